"""`briefer turn`: radius, rate, times and load factor of a coordinated level turn."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, ranged
from briefer.commands.atmosphere import add_altimeter_arguments

NAME = "turn"
HELP = "turn radius, rate, time and load factor at a speed and bank"
DESCRIPTION = (HELP + ". Coordinated level turn in still air: r = V^2/(g tan bank). With "
               "--speed-is ias the TAS comes from the air data (--altitude-ft required; ISA "
               "temperature without --oat-c, standard pressure without an altimeter setting).")
ORDER = 30


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--speed-kt", type=ranged(1, 600, "kt"), required=True, metavar="V",
                        help="airspeed in kt (TAS unless --speed-is ias)")
    parser.add_argument("--speed-is", choices=("tas", "ias"), default="tas",
                        help="what --speed-kt is (default tas); ias is taken as CAS")
    parser.add_argument("--bank-deg", type=ranged(1, 80, "deg"), required=True, metavar="B",
                        help="bank angle, degrees")
    parser.add_argument("--altitude-ft", type=ranged(-2000, 60_000, "ft"), metavar="A",
                        help="altitude for --speed-is ias (indicated with the altimeter setting)")
    parser.add_argument("--oat-c", type=ranged(-90, 60, "degC"), metavar="T",
                        help="outside air temperature at that altitude, degC (default: ISA)")
    add_altimeter_arguments(parser)
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.commands.atmosphere import air_data_payload, altimeter_hpa_from_args
    from briefer.core.atmosphere import air_data
    from briefer.core.turn import turn_performance
    from briefer.errors import DomainError

    payload: dict[str, Any] = {"speed_kt": args.speed_kt, "speed_is": args.speed_is,
                               "bank_deg": args.bank_deg}
    notes = ["Coordinated level turn in still air; the wind displaces the turn over the ground."]
    air = None
    if args.speed_is == "ias":
        if args.altitude_ft is None:
            raise DomainError("--speed-is ias needs --altitude-ft to find the TAS")
        air = air_data(args.altitude_ft, oat_c=args.oat_c, altimeter_hpa=altimeter_hpa_from_args(args),
                       cas_kt=args.speed_kt)
        tas_kt = float(air.tas_kt)  # type: ignore[arg-type]
        payload["ias_kt"] = args.speed_kt
        payload.update(air_data_payload(air))
        notes.append("IAS taken as CAS; TAS from the ICAO Standard Atmosphere with compressibility"
                     + (" at ISA temperature" if args.oat_c is None else "") + ".")
    else:
        tas_kt = args.speed_kt
        if args.altitude_ft is not None or args.oat_c is not None or altimeter_hpa_from_args(args) is not None:
            notes.append("Altitude, temperature and altimeter setting are not used with --speed-is tas.")
    turn = turn_performance(tas_kt, args.bank_deg)
    payload.update({
        "tas_kt": turn.tas_kt,
        "radius_ft": turn.radius_ft,
        "radius_nm": turn.radius_nm,
        "radius_m": turn.radius_m,
        "rate_deg_s": turn.turn_rate_deg_per_s,
        "time_180_s": turn.time_180_s,
        "time_360_s": turn.time_360_s,
        "load_factor": turn.load_factor,
        "stall_speed_factor": turn.stall_speed_factor,
        "stall_speed_increase_pct": (turn.stall_speed_factor - 1.0) * 100.0,
        "notes": notes,
    })

    def table() -> Any:
        rows = []
        if air is not None:
            rows += [("IAS (as CAS)", f"{args.speed_kt:.0f} kt"),
                     ("Pressure altitude", f"{air.pressure_altitude_ft:,.0f} ft"),
                     ("OAT", f"{air.oat_c:.1f} °C" + (" (ISA)" if args.oat_c is None else ""))]
        rows += [("TAS", f"{turn.tas_kt:.1f} kt"),
                 ("Bank", f"{turn.bank_deg:g}°"),
                 ("Radius", f"{turn.radius_ft:,.0f} ft ({turn.radius_nm:.2f} NM)"),
                 ("Rate of turn", f"{turn.turn_rate_deg_per_s:.2f} °/s"),
                 ("Time for 180° / 360°", f"{turn.time_180_s:.0f} s / {turn.time_360_s:.0f} s"),
                 ("Load factor", f"{turn.load_factor:.3f} g"),
                 ("Stall speed factor", f"× {turn.stall_speed_factor:.3f} "
                  f"(+{payload['stall_speed_increase_pct']:.1f} %)")]
        return key_value_table("Level turn", rows)

    return emit(args, payload, table)
