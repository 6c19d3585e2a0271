"""The renderer-neutral plan-view scene: items, styles per role, viewport maths, scale bar.

`example_scene()` is the small invented scene the canvas, SVG and benchmark files share: two
thresholds 2.5 km apart on an east-west runway, a protected area of radius 1.7 NM around them, a
not-authorised sector south of the runway, three obstacles, and a circling track.
"""

from __future__ import annotations

import math

import pytest

from briefer.render.scene import (
    ROLE_STYLES,
    SYMBOLS,
    Bounds,
    Circle,
    Label,
    Marker,
    Polygon,
    Polyline,
    Role,
    Scene,
    Viewport,
    hatch_segments,
    north_arrow,
    scale_bar_nm,
    style_of,
)
from briefer.units import NM_TO_M

RUNWAY_LENGTH_M = 2500.0
AREA_RADIUS_NM = 1.7
WEST_THR = (-RUNWAY_LENGTH_M / 2, 0.0)
EAST_THR = (RUNWAY_LENGTH_M / 2, 0.0)


def _arc(cx, cy, r, a0_deg, a1_deg, n):
    """Points on an arc, angles counter-clockwise from east."""
    return [(cx + r * math.cos(math.radians(a0_deg + (a1_deg - a0_deg) * i / n)),
             cy + r * math.sin(math.radians(a0_deg + (a1_deg - a0_deg) * i / n))) for i in range(n + 1)]


def area_boundary(radius_m: float, n: int = 36):
    """Stadium around both thresholds: the hull of two circles (east half round the east one)."""
    return _arc(*EAST_THR, radius_m, -90, 90, n) + _arc(*WEST_THR, radius_m, 90, 270, n)


def planned_track(n: int = 24):
    """Inbound westbound on the runway line, break off north, downwind west, 180° left onto final 09."""
    r = 750.0
    pts = [(5000.0, 0.0), (1800.0, 0.0)]
    pts += [(1000.0, 800.0), (-2500.0, 800.0)]                  # break off and downwind (westbound)
    pts += _arc(-2500.0, 800.0 - r / 2, r / 2, 90, 270, n)[1:]  # tight turn back onto final eastbound
    pts += [(-1250.0, 800.0 - r)]
    return pts


def example_scene(*, n: int = 24) -> Scene:
    """The shared invented example (see the module docstring); `n` points per arc."""
    radius_m = AREA_RADIUS_NM * NM_TO_M
    items = [
        Polyline(area_boundary(radius_m, n), Role.PROTECTED_AREA, closed=True),
        Polygon([(-1500.0, -600.0), (1500.0, -600.0), (1500.0, -radius_m), (-1500.0, -radius_m)],
                Role.EXCLUDED_SECTOR),
        Marker((2200.0, 1900.0), Role.OBSTACLE, label="1240"),
        Marker((-300.0, -1500.0), Role.OBSTACLE),
        Marker((-3500.0, 1200.0), Role.OBSTACLE, label="980"),
        Polyline([(5500.0, 0.0), (1250.0, 0.0)], Role.FINAL_APPROACH),
        Polyline([(-1250.0, 0.0), (1250.0, 0.0), (2500.0, 400.0), (3200.0, 1500.0)],
                 Role.MISSED_APPROACH),
        Polyline(_arc(-2500.0, 0.0, 1500.0, 90, 270, n) + [(-1250.0, -1500.0)], Role.FAMILIAR_TRACK),
        Polyline(planned_track(n), Role.PLANNED_TRACK),
        Marker((-2500.0, 800.0), Role.ROLL_IN, label="roll in"),
        Marker((-2000.0, 25.0), Role.DESCENT_POINT),
        Polyline([WEST_THR, EAST_THR], Role.RUNWAY),
        Marker(WEST_THR, Role.THRESHOLD, label="09"),
        Marker(EAST_THR, Role.THRESHOLD, label="27"),
    ]
    return Scene(items)


# --- items ------------------------------------------------------------------------------------


def test_items_store_plain_float_tuples():
    import numpy as np

    line = Polyline(np.array([[0, 0], [1, 2]]), "planned_track")
    assert line.points == ((0.0, 0.0), (1.0, 2.0))
    assert line.role is Role.PLANNED_TRACK
    assert isinstance(line.points[0][0], float)
    hash(line)  # frozen and hashable


@pytest.mark.parametrize("make", [
    pytest.param(lambda: Polyline([(0, 0)], Role.PLANNED_TRACK), id="polyline-one-point"),
    pytest.param(lambda: Polygon([(0, 0), (1, 1)], Role.EXCLUDED_SECTOR), id="polygon-two-points"),
    pytest.param(lambda: Circle((0, 0), 0.0, Role.PROTECTED_AREA), id="circle-zero-radius"),
    pytest.param(lambda: Marker((0, 0), Role.OBSTACLE, symbol="star"), id="unknown-symbol"),
    pytest.param(lambda: Polyline([(0, 0), (1, 1)], "no_such_role"), id="unknown-role"),
])
def test_invalid_items_raise(make):
    with pytest.raises(ValueError):
        make()


