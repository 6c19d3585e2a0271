"""Legs flown at constant TAS in a constant wind, in the runway frame, in closed form.

Runway frame (used by every module of :mod:`briefer.core.manoeuvre`)
--------------------------------------------------
* ``x`` : metres along the landing direction from the landing threshold (positive = past the
  threshold, down the runway; the final approach is at negative ``x``).
* ``y`` : metres to the RIGHT of the extended centreline, looking in the landing direction.
* Headings and tracks: degrees, 0 = the landing direction, positive clockwise (toward +y);
  180 = the reciprocal (downwind) direction.
* Wind: the velocity of the air mass in this frame (:class:`RunwayWind`), i.e. the direction the
  wind blows TOWARD. :func:`runway_wind_from` converts a reported from-direction.

A constant-bank level turn in a constant wind is a trochoid: the air-mass path is a circle arc
(radius r = V^2 / (g tan(bank)), rate w = g tan(bank) / V) and the wind adds ``w_vec * t``. So
position, heading and time at any instant are closed-form; no stepping loop is needed. Optional
roll-in/roll-out: see :class:`Turn`.

References
----------
.. [1] ICAO Doc 8168 (PANS-OPS) Vol II, Part I, Section 2, Chapter 3, 3.1.2.2 (rate and radius
   of turn, wind effect E_theta for the time taken to turn), 5th ed., 2006.
.. [2] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7, 7.2.2 (circling: the wind is applied
   throughout the turn), 5th ed., 2006.
"""

from __future__ import annotations

import math

from briefer._dataclass import dataclass, field
from typing import Literal, Union

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core._types import Numeric
from briefer.core.ranges import checked
from briefer.core.wind import wind_triangle
from briefer.errors import DomainError
from briefer.units import G0_MPS2, KT_TO_MPS, MPS_TO_KT
from briefer.core.angles import cosd, sind, wrap_360

FloatArray = npt.NDArray[np.float64] if TYPE_CHECKING else np.ndarray
Direction = Literal["left", "right"]

BANK_MAX_DEG = 90.0
_TINY = 1e-12
# Gauss-Legendre nodes on [-1, 1] for the roll-in/roll-out integrals (8 nodes integrate the
# smooth ramp integrands to ~1e-12 relative; checked against RK4 in tests/test_maneuver.py).
# The values of numpy.polynomial.legendre.leggauss(8), written out so that start-up does not
# import numpy.polynomial (tests/test_maneuver.py checks them against it, to the last digit).
GL_NODES = np.array([-0.9602898564975362, -0.7966664774136267, -0.525532409916329, -0.18343464249564978,
                     0.18343464249564978, 0.525532409916329, 0.7966664774136267, 0.9602898564975362])
GL_WEIGHTS = np.array([0.10122853629037706, 0.22238103445337443, 0.3137066458778869, 0.36268378337836166,
                       0.36268378337836166, 0.3137066458778869, 0.22238103445337443, 0.10122853629037706])
_GL_U = 0.5 * (GL_NODES + 1.0)          # the nodes mapped to [0, 1]
from briefer.core.ufuncs import clip as _uclip


# --------------------------------------------------------------------------------------------
# wind and state
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class RunwayWind:
    """Wind as a velocity in the runway frame (the direction it blows TOWARD).

    Attributes
    ----------
    toward_x_kt : float
        Component blowing along the landing direction (positive = tailwind on final). [kt]
    toward_y_kt : float
        Component blowing toward the right of the centreline (positive = wind from the left). [kt]
    """

    toward_x_kt: float
    toward_y_kt: float

    def __post_init__(self) -> None:
        if not (math.isfinite(self.toward_x_kt) and math.isfinite(self.toward_y_kt)):
            raise DomainError(f"wind components must be finite; got ({self.toward_x_kt}, {self.toward_y_kt}) kt")

    @property
    def speed_kt(self) -> float:
        """Wind speed. [kt]"""
        return float(np.hypot(self.toward_x_kt, self.toward_y_kt))

    @property
    def headwind_kt(self) -> float:
        """Headwind on final (negative = tailwind). [kt]"""
        return -float(self.toward_x_kt)

    @property
    def crosswind_from_right_kt(self) -> float:
        """Crosswind on final from the right (negative = from the left). [kt]"""
        return -float(self.toward_y_kt)

    def mps(self) -> tuple[float, float]:
        """The two components in m/s, (toward x, toward y). [m/s]"""
        return self.toward_x_kt * KT_TO_MPS, self.toward_y_kt * KT_TO_MPS


