"""The plans' dense tracks sample only the sides that can be flown, to the last bit.

``candidate_plans`` samples a shape's sides in one call; a side that cannot be flown has no
track, so it is left out of the call. Each turn still gets the sample count of every side's
calm-wind angle, as when both sides were sampled together, so a flyable plan's track (points,
headings, times) is the one of both sides sampled together. The geometry is the solver's own
(tests/test_batch_cells.py, tests/test_sampling_rows.py check it).
"""

from __future__ import annotations

import numpy as np
import pytest

from briefer.core.manoeuvre.legs import runway_wind_from
from briefer.core.manoeuvre.plans import PLAN_STRAIGHT_STEP_M, PLAN_TURN_STEP_DEG, candidate_plans
from briefer.core.manoeuvre.solver import (
    CircleInputs,
    applicable_candidates,
    descent_geometry,
    sample_solution,
    sampling_rows,
    solve_inputs,
)

DENSE = dict(turn_step_deg=PLAN_TURN_STEP_DEG, n_straight=2, straight_step_m=PLAN_STRAIGHT_STEP_M, with_heading=True)


def _inputs(**kw) -> CircleInputs:
    base = dict(tas_kt=140.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=4000.0, arrival_y_m=0.0,
                arrival_course_deg=165.0, circling_height_ft=600.0, runway_length_m=2500.0, roll_rate_deg_per_s=10.0)
    base.update(kw)
    return CircleInputs(**base)


ARRIVALS = [dict(), dict(arrival_course_deg=195.0, roll_rate_deg_per_s=None),
            dict(arrival_course_deg=180.0, arrival_x_m=2500.0, arrival_y_m=500.0)]


def _bits(a: np.ndarray) -> bytes:
    return np.ascontiguousarray(a).tobytes()


@pytest.mark.parametrize("arrival", ARRIVALS)
def test_a_flyable_plan_is_sampled_as_with_the_side_that_cannot_be_flown(arrival):
    """Every shape on both sides, winds all round at 10-40 kt: where one side cannot be flown,
    the other's track is the row of both sides sampled together (points, headings, times)."""
    one_side_only = 0
    for wind_from in range(0, 360, 20):
        for kt in (10.0, 25.0, 40.0):
            inp = _inputs(wind=runway_wind_from(float(wind_from), kt), **arrival)
            sides: dict[str, list[str]] = {}
            for s, d in applicable_candidates(inp.arrival_course_deg):
                sides.setdefault(s, []).append(d)
            wx, wy = inp.wind.mps()
            for shape, ds in sides.items():
                if len(ds) != 2:
                    continue
                sol = solve_inputs(inp, shape, sigma=np.array([-1.0, 1.0]), wx_mps=wx, wy_mps=wy,
                                   bank_deg=inp.bank_deg, descent=descent_geometry(inp))
                if sol.ok.all() or not sol.ok.any():
                    continue
                one_side_only += 1
                both = sample_solution(sampling_rows(sol, slice(0, 2)), **DENSE)
                for given in (sol, (sol, slice(0, 2))):
                    plans = [p for p in candidate_plans(inp, solved={shape: given}) if p.shape == shape]
                    assert [p.side for p in plans] == ds
                    for t, p in enumerate(plans):
                        assert p.feasible == bool(sol.ok[t])
                        if p.feasible:
                            assert _bits(p.track_xy_m) == _bits(both.xy[t])
                            assert _bits(p.track_time_s) == _bits(both.time[t])
                            assert _bits(p.track_heading_deg) == _bits(np.degrees(both.heading[t]))
    assert one_side_only >= 5, "the sweep should meet shapes flyable on one side only"
