"""The main screen: the entry steps (aircraft, airfield, runway, weather) and the brief's views
(brief, plan, sight picture, wind envelope). It only displays: the app pushes results down."""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING

from rich.text import Text
from textual.app import ComposeResult
from textual.message import Message
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.css.query import NoMatches
from textual.lazy import Lazy
from textual.screen import Screen
from textual.widget import Widget
from textual.widgets import Footer, Label, RadioButton, RadioSet, Static, TabbedContent, TabPane

from briefer.cautions import SHORT_CAUTION
from briefer.tui.frame_compositor import ChangedRegionsCompositor
from briefer.tui.rendered_once import RenderedOnce
from briefer.tui.state import (
    parse_altimeter_hpa,
    parse_optional_number,
    parse_wind_text,
)
from briefer.tui.widgets import Choice, ChoiceList, EnvelopePolar, FieldRow, PlanCanvas, SideView
from briefer.tui.widgets._typing_input import FOCUS_KEYS

# The briefing step's typed numbers: unit words and the model's own plausibility range (the one
# declared with BriefRequest's and Weather's fields), so that a value is refused beside its field
# with the same limits the loader and the brief apply. The ranges are named here and read from
# briefer.model when a value is first read: the model is imported after the first frame (with
# the catalog), not to draw the empty fields.
_NUMBER_RANGES = {
    "weight": ("WEIGHT_LB", "lb"), "bank": ("BANK_DEG", "degrees"), "oat": ("OAT_C", "°C"),
    "visibility": ("WX_VISIBILITY_SM", "SM"), "ceiling": ("CEILING_FT", "ft above the field"),
}


def number_field(key: str) -> tuple[Range, str]:
    """(the model's range, unit words) of the briefing field `key`."""
    from briefer import model

    name, what = _NUMBER_RANGES[key]
    return getattr(model, name), what


def __getattr__(name: str):
    """``NUMBER_FIELDS``: key -> (the model's range, unit words) of every briefing number field."""
    if name == "NUMBER_FIELDS":
        return {key: number_field(key) for key in _NUMBER_RANGES}
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def number_parser(key: str):
    """The reader of the briefing field `key` (see `number_field`)."""
    if key not in _NUMBER_RANGES:
        raise KeyError(key)

    def read(text: str):
        rng, what = number_field(key)
        return parse_optional_number(text, what=what, lo=rng.lo, hi=rng.hi)
    return read


if TYPE_CHECKING:   # the views import numpy and the result model: imported with the first brief
    from briefer.model import Range
    from briefer.result import Brief

STEPS = (("aircraft", "1 Aircraft"), ("airfield", "2 Airfield"), ("runway", "3 Runway"),
         ("weather", "4 Weather"), ("brief", "5 Brief"), ("plan", "6 Plan"), ("sight", "7 Sight"),
         ("envelope", "8 Winds"))
"""(pane id, tab label): entry steps first, then the brief's views."""


class MarkedRadioButton(RadioButton):
    """A radio button whose mark is a different glyph when on (●) and off (○), not only a colour."""

    @property
    def BUTTON_INNER(self) -> str:  # type: ignore[override]
        return "●" if self.value else "○"


def _report_parser(text: str) -> str:
    from briefer.errors import BriefingError
    from briefer.tui.state import decode_report

    try:
        decode_report(text)
    except BriefingError as exc:
        raise ValueError(str(exc)) from None
    return text.strip()


class _LazyPane(Lazy):
    """`textual.lazy.Lazy` mounted when its screen says so (`BriefingScreen._mount_steps`)."""

    async def mount_composed_widgets(self, widgets: list[Widget]) -> None:
        self.screen._lazies.append(self)

    @property
    def pane_id(self) -> str:
        return self.parent.id or ""

    async def mount_now(self) -> None:
        await self.parent.mount(self._replace_widget, after=self)
        await self.remove()


