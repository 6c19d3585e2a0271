"""Circling not authorised for the category: no plan, no planned picture, said plainly (issue 11
item 7). The demo bizjet in a 40 deg, 20G38 kt wind at V2RL (landing 09 from the RNAV 09) is raised
by the gust additive to a category whose circling line V2RL does not publish (NA).
"""

from __future__ import annotations

import io
import math
import re

from rich.console import Console

from briefer.brief import build_brief
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.card import card_pdf_bytes, card_text
from briefer.render.card_layout import card_layout
from briefer.render.views import BriefView


def _brief():
    wx = Weather(wind_from_deg=130.0, wind_speed_kt=20.0, wind_gust_kt=38.0, wind_reference="magnetic", oat_c=15.0,
                 altimeter_hpa=1013.0, visibility_sm=6.0, ceiling_ft=4000.0)
    return build_brief(BriefRequest(profile=catalog.find_profile("demo-bizjet"), airfield=catalog.find_airfield("V2RL"),
                                    approach="RNAV (GPS) RWY 09", landing_runway="09", weather=wx), computed_utc="x")


def test_no_plan_and_no_planned_picture_when_not_authorised():
    b = _brief()
    assert b.minimums.authorised is False                      # the premise
    assert b.plan.feasible is False and len(b.plan.track_xy_m) == 0
    assert any("not authorised" in r for r in b.plan.reasons)
    assert math.isnan(b.sight_picture.planned_offset_nm) and math.isnan(b.sight_picture.planned_depression_deg)
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(BriefView(b))
    text = " ".join(c.export_text().split())
    assert "no planned picture" in text and not re.search(r"Planned runway [\d.]+°", text)
    card = " ".join(card_text(b).split())
    assert "no planned picture" in card
    sv = card_layout(b).side_view
    assert math.isnan(sv.picture.planned_offset_nm) and not sv.picture.planned
    assert card_pdf_bytes(b)[:4] == b"%PDF"                    # the side view draws without a plan


def test_deck_and_app_say_so_too():
    from briefer.instructor.deck import trap_lines
    from briefer.tui.views import sight_comparison, sight_legend

    b = _brief()
    assert "no planned picture" in " ".join(trap_lines(b))
    c = Console(record=True, width=120, file=io.StringIO())
    c.print(sight_comparison(b))
    c.print(sight_legend(b, ascii=True))
    out = c.export_text()
    assert "nan" not in out and "no plan" in out
