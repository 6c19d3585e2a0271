"""The wind envelope of a request: the brief's plan rule over a grid of winds."""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from briefer import units
from briefer.brief.roll_out import roll_out_steps_m
from briefer.brief.situation_inputs import situation
from briefer.core import maneuver
from briefer.model import BriefRequest


def envelope_for(request: BriefRequest, **kwargs) -> maneuver.Envelope:
    """The wind envelope of the request's situation (every 10° x 0-40 kt by default).

    Same rule as the brief: cells where nothing fits at the descent point are solved again
    with the roll-out closer (roll_out_steps_m), and take the first verdict that fits. The
    envelope is an overview: its turns are solved with instant bank (no roll-in ramps), which
    moves a roll-out by a few metres; the brief's own plan keeps the profile's roll rate.
    """
    s = situation(request)
    s = replace(s, inputs=replace(s.inputs, roll_rate_deg_per_s=None))
    common = dict(margin_fn=s.margins_fn, visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                  area_radius_m=s.area_radius.radius_nm * units.NM_TO_M)
    common.update(kwargs)
    env = maneuver.wind_envelope(s.inputs, **common)
    fields = ("status", "reasons", "bank_needed_deg", "best_candidate", "area_margin_m",
              "max_distance_from_runway_m")
    for d in roll_out_steps_m(s.inputs):
        rows = np.flatnonzero(np.any(env.status == maneuver.DOES_NOT_FIT, axis=1))
        if not rows.size:
            break
        sub = dict(common, wind_from_relative_deg=env.wind_from_relative_deg[rows], wind_speed_kt=env.wind_speed_kt)
        closer = maneuver.wind_envelope(replace(s.inputs, roll_out_distance_m=d), **sub)
        merged = {}
        for name in fields:
            arr = np.array(getattr(env, name), copy=True)
            old_rows, new_rows = arr[rows], getattr(closer, name)
            take = (env.status[rows] == maneuver.DOES_NOT_FIT) & (closer.status != maneuver.DOES_NOT_FIT)
            arr[rows] = np.where(take, new_rows, old_rows)
            merged[name] = arr
        env = replace(env, **merged)
    return env
