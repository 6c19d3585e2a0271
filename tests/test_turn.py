"""briefer.core.turn against handbook formulas, the PHAK load-factor chart, Doc 8168 and Annex 11
worked values, ready-made test points, and invariants."""

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

from briefer import units
from briefer.core import turn
from briefer.errors import DomainError

REFERENCE = Path(__file__).parent / "reference"


@pytest.fixture(scope="module")
def turn_ready_made_points() -> dict:
    return yaml.safe_load((REFERENCE / "turn_ready_made_points.yaml").read_text())


# --- handbook formulas ------------------------------------------------------------------------
@pytest.mark.parametrize("tas_kt", [60.0, 90.0, 120.0, 165.0, 250.0])
@pytest.mark.parametrize("bank_deg", [10.0, 20.0, 30.0, 45.0, 60.0])
def test_radius_vs_faa_handbook_form(tas_kt, bank_deg):
    """FAA handbook form R = V^2 / (11.26 tan bank) ft (constant from memory, REFERENCES 7a).

    Exact physics gives 11.294 (g = 9.80665, 1 kt = 1852/3600 m/s), 0.30 % from 11.26, so the
    tolerance is 0.4 %. The exact constant is checked to 1e-4 (it is printed to 5 figures).
    """
    handbook = tas_kt ** 2 / (11.26 * math.tan(math.radians(bank_deg)))
    assert_allclose(turn.turn_radius_ft(tas_kt, bank_deg), handbook, rtol=4e-3)
    exact = tas_kt ** 2 / (11.294 * math.tan(math.radians(bank_deg)))
    assert_allclose(turn.turn_radius_ft(tas_kt, bank_deg), exact, rtol=1e-4)


def test_ready_made_points(turn_ready_made_points):
    """REFERENCES 7c [C] (hand-derived, see the YAML header): radius to the printed 1 ft, NM to
    0.001 NM, rate to 0.01 deg/s (half a unit of the last printed digit)."""
    for p in turn_ready_made_points["points"]:
        pid = f"{p['tas_kt']} kt {p['bank_deg']} deg"
        assert_allclose(turn.turn_radius_ft(p["tas_kt"], p["bank_deg"]), p["radius_ft"], atol=0.5, err_msg=pid)
        assert_allclose(turn.turn_rate_deg_per_s(p["tas_kt"], p["bank_deg"]), p["rate_deg_per_s"],
                        atol=0.005, err_msg=pid)
        if "radius_nm" in p:
            assert_allclose(turn.turn_radius_nm(p["tas_kt"], p["bank_deg"]), p["radius_nm"], atol=5e-4, err_msg=pid)
    for p in turn_ready_made_points["standard_rate"]:
        assert_allclose(turn.bank_for_rate_deg(p["tas_kt"]), p["standard_rate_bank_deg"], atol=0.05,
                        err_msg=str(p["tas_kt"]))


def test_worked_example_120kt_30deg_2208ft():
    """Published third-party turn page (REFERENCES 7c, V2): 120 kt, 30 deg -> 2,208 ft, which is
    exact physics; printed to 1 ft."""
    assert_allclose(turn.turn_radius_ft(120.0, 30.0), 2208.0, atol=0.5)


def test_worked_example_aviation_formulary_100kt_45deg():
    """Aviation Formulary worked example (REFERENCES 7c, V2): 100 kt, 45 deg -> 891 ft with the
    constant 11.23 (exact physics 885 ft, 0.6 % less: rtol 1 %), rate 10.9 deg/s, standard-rate
    bank at 100 kt 15.4 deg."""
    assert_allclose(turn.turn_radius_ft(100.0, 45.0), 891.0, rtol=0.01)
    assert_allclose(turn.turn_radius_ft(100.0, 45.0), 885.0, atol=0.5)      # [C] exact
    assert_allclose(turn.turn_rate_deg_per_s(100.0, 45.0), 10.9, atol=0.05)
    assert_allclose(turn.bank_for_rate_deg(100.0), 15.4, atol=0.05)


