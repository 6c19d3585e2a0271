"""Draw a plan-view `Scene` on a terminal canvas (braille, or ASCII where braille cannot show).

`render_plan(scene, cols, rows)` gives a canvas that is a Rich renderable (for the app, via
`Static.update`) and gives plain lines (`to_text()`) for the text card. The north arrow sits in
the top-right corner and a scale bar in nautical miles in the bottom-left corner.
"""

from __future__ import annotations

import math
import os
from collections.abc import Mapping
from briefer._dataclass import dataclass

from briefer.render.canvas import _EMPTY, _FILL, ROLE_DASH, AsciiCanvas, BrailleCanvas, Canvas
from briefer.render.labels import SOFT_ROLES, LabelSpec, label_priority, place, runway_axis
from briefer.render.scene import (
    GENERIC_DASH_DOTS,
    ROLE_STYLES,
    SYMBOLS,
    Circle,
    Label,
    Marker,
    Polygon,
    Polyline,
    Role,
    Scene,
    Viewport,
    format_nm,
    north_arrow,
    scale_bar_nm,
)
from briefer.units import NM_TO_M

NO_BRAILLE_TERMS = frozenset({"linux", "dumb", "vt52", "vt100", "vt102", "vt220", "vt320", "cons25",
                              "ansi", "xterm-mono"})
"""TERM values whose consoles have no braille glyphs (the Linux console fonts have none)."""

_TRUE = frozenset({"1", "true", "yes", "on"})


def braille_supported(env: Mapping[str, str] | None = None) -> bool:
    """Whether to draw the plan view in braille (else ASCII).

    `BRIEFER_ASCII=1` (or true/yes/on) forces ASCII. Otherwise the terminal type decides: the
    Linux console, the VT family and `dumb` get ASCII; any other terminal gets braille.

    Args:
        env: The environment to read; `os.environ` if None.
    """
    env = os.environ if env is None else env
    if env.get("BRIEFER_ASCII", "").strip().lower() in _TRUE:
        return False
    term = env.get("TERM", "").strip().lower()
    base = term.split("-", 1)[0] if term.startswith(("linux", "vt")) else term
    return base not in NO_BRAILLE_TERMS and term not in NO_BRAILLE_TERMS


def render_plan(scene: Scene, cols: int, rows: int, *, ascii: bool = False) -> Canvas:
    """A canvas of `cols` x `rows` cells with the scene drawn on it."""
    canvas: Canvas = AsciiCanvas(cols, rows) if ascii else BrailleCanvas(cols, rows)
    draw_scene(canvas, scene)
    return canvas


def draw_scene(canvas: Canvas, scene: Scene, *, viewport: Viewport | None = None,
               decorations: bool = True) -> Viewport:
    """Draw every item by layer (area, sectors, obstacles, tracks, runway last), then labels.

    Args:
        canvas: A `BrailleCanvas` or `AsciiCanvas`.
        scene: What to draw.
        viewport: World-to-dot mapping; None fits the scene to the canvas.
        decorations: Draw the north arrow and the scale bar.

    Returns:
        The viewport used.
    """
    vp = viewport or canvas.fit(scene)
    labels: list = []
    for index, item in scene.by_layer():
        role = item.role
        if isinstance(item, Polyline):
            pts = vp.points_to_view(item.points)
            dash = _dashed(canvas, role) if item.dashed else ROLE_DASH
            canvas.polyline(pts, role, closed=item.closed, dash=dash)
        elif isinstance(item, Circle):
            cx, cy = vp.to_view(*item.centre)
            canvas.circle(cx, cy, item.radius_m * vp.units_per_m, role)
        elif isinstance(item, Polygon):
            canvas.polygon(vp.points_to_view(item.points), role, fill=item.filled)
        elif isinstance(item, Marker):
            x, y = vp.to_view(*item.point)
            canvas.glyph(x, y, SYMBOLS[item.symbol or "cross"], role)
            if item.label:
                labels.append((index, item, x, y))
        elif isinstance(item, Label):
            x, y = vp.to_view(*item.point)
            labels.append((index, item, x, y))
    if decorations:
        _decorate(canvas, scene, vp)   # before the words, so that no label lands on the key
    _place_labels(canvas, scene, vp, labels)   # text last, so that lines never cut a label
    return vp


def _dashed(canvas: Canvas, role: Role) -> tuple[int, int]:
    """The pattern of an item drawn `dashed`: the role's own if it has one, else a generic dash
    (every other cell in ASCII)."""
    own = ROLE_STYLES[role].braille_dash
    if isinstance(canvas, AsciiCanvas):
        return (1, 1)
    return own or GENERIC_DASH_DOTS


