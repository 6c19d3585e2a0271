"""Terminal canvases (braille and ASCII) and the plan-view drawing on them.

Expected drawings are hand-derived: braille cell = U+2800 + bits, with dot (col, row) bits
row0: 0x01 0x08, row1: 0x02 0x10, row2: 0x04 0x20, row3: 0x40 0x80 (Unicode braille patterns).
"""

from __future__ import annotations

import io
import subprocess
import sys

import pytest
from rich.console import Console

from briefer.render.canvas import AsciiCanvas, BrailleCanvas, lit_dots
from briefer.render.planview import (
    braille_supported,
    draw_scene,
    legend,
    render_plan,
    scale_bar_text,
)
from briefer.render.scene import (
    ROLE_STYLES,
    Bounds,
    Circle,
    Label,
    Marker,
    Polyline,
    Role,
    Scene,
)
from briefer.units import NM_TO_M

try:  # the shared example scene (tests/ is not a package)
    from tests.test_scene import example_scene
except ImportError:  # pragma: no cover - plain `pytest` puts tests/ itself on sys.path
    from test_scene import example_scene


def _rich_text(renderable, width=80, **kw) -> str:
    console = Console(file=io.StringIO(), width=width, color_system=None, **kw)
    console.print(renderable)
    return console.file.getvalue()


def extent(canvas):
    xs, ys = zip(*lit_dots(canvas))
    return max(xs) - min(xs), max(ys) - min(ys)


# --- braille: exact tiny drawings ---------------------------------------------------------------


@pytest.mark.parametrize("cols, rows, draw, expected", [
    # top dot row of two cells: (0x01|0x08) = 0x09 twice
    pytest.param(2, 1, lambda c: c.line(0, 0, 3, 0), "⠉⠉", id="horizontal"),
    # left dot column of one cell: 0x01|0x02|0x04|0x40 = 0x47
    pytest.param(1, 1, lambda c: c.line(0, 0, 0, 3), "⡇", id="vertical"),
    # (0,0)+(1,1) = 0x01|0x10 = 0x11; (2,2)+(3,3) = 0x04|0x80 = 0x84
    pytest.param(2, 1, lambda c: c.line(0, 0, 3, 3), "⠑⢄", id="diagonal"),
    # a 4 x 8 dot rectangle: 0x4F 0xB9 / 0xC7 0xF8 (corners counted once)
    pytest.param(2, 2, lambda c: c.polygon([(0, 0), (3, 0), (3, 7), (0, 7)]), "⡏⢹\n⣇⣸", id="rectangle"),
    # one dot, then blanks are spaces (not U+2800), stripped at line end
    pytest.param(3, 1, lambda c: c.dot(0, 0), "⠁", id="single-dot"),
    # off-canvas parts are dropped: only (1,0) of the line lands
    pytest.param(1, 1, lambda c: c.line(1, 0, 9, 0), "⠈", id="clipped"),
])
def test_braille_tiny_drawings(cols, rows, draw, expected):
    c = BrailleCanvas(cols, rows)
    draw(c)
    assert c.to_text() == expected


def test_braille_empty_cells_are_spaces_not_blank_pattern():
    c = BrailleCanvas(4, 2)
    c.dot(0, 0)
    assert c.to_lines() == ["⠁   ", "    "]
    assert "\u2800" not in "".join(c.to_lines())


def test_braille_crossing_dots_are_ored_and_higher_priority_owns_the_cell():
    # horizontal dot row 1 (0x02|0x10) OR left column (0x47) = 0x57
    c = BrailleCanvas(1, 1)
    c.line(0, 1, 1, 1, Role.PLANNED_TRACK)
    c.line(0, 0, 0, 3, Role.FAMILIAR_TRACK, dash=None)
    assert c.to_text() == "⡗"
    assert c.role_at(0, 0) is Role.PLANNED_TRACK  # drawn first, still owns the cell's style


def test_braille_runway_wins_whatever_the_order():
    for first, second in [(Role.RUNWAY, Role.PLANNED_TRACK), (Role.PLANNED_TRACK, Role.RUNWAY)]:
        c = BrailleCanvas(4, 2)
        c.line(0, 3, 7, 3, first)
        c.line(0, 3, 7, 3, second)
        assert {c.role_at(col, 0) for col in range(4)} == {Role.RUNWAY}


