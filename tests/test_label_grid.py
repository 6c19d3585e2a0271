"""The app's label/value grids (briefer.tui.views.LabelGrid) show exactly what Rich's own
`Table.grid(padding=(0, 1))` with a bold unwrapped label column shows (Rich, the reference: the
grid only works out the column widths itself instead of measuring every cell), at every width from
12 to 120 cells, for the views of a sample of the demo briefs."""

from __future__ import annotations

import io

import pytest
from rich.console import Console
from rich.table import Table
from test_golden_briefs import demo_cases

import briefer.tui.views as views
from briefer.brief import build_brief


def _rich_grid(grid: views.LabelGrid) -> Table:
    t = Table.grid(padding=(0, 1))
    t.add_column(style="bold", no_wrap=True)
    t.add_column()
    for row in grid.rows:
        t.add_row(*row)
    return t


def _grids(monkeypatch, brief) -> list[views.LabelGrid]:
    made: list[views.LabelGrid] = []
    real = views._grid

    def grid():
        made.append(real())
        return made[-1]

    monkeypatch.setattr(views, "_grid", grid)
    for units in ("us", "icao"):
        views.aircraft_implies(brief, units)
        views.runway_implies(brief, units)
        views.weather_implies(brief, units)
    views.plan_numbers(brief)
    return made


@pytest.mark.parametrize("label,request_", list(demo_cases())[::97])
def test_label_grids_render_as_rich_grids(monkeypatch, label, request_):
    console = Console(file=io.StringIO(), width=200, color_system="truecolor", force_terminal=True,
                      legacy_windows=False)
    grids = _grids(monkeypatch, build_brief(request_))
    assert grids
    for grid in grids:
        for width in range(12, 121):
            options = console.options.update_width(width)
            assert console.render_lines(grid, options, pad=False) == console.render_lines(
                _rich_grid(grid), options, pad=False), (label, width)


def test_the_aircraft_steps_rows_line_up_in_one_column():
    """The aircraft step's 'what this gives' was two grids, Category/Speeds/Weight then
    Speed/Turn/Stall/Wind, whose texts started at different columns ('Weight   31000 lb' over
    'Speed 163 kt IAS'); it is one grid now: every text starts in the same column."""
    from briefer.brief import demo_request

    console = Console(file=io.StringIO(), width=60, color_system=None, legacy_windows=False)
    console.print(views.aircraft_implies(build_brief(demo_request())))
    lines = console.file.getvalue().splitlines()[1:]          # below the heading
    labelled = [ln for ln in lines if ln and not ln.startswith(" ")]
    assert [ln.split()[0] for ln in labelled] == ["Category", "Speeds", "Weight", "Speed", "Turn", "Stall", "Wind"]
    starts = {len(ln) - len(ln[len(ln.split()[0]):].lstrip()) for ln in labelled}
    assert starts == {len("Category") + 1}, starts
