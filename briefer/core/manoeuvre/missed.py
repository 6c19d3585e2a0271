"""The missed approach from the circle: which way the initial climbing turn goes.

References
----------
.. [1] FAA, Aeronautical Information Manual, 5-4-21(c): missed approach while circling, an
   initial climbing turn toward the landing runway.
.. [2] ICAO Doc 8168 Vol I, Part I, Section 4, Chapter 7: climbing turn within the circling area
   toward the landing runway, 5th ed., 2006 (docs/REFERENCES.md 4d).
"""

from __future__ import annotations

from briefer._dataclass import dataclass, field
from typing import Literal

import numpy as np

TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core.manoeuvre.legs import FloatArray
from briefer.core.manoeuvre.plans import Plan
from briefer.errors import DomainError

MissedDirection = Literal["left", "right", "ahead", "either"]
AHEAD_TOL_DEG = 5.0
_DIRECTIONS: tuple[MissedDirection, ...] = ("ahead", "either", "right", "left")
_CODE_OF = {d: k for k, d in enumerate(_DIRECTIONS)}
_NOT_COUNTED = len(_DIRECTIONS)          # a code for the headline's points that hold no time
_DIRECTION_OF_CODE = np.array(_DIRECTIONS, dtype=object)     # the same str objects, by code
# Bins of a relative bearing (-180, 180], ascending: either (<= -175), left, ahead ([-5, 5]),
# right, either (>= 175). searchsorted puts a bearing equal to an edge in the bin below it; an
# edge whose own value belongs to the bin above (-5, 175) is given as the float just below it.
_BEARING_EDGES_DEG = np.array([-(180.0 - AHEAD_TOL_DEG), np.nextafter(-AHEAD_TOL_DEG, -np.inf), AHEAD_TOL_DEG,
                               np.nextafter(180.0 - AHEAD_TOL_DEG, -np.inf)])
_CODE_OF_BIN = np.array([_CODE_OF["either"], _CODE_OF["left"], _CODE_OF["ahead"], _CODE_OF["right"],
                         _CODE_OF["either"]])


@dataclass(frozen=True, slots=True, kw_only=True)
class MissedTurnSegment:
    """A stretch of a leg over which the initial missed-approach turn has one direction.

    Attributes
    ----------
    leg_name : str
    start_s, end_s : float
        Times from the start of the plan. [s]
    direction : {"left", "right", "ahead", "either"}
        Climbing turn toward the runway: "ahead" when the runway is within 5 deg of the nose,
        "either" when it is within 5 deg of the tail.
    """

    leg_name: str
    start_s: float
    end_s: float
    direction: MissedDirection

    def __post_init__(self) -> None:
        if self.end_s < self.start_s:
            raise DomainError("end_s must not precede start_s")


@dataclass(frozen=True, slots=True, kw_only=True)
class MissedApproachGuide:
    """Direction of the initial climbing turn toward the landing runway along a plan.

    Attributes
    ----------
    reference_xy_m : tuple of float
        The runway point turned toward (threshold or runway midpoint), runway frame. [m]
    relative_bearing_deg : ndarray (N,)
        Bearing of that point from the nose at each track point, (-180, 180], positive right. [deg]
    direction : tuple of str
        Per track point: "left" | "right" | "ahead" | "either".
    segments : tuple of MissedTurnSegment
        Compact summary per leg.
    direction_code : ndarray (N,) of int, optional
        `direction` as indices into ("ahead", "either", "right", "left") (None: read `direction`).
    """

    reference_xy_m: tuple[float, float]
    relative_bearing_deg: FloatArray = field(compare=False, repr=False)
    direction: tuple[MissedDirection, ...] = field(compare=False, repr=False)
    segments: tuple[MissedTurnSegment, ...]
    direction_code: npt.NDArray[np.int_] | None = field(default=None, compare=False, repr=False)

    def __post_init__(self) -> None:
        if len(self.direction) != len(self.relative_bearing_deg):
            raise DomainError("one direction per track point")


def missed_approach_turns(plan: Plan, *, toward: Literal["threshold", "midpoint"] = "midpoint"
                          ) -> MissedApproachGuide:
    """Initial climbing-turn direction toward the landing runway at every point of a plan.

    Parameters
    ----------
    plan : Plan
        A feasible plan.
    toward : {"threshold", "midpoint"}
        Runway point turned toward (the midpoint needs ``inputs.runway_length_m`` > 0;
        otherwise the threshold is used).

    Returns
    -------
    MissedApproachGuide

    Raises
    ------
    DomainError
        If the plan is not feasible.

    Notes
    -----
    "Make an initial climbing turn toward the landing runway" [1]_ [2]_: the side is the sign
    of the cross product of the heading unit vector with the vector to the runway point
    (positive = to the right in the runway frame, whose headings increase clockwise).
    """
    ref, rel, codes = _bearings(plan, toward)
    times = np.asarray(plan.track_time_s, dtype=float)
    starts, legs, n = _runs(plan, codes, len(times))
    ends = np.concatenate([starts[1:], [n]]) - 1
    names = plan.leg_names
    segs = [MissedTurnSegment(leg_name=names[k], start_s=t0, end_s=t1, direction=_DIRECTIONS[c])
            for k, t0, t1, c in zip(legs[starts].tolist(), times[starts].tolist(), times[ends].tolist(),
                                    codes[starts].tolist())]
    return MissedApproachGuide(reference_xy_m=ref, relative_bearing_deg=rel,
                               direction=tuple(_DIRECTION_OF_CODE[codes].tolist()),
                               segments=tuple(segs), direction_code=codes)


