"""Solved circling plans and the candidates for an arrival.

Runway frame, wind and plan shapes: see :mod:`briefer.core.manoeuvre.legs` and
:mod:`briefer.core.manoeuvre.solver`. Situations that are valid inputs but cannot be flown give a
``Plan`` with ``feasible=False`` and the reasons in words; nothing here raises for them.
Ranking is in :mod:`briefer.core.manoeuvre.ranking`, the missed approach from the circle in
:mod:`briefer.core.manoeuvre.missed`.

References
----------
.. [1] ICAO Doc 8168 Vol II, Part I, Section 4, Chapter 7 (visual manoeuvring area), 5th ed., 2006.
.. [2] FAA, Aeronautical Information Manual, 5-4-20 (circling: descend only when in a position to
   land with normal manoeuvres).
.. [3] Operator technique summarised in docs/REFERENCES.md section 9 (break 45 deg / 30 s,
   timing from abeam the threshold, ~3 deg descent, stabilised by 300 ft, common practice).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from briefer._dataclass import dataclass, field

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.legs import (
    FloatArray,
    Leg,
    State,
    Straight,
    StraightTrack,
    TrackSamples,
    Turn,
    sample_legs,
)
from briefer.core.manoeuvre.solver import (
    R_BREAK_BACK,
    R_INSIDE_TURN,
    R_NEG_LEG,
    R_NO_CONVERGE,
    R_TOO_CLOSE,
    R_TURN_REVERSED,
    R_WIND,
    R_WRONG_SIDE,
    DOWNWIND_SHAPES,
    SHAPES,
    SIDES,
    CircleInputs,
    DescentGeometry,
    Shape,
    ShapeSolution,
    Side,
    Rows,
    SamplingRows,
    SolutionTrack,
    applicable_candidates,
    descent_geometry,
    sample_solution,
    sampling_rows,
    solve_inputs,
)
from briefer.errors import DomainError
from briefer.units import KT_TO_MPS, M_TO_NM
from briefer.core.angles import wrap_180

from briefer.core.ufuncs import clip as _uclip

PLAN_TURN_STEP_DEG = 2.0          # a plan's track: a point every 2 deg of turn ...
PLAN_STRAIGHT_STEP_M = 100.0      # ... and every 100 m of straight
CONTINUOUS_TURN_S = 0.5           # a circuit leg shorter than this: the turns either side are one turn
JOIN_PAST_ABEAM_S = 1.0           # a join less than this much flight past abeam changes no whole-second timing


@dataclass(frozen=True, slots=True, kw_only=True)
class LeaveMda:
    """Where to leave the circling height (MDA) to descend on the glide path.

    Attributes
    ----------
    x_m, y_m : float
        Point in the runway frame. [m]
    heading_deg : float
        Heading there (runway frame, wrapped to [0, 360)). [deg]
    in_turn : bool
        True if the point is inside the turn onto final (the descent starts before the
        roll-out): the final turn, or an overfly circuit's base turn (``leg_name`` says which).
    leg_name : str
        Name of the leg holding the point ("final", "final turn", "downwind", ...).
    along_track_to_threshold_m : float
        Ground distance still to fly to the threshold from the point. [m]
    time_s : float
        Time from the start of the plan. [s]
    """

    x_m: float
    y_m: float
    heading_deg: float
    in_turn: bool
    leg_name: str
    along_track_to_threshold_m: float
    time_s: float

    def __post_init__(self) -> None:
        if not self.along_track_to_threshold_m >= 0.0:
            raise DomainError("along_track_to_threshold_m must be >= 0")


@dataclass(frozen=True, slots=True, kw_only=True)
class Plan:
    """One solved circling plan (or an infeasible candidate with its reasons).

    Attributes
    ----------
    shape : str
        One of ``SHAPES``.
    side : {"left", "right"}
        Side of the runway of the downwind (or from which a direct turn joins), looking in the
        landing direction; pattern turns are to that side.
    bank_deg, tas_kt : float
        Bank of every turn and TAS. [deg], [kt]
    feasible : bool
        False if the plan cannot be flown; then ``reasons`` says why and the numeric fields
        are None.
    reasons : tuple of str
        Why it cannot be flown (empty when feasible).
    notes : tuple of str
        Things the crew should know about a feasible plan (e.g. descent starts in the turn).
    inputs : CircleInputs
        The inputs it was solved from (with this bank).
    offset_m : float or None
        Lateral distance of the downwind (or of the roll-in point) from the centreline. [m]
    abeam_to_roll_in_s : float or None
        Seconds from abeam (or over) the threshold to the roll-in into the final turn (the
        base turn of an overfly circuit: the turn off the downwind); negative if the roll-in
        comes before abeam; None if the track never passes abeam. [s]
    roll_in_distance_m : float or None
        Roll-in point along the downwind past abeam the threshold (= -x of the roll-in;
        negative before abeam). [m]
    roll_in_xy_m : tuple of float or None
        Roll-in point of the final turn (circuit: of the base turn) in the runway frame. [m]
    break_off_s : float or None
        Solved time on the break leg (break-and-return), the crossing leg (downwind-join), the
        offset leg (teardrop) or the upwind leg (overfly-circuit); None for a direct turn. [s]
    roll_out_distance_m : float or None
        Roll-out (wings level on the centreline) distance before the threshold. [m]
    descent_point_m : float
        Where the glide path meets the circling height, before the threshold. [m]
    final_heading_deg, downwind_heading_deg : float or None
        Crab headings holding the final and the downwind tracks (runway frame). [deg]
    leave_mda : LeaveMda or None
        Where the descent from the circling height starts.
    legs : tuple of Leg
        The legs, the last one the final straight to the threshold; ``start`` is the arrival.
    leg_names, leg_times_s : tuple
        Name and duration of each leg. [s]
    total_time_s : float or None
        Arrival to threshold. [s]
    start : State
        Arrival state (heading crabbed on the arrival course).
    track_xy_m : ndarray (N, 2)
        Ground track, arrival to threshold, runway frame (empty when infeasible). [m]
    track_time_s, track_heading_deg : ndarray (N,)
        Time and heading of each track point. [s], [deg]
    track_leg_index : ndarray (N,)
        Leg of each track point.
    max_distance_from_threshold_m : float or None
        Largest distance from the landing threshold along the track. [m]
    max_distance_from_runway_m : float or None
        Largest distance from the runway (threshold to far end) along the track. [m]
    """

    shape: Shape
    side: Side
    bank_deg: float
    tas_kt: float
    feasible: bool
    reasons: tuple[str, ...]
    notes: tuple[str, ...]
    inputs: CircleInputs
    offset_m: float | None = None
    abeam_to_roll_in_s: float | None = None
    roll_in_distance_m: float | None = None
    roll_in_xy_m: tuple[float, float] | None = None
    break_off_s: float | None = None
    roll_out_distance_m: float | None = None
    descent_point_m: float = 0.0
    final_heading_deg: float | None = None
    downwind_heading_deg: float | None = None
    leave_mda: LeaveMda | None = None
    legs: tuple[Leg, ...] = ()
    leg_names: tuple[str, ...] = ()
    leg_times_s: tuple[float, ...] = ()
    total_time_s: float | None = None
    start: State | None = None
    track_xy_m: FloatArray = field(default_factory=lambda: np.zeros((0, 2)), compare=False, repr=False)
    track_time_s: FloatArray = field(default_factory=lambda: np.zeros(0), compare=False, repr=False)
    track_heading_deg: FloatArray = field(default_factory=lambda: np.zeros(0), compare=False, repr=False)
    track_leg_index: npt.NDArray[np.int_] = field(default_factory=lambda: np.zeros(0, dtype=int),
                                                  compare=False, repr=False)
    max_distance_from_threshold_m: float | None = None
    max_distance_from_runway_m: float | None = None

    def __post_init__(self) -> None:
        if self.shape not in SHAPES:
            raise DomainError(f"shape = {self.shape!r}: expected one of {SHAPES}")
        if self.side not in SIDES:
            raise DomainError(f"side = {self.side!r}: expected 'left' or 'right'")
        if self.feasible:
            if self.reasons:
                raise DomainError("a feasible plan carries no reasons")
            if (self.offset_m is None or self.roll_out_distance_m is None or not self.legs
                    or self.track_xy_m.shape[0] < 2 or self.total_time_s is None):
                raise DomainError("a feasible plan needs its numbers, legs and track")
            if not (len(self.legs) == len(self.leg_names) == len(self.leg_times_s)):
                raise DomainError("legs, leg_names and leg_times_s must have the same length")
            if min(self.leg_times_s) < 0.0:
                raise DomainError("leg times must be >= 0")
        elif not self.reasons:
            raise DomainError("an infeasible plan must say why")

    @property
    def sign(self) -> int:
        """+1 for the right side (right-hand pattern), -1 for the left."""
        return 1 if self.side == "right" else -1


# --------------------------------------------------------------------------------------------
# solving one plan
# --------------------------------------------------------------------------------------------
def _nm(metres: float) -> str:
    """A distance for the crew's text, in nautical miles ('0.02 NM'): briefs are in feet and NM."""
    return f"{metres * M_TO_NM:.2f} NM"


