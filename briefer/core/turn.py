"""Coordinated level turn: radius, rate, load factor, stall speed and angle of attack.

All functions model a steady, coordinated, level turn at constant true airspeed in still air
(the wind only displaces the turn over the ground; see `briefer.core.wind` and the manoeuvre
module). g is the standard acceleration of gravity, `units.G0_MPS2`.

Validity ranges (a `DomainError` is raised outside them, never a silent NaN):

* bank: 0 <= bank_deg < 90 (a magnitude; the turn direction is the caller's business). Radius,
  time-to-turn and `turn_performance` need a turn, so they require 0 < bank_deg < 90; at 0 deg
  the rate of turn is 0 and the load factor 1;
* speeds: 0 < speed <= 1000 kt;
* weight ratio W/W_ref: 0 < w <= 10;
* turn angle: 0 <= angle_deg <= 3600.

References
----------
.. [1] FAA, "Pilot's Handbook of Aeronautical Knowledge," FAA-H-8083-25, Chapter "Aerodynamics
   of Flight" (load factor n = 1/cos(bank); stall speed rises with the square root of the load
   factor; load factor chart).
.. [2] ICAO, "Procedures for Air Navigation Services - Aircraft Operations," Doc 8168, Vol II,
   Part I, Section 2, Chapter 3 (rate of turn R = 3431 tan(bank)/(pi V) deg/s and radius r = V/(20
   pi R) NM for V in kt).
.. [3] Level-turn mechanics and the linear lift curve as given in introductory flight-mechanics
   textbooks (from memory): lift L = n W balances weight and centripetal force, so
   r = V^2/(g tan(bank)), omega = g tan(bank)/V; below the stall C_L = a (alpha - alpha_0).
"""

from __future__ import annotations

import math

from briefer._dataclass import dataclass

import numpy as np

from briefer import units
from briefer.core import angles
from briefer.core._types import Numeric
from briefer.core.ranges import SCALAR_TYPES as _S
from briefer.core.ranges import checked as _checked  # the one range check of the core
from briefer.core.ranges import checked_float as _checked_f
from briefer.errors import DomainError

__all__ = [
    "BANK_MAX_DEG",
    "SPEED_MAX_KT",
    "STANDARD_RATE_DEG_PER_S",
    "TurnPerformance",
    "turn_radius_m",
    "turn_radius_ft",
    "turn_radius_nm",
    "turn_rate_deg_per_s",
    "time_to_turn_s",
    "load_factor",
    "stall_speed_factor",
    "stall_speed_in_turn_kt",
    "stall_bank_deg",
    "bank_for_rate_deg",
    "bank_for_radius_deg",
    "bank_for_load_factor_deg",
    "lift_coefficient_fraction_of_max",
    "angle_of_attack_in_turn",
    "aoa_margin_to_stall",
    "turn_performance",
]

BANK_MAX_DEG = 90.0
SPEED_MAX_KT = 1000.0
WEIGHT_RATIO_MAX = 10.0
TURN_ANGLE_MAX_DEG = 3600.0
STANDARD_RATE_DEG_PER_S = 3.0


def _bank(bank_deg: Numeric, *, turning: bool) -> np.ndarray:
    """Checked bank: 0 <= bank < 90, or 0 < bank < 90 when a turn is needed."""
    return _checked("bank_deg", bank_deg, 0.0, BANK_MAX_DEG, "deg", lo_open=turning, hi_open=True)


def _speed(name: str, speed_kt: Numeric) -> np.ndarray:
    return _checked(name, speed_kt, 0.0, SPEED_MAX_KT, "kt", lo_open=True)


def _tas_mps(tas_kt: Numeric) -> np.ndarray:
    """Checked TAS (0 < TAS <= 1000 kt) in m/s."""
    return _speed("tas_kt", tas_kt) * units.KT_TO_MPS


def _weight_ratio(weight_ratio: Numeric) -> np.ndarray:
    return _checked("weight_ratio", weight_ratio, 0.0, WEIGHT_RATIO_MAX, "", lo_open=True)


