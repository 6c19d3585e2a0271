"""`briefer envelope`: where the circling plans still fit, over every wind direction and speed."""

from __future__ import annotations

import argparse
from typing import Any

NAME = "envelope"
ORDER = 2
HELP = "wind envelope: which winds the circling plans fit (table and polar picture)"
DESCRIPTION = (HELP + ". Solves the plans of the situation (same options as 'brief') for every wind "
               "direction and speed of a grid and shows, per cell, whether the best plan fits, is "
               "marginal or does not fit, and why (B bank, A area, S not-authorised sector, V visibility, "
               "K stall, W wind, L crosswind or tailwind limit). The "
               "reported wind is marked on the picture. --json gives the status grid with its "
               "direction and speed axes.")

SCHEMA = "briefer.envelope/1"
MAX_CELLS = 12_000           # bound of the grid (the default 36 x 41 has 1,476 cells)
MAX_WIND_KT = 150.0          # the model's limit for a wind speed (briefer.model WIND_SPEED_KT)


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import add_json_flag, ranged
    from briefer.commands._request import add_situation_arguments

    add_situation_arguments(parser)
    add_json_flag(parser)
    g = parser.add_argument_group("envelope")
    g.add_argument("--direction-step-deg", type=ranged(1, 90, "deg"), default=10.0, metavar="D",
                   help="step of the wind directions (default 10; must divide 360)")
    g.add_argument("--max-wind-kt", type=ranged(1, MAX_WIND_KT, "kt"), default=40.0, metavar="W",
                   help="fastest wind of the grid (default 40)")
    g.add_argument("--speed-step-kt", type=ranged(0.5, 50, "kt"), default=1.0, metavar="S",
                   help="step of the wind speeds (default 1)")
    out = parser.add_argument_group("display")
    out.add_argument("--ascii", action="store_true", help="ASCII glyphs only (no Unicode shades)")
    out.add_argument("--directions", choices=("relative", "true"), default="relative",
                     help="picture up = the landing direction (relative, default) or true north")
    out.add_argument("--view", choices=("both", "table", "picture"), default="both",
                     help="what to print (default both)")
    out.add_argument("--band-kt", type=ranged(1, MAX_WIND_KT, "kt"), default=5.0, metavar="B",
                     help="width of the table's speed bands (default 5)")
    out.add_argument("--radius-rows", type=ranged(2, 40, "rows", integer=True), default=12, metavar="N",
                     help="radius of the polar picture in text rows (default 12)")


def grid_axes(args: argparse.Namespace) -> tuple[Any, Any]:
    """The direction and speed axes the options ask for (DomainError when out of range)."""
    import math

    import numpy as np

    from briefer.errors import DomainError

    step, vmax, dv = args.direction_step_deg, args.max_wind_kt, args.speed_step_kt
    n = 360.0 / step if step > 0 else 0.0
    if not (0.0 < step <= 90.0 and abs(n - round(n)) < 1e-9):
        raise DomainError(f"--direction-step-deg {step:g}: must divide 360 and be in (0, 90]")
    if not 0.0 < vmax <= MAX_WIND_KT:
        raise DomainError(f"--max-wind-kt {vmax:g}: must be in (0, {MAX_WIND_KT:g}]")
    if not 0.0 < dv <= vmax:
        raise DomainError(f"--speed-step-kt {dv:g}: must be in (0, --max-wind-kt]")
    if args.band_kt <= 0.0:
        raise DomainError(f"--band-kt {args.band_kt:g}: must be positive")
    if not 2 <= args.radius_rows <= 40:
        raise DomainError(f"--radius-rows {args.radius_rows}: must be 2 to 40")
    cells = round(n) * (math.floor(vmax / dv + 1e-9) + 2)
    if cells > MAX_CELLS:
        raise DomainError(f"the grid of {round(n)} directions by about {cells // round(n)} speeds has "
                          f"{cells:,} cells, more than the limit of {MAX_CELLS:,}: raise "
                          "--direction-step-deg or --speed-step-kt, or lower --max-wind-kt")
    dirs = np.arange(round(n)) * step
    speeds = np.arange(0.0, vmax + dv / 2.0, dv)
    speeds = speeds[speeds < vmax - 1e-9]
    return dirs, np.append(speeds, vmax)      # the grid always reaches the maximum


