"""Rich views of a Brief (STYLE G): each takes a result and nothing else.

Used by `briefer brief` (Console().print), the app (Static.update) and, through
`Console(record=True)`, plain text. Warnings come first and are marked by words and symbols, not
colour alone.
"""

from __future__ import annotations

from rich.console import Console, ConsoleOptions, RenderResult
from rich.text import Text

from briefer.render.text_layout import LabelRows, TitledBox

from briefer.wording import area_edge_words, stall_margin_words, signed, break_off_words, timing_words, missed_approach_words, category_words, wind_components_text, wind_limits_words, wind_words
from briefer.display_units import (DEFAULT_UNITS, altimeter_words, finding_text, said_in, visibility_reported_words,
                                   visibility_required_words, weight_words)
from briefer.result import Brief, Finding

MARK = {"danger": "!!", "warning": "! ", "info": "i "}
STYLE = {"danger": "bold white on red", "warning": "bold yellow", "info": "cyan"}


def fmt(value: float | None, spec: str = ".0f", unit: str = "", none: str = "n/r") -> str:
    """Format a number with its unit; `none` (not reported) when missing."""
    if value is None:
        return none
    return f"{value:{spec}}{unit}"


def _kv_grid() -> LabelRows:
    """Bold labels, values wrapped beside them."""
    return LabelRows()


class FindingsView:
    """Warnings, most severe first."""

    def __init__(self, findings: tuple[Finding, ...], units: str = DEFAULT_UNITS) -> None:
        self.findings = findings
        self.units = units

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        if not self.findings:
            yield Text("No warnings.", style="green")
            return
        for f in self.findings:
            t = Text()
            t.append(f"{MARK[f.severity]} {f.severity.upper():7}", style=STYLE[f.severity])
            t.append(" " + finding_text(f, self.units))
            yield t


class MinimumsView:
    def __init__(self, brief: Brief, units: str = DEFAULT_UNITS) -> None:
        self.brief = brief
        self.units = units

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        b = self.brief
        c, m, a = b.category, b.minimums, b.area
        g = _kv_grid()
        g.add_row("Category", category_words(c))
        if m.authorised:
            g.add_row("MDA", f"{fmt(m.mda_ft, '.0f', ' ft')}   HAA {fmt(m.height_above_airport_ft, '.0f', ' ft')}")
            required = visibility_required_words(m.visibility_required_text, m.visibility_required_sm,
                                                 metre_minimums=m.visibility_in_metres, units=self.units)
            vis = (f"required {required or 'n/a'}, reported "
                   f"{visibility_reported_words(m.visibility_reported_sm, metre_minimums=m.visibility_in_metres, units=self.units)}")
            vis += {True: "  OK", False: "  BELOW MINIMUM", None: ""}[m.visibility_ok]
            g.add_row("Visibility", vis)
            ceil = f"reported {fmt(m.ceiling_reported_ft, '.0f', ' ft', none='none')}"
            ceil += {True: "  OK (at or above the HAA)", False: "  BELOW THE MDA", None: ""}[m.ceiling_ok]
            g.add_row("Ceiling", ceil)
            if self.units == "icao":       # the ICAO set names the setting the MDA is flown on
                g.add_row("QNH", altimeter_words(b.weather.altimeter_hpa, self.units))
        else:
            g.add_row("Minimums", f"NOT AUTHORISED: {m.not_authorised_reason}")
        if m.cold is not None:
            g.add_row("Cold temp", f"+{m.cold.correction_ft:.0f} ft -> MDA {m.cold.corrected_mda_ft:.0f} ft "
                                   f"({m.cold.method}, OAT {m.cold.oat_c:.0f} °C)")
        if m.circling_only_reasons:
            for r in m.circling_only_reasons:
                g.add_row("Circling only", r.text)
        g.add_row("Area", f"{a.criteria} {a.radius_nm:.2f} NM ({a.provenance}); "
                          f"this aircraft today needs {a.required_radius_nm:.2f} NM")
        if m.controlling_obstacle:
            g.add_row("Obstacle", f"{m.controlling_obstacle}, clearance {fmt(m.obstacle_clearance_actual_ft, '.0f', ' ft')} "
                                  f"(criteria {m.obstacle_clearance_ft:.0f} ft)")
        yield g


class PlanView:
    def __init__(self, brief: Brief, units: str = DEFAULT_UNITS) -> None:
        self.brief = brief
        self.units = units

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        b = self.brief
        p, pf = b.plan, b.performance
        g = _kv_grid()
        if not p.feasible:
            g.add_row("Plan", f"{p.shape_text}: NOT FLYABLE AS BRIEFED")
            for r in p.reasons:
                g.add_row("", r)
            g.add_row("Missed appr", missed_approach_words("", b.missed_approach.instruction))
            yield g
            if p.alternatives:
                yield Text("Other plans:", style="bold")
                for alt in p.alternatives:
                    yield Text(f"  {alt.shape} ({alt.side}): {said_in(alt.why_not, alt.why_not_visibilities, self.units)}")
            return
        g.add_row("Plan", f"{p.shape_text}, downwind {p.side} of the runway")
        g.add_row("Offset", f"{p.offset_nm:.2f} NM from the centreline")
        if p.break_off_s is not None:
            g.add_row("Break-off", break_off_words(p))
        g.add_row("Timing", timing_words(p, b.header.landing_runway))
        g.add_row("Bank", f"{p.bank_deg:.0f}° target, limit {pf.bank_limit_deg:.0f}°")
        g.add_row("Roll out", f"{p.roll_out_distance_nm:.2f} NM final, heading {p.final_heading_deg_mag:03.0f}° M")
        g.add_row("Leave MDA", p.leave_mda_text)
        area = area_edge_words(p.area_edge_margin_nm, p.inside_area)
        if p.sector_clearance_nm is not None:
            area += ("; on the edge of the not-authorised sector" if abs(p.sector_clearance_nm) < 0.005
                     else f"; {p.sector_clearance_nm:.2f} NM from the not-authorised sector")
        g.add_row("Area", area)
        vis = {True: "stays within the reported visibility", False: "goes beyond the reported visibility",
               None: "visibility not reported"}[p.runway_within_visibility]
        g.add_row("Runway", f"{vis} (farthest {p.max_distance_from_threshold_nm:.2f} NM)")
        g.add_row("Missed appr", missed_approach_words(b.missed_approach.turn_direction,
                                                       b.missed_approach.instruction))
        yield g
        if p.alternatives:
            yield Text("Other plans:", style="bold")
            for alt in p.alternatives:
                yield Text(f"  {alt.shape} ({alt.side}): {said_in(alt.why_not, alt.why_not_visibilities, self.units)}")


