"""Pilot tests: drive the app as a crew would and check it shows what build_brief gives
(STYLE I: assert on the model and on the shown text, not on pixels)."""

from __future__ import annotations

import pytest
from test_app_support import METAR, demo_catalog, demo_inputs, expected_brief, settle, text_of
from textual import events
from textual.widgets import Input, TabbedContent

from briefer.wording import components_words
from briefer.tui.app import BriefingApp
from briefer.tui.inputs_file import load_inputs
from briefer.tui.widgets import ChoiceList, EnvelopePolar, FieldRow, PlanCanvas

SIZE = (100, 40)


def make_app(**kwargs) -> BriefingApp:
    return BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01, **kwargs)


async def type_into(pilot, field_id: str, text: str, *, paste: bool = True) -> None:
    """Click the field, clear it, then paste the text (one edit) or type it key by key."""
    await pilot.pause()                      # let a tab switch lay out before clicking
    await pilot.click(f"#{field_id}")
    await pilot.press("home", "ctrl+k")
    if paste:
        pilot.app.main.query_one(f"#{field_id}", Input).post_message(events.Paste(text))
        await pilot.pause()
    else:
        await pilot.press(*text)
    assert pilot.app.main.query_one(f"#{field_id}", Input).value == text


async def test_opens_on_the_demo_and_shows_build_brief_numbers():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        want = expected_brief(app)
        assert app.brief.minimums.mda_ft == want.minimums.mda_ft
        assert app.stale is None
        summary = text_of(app.main.query_one("#summary"))
        assert f"CAT {want.category.category}" in summary and f"MDA {want.minimums.mda_ft:.0f}" in summary
        # the short caution is on the screen, the warnings line first
        assert "NOT FOR NAVIGATION" in text_of(app.main.query_one("#caution"))
        assert "WARNING" in text_of(app.main.query_one("#warnings"))


async def test_pick_an_approach_and_type_a_wind_recomputes():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("2")
        assert app.main.query_one("#steps", TabbedContent).active == "airfield"
        app.main.query_one("#approach", ChoiceList).focus()
        await pilot.press("down")
        await settle(app, pilot)
        assert app.inputs.approach == "NDB-B"
        assert app.brief.header.approach_name == "NDB-B"

        await pilot.press("4")
        await type_into(pilot, "wind", "300/25G35", paste=False)
        await settle(app, pilot)
        w = app.inputs.weather
        assert (w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt) == (300, 25, 35)
        want = expected_brief(app)
        assert app.brief.wind.headwind_kt == pytest.approx(want.wind.headwind_kt)
        assert app.brief.performance.tas_kt == pytest.approx(want.performance.tas_kt)
        shown = text_of(app.main.query_one("#implies-weather"))
        assert components_words(want.wind.headwind_kt, want.wind.crosswind_from_right_kt) in " ".join(shown.split())
        await pilot.press("escape", "6")
        await pilot.pause()
        plan = text_of(app.main.query_one("#plan-numbers"), width=36)
        if want.plan.feasible:
            assert f"{want.plan.offset_nm:.2f} NM" in plan
        else:
            assert "NOT FLYABLE" in plan


async def test_choose_profile_and_airfield_from_lists():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        app.main.query_one("#profile", ChoiceList).focus()
        await pilot.press("down", "down")           # demo-twin
        await settle(app, pilot)
        assert app.inputs.profile == "demo-twin"
        assert app.brief.header.profile_name == "demo-twin"
        await pilot.press("2")
        app.main.query_one("#airfield-list", ChoiceList).focus()
        await pilot.press("down")                   # the next airfield: approach and runway follow
        await settle(app, pilot)
        af = app.catalog.airfield(app.inputs.airfield)
        assert app.inputs.airfield != "V2RL"
        assert app.inputs.approach in [a.name for a in af.approaches]
        assert app.brief.header.airfield_ident == af.ident
        await pilot.press("3")
        app.main.query_one("#runway-list", ChoiceList).focus()
        await pilot.press("down")
        await settle(app, pilot)
        assert app.brief.header.landing_runway == app.inputs.landing_runway


async def test_paste_a_metar_then_override_a_field():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("4")
        report = app.main.query_one("#report", Input)
        report.focus()
        report.post_message(events.Paste(METAR))
        await settle(app, pilot)
        assert app.inputs.weather.report == METAR
        assert app.inputs.weather.explicit() == {}          # the report fills every field now
        assert app.main.query_one("#wind", Input).value == ""
        assert "300/12" in app.main.query_one("#wind", Input).placeholder
        assert app.brief.weather.source == "report"
        assert app.brief.weather.oat_c == -2
        assert app.brief.minimums.cold is not None         # -2 °C: the cold correction shows
        await type_into(pilot, "oat", "-10")
        await settle(app, pilot)
        assert app.brief.weather.oat_c == -10
        assert app.brief.wind.speed_kt == 12                # still the report's wind
        assert app.brief.performance.tas_kt == pytest.approx(expected_brief(app).performance.tas_kt)