def envelope_to_dict(envelope: Any, *, runway_course_deg_true: float) -> dict[str, Any]:
    """The JSON-ready mapping of an Envelope (axes, status grid, reason bits by name)."""
    import numpy as np

    from briefer.core.manoeuvre import envelope as me

    rel = np.asarray(envelope.wind_from_relative_deg, dtype=float)
    return {
        "runway_course_deg_true": runway_course_deg_true,
        "wind_from_relative_deg": rel.tolist(),
        "wind_from_deg_true": ((rel + runway_course_deg_true) % 360.0).tolist(),
        "wind_speed_kt": np.asarray(envelope.wind_speed_kt, dtype=float).tolist(),
        "grid_order": "status[direction index][speed index]",
        "status": np.asarray(envelope.status).tolist(),
        "status_names": {str(k): v for k, v in sorted(me.STATUS_TEXT.items())},
        "reasons": np.asarray(envelope.reasons).tolist(),
        "reason_bits": {"bank": me.REASON_BANK, "area": me.REASON_AREA, "sector": me.REASON_SECTOR,
                        "visibility": me.REASON_VISIBILITY, "stall": me.REASON_STALL, "wind": me.REASON_WIND,
                        "limit": me.REASON_LIMIT},
        "bank_needed_deg": np.asarray(envelope.bank_needed_deg),
        "candidates": [{"shape": shape, "side": side} for shape, side in envelope.candidates],
        "best_candidate": np.asarray(envelope.best_candidate).tolist(),
        "area_margin_m": np.asarray(envelope.area_margin_m),
        "max_distance_from_runway_m": np.asarray(envelope.max_distance_from_runway_m),
        "bank_deg": envelope.bank_deg,
        "bank_limit_deg": envelope.bank_limit_deg,
        "visibility_m": envelope.visibility_m,
        "area_radius_m": envelope.area_radius_m,
    }


def run(args: argparse.Namespace) -> int:
    import sys

    from briefer.brief import envelope_for, situation
    from briefer.commands._request import request_from_args

    request, _report = request_from_args(args)
    dirs, speeds = grid_axes(args)
    s = situation(request)
    course = float(s.runway.landing_course_deg_true)
    env = envelope_for(request, wind_from_relative_deg=dirs, wind_speed_kt=speeds)
    today = None if s.wind_from_true is None or s.wind_speed_kt <= 0 else (float(s.wind_from_true),
                                                                          float(s.wind_speed_kt))
    if args.json:
        from briefer.commands._common import dumps

        payload = {"schema": SCHEMA, "airfield": request.airfield.ident,
                   "approach": request.selected_approach().name, "landing_runway": request.landing_runway,
                   "profile": request.profile.name, "configuration": request.selected_configuration().name,
                   "category": s.category.category, "visibility_reported": s.visibility_reported,
                   "today": None if today is None else {"wind_from_deg_true": today[0], "wind_speed_kt": today[1]},
                   **envelope_to_dict(env, runway_course_deg_true=course)}
        sys.stdout.write(dumps(payload) + "\n")
        return 0

    from rich.console import Console
    from rich.text import Text

    from briefer import units
    from briefer.cautions import SHORT_CAUTION
    from briefer.render.envelope_view import EnvelopeTable, EnvelopeView

    console = Console()
    vis = (f"visibility {env.visibility_m * units.M_TO_SM:.1f} SM" if s.visibility_reported
           else "visibility not reported (not checked)")
    head = Text()
    head.append(f"{request.airfield.ident} {request.airfield.name}", style="bold")
    head.append(f"  {request.selected_approach().name}, circle to land {request.landing_runway} "
                f"({course:03.0f}T)\n{request.profile.name}, category {s.category.category}, "
                f"{s.circling_ias_kt:.0f} kt IAS; bank {env.bank_deg:g} deg target, {env.bank_limit_deg:g} deg limit; "
                f"area {env.area_radius_m * units.M_TO_NM:.2f} NM; {vis}")
    console.print(head)
    if args.view in ("both", "table"):
        console.print(EnvelopeTable(env, runway_course_deg_true=course, ascii=args.ascii, band_kt=args.band_kt))
    if args.view in ("both", "picture"):
        console.print(EnvelopeView(env, runway_course_deg_true=course, ascii=args.ascii, directions=args.directions,
                                   radius_rows=args.radius_rows, today=today))
    console.print(f"[dim]{SHORT_CAUTION}[/dim]")
    return 0
