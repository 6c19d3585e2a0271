"""The app under hostile use: saving with flagged fields, keys queued without waiting, bad files
opened. Nothing may end the app, and nothing typed may be lost or replaced without a word."""

from __future__ import annotations

import pytest
from test_app import SIZE, make_app, type_into
from test_app_fuzz import send_keys
from test_app_support import settle, text_of
from textual.widgets import Button, Input

from briefer.tui.inputs_file import load_inputs, save_inputs


async def _drain(app, pilot, rounds: int = 30) -> None:
    for _ in range(rounds):
        await pilot.pause(0.02)


# --- 17.2: saving while a field is flagged -------------------------------------------------------------
@pytest.mark.parametrize("field, text", [("wind", "300/25G20"), ("ceiling", "abc"), ("wind", "zzz")])
async def test_save_is_refused_while_a_field_is_wrong_and_the_file_is_kept(tmp_path, field, text):
    path = tmp_path / "saved.yaml"
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        save_inputs(app.inputs, path)                 # yesterday's good file
        before = path.read_bytes()
        await pilot.press("4")
        await type_into(pilot, field, text)
        await settle(app, pilot)
        assert app.stale is not None
        await pilot.press("escape", "ctrl+s")
        await pilot.pause()
        assert app.screen is app.main                  # no save dialog
        messages = [n.message for n in app._notifications]
        assert any(m.startswith(f"Not saved: the {field} field is wrong") for m in messages), messages
        assert path.read_bytes() == before


async def test_save_refused_inside_the_dialog_when_a_field_went_wrong_meanwhile(tmp_path):
    path = tmp_path / "saved.yaml"
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("ctrl+s")
        dialog = app.screen
        app.field_errors["ceiling"] = "expected a number in feet, got 'abc'"
        dialog.query_one("#path-input", Input).value = str(path)
        await pilot.press("enter")
        await pilot.pause()
        assert app.screen is dialog
        assert "Not saved: the ceiling field is wrong" in text_of(dialog.query_one("#path-error"))
        assert not path.exists()


async def test_a_good_save_still_round_trips(tmp_path):
    path = tmp_path / "ok.yaml"
    app = make_app()
    async with app.run_test(size=SIZE) as pilot:
        await settle(app, pilot)
        await pilot.press("ctrl+s")
        app.screen.query_one("#path-input", Input).value = str(path)
        await pilot.press("enter")
        await pilot.pause()
        assert app.screen is app.main
        assert load_inputs(path) == app.inputs


# --- 17.8: keys queued without waiting ---------------------------------------------------------------
async def test_palette_page_down_before_the_list_fills():
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        send_keys(app, ["ctrl+p", "pagedown", "pageup", "pagedown", "end", "home"])
        await _drain(app, pilot)
        assert app.is_running
        await pilot.press("escape")
        await _drain(app, pilot, 5)
        assert app.screen is app.main


@pytest.mark.parametrize("opener", ["ctrl+s", "ctrl+o"])
async def test_a_dialog_cancelled_and_escaped_at_once_closes_once(opener):
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press(opener)
        dialog = app.screen
        assert dialog is not app.main
        dialog.query_one("#path-cancel", Button).focus()
        await pilot.pause()
        send_keys(app, ["enter", "escape"])                # Cancel pressed, escape right behind it
        await _drain(app, pilot, 10)
        assert app.is_running and app.screen is app.main
        await pilot.press(opener)
        dialog = app.screen
        dialog.action_cancel()                             # Cancel (enter) ...
        dialog.action_cancel()                             # ... and escape before the pop is done
        await pilot.pause()
        dialog.action_cancel()                             # a key still queued for the old dialog
        await _drain(app, pilot, 10)
        assert app.is_running and app.screen is app.main
        send_keys(app, [opener, "shift+tab", "enter", "escape", opener, "escape", "escape"])
        await _drain(app, pilot)
        assert app.is_running and app.screen is app.main


async def test_opening_hostile_files_shows_one_line(tmp_path):
    from hostile_corpus import CASES

    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        for name in ("esc-escaped-in-quotes.yaml", "nesting-500.yaml", "int-5000-digits.yaml",
                     "bool-tag-abc.yaml", "lone-surrogate.yaml", "bel-in-plain-text.yaml"):
            (tmp_path / name).write_bytes(CASES[name])
            error = app.open_inputs(str(tmp_path / name))
            assert error is not None and error.startswith(str(tmp_path / name))
            assert "Error:" not in error and "\x1b" not in error and "\n" not in error
        assert app.is_running
