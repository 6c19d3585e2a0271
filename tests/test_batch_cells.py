"""The judgement's batch (both sides of a shape in one solve and one sampling call, every level
and wind as rows) against each cell solved alone: one candidate, one side, one row.

A cell solved alone is the solver's plain use (``solve_inputs`` with one side's sign and one
wind, bank and roll-out; ``sample_solution`` at that side's own sample counts), so a batch that
mixed the sides' turn counts or let a row depend on its neighbours would differ here. The
numbers must be equal to the last bit, not close: the brief and the envelope read the same
cells. Then the brief's full plans built from the batch's rows against plans solved afresh.

The margins are this file's own: a stadium of radius R about the runway (ICAO Doc 8168 Vol II,
Part I, Section 4, Chapter 7: arcs about the thresholds joined by tangents) with a half-plane
not-authorised to the right of a line 1500 m right of the centreline (an invented sector).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from briefer.core.manoeuvre.judgement import (
    BATCH_N_STRAIGHT,
    BATCH_TURN_STEP_DEG,
    judge_winds,
    judgement_levels,
    solve_candidates,
)
from briefer.core.manoeuvre.plans import candidate_plans
from briefer.core.manoeuvre.solver import (
    CircleInputs,
    applicable_candidates,
    descent_geometry,
    sample_solution,
    solve_inputs,
    take_rows,
    turn_rows,
    turn_sample_count,
)
from briefer.core.manoeuvre.legs import runway_wind_from
from briefer.units import KT_TO_MPS, NM_TO_M

RUNWAY_M = 2500.0
R_M = 2.66 * NM_TO_M          # ICAO Cat B circling radius, Doc 8168 (as in tests/test_envelope.py)
SECTOR_Y_M = 1500.0


def margins(xy):
    """(margin, sector_bound) of tracks (..., N, 2): the stadium, limited by the sector's depth."""
    x, y = xy[..., 0], xy[..., 1]
    hull = np.min(R_M - np.hypot(x - np.clip(x, 0.0, RUNWAY_M), y), axis=-1)
    depth = np.min(np.where(y > SECTOR_Y_M, SECTOR_Y_M - y, np.inf), axis=-1)
    m = np.minimum(hull, depth)
    return m, m < hull


def _inputs(**kw) -> CircleInputs:
    base = dict(tas_kt=120.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=RUNWAY_M + 1500.0,
                arrival_y_m=0.0, arrival_course_deg=178.0, circling_height_ft=600.0, runway_length_m=RUNWAY_M,
                roll_rate_deg_per_s=10.0)
    base.update(kw)
    return CircleInputs(**base)


# arrivals a little off the reciprocal (each side's turn onto the downwind has its own calm-wind
# angle, so its own sample count), aligned (the overfly circuit), at an angle (direct turn and
# join); with roll ramps and with instant bank
SCENARIOS = [
    _inputs(),
    _inputs(arrival_course_deg=183.0, roll_rate_deg_per_s=None),
    _inputs(arrival_course_deg=200.0, tas_kt=160.0, circling_height_ft=900.0),
    _inputs(arrival_course_deg=0.0, arrival_x_m=-4000.0, roll_rate_deg_per_s=15.0),
    _inputs(arrival_course_deg=60.0, arrival_x_m=-3000.0, arrival_y_m=-2500.0),
]


def _rows(inp: CircleInputs):
    """Winds (every 45 deg, 0/15/30 kt) x every level of the judgement, as rows."""
    levels = judgement_levels(inp, bank_limit_deg=35.0)
    wx, wy, bank, ro = [], [], [], []
    for r, b in levels.order():
        for deg in range(0, 360, 45):
            for kt in (0.0, 15.0, 30.0):
                wx.append(kt * KT_TO_MPS * math.cos(math.radians(deg)))
                wy.append(kt * KT_TO_MPS * math.sin(math.radians(deg)))
                bank.append(levels.bank_deg[b])
                ro.append(levels.roll_out_m[r])
    return np.array(wx), np.array(wy), np.array(bank), np.array(ro)


