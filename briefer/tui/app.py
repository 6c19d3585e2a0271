"""The Textual app: `BriefingApp` walks the crew through the inputs and shows the Brief.

It computes nothing itself: every change builds a BriefRequest from the inputs
(`briefer.tui.state.request_from_inputs`) and calls `briefer.brief.build_brief` (debounced, in the
brief thread, `briefer.tui.brief_thread`); the wind envelope comes from `briefer.brief.envelope_for`,
in a worker thread.
State is one reactive holding the frozen `BriefingInputs`; results are pushed down into the
screen's widgets; widgets post messages up.
"""

from __future__ import annotations

import asyncio
from collections.abc import Iterable
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from textual import on, work
from textual.app import App, ScreenStackError, SystemCommand
from textual.binding import Binding
from textual.message import Message
from textual.reactive import reactive
from textual.screen import Screen
from textual.widgets import RadioSet, TabbedContent

from briefer.errors import BriefingError
from briefer.tui.brief_thread import BriefThread
from briefer.tui.briefing_screen import STEPS, BriefingScreen
from briefer.tui.state import (
    AppCatalog,
    BriefingInputs,
    InputError,
    decode_report,
    format_number,
    format_wind,
)
from briefer.tui.themes import NIGHT_THEME, THEMES
from briefer.tui.widgets import Choice, ChoiceList, EnvelopePolar, FieldRow

if TYPE_CHECKING:   # numpy and the brief are imported by the first brief's worker, after the first frame
    from briefer.result import Brief

DEBOUNCE_S = 0.0   # an edit starts the brief at once; edits made while one is built are coalesced
FRAME_HOLD_S = 1 / 60   # an edit's echo waits at most one 60 Hz frame for the brief it asks for
ENVELOPE_DIRECTIONS_DEG = tuple(range(0, 360, 10))
ENVELOPE_SPEEDS_KT = tuple(float(s) for s in range(0, 41, 2))

ACTIONS: tuple[tuple[str, str, str], ...] = (
    # (action, palette title, help)
    ("next_step", "Next step", "Go to the next step or view"),
    ("previous_step", "Previous step", "Go to the previous step or view"),
    ("save", "Save inputs", "Save the current inputs as a YAML file"),
    ("open", "Open inputs", "Open a saved inputs file"),
    ("export_card", "Export card", "Write the kneeboard card (PDF or text)"),
    ("toggle_night", "Night theme", "Switch the high-contrast night theme on or off"),
    ("toggle_units", "Display units (US / ICAO)", "Switch lb/SM and kg/m/hPa in the brief's views and the card"),
    ("toggle_ascii", "ASCII drawings", "Draw the plan, side view and envelope in plain ASCII (or braille)"),
    ("warnings", "All warnings", "List every warning of the brief, most severe first"),
    ("instructor", "Instructor", "Open the instructor screen"),
    ("new_entry", "New aircraft or airfield", "Enter a new aircraft (step 1) or airfield (step 2) in a form"),
    ("edit_entry", "Edit aircraft or airfield", "Edit the chosen aircraft (step 1) or airfield (step 2) in a form"),
    ("help", "Help and cautions", "Keys, how the steps work, and the full cautions"),
) + tuple((f"step('{pid}')", f"Go to: {label[2:]}", f"Show step {label}") for pid, label in STEPS)


