"""Plan-view labels never sit on a label, the planned track, the runway or a marker: on the
app's braille and ASCII canvas at 80x24 and 120x40 and on the card's front page, for every demo
profile, airfield, approach and landing runway (calm and a strong crosswind). Checked against
drawings made without the labels, not against the placement's own bookkeeping."""

from __future__ import annotations

import pytest
from test_golden_briefs import demo_cases

from briefer.brief import build_brief
from briefer.render.brief_scene import scene_from_brief
from briefer.render.canvas import AsciiCanvas, BrailleCanvas
from briefer.render.card_layout import card_layout
from briefer.render.planview import draw_scene, render_plan
from briefer.render.scene import Label, Marker, Role, Scene

APP_PLAN_CELLS = {(80, 24): (43, 13), (120, 40): (83, 31)}
"""The plan view's size in cells in the app at these terminal sizes (checked by
test_app_plan_view_sizes below)."""
KEEP_CLEAR = (Role.PLANNED_TRACK, Role.RUNWAY, Role.THRESHOLD, Role.OBSTACLE, Role.ROLL_IN, Role.DESCENT_POINT,
              Role.MISSED_APPROACH)
WEATHERS = ("calm", "crosswind-right-35")


@pytest.fixture(scope="module")
def briefs():
    return [(label, build_brief(req, computed_utc="2000-01-01 00:00Z"))
            for label, req in demo_cases() if label.rsplit("/", 1)[1] in WEATHERS]


def _only(scene: Scene, roles) -> Scene:
    """The scene with only these roles' items, labels stripped."""
    out = []
    for item in scene.items:
        if isinstance(item, Label) or item.role not in roles:
            continue
        if isinstance(item, Marker):
            item = Marker(item.point, item.role, item.symbol)
        out.append(item)
    return Scene(items=tuple(out), bounds=scene.bounds, north_up=scene.north_up,
                 up_track_deg_true=scene.up_track_deg_true)


def _drawn_cells(scene: Scene, cols: int, rows: int, ascii: bool, vp) -> set[tuple[int, int]]:
    canvas = AsciiCanvas(cols, rows) if ascii else BrailleCanvas(cols, rows)
    draw_scene(canvas, scene, viewport=vp, decorations=False)
    return {(c, r) for r in range(rows) for c in range(cols) if canvas.role_at(c, r) is not None}


@pytest.mark.parametrize("ascii", [False, True], ids=["braille", "ascii"])
@pytest.mark.parametrize("term", sorted(APP_PLAN_CELLS), ids=lambda t: f"{t[0]}x{t[1]}")
def test_canvas_labels_clear_of_each_other_the_track_runway_and_markers(briefs, term, ascii):
    cols, rows = APP_PLAN_CELLS[term]
    placed_total = 0
    for label, brief in briefs:
        scene = scene_from_brief(brief)
        canvas = render_plan(scene, cols, rows, ascii=ascii)
        boxes = canvas.label_boxes
        cells = [(c + i, r) for c, r, n in boxes for i in range(n)]
        assert len(cells) == len(set(cells)), (label, boxes)          # no two labels overlap
        vp = canvas.fit(scene)
        clear = _drawn_cells(_only(scene, KEEP_CLEAR), cols, rows, ascii, vp)
        assert not set(cells) & clear, (label, sorted(set(cells) & clear))
        for c, r, n in boxes:
            assert 0 <= c and c + n <= cols and 0 <= r < rows
        texts = sorted(canvas.to_lines()[r][c:c + n] for c, r, n in boxes)
        wanted = sorted(i.label if isinstance(i, Marker) else i.text for i in scene.items
                        if isinstance(i, Label) or (isinstance(i, Marker) and i.label))
        assert sorted(texts + list(canvas.dropped_labels)) == wanted, label   # shown or said dropped
        placed_total += len(boxes)
    assert placed_total > 0


