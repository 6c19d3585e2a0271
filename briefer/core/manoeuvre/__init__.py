"""Circling manoeuvres: legs, ground tracks in wind, the standard plans, the solver, the
candidates, their ranking, the missed approach from the circle and the wind envelope.

This package gathers the public API of its modules:

* :mod:`briefer.core.manoeuvre.legs` -- runway frame, wind vector, legs and closed-form tracks;
* :mod:`briefer.core.manoeuvre.solver` -- inputs, plan shapes, descent geometry, vectorised solve;
* :mod:`briefer.core.manoeuvre.plans` -- ``Plan``, one solved plan, the candidates;
* :mod:`briefer.core.manoeuvre.ranking` -- ranking, verdict thresholds, the bank needed;
* :mod:`briefer.core.manoeuvre.missed` -- the missed-approach turn direction along a plan;
* :mod:`briefer.core.manoeuvre.judgement` -- one judgement: every candidate x level in one batch;
* :mod:`briefer.core.manoeuvre.envelope` -- the wind envelope over a grid (vectorised).

Runway frame: x metres along the landing direction from the landing threshold (final approach
at negative x), y metres to the right of the centreline; headings 0 = landing direction,
clockwise positive; wind as the velocity of the air in that frame (blowing toward).
"""

from __future__ import annotations

from briefer.core.manoeuvre.envelope import (
    DOES_NOT_FIT,
    FITS,
    MARGINAL,
    REASON_AREA,
    REASON_BANK,
    REASON_LIMIT,
    REASON_NOT_AUTHORISED,
    REASON_SECTOR,
    REASON_STALL,
    REASON_VISIBILITY,
    REASON_WIND,
    Envelope,
    wind_envelope,
)
from briefer.core.manoeuvre.judgement import (
    DENSE_CHECK_M,
    ROLL_OUT_STEPS,
    Levels,
    WindJudgement,
    choose_plan_at_wind,
    judge_winds,
    judgement_levels,
    roll_out_steps_m,
    solve_candidates,
)
from briefer.core.manoeuvre.legs import (
    CALM,
    Leg,
    RunwayWind,
    State,
    Straight,
    StraightTrack,
    TrackSamples,
    Turn,
    crab_heading_deg,
    leg_ground_speed_kt,
    leg_duration_s,
    leg_end_state,
    plan_end_state,
    plan_time_s,
    runway_wind_from,
    sample_leg,
    sample_legs,
    turn_angle_deg,
)
from briefer.core.manoeuvre.missed import MissedApproachGuide, MissedTurnSegment, missed_approach_turns
from briefer.core.manoeuvre.plans import LeaveMda, Plan, candidate_plans, plan_sample, solve_plan
from briefer.core.manoeuvre.ranking import (
    MARGINAL_AOA_DEG,
    MARGINAL_AREA_FRACTION,
    MARGINAL_BANK_DEG,
    MARGINAL_VISIBILITY_FRACTION,
    MarginFn,
    PlanChoice,
    RankedPlan,
    bank_levels_deg,
    choose_plan,
    plan_checks,
    rank_plans,
)
from briefer.core.manoeuvre.solver import (
    DOWNWIND_SHAPES,
    SHAPES,
    SIDES,
    CircleInputs,
    DescentGeometry,
    applicable_candidates,
    descent_geometry,
)

__all__ = [
    "CALM", "DENSE_CHECK_M", "ROLL_OUT_STEPS", "DOES_NOT_FIT", "DOWNWIND_SHAPES", "FITS", "MARGINAL", "MARGINAL_AOA_DEG", "MARGINAL_AREA_FRACTION",
    "MARGINAL_BANK_DEG", "MARGINAL_VISIBILITY_FRACTION", "REASON_AREA", "REASON_BANK", "REASON_LIMIT", "REASON_NOT_AUTHORISED", "REASON_SECTOR", "REASON_STALL", "REASON_VISIBILITY",
    "REASON_WIND", "SHAPES", "SIDES", "CircleInputs", "DescentGeometry", "Envelope", "LeaveMda", "Leg", "Levels", "MarginFn",
    "MissedApproachGuide", "MissedTurnSegment", "Plan", "PlanChoice", "RankedPlan", "RunwayWind", "State",
    "Straight", "StraightTrack", "TrackSamples", "Turn", "applicable_candidates", "bank_levels_deg",
    "candidate_plans", "choose_plan", "crab_heading_deg", "descent_geometry", "leg_ground_speed_kt", "leg_duration_s",
    "leg_end_state", "missed_approach_turns", "plan_end_state", "plan_sample", "plan_time_s", "rank_plans",
    "runway_wind_from", "sample_leg", "sample_legs", "solve_plan", "turn_angle_deg", "wind_envelope",
    "WindJudgement", "choose_plan_at_wind", "judge_winds", "judgement_levels", "plan_checks", "roll_out_steps_m", "solve_candidates",
]
