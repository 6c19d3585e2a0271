"""The closer roll-outs tried when no plan fits at the descent point (the brief and the envelope
use the same steps), and the plan choice that walks them."""

from __future__ import annotations

from dataclasses import replace

from briefer.brief.situation_inputs import Situation
from briefer.core import maneuver

ROLL_OUT_STEPS = (0.66, 0.33, 0.0)   # of the way from the stabilised distance to the descent point


def roll_out_steps_m(inputs: maneuver.CircleInputs) -> tuple[float, ...]:
    """The closer roll-outs tried, in order, when no plan fits at the descent point: steps
    toward the stabilised distance (descending in the final turn). The brief and the envelope
    use the same steps."""
    geo = maneuver.descent_geometry(inputs)
    return tuple(geo.stabilised_distance_m + f * (geo.roll_out_distance_m - geo.stabilised_distance_m)
                 for f in ROLL_OUT_STEPS)


def choose_with_closer_roll_out(s: Situation, area_radius_m: float) -> tuple[maneuver.PlanChoice, bool]:
    """Rank the plans at the default roll-out (the descent point); if none fits, roll out
    closer, step by step (roll_out_steps_m). Returns the choice and whether it rolled out closer."""
    kwargs = dict(margin_fn=s.margin_fn, visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                  area_radius_m=area_radius_m, aoa_margin_fn=s.aoa_margin_fn)
    first = maneuver.choose_plan(s.inputs, **kwargs)
    if first.bank_needed_deg is not None or not first.ranked:
        return first, False
    for d in roll_out_steps_m(s.inputs):
        closer = maneuver.choose_plan(replace(s.inputs, roll_out_distance_m=d), **kwargs)
        if closer.bank_needed_deg is not None:
            return closer, True
    return first, False
