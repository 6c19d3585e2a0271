"""The instructor screen: build a practice scenario, preview both pages, write the file and a deck.

Three tabs (keys 1, 2, 3, and the command palette): Choose the airfield, the profile (the
brief's own at first), the emphasis (or let the seed draw it) and the seed, then Generate
(ctrl+g): the student page and the answer key show as text (the same text `briefer scenario new`
prints, prose lines wrapped to the screen; the answer key is the kneeboard card's text plus the
trap, why this case and the grading tolerances). Write the scenario file (ctrl+w) or a deck of
varied scenarios from the same seed (ctrl+d). Esc goes back.

`InstructorScreen()` needs nothing: without a catalog it loads one (`briefer.tui.state.AppCatalog`,
i.e. `briefer.io.catalog`). The app pushes it with its own catalog: `InstructorScreen(catalog)`.
Generation and the deck run in worker threads; a `BriefingError` becomes a notification and the
last good preview stays, marked stale.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Any

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, ScrollableContainer, VerticalScroll
from textual.screen import Screen
from textual.widgets import Button, Checkbox, Footer, Input, Label, Select, Static, TabbedContent, TabPane

from briefer.cautions import SHORT_CAUTION
from briefer.errors import BriefingError
from briefer.vocabulary import DECK_SIZE_MAX, DECK_SIZE_WORDS, SEED_MAX, SEED_WORDS
from briefer.instructor.scenario_format import EMPHASES, EMPHASIS_TITLES
from briefer.tui.widgets._typing_input import FOCUS_KEYS, TypingInput

ANY_EMPHASIS = "any"


def fit_lines(text: str, width: int) -> str:
    """`text` with each prose line longer than `width` wrapped under its own indent (+2); lines
    that are mostly not letters (drawings, rules, boxes) stay whole."""
    import textwrap

    out: list[str] = []
    for line in text.splitlines():
        body = line.strip()
        if len(line) <= width or sum(ch.isalpha() for ch in body) < 0.5 * len(body):
            out.append(line)
            continue
        indent = line[:len(line) - len(line.lstrip())]
        out.extend(textwrap.wrap(body, width, initial_indent=indent, subsequent_indent=indent + "  ",
                                 break_on_hyphens=False) or [line])
    return "\n".join(out)
DEFAULT_DECK_COUNT = 6


class InstructorScreen(Screen[None]):
    """Build a scenario, preview its student page and answer key, write it and a deck.

    Attributes:
        generated: the last scenario generated (`briefer.instructor.generation.Generated`), or None.
        stale: why the preview is not that of the current choices (None when it is).
        written: the last scenario file written; deck: the last deck written.
    """

    DEFAULT_CSS = """
    InstructorScreen #instructor-status { height: auto; max-height: 3; padding: 0 1; }
    InstructorScreen #instructor-tabs { height: 1fr; }
    InstructorScreen #instructor-tabs TabPane { padding: 0; }
    InstructorScreen #instructor-form { padding: 0 1; scrollbar-gutter: stable; }
    InstructorScreen .form-row { height: auto; margin-bottom: 1; }
    InstructorScreen .form-row Label { width: 26; padding-top: 1; }
    InstructorScreen .form-row Select, InstructorScreen .form-row Input { width: 1fr; max-width: 60; }
    InstructorScreen .form-row Checkbox { width: auto; }
    InstructorScreen .form-row Button { width: auto; min-width: 28; margin-right: 2; }
    InstructorScreen .preview-scroll { overflow-x: auto; overflow-y: auto; scrollbar-gutter: stable;
                                       scrollbar-size-vertical: 1; }
    InstructorScreen .preview { width: auto; padding: 0; }
    InstructorScreen #instructor-caution { height: auto; padding: 0 1; text-style: bold; }
    """

    BINDINGS = [
        *FOCUS_KEYS,
        Binding("ctrl+g", "generate", "Generate"),
        Binding("ctrl+w", "write_scenario", "Write scenario"),
        Binding("ctrl+d", "write_deck", "Write deck"),
        Binding("1", "show_tab('choose-tab')", "Choose"),
        Binding("2", "show_tab('student-tab')", "Student"),
        Binding("3", "show_tab('answer-tab')", "Answer"),
        Binding("escape", "close", "Back"),
    ]

    TABS = (("choose-tab", "Choose"), ("student-tab", "Student page"), ("answer-tab", "Answer key"))
    """(pane id, title) of the screen's tabs, in order (keys 1, 2, 3)."""

    def __init__(self, catalog: Any = None, *, seed: int | None = None, out_dir: str | os.PathLike[str] | None = None,
                 deck_count: int = DEFAULT_DECK_COUNT, airfield: str | None = None,
                 profile: str | None = None) -> None:
        """Args:
            catalog: An `AppCatalog` (profiles and airfields); None loads the default one.
            seed: The seed to start with (None: a fresh one).
            airfield, profile: The names chosen at first (the brief's own, from the app); None
                or a name not in the catalog: the first one.
            out_dir: Where files are written by default (None: the current folder).
            deck_count: How many scenarios a deck has by default.
        """
        super().__init__()
        if catalog is None:
            from briefer.tui.state import AppCatalog

            catalog = AppCatalog.load()
        if hasattr(catalog, "loaded"):        # the app's catalog reads models on first use
            catalog = catalog.loaded()
        from briefer.instructor.generation import new_seed

        self.catalog = catalog
        self.airfields = {i.name: i for i in catalog.airfields if getattr(i, "model", None) is not None}
        self.profiles = {i.name: i for i in catalog.profiles if getattr(i, "model", None) is not None}
        self.seed = new_seed() if seed is None else int(seed)
        self.out_dir = Path(out_dir) if out_dir is not None else Path.cwd()
        self.deck_count = deck_count
        self.first_airfield = airfield if airfield in self.airfields else next(iter(self.airfields), None)
        self.first_profile = profile if profile in self.profiles else next(iter(self.profiles), None)
        self.generated: Any = None
        self.stale: str | None = None
        self.written: Path | None = None
        self.deck: Path | None = None
        self.busy = False

    # --- layout -----------------------------------------------------------------------------
    def compose(self) -> ComposeResult:
        fields = [(f"{n} {i.title}", n) for n, i in self.airfields.items()]
        profs = [(n, n) for n in self.profiles]
        emph = [("any (drawn from the seed)", ANY_EMPHASIS)] + [(EMPHASIS_TITLES[e], e) for e in EMPHASES]

        def row(label: str, *widgets: Any) -> Horizontal:
            return Horizontal(Label(label), *widgets, classes="form-row")

        yield Static("Choose, then Generate (ctrl+g).", id="instructor-status")
        with TabbedContent(id="instructor-tabs", initial="choose-tab"):
            with TabPane("1 Choose", id="choose-tab"):
                with VerticalScroll(id="instructor-form"):
                    yield row("Airfield", Select(fields, id="airfield", allow_blank=False,
                                                 value=self.first_airfield or Select.BLANK))
                    yield row("Aircraft profile", Select(profs, id="profile", allow_blank=False,
                                                         value=self.first_profile or Select.BLANK))
                    yield row("Emphasis", Select(emph, id="emphasis", allow_blank=False, value=ANY_EMPHASIS))
                    yield row("Seed", TypingInput(str(self.seed), id="seed", type="integer"))
                    yield row("", Button("Generate (ctrl+g)", id="generate", variant="primary"))
                    yield row("Scenario file", TypingInput("", id="scenario-path", placeholder="scenario.yaml"))
                    yield row("", Button("Write scenario (ctrl+w)", id="write-scenario"))
                    yield row("Deck: how many scenarios", TypingInput(str(self.deck_count), id="deck-count", type="integer"))
                    yield row("Deck PDF", TypingInput(str(self.out_dir / f"deck-{self.seed}.pdf"), id="deck-path"))
                    yield row("", Checkbox("Overwrite existing files", id="overwrite"))
                    yield row("", Button("Write deck (ctrl+d)", id="write-deck"))
            with TabPane("2 Student page", id="student-tab"):
                with ScrollableContainer(classes="preview-scroll", id="student-scroll"):
                    yield Static("Generate a scenario first (1 Choose, then ctrl+g).", id="student", classes="preview")
            with TabPane("3 Answer key", id="answer-tab"):
                with ScrollableContainer(classes="preview-scroll", id="answer-scroll"):
                    yield Static("Generate a scenario first (1 Choose, then ctrl+g).", id="answer", classes="preview")
        yield Static(SHORT_CAUTION, id="instructor-caution")
        yield Footer()

    pages: tuple[str, str] | None = None
    _shown_width = 0

    def _preview_width(self) -> int:
        """Columns a preview line can take (the screen's width less the scrollbar)."""
        return max(40, self.size.width - 1)

    def _show_pages(self) -> None:
        """The pages as printed (78-80 columns), prose lines longer than the screen wrapped (the
        drawings never: scroll sideways for them)."""
        if self.pages is None:
            return
        width = self._shown_width = self._preview_width()
        for sel, page in (("#student", self.pages[0]), ("#answer", self.pages[1])):
            self.query_one(sel, Static).update(Text(fit_lines(page, width), no_wrap=True, overflow="ignore"))

    def on_resize(self) -> None:
        if self.pages is not None and self._preview_width() != self._shown_width:
            self._show_pages()

    def action_show_tab(self, pane_id: str) -> None:
        """Show a tab: the form, the student page or the answer key (keys 1, 2, 3)."""
        tabs = self.query_one("#instructor-tabs", TabbedContent)
        tabs.active = pane_id
        target = {"choose-tab": "#airfield", "student-tab": "#student-scroll",
                  "answer-tab": "#answer-scroll"}[pane_id]
        self.query_one(target).focus()

    @on(TabbedContent.TabActivated, "#instructor-tabs")
    def _tab_shown(self, event: TabbedContent.TabActivated) -> None:
        # a preview updated while its tab was hidden is laid out again now that it has a size
        for scroll in event.pane.query(".preview-scroll"):
            scroll.refresh(layout=True)
            for child in scroll.children:
                child.refresh(layout=True)

    def system_commands(self) -> list[tuple[str, str, str]]:
        """(title, help, action) entries for the app's command palette while this screen shows."""
        return [("Instructor: choose", "Show the scenario choices", "show_tab('choose-tab')"),
                ("Instructor: student page", "Show the student page", "show_tab('student-tab')"),
                ("Instructor: answer key", "Show the answer key", "show_tab('answer-tab')"),
                ("Instructor: generate", "Generate a scenario from the choices", "generate"),
                ("Instructor: write scenario", "Write the scenario file", "write_scenario"),
                ("Instructor: write deck", "Write a deck of scenarios", "write_deck")]

    # --- reading the form -------------------------------------------------------------------
    def _value(self, selector: str) -> str:
        return str(self.query_one(selector, Select).value)

    def _whole_number(self, selector: str, what: str, lo: int, hi: int, range_words: str) -> int:
        """The whole number typed in an input, from `lo` to `hi` (the app's one reader of typed
        numbers); else a BriefingError naming it."""
        from briefer.tui.state import parse_optional_number

        try:
            value = parse_optional_number(self.query_one(selector, Input).value, what="", lo=lo, hi=hi,
                                          whole=True, range_words=range_words)
        except ValueError as exc:
            raise BriefingError(f"the {what}: {exc}") from None
        if value is None:
            raise BriefingError(f"the {what}: expected a whole number, {range_words}; the field is empty")
        return int(value)

    def _seed(self) -> int:
        return self._whole_number("#seed", "seed", 0, SEED_MAX, SEED_WORDS)

    def _count(self) -> int:
        return self._whole_number("#deck-count", "deck size", 1, DECK_SIZE_MAX, DECK_SIZE_WORDS)

    def choices(self) -> dict[str, Any]:
        """The airfield and profile models, the emphasis (None: drawn) and the seed chosen."""
        airfield, profile = self._value("#airfield"), self._value("#profile")
        if airfield not in self.airfields or profile not in self.profiles:
            raise BriefingError("choose an airfield and an aircraft profile")
        emphasis = self._value("#emphasis")
        return {"airfield": self.airfields[airfield].model, "profile": self.profiles[profile].model,
                "emphasis": None if emphasis == ANY_EMPHASIS else emphasis, "seed": self._seed(),
                "airfield_ref": self._reference(self.airfields[airfield]),
                "profile_ref": self._reference(self.profiles[profile])}

    def _reference(self, item: Any) -> str:
        from briefer.instructor.scenario_format import reference_for

        source = getattr(item, "source", "")
        if getattr(item, "builtin", True) or not source:
            return item.name
        return reference_for(source, self.out_dir, name=item.name)

    def _fail(self, exc: BriefingError) -> None:
        self.notify(str(exc), severity="error", timeout=8)
        if self.generated is not None:
            self.stale = str(exc)
            self._status()

    def _status(self, text: str | None = None) -> None:
        if text is None:
            g = self.generated
            if g is None:
                text = "Choose, then Generate."
            else:
                text = f"{g.scenario.title} (seed {g.scenario.seed})"
                if self.stale:
                    text = f"STALE (the choices changed or failed: {self.stale}). Last good: {text}"
        self.query_one("#instructor-status", Static).update(Text(text))

    # --- actions ----------------------------------------------------------------------------
    @on(Button.Pressed, "#generate")
    def action_generate(self) -> None:
        try:
            choices = self.choices()
        except BriefingError as exc:
            self._fail(exc)
            return
        self.busy = True
        self._status("Generating...")
        self._generate(choices)

    @work(thread=True, exclusive=True, group="instructor-generate")
    def _generate(self, choices: dict[str, Any]) -> None:
        from briefer.instructor.deck import answer_text, student_text
        from briefer.instructor.generation import generate_scenario

        try:
            gen = generate_scenario(**choices)
            pages = (student_text(gen.scenario, gen.brief), answer_text(gen.scenario, gen.brief, checks=gen.checks))
        except BriefingError as exc:
            self.app.call_from_thread(self._generated, None, None, exc)
            return
        self.app.call_from_thread(self._generated, gen, pages, None)

    def _generated(self, gen: Any, pages: tuple[str, str] | None, error: BriefingError | None) -> None:
        self.busy = False
        if error is not None:
            self._fail(error)
            if self.generated is None:
                self._status(f"Could not generate: {error}")
            return
        self.generated, self.stale = gen, None
        # 78-80 columns as printed (the answer's plan view must not wrap): scroll sideways if narrower
        self.pages = pages
        self._show_pages()
        if self.query_one("#instructor-tabs", TabbedContent).active == "choose-tab":
            self.action_show_tab("student-tab")
        s = gen.scenario
        name = f"scenario-{gen.brief.header.airfield_ident.lower()}-{s.emphasis}-{s.seed}.yaml"
        self.query_one("#scenario-path", Input).value = str(self.out_dir / name)
        self._status()

    @on(Button.Pressed, "#write-scenario")
    def action_write_scenario(self) -> None:
        from briefer.instructor.scenario_format import write_scenario

        if self.generated is None:
            self.notify("Generate a scenario first.", severity="warning")
            return
        path = self.query_one("#scenario-path", Input).value.strip()
        if not path:
            self.notify("Give the scenario file a name.", severity="warning")
            return
        try:
            self.written = write_scenario(os.path.expanduser(path), self.generated.scenario,
                                          overwrite=self.query_one("#overwrite", Checkbox).value)
        except BriefingError as exc:
            self._fail(exc)
            return
        self.notify(f"Scenario written to {self.written}")

    @on(Button.Pressed, "#write-deck")
    def action_write_deck(self) -> None:
        from briefer.render.deck_pdf import check_deck_target

        try:
            seed, count = self._seed(), self._count()
            path = check_deck_target(self.query_one("#deck-path", Input).value.strip(),
                                     overwrite=self.query_one("#overwrite", Checkbox).value)
        except BriefingError as exc:
            self._fail(exc)
            return
        self.busy = True
        self._status(f"Writing a deck of {count} scenarios (seed {seed})...")
        self._deck(seed, count, path, self.query_one("#overwrite", Checkbox).value)

    @work(thread=True, exclusive=True, group="instructor-deck")
    def _deck(self, seed: int, count: int, path: Path, overwrite: bool) -> None:
        from briefer.instructor.deck import build_deck
        from briefer.render.deck_pdf import write_deck

        try:
            deck = build_deck(count=count, seed=seed, airfields=[i.model for i in self.airfields.values()],
                              profiles=[i.model for i in self.profiles.values()])
            written = write_deck(path, deck, overwrite=overwrite)
        except BriefingError as exc:
            self.app.call_from_thread(self._decked, None, exc)
            return
        self.app.call_from_thread(self._decked, written, None)

    def _decked(self, written: Path | None, error: BriefingError | None) -> None:
        self.busy = False
        self._status()
        if error is not None:
            self._fail(error)
            return
        self.deck = written
        self.notify(f"Deck written to {written}")

    @on(Select.Changed)
    @on(Input.Changed, "#seed")
    def _choices_changed(self) -> None:
        if self.generated is not None and not self.busy:
            self.stale = "press Generate for the new choices"
            self._status()
        seed = self.query_one("#seed", Input).value.strip()
        if seed.isdigit():
            self.query_one("#deck-path", Input).value = str(self.out_dir / f"deck-{seed}.pdf")

    def action_close(self) -> None:
        self.dismiss(None)
