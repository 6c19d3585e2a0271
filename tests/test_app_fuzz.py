"""Random key sequences (seeded) must never raise: every bad entry is shown, never crashes."""

from __future__ import annotations

import random

import pytest

from test_app_support import demo_catalog, demo_inputs, expected_brief, settle

from briefer.tui.app import BriefingApp

pytestmark = pytest.mark.slow   # a sweep or fuzz: `-m "not slow"` skips it in a quick run

KEYS = list("0123456789/GVRBKTQAMabxz .-") + [
    "tab", "shift+tab", "up", "down", "left", "right", "enter", "escape", "backspace", "home", "end",
    "ctrl+k", "ctrl+n", "f1", "ctrl+s", "ctrl+o", "ctrl+e", "space"]
SEQUENCES = 40
LENGTH = 3


def send_keys(app, keys: list[str]) -> None:
    """Queue key events as a fast typist would (no wait between keys, unlike Pilot.press)."""
    from textual import events
    from textual.keys import _character_to_key

    for key in keys:
        if len(key) == 1 and not key.isalnum():
            name = _character_to_key(key)
            char = key
        else:
            name, char = key, (key if len(key) == 1 else (" " if key == "space" else None))
        event = events.Key(name, char)
        event.set_sender(app)
        app._driver.send_message(event)


async def test_random_keys_never_crash(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)          # a random Enter in the save dialog writes here
    rng = random.Random(20240601)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.1)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        for _ in range(SEQUENCES):
            send_keys(app, rng.choices(KEYS, k=LENGTH))
            await pilot.pause()
            if app.screen is not app.main and rng.random() < 0.5:
                await pilot.press("escape")
        while app.screen is not app.main:
            await pilot.press("escape")
        await settle(app, pilot)
        assert app.brief is not None
        if app.stale is None:            # what is shown answers the inputs
            assert app.brief.plan.shape == expected_brief(app).plan.shape