def _reason_texts(flags: int, shape: Shape, sol: ShapeSolution, k: int, inputs: CircleInputs,
                  descent: DescentGeometry) -> tuple[str, ...]:
    out = []
    b = inputs.bank_deg
    f = lambda a: a.item(k)  # noqa: E731   (float(a[k]) without the numpy scalar)
    if flags & R_WIND:
        out.append(f"the wind ({inputs.wind.speed_kt:.0f} kt) leaves no flyable crab on a leg: a crosswind "
                   f"component reaches the TAS ({inputs.tas_kt:.0f} kt) or a ground speed is not positive")
    if flags & R_BREAK_BACK:
        out.append("the wind carries the break leg back toward the runway: no offset can be built "
                   f"with a {inputs.break_angle_deg:g} deg break")
    if flags & R_WRONG_SIDE:
        out.append(f"the wind is too strong to make the roll-out with {b:g} deg bank: the final turn would "
                   "need the downwind on the other side")
    if flags & R_NO_CONVERGE:
        if shape == "overfly-circuit":
            out.append("the arrival makes no progress along the landing direction: no upwind leg to fly")
        else:
            out.append("the arrival course never converges with the centreline: no single turn joins the final")
    if flags & R_TURN_REVERSED:
        out.append(f"the wind ({inputs.wind.speed_kt:.0f} kt) needs crab angles so large that a 90 deg "
                   "circuit turn would last 180 deg or more")
    if flags & R_NEG_LEG:
        if shape == "downwind-join":
            out.append(f"the arrival is already beyond the downwind offset ({_nm(f(sol.offset))} at {b:g} deg "
                       f"bank), by {-f(sol.break_s):.0f} s of crossing leg")
        elif shape == "break-and-return":
            out.append(f"the break turns alone overshoot the downwind offset ({_nm(f(sol.offset))} at {b:g} deg "
                       f"bank), by {-f(sol.break_s):.0f} s of break leg")
        elif shape == "teardrop":
            short = [f"the {name} by {-f(sol.legs[i].duration):.0f} s" for i, name in ((0, "outbound leg"),
                                                                                       (2, "offset leg"))
                     if f(sol.legs[i].duration) < 0]
            out.append(f"no teardrop fits at {b:g} deg bank: the turns alone overrun "
                       + (" and ".join(short) if short else "its legs"))
        else:
            out.append("the arrival is already past the point where the turn onto final must start "
                       f"(by {-f(sol.legs[0].duration):.0f} s)")
    if flags & R_INSIDE_TURN:
        dw = [lg for lg in sol.legs if lg.name == "downwind"][0]
        gone = -f(dw.duration) * f(sol.gs_d)
        out.append(f"the downwind is joined {_nm(gone)} past the roll-in point: the arrival is already "
                   f"inside the final turn for {b:g} deg bank")
    if flags & R_TOO_CLOSE:
        d = f(sol.roll_out_d)
        out.append(f"the turn rolls out {_nm(abs(d))} {'before' if d >= 0 else 'past'} the threshold, inside the "
                   f"stabilised distance ({_nm(descent.stabilised_distance_m)})")
    return tuple(out)


