"""Section builder "weather checks": the wind on the landing runway (components, gusts), the
weather the brief used and where it came from, and the report's own cautions. Findings' wording
for these (tailwind, variable wind, the report's variable sector, unsure ceiling, skipped groups)
lives here. A variable wind is planned as calm and flagged.
"""

from __future__ import annotations

from dataclasses import dataclass

from briefer.brief.findings import FindingList
from briefer.brief.situation_inputs import Situation
from briefer.core import wind
from briefer.result import Finding, WeatherUsed, WindInfo

TAILWIND_WARNING_KT = 2.0


@dataclass(frozen=True, slots=True)
class WeatherChecks:
    """The brief's wind and weather parts, with the findings on the wind."""

    wind: WindInfo
    weather: WeatherUsed
    findings: tuple[Finding, ...]


def weather_section(s: Situation, weather_report=None) -> WeatherChecks:
    """Wind components on the landing runway, tailwind and variable-wind checks, weather used."""
    request = s.request
    wx = request.weather
    found = FindingList()
    course_true = s.runway.landing_course_deg_true
    if s.wind_from_true is not None:
        comp = wind.wind_components_kt(s.wind_from_true, s.wind_speed_kt, course_deg=course_true)
        hw, xw = float(comp.headwind_kt), float(comp.crosswind_from_right_kt)
    else:
        hw, xw = 0.0 - s.wind_speed_kt, 0.0      # 0 - 0 = +0: no "-0 kt" for calm
    ghw = gxw = None
    if wx.wind_gust_kt is not None and s.wind_from_true is not None:
        gc = wind.wind_components_kt(s.wind_from_true, wx.wind_gust_kt, course_deg=course_true)
        ghw, gxw = float(gc.headwind_kt), float(gc.crosswind_from_right_kt)
    if hw < -TAILWIND_WARNING_KT:
        found.add("warning", "tailwind", f"Tailwind of {-hw:.0f} kt on runway {request.landing_runway}.")
    if s.wind_from_true is None and s.wind_speed_kt > 0:
        found.add("warning", "variable-wind",
                  "Variable wind: planned as calm; see the wind envelope for every direction.")
    wind_info = WindInfo(reported=wx.wind_speed_kt is not None and s.wind_speed_kt > 0,
                         from_deg_true=s.wind_from_true, speed_kt=s.wind_speed_kt, gust_kt=wx.wind_gust_kt,
                         headwind_kt=hw, crosswind_from_right_kt=xw, gust_headwind_kt=ghw,
                         gust_crosswind_from_right_kt=gxw)
    source = "manual" if any(v is not None for v in (wx.wind_speed_kt, wx.oat_c, wx.altimeter_hpa,
                                                     wx.visibility_sm, wx.ceiling_ft)) else "standard"
    if weather_report is not None:
        source = "report"
    weather = WeatherUsed(source=source, report=None if weather_report is None else weather_report.raw,
                          oat_c=s.oat_c, altimeter_hpa=s.altimeter_hpa, visibility_sm=wx.visibility_sm,
                          ceiling_ft=wx.ceiling_ft)
    return WeatherChecks(wind=wind_info, weather=weather, findings=tuple(found))


def report_findings(weather_report) -> tuple[Finding, ...]:
    """The decoded report's own cautions: a variable wind sector, a ceiling that may be lower,
    groups not used (listed last in the brief)."""
    found = FindingList()
    if weather_report is None:
        return ()
    if weather_report.wind_variable_from_deg is not None:
        found.add("warning", "variable-wind-sector",
                  f"The wind varies between {weather_report.wind_variable_from_deg:03.0f}° and "
                  f"{weather_report.wind_variable_to_deg:03.0f}°: brief the worst direction (see the wind envelope).")
    if weather_report.ceiling_may_be_lower:
        found.add("warning", "ceiling-unsure", "The report does not rule out a ceiling lower than stated.")
    if weather_report.skipped:
        found.add("info", "report-skipped", "Report groups not used: "
                  + ", ".join(f"{g} ({why})" for g, why in weather_report.skipped) + ".")
    return tuple(found)
