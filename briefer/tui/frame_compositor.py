"""The main screen's compositor: a frame that updates part of the screen renders only the widgets
seen in the parts that changed.

For such a frame Textual renders every widget whose clip meets the box around *all* the changed
regions, then writes only the changed regions. An edit changes the field typed in and the brief's
text a few lines below it: the box spans the form between them, so every row, label, field and
container of the form was rendered (about 0.1 ms each, 38 widgets at 80x24), though none of them
but those seen in a changed region adds anything to what is written. This compositor leaves the
others out: the bytes written are the same (tests/test_app_frames.py compares them with Textual's
own for a run of edits).
"""

from __future__ import annotations

from collections.abc import Iterable

from textual._compositor import ChopsUpdate, Compositor
from textual.geometry import Region
from textual.strip import Strip


class ChangedRegionsCompositor(Compositor):
    """`textual._compositor.Compositor` whose partial updates render only the widgets that show
    in a changed region (whole-screen renders are Textual's own)."""

    _changed: list[Region] | None = None

    def render_partial_update(self) -> ChopsUpdate | None:
        self._changed = list(self._dirty_regions)
        try:
            return super().render_partial_update()
        finally:
            self._changed = None

    def _get_renders(self, crop: Region | None = None) -> Iterable[tuple[Region, Region, list[Strip]]]:
        changed = self._changed
        if crop is None or not changed:
            yield from super()._get_renders(crop)
            return
        overlaps, intersection = Region.overlaps, Region.intersection
        for widget, (region, clip) in self.visible_widgets.items():
            shown = intersection(region, clip)     # the part of the widget on screen
            if not shown.area or not any(overlaps(shown, c) for c in changed):
                continue                           # nothing of it is written in this frame
            yield region, clip, widget.render_lines(
                Region(shown.x - region.x, shown.y - region.y, shown.width, shown.height))
