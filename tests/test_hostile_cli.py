"""Hostile command lines, reports and outputs: ranges, non-finite values, ASCII terminals,
wind strings, METAR plausibility, zero visibility, check and brief agreeing.

Each test is the regression test of an item of the hostile-input review; every bad input must be
one line naming the option (in its unit) or the file, line and field, exit code 2.
"""

from __future__ import annotations

import json
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
from cli_helpers import run_error

from briefer.cli import build_parser, main
from briefer.errors import BriefingError, DomainError

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT        # the demo data: profiles/, airfields_demo/, scenarios/
TINY = "1e-320"


def _out(capsys, argv: list[str]) -> str:
    assert main(argv) == 0
    return capsys.readouterr().out


# --- 17.5 and 17.12: every numeric option has a stated range ----------------------------------------
@pytest.mark.parametrize("argv, option, words", [
    (["turn", "--speed-kt", "140", "--bank-deg", TINY], "--bank-deg", "expected 1 to 80 deg"),
    (["area", "--category", "C", "--criteria", "icao", "--airport-elevation-ft", "0", "--tas-kt", "140",
      "--bank-deg", TINY], "--bank-deg", "expected 1 to 60 deg"),
    (["wind", "--wind", "270/10", "--runway-heading-deg", "90", "--variation-deg", "999999"],
     "--variation-deg", "expected -90 to 90 deg"),
    (["wind", "--wind", "270/10", "--runway-heading-deg", "1e308"], "--runway-heading-deg",
     "expected 0 to 360 deg"),
    (["envelope", "--demo", "--direction-step-deg", TINY], "--direction-step-deg", "expected 1 to 90 deg"),
    (["envelope", "--demo", "--speed-step-kt", TINY], "--speed-step-kt", "expected 0.5 to 50 kt"),
    (["brief", "--demo", "--oat-c", "inf"], "--oat-c", "expected a finite number -90 to 60 degrees Celsius"),
    (["brief", "--demo", "--weight-lb", "nan"], "--weight-lb", "expected a finite number 300 to 1,500,000 pounds"),
])
def test_an_option_out_of_its_range_is_one_line_in_its_unit(capsys, argv, option, words):
    line = run_error(capsys, argv)
    assert f"argument {option}: {words}" in line


def test_the_envelope_grid_is_bounded(capsys):
    line = run_error(capsys, ["envelope", "--demo", "--direction-step-deg", "1", "--speed-step-kt", "0.5",
                              "--max-wind-kt", "150"])
    assert "more than the limit of 12,000" in line


def _numeric_actions():
    parser, _ = build_parser()
    sub = next(a for a in parser._actions if isinstance(getattr(a, "choices", None), dict))
    stack = [(name, p) for name, p in sub.choices.items()]
    while stack:
        name, p = stack.pop()
        for action in p._actions:
            if isinstance(getattr(action, "choices", None), dict):
                stack.extend((f"{name} {n}", q) for n, q in action.choices.items())
            elif action.type is not None and action.type not in (str, str.upper) and action.option_strings:
                yield name, action


def test_every_numeric_option_is_range_checked_and_says_its_range_in_help():
    from briefer.commands._common import ranged

    seen = 0
    for command, action in _numeric_actions():
        if getattr(action.type, "__name__", "") in ("_seed", "_count", "existing_folder", "non_empty"):
            continue
        assert isinstance(action.type, ranged), (command, action.option_strings)
        assert action.type.describe() in (action.help or ""), (command, action.option_strings)
        seen += 1
    assert seen >= 30


@pytest.mark.parametrize("text", ["nan", "inf", "-inf", "1e999", "abc", ""])
def test_ranged_never_returns_a_non_finite_number(text):
    import argparse

    from briefer.commands._common import ranged

    with pytest.raises(argparse.ArgumentTypeError):
        ranged(0, 10, "kt")(text)


# --- 17.9: an ASCII-only terminal degrades, never crashes ----------------------------------------------
@pytest.mark.parametrize("env", [{"LC_ALL": "C", "LANG": "C", "PYTHONUTF8": "0", "PYTHONIOENCODING": ""},
                                 {"PYTHONIOENCODING": "ascii"}], ids=["C-locale", "ascii"])
