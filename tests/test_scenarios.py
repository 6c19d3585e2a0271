"""Scenario files (briefer.instructor.scenario_format) and the generator (briefer.instructor.generation).

Loader checks use exact messages of our own format (file:line: field: what was expected), as the
other loaders' tests do. Generator checks run over many seeds and assert that each scenario
really exercises its emphasis, recomputing the quantity from the scenario itself:

* tailwind on base: tail = sigma * W * sin(wind_from - landing_course), sigma = +1 for a
  right-hand pattern (hand-derived in the runway frame of briefer.core.manoeuvre.legs, where
  y is to the right and a right-hand base heads toward -y);
* low visibility: |reported - required| <= the stated margin (0.5 SM, or 800 m for metre reports);
* reciprocal: the arrival is within 60 degrees of the landing course + 180;
* hot/cold: the temperature is at least 20 C above / 25 C below ISA at the field elevation
  (ISA: 15 C - 1.98 C per 1000 ft, ICAO Doc 7488; the core's isa_temperature_c);
* familiar picture: the brief says no bank can make the familiar turn, or it needs more than
  the bank limit;
* gusty category: the brief's "gust-raises-category" finding.
"""

from __future__ import annotations

import json
import random
import textwrap
from fractions import Fraction
from pathlib import Path

import pytest

from briefer.brief import envelope_for
from briefer.core import atmosphere, maneuver
from briefer.errors import DataFileError, DomainError
from briefer.io import catalog
from briefer.io.metar import decode_metar, weather_from_metar
from briefer.model import Weather
from briefer.instructor.generation import (
    LOW_VIS_MARGIN_M,
    LOW_VIS_MARGIN_SM,
    RECIPROCAL_WITHIN_DEG,
    WeatherPlan,
    base_tailwind_kt,
    candidate_pairs,
    format_report,
    generate_scenario,
    landing_course_deg_true,
    station_of,
)
from briefer.instructor.scenario_format import (
    EMPHASES,
    Scenario,
    ScenarioWeather,
    load_scenario,
    resolve_scenario,
    scenario_yaml,
    write_scenario,
)
from briefer.units import SM_TO_M
from briefer.core.angles import wrap_180

SCHEMA = Path(__file__).resolve().parent.parent / "briefer" / "schemas" / "scenario.schema.json"


@pytest.fixture(scope="module")
def fields():
    return {a: catalog.find_airfield(a) for a in ("V2RL", "Q7HM", "X4CD")}


@pytest.fixture(scope="module")
def profiles():
    return {p: catalog.find_profile(p) for p in ("demo-bizjet", "demo-twin", "demo-trainer")}


# ----------------------------------------------------------------------------------------------
# The report written by the generator
# ----------------------------------------------------------------------------------------------

def test_format_report_decodes_to_the_plan():
    # METAR code forms (AIM 7-1; FMH-1 ch. 12): 1 1/4SM, M05 = -5 C, A2980 = 29.80 inHg,
    # BKN011 = 1100 ft ceiling.
    w = WeatherPlan(wind_from_deg=270, wind_speed_kt=15, wind_gust_kt=25, visibility_sm=Fraction(5, 4),
                    weather=("BR",), clouds=(("SCT", 6), ("BKN", 11)), temperature_c=-5, dew_point_c=-7,
                    altimeter_hundredths_inhg=2980, day=3, hour=9, minute=50)
    text = format_report("V2RL", w)
    assert text == "METAR V2RL 030950Z 27015G25KT 1 1/4SM BR SCT006 BKN011 M05/M07 A2980"
    values = weather_from_metar(decode_metar(text))
    assert values["wind_from_deg"] == 270 and values["wind_gust_kt"] == 25
    assert values["visibility_sm"] == 1.25 and values["ceiling_ft"] == 1100 and values["oat_c"] == -5


