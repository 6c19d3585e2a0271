"""What the brief says about the magnetic variation (the file's, or the World Magnetic Model's).

The file's value, the chart's variation of record, always wins. The brief says so when it was
taken from the World Magnetic Model (the file gives none), when the file's value is more than
`briefer.core.magvar.DISAGREEMENT_DEG` from the model's (a typing error or a very old chart), and
when the model cannot be used (no reference point).
"""

from __future__ import annotations

from typing import Any

from briefer.brief.findings import FindingList
from briefer.errors import DomainError


def variation_findings(af: Any, found: FindingList) -> None:
    """Add the variation's findings for airfield `af` to `found`."""
    from briefer.core import magvar

    if af.variation_model is not None:
        found.add("info", "variation-from-model",
                  f"No magnetic variation in the airfield file: {af.variation_model.text()} used.")
        return
    rp = getattr(af, "reference_point", None)
    if rp is None:   # one note says both: where the positions are, and that the variation is unchecked
        found.add("info", "local-frame",
                  f"Airfield in a local frame from the chart's numbers (no reference point): positions are "
                  f"measured from {af.layout.origin}, not tied to the earth; the chart's magnetic variation "
                  f"{magvar.format_variation(af.magnetic_variation_deg)} is used as given (the World Magnetic "
                  f"Model needs a position to check it).")
        return
    try:
        mv = magvar.model_variation(rp.lat_deg, rp.lon_deg, magvar.today_utc())
    except DomainError as exc:
        found.add("info", "variation-model-unavailable", f"The file's magnetic variation is used unchecked: {exc}.")
        return
    diff = magvar.difference_deg(af.magnetic_variation_deg, mv.variation_deg)
    if diff > magvar.DISAGREEMENT_DEG:
        found.add("warning", "variation-differs",
                  f"The file's magnetic variation {magvar.format_variation(af.magnetic_variation_deg)} differs "
                  f"from the World Magnetic Model's {mv.text()} by {diff:.1f}°: a typing error or a very old "
                  "chart? The brief uses the file's value (the chart's variation of record).")
