"""The batch judgement (briefer.core.maneuver.judge_winds) against a cell-by-cell solve.

Two independent checks of the one vectorised call that both the brief and the envelope use:

* the plain-Python scalar reference (benchmarks/envelope_scalar_reference.py: loops and the
  math module, one cell, one level, one candidate, one track point at a time) gives the same
  verdicts, reasons, levels and best candidates, here with the angle-of-attack check and a margin
  function that reports not-authorised sectors (the reasons the brief's judgement uses);
* a wind solved alone (the brief's way: one wind, every level in one call) gives what the same
  wind gives inside a grid solved level by level (the envelope's way): a row's numbers do not
  depend on the other rows of the batch.

The margins are this file's own: a stadium of radius R about the runway (ICAO Doc 8168 Vol I,
Part I, Section 4, Chapter 7: arcs about the thresholds joined by tangents) with a half-plane
not-authorised to the right of a line 1500 m right of the centreline (our invented sector).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from briefer.core.maneuver import (
    DOES_NOT_FIT,
    REASON_SECTOR,
    REASON_STALL,
    CircleInputs,
    judge_winds,
    runway_wind_from,
    wind_envelope,
)
from briefer.units import KT_TO_MPS, NM_TO_M
from scalar_reference_support import REF

RUNWAY_M = 2500.0
R_M = 2.66 * NM_TO_M          # ICAO Cat B circling radius, Doc 8168 (as in tests/test_envelope.py)
SECTOR_Y_M = 1500.0           # not authorised: y > 1500 m (right of the centreline)


def margins(xy):
    """(margin, sector_bound) of tracks (..., N, 2): the stadium, limited by the sector's depth."""
    x, y = xy[..., 0], xy[..., 1]
    hull = np.min(R_M - np.hypot(x - np.clip(x, 0.0, RUNWAY_M), y), axis=-1)
    depth = np.min(np.where(y > SECTOR_Y_M, SECTOR_Y_M - y, np.inf), axis=-1)
    m = np.minimum(hull, depth)
    return m, m < hull


def margins_scalar(points):
    hull = min(R_M - math.hypot(x - min(max(x, 0.0), RUNWAY_M), y) for x, y in points)
    depth = min((SECTOR_Y_M - y for x, y in points if y > SECTOR_Y_M), default=math.inf)
    return min(hull, depth), depth < hull


def aoa_margin(bank_deg: float) -> float:
    """An invented stall margin: 6 deg at 25 deg bank, shrinking with the load factor."""
    return 6.0 - 8.0 * (1.0 / math.cos(math.radians(bank_deg)) - 1.0 / math.cos(math.radians(25.0))) * 10.0


def reciprocal(**kw):
    base = dict(tas_kt=120.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=RUNWAY_M + 1500.0,
                arrival_y_m=0.0, arrival_course_deg=180.0, circling_height_ft=600.0, runway_length_m=RUNWAY_M,
                roll_rate_deg_per_s=10.0)
    base.update(kw)
    return CircleInputs(**base)


SCENARIOS = [
    pytest.param(reciprocal(), 4500.0, id="reciprocal"),
    pytest.param(reciprocal(), 3000.0, id="reciprocal-low-visibility"),
    pytest.param(reciprocal(arrival_x_m=900.0, arrival_y_m=-1800.0, arrival_course_deg=70.0), 5000.0,
                 id="crossing"),
    pytest.param(reciprocal(arrival_x_m=1100.0, arrival_course_deg=0.0, roll_out_distance_m=2200.0), 3800.0,
                 id="aligned"),
]
DIRS = [0.0, 45.0, 90.0, 160.0, 200.0, 270.0, 315.0]
SPEEDS = [0.0, 10.0, 22.0, 35.0]


