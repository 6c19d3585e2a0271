"""The plan view of a Brief as a renderer-neutral Scene (drawn by the app, the text card,
the PDF card and SVG screenshots alike)."""

from __future__ import annotations

import numpy as np

from briefer.render.scene import Bounds, Label, Marker, Polygon, Polyline, Role, Scene
from briefer.result import Brief

BOUNDS_MARGIN = 1.08   # a little air around the protected area


def _pts(arr) -> tuple[tuple[float, float], ...]:
    a = np.asarray(arr, dtype=float).reshape(-1, 2)
    a = a[np.all(np.isfinite(a), axis=1)]
    return tuple((float(x), float(y)) for x, y in a)


def scene_from_brief(brief: Brief, *, familiar: bool = True, labels: bool = True,
                     north_up: bool = True) -> Scene:
    """Runways, the protected area, not-authorised sectors, obstacles, the planned track with
    its roll-in and descent points, and (optionally) the track the familiar picture gives.

    The view is bounded by the protected area (sectors are clipped to it), so the plan view
    keeps the same scale as the crew edits the weather.
    """
    items: list = []
    a = brief.area
    boundary = _pts(a.boundary_xy_m)
    if boundary:
        items.append(Polyline(points=boundary, role=Role.PROTECTED_AREA, closed=True))
    for poly in a.sectors_xy_m:
        p = _pts(poly)
        if len(p) >= 3:
            items.append(Polygon(points=p, role=Role.EXCLUDED_SECTOR, filled=True))
    # every obstacle with its elevation; when room runs short the labels of obstacles inside the
    # area are kept before those outside it (in a sector, or beyond), the highest first
    by_height = sorted(range(len(brief.obstacles)), key=lambda i: brief.obstacles[i].elevation_ft)
    for rank, i in enumerate(by_height):
        ob = brief.obstacles[i]
        items.append(Marker(point=_pts(ob.xy_m)[0], role=Role.OBSTACLE,
                            priority=(50 if ob.inside_area else 30) + min(rank, 9),
                            label=f"{ob.elevation_ft:.0f}" if labels else ""))
    if familiar and len(brief.sight_picture.familiar_track_xy_m):
        items.append(Polyline(points=_pts(brief.sight_picture.familiar_track_xy_m), role=Role.FAMILIAR_TRACK,
                              dashed=True))
    pl = brief.plan
    if pl.feasible and len(pl.track_xy_m):
        items.append(Polyline(points=_pts(pl.track_xy_m), role=Role.PLANNED_TRACK))
        for arr, role, text in ((pl.roll_in_xy_m, Role.ROLL_IN, "roll in"),
                                (pl.descent_xy_m, Role.DESCENT_POINT, "descend")):
            pts = _pts(arr)
            if pts:
                items.append(Marker(point=pts[0], role=role, label=text if labels else ""))
    for rw in brief.runways:
        a_xy, b_xy = _pts(rw.a_xy_m)[0], _pts(rw.b_xy_m)[0]
        items.append(Polyline(points=(a_xy, b_xy), role=Role.RUNWAY))
        for end, thr in ((rw.a_end_xy_m, a_xy), (rw.b_end_xy_m, b_xy)):
            if end is not None:     # the pavement behind a displaced threshold: not for landing
                items.append(Polyline(points=(_pts(end)[0], thr), role=Role.RUNWAY, dashed=True))
        if labels:
            des_a, des_b = rw.designator.split("/")
            # a designator is painted at its own threshold, read on the approach to it
            items.append(Label(point=a_xy, text=des_a, priority=90 if rw.landing else 60))
            items.append(Label(point=b_xy, text=des_b, priority=90 if rw.landing else 60))
    pts = np.asarray(a.boundary_xy_m, dtype=float).reshape(-1, 2)
    if len(pts):
        (x0, y0), (x1, y1) = pts.min(axis=0), pts.max(axis=0)
        cx, cy, hx, hy = (x0 + x1) / 2, (y0 + y1) / 2, (x1 - x0) / 2 * BOUNDS_MARGIN, (y1 - y0) / 2 * BOUNDS_MARGIN
        bounds = Bounds(x_min_m=cx - hx, y_min_m=cy - hy, x_max_m=cx + hx, y_max_m=cy + hy)
    else:
        bounds = None
    return Scene(items=tuple(items), bounds=bounds, north_up=north_up)
