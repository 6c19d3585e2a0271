"""The warnings name visibilities in the display units (the renderer chooses the words; the brief
keeps its numbers and, in the JSON, its default words).

Conversions: 1 SM = 1609.344 m (NIST SP 811 Appendix B). The ICAO set shows a reported or
planned visibility in 100 m steps rounded down below 5 km (ICAO Annex 3 report steps, as
`briefer.display_units` documents), and a requirement charted in statute miles as charted with
the exact metres beside it.
"""

from __future__ import annotations

import io
import json

from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.display_units import finding_text, said_in
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_text
from briefer.render.views import BriefView
from briefer.commands._common import _jsonable


def _finding(brief, code):
    (f,) = [f for f in brief.findings if f.code == code]
    return f


def _text(view) -> str:
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(view)
    return " ".join(c.export_text().split())


def test_the_marginal_plans_visibility_follows_the_display_units():
    """The demo (3 SM reported): 3 x 1609.344 = 4828.0 m, shown 4800 m (rounded down)."""
    b = build_brief(demo_request(), computed_utc="x")
    f = _finding(b, "plan-marginal")
    assert "over 90 % of the 3.0 SM visibility" in f.text               # the JSON's words, unchanged
    assert finding_text(f, "us") == f.text
    icao = finding_text(f, "icao")
    assert "over 90 % of the 4800 m visibility" in icao and "SM" not in icao
    assert "4800 m visibility" in _text(BriefView(b, "icao")) and "3.0 SM visibility" not in _text(BriefView(b, "icao"))
    assert "3.0 SM visibility" in _text(BriefView(b, "us"))
    card = " ".join(card_text(b, units="icao").split())
    assert "4800 m visibility" in card and "3.0 SM visibility" not in card


def test_a_visibility_below_the_minimum_says_both_in_the_display_units():
    """1 SM reported against 2 1/2 SM required (the demo approach's category D line):
    1609.344 m -> 1600 m; 2.5 x 1609.344 = 4023.36 m -> '2 1/2 SM = 4023 m' (the charted text
    with the exact metres, never rounded to a step that could read as less)."""
    b = build_brief(demo_request(visibility_sm=1.0), computed_utc="x")
    f = _finding(b, "visibility-below-minimum")
    assert f.text == "Reported visibility 1 SM is below the required 2 1/2 SM."
    assert finding_text(f, "icao") == "Reported visibility 1600 m is below the required 2 1/2 SM = 4023 m."


def test_the_alternatives_why_not_follows_the_display_units():
    """An alternative that fails on the visibility (the demo trainer at X4CD, VOR 33 to 15,
    1 SM: '... beyond the 1.0 SM visibility'; 1609 m -> 1600 m)."""
    wx = Weather(wind_speed_kt=0.0, oat_c=-35.0, altimeter_hpa=1035.0, visibility_sm=1.0, ceiling_ft=300.0)
    b = build_brief(BriefRequest(profile=catalog.find_profile("demo-trainer"), airfield=catalog.find_airfield("X4CD"),
                                 approach="VOR RWY 33", landing_runway="15", weather=wx), computed_utc="x")
    alts = [a for a in b.plan.alternatives if "SM visibility" in a.why_not]
    assert alts, [a.why_not for a in b.plan.alternatives]
    for a in alts:
        icao = said_in(a.why_not, a.why_not_visibilities, "icao")
        assert "beyond the 1600 m visibility" in icao and "SM" not in icao
        assert said_in(a.why_not, a.why_not_visibilities, "us") == a.why_not


def test_the_json_keeps_its_words_in_either_display_set():
    b = build_brief(demo_request(), computed_utc="x")
    text = json.dumps(_jsonable(brief_to_dict(b)))
    assert "over 90 % of the 3.0 SM visibility" in text and "visibilities" not in text


async def test_the_apps_warnings_follow_the_display_units():
    from test_app_support import demo_catalog, demo_inputs, settle, text_of

    from briefer.tui.app import BriefingApp

    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=True, debounce_s=0.01)
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        await pilot.press("u")
        await settle(app, pilot)
        await pilot.press("w")
        await pilot.pause()
        listed = " ".join(text_of(app.screen.query_one("#warnings-body Static")).split())
        assert "4800 m visibility" in listed and "3.0 SM" not in listed

