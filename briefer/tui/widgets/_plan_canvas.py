"""The plan view: the brief's scene drawn on a braille (or ASCII) canvas at the widget's size."""

from __future__ import annotations

from typing import TYPE_CHECKING

from rich.style import Style
from rich.text import Text
from textual.message import Message
from textual.reactive import reactive
from textual.widget import Widget

if TYPE_CHECKING:        # the drawing code (numpy, the scene) is imported when the first brief is drawn
    from briefer.render.scene import Role
    from briefer.result import Brief

SHORT_LEGEND_BY_NAME = {"PROTECTED_AREA": "area", "EXCLUDED_SECTOR": "no circling", "OBSTACLE": "obstacle",
                        "FAMILIAR_TRACK": "familiar-picture turn", "PLANNED_TRACK": "planned track",
                        "ROLL_IN": "roll in", "DESCENT_POINT": "leave MDA", "RUNWAY": "runway",
                        "FINAL_APPROACH": "final", "MISSED_APPROACH": "missed", "THRESHOLD": "threshold"}
"""Short legend texts by `Role` member name (the Role enum is imported on first use)."""


def role_style(role: Role) -> Style:
    """The on-screen style of a role (colour plus bold/dim, which survive NO_COLOR)."""
    from briefer.render.scene import ROLE_STYLES

    rs = ROLE_STYLES[role]
    return Style(color=rs.term_colour, bold=rs.term_bold or None, dim=rs.term_dim or None)


class PlanCanvas(Widget):
    """Draws `render_plan(scene_from_brief(brief), width, height, ascii=...)` at its current size."""

    ascii: reactive[bool] = reactive(False)

    def __init__(self, *, ascii: bool = False, id: str | None = None) -> None:
        super().__init__(id=id)
        self.set_reactive(PlanCanvas.ascii, ascii)
        self.brief: Brief | None = None
        self.scene = None
        self._cache: tuple | None = None

    def show(self, brief: Brief) -> None:
        """Draw this brief (the scene is built once per brief)."""
        if brief is not self.brief:
            from briefer.render.brief_scene import scene_from_brief

            self.brief = brief
            self.scene = scene_from_brief(brief)
            self._cache = None
            self.refresh()

    def legend_text(self) -> Text:
        """One legend line: a sample of each role drawn the same way, and its meaning."""
        t = Text()
        if self.scene is None:
            return t
        from briefer.render.planview import legend

        for entry in legend(self.scene, ascii=self.ascii):
            if t:
                t.append("  ")
            t.append(entry.sample.strip() or entry.sample, style=role_style(entry.role))
            t.append(" " + SHORT_LEGEND_BY_NAME.get(entry.role.name, entry.text))
        if self.dropped:
            t.append("  labels left off (no room): " + ", ".join(self.dropped), style="bold")
        return t

    dropped: tuple[str, ...] = ()
    """The labels the last drawing had no room for (the legend says so)."""

    class LegendChanged(Message):
        """The drawing left off other labels than before: the legend should be shown again."""

    def render(self):
        if self.scene is None:
            return Text("computing the brief...")
        w, h = self.size.width, self.size.height
        key = (w, h, self.ascii)
        if self._cache is None or self._cache[0] != key:
            from briefer.render.planview import render_plan

            canvas = render_plan(self.scene, max(w, 4), max(h, 2), ascii=self.ascii)
            self._cache = (key, canvas)
            dropped = tuple(canvas.dropped_labels)
            if dropped != self.dropped:
                self.dropped = dropped
                self.post_message(self.LegendChanged())
        return self._cache[1]
