"""The headline missed-approach turn from geometry (issue 11 item 5).

Rule (AIM 5-4-21(c); ICAO Doc 8168 Vol I Part I Section 4 Chapter 7): if visual reference is lost
while circling, make an initial climbing turn toward the landing runway. The brief states one
headline direction: the side of the landing runway along the manoeuvre, weighted by time (from
the start of the circle to the roll-out on final; the final straight, where the runway is ahead,
does not count).

Hand derivation (runway frame of briefer.core.manoeuvre.legs: x along the landing direction,
y to the right, headings clockwise from the landing direction):
  * a RIGHT-hand pattern flies its downwind at y = +offset > 0 on heading 180 deg (the
    reciprocal). The aircraft's right-hand side at heading 180 is the -y direction (right of
    heading psi is (cos(psi + 90), sin(psi + 90)) = (0, -1) at psi = 180), and the runway (y = 0)
    lies in -y from y > 0: the runway is on the RIGHT for the whole downwind.
  * every turn of a right-hand pattern (downwind turn, final turn) turns right, around a centre
    on the runway side, so the runway stays on the right through them as well;
  * the only stretch where the runway can be on the other side is the break-off or crossing leg
    before the pattern turns, which is shorter than the downwind plus the 180 deg final turn
    (59 s at 25 deg bank and 167 kt; 47 s at 20 deg and 104 kt).
  * the "arrival" leg (a downwind join still on the published approach course) is not part of
    the circle and does not count.
  So the headline is the pattern side: RIGHT for a right-hand pattern, LEFT for a left-hand one,
  whatever the arrival's angle to the runway (30-60 deg here) and the wind.
The old rule counted the track points of legs whose *name* contained "downwind" (the turn onto
the downwind included), which on a 40 deg off-axis arrival joining a right-hand downwind said LEFT.
"""

from __future__ import annotations

import pytest

from briefer.core.maneuver import CircleInputs, candidate_plans, missed_approach_turns, runway_wind_from
from briefer.core.manoeuvre.missed import headline_missed_direction

RUNWAY_M = 2000.0
# Shapes with a downwind flown on the pattern side (the derivation above). A teardrop has none:
# its offset leg has the runway on the side opposite its final turn, so its headline is
# whichever side holds longer (see test_teardrop_headline_is_the_longer_side).
PATTERN_SHAPES = ("break-and-return", "downwind-join", "overfly-circuit")


def _arrival(offset_deg: float, wind_rel_deg: float, wind_kt: float, *, from_far_end: bool) -> CircleInputs:
    """An arrival `offset_deg` off the reciprocal (from beyond the far end) or off the landing
    direction (from short of the threshold, then an overfly or direct turn)."""
    if from_far_end:
        return CircleInputs(tas_kt=140.0, bank_deg=25.0, wind=runway_wind_from(wind_rel_deg, wind_kt),
                            arrival_x_m=RUNWAY_M + 1500.0, arrival_y_m=0.0, arrival_course_deg=180.0 + offset_deg,
                            circling_height_ft=700.0, runway_length_m=RUNWAY_M)
    return CircleInputs(tas_kt=140.0, bank_deg=25.0, wind=runway_wind_from(wind_rel_deg, wind_kt),
                        arrival_x_m=-2500.0, arrival_y_m=0.0, arrival_course_deg=offset_deg,
                        circling_height_ft=700.0, runway_length_m=RUNWAY_M)


CASES = [(off, w, kt, far)
         for off in (30.0, -30.0, 40.0, -40.0, 50.0, -50.0, 60.0, -60.0)
         for (w, kt) in ((0.0, 0.0), (60.0, 15.0), (-60.0, 15.0), (150.0, 10.0), (-120.0, 20.0))
         for far in (True, False)]


def test_headline_is_the_pattern_side_on_off_axis_arrivals():
    checked, sides = 0, set()
    for off, w, kt, far in CASES:
        for plan in candidate_plans(_arrival(off, w, kt, from_far_end=far)):
            if not plan.feasible or plan.shape not in PATTERN_SHAPES:
                continue
            guide = missed_approach_turns(plan)
            got = headline_missed_direction(plan, guide)
            assert got == plan.side, (off, w, kt, far, plan.shape, plan.side, got)
            checked += 1
            sides.add(plan.side)
    assert checked >= 40 and sides == {"left", "right"}