@pytest.mark.parametrize("inp, vis", SCENARIOS)
def test_batch_equals_the_plain_python_cell_by_cell_solve(inp, vis):
    kw = dict(visibility_m=vis, bank_limit_deg=35.0, area_radius_m=R_M, wind_from_relative_deg=DIRS,
              wind_speed_kt=SPEEDS, aoa_margin_fn=aoa_margin)
    env = wind_envelope(inp, margin_fn=margins, **kw)
    ref = REF.envelope_scalar(inp, margin_track_fn=margins_scalar, **kw)
    np.testing.assert_array_equal(env.status, np.array(ref["status"]))
    np.testing.assert_array_equal(env.reasons, np.array(ref["reasons"]))
    np.testing.assert_array_equal(env.best_candidate, np.array(ref["best"]))
    nan = np.nan
    np.testing.assert_array_equal(env.bank_needed_deg, np.array([[nan if b is None else b for b in row]
                                                                 for row in ref["bank_needed"]]))
    np.testing.assert_allclose(env.roll_out_m, np.array([[nan if b is None else b for b in row]
                                                         for row in ref["roll_out"]]), atol=1e-6)
    np.testing.assert_allclose(env.area_margin_m, np.array([[nan if a is None else a for a in row]
                                                            for row in ref["area"]]), atol=1e-6)


def test_the_scenarios_exercise_sector_stall_and_closer_roll_outs():
    # guard against a vacuous comparison above
    seen_reasons, closer, nofit = 0, False, False
    for p in SCENARIOS:
        inp, vis = p.values
        env = wind_envelope(inp, margin_fn=margins, visibility_m=vis, bank_limit_deg=35.0, area_radius_m=R_M,
                            wind_from_relative_deg=DIRS, wind_speed_kt=SPEEDS, aoa_margin_fn=aoa_margin)
        seen_reasons |= int(np.bitwise_or.reduce(env.reasons.ravel()))
        default = judge_winds(inp, wx_mps=[0.0], wy_mps=[0.0], margin_fn=margins, visibility_m=vis,
                              bank_limit_deg=35.0, area_radius_m=R_M).levels.roll_out_m[0]
        closer |= bool(np.any(env.roll_out_m < default - 1.0))
        nofit |= bool(np.any(env.status == DOES_NOT_FIT))
    assert seen_reasons & REASON_SECTOR and seen_reasons & REASON_STALL and closer and nofit


@pytest.mark.parametrize("inp, vis", SCENARIOS)
def test_a_wind_alone_gives_what_it_gives_in_the_grid(inp, vis):
    kw = dict(margin_fn=margins, visibility_m=vis, bank_limit_deg=35.0, area_radius_m=R_M, aoa_margin_fn=aoa_margin)
    rel = np.radians(np.repeat(DIRS, len(SPEEDS)))
    spd = np.tile(SPEEDS, len(DIRS)) * KT_TO_MPS
    wx, wy = -spd * np.cos(rel), -spd * np.sin(rel)
    grid = judge_winds(inp, wx_mps=wx, wy_mps=wy, **kw)                 # level by level, many rows
    for k in range(wx.size):
        one = judge_winds(inp, wx_mps=wx[k:k + 1], wy_mps=wy[k:k + 1], eager=True, **kw)
        for name in ("status", "reasons", "roll_out_index", "bank_index", "best_candidate"):
            assert getattr(one, name)[0] == getattr(grid, name)[k], (name, k)
        np.testing.assert_allclose(one.area_margin_m[0], grid.area_margin_m[k], atol=1e-9)
        np.testing.assert_allclose(one.max_distance_from_runway_m[0], grid.max_distance_from_runway_m[k], atol=1e-9)


def test_wind_limits_cut_cells_by_their_components():
    # hand derivation: from 90 deg relative, 25 kt is all crosswind (25 > 20); from 180, 15 kt is all
    # tailwind (15 > 10); 5 kt from anywhere is within both; from 0 deg every speed is a headwind
    env = wind_envelope(reciprocal(), margin_fn=margins, visibility_m=4500.0, bank_limit_deg=35.0, area_radius_m=R_M,
                        wind_from_relative_deg=[0.0, 90.0, 180.0], wind_speed_kt=[5.0, 15.0, 25.0],
                        crosswind_limit_kt=20.0, tailwind_limit_kt=10.0)
    from briefer.core.maneuver import REASON_LIMIT

    limited = (env.reasons & REASON_LIMIT) > 0
    np.testing.assert_array_equal(limited, [[False, False, False], [False, False, True], [False, True, True]])
    assert np.all(env.status[limited] == DOES_NOT_FIT) and np.all(np.isnan(env.bank_needed_deg[limited]))
    assert env.reason_texts(1, 2) == ("beyond the crosswind or tailwind limit",)


