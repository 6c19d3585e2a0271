"""Where the plan view's words go: one placement for the terminal canvas and for paper.

Each label (an obstacle's elevation, "roll in", "descend", a runway designator) tries the places
around its point in a fixed order of preference: beside its marker (right, left, above, below,
then the four corners, then the same a step farther out); a runway designator first beyond its
runway's end, along the runway. The first place that is inside the view, clear of every label
already placed and clear of the drawing's key lines (the planned track, the runway, the missed
approach, the markers, the key) wins. A place clear of everything drawn is preferred; one over
the area's dotted edge, a sector's hatch, the familiar-picture track or the final approach line
comes next. Labels are placed by importance (the landing runway's designators, then "descend" and
"roll in", then the obstacles, highest first); a label with no free place is left off, and the
caller says so in the legend.

Units are the caller's: character cells for a terminal canvas, millimetres on paper. Boxes are
(x0, y0, x1, y1), y down, x1 and y1 exclusive.

Pure Python (numpy for the paper's segment tests): no Rich, Textual or fpdf import.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from briefer._dataclass import dataclass, replace
from typing import Any

from briefer.render.scene import Label, Marker, Role, Scene

Box = tuple[float, float, float, float]

HARD_ROLES = frozenset({Role.PLANNED_TRACK, Role.RUNWAY, Role.THRESHOLD, Role.MISSED_APPROACH, Role.OBSTACLE,
                        Role.ROLL_IN, Role.DESCENT_POINT, Role.ANNOTATION})
"""What a label never covers."""
SOFT_ROLES = frozenset({Role.PROTECTED_AREA, Role.EXCLUDED_SECTOR, Role.FAMILIAR_TRACK, Role.FINAL_APPROACH})
"""What a label covers only when no place clear of everything is left."""

PRIORITY = {Role.DESCENT_POINT: 80, Role.ROLL_IN: 75, Role.OBSTACLE: 50}
"""Importance of a marker's label by role (a `Marker.priority` or `Label.priority` above 0 wins)."""
DESIGNATOR_PRIORITY = 60


@dataclass(frozen=True, slots=True)
class LabelSpec:
    """One label to place.

    Attributes:
        text: The words.
        anchor: The point the label belongs to, in view units.
        width, height: The label's size, in view units.
        gap_x, gap_y: Clearance kept between the anchor and the label (a marker's half size).
        priority: Higher is placed first (and kept when space runs out).
        axis: For a runway designator: the unit vector along the runway, outward at this end.
        item: The scene item the label belongs to.
    """

    text: str
    anchor: tuple[float, float]
    width: float
    height: float
    gap_x: float
    gap_y: float
    priority: int
    axis: tuple[float, float] | None = None
    item: int | None = None


def candidates(spec: LabelSpec) -> list[Box]:
    """The places a label may take, most preferred first."""
    ax, ay = spec.anchor
    w, h = spec.width, spec.height
    out: list[Box] = []
    if spec.axis is not None:
        ux, uy = spec.axis
        px, py = -uy, ux
        base = abs(ux) * w / 2 + abs(uy) * h / 2
        for reach, side in ((spec.gap_x + base, 0.0), (spec.gap_x + base + h, 0.0), (spec.gap_x + base, 1.0),
                            (spec.gap_x + base, -1.0), (spec.gap_x + base + 2 * h, 0.0)):
            off = side * (abs(px) * w + abs(py) * h)
            cx, cy = ax + ux * reach + px * off, ay + uy * reach + py * off
            out.append((cx - w / 2, cy - h / 2, cx + w / 2, cy + h / 2))
    for ring in (0.0, 1.0):
        gx, gy = spec.gap_x + ring * h, spec.gap_y + ring * h
        right, left = ax + gx, ax - gx - w
        above, below, middle = ay - gy - h, ay + gy, ay - h / 2
        centre = ax - w / 2
        for x0, y0 in ((right, middle), (left, middle), (centre, above), (centre, below),
                       (right, above), (left, above), (right, below), (left, below)):
            out.append((x0, y0, x0 + w, y0 + h))
    return out