def test_braille_dash_pattern_runs_on():
    # (on 2, off 2) along 8 dots of the top row: dots 0,1 and 4,5 -> 0x09, blank, 0x09, blank
    c = BrailleCanvas(4, 1)
    c.line(0, 0, 7, 0, dash=(2, 2))
    assert c.to_lines() == ["⠉ ⠉ "]


def test_braille_runway_is_three_dots_wide():
    # rows 1, 2, 3 of a cell: 0x02|0x04|0x40 + 0x10|0x20|0x80 = 0xF6
    c = BrailleCanvas(2, 1)
    c.line(0, 2, 3, 2, Role.RUNWAY)
    assert c.to_text() == "⣶⣶"


def test_glyph_respects_priority():
    c = BrailleCanvas(3, 1)
    c.glyph(2, 0, "^", Role.OBSTACLE)
    c.line(0, 0, 5, 0, Role.PLANNED_TRACK)      # lower: the obstacle stays
    assert c.to_lines()[0][1] == "^"
    c.line(0, 0, 5, 0, Role.RUNWAY)             # higher: the runway uncovers the cell
    assert c.to_lines()[0][1] != "^"


# --- equal aspect -------------------------------------------------------------------------------


def test_braille_circle_is_as_wide_as_tall():
    c = BrailleCanvas(21, 11)
    c.circle(20, 20, 10)
    assert extent(c) == (20, 20)


def test_ascii_circle_is_twice_as_many_cells_wide_as_tall():
    # one dot per cell, cells about 1:2, so a round circle is 20 cells across and 10 rows down
    c = AsciiCanvas(31, 13)
    c.circle(15, 6, 10)
    assert extent(c) == (20, 10)


@pytest.mark.parametrize("ascii", [False, True], ids=["braille", "ascii"])
def test_world_circle_stays_round_through_the_viewport(ascii):
    s = Scene([Circle((0.0, 0.0), 1000.0, Role.PROTECTED_AREA)])
    c = render_plan(s, 40, 20, ascii=ascii)
    # decorations are text, not dots, so only the circle is lit
    w, h = extent(c)
    assert w == pytest.approx(h / c.aspect, abs=1)


# --- ASCII: the same API ------------------------------------------------------------------------


def test_ascii_has_the_same_drawing_api():
    api = ["dot", "line", "polyline", "circle", "polygon", "glyph", "text", "to_lines", "to_text",
           "fit", "lit", "__rich_console__", "__rich_measure__"]
    for name in api:
        assert callable(getattr(AsciiCanvas(2, 2), name)), name
        assert callable(getattr(BrailleCanvas(2, 2), name)), name


def test_ascii_tiny_drawings():
    c = AsciiCanvas(5, 3)
    c.polygon([(0, 0), (4, 0), (4, 2), (0, 2)], Role.PROTECTED_AREA)
    assert c.to_lines() == [".....", ".   .", "....."]
    c = AsciiCanvas(5, 1)
    c.line(0, 0, 4, 0)
    assert c.to_text() == "*****"  # no role: the default glyph


def test_ascii_higher_priority_glyph_wins_a_crossing():
    c = AsciiCanvas(5, 5)
    c.line(2, 0, 2, 4, Role.RUNWAY)
    c.line(0, 2, 4, 2, Role.PLANNED_TRACK)
    assert c.to_lines() == ["  #  ", "  #  ", "**#**", "  #  ", "  #  "]


def test_ascii_hatch_fill_never_covers_a_line():
    c = AsciiCanvas(12, 6)
    c.line(0, 3, 11, 3, Role.FAMILIAR_TRACK)
    c.polygon([(1, 1), (10, 1), (10, 5), (1, 5)], Role.EXCLUDED_SECTOR, fill=True)
    rows = c.to_lines()
    assert "/" in rows[2] + rows[4]                 # hatched inside
    assert rows[3][2:10] == "oooooooo"              # the track crossing the sector stays visible


@pytest.mark.parametrize("role", [r for r in Role if r is not Role.ANNOTATION])
def test_each_role_draws_with_its_own_glyph(role):
    c = AsciiCanvas(6, 1)
    c.line(0, 0, 5, 0, role)
    assert c.to_text() == ROLE_STYLES[role].ascii_glyph * 6


def test_line_roles_look_different_in_braille_without_colour():
    lines = [r for r in Role if ROLE_STYLES[r].marker_symbol is None and r is not Role.ANNOTATION]
    samples = {}
    for role in lines:
        c = BrailleCanvas(12, 1)
        c.line(0, 1, 23, 1, role)
        samples[role] = c.to_text()
    assert len(set(samples.values())) == len(lines), samples


