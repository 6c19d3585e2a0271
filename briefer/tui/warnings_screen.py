"""Every warning of the brief on screen, most severe first (the warnings line shows the top one)."""

from __future__ import annotations

from rich.console import Group, RenderableType
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Footer, Static


class WarningsScreen(ModalScreen[None]):
    """A scrolling list of the findings; Esc, w or q closes it."""

    BINDINGS = [Binding("escape,q,w", "dismiss", "Close")]

    def __init__(self, body: RenderableType, title: str = "WARNINGS, most severe first") -> None:
        super().__init__(id="warnings-screen")
        self.body = body
        self.title_text = title

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="warnings-body"):
            yield Static(Group(Text(self.title_text, style="bold underline"), self.body))
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#warnings-body").focus()
