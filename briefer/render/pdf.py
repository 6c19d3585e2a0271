"""The kneeboard card as a PDF (fpdf2's drawing API), from the shared `CardLayout`.

Page 1 is what a crew reads at a glance, in type that can be read on a kneeboard at night in
turbulence: the header (airfield, approach, landing runway, aircraft, when briefed), MINIMUMS and
THE PLAN as boxed figures (the numbers to fly, 17 pt bold), the missed approach and the wind in one
line each, the warnings (most severe first), the plan view with its legend, and the caution.
Everything else follows on the detail pages (page 2, and 3 if needed), which a crew may leave
unprinted: the small print of every section, the sight picture drawn and in words, wind, weather
and performance, every warning and note, and the full CAUTIONS.

Type sizes: every sentence at least `BODY_PT` (9 pt); every label (figure labels and notes, the
plan view's labels, the legend, section titles, severity tags) at least `LABEL_PT` (7 pt); only the
one-line footer is smaller. Nothing is shrunk below these to make a page fit: the front page's
plan view gives way first, then warnings move to page 2 (the front says how many), and the detail
pages flow onto as many pages as they need.

Fonts: the PDF core font Helvetica (Latin-1 only), so the card's text goes through
`printable_text(..., "latin-1")`. Greyscale only: roles and severities differ by line pattern,
weight, hatching, symbol and word, never by colour. The creation date is fixed (the brief's time,
else `FIXED_DATE`), so the same Brief gives the same bytes.

fpdf is imported inside `layout_pdf_bytes` only: the import costs about 0.3 s.
"""

from __future__ import annotations

import datetime as dt
import math
from dataclasses import replace
from typing import Any

from briefer.cautions import SHORT_CAUTION
from briefer.errors import BriefingError
from briefer.render.card_layout import (
    CardLayout,
    Figure,
    Row,
    Section,
    SideView,
    WarningLine,
    bind_units,
    card_layout,
    printable_text,
)
from briefer.render.scene import ROLE_STYLES, Label, Marker, Polygon, Polyline, Role, Scene
from briefer.render.paper import (
    HATCH_WIDTH_MM,
    MARGIN_MM as PAPER_MARGIN_MM,
    MARKER_SIZE_MM,
    CirclePrim,
    LinePrim,
    PolygonPrim,
    TextPrim,
    drawing_height,
    paper_style,
    scene_to_primitives,
)
from briefer.result import Brief

PAGE_SIZES_MM: dict[str, tuple[float, float]] = {
    "half-letter": (139.7, 215.9),   # 5.5 x 8.5 in = 396 x 612 pt
    "a5": (148.0, 210.0),            # ISO A5 = 419.5 x 595.3 pt
}
"""Portrait page sizes (width, height) in millimetres."""
FIXED_DATE = dt.datetime(2000, 1, 1, tzinfo=dt.timezone.utc)
"""Creation date when the brief's time cannot be read (keeps the bytes reproducible)."""

MARGIN_MM = 6.0
GAP_MM = 2.0
FONT = "Helvetica"
FIGURES_PER_ROW = 4
PLAN_MIN_MM = 55.0
"""The front page's plan view is not made smaller than this while warnings can move to page 2."""
PLAN_FLOOR_MM = 35.0
"""Below this the plan view leaves the front page for the detail pages."""
SIDE_VIEW_H_MM = 36.0
LINE_SPACING = 1.2

# type sizes in points
BODY_PT = 9.0
"""Every sentence on the card: rows, warnings, statuses, the cautions (never smaller)."""
LABEL_PT = 7.0
"""The smallest label: figure labels and notes, legend, the drawings' words, tags (never smaller)."""
TITLE_PT = 13.0
SUBTITLE_PT = 10.0
SECTION_PT = 8.0
FIG_LABEL_PT = LABEL_PT
FIG_VALUE_PT = 17.0
FIG_VALUE_MIN_PT = 12.0
FIG_NOTE_PT = LABEL_PT
ROW_PT = BODY_PT
TAG_PT = 7.5
CAUTION_PT = BODY_PT
FOOTER_PT = 6.0
"""The one-line footer (version and the short caution), the only text under `LABEL_PT`."""
FRONT_SEVERITIES = ("danger", "warning")
"""Findings printed on the front page; notes are on the detail pages."""


def page_size_mm(page: str) -> tuple[float, float]:
    """(width, height) of a page name ("half-letter" or "a5"); BriefingError for another name."""
    key = str(page).strip().lower()
    if key not in PAGE_SIZES_MM:
        raise BriefingError(f"unknown page size {page!r}; expected one of {', '.join(PAGE_SIZES_MM)}")
    return PAGE_SIZES_MM[key]


def creation_date(briefed_utc: str) -> dt.datetime:
    """The brief's time ('2000-01-01 12:00Z') as a UTC datetime, or `FIXED_DATE`."""
    for fmt in ("%Y-%m-%d %H:%MZ", "%Y-%m-%d %H:%M:%SZ", "%Y-%m-%dT%H:%M:%SZ", "%Y-%m-%dT%H:%MZ"):
        try:
            return dt.datetime.strptime(briefed_utc.strip(), fmt).replace(tzinfo=dt.timezone.utc)
        except ValueError:
            continue
    return FIXED_DATE


