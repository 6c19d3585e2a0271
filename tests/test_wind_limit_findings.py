"""Wind limits in the brief (issue 11 item 6): beyond the profile's limit a DANGER and no
recommended plan; a profile without limits gets "not given" and the common-practice defaults.

Components by hand (FAA PHAK FAA-H-8083-25 crosswind component chart: W sin(angle), W cos(angle))
on the demo runway 27, whose true course is read from the brief (about 264 deg true):
  * 180/40: 40 sin(180 - 264) = 40 sin(-84 deg) = -39.8 kt: 40 kt from the left, beyond the demo
    bizjet's (invented) 24 kt demonstrated crosswind;
  * 090/30: 30 cos(090 - 264) = 30 cos(-174 deg) = -29.8 kt: a 30 kt tailwind, beyond its 10 kt;
  * 360/35G45: 45 sin(360 - 264) = 45 sin(96 deg) = 44.8 kt in the gusts from the right.
"""

from __future__ import annotations

import dataclasses
import io

import pytest
from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.io import catalog
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_text
from briefer.render.views import BriefView


def _text(b) -> str:
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(BriefView(b))
    return " ".join(c.export_text().split())


def _brief(**wx):
    return build_brief(demo_request(**wx), computed_utc="2000-01-01 00:00Z")


@pytest.mark.parametrize("wx, code, words", [
    (dict(wind_from_deg=180.0, wind_speed_kt=40.0, wind_gust_kt=None), "crosswind-beyond-limit",
     "40 kt from the left is beyond the maximum demonstrated crosswind of 24 kt"),
    (dict(wind_from_deg=90.0, wind_speed_kt=30.0, wind_gust_kt=None), "tailwind-beyond-limit",
     "TAILWIND 30 kt is beyond the tailwind limit of 10 kt"),
    (dict(wind_from_deg=360.0, wind_speed_kt=35.0, wind_gust_kt=45.0), "crosswind-beyond-limit",
     "45 kt from the right in the gusts is beyond the maximum demonstrated crosswind of 24 kt"),
])
def test_beyond_the_profile_limit_is_a_danger_with_no_plan(wx, code, words):
    b = _brief(**wx)
    dangers = {f.code: f.text for f in b.findings if f.severity == "danger"}
    assert code in dangers and words in dangers[code], dangers
    assert b.plan.feasible is False
    assert b.missed_approach.turn_direction == ""
    text = _text(b)
    assert "NOT FLYABLE AS BRIEFED" in text and "downwind right of the runway" not in text
    assert "NO FLYABLE PLAN" in " ".join(card_text(b).split())
    j = brief_to_dict(b)
    assert j["plan"]["feasible"] is False and j["wind"]["limits"]["source"] == "profile"


def test_within_the_limits_the_limits_are_shown():
    b = _brief()
    assert not [f for f in b.findings if f.code.endswith("beyond-limit")]
    assert b.wind.crosswind_limit_kt == 24.0 and b.wind.tailwind_limit_kt == 10.0
    assert "limits: crosswind 24 kt, tailwind 10 kt (profile)" in _text(b)
    assert "limits: crosswind 24 kt, tailwind 10 kt (profile)" in " ".join(card_text(b).split())


def test_profile_without_limits_says_not_given_and_uses_common_practice():
    req = dataclasses.replace(demo_request(wind_from_deg=90.0, wind_speed_kt=15.0, wind_gust_kt=None),
                              profile=catalog.find_profile("demo-trainer"), configuration=None)
    b = build_brief(req, computed_utc="2000-01-01 00:00Z")
    codes = {f.code: f for f in b.findings}
    assert "wind-limits-not-given" in codes
    note = codes["wind-limits-not-given"].text
    assert "not given" in note and "common practice" in note
    # 15 kt tailwind beyond the 10 kt common-practice default: a WARNING, not the aircraft's limit
    assert codes["tailwind-beyond-default"].severity == "warning"
    assert b.wind.limits_source == "not given"
    assert "limits not given" in _text(b)
    assert brief_to_dict(b)["wind"]["limits"]["source"] == "not given"
