"""The invented demo data, the catalog, `briefer check` and the JSON Schemas.

Every demo aircraft and airfield is invented. The checks on their content cite where the rule
comes from (14 CFR 97.3 categories, AIM 5-4-20 alignment, TERPS 400 ft/NM) and use the core
modules and geographiclib (a reference geodesic library) for the geometry, so the data are
consistent with what the briefing will compute.
"""

from __future__ import annotations

import json
import re
from pathlib import Path
from typing import Any

import pytest
from geographiclib.geodesic import Geodesic

from briefer.cli import main
from briefer.core import criteria as cr
from briefer.core import geometry as geo
from briefer.errors import DataFileError
from briefer.io.catalog import (
    NotFoundError,
    builtin_files,
    config_path,
    find_airfield,
    find_profile,
    list_airfields,
    list_profiles,
    load_config,
)
from briefer.io.yamlload import load_any, load_bytes, parse_yaml_mapping
from briefer.model import (
    KIND_AIRFIELD,
    KIND_PROFILE,
    AircraftProfile,
    Airfield,
    CirclingMinimum,
    Configuration,
    FamiliarPattern,
    Fix,
    LatLon,
    Obstacle,
    Runway,
    RunwayPosition,
    CrossingPoint,
    Sector,
    StraightIn,
    Threshold,
    WindAdditive,
)
from briefer.units import M_TO_NM

ROOT = Path(__file__).resolve().parent.parent
BAD = Path(__file__).parent / "bad_files"
SCHEMAS = ROOT / "briefer" / "schemas"
WGS84 = Geodesic.WGS84


@pytest.fixture(autouse=True)
def no_user_config(tmp_path_factory: pytest.TempPathFactory, monkeypatch: pytest.MonkeyPatch) -> Path:
    """Keep the developer's own config file out of these tests."""
    home = tmp_path_factory.mktemp("config-home")
    monkeypatch.setenv("XDG_CONFIG_HOME", str(home))
    return home


def demo(kind: str) -> list[Any]:
    return [load_bytes(t.read_bytes(), file=t.name, expected_kind=kind) for t in builtin_files(kind)]


PROFILES = {p.name: p for p in demo(KIND_PROFILE)}
AIRFIELDS = {a.ident: a for a in demo(KIND_AIRFIELD)}


# --- every demo file loads and checks -------------------------------------------------------------
def test_there_are_at_least_three_of_each() -> None:
    assert sorted(PROFILES) == ["demo-bizjet", "demo-trainer", "demo-twin"]
    assert sorted(AIRFIELDS) == ["Q7HM", "V2RL", "X4CD"]


@pytest.mark.parametrize("kind", [KIND_PROFILE, KIND_AIRFIELD])
def test_every_demo_file_round_trips(kind: str) -> None:
    for model in demo(kind):
        assert type(model).from_mapping(model.to_mapping()) == model


