"""The kneeboard card as a one-page PDF (fpdf2's drawing API), from the shared `CardLayout`.

Reading order, top to bottom: the header (airfield, approach, landing runway, aircraft, when
briefed), MINIMUMS (big figures, then small print), THE PLAN (the numbers to fly in large type,
then the missed approach and the track), the plan view (drawn from `scene_to_primitives`, the
primitives the SVG is written from) beside the side view of the sight picture, the plan view's
legend, wind and weather, the warnings (most severe first) and, at the foot, the CAUTIONS box.

Fonts: the PDF core font Helvetica (Latin-1 only), so the card's text goes through
`printable_text(..., "latin-1")`. Embedding a TTF would cost about 80 ms and 19 KB per card for
characters the Brief never uses (its text is Latin-1; only a user's data file could bring others,
which then print as their unaccented letter or '?').

Sizes: the numbers to fly 14 pt bold, the title 13 pt, section bars 6.8 pt, the small print 6.6 pt
at most. Greyscale only: roles and severities differ by line pattern, weight, hatching, symbol and
word, never by colour. The page never breaks: the small print shrinks (to 5.6 pt at least), then
the plan view and the side view give way; only a page still too full leaves warnings off, with a
line saying how many. The creation date is fixed (the brief's time, else `FIXED_DATE`), so the
same Brief gives the same bytes.

fpdf is imported inside `layout_pdf_bytes` only: the import costs about 0.3 s.
"""

from __future__ import annotations

import datetime as dt
import math
from dataclasses import dataclass, replace
from typing import Any

from briefer.errors import BriefingError
from briefer.render.card_layout import (
    CardLayout,
    Figure,
    Row,
    Section,
    SideView,
    bind_units,
    card_layout,
    printable_text,
)
from briefer.render.scene import ROLE_STYLES, Label, Marker, Polygon, Polyline, Role, Scene
from briefer.render.paper import (
    HATCH_WIDTH_MM,
    MARKER_SIZE_MM,
    CirclePrim,
    LinePrim,
    PolygonPrim,
    TextPrim,
    paper_style,
    scene_to_primitives,
)
from briefer.result import Brief
from briefer.units import NM_TO_FT

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
SCALES = (1.0, 0.95, 0.9, 0.85)
"""Scales of the small print tried in turn until the page fits (6.6 pt down to 5.6 pt)."""
MIN_SCALE = SCALES[-1]
PLAN_MIN_MM = 50.0
"""The plan view is not made smaller than this while the small print can still shrink."""
PLAN_FLOOR_MM = 38.0
SIDE_VIEW_H_MM = 24.0
SIDE_VIEW_STEPS_MM = (SIDE_VIEW_H_MM, 20.0, 16.0)
"""Heights the side view may take when the page is tight, largest first."""
LINE_SPACING = 1.2
RIGHT_COLUMN = 0.5
"""Share of the width taken by the sight picture and the legend, beside the plan view."""

