"""Ranking of candidate plans, and the choice of the lowest bank that fits.

Verdict thresholds (shared with the envelope, :mod:`briefer.core.manoeuvre.envelope`)
-------------------------------------------------------------------------------------
A plan FAILS if it cannot be flown, needs more bank than the limit, leaves the protected area
(area margin < 0), takes the runway beyond the visibility (max distance from the runway >
visibility) or, if an angle-of-attack margin callable is given, has a negative margin. It is
MARGINAL (our thresholds) when the bank is within ``MARGINAL_BANK_DEG`` = 5 deg of the limit,
the area margin is below ``MARGINAL_AREA_FRACTION`` = 10 % of the area radius R, the runway gets
beyond ``MARGINAL_VISIBILITY_FRACTION`` = 90 % of the visibility, or the AoA margin is below
``MARGINAL_AOA_DEG`` = 3 deg. Candidates are ordered by (number of failures, bank,
-min(area margin, visibility margin) to 1 m, -AoA margin, total time to 0.1 s); exact ties keep
the candidate order.

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (circling area: R = 2r + S; 20 deg
   design bank), 5th ed., 2006.
.. [2] docs/REFERENCES.md section 9: circling bank commonly kept at or below 30 deg, the
   runway to stay in sight (visibility), common practice.
"""

from __future__ import annotations

import dataclasses
import math
from briefer._dataclass import dataclass
from typing import Callable, Literal

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.plans import Plan, candidate_plans
from briefer.core.manoeuvre.solver import CircleInputs
from briefer.errors import DomainError
from briefer.units import M_TO_NM, M_TO_SM

MARGINAL_BANK_DEG = 5.0
MARGINAL_AREA_FRACTION = 0.10
MARGINAL_VISIBILITY_FRACTION = 0.90
MARGINAL_AOA_DEG = 3.0

# the criteria of a failure or of a marginal plan, as bits (the brief's ranking, the envelope's cells)
REASON_BANK, REASON_AREA, REASON_VISIBILITY, REASON_WIND, REASON_SECTOR, REASON_STALL = 1, 2, 4, 8, 16, 32
REASON_LIMIT = 64        # the wind is beyond the aircraft's crosswind or tailwind limit (no plan is offered)
REASON_NOT_AUTHORISED = 128   # circling is not authorised for the category (no plan is offered)

MarginFn = (Callable[[npt.NDArray[np.float64]], "float | npt.NDArray[np.float64] | tuple"]
            if TYPE_CHECKING else Callable)
"""margin_fn(track_xy) -> minimum area margin [m], positive inside. ``track_xy`` is a runway-frame
array of shape (..., N, 2); the result has shape (...) (a float for one (N, 2) track). It may also
answer a pair (margins, sector_bound): sector_bound True where the margin is a not-authorised
sector's rather than the area radius's."""