# --- Rich rendering -----------------------------------------------------------------------------


@pytest.mark.parametrize("make", [BrailleCanvas, AsciiCanvas], ids=["braille", "ascii"])
def test_rich_plain_render_equals_to_lines(make):
    c = make(30, 6)
    draw_scene(c, example_scene())
    out = _rich_text(c)
    assert out.splitlines() == c.to_lines()


def test_rich_segments_merge_runs_of_equal_style():
    c = BrailleCanvas(10, 1)
    c.line(0, 0, 9, 0, Role.PLANNED_TRACK)
    c.line(10, 0, 19, 0, Role.PROTECTED_AREA)
    console = Console(file=io.StringIO(), width=80, color_system=None)
    segs = list(console.render(c))
    # the area's (on 1, off 1) pattern lights the even dots 10, 12, ..., 18: 0x01 per cell
    assert [s.text for s in segs] == ["⠉⠉⠉⠉⠉", "⠁⠁⠁⠁⠁", "\n"]
    row = [s for s in segs if s.text != "\n"]
    assert all(a.style != b.style for a, b in zip(row, row[1:]))


def test_rich_output_crops_to_the_console_width():
    c = AsciiCanvas(30, 2)
    c.line(0, 0, 29, 0, Role.RUNWAY)
    assert _rich_text(c, width=10).splitlines()[0] == "#" * 10


def test_bold_survives_no_color():
    """NO_COLOR drops colour but keeps bold: the runway stays bold, the area stays dim."""
    c = AsciiCanvas(4, 2)
    c.line(0, 0, 3, 0, Role.RUNWAY)
    c.line(0, 1, 3, 1, Role.PROTECTED_AREA)
    console = Console(file=io.StringIO(), width=20, force_terminal=True, no_color=True,
                      color_system="truecolor")
    segs = [s for s in console.render(c) if s.text.strip()]
    console.print(c)
    out = console.file.getvalue()
    assert "\x1b[1m" in out and "\x1b[2m" in out
    assert "38;2" not in out  # no colour
    assert segs[0].style.bold and segs[1].style.dim


def test_canvas_measures_its_width():
    console = Console(file=io.StringIO(), width=80)
    from rich.measure import Measurement

    assert Measurement.get(console, console.options, BrailleCanvas(37, 3)) == Measurement(37, 37)


# --- the plan view ------------------------------------------------------------------------------


def test_draw_scene_layers_and_priorities_exact():
    """Runway across the middle, the area's box around it, an obstacle on the box's top edge.

    Viewport, hand-derived: 11 x 5 cells give dots 0..10 x 0..4; margin 1 leaves 8 x 2; bounds
    8 m x 4 m at aspect 0.5 give min(8/8, 2/(4*0.5)) = 1 dot per metre; centre (0, 0) at (5, 2).
    Runway x -4..4 -> cols 1..9 on row 2; box y +-2 -> rows 1 and 3; the obstacle (0, 2) -> (5, 1).
    Items are given runway first: the layer order still draws the area first.
    """
    s = Scene([
        Polyline([(-4.0, 0.0), (4.0, 0.0)], Role.RUNWAY),
        Marker((0.0, 2.0), Role.OBSTACLE),
        Polyline([(-4.0, -2.0), (4.0, -2.0), (4.0, 2.0), (-4.0, 2.0)], Role.PROTECTED_AREA, closed=True),
    ], bounds=Bounds(-4.0, -2.0, 4.0, 2.0))
    c = AsciiCanvas(11, 5)
    draw_scene(c, s, decorations=False)
    assert c.to_lines() == [
        "           ",
        " ....^.... ",
        " ######### ",
        " ......... ",
        "           ",
    ]


def test_render_plan_sizes_and_kinds():
    s = example_scene()
    b = render_plan(s, 48, 20)
    a = render_plan(s, 48, 20, ascii=True)
    assert isinstance(b, BrailleCanvas) and isinstance(a, AsciiCanvas)
    for c in (a, b):
        lines = c.to_lines()
        assert len(lines) == 20 and all(len(line) == 48 for line in lines)
    assert "#" in a.to_text() and "*" in a.to_text() and "." in a.to_text()
    assert not any("\u2800" <= ch <= "\u28ff" for ch in a.to_text())  # no braille in ASCII