class BriefingApp(App[None]):
    """Circling brief: entry steps and the brief's views."""

    CSS_PATH = "app.tcss"
    TITLE = "briefer"
    ENABLE_COMMAND_PALETTE = True
    BINDINGS = [
        Binding("1", "step('aircraft')", "Steps", key_display="1-8"),
        *[Binding(str(i + 2), f"step('{pid}')", label, show=False) for i, (pid, label) in enumerate(STEPS[1:])],
        Binding("ctrl+n", "next_step", "Next"),
        Binding("ctrl+s", "save", "Save"),
        Binding("ctrl+o", "open", "Open"),
        Binding("ctrl+e", "export_card", "Card"),
        Binding("ctrl+t", "toggle_night", "Night"),
        Binding("ctrl+g", "toggle_ascii", "ASCII", show=False),
        Binding("u", "toggle_units", "Units US/ICAO", show=False),
        Binding("ctrl+l", "instructor", "Instructor", show=False),
        Binding("w", "warnings", "All warnings", show=False),
        Binding("f2", "new_entry", "New aircraft/airfield (form)", show=False),
        Binding("f3", "edit_entry", "Edit aircraft/airfield (form)", show=False),
        Binding("f1,question_mark", "help", "Help"),
        Binding("escape", "leave_field", "Leave a field (then digits switch steps)", show=False),
    ]

    # repaint=False: the inputs are shown by the widgets, not by the app; an edit must not repaint the screen
    inputs: reactive[BriefingInputs] = reactive(None, init=False, always_update=False, repaint=False)  # type: ignore[arg-type]

    def __init__(self, catalog: AppCatalog, inputs: BriefingInputs, *, ascii: bool | None = None,
                 night: bool = False, debounce_s: float = DEBOUNCE_S, inputs_path: str | None = None,
                 notice: str | None = None, units: str = "us") -> None:
        """Args:
            catalog: The profiles and airfields to choose from (loaded by the caller).
            inputs: The situation to open on.
            ascii: Force ASCII drawings (None: braille unless the terminal cannot show it).
            night: Start in the night theme.
            debounce_s: Wait after an edit before recomputing (0: at once; edits made while a
                brief is built are coalesced into the next one either way).
            inputs_path: The file the inputs came from (the default name to save to).
            notice: A message to show once the app is up (e.g. a file that could not be opened).
            units: Display units, "us" or "icao" (briefer.display_units); `u` switches them.
        """
        super().__init__()
        self._ascii_auto = ascii is None     # decided when the first brief is back (_decide_ascii)
        ascii = bool(ascii)
        self.catalog = catalog
        self.ascii = ascii
        self.debounce_s = debounce_s
        self.inputs_path = inputs_path
        self._notice = notice
        self.set_reactive(BriefingApp.inputs, inputs)
        self.brief: Brief | None = None          # the last good brief
        self.request = None                      # its request
        self.brief_inputs: BriefingInputs | None = None   # the inputs it was built from
        self.stale: str | None = None            # why the brief on screen is not the inputs'
        self.field_errors: dict[str, str] = {}   # field -> message (typed text that cannot be read)
        self.envelope = None
        self.envelope_request = None
        self.computing = False
        self._timer = None
        self._hold: tuple[Any, Any] | None = None   # repaints held for an edit's brief (hold_frame)
        self._pushed: dict[str, tuple[str, Any]] = {}
        self._briefs = BriefThread(self._build_brief)   # one brief at a time, in its own thread
        self._day_theme = "textual-dark"
        for theme in THEMES:
            self.register_theme(theme)
        if night:
            self.theme = NIGHT_THEME.name
        self.main = BriefingScreen(ascii=ascii, units=units)

    # --- start ------------------------------------------------------------------------------
    def get_default_screen(self) -> Screen:
        return self.main

    @on(BriefingScreen.Ready)
    def _screen_ready(self) -> None:
        self._push_inputs(self.inputs)
        # The first brief (and the numpy/core imports it needs) starts once the first frame is
        # painted: the summary line reads "computing the brief..." until then.
        self._starting = True
        self.call_after_refresh(self._first_compute)
        if self._notice:
            self.notify(self._notice, severity="error", timeout=10)

    _starting = False

    def _decide_ascii(self) -> None:
        """Braille or ASCII drawings, as the terminal allows: decided when the first brief is
        back (the check's module imports the drawing code and numpy, which the brief's worker
        has imported by then; nothing is drawn before there is a brief but the envelope's
        legend, which is redrawn)."""
        if self._ascii_auto:
            from briefer.render.planview import braille_supported

            self._ascii_auto = False
            if self.ascii != (not braille_supported()):
                self.action_toggle_ascii()

    def _first_compute(self) -> None:
        self._starting = False
        if self._timer is None and not self.computing:
            self._schedule(0.0)

    @property
    def settled(self) -> bool:
        """True when what is shown answers the current inputs (or they cannot be briefed), every
        step mounted."""
        return self._timer is None and not self.computing and not self._starting and self.main.all_mounted and (
            self.brief_inputs == self.inputs or self.stale is not None)

    # --- pushing inputs into the widgets ---------------------------------------------------
    def _push_inputs(self, inputs: BriefingInputs) -> None:
        """Show `inputs` in every list and field (after open, and at start)."""
        self._push_lists(inputs)
        w = inputs.weather
        texts = {"weight": (format_number(inputs.weight_lb), inputs.weight_lb),
                 "bank": (format_number(inputs.bank_deg), inputs.bank_deg),
                 "report": (w.report, w.report),
                 "wind": (format_wind(w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt),
                          None if w.wind_speed_kt is None else (w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt)),
                 "oat": (format_number(w.oat_c), w.oat_c),
                 "altimeter": (format_number(w.altimeter_hpa, ".6g"), w.altimeter_hpa),
                 "visibility": (format_number(w.visibility_sm), w.visibility_sm),
                 "ceiling": (format_number(w.ceiling_ft), w.ceiling_ft)}
        self._pushed = dict(texts)
        for name, (text, _) in texts.items():
            self.main.set_field_text(name, text)
        self.main.set_wind_reference(w.wind_reference)
        self._show_report_placeholders(w.report)

    def _push_lists(self, inputs: BriefingInputs) -> None:
        cat = self.catalog
        self.main.set_choices("profile", [Choice(i.name, i.name, i.error) for i in cat.profiles], inputs.profile)
        prof = cat.profile(inputs.profile)
        configs = [] if prof is None else [Choice(c.name, c.name + (" (default)" if c.name == prof.default_configuration
                                                                     else "")) for c in prof.configurations]
        chosen_cfg = inputs.configuration or (prof.default_configuration if prof else None)
        self.main.set_choices("configuration", configs, chosen_cfg)
        self.main.set_choices("airfield-list", [Choice(i.name, f"{i.name} {i.title}", i.error) for i in cat.airfields],
                              inputs.airfield)
        af = cat.airfield(inputs.airfield)
        approaches = [] if af is None else [Choice(a.name, a.name) for a in af.approaches]
        self.main.set_choices("approach", approaches, inputs.approach)
        runways = [] if af is None else [Choice(t.designator, f"{t.designator}  (runway {rw.designator})")
                                          for rw in af.runways for t in (rw.threshold_a, rw.threshold_b)]
        self.main.set_choices("runway-list", runways, inputs.landing_runway)

    def use_catalog(self, catalog: AppCatalog, inputs: BriefingInputs) -> None:
        """Use a changed catalog (a form saved a file into it) with these choices, and brief
        again at once, also when the names chosen are the same (their data changed)."""
        self.catalog = catalog
        self._push_lists(inputs)
        if inputs == self.inputs:
            self._schedule(0.0)
        self.inputs = inputs

    def _show_report_placeholders(self, report_text: str) -> None:
        """Empty weather fields show what the report gives."""
        from briefer.io.metar import weather_from_metar

        try:
            report = decode_report(report_text)
        except BriefingError:
            report = None
        rep = weather_from_metar(report) if report is not None else {}
        given = "report: "
        none = "not given"
        wind = format_wind(rep.get("wind_from_deg"), rep.get("wind_speed_kt"), rep.get("wind_gust_kt"))
        self.main.set_placeholder("wind", given + wind if wind else "250/15G25 or calm")
        for name, key, spec in (("oat", "oat_c", "g"), ("altimeter", "altimeter_hpa", ".1f"),
                                ("visibility", "visibility_sm", "g"), ("ceiling", "ceiling_ft", "g")):
            v = rep.get(key)
            self.main.set_placeholder(name, given + format(v, spec) if v is not None else (
                none if report is not None else {"altimeter": "1013 or 29.92"}.get(name, "")))
        if report is not None:
            bits = [report.station, format_wind(report.wind_from_deg_true, report.wind_speed_kt, report.wind_gust_kt)]
            if report.skipped:
                bits.append(f"{len(report.skipped)} group(s) not used")
            self.main.set_note("report", "decoded: " + " ".join(b for b in bits if b))
        else:
            self.main.set_note("report", "")

    # --- one frame per edit ----------------------------------------------------------------
    def hold_frame(self) -> None:
        """An edit was typed: hold the screen's repaints until the brief it asks for is shown (or
        the edit is refused, or changes nothing), one frame (FRAME_HOLD_S) at most, so that the
        typed character and the brief it leads to reach the terminal in the same frame instead
        of the echo in one frame and the brief a frame later. The hold runs out by a callback
        of the event loop (a Textual timer is a task of its own, started and cancelled on every
        keystroke: about 0.2 ms of the app's time before the brief is asked for and shown)."""
        if self._hold is None and self.is_running:
            batch = self.batch_update()
            batch.__enter__()
            self._hold = (batch, asyncio.get_running_loop().call_later(FRAME_HOLD_S, self.release_frame))

    def release_frame(self) -> None:
        """Let the held repaints through (see `hold_frame`)."""
        if self._hold is not None:
            batch, timer = self._hold
            self._hold = None
            timer.cancel()
            batch.__exit__(None, None, None)
            try:
                screen = self.screen
            except ScreenStackError:      # the app is closing
                return
            screen.check_idle()           # the screen paints what changed meanwhile

    # --- messages up from the widgets ------------------------------------------------------
    @on(ChoiceList.Changed)
    def _choice(self, event: ChoiceList.Changed) -> None:
        lid, value, cur = event.choice_list.id, event.value, self.inputs
        if lid == "profile":
            prof = self.catalog.profile(value)
            cfg = cur.configuration
            if prof is not None and cfg is not None and cfg.lower() not in [c.name.lower() for c in prof.configurations]:
                cfg = None
            new = replace(cur, profile=value, configuration=cfg)
        elif lid == "configuration":
            new = replace(cur, configuration=value)
        elif lid == "airfield-list":
            af = self.catalog.airfield(value)
            approach, runway = cur.approach, cur.landing_runway
            if af is not None:
                names = [a.name for a in af.approaches]
                if approach not in names:
                    approach = names[0] if names else approach
                designators = [t.designator for t in af.thresholds]
                if runway not in designators:
                    appr_rwy = next((a.runway for a in af.approaches if a.name == approach), None)
                    runway = next((d for d in designators if d != appr_rwy), designators[0] if designators else runway)
            new = replace(cur, airfield=value, approach=approach, landing_runway=runway)
        elif lid == "approach":
            new = replace(cur, approach=value)
        elif lid == "runway-list":
            new = replace(cur, landing_runway=value)
        else:
            return
        self.inputs = new

    @on(FieldRow.Changed)
    def _field(self, event: FieldRow.Changed) -> None:
        name, value = event.name, event.value
        pushed = self._pushed.get(name)
        row = self.main.node(f"#row-{name}", FieldRow)
        if pushed is not None and pushed[0] == row.text:
            value = pushed[1]            # the text we showed: keep the exact value behind it
        self.field_errors.pop(name, None)
        cur = self.inputs
        if name == "weight":
            new = replace(cur, weight_lb=value)
        elif name == "bank":
            new = replace(cur, bank_deg=value)
        elif name == "wind":
            if value is None:
                new = cur.with_weather(wind_from_deg=None, wind_speed_kt=None, wind_gust_kt=None)
            else:
                new = cur.with_weather(wind_from_deg=value[0], wind_speed_kt=value[1], wind_gust_kt=value[2])
        elif name == "report":
            new = self._new_report(cur, value)
        else:
            key = {"oat": "oat_c", "altimeter": "altimeter_hpa", "visibility": "visibility_sm",
                   "ceiling": "ceiling_ft"}[name]
            new = cur.with_weather(**{key: value})
        if new == cur:
            self._refresh_stale()
            self.release_frame()         # no brief to wait for
        self.inputs = new

    def _new_report(self, cur: BriefingInputs, text: str) -> BriefingInputs:
        """A decoded report. The first report replaces the typed weather wholesale (the fields
        then show the report's values; typing in one overrides it); later ones keep what was typed."""
        self._show_report_placeholders(text)
        if text and not cur.weather.report and cur.weather.explicit():
            new = replace(cur, weather=replace(cur.weather.cleared(), report=text))
            self._pushed.update({n: ("", None) for n in ("wind", "oat", "altimeter", "visibility", "ceiling")})
            for n in ("wind", "oat", "altimeter", "visibility", "ceiling"):
                self.main.set_field_text(n, "")
            self.main.set_wind_reference("true")
            self.notify("Report decoded: the weather fields now show its values; type in a field to override it.",
                        timeout=6)
            return new
        return cur.with_weather(report=text)

    @on(FieldRow.Invalid)
    def _invalid(self, event: FieldRow.Invalid) -> None:
        self.field_errors[event.name] = event.message
        self._refresh_stale()
        self.release_frame()             # the refusal is all there is to show

    @on(RadioSet.Changed, "#wind-ref")
    def _wind_ref(self, event: RadioSet.Changed) -> None:
        ref = "magnetic" if event.pressed.id == "ref-magnetic" else "true"
        self.main._wind_ref = ref
        self.inputs = self.inputs.with_weather(wind_reference=ref)

    @on(EnvelopePolar.Hovered)
    def _hovered(self, event: EnvelopePolar.Hovered) -> None:
        self.main.show_hover(event.text)

    @on(TabbedContent.TabActivated)
    def _tab(self, event: TabbedContent.TabActivated) -> None:
        if event.pane.id == "envelope":
            self._want_envelope()

    # --- recompute -----------------------------------------------------------------------
    def watch_inputs(self, old: BriefingInputs, new: BriefingInputs) -> None:
        if (old.profile, old.airfield, old.approach, old.landing_runway, old.configuration) != (
                new.profile, new.airfield, new.approach, new.landing_runway, new.configuration):
            self._push_lists(new)
        self._schedule(self.debounce_s)

    def _schedule(self, delay: float) -> None:
        """Build the brief for the current inputs: at once (after ``delay``, if any) when no brief
        is being built; otherwise when the one being built is done (it answers older inputs): one
        brief at a time, edits made meanwhile coalesced into the next."""
        if self._timer is not None:
            self._timer.stop()
            self._timer = None
        if self.computing:
            self._again = True           # _brief_done / _brief_failed start the next one
            return
        if delay > 0.0:
            self._timer = self.set_timer(delay, self._compute)
        else:
            self._compute()

    def _compute(self) -> None:
        self._timer = None
        self.computing = True
        self._briefs.ask(self.inputs)

    _again = False                       # asked to brief again while one was being built

    def _newer_inputs(self, inputs: BriefingInputs) -> bool:
        """A brief for ``inputs`` is done: if the inputs changed meanwhile (or a brief was asked
        for again, e.g. the catalog changed), build the next one instead of showing this one."""
        self.computing = False
        again, self._again = self._again or inputs != self.inputs, False
        if not again:
            return False
        self._schedule(self.debounce_s)
        return True

    class BriefBuilt(Message):
        """A brief asked for is built (posted by the brief thread): `brief` and its `request`, or
        why not (`error`: the message and the field at fault, if one is)."""

        def __init__(self, inputs: BriefingInputs, request, brief: Brief | None,
                     error: tuple[str, str | None] | None = None) -> None:
            super().__init__()
            self.inputs, self.request, self.brief, self.error = inputs, request, brief, error

    def _build_brief(self, inputs: BriefingInputs) -> None:
        """Build the brief for `inputs` (in the brief thread) and post it to the app."""
        from briefer.brief import build_brief
        from briefer.tui.state import request_from_inputs

        request = brief = error = None
        try:
            request, report = request_from_inputs(inputs, self.catalog)
            brief = build_brief(request, weather_report=report)
        except InputError as exc:
            error = (str(exc.message), exc.field)
        except BriefingError as exc:
            error = (str(exc), None)
        except Exception as exc:  # a bug: keep the app up, say so, keep the last good brief
            error = (f"unexpected error ({type(exc).__name__}: {exc})", None)
        try:
            self.post_message(self.BriefBuilt(inputs, request, brief, error))
        except RuntimeError:             # the app has closed (its loop with it)
            pass

    @on(BriefBuilt)
    def _brief_built(self, message: BriefBuilt) -> None:
        if message.error is None:
            self._brief_done(message.inputs, message.request, message.brief)
        else:
            self._brief_failed(message.inputs, *message.error)

    def on_unmount(self) -> None:
        self._briefs.stop()

    def _brief_done(self, inputs: BriefingInputs, request, brief: Brief) -> None:
        self._decide_ascii()
        if self._newer_inputs(inputs):
            return                       # a newer edit is on its way
        self.brief, self.request, self.brief_inputs = brief, request, inputs
        self._model_error = None
        for name in ("weight", "bank", "wind", "oat", "altimeter", "visibility", "ceiling", "report"):
            if name not in self.field_errors:
                self.main.set_field_error(name, None)
        self._refresh_stale(show=False)
        self.main.show_brief(brief, self.stale)
        self.release_frame()
        if self._envelope_visible():        # else when the envelope view is next shown
            self._want_envelope()

    def _brief_failed(self, inputs: BriefingInputs, message: str, field: str | None) -> None:
        self._decide_ascii()
        if self._newer_inputs(inputs):
            return
        self._model_error = (field, message)
        if field is not None:
            self.main.set_field_error(field, message)
        else:
            self.notify(message, severity="error", timeout=8)
        self._refresh_stale()
        self.release_frame()

    _model_error: tuple[str | None, str] | None = None

    def _refresh_stale(self, show: bool = True) -> None:
        """Mark the brief stale when the inputs on screen are not the ones it was built from."""
        reason = None
        if self.field_errors:
            name, msg = next(iter(self.field_errors.items()))
            reason = f"{name}: {msg}"
            shown = self._shown_value(name)
            if shown is not None:       # first, so that a long message cannot push it off the line
                reason = f"{name} {shown}. {reason}"
        elif self._model_error is not None:
            field, msg = self._model_error
            reason = f"{field}: {msg}" if field else msg
        self.stale = reason
        if show:
            self.main.show_status(self.brief, reason)

    def _shown_value(self, name: str) -> str | None:
        """The value of field `name` that the brief on screen was built from, as typed text
        ("not given" when empty); None when no brief is shown yet."""
        shown = self.brief_inputs
        if shown is None:
            return None
        w = shown.weather
        text = {"weight": format_number(shown.weight_lb), "bank": format_number(shown.bank_deg),
                "report": w.report, "wind": format_wind(w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt),
                "oat": format_number(w.oat_c), "altimeter": format_number(w.altimeter_hpa, ".6g"),
                "visibility": format_number(w.visibility_sm), "ceiling": format_number(w.ceiling_ft)}.get(name)
        if text is None:
            return None
        return text if text else "not given"

    # --- the envelope (worker) -------------------------------------------------------------
    def _envelope_visible(self) -> bool:
        try:
            return self.main.node("#steps", TabbedContent).active == "envelope"
        except Exception:
            return False

    def _want_envelope(self) -> None:
        if self.request is None or self.request is self.envelope_request:
            return
        self.envelope_request = self.request
        self._envelope_worker(self.request, self.brief)

    @work(thread=True, exclusive=True, group="envelope")
    def _envelope_worker(self, request, brief: Brief) -> None:
        import numpy as np

        from briefer.brief import envelope_for

        try:
            env = envelope_for(request, wind_from_relative_deg=np.array(ENVELOPE_DIRECTIONS_DEG, dtype=float),
                               wind_speed_kt=np.array(ENVELOPE_SPEEDS_KT))
        except Exception as exc:
            self.call_from_thread(self.notify, f"wind envelope: {exc}", severity="error")
            return
        self.call_from_thread(self._envelope_done, request, brief, env)

    def _envelope_done(self, request, brief: Brief, env) -> None:
        if request is not self.request:
            return
        self.envelope = env
        self.main.show_envelope(env, brief)

    # --- actions ---------------------------------------------------------------------------
    FIRST_FOCUS = {"aircraft": "#profile", "airfield": "#airfield-list", "runway": "#runway-list",
                   "weather": "#weather-form", "brief": "#brief-scroll", "plan": "#plan-right",
                   "sight": "#sight-scroll", "envelope": "#envelope-side"}
    """What takes the focus when a step is shown: a list, or the pane's scrolling body (so that
    PageDown scrolls it); never a text field, so the next digit still switches steps."""

    def action_step(self, pane_id: str) -> None:
        """Show a step or view. Focus leaves the old pane first (a focused widget in a hidden
        pane would pull its pane back); the step's list or scrolling body then takes the focus.
        A text field takes it only when clicked or tabbed into."""
        from textual.widgets import Tabs

        tabs = self.main.node("#steps", TabbedContent)
        self.main.set_focus(tabs.query_one(Tabs))
        tabs.active = pane_id
        first = self.FIRST_FOCUS.get(pane_id)
        if first is not None:
            self.main.focus_node(first)

    def _move_step(self, delta: int) -> None:
        tabs = self.main.node("#steps", TabbedContent)
        ids = [pid for pid, _ in STEPS]
        i = ids.index(tabs.active) if tabs.active in ids else 0
        self.action_step(ids[(i + delta) % len(ids)])

    def action_next_step(self) -> None:
        self._move_step(1)

    def action_previous_step(self) -> None:
        self._move_step(-1)

    def action_leave_field(self) -> None:
        from textual.widgets import Tabs

        self.main.node("#steps", TabbedContent).query_one(Tabs).focus()

    def action_toggle_night(self) -> None:
        if self.theme == NIGHT_THEME.name:
            self.theme = self._day_theme
        else:
            self._day_theme = self.theme
            self.theme = NIGHT_THEME.name

    def action_toggle_ascii(self) -> None:
        self.ascii = not self.ascii
        self.main.set_ascii(self.ascii)

    def action_toggle_units(self) -> None:
        from briefer.display_units import next_units

        units = next_units(self.main.units)
        self.main.set_units(units)
        self.notify("Display units: " + {"us": "US (lb, SM)", "icao": "ICAO (kg, m/km, hPa)"}[units]
                    + "; MDA and heights in feet, distances in NM")

    def action_help(self) -> None:
        from briefer.tui.help_screen import HelpScreen

        steps = ", ".join(label for _, label in STEPS)
        keys = [("1-8", f"Go to a step or view: {steps}")]
        helps = {action: help_text for action, _, help_text in ACTIONS}
        keys += [(key_name(b.key_display or b.key), helps.get(b.action, b.description)) for b in self.BINDINGS
                 if isinstance(b, Binding) and b.description and not b.key.isdigit()]
        keys += [("ctrl+p", "Command palette (every action)"), ("ctrl+q", "Quit"),
                 ("tab / shift+tab", "Next / previous field or list")]
        self.push_screen(HelpScreen(keys))

    def action_warnings(self) -> None:
        from briefer.tui.views import findings_short
        from briefer.tui.warnings_screen import WarningsScreen

        if self.brief is None:
            self.notify("No brief yet.", severity="warning")
            return
        title = "WARNINGS, most severe first" + (" (of the last good brief: STALE)" if self.stale else "")
        self.push_screen(WarningsScreen(findings_short(self.brief, severities=("danger", "warning", "info"),
                                                       units=self.main.units), title))

    def unsaveable_reason(self) -> str | None:
        """Why the inputs cannot be saved now: a field flagged wrong (its typed text is not in
        the inputs, so saving would silently write the last good or an empty value), or None."""
        if self.field_errors:
            name, msg = next(iter(self.field_errors.items()))
        elif self._model_error is not None and self._model_error[0] is not None:
            name, msg = self._model_error
        else:
            return None
        return (f"Not saved: the {name} field is wrong ({msg}). Correct or clear it, then save; "
                "the file on disk is unchanged.")

    def action_save(self) -> None:
        from briefer.tui.path_screen import PathScreen

        reason = self.unsaveable_reason()
        if reason is not None:
            self.notify(reason, severity="error", timeout=8)
            return

        def save(path: str, overwrite: bool) -> str | None:
            from briefer.tui.inputs_file import save_inputs

            reason = self.unsaveable_reason()   # a field may have gone wrong since the dialog opened
            if reason is not None:
                return reason
            try:
                save_inputs(self.inputs, path, overwrite=overwrite)
            except BriefingError as exc:
                return str(exc)
            self.inputs_path = path
            self.notify(f"Inputs saved to {path}")
            return None

        self.push_screen(PathScreen("Save the inputs to (YAML)", self.inputs_path or "briefing.yaml", save,
                                    verb="Save"))

    def open_inputs(self, path: str) -> str | None:
        """Open a saved-inputs file; returns the error (shown inline by the dialog) or None."""
        from briefer.tui.inputs_file import load_inputs

        try:
            new = load_inputs(path)
        except BriefingError as exc:
            return str(exc)
        if self.catalog.profile(new.profile) is None:
            return f"{path}: profile: no usable aircraft profile '{new.profile}' in the catalog"
        if self.catalog.airfield(new.airfield) is None:
            return f"{path}: airfield: no usable airfield '{new.airfield}' in the catalog"
        self.inputs_path = path
        self.field_errors.clear()
        self._push_inputs(new)
        self.inputs = new
        self.notify(f"Opened {path}")
        return None

    def action_open(self) -> None:
        from briefer.tui.path_screen import PathScreen

        self.push_screen(PathScreen("Open saved inputs (YAML)", self.inputs_path or "briefing.yaml",
                                    lambda path, _ow: self.open_inputs(path), verb="Open", can_overwrite=False))

    def action_export_card(self) -> None:
        try:
            from briefer.render.card import write_card
        except ImportError:
            self.notify("The card writer is not in this version yet (briefer.render.card).",
                        severity="warning", timeout=6)
            return
        if self.brief is None or self.stale is not None:
            self.notify("The brief on screen is stale: fix the inputs before exporting a card.", severity="error")
            return
        from briefer.tui.path_screen import PathScreen

        brief = self.brief

        def export(path: str, overwrite: bool) -> str | None:
            try:
                written = write_card(brief, path, overwrite=overwrite, units=self.main.units)
            except (BriefingError, ValueError, OSError) as exc:
                return str(exc)
            self.notify(f"Card written to {written}")
            return None

        self.push_screen(PathScreen("Write the card to (.pdf or .txt)", "brief-card.pdf", export, verb="Write"))

    def action_instructor(self) -> None:
        try:
            from briefer.tui.instructor_screen import InstructorScreen
        except ImportError:
            self.notify("The instructor screen is not in this version yet.", severity="warning")
            return
        try:
            self.push_screen(InstructorScreen(self.catalog.loaded(), airfield=self.inputs.airfield,
                                              profile=self.inputs.profile))
        except Exception as exc:  # another engineer's screen: keep the app up
            self.notify(f"Instructor screen: {type(exc).__name__}: {exc}", severity="error")

    MAIN_SCREEN_ACTIONS = frozenset({"step", "next_step", "previous_step", "leave_field", "warnings", "new_entry",
                                     "edit_entry"})
    """Actions on the main screen's steps: off while another screen is shown (its own keys, e.g.
    the instructor screen's 1-3, must not switch the hidden steps)."""

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action in self.MAIN_SCREEN_ACTIONS and self.screen is not self.main:
            return False
        return True

    def action_new_entry(self) -> None:
        from briefer.tui.forms.app_hooks import open_form

        open_form(self, edit=False)

    def action_edit_entry(self) -> None:
        from briefer.tui.forms.app_hooks import open_form

        open_form(self, edit=True)

    def action_command_palette(self) -> None:
        """The command palette (ignoring list keys queued before it has laid out its list)."""
        from textual.command import CommandPalette

        from briefer.tui.safe_palette import SafeCommandPalette

        if self.use_command_palette and not CommandPalette.is_open(self):
            self.push_screen(SafeCommandPalette(id="--command-palette"))

    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        yield from super().get_system_commands(screen)
        own = getattr(screen, "system_commands", None)
        if own is not None:
            for title, help_text, action in own():
                yield SystemCommand(title, help_text, lambda a=action, s=screen: s.run_action(a))
            return
        for action, title, help_text in ACTIONS:
            yield SystemCommand(title, help_text, lambda a=action: self.run_action(a))


_KEY_WORDS = {"question_mark": "?", "escape": "Esc", "f1": "F1", "f2": "F2"}


def key_name(keys: str) -> str:
    """A binding's keys as a crew reads them: 'f1,question_mark' -> 'F1 or ?'."""
    return " or ".join(_KEY_WORDS.get(k.strip(), k.strip()) for k in keys.split(","))


def run_app(catalog: AppCatalog, inputs: BriefingInputs, **kwargs: Any) -> None:
    """Run the app in the terminal."""
    BriefingApp(catalog, inputs, **kwargs).run()


__all__ = ["BriefingApp", "run_app"]
