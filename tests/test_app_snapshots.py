"""A few 80x24 snapshots of the main screens (pytest-textual-snapshot; baselines were looked at
as PNGs before being accepted). Braille drawings and the default theme; the brief's time stamp
is not shown on these screens."""

from __future__ import annotations

from test_app_support import demo_catalog, demo_inputs, settle

from briefer.tui.app import BriefingApp

SIZE = (80, 24)


def make_app() -> BriefingApp:
    return BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01)


def run_keys(*keys: str):
    async def run_before(pilot) -> None:
        await pilot.pause()
        await settle(pilot.app, pilot)
        if keys:
            await pilot.press(*keys)
        await settle(pilot.app, pilot)
        await pilot.pause(0.1)
    return run_before


def test_snapshot_aircraft_step(snap_compare):
    assert snap_compare(make_app(), terminal_size=SIZE, run_before=run_keys())


def test_snapshot_weather_step(snap_compare):
    assert snap_compare(make_app(), terminal_size=SIZE, run_before=run_keys("4", "escape"))


def test_snapshot_plan_view(snap_compare):
    assert snap_compare(make_app(), terminal_size=SIZE, run_before=run_keys("6"))


def test_snapshot_sight_step(snap_compare):
    """The side view of the sight picture (the Scene the PDF card draws too), its legend and table."""
    assert snap_compare(make_app(), terminal_size=SIZE, run_before=run_keys("7"))
