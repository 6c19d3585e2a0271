"""A Rich renderable shown in a Static, rendered once per width: Textual asks a Rich renderable
for its height when it lays the screen out and for its lines when it paints, and renders it for
each (a table of wrapped text costs milliseconds a time)."""

from __future__ import annotations

from typing import Any

from rich.console import Console, ConsoleOptions, RenderResult
from rich.measure import Measurement
from textual.strip import Strip
from textual.visual import RichVisual


class RenderedOnce(RichVisual):
    """`renderable` for `widget`, its lines kept for the last width and style asked for.

    It is also the Rich renderable itself (printed, it prints `renderable`), so that
    `Static.content` still reads as the text shown."""

    def __init__(self, widget: Any, renderable: Any) -> None:
        super().__init__(widget, renderable)
        self._kept: tuple[int, Any, list[Strip]] | None = None   # (width, style, lines)

    def _lines(self, width: int, style: Any) -> list[Strip]:
        kept = self._kept
        if kept is None or kept[0] != width or kept[1] != style:
            kept = self._kept = (width, style, super().render_strips(width, None, style, None))
        return kept[2]

    def get_height(self, rules: Any, width: int) -> int:
        return len(self._lines(width, self._widget.visual_style))

    def render_strips(self, width: int, height: int | None, style: Any, options: Any) -> list[Strip]:
        lines = self._lines(width, style)
        return lines if height is None else lines[:height]

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        yield self._renderable

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        return Measurement.get(console, options, self._renderable)
