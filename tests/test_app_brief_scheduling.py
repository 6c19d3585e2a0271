"""The app builds one brief at a time: an edit starts it at once; edits made while it is built are
coalesced into one more brief, for the newest inputs; a changed catalog briefs again even when
the choices are the same (their data changed). (Behaviour of the app itself: no outside source.)"""

from __future__ import annotations

import threading

from test_app_support import demo_catalog, demo_inputs, expected_brief, settle
from textual.widgets import Input

import briefer.brief
from briefer.render.brief_json import brief_to_dict
from briefer.tui.app import BriefingApp


def _held_builds(monkeypatch):
    """build_brief that waits for ``gate`` before answering; records the winds it was asked for."""
    real = briefer.brief.build_brief
    asked: list[float | None] = []
    gate = threading.Event()
    gate.set()

    def build(request, **kw):
        asked.append(request.weather.wind_from_deg)
        gate.wait(10.0)
        return real(request, **kw)

    monkeypatch.setattr(briefer.brief, "build_brief", build)
    return asked, gate


async def test_edits_made_while_a_brief_is_built_give_one_more_brief_for_the_newest(monkeypatch):
    asked, gate = _held_builds(monkeypatch)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)     # the app's own (no) debounce
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        wind = app.main.query_one("#wind", Input)
        asked.clear()
        gate.clear()                                  # the next brief is held until released
        wind.value = "250/15"
        await pilot.pause(0.05)
        assert asked == [250.0] and app.computing     # started at once, no wait
        for text in ("260/15", "270/15", "280/15"):   # three edits while it is held
            wind.value = text
            await pilot.pause(0.02)
        assert asked == [250.0]                       # no second brief alongside the first
        gate.set()
        await settle(app, pilot)
        assert asked == [250.0, 280.0]                # one more, for the newest inputs only
        assert app.brief_inputs == app.inputs and app.inputs.weather.wind_from_deg == 280.0
        assert brief_to_dict(app.brief) == brief_to_dict(expected_brief(app))


async def test_a_changed_catalog_while_a_brief_is_built_briefs_again(monkeypatch):
    asked, gate = _held_builds(monkeypatch)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        asked.clear()
        gate.clear()
        app.main.query_one("#wind", Input).value = "250/15"
        await pilot.pause(0.05)
        assert len(asked) == 1
        app.use_catalog(app.catalog, app.inputs)      # same choices, the files behind them changed
        gate.set()
        await settle(app, pilot)
        assert len(asked) == 2                        # the brief built from the old data is not kept