# sizes in points (the small print's at scale 1)
TITLE_PT = 13.0
SUBTITLE_PT = 9.5
HEADER_PT = 6.8
SECTION_PT = 6.8
FIG_LABEL_PT = 5.6
FIG_VALUE_PT = 14.0
FIG_NOTE_PT = 5.6
ROW_PT = 6.6
CAUTION_PT = 6.4
FOOTER_PT = 5.2


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
    """Draws (or, with `draw=False`, only measures) the card's blocks at one scale of small print."""

    def __init__(self, pdf: Any, layout: CardLayout, page_w: float, page_h: float, scale: float,
                 widths: dict[tuple[str, float, str], float] | None = None, side_h: float = SIDE_VIEW_H_MM,
                 extra: tuple[Section, ...] = ()) -> None:
        self.pdf = pdf
        self.layout = layout
        self.page_w, self.page_h = page_w, page_h
        self.s = scale
        self.x0 = MARGIN_MM
        self.w = page_w - 2 * MARGIN_MM
        self.draw = False
        self.plan_h_used = 0.0
        self.side_h = side_h
        self.extra_sections: tuple[Section, ...] = extra
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
        """The largest size up to `size_pt` at which `text` fits `width` on one line."""
        self.font(style, size_pt)
        tw = self.width_of(_t(text))
        if tw <= width or tw == 0:
            return size_pt
        return max(floor_pt, size_pt * width / tw)

    # --- blocks --------------------------------------------------------------------------------

    def header(self, y: float) -> float:
        L = self.layout
        right_w = 40.0
        size = self.fit_size(L.place, "B", TITLE_PT, self.w - right_w, 9.0)
        self.font("B", size)
        self.text_at(self.x0, y, L.place, size)
        self.font("B", HEADER_PT)
        self.text_at(self.x0, y + 0.3, L.title, HEADER_PT, align="R", width=self.w)
        self.font("", HEADER_PT)
        self.text_at(self.x0, y + 0.3 + self.lh(HEADER_PT), L.briefed, HEADER_PT, align="R", width=self.w)
        y += self.lh(TITLE_PT)
        y += self.paragraph(self.x0, y, self.w - right_w, L.approach, "B", SUBTITLE_PT)
        y += self.paragraph(self.x0, y, self.w, f"{L.aircraft}; criteria {L.criteria}", "", HEADER_PT)
        y += 0.6
        if self.draw:
            self.pen(0.6)
            self.pdf.line(self.x0, y, self.x0 + self.w, y)
        return y + 1.0

    def bar(self, x: float, y: float, w: float, title: str, status: str = "", alert: bool = False) -> float:
        """A section title on a light grey bar, the section's status beside it (wrapped); an alert
        is reversed, white on black, and starts with '!!', so it stands out without colour.
        Returns the y below the bar."""
        self.font("B", SECTION_PT)
        title_w = self.width_of(_t(title)) + 3.0
        lines = self.lines(("!! " if alert else "") + status, w - title_w - 1.0) if status else [""]
        lh = self.lh(SECTION_PT)
        h = len(lines) * lh + 0.3
        if self.draw:
            self.pen(fill=0.0 if alert else 0.85)
            self.pdf.rect(x, y, w, h, style="F")
            if alert:
                self.pdf.set_text_color(255)
            self.text_at(x + 1.0, y + 0.25, title, SECTION_PT)
            for i, ln in enumerate(lines):
                self.text_at(x + title_w, y + 0.25 + i * lh, ln, SECTION_PT)
            self.pdf.set_text_color(0)
        return y + h + 0.6

    def figures(self, y: float, figures: tuple[Figure, ...]) -> float:
        """The numbers to fly in large type, four to a row, each boxed: label, value, note."""
        cw = self.w / FIGURES_PER_ROW
        ch = self.lh(FIG_LABEL_PT) + self.lh(FIG_VALUE_PT) * 0.92 + self.lh(FIG_NOTE_PT) + 0.3
        for start in range(0, len(figures), FIGURES_PER_ROW):
            for i, f in enumerate(figures[start:start + FIGURES_PER_ROW]):
                x = self.x0 + i * cw
                if not self.draw:
                    continue
                self.pen(0.25)
                self.pdf.rect(x, y, cw, ch, style="D")
                self.font("B", FIG_LABEL_PT)
                self.text_at(x + 1.0, y + 0.3, f.label, FIG_LABEL_PT)
                vs = self.fit_size(f.value, "B", FIG_VALUE_PT, cw - 2.0, 8.0)
                self.font("B", vs)
                self.text_at(x + 0.8, y + self.lh(FIG_LABEL_PT) + (self.lh(FIG_VALUE_PT) - self.lh(vs)) / 2 - 0.4,
                             f.value, vs)
                ns = self.fit_size(f.note, "", FIG_NOTE_PT, cw - 2.0, 4.5)
                self.font("", ns)
                self.text_at(x + 1.0, y + ch - self.lh(FIG_NOTE_PT) - 0.1, f.note, ns)
            y += ch
        return y + 0.8

    def rows(self, y: float, rows: tuple[Row, ...], x: float | None = None, width: float | None = None,
             label_w: float = 15.0, size: float | None = None, sample_rows: tuple[int, ...] = ()) -> float:
        """Labelled lines of small print; returns the y below them."""
        x = self.x0 if x is None else x
        width = self.w if width is None else width
        size = (ROW_PT * self.s) if size is None else size
        lh = self.lh(size)
        for i, r in enumerate(rows):
            self.font("", size)
            lines = self.lines(r.text, width - label_w)
            if self.draw:
                lx = x
                if i in sample_rows:    # a sample of the side view's line before the label
                    self.pen(0.5, 0.0) if i == 0 else self.pen(0.4, 0.3, dash=(0.9, 0.6))
                    self.pdf.line(x, y + lh * 0.55, x + 3.0, y + lh * 0.55)
                    lx = x + 3.6
                self.font("B", size)
                self.text_at(lx, y, r.label, size)
                self.font("", size)
                for i, ln in enumerate(lines):
                    self.text_at(x + label_w, y + i * lh, ln, size)
            y += len(lines) * lh
        return y + 0.6

    def section(self, y: float, sec: Section) -> float:
        y = self.bar(self.x0, y, self.w, sec.title, sec.status, sec.alert)
        if sec.figures:
            y = self.figures(y, sec.figures)
        return self.rows(y, sec.rows)

    # --- the drawings --------------------------------------------------------------------------

    def right_column_w(self) -> float:
        return self.w * RIGHT_COLUMN

    def right_column(self, y: float) -> float:
        """The side view of the sight picture and the comparison in words."""
        sv = self.layout.side_view
        w = self.right_column_w()
        x = self.x0 + self.w - w
        y = self.bar(x, y, w, "SIGHT PICTURE, abeam the threshold")
        if self.draw:
            self.side_view(sv, (x, y, w, self.side_h))
        y += self.side_h + 0.8
        label_w = 15.0
        return self.rows(y, self.layout.side_view.rows, x=x, width=w, label_w=label_w, sample_rows=(0, 1))

    def legend(self, x: float, y: float, w: float, size: float, columns: int = 4) -> float:
        """One entry per role on the plan view, with a sample drawn in that role's pen."""
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
        return y + per_col * lh + 0.6

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

    def plan_view(self, box: tuple[float, float, float, float]) -> None:
        prims = _place_labels(self, scene_to_primitives(self.layout.plan_view, box))
        x, y, w, h = box
        # local_context around the clip: the PDF's state returns to the outside one at the end of
        # the clip, and so must fpdf's record of it (pen and font)
        with self.pdf.local_context(), self.pdf.rect_clip(x, y, w, h):
            for p in prims:
                self.primitive(p)
        self._font = None

    def side_view(self, sv: SideView, box: tuple[float, float, float, float]) -> None:
        """Abeam the threshold, looking along the runway: the runway at the left, the aircraft at
        circling height to the right, the sight lines to the runway (heights exaggerated)."""
        pdf = self.pdf
        x, y, w, h = box
        pl, pr, pt, pb = 3.0, 3.0, 3.0, 4.0
        planned = math.isfinite(sv.planned_offset_nm)       # no plan: no planned sight line
        d_max = max([sv.familiar_offset_nm, sv.familiar_offset_at_circling_nm, 0.1]
                    + ([sv.planned_offset_nm] if planned else [])) * 1.1
        h_max = max(sv.circling_height_ft, sv.familiar_height_ft, 1.0) * 1.1
        sx = (w - pl - pr) / d_max            # mm per NM
        sy = (h - pt - pb) / h_max            # mm per ft
        xg, yg = x + pl, y + h - pb

        def at(d_nm: float, h_ft: float) -> tuple[float, float]:
            return (xg + d_nm * sx, yg - h_ft * sy)

        self.pen(0.2)
        pdf.rect(x, y, w, h, style="D")
        size = 5.6
        self.pen(0.35, fill=0.0)
        pdf.line(x, yg, x + w, yg)                                  # the ground
        pdf.rect(xg - 1.2, yg - 0.7, 2.4, 0.7, style="F")           # the runway, end on
        self.font("", size)
        self.text_at(xg - 1.5, yg + 0.4, "RWY", size)
        hc = sv.circling_height_ft
        self.pen(0.2, 0.4, dash=(0.1, 0.8))
        with pdf.local_context(stroke_cap_style="ROUND"):
            pdf.line(xg, at(0, hc)[1], x + w - 1, at(0, hc)[1])     # circling height (dotted)
        self.text_at(xg + 3.0, at(0, hc)[1] - self.lh(size) - 0.2, f"{hc:.0f} ft", size)
        p = at(sv.planned_offset_nm if planned else 0.0, hc)
        t = at(sv.familiar_offset_at_circling_nm, hc)
        u = at(sv.familiar_offset_nm, sv.familiar_height_ft)
        far = u if sv.familiar_offset_nm >= sv.familiar_offset_at_circling_nm else t
        self.pen(0.4, 0.3, dash=(1.2, 0.8))
        pdf.line(xg, yg, far[0], far[1])                            # the usual picture's sight line
        if planned:
            self.pen(0.5)
            pdf.line(xg, yg, p[0], p[1])                            # the planned sight line
            self.pen(0.3, fill=0.0)
            pdf.circle(p[0], p[1], 0.9, style="DF")                 # you, as planned
        self.pen(0.3, fill=1.0)
        pdf.circle(t[0], t[1], 0.9, style="DF")                     # the trap
        pdf.rect(u[0] - 0.8, u[1] - 0.8, 1.6, 1.6, style="DF")      # the usual pattern
        self.font("", size)
        plan_w, trap_w = self.width_of("plan"), self.width_of("trap")
        if planned:
            self.text_at(p[0] - plan_w / 2, p[1] + 1.2, "plan", size)
        trap_x = t[0] - trap_w / 2
        # under its point unless that runs into "plan"; then above the circling height
        trap_y = t[1] + 1.2 if trap_x + trap_w + 0.8 < p[0] - plan_w / 2 else t[1] - 1.2 - self.lh(size)
        self.text_at(trap_x, trap_y, "trap", size)
        lab = f"usual {sv.familiar_height_ft:.0f} ft"
        self.font("", size)
        tw = self.width_of(lab)
        self.text_at(max(x + 1.0, u[0] - tw - 1.5), u[1] - self.lh(size) / 2, lab, size)
        exaggeration = sy / (sx / NM_TO_FT)
        self.text_at(x, y + h - self.lh(size) - 0.3, f"heights x{exaggeration:.0f}", size, align="R", width=w - 1.0)

    def warnings(self, y: float, limit: int | None = None) -> float:
        """The findings, most severe first: DANGER reversed (white on black), WARNING boxed,
        NOTE plain, each with its symbol, so that no colour is needed."""
        y = self.bar(self.x0, y, self.w, "WARNINGS, most severe first")
        size = ROW_PT * max(self.s, 0.9)
        lh = self.lh(size)
        tag_w = 14.0
        if not self.layout.warnings:
            return y + self.paragraph(self.x0, y, self.w, "No warnings.", "", size) + 0.4
        items = self.layout.warnings if limit is None else self.layout.warnings[:limit]
        for wl in items:
            self.font("", size)
            lines = self.lines(wl.text, self.w - tag_w)
            if self.draw:
                tag, ts = f"{wl.mark} {wl.word}", size * 0.9
                self.font("B", ts)
                box = (self.x0, y + 0.15, tag_w - 1.5, lh - 0.1)
                if wl.severity == "danger":
                    self.pen(fill=0.0)
                    self.pdf.rect(*box, style="F")
                    self.pdf.set_text_color(255)
                elif wl.severity == "warning":
                    self.pen(0.3)
                    self.pdf.rect(*box, style="D")
                self.text_at(self.x0 + 0.6, y + 0.15 + (lh - self.lh(ts)) / 2, tag, ts)
                self.pdf.set_text_color(0)
                self.font("", size)
                for i, ln in enumerate(lines):
                    self.text_at(self.x0 + tag_w, y + i * lh, ln, size)
            y += len(lines) * lh + 0.35
        if limit is not None and limit < len(self.layout.warnings):
            more = len(self.layout.warnings) - limit
            y += self.paragraph(self.x0 + tag_w, y, self.w - tag_w,
                                f"... and {more} more not shown here: see the brief on screen.", "B", size)
        return y + 0.4

    def cautions(self, y: float) -> float:
        """The CAUTIONS box: heavy border, light grey ground; returns its height."""
        size = CAUTION_PT * max(self.s, 0.92)
        lh = self.lh(size)
        pad = 1.2
        bullet = 2.2
        inner = self.w - 2 * pad - bullet
        self.font("", size)
        blocks = [self.lines(c, inner) for c in self.layout.cautions]
        h = pad + self.lh(SECTION_PT) + sum(len(b) for b in blocks) * lh + pad - 0.4
        if not self.draw:
            return h
        self.pen(0.7, fill=0.93)
        self.pdf.rect(self.x0, y, self.w, h, style="DF")
        self.font("B", SECTION_PT)
        self.text_at(self.x0 + pad, y + pad - 0.2, "CAUTIONS", SECTION_PT)
        yy = y + pad + self.lh(SECTION_PT) - 0.2
        self.font("", size)
        for b in blocks:
            self.text_at(self.x0 + pad, yy, "-", size)
            for i, ln in enumerate(b):
                self.text_at(self.x0 + pad + bullet, yy + i * lh, ln, size)
            yy += len(b) * lh
        return h

    def footer_height(self) -> float:
        return self.lh(FOOTER_PT) + 0.6

    def footer(self) -> None:
        if not self.draw:
            return
        y = self.page_h - MARGIN_MM - self.lh(FOOTER_PT) + 1.0
        self.font("", FOOTER_PT)
        self.text_at(self.x0, y, self.layout.footer, FOOTER_PT)

    # --- the page ------------------------------------------------------------------------------

    def cautions_top(self) -> float:
        draw, self.draw = self.draw, False
        try:
            return self.page_h - MARGIN_MM - self.footer_height() - self.cautions(0.0)
        finally:
            self.draw = draw

    def run(self, plan_h: float, warn_limit: int | None = None) -> float:
        """Lay the page out from the top (the plan view at least `plan_h` tall); returns the bottom
        of the content above the cautions."""
        y = self.header(MARGIN_MM)
        y = self.section(y, self.layout.minimums)
        y = self.section(y, self.layout.plan)
        top = y
        h = max(plan_h, self.right_column(top) - top)
        self.plan_h_used = h
        if self.draw:
            self.plan_view((self.x0, top, self.w - self.right_column_w() - GAP_MM, h))
        y = self.legend(self.x0, top + h + 0.4, self.w, ROW_PT * self.s)
        y = self.section(y, self.layout.wind)
        y = self.warnings(y, warn_limit)
        for sec in self.extra_sections:
            y = self.section(y, sec)
        return y


