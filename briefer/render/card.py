"""The printable kneeboard card: `write_card` (PDF or text, written atomically), and the
`card_pdf_bytes` / `card_text` the app and the instructor deck reuse.

Both formats are drawn from one `CardLayout` (briefer.render.card_layout). This module imports
no PDF library: fpdf is imported only when a PDF is actually made.
"""

from __future__ import annotations

import os
from os import PathLike
from pathlib import Path

from briefer.display_units import DEFAULT_UNITS
from briefer.errors import BriefingError
from briefer.io.atomic import FileWriteError, resolve_target, write_bytes_atomic
from briefer.render.card_layout import CardLayout, card_layout
from briefer.render.card_text import card_text
from briefer.result import Brief

FORMATS = ("pdf", "txt")
PAGES = ("half-letter", "a5")
EXISTS_REASON = "the file already exists; not overwritten (overwrite it with --force)"


def card_pdf_bytes(brief: Brief, *, page: str = "half-letter", detail: bool = True,
                   units: str = DEFAULT_UNITS) -> bytes:
    """The PDF card (half-letter or A5, portrait): the front page and, with `detail`, the detail
    pages, in the display units `units`; the same Brief gives the same bytes."""
    from briefer.render.pdf import card_pdf_bytes as _pdf

    return _pdf(brief, page=page, detail=detail, units=units)


def card_format(path: str | PathLike[str], fmt: str | None = None) -> str:
    """The card format: `fmt` if given, else the file's suffix (.pdf or .txt).

    Raises BriefingError for an unknown format, an unknown suffix without `fmt`, or a suffix that
    contradicts `fmt` (e.g. card.pdf with fmt="txt").
    """
    suffix = Path(path).suffix.lower().lstrip(".")
    if fmt is not None:
        fmt = fmt.strip().lower()
        if fmt not in FORMATS:
            raise BriefingError(f"unknown card format {fmt!r}; expected one of {', '.join(FORMATS)}")
        if suffix in FORMATS and suffix != fmt:
            raise BriefingError(f"cannot write {path}: the name ends in .{suffix} but the format asked for is {fmt}")
        return fmt
    if suffix not in FORMATS:
        raise BriefingError(f"cannot tell the card format of {path}: name it .pdf or .txt, or give the format")
    return suffix


def write_card(brief: Brief, path: str | PathLike[str], *, fmt: str | None = None, page: str = "half-letter",
               overwrite: bool = False, detail: bool = True, units: str = DEFAULT_UNITS) -> Path:
    """Write the kneeboard card of `brief` to `path` and return the path.

    Args:
        brief: The brief to print.
        path: The file to write (`~` is expanded).
        fmt: "pdf" or "txt"; None takes it from the suffix.
        page: "half-letter" (5.5 x 8.5 in, the default) or "a5"; PDF only.
        overwrite: Replace an existing file (the CLI's --force).
        detail: PDF only: add the detail pages after the front page (the CLI's --front-only
            leaves them off).
        units: Display units, "us" or "icao" (briefer.display_units).

    Raises:
        BriefingError: unknown format or page; the file exists and `overwrite` is false; the
            directory is missing or cannot be written. The file is written atomically: a failed
            write leaves no partial file and any old card as it was.
    """
    target = Path(os.path.expanduser(os.fspath(path)))
    kind = card_format(target, fmt)
    if str(page).strip().lower() not in PAGES:
        raise BriefingError(f"unknown page size {page!r}; expected one of {', '.join(PAGES)}")
    try:
        resolve_target(target, overwrite=overwrite)   # before the work of drawing the card
    except FileWriteError as exc:
        if not overwrite and "already exists" in exc.reason:
            raise FileWriteError(target, EXISTS_REASON) from None
        raise
    layout = card_layout(brief, units)
    if kind == "pdf":
        from briefer.render.pdf import layout_pdf_bytes

        data = layout_pdf_bytes(layout, page=page, detail=detail)
    else:
        from briefer.render.card_text import layout_text

        data = layout_text(layout).encode("utf-8")
    try:
        return write_bytes_atomic(target, data, overwrite=overwrite)
    except FileWriteError as exc:
        if not overwrite and "already exists" in exc.reason:
            raise FileWriteError(target, EXISTS_REASON) from None
        raise


__all__ = ["CardLayout", "card_format", "card_layout", "card_pdf_bytes", "card_text", "write_card"]
