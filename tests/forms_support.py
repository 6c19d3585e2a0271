"""Shared helpers for the form tests (no tests here)."""

from __future__ import annotations

import json

from textual.keys import _character_to_key

from briefer.brief import build_brief
from briefer.render.brief_json import brief_to_dict
from briefer.tui.forms.screen import FormScreen, widget_id


def keys_of(text: str) -> list[str]:
    return [_character_to_key(c) for c in text]


async def type_field(pilot, fpath: tuple, text: str) -> None:
    """Focus a form field, clear it and type `text` key by key (as a crew would)."""
    screen = pilot.app.screen
    assert isinstance(screen, FormScreen)
    inp = screen.query_one("#" + widget_id("in", fpath))
    inp.focus()
    await pilot.pause()
    await pilot.press("end", "ctrl+u")
    if text:
        await pilot.press(*keys_of(text))
    await pilot.pause()
    assert inp.value == text, (fpath, inp.value, text)


async def type_fields(pilot, entries: list[tuple[tuple, str]]) -> None:
    for fpath, text in entries:
        await type_field(pilot, fpath, text)


async def wait_until(pilot, ready, *, timeout_s: float = 10.0) -> None:
    """Let the app run until `ready()` holds, or `timeout_s` has passed (the caller then asserts):
    on a loaded machine a timer's work can finish well after its delay."""
    import time

    end = time.monotonic() + timeout_s
    while not ready() and time.monotonic() < end:
        await pilot.pause(0.05)


def message_of(screen: FormScreen, fpath: tuple) -> str:
    """The text shown beside a field."""
    return str(screen._msgs[fpath].content)


def brief_json(request, report=None) -> str:
    return json.dumps(brief_to_dict(build_brief(request, weather_report=report)), sort_keys=True)


def form_app():
    """The app on the demo catalog, as the form tests drive it (a short debounce)."""
    from test_app_support import demo_catalog, demo_inputs

    from briefer.tui.app import BriefingApp

    return BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01)


async def open_new_form(app, pilot, step: str, spec) -> FormScreen:
    """Settle, go to `step` ('1' aircraft, '2' airfield) and press F2: the new form of `spec`."""
    from test_app_support import settle

    await settle(app, pilot)
    await pilot.press(step)
    await pilot.pause()
    await pilot.press("f2")
    await pilot.pause()
    screen = pilot.app.screen
    assert isinstance(screen, FormScreen) and screen.spec is spec
    return screen
