"""A side view of the sight picture: the eye at circling height, the horizon, and the two sight
lines down to the runway: at the planned offset, and at the familiar pattern's angle."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from rich.text import Text
from textual.reactive import reactive
from textual.widget import Widget

if TYPE_CHECKING:        # the drawing code is imported when the first brief is drawn
    from briefer.render.canvas import Canvas
    from briefer.result import Brief

LABEL_COLS = 4


class SideView(Widget):
    """Side view drawn at the widget's size. Heights are stretched by a whole factor (shown on
    the drawing) so that the lines stand apart; distances are to scale."""

    ascii: reactive[bool] = reactive(False)

    def __init__(self, *, ascii: bool = False, id: str | None = None) -> None:
        super().__init__(id=id)
        self.set_reactive(SideView.ascii, ascii)
        self.brief: Brief | None = None

    def show(self, brief: Brief) -> None:
        self.brief = brief
        self.refresh()

    def draw(self, cols: int, rows: int) -> Canvas:
        from briefer import units
        from briefer.render.canvas import AsciiCanvas, BrailleCanvas
        from briefer.render.scene import Role

        s = self.brief.sight_picture  # type: ignore[union-attr]
        canvas: Canvas = AsciiCanvas(cols, rows) if self.ascii else BrailleCanvas(cols, rows)
        dx, dy = canvas.dots_per_cell
        x_eye, y_eye = LABEL_COLS * dx, dy + dy // 2          # the eye sits on row 1
        y_ground_max = (rows - 2) * dy + dy // 2              # the last row holds distances
        d_plan, d_fam = s.planned_offset_nm, s.familiar_offset_at_circling_nm
        finite = [d for d in (d_plan, d_fam) if math.isfinite(d) and d > 0]
        d_max = max(finite) * 1.12 if finite else 1.0
        k = (canvas.w - 1 - x_eye) / d_max                    # dots per NM across
        height_nm = s.circling_height_ft / units.NM_TO_FT
        true_dots = height_nm * k * canvas.aspect
        stretch = max(1, math.floor((y_ground_max - y_eye) / true_dots)) if true_dots > 0 else 1
        y_ground = y_eye + true_dots * stretch
        canvas.line(x_eye, y_eye, canvas.w - 1, y_eye, Role.PROTECTED_AREA)           # horizon
        canvas.line(x_eye, y_ground, canvas.w - 1, y_ground, Role.FINAL_APPROACH)     # ground
        ends = []
        for d, role in ((d_fam, Role.FAMILIAR_TRACK), (d_plan, Role.PLANNED_TRACK)):
            if math.isfinite(d) and d > 0:
                x = x_eye + d * k
                canvas.line(x_eye, y_eye, x, y_ground, role)
                ends.append((x, d, role))
        for x, d, role in ends:
            col, _ = canvas.glyph(x, y_ground, "#" if self.ascii else "█", Role.RUNWAY)
            label = f"{d:.2f} NM"
            canvas.text(max(0, min(col - len(label) // 2, cols - len(label))), rows - 1, label, role)
        canvas.text(0, 1, "eye", Role.ANNOTATION)
        canvas.glyph(x_eye, y_eye, "o" if self.ascii else "◉", Role.ANNOTATION)
        canvas.text(max(0, cols - 8), 0, "horizon", Role.PROTECTED_AREA)
        gcol, grow = canvas.cell_of(x_eye, y_ground)
        canvas.text(0, grow, "gnd", Role.FINAL_APPROACH)
        note = f"{s.circling_height_ft:.0f} ft up" + (f", heights x{stretch}" if stretch > 1 else "")
        canvas.text(LABEL_COLS + 1, 0, note, Role.ANNOTATION)
        return canvas

    def render(self):
        if self.brief is None:
            return Text("computing the brief...")
        return self.draw(max(self.size.width, 20), max(self.size.height, 5))
