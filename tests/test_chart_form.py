"""Chart numbers in the airfield format: the plane geometry (against geographiclib), the local
frame, the loader's messages for chart-form mistakes, the JSON Schema, the draft API the forms
use, and the `new-airfield` skeleton.

Sources: geographiclib's direct geodesic problem on WGS-84 (C. F. F. Karney, "Algorithms for
geodesics," J. Geodesy 87, 2013) for where a distance and a bearing lead; hand-worked plane
geometry for the crossing runways. The messages and plausibility limits are our own rules
(briefer/model.py, briefer/core/layout.py).
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest
from geographiclib.geodesic import Geodesic

from briefer.brief import build_brief
from briefer.cli import main
from briefer.core import layout as lay
from briefer.errors import DataFileError
from briefer.io import catalog, drafts
from briefer.io.skeleton import AIRFIELD_SKELETON, filled_example
from briefer.io.yamlload import load_airfield, load_any, load_bytes, parse_yaml_mapping
from briefer.model import Airfield, BriefRequest, Weather
from briefer.render.card_text import card_text
from briefer.units import FT_TO_M, NM_TO_M
from briefer.vocabulary import PLAN_SHAPES

HERE = Path(__file__).parent
FILES = HERE / "chart_files"
TWINS = HERE / "chart_twins"
WGS84 = Geodesic.WGS84


@pytest.fixture
def in_chart_files(monkeypatch: pytest.MonkeyPatch) -> Path:
    monkeypatch.chdir(FILES)
    return FILES


# --- plane geometry --------------------------------------------------------------------------------
def test_point_at_and_before_on_course_by_hand() -> None:
    # 1000 m on 090: 1000 m east; 2 NM before a point on course 180 (flying south): 2 NM north of it
    assert lay.point_at((0.0, 0.0), 1000.0, 90.0) == pytest.approx((1000.0, 0.0), abs=1e-9)
    assert lay.before_on_course((10.0, 20.0), 2 * NM_TO_M, 180.0) == pytest.approx((10.0, 20.0 + 2 * NM_TO_M))
    # far threshold of a 3000 m runway on 045: 3000 / sqrt(2) each way
    assert lay.far_threshold((0.0, 0.0), 3000.0, 45.0) == pytest.approx((3000 / math.sqrt(2),) * 2)
    # centrelines crossing 1000 m along 090 from K at the origin and 500 m along 360 from N: N = (1000, -500)
    assert lay.crossing_threshold((0.0, 0.0), 90.0, 1000.0, 0.0, 500.0) == pytest.approx((1000.0, -500.0))


def test_crossing_runways_by_hand(in_chart_files: Path) -> None:
    """good-chart.yaml: 09/27 on 090 true (085 M + 5 E), 6000 ft from the origin at threshold 09;
    18/36 on 180 true, crossing 3000 ft from threshold 09 and 2000 ft from threshold 18. Hand:
    the crossing is (3000 ft, 0); threshold 18 is 2000 ft north of it, threshold 36 5000 ft
    south of 18."""
    af = load_airfield("good-chart.yaml")
    t = af.layout.thresholds_m
    assert t["09"] == pytest.approx((0.0, 0.0), abs=1e-9)
    assert t["27"] == pytest.approx((6000 * FT_TO_M, 0.0), abs=1e-6)
    assert t["18"] == pytest.approx((3000 * FT_TO_M, 2000 * FT_TO_M), abs=1e-6)
    assert t["36"] == pytest.approx((3000 * FT_TO_M, -3000 * FT_TO_M), abs=1e-6)
    assert af.layout.origin == "threshold 09" and not af.layout.georeferenced


@pytest.mark.parametrize(("lat0", "lon0"), [(64.05, 23.64), (36.92, -107.6), (-45.0, 170.0)])
@pytest.mark.parametrize("arp_to_threshold", [(0.0, 0.0), (5000.0, 300.0), (6000.0, 90.0)])
def test_distance_and_bearing_land_where_the_geodesic_does(lat0: float, lon0: float,
                                                           arp_to_threshold: tuple[float, float]) -> None:
    """A point at a distance and a true bearing from a threshold, placed in the local frame,
    against geographiclib's direct geodesic from the threshold's latitude/longitude: within
    0.05 m per km out to 20 NM (the frame's own shortening and the first-order convergence left;
    measured about 0.01 m per km)."""
    obstacles = [{"name": f"o{d}-{b}", "from_point": "13", "distance_nm": d, "bearing_deg_true": b,
                  "elevation_ft": 500} for d in (0.3, 1, 3, 6, 12, 20) for b in range(0, 360, 30)]
    af = Airfield.from_mapping({
        "ident": "T3GE", "name": "geodesic test", "reference_point": {"lat_deg": lat0, "lon_deg": lon0},
        "elevation_ft": 100, "magnetic_variation_deg": 0,
        "runways": [{"threshold_a": {"designator": "13", "elevation_ft": 100},
                     "threshold_b": {"designator": "31", "elevation_ft": 100}, "heading_deg_true": 130,
                     "length_ft": 8000, "position": {"from_point": "ARP", "distance_m": arp_to_threshold[0],
                                                     "bearing_deg_true": arp_to_threshold[1]}}],
        "obstacles": obstacles,
        "approaches": [{"name": "A", "final_course_deg_mag": 130, "criteria": "icao",
                        "faf": {"name": "F", "distance_nm": 5, "altitude_ft": 2000},
                        "map_fix": {"name": "M", "threshold": "13"},
                        "circling": {"A": {"mda_ft": 700, "visibility_m": 1500}}}]})
    frame = af.layout.frame
    t_lat, t_lon = frame.to_geodetic(*af.layout.thresholds_m["13"])
    arp_d = WGS84.Inverse(lat0, lon0, float(t_lat), float(t_lon))["s12"]
    assert arp_d == pytest.approx(arp_to_threshold[0], abs=0.05 + 1e-4 * arp_to_threshold[0])
    for ob, p in zip(af.obstacles, af.layout.obstacles_m):
        r = WGS84.Direct(float(t_lat), float(t_lon), ob.bearing_deg_true, ob.distance_nm * NM_TO_M)
        e, n = frame.to_local(r["lat2"], r["lon2"])
        km = ob.distance_nm * NM_TO_M / 1000.0
        assert math.hypot(e - p[0], n - p[1]) < 0.05 * km, ob.name


def test_chart_twin_positions_match_the_demo_coordinates() -> None:
    """The georeferenced twin (Qorvel Mesa) puts every threshold, fix and obstacle where the
    demo file's coordinates are, within what the chart's rounding allows: 1 ft and 0.1 deg on
    runway positions (a few metres), 0.1 NM on the FAF distance (93 m)."""
    demo = load_airfield(Path(str(catalog.builtin_files("airfield")[0])).parent / "q7hm-qorvel-mesa.yaml")
    twin = load_airfield(TWINS / "q7hm-qorvel-mesa-chart.yaml")
    for d, p in demo.layout.thresholds_m.items():
        assert math.dist(p, twin.layout.thresholds_m[d]) < 10.0, d
    for p, q in zip(demo.layout.obstacles_m, twin.layout.obstacles_m):
        assert math.dist(p, q) < 10.0
    for name, (faf, mapf) in demo.layout.fixes_m.items():
        assert math.dist(mapf, twin.layout.fixes_m[name][1]) < 10.0, name
        assert math.dist(faf, twin.layout.fixes_m[name][0]) < 0.05 * NM_TO_M + 10.0, name


# --- the loader's messages ---------------------------------------------------------------------------
CASES = [
    ("c-map-40nm.yaml", "c-map-40nm.yaml:26: approaches[0].map_fix.distance_nm: expected a number in nautical "
     "miles between 0 and 30, got 40 (or give distance_ft or distance_m)"),
    ("c-faf-far.yaml", "c-faf-far.yaml:25: approaches[0].faf: the fix would be 33.0 NM from threshold 09; expected "
     "within 30 NM (check its distance, its bearing and the final course)"),
    ("c-crossing-beyond.yaml", "c-crossing-beyond.yaml:17: runways[1].crossing[0]: runways 09/27 and 18/36 cannot "
     "cross 7000 ft from threshold 09: runway 09/27 is only 6000 ft (1829 m) long"),
    ("c-crossing-parallel.yaml", "c-crossing-parallel.yaml:16: runways[1].crossing: runways 09/27 and 10/28 are 7 "
     "degrees apart: near-parallel centrelines do not cross at a usable point; place the runway by 'position' "
     "(a distance and a bearing from a threshold)"),
    ("c-crossing-own-only.yaml", "c-crossing-own-only.yaml:16: runways[1].crossing: expected one threshold of this "
     "runway (18, 36) and one of a runway listed before it, got 36, 18"),
    ("c-heading-other-end.yaml", "c-heading-other-end.yaml:10: runways[0].heading_deg_mag: expected a heading within "
     "15 degrees of 090 magnetic for designator '09' (threshold_a), got 265 (that is the heading of the other "
     "end, '27')"),
    ("c-heading-twice.yaml", "c-heading-twice.yaml:11: runways[0].heading_deg_true: give either heading_deg_mag or "
     "heading_deg_true, not both"),
    ("c-no-length.yaml", "c-no-length.yaml:8: runways[0]: missing the length: give length_ft or length_m"),
    ("c-length-in-m-as-ft.yaml", "c-length-in-m-as-ft.yaml:11: runways[0].length_ft: expected a number in feet "
     "between 984 and 19685, got 600 (or give length_m)"),
    ("c-distance-unit.yaml", "c-distance-unit.yaml:20: obstacles[0].distance_nm: expected a number in nautical miles "
     "between 0 and 30, got 7300 (or give distance_ft or distance_m)"),
    ("c-latlon-no-reference.yaml", "c-latlon-no-reference.yaml:20: obstacles[0]: latitude/longitude need the "
     "airfield's reference_point (or give the position from the chart: from_point, distance_nm and "
     "bearing_deg_mag)"),
    ("c-from-unknown.yaml", "c-from-unknown.yaml:20: obstacles[0].from_point: no threshold '22' at this airfield "
     "(placed so far: 09, 27, 18, 36)"),
    ("c-from-arp-no-reference.yaml", "c-from-arp-no-reference.yaml:20: obstacles[0].from_point: there is no "
     "reference point to measure from: give the airfield's reference_point, or measure from a threshold"),
    ("c-bearing-without-from.yaml", "c-bearing-without-from.yaml:20: obstacles[0].bearing_deg_mag: bearing_deg_mag "
     "needs from_point (the threshold or ARP it is measured from)"),
    ("c-missing-bearing.yaml", "c-missing-bearing.yaml:20: obstacles[0]: missing the bearing: give bearing_deg_mag "
     "or bearing_deg_true (from the point named in from_point)"),
    ("c-map-distance-only.yaml", "c-map-distance-only.yaml:26: approaches[0].map_fix: a distance alone places the "
     "final approach fix before the missed approach point; give the missed approach point by threshold (at it, or "
     "distance_nm before it) or by from_point with distance_nm and bearing_deg_mag"),
    ("c-no-position.yaml", "c-no-position.yaml:12: runways[1]: missing the position: place this runway from one "
     "listed before it, by 'position' (a threshold at a distance and a bearing from another threshold) or "
     "'crossing' (where the two centrelines cross)"),
    ("c-first-runway-with-arp.yaml", "c-first-runway-with-arp.yaml:9: runways[0]: missing the position: with a "
     "reference_point, say where the runway lies from it (position: {threshold: '09', from_point: ARP, "
     "distance_ft: ..., bearing_deg_mag: ...}), or leave the reference point out"),
    ("c-half-coordinates.yaml", "c-half-coordinates.yaml:9: runways[0].threshold_b: missing lat_deg and lon_deg "
     "(threshold_a has them): give both thresholds' coordinates, or neither and the runway's heading and length"),
    ("c-tdze-and-elevation.yaml", "c-tdze-and-elevation.yaml:9: runways[0].threshold_b.tdze_ft: give either "
     "elevation_ft or tdze_ft, not both"),
    ("c-displaced-too-long.yaml", "c-displaced-too-long.yaml:9: runways[0].threshold_b.displaced_threshold_m: the "
     "displaced thresholds (0 m and 1700 m) leave 129 m between the landing thresholds of a 1829 m runway; "
     "expected at least 300 m"),
]


@pytest.mark.parametrize(("name", "message"), [pytest.param(n, m, id=n) for n, m in CASES])
def test_chart_mistake_gives_one_exact_error(in_chart_files: Path, name: str, message: str) -> None:
    with pytest.raises(DataFileError) as info:
        load_any(name)
    assert str(info.value) == message


def test_every_chart_fixture_is_in_the_table() -> None:
    on_disk = {p.name for p in FILES.iterdir() if p.name != "good-chart.yaml"}
    assert on_disk == {n for n, _ in CASES}


@pytest.mark.parametrize("name", [n for n, _ in CASES])
def test_check_command_reports_it_with_exit_2(in_chart_files: Path, name: str,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["check", name]) == 2
    assert capsys.readouterr().out.strip() == dict(CASES)[name]


# --- the local frame in the brief and on the card --------------------------------------------------
def test_a_local_frame_airfield_briefs_and_says_so(in_chart_files: Path) -> None:
    af = load_airfield("good-chart.yaml")
    prof = catalog.find_profile("demo-twin", use_config=False)   # category B: the file publishes A-D (E gets no plan, issue 11 item 7)
    brief = build_brief(BriefRequest(profile=prof, airfield=af, approach="VOR-A", landing_runway="27",
                                     weather=Weather()))
    notes = [f for f in brief.warnings if f.code == "local-frame"]
    assert len(notes) == 1 and "threshold 09" in notes[0].text and "not tied to the earth" in notes[0].text
    assert "local frame" in card_text(brief)
    assert brief.plan.feasible and brief.plan.shape in PLAN_SHAPES and brief.plan.side in ("left", "right")


# --- schema --------------------------------------------------------------------------------------------
SCHEMA_REJECTS = ["c-heading-twice.yaml", "c-no-length.yaml", "c-length-in-m-as-ft.yaml", "c-distance-unit.yaml",
                  "c-bearing-without-from.yaml", "c-missing-bearing.yaml", "c-tdze-and-elevation.yaml",
                  "c-map-40nm.yaml", "c-map-distance-only.yaml"]


def test_chart_files_validate_against_the_schema_and_the_schema_rejects_form_mistakes() -> None:
    from test_demo_data import keys_not_in_schema, schema, schema_errors

    root = schema("airfield")
    good = [FILES / "good-chart.yaml", *sorted(TWINS.glob("*.yaml"))]
    for path in good:
        data = parse_yaml_mapping(path.read_bytes(), path.name).data
        assert keys_not_in_schema(data, root, root) == [], path.name
        assert schema_errors(data, root, root) == [], path.name
    ex = filled_example("airfield")
    assert schema_errors(ex, root, root) == []
    for name in SCHEMA_REJECTS:
        data = parse_yaml_mapping((FILES / name).read_bytes(), name).data
        assert schema_errors(data, root, root) != [], name


# --- the draft API (what the app's forms use) -----------------------------------------------------------
def test_parse_scalar_reads_as_the_loader_does() -> None:
    assert [drafts.parse_scalar(t) for t in ("093.2", "09", "true", "NA", "", " 6012 ", "'13'")] == [
        93.2, 9, True, "NA", None, 6012, "13"]


def test_field_message_is_the_loaders_message_for_that_field() -> None:
    d = {"runways": [{"threshold_a": {"designator": "13"}, "heading_deg_mag": 400}]}
    assert drafts.field_message("airfield", d, "runways[0].heading_deg_mag") == (
        "expected a number in degrees magnetic between 0 and 360, got 400 (or give heading_deg_true)")
    assert drafts.field_message("airfield", d, "runways[0].threshold_a.designator") is None
    d["runways"][0]["threshold_a"]["designator"] = "9X"
    assert drafts.field_message("airfield", d, "runways[0].threshold_a.designator") == (
        "expected a runway designator such as '09' or '27L', got '9X'")
    m = {"approaches": [{"map_fix": {"name": "V", "from_point": "13", "distance_nm": 6000}}]}
    assert drafts.field_message("airfield", m, "approaches[0].map_fix.distance_nm") == (
        "expected a number in nautical miles between 0 and 30, got 6000 (or give distance_ft or distance_m)")
    assert drafts.field_message("airfield", {"approaches": [{"circling": {"B": {"mda_ft": "x"}}}]},
                                "approaches[0].circling.B.mda_ft") == "expected a number in feet, got 'x'"
    assert drafts.field_message("aircraft-profile", {"configurations": [{"vref_kt": "fast"}]},
                                "configurations[0].vref_kt") == "expected a number in knots, got 'fast'"


def test_draft_error_names_the_field_of_a_cross_field_rule() -> None:
    ex = filled_example("airfield")
    assert drafts.draft_error("airfield", ex) is None
    ex["runways"][1]["crossing"][0]["distance_ft"] = 7500
    err = drafts.draft_error("airfield", ex)
    assert err is not None and err.context == "runways[1].crossing[0]"
    assert err.message.startswith("runways 09/27 and 18/36 cannot cross 7500 ft from threshold 09")


@pytest.mark.parametrize("path", [FILES / "good-chart.yaml", *sorted(TWINS.glob("*.yaml"))],
                         ids=lambda p: p.name)
def test_save_load_save_is_byte_identical(path: Path) -> None:
    model = load_airfield(path)
    first = drafts.draft_yaml("airfield", model.to_mapping())
    again = drafts.draft_yaml("airfield", load_bytes(first.encode(), file="saved.yaml"))
    assert first == again
    assert load_bytes(first.encode(), file="saved.yaml") == model
    assert ".0\n" not in first.replace("glide_path_deg: 3.2", "")   # whole numbers written as typed


# --- the skeleton ---------------------------------------------------------------------------------------
FILL = {
    "ident": ["T3SK"], "name": ["Skeleton Field", "tower", "VOR-A", "SKFAF", "SKVOR"],
    "elevation_ft": [800, 800, 790, 1310], "magnetic_variation_deg": [-3],
    "designator": ["'04'", "'22'"], "heading_deg_mag": [41.5], "length_ft": [5500], "width_m": [30],
    "from_point": ["'04'"], "distance_nm": [1.5, 5.2], "bearing_deg_mag": [300],
    "runway": [""], "final_course_deg_mag": [60], "criteria": ["terps-expanded"], "altitude_ft": [2500],
    "threshold": ["'04'"], "missed_approach": ["Climb to 3000 direct SKVOR and hold."],
}
MINIMUMS = {"A": "{mda_ft: 1400, visibility_sm: 1}", "B": "{mda_ft: 1400, visibility_sm: 1.25}",
            "C": "{mda_ft: 1460, visibility_sm: 2}", "D": "{mda_ft: 1500, visibility_sm: 2.25}"}


def fill_skeleton(text: str) -> str:
    """Type values into the skeleton's empty fields, in order, keeping its comments."""
    queues = {k: list(v) for k, v in FILL.items()}
    out = []
    for line in text.splitlines():
        m = re.match(r"^(\s*(?:- )?)([a-z_]+|[A-E]):(\s*)(\{[^}]*\})?(\s*#.*)?$", line)
        if m and not line.lstrip().startswith("#"):
            key = m.group(2)
            if key in MINIMUMS and m.group(4):
                line = f"{m.group(1)}{key}: {MINIMUMS[key]}{m.group(5) or ''}"
            elif key in queues and queues[key] and not m.group(4):
                value = queues[key].pop(0)
                line = f"{m.group(1)}{key}: {value}{m.group(3) or ' '}{m.group(5) or ''}".rstrip()
        out.append(line)
    assert all(not q for q in queues.values()), {k: q for k, q in queues.items() if q}
    return "\n".join(out) + "\n"


