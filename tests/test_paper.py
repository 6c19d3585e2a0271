"""The plan view on paper: millimetre primitives (briefer.render.paper)."""

from __future__ import annotations

import pytest

from briefer.render.scene import (
    ROLE_STYLES,
    Bounds,
    Circle,
    Marker,
    Polygon,
    Polyline,
    Role,
    Scene,
)
from briefer.render.paper import (
    KEY_STRIP_MM,
    CirclePrim,
    LinePrim,
    PolygonPrim,
    TextPrim,
    paper_style,
    scene_to_primitives,
)
from briefer.units import NM_TO_M

try:  # the shared example scene (tests/ is not a package)
    from tests.test_scene import example_scene
except ImportError:  # pragma: no cover - plain `pytest` puts tests/ itself on sys.path
    from test_scene import example_scene

def test_dash_patterns_follow_the_roles():
    """Every stroked item's primitive carries its role's paper dash (hand-checked values of the
    table in scene.py: the protected area dotted, the planned track solid)."""
    scene = example_scene()
    seen = set()
    for p in scene_to_primitives(scene, (0.0, 0.0, 120.0, 90.0), decorations=False):
        if p.item is None or isinstance(p, TextPrim):
            continue
        item = scene.items[p.item]
        if not isinstance(item, (Polyline, Circle, Polygon)):
            continue
        if getattr(item, "dashed", False):
            continue
        assert p.dash_mm == ROLE_STYLES[item.role].paper.dash_mm, item.role
        seen.add(item.role)
    assert {Role.PROTECTED_AREA, Role.PLANNED_TRACK, Role.RUNWAY} <= seen
    assert paper_style("protected_area").dash_mm == (0.1, 0.9)
    assert paper_style("planned_track").dash_mm is None


# --- primitives ---------------------------------------------------------------------------------


def test_primitives_are_offset_into_the_box():
    s = example_scene()
    at0 = scene_to_primitives(s, (0.0, 0.0, 100.0, 80.0))
    moved = scene_to_primitives(s, (10.0, 20.0, 100.0, 80.0))
    assert len(at0) == len(moved)
    for a, b in zip(at0, moved):
        if isinstance(a, (LinePrim, PolygonPrim)):
            shifted = [v for x, y in a.points_mm for v in (x + 10, y + 20)]
            assert shifted == pytest.approx([v for p in b.points_mm for v in p])
        elif isinstance(a, CirclePrim):
            assert (a.centre_mm[0] + 10, a.centre_mm[1] + 20) == pytest.approx(b.centre_mm)
        else:
            assert (a.point_mm[0] + 10, a.point_mm[1] + 20) == pytest.approx(b.point_mm)


def test_primitives_stay_inside_the_box():
    for p in scene_to_primitives(example_scene(), (10.0, 20.0, 100.0, 80.0), decorations=False):
        pts = getattr(p, "points_mm", None) or [getattr(p, "centre_mm", None) or p.point_mm]
        for x, y in pts:
            assert 10.0 <= x <= 110.0 and 20.0 <= y <= 100.0


def test_circle_fills_the_box_at_equal_scale():
    # a 1000 m circle in 80 x 60 mm with 3 mm margins: height limits, radius (60 - 6) / 2 = 27 mm
    prims = scene_to_primitives(Scene([Circle((0, 0), 1000.0, Role.PROTECTED_AREA)]), (0, 0, 80, 60),
                                decorations=False)
    (c,) = prims
    assert c.radius_mm == pytest.approx(27.0) and c.centre_mm == pytest.approx((40.0, 30.0))
    assert c.dash_mm == paper_style("protected_area").dash_mm


def test_scale_bar_length_in_mm():
    # a 2 NM wide box shown 100 mm wide (no margin; the key strip below the 100 mm drawing): 0.5 NM
    # is the longest round length within 40 % (0.8 NM); 0.5 NM = 25 mm. The bar is tick-bar-tick:
    # 4 points, bar from x=0 to x=25.
    s = Scene([], bounds=Bounds(0.0, 0.0, 2 * NM_TO_M, 2 * NM_TO_M))
    prims = scene_to_primitives(s, (0, 0, 100, 100 + KEY_STRIP_MM), margin_mm=0.0)
    bar = next(p for p in prims if isinstance(p, LinePrim) and len(p.points_mm) == 4 and not p.closed)
    assert bar.points_mm[2][0] - bar.points_mm[1][0] == pytest.approx(25.0)
    assert any(isinstance(p, TextPrim) and p.text == "0.5 NM" for p in prims)


def test_north_arrow_turns_with_the_view():
    # east up: north points left, so "N" is left of the arrow's shaft
    s = Scene([Circle((0, 0), 1000.0, Role.PROTECTED_AREA)], north_up=False, up_track_deg_true=90.0)
    prims = scene_to_primitives(s, (0, 0, 80, 60))
    n = next(p for p in prims if isinstance(p, TextPrim) and p.text == "N")
    head = next(p for p in prims if isinstance(p, PolygonPrim) and p.item is None)
    assert n.point_mm[0] < min(x for x, _ in head.points_mm)
    tip = min(head.points_mm)  # the head's leftmost corner is its tip
    assert n.point_mm[1] == pytest.approx(tip[1], abs=1.0)


def test_marker_primitives_by_symbol():
    s = Scene([Marker((0, 0), Role.OBSTACLE), Marker((10, 0), Role.ROLL_IN),
               Marker((20, 0), Role.THRESHOLD), Marker((30, 0), Role.DESCENT_POINT)])
    kinds = [type(p).__name__ for p in scene_to_primitives(s, (0, 0, 60, 40), decorations=False)]
    # triangle, ring, square, cross (two strokes)
    # drawing order by layer: obstacle, roll-in, descent point, threshold
    assert kinds == ["PolygonPrim", "CirclePrim", "LinePrim", "LinePrim", "PolygonPrim"]
