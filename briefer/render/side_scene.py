"""The side view of the sight picture, described once and drawn by the app and the PDF card.

Seen from beside the aircraft as it flies abeam the landing threshold: the runway (end on) at the
left, the ground, the circling height (the MDA's height above the runway, dotted), and the sight
lines from the runway to the eye: the planned one (solid, to the plan's offset at circling height)
and the familiar one (dashed, through the trap, where the everyday picture puts the eye at
circling height, out to the everyday pattern at its own height). Labels give each point's
distance or height.

`side_picture(brief)` reads the five numbers the drawing needs from the Brief (true units, NM
and ft). `SidePicture.scene(width, height, aspect)` turns them into a plan-view-style `Scene` for
a view of that size: distances to scale, heights stretched by a whole factor (`stretch`) so that
the lines stand apart in a flat box; the factor is written in the key ("heights x3"). The
terminal canvas (`planview.draw_scene`, via `render_side` for the app and the text card) and the
paper primitives (`paper.scene_to_primitives`) draw that Scene as they draw the plan view.

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass

from typing import TYPE_CHECKING

from briefer.render.scene import Bounds, Label, Marker, Polyline, Role, Scene
from briefer.result import Brief

if TYPE_CHECKING:  # pragma: no cover
    from briefer.render.canvas import Canvas
from briefer.units import FT_TO_M, NM_TO_M

HEADROOM = 1.15
"""The drawing's top, as a multiple of the highest point (room for its label above it)."""
FOOTROOM = 0.15
"""Room below the ground, as a multiple of the highest point (the scale bar, the runway's label)."""
LEFT_ROOM = 0.1
"""Room left of the runway (for its label), as a multiple of the farthest distance."""
RIGHT_ROOM = 1.12
"""The drawing's right edge, as a multiple of the farthest distance."""
RUNWAY_SHARE = 0.025
"""The runway's drawn width, as a share of the farthest distance (a true width would not show)."""


LEGEND: dict[Role, str] = {Role.PLANNED_TRACK: "planned sight line", Role.FAMILIAR_TRACK: "usual picture",
                           Role.CIRCLING_HEIGHT: "circling height"}
"""What the side view's lines mean, for a legend (the points are labelled on the drawing)."""


