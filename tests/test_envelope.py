"""Tests of the vectorised wind envelope (briefer.core.manoeuvre.envelope).

The main check is agreement with an independent plain-Python scalar implementation,
benchmarks/envelope_scalar_reference.py (loops and the math module), on small grids; then the
symmetries a calm or mirrored wind must give (hand-derived), the documented thresholds, and
agreement with the single-plan path (choose_plan) on a few cells.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from briefer.core.maneuver import (
    DOES_NOT_FIT,
    FITS,
    MARGINAL,
    REASON_AREA,
    REASON_BANK,
    REASON_VISIBILITY,
    CircleInputs,
    choose_plan,
    runway_wind_from,
    wind_envelope,
)
from briefer.errors import DomainError
from briefer.units import NM_TO_M
from scalar_reference_support import REF

RUNWAY_M = 2500.0
R_CAT_B_M = 2.66 * NM_TO_M          # docs/REFERENCES.md 4b: ICAO Cat B R = 2.66 NM (published)


def stadium(radius_m):
    """Vectorised margin of tracks (..., N, 2): R minus the largest distance to the runway."""
    def margin(xy):
        x, y = xy[..., 0], xy[..., 1]
        return np.min(radius_m - np.hypot(x - np.clip(x, 0.0, RUNWAY_M), y), axis=-1)
    return margin


def stadium_scalar(radius_m):
    def margin(points):
        return min(radius_m - math.hypot(x - min(max(x, 0.0), RUNWAY_M), y) for x, y in points)
    return margin


def reciprocal(**kw):
    base = dict(tas_kt=120.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=RUNWAY_M + 1500.0,
                arrival_y_m=0.0, arrival_course_deg=180.0, circling_height_ft=600.0, runway_length_m=RUNWAY_M)
    base.update(kw)
    return CircleInputs(**base)


def aligned(**kw):
    """Arrival aligned with the landing runway, 1100 m past its threshold (the overfly circuit)."""
    return reciprocal(**{**dict(arrival_x_m=1100.0, arrival_course_deg=0.0), **kw})


SCENARIOS = [
    pytest.param(reciprocal(), R_CAT_B_M, 4000.0, id="reciprocal"),
    pytest.param(reciprocal(roll_rate_deg_per_s=5.0, roll_out_distance_m=1800.0), R_CAT_B_M, 4500.0,
                 id="reciprocal-ramps"),
    pytest.param(reciprocal(bank_deg=20.0, roll_out_distance_m=1500.0), 2400.0, 9000.0, id="bank-steps"),
    pytest.param(reciprocal(arrival_x_m=900.0, arrival_y_m=-1800.0, arrival_course_deg=70.0), R_CAT_B_M, 5000.0,
                 id="crossing"),
    pytest.param(reciprocal(arrival_x_m=-6000.0, arrival_y_m=-900.0, arrival_course_deg=20.0,
                            circling_height_ft=450.0), R_CAT_B_M, 7000.0, id="direct"),
    pytest.param(reciprocal(arrival_x_m=2000.0, arrival_y_m=1550.0, arrival_course_deg=42.0), R_CAT_B_M, 6000.0,
                 id="crossing-wide"),
    pytest.param(reciprocal(arrival_x_m=2000.0, arrival_y_m=1550.0, arrival_course_deg=42.0,
                            roll_rate_deg_per_s=5.0), R_CAT_B_M, 6000.0, id="crossing-wide-ramps"),
    pytest.param(aligned(), R_CAT_B_M, 5000.0, id="aligned"),
    pytest.param(aligned(roll_rate_deg_per_s=5.0, roll_out_distance_m=1800.0, arrival_y_m=200.0), R_CAT_B_M, 4000.0,
                 id="aligned-ramps"),
    pytest.param(aligned(bank_deg=20.0, arrival_x_m=-2500.0, arrival_y_m=-600.0, arrival_course_deg=-25.0,
                         circuit_turn_past_threshold_m=RUNWAY_M), 4200.0, 9000.0, id="near-aligned-bank-steps"),
]
DIRS = [0.0, 40.0, 90.0, 135.0, 180.0, 230.0, 300.0]
SPEEDS = [0.0, 8.0, 20.0, 33.0]


@pytest.mark.parametrize("inp, radius, vis", SCENARIOS)
def test_vectorised_equals_scalar_reference(inp, radius, vis):
    kw = dict(visibility_m=vis, bank_limit_deg=30.0, area_radius_m=radius)
    env = wind_envelope(inp, margin_fn=stadium(radius), wind_from_relative_deg=DIRS, wind_speed_kt=SPEEDS, **kw)
    ref = REF.envelope_scalar(inp, margin_track_fn=stadium_scalar(radius), wind_from_relative_deg=DIRS,
                              wind_speed_kt=SPEEDS, **kw)
    np.testing.assert_array_equal(env.status, np.array(ref["status"]))
    np.testing.assert_array_equal(env.reasons, np.array(ref["reasons"]))
    bank_ref = np.array([[np.nan if b is None else b for b in row] for row in ref["bank_needed"]])
    np.testing.assert_array_equal(env.bank_needed_deg, bank_ref)
    np.testing.assert_array_equal(env.best_candidate, np.array(ref["best"]))
    area_ref = np.array([[np.nan if a is None else a for a in row] for row in ref["area"]])
    dist_ref = np.array([[np.nan if a is None else a for a in row] for row in ref["dist"]])
    # same sampling, same algebra in another form: agreement to rounding (1e-6 m)
    np.testing.assert_allclose(env.area_margin_m, area_ref, atol=1e-6)
    np.testing.assert_allclose(env.max_distance_from_runway_m, dist_ref, atol=1e-6)
    assert len(set(env.status.ravel())) >= 1


def test_the_scenarios_exercise_every_verdict():
    # guard against a vacuous comparison: over the scenarios above all three verdicts occur
    seen = set()
    for p in SCENARIOS:
        inp, radius, vis = p.values
        env = wind_envelope(inp, margin_fn=stadium(radius), wind_from_relative_deg=DIRS, wind_speed_kt=SPEEDS,
                            visibility_m=vis, bank_limit_deg=30.0, area_radius_m=radius)
        seen |= set(env.status.ravel().tolist())
    assert seen == {FITS, MARGINAL, DOES_NOT_FIT}


@pytest.mark.parametrize("make", [reciprocal, aligned])
def test_zero_wind_symmetric_left_right(make):
    # hand-derived: calm + arrival on the centreline + a symmetric area: left and right mirror, so every
    # direction at 0 kt gives the same cell, and a wind from +a mirrors one from -a
    dirs = np.arange(0.0, 360.0, 10.0)
    env = wind_envelope(make(), margin_fn=stadium(R_CAT_B_M), visibility_m=4500.0, bank_limit_deg=30.0,
                        area_radius_m=R_CAT_B_M, wind_from_relative_deg=dirs, wind_speed_kt=[0.0, 15.0, 30.0])
    assert len(set(env.status[:, 0])) == 1 and len(set(env.reasons[:, 0])) == 1
    np.testing.assert_allclose(env.area_margin_m[:, 0], env.area_margin_m[0, 0], atol=1e-6)
    mirror = (-np.arange(36)) % 36                     # index of the direction -a
    np.testing.assert_array_equal(env.status, env.status[mirror])
    np.testing.assert_allclose(env.area_margin_m, env.area_margin_m[mirror], atol=1e-6)
    sides = [side for _, side in env.candidates]
    ok = env.best_candidate >= 0
    best_side = np.where(ok, np.array(sides)[np.maximum(env.best_candidate, 0)], "")
    # where the mirrored cells have different margins per side, the chosen sides are mirrored as well
    swapped = {"left": "right", "right": "left", "": ""}
    for i in range(36):
        for j in range(1, 3):
            if dirs[i] % 180.0 != 0.0:
                assert swapped[best_side[i, j]] == best_side[mirror[i], j]


def test_default_grid_and_thresholds():
    # defaults: every 10 deg x 0..40 kt (36 x 41)
    env = wind_envelope(reciprocal(), margin_fn=stadium(R_CAT_B_M), visibility_m=6000.0, bank_limit_deg=35.0,
                        area_radius_m=R_CAT_B_M)
    assert env.status.shape == (36, 41)
    assert env.wind_speed_kt[-1] == 40.0 and env.wind_from_relative_deg[-1] == 350.0
    # marginal area: less than 10 % of R (our threshold, documented)
    cells = (env.status == MARGINAL) & ((env.reasons & REASON_AREA) > 0)
    assert np.all(env.area_margin_m[cells] < 0.10 * R_CAT_B_M)
    fits = env.status == FITS
    assert np.all(env.area_margin_m[fits] >= 0.10 * R_CAT_B_M)
    assert np.all(env.max_distance_from_runway_m[fits] <= 0.9 * 6000.0)
    assert np.all(np.isnan(env.bank_needed_deg) == (env.status == DOES_NOT_FIT))
    assert fits.any()                                       # calm fits here (regression value, no published source)


def test_bank_escalation_and_limit():
    # R = 2.4 km with a 1.5 km roll-out: 20 deg does not fit in calm air, 30 deg does (see test_maneuver)
    inp = reciprocal(bank_deg=20.0, roll_out_distance_m=1500.0)
    env = wind_envelope(inp, margin_fn=stadium(2400.0), visibility_m=9000.0, bank_limit_deg=35.0, area_radius_m=2400.0,
                        wind_from_relative_deg=[0.0], wind_speed_kt=[0.0])
    # the brief's judgement: a bank above the target is not marginal by itself (the brief warns of it
    # apart); 30 deg is not within 5 deg of the 35 deg limit, so only the area margin makes it marginal
    assert env.status[0, 0] == MARGINAL and env.bank_needed_deg[0, 0] == 30.0
    assert env.reasons[0, 0] == REASON_AREA
    choice = choose_plan(inp, margin_fn=stadium(2400.0), visibility_m=9000.0, bank_limit_deg=35.0,
                         area_radius_m=2400.0)
    assert choice.bank_needed_deg == env.bank_needed_deg[0, 0]
    assert choice.ranked[0].verdict == "marginal" and len(choice.ranked[0].marginal) == 1
    # a target above the limit never fits, for the bank
    env = wind_envelope(reciprocal(bank_deg=32.0), margin_fn=stadium(9000.0), visibility_m=9000.0, bank_limit_deg=30.0,
                        area_radius_m=9000.0, wind_from_relative_deg=[0.0, 90.0], wind_speed_kt=[0.0, 10.0])
    assert np.all(env.status == DOES_NOT_FIT) and np.all(env.reasons & REASON_BANK)
    assert env.reason_texts(0, 0) == ("would need more than the bank limit",)


def test_visibility_reason():
    kw = dict(margin_fn=stadium(9000.0), bank_limit_deg=30.0, area_radius_m=9000.0, wind_from_relative_deg=[0.0],
              wind_speed_kt=[0.0])
    env = wind_envelope(reciprocal(), visibility_m=2000.0, **kw)
    assert env.status[0, 0] == DOES_NOT_FIT and env.reasons[0, 0] & REASON_VISIBILITY
    assert "runway beyond the visibility" in env.reason_texts(0, 0)
    # at 3000 m the descent-point roll-out takes the runway out of sight, a closer one (as the brief
    # tries) keeps it within the visibility, beyond 90 % of it: marginal, for the visibility
    assert wind_envelope(reciprocal(), visibility_m=3000.0, roll_out_steps=False, **kw).status[0, 0] == DOES_NOT_FIT
    env = wind_envelope(reciprocal(), visibility_m=3000.0, **kw)
    assert env.status[0, 0] == MARGINAL and env.reasons[0, 0] & REASON_VISIBILITY
    assert env.roll_out_m[0, 0] < 2500.0


@pytest.mark.parametrize("make", [reciprocal, aligned])
@pytest.mark.parametrize("wdir, wspd", [(0.0, 0.0), (70.0, 15.0), (200.0, 25.0), (320.0, 35.0)])
def test_envelope_cell_agrees_with_choose_plan(make, wdir, wspd):
    # the vectorised cell and the single-plan path rank the same way; their tracks are sampled at
    # different densities (7.5 vs 2 deg of turn), so margins agree to a few metres only
    inp = make(wind=runway_wind_from(wdir, wspd))
    kw = dict(visibility_m=5000.0, bank_limit_deg=30.0, area_radius_m=R_CAT_B_M)
    env = wind_envelope(inp, margin_fn=stadium(R_CAT_B_M), wind_from_relative_deg=[wdir], wind_speed_kt=[wspd], **kw)
    choice = choose_plan(inp, margin_fn=stadium(R_CAT_B_M), **kw)
    best = choice.ranked[0]
    if env.status[0, 0] == DOES_NOT_FIT:
        assert choice.bank_needed_deg is None
        return
    assert env.bank_needed_deg[0, 0] == choice.bank_needed_deg
    shape, _side = env.candidates[env.best_candidate[0, 0]]
    assert shape == best.plan.shape or abs(best.area_margin_m - env.area_margin_m[0, 0]) < 10.0
    assert env.area_margin_m[0, 0] == pytest.approx(best.area_margin_m, abs=10.0)


def test_aligned_arrival_has_an_envelope():
    # an arrival aligned with the landing runway used to get no candidate (every cell "no plan"); the overfly
    # circuit covers it: both sides are compared in every cell, and in calm air it fits (regression value, no
    # published source: R = 2.66 NM, 5000 m visibility)
    env = wind_envelope(aligned(), margin_fn=stadium(R_CAT_B_M), visibility_m=5000.0, bank_limit_deg=30.0,
                        area_radius_m=R_CAT_B_M, wind_from_relative_deg=DIRS, wind_speed_kt=SPEEDS)
    assert env.candidates == (("overfly-circuit", "left"), ("overfly-circuit", "right"))
    assert env.status[0, 0] != DOES_NOT_FIT and np.all(env.best_candidate >= 0)


def test_envelope_domain():
    kw = dict(margin_fn=stadium(R_CAT_B_M), bank_limit_deg=30.0, area_radius_m=R_CAT_B_M)
    with pytest.raises(DomainError):
        wind_envelope(reciprocal(), visibility_m=-1.0, **kw)
    with pytest.raises(DomainError):
        wind_envelope(reciprocal(), visibility_m=5000.0, wind_speed_kt=[-5.0], **kw)
    with pytest.raises(DomainError):
        wind_envelope(reciprocal(), visibility_m=5000.0, turn_step_deg=0.0, **kw)


def test_no_cell_offers_a_plan_where_circling_is_not_authorised():
    """The brief offers no plan where the approach publishes no circling minimums for the category
    flown (14 CFR 97.3 categories; the V2RL demo file marks category E not authorised); the
    envelope of the same request must say the same at every wind, and say why."""
    from briefer.brief import build_brief, envelope_for
    from briefer.core.maneuver import REASON_NOT_AUTHORISED
    from briefer.io import catalog
    from briefer.model import BriefRequest, Weather

    req = BriefRequest(profile=catalog.find_profile("demo-trainer", use_config=False),
                       airfield=catalog.find_airfield("V2RL", use_config=False),
                       approach="RNAV (GPS) RWY 09", landing_runway="09",
                       weather=Weather(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0))
    brief = build_brief(req, computed_utc="2000-01-01 00:00Z")
    assert not brief.minimums.authorised and not brief.plan.feasible
    env = envelope_for(req, wind_from_relative_deg=[0.0, 90.0, 180.0], wind_speed_kt=[0.0, 15.0])
    assert np.all(env.status == DOES_NOT_FIT)
    assert np.all(env.reasons == REASON_NOT_AUTHORISED)
    assert env.reason_texts(1, 1) == ("circling not authorised for the category",)