def overlap(a: Box, b: Box) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def place(specs: Sequence[LabelSpec], is_free: Callable[[Box, bool], bool], bounds: Box,
          snap: Callable[[Box], Box] | None = None) -> list[Box | None]:
    """Places for the labels (None: left off), in the order given.

    Args:
        specs: The labels.
        is_free: (box, strict) -> whether the drawing leaves the box free; strict asks for a box
            clear of everything drawn, else only of what a label never covers.
        bounds: The box every label must stay inside.
        snap: Moves a candidate onto the caller's grid (whole cells on a terminal).
    """
    order = sorted(range(len(specs)), key=lambda i: (-specs[i].priority, i))
    placed: list[Box] = []
    result: list[Box | None] = [None] * len(specs)
    for i in order:
        boxes = candidates(specs[i])
        if snap is not None:
            boxes = list(dict.fromkeys(snap(b) for b in boxes))
        boxes = [b for b in boxes if b[0] >= bounds[0] and b[1] >= bounds[1] and b[2] <= bounds[2]
                 and b[3] <= bounds[3]]
        for strict in (True, False):
            choice = next((b for b in boxes if not any(overlap(b, q) for q in placed) and is_free(b, strict)), None)
            if choice is not None:
                result[i] = choice
                placed.append(choice)
                break
    return result


def label_priority(item: Any) -> int:
    """How much a label matters (see `PRIORITY`)."""
    own = getattr(item, "priority", 0) or 0
    if own:
        return int(own)
    if isinstance(item, Label):
        return DESIGNATOR_PRIORITY
    return PRIORITY.get(item.role, 40)


def runway_axis(scene: Scene, point: tuple[float, float], to_view: Callable[[float, float], tuple[float, float]]
                ) -> tuple[float, float] | None:
    """The outward direction (view units) along the runway that ends at `point`, or None."""
    from briefer.render.scene import Polyline

    for item in scene.items:
        if isinstance(item, Polyline) and item.role is Role.RUNWAY and len(item.points) == 2:
            a, b = item.points
            for end, other in ((a, b), (b, a)):
                if math.hypot(end[0] - point[0], end[1] - point[1]) < 1.0:
                    ex, ey = to_view(*end)
                    ox, oy = to_view(*other)
                    n = math.hypot(ex - ox, ey - oy)
                    if n > 0:
                        return ((ex - ox) / n, (ey - oy) / n)
    return None


# --- paper -----------------------------------------------------------------------------------

def _segments(points: Sequence[tuple[float, float]], closed: bool) -> list[tuple[tuple[float, float], tuple[float, float]]]:
    pts = list(points)
    if closed and len(pts) > 2:
        pts.append(pts[0])
    return list(zip(pts, pts[1:]))


class _SegmentSet:
    """Line segments (page mm) with a fast 'does any cross this box' test."""

    def __init__(self, segs: list[tuple[tuple[float, float], tuple[float, float]]], pad: float) -> None:
        import numpy as np

        self.np = np
        a = np.array([s[0] for s in segs], dtype=float).reshape(-1, 2)
        b = np.array([s[1] for s in segs], dtype=float).reshape(-1, 2)
        self.a, self.d = a, b - a
        self.lo = np.minimum(a, b) - pad
        self.hi = np.maximum(a, b) + pad
        self.pad = pad

    def hits(self, box: Box) -> bool:
        np = self.np
        if not len(self.a):
            return False
        x0, y0, x1, y1 = box[0] - self.pad, box[1] - self.pad, box[2] + self.pad, box[3] + self.pad
        near = (self.lo[:, 0] < x1) & (self.hi[:, 0] > x0) & (self.lo[:, 1] < y1) & (self.hi[:, 1] > y0)
        if not near.any():
            return False
        a, d = self.a[near], self.d[near]
        # Liang-Barsky: clip each segment's parameter range [0, 1] to the box
        t0 = np.zeros(len(a))
        t1 = np.ones(len(a))
        for p, q in ((-d[:, 0], a[:, 0] - x0), (d[:, 0], x1 - a[:, 0]), (-d[:, 1], a[:, 1] - y0),
                     (d[:, 1], y1 - a[:, 1])):
            with np.errstate(divide="ignore", invalid="ignore"):
                r = q / p
            par = p == 0
            outside = par & (q < 0)
            t0 = np.where(~par & (p < 0), np.maximum(t0, r), t0)
            t1 = np.where(~par & (p > 0), np.minimum(t1, r), t1)
            t0 = np.where(outside, 2.0, t0)
        return bool(np.any(t0 <= t1))


