"""Rich views of a wind envelope (STYLE G): a polar picture and a table, each taking an Envelope.

`EnvelopeView` draws the envelope as a polar picture in the terminal: the centre is calm, each ring
is 10 kt more wind, and a cell at bearing B and distance S shows the verdict for a wind blowing
FROM B at S kt. Up is the landing direction (``directions="relative"``: a wind from the top is a
headwind) or true north (``directions="true"``); the landing direction is marked on the rim
either way. `EnvelopeTable` gives the same verdicts as a table of wind directions x speed bands
with the reason letters.

Verdicts are told apart by glyph (shape and density), never by colour alone; colour is an extra
cue. Unicode / ASCII glyphs:

=============== ======= ===== ====================================================
Verdict         Unicode ASCII Meaning
=============== ======= ===== ====================================================
fits            ``·``   ``.`` the best plan fits at the target bank with margins
marginal        ``▒``   ``+`` it fits, but needs more bank or has thin margins
does not fit    ``█``   ``#`` nothing fits up to the bank limit
ring (fits)     ``∘``   ``:`` a 10 kt ring, drawn where the wind fits
landing dir.    ``◆``   ``*`` on the rim: the direction the aircraft lands toward
today's wind    ``✕``   ``X`` the reported wind, when given
=============== ======= ===== ====================================================

Reason letters (bits of :data:`briefer.core.manoeuvre.envelope` ``REASON_*``): ``B`` bank (more
than the target, near or over the limit), ``A`` area (margin under 10 % of R, or leaves it),
``V`` visibility (runway beyond 90 % of it, or beyond it), ``W`` wind (no plan can be flown).

Both views take an `Envelope` and plain numbers only, so the app can reuse them
(``Static.update(EnvelopeView(...))``).
"""

from __future__ import annotations

import math
from collections.abc import Iterator, Sequence
from briefer._dataclass import dataclass

import numpy as np
from rich.console import Console, ConsoleOptions, RenderResult
from rich.measure import Measurement
from rich.style import Style
from rich.table import Table
from rich.text import Text

from briefer.core.manoeuvre.envelope import (
    DOES_NOT_FIT,
    FITS,
    MARGINAL,
    REASON_AREA,
    REASON_BANK,
    REASON_LIMIT,
    REASON_NOT_AUTHORISED,
    REASON_SECTOR,
    REASON_STALL,
    REASON_VISIBILITY,
    REASON_WIND,
    STATUS_TEXT,
    Envelope,
)

__all__ = ["EnvelopeTable", "EnvelopeView", "GLYPHS", "REASON_LETTERS", "direction_label",
           "polar_grid", "reason_letters", "speed_bands"]

OUTSIDE = -1
"""Polar grid value of a cell beyond the fastest wind of the envelope."""


@dataclass(frozen=True, slots=True)
class GlyphSet:
    fits: str
    marginal: str
    does_not_fit: str
    ring: str
    landing: str
    today: str

    def status(self, status: int) -> str:
        return {FITS: self.fits, MARGINAL: self.marginal, DOES_NOT_FIT: self.does_not_fit}[status]


GLYPHS = {False: GlyphSet(fits="·", marginal="▒", does_not_fit="█", ring="∘", landing="◆", today="✕"),
          True: GlyphSet(fits=".", marginal="+", does_not_fit="#", ring=":", landing="*", today="X")}
"""Glyphs by ``ascii`` flag."""

STATUS_STYLE = {FITS: Style(color="green"), MARGINAL: Style(color="yellow", bold=True),
                DOES_NOT_FIT: Style(color="red", bold=True)}
MARK_STYLE = Style(color="cyan", bold=True)
LABEL_STYLE = Style(bold=True)

REASON_LETTERS: tuple[tuple[int, str, str], ...] = (
    (REASON_BANK, "B", "bank: within 5 deg of the limit, or more than the limit"),
    (REASON_AREA, "A", "area: margin under 10 % of R, or leaves the protected area"),
    (REASON_SECTOR, "S", "sector: within 10 % of R of a not-authorised sector, or enters it"),
    (REASON_VISIBILITY, "V", "visibility: the runway gets beyond 90 % of it, or beyond it"),
    (REASON_STALL, "K", "stall: angle-of-attack margin under 3 deg, or beyond the stall"),
    (REASON_WIND, "W", "wind: no plan can be flown at all"),
    (REASON_LIMIT, "L", "limit: beyond the crosswind or tailwind limit"),
    (REASON_NOT_AUTHORISED, "N", "not authorised: no circling for this category"),
)
"""(bit, letter, meaning) of each reason flag."""

