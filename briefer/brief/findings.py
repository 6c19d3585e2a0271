"""A list of findings that a section of the brief fills in order (the Brief sorts them by
severity, keeping this order within a severity)."""

from __future__ import annotations

from briefer.result import Finding


class FindingList(list[Finding]):
    """Findings in the order a section found them."""

    def add(self, severity: str, code: str, text: str) -> None:
        self.append(Finding(severity=severity, code=code, text=text))
