"""Compact Rich views of a Brief for the app's steps and views (each takes the brief and nothing
else, as in `briefer.render.views`, whose larger views the app also reuses).

Warnings are marked by words and symbols (!!, !, i), never by colour alone.
"""

from __future__ import annotations

import math

from rich.cells import cell_len
from rich.console import Console, ConsoleOptions, Group, RenderableType, RenderResult
from rich.measure import Measurement
from rich.segment import Segment
from rich.table import Table
from rich.text import Text

from briefer.render.views import MARK, STYLE, MinimumsView, fmt, performance_rows
from briefer.display_units import (DEFAULT_UNITS, altimeter_words, finding_text, visibility_reported_words,
                                   visibility_required_words, weight_words)
from briefer.wording import area_edge_words, circling_speed_words, vref_words, wind_components_text, wind_limits_words, wind_words
from briefer.result import Brief


class LabelGrid:
    """Label/value rows drawn as `Table.grid(padding=(0, 1))` with a bold unwrapped label column
    draws them (the same cells), the two columns' widths worked out from the text's own lengths
    and each row laid out as that grid lays it out (the label padded to its column and a space,
    the value wrapped in the width left): a table measures every cell by rendering it and
    renders each through padding and cropping layers, most of its cost, and the app draws these
    grids on every brief. Cells a quick layout cannot match (a label of several lines, a text
    with its own wrapping or justification, widths too narrow for the labels) use the table."""

    def __init__(self) -> None:
        self.rows: list[tuple[str | Text, str | Text]] = []

    def add_row(self, label: str | Text, value: str | Text) -> None:
        self.rows.append((label, value))

    def _widths(self, max_width: int) -> tuple[int, int]:
        """(label column, value column) for `max_width` cells: labels as wide as the widest,
        values as wide as the widest or what is left beside the labels and their one-cell gap
        (what Rich's own measuring gives)."""
        label_w = max((_text_width(label) for label, _ in self.rows), default=0)
        value_w = max((_text_width(value) for _, value in self.rows), default=0)
        return label_w, max(1, min(value_w, max_width - label_w - 1))

    def table(self, max_width: int) -> Table:
        """The grid as a table of fixed column widths for `max_width` cells (see `_widths`)."""
        label_w, value_w = self._widths(max_width)
        t = Table.grid(padding=(0, 1))
        t.add_column(style="bold", no_wrap=True, width=label_w)
        t.add_column(width=value_w)
        for row in self.rows:
            t.add_row(*row)
        return t

    def _quick(self, max_width: int) -> bool:
        label_w, _ = self._widths(max_width)
        return max_width >= label_w + 2 and not any(
            "\n" in (label.plain if isinstance(label, Text) else label)
            or (isinstance(cell, Text) and (cell.justify or cell.overflow or cell.no_wrap is not None
                                            or cell.end != "\n"))
            for label, value in self.rows for cell in (label, value))

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        if not self._quick(options.max_width):
            yield self.table(options.max_width)
            return
        label_w, value_w = self._widths(options.max_width)
        bold = console.get_style("bold")
        gap = Segment(" ", bold)
        blank = Segment(" " * (label_w + 1), bold)
        new_line = Segment.line()
        tab_size = console.tab_size or 8

        def text(cell: str | Text) -> Text:      # a str cell is read as the table reads it (markup, no highlighting)
            return cell if isinstance(cell, Text) else console.render_str(
                cell, highlight=False, markup=options.markup)

        def lines(cell: str | Text, width: int, no_wrap: bool) -> list[list[Segment]]:
            """The cell's lines as the table's Text renders them (its wrapped lines joined, so
            that a line's own style is kept)."""
            wrapped = text(cell).wrap(console, width, justify="left", overflow="ellipsis", no_wrap=no_wrap,
                                      tab_size=tab_size)
            return list(Segment.split_lines(Text("\n").join(wrapped).render(console)))

        for label, value in self.rows:
            head = lines(label, label_w, True)[0]
            for i, line in enumerate(lines(value, value_w, False)):
                if i:
                    yield blank
                else:
                    yield from Segment.apply_style(head, bold)
                    yield gap
                yield from line
                yield new_line

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        return Measurement.get(console, options, self.table(options.max_width))