GRID_DIRS = np.arange(0.0, 360.0, 20.0)
GRID_SPEEDS = np.arange(0.0, 41.0, 5.0)     # 18 x 9 = 162 winds: enough rows for the batch to leave some out


@pytest.mark.parametrize("inp, vis", SCENARIOS)
def test_a_grid_level_by_level_gives_what_one_batch_of_every_level_gives(inp, vis):
    # the envelope's way (level by level, only the winds still without a plan; the fallback level
    # solved in full only for the winds that fit nowhere) against every level of every wind at once
    kw = dict(margin_fn=margins, visibility_m=vis, bank_limit_deg=35.0, area_radius_m=R_M, aoa_margin_fn=aoa_margin)
    rel = np.radians(np.repeat(GRID_DIRS, GRID_SPEEDS.size))
    spd = np.tile(GRID_SPEEDS, GRID_DIRS.size) * KT_TO_MPS
    wx, wy = -spd * np.cos(rel), -spd * np.sin(rel)
    grid = judge_winds(inp, wx_mps=wx, wy_mps=wy, **kw)
    every = judge_winds(inp, wx_mps=wx, wy_mps=wy, eager=True, **kw)
    for name in ("status", "reasons", "roll_out_index", "bank_index", "best_candidate", "bank_needed_deg",
                 "roll_out_m", "area_margin_m", "max_distance_from_runway_m"):
        np.testing.assert_array_equal(getattr(grid, name), getattr(every, name), err_msg=name)


def test_cells_beyond_the_wind_limits_leave_the_other_cells_as_they_were():
    # the envelope does not judge the winds beyond the limits; every other cell is what it is
    # without limits
    kw = dict(margin_fn=margins, visibility_m=4500.0, bank_limit_deg=35.0, area_radius_m=R_M,
              wind_from_relative_deg=GRID_DIRS, wind_speed_kt=GRID_SPEEDS, aoa_margin_fn=aoa_margin)
    free = wind_envelope(reciprocal(), **kw)
    cut = wind_envelope(reciprocal(), crosswind_limit_kt=20.0, tailwind_limit_kt=10.0, **kw)
    from briefer.core.maneuver import REASON_LIMIT

    within = (cut.reasons & REASON_LIMIT) == 0
    assert 0 < within.sum() < within.size
    for name in ("status", "reasons", "bank_needed_deg", "best_candidate", "area_margin_m",
                 "max_distance_from_runway_m", "roll_out_m"):
        np.testing.assert_array_equal(getattr(cut, name)[within], getattr(free, name)[within], err_msg=name)


@pytest.mark.parametrize("seed", range(40))
def test_best_of_level_in_plain_floats_is_the_array_rule(seed, monkeypatch):
    """A few rows are ranked in plain floats (judgement._best_of_level_floats): every field, its
    bits and its dtype are the array rule's, here on invented batches made to hit its corners:
    exact ties of the rounded keys (half metres, half tenths of a second), margins of the
    thresholds, candidates that cannot be flown (NaN numbers), rows with none flyable, and a
    NaN margin of a flyable candidate (handed to the array path)."""
    from briefer.core.manoeuvre import judgement as jm

    rng = np.random.default_rng(seed)
    m, c = 16, 8
    ok = rng.random((m, c)) < 0.7
    ok[0] = False
    area = rng.choice([-0.5, 0.0, 0.5, 1.5, 2.5, 1e4], (m, c), p=[0.1] * 5 + [0.5]) + rng.choice([0.0, 1e-9], (m, c))
    dist = rng.choice([1000.0, 4345.0, 4346.0, 4828.0, 4829.0], (m, c), p=[0.6, 0.1, 0.1, 0.1, 0.1])
    ttime = rng.choice([100.35, 100.4, 100.45, 100.3, 100.05, 100.0], (m, c))     # 100.35: 100.4 as numpy rounds
    if seed % 10 == 5:
        area[3, 1], ok[3, 1] = np.nan, True
    area[~ok] = dist[~ok] = ttime[~ok] = np.nan
    batch = jm.CandidateBatch(ok=ok, area_margin_m=area, sector_bound=rng.random((m, c)) < 0.3,
                              max_distance_from_runway_m=dist, total_time_s=ttime)
    kw = dict(bank_deg=rng.choice([20.0, 25.0, 30.0, 36.0], m), bank_limit_deg=35.0, visibility_m=4828.0,
              area_radius_m=R_M if seed % 2 else None,
              aoa_margin_deg=None if seed % 3 == 0 else rng.choice([-1.0, 0.0, 2.0, 5.0], m))
    floats = jm.best_of_level(batch, **kw)
    monkeypatch.setattr(jm, "_FLOAT_CELLS", 0)
    arrays = jm.best_of_level(batch, **kw)
    for f in jm.LevelBest.__slots__:
        a, b = getattr(floats, f), getattr(arrays, f)
        assert a.dtype == b.dtype and a.shape == b.shape and a.tobytes() == b.tobytes(), f


