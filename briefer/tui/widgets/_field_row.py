"""One labelled input with its note or error beside it (errors inline, never a crash)."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.widget import Widget
from textual.message import Message
from textual.widgets import Input, Label, Static

from briefer.tui.widgets._typing_input import TypingInput

ERROR_MARK = "✗ "


class FieldRow(Widget):
    """`label [input] note`. Each edit is read by `parser` (text -> value, ValueError with a
    short message); a good value posts `Changed`, a bad one shows the message beside the field
    and posts `Invalid`. Both go to the app itself, which turns them into inputs: bubbled, they
    passed through every container of the step first, a message hop each (~0.7 ms an edit, in
    the time from a keystroke to its brief)."""

    class Changed(Message):
        """A field holds a readable value.

        Attributes:
            name: The field's name (e.g. "wind").
            value: The parsed value (None when the field is empty).
        """

        def __init__(self, name: str, value: Any) -> None:
            super().__init__()
            self.name = name
            self.value = value

    class Invalid(Message):
        """A field holds text that cannot be read.

        Attributes:
            name: The field's name.
            message: Why.
        """

        def __init__(self, name: str, message: str) -> None:
            super().__init__()
            self.name = name
            self.message = message

    def __init__(self, name: str, label: str, parser: Callable[[str], Any], *, placeholder: str = "",
                 note: str = "", input_classes: str = "") -> None:
        super().__init__(id=f"row-{name}", classes="field-row")
        self.field_name = name
        self.label = label
        self.parser = parser
        self._placeholder = placeholder
        self._note = note
        self._input_classes = input_classes
        self.error: str | None = None

    def compose(self) -> ComposeResult:
        yield Label(self.label, classes="field-label")
        inp = TypingInput(placeholder=self._placeholder, id=self.field_name, compact=True, classes=self._input_classes)
        inp.cursor_blink = False   # no idle redraws over a slow link
        yield inp
        yield Static(self._note, classes="field-note", markup=False)

    @property
    def input(self) -> Input:
        return self.query_one(Input)

    @property
    def text(self) -> str:
        return self.input.value

    def set_text(self, text: str) -> None:
        """Show `text` in the field (as if typed; equal values change nothing downstream)."""
        if self.input.value != text:
            self.input.value = text

    def set_placeholder(self, text: str) -> None:
        self.input.placeholder = text

    def show_note(self, note: str) -> None:
        self._note = note
        if self.error is None:
            self.query_one(".field-note", Static).update(note)

    def show_error(self, message: str | None) -> None:
        """An error beside the field (None clears it and shows the note again)."""
        if message == self.error and self.is_mounted:
            return
        self.error = message
        if self.has_class("-invalid") != (message is not None):
            self.set_class(message is not None, "-invalid")
        note = self.query_one(".field-note", Static)
        if message is None:
            note.update(self._note)
        else:
            note.update(Text(ERROR_MARK + message, style="bold"))

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        hold = getattr(self.app, "hold_frame", None)   # the echo waits (a frame at most) for what the
        if hold is not None:                           # edit leads to, to show both in one frame
            hold()
        try:
            value = self.parser(event.value)
        except ValueError as exc:
            self.show_error(str(exc))
            self.app.post_message(self.Invalid(self.field_name, str(exc)))
            return
        self.show_error(None)
        self.app.post_message(self.Changed(self.field_name, value))
