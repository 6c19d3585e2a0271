"""`briefer list`: the aircraft profiles and airfields the catalog finds, and why a file is broken."""

from __future__ import annotations

import argparse
from typing import Any

NAME = "list"
ORDER = 80
HELP = "list the aircraft profiles and airfields found (name, ident, file, approaches, errors)"
DESCRIPTION = (HELP + ". Searches the folders given with --profile-dir/--airfield-dir, then those of "
               "the config file, then the built-in demo data; the first file of a name wins, and a "
               "later one of the same name is marked as shadowed. Broken files are listed with "
               "their first error (see also 'briefer check').")


def add_arguments(parser: argparse.ArgumentParser) -> None:
    from briefer.commands._common import add_json_flag, existing_folder

    which = parser.add_mutually_exclusive_group()
    which.add_argument("--profiles", action="store_true", help="aircraft profiles only")
    which.add_argument("--airfields", action="store_true", help="airfields only")
    parser.add_argument("--profile-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                        help="also look for profiles here (repeatable)")
    parser.add_argument("--airfield-dir", action="append", default=[], type=existing_folder, metavar="DIR",
                        help="also look for airfields here (repeatable)")
    add_json_flag(parser)


def _read_model(entry: Any) -> Any:
    """The model of a catalog entry that loads (built-in files through importlib.resources)."""
    from briefer.io.catalog import builtin_files
    from briefer.io.yamlload import load_bytes

    if entry.builtin:
        data = next(t for t in builtin_files(entry.kind) if str(t) == entry.source).read_bytes()
    else:
        from briefer.io.safefile import read_regular_file

        data = read_regular_file(entry.source)
    return load_bytes(data, file=entry.source, expected_kind=entry.kind)


def _loose(text: str) -> str:
    return "".join(ch for ch in text.lower() if ch.isalnum())


def _with_shadowing(rows: list[dict[str, Any]], key: str) -> list[dict[str, Any]]:
    """Mark a file whose name an earlier file already has (the first match wins)."""
    first: dict[str, str] = {}
    for row in rows:
        row["shadowed_by"] = None
        if row["error"] is not None:
            continue
        k = _loose(row[key])
        if k in first:
            row["shadowed_by"] = first[k]
        else:
            first[k] = row["file"]
    return rows


def profile_rows(dirs: list[str]) -> list[dict[str, Any]]:
    """One mapping per profile file: name, description, file, configurations, error."""
    from briefer.io.catalog import list_profiles

    rows = []
    for e in list_profiles(dirs=dirs):
        row: dict[str, Any] = {"name": e.name, "description": e.title, "file": e.source, "builtin": e.builtin,
                               "configurations": [], "default_configuration": None, "error": e.error}
        if e.error is None:
            model = _read_model(e)
            row["configurations"] = [c.name for c in model.configurations]
            row["default_configuration"] = model.default_configuration
        rows.append(row)
    return _with_shadowing(rows, "name")


def airfield_rows(dirs: list[str]) -> list[dict[str, Any]]:
    """One mapping per airfield file: ident, name, file, runways, approaches, error."""
    from briefer.io.catalog import list_airfields

    rows = []
    for e in list_airfields(dirs=dirs):
        row: dict[str, Any] = {"ident": e.name if e.error is None else None, "name": e.title, "file": e.source,
                               "builtin": e.builtin, "elevation_ft": None, "runways": [], "approaches": [],
                               "error": e.error}
        if e.error is None:
            model = _read_model(e)
            row["elevation_ft"] = model.elevation_ft
            row["runways"] = [rw.designator for rw in model.runways]
            row["approaches"] = [a.name for a in model.approaches]
        else:
            row["name"] = e.name            # the file name, the only name a broken file has
        rows.append(row)
    return _with_shadowing(rows, "ident")


def _file_text(row: dict[str, Any]) -> str:
    from pathlib import PurePath

    from briefer.safetext import escape_text

    return f"built-in {PurePath(row['file']).name}" if row["builtin"] else escape_text(row["file"])


def _details(row: dict[str, Any], lines: list[str]) -> Any:
    """The detail cell of one file: its lines, then its file, then BROKEN/shadowed in words."""
    from rich.text import Text

    t = Text()
    if row["error"] is not None:
        t.append("BROKEN: " + row["error"], style="bold red")
        t.append("\n" + _file_text(row), style="dim")
        return t
    t.append("\n".join(line for line in lines if line))
    t.append("\n" + _file_text(row), style="dim")
    if row["shadowed_by"] is not None:
        from briefer.safetext import escape_text

        t.append(f"\nshadowed by {escape_text(row['shadowed_by'])} (the first file of a name wins)", style="yellow")
    return t


def _grid(title: str) -> Any:
    from rich.table import Table

    t = Table.grid(padding=(0, 2, 1, 0))
    t.title, t.title_justify, t.title_style = title, "left", "bold underline"
    t.add_column(style="bold", no_wrap=True)
    t.add_column()
    return t


def _profiles_table(rows: list[dict[str, Any]]) -> Any:
    t = _grid("Aircraft profiles")
    for r in rows:
        confs = ", ".join(f"{c} (default)" if c == r["default_configuration"] else c for c in r["configurations"])
        t.add_row(r["name"], _details(r, [r["description"], f"configurations: {confs}" if confs else ""]))
    return t


def _airfields_table(rows: list[dict[str, Any]]) -> Any:
    t = _grid("Airfields")
    for r in rows:
        lines = [f"{r['name']}, elevation {r['elevation_ft']:.0f} ft, runways {' '.join(r['runways'])}"
                 if r["error"] is None else "",
                 "approaches: " + "; ".join(r["approaches"]) if r["approaches"] else ""]
        t.add_row(r["ident"] or r["name"], _details(r, lines))
    return t


def run(args: argparse.Namespace) -> int:
    import sys

    want_profiles = not args.airfields
    want_airfields = not args.profiles
    payload: dict[str, Any] = {}
    if want_profiles:
        payload["profiles"] = profile_rows(args.profile_dir)
    if want_airfields:
        payload["airfields"] = airfield_rows(args.airfield_dir)
    if args.json:
        from briefer.commands._common import dumps

        sys.stdout.write(dumps(payload) + "\n")
        return 0
    from rich.console import Console

    from briefer.cautions import SHORT_CAUTION

    console = Console()
    if want_profiles:
        console.print(_profiles_table(payload["profiles"]))
    if want_airfields:
        console.print(_airfields_table(payload["airfields"]))
    console.print(f"[dim]{SHORT_CAUTION}[/dim]")
    return 0
