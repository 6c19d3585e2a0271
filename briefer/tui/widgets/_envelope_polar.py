"""The wind envelope as a polar picture: wind from ahead at the top, from the right on the right,
calm in the centre, rings every 10 kt, one glyph per cell (fits / marginal / does not fit)."""

from __future__ import annotations

import math
from functools import cache
from typing import TYPE_CHECKING

from rich.text import Text
from textual import events
from textual.message import Message
from textual.reactive import reactive
from textual.widget import Widget

if TYPE_CHECKING:               # numpy and the core are imported on first use (start-up time)
    from briefer.core.manoeuvre.envelope import Envelope
    from briefer.result import Brief

RING_STEP_KT = 10.0
RING = {True: "·", False: "."}


@cache
def _tables():
    """(FITS, MARGINAL, DOES_NOT_FIT, STATUS_TEXT, GLYPHS, STYLES), read from the core on first use
    (importing it pulls numpy, which the first frame does not need)."""
    from briefer.core.manoeuvre.envelope import DOES_NOT_FIT, FITS, MARGINAL, STATUS_TEXT

    glyphs = {True: {FITS: " ", MARGINAL: "░", DOES_NOT_FIT: "▓"}, False: {FITS: " ", MARGINAL: "+", DOES_NOT_FIT: "#"}}
    styles = {FITS: "green", MARGINAL: "bold yellow", DOES_NOT_FIT: "bold red"}
    return FITS, MARGINAL, DOES_NOT_FIT, STATUS_TEXT, glyphs, styles


def legend_lines(unicode: bool) -> list[tuple[str, str, str]]:
    """(glyph, style, meaning) for the legend."""
    _, MARGINAL, DOES_NOT_FIT, _, GLYPHS, STYLES = _tables()
    g = GLYPHS[unicode]
    return [(RING[unicode], "green", f"fits (dots: rings every {RING_STEP_KT:.0f} kt; edge = top speed)"),
            (g[MARGINAL], STYLES[MARGINAL], "marginal"),
            (g[DOES_NOT_FIT], STYLES[DOES_NOT_FIT], "does not fit"),
            ("W", "bold reverse", "today's wind"), ("G", "bold", "today's gust")]