def test_marker_takes_its_roles_symbol():
    assert Marker((0, 0), Role.OBSTACLE).symbol == "triangle"
    assert Marker((0, 0), Role.ROLL_IN).symbol == "ring"
    assert Marker((0, 0), Role.PLANNED_TRACK).symbol == "cross"  # a role without one


def test_label_defaults_to_the_annotation_role():
    assert Label((1, 2), "AREA").role is Role.ANNOTATION


def test_scene_rejects_non_items():
    with pytest.raises(TypeError):
        Scene([((0, 0), (1, 1))])


# --- styles: never colour alone -----------------------------------------------------------------


def test_every_role_has_a_style():
    assert set(ROLE_STYLES) == set(Role)
    assert style_of("runway") is ROLE_STYLES[Role.RUNWAY]


def test_ascii_glyphs_of_drawn_roles_are_distinct():
    """On the ASCII canvas the glyph is the only distinction (no colour, no dash)."""
    drawn = [r for r in Role if r is not Role.ANNOTATION]
    glyphs = [ROLE_STYLES[r].ascii_glyph for r in drawn]
    assert len(set(glyphs)) == len(glyphs)
    assert all(len(g) == 1 and g.isascii() for g in glyphs)


def test_line_roles_differ_without_colour_in_braille_and_on_paper():
    line_roles = [r for r in Role if ROLE_STYLES[r].marker_symbol is None and r is not Role.ANNOTATION]
    braille = [(ROLE_STYLES[r].braille_dash, ROLE_STYLES[r].braille_width_dots) for r in line_roles]
    assert len(set(braille)) == len(braille)
    paper = [(s.dash_mm, s.stroke_width_mm, s.stroke_grey, s.fill_grey)
             for s in (ROLE_STYLES[r].paper for r in line_roles)]
    assert len(set(paper)) == len(paper)


def test_marker_roles_have_distinct_symbols():
    marker_roles = [r for r in Role if ROLE_STYLES[r].marker_symbol is not None]
    symbols = [ROLE_STYLES[r].marker_symbol for r in marker_roles]
    assert len(set(symbols)) == len(symbols)
    assert set(symbols) <= set(SYMBOLS)


def test_paper_dashes_are_single_pairs_for_the_pdf_api():
    """fpdf2's set_dash_pattern takes one (dash, gap) pair."""
    for rs in ROLE_STYLES.values():
        assert rs.paper.dash_mm is None or (len(rs.paper.dash_mm) == 2 and min(rs.paper.dash_mm) > 0)


def test_priorities_runway_over_tracks_over_area():
    p = {r: ROLE_STYLES[r].priority for r in Role}
    assert p[Role.RUNWAY] > p[Role.OBSTACLE] > p[Role.PLANNED_TRACK] > p[Role.FAMILIAR_TRACK]
    assert p[Role.PLANNED_TRACK] > p[Role.EXCLUDED_SECTOR] > p[Role.PROTECTED_AREA]
    assert p[Role.THRESHOLD] > p[Role.RUNWAY]  # threshold marks sit on the runway ends


def test_layers_area_first_runway_last():
    order = example_scene().roles()
    assert order[0] is Role.PROTECTED_AREA
    assert order.index(Role.EXCLUDED_SECTOR) < order.index(Role.OBSTACLE) < order.index(Role.PLANNED_TRACK)
    assert order.index(Role.PLANNED_TRACK) < order.index(Role.RUNWAY)


# --- bounds and fit -----------------------------------------------------------------------------


def test_content_bounds_include_circle_radius():
    s = Scene([Circle((100.0, 50.0), 30.0, Role.PROTECTED_AREA), Marker((0.0, 0.0), Role.OBSTACLE)])
    assert s.content_bounds() == Bounds(0.0, 0.0, 130.0, 80.0)


def test_fit_equal_scale_limited_by_the_tighter_side():
    # a 2000 m x 1000 m box into 100 x 100 units: width limits, 100/2000 = 0.05 units per metre
    s = Scene([Marker((0.0, 0.0), Role.OBSTACLE), Marker((2000.0, 1000.0), Role.OBSTACLE)])
    vp = s.fit(100, 100)
    assert vp.units_per_m == pytest.approx(0.05)
    assert vp.to_view(0.0, 0.0) == pytest.approx((0.0, 75.0))       # y down, centred: 50 + 25
    assert vp.to_view(2000.0, 1000.0) == pytest.approx((100.0, 25.0))


def test_fit_with_aspect_half_doubles_height_room():
    # 1000 m square into 100 x 25 cells of aspect 0.5: height limits, 25 / (1000 * 0.5) = 0.05
    s = Scene([Marker((0.0, 0.0), Role.OBSTACLE), Marker((1000.0, 1000.0), Role.OBSTACLE)])
    vp = s.fit(100, 25, aspect=0.5)
    assert vp.units_per_m == pytest.approx(0.05)
    u0, v0 = vp.to_view(0.0, 0.0)
    u1, v1 = vp.to_view(1000.0, 1000.0)
    assert (u1 - u0) == pytest.approx(2 * (v0 - v1))  # 50 across, 25 down: square on screen


