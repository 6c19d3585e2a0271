"""The airfield form's import: ask for an identifier and the open airport database's two CSV
files, read them with `briefer.io.runway_import.import_airfield` (the function the
``import-runways`` command uses), and fill the form with the airfield and its runways; the crew
then adds the approach from the chart and saves.

A bad file is the importer's ``FILE:LINE:COLUMN: message`` in the dialog, which stays open; the
files are read in a thread, so a large database does not freeze the screen.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import TYPE_CHECKING, Any

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Static

from briefer.errors import BriefingError
from briefer.tui.widgets._typing_input import TypingInput

if TYPE_CHECKING:
    from briefer.io.runway_import import ImportResult
    from briefer.tui.forms.screen import FormScreen

ERROR_MARK = "✗ "
_LAST: dict[str, str] = {}
"""The files used last in this session (the next import offers them again)."""


def examples_folder() -> Path | None:
    """The invented example files of the database's layout, in a checkout (None in an install)."""
    here = Path(__file__).resolve().parents[3] / "examples" / "open-airport-data"
    return here if (here / "airports.csv").is_file() else None


def _hint(name: str, width: int = 50) -> str:
    """The example file as a hint, short enough for one line of the field."""
    folder = examples_folder()
    if folder is None:
        return f"the database's {name}"
    path = str(folder / name)
    rel = os.path.relpath(path)
    home = str(Path.home())
    shown = min((p for p in (path, rel, "~" + path[len(home):] if path.startswith(home + os.sep) else path)
                 if not p.startswith(".." + os.sep)), key=len, default=path)
    return shown if len(shown) <= width else "…" + shown[-(width - 1):]


class ImportRunways(ModalScreen["ImportResult | None"]):
    """Identifier and the two CSV files -> the import (dismissed with it), or None."""

    BINDINGS = [Binding("escape", "cancel", "Cancel"),
                # Tab in a fixed order, at once: right after F4 the dialog is not laid out yet, and
                # the focus chain (which follows the layout) would drop a Tab typed that early.
                Binding("tab", "move(1)", "Next field", show=False, priority=True),
                Binding("shift+tab", "move(-1)", "Previous field", show=False, priority=True)]
    ORDER = ("import-ident", "import-airports", "import-runways", "import-ok", "import-cancel")

    def __init__(self, ident: str = "") -> None:
        super().__init__(classes="import-screen")
        self.ident = ident.strip()
        self._busy = False
        self._answered = False

    def compose(self) -> ComposeResult:
        with Vertical(id="import-dialog"):
            yield Label("Import runways from the open airport database", id="import-title")
            yield Static("Fills the identifier, name, elevation, reference point and runways; you add "
                         "the approach from the chart.", id="import-help")
            for key, label, value, hint in (
                    ("ident", "Identifier", self.ident or _LAST.get("ident", ""), "Q7HM"),
                    ("airports", "airports.csv", _LAST.get("airports", ""), _hint("airports.csv")),
                    ("runways", "runways.csv", _LAST.get("runways", ""), _hint("runways.csv"))):
                inp = TypingInput(value, placeholder=hint, id=f"import-{key}", compact=True)
                inp.cursor_blink = False
                inp.styles.width = "1fr"
                yield Horizontal(Label(label, classes="import-label"), inp, classes="import-line")
            yield Static("", id="import-message", markup=False)
            with Horizontal(id="import-buttons"):
                yield Button("Import (Enter)", id="import-ok", variant="primary", compact=True)
                yield Button("Cancel (Esc)", id="import-cancel", compact=True)

    def on_mount(self) -> None:
        # At once, not after the keys already queued (Widget.focus defers it): the identifier
        # and a Tab typed right after F4 belong to the dialog's fields.
        self.set_focus(self.query_one("#import-ident", Input))

    def action_move(self, step: int) -> None:
        current = getattr(self.focused, "id", None)
        index = self.ORDER.index(current) if current in self.ORDER else -step
        self.set_focus(self.query_one("#" + self.ORDER[(index + step) % len(self.ORDER)]))

    def _value(self, key: str) -> str:
        return self.query_one(f"#import-{key}", Input).value.strip()

    def _say(self, text: str, *, error: bool) -> None:
        msg = self.query_one("#import-message", Static)
        msg.set_class(error, "-error")
        msg.update((ERROR_MARK if error else "") + text)

    @on(Input.Submitted)
    @on(Button.Pressed, "#import-ok")
    def _run(self, event: Any = None) -> None:
        if event is not None:
            event.stop()
        if self._busy or self._answered:
            return
        ident, airports, runways = self._value("ident"), self._value("airports"), self._value("runways")
        for key, value, what in (("ident", ident, "the airport's identifier"),
                                 ("airports", airports, "the path of airports.csv"),
                                 ("runways", runways, "the path of runways.csv")):
            if not value:
                self._say(f"give {what}", error=True)
                self.query_one(f"#import-{key}", Input).focus()
                return
        _LAST.update(ident=ident, airports=airports, runways=runways)
        self._busy = True
        self._say(f"reading {os.path.basename(runways)} for {ident.upper()}...", error=False)
        self.run_worker(lambda: self._read(ident, os.path.expanduser(airports), os.path.expanduser(runways)),
                        thread=True, exclusive=True, group="import")

    def _read(self, ident: str, airports: str, runways: str) -> None:
        from briefer.io.runway_import import import_airfield

        result, message = None, ""
        try:
            result = import_airfield(ident, airports, runways)
        except BriefingError as exc:          # a bad file: FILE:LINE:COLUMN: message
            message = str(exc)
        except (OSError, ValueError) as exc:
            message = f"cannot read the files: {exc}"
        except Exception as exc:  # never lose the form to an import
            message = f"the import failed: {type(exc).__name__}: {exc}"
        self.app.call_from_thread(self._done, result, message)

    def _done(self, result: ImportResult | None, message: str) -> None:
        self._busy = False
        if result is None:
            self._say(message, error=True)
            return
        self._answered = True
        self.dismiss(result)

    @on(Button.Pressed, "#import-cancel")
    def action_cancel(self) -> None:
        if not self._answered:
            self._answered = True
            self.dismiss(None)


def ask_import(screen: FormScreen) -> None:
    """F4 in the airfield form: the dialog, then the form filled with what it imported."""
    from briefer.tui.forms.airfield_form import imported_texts

    def done(result: ImportResult | None) -> None:
        if result is None:
            return
        texts, flags = imported_texts(screen.texts, result.mapping, result.missing)
        n = len(result.mapping["runways"])
        notes = [f"Imported {result.ident} from the open airport database: {n} runway{'s' * (n != 1)}. "
                 "Check every value against the chart; add the approach below."] + result.notes
        approaches = texts["approaches"]
        first = next((i for i, a in enumerate(approaches) if not str(a.get("name", "")).strip()),
                     len(approaches) - 1)
        focus = min(flags, key=len) if flags else ("approaches", first, "name")    # a value to type first
        status = (f"Imported {result.ident}: {len(notes)} notes above the fields (PageUp); "
                  + (f"{len(flags)} values to type from the chart" if flags else "now the approach"))
        screen.call_later(screen.replace_texts, texts, flags=flags, notes=notes, focus=focus, status=status)

    screen.app.push_screen(ImportRunways(str(screen.texts.get("ident", ""))), done)