def test_north_arrow_top_right_and_scale_bar_bottom_left():
    b = render_plan(example_scene(), 48, 20).to_lines()
    a = render_plan(example_scene(), 48, 20, ascii=True).to_lines()
    assert b[0].endswith("N↑") and a[0].endswith("N^")
    assert b[-1].startswith("├") and "┤ " in b[-1] and b[-1].rstrip().endswith(" NM")
    assert a[-1].startswith("|-") and a[-1].rstrip().endswith(" NM")


def test_scale_bar_length_matches_the_scale():
    s = Scene([Marker((0.0, 0.0), Role.OBSTACLE), Marker((3 * NM_TO_M, 0.0), Role.OBSTACLE)])
    c = BrailleCanvas(40, 10)
    vp = draw_scene(c, s)
    bar = scale_bar_text(vp, c)
    n = bar.index(" ")
    length_nm = float(bar.split()[-2])
    # n cells of 2 dots: within half a cell of the chosen length
    assert abs(n * 2 * vp.metres_per_unit - length_nm * NM_TO_M) <= vp.metres_per_unit
    assert bar == scale_bar_text(vp, c, 1.0)  # 3 NM wide view: 1 NM is the longest within 40 %


def test_scale_hint_overrides_the_choice():
    s = Scene([Circle((0.0, 0.0), 3000.0, Role.PROTECTED_AREA)], scale_hint_nm=0.5)
    assert render_plan(s, 60, 20).to_lines()[-1].startswith("├────┤ 0.5 NM ")


def test_marker_labels_sit_beside_the_marker_and_labels_centre():
    s = Scene([Marker((0.0, 0.0), Role.OBSTACLE, label="1240"),
               Label((0.0, -500.0), "AREA"),
               Circle((0.0, 0.0), 1000.0, Role.PROTECTED_AREA)])
    lines = render_plan(s, 40, 16, ascii=True).to_lines()
    assert any("^1240" in line for line in lines)
    assert any("AREA" in line for line in lines)


def test_dashed_item_is_drawn_dashed():
    solid = Scene([Polyline([(0.0, 0.0), (1000.0, 0.0)], Role.PLANNED_TRACK)])
    dashed = Scene([Polyline([(0.0, 0.0), (1000.0, 0.0)], Role.PLANNED_TRACK, dashed=True)])
    for ascii in (False, True):
        a = render_plan(solid, 20, 3, ascii=ascii)
        b = render_plan(dashed, 20, 3, ascii=ascii)
        assert len(list(lit_dots(b))) < len(list(lit_dots(a)))


def test_empty_scene_draws_only_decorations():
    c = render_plan(Scene([]), 30, 6, ascii=True)
    assert c.to_lines()[0].endswith("N^")
    assert list(lit_dots(c))  # the text counts as drawn in ASCII
    assert len(render_plan(Scene([]), 1, 1).to_lines()[0]) == 1  # tiny canvas: clipped, no error


def test_legend_samples_use_the_canvas_drawing():
    entries = legend(example_scene(), ascii=True)
    by_role = {e.role: e for e in entries}
    assert by_role[Role.RUNWAY].sample == "###"
    assert by_role[Role.OBSTACLE].sample.strip() == "^"
    assert Role.ANNOTATION not in by_role
    assert [e.role for e in entries] == [r for r in example_scene().roles() if r is not Role.ANNOTATION]
    assert all(len(e.sample) == 3 for e in legend(example_scene()))


@pytest.mark.parametrize("env, expected", [
    pytest.param({"TERM": "xterm-256color"}, True, id="xterm"),
    pytest.param({"TERM": "tmux-256color"}, True, id="tmux"),
    pytest.param({"TERM": "linux"}, False, id="linux-console"),
    pytest.param({"TERM": "linux-16color"}, False, id="linux-16color"),
    pytest.param({"TERM": "vt100"}, False, id="vt100"),
    pytest.param({"TERM": "vt220"}, False, id="vt220"),
    pytest.param({"TERM": "dumb"}, False, id="dumb"),
    pytest.param({}, True, id="no-term"),
    pytest.param({"TERM": "xterm-256color", "BRIEFER_ASCII": "1"}, False, id="forced-ascii"),
    pytest.param({"TERM": "xterm-256color", "BRIEFER_ASCII": "0"}, True, id="ascii-0-is-off"),
])
def test_braille_supported(env, expected):
    assert braille_supported(env) is expected


def test_render_modules_import_no_ui_or_pdf_library():
    code = ("import sys, briefer.render.scene, briefer.render.canvas, briefer.render.planview, "
            "briefer.render.paper; print(sorted(m for m in ('textual', 'fpdf', 'rich') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip() == "[]"
