"""`briefer area`: the published circling-area radius (TERPS legacy / expanded, ICAO PANS-OPS)."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, ranged
from briefer.vocabulary import CATEGORIES, CRITERIA_SETS

NAME = "area"
HELP = "circling-area radius: TERPS legacy, TERPS expanded (by MDA) or ICAO PANS-OPS"
DESCRIPTION = (HELP + ". terps-legacy: fixed radius per category (charts without the negative-C "
               "symbol); terps-expanded: radius by category and circling MDA, needs --mda-ft "
               "(charts with the negative-C symbol); icao: R = 2r + S built from the category's "
               "maximum circling IAS at aerodrome elevation + 1000 ft, ISA+15, 25 kt wind, needs "
               "--airport-elevation-ft. Values from memory are marked. With --tas-kt and "
               "--bank-deg the radius this aircraft needs (same 2r + S construction, today's "
               "wind added to TAS) is shown beside the published one.")
ORDER = 21



def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--category", type=str.upper, choices=CATEGORIES, required=True,
                        help="approach category (the one that applies at the circling speed)")
    parser.add_argument("--criteria", choices=CRITERIA_SETS, required=True,
                        help="design criteria of the procedure (see the chart)")
    parser.add_argument("--mda-ft", type=ranged(-1500, 30_000, "ft"), metavar="M",
                        help="circling MDA, ft MSL (needed for terps-expanded)")
    parser.add_argument("--airport-elevation-ft", type=ranged(-1500, 15_000, "ft"), metavar="E",
                        help="aerodrome elevation, ft MSL (needed for icao)")
    parser.add_argument("--tas-kt", type=ranged(20, 400, "kt"), metavar="V",
                        help="this aircraft's TAS at the MDA, kt (shows the radius it needs)")
    parser.add_argument("--bank-deg", type=ranged(1, 60, "deg"), metavar="B",
                        help="planned bank for the radius needed, deg (with --tas-kt)")
    parser.add_argument("--wind-kt", type=ranged(0, 150, "kt"), metavar="W", default=0.0,
                        help="today's wind speed, added to TAS as the design does, kt (default 0)")
    parser.add_argument("--straight-segment-nm", type=ranged(0, 5, "NM"), metavar="S",
                        help="straight segment S for the radius needed, NM (default: the "
                        "category's Doc 8168 value 0.3/0.4/0.5/0.6/0.7)")
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.core import criteria as cr
    from briefer.errors import DomainError

    area = cr.circling_area_radius_nm(args.category, criteria=args.criteria,
                                      mda_ft_msl=args.mda_ft,
                                      airport_elevation_ft=args.airport_elevation_ft)
    payload: dict[str, Any] = {
        "category": area.category,
        "criteria": area.criteria,
        "radius_nm": area.radius_nm,
        "basis": area.basis,
        "provenance": area.provenance,
        "provenance_text": cr.provenance_label(area.provenance),
        "from_memory": area.from_memory,
        "source": area.source,
    }
    if area.mda_ft_msl is not None:
        payload["mda_ft_msl"] = area.mda_ft_msl
        payload["mda_band"] = area.mda_band
    if area.icao is not None:
        c = area.icao
        payload["construction"] = {
            "airport_elevation_ft": c.airport_elevation_ft,
            "altitude_ft": c.altitude_ft,
            "isa_deviation_c": c.isa_deviation_c,
            "ias_kt": c.ias_kt,
            "tas_kt": c.tas_kt,
            "wind_kt": c.wind_kt,
            "tas_plus_wind_kt": c.tas_plus_wind_kt,
            "bank_deg": c.bank_deg,
            "turn_rate_deg_per_s": c.turn_rate_deg_per_s,
            "turn_radius_nm": c.turn_radius_nm,
            "straight_segment_nm": c.straight_segment_nm,
            "radius_nm": c.radius_nm,
        }

    notes = ["The area is the arcs of this radius around each usable runway threshold, joined by "
             "tangents; obstacle clearance is protected only inside it and only at or above the "
             "MDA."]
    if args.criteria == "terps-expanded":
        notes.append("Expanded radii apply only to procedures charted with the negative-C symbol; "
                     "without it, use the legacy radius.")
    if area.from_memory:
        notes.append("This radius is from memory, not verified against the published table: "
                     "check the chart legend before relying on it.")

    required = None
    if args.tas_kt is not None or args.bank_deg is not None:
        if args.tas_kt is None or args.bank_deg is None:
            raise DomainError("--tas-kt and --bank-deg go together (the radius this aircraft needs)")
        s = (args.straight_segment_nm if args.straight_segment_nm is not None
             else cr.ICAO_STRAIGHT_SEGMENT_NM[args.category])
        required = cr.required_radius_nm(tas_kt=args.tas_kt, wind_kt=args.wind_kt,
                                         bank_deg=args.bank_deg, straight_segment_nm=s)
        margin = area.radius_nm - required.radius_nm
        payload["required"] = {
            "tas_kt": required.tas_kt,
            "wind_kt": required.wind_kt,
            "tas_plus_wind_kt": required.tas_plus_wind_kt,
            "bank_deg": required.bank_deg,
            "turn_rate_deg_per_s": required.turn_rate_deg_per_s,
            "turn_radius_nm": required.turn_radius_nm,
            "straight_segment_nm": required.straight_segment_nm,
            "radius_nm": required.radius_nm,
        }
        payload["margin_nm"] = margin
        payload["fits"] = margin >= 0.0
        if margin < 0.0:
            notes.append(f"The turn as planned needs {required.radius_nm:.2f} NM, more than the "
                         f"published {area.radius_nm:.2f} NM: fly slower, bank more (within "
                         "limits) or plan the circle closer in.")
    payload["notes"] = notes

    def table() -> Any:
        from rich.console import Group
        from rich.text import Text

        mark = " (from memory)" if area.from_memory else ""
        rows = [("Criteria", area.criteria), ("Category", area.category),
                ("Radius", f"{area.radius_nm:.2f} NM{mark}")]
        if area.mda_band is not None:
            rows.append(("Circling MDA", f"{area.mda_ft_msl:,.0f} ft MSL (band {area.mda_band})"))
        if area.icao is not None:
            c = area.icao
            rows += [("IAS (category max circling)", f"{c.ias_kt:.0f} kt"),
                     ("TAS", f"{c.tas_kt:.1f} kt at {c.altitude_ft:,.0f} ft, ISA+{c.isa_deviation_c:g}"),
                     ("TAS + wind", f"{c.tas_plus_wind_kt:.1f} kt ({c.wind_kt:g} kt wind)"),
                     ("Bank / rate", f"{c.bank_deg:.1f}° / {c.turn_rate_deg_per_s:.2f}°/s"),
                     ("Turn radius r", f"{c.turn_radius_nm:.3f} NM"),
                     ("Straight segment S", f"{c.straight_segment_nm:g} NM")]
        rows.append(("Provenance", cr.provenance_label(area.provenance)))
        if required is not None:
            rows += [("Needed today (2r + S)", f"{required.radius_nm:.2f} NM"),
                     ("  at", f"{required.tas_plus_wind_kt:.0f} kt TAS + wind, "
                      f"{required.bank_deg:g}° bank, S {required.straight_segment_nm:g} NM"),
                     ("Margin", f"{payload['margin_nm']:+.2f} NM"
                      + ("" if payload["fits"] else "  DOES NOT FIT"))]
        lines = [f"Source: {area.source}"] + [f"Note: {n}" for n in notes]
        return Group(key_value_table("Circling area", rows), Text("\n".join(lines)))

    return emit(args, payload, table)