@pytest.mark.parametrize("speed_kt, bank_deg, radius_nm, atol_nm", [
    # printed 22.51 NM; recomputed 22.52 [C]: 0.02 NM covers both
    pytest.param(750.0, 20.0, 22.51, 0.02, id="750kt-GS-20deg"),
    # printed 14.45 NM; recomputed 14.41 [C]: REFERENCES 7c asks for at least 0.05 NM
    pytest.param(600.0, 20.0, 14.45, 0.05, id="400TAS+200tail-20deg"),
])
def test_annex11_attachment_a_radii(speed_kt, bank_deg, radius_nm, atol_nm):
    """ICAO Annex 11, Attachment A 7.4 (V2, REFERENCES 7c): turn radius at 20 deg bank."""
    assert_allclose(turn.turn_radius_nm(speed_kt, bank_deg), radius_nm, atol=atol_nm)


@pytest.mark.parametrize("tas_kt", [90.0, 135.0, 215.0])
@pytest.mark.parametrize("bank_deg", [15.0, 20.0, 25.0])
def test_doc8168_rate_and_radius_forms(tas_kt, bank_deg):
    """Doc 8168 Vol II Part I Sec 2 Ch 3 (V, REFERENCES 4a/7a): R = 3431 tan(bank)/(pi V) deg/s
    and r = V/(20 pi R) NM. 3431/pi = 1092.1 against the exact 1092.2: rtol 2e-4."""
    rate_icao = 3431.0 * math.tan(math.radians(bank_deg)) / (math.pi * tas_kt)
    assert_allclose(turn.turn_rate_deg_per_s(tas_kt, bank_deg), rate_icao, rtol=2e-4)
    assert_allclose(turn.turn_radius_nm(tas_kt, bank_deg), tas_kt / (20.0 * math.pi * rate_icao), rtol=2e-4)


# --- PHAK load factor chart -------------------------------------------------------------------
@pytest.mark.parametrize("bank_deg, n_chart", [
    pytest.param(0.0, 1.0, id="0deg"),
    pytest.param(10.0, 1.015, id="10deg"),
    pytest.param(30.0, 1.154, id="30deg"),
    pytest.param(45.0, 1.414, id="45deg"),
    pytest.param(60.0, 2.000, id="60deg"),
    pytest.param(70.0, 2.923, id="70deg"),
    pytest.param(80.0, 5.747, id="80deg"),
    pytest.param(85.0, 11.473, id="85deg"),
])
def test_load_factor_phak_chart(bank_deg, n_chart):
    """PHAK FAA-H-8083-25 "Aerodynamics of Flight" load-factor chart (V2, REFERENCES 7b).
    The chart's 80 deg cell is 0.2 % below 1/cos: rtol 0.3 %."""
    assert_allclose(turn.load_factor(bank_deg), n_chart, rtol=3e-3)


@pytest.mark.parametrize("bank_deg, increase_pct", [
    pytest.param(30.0, 7.5, id="30deg"),
    pytest.param(45.0, 18.9, id="45deg"),
    pytest.param(60.0, 41.4, id="60deg"),
    pytest.param(75.0, 96.6, id="75deg-about-double"),
])
def test_stall_speed_increase_phak(bank_deg, increase_pct):
    """PHAK "Aerodynamics of Flight" (V2, REFERENCES 7b): stall speed rises as sqrt(n); 60 deg ->
    +41 %, about double at 75 deg. Printed to 0.1 %."""
    assert_allclose((turn.stall_speed_factor(bank_deg) - 1.0) * 100.0, increase_pct, atol=0.05)


def test_phak_stall_speed_at_4g_and_9g():
    """PHAK text (V2, REFERENCES 7a): a 50 kt stall speed becomes 100 kt at 4 G and 150 kt at 9 G."""
    for n, expected in ((4.0, 100.0), (9.0, 150.0)):
        bank = turn.bank_for_load_factor_deg(n)
        assert_allclose(turn.stall_speed_in_turn_kt(50.0, bank), expected, rtol=1e-12)


def test_phak_30deg_weight_example():
    """PHAK (V2, REFERENCES 7b): 3,300 lb airplane in a 30 deg bank is supported as about 3,960 lb
    (the handbook uses n of about 1.2; 1/cos 30 = 1.155 gives 3,811 lb, so 4 %)."""
    assert_allclose(3300.0 * turn.load_factor(30.0), 3960.0, rtol=0.04)