def plan_checks(*, bank_deg: npt.ArrayLike, bank_limit_deg: float, area_margin_m: npt.ArrayLike,
                sector_bound: npt.ArrayLike, visibility_m: float, max_distance_from_runway_m: npt.ArrayLike,
                area_radius_m: float | None, aoa_margin_deg: npt.ArrayLike | None
                ) -> tuple[npt.NDArray[np.int_], npt.NDArray[np.int_]]:
    """The verdict criteria of flyable plans (the one rule of the brief and the envelope).

    Returns (failures, marginal) as REASON_* bits, elementwise. Failures: bank above the limit
    (BANK), area margin < 0 (AREA, or SECTOR when the margin is a not-authorised sector's), the
    runway farther than the visibility (VISIBILITY), angle-of-attack margin < 0 (STALL).
    Marginal, for a criterion that does not fail: bank within ``MARGINAL_BANK_DEG`` of the
    limit, area margin under ``MARGINAL_AREA_FRACTION`` of R (not checked when R is None), the
    runway beyond ``MARGINAL_VISIBILITY_FRACTION`` of the visibility, AoA margin under
    ``MARGINAL_AOA_DEG`` (not checked when None). NaN margins (plans that cannot be flown)
    check nothing.
    """
    bank = np.asarray(bank_deg, dtype=float)
    area = np.asarray(area_margin_m, dtype=float)
    dist = np.asarray(max_distance_from_runway_m, dtype=float)
    a_bit = np.where(np.asarray(sector_bound, dtype=bool), REASON_SECTOR, REASON_AREA)
    zero = np.zeros(np.broadcast(bank, area, dist, a_bit).shape, dtype=np.int64)
    over = bank > bank_limit_deg
    fail = zero + np.where(over, REASON_BANK, 0) + np.where(area < 0.0, a_bit, 0) \
        + np.where(visibility_m - dist < 0.0, REASON_VISIBILITY, 0)
    marg = zero + np.where(~over & (bank > bank_limit_deg - MARGINAL_BANK_DEG), REASON_BANK, 0) \
        + np.where(dist > MARGINAL_VISIBILITY_FRACTION * visibility_m, REASON_VISIBILITY, 0) * (visibility_m - dist >= 0.0)
    if area_radius_m is not None:
        marg = marg + np.where((area >= 0.0) & (area < MARGINAL_AREA_FRACTION * area_radius_m), a_bit, 0)
    if aoa_margin_deg is not None:
        aoa = np.asarray(aoa_margin_deg, dtype=float)
        fail = fail + np.where(aoa < 0.0, REASON_STALL, 0)
        marg = marg + np.where((aoa >= 0.0) & (aoa < MARGINAL_AOA_DEG), REASON_STALL, 0)
    return fail, marg


def plan_checks_one(*, bank_deg: float, bank_limit_deg: float, area_margin_m: float, sector_bound: bool,
                    visibility_m: float, max_distance_from_runway_m: float, area_radius_m: float | None,
                    aoa_margin_deg: float | None) -> tuple[int, int]:
    """:func:`plan_checks` of one plan in plain floats: the same comparisons and the same single
    operations (IEEE, so the same bits), without the array calls. Returns (failures, marginal)."""
    bank, area, dist = float(bank_deg), float(area_margin_m), float(max_distance_from_runway_m)
    a_bit = REASON_SECTOR if sector_bound else REASON_AREA
    over = bank > bank_limit_deg
    fail = (REASON_BANK if over else 0) + (a_bit if area < 0.0 else 0) \
        + (REASON_VISIBILITY if visibility_m - dist < 0.0 else 0)
    marg = (REASON_BANK if not over and bank > bank_limit_deg - MARGINAL_BANK_DEG else 0) \
        + (REASON_VISIBILITY if dist > MARGINAL_VISIBILITY_FRACTION * visibility_m and visibility_m - dist >= 0.0
           else 0)
    if area_radius_m is not None and area >= 0.0 and area < MARGINAL_AREA_FRACTION * area_radius_m:
        marg += a_bit
    if aoa_margin_deg is not None:
        aoa = float(aoa_margin_deg)
        fail += REASON_STALL if aoa < 0.0 else 0
        marg += REASON_STALL if aoa >= 0.0 and aoa < MARGINAL_AOA_DEG else 0
    return fail, marg


Verdict = Literal["fits", "marginal", "does not fit"]


