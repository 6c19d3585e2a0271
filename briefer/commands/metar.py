"""`briefer metar "REPORT"`: decode a METAR/SPECI into the values a circling brief uses."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag

NAME = "metar"
HELP = "decode a METAR or SPECI report (wind, visibility, ceiling, temperature, altimeter)"
DESCRIPTION = (HELP + ". Quote the report: briefer metar \"METAR Q4LM 121853Z 27015G25KT 3SM "
               "BKN011 M02/M05 A2992\". Groups that cannot be decoded are listed, never guessed.")
ORDER = 60


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("report", nargs="+",
                        help="the report text (quote it; several words are joined with spaces)")
    add_json_flag(parser)


def _num(value: float) -> str:
    return f"{value:.2f}".rstrip("0").rstrip(".")


def _wind(r: Any) -> str:
    if r.wind_unit is None:
        return "no wind group"
    if r.wind_is_calm:
        return "calm"
    if r.wind_speed_kt is None and r.wind_from_deg_true is None and not r.wind_is_variable:
        return "not reported"
    direction = ("variable" if r.wind_is_variable else "direction not reported"
                 if r.wind_from_deg_true is None else f"{r.wind_from_deg_true:03.0f}° true")
    speed = "speed not reported" if r.wind_speed_kt is None else f"{_num(r.wind_speed_kt)} kt"
    text = f"{direction} {speed}"
    if r.wind_gust_kt is not None:
        text += f" gusting {_num(r.wind_gust_kt)} kt"
    if r.wind_unit != "KT" and r.wind_speed_as_reported is not None:
        text += f" (reported {r.wind_speed_as_reported:.0f}"
        if r.wind_gust_as_reported is not None:
            text += f" G{r.wind_gust_as_reported:.0f}"
        text += f" {r.wind_unit})"
    if r.wind_variable_from_deg is not None:
        text += f", varying {r.wind_variable_from_deg:03.0f}°-{r.wind_variable_to_deg:03.0f}°"
    return text


def _visibility(r: Any) -> str:
    if r.cavok:
        return f"10 km or more ({_num(r.visibility_sm)} SM), CAVOK"
    if r.visibility_group is None:
        return "no visibility group"
    if r.visibility_m is None:
        return "not reported"
    qualifier = "less than " if r.visibility_is_less_than else "at least " if r.visibility_is_at_least else ""
    text = f"{qualifier}{_num(r.visibility_sm)} SM ({r.visibility_m:.0f} m) [{r.visibility_group}]"
    if r.visibility_minimum_m is not None:
        text += f"; minimum {r.visibility_minimum_m:.0f} m {r.visibility_minimum_direction}"
    return text


def _ceiling(r: Any) -> str:
    if r.ceiling_ft is not None:
        text = f"{r.ceiling_ft:.0f} ft"
        return text + " (a lower one may be unreported)" if r.ceiling_may_be_lower else text
    if r.ceiling_may_be_lower:
        return "not known (sky condition not fully reported)"
    if r.cavok:
        return "none below 5000 ft (CAVOK)"
    return f"none reported ({r.cloud_free_code})" if r.cloud_free_code else "none reported"


def _temperatures(r: Any) -> str:
    def t(v: float | None) -> str:
        return "not reported" if v is None else f"{v:.0f} °C"
    return f"{t(r.temperature_c)} / {t(r.dew_point_c)}"


def _altimeter(r: Any) -> str:
    if r.altimeter_unit is None:
        return "no altimeter group"
    if r.altimeter_hpa is None:
        return "not reported"
    if r.altimeter_unit == "inHg":
        return f"{r.altimeter_inhg:.2f} inHg ({r.altimeter_hpa:.1f} hPa)"
    return f"{r.altimeter_hpa:.0f} hPa ({r.altimeter_inhg:.2f} inHg)"


def _rows(r: Any) -> list[tuple[str, str]]:
    when = ("not reported" if r.observed_day_of_month is None else
            f"day {r.observed_day_of_month}, {r.observed_hour_utc:02d}{r.observed_minute_utc:02d} UTC")
    flags = [w for w, on in (("AUTO", r.auto), ("COR", r.corrected)) if on]
    rows = [("Station", " ".join([r.report_type or "(type not given)", r.station, *flags])),
            ("Observed", when)]
    if r.nil:
        rows.append(("Report", "NIL (missing report)"))
    else:
        weather = ("not observable" if r.present_weather is None
                   else " ".join(r.present_weather) or "none reported")
        clouds = " ".join(c.group for c in r.clouds) or r.cloud_free_code or ("CAVOK" if r.cavok else "none")
        rows += [("Wind", _wind(r)), ("Visibility", _visibility(r)), ("Weather", weather),
                 ("Cloud", clouds), ("Ceiling", _ceiling(r)),
                 ("Temperature / dew point", _temperatures(r)), ("Altimeter", _altimeter(r))]
        for label, items in (("RVR", r.rvr), ("Recent weather", r.recent_weather),
                             ("Wind shear", r.wind_shear)):
            if items:
                rows.append((label, " ".join(items)))
        if r.trend:
            rows.append(("Trend (not decoded)", r.trend))
        if r.remarks:
            rows.append(("Remarks (not decoded)", r.remarks))
    for group, reason in r.skipped:
        rows.append(("Skipped", f"{group}: {reason}"))
    return rows


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.io.metar import decode_metar, weather_from_metar

    report = decode_metar(" ".join(args.report))
    payload = report.to_mapping()
    payload["weather"] = weather_from_metar(report)
    return emit(args, payload, lambda: key_value_table(f"METAR {report.station}", _rows(report)))
