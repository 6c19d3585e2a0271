"""What an edit costs the screen: the typed character and the brief it leads to reach the terminal
in one frame; an edit repaints the widgets it changes, never the whole screen; a new brief whose
text keeps its height lays nothing out again, and one that changes a height is laid out (its new
line shows). (Behaviour of the app itself: no outside source; Textual's documented
`App.batch_update` and `Widget.refresh(layout=...)` are what is relied on.)"""

from __future__ import annotations

import threading

from test_app_support import demo_catalog, demo_inputs, settle
from textual._compositor import Compositor
from textual.screen import Screen
from textual.widgets import Input, Static

import briefer.brief
import briefer.tui.app as app_module
from briefer.tui.app import BriefingApp
from briefer.tui.frame_compositor import ChangedRegionsCompositor


def _frames(monkeypatch, app: BriefingApp) -> list[float | None]:
    """The wind the brief on screen answered, for every frame written to the terminal from now."""
    seen: list[float | None] = []
    real = BriefingApp._display

    def display(self, screen, renderable):
        real(self, screen, renderable)
        if renderable is not None and not self._batch_count:
            seen.append(None if self.brief_inputs is None else self.brief_inputs.weather.wind_from_deg)

    monkeypatch.setattr(BriefingApp, "_display", display)
    return seen


async def _on_weather_step(app, pilot) -> Input:
    await settle(app, pilot)
    await pilot.press("4")
    await settle(app, pilot)
    wind = app.main.query_one("#wind", Input)
    wind.value = "251/15"                 # a first edit (its field's first repaint lays it out)
    await settle(app, pilot)
    return wind


async def test_the_typed_character_and_its_brief_reach_the_terminal_in_one_frame(monkeypatch):
    monkeypatch.setattr(app_module, "FRAME_HOLD_S", 30.0, raising=False)   # the brief, however slow here, is waited for
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        frames = _frames(monkeypatch, app)
        wind.value = "252/15"
        await settle(app, pilot)
        assert frames and frames[0] == 252.0      # no frame with the new text beside the old brief


async def test_a_slow_brief_does_not_hold_the_typed_character_back(monkeypatch):
    monkeypatch.setattr(app_module, "FRAME_HOLD_S", 0.05)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        real, gate = briefer.brief.build_brief, threading.Event()

        def held(request, **kw):
            gate.wait(10.0)
            return real(request, **kw)

        monkeypatch.setattr(briefer.brief, "build_brief", held)
        frames = _frames(monkeypatch, app)
        wind.value = "253/15"
        await pilot.pause(0.3)
        assert app.computing and frames and frames[0] == 251.0   # the echo is shown, the brief not yet
        assert wind.value == "253/15"
        gate.set()
        await settle(app, pilot)
        assert frames[-1] == 253.0


async def test_an_edit_repaints_the_widgets_it_changes_not_the_whole_screen(monkeypatch):
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        whole: list[Screen] = []
        real = Screen.refresh

        def refresh(self, *regions, **kw):
            if not regions:
                whole.append(self)
            return real(self, *regions, **kw)

        monkeypatch.setattr(Screen, "refresh", refresh)
        wind.value = "254/15"
        await settle(app, pilot)
        assert app.brief_inputs.weather.wind_from_deg == 254.0
        assert whole == []


async def test_a_brief_of_the_same_heights_lays_nothing_out_and_a_new_line_is_laid_out(monkeypatch):
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        layouts: list[Screen] = []
        real = Screen._refresh_layout

        def refresh_layout(self, *a, **kw):
            layouts.append(self)
            return real(self, *a, **kw)

        monkeypatch.setattr(Screen, "_refresh_layout", refresh_layout)
        implies = app.main.query_one("#implies-weather", Static)
        lines = implies.size.height
        wind.value = "252/15"                     # new numbers, the same lines
        await settle(app, pilot)
        assert app.brief_inputs.weather.wind_from_deg == 252.0
        assert implies.size.height == lines and layouts == []
        oat = app.main.query_one("#oat", Input)
        oat.value = "-35"                         # a cold-temperature line more in the weather pane
        await settle(app, pilot)
        assert app.brief.minimums.cold is not None
        assert layouts and implies.size.height == lines + 1


