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
    if rp is None:
        found.add("info", "variation-model-unavailable",
                  "No reference point (local frame): the World Magnetic Model cannot check the file's "
                  f"magnetic variation {magvar.format_variation(af.magnetic_variation_deg)}, used as given.")
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