@dataclass(frozen=True, slots=True, kw_only=True)
class SidePicture:
    """What the side view shows, in true units.

    Attributes:
        circling_height_ft: Height of the circle above the runway (the MDA's height, or the
            criteria's lowest circling height when circling is not authorised).
        planned_offset_nm: The plan's offset from the runway abeam the threshold; NaN: no plan,
            so no planned sight line.
        familiar_height_ft, familiar_offset_nm: The crew's everyday pattern.
        familiar_offset_at_circling_nm: Where the everyday picture puts the eye at circling
            height (the trap).
    """

    circling_height_ft: float
    planned_offset_nm: float
    familiar_height_ft: float
    familiar_offset_nm: float
    familiar_offset_at_circling_nm: float

    @property
    def planned(self) -> bool:
        """Whether there is a planned sight line."""
        return math.isfinite(self.planned_offset_nm) and self.planned_offset_nm > 0

    def _extent(self) -> tuple[float, float]:
        """(farthest distance, highest point) of the points drawn, in metres."""
        ds = [self.familiar_offset_nm, self.familiar_offset_at_circling_nm] + (
            [self.planned_offset_nm] if self.planned else [])
        d = max([x for x in ds if math.isfinite(x)] + [0.1]) * NM_TO_M
        h = max(self.circling_height_ft, self.familiar_height_ft, 1.0) * FT_TO_M
        return d, h

    def stretch(self, width: float, height: float, aspect: float = 1.0, *, margin: float = 0.0) -> int:
        """The whole factor heights are drawn larger than distances in a view of `width` x
        `height` view units (`aspect`: width over height of one unit), so that the drawing
        fills the view's height; at least 1."""
        d, h = self._extent()
        across = max(width - 2 * margin, 1e-9) / (d * (RIGHT_ROOM + LEFT_ROOM))      # units per metre
        tall = h * (HEADROOM + FOOTROOM) * across * aspect                             # height at x1
        return max(1, math.floor(max(height - 2 * margin, 0.0) / tall)) if tall > 0 else 1

    def scene(self, width: float, height: float, aspect: float = 1.0, *, margin: float = 0.0,
              labels: bool = True) -> Scene:
        """The side view for a view of `width` x `height` units (see `stretch`), as a Scene in
        metres: x the distance from the runway, y the height times the stretch."""
        k = self.stretch(width, height, aspect, margin=margin)
        d_max, h_max = self._extent()
        hc = self.circling_height_ft * FT_TO_M * k
        x_right = d_max * RIGHT_ROOM
        rw = d_max * RUNWAY_SHARE / 2

        def at(d_nm: float, h_ft: float) -> tuple[float, float]:
            return (d_nm * NM_TO_M, h_ft * FT_TO_M * k)

        items: list = [
            Polyline(points=((-rw, 0.0), (x_right, 0.0)), role=Role.GROUND),
            Polyline(points=((0.0, hc), (x_right, hc)), role=Role.CIRCLING_HEIGHT),
            Polyline(points=((-rw, 0.0), (rw, 0.0)), role=Role.RUNWAY),
        ]
        trap = at(self.familiar_offset_at_circling_nm, self.circling_height_ft)
        usual = at(self.familiar_offset_nm, self.familiar_height_ft)
        far = usual if self.familiar_offset_nm >= self.familiar_offset_at_circling_nm else trap
        items.append(Polyline(points=((0.0, 0.0), far), role=Role.FAMILIAR_TRACK))
        if self.planned:
            plan = at(self.planned_offset_nm, self.circling_height_ft)
            items.append(Polyline(points=((0.0, 0.0), plan), role=Role.PLANNED_TRACK))
            items.append(Marker(point=plan, role=Role.PLANNED_TRACK, symbol="ring", priority=95,
                                label=f"plan {self.planned_offset_nm:.2f} NM" if labels else ""))
        items.append(Marker(point=trap, role=Role.FAMILIAR_TRACK, symbol="cross", priority=90,
                            label=f"trap {self.familiar_offset_at_circling_nm:.2f} NM" if labels else ""))
        items.append(Marker(point=usual, role=Role.FAMILIAR_TRACK, symbol="square", priority=85,
                            label=f"usual {self.familiar_height_ft:.0f} ft" if labels else ""))
        if labels:
            items.append(Label(point=(d_max * 0.12, hc), text=f"{self.circling_height_ft:.0f} ft",
                               role=Role.CIRCLING_HEIGHT, priority=80))
            # at the runway's outer end: placed beyond it, left of the drawing's start
            items.append(Label(point=(-rw, 0.0), text="RWY", role=Role.RUNWAY, priority=70))
        bounds = Bounds(x_min_m=-d_max * LEFT_ROOM, y_min_m=-h_max * FOOTROOM * k,
                        x_max_m=x_right, y_max_m=h_max * HEADROOM * k)
        return Scene(items=tuple(items), bounds=bounds, north_arrow=False,
                     key_note=f"heights x{k}" if k > 1 else "heights to scale")


def render_side(picture: SidePicture, cols: int, rows: int, *, ascii: bool = False) -> Canvas:
    """A terminal canvas of `cols` x `rows` cells with the side view drawn on it (the app's
    widget and the text card)."""
    from briefer.render.canvas import AsciiCanvas, BrailleCanvas
    from briefer.render.planview import draw_scene

    canvas: Canvas = AsciiCanvas(cols, rows) if ascii else BrailleCanvas(cols, rows)
    margin = 1.0
    scene = picture.scene(canvas.w - 1, canvas.h - 1, canvas.aspect, margin=margin)
    draw_scene(canvas, scene, viewport=canvas.fit(scene, margin=margin))
    return canvas


def side_picture(brief: Brief) -> SidePicture:
    """The side view's numbers, read from the Brief's sight picture."""
    s = brief.sight_picture
    return SidePicture(circling_height_ft=s.circling_height_ft, planned_offset_nm=s.planned_offset_nm,
                       familiar_height_ft=s.familiar_height_ft, familiar_offset_nm=s.familiar_offset_nm,
                       familiar_offset_at_circling_nm=s.familiar_offset_at_circling_nm)


__all__ = ["LEGEND", "SidePicture", "render_side", "side_picture"]
