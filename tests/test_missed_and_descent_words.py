"""The words of the missed approach and of a descent that starts in the final turn, as a crew
reads them: no word said twice, no dangling 'then', the charted instruction after a colon in
every output (AIM 5-4-21(c): the initial climbing turn toward the landing runway, then the
published missed approach)."""

from __future__ import annotations

import io

from briefer.brief import build_brief, demo_request
from briefer.render.card_layout import card_layout
from briefer.render.views import PlanView
from rich.console import Console
from briefer.wording import missed_approach_words


def test_missed_approach_words_name_the_turn_and_the_charted_text_after_a_colon():
    assert missed_approach_words("right", "Climb to 3500.") == \
        "climbing turn RIGHT toward the runway, then: Climb to 3500."
    assert missed_approach_words("", "Climb to 3500.") == "climbing turn toward the runway, then: Climb to 3500."


def test_without_a_charted_instruction_the_words_do_not_end_on_then():
    for text in ("", "   "):
        w = missed_approach_words("left", text)
        assert w == "climbing turn LEFT toward the runway, then the published missed approach"
        assert not w.rstrip().endswith(("then", "then:"))


def test_the_text_brief_and_the_card_say_the_missed_approach_alike():
    b = build_brief(demo_request(), computed_utc="2026-01-01 00:00Z")
    words = missed_approach_words(b.missed_approach.turn_direction, b.missed_approach.instruction)
    assert ", then: " in words
    console = Console(width=400, record=True, file=io.StringIO())
    console.print(PlanView(b))
    assert words in " ".join(console.export_text().split())
    rows = [r.text for r in card_layout(b).plan.rows if r.label == "Missed appr"]
    assert rows == [words]


def test_the_descent_in_the_turn_finding_says_the_final_turn_once():
    b = build_brief(demo_request(), computed_utc="2026-01-01 00:00Z")
    assert b.plan.leave_mda_in_turn, "the demo's plan leaves the MDA in the final turn"
    (text,) = [f.text for f in b.findings if f.code == "descent-in-turn"]
    assert text.count("final turn") == 1, text
    assert text.endswith(".") and b.plan.leave_mda_text in text