def _text_width(cell: str | Text) -> int:
    """Cells of the longest line of `cell` (what Rich measures as a text's widest)."""
    plain = cell.plain if isinstance(cell, Text) else cell
    return max((cell_len(line) for line in plain.split("\n")), default=0)


def _grid() -> LabelGrid:
    return LabelGrid()


def _num(value: float | None, spec: str, unit: str = "") -> str:
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "n/a"
    return f"{value:{spec}}{unit}"


def summary_text(brief: Brief) -> Text:
    """One line: where, what, category and minimums."""
    h, c, m = brief.header, brief.category, brief.minimums
    t = Text(no_wrap=True, overflow="ellipsis")
    t.append(f"CAT {c.category}", style="bold")
    if m.authorised:
        t.append(f"  MDA {fmt(m.mda_ft)}  HAA {fmt(m.height_above_airport_ft)}", style="bold")
    else:
        t.append("  NOT AUTHORISED", style="bold reverse")
    t.append(f"  | {h.airfield_ident} {h.approach_name} > circle {h.landing_runway}"
             f" | {h.profile_name} {h.configuration_name}")
    return t


def warnings_line(brief: Brief, units: str = DEFAULT_UNITS) -> Text:
    """How many warnings, and the most severe one's text whole (it wraps; `w` lists them all), in
    the display units `units`."""
    ws = brief.warnings
    n = {s: sum(1 for f in ws if f.severity == s) for s in ("danger", "warning", "info")}
    t = Text()
    if n["danger"] or n["warning"]:
        top = ws[0]
        label = (f"!! {n['danger']} DANGER" if n["danger"] else "") + (
            (" " if n["danger"] else "") + f"! {n['warning']} WARNING{'S' if n['warning'] != 1 else ''}"
            if n["warning"] else "")
        t.append(label, style="bold reverse" if n["danger"] else "bold")
        t.append(" (w lists all)" if len(ws) > 1 else "")
        t.append(" " + finding_text(top, units), style=STYLE[top.severity])
    else:
        t.append("No warnings.", style="bold")
        if n["info"]:
            t.append(f" i {n['info']} note{'s' if n['info'] != 1 else ''} (w lists them)")
    return t


def findings_short(brief: Brief, *, severities: tuple[str, ...] = ("danger", "warning"),
                   units: str = DEFAULT_UNITS) -> RenderableType:
    rows = [f for f in brief.warnings if f.severity in severities]
    if not rows:
        return Text("No warnings.", style="bold")
    out = []
    for f in rows:
        t = Text()
        t.append(f"{MARK[f.severity]} {f.severity.upper()}", style=STYLE[f.severity])
        t.append(" " + finding_text(f, units))
        out.append(t)
    return Group(*out)


def aircraft_implies(brief: Brief, units: str = DEFAULT_UNITS) -> RenderableType:
    """What the aircraft and configuration give: category, speeds, the turn."""
    c, pf = brief.category, brief.performance
    g = _grid()
    cat = f"{c.category}"
    if c.raised:
        cat += f"  (certified {c.certified_category}; RAISED by the circling speed)"
    g.add_row("Category", cat)
    g.add_row("Speeds", f"{circling_speed_words(c)}; {vref_words(c)}")
    g.add_row("Weight", weight_words(brief.header.weight_lb, units))
    for label, text in performance_rows(brief):      # one grid: the labels line up
        g.add_row(label, text)
    return Group(Text("WHAT THIS GIVES", style="bold underline"), g)


def airfield_implies(brief: Brief, units: str = DEFAULT_UNITS) -> RenderableType:
    """Minimums, area and the circling-only reasons."""
    return Group(Text("MINIMUMS AND AREA", style="bold underline"), MinimumsView(brief, units))