RING_STEP_KT = 10.0


def reason_letters(flags: int) -> str:
    """The letters of a reason bit set, e.g. ``REASON_BANK | REASON_AREA`` -> ``"BA"``."""
    return "".join(letter for bit, letter, _ in REASON_LETTERS if int(flags) & bit)


def _wrap360(deg: float) -> float:
    return deg % 360.0


def direction_label(relative_deg: float, runway_course_deg_true: float) -> str:
    """Plain words for a wind direction relative to the landing course, with its true bearing:
    ``"000 head (264T)"``, ``"090 right (354T)"``, ``"180 tail"``, ``"270 left"``."""
    rel = _wrap360(relative_deg)
    side = {0.0: "head", 90.0: "right", 180.0: "tail", 270.0: "left"}.get(round(rel, 6))
    if side is None:
        side = "right" if 0.0 < rel < 180.0 else "left"
        side = ("head-" if rel < 90.0 or rel > 270.0 else "tail-") + side
    return f"{rel:03.0f} {side} ({_wrap360(rel + runway_course_deg_true):03.0f}T)"


def _nearest_direction(envelope: Envelope, relative_deg: np.ndarray) -> np.ndarray:
    dirs = np.asarray(envelope.wind_from_relative_deg, dtype=float)
    diff = np.abs((relative_deg[..., None] - dirs + 180.0) % 360.0 - 180.0)
    return np.argmin(diff, axis=-1)


def _nearest_speed(envelope: Envelope, speed_kt: np.ndarray) -> np.ndarray:
    spds = np.asarray(envelope.wind_speed_kt, dtype=float)
    return np.argmin(np.abs(speed_kt[..., None] - spds), axis=-1)


@dataclass(frozen=True, slots=True)
class PolarGrid:
    """The polar picture as numbers: one entry per character cell.

    Attributes:
        status: FITS / MARGINAL / DOES_NOT_FIT, or OUTSIDE beyond the fastest wind (rows, cols).
        ring: True on the 10 kt rings (rows, cols).
        speed_kt: wind speed at each cell centre (rows, cols). [kt]
        bearing_deg: screen bearing of each cell, clockwise from up (rows, cols). [deg]
        centre: (row, col) of the calm point.
        kt_per_row: wind speed per character row. [kt]
    """

    status: np.ndarray
    ring: np.ndarray
    speed_kt: np.ndarray
    bearing_deg: np.ndarray
    centre: tuple[int, int]
    kt_per_row: float


def polar_grid(envelope: Envelope, *, runway_course_deg_true: float, directions: str = "relative",
               radius_rows: int = 12) -> PolarGrid:
    """Sample the envelope on a character grid (two columns per row, terminal cells being about
    twice as tall as wide). Up is the landing direction ("relative") or true north ("true")."""
    if directions not in ("relative", "true"):
        raise ValueError(f"directions must be 'relative' or 'true', got {directions!r}")
    if radius_rows < 2:
        raise ValueError(f"radius_rows must be at least 2, got {radius_rows}")
    vmax = float(np.max(envelope.wind_speed_kt))
    kt_per_row = (vmax if vmax > 0 else RING_STEP_KT) / radius_rows
    rows, cols = 2 * radius_rows + 1, 4 * radius_rows + 1
    i, j = np.mgrid[0:rows, 0:cols]
    up = (radius_rows - i).astype(float)
    right = (j - 2 * radius_rows) / 2.0
    speed = np.hypot(up, right) * kt_per_row
    bearing = np.degrees(np.arctan2(right, up)) % 360.0
    relative = bearing if directions == "relative" else (bearing - runway_course_deg_true) % 360.0
    di, si = _nearest_direction(envelope, relative), _nearest_speed(envelope, speed)
    status = np.asarray(envelope.status)[di, si].astype(int)
    outside = speed > vmax + kt_per_row / 2.0
    status = np.where(outside, OUTSIDE, status)
    # a ring takes the cells it crosses: a cell is 1 row tall and half a row wide, so its radial
    # extent is |cos b| + |sin b| / 2 rows; one cell thick in every direction
    step = RING_STEP_KT
    nearest_ring = np.round(speed / step) * step
    b = np.radians(bearing)
    extent_kt = (np.abs(np.cos(b)) + 0.5 * np.abs(np.sin(b))) * kt_per_row
    ring = (~outside) & (nearest_ring > 0) & (np.abs(speed - nearest_ring) < extent_kt / 2.0)
    return PolarGrid(status=status, ring=ring, speed_kt=speed, bearing_deg=bearing,
                     centre=(radius_rows, 2 * radius_rows), kt_per_row=kt_per_row)


