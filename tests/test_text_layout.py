"""The text views' light layout (render/text_layout.py) against Rich's own: label/value rows lay out
as a Rich grid of two columns (``Table.grid(padding=(0, 1))``, bold labels that do not wrap) and
the cautions box as a Rich ``Panel`` with a left title, cell for cell (character and style), at
every width; and names from a data file are shown as typed (Rich markup and emoji codes in them are
text, not commands).
"""

from __future__ import annotations

import dataclasses
import io

import pytest
from rich.console import Console, Group
from rich.panel import Panel
from rich.style import Style
from rich.table import Table
from rich.text import Text

from briefer.brief import build_brief, demo_request
from briefer.render.text_layout import LabelRows, TitledBox
from briefer.render.views import BriefView, MinimumsView

ROWS = [("Category", "D (certified C, raised by the circling speed): circling 163 kt IAS = 152 kt + 11 kt "
                     "wind additive; VREF 133 kt"),
        ("MDA", "1860 ft   HAA 740 ft"),
        ("", "a row without a label, and a_very_long_word_that_does_not_fit_anywhere_in_a_narrow_column"),
        ("Missed appr", "climbing turn RIGHT toward the runway,\nthen as published"),
        ("Empty", ""),
        ("Tabbed", "a\tb\tc")]
CAUTIONS = ["- Not for navigation. A briefing aid only.",
            "- The published procedure, the aircraft flight manual, local rules and licensed practice govern.",
            "- " + "x" * 90]


class _AsciiFile(io.StringIO):
    encoding = "ascii"


def _cells(renderable, width: int, *, ascii_only: bool = False, legacy_windows: bool = False
           ) -> list[list[tuple[str, Style]]]:
    """Each line's (character, style) pairs as the console lays them out."""
    c = Console(file=_AsciiFile() if ascii_only else io.StringIO(), width=width, force_terminal=True,
                color_system="truecolor", legacy_windows=legacy_windows)
    lines: list[list[tuple[str, Style]]] = [[]]
    for seg in c.render(renderable, c.options):
        for ch in seg.text:
            if ch == "\n":
                lines.append([])
            else:
                lines[-1].append((ch, seg.style or Style.null()))
    return lines


def _rich_grid(rows) -> Table:
    t = Table.grid(padding=(0, 1))
    t.add_column(style="bold", no_wrap=True)
    t.add_column()
    for label, value in rows:
        t.add_row(Text(label), Text(value))
    return t


@pytest.mark.parametrize("width", [5, 12, 13, 14, 20, 40, 79, 80, 81, 120, 200])
def test_label_rows_lay_out_as_a_rich_grid(width):
    rows = LabelRows()
    for label, value in ROWS:
        rows.add_row(label, value)
    assert _cells(rows, width) == _cells(_rich_grid(ROWS), width)


# values that fit their column and values that just do not: the rows skip Rich's word wrap for a
# value that stays one line as it is (text_layout._one_line), and must lay it out as the wrap does
ODD_VALUES = ["", " ", "fits", "fits exactly", "fits exactly ", "  leading spaces", "trailing spaces   ",
              "wide 機能 characters", "e\u0301 combining", "no-break\u00a0space", "bell\x07 and\r return",
              "°C 25° ±3", "x" * 11, "x" * 12, "x" * 13, "two words_longer_than_the_column"]


@pytest.mark.parametrize("width", [5, 13, 14, 15, 16, 20, 24, 25, 26, 27, 40])
def test_label_rows_that_fit_lay_out_as_a_rich_grid(width):
    rows = [("Label", v) for v in ODD_VALUES]
    grid = LabelRows()
    for label, value in rows:
        grid.add_row(label, value)
    assert _cells(grid, width) == _cells(_rich_grid(rows), width)


@pytest.mark.parametrize("width", [8, 14, 15, 16, 17, 20, 30, 40])
def test_titled_box_lines_that_fit_lay_out_as_a_rich_panel(width):
    panel = Panel(Group(*[Text(t) for t in ODD_VALUES]), title="CAUTIONS", title_align="left")
    assert _cells(TitledBox("CAUTIONS", ODD_VALUES), width) == _cells(panel, width)


@pytest.mark.parametrize("width", [4, 5, 10, 12, 13, 40, 80, 120])
@pytest.mark.parametrize("output", [{}, {"ascii_only": True}, {"legacy_windows": True},
                                    {"ascii_only": True, "legacy_windows": True}])
def test_titled_box_lays_out_as_a_rich_panel(width, output):
    panel = Panel(Group(*[Text(t) for t in CAUTIONS]), title="CAUTIONS", title_align="left")
    assert _cells(TitledBox("CAUTIONS", CAUTIONS), width, **output) == _cells(panel, width, **output)


def test_a_name_that_looks_like_markup_is_shown_as_typed():
    """An obstacle named with brackets or colons (a data file may hold any text) is printed as
    typed; the grid read it as Rich markup, so '[/b]' stopped the brief with a MarkupError and
    ':thumbs_up:' became a picture."""
    b = build_brief(demo_request(), computed_utc="x")
    name = "north-hill [/b] [bold]x :thumbs_up:"
    b = dataclasses.replace(b, minimums=dataclasses.replace(b.minimums, controlling_obstacle=name))
    for view in (BriefView(b), MinimumsView(b)):
        c = Console(record=True, width=120, file=io.StringIO())
        c.print(view)
        assert f"Obstacle   {name}, clearance" in c.export_text()
