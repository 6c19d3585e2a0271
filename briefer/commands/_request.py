"""Arguments that describe a briefing situation, shared by `brief`, `envelope` and `app`,
and the one function that turns them into a BriefRequest."""

from __future__ import annotations

import argparse
import math
from typing import Any

from briefer.commands._common import existing_folder, non_empty, ranged
from briefer.demo import SITUATION as DEMO
from briefer.vocabulary import CRITERIA_SETS


def _inhg_hint(value: float) -> str:
    """A likely slip: an altimeter setting typed without its decimal point (3012 for 30.12)."""
    for factor in (0.01, 0.1):
        if 25.7 <= value * factor <= 32.2:
            return f" (did you mean {value * factor:.2f}?)"
    return ""


def add_situation_arguments(parser: argparse.ArgumentParser, *, demo: bool = True) -> None:
    g = parser.add_argument_group("situation")
    if demo:
        g.add_argument("--demo", action="store_true",
                       help="the built-in invented case (other options override its parts)")
    g.add_argument("--profile", type=non_empty, metavar="FILE|NAME", help="aircraft profile (a YAML file or a profile name)")
    g.add_argument("--configuration", type=non_empty, metavar="NAME", help="configuration of the profile (default: its own)")
    g.add_argument("--airfield", type=non_empty, metavar="FILE|NAME", help="airfield (a YAML file, ident or name)")
    g.add_argument("--approach", type=non_empty, metavar="NAME", help="approach name as in the airfield file")
    g.add_argument("--runway", type=non_empty, metavar="DES", help="landing runway, e.g. 27")
    # The ranges are the model's (briefer.model WEIGHT_LB, BANK_DEG, OAT_C, ALTIMETER_*,
    # WX_VISIBILITY_SM, CEILING_FT), metric ones converted and rounded inward; kept literal so
    # that --help imports nothing heavy (check_options checks them again against the model).
    wt = g.add_mutually_exclusive_group()
    wt.add_argument("--weight-lb", type=ranged(300, 1_500_000, "pounds"), metavar="W",
                    help="landing weight (default: maximum)")
    wt.add_argument("--weight-kg", type=ranged(137, 680_388, "kilograms"), metavar="W",
                    help="landing weight in kilograms")
    g.add_argument("--bank-deg", type=ranged(5, 60, "degrees"), metavar="B", help="planned bank (default: the profile's)")
    g.add_argument("--criteria", choices=CRITERIA_SETS,
                   help="criteria set (default: the approach's own)")
    w = parser.add_argument_group("weather (values given here override a --metar report)")
    w.add_argument("--metar", type=non_empty, metavar="REPORT", help="a METAR/SPECI report to fill the weather")
    w.add_argument("--wind", type=non_empty, metavar="DDD/SS[GGG]", help="wind, e.g. 250/15G25 or VRB/5")
    w.add_argument("--wind-is", choices=("true", "magnetic"), default="true",
                   help="reference of --wind directions (METAR: true; tower/ATIS: magnetic)")
    w.add_argument("--oat-c", type=ranged(-90, 60, "degrees Celsius"), metavar="T", help="surface temperature")
    alt = w.add_mutually_exclusive_group()
    alt.add_argument("--altimeter-inhg", type=ranged(25.7, 32.2, "inches of mercury", hint=_inhg_hint), metavar="X")
    alt.add_argument("--altimeter-hpa", type=ranged(870, 1090, "hectopascals"), metavar="X")
    vis = w.add_mutually_exclusive_group()
    vis.add_argument("--visibility-sm", type=ranged(0, 100, "statute miles"), metavar="V", help="reported visibility")
    vis.add_argument("--visibility-m", type=ranged(0, 160_934, "metres"), metavar="V",
                     help="reported visibility in metres")
    ceil = w.add_mutually_exclusive_group()
    ceil.add_argument("--ceiling-ft", type=ranged(0, 50_000, "feet"), metavar="C", help="reported ceiling above the airport")
    ceil.add_argument("--ceiling-m", type=ranged(0, 15_240, "metres"), metavar="C", help="reported ceiling in metres")
    parser.add_argument("--profile-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                        help="also look for profiles here (repeatable)")
    parser.add_argument("--airfield-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                        help="also look for airfields here (repeatable)")




def _option_ranges() -> dict[str, tuple[str, Any, str]]:
    """Each numeric situation option: (option as typed, its range in its own unit, unit words).
    The ranges are the model's, converted to the option's unit."""
    from briefer import model, units

    def scaled(rng, factor):            # whole units inward, so the message reads plainly
        return model.Range(math.ceil(rng.lo * factor), math.floor(rng.hi * factor))

    return {
        "weight_lb": ("--weight-lb", model.WEIGHT_LB, "pounds"),
        "weight_kg": ("--weight-kg", scaled(model.WEIGHT_LB, units.LB_TO_KG), "kilograms"),
        "bank_deg": ("--bank-deg", model.BANK_DEG, "degrees"),
        "oat_c": ("--oat-c", model.OAT_C, "degrees Celsius"),
        "altimeter_hpa": ("--altimeter-hpa", model.ALTIMETER_HPA, "hectopascals"),
        "altimeter_inhg": ("--altimeter-inhg", model.ALTIMETER_INHG, "inches of mercury"),
        "visibility_sm": ("--visibility-sm", model.WX_VISIBILITY_SM, "statute miles"),
        "visibility_m": ("--visibility-m", scaled(model.WX_VISIBILITY_SM, units.SM_TO_M), "metres"),
        "ceiling_ft": ("--ceiling-ft", model.CEILING_FT, "feet"),
        "ceiling_m": ("--ceiling-m", scaled(model.CEILING_FT, units.FT_TO_M), "metres"),
    }


def _hint(dest: str, value: float, rng: Any) -> str:
    """A likely slip: an altimeter setting typed without its decimal point (3012 for 30.12)."""
    for factor in (0.01, 0.1):
        if dest == "altimeter_inhg" and (value * factor) in rng:
            return f" (did you mean {value * factor:.2f}?)"
    return ""


def check_options(args: argparse.Namespace) -> None:
    """Every numeric option typed, checked in its own unit before any conversion: the message
    names the option as typed ('--altimeter-inhg: expected a number in inches of mercury between
    25.7 and 32.2, got 3012'), never the model field it feeds."""
    from briefer.errors import DomainError
    from briefer.model import _fmt

    for dest, (option, rng, unit) in _option_ranges().items():
        value = getattr(args, dest, None)
        if value is not None and value not in rng:
            raise DomainError(f"{option}: expected a number in {unit} between {_fmt(rng.lo)} and {_fmt(rng.hi)}, "
                              f"got {_fmt(value)}{_hint(dest, value, rng)}")


def weight_lb_from_args(args: argparse.Namespace) -> float | None:
    """The landing weight in pounds from --weight-lb or --weight-kg (None: the profile's maximum)."""
    from briefer import units

    if getattr(args, "weight_kg", None) is not None:
        return args.weight_kg * units.KG_TO_LB
    return args.weight_lb


def typed_weather(args: argparse.Namespace) -> dict[str, Any]:
    """The weather values the options give (Weather keys; the wind as one part)."""
    from briefer import units
    from briefer.core.wind import parse_wind

    typed: dict[str, Any] = {}
    if args.wind:
        w = parse_wind(args.wind, reference=args.wind_is)
        typed.update(wind_from_deg=w.from_deg, wind_speed_kt=w.speed_kt, wind_gust_kt=w.gust_kt,
                     wind_reference=args.wind_is)
    typed.update(oat_c=args.oat_c, altimeter_hpa=args.altimeter_hpa, visibility_sm=args.visibility_sm,
                 ceiling_ft=args.ceiling_ft)
    if args.altimeter_inhg is not None:
        typed["altimeter_hpa"] = args.altimeter_inhg * units.INHG_TO_HPA
    if getattr(args, "visibility_m", None) is not None:
        typed["visibility_sm"] = args.visibility_m * units.M_TO_SM
    if getattr(args, "ceiling_m", None) is not None:
        typed["ceiling_ft"] = args.ceiling_m * units.M_TO_FT
    return typed


def decoded_report(args: argparse.Namespace) -> Any:
    """The decoded --metar report, or None."""
    if not getattr(args, "metar", None):
        return None
    from briefer.io.metar import decode_metar

    return decode_metar(args.metar)


def request_from_args(args: argparse.Namespace):
    """The BriefRequest the options describe (with --demo, the demo case with overrides).

    Returns (request, decoded METAR report or None). Raises BriefingError with a clear message.
    """
    from briefer.brief import demo_request
    from briefer.errors import DomainError
    from briefer.io import catalog
    from briefer.io.weather_input import weather_fields
    from briefer.model import BriefOptions, BriefRequest, Weather

    check_options(args)
    report = decoded_report(args)
    base_weather = None
    if getattr(args, "demo", False) or not any((args.profile, args.airfield, args.approach, args.runway)):
        base = demo_request()
        base_weather = base.weather.to_mapping()   # the demo's weather: typed values override its parts
        names = dict(DEMO)
    else:
        base = None
        missing = [o for o, v in (("--profile", args.profile), ("--airfield", args.airfield),
                                  ("--approach", args.approach), ("--runway", args.runway)) if not v]
        if missing:
            raise DomainError("missing " + ", ".join(missing) + " (or use --demo)")
        names = {}
    demo = names and base   # the demo's own models, unless an option names another
    profile = (base.profile if demo and not args.profile
               else catalog.find_profile(args.profile or names["profile"], dirs=args.profile_dir))
    airfield = (base.airfield if demo and not args.airfield
                else catalog.find_airfield(args.airfield or names["airfield"], dirs=args.airfield_dir))
    approach = args.approach or names.get("approach")
    if approach is None:
        raise DomainError("missing --approach")
    try:
        appr = airfield.approach(approach)
    except DomainError:
        raise
    request = BriefRequest(
        profile=profile, configuration=args.configuration, airfield=airfield, approach=appr.name,
        landing_runway=args.runway or names["runway"],
        weather=Weather(**weather_fields(report=report, typed=typed_weather(args), base=base_weather)),
        weight_lb=weight_lb_from_args(args),
        bank_deg=args.bank_deg, options=BriefOptions(criteria=args.criteria))
    return request, report
