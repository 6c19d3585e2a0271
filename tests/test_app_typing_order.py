"""Keys that arrive together (a fast typist, keys buffered by a slow SSH link) take effect in the
order they were typed, editing keys included.

Textual applies an input's editing keys (End, ctrl+U, Backspace ...) as key bindings, after the
key has passed up through every container to the app, but inserts a character as soon as the
input gets it: 'End ctrl+U 310/20' typed in one burst into '240/10G16' left '10/20'. The app's
inputs (`briefer.tui.widgets.TypingInput`) apply their editing keys as they receive them."""

from __future__ import annotations

from textual import events
from textual.keys import _character_to_key
from textual.widgets import Input
from test_app_support import demo_catalog, demo_inputs, settle

from briefer.tui.app import BriefingApp


def _burst(app, keys: list[str]) -> None:
    """Post every key at once, as a terminal hands over keys that arrived together."""
    for k in keys:
        app.post_message(events.Key(_character_to_key(k) if len(k) == 1 else k, k if len(k) == 1 else None))


async def _in_weather_field(app, pilot, field_id: str) -> Input:
    """Settle, show the weather step (4) and put the cursor in one of its fields."""
    await settle(app, pilot)
    await pilot.press("4")
    await settle(app, pilot)
    field = app.main.query_one(f"#{field_id}", Input)
    field.focus()
    await settle(app, pilot)
    return field


async def test_a_burst_of_editing_keys_and_characters_lands_in_the_order_typed():
    app = BriefingApp(demo_catalog(), demo_inputs())
    async with app.run_test(size=(80, 24)) as pilot:
        wind = await _in_weather_field(app, pilot, "wind")
        assert wind.value == "240/10G16"
        _burst(app, ["end", "ctrl+u", *"310/20", "backspace", "5", "left", "left", "left", "backspace", "2"])
        await settle(app, pilot)
        assert wind.value == "312/25"          # 310/20, 310/25, then 31|/25 -> 312/25
        await settle(app, pilot)
        assert app.inputs.weather.wind_from_deg == 312 and app.inputs.weather.wind_speed_kt == 25


async def test_characters_typed_right_after_tab_go_to_the_next_field():
    """Tab moved the focus only after the key had passed up to the app, so '270/12' typed right
    after Tab went into the METAR field being left; Tab is now the screen's priority binding."""
    app = BriefingApp(demo_catalog(), demo_inputs())
    async with app.run_test(size=(80, 24)) as pilot:
        report = await _in_weather_field(app, pilot, "report")
        _burst(app, ["tab", "end", "ctrl+u", *"270/12"])
        await settle(app, pilot)
        assert report.value == ""
        assert app.main.query_one("#wind", Input).value == "270/12"
        _burst(app, ["shift+tab", *"x", "tab"])     # back, a slip in the METAR field, forward again
        await settle(app, pilot)
        assert report.value == "x" and app.focused is app.main.query_one("#wind", Input)
