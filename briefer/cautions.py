"""The standard cautions every output carries (screen, text card, PDF, JSON)."""

from __future__ import annotations

CAUTIONS: tuple[str, ...] = (
    "Not for navigation. A briefing aid only.",
    "The published procedure, the aircraft flight manual, local rules and licensed practice govern.",
    "Verify every number against the current chart and the flight manual before use.",
    "Below the MDA, see and avoid: obstacle clearance is protected only inside the circling area "
    "and only at or above the MDA.",
    "If visual reference is lost while circling, make an initial climbing turn toward the landing "
    "runway and follow the published missed approach.",
)

SHORT_CAUTION = "NOT FOR NAVIGATION - the published procedure, the flight manual, local rules and licensed practice govern."
