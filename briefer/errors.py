"""The one exception family of briefer (see STYLE: fail loudly and precisely)."""

from __future__ import annotations


class BriefingError(Exception):
    """Base of every error the tool reports to the user as one clear line."""


class DomainError(BriefingError, ValueError):
    """A physically impossible or out-of-range request (e.g. bank >= 90 degrees).

    The message quotes the offending value and the valid range.
    """


class DataFileError(BriefingError, ValueError):
    """A bad input file: names the file, the line (when known) and the dotted field path."""

    def __init__(self, message: str, *, file: str | None = None, line: int | None = None,
                 context: str | None = None) -> None:
        self.message = message
        self.file = file
        self.line = line
        self.context = context
        super().__init__(str(self))

    def __str__(self) -> str:
        where = ""
        if self.file is not None:
            where = self.file
            if self.line is not None:
                where += f":{self.line}"
            where += ": "
        field = f"{self.context}: " if self.context else ""
        from briefer.safetext import escape_text

        return escape_text(f"{where}{field}{self.message}")
