"""`briefer coldtemp`: cold-temperature correction of an altitude (Doc 8168 formula / AIM table)."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, ranged

NAME = "coldtemp"
HELP = "cold-temperature altitude correction (ICAO formula, AIM/ICAO table)"
DESCRIPTION = (HELP + ". sea-level-table (default) reproduces the AIM/ICAO cold temperature error "
               "table (formula for a sea-level aerodrome, rounded up to 10 ft; conservative at "
               "elevated aerodromes); airport-elevation uses the real elevation (smaller, "
               "unrounded). Both are shown; the output says which one was applied. No correction "
               "when the temperature is at or above standard.")
ORDER = 32


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--airport-elevation-ft", type=ranged(-1500, 15_000, "ft"), required=True, metavar="E",
                        help="elevation of the aerodrome (altimeter-setting source), ft")
    parser.add_argument("--oat-c", type=ranged(-90, 60, "degC"), required=True, metavar="T",
                        help="reported aerodrome temperature, degC")
    parser.add_argument("--altitude-ft", type=ranged(-1500, 30_000, "ft"), required=True, metavar="A",
                        help="published altitude to correct (MSL), ft")
    parser.add_argument("--method", choices=("sea-level-table", "airport-elevation"),
                        default="sea-level-table",
                        help="correction method (default sea-level-table, the AIM/ICAO table)")
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.core.coldtemp import METHODS, cold_temperature_correction
    from briefer.errors import DomainError

    height = args.altitude_ft - args.airport_elevation_ft
    if height < 0:
        raise DomainError(f"--altitude-ft {args.altitude_ft:g} is below the airport elevation "
                          f"{args.airport_elevation_ft:g} ft")
    results = {m: cold_temperature_correction(height, airport_oat_c=args.oat_c,
                                              airport_elevation_ft=args.airport_elevation_ft, method=m)
               for m in METHODS}
    used = results[args.method]
    payload: dict[str, Any] = {
        "altitude_ft": args.altitude_ft,
        "airport_elevation_ft": args.airport_elevation_ft,
        "oat_c": args.oat_c,
        "height_above_airport_ft": height,
        "method": args.method,
        "applicable": used.applicable,
        "correction_ft": used.correction_ft,
        "corrected_altitude_ft": args.altitude_ft + used.correction_ft,
        "correction_by_method_ft": {m: r.correction_ft for m, r in results.items()},
        "notes": [
            "Doc 8168 Vol I Part III Sec 1 Ch 4 approximate formula. Add the correction to the "
            "published altitude; an MDA/DA correction may be rounded up, never down.",
        ],
    }
    if not used.applicable:
        payload["notes"].append("Temperature at or above standard for this method: no cold-temperature "
                                "correction.")

    def table() -> Any:
        rows = [("Altitude to correct", f"{args.altitude_ft:,.0f} ft"),
                ("Airport elevation / temperature", f"{args.airport_elevation_ft:,.0f} ft / {args.oat_c:g} °C"),
                ("Height above airport", f"{height:,.0f} ft"),
                ("Method", args.method),
                ("Correction", f"+{used.correction_ft:,.0f} ft" if used.applicable else "none (not cold)"),
                ("Corrected altitude", f"{payload['corrected_altitude_ft']:,.0f} ft")]
        for m, r in results.items():
            if m != args.method:
                rows.append((f"  ({m} would give)", f"+{r.correction_ft:,.0f} ft"))
        return key_value_table("Cold-temperature correction", rows)

    return emit(args, payload, table)