def test_fit_margin_and_explicit_bounds():
    s = Scene([Marker((0.0, 0.0), Role.OBSTACLE)], bounds=Bounds(-500.0, -500.0, 500.0, 500.0))
    vp = s.fit(120, 120, margin=10)
    assert vp.units_per_m == pytest.approx(0.1)  # (120 - 2*10) / 1000
    assert vp.to_view(-500.0, 500.0) == pytest.approx((10.0, 10.0))


def test_fit_empty_and_single_point_scenes_do_not_divide_by_zero():
    for s in (Scene([]), Scene([Marker((5.0, 5.0), Role.OBSTACLE)])):
        vp = s.fit(50, 20)
        assert math.isfinite(vp.units_per_m) and vp.units_per_m > 0


def test_rotated_view_puts_the_chosen_track_up():
    # view up = 090° true: a point east of the centre appears above it, north appears to the left
    s = Scene([Marker((-1000.0, -1000.0), Role.OBSTACLE), Marker((1000.0, 1000.0), Role.OBSTACLE)],
              north_up=False, up_track_deg_true=90.0)
    vp = s.fit(100, 100)
    cu, cv = vp.to_view(0.0, 0.0)
    eu, ev = vp.to_view(500.0, 0.0)
    nu, nv = vp.to_view(0.0, 500.0)
    assert eu == pytest.approx(cu) and ev < cv
    assert nv == pytest.approx(cv) and nu < cu
    assert north_arrow(s.up_deg_true).glyph == "←"


def test_to_world_inverts_to_view():
    vp = Viewport(centre_x_m=100.0, centre_y_m=-40.0, units_per_m=0.07, width=96, height=84,
                  aspect=0.5, up_deg_true=33.0)
    for x, y in [(0.0, 0.0), (1234.0, -987.0), (-50.0, 400.0)]:
        assert vp.to_world(*vp.to_view(x, y)) == pytest.approx((x, y))
    assert vp.points_to_view([(1234.0, -987.0)])[0] == pytest.approx(vp.to_view(1234.0, -987.0))


def test_example_scene_fits_with_the_area_round():
    s = example_scene()
    b = s.content_bounds()
    radius_m = AREA_RADIUS_NM * NM_TO_M
    assert b.y_max_m == pytest.approx(radius_m)
    assert b.x_max_m == pytest.approx(5500.0)  # the final approach line reaches out east


# --- scale bar, north arrow, hatch --------------------------------------------------------------


@pytest.mark.parametrize("view_width_m, expected_nm", [
    # longest of 0.1/0.25/0.5/1/2/5/10 NM within 40 % of the width (hand-derived)
    pytest.param(2 * NM_TO_M, 0.5, id="2NM-wide->0.5"),      # 0.8 NM room
    pytest.param(2.5 * NM_TO_M, 1.0, id="2.5NM-wide->1"),    # exactly 1.0 NM room
    pytest.param(6 * NM_TO_M, 2.0, id="6NM-wide->2"),        # 2.4 NM room
    pytest.param(0.2 * NM_TO_M, 0.1, id="tiny->shortest"),   # 0.08 NM room: nothing fits
    pytest.param(100 * NM_TO_M, 10.0, id="huge->longest"),
])
def test_scale_bar_nm_picks_a_round_length(view_width_m, expected_nm):
    assert scale_bar_nm(view_width_m) == expected_nm


def test_scale_bar_nm_rejects_zero_width():
    with pytest.raises(ValueError):
        scale_bar_nm(0.0)


@pytest.mark.parametrize("up_deg, glyph, ascii_glyph", [
    pytest.param(0.0, "↑", "^", id="north-up"),
    pytest.param(180.0, "↓", "v", id="south-up"),
    pytest.param(270.0, "→", ">", id="west-up"),
    pytest.param(45.0, "↖", "\\", id="northeast-up"),
])
def test_north_arrow(up_deg, glyph, ascii_glyph):
    a = north_arrow(up_deg)
    assert (a.glyph, a.ascii_glyph) == (glyph, ascii_glyph)
    assert a.text() == "N" + glyph


def test_hatch_of_a_square_is_clipped_and_spaced():
    # 10 x 10 square, horizontal hatch (angle 0) every 2.5: lines at y = 1.25, 3.75, 6.25, 8.75
    segs = hatch_segments([(0, 0), (10, 0), (10, 10), (0, 10)], 2.5, angle_deg=0.0)
    assert [round(a[1], 6) for a, _ in segs] == [1.25, 3.75, 6.25, 8.75]
    for a, b in segs:
        assert (a[0], b[0]) == pytest.approx((0.0, 10.0))


def test_hatch_45_stays_inside_a_concave_polygon():
    # an L shape; every hatch segment's midpoint must be inside it
    poly = [(0, 0), (10, 0), (10, 4), (4, 4), (4, 10), (0, 10)]
    segs = hatch_segments(poly, 1.0)
    assert segs

    def inside(x, y):
        return (0 <= x <= 10 and 0 <= y <= 4) or (0 <= x <= 4 and 0 <= y <= 10)

    for (x0, y0), (x1, y1) in segs:
        assert inside((x0 + x1) / 2, (y0 + y1) / 2)
