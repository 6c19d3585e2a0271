"""The standard circling plan shapes and their solver, vectorised over winds, sides and banks.

Runway frame and wind: see :mod:`briefer.core.manoeuvre.legs`. ``sigma`` = +1 puts the downwind
on the right of the runway (y > 0) and all pattern turns to the right; -1 on the left.

Plan shapes (names of our own)
------------------------------
``downwind-join``
    Hold the arrival course (the "crossing" leg) for t_join, turn (same hand as the pattern)
    onto the downwind, hold the downwind TRACK for t_dw, turn to final. For an arrival that
    crosses toward the downwind side at 30 deg or more. When the turn onto the downwind alone
    (no crossing leg) already carries the arrival beyond the offset one 180 deg final turn
    needs, the downwind is flown wider: base turn, base leg (track 90 deg to the runway,
    crabbed) and final turn, as on the final side of the overfly circuit. Otherwise the base
    turn and base leg are nil (0 deg, 0 s) and the final turn is one 180 deg turn.
``break-and-return``
    Reciprocal arrival: turn away from the runway through the break angle (45 deg default),
    hold that heading for t_break, turn onto the downwind, downwind, turn to final [3]_.
``teardrop``
    Reciprocal arrival: hold the arrival course for t_out (over and past the landing
    threshold), turn away through the teardrop angle (30 deg default), hold that heading for
    t_offset, then one turn of about 180 + angle onto final.
``direct-turn``
    Arrival at an angle of at most 90 deg to the landing direction: hold the arrival course
    until one turn rolls out on the centreline. The roll-out distance is a result here.
``overfly-circuit``
    Arrival within 30 deg of the landing direction, aligned included (an approach that is
    circling-only because its descent is too steep arrives aligned and too high): hold the
    arrival course over the runway (the "upwind" leg) to the crosswind turn point, then a
    rectangular circuit on the chosen side -- crosswind turn, crosswind leg, downwind turn,
    downwind, base turn, base leg, final turn -- every turn to the pattern side, the crosswind,
    downwind and base legs holding their TRACKS (90, 180 and 270 deg from the landing
    direction, crabbed). At most one of the crosswind and base legs is longer than zero; with
    no leg the two turns either side make one continuous 180 deg turn [2]_.

The unknowns and the equations
------------------------------
Every turn's ground displacement is D = R(psi_entry) D_air + w T (closed form, independent of
where it starts) and every straight leg moves g t, so the end position is LINEAR in the leg
times. The final turn (downwind crab heading -> final crab heading, pattern hand, target bank)
fixes the roll-in point: (x_ri, y_ri) = (-d, 0) - D_final; the downwind offset is |y_ri|
(downwind-join: the larger of that and the join's own reach with no crossing leg, y_a; when
y_a is larger the base and final turns as in the circuit below fix x_ri, the base leg takes
Y - sigma y_b and the crossing leg is zero). The join leg time follows from y, the downwind time from x (two 1x1 solves); the teardrop solves a
2x2 system. No iteration and no generic optimiser.

The overfly circuit has four unknowns. The upwind time is a rule, not a solve: fly on to the
crosswind turn point x_t (``circuit_turn_past_threshold_m``, 0 = over the landing threshold)
or turn at once if already past it, t_up = max(0, (x_t - x0) / g0x). The two turns to the
downwind, flown with no crosswind leg, put the downwind at y_a; the base and final turns, with
no base leg, need it at y_b = -(D_base + D_final)_y. In calm air both are one turn diameter out
(2r), but in a crosswind they differ by about 2 pi w_y / omega (the drift over 360 deg of
turning; 220 m per 5 kt at 25 deg bank and 120 kt), one way or the other, so no pair of 180 deg
turns closes by itself: the downwind offset is the smallest one both ends can reach,
Y = max(sigma y_a, sigma y_b), the crosswind leg takes Y - sigma y_a and the base leg
Y - sigma y_b (so one of them is zero), and the downwind time follows from x as above. The
offset then closes on both sides in any crosswind the crabs allow; what can still fail is x:
a headwind on final drifts the four turns back (w_x 2 pi / omega) past a short roll-out, and
the downwind would start beyond the base turn (R_INSIDE_TURN). With roll ramps the two 90 deg
turns with no leg between are a little wider than one 180 deg turn (wings level for an
instant: about V times the roll-in time), on both ends alike.

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (visual manoeuvring area, R = 2r + S;
   wind throughout the turn), 5th ed., 2006.
.. [2] FAA, Aeronautical Information Manual, 5-4-20 (circling: remain at the MDA until in a
   position to descend with normal manoeuvres; shortest path to the base or downwind leg,
   passing over the airport or other runways allowed).
.. [3] Operator circling technique summarised in docs/REFERENCES.md section 9: reciprocal
   break 45 deg for about 30 s, timing from abeam the threshold, descent on a ~3 deg path,
   stabilised by 300 ft above the airport (common practice).
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass, field
from collections.abc import Callable, Generator, Sequence
from typing import Literal

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.legs import (
    BANK_MAX_DEG,
    FloatArray,
    RunwayWind,
    TurnProfile,
    ramp_q,
    turn_end_displacement,
    turn_profile,
)
from briefer.core.wind import wind_triangle
from briefer.errors import DomainError
from briefer import vocabulary
from briefer.units import FT_TO_M, KT_TO_MPS
from briefer.core.angles import wrap_180

Shape = Literal["downwind-join", "break-and-return", "teardrop", "direct-turn", "overfly-circuit"]
Side = Literal["left", "right"]
SHAPES: tuple[Shape, ...] = vocabulary.PLAN_SHAPES  # type: ignore[assignment]
DOWNWIND_SHAPES: tuple[Shape, ...] = vocabulary.DOWNWIND_SHAPES  # type: ignore[assignment]
"""Shapes with a downwind leg held on the reciprocal track (timed from abeam the threshold)."""
SIDES: tuple[Side, ...] = ("left", "right")

# --- feasibility reason flags (bit field) ----------------------------------------------------
R_WIND = 1            # a crosswind component reaches the TAS, or a ground speed is not positive
R_BREAK_BACK = 2      # the wind carries the break/offset leg back toward the runway
R_NEG_LEG = 4         # a solved leg time is negative (the turns alone overshoot, or too late)
R_INSIDE_TURN = 8     # joins the downwind past the roll-in point (already inside the turn)
R_WRONG_SIDE = 16     # the final turn would need the downwind on the other side
R_NO_CONVERGE = 32    # the arrival course never converges with the centreline
R_TOO_CLOSE = 64      # rolls out closer than the stabilised distance (direct turn)
R_NOT_APPLICABLE = 128
R_TURN_REVERSED = 256  # the crab angles make a 90 deg pattern turn 180 deg or more (wind near the TAS)

# --- applicability of the shapes to the arrival course (track-based, wind-independent) -------
JOIN_MIN_CROSSING_DEG = 30.0      # downwind-join: arrival crosses toward the side at >= 30 deg
RECIPROCAL_MAX_DEG = 60.0         # break/teardrop: arrival within 60 deg of the reciprocal
DIRECT_MAX_DEG = 90.0             # direct-turn: at most 90 deg to turn onto final
ALIGNED_TOL_DEG = 0.5             # below this the arrival is already aligned (no direct turn)
CIRCUIT_MAX_DEG = 30.0            # overfly-circuit: arrival within 30 deg of the landing direction
_SMALL_GS = 1e-6


@dataclass(frozen=True, slots=True, kw_only=True)
class CircleInputs:
    """Everything the plan solver needs, in the runway frame.

    Attributes
    ----------
    tas_kt : float
        True airspeed flown in the circle, 0 < TAS <= 500. [kt]
    bank_deg : float
        Target bank for every turn, 0 < bank <= 60. [deg]
    wind : RunwayWind
        Wind vector in the runway frame (blowing toward).
    arrival_x_m, arrival_y_m : float
        Where the circle starts (missed approach point / visual point). [m]
    arrival_course_deg : float
        Ground track on arrival in the runway frame (180 = reciprocal). [deg]
    circling_height_ft : float
        Height of the circle above the threshold (HAA), > tch_ft. [ft]
    glide_path_deg : float
        Descent path angle to the threshold, 0 < gpa <= 10 (3 if the runway has none). [deg]
    tch_ft : float
        Threshold crossing height of that path, >= 0. [ft]
    stabilised_height_ft : float
        Height by which the aircraft is wings level on final (300 ft above the airport,
        common practice), tch_ft < h. [ft]
    roll_out_distance_m : float or None
        Chosen roll-out distance before the threshold; None = where the glide path from the
        circling height meets the final. Never closer than the stabilised distance. [m]
    roll_rate_deg_per_s : float or None
        Roll rate for the roll-in/roll-out ramps (None = instant bank). [deg/s]
    break_angle_deg : float
        Break-off angle of break-and-return, 0 < angle <= 90 (45 common practice). [deg]
    teardrop_angle_deg : float
        Offset angle of the teardrop, 0 < angle < 90 (30 our default). [deg]
    runway_length_m : float
        Landing runway length, >= 0 (0 = threshold only); used for the visibility distance and
        the missed-approach reference point. [m]
    circuit_turn_past_threshold_m : float
        Overfly circuit: the crosswind turn starts no earlier than this far past the landing
        threshold along the landing direction (0 = over the threshold, our default: the
        shortest path to the downwind [2]_; ``runway_length_m`` = over the far end; negative =
        before the threshold). An arrival already past it turns at once. [m]
    """

    tas_kt: float
    bank_deg: float
    wind: RunwayWind
    arrival_x_m: float
    arrival_y_m: float
    arrival_course_deg: float
    circling_height_ft: float
    glide_path_deg: float = 3.0
    tch_ft: float = 50.0
    stabilised_height_ft: float = 300.0
    roll_out_distance_m: float | None = None
    roll_rate_deg_per_s: float | None = None
    break_angle_deg: float = 45.0
    teardrop_angle_deg: float = 30.0
    runway_length_m: float = 0.0
    circuit_turn_past_threshold_m: float = 0.0

    def __post_init__(self) -> None:
        bad = _circle_inputs_problem(self)
        if bad is not None:
            raise DomainError(bad)


def _circle_inputs_problem(c: CircleInputs) -> str | None:
    """The first of `CircleInputs`' checks that fails, as its message (None: all pass). Each
    message is written only for the check that fails."""
    if not all(math.isfinite(v) for v in (c.tas_kt, c.bank_deg, c.arrival_x_m, c.arrival_y_m, c.arrival_course_deg,
                                          c.circling_height_ft, c.glide_path_deg, c.tch_ft, c.stabilised_height_ft,
                                          c.break_angle_deg, c.teardrop_angle_deg, c.runway_length_m,
                                          c.circuit_turn_past_threshold_m)):
        return "CircleInputs values must be finite"
    if not 0.0 < c.tas_kt <= 500.0:
        return f"tas_kt = {c.tas_kt}: valid range is 0 < TAS <= 500 kt"
    if not 0.0 < c.bank_deg <= 60.0:
        return f"bank_deg = {c.bank_deg}: valid range is 0 < bank <= 60"
    if not 0.0 < c.glide_path_deg <= 10.0:
        return f"glide_path_deg = {c.glide_path_deg}: valid range is (0, 10]"
    if not c.tch_ft >= 0.0:
        return f"tch_ft = {c.tch_ft}: must be >= 0"
    if not c.circling_height_ft > c.tch_ft:
        return f"circling_height_ft = {c.circling_height_ft}: must be above tch_ft = {c.tch_ft}"
    if not c.stabilised_height_ft > c.tch_ft:
        return f"stabilised_height_ft = {c.stabilised_height_ft}: must be above tch_ft = {c.tch_ft}"
    if not (c.roll_out_distance_m is None or (math.isfinite(c.roll_out_distance_m) and c.roll_out_distance_m >= 0.0)):
        return f"roll_out_distance_m = {c.roll_out_distance_m}: must be >= 0 (or None)"
    if not (c.roll_rate_deg_per_s is None or (math.isfinite(c.roll_rate_deg_per_s) and c.roll_rate_deg_per_s > 0.0)):
        return f"roll_rate_deg_per_s = {c.roll_rate_deg_per_s}: must be > 0 (or None)"
    if not 0.0 < c.break_angle_deg <= 90.0:
        return f"break_angle_deg = {c.break_angle_deg}: valid range (0, 90]"
    if not 0.0 < c.teardrop_angle_deg < 90.0:
        return f"teardrop_angle_deg = {c.teardrop_angle_deg}: valid range (0, 90)"
    if not c.runway_length_m >= 0.0:
        return f"runway_length_m = {c.runway_length_m}: must be >= 0"
    if not isinstance(c.wind, RunwayWind):
        return "wind must be a RunwayWind"
    return None


@dataclass(frozen=True, slots=True, kw_only=True)
class DescentGeometry:
    """Where the descent from the circling height starts and where the roll-out is.

    Attributes
    ----------
    descent_point_m : float
        Distance before the threshold where the glide path meets the circling height,
        (HAA - TCH) / tan(gpa). [m]
    stabilised_distance_m : float
        Distance where the glide path passes the stabilised-by height. [m]
    roll_out_distance_m : float
        Roll-out distance used by the downwind plans (the chosen one, or the descent point),
        never closer than the stabilised distance. [m]
    clamped : bool
        True if a chosen distance was moved out to the stabilised distance.
    """

    descent_point_m: float
    stabilised_distance_m: float
    roll_out_distance_m: float
    clamped: bool

    def __post_init__(self) -> None:
        if not (self.descent_point_m > 0 and self.stabilised_distance_m > 0
                and self.roll_out_distance_m >= self.stabilised_distance_m - 1e-9):
            raise DomainError("DescentGeometry: distances must be positive, roll-out >= stabilised distance")


def descent_geometry(inputs: CircleInputs) -> DescentGeometry:
    """Descent point, stabilised distance and roll-out distance along the final.

    Parameters
    ----------
    inputs : CircleInputs

    Returns
    -------
    DescentGeometry

    Notes
    -----
    On a straight path of angle gpa crossing the threshold at TCH, the height at a distance d
    before the threshold is TCH + d tan(gpa), so d(h) = (h - TCH) / tan(gpa). Descent starts at
    d(HAA) "only when intercepting a normal ~3 deg path" and the aircraft is stabilised by
    d(300 ft) [3]_.

    References
    ----------
    See the module references [3]_.
    """
    tg = math.tan(math.radians(inputs.glide_path_deg))
    d_glide = (inputs.circling_height_ft - inputs.tch_ft) * FT_TO_M / tg
    d_stab = (inputs.stabilised_height_ft - inputs.tch_ft) * FT_TO_M / tg
    chosen = d_glide if inputs.roll_out_distance_m is None else inputs.roll_out_distance_m
    return DescentGeometry(descent_point_m=d_glide, stabilised_distance_m=d_stab,
                           roll_out_distance_m=max(chosen, d_stab), clamped=chosen < d_stab)


def applicable_candidates(arrival_course_deg: float) -> tuple[tuple[Shape, Side], ...]:
    """Plan shapes and sides that suit an arrival course (in the runway frame).

    Rules (our choices, after the techniques of [3]_): ``direct-turn`` when the course is
    within 90 deg of the landing direction (and not aligned), on the side it converges from;
    ``overfly-circuit`` when it is within 30 deg of the landing direction, aligned included
    (both sides; 30 deg is the FAA straight-in alignment limit, so an approach that is
    circling-only for its descent gradient alone arrives within it, docs/REFERENCES.md
    section 5); ``downwind-join`` when it crosses toward a side at 30 deg or more (that side
    only); ``break-and-return`` and ``teardrop`` when it is within 60 deg of the reciprocal
    (both sides). Every course has a candidate.
    """
    if type(arrival_course_deg) is float:   # wrap_180 on a float: Python's % is np.mod's rule (fmod, then the sign of 360)
        c = (arrival_course_deg + 180.0) % 360.0 - 180.0
    else:
        c = float(wrap_180(arrival_course_deg))
    delta = abs(c)
    out: list[tuple[Shape, Side]] = []
    s = math.sin(math.radians(c))
    if ALIGNED_TOL_DEG < delta <= DIRECT_MAX_DEG:
        out.append(("direct-turn", "left" if c > 0 else "right"))
    if delta <= CIRCUIT_MAX_DEG:
        out.extend([("overfly-circuit", "left"), ("overfly-circuit", "right")])
    if JOIN_MIN_CROSSING_DEG <= delta <= 180.0 - JOIN_MIN_CROSSING_DEG:
        out.append(("downwind-join", "right" if s > 0 else "left"))
    if delta >= 180.0 - RECIPROCAL_MAX_DEG:
        out.extend([("break-and-return", "left"), ("break-and-return", "right"),
                    ("teardrop", "left"), ("teardrop", "right")])
    return tuple(out)


# --------------------------------------------------------------------------------------------
# vectorised solution
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class LegArrays:
    """One leg of a solved shape, as arrays over the broadcast shape of the solve (kernel output)."""

    kind: Literal["straight", "turn"]
    name: str
    duration: FloatArray
    x0: FloatArray = field(default=None)  # type: ignore[assignment]
    y0: FloatArray = field(default=None)  # type: ignore[assignment]
    psi0: FloatArray = field(default=None)  # type: ignore[assignment]
    # straight legs
    gx: FloatArray | None = None
    gy: FloatArray | None = None
    track_rad: float | FloatArray | None = None   # set when the leg holds a track (crabbed); per row if an array
    # turns
    prof: TurnProfile | None = None
    sign: FloatArray | None = None
    dx: FloatArray | None = None        # ground displacement of the whole turn
    dy: FloatArray | None = None
    nominal_rad: float = 0.0            # the turn angle in calm wind (sets the sample count) ...
    nominal_rows: FloatArray | None = None   # ... and per row (rows of different sides differ)


@dataclass(frozen=True, slots=True, kw_only=True)
class ShapeSolution:
    """Solved unknowns of one shape, as arrays over the broadcast shape (see :func:`solve_shape`)."""

    shape: Shape
    ok: npt.NDArray[np.bool_]
    reasons: npt.NDArray[np.int_]
    legs: tuple[LegArrays, ...]
    x_ri: FloatArray
    y_ri: FloatArray
    offset: FloatArray                  # sigma * y_ri: > 0 on the planned side
    roll_out_d: FloatArray
    abeam_s: FloatArray | None          # downwind shapes: from abeam the threshold to roll-in
    break_s: FloatArray | None          # the solved join/break/offset leg time (circuit: the upwind time)
    psi_f: FloatArray
    gs_f: FloatArray
    psi_d: FloatArray
    gs_d: FloatArray
    final_turn: int                     # index of the final turn in legs
    turns_to_final: tuple[int, ...]     # the turn(s) that end on final (circuit: base and final turn)
    wx: FloatArray                      # wind (m/s), broadcast
    wy: FloatArray
    columns: _ShapeColumns | None = field(default=None, compare=False)
    """The fields sampling reads, as rows of one array of the solve (a solve over one axis of rows)."""


def _wrap_2pi(a: FloatArray) -> FloatArray:
    a = np.mod(a, 2.0 * np.pi)
    return a * (a <= 2.0 * np.pi - 1e-9)          # a hair below 2 pi is a zero turn


class _Wrap:
    """An angle of a turn spec to be wrapped to [0, 2 pi) (:func:`_wrap_2pi`): :meth:`_Kernel.turns`
    wraps every such angle of its call in one go (a spec's angles are made only to be wrapped)."""

    __slots__ = ("a",)

    def __init__(self, a: FloatArray) -> None:
        self.a = a


def _pick_turn(mask: npt.NDArray[np.bool_], a: LegArrays, b: LegArrays | None, name: str,
               nominal_rad: float) -> LegArrays:
    """Turn ``a`` where ``mask``, else ``b`` (None: no turn, angle 0, at ``a``'s rate), row by row."""
    pa = a.prof
    assert pa is not None and a.dx is not None and a.dy is not None and a.sign is not None

    def pick(fa: FloatArray, fb: FloatArray | float) -> FloatArray:
        return np.where(mask, fa, fb)

    if b is None:
        prof = TurnProfile(angle=pick(pa.angle, 0.0), tas=pa.tas, tr=pick(pa.tr, 0.0), tc=pick(pa.tc, 0.0),
                           dp=pick(pa.dp, 0.0), wp=pa.wp, c=pa.c, k=pa.k, total=pick(pa.total, 0.0))
        return LegArrays(kind="turn", name=name, duration=prof.total, psi0=a.psi0, prof=prof, sign=a.sign,
                         dx=pick(a.dx, 0.0), dy=pick(a.dy, 0.0), nominal_rad=nominal_rad,
                         nominal_rows=np.full(mask.shape, nominal_rad))
    pb = b.prof
    assert pb is not None and b.dx is not None and b.dy is not None
    prof = TurnProfile(angle=pick(pa.angle, pb.angle), tas=pa.tas, tr=pick(pa.tr, pb.tr), tc=pick(pa.tc, pb.tc),
                       dp=pick(pa.dp, pb.dp), wp=pick(pa.wp, pb.wp), c=pa.c, k=pa.k,
                       total=pick(pa.total, pb.total))
    return LegArrays(kind="turn", name=name, duration=prof.total, psi0=pick(a.psi0, b.psi0), prof=prof,
                     sign=a.sign, dx=pick(a.dx, b.dx), dy=pick(a.dy, b.dy), nominal_rad=nominal_rad,
                     nominal_rows=np.full(mask.shape, nominal_rad))


def _flag(ok: npt.NDArray[np.bool_], flag: int) -> npt.NDArray[np.int_]:
    """``flag`` where ``ok`` is False, else 0 (int64, as ``np.logical_not(ok) * flag``, in one call)."""
    return np.where(ok, 0, flag)


class _Kernel:
    """What every leg of one solve shares: the broadcast inputs and the leg makers. ``block``:
    the last :meth:`turns` call's fields every turn has in :class:`SamplingRows` (angle, tas,
    tr, tc, dp, wp, c, total, psi0, sign, calm-wind angle), each an array (T, ...) over its turns."""

    __slots__ = ("zero", "sig", "wx", "wy", "bank", "v", "roll_rate_rad", "x0", "y0", "c0_rad", "d_m", "block")

    def __init__(self, *, sigma: npt.ArrayLike, tas_mps: float, wx: npt.ArrayLike, wy: npt.ArrayLike,
                 bank_rad: npt.ArrayLike, roll_rate_rad: float | None, x0: float, y0: float, c0_rad: float,
                 d_m: float | FloatArray) -> None:
        sig = np.asarray(sigma, dtype=float)
        wx = np.asarray(wx, dtype=float)
        wy = np.asarray(wy, dtype=float)
        bank = np.asarray(bank_rad, dtype=float)
        zero = np.zeros(np.broadcast(sig, wx, wy, bank, d_m).shape)
        self.zero = zero
        self.sig, self.wx, self.wy, self.bank = sig + zero, wx + zero, wy + zero, bank + zero
        self.v = float(tas_mps)
        self.roll_rate_rad = roll_rate_rad
        self.x0, self.y0, self.c0_rad, self.d_m = x0, y0, c0_rad, d_m
        self.block: list[FloatArray] = []

    def turns(self, *specs: tuple[FloatArray, FloatArray, FloatArray, str, FloatArray]) -> list[LegArrays]:
        """Turn legs from (entry heading, angle, sign, name, calm-wind angle) specs, all computed in
        one call of the (elementwise) kernels: the specs are stacked on a new leading axis."""
        zero, v, wx, wy = self.zero, self.v, self.wx, self.wy
        psi_a, angle, sgn, nominal = self._spec_block(specs)
        nominal_max = nominal.reshape(len(specs), -1).max(axis=1).tolist()    # each turn's largest
        prof = turn_profile(angle, self.bank, v, self.roll_rate_rad)
        if self.roll_rate_rad is None:      # the trochoid: s r (sin psi_b - sin psi_a, cos psi_a - cos psi_b) + w T
            sr = sgn * (v / prof.wp)
            psi_b = psi_a + sgn * angle
            dx = sr * (np.sin(psi_b) - np.sin(psi_a)) + wx * prof.total
            dy = sr * (np.cos(psi_a) - np.cos(psi_b)) + wy * prof.total
        else:
            dx, dy = turn_end_displacement(prof, psi0=psi_a, sign=sgn, wx=wx, wy=wy)
        self.block = [prof.angle, prof.tas, prof.tr, prof.tc, prof.dp, prof.wp, prof.c, prof.total, psi_a, sgn, nominal]
        out = []
        for i, sp in enumerate(specs):
            p_i = TurnProfile(angle=prof.angle[i], tas=prof.tas[i], tr=prof.tr[i], tc=prof.tc[i], dp=prof.dp[i],
                              wp=prof.wp[i], c=prof.c[i], k=prof.k, total=prof.total[i])
            out.append(LegArrays(kind="turn", name=sp[3], duration=p_i.total, psi0=psi_a[i], prof=p_i,
                                 sign=sgn[i], dx=dx[i], dy=dy[i], nominal_rad=nominal_max[i],
                                 nominal_rows=nominal[i]))
        return out

    def _spec_block(self, specs: tuple) -> FloatArray:
        """The specs' entry headings, angles, signs and calm-wind angles, each plus the zero rows
        (broadcast, a copy), as one array (4, T, ...); the angles given as :class:`_Wrap` wrapped,
        all in one call. One array of the fields stacked, plus 0.0, is each field plus the zero
        rows to the bit (x + 0.0 turns -0.0 into 0.0 as x + zero does), and wrapping x + 0.0 is
        wrapping x, plus 0.0 (a wrapped angle is never -0.0)."""
        zero = self.zero
        fields = [sp[j] for j in (0, 1, 2, 4) for sp in specs]
        wrap = [i for i, f in enumerate(fields) if type(f) is _Wrap]
        for i in wrap:
            fields[i] = fields[i].a
        shp = zero.shape
        if all(type(f) is np.ndarray and f.shape == shp and f.dtype == np.float64 for f in fields):
            block = np.array(fields) + 0.0
        else:
            block = np.array([f + zero for f in fields])
        if wrap:
            block[wrap] = _wrap_2pi(block[wrap])
        return block.reshape((4, len(specs)) + shp)

    def straight(self, psi: FloatArray, gx: FloatArray, gy: FloatArray, t: FloatArray, name: str,
                 track: float | FloatArray | None) -> LegArrays:
        zero = self.zero
        return LegArrays(kind="straight", name=name, duration=t + zero, psi0=psi + zero, gx=gx + zero,
                         gy=gy + zero, track_rad=track)


class _Tracks:
    """The final, downwind and arrival legs' crab headings and ground speeds, which every shape uses."""

    __slots__ = ("psi_f", "psi_d", "psi0", "gs_f", "gs_d", "gs0", "g0x", "g0y", "reasons", "final_leg")

    def __init__(self, k: _Kernel) -> None:
        # final (0), downwind (pi) and arrival tracks in one call of the (elementwise) kernel
        trk3 = np.array([0.0, np.pi, float(k.c0_rad)]).reshape((3,) + (1,) * k.zero.ndim)
        psi3, gs3, ok3 = wind_triangle(trk3, k.v, k.wx, k.wy)
        (self.psi_f, self.psi_d, self.psi0), (self.gs_f, self.gs_d, self.gs0), (ok_f, ok_d, ok0) = psi3, gs3, ok3
        self.g0x, self.g0y = self.gs0 * math.cos(k.c0_rad), self.gs0 * math.sin(k.c0_rad)
        self.reasons = _flag(ok_f & ok_d & ok0, R_WIND)
        self.final_leg = k.straight(self.psi_f, self.gs_f, k.zero, k.d_m / self.gs_f, "final", 0.0)

    def final(self) -> LegArrays:
        """The final straight, a leg of its own (the shapes of one solve share its arrays)."""
        f = self.final_leg
        return LegArrays(kind="straight", name="final", duration=f.duration, psi0=f.psi0, gx=f.gx, gy=f.gy,
                         track_rad=f.track_rad)


@dataclass(slots=True)
class _Solved:
    """One shape's legs (in order, starts not yet set) and its solved unknowns."""

    legs: list[LegArrays]
    reasons: npt.NDArray[np.int_]
    x_ri: FloatArray
    y_ri: FloatArray
    offset: FloatArray
    roll_out: float | FloatArray      # (the roll-out given, as it is: the solution broadcasts it, plus zero)
    abeam_s: FloatArray | None = None
    break_s: FloatArray | None = None


_ShapeSteps = Generator[tuple, list[LegArrays], _Solved] if TYPE_CHECKING else object
"""A shape's solve: it yields its turn specs (see :meth:`_Kernel.turns`), is sent the turn legs
and returns its legs and unknowns."""


def _final_turn_spec(k: _Kernel, t: _Tracks) -> tuple:
    """The one 180 deg turn from the downwind onto final (pattern hand)."""
    return (t.psi_d, _Wrap(k.sig * (t.psi_f - t.psi_d)), k.sig, "final turn", np.pi + k.zero)


def _downwind_and_final(k: _Kernel, t: _Tracks, reasons: npt.NDArray[np.int_], first: list[LegArrays],
                        final_side: list[LegArrays], x_j: FloatArray, t_j: FloatArray, x_ri: FloatArray,
                        y_ri: FloatArray, offset: FloatArray) -> _Solved:
    """The downwind shapes' common end: the downwind time from x, the legs in order."""
    t_dw = (x_j - x_ri) / t.gs_d
    reasons = reasons | _flag(t_j >= 0.0, R_NEG_LEG) | _flag(t_dw >= 0.0, R_INSIDE_TURN)
    legs = first + [k.straight(t.psi_d, -t.gs_d, k.zero, t_dw, "downwind", math.pi)] + final_side + [t.final()]
    return _Solved(legs=legs, reasons=reasons, x_ri=x_ri, y_ri=y_ri, offset=offset, roll_out=k.d_m,
                   abeam_s=-x_ri / t.gs_d, break_s=t_j)


def _solve_downwind_join(k: _Kernel, t: _Tracks) -> _ShapeSteps:
    """Crossing leg, turn onto the downwind, downwind, then one 180 deg turn to final, or (when the
    join alone reaches beyond that turn's offset) a wider downwind with a base turn, base leg and
    final turn, as on the circuit's final side."""
    sig, zero, x0, y0 = k.sig, k.zero, k.x0, k.y0
    psi0, psi_d, psi_f = t.psi0, t.psi_d, t.psi_f
    trk_b = -sig * (0.5 * np.pi)
    psi_b, gs_b, ok_b = wind_triangle(trk_b, k.v, k.wx, k.wy)
    t_f180, t_join, t_bt90, t_f90 = yield (
        _final_turn_spec(k, t), (psi0, _Wrap(sig * (psi_d - psi0)), sig, "turn downwind",
                                 _Wrap(sig * (np.pi - k.c0_rad))),
        (psi_d, _Wrap(sig * (psi_b - psi_d)), sig, "base turn", 0.5 * np.pi + zero),
        (psi_b, _Wrap(sig * (psi_f - psi_b)), sig, "final turn", 0.5 * np.pi + zero))
    # the downwind offset is the larger of what the final turn needs (one 180 deg turn, no base
    # leg) and what the join reaches with no crossing leg (y_a); when the join reaches further, a
    # wider downwind: base turn, base leg (taking up the difference to what the base and final
    # turns need, y_b) and final turn, as in the circuit
    y_a = y0 + t_join.dy
    wide = sig * y_a > -sig * t_f180.dy
    offset = np.where(wide, np.maximum(sig * y_a, -sig * (t_bt90.dy + t_f90.dy)), -sig * t_f180.dy)
    t_bl = np.where(wide, (offset + sig * (t_bt90.dy + t_f90.dy)) / gs_b, 0.0)
    t_bt = _pick_turn(wide, t_bt90, None, "base turn", 0.5 * np.pi)
    t_fin = _pick_turn(wide, t_f90, t_f180, "final turn", np.pi)
    reasons = (t.reasons | _flag(ok_b | ~wide, R_WIND)
               | _flag(~wide | ((t_bt90.prof.angle < np.pi) & (t_f90.prof.angle < np.pi)), R_TURN_REVERSED))
    x_ri, y_ri = -k.d_m - t_fin.dx - t_bt.dx, sig * offset
    reasons = reasons | _flag(offset > 0.0, R_WRONG_SIDE)
    t_j = (offset - sig * y_a) / (sig * t.g0y)
    x_j = x0 + t.g0x * t_j + t_join.dx
    first = [k.straight(psi0, t.g0x, t.g0y, t_j, "arrival", k.c0_rad), t_join]
    final_side = [t_bt, k.straight(np.where(wide, psi_b, psi_d), zero, -sig * gs_b, t_bl, "base",
                                   np.where(wide, trk_b, np.pi)), t_fin]
    return _downwind_and_final(k, t, reasons, first, final_side, x_j, t_j, x_ri, y_ri, offset)


def _solve_break_and_return(k: _Kernel, t: _Tracks, break_rad: float) -> _ShapeSteps:
    """Break turn away from the runway, break leg, turn onto the downwind, downwind, final turn."""
    sig, zero, x0, y0, v = k.sig, k.zero, k.x0, k.y0, k.v
    psi0 = t.psi0
    psi_b = psi0 - sig * break_rad
    t_fin, t_brk, t_join = yield (
        _final_turn_spec(k, t), (psi0, break_rad + zero, -sig, "break turn", break_rad + zero),
        (psi_b, _Wrap(sig * (t.psi_d - psi_b)), sig, "turn downwind",
         _Wrap(sig * (np.pi - k.c0_rad) + break_rad)))
    x_ri, y_ri = -k.d_m - t_fin.dx, -t_fin.dy
    offset = sig * y_ri
    reasons = t.reasons | _flag(offset > 0.0, R_WRONG_SIDE)
    gbx, gby = v * np.cos(psi_b) + k.wx, v * np.sin(psi_b) + k.wy
    reasons = reasons | _flag(sig * gby > _SMALL_GS, R_BREAK_BACK)
    t_j = (y_ri - y0 - t_brk.dy - t_join.dy) / gby
    x_j = x0 + t_brk.dx + gbx * t_j + t_join.dx
    first = [t_brk, k.straight(psi_b, gbx, gby, t_j, "break leg", None), t_join]
    return _downwind_and_final(k, t, reasons, first, [t_fin], x_j, t_j, x_ri, y_ri, offset)


def _solve_teardrop(k: _Kernel, t: _Tracks, teardrop_rad: float) -> _ShapeSteps:
    """Outbound leg, offset turn, offset leg, one turn onto final: a 2x2 linear system."""
    sig, zero, x0, y0, v, d_m = k.sig, k.zero, k.x0, k.y0, k.v, k.d_m
    psi0, g0x, g0y = t.psi0, t.g0x, t.g0y
    psi_t = psi0 - sig * teardrop_rad
    t_off, t_fin = yield ((psi0, teardrop_rad + zero, -sig, "offset turn", teardrop_rad + zero),
                          (psi_t, _Wrap(sig * (t.psi_f - psi_t)), sig, "final turn",
                            _Wrap(-sig * k.c0_rad + teardrop_rad)))
    gtx, gty = v * np.cos(psi_t) + k.wx, v * np.sin(psi_t) + k.wy
    bx = -d_m - x0 - t_off.dx - t_fin.dx
    by = -y0 - t_off.dy - t_fin.dy
    det = g0x * gty - g0y * gtx
    t1 = (bx * gty - by * gtx) / det                  # Cramer's rule, 2x2
    t2 = (g0x * by - g0y * bx) / det
    x_ri, y_ri = -d_m - t_fin.dx, -t_fin.dy
    offset = sig * y_ri
    reasons = (t.reasons | _flag(np.abs(det) > _SMALL_GS * v, R_NO_CONVERGE)
               | _flag((t1 >= 0.0) & (t2 >= 0.0), R_NEG_LEG) | _flag(offset > 0.0, R_WRONG_SIDE))
    legs = [k.straight(psi0, g0x, g0y, t1, "outbound", k.c0_rad), t_off,
            k.straight(psi_t, gtx, gty, t2, "offset leg", None), t_fin, t.final()]
    return _Solved(legs=legs, reasons=reasons, x_ri=x_ri, y_ri=y_ri, offset=offset, roll_out=d_m,
                   break_s=t2)


def _solve_direct_turn(k: _Kernel, t: _Tracks, d_stab_m: float) -> _ShapeSteps:
    """Hold the arrival course until one turn rolls out on the centreline (roll-out a result)."""
    sig, zero, x0, y0 = k.sig, k.zero, k.x0, k.y0
    psi0, g0x, g0y = t.psi0, t.g0x, t.g0y
    ang = _wrap_2pi(sig * (t.psi_f - psi0))
    (t_fin,) = yield ((psi0, ang, sig, "final turn", _Wrap(-sig * k.c0_rad)),)
    t1 = -(y0 + t_fin.dy) / g0y
    x_ri, y_ri = x0 + g0x * t1, y0 + g0y * t1
    roll_out = -(x_ri + t_fin.dx)
    offset = sig * y_ri
    reasons = (t.reasons | _flag(np.abs(g0y) > _SMALL_GS * k.v, R_NO_CONVERGE) | _flag(ang <= np.pi, R_WRONG_SIDE)
               | _flag(t1 >= 0.0, R_NEG_LEG) | _flag(roll_out >= d_stab_m - 1e-6, R_TOO_CLOSE))
    final_leg = k.straight(t.psi_f, t.gs_f, zero, roll_out / t.gs_f, "final", 0.0)
    legs = [k.straight(psi0, g0x, g0y, t1, "arrival", k.c0_rad), t_fin, final_leg]
    return _Solved(legs=legs, reasons=reasons, x_ri=x_ri, y_ri=y_ri, offset=offset, roll_out=roll_out)


def _solve_overfly_circuit(k: _Kernel, t: _Tracks, circuit_turn_x_m: float) -> _ShapeSteps:
    """Upwind leg to the crosswind turn point, then the rectangular circuit on the chosen side."""
    sig, zero, x0, y0, v = k.sig, k.zero, k.x0, k.y0, k.v
    psi0, psi_d, g0x, g0y = t.psi0, t.psi_d, t.g0x, t.g0y
    # tracks: crosswind sigma*90 (outward), downwind 180, base -sigma*90 (inward)
    trk_x, trk_b = sig * (0.5 * np.pi), -sig * (0.5 * np.pi)
    psi_x, gs_x, ok_x = wind_triangle(trk_x, v, k.wx, k.wy)
    psi_b, gs_b, ok_b = wind_triangle(trk_b, v, k.wx, k.wy)
    t_up = np.maximum((circuit_turn_x_m - x0) / g0x, 0.0)
    t_cw, t_dwt, t_bt, t_fin = yield (
        (psi0, _Wrap(sig * (psi_x - psi0)), sig, "crosswind turn", _Wrap(0.5 * np.pi - sig * k.c0_rad)),
        (psi_x, _Wrap(sig * (psi_d - psi_x)), sig, "downwind turn", 0.5 * np.pi + zero),
        (psi_d, _Wrap(sig * (psi_b - psi_d)), sig, "base turn", 0.5 * np.pi + zero),
        (psi_b, _Wrap(sig * (t.psi_f - psi_b)), sig, "final turn", 0.5 * np.pi + zero))
    y_a = y0 + g0y * t_up + t_cw.dy + t_dwt.dy            # downwind y with no crosswind leg
    y_b = -(t_bt.dy + t_fin.dy)                            # downwind y with no base leg
    offset = np.maximum(sig * y_a, sig * y_b)               # the smaller offset both ends reach
    t_xw = (offset - sig * y_a) / gs_x
    t_bl = (offset - sig * y_b) / gs_b
    x_j = x0 + g0x * t_up + t_cw.dx + t_dwt.dx
    x_ri, y_ri = -k.d_m - t_fin.dx - t_bt.dx, sig * offset
    t_dw = (x_j - x_ri) / t.gs_d
    reversed_ = (t_dwt.prof.angle < np.pi) & (t_bt.prof.angle < np.pi) & (t_fin.prof.angle < np.pi)
    reasons = (t.reasons | _flag(ok_x & ok_b, R_WIND) | _flag(g0x > _SMALL_GS * v, R_NO_CONVERGE)
               | _flag(reversed_, R_TURN_REVERSED) | _flag(offset > 0.0, R_WRONG_SIDE)
               | _flag(t_dw >= 0.0, R_INSIDE_TURN))
    legs = [k.straight(psi0, g0x, g0y, t_up, "upwind", k.c0_rad), t_cw,
            k.straight(psi_x, zero, sig * gs_x, t_xw, "crosswind", trk_x), t_dwt,
            k.straight(psi_d, -t.gs_d, zero, t_dw, "downwind", math.pi), t_bt,
            k.straight(psi_b, zero, -sig * gs_b, t_bl, "base", trk_b), t_fin, t.final()]
    return _Solved(legs=legs, reasons=reasons, x_ri=x_ri, y_ri=y_ri, offset=offset, roll_out=k.d_m,
                   abeam_s=-x_ri / t.gs_d, break_s=t_up)


def _chain_starts(legs: list[LegArrays], x0: float, y0: float, zero: FloatArray) -> None:
    """Set each leg's start point: the end of the leg before (the legs are new: no copy)."""
    x, y = x0 + zero, y0 + zero
    for leg in legs:
        object.__setattr__(leg, "x0", x)
        object.__setattr__(leg, "y0", y)
        if leg.kind == "turn":
            x, y = x + leg.dx, y + leg.dy
        else:
            x, y = x + leg.gx * leg.duration, y + leg.gy * leg.duration


def solve_shape(shape: Shape, *, sigma: npt.ArrayLike, tas_mps: float, wx: npt.ArrayLike, wy: npt.ArrayLike,
                bank_rad: npt.ArrayLike, roll_rate_rad: float | None, x0: float, y0: float, c0_rad: float,
                d_m: float | FloatArray, d_stab_m: float, break_rad: float, teardrop_rad: float,
                circuit_turn_x_m: float = 0.0, turns: Sequence[LegArrays] | None = None,
                made: list[LegArrays] | None = None) -> ShapeSolution:
    """Solve one plan shape over broadcast arrays of sides, winds and banks (array kernel).

    Parameters are in SI and radians; ``sigma`` = +1 right side, -1 left side. Every output
    array has the broadcast shape of (sigma, wx, wy, bank_rad). Where ``ok`` is False the
    numbers are not meaningful and ``reasons`` holds the R_* flags. ``circuit_turn_x_m`` is
    the overfly circuit's earliest crosswind turn point, x past the landing threshold.

    Notes
    -----
    See the module docstring: the turn displacements are closed form, the leg times come from
    linear equations in y (and x for the teardrop); the circuit's crosswind and base legs from
    a maximum of two such solutions. One step per shape (``_solve_<shape>``), after the tracks
    every shape shares (:class:`_Tracks`); then the legs' start points are chained.

    A turn does not depend on the roll-out distance: ``made`` (a list) receives the shape's turn
    legs as they are made, and ``turns`` gives them back to a solve of the same shape, rows
    (sides, winds, banks) and inputs at other roll-out distances, which then makes none (the
    legs given become the solution's: give legs of their own, e.g. from :func:`turn_rows`).
    """
    return solve_shapes((shape,), sigma=sigma, tas_mps=tas_mps, wx=wx, wy=wy, bank_rad=bank_rad,
                        roll_rate_rad=roll_rate_rad, x0=x0, y0=y0, c0_rad=c0_rad, d_m=d_m, d_stab_m=d_stab_m,
                        break_rad=break_rad, teardrop_rad=teardrop_rad, circuit_turn_x_m=circuit_turn_x_m,
                        turns=(turns,), made=(made,))[0]


def _shape_steps(shape: Shape, k: _Kernel, t: _Tracks, d_stab_m: float, break_rad: float, teardrop_rad: float,
                 circuit_turn_x_m: float) -> _ShapeSteps:
    if shape == "downwind-join":
        return _solve_downwind_join(k, t)
    if shape == "break-and-return":
        return _solve_break_and_return(k, t, break_rad)
    if shape == "teardrop":
        return _solve_teardrop(k, t, teardrop_rad)
    if shape == "direct-turn":
        return _solve_direct_turn(k, t, d_stab_m)
    return _solve_overfly_circuit(k, t, circuit_turn_x_m)


def solve_shapes(shapes: Sequence[Shape], *, sigma: npt.ArrayLike, tas_mps: float, wx: npt.ArrayLike,
                 wy: npt.ArrayLike, bank_rad: npt.ArrayLike, roll_rate_rad: float | None, x0: float, y0: float,
                 c0_rad: float, d_m: float | FloatArray, d_stab_m: float, break_rad: float, teardrop_rad: float,
                 circuit_turn_x_m: float = 0.0, turns: Sequence[Sequence[LegArrays] | None] | None = None,
                 made: Sequence[list[LegArrays] | None] | None = None) -> list[ShapeSolution]:
    """:func:`solve_shape` of several shapes on the same rows, in one pass: the tracks every shape
    uses are solved once, and every turn of every shape in one call of the turn kernels (each
    shape's ``_solve_<shape>`` hands its turns over and gets them back); elementwise, so each
    shape's numbers are its solve alone to the last bit. ``turns``, ``made``: per shape, as
    :func:`solve_shape`'s."""
    for shape in shapes:
        if shape not in SHAPES:
            raise DomainError(f"unknown plan shape {shape!r}; expected one of {SHAPES}")
    n = len(shapes)
    given = [None] * n if turns is None else list(turns)
    makes = [None] * n if made is None else list(made)
    k = _Kernel(sigma=sigma, tas_mps=tas_mps, wx=wx, wy=wy, bank_rad=bank_rad, roll_rate_rad=roll_rate_rad, x0=x0,
                y0=y0, c0_rad=c0_rad, d_m=d_m)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        t = _Tracks(k)
        steps = [_shape_steps(shape, k, t, d_stab_m, break_rad, teardrop_rad, circuit_turn_x_m) for shape in shapes]
        specs = [next(st) for st in steps]
        todo = [sp for sps, gv in zip(specs, given) if gv is None for sp in sps]
        fresh = k.turns(*todo) if todo else []
        cols = (_SolveColumns(k, fresh, (tuple(shapes), tuple(gv is None for gv in given)))
                if k.zero.ndim == 1 else None)
        solved = []
        for st, sps, gv, mk in zip(steps, specs, given, makes):
            if gv is None:
                legs, fresh = fresh[:len(sps)], fresh[len(sps):]
                if mk is not None:
                    mk.extend(legs)
            elif len(gv) != len(sps):
                raise DomainError(f"{len(gv)} turns given where the shape makes {len(sps)}")
            else:
                legs = list(gv)
            try:
                st.send(legs)
            except StopIteration as done:
                solved.append(done.value)
            else:
                raise RuntimeError("a shape's solve hands its turns over once")
        for sv in solved:
            _chain_starts(sv.legs, x0, y0, k.zero)
    return [_solution(shape, sv, k, t, None if cols is None else cols.shape(sv.legs)) for shape, sv in zip(shapes, solved)]


def _solution(shape: Shape, s: _Solved, k: _Kernel, t: _Tracks, columns: _ShapeColumns | None) -> ShapeSolution:
    zero, legs = k.zero, s.legs
    reasons = s.reasons
    if type(reasons) is not np.ndarray or reasons.dtype != np.int64 or reasons.shape != zero.shape:
        reasons = np.asarray(reasons, dtype=np.int64) + np.zeros(zero.shape, dtype=np.int64)
    # (else: a shape's reasons are its own array, made by its solve: taken as they are)
    return ShapeSolution(shape=shape, ok=reasons == 0, reasons=reasons, legs=tuple(legs), x_ri=s.x_ri + zero,
                         y_ri=s.y_ri + zero, offset=s.offset + zero, roll_out_d=s.roll_out + zero,
                         abeam_s=None if s.abeam_s is None else s.abeam_s + zero,
                         break_s=None if s.break_s is None else s.break_s + zero,
                         psi_f=t.psi_f, gs_f=t.gs_f, psi_d=t.psi_d, gs_d=t.gs_d,
                         final_turn=[i for i, lg in enumerate(legs) if lg.name == "final turn"][0],
                         turns_to_final=tuple(i for i, lg in enumerate(legs) if lg.name in ("base turn", "final turn")),
                         wx=k.wx, wy=k.wy, columns=columns)


_N_BLOCK = 11       # the fields of a turn in _Kernel.block
_STRAIGHT_LEG, _BLOCK_TURN, _LOOSE_TURN = 0, 1, 2
_LEG_ROWS = (6, 2, 13)      # rows of each kind of leg outside the turn block
_COLUMN_PLANS: dict[tuple, tuple | None] = {}
"""Per kind of solve (its shapes, its number of turns made, which shapes were given theirs):
each shape's kind of each leg and its rows (see :class:`_SolveColumns`); the same code path
makes the same legs, so the rows are found once."""


class _SolveColumns:
    """Every field sampling reads of the legs of one solve's shapes (rows over one axis), as the
    rows of one array (F, M), made when first read: the turns made by the solve's one call of
    the turn kernels as their blocks (:attr:`_Kernel.block`, no copy per turn), then the zero
    and one rows, the wind, and every other field of each leg in :class:`SamplingRows`' order.
    A solve whose columns are never read pays for none of it."""

    __slots__ = ("k", "block", "fresh", "key", "shapes", "idx", "cols")

    def __init__(self, k: _Kernel, fresh: list[LegArrays], key: tuple) -> None:
        self.k, self.fresh, self.key, self.block = k, fresh, key, None
        self.shapes: list[tuple[LegArrays, ...]] = []
        self.idx: list[list[int]] | None = None
        self.cols: FloatArray | None = None

    def shape(self, legs: list[LegArrays]) -> _ShapeColumns:
        self.shapes.append(tuple(legs))
        return _ShapeColumns(self, len(self.shapes) - 1)

    def _plan(self) -> tuple | None:
        """Each shape's kind of each leg and its rows (None: not every field is an array of the rows)."""
        t = len(self.fresh)
        kernel_at = {id(lg): i for i, lg in enumerate(self.fresh)}
        at = _N_BLOCK * t + 4       # zero, one, wx, wy first
        codes, idx = [], []
        for legs in self.shapes:
            cs, rows = [], []
            for lg in legs:
                i = kernel_at.get(id(lg)) if lg.kind == "turn" else None
                c = _STRAIGHT_LEG if lg.kind == "straight" else _LOOSE_TURN if i is None else _BLOCK_TURN
                if c == _BLOCK_TURN:
                    rows += [i, t + i, 2 * t + i, 3 * t + i, 4 * t + i, 5 * t + i, 6 * t + i, 7 * t + i, at, at + 1,
                             8 * t + i, 9 * t + i, 10 * t + i]
                else:
                    rows += range(at, at + _LEG_ROWS[c])
                at += _LEG_ROWS[c]
                cs.append(c)
            codes.append(tuple(cs))
            idx.append(rows + [_N_BLOCK * t + 2, _N_BLOCK * t + 3])
        return tuple(codes), idx

    def rows(self, n: int) -> list[int] | None:
        """The rows of shape ``n``'s fields and the wind (None: a field is not an array of the rows)."""
        if self.idx is None:
            if self.block is None:      # the turn block, if every array of it is (turns, rows)
                k, fresh = self.k, self.fresh
                m = k.zero.shape[0]
                ok = bool(fresh) and all(type(b) is np.ndarray and b.shape == (len(fresh), m) for b in k.block)
                self.block = k.block if ok else []
                self.fresh = fresh if ok else []
                self.key = self.key + (len(self.fresh),)
            plan = _COLUMN_PLANS.get(self.key, False)
            if plan is False:
                plan = self._plan()
                if self.array(plan[0]) is None:
                    plan = None
                _COLUMN_PLANS[self.key] = plan
            if plan is None or self.array(plan[0]) is None:
                return None
            self.idx = plan[1]
        return self.idx[n]

    def array(self, codes: tuple | None = None) -> FloatArray | None:
        """Every row, made once (the turn block, zero, one, wind, each leg's other fields; None:
        a field is not an array of the rows). ``codes``: each shape's kind of each leg."""
        if self.cols is None and codes is not None:
            k = self.k
            m = k.zero.shape[0]
            loose = [k.zero, np.ones(m), k.wx, k.wy]
            for legs, cs in zip(self.shapes, codes):
                for lg, c in zip(legs, cs):
                    if c == _STRAIGHT_LEG:
                        loose += (lg.duration, lg.x0, lg.y0, lg.psi0, lg.gx, lg.gy)
                    elif c == _BLOCK_TURN:
                        loose += (lg.x0, lg.y0)
                    else:
                        pr = lg.prof
                        loose += (pr.angle, pr.tas, pr.tr, pr.tc, pr.dp, pr.wp, pr.c, pr.total, lg.x0, lg.y0, lg.psi0,
                                  lg.sign, lg.nominal_rows)
            try:
                rest = np.concatenate(loose)
            except ValueError:          # a number, or arrays of other dimensions
                return None
            if rest.shape != (len(loose) * m,) or rest.dtype != np.float64:
                return None
            rest = rest.reshape(len(loose), m)
            self.cols = np.concatenate(self.block + [rest]) if self.block else rest    # type: ignore[operator]
        return self.cols


class _ShapeColumns:
    """One shape's rows of its solve's :class:`_SolveColumns` (not a field-by-field part of the
    solution: no ``__slots__`` to walk)."""

    def __init__(self, solve: _SolveColumns, n: int) -> None:
        self.solve, self.n = solve, n

    def rows(self) -> list[int] | None:
        return self.solve.rows(self.n)


Rows = (npt.NDArray[np.int_] | slice) if TYPE_CHECKING else object


def _take(value: object, rows: Rows, m: int) -> object:
    """The rows of an array over the M rows (anything else as it is)."""
    return value[rows] if type(value) is np.ndarray and value.ndim >= 1 and value.shape[0] == m else value


def _take_prof(pr: TurnProfile | None, rows: Rows, m: int) -> TurnProfile | None:
    if pr is None:
        return None
    t = _take
    return TurnProfile(angle=t(pr.angle, rows, m), tas=t(pr.tas, rows, m), tr=t(pr.tr, rows, m),
                       tc=t(pr.tc, rows, m), dp=t(pr.dp, rows, m), wp=t(pr.wp, rows, m), c=t(pr.c, rows, m),
                       k=pr.k, total=t(pr.total, rows, m))


def _take_leg(lg: LegArrays, rows: Rows, m: int) -> LegArrays:
    """A leg's rows; a turn's calm-wind angle (its sample count) becomes the largest of those rows'."""
    t = _take
    nominal_rows = t(lg.nominal_rows, rows, m)
    nominal = lg.nominal_rad
    if nominal_rows is not None and nominal_rows.size:
        nominal = float(np.max(nominal_rows))
    return LegArrays(kind=lg.kind, name=lg.name, duration=t(lg.duration, rows, m), x0=t(lg.x0, rows, m),
                     y0=t(lg.y0, rows, m), psi0=t(lg.psi0, rows, m), gx=t(lg.gx, rows, m), gy=t(lg.gy, rows, m),
                     track_rad=t(lg.track_rad, rows, m), prof=_take_prof(lg.prof, rows, m),
                     sign=t(lg.sign, rows, m), dx=t(lg.dx, rows, m), dy=t(lg.dy, rows, m), nominal_rad=nominal,
                     nominal_rows=nominal_rows)


def take_rows(sol: ShapeSolution, rows: Rows) -> ShapeSolution:
    """The rows ``rows`` of a solution solved over one leading axis of M rows (winds, levels, sides);
    a slice gives views of the solution's arrays (read only: nothing here writes into them)."""
    m = sol.ok.shape[0]
    t = _take
    return ShapeSolution(shape=sol.shape, ok=t(sol.ok, rows, m), reasons=t(sol.reasons, rows, m),
                         legs=tuple([_take_leg(lg, rows, m) for lg in sol.legs]), x_ri=t(sol.x_ri, rows, m),
                         y_ri=t(sol.y_ri, rows, m), offset=t(sol.offset, rows, m),
                         roll_out_d=t(sol.roll_out_d, rows, m), abeam_s=t(sol.abeam_s, rows, m),
                         break_s=t(sol.break_s, rows, m), psi_f=t(sol.psi_f, rows, m), gs_f=t(sol.gs_f, rows, m),
                         psi_d=t(sol.psi_d, rows, m), gs_d=t(sol.gs_d, rows, m), final_turn=sol.final_turn,
                         turns_to_final=sol.turns_to_final, wx=t(sol.wx, rows, m), wy=t(sol.wy, rows, m))


def _gather(arrays: list[FloatArray], rows: Sequence[npt.NDArray[np.int_]]) -> FloatArray:
    """The rows of each array, end to end."""
    return arrays[0][rows[0]] if len(arrays) == 1 else np.concatenate([a[r] for a, r in zip(arrays, rows)])


_PROFILE_ROWS = ("angle", "tas", "tr", "tc", "dp", "wp", "c", "total")


def turn_rows(pieces: Sequence[tuple[Sequence[LegArrays], npt.NDArray[np.int_]]]) -> list[LegArrays]:
    """Turn legs made by solves of one shape (``made`` of :func:`solve_shape`), the rows given of
    each (legs, rows) piece end to end: new legs for a solve of those rows (its ``turns``; their
    start points are left for that solve to set)."""
    rows = [r for _, r in pieces]
    out = []
    for i in range(len(pieces[0][0])):
        legs = [made[i] for made, _ in pieces]
        a = legs[0]
        profs = [lg.prof for lg in legs]
        assert a.prof is not None and a.nominal_rows is not None
        pr = TurnProfile(k=a.prof.k, **{f: _gather([getattr(p, f) for p in profs], rows) for f in _PROFILE_ROWS})
        nominal = _gather([lg.nominal_rows for lg in legs], rows)
        out.append(LegArrays(kind="turn", name=a.name, duration=pr.total, psi0=_gather([lg.psi0 for lg in legs], rows),
                             prof=pr, sign=_gather([lg.sign for lg in legs], rows),
                             dx=_gather([lg.dx for lg in legs], rows), dy=_gather([lg.dy for lg in legs], rows),
                             nominal_rad=float(np.max(nominal, initial=0.0)), nominal_rows=nominal))
    return out


def _no_turn(before: LegArrays, like: LegArrays) -> LegArrays:
    """A turn of no angle and no time at the start of leg ``before``: its samples are all that
    point (the profile's speed and ramp constant from turn ``like``, so every number is finite)."""
    pr = like.prof
    assert pr is not None
    z = np.zeros(np.shape(before.duration))
    prof = TurnProfile(angle=z, tas=pr.tas + z, tr=z, tc=z, dp=z, wp=z, c=pr.c + z, k=pr.k, total=z)
    return LegArrays(kind="turn", name="none", duration=z, x0=before.x0, y0=before.y0, psi0=before.psi0, prof=prof,
                     sign=z + 1.0, dx=z, dy=z, nominal_rad=0.0, nominal_rows=z)


def _cat_rows(arrays: list[FloatArray], rows: Sequence[npt.NDArray[np.int_] | None]) -> FloatArray:
    """The rows of each array (all of them where None), end to end."""
    parts = [a if r is None else a[r] for a, r in zip(arrays, rows)]
    return parts[0] if len(parts) == 1 else np.concatenate(parts)


_TURN_PROF = ("angle", "tas", "tr", "tc", "dp", "wp", "c", "total")
_TURN_LEG = ("x0", "y0", "psi0", "sign", "nominal_rows")
_STRAIGHT = ("duration", "x0", "y0", "psi0", "gx", "gy")
_T_ANGLE, _T_DP, _T_TOTAL, _T_NOMINAL = 0, 4, 7, 12          # rows of a turn's fields (_leg_columns' order)
_TURN_GATHER = (0, 1, 2, 3, 4, 5, 6, 10, 11, 8, 9)           # _Turns' order: profile, psi0, sign, x0, y0


def _leg_columns(lg: LegArrays) -> list[FloatArray | float]:
    """The arrays of a leg that sampling reads, in :class:`SamplingRows`' order (a turn with no
    per-row calm-wind angle: its one angle)."""
    if lg.kind == "straight":
        return [getattr(lg, f) for f in _STRAIGHT]
    return ([getattr(lg.prof, f) for f in _TURN_PROF] + [lg.x0, lg.y0, lg.psi0, lg.sign]
            + [lg.nominal_rad if lg.nominal_rows is None else lg.nominal_rows])


def _sampled_fields(legs: Sequence[LegArrays], sol: ShapeSolution) -> list:
    """Every field sampling reads of ``legs`` (:func:`_leg_columns`), then the wind of ``sol``,
    each an array of the solution's shape (as it is when it is one, else broadcast to it)."""
    shp = sol.ok.shape
    fields = [c for lg in legs for c in _leg_columns(lg)] + [sol.wx, sol.wy]
    if all(type(c) is np.ndarray and c.shape == shp for c in fields):
        return fields
    return [np.broadcast_to(c, shp) for c in fields]


class SamplingRows:
    """What :func:`sample_solution` reads of a solution (or of several merged), structure of
    arrays: every field of every leg, then the wind (wx, wy), as the rows of one (F, M) array
    ``cols`` over the M tracks (a straight: duration, x0, y0, psi0, gx, gy; a turn: angle, tas,
    tr, tc, dp, wp, c, total, x0, y0, psi0, sign and its per-row calm-wind angle). ``at``: each
    leg's first row; ``nominal_rad``: each turn's calm-wind angle (0 for a straight; None: the
    largest of its rows); ``shape``: the solution's own broadcast shape (the tracks' order)."""

    __slots__ = ("ok", "cols", "kinds", "names", "k", "nominal_rad", "at", "shape")

    def __init__(self, ok: npt.NDArray[np.bool_], cols: FloatArray, like: Sequence[LegArrays],
                 nominal_rad: list[float] | None, shape: tuple[int, ...] | None = None) -> None:
        self.ok, self.cols = ok, cols
        self.shape = ok.shape if shape is None else shape
        self.kinds = [lg.kind for lg in like]
        self.names = [lg.name for lg in like]
        self.k = [0.0 if lg.prof is None else lg.prof.k for lg in like]
        self.at = [0]
        for kind in self.kinds:
            self.at.append(self.at[-1] + (6 if kind == "straight" else 13))
        if nominal_rad is None:     # the largest calm-wind angle of each turn's rows, every turn in one call
            nominal_rad = [0.0] * len(like)
            turns = [i for i, kind in enumerate(self.kinds) if kind == "turn"]
            if turns:
                big = cols[[self.at[i] + _T_NOMINAL for i in turns]].max(axis=1, initial=0.0).tolist()
                for i, v in zip(turns, big):
                    nominal_rad[i] = v
        self.nominal_rad = nominal_rad


def sampling_rows(sol: ShapeSolution, rows: Rows | None = None) -> SamplingRows:
    """The fields of ``sol`` that sampling reads as :class:`SamplingRows` (one copy of them all),
    of the rows ``rows`` of a solution over one axis (None: every track, in the solution's
    shape; a turn's calm-wind angle then is the solution's own, else the largest of the rows',
    as :func:`take_rows` makes it)."""
    shp = sol.ok.shape
    idx = None if sol.columns is None else sol.columns.rows()
    if idx is not None:         # rows of the solve's one array
        whole = sol.columns.solve.array()
        cols = whole[idx] if rows is None else whole[:, rows][idx] if isinstance(rows, slice) else whole[idx][:, rows]
        if rows is None:
            return SamplingRows(sol.ok, cols, sol.legs, [lg.nominal_rad for lg in sol.legs], shp)
        ok = sol.ok[rows]
        return SamplingRows(ok, cols, sol.legs, None if ok.size else [lg.nominal_rad for lg in sol.legs])
    fields = _sampled_fields(sol.legs, sol)
    cols = np.array(fields)
    if rows is None:
        return SamplingRows(sol.ok.reshape(-1), cols.reshape(len(fields), -1), sol.legs,
                            [lg.nominal_rad for lg in sol.legs], shp)
    ok = sol.ok[rows]
    return SamplingRows(ok, cols[:, rows], sol.legs, None if ok.size else [lg.nominal_rad for lg in sol.legs])


def merge_for_sampling(sols: list[ShapeSolution], rows: Sequence[npt.NDArray[np.int_] | None] | None = None
                       ) -> SamplingRows | None:
    """Solutions of several shapes (rows of one axis) as one, to be sampled in one call
    (:func:`sample_solution` with ``pad_rows``): their legs matched kind by kind, a shape with
    one leg fewer than the longest given a turn of no angle at its start (samples that repeat
    its arrival point: the same track points, one more time). None when the legs do not match,
    or the roll ramps differ. ``rows``: per solution, the rows taken (None: all), as
    :func:`take_rows` would; the solutions' rows end to end.
    """
    rows = [None] * len(sols) if rows is None else list(rows)
    n = max(len(sol.legs) for sol in sols)
    pre = _merge_plan(sols, n)
    if pre is None:
        return None
    if all(r is None for r in rows):
        merged = _merged_columns(sols, pre, n)
        if merged is not None:
            return merged
    legs = [(_no_turn(sol.legs[0], next(lg for lg in sol.legs if lg.kind == "turn")),) + sol.legs if p else sol.legs
            for sol, p in zip(sols, pre)]
    ok = _cat_rows([sol.ok for sol in sols], rows)
    # every field read, of every leg of a solution, as the rows of one array; the solutions' rows end to end
    parts = []
    for lgs, sol, r in zip(legs, sols, rows):
        fields = _sampled_fields(lgs, sol)
        parts.append(np.array(fields if r is None else [c[r] for c in fields]))
    cols = parts[0] if len(parts) == 1 else np.concatenate(parts, axis=1)
    whole = all(r is None for r in rows)
    nominal = [max(lg[i].nominal_rad for lg in legs) for i in range(n)] if whole else None
    return SamplingRows(ok, cols, legs[0], nominal)


def _merge_plan(sols: list[ShapeSolution], n: int) -> list[int] | None:
    """Per solution, 1 when :func:`merge_for_sampling` gives it a turn of no angle at its start,
    else 0; None when the legs do not match kind by kind (a final with a final, the same roll
    ramps)."""
    pre, like = [], None
    for sol in sols:
        lgs = sol.legs
        sig = [(lg.kind, lg.name == "final", None if lg.prof is None else lg.prof.k) for lg in lgs]
        p = 0
        if len(lgs) == n - 1 and lgs[0].kind == "straight":
            first = next((lg for lg in lgs if lg.kind == "turn"), None)
            if first is None:
                return None
            sig.insert(0, ("turn", False, first.prof.k))        # type: ignore[union-attr]
            p = 1
        if like is None:
            like = sig
        elif sig != like:
            return None
        pre.append(p)
    return pre


_MERGE_ROWS: dict[tuple, npt.NDArray[np.intp]] = {}
"""Per kind of solve and the shapes merged: the rows of its array gathered (see :func:`_merged_columns`)."""


def _merged_columns(sols: list[ShapeSolution], pre: list[int], n: int) -> SamplingRows | None:
    """:func:`merge_for_sampling` of whole solutions from the rows of their solves' arrays
    (None: a solution has none); a turn of no angle is rows of the solve (zeros, ones, the
    speed and ramp constant of the first turn, the start of the first leg)."""
    cs = [sol.columns for sol in sols]
    if any(c is None or c.rows() is None for c in cs):
        return None
    sc = cs[0].solve                                            # type: ignore[union-attr]
    one = all(c.solve is sc for c in cs)                        # type: ignore[union-attr]
    key = (sc.key, tuple(c.n for c in cs), tuple(pre)) if one else None    # type: ignore[union-attr]
    gather = _MERGE_ROWS.get(key) if one else None
    if gather is None:
        idx = []
        for sol, c, p in zip(sols, cs, pre):
            rows = c.rows()                                     # type: ignore[union-attr]
            if p:
                t = next(i for i, lg in enumerate(sol.legs) if lg.kind == "turn")
                at = 6 * t              # the legs before the first turn are straights
                z = _N_BLOCK * len(c.solve.fresh)               # type: ignore[union-attr]  # the zero row, then the one
                rows = [z, rows[at + 1], z, z, z, z, rows[at + 6], z, rows[1], rows[2], rows[3], z + 1, z] + rows
            idx.append(rows)
        if not one:
            cols = np.concatenate([c.solve.array()[i] for c, i in zip(cs, idx)], axis=1)    # type: ignore[union-attr]
        else:
            gather = _MERGE_ROWS[key] = np.ascontiguousarray(np.array(idx, dtype=np.intp).T)
    if gather is not None:          # one solve: one gather, the solutions' rows end to end
        cols = sc.array()[gather]
        cols = cols.reshape(cols.shape[0], -1)
    ok = sols[0].ok if len(sols) == 1 else np.concatenate([sol.ok for sol in sols])
    like = next(sol for sol, p in zip(sols, pre) if not p)
    nominal = [max(v) for v in zip(*[[0.0] * p + [lg.nominal_rad for lg in sol.legs] for sol, p in zip(sols, pre)])]
    return SamplingRows(ok, cols, like.legs, nominal)


def leg_end_distance_m(sol: ShapeSolution, runway_length_m: float) -> FloatArray:
    """Largest distance from the runway (threshold to far end) over the start points of the
    legs: exact track points, so a lower bound of the sampled track's largest distance. [m]"""
    d2 = np.zeros(sol.ok.shape)
    for lg in sol.legs:
        x = lg.x0
        d2 = np.maximum(d2, np.square(x - np.minimum(np.maximum(x, 0.0), runway_length_m)) + np.square(lg.y0))
    return np.sqrt(d2)


def solve_inputs(inputs: CircleInputs, shape: Shape, *, sigma: npt.ArrayLike, wx_mps: npt.ArrayLike,
                 wy_mps: npt.ArrayLike, bank_deg: npt.ArrayLike, descent: DescentGeometry | None = None,
                 roll_out_m: npt.ArrayLike | None = None, turns: Sequence[LegArrays] | None = None,
                 made: list[LegArrays] | None = None) -> ShapeSolution:
    """:func:`solve_shape` with the fixed parts taken from ``inputs`` (winds, sides, banks vary;
    ``roll_out_m`` may vary too: roll-out distances, default the descent geometry's; ``turns``
    and ``made``: turns solved once for several roll-outs, see :func:`solve_shape`). [m]"""
    return solve_inputs_shapes(inputs, (shape,), sigma=sigma, wx_mps=wx_mps, wy_mps=wy_mps, bank_deg=bank_deg,
                               descent=descent, roll_out_m=roll_out_m, turns=(turns,), made=(made,))[0]


_FEW_BANKS = 64     # up to this many rows, the bank range is checked on floats


def solve_inputs_shapes(inputs: CircleInputs, shapes: Sequence[Shape], *, sigma: npt.ArrayLike,
                        wx_mps: npt.ArrayLike, wy_mps: npt.ArrayLike, bank_deg: npt.ArrayLike,
                        descent: DescentGeometry | None = None, roll_out_m: npt.ArrayLike | None = None,
                        turns: Sequence[Sequence[LegArrays] | None] | None = None,
                        made: Sequence[list[LegArrays] | None] | None = None) -> list[ShapeSolution]:
    """:func:`solve_inputs` of several shapes on the same rows in one pass (:func:`solve_shapes`)."""
    b = np.asarray(bank_deg, dtype=float)
    # a few rows: each bank compared as a float (the same comparisons, NaN fails both)
    if not (all(0.0 < x < BANK_MAX_DEG for x in b.ravel().tolist()) if b.size <= _FEW_BANKS
            else ((b > 0.0) & (b < BANK_MAX_DEG)).all()):
        raise DomainError(f"bank_deg = {bank_deg}: a turn needs 0 < bank < 90")
    dg = descent if descent is not None else descent_geometry(inputs)
    rr = None if inputs.roll_rate_deg_per_s is None else math.radians(inputs.roll_rate_deg_per_s)
    return solve_shapes(shapes, sigma=sigma, tas_mps=inputs.tas_kt * KT_TO_MPS, wx=wx_mps, wy=wy_mps,
                        bank_rad=np.radians(b), roll_rate_rad=rr, x0=inputs.arrival_x_m, y0=inputs.arrival_y_m,
                        c0_rad=math.radians(inputs.arrival_course_deg),
                        d_m=dg.roll_out_distance_m if roll_out_m is None else np.asarray(roll_out_m, dtype=float),
                        d_stab_m=dg.stabilised_distance_m, break_rad=math.radians(inputs.break_angle_deg),
                        teardrop_rad=math.radians(inputs.teardrop_angle_deg),
                        circuit_turn_x_m=inputs.circuit_turn_past_threshold_m, turns=turns, made=made)


N_RAMP = 3
_RUNNING_PRODUCT_MIN_CELLS = 16     # below this many tracks, exp() directly beats the running product
_BLOCK_MAX_CELLS = 64               # from this many tracks, turns are sampled one by one (no padded block)
"""Samples per roll-in (and per roll-out) ramp when turns have roll ramps."""


def turn_sample_count(nominal_rad: float, turn_step_deg: float) -> int:
    """Samples of a turn's constant-bank arc: one per ``turn_step_deg`` of its calm-wind angle, >= 3."""
    return max(3, int(math.ceil(math.degrees(nominal_rad) / turn_step_deg - 1e-9)) + 1)


@dataclass(frozen=True, slots=True, kw_only=True)
class SolutionTrack:
    """Sampled tracks of a solved shape: ``xy`` (..., N, 2) [m]; with headings: ``heading``
    (..., N) [rad] and ``time`` (..., N) [s]; ``leg_index`` (N,) the leg of each sample."""

    xy: FloatArray
    heading: FloatArray | None
    time: FloatArray | None
    leg_index: npt.NDArray[np.int_]


def _row_counts(sr: SamplingRows, turn_step_deg: float, n_straight: int, straight_step_m: float | None,
                pad_rows: bool) -> tuple[list[int], npt.NDArray[np.int_] | None]:
    """Samples of each leg (the most of any row) and, with ``pad_rows``, each turn's arc samples
    per row (T, M) (each row's own calm-wind angle); every turn, and every straight, in one pass."""
    cols, ok, at = sr.cols, sr.ok, sr.at
    extra = 2 * N_RAMP if any(k > 0.0 for k in sr.k) else 0
    turns = [i for i, kind in enumerate(sr.kinds) if kind == "turn"]
    counts = [2] * len(sr.kinds)           # the final: the centreline from the roll-out to the threshold, its two ends
    per_row = None
    m = ok.shape[0]
    inner = [i for i, kind in enumerate(sr.kinds) if kind == "straight" and sr.names[i] != "final"]
    longest = _longest(sr, turns, inner) if straight_step_m is not None and (turns or inner) else []
    if turns and pad_rows and m:           # turn_sample_count of each row's own calm-wind angle
        per_row = np.maximum(3, np.ceil(np.degrees(cols[[at[i] + _T_NOMINAL for i in turns]]) / turn_step_deg - 1e-9)
                             .astype(np.int64) + 1)
        arcs = per_row.max(axis=1).tolist()
    elif turns:
        nominal = [sr.nominal_rad[i] for i in turns]
        if straight_step_m is not None and m:      # a plan's track: the larger of the calm and the actual angle
            nominal = [max(a, b) for a, b in zip(nominal, longest)]
        arcs = [turn_sample_count(a, turn_step_deg) for a in nominal]
    for i, n in zip(turns, arcs if turns else ()):
        counts[i] = n + extra
    if straight_step_m is None:
        for i in inner:
            counts[i] = n_straight
    elif inner:      # one point per straight_step_m of the longest ok row
        for i, d in zip(inner, longest[len(turns):]):
            counts[i] = max(n_straight, int(math.ceil(d / straight_step_m)) + 1)
    return counts, per_row


def _longest(sr: SamplingRows, turns: list[int], inner: list[int]) -> list[float]:
    """The largest over the ok rows (0 without one) of each turn's actual angle A - 2 dp, then of
    each straight's length (duration x ground speed), in one gather and one reduction."""
    cols, ok, at, nt = sr.cols, sr.ok, sr.at, len(turns)
    g = cols.take([at[i] + f for f in (_T_ANGLE, _T_DP) for i in turns]
                  + [at[i] + f for f in (0, 4, 5) for i in inner], axis=0)          # one gather
    s = g[2 * nt:].reshape(3, len(inner), cols.shape[1])                             # duration, gx, gy
    arc = g[:nt] - 2.0 * g[nt:2 * nt]
    both = np.concatenate([arc, np.hypot(s[1], s[2]) * s[0]]) if nt and inner else arc if nt else \
        np.hypot(s[1], s[2]) * s[0]
    return np.maximum.reduce(np.where(ok, both, 0.0), axis=1, initial=0.0).tolist()     # .max(axis=1)


def _cx(a: FloatArray) -> npt.NDArray[np.complex128]:
    """A float array as complex (a + 0j, exact): an operation with a complex operand then needs no
    casting pass (the same complex loop on the same values, so the same bits, at a third of the cost)."""
    return a.astype(np.complex128)


class _Turns:
    """Every turn of a group stacked on axis 1, as arrays (1, T, M) (samples on axis 0, so that a
    sample of every turn is one contiguous block, as a sample of one turn was): profile fields,
    entry heading and point, sign, start time; ``den`` each row's arc steps (its own sample
    count - 1), ``fa`` (na, T, M) the fractions of the arc at the samples (k / den up to a row's
    own count, then 1), ``pad`` True past a row's own count."""

    __slots__ = ("angle", "tas", "tr", "tc", "dp", "wp", "c", "k", "psi0", "sign", "p0", "t0", "den", "fa", "pad",
                 "na")

    def __init__(self, sr: SamplingRows, grp: list[int], t0: FloatArray | None, na: list[int],
                 den: npt.NDArray[np.int_] | None) -> None:
        m = sr.ok.shape[0]
        every = sr.cols.take([sr.at[i] + f for f in _TURN_GATHER for i in grp], axis=0).reshape(
            len(_TURN_GATHER), 1, len(grp), m)                       # one copy of them all
        self.angle, self.tas, self.tr, self.tc, self.dp, self.wp, self.c, self.psi0, self.sign = every[:9]
        self.k = sr.k[grp[0]]
        xy0 = every[9:11].astype(np.complex128)        # (complex operands: no casting pass per operation)
        self.p0 = xy0[0] + 1j * xy0[1]
        self.t0 = t0
        self.na = max(na)
        if den is None:         # every row of a turn at its count: the same arrays at every call of these counts
            self.den, self.fa, self.pad = _arc_fractions(tuple(na), m)
        else:
            self.den, self.fa, self.pad = _fractions_of(den[None], self.na)


_ARC_FRACTIONS: dict[tuple[tuple[int, ...], int], tuple] = {}


def _arc_fractions(na: tuple[int, ...], m: int) -> tuple:
    """:func:`_fractions_of` of turns of ``na`` arc samples each, every one of the ``m`` rows at
    its turn's count, made once per (counts, rows) (read-only; a few hundred kinds at most)."""
    return _made_once(_ARC_FRACTIONS, (na, m), lambda: _fractions_of(
        np.array([n - 1 for n in na])[:, None].repeat(m, axis=1)[None], max(na)))


def _made_once(memo: dict, key: object, make: Callable[[], tuple]) -> tuple:
    """``make()``'s arrays for ``key``, made once and kept read-only in ``memo`` (the same numbers at
    every call of that key); a memo of 256 kinds starts again."""
    f = memo.get(key)
    if f is None:
        if len(memo) >= 256:
            memo.clear()
        f = make()
        for a in f:
            a.flags.writeable = False
        memo[key] = f
    return f


def _fractions_of(den: npt.NDArray[np.int_], na: int) -> tuple:
    """``den`` (1, T, M) each row's arc steps, ``fa`` (na, T, M) the arc fractions k / den up to
    a row's own count then 1, ``pad`` True past it."""
    k = np.arange(na, dtype=np.float64).reshape((na, 1, 1))
    d = den.astype(np.float64)         # (whole numbers: exact; float loops, the same quotients)
    return den, np.minimum(k, d) / d, k > d     # k / (n - 1) up to the row's n, then 1


_RAMP_FRACTIONS: dict[int, tuple[FloatArray, ...]] = {}


def _ramp_fractions(nr: int) -> tuple[FloatArray, ...]:
    """The ramp samples' fractions of the ramp time, (nr, 1, 1) each, the same numbers at every
    call (made once, read-only): the roll-in's k/nr, the roll-out's 1 - k/nr - 1/nr (= (nr-1-k)/nr),
    the roll-out samples' time after the arc k/nr + 1/nr, the roll-in's then the roll-out's
    (2 nr, 1, 1), and every ramp sample's of :func:`_ramp_times` (2 nr + 1, 1, 1)."""
    def make() -> tuple[FloatArray, ...]:
        fr = (np.arange(nr) / nr).reshape((nr, 1, 1))
        out = 1.0 - fr - 1.0 / nr
        return fr, out, fr + 1.0 / nr, np.concatenate([fr, out], axis=0), np.concatenate([fr, fr[:1] + 1.0, out], axis=0)
    return _made_once(_RAMP_FRACTIONS, nr, make)


def _turn_ramps(tn: _Turns, nr: int) -> tuple:
    """The roll-in and roll-out ramps of every turn, in one quadrature call: sample fractions
    (nr, 1, 1), roll-in times and air path (nr, T, M), the full ramp's Q(tr) (1, T, M), the
    roll-out samples' air path (nr, T, M)."""
    tr, c, v = tn.tr[0], tn.c[0], tn.tas[0]
    fr, every = _ramp_fractions(nr)[::4]
    u = _distinct_ramp_times(tr, c, v)
    if u is None:
        times = _ramp_times(tr, every)
        q_all = _known_q(tr, c, v, tn.k, nr)
        if q_all is None:
            q_all = ramp_q(times, c, v, tn.k)
    else:   # one TAS and roll rate: Q of each distinct ramp time once (the same numbers), then gathered
        times = _ramp_times(tr, fr)
        q_u = ramp_q(_ramp_times(u, every.reshape(-1, 1)), c.flat[0], v.flat[0], tn.k)
        _LAST_Q[0] = (tn.k, c.flat[0], v.flat[0], nr, u, q_u)
        q_all = q_u.take(u.searchsorted(tr), axis=1)
    return fr, times[:nr], q_all[:nr], q_all[nr:nr + 1], q_all[nr + 1:]


_LAST_Q: list[tuple | None] = [None]
"""The last ramps' Q of distinct ramp times (roll rate, c, TAS, nr, the times, Q (2 nr + 1, U)):
a plan's track samples rows of the batch sampled just before (judgement then plans)."""


def _known_q(tr: FloatArray, c: FloatArray, v: FloatArray, k: float, nr: int) -> npt.NDArray[np.complex128] | None:
    """The ramps' Q (2 nr + 1, T, M) of ramp times ``tr`` (T, M) taken from the last distinct ramp
    times' (:data:`_LAST_Q`), when every row has their roll rate, c and TAS and a ramp time of
    theirs (the same numbers as ramp_q of these times: each Q is its own time's, element by
    element); None otherwise (a ramp time of zero too: the times' order does not tell -0 from 0;
    more than 8 ramp times: the look-up is in Python)."""
    last = _LAST_Q[0]
    if last is None or last[0] != k or last[3] != nr or tr.size > 8:      # (a few rows: a plan's track)
        return None
    _, c0, v0, _, u, q_u = last
    for x in c.ravel().tolist():
        if x != c0:
            return None
    for x in v.ravel().tolist():
        if x != v0:
            return None
    flat = tr.ravel()
    idx = u.searchsorted(flat)
    times, n = u.tolist(), len(u)
    for i, t in zip(idx.tolist(), flat.tolist()):
        if not (i < n and times[i] == t and t > 0.0):
            return None
    return q_u.take(idx, axis=1).reshape((2 * nr + 1,) + tr.shape)


def _exps(*angles: FloatArray) -> list[npt.NDArray[np.complex128]]:
    """exp(i a) of each of ``angles`` (arrays (n, ...) of one trailing shape), in one call (each
    number as np.exp(1j * a) makes it: the same complex operations, element by element)."""
    if len(angles) == 1:
        return [np.exp(1j * _cx(angles[0]))]
    e = np.exp(1j * _cx(np.concatenate(angles, axis=0)))
    out, at = [], 0
    for a in angles:
        out.append(e[at:at + a.shape[0]])
        at += a.shape[0]
    return out


def _ramp_times(tr: FloatArray, fractions: FloatArray) -> FloatArray:
    """The times of the ramp samples (n, ...) at ``fractions`` (n, 1, ...) of the ramp times ``tr``:
    every one, (2 nr + 1, ...), the roll-in's tr k/nr, the full ramp tr (tr 1.0: the same number as
    tr + 0.0 (tr 0.0) for a finite or NaN tr), the roll-out's tr (nr-1-j)/nr."""
    return tr * fractions


def _distinct_ramp_times(tr: FloatArray, c: FloatArray, v: FloatArray) -> FloatArray | None:
    """The distinct full ramp times ``tr`` (sorted), when Q depends on the time alone (one ``c``
    and one TAS ``v`` everywhere) and they are few (an eighth of the times or fewer); else None.
    (A sort and a not-equal mask: np.unique without an inverse imports numpy.ma on its first call.)"""
    if tr.size <= 8:
        return None
    lo, hi = np.minimum.reduce(c, None), np.maximum.reduce(c, None)
    if not lo == hi or not np.minimum.reduce(v, None) == np.maximum.reduce(v, None):
        return None
    srt = tr.flatten()
    srt.sort()
    keep = np.empty(srt.size, dtype=bool)
    keep[:1] = True
    np.not_equal(srt[1:], srt[:-1], keep[1:])
    u = srt[keep]
    return u if u.size * 8 < srt.size else None


def _running_arc(a: npt.NDArray[np.complex128], first: npt.NDArray[np.complex128],
                 step: npt.NDArray[np.complex128], tn: _Turns) -> None:
    """a[k] = first step^k (step = exp(i step angle)), k = 0..na-1, by a running product over
    the samples (one complex multiply per point; rounding grows like k eps); samples past a row's
    own count repeat its last one. ``a``: (na, ...) contiguous (each sample a block apart from the others)."""
    a[0] = first
    mul, rows = np.multiply, list(a)             # each sample's view, made in one call
    for k in range(1, len(rows)):                # loop over samples, not cells
        mul(rows[k - 1], step, rows[k])          # (out positional: no keyword parsing)
    w = tn.den.size         # a row's last sample a[den] (np.take_along_axis without its wrapper): a flat take
    last = a.reshape(-1).take(tn.den.reshape(-1) * w + np.arange(w)).reshape(tn.den.shape)
    np.copyto(a, last, where=tn.pad)


def _sample_turns(tn: _Turns, nr: int, many: bool, wind: npt.ArrayLike, with_heading: bool,
                  blk: npt.NDArray[np.complex128] | None = None
                  ) -> tuple[npt.NDArray[np.complex128], FloatArray | None, FloatArray | None]:
    """Positions (2 nr + na, T, M) of every turn's samples -- the roll-in ramp (``nr`` points),
    the arc (``na``, a turn with fewer repeating its end), the roll-out ramp -- into ``blk``
    (contiguous; None: a new array), with headings and times (None without ``with_heading``)."""
    na = tn.na
    if blk is None:
        blk = np.empty((2 * nr + na,) + tn.angle.shape[1:], dtype=np.complex128)
    a_seg = blk[nr:nr + na]
    arc = tn.angle - 2.0 * tn.dp
    h_arc = None
    if not nr and many:     # instant bank, many tracks: p_k = C - i s r exp(i psi_k) + w t_k, C = p0 + i s r exp(i psi0)
        rot, step = _exps(tn.psi0, tn.sign * arc / tn.den)
        sr = tn.sign * (tn.tas / np.maximum(tn.wp, 1e-12))
        _running_arc(a_seg, (-1j * _cx(sr) * rot)[0], step[0], tn)
        a_seg += (tn.p0 + 1j * _cx(sr) * rot) + (wind * _cx(tn.tc)) * _cx(tn.fa)
        t_all, ramps = tn.tr + tn.tc * tn.fa, None
    else:
        r = tn.tas / np.maximum(tn.wp, 1e-12)
        ramps = _turn_ramps(tn, nr) if nr else None
        q_tr = ramps[3] if ramps is not None else np.zeros(tn.angle.shape, dtype=np.complex128)
        # the arc in the right-turn frame from heading 0: -i r (exp(i h) - exp(i dp)) + Q(tr)
        # exp(i angle) of the turn angle (with ramps), the entry heading, and the arc's: one call
        ends = (tn.angle, tn.psi0) if ramps is not None else (tn.psi0,)
        if not many:                                   # a few tracks: direct exponentials
            h_arc = tn.dp + arc * tn.fa                # (the arc's headings too)
            *ends, e_arc = _exps(*ends, h_arc)
            a_seg[...] = e_arc
        else:
            *ends, first, step = _exps(*ends, tn.dp, arc / tn.den)
            _running_arc(a_seg, first[0], step[0], tn)
        rot = ends[-1]
        a_end = a_seg[na - 1:] - a_seg[:1]
        a_seg -= a_seg[:1].copy()
        r_cx = _cx(r)
        a_seg *= -1j * r_cx
        a_seg += q_tr
        t_arc = tn.tr + tn.tc * tn.fa
        if ramps is not None:
            fr, tau_in, q_in, _, q_out = ramps
            e_a = ends[0]
            blk[:nr] = q_in
            arc_end = q_tr - 1j * r_cx * a_end
            blk[nr + na:] = arc_end + e_a * np.conj(q_tr) - e_a * np.conj(q_out)
            t_all = np.concatenate([tau_in, t_arc, tn.tr + tn.tc + tn.tr * _ramp_fractions(nr)[2]], axis=0)
        else:
            t_all = t_arc
        # left turns mirror (conjugate), then rotate to the entry heading, then drift
        im = blk.imag                                  # (a view: no copy back)
        im *= tn.sign
        blk *= rot
        blk += tn.p0 + wind * _cx(t_all)
    if not with_heading:
        return blk, None, None
    if ramps is None:       # heading relative to the entry heading, turn direction positive
        h = arc * tn.fa
    else:
        kt = tn.k * tn.tr          # kt times the roll-in's, then the roll-out's fractions (one product)
        h_ramp = tn.c * -np.log(np.cos(kt * _ramp_fractions(nr)[3]))
        h = np.concatenate([h_ramp[:nr], tn.dp + arc * tn.fa if h_arc is None else h_arc, tn.angle - h_ramp[nr:]],
                           axis=0)
    return blk, tn.psi0 + tn.sign * h, tn.t0 + t_all


def _turns_in_place(out: npt.NDArray[np.complex128], hdg: FloatArray | None, tim: FloatArray | None,
                    sr: SamplingRows, i: int, t0: FloatArray | None, counts: list[int], starts: list[int],
                    den: npt.NDArray[np.int_] | None, nr: int, many: bool, wind: npt.ArrayLike) -> None:
    """Sample turn ``i`` (a leg index) in place in ``out`` (and ``hdg``, ``tim``)."""
    tn = _Turns(sr, [i], t0, [counts[i] - 2 * nr], den)
    j, n = starts[i], counts[i]
    blocks = _sample_turns(tn, nr, many, wind, hdg is not None, out[j:j + n][:, None])
    for dst, blk in zip((hdg, tim), blocks[1:]):
        if dst is not None:
            dst[j:j + n] = blk[:, 0]


def _turn_pieces(parts: list[list], sr: SamplingRows, grp: list[int], t0: FloatArray | None, counts: list[int],
                 den: npt.NDArray[np.int_] | None, nr: int, many: bool, wind: npt.ArrayLike,
                 with_heading: bool) -> None:
    """Sample the turns ``grp`` (leg indices) in one block; each turn's (positions, headings,
    times) pieces into ``parts`` (a turn with fewer arc samples: its arc's own, then its ramp)."""
    na = [counts[i] - 2 * nr for i in grp]
    tn = _Turns(sr, grp, t0, na, den)
    blocks = _sample_turns(tn, nr, many, wind, with_heading)
    for b, (i, n_arc) in enumerate(zip(grp, na)):
        cuts = (slice(None),) if n_arc == tn.na else (slice(0, nr + n_arc), slice(nr + tn.na, None))
        parts[i] = [tuple(None if blk is None else blk[c, b] for blk in blocks) for c in cuts]


_STRAIGHT_FRACTIONS: dict[tuple[int, ...], tuple[FloatArray, npt.NDArray[np.complex128]]] = {}


def _straight_fractions(counts: tuple[int, ...]) -> tuple[FloatArray, npt.NDArray[np.complex128]]:
    """The fractions k/(n-1) of straights of ``counts`` points (S, n, 1) for n up to the most of
    any, and the same as complex, made once per counts (read-only; a few hundred kinds at most)."""
    def make() -> tuple[FloatArray, npt.NDArray[np.complex128]]:
        fr = (np.arange(max(counts), dtype=np.float64) / np.array([float(n - 1) for n in counts])[:, None])[..., None]
        return fr, _cx(fr)
    return _made_once(_STRAIGHT_FRACTIONS, counts, make)


def _straights(sr: SamplingRows, legs: list[int], counts: list[int], t_start: FloatArray | None
               ) -> tuple[FloatArray, ...]:
    """The straights ``legs`` (leg indices), ``counts`` points each at equal steps, both ends
    included: positions (S, n, M) for n up to the most of any (a straight's own count first),
    headings and times (None without ``t_start``, each leg's start time (L, M))."""
    g = sr.cols.take([sr.at[i] + f for f in range(6) for i in legs], axis=0).reshape(
        6, len(legs), 1, sr.cols.shape[1])                                           # (6, S, 1, M)
    d, psi0 = g[0], g[3]
    dc, xc, yc, _, gxc, gyc = g.astype(np.complex128)        # complex operands: no casting pass per operation
    f, f_cx = _straight_fractions(tuple([counts[i] for i in legs]))
    xy = (xc + 1j * yc) + ((gxc + 1j * gyc) * dc) * f_cx
    if t_start is None:
        return xy, None, None
    return xy, psi0.repeat(f.shape[1], axis=1), t_start.take(legs, axis=0)[:, None] + d * f


def sample_solution(sol: ShapeSolution | SamplingRows, *, turn_step_deg: float, n_straight: int,
                    straight_step_m: float | None = None, with_heading: bool = False,
                    running_product: bool | None = None, pad_rows: bool = False) -> SolutionTrack:
    """Sample every leg of a solved shape (vectorised): tracks of shape (..., N, 2).

    ``sol``: a solution, or the fields sampling reads (:func:`sampling_rows`,
    :func:`merge_for_sampling`). Each straight gets ``n_straight`` points (the final, on the
    centreline, only its two ends), each turn :func:`turn_sample_count` points on its
    constant-bank arc (from its calm-wind angle, so the count does not depend on the wind)
    plus, with roll ramps, ``N_RAMP`` points at equal times in each ramp. Both ends of every
    leg are included (joins appear twice); rows that are not ok hold garbage. With
    ``straight_step_m`` (a single plan's track) straights get one point per that many metres of
    their longest instance and arcs use the larger of the calm and the actual angle.
    ``running_product`` chooses how arc points are made (None: by the number of tracks); a batch
    whose rows must not depend on its size fixes it. ``pad_rows`` (a batch, without
    ``straight_step_m``): each row's turns get the count of that row's own calm-wind angle
    (rows of both sides in one call: the same points as each side alone), a row with fewer
    arc samples repeating its arc's end point up to the most of any row.

    Notes
    -----
    Positions are built as complex numbers x + i y (time axis first, contiguous rows) and
    returned as a float view. On the arc psi_k = psi_a + s (A - 2 dp) k/(n-1), so
    exp(i psi_k) = exp(i psi_a) exp(i s (A - 2 dp)/(n-1))^k: a running product over the samples,
    one complex multiply per point instead of two transcendental calls (rounding grows like
    k eps). The air arc from heading h0 is -i r (exp(i h) - exp(i h0)) in a right-turn frame;
    the ramps use the roll-in integral Q(tau) = C + i S and the roll-out its mirror
    exp(i A) conj(Q); a left turn is the complex conjugate; the wind adds (wx + i wy) t.
    Few tracks: every straight in one gather and every turn in one block (the calls are the
    cost); many: leg by leg in place (the arithmetic is: no padding to the longest arc).
    """
    if pad_rows and straight_step_m is not None:
        raise DomainError("pad_rows samples a batch: turns by their calm-wind angle only (no straight_step_m)")
    sr = sol if isinstance(sol, SamplingRows) else sampling_rows(sol)
    counts, per_row = _row_counts(sr, turn_step_deg, n_straight, straight_step_m, pad_rows)
    nr = N_RAMP if any(k > 0.0 for k in sr.k) else 0     # _row_counts added 2 N_RAMP ramp samples per turn
    m, nt, cols = sr.ok.shape[0], sum(counts), sr.cols
    wxy = cols[-2:].astype(np.complex128)      # complex operands: no casting pass per operation
    wind = wxy[0] + 1j * wxy[1]
    many = m >= _RUNNING_PRODUCT_MIN_CELLS if running_product is None else running_product
    starts = [0]
    for n in counts[:-1]:
        starts.append(starts[-1] + n)
    turns = [i for i, kind in enumerate(sr.kinds) if kind == "turn"]
    straights = [i for i, kind in enumerate(sr.kinds) if kind != "turn"]
    t_start = None
    if with_heading:        # each leg's start time: the durations before it added in order
        t_start = np.zeros((len(counts) + 1, m))
        t_start[1:] = cols.take([sr.at[i] + (_T_TOTAL if kind == "turn" else 0) for i, kind in enumerate(sr.kinds)],
                                axis=0)
        t_start = np.add.accumulate(t_start, axis=0)       # np.cumsum without its wrapper
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        if m < _BLOCK_MAX_CELLS:     # few tracks: every straight, and every turn, in one block; pieces joined
            parts: list[list] = [[] for _ in counts]
            if straights:
                blocks = _straights(sr, straights, counts, t_start)
                for s, i in enumerate(straights):
                    parts[i] = [tuple(None if blk is None else blk[s, :counts[i]] for blk in blocks)]
            if turns:
                _turn_pieces(parts, sr, turns, None if t_start is None else t_start.take(turns, axis=0)[None], counts,
                             None if per_row is None else per_row - 1, nr, many, wind, with_heading)
            pieces = [p for part in parts for p in part]
            out = np.concatenate([p[0] for p in pieces]) if pieces else np.empty((0, m), dtype=np.complex128)
            hdg = np.concatenate([p[1] for p in pieces]) if with_heading and pieces else None
            tim = np.concatenate([p[2] for p in pieces]) if with_heading and pieces else None
        else:                        # many: leg by leg, in place
            out = np.empty((nt, m), dtype=np.complex128)
            hdg = np.empty((nt, m)) if with_heading else None
            tim = np.empty((nt, m)) if with_heading else None
            if straights:
                for s, i in enumerate(straights):
                    blocks = _straights(sr, [i], counts, t_start)
                    for dst, blk in zip((out, hdg, tim), blocks):
                        if dst is not None:
                            dst[starts[i]:starts[i] + counts[i]] = blk[0]
            for q, i in enumerate(turns):
                _turns_in_place(out, hdg, tim, sr, i, None if t_start is None else t_start[[i]][None], counts, starts,
                                None if per_row is None else per_row[[q]] - 1, nr, many, wind)
    shp = sr.shape
    xy = np.ascontiguousarray(out.T).view(np.float64).reshape(shp + (nt, 2))
    leg_index = np.arange(len(counts)).repeat(counts)
    if hdg is None or tim is None:
        return SolutionTrack(xy=xy, heading=None, time=None, leg_index=leg_index)
    heading, time = hdg.T, tim.T
    if len(shp) != 1:
        heading, time = heading.reshape(shp + (nt,)), time.reshape(shp + (nt,))
    return SolutionTrack(xy=xy, heading=heading, time=time, leg_index=leg_index)