# --- rules of thumb ---------------------------------------------------------------------------
@pytest.mark.parametrize("tas_kt", [80.0, 100.0, 120.0, 140.0, 160.0, 180.0])
def test_standard_rate_bank_rule_of_thumb(tas_kt):
    """Common practice (IFH wording via V2 pages, REFERENCES 7a): standard-rate bank is about 15 %
    of the TAS. Loose: within 1 deg from 80 to 180 kt."""
    assert_allclose(turn.bank_for_rate_deg(tas_kt), 0.15 * tas_kt, atol=1.0)


def test_standard_rate_bank_exact_form():
    """Hand-derived: phi = atan(V omega / g); with omega = 3 deg/s, V/364.1 (REFERENCES 7a [C])."""
    for v in (90.0, 150.0):
        assert_allclose(turn.bank_for_rate_deg(v), math.degrees(math.atan(v / 364.1)), atol=0.01)
    assert_allclose(turn.turn_rate_deg_per_s(137.0, turn.bank_for_rate_deg(137.0)), 3.0, rtol=1e-12)


# --- stall bank and angle of attack -------------------------------------------------------------
def test_stall_bank_hand_derived():
    """Hand-derived: at V = sqrt(2) VS the wing stalls at n = 2, i.e. 60 deg; at VS: 0 deg."""
    assert_allclose(turn.stall_bank_deg(100.0 * math.sqrt(2.0), 100.0), 60.0, atol=1e-9)
    assert turn.stall_bank_deg(100.0, 100.0) == 0.0
    # heavier by 21 %: VS grows by 10 %, so 110 kt is the 1-g stall (hand-derived, sqrt(1.21) = 1.1)
    assert_allclose(turn.stall_bank_deg(110.0, 100.0, weight_ratio=1.21), 0.0, atol=1e-6)


def test_stall_bank_below_stall_speed_raises():
    """Decision documented in stall_bank_deg: already stalled at 1 g -> DomainError."""
    with pytest.raises(DomainError, match="stall"):
        turn.stall_bank_deg(90.0, 100.0)


def test_stall_bank_inverts_stall_speed_in_turn():
    """Invariant: the stall speed at the stall bank is the speed flown (hand-derived identity)."""
    v = np.array([105.0, 130.0, 160.0])
    bank = turn.stall_bank_deg(v, 95.0, weight_ratio=0.9)
    assert_allclose(turn.stall_speed_in_turn_kt(95.0, bank, weight_ratio=0.9), v, rtol=1e-12)


AOA = dict(vref_kt=130.0, vs1g_kt=100.0, aoa_ref=8.0, aoa_stall=16.0)


def test_aoa_anchors_reproduced():
    """The linear model passes through its anchors (definition): aoa_ref at VREF 1 g, aoa_stall at
    VS1G 1 g."""
    assert_allclose(turn.angle_of_attack_in_turn(130.0, 0.0, **AOA), 8.0, atol=1e-12)
    assert_allclose(turn.angle_of_attack_in_turn(100.0, 0.0, **AOA), 16.0, atol=1e-12)


def test_aoa_hand_derived_60deg_at_vref():
    """Hand-derived: r = (100/130)^2 = 0.591716; alpha0 = (8 - 16 r)/(1 - r) = -3.5942;
    at 60 deg (n = 2) and VREF: alpha = alpha0 + 2 (8 - alpha0) = 19.594 > 16, i.e. stalled."""
    r = (100.0 / 130.0) ** 2
    a0 = (8.0 - 16.0 * r) / (1.0 - r)
    assert_allclose(a0, -3.5942, atol=1e-4)
    assert_allclose(turn.angle_of_attack_in_turn(130.0, 60.0, **AOA), a0 + 2.0 * (8.0 - a0), rtol=1e-12)
    assert turn.aoa_margin_to_stall(130.0, 60.0, **AOA) < 0.0


