"""`briefer import-runways IDENT --airports FILE --runways FILE --out DIR`: write an airfield file
from the open airport database's CSV files (see `briefer.io.runway_import`)."""

from __future__ import annotations

import argparse

from briefer.commands._common import add_json_flag

NAME = "import-runways"
HELP = "write an airfield file for one identifier from the open airport database's airports.csv and runways.csv"
DESCRIPTION = (HELP + ". Reference point, elevation, runways (threshold positions and elevations, width, "
               "displaced thresholds); closed runways are left out and every value the database lacks is "
               "reported, never guessed. Add the approaches afterwards (the app's airfield form). The file is "
               "written atomically as DIR/<ident>.yaml; a bad CSV file is one line FILE:LINE:COLUMN, exit 2.")
ORDER = 85


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("ident", metavar="IDENT", help="the airport's identifier in the database (its ident column)")
    parser.add_argument("--airports", required=True, metavar="FILE", help="the database's airports.csv")
    parser.add_argument("--runways", required=True, metavar="FILE", help="the database's runways.csv")
    parser.add_argument("--out", default=".", metavar="DIR", help="folder to write <ident>.yaml into (default: .)")
    parser.add_argument("--overwrite", action="store_true", help="replace an existing file of that name")
    add_json_flag(parser)


def run(args: argparse.Namespace) -> int:
    import sys

    from briefer.commands._common import dumps
    from briefer.io.runway_import import import_airfield, write_import

    result = import_airfield(args.ident, args.airports, args.runways)
    path = write_import(result, args.out, overwrite=args.overwrite)
    if args.json:
        sys.stdout.write(dumps({"file": str(path), "ident": result.ident, "runways": len(result.mapping["runways"]),
                                "missing": result.missing, "notes": result.notes}) + "\n")
        return 0
    n = len(result.mapping["runways"])
    print(f"{path}: airfield {result.ident} '{result.mapping['name']}', {n} runway{'s' * (n != 1)}")
    for note in result.notes:
        print(f"  note: {note}")
    for item in result.missing:
        print(f"  missing: {item} (type it from the chart)")
    print("  next: add the approaches from the chart (the app's airfield form), then check the file "
          f"(briefer check {path}). Not for navigation.")
    return 0