CALM = RunwayWind(toward_x_kt=0.0, toward_y_kt=0.0)


def runway_wind_from(wind_from_relative_deg: float, speed_kt: float) -> RunwayWind:
    """Runway-frame wind vector from a from-direction relative to the landing course.

    Parameters
    ----------
    wind_from_relative_deg : float
        Direction the wind blows FROM minus the runway (landing) course, clockwise: 0 = a
        headwind on final, 90 = from the right, 180 = a tailwind. Both directions must have the
        same reference (true or magnetic). [deg]
    speed_kt : float
        Wind speed, >= 0. [kt]

    Returns
    -------
    RunwayWind
        ``toward = -speed * (cos(rel), sin(rel))``.

    Raises
    ------
    DomainError
        If the speed is negative or not finite.
    """
    if not (math.isfinite(speed_kt) and speed_kt >= 0.0):
        raise DomainError(f"wind speed_kt must be >= 0; got {speed_kt}")
    return RunwayWind(toward_x_kt=float(-speed_kt * cosd(wind_from_relative_deg)),
                      toward_y_kt=float(-speed_kt * sind(wind_from_relative_deg)))


@dataclass(frozen=True, slots=True, kw_only=True)
class State:
    """Aircraft state in the runway frame.

    Attributes
    ----------
    x_m, y_m : float
        Position: along the landing direction from the threshold, and right of the centreline. [m]
    heading_deg : float
        Heading, 0 = landing direction, clockwise positive (any real value; not wrapped). [deg]
    time_s : float
        Time since the start of the plan. [s]
    """

    x_m: float
    y_m: float
    heading_deg: float
    time_s: float = 0.0

    def __post_init__(self) -> None:
        if not all(math.isfinite(v) for v in (self.x_m, self.y_m, self.heading_deg, self.time_s)):
            raise DomainError("State values must be finite")


# --------------------------------------------------------------------------------------------
# legs
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class Straight:
    """Wings level on a constant HEADING for a time (the wind drifts the track).

    Attributes
    ----------
    time_s : float
        Duration, >= 0. [s]
    heading_deg : float
        Heading held. [deg]
    name : str
        Label of the leg (e.g. "break leg").
    """

    time_s: float
    heading_deg: float
    name: str = "straight"

    def __post_init__(self) -> None:
        _check_time(self.time_s)


@dataclass(frozen=True, slots=True, kw_only=True)
class StraightTrack:
    """Wings level on a constant TRACK for a time, crabbed into the wind (e.g. a downwind leg).

    Attributes
    ----------
    time_s : float
        Duration, >= 0. [s]
    track_deg : float
        Ground track held; the heading is computed from the wind (see :func:`crab_heading_deg`). [deg]
    name : str
        Label of the leg.
    """

    time_s: float
    track_deg: float
    name: str = "straight track"

    def __post_init__(self) -> None:
        _check_time(self.time_s)