def test_new_airfield_prints_the_skeleton(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["new-airfield"]) == 0
    assert capsys.readouterr().out == AIRFIELD_SKELETON


def test_the_skeleton_unfilled_fails_check_with_a_line_and_field(tmp_path: Path,
                                                                  capsys: pytest.CaptureFixture[str]) -> None:
    path = tmp_path / "mine.yaml"
    assert main(["new-airfield", "--out", str(path)]) == 0
    capsys.readouterr()
    assert main(["check", str(path)]) == 2
    line = capsys.readouterr().out.strip()
    assert re.fullmatch(rf"{re.escape(str(path))}:\d+: [a-z_\[\]0-9.]+: expected .*got an empty value", line), line


def test_new_airfield_keeps_an_existing_file(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    path = tmp_path / "mine.yaml"
    path.write_text("mine\n")
    code = main(["new-airfield", "--out", str(path)])
    assert code == 2 and path.read_text() == "mine\n"
    assert "exists" in capsys.readouterr().err


def test_the_skeleton_filled_in_passes_check_and_briefs(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    path = tmp_path / "t3sk.yaml"
    path.write_text(fill_skeleton(AIRFIELD_SKELETON))
    assert main(["check", str(path)]) == 0, capsys.readouterr().out
    assert capsys.readouterr().out.strip() == (f"{path}: OK: airfield T3SK 'Skeleton Field' (1 runway, 1 approach, "
                                               "1 obstacle), in a local frame from threshold 04")
    af = load_airfield(path)
    assert af.reference_point is None and af.approaches[0].circling_only
    assert af.layout.fixes_m["VOR-A"][1] == pytest.approx((0.0, 0.0))
    assert main(["brief", "--profile", "demo-trainer", "--airfield", str(path), "--approach", "VOR-A",
                 "--runway", "22"]) == 0
    assert "local frame" in capsys.readouterr().out


def test_positions_and_fixes_of_the_example_by_hand() -> None:
    """The forms' example airfield (variation 4 E): 09/27 on 090 true from the origin, 7000 ft;
    threshold 04 1500 ft from threshold 27 on 204 true; the MAP 0.5 NM before threshold 27 on the
    final course 270 true (so 0.5 NM east of it), the FAF 5 NM before that; the NDB 2500 ft from
    threshold 09 on 124 true."""
    af = Airfield.from_mapping(filled_example("airfield"))
    t, fixes = af.layout.thresholds_m, af.layout.fixes_m
    t27 = (7000 * FT_TO_M, 0.0)
    assert t["27"] == pytest.approx(t27, abs=1e-6)
    b = math.radians(204.0)
    assert t["04"] == pytest.approx((t27[0] + 1500 * FT_TO_M * math.sin(b), 1500 * FT_TO_M * math.cos(b)), abs=1e-6)
    faf, mapf = fixes["VOR RWY 27"]
    assert mapf == pytest.approx((t27[0] + 0.5 * NM_TO_M, 0.0), abs=1e-6)
    assert faf == pytest.approx((t27[0] + 5.5 * NM_TO_M, 0.0), abs=1e-6)
    b = math.radians(124.0)
    assert fixes["NDB-A"][1] == pytest.approx((2500 * FT_TO_M * math.sin(b), 2500 * FT_TO_M * math.cos(b)), abs=1e-6)


def test_position_may_place_the_far_threshold_and_the_length_is_end_to_end() -> None:
    """A runway placed by its threshold B; its charted length is end to end, so a displaced
    threshold A (300 m) sits 300 m inside the runway end: the landing thresholds are
    length - 300 m apart, and the runway end (core.geometry.runway_end_xy) is where the chart's
    length puts it."""
    from briefer.core.geometry import runway_end_xy

    data = filled_example("airfield")
    rw = data["runways"][2]
    rw["position"] = {"threshold": "22", "from_point": "27", "distance_ft": 1500, "bearing_deg_mag": 200.0}
    rw["threshold_a"]["displaced_threshold_m"] = 300
    af = Airfield.from_mapping(data)
    t = af.layout.thresholds_m
    t27 = (7000 * FT_TO_M, 0.0)
    b = math.radians(204.0)
    assert t["22"] == pytest.approx((t27[0] + 1500 * FT_TO_M * math.sin(b), 1500 * FT_TO_M * math.cos(b)), abs=1e-6)
    assert math.dist(t["04"], t["22"]) == pytest.approx(4000 * FT_TO_M - 300.0, abs=1e-6)
    assert af.runways[2].end_to_end_m == pytest.approx(4000 * FT_TO_M)
    end = runway_end_xy(t["04"], t["22"], 300.0)
    assert math.dist(end, t["22"]) == pytest.approx(4000 * FT_TO_M, abs=1e-6)
    h = math.radians(44.0)     # 040 M + 4 E: from 04 toward 22
    assert (t["22"][0] - t["04"][0], t["22"][1] - t["04"][1]) == pytest.approx(
        ((4000 * FT_TO_M - 300) * math.sin(h), (4000 * FT_TO_M - 300) * math.cos(h)), abs=1e-6)
