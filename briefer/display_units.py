"""The display-units preference: how the brief's weather and weight are shown, in one place.

Two sets:

* ``us`` (the default): weight in pounds, visibility in the unit of the minimums (statute miles
  in chart fractions for SM minimums, metres for metre minimums), altimeter in hectopascals as the
  brief has always shown it.
* ``icao``: weight in kilograms, visibility in metres (100 m steps) below 5 km and whole
  kilometres from 5 km (the steps of ICAO Annex 3 reports), altimeter (QNH) in whole hectopascals.

MDA, heights and altitudes stay in feet, distances in NM, speeds in knots in both sets. A
visibility is rounded DOWN to the step (never more than was reported); a requirement charted in
statute miles keeps its charted text with the exact metres beside it ('2 1/2 SM = 4023 m').
Only what is shown changes: the JSON keeps its own units (they are in its keys), and a
finding's sentence keeps the default words in the JSON (`finding_text` says it in the set shown).

Conversions from `briefer.units` (NIST SP 811 Appendix B). Pure Python: no numpy, Rich or Textual.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING

from briefer.units import LB_TO_KG, SM_TO_M
from briefer.wording import visibility_words

if TYPE_CHECKING:       # the Brief's parts are read here, never built (no numpy at import)
    from briefer.result import Finding, VisibilityMention

UNIT_SETS = ("us", "icao")
"""The display-unit sets, as written in the config file and after ``--units``."""
DEFAULT_UNITS = "us"
METRE_STEP_LIMIT_M = 5000
"""From here on a metric visibility is given in whole kilometres."""


def check_units(value: object) -> str:
    """The unit set named by `value` ('us' or 'icao', any case); ValueError for anything else."""
    if isinstance(value, str) and value.strip().lower() in UNIT_SETS:
        return value.strip().lower()
    raise ValueError(f"expected one of {', '.join(UNIT_SETS)}, got {value!r}")


def next_units(units: str) -> str:
    """The other set (the app's toggle)."""
    return UNIT_SETS[(UNIT_SETS.index(check_units(units)) + 1) % len(UNIT_SETS)]


def weight_words(weight_lb: float, units: str = DEFAULT_UNITS) -> str:
    """'31000 lb' or '14061 kg'."""
    if check_units(units) == "icao":
        return f"{weight_lb * LB_TO_KG:.0f} kg"
    return f"{weight_lb:.0f} lb"


def altimeter_words(altimeter_hpa: float, units: str = DEFAULT_UNITS, *, spec: str = ".0f") -> str:
    """'1009 hPa' (us: `spec` as the renderer always printed it; icao: whole hectopascals, as QNH
    is reported)."""
    if check_units(units) == "icao":
        return f"{altimeter_hpa:.0f} hPa"
    return f"{altimeter_hpa:{spec}} hPa"


def metric_visibility_words(value_sm: float | None) -> str:
    """'4800 m' (100 m steps below 5 km), '9 km' (whole km from 5 km), rounded down;
    'not reported' for None."""
    if value_sm is None or value_sm != value_sm:
        return "not reported"
    metres = value_sm * SM_TO_M
    if metres + 1e-6 >= METRE_STEP_LIMIT_M:
        return f"{int(metres / 1000.0 + 1e-9)} km"
    return f"{int(metres / 100.0 + 1e-6) * 100} m"


def visibility_reported_words(value_sm: float | None, *, metre_minimums: bool, units: str = DEFAULT_UNITS) -> str:
    """A reported visibility: us in the unit of the minimums, icao in metres or kilometres."""
    if check_units(units) == "icao":
        return metric_visibility_words(value_sm)
    return visibility_words(value_sm, metres=metre_minimums)


def visibility_required_words(text: str | None, required_sm: float | None, *, metre_minimums: bool,
                              units: str = DEFAULT_UNITS) -> str | None:
    """The required visibility as charted ('2 1/2 SM', '2800 m'); icao adds the metres to a
    requirement charted in statute miles ('2 1/2 SM = 4023 m', exact to the metre, not rounded
    to a step that could read as less than required). None when there is none."""
    if text is None or check_units(units) != "icao" or metre_minimums or required_sm is None:
        return text
    return f"{text} = {required_sm * SM_TO_M:.0f} m"


def mention_words(mention: VisibilityMention, units: str = DEFAULT_UNITS) -> str:
    """A visibility a text names, in the display units: a requirement as charted (icao: with the
    metres beside one charted in statute miles), any other visibility as a report is shown."""
    if check_units(units) != "icao":
        return mention.text
    if mention.required:
        return visibility_required_words(mention.text, mention.visibility_sm, metre_minimums=mention.metre_minimums,
                                         units=units) or mention.text
    return metric_visibility_words(mention.visibility_sm)


def said_in(text: str, mentions: Iterable[VisibilityMention], units: str = DEFAULT_UNITS) -> str:
    """`text` (a finding's, an alternative's why-not) with the visibilities it names said in the
    display units: each mention's words, in the order they stand in the text, replaced by
    `mention_words` (the us set leaves the text as written)."""
    if check_units(units) != "icao":
        return text
    pos = 0
    for m in mentions:
        at = text.find(m.text, pos)
        if at < 0:
            continue
        words = mention_words(m, units)
        text = text[:at] + words + text[at + len(m.text):]
        pos = at + len(words)
    return text


def finding_text(finding: Finding, units: str = DEFAULT_UNITS) -> str:
    """A finding's sentence in the display units (`said_in`)."""
    return said_in(finding.text, finding.visibilities, units)


__all__ = ["DEFAULT_UNITS", "UNIT_SETS", "altimeter_words", "check_units", "finding_text", "mention_words",
           "metric_visibility_words", "next_units", "said_in", "visibility_reported_words",
           "visibility_required_words", "weight_words"]
