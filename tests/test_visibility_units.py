"""Visibility in the unit of the minimums, rounded as charts and reports round it (issue 11 item
10). Metre minimums (PANS-OPS charts, ICAO Annex 3 reports in metres): metres in steps of 100 m
(rounded down: never more than was reported); statute-mile minimums (US charts): statute miles in
the fractions the charts print (1/16 steps below 1, then 1/8, as in AIM/METAR visibility groups).
4000 m = 2.48548 SM (NIST SP 811: 1 SM = 1609.344 m).
"""

from __future__ import annotations

import io
import re

from rich.console import Console

from briefer.brief import build_brief
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.card import card_text
from briefer.render.views import BriefView
from briefer.units import M_TO_SM
from briefer.wording import visibility_words


def _text(b) -> str:
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(BriefView(b))
    return " ".join(c.export_text().split())


def test_formatter():
    assert visibility_words(4000 * M_TO_SM, metres=True) == "4000 m"
    assert visibility_words(2.5, metres=False) == "2 1/2 SM"
    assert visibility_words(3.0, metres=False) == "3 SM"
    assert visibility_words(1.25, metres=False) == "1 1/4 SM"
    assert visibility_words(0.75, metres=False) == "3/4 SM"
    assert visibility_words(2.48548, metres=False) == "2 3/8 SM"      # rounded down to the chart step
    assert visibility_words(3049 * M_TO_SM, metres=True) == "3000 m"


def test_metre_minimums_show_metres_for_the_report():
    b = build_brief(BriefRequest(profile=catalog.find_profile("demo-twin"), airfield=catalog.find_airfield("X4CD"),
                                 approach="VOR RWY 33", landing_runway="15",
                                 weather=Weather(visibility_sm=4000 * M_TO_SM)), computed_utc="x")
    text = _text(b)
    assert re.search(r"required \d+00 m, reported 4000 m", text)
    assert "2.48548" not in text and "SM" not in text.split("MINIMUMS AND AREA")[1].split("PERFORMANCE")[0]
    assert "4000 m" in " ".join(card_text(b).split())


def test_sm_minimums_show_chart_fractions():
    from briefer.brief import demo_request

    b = build_brief(demo_request(visibility_sm=2.0), computed_utc="x")
    text = _text(b)
    assert "required 2 1/2 SM, reported 2 SM" in text
    below = next(f for f in b.findings if f.code == "visibility-below-minimum")
    assert "2 SM" in below.text and "2 1/2 SM" in below.text and "2.50" not in below.text