def _public_legs(sol: ShapeSolution, k: int, inputs: CircleInputs, times: tuple[float, ...]) -> tuple[Leg, ...]:
    """The legs of row k as the crew's legs (``times``: each leg's duration in row k). Values
    are read with ``item`` (a Python float: the same number as ``float(a[k])``)."""
    legs: list[Leg] = []
    for lg, t in zip(sol.legs, times):
        if lg.kind == "turn":
            assert lg.prof is not None and lg.sign is not None
            legs.append(Turn(angle_deg=math.degrees(lg.prof.angle.item(k)), bank_deg=inputs.bank_deg,
                             direction="right" if lg.sign.item(k) > 0 else "left",
                             roll_rate_deg_per_s=inputs.roll_rate_deg_per_s, name=lg.name))
        elif lg.track_rad is not None:
            trk = lg.track_rad
            trk = trk.item(k) if isinstance(trk, np.ndarray) and trk.ndim else float(trk)
            legs.append(StraightTrack(time_s=t, track_deg=math.degrees(trk), name=lg.name))
        else:
            legs.append(Straight(time_s=t, heading_deg=math.degrees(lg.psi0.item(k)), name=lg.name))
    return tuple(legs)


def _distance_to_runway_m(x: FloatArray, y: FloatArray, length_m: float) -> FloatArray:
    """Distance of each point (x, y) from the runway, the segment from the threshold (0, 0) to
    (``length_m``, 0): hypot(x - clip(x, 0, L), y), the clip in one ufunc call (the same numbers as
    np.minimum(np.maximum(x, 0), L) but for the sign of a zero, which hypot does not see)."""
    return np.hypot(x - _uclip(x, 0.0, length_m), y)


