"""What every section builder of the brief shares: the list of findings it fills in order (the
Brief sorts them by severity, keeping this order within a severity), and the result it returns
(`SectionResult`: its parts of the brief and those findings)."""

from __future__ import annotations

from briefer._dataclass import dataclass
from briefer.result import Finding, VisibilityMention


class FindingList(list[Finding]):
    """Findings in the order a section found them."""

    def add(self, severity: str, code: str, text: str, visibilities: tuple[VisibilityMention, ...] = ()) -> None:
        self.append(Finding(severity=severity, code=code, text=text, visibilities=visibilities))


@dataclass(frozen=True, slots=True, kw_only=True)
class SectionResult:
    """What a section builder returns: its parts of the brief (the subclass's fields) and its
    findings, in the order found."""

    findings: tuple[Finding, ...]
