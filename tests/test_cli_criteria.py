"""CLI tests of `briefer area` and `briefer category`: wiring, JSON keys, cautions, errors.

Numbers are checked in tests/test_criteria.py; here only that the right values reach the output
(the orchestrator's wiring: the numbers themselves are checked in the core's tests).
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from cli_helpers import run_error

from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.core import criteria as cr


def _json(capsys, argv: list[str]) -> dict:
    assert main(argv) == 0
    return json.loads(capsys.readouterr().out)


def test_command_modules_do_not_import_numpy():
    # DEVELOPERS.md start-up rule: command modules import only argparse at top level
    code = ("import sys, briefer.commands.area, briefer.commands.category; "
            "print('numpy' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


# ----------------------------------------------------------------------------------------------
# briefer area
# ----------------------------------------------------------------------------------------------

def test_area_expanded_json(capsys):
    data = _json(capsys, ["area", "--category", "D", "--mda-ft", "1200",
                          "--criteria", "terps-expanded", "--json"])
    for key in ("radius_nm", "criteria", "category", "basis", "provenance", "source", "cautions"):
        assert key in data
    assert data["cautions"] == list(CAUTIONS)
    # AIM 5-4-20 expanded, Cat D 1001-3000 ft: 3.7 NM, a cell from memory (lookup regression)
    assert data["radius_nm"] == 3.7 and data["provenance"] == "M" and data["from_memory"] is True
    assert data["mda_band"] == "1001-3000" and data["mda_ft_msl"] == 1200.0
    assert any("from memory" in n for n in data["notes"])
    assert any("negative-C" in n for n in data["notes"])


def test_area_category_is_case_insensitive(capsys):
    # AIM 5-4-20 legacy radius Cat C 1.7 NM (V2)
    data = _json(capsys, ["area", "--category", "c", "--criteria", "terps-legacy", "--json"])
    assert data["category"] == "C" and data["radius_nm"] == 1.7 and data["provenance"] == "V2"


def test_area_icao_json_has_construction(capsys):
    data = _json(capsys, ["area", "--category", "C", "--criteria", "icao",
                          "--airport-elevation-ft", "1000", "--json"])
    c = data["construction"]
    for key in ("ias_kt", "tas_kt", "tas_plus_wind_kt", "bank_deg", "turn_rate_deg_per_s",
                "turn_radius_nm", "straight_segment_nm", "radius_nm", "altitude_ft"):
        assert key in c
    # Doc 8168 Vol I Table I-4-7-2 Cat C: 4.20 NM (V2), reproduced within 0.03 NM
    assert data["radius_nm"] == pytest.approx(4.20, abs=0.03)
    assert c["radius_nm"] == data["radius_nm"] and data["provenance"] == "C"


def test_area_required_radius(capsys):
    # wiring: the radius needed is the core's required_radius_nm with the category's S default
    data = _json(capsys, ["area", "--category", "C", "--criteria", "terps-legacy", "--tas-kt", "150",
                          "--bank-deg", "20", "--wind-kt", "20", "--json"])
    expected = cr.required_radius_nm(tas_kt=150.0, wind_kt=20.0, bank_deg=20.0,
                                     straight_segment_nm=cr.ICAO_STRAIGHT_SEGMENT_NM["C"])
    assert data["required"]["radius_nm"] == pytest.approx(expected.radius_nm, rel=1e-12)
    assert data["margin_nm"] == pytest.approx(1.7 - expected.radius_nm, rel=1e-12)
    assert data["fits"] is False       # 2r + S at 170 kt and 20 deg is far above 1.7 NM
    assert any("does not fit" in n.lower() or "more than the published" in n for n in data["notes"])


def test_area_table_output_marks_memory_and_cautions(capsys):
    assert main(["area", "--category", "E", "--mda-ft", "9500", "--criteria", "terps-expanded"]) == 0
    out = capsys.readouterr().out
    assert "from memory" in out
    assert "NOT FOR NAVIGATION" in out


@pytest.mark.parametrize("argv, fragment", [
    (["area", "--category", "C", "--criteria", "terps-expanded"], "MDA"),
    (["area", "--category", "C", "--criteria", "icao"], "elevation"),
    (["area", "--category", "C", "--criteria", "terps-expanded", "--mda-ft", "30000"], "MDA"),
    (["area", "--category", "C", "--criteria", "terps-legacy", "--tas-kt", "150"], "--bank-deg"),
    (["area", "--category", "C", "--criteria", "terps-legacy", "--tas-kt", "150",
      "--bank-deg", "95"], "bank"),
])
def test_area_domain_errors_exit_2(capsys, argv, fragment):
    err = run_error(capsys, argv)       # a range error is a usage error (argparse exits 2)
    assert err.startswith("briefer area: error:") and fragment in err


@pytest.mark.parametrize("argv", [
    ["area", "--category", "F", "--criteria", "icao"],
    ["area", "--category", "C", "--criteria", "pans-ops"],
    ["area", "--category", "C"],
    ["area", "--category", "C", "--criteria", "terps-expanded", "--mda-ft", "abc"],
])
def test_area_usage_errors_exit_2(capsys, argv):
    with pytest.raises(SystemExit) as exc:
        main(argv)
    assert exc.value.code == 2
    assert capsys.readouterr().err.count("\n") == 1


# ----------------------------------------------------------------------------------------------
# briefer category
# ----------------------------------------------------------------------------------------------

def test_category_json_raise(capsys):
    # P/CG "Aircraft approach category": a Cat A aircraft circling at 95 kt must use Cat B (V2)
    data = _json(capsys, ["category", "--vref-kt", "85", "--circling-speed-kt", "95", "--json"])
    for key in ("category", "certified_category", "raised", "reason", "criteria", "cautions"):
        assert key in data
    assert (data["certified_category"], data["category"], data["raised"]) == ("A", "B", True)
    assert data["criteria"] == "terps-expanded"
    assert data["cautions"] == list(CAUTIONS)


def test_category_json_icao(capsys):
    # Doc 8168 Table I-4-1-2: Cat A is designed for a 100 kt circle, so 95 kt stays Cat A (V2)
    data = _json(capsys, ["category", "--vref-kt", "85", "--circling-speed-kt", "95",
                          "--criteria", "icao", "--json"])
    assert (data["category"], data["raised"], data["design_circling_speed_kt"]) == ("A", False, 100.0)
    assert data["speed_band_kt"] == [0.0, 91.0]


def test_category_without_circling_speed(capsys):
    # 14 CFR 97.3: VREF 166 kt is Cat E, which has no upper limit under TERPS
    data = _json(capsys, ["category", "--vref-kt", "166", "--json"])
    assert data["category"] == "E" and data["circling_speed_kt"] is None
    assert data["speed_band_kt"] == [166.0, None]


def test_category_table_output(capsys):
    assert main(["category", "--vref-kt", "130", "--circling-speed-kt", "150"]) == 0
    out = capsys.readouterr().out
    assert "raised" in out and "NOT FOR NAVIGATION" in out


@pytest.mark.parametrize("argv, fragment", [
    (["category", "--vref-kt", "0"], "--vref-kt"),
    (["category", "--vref-kt", "400"], "--vref-kt"),
    (["category", "--vref-kt", "215", "--criteria", "icao"], "Cat E"),
    (["category", "--vref-kt", "120", "--circling-speed-kt", "-5"], "--circling-speed-kt"),
])
def test_category_domain_errors_exit_2(capsys, argv, fragment):
    err = run_error(capsys, argv)       # a range error is a usage error (argparse exits 2)
    assert err.startswith("briefer category: error:") and fragment in err


@pytest.mark.parametrize("argv", [
    ["category"],
    ["category", "--vref-kt", "nan"],
    ["category", "--vref-kt", "120", "--criteria", "terps"],
])
def test_category_usage_errors_exit_2(capsys, argv):
    with pytest.raises(SystemExit) as exc:
        main(argv)
    assert exc.value.code == 2
    assert capsys.readouterr().err.count("\n") == 1