# The scalar paths: one number in, a Python float out, the same operations in the same order as
# the array path (numpy and `math` round + - * / sqrt sin cos tan atan acos alike; a numpy
# float64 ** 2 is `pow`, as a float's), so a brief's single figures skip numpy's per-call cost.
def _bank_f(bank_deg: float, *, turning: bool) -> float:
    return _checked_f("bank_deg", bank_deg, 0.0, BANK_MAX_DEG, "deg", lo_open=turning, hi_open=True)


def _speed_f(name: str, speed_kt: float) -> float:
    return _checked_f(name, speed_kt, 0.0, SPEED_MAX_KT, "kt", lo_open=True)


def _weight_ratio_f(weight_ratio: float) -> float:
    return _checked_f("weight_ratio", weight_ratio, 0.0, WEIGHT_RATIO_MAX, "", lo_open=True)


def turn_radius_m(tas_kt: Numeric, bank_deg: Numeric) -> Numeric:
    """Radius of a coordinated level turn.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 < bank < 90. [deg]

    Returns
    -------
    numeric
        r = V^2 / (g tan(bank)). [m]

    Raises
    ------
    DomainError
        If the speed or bank is outside its range (a wings-level aircraft does not turn).

    Notes
    -----
    Level, coordinated, constant-speed turn in still air [3]_. In knots and feet this is
    R = V^2/(11.294 tan(bank)) (handbooks round the constant to 11.26 or 11.23).

    References
    ----------
    .. [2] ICAO Doc 8168, Vol II, Part I, Section 2, Chapter 3 (r = V/(20 pi R)).
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    if type(tas_kt) in _S and type(bank_deg) in _S:
        v = _speed_f("tas_kt", tas_kt) * units.KT_TO_MPS
        return v ** 2 / (units.G0_MPS2 * math.tan(math.radians(_bank_f(bank_deg, turning=True))))
    v_mps = _tas_mps(tas_kt)
    bank = _bank(bank_deg, turning=True)
    return angles.as_float(v_mps ** 2 / (units.G0_MPS2 * angles.tand(bank)))   # [3] eq. r = V^2/(g tan phi)


def turn_radius_ft(tas_kt: Numeric, bank_deg: Numeric) -> Numeric:
    """Radius of a coordinated level turn. [ft] See :func:`turn_radius_m`."""
    r = turn_radius_m(tas_kt, bank_deg)
    return r * units.M_TO_FT if type(r) is float else angles.as_float(np.asarray(r) * units.M_TO_FT)


def turn_radius_nm(tas_kt: Numeric, bank_deg: Numeric) -> Numeric:
    """Radius of a coordinated level turn. [NM] See :func:`turn_radius_m`."""
    r = turn_radius_m(tas_kt, bank_deg)
    return r * units.M_TO_NM if type(r) is float else angles.as_float(np.asarray(r) * units.M_TO_NM)


def turn_rate_deg_per_s(tas_kt: Numeric, bank_deg: Numeric) -> Numeric:
    """Rate of a coordinated level turn.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 <= bank < 90 (0 gives 0). [deg]

    Returns
    -------
    numeric
        omega = g tan(bank) / V. [deg/s]

    Raises
    ------
    DomainError
        If the speed or bank is outside its range.

    Notes
    -----
    In knots: omega = 1092.2 tan(bank)/V deg/s; ICAO writes 3431 tan(bank)/(pi V) = 1092.1
    tan(bank)/V [2]_.

    References
    ----------
    .. [2] ICAO Doc 8168, Vol II, Part I, Section 2, Chapter 3.
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    if type(tas_kt) in _S and type(bank_deg) in _S:
        v = _speed_f("tas_kt", tas_kt) * units.KT_TO_MPS
        return math.degrees(units.G0_MPS2 * math.tan(math.radians(_bank_f(bank_deg, turning=False))) / v)
    v_mps = _tas_mps(tas_kt)
    bank = _bank(bank_deg, turning=False)
    return angles.as_float(np.degrees(units.G0_MPS2 * angles.tand(bank) / v_mps))  # [3] eq. omega = g tan phi / V