@pytest.mark.parametrize("seed", range(10))
def test_settling_every_level_in_plain_python_is_the_array_rule(seed, monkeypatch):
    """A few winds x levels are settled in plain Python (judgement._settle_every_level_floats):
    every array, its bits and its dtype are the array rule's, on invented levels' bests (the
    first level that fits, else the fallback with its failures; no candidate at all)."""
    from briefer.core.manoeuvre import judgement as jm

    rng = np.random.default_rng(seed)
    n, banks = (1, 2, 3, 5)[seed % 4], 1 + seed % 3
    order = [(r, b) for r in range(2 + seed % 2) for b in range(banks)]
    k = len(order)
    lb = jm.LevelBest(best=rng.choice([-1, 0, 1, 2], k * n), failures=rng.choice([0, 0, 1, 4, 6, 32], k * n),
                      marginal=rng.choice([0, 0, 1, 2, 16], k * n), area_margin_m=rng.normal(100.0, 300.0, k * n),
                      max_distance_from_runway_m=rng.normal(3000.0, 900.0, k * n),
                      slack_m=rng.choice([-np.inf, -30.0, 12.5, np.nan], k * n))
    floats = jm._settle_every_level(lb, order, (0, banks - 1), n)
    monkeypatch.setattr(jm, "_FLOAT_CELLS", 0)
    arrays = jm._settle_every_level(lb, order, (0, banks - 1), n)
    for a, b in zip(floats, arrays, strict=True):
        assert a.dtype == b.dtype and a.shape == b.shape and a.tobytes() == b.tobytes()


def test_one_winds_rows_and_the_wind_check_on_floats_are_the_array_rule(monkeypatch):
    """One wind's rows (judgement.judge_winds, eager) are the wind repeated and each level's values
    without a repeat (judgement._per_level): the same arrays, bits and dtypes as tiling the wind
    and repeating each value once; the finiteness of a few winds is checked on floats, and the
    same winds are refused as by the array check."""
    from briefer.core.manoeuvre import judgement as jm
    from briefer.errors import DomainError

    for w in (0.0, -0.0, 12.5, -3.25e-7):
        a = np.array([w])
        for k in (1, 2, 8):
            got, want = a[np.arange(1)].repeat(k), jm._tile(a[np.arange(1)], k)
            assert got.dtype == want.dtype and got.shape == want.shape and got.tobytes() == want.tobytes()
    for vals, dtype in (([25.0, 30.0, -0.0], float), ([True, False], bool)):
        got, want = jm._per_level(vals, 1, dtype), np.array(vals, dtype=dtype).repeat(1)
        assert got.dtype == want.dtype and got.shape == want.shape and got.tobytes() == want.tobytes()
    inp = reciprocal()
    kw = dict(margin_fn=margins, visibility_m=4500.0, bank_limit_deg=35.0, area_radius_m=R_M, eager=True)

    def refused(wx, wy):
        try:
            judge_winds(inp, wx_mps=wx, wy_mps=wy, **kw)
        except DomainError:
            return True
        return False

    winds = [([0.0], [0.0]), ([math.nan], [0.0]), ([0.0], [math.inf]), ([-math.inf], [1.0]), ([1.0, 2.0], [0.0]),
             ([3.0, math.nan], [1.0, 2.0]), ([5.0], [-4.0])]
    floats = [refused(wx, wy) for wx, wy in winds]
    monkeypatch.setattr(jm, "_FEW_ROWS", 0)
    assert floats == [refused(wx, wy) for wx, wy in winds]
    assert floats == [False, True, True, True, True, True, False]
