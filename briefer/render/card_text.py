"""The kneeboard card as plain text: 80 columns, ASCII plus the degree sign, for any printer.

Everything comes from the `CardLayout` the PDF card also draws; the plan view is the ASCII
canvas (`render_plan(..., ascii=True)`), so the text card needs no braille or box-drawing glyph.
The degree sign is the one character outside ASCII (written as UTF-8): headings and angles read
far better with it, and every printer path that takes UTF-8 text prints it.
"""

from __future__ import annotations

import textwrap

from briefer.display_units import DEFAULT_UNITS
from briefer.render.card_layout import (
    NBSP,
    CardLayout,
    Figure,
    Row,
    Section,
    SideView,
    bind_units,
    card_layout,
    printable_text,
)
from briefer.render.planview import legend, render_plan
from briefer.render.scene import ROLE_STYLES, Role
from briefer.render.side_scene import LEGEND as SIDE_LEGEND, render_side
from briefer.result import Brief

WIDTH = 80
"""Columns of the text card."""
PLAN_COLS, PLAN_ROWS = 78, 30
"""Size of the ASCII plan view (a character cell is about twice as tall as wide)."""
SIDE_COLS, SIDE_ROWS = 78, 9
"""Size of the ASCII side view of the sight picture."""
LABEL_COLS = 13
FIGURES_PER_ROW = 4
CELL = (WIDTH - 2 - FIGURES_PER_ROW - 1) // FIGURES_PER_ROW   # 18 columns inside each figure box


def _t(text: str) -> str:
    return printable_text(text, "ascii+degree")


def _wrap(text: str, width: int) -> list[str]:
    """Wrapped at spaces (never between a number and its unit)."""
    lines = textwrap.wrap(bind_units(_t(text)), width, break_long_words=True, break_on_hyphens=False)
    return [ln.replace(NBSP, " ") for ln in lines] or [""]


def _rule(title: str) -> str:
    head = f"== {title} "
    return head + "=" * (WIDTH - len(head))


def _rows(rows: tuple[Row, ...], indent: int = 2) -> list[str]:
    """Labelled rows; the label column widens to the longest label (never cut: 'Circling only')."""
    out = []
    cols = max([LABEL_COLS] + [len(_t(r.label)) + 1 for r in rows])
    body = WIDTH - indent - cols
    for r in rows:
        lines = _wrap(r.text, body)
        out.append(" " * indent + f"{_t(r.label):<{cols - 1}} " + lines[0])
        out += [" " * (indent + cols) + ln for ln in lines[1:]]
    return out


def _figures(figures: tuple[Figure, ...]) -> list[str]:
    """Boxes, four to a row: the label, the value (set off by blank lines, as large as plain text
    gets), then the note wrapped."""
    border = " +" + ("-" * CELL + "+") * FIGURES_PER_ROW
    out: list[str] = [border]
    for start in range(0, len(figures), FIGURES_PER_ROW):
        group = list(figures[start:start + FIGURES_PER_ROW])
        group += [Figure(label="", value="", note="")] * (FIGURES_PER_ROW - len(group))
        cells = [[_t(f.label), "", "  " + _t(f.value), ""] + (_wrap(f.note, CELL - 2) if f.note else [])
                 for f in group]
        height = max(len(c) for c in cells)
        for i in range(height):
            out.append(" |" + "|".join(f" {(c[i] if i < len(c) else ''):<{CELL - 1}.{CELL - 1}}" for c in cells) + "|")
        out.append(border)
    return out


def _section(sec: Section) -> list[str]:
    out = [_rule(sec.title)]
    if sec.status:
        prefix = "!! " if sec.alert else ""
        out += ["  " + ln for ln in _wrap(prefix + sec.status, WIDTH - 2)]
    if sec.figures:
        out += _figures(sec.figures)
    out += _rows(sec.rows)
    return out


def _side_view(sv: SideView) -> list[str]:
    """The side view drawn in ASCII (the Scene the app and the PDF draw), then the comparison."""
    canvas = render_side(sv.picture, SIDE_COLS, SIDE_ROWS, ascii=True)
    key = "  ".join(f"{ROLE_STYLES[role].ascii_glyph * 3} {text}" for role, text in SIDE_LEGEND.items()
                    if role is not Role.PLANNED_TRACK or sv.picture.planned)
    return ([_rule("SIGHT PICTURE, abeam the threshold")] + [" " + ln.rstrip() for ln in canvas.to_lines()]
            + ["  " + key] + _rows(sv.rows))


def _plan_view(layout: CardLayout) -> list[str]:
    out = [_rule("PLAN VIEW (north up)")]
    canvas = render_plan(layout.plan_view, PLAN_COLS, PLAN_ROWS, ascii=True)
    out += [" " + ln.rstrip() for ln in canvas.to_lines()]
    samples = {e.role: e.sample for e in legend(layout.plan_view, ascii=True)}
    items = [f"{samples.get(ln.role, '   ')} {_t(ln.text)}" for ln in layout.legend]
    half = (len(items) + 1) // 2
    col = (WIDTH - 2) // 2
    for left, right in zip(items[:half], items[half:] + [""]):
        out.append(("  " + f"{left:<{col}.{col}}" + right[:col]).rstrip())
    if canvas.dropped_labels:
        out += _wrap("  Labels left off the drawing (no room): " + ", ".join(canvas.dropped_labels) + ".", WIDTH)
    return out


def _warnings(layout: CardLayout) -> list[str]:
    out = [_rule("WARNINGS (most severe first)")]
    if not layout.warnings:
        return out + ["  No warnings."]
    for w in layout.warnings:
        head = f"{w.mark:<2} {w.word:<8} "
        lines = _wrap(w.text, WIDTH - len(head))
        out.append(head + lines[0])
        out += [" " * len(head) + ln for ln in lines[1:]]
    return out


def _cautions(layout: CardLayout) -> list[str]:
    inner = WIDTH - 4
    top = "+-- CAUTIONS "
    out = [top + "-" * (WIDTH - len(top) - 1) + "+"]
    for c in layout.cautions:
        lines = _wrap(c, inner - 2)
        out.append(f"| - {lines[0]:<{inner - 2}} |")
        out += [f"|   {ln:<{inner - 2}} |" for ln in lines[1:]]
    out.append("+" + "-" * (WIDTH - 2) + "+")
    return out


def layout_text(layout: CardLayout) -> str:
    """The text card of a layout (every line at most 80 columns, ending in a newline)."""
    title = f"{layout.title}  {layout.place}"
    when = layout.briefed
    first = title + " " * max(1, WIDTH - len(title) - len(when)) + when
    lines = _wrap(first, WIDTH) if len(first) > WIDTH else [_t(first)]
    lines += _wrap(layout.approach, WIDTH)
    lines += _wrap(f"{layout.aircraft}; criteria {layout.criteria}", WIDTH)
    for block in (_section(layout.minimums), _section(layout.plan), _plan_view(layout),
                  _side_view(layout.side_view), _section(layout.wind), _warnings(layout), _cautions(layout)):
        lines += ["", *block]         # a blank line before each block, in reading order
    lines += _wrap(layout.footer, WIDTH)
    return "\n".join(ln.rstrip() for ln in lines) + "\n"


def card_text(brief: Brief, units: str = DEFAULT_UNITS) -> str:
    """The text card of a Brief (80 columns, ASCII plus °) in the display units `units`."""
    return layout_text(card_layout(brief, units))


__all__ = ["WIDTH", "card_text", "layout_text"]
