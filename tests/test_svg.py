"""The plan view on paper: millimetre primitives and the SVG written from them."""

from __future__ import annotations

import io
import re
import xml.etree.ElementTree as ET

import pytest

from briefer.render.scene import (
    GENERIC_DASH_MM,
    ROLE_STYLES,
    Bounds,
    Circle,
    Label,
    Marker,
    Polygon,
    Polyline,
    Role,
    Scene,
)
from briefer.render.svg import (
    CirclePrim,
    LinePrim,
    PolygonPrim,
    TextPrim,
    paper_style,
    scene_to_primitives,
    scene_to_svg,
)
from briefer.units import NM_TO_M

try:  # the shared example scene (tests/ is not a package)
    from tests.test_scene import example_scene
except ImportError:  # pragma: no cover - plain `pytest` puts tests/ itself on sys.path
    from test_scene import example_scene

NS = {"svg": "http://www.w3.org/2000/svg"}


def _parse(svg: str) -> ET.Element:
    return ET.fromstring(svg)


def _scene_group(root: ET.Element) -> ET.Element:
    return root.find("svg:g[@id='scene']", NS)


def _stroked(el: ET.Element) -> ET.Element:
    """The element that carries the item's outline (the first child of a group)."""
    return el[0] if el.tag.endswith("}g") else el


def _fmt(dash):
    return " ".join(f"{v:g}" for v in dash)


# --- SVG structure ------------------------------------------------------------------------------


def test_svg_parses_and_is_measured_in_mm():
    root = _parse(scene_to_svg(example_scene(), 120, 90))
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    assert (root.get("width"), root.get("height"), root.get("viewBox")) == ("120mm", "90mm", "0 0 120 90")


def test_one_element_per_item_in_drawing_order_with_role_class():
    scene = example_scene()
    group = _scene_group(_parse(scene_to_svg(scene, 120, 90)))
    children = list(group)
    assert len(children) == len(scene.items)
    assert [c.get("id") for c in children] == [f"item-{i}" for i, _ in scene.by_layer()]
    assert [c.get("class") for c in children] == [item.role.value for _, item in scene.by_layer()]


def test_dash_patterns_follow_the_roles():
    scene = example_scene()
    group = _scene_group(_parse(scene_to_svg(scene, 120, 90)))
    seen = set()
    for el in group:
        item = scene.items[int(el.get("id").split("-")[1])]
        if isinstance(item, (Polyline, Circle, Polygon)):
            dash = ROLE_STYLES[item.role].paper.dash_mm
            got = _stroked(el).get("stroke-dasharray")
            assert got == (_fmt(dash) if dash else None), item.role
            seen.add(item.role)
    assert {Role.PROTECTED_AREA, Role.EXCLUDED_SECTOR, Role.FINAL_APPROACH, Role.MISSED_APPROACH,
            Role.FAMILIAR_TRACK, Role.PLANNED_TRACK, Role.RUNWAY} <= seen
    # hand-checked values of the table (scene.py): area dotted, planned track solid
    area = group.find("*[@class='protected_area']")
    assert area.get("stroke-dasharray") == "0.1 0.9" and area.get("stroke-linecap") == "round"
    assert group.find("*[@class='planned_track']").get("stroke-dasharray") is None


def test_dashed_flag_on_a_solid_role_uses_the_generic_dash():
    s = Scene([Polyline([(0, 0), (1000, 0)], Role.PLANNED_TRACK, dashed=True),
               Polyline([(0, 100), (1000, 100)], Role.FAMILIAR_TRACK, dashed=True)])
    group = _scene_group(_parse(scene_to_svg(s, 80, 40)))
    planned = group.find("*[@class='planned_track']")
    familiar = group.find("*[@class='familiar_track']")
    assert planned.get("stroke-dasharray") == _fmt(GENERIC_DASH_MM)
    assert familiar.get("stroke-dasharray") == _fmt(ROLE_STYLES[Role.FAMILIAR_TRACK].paper.dash_mm)


def test_black_and_white_by_default_colour_on_request():
    svg = scene_to_svg(example_scene(), 120, 90)
    colours = set(re.findall(r'(?:stroke|fill)="(#[0-9a-f]{6})"', svg))
    assert all(c[1:3] == c[3:5] == c[5:7] for c in colours), colours  # greys only
    coloured = scene_to_svg(example_scene(), 120, 90, colour=True)
    assert ROLE_STYLES[Role.PLANNED_TRACK].paper.colour_hex in coloured


def test_filled_sector_is_a_group_with_grey_fill_and_hatch():
    s = Scene([Polygon([(0, 0), (1000, 0), (1000, 1000), (0, 1000)], Role.EXCLUDED_SECTOR)])
    el = _scene_group(_parse(scene_to_svg(s, 60, 60)))[0]
    poly, hatch = list(el)
    assert poly.get("fill") == "#e0e0e0"  # grey 0.88 * 255 = 224 = 0xe0
    assert hatch.tag.endswith("path") and hatch.get("d").count("M") > 5


def test_marker_with_label_and_text_is_escaped():
    s = Scene([Marker((0, 0), Role.OBSTACLE, label="A<B & C"), Label((100, 100), "x > y"),
               Circle((0, 0), 500, Role.PROTECTED_AREA)])
    group = _scene_group(_parse(scene_to_svg(s, 60, 60)))
    obstacle = group.find("*[@class='obstacle']")
    assert [c.tag.split("}")[1] for c in obstacle] == ["polygon", "text"]
    assert obstacle[1].text == "A<B & C"
    assert group.find("*[@class='annotation']").text == "x > y"


def test_decorations_scale_bar_and_north_arrow():
    root = _parse(scene_to_svg(example_scene(), 120, 90))
    deco = root.find("svg:g[@id='decorations']", NS)
    texts = [t.text for t in deco.iter("{http://www.w3.org/2000/svg}text")]
    assert "N" in texts and any(t.endswith(" NM") for t in texts)


def test_fpdf2_embeds_the_svg():
    fpdf = pytest.importorskip("fpdf")
    pdf = fpdf.FPDF(unit="mm", format=(139.7, 215.9))
    pdf.add_page()
    pdf.image(io.BytesIO(scene_to_svg(example_scene(), 120, 90).encode()), x=8, y=8, w=120, h=90)
    assert pdf.output()[:5] == b"%PDF-"


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
    # a 2 NM wide box shown 100 mm wide (no margin): 0.5 NM is the longest round length within
    # 40 % (0.8 NM); 0.5 NM = 25 mm. The bar is tick-bar-tick: 4 points, bar from x=0 to x=25.
    s = Scene([], bounds=Bounds(0.0, 0.0, 2 * NM_TO_M, 2 * NM_TO_M))
    prims = scene_to_primitives(s, (0, 0, 100, 100), margin_mm=0.0)
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
