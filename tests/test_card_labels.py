"""The text card prints every row label whole (issue 11 item 11: it printed "Circling onl")."""

from __future__ import annotations

from briefer.brief import build_brief, demo_request
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.card import card_text
from briefer.render.card_layout import card_layout


def test_every_row_label_is_printed_whole():
    # Q7HM VOR-A (no straight-in minimums: "Circling only" reasons in the brief)
    briefs = [build_brief(demo_request(), computed_utc="x"),
              build_brief(BriefRequest(profile=catalog.find_profile("demo-bizjet"), airfield=catalog.find_airfield("Q7HM"),
                                       approach="VOR-A", landing_runway="13", weather=Weather()), computed_utc="x")]
    labels_seen = set()
    for b in briefs:
        layout = card_layout(b)
        lines = card_text(b).splitlines()
        for sec in (layout.minimums, layout.plan, layout.wind):
            for row in sec.rows:
                labels_seen.add(row.label)
                assert any(line.lstrip().startswith(row.label + " ") for line in lines), row.label
    assert "Circling only" in labels_seen
