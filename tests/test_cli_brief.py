"""`briefer brief`: the command's wiring (STYLE F: no numbers re-checked here).

The demo text carries the warnings header and every caution; --json is the stable
"briefer.brief/1" form and parses as strict JSON; a --metar report fills the weather and explicit
options override it; bad inputs are one line on stderr with exit code 2 and no traceback.
The METAR reports below are invented (station V2RL is a demo airfield).
"""

from __future__ import annotations

import json
import re

import pytest

from briefer.cautions import CAUTIONS
from briefer.cli import main
from cli_helpers import run_error

# Invented reports for the demo airfield (wind true, as a METAR gives it).
METAR = "METAR V2RL 121250Z 30008KT 5SM BKN014 M02/M05 A2992"
METAR_GUSTY_VARIABLE = "METAR V2RL 121250Z 30012G22KT 260V330 5SM BKN014 M02/M05 A2992"

ISSUE_4_KEYS = {"schema", "category", "mda_ft", "height_above_airport_ft", "area", "tas_kt", "plan",
                "sight_picture", "missed_approach", "warnings", "cautions"}


def run_text(capsys, argv: list[str]) -> str:
    code = main(argv)
    out, err = capsys.readouterr()
    assert code == 0, err
    assert err == ""
    return out


def run_json(capsys, argv: list[str]) -> dict:
    out = run_text(capsys, [*argv, "--json"])
    return json.loads(out, parse_constant=lambda c: pytest.fail(f"non-standard JSON constant {c}"))




def flat(text: str) -> str:
    """Text with the panel borders removed and all white space collapsed (Rich wraps lines)."""
    return re.sub(r"\s+", " ", re.sub(r"[│╭╮╰╯─]", " ", text)).strip()


# A wind faster than the twin's circling TAS down runway 27: no plan can be flown.
NO_PLAN = ["brief", "--profile", "demo-twin", "--airfield", "V2RL", "--approach", "RNAV (GPS) RWY 09", "--runway", "27",
           "--wind", "263/110"]


# --- text ------------------------------------------------------------------------------------------
def test_demo_text_has_warnings_and_every_caution(capsys):
    out = run_text(capsys, ["brief", "--demo"])
    assert "WARNINGS" in out and "CAUTIONS" in out
    assert out.index("WARNINGS") < out.index("MINIMUMS AND AREA")     # warnings come first
    text = flat(out)
    for caution in CAUTIONS:
        assert flat(caution) in text, caution
    assert "V2RL" in out and "circle to land 27" in out
    assert "Traceback" not in out


def test_text_marks_severity_by_words_not_colour_alone(capsys):
    out = run_text(capsys, ["brief", "--demo", "--ceiling-ft", "500"])
    assert "!! DANGER" in out                       # ceiling below the HAA (740 ft)
    assert "WARNING" in out


def test_no_arguments_means_the_demo(capsys):
    assert run_json(capsys, ["brief"])["airfield"]["ident"] == "V2RL"


# --- JSON ------------------------------------------------------------------------------------------
def test_demo_json_keys_and_cautions(capsys):
    d = run_json(capsys, ["brief", "--demo"])
    assert ISSUE_4_KEYS <= d.keys()
    assert d["schema"] == "briefer.brief/1"
    assert d["cautions"] == list(CAUTIONS)
    assert (d["airfield"]["ident"], d["approach"], d["landing_runway"]) == ("V2RL", "RNAV (GPS) RWY 09", "27")
    assert d["profile"] == "demo-bizjet"
    assert {"radius_nm", "criteria"} <= d["area"].keys()
    assert {"offset_nm", "bank_deg", "track", "inside_area"} <= d["plan"].keys()


def test_json_of_a_brief_with_no_plan_is_strict(capsys):
    """NaN fields (no flyable plan) become null, never a bare NaN."""
    d = run_json(capsys, NO_PLAN)
    assert d["plan"]["feasible"] is False and d["plan"]["offset_nm"] is None


# --- weather from a report, and overrides ----------------------------------------------------------
def test_metar_fills_the_weather(capsys):
    d = run_json(capsys, ["brief", "--demo", "--metar", METAR])
    w, wx = d["wind"], d["weather"]
    assert wx["source"] == "report" and wx["report"] == METAR
    assert (w["from_deg_true"], w["speed_kt"], w["gust_kt"]) == (300.0, 8.0, None)
    assert (wx["oat_c"], wx["visibility_sm"], wx["ceiling_ft"]) == (-2.0, 5.0, 1400.0)
    assert d["cold_temperature"] is not None        # -2 degC: at or below 0 degC


def test_metar_replaces_the_demo_weather_wholesale(capsys):
    """A report without a ceiling must not keep the demo's 1100 ft ceiling."""
    d = run_json(capsys, ["brief", "--demo", "--metar", "METAR V2RL 121250Z 30008KT 5SM SCT030 10/05 A2992"])
    assert d["weather"]["ceiling_ft"] is None and d["ceiling_reported_ft"] is None


def test_metar_variable_sector_becomes_a_finding(capsys):
    d = run_json(capsys, ["brief", "--demo", "--metar", METAR_GUSTY_VARIABLE])
    codes = {w["code"] for w in d["warnings"]}
    assert "variable-wind-sector" in codes
    assert d["wind"]["gust_kt"] == 22.0


