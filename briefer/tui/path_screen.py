"""A small dialog asking for a file path; the action runs inside it, so an error shows next to
the field and the dialog stays open."""

from __future__ import annotations

import os
from collections.abc import Callable

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Checkbox, Input, Label, Static

from briefer.tui.widgets._typing_input import TypingInput

REPLACE_LABEL = "replace an existing file"


def _exists(path: str) -> bool:
    target = os.path.expanduser(path)
    return os.path.lexists(target) and not os.path.isdir(target)


PathAction = Callable[[str, bool], "str | None"]
"""(path, overwrite) -> None on success, else the error to show."""


class PathScreen(ModalScreen["str | None"]):
    """Ask for a path, run `action(path, overwrite)`, dismiss with the path on success."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    def __init__(self, title: str, default: str, action: PathAction, *, verb: str = "OK",
                 can_overwrite: bool = True) -> None:
        super().__init__(classes="path-screen")
        self.title_text = title
        self.default = default
        self.action_fn = action
        self.verb = verb
        self.can_overwrite = can_overwrite

    def compose(self) -> ComposeResult:
        with Vertical(id="path-dialog"):
            yield Label(self.title_text, id="path-title")
            inp = TypingInput(self.default, id="path-input")
            inp.cursor_blink = False
            yield inp
            yield Static("", id="path-error", markup=False)
            with Horizontal(id="path-buttons"):
                if self.can_overwrite:
                    yield Checkbox(REPLACE_LABEL, id="path-overwrite")
                yield Button(self.verb, id="path-ok", variant="primary")
                yield Button("Cancel", id="path-cancel")

    def on_mount(self) -> None:
        self.query_one("#path-input", Input).focus()

    _answered = False
    """Set once the dialog is dismissed: keys queued behind the one that closed it (enter on
    Cancel then escape, typed fast or pasted) must not dismiss it a second time."""

    def _close(self, result: str | None) -> None:
        if self._answered:
            return
        self._answered = True
        self.dismiss(result)

    @on(Input.Submitted, "#path-input")
    @on(Button.Pressed, "#path-ok")
    def _run(self) -> None:
        if self._answered:
            return
        path = self.query_one("#path-input", Input).value.strip()
        if not path:
            self._error("give a file name")
            return
        overwrite = self.can_overwrite and self.query_one("#path-overwrite", Checkbox).value
        if self.can_overwrite and not overwrite and _exists(path):
            self._error(f"{path} already exists: tick '{REPLACE_LABEL}' to write over it, or give another name")
            return
        try:
            error = self.action_fn(path, overwrite)
        except Exception as exc:  # never crash the app on a file problem; show it here
            error = f"cannot use {path}: {exc}"
        if error:
            self._error(error)
        else:
            self._close(path)

    def _error(self, message: str) -> None:
        from briefer.safetext import escape_text

        self.query_one("#path-error", Static).update(Text("✗ " + escape_text(message), style="bold"))

    @on(Button.Pressed, "#path-cancel")
    def action_cancel(self) -> None:
        self._close(None)