def _largest(a: FloatArray) -> float:
    """``a.max()`` as a float (the same reduction, without the method's wrapper)."""
    return np.maximum.reduce(a).item()


def _first_abeam_time_s(x: FloatArray, t: FloatArray) -> float | None:
    """Time at which the track first goes from x > 0 to x <= 0 (linear between samples)."""
    idx = np.nonzero((x[:-1] > 0.0) & (x[1:] <= 0.0))[0]
    if idx.size == 0:
        return None
    i = int(idx[0])
    return float(t[i] + (t[i + 1] - t[i]) * x[i] / (x[i] - x[i + 1]))


def _leave_mda(xy: FloatArray, hd: FloatArray, tm: FloatArray, li: npt.NDArray[np.int_], names: tuple[str, ...],
               turns_to_final: tuple[int, ...], roll_out_d: float, descent: DescentGeometry) -> tuple[LeaveMda, bool]:
    """Point along the track, back from the roll-out, where the ground distance still to fly to
    the threshold equals the descent-point distance. Returns (point, reached)."""
    need = descent.descent_point_m - roll_out_d
    last = len(names) - 1
    nk = int(li.searchsorted(last))   # the legs in order: everything before the final straight
    if need <= 0.0:              # the descent point is on the final straight
        t = float(np.interp(-descent.descent_point_m, xy[nk:, 0], tm[nk:]))
        return LeaveMda(x_m=-descent.descent_point_m, y_m=0.0, heading_deg=math.degrees(hd.item(nk)) % 360.0,
                        in_turn=False, leg_name="final", along_track_to_threshold_m=descent.descent_point_m,
                        time_s=t), True
    # walked backwards from the roll-out: the distance flown back along the track at each point
    # (a step's length is the same backwards: each difference only changes sign)
    d = xy[1:nk] - xy[:nk - 1]
    s = np.zeros(nk)
    np.add.accumulate(np.hypot(d[:, 0], d[:, 1])[::-1], out=s[1:])      # np.cumsum without its wrapper
    total = s.item(-1)
    reached = total >= need
    j = max(1, int(s.searchsorted(need)) if reached else nk - 1)
    s0, s1 = s.item(j - 1), s.item(j)
    fr = 0.0 if s1 == s0 else min(1.0, (need - s0) / (s1 - s0))
    i1, i0 = nk - j, nk - 1 - j           # the points j - 1 and j backwards
    lerp = lambda a: a.item(i1) + fr * (a.item(i0) - a.item(i1))  # noqa: E731
    leg_i = li.item(i0)
    return LeaveMda(x_m=lerp(xy[:, 0]), y_m=lerp(xy[:, 1]), heading_deg=math.degrees(lerp(hd)) % 360.0,
                    in_turn=leg_i in turns_to_final, leg_name=names[leg_i],
                    along_track_to_threshold_m=roll_out_d + min(need, total), time_s=lerp(tm)), reached