@dataclass(frozen=True, slots=True, kw_only=True)
class RankedPlan:
    """A plan with its checks, its verdict and why it is not first.

    Attributes
    ----------
    plan : Plan
    rank : int
        1 = the recommended plan.
    verdict : {"fits", "marginal", "does not fit"}
    area_margin_m : float or None
        Smallest distance inside the protected area along the track (negative = leaves). [m]
    visibility_margin_m : float or None
        Visibility minus the largest distance from the runway along the track. [m]
    aoa_margin_deg : float or None
        Angle-of-attack margin from the caller's callable (None if not given). [deg]
    failures : tuple of str
        Hard failures (the plan's own reasons if infeasible).
    marginal : tuple of str
        Why it is marginal.
    why_not_first : str
        Short reason it loses to rank 1 ("" for rank 1).
    """

    plan: Plan
    rank: int
    verdict: Verdict
    area_margin_m: float | None
    visibility_margin_m: float | None
    aoa_margin_deg: float | None
    failures: tuple[str, ...]
    marginal: tuple[str, ...]
    why_not_first: str

    def __post_init__(self) -> None:
        if self.rank < 1:
            raise DomainError("rank starts at 1")
        if self.verdict not in ("fits", "marginal", "does not fit"):
            raise DomainError(f"verdict = {self.verdict!r}")
        if (self.verdict == "does not fit") != bool(self.failures):
            raise DomainError("'does not fit' exactly when there are failures")


def _nm(distance_m: float) -> str:
    """A distance for the crew: nautical miles, two decimals."""
    return f"{distance_m * M_TO_NM:.2f} NM"


def reason_visibility_words(visibility_m: float) -> str:
    """A visibility as the ranking's reasons name it: statute miles, one decimal ('3.0 SM'). The
    brief records each use (`briefer.result.VisibilityMention`) so that a renderer can say it in
    the crew's display units."""
    return f"{visibility_m * M_TO_SM:.1f} SM"


def _as_float(value: object) -> float:
    """``float(np.asarray(value))``: a float as it is, anything else through the array."""
    return value if type(value) is float else float(np.asarray(value))


def _label(p: Plan) -> str:
    return f"{p.shape} {p.side}"


