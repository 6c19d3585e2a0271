"""The category line adds up and names its two VREFs the same way everywhere (issue 11 item 3).

14 CFR 97.3 (and ICAO Doc 8168 Vol I Part I Sec 4 Ch 1): the approach category is fixed by VREF
at the MAXIMUM certificated landing weight; the speed flown today (the configuration's circling
speed at today's landing weight, plus the wind additive) can raise it. The demo bizjet (invented):
VREF 116 kt (flaps-35) at 28000 lb -> at the 31000 lb maximum 116 sqrt(31000/28000) = 122.06 kt
(category C, band 121-140 kt); flaps-20 VREF 126 kt -> 132.6 kt at today's 31000 lb; circling
145 kt -> 152.6 kt, plus the additive (half the 9.1 kt headwind + the 6 kt gust increment =
10.6 kt) = 163.2 kt, category D.
"""

from __future__ import annotations

import io
import json
import re

import pytest
from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_text
from briefer.render.views import BriefView

VREFS = ("VREF 133 kt in this configuration at landing weight; category speed 122 kt at maximum landing weight "
         "sets category C")
SPEED = "circling 163 kt IAS = 152 kt + 11 kt wind additive"


@pytest.fixture(scope="module")
def demo():
    return build_brief(demo_request(), computed_utc="2000-01-01 00:00Z")


def _flat(text: str) -> str:
    return " ".join(text.replace("\u00a0", " ").split())


def _rich(renderable) -> str:
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(renderable)
    return _flat(c.export_text())


def _outputs(b) -> dict[str, str]:
    from briefer.tui.views import aircraft_implies

    return {"text": _rich(BriefView(b)), "card": _flat(card_text(b)), "app": _rich(aircraft_implies(b)),
            "json": _flat(json.dumps(brief_to_dict(b), ensure_ascii=False))}


def test_same_words_on_every_output(demo):
    for name, text in _outputs(demo).items():
        assert VREFS in text, name
        assert SPEED in text, name


def test_json_reason_is_rounded_and_says_which_vref(demo):
    reason = brief_to_dict(demo)["category_reason"]
    assert "122.056" not in reason and "163.155" not in reason
    assert "122 kt at maximum landing weight" in reason
    j = brief_to_dict(demo)
    assert j["category_speed_at_max_landing_weight_kt"] == pytest.approx(122.056, abs=0.01)
    assert j["circling_speed_before_additive_kt"] == pytest.approx(152.57, abs=0.01)


SUM = re.compile(r"(\d+) kt IAS = (\d+) kt \+ (\d+) kt")


@pytest.mark.parametrize("wind", [(240.0, 10.0, 16.0), (90.0, 5.0, None), (270.0, 25.0, 35.0), (0.0, 0.0, None)])
def test_the_sum_adds_up(wind):
    d, s, g = wind
    b = build_brief(demo_request(wind_from_deg=d, wind_speed_kt=s, wind_gust_kt=g), computed_utc="x")
    for name, text in _outputs(b).items():
        sums = SUM.findall(text)
        assert sums, name
        for total, base, add in sums:
            assert int(total) == int(base) + int(add), (name, total, base, add)
