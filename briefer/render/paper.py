"""The plan view (and the side view of the sight picture) on paper: millimetre primitives for
fpdf2's drawing API.

`scene_to_primitives(scene, box_mm)` transforms a `Scene` into lines, circles, polygons and text
in page millimetres (x right, y down, as fpdf2 uses), each with a style name (the role's value;
look its pen up with `paper_style`). The PDF card and the instructor's deck pages draw them.

The drawing is legible in black and white: roles differ by dash pattern, stroke width, grey
level, hatching and marker symbol.

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

from collections.abc import Sequence
from math import cos, radians, sin
from briefer._dataclass import dataclass
from typing import Literal, Union
from xml.sax.saxutils import escape, quoteattr

from briefer.render.scene import (
    GENERIC_DASH_MM,
    ROLE_STYLES,
    Circle,
    Label,
    Marker,
    PaperStyle,
    Point,
    Polygon,
    Polyline,
    Role,
    Scene,
    Viewport,
    format_nm,
    hatch_segments,
    north_arrow,
    scale_bar_nm,
)
from briefer.units import NM_TO_M

MARKER_SIZE_MM = 2.2
"""Width of a marker symbol."""
LABEL_SIZE_MM = 2.6
"""Height of label text (font size in millimetres, 7.4 pt; a PDF font size in points is
`size * pdf.k` when the FPDF unit is mm). Never under 7 pt (2.47 mm) on a kneeboard."""
HATCH_WIDTH_MM = 0.15
"""Width of the hatch lines inside a filled polygon."""
MARGIN_MM = 3.0
"""Space kept free inside the box around the drawing."""
KEY_STRIP_MM = 5.5
"""The band at the foot of the frame that holds the scale bar and the north arrow, below the
drawing (so that nothing drawn runs under them)."""

Anchor = Literal["start", "middle", "end"]


@dataclass(frozen=True, slots=True)
class LinePrim:
    """A polyline in page millimetres (`closed` joins the last point to the first)."""

    points_mm: tuple[Point, ...]
    style: str
    closed: bool = False
    dash_mm: tuple[float, float] | None = None
    item: int | None = None


@dataclass(frozen=True, slots=True)
class CirclePrim:
    """A circle by its centre (fpdf2 >= 2.8.1 `circle(x, y, r)` also takes the centre)."""

    centre_mm: Point
    radius_mm: float
    style: str
    filled: bool = False
    dash_mm: tuple[float, float] | None = None
    item: int | None = None


@dataclass(frozen=True, slots=True)
class PolygonPrim:
    """A closed polygon; if `filled`, fill it with the style's grey and draw `hatch_mm` on it."""

    points_mm: tuple[Point, ...]
    style: str
    filled: bool = True
    dash_mm: tuple[float, float] | None = None
    hatch_mm: tuple[tuple[Point, Point], ...] = ()
    item: int | None = None


@dataclass(frozen=True, slots=True)
class TextPrim:
    """Text whose baseline starts, centres or ends (`anchor`) at `point_mm`."""

    point_mm: Point
    text: str
    style: str
    size_mm: float = LABEL_SIZE_MM
    anchor: Anchor = "start"
    item: int | None = None


Primitive = Union[LinePrim, CirclePrim, PolygonPrim, TextPrim]


def paper_style(style: str) -> PaperStyle:
    """The pen of a primitive's style name (a role value)."""
    return ROLE_STYLES[Role(style)].paper


def _dash(role: Role, dashed: bool) -> tuple[float, float] | None:
    own = ROLE_STYLES[role].paper.dash_mm
    return (own or GENERIC_DASH_MM) if dashed else own


def _marker(x: float, y: float, symbol: str, role: Role, index: int) -> list[Primitive]:
    h = MARKER_SIZE_MM / 2
    st = role.value
    if symbol == "triangle":
        return [PolygonPrim(((x, y - h), (x + h, y + h * 0.8), (x - h, y + h * 0.8)), st, item=index)]
    if symbol == "ring":
        return [CirclePrim((x, y), h * 0.8, st, item=index)]
    if symbol == "square":
        return [PolygonPrim(((x - h * 0.7, y - h * 0.7), (x + h * 0.7, y - h * 0.7),
                             (x + h * 0.7, y + h * 0.7), (x - h * 0.7, y + h * 0.7)), st, item=index)]
    # cross
    return [LinePrim(((x - h, y), (x + h, y)), st, item=index),
            LinePrim(((x, y - h), (x, y + h)), st, item=index)]


