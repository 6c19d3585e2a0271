"""The plan choice of the brief: the judgement at its wind (the envelope's call with one wind),
then the full plans of the chosen level. The closer roll-outs tried when no plan fits at the
descent point live in the core (``maneuver.roll_out_steps_m``), for the brief and the envelope."""

from __future__ import annotations

from briefer.brief.situation_inputs import Situation
from briefer.core import maneuver

ROLL_OUT_STEPS = maneuver.ROLL_OUT_STEPS
roll_out_steps_m = maneuver.roll_out_steps_m


def choose_with_closer_roll_out(s: Situation, area_radius_m: float) -> tuple[maneuver.PlanChoice, bool]:
    """Every candidate x bank level x roll-out (the descent point, then closer) solved in one
    batch at the brief's wind, then the full plans of the chosen level, ranked
    (:func:`briefer.core.maneuver.choose_plan_at_wind`). Returns the choice and whether it rolled
    out closer."""
    return maneuver.choose_plan_at_wind(s.inputs, margin_fn=s.margin_fn, batch_margin_fn=s.margins_fn,
                                        visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                                        area_radius_m=area_radius_m, aoa_margin_fn=s.aoa_margin_fn)