def rank_plans(plans: tuple[Plan, ...] | list[Plan], *, margin_fn: MarginFn, visibility_m: float,
               bank_limit_deg: float, area_radius_m: float | None = None,
               aoa_margin_fn: Callable[[float], float] | None = None) -> tuple[RankedPlan, ...]:
    """Rank candidate plans and say why each loser loses.

    Parameters
    ----------
    plans : sequence of Plan
    margin_fn : callable
        ``margin_fn(track_xy)`` -> smallest protected-area margin [m] along a runway-frame track
        of shape (N, 2), positive inside (including not-authorised sectors).
    visibility_m : float
        Reported visibility, > 0. [m]
    bank_limit_deg : float
        Largest bank allowed, 0 < limit < 90. [deg]
    area_radius_m : float, optional
        Area radius R, for the 10 % marginal threshold (not used if None). [m]
    aoa_margin_fn : callable, optional
        ``aoa_margin_fn(bank_deg)`` -> angle-of-attack margin to the stall in that turn. [deg]

    Returns
    -------
    tuple of RankedPlan
        Best first. Never raises for an infeasible plan: it ranks last with its reasons.

    Raises
    ------
    DomainError
        If visibility or bank limit is out of range.

    Notes
    -----
    Order key (lower is better): (number of failures, bank, -min(area margin, visibility
    margin) rounded to 1 m, -AoA margin, total time rounded to 0.1 s); infeasible plans after
    all others; exact ties keep the input order. Thresholds: see the
    module docstring.
    """
    if not (math.isfinite(visibility_m) and visibility_m >= 0.0):   # 0: a legal report (fog)
        raise DomainError(f"visibility_m = {visibility_m}: must be >= 0")
    if not 0.0 < bank_limit_deg < 90.0:
        raise DomainError(f"bank_limit_deg = {bank_limit_deg}: valid range is (0, 90)")
    rows = []
    flyable = [p for p in plans if p.feasible]
    areas = [_as_float(margin_fn(p.track_xy_m)) for p in flyable]
    aoas = [None if aoa_margin_fn is None else float(aoa_margin_fn(p.bank_deg)) for p in flyable]
    checks = iter([(area, aoa, *plan_checks_one(  # each flyable plan: plan_checks' rule in plain floats
        bank_deg=p.bank_deg, bank_limit_deg=bank_limit_deg, area_margin_m=area, sector_bound=False,
        visibility_m=visibility_m, max_distance_from_runway_m=p.max_distance_from_runway_m,  # type: ignore[arg-type]
        area_radius_m=area_radius_m, aoa_margin_deg=aoa)) for p, area, aoa in zip(flyable, areas, aoas)])
    for p in plans:
        if not p.feasible:
            rows.append(((10**6, 0.0, 0.0, 0.0, 0.0), p, None, None, None, tuple(p.reasons), ()))
            continue
        area, aoa, fbits, mbits = next(checks)
        assert p.max_distance_from_runway_m is not None and p.total_time_s is not None
        vis = visibility_m - p.max_distance_from_runway_m
        fails, marg = [], []
        if fbits & REASON_BANK:
            fails.append(f"needs {p.bank_deg:g} deg bank, above the {bank_limit_deg:g} deg limit")
        elif mbits & REASON_BANK:
            marg.append(f"{p.bank_deg:g} deg bank is within {MARGINAL_BANK_DEG:g} deg of the limit")
        if fbits & REASON_AREA:
            fails.append(f"leaves the protected area by {_nm(-area)}")
        elif mbits & REASON_AREA:
            marg.append(f"only {_nm(area)} inside the protected area (< 10 % of R)")
        if fbits & REASON_VISIBILITY:
            fails.append(f"the runway gets {_nm(p.max_distance_from_runway_m)} away, beyond the "
                         f"{reason_visibility_words(visibility_m)} visibility")
        elif mbits & REASON_VISIBILITY:
            marg.append(f"the runway gets {_nm(p.max_distance_from_runway_m)} away, over 90 % of the "
                        f"{reason_visibility_words(visibility_m)} visibility")
        if fbits & REASON_STALL:
            fails.append(f"angle-of-attack margin {aoa:.1f} deg: beyond the stall")
        elif mbits & REASON_STALL:
            marg.append(f"angle-of-attack margin only {aoa:.1f} deg")
        key = (len(fails), round(p.bank_deg, 3), -round(min(area, vis)), -(aoa or 0.0), round(p.total_time_s, 1))
        rows.append((key, p, area, vis, aoa, tuple(fails), tuple(marg)))
    rows.sort(key=lambda r: r[0])
    out: list[RankedPlan] = []
    for i, (key, p, area, vis, aoa, fails, marg) in enumerate(rows):
        why = "" if i == 0 else _why_loses(rows[0], (key, p, area, vis, aoa, fails, marg))
        verdict: Verdict = "does not fit" if fails else ("marginal" if marg else "fits")
        out.append(RankedPlan(plan=p, rank=i + 1, verdict=verdict, area_margin_m=area, visibility_margin_m=vis,
                              aoa_margin_deg=aoa, failures=fails, marginal=marg, why_not_first=why))
    return tuple(out)


def _margin(m: float) -> str:
    """A margin for the crew's text: '0.40 NM' to spare, or '0.58 NM short' (never a negative distance)."""
    return _nm(m) if m >= 0 else f"{_nm(-m)} short"


def _why_loses(best: tuple, row: tuple) -> str:
    bkey, bp, barea, bvis = best[0], best[1], best[2], best[3]
    key, p, area, vis, aoa, fails = row[0], row[1], row[2], row[3], row[4], row[5]
    if not p.feasible:
        return "cannot be flown: " + p.reasons[0]
    if key[0] > bkey[0]:
        return "fails: " + "; ".join(fails)
    if key[1] > bkey[1]:
        return f"needs {p.bank_deg:g} deg bank against {bp.bank_deg:g} deg for {_label(bp)}"
    if key[2] > bkey[2]:
        if min(area, vis) == area:
            return f"area margin {_margin(area)} against {_margin(min(barea, bvis))} for {_label(bp)}"
        return f"the runway gets {_nm(p.max_distance_from_runway_m)} away (visibility margin {_margin(vis)}) " \
               f"against {_margin(min(barea, bvis))} for {_label(bp)}"
    if key[3] > bkey[3]:
        return f"angle-of-attack margin {aoa:.1f} deg against {-bkey[3]:.1f} deg for {_label(bp)}"
    if round(p.total_time_s - bp.total_time_s, 1) == 0.0:
        return f"ties with {_label(bp)}: either may be flown"
    return f"takes {p.total_time_s - bp.total_time_s:.0f} s longer than {_label(bp)}"


