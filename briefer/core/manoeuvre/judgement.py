"""One judgement for the brief and the wind envelope: a batch of candidates solved at once.

The brief is the envelope evaluated at one wind. Every candidate (shape, side) at every level
(roll-out distance x bank) is solved in one vectorised batch of rows (one row = one wind at one
level), each row's tracks are sampled at counts that do not depend on the other rows (so a
row gives the same numbers alone or among thousands), and the same rules pick, for every wind:

1. the levels in order: the default roll-out (the descent point) at the target bank, then every
   bank step up to the limit (:func:`briefer.core.manoeuvre.ranking.bank_levels_deg`); only if
   nothing fits at any bank there, the closer roll-outs (:func:`roll_out_steps_m`), each with the
   same bank steps;
2. at a level, the candidates ranked as :func:`briefer.core.manoeuvre.ranking.rank_plans` ranks
   them (failures first, then the smaller of area margin and visibility margin to 1 m, then the
   total time to 0.1 s; exact ties keep the candidate order);
3. the first level whose best candidate has no failure; if there is none, the default
   roll-out's last bank level (the best there is shown with its failures).

The verdict of the chosen candidate is :func:`briefer.core.manoeuvre.ranking.plan_checks`: the
same function that rank_plans uses for every plan of the brief. FITS, MARGINAL (and which
criterion: bank, area margin, a not-authorised sector, visibility, angle of attack) or
DOES_NOT_FIT (the failures of the best at the last level, or REASON_WIND when no candidate can
be flown at all).

The brief solves its one wind with every level in a single call (``eager``) and then builds the
full sampled plans only at the chosen level (the chosen plan and the alternatives shown); the
envelope solves level by level, each time only for the winds still without a fitting plan, and
the fallback level's full margins (its best is shown) only for the winds that fit at no level.

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (visual manoeuvring area), 5th ed., 2006.
.. [2] FAA, Aeronautical Information Manual, 5-4-20 (circling: remain at the MDA until in a
   position to descend with normal manoeuvres).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping, Sequence
from briefer._dataclass import dataclass, field

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.legs import FloatArray, ramp_q
from briefer.core.manoeuvre.plans import candidate_plans, inputs_at_level
from briefer.core.manoeuvre.ranking import (
    PlanChoice,
    REASON_AREA,
    REASON_BANK,
    REASON_SECTOR,
    REASON_STALL,
    REASON_VISIBILITY,
    REASON_WIND,
    MarginFn,
    bank_levels_deg,
    plan_checks,
    plan_checks_one,
    rank_plans,
)
from briefer.core.manoeuvre.solver import (
    CircleInputs,
    DescentGeometry,
    LegArrays,
    Shape,
    ShapeSolution,
    Side,
    applicable_candidates,
    descent_geometry,
    merge_for_sampling,
    sample_solution,
    solve_inputs_shapes,
    take_rows,
    turn_rows,
    turn_sample_count,
)
from briefer.errors import DomainError

FITS, MARGINAL, DOES_NOT_FIT = 2, 1, 0
STATUS_TEXT = {FITS: "fits", MARGINAL: "marginal", DOES_NOT_FIT: "does not fit"}
ROLL_OUT_STEPS = (0.66, 0.33, 0.0)   # of the way from the stabilised distance to the descent point
BATCH_TURN_STEP_DEG = 7.5            # batch tracks: a point every 7.5 deg of each turn's calm angle ...
BATCH_N_STRAIGHT = 5                 # ... and 5 points per straight (the final: its two ends)
_INFEASIBLE = 1000                   # failure count of a candidate that cannot be flown
DENSE_CHECK_M = 50.0                 # a level the batch rejects by less than this is checked on the full plans
PROOF_MARGIN_M = 5.0                 # a coarse bound proves a failure only beyond the threshold by this
_TAIL_ROWS = 512                     # few winds left: every level left in one batch (rows x levels)
_PRUNE_MIN_ROWS = 64                 # below this many rows every row is sampled (pruning costs more)


def roll_out_steps_m(inputs: CircleInputs, descent: DescentGeometry | None = None) -> tuple[float, ...]:
    """The closer roll-outs tried, in order, when no plan fits at the descent point: steps toward
    the stabilised distance (descending in the final turn), ``ROLL_OUT_STEPS`` of the way
    (``descent``: the inputs' :func:`descent_geometry`, if already made)."""
    geo = descent_geometry(inputs) if descent is None else descent
    return tuple(geo.stabilised_distance_m + f * (geo.roll_out_distance_m - geo.stabilised_distance_m)
                 for f in ROLL_OUT_STEPS)


@dataclass(frozen=True, slots=True, kw_only=True)
class Levels:
    """The levels tried, in order: for each roll-out (default first), every bank level.

    ``roll_out_m[0]`` is the default (the inputs' own roll-out, ``None`` in ``roll_out_chosen``);
    the others are :func:`roll_out_steps_m`.
    """

    roll_out_m: tuple[float, ...]
    roll_out_chosen: tuple[float | None, ...]
    bank_deg: tuple[float, ...]

    def order(self) -> list[tuple[int, int]]:
        """(roll-out index, bank index) in the order tried."""
        return [(r, b) for r in range(len(self.roll_out_m)) for b in range(len(self.bank_deg))]


def judgement_levels(inputs: CircleInputs, *, bank_limit_deg: float, bank_step_deg: float = 5.0,
                     roll_out_steps: bool = True, descent: DescentGeometry | None = None) -> Levels:
    """The bank levels (at most 60 deg, the solver's range) and roll-outs of the judgement
    (``descent``: the inputs' :func:`descent_geometry`, if already made)."""
    banks = tuple(b for b in bank_levels_deg(inputs.bank_deg, bank_limit_deg, bank_step_deg) if b <= 60.0)
    geo = descent_geometry(inputs) if descent is None else descent
    steps = roll_out_steps_m(inputs, geo) if roll_out_steps else ()
    return Levels(roll_out_m=(geo.roll_out_distance_m,) + tuple(max(d, geo.stabilised_distance_m) for d in steps),
                  roll_out_chosen=(inputs.roll_out_distance_m,) + steps, bank_deg=banks)


@dataclass(frozen=True, slots=True, kw_only=True)
class CandidateBatch:
    """Every candidate solved on every row: arrays of shape (M, C) (rows x candidates).

    ``ok`` flyable; ``area_margin_m`` smallest protected-area margin (NaN where not ok) [m];
    ``sector_bound`` the margin is a not-authorised sector's; ``max_distance_from_runway_m``
    [m]; ``total_time_s`` arrival to threshold [s].
    """

    ok: npt.NDArray[np.bool_]
    area_margin_m: FloatArray
    sector_bound: npt.NDArray[np.bool_]
    max_distance_from_runway_m: FloatArray
    total_time_s: FloatArray
    solutions: tuple[tuple[tuple[int, ...], ShapeSolution], ...] = field(default=(), compare=False)
    """Per shape: its candidates' indices and their solution (rows: side by side, then row)."""


def _margins(margin_fn: MarginFn, xy: FloatArray) -> tuple[FloatArray, npt.NDArray[np.bool_]]:
    """Call the margin function; it may answer the margins alone or (margins, sector_bound)."""
    out = margin_fn(xy)
    if isinstance(out, tuple):
        m, sec = out
        return np.asarray(m, dtype=float), np.asarray(sec, dtype=bool)
    m = np.asarray(out, dtype=float)
    return m, np.zeros(m.shape, dtype=bool)


def _ramp_end_q(tr: FloatArray, c: FloatArray, v: FloatArray, k: float, cache: dict[tuple[float, ...], complex]
                ) -> complex | npt.NDArray[np.complex128]:
    """Q(tr) = C + i S of each row's roll-in ramp (:func:`briefer.core.manoeuvre.legs.ramp_q`);
    computed once (and kept in ``cache``) when every row has the same ramp (one bank, TAS and
    roll rate: the full turns of a level of the envelope)."""
    if not k > 0.0:
        return 0j
    if tr.size and tr.min() == tr.max() and c.min() == c.max() and v.min() == v.max():
        key = (float(tr.flat[0]), float(c.flat[0]), float(v.flat[0]), k)
        if key not in cache:
            cache[key] = complex(ramp_q(key[0], key[1], key[2], k))
        return cache[key]
    return ramp_q(tr, c, v, k)


def _final_turn_middle(sol: ShapeSolution, rows: npt.NDArray[np.int_], turn_step_deg: float,
                       cache: dict[tuple[float, ...], complex]) -> tuple[FloatArray, FloatArray]:
    """The middle sample of the final turn's constant-bank arc on the rows given, x and y: the
    point :func:`sample_solution` makes up to rounding (there by a running product over the arc,
    here directly: a few 1e-12 m apart at the demo's scale), the farthest part of most tracks
    from the runway. [m]

    The arc sample k of n (:func:`turn_sample_count` of the row's calm-wind angle) is at the
    fraction f = k / (n - 1) of the arc. In the frame of a right turn from heading 0 the air
    position is Q(tr) + r (sin h - sin dp, cos dp - cos h), h = dp + (A - 2 dp) f, r = V / w (the
    circle of the constant-bank arc after the roll-in ramp, whose end is Q(tr)); a left turn
    mirrors y; then the rotation to the entry heading psi0, the start point and the wind drift
    w (tr + tc f) (the trochoid: ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7, wind
    throughout the turn).
    """
    lg = sol.legs[sol.final_turn]
    pr = lg.prof
    assert pr is not None and lg.sign is not None
    tas, wp, dp, angle, tr, tc, c = (np.asarray(getattr(pr, f))[rows] for f in ("tas", "wp", "dp", "angle", "tr",
                                                                               "tc", "c"))
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        n = (turn_sample_count(lg.nominal_rad, turn_step_deg) if lg.nominal_rows is None else
             np.maximum(3, np.ceil(np.degrees(lg.nominal_rows[rows]) / turn_step_deg - 1e-9).astype(np.int64) + 1))
        f = ((n - 1) // 2) / (n - 1)
        r = tas / np.maximum(wp, 1e-12)
        h = dp + (angle - 2.0 * dp) * f
        q = _ramp_end_q(tr, c, tas, pr.k, cache)
        # the ramp's heading change is one number on a level's full turns: its sine and cosine once
        sd, cd = ((math.sin(dp[0]), math.cos(dp[0])) if dp.size and dp.min() == dp.max() else (np.sin(dp), np.cos(dp)))
        ax = q.real + r * (np.sin(h) - sd)
        ay = lg.sign[rows] * (q.imag + r * (cd - np.cos(h)))
        psi0 = lg.psi0[rows]
        c0, s0 = np.cos(psi0), np.sin(psi0)
        t = tr + tc * f
        return lg.x0[rows] + (ax * c0 - ay * s0) + sol.wx[rows] * t, lg.y0[rows] + (ax * s0 + ay * c0) + sol.wy[rows] * t


def _runway_distance_m(x: FloatArray, y: FloatArray, runway_length_m: float) -> FloatArray:
    """Distance from points to the runway (the segment from the threshold to the far end). [m]"""
    return np.sqrt(np.square(x - np.minimum(np.maximum(x, 0.0), runway_length_m)) + np.square(y))


@dataclass(frozen=True, slots=True, kw_only=True)
class _Coarse:
    """What a few track points prove, arrays (M, C): ``proven`` the candidate fails whatever its
    other samples (its runway distance or area margin at a coarse point is beyond the threshold
    by more than PROOF_MARGIN_M); the coarse largest runway distance and smallest margin."""

    proven: npt.NDArray[np.bool_]
    distance_m: FloatArray
    margin_m: FloatArray
    sector_bound: npt.NDArray[np.bool_]


def _coarse_pass(solved: list[tuple[list[int], ShapeSolution]], ok: npt.NDArray[np.bool_], *,
                 runway_length_m: float, visibility_m: float, margin_fn: MarginFn, turn_step_deg: float) -> _Coarse:
    """Which flyable candidates (``ok``, (M, C)) fail on a few of their own track points (see
    :class:`_Coarse`); ``solved``: (candidate indices, their solution, rows side-major).

    The coarse points are every leg's start, then (where those do not prove it) the middle
    sample of the final turn's arc (:func:`_final_turn_middle`). The judged largest runway
    distance and smallest area margin of a track are the largest and smallest over its samples;
    a coarse point is a sample (to rounding, under 1e-9 m), so a coarse distance beyond the
    visibility, or a coarse margin below zero, by more than PROOF_MARGIN_M is a failure of the
    sampled track too: more than the rounding, and more than any step the margin function makes
    near zero (the area's sector edge tolerance, 1 m, below which a sector does not count). A
    candidate proven to fail is not the best of a row that fits (it has a failure, the best has
    none), so only the candidates not proven need their full samples.
    """
    m, c = ok.shape
    dist = np.full((m, c), np.nan)
    margin = np.full((m, c), np.nan)
    sector = np.zeros((m, c), dtype=bool)
    proven = np.zeros((m, c), dtype=bool)
    cache: dict[tuple[float, ...], complex] = {}
    beyond = visibility_m + PROOF_MARGIN_M
    for cis, sol in solved:
        g = len(cis)
        ok_s = ok[:, cis].T.ravel()                          # (side, row) in the solution's order
        rows = np.flatnonzero(ok_s)
        if not rows.size:
            continue
        px = np.stack([lg.x0 for lg in sol.legs])            # (legs, rows): every leg's start, every row
        py = np.stack([lg.y0 for lg in sol.legs])
        with np.errstate(invalid="ignore", over="ignore"):   # (garbage where not flyable)
            d = np.max(_runway_distance_m(px, py, runway_length_m), axis=0)
        d = np.where(ok_s, d, np.nan)
        prov = d > beyond
        left = rows[~prov[rows]]
        mx, my = _final_turn_middle(sol, left, turn_step_deg, cache)
        with np.errstate(invalid="ignore"):
            d[left] = np.maximum(d[left], _runway_distance_m(mx, my, runway_length_m))
            prov[left] = d[left] > beyond
        near_at = np.flatnonzero(~prov[left])                # of ``left``
        near = left[near_at]
        mg = np.full(g * m, np.nan)
        sb = np.zeros(g * m, dtype=bool)
        if near.size:
            xy = np.stack([np.concatenate([px[:, near], mx[None, near_at]]).T,
                           np.concatenate([py[:, near], my[None, near_at]]).T], axis=-1)[:, :, None, :]  # (tracks, K, 1, 2)
            a, sec = _margins(margin_fn, xy)
            mg[near], sb[near] = _worst_point(a, sec)
            prov[near] = mg[near] < -PROOF_MARGIN_M
        for arr, val in ((dist, d), (margin, mg), (sector, sb), (proven, prov)):
            arr[:, cis] = val.reshape(g, m).T
    return _Coarse(proven=proven, distance_m=dist, margin_m=margin, sector_bound=sector)


def _worst_point(a: FloatArray, sec: npt.NDArray[np.bool_]) -> tuple[FloatArray, npt.NDArray[np.bool_]]:
    """Each track's smallest margin over its points (columns of ``a``, (T, K)) and the sector flag
    of the first point that has it (``np.argmin`` along the rows), column by column."""
    low, flag = a[:, 0].copy(), sec[:, 0].copy()
    for j in range(1, a.shape[1]):
        lower = a[:, j] < low
        np.copyto(low, a[:, j], where=lower)
        np.copyto(flag, sec[:, j], where=lower)
    return low, flag


def solve_candidates(inputs: CircleInputs, candidates: tuple[tuple[Shape, Side], ...], *, wx_mps: FloatArray,
                     wy_mps: FloatArray, bank_deg: FloatArray, roll_out_m: FloatArray, margin_fn: MarginFn,
                     descent: DescentGeometry | None = None, turn_step_deg: float = BATCH_TURN_STEP_DEG,
                     n_straight: int = BATCH_N_STRAIGHT, visibility_m: float | None = None,
                     all_margins: npt.ArrayLike = True, turns: Mapping[Shape, Sequence[LegArrays]] | None = None,
                     made: dict[Shape, list[LegArrays]] | None = None) -> CandidateBatch:
    """Solve every candidate on every row (wind, bank, roll-out), vectorised over the rows.

    Rows are independent: the sample counts of a track depend on the candidate and the
    situation only (each turn by its calm-wind angle, each straight ``n_straight`` points), so a
    row's numbers do not depend on which other rows share the batch. Both sides of a shape are
    one solve (the side a sign per row) and one sampling call (each row's turns at its own
    counts, :func:`sample_solution` ``pad_rows``).

    With ``visibility_m`` (and many rows), a candidate that fails on a few of its own track
    points is not sampled in full (:func:`_sample_and_margins`), except on the rows where
    ``all_margins`` is True (the level whose failures are reported).

    ``turns`` and ``made``: per shape, the turns of these rows already solved (at another roll-out),
    and a dict to receive each shape's turns (see :func:`briefer.core.manoeuvre.solver.solve_shape`).
    """
    wx = np.asarray(wx_mps, dtype=float).ravel()
    m = wx.size
    # one value per row (broadcast where one is given for all; the solve adds zeros to each again)
    wy, bank, d = (a if a.size == m else a + np.zeros(m) for a in
                   (np.asarray(x, dtype=float).ravel() for x in (wy_mps, bank_deg, roll_out_m)))
    dg = descent if descent is not None else descent_geometry(inputs)
    c = len(candidates)
    ok, sector = np.zeros((2, m, c), dtype=bool)
    area, dist, ttime = np.full((3, m, c), np.nan)
    if m == 0:
        return CandidateBatch(ok=ok, area_margin_m=area, sector_bound=sector, max_distance_from_runway_m=dist,
                              total_time_s=ttime)
    groups: dict[Shape, list[int]] = {}
    for ci, (shape, _side) in enumerate(candidates):
        groups.setdefault(shape, []).append(ci)
    by_sides: dict[tuple[Side, ...], list[Shape]] = {}     # shapes on the same sides: one solve
    for shape, cis in groups.items():
        by_sides.setdefault(tuple(candidates[ci][1] for ci in cis), []).append(shape)
    sols: dict[Shape, ShapeSolution] = {}
    for sides, shapes in by_sides.items():
        g = len(sides)
        sigma = np.array([1.0 if side == "right" else -1.0 for side in sides]).repeat(m)
        sols.update(zip(shapes, solve_inputs_shapes(
            inputs, shapes, sigma=sigma, wx_mps=_tile(wx, g), wy_mps=_tile(wy, g), bank_deg=_tile(bank, g),
            descent=dg, roll_out_m=_tile(d, g), turns=None if turns is None else [turns[sh] for sh in shapes],
            made=None if made is None else [made.setdefault(sh, []) for sh in shapes])))
    solved = []
    for shape, cis in groups.items():
        g, sol = len(cis), sols[shape]
        ok_g = sol.ok.reshape(g, m)
        at = slice(cis[0], cis[0] + g) if cis[-1] - cis[0] == g - 1 else cis   # (a shape's candidates: in a run)
        ok[:, at] = ok_g.T
        total = sol.legs[0].duration
        for lg in sol.legs[1:]:             # the legs' times added in order (sum() adds them to 0 first)
            total = total + lg.duration
        ttime[:, at] = np.where(ok_g, total.reshape(g, m), np.nan).T
        solved.append((cis, sol))
    _sample_and_margins(inputs, solved, ok, m, margin_fn=margin_fn, turn_step_deg=turn_step_deg,
                        n_straight=n_straight, visibility_m=visibility_m, all_margins=all_margins,
                        area=area, sector=sector, dist=dist)
    return CandidateBatch(ok=ok, area_margin_m=area, sector_bound=sector, max_distance_from_runway_m=dist,
                          total_time_s=ttime, solutions=tuple((tuple(cis), sol) for cis, sol in solved))


def _per_level(values: list, m: int, dtype: type) -> npt.NDArray:
    """One value per level, each repeated for the level's ``m`` rows (level by level); one row per
    level needs no repeat (``repeat(1)`` is a copy of the same values)."""
    a = np.array(values, dtype=dtype)
    return a if m == 1 else a.repeat(m)


def _tile(a: FloatArray, k: int) -> FloatArray:
    """``np.tile`` of a 1-d array (k copies end to end), without its overhead on small arrays."""
    return a if k == 1 else np.concatenate([a] * k)


def _sampled(solved: list[tuple[list[int], ShapeSolution]], sampled: npt.NDArray[np.bool_], m: int, *,
             turn_step_deg: float, n_straight: int) -> list[tuple[npt.NDArray[np.int_], ...]]:
    """(rows, candidates, tracks) of the cells ``sampled`` (M, C): every shape sampled in one
    call where their legs match (:func:`merge_for_sampling`, which takes the rows sampled of
    each), else one call per shape."""
    if m < _PRUNE_MIN_ROWS:
        few = _sampled_whole(solved, sampled, m, turn_step_deg=turn_step_deg, n_straight=n_straight)
        if few is not None:
            return few
    subs, idx = [], []
    for cis, sol in solved:
        g = len(cis)
        rows = sampled[:, slice(cis[0], cis[0] + g) if cis[-1] - cis[0] == g - 1 else cis].T.ravel()  # (side, row)
        if not rows.any():
            continue
        flat = rows.nonzero()[0]
        # a small batch samples every row (taking rows out costs more than sampling them)
        every = bool(rows.all()) or m < _PRUNE_MIN_ROWS
        subs.append((sol, None if every else flat, None if not every or rows.all() else rows))
        idx.append((flat % m, np.asarray(cis)[flat // m]))
    if not subs:
        return []
    merged = merge_for_sampling([sol for sol, _, _ in subs], [take for _, take, _ in subs])
    groups = [merged] if merged is not None else [sol if take is None else take_rows(sol, take)
                                                  for sol, take, _ in subs]
    xys = []
    for sol in groups:
        xy = sample_solution(sol, turn_step_deg=turn_step_deg, n_straight=n_straight, running_product=True,
                             pad_rows=True).xy
        if not sol.ok.all():
            xy[~sol.ok] = 0.0
        xys.append(xy)
    if merged is not None and len(subs) > 1:      # one group: every shape's rows end to end
        keeps = [keep for _, _, keep in subs]
        keep = None if all(k is None for k in keeps) else np.concatenate(
            [np.ones(sol.ok.shape[0] if take is None else take.size, dtype=bool) if k is None else k
             for (sol, take, _), k in zip(subs, keeps)])
        idx = [tuple(np.concatenate(part) for part in zip(*idx))]
        subs = [(merged, None, keep)]
    return [(r, c, xy if keep is None else xy[keep]) for (r, c), (_, _, keep), xy in zip(idx, subs, xys)]


def _sampled_whole(solved: list[tuple[list[int], ShapeSolution]], sampled: npt.NDArray[np.bool_], m: int, *,
                   turn_step_deg: float, n_straight: int) -> list[tuple[npt.NDArray[np.int_], ...]] | None:
    """:func:`_sampled` of a small batch (every row of a shape with a cell sampled is sampled),
    when its shapes merge (None otherwise): one sampling call, and the cells taken out of it at
    once. The merged rows are the shapes' (side, row) rows end to end, so the cells, candidate
    by candidate, row by row, are the rows taken, in :func:`_sampled`'s order; the rows not
    taken (not sampled: every row that cannot be flown among them) are left out unread."""
    anyc = sampled.any(axis=0).tolist()
    inc = [(cis, sol) for cis, sol in solved if True in [anyc[ci] for ci in cis]]
    if not inc:
        return []
    merged = merge_for_sampling([sol for _, sol in inc])
    if merged is None:
        return None
    xy = sample_solution(merged, turn_step_deg=turn_step_deg, n_straight=n_straight, running_product=True,
                         pad_rows=True).xy
    cis_all = [ci for cis, _ in inc for ci in cis]
    run = cis_all == list(range(cis_all[0], cis_all[0] + len(cis_all)))
    keep = sampled[:, slice(cis_all[0], cis_all[0] + len(cis_all)) if run else cis_all].T.ravel()
    flat = keep.nonzero()[0]
    return [(flat % m, np.asarray(cis_all)[flat // m], xy if flat.size == keep.size else xy[keep])]


def _max_runway_d2(xy: FloatArray, runway_length_m: float) -> FloatArray:
    """The largest squared distance of each track (..., N, 2) to the runway (the segment from the
    threshold to the far end): :func:`_runway_distance_m` squared, each coordinate read once as a
    contiguous copy and the steps done in place (the same operations, fewer arrays). [m^2]"""
    x, y = xy[..., 0].copy(), xy[..., 1].copy()
    d = np.maximum(x, 0.0)
    np.minimum(d, runway_length_m, out=d)
    np.subtract(x, d, out=d)
    np.square(d, out=d)
    np.square(y, out=y)
    d += y
    return np.maximum.reduce(d, axis=-1)


def _sample_and_margins(inputs: CircleInputs, solved: list[tuple[list[int], ShapeSolution]],
                        ok: npt.NDArray[np.bool_], m: int, *, margin_fn: MarginFn, turn_step_deg: float,
                        n_straight: int, visibility_m: float | None, all_margins: npt.ArrayLike, area: FloatArray,
                        sector: npt.NDArray[np.bool_], dist: FloatArray) -> None:
    """The sampled tracks' largest distances from the runway and area margins, into ``dist``,
    ``area`` and ``sector`` (M, C) (one sampling and one margin call per shape).

    With ``visibility_m`` and at least ``_PRUNE_MIN_ROWS`` rows, a candidate that fails on a few
    of its own track points (:func:`_coarse_pass`) is not sampled in full: it keeps the coarse
    runway distance and area margin (enough to fail it), except on the rows where ``all_margins``
    is True (the level whose failures are reported: every number exact); a candidate sampled
    whose runway is beyond the visibility gets no area margin (NaN) except on those rows. The
    candidates that might pass get every number exact, so whether a row fits, and its best
    candidate, are what the full evaluation gives.
    """
    length = inputs.runway_length_m
    prune = visibility_m is not None and m >= _PRUNE_MIN_ROWS
    full = np.asarray(all_margins, dtype=bool) + np.zeros(m, dtype=bool) if prune else None    # (read only to prune)
    sampled = ok
    if prune:
        co = _coarse_pass(solved, ok & ~full[:, None], runway_length_m=length, visibility_m=visibility_m,
                          margin_fn=margin_fn, turn_step_deg=turn_step_deg)
        sampled = ok & ~co.proven
        dist[:] = np.where(co.proven, co.distance_m, np.nan)     # enough to fail them
        area[:] = np.where(co.proven, co.margin_m, np.nan)
        sector[:] = co.proven & co.sector_bound
    tracks = []
    for r_idx, c_idx, xy in _sampled(solved, sampled, m, turn_step_deg=turn_step_deg, n_straight=n_straight):
        dist[r_idx, c_idx] = np.sqrt(_max_runway_d2(xy, length))
        tracks.append((r_idx, c_idx, xy))
    # a candidate whose sampled track takes the runway beyond the visibility fails whatever its
    # margin: no margin, except on the rows reported in full
    picked = tracks                 # (every track sampled: every one needs its margins)
    if prune:
        with np.errstate(invalid="ignore"):
            need = sampled & (~(dist > visibility_m) | full[:, None])
        picked = [(r[sel], c[sel], xy if sel.all() else xy[sel]) for r, c, xy in tracks
                  for sel in (need[r, c],) if sel.any()]
    if len({xy.shape[-2] for _, _, xy in picked}) == 1 and len(picked) > 1:    # one call for tracks of one length
        picked = [tuple(np.concatenate(part) for part in zip(*picked))]
    for r_idx, c_idx, xy in picked:
        a, sec = _margins(margin_fn, xy)
        area[r_idx, c_idx] = a
        sector[r_idx, c_idx] = sec


@dataclass(frozen=True, slots=True, kw_only=True)
class LevelBest:
    """The best candidate of each row at one level and its checks (arrays of shape (M,))."""

    best: npt.NDArray[np.int_]          # candidate index; -1 when none can be flown
    failures: npt.NDArray[np.int_]      # REASON_* bits of its failures
    marginal: npt.NDArray[np.int_]      # REASON_* bits of why it is marginal
    area_margin_m: FloatArray
    max_distance_from_runway_m: FloatArray
    slack_m: FloatArray                 # best min(area margin, visibility margin) of the candidates
    #                                     that fail neither bank nor stall; -inf if none [m]

    @property
    def fits(self) -> npt.NDArray[np.bool_]:
        return (self.best >= 0) & (self.failures == 0)


_FAILURE_GROUPS = (REASON_BANK, REASON_AREA | REASON_SECTOR, REASON_VISIBILITY, REASON_STALL)
_FAILURE_BITS = REASON_BANK | REASON_AREA | REASON_SECTOR | REASON_VISIBILITY | REASON_STALL
_FAILURE_COUNT = np.array([sum((f & g) != 0 for g in _FAILURE_GROUPS) for f in range(_FAILURE_BITS + 1)],
                          dtype=np.int64)
"""The number of failures of each combination of failure bits (area and sector count as one)."""


def best_of_level(batch: CandidateBatch, *, bank_deg: npt.ArrayLike, bank_limit_deg: float, visibility_m: float,
                  area_radius_m: float | None, aoa_margin_deg: npt.ArrayLike | None) -> LevelBest:
    """Rank the candidates of each row as rank_plans does and check the best one (``bank_deg``
    and ``aoa_margin_deg``: one value, or one per row).

    Order (lower first): number of failures, -round(min(area margin, visibility margin)) (1 m),
    round(total time, 1) (0.1 s); candidates that cannot be flown last; exact ties: the first.
    A few cells (``_FLOAT_CELLS``) are ranked in plain floats (:func:`_best_of_level_floats`,
    the same numbers).
    """
    if batch.ok.size <= _FLOAT_CELLS and batch.ok.ndim == 2:
        lb = _best_of_level_floats(batch, bank_deg=bank_deg, bank_limit_deg=bank_limit_deg,
                                   visibility_m=visibility_m, area_radius_m=area_radius_m,
                                   aoa_margin_deg=aoa_margin_deg)
        if lb is not None:
            return lb
    bank_deg = np.asarray(bank_deg, dtype=float)[..., None]
    aoa_margin_deg = None if aoa_margin_deg is None else np.asarray(aoa_margin_deg, dtype=float)[..., None]
    fail, marg = plan_checks(bank_deg=bank_deg, bank_limit_deg=bank_limit_deg, area_margin_m=batch.area_margin_m,
                             sector_bound=batch.sector_bound, visibility_m=visibility_m,
                             max_distance_from_runway_m=batch.max_distance_from_runway_m,
                             area_radius_m=area_radius_m, aoa_margin_deg=aoa_margin_deg)
    ok = batch.ok
    not_ok = ~ok
    nf = np.where(ok, _FAILURE_COUNT[fail & _FAILURE_BITS], _INFEASIBLE)
    vis_margin = visibility_m - batch.max_distance_from_runway_m
    with np.errstate(invalid="ignore"):
        k2 = -np.minimum(batch.area_margin_m, vis_margin).round()     # (np.round's own method, without its wrapper)
        k3 = batch.total_time_s.round(1)
    sel = nf == _by_row(np.minimum, nf)
    k2 = np.where(sel & ok, k2, np.inf)
    sel &= (k2 == _by_row(np.minimum, k2)) | not_ok
    k3 = np.where(sel & ok, k3, np.inf)
    sel &= (k3 == _by_row(np.minimum, k3)) | not_ok
    best = _first_true(sel)
    at = np.arange(best.size) * sel.shape[-1] + best          # (row, best) in the flattened (M, C)

    def of_best(a: npt.NDArray) -> npt.NDArray:
        return np.ravel(a)[at]

    flyable = of_best(ok)
    with np.errstate(invalid="ignore"):
        room = np.minimum(np.where(np.isnan(batch.area_margin_m), np.inf, batch.area_margin_m), vis_margin)
    usable = ok & ((fail & (REASON_BANK | REASON_STALL)) == 0)
    slack = _by_row(np.maximum, np.where(usable, room, -np.inf))[:, 0]
    return LevelBest(best=np.where(flyable, best, -1), failures=np.where(flyable, of_best(fail), 0),
                     marginal=np.where(flyable, of_best(marg), 0), area_margin_m=of_best(batch.area_margin_m),
                     max_distance_from_runway_m=of_best(batch.max_distance_from_runway_m), slack_m=slack)


_FLOAT_CELLS = 128  # up to this many cells (rows x candidates), best_of_level in plain floats
_INF, _NAN = math.inf, math.nan


def _best_of_level_floats(batch: CandidateBatch, *, bank_deg: npt.ArrayLike, bank_limit_deg: float,
                          visibility_m: float, area_radius_m: float | None,
                          aoa_margin_deg: npt.ArrayLike | None) -> LevelBest | None:
    """:func:`best_of_level` of a few rows in plain floats, row by row (None: no rows, or a flyable
    candidate has a NaN area margin, distance or time; the array path then ranks them): the checks of
    :func:`briefer.core.manoeuvre.ranking.plan_checks_one` (the array rule's comparisons and
    single operations), the same keys (``np.round`` to 1 m is ``rint``, to 0.1 s ``rint(10 t) / 10``,
    as numpy rounds them) compared as a tuple, the first of exact ties. Without NaN, the array
    path's selection is the least key among the flyable candidates (the others rank last), and
    every number is its own (``tests/test_judgement.py``)."""
    ok_rows = batch.ok.tolist()
    m = len(ok_rows)
    if m == 0:
        return None
    banks, aoas = (None if v is None else v.tolist() if type(v) is np.ndarray and v.shape == (m,) and v.dtype == float
                   else (np.asarray(v, dtype=float) + np.zeros(m)).tolist() for v in (bank_deg, aoa_margin_deg))
    aoas = [None] * m if aoas is None else aoas
    areas, secs = batch.area_margin_m.tolist(), batch.sector_bound.tolist()
    dists, times = batch.max_distance_from_runway_m.tolist(), batch.total_time_s.tolist()
    counts = _FAILURE_COUNT.tolist()
    hard = REASON_BANK | REASON_STALL
    out = []
    for ok, bank, aoa, area, sec, dist, tt in zip(ok_rows, banks, aoas, areas, secs, dists, times):
        key, best, fail, marg, slack = None, 0, 0, 0, -_INF
        for i, flyable in enumerate(ok):
            if not flyable:
                continue
            a, v, t = area[i], visibility_m - dist[i], tt[i]
            if a != a or v != v or t != t:
                return None
            f, mg = plan_checks_one(bank_deg=bank, bank_limit_deg=bank_limit_deg, area_margin_m=a,
                                    sector_bound=sec[i], visibility_m=visibility_m, max_distance_from_runway_m=dist[i],
                                    area_radius_m=area_radius_m, aoa_margin_deg=aoa)
            room, t10 = min(a, v), t * 10.0
            # the keys as numpy rounds them: round() halves to even as rint (an int, which compares as
            # its float), not finite as it is
            k = (counts[f & _FAILURE_BITS], -(round(room) if room - room == 0.0 else room),
                 (round(t10) if t10 - t10 == 0.0 else t10) / 10.0)
            if key is None or k < key:
                key, best, fail, marg = k, i, f, mg
            if not f & hard and room > slack:
                slack = room
        out.append((-1 if key is None else best, fail, marg, area[best], dist[best], slack))
    cols = list(zip(*out))
    ints, floats = np.array(cols[:3], dtype=np.int64), np.array(cols[3:], dtype=float)
    return LevelBest(best=ints[0], failures=ints[1], marginal=ints[2], area_margin_m=floats[0],
                     max_distance_from_runway_m=floats[1], slack_m=floats[2])


_FEW_ROWS = 64      # below this many rows, one reduction along the rows beats a call per column


def _by_row(op: np.ufunc, a: npt.NDArray) -> npt.NDArray:
    """``op`` (minimum or maximum) of each row of ``a`` (M, C), shape (M, 1): ``op.reduce`` along
    the rows for a few rows, else column by column (the same number, NaN included, without a
    reduction loop per row of a few candidates)."""
    if a.shape[0] < _FEW_ROWS:
        return op.reduce(a, axis=1, keepdims=True)
    out = a[:, 0].copy()
    for j in range(1, a.shape[1]):
        op(out, a[:, j], out=out)
    return out[:, None]


def _first_true(sel: npt.NDArray[np.bool_]) -> npt.NDArray[np.int_]:
    """``np.argmax(sel, axis=-1)``: each row's first True column (0 where none); column by column
    when the rows are many."""
    if sel.shape[0] < _FEW_ROWS:
        return sel.argmax(axis=-1)
    best = np.zeros(sel.shape[0], dtype=np.intp)
    found = sel[:, 0].copy()
    for j in range(1, sel.shape[1]):
        new = sel[:, j] & ~found
        best[new] = j
        found |= new
    return best


@dataclass(frozen=True, slots=True, kw_only=True)
class WindJudgement:
    """The judgement at each of N winds (arrays of shape (N,)).

    Attributes
    ----------
    candidates : tuple of (shape, side)
    levels : Levels
    status : FITS, MARGINAL or DOES_NOT_FIT
    reasons : REASON_* bits: why marginal, or the failures (REASON_WIND: nothing can be flown)
    roll_out_index, bank_index : the chosen level (for DOES_NOT_FIT the level shown: the default
        roll-out's last bank level); -1 when there is no candidate at all
    bank_needed_deg : the chosen level's bank, NaN where nothing fits [deg]
    roll_out_m : the chosen level's roll-out distance, NaN where nothing fits [m]
    best_candidate : index into ``candidates``; -1 where none can be flown
    area_margin_m, max_distance_from_runway_m : of that candidate, NaN where none [m]
    level_slack_m : ndarray (N, L)
        Per level (in ``levels.order()``), the largest min(area margin, visibility margin) of
        the candidates failing neither bank nor stall (-inf: none; NaN: level not solved). A
        level that fails with a slack a few metres below zero might fit on a denser track. [m]
    solutions : the eager batch's solutions (``CandidateBatch.solutions``; rows: level by
        level, then wind); empty when solved level by level
    """

    candidates: tuple[tuple[Shape, Side], ...]
    levels: Levels
    status: npt.NDArray[np.int_] = field(compare=False)
    reasons: npt.NDArray[np.int_] = field(compare=False)
    roll_out_index: npt.NDArray[np.int_] = field(compare=False)
    bank_index: npt.NDArray[np.int_] = field(compare=False)
    bank_needed_deg: FloatArray = field(compare=False)
    roll_out_m: FloatArray = field(compare=False)
    best_candidate: npt.NDArray[np.int_] = field(compare=False)
    area_margin_m: FloatArray = field(compare=False)
    max_distance_from_runway_m: FloatArray = field(compare=False)
    level_slack_m: FloatArray = field(compare=False)
    solutions: tuple[tuple[tuple[int, ...], ShapeSolution], ...] = field(default=(), compare=False)


def judge_winds(inputs: CircleInputs, *, wx_mps: npt.ArrayLike, wy_mps: npt.ArrayLike, margin_fn: MarginFn,
                visibility_m: float, bank_limit_deg: float, area_radius_m: float | None,
                aoa_margin_fn: Callable[[float], float] | None = None, bank_step_deg: float = 5.0,
                roll_out_steps: bool = True, eager: bool = False, turn_step_deg: float = BATCH_TURN_STEP_DEG,
                n_straight: int = BATCH_N_STRAIGHT) -> WindJudgement:
    """The judgement (see the module docstring) at each wind (runway-frame, blowing toward). [m/s]

    ``eager``: solve every level of every wind in one batch (the brief, one wind); otherwise
    level by level, only for the winds still without a fitting plan (the envelope). Both give
    the same result for a wind.
    """
    if not (math.isfinite(visibility_m) and visibility_m >= 0.0):   # 0: a legal report (fog)
        raise DomainError(f"visibility_m = {visibility_m}: must be >= 0")
    if not 0.0 < bank_limit_deg < 90.0:
        raise DomainError(f"bank_limit_deg = {bank_limit_deg}: valid range is (0, 90)")
    if area_radius_m is not None and not (math.isfinite(area_radius_m) and area_radius_m > 0.0):
        raise DomainError(f"area_radius_m = {area_radius_m}: must be > 0")
    if not 0.0 < turn_step_deg <= 45.0 or n_straight < 2:
        raise DomainError(f"turn_step_deg = {turn_step_deg} must be in (0, 45] and n_straight = {n_straight} >= 2")
    wx = np.asarray(wx_mps, dtype=float).ravel()
    wy = np.asarray(wy_mps, dtype=float).ravel()
    if wx.shape != wy.shape or not (all(map(math.isfinite, wx.tolist() + wy.tolist())) if wx.size <= _FEW_ROWS
                                    else np.isfinite(wx).all() and np.isfinite(wy).all()):
        raise DomainError("wind components must be finite arrays of one shape")
    n = wx.size
    cands = applicable_candidates(inputs.arrival_course_deg)
    descent = descent_geometry(inputs)
    levels = judgement_levels(inputs, bank_limit_deg=bank_limit_deg, bank_step_deg=bank_step_deg,
                              roll_out_steps=roll_out_steps, descent=descent)
    order = levels.order()
    nb = len(levels.bank_deg)
    fallback = (0, nb - 1)
    aoa = {b: (None if aoa_margin_fn is None else float(aoa_margin_fn(b))) for b in levels.bank_deg}

    if not cands or n == 0:
        status, reasons, r_idx, b_idx, best_c, best_area, best_dist, slack = _unsettled(n, len(order))
        return WindJudgement(candidates=cands, levels=levels, status=status, reasons=reasons, roll_out_index=r_idx,
                             bank_index=b_idx, bank_needed_deg=np.full(n, np.nan), roll_out_m=np.full(n, np.nan),
                             best_candidate=best_c, area_margin_m=best_area, max_distance_from_runway_m=best_dist,
                             level_slack_m=slack)

    kept: list[tuple[tuple[int, ...], ShapeSolution]] = []
    turn_store = _TurnStore(n)

    def solve(rows: npt.NDArray[np.int_], lv: list[tuple[int, int]], shown: bool = True,
              every: bool = False) -> list[LevelBest]:
        """One batch for the given winds at each of the levels ``lv``; the best per level (with
        ``shown``, the fallback level's margins in full: its best is shown where nothing fits;
        with ``every``, one LevelBest of every level's rows, level by level)."""
        k, m = len(lv), rows.size
        bank = _per_level([levels.bank_deg[b] for _, b in lv], m, float)
        full = _per_level([shown and lvl == fallback for lvl in lv], m, bool)
        given = None if eager else turn_store.given(rows, [b for _, b in lv])
        made = None if eager or given is not None or k > 1 else {}
        # one wind: its rows are the wind repeated (tiling k copies of one row)
        wx_rows, wy_rows = (wx[rows].repeat(k), wy[rows].repeat(k)) if m == 1 else (_tile(wx[rows], k), _tile(wy[rows], k))
        batch = solve_candidates(inputs, cands, wx_mps=wx_rows, wy_mps=wy_rows, bank_deg=bank,
                                 roll_out_m=_per_level([levels.roll_out_m[r] for r, _ in lv], m, float),
                                 margin_fn=margin_fn, descent=descent, turn_step_deg=turn_step_deg,
                                 n_straight=n_straight, visibility_m=visibility_m, all_margins=full, turns=given,
                                 made=made)
        if made:
            turn_store.keep(rows, lv[0][1], made)
        if eager:
            kept.extend(batch.solutions)
        aoa_rows = None if aoa_margin_fn is None else _per_level([aoa[levels.bank_deg[b]] for _, b in lv], m, float)
        lb = best_of_level(batch, bank_deg=bank, bank_limit_deg=bank_limit_deg, visibility_m=visibility_m,
                           area_radius_m=area_radius_m, aoa_margin_deg=aoa_rows)
        if every:
            return [lb]
        return [LevelBest(**{f: getattr(lb, f)[i * m:(i + 1) * m] for f in LevelBest.__slots__}) for i in range(k)]

    def settle(rows: npt.NDArray[np.int_], lvl: tuple[int, int], lb: LevelBest, shown: bool = True) -> None:
        r, b = lvl
        slack[rows, order.index(lvl)] = lb.slack_m
        fit = lb.fits & ~resolved[rows]
        keep = fit | ((shown and lvl == fallback) & ~resolved[rows])
        cells = rows[keep]
        status[cells] = np.where(fit[keep], np.where(lb.marginal[keep] == 0, FITS, MARGINAL), DOES_NOT_FIT)
        reasons[cells] = np.where(fit[keep], lb.marginal[keep],
                                  np.where(lb.best[keep] < 0, REASON_WIND, lb.failures[keep] | REASON_BANK))
        r_idx[cells], b_idx[cells] = r, b
        best_c[cells] = lb.best[keep]
        best_area[cells], best_dist[cells] = lb.area_margin_m[keep], lb.max_distance_from_runway_m[keep]
        resolved[rows[fit]] = True

    if eager:
        lb_all = solve(np.arange(n), order, every=True)[0]
        status, reasons, r_idx, b_idx, best_c, best_area, best_dist, slack = _settle_every_level(
            lb_all, order, fallback, n)
    else:
        status, reasons, r_idx, b_idx, best_c, best_area, best_dist, slack = _unsettled(n, len(order))
        resolved = np.zeros(n, dtype=bool)
        _level_by_level(order, fallback, resolved, solve, settle)
    if n * len(order) <= _FLOAT_CELLS:      # a few winds: the chosen levels' bank and roll-out taken on floats
        chosen = [(s != DOES_NOT_FIT, r, b) for s, r, b in zip(status.tolist(), r_idx.tolist(), b_idx.tolist())]
        bank_needed = np.array([levels.bank_deg[b] if f else math.nan for f, _, b in chosen], dtype=float)
        roll_out = np.array([levels.roll_out_m[r] if f else math.nan for f, r, _ in chosen], dtype=float)
    else:
        fits = status != DOES_NOT_FIT
        bank_needed = np.where(fits, np.asarray(levels.bank_deg)[np.maximum(b_idx, 0)], np.nan)
        roll_out = np.where(fits, np.asarray(levels.roll_out_m)[np.maximum(r_idx, 0)], np.nan)
    return WindJudgement(candidates=cands, levels=levels, status=status, reasons=reasons, roll_out_index=r_idx,
                         bank_index=b_idx, bank_needed_deg=bank_needed, roll_out_m=roll_out, best_candidate=best_c,
                         area_margin_m=best_area, max_distance_from_runway_m=best_dist, level_slack_m=slack,
                         solutions=tuple(kept))


def _unsettled(n: int, levels: int) -> tuple:
    """The judgement of N winds before any level is settled: status, reasons, roll-out index,
    bank index, best candidate, its area margin and distance, the slack of each level (N, L)."""
    return (np.full(n, DOES_NOT_FIT, dtype=np.int64), np.full(n, REASON_WIND, dtype=np.int64),
            np.full(n, -1, dtype=np.int64), np.full(n, -1, dtype=np.int64), np.full(n, -1, dtype=np.int64),
            np.full(n, np.nan), np.full(n, np.nan), np.full((n, levels), np.nan))


class _TurnStore:
    """Each wind's turns at each bank level, solved once: a turn (its profile, entry heading and
    displacement) depends on the wind, the side and the bank, not on the roll-out distance, so
    the closer roll-outs take the turns solved at the first roll-out tried (the same numbers,
    not computed again; :func:`briefer.core.manoeuvre.solver.solve_shape` ``turns``)."""

    __slots__ = ("n", "made")

    def __init__(self, n: int) -> None:
        self.n = n
        self.made: dict[int, tuple[npt.NDArray[np.int_], int, dict[Shape, list[LegArrays]]]] = {}

    def keep(self, rows: npt.NDArray[np.int_], bank_index: int, made: dict[Shape, list[LegArrays]]) -> None:
        """The turns of a solve of the winds ``rows`` at one bank level (rows side by side, then wind)."""
        if bank_index not in self.made:
            pos = np.full(self.n, -1, dtype=np.int64)
            pos[rows] = np.arange(rows.size)
            self.made[bank_index] = (pos, rows.size, made)

    def given(self, rows: npt.NDArray[np.int_], bank_indices: list[int]) -> dict[Shape, list[LegArrays]] | None:
        """Per shape, the turns of a solve of the winds ``rows`` at each of the bank levels given
        (rows: side, level, wind), or None if some were not solved before."""
        if any(b not in self.made for b in bank_indices):
            return None
        at = []
        for b in bank_indices:
            pos, m0, made = self.made[b]
            p = pos[rows]
            if p.size and p.min() < 0:
                return None
            at.append((b, p, m0, made))
        out = {}
        for shape in at[0][3]:
            g = int(np.shape(at[0][3][shape][0].duration)[0]) // at[0][2]     # sides
            pieces: list[tuple[list[LegArrays], npt.NDArray[np.int_]]] = []
            for side in range(g):
                for b, p, m0, made in at:
                    if pieces and pieces[-1][0] is made[shape]:
                        pieces[-1] = (made[shape], np.concatenate([pieces[-1][1], side * m0 + p]))
                    else:
                        pieces.append((made[shape], side * m0 + p))
            out[shape] = turn_rows(pieces)
        return out


def _level_by_level(order: list[tuple[int, int]], fallback: tuple[int, int], resolved: npt.NDArray[np.bool_],
                    solve: Callable[..., list[LevelBest]], settle: Callable[..., None]) -> None:
    """The envelope's way: level by level, each only for the winds still without a fitting plan.

    The fallback's failures are reported only for the winds that fit at no level: when later
    levels follow it, it is first solved as any level (pruned, for the winds it fits), then
    again in full for the winds left. When few winds are left (``_TAIL_ROWS`` rows for every
    level left and the fallback), every level left and the fallback in full are one batch:
    a wind's numbers do not depend on the other rows of a batch, so each settles as if solved
    alone, and a batch costs more than its rows when they are few.
    """
    shown_in_turn = fallback == order[-1]
    for i, lvl in enumerate(order):
        pending = np.flatnonzero(~resolved)
        if pending.size == 0:
            return
        rest = order[i:]
        if i > 0 and pending.size * (len(rest) + 1) <= _TAIL_ROWS:
            lv = rest if fallback in rest else rest + [fallback]
            lbs = dict(zip(lv, solve(pending, lv, True)))       # the fallback's rows in full
            for later in rest:
                settle(pending, later, lbs[later], shown_in_turn)
            left = ~resolved[pending]
            if not shown_in_turn and left.any():
                lb = lbs[fallback]
                settle(pending[left], fallback, LevelBest(**{f: getattr(lb, f)[left] for f in LevelBest.__slots__}))
            return
        settle(pending, lvl, solve(pending, [lvl], shown_in_turn)[0], shown_in_turn)
    left_rows = np.flatnonzero(~resolved)
    if not shown_in_turn and left_rows.size:
        settle(left_rows, fallback, solve(left_rows, [fallback])[0])


def _settle_every_level(lb: LevelBest, order: list[tuple[int, int]], fallback: tuple[int, int], n: int) -> tuple:
    """The judgement of N winds from one LevelBest of every level (rows level by level, then
    wind): the first level that fits, else the fallback level (its best shown with its
    failures). What settling the levels one by one in ``order`` gives, in one step.

    Returns (status, reasons, roll-out index, bank index, best candidate, its area margin, its
    largest distance from the runway, the slack of each level (N, L)).
    """
    k = len(order)
    if k * n <= _FLOAT_CELLS:
        return _settle_every_level_floats(lb, order, fallback, n)
    fits = lb.fits.reshape(k, n)
    any_fit = fits.any(axis=0)
    level = np.where(any_fit, fits.argmax(axis=0), order.index(fallback))
    pick = level * n + np.arange(n)
    best, marg, fail = lb.best[pick], lb.marginal[pick], lb.failures[pick]
    status = np.where(any_fit, np.where(marg == 0, FITS, MARGINAL), DOES_NOT_FIT).astype(np.int64)
    reasons = np.where(any_fit, marg, np.where(best < 0, REASON_WIND, fail | REASON_BANK)).astype(np.int64)
    r_idx = np.array([r for r, _ in order], dtype=np.int64)[level]
    b_idx = np.array([b for _, b in order], dtype=np.int64)[level]
    return (status, reasons, r_idx, b_idx, best.astype(np.int64), lb.area_margin_m[pick],
            lb.max_distance_from_runway_m[pick], lb.slack_m.reshape(k, n).T.copy())


def _settle_every_level_floats(lb: LevelBest, order: list[tuple[int, int]], fallback: tuple[int, int],
                               n: int) -> tuple:
    """:func:`_settle_every_level` of a few winds and levels in plain Python: the same picks and
    numbers (taken, not computed), the same arrays."""
    k = len(order)
    best, fail, marg = lb.best.tolist(), lb.failures.tolist(), lb.marginal.tolist()
    area, dist, slack = lb.area_margin_m.tolist(), lb.max_distance_from_runway_m.tolist(), lb.slack_m.tolist()
    out: tuple[list, ...] = ([], [], [], [], [], [], [])
    for w in range(n):
        fit = [i for i in range(k) if best[i * n + w] >= 0 and fail[i * n + w] == 0]
        at = (fit[0] if fit else order.index(fallback)) * n + w
        if fit:
            status, reasons = (FITS if marg[at] == 0 else MARGINAL), marg[at]
        else:
            status, reasons = DOES_NOT_FIT, (REASON_WIND if best[at] < 0 else fail[at] | REASON_BANK)
        r, b = order[at // n]
        for lst, v in zip(out, (status, reasons, r, b, best[at], area[at], dist[at])):
            lst.append(v)
    ints, floats = np.array(out[:5], dtype=np.int64).reshape(5, n), np.array(out[5:], dtype=float).reshape(2, n)
    return (*ints, *floats,
            np.array([[slack[i * n + w] for i in range(k)] for w in range(n)], dtype=float).reshape(n, k))


def choose_plan_at_wind(inputs: CircleInputs, *, margin_fn: MarginFn, batch_margin_fn: MarginFn | None = None,
                        visibility_m: float, bank_limit_deg: float, area_radius_m: float | None,
                        aoa_margin_fn: Callable[[float], float] | None = None, bank_step_deg: float = 5.0
                        ) -> tuple[PlanChoice, bool]:
    """The brief's plan: the judgement at the inputs' wind, then the full plans of one level.

    Every candidate at every level is solved in one batch (:func:`judge_winds`, ``eager``); only
    the chosen level's plans are then built in full (dense tracks, :func:`candidate_plans`) and
    ranked (:func:`rank_plans`). Plans drawn with the dense track are the ones shown, so they
    decide at the end: a level is checked on its full plans when the batch chose it, or when the
    batch rejected it by less than ``DENSE_CHECK_M`` on the area or visibility margin (the
    sparser batch track may differ by that much: straights are sampled every 100 m on a plan,
    every fifth of a leg in the batch); levels rejected clearly, or for bank or stall, are not.

    Returns (choice, rolled out closer than the descent point).
    """
    kw = dict(visibility_m=visibility_m, bank_limit_deg=bank_limit_deg, area_radius_m=area_radius_m,
              aoa_margin_fn=aoa_margin_fn)
    wx, wy = inputs.wind.mps()
    j = judge_winds(inputs, wx_mps=[wx], wy_mps=[wy], margin_fn=batch_margin_fn or margin_fn, eager=True,
                    bank_step_deg=bank_step_deg, **kw)
    levels, banks = j.levels, j.levels.bank_deg
    if not j.candidates:
        return PlanChoice(bank_needed_deg=None, banks_tried_deg=banks, ranked=()), False
    order = levels.order()
    fallback = (0, len(banks) - 1)
    chosen = order.index((int(j.roll_out_index[0]), int(j.bank_index[0]))) if j.status[0] != DOES_NOT_FIT else -1

    def ranked_at(lvl: tuple[int, int]) -> tuple:
        # the level's rows of the batch (row i of each side) are the plans' solutions: not solved again
        r, b, i, rows = lvl[0], lvl[1], order.index(lvl), len(order)
        solved = {j.candidates[cis[0]][0]: (sol, slice(i, None, rows)) for cis, sol in j.solutions}
        same = banks[b] == inputs.bank_deg and levels.roll_out_chosen[r] == inputs.roll_out_distance_m
        lvl_inputs = inputs if same else inputs_at_level(inputs, bank_deg=banks[b],
                                                         roll_out_distance_m=levels.roll_out_chosen[r])
        plans = candidate_plans(lvl_inputs, solved=solved, applicable=j.candidates)
        return rank_plans(plans, margin_fn=margin_fn, **kw)

    shown = None
    for i, lvl in enumerate(order):
        if i != chosen and not j.level_slack_m[0, i] >= -DENSE_CHECK_M:
            continue
        ranked = ranked_at(lvl)
        if lvl == fallback:
            shown = ranked
        if ranked and not ranked[0].failures:
            r, b = lvl
            return PlanChoice(bank_needed_deg=banks[b], banks_tried_deg=banks[: b + 1], ranked=ranked), r > 0
    return PlanChoice(bank_needed_deg=None, banks_tried_deg=banks,
                      ranked=shown if shown is not None else ranked_at(fallback)), False


__all__ = ["BATCH_N_STRAIGHT", "DENSE_CHECK_M", "choose_plan_at_wind", "BATCH_TURN_STEP_DEG", "DOES_NOT_FIT", "FITS", "MARGINAL", "ROLL_OUT_STEPS",
           "STATUS_TEXT", "CandidateBatch", "LevelBest", "Levels", "WindJudgement", "best_of_level", "judge_winds",
           "judgement_levels", "roll_out_steps_m", "solve_candidates"]