def test_old_name_counting_rule_fails_on_one_of_them():
    """The reason for the change, kept as a check of the cases: counting the points of legs named
    '*downwind*' disagrees with the geometry on at least one off-axis case."""
    wrong = 0
    for off, w, kt, far in CASES:
        for plan in candidate_plans(_arrival(off, w, kt, from_far_end=far)):
            if not plan.feasible or plan.shape not in PATTERN_SHAPES:
                continue
            dirs = missed_approach_turns(plan).direction
            legs = list(plan.track_leg_index)
            pool = [d for d, i in zip(dirs, legs) if "downwind" in plan.leg_names[int(i)]] or list(dirs)
            counts = {d: pool.count(d) for d in ("left", "right")}
            if max(counts, key=counts.get) != plan.side:
                wrong += 1
    assert wrong >= 1


@pytest.mark.parametrize("side_sign", [1.0, -1.0])
def test_brief_headline_matches_on_the_demo_fields(side_sign):
    """Every feasible demo brief's headline equals its downwind side (same derivation)."""
    from briefer.brief import build_brief, demo_request

    b = build_brief(demo_request(wind_from_deg=270.0 + side_sign * 40.0, wind_speed_kt=12.0, wind_gust_kt=None))
    if b.plan.feasible:
        assert b.missed_approach.turn_direction == b.plan.side


def test_teardrop_headline_is_the_longer_side():
    """A teardrop: the headline is the side the runway holds for longer, by the time-weighted sum
    computed here independently from the per-point directions."""
    import numpy as np

    seen = 0
    for off in (0.0, 10.0, -10.0, 20.0):
        for plan in candidate_plans(_arrival(off, 0.0, 0.0, from_far_end=True)):
            if not plan.feasible or plan.shape != "teardrop":
                continue
            guide = missed_approach_turns(plan)
            dt = np.diff(plan.track_time_s)
            names = [plan.leg_names[int(i)] for i in plan.track_leg_index[:-1]]
            left = sum(t for d, t, n in zip(guide.direction, dt, names) if d == "left" and n != "final")
            right = sum(t for d, t, n in zip(guide.direction, dt, names) if d == "right" and n != "final")
            assert headline_missed_direction(plan, guide) == ("left" if left > right else "right")
            seen += 1
    assert seen >= 1


def test_direction_rule_at_the_tolerance_edges():
    """The per-point direction against the rule written out (AIM 5-4-21(c): turn toward the
    runway; "ahead"/"either" within 5 deg of the nose/tail, the module's documented tolerance),
    at the edges and the floats beside them, and over a fine sweep of bearings."""
    import numpy as np

    from briefer.core.manoeuvre.missed import _DIRECTIONS, _direction_codes

    def rule(rel: float) -> str:
        a = abs(rel)
        return "ahead" if a <= 5.0 else "either" if a >= 175.0 else "right" if rel > 0 else "left"

    edges = [-180.0, -175.0, -5.0, -0.0, 0.0, 5.0, 175.0, 180.0]
    rels = [np.nextafter(e, d) for e in edges for d in (-np.inf, np.inf)] + edges
    rels += np.linspace(-180.0, 180.0, 14401).tolist()
    got = [_DIRECTIONS[c] for c in _direction_codes(np.array(rels)).tolist()]
    assert got == [rule(r) for r in rels]


def test_brief_summary_is_the_guides_segments_and_headline():
    """The brief's per-leg summary (missed_turns_by_leg) is the guide's segments, in order, and
    its headline, on every feasible plan of the cases above."""
    from briefer.core.manoeuvre.missed import missed_turns_by_leg

    checked = 0
    for off, w, kt, far in CASES[::3]:
        for plan in candidate_plans(_arrival(off, w, kt, from_far_end=far)):
            if not plan.feasible:
                continue
            guide = missed_approach_turns(plan)
            runs, headline = missed_turns_by_leg(plan)
            assert runs == tuple((seg.leg_name, seg.direction) for seg in guide.segments)
            assert headline == headline_missed_direction(plan, guide)
            checked += 1
    assert checked >= 20