@pytest.mark.parametrize("argv", [
    ["brief", "--demo"], ["brief", "--demo", "--json"],
    ["metar", "METAR V2RL 061150Z 25008KT 1SM BR OVC008 12/11 A3001"],
    ["envelope", "--demo", "--direction-step-deg", "30", "--max-wind-kt", "20", "--speed-step-kt", "5"],
    ["list"], ["turn", "--speed-kt", "140", "--bank-deg", "30"],
], ids=["brief", "brief-json", "metar", "envelope", "list", "turn"])
def test_an_ascii_only_stdout_degrades(argv, env):
    full = {k: v for k, v in os.environ.items() if not k.startswith("LC_")}
    full.update(env, PYTHONPATH=str(ROOT))
    proc = subprocess.run([sys.executable, "-m", "briefer", *argv], capture_output=True, timeout=300, env=full)
    assert proc.returncode == 0, proc.stderr.decode("utf-8", "replace")
    assert b"Traceback" not in proc.stderr
    assert all(b < 128 for b in proc.stdout)
    if "--json" in argv:
        json.loads(proc.stdout)
    elif argv[0] in ("brief", "metar"):
        assert b" deg" in proc.stdout


# --- 17.10: control characters never reach the terminal ----------------------------------------------
def test_a_profile_name_with_escape_codes_is_refused_by_check(tmp_path, capsys):
    good = (DEMO / "profiles" / "demo-twin.yaml").read_text()
    bad = tmp_path / "red.yaml"
    bad.write_text(good.replace("name: demo-twin", 'name: "a\\e[31mred\\a"', 1))
    assert main(["check", str(bad)]) == 2
    out, err = capsys.readouterr()
    assert "\x1b" not in out + err and "\x07" not in out + err
    assert "name: a control character (\\x1b) in the text 'a\\x1b[31mred\\x07'" in out


def test_a_file_name_with_escape_codes_is_shown_escaped(tmp_path, capsys):
    good = (DEMO / "profiles" / "demo-twin.yaml").read_text()
    odd = tmp_path / "tw\x1b[2Jin.yaml"
    odd.write_text(good)
    assert main(["check", str(odd)]) == 0
    out = capsys.readouterr().out
    assert "\x1b" not in out and "tw\\x1b[2Jin.yaml: OK" in out
    line = run_error(capsys, ["brief", "--demo", "--profile", str(tmp_path / "no\x07such.yaml")])
    assert "\x07" not in line and "no\\x07such.yaml" in line


def test_a_metar_with_escape_codes_is_shown_escaped(capsys):
    out = _out(capsys, ["metar", "METAR V2RL 061150Z 25008KT 1SM \x1b]0;owned\x07 OVC008 12/11 A3001"])
    assert "\x1b" not in out and "\x07" not in out


# --- 17.13: wind strings, empty options, runway numbers -------------------------------------------------
@pytest.mark.parametrize("wind, words", [
    ("270/15 300V240", "lies outside the variable sector 300V240"),
    ("270/15 270V270", "has no width"),
])
def test_a_wind_outside_its_own_variable_sector_is_refused(capsys, wind, words):
    from briefer.core.wind import parse_wind

    with pytest.raises(DomainError, match=words):
        parse_wind(wind)
    assert words in run_error(capsys, ["brief", "--demo", "--wind", wind])


def test_a_wind_inside_its_variable_sector_is_accepted():
    from briefer.core.wind import parse_wind

    w = parse_wind("350/15 300V030")         # the sector crosses north, clockwise
    assert w.variable_from_deg == 300 and w.variable_to_deg == 30


@pytest.mark.parametrize("option", ["--wind", "--runway", "--out", "--metar", "--profile", "--approach"])
def test_an_empty_option_is_refused_not_ignored(capsys, option):
    line = run_error(capsys, ["brief", "--demo", option, ""])
    assert f"argument {option}: expected a value, got an empty one" in line


def test_a_fractional_saved_runway_is_refused(tmp_path):
    from briefer.tui.inputs_file import load_inputs

    p = tmp_path / "in.yaml"
    p.write_text("kind: briefing-inputs\nformat_version: 1\nprofile: demo-twin\nairfield: V2RL\n"
                 "approach: RNAV (GPS) RWY 09\nlanding_runway: 27.9\n")
    with pytest.raises(BriefingError, match=r"in.yaml:6: landing_runway: expected a runway designator"):
        load_inputs(p)


# --- 17.14: one report per string, impossible values flagged ----------------------------------------------
@pytest.mark.parametrize("text", [
    "METAR V2RL 061150Z 25008KT 10SM SKC 12/11 A3001 METAR Q7HM 061150Z 36010KT 10SM OVC002 10/05 A2992",
    "V2RL 061150Z 25008KT 10SM SKC 12/11 A3001= Q7HM 061150Z 36010KT 10SM OVC002 10/05 A2992",
    "V2RL 061150Z 25008KT 10SM 12/11 A3001 Q7HM 061150Z OVC002",
])
def test_two_reports_in_one_string_are_refused(text):
    from briefer.io.metar import MetarError, decode_metar

    with pytest.raises(MetarError, match="give one report at a time"):
        decode_metar(text)