class EnvelopePolar(Widget):
    """Polar picture of an `Envelope` at the widget's size; hovering a cell posts `Hovered`."""

    unicode: reactive[bool] = reactive(True)

    class Hovered(Message):
        """The pointer is over a cell of the picture.

        Attributes:
            text: The cell's wind and verdict in words.
        """

        def __init__(self, text: str) -> None:
            super().__init__()
            self.text = text

    def __init__(self, *, unicode: bool = True, id: str | None = None) -> None:
        super().__init__(id=id)
        self.set_reactive(EnvelopePolar.unicode, unicode)
        self.envelope: Envelope | None = None
        self.brief: Brief | None = None
        self._cache: tuple | None = None

    def show(self, envelope: Envelope | None, brief: Brief | None) -> None:
        self.envelope, self.brief = envelope, brief
        self._cache = None
        self.refresh()

    # --- geometry --------------------------------------------------------------------------
    def _frame(self) -> tuple[float, float, float, float]:
        """(centre col, centre row, radius in rows, top speed in kt)."""
        w, h = self.size.width, self.size.height
        r_rows = max(2.0, min((h - 3) / 2.0, (w - 8) / 4.0))
        import numpy as np

        speed_max = float(np.max(self.envelope.wind_speed_kt)) if self.envelope is not None else 40.0
        return (w - 1) / 2.0, (h - 1) / 2.0, r_rows, speed_max

    def cell_wind(self, col: int, row: int) -> tuple[float, float] | None:
        """(wind from, relative to the landing course [deg]; speed [kt]) of a cell, or None outside."""
        cx, cy, r_rows, smax = self._frame()
        dx, dy = (col - cx) / 2.0, cy - row
        speed = math.hypot(dx, dy) / r_rows * smax
        if speed > smax + 0.5 * smax / r_rows:
            return None
        return math.degrees(math.atan2(dx, dy)) % 360.0, speed

    def _index(self, rel_deg: float, speed_kt: float) -> tuple[int, int]:
        import numpy as np

        env = self.envelope
        dirs = np.asarray(env.wind_from_relative_deg, dtype=float)
        diff = np.abs((dirs - rel_deg + 180.0) % 360.0 - 180.0)
        i = int(np.argmin(diff))
        j = int(np.argmin(np.abs(np.asarray(env.wind_speed_kt, dtype=float) - speed_kt)))
        return i, j

    def describe(self, rel_deg: float, speed_kt: float) -> str:
        """The verdict of the grid cell nearest to a wind, in words."""
        env = self.envelope
        if env is None:
            return ""
        i, j = self._index(rel_deg, speed_kt)
        d, s = float(env.wind_from_relative_deg[i]), float(env.wind_speed_kt[j])
        side = "ahead" if d in (0.0, 360.0) else "behind" if d == 180.0 else (
            f"{d:.0f}° right" if d < 180 else f"{360 - d:.0f}° left")
        st = int(env.status[i, j])
        STATUS_TEXT = _tables()[3]
        why = "; ".join(env.reason_texts(i, j))
        return f"wind from {side}, {s:.0f} kt: {STATUS_TEXT[st].upper()}" + (f" ({why})" if why else "")

    # --- drawing ---------------------------------------------------------------------------
    def render(self):
        if self.envelope is None:
            return Text("computing the wind envelope (a moment)...")
        key = (self.size, self.unicode)
        if self._cache is None or self._cache[0] != key:
            self._cache = (key, self._draw())
        return self._cache[1]

    def _draw(self) -> Text:
        FITS, _, _, _, GLYPHS, STYLES = _tables()
        env = self.envelope
        w, h = self.size.width, self.size.height
        cx, cy, r_rows, smax = self._frame()
        uni = self.unicode
        glyphs, ring = GLYPHS[uni], RING[uni]
        tol = 0.5 * smax / r_rows
        chars = [[" "] * w for _ in range(h)]
        styles: list[list[str]] = [[""] * w for _ in range(h)]
        status = env.status
        for row in range(h):
            for col in range(w):
                cw = self.cell_wind(col, row)
                if cw is None:
                    continue
                rel, spd = cw
                i, j = self._index(rel, spd)
                st = int(status[i, j])
                on_ring = spd > tol and abs(spd / RING_STEP_KT - round(spd / RING_STEP_KT)) * RING_STEP_KT < tol
                ch = glyphs[st]
                if st == FITS and (on_ring or abs(spd - smax) < tol):
                    ch = ring
                chars[row][col] = ch
                styles[row][col] = STYLES[st] if st != FITS else "green"

        def put(col: float, row: float, text: str, style: str) -> None:
            c0, r0 = int(round(col)), int(round(row))
            if 0 <= r0 < h:
                for k, ch in enumerate(text):
                    if 0 <= c0 + k < w:
                        chars[r0][c0 + k], styles[r0][c0 + k] = ch, style

        put(cx, cy, "+", "bold")
        for k in range(1, int(smax // RING_STEP_KT)):
            put(cx + 2 * r_rows * k * RING_STEP_KT / smax + 1, cy, f"{k * RING_STEP_KT:.0f}", "bold")
        put(cx - 2, cy - r_rows - 1, "ahead", "bold")
        put(cx - 3, cy + r_rows + 1, "behind", "bold")
        put(cx - 2 * r_rows - 3, cy, "L", "bold")
        put(cx + 2 * r_rows + 2, cy, "R", "bold")
        b = self.brief
        if b is not None and b.wind.reported:
            if b.wind.gust_headwind_kt is not None:
                put(cx + 2 * r_rows * b.wind.gust_crosswind_from_right_kt / smax,
                    cy - r_rows * b.wind.gust_headwind_kt / smax, "G", "bold")
            put(cx + 2 * r_rows * b.wind.crosswind_from_right_kt / smax,
                cy - r_rows * b.wind.headwind_kt / smax, "W", "bold reverse")
        out = Text()
        for row in range(h):
            run, st0 = [], styles[row][0]
            for ch, st in zip(chars[row], styles[row]):
                if st != st0 and run:
                    out.append("".join(run), st0 or None)
                    run = []
                st0 = st
                run.append(ch)
            out.append("".join(run), st0 or None)
            if row < h - 1:
                out.append("\n")
        return out

    def on_mouse_move(self, event: events.MouseMove) -> None:
        if self.envelope is None:
            return
        off = event.get_content_offset(self)
        if off is None:
            return
        cw = self.cell_wind(off.x, off.y)
        if cw is not None:
            self.post_message(self.Hovered(self.describe(*cw)))