async def test_bad_report_shows_inline_and_keeps_the_last_brief_stale():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        good = app.brief
        await pilot.press("4")
        await type_into(pilot, "report", "XX")
        await settle(app, pilot)
        row = app.main.query_one("#row-report", FieldRow)
        assert row.error is not None and "METAR" in row.error
        assert app.brief is good
        assert app.stale is not None and "report" in app.stale
        assert "STALE" in text_of(app.main.query_one("#warnings"))
        await pilot.press("home", "ctrl+k")                 # clear it: fresh again
        await settle(app, pilot)
        assert app.stale is None and row.error is None


async def test_impossible_value_is_shown_beside_the_field():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("4")
        await type_into(pilot, "wind", "250/15G10")         # gust below the speed
        await settle(app, pilot)
        assert app.main.query_one("#row-wind", FieldRow).error
        assert app.stale is not None
        await type_into(pilot, "altimeter", "29.92")        # inHg, told apart by its range
        await type_into(pilot, "wind", "250/15G25")
        await settle(app, pilot)
        assert app.stale is None
        assert app.brief.weather.altimeter_hpa == pytest.approx(1013.2, abs=0.1)   # 29.92 inHg = 1013.2 hPa
        await pilot.press("escape", "1")                    # leave the field, then digits jump
        await type_into(pilot, "weight", "5")               # below the landing-weight range
        await settle(app, pilot)
        assert app.main.query_one("#row-weight", FieldRow).error
        assert app.stale is not None


async def test_switch_views_and_the_envelope_arrives():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        tabs = app.main.query_one("#steps", TabbedContent)
        for key, pane in (("5", "brief"), ("6", "plan"), ("7", "sight")):
            await pilot.press(key)
            assert tabs.active == pane
        await pilot.press("ctrl+n")
        assert tabs.active == "envelope"
        await settle(app, pilot, envelope=True)
        polar = app.main.query_one(EnvelopePolar)
        assert polar.envelope is app.envelope
        assert "Today's wind" in text_of(app.main.query_one("#envelope-hover"))
        await pilot.press("6")
        canvas = app.main.query_one(PlanCanvas)
        assert canvas.brief is app.brief
        await pilot.press("ctrl+g")                         # ASCII drawings
        assert canvas.ascii and not polar.unicode
        await pilot.press("ctrl+t")
        assert app.theme == "briefer-night"
        await pilot.press("f1")
        assert type(app.screen).__name__ == "HelpScreen"
        await pilot.press("escape")
        assert app.screen is app.main


async def test_save_and_reopen(tmp_path):
    path = tmp_path / "my-brief.yaml"
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("4")
        await type_into(pilot, "wind", "020/12")
        await settle(app, pilot)
        await pilot.press("escape")
        saved = app.inputs
        await pilot.press("ctrl+s")
        dialog = app.screen
        dialog.query_one("#path-input", Input).value = str(path)
        await pilot.press("enter")
        await pilot.pause()
        assert app.screen is app.main
        assert load_inputs(path) == saved
        # change something, then reopen the file through the dialog
        await type_into(pilot, "wind", "calm")
        await settle(app, pilot)
        assert app.inputs != saved
        await pilot.press("ctrl+o")
        app.screen.query_one("#path-input", Input).value = str(tmp_path / "missing.yaml")
        await pilot.press("enter")
        await pilot.pause()
        assert "no such file" in text_of(app.screen.query_one("#path-error"))   # inline, dialog stays
        app.screen.query_one("#path-input", Input).value = str(path)
        await pilot.press("enter")
        await settle(app, pilot)
        assert app.screen is app.main
        assert app.inputs == saved
        assert app.main.query_one("#wind", Input).value == "020/12"
        assert app.brief.wind.from_deg_true == 20


async def test_card_and_instructor_actions_never_crash():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("ctrl+e")     # the card writer may not exist yet: a notice, not a crash
        await pilot.pause()
        if app.screen is not app.main:
            await pilot.press("escape")
        await pilot.press("ctrl+l")
        await pilot.pause()
        if app.screen is not app.main:
            app.pop_screen()
        assert app.brief is not None


async def test_palette_lists_every_action():
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        titles = {c.title for c in app.get_system_commands(app.main)}
        for title in ("Next step", "Save inputs", "Open inputs", "Export card", "Night theme", "ASCII drawings",
                      "Instructor", "Help and cautions", "Go to: Winds"):
            assert title in titles