async def test_an_edits_frame_writes_what_textuals_own_compositor_writes(monkeypatch):
    """The main screen's compositor renders for a partial frame only the widgets seen in the
    regions that changed (briefer.tui.frame_compositor); Textual's own renders every widget in
    the box around them. Each frame of a run of edits (new numbers, a new line laid out, a value
    refused beside its field, another step) writes the same bytes as Textual's would."""
    compared: list[int] = []
    real = ChangedRegionsCompositor.render_partial_update

    def both(self):
        dirty = set(self._dirty_regions)
        ours = real(self)
        self._dirty_regions.update(dirty)
        theirs = Compositor.render_partial_update(self)     # Textual's: every widget in the box
        assert (ours is None) == (theirs is None)
        if ours is not None:
            console = app.console
            assert ours.render_segments(console) == theirs.render_segments(console)
            compared.append(len(dirty))
        return ours

    monkeypatch.setattr(ChangedRegionsCompositor, "render_partial_update", both)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        for text in ("255/15", "260/25G35", "bad wind", "270/10"):
            wind.value = text
            await settle(app, pilot)
        app.main.query_one("#oat", Input).value = "-35"      # a new line in the weather pane
        await settle(app, pilot)
        await pilot.press("escape", "6")                     # the plan view, then an edit's brief there
        await settle(app, pilot)
        app.inputs = app.inputs.with_weather(wind_from_deg=300.0, wind_speed_kt=20.0)
        await settle(app, pilot)
    assert len(compared) >= 6 and max(compared) >= 2         # frames of several changed regions among them


async def test_an_edits_frame_renders_the_field_and_the_text_not_the_containers_behind_them(monkeypatch):
    """A piece of a line is written from the front-most widget there (Textual's compositor keeps
    the first strip for it): the field typed in and the text below it paint every piece written,
    so the form, the tab pane and the screen behind them are not rendered for the edit's frame
    (briefer.tui.frame_compositor)."""
    from textual.widget import Widget

    monkeypatch.setattr(app_module, "FRAME_HOLD_S", 30.0, raising=False)   # the brief, however slow here, is waited for
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _on_weather_step(app, pilot)
        rendered: list[Widget] = []
        real_render, real_update = Widget.render_lines, ChangedRegionsCompositor.render_partial_update

        def render_lines(self, crop):
            rendered.append(self)
            return real_render(self, crop)

        def partial(self):
            rendered.clear()
            update = real_update(self)
            if update is not None:
                frames.append(list(rendered))
            return update

        frames: list[list[Widget]] = []
        monkeypatch.setattr(Widget, "render_lines", render_lines)
        monkeypatch.setattr(ChangedRegionsCompositor, "render_partial_update", partial)
        wind.value = "256/15"
        await settle(app, pilot)
        behind = {app.main, app.main.query_one("#weather-form"), app.main.query_one("#row-wind")}
        implies = app.main.query_one("#implies-weather", Static)
    shown = {w for frame in frames for w in frame}
    assert frames and wind in shown and implies in shown
    assert not shown & behind


async def test_a_hold_that_runs_out_while_the_app_closes_does_no_harm():
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await _on_weather_step(app, pilot)
        app.hold_frame()                    # an edit's hold ...
    app.release_frame()                     # ... running out once the screens are gone
    assert app._hold is None


async def test_the_step_shown_first_is_filled_before_the_other_steps_are_mounted(monkeypatch):
    """The first frames: the screen's frame, then the aircraft step with its lists filled, and
    only then the hidden steps and views are mounted (their widgets are most of the screen's)."""
    seen: list[tuple[bool, bool]] = []          # per frame: (profile list filled, weather step mounted)
    real = BriefingApp._display

    def display(self, screen, renderable):
        real(self, screen, renderable)
        if renderable is not None and not self._batch_count and screen is self.main:
            filled = bool(self.main.query("#profile") and self.main.query_one("#profile").option_count)
            seen.append((filled, bool(self.main.query("#row-wind"))))

    monkeypatch.setattr(BriefingApp, "_display", display)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        assert app.main.query_one("#row-wind")
    assert (True, False) in seen                # a frame with the step filled, the weather step not there yet
    assert seen[-1] == (True, True)


async def test_what_is_pushed_to_a_step_not_mounted_yet_reaches_it(monkeypatch):
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    real = app.main.__class__._mount_rest

    async def later(self):                      # the app pushes a wind while the weather step is not there
        assert not self.query("#row-wind")
        self.set_field_text("wind", "300/20")
        self.set_wind_reference("magnetic")
        await real(self)

    monkeypatch.setattr(app.main.__class__, "_mount_rest", later)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        assert app.main.query_one("#wind", Input).value == "300/20"
        assert app.main.query_one("#ref-magnetic").value
        assert app.inputs.weather.wind_from_deg == 300.0 and app.brief_inputs == app.inputs


async def test_the_frames_before_the_first_brief_say_it_is_being_computed(monkeypatch):
    summaries: list[str] = []
    real = BriefingApp._display

    def display(self, screen, renderable):
        real(self, screen, renderable)
        if renderable is not None and not self._batch_count and screen is self.main and self.brief is None:
            summaries.append(str(self.main.query_one("#summary", Static).content))

    monkeypatch.setattr(BriefingApp, "_display", display)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        assert str(app.main.query_one("#summary", Static).content).startswith("CAT ")
    assert summaries and set(summaries) == {"computing the brief..."}   # until the brief is there
