"""Pilot tests of the instructor screen as opened from the app: the brief's airfield, keys and
palette entries for its tabs, no clipped text at 80x24 or 120x40, the answer key drawn whole."""

from __future__ import annotations

from test_app_support import demo_catalog, demo_inputs, settle
from textual.widgets import Checkbox, Select, Static, TabbedContent

from briefer.tui.app import BriefingApp
from briefer.tui.instructor_screen import InstructorScreen


def make_app() -> BriefingApp:
    return BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01)


async def open_instructor(app, pilot) -> InstructorScreen:
    await settle(app, pilot)
    await pilot.press("ctrl+l")
    await pilot.pause(0.2)
    assert isinstance(app.screen, InstructorScreen)
    return app.screen


async def generate(app, pilot, screen: InstructorScreen) -> None:
    await pilot.press("ctrl+g")
    await app.workers.wait_for_complete()
    await pilot.pause(0.2)
    assert screen.generated is not None


def lines_of(static: Static) -> list[str]:
    return str(static.render()).splitlines()


async def test_opens_on_the_briefs_airfield_and_profile():
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_instructor(app, pilot)
        assert screen.query_one("#airfield", Select).value == app.inputs.airfield
        assert screen.query_one("#profile", Select).value == app.inputs.profile


async def test_keys_and_palette_reach_every_tab_and_steps_keys_stay_off():
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_instructor(app, pilot)
        await generate(app, pilot, screen)
        tabs = screen.query_one("#instructor-tabs", TabbedContent)
        for key, pane in (("3", "answer-tab"), ("2", "student-tab"), ("1", "choose-tab"), ("3", "answer-tab")):
            await pilot.press(key)
            await pilot.pause()
            assert tabs.active == pane
        # the main screen's steps did not move behind it
        assert app.main.query_one("#steps", TabbedContent).active == "aircraft"
        titles = [c.title for c in app.get_system_commands(screen)]
        assert "Instructor: answer key" in titles and "Instructor: student page" in titles


async def test_nothing_clipped_at_80x24_and_labels_whole_at_120x40():
    for size in ((80, 24), (120, 40)):
        app = make_app()
        async with app.run_test(size=size) as pilot:
            screen = await open_instructor(app, pilot)
            box = screen.query_one("#overwrite", Checkbox)
            assert box.region.width >= len("Overwrite existing files") + 4, size
            await generate(app, pilot, screen)
            await pilot.press("2")
            await pilot.pause()
            student = screen.query_one("#student", Static)
            visible = screen.query_one("#student-scroll").scrollable_content_region.width
            for line in lines_of(student):
                assert len(line) <= visible, (size, line)
            brief = screen.generated.brief
            shown = "\n".join(lines_of(student))
            assert f"elevation {brief.header.airfield_elevation_ft:.0f} ft" in shown
            assert screen.generated.scenario.weather.report.split()[-1] in shown


async def test_answer_key_is_laid_out_whole_when_shown():
    """Generated while its tab was hidden, the answer key is laid out at its full length when
    its tab is shown (not half-drawn until the window is resized)."""
    app = make_app()
    async with app.run_test(size=(120, 40)) as pilot:
        screen = await open_instructor(app, pilot)
        await generate(app, pilot, screen)
        await pilot.press("3")
        await pilot.pause(0.2)
        answer = screen.query_one("#answer", Static)
        n = len(lines_of(answer))
        assert n > 60
        assert answer.size.height == n
        scroll = screen.query_one("#answer-scroll")
        assert scroll.virtual_size.height >= n