def runway_implies(brief: Brief, units: str = DEFAULT_UNITS) -> RenderableType:
    """The wind on the landing runway, why circling, and the plan it leads to."""
    m, p, w = brief.minimums, brief.plan, brief.wind
    g = _grid()
    g.add_row("Land", f"runway {brief.header.landing_runway}, final heading {p.final_heading_deg_mag:03.0f}° M")
    g.add_row("Wind", f"{wind_words(w, compact=True)}: {wind_components_text(w)}")
    if m.circling_only_reasons:
        for r in m.circling_only_reasons:
            g.add_row("Circling only", r.text)
    g.add_row("Straight-in", "available to this runway" if m.straight_in_available else "not available")
    g.add_row("Plan", p.shape_text + ("" if p.feasible else "  (NOT FLYABLE AS BRIEFED)")
              + (f", downwind {p.side} of the runway" if p.feasible else ""))
    return Group(Text("WHAT THIS GIVES", style="bold underline"), g)


def weather_implies(brief: Brief, units: str = DEFAULT_UNITS) -> RenderableType:
    """The weather the brief used and what it means for the minimums."""
    wu, m, w, pf = brief.weather, brief.minimums, brief.wind, brief.performance
    g = _grid()
    g.add_row("Source", {"manual": "typed values", "report": "the report (typed values override it)",
                         "standard": "nothing given: standard values"}.get(wu.source, wu.source))
    g.add_row("Wind", f"{wind_words(w, compact=True)}: {wind_components_text(w)}; {wind_limits_words(w)}")
    g.add_row("Temp/alt", f"OAT {wu.oat_c:.0f} °C, altimeter {altimeter_words(wu.altimeter_hpa, units, spec='.1f')}; "
                          f"TAS {pf.tas_kt:.0f} kt at the MDA")
    vis = {True: "OK", False: "BELOW MINIMUM", None: "not checked"}[m.visibility_ok]
    required = visibility_required_words(m.visibility_required_text, m.visibility_required_sm,
                                         metre_minimums=m.visibility_in_metres, units=units)
    g.add_row("Visibility", f"{visibility_reported_words(wu.visibility_sm, metre_minimums=m.visibility_in_metres, units=units)} vs "
                            f"{required or 'none'} required: {vis}")
    ceil = {True: "OK", False: "BELOW THE MDA", None: "not checked"}[m.ceiling_ok]
    g.add_row("Ceiling", f"{fmt(wu.ceiling_ft, '.0f', ' ft')} vs HAA {fmt(m.height_above_airport_ft, '.0f', ' ft')}: "
                         f"{ceil}")
    if m.cold is not None:
        g.add_row("Cold temp", f"+{m.cold.correction_ft:.0f} ft: MDA {m.cold.corrected_mda_ft:.0f} ft")
    return Group(Text("WHAT THIS GIVES", style="bold underline"), g)


def plan_numbers(brief: Brief) -> RenderableType:
    """The numbers to fly, narrow enough to sit beside the plan view."""
    p, pf, ma = brief.plan, brief.performance, brief.missed_approach
    g = _grid()
    if not p.feasible:
        g.add_row("PLAN", Text("NOT FLYABLE AS BRIEFED", style="bold reverse"))
        for r in p.reasons[:3]:
            g.add_row("", r)
        return g
    g.add_row("Plan", f"{p.shape_text} ({p.side})")
    g.add_row("Offset", f"{p.offset_nm:.2f} NM")
    if p.break_off_s is not None:
        side = f" {p.break_off_direction.upper()}" if p.break_off_direction else ""
        hdg = "" if p.break_off_heading_deg_mag is None else f", {p.break_off_heading_deg_mag % 360.0:03.0f}° M"
        g.add_row("Break off", f"{_num(p.break_off_angle_deg, '.0f', '°')}{side}{hdg}")
        g.add_row("", f"for {p.break_off_s:.0f} s")     # its own line: at 80 columns it wrapped
    if p.downwind_heading_deg_mag is not None:
        g.add_row("Downwind", f"{p.downwind_heading_deg_mag:03.0f}° M")
    t, d = p.abeam_to_roll_in_s, p.roll_in_distance_nm
    if t == t and t < 0:
        g.add_row("Roll in", f"{-t:.0f} s BEFORE abeam thr ({abs(d):.2f} NM)")
    else:
        g.add_row("Abeam>roll", f"{_num(t, '.0f', ' s')} ({_num(None if d != d else abs(d), '.2f', ' NM')} "
                                f"{'past' if d == d and d >= 0 else 'before'})")
    g.add_row("Bank", f"{p.bank_deg:.0f}° (limit {pf.bank_limit_deg:.0f}°)")
    g.add_row("Speed", f"{pf.ias_kt:.0f} IAS / {pf.tas_kt:.0f} TAS kt")
    g.add_row("Roll out", f"{p.roll_out_distance_nm:.2f} NM, {p.final_heading_deg_mag:03.0f}° M")
    g.add_row("Leave MDA", p.leave_mda_text)
    g.add_row("Area", area_edge_words(p.area_edge_margin_nm, p.inside_area).replace(" from the area edge", " to edge")
              .replace(" beyond the area edge", " beyond edge"))
    g.add_row("Missed", f"climbing turn {ma.turn_direction.upper()}")
    return g


