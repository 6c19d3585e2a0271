"""The app's label/value grids (briefer.tui.views.LabelGrid) show exactly what Rich's own
`Table.grid(padding=(0, 1))` with a bold unwrapped label column shows, cell for cell (character
and style; Rich, the reference: the grid works out the column widths itself instead of measuring
every cell, and lays its rows out itself), at every width from 12 to 120 cells, for the views of a
sample of the demo briefs."""

from __future__ import annotations

import io

import pytest
from rich.console import Console
from rich.style import Style
from rich.text import Text
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


def _cells(console: Console, renderable, options) -> list[list[tuple[str, Style]]]:
    """Each line's cells as the terminal shows them: (character, style)."""
    return [[(ch, seg.style or Style.null()) for seg in line for ch in seg.text]
            for line in console.render_lines(renderable, options, pad=False)]


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
            assert _cells(console, grid, options) == _cells(console, _rich_grid(grid), options), (label, width)


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


def test_rows_of_every_kind_render_as_rich_grids():
    """Cells the views may hold: markup and emoji codes in a str (the table reads them), styled
    Text, a word longer than the column, tabs, an empty value, a value of two lines, wide
    characters; at widths 1-130, with and without colour (too narrow for the labels: the table)."""
    grid = views.LabelGrid()
    grid.add_row("Name", "mast [b]bold[/b] :smile: x")
    grid.add_row(Text("Styled", style="italic"), Text.assemble(("red ", "red"), ("blue", "blue underline"), " plain"))
    grid.add_row("", "a_very_long_word_that_does_not_fit_anywhere_in_a_narrow_column and more")
    grid.add_row("Tabs", "a\tb\tc")
    grid.add_row("Empty", "")
    grid.add_row("Multi", "line one\nline two is longer than the first one by far")
    grid.add_row("Wide", "日本語の文字 wide chars 日本語")
    grid.add_row("PLAN", Text("NOT FLYABLE AS BRIEFED", style="bold reverse"))
    for color in ("truecolor", None):
        console = Console(file=io.StringIO(), width=200, color_system=color, force_terminal=True,
                          legacy_windows=False)
        for width in range(1, 131):
            options = console.options.update_width(width)
            assert _cells(console, grid, options) == _cells(console, _rich_grid(grid), options), (color, width)
