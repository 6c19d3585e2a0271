"""The plan view on paper: millimetre primitives (for fpdf2's drawing API) and an SVG string.

`scene_to_primitives(scene, box_mm)` transforms a `Scene` into lines, circles, polygons and text
in page millimetres (x right, y down, as fpdf2 and SVG both use), each with a style name (the
role's value; look its pen up with `paper_style`). `scene_to_svg` writes exactly those primitives
as SVG, so the PDF card drawn either way and any screenshot show the same drawing.

The drawing is legible in black and white: roles differ by dash pattern, stroke width, grey
level, hatching and marker symbol; colour is optional (`colour=True`).

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

from collections.abc import Sequence
from math import cos, radians, sin
from dataclasses import dataclass
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
LABEL_SIZE_MM = 2.4
"""Height of label text (font size in millimetres; a PDF font size in points is `size * pdf.k`
when the FPDF unit is mm)."""
HATCH_WIDTH_MM = 0.15
"""Width of the hatch lines inside a filled polygon."""
MARGIN_MM = 3.0
"""Space kept free inside the box around the drawing."""

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
    vp = scene.fit(bw, bh, 1.0, margin=margin_mm)

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


def _decorations(scene: Scene, vp: Viewport, box_mm: tuple[float, float, float, float],
                 margin_mm: float) -> list[Primitive]:
    bx, by, bw, bh = box_mm
    st = Role.ANNOTATION.value
    out: list[Primitive] = [LinePrim(((bx, by), (bx + bw, by), (bx + bw, by + bh), (bx, by + bh)), st,
                                     closed=True)]
    # scale bar, bottom left: a bar with end and middle ticks, the length written after it
    length_nm = scene.scale_hint_nm or scale_bar_nm(vp.width_m)
    length_mm = length_nm * NM_TO_M * vp.units_per_m
    x0, y0 = bx + margin_mm, by + bh - margin_mm
    tick = 1.2
    out.append(LinePrim(((x0, y0 - tick), (x0, y0), (x0 + length_mm, y0), (x0 + length_mm, y0 - tick)), st))
    out.append(LinePrim(((x0 + length_mm / 2, y0), (x0 + length_mm / 2, y0 - tick / 2)), st))
    out.append(TextPrim((x0 + length_mm + 1.2, y0), format_nm(length_nm), st))
    # north arrow, top right: a shaft, a filled head at north's end, and "N" beyond it
    arrow = north_arrow(scene.up_deg_true)
    a = radians(arrow.screen_deg)
    ux, uy = sin(a), -cos(a)              # unit vector towards north on the page
    px, py = -uy, ux                      # perpendicular
    half = 3.0
    cx, cy = bx + bw - margin_mm - 3.0, by + margin_mm + 6.5
    tip = (cx + ux * half, cy + uy * half)
    tail = (cx - ux * half, cy - uy * half)
    out.append(LinePrim((tail, tip), st))
    head = 1.6
    base = (tip[0] - ux * head * 1.4, tip[1] - uy * head * 1.4)
    out.append(PolygonPrim((tip, (base[0] + px * head / 2, base[1] + py * head / 2),
                            (base[0] - px * head / 2, base[1] - py * head / 2)), st))
    out.append(TextPrim((tip[0] + ux * 2.4, tip[1] + uy * 2.4 + LABEL_SIZE_MM * 0.35), "N", st,
                        anchor="middle"))
    return out


# --- SVG ------------------------------------------------------------------------------------


def _n(v: float) -> str:
    s = f"{v:.3f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _grey(level: float) -> str:
    g = max(0, min(255, round(level * 255)))
    return f"#{g:02x}{g:02x}{g:02x}"


def _pts(points: Sequence[Point]) -> str:
    return " ".join(f"{_n(x)},{_n(y)}" for x, y in points)


def _pen(style: str, dash: tuple[float, float] | None, colour: bool, *, width: float | None = None) -> str:
    ps = paper_style(style)
    stroke = ps.colour_hex if colour else _grey(ps.stroke_grey)
    attrs = f'stroke="{stroke}" stroke-width="{_n(width if width is not None else ps.stroke_width_mm)}"'
    if dash:
        attrs += f' stroke-dasharray="{_n(dash[0])} {_n(dash[1])}"'
    if ps.round_cap:
        attrs += ' stroke-linecap="round"'
    return attrs + ' stroke-linejoin="round"'


def _fill(style: str, filled: bool) -> str:
    ps = paper_style(style)
    if not filled or ps.fill_grey is None:
        return 'fill="none"'
    return f'fill="{_grey(ps.fill_grey)}"'


def _element(p: Primitive, colour: bool) -> str:
    if isinstance(p, LinePrim):
        tag = "polygon" if p.closed else "polyline"
        return f'<{tag} points="{_pts(p.points_mm)}" fill="none" {_pen(p.style, p.dash_mm, colour)}/>'
    if isinstance(p, CirclePrim):
        return (f'<circle cx="{_n(p.centre_mm[0])}" cy="{_n(p.centre_mm[1])}" r="{_n(p.radius_mm)}" '
                f'{_fill(p.style, p.filled)} {_pen(p.style, p.dash_mm, colour)}/>')
    if isinstance(p, PolygonPrim):
        poly = (f'<polygon points="{_pts(p.points_mm)}" {_fill(p.style, p.filled)} '
                f'{_pen(p.style, p.dash_mm, colour)}/>')
        if not p.hatch_mm:
            return poly
        d = " ".join(f"M{_n(a[0])},{_n(a[1])} L{_n(b[0])},{_n(b[1])}" for a, b in p.hatch_mm)
        hatch = f'<path d="{d}" fill="none" {_pen(p.style, None, colour, width=HATCH_WIDTH_MM)}/>'
        return f"<g>{poly}{hatch}</g>"
    x, y = p.point_mm
    fill = paper_style(p.style).colour_hex if colour else "#000000"
    return (f'<text x="{_n(x)}" y="{_n(y)}" font-family="sans-serif" font-size="{_n(p.size_mm)}" '
            f'text-anchor="{p.anchor}" fill="{fill}" stroke="none">{escape(p.text)}</text>')


def scene_to_svg(scene: Scene, width_mm: float, height_mm: float, *, colour: bool = False,
                 margin_mm: float = MARGIN_MM, title: str | None = None) -> str:
    """The plan view as a standalone SVG document measured in millimetres.

    Inside `<g id="scene">` there is exactly one element per scene item, in drawing order, with
    `class` set to the item's role and `id="item-<index>"`; a marker with a label, or a hatched
    polygon, is a `<g>`. The frame, scale bar and north arrow are in `<g id="decorations">`.

    Args:
        scene: What to draw.
        width_mm, height_mm: The drawing's size.
        colour: Stroke in the roles' print colours instead of black and greys.
        margin_mm: Space kept free inside the frame.
        title: An optional `<title>` (a tooltip and an accessible name).
    """
    prims = scene_to_primitives(scene, (0.0, 0.0, width_mm, height_mm), margin_mm=margin_mm)
    by_item: dict[int, list[Primitive]] = {}
    decorations: list[Primitive] = []
    for p in prims:
        if p.item is None:
            decorations.append(p)
        else:
            by_item.setdefault(p.item, []).append(p)
    w, h = _n(width_mm), _n(height_mm)
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{w}mm" height="{h}mm" '
           f'viewBox="0 0 {w} {h}">']
    if title:
        out.append(f"<title>{escape(title)}</title>")
    out.append(f'<defs><clipPath id="plan-clip"><rect x="0" y="0" width="{w}" height="{h}"/></clipPath></defs>')
    out.append(f'<rect x="0" y="0" width="{w}" height="{h}" fill="#ffffff" stroke="none"/>')
    out.append('<g id="scene" clip-path="url(#plan-clip)">')
    for index, _ in scene.by_layer():
        parts = by_item.get(index, [])
        role = scene.items[index].role.value
        ident = f'id="item-{index}" class={quoteattr(role)}'
        if len(parts) == 1:
            el = _element(parts[0], colour)
            tag_end = el.index(" ") if not el.startswith("<g>") else 2
            out.append(el[:tag_end] + " " + ident + el[tag_end:])
        else:
            out.append(f"<g {ident}>" + "".join(_element(p, colour) for p in parts) + "</g>")
    out.append("</g>")
    out.append('<g id="decorations">' + "".join(_element(p, colour) for p in decorations) + "</g>")
    out.append("</svg>")
    return "\n".join(out)