def _cell_alone(inp, shape, side, wx, wy, bank, ro, vis):
    """One candidate on one row, solved and sampled alone: (ok, total time, distance, margin, sector)."""
    sol = solve_inputs(inp, shape, sigma=1.0 if side == "right" else -1.0, wx_mps=np.array([wx]),
                       wy_mps=np.array([wy]), bank_deg=np.array([bank]), roll_out_m=np.array([ro]),
                       descent=descent_geometry(inp))
    if not sol.ok[0]:
        return False, None, None, None, None
    xy = sample_solution(sol, turn_step_deg=BATCH_TURN_STEP_DEG, n_straight=BATCH_N_STRAIGHT,
                         running_product=True).xy
    x = xy[..., 0]
    d = float(np.sqrt(np.max(np.square(x - np.minimum(np.maximum(x, 0.0), RUNWAY_M)) + np.square(xy[..., 1]),
                             axis=-1))[0])
    m, sec = margins(xy)
    return True, float(sum(lg.duration for lg in sol.legs)[0]), d, float(m[0]), bool(sec[0])


@pytest.mark.parametrize("inp", SCENARIOS)
def test_every_cell_of_the_batch_is_the_cell_solved_alone(inp):
    cands = applicable_candidates(inp.arrival_course_deg)
    wx, wy, bank, ro = _rows(inp)
    vis = 3.0 * NM_TO_M
    batch = solve_candidates(inp, cands, wx_mps=wx, wy_mps=wy, bank_deg=bank, roll_out_m=ro, margin_fn=margins)
    step = 7                                     # every 7th row (the rows are alike; the test stays quick)
    for i in range(0, wx.size, step):
        for ci, (shape, side) in enumerate(cands):
            ok, t, d, m, sec = _cell_alone(inp, shape, side, wx[i], wy[i], bank[i], ro[i], vis)
            assert bool(batch.ok[i, ci]) == ok, (i, shape, side)
            if not ok:
                continue
            assert batch.total_time_s[i, ci] == t
            assert batch.max_distance_from_runway_m[i, ci] == d
            assert batch.area_margin_m[i, ci] == m
            assert bool(batch.sector_bound[i, ci]) == sec


def test_the_scenarios_mix_turn_counts_of_the_two_sides_in_one_call():
    """The point of the padded sampling: some shape's two sides sample a turn at different counts."""
    mixed = False
    for inp in SCENARIOS:
        shapes = {s for s, _ in applicable_candidates(inp.arrival_course_deg)}
        for shape in shapes:
            sols = [solve_inputs(inp, shape, sigma=sg, wx_mps=0.0, wy_mps=0.0, bank_deg=inp.bank_deg)
                    for sg in (-1.0, 1.0)]
            for a, b in zip(sols[0].legs, sols[1].legs):
                if a.kind == "turn" and (turn_sample_count(a.nominal_rad, BATCH_TURN_STEP_DEG)
                                         != turn_sample_count(b.nominal_rad, BATCH_TURN_STEP_DEG)):
                    mixed = True
    assert mixed


def _plan_fields(p):
    out = {}
    for f in dataclasses.fields(p):
        v = getattr(p, f.name)
        out[f.name] = v.tolist() if isinstance(v, np.ndarray) else v
    return out


@pytest.mark.parametrize("inp", SCENARIOS)
@pytest.mark.parametrize("wind", [(0.0, 0.0), (130.0, 20.0), (250.0, 12.0)])
def test_plans_built_from_the_batch_rows_are_the_plans_solved_afresh(inp, wind):
    """choose_plan_at_wind builds the chosen level's plans from the judgement's own rows."""
    inp = dataclasses.replace(inp, wind=runway_wind_from(*wind))
    wx, wy = inp.wind.mps()
    j = judge_winds(inp, wx_mps=[wx], wy_mps=[wy], margin_fn=margins, visibility_m=3.0 * NM_TO_M,
                    bank_limit_deg=35.0, area_radius_m=R_M, eager=True)
    order = j.levels.order()
    for i, (r, b) in enumerate(order):
        lvl_inputs = dataclasses.replace(inp, bank_deg=j.levels.bank_deg[b],
                                         roll_out_distance_m=j.levels.roll_out_chosen[r])
        solved = {j.candidates[cis[0]][0]: take_rows(sol, np.arange(len(cis)) * len(order) + i)
                  for cis, sol in j.solutions}
        from_batch = candidate_plans(lvl_inputs, solved=solved)
        afresh = candidate_plans(lvl_inputs)
        assert [_plan_fields(p) for p in from_batch] == [_plan_fields(p) for p in afresh]
        # the batch with each side's row (as choose_plan_at_wind gives it): rows taken out only
        # for a shape with a flyable side
        in_batch = candidate_plans(lvl_inputs, solved={j.candidates[cis[0]][0]: (sol, slice(i, None, len(order)))
                                                       for cis, sol in j.solutions})
        assert [_plan_fields(p) for p in in_batch] == [_plan_fields(p) for p in afresh]


