"""The side view of the sight picture: one Scene (`briefer.render.side_scene`), drawn by the app's
terminal canvas, the PDF card and the text card.

The sight lines' angles are checked against the brief's depression angles (hand-derived: a line
from the runway to an eye h ft up and d NM out is atan(h / d) below the horizon, AIM-style
geometry; the stretch multiplies the heights only). The PDF is read back with pypdf (a reference
reader independent of fpdf2).
"""

from __future__ import annotations

import io
import math

import pytest
from pypdf import PdfReader

from briefer.brief import build_brief
from briefer.brief.demo_case import demo_request
from briefer.render.card import card_pdf_bytes, card_text
from briefer.render.scene import Label, Marker, Polyline, Role
from briefer.render.side_scene import SidePicture, side_picture
from briefer.tui.widgets._side_view import SideView
from briefer.units import FT_TO_M, NM_TO_M


@pytest.fixture(scope="module")
def demo_brief():
    return build_brief(demo_request(), computed_utc="2000-01-01 00:00Z")


def _line(scene, role):
    (line,) = [i for i in scene.items if isinstance(i, Polyline) and i.role is role]
    return line


def _angle_deg(line, stretch):
    (x0, y0), (x1, y1) = line.points
    return math.degrees(math.atan2((y1 - y0) / stretch, x1 - x0))


@pytest.mark.parametrize("size", [(150.0, 30.0, 1.0), (76.0, 9.0, 0.5), (300.0, 20.0, 1.0)],
                         ids=["braille-80-cols", "ascii", "flat-box-stretched"])
def test_sight_lines_make_the_briefs_depression_angles(demo_brief, size):
    w, h, aspect = size
    pic = side_picture(demo_brief)
    k = pic.stretch(w, h, aspect)
    assert isinstance(k, int) and k >= 1
    scene = pic.scene(w, h, aspect)
    s = demo_brief.sight_picture
    assert _angle_deg(_line(scene, Role.PLANNED_TRACK), k) == pytest.approx(s.planned_depression_deg, abs=1e-9)
    assert _angle_deg(_line(scene, Role.FAMILIAR_TRACK), k) == pytest.approx(s.familiar_depression_deg, abs=1e-9)
    # the circling-height line at the brief's height (times the stretch)
    assert _line(scene, Role.CIRCLING_HEIGHT).points[0][1] == pytest.approx(s.circling_height_ft * FT_TO_M * k)
    # the trap sits on the familiar line at circling height
    trap = next(i for i in scene.items if isinstance(i, Marker) and i.label.startswith("trap"))
    assert trap.point[0] == pytest.approx(s.familiar_offset_at_circling_nm * NM_TO_M)
    # every item inside the view
    vp = scene.fit(w, h, aspect)
    for item in scene.items:
        for p in (item.points if isinstance(item, Polyline) else (item.point,)):
            u, v = vp.to_view(*p)
            assert -1e-6 <= u <= w + 1e-6 and -1e-6 <= v <= h + 1e-6, (item, u, v)


def test_heights_are_stretched_by_a_whole_factor_only_when_the_box_is_flat():
    """A 3 NM offset at 500 ft in a 120 x 20 box: at true scale the heights would take
    (500 ft x 1.3 = 198 m) x 120 / (3 NM x 1.22 = 6778 m) = 3.5 of the 20 units, so x5 fills it
    (5 x 3.5 = 17.6 <= 20 < 6 x 3.5)."""
    pic = SidePicture(circling_height_ft=500.0, planned_offset_nm=3.0, familiar_height_ft=500.0,
                      familiar_offset_nm=1.0, familiar_offset_at_circling_nm=1.0)
    assert pic.stretch(120.0, 20.0) == 5
    assert pic.scene(120.0, 20.0).key_note == "heights x5"
    assert pic.stretch(120.0, 2.0) == 1                     # never squashed below true scale
    assert pic.scene(120.0, 2.0).key_note == "heights to scale"


def _words(canvas) -> str:
    return " ".join(canvas.to_text().split())


def test_the_app_the_pdf_and_the_text_card_draw_the_same_scene(demo_brief):
    """The app's widget, the card's detail page and the text card draw the one Scene: the same
    labels on each."""
    widget = SideView(ascii=True)
    widget.brief = demo_brief
    screen = _words(widget.draw(78, 9))
    pdf = " ".join(" ".join(p.extract_text() for p in PdfReader(io.BytesIO(card_pdf_bytes(demo_brief))).pages).split())
    scene = side_picture(demo_brief).scene(100.0, 30.0)
    texts = [i.label for i in scene.items if isinstance(i, Marker)] + [i.text for i in scene.items if isinstance(i, Label)]
    assert texts == ["plan 1.67 NM", "trap 0.74 NM", "usual 1500 ft", "740 ft", "RWY"]
    text_card = card_text(demo_brief)
    for t in texts + ["heights to scale"]:
        assert t in screen, t
        assert t in pdf, t
        assert t in text_card, t


def test_no_plan_draws_no_planned_line():
    pic = SidePicture(circling_height_ft=550.0, planned_offset_nm=math.nan, familiar_height_ft=1500.0,
                      familiar_offset_nm=1.5, familiar_offset_at_circling_nm=0.55)
    scene = pic.scene(150.0, 30.0)
    assert not pic.planned
    assert Role.PLANNED_TRACK not in scene.roles()
    assert not any(isinstance(i, Marker) and i.label.startswith("plan") for i in scene.items)
