"""briefer.core.coldtemp against the AIM/ICAO cold temperature error table (all 98 cells), the AIM
worked example, the Doc 8168 formula and invariants."""

from __future__ import annotations

import dataclasses
import math
from pathlib import Path

import numpy as np
import pytest
import yaml
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from briefer.core import coldtemp
from briefer.errors import DomainError

REFERENCE = Path(__file__).parent / "reference"


def _aim_cells() -> list:
    data = yaml.safe_load((REFERENCE / "cold_temperature_error_table.yaml").read_text())
    heights = data["heights_above_airport_ft"]
    return [pytest.param(float(t), float(h), float(c), id=f"{t:+d}C-{h}ft")
            for t, row in data["rows"].items() for h, c in zip(heights, row)]


AIM_TBL_7_3_1 = _aim_cells()


def test_table_has_98_cells():
    """AIM TBL 7-3-1 has 7 temperature rows x 14 height columns."""
    assert len(AIM_TBL_7_3_1) == 98


@pytest.mark.parametrize("temp_c, height_ft, table_ft", AIM_TBL_7_3_1)
def test_aim_cold_temperature_error_table(temp_c, height_ft, table_ft):
    """AIM TBL 7-3-1 / Doc 8168 Table III-1-4-1 b), every cell, with the table's own rounding
    (up to the next 10 ft): exact equality."""
    got = coldtemp.cold_temperature_correction_ft(height_ft, airport_oat_c=temp_c, method="sea-level-table")
    assert got == table_ft


def test_aim_table_whole_grid_as_array():
    """Same table, one vectorised call per row (array support)."""
    data = yaml.safe_load((REFERENCE / "cold_temperature_error_table.yaml").read_text())
    heights = np.array(data["heights_above_airport_ft"], dtype=float)
    for t, row in data["rows"].items():
        got = coldtemp.cold_temperature_correction_ft(heights, airport_oat_c=float(t), method="sea-level-table")
        assert_allclose(got, row, rtol=0, atol=0)


def test_savant_cell_minus30_1000ft():
    """The one table cell seen in a secondary source (REFERENCES 6b, V2): -30 degC, 1000 ft -> 190 ft."""
    assert coldtemp.cold_temperature_correction_ft(1000.0, airport_oat_c=-30.0, method="sea-level-table") == 190.0


# --- AIM worked example ------------------------------------------------------------------------
AIM_EXAMPLE = dict(airport_oat_c=-12.0, airport_elevation_ft=3206.0)
AIM_EXAMPLE_HEIGHT_FT = 6200.0 - 3206.0      # FAF 6200 ft, elevation 3206 ft -> 2994 ft


def test_aim_worked_example_height():
    """AIM 7-3-1 worked example (V, REFERENCES 6b): FAF 6200 ft, airport 3206 ft -> HAA 2994 ft."""
    assert AIM_EXAMPLE_HEIGHT_FT == 2994.0


def test_aim_worked_example_table_method():
    """AIM 7-3-1 worked example: reported -12 degC, 2994 ft -> table interpolation about 300 ft,
    added to the FAF. The sea-level formula gives 313.3 ft ([C]); rounded up to 10 ft, 320 ft; the
    AIM allows segment corrections to be rounded to the nearest 100 ft: 300 ft."""
    raw = 2994.0 * (15.0 - -12.0) / (273.0 - 12.0 - 0.5 * 0.00198 * 2994.0)   # Doc 8168 formula, Hss = 0
    assert_allclose(raw, 313.3, atol=0.05)
    got = coldtemp.cold_temperature_correction_ft(AIM_EXAMPLE_HEIGHT_FT, method="sea-level-table", **AIM_EXAMPLE)
    assert got == 320.0
    assert round(got, -2) == 300.0


def test_aim_worked_example_airport_elevation_method():
    """REFERENCES 6b [C]: the full formula with the real elevation, t0 = -12 + 0.00198 x 3206 =
    -5.652 degC, Hss = 3206 ft -> 237 ft (less conservative than the table)."""
    res = coldtemp.cold_temperature_correction(AIM_EXAMPLE_HEIGHT_FT, method="airport-elevation", **AIM_EXAMPLE)
    assert_allclose(res.sea_level_temperature_c, -5.652, atol=5e-4)
    assert_allclose(res.correction_ft, 237.0, atol=0.5)
    assert res.method == "airport-elevation" and res.applicable


def test_default_method_is_airport_elevation():
    """The API default (documented): the real-elevation formula."""
    assert coldtemp.cold_temperature_correction_ft(AIM_EXAMPLE_HEIGHT_FT, **AIM_EXAMPLE) == \
        coldtemp.cold_temperature_correction_ft(AIM_EXAMPLE_HEIGHT_FT, method="airport-elevation", **AIM_EXAMPLE)