def _arrays(value, path="sol"):
    """Every array of a solution (its legs and their profiles included), by path."""
    if isinstance(value, np.ndarray):
        yield path, value
    elif isinstance(value, (tuple, list)):
        for i, v in enumerate(value):
            yield from _arrays(v, f"{path}[{i}]")
    elif hasattr(value, "__slots__") and not isinstance(value, str):
        for f in value.__slots__:
            yield from _arrays(getattr(value, f), f"{path}.{f}")


@pytest.mark.parametrize("inp", SCENARIOS)
def test_turns_solved_at_one_roll_out_give_the_solve_at_another(inp):
    """The envelope solves each wind's turns once per bank (solve_shape's made/turns): a solve at a
    closer roll-out given the turns made at the first one, on some of its rows in another order,
    is the solve afresh to the last bit; turns made at another bank are not (the check can fail)."""
    wx, wy, bank, ro = _rows(inp)
    levels = judgement_levels(inp, bank_limit_deg=35.0)
    first, closer = levels.roll_out_m[0], levels.roll_out_m[-1]
    assert closer != first
    rows = np.array([5, 0, 17, 3, 3, 11])
    for shape in {s for s, _ in applicable_candidates(inp.arrival_course_deg)}:
        sigma = np.repeat([1.0, -1.0], 24)
        kw = dict(sigma=sigma, wx_mps=np.tile(wx[:24], 2), wy_mps=np.tile(wy[:24], 2), descent=descent_geometry(inp))
        made, made_steeper = [], []
        solve_inputs(inp, shape, bank_deg=bank[0], roll_out_m=first, made=made, **kw)
        solve_inputs(inp, shape, bank_deg=bank[0] + 5.0, roll_out_m=first, made=made_steeper, **kw)
        idx = np.concatenate([rows, rows + 24])          # both sides, some winds, in another order
        sub = dict(sigma=sigma[idx], wx_mps=kw["wx_mps"][idx], wy_mps=kw["wy_mps"][idx], descent=kw["descent"],
                   bank_deg=bank[0], roll_out_m=closer)
        afresh = dict(_arrays(solve_inputs(inp, shape, **sub)))
        given = dict(_arrays(solve_inputs(inp, shape, turns=turn_rows([(made, idx)]), **sub)))
        assert given.keys() == afresh.keys()
        for path, a in afresh.items():
            np.testing.assert_array_equal(given[path], a, err_msg=f"{shape} {path}")
        wrong = dict(_arrays(solve_inputs(inp, shape, turns=turn_rows([(made_steeper, idx)]), **sub)))
        assert any(not np.array_equal(wrong[p], a, equal_nan=True) for p, a in afresh.items())


def _generic_take(value, rows, m):
    """Every dataclass field, recursively: an array over the M rows taken, anything else kept."""
    if isinstance(value, np.ndarray):
        return value[rows] if value.ndim >= 1 and value.shape[0] == m else value
    if dataclasses.is_dataclass(value):
        return {f.name: _generic_take(getattr(value, f.name), rows, m) for f in dataclasses.fields(value)}
    if isinstance(value, tuple):
        return tuple(_generic_take(v, rows, m) for v in value)
    return value


def _same(a, b):
    if isinstance(a, np.ndarray) or isinstance(b, np.ndarray):
        return np.array_equal(a, b, equal_nan=True)
    if isinstance(a, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, tuple):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b))
    return a == b


