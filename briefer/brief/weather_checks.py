"""Section builder "weather checks": the wind on the landing runway (components, gusts), the
weather the brief used and where it came from, and the report's own cautions. Findings' wording
for these (tailwind, variable wind, the report's variable sector, unsure ceiling, skipped groups)
lives here. A variable wind is planned as calm and flagged.
"""

from __future__ import annotations

from briefer._dataclass import dataclass

from briefer.brief.findings import FindingList, SectionResult
from briefer.brief.situation_inputs import Situation
from briefer.core import wind
from briefer.result import Finding, WeatherUsed, WindInfo
from briefer.wording import crosswind_words, headwind_words

TAILWIND_WARNING_KT = 2.0
# Where a profile gives no limit: common practice, from memory (not a flight-manual value); beyond
# them a WARNING, never the DANGER of the aircraft's own limit.
COMMON_PRACTICE_TAILWIND_KT = 10.0     # the tailwind most transport flight manuals certify for landing
COMMON_PRACTICE_CROSSWIND_KT = 25.0    # a usual operator limit on a dry runway


@dataclass(frozen=True, slots=True, kw_only=True)
class WeatherChecks(SectionResult):
    """The brief's wind and weather parts (the findings are on the wind)."""

    wind: WindInfo
    weather: WeatherUsed
    beyond_limits: tuple[str, ...] = ()   # the aircraft's wind limits exceeded: no plan is recommended


def weather_section(s: Situation, weather_report=None) -> WeatherChecks:
    """Wind components on the landing runway, tailwind and variable-wind checks, weather used."""
    request = s.request
    wx = request.weather
    found = FindingList()
    course_true = s.runway.landing_course_deg_true
    if s.wind_from_true is not None:
        hw, xw = s.headwind_kt, s.crosswind_kt     # the situation's components of this wind on this course
    else:
        hw, xw = 0.0 - s.wind_speed_kt, 0.0      # 0 - 0 = +0: no "-0 kt" for calm
    ghw = gxw = None
    if wx.wind_gust_kt is not None and s.wind_from_true is not None:
        gc = wind.wind_components_kt(s.wind_from_true, wx.wind_gust_kt, course_deg=course_true)
        ghw, gxw = float(gc.headwind_kt), float(gc.crosswind_from_right_kt)
    cfg = s.configuration
    beyond = _wind_limit_findings(cfg, hw, xw, ghw, gxw, found)
    if hw < -TAILWIND_WARNING_KT and not beyond:
        found.add("warning", "tailwind", f"Tailwind of {-hw:.0f} kt on runway {request.landing_runway}.")
    if s.wind_from_true is None and s.wind_speed_kt > 0:
        found.add("warning", "variable-wind",
                  "Variable wind: planned as calm; see the wind envelope for every direction.")
    wind_info = WindInfo(reported=wx.wind_speed_kt is not None and s.wind_speed_kt > 0,
                         from_deg_true=s.wind_from_true, speed_kt=s.wind_speed_kt, gust_kt=wx.wind_gust_kt,
                         headwind_kt=hw, crosswind_from_right_kt=xw, gust_headwind_kt=ghw,
                         gust_crosswind_from_right_kt=gxw, crosswind_limit_kt=cfg.max_demonstrated_crosswind_kt,
                         tailwind_limit_kt=cfg.tailwind_limit_kt, limits_source=_limits_source(cfg))
    source = "manual" if any(v is not None for v in (wx.wind_speed_kt, wx.oat_c, wx.altimeter_hpa,
                                                     wx.visibility_sm, wx.ceiling_ft)) else "standard"
    if weather_report is not None:
        source = "report"
    weather = WeatherUsed(source=source, report=None if weather_report is None else weather_report.raw,
                          oat_c=s.oat_c, altimeter_hpa=s.altimeter_hpa, visibility_sm=wx.visibility_sm,
                          ceiling_ft=wx.ceiling_ft)
    return WeatherChecks(wind=wind_info, weather=weather, findings=tuple(found), beyond_limits=beyond)


def _limits_source(cfg) -> str:
    given = [v is not None for v in (cfg.max_demonstrated_crosswind_kt, cfg.tailwind_limit_kt)]
    return "profile" if all(given) else "part" if any(given) else "not given"


def _worst(steady: float, gust: float | None) -> tuple[float, bool]:
    """The larger of the steady value and the gust value (both counted toward the limit), and
    whether the gust gives it."""
    if gust is not None and gust > steady:
        return gust, True
    return steady, False


def _wind_limit_findings(cfg, hw: float, xw: float, ghw: float | None, gxw: float | None,
                         found: FindingList) -> tuple[str, ...]:
    """The wind against the configuration's limits (worst of steady and gust, in whole knots as
    printed): beyond the profile's limit a DANGER (and the plan is withheld); where the profile
    gives none, "not given" and the common-practice defaults, beyond which a WARNING."""
    cross, cross_gust = _worst(abs(xw), None if gxw is None else abs(gxw))
    tail, tail_gust = _worst(-hw, None if ghw is None else -ghw)
    in_gusts = " in the gusts"

    def cross_words() -> str:
        return f"crosswind {crosswind_words(gxw if cross_gust else xw)}{in_gusts if cross_gust else ''}"

    def tail_words() -> str:
        return f"{headwind_words(-tail)}{in_gusts if tail_gust else ''}"

    checks = (  # (kind, worst value, its words (made only for a finding), profile limit,
                #  common-practice limit, limit's name, what the flight manual calls it)
        ("crosswind", cross, cross_words, cfg.max_demonstrated_crosswind_kt, COMMON_PRACTICE_CROSSWIND_KT,
         "maximum demonstrated crosswind", "demonstrated crosswind"),
        ("tailwind", tail, tail_words, cfg.tailwind_limit_kt, COMMON_PRACTICE_TAILWIND_KT, "tailwind limit",
         "tailwind limit"),
    )
    beyond: list[str] = []
    for kind, value, words, limit, _, limit_name, _ in checks:
        if limit is not None and round(value) > limit:
            text = f"{words()} is beyond the {limit_name} of {limit:.0f} kt ({cfg.name})"
            beyond.append(text)
            found.add("danger", f"{kind}-beyond-limit", f"The {text}: no plan is recommended; land on another "
                      "runway or divert.")
    missing = [(kind, default) for kind, _, _, limit, default, _, _ in checks if limit is None]
    if missing:
        found.add("info", "wind-limits-not-given",
                  f"The profile's {' and '.join(kind for kind, _ in missing)} limit for {cfg.name}: not given. "
                  f"Checked instead against common practice (from memory, not the flight manual): "
                  + ", ".join(f"{kind} {default:.0f} kt" for kind, default in missing) + ".")
    for kind, value, words, limit, default, _, manual_name in checks:
        if limit is None and round(value) > default:
            found.add("warning", f"{kind}-beyond-default",
                      f"{words().capitalize()} is beyond {default:.0f} kt, a common-practice limit (the "
                      f"profile gives none): check the flight manual's {manual_name}.")
    return tuple(beyond)


def report_findings(weather_report, airfield_ident: str | None = None) -> tuple[Finding, ...]:
    """The decoded report's own cautions: a report from another station than the airfield, a
    variable wind sector, a ceiling that may be lower, groups not used (listed last in the brief)."""
    found = FindingList()
    if weather_report is None:
        return ()
    station = getattr(weather_report, "station", None)
    if airfield_ident and station and station.upper() != airfield_ident.upper():
        found.add("warning", "report-other-station",
                  f"The weather report is from {station}, not from {airfield_ident}: check that it applies here "
                  "(the altimeter setting and the ceiling may differ).")
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
