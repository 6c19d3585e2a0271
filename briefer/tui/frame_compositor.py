"""The main screen's compositor: a frame that updates part of the screen renders only the widgets
that show in the parts that changed, front to back, and stops once those parts are painted.

For such a frame Textual renders every widget whose clip meets the box around *all* the changed
regions, then writes only the changed regions. An edit changes the field typed in and the brief's
text a few lines below it: the box spans the form between them, so every row, label, field and
container of the form was rendered (about 0.1 ms each, 38 widgets at 80x24), though none of them
but those seen in a changed region adds anything to what is written. Of those, Textual keeps for
each piece of a line (a "chop": from one widget edge to the next) the first widget's, painting
front to back: the containers behind the field and the text (its row, the form, the tab pane,
the tabs, the screen) are rendered only to be dropped. This compositor renders a widget only
while a piece of a changed region it covers is not painted yet; a piece of a written line that
no widget rendered gets an empty strip (such a piece is outside every changed span or starts
where one ends: only a cursor move is written for it, as Textual's screen-wide background
piece gives). The bytes written are the same (tests/test_app_frames.py compares them with
Textual's own for a run of edits).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence

from textual._compositor import ChopsUpdate, Compositor
from textual.geometry import Region
from textual.strip import Strip

_EMPTY = Strip([], 0)


class ChangedRegionsCompositor(Compositor):
    """`textual._compositor.Compositor` whose partial updates render only the widgets whose
    pieces are written (whole-screen renders are Textual's own)."""

    _changed: list[Region] | None = None

    def render_partial_update(self) -> ChopsUpdate | None:
        self._changed = list(self._dirty_regions)
        try:
            return super().render_partial_update()
        finally:
            self._changed = None

    def _render_chops(self, crop: Region, is_rendered_line: Callable[[int], bool]
                      ) -> Sequence[Mapping[int, Strip | None]]:
        """Textual's `_render_chops` (each line's pieces, the first widget's strip for each,
        widgets front to back) for the widgets that paint a written piece first."""
        changed = self._changed
        if not changed:
            return super()._render_chops(crop, is_rendered_line)
        cuts = self.cuts
        chops: list[dict[int, Strip | None]] = [dict.fromkeys(cut_set[:-1]) for cut_set in cuts]
        pending: list[tuple[int, int]] = []      # (line, piece start) of the pieces written with content
        for y, x1, x2 in self._regions_to_spans(changed):
            line_cuts = cuts[y]
            pending.extend((y, cut) for cut, end in zip(line_cuts, line_cuts[1:]) if cut < x2 and end > x1)
        overlaps, intersection = Region.overlaps, Region.intersection
        for widget, (region, clip) in self.visible_widgets.items():
            if not pending:
                break
            shown = intersection(region, clip)         # the part of the widget on screen
            if not shown.area or not any(overlaps(shown, c) for c in changed):
                continue
            x, top, width, height = shown
            right, bottom = x + width, top + height
            if not any(top <= y < bottom and x <= cut < right for y, cut in pending):
                continue                               # every piece of it written is painted
            strips = widget.render_lines(Region(x - region.x, top - region.y, width, height))
            for y, strip in zip(range(top, bottom), strips):   # as textual._compositor fills them
                if not is_rendered_line(y):
                    continue
                chops_line = chops[y]
                final_cuts = [cut for cut in cuts[y] if right >= cut >= x]
                get_chops_line = chops_line.get
                for cut, piece in zip(final_cuts, strip.divide([cut - x for cut in final_cuts[1:]])):
                    if get_chops_line(cut) is None:
                        chops_line[cut] = piece
            pending = [(y, cut) for y, cut in pending if chops[y][cut] is None]
        if pending:                                    # not all painted (not seen): Textual's own
            return super()._render_chops(crop, is_rendered_line)
        for y, line in enumerate(chops):
            if is_rendered_line(y):
                for cut, piece in line.items():
                    if piece is None:
                        line[cut] = _EMPTY
        return chops