def test_format_report_metric():
    w = WeatherPlan(wind_from_deg=None, wind_speed_kt=3, visibility_m=3700, clouds=(), temperature_c=2,
                    dew_point_c=1, altimeter_hpa=1031)
    text = format_report("X4CD", w)
    assert text == "METAR X4CD 011250Z VRB03KT 3700 SKC 02/01 Q1031"
    values = weather_from_metar(decode_metar(text))
    assert values["visibility_sm"] == pytest.approx(3700 / SM_TO_M, rel=1e-12)   # 3700 m in SM
    assert values["wind_from_deg"] is None and values["altimeter_hpa"] == 1031


@pytest.mark.parametrize(("ident", "station"), [("V2RL", "V2RL"), ("AB", "ABXX"), ("12AB", "XXXX")])
def test_station_of(ident, station):
    # a report's station is four characters, the first a letter (WMO FM 15)
    assert station_of(ident) == station


# ----------------------------------------------------------------------------------------------
# The file format
# ----------------------------------------------------------------------------------------------

BASE = textwrap.dedent("""\
    kind: scenario
    format_version: 1
    title: Valley reciprocal
    airfield: V2RL
    approach: RNAV (GPS) RWY 09
    landing_runway: '27'
    profile: demo-bizjet
    weight_lb: 30000
    weather:
      report: METAR V2RL 121550Z 26014KT 3SM BR BKN011 09/06 A2980
      wind_speed_kt: 14
    emphasis: reciprocal
    seed: 7
    notes: hand written
    """)


def write(tmp_path: Path, text: str, name: str = "s.yaml") -> str:
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return str(p)


def test_values_are_filled_from_the_report(tmp_path):
    loaded = load_scenario(write(tmp_path, BASE))
    w = loaded.scenario.weather
    # 26014KT -> 260/14 true; A2980 -> 29.80 inHg; BKN011 -> 1100 ft (METAR key, AIM 7-1)
    assert (w.wind_from_deg, w.wind_speed_kt, w.oat_c, w.visibility_sm, w.ceiling_ft) == (260, 14, 9, 3, 1100)
    assert w.altimeter_hpa == pytest.approx(weather_from_metar(decode_metar(w.report))["altimeter_hpa"])
    assert loaded.request.weather == w.as_weather() and isinstance(loaded.request.weather, Weather)
    assert loaded.request.weight_lb == 30000 and loaded.report.station == "V2RL"
    brief = loaded.brief()
    assert brief.weather.report == w.report and brief.computed_utc.startswith("practice scenario")


def test_round_trip(tmp_path):
    first = load_scenario(write(tmp_path, BASE)).scenario
    text = scenario_yaml(first)
    assert text.startswith("# Practice scenario")
    again = load_scenario(write(tmp_path, text, "again.yaml")).scenario
    assert again == first
    assert Scenario.from_mapping(first.to_mapping()) == first


def test_write_is_atomic_and_refuses_to_overwrite(tmp_path):
    s = load_scenario(write(tmp_path, BASE)).scenario
    out = tmp_path / "out.yaml"
    write_scenario(out, s)
    with pytest.raises(Exception, match="already exists"):
        write_scenario(out, s)
    write_scenario(out, s, overwrite=True)
    assert load_scenario(out).scenario == s
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".")] == []   # no temporary left


def test_relative_airfield_path_is_taken_from_the_scenario_folder(tmp_path):
    src = next(e.source for e in catalog.list_airfields() if e.name == "V2RL")
    (tmp_path / "lessons" / "fields").mkdir(parents=True)
    (tmp_path / "lessons" / "fields" / "valley.yaml").write_text(Path(src).read_text(encoding="utf-8"),
                                                                 encoding="utf-8")
    text = BASE.replace("airfield: V2RL", "airfield: fields/valley.yaml")
    loaded = load_scenario(write(tmp_path / "lessons", text))
    assert loaded.request.airfield.ident == "V2RL"