def solve_plan(inputs: CircleInputs, *, shape: Shape, side: Side) -> Plan:
    """Solve one plan shape on one side for the inputs' bank target.

    Parameters
    ----------
    inputs : CircleInputs
    shape : str
        One of ``SHAPES``.
    side : {"left", "right"}

    Returns
    -------
    Plan
        ``feasible=False`` with reasons if the plan cannot be flown (or does not apply to this
        arrival); otherwise the roll-out is on the centreline, wings level, on the final crab
        heading, at ``descent_geometry(inputs).roll_out_distance_m`` (the direct turn's
        roll-out distance is a result instead).

    Raises
    ------
    DomainError
        If shape or side is not one of the known names.

    Notes
    -----
    Closed-form solve of :func:`briefer.core.manoeuvre.solver.solve_shape`. If the roll-out is
    closer than the descent point, the descent starts before the roll-out: ``leave_mda`` is
    the point where the ground distance left to the threshold along the track equals the
    descent-point distance (on a 3 deg path that distance sets the height) [3]_.

    References
    ----------
    See the module references.
    """
    if shape not in SHAPES:
        raise DomainError(f"shape = {shape!r}: expected one of {SHAPES}")
    if side not in SIDES:
        raise DomainError(f"side = {side!r}: expected 'left' or 'right'")
    return _solve_sides(inputs, shape, (side,))[0]


_INPUT_FIELDS = tuple(f.name for f in dataclasses.fields(CircleInputs) if f.init)


def inputs_at_level(inputs: CircleInputs, *, bank_deg: float, roll_out_distance_m: float | None) -> CircleInputs:
    """``dataclasses.replace(inputs, bank_deg=..., roll_out_distance_m=...)``: the same new inputs,
    checked as any, made from the fields' names taken once (replace reads every field's
    declaration on each call)."""
    kw = {name: getattr(inputs, name) for name in _INPUT_FIELDS}
    kw["bank_deg"], kw["roll_out_distance_m"] = bank_deg, roll_out_distance_m
    return CircleInputs(**kw)