@dataclass(frozen=True, slots=True, kw_only=True)
class Turn:
    """A level turn through an angle at a target bank, optionally with roll-in and roll-out.

    Attributes
    ----------
    angle_deg : float
        Heading change, 0 <= angle < 720. [deg]
    bank_deg : float
        Target bank, 0 < bank < 90. [deg]
    direction : {"left", "right"}
        Right = clockwise (heading increases).
    roll_rate_deg_per_s : float or None
        None: the bank is established instantly (the textbook trochoid). Otherwise the bank
        ramps linearly at this rate, 0 < rate, from wings level to the target and back, and the
        heading still changes by exactly ``angle_deg`` (wings level at the end). [deg/s]
    name : str
        Label of the leg.

    Notes
    -----
    With a linear bank ramp phi(t) = k t, the heading change is closed form,
    h(t) = g/(V k) * (-ln cos(k t)); the position needs the integral of cos/sin of that, which
    is taken with 8 fixed Gauss-Legendre points. The roll-out is the mirror of the roll-in. A
    turn too small to reach the target bank ramps to the peak phi_p with
    -ln cos(phi_p) = A V k / (2 g) and straight back.
    """

    angle_deg: float
    bank_deg: float
    direction: Direction
    roll_rate_deg_per_s: float | None = None
    name: str = "turn"

    def __post_init__(self) -> None:
        if not (math.isfinite(self.angle_deg) and 0.0 <= self.angle_deg < 720.0):
            raise DomainError(f"turn angle_deg = {self.angle_deg}: valid range is 0 <= angle < 720")
        _check_bank(self.bank_deg)
        if self.direction not in ("left", "right"):
            raise DomainError(f"turn direction = {self.direction!r}: expected 'left' or 'right'")
        _check_roll_rate(self.roll_rate_deg_per_s)

    @property
    def sign(self) -> int:
        """+1 for a right (clockwise) turn, -1 for a left turn."""
        return 1 if self.direction == "right" else -1


Leg = Union[Straight, StraightTrack, Turn]


@dataclass(frozen=True, slots=True, kw_only=True)
class TrackSamples:
    """Points along one or several legs.

    Attributes
    ----------
    time_s, x_m, y_m, heading_deg : ndarray, shape (N,)
        Time, position (runway frame) and heading of each point. [s], [m], [m], [deg]
    leg_index : ndarray of int, shape (N,)
        Index of the leg each point belongs to (joins belong to both legs; each leg is sampled
        including both its ends).
    """

    time_s: FloatArray = field(compare=False)
    x_m: FloatArray = field(compare=False)
    y_m: FloatArray = field(compare=False)
    heading_deg: FloatArray = field(compare=False)
    leg_index: npt.NDArray[np.int_] = field(compare=False)

    def __post_init__(self) -> None:
        n = len(self.time_s)
        if not all(len(a) == n for a in (self.x_m, self.y_m, self.heading_deg, self.leg_index)):
            raise DomainError("TrackSamples arrays must all have the same length")

    @property
    def xy_m(self) -> FloatArray:
        """Positions as an (N, 2) array. [m]"""
        return np.stack([self.x_m, self.y_m], axis=-1)


# --------------------------------------------------------------------------------------------
# checks
# --------------------------------------------------------------------------------------------
def _check_time(time_s: float) -> None:
    if not (math.isfinite(time_s) and time_s >= 0.0):
        raise DomainError(f"leg time_s = {time_s}: must be >= 0")


def _check_bank(bank_deg: Numeric) -> None:
    if isinstance(bank_deg, (float, int)):
        if not 0.0 < bank_deg < BANK_MAX_DEG:
            raise DomainError(f"bank_deg = {bank_deg}: a turn needs 0 < bank < 90")
        return
    b = np.asarray(bank_deg, dtype=float)
    if not np.all((b > 0.0) & (b < BANK_MAX_DEG)):
        raise DomainError(f"bank_deg = {bank_deg}: a turn needs 0 < bank < 90")


def _check_roll_rate(roll_rate_deg_per_s: float | None) -> None:
    if roll_rate_deg_per_s is not None and not (math.isfinite(roll_rate_deg_per_s) and roll_rate_deg_per_s > 0.0):
        raise DomainError(f"roll_rate_deg_per_s = {roll_rate_deg_per_s}: must be > 0 (or None)")


def _check_tas(tas_kt: float) -> None:
    checked("tas_kt", tas_kt, 0.0, 1000.0, "kt", lo_open=True)


