"""Two light Rich renderables for the text views: label/value rows and a titled box.

They lay text out as a Rich grid of two columns (``Table.grid(padding=(0, 1))``, bold labels that
do not wrap, values wrapped beside them) and a ``Panel`` with a title on its top edge did, cell
for cell, at a fraction of the cost: a brief printed from the command line is mostly these rows,
and laying out a table or a panel (measuring every cell, padding, cropping) took longer than
computing the brief. Values are text as given: nothing in them is read as Rich markup or emoji
codes (an obstacle named ``mast [/b]`` is shown as typed).

When a width is too narrow for the labels, the rows fall back to the Rich grid itself.
"""

from __future__ import annotations

from rich.cells import cell_len
from rich.segment import Segment
from rich.style import Style
from rich.text import Text

TYPE_CHECKING = False
if TYPE_CHECKING:
    from rich.console import Console, ConsoleOptions, RenderResult

_BOLD = Style(bold=True)
_NEW_LINE = Segment("\n")


def _widest_line(text: str) -> int:
    return max((cell_len(line) for line in text.splitlines()), default=0)


def _one_line(text: str, width: int) -> int | None:
    """The cells of `text` when Rich's word wrap at `width` would leave it as it is, one line
    (printable: no line break, tab or control code, which ``Text`` splits, expands or strips;
    no wider than `width`); else None. Most values of a brief are such a line, and wrapping one
    cost a fifth of printing the brief."""
    if not text.isprintable():
        return None
    cells = cell_len(text)
    return cells if cells <= width else None


class LabelRows:
    """Rows of a bold label and a value; the values wrap in the width left beside the labels
    (one space between), continuation lines start under the value."""

    def __init__(self) -> None:
        self.rows: list[tuple[str, str]] = []

    def add_row(self, label: str, value: str) -> None:
        self.rows.append((label, value))

    def _widths(self, max_width: int) -> tuple[int, int] | None:
        """(label column with its space, value column), as the grid sized them; None when the
        labels leave no room for a value column."""
        label_w = max((_widest_line(label) for label, _ in self.rows), default=0) + 1
        if max_width < label_w + 1:
            return None
        value_w = min(max((_widest_line(value) for _, value in self.rows), default=0), max_width) or 1
        return label_w, (max_width - label_w if label_w + value_w > max_width else value_w)

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        widths = self._widths(options.max_width)
        if widths is None:
            yield self._grid()
            return
        label_w, value_w = widths
        blank_label = Segment(" " * label_w, _BOLD)
        tab_size = console.tab_size or 8
        for label, value in self.rows:
            yield Segment(label + " " * (label_w - cell_len(label)), _BOLD)
            cells = _one_line(value, value_w)
            if cells is not None:             # the wrap's one line, padded to the column (justify="left")
                yield Segment(value + " " * (value_w - cells))
                yield _NEW_LINE
                continue
            lines = Text(value).wrap(console, value_w, justify="left", overflow="ellipsis", tab_size=tab_size)
            for i, line in enumerate(lines):
                if i:
                    yield blank_label
                yield from line.render(console)
                yield _NEW_LINE

    def _grid(self):
        """The Rich grid these rows stand for (for widths too narrow for the quick layout)."""
        from rich.table import Table

        t = Table.grid(padding=(0, 1))
        t.add_column(style="bold", no_wrap=True)
        t.add_column()
        for label, value in self.rows:
            t.add_row(Text(label), Text(value))
        return t


_ROUNDED, _SQUARE, _ASCII = "╭─╮│╰╯", "┌─┐│└┘", "+-+|++"   # corners, line, side: rich.box's


def _box(console: Console, options: ConsoleOptions) -> str:
    """The box characters Rich's ``box.ROUNDED.substitute`` gives for this output: square corners
    on a legacy Windows console (with safe boxes), plain ASCII where only ASCII can be shown."""
    if options.ascii_only:
        return _ASCII
    return _SQUARE if options.legacy_windows and console.safe_box else _ROUNDED


class TitledBox:
    """Lines of text in a box as wide as the space, the title on its top edge at the left
    (rounded corners; plain ASCII where the output cannot show box drawing)."""

    def __init__(self, title: str, lines: list[str]) -> None:
        self.title = title
        self.lines = lines

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        width = options.max_width
        title = f" {self.title} "
        if width < cell_len(title) + 4:
            yield self._panel()
            return
        top_left, edge, top_right, side, bottom_left, bottom_right = _box(console, options)
        yield Segment(top_left + edge + title + edge * (width - 3 - cell_len(title)) + top_right)
        yield _NEW_LINE
        inner = width - 4
        left, right = Segment(side + " "), Segment(" " + side)
        for text in self.lines:
            if options.justify is None and _one_line(text, inner) is not None:   # the wrap's one line
                yield left
                yield from Segment.adjust_line_length([Segment(text)], inner)
                yield right
                yield _NEW_LINE
                continue
            for line in Text(text).wrap(console, inner, justify=options.justify, overflow=options.overflow,
                                        tab_size=console.tab_size or 8, no_wrap=options.no_wrap or False):
                yield left
                yield from Segment.adjust_line_length(list(line.render(console)), inner)
                yield right
                yield _NEW_LINE
        yield Segment(bottom_left + edge * (width - 2) + bottom_right)
        yield _NEW_LINE

    def _panel(self):
        """The Rich panel this box stands for (for widths too narrow for its title)."""
        from rich.console import Group
        from rich.panel import Panel

        return Panel(Group(*[Text(t) for t in self.lines]), title=Text(self.title), title_align="left")
