"""The form screen: one column of labelled fields in the documents' order, the loader's message
beside each field, a side panel drawn from what is entered, the save path at the bottom.

Keys: Tab / shift+Tab move between fields, ctrl+n adds a row to the group the cursor is in
(the "+ add" buttons too), ctrl+r removes the row the cursor is in, ctrl+s saves, Esc closes
(asking first when something is not saved).
"""

from __future__ import annotations

import copy
from collections.abc import Callable
from briefer._dataclass import dataclass
from pathlib import Path
from typing import Any

from rich.cells import cell_len
from rich.text import Text
from textual import events, on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.content import Content
from textual.screen import ModalScreen, Screen
from textual.widget import Widget
from textual.widgets import Button, Footer, Input, Label, Static

from briefer.tui.forms.check import Checker, Verdict
from briefer.tui.widgets._typing_input import TypingInput
from briefer.tui.forms.spec import Field, FormPath, FormSpec, Group, Item, Repeat, blank_texts, new_row, shown
from briefer.tui.forms.store import SaveError, Target, file_name, save_model, target_folder

ERROR_MARK = "✗ "
LABEL_WIDTH = 17
UNIT_WIDTH = 4
"""A field line's columns: the label's, then the unit's after the input (a blank, then the unit)."""
CHECK_DELAY_S = 0.08

SidePainter = Callable[[Verdict, int, int, bool], Any]
"""(verdict, width, height, ascii) -> a Rich renderable for the side panel."""


@dataclass(frozen=True, slots=True)
class Saved:
    """What a form saved: the file kind, the model (as the loader read it back) and the path."""

    kind: str
    model: Any
    path: Path


def widget_id(prefix: str, fpath: FormPath) -> str:
    return prefix + "-" + "-".join(str(p) for p in fpath) if fpath else prefix


class _StyledOnMount:
    """A form widget whose class changes restyle it only once it is on the screen: mounting
    applies the stylesheet to it whole, so the classes set while the form is built (an Input's
    own '-valid' and '-textual-compact', the verdict's '-error' ...) cost nothing until then."""

    def update_node_styles(self, animate: bool = True) -> None:
        if self.is_attached:                                # type: ignore[attr-defined]
            super().update_node_styles(animate=animate)     # type: ignore[misc]


class FormInput(_StyledOnMount, TypingInput):
    """A field's input; knows where its text lives in the form."""

    def __init__(self, fpath: FormPath, text: str, *, width: int, hint: str) -> None:
        super().__init__(text, placeholder=hint, compact=True, id=widget_id("in", fpath), classes="form-input")
        self.form_path = fpath
        self.cursor_blink = False
        self.styles.width = width + 1


class FormMessage(_StyledOnMount, Static):
    """The words beside a field, a row or a group (the loader's message, a reminder)."""

    said: tuple[str, str] | None = None
    """(kind, words) shown: kind 'error', 'required' or ''."""

    def say(self, kind: str, text: str) -> None:
        """Show `text` as `kind`; nothing to do (no new layout) when it shows already."""
        if self.said == (kind, text):
            return
        self.said = (kind, text)
        self.set_class(kind == "error", "-error")
        self.set_class(kind == "required", "-required")
        self.display = bool(text) or "form-row-msg" not in self.classes and "form-group-msg" not in self.classes
        self.update(Text(text, style="bold") if kind == "error" else text)


class AddButton(_StyledOnMount, Button):
    """A repeating group's "+ add" button."""


class FieldLine(Horizontal):
    """A field's line: its label, the input, the unit and the message. The line draws the label
    and the unit itself, in the columns the input and the message leave free (three widgets a
    field, not five: a form's widgets are what it takes to open)."""

    def __init__(self, label: str, unit: str, inp: FormInput, msg: FormMessage) -> None:
        inp.styles.margin = (0, 0, 0, LABEL_WIDTH)
        msg.styles.margin = (0, 0, 0, UNIT_WIDTH)
        super().__init__(inp, msg, classes="form-line")
        blank = " " * _input_width(inp)
        # the line's colour is the unit's (muted, as the stylesheet gives it); the label's is the text's
        self._words = Content.assemble((label.ljust(LABEL_WIDTH), "$foreground"), blank, " ", unit)

    def render(self) -> Content:
        return self._words


