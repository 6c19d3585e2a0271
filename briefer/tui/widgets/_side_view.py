"""A side view of the sight picture: the Scene the PDF card draws too
(`briefer.render.side_scene`), drawn at the widget's size on the terminal canvas."""

from __future__ import annotations

from typing import TYPE_CHECKING

from rich.text import Text
from textual.reactive import reactive
from textual.widget import Widget

if TYPE_CHECKING:        # the drawing code is imported when the first brief is drawn
    from briefer.render.canvas import Canvas
    from briefer.result import Brief


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
        from briefer.render.side_scene import render_side, side_picture

        return render_side(side_picture(self.brief), cols, rows, ascii=self.ascii)  # type: ignore[arg-type]

    def render(self):
        if self.brief is None:
            return Text("computing the brief...")
        return self.draw(max(self.size.width, 20), max(self.size.height, 5))