def scene_to_primitives(scene: Scene, box_mm: tuple[float, float, float, float], *,
                        margin_mm: float = MARGIN_MM, decorations: bool = True) -> list[Primitive]:
    """The scene as page-millimetre primitives inside a box, items in drawing order.

    Args:
        scene: What to draw.
        box_mm: (x, y, width, height) of the box on the page, y down.
        margin_mm: Space kept free inside the box.
        decorations: Add the frame, a north arrow (top right) and a scale bar (bottom left), with
            `item=None`.

    Returns:
        Primitives; those of scene item `i` carry `item=i` (a marker gives its symbol and label).
    """
    bx, by, bw, bh = box_mm
    vp, _ = drawing_viewport(scene, box_mm, margin_mm=margin_mm, key=decorations)
    drawn_h = drawing_height(bh, decorations)

    def at(p: Point) -> Point:
        u, v = vp.to_view(*p)
        return (bx + u, by + v)

    out: list[Primitive] = []
    for index, item in scene.by_layer():
        role = item.role
        st = role.value
        if isinstance(item, Polyline):
            out.append(LinePrim(tuple(at(p) for p in item.points), st, closed=item.closed,
                                dash_mm=_dash(role, item.dashed), item=index))
        elif isinstance(item, Circle):
            out.append(CirclePrim(at(item.centre), item.radius_m * vp.units_per_m, st,
                                  dash_mm=_dash(role, False), item=index))
        elif isinstance(item, Polygon):
            pts = tuple(at(p) for p in item.points)
            spacing = ROLE_STYLES[role].paper.hatch_spacing_mm
            hatch = tuple(hatch_segments(pts, spacing, angle_deg=-45.0)) if (item.filled and spacing) else ()
            out.append(PolygonPrim(pts, st, filled=item.filled, dash_mm=_dash(role, False),
                                   hatch_mm=hatch, item=index))
        elif isinstance(item, Marker):
            x, y = at(item.point)
            h = MARKER_SIZE_MM / 2
            if decorations and not (bx + h <= x <= bx + bw - h and by + h <= y <= by + drawn_h - h):
                continue          # off the drawing or on its edge: not drawn half-cut by the frame
            out.extend(_marker(x, y, item.symbol or "cross", role, index))
            if item.label:
                # up and to the right, so a line through the marker does not cross the text
                out.append(TextPrim((x + MARKER_SIZE_MM * 0.7, y - MARKER_SIZE_MM * 0.3), item.label,
                                    st, item=index))
        elif isinstance(item, Label):
            x, y = at(item.point)
            out.append(TextPrim((x, y + LABEL_SIZE_MM * 0.35), item.text, st, anchor="middle",
                                item=index))
    if decorations:
        out.extend(_decorations(scene, vp, box_mm, margin_mm))
    return out


def drawing_viewport(scene: Scene, box_mm: tuple[float, float, float, float], *, margin_mm: float = MARGIN_MM,
                     key: bool = True) -> tuple[Viewport, tuple[float, float]]:
    """The viewport of the drawing inside a plan view's box (above the key strip when `key`), and
    the page position of the viewport's origin."""
    bx, by, bw, bh = box_mm
    return scene.fit(bw, drawing_height(bh, key), 1.0, margin=margin_mm), (bx, by)


def drawing_height(height_mm: float, key: bool = True) -> float:
    """Height of the drawing inside a plan view's box of `height_mm` (the key strip below it)."""
    return max(height_mm - (KEY_STRIP_MM if key else 0.0), 1.0)


def _decorations(scene: Scene, vp: Viewport, box_mm: tuple[float, float, float, float],
                 margin_mm: float) -> list[Primitive]:
    """The frame, the line above the key strip, and in the strip the scale bar (left), the north
    arrow (right, if the scene has one) and the scene's key note."""
    bx, by, bw, bh = box_mm
    st = Role.ANNOTATION.value
    top = by + drawing_height(bh)
    out: list[Primitive] = [LinePrim(((bx, by), (bx + bw, by), (bx + bw, by + bh), (bx, by + bh)), st,
                                     closed=True),
                            LinePrim(((bx, top), (bx + bw, top)), st)]
    # scale bar, bottom left: a bar with end and middle ticks, the length written after it
    length_nm = scene.scale_hint_nm or scale_bar_nm(vp.width_m)
    length_mm = length_nm * NM_TO_M * vp.units_per_m
    x0, y0 = bx + margin_mm, by + bh - 1.6
    tick = 1.2
    out.append(LinePrim(((x0, y0 - tick), (x0, y0), (x0 + length_mm, y0), (x0 + length_mm, y0 - tick)), st))
    out.append(LinePrim(((x0 + length_mm / 2, y0), (x0 + length_mm / 2, y0 - tick / 2)), st))
    out.append(TextPrim((x0 + length_mm + 1.2, y0), format_nm(length_nm), st))
    right = bx + bw - margin_mm
    if scene.north_arrow:
        out.extend(_north_arrow(scene, right, top))
        right -= 8.0
    if scene.key_note:       # a side view's "heights x3", at the right of the strip
        out.append(TextPrim((right, y0), scene.key_note, st, anchor="end"))
    return out


def _north_arrow(scene: Scene, right: float, top: float) -> list[Primitive]:
    """The north arrow in the key strip, ending `right`: a shaft, a filled head at north's end,
    and "N" beside it."""
    st = Role.ANNOTATION.value
    out: list[Primitive] = []
    # north arrow, bottom right: a shaft, a filled head at north's end, and "N" beside it
    arrow = north_arrow(scene.up_deg_true)
    a = radians(arrow.screen_deg)
    ux, uy = sin(a), -cos(a)              # unit vector towards north on the page
    px, py = -uy, ux                      # perpendicular
    half = 1.9
    cx, cy = right - 4.0, top + KEY_STRIP_MM / 2
    tip = (cx + ux * half, cy + uy * half)
    tail = (cx - ux * half, cy - uy * half)
    out.append(LinePrim((tail, tip), st))
    head = 1.3
    base = (tip[0] - ux * head * 1.4, tip[1] - uy * head * 1.4)
    out.append(PolygonPrim((tip, (base[0] + px * head / 2, base[1] + py * head / 2),
                            (base[0] - px * head / 2, base[1] - py * head / 2)), st))
    if abs(ux) > 0.5:      # north across the page: "N" beyond the tip, still in the strip
        out.append(TextPrim((tip[0] + ux * 2.4, cy + LABEL_SIZE_MM * 0.35), "N", st, anchor="middle"))
    else:                  # north up or down the page: "N" beside the shaft
        out.append(TextPrim((cx + 2.2, cy + LABEL_SIZE_MM * 0.35), "N", st, anchor="start"))
    return out


# --- SVG ------------------------------------------------------------------------------------