Box = tuple[float, float, float, float]   # x0, y0, x1, y1 in page mm


def _text_box(p: Any, width: float) -> Box:
    """The page box a TextPrim covers (from its anchor and baseline)."""
    x = p.point_mm[0] - {"start": 0.0, "middle": width / 2, "end": width}[p.anchor]
    return (x, p.point_mm[1] - p.size_mm * 0.74, x + width, p.point_mm[1] + p.size_mm * 0.18)


def _overlap(a: Box, b: Box) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _place_labels(card: CardPainter, prims: list[Any]) -> list[Any]:
    """Move the plan view's text off the drawing's key lines and off other text.

    A runway designator goes just beyond its runway's end, along the runway (not on the runway,
    where it would hide it); a marker's label tries up-right, up-left, down-right, down-left of
    the marker. The first place free of the text already placed wins; if none is, the first.
    The geometry itself is `scene_to_primitives`'s; only where the words sit changes.
    """
    scene, pdf = card.layout.plan_view, card.pdf
    ends: list[tuple[tuple[float, float], tuple[float, float]]] = []
    for p in prims:
        if isinstance(p, LinePrim) and p.style == Role.RUNWAY.value and len(p.points_mm) == 2:
            a, b = p.points_mm
            ends += [(a, b), (b, a)]
    placed: list[Box] = []
    out = []
    for p in prims:
        if not (isinstance(p, TextPrim) and p.item is not None):
            out.append(p)
            continue
        item = scene.items[p.item]
        card.font("", p.size_mm * pdf.k)
        tw = card.width_of(_t(p.text))
        size = p.size_mm
        candidates = [p]
        if isinstance(item, Label):
            x, y = p.point_mm[0], p.point_mm[1] - size * 0.35      # the point the label is centred on
            for (ex, ey), (ox, oy) in ends:
                length = math.hypot(ex - ox, ey - oy)
                if length > 0 and math.hypot(ex - x, ey - y) < 0.3:
                    ux, uy = (ex - ox) / length, (ey - oy) / length
                    reach = 1.0 + min(tw / 2 / max(abs(ux), 1e-9), size * 0.4 / max(abs(uy), 1e-9))
                    candidates = [replace(p, point_mm=(ex + ux * r + px * side, ey + uy * r + py * side + size * 0.35))
                                  for r, px, py, side in ((reach, 0, 0, 0), (reach + size, 0, 0, 0),
                                                          (reach, -uy, ux, size), (reach, uy, -ux, size))]
                    break
        elif isinstance(item, Marker):
            # the marker's centre (scene_to_primitives puts its label up and to the right of it)
            mx, my = p.point_mm[0] - MARKER_SIZE_MM * 0.7, p.point_mm[1] + MARKER_SIZE_MM * 0.3
            dx, up, down = MARKER_SIZE_MM * 0.7, -MARKER_SIZE_MM * 0.3, MARKER_SIZE_MM * 0.3 + size * 0.8
            candidates = [replace(p, point_mm=(mx + dx, my + up)),
                          replace(p, point_mm=(mx - dx, my + up), anchor="end"),
                          replace(p, point_mm=(mx + dx, my + down)),
                          replace(p, point_mm=(mx - dx, my + down), anchor="end")]
        choice = next((c for c in candidates if not any(_overlap(_text_box(c, tw), q) for q in placed)),
                      candidates[0])
        placed.append(_text_box(choice, tw))
        out.append(choice)
    return out