def test_methods_agree_at_sea_level_before_rounding():
    """Hand-derived: at a sea-level aerodrome the two methods differ only by the rounding up."""
    h = np.linspace(100.0, 5000.0, 50)
    exact = coldtemp.cold_temperature_correction_ft(h, airport_oat_c=-25.0, method="airport-elevation")
    table = coldtemp.cold_temperature_correction_ft(h, airport_oat_c=-25.0, method="sea-level-table")
    assert np.all(table >= exact) and np.all(table - exact < 10.0)


def test_four_percent_per_ten_degrees_rule():
    """Doc 8168 4.3 simple rule (V2, REFERENCES 6a): about 4 % of the height per 10 degC below
    standard, safe above -15 degC. At 0 degC (15 below) and 1000 ft: 6 % = 60 ft. The formula
    gives 55.1 ft (hand-derived: 1000 x 15 / (273 + 0 - 0.5 x 0.00198 x 1000) = 15000/272.01),
    within 10 % of the rule."""
    got = coldtemp.cold_temperature_correction_ft(1000.0, airport_oat_c=0.0)
    assert_allclose(got, 15000.0 / (273.0 - 0.5 * 0.00198 * 1000.0), rtol=1e-12)
    assert_allclose(got, 60.0, rtol=0.10)   # rule of thumb (common practice), 10 %


# --- not applicable at or above standard --------------------------------------------------------
@pytest.mark.parametrize("method", coldtemp.METHODS)
def test_no_correction_when_not_cold(method):
    """Documented decision: 0 ft and applicable=False when t0 >= 15 degC (formula would be <= 0)."""
    res = coldtemp.cold_temperature_correction(1500.0, airport_oat_c=20.0, airport_elevation_ft=0.0, method=method)
    assert res.correction_ft == 0.0 and not res.applicable


def test_elevated_airport_standard_temperature_needs_no_correction():
    """Hand-derived: at 5000 ft ISA is 15 - 0.00198 x 5000 = 5.1 degC; t0 = 15 -> no correction
    with the airport-elevation method; the table method (sea-level) still adds some."""
    res = coldtemp.cold_temperature_correction(2000.0, airport_oat_c=5.1, airport_elevation_ft=5000.0)
    assert res.correction_ft == 0.0 and not res.applicable
    table = coldtemp.cold_temperature_correction(2000.0, airport_oat_c=5.1, airport_elevation_ft=5000.0,
                                                 method="sea-level-table")
    assert table.applicable and table.correction_ft > 0.0


def test_result_validates_itself():
    """STYLE C: a hand-built inconsistent result is rejected."""
    res = coldtemp.cold_temperature_correction(1000.0, airport_oat_c=-20.0)
    with pytest.raises(DomainError):
        dataclasses.replace(res, correction_ft=-5.0)
    with pytest.raises(DomainError):
        dataclasses.replace(res, applicable=False)
    with pytest.raises(DomainError):
        dataclasses.replace(res, method="guess")
    assert res.corrected_height_above_airport_ft == 1000.0 + res.correction_ft


# --- properties and domain ------------------------------------------------------------------------
@settings(max_examples=200, deadline=None)
@given(h=st.floats(0.0, 30000.0), t=st.floats(-100.0, 60.0), elev=st.floats(-2000.0, 15000.0),
       method=st.sampled_from(coldtemp.METHODS))
def test_finite_and_non_negative_across_ranges(h, t, elev, method):
    """Property: finite, >= 0, inside the documented ranges (STYLE E)."""
    c = coldtemp.cold_temperature_correction_ft(h, airport_oat_c=t, airport_elevation_ft=elev, method=method)
    assert math.isfinite(c) and c >= 0.0


@settings(max_examples=150, deadline=None)
@given(h=st.floats(100.0, 10000.0), t=st.floats(-60.0, 10.0), dt=st.floats(0.5, 20.0))
def test_colder_needs_more(h, t, dt):
    """Property: a colder report never needs less correction (monotonic in temperature)."""
    warm = coldtemp.cold_temperature_correction_ft(h, airport_oat_c=t, airport_elevation_ft=1000.0)
    cold = coldtemp.cold_temperature_correction_ft(h, airport_oat_c=t - dt, airport_elevation_ft=1000.0)
    assert cold > warm


@pytest.mark.parametrize("kwargs", [
    pytest.param(dict(height_above_airport_ft=-1.0, airport_oat_c=-10.0), id="negative-height"),
    pytest.param(dict(height_above_airport_ft=30001.0, airport_oat_c=-10.0), id="height-too-high"),
    pytest.param(dict(height_above_airport_ft=1000.0, airport_oat_c=-101.0), id="too-cold"),
    pytest.param(dict(height_above_airport_ft=1000.0, airport_oat_c=-10.0, airport_elevation_ft=16000.0),
                 id="elevation-too-high"),
    pytest.param(dict(height_above_airport_ft=float("nan"), airport_oat_c=-10.0), id="nan"),
    pytest.param(dict(height_above_airport_ft=1000.0, airport_oat_c=-10.0, method="table"), id="unknown-method"),
])
def test_domain_errors(kwargs):
    with pytest.raises(DomainError):
        coldtemp.cold_temperature_correction_ft(**kwargs)
