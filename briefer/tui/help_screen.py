"""Help: the keys, how the steps work, and the full cautions."""

from __future__ import annotations

from rich.console import Group
from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Footer, Static

from briefer.cautions import CAUTIONS

STEPS_TEXT = (
    "Walk the steps in order (1-4), each shows what it already gives; 5-8 are the brief's views. "
    "Lists: arrows or the mouse choose. Fields: type; an error shows beside the field and the last "
    "good brief stays on screen, marked STALE. A pasted report fills every weather field you "
    "leave empty; a value you type overrides it. Digits jump to a step when no field has the "
    "cursor (Esc leaves a field)."
)


class HelpScreen(ModalScreen[None]):
    """The keys and the cautions."""

    BINDINGS = [Binding("escape,q,f1,question_mark", "dismiss", "Close")]

    def __init__(self, keys: list[tuple[str, str]]) -> None:
        super().__init__(id="help")
        self.keys = keys

    def compose(self) -> ComposeResult:
        t = Table.grid(padding=(0, 2))
        t.add_column(style="bold", no_wrap=True)
        t.add_column()
        for key, what in self.keys:
            t.add_row(key, what)
        cautions = Group(*[Text(f"- {c}") for c in CAUTIONS])
        with VerticalScroll(id="help-body"):
            yield Static(Group(Text("HELP", style="bold underline"), Text(STEPS_TEXT), Text(""),
                               Text("KEYS", style="bold underline"), t, Text(""),
                               Text("CAUTIONS", style="bold underline"), cautions))
        yield Footer()