class PerformanceView:
    def __init__(self, brief: Brief) -> None:
        self.brief = brief

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        g = _kv_grid()
        for label, text in performance_rows(self.brief):
            g.add_row(label, text)
        yield g


def performance_rows(brief: Brief) -> list[tuple[str, str]]:
    """The performance at the MDA as (label, text) rows: speed, turn, stall, wind."""
    pf, w = brief.performance, brief.wind
    sb = "n/a" if pf.stall_bank_deg is None else f"{pf.stall_bank_deg:.0f}°"
    margin = stall_margin_words(pf.stall_margin_pct).replace("stall margin", "margin")
    return [
        ("Speed", f"{pf.ias_kt:.0f} kt IAS = {pf.tas_kt:.0f} kt TAS at the MDA "
                  f"(OAT {pf.oat_at_mda_c:.0f} °C, ISA{signed(pf.isa_deviation_c)}, DA {pf.density_altitude_ft:.0f} ft)"),
        ("Turn", f"{pf.bank_target_deg:.0f}° bank: radius {pf.turn_radius_nm:.2f} NM, "
                 f"{pf.turn_rate_deg_per_s:.1f}°/s, 180° in {pf.time_180_s:.0f} s, {pf.load_factor:.2f} g"),
        ("Stall", f"{pf.stall_speed_kt:.0f} kt in the turn ({margin}); "
                  f"AoA {pf.aoa_in_turn:.1f} of {pf.aoa_stall:.1f} {pf.aoa_unit}; wing stalls at {sb} bank"),
        ("Wind", f"{wind_words(w, compact=True)}: {wind_components_text(w)}; {wind_limits_words(w)}"),
    ]


class SightPictureView:
    def __init__(self, brief: Brief) -> None:
        self.brief = brief

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        s = self.brief.sight_picture
        g = _kv_grid()
        if s.planned_offset_nm == s.planned_offset_nm:
            g.add_row("Planned", f"runway {s.planned_depression_deg:.1f}° below the horizon at "
                                 f"{s.planned_offset_nm:.2f} NM, {s.circling_height_ft:.0f} ft up")
        else:
            g.add_row("Planned", "none: no plan, so no planned picture")
        g.add_row("Familiar", f"{s.familiar_depression_deg:.1f}° at {s.familiar_offset_nm:.2f} NM, "
                              f"{s.familiar_height_ft:.0f} ft up (your usual pattern)")
        g.add_row("The trap", f"that picture at circling height puts you {s.familiar_offset_at_circling_nm:.2f} NM out")
        if s.familiar_possible and s.familiar_bank_required_deg is not None:
            lim = "  BEYOND THE BANK LIMIT" if s.familiar_exceeds_bank_limit else ""
            g.add_row("It needs", f"{s.familiar_bank_required_deg:.0f}° bank, {s.familiar_load_factor:.2f} g, "
                                  f"{stall_margin_words(s.familiar_stall_margin_pct)}, AoA {fmt(s.familiar_aoa, '.1f')}{lim}")
        else:
            g.add_row("It needs", "a turn no aircraft can fly at this speed (wing stalls first)")
        g.add_row("Or", f"hold the planned bank and overshoot the centreline by {s.overshoot_nm:.2f} NM")
        yield g


class CautionsView:
    def __init__(self, cautions: tuple[str, ...]) -> None:
        self.cautions = cautions

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        yield TitledBox("CAUTIONS", [f"- {c}" for c in self.cautions])


def header_text(brief: Brief, units: str = DEFAULT_UNITS) -> Text:
    h = brief.header
    t = Text()
    t.append(f"{h.airfield_ident} {h.airfield_name}", style="bold")
    t.append(f"  {h.approach_name}, circle to land {h.landing_runway}")
    t.append(f"\n{h.profile_name} ({h.configuration_name}), {weight_words(h.weight_lb, units)}; {h.criteria}; "
             f"elevation {h.airfield_elevation_ft:.0f} ft")
    return t


class BriefView:
    """The whole brief as a compact text layout (fits 80 columns), in the display units `units`
    ('us' or 'icao', briefer.display_units)."""

    def __init__(self, brief: Brief, units: str = DEFAULT_UNITS) -> None:
        self.brief = brief
        self.units = units

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        b = self.brief
        yield header_text(b, self.units)
        yield Text("WARNINGS", style="bold underline")
        yield FindingsView(b.warnings, self.units)
        yield Text("MINIMUMS AND AREA", style="bold underline")
        yield MinimumsView(b, self.units)
        yield Text("PERFORMANCE AT THE MDA", style="bold underline")
        yield PerformanceView(b)
        yield Text("PLAN", style="bold underline")
        yield PlanView(b, self.units)
        yield Text("SIGHT PICTURE", style="bold underline")
        yield SightPictureView(b)
        yield CautionsView(b.cautions)
