"""Tests of briefer.core.sightpicture: depression angles and the familiar-picture comparison.

Sources: the wrong-picture hazard of AvWeb/IFR magazine "Circling With Precision" (2005,
secondary text: same picture at a lower height can halve the lateral spacing); the 180 deg
reversal of one turn diameter of ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (R = 2r + S);
load factor 1/cos(bank) and stall speed times sqrt(n) from the FAA Pilot's Handbook of
Aeronautical Knowledge (60 deg -> 2 g, +41.4 %). Everything else is hand-derived from first
principles in the comments (level turn r = V^2/(g tan(bank)), sight line atan(h/d)).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from briefer.core import sightpicture
from briefer.core.sightpicture import (
    SightPictureComparison,
    compare_sight_picture,
    depression_angle_deg,
    offset_for_depression_nm,
    reversal_lateral_factor,
)
from briefer.errors import DomainError
from briefer.units import FT_TO_M, G0_MPS2, KT_TO_MPS, NM_TO_M

# an invented light-twin-like profile (all numbers made up for the tests)
PROFILE = dict(vs1g_kt=80.0, vref_kt=104.0, aoa_ref=6.0, aoa_stall=14.0)


def _radius_m(tas_kt: float, bank_deg: float) -> float:
    """First principles: r = V^2 / (g tan(bank)), V in m/s."""
    v = tas_kt * KT_TO_MPS
    return v * v / (G0_MPS2 * math.tan(math.radians(bank_deg)))


def _compare(**over):
    args = dict(circling_height_ft=500.0, planned_offset_nm=1.0, familiar_height_ft=1000.0,
                familiar_offset_nm=1.0, tas_kt=120.0, ias_kt=115.0, bank_planned_deg=25.0,
                bank_limit_deg=30.0, **PROFILE)
    args.update(over)
    return compare_sight_picture(**args)


# ---------------------------------------------------------------------------------------------
# depression angle
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("height_ft, offset_nm, expected_deg", [
    # 1000 ft = 304.8 m, 1 NM = 1852 m: atan(304.8 / 1852) = atan(0.164579) = 9.3459 deg
    pytest.param(1000.0, 1.0, math.degrees(math.atan(1000.0 * FT_TO_M / NM_TO_M)), id="1000ft-1NM"),
    # 500 ft at 0.5 NM: the same ratio, the same angle
    pytest.param(500.0, 0.5, math.degrees(math.atan(1000.0 * FT_TO_M / NM_TO_M)), id="500ft-half-NM"),
    # height equal to the offset: 1 NM = 1852 / 0.3048 = 6076.1 ft -> 45 deg
    pytest.param(NM_TO_M / FT_TO_M, 1.0, 45.0, id="45deg"),
])
def test_depression_angle_hand_derived(height_ft, offset_nm, expected_deg):
    """depression = atan(height / offset), hand-derived (arithmetic in the ids' comments)."""
    # 1e-12 relative: exact arithmetic apart from rounding
    assert depression_angle_deg(height_ft, offset_nm) == pytest.approx(expected_deg, rel=1e-12)


def test_depression_vectorised_and_round_trip():
    """offset_for_depression(h, depression(h, d)) == d (invariant), over an array grid."""
    h = np.linspace(300.0, 1500.0, 7)[:, None]
    d = np.linspace(0.3, 2.5, 5)[None, :]
    dep = depression_angle_deg(h, d)
    assert dep.shape == (7, 5)
    assert_allclose(offset_for_depression_nm(h, dep), np.broadcast_to(d, (7, 5)), rtol=1e-12)
    # monotonic: higher -> steeper, farther -> shallower
    assert np.all(np.diff(dep, axis=0) > 0) and np.all(np.diff(dep, axis=1) < 0)


@settings(max_examples=200)
@given(st.floats(100.0, 3000.0), st.floats(0.5, 30.0))
def test_half_height_same_angle_half_offset(height_ft, depression_deg):
    """Wrong-picture hazard (AvWeb 2005): the same picture at half the height is half as far out.
    Hand-derived: d = h / tan(a), linear in h."""
    full = offset_for_depression_nm(height_ft, depression_deg)
    half = offset_for_depression_nm(height_ft / 2.0, depression_deg)
    assert half == pytest.approx(full / 2.0, rel=1e-12)


@pytest.mark.parametrize("h, d", [(0.0, 1.0), (-100.0, 1.0), (500.0, 0.0), (500.0, math.nan)])
def test_depression_refuses_bad_inputs(h, d):
    with pytest.raises(DomainError):
        depression_angle_deg(h, d)


@pytest.mark.parametrize("dep", [0.0, 90.0, 95.0, -3.0])
def test_offset_refuses_bad_angles(dep):
    with pytest.raises(DomainError):
        offset_for_depression_nm(500.0, dep)


# ---------------------------------------------------------------------------------------------
# the comparison
# ---------------------------------------------------------------------------------------------
def test_half_height_halves_spacing_avweb():
    """AvWeb 2005: circling at 500 ft with the 1000 ft picture halves the lateral spacing."""
    # hand-derived: d_f = 500 ft / tan(atan(1000 ft / 1 NM)) = 0.5 NM; ratio 0.5 of a 1 NM plan
    c = _compare()
    assert c.familiar_offset_at_circling_nm == pytest.approx(0.5, rel=1e-12)
    assert c.familiar_offset_at_circling_m == pytest.approx(0.5 * NM_TO_M, rel=1e-12)
    assert c.offset_ratio == pytest.approx(0.5, rel=1e-12)
    # planned: atan(500 ft / 1 NM) = atan(152.4 m / 1852 m) = 4.704 deg; familiar atan(304.8 / 1852)
    assert c.planned_depression_deg == pytest.approx(math.degrees(math.atan(500.0 * FT_TO_M / NM_TO_M)), rel=1e-12)
    assert c.familiar_depression_deg == pytest.approx(math.degrees(math.atan(1000.0 * FT_TO_M / NM_TO_M)), rel=1e-12)


def test_required_bank_from_first_principles():
    """Fit a 180 deg reversal into the familiar offset at circling height (ICAO R = 2r + S:
    the reversal is one diameter wide); every step hand-derived below."""
    # d_f = 0.5 NM = 926 m -> r = 463 m; tan(bank) = V^2/(g r) = (120 * 1852/3600)^2 / (9.80665 * 463)
    # = 3810.9 / 4540.5 = 0.8393 -> bank = 40.0 deg; n = 1/cos = 1.3056; stall 80 * sqrt(1.3056)
    # = 91.41 kt; margin (115 - 91.41) / 91.41 = +25.8 %
    c = _compare()
    v = 120.0 * KT_TO_MPS
    tan_b = v * v / (G0_MPS2 * 463.0)
    bank = math.degrees(math.atan(tan_b))
    n = 1.0 / math.cos(math.radians(bank))
    vs = 80.0 * math.sqrt(n)
    assert c.familiar_possible
    assert c.familiar_turn_radius_m == pytest.approx(463.0, rel=1e-12)
    assert c.familiar_bank_required_deg == pytest.approx(bank, rel=1e-12)
    assert c.familiar_bank_required_deg == pytest.approx(40.0, abs=0.05)      # the rounded figure above
    assert c.familiar_load_factor == pytest.approx(n, rel=1e-12)
    assert c.familiar_stall_speed_kt == pytest.approx(vs, rel=1e-12)
    assert c.familiar_stall_margin_pct == pytest.approx((115.0 - vs) / vs * 100.0, rel=1e-12)
    assert not c.familiar_beyond_stall
    assert c.familiar_exceeds_bank_limit                                        # 40 > 30


def test_half_offset_doubles_tan_bank():
    """Hand-derived: tan(bank) = V^2 / (g d/2), so half the offset doubles tan(bank)."""
    high = _compare(circling_height_ft=1000.0)       # familiar picture at its own height: d_f = 1 NM
    low = _compare(circling_height_ft=500.0)         # d_f = 0.5 NM
    assert low.familiar_offset_at_circling_nm == pytest.approx(high.familiar_offset_at_circling_nm / 2.0)
    assert math.tan(math.radians(low.familiar_bank_required_deg)) == pytest.approx(
        2.0 * math.tan(math.radians(high.familiar_bank_required_deg)), rel=1e-12)


def test_sixty_degree_case_two_g():
    """PHAK: 60 deg bank -> n = 2 and stall speed x sqrt(2) (+41.4 %). Build the familiar offset
    so the reversal needs exactly 60 deg: d_f = 2 r(120 kt, 60 deg) (circling at the familiar
    height, so d_f = familiar offset). Stall 80 * 1.41421 = 113.14 kt > 110 kt IAS: beyond the
    stall, margin (110 - 113.14)/113.14 = -2.8 %."""
    d_f_nm = 2.0 * _radius_m(120.0, 60.0) / NM_TO_M
    c = _compare(circling_height_ft=800.0, familiar_height_ft=800.0, familiar_offset_nm=d_f_nm,
                 ias_kt=110.0, bank_limit_deg=45.0)
    assert c.familiar_bank_required_deg == pytest.approx(60.0, rel=1e-12)
    assert c.familiar_load_factor == pytest.approx(2.0, rel=1e-12)
    assert c.familiar_stall_speed_kt == pytest.approx(80.0 * math.sqrt(2.0), rel=1e-12)
    assert c.familiar_stall_margin_pct == pytest.approx((110.0 - 80.0 * math.sqrt(2.0)) / (80.0 * math.sqrt(2.0)) * 100.0)
    assert c.familiar_stall_margin_pct < 0.0 and c.familiar_beyond_stall
    assert c.familiar_exceeds_bank_limit


def test_angle_of_attack_two_g_at_vref():
    """Linear lift curve, hand-derived: C_L is linear in alpha and C_L ~ n / V^2. At VREF and 1 g
    alpha = 6; at the stall C_L,max / C_L,ref = (VREF/VS)^2 = (104/80)^2 = 1.69 and alpha = 14.
    At VREF with n = 2: alpha = 6 + (2 - 1) * (14 - 6) / (1.69 - 1) = 6 + 11.594 = 17.594."""
    d_f_nm = 2.0 * _radius_m(120.0, 60.0) / NM_TO_M
    c = _compare(circling_height_ft=800.0, familiar_height_ft=800.0, familiar_offset_nm=d_f_nm, ias_kt=104.0)
    expected = 6.0 + (2.0 - 1.0) * (14.0 - 6.0) / ((104.0 / 80.0) ** 2 - 1.0)
    assert c.familiar_aoa == pytest.approx(expected, rel=1e-9)
    assert c.familiar_aoa > PROFILE["aoa_stall"]


def test_overshoot_formula():
    """Overshoot = 2 r_planned - d_f (hand-derived: the reversal at the planned bank is one
    diameter wide)."""
    # r(120 kt, 25 deg) = 3810.9 / (9.80665 * 0.46631) = 833.4 m; 2r = 1666.8 m;
    # d_f = 0.5 NM = 926 m -> 740.8 m = 0.400 NM past the centreline
    c = _compare()
    r = _radius_m(120.0, 25.0)
    assert c.planned_turn_radius_m == pytest.approx(r, rel=1e-12)
    assert c.planned_lateral_m == pytest.approx(2.0 * r, rel=1e-12)
    assert c.overshoot_m == pytest.approx(2.0 * r - 0.5 * NM_TO_M, rel=1e-12)
    assert c.overshoot_nm == pytest.approx((2.0 * r - 0.5 * NM_TO_M) / NM_TO_M, rel=1e-12)
    assert c.overshoot_m == pytest.approx(740.8, abs=0.1)
    # a familiar picture wider than the planned turn: negative overshoot (rolls out short)
    wide = _compare(circling_height_ft=1000.0, familiar_offset_nm=1.5)
    assert wide.overshoot_m == pytest.approx(2.0 * r - 1.5 * NM_TO_M, rel=1e-12) and wide.overshoot_m < 0


def test_unreachable_radius_is_reported_not_raised(monkeypatch):
    """turn.bank_for_radius_deg may raise DomainError when no bank below 90 deg reaches the
    radius; the comparison must show "not possible" instead (STYLE reconciliation: the crew
    sees it)."""
    def unreachable(tas_kt, *, radius_m):
        raise DomainError(f"radius_m = {radius_m:g} m needs a bank of 90 deg or more")

    monkeypatch.setattr(sightpicture, "bank_for_radius_deg", unreachable)
    c = _compare()
    assert not c.familiar_possible
    assert c.familiar_bank_required_deg is None and c.familiar_load_factor is None
    assert c.familiar_stall_margin_pct is None and c.familiar_aoa is None
    assert c.familiar_exceeds_bank_limit and c.familiar_beyond_stall
    assert c.overshoot_m == pytest.approx(2.0 * _radius_m(120.0, 25.0) - 0.5 * NM_TO_M, rel=1e-12)


def test_bad_profile_still_raises_when_turn_unreachable(monkeypatch):
    """An impossible turn must not hide a bad profile (VREF below VS1G)."""
    monkeypatch.setattr(sightpicture, "bank_for_radius_deg",
                        lambda tas_kt, *, radius_m: (_ for _ in ()).throw(DomainError("unreachable")))
    with pytest.raises(DomainError, match="vref_kt"):
        _compare(vref_kt=70.0)


@pytest.mark.parametrize("bad", [
    pytest.param(dict(vref_kt=70.0), id="vref-below-vs1g"),
    pytest.param(dict(aoa_stall=5.0), id="stall-angle-below-ref"),
    pytest.param(dict(vs1g_kt=0.0), id="vs1g-0"),
    pytest.param(dict(weight_ratio=0.0), id="weight-ratio-0"),
    pytest.param(dict(aoa_ref=2e6), id="aoa-ref-out-of-range"),
])
def test_bad_profile_raises_the_wings_level_error_whether_the_turn_is_reachable(bad, monkeypatch):
    """A reachable familiar turn checks the stall and angle-of-attack inputs in its own calls; an
    unreachable one has them checked wings-level: either way the error is the one of the
    wings-level checks (stall speed first, then the angle of attack), word for word."""
    from briefer.core import turn
    prof = {**PROFILE, "weight_ratio": 1.0, **bad}
    with pytest.raises(DomainError) as wings_level:
        turn.stall_speed_in_turn_kt(prof["vs1g_kt"], 0.0, weight_ratio=prof["weight_ratio"])
        turn.angle_of_attack_in_turn(115.0, 0.0, **prof)
    with pytest.raises(DomainError) as reachable:
        _compare(**bad)
    assert str(reachable.value) == str(wings_level.value)
    monkeypatch.setattr(sightpicture, "bank_for_radius_deg",
                        lambda tas_kt, *, radius_m: (_ for _ in ()).throw(DomainError("unreachable")))
    with pytest.raises(DomainError) as unreachable:
        _compare(**bad)
    assert str(unreachable.value) == str(wings_level.value)


@pytest.mark.parametrize("over", [
    pytest.param(dict(circling_height_ft=0.0), id="height-0"),
    pytest.param(dict(planned_offset_nm=-1.0), id="offset-negative"),
    pytest.param(dict(bank_limit_deg=90.0), id="limit-90"),
    pytest.param(dict(bank_planned_deg=0.0), id="planned-bank-0"),
    pytest.param(dict(tas_kt=0.0), id="tas-0"),
    pytest.param(dict(crosswind_toward_runway_kt=130.0), id="wind-above-tas"),
])
def test_comparison_refuses_bad_inputs(over):
    with pytest.raises(DomainError):
        _compare(**over)


def test_result_invariants_checked():
    """The frozen result validates itself (STYLE C), also when built by hand."""
    c = _compare()
    with pytest.raises(DomainError):
        dataclasses.replace(c, familiar_possible=False)             # fields present but "impossible"
    with pytest.raises(DomainError):
        dataclasses.replace(c, overshoot_nm=c.overshoot_nm + 0.1)
    with pytest.raises(dataclasses.FrozenInstanceError):
        c.overshoot_m = 0.0  # type: ignore[misc]
    assert isinstance(c, SightPictureComparison)


# ---------------------------------------------------------------------------------------------
# crosswind in the reversal
# ---------------------------------------------------------------------------------------------
def _lateral_by_integration(tas_kt: float, wind_toward_kt: float, radius_m: float, steps: int = 200_000) -> float:
    """Independent check: march a constant-rate turn (omega = V / r) in a steady wind.
    Downwind track +x, runway toward -y, wind (0, -W). Start with the crab that holds +x
    (V sin(h0) = W), turn clockwise until the ground track points to -x (V sin(h) = W, cos h < 0),
    and return the ground displacement toward the runway."""
    v = tas_kt * KT_TO_MPS
    w = wind_toward_kt * KT_TO_MPS
    h0 = math.asin(w / v)
    h_end = -(math.pi + h0)          # V sin(h) = W and cos(h) < 0, reached turning clockwise from h0
    t_end = (h0 - h_end) * radius_m / v
    t = np.linspace(0.0, t_end, steps + 1)
    h = h0 - (v / radius_m) * t
    vy = v * np.sin(h) - w
    dy = np.sum((vy[1:] + vy[:-1]) / 2.0) * (t_end / steps)      # trapezoid rule
    return -dy


@pytest.mark.parametrize("wind_kt", [-20.0, -10.0, 0.0, 10.0, 25.0])
def test_reversal_factor_matches_integration(wind_kt):
    """reversal_lateral_factor (closed form) against a numerical march (independent)."""
    r = 800.0
    k = reversal_lateral_factor(120.0, crosswind_toward_runway_kt=wind_kt)
    # trapezoid error ~ (dt)^2: far below 1e-6 relative with 200 000 steps
    assert k * r == pytest.approx(_lateral_by_integration(120.0, wind_kt, r), rel=1e-6)


def test_still_air_factor_is_two_and_wind_tightens_the_turn():
    """Still air: one diameter (ICAO R = 2r + S). A wind toward the runway carries the aircraft
    further, so the familiar offset needs a steeper bank and the overshoot grows."""
    assert reversal_lateral_factor(120.0) == 2.0
    calm, windy = _compare(), _compare(crosswind_toward_runway_kt=15.0)
    assert windy.familiar_bank_required_deg > calm.familiar_bank_required_deg
    assert windy.overshoot_m > calm.overshoot_m
    away = _compare(crosswind_toward_runway_kt=-15.0)
    assert away.familiar_bank_required_deg < calm.familiar_bank_required_deg


def test_turn_functions_are_shared_not_copied():
    """The comparison uses briefer.core.turn (issue 4: one implementation of the turn formulas)."""
    from briefer.core import turn
    assert sightpicture.turn_radius_m is turn.turn_radius_m
    assert sightpicture.angle_of_attack_in_turn is turn.angle_of_attack_in_turn