def test_explicit_options_override_the_report(capsys):
    d = run_json(capsys, ["brief", "--demo", "--metar", METAR, "--wind", "250/6", "--oat-c", "5",
                          "--visibility-sm", "3", "--altimeter-hpa", "1020"])
    w, wx = d["wind"], d["weather"]
    assert (w["from_deg_true"], w["speed_kt"], w["gust_kt"]) == (250.0, 6.0, None)
    assert (wx["oat_c"], wx["visibility_sm"], wx["altimeter_hpa"]) == (5.0, 3.0, 1020.0)
    assert wx["ceiling_ft"] == 1400.0               # not overridden: still the report's
    assert d["cold_temperature"] is None            # +5 degC
    assert wx["report"] == METAR


def test_magnetic_wind_is_turned_to_true(capsys):
    """--wind-is magnetic: 270 M at V2RL (variation 8.5 W, file) is 261.5 T."""
    d = run_json(capsys, ["brief", "--demo", "--wind", "270/10", "--wind-is", "magnetic"])
    assert d["wind"]["from_deg_true"] == 261.5


def test_situation_options_reach_the_request(capsys):
    d = run_json(capsys, ["brief", "--profile", "demo-twin", "--airfield", "Q7HM", "--approach", "VOR-A",
                          "--runway", "13", "--bank-deg", "25", "--criteria", "terps-expanded", "--wind", "calm"])
    assert d["profile"] == "demo-twin" and d["approach"] == "VOR-A" and d["landing_runway"] == "13"
    assert d["area"]["criteria"] == "terps-expanded"
    assert d["performance"]["bank_target_deg"] == 25.0


# --- errors ----------------------------------------------------------------------------------------
@pytest.mark.parametrize(("argv", "words"), [
    pytest.param(["--demo", "--airfield", "NOPE"], "no airfield named 'NOPE'", id="unknown-airfield"),
    pytest.param(["--demo", "--approach", "ILS Z RWY 99"], "has no approach", id="unknown-approach"),
    pytest.param(["--demo", "--runway", "18"], "has no runway '18'", id="unknown-runway"),
    pytest.param(["--demo", "--profile", "no-such-aircraft"], "no aircraft profile", id="unknown-profile"),
    pytest.param(["--demo", "--wind", "9x9"], "cannot read the wind", id="bad-wind"),
    pytest.param(["--demo", "--metar", "garbage"], "cannot decode METAR", id="bad-metar"),
    pytest.param(["--profile", "demo-twin"], "missing --airfield", id="incomplete-situation"),
    pytest.param(["--demo", "--oat-c", "hot"], "expected a number", id="bad-number"),
    pytest.param(["--demo", "--weight-lb", "1"], "weight", id="weight-out-of-range"),
])
def test_bad_inputs_are_one_line_exit_2(capsys, argv, words):
    line = run_error(capsys, ["brief", *argv])
    assert words in line
    assert line.startswith("briefer brief: error:")


# --- how the text reads for a pilot -----------------------------------------------------------------


def test_text_of_a_brief_without_a_plan_prints_no_nan(capsys):
    """A plan that cannot be flown has no offset or timing: no 'nan' on the screen."""
    out = run_text(capsys, NO_PLAN)
    assert "nan" not in out.lower()


def test_missed_approach_line_does_not_repeat_itself(capsys):
    out = flat(run_text(capsys, NO_PLAN))
    assert "toward the runway toward the runway" not in out.lower()


def test_icao_visibility_is_shown_as_charted(capsys):
    """X4CD (ICAO) charts Cat C circling visibility as 3700 m (X4CD file): the pilot compares with
    the chart, so the brief shows the charted value and unit."""
    out = run_text(capsys, ["brief", "--profile", "demo-bizjet", "--airfield", "X4CD", "--approach",
                            "VOR RWY 33", "--runway", "15", "--wind", "calm"])
    assert "3700 m" in out


def test_demo_with_a_typed_wind_keeps_the_rest_of_the_demo_weather(capsys):
    """Issue 11 item 2: `--demo --wind 090/30` overrides the demo's wind only; its temperature
    (9 degC), altimeter (1009 hPa), visibility (3 SM) and ceiling (1100 ft) stay (briefer.demo)."""
    d = run_json(capsys, ["brief", "--demo", "--wind", "090/30"])
    w, wx = d["wind"], d["weather"]
    assert (w["from_deg_true"], w["speed_kt"], w["gust_kt"]) == (90.0, 30.0, None)
    assert (wx["oat_c"], wx["altimeter_hpa"], wx["visibility_sm"], wx["ceiling_ft"]) == (9.0, 1009.0, 3.0, 1100.0)
    codes = {f["code"] for f in d["warnings"]}
    assert not codes & {"oat-assumed", "altimeter-assumed"}


def test_demo_with_a_typed_temperature_keeps_the_demo_wind(capsys):
    """Issue 11 item 2: `--demo --oat-c -5` keeps the demo's 240/10G16 (true), so the circling speed
    (with the profile's wind additive) is the demo's own."""
    demo = run_json(capsys, ["brief", "--demo"])
    d = run_json(capsys, ["brief", "--demo", "--oat-c", "-5"])
    w = d["wind"]
    assert (w["from_deg_true"], w["speed_kt"], w["gust_kt"]) == (240.0, 10.0, 16.0)
    assert d["weather"]["oat_c"] == -5.0
    assert (d["weather"]["altimeter_hpa"], d["weather"]["ceiling_ft"]) == (1009.0, 1100.0)
    assert d["circling_speed_kt"] == demo["circling_speed_kt"]
    assert d["wind_additive_kt"] == demo["wind_additive_kt"] > 0