@pytest.mark.parametrize("shape", ["break-and-return", "teardrop", "overfly-circuit", "downwind-join"])
def test_take_rows_takes_every_field_of_the_solution(shape):
    """take_rows (written field by field) against every dataclass field taken: no field left out
    or kept whole; each turn's calm-wind angle is the largest of the rows taken."""
    inp = _inputs(arrival_course_deg=0.0 if shape == "overfly-circuit" else (90.0 if shape == "downwind-join" else 178.0))
    m = 6
    sol = solve_inputs(inp, shape, sigma=np.repeat([1.0, -1.0], 3), wx_mps=np.linspace(-5, 5, m),
                       wy_mps=np.linspace(3, -3, m), bank_deg=np.repeat([25.0, 30.0], 3))
    for rows in (np.array([4, 1]), slice(1, None, 3)):
        got, want = _generic_take(take_rows(sol, rows), rows, 10**9), _generic_take(sol, rows, m)
        assert sol.columns is not None and got["columns"] is None
        want["columns"] = None      # the solve's own array of every row (sampling's): not taken, left out
        for lg in want["legs"]:
            if lg["nominal_rows"] is not None and lg["nominal_rows"].size:
                lg["nominal_rad"] = float(np.max(lg["nominal_rows"]))
        assert _same(got, want)


@pytest.mark.parametrize("inp", SCENARIOS)
def test_shapes_solved_together_are_each_shape_solved_alone(inp):
    """solve_inputs_shapes solves the shapes of one set of rows in one pass (one call of the turn
    kernels for all their turns): each shape's solution is its solve alone to the last bit."""
    from briefer.core.manoeuvre.solver import solve_inputs_shapes
    wx, wy, bank, ro = _rows(inp)
    shapes = sorted({s for s, _ in applicable_candidates(inp.arrival_course_deg)})
    kw = dict(sigma=np.repeat([1.0, -1.0], wx.size), wx_mps=np.tile(wx, 2), wy_mps=np.tile(wy, 2),
              bank_deg=np.tile(bank, 2), roll_out_m=np.tile(ro, 2), descent=descent_geometry(inp))
    together = solve_inputs_shapes(inp, shapes, **kw)
    for shape, sol in zip(shapes, together):
        alone = dict(_arrays(solve_inputs(inp, shape, **kw)))
        got = dict(_arrays(sol))
        assert got.keys() == alone.keys()
        for path, a in alone.items():
            np.testing.assert_array_equal(got[path], a, err_msg=f"{shape} {path}")


@pytest.mark.parametrize("inp", SCENARIOS)
def test_a_small_batch_sampled_whole_gives_the_cells_taken_one_shape_at_a_time(inp, monkeypatch):
    """A small batch's shapes are sampled in one call and its cells taken out at once
    (judgement._sampled_whole): the same rows, candidates and track points, bit for bit, as the
    general way (each shape's cells found on its own and joined), here also with cells left out
    of the sampling (as a pruned level leaves them) and a candidate with none sampled."""
    from briefer.core.manoeuvre import judgement as jm

    wx = np.array([0.0, 8.0, -12.0, 5.0])
    wy = np.array([0.0, -6.0, 3.0, 11.0])
    cands = applicable_candidates(inp.arrival_course_deg)
    batch = solve_candidates(inp, cands, wx_mps=wx, wy_mps=wy, bank_deg=np.array([25.0, 25.0, 30.0, 30.0]),
                             roll_out_m=descent_geometry(inp).roll_out_distance_m, margin_fn=margins)
    solved = [(list(cis), sol) for cis, sol in batch.solutions]
    kw = dict(turn_step_deg=BATCH_TURN_STEP_DEG, n_straight=BATCH_N_STRAIGHT)
    for drop in (None, 0, len(cands) - 1):
        sampled = batch.ok.copy()
        if drop is not None:
            sampled[1::2, drop] = False
            sampled[:, drop] &= drop != 0          # candidate 0: no cell sampled
        whole = jm._sampled(solved, sampled, 4, **kw)
        monkeypatch.setattr(jm, "_sampled_whole", lambda *a, **k: None)
        each = jm._sampled(solved, sampled, 4, **kw)
        monkeypatch.undo()
        assert len(whole) == len(each)
        for got, want in zip(whole, each, strict=True):
            for a, b in zip(got, want, strict=True):
                assert a.dtype == b.dtype and a.shape == b.shape and a.tobytes() == b.tobytes()


