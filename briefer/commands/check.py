"""`briefer check`: validate aircraft-profile and airfield files, one line per file."""

from __future__ import annotations

import argparse
from typing import Any

from briefer.commands._common import add_json_flag

NAME = "check"
HELP = "validate aircraft-profile and airfield YAML files (one line per file)"
DESCRIPTION = (HELP + ". Prints 'OK' or the first error of each file as FILE:LINE: FIELD: "
               "MESSAGE; exits 2 if any file fails. --demo checks every built-in demo file.")
ORDER = 90


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("files", nargs="*", metavar="FILE", help="profile or airfield YAML files")
    parser.add_argument("--demo", action="store_true", help="also check every built-in demo file")
    add_json_flag(parser)


def _summary(model: Any) -> tuple[str, str, str]:
    """(kind, name, one-line description) of a loaded model."""
    from briefer.model import AircraftProfile

    if isinstance(model, AircraftProfile):
        n = len(model.configurations)
        return ("aircraft-profile", model.name,
                f"aircraft profile '{model.name}' ({n} configuration{'s' * (n != 1)})")
    counts = [(len(model.runways), "runway"), (len(model.approaches), "approach"),
              (len(model.obstacles), "obstacle")]
    parts = ", ".join(f"{n} {w}{('es' if w.endswith('ch') else 's') * (n != 1)}" for n, w in counts)
    frame = "" if model.reference_point is not None else f", in a local frame from {model.layout.origin}"
    return "airfield", model.ident, f"airfield {model.ident} '{model.name}' ({parts}){frame}"


def run(args: argparse.Namespace) -> int:
    import sys

    from briefer.commands._common import dumps
    from briefer.errors import BriefingError, DataFileError
    from briefer.io.catalog import builtin_files
    from briefer.io.yamlload import load_any, load_bytes
    from briefer.model import KINDS
    from briefer.safetext import escape_text

    if not args.files and not args.demo:
        raise BriefingError("give at least one FILE, or --demo")
    jobs: list[tuple[str, Any]] = [(f, lambda f=f: load_any(f)) for f in args.files]
    if args.demo:
        for kind in KINDS:
            for t in builtin_files(kind):
                jobs.append((str(t), lambda t=t, kind=kind: load_bytes(t.read_bytes(), file=str(t),
                                                                  expected_kind=kind)))
    results: list[dict[str, Any]] = []
    for name, load in jobs:
        try:
            kind, ident, text = _summary(load())
        except DataFileError as exc:
            results.append({"file": name, "ok": False, "error": str(exc), "line": exc.line,
                            "field": exc.context, "message": exc.message})
            continue
        results.append({"file": name, "ok": True, "kind": kind, "name": ident, "text": text})
    failed = sum(not r["ok"] for r in results)
    if args.json:
        sys.stdout.write(dumps({"files": results, "checked": len(results), "failed": failed}) + "\n")
    else:
        for r in results:
            print(escape_text(f"{r['file']}: OK: {r['text']}") if r["ok"] else r["error"])
        if len(results) > 1:
            print(f"{len(results)} files checked, {failed} failed")
    return 2 if failed else 0
