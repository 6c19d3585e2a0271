"""The wind envelope of a request: the brief's judgement over a grid of winds."""

from __future__ import annotations

from briefer import units
from briefer.brief.situation_inputs import situation
from briefer.core import maneuver
from briefer.model import BriefRequest


def envelope_for(request: BriefRequest, **kwargs) -> maneuver.Envelope:
    """The wind envelope of the request's situation (every 10° x 0-40 kt by default).

    Each cell is the brief's own judgement (:func:`briefer.core.maneuver.judge_winds`) at that
    wind: the profile's roll rate, the bank steps, the closer roll-outs, the angle-of-attack
    check, the same ranking and verdict rule, so a cell says what the brief says at that wind;
    beyond the aircraft's wind limits, or where circling is not authorised for the category, the
    brief offers no plan and neither does the cell.
    """
    s = situation(request)
    common = dict(margin_fn=s.margins_fn, visibility_m=s.visibility_m,
                  bank_limit_deg=min(s.bank_limit_deg, 60.0), area_radius_m=s.area_radius.radius_nm * units.NM_TO_M,
                  aoa_margin_fn=s.aoa_margin_fn,
                  crosswind_limit_kt=request.selected_configuration().max_demonstrated_crosswind_kt,
                  tailwind_limit_kt=request.selected_configuration().tailwind_limit_kt,
                  authorised=s.circling_authorised)
    common.update(kwargs)
    return maneuver.wind_envelope(s.inputs, **common)
