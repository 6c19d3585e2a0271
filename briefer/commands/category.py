"""`briefer category`: the approach category from VREF, raised by the circling speed."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag, ranged
from briefer.vocabulary import CRITERIA_SETS

NAME = "category"
HELP = "approach category from VREF (or 1.3 VSO), raised by a faster circling speed"
DESCRIPTION = (HELP + ". TERPS (14 CFR 97.3): circling faster than the category's upper speed "
               "means the higher category's minimums and area must be used. ICAO (Doc 8168): "
               "the same VREF/VAT bands, but each category's circling area is built for a higher "
               "maximum circling IAS (100/135/180/205/240 kt); faster than that, the next "
               "category applies.")
ORDER = 20



def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--vref-kt", type=ranged(20, 300, "kt"), required=True, metavar="V",
                        help="VREF at maximum certificated landing weight, kt "
                        "(without a VREF, pass 1.3 x VSO)")
    parser.add_argument("--circling-speed-kt", type=ranged(20, 300, "kt"), metavar="C",
                        help="IAS planned in the circle, kt")
    parser.add_argument("--criteria", choices=CRITERIA_SETS, default="terps-expanded",
                        help="design criteria (default terps-expanded; both TERPS sets give the "
                        "same category)")
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit, key_value_table
    from briefer.core import criteria as cr

    d = cr.category_for_approach(vref_kt=args.vref_kt, circling_speed_kt=args.circling_speed_kt,
                                 criteria=args.criteria)
    low, high = cr.category_speed_band_kt(d.category, criteria=d.criteria)
    payload: dict[str, Any] = {
        "category": d.category,
        "certified_category": d.certified_category,
        "raised": d.raised,
        "reason": d.reason,
        "criteria": d.criteria,
        "vref_kt": d.vref_kt,
        "circling_speed_kt": d.circling_speed_kt,
        "speed_band_kt": [low, high],
        "design_circling_speed_kt": d.design_circling_speed_kt,
        "within_design_speed": d.within_design_speed,
        "source": d.source,
    }

    def table() -> Any:
        from rich.console import Group
        from rich.text import Text

        if high is None:
            band = f"{low:g} kt or more"
        elif low <= 0.0:
            band = f"below {high:g} kt"
        else:
            band = f"{low:g} to below {high:g} kt"
        design = ("no upper limit" if d.design_circling_speed_kt is None
                  else f"{d.design_circling_speed_kt:g} kt")
        rows = [("Criteria", d.criteria),
                ("VREF", f"{d.vref_kt:g} kt"),
                ("Circling speed", "not given" if d.circling_speed_kt is None
                 else f"{d.circling_speed_kt:g} kt"),
                ("Certified category", d.certified_category),
                ("Category that applies", d.category + ("  (raised)" if d.raised else "")),
                ("Band of that category", band),
                ("Area designed for", design)]
        if not d.within_design_speed:
            rows.append(("WARNING", "circling speed above every category's design speed"))
        text = Text(f"Reason: {d.reason}\nSource: {d.source}")
        return Group(key_value_table("Approach category", rows), text)

    return emit(args, payload, table)