@pytest.mark.parametrize("reference", ["../fields/valley.yaml", "/etc/passwd", "~/.bashrc",
                                       "fields/../../fields/valley.yaml"])
def test_a_reference_out_of_the_scenario_folder_is_refused(tmp_path, reference):
    """A data file may name a catalog entry or a file in its own folder, nothing else (README)."""
    src = next(e.source for e in catalog.list_airfields() if e.name == "V2RL")
    (tmp_path / "fields").mkdir()
    (tmp_path / "fields" / "valley.yaml").write_text(Path(src).read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "lessons").mkdir()
    text = BASE.replace("airfield: V2RL", f"airfield: {reference}")
    with pytest.raises(DataFileError) as info:
        load_scenario(write(tmp_path / "lessons", text))
    message = str(info.value)
    assert ": airfield: expected a catalog name, or a path to a YAML file inside the scenario's own folder" in message
    assert "root:" not in message and "PATH" not in message


BAD_CASES = [
    ("kind: scenario\n", "kind: airfield\n", "s.yaml:1: kind: expected 'scenario', got 'airfield' (this is not a scenario file)"),
    ("kind: scenario\n", "", "s.yaml:1: missing required key 'kind' (expected 'scenario')"),
    ("seed: 7\n", "sead: 7\n", "s.yaml:13: unknown key 'sead' (did you mean 'seed'?)"),
    ("seed: 7\n", "seed: -1\n", "s.yaml:13: seed: expected a whole number from 0 to 2^63-1, got -1"),
    ("emphasis: reciprocal\n", "emphasis: reciprocol\n",
     "s.yaml:12: emphasis: expected 'tailwind-on-base', 'low-visibility', 'reciprocal', 'hot-high', 'cold', "
     "'familiar-picture' or 'gusty-category', got 'reciprocol' (did you mean 'reciprocal'?)"),
    ("  wind_speed_kt: 14\n", "  wind_speed_kt: 41\n",
     "s.yaml:11: weather.wind_speed_kt: expected 14 (as in the report), got 41"),
    ("  wind_speed_kt: 14\n", "  wind_speed_kt: 14\n  wind_reference: magnetic\n",
     "s.yaml:12: weather.wind_reference: expected 'true' with a report (a METAR wind is from true north), "
     "got 'magnetic'"),
    ("  wind_speed_kt: 14\n", "  wind_speed_kt: 14\n  ceiling_ft: 1500\n",
     "s.yaml:12: weather.ceiling_ft: expected 1100 (as in the report), got 1500"),
    ("26014KT 3SM", "26014KT 3SM RA", None),     # present weather is fine (kept as text)
    ("METAR V2RL 121550Z", "METAR 121550Z", "s.yaml:10: weather.report: cannot decode the report: "),
    ("landing_runway: '27'\n", "landing_runway: '45'\n",
     "s.yaml:6: landing_runway: expected a runway designator such as '09' or '27L', got '45'"),
    ("landing_runway: '27'\n", "landing_runway: '18'\n",
     "s.yaml:6: landing_runway: airfield V2RL has no runway '18' (runways: 09/27)"),
    ("weight_lb: 30000\n", "weight_lb: 40000\n",
     "s.yaml:8: weight_lb: expected a landing weight between 12400 and the maximum landing weight 31000, got 40000"),
    ("airfield: V2RL\n", "airfield: V2RX\n", "s.yaml:4: airfield: no airfield named 'V2RX'"),
    ("profile: demo-bizjet\n", "profile: demo-bizjet\nconfiguration: flaps-99\n",
     "s.yaml:8: configuration: aircraft profile 'demo-bizjet' has no configuration 'flaps-99'"),
    ("notes: hand written\n", "notes: " + "x" * 2001 + "\n",
     "s.yaml:14: notes: expected at most 2000 characters, got 2001"),
]