def candidate_plans(inputs: CircleInputs, *, solved: Mapping[Shape, ShapeSolution | tuple[ShapeSolution, Rows]]
                    | None = None, applicable: tuple[tuple[Shape, Side], ...] | None = None) -> tuple[Plan, ...]:
    """Every applicable (shape, side) for the arrival, solved at the inputs' bank.

    Both sides of a shape are solved in one vectorised call. Returns an empty tuple for an
    arrival aligned with the landing direction (a straight-in). ``solved``: the shapes already
    solved for these inputs, not solved again: a solution with one row per applicable side, in
    the order of :func:`applicable_candidates`, or (solution, rows) with the row of each side in
    a bigger solution (e.g. the judgement's batch: only a shape with a flyable side has its rows
    taken out and sampled). ``applicable``: ``applicable_candidates(inputs.arrival_course_deg)``,
    when the caller has it (e.g. the judgement's ``candidates``).
    """
    if applicable is None:
        applicable = applicable_candidates(inputs.arrival_course_deg)
    descent = descent_geometry(inputs)
    by_shape: dict[Shape, list[Side]] = {}
    for s, d in applicable:
        by_shape.setdefault(s, []).append(d)
    plans = {}
    for s, sides in by_shape.items():
        for d, p in zip(sides, _solve_sides(inputs, s, tuple(sides), None if solved is None else solved.get(s),
                                            applicable=applicable, descent=descent)):
            plans[(s, d)] = p
    return tuple(plans[c] for c in applicable)


def _solve_sides(inputs: CircleInputs, shape: Shape, sides: tuple[Side, ...],
                 solved: ShapeSolution | tuple[ShapeSolution, Rows] | None = None, *,
                 applicable: tuple[tuple[Shape, Side], ...] | None = None,
                 descent: DescentGeometry | None = None) -> list[Plan]:
    descent = descent_geometry(inputs) if descent is None else descent
    applicable = applicable_candidates(inputs.arrival_course_deg) if applicable is None else applicable
    out: list[Plan | None] = [None] * len(sides)
    todo = []
    for i, side in enumerate(sides):
        if (shape, side) in applicable:
            todo.append(i)
        else:
            out[i] = Plan(shape=shape, side=side, bank_deg=inputs.bank_deg, tas_kt=inputs.tas_kt, inputs=inputs,
                          descent_point_m=descent.descent_point_m, feasible=False, notes=(),
                          reasons=(f"{shape} on the {side} does not suit an arrival course of "
                                   f"{float(wrap_180(inputs.arrival_course_deg)):.0f} deg to the runway",))
    if todo:
        sol, ks, rows = _solution_rows(inputs, shape, [sides[i] for i in todo], len(todo) == len(sides), solved,
                                       descent)
        flyable = [sol.ok.item(k) for k in ks]
        trk, at = None, [0] * len(ks)
        if any(flyable):
            trk, at = _flyable_tracks(sol, ks, rows, flyable)
        for t, (k, i) in enumerate(zip(ks, todo)):
            out[i] = _plan_from_row(inputs, shape, sides[i], sol, trk, k, descent, at[t])
    return [p for p in out if p is not None]


def _flyable_tracks(sol: ShapeSolution, ks: list[int], rows: Rows | None, flyable: list[bool]
                    ) -> tuple[SolutionTrack, list[int]]:
    """The dense tracks of the rows ``ks`` of ``sol`` that can be flown, and the track of each
    row (its place among them; 0 for a row not sampled). ``rows``: the rows ``ks`` as given to
    :func:`sampling_rows` (None: every row of ``sol``, ``ks`` in order). A row that cannot be
    flown is not sampled, but every turn keeps the sample count of all the rows' calm-wind
    angles (a track's points do not depend on the other tracks of the call)."""
    sr = sampling_rows(sol) if rows is None else sampling_rows(sol, rows)
    at = [0] * len(ks)
    if not all(flyable):
        keep = [t for t, f in enumerate(flyable) if f]
        for n, t in enumerate(keep):
            at[t] = n
        # a run of rows (one side of two) as views, not a gather: the same numbers
        run = slice(keep[0], keep[-1] + 1) if keep[-1] - keep[0] == len(keep) - 1 else keep
        sr = SamplingRows(sr.ok[run], sr.cols[:, run], sol.legs, sr.nominal_rad)
    else:
        at = list(range(len(ks))) if rows is not None else list(ks)
    trk = sample_solution(sr, turn_step_deg=PLAN_TURN_STEP_DEG, n_straight=2, straight_step_m=PLAN_STRAIGHT_STEP_M,
                          with_heading=True)
    return trk, at


