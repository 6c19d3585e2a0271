"""`build_brief(request) -> Brief`: the one place that composes the core.

It never raises for a valid request: situations that cannot be flown (category not authorised,
no plan fits the bank limit, the plan leaves the protected area, ceiling below the MDA, the MDA
too close to the controlling obstacle) become findings in the Brief, most severe first.

The brief is a composition of section builders, each returning its part and its findings (the
wording of each finding lives with its section):

- `situation_inputs.situation`: the inputs every section shares (positions, category, MDA,
  area, atmosphere at the MDA, TAS, the plan solver's inputs), computed once;
- `minimums_and_area.minimums_and_area_section`: category, minimums, circling-only reasons, cold
  correction, obstacles; `minimums_and_area.area_info`: the protected area as drawn;
- `performance.performance_section`: TAS, turn, stall margin, angle of attack, the area the turn
  needs today;
- `weather_checks.weather_section`: wind components, tailwind, variable wind, the weather used;
  `weather_checks.report_findings`: the report's own cautions;
- `plan.plan_section`: the manoeuvre plan in the actual wind, its margins, alternatives,
  missed-approach turn;
- `sight_picture.sight_picture_section`: the planned picture against the familiar one.

`envelope.envelope_for` runs the plan's rule over a grid of winds.
"""

from __future__ import annotations

from datetime import datetime, timezone

from briefer.brief.demo_case import demo_request
from briefer.brief.envelope import envelope_for
from briefer.brief.header import brief_header, runway_drawings
from briefer.brief.minimums_and_area import area_info, minimums_and_area_section
from briefer.brief.performance import performance_section
from briefer.brief.plan import plan_section
from briefer.brief.roll_out import roll_out_steps_m
from briefer.brief.sight_picture import sight_picture_section
from briefer.brief.situation_inputs import STANDARD_ALTIMETER_HPA, Situation, situation
from briefer.brief.weather_checks import report_findings, weather_section
from briefer.cautions import CAUTIONS
from briefer.core import criteria  # noqa: F401  (tests patch briefer.brief.criteria)
from briefer.model import BriefRequest
from briefer.result import Brief


def build_brief(request: BriefRequest, *, computed_utc: str | None = None, weather_report=None) -> Brief:
    """Every number the crew needs for one circling approach (see the module docstring).

    ``weather_report`` is the decoded METAR the weather came from, if any (briefer.io.metar):
    its text is kept in the brief and its variable wind sector, unsure ceiling and skipped
    groups become findings.
    """
    s = situation(request)
    mins = minimums_and_area_section(s)
    perf = performance_section(s)
    wx = weather_section(s, weather_report)
    plan = plan_section(s, bank_target_deg=s.inputs.bank_deg, straight_in=mins.minimums.straight_in_available,
                        withheld=wx.beyond_limits + _not_authorised(mins))
    sight = sight_picture_section(s, plan.plan, plan.solved, perf.performance)
    findings = (mins.findings + perf.findings + wx.findings + plan.findings + sight.findings
                + report_findings(weather_report, s.request.airfield.ident))
    if computed_utc is None:
        computed_utc = datetime.now(timezone.utc).strftime("%Y-%m-%d %H:%MZ")
    return Brief(header=brief_header(s), category=mins.category, minimums=mins.minimums,
                 area=area_info(s, perf.required_radius_nm), performance=perf.performance, wind=wx.wind,
                 weather=wx.weather, plan=plan.plan, sight_picture=sight.sight_picture,
                 missed_approach=plan.missed_approach, runways=runway_drawings(s), obstacles=mins.obstacles,
                 findings=findings, cautions=CAUTIONS, computed_utc=computed_utc)


def _not_authorised(mins) -> tuple[str, ...]:
    """No plan is recommended where circling is not authorised for the category."""
    if mins.minimums.authorised:
        return ()
    return (f"circling is not authorised for category {mins.category.category}: no plan",)


__all__ = ["STANDARD_ALTIMETER_HPA", "Situation", "build_brief", "demo_request", "envelope_for",
           "roll_out_steps_m", "situation"]
