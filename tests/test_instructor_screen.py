"""Pilot tests of the instructor screen (STYLE I: assert on the model and the shown text).

Wiring only: the screen shows what `generate_scenario`, `student_text` and `answer_text` give for
the choices made, and writes what `write_scenario` and the deck write. The numbers are checked
in test_scenarios and test_minimums.
"""

from __future__ import annotations

import pytest
from textual.app import App
from textual.widgets import Checkbox, Input, Select, Static

from briefer.io import catalog
from briefer.instructor.deck import student_text
from briefer.instructor.generation import generate_scenario
from briefer.instructor.scenario_format import load_scenario
from briefer.tui.instructor_screen import InstructorScreen
from briefer.tui.state import AppCatalog

SIZE = (120, 44)


@pytest.fixture(scope="module")
def small_catalog() -> AppCatalog:
    return AppCatalog.of([catalog.find_profile("demo-bizjet"), catalog.find_profile("demo-twin")],
                         [catalog.find_airfield("V2RL"), catalog.find_airfield("Q7HM")])


class Host(App[None]):
    """A bare app that opens the screen, as the briefing app's action does."""

    def __init__(self, screen: InstructorScreen) -> None:
        super().__init__()
        self.instructor = screen

    def on_mount(self) -> None:
        self.push_screen(self.instructor)


def shown(screen: InstructorScreen, selector: str) -> str:
    return str(screen.query_one(selector, Static).render())


async def wait(pilot) -> None:
    await pilot.app.workers.wait_for_complete()
    await pilot.pause()


async def choose(pilot, screen: InstructorScreen, *, airfield: str, profile: str, emphasis: str, seed: int) -> None:
    screen.query_one("#airfield", Select).value = airfield
    screen.query_one("#profile", Select).value = profile
    screen.query_one("#emphasis", Select).value = emphasis
    screen.query_one("#seed", Input).value = str(seed)
    await pilot.pause()


async def test_generate_previews_student_page_and_answer(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=5, out_dir=tmp_path)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        await choose(pilot, screen, airfield="Q7HM", profile="demo-twin", emphasis="cold", seed=8)
        await pilot.press("ctrl+g")
        await wait(pilot)
        want = generate_scenario(airfield=catalog.find_airfield("Q7HM"), profile=catalog.find_profile("demo-twin"),
                                 emphasis="cold", seed=8)
        assert screen.generated.scenario == want.scenario and screen.stale is None
        assert shown(screen, "#student") == student_text(want.scenario, want.brief).rstrip("\n") or \
            want.scenario.weather.report in shown(screen, "#student")
        answer = shown(screen, "#answer")
        assert "GRADING TOLERANCES" in answer and "SIGHT-PICTURE TRAP" in answer
        assert f"{want.brief.minimums.mda_ft:.0f}" in answer
        assert "NOT FOR NAVIGATION" in shown(screen, "#instructor-caution")
        # a changed choice marks the preview stale until Generate
        screen.query_one("#seed", Input).value = "9"
        await pilot.pause()
        assert screen.stale is not None and "STALE" in shown(screen, "#instructor-status")


async def test_write_the_scenario_file(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=3, out_dir=tmp_path)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        await choose(pilot, screen, airfield="V2RL", profile="demo-bizjet", emphasis="reciprocal", seed=3)
        await pilot.press("ctrl+g")
        await wait(pilot)
        await pilot.press("ctrl+w")
        await pilot.pause()
        assert screen.written is not None and screen.written.parent == tmp_path
        assert load_scenario(screen.written).scenario == screen.generated.scenario
        # a second write is refused unless overwriting is ticked; the file is kept
        before = screen.written.read_bytes()
        screen.written = None
        await pilot.press("ctrl+w")
        await pilot.pause()
        assert screen.written is None and screen.stale and "already exists" in screen.stale
        screen.query_one("#overwrite", Checkbox).value = True
        await pilot.press("ctrl+w")
        await pilot.pause()
        assert screen.written is not None and screen.written.read_bytes() == before


async def test_write_a_deck(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=4, out_dir=tmp_path, deck_count=1)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert screen.query_one("#deck-path", Input).value == str(tmp_path / "deck-4.pdf")
        await pilot.press("ctrl+d")
        await wait(pilot)
        assert screen.deck == tmp_path / "deck-4.pdf"
        assert screen.deck.read_bytes().startswith(b"%PDF")


async def test_bad_seed_is_a_notice_not_a_crash(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=1, out_dir=tmp_path)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen.query_one("#seed", Input).value = "-2"
        await pilot.press("ctrl+g")
        await wait(pilot)
        assert screen.generated is None and not screen.busy
        await pilot.press("ctrl+w")                 # nothing to write yet: a notice
        await pilot.pause()
        assert screen.written is None


async def test_impossible_emphasis_keeps_the_last_good_preview(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=2, out_dir=tmp_path)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        await choose(pilot, screen, airfield="V2RL", profile="demo-twin", emphasis="cold", seed=2)
        await pilot.press("ctrl+g")
        await wait(pilot)
        good = screen.generated
        await choose(pilot, screen, airfield="V2RL", profile="demo-twin", emphasis="gusty-category", seed=2)
        await pilot.press("ctrl+g")
        await wait(pilot)
        assert screen.generated is good and "no gust raises" in screen.stale


async def test_needs_no_arguments(monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    screen = InstructorScreen()             # loads the catalog itself
    assert "V2RL" in screen.airfields and "demo-bizjet" in screen.profiles
    assert screen.out_dir == tmp_path


async def test_escape_closes(small_catalog, tmp_path):
    screen = InstructorScreen(small_catalog, seed=1, out_dir=tmp_path)
    host = Host(screen)
    async with host.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert host.screen is screen
        await pilot.press("escape")
        await pilot.pause()
        assert host.screen is not screen


async def test_the_screen_says_the_seed_and_deck_ranges_as_the_command_line_does(small_catalog, tmp_path):
    """The instructor screen said "the seed: expected 0 to 2^63-1, got -2" where the command line
    and the scenario file say "expected a whole number from 0 to 2^63-1"; one wording now
    (briefer.vocabulary SEED_WORDS, DECK_SIZE_WORDS)."""
    import argparse

    from briefer.commands.scenario import _count, _seed
    from briefer.errors import BriefingError

    def cli_words(parse, text: str) -> str:
        with pytest.raises(argparse.ArgumentTypeError) as exc:
            parse(text)
        return str(exc.value)

    screen = InstructorScreen(small_catalog, seed=1, out_dir=tmp_path)
    async with Host(screen).run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen.query_one("#seed", Input).value = "-2"
        with pytest.raises(BriefingError) as seed_exc:
            screen._seed()
        screen.query_one("#deck-count", Input).value = "51"
        with pytest.raises(BriefingError) as count_exc:
            screen._count()
    assert str(seed_exc.value) == "the seed: " + cli_words(_seed, "-2")
    assert str(seed_exc.value) == "the seed: expected a whole number from 0 to 2^63-1, got -2"
    assert str(count_exc.value) == "the deck size: " + cli_words(_count, "51")