# --------------------------------------------------------------------------------------------
# array kernels (radians, m/s; broadcast over any shapes); shared with the solver and envelope
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class TurnProfile:
    """Timing of a turn (array kernel output; radians, seconds, m/s).

    ``tr`` roll-in (= roll-out) time, ``tc`` constant-bank time, ``dp`` heading change during
    one ramp, ``wp`` rate at the peak bank, ``c = g/(V k)``, ``k`` roll rate (rad/s, 0 = instant),
    ``total`` = 2 tr + tc, ``angle`` the heading change, ``tas`` V.
    """

    angle: FloatArray
    tas: FloatArray
    tr: FloatArray
    tc: FloatArray
    dp: FloatArray
    wp: FloatArray
    c: FloatArray
    k: float
    total: FloatArray


def turn_profile(angle_rad: Numeric, bank_rad: Numeric, tas_mps: Numeric, roll_rate_rad_per_s: float | None
                 ) -> TurnProfile:
    """Phases of a turn through ``angle_rad`` at ``bank_rad`` (array kernel, see :class:`Turn`).

    Notes
    -----
    Rate of turn w = g tan(bank) / V [1]_; with a linear bank ramp at k rad/s the ramp turns the
    heading by c (-ln cos(bank)) with c = g / (V k).
    """
    a = np.asarray(angle_rad, dtype=float)
    v = np.asarray(tas_mps, dtype=float)
    bank = np.asarray(bank_rad, dtype=float)
    w = G0_MPS2 * np.tan(bank) / v                     # [1] 3.1.2.2: rate of turn = g tan(bank)/V
    zero = np.zeros(np.broadcast(a, v, bank).shape)
    if roll_rate_rad_per_s is None:
        return TurnProfile(angle=a + zero, tas=v + zero, tr=zero, tc=a / w + zero, dp=zero, wp=w + zero,
                           c=zero, k=0.0, total=a / w + zero)
    k = float(roll_rate_rad_per_s)
    c = G0_MPS2 / (v * k) + zero
    d_full = c * -np.log(np.cos(bank))
    full = a >= 2.0 * d_full
    phi_p = np.where(full, bank, np.arccos(np.exp(-a / (2.0 * c))))
    dp = np.where(full, d_full, 0.5 * a)
    wp = G0_MPS2 * np.tan(phi_p) / v
    tc = np.where(full, (a - 2.0 * dp) / np.maximum(wp, _TINY), 0.0)
    tr = phi_p / k
    return TurnProfile(angle=a + zero, tas=v + zero, tr=tr, tc=tc, dp=dp, wp=wp, c=c, k=k, total=2.0 * tr + tc)


def ramp_q(tau: Numeric, c: Numeric, tas: Numeric, k: float) -> npt.NDArray[np.complex128]:
    """Roll-in ramp air path Q(tau) = C + i S = integral over [0, tau] of V exp(i h_in(u)) du (kernel).

    h_in(u) = c (-ln cos(k u)), right turn from heading 0; 8-point Gauss-Legendre. ``tau``, ``c``
    and ``tas`` broadcast. When c and V are the same everywhere (one TAS and roll rate, as in
    the envelope) Q is computed once per distinct tau, which are few (the ramp times of a level).
    """
    tau = np.asarray(tau, dtype=float)
    c = np.asarray(c, dtype=float)
    v = np.asarray(tas, dtype=float)
    if tau.size > 64 and c.size and c.min() == c.max() and v.min() == v.max():
        # the distinct times by a sort (np.unique without an inverse imports numpy.ma on its first
        # call, ~46 M instructions; with one it sorts by a stable argsort), each time's place in
        # them by a search
        srt = np.sort(tau, axis=None)
        keep = np.empty(srt.size, dtype=bool)
        keep[:1] = True
        np.not_equal(srt[1:], srt[:-1], out=keep[1:])
        uniq = srt[keep]
        if uniq.size * 8 < tau.size:
            q = ramp_q(uniq, c.flat[0], v.flat[0], k)
            return q[np.searchsorted(uniq, tau)].reshape(np.broadcast(tau, c, v).shape)
    u = tau[..., None] * _GL_U
    h = c[..., None] * -np.log(np.cos(k * u))
    return (v * 0.5 * tau) * np.add.reduce(GL_WEIGHTS * np.exp(1j * h), axis=-1)