class BriefingScreen(Screen):
    """Steps and views in tabs, the brief's summary and warnings on top, the caution below."""

    BINDINGS = [*FOCUS_KEYS]

    def __init__(self, *, ascii: bool = False, units: str = "us") -> None:
        super().__init__(id="briefing")
        self._compositor = ChangedRegionsCompositor()   # an edit's frame renders only what it changes
        self.ascii = ascii
        self.units = units                    # display units of the brief's views (briefer.display_units)
        self._wind_ref = "true"
        self._node_cache: dict = {}           # selector -> widget (the DOM never changes: no re-query per keystroke)
        self._shown: dict[str, object] = {}   # Static id -> the Text it shows (unchanged text: no update)
        self._heights: dict[str, tuple[int, int | None]] = {}   # Static id -> (width, content height) shown
        self._lazies = []                     # steps and views not mounted yet (see _lazy)
        self._mounted_panes = set()
        self._pending = {}                    # (kind, selector) -> what to do with it once mounted

    def node(self, selector, expect_type=None):
        """`query_one`, remembered (a query walks the whole DOM; this screen's widgets stay put)."""
        w = self._node_cache.get(selector)
        if w is None:
            w = self.query_one(selector) if expect_type is None else self.query_one(selector, expect_type)
            self._node_cache[selector] = w
        return w

    def _update(self, static_id: str, content) -> None:
        """Update a Static, unless it already shows this very Text (no refresh, no layout). The
        screen is laid out again only when the new content's height differs from the old one's
        at the Static's width (a layout reflows and repaints the whole screen; a repaint of the
        Static alone is enough for new text of the same height)."""
        old = self._shown.get(static_id)
        if isinstance(content, Text) and isinstance(old, Text) and old == content:
            return
        self._shown[static_id] = content
        static = self.node(f"#{static_id}", Static)
        width = static.size.width
        if not isinstance(content, (str, Text)):     # a table or group: rendered once, not per question
            content = RenderedOnce(static, content)
        static.update(content, layout=False)
        height = static.visual.get_height(static.styles, width) if width else None
        if height is None or self._heights.get(static_id) != (width, height):
            static.refresh(layout=True)
        self._heights[static_id] = (width, height)

    def compose(self) -> ComposeResult:
        yield Static(Text("computing the brief...", style="bold"), id="summary")   # until the first one is back
        yield Static("", id="warnings")
        with TabbedContent(id="steps"):
            with TabPane(STEPS[0][1], id="aircraft"):
                with self._lazy(Horizontal(classes="step")):
                    with Vertical(classes="step-inputs"):
                        yield ChoiceList(id="profile")
                        yield ChoiceList(id="configuration")
                        yield FieldRow("weight", "Weight lb", number_parser("weight"), placeholder="max landing")
                        yield FieldRow("bank", "Bank °", number_parser("bank"), placeholder="profile's")
                    with VerticalScroll(classes="implies"):
                        yield Static("", id="implies-aircraft")
            with TabPane(STEPS[1][1], id="airfield"):
                with self._lazy(Horizontal(classes="step")):
                    with Vertical(classes="step-inputs"):
                        yield ChoiceList(id="airfield-list")
                        yield ChoiceList(id="approach")
                    with VerticalScroll(classes="implies"):
                        yield Static("", id="implies-airfield")
            with TabPane(STEPS[2][1], id="runway"):
                with self._lazy(Horizontal(classes="step")):
                    with Vertical(classes="step-inputs"):
                        yield ChoiceList(id="runway-list")
                    with VerticalScroll(classes="implies"):
                        yield Static("", id="implies-runway")
            with TabPane(STEPS[3][1], id="weather"):
                with self._lazy(VerticalScroll(classes="weather-form", id="weather-form")):
                    yield FieldRow("report", "METAR/SPECI", _report_parser, placeholder="paste a report here",
                                   input_classes="wide")
                    yield FieldRow("wind", "Wind", lambda t: parse_wind_text(t, self._wind_ref),
                                   placeholder="250/15G25")
                    with Horizontal(classes="field-row", id="row-wind-ref"):
                        yield Label("Wind is", classes="field-label")
                        with RadioSet(id="wind-ref"):
                            yield MarkedRadioButton("true (report)", value=True, id="ref-true")
                            yield MarkedRadioButton("magnetic (tower)", id="ref-magnetic")
                    yield FieldRow("oat", "Temp °C", number_parser("oat"))
                    yield FieldRow("altimeter", "Altimeter", parse_altimeter_hpa, placeholder="1013 or 29.92")
                    yield FieldRow("visibility", "Visibility SM", number_parser("visibility"))
                    yield FieldRow("ceiling", "Ceiling ft", number_parser("ceiling"))
                    yield Static("", id="implies-weather", classes="implies-below")
            with TabPane(STEPS[4][1], id="brief"):
                with self._lazy(VerticalScroll(id="brief-scroll")):
                    yield Static("", id="brief-full")
            with TabPane(STEPS[5][1], id="plan"):
                with self._lazy(Horizontal(classes="step")):
                    with Vertical(id="plan-left"):
                        yield PlanCanvas(ascii=self.ascii, id="plan-canvas")
                        yield Static("", id="plan-legend")
                    with VerticalScroll(id="plan-right"):
                        yield Static("", id="plan-numbers")
            with TabPane(STEPS[6][1], id="sight"):
                with self._lazy(VerticalScroll(id="sight-scroll")):
                    yield SideView(ascii=self.ascii, id="side-view")
                    yield Static("", id="sight-legend")
                    yield Static("", id="sight-table")
            with TabPane(STEPS[7][1], id="envelope"):
                with self._lazy(Horizontal(classes="step")):
                    yield EnvelopePolar(unicode=not self.ascii, id="polar")
                    with VerticalScroll(id="envelope-side"):
                        yield Static("", id="envelope-legend")
                        yield Static("", id="envelope-hover")
        yield Static(SHORT_CAUTION, id="caution", markup=False)
        yield Footer()

    def _lazy(self, widget):
        """`widget`, mounted after the first frame: the step shown first, once that frame is
        painted, then (once it is painted too) the other steps and views. The first frame has
        fewer widgets to style and lay out, and the step the crew looks at is filled before the
        hidden ones are mounted."""
        return _LazyPane(widget)

    _lazies: list[_LazyPane]
    _mounted_panes: set[str]
    _pending: dict[tuple[str, str], Callable[[Widget], object]]

    @property
    def all_mounted(self) -> bool:
        """Every step and view is mounted (their widgets can be queried)."""
        return not self._lazies and self.is_mounted

    def on_mount(self) -> None:
        self.call_after_refresh(self._mount_steps)

    async def _mount_steps(self) -> None:
        active = self.node("#steps", TabbedContent).active
        self._lazies.sort(key=lambda lazy: lazy.pane_id != active)     # the step shown first
        if self._lazies:
            await self._mount_lazy(self._lazies[0])
        self.post_message(self.Ready())
        self.call_after_refresh(self._mount_rest)

    async def _mount_rest(self) -> None:
        while self._lazies:
            await self._mount_lazy(self._lazies[0])

    async def _mount_lazy(self, lazy: _LazyPane) -> None:
        pane_id = lazy.pane_id
        await lazy.mount_now()
        self._lazies.remove(lazy)
        self._mounted_panes.add(pane_id)
        self._titles()
        for key, call in list(self._pending.items()):     # what the app pushed before it was there
            try:
                widget = self.node(key[1])
            except NoMatches:
                continue
            del self._pending[key]
            call(widget)
        if pane_id == self.node("#steps", TabbedContent).active:
            self._draw_pane(pane_id)

    def _titles(self) -> None:
        for list_id, title, subtitle in (("#profile", "Aircraft profile", "F2 new  F3 edit"),
                                         ("#configuration", "Configuration", ""),
                                         ("#airfield-list", "Airfield", "F2 new  F3 edit"),   # the forms
                                         ("#approach", "Approach", ""), ("#runway-list", "Landing runway", "")):
            try:
                choices = self.node(list_id, ChoiceList)
            except NoMatches:
                continue
            choices.border_title = title
            if subtitle:
                choices.border_subtitle = subtitle

    def _on_widget(self, kind: str, selector: str, call: Callable[[Widget], object]) -> None:
        """`call(widget)` now, or when the step holding `selector` is mounted (the last call
        of each `kind` for a widget is kept)."""
        try:
            widget = self.node(selector)
        except NoMatches:
            self._pending[(kind, selector)] = call
            return
        call(widget)

    def focus_node(self, selector: str) -> None:
        """Focus `selector` now, or when its step is mounted if that step is still shown (a
        focused widget in a hidden step would pull its step back)."""
        def focus(widget: Widget) -> None:
            if self.node("#steps", TabbedContent).active_pane in widget.ancestors_with_self:
                widget.focus()

        self._on_widget("focus", selector, focus)

    class Ready(Message):
        """The step shown first is mounted (the others follow, see `all_mounted`): the app may
        push the inputs down (what goes to steps not mounted yet is kept until they are)."""

    # --- pushed down by the app -------------------------------------------------------------
    def set_choices(self, list_id: str, choices: list[Choice], chosen: str | None) -> None:
        self._on_widget("choices", f"#{list_id}", lambda w: w.set_choices(choices, chosen))

    def set_field_text(self, name: str, text: str) -> None:
        self._on_widget("text", f"#row-{name}", lambda w: w.set_text(text))

    def set_placeholder(self, name: str, text: str) -> None:
        self._on_widget("placeholder", f"#row-{name}", lambda w: w.set_placeholder(text))

    def set_note(self, name: str, text: str) -> None:
        self._on_widget("note", f"#row-{name}", lambda w: w.show_note(text))

    def set_field_error(self, name: str, message: str | None) -> None:
        self._on_widget("error", f"#row-{name}", lambda w: w.show_error(message))

    def set_wind_reference(self, reference: str) -> None:
        self._wind_ref = reference
        selector = "#ref-magnetic" if reference == "magnetic" else "#ref-true"

        def press(button: Widget) -> None:
            if not button.value:
                button.value = True

        self._on_widget("wind-ref", "#ref-true", lambda w: press(self.node(selector)))

    def set_units(self, units: str) -> None:
        """Show the brief's views in other display units (redrawn from the same brief)."""
        self.units = units
        if self.brief is not None:
            if not self.node("#warnings", Static).has_class("-stale"):   # the top warning names a visibility
                from briefer.tui import views

                self._update("warnings", views.warnings_line(self.brief, self.units))
            self._dirty = {pid for pid, _ in STEPS}
            self._draw_pane(self.node("#steps", TabbedContent).active)

    def set_ascii(self, ascii: bool) -> None:
        self.ascii = ascii
        self._on_widget("ascii", "#plan-canvas", lambda w: setattr(w, "ascii", ascii))
        self._on_widget("ascii", "#side-view", lambda w: setattr(w, "ascii", ascii))
        self._on_widget("ascii", "#polar", lambda w: setattr(w, "unicode", not ascii))
        if self._legend_shown:
            self.show_envelope_legend()
        self._dirty |= {"plan", "sight"}
        self._draw_pane(self.node("#steps", TabbedContent).active)

    def show_brief(self, brief: Brief, stale: str | None) -> None:
        """Show a brief (the last good one, marked when stale): the status lines and the visible
        pane now, the other panes when they are shown (less work per keystroke)."""
        self.brief = brief
        self.show_status(brief, stale)
        self._dirty = {pid for pid, _ in STEPS}
        self._draw_pane(self.node("#steps", TabbedContent).active)

    brief: Brief | None = None
    _dirty: set[str] = set()

    def on_plan_canvas_legend_changed(self, event: PlanCanvas.LegendChanged) -> None:
        self._update("plan-legend", self.node(PlanCanvas).legend_text())

    def on_tabbed_content_tab_activated(self, event: TabbedContent.TabActivated) -> None:
        self._draw_pane(event.pane.id or "")

    def _draw_pane(self, pane_id: str) -> None:
        if pane_id not in self._mounted_panes:
            return                     # drawn when it is mounted (see _mount_lazy)
        if pane_id == "envelope" and not self._legend_shown:
            self.show_envelope_legend()
        brief = self.brief
        if brief is None or pane_id not in self._dirty:
            return
        self._dirty.discard(pane_id)
        from briefer.tui import views
        if pane_id in ("aircraft", "airfield", "runway", "weather"):
            fn = {"aircraft": views.aircraft_implies, "airfield": views.airfield_implies,
                  "runway": views.runway_implies, "weather": views.weather_implies}[pane_id]
            self._update(f"implies-{pane_id}", fn(brief, self.units))
        elif pane_id == "brief":
            from briefer.render.views import BriefView

            self._update("brief-full", BriefView(brief, self.units))
        elif pane_id == "plan":
            canvas = self.node(PlanCanvas)
            canvas.show(brief)
            self._update("plan-legend", canvas.legend_text())
            self._update("plan-numbers", views.plan_numbers(brief))
        elif pane_id == "sight":
            self.node(SideView).show(brief)
            self._update("sight-legend", views.sight_legend(brief, ascii=self.ascii))
            self._update("sight-table", views.sight_comparison(brief))

    def show_status(self, brief: Brief | None, stale: str | None) -> None:
        summary = self.node("#summary", Static)
        warnings = self.node("#warnings", Static)
        if warnings.has_class("-stale") != (stale is not None):
            warnings.set_class(stale is not None, "-stale")
            summary.set_class(stale is not None, "-stale")
        if brief is None:
            self._update("summary", Text("No brief yet." if stale is not None else "computing the brief...",
                                         style="bold"))   # one line, always
        else:
            from briefer.tui import views

            self._update("summary", views.summary_text(brief))
        if stale is not None:
            t = Text()
            t.append(" STALE ", style="bold reverse")
            t.append(" last good brief shown: " + stale, style="bold")
            self._update("warnings", t)      # it wraps (up to 3 lines): a new text may change its height
        elif brief is not None:
            from briefer.tui import views

            self._update("warnings", views.warnings_line(brief, self.units))

    def show_envelope(self, envelope, brief: Brief | None) -> None:
        if "envelope" not in self._mounted_panes:
            self._on_widget("envelope", "#polar", lambda w: self.show_envelope(envelope, brief))
            return
        polar = self.node(EnvelopePolar)
        polar.show(envelope, brief)
        text = ""
        if envelope is not None and brief is not None and brief.wind.reported:
            import math

            w = brief.wind
            rel = math.degrees(math.atan2(w.crosswind_from_right_kt, w.headwind_kt)) % 360.0
            text = "Today's wind: " + polar.describe(rel, w.speed_kt)
        self._update("envelope-hover", Text(text))

    def show_hover(self, text: str) -> None:
        self._update("envelope-hover", Text("Pointer: " + text))

    _legend_shown = False

    def show_envelope_legend(self) -> None:
        """The envelope's legend (drawn when its view is first shown: it reads the core's tables)."""
        from briefer.tui.widgets._envelope_polar import legend_lines

        self._legend_shown = True
        t = Text()
        t.append("WIND ENVELOPE\n", style="bold underline")
        t.append("Top: wind from ahead on final; right: from the right. Centre calm.\n")
        for glyph, style, meaning in legend_lines(not self.ascii):
            t.append(f" {glyph} ", style=style)
            t.append(f"{meaning}\n")
        t.append("Point at a cell for its verdict.")
        self._update("envelope-legend", t)
