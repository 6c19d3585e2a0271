"""Terminal canvases for the plan view: braille (2x4 dots per cell) and ASCII (one dot per cell).

Both canvases share one drawing API in *dot* coordinates (x right, y down, dot centres at whole
numbers): `dot`, `line`, `polyline`, `circle`, `polygon`, `glyph`, `text`. Both are Rich
renderables (one line per row, runs of equal style merged) and both give plain lines with
`to_lines()` / `to_text()` for the text card.

Each drawing call names a `Role`. A cell shared by several roles takes the style of the role with
the highest priority (the runway wins), while braille dots are OR-ed so crossings stay visible.
In ASCII a cell holds one character, so the higher-priority role's glyph wins.

Rich is imported only inside `__rich_console__`.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Iterator, Sequence
from itertools import groupby
from operator import itemgetter
from typing import TYPE_CHECKING, Any

from briefer.render.scene import (
    ROLE_STYLES,
    Point,
    Role,
    Scene,
    Viewport,
    hatch_segments,
)

if TYPE_CHECKING:  # pragma: no cover
    from rich.console import Console, ConsoleOptions, RenderResult
    from rich.measure import Measurement

__all__ = ["AsciiCanvas", "BrailleCanvas", "Canvas", "ROLE_DASH", "Viewport"]

_BITS = ((0x01, 0x08), (0x02, 0x10), (0x04, 0x20), (0x40, 0x80))  # [dot row 0..3][dot col 0..1]
_BRAILLE = [" "] + [chr(0x2800 + b) for b in range(1, 256)]            # blank cells are spaces
_EMPTY = -1          # priority of an untouched cell
_FILL = 0            # priority of hatch dots: anything drawn later takes the cell
_PLAIN = 1           # priority of a dot drawn without a role
_TEXT = 1000         # priority of text: nothing drawn later takes the cell

ROLE_DASH: Any = object()
"""Default of the `dash` arguments: the role's own pattern."""

_STYLE_CACHE: dict[Role | None, Any] = {}


def _rich_style(role: Role | None) -> Any:
    """The Rich style of a role (colour plus bold/dim, which survive NO_COLOR)."""
    try:
        return _STYLE_CACHE[role]
    except KeyError:
        from rich.style import Style

        if role is None:
            style = None
        else:
            rs = ROLE_STYLES[role]
            style = Style(color=rs.term_colour, bold=rs.term_bold or None, dim=rs.term_dim or None)
        _STYLE_CACHE[role] = style
        return style


