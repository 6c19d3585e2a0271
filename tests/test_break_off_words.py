"""The break-off is said with its direction and the heading to fly, and "abeam the threshold"
names the threshold (issue 11 item 4).

Hand check of the demo (break-and-return to a right-hand downwind for runway 27, the RNAV 09
arrival flying the reciprocal of 27): to put the downwind on the RIGHT of runway 27 (north of it,
the landing direction being about west), an aircraft inbound on about 090 M breaks off to its
LEFT (north), by the 45 deg break angle: heading about 090 - 45 = 045 M (the crab for the
240/10 wind moves it by a few degrees).
"""

from __future__ import annotations

import io

import pytest
from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_text
from briefer.render.views import BriefView


@pytest.fixture(scope="module")
def demo():
    return build_brief(demo_request(), computed_utc="2000-01-01 00:00Z")


def _flat(t: str) -> str:
    return " ".join(t.replace("\u00a0", " ").split())


def test_break_off_direction_and_heading(demo):
    p = demo.plan
    assert p.shape == "break-and-return" and p.side == "right"
    assert p.break_off_direction == "left"
    assert 35.0 <= p.break_off_heading_deg_mag <= 55.0
    hdg = f"{p.break_off_heading_deg_mag:03.0f}° M"
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(BriefView(demo))
    text = _flat(c.export_text())
    assert f"45° LEFT off the inbound course, heading {hdg}, for 35 s" in text
    assert "from abeam the runway 27 threshold" in text
    from briefer.render.card_layout import card_layout

    notes = {f.label: f.note for f in card_layout(demo).plan.figures}    # the card's boxes, text and PDF
    assert notes["BREAK OFF"] == f"LEFT off inbound, {hdg}"
    assert notes["TIMING"] == "abeam thr 27 to roll-in"
    assert "LEFT off" in card_text(demo)
    j = brief_to_dict(demo)["plan"]
    assert j["break_off_direction"] == "left" and j["break_off_heading_deg_mag"] == pytest.approx(
        p.break_off_heading_deg_mag)
