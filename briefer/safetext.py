"""Text that reaches a terminal: control characters found, escaped, and short excerpts.

A control character (C0 other than tab and newline, DEL, C1) in a data file's text field is an
error (the loaders refuse it, naming file, line and field); text from elsewhere (a METAR report, a
file name, an error quoting a file) is shown with such characters escaped (``\\x1b``), so nothing
read can move the cursor, recolour or retitle the user's terminal.
"""

from __future__ import annotations

import re

_OTHERS = "\x7f-\x9f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff"
_C0 = {True: "\x00-\x08\x0b-\x1f", False: "\x00-\x08\x0a-\x1f"}   # by allow_newline (tab always allowed)
# ASCII text can hold only C0 and DEL: a small pattern, quick to compile; the full one (a character
# class up to U+DFFF costs a millisecond to compile) only when some text is not ASCII
_ASCII = {nl: re.compile(f"[{c0}\x7f]") for nl, c0 in _C0.items()}
_FULL: dict[bool, re.Pattern[str]] = {}
EXCERPT_CHARS = 60


def _pattern(text: str, allow_newline: bool) -> re.Pattern[str]:
    if text.isascii():
        return _ASCII[allow_newline]
    if allow_newline not in _FULL:
        _FULL[allow_newline] = re.compile(f"[{_C0[allow_newline]}{_OTHERS}]")
    return _FULL[allow_newline]


def control_character(text: str, *, allow_newline: bool = False) -> str | None:
    """The first control character (or lone surrogate, or bidi override) in `text` as
    ``\\xNN``/``\\uNNNN``, or None. Tab is allowed; newline only with `allow_newline`."""
    m = _pattern(text, allow_newline).search(text)
    return None if m is None else _code(m.group())


def _code(ch: str) -> str:
    n = ord(ch)
    return f"\\x{n:02x}" if n < 0x100 else f"\\u{n:04x}"


def escape_text(text: str, *, keep_newline: bool = False) -> str:
    """`text` with control characters and lone surrogates escaped (``\\x1b``, ``\\ud800``)."""
    return _pattern(text, keep_newline).sub(lambda m: _code(m.group()), text)


def excerpt(text: str, limit: int = EXCERPT_CHARS) -> str:
    """A short, escaped, quoted excerpt of `text` (for an error quoting what it could not read)."""
    short = text if len(text) <= limit else text[:limit] + "..."
    return "'" + escape_text(short) + "'"
