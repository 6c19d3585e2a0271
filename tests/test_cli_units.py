"""Metric options beside the US ones, and option errors in the option's own words (issue 11
items 10 and 12).

Conversions: NIST SP 811 (2008) Appendix B: 1 ft = 0.3048 m, 1 statute mile = 1609.344 m,
1 lb = 0.45359237 kg (all exact); 1 inHg (conventional) = 33.86389 hPa.
"""

from __future__ import annotations

import json

import pytest
from cli_helpers import run_error

from briefer.cli import main


def _json(capsys, argv):
    assert main(argv + ["--json"]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("argv, option, unit, typed", [
    (["--altimeter-inhg", "3012"], "--altimeter-inhg", "inches of mercury", "3012"),
    (["--altimeter-hpa", "29.92"], "--altimeter-hpa", "hectopascals", "29.92"),
    (["--weight-lb", "5"], "--weight-lb", "pounds", "5"),
    (["--weight-kg", "3"], "--weight-kg", "kilograms", "3"),
    (["--visibility-sm", "-1"], "--visibility-sm", "statute miles", "-1"),
    (["--visibility-m", "-100"], "--visibility-m", "metres", "-100"),
    (["--ceiling-ft", "999999"], "--ceiling-ft", "feet", "999999"),
    (["--ceiling-m", "-5"], "--ceiling-m", "metres", "-5"),
    (["--oat-c", "99"], "--oat-c", "degrees Celsius", "99"),
    (["--bank-deg", "95"], "--bank-deg", "degrees", "95"),
])
def test_option_error_names_the_option_in_its_unit(capsys, argv, option, unit, typed):
    line = run_error(capsys, ["brief", "--demo", *argv])
    assert option in line and unit in line and f"got {typed}" in line, line
    assert "_hpa" not in line and "_lb" not in line and "101998" not in line, line


def test_inhg_typed_without_the_point_gets_a_hint(capsys):
    line = run_error(capsys, ["brief", "--demo", "--altimeter-inhg", "3012"])
    assert "30.12" in line


def test_metric_options_give_the_same_brief_as_the_us_ones(capsys):
    us = _json(capsys, ["brief", "--demo", "--visibility-sm", "2.485484", "--ceiling-ft", "984.252",
                        "--weight-lb", "30864.7"])
    metric = _json(capsys, ["brief", "--demo", "--visibility-m", "4000", "--ceiling-m", "300",
                            "--weight-kg", "14000"])
    # 4000 m / 1609.344 = 2.485484 SM; 300 m / 0.3048 = 984.252 ft; 14000 kg / 0.45359237 = 30864.7 lb
    assert metric["weather"]["visibility_sm"] == pytest.approx(us["weather"]["visibility_sm"], abs=1e-5)
    assert metric["weather"]["ceiling_ft"] == pytest.approx(us["weather"]["ceiling_ft"], abs=1e-3)
    assert metric["weight_lb"] == pytest.approx(us["weight_lb"], abs=0.1)


@pytest.mark.parametrize("pair", [("--visibility-sm", "3", "--visibility-m", "4000"),
                                  ("--ceiling-ft", "900", "--ceiling-m", "300"),
                                  ("--weight-lb", "30000", "--weight-kg", "14000")])
def test_one_unit_per_quantity(capsys, pair):
    line = run_error(capsys, ["brief", "--demo", *pair])
    assert pair[0] in line and pair[2] in line


@pytest.mark.parametrize("argv, option", [
    (["app", "--altimeter-inhg", "3012"], "--altimeter-inhg"),
    (["envelope", "--demo", "--visibility-m", "-3"], "--visibility-m"),
    (["atmosphere", "--altitude-ft", "99999"], "--altitude-ft"),
])
def test_other_commands_name_the_option(capsys, argv, option):
    line = run_error(capsys, argv)
    assert option in line and "_" not in line.split("error:", 1)[1], line
