"""The plan view: the brief's scene drawn on a braille (or ASCII) canvas at the widget's size."""

from __future__ import annotations

from rich.style import Style
from rich.text import Text
from textual.reactive import reactive
from textual.widget import Widget

from briefer.render.brief_scene import scene_from_brief
from briefer.render.planview import legend, render_plan
from briefer.render.scene import ROLE_STYLES, Role
from briefer.result import Brief

SHORT_LEGEND = {Role.PROTECTED_AREA: "area", Role.EXCLUDED_SECTOR: "no circling", Role.OBSTACLE: "obstacle",
                Role.FAMILIAR_TRACK: "familiar-picture turn", Role.PLANNED_TRACK: "planned track",
                Role.ROLL_IN: "roll in", Role.DESCENT_POINT: "leave MDA", Role.RUNWAY: "runway",
                Role.FINAL_APPROACH: "final", Role.MISSED_APPROACH: "missed", Role.THRESHOLD: "threshold"}


def role_style(role: Role) -> Style:
    """The on-screen style of a role (colour plus bold/dim, which survive NO_COLOR)."""
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
            self.brief = brief
            self.scene = scene_from_brief(brief)
            self._cache = None
            self.refresh()

    def legend_text(self) -> Text:
        """One legend line: a sample of each role drawn the same way, and its meaning."""
        t = Text()
        if self.scene is None:
            return t
        for entry in legend(self.scene, ascii=self.ascii):
            if t:
                t.append("  ")
            t.append(entry.sample.strip() or entry.sample, style=role_style(entry.role))
            t.append(" " + SHORT_LEGEND.get(entry.role, entry.text))
        return t

    def render(self):
        if self.scene is None:
            return Text("computing the brief...")
        w, h = self.size.width, self.size.height
        key = (w, h, self.ascii)
        if self._cache is None or self._cache[0] != key:
            self._cache = (key, render_plan(self.scene, max(w, 4), max(h, 2), ascii=self.ascii))
        return self._cache[1]
