"""Kneeboard type sizes read back from the PDF's text matrices (pypdf, independent of fpdf2):
every sentence at least 9 pt, every label at least 7 pt (the one-line footer aside), the numbers
to fly large, on half-letter and A5, for a case of each demo airfield and a deck's pages.

The sizes are a kneeboard-legibility choice of this project (common practice for cockpit
documents read at arm's length in poor light), not a published standard."""

from __future__ import annotations

import io
import re

import pytest
from pypdf import PdfReader

from briefer.brief import build_brief, demo_request
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.card import card_pdf_bytes
from briefer.render.card_layout import card_layout, printable_text

BODY_MIN_PT = 9.0
LABEL_MIN_PT = 7.0
FIGURE_MIN_PT = 12.0
CASES = (("V2RL", "RNAV (GPS) RWY 09", "27", "demo-bizjet"), ("Q7HM", "VOR-A", "36", "demo-twin"),
         ("X4CD", "VOR RWY 33", "15", "demo-trainer"))


def runs(data: bytes) -> list[tuple[int, float, str]]:
    """(page index, size in points, text) of every text run: the font size times the scale of
    the text matrix and of the current transformation matrix."""
    out = []
    for i, page in enumerate(PdfReader(io.BytesIO(data)).pages):
        def visit(text, cm, tm, font_dict, font_size, i=i):
            if text.strip():
                scale = (tm[0] ** 2 + tm[1] ** 2) ** 0.5 * (cm[0] ** 2 + cm[1] ** 2) ** 0.5
                out.append((i, round(font_size * scale, 2), text.strip()))
        page.extract_text(visitor_text=visit)
    return out


def flat(text: str) -> str:
    return " ".join(printable_text(text, "latin-1").replace("\u00a0", " ").split())


def briefs():
    out = [build_brief(demo_request(), computed_utc="2000-01-01 12:00Z")]
    for ident, approach, runway, profile in CASES[1:]:
        req = BriefRequest(profile=catalog.find_profile(profile, use_config=False),
                           airfield=catalog.find_airfield(ident, use_config=False), approach=approach,
                           landing_runway=runway, weather=Weather(wind_from_deg=200.0, wind_speed_kt=18.0,
                                                                  wind_gust_kt=28.0, visibility_sm=2.0))
        out.append(build_brief(req, computed_utc="2000-01-01 12:00Z"))
    return out


def body_texts(layout) -> list[str]:
    """The card's sentences: rows, statuses, warnings, cautions."""
    texts = [r.text for s in layout.sections() for r in s.rows] + [r.text for r in layout.side_view.rows]
    texts += [s.status for s in layout.sections() if s.status]
    texts += [w.text for w in layout.warnings] + list(layout.cautions)
    return [flat(t) for t in texts]


@pytest.mark.parametrize("page", ["half-letter", "a5"])
@pytest.mark.parametrize("index", range(len(CASES)), ids=[c[0] for c in CASES])
def test_card_type_sizes(page, index):
    brief = briefs()[index]
    layout = card_layout(brief)
    found = runs(card_pdf_bytes(brief, page=page))
    footer = [r for r in found if r[2].startswith("briefer ")]
    assert footer and all(len({r[0] for r in footer}) == len({r[0] for r in found}) for _ in [0])
    body = body_texts(layout)
    checked_body = 0
    for pg, size, text in found:
        if text.startswith("briefer "):
            continue                                        # the one-line footer
        assert size >= LABEL_MIN_PT, (page, pg, size, text)
        t = flat(text)
        if len(t.split()) >= 4 and any(t in b for b in body):   # a sentence (a drawing label is shorter)
            checked_body += 1
            assert size >= BODY_MIN_PT, (page, pg, size, text)
    assert checked_body > 20
    # the numbers to fly, on the front page, large
    values = {f.value for s in layout.sections() for f in s.figures}
    front_sizes = {flat(t): s for pg, s, t in found if pg == 0}
    for v in values:
        v = flat(v)
        if v in front_sizes:
            assert front_sizes[v] >= FIGURE_MIN_PT, (v, front_sizes[v])
    assert sum(1 for v in values if flat(v) in front_sizes) >= 6


def test_front_page_has_what_a_crew_needs_at_a_glance():
    brief = briefs()[0]
    layout = card_layout(brief)
    front = " ".join(t for pg, _, t in runs(card_pdf_bytes(brief)) if pg == 0)
    for fig in (f for s in (layout.minimums, layout.plan) for f in s.figures):
        assert flat(fig.label) in flat(front) and flat(fig.value) in flat(front), fig.label
    assert "NOT FOR NAVIGATION" in front
    assert re.search(r"WARNING", front)


def test_deck_pages_type_sizes(tmp_path):
    from briefer.instructor.deck import build_deck
    from briefer.render.deck_pdf import deck_pdf_bytes

    deck = build_deck(count=2, seed=7, airfields=["V2RL", "Q7HM"], profiles=["demo-bizjet", "demo-twin"])
    for page in ("half-letter", "a5"):
        for pg, size, text in runs(deck_pdf_bytes(deck, page=page)):
            if text.startswith("briefer "):
                continue
            assert size >= LABEL_MIN_PT, (page, pg, size, text)