@pytest.mark.parametrize(("old", "new", "message"), BAD_CASES, ids=[c[2][:40] if c[2] else "ok" for c in BAD_CASES])
def test_bad_files_name_file_line_and_field(tmp_path, monkeypatch, old, new, message):
    assert old in BASE
    monkeypatch.chdir(tmp_path)
    write(tmp_path, BASE.replace(old, new, 1))
    if message is None:
        load_scenario("s.yaml")
        return
    with pytest.raises(DataFileError) as exc:
        load_scenario("s.yaml")
    assert str(exc.value).startswith(message), str(exc.value)


def test_model_checks_report_against_values_when_built_by_hand():
    report = "METAR V2RL 121550Z 26014KT 3SM BKN011 09/06 A2980"
    values = weather_from_metar(decode_metar(report))
    ScenarioWeather(report=report, **values)
    with pytest.raises(DomainError, match="visibility_sm: missing: the report gives 3"):
        ScenarioWeather(report=report, **(values | {"visibility_sm": None}))
    with pytest.raises(DomainError, match="oat_c: expected 9 \\(as in the report\\), got 11"):
        ScenarioWeather(report=report, **(values | {"oat_c": 11.0}))


def test_resolve_without_a_file_names_the_field():
    s = Scenario.from_mapping(json.loads(json.dumps(
        {"kind": "scenario", "title": "t", "airfield": "V2RL", "approach": "nope", "landing_runway": "27",
         "profile": "demo-twin", "weather": {"wind_speed_kt": 5}, "emphasis": "cold"})))
    with pytest.raises(DataFileError, match="^approach: airfield V2RL has no approach 'nope'"):
        resolve_scenario(s)


def test_schema_matches_the_model():
    schema = json.loads(SCHEMA.read_text(encoding="utf-8"))
    assert set(schema["properties"]) == set(Scenario.keys())
    assert set(schema["required"]) == set(Scenario.required_keys()) | {"kind"}
    assert schema["properties"]["emphasis"]["enum"] == list(EMPHASES)
    weather = schema["$defs"]["ScenarioWeather"]
    assert set(weather["properties"]) == set(ScenarioWeather.keys())
    assert schema["additionalProperties"] is False and weather["additionalProperties"] is False


def test_shipped_examples_load_and_brief():
    """The example scenarios shipped (top-level scenarios/, briefer/data/scenarios when installed)
    load, resolve and brief."""
    from briefer.io import catalog

    folder = catalog.builtin_folder("scenario")
    files = sorted(f for f in folder.iterdir() if f.name.endswith(".yaml"))
    assert files
    for f in files:
        loaded = load_scenario(str(f))
        brief = loaded.brief()
        assert brief.header.airfield_ident == loaded.request.airfield.ident
        assert brief.weather.report == loaded.scenario.weather.report


# ----------------------------------------------------------------------------------------------
# The generator: reproducible, no global state
# ----------------------------------------------------------------------------------------------

def test_same_seed_same_scenario(fields, profiles):
    a = generate_scenario(airfield=fields["V2RL"], profile=profiles["demo-bizjet"], emphasis="reciprocal", seed=11)
    random.seed(12345)                         # the global generator is never used
    state = random.getstate()
    b = generate_scenario(airfield=fields["V2RL"], profile=profiles["demo-bizjet"], emphasis="reciprocal", seed=11)
    assert random.getstate() == state
    assert a.scenario == b.scenario and scenario_yaml(a.scenario) == scenario_yaml(b.scenario)
    c = generate_scenario(airfield=fields["V2RL"], profile=profiles["demo-bizjet"], emphasis="reciprocal", seed=12)
    assert c.scenario != a.scenario


def test_emphasis_drawn_from_the_seed(fields, profiles):
    g = generate_scenario(airfield=fields["Q7HM"], profile=profiles["demo-twin"], seed=3)
    assert g.scenario.emphasis in EMPHASES
    again = generate_scenario(airfield=fields["Q7HM"], profile=profiles["demo-twin"], seed=3)
    assert again.scenario == g.scenario