def _rim_cell(grid: PolarGrid, bearing_deg: float, radius_rows: float) -> tuple[int, int]:
    r0, c0 = grid.centre
    b = math.radians(bearing_deg)
    return int(round(r0 - radius_rows * math.cos(b))), int(round(c0 + 2.0 * radius_rows * math.sin(b)))


class EnvelopeView:
    """The wind envelope as a polar picture, with its legend.

    Args:
        envelope: the result of `wind_envelope` / `briefer.brief.envelope_for`.
        runway_course_deg_true: the landing course (to turn relative directions to true).
        ascii: draw with ASCII glyphs only.
        directions: "relative" (up = the landing direction) or "true" (up = true north).
        radius_rows: radius of the picture in character rows (the width is four times it).
        today: (wind from, deg true; speed, kt) of the reported wind, marked when given.
        legend: print the legend under the picture.
    """

    def __init__(self, envelope: Envelope, *, runway_course_deg_true: float, ascii: bool = False,
                 directions: str = "relative", radius_rows: int = 12,
                 today: tuple[float, float] | None = None, legend: bool = True) -> None:
        self.envelope = envelope
        self.runway_course_deg_true = float(runway_course_deg_true)
        self.ascii = ascii
        self.directions = directions
        self.radius_rows = radius_rows
        self.today = today
        self.legend = legend
        self.grid = polar_grid(envelope, runway_course_deg_true=self.runway_course_deg_true,
                               directions=directions, radius_rows=radius_rows)

    # --- the picture as characters ------------------------------------------------------------
    def _screen_bearing(self, true_deg: float) -> float:
        return _wrap360(true_deg - self.runway_course_deg_true) if self.directions == "relative" else _wrap360(true_deg)

    def cells(self) -> list[list[tuple[str, Style | None]]]:
        """The picture's character cells (glyph, style), labels included; rows of equal width."""
        g = GLYPHS[self.ascii]
        grid = self.grid
        rows, cols = grid.status.shape
        pad = 7                                            # label columns either side
        out: list[list[tuple[str, Style | None]]] = []
        for i in range(rows):
            line: list[tuple[str, Style | None]] = [(" ", None)] * pad
            for j in range(cols):
                st = int(grid.status[i, j])
                if st == OUTSIDE:
                    line.append((" ", None))
                elif st == FITS and grid.ring[i, j]:
                    line.append((g.ring, STATUS_STYLE[FITS]))
                else:
                    line.append((g.status(st), STATUS_STYLE[st]))
            line.extend([(" ", None)] * pad)
            out.append(line)
        top_rows = 2                                       # a label row and a marker row
        blank = [(" ", None)] * (cols + 2 * pad)
        out = [list(blank) for _ in range(top_rows)] + out + [list(blank) for _ in range(top_rows)]

        def put(row: int, col: int, text: str, style: Style | None = LABEL_STYLE) -> None:
            for k, ch in enumerate(text):
                if 0 <= row < len(out) and 0 <= col + k < len(out[row]):
                    out[row][col + k] = (ch, style)

        def put_polar(bearing_deg: float, radius_rows: float, text: str, style: Style | None) -> None:
            rr, cc = _rim_cell(grid, bearing_deg, radius_rows)
            put(rr + top_rows, cc + pad, text, style)

        r0, c0 = grid.centre[0] + top_rows, grid.centre[1] + pad
        R = self.radius_rows
        # axis labels, then the landing direction just outside the outer ring
        if self.directions == "relative":
            top, right, bottom, left = "000", "090", "180", "270"
        else:
            top, right, bottom, left = "N", "E", "S", "W"
        put(0, c0 - len(top) // 2, top)
        put(len(out) - 1, c0 - len(bottom) // 2, bottom)
        put(r0, c0 + 2 * R + 4, right)
        put(r0, c0 - 2 * R - 3 - len(left), left)
        put_polar(self._screen_bearing(self.runway_course_deg_true), R + 1, g.landing, MARK_STYLE)
        # today's wind
        if self.today is not None:
            from_true, speed = self.today
            if 0 < speed <= float(np.max(self.envelope.wind_speed_kt)):
                put_polar(self._screen_bearing(from_true), speed / grid.kt_per_row, g.today, MARK_STYLE)
        return out

    def lines(self) -> list[str]:
        """The picture as plain text lines (no legend)."""
        return ["".join(ch for ch, _ in row).rstrip() for row in self.cells()]

    def legend_lines(self) -> list[str]:
        g = GLYPHS[self.ascii]
        vmax = float(np.max(self.envelope.wind_speed_kt))
        rings = " ".join(f"{v:g}" for v in np.arange(RING_STEP_KT, vmax + 1e-9, RING_STEP_KT))
        up = ("Up = the landing direction: a wind from the top is a headwind." if self.directions == "relative"
              else "Up = true north.")
        text = [f"{g.fits} fits   {g.marginal} marginal   {g.does_not_fit} does not fit   "
                f"{g.ring} ring every {RING_STEP_KT:g} kt ({rings} kt)",
                f"{g.landing} landing direction ({self.runway_course_deg_true:03.0f}T)"
                + (f"   {g.today} today's wind" if self.today is not None else ""),
                "A cell: the wind FROM its bearing, at its distance from the centre.", up]
        return text

    # --- Rich protocol --------------------------------------------------------------------------
    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        for row in self.cells():
            t = Text(no_wrap=True, overflow="crop")
            for ch, style in row:
                t.append(ch, style=style)
            t.rstrip()
            yield t
        if self.legend:
            for line in self.legend_lines():
                yield Text(line)

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        width = len(self.cells()[0])
        return Measurement(width, max(width, *(len(s) for s in self.legend_lines())) if self.legend else width)


def speed_bands(speeds_kt: Sequence[float], band_kt: float = 5.0) -> list[tuple[str, np.ndarray]]:
    """Group the envelope's speed indices into bands of `band_kt`: [(label, indices), ...]."""
    spds = np.asarray(speeds_kt, dtype=float)
    if band_kt <= 0:
        raise ValueError(f"band_kt must be positive, got {band_kt}")
    keys = np.floor(spds / band_kt + 1e-9)
    out = []
    for k in np.unique(keys):
        idx = np.nonzero(keys == k)[0]
        lo, hi = spds[idx].min(), spds[idx].max()
        label = f"{lo:g}" if lo == hi else f"{lo:g}-{hi:g}"
        out.append((label, idx))
    return out


class EnvelopeTable:
    """Directions x speed bands. Each cell shows the worst verdict of its band (glyph) and the
    reason letters of the band's cells with that verdict.

    Args:
        envelope: the wind envelope.
        runway_course_deg_true: the landing course (for the true bearings in the first column).
        ascii: ASCII glyphs only.
        band_kt: width of a speed band.
    """

    def __init__(self, envelope: Envelope, *, runway_course_deg_true: float, ascii: bool = False,
                 band_kt: float = 5.0) -> None:
        self.envelope = envelope
        self.runway_course_deg_true = float(runway_course_deg_true)
        self.ascii = ascii
        self.bands = speed_bands(envelope.wind_speed_kt, band_kt)

    def band_cell(self, i: int, idx: np.ndarray) -> tuple[int, str]:
        """(worst status, reason letters) of direction i over the speed indices idx."""
        st = np.asarray(self.envelope.status)[i, idx]
        worst = int(st.min())               # DOES_NOT_FIT < MARGINAL < FITS
        flags = 0
        for r in np.asarray(self.envelope.reasons)[i, idx][st == worst]:
            flags |= int(r)
        return worst, reason_letters(flags)

    def rows(self) -> Iterator[tuple[str, list[tuple[int, str]]]]:
        for i, rel in enumerate(self.envelope.wind_from_relative_deg):
            yield (direction_label(float(rel), self.runway_course_deg_true),
                   [self.band_cell(i, idx) for _, idx in self.bands])

    def __rich__(self) -> Table:
        g = GLYPHS[self.ascii]
        t = Table(title="Wind envelope: wind from (relative, true) x speed band (kt)",
                  box=None, pad_edge=False, padding=(0, 1), title_justify="left")
        t.add_column("wind from", no_wrap=True)
        for label, _ in self.bands:
            t.add_column(label, justify="left", no_wrap=True)
        for label, cells in self.rows():
            t.add_row(label, *[Text(g.status(st) + letters, style=STATUS_STYLE[st]) for st, letters in cells])
        t.caption = ("   ".join(f"{g.status(s)} {STATUS_TEXT[s]}" for s in (FITS, MARGINAL, DOES_NOT_FIT))
                     + "\n" + "   ".join(f"{letter} {meaning.split(':')[0]}" for _, letter, meaning in REASON_LETTERS))
        t.caption_justify = "left"
        return t
