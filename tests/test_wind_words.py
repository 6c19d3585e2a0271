"""One crosswind formatter on every output (issue 11 item 1).

The expected side is derived by hand from the definition of the crosswind component
(FAA PHAK, FAA-H-8083-25, "Airplane Performance", crosswind component chart: crosswind =
W sin(wind direction - runway heading), positive from the right): the demo landing runway 27
has a true course near 264 deg (V2RL's runway 09/27, variation 4 deg W... read from the brief's
own final heading below, not assumed), so
  * 240/10 true: 240 - 264 = -24 deg, 10 sin(-24 deg) = -4.1 kt -> 4 kt from the LEFT;
  * 300/10 true: 300 - 264 = +36 deg, 10 sin(36 deg) = +5.9 kt -> 6 kt from the RIGHT.
"""

from __future__ import annotations

import io
import json
import math

import pytest
from pypdf import PdfReader
from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_pdf_bytes, card_text
from briefer.render.views import BriefView
from briefer.wording import components_words, crosswind_side, crosswind_words, headwind_words


def _render(renderable) -> str:
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(renderable)
    return " ".join(c.export_text().split())


def _flat(text: str) -> str:
    return " ".join(text.replace("\u00a0", " ").split())


CASES = {
    # wind (true) -> (side, knots) by the hand derivation in the module docstring
    "left": ({"wind_from_deg": 240.0, "wind_speed_kt": 10.0, "wind_gust_kt": None}, "left", 4),
    "right": ({"wind_from_deg": 300.0, "wind_speed_kt": 10.0, "wind_gust_kt": None}, "right", 6),
}


@pytest.fixture(scope="module", params=sorted(CASES))
def case(request):
    wx, side, kt = CASES[request.param]
    brief = build_brief(demo_request(**wx), computed_utc="2000-01-01 12:00Z")
    return brief, side, kt


def test_formatter_both_sides_and_zero():
    assert crosswind_words(-4.1) == "4 kt from the left"
    assert crosswind_words(5.9) == "6 kt from the right"
    assert crosswind_words(-0.3) == "no crosswind"          # never "-0 kt"
    assert crosswind_words(0.0) == "no crosswind"
    assert crosswind_side(-0.49) is None and crosswind_side(0.5) == "right"
    assert headwind_words(-3.2) == "TAILWIND 3 kt"
    assert headwind_words(9.4) == "headwind 9 kt"
    assert headwind_words(-0.2) == "no headwind"
    assert components_words(9.0, -4.0) == "headwind 9 kt, crosswind 4 kt from the left"


def test_hand_derivation_matches_the_brief(case):
    brief, side, kt = case
    w = brief.wind
    course_true = brief.plan.final_heading_deg_mag + brief.header.magnetic_variation_deg
    xw = w.speed_kt * math.sin(math.radians(w.from_deg_true - course_true))
    assert round(abs(xw)) == kt and (xw > 0) == (side == "right")
    assert round(abs(w.crosswind_from_right_kt)) == kt


def _no_wrong_side(text: str, side: str, kt: int) -> None:
    other = "right" if side == "left" else "left"
    assert f"{kt} kt from the {side}" in text
    assert f"from the {other}" not in text.replace("from the right of the", "")
    assert f"-{kt} kt from" not in text and f"+{kt} kt from" not in text


def test_text_brief(case):
    brief, side, kt = case
    _no_wrong_side(_render(BriefView(brief)), side, kt)


def test_text_card(case):
    brief, side, kt = case
    _no_wrong_side(_flat(card_text(brief)), side, kt)


def test_pdf_card(case):
    brief, side, kt = case
    pdf = PdfReader(io.BytesIO(card_pdf_bytes(brief)))
    _no_wrong_side(_flat(" ".join(p.extract_text() for p in pdf.pages)), side, kt)


def test_json(case):
    brief, side, kt = case
    w = json.loads(json.dumps(brief_to_dict(brief)))["wind"]
    assert w["crosswind_side"] == side
    assert w["crosswind_text"] == f"{kt} kt from the {side}"


def test_app_steps_1_3_4(case):
    from briefer.tui.views import aircraft_implies, runway_implies, weather_implies

    brief, side, kt = case
    for view in (aircraft_implies, runway_implies, weather_implies):
        _no_wrong_side(_render(view(brief)), side, kt)


def test_scenario_answer_and_deck(case):
    """`briefer scenario show/new` print the BriefView; the deck's answer page is the card's text."""
    from briefer.instructor.deck import answer_text
    from briefer.instructor.scenario_format import Scenario

    brief, side, kt = case
    scenario = Scenario.__new__(Scenario)
    for k, v in {"title": "t", "notes": "", "emphasis": "tailwind-on-base", "seed": None}.items():
        object.__setattr__(scenario, k, v)
    _no_wrong_side(_flat(answer_text(scenario, brief)), side, kt)


def test_icao_demo_field_both_sides():
    """The ICAO demo field (metre minimums), circling from VOR RWY 33 to land 15: the same words."""
    from briefer.io import catalog
    from briefer.model import BriefRequest, Weather
    from briefer.tui.views import runway_implies

    af, prof = catalog.find_airfield("X4CD"), catalog.find_profile("demo-twin")

    def brief_for(wx):
        return build_brief(BriefRequest(profile=prof, airfield=af, approach="VOR RWY 33", landing_runway="15",
                                        weather=wx))

    probe = brief_for(Weather())
    course_true = probe.plan.final_heading_deg_mag + probe.header.magnetic_variation_deg
    for wind_rel, side in ((-40.0, "left"), (40.0, "right")):
        # 15 kt at 40 deg off the course: 15 sin(40 deg) = 9.6 kt -> 10 kt from that side
        brief = brief_for(Weather(wind_from_deg=(course_true + wind_rel) % 360.0, wind_speed_kt=15.0))
        assert round(abs(brief.wind.crosswind_from_right_kt)) == 10
        for text in (_render(BriefView(brief)), _flat(card_text(brief)), _render(runway_implies(brief))):
            _no_wrong_side(text, side, 10)


@pytest.mark.parametrize("from_deg, speed, gust, card, screen", [
    # the wind as the card and the screen's grids say it (one formatter, two forms)
    (240.0, 10.0, 16.0, "240° true 10 kt, gusts 16 kt", "240/10G16 kt true"),
    (5.0, 8.0, None, "005° true 8 kt", "005/8 kt true"),
    (None, 5.0, None, "VRB 5 kt", "VRB/5 kt true"),
    (None, 0.0, None, "calm or not given", "calm / not given"),
])
def test_wind_words_card_and_compact_forms(from_deg, speed, gust, card, screen):
    from briefer.result import WindInfo
    from briefer.wording import wind_words

    w = WindInfo(reported=speed > 0, from_deg_true=from_deg, speed_kt=speed, gust_kt=gust, headwind_kt=0.0,
                 crosswind_from_right_kt=0.0, gust_headwind_kt=None, gust_crosswind_from_right_kt=None)
    assert wind_words(w) == card
    assert wind_words(w, compact=True) == screen
