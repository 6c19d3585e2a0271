"""The sampler's two layouts and its column form against the plain ones, to the last bit.

``sample_solution`` builds few tracks (under 64) in one block per leg kind, pieces joined in leg
order, and many tracks leg by leg in place; it reads a solution as one (F, M) array of the
fields it needs (``sampling_rows``), also of some rows only (the brief's plans from the
judgement's batch) instead of a solution with those rows taken out (``take_rows``). Each way
must give the same points, headings and times: the brief's plans and the envelope read them.
The geometry is the solver's own (tests/test_batch_cells.py checks it against cells solved alone).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from briefer.core.manoeuvre.solver import (
    CircleInputs,
    applicable_candidates,
    merge_for_sampling,
    sample_solution,
    sampling_rows,
    solve_inputs_shapes,
    take_rows,
)
from briefer.core.manoeuvre import solver
from briefer.core.manoeuvre.legs import ramp_q, runway_wind_from
from briefer.units import KT_TO_MPS


def _inputs(**kw) -> CircleInputs:
    base = dict(tas_kt=120.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=4000.0, arrival_y_m=0.0,
                arrival_course_deg=178.0, circling_height_ft=600.0, runway_length_m=2500.0, roll_rate_deg_per_s=10.0)
    base.update(kw)
    return CircleInputs(**base)


SCENARIOS = [_inputs(), _inputs(arrival_course_deg=183.0, roll_rate_deg_per_s=None),
             _inputs(arrival_course_deg=0.0, arrival_x_m=-4000.0), _inputs(arrival_course_deg=60.0, arrival_x_m=-3000.0,
                                                                        arrival_y_m=-2500.0)]


def _solutions(inp: CircleInputs, m: int):
    """Every applicable shape on m rows: winds every few degrees at 0-30 kt, both sides, two banks."""
    i = np.arange(m)
    deg, kt = np.radians(i * 37.0 % 360.0), (i % 4) * 10.0
    shapes = sorted({s for s, _ in applicable_candidates(inp.arrival_course_deg)})
    return shapes, solve_inputs_shapes(inp, shapes, sigma=np.where(i % 2, 1.0, -1.0), wx_mps=kt * KT_TO_MPS * np.cos(deg),
                                       wy_mps=kt * KT_TO_MPS * np.sin(deg), bank_deg=np.where(i % 3, 25.0, 30.0))


def _same(a, b):
    for f in ("xy", "heading", "time", "leg_index"):
        x, y = getattr(a, f), getattr(b, f)
        assert (x is None) == (y is None), f
        if x is not None:
            assert x.shape == y.shape and np.array_equal(np.ascontiguousarray(x).view(np.uint8),
                                                         np.ascontiguousarray(y).view(np.uint8)), f


@pytest.mark.parametrize("inp", SCENARIOS)
def test_many_tracks_in_place_are_the_tracks_sampled_a_few_at_a_time(inp):
    """Rows sampled in one call of 80 (leg by leg in place) = the same rows 8 at a time (one
    block per leg kind): every bit of points, headings and times (running product fixed)."""
    _, sols = _solutions(inp, 80)
    for sol in sols:
        for kw in (dict(pad_rows=True), dict(with_heading=True)):
            whole = sample_solution(sol, turn_step_deg=7.5, n_straight=5, running_product=True, **kw)
            for r in range(0, 80, 8):
                part = sample_solution(take_rows(sol, slice(r, r + 8)), turn_step_deg=7.5, n_straight=5,
                                       running_product=True, **kw)
                if kw.get("pad_rows"):      # counts of the rows' own calm-wind angles: the whole call pads to its most
                    assert part.xy.shape[1] <= whole.xy.shape[1]
                    continue
                _same(part, type(part)(xy=whole.xy[r:r + 8], heading=whole.heading[r:r + 8],
                                       time=whole.time[r:r + 8], leg_index=whole.leg_index))


@pytest.mark.parametrize("inp", SCENARIOS)
def test_rows_read_in_place_are_the_rows_taken_out(inp):
    """A plan's dense track from the batch's rows read in place (sampling_rows) = from those
    rows taken out of the solution (take_rows), slices and index arrays alike."""
    _, sols = _solutions(inp, 16)
    for sol in sols:
        for rows in (slice(2, None, 8), np.array([5, 1]), slice(0, 16)):
            kw = dict(turn_step_deg=2.0, n_straight=2, straight_step_m=100.0, with_heading=True)
            _same(sample_solution(sampling_rows(sol, rows), **kw), sample_solution(take_rows(sol, rows), **kw))


def _same_rows(a, b):
    assert (a is None) == (b is None)
    if a is not None:
        x, y = np.ascontiguousarray(a.cols), np.ascontiguousarray(b.cols)
        assert x.shape == y.shape and np.array_equal(x.view(np.uint8), y.view(np.uint8))
        assert np.array_equal(a.ok, b.ok) and a.kinds == b.kinds and a.k == b.k and a.at == b.at
        assert a.nominal_rad == b.nominal_rad and a.shape == b.shape


@pytest.mark.parametrize("inp", SCENARIOS)
def test_the_solves_one_array_gives_the_fields_one_by_one(inp):
    """The fields sampling reads, rows of the solve's one array (the turns' block, every other
    field once), merged or read in place = the same fields collected leg by leg from a solution
    without that array (take_rows of every row): every bit, every order of the shapes."""
    shapes, sols = _solutions(inp, 16)
    plain = [take_rows(sol, slice(None)) for sol in sols]
    assert all(sol.columns is not None for sol in sols) and all(p.columns is None for p in plain)
    for sol, p in zip(sols, plain):
        _same_rows(sampling_rows(sol), sampling_rows(p))
        for rows in (slice(2, None, 8), np.array([5, 1])):
            _same_rows(sampling_rows(sol, rows), sampling_rows(p, rows))
    for order in (list(range(len(sols))), list(range(len(sols)))[::-1]):
        for k in range(1, len(order) + 1):
            pick = order[:k]
            _same_rows(merge_for_sampling([sols[i] for i in pick]), merge_for_sampling([plain[i] for i in pick]))


def _bits(a: np.ndarray) -> bytes:
    return str((a.dtype, a.shape)).encode() + np.ascontiguousarray(a).tobytes()


def test_every_ramp_time_as_one_product_is_each_ramp_time_as_it_was():
    """The ramp sample times tr x (k/nr, 1.0, (nr-1-k)/nr) in one product (solver._ramp_times) =
    the roll-in's tr k/nr, the full ramp's tr + 0.0 (tr 0.0), the roll-out's tr (1 - k/nr - 1/nr),
    the way they were made before (the source of truth): every bit, for finite times (signed
    zeros, subnormal, huge) and NaN (a row that cannot be flown)."""
    rng = np.random.default_rng(7)
    tr = np.concatenate([rng.uniform(0.0, 8.0, 200), [0.0, -0.0, 5e-324, 1e300, -3.5, np.nan]]).reshape(2, -1)
    for nr in (1, 2, 3, 4):
        fr, out = solver._ramp_fractions(nr)[:2]
        tau_in = tr * fr
        before = np.concatenate([tau_in, tr[None] + 0.0 * tau_in[:1], tr * out], axis=0)
        assert _bits(solver._ramp_times(tr, solver._ramp_fractions(nr)[4])) == _bits(before)


def test_the_last_ramps_q_given_for_known_times_is_ramp_q_of_them():
    """_known_q (Q of ramp times found among the last batch's distinct times) = ramp_q of those
    times afresh (legs.ramp_q, the source of truth): every bit; None where a row's c, TAS or roll
    rate differs, a time is not among them, or a time is zero."""
    nr, k, c, v = 3, math.radians(10.0), 12.5, 61.7
    every = solver._ramp_fractions(nr)[4]
    u = np.sort(np.random.default_rng(3).uniform(0.5, 6.0, 12))
    saved = solver._LAST_Q[0]
    try:
        solver._LAST_Q[0] = (k, np.float64(c), np.float64(v), nr, u, ramp_q(u * every.reshape(-1, 1), c, v, k))
        for tr in (u[[4, 0, 11]].reshape(3, 1), u[[1, 1, 7, 2, 9, 3]].reshape(3, 2)):
            cs, vs = np.full(tr.shape, c), np.full(tr.shape, v)
            assert _bits(solver._known_q(tr, cs, vs, k, nr)) == _bits(ramp_q(tr * every, cs, vs, k))
            assert solver._known_q(tr, cs + 1e-9, vs, k, nr) is None
            assert solver._known_q(tr, cs, vs, k * 1.01, nr) is None
            assert solver._known_q(tr, cs, vs, k, 2) is None
            assert solver._known_q(tr + 1e-12, cs, vs, k, nr) is None
            assert solver._known_q(tr * 0.0, cs, vs, k, nr) is None
    finally:
        solver._LAST_Q[0] = saved


@pytest.mark.parametrize("inp", [s for s in SCENARIOS if s.roll_rate_deg_per_s is not None])
def test_a_plan_track_after_its_batch_is_the_track_sampled_afresh(inp, monkeypatch):
    """A plan's dense track sampled just after its batch (the ramps' Q taken from the batch's,
    solver._known_q) = the same rows sampled with no batch before (Q by ramp_q): every bit."""
    _, sols = _solutions(inp, 24)
    given = []
    real = solver._known_q
    monkeypatch.setattr(solver, "_known_q", lambda *a: given.append(real(*a)) or given[-1])
    kw = dict(turn_step_deg=2.0, n_straight=2, straight_step_m=100.0, with_heading=True)
    for sol in sols:
        for rows in (np.array([5]), np.array([6, 7]), slice(0, 2)):
            sample_solution(sol, turn_step_deg=7.5, n_straight=5, running_product=True, pad_rows=True)
            after = sample_solution(sampling_rows(sol, rows), **kw)
            solver._LAST_Q[0] = None
            _same(after, sample_solution(sampling_rows(sol, rows), **kw))
    assert any(q is not None for q in given) and any(q is None for q in given)
