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

from briefer.core.manoeuvre.legs import FloatArray
from briefer.core.manoeuvre.plans import Plan
from briefer.errors import DomainError

MissedDirection = Literal["left", "right", "ahead", "either"]
AHEAD_TOL_DEG = 5.0
_DIRECTIONS: tuple[MissedDirection, ...] = ("ahead", "either", "right", "left")


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
    """

    reference_xy_m: tuple[float, float]
    relative_bearing_deg: FloatArray = field(compare=False, repr=False)
    direction: tuple[MissedDirection, ...] = field(compare=False, repr=False)
    segments: tuple[MissedTurnSegment, ...]

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
    if not plan.feasible:
        raise DomainError("missed_approach_turns needs a feasible plan")
    ref = (plan.inputs.runway_length_m / 2.0 if toward == "midpoint" else 0.0, 0.0)
    psi = np.radians(plan.track_heading_deg)
    dx, dy = ref[0] - plan.track_xy_m[:, 0], ref[1] - plan.track_xy_m[:, 1]
    cos_psi, sin_psi = np.cos(psi), np.sin(psi)
    cross = cos_psi * dy - sin_psi * dx          # > 0: runway to the right
    dot = cos_psi * dx + sin_psi * dy
    rel = np.degrees(np.arctan2(cross, dot))
    a = np.abs(rel)
    codes = np.where(a <= AHEAD_TOL_DEG, 0, np.where(a >= 180.0 - AHEAD_TOL_DEG, 1, np.where(rel > 0, 2, 3)))
    dirs: list[MissedDirection] = [_DIRECTIONS[c] for c in codes.tolist()]
    # segments: runs of one (leg, direction), from the first point's time to the last's
    times = np.asarray(plan.track_time_s, dtype=float)
    legs = np.asarray(plan.track_leg_index)
    names = plan.leg_names
    n = min(len(dirs), len(times), len(legs))
    # runs of one (direction, leg name): a new run where either changes
    name_ids = {name: k for k, name in enumerate(dict.fromkeys(names))}
    key = codes[:n] * len(name_ids) + np.array([name_ids[name] for name in names])[legs[:n]]
    starts = np.flatnonzero(np.concatenate([[True], key[1:] != key[:-1]])) if n else np.zeros(0, dtype=int)
    ends = np.concatenate([starts[1:], [n]]) - 1
    segs = [MissedTurnSegment(leg_name=names[int(legs[i])], start_s=float(times[i]), end_s=float(times[j]),
                              direction=dirs[i]) for i, j in zip(starts.tolist(), ends.tolist())]
    return MissedApproachGuide(reference_xy_m=ref, relative_bearing_deg=rel, direction=tuple(dirs),
                               segments=tuple(segs))


def headline_missed_direction(plan: Plan, guide: MissedApproachGuide) -> str:
    """The one direction to brief: the side of the landing runway along the manoeuvre, weighted
    by time ("left", "right", or "" when neither side holds any time).

    Each track point's direction (`missed_approach_turns`) counts for the time to the next
    point, from leaving the approach course to the roll-out: the "arrival" leg (still on the
    published approach course) and the final straight (the runway ahead) do not count, nor
    points with the runway within 5 deg of the nose or the tail. A tie goes to the pattern side
    (`plan.side`).
    """
    times = np.asarray(plan.track_time_s, dtype=float)
    if len(times) < 2:
        return ""
    dt = np.diff(times)
    legs = np.asarray(plan.track_leg_index)[:-1]
    skip = {i for i, name in enumerate(plan.leg_names) if name == "arrival"}
    if plan.leg_names and plan.leg_names[-1] == "final":
        skip.add(len(plan.leg_names) - 1)
    counted = np.ones(legs.shape, dtype=bool)
    for i in skip:
        counted &= legs != i
    sides = np.array(guide.direction[:-1])
    weight = {}
    for side in ("left", "right"):
        held = dt[counted & (sides == side)]      # summed in order, as one running total
        weight[side] = float(np.cumsum(held)[-1]) if held.size else 0.0
    if weight["left"] == weight["right"]:
        return plan.side if weight["left"] > 0 else ""
    return "left" if weight["left"] > weight["right"] else "right"


__all__ = ["MissedApproachGuide", "MissedTurnSegment", "headline_missed_direction", "missed_approach_turns"]
