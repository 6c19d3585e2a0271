"""The kneeboard card's content, built once from a Brief and drawn twice (text and PDF).

`card_layout(brief)` turns a `Brief` into a `CardLayout`: frozen dataclasses of sections, big
figures ("OFFSET 1.67 NM") and labelled rows, the plan-view `Scene`, the side view of the sight
picture, the warnings (most severe first) and the cautions. `card_text` and the PDF card only
arrange what is here, so the two cannot say different things (STYLE G).

The layout keeps the Brief's own characters; each renderer narrows them to what it can print
with `printable_text` (Latin-1 for the PDF's core fonts, ASCII plus the degree sign for the text
card). Numbers that do not exist (no flyable plan, circling not authorised) show as "--", next to
a status line that says why.

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

import math
import re
import unicodedata
from briefer._dataclass import dataclass
from typing import Literal

from briefer import __version__
from briefer.cautions import CAUTIONS, SHORT_CAUTION
from briefer.render.brief_scene import scene_from_brief
from briefer.render.scene import ROLE_STYLES, Role, Scene
from briefer.render.side_scene import SidePicture, side_picture
from briefer.wording import area_edge_words, stall_margin_words, category_words, missed_approach_words, wind_components_text, wind_limits_words, wind_words
from briefer.display_units import (DEFAULT_UNITS, altimeter_words, finding_text, visibility_reported_words,
                                   visibility_required_words, weight_words)
from briefer.result import Brief, Finding

DASH = "--"
"""Shown for a number that does not exist (no flyable plan, not authorised, not reported)."""

SEVERITY_MARK = {"danger": "!!", "warning": "!", "info": "i"}
"""A symbol per severity, so that no colour is needed to tell them apart."""
SEVERITY_WORD = {"danger": "DANGER", "warning": "WARNING", "info": "NOTE"}


# --- the layout's parts ---------------------------------------------------------------------


@dataclass(frozen=True, slots=True, kw_only=True)
class Figure:
    """A number to fly, printed large: `label` above, `value` large, `note` below."""

    label: str
    value: str
    note: str = ""


@dataclass(frozen=True, slots=True, kw_only=True)
class Row:
    """A labelled line of small print (wrapped by the renderer)."""

    label: str
    text: str


@dataclass(frozen=True, slots=True, kw_only=True)
class Section:
    """A titled block: an optional status line (printed bold, e.g. NOT AUTHORISED), big figures,
    then rows."""

    key: str
    title: str
    status: str = ""
    alert: bool = False               # the status says the case cannot be flown as briefed
    figures: tuple[Figure, ...] = ()
    rows: tuple[Row, ...] = ()


@dataclass(frozen=True, slots=True, kw_only=True)
class WarningLine:
    """One finding, marked by a symbol and a word (never by colour alone)."""

    severity: str
    mark: str
    word: str
    text: str


@dataclass(frozen=True, slots=True, kw_only=True)
class SideView:
    """The sight picture seen from abeam the threshold: the drawing's numbers (`picture`, the
    side view the app draws too) and the comparison in words.

    Attributes:
        picture: What the drawing shows (`briefer.render.side_scene`).
        rows: The comparison in words: "Planned", "Usual", "The trap", "It needs" (under the
            drawing on the PDF, alone on the text card).
    """

    picture: SidePicture
    rows: tuple[Row, ...]


@dataclass(frozen=True, slots=True, kw_only=True)
class LegendLine:
    """A role of the plan view and what it means."""

    role: Role
    text: str


@dataclass(frozen=True, slots=True, kw_only=True)
class CardLayout:
    """Everything on the kneeboard card, in reading order."""

    title: str
    place: str                        # "V2RL  Ellisvane Valley"
    approach: str                     # "RNAV (GPS) RWY 09, circle to land runway 27"
    aircraft: str                     # profile, configuration, weight
    briefed: str                      # "briefed 2000-01-01 00:00Z"
    briefed_utc: str                  # the Brief's computed_utc, as it is
    criteria: str
    minimums: Section
    plan: Section
    plan_view: Scene
    legend: tuple[LegendLine, ...]
    side_view: SideView
    wind: Section
    warnings: tuple[WarningLine, ...]
    cautions: tuple[str, ...]
    footer: str

    def sections(self) -> tuple[Section, ...]:
        """The titled blocks, in reading order."""
        return (self.minimums, self.plan, self.wind)


# --- formatting -----------------------------------------------------------------------------


def _missing(value: float | None) -> bool:
    return value is None or (isinstance(value, float) and not math.isfinite(value))


def num(value: float | None, spec: str = ".0f", unit: str = "") -> str:
    """`value` formatted with its unit, or "--" when it does not exist (None or NaN)."""
    if _missing(value):
        return DASH
    return f"{value:{spec}}{unit}"


def vis(value_sm: float | None) -> str:
    """A visibility in statute miles without trailing zeros: '2.5 SM', '3 SM', '1.24 SM'."""
    if _missing(value_sm):
        return DASH
    return f"{value_sm:.2f}".rstrip("0").rstrip(".") + " SM"


def heading(value_deg: float | None) -> str:
    return num(value_deg, "03.0f", "° M")


# --- narrowing text to what a printer can show ----------------------------------------------

_REPLACEMENTS = {
    "\u2014": "-", "\u2013": "-", "\u2212": "-", "\u2010": "-", "\u2011": "-",
    "\u2192": "->", "\u2190": "<-", "\u2191": "^", "\u2193": "v", "\u2248": "~", "\u2265": ">=",
    "\u2264": "<=", "\u2260": "!=", "\u2018": "'", "\u2019": "'", "\u201c": '"', "\u201d": '"',
    "\u2026": "...", "\u2022": "-", "\u00a0": " ", "\u202f": " ", "\u2009": " ", "\u00d7": "x",
    "\u00b1": "+/-", "\u00b7": "-", "\u2032": "'", "\u2033": '"', "\u00ba": "°",
}


_NOT_PLAIN = re.compile("[^\n -~°]")


def printable_text(text: str, charset: Literal["latin-1", "ascii+degree"]) -> str:
    """`text` narrowed to a character set: known symbols spelled out (an em dash as '-', an arrow
    as '->'), accents dropped where the set lacks the letter, braille cells as spaces, anything
    else as '?'.

    Args:
        text: Any text.
        charset: "latin-1" (the PDF core fonts) or "ascii+degree" (the text card: ASCII and °).
    """
    if not _NOT_PLAIN.search(text):
        return text
    out = []
    for ch in text:
        if ch == "°" or ch == "\n" or (" " <= ch <= "~"):
            out.append(ch)
            continue
        if charset == "latin-1" and "\u00a0" < ch <= "\u00ff":
            out.append(ch)
            continue
        if ch in _REPLACEMENTS:
            rep = _REPLACEMENTS[ch]
            out.append(rep if charset == "latin-1" or rep.isascii() or rep == "°" else "?")
            continue
        if "\u2800" <= ch <= "\u28ff":
            out.append(" ")
            continue
        base = "".join(c for c in unicodedata.normalize("NFKD", ch) if not unicodedata.combining(c))
        if base and all(" " <= c <= "~" for c in base):
            out.append(base)
        else:
            out.append("?")
    return "".join(out)


NBSP = "\u00a0"
_UNIT_AFTER_NUMBER = re.compile(r"(?<=[\d°]) (?=(?:ft|kt|NM|SM|s|g|hPa|lb|kg|km|m|M)\b|%|°C)")


def bind_units(text: str) -> str:
    """Join a number to its unit with a no-break space ('300 ft' never splits across lines);
    renderers turn it back into a plain space after wrapping."""
    return _UNIT_AFTER_NUMBER.sub(NBSP, text)


# --- building the layout --------------------------------------------------------------------


def _ok(flag: bool | None, below: str) -> str:
    return {True: " OK", False: " " + below, None: ""}[flag]


def _minimums(brief: Brief, units: str) -> Section:
    c, m, a, h = brief.category, brief.minimums, brief.area, brief.header
    cat_note = (f"raised from {c.certified_category}: {c.circling_speed_kt:.0f} kt" if c.raised
                else f"circling at {c.circling_speed_kt:.0f} kt")
    status, alert = "", False
    if m.authorised:
        mda_note = f"COLD: FLY {m.cold.corrected_mda_ft:.0f} FT" if m.cold is not None else "no cold correction"
        ceil_note = (f"ceiling {m.ceiling_reported_ft:.0f} ft" + _ok(m.ceiling_ok, "BELOW")
                     if m.ceiling_reported_ft is not None else "ceiling not reported")
        vis_note = (f"reported {visibility_reported_words(m.visibility_reported_sm, metre_minimums=m.visibility_in_metres, units=units)}"
                    + _ok(m.visibility_ok, "BELOW")
                    if m.visibility_reported_sm is not None else "reported: none")
        figures = (Figure(label="CATEGORY", value=c.category, note=cat_note),
                   Figure(label="MDA", value=num(m.mda_ft, ".0f", " ft"), note=mda_note),
                   Figure(label="HAA", value=num(m.height_above_airport_ft, ".0f", " ft"), note=ceil_note),
                   Figure(label="VISIBILITY", value=m.visibility_required_text or DASH,
                          note=_required_metres(m, units) + vis_note))
    else:
        reason = m.not_authorised_reason.rstrip(".")
        head = (f"CIRCLING NOT AUTHORISED. {reason}" if reason.lower().startswith(f"category {c.category}".lower())
                else f"CIRCLING NOT AUTHORISED for category {c.category}: {reason}")
        status, alert = head + ". No MDA, no plan.", True
        figures = (Figure(label="CATEGORY", value=c.category, note=cat_note),
                   Figure(label="MDA", value=DASH, note="not authorised"),
                   Figure(label="HAA", value=DASH, note="not authorised"),
                   Figure(label="VISIBILITY", value=DASH, note="not authorised"))
    rows = [Row(label="Category", text=category_words(c))]
    rows.append(Row(label="Area", text=(
        f"{a.criteria}: {a.radius_nm:.2f} NM from each threshold ({a.provenance}); needed today "
        f"{a.required_radius_nm:.2f} NM. Lowest height {m.lowest_height_ft:.0f} ft ({m.lowest_height_provenance}); "
        f"obstacle clearance {m.obstacle_clearance_ft:.0f} ft ({m.obstacle_clearance_provenance})")))
    for text in a.sector_texts:
        rows.append(Row(label="Sector", text=text))
    if m.controlling_obstacle:
        rows.append(Row(label="Obstacle", text=(
            f"{m.controlling_obstacle}, cleared by {num(m.obstacle_clearance_actual_ft, '.0f', ' ft')} at the MDA "
            f"(criteria {m.obstacle_clearance_ft:.0f} ft)")))
    for r in m.circling_only_reasons:
        rows.append(Row(label="Circling only", text=r.text))
    if m.straight_in_available:
        rows.append(Row(label="Straight-in", text=f"straight-in minimums also apply to runway {h.landing_runway}"))
    if m.cold is not None:
        rows.append(Row(label="Cold temp", text=(
            f"OAT {m.cold.oat_c:.0f} °C: add {m.cold.correction_ft:.0f} ft, fly the MDA as "
            f"{m.cold.corrected_mda_ft:.0f} ft ({m.cold.method})")))
    return Section(key="minimums", title="MINIMUMS", status=status, alert=alert, figures=figures, rows=tuple(rows))


def _required_metres(m, units: str) -> str:
    """'= 4023 m; ' (the charted SM in metres) before the reported visibility, in the icao set,
    when the minimums are in SM; '' otherwise."""
    words = visibility_required_words(m.visibility_required_text, m.visibility_required_sm,
                                      metre_minimums=m.visibility_in_metres, units=units)
    if words is None or words == m.visibility_required_text:
        return ""
    return f"= {words[len(m.visibility_required_text):].lstrip(' =')}; "


def _plan(brief: Brief) -> Section:
    p, pf, ma, h = brief.plan, brief.performance, brief.missed_approach, brief.header
    side = p.side.upper() if p.side in ("left", "right") else DASH
    sided = ma.turn_direction in ("left", "right")
    turn_dir = ma.turn_direction.upper() if sided else "TO RWY"
    if p.feasible:
        status = f"{p.shape_text}; downwind {side} of the runway {h.landing_runway} centreline"
        if p.downwind_heading_deg_mag is not None:
            status += f", heading {heading(p.downwind_heading_deg_mag)}"
        status += "."
        alert = False
    else:
        why = "; ".join(p.reasons) if p.reasons else "see the warnings"
        status, alert = f"NO FLYABLE PLAN: {why}. Do not circle as briefed.", True
    ri = p.roll_in_distance_nm
    ri_note = DASH if _missing(ri) else ("past abeam the threshold" if ri >= 0 else "before abeam the threshold")
    if p.feasible and p.leave_mda_in_turn:
        leave = Figure(label="LEAVE MDA", value=heading(p.leave_mda_heading_deg_mag),
                       note=f"in the turn, {p.leave_mda_distance_nm:.1f} NM to go")
    else:
        leave = Figure(label="LEAVE MDA", value=num(p.roll_out_distance_nm, ".2f", " NM"), note="at roll-out, on final")
    figures = [
        Figure(label="OFFSET", value=num(p.offset_nm, ".2f", " NM"),
               note=f"{p.side} of the centreline" if p.feasible else "no plan"),
        _timing_figure(p, h.landing_runway),
        Figure(label="BANK", value=num(p.bank_deg, ".0f", "°"), note=f"limit {pf.bank_limit_deg:.0f}°"),
        Figure(label="ROLL IN", value=num(None if _missing(ri) else abs(ri), ".2f", " NM"), note=ri_note),
    ]
    if p.break_off_s is not None:
        figures.append(Figure(label="BREAK OFF", value=f"{num(p.break_off_angle_deg, '.0f', '°')}/"
                                                      f"{num(p.break_off_s, '.0f', ' s')}",
                              note=(f"{p.break_off_direction.upper()} off inbound" if p.break_off_direction
                                    else "off the inbound course")
                              + ("" if p.break_off_heading_deg_mag is None
                                 else f", {heading(p.break_off_heading_deg_mag % 360.0)}")))
    figures += [
        Figure(label="ROLL OUT", value=num(p.roll_out_distance_nm, ".2f", " NM"),
               note=f"final, {heading(p.final_heading_deg_mag)}"),
        leave,
        Figure(label="MISSED", value=turn_dir, note="climbing turn to the runway"),
    ]
    rows = [Row(label="Missed appr", text=missed_approach_words(ma.turn_direction, ma.instruction))]
    if p.feasible:
        where = area_edge_words(p.area_edge_margin_nm, p.inside_area)
        if p.sector_clearance_nm is not None:
            where += ("; on the edge of the not-authorised sector" if abs(p.sector_clearance_nm) < 0.005
                      else f"; {p.sector_clearance_nm:.2f} NM from the not-authorised sector")
        seen = {True: "within the reported visibility", False: "BEYOND THE REPORTED VISIBILITY",
                None: "visibility not reported"}[p.runway_within_visibility]
        rows.append(Row(label="Track", text=where + f"; runway {p.max_distance_from_threshold_nm:.2f} NM away at "
                        f"most ({seen})"))
    return Section(key="plan", title="THE PLAN", status=status, alert=alert, figures=tuple(figures),
                   rows=tuple(rows))


def _timing_figure(p, runway: str) -> Figure:
    """Seconds from abeam the landing threshold to the roll-in; a roll-in before abeam is said so,
    never as a negative time."""
    t = p.abeam_to_roll_in_s
    if not _missing(t) and t < 0:
        return Figure(label="TIMING", value=num(-t, ".0f", " s"), note=f"roll-in BEFORE abeam thr {runway}")
    return Figure(label="TIMING", value=num(t, ".0f", " s"), note=f"abeam thr {runway} to roll-in")


def _wind(brief: Brief, units: str) -> Section:
    w, wx, pf, h = brief.wind, brief.weather, brief.performance, brief.header
    comp = f"rwy {h.landing_runway}: {wind_components_text(w)}; {wind_limits_words(w)}"
    source = {"manual": "as entered", "report": "from the report", "report+manual": "report and entries",
              "standard": "none given: standard day"}.get(wx.source, wx.source)
    weather = (f"OAT {wx.oat_c:.0f} °C, altimeter {altimeter_words(wx.altimeter_hpa, units)}, visibility "
               f"{visibility_reported_words(wx.visibility_sm, metre_minimums=brief.minimums.visibility_in_metres, units=units)}, ceiling "
               f"{num(wx.ceiling_ft, '.0f', ' ft') if wx.ceiling_ft is not None else 'not reported'} ({source})")
    rows = [Row(label="Wind", text=(f"{wind_words(w)}; " + comp if w.reported
                                    else f"{wind_words(w)}; {wind_limits_words(w)}")),
            Row(label="Weather", text=weather)]
    if wx.report:
        rows.append(Row(label="Report", text=wx.report))
    rows.append(Row(label="At the MDA", text=(
        f"{pf.ias_kt:.0f} kt IAS = {pf.tas_kt:.0f} kt TAS, OAT {pf.oat_at_mda_c:.0f} °C "
        f"(ISA{round(pf.isa_deviation_c):+d}), "
        f"DA {pf.density_altitude_ft:.0f} ft")))
    rows.append(Row(label="Turn", text=(
        f"{pf.bank_target_deg:.0f}° bank: radius {pf.turn_radius_nm:.2f} NM, 180° in {pf.time_180_s:.0f} s, "
        f"{pf.load_factor:.2f} g; stall {pf.stall_speed_kt:.0f} kt ({stall_margin_words(pf.stall_margin_pct)})")))
    return Section(key="wind", title="WIND, WEATHER, PERFORMANCE", rows=tuple(rows))


def _side_view(brief: Brief) -> SideView:
    s = brief.sight_picture
    h = f"{s.circling_height_ft:.0f} ft"
    rows = [
        Row(label="Planned", text=(f"runway {s.planned_depression_deg:.1f}° below the horizon, "
                                   f"{s.planned_offset_nm:.2f} NM out at {h}" if not _missing(s.planned_offset_nm)
                                   else "none: no plan, so no planned picture")),
        Row(label="Usual", text=(f"{s.familiar_depression_deg:.1f}° below the horizon, {s.familiar_offset_nm:.2f} NM "
                                 f"out at {s.familiar_height_ft:.0f} ft (your everyday pattern)")),
        Row(label="The trap", text=(f"the usual picture at {h} puts you only "
                                    f"{s.familiar_offset_at_circling_nm:.2f} NM out")),
    ]
    if s.familiar_possible and s.familiar_bank_required_deg is not None:
        lim = "; BEYOND THE BANK LIMIT" if s.familiar_exceeds_bank_limit else ""
        rows.append(Row(label="It needs", text=(
            f"{s.familiar_bank_required_deg:.0f}° bank, {num(s.familiar_load_factor, '.2f', ' g')}, "
            f"{stall_margin_words(s.familiar_stall_margin_pct)}{lim}; or overshoot the centreline by "
            f"{s.overshoot_nm:.2f} NM")))
    else:
        rows.append(Row(label="It needs", text=(f"a turn no bank can fly at this speed; at the planned bank you "
                                                f"overshoot the centreline by {s.overshoot_nm:.2f} NM")))
    return SideView(picture=side_picture(brief), rows=tuple(rows))


def _warning(f: Finding, units: str) -> WarningLine:
    return WarningLine(severity=f.severity, mark=SEVERITY_MARK[f.severity], word=SEVERITY_WORD[f.severity],
                       text=finding_text(f, units))


def legend_lines(scene: Scene) -> tuple[LegendLine, ...]:
    """The legend of a plan-view scene: one line per role drawn on it."""
    texts = {Role.PROTECTED_AREA: "protected area", Role.EXCLUDED_SECTOR: "not authorised",
             Role.OBSTACLE: "obstacle, ft", Role.FAMILIAR_TRACK: "usual-picture track",
             Role.DESCENT_POINT: "leave the MDA", Role.FINAL_APPROACH: "final approach"}
    return tuple(LegendLine(role=r, text=texts.get(r, ROLE_STYLES[r].description))
                 for r in scene.roles() if r is not Role.ANNOTATION)


def card_layout(brief: Brief, units: str = DEFAULT_UNITS) -> CardLayout:
    """The card's content, built once from a Brief (see the module docstring), in the display
    units `units` ('us' or 'icao', briefer.display_units)."""
    h = brief.header
    scene = scene_from_brief(brief)
    cautions = tuple(dict.fromkeys(tuple(brief.cautions) + CAUTIONS))   # every standard caution, once
    return CardLayout(
        title="CIRCLING BRIEF",
        place=f"{h.airfield_ident}  {h.airfield_name}",
        approach=f"{h.approach_name}, circle to land runway {h.landing_runway}",
        aircraft=(f"{h.profile_name}, {h.configuration_name}, {weight_words(h.weight_lb, units)}; elevation "
                  f"{h.airfield_elevation_ft:.0f} ft"),
        briefed=f"briefed {brief.computed_utc}" if brief.computed_utc else "briefed (time not recorded)",
        briefed_utc=brief.computed_utc,
        criteria=h.criteria,
        minimums=_minimums(brief, units),
        plan=_plan(brief),
        plan_view=scene,
        legend=legend_lines(scene),
        side_view=_side_view(brief),
        wind=_wind(brief, units),
        warnings=tuple(_warning(f, units) for f in brief.warnings),
        cautions=cautions,
        footer=f"briefer {__version__}. {SHORT_CAUTION}",
    )


__all__ = ["NBSP", "CardLayout", "Figure", "LegendLine", "Row", "Section", "SideView", "WarningLine", "bind_units",
           "card_layout", "legend_lines", "num", "printable_text"]
