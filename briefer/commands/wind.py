"""`briefer wind`: headwind and crosswind components of a reported wind on a runway."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, non_empty, ranged

NAME = "wind"
HELP = "headwind and crosswind components of a wind on a runway (steady and gust)"
DESCRIPTION = (HELP + ". Wind forms: 270/15, 270/15G25, 27015G25KT, VRB05KT, 00000KT, calm, "
               "optionally with a variation group (\"270/15 240V300\"). Crosswind is positive "
               "from the right, headwind negative for a tailwind. METAR winds are true, tower "
               "winds magnetic; runway headings are magnetic: give --variation-deg when the "
               "references differ.")
ORDER = 33


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--wind", type=non_empty, required=True, metavar="W",
                        help="the wind, e.g. 270/15G25 or 27015G25KT (quote it if it has a space)")
    parser.add_argument("--wind-is", choices=("true", "magnetic"), default="true",
                        help="reference of the wind direction (default true, as in a METAR)")
    parser.add_argument("--runway-heading-deg", type=ranged(0, 360, "deg"), required=True, metavar="H",
                        help="runway heading (or course), degrees")
    parser.add_argument("--runway-heading-is", choices=("magnetic", "true"), default="magnetic",
                        help="reference of the runway heading (default magnetic)")
    parser.add_argument("--variation-deg", type=ranged(-90, 90, "deg"), metavar="V",
                        help="magnetic variation, east positive (true = magnetic + east variation)")
    add_json_flag(parser)


def _fmt_components(head: float | None, cross: float | None) -> str:
    if head is None or cross is None:
        return "-"
    along = f"{abs(head):.1f} kt {'head' if head >= 0 else 'tail'}wind"
    side = "from the right" if cross > 0 else "from the left" if cross < 0 else ""
    return f"{along}, {abs(cross):.1f} kt crosswind {side}".rstrip()


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.core.wind import Wind, parse_wind, wind_components_kt, worst_wind_components_kt

    wind = parse_wind(args.wind, reference=args.wind_is)
    notes: list[str] = []
    # Express the runway heading in the wind's reference (true = magnetic + east variation).
    course = args.runway_heading_deg
    if args.wind_is != args.runway_heading_is:
        if args.variation_deg is None:
            notes.append(f"Wind is {args.wind_is}, runway heading {args.runway_heading_is}, no "
                         "--variation-deg: treated as the same reference (error up to the local "
                         "magnetic variation).")
        else:
            sign = 1.0 if args.runway_heading_is == "magnetic" else -1.0
            course = args.runway_heading_deg + sign * args.variation_deg
    payload: dict[str, Any] = {
        "wind": args.wind,
        "wind_from_deg": wind.from_deg,
        "wind_speed_kt": wind.speed_kt,
        "wind_gust_kt": wind.gust_kt,
        "wind_reference": wind.reference,
        "wind_variable_from_deg": wind.variable_from_deg,
        "wind_variable_to_deg": wind.variable_to_deg,
        "runway_heading_deg": args.runway_heading_deg,
        "runway_heading_reference": args.runway_heading_is,
        "variation_deg": args.variation_deg,
        "runway_heading_in_wind_reference_deg": course,
    }
    worst_case = wind.from_deg is None and not wind.is_calm
    if wind.is_calm:
        head = cross = 0.0
        g_head = g_cross = None
        notes.append("Calm.")
    elif worst_case:
        steady = worst_wind_components_kt(Wind(from_deg=None, speed_kt=wind.speed_kt,
                                               reference=wind.reference), course_deg=course)
        head, cross = float(steady.headwind_kt), float(steady.crosswind_from_right_kt)
        g_head = g_cross = None
        if wind.gust_kt is not None:
            gust = worst_wind_components_kt(wind, course_deg=course)
            g_head, g_cross = float(gust.headwind_kt), float(gust.crosswind_from_right_kt)
        notes.append("Variable direction: the components are worst cases (the full speed as a "
                     "tailwind and as a crosswind; they do not occur together).")
    else:
        comps = wind_components_kt(wind.from_deg, wind.speed_kt, course_deg=course)
        head, cross = float(comps.headwind_kt), float(comps.crosswind_from_right_kt)
        g_head = g_cross = None
        if wind.gust_kt is not None:
            g = wind_components_kt(wind.from_deg, wind.gust_kt, course_deg=course)
            g_head, g_cross = float(g.headwind_kt), float(g.crosswind_from_right_kt)
    payload.update({
        "headwind_kt": head,
        "crosswind_kt": cross,
        "gust_headwind_kt": g_head,
        "gust_crosswind_kt": g_cross,
        "components_are_worst_case": worst_case,
    })
    if wind.variable_from_deg is not None:
        worst = worst_wind_components_kt(wind, course_deg=course)
        payload["worst_headwind_kt"] = float(worst.headwind_kt)
        payload["worst_crosswind_kt"] = float(worst.crosswind_from_right_kt)
        notes.append(f"Direction varying {wind.variable_from_deg:03.0f}-{wind.variable_to_deg:03.0f}: "
                     "worst_* are the least favourable components over that sector"
                     + (" at the gust speed." if wind.gust_kt is not None else "."))
    notes.append("Crosswind positive from the right; headwind negative for a tailwind.")
    payload["notes"] = notes

    def table() -> Any:
        direction = ("calm" if wind.is_calm else "variable" if wind.from_deg is None
                     else f"{wind.from_deg:03.0f}° {wind.reference}")
        speed = "" if wind.is_calm else f" {wind.speed_kt:g} kt"
        if wind.gust_kt is not None:
            speed += f" gusting {wind.gust_kt:g} kt"
        rows = [("Wind", direction + speed),
                ("Runway heading", f"{args.runway_heading_deg:03.0f}° {args.runway_heading_is}"),
                ("Steady" + (" (worst case)" if worst_case else ""), _fmt_components(head, cross))]
        if g_head is not None:
            rows.append(("Gust" + (" (worst case)" if worst_case else ""), _fmt_components(g_head, g_cross)))
        if "worst_headwind_kt" in payload:
            rows.append(("Worst over the sector", _fmt_components(payload["worst_headwind_kt"],
                                                                   payload["worst_crosswind_kt"])))
        from rich.console import Group
        from rich.text import Text

        return Group(key_value_table("Wind components", rows), *(Text(f"Note: {n}") for n in notes))

    return emit(args, payload, table)
