"""The wind envelope: the plan solver over a grid of wind directions and speeds, vectorised.

For each candidate (shape, side) and bank level, every cell of the grid is solved at once with
numpy (no Python loop over cells): the closed-form solve of :mod:`briefer.core.maneuver_solver`,
tracks sampled at fixed counts per leg, then ONE call of the caller's vectorised margin function
on all the tracks of that candidate. Later bank levels only revisit the cells not yet fitting.

Cell verdicts (the thresholds of :mod:`briefer.core.maneuver_ranking`)
----------------------------------------------------------------------
For each cell the candidates are ranked as :func:`~briefer.core.maneuver_ranking.rank_plans`
does (failures first, then the smaller of area margin and visibility margin). The bank is
raised from the target in ``bank_step_deg`` steps up to the limit until the best candidate
has no failure (a failure: cannot be flown, area margin < 0, runway farther than the
visibility, bank above the limit).

* FITS: the best candidate fits at the target bank, the bank is more than 5 deg below the
  limit, the area margin is at least 10 % of R and the runway stays within 90 % of the
  visibility.
* MARGINAL: it fits at some bank up to the limit, but needed more bank than the target
  (REASON_BANK), or the bank is within 5 deg of the limit (REASON_BANK), or the area margin is
  under 10 % of R (REASON_AREA), or the runway gets beyond 90 % of the visibility
  (REASON_VISIBILITY).
* DOES_NOT_FIT: nothing fits even at the limit. REASON_WIND: no candidate can be flown at all
  (see the plan reasons); otherwise the best candidate's failures at the limit, with
  REASON_BANK meaning "would need more than the bank limit".

Tracks in the envelope are sampled every ``turn_step_deg`` (7.5 deg) of each turn's calm-wind
angle (chord error about r (1 - cos 3.75 deg), 0.2 % of r) and at ``n_straight`` (5) points per
straight; a single plan's track is denser (2 deg), so a cell right at a threshold may differ by
a metre or two from :func:`~briefer.core.maneuver_ranking.choose_plan`.

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (circling area; 46 km/h (25 kt)
   design wind), 5th ed., 2006.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt

from briefer.core.maneuver_legs import FloatArray
from briefer.core.maneuver_ranking import (
    MARGINAL_AREA_FRACTION,
    MARGINAL_BANK_DEG,
    MARGINAL_VISIBILITY_FRACTION,
    MarginFn,
    bank_levels_deg,
)
from briefer.core.maneuver_solver import (
    CircleInputs,
    Shape,
    Side,
    applicable_candidates,
    descent_geometry,
    sample_solution,
    solve_inputs,
)
from briefer.errors import DomainError
from briefer.units import KT_TO_MPS

FITS, MARGINAL, DOES_NOT_FIT = 2, 1, 0
REASON_BANK, REASON_AREA, REASON_VISIBILITY, REASON_WIND = 1, 2, 4, 8
STATUS_TEXT = {FITS: "fits", MARGINAL: "marginal", DOES_NOT_FIT: "does not fit"}
_FAIL_INFEASIBLE = 100      # failure count of a candidate that cannot be flown
_KEY_SCALE = 1e12           # failures dominate margins in the combined key
_TIME_SCALE = 1e4           # margins (rounded to 1 m, |m| < 1e7) dominate times (< 1e4 s, to 0.1 s)


@dataclass(frozen=True, slots=True, kw_only=True)
class Envelope:
    """Verdict of the best plan over a grid of winds.

    Attributes
    ----------
    wind_from_relative_deg : ndarray (D,)
        Wind from-direction minus the landing course (0 = headwind, 90 = from the right). [deg]
    wind_speed_kt : ndarray (S,)
        Wind speeds. [kt]
    candidates : tuple of (shape, side)
        The plan candidates compared in every cell.
    status : ndarray (D, S) of int
        FITS (2), MARGINAL (1) or DOES_NOT_FIT (0).
    reasons : ndarray (D, S) of int
        Bit flags REASON_BANK | REASON_AREA | REASON_VISIBILITY | REASON_WIND (see module doc).
    bank_needed_deg : ndarray (D, S)
        Lowest bank level at which the best candidate fits; NaN where nothing fits up to the
        limit (status DOES_NOT_FIT). [deg]
    best_candidate : ndarray (D, S) of int
        Index into ``candidates`` of the best candidate (at the bank needed, or at the limit);
        -1 where no candidate can be flown.
    area_margin_m : ndarray (D, S)
        Area margin of that candidate; NaN where no candidate can be flown. [m]
    max_distance_from_runway_m : ndarray (D, S)
        Largest distance from the runway along its track; NaN where none can be flown. [m]
    bank_deg, bank_limit_deg, visibility_m, area_radius_m : float
        The target bank, the limit, the visibility and R used. [deg], [deg], [m], [m]
    """

    wind_from_relative_deg: FloatArray = field(compare=False)
    wind_speed_kt: FloatArray = field(compare=False)
    candidates: tuple[tuple[Shape, Side], ...]
    status: npt.NDArray[np.int_] = field(compare=False)
    reasons: npt.NDArray[np.int_] = field(compare=False)
    bank_needed_deg: FloatArray = field(compare=False)
    best_candidate: npt.NDArray[np.int_] = field(compare=False)
    area_margin_m: FloatArray = field(compare=False)
    max_distance_from_runway_m: FloatArray = field(compare=False)
    bank_deg: float
    bank_limit_deg: float
    visibility_m: float
    area_radius_m: float

    def __post_init__(self) -> None:
        shp = (len(self.wind_from_relative_deg), len(self.wind_speed_kt))
        for a in (self.status, self.reasons, self.bank_needed_deg, self.best_candidate, self.area_margin_m,
                  self.max_distance_from_runway_m):
            if a.shape != shp:
                raise DomainError(f"Envelope arrays must have shape {shp}; got {a.shape}")
        if np.any(np.isnan(self.bank_needed_deg) != (self.status == DOES_NOT_FIT)):
            raise DomainError("bank_needed_deg is NaN exactly where the status is DOES_NOT_FIT")

    def reason_texts(self, i: int, j: int) -> tuple[str, ...]:
        """The reasons of cell (direction i, speed j) in words."""
        st, r = int(self.status[i, j]), int(self.reasons[i, j])
        out = []
        if r & REASON_WIND:
            out.append("no plan can be flown in this wind")
        if r & REASON_BANK:
            out.append("would need more than the bank limit" if st == DOES_NOT_FIT else
                       f"needs {self.bank_needed_deg[i, j]:g} deg bank (target {self.bank_deg:g}, "
                       f"limit {self.bank_limit_deg:g})")
        if r & REASON_AREA:
            out.append("leaves the protected area" if st == DOES_NOT_FIT else "area margin under 10 % of R")
        if r & REASON_VISIBILITY:
            out.append("runway beyond the visibility" if st == DOES_NOT_FIT else "runway beyond 90 % of the visibility")
        return tuple(out)


def wind_envelope(inputs: CircleInputs, *, margin_fn: MarginFn, visibility_m: float, bank_limit_deg: float,
                  area_radius_m: float, wind_from_relative_deg: npt.ArrayLike | None = None,
                  wind_speed_kt: npt.ArrayLike | None = None, bank_step_deg: float = 5.0,
                  turn_step_deg: float = 7.5, n_straight: int = 5) -> Envelope:
    """Where the plans still fit, over a grid of wind directions and speeds (vectorised).

    Parameters
    ----------
    inputs : CircleInputs
        The situation; its ``wind`` is ignored (the grid replaces it) and its ``bank_deg`` is
        the target bank.
    margin_fn : callable
        Vectorised ``margin_fn(tracks)``: tracks of shape (..., N, 2) in the runway frame ->
        smallest protected-area margin of each track, shape (...). Positive inside. [m]
    visibility_m : float
        Reported visibility, > 0. [m]
    bank_limit_deg : float
        Largest bank allowed, 0 < limit < 90. [deg]
    area_radius_m : float
        Radius R of the protected area (marginal threshold 10 % of R), > 0. [m]
    wind_from_relative_deg : array_like, optional
        Directions relative to the landing course; default every 10 deg, 0..350. [deg]
    wind_speed_kt : array_like, optional
        Speeds, >= 0; default 0..40 kt every 1 kt. [kt]
    bank_step_deg : float
        Step of the bank levels between the target and the limit. [deg]
    turn_step_deg : float
        Track sample spacing in a turn, by its calm-wind angle (0 < step <= 45). [deg]
    n_straight : int
        Track samples per straight leg, >= 2.

    Returns
    -------
    Envelope

    Raises
    ------
    DomainError
        On out-of-range parameters (never for a wind that cannot be flown: that is a cell verdict).

    Notes
    -----
    See the module docstring for the verdicts. Cost: one vectorised solve and one margin call
    per plan shape and bank level; later bank levels only revisit the cells not yet fitting.
    """
    if not (math.isfinite(visibility_m) and visibility_m > 0.0):
        raise DomainError(f"visibility_m = {visibility_m}: must be > 0")
    if not 0.0 < bank_limit_deg < 90.0:
        raise DomainError(f"bank_limit_deg = {bank_limit_deg}: valid range is (0, 90)")
    if not (math.isfinite(area_radius_m) and area_radius_m > 0.0):
        raise DomainError(f"area_radius_m = {area_radius_m}: must be > 0")
    if not 0.0 < turn_step_deg <= 45.0 or n_straight < 2:
        raise DomainError(f"turn_step_deg = {turn_step_deg} must be in (0, 45] and n_straight = {n_straight} >= 2")
    dirs = np.arange(0.0, 360.0, 10.0) if wind_from_relative_deg is None else np.asarray(
        wind_from_relative_deg, dtype=float).ravel()
    spds = np.arange(0.0, 41.0, 1.0) if wind_speed_kt is None else np.asarray(wind_speed_kt, dtype=float).ravel()
    if not (np.all(np.isfinite(dirs)) and np.all(np.isfinite(spds)) and np.all(spds >= 0.0)):
        raise DomainError("wind directions must be finite and wind speeds >= 0")
    nd, ns = dirs.size, spds.size
    rel = np.radians(dirs)[:, None]
    wx_all = (-spds[None, :] * np.cos(rel) * KT_TO_MPS).ravel()     # blowing toward = -from
    wy_all = (-spds[None, :] * np.sin(rel) * KT_TO_MPS).ravel()
    m_all = wx_all.size

    cands = applicable_candidates(inputs.arrival_course_deg)
    levels = tuple(b for b in bank_levels_deg(inputs.bank_deg, bank_limit_deg, bank_step_deg) if b <= 60.0)
    descent = descent_geometry(inputs)
    length = inputs.runway_length_m
    vis_marg = MARGINAL_VISIBILITY_FRACTION * visibility_m
    area_marg = MARGINAL_AREA_FRACTION * area_radius_m

    status = np.full(m_all, DOES_NOT_FIT, dtype=np.int64)
    reasons = np.zeros(m_all, dtype=np.int64)
    bank_needed = np.full(m_all, np.nan)
    best_c = np.full(m_all, -1, dtype=np.int64)
    best_area = np.full(m_all, np.nan)
    best_dist = np.full(m_all, np.nan)
    if not cands:
        reasons[:] = REASON_WIND
    pending = np.arange(m_all) if cands else np.arange(0)

    for li, bank in enumerate(levels):
        if pending.size == 0:
            break
        m = pending.size
        area = np.zeros((m, len(cands)))
        dist = np.zeros((m, len(cands)))
        ok = np.zeros((m, len(cands)), dtype=bool)
        ttime = np.zeros((m, len(cands)))
        wx, wy = wx_all[pending], wy_all[pending]
        for ci, (shape, side) in enumerate(cands):
            sol = solve_inputs(inputs, shape, sigma=1.0 if side == "right" else -1.0, wx_mps=wx, wy_mps=wy,
                               bank_deg=bank, descent=descent)
            xy = sample_solution(sol, turn_step_deg=turn_step_deg, n_straight=n_straight).xy
            if not sol.ok.all():
                xy[~sol.ok] = 0.0
            area[:, ci] = np.asarray(margin_fn(xy))
            x = xy[..., 0]
            d2 = np.max(np.square(x - np.minimum(np.maximum(x, 0.0), length)) + np.square(xy[..., 1]), axis=-1)
            dist[:, ci] = np.sqrt(d2)
            ok[:, ci] = sol.ok
            ttime[:, ci] = sum(lg.duration for lg in sol.legs)
        vis = visibility_m - dist
        fails = (area < 0.0).astype(np.int64) + (vis < 0.0) + (bank > bank_limit_deg)
        nf = np.where(ok, fails, _FAIL_INFEASIBLE)
        # rank_plans' order: failures, then the rounded smaller margin, then total time
        key = nf * _KEY_SCALE + np.where(ok, -np.round(np.minimum(area, vis)) * _TIME_SCALE
                                         + np.round(np.minimum(ttime, _TIME_SCALE - 1.0), 1), 0.0)
        b = np.argmin(key, axis=1)
        rows = np.arange(m)
        bnf, barea, bdist = nf[rows, b], area[rows, b], dist[rows, b]
        resolved = bnf == 0
        last = li == len(levels) - 1
        cells = pending[resolved]
        flags = (np.where((bank > inputs.bank_deg) | (bank > bank_limit_deg - MARGINAL_BANK_DEG), REASON_BANK, 0)
                 | np.where(barea[resolved] < area_marg, REASON_AREA, 0)
                 | np.where(bdist[resolved] > vis_marg, REASON_VISIBILITY, 0))
        status[cells] = np.where(flags == 0, FITS, MARGINAL)
        reasons[cells] = flags
        bank_needed[cells] = bank
        best_c[cells], best_area[cells], best_dist[cells] = b[resolved], barea[resolved], bdist[resolved]
        if last:
            un = ~resolved
            cells = pending[un]
            infeasible = bnf[un] >= _FAIL_INFEASIBLE
            reasons[cells] = np.where(infeasible, REASON_WIND,
                                      REASON_BANK | np.where(barea[un] < 0.0, REASON_AREA, 0)
                                      | np.where(bdist[un] > visibility_m, REASON_VISIBILITY, 0))
            best_c[cells] = np.where(infeasible, -1, b[un])
            best_area[cells] = np.where(infeasible, np.nan, barea[un])
            best_dist[cells] = np.where(infeasible, np.nan, bdist[un])
        pending = pending[~resolved]

    shp = (nd, ns)
    return Envelope(wind_from_relative_deg=dirs, wind_speed_kt=spds, candidates=cands,
                    status=status.reshape(shp), reasons=reasons.reshape(shp), bank_needed_deg=bank_needed.reshape(shp),
                    best_candidate=best_c.reshape(shp), area_margin_m=best_area.reshape(shp),
                    max_distance_from_runway_m=best_dist.reshape(shp), bank_deg=float(inputs.bank_deg),
                    bank_limit_deg=float(bank_limit_deg), visibility_m=float(visibility_m),
                    area_radius_m=float(area_radius_m))