class CellRow(Horizontal):
    """A short repeating group's row (a category's minimums, a sector): its inputs side by side,
    each with its label before it and its unit after it. The row draws the labels and units
    itself, in the columns the inputs leave free."""

    def __init__(self, cells: list[tuple[str, FormInput, str]], *, id: str) -> None:
        words: list[tuple[str, str] | str] = []
        gap = 0
        for label, inp, unit in cells:
            if label:
                words.append((f" {label} ", "$foreground"))
                gap += cell_len(label) + 2
            inp.styles.margin = (0, 0, 0, gap)
            words.append(" " * _input_width(inp))
            gap = 0
            if unit:
                words.append(f" {unit} ")
                gap = cell_len(unit) + 2
        super().__init__(*(inp for _label, inp, _unit in cells), classes="form-row", id=id)
        self._words = Content.assemble(*words)

    def render(self) -> Content:
        return self._words


def _input_width(inp: FormInput) -> int:
    return int(inp.styles.width.value) if inp.styles.width else 0


class SidePanel(Widget):
    """The side panel: whatever the form's painter draws from the verdict, at the panel's size."""

    def __init__(self, painter: SidePainter, *, ascii: bool) -> None:
        super().__init__(id="form-side")
        self.painter = painter
        self.ascii = ascii
        self.verdict: Verdict | None = None

    def show(self, verdict: Verdict) -> None:
        self.verdict = verdict
        self.refresh()

    def render(self):
        if self.verdict is None:
            return Text("")
        try:
            return self.painter(self.verdict, max(self.size.width, 4), max(self.size.height, 2), self.ascii)
        except Exception as exc:  # a drawing problem must not take the form down
            return Text(f"(cannot draw: {type(exc).__name__}: {exc})")


class ConfirmClose(ModalScreen[str]):
    """Unsaved changes: save, discard or keep editing."""

    BINDINGS = [Binding("escape", "choose('keep')", "Keep editing"), Binding("s", "choose('save')", "Save"),
                Binding("d", "choose('discard')", "Discard")]

    def compose(self) -> ComposeResult:
        with Vertical(id="confirm-dialog"):
            yield Label("This form has changes that are not saved.", id="confirm-title")
            with Horizontal(id="confirm-buttons"):
                yield Button("Save (s)", id="confirm-save", variant="primary")
                yield Button("Discard (d)", id="confirm-discard", variant="error")
                yield Button("Keep editing (Esc)", id="confirm-keep")

    def on_mount(self) -> None:
        self.query_one("#confirm-keep", Button).focus()

    @on(Button.Pressed)
    def _pressed(self, event: Button.Pressed) -> None:
        self.dismiss((event.button.id or "confirm-keep").removeprefix("confirm-"))

    def action_choose(self, choice: str) -> None:
        self.dismiss(choice)


