"""The brief and the wind envelope are one judgement: at every demo case and a grid of winds, the
envelope's cell for a wind says what the brief says at that wind.

Both come from ``briefer.core.maneuver.judge_winds`` (the brief: its one wind, every level in one
batch; the envelope: the grid, level by level). What is compared: the verdict (the brief's
"no-plan-fits" danger = does not fit, its "plan-marginal" warning = marginal, otherwise fits),
the bank needed, whether the roll-out was brought closer, and the plan flown (shape and side).
The plan may differ only between two candidates whose margins (the smaller of area and
visibility margin, the ranking key) are within DENSE_CHECK_M of each other: the envelope ranks
on its batch tracks, the brief on the plans' denser tracks, which may differ by that much.
No outside reference: this checks that two outputs of the tool agree (issue: the envelope and
the brief disagreed).
"""

from __future__ import annotations

import numpy as np
import pytest
from conftest import demo_landings, designator_heading_deg

from briefer.brief import build_brief, envelope_for, situation
from briefer.core.maneuver import DENSE_CHECK_M, DOES_NOT_FIT, FITS, MARGINAL
from briefer.model import BriefRequest, Weather

pytestmark = pytest.mark.slow   # a sweep or fuzz: `-m "not slow"` skips it in a quick run

FAIR = dict(oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=3.0, ceiling_ft=4000.0)
WINDS = [(0.0, 0.0), (0.0, 20.0), (60.0, 15.0), (100.0, 30.0), (180.0, 12.0), (250.0, 25.0), (300.0, 40.0)]
"""(from, relative to the landing runway's designator heading, magnetic; speed kt)."""


def demo_situations():
    """(profile, airfield, approach name, landing designator) for every built-in case."""
    for label, prof, af, approach, des in demo_landings():
        yield pytest.param(prof, af, approach, des, id=label)


def _verdict(brief) -> int:
    codes = {f.code for f in brief.findings}
    if "no-plan-fits" in codes or not brief.plan.feasible:
        return DOES_NOT_FIT
    return MARGINAL if "plan-marginal" in codes else FITS


@pytest.mark.parametrize("prof, af, approach, des", list(demo_situations()))
def test_brief_and_envelope_agree_on_a_grid_of_winds(prof, af, approach, des):
    hdg = designator_heading_deg(des)
    seen = set()
    for rel_mag, speed in WINDS:
        wx = dict(FAIR, wind_from_deg=(hdg + rel_mag) % 360.0, wind_speed_kt=speed, wind_reference="magnetic")
        req = BriefRequest(profile=prof, airfield=af, approach=approach, landing_runway=des, weather=Weather(**wx))
        brief = build_brief(req, computed_utc="2000-01-01 00:00Z")
        s = situation(req)
        rel = 0.0 if s.wind_from_true is None else s.wind_from_true - s.runway.landing_course_deg_true
        env = envelope_for(req, wind_from_relative_deg=[rel], wind_speed_kt=[speed])
        where = f"wind {wx['wind_from_deg']:.0f}/{speed:.0f}: envelope reasons {env.reason_texts(0, 0)}"
        verdict = _verdict(brief)
        seen.add(verdict)
        shortened = "roll-out-shortened" in {f.code for f in brief.findings}
        env_level = (int(env.status[0, 0]) != DOES_NOT_FIT, env.bank_needed_deg[0, 0],
                     bool(env.roll_out_m[0, 0] < _descent_point_m(s) - 1e-6))
        brief_level = (verdict != DOES_NOT_FIT, brief.plan.bank_deg if verdict != DOES_NOT_FIT else None, shortened)
        if env_level[0] and brief_level[0] and env_level[1:] != brief_level[1:] or env_level[0] != brief_level[0]:
            # the brief checks, on its plans' denser tracks, every level the batch decided by less
            # than DENSE_CHECK_M; only there may it land elsewhere than the envelope
            assert _decided_near_zero(s), f"{where}: envelope {env_level}, brief {brief_level}"
            continue
        assert int(env.status[0, 0]) == verdict or _decided_near_zero(s), where
        if verdict == DOES_NOT_FIT:
            continue
        cand = env.candidates[env.best_candidate[0, 0]]
        if cand != (brief.plan.shape, brief.plan.side):
            ranked = _ranked(s)
            key = {(rp.plan.shape, rp.plan.side): min(rp.area_margin_m, rp.visibility_margin_m)
                   for rp in ranked if rp.area_margin_m is not None}
            assert cand in key and abs(key[cand] - key[ranked[0].plan.shape, ranked[0].plan.side]) < DENSE_CHECK_M, \
                f"{where}: envelope {cand}, brief {brief.plan.shape} {brief.plan.side}, keys {key}"
    assert seen, "no wind compared"


def _decided_near_zero(s) -> bool:
    """Whether the batch judgement at the situation's wind decided some level by less than
    DENSE_CHECK_M (its best margin between -DENSE_CHECK_M and +DENSE_CHECK_M)."""
    from briefer.core.maneuver import judge_winds
    from briefer.units import NM_TO_M

    wx, wy = s.inputs.wind.mps()
    j = judge_winds(s.inputs, wx_mps=[wx], wy_mps=[wy], margin_fn=s.margins_fn, eager=True,
                    visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                    area_radius_m=s.area_radius.radius_nm * NM_TO_M, aoa_margin_fn=s.aoa_margin_fn)
    return bool(np.any(np.abs(j.level_slack_m) < DENSE_CHECK_M))


def _ranked(s):
    from briefer.core.maneuver import choose_plan_at_wind
    from briefer.units import NM_TO_M

    choice, _ = choose_plan_at_wind(s.inputs, margin_fn=s.margin_fn, batch_margin_fn=s.margins_fn,
                                    visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                                    area_radius_m=s.area_radius.radius_nm * NM_TO_M, aoa_margin_fn=s.aoa_margin_fn)
    return choice.ranked


def _descent_point_m(s) -> float:
    from briefer.core.maneuver import descent_geometry

    return descent_geometry(s.inputs).roll_out_distance_m