def test_generated_file_loads_back(tmp_path, fields, profiles):
    g = generate_scenario(airfield=fields["X4CD"], profile=profiles["demo-twin"], emphasis="cold", seed=5)
    path = write_scenario(tmp_path / "cold.yaml", g.scenario)
    loaded = load_scenario(path)
    assert loaded.scenario == g.scenario
    assert loaded.brief().minimums.mda_ft == g.brief.minimums.mda_ft


# ----------------------------------------------------------------------------------------------
# The generator: each emphasis is really exercised, over many seeds
# ----------------------------------------------------------------------------------------------

SEEDS = range(5)


def _course(fields, g) -> float:
    return landing_course_deg_true(fields[g.brief.header.airfield_ident], g.scenario.landing_runway)


@pytest.mark.parametrize(("field", "profile", "seed"), [("V2RL", "demo-bizjet", s) for s in SEEDS]
                         + [("Q7HM", "demo-twin", s) for s in range(3)] + [("V2RL", "demo-twin", 0)])
def test_tailwind_on_base(fields, profiles, field, profile, seed):
    g = generate_scenario(airfield=fields[field], profile=profiles[profile], emphasis="tailwind-on-base", seed=seed)
    w, b = g.scenario.weather, g.brief
    assert b.plan.feasible and b.plan.shape != "direct-turn"
    tail = base_tailwind_kt(wind_from_deg_true=w.wind_from_deg, wind_speed_kt=w.wind_speed_kt,
                            landing_course_deg_true=_course(fields, g), side=b.plan.side)
    assert tail >= 5.0                           # a real tailwind in the base turn
    # and the wind envelope (briefer.brief.envelope_for) calls this wind marginal
    cell = envelope_for(g.loaded.request, wind_from_relative_deg=[w.wind_from_deg - _course(fields, g)],
                        wind_speed_kt=[w.wind_speed_kt])
    assert int(cell.status[0, 0]) == maneuver.MARGINAL


def test_base_tailwind_sign():
    # runway 360: wind from 090 (the right) blows toward the left; a right-hand pattern's base
    # heads left (toward the centreline): full tailwind; a left-hand base heads right: headwind.
    assert base_tailwind_kt(wind_from_deg_true=90, wind_speed_kt=10, landing_course_deg_true=0,
                            side="right") == pytest.approx(10.0)
    assert base_tailwind_kt(wind_from_deg_true=90, wind_speed_kt=10, landing_course_deg_true=0,
                            side="left") == pytest.approx(-10.0)
    assert base_tailwind_kt(wind_from_deg_true=0, wind_speed_kt=10, landing_course_deg_true=0,
                            side="left") == pytest.approx(0.0, abs=1e-12)


@pytest.mark.parametrize("seed", range(8))
@pytest.mark.parametrize(("field", "profile"), [("V2RL", "demo-twin"), ("Q7HM", "demo-bizjet"),
                                                ("X4CD", "demo-bizjet")])
def test_low_visibility_within_margin(fields, profiles, field, profile, seed):
    g = generate_scenario(airfield=fields[field], profile=profiles[profile], emphasis="low-visibility", seed=seed)
    m = g.brief.minimums
    reported = g.scenario.weather.visibility_sm
    if fields[field].approach(g.scenario.approach).criteria == "icao":
        assert abs(reported * SM_TO_M - m.visibility_required_sm * SM_TO_M) <= LOW_VIS_MARGIN_M + 1e-6
    else:
        assert abs(reported - m.visibility_required_sm) <= LOW_VIS_MARGIN_SM + 1e-9
    assert m.visibility_ok == (reported >= m.visibility_required_sm - 1e-9)
    assert "BR" in g.scenario.weather.report or "FG" in g.scenario.weather.report
    assert m.ceiling_ok                          # the ceiling is not the question here


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize("field", ["V2RL", "Q7HM", "X4CD"])
def test_reciprocal_arrival(fields, profiles, field, seed):
    g = generate_scenario(airfield=fields[field], profile=profiles["demo-bizjet"], emphasis="reciprocal", seed=seed)
    af = fields[field]
    final_true = af.approach(g.scenario.approach).final_course_deg_mag + af.magnetic_variation_deg
    off = abs(float(wrap_180(final_true - (_course(fields, g) + 180.0))))
    assert off <= RECIPROCAL_WITHIN_DEG
    assert g.brief.wind.headwind_kt > 0          # the wind favours the landing runway