def test_aoa_reaches_stall_at_stall_bank():
    """Consistency: at the bank where the wing stalls, the AoA equals aoa_stall (hand-derived)."""
    for v, w in ((120.0, 1.0), (140.0, 0.85)):
        bank = turn.stall_bank_deg(v, 100.0, weight_ratio=w)
        assert_allclose(turn.aoa_margin_to_stall(v, bank, weight_ratio=w, **AOA), 0.0, atol=1e-9)
        assert_allclose(turn.lift_coefficient_fraction_of_max(v, bank, vs1g_kt=100.0, weight_ratio=w), 1.0,
                        rtol=1e-12)


def test_aoa_indexer_units():
    """Any unit linear in alpha works (documented): an indexer scale 0..1 (ref 0.6, stall 1.0)
    maps exactly like degrees under the affine map u = (alpha - 8)/(16 - 8) * 0.4 + 0.6."""
    deg = turn.angle_of_attack_in_turn(115.0, 35.0, **AOA)
    idx = turn.angle_of_attack_in_turn(115.0, 35.0, vref_kt=130.0, vs1g_kt=100.0, aoa_ref=0.6, aoa_stall=1.0)
    assert_allclose(idx, (deg - 8.0) / 8.0 * 0.4 + 0.6, rtol=1e-12)


@pytest.mark.parametrize("kwargs", [
    pytest.param(dict(vref_kt=100.0, vs1g_kt=100.0, aoa_ref=8.0, aoa_stall=16.0), id="vref-equals-vs"),
    pytest.param(dict(vref_kt=130.0, vs1g_kt=100.0, aoa_ref=16.0, aoa_stall=8.0), id="stall-below-ref"),
])
def test_aoa_bad_anchors_raise(kwargs):
    with pytest.raises(DomainError):
        turn.angle_of_attack_in_turn(120.0, 20.0, **kwargs)


# --- turn_performance --------------------------------------------------------------------------
def test_turn_performance_bundle():
    """Wiring: the bundle equals the separate functions; hand-derived n = 1/cos 60 = 2 exactly."""
    tp = turn.turn_performance(120.0, 60.0)
    assert tp.radius_m == turn.turn_radius_m(120.0, 60.0)
    assert_allclose(tp.radius_ft, turn.turn_radius_ft(120.0, 60.0), rtol=1e-12)
    assert_allclose(tp.radius_nm, turn.turn_radius_nm(120.0, 60.0), rtol=1e-12)
    assert tp.turn_rate_deg_per_s == turn.turn_rate_deg_per_s(120.0, 60.0)
    assert_allclose(tp.time_360_s, turn.time_to_turn_s(120.0, 60.0, angle_deg=360.0), rtol=1e-12)
    assert_allclose(tp.load_factor, 2.0, rtol=1e-12)
    assert_allclose(tp.stall_speed_factor, math.sqrt(2.0), rtol=1e-12)


def test_turn_performance_validates_hand_built():
    """STYLE C: __post_init__ rejects an inconsistent hand-built result."""
    tp = turn.turn_performance(120.0, 30.0)
    with pytest.raises(DomainError):
        dataclasses.replace(tp, load_factor=0.9)
    with pytest.raises(DomainError):
        dataclasses.replace(tp, radius_ft=tp.radius_ft * 2)
    with pytest.raises(dataclasses.FrozenInstanceError):
        tp.bank_deg = 10.0  # type: ignore[misc]


def test_standard_rate_time_360_is_two_minutes():
    """Definition of standard rate (3 deg/s): 360 deg in 120 s (hand-derived)."""
    bank = turn.bank_for_rate_deg(110.0)
    assert_allclose(turn.time_to_turn_s(110.0, bank, angle_deg=360.0), 120.0, rtol=1e-12)


def test_bank_for_radius_inverts_radius():
    """Round trip bank -> radius -> bank (hand-derived identity), arrays."""
    bank = np.array([5.0, 25.0, 45.0, 70.0])
    r = turn.turn_radius_m(140.0, bank)
    assert_allclose(turn.bank_for_radius_deg(140.0, radius_m=r), bank, rtol=1e-12)


def test_zero_bank_rate_and_load_factor():
    """Hand-derived: wings level -> rate 0, n = 1, stall factor 1."""
    assert turn.turn_rate_deg_per_s(120.0, 0.0) == 0.0
    assert turn.load_factor(0.0) == 1.0
    assert turn.stall_speed_factor(0.0) == 1.0


