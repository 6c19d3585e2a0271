"""The quick look-up commands: turn, atmosphere, coldtemp, wind. Wiring only (numbers are checked
in the core tests): JSON keys present, cautions present, errors are one line with exit code 2."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from numpy.testing import assert_allclose

from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.core import atmosphere, coldtemp, turn
from cli_helpers import run_error


def run_json(capsys, argv: list[str]) -> dict:
    code = main([*argv, "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    assert err == ""
    data = json.loads(out)
    assert data["cautions"] == list(CAUTIONS)
    return data




# --- turn ------------------------------------------------------------------------------------------
TURN_KEYS = {"tas_kt", "radius_ft", "radius_nm", "rate_deg_s", "time_180_s", "load_factor", "stall_speed_factor"}


def test_turn_json_keys_and_values(capsys):
    """120 kt / 30 deg -> 2,208 ft (published worked example, see test_turn)."""
    data = run_json(capsys, ["turn", "--speed-kt", "120", "--bank-deg", "30"])
    assert TURN_KEYS <= data.keys()
    assert_allclose(data["radius_ft"], 2208.0, atol=0.5)
    assert data["tas_kt"] == 120.0 and data["speed_is"] == "tas"
    assert data["load_factor"] == turn.load_factor(30.0)


def test_turn_ias_uses_air_data(capsys):
    """--speed-is ias: TAS from air_data (ISA temperature, altimeter in inHg converted)."""
    data = run_json(capsys, ["turn", "--speed-kt", "120", "--speed-is", "ias", "--altitude-ft", "3000",
                             "--altimeter-inhg", "29.92", "--bank-deg", "25"])
    from briefer import units

    expected = atmosphere.air_data(3000.0, altimeter_hpa=29.92 * units.INHG_TO_HPA, cas_kt=120.0)
    assert_allclose(data["tas_kt"], expected.tas_kt, rtol=1e-12)
    assert data["tas_kt"] > 120.0                   # TAS > IAS above sea level in ISA
    assert data["isa_deviation_c"] == 0.0
    assert TURN_KEYS <= data.keys()


def test_turn_ias_with_oat_and_hpa(capsys):
    data = run_json(capsys, ["turn", "--speed-kt", "140", "--speed-is", "ias", "--altitude-ft", "1500",
                             "--oat-c", "-10", "--altimeter-hpa", "1030", "--bank-deg", "20"])
    air = atmosphere.air_data(1500.0, oat_c=-10.0, altimeter_hpa=1030.0, cas_kt=140.0)
    assert_allclose(data["tas_kt"], air.tas_kt, rtol=1e-12)
    assert_allclose(data["radius_nm"], turn.turn_radius_nm(air.tas_kt, 20.0), rtol=1e-12)


def test_turn_table_output_has_caution(capsys):
    assert main(["turn", "--speed-kt", "100", "--bank-deg", "25"]) == 0
    out = capsys.readouterr().out
    assert "Radius" in out and "NOT FOR NAVIGATION" in out


@pytest.mark.parametrize("argv, fragment", [
    pytest.param(["turn", "--speed-kt", "120", "--bank-deg", "95"], "--bank-deg: expected 1 to 80 deg", id="bank-95"),
    pytest.param(["turn", "--speed-kt", "120", "--bank-deg", "0"], "--bank-deg: expected 1 to 80 deg", id="bank-0"),
    pytest.param(["turn", "--speed-kt", "-5", "--bank-deg", "30"], "--speed-kt: expected 1 to 600 kt", id="negative-speed"),
    pytest.param(["turn", "--speed-kt", "abc", "--bank-deg", "30"], "expected a number", id="not-a-number"),
    pytest.param(["turn", "--speed-kt", "nan", "--bank-deg", "30"], "finite", id="nan"),
    pytest.param(["turn", "--bank-deg", "30"], "--speed-kt", id="missing-speed"),
    pytest.param(["turn", "--speed-kt", "120", "--speed-is", "ias", "--bank-deg", "30"], "--altitude-ft",
                 id="ias-without-altitude"),
    pytest.param(["turn", "--speed-kt", "120", "--bank-deg", "30", "--altimeter-hpa", "1013",
                  "--altimeter-inhg", "29.92"], "not allowed", id="two-altimeters"),
])
def test_turn_bad_input(capsys, argv, fragment):
    line = run_error(capsys, argv)
    assert fragment in line


# --- atmosphere ------------------------------------------------------------------------------------
ATMOSPHERE_KEYS = {"pressure_altitude_ft", "density_altitude_ft", "isa_temperature_c", "density_ratio"}


def test_atmosphere_json_keys(capsys):
    data = run_json(capsys, ["atmosphere", "--altitude-ft", "5000", "--oat-c", "25"])
    assert ATMOSPHERE_KEYS <= data.keys()
    assert "tas_kt" not in data
    assert data["pressure_altitude_ft"] == 5000.0
    assert data["density_altitude_ft"] == atmosphere.density_altitude_ft(5000.0, oat_c=25.0)


def test_atmosphere_with_speed_and_setting(capsys):
    data = run_json(capsys, ["atmosphere", "--altitude-ft", "10000", "--altimeter-hpa", "1030",
                             "--ias-kt", "150"])
    assert ATMOSPHERE_KEYS | {"tas_kt", "pressure_altitude_rule_of_thumb_ft"} <= data.keys()
    pa = atmosphere.pressure_altitude_ft(10000.0, altimeter_hpa=1030.0)
    assert data["pressure_altitude_ft"] == pa
    assert data["tas_kt"] == atmosphere.tas_from_cas_kt(150.0, pressure_altitude_ft=pa,
                                                        oat_c=atmosphere.isa_temperature_c(pa))
    assert any("IAS taken as CAS" in n for n in data["notes"])


def test_atmosphere_inhg_equals_hpa(capsys):
    """--altimeter-inhg X is X inHg converted with units.INHG_TO_HPA."""
    from briefer import units

    a = run_json(capsys, ["atmosphere", "--altitude-ft", "2000", "--altimeter-inhg", "30.12"])
    b = run_json(capsys, ["atmosphere", "--altitude-ft", "2000", "--altimeter-hpa", str(30.12 * units.INHG_TO_HPA)])
    assert_allclose(a["pressure_altitude_ft"], b["pressure_altitude_ft"], rtol=1e-12)


@pytest.mark.parametrize("argv, fragment", [
    pytest.param(["atmosphere", "--altitude-ft", "70000"], "--altitude-ft: expected -2000 to 60000 ft", id="too-high"),
    pytest.param(["atmosphere", "--altitude-ft", "1000", "--altimeter-hpa", "29.92"], "--altimeter-hpa: expected 870 to 1090 hPa",
                 id="inhg-given-as-hpa"),
    pytest.param(["atmosphere", "--altitude-ft", "1000", "--oat-c", "-150"], "--oat-c: expected -90 to 60 degC", id="too-cold"),
    pytest.param(["atmosphere", "--altitude-ft", "1000", "--ias-kt", "0"], "--ias-kt: expected 1 to 600 kt", id="zero-speed"),
    pytest.param(["atmosphere"], "--altitude-ft", id="missing-altitude"),
])
def test_atmosphere_bad_input(capsys, argv, fragment):
    assert fragment in run_error(capsys, argv)


# --- coldtemp -------------------------------------------------------------------------------------
COLDTEMP_KEYS = {"height_above_airport_ft", "correction_ft", "corrected_altitude_ft", "method"}


def test_coldtemp_aim_example_default_table(capsys):
    """AIM 7-3-1 worked example (see test_coldtemp): -12 degC, FAF 6200 ft, airport 3206 ft."""
    data = run_json(capsys, ["coldtemp", "--airport-elevation-ft", "3206", "--oat-c", "-12",
                             "--altitude-ft", "6200"])
    assert COLDTEMP_KEYS <= data.keys()
    assert data["method"] == "sea-level-table"          # CLI default: the AIM/ICAO table
    assert data["height_above_airport_ft"] == 2994.0
    assert data["correction_ft"] == 320.0
    assert data["corrected_altitude_ft"] == 6520.0
    assert_allclose(data["correction_by_method_ft"]["airport-elevation"], 237.0, atol=0.5)


def test_coldtemp_airport_elevation_method(capsys):
    data = run_json(capsys, ["coldtemp", "--airport-elevation-ft", "3206", "--oat-c", "-12",
                             "--altitude-ft", "6200", "--method", "airport-elevation"])
    assert data["method"] == "airport-elevation"
    assert data["correction_ft"] == coldtemp.cold_temperature_correction_ft(
        2994.0, airport_oat_c=-12.0, airport_elevation_ft=3206.0, method="airport-elevation")


def test_coldtemp_warm_not_applicable(capsys):
    data = run_json(capsys, ["coldtemp", "--airport-elevation-ft", "0", "--oat-c", "20", "--altitude-ft", "1500"])
    assert data["applicable"] is False and data["correction_ft"] == 0.0
    assert data["corrected_altitude_ft"] == 1500.0


@pytest.mark.parametrize("argv, fragment", [
    pytest.param(["coldtemp", "--airport-elevation-ft", "3000", "--oat-c", "-12", "--altitude-ft", "2000"],
                 "below the airport elevation", id="altitude-below-airport"),
    pytest.param(["coldtemp", "--airport-elevation-ft", "0", "--oat-c", "-12", "--altitude-ft", "1000",
                  "--method", "guess"], "invalid choice", id="bad-method"),
    pytest.param(["coldtemp", "--airport-elevation-ft", "0", "--oat-c", "-200", "--altitude-ft", "1000"],
                 "--oat-c: expected -90 to 60 degC", id="too-cold"),
])
def test_coldtemp_bad_input(capsys, argv, fragment):
    assert fragment in run_error(capsys, argv)


# --- wind ------------------------------------------------------------------------------------------
WIND_KEYS = {"headwind_kt", "crosswind_kt", "gust_headwind_kt", "gust_crosswind_kt"}


def test_wind_json_keys_and_values(capsys):
    """Hand-derived: 270/15G25 on 240: head 15 cos 30 = 12.99, cross 7.5 from the right; gust
    25 cos 30 = 21.65, 12.5."""
    data = run_json(capsys, ["wind", "--wind", "270/15G25", "--runway-heading-deg", "240"])
    assert WIND_KEYS <= data.keys()
    assert_allclose([data["headwind_kt"], data["crosswind_kt"]], [12.990381, 7.5], atol=1e-6)
    assert_allclose([data["gust_headwind_kt"], data["gust_crosswind_kt"]], [21.650635, 12.5], atol=1e-6)
    # METAR wind true, runway magnetic, no variation: the output says so
    assert any("variation" in n for n in data["notes"])


def test_wind_no_gust_gives_null_gust_components(capsys):
    data = run_json(capsys, ["wind", "--wind", "27015KT", "--wind-is", "magnetic", "--runway-heading-deg", "240"])
    assert data["gust_headwind_kt"] is None and data["gust_crosswind_kt"] is None
    assert not any("variation" in n for n in data["notes"])


def test_wind_variation_applied(capsys):
    """True wind 270 on runway 240 magnetic with 10 deg west variation (-10): runway 230 true,
    angle 40 deg: head 15 cos 40 = 11.49 (hand-derived)."""
    data = run_json(capsys, ["wind", "--wind", "270/15", "--runway-heading-deg", "240", "--variation-deg", "-10"])
    assert data["runway_heading_in_wind_reference_deg"] == 230.0
    assert_allclose(data["headwind_kt"], 11.490667, atol=1e-6)


def test_wind_variable_is_worst_case(capsys):
    data = run_json(capsys, ["wind", "--wind", "VRB05KT", "--runway-heading-deg", "240"])
    assert data["components_are_worst_case"] is True
    assert_allclose(data["headwind_kt"], -5.0, atol=1e-9)


def test_wind_table_output(capsys):
    assert main(["wind", "--wind", "calm", "--runway-heading-deg", "90"]) == 0
    out = capsys.readouterr().out
    assert "calm" in out and "NOT FOR NAVIGATION" in out


@pytest.mark.parametrize("argv, fragment", [
    pytest.param(["wind", "--wind", "27O15", "--runway-heading-deg", "240"], "'27O15'", id="typo"),
    pytest.param(["wind", "--wind", "270/15G10", "--runway-heading-deg", "240"], "gust", id="gust-below-speed"),
    pytest.param(["wind", "--wind", "270/15", "--runway-heading-deg", "inf"], "finite", id="inf-heading"),
    pytest.param(["wind", "--wind", "270/15", "--runway-heading-deg", "240", "--wind-is", "grid"],
                 "invalid choice", id="bad-reference"),
])
def test_wind_bad_input(capsys, argv, fragment):
    assert fragment in run_error(capsys, argv)


# --- as a real process ---------------------------------------------------------------------------------
def test_subprocess_error_is_one_line_exit_2():
    """The installed entry point: a DomainError gives one stderr line, exit 2, no traceback."""
    proc = subprocess.run([sys.executable, "-m", "briefer", "turn", "--speed-kt", "120", "--bank-deg", "90"],
                          capture_output=True, text=True)
    assert proc.returncode == 2
    assert proc.stdout == ""
    assert len(proc.stderr.strip().splitlines()) == 1
    assert proc.stderr.startswith("briefer turn: error:")


def test_subprocess_json_has_cautions():
    proc = subprocess.run([sys.executable, "-m", "briefer", "coldtemp", "--airport-elevation-ft", "0",
                           "--oat-c", "-30", "--altitude-ft", "1000", "--json"],
                          capture_output=True, text=True, check=True)
    data = json.loads(proc.stdout)
    assert data["correction_ft"] == 190.0          # AIM TBL 7-3-1, -30 degC, 1000 ft
    assert data["cautions"] == list(CAUTIONS)