class FormScreen(Screen[Saved | None]):
    """Enter or edit one data file with a form."""

    BINDINGS = [
        # Tab as a priority binding: the focus moves before the next keys are handed out, so a
        # burst of keys (a fast typist, a slow link) lands in the right fields.
        Binding("tab", "app.focus_next", "Next field", show=False, priority=True),
        Binding("shift+tab", "app.focus_previous", "Previous field", show=False, priority=True),
        Binding("ctrl+s", "save", "Save", priority=True),
        Binding("escape", "close", "Close", priority=True),
        Binding("ctrl+n", "add_row", "Add row", priority=True),
        Binding("enter", "press_add", "Add", show=False, priority=True),
        Binding("ctrl+r", "remove_row", "Remove row", priority=True),
        Binding("f4", "import", "Import runways", priority=True),
        Binding("pageup", "page(-1)", "Page up", show=False),
        Binding("pagedown", "page(1)", "Page down", show=False),
    ]

    def __init__(self, spec: FormSpec, *, mapping: dict[str, Any] | None = None, source: str | None = None,
                 builtin: bool = False, side: SidePainter | None = None, ascii: bool = False,
                 on_import: Callable[[FormScreen], None] | None = None, checker: Checker | None = None) -> None:
        """Args:
            spec: The form.
            mapping: The file mapping to edit (None: a new, empty form).
            source: The file it came from (saved back there unless `builtin`).
            builtin: The file is one of the packaged demo files (saved as a new file in the
                user's folder).
            side: Draws the side panel from the verdict.
            ascii: Draw in ASCII instead of braille.
            on_import: F4: fills the form from another source (the airfield form's runway import).
            checker: The form's checker, if one has read these texts already (each field's
                message is then not asked again).
        """
        super().__init__(classes="form-screen")
        from briefer.tui.forms.spec import to_texts

        self.spec = spec
        self.texts: dict[str, Any] = to_texts(spec, mapping) if mapping is not None else blank_texts(spec)
        self.saved_texts = copy.deepcopy(self.texts)
        self.source = source if source and not builtin else None
        self.painter = side
        self.ascii = ascii
        self.checker = checker if checker is not None and checker.spec is spec else Checker(spec)
        self.verdict: Verdict = self.checker.check(self.texts)
        self._msgs: dict[FormPath, FormMessage] = {}
        self._inputs: dict[FormPath, FormInput] = {}
        self._built: set[FormPath] = set()
        """The items that have their lines on the screen (fields, groups, repeating groups)."""
        self._keep: set[FormPath] = set()
        """Items kept on the screen while an item box is built again (see `_reveal`)."""
        self._overwrite_ok: Path | None = None
        self._target: Target | None = None
        self.status_text = ""
        self.on_import = on_import
        self.flags: dict[FormPath, str] = {}
        """Field -> a reminder shown beside it while it is empty (a value an import lacks)."""
        self.notes: list[str] = []
        """Shown above the fields (what an import did)."""

    # --- building ---------------------------------------------------------------------------
    def compose(self) -> ComposeResult:
        what = "Edit" if self.saved_texts != blank_texts(self.spec) else "New"
        keys = " Tab next  ^n add row  ^r remove row  ^s save  Esc close"
        if self.on_import is not None:
            keys = " Tab next  ^n add  ^r remove  F4 import  ^s save  Esc close"
        yield Static(Text.assemble((f" {what} {self.spec.title.lower()} ", "bold reverse"), keys),
                     id="form-title")
        with Horizontal(id="form-main"):
            body = VerticalScroll(*self._body(), id="form-body")
            body.can_focus = False          # Tab goes from field to field; the body scrolls to follow
            yield body
            if self.painter is not None:
                yield SidePanel(self.painter, ascii=self.ascii)
        yield Static("", id="form-status")
        yield Footer()

    def _body(self) -> list[Widget]:
        self._msgs.clear()
        self._inputs.clear()
        self._built.clear()
        notes: list[Widget] = []
        if self.notes:
            notes.append(Static("\n".join(f"• {n}" for n in self.notes), id="form-notes", markup=False))
        lines = notes + self._items(self.spec.items, self.texts, ())
        self._show_messages()
        return lines

    def _message(self, fpath: FormPath, classes: str = "form-msg") -> FormMessage:
        msg = FormMessage("", id=widget_id("msg", fpath), classes=classes, markup=False)
        self._msgs[fpath] = msg
        return msg

    def _input(self, f: Field, texts: dict[str, Any], fpath: FormPath) -> FormInput:
        inp = FormInput(fpath, str(texts.get(f.key, "")), width=f.width, hint=f.hint)
        self._inputs[fpath] = inp
        return inp

    def _field_line(self, f: Field, texts: dict[str, Any], fpath: FormPath) -> Widget:
        here = fpath + (f.key,)
        return FieldLine(f.label, f.unit, self._input(f, texts, here), self._message(here))

    def _items(self, items: tuple[Item, ...], texts: dict[str, Any], fpath: FormPath) -> list[Widget]:
        out: list[Widget] = []
        for item in items:
            if isinstance(item, Field):
                if self._visible(item, texts, fpath):
                    out.append(self._field_line(item, texts, fpath))
            elif not self._visible(item, texts, fpath):
                continue
            elif isinstance(item, Group):
                if item.title:
                    out.append(Static(item.title, classes="form-heading", markup=False))
                if item.key is None:
                    out.extend(self._items(item.items, texts, fpath))
                else:
                    gpath = fpath + (item.key,)
                    out.append(self._message(gpath, "form-msg form-group-msg"))
                    out.extend(self._items(item.items, texts.setdefault(item.key, {}), gpath))
            else:
                out.extend(self._repeat(item, texts, fpath))
        return out

    def _repeat(self, rep: Repeat, texts: dict[str, Any], fpath: FormPath) -> list[Widget]:
        rpath = fpath + (rep.key,)
        rows = texts.setdefault(rep.key, [])
        out: list[Widget] = [Static(rep.title, classes="form-heading", markup=False),
                             self._message(rpath, "form-msg form-group-msg")]
        out.extend(self._repeat_item(rep, rpath, i, row) for i, row in enumerate(rows))
        out.append(AddButton(f"+ add {rep.item_title.lower()}", id=widget_id("add", rpath), classes="form-add",
                             compact=True))
        return out

    def _repeat_item(self, rep: Repeat, rpath: FormPath, i: int, row: dict[str, Any]) -> Widget:
        """One item of a repeating group, in its own box (added and removed whole)."""
        ipath = rpath + (i,)
        if rep.row:
            cells = [(f.label, self._input(f, row, ipath + (f.key,)), f.unit) for f in rep.items
                     if isinstance(f, Field) and self._visible(f, row, ipath)]
            parts: list[Widget] = [CellRow(cells, id=widget_id("row", ipath)), self._row_message(rep, ipath)]
        else:
            parts = [Static(f"{rep.item_title} {i + 1}  (^r removes it)", classes="form-item-heading",
                            markup=False),
                     self._message(ipath, "form-msg form-group-msg"),
                     *self._items(rep.items, row, ipath)]    # type: ignore[arg-type]
        return Vertical(*parts, classes="form-item", id=widget_id("box", ipath))

    def _visible(self, item: Item, texts: dict[str, Any], fpath: FormPath) -> bool:
        """`shown`, or kept while its box is built again; recorded as built."""
        path = fpath if item.key is None else fpath + (item.key,)
        if shown(item, texts) or path in self._keep:
            self._built.add(path)
            return True
        return False

    def _wanted(self, items: tuple[Item, ...], texts: dict[str, Any], fpath: FormPath, out: set[FormPath]) -> None:
        """The items `shown` for the texts as they are now (the walk `_items` makes)."""
        for item in items:
            path = fpath if item.key is None else fpath + (item.key,)
            if not shown(item, texts):
                continue
            out.add(path)
            if isinstance(item, Group):
                self._wanted(item.items, texts if item.key is None else texts.get(item.key, {}), path, out)
            elif isinstance(item, Repeat):
                for i, row in enumerate(texts.get(item.key, [])):
                    self._wanted(item.items, row, path + (i,), out)   # type: ignore[arg-type]

    async def _reveal(self) -> None:
        """Give their lines to items the texts now call for (a runway's latitude cleared: its
        heading and length from the chart): the item boxes concerned are built again, keeping
        every line already there and the cursor where it was."""
        wanted: set[FormPath] = set()
        self._wanted(self.spec.items, self.texts, (), wanted)
        new = wanted - self._built
        boxes = sorted({p[:2] for p in new if len(p) >= 2 and isinstance(p[1], int)})
        if not boxes:
            return
        focus = next((p for p, w in self._inputs.items() if w is self.focused), None)
        cursor = self.focused.cursor_position if isinstance(self.focused, Input) else None
        for ipath in boxes:
            rep = self._item_at(ipath[:1])
            old = self.query_one("#" + widget_id("box", ipath), Vertical)
            parent, index = old.parent, old.parent.children.index(old) if old.parent else 0
            self._keep = {p for p in self._built if p[:2] == ipath}
            for table in (self._inputs, self._msgs):
                for p in [p for p in table if p[:2] == ipath]:
                    del table[p]
            self._built -= self._keep
            try:
                box = self._repeat_item(rep, ipath[:1], ipath[1], self.texts[ipath[0]][ipath[1]])
            finally:
                self._keep = set()
            await old.remove()
            if index < len(parent.children):
                await parent.mount(box, before=index)
            else:
                await parent.mount(box)
        self._show_verdict()
        target = self._inputs.get(focus) if focus is not None else None
        if target is not None:
            self.set_focus(target)
            if cursor is not None:
                target.cursor_position = cursor

    def _row_message(self, rep: Repeat, ipath: FormPath) -> FormMessage:
        """One message line under a short row, for the row and each of its fields."""
        msg = self._message(ipath, "form-msg form-row-msg")
        for f in rep.items:
            if isinstance(f, Field):
                self._msgs[ipath + (f.key,)] = msg
        return msg

    def on_mount(self) -> None:
        self._show_verdict()
        first = next(iter(self._inputs.values()), None)
        if first is not None:
            first.focus()

    _shown_once = False

    def on_screen_resume(self, event: events.ScreenResume) -> None:
        """The first time the form shows, every line was styled as it was mounted: the screen
        need not style them all again (as it does when it comes back from a dialog). Runs
        before the screen's own handler."""
        if not self._shown_once:
            self._shown_once = True
            event.refresh_styles = False

    # --- editing -------------------------------------------------------------------------------
    @property
    def dirty(self) -> bool:
        """Something typed differs from what was opened or saved (the screen's empty groups and
        spaces alone are no change)."""
        return _meaning(self.texts) != _meaning(self.saved_texts)

    def _set_text(self, fpath: FormPath, text: str) -> None:
        cur: Any = self.texts
        for tok in fpath[:-1]:
            cur = cur[tok]
        cur[fpath[-1]] = text

    @on(Input.Changed, ".form-input")
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        inp = event.input
        assert isinstance(inp, FormInput)
        if event.value != self._text_at(inp.form_path):
            self._said = None                    # the crew types: the status line follows the form
        self._set_text(inp.form_path, event.value)
        self._overwrite_ok = None
        if self._timer is not None:
            self._timer.stop()
        self._timer = self.set_timer(CHECK_DELAY_S, self.revalidate)     # check once typing pauses

    _timer = None

    def revalidate(self) -> None:
        if self._timer is not None:
            self._timer.stop()
            self._timer = None
        self.verdict = self.checker.check(self.texts)
        self._show_verdict()
        self.call_later(self._reveal)

    def _show_verdict(self) -> None:
        self._show_messages()
        self._show_status()
        side = self.query(SidePanel)
        if side:
            side.first().show(self.verdict)

    def _show_messages(self) -> None:
        """The verdict beside the fields (and the inputs' marks); also on lines not mounted yet,
        so that they are mounted as they will show."""
        v = self.verdict
        shown: dict[FormMessage, tuple[str, str]] = {}
        for fpath, msg in self._msgs.items():
            if fpath in v.errors:
                label = self._label_of(fpath) if "form-row-msg" in msg.classes else ""
                shown.setdefault(msg, ("error", ERROR_MARK + (f"{label}: " if label else "") + v.errors[fpath]))
            elif fpath in v.required and msg not in shown:
                label = self._label_of(fpath) if "form-row-msg" in msg.classes else ""
                words = self.flags.get(fpath, v.required[fpath])
                shown[msg] = ("required", (f"{label}: " if label else "") + words)
            elif fpath in self.flags and msg not in shown and not self._text_at(fpath).strip():
                shown[msg] = ("required", self.flags[fpath])
        for msg in set(self._msgs.values()):
            msg.say(*shown.get(msg, ("", "")))
        for fpath, inp in self._inputs.items():
            inp.set_class(fpath in v.errors, "-invalid")

    def _text_at(self, fpath: FormPath) -> str:
        cur: Any = self.texts
        for tok in fpath:
            try:
                cur = cur[tok]
            except (KeyError, IndexError, TypeError):
                return ""
        return cur if isinstance(cur, str) else ""

    def _label_of(self, fpath: FormPath) -> str:
        f = self._field_at(fpath)
        return f.label if f is not None else ""

    def _place_words(self, path: FormPath) -> str:
        """What the status line calls the item at `path`: the rows it is in and its label or
        short title ('Runway 1, Threshold A', 'Approach 2, Missed approach point')."""
        words: list[str] = []
        for n, tok in enumerate(path):
            if isinstance(tok, int):
                rep = self._item_at(path[:n])
                if isinstance(rep, Repeat):
                    try:
                        rows = self._rows(path[:n])
                    except (KeyError, IndexError, TypeError):    # a path the texts no longer have
                        rows = []
                    named = str(rows[tok].get(rep.by, "")).strip() if rep.by and tok < len(rows) else ""
                    words.append(f"{rep.item_title} {named.upper() or tok + 1}")   # 'Category C
        item = self._item_at(path) if not isinstance(path[-1], int) else None
        title = item.label if isinstance(item, Field) else getattr(item, "title", "") or ""
        if title and not isinstance(item, Field):
            title = title.split(" (")[0].split(":")[0]
        if isinstance(item, Field):
            return title                     # a field: its label, as beside the field
        return ", ".join(words + ([title] if title else []))

    def _field_at(self, fpath: FormPath) -> Field | None:
        found = self._item_at(fpath)
        return found if isinstance(found, Field) else None

    def _item_at(self, path: FormPath) -> Item | None:
        """The item the last key of `path` names (a repeating group's key is followed by a row
        index, except at the end of the path), or None."""
        items: tuple[Item, ...] = self.spec.items
        i = 0
        while i < len(path):
            nxt = _child(items, path[i])
            if nxt is None or i == len(path) - 1:
                return nxt
            if isinstance(nxt, Repeat):
                items = nxt.items  # type: ignore[assignment]
                i += 2
            elif isinstance(nxt, Group):
                items = nxt.items
                i += 1
            else:
                return None
        return None

    # --- status line ---------------------------------------------------------------------------
    def save_path(self) -> Path:
        """Where ctrl+s writes."""
        if self.source is not None:
            return Path(self.source)
        if self._target is None:
            try:
                self._target = target_folder(self.spec.kind)
            except SaveError:
                self._target = Target(Path.cwd(), True)
        m = self.verdict.built.mapping if self.verdict.built else {}
        name = str(m.get(self.spec.name_key) or "")
        return self._target.folder / file_name(self.spec.kind, name or "unnamed", str(m.get("name") or ""))

    _said: str | None = None
    """Said in the status line until the crew next types (what an import did)."""

    def _show_status(self, extra: str | None = None) -> None:
        v = self.verdict
        extra = extra or self._said
        t = Text(no_wrap=True, overflow="ellipsis")
        n = len(v.errors)
        if extra:
            t.append(extra, style="bold")
        elif n:
            _path, msg = v.first_problem() or (None, "")
            t.append(f"{ERROR_MARK}{n} to fix", style="bold")
            where = self._place_words(_path) if _path else ""
            t.append(f" - {where}: {msg}" if where else f" - {msg}")
        elif v.required:
            t.append(f"{len(v.required)} required still empty", style="bold")
        elif v.general:
            t.append(ERROR_MARK + v.general[0], style="bold")
        else:
            t.append("✓ complete", style="bold")
            t.append("; unsaved changes" if self.dirty else "")
        t.append("\nsaves to ")
        t.append(self._short(self.save_path()))
        self.status_text = t.plain
        self.query_one("#form-status", Static).update(t)

    @staticmethod
    def _short(path: Path) -> str:
        home = str(Path.home())
        s = str(path)
        return "~" + s[len(home):] if s.startswith(home + "/") else s

    # --- actions -------------------------------------------------------------------------------
    def _repeat_of_focus(self) -> tuple[Repeat, FormPath, int | None] | None:
        """The deepest repeating group holding the focus: (spec, its path, the row index)."""
        focused = self.focused
        fpath: FormPath | None = getattr(focused, "form_path", None)
        if fpath is None and isinstance(focused, Button) and (focused.id or "").startswith("add-"):
            return self._repeat_at(self._add_paths[focused.id])
        if fpath is None:
            return None
        best = None
        for n in range(len(fpath) - 1, 0, -1):
            if isinstance(fpath[n], int):
                hit = self._repeat_at(fpath[:n])
                if hit is not None:
                    best = (hit[0], hit[1], fpath[n])
                    break
        return best

    @property
    def _add_paths(self) -> dict[str, FormPath]:
        out: dict[str, FormPath] = {}

        def walk(items: tuple[Item, ...], texts: dict[str, Any], fpath: FormPath) -> None:
            for it in items:
                if isinstance(it, Group):
                    if it.key is None:
                        walk(it.items, texts, fpath)
                    else:
                        walk(it.items, texts.get(it.key, {}), fpath + (it.key,))
                elif isinstance(it, Repeat):
                    rpath = fpath + (it.key,)
                    out[widget_id("add", rpath)] = rpath
                    for i, row in enumerate(texts.get(it.key, [])):
                        walk(it.items, row, rpath + (i,))  # type: ignore[arg-type]

        walk(self.spec.items, self.texts, ())
        return out

    def _repeat_at(self, rpath: FormPath) -> tuple[Repeat, FormPath, None] | None:
        found = self._item_at(rpath)
        return (found, rpath, None) if isinstance(found, Repeat) else None

    def _rows(self, rpath: FormPath) -> list[dict[str, Any]]:
        cur: Any = self.texts
        for tok in rpath:
            cur = cur[tok]
        return cur

    @on(Button.Pressed, ".form-add")
    async def _add_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        rpath = self._add_paths.get(event.button.id or "")
        if rpath is not None:
            await self._add_at(rpath)

    async def action_press_add(self) -> None:
        """Enter on a "+ add" button, handled before the next keys are handed out (so what is
        typed next lands in the new row)."""
        button = self.focused
        rpath = self._add_paths.get(getattr(button, "id", "") or "")
        if rpath is not None:
            await self._add_at(rpath)

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "import":
            return self.on_import is not None
        if action == "press_add":
            return isinstance(self.focused, Button) and "form-add" in self.focused.classes
        return True

    async def action_add_row(self) -> None:
        hit = self._repeat_of_focus()
        if hit is None:
            self.notify("Put the cursor in a group (runways, categories, sectors...) to add a row to it.",
                        timeout=4)
            return
        await self._add_at(hit[1])

    async def _add_at(self, rpath: FormPath) -> None:
        """Add a row and mount its box before the group's "+ add" button; the cursor goes to it."""
        hit = self._repeat_at(rpath)
        if hit is None:
            return
        rep = hit[0]
        rows = self._rows(rpath)
        rows.append(new_row(rep, rows))
        index = len(rows) - 1
        box = self._repeat_item(rep, rpath, index, rows[-1])
        button = self.query_one("#" + widget_id("add", rpath), Button)
        await self.query_one("#form-body", VerticalScroll).mount(box, before=button)
        target = next((w for p, w in self._inputs.items() if p[: len(rpath) + 1] == rpath + (index,)), None)
        if target is not None:
            # At once, not after the queued events as `Widget.focus` does: keys typed right after
            # Enter are already waiting, and they belong to the new row.
            self.set_focus(target)
        self.revalidate()

    async def action_remove_row(self) -> None:
        hit = self._repeat_of_focus()
        if hit is None or hit[2] is None:
            self.notify("Put the cursor in the row to remove.", timeout=4)
            return
        rows = self._rows(hit[1])
        index = hit[2]
        del rows[index]
        focus = hit[1] + (min(index, len(rows) - 1),) if rows else None
        await self._rebuild(focus=focus, add_button=hit[1] if not rows else None)

    async def _rebuild(self, *, focus: FormPath | None = None, add_button: FormPath | None = None) -> None:
        """Build the form again (after a row is removed: the rows after it are renumbered)."""
        body = self.query_one("#form-body", VerticalScroll)
        scroll_y = body.scroll_y
        await body.remove_children()
        await body.mount_all(self._body())
        self.revalidate()
        body.scroll_to(y=scroll_y, animate=False)
        target: Widget | None = None
        if focus is not None:
            target = next((w for p, w in self._inputs.items() if p[: len(focus)] == focus), None)
        if target is None and add_button is not None:
            target = self.query_one("#" + widget_id("add", add_button), Button)
        if target is not None:
            self.set_focus(target)          # before the keys already queued (see `_add_at`)

    def action_import(self) -> None:
        if self.on_import is not None:
            self.on_import(self)

    async def replace_texts(self, texts: dict[str, Any], *, flags: dict[FormPath, str] | None = None,
                            notes: list[str] | None = None, focus: FormPath | None = None,
                            status: str | None = None) -> None:
        """Show other texts (an import filled the form), the cursor on `focus`; kept unsaved
        until ^s. `status` is said in the status line until the next keystroke."""
        self.texts = texts
        self.flags = dict(flags or {})
        self.notes = list(notes or [])
        self._overwrite_ok = None
        self._said = status
        await self._rebuild(focus=focus)
        target = self.focused
        if target is not None:       # the new fields are laid out at the next refresh
            self.call_after_refresh(lambda: self.query_one("#form-body", VerticalScroll).scroll_to_widget(
                target, animate=False))

    def action_page(self, direction: int) -> None:
        body = self.query_one("#form-body", VerticalScroll)
        body.scroll_to(y=body.scroll_y + direction * max(body.size.height - 2, 1), animate=False)

    def action_save(self) -> None:
        self.save()

    def save(self) -> Saved | None:
        """Save if the form is complete; else show why and put the cursor on the first problem."""
        self.revalidate()
        v = self.verdict
        if not v.ok or v.model is None:
            problem = v.first_problem()
            count = len(v.errors) + len(v.required) + len(v.general)
            self._show_status(f"{ERROR_MARK}not saved: {count} to fix or fill"
                              + (f" - {self._label_of(problem[0]) if problem[0] else ''}: {problem[1]}"
                                 if problem else ""))
            if problem and problem[0] is not None:
                inp = next((w for p, w in self._inputs.items() if p[: len(problem[0])] == problem[0]), None)
                if inp is not None:
                    inp.focus()
            return None
        path = self.save_path()
        overwrite = self.source is not None
        if not overwrite and path.exists():
            if self._overwrite_ok != path:
                self._overwrite_ok = path
                self._show_status(f"{self._short(path)} exists: ^s again replaces it (or change the name)")
                return None
            overwrite = True
        try:
            written = save_model(self.spec.kind, v.model, path, overwrite=overwrite,
                                 target=self._target if self.source is None else None)
        except SaveError as exc:
            self._show_status(ERROR_MARK + str(exc))
            return None
        self.saved_texts = copy.deepcopy(self.texts)
        self.source = str(written)
        result = Saved(self.spec.kind, v.model, written)
        self.dismiss(result)
        return result

    def action_close(self) -> None:
        if not self.dirty:
            self.dismiss(None)
            return

        def chosen(choice: str | None) -> None:
            if choice == "save":
                self.save()
            elif choice == "discard":
                self.dismiss(None)

        self.app.push_screen(ConfirmClose(), chosen)


def _meaning(texts: Any) -> Any:
    """Texts without empty entries and outer spaces: two forms that say the same compare equal
    (a group the screen added empty, a field left blank)."""
    if isinstance(texts, str):
        return texts.strip()
    if isinstance(texts, dict):
        kept = {k: _meaning(v) for k, v in texts.items()}
        return {k: v for k, v in kept.items() if v not in ("", {}, [])}
    if isinstance(texts, list):
        return [_meaning(v) for v in texts]
    return texts


def _child(items: tuple[Item, ...], tok: object) -> Item | None:
    """The item of key `tok` among `items`, looking inside unnamed groups (one step of a path)."""
    for it in items:
        if isinstance(it, Group) and it.key is None:
            hit = next((x for x in it.items if getattr(x, "key", None) == tok), None)
            if hit is not None:
                return hit
        elif getattr(it, "key", None) == tok:
            return it
    return None