class Canvas:
    """The shared part of both canvases. Use `BrailleCanvas` or `AsciiCanvas`.

    Attributes:
        cols, rows: Size in character cells.
        w, h: Size in dots.
        aspect: Width over height of one dot (1 for braille, 0.5 for ASCII).
        dots_per_cell: (across, down).
    """

    aspect: float = 1.0
    dots_per_cell: tuple[int, int] = (1, 1)
    _role_dash: bool = True       # use the role's dash pattern when `dash` is not given
    _role_width: bool = True      # use the role's line width in dots

    def __init__(self, cols: int, rows: int) -> None:
        self.cols, self.rows = max(1, int(cols)), max(1, int(rows))
        dx, dy = self.dots_per_cell
        self.w, self.h = self.cols * dx, self.rows * dy
        n = self.cols * self.rows
        self._prio = [_EMPTY] * n
        self._role: list[Role | None] = [None] * n
        self._char: list[str | None] = [None] * n
        self.label_boxes: list[tuple[int, int, int]] = []   # (col, row, length) of each label written
        self.dropped_labels: list[str] = []                 # labels left off for want of room

    # --- geometry helpers ---------------------------------------------------------------
    def fit(self, scene: Scene, *, margin: float = 1.0) -> Viewport:
        """The viewport showing `scene` on this canvas (dot centres 0 .. w-1, 0 .. h-1)."""
        return scene.fit(self.w - 1, self.h - 1, self.aspect, margin=margin)

    def cell_of(self, x: float, y: float) -> tuple[int, int]:
        """(col, row) of the cell holding the dot nearest to (x, y)."""
        dx, dy = self.dots_per_cell
        return (math.floor(x + 0.5) // dx, math.floor(y + 0.5) // dy)

    # --- per-dot writing (subclasses) ---------------------------------------------------
    def _plot(self, xi: int, yi: int, role: Role | None, prio: int, ch: str | None) -> None:
        raise NotImplementedError

    def lit(self, x: float, y: float) -> bool:
        """Whether the dot nearest to (x, y) is drawn."""
        raise NotImplementedError

    def _glyph_for(self, role: Role | None, fill: bool) -> str | None:
        return None

    # --- drawing API --------------------------------------------------------------------
    def dot(self, x: float, y: float, role: Role | None = None) -> None:
        """Draw one dot (nearest dot centre); outside the canvas it is dropped."""
        prio = ROLE_STYLES[role].priority if role is not None else _PLAIN
        self._plot(math.floor(x + 0.5), math.floor(y + 0.5), role, prio, self._glyph_for(role, False))

    def line(self, x0: float, y0: float, x1: float, y1: float, role: Role | None = None, *,
             dash: Any = ROLE_DASH) -> None:
        """Draw a straight line between two dot positions."""
        self.polyline(((x0, y0), (x1, y1)), role, dash=dash)

    def polyline(self, points: Sequence[Point], role: Role | None = None, *, closed: bool = False,
                 dash: Any = ROLE_DASH) -> None:
        """Draw connected lines; a dash pattern runs on across the corners.

        Args:
            points: Dot positions.
            role: What the line is (style, priority, glyph, pattern, width).
            closed: Join the last point to the first.
            dash: (on, off) in dots, None for solid, or the role's own pattern (the default).
        """
        pts = list(points)
        if closed and len(pts) > 2 and pts[0] != pts[-1]:
            pts.append(pts[0])
        if not pts:
            return
        if dash is ROLE_DASH:
            dash = ROLE_STYLES[role].braille_dash if (role is not None and self._role_dash) else None
        width = ROLE_STYLES[role].braille_width_dots if (role is not None and self._role_width) else 1
        if width <= 1:
            self._stroke(pts, role, dash, None)
            return
        # a wide line: parallel strokes one dot apart, each offset along the local normal
        for seg0, seg1 in zip(pts, pts[1:]):
            ddx, ddy = seg1[0] - seg0[0], seg1[1] - seg0[1]
            length = math.hypot(ddx, ddy) or 1.0
            nx, ny = -ddy / length, ddx / length
            for k in range(width):
                off = k - (width - 1) / 2
                self._stroke([(seg0[0] + nx * off, seg0[1] + ny * off),
                              (seg1[0] + nx * off, seg1[1] + ny * off)], role, dash, None)

    def circle(self, cx: float, cy: float, radius: float, role: Role | None = None, *,
               dash: Any = ROLE_DASH) -> None:
        """Draw a circle of `radius` dots across (`radius * aspect` dots down, so it is round)."""
        ry = radius * self.aspect
        n = max(8, int(math.ceil(2 * math.pi * max(radius, ry) / 1.5)))
        pts = [(cx + radius * math.cos(2 * math.pi * i / n), cy + ry * math.sin(2 * math.pi * i / n))
               for i in range(n + 1)]
        self.polyline(pts, role, dash=dash)

    def polygon(self, points: Sequence[Point], role: Role | None = None, *, fill: bool = False,
                dash: Any = ROLE_DASH, hatch_spacing: float | None = None) -> None:
        """Draw a polygon's outline and, with `fill`, a diagonal hatch inside it.

        Hatch dots have the lowest priority: any line drawn later owns the cell.
        """
        pts = list(points)
        if fill and len(pts) >= 3:
            spacing = hatch_spacing or self._hatch_spacing
            glyph = self._glyph_for(role, True)
            for a, b in hatch_segments(pts, spacing, angle_deg=self._hatch_angle_deg):
                self._stroke([a, b], role, None, glyph, prio=_FILL)
        self.polyline(pts, role, closed=True, dash=dash)

    def glyph(self, x: float, y: float, ch: str, role: Role | None = None) -> tuple[int, int]:
        """Put one character in the cell holding dot (x, y), if `role` outranks what is there.

        Returns:
            The cell (col, row).
        """
        col, row = self.cell_of(x, y)
        if 0 <= col < self.cols and 0 <= row < self.rows:
            c = row * self.cols + col
            prio = ROLE_STYLES[role].priority if role is not None else _PLAIN
            if prio >= self._prio[c]:
                self._prio[c], self._role[c], self._char[c] = prio, role, ch
        return col, row

    def text(self, col: int, row: int, text: str, role: Role | None = Role.ANNOTATION) -> None:
        """Write text from a cell rightwards; it always shows (clipped at the edges)."""
        if not 0 <= row < self.rows:
            return
        for i, ch in enumerate(text):
            cc = col + i
            if 0 <= cc < self.cols:
                c = row * self.cols + cc
                self._prio[c], self._role[c], self._char[c] = _TEXT, role, ch

    def is_free(self, col: int, row: int, length: int = 1) -> bool:
        """Whether `length` cells from (col, row) rightwards are inside and untouched."""
        if not (0 <= row < self.rows and 0 <= col and col + length <= self.cols):
            return False
        base = row * self.cols + col
        return all(p == _EMPTY for p in self._prio[base:base + length])

    # --- the core stroke loop -----------------------------------------------------------
    _hatch_spacing: float = 4.0
    _hatch_angle_deg: float = -45.0   # in y-down coordinates: lines rising to the right, '/'

    def _stroke(self, pts: Sequence[Point], role: Role | None, dash: tuple[int, int] | None,
                ch: str | None, *, prio: int | None = None) -> None:
        if prio is None:
            prio = ROLE_STYLES[role].priority if role is not None else _PLAIN
        if ch is None:
            ch = self._glyph_for(role, False)
        if len(pts) > 2:
            # drop points less than a dot from the last kept one: long tracks sampled finer than
            # the canvas cost time and add nothing (the drawn line moves by under a dot)
            kept = [pts[0]]
            lx, ly = pts[0]
            for x, y in pts[1:-1]:
                if abs(x - lx) >= 1.0 or abs(y - ly) >= 1.0:
                    kept.append((x, y))
                    lx, ly = x, y
            kept.append(pts[-1])
            pts = kept
        plot, floor = self._plot, math.floor
        if dash is None:
            on = period = 0.0
        else:
            on, period = float(dash[0]), float(dash[0] + dash[1])
        phase = 0.0
        x0, y0 = pts[0]
        first = True
        for x1, y1 in pts[1:]:
            dx, dy = x1 - x0, y1 - y0
            n = max(1, math.ceil(max(abs(dx), abs(dy)) - 1e-9))
            step = math.hypot(dx, dy) / n
            for k in range(0 if first else 1, n + 1):
                if period == 0.0 or (phase % period) < on:
                    plot(floor(x0 + dx * k / n + 0.5), floor(y0 + dy * k / n + 0.5), role, prio, ch)
                phase += step
            phase -= step  # the next segment starts at this segment's end point
            first = False
            x0, y0 = x1, y1
        if first:  # a single point
            plot(floor(x0 + 0.5), floor(y0 + 0.5), role, prio, ch)

    # --- output -------------------------------------------------------------------------
    def _chars(self) -> list[str]:
        """The character of every cell, row by row."""
        raise NotImplementedError

    def to_lines(self) -> list[str]:
        """The rows as strings of exactly `cols` characters."""
        chars, cols = self._chars(), self.cols
        return ["".join(chars[r * cols:(r + 1) * cols]) for r in range(self.rows)]

    def to_text(self) -> str:
        """The rows joined by newlines, trailing spaces removed (for the text card)."""
        return "\n".join(line.rstrip() for line in self.to_lines())

    def role_at(self, col: int, row: int) -> Role | None:
        """The role owning a cell (its style), or None."""
        return self._role[row * self.cols + col]

    def runs(self) -> Iterator[list[tuple[str, Role | None]]]:
        """Per row, the runs of equal role as (text, role)."""
        chars, roles, cols = self._chars(), self._role, self.cols
        for r in range(self.rows):
            a, b = r * cols, (r + 1) * cols
            yield [("".join(ch for _, ch in group), role)
                   for role, group in groupby(zip(roles[a:b], chars[a:b]), key=itemgetter(0))]

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        from rich.segment import Segment

        max_width = options.max_width
        for row in self.runs():
            used = 0
            for text, role in row:
                if used >= max_width:
                    break
                text = text[:max_width - used]
                used += len(text)
                yield Segment(text, _rich_style(role))
            yield Segment.line()

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        from rich.measure import Measurement

        return Measurement(self.cols, self.cols)


class BrailleCanvas(Canvas):
    """2x4 braille dots per cell; dots are OR-ed, empty cells are spaces (not U+2800)."""

    aspect = 1.0
    dots_per_cell = (2, 4)
    _hatch_spacing = 6.0

    def __init__(self, cols: int, rows: int) -> None:
        super().__init__(cols, rows)
        self._bits = bytearray(self.cols * self.rows)

    def _plot(self, xi: int, yi: int, role: Role | None, prio: int, ch: str | None) -> None:
        if 0 <= xi < self.w and 0 <= yi < self.h:
            c = (yi >> 2) * self.cols + (xi >> 1)
            self._bits[c] |= _BITS[yi & 3][xi & 1]
            if prio >= self._prio[c]:
                # a higher line takes the cell's style and uncovers the dots under a glyph
                if prio > self._prio[c]:
                    self._char[c] = None
                self._prio[c], self._role[c] = prio, role

    def lit(self, x: float, y: float) -> bool:
        xi, yi = math.floor(x + 0.5), math.floor(y + 0.5)
        if not (0 <= xi < self.w and 0 <= yi < self.h):
            return False
        return bool(self._bits[(yi >> 2) * self.cols + (xi >> 1)] & _BITS[yi & 3][xi & 1])

    def _chars(self) -> list[str]:
        table = _BRAILLE
        return [table[b] if ch is None else ch for ch, b in zip(self._char, self._bits)]


class AsciiCanvas(Canvas):
    """One dot per cell (cells are about twice as tall as wide, so aspect 0.5), a glyph per role.

    The role's glyph tells the roles apart, so role dash patterns are not used here (an explicit
    `dash` still is). Lines are one cell wide.
    """

    aspect = 0.5
    dots_per_cell = (1, 1)
    _role_dash = False
    _role_width = False
    _hatch_spacing = 3.0
    DEFAULT_GLYPH = "*"

    def _glyph_for(self, role: Role | None, fill: bool) -> str:
        if role is None:
            return self.DEFAULT_GLYPH
        rs = ROLE_STYLES[role]
        return (rs.ascii_fill or rs.ascii_glyph) if fill else rs.ascii_glyph

    def _plot(self, xi: int, yi: int, role: Role | None, prio: int, ch: str | None) -> None:
        if 0 <= xi < self.cols and 0 <= yi < self.rows:
            c = yi * self.cols + xi
            if prio >= self._prio[c]:
                self._prio[c], self._role[c] = prio, role
                self._char[c] = ch if ch is not None else self._glyph_for(role, False)

    def lit(self, x: float, y: float) -> bool:
        xi, yi = math.floor(x + 0.5), math.floor(y + 0.5)
        return 0 <= xi < self.cols and 0 <= yi < self.rows and self._char[yi * self.cols + xi] is not None

    def _chars(self) -> list[str]:
        return [ch or " " for ch in self._char]


def lit_dots(canvas: Canvas) -> Iterable[tuple[int, int]]:
    """Every drawn dot (x, y), row by row (for tests and measurements)."""
    return ((x, y) for y in range(canvas.h) for x in range(canvas.w) if canvas.lit(x, y))