@pytest.mark.parametrize("inp", SCENARIOS)
def test_a_solutions_reasons_are_its_own_int_array_of_the_rows(inp):
    """solver._solution takes a shape's reasons as its solve made them (no broadcast copy): the
    rule it replaces, ``np.asarray(reasons, dtype=int64) + zeros``, gives the same numbers only
    if they are an int64 array of the rows, of that shape's own (not shared with another shape,
    nor with the tracks every shape shares)."""
    from briefer.core.manoeuvre.solver import solve_inputs_shapes
    wx, wy, bank, ro = _rows(inp)
    shapes = ("downwind-join", "break-and-return", "teardrop", "direct-turn", "overfly-circuit")
    sols = solve_inputs_shapes(inp, shapes, sigma=np.repeat([1.0, -1.0], wx.size), wx_mps=np.tile(wx, 2),
                               wy_mps=np.tile(wy, 2), bank_deg=np.tile(bank, 2), roll_out_m=np.tile(ro, 2))
    for i, sol in enumerate(sols):
        assert sol.reasons.dtype == np.int64 and sol.reasons.shape == sol.ok.shape == (2 * wx.size,)
        assert sol.reasons.base is None and sol.reasons.flags.writeable
        np.testing.assert_array_equal(sol.ok, sol.reasons == 0)
        for other in sols[i + 1:]:
            assert not np.shares_memory(sol.reasons, other.reasons)


def test_bank_range_checked_on_floats_is_the_array_check(monkeypatch):
    """A few rows' banks are checked on floats (solver._FEW_BANKS): 0 < bank < 90 as the array
    test ((b > 0) & (b < 90)).all(), NaN failing both; the same banks raise on either path."""
    from briefer.core.manoeuvre import solver
    from briefer.errors import DomainError
    inp = SCENARIOS[0]

    def raises(bank):
        try:
            solver.solve_inputs_shapes(inp, ("teardrop",), sigma=1.0, wx_mps=0.0, wy_mps=0.0, bank_deg=bank)
        except DomainError:
            return True
        return False

    cases = [25.0, 0.0, -0.0, 90.0, 89.999, 1e-300, -5.0, math.nan, math.inf, [25.0, 30.0], [25.0, 0.0],
             [30.0, math.nan], np.array([[20.0, 45.0]])]
    floats = [raises(b) for b in cases]
    monkeypatch.setattr(solver, "_FEW_BANKS", -1)
    assert floats == [raises(b) for b in cases]
    assert floats == [False, True, True, True, False, False, True, True, True, False, True, True, False]


def test_candidates_of_a_float_course_wrap_it_as_wrap_180():
    """applicable_candidates wraps a float course with Python's % (fmod, then the sign of 360: the
    rule of numpy's mod) instead of core.angles.wrap_180: the same wrapped number to the bit, so
    the same candidates, at the rules' edges, signed zeros and large or non-finite courses."""
    from briefer.core.angles import wrap_180
    for c in (0.0, -0.0, 30.0, -30.0, 90.0, -90.0, 120.0, 150.0, 179.999, 180.0, -180.0, 210.0, 359.9, 360.0,
              -360.0, 540.0, 1e-300, -1e-300, 1e17, -7.5e15, 5.000000000000001, math.nan, math.inf, -math.inf):
        want = float(wrap_180(c)) if math.isfinite(c) else math.nan
        got = (c + 180.0) % 360.0 - 180.0
        assert math.copysign(1.0, got) == math.copysign(1.0, want) or got != got, c
        assert got == want or (got != got and want != want), c
        with np.errstate(invalid="ignore"):         # (numpy warns of an infinite course)
            assert applicable_candidates(c) == applicable_candidates(np.float64(c)), c