def _ramp_q_expanded(tau: FloatArray, prof: TurnProfile, expand: int) -> npt.NDArray[np.complex128]:
    """Q(tau) = C + i S with the profile given ``expand`` trailing axes (see :func:`ramp_q`)."""
    c, v = prof.c, prof.tas
    for _ in range(expand):
        c, v = c[..., None], v[..., None]
    return ramp_q(tau, c, v, prof.k)


def _ramp_integrals(tau: FloatArray, prof: TurnProfile, expand: int) -> tuple[FloatArray, FloatArray]:
    """C(tau), S(tau) = integral over [0, tau] of V (cos h_in, sin h_in) (Gauss-Legendre)."""
    c, v = prof.c, prof.tas
    for _ in range(expand):
        c, v = c[..., None], v[..., None]
    q = ramp_q(tau, c, v, prof.k)
    return q.real, q.imag


def turn_air_xyh(t: Numeric, prof: TurnProfile, *, expand: int = 0
                 ) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Air-mass displacement and heading change of a RIGHT turn entered on heading 0 (kernel).

    ``t`` is the time into the turn (0 <= t <= total); with ``expand`` = m the profile arrays
    get m trailing axes to broadcast against ``t`` (e.g. t of shape (..., n) and a profile of
    shape (...) use ``expand=1``). Returns (X, Y, h): X along the entry heading, Y to its right,
    h the heading change. [m], [m], [rad]

    Notes
    -----
    Instant bank: X = r sin(w t), Y = r (1 - cos(w t)), r = V / w. With ramps the constant-bank
    arc runs from heading dp to A - dp; the roll-out ramp is the roll-in mirrored, whose
    integral is the roll-in integral rotated by A.
    """
    return _turn_air(t, prof, expand, True)


def _turn_air(t: Numeric, prof: TurnProfile, expand: int, heading: bool
              ) -> tuple[FloatArray, FloatArray, FloatArray | None]:
    """:func:`turn_air_xyh`; the heading change only if ``heading`` (None otherwise)."""
    t = np.asarray(t, dtype=float)
    tr, tc, dp, wp, v, a = prof.tr, prof.tc, prof.dp, prof.wp, prof.tas, prof.angle
    for _ in range(expand):
        tr, tc, dp, wp, v, a = tr[..., None], tc[..., None], dp[..., None], wp[..., None], v[..., None], a[..., None]
    tc_ = _uclip(t - tr, 0.0, tc)
    rp = v / np.maximum(wp, _TINY)
    hb = dp + wp * tc_
    x = rp * (np.sin(hb) - np.sin(dp))
    y = rp * (np.cos(dp) - np.cos(hb))
    h = wp * tc_ if heading else None
    if prof.k > 0.0:
        total = 2.0 * tr + tc
        t1 = np.minimum(t, tr) + 0.0 * t
        t3 = _uclip(total - t, 0.0, tr)
        # one quadrature call for the three (t1, tr + 0 t and t3 share the shape of t broadcast with tr)
        q = _ramp_q_expanded(np.concatenate([t1[None], (tr + 0.0 * t)[None], t3[None]]), prof, expand)
        c1, s1, cr, sr, c3, s3 = q[0].real, q[0].imag, q[1].real, q[1].imag, q[2].real, q[2].imag
        ca, sa = np.cos(a), np.sin(a)
        x = x + c1 + ca * (cr - c3) + sa * (sr - s3)
        y = y + s1 + sa * (cr - c3) - ca * (sr - s3)
        if heading:
            cc = prof.c
            for _ in range(expand):
                cc = cc[..., None]
            h_in = lambda s: cc * -np.log(np.cos(prof.k * s))  # noqa: E731
            h = h + h_in(t1) + (dp - h_in(t3))
    return x, y, h


def _turn_air_end(prof: TurnProfile) -> tuple[FloatArray, FloatArray]:
    """``_turn_air(prof.total, prof, 0, False)[:2]``, the air displacement over the whole turn,
    with one quadrature: at the end the roll-in ramp is complete (Q(t1) = Q(tr)) and the roll-out
    ramp too (t3 = 0, Q(0) = 0), so only Q(tr) is computed (the same numbers to the last bit)."""
    tr, tc, dp, wp, v, a = prof.tr, prof.tc, prof.dp, prof.wp, prof.tas, prof.angle
    t = prof.total
    tc_ = _uclip(t - tr, 0.0, tc)
    rp = v / np.maximum(wp, _TINY)
    hb = dp + wp * tc_
    x = rp * (np.sin(hb) - np.sin(dp))
    y = rp * (np.cos(dp) - np.cos(hb))
    if prof.k > 0.0:
        q = _ramp_q_expanded(np.minimum(t, tr) + 0.0 * t, prof, 0)     # t1 = tr: the whole roll-in ramp
        cr, sr = q.real, q.imag
        ca, sa = np.cos(a), np.sin(a)
        x = x + cr + ca * cr + sa * sr
        y = y + sr + sa * cr - ca * sr
    return x, y


def turn_end_displacement(prof: TurnProfile, *, psi0: FloatArray, sign: FloatArray, wx: FloatArray,
                          wy: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Ground displacement over a whole turn: ``turn_ground(prof.total, prof, x0=0, y0=0, ...)[:2]``
    without the heading (array kernel, arrays of one shape; the solver's turn legs)."""
    t = prof.total
    big_x, big_y = _turn_air_end(prof)
    c0, s0 = np.cos(psi0), np.sin(psi0)
    sy = sign * big_y
    return 0.0 + big_x * c0 - sy * s0 + wx * t, 0.0 + big_x * s0 + sy * c0 + wy * t