def time_to_turn_s(tas_kt: Numeric, bank_deg: Numeric, *, angle_deg: Numeric) -> Numeric:
    """Time to turn through an angle at constant bank and TAS.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 < bank < 90. [deg]
    angle_deg : numeric
        Heading change, 0 to 3600. [deg]

    Returns
    -------
    numeric
        t = angle / omega. [s]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    _bank(bank_deg, turning=True)
    angle = _checked("angle_deg", angle_deg, 0.0, TURN_ANGLE_MAX_DEG, "deg")
    rate = np.asarray(turn_rate_deg_per_s(tas_kt, bank_deg))
    return angles.as_float(angle / rate)


def load_factor(bank_deg: Numeric) -> Numeric:
    """Load factor of a coordinated level turn.

    Parameters
    ----------
    bank_deg : numeric
        Bank angle, 0 <= bank < 90. [deg]

    Returns
    -------
    numeric
        n = 1 / cos(bank). [-]

    Raises
    ------
    DomainError
        If the bank is outside its range.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight", load factor chart.
    """
    if type(bank_deg) in _S:
        return 1.0 / math.cos(math.radians(_bank_f(bank_deg, turning=False)))
    bank = _bank(bank_deg, turning=False)
    return angles.as_float(1.0 / angles.cosd(bank))                   # [1] eq. n = 1/cos(phi)


def stall_speed_factor(bank_deg: Numeric) -> Numeric:
    """Factor by which the stall speed rises in a coordinated level turn.

    Parameters
    ----------
    bank_deg : numeric
        Bank angle, 0 <= bank < 90. [deg]

    Returns
    -------
    numeric
        sqrt(n) = 1/sqrt(cos(bank)); 1.414 at 60 deg. [-]

    Raises
    ------
    DomainError
        If the bank is outside its range.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight" (stall speed increases in
       proportion to the square root of the load factor).
    """
    n = load_factor(bank_deg)
    return math.sqrt(n) if type(n) is float else angles.as_float(np.sqrt(np.asarray(n)))  # [1] eq. Vs_n = Vs sqrt(n)


def stall_speed_in_turn_kt(vs1g_kt: Numeric, bank_deg: Numeric, *, weight_ratio: Numeric = 1.0) -> Numeric:
    """Stall speed in a coordinated level turn at a weight.

    Parameters
    ----------
    vs1g_kt : numeric
        1-g stall speed at the reference weight (same speed kind as the answer, normally IAS),
        0 < VS1G <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 <= bank < 90. [deg]
    weight_ratio : numeric, optional
        W / W_ref, the weight relative to the weight of `vs1g_kt`, 0 < w <= 10. [-]

    Returns
    -------
    numeric
        VS = VS1G sqrt(n) sqrt(W/W_ref). [kt]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight".
    """
    if type(vs1g_kt) in _S and type(weight_ratio) in _S and type(bank_deg) in _S:
        vs_f = _speed_f("vs1g_kt", vs1g_kt)
        w_f = _weight_ratio_f(weight_ratio)
        return vs_f * stall_speed_factor(bank_deg) * math.sqrt(w_f)
    vs = _speed("vs1g_kt", vs1g_kt)
    w = _weight_ratio(weight_ratio)
    return angles.as_float(vs * np.asarray(stall_speed_factor(bank_deg)) * np.sqrt(w))  # [1] eq. Vs sqrt(n), lift = W n


def stall_bank_deg(speed_kt: Numeric, vs1g_kt: Numeric, *, weight_ratio: Numeric = 1.0) -> Numeric:
    """Bank angle at which the wing stalls in a level turn at a given speed.

    Parameters
    ----------
    speed_kt : numeric
        Speed flown, same kind as `vs1g_kt` (normally IAS), 0 < V <= 1000. [kt]
    vs1g_kt : numeric
        1-g stall speed at the reference weight, 0 < VS1G <= 1000. [kt]
    weight_ratio : numeric, optional
        W / W_ref, 0 < w <= 10. [-]

    Returns
    -------
    numeric
        phi = acos(w VS1G^2 / V^2); 0 when the speed equals the 1-g stall speed. [deg]

    Raises
    ------
    DomainError
        If an input is outside its range, or the speed is below the 1-g stall speed at that
        weight (the wing is already stalled wings-level: there is no such bank).

    Notes
    -----
    The level turn stalls when n = (V / (VS1G sqrt(w)))^2, and n = 1/cos(phi) [1]_.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight".
    """
    if type(speed_kt) in _S and type(vs1g_kt) in _S and type(weight_ratio) in _S:
        return _stall_bank_deg_f(speed_kt, vs1g_kt, weight_ratio)
    v = _speed("speed_kt", speed_kt)
    vs = _speed("vs1g_kt", vs1g_kt)
    w = _weight_ratio(weight_ratio)
    vs_w = vs * np.sqrt(w)
    # a relative slack of 1e-12 so that V equal to VS1G sqrt(w) up to rounding gives 0 deg
    below = v < vs_w * (1.0 - 1e-12)
    if below.any():
        bad = np.broadcast_arrays(v, vs_w)
        idx = int(np.argmax(np.ravel(np.broadcast_to(below, bad[0].shape))))
        v_bad = float(np.ravel(bad[0])[idx])
        vs_bad = float(np.ravel(bad[1])[idx])
        raise DomainError(f"speed_kt = {v_bad:g} kt is below the 1-g stall speed {vs_bad:g} kt "
                          "at this weight: the wing is stalled wings-level, no bank is possible")
    cos_phi = (vs_w / v) ** 2                                         # [1] eq. n_stall = (V/Vs)^2
    return angles.as_float(np.degrees(np.arccos(np.minimum(cos_phi, 1.0))))


def _stall_bank_deg_f(speed_kt: float, vs1g_kt: float, weight_ratio: float) -> float:
    """`stall_bank_deg` of one number each (the same checks, operations and error)."""
    v = _speed_f("speed_kt", speed_kt)
    vs_w = _speed_f("vs1g_kt", vs1g_kt) * math.sqrt(_weight_ratio_f(weight_ratio))
    if v < vs_w * (1.0 - 1e-12):
        raise DomainError(f"speed_kt = {v:g} kt is below the 1-g stall speed {vs_w:g} kt "
                          "at this weight: the wing is stalled wings-level, no bank is possible")
    return math.degrees(math.acos(min((vs_w / v) ** 2, 1.0)))


def bank_for_rate_deg(tas_kt: Numeric, *, rate_deg_per_s: Numeric = STANDARD_RATE_DEG_PER_S) -> Numeric:
    """Bank angle for a rate of turn (standard rate, 3 deg/s, by default).

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    rate_deg_per_s : numeric, optional
        Rate of turn, 0 <= rate <= 30. [deg/s]

    Returns
    -------
    numeric
        phi = atan(omega V / g); 15.4 deg at 100 kt for standard rate. [deg]

    Raises
    ------
    DomainError
        If an input is outside its range.

    Notes
    -----
    The pilots' rule "15 % of TAS" (or TAS/10 + half of that) approximates the standard-rate bank
    within about one degree between 80 and 200 kt.

    References
    ----------
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    v_mps = _tas_mps(tas_kt)
    rate = _checked("rate_deg_per_s", rate_deg_per_s, 0.0, 30.0, "deg/s")
    return angles.as_float(angles.atand(np.radians(rate) * v_mps / units.G0_MPS2))  # [3] eq. tan phi = omega V/g