def _t(text: str) -> str:
    return printable_text(text, "latin-1")


def _grey(level: float) -> int:
    return max(0, min(255, round(level * 255)))


class CardPainter:
    """Draws (or, with `draw=False`, only measures) the card's blocks on the current page."""

    def __init__(self, pdf: Any, layout: CardLayout, page_w: float, page_h: float,
                 widths: dict[tuple[str, float, str], float] | None = None) -> None:
        self.pdf = pdf
        self.layout = layout
        self.page_w, self.page_h = page_w, page_h
        self.x0 = MARGIN_MM
        self.w = page_w - 2 * MARGIN_MM
        self.draw = False
        self._font: tuple[str, float] | None = None
        self._widths: dict[tuple[str, float, str], float] = widths if widths is not None else {}

    # --- text helpers ------------------------------------------------------------------------

    def font(self, style: str, size_pt: float) -> None:
        if (style, size_pt) != self._font:      # set_font() costs ~0.1 ms even when nothing changes
            self.pdf.set_font(FONT, style, size_pt)
            self._font = (style, size_pt)

    def pen(self, width: float = 0.2, grey: float = 0.0, *, fill: float | None = None,
            dash: tuple[float, float] | None = None) -> None:
        """Set the whole pen before each drawing (fpdf writes only what changes): line width [mm],
        stroke grey and fill grey (0 black, 1 white), dash (dash, gap) [mm] or solid."""
        pdf = self.pdf
        pdf.set_line_width(width)
        pdf.set_draw_color(_grey(grey))
        if fill is not None:
            pdf.set_fill_color(_grey(fill))
        if dash:
            pdf.set_dash_pattern(dash=dash[0], gap=dash[1])
        else:
            pdf.set_dash_pattern()

    def lh(self, size_pt: float) -> float:
        """Line height in mm of a font size in points."""
        return size_pt / self.pdf.k * LINE_SPACING

    def width_of(self, text: str) -> float:
        """Width in mm of `text` in the current font (cached per font, size and text)."""
        pdf = self.pdf
        key = (pdf.font_style, pdf.font_size_pt, text)
        w = self._widths.get(key)
        if w is None:
            # the core font's own metrics: get_string_width() gives the same number but parses
            # the text into styled fragments first, which cost ~0.4 ms a call
            w = self._widths[key] = pdf.current_font.get_text_width(text, pdf.font_size_pt, None)[1] / pdf.k
        return w

    def lines(self, text: str, width: float) -> list[str]:
        """`text` broken at spaces into lines that fit `width` in the current font (a word longer
        than the line is cut). Own greedy breaking: fpdf's multi_cell(dry_run=True) measures
        character by character and cost about 5 ms a paragraph."""
        words = [w for w in bind_units(_t(text)).split(" ") if w]   # split(" "): the no-break space binds
        if not words:
            return [""]
        space = self.width_of(" ")
        out: list[str] = []
        line: list[str] = []
        used = 0.0
        for word in words:
            ww = self.width_of(word)
            while ww > width and len(word) > 1:       # cut a word longer than the line
                if line:
                    out.append(" ".join(line))
                    line, used = [], 0.0
                n = len(word) - 1
                while n > 1 and self.width_of(word[:n]) > width:
                    n -= 1
                out.append(word[:n])
                word = word[n:]
                ww = self.width_of(word)
            if line and used + space + ww > width:
                out.append(" ".join(line))
                line, used = [], 0.0
            used = ww if not line else used + space + ww
            line.append(word)
        if line:
            out.append(" ".join(line))
        return out

    def text_at(self, x: float, y_top: float, text: str, size_pt: float, *, align: str = "L",
                width: float = 0.0) -> None:
        """One line whose top is `y_top` (L: starts at x; R: ends at x + width; C: centred)."""
        if not self.draw:
            return
        t = _t(text)
        if align != "L":
            tw = self.width_of(t)
            x = x + width - tw if align == "R" else x + (width - tw) / 2
        # baseline: the cap height is about 0.72 em below the line's top with this line spacing
        self.pdf.text(x, y_top + size_pt / self.pdf.k * 0.93, t)

    def paragraph(self, x: float, y: float, width: float, text: str, style: str, size_pt: float) -> float:
        """Wrapped text from `y`; returns the height used."""
        self.font(style, size_pt)
        lines = self.lines(text, width)
        for i, ln in enumerate(lines):
            self.text_at(x, y + i * self.lh(size_pt), ln, size_pt)
        return len(lines) * self.lh(size_pt)

    def fit_size(self, text: str, style: str, size_pt: float, width: float, floor_pt: float) -> float:
        """The largest size from `size_pt` down to `floor_pt` at which `text` fits `width` on one
        line (`floor_pt` if none does)."""
        self.font(style, size_pt)
        tw = self.width_of(_t(text))
        if tw <= width or tw == 0:
            return size_pt
        return max(floor_pt, size_pt * width / tw)

    # --- blocks (each returns the y below it) ----------------------------------------------------

    def header(self, y: float, *, title: str | None = None, subtitle: str | None = None) -> float:
        """The airfield large, the card's title and time at the right, the approach and the
        aircraft below; a detail page passes its own `title`."""
        L = self.layout
        right_w = 42.0
        size = self.fit_size(L.place, "B", TITLE_PT, self.w - right_w, 10.0)
        self.font("B", size)
        self.text_at(self.x0, y, L.place, size)
        self.font("B", SECTION_PT)
        self.text_at(self.x0, y + 0.3, title or L.title, SECTION_PT, align="R", width=self.w)
        self.font("", LABEL_PT)
        self.text_at(self.x0, y + 0.3 + self.lh(SECTION_PT), L.briefed, LABEL_PT, align="R", width=self.w)
        y += max(self.lh(TITLE_PT), 0.3 + self.lh(SECTION_PT) + self.lh(LABEL_PT))
        y += self.paragraph(self.x0, y, self.w, subtitle or L.approach, "B", SUBTITLE_PT)
        if subtitle is None:
            y += self.paragraph(self.x0, y, self.w, f"{L.aircraft}; criteria {L.criteria}", "", BODY_PT)
        y += 0.6
        if self.draw:
            self.pen(0.6)
            self.pdf.line(self.x0, y, self.x0 + self.w, y)
        return y + 1.0

    def bar(self, x: float, y: float, w: float, title: str, status: str = "", alert: bool = False) -> float:
        """A section title on a light grey bar and, below it, the section's status in bold body
        type; an alert status is reversed, white on black, and starts with '!!', so it stands out
        without colour."""
        self.font("B", SECTION_PT)
        h = self.lh(SECTION_PT) + 0.3
        if self.draw:
            self.pen(fill=0.85)
            self.pdf.rect(x, y, w, h, style="F")
            self.text_at(x + 1.0, y + 0.2, title, SECTION_PT)
        y += h + 0.5
        if status:
            self.font("B", BODY_PT)
            lines = self.lines(("!! " if alert else "") + status, w - 2.0)
            lh = self.lh(BODY_PT)
            if self.draw:
                if alert:
                    self.pen(fill=0.0)
                    self.pdf.rect(x, y - 0.2, w, len(lines) * lh + 0.4, style="F")
                    self.pdf.set_text_color(255)
                for i, ln in enumerate(lines):
                    self.text_at(x + 1.0, y + i * lh, ln, BODY_PT)
                self.pdf.set_text_color(0)
            y += len(lines) * lh + 0.6
        return y

    def figure_height(self, figures: tuple[Figure, ...]) -> float:
        """Height of one row of figure boxes (the label, the value, the note on up to two lines)."""
        cw = self.w / FIGURES_PER_ROW
        self.font("", FIG_NOTE_PT)
        note_lines = max([len(self.lines(f.note, cw - 2.0)) for f in figures] or [1])
        return self.lh(FIG_LABEL_PT) + self.lh(FIG_VALUE_PT) * 0.95 + min(2, note_lines) * self.lh(FIG_NOTE_PT) + 0.4

    def figures(self, y: float, figures: tuple[Figure, ...]) -> float:
        """The numbers to fly in large type, four to a row, each boxed: label, value, note."""
        cw = self.w / FIGURES_PER_ROW
        for start in range(0, len(figures), FIGURES_PER_ROW):
            row = figures[start:start + FIGURES_PER_ROW]
            ch = self.figure_height(row)
            for i, f in enumerate(row):
                x = self.x0 + i * cw
                if not self.draw:
                    continue
                self.pen(0.25)
                self.pdf.rect(x, y, cw, ch, style="D")
                self.font("B", FIG_LABEL_PT)
                self.text_at(x + 1.0, y + 0.3, f.label, FIG_LABEL_PT)
                vs = self.fit_size(f.value, "B", FIG_VALUE_PT, cw - 2.0, FIG_VALUE_MIN_PT)
                self.font("B", vs)
                self.text_at(x + 0.8, y + self.lh(FIG_LABEL_PT) + (self.lh(FIG_VALUE_PT) - self.lh(vs)) / 2 - 0.2,
                             f.value, vs)
                self.font("", FIG_NOTE_PT)
                notes = self.lines(f.note, cw - 2.0)[:2]
                ny = y + self.lh(FIG_LABEL_PT) + self.lh(FIG_VALUE_PT) * 0.95
                for k, ln in enumerate(notes):
                    self.text_at(x + 1.0, ny + k * self.lh(FIG_NOTE_PT), ln, FIG_NOTE_PT)
            y += ch
        return y + 0.8

    def label_width(self, rows: tuple[Row, ...], size: float) -> float:
        self.font("B", size)
        return min(self.w * 0.3, max([self.width_of(_t(r.label)) for r in rows] or [0.0]) + 2.0)

    def row_height(self, row: Row, width: float, label_w: float, size: float) -> float:
        self.font("", size)
        return len(self.lines(row.text, width - label_w)) * self.lh(size)

    def rows(self, y: float, rows: tuple[Row, ...], x: float | None = None, width: float | None = None,
             label_w: float | None = None, size: float = ROW_PT, sample_rows: tuple[int, ...] = (),
             flow: Flow | None = None) -> float:
        """Labelled lines of body type; returns the y below them. With a `flow`, a row that does
        not fit goes on to the next page."""
        x = self.x0 if x is None else x
        width = self.w if width is None else width
        sample_w = 3.6 if sample_rows else 0.0
        label_w = (self.label_width(rows, size) + sample_w) if label_w is None else label_w
        lh = self.lh(size)
        for i, r in enumerate(rows):
            self.font("", size)
            lines = self.lines(r.text, width - label_w)
            if flow is not None:
                y = flow.need(y, len(lines) * lh)
            if self.draw:
                lx = x
                if i in sample_rows:    # a sample of the side view's line before the label
                    self.pen(0.5, 0.0) if i == 0 else self.pen(0.4, 0.3, dash=(0.9, 0.6))
                    self.pdf.line(x, y + lh * 0.55, x + 3.0, y + lh * 0.55)
                    lx = x + sample_w
                self.font("B", size)
                self.text_at(lx, y, r.label, size)
                self.font("", size)
                for k, ln in enumerate(lines):
                    self.text_at(x + label_w, y + k * lh, ln, size)
            y += len(lines) * lh
        return y + 0.6

    def tag_width(self) -> float:
        self.font("B", TAG_PT)
        return self.width_of("!! DANGER") + 2.6

    def warning_lines(self, items: tuple[WarningLine, ...]) -> list[list[str]]:
        width = self.w - self.tag_width()
        self.font("", BODY_PT)
        return [self.lines(wl.text, width) for wl in items]

    def warnings(self, y: float, items: tuple[WarningLine, ...], flow: Flow | None = None) -> float:
        """Findings, most severe first: DANGER reversed (white on black), WARNING boxed, NOTE
        plain, each with its symbol and word, so that no colour is needed."""
        lh = self.lh(BODY_PT)
        tag_w = self.tag_width()
        for wl, lines in zip(items, self.warning_lines(items)):
            if flow is not None:
                y = flow.need(y, len(lines) * lh)
            if self.draw:
                self.font("B", TAG_PT)
                box = (self.x0, y + 0.15, tag_w - 1.2, lh - 0.1)
                if wl.severity == "danger":
                    self.pen(fill=0.0)
                    self.pdf.rect(*box, style="F")
                    self.pdf.set_text_color(255)
                elif wl.severity == "warning":
                    self.pen(0.3)
                    self.pdf.rect(*box, style="D")
                self.text_at(self.x0 + 0.6, y + 0.15 + (lh - self.lh(TAG_PT)) / 2, f"{wl.mark} {wl.word}", TAG_PT)
                self.pdf.set_text_color(0)
                self.font("", BODY_PT)
                for k, ln in enumerate(lines):
                    self.text_at(self.x0 + tag_w, y + k * lh, ln, BODY_PT)
            y += len(lines) * lh + 0.35
        return y + 0.4

    def caution_box(self, y: float, texts: tuple[str, ...], title: str = "") -> float:
        """A heavy-bordered box on a light grey ground: a title (optional) and the cautions, one
        per bullet, in bold body type on the front page, plain on the detail pages."""
        pad, bullet = 1.2, 2.4 if len(texts) > 1 else 0.0
        style = "" if title else "B"
        inner = self.w - 2 * pad - bullet
        lh = self.lh(CAUTION_PT)
        self.font(style, CAUTION_PT)
        blocks = [self.lines(c, inner) for c in texts]
        h = pad * 2 + (self.lh(SECTION_PT) if title else 0.0) + sum(len(b) for b in blocks) * lh - 0.4
        if not self.draw:
            return y + h
        self.pen(0.7, fill=0.93)
        self.pdf.rect(self.x0, y, self.w, h, style="DF")
        yy = y + pad - 0.2
        if title:
            self.font("B", SECTION_PT)
            self.text_at(self.x0 + pad, yy, title, SECTION_PT)
            yy += self.lh(SECTION_PT)
        self.font(style, CAUTION_PT)
        for b in blocks:
            if bullet:
                self.text_at(self.x0 + pad, yy, "-", CAUTION_PT)
            for k, ln in enumerate(b):
                self.text_at(self.x0 + pad + bullet, yy + k * lh, ln, CAUTION_PT)
            yy += len(b) * lh
        return y + h

    def measure_caution(self, texts: tuple[str, ...], title: str = "") -> float:
        """Height of `caution_box(texts, title)`."""
        draw, self.draw = self.draw, False
        try:
            return self.caution_box(0.0, texts, title)
        finally:
            self.draw = draw

    def footer_height(self) -> float:
        return self.lh(FOOTER_PT) + 0.6

    def footer(self, page_text: str = "") -> None:
        """One line at the foot: the version, the short caution and the page."""
        if not self.draw:
            return
        y = self.page_h - MARGIN_MM - self.lh(FOOTER_PT) + 1.0
        text = self.layout.footer + (f"  {page_text}" if page_text else "")
        size = self.fit_size(text, "", FOOTER_PT, self.w, 4.5)
        self.font("", size)
        self.text_at(self.x0, y, text, size)

    # --- the drawings --------------------------------------------------------------------------

    def legend(self, x: float, y: float, w: float, columns: int = 3) -> float:
        """One entry per role on the plan view, with a sample drawn in that role's pen, and the
        labels left off the drawing (if any)."""
        size = LABEL_PT
        sample_w = 6.0
        col_w = w / columns
        entries = self.layout.legend
        per_col = max(1, math.ceil(len(entries) / columns))
        lh = max(self.lh(size), 2.8)
        for i, entry in enumerate(entries):
            cx = x + (i // per_col) * col_w
            cy = y + (i % per_col) * lh
            if self.draw:
                self.role_sample(entry.role, cx + 0.3, cy + lh / 2, sample_w - 1.6)
                self.font("", size)
                t = _t(entry.text)
                while t and self.width_of(t) > col_w - sample_w - 0.5:
                    t = t[:-1]
                self.text_at(cx + sample_w, cy + (lh - self.lh(size)) / 2, t, size)
        y += per_col * lh + 0.6
        dropped = getattr(self, "dropped_labels", ())
        if dropped:
            y += self.paragraph(x, y, w, "Labels left off the drawing (no room): " + ", ".join(dropped) + ".",
                                "", size) + 0.4
        return y

    def legend_height(self, w: float) -> float:
        draw, self.draw = self.draw, False
        try:
            return self.legend(0.0, 0.0, w)
        finally:
            self.draw = draw

    def role_sample(self, role: Any, x: float, y: float, w: float) -> None:
        """A sample of a role drawn by `scene_to_primitives` itself (a marker, a hatched patch or
        a stretch of line), so the legend shows exactly the plan view's pen."""
        rs = ROLE_STYLES[role]
        if rs.marker_symbol is not None:
            item: Any = Marker((0.0, 0.0), role)
        elif rs.paper.hatch_spacing_mm:
            item = Polygon(((0.0, -1.0), (4.0, -1.0), (4.0, 1.0), (0.0, 1.0)), role)
        else:
            item = Polyline(((0.0, 0.0), (4.0, 0.0)), role, dashed=role is Role.FAMILIAR_TRACK)
        half = 1.3
        for p in scene_to_primitives(Scene(items=(item,)), (x, y - half, w, 2 * half), margin_mm=0.0,
                                     decorations=False):
            self.primitive(p)

    def primitive(self, p: Any) -> None:
        pdf = self.pdf
        ps = paper_style(p.style)
        if isinstance(p, TextPrim):
            size_pt = p.size_mm * pdf.k
            self.font("", size_pt)
            t = _t(p.text)
            tw = self.width_of(t)
            x = p.point_mm[0] - {"start": 0.0, "middle": tw / 2, "end": tw}[p.anchor]
            # a tight white ground keeps a label legible where a line crosses it (a white outline
            # drawn as stroked text would read twice in the PDF's text)
            self.pen(fill=1.0)
            pdf.rect(x - 0.25, p.point_mm[1] - p.size_mm * 0.74, tw + 0.5, p.size_mm * 0.92, style="F")
            pdf.set_text_color(0)
            pdf.text(x, p.point_mm[1], t)
            return
        filled = not isinstance(p, LinePrim) and p.filled and ps.fill_grey is not None
        self.pen(ps.stroke_width_mm, ps.stroke_grey, fill=ps.fill_grey if filled else None, dash=p.dash_mm)
        if ps.round_cap:    # rare (the dotted area boundary): the one case worth a graphics state
            with pdf.local_context(stroke_cap_style="ROUND"):
                self.shape(p, filled)
        else:
            self.shape(p, filled)
        if isinstance(p, PolygonPrim) and p.hatch_mm:
            self.pen(HATCH_WIDTH_MM, ps.stroke_grey)
            for a, b in p.hatch_mm:
                pdf.line(a[0], a[1], b[0], b[1])

    def shape(self, p: Any, filled: bool) -> None:
        """A line, circle or polygon primitive in the current pen."""
        pdf = self.pdf
        if isinstance(p, LinePrim):
            pdf.polyline(list(p.points_mm), polygon=p.closed, style="D")
        elif isinstance(p, CirclePrim):
            pdf.circle(p.centre_mm[0], p.centre_mm[1], p.radius_mm, style="DF" if filled else "D")
        else:
            pdf.polygon(list(p.points_mm), style="DF" if filled else "D")

    def plan_prims(self, box: tuple[float, float, float, float]) -> list[Any]:
        """The plan view's primitives in `box`, labels placed (see `_place_labels`); records the
        labels left off in `dropped_labels` for the legend."""
        prims = scene_to_primitives(self.layout.plan_view, box)
        out, self.dropped_labels = _place_labels(self, prims, box)
        return out

    def plan_view(self, box: tuple[float, float, float, float], prims: list[Any] | None = None) -> None:
        """The plan view in `box`: the drawing clipped to its frame, the key (scale bar and north
        arrow) on a white ground over it."""
        self.scene_prims(self.plan_prims(box) if prims is None else prims, box)

    def scene_prims(self, prims: list[Any], box: tuple[float, float, float, float]) -> None:
        """A scene's primitives in `box`: the drawing clipped to its frame, then the key."""
        x, y, w, h = box
        # local_context around the clip: the PDF's state returns to the outside one at the end of
        # the clip, and so must fpdf's record of it (pen and font)
        with self.pdf.local_context(), self.pdf.rect_clip(x, y, w, drawing_height(h)):
            for p in prims:
                if p.item is not None:
                    self.primitive(p)
        self._font = None
        with self.pdf.local_context():
            for p in prims:
                if p.item is None:
                    self.primitive(p)
        self._font = None

    def side_view(self, sv: SideView, box: tuple[float, float, float, float]) -> None:
        """The side view of the sight picture in `box`: the Scene the app draws too
        (`briefer.render.side_scene`), sized to the box, its labels placed as the plan view's."""
        from briefer.render.labels import place_paper_labels

        _, _, w, h = box
        scene = sv.picture.scene(w, drawing_height(h), margin=PAPER_MARGIN_MM)
        prims, _ = place_paper_labels(scene_to_primitives(scene, box), scene, box,
                                      lambda text, size_mm: _measure(self, text, size_mm))
        self.scene_prims(prims, box)


class Flow:
    """Blocks set one below the other over as many pages as they need (the detail pages): a block
    that does not fit goes to a new page, which gets the continued header and the footer."""

    def __init__(self, card: CardPainter, first_page: int, heading: str) -> None:
        self.card = card
        self.page = first_page
        self.heading = heading
        self.pages = 1
        self.bottom = card.page_h - MARGIN_MM - card.footer_height() - GAP_MM
        self.total: int | None = None

    def start(self) -> float:
        """Begin a page: its header; returns the y below it."""
        card = self.card
        if card.draw:
            card.pdf.add_page()
        return card.header(MARGIN_MM, title=f"{card.layout.title}, {self.heading}",
                           subtitle=f"{card.layout.approach} (continued from page 1)")

    def need(self, y: float, h: float) -> float:
        """The y to draw a block of height `h` at: `y`, or the top of a new page."""
        if y + h <= self.bottom or y <= self._top:
            return y
        self.end_page()
        self.page += 1
        self.pages += 1
        self._top = self.start()
        return self._top

    _top = 0.0

    def begin(self) -> float:
        self._top = self.start()
        return self._top

    def end_page(self) -> None:
        total = f" of {self.total}" if self.total else ""
        self.card.footer(f"page {self.page}{total}")


def _front(card: CardPainter, warn_limit: int, plan_prims: list[Any] | None = None,
           detail: bool = True) -> tuple[float, float]:
    """Lay out (or draw) the front page with this many warnings; returns (top of the plan view,
    its height, possibly < PLAN_FLOOR_MM: then it is not drawn here)."""
    L = card.layout
    y = card.header(MARGIN_MM)
    for sec in (L.minimums, L.plan):
        y = card.bar(card.x0, y, card.w, sec.title, sec.status, sec.alert)
        y = card.figures(y, sec.figures)
    y = card.rows(y, front_rows(L))
    shown, rest = front_warnings(L, warn_limit)
    title = "WARNINGS, most severe first" if shown else "WARNINGS"
    y = card.bar(card.x0, y, card.w, title)
    if shown:
        y = card.warnings(y, shown)
    summary = rest_summary(L, shown, rest, detail)
    if summary:
        y += card.paragraph(card.x0, y, card.w, summary, "B" if rest else "", BODY_PT) + 0.6
    caution_top = card.page_h - MARGIN_MM - card.footer_height() - card.measure_caution(front_cautions(detail)) - GAP_MM
    plan_top = y
    card.dropped_labels = ()
    legend_h = card.legend_height(card.w)
    plan_h = caution_top - GAP_MM - legend_h - plan_top
    if plan_h >= PLAN_FLOOR_MM and card.draw:
        box = (card.x0, plan_top, card.w, plan_h)
        prims = card.plan_prims(box) if plan_prims is None else plan_prims
        extra = card.legend_height(card.w) - legend_h      # a line naming labels left off
        if extra > 0:
            plan_h -= extra
            box = (card.x0, plan_top, card.w, plan_h)
            prims = card.plan_prims(box)
        card.plan_view(box, prims)
        card.legend(card.x0, plan_top + plan_h + 0.6, card.w)
    if card.draw:
        card.caution_box(caution_top, front_cautions(detail))
    return plan_top, plan_h


def front_rows(layout: CardLayout) -> tuple[Row, ...]:
    """The front page's lines of body type: the missed approach and the wind."""
    rows = [r for r in layout.plan.rows if r.label == "Missed appr"][:1]
    rows += [r for r in layout.wind.rows if r.label == "Wind"][:1]
    return tuple(rows)


def front_warnings(layout: CardLayout, limit: int) -> tuple[tuple[WarningLine, ...], tuple[WarningLine, ...]]:
    """(shown on the front page, left for the detail pages) of the dangers and warnings."""
    severe = tuple(w for w in layout.warnings if w.severity in FRONT_SEVERITIES)
    return severe[:limit], severe[limit:]


def rest_summary(layout: CardLayout, shown: tuple[WarningLine, ...], rest: tuple[WarningLine, ...],
                 detail: bool) -> str:
    """The line under the front page's warnings naming what is not on it."""
    notes = sum(1 for w in layout.warnings if w.severity not in FRONT_SEVERITIES)
    bits = []
    if rest:
        bits.append(f"{len(rest)} more warning{'s' if len(rest) != 1 else ''}")
    if notes:
        bits.append(f"{notes} note{'s' if notes != 1 else ''}")
    if not shown and not rest:
        head = "No warnings."
        return head + (f" {notes} note{'s' if notes != 1 else ''} on page 2." if notes and detail else "")
    if not bits:
        return ""
    where = "on page 2" if detail else "in the brief on screen (page 2 not printed)"
    return ("... and " if rest else "") + " and ".join(bits) + f" {where}."


def front_cautions(detail: bool) -> tuple[str, ...]:
    return (SHORT_CAUTION + (" All cautions: page 2." if detail else ""),)


def _front_fit(card: CardPainter) -> int:
    """How many of the dangers and warnings the front page shows: all, unless the plan view
    would fall under `PLAN_MIN_MM`; then as many as keep it there (never smaller type)."""
    severe = sum(1 for w in card.layout.warnings if w.severity in FRONT_SEVERITIES)
    draw, card.draw = card.draw, False
    try:
        for limit in range(severe, -1, -1):
            _, plan_h = _front(card, limit)
            if plan_h >= PLAN_MIN_MM:
                return limit
        return 0
    finally:
        card.draw = draw


def _details(card: CardPainter, extra: tuple[Section, ...], plan_on_front: bool, first_page: int = 2,
             total: int | None = None) -> int:
    """The detail pages (flowing): every section's small print, the sight picture, every warning
    and note, the extra sections, the full cautions. Returns how many pages they took."""
    L = card.layout
    flow = Flow(card, first_page, "details")
    flow.total = total
    y = flow.begin()
    if not plan_on_front:
        h = min(card.w * 0.8, flow.bottom - y - 20.0)
        y = flow.need(y, h + 10.0)
        card.plan_view((card.x0, y, card.w, h)) if card.draw else None
        y = card.legend(card.x0, y + h + 0.6, card.w)
    for sec in (L.minimums, L.plan):
        y = flow.need(y, card.lh(SECTION_PT) + 2 * card.lh(BODY_PT))
        y = card.bar(card.x0, y, card.w, f"{sec.title}: the small print")
        y = card.rows(y, sec.rows, flow=flow)
    y = flow.need(y, card.lh(SECTION_PT) + SIDE_VIEW_H_MM + 2.0)
    y = card.bar(card.x0, y, card.w, "SIGHT PICTURE, abeam the threshold")
    if card.draw:
        card.side_view(L.side_view, (card.x0, y, card.w, SIDE_VIEW_H_MM))
    y += SIDE_VIEW_H_MM + 1.0
    y = card.rows(y, L.side_view.rows, sample_rows=(0, 1), flow=flow)
    y = flow.need(y, card.lh(SECTION_PT) + 2 * card.lh(BODY_PT))
    y = card.bar(card.x0, y, card.w, L.wind.title)
    y = card.rows(y, L.wind.rows, flow=flow)
    y = flow.need(y, card.lh(SECTION_PT) + 2 * card.lh(BODY_PT))
    y = card.bar(card.x0, y, card.w, "EVERY WARNING AND NOTE, most severe first")
    if L.warnings:
        y = card.warnings(y, L.warnings, flow=flow)
    else:
        y += card.paragraph(card.x0, y, card.w, "No warnings.", "", BODY_PT) + 0.6
    for sec in extra:
        first = card.figure_height(sec.figures[:FIGURES_PER_ROW]) if sec.figures else 2 * card.lh(BODY_PT)
        y = flow.need(y, card.lh(SECTION_PT) + card.lh(BODY_PT) + first)
        y = card.bar(card.x0, y, card.w, sec.title, sec.status, sec.alert)
        for start in range(0, len(sec.figures), FIGURES_PER_ROW):
            part = sec.figures[start:start + FIGURES_PER_ROW]
            y = flow.need(y, card.figure_height(part))
            y = card.figures(y, part)
        y = card.rows(y, sec.rows, flow=flow)
    h = card.measure_caution(L.cautions, "CAUTIONS")
    y = flow.need(y + GAP_MM, h)
    card.caution_box(y, L.cautions, "CAUTIONS")
    flow.end_page()
    return flow.pages


def draw_card_page(pdf: Any, layout: CardLayout, *, extra: tuple[Section, ...] = (),
                   widths: dict[tuple[str, float, str], float] | None = None, detail: bool = True) -> int:
    """Draw the card: the front page on the current page of `pdf` (an fpdf2 FPDF in millimetres,
    a page added; the page's own size is used), then, with `detail`, the detail pages it adds.

    Args:
        pdf: The document (e.g. a deck that prints several cards).
        layout: What to print.
        extra: Sections printed on the detail pages after the warnings, in the card's style.
        widths: A text-width cache to share between pages.
        detail: Add the detail pages (page 2 on); without them the front page says where the
            rest is.

    Returns:
        The number of pages drawn.
    """
    widths = {} if widths is None else widths
    card = CardPainter(pdf, layout, pdf.w, pdf.h, widths)
    pdf.set_text_color(0)
    pdf.set_draw_color(0)
    limit = _front_fit(card)
    total = None
    if detail:
        card.draw = False
        total = 1 + _details(card, extra, True)
    card.draw = True
    _, plan_h = _front(card, limit, detail=detail)
    card.footer(f"page 1 of {total}" if total else "page 1 of 1")
    if not detail:
        return 1
    return 1 + _details(card, extra, plan_h >= PLAN_FLOOR_MM, total=total)


Box = tuple[float, float, float, float]   # x0, y0, x1, y1 in page mm


def _text_box(p: Any, width: float) -> Box:
    """The page box a TextPrim covers (from its anchor and baseline)."""
    x = p.point_mm[0] - {"start": 0.0, "middle": width / 2, "end": width}[p.anchor]
    return (x, p.point_mm[1] - p.size_mm * 0.74, x + width, p.point_mm[1] + p.size_mm * 0.18)


def _overlap(a: Box, b: Box) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _place_labels(card: CardPainter, prims: list[Any], box: tuple[float, float, float, float]
                  ) -> tuple[list[Any], tuple[str, ...]]:
    """Move the plan view's text off the drawing's key lines and off other text (the shared
    placement of `briefer.render.labels`); returns the primitives and the labels left off."""
    from briefer.render.labels import place_paper_labels

    return place_paper_labels(prims, card.layout.plan_view, box, lambda text, size_mm: _measure(card, text, size_mm))


def _measure(card: CardPainter, text: str, size_mm: float) -> float:
    card.font("", size_mm * card.pdf.k)
    return card.width_of(_t(text))


def front_plan(layout: CardLayout, *, page: str = "half-letter") -> tuple[tuple[float, float, float, float],
                                                                           list[Any], tuple[str, ...]]:
    """The front page's plan view as drawn: its box [mm], its primitives with the labels placed,
    and the labels left off (for checks of the drawing without reading the PDF back)."""
    from fpdf import FPDF

    page_w, page_h = page_size_mm(page)
    pdf = FPDF(orientation="P", unit="mm", format=(page_w, page_h))
    pdf.add_page()
    card = CardPainter(pdf, layout, page_w, page_h)
    top, h = _front(card, _front_fit(card))
    box = (card.x0, top, card.w, h)
    prims = card.plan_prims(box)
    if card.dropped_labels:               # as `_front` draws it: a line under the legend says so
        dropped = card.dropped_labels
        card.dropped_labels = ()
        extra = -card.legend_height(card.w)
        card.dropped_labels = dropped
        extra += card.legend_height(card.w)
        box = (card.x0, top, card.w, h - extra)
        prims = card.plan_prims(box)
    return box, prims, tuple(card.dropped_labels)


def layout_pdf_bytes(layout: CardLayout, *, page: str = "half-letter", detail: bool = True) -> bytes:
    """The PDF card of a layout: the front page, and with `detail` the detail pages (see the
    module docstring)."""
    page_w, page_h = page_size_mm(page)
    from fpdf import FPDF   # about 0.3 s to import: only when a PDF is made

    pdf = FPDF(orientation="P", unit="mm", format=(page_w, page_h))
    pdf.set_auto_page_break(False)
    pdf.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
    pdf.set_creation_date(creation_date(layout.briefed_utc))
    pdf.set_title(_t(f"{layout.title}: {layout.place}, {layout.approach}"))
    pdf.set_subject(_t(layout.footer))
    pdf.set_creator("briefer")
    pdf.add_page()
    draw_card_page(pdf, layout, detail=detail)
    return bytes(pdf.output())


def card_pdf_bytes(brief: Brief, *, page: str = "half-letter", detail: bool = True, units: str = "us") -> bytes:
    """The PDF kneeboard card of a Brief (half-letter or A5, portrait): the front page, and with
    `detail` the detail pages; `units` the display units (briefer.display_units)."""
    return layout_pdf_bytes(card_layout(brief, units), page=page, detail=detail)


__all__ = ["BODY_PT", "FIXED_DATE", "LABEL_PT", "PAGE_SIZES_MM", "card_pdf_bytes", "creation_date", "draw_card_page",
           "layout_pdf_bytes", "page_size_mm"]