@pytest.mark.parametrize("text, group, words", [
    ("V2RL 061150Z 25008KT 1SM OVC008 12/14 A3001", "12/14", "dew point 14 degC above the temperature 12"),
    ("V2RL 061150Z 25008KT 1SM OVC008 99/M99 A3001", "99/M99", "temperature 99 degC outside the plausible"),
    ("V2RL 061150Z 270999KT 1SM OVC008 12/11 A3001", "270999KT", "beyond any surface wind"),
    ("V2RL 061150Z 27015KT 300V240 1SM OVC008 12/11 A3001", "300V240", "outside the variable sector"),
])
def test_impossible_metar_values_are_flagged_not_believed(text, group, words):
    from briefer.io.metar import decode_metar

    report = decode_metar(text)
    reasons = dict(report.skipped)
    assert group in reasons and words in reasons[group]
    assert report.temperature_c is None or report.temperature_c <= 60
    assert report.wind_speed_kt is None or report.wind_speed_kt < 250


# --- 17.15: zero visibility is a legal report and briefs --------------------------------------------------
def test_zero_visibility_has_an_envelope(capsys):
    data = json.loads(_out(capsys, ["envelope", "--demo", "--visibility-sm", "0", "--json",
                                    "--direction-step-deg", "45", "--max-wind-kt", "10", "--speed-step-kt", "5"]))
    assert data["cautions"]


@pytest.mark.parametrize("argv", [
    ["brief", "--demo", "--visibility-sm", "0", "--json"],
    ["brief", "--demo", "--metar", "METAR V2RL 061150Z 25008KT 0SM FG VV001 12/11 A3001", "--json"],
])
def test_zero_visibility_briefs_below_minimums(capsys, argv):
    data = json.loads(_out(capsys, argv))
    text = json.dumps(data)
    assert "visibility_m" not in " ".join(str(w) for w in data.get("warnings", []))
    assert re.search(r"[Rr]eported visibility 0 SM is below the required", text)


# --- 17.16: check and brief accept the same files; saved-input ranges name line and field ------------------
def test_a_profile_too_fast_for_the_briefs_fails_check(tmp_path, capsys):
    good = (DEMO / "profiles" / "demo-bizjet.yaml").read_text()
    fast = tmp_path / "fast.yaml"
    fast.write_text(good.replace("circling_speed_kt: 145", "circling_speed_kt: 300", 1))
    assert main(["check", str(fast)]) == 2
    out = capsys.readouterr().out
    assert "configurations[0].circling_speed_kt: 300 kt at the reference weight becomes 336 kt" in out


def test_every_profile_check_accepts_briefs(tmp_path, capsys):
    """The fastest profile check accepts (circling speed at MLW + largest additive = 300 kt) briefs."""
    good = (DEMO / "profiles" / "demo-bizjet.yaml").read_text()
    top = int((300 - 20) / (31000 / 28000) ** 0.5 * 100) / 100
    edge = tmp_path / "edge.yaml"
    edge.write_text(good.replace("circling_speed_kt: 145", f"circling_speed_kt: {top}", 1))
    assert main(["check", str(edge)]) == 0
    capsys.readouterr()
    assert main(["brief", "--demo", "--profile", str(edge), "--wind", "270/30G50", "--json"]) == 0


def test_a_saved_input_out_of_range_names_line_and_field(tmp_path):
    from briefer.tui.inputs_file import load_inputs

    p = tmp_path / "in.yaml"
    p.write_text("kind: briefing-inputs\nformat_version: 1\nprofile: demo-twin\nairfield: V2RL\n"
                 "approach: RNAV (GPS) RWY 09\nlanding_runway: '27'\nweather:\n  wind_speed_kt: 900\n")
    with pytest.raises(BriefingError) as info:
        load_inputs(p)
    assert str(info.value) == f"{p}:8: weather.wind_speed_kt: expected 0 to 150, got 900"


def test_list_shows_odd_file_names_escaped(tmp_path, capsys, monkeypatch):
    monkeypatch.setenv("COLUMNS", "300")
    good = (DEMO / "profiles" / "demo-twin.yaml").read_text()
    (tmp_path / "t\x1b[2Jx.yaml").write_text(good)
    out = _out(capsys, ["list", "--profiles", "--profile-dir", str(tmp_path)])
    assert "\x1b" not in out and "t\\x1b[2Jx.yaml" in out