def test_radius_in_all_three_units_agree():
    """units.py conversions: ft and NM radii are the metre radius converted."""
    r_m = turn.turn_radius_m(100.0, 25.0)
    assert_allclose(turn.turn_radius_ft(100.0, 25.0), r_m * units.M_TO_FT, rtol=1e-12)
    assert_allclose(turn.turn_radius_nm(100.0, 25.0), r_m * units.M_TO_NM, rtol=1e-12)


# --- properties ----------------------------------------------------------------------------------
speeds = st.floats(1.0, 1000.0)
banks = st.floats(0.01, 89.9)


@settings(max_examples=200, deadline=None)
@given(v=st.floats(1.0, 900.0), dv=st.floats(0.1, 100.0), bank=banks)
def test_radius_grows_with_speed(v, dv, bank):
    """Property: r ~ V^2 at fixed bank."""
    assert turn.turn_radius_m(v + dv, bank) > turn.turn_radius_m(v, bank)


@settings(max_examples=200, deadline=None)
@given(v=speeds, bank=st.floats(0.01, 89.0), db=st.floats(0.01, 0.99))
def test_radius_falls_with_bank(v, bank, db):
    """Property: r ~ 1/tan(bank) at fixed speed."""
    assert turn.turn_radius_m(v, bank + db) < turn.turn_radius_m(v, bank)


@settings(max_examples=200, deadline=None)
@given(v=speeds, bank=banks, vs=st.floats(1.0, 200.0), w=st.floats(0.3, 2.0))
def test_no_nan_across_documented_ranges(v, bank, vs, w):
    """Property: finite results everywhere inside the documented ranges (STYLE E)."""
    tp = turn.turn_performance(v, bank)
    values = [tp.radius_m, tp.radius_ft, tp.radius_nm, tp.turn_rate_deg_per_s, tp.time_180_s,
              tp.load_factor, tp.stall_speed_factor, turn.stall_speed_in_turn_kt(vs, bank, weight_ratio=w),
              turn.bank_for_rate_deg(v), turn.bank_for_radius_deg(v, radius_m=tp.radius_m)]
    assert all(math.isfinite(x) and x > 0 for x in values)


@settings(max_examples=100, deadline=None)
@given(bank=st.one_of(st.floats(-1e6, -1e-9), st.floats(90.0, 1e6)))
def test_bank_outside_range_raises(bank):
    """Property: bank outside 0 <= bank < 90 raises DomainError (STYLE E)."""
    with pytest.raises(DomainError):
        turn.load_factor(bank)
    with pytest.raises(DomainError):
        turn.turn_radius_m(120.0, bank)


@pytest.mark.parametrize("call", [
    pytest.param(lambda: turn.turn_radius_m(120.0, 0.0), id="radius-wings-level"),
    pytest.param(lambda: turn.turn_radius_m(0.0, 30.0), id="zero-speed"),
    pytest.param(lambda: turn.turn_radius_m(-5.0, 30.0), id="negative-speed"),
    pytest.param(lambda: turn.turn_radius_m(1001.0, 30.0), id="speed-too-high"),
    pytest.param(lambda: turn.turn_radius_m(np.array([100.0, np.nan]), 30.0), id="nan-in-array"),
    pytest.param(lambda: turn.time_to_turn_s(120.0, 30.0, angle_deg=-1.0), id="negative-angle"),
    pytest.param(lambda: turn.stall_speed_in_turn_kt(60.0, 30.0, weight_ratio=0.0), id="zero-weight"),
    pytest.param(lambda: turn.bank_for_radius_deg(120.0, radius_m=0.0), id="zero-radius"),
    pytest.param(lambda: turn.bank_for_load_factor_deg(0.5), id="n-below-1"),
    pytest.param(lambda: turn.turn_performance(120.0, 90.0), id="bank-90"),
])
def test_domain_errors(call):
    with pytest.raises(DomainError):
        call()


def test_domain_error_message_quotes_value_and_range():
    with pytest.raises(DomainError, match=r"bank_deg = 95 deg .* 0 < bank_deg < 90 deg"):
        turn.turn_radius_m(120.0, 95.0)