def _spare(card: CardPainter, plan_h: float, warn_limit: int | None = None) -> tuple[float, float]:
    """(millimetres left over, negative for an overflow; the plan view's height) with this
    least plan height and these warnings."""
    draw, card.draw = card.draw, False
    try:
        return card.cautions_top() - GAP_MM - card.run(plan_h, warn_limit), card.plan_h_used
    finally:
        card.draw = draw


@dataclass(frozen=True, slots=True)
class _Fit:
    """How the page is filled: scale of the small print, least plan-view height [mm], side-view
    height [mm], and how many warnings are shown (None: all)."""

    scale: float
    plan_h: float
    side_h: float = SIDE_VIEW_H_MM
    limit: int | None = None


def _fit(pdf: Any, layout: CardLayout, page_w: float, page_h: float,
         widths: dict[tuple[str, float, str], float], extra: tuple[Section, ...] = ()) -> _Fit:
    """The largest print and plan view that fit. At the smallest print the plan view gives way to
    its floor, then the side view shrinks; only then are warnings left off (a line says how many)."""
    def card(scale: float, side_h: float = SIDE_VIEW_H_MM) -> CardPainter:
        return CardPainter(pdf, layout, page_w, page_h, scale, widths, side_h=side_h, extra=extra)

    for sc in SCALES:
        c = card(sc)
        spare, used = _spare(c, PLAN_MIN_MM)
        if spare >= 0:
            return _Fit(sc, min(used + spare, c.w * (1 - RIGHT_COLUMN)))
    for side_h in SIDE_VIEW_STEPS_MM:
        c = card(MIN_SCALE, side_h)
        spare, used = _spare(c, PLAN_FLOOR_MM)
        if spare >= 0:
            return _Fit(MIN_SCALE, used + spare, side_h)
    for lim in range(len(layout.warnings) - 1, -1, -1):
        spare, used = _spare(c, PLAN_FLOOR_MM, lim)
        if spare >= 0:
            return _Fit(MIN_SCALE, used + spare, SIDE_VIEW_STEPS_MM[-1], lim)
    return _Fit(MIN_SCALE, PLAN_FLOOR_MM, SIDE_VIEW_STEPS_MM[-1], 0)