def test_reciprocal_needs_a_reciprocal_pair(fields, profiles):
    # VOR-A (final 049 true) to runway 13 (141 true) is 92 deg off the landing course: not reciprocal
    with pytest.raises(DomainError, match="within 60° of the reciprocal"):
        generate_scenario(airfield=fields["Q7HM"], profile=profiles["demo-bizjet"], emphasis="reciprocal",
                          approach="VOR-A", runway="13", seed=1)


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize(("emphasis", "field"), [("hot-high", "Q7HM"), ("cold", "X4CD"), ("cold", "Q7HM")])
def test_temperature_far_from_isa(fields, profiles, emphasis, field, seed):
    g = generate_scenario(airfield=fields[field], profile=profiles["demo-twin"], emphasis=emphasis, seed=seed)
    isa = float(atmosphere.isa_temperature_c(fields[field].elevation_ft))
    dev = g.scenario.weather.oat_c - isa
    if emphasis == "hot-high":
        assert dev >= 20 - 0.5                   # rounded to whole degrees in the report
    else:
        assert dev <= -25 + 0.5
        assert g.brief.minimums.cold is not None and g.brief.minimums.cold.correction_ft > 0


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize("profile", ["demo-bizjet", "demo-twin", "demo-trainer"])
def test_familiar_picture_fails_badly(fields, profiles, profile, seed):
    g = generate_scenario(airfield=fields["Q7HM"], profile=profiles[profile], emphasis="familiar-picture", seed=seed)
    s = g.brief.sight_picture
    assert (not s.familiar_possible) or s.familiar_exceeds_bank_limit


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize(("field", "profile"), [("V2RL", "demo-bizjet"), ("X4CD", "demo-twin")])
def test_gusty_category(fields, profiles, field, profile, seed):
    g = generate_scenario(airfield=fields[field], profile=profiles[profile], emphasis="gusty-category", seed=seed)
    assert any(f.code == "gust-raises-category" for f in g.brief.findings)
    assert g.scenario.weather.wind_gust_kt > g.scenario.weather.wind_speed_kt


@pytest.mark.parametrize(("field", "profile", "emphasis", "match"), [
    ("V2RL", "demo-trainer", "cold", "circling is not authorised for demo-trainer \\(category E\\)"),
    ("V2RL", "demo-twin", "gusty-category", "no gust raises the category of demo-twin"),
])
def test_cannot_exercise_says_why(fields, profiles, field, profile, emphasis, match):
    with pytest.raises(DomainError, match=match):
        generate_scenario(airfield=fields[field], profile=profiles[profile], emphasis=emphasis, seed=1)


def test_aligned_pair_is_not_a_circle(fields):
    # RNAV (GPS) RWY 09 (092 M = 083.5 true) to runway 09: aligned
    with pytest.raises(DomainError, match="straight-in, not a circle"):
        candidate_pairs(fields["V2RL"], approach="RNAV (GPS) RWY 09", runway="09")


def test_unknown_emphasis_and_bad_seed(fields, profiles):
    with pytest.raises(DomainError, match="unknown emphasis"):
        generate_scenario(airfield=fields["V2RL"], profile=profiles["demo-twin"], emphasis="windy", seed=1)
    with pytest.raises(DomainError, match="seed"):
        generate_scenario(airfield=fields["V2RL"], profile=profiles["demo-twin"], emphasis="cold", seed=-3)