def place_paper_labels(prims: list[Any], scene: Scene, box: tuple[float, float, float, float],
                       measure: Callable[[str, float], float]) -> tuple[list[Any], tuple[str, ...]]:
    """The plan view's primitives with each label's text moved to its place (`place`), and the
    labels left off (no room).

    Args:
        prims: From `scene_to_primitives(scene, box)`.
        scene: The scene they were made from.
        box: The drawing's box on the page (x, y, width, height) [mm].
        measure: (text, size_mm) -> the text's width [mm].
    """
    from briefer.render.paper import MARKER_SIZE_MM, LinePrim, CirclePrim, PolygonPrim, TextPrim, paper_style

    hard_segs: list = []
    soft_segs: list = []
    blocks: list[Box] = []
    texts = []
    for p in prims:
        if isinstance(p, TextPrim):
            if p.item is None:
                tw = measure(p.text, p.size_mm)
                x = p.point_mm[0] - {"start": 0.0, "middle": tw / 2, "end": tw}[p.anchor]
                blocks.append((x - 0.4, p.point_mm[1] - p.size_mm * 0.8, x + tw + 0.4, p.point_mm[1] + p.size_mm * 0.3))
            else:
                texts.append(p)
            continue
        role = Role(p.style)
        if p.item is None:                                   # the key: frame, scale bar, arrow
            pts = p.points_mm if not isinstance(p, CirclePrim) else (p.centre_mm,)
            if isinstance(p, LinePrim) and p.closed and len(pts) == 4:
                continue                                     # the frame itself
            xs, ys = [q[0] for q in pts], [q[1] for q in pts]
            blocks.append((min(xs) - 0.6, min(ys) - 0.6, max(xs) + 0.6, max(ys) + 0.6))
            continue
        if isinstance(p, CirclePrim):
            (cx, cy), r = p.centre_mm, p.radius_mm
            if role in HARD_ROLES:
                blocks.append((cx - r - 0.3, cy - r - 0.3, cx + r + 0.3, cy + r + 0.3))
            else:
                n = 48
                ring = [(cx + r * math.cos(2 * math.pi * k / n), cy + r * math.sin(2 * math.pi * k / n)) for k in range(n)]
                soft_segs += _segments(ring, True)
            continue
        pts = p.points_mm
        item = scene.items[p.item]
        if isinstance(item, Marker):
            xs, ys = [q[0] for q in pts], [q[1] for q in pts]
            blocks.append((min(xs) - 0.3, min(ys) - 0.3, max(xs) + 0.3, max(ys) + 0.3))
            continue
        segs = _segments(pts, getattr(p, "closed", False) or isinstance(p, PolygonPrim))
        (hard_segs if role in HARD_ROLES else soft_segs).append((segs, paper_style(p.style).stroke_width_mm))
    hard = _SegmentSet([s for segs, _ in hard_segs for s in segs],
                       max([w for _, w in hard_segs] or [0.3]) / 2 + 0.25)
    soft = _SegmentSet([s for segs, _ in soft_segs for s in segs], 0.3)

    def is_free(b: Box, strict: bool) -> bool:
        if any(overlap(b, q) for q in blocks) or hard.hits(b):
            return False
        return not (strict and soft.hits(b))

    bx, by, bw, bh = box
    to_view = _paper_to_view(scene, box)
    specs = []
    for p in texts:
        item = scene.items[p.item]
        tw = measure(p.text, p.size_mm)
        h = p.size_mm * 0.95
        if isinstance(item, Marker):
            ax, ay = to_view(*item.point)
            gap = MARKER_SIZE_MM * 0.6
            axis = None
        else:
            ax, ay = to_view(*item.point)
            gap = 0.9
            axis = runway_axis(scene, item.point, to_view)
        specs.append(LabelSpec(text=p.text, anchor=(ax, ay), width=tw + 0.5, height=h, gap_x=gap, gap_y=gap,
                               priority=label_priority(item), axis=axis, item=p.item))
    spots = place(specs, is_free, (bx + 0.5, by + 0.5, bx + bw - 0.5, by + bh - 0.5))
    out = [p for p in prims if not (isinstance(p, TextPrim) and p.item is not None)]
    dropped = []
    for p, spec, spot in zip(texts, specs, spots):
        if spot is None:
            dropped.append(p.text)
            continue
        # the text's baseline: the box's top plus the cap height (0.74 of the size)
        out.append(replace(p, point_mm=(spot[0] + 0.25, spot[1] + p.size_mm * 0.74), anchor="start"))
    return out, tuple(dropped)


def _paper_to_view(scene: Scene, box: tuple[float, float, float, float]) -> Callable[[float, float], tuple[float, float]]:
    """World metres -> page mm, as `scene_to_primitives` maps them."""
    from briefer.render.paper import drawing_viewport

    vp, (bx, by) = drawing_viewport(scene, box)

    def to_view(x: float, y: float) -> tuple[float, float]:
        u, v = vp.to_view(x, y)
        return (bx + u, by + v)

    return to_view


__all__ = ["HARD_ROLES", "LabelSpec", "SOFT_ROLES", "candidates", "label_priority", "place", "place_paper_labels",
           "runway_axis"]