def turn_ground(t: Numeric, prof: TurnProfile, *, x0: Numeric, y0: Numeric, psi0: Numeric, sign: Numeric,
                wx: Numeric, wy: Numeric, expand: int = 0) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Ground position and heading at time t into a turn (array kernel; trochoid in closed form).

    Returns (x, y, psi): the air-mass arc rotated to the entry heading psi0 (mirrored for a
    left turn, sign = -1) plus the wind drift w t [2]_. [m], [m], [rad]
    """
    big_x, big_y, h = turn_air_xyh(t, prof, expand=expand)
    x0, y0, psi0, sign, wx, wy = (np.asarray(q, dtype=float) for q in (x0, y0, psi0, sign, wx, wy))
    for _ in range(expand):
        x0, y0, psi0, sign, wx, wy = x0[..., None], y0[..., None], psi0[..., None], sign[..., None], wx[..., None], wy[..., None]
    c0, s0 = np.cos(psi0), np.sin(psi0)
    sy = sign * big_y
    x = x0 + big_x * c0 - sy * s0 + wx * t                 # air arc rotated by psi0, plus drift [2]
    y = y0 + big_x * s0 + sy * c0 + wy * t
    return x, y, psi0 + sign * h


# --------------------------------------------------------------------------------------------
# public leg functions
# --------------------------------------------------------------------------------------------
def crab_heading_deg(track_deg: Numeric, *, tas_kt: float, wind: RunwayWind) -> Numeric:
    """Heading that holds a ground track in the wind (wind correction angle applied).

    Parameters
    ----------
    track_deg : numeric
        Ground track in the runway frame. [deg]
    tas_kt : float
        True airspeed, 0 < TAS <= 1000. [kt]
    wind : RunwayWind
        Wind vector in the runway frame.

    Returns
    -------
    numeric
        Heading in the runway frame, within 90 deg of the track. [deg]

    Raises
    ------
    DomainError
        If the crosswind component reaches the TAS or the ground speed would not be positive.
    """
    _check_tas(tas_kt)
    wx, wy = wind.mps()
    psi, _, ok = wind_triangle(np.radians(track_deg), tas_kt * KT_TO_MPS, wx, wy)
    if not np.all(ok):
        raise DomainError(f"cannot hold track {track_deg} deg at {tas_kt} kt TAS in a {wind.speed_kt:.1f} kt wind: "
                          "crosswind component reaches the TAS or the ground speed is not positive")
    out = np.degrees(psi)
    return float(out) if out.ndim == 0 else out


def _straight_velocity(leg: Straight | StraightTrack, *, tas_kt: float, wind: RunwayWind
                       ) -> tuple[float, float, float]:
    """Ground velocity (m/s) and heading (deg) of a straight leg."""
    wx, wy = wind.mps()
    v = tas_kt * KT_TO_MPS
    if isinstance(leg, StraightTrack):
        hdg = float(crab_heading_deg(leg.track_deg, tas_kt=tas_kt, wind=wind))
    else:
        hdg = float(leg.heading_deg)
    return v * float(cosd(hdg)) + wx, v * float(sind(hdg)) + wy, hdg


def _turn_prof(leg: Turn, tas_kt: float) -> TurnProfile:
    rr = None if leg.roll_rate_deg_per_s is None else np.radians(leg.roll_rate_deg_per_s)
    return turn_profile(np.radians(leg.angle_deg), np.radians(leg.bank_deg), tas_kt * KT_TO_MPS, rr)


def leg_duration_s(leg: Leg, *, tas_kt: float) -> float:
    """Duration of a leg (a turn's from its angle, bank and roll rate). [s]"""
    _check_tas(tas_kt)
    if isinstance(leg, Turn):
        return float(_turn_prof(leg, tas_kt).total)
    return float(leg.time_s)


def sample_leg(leg: Leg, start: State, *, tas_kt: float, wind: RunwayWind, n: int = 32) -> TrackSamples:
    """Sample a leg at ``n`` points evenly spaced in time, both ends included (vectorised).

    Parameters
    ----------
    leg : Straight, StraightTrack or Turn
    start : State
        State at the start of the leg.
    tas_kt : float
        True airspeed, 0 < TAS <= 1000. [kt]
    wind : RunwayWind
    n : int
        Number of points, >= 2.

    Returns
    -------
    TrackSamples

    Raises
    ------
    DomainError
        On an out-of-range input, or a track leg that cannot be held in this wind.

    Notes
    -----
    Straight legs: p = p0 + (V u_heading + w) t. Turns: the closed-form trochoid of
    :func:`turn_ground` [1]_ [2]_.
    """
    _check_tas(tas_kt)
    if n < 2:
        raise DomainError(f"n = {n}: need at least 2 points")
    dur = leg_duration_s(leg, tas_kt=tas_kt)
    t = np.linspace(0.0, dur, n)
    if isinstance(leg, Turn):
        wx, wy = wind.mps()
        x, y, psi = turn_ground(t, _turn_prof(leg, tas_kt), x0=start.x_m, y0=start.y_m,
                                psi0=np.radians(start.heading_deg), sign=leg.sign, wx=wx, wy=wy)
        hdg = np.degrees(psi)
    else:
        gx, gy, h = _straight_velocity(leg, tas_kt=tas_kt, wind=wind)
        x, y = start.x_m + gx * t, start.y_m + gy * t
        hdg = np.full(n, h)
    return TrackSamples(time_s=start.time_s + t, x_m=np.asarray(x, float), y_m=np.asarray(y, float),
                        heading_deg=np.asarray(hdg, float), leg_index=np.zeros(n, dtype=int))


def leg_end_state(leg: Leg, start: State, *, tas_kt: float, wind: RunwayWind) -> State:
    """State at the end of a leg (closed form; see :func:`sample_leg`).

    For a turn the end heading is exactly ``start.heading_deg +/- angle_deg`` (not wrapped).
    """
    _check_tas(tas_kt)
    if isinstance(leg, Turn):
        prof = _turn_prof(leg, tas_kt)
        wx, wy = wind.mps()
        x, y, _ = turn_ground(prof.total, prof, x0=start.x_m, y0=start.y_m,
                              psi0=np.radians(start.heading_deg), sign=leg.sign, wx=wx, wy=wy)
        return State(x_m=float(x), y_m=float(y), heading_deg=start.heading_deg + leg.sign * leg.angle_deg,
                     time_s=start.time_s + float(prof.total))
    gx, gy, h = _straight_velocity(leg, tas_kt=tas_kt, wind=wind)
    return State(x_m=start.x_m + gx * leg.time_s, y_m=start.y_m + gy * leg.time_s, heading_deg=h,
                 time_s=start.time_s + leg.time_s)


def plan_end_state(legs: tuple[Leg, ...] | list[Leg], start: State, *, tas_kt: float, wind: RunwayWind) -> State:
    """State after flying ``legs`` in order from ``start``."""
    s = start
    for leg in legs:
        s = leg_end_state(leg, s, tas_kt=tas_kt, wind=wind)
    return s


def plan_time_s(legs: tuple[Leg, ...] | list[Leg], *, tas_kt: float) -> float:
    """Total time of a sequence of legs. [s]"""
    return float(sum(leg_duration_s(leg, tas_kt=tas_kt) for leg in legs))


def points_for_leg(leg: Leg, *, tas_kt: float, wind: RunwayWind, turn_step_deg: float = 2.0,
                   straight_step_m: float = 100.0) -> int:
    """Default number of samples for a leg: one per ``turn_step_deg`` of turn or per
    ``straight_step_m`` of straight ground distance, at least 2."""
    if isinstance(leg, Turn):
        return max(2, int(np.ceil(leg.angle_deg / turn_step_deg)) + 1)
    gx, gy, _ = _straight_velocity(leg, tas_kt=tas_kt, wind=wind)
    return max(2, int(np.ceil(np.hypot(gx, gy) * leg.time_s / straight_step_m)) + 1)


def sample_legs(legs: tuple[Leg, ...] | list[Leg], start: State, *, tas_kt: float, wind: RunwayWind,
                n_per_leg: tuple[int, ...] | None = None) -> TrackSamples:
    """Sample a sequence of legs (each leg's ends included, so joins appear twice).

    Parameters
    ----------
    legs : sequence of Leg
    start : State
    tas_kt : float
        [kt]
    wind : RunwayWind
    n_per_leg : tuple of int, optional
        Points per leg; default :func:`points_for_leg` (2 deg of turn, 100 m of straight).

    Returns
    -------
    TrackSamples
    """
    if n_per_leg is None:
        n_per_leg = tuple(points_for_leg(leg, tas_kt=tas_kt, wind=wind) for leg in legs)
    if len(n_per_leg) != len(legs):
        raise DomainError("n_per_leg must give one count per leg")
    parts: list[TrackSamples] = []
    s = start
    for i, (leg, n) in enumerate(zip(legs, n_per_leg)):
        smp = sample_leg(leg, s, tas_kt=tas_kt, wind=wind, n=n)
        parts.append(TrackSamples(time_s=smp.time_s, x_m=smp.x_m, y_m=smp.y_m, heading_deg=smp.heading_deg,
                                  leg_index=np.full(n, i, dtype=int)))
        s = leg_end_state(leg, s, tas_kt=tas_kt, wind=wind)
    if not parts:
        return TrackSamples(time_s=np.array([start.time_s]), x_m=np.array([start.x_m]), y_m=np.array([start.y_m]),
                            heading_deg=np.array([start.heading_deg]), leg_index=np.zeros(1, dtype=int))
    cat = np.concatenate
    return TrackSamples(time_s=cat([p.time_s for p in parts]), x_m=cat([p.x_m for p in parts]),
                        y_m=cat([p.y_m for p in parts]), heading_deg=cat([p.heading_deg for p in parts]),
                        leg_index=cat([p.leg_index for p in parts]))


def leg_ground_speed_kt(leg: Straight | StraightTrack, *, tas_kt: float, wind: RunwayWind) -> float:
    """Ground speed on a straight leg of a plan (runway frame). [kt]"""
    gx, gy, _ = _straight_velocity(leg, tas_kt=tas_kt, wind=wind)
    return float(np.hypot(gx, gy) * MPS_TO_KT)


def turn_angle_deg(from_heading_deg: float, to_heading_deg: float, direction: Direction) -> float:
    """Angle turned from one heading to another in the given direction, in [0, 360). [deg]"""
    sgn = 1.0 if direction == "right" else -1.0
    a = float(wrap_360(sgn * (to_heading_deg - from_heading_deg)))
    return 0.0 if a > 360.0 - 1e-9 else a
