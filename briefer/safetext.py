"""Text that reaches a terminal: control characters found, escaped, and short excerpts.

A control character (C0 other than tab and newline, DEL, C1) in a data file's text field is an
error (the loaders refuse it, naming file, line and field); text from elsewhere (a METAR report, a
file name, an error quoting a file) is shown with such characters escaped (``\\x1b``), so nothing
read can move the cursor, recolour or retitle the user's terminal.
"""

from __future__ import annotations

import re

_OTHERS = "\x7f-\x9f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff"
_CONTROL = re.compile(f"[\x00-\x08\x0b-\x1f{_OTHERS}]")       # tab and newline allowed
_CONTROL_ANY = re.compile(f"[\x00-\x08\x0a-\x1f{_OTHERS}]")   # tab allowed
EXCERPT_CHARS = 60


def control_character(text: str, *, allow_newline: bool = False) -> str | None:
    """The first control character (or lone surrogate, or bidi override) in `text` as
    ``\\xNN``/``\\uNNNN``, or None. Tab is allowed; newline only with `allow_newline`."""
    m = (_CONTROL if allow_newline else _CONTROL_ANY).search(text)
    return None if m is None else _code(m.group())


def _code(ch: str) -> str:
    n = ord(ch)
    return f"\\x{n:02x}" if n < 0x100 else f"\\u{n:04x}"


def escape_text(text: str, *, keep_newline: bool = False) -> str:
    """`text` with control characters and lone surrogates escaped (``\\x1b``, ``\\ud800``)."""
    return (_CONTROL if keep_newline else _CONTROL_ANY).sub(lambda m: _code(m.group()), text)


def excerpt(text: str, limit: int = EXCERPT_CHARS) -> str:
    """A short, escaped, quoted excerpt of `text` (for an error quoting what it could not read)."""
    short = text if len(text) <= limit else text[:limit] + "..."
    return "'" + escape_text(short) + "'"