def _solution_rows(inputs: CircleInputs, shape: Shape, sides: list[Side], every_side: bool,
                   solved: ShapeSolution | tuple[ShapeSolution, Rows] | None, descent: DescentGeometry
                   ) -> tuple[ShapeSolution, list[int], Rows | None]:
    """The solution of the sides (solved now unless given), the row of each side in it, and the
    rows to sample (None: all of them): a given batch is only read (its rows of the sides are
    sampled alone, :func:`sampling_rows`)."""
    if isinstance(solved, tuple) and every_side:
        batch, rows = solved
        ks = list(range(batch.ok.shape[0])[rows]) if isinstance(rows, slice) else [int(r) for r in rows]
        if len(ks) == len(sides):
            return batch, ks, rows
    elif solved is not None and not isinstance(solved, tuple) and every_side and solved.ok.shape == (len(sides),):
        return solved, list(range(len(sides))), None
    sigma = np.array([1.0 if side == "right" else -1.0 for side in sides])
    wx, wy = inputs.wind.mps()
    return solve_inputs(inputs, shape, sigma=sigma, wx_mps=wx, wy_mps=wy, bank_deg=inputs.bank_deg,
                        descent=descent), list(range(len(sides))), None


_EMPTY_XY = np.zeros((0, 2))
_EMPTY = np.zeros(0)
_EMPTY_INT = np.zeros(0, dtype=int)
for _a in (_EMPTY_XY, _EMPTY, _EMPTY_INT):
    _a.flags.writeable = False          # shared by every plan that cannot be flown (no track)