def _place_labels(canvas: Canvas, scene: Scene, vp: Viewport, labels: list) -> None:
    """Write the labels where `briefer.render.labels.place` finds room, in whole cells; records
    the boxes placed (`canvas.label_boxes`: (col, row, length)) and the labels left off
    (`canvas.dropped_labels`)."""
    dx, dy = canvas.dots_per_cell

    def to_cells(x: float, y: float) -> tuple[float, float]:
        return ((x + 0.5) / dx, (y + 0.5) / dy)

    def world_to_cells(x: float, y: float) -> tuple[float, float]:
        return to_cells(*vp.to_view(x, y))

    specs = []
    for index, item, x, y in labels:
        text = item.label if isinstance(item, Marker) else item.text
        if isinstance(item, Marker):
            col, row = canvas.cell_of(x, y)
            anchor, axis = (col + 0.5, row + 0.5), None
        else:
            anchor, axis = to_cells(x, y), runway_axis(scene, item.point, world_to_cells)
        specs.append(LabelSpec(text=text, anchor=anchor, width=len(text), height=1.0, gap_x=0.5, gap_y=0.5,
                               priority=label_priority(item), axis=axis, item=index))
    prio, roles, cols = canvas._prio, canvas._role, canvas.cols

    def is_free(box: tuple[float, float, float, float], strict: bool) -> bool:
        c0, r, c1 = round(box[0]), round(box[1]), round(box[2])
        for c in range(r * cols + c0, r * cols + c1):
            if prio[c] == _EMPTY:
                continue
            if strict or (prio[c] != _FILL and roles[c] not in SOFT_ROLES):
                return False
        return True

    def snap(box: tuple[float, float, float, float]) -> tuple[float, float, float, float]:
        c, r = math.floor(box[0] + 0.5), math.floor(box[1] + 0.5)
        return (c, r, c + round(box[2] - box[0]), r + 1)

    spots = place(specs, is_free, (0, 0, canvas.cols, canvas.rows), snap=snap)
    canvas.label_boxes = []
    canvas.dropped_labels = []
    for spec, spot in zip(specs, spots):
        if spot is None:
            canvas.dropped_labels.append(spec.text)
            continue
        role = scene.items[spec.item].role
        canvas.text(int(spot[0]), int(spot[1]), spec.text, role)
        canvas.label_boxes.append((int(spot[0]), int(spot[1]), len(spec.text)))


def _decorate(canvas: Canvas, scene: Scene, vp: Viewport) -> None:
    ascii_only = isinstance(canvas, AsciiCanvas)
    arrow = north_arrow(scene.up_deg_true).text(ascii=ascii_only) if scene.north_arrow else ""
    key = (scene.key_note + " " + arrow).strip()
    if key:
        canvas.text(max(0, canvas.cols - len(key)), 0, key, Role.ANNOTATION)
    bar = scale_bar_text(vp, canvas, scene.scale_hint_nm)
    if bar:
        canvas.text(0, canvas.rows - 1, bar, Role.ANNOTATION)


def scale_bar_text(vp: Viewport, canvas: Canvas, length_nm: float | None = None) -> str:
    """The scale bar as text, e.g. '├───┤ 1 NM' (or '|---| 1 NM' in ASCII); '' if it cannot fit.

    The bar's characters span the chosen length to within half a cell.
    """
    dots_x = canvas.dots_per_cell[0]
    metres_per_cell = vp.metres_per_unit * dots_x
    if length_nm is None:
        length_nm = scale_bar_nm(canvas.cols * metres_per_cell)
    n = round(length_nm * NM_TO_M / metres_per_cell)
    label = " " + format_nm(length_nm)
    if n < 2 or n + len(label) > canvas.cols:
        return ""
    if isinstance(canvas, AsciiCanvas):
        return "|" + "-" * (n - 2) + "|" + label
    return "├" + "─" * (n - 2) + "┤" + label


@dataclass(frozen=True, slots=True)
class LegendEntry:
    """One legend line: a sample of how the role looks on this canvas, and what it means."""

    role: Role
    sample: str
    text: str


def legend(scene: Scene, *, ascii: bool = False) -> tuple[LegendEntry, ...]:
    """Legend entries for the roles present in a scene (annotations excluded), in layer order.

    The sample is drawn by the same canvas code, so it shows the role's real pattern.
    """
    out = []
    for role in scene.roles():
        if role is Role.ANNOTATION:
            continue
        rs = ROLE_STYLES[role]
        canvas: Canvas = AsciiCanvas(3, 1) if ascii else BrailleCanvas(3, 1)
        if rs.marker_symbol is not None:
            canvas.glyph(1 * canvas.dots_per_cell[0], 0, SYMBOLS[rs.marker_symbol], role)
        elif rs.ascii_fill is not None:
            canvas.polygon([(0, 0), (canvas.w - 1, 0), (canvas.w - 1, canvas.h - 1), (0, canvas.h - 1)],
                           role, fill=True, hatch_spacing=3.0)
        else:
            y = 0 if ascii else 1
            canvas.line(0, y, canvas.w - 1, y, role)
        out.append(LegendEntry(role=role, sample=canvas.to_lines()[0], text=rs.description))
    return tuple(out)
