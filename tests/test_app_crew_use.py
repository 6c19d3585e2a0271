"""Pilot tests of the app as a crew uses it: number keys, focus, scrolling, the warnings line at
80x24, the brief kept while a field is wrong, the dialogs' wording and the help screen."""

from __future__ import annotations

from test_app_support import demo_catalog, demo_inputs, settle, text_of
from textual.widgets import Input, Static, TabbedContent

from briefer.tui.app import BriefingApp

SMALL = (80, 24)
LARGE = (120, 40)


def make_app(**kwargs) -> BriefingApp:
    return BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01, **kwargs)


def active(app: BriefingApp) -> str:
    return app.main.query_one("#steps", TabbedContent).active


async def test_number_keys_switch_steps_and_never_type_into_the_report():
    """Pressing 4 shows the weather step without putting a text field into typing mode: the
    next digit switches steps and the report stays empty."""
    app = make_app()
    async with app.run_test(size=SMALL) as pilot:
        await settle(app, pilot)
        await pilot.press("4")
        await pilot.pause()
        assert active(app) == "weather"
        assert not isinstance(app.focused, Input)
        await pilot.press("6")
        await pilot.pause()
        assert active(app) == "plan"
        assert app.main.query_one("#report", Input).value == ""
        await settle(app, pilot)
        assert app.stale is None
        # every step: a digit after it still switches
        for key, pane in (("1", "aircraft"), ("2", "airfield"), ("3", "runway"), ("4", "weather"),
                          ("5", "brief"), ("6", "plan"), ("7", "sight"), ("8", "envelope"), ("4", "weather")):
            await pilot.press(key)
            await pilot.pause()
            assert active(app) == pane
            assert not isinstance(app.focused, Input), pane


async def test_tab_into_a_field_then_digits_type():
    """Digits type into a field the user tabbed into (and Esc gives them back to the steps)."""
    app = make_app()
    async with app.run_test(size=SMALL) as pilot:
        await settle(app, pilot)
        await pilot.press("4", "tab")
        await pilot.pause()
        assert app.focused is app.main.query_one("#report", Input)
        await pilot.press("tab")
        assert app.focused is app.main.query_one("#wind", Input)
        await pilot.press("2", "7", "0")
        assert app.main.query_one("#wind", Input).value == "270"
        assert active(app) == "weather"
        await pilot.press("escape", "6")
        await pilot.pause()
        assert active(app) == "plan"


async def test_brief_view_scrolls_with_pagedown_at_once():
    app = make_app()
    async with app.run_test(size=SMALL) as pilot:
        await settle(app, pilot)
        await pilot.press("5")
        await pilot.pause(0.1)
        scroll = app.main.query_one("#brief-scroll")
        assert scroll.max_scroll_y > 0
        await pilot.press("pagedown")
        await pilot.pause(0.1)
        assert scroll.scroll_y > 0


async def test_scrollbars_never_draw_over_the_text():
    """Each scrolling pane keeps its scrollbar's columns free: the text is laid out beside it."""
    for size in (SMALL, LARGE):
        app = make_app()
        async with app.run_test(size=size) as pilot:
            await settle(app, pilot)
            for key, scroll_id, body_id in (("1", ".implies", "#implies-aircraft"),
                                            ("5", "#brief-scroll", "#brief-full"), ("6", "#plan-right", "#plan-numbers"),
                                            ("7", "#sight-scroll", "#sight-table"), ("1", None, None)):
                await pilot.press(key)
                await pilot.pause(0.1)
                if scroll_id is None:
                    continue
                scroll = app.main.query(scroll_id).first()
                body = app.main.query_one(body_id, Static)
                # the bar's columns are kept (shown or not) and the text stops short of them, with
                # a blank column between (measured in tmux: the bar is drawn one column inside
                # the region's edge, so the text must end two columns before the gutter)
                assert scroll.styles.scrollbar_gutter == "stable", scroll_id
                gutter_x = scroll.region.right - scroll.styles.scrollbar_size_vertical
                assert body.content_region.right <= gutter_x - 2, (size, scroll_id, body.content_region,
                                                                   scroll.region)


async def test_warning_line_shows_the_count_and_the_top_warning_whole_at_80x24():
    app = make_app()
    async with app.run_test(size=SMALL) as pilot:
        await settle(app, pilot)
        top = app.brief.warnings[0].text
        widget = app.main.query_one("#warnings", Static)
        shown = " ".join(line.text for line in widget.render_lines(widget.region.reset_offset))
        shown = " ".join(shown.split())
        assert "WARNINGS" in shown or "WARNING" in shown
        assert " ".join(top.split()) in shown


async def test_stale_line_says_which_value_the_kept_brief_shows():
    """Typed key by key, '25015KTX' passes through readable prefixes (25015KT = 250/15); the
    brief kept on screen is that intermediate one, and the stale line says so."""
    app = make_app()
    async with app.run_test(size=SMALL) as pilot:
        await settle(app, pilot)
        await pilot.press("4", "tab", "tab")
        assert app.focused is app.main.query_one("#wind", Input)
        await pilot.press("home", "ctrl+k")
        for ch in "25015KT":
            await pilot.press(ch)
        await settle(app, pilot)
        assert (app.inputs.weather.wind_from_deg, app.inputs.weather.wind_speed_kt) == (250, 15)
        await pilot.press("X")
        await settle(app, pilot)
        assert app.stale is not None
        line = " ".join(text_of(app.main.query_one("#warnings"), width=80).split())
        assert "STALE" in line
        assert "last good brief shown: wind 250/15. wind: cannot read" in line


async def test_export_card_twice_speaks_the_dialogs_language(tmp_path):
    """The second export to the same name points at the dialog's own checkbox, never a CLI flag;
    ticking it replaces the file."""
    from textual.widgets import Checkbox

    path = tmp_path / "card.pdf"
    app = make_app()
    async with app.run_test(size=LARGE) as pilot:
        await settle(app, pilot)
        for attempt in range(2):
            await pilot.press("ctrl+e")
            await pilot.pause()
            app.screen.query_one("#path-input", Input).value = str(path)
            await pilot.press("enter")
            await pilot.pause(0.3)
            if attempt == 0:
                assert app.screen is app.main and path.exists()
        error = " ".join(text_of(app.screen.query_one("#path-error"), width=200).split())
        assert "already exists" in error
        assert "--force" not in error and "replace an existing file" in error
        app.screen.query_one("#path-overwrite", Checkbox).value = True
        await pilot.press("enter")
        await pilot.pause(0.3)
        assert app.screen is app.main


async def test_help_lists_keys_as_a_crew_reads_them():
    """F1: readable key names, every key once (Esc too), and the step keys 1-8."""
    app = make_app()
    async with app.run_test(size=LARGE) as pilot:
        await settle(app, pilot)
        await pilot.press("f1")
        await pilot.pause()
        static = app.screen.query_one(Static)
        shown = text_of(static, width=110)
        assert "question_mark" not in shown and "f1," not in shown
        keys = [line.split()[0] for line in shown.splitlines() if line.strip()]
        assert "1-8" in shown
        for n, label in enumerate(("Aircraft", "Airfield", "Runway", "Weather", "Brief", "Plan", "Sight", "Winds"), 1):
            assert f"{n} {label}" in shown
        assert sum(1 for line in shown.splitlines() if line.strip().lower().startswith("esc")) == 1, keys
        assert "F1 or ?" in shown
