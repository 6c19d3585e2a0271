"""The envelope's fast path against the plain full evaluation, cell by cell, on demo cases.

On many winds the judgement (``briefer.core.maneuver.judge_winds``, level by level) proves some
candidates fail on a few of their own track points (each leg's start, each turn's middle arc
sample) and samples in full only the candidates that might pass. The plain evaluation samples
every flyable candidate of every cell in full and measures every track, as a cell judged alone
does. Checked here, on the demo case and demo landings in low visibility and wind:

* every field of every cell of the envelope is identical with and without the fast path (and
  without its turns solved once per bank, each level solving its own), and identical to the
  cell judged alone (one wind: nothing is left out);
* every candidate the coarse pass declares failing does fail on its full track (runway beyond
  the visibility, or a negative area margin), and the pass does leave candidates out (the
  comparison above is not vacuous).

No outside reference: this checks that the two ways of the tool agree.
"""

from __future__ import annotations

import numpy as np
import pytest
from conftest import demo_landings, designator_heading_deg

from briefer.brief import demo_request, envelope_for, situation
from briefer.core.manoeuvre import judgement
from briefer.core.maneuver import REASON_LIMIT, REASON_NOT_AUTHORISED, judge_winds
from briefer.model import BriefRequest, Weather
from briefer.units import KT_TO_MPS, NM_TO_M

FIELDS = ("status", "reasons", "bank_needed_deg", "best_candidate", "area_margin_m", "max_distance_from_runway_m",
          "roll_out_m")
CASES = ("demo-bizjet/Q7HM/RNAV (GPS) RWY 31/18", "demo-twin/Q7HM/VOR-A/31", "demo-trainer/X4CD/VOR RWY 33/33",
         "demo-twin/V2RL/RNAV (GPS) RWY 09/27")
"""Every plan shape among them (downwind join, break-and-return, teardrop, direct turn, overfly circuit), and
cells that fit, are marginal and do not fit."""


def _requests():
    yield pytest.param(demo_request(), id="demo")
    by_label = {label: (prof, af, appr, des) for label, prof, af, appr, des in demo_landings()}
    for label in CASES:
        prof, af, appr, des = by_label[label]
        wx = Weather(oat_c=5.0, altimeter_hpa=1013.0, visibility_sm=2.0, ceiling_ft=1500.0,
                     wind_from_deg=(designator_heading_deg(des) + 60.0) % 360.0, wind_speed_kt=15.0,
                     wind_reference="magnetic")
        yield pytest.param(BriefRequest(profile=prof, airfield=af, approach=appr, landing_runway=des, weather=wx),
                           id=label)


@pytest.mark.parametrize("request_", list(_requests()))
def test_the_fast_path_gives_every_field_of_the_plain_evaluation(request_, monkeypatch):
    given = []
    with monkeypatch.context() as m:
        keep_given = judgement._TurnStore.given
        m.setattr(judgement._TurnStore, "given", lambda self, *a: given.append(keep_given(self, *a)) or given[-1])
        fast = envelope_for(request_)
    with monkeypatch.context() as m:
        m.setattr(judgement, "_PRUNE_MIN_ROWS", 10**9)      # every candidate of every cell sampled in full
        m.setattr(judgement._TurnStore, "given", lambda self, *a: None)     # every level solves its turns
        plain = envelope_for(request_)
    fitting = ~np.isnan(fast.roll_out_m)
    if np.any(fast.roll_out_m[fitting] < np.max(fast.roll_out_m[fitting], initial=0.0)):
        assert any(g is not None for g in given)             # closer roll-outs were given the turns
    for name in FIELDS:
        np.testing.assert_array_equal(getattr(fast, name), getattr(plain, name), err_msg=name)
    # a few cells judged alone, one wind at a time (the brief's way)
    s = situation(request_)
    kw = dict(margin_fn=s.margins_fn, visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
              area_radius_m=s.area_radius.radius_nm * NM_TO_M, aoa_margin_fn=s.aoa_margin_fn)
    judged = 0
    for i, j in ((0, 0), (3, 12), (9, 25), (18, 40), (27, 7), (33, 33), (14, 20), (22, 16)):
        if fast.reasons[i, j] & (REASON_LIMIT | REASON_NOT_AUTHORISED):    # not judged: no plan offered
            continue
        rel = np.radians(fast.wind_from_relative_deg[i])
        spd = fast.wind_speed_kt[j] * KT_TO_MPS
        one = judge_winds(s.inputs, wx_mps=[-spd * np.cos(rel)], wy_mps=[-spd * np.sin(rel)], **kw)
        assert one.status[0] == fast.status[i, j] and one.reasons[0] == fast.reasons[i, j], (i, j)
        assert one.best_candidate[0] == fast.best_candidate[i, j], (i, j)
        np.testing.assert_array_equal([one.area_margin_m[0], one.max_distance_from_runway_m[0],
                                       one.bank_needed_deg[0], one.roll_out_m[0]],
                                      [fast.area_margin_m[i, j], fast.max_distance_from_runway_m[i, j],
                                       fast.bank_needed_deg[i, j], fast.roll_out_m[i, j]], err_msg=str((i, j)))
        judged += 1
    assert judged or np.all(fast.reasons & REASON_NOT_AUTHORISED)


def test_what_the_coarse_pass_fails_fails_on_the_full_track():
    s = situation(demo_request())
    dirs, spds = np.radians(np.arange(0.0, 360.0, 10.0)), np.arange(0.0, 41.0, 2.0) * KT_TO_MPS
    wx = (-spds[None, :] * np.cos(dirs[:, None])).ravel()
    wy = (-spds[None, :] * np.sin(dirs[:, None])).ravel()
    levels = judgement.judgement_levels(s.inputs, bank_limit_deg=min(s.bank_limit_deg, 60.0))
    cands = judgement.applicable_candidates(s.inputs.arrival_course_deg)
    proven_total = 0
    for r, b in levels.order():
        kw = dict(wx_mps=wx, wy_mps=wy, bank_deg=levels.bank_deg[b], roll_out_m=levels.roll_out_m[r],
                  margin_fn=s.margins_fn)
        full = judgement.solve_candidates(s.inputs, cands, **kw)                  # every track sampled in full
        co = judgement._coarse_pass([(list(cis), sol) for cis, sol in full.solutions], full.ok,
                                    runway_length_m=s.inputs.runway_length_m, visibility_m=s.visibility_m,
                                    margin_fn=s.margins_fn, turn_step_deg=judgement.BATCH_TURN_STEP_DEG)
        fails = full.ok & ((full.max_distance_from_runway_m > s.visibility_m) | (full.area_margin_m < 0.0))
        assert np.all(fails[co.proven]), (r, b)
        # the coarse points are track points: no farther out than the track's farthest sample
        assert np.all(co.distance_m[full.ok] <= full.max_distance_from_runway_m[full.ok] + 1e-6)
        # the candidates left for the full samples carry the full evaluation's numbers
        fast = judgement.solve_candidates(s.inputs, cands, visibility_m=s.visibility_m, all_margins=False, **kw)
        keep = full.ok & ~co.proven
        np.testing.assert_array_equal(fast.max_distance_from_runway_m[keep], full.max_distance_from_runway_m[keep])
        kept_area = keep & ~(full.max_distance_from_runway_m > s.visibility_m)
        np.testing.assert_array_equal(fast.area_margin_m[kept_area], full.area_margin_m[kept_area])
        proven_total += int(co.proven.sum())
    assert proven_total > 1000