def missed_turns_by_leg(plan: Plan) -> tuple[tuple[tuple[str, MissedDirection], ...], str]:
    """The (leg name, direction) of each segment of ``missed_approach_turns(plan)``, in order,
    and ``headline_missed_direction`` of that guide: the brief's summary, without the guide's
    per-point directions and segment objects.

    Raises
    ------
    DomainError
        If the plan is not feasible.
    """
    _, _, codes = _bearings(plan, "midpoint")
    starts, legs, _ = _runs(plan, codes, len(plan.track_time_s))
    names = plan.leg_names
    runs = tuple(zip([names[k] for k in legs[starts].tolist()], _DIRECTION_OF_CODE[codes[starts]].tolist()))
    return runs, _headline(plan, codes)


def _bearings(plan: Plan, toward: str) -> tuple[tuple[float, float], FloatArray, npt.NDArray[np.int_]]:
    """`missed_approach_turns`' runway point, relative bearings and their direction codes."""
    if not plan.feasible:
        raise DomainError("missed_approach_turns needs a feasible plan")
    ref = (plan.inputs.runway_length_m / 2.0 if toward == "midpoint" else 0.0, 0.0)
    psi = np.radians(plan.track_heading_deg)
    dx, dy = ref[0] - plan.track_xy_m[:, 0], ref[1] - plan.track_xy_m[:, 1]
    cos_psi, sin_psi = np.cos(psi), np.sin(psi)
    cross = cos_psi * dy - sin_psi * dx          # > 0: runway to the right
    dot = cos_psi * dx + sin_psi * dy
    rel = np.degrees(np.arctan2(cross, dot))
    return ref, rel, _direction_codes(rel)


def _runs(plan: Plan, codes: npt.NDArray[np.int_], n_times: int
          ) -> tuple[npt.NDArray[np.intp], npt.NDArray[np.int_], int]:
    """The segments: runs of one (leg name, direction), as their first point indices, the
    track's leg indices and the number of points the runs cover."""
    legs = np.asarray(plan.track_leg_index)
    names = plan.leg_names
    n = min(len(codes), n_times, len(legs))
    # runs of one (direction, leg name): a new run where either changes
    name_ids = {name: k for k, name in enumerate(dict.fromkeys(names))}
    if len(name_ids) == len(names):    # every leg named once: a leg's name id is its index
        ids = legs[:n]
    else:
        ids = np.array([name_ids[name] for name in names])[legs[:n]]
    key = codes[:n] * len(name_ids) + ids
    if not n:
        return np.zeros(0, dtype=int), legs, n
    change = np.empty(n, dtype=bool)   # a run starts at the first point and wherever the key changes
    change[0] = True
    np.not_equal(key[1:], key[:-1], out=change[1:])
    return change.nonzero()[0], legs, n


def _direction_codes(rel: FloatArray) -> npt.NDArray[np.int_]:
    """Indices into `_DIRECTIONS` of finite relative bearings: ahead within 5 deg of the nose
    (|rel| <= 5), either within 5 deg of the tail (|rel| >= 175), else the side of the bearing's
    sign: the bin of each bearing among `_BEARING_EDGES_DEG`, as one search."""
    return _CODE_OF_BIN[_BEARING_EDGES_DEG.searchsorted(rel)]     # np.searchsorted's own method, without its wrapper


def headline_missed_direction(plan: Plan, guide: MissedApproachGuide) -> str:
    """The one direction to brief: the side of the landing runway along the manoeuvre, weighted
    by time ("left", "right", or "" when neither side holds any time).

    Each track point's direction (`missed_approach_turns`) counts for the time to the next
    point, from leaving the approach course to the roll-out: the "arrival" leg (still on the
    published approach course) and the final straight (the runway ahead) do not count, nor
    points with the runway within 5 deg of the nose or the tail. A tie goes to the pattern side
    (`plan.side`).
    """
    codes = guide.direction_code
    if codes is None:                             # a guide made by hand: its directions' indices
        codes = np.array([_CODE_OF.get(d, _NOT_COUNTED) for d in guide.direction], dtype=int)
    return _headline(plan, codes)


def _headline(plan: Plan, codes: npt.NDArray[np.int_]) -> str:
    """`headline_missed_direction` from the guide's direction codes."""
    times = np.asarray(plan.track_time_s, dtype=float)
    if len(times) < 2:
        return ""
    dt = times[1:] - times[:-1]                   # np.diff's own operation
    legs = np.asarray(plan.track_leg_index)[:-1]
    skip = {i for i, name in enumerate(plan.leg_names) if name == "arrival"}
    if plan.leg_names and plan.leg_names[-1] == "final":
        skip.add(len(plan.leg_names) - 1)
    counted = None                                # points on the legs that count (None: every point)
    for i in skip:
        if counted is None:
            counted = legs != i
        else:
            counted &= legs != i
    held_codes = codes[:-1] if counted is None else np.where(counted, codes[:-1], _NOT_COUNTED)
    # each direction's time, summed in track order (bincount adds its weights one by one, in order)
    held = np.bincount(held_codes, weights=dt, minlength=_NOT_COUNTED + 1).tolist()
    left, right = held[_CODE_OF["left"]], held[_CODE_OF["right"]]
    if left == right:
        return plan.side if left > 0 else ""
    return "left" if left > right else "right"


__all__ = ["MissedApproachGuide", "MissedTurnSegment", "headline_missed_direction", "missed_approach_turns",
           "missed_turns_by_leg"]
