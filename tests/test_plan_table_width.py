"""The app's plan step at 80 x 24: the number table beside the plan view keeps each figure on
one line (a cosmetic defect: the break-off time wrapped)."""

from __future__ import annotations


async def test_the_plan_tables_break_off_line_does_not_wrap_at_80_columns():
    """The plan step's number table at the app's 80 x 24: the break-off line and its time each
    fit the table's width ('35 s' was split over two lines, 's' alone)."""
    from test_app_support import demo_catalog, demo_inputs, settle, text_of

    from briefer.tui.app import BriefingApp

    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=True, debounce_s=0.01)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press("6")
        await pilot.pause()
        table = app.main.query_one("#plan-numbers")
        lines = [ln.strip() for ln in text_of(table, width=table.content_region.width).splitlines()]
        assert lines[0].startswith("Plan")
        assert any(ln.startswith("Break off") and ln.endswith("048° M") for ln in lines), lines
        assert "for 35 s" in lines, lines
        assert "s" not in lines
