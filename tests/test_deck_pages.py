"""The instructor deck's pages: the student page gives nothing away, and every plan view fits its
frame with the scale bar clear (checked on the scene and on the PDF drawn from it)."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from briefer.render.scene import Role
from briefer.instructor.deck import build_deck
from briefer.render.deck_pdf import chart_scene


@pytest.fixture(scope="module")
def deck():
    return build_deck(count=2, seed=11, airfields=["V2RL", "Q7HM"], profiles=["demo-bizjet", "demo-trainer"])


def _with_area_scaled(case, k: float):
    """The same case with the answer's protected area (and its clipped sectors) k times larger:
    what the category would do to it."""
    a = case.brief.area
    c = np.asarray(a.centres_xy_m, dtype=float).reshape(-1, 2).mean(axis=0)

    def scale(arr):
        arr = np.asarray(arr, dtype=float).reshape(-1, 2)
        return c + (arr - c) * k

    area = replace(a, radius_nm=a.radius_nm * k, boundary_xy_m=scale(a.boundary_xy_m),
                   sectors_xy_m=tuple(scale(p) for p in a.sectors_xy_m))
    return replace(case, brief=replace(case.brief, area=area))


def test_student_chart_does_not_depend_on_the_answers_area(deck):
    """The student page's chart is the same whatever the protected area's radius (the answer to
    one of its questions): no area, no sector clipped at its radius, no frame sized by it."""
    for case in deck.cases:
        chart = chart_scene(case)
        assert Role.PROTECTED_AREA not in chart.roles()
        for k in (0.6, 1.7):
            assert chart_scene(_with_area_scaled(case, k)) == chart


def test_student_chart_frame_holds_every_obstacle_with_a_margin(deck):
    from briefer.units import NM_TO_M

    for case in deck.cases:
        chart = chart_scene(case)
        b = chart.bounds
        for ob in case.brief.obstacles:
            x, y = np.asarray(ob.xy_m, dtype=float).reshape(-1, 2)[0]
            assert b.x_min_m + 0.5 * NM_TO_M <= x <= b.x_max_m - 0.5 * NM_TO_M
            assert b.y_min_m + 0.5 * NM_TO_M <= y <= b.y_max_m - 0.5 * NM_TO_M


def _plan_checks(box, prims, scene):
    """Markers whole inside the drawing (above the key strip), the scale bar and the north arrow
    in the key strip below it, where nothing of the drawing is painted (the drawing is clipped
    to its own height)."""
    from briefer.render.scene import Marker
    from briefer.render.paper import MARKER_SIZE_MM, LinePrim, TextPrim, drawing_height

    bx, by, bw, bh = box
    bottom = by + drawing_height(bh)
    assert bh - (bottom - by) >= 5.0                               # a key strip of its own
    for p in prims:
        if p.item is not None and isinstance(scene.items[p.item], Marker) and not isinstance(p, TextPrim):
            pts = p.points_mm if hasattr(p, "points_mm") else (p.centre_mm,)
            for x, y in pts:
                assert bx < x < bx + bw and by < y < bottom, (scene.items[p.item], x, y)
    key = [p for p in prims if p.item is None and not (isinstance(p, LinePrim) and p.closed)]
    texts = [p for p in key if isinstance(p, TextPrim)]
    assert {t.text for t in texts} >= {"N"} and any(t.text.endswith("NM") for t in texts)
    for p in key:
        pts = p.points_mm if hasattr(p, "points_mm") else (p.point_mm,)
        for x, y in pts:
            assert y >= bottom - 1e-6, (p, bottom)                  # in the strip, not on the drawing
    for t in texts:
        assert t.point_mm[1] - t.size_mm * 0.74 >= bottom, t
    assert MARKER_SIZE_MM > 0


def test_plan_views_fit_their_frames_and_keep_the_key_clear(deck):
    from fpdf import FPDF

    from briefer.render.card_layout import card_layout
    from briefer.render.pdf import CardPainter, front_plan
    from briefer.render.paper import scene_to_primitives

    for case in deck.cases:
        for page in ("half-letter", "a5"):
            layout = card_layout(case.brief)
            box, prims, _ = front_plan(layout, page=page)
            _plan_checks(box, prims, layout.plan_view)
        chart = chart_scene(case)
        box = (6.0, 40.0, 127.0, 70.0)
        pdf = FPDF(unit="mm")
        pdf.add_page()
        painter = CardPainter(pdf, replace(card_layout(case.brief), plan_view=chart), 139.7, 215.9)
        _plan_checks(box, painter.plan_prims(box), chart)
        assert scene_to_primitives(chart, box)