def sight_comparison(brief: Brief) -> RenderableType:
    """Planned picture vs the familiar one flown at circling height: bank, g, stall margin."""
    s, pf = brief.sight_picture, brief.performance
    t = Table(box=None, padding=(0, 1), show_edge=False, header_style="bold")
    t.add_column("", style="bold", no_wrap=True)
    t.add_column("Planned", justify="right", no_wrap=True)
    t.add_column("Familiar picture", justify="right", no_wrap=True)
    t.add_row("Runway below horizon", _num(s.planned_depression_deg, ".1f", "°") if s.planned_offset_nm == s.planned_offset_nm
              else "no plan", f"{s.familiar_depression_deg:.1f}°")
    t.add_row("Offset at circling height", _num(s.planned_offset_nm, ".2f", " NM"),
              f"{s.familiar_offset_at_circling_nm:.2f} NM")
    if s.familiar_possible and s.familiar_bank_required_deg is not None:
        over = " !" if s.familiar_exceeds_bank_limit else ""
        t.add_row("Bank", f"{pf.bank_target_deg:.0f}°", f"{s.familiar_bank_required_deg:.0f}°{over}")
        t.add_row("Load factor", f"{pf.load_factor:.2f} g", f"{_num(s.familiar_load_factor, '.2f', ' g')}")
        fam = s.familiar_stall_margin_pct
        t.add_row("Stall margin", f"{pf.stall_margin_pct:.0f} %",
                  "WING STALLS" if fam is not None and round(fam) < 0 else _num(fam, '.0f', ' %'))
        t.add_row(f"AoA ({pf.aoa_unit})", f"{pf.aoa_in_turn:.1f}", _num(s.familiar_aoa, ".1f"))
    else:
        t.add_row("Bank", f"{pf.bank_target_deg:.0f}°", "STALLS FIRST")
    out: list[RenderableType] = [t]
    if s.familiar_exceeds_bank_limit:
        out.append(Text(f"! the familiar picture needs more than the {pf.bank_limit_deg:.0f}° bank limit",
                        style="bold"))
    out.append(Text(f"Holding {pf.bank_target_deg:.0f}° there overshoots the centreline by {s.overshoot_nm:.2f} NM."))
    return Group(*out)


def sight_legend(brief: Brief, *, ascii: bool) -> Text:
    s = brief.sight_picture
    t = Text()
    t.append("*" if ascii else "━", style="bold #4fc3f7")
    t.append(f" planned {s.planned_depression_deg:.1f}° below the horizon   " if s.planned_offset_nm == s.planned_offset_nm
             else " no plan, so no planned picture   ")
    t.append("o" if ascii else "┄", style="#a0a0a0")
    t.append(f" familiar {s.familiar_depression_deg:.1f}° ({s.familiar_height_ft:.0f} ft pattern)")
    return t