def _plan_from_row(inputs: CircleInputs, shape: Shape, side: Side, sol: ShapeSolution, trk: SolutionTrack | None,
                   k: int, descent: DescentGeometry, t: int) -> Plan:
    """Plan of row k of a solved batch, its track row t of ``trk``. Row k's numbers are read
    with ``item`` (a Python float: the same number as ``float(a[k])``, without the numpy scalar)."""
    flags = sol.reasons.item(k)
    if flags:
        return Plan(shape=shape, side=side, bank_deg=inputs.bank_deg, tas_kt=inputs.tas_kt, inputs=inputs,
                    descent_point_m=descent.descent_point_m, feasible=False, notes=(),
                    reasons=_reason_texts(flags, shape, sol, k, inputs, descent),
                    track_xy_m=_EMPTY_XY, track_time_s=_EMPTY, track_heading_deg=_EMPTY,
                    track_leg_index=_EMPTY_INT)
    assert trk is not None and trk.heading is not None and trk.time is not None
    times = tuple([lg.duration.item(k) for lg in sol.legs])
    names = tuple([lg.name for lg in sol.legs])
    legs = _public_legs(sol, k, inputs, times)
    start = State(x_m=inputs.arrival_x_m, y_m=inputs.arrival_y_m,
                  heading_deg=math.degrees(sol.legs[0].psi0.item(k)), time_s=0.0)
    xy, hdg, tim = trk.xy[t], trk.heading[t], trk.time[t]
    roll_out_d = sol.roll_out_d.item(k)
    notes: list[str] = []
    if descent.clamped:
        notes.append(f"roll-out moved out to the stabilised distance, {_nm(descent.stabilised_distance_m)} "
                     f"({inputs.stabilised_height_ft:.0f} ft on the glide path)")
    leave, reached = _leave_mda(xy, hdg, tim, trk.leg_index, names, sol.turns_to_final, roll_out_d, descent)
    if leave.in_turn:
        notes.append(f"the glide path starts in the {leave.leg_name}: leave the circling height at heading "
                     f"{leave.heading_deg:.0f} with {_nm(leave.along_track_to_threshold_m)} to fly")
    elif leave.leg_name != "final":
        notes.append(f"the glide path starts before the final turn, on the {leave.leg_name}")
    if not reached:
        notes.append("the glide path from the circling height starts before the circle begins: "
                     "descend from the arrival")
    if sol.abeam_s is not None:
        abeam: float | None = sol.abeam_s.item(k)
    else:       # teardrop, direct turn: from the first pass abeam/over the threshold, if before the roll-in
        t_cross = _first_abeam_time_s(xy[:, 0], tim)
        t_roll_in = sum(times[: sol.final_turn])
        abeam = None if t_cross is None or t_cross > t_roll_in else t_roll_in - t_cross
    downwind = shape in DOWNWIND_SHAPES
    if downwind:
        dw_i = names.index("downwind")
        x_join = sol.legs[dw_i].x0.item(k)
        downwind_gs_kt = inputs.tas_kt - inputs.wind.toward_x_kt     # flown against the landing direction
        if -x_join > JOIN_PAST_ABEAM_S * downwind_gs_kt * KT_TO_MPS:   # else the same whole-second timings
            notes.append(f"the downwind is joined {_nm(-x_join)} past abeam the threshold: start the timing "
                         f"from the join, {times[dw_i]:.0f} s to the roll-in")
    if shape == "overfly-circuit":
        t_xw, t_base = times[names.index("crosswind")], times[names.index("base")]
        if t_xw < CONTINUOUS_TURN_S and t_base < CONTINUOUS_TURN_S:
            notes.append("no crosswind or base leg: two continuous 180 deg turns")
        elif t_xw < CONTINUOUS_TURN_S:
            notes.append(f"no crosswind leg: one continuous turn onto the downwind; a {t_base:.0f} s base leg")
        else:
            notes.append(f"a {t_xw:.0f} s crosswind leg; no base leg: one continuous turn onto final")
    x, y = xy[:, 0], xy[:, 1]
    ri = (sol.x_ri.item(k), sol.y_ri.item(k))
    return Plan(shape=shape, side=side, bank_deg=inputs.bank_deg, tas_kt=inputs.tas_kt, inputs=inputs,
                descent_point_m=descent.descent_point_m, feasible=True, reasons=(), notes=tuple(notes),
                offset_m=sol.offset.item(k), abeam_to_roll_in_s=abeam, roll_in_distance_m=-ri[0], roll_in_xy_m=ri,
                break_off_s=None if sol.break_s is None else sol.break_s.item(k), roll_out_distance_m=roll_out_d,
                final_heading_deg=math.degrees(sol.psi_f.item(k)) % 360.0,
                downwind_heading_deg=math.degrees(sol.psi_d.item(k)) % 360.0 if downwind else None,
                leave_mda=leave, legs=legs, leg_names=names, leg_times_s=times,
                total_time_s=float(sum(times)), start=start, track_xy_m=xy, track_time_s=tim,
                track_heading_deg=np.degrees(hdg), track_leg_index=trk.leg_index,
                max_distance_from_threshold_m=math.sqrt(_largest(x * x + y * y)),
                max_distance_from_runway_m=_largest(_distance_to_runway_m(x, y, inputs.runway_length_m)))


def plan_sample(plan: Plan, n: int) -> TrackSamples:
    """Resample a feasible plan's legs at about ``n`` points in all (time-proportional per leg)."""
    if not plan.feasible or plan.start is None:
        raise DomainError("plan_sample needs a feasible plan")
    if n < 2 * len(plan.legs):
        raise DomainError(f"n = {n}: need at least 2 points per leg ({2 * len(plan.legs)})")
    total = sum(plan.leg_times_s)
    counts = tuple(max(2, int(round(n * t / total))) if total > 0 else 2 for t in plan.leg_times_s)
    return sample_legs(plan.legs, plan.start, tas_kt=plan.tas_kt, wind=plan.inputs.wind, n_per_leg=counts)


__all__ = ["LeaveMda", "Plan", "candidate_plans", "inputs_at_level", "plan_sample", "solve_plan"]
