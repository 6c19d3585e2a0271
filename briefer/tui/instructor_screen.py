"""The instructor screen: build a practice scenario, preview both pages, write the file and a deck.

Choose the airfield, the profile, the emphasis (or let the seed draw it) and the seed, then
Generate (ctrl+g): the screen shows the student page and the answer key as text (the same text
`briefer scenario new` prints; the answer key is the kneeboard card's text plus the trap, why
this case and the grading tolerances). Write the scenario file (ctrl+w) or a deck of varied
scenarios from the same seed (ctrl+d). Esc goes back.

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
from textual.containers import Horizontal, ScrollableContainer, Vertical, VerticalScroll
from textual.screen import Screen
from textual.widgets import Button, Checkbox, Footer, Input, Label, Select, Static, TabbedContent, TabPane

from briefer.cautions import SHORT_CAUTION
from briefer.errors import BriefingError
from briefer.scenarios import EMPHASES, EMPHASIS_TITLES

ANY_EMPHASIS = "any"
DEFAULT_DECK_COUNT = 6


class InstructorScreen(Screen[None]):
    """Build a scenario, preview its student page and answer key, write it and a deck.

    Attributes:
        generated: the last scenario generated (`briefer.scenario_generate.Generated`), or None.
        stale: why the preview is not that of the current choices (None when it is).
        written: the last scenario file written; deck: the last deck written.
    """

    DEFAULT_CSS = """
    InstructorScreen #instructor-form { width: 32; padding: 0 1; }
    InstructorScreen #instructor-form Label { margin-top: 1; }
    InstructorScreen #instructor-form Button { width: 100%; margin-top: 1; }
    InstructorScreen #instructor-status { height: auto; max-height: 3; padding: 0 1; }
    InstructorScreen #instructor-tabs { height: 1fr; }
    InstructorScreen #instructor-tabs TabPane { padding: 0; }
    InstructorScreen .preview-scroll { overflow-x: auto; overflow-y: auto; }
    InstructorScreen .preview { width: auto; padding: 0 1; }
    InstructorScreen #instructor-caution { height: 1; padding: 0 1; text-style: bold; }
    """

    BINDINGS = [
        Binding("ctrl+g", "generate", "Generate"),
        Binding("ctrl+w", "write_scenario", "Write scenario"),
        Binding("ctrl+d", "write_deck", "Write deck"),
        Binding("escape", "close", "Back"),
    ]

    def __init__(self, catalog: Any = None, *, seed: int | None = None, out_dir: str | os.PathLike[str] | None = None,
                 deck_count: int = DEFAULT_DECK_COUNT) -> None:
        """Args:
            catalog: An `AppCatalog` (profiles and airfields); None loads the default one.
            seed: The seed to start with (None: a fresh one).
            out_dir: Where files are written by default (None: the current folder).
            deck_count: How many scenarios a deck has by default.
        """
        super().__init__()
        if catalog is None:
            from briefer.tui.state import AppCatalog

            catalog = AppCatalog.load()
        if hasattr(catalog, "loaded"):        # the app's catalog reads models on first use
            catalog = catalog.loaded()
        from briefer.scenario_generate import new_seed

        self.catalog = catalog
        self.airfields = {i.name: i for i in catalog.airfields if getattr(i, "model", None) is not None}
        self.profiles = {i.name: i for i in catalog.profiles if getattr(i, "model", None) is not None}
        self.seed = new_seed() if seed is None else int(seed)
        self.out_dir = Path(out_dir) if out_dir is not None else Path.cwd()
        self.deck_count = deck_count
        self.generated: Any = None
        self.stale: str | None = None
        self.written: Path | None = None
        self.deck: Path | None = None
        self.busy = False

    # --- layout -----------------------------------------------------------------------------
    def compose(self) -> ComposeResult:
        fields = [(f"{n} {i.title}"[:22], n) for n, i in self.airfields.items()]
        profs = [(n, n) for n in self.profiles]
        emph = [("any (drawn from the seed)", ANY_EMPHASIS)] + [(EMPHASIS_TITLES[e], e) for e in EMPHASES]
        with Horizontal():
            with VerticalScroll(id="instructor-form"):
                yield Label("Airfield")
                yield Select(fields, id="airfield", allow_blank=False, value=fields[0][1] if fields else Select.BLANK)
                yield Label("Aircraft profile")
                yield Select(profs, id="profile", allow_blank=False, value=profs[0][1] if profs else Select.BLANK)
                yield Label("Emphasis")
                yield Select(emph, id="emphasis", allow_blank=False, value=ANY_EMPHASIS)
                yield Label("Seed")
                yield Input(str(self.seed), id="seed", type="integer")
                yield Button("Generate (ctrl+g)", id="generate", variant="primary")
                yield Label("Scenario file")
                yield Input("", id="scenario-path", placeholder="scenario.yaml")
                yield Button("Write scenario (ctrl+w)", id="write-scenario")
                yield Label("Deck: how many scenarios, and the PDF")
                yield Input(str(self.deck_count), id="deck-count", type="integer")
                yield Input(str(self.out_dir / f"deck-{self.seed}.pdf"), id="deck-path")
                yield Checkbox("Overwrite existing files", id="overwrite")
                yield Button("Write deck (ctrl+d)", id="write-deck")
            with Vertical():
                yield Static("Choose, then Generate.", id="instructor-status")
                with TabbedContent(id="instructor-tabs"):
                    with TabPane("Student page", id="student-tab"):
                        with ScrollableContainer(classes="preview-scroll"):
                            yield Static("", id="student", classes="preview")
                    with TabPane("Answer key", id="answer-tab"):
                        with ScrollableContainer(classes="preview-scroll"):
                            yield Static("", id="answer", classes="preview")
                yield Static(SHORT_CAUTION, id="instructor-caution")
        yield Footer()

    # --- reading the form -------------------------------------------------------------------
    def _value(self, selector: str) -> str:
        return str(self.query_one(selector, Select).value)

    def _seed(self) -> int:
        text = self.query_one("#seed", Input).value.strip()
        try:
            value = int(text)
        except ValueError:
            raise BriefingError(f"the seed must be a whole number, got {text!r}") from None
        if not 0 <= value < 2**63:
            raise BriefingError(f"the seed must be from 0 to 2^63-1, got {value}")
        return value

    def _count(self) -> int:
        text = self.query_one("#deck-count", Input).value.strip()
        try:
            value = int(text)
        except ValueError:
            raise BriefingError(f"the deck size must be a whole number, got {text!r}") from None
        if not 1 <= value <= 50:
            raise BriefingError(f"the deck size must be 1 to 50, got {value}")
        return value

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
        from briefer.scenarios import reference_for

        source = getattr(item, "source", "")
        if getattr(item, "builtin", True) or not source:
            return item.name
        return reference_for(source, self.out_dir)

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
        from briefer.scenario_deck import answer_text, student_text
        from briefer.scenario_generate import generate_scenario

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
        self.query_one("#student", Static).update(Text(pages[0], no_wrap=True, overflow="ignore"))
        self.query_one("#answer", Static).update(Text(pages[1], no_wrap=True, overflow="ignore"))
        s = gen.scenario
        name = f"scenario-{gen.brief.header.airfield_ident.lower()}-{s.emphasis}-{s.seed}.yaml"
        self.query_one("#scenario-path", Input).value = str(self.out_dir / name)
        self._status()

    @on(Button.Pressed, "#write-scenario")
    def action_write_scenario(self) -> None:
        from briefer.scenarios import write_scenario

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
        from briefer.scenario_deck import check_deck_target

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
        from briefer.scenario_deck import build_deck, write_deck

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