def draw_card_page(pdf: Any, layout: CardLayout, *, extra: tuple[Section, ...] = (),
                   widths: dict[tuple[str, float, str], float] | None = None) -> None:
    """Fit and draw the card on the current page of `pdf` (an fpdf2 FPDF in millimetres, a page
    added; the page's own size is used).

    Args:
        pdf: The document (e.g. a deck that prints several cards).
        layout: What to print.
        extra: Sections printed after the warnings in the card's style (the page is fitted with
            them, so they never push the cautions off the page).
        widths: A text-width cache to share between pages.
    """
    widths = {} if widths is None else widths
    page_w, page_h = pdf.w, pdf.h
    fit = _fit(pdf, layout, page_w, page_h, widths, extra)
    card = CardPainter(pdf, layout, page_w, page_h, fit.scale, widths, side_h=fit.side_h, extra=extra)
    card.draw = True
    pdf.set_text_color(0)
    pdf.set_draw_color(0)
    card.run(fit.plan_h, fit.limit)
    card.cautions(card.cautions_top())
    card.footer()


def layout_pdf_bytes(layout: CardLayout, *, page: str = "half-letter") -> bytes:
    """The one-page PDF card of a layout (see the module docstring)."""
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
    draw_card_page(pdf, layout)
    return bytes(pdf.output())


def card_pdf_bytes(brief: Brief, *, page: str = "half-letter") -> bytes:
    """The one-page PDF kneeboard card of a Brief (half-letter or A5, portrait)."""
    return layout_pdf_bytes(card_layout(brief), page=page)


__all__ = ["FIXED_DATE", "PAGE_SIZES_MM", "card_pdf_bytes", "creation_date", "draw_card_page", "layout_pdf_bytes",
           "page_size_mm"]
