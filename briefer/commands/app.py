"""`briefer app` (and `briefer` alone): the interactive briefing app, on the demo case by default."""

from __future__ import annotations

import argparse

from briefer.demo import SITUATION as DEMO
from briefer.demo import WEATHER as DEMO_WEATHER

NAME = "app"
ORDER = 0
HELP = "the interactive briefing app (the default command)"
DESCRIPTION = ("Open the briefing app. With no situation options it opens on the built-in invented "
               "demo case; --open reopens inputs saved from the app.")


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import non_empty
    from briefer.commands._request import add_situation_arguments

    add_situation_arguments(parser)
    a = parser.add_argument_group("app")
    a.add_argument("--open", type=non_empty, metavar="FILE", help="open inputs saved from the app (YAML)")
    a.add_argument("--ascii", action="store_true",
                   help="draw in plain ASCII (also BRIEFER_ASCII=1; automatic on the Linux console)")
    a.add_argument("--night", action="store_true", help="start in the high-contrast night theme")
    a.add_argument("--units", choices=("us", "icao"), default=None,
                   help="display units: us (lb, SM) or icao (kg, m/km visibility, hPa); u switches them "
                        "(default: the config file's display_units, else us)")



def inputs_from_args(args: argparse.Namespace):
    """(catalog, inputs, notice) for the app. Raises BriefingError for a bad option."""
    from briefer.errors import BriefingError, DomainError
    from briefer.tui.state import AppCatalog, BriefingInputs, LazyCatalog, WeatherInputs, request_from_inputs

    options = (args.open, args.profile, args.airfield, args.approach, args.runway, args.configuration,
               args.weight_lb, args.bank_deg, args.criteria, args.metar, args.wind, args.oat_c,
               args.altimeter_inhg, args.altimeter_hpa, args.visibility_sm, args.ceiling_ft,
               args.weight_kg, args.visibility_m, args.ceiling_m)
    if all(o is None or o == "" for o in options):
        # The plain demo case (`briefer` alone): nothing to check before the app starts, so the
        # catalog is read when the app first needs it, after its first frame.
        cat = LazyCatalog(profile_dirs=args.profile_dir, airfield_dirs=args.airfield_dir)
        inputs = BriefingInputs(profile=DEMO["profile"], airfield=DEMO["airfield"], approach=DEMO["approach"],
                                landing_runway=DEMO["runway"], weather=WeatherInputs(**DEMO_WEATHER))
        return cat, inputs, None
    from briefer.commands._request import check_options, typed_weather, weight_lb_from_args
    from briefer.io.weather_input import weather_fields
    from briefer.io import catalog as catalog_mod

    check_options(args)

    cat = AppCatalog.load(profile_dirs=args.profile_dir, airfield_dirs=args.airfield_dir)
    notice = None
    if args.open:
        from briefer.tui.inputs_file import load_inputs

        try:
            inputs = load_inputs(args.open)
            request_from_inputs(inputs, cat)
            return cat, inputs, None
        except BriefingError as exc:
            notice = f"Could not open {args.open}: {exc}. Showing the demo case."
            args = argparse.Namespace(**{**vars(args), "open": None})

    situation = (args.profile, args.airfield, args.approach, args.runway)
    use_demo = getattr(args, "demo", False) or not any(situation)
    if not use_demo:
        missing = [o for o, v in zip(("--profile", "--airfield", "--approach", "--runway"), situation) if not v]
        if missing:
            raise DomainError("missing " + ", ".join(missing) + " (or use --demo)")
    names = dict(DEMO) if use_demo else {}
    profile = cat.profile(args.profile or names["profile"])
    if profile is None:                   # a file path, or a name the catalog explains
        profile = catalog_mod.find_profile(args.profile or names["profile"], dirs=args.profile_dir)
        cat = cat.with_models(profile=profile)
    airfield = cat.airfield(args.airfield or names["airfield"])
    if airfield is None:
        airfield = catalog_mod.find_airfield(args.airfield or names["airfield"], dirs=args.airfield_dir)
        cat = cat.with_models(airfield=airfield)
    approach = airfield.approach(args.approach or names["approach"]).name

    typed = {k: v for k, v in typed_weather(args).items() if v is not None}
    if args.metar or not use_demo:
        weather = WeatherInputs(report=(args.metar or "").strip(), **typed)
    else:   # the demo's weather, the typed values over its parts (the one rule of io.weather_input)
        weather = WeatherInputs(**weather_fields(base=DEMO_WEATHER, typed=typed))
    inputs = BriefingInputs(profile=profile.name, configuration=args.configuration, airfield=airfield.ident,
                            approach=approach, landing_runway=args.runway or names["runway"],
                            weight_lb=weight_lb_from_args(args), bank_deg=args.bank_deg,
                            criteria=args.criteria, weather=weather)
    request_from_inputs(inputs, cat)      # a bad option is one line on stderr, before the app starts
    return cat, inputs, notice


def run(args: argparse.Namespace) -> int:
    import gc

    gc.enable()          # the app runs for hours: its garbage is collected (briefer.cli.run)
    from briefer.io.catalog import configured_units

    units = args.units or configured_units()
    cat, inputs, notice = inputs_from_args(args)
    from briefer.tui.app import BriefingApp

    BriefingApp(cat, inputs, ascii=True if args.ascii else None, night=args.night,
                inputs_path=args.open, notice=notice, units=units).run()
    return 0
