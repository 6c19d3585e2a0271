"""Helpers shared by the sub-commands: JSON output with cautions, Rich tables, argument types."""

from __future__ import annotations

import argparse
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
    import json

    return json.dumps(_jsonable(data), indent=JSON_INDENT, ensure_ascii=not stdout_takes_unicode())


def stdout_takes_unicode() -> bool:
    """True when stdout can print the degree sign (else JSON is written with ASCII escapes)."""
    encoding = getattr(sys.stdout, "encoding", None) or "ascii"
    try:
        "\u00b0\u2014".encode(encoding)
    except (UnicodeEncodeError, LookupError):
        return False
    return True


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


def _num_text(x: float) -> str:
    if abs(x) < 1e6:
        return f"{x:g}"
    return f"{x:,.0f}" if abs(x) < 1e12 else f"{x:.6g}"


class ranged:  # noqa: N801 - used like a type in add_argument(type=...)
    """argparse type: a finite number within a stated range, in a stated unit.

    The one range-checked option type of every command (a value outside is refused before any
    work, so nothing non-finite or absurd reaches the core or the screen)::

        parser.add_argument("--bank-deg", type=ranged(5, 60, "deg"), ...)

    argparse names the option; the message says the range in the option's unit, e.g.
    ``argument --bank-deg: expected 5 to 60 deg, got 75``. ``lo_open``/``hi_open`` exclude an
    end (``above 0``); ``integer`` asks for a whole number; ``hint(value)`` may add a likely slip
    to the message (``(did you mean 30.12?)``). `help_text` appends the range to a help line.
    """

    def __init__(self, lo: float, hi: float, unit: str = "", *, lo_open: bool = False, hi_open: bool = False,
                 integer: bool = False, hint: Callable[[float], str] | None = None) -> None:
        self.lo, self.hi, self.unit = float(lo), float(hi), unit
        self.lo_open, self.hi_open, self.integer = lo_open, hi_open, integer
        self.hint = hint
        self.__name__ = "number"    # argparse's fallback message names the type

    def describe(self) -> str:
        unit = f" {self.unit}" if self.unit else ""
        lo, hi = _num_text(self.lo), _num_text(self.hi)
        if self.lo_open and self.hi_open:
            return f"above {lo} and below {hi}{unit}"
        if self.lo_open:
            return f"above {lo}{unit}, up to {hi}{unit}"
        if self.hi_open:
            return f"{lo}{unit} or more, below {hi}{unit}"
        return f"{lo} to {hi}{unit}"

    def help_text(self, text: str) -> str:
        return f"{text} ({'whole number, ' if self.integer else ''}{self.describe()})".replace("%", "%%")

    def __call__(self, text: str) -> float:
        from briefer.safetext import escape_text, excerpt

        shown = excerpt(text.strip(), 20)
        typed = escape_text(text.strip()[:20])
        try:
            value = float(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"expected a number {self.describe()}, got {shown}") from None
        if not math.isfinite(value):
            raise argparse.ArgumentTypeError(f"expected a finite number {self.describe()}, got {shown}")
        if self.integer and not value.is_integer():
            raise argparse.ArgumentTypeError(f"expected a whole number {self.describe()}, got {shown}")
        below = value <= self.lo if self.lo_open else value < self.lo
        above = value >= self.hi if self.hi_open else value > self.hi
        if below or above:
            hint = self.hint(value) if self.hint is not None else ""
            raise argparse.ArgumentTypeError(f"expected {self.describe()}, got {typed}{hint}")
        return int(value) if self.integer else value

    def __repr__(self) -> str:
        return f"ranged({self.describe()})"


def existing_folder(text: str) -> str:
    """argparse type: a folder that exists (an absent or unreadable one is named at once)."""
    import os

    from briefer.safetext import excerpt

    if not text.strip():
        raise argparse.ArgumentTypeError("expected a folder, got an empty value")
    if not os.path.isdir(os.path.expanduser(text)):
        raise argparse.ArgumentTypeError(f"no such folder: {excerpt(text, 80)}")
    return text


def non_empty(text: str) -> str:
    """argparse type: text that is not empty or blank (an empty option is never silently ignored)."""
    if not text.strip():
        raise argparse.ArgumentTypeError("expected a value, got an empty one")
    return text