def bank_for_radius_deg(tas_kt: Numeric, *, radius_m: Numeric) -> Numeric:
    """Bank angle for a turn radius.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    radius_m : numeric
        Turn radius, above 0 and finite. [m]

    Returns
    -------
    numeric
        phi = atan(V^2 / (g r)). [deg]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    if type(tas_kt) in _S and type(radius_m) in _S:
        v = _speed_f("tas_kt", tas_kt) * units.KT_TO_MPS
        r_f = _checked_f("radius_m", radius_m, 0.0, math.inf, "m", lo_open=True)
        return math.degrees(math.atan(v ** 2 / (units.G0_MPS2 * r_f)))
    v_mps = _tas_mps(tas_kt)
    r = _checked("radius_m", radius_m, 0.0, np.inf, "m", lo_open=True)
    return angles.as_float(angles.atand(v_mps ** 2 / (units.G0_MPS2 * r)))  # [3] eq. tan phi = V^2/(g r)


def bank_for_load_factor_deg(load_factor: Numeric) -> Numeric:
    """Bank angle of a level turn at a load factor: phi = acos(1/n). [deg]

    Raises `DomainError` unless 1 <= n <= 100.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight".
    """
    n = _checked("load_factor", load_factor, 1.0, 100.0, "")
    return angles.as_float(np.degrees(np.arccos(1.0 / n)))            # [1] eq. n = 1/cos(phi)


def lift_coefficient_fraction_of_max(ias_kt: Numeric, bank_deg: Numeric, *, vs1g_kt: Numeric,
                                     weight_ratio: Numeric = 1.0) -> Numeric:
    """Fraction of the maximum lift coefficient used in a level turn.

    Parameters
    ----------
    ias_kt : numeric
        Indicated (taken as equivalent) airspeed, 0 < V <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 <= bank < 90. [deg]
    vs1g_kt : numeric
        1-g stall speed at the reference weight, 0 < VS1G <= 1000. [kt]
    weight_ratio : numeric, optional
        W / W_ref, 0 < w <= 10. [-]

    Returns
    -------
    numeric
        CL/CL_max = n w (VS1G/V)^2; 1 at the stall, above 1 means the lift cannot be made. [-]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [3] Flight-mechanics textbooks, lift L = q S C_L = n W (from memory).
    """
    v = _speed("ias_kt", ias_kt)
    vs = _speed("vs1g_kt", vs1g_kt)
    w = _weight_ratio(weight_ratio)
    n = np.asarray(load_factor(bank_deg))
    return angles.as_float(n * w * (vs / v) ** 2)                      # [3] eq. C_L ~ n W / V^2


def _alpha_zero_lift(*, vref_kt: np.ndarray, vs1g_kt: np.ndarray, aoa_ref: np.ndarray,
                     aoa_stall: np.ndarray) -> np.ndarray:
    r = (vs1g_kt / vref_kt) ** 2                                      # CL_ref / CL_max
    return (aoa_ref - r * aoa_stall) / (1.0 - r)


def angle_of_attack_in_turn(ias_kt: Numeric, bank_deg: Numeric, *, vref_kt: Numeric, vs1g_kt: Numeric,
                            aoa_ref: Numeric, aoa_stall: Numeric, weight_ratio: Numeric = 1.0) -> Numeric:
    """Angle of attack needed in a level turn, from a linear lift model on two anchors.

    Parameters
    ----------
    ias_kt : numeric
        Indicated airspeed flown (taken as equivalent airspeed), 0 < V <= 1000. [kt]
    bank_deg : numeric
        Bank angle, 0 <= bank < 90. [deg]
    vref_kt : numeric
        Reference speed of the anchor `aoa_ref` (1 g, reference weight), above `vs1g_kt`. [kt]
    vs1g_kt : numeric
        1-g stall speed at the reference weight, 0 < VS1G <= 1000. [kt]
    aoa_ref : numeric
        Angle of attack at VREF, 1 g, reference weight. [profile unit: deg or indexer units]
    aoa_stall : numeric
        Angle of attack at the stall (VS1G, 1 g), greater than `aoa_ref`. [same unit]
    weight_ratio : numeric, optional
        W / W_ref, the weight relative to the anchors' weight, 0 < w <= 10. [-]

    Returns
    -------
    numeric
        The angle of attack the turn requires, in the unit of the anchors. Above `aoa_stall` the
        wing cannot make the lift (the value is the linear model's extrapolation and means
        "stalled"); use :func:`aoa_margin_to_stall` for the margin.

    Raises
    ------
    DomainError
        If an input is outside its range, VREF <= VS1G, or aoa_stall <= aoa_ref.

    Notes
    -----
    C_L = a (alpha - alpha_0) [3]_. Anchors: alpha_ref at VREF and alpha_stall at VS1G, both 1 g,
    so C_L,ref / C_L,max = (VS1G/VREF)^2 and alpha_0 = (alpha_ref - r alpha_stall)/(1 - r) with
    r = (VS1G/VREF)^2. In a level turn at V, load factor n and weight ratio w,
    C_L / C_L,ref = n w (VREF/V)^2, hence alpha = alpha_0 + n w (VREF/V)^2 (alpha_ref - alpha_0).
    Any unit linear in alpha works (degrees, or an indexer scale), the result is in that unit.
    The linear model is good below the stall break; near C_L,max real wings bend over.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight" (load factor).
    .. [3] Flight-mechanics textbooks, the linear lift curve (from memory).
    """
    if (type(ias_kt) in _S and type(bank_deg) in _S and type(vref_kt) in _S and type(vs1g_kt) in _S
            and type(aoa_ref) in _S and type(aoa_stall) in _S and type(weight_ratio) in _S):
        return _angle_of_attack_f(ias_kt, bank_deg, vref_kt, vs1g_kt, aoa_ref, aoa_stall, weight_ratio)
    v, vref, vs, w, a_ref, a_stall = _aoa_inputs(_speed, _weight_ratio, _checked, ias_kt, vref_kt, vs1g_kt,
                                                 weight_ratio, aoa_ref, aoa_stall)
    _check_aoa_model(bool((vref <= vs).any()), bool((a_stall <= a_ref).any()))
    n = np.asarray(load_factor(bank_deg))
    a0 = _alpha_zero_lift(vref_kt=vref, vs1g_kt=vs, aoa_ref=a_ref, aoa_stall=a_stall)
    return angles.as_float(a0 + n * w * (vref / v) ** 2 * (a_ref - a0))   # [3] eq. C_L = a (alpha - alpha_0)


def _angle_of_attack_f(ias_kt: float, bank_deg: float, vref_kt: float, vs1g_kt: float, aoa_ref: float,
                       aoa_stall: float, weight_ratio: float) -> float:
    """`angle_of_attack_in_turn` of one number each (the same checks, operations and errors)."""
    v, vref, vs, w, a_ref, a_stall = _aoa_inputs(_speed_f, _weight_ratio_f, _checked_f, ias_kt, vref_kt, vs1g_kt,
                                                 weight_ratio, aoa_ref, aoa_stall)
    _check_aoa_model(vref <= vs, a_stall <= a_ref)
    n = load_factor(bank_deg)
    r = (vs / vref) ** 2                                              # CL_ref / CL_max
    a0 = (a_ref - r * a_stall) / (1.0 - r)
    return a0 + n * w * (vref / v) ** 2 * (a_ref - a0)


def _aoa_inputs(speed, weight_ratio_of, checked, ias_kt, vref_kt, vs1g_kt, weight_ratio, aoa_ref, aoa_stall):
    """The angle-of-attack model's inputs checked by the array or the one-number checks given:
    (ias, vref, vs1g, weight ratio, aoa_ref, aoa_stall)."""
    return (speed("ias_kt", ias_kt), speed("vref_kt", vref_kt), speed("vs1g_kt", vs1g_kt),
            weight_ratio_of(weight_ratio), checked("aoa_ref", aoa_ref, -1e6, 1e6, ""),
            checked("aoa_stall", aoa_stall, -1e6, 1e6, ""))


def _check_aoa_model(vref_not_above_vs: bool, stall_not_above_ref: bool) -> None:
    """The angle-of-attack model needs VREF above VS1G and the stall angle above the reference angle."""
    if vref_not_above_vs:
        raise DomainError("vref_kt must be greater than vs1g_kt for the angle-of-attack model")
    if stall_not_above_ref:
        raise DomainError("aoa_stall must be greater than aoa_ref for the angle-of-attack model")


def aoa_margin_to_stall(ias_kt: Numeric, bank_deg: Numeric, *, vref_kt: Numeric, vs1g_kt: Numeric,
                        aoa_ref: Numeric, aoa_stall: Numeric, weight_ratio: Numeric = 1.0) -> Numeric:
    """Angle-of-attack margin to the stall in a level turn: aoa_stall - alpha.

    Same parameters and model as :func:`angle_of_attack_in_turn`; the result is in the anchors'
    unit and negative when the turn cannot be flown without stalling.
    """
    alpha = np.asarray(angle_of_attack_in_turn(ias_kt, bank_deg, vref_kt=vref_kt, vs1g_kt=vs1g_kt,
                                               aoa_ref=aoa_ref, aoa_stall=aoa_stall,
                                               weight_ratio=weight_ratio))
    return angles.as_float(np.asarray(aoa_stall, dtype=float) - alpha)


def _isclose(a: float, b: float) -> bool:
    """numpy.isclose(a, b, rtol=1e-9) of two numbers: |a - b| <= 1e-8 + 1e-9 |b| (equal infinities too)."""
    return a == b or abs(a - b) <= 1e-8 + 1e-9 * abs(b)


@dataclass(frozen=True, slots=True, kw_only=True)
class TurnPerformance:
    """A coordinated level turn at one TAS and bank (see :func:`turn_performance`).

    Attributes
    ----------
    tas_kt, bank_deg : float
        Inputs. [kt], [deg]
    radius_m, radius_ft, radius_nm : float
        Turn radius. [m], [ft], [NM]
    turn_rate_deg_per_s : float
        Rate of turn. [deg/s]
    time_180_s, time_360_s : float
        Time to turn through 180 and 360 deg. [s]
    load_factor : float
        n = 1/cos(bank). [-]
    stall_speed_factor : float
        sqrt(n). [-]
    """

    tas_kt: float
    bank_deg: float
    radius_m: float
    radius_ft: float
    radius_nm: float
    turn_rate_deg_per_s: float
    time_180_s: float
    time_360_s: float
    load_factor: float
    stall_speed_factor: float

    def __post_init__(self) -> None:
        if not 0.0 < self.bank_deg < BANK_MAX_DEG:
            raise DomainError(f"bank_deg = {self.bank_deg:g} deg: a turn needs 0 < bank_deg < 90")
        if not (self.tas_kt > 0 and self.radius_m > 0 and self.turn_rate_deg_per_s > 0):
            raise DomainError("tas_kt, radius_m and turn_rate_deg_per_s must be positive")
        if not self.load_factor >= 1.0:
            raise DomainError(f"load_factor = {self.load_factor:g} must be at least 1 in a level turn")
        if not _isclose(self.stall_speed_factor ** 2, self.load_factor):
            raise DomainError("stall_speed_factor must equal sqrt(load_factor)")
        if not _isclose(self.radius_ft * units.FT_TO_M, self.radius_m):
            raise DomainError("radius_ft and radius_m disagree")
        if not _isclose(self.time_360_s, 2.0 * self.time_180_s):
            raise DomainError("time_360_s must be twice time_180_s")


def turn_performance(tas_kt: float, bank_deg: float) -> TurnPerformance:
    """Radius, rate, times, load factor and stall-speed factor of one level turn.

    Parameters
    ----------
    tas_kt : float
        True airspeed, 0 < TAS <= 1000. [kt]
    bank_deg : float
        Bank angle, 0 < bank < 90. [deg]

    Returns
    -------
    TurnPerformance

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Aerodynamics of Flight".
    .. [3] Flight-mechanics textbooks, the level turn (from memory).
    """
    radius_m = float(turn_radius_m(tas_kt, bank_deg))
    rate = float(turn_rate_deg_per_s(tas_kt, bank_deg))
    n = float(load_factor(bank_deg))
    return TurnPerformance(
        tas_kt=float(tas_kt),
        bank_deg=float(bank_deg),
        radius_m=radius_m,
        radius_ft=radius_m * units.M_TO_FT,
        radius_nm=radius_m * units.M_TO_NM,
        turn_rate_deg_per_s=rate,
        time_180_s=180.0 / rate,
        time_360_s=360.0 / rate,
        load_factor=n,
        stall_speed_factor=float(stall_speed_factor(bank_deg)),
    )