@dataclass(frozen=True, slots=True, kw_only=True)
class PlanChoice:
    """The candidates ranked at the lowest bank that makes the best of them fit.

    Attributes
    ----------
    bank_needed_deg : float or None
        Lowest bank level (target, then steps up to the limit) at which the best candidate has
        no failure; None if none up to the limit. [deg]
    banks_tried_deg : tuple of float
        The bank levels tried. [deg]
    ranked : tuple of RankedPlan
        The ranking at ``bank_needed_deg`` (or at the last level tried).
    """

    bank_needed_deg: float | None
    banks_tried_deg: tuple[float, ...]
    ranked: tuple[RankedPlan, ...]

    def __post_init__(self) -> None:
        if not self.banks_tried_deg:
            raise DomainError("at least one bank level is tried")


def bank_levels_deg(bank_deg: float, bank_limit_deg: float, step_deg: float) -> tuple[float, ...]:
    """Bank levels tried: the target, then every ``step_deg`` below the limit, then the limit."""
    if not step_deg > 0.0:
        raise DomainError(f"bank step_deg = {step_deg}: must be > 0")
    levels = [float(bank_deg)]
    b = bank_deg + step_deg
    while b < bank_limit_deg - 1e-9:
        levels.append(float(b))
        b += step_deg
    if bank_limit_deg > bank_deg + 1e-9:
        levels.append(float(bank_limit_deg))
    return tuple(levels)


def choose_plan(inputs: CircleInputs, *, margin_fn: MarginFn, visibility_m: float, bank_limit_deg: float,
                area_radius_m: float | None = None, bank_step_deg: float = 5.0,
                aoa_margin_fn: Callable[[float], float] | None = None) -> PlanChoice:
    """Rank the candidates at the inputs' bank and, if the best one fails, at steeper banks.

    The same rule as one cell of :func:`briefer.core.manoeuvre.envelope.wind_envelope`.
    Banks above 60 deg are not tried (the solver's range).
    """
    levels = tuple(b for b in bank_levels_deg(inputs.bank_deg, bank_limit_deg, bank_step_deg) if b <= 60.0)
    ranked: tuple[RankedPlan, ...] = ()
    for b in levels:
        plans = candidate_plans(dataclasses.replace(inputs, bank_deg=b))
        ranked = rank_plans(plans, margin_fn=margin_fn, visibility_m=visibility_m, bank_limit_deg=bank_limit_deg,
                            area_radius_m=area_radius_m, aoa_margin_fn=aoa_margin_fn)
        if ranked and not ranked[0].failures:
            return PlanChoice(bank_needed_deg=b, banks_tried_deg=levels[: levels.index(b) + 1], ranked=ranked)
    return PlanChoice(bank_needed_deg=None, banks_tried_deg=levels, ranked=ranked)


__all__ = ["REASON_LIMIT", "REASON_AREA", "REASON_BANK", "REASON_SECTOR", "REASON_STALL", "REASON_VISIBILITY", "REASON_WIND",
           "plan_checks", "plan_checks_one", "MARGINAL_AOA_DEG", "MARGINAL_AREA_FRACTION", "MARGINAL_BANK_DEG", "MARGINAL_VISIBILITY_FRACTION",
           "MarginFn", "PlanChoice", "RankedPlan", "Verdict", "bank_levels_deg", "choose_plan", "rank_plans"]
