"""Sight picture: where the runway sits below the horizon, and the wrong-picture trap.

A circle is flown lower than the pattern a crew flies every day. Putting the runway at its usual
place in the window (the same depression angle) at the lower height puts the aircraft closer to
the runway, in proportion to the height: half the height, half the offset. The turn onto final
must then be tighter (the bank for a given radius rises as 1/r), or, at the planned bank, the
aircraft overshoots the centreline.

References
----------
.. [1] AvWeb (IFR magazine, October 2005), "Circling With Precision" (secondary text): at the
   lower circling altitude, placing the runway in the usual spot in the window can halve the
   lateral spacing; darkness and low visibility make the runway look farther away.
.. [2] ICAO Doc 8168 (PANS-OPS), 5th ed., 2006, Vol II, Part I, Section 4, Chapter 7: the
   circling area is built on a 180 deg turn of radius r, i.e. a lateral spacing of one turn
   diameter 2r (R = 2r + S).
.. [3] Plane trigonometry of the sight line (hand-derived): depression = atan(height / offset).
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass

import numpy as np

from briefer import units
from briefer.core import angles
from briefer.core._types import Numeric
from briefer.core.geometry import linspace as _linspace
from briefer.core.ranges import SCALAR_TYPES, checked, checked_float
from briefer.core.turn import (
    angle_of_attack_in_turn,
    bank_for_radius_deg,
    load_factor,
    stall_speed_in_turn_kt,
    turn_radius_m,
)
from briefer.errors import DomainError

__all__ = [
    "familiar_turn_track_m",
    "SightPictureComparison",
    "compare_sight_picture",
    "depression_angle_deg",
    "offset_for_depression_nm",
    "reversal_lateral_factor",
]


def _positive(name: str, value: Numeric, unit: str) -> np.ndarray:
    return checked(name, value, 0.0, math.inf, unit, lo_open=True, hi_open=True)


def _positive_float(name: str, value: Numeric, unit: str) -> float:
    """`_positive` as a float (one number: without numpy)."""
    if type(value) in SCALAR_TYPES:
        return checked_float(name, value, 0.0, math.inf, unit, lo_open=True, hi_open=True)
    return float(_positive(name, value, unit))


def depression_angle_deg(height_ft: Numeric, offset_nm: Numeric) -> Numeric:
    """Angle of the runway below the horizon, seen from abeam the threshold.

    Parameters
    ----------
    height_ft : numeric
        Height of the eye above the runway, > 0. [ft]
    offset_nm : numeric
        Horizontal distance from the eye to the runway centreline (the downwind offset), > 0. [NM]

    Returns
    -------
    numeric
        depression = atan(height / offset), in (0, 90). [deg]

    Raises
    ------
    DomainError
        If a height or offset is not positive and finite.

    Notes
    -----
    Flat runway, straight sight line to the centreline abeam the threshold [3]_; refraction and
    the earth's curvature are negligible at these distances (under 0.01 deg at 3 NM).

    References
    ----------
    .. [3] Hand-derived sight-line trigonometry (module references).
    """
    if type(height_ft) in SCALAR_TYPES and type(offset_nm) in SCALAR_TYPES:    # one number: math, same operations
        h_f = _positive_float("height_ft", height_ft, "ft") * units.FT_TO_M
        return math.degrees(math.atan(h_f / (_positive_float("offset_nm", offset_nm, "NM") * units.NM_TO_M)))
    h_m = _positive("height_ft", height_ft, "ft") * units.FT_TO_M
    d_m = _positive("offset_nm", offset_nm, "NM") * units.NM_TO_M
    return angles.as_float(angles.atand(h_m / d_m))                  # [3] depression = atan(h / d)


def offset_for_depression_nm(height_ft: Numeric, depression_deg: Numeric) -> Numeric:
    """Offset from the centreline at which the runway sits at a depression angle.

    Parameters
    ----------
    height_ft : numeric
        Height of the eye above the runway, > 0. [ft]
    depression_deg : numeric
        Angle of the runway below the horizon, 0 < angle < 90. [deg]

    Returns
    -------
    numeric
        offset = height / tan(depression); proportional to the height at a fixed angle. [NM]

    Raises
    ------
    DomainError
        If the height is not positive or the angle is outside (0, 90).

    References
    ----------
    .. [3] Hand-derived sight-line trigonometry (module references).
    """
    if type(height_ft) in SCALAR_TYPES and type(depression_deg) in SCALAR_TYPES:  # one number: math, same operations
        h_f = _positive_float("height_ft", height_ft, "ft") * units.FT_TO_M
        dep_f = _positive_float("depression_deg", depression_deg, "deg")
        if dep_f < 90.0:
            return h_f / math.tan(math.radians(dep_f)) * units.M_TO_NM
    h_m = _positive("height_ft", height_ft, "ft") * units.FT_TO_M
    dep = _positive("depression_deg", depression_deg, "deg")
    if np.any(dep >= 90.0):
        raise DomainError(f"depression_deg = {float(np.max(dep)):g} deg is outside the valid range "
                          "0 < depression_deg < 90 deg")
    return angles.as_float(h_m / angles.tand(dep) * units.M_TO_NM)   # [3] d = h / tan(depression)


def reversal_lateral_factor(tas_kt: float, *, crosswind_toward_runway_kt: float = 0.0) -> float:
    """Lateral ground displacement of a downwind-to-final reversal, per metre of turn radius.

    Parameters
    ----------
    tas_kt : float
        True airspeed, > 0. [kt]
    crosswind_toward_runway_kt : float, optional
        Wind component square to the runway, positive when it blows from the downwind leg toward
        the runway (it carries the aircraft toward and past the centreline in the turn);
        |wind| < TAS. [kt]

    Returns
    -------
    float
        k such that the lateral displacement is k r: 2 in still air. [-]

    Raises
    ------
    DomainError
        If the TAS is not positive or the crosswind is not below it.

    Notes
    -----
    Hand-derived for a constant-bank turn from a downwind track parallel to the runway onto the
    reciprocal final track, both tracks held by crabbing. With sin(c) = W / V the heading turns
    through 180 + 2c deg, the air-mass displacement square to the runway is 2 r cos(c) (the
    along-runway parts cancel), and the wind adds W t with t = (pi + 2c) r / V:
    k = 2 cos(c) + (W / V)(pi + 2c). k > 0 for |c| < 90 deg. The along-runway wind component
    does not change k.
    """
    v = _positive_float("tas_kt", tas_kt, "kt")
    w = float(crosswind_toward_runway_kt)
    if not (math.isfinite(w) and abs(w) < v):
        raise DomainError(f"crosswind_toward_runway_kt = {w:g} kt is outside the valid range "
                          f"|crosswind| < TAS = {v:g} kt (the track cannot be held)")
    c = math.asin(w / v)
    return 2.0 * math.cos(c) + (w / v) * (math.pi + 2.0 * c)     # hand-derived, see Notes


@dataclass(frozen=True, slots=True, kw_only=True)
class SightPictureComparison:
    """The planned picture against the familiar one flown at circling height.

    Attributes
    ----------
    circling_height_ft : float
        Height of the circle above the runway. [ft]
    planned_offset_nm : float
        Planned downwind offset from the centreline. [NM]
    planned_depression_deg : float
        Runway below the horizon abeam the threshold on the planned downwind. [deg]
    familiar_height_ft, familiar_offset_nm : float
        The pattern the crew flies every day. [ft], [NM]
    familiar_depression_deg : float
        Runway below the horizon in that pattern. [deg]
    familiar_offset_at_circling_nm, familiar_offset_at_circling_m : float
        Offset that puts the runway at the familiar angle at circling height. [NM], [m]
    offset_ratio : float
        familiar_offset_at_circling / planned_offset (0.5: "half the spacing"). [-]
    crosswind_toward_runway_kt : float
        Wind used for the turns (0: still air). [kt]
    tas_kt, ias_kt : float
        Speeds of the circle. [kt]
    bank_planned_deg, bank_limit_deg : float
        Planned bank and the profile's limit. [deg]
    planned_turn_radius_m : float
        Radius at the planned bank. [m]
    planned_lateral_m : float
        Lateral displacement of the 180 deg reversal at the planned bank (2 r in still air). [m]
    familiar_possible : bool
        False when no bank below 90 deg fits the reversal into the familiar offset.
    familiar_turn_radius_m : float or None
        Radius the reversal needs to fit the familiar offset. [m]
    familiar_bank_required_deg : float or None
        Bank for that radius. [deg]
    familiar_load_factor : float or None
        Load factor at that bank. [-]
    familiar_stall_speed_kt : float or None
        Stall speed in that turn at this weight. [kt]
    familiar_stall_margin_pct : float or None
        (IAS - stall speed) / stall speed * 100; negative = beyond the stall. [%]
    familiar_aoa : float or None
        Angle of attack that turn needs, in the profile's angle-of-attack unit (above the
        profile's stall angle means the wing cannot make the lift).
    familiar_beyond_stall : bool
        The turn cannot be flown at the IAS without stalling (or is not possible at all).
    familiar_exceeds_bank_limit : bool
        The required bank exceeds the profile's limit (or no bank fits).
    overshoot_m, overshoot_nm : float
        planned_lateral - familiar_offset_at_circling: how far past the centreline the planned
        bank carries the aircraft from the familiar-picture downwind (negative: rolls out short
        of it). [m], [NM]
    """

    circling_height_ft: float
    planned_offset_nm: float
    planned_depression_deg: float
    familiar_height_ft: float
    familiar_offset_nm: float
    familiar_depression_deg: float
    familiar_offset_at_circling_nm: float
    familiar_offset_at_circling_m: float
    offset_ratio: float
    crosswind_toward_runway_kt: float
    tas_kt: float
    ias_kt: float
    bank_planned_deg: float
    bank_limit_deg: float
    planned_turn_radius_m: float
    planned_lateral_m: float
    familiar_possible: bool
    familiar_turn_radius_m: float | None
    familiar_bank_required_deg: float | None
    familiar_load_factor: float | None
    familiar_stall_speed_kt: float | None
    familiar_stall_margin_pct: float | None
    familiar_aoa: float | None
    familiar_beyond_stall: bool
    familiar_exceeds_bank_limit: bool
    overshoot_m: float
    overshoot_nm: float

    def __post_init__(self) -> None:
        if not (0.0 < self.planned_depression_deg < 90.0 and 0.0 < self.familiar_depression_deg < 90.0):
            for name in ("planned_depression_deg", "familiar_depression_deg"):
                if not 0.0 < getattr(self, name) < 90.0:
                    raise DomainError(f"{name} = {getattr(self, name):g} deg must be within (0, 90)")
        if not math.isclose(self.familiar_offset_at_circling_nm * units.NM_TO_M,
                            self.familiar_offset_at_circling_m, rel_tol=1e-9):
            raise DomainError("familiar_offset_at_circling_nm and _m disagree")
        if not math.isclose(self.overshoot_nm * units.NM_TO_M, self.overshoot_m, rel_tol=1e-9, abs_tol=1e-9):
            raise DomainError("overshoot_nm and overshoot_m disagree")
        turn_fields = (self.familiar_turn_radius_m, self.familiar_bank_required_deg, self.familiar_load_factor,
                       self.familiar_stall_speed_kt, self.familiar_stall_margin_pct, self.familiar_aoa)
        if self.familiar_possible:
            if None in turn_fields:       # (each field a float or None)
                raise DomainError("a possible familiar turn must carry its bank, load factor, stall and AoA")
            assert self.familiar_bank_required_deg is not None
            if not 0.0 < self.familiar_bank_required_deg < 90.0:
                raise DomainError(f"familiar_bank_required_deg = {self.familiar_bank_required_deg:g} "
                                  "must be within (0, 90)")
        else:
            if any(v is not None for v in turn_fields):
                raise DomainError("an impossible familiar turn carries no bank, load factor, stall or AoA")
            if not (self.familiar_exceeds_bank_limit and self.familiar_beyond_stall):
                raise DomainError("an impossible familiar turn exceeds the bank limit and the stall")


def _familiar_turn(tas_kt: float, ias_kt: float, radius_m: float, *, bank_limit_deg: float, vs1g_kt: float,
                   vref_kt: float, aoa_ref: float, aoa_stall: float, weight_ratio: float,
                   ) -> tuple[bool, bool, bool, dict[str, float | None]]:
    """The turn that fits the familiar picture's offset (`compare_sight_picture`, Notes): whether
    a bank below 90 deg gives `radius_m` at `tas_kt`, whether that turn is beyond the stall,
    whether it exceeds the bank limit, and its figures (all None when no bank fits)."""
    try:
        bank_need = float(bank_for_radius_deg(tas_kt, radius_m=radius_m))          # tan(bank) = V^2/(g r)
        n_need = float(load_factor(bank_need))                                     # DomainError at 90 deg
        possible = bank_need < 90.0
    except DomainError:        # the radius is out of reach: no bank below 90 deg fits (shown to the crew)
        possible = False
    if not possible:
        return False, True, True, dict(
            familiar_turn_radius_m=None, familiar_bank_required_deg=None, familiar_load_factor=None,
            familiar_stall_speed_kt=None, familiar_stall_margin_pct=None, familiar_aoa=None)
    vs_turn = float(stall_speed_in_turn_kt(vs1g_kt, bank_need, weight_ratio=weight_ratio))
    aoa = float(angle_of_attack_in_turn(ias_kt, bank_need, vref_kt=vref_kt, vs1g_kt=vs1g_kt,
                                        aoa_ref=aoa_ref, aoa_stall=aoa_stall, weight_ratio=weight_ratio))
    margin_pct = (ias_kt - vs_turn) / vs_turn * 100.0
    return True, margin_pct < 0.0, bank_need > bank_limit_deg, dict(
        familiar_turn_radius_m=radius_m, familiar_bank_required_deg=bank_need, familiar_load_factor=n_need,
        familiar_stall_speed_kt=vs_turn, familiar_stall_margin_pct=margin_pct, familiar_aoa=aoa)


def compare_sight_picture(*, circling_height_ft: float, planned_offset_nm: float, familiar_height_ft: float,
                          familiar_offset_nm: float, tas_kt: float, ias_kt: float, bank_planned_deg: float,
                          bank_limit_deg: float, vs1g_kt: float, vref_kt: float, aoa_ref: float,
                          aoa_stall: float, weight_ratio: float = 1.0,
                          crosswind_toward_runway_kt: float = 0.0) -> SightPictureComparison:
    """Compare the planned sight picture with the familiar one flown at circling height.

    Parameters
    ----------
    circling_height_ft : float
        Height of the circle above the runway, > 0. [ft]
    planned_offset_nm : float
        Planned downwind offset from the runway centreline, > 0. [NM]
    familiar_height_ft : float
        Height of the crew's everyday pattern above the runway, > 0. [ft]
    familiar_offset_nm : float
        Downwind offset of that pattern, > 0. [NM]
    tas_kt : float
        True airspeed in the circle (sets the turn radius). [kt]
    ias_kt : float
        Indicated airspeed in the circle (sets the stall margin and angle of attack). [kt]
    bank_planned_deg : float
        Bank planned for the turn onto final, 0 < bank < 90. [deg]
    bank_limit_deg : float
        The profile's bank limit for the circle, 0 < limit < 90. [deg]
    vs1g_kt : float
        1-g stall speed (IAS) in the circling configuration at the reference weight. [kt]
    vref_kt : float
        Reference speed of the angle-of-attack anchor `aoa_ref`. [kt]
    aoa_ref, aoa_stall : float
        Angle of attack at VREF (1 g) and at the stall, in the profile's unit.
    weight_ratio : float, optional
        Weight relative to the reference weight of `vs1g_kt`. [-]
    crosswind_toward_runway_kt : float, optional
        Wind component square to the runway, positive when it blows from the downwind leg toward
        the runway; 0 (default) is the still-air comparison. [kt]

    Returns
    -------
    SightPictureComparison

    Raises
    ------
    DomainError
        If an input is outside its range. A reversal that no bank can fit into the familiar
        offset is not an error: it is reported with `familiar_possible` False.

    Notes
    -----
    depression = atan(h / d) [3]_; flying the familiar angle at circling height gives
    d_f = h_circ / tan(depression_familiar) [1]_. The reversal onto final is a 180 deg turn whose
    lateral displacement is one diameter, 2 r, in still air [2]_, so fitting d_f needs
    r = d_f / 2 and tan(bank) = V^2 / (g r) (V = TAS). The load factor, the stall speed in that
    turn (VS1G sqrt(n) sqrt(W/W_ref)), the stall margin (IAS - VS_turn) / VS_turn * 100 and the
    angle of attack (linear lift model) follow from `briefer.core.turn`. Holding the planned bank
    instead displaces the aircraft by 2 r_planned, overshooting the centreline by
    2 r_planned - d_f. With a crosswind the still-air factor 2 becomes
    `reversal_lateral_factor` (hand-derived closed form; tracks held by crabbing).

    The comparison is of geometry and turn performance only: the profile's plan and its ground
    track in the wind come from the manoeuvre module.

    References
    ----------
    .. [1] AvWeb/IFR magazine, "Circling With Precision," 2005 (secondary text).
    .. [2] ICAO Doc 8168, Vol II, Part I, Section 4, Chapter 7 (R = 2r + S).
    .. [3] Hand-derived sight-line trigonometry.
    """
    h_circ = _positive_float("circling_height_ft", circling_height_ft, "ft")
    d_plan = _positive_float("planned_offset_nm", planned_offset_nm, "NM")
    h_fam = _positive_float("familiar_height_ft", familiar_height_ft, "ft")
    d_fam = _positive_float("familiar_offset_nm", familiar_offset_nm, "NM")
    ias = _positive_float("ias_kt", ias_kt, "kt")
    if not (math.isfinite(bank_limit_deg) and 0.0 < bank_limit_deg < 90.0):
        raise DomainError(f"bank_limit_deg = {bank_limit_deg:g} deg is outside the valid range "
                          "0 < bank_limit_deg < 90 deg")
    k = reversal_lateral_factor(tas_kt, crosswind_toward_runway_kt=crosswind_toward_runway_kt)

    dep_plan = float(depression_angle_deg(h_circ, d_plan))                         # [3]
    dep_fam = float(depression_angle_deg(h_fam, d_fam))                            # [3]
    d_fam_circ_nm = float(offset_for_depression_nm(h_circ, dep_fam))               # [1] same angle, lower
    d_fam_circ_m = d_fam_circ_nm * units.NM_TO_M

    r_plan_m = float(turn_radius_m(tas_kt, bank_planned_deg))
    lateral_plan_m = k * r_plan_m                                                  # [2] 2 r in still air
    overshoot_m = lateral_plan_m - d_fam_circ_m

    r_need_m = d_fam_circ_m / k                                                    # [2] r = d / 2 in still air
    possible, beyond_stall, exceeds, turn = _familiar_turn(
        tas_kt, ias, r_need_m, bank_limit_deg=bank_limit_deg, vs1g_kt=vs1g_kt, vref_kt=vref_kt,
        aoa_ref=aoa_ref, aoa_stall=aoa_stall, weight_ratio=weight_ratio)
    if not possible:
        # a turn that can be flown checks the stall and angle-of-attack inputs in its own calls
        # (the inputs first, in this order, then the bank); one that cannot has them checked
        # wings-level here, so that a bad profile raises either way and is never mistaken for
        # an impossible turn
        stall_speed_in_turn_kt(vs1g_kt, 0.0, weight_ratio=weight_ratio)
        angle_of_attack_in_turn(ias, 0.0, vref_kt=vref_kt, vs1g_kt=vs1g_kt, aoa_ref=aoa_ref,
                                aoa_stall=aoa_stall, weight_ratio=weight_ratio)

    return SightPictureComparison(
        circling_height_ft=h_circ, planned_offset_nm=d_plan, planned_depression_deg=dep_plan,
        familiar_height_ft=h_fam, familiar_offset_nm=d_fam, familiar_depression_deg=dep_fam,
        familiar_offset_at_circling_nm=d_fam_circ_nm, familiar_offset_at_circling_m=d_fam_circ_m,
        offset_ratio=d_fam_circ_nm / d_plan, crosswind_toward_runway_kt=float(crosswind_toward_runway_kt),
        tas_kt=float(tas_kt), ias_kt=ias, bank_planned_deg=float(bank_planned_deg),
        bank_limit_deg=float(bank_limit_deg), planned_turn_radius_m=r_plan_m, planned_lateral_m=lateral_plan_m,
        familiar_possible=possible, familiar_beyond_stall=beyond_stall, familiar_exceeds_bank_limit=exceeds,
        overshoot_m=overshoot_m, overshoot_nm=overshoot_m * units.M_TO_NM, **turn,
    )


def familiar_turn_track_m(*, side: str, roll_in_along_m: float, offset_m: float, radius_m: float) -> np.ndarray:
    """The turn the familiar picture gives, in still air and runway axes.

    A downwind at the familiar offset, the planned bank (radius) held from the planned roll-in
    point through 180 deg, then straight ahead: the track the crew would fly by holding their
    everyday picture at circling height (drawn beside the plan; the overshoot is in
    `SightPictureComparison`).

    Parameters
    ----------
    side : {"left", "right"}
        Side of the runway the downwind is flown on (right: positive ``y``).
    roll_in_along_m : float
        Along-track position of the planned roll-in (runway axes, ``x``). [m]
    offset_m : float
        Familiar offset at circling height. [m]
    radius_m : float
        Turn radius at the planned bank. [m]

    Returns
    -------
    ndarray, shape (51, 2)
        Points (x along the landing direction, y to the right of it). [m]

    Notes
    -----
    Circle geometry [3]_: a 180 deg turn of radius r moves the track 2 r sideways.
    """
    sign = 1.0 if side == "right" else -1.0
    x_ri = roll_in_along_m
    sin_th, one_minus_cos_th = _half_turn()
    out = np.empty((51, 2))
    out[:8, 0] = _spaced(x_ri + 2500.0, x_ri, 8)                    # downwind
    out[:8, 1] = sign * offset_m
    along = out[8:45, 0]                                            # 180 deg of turn, 37 points:
    np.subtract(x_ri, np.multiply(radius_m, sin_th, out=along), out=along)    # x_ri - radius_m * sin_th
    right = out[8:45, 1]
    np.multiply(sign, np.subtract(offset_m, np.multiply(radius_m, one_minus_cos_th, out=right), out=right),
                out=right)                                          # sign * (offset_m - radius_m * (1 - cos th))
    out[45:, 0] = _spaced(x_ri, x_ri + 1500.0, 6)                   # final
    out[45:, 1] = sign * (offset_m - 2 * radius_m)
    return out


def _spaced(start: float, stop: float, num: int) -> list[float] | np.ndarray:
    """`briefer.core.geometry.linspace` of two floats as a list: its operations (i * step + start,
    the last point set to stop) on floats, the same numbers without the arrays."""
    step = (stop - start) / (num - 1)
    if step == 0.0 or not math.isfinite(step):
        return _linspace(start, stop, num)
    y = [i * step + start for i in range(num)]
    y[-1] = stop
    return y


_HALF_TURN: list[tuple[np.ndarray, np.ndarray]] = []


def _half_turn() -> tuple[np.ndarray, np.ndarray]:
    """sin(th) and 1 - cos(th) at 37 angles th from 0 to pi (computed once)."""
    if not _HALF_TURN:
        th = np.linspace(0.0, math.pi, 37)
        _HALF_TURN.append((np.sin(th), 1 - np.cos(th)))
    return _HALF_TURN[0]

