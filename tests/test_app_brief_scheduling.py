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


async def test_the_briefs_are_built_in_one_thread_that_ends_with_the_app(monkeypatch):
    """Every brief of the app is built in the same thread (not the app's), which ends when the
    app closes, also while a brief is being built then (its result is dropped)."""
    threads: list[threading.Thread] = []
    real = briefer.brief.build_brief

    def build(request, **kw):
        threads.append(threading.current_thread())
        return real(request, **kw)

    monkeypatch.setattr(briefer.brief, "build_brief", build)
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press("4")
        await settle(app, pilot)
        app.main.query_one("#wind", Input).value = "280/12"
        await settle(app, pilot)
        assert len(threads) >= 2 and len(set(threads)) == 1 and threads[0] is not threading.main_thread()
        asked, gate = _held_builds(monkeypatch)
        gate.clear()
        app.main.query_one("#wind", Input).value = "290/12"   # a brief still being built at the close
        await pilot.pause(0.1)
        assert asked == [290.0]
    gate.set()
    threads[0].join(10.0)
    assert not threads[0].is_alive()
