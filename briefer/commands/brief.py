"""`briefer brief`: the circling brief for one approach (the main job)."""

from __future__ import annotations

import argparse

NAME = "brief"
ORDER = 1
HELP = "the circling brief: category, minimums, area, plan in the wind, sight picture"


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import add_json_flag, non_empty
    from briefer.commands._request import add_situation_arguments

    add_situation_arguments(parser)
    add_json_flag(parser)
    parser.add_argument("--units", choices=("us", "icao"), default=None,
                        help="display units: us (lb, SM) or icao (kg, m/km visibility, hPa); MDA and heights "
                             "stay in feet, distances in NM; JSON unchanged (default: the config file's "
                             "display_units, else us)")
    out = parser.add_argument_group("kneeboard card")
    out.add_argument("--out", type=non_empty, metavar="FILE", help="write the card to FILE (.pdf or .txt)")
    out.add_argument("--format", choices=("pdf", "txt"), help="card format (default: from the suffix)")
    out.add_argument("--page", choices=("half-letter", "a5"), default="half-letter", help="PDF page size")
    out.add_argument("--front-only", action="store_true",
                     help="PDF card: the front page only (the detail pages, page 2 on, left off)")
    out.add_argument("--force", action="store_true", help="overwrite an existing card")


def run(args: argparse.Namespace) -> int:
    from briefer.brief import build_brief
    from briefer.commands._request import request_from_args

    from briefer.io.catalog import configured_units

    units = args.units or configured_units()   # a bad config file is an error before any work
    request, report = request_from_args(args)
    brief = build_brief(request, weather_report=report)
    if args.out:
        from briefer.render.card import write_card

        path = write_card(brief, args.out, fmt=args.format, page=args.page, overwrite=args.force,
                          detail=not args.front_only, units=units)
        if not args.json:
            print(f"card written to {path}")
    if args.json:
        import sys

        from briefer.commands._common import dumps
        from briefer.render.brief_json import brief_to_dict

        sys.stdout.write(dumps(brief_to_dict(brief)) + "\n")
        return 0
    from rich.console import Console

    from briefer.render.views import BriefView

    Console().print(BriefView(brief, units))
    return 0
