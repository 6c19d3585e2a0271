"""`briefer atmosphere`: pressure altitude, density altitude, ISA deviation and TAS at an altitude."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, ranged

NAME = "atmosphere"
HELP = "pressure and density altitude, ISA temperature and TAS at an altitude"
DESCRIPTION = (HELP + ". ICAO Standard Atmosphere (Doc 7488); the altimeter setting is applied with "
               "the exact standard-atmosphere relation; IAS is taken as CAS (no position error); "
               "TAS includes compressibility. Without --oat-c the ISA temperature is used, without "
               "an altimeter setting the standard 1013.25 hPa (29.92 inHg).")
ORDER = 31


def add_altimeter_arguments(parser: argparse.ArgumentParser) -> None:
    """--altimeter-inhg | --altimeter-hpa (mutually exclusive). Shared with `briefer turn`."""
    group = parser.add_mutually_exclusive_group()
    group.add_argument("--altimeter-inhg", type=ranged(25.7, 32.2, "inHg"), metavar="X",
                       help="altimeter setting (QNH) in inches of mercury, e.g. 29.92")
    group.add_argument("--altimeter-hpa", type=ranged(870, 1090, "hPa"), metavar="X",
                       help="altimeter setting (QNH) in hectopascals, e.g. 1013")


def altimeter_hpa_from_args(args: argparse.Namespace) -> float | None:
    """The altimeter setting in hPa from --altimeter-hpa or --altimeter-inhg, or None."""
    from briefer import units

    if getattr(args, "altimeter_hpa", None) is not None:
        return float(args.altimeter_hpa)
    if getattr(args, "altimeter_inhg", None) is not None:
        return float(args.altimeter_inhg) * units.INHG_TO_HPA
    return None


def air_data_payload(air: Any) -> dict[str, Any]:
    """JSON keys of an `AirData` result (units in the keys)."""
    return {
        "altitude_ft": air.altitude_ft,
        "altimeter_hpa": air.altimeter_hpa,
        "pressure_altitude_ft": air.pressure_altitude_ft,
        "oat_c": air.oat_c,
        "isa_temperature_c": air.isa_temperature_c,
        "isa_deviation_c": air.isa_deviation_c,
        "density_ratio": air.density_ratio,
        "density_altitude_ft": air.density_altitude_ft,
    }


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--altitude-ft", type=ranged(-2000, 60_000, "ft"), required=True, metavar="A",
                        help="altitude (indicated with the altimeter setting given, else pressure "
                        "altitude), -2000 to 60000 ft")
    parser.add_argument("--oat-c", type=ranged(-90, 60, "degC"), metavar="T",
                        help="outside air temperature at that altitude in degC (default: ISA)")
    add_altimeter_arguments(parser)
    parser.add_argument("--ias-kt", type=ranged(1, 600, "kt"), metavar="V",
                        help="indicated airspeed (taken as CAS) for a TAS, kt")
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    from briefer import units
    from briefer.commands._common import emit, key_value_table
    from briefer.core.atmosphere import air_data, pressure_altitude_rule_of_thumb_ft

    setting = altimeter_hpa_from_args(args)
    air = air_data(args.altitude_ft, oat_c=args.oat_c, altimeter_hpa=setting, cas_kt=args.ias_kt)
    payload: dict[str, Any] = air_data_payload(air)
    payload["altimeter_inhg"] = air.altimeter_hpa * units.HPA_TO_INHG
    payload["oat_is_isa"] = args.oat_c is None
    payload["altimeter_is_standard"] = setting is None
    if setting is not None:
        payload["pressure_altitude_rule_of_thumb_ft"] = float(
            pressure_altitude_rule_of_thumb_ft(air.altitude_ft, altimeter_hpa=setting))
    notes = ["ICAO Standard Atmosphere (Doc 7488); pressure altitude from the altimeter setting "
             "by the exact standard-atmosphere relation."]
    if args.ias_kt is not None:
        payload["ias_kt"] = air.cas_kt
        payload["tas_kt"] = air.tas_kt
        notes.append("IAS taken as CAS (instrument and position error not modelled); TAS with "
                     "compressibility.")
    payload["notes"] = notes

    def table() -> Any:
        rows = [("Altitude", f"{air.altitude_ft:,.0f} ft"),
                ("Altimeter setting", f"{air.altimeter_hpa:.1f} hPa ({air.altimeter_hpa * units.HPA_TO_INHG:.2f} inHg)"
                 + (" standard" if setting is None else "")),
                ("Pressure altitude", f"{air.pressure_altitude_ft:,.0f} ft")]
        if setting is not None:
            rows.append(("  rule of thumb (1000 ft/inHg)",
                         f"{payload['pressure_altitude_rule_of_thumb_ft']:,.0f} ft"))
        rows += [("OAT", f"{air.oat_c:.1f} °C" + (" (ISA)" if args.oat_c is None else "")),
                 ("ISA temperature", f"{air.isa_temperature_c:.1f} °C"),
                 ("ISA deviation", f"{air.isa_deviation_c:+.1f} °C"),
                 ("Density ratio", f"{air.density_ratio:.4f}"),
                 ("Density altitude", f"{air.density_altitude_ft:,.0f} ft")]
        if air.tas_kt is not None:
            rows += [("IAS (as CAS)", f"{air.cas_kt:.0f} kt"), ("TAS", f"{air.tas_kt:.1f} kt")]
        return key_value_table("Atmosphere", rows)

    return emit(args, payload, table)
