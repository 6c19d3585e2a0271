"""The wind envelope: the brief's judgement at every wind of a grid.

Each cell is :func:`briefer.core.manoeuvre.judgement.judge_winds` at that wind: the same batch
solve, the same levels (bank steps, then closer roll-outs), the same ranking and the same
verdict rule (:func:`briefer.core.manoeuvre.ranking.plan_checks`) as the brief's plan, so the
brief at a wind and the envelope's cell for it agree by construction. Cells are solved level by
level, each level only for the cells still without a fitting plan.

Cell verdicts
-------------
* FITS: the best plan passes every check with room (see plan_checks). A bank above the target
  but not near the limit still fits (``bank_needed_deg`` says how much; the brief warns).
* MARGINAL: it fits, and ``reasons`` says which criterion is close: REASON_BANK (within 5 deg of
  the limit), REASON_AREA (area margin under 10 % of R), REASON_SECTOR (within 10 % of R of a
  not-authorised sector), REASON_VISIBILITY (the runway beyond 90 % of the visibility),
  REASON_STALL (angle-of-attack margin under 3 deg).
* DOES_NOT_FIT: nothing fits up to the bank limit, at any roll-out. REASON_WIND: no candidate
  can be flown at all; otherwise REASON_BANK ("would need more than the limit") with the best
  candidate's failures at the limit. REASON_LIMIT alone: the wind's steady crosswind or tailwind
  component on the landing runway is beyond the limits given (no plan is offered there).

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (circling area; 46 km/h (25 kt)
   design wind), 5th ed., 2006.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from briefer._dataclass import dataclass, field

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.judgement import (
    BATCH_N_STRAIGHT,
    BATCH_TURN_STEP_DEG,
    DOES_NOT_FIT,
    FITS,
    MARGINAL,
    STATUS_TEXT,
    judge_winds,
)
from briefer.core.manoeuvre.legs import FloatArray
from briefer.core.manoeuvre.ranking import (
    MARGINAL_AOA_DEG,
    MARGINAL_BANK_DEG,
    REASON_AREA,
    REASON_BANK,
    REASON_LIMIT,
    REASON_NOT_AUTHORISED,
    REASON_SECTOR,
    REASON_STALL,
    REASON_VISIBILITY,
    REASON_WIND,
    MarginFn,
)
from briefer.core.manoeuvre.solver import CircleInputs, Shape, Side
from briefer.errors import DomainError
from briefer.units import KT_TO_MPS

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
    roll_out_m : ndarray (D, S)
        Roll-out distance of the chosen level (closer than the descent point when that was
        needed); NaN where nothing fits. [m]
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
    roll_out_m: FloatArray | None = field(default=None, compare=False)
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
        nofit = st == DOES_NOT_FIT
        if r & REASON_WIND:
            out.append("no plan can be flown in this wind")
        if r & REASON_BANK:
            out.append("would need more than the bank limit" if nofit else
                       f"{self.bank_needed_deg[i, j]:g} deg bank is within {MARGINAL_BANK_DEG:g} deg of the "
                       f"limit ({self.bank_limit_deg:g})")
        if r & REASON_AREA:
            out.append("leaves the protected area" if nofit else "area margin under 10 % of R")
        if r & REASON_SECTOR:
            out.append("enters a not-authorised sector" if nofit else
                       "within 10 % of R of a not-authorised sector")
        if r & REASON_VISIBILITY:
            out.append("runway beyond the visibility" if nofit else "runway beyond 90 % of the visibility")
        if r & REASON_STALL:
            out.append("beyond the stall" if nofit else f"angle-of-attack margin under {MARGINAL_AOA_DEG:g} deg")
        if r & REASON_LIMIT:
            out.append("beyond the crosswind or tailwind limit")
        if r & REASON_NOT_AUTHORISED:
            out.append("circling not authorised for the category")
        return tuple(out)


def wind_envelope(inputs: CircleInputs, *, margin_fn: MarginFn, visibility_m: float, bank_limit_deg: float,
                  area_radius_m: float, wind_from_relative_deg: npt.ArrayLike | None = None,
                  wind_speed_kt: npt.ArrayLike | None = None, bank_step_deg: float = 5.0,
                  turn_step_deg: float = BATCH_TURN_STEP_DEG, n_straight: int = BATCH_N_STRAIGHT,
                  aoa_margin_fn: Callable[[float], float] | None = None, roll_out_steps: bool = True,
                  crosswind_limit_kt: float | None = None, tailwind_limit_kt: float | None = None,
                  authorised: bool = True) -> Envelope:
    """The brief's judgement over a grid of wind directions and speeds (vectorised).

    Parameters
    ----------
    inputs : CircleInputs
        The situation; its ``wind`` is ignored (the grid replaces it) and its ``bank_deg`` is
        the target bank.
    margin_fn : callable
        Vectorised ``margin_fn(tracks)``: tracks of shape (..., N, 2) in the runway frame ->
        smallest protected-area margin of each track, shape (...), positive inside; or the pair
        (margins, sector_bound) (see :data:`briefer.core.manoeuvre.ranking.MarginFn`). [m]
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
    turn_step_deg, n_straight : float, int
        Track samples of the batch: every ``turn_step_deg`` of a turn's calm-wind angle (chord
        error about r (1 - cos 3.75 deg), 0.2 % of r) and ``n_straight`` per straight.
    aoa_margin_fn : callable, optional
        ``aoa_margin_fn(bank_deg)`` -> angle-of-attack margin in that turn. [deg]
    roll_out_steps : bool
        Try the closer roll-outs when nothing fits at the descent point (as the brief does).
    crosswind_limit_kt, tailwind_limit_kt : float, optional
        Cells whose steady crosswind (either side) or tailwind component exceeds these are not
        solved: DOES_NOT_FIT with REASON_LIMIT. [kt]
    authorised : bool
        False where circling is not authorised for the category: the brief then offers no plan
        at any wind, so every cell is DOES_NOT_FIT with REASON_NOT_AUTHORISED (nothing is solved).

    Returns
    -------
    Envelope

    Raises
    ------
    DomainError
        On out-of-range parameters (never for a wind that cannot be flown: that is a cell verdict).
    """
    if not (math.isfinite(area_radius_m) and area_radius_m > 0.0):
        raise DomainError(f"area_radius_m = {area_radius_m}: must be > 0")
    dirs = np.arange(0.0, 360.0, 10.0) if wind_from_relative_deg is None else np.asarray(
        wind_from_relative_deg, dtype=float).ravel()
    spds = np.arange(0.0, 41.0, 1.0) if wind_speed_kt is None else np.asarray(wind_speed_kt, dtype=float).ravel()
    if not (np.all(np.isfinite(dirs)) and np.all(np.isfinite(spds)) and np.all(spds >= 0.0)):
        raise DomainError("wind directions must be finite and wind speeds >= 0")
    rel = np.radians(dirs)[:, None]
    wx = (-spds[None, :] * np.cos(rel) * KT_TO_MPS).ravel()     # blowing toward = -from
    wy = (-spds[None, :] * np.sin(rel) * KT_TO_MPS).ravel()
    shp = (dirs.size, spds.size)
    if not authorised:
        return _nothing_offered(inputs, dirs, spds, bank_limit_deg, visibility_m, area_radius_m)
    beyond = np.zeros(wx.shape, dtype=bool)
    if crosswind_limit_kt is not None:
        beyond |= np.round(np.abs(spds[None, :] * np.sin(rel))).ravel() > crosswind_limit_kt   # whole knots,
    if tailwind_limit_kt is not None:                                                         # as the brief says
        beyond |= np.round(-spds[None, :] * np.cos(rel)).ravel() > tailwind_limit_kt
    # cells beyond the limits are not judged (no plan is offered there); a wind's judgement does
    # not depend on the other winds of the batch, so the others are as if all were judged
    within = np.flatnonzero(~beyond)
    j = judge_winds(inputs, wx_mps=wx[within], wy_mps=wy[within], margin_fn=margin_fn, visibility_m=visibility_m,
                    bank_limit_deg=bank_limit_deg, area_radius_m=area_radius_m, aoa_margin_fn=aoa_margin_fn,
                    bank_step_deg=bank_step_deg, roll_out_steps=roll_out_steps, turn_step_deg=turn_step_deg,
                    n_straight=n_straight)

    def cut(a: npt.NDArray, value: object) -> npt.NDArray:
        out = np.full(wx.shape, value, dtype=a.dtype)
        out[within] = a
        return out.reshape(shp)

    return Envelope(wind_from_relative_deg=dirs, wind_speed_kt=spds, candidates=j.candidates,
                    status=cut(j.status, DOES_NOT_FIT), reasons=cut(j.reasons, REASON_LIMIT),
                    bank_needed_deg=cut(j.bank_needed_deg, np.nan), best_candidate=cut(j.best_candidate, -1),
                    area_margin_m=cut(j.area_margin_m, np.nan),
                    max_distance_from_runway_m=cut(j.max_distance_from_runway_m, np.nan),
                    roll_out_m=cut(j.roll_out_m, np.nan), bank_deg=float(inputs.bank_deg),
                    bank_limit_deg=float(bank_limit_deg), visibility_m=float(visibility_m),
                    area_radius_m=float(area_radius_m))


def _nothing_offered(inputs: CircleInputs, dirs: FloatArray, spds: FloatArray, bank_limit_deg: float,
                     visibility_m: float, area_radius_m: float) -> Envelope:
    """The envelope where no plan may be offered at any wind (circling not authorised)."""
    shp = (dirs.size, spds.size)
    nan = np.full(shp, np.nan)
    return Envelope(wind_from_relative_deg=dirs, wind_speed_kt=spds, candidates=(),
                    status=np.full(shp, DOES_NOT_FIT, dtype=int),
                    reasons=np.full(shp, REASON_NOT_AUTHORISED, dtype=int), bank_needed_deg=nan,
                    best_candidate=np.full(shp, -1, dtype=int), area_margin_m=nan.copy(),
                    max_distance_from_runway_m=nan.copy(), roll_out_m=nan.copy(), bank_deg=float(inputs.bank_deg),
                    bank_limit_deg=float(bank_limit_deg), visibility_m=float(visibility_m),
                    area_radius_m=float(area_radius_m))


__all__ = ["DOES_NOT_FIT", "FITS", "MARGINAL", "REASON_AREA", "REASON_BANK", "REASON_LIMIT", "REASON_NOT_AUTHORISED", "REASON_SECTOR", "REASON_STALL",
           "REASON_VISIBILITY", "REASON_WIND", "STATUS_TEXT", "Envelope", "wind_envelope"]