def _segments_hit_box(points, closed, box, pad):
    """Whether a polyline comes within `pad` of a box (sampled every 0.05 mm)."""
    x0, y0, x1, y1 = box[0] - pad, box[1] - pad, box[2] + pad, box[3] + pad
    pts = list(points) + ([points[0]] if closed else [])
    for (ax, ay), (bx, by) in zip(pts, pts[1:]):
        n = max(1, int(((bx - ax) ** 2 + (by - ay) ** 2) ** 0.5 / 0.05))
        for k in range(n + 1):
            x, y = ax + (bx - ax) * k / n, ay + (by - ay) * k / n
            if x0 < x < x1 and y0 < y < y1:
                return True
    return False


@pytest.mark.parametrize("page", ["half-letter", "a5"])
def test_card_labels_clear_of_each_other_the_track_runway_and_markers(briefs, page):
    from briefer.render.pdf import _measure, CardPainter, front_plan  # noqa: F401
    from briefer.render.paper import LinePrim, PolygonPrim, CirclePrim, TextPrim

    subset = briefs if page == "half-letter" else [b for b in briefs if "/calm" in b[0]]
    for label, brief in subset:
        layout = card_layout(brief)
        box, prims, dropped = front_plan(layout, page=page)
        texts = [p for p in prims if isinstance(p, TextPrim) and p.item is not None]
        # the label's box from its baseline: the glyphs' top (0.74 em) to below the baseline (0.2 em)
        from fpdf import FPDF

        pdf = FPDF(unit="mm")
        pdf.set_font("Helvetica", "", texts[0].size_mm * pdf.k if texts else 7)
        tboxes = []
        for p in texts:
            w = pdf.get_string_width(p.text)
            x = p.point_mm[0] - {"start": 0.0, "middle": w / 2, "end": w}[p.anchor]
            tboxes.append((x, p.point_mm[1] - p.size_mm * 0.72, x + w, p.point_mm[1] + p.size_mm * 0.2))
        for i, a in enumerate(tboxes):
            for b in tboxes[i + 1:]:
                assert not (a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]), (label, a, b)
            bx, by, bw, bh = box
            assert bx <= a[0] and a[2] <= bx + bw and by <= a[1] and a[3] <= by + bh, (label, a)
        for p in prims:
            if p.item is None or isinstance(p, TextPrim) or Role(p.style) not in KEEP_CLEAR:
                continue
            if isinstance(p, CirclePrim):
                (cx, cy), r = p.centre_mm, p.radius_mm
                pts, closed = [(cx - r, cy - r), (cx + r, cy - r), (cx + r, cy + r), (cx - r, cy + r)], True
            else:
                pts, closed = list(p.points_mm), isinstance(p, PolygonPrim) or getattr(p, "closed", False)
            for t, tb in zip(texts, tboxes):
                assert not _segments_hit_box(pts, closed, tb, 0.0), (label, page, t.text, Role(p.style))
        drawn = {p.item for p in prims if p.item is not None and not isinstance(p, TextPrim)}
        wanted = sorted(i.label if isinstance(i, Marker) else i.text for k, i in enumerate(layout.plan_view.items)
                        if isinstance(i, Label) or (isinstance(i, Marker) and i.label and k in drawn))
        assert sorted([t.text for t in texts] + list(dropped)) == wanted, label   # shown or said dropped


async def test_app_plan_view_sizes():
    """The canvas sizes the checks above use are the app's own at 80x24 and 120x40."""
    from test_app_support import demo_catalog, demo_inputs, settle

    from briefer.tui.app import BriefingApp
    from briefer.tui.widgets import PlanCanvas

    for term, cells in APP_PLAN_CELLS.items():
        app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01)
        async with app.run_test(size=term) as pilot:
            await settle(app, pilot)
            await pilot.press("6")
            await pilot.pause(0.2)
            size = app.main.query_one(PlanCanvas).size
            assert (size.width, size.height) == cells, term
