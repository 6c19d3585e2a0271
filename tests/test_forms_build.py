"""How the forms are built on the screen: the work Textual does per widget (styling, layout) is
most of the time a form takes to open on a slow machine (the airfield form holds some 140 fields),
so each widget of a form is styled once as it opens, and a message re-shown unchanged asks for no
new layout. Counted, never timed.
"""

from __future__ import annotations

import collections

import pytest
from forms_support import form_app
from test_app_support import settle
from textual.css.stylesheet import Stylesheet
from textual.widget import Widget

from briefer.tui.forms.screen import FormScreen


@pytest.fixture(autouse=True)
def _config_home(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


async def _open(pilot, step: str, key: str) -> FormScreen:
    await settle(pilot.app, pilot)
    await pilot.press(step)
    await pilot.pause()
    await pilot.press(key)
    await pilot.pause()
    screen = pilot.app.screen
    assert isinstance(screen, FormScreen)
    return screen


@pytest.mark.parametrize(("step", "key"), [("2", "f2"), ("2", "f3"), ("1", "f3")])
async def test_opening_a_form_styles_each_of_its_widgets_once(step, key, monkeypatch):
    """Every widget of the form's body is styled once as the form opens (the one the cursor is
    in once more, for its focus): not again when its classes are set before it is on the screen,
    nor by the screen as it first shows."""
    styled: collections.Counter[Widget] = collections.Counter()
    apply = Stylesheet.apply

    def counting(self, node, **kwargs):
        if isinstance(node, Widget):
            styled[node] += 1
        return apply(self, node, **kwargs)

    monkeypatch.setattr(Stylesheet, "apply", counting)
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        styled.clear()
        screen = await _open(pilot, step, key)
        body = list(screen.query_one("#form-body").walk_children())
        assert len(body) > 50
        again = [(type(w).__name__, w.id, styled[w]) for w in body if styled[w] != 1 and w is not app.focused]
        assert not again, again[:8]
        assert styled[app.focused] <= 2


async def test_a_message_shown_again_unchanged_asks_for_no_layout():
    """Checking the form again after a keystroke re-shows every message; those that did not
    change are left alone (each change lays out the whole form again)."""
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _open(pilot, "2", "f3")
        await pilot.pause()
        refreshed: list[Widget] = []
        for msg in set(screen._msgs.values()):
            msg.refresh = lambda *a, _m=msg, **k: refreshed.append(_m)     # type: ignore[method-assign]
        screen.revalidate()
        assert refreshed == []


async def test_a_field_line_is_three_widgets_and_a_row_one_per_input():
    """A field's line holds its input and its message (the line draws the label and the unit);
    a short row (a category's minimums) holds only its inputs (the row draws the labels and
    units between them). The words are still there, where they were."""
    from briefer.tui.forms.screen import FieldLine, FormInput

    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _open(pilot, "2", "f3")
        lines = list(screen.query(FieldLine))
        assert len(lines) > 50
        for line in lines:
            kids = list(line.walk_children())
            assert [type(w).__name__ for w in kids] == ["FormInput", "FormMessage"], kids
        elevation = screen.query_one("#in-elevation_ft", FormInput).parent
        assert elevation.render().plain.split() == ["Elevation", "ft"]
        rows = list(screen.query(".form-row"))
        assert rows
        for row in rows:
            assert all(isinstance(w, FormInput) for w in row.walk_children())
        first = screen.query_one("#row-approaches-0-circling-0")
        assert first.render().plain.split() == ["MDA", "ft", "vis", "SM/m"]


async def test_opening_a_file_in_its_form_asks_each_fields_message_once(monkeypatch):
    """F3 reads the file through the form once to be sure it saves back unchanged; the form then
    shows those very messages, without asking the loader about every field again."""
    from briefer.io import drafts

    asked: collections.Counter[str] = collections.Counter()
    message = drafts.field_message

    def counting(kind, draft, path):
        asked[path] += 1
        return message(kind, draft, path)

    monkeypatch.setattr(drafts, "field_message", counting)
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        asked.clear()
        await _open(pilot, "2", "f3")
        assert len(asked) > 50
        twice = [p for p, n in asked.items() if n > 1]
        assert not twice, twice[:5]