def test_briefer_check_demo_exits_0(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["check", "--demo"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert len(lines) == 7 and lines[-1] == "6 files checked, 0 failed"
    assert all(": OK: " in line for line in lines[:-1])
    assert any(line.endswith("demo-trainer.yaml: OK: aircraft profile 'demo-trainer' (1 configuration)")
               for line in lines)
    assert any(line.endswith("v2rl-ellisvane-valley.yaml: OK: airfield V2RL 'Ellisvane Valley' "
                             "(1 runway, 2 approaches, 5 obstacles)") for line in lines)


def test_briefer_check_bad_file_exits_2_with_one_line(capsys: pytest.CaptureFixture[str],
                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(BAD)
    assert main(["check", "lemon.yaml"]) == 2
    out = capsys.readouterr()
    assert out.out == "lemon.yaml:16: runways[1].threshold_b.elevation_ft: expected a number in feet, got 'abc'\n"
    assert out.err == ""


def test_briefer_check_mixed_files(capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(BAD)
    assert main(["check", "good-profile.yaml", "g-empty.yaml", "good-airfield.yaml"]) == 2
    assert capsys.readouterr().out.splitlines() == [
        "good-profile.yaml: OK: aircraft profile 'test-single' (1 configuration)",
        "g-empty.yaml: the file is empty; expected a YAML mapping starting with 'kind: aircraft-profile' or "
        "'kind: airfield'",
        "good-airfield.yaml: OK: airfield T1ST 'Testfield' (1 runway, 1 approach, 0 obstacles)",
        "3 files checked, 1 failed",
    ]


def test_briefer_check_json(capsys: pytest.CaptureFixture[str], monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(BAD)
    assert main(["check", "--json", "good-profile.yaml", "p-wrong-type.yaml"]) == 2
    payload = json.loads(capsys.readouterr().out)
    assert payload["checked"] == 2 and payload["failed"] == 1 and payload["cautions"]
    assert payload["files"][0] == {"file": "good-profile.yaml", "ok": True, "kind": "aircraft-profile",
                                   "name": "test-single", "text": "aircraft profile 'test-single' (1 configuration)"}
    assert payload["files"][1] == {"file": "p-wrong-type.yaml", "ok": False, "line": 13,
                                   "field": "configurations[0].vref_kt",
                                   "message": "expected a number in knots, got 'fast'",
                                   "error": "p-wrong-type.yaml:13: configurations[0].vref_kt: expected a number "
                                            "in knots, got 'fast'"}


def test_briefer_check_needs_something(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["check"]) == 2
    assert capsys.readouterr().err == "briefer check: error: give at least one FILE, or --demo\n"


# --- the catalog ------------------------------------------------------------------------------------
@pytest.mark.parametrize("name", ["demo-twin", "DEMO-BIZJET", "demo trainer"])
def test_catalog_finds_profiles_by_name(name: str) -> None:
    assert find_profile(name).name == name.lower().replace(" ", "-")


@pytest.mark.parametrize(("query", "ident"), [("V2RL", "V2RL"), ("q7hm", "Q7HM"), ("Tarnwick Coastal", "X4CD"),
                                              ("ellisvane-valley", "V2RL"), ("x4cd-tarnwick-coastal", "X4CD")])
def test_catalog_finds_airfields_by_ident_name_or_file(query: str, ident: str) -> None:
    assert find_airfield(query).ident == ident


def test_catalog_lists_the_built_ins() -> None:
    profiles = list_profiles()
    assert [(e.name, e.builtin, e.error) for e in profiles] == [
        ("demo-bizjet", True, None), ("demo-trainer", True, None), ("demo-twin", True, None)]
    assert [(e.name, e.title) for e in list_airfields()] == [
        ("Q7HM", "Qorvel Mesa"), ("V2RL", "Ellisvane Valley"), ("X4CD", "Tarnwick Coastal")]
    assert all(Path(e.source).name.endswith(".yaml") for e in profiles)


def test_catalog_not_found_lists_what_exists() -> None:
    with pytest.raises(NotFoundError) as info:
        find_profile("demo-twn")
    assert str(info.value) == ("no aircraft profile named 'demo-twn' (did you mean 'demo-twin'?); available: "
                               "demo-bizjet, demo-trainer, demo-twin (or give a file path)")
    with pytest.raises(NotFoundError, match=r"^no airfield named 'K1XX'; available: Q7HM, V2RL, X4CD"):
        find_airfield("K1XX")


def test_catalog_loads_paths(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(BAD)
    assert find_profile("good-profile.yaml").name == "test-single"
    assert find_airfield(BAD / "good-airfield.yaml").ident == "T1ST"
    with pytest.raises(DataFileError, match="^missing.yaml: no such file$"):
        find_airfield("missing.yaml")


def test_user_folders_come_first_and_broken_files_are_listed(tmp_path: Path) -> None:
    mine = tmp_path / "mine"
    mine.mkdir()
    text = (ROOT / "profiles" / "demo-twin.yaml").read_text()
    (mine / "my-twin.yaml").write_text(text.replace("Invented light piston twin (", "My own copy ("))
    (mine / "broken.yaml").write_text("kind: aircraft-profile\nname: [\n")
    (mine / "notes.txt").write_text("not data")
    assert find_profile("demo-twin", dirs=[mine]).description.startswith("My own copy")
    assert find_profile("demo-twin").description.startswith("Invented")
    entries = list_profiles(dirs=[mine])
    assert [(e.name, e.builtin) for e in entries][:2] == [("broken", False), ("demo-twin", False)]
    assert entries[0].error is not None and entries[0].error.startswith(f"{mine / 'broken.yaml'}:3: not valid YAML")
    with pytest.raises(DataFileError, match="not valid YAML"):
        find_profile("broken", dirs=[mine])   # asked for by its file name: the error is shown


def test_config_file_adds_folders(tmp_path: Path, no_user_config: Path) -> None:
    assert config_path() == no_user_config / "briefer" / "config.yaml"
    assert load_config().profile_dirs == ()
    fields_dir = tmp_path / "fields"
    fields_dir.mkdir()
    (fields_dir / "home.yaml").write_text((BAD / "good-airfield.yaml").read_text())
    cfg = no_user_config / "briefer" / "config.yaml"
    cfg.parent.mkdir(parents=True)
    cfg.write_text(f"airfield_dirs: [{fields_dir}]\nprofile_dirs: []\n")
    assert find_airfield("t1st").name == "Testfield"
    assert find_airfield("home").ident == "T1ST"
    assert [e.name for e in list_airfields()][0] == "T1ST"
    with pytest.raises(NotFoundError):
        find_airfield("T1ST", use_config=False)


@pytest.mark.parametrize(("text", "message"), [
    pytest.param("profile_dir: [a]\n", ":1: unknown key 'profile_dir' (did you mean 'profile_dirs'?)", id="typo"),
    pytest.param("airfield_dirs: [./nowhere]\n", ":1: airfield_dirs[0]: no such folder: {dir}/nowhere", id="no-dir"),
    pytest.param("airfield_dirs: 5\n", ":1: airfield_dirs: expected a list of folders, got int", id="type"),
])
def test_config_file_errors(no_user_config: Path, text: str, message: str) -> None:
    cfg = no_user_config / "briefer" / "config.yaml"
    cfg.parent.mkdir(parents=True, exist_ok=True)
    cfg.write_text(text)
    with pytest.raises(DataFileError) as info:
        find_airfield("V2RL")
    assert str(info.value) == f"{cfg}{message.format(dir=cfg.parent)}"


def test_demo_data_ships_in_the_wheel() -> None:
    """pyproject maps the top-level demo folders into the package and ships their files and the
    schemas (so `pip install .` has them); every package folder of briefer/ is listed."""
    tomllib = pytest.importorskip("tomllib")   # Python 3.11+

    tool = tomllib.loads((ROOT / "pyproject.toml").read_text())["tool"]["setuptools"]
    for folder in ("profiles", "airfields_demo", "scenarios"):
        assert tool["package-dir"][f"briefer.data.{folder}"] == folder
        assert tool["package-data"][f"briefer.data.{folder}"] == ["*.yaml"]
        assert f"briefer.data.{folder}" in tool["packages"]
    assert "schemas/*.json" in tool["package-data"]["briefer"]
    on_disk = {".".join(p.parent.relative_to(ROOT).parts) for p in (ROOT / "briefer").rglob("__init__.py")}
    assert on_disk <= set(tool["packages"]), sorted(on_disk - set(tool["packages"]))


# --- what the demo data must exercise ----------------------------------------------------------------
def geodesic(a: Any, b: Any) -> tuple[float, float]:
    """(distance m, initial azimuth deg true) on WGS-84 (geographiclib)."""
    g = WGS84.Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg)
    return g["s12"], g["azi1"] % 360.0


def angle_between(a: float, b: float) -> float:
    return abs((a - b + 180.0) % 360.0 - 180.0)


def test_profiles_cover_categories_a_c_e() -> None:
    """14 CFR 97.3 bands (REFERENCES 1a): A < 91, B 91-120, C 121-140, D 141-165, E >= 166 kt."""
    speeds = {n: p.approach_category_speed_kt() for n, p in PROFILES.items()}
    assert {n: cr.category_from_speed(v) for n, v in speeds.items()} == {
        "demo-twin": "A", "demo-bizjet": "C", "demo-trainer": "E"}
    twin = PROFILES["demo-twin"]
    assert 91 <= twin.configuration().circling_speed_kt < 121  # circles at category B speed
    bizjet = PROFILES["demo-bizjet"]
    assert 141 <= bizjet.configuration().circling_speed_kt * bizjet.weight_speed_factor(31000) < 166  # D speed
    trainer = PROFILES["demo-trainer"]
    assert (trainer.aoa_unit, trainer.aoa_indexer, trainer.stall_warning) == ("units", True, "none")
    cfg = trainer.configuration()
    assert cfg.aoa_ref < cfg.aoa_buffet < cfg.aoa_stall     # buffet warns between the approach AoA and the stall
    heights = sorted(p.familiar_pattern.height_ft for p in PROFILES.values())
    assert heights == [1000, 1500, 1500]


def test_idents_cannot_be_real_icao_codes() -> None:
    assert all(re.search(r"\d", ident) for ident in AIRFIELDS)


def test_hot_high_and_cold_low_fields_and_all_criteria() -> None:
    elevations = {a.ident: a.elevation_ft for a in AIRFIELDS.values()}
    assert max(elevations.values()) >= 5500 and min(elevations.values()) <= 200
    assert {ap.criteria for a in AIRFIELDS.values() for ap in a.approaches} == set(cr.CRITERIA_SETS)


def test_runways_are_consistent_on_the_ellipsoid() -> None:
    """Lengths 1500-3500 m; the bearing between thresholds fits the designator (magnetic) within 5 deg."""
    for a in AIRFIELDS.values():
        for rw in a.runways:
            length_m, azimuth = geodesic(rw.threshold_a, rw.threshold_b)
            assert 1500 <= length_m <= 3500, rw.designator
            magnetic = azimuth - a.magnetic_variation_deg   # true = magnetic + variation
            assert angle_between(magnetic, int(rw.threshold_a.designator) * 10) <= 5, (a.ident, rw.designator)


def final_geometry(a: Airfield, ap: Any, designator: str) -> tuple[float, float]:
    """(alignment deg, gradient ft/NM FAF to TCH) of an approach against one landing threshold."""
    landing, opposite = a.runway_by_designator(designator)
    _, runway_true = geodesic(landing, opposite)  # the landing course, from the threshold down the runway
    runway_mag = runway_true - a.magnetic_variation_deg
    distance_m, _ = geodesic(ap.faf, landing)
    gradient = cr.descent_gradient_ft_per_nm(faf_altitude_ft=ap.faf.altitude_ft,
                                             threshold_elevation_ft=landing.elevation_ft,
                                             tch_ft=landing.tch_ft, distance_nm=distance_m * M_TO_NM)
    return angle_between(ap.final_course_deg_mag, runway_mag), gradient


def test_circling_only_by_alignment() -> None:
    """Qorvel VOR-A: final course more than 30 deg off every runway (AIM 5-4-20 c)."""
    a = AIRFIELDS["Q7HM"]
    ap = a.approach("VOR-A")
    assert ap.circling_only
    offsets = [final_geometry(a, ap, t.designator)[0] for t in a.thresholds]
    assert min(offsets) > 30
    nearest = min(a.thresholds, key=lambda t: final_geometry(a, ap, t.designator)[0])
    gradient = final_geometry(a, ap, nearest.designator)[1]
    assessment = cr.straight_in_assessment(final_course_deg=ap.final_course_deg_mag,
                                           runway_course_deg=ap.final_course_deg_mag + min(offsets),
                                           gradient_ft_per_nm=gradient, category="A", criteria=ap.criteria)
    assert [r.code for r in assessment.reasons] == ["alignment"]


def test_circling_only_by_descent_gradient() -> None:
    """Ellisvane NDB-B: aligned with 27, but FAF to TCH is more than 400 ft/NM (TERPS, REFERENCES 5)."""
    a = AIRFIELDS["V2RL"]
    ap = a.approach("NDB-B")
    assert ap.circling_only
    alignment, gradient = final_geometry(a, ap, "27")
    assert alignment <= 5
    assert gradient > 400   # (3300 - (1120 + 50)) / 3.4 NM = 626 ft/NM
    assessment = cr.straight_in_assessment(final_course_deg=0.0, runway_course_deg=alignment,
                                           gradient_ft_per_nm=gradient, category="B", criteria=ap.criteria,
                                           rnav_gps=ap.rnav_gps)
    assert [r.code for r in assessment.reasons] == ["gradient"]


def test_straight_in_approaches_are_straight_in_geometry() -> None:
    for a in AIRFIELDS.values():
        for ap in a.approaches:
            if ap.circling_only:
                continue
            alignment, gradient = final_geometry(a, ap, ap.runway)
            assert alignment <= 5 and 300 <= gradient <= 400, (a.ident, ap.name, alignment, gradient)
            assert ap.straight_in.runway == ap.runway, (a.ident, ap.name)


def test_circle_to_the_reciprocal_runway_is_possible() -> None:
    """Ellisvane RNAV (GPS) RWY 09 serves 09; runway 27 is its reciprocal, to land after circling."""
    a = AIRFIELDS["V2RL"]
    ap = a.approach("RNAV (GPS) RWY 09")
    landing, opposite = a.runway_by_designator("27")
    assert ap.runway == opposite.designator == "09" and landing.designator == "27"


def test_not_authorised_category_and_sectors() -> None:
    v2rl, x4cd = AIRFIELDS["V2RL"], AIRFIELDS["X4CD"]
    assert v2rl.approach("RNAV (GPS) RWY 09").circling_not_authorised_reason("E").startswith("Category E: ")
    assert x4cd.approach("RNP RWY 15").circling_not_authorised_reason("E") == \
        "no circling minimum published for category E"
    kinds = {s.kind for a in AIRFIELDS.values() for ap in a.approaches for s in ap.not_authorised_sectors}
    assert kinds == {"side", "bearings"}


def core_sector(a: Airfield, frame: geo.LocalFrame, s: Sector) -> Any:
    if s.kind == "bearings":
        th, _ = a.runway_by_designator(s.threshold)
        var = a.magnetic_variation_deg
        return geo.BearingSector(centre_m=frame.to_local(th.lat_deg, th.lon_deg),
                                 from_deg_true=s.from_deg_mag + var, to_deg_true=s.to_deg_mag + var)
    rw = a.runway(s.runway)
    return geo.side_of_centreline(frame.to_local(rw.threshold_a.lat_deg, rw.threshold_a.lon_deg),
                                  frame.to_local(rw.threshold_b.lat_deg, rw.threshold_b.lon_deg), s.side)


def test_sectors_hold_the_obstacles_that_explain_them() -> None:
    """Each sector holds an obstacle that the published MDA of some category would not clear by the
    required clearance: the reason circling there is not authorised."""
    for a in AIRFIELDS.values():
        frame = geo.LocalFrame(lat0_deg=a.reference_point.lat_deg, lon0_deg=a.reference_point.lon_deg)
        for ap in a.approaches:
            for s in ap.not_authorised_sectors:
                sector = core_sector(a, frame, s)
                inside = [o for o in a.obstacles if sector.contains(frame.to_local(o.lat_deg, o.lon_deg))]
                assert any(o.elevation_ft + cr.circling_obstacle_clearance_ft(m.category, criteria=ap.criteria)
                           .clearance_ft > m.mda_ft for o in inside for m in ap.circling
                           if m.mda_ft is not None), (a.ident, ap.name)


def test_circling_mdas_clear_the_obstacles_in_their_area() -> None:
    """MDA >= highest obstacle in the published area (sectors cut out) + the required clearance,
    and the height above the airport is at least the criteria's minimum (AIM 5-4-20; Doc 8168
    Table I-4-7-3 via briefer.core.criteria), and between 400 and 900 ft (realistic demo values)."""
    for a in AIRFIELDS.values():
        frame = geo.LocalFrame(lat0_deg=a.reference_point.lat_deg, lon0_deg=a.reference_point.lon_deg)
        centres = [frame.to_local(t.lat_deg, t.lon_deg) for t in a.thresholds]
        obstacles = [(o, frame.to_local(o.lat_deg, o.lon_deg)) for o in a.obstacles]
        for ap in a.approaches:
            excluded = tuple(core_sector(a, frame, s) for s in ap.not_authorised_sectors)
            for m in ap.circling:
                if m.mda_ft is None:
                    continue
                radius = cr.circling_area_radius_nm(m.category, criteria=ap.criteria, mda_ft_msl=m.mda_ft,
                                                    airport_elevation_ft=a.elevation_ft).radius_nm
                area = geo.ProtectedArea(centres_m=centres, radius_m=radius / M_TO_NM, excluded=excluded)
                inside = [o.elevation_ft for o, xy in obstacles if area.contains(xy)]
                clearance = cr.circling_obstacle_clearance_ft(m.category, criteria=ap.criteria).clearance_ft
                where = (a.ident, ap.name, m.category)
                assert not inside or m.mda_ft >= max(inside) + clearance - 1, where  # 1 ft: metric MOC
                haa = m.mda_ft - a.elevation_ft
                assert haa >= cr.minimum_circling_height_ft(m.category, criteria=ap.criteria).height_ft, where
                assert 400 <= haa <= 900, where


def test_visibility_units_follow_the_criteria() -> None:
    for a in AIRFIELDS.values():
        for ap in a.approaches:
            for m in ap.circling:
                if m.authorised:
                    assert (m.visibility_m is not None) == (ap.criteria == "icao"), (a.ident, ap.name)


# --- JSON Schemas -------------------------------------------------------------------------------------
def schema(kind: str) -> dict[str, Any]:
    return json.loads((SCHEMAS / f"{kind}.schema.json").read_text())


def _validator(root: dict[str, Any]) -> Any:
    """A draft 2020-12 validator of a schema (the `jsonschema` reference implementation)."""
    jsonschema = pytest.importorskip("jsonschema")
    jsonschema.Draft202012Validator.check_schema(root)
    return jsonschema.Draft202012Validator(root)


def schema_errors(value: Any, node: dict[str, Any], root: dict[str, Any] | None = None) -> list[str]:
    """Every way `value` fails the schema `node` (validated by `jsonschema`), as "path: message"."""
    return [f"${''.join(f'[{p!r}]' for p in e.absolute_path)}: {e.message}"
            for e in _validator(node).iter_errors(value)]


def keys_not_in_schema(value: Any, node: dict[str, Any], root: dict[str, Any] | None = None) -> list[str]:
    """The keys of `value` that the schema does not declare (its additionalProperties errors)."""
    return [f"${''.join(f'[{p!r}]' for p in e.absolute_path)}: {e.message}"
            for e in _validator(node).iter_errors(value) if e.validator in ("additionalProperties",
                                                                             "unevaluatedProperties")]


def test_schemas_are_draft_2020_12() -> None:
    for kind in (KIND_PROFILE, KIND_AIRFIELD, "scenario"):
        s = schema(kind)
        assert s["$schema"] == "https://json-schema.org/draft/2020-12/schema"
        _validator(s)            # a valid schema of that draft (jsonschema's meta-schema check)
    for kind in (KIND_PROFILE, KIND_AIRFIELD):
        s = schema(kind)
        assert s["properties"]["kind"] == {"const": kind, "description": f"What the file holds: always '{kind}'."}


def test_checked_in_schemas_are_the_generated_ones(tmp_path: Path) -> None:
    """Each format is declared once, with the model's fields; the checked-in schemas are what
    `python -m briefer.schemagen` writes from those declarations (run it after changing a model)."""
    from briefer import schemagen

    assert schemagen.stale() == []
    for kind in schemagen.GENERATED_KINDS:
        assert (SCHEMAS / f"{kind}.schema.json").read_text(encoding="utf-8") == schemagen.schema_text(kind)
    (tmp_path / f"{KIND_PROFILE}.schema.json").write_text("{}\n", encoding="utf-8")
    assert schemagen.main(["--check", "--folder", str(tmp_path)]) == 1
    assert schemagen.main(["--folder", str(tmp_path)]) == 0
    assert schemagen.main(["--check", "--folder", str(tmp_path)]) == 0
    assert json.loads((tmp_path / f"{KIND_PROFILE}.schema.json").read_text()) == schema(KIND_PROFILE)


def _declared_models(cls: Any) -> list[Any]:
    """A model class and every model nested in it (fields, lists, categories), once each."""
    from briefer.model import declared_fields

    out = [cls]
    for _, spec in declared_fields(cls):
        if spec.model is not None:
            out += [m for m in _declared_models(spec.model) if m not in out]
    return out


def _scenario() -> Any:
    from briefer.instructor.scenario_format import Scenario

    return Scenario


@pytest.mark.parametrize("kind, top", [(KIND_PROFILE, AircraftProfile), (KIND_AIRFIELD, Airfield),
                                       ("scenario", _scenario())])
def test_schema_ranges_and_choices_are_the_loaders(kind: str, top: Any) -> None:
    """The generated schema says what the loader checks: for every declared field of every model
    of the format, the same range, the same choices and the same help text."""
    from briefer.model import declared_fields

    root = schema(kind)
    seen = 0
    for cls in _declared_models(top):
        node = root if cls is top else root["$defs"][cls.__name__]
        assert [k for k in node["properties"] if k not in cls._extra_fields] == [
            k for k in cls.keys() if k != "category" and k not in cls._extra_fields], cls.__name__
        for key, (_, spec) in cls._extra_fields.items():     # a file key that is no field (altimeter_inhg)
            assert node["properties"][key]["minimum"] == spec.range.lo, key
        for f, spec in declared_fields(cls):
            prop = node["properties"][f.name]
            if spec.kind == "number":
                assert (prop["minimum"], prop["maximum"]) == (spec.range.lo, spec.range.hi), f.name
                seen += 1
            elif spec.kind == "choice":
                assert prop["enum"][:len(spec.choices)] == list(spec.choices), f.name
            assert prop.get("description", "") == spec.help, f.name
    assert seen >= {KIND_PROFILE: 15, KIND_AIRFIELD: 40, "scenario": 8}[kind]


@pytest.mark.parametrize("kind", [KIND_PROFILE, KIND_AIRFIELD])
def test_every_demo_key_is_in_the_schema_and_the_files_validate(kind: str) -> None:
    root = schema(kind)
    for t in builtin_files(kind):
        data = parse_yaml_mapping(t.read_bytes(), t.name).data
        assert keys_not_in_schema(data, root, root) == [], t.name
        assert schema_errors(data, root, root) == [], t.name


SCHEMA_DEFS = {KIND_PROFILE: {"": AircraftProfile, "WindAdditive": WindAdditive, "FamiliarPattern": FamiliarPattern,
                              "Configuration": Configuration},
               KIND_AIRFIELD: {"": Airfield, "LatLon": LatLon, "Threshold": Threshold, "Runway": Runway,
                               "RunwayPosition": RunwayPosition, "CrossingPoint": CrossingPoint,
                               "Obstacle": Obstacle, "Fix": Fix, "FinalApproachFix": Fix,
                               "CirclingMinimum": CirclingMinimum, "StraightInMinimum": CirclingMinimum,
                               "StraightIn": StraightIn, "Sector": Sector}}


@pytest.mark.parametrize("kind", [KIND_PROFILE, KIND_AIRFIELD])
def test_schema_properties_are_exactly_the_model_keys(kind: str) -> None:
    """The schemas and the loaders accept the same keys and require the same ones."""
    from briefer.model import Approach

    root = schema(kind)
    defs = dict(SCHEMA_DEFS[kind])
    if kind == KIND_AIRFIELD:
        defs["Approach"] = Approach
    for name, cls in defs.items():
        node = root if not name else root["$defs"][name]
        keys = [k for k in cls.keys() if k != "category"]
        assert list(node["properties"]) == keys, name
        required = [k for k in cls.required_keys() if k != "category"]
        if name == "":
            required = ["kind", *required]
        if name == "FinalApproachFix":
            required.append("altitude_ft")
        assert node["required"] == required, name
    assert set(root["$defs"]) == {n for n in defs if n}


SCHEMA_REJECTS = (
    # a key, a type, a range, a choice or a form: every bad file whose fault lies within one mapping
    "p-bank-range.yaml", "p-bool.yaml", "p-configs-not-list.yaml", "p-empty-configs.yaml", "p-familiar-both.yaml",
    "p-familiar-speed-only.yaml", "p-format-version.yaml", "p-infinite.yaml", "p-list-for-number.yaml",
    "p-missing-key.yaml", "p-null-value.yaml", "p-speed-range.yaml", "p-stall-warning.yaml",
    "p-unknown-key-no-match.yaml", "p-unknown-key.yaml", "p-unknown-top-key.yaml", "p-wrong-type.yaml",
    "a-bad-designator.yaml", "a-both-visibilities.yaml", "a-criteria.yaml", "a-elevation-range.yaml",
    "a-faf-altitude.yaml", "a-latitude-range.yaml", "a-na-with-mda.yaml", "a-no-runways.yaml",
    "a-sector-both-forms.yaml", "a-unknown-category.yaml",
    "../chart_files/c-bearing-without-from.yaml", "../chart_files/c-distance-unit.yaml",
    "../chart_files/c-half-coordinates.yaml", "../chart_files/c-heading-twice.yaml",
    "../chart_files/c-length-in-m-as-ft.yaml", "../chart_files/c-map-40nm.yaml",
    "../chart_files/c-map-distance-only.yaml", "../chart_files/c-missing-bearing.yaml",
    "../chart_files/c-no-length.yaml", "../chart_files/c-tdze-and-elevation.yaml")


@pytest.mark.parametrize("name", SCHEMA_REJECTS)
def test_schema_also_rejects_what_the_loader_rejects(name: str) -> None:
    """The generated schemas reject every bad test file the hand-kept ones rejected (the faults
    left to the loader alone are rules between mappings: a runway's bearing, a fix 60 NM away)."""
    data = parse_yaml_mapping((BAD / name).read_bytes(), name).data
    root = schema(data["kind"])
    assert schema_errors(data, root, root) != []
    with pytest.raises(DataFileError):
        load_any(BAD / name)


SHIPPED_AND_TEST_FILES = ("profiles/*.yaml", "airfields_demo/*.yaml", "scenarios/*.yaml", "tests/bad_files/good-*.yaml",
                          "tests/chart_files/good-*.yaml", "tests/chart_twins/*.yaml")


def test_every_shipped_and_test_data_file_validates_against_its_schema() -> None:
    """Each shipped file and each good test file validates (jsonschema, draft 2020-12) against the
    schema of its `kind`, so the schemas describe what the loaders accept."""
    seen = {}
    for pattern in SHIPPED_AND_TEST_FILES:
        files = sorted(ROOT.glob(pattern))
        assert files, pattern
        for path in files:
            data = parse_yaml_mapping(path.read_bytes(), path.name).data
            kind = data.get("kind", "scenario")
            assert schema_errors(data, schema(kind)) == [], path
            seen[kind] = seen.get(kind, 0) + 1
    assert set(seen) == {KIND_PROFILE, KIND_AIRFIELD, "scenario"}


def _number_leaves(value: Any, path: str = "") -> list[str]:
    """The dotted paths of every number in a file's mapping (as the loader names them)."""
    from briefer.model import join_path

    if isinstance(value, dict):
        return [p for k, v in value.items() for p in _number_leaves(v, join_path(path, str(k)))]
    if isinstance(value, list):
        return [p for i, v in enumerate(value) for p in _number_leaves(v, f"{path}[{i}]")]
    return [path] if isinstance(value, (int, float)) and not isinstance(value, bool) else []


def _set_leaf(data: Any, path: str, value: Any) -> Any:
    import copy

    out = copy.deepcopy(data)
    tokens = [t for t in re.split(r"\.|\[(\d+)\]", path) if t]
    node = out
    for tok in tokens[:-1]:
        node = node[int(tok)] if isinstance(node, list) else node[tok]
    last = tokens[-1]
    node[int(last) if isinstance(node, list) else last] = value
    return out


@pytest.mark.parametrize("name", ["tests/bad_files/good-profile.yaml", "tests/bad_files/good-airfield.yaml",
                                  "tests/chart_files/good-chart.yaml", "profiles/demo-bizjet.yaml",
                                  "scenarios/v2rl-low-visibility-by-hand.yaml"])
def test_loader_and_schema_refuse_the_same_out_of_range_numbers(name: str) -> None:
    """For every number of a good file: far out of range, or text, both the loader (naming that
    very field) and the generated schema refuse it. Both come from one declaration per field."""
    from briefer.instructor.scenario_format import Scenario
    from briefer.model import FieldError

    path_on_disk = ROOT / name
    data = parse_yaml_mapping(path_on_disk.read_bytes(), path_on_disk.name).data
    kind = data.get("kind", "scenario")
    model = {KIND_PROFILE: AircraftProfile, KIND_AIRFIELD: Airfield, "scenario": Scenario}[kind]
    check = _validator(schema(kind))
    leaves = _number_leaves(data)
    assert leaves
    for leaf in leaves:
        for bad in (1e12, "seven"):
            mutated = _set_leaf(data, leaf, bad)
            assert not check.is_valid(mutated), (leaf, bad)
            with pytest.raises(FieldError) as info:
                model.from_mapping(mutated)
            assert info.value.context == leaf, (leaf, bad, str(info.value))
