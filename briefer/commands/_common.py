"""Helpers shared by the sub-commands: JSON output with cautions, Rich tables, argument types."""

from __future__ import annotations

import argparse
import json
import math
import sys
from typing import Any, Callable

JSON_INDENT = 2


def add_json_flag(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--json", action="store_true",
                        help="print a JSON object (keys carry units; numbers unrounded)")


def _jsonable(value: Any) -> Any:
    """Plain JSON types; numpy scalars and arrays become floats and lists; NaN/inf become null."""
    try:
        import numpy as np
    except ImportError:  # pragma: no cover
        np = None
    if np is not None:
        if isinstance(value, np.ndarray):
            return [_jsonable(v) for v in value.tolist()]
        if isinstance(value, np.generic):
            value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if isinstance(value, dict):
        return {str(k): _jsonable(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_jsonable(v) for v in value]
    return value


def dumps(payload: dict[str, Any]) -> str:
    """JSON text of a payload; adds the cautions when the payload has none."""
    from briefer.cautions import CAUTIONS

    data = dict(payload)
    data.setdefault("cautions", list(CAUTIONS))
    return json.dumps(_jsonable(data), indent=JSON_INDENT, ensure_ascii=False)


def emit(args: argparse.Namespace, payload: dict[str, Any], table: Callable[[], Any]) -> int:
    """Print `payload` as JSON with --json, else the Rich renderable that `table()` builds,
    followed by the short caution line."""
    if getattr(args, "json", False):
        sys.stdout.write(dumps(payload) + "\n")
        return 0
    from rich.console import Console

    from briefer.cautions import SHORT_CAUTION

    console = Console()
    console.print(table())
    console.print(f"[dim]{SHORT_CAUTION}[/dim]")
    return 0


def key_value_table(title: str, rows: list[tuple[str, str]]) -> Any:
    """A two-column Rich table of label/value rows (values right-aligned)."""
    from rich.table import Table

    t = Table(title=title, show_header=False, box=None, pad_edge=False)
    t.add_column("quantity", style="bold")
    t.add_column("value", justify="right")
    for label, value in rows:
        t.add_row(label, value)
    return t


def finite_float(text: str) -> float:
    """argparse type: a finite number."""
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number, got {text!r}") from None
    if not math.isfinite(value):
        raise argparse.ArgumentTypeError(f"expected a finite number, got {text!r}")
    return value
