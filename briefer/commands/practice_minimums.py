"""`briefer practice-minimums`: what the circling criteria would give at an airfield, per category.

For teaching: the protected-area radius, the controlling obstacle inside it, the minimum altitude
(obstacle + clearance, not below the lowest circling height, rounded up as the criteria round),
the HAA and the criteria's lowest visibility. PRACTICE VALUES — NOT A PUBLISHED PROCEDURE.
"""

from __future__ import annotations

import argparse
from typing import Any
from briefer.vocabulary import CATEGORIES, CRITERIA_SETS

NAME = "practice-minimums"
HELP = "practice circling minimums from the criteria and the airfield's obstacles (not a procedure)"
DESCRIPTION = (HELP + ". For each category: the circling-area radius (terps-expanded: iterated with "
               "the MDA until its band settles), the highest obstacle inside the authorised area "
               "(not-authorised sectors of --approach excluded), MDA = obstacle + clearance, not below "
               "the lowest circling height, rounded up; the HAA and the lowest visibility. Values from "
               "memory are marked. PRACTICE VALUES - NOT A PUBLISHED PROCEDURE.")
ORDER = 30

PLAN_MAX_COLS = 100


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import add_json_flag, existing_folder

    parser.add_argument("--airfield", required=True, metavar="FILE|NAME",
                        help="airfield (a YAML file, ident or name)")
    parser.add_argument("--criteria", choices=CRITERIA_SETS,
                        help="criteria set (default: the approach's own, else the airfield's first approach's)")
    parser.add_argument("--approach", metavar="NAME",
                        help="apply this approach's not-authorised sectors and compare with its circling line")
    parser.add_argument("--category", type=str.upper, choices=CATEGORIES, action="append",
                        help="only this category (repeatable; default A to E)")
    parser.add_argument("--plan", action="store_true",
                        help="also draw the areas and the controlling obstacles (braille, or ASCII "
                        "with BRIEFER_ASCII=1)")
    parser.add_argument("--airfield-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                        help="also look for airfields here (repeatable)")
    add_json_flag(parser)


def payload_of(result: Any) -> dict[str, Any]:
    """The JSON object of a `PracticeMinimums` (keys carry units; numbers unrounded)."""
    from dataclasses import asdict

    from briefer.core import criteria as cr

    cats = []
    for c in result.categories:
        d = asdict(c)
        d["controlling_obstacle"] = d.pop("controlling")
        d["from_memory"] = list(c.from_memory)
        d["iterations"] = c.iterations
        for key in ("radius", "obstacle_clearance", "lowest_height", "rounding", "visibility"):
            d[f"{key}_provenance_text"] = cr.provenance_label(d[f"{key}_provenance"])
        cats.append(d)
    return {
        "notice": result.notice,
        "practice": True,
        "airfield_ident": result.airfield_ident,
        "airfield_name": result.airfield_name,
        "airport_elevation_ft": result.airport_elevation_ft,
        "criteria": result.criteria,
        "criteria_basis": result.criteria_basis,
        "approach": result.approach_name,
        "sectors": list(result.sectors),
        "from_memory": list(result.from_memory),
        "notes": list(result.notes),
        "categories": cats,
    }


def table_of(result: Any) -> Any:
    """A Rich renderable: the notice, the table per category, how the radius settled, notes."""
    from rich.console import Group
    from rich.table import Table
    from rich.text import Text

    notice = Text(result.notice, style="bold reverse")
    head = Text(f"{result.airfield_ident} {result.airfield_name}, elevation {result.airport_elevation_ft:.0f} ft; "
                f"criteria {result.criteria} ({result.criteria_basis})")
    if result.approach_name:
        head.append(f"\nSectors of {result.approach_name}: " + ("; ".join(result.sectors) or "none"))
    else:
        head.append("\nNo approach given: no not-authorised sector applied.")
    show_published = any(c.published_note for c in result.categories)
    t = Table(show_header=True, header_style="bold underline", box=None, pad_edge=False, padding=(0, 1))
    for col, just in (("Cat", "left"), ("R NM", "right"), ("Controlling obstacle", "left"),
                      ("+clr", "right"), ("floor", "right"), ("MDA", "right"), ("HAA", "right"),
                      ("Vis", "right")):
        t.add_column(col, justify=just, no_wrap=True)
    if show_published:
        t.add_column("Chart", justify="right", no_wrap=True)
    for c in result.categories:
        mark = "*" if c.radius_provenance == "M" else ""
        ob = c.controlling
        obst = "none" if ob is None else f"{ob.name} {ob.elevation_ft:.0f} ft {ob.distance_nm:.1f} NM"
        plus = "-" if ob is None else f"{ob.elevation_ft + c.obstacle_clearance_ft:.0f}"
        row = [c.category, f"{c.radius_nm:.2f}{mark}", obst, plus,
               f"{c.airport_elevation_ft + c.lowest_height_ft:.0f}",
               f"{c.mda_ft:.0f}" + ("" if c.controlled_by == "obstacle" else "h"), f"{c.haa_ft:.0f}", _vis_text(c)]
        if show_published:
            row.append("n/a" if c.published_mda_ft is None else f"{c.published_mda_ft:.0f}")
        t.add_row(*row)
    lines = [Text("+clr: obstacle + clearance; floor: elevation + lowest circling height; MDA = the higher, "
                  "rounded up (h: the floor governs); * radius from memory; Chart: the approach's own line.",
                  style="dim")]
    for c in result.categories:
        if c.iterations > 1:
            chain = "; ".join(f"{s.mda_guess_ft:.0f} ft -> {s.radius_nm:g} NM -> {s.controlling_obstacle or 'none'} "
                              f"-> {s.mda_ft:.0f} ft" for s in c.steps)
            lines.append(Text(f"Cat {c.category} radius settled in {c.iterations} steps: {chain}."))
        if c.ignored_in_sectors:
            lines.append(Text(f"Cat {c.category}: ignored in not-authorised sectors: "
                              f"{', '.join(c.ignored_in_sectors)}."))
    if result.from_memory:
        lines.append(Text("From memory, not verified: " + ", ".join(result.from_memory) + ".", style="yellow"))
    lines.extend(Text(f"- {n}") for n in result.notes)
    return Group(notice, head, t, *lines, notice)


def _vis_text(c: Any) -> str:
    if c.criteria == "icao":
        return f"{c.visibility_m:.0f} m"
    return f"{c.visibility_sm:g} SM"


def plan_scene(airfield: Any, result: Any) -> Any:
    """A plan-view Scene: runways, each category's area, the sectors, the obstacles; the
    controlling obstacles labelled with their elevation and categories."""
    import numpy as np

    from briefer.core.airfield_geometry import AirfieldGeometry
    from briefer.render.scene import Bounds, Label, Marker, Polygon, Polyline, Role, Scene
    from briefer.units import NM_TO_M

    geo = AirfieldGeometry(airfield)
    appr = airfield.approach(result.approach_name) if result.approach_name else None
    items: list[Any] = []
    largest = max(c.radius_nm for c in result.categories) * NM_TO_M
    outer = None
    for c in result.categories:
        boundary = geo.area(criteria=result.criteria, radius_m=c.radius_nm * NM_TO_M).boundary()
        items.append(Polyline(points=[tuple(p) for p in boundary], role=Role.PROTECTED_AREA, closed=True))
        top = boundary[int(np.argmax(boundary[:, 1]))]
        items.append(Label(point=(float(top[0]), float(top[1])), text=c.category))
        if c.radius_nm * NM_TO_M == largest:
            outer = boundary
    if appr is not None:
        clip = largest + max(rw.threshold_distance_m for rw in airfield.runways) / 2.0
        for sector in geo.sectors(appr):
            poly = sector.polygon(clip)
            if len(poly) >= 3:
                items.append(Polygon(points=[tuple(p) for p in poly], role=Role.EXCLUDED_SECTOR, filled=True))
    controlling: dict[str, list[str]] = {}
    for c in result.categories:
        if c.controlling is not None:
            controlling.setdefault(c.controlling.name, []).append(c.category)
    for ob, p in zip(airfield.obstacles, airfield.layout.obstacles_m):
        cats = controlling.get(ob.name)
        label = f"{ob.elevation_ft:.0f} {''.join(cats)}" if cats else ""
        items.append(Marker(point=p, role=Role.OBSTACLE, label=label))
    for rw in airfield.runways:
        a, b = geo.runway_ends_xy_m(rw)
        items.append(Polyline(points=[tuple(a), tuple(b)], role=Role.RUNWAY))
    x0, y0 = outer.min(axis=0)
    x1, y1 = outer.max(axis=0)
    pad = 0.06 * max(x1 - x0, y1 - y0)
    return Scene(items=tuple(items), bounds=Bounds(x0 - pad, y0 - pad, x1 + pad, y1 + pad))


def run(args: argparse.Namespace) -> int:
    from briefer.commands._common import emit
    from briefer.core.minimums import practice_minimums_for_airfield
    from briefer.io import catalog

    airfield = catalog.find_airfield(args.airfield, dirs=args.airfield_dir)
    categories = tuple(dict.fromkeys(args.category)) if args.category else CATEGORIES
    result = practice_minimums_for_airfield(airfield, criteria=args.criteria, approach=args.approach,
                                            categories=categories)
    if args.json:
        return emit(args, payload_of(result), lambda: None)

    def renderable() -> Any:
        if not args.plan:
            return table_of(result)
        import shutil

        from rich.console import Group
        from rich.text import Text

        from briefer.render.planview import braille_supported, legend, render_plan

        scene = plan_scene(airfield, result)
        cols = max(40, min(PLAN_MAX_COLS, shutil.get_terminal_size((80, 24)).columns))
        ascii_only = not braille_supported()
        canvas = render_plan(scene, cols, max(16, cols * 2 // 5), ascii=ascii_only)
        keys = "  ".join(f"{e.sample} {e.text}" for e in legend(scene, ascii=ascii_only))
        return Group(table_of(result), Text("Plan view (areas labelled by category; controlling obstacles "
                                            "with elevation and categories):"), canvas, Text(keys))

    return emit(args, {}, renderable)
