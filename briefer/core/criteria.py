"""Published design criteria for circling approaches.

Approach categories, the protected circling area (FAA TERPS legacy and expanded radii, ICAO
PANS-OPS visual manoeuvring radius), obstacle clearance, the lowest circling height, the minimum
circling visibility, MDA rounding, and the tests that make a procedure circling-only.

Every published value carries a provenance code so that a brief can say how sure it is:

===== =======================================================================================
Code  Meaning
===== =======================================================================================
"V"   read in a copy of the primary text
"V2"  read in a secondary text that quotes or reproduces the primary source
"C"   computed from a published formula and checked against published numbers
"M"   from memory, not verified: the brief must say so
===== =======================================================================================

Criteria sets (``CRITERIA_SETS``):

* ``"terps-legacy"``: FAA TERPS areas built before late 2012, fixed radius per category.
* ``"terps-expanded"``: FAA TERPS areas built after late 2012 (charted with the negative-C
  symbol), radius by category and circling MDA.
* ``"icao"``: ICAO PANS-OPS (Doc 8168) visual manoeuvring area, R = 2r + S.

References
----------
.. [1] 14 CFR 97.3, "Symbols and terms used in procedures", definition of aircraft approach
   category (VREF, or 1.3 VSO, at maximum certificated landing weight).
.. [2] FAA, Pilot/Controller Glossary, "Aircraft approach category" (a higher category "must" be
   used when manoeuvring faster than the category's upper limit).
.. [3] FAA, Aeronautical Information Manual, 5-4-7 (approach categories), 5-4-20 (circling:
   legacy and expanded radii, 300 ft obstacle clearance, alignment rules), 5-4-21 (missed
   approach).
.. [4] FAA, U.S. Terminal Procedures Publication, page B2 (standard and expanded circling
   approach radii).
.. [5] ICAO, Doc 8168 PANS-OPS Vol I, "Flight Procedures", 5th ed., 2006: Part I Section 4
   Chapter 1 (Tables I-4-1-1/-2, aircraft categories and speeds) and Chapter 7 (visual
   manoeuvring, Tables I-4-7-1, I-4-7-2, I-4-7-3).
.. [6] ICAO, Doc 8168 PANS-OPS Vol II, "Construction of Visual and Instrument Flight
   Procedures", 5th ed., 2006: Part I Section 2 Chapter 3 (turn area construction, 3.1.2.2 and
   Table I-2-3-1), Section 4 Chapter 5 (final approach) and Chapter 7 (7.2.1-7.2.2, visual
   manoeuvring area).
.. [7] FAA Order 8260.3 (TERPS), circling criteria; Change 21 to Order 8260.3B (2009) introduced
   the expanded radii. Not read for this module: values attributed to it are "M".
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass
from types import MappingProxyType
from typing import Literal, Mapping

import numpy as np

from briefer.core._types import Numeric
from briefer.errors import DomainError
from briefer import vocabulary
from briefer.core.ranges import SCALAR_TYPES, checked, checked_float
from briefer.units import KM_TO_M, M_TO_FT, M_TO_SM, NM_TO_FT, SM_TO_M, FT_TO_M
from briefer.core.angles import as_float, atand, tand, wrap_180

# --------------------------------------------------------------------------------------------
# Names
# --------------------------------------------------------------------------------------------

CRITERIA_SETS: tuple[str, ...] = vocabulary.CRITERIA_SETS
"""The design criteria sets this module knows."""

TERPS_CRITERIA: tuple[str, ...] = vocabulary.TERPS_CRITERIA
"""The FAA sets (same categories, clearances and straight-in rules; different radii)."""

CATEGORIES: tuple[str, ...] = vocabulary.CATEGORIES
"""Aircraft approach categories, slowest first."""

Provenance = Literal["V", "V2", "C", "M"]
"""How sure a published value is (see the module docstring)."""

PROVENANCE_LABELS: Mapping[str, str] = MappingProxyType({
    "V": "verified in the primary text",
    "V2": "verified in a secondary source",
    "C": "computed from a published formula",
    "M": "from memory, not verified",
})


def is_from_memory(provenance: str) -> bool:
    """True when a provenance code means "from memory, not verified" (the brief must say so)."""
    return provenance == "M"


def provenance_label(provenance: str) -> str:
    """Plain words for a provenance code, e.g. ``"from memory, not verified"`` for ``"M"``."""
    try:
        return PROVENANCE_LABELS[provenance]
    except KeyError:
        raise DomainError(f"unknown provenance code {provenance!r}; "
                          f"expected one of {', '.join(PROVENANCE_LABELS)}") from None


def check_criteria(criteria: str) -> str:
    """Return `criteria` if it names a known set, else raise DomainError listing the sets."""
    if criteria not in CRITERIA_SETS:
        raise DomainError(f"unknown criteria {criteria!r}; expected one of {', '.join(CRITERIA_SETS)}")
    return criteria


def check_category(category: str) -> str:
    """Return `category` if it is one of A-E, else raise DomainError."""
    if category not in CATEGORIES:
        raise DomainError(f"unknown approach category {category!r}; expected one of {', '.join(CATEGORIES)}")
    return category


def _check_range(name: str, value: float, low: float, high: float, unit: str, *,
                 low_inclusive: bool = True, high_inclusive: bool = True) -> float:
    """`briefer.core.ranges.checked` (the core's one range check); returns value unchanged."""
    if type(value) in SCALAR_TYPES:
        checked_float(name, value, low, high, unit, lo_open=not low_inclusive, hi_open=not high_inclusive)
    else:
        checked(name, value, low, high, unit, lo_open=not low_inclusive, hi_open=not high_inclusive)
    return value


# --------------------------------------------------------------------------------------------
# Categories
# --------------------------------------------------------------------------------------------

MAX_SPEED_KT = 300.0
"""Highest approach or circling IAS accepted; anything faster is treated as a typing error."""

# Lower bound (inclusive) of each category's VREF / VAT band [1], [5] Table I-4-1-2 ("V2").
_CATEGORY_LOW_KT: Mapping[str, float] = MappingProxyType(
    {"A": 0.0, "B": 91.0, "C": 121.0, "D": 141.0, "E": 166.0})

ICAO_CAT_E_VAT_LIMIT_KT = 211.0
"""Exclusive upper bound of the ICAO Cat E VAT band ("166-210 kt", [5] Table I-4-1-2, "V2")."""

ICAO_MAX_CIRCLING_IAS_KT: Mapping[str, float] = MappingProxyType(
    {"A": 100.0, "B": 135.0, "C": 180.0, "D": 205.0, "E": 240.0})
"""Maximum IAS for visual manoeuvring (circling), [5] Table I-4-1-2 and [6] 7.2.2 a) ("V")."""

TERPS_CIRCLING_DESIGN_IAS_KT: Mapping[str, float | None] = MappingProxyType(
    {"A": 90.0, "B": 120.0, "C": 140.0, "D": 165.0, "E": None})
"""The category's upper speed, which TERPS design "typically" uses ([3] 5-4-7); Cat E has none."""


def category_from_speed(speed_kt: float) -> str:
    """Approach category of a speed by the 14 CFR 97.3 / Doc 8168 bands.

    Parameters
    ----------
    speed_kt : float
        VREF (or 1.3 VSO) at maximum certificated landing weight, or a speed actually flown,
        0 < speed_kt <= 300. [kt IAS]

    Returns
    -------
    str
        "A" (< 91), "B" (91 to < 121), "C" (121 to < 141), "D" (141 to < 166) or "E" (>= 166).

    Raises
    ------
    DomainError
        If the speed is not finite, not positive or above 300 kt.

    Notes
    -----
    The bands are half-open: 90.9 kt is A and 91.0 kt is B [1]_. ICAO uses the same VAT bands
    [2]_, with Cat E ending at 210 kt (checked by `category_for_approach` for ``"icao"``).

    References
    ----------
    .. [1] 14 CFR 97.3, "Aircraft approach category".
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 1, Table I-4-1-2.
    """
    _check_range("speed", speed_kt, 0.0, MAX_SPEED_KT, "kt", low_inclusive=False)
    found = "A"
    for cat in CATEGORIES:
        if speed_kt >= _CATEGORY_LOW_KT[cat]:   # [1] half-open bands
            found = cat
    return found


def category_speed_band_kt(category: str, *, criteria: str) -> tuple[float, float | None]:
    """VREF / VAT band of a category: (low inclusive, high exclusive or None).

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    tuple of (float, float or None)
        The lower bound (inclusive) and the upper bound (exclusive); None when the category has
        no upper bound (TERPS Cat E). [kt]

    Raises
    ------
    DomainError
        For an unknown category or criteria set.

    References
    ----------
    .. [1] 14 CFR 97.3 (FAA bands).
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Table I-4-1-2 (VAT; Cat E 166-210 kt).
    """
    check_category(category)
    check_criteria(criteria)
    idx = CATEGORIES.index(category)
    low = _CATEGORY_LOW_KT[category]
    if idx + 1 < len(CATEGORIES):
        return low, _CATEGORY_LOW_KT[CATEGORIES[idx + 1]]
    return low, (ICAO_CAT_E_VAT_LIMIT_KT if criteria == "icao" else None)


def design_circling_speed_kt(category: str, *, criteria: str) -> float | None:
    """The IAS the circling area of a category is designed for.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    float or None
        ICAO: the maximum circling IAS 100/135/180/205/240 kt [2]_ ("V"). TERPS: the category's
        upper speed 90/120/140/165 kt, which design "typically" uses [1]_; None for Cat E, whose
        band has no upper limit. [kt IAS]

    Raises
    ------
    DomainError
        For an unknown category or criteria set.

    References
    ----------
    .. [1] FAA AIM 5-4-7 ("procedure design criteria typically utilize the highest speed for a
       particular category").
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Table I-4-1-2; Vol II Part I Section 4
       Chapter 7, 7.2.2 a).
    """
    check_category(category)
    if check_criteria(criteria) == "icao":
        return ICAO_MAX_CIRCLING_IAS_KT[category]
    return TERPS_CIRCLING_DESIGN_IAS_KT[category]


@dataclass(frozen=True, slots=True, kw_only=True)
class CategoryDetermination:
    """The approach category that applies today, and why.

    Attributes:
        criteria: the criteria set used.
        vref_kt: VREF (or 1.3 VSO / VAT) at maximum certificated landing weight. [kt IAS]
        circling_speed_kt: the IAS planned in the circle, or None when not given. [kt]
        certified_category: the category from `vref_kt` alone.
        category: the category whose minimums and area apply.
        raised: True when `category` is above `certified_category`.
        within_design_speed: False when the circling speed exceeds even the design speed of
            `category` (ICAO: above 240 kt); the circle is then outside every published area.
        design_circling_speed_kt: design circling IAS of `category` (None: TERPS Cat E). [kt]
        reason: one plain sentence for the brief.
        source: the rule's citation.
    """

    criteria: str
    vref_kt: float
    circling_speed_kt: float | None
    certified_category: str
    category: str
    raised: bool
    within_design_speed: bool
    design_circling_speed_kt: float | None
    reason: str
    source: str

    def __post_init__(self) -> None:
        check_criteria(self.criteria)
        check_category(self.certified_category)
        check_category(self.category)
        if CATEGORIES.index(self.category) < CATEGORIES.index(self.certified_category):
            raise DomainError(f"category {self.category} is below the certified category "
                              f"{self.certified_category}")
        if self.raised != (self.category != self.certified_category):
            raise DomainError("raised must be True exactly when category differs from certified_category")


def category_at_speed(*, vref_kt: float, circling_speed_kt: float, criteria: str) -> str:
    """``category_for_approach(...).category`` alone (the same checks and rule, no texts)."""
    return _categories(vref_kt, circling_speed_kt, criteria)[1]


def _categories(vref_kt: float, circling_speed_kt: float | None, criteria: str) -> tuple[str, str, bool]:
    """`category_for_approach`'s rule: the certified category, the category at the circling
    speed (the certified one without a speed) and whether that speed is within the category's
    design speed, after its checks in its order."""
    check_criteria(criteria)
    certified = category_from_speed(vref_kt)
    if criteria == "icao" and vref_kt >= ICAO_CAT_E_VAT_LIMIT_KT:
        raise DomainError(f"VAT {vref_kt:g} kt is above the ICAO Cat E band (166 to 210 kt); "
                          "no ICAO category applies")
    if circling_speed_kt is None:
        return certified, certified, True
    _check_range("circling speed", circling_speed_kt, 0.0, MAX_SPEED_KT, "kt", low_inclusive=False)
    cert_idx = CATEGORIES.index(certified)
    if criteria == "icao":
        idx = cert_idx
        while idx < len(CATEGORIES) and circling_speed_kt > ICAO_MAX_CIRCLING_IAS_KT[CATEGORIES[idx]]:
            idx += 1
        if idx == len(CATEGORIES):
            return certified, CATEGORIES[-1], False
        return certified, CATEGORIES[idx], True
    speed_cat = category_from_speed(circling_speed_kt)
    # the raised category's band always contains the circling speed: within
    return certified, CATEGORIES[max(cert_idx, CATEGORIES.index(speed_cat))], True


_CATEGORY_SOURCE_TERPS = "14 CFR 97.3; FAA Pilot/Controller Glossary (a higher category must be used)"
_CATEGORY_SOURCE_ICAO = ("ICAO Doc 8168 Vol I Part I Sec 4 Ch 1, Table I-4-1-2 (VAT bands; maximum "
                         "circling IAS)")


def _band_text(category: str, criteria: str) -> str:
    low, high = category_speed_band_kt(category, criteria=criteria)
    if high is None:
        return f"{low:g} kt or more"
    if low <= 0.0:
        return f"below {high:g} kt"
    return f"{low:g} to below {high:g} kt"


def category_for_approach(*, vref_kt: float, circling_speed_kt: float | None = None,
                          criteria: str) -> CategoryDetermination:
    """The category certified from VREF and the category that applies at the circling speed.

    Parameters
    ----------
    vref_kt : float
        VREF at maximum certificated landing weight; when no VREF is specified, pass 1.3 VSO
        (FAA) or the VAT, the greater of 1.3 VSO and 1.23 VS1g (ICAO). [kt IAS]
    circling_speed_kt : float, optional
        The IAS planned in the circle (wind additive included). [kt]
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    CategoryDetermination

    Raises
    ------
    DomainError
        For a speed that is not positive or above 300 kt, an unknown criteria set, or (ICAO)
        a VAT of 211 kt or more, outside every ICAO category.

    Notes
    -----
    TERPS: the category follows the speed actually flown. A faster circling speed moves to the
    category of that speed [1]_ [2]_ (the P/CG now says "must"): a Cat A aircraft circling at
    95 kt uses Cat B.

    ICAO: the categories have the same VAT bands, but each category's area is designed for a
    higher maximum circling IAS (100/135/180/205/240 kt) [3]_. A circling speed within that
    maximum keeps the certified category; a faster one moves to the lowest category whose
    maximum covers it. That reading (the design speed is a maximum, and flying faster leaves
    the protection) follows [3]_; the "next higher category" wording is operator practice
    ("V2"). Above 240 kt no category protects the circle: `within_design_speed` is False.

    The category never goes below the certified one, whatever the circling speed.

    References
    ----------
    .. [1] 14 CFR 97.3, "Aircraft approach category".
    .. [2] FAA Pilot/Controller Glossary, "Aircraft approach category"; AIM 5-4-7.
    .. [3] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 1, Table I-4-1-2;
       Vol II Part I Section 4 Chapter 7, 7.2.2 a).
    """
    certified, category, within = _categories(vref_kt, circling_speed_kt, criteria)
    source = _CATEGORY_SOURCE_ICAO if criteria == "icao" else _CATEGORY_SOURCE_TERPS
    cert_text = (f"Cat {certified} from VREF {vref_kt:g} kt "
                 f"(band {_band_text(certified, criteria)})")

    if circling_speed_kt is None:
        return CategoryDetermination(
            criteria=criteria, vref_kt=float(vref_kt), circling_speed_kt=None,
            certified_category=certified, category=certified, raised=False,
            within_design_speed=True,
            design_circling_speed_kt=design_circling_speed_kt(certified, criteria=criteria),
            reason=f"{cert_text}; no circling speed given, so the certified category applies.",
            source=source)

    if criteria == "icao":
        cat_max = ICAO_MAX_CIRCLING_IAS_KT[category]
        if not within:
            reason = (f"{cert_text}; circling at {circling_speed_kt:g} kt exceeds the Cat E maximum "
                      f"circling IAS of {cat_max:g} kt: no PANS-OPS circling area protects this "
                      "speed.")
        elif category != certified:
            cert_max = ICAO_MAX_CIRCLING_IAS_KT[certified]
            reason = (f"{cert_text}; circling at {circling_speed_kt:g} kt exceeds the Cat {certified} "
                      f"maximum circling IAS of {cert_max:g} kt, so the Cat {category} minimums and "
                      f"area apply (maximum {cat_max:g} kt).")
        else:
            reason = (f"{cert_text}; circling at {circling_speed_kt:g} kt is within the Cat "
                      f"{category} maximum circling IAS of {cat_max:g} kt.")
    else:
        if category != certified:
            _, high = category_speed_band_kt(certified, criteria=criteria)
            reason = (f"{cert_text}; circling at {circling_speed_kt:g} kt is at or above the Cat "
                      f"{certified} limit of {high:g} kt, so the Cat {category} minimums and area "
                      "must be used (14 CFR 97.3).")
        else:
            reason = (f"{cert_text}; circling at {circling_speed_kt:g} kt stays within the Cat "
                      f"{category} band.")

    return CategoryDetermination(
        criteria=criteria, vref_kt=float(vref_kt), circling_speed_kt=float(circling_speed_kt),
        certified_category=certified, category=category, raised=category != certified,
        within_design_speed=within,
        design_circling_speed_kt=design_circling_speed_kt(category, criteria=criteria),
        reason=reason, source=source)


# --------------------------------------------------------------------------------------------
# FAA TERPS radii: tables
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True, slots=True, kw_only=True)
class RadiusCell:
    """One cell of a published radius table, with how sure it is.

    Attributes:
        radius_nm: the circling radius from each runway threshold. [NM]
        provenance: "V", "V2", "C" or "M" (see the module docstring).
        source: where the cell was read (or "from memory").
    """

    radius_nm: float
    provenance: str
    source: str

    def __post_init__(self) -> None:
        if not (math.isfinite(self.radius_nm) and self.radius_nm > 0.0):
            raise DomainError(f"radius {self.radius_nm!r} NM must be positive")
        provenance_label(self.provenance)

    @property
    def from_memory(self) -> bool:
        """True when the cell is from memory and the brief must say so."""
        return is_from_memory(self.provenance)


@dataclass(frozen=True, slots=True, kw_only=True)
class MdaBand:
    """A band of circling MDA (ft MSL) of the expanded-radius table.

    Attributes:
        label: the band as printed, e.g. "1001-3000".
        above_ft: exclusive lower bound, None for the lowest band. [ft MSL]
        up_to_ft: inclusive upper bound, None for the highest band. [ft MSL]
    """

    label: str
    above_ft: float | None
    up_to_ft: float | None

    def contains(self, mda_ft_msl: float) -> bool:
        """True when above_ft < mda_ft_msl <= up_to_ft (open ends where None)."""
        if self.above_ft is not None and not mda_ft_msl > self.above_ft:
            return False
        return self.up_to_ft is None or mda_ft_msl <= self.up_to_ft


LEGACY_SOURCE = "AIM 5-4-20; TPP page B2 (standard radii), read in secondary reproductions"
EXPANDED_SOURCE = "AIM 5-4-20; TPP page B2 (expanded radii)"

LEGACY_RADII: Mapping[str, RadiusCell] = MappingProxyType({
    cat: RadiusCell(radius_nm=r, provenance="V2", source=LEGACY_SOURCE)
    for cat, r in zip(CATEGORIES, (1.3, 1.5, 1.7, 2.3, 4.5))
})
"""TERPS legacy (standard) circling radius per category [3] 5-4-20, [4] ("V2")."""

EXPANDED_MDA_BANDS: tuple[MdaBand, ...] = (
    MdaBand(label="1000 or less", above_ft=None, up_to_ft=1000.0),
    MdaBand(label="1001-3000", above_ft=1000.0, up_to_ft=3000.0),
    MdaBand(label="3001-5000", above_ft=3000.0, up_to_ft=5000.0),
    MdaBand(label="5001-7000", above_ft=5000.0, up_to_ft=7000.0),
    MdaBand(label="7001-9000", above_ft=7000.0, up_to_ft=9000.0),
    MdaBand(label="9001 and above", above_ft=9000.0, up_to_ft=None),
)
"""Circling MDA bands of the expanded table [3] 5-4-20, [4]. Whole-foot MDAs fall in the
printed bands; a fractional MDA just above a band's top (e.g. 1000.4 ft) goes to the next band,
the larger radius."""

_EXPANDED_VALUES_NM: tuple[tuple[float, ...], ...] = (
    # A    B    C    D    E
    (1.3, 1.7, 2.7, 3.6, 4.5),   # 1000 or less
    (1.3, 1.8, 2.8, 3.7, 4.6),   # 1001-3000
    (1.3, 1.8, 2.9, 3.8, 4.8),   # 3001-5000
    (1.3, 1.9, 3.0, 4.0, 5.0),   # 5001-7000
    (1.4, 2.0, 3.2, 4.2, 5.3),   # 7001-9000
    (1.4, 2.1, 3.3, 4.4, 5.5),   # 9001 and above
)

# Cells read in secondary sources (docs/REFERENCES.md section 2c); every other cell is from memory.
_SRC_PARTIAL_COPY = EXPANDED_SOURCE + ", partial copy of the table on a training web page"
_SRC_PRESS_C = EXPANDED_SOURCE + ", quoted by the aviation press, 2013 (Cat C 1.7 -> 2.7 NM)"
_SRC_HIGH_C = EXPANDED_SOURCE + ", a training provider's example (Cat C 3.0 NM, airport at 5,885 ft)"
_SRC_WEAK = EXPANDED_SOURCE + ", sea-level values hard-coded in a public source file (weak)"
_SRC_MEMORY = EXPANDED_SOURCE + "; cell from memory, not verified"

_EXPANDED_VERIFIED: Mapping[tuple[int, str], str] = MappingProxyType({
    (0, "A"): _SRC_WEAK, (0, "B"): _SRC_WEAK, (0, "C"): _SRC_PRESS_C, (0, "D"): _SRC_WEAK,
    (1, "A"): _SRC_PARTIAL_COPY, (1, "B"): _SRC_PARTIAL_COPY,
    (2, "A"): _SRC_PARTIAL_COPY, (2, "B"): _SRC_PARTIAL_COPY,
    (3, "A"): _SRC_PARTIAL_COPY, (3, "B"): _SRC_PARTIAL_COPY, (3, "C"): _SRC_HIGH_C,
})

EXPANDED_RADII: tuple[Mapping[str, RadiusCell], ...] = tuple(
    MappingProxyType({
        cat: RadiusCell(
            radius_nm=value,
            provenance="V2" if (row, cat) in _EXPANDED_VERIFIED else "M",
            source=_EXPANDED_VERIFIED.get((row, cat), _SRC_MEMORY))
        for cat, value in zip(CATEGORIES, values)
    })
    for row, values in enumerate(_EXPANDED_VALUES_NM)
)
"""TERPS expanded circling radii, one mapping per `EXPANDED_MDA_BANDS` row, with the provenance
of each cell [3] 5-4-20, [4]. The table is printed as an image; no single formula reproduces it,
so it is a lookup, never a recomputation."""

MDA_MIN_FT = -1500.0
MDA_MAX_FT = 20000.0


def expanded_mda_band(mda_ft_msl: float) -> MdaBand:
    """The expanded-table band holding a circling MDA.

    Parameters
    ----------
    mda_ft_msl : float
        Circling MDA, -1500 <= mda <= 20000. [ft MSL]

    Returns
    -------
    MdaBand

    Raises
    ------
    DomainError
        If the MDA is not finite or outside -1500 to 20000 ft MSL.

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2, expanded circling approach radii.
    """
    _check_range("circling MDA", mda_ft_msl, MDA_MIN_FT, MDA_MAX_FT, "ft MSL")
    for band in EXPANDED_MDA_BANDS:
        if band.contains(mda_ft_msl):
            return band
    raise AssertionError("the bands cover every MDA")  # pragma: no cover


def expanded_radius_cell(category: str, mda_ft_msl: float) -> RadiusCell:
    """The expanded-table cell for a category and circling MDA, with its provenance.

    Parameters
    ----------
    category : str
        "A" to "E".
    mda_ft_msl : float
        Circling MDA, -1500 <= mda <= 20000. [ft MSL]

    Returns
    -------
    RadiusCell
        Radius and provenance; `RadiusCell.from_memory` tells the brief to mark the value.

    Raises
    ------
    DomainError
        For an unknown category or an MDA outside the range.

    Notes
    -----
    Cells "V2": A and B for 1001-7000 ft; A, B, C, D for 1000 ft or less; C for 5001-7000 ft.
    All other cells are from memory ("M") until someone reads TPP page B2 or Order 8260.3.

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2, expanded circling approach radii.
    """
    check_category(category)
    band = expanded_mda_band(mda_ft_msl)
    return EXPANDED_RADII[EXPANDED_MDA_BANDS.index(band)][category]


def expanded_radius_nm(category: str, *, mda_ft_msl: float) -> float:
    """TERPS expanded circling radius for a category and circling MDA (a table lookup).

    Parameters
    ----------
    category : str
        "A" to "E".
    mda_ft_msl : float
        Circling MDA, -1500 <= mda <= 20000. [ft MSL]

    Returns
    -------
    float
        Radius from each runway threshold. [NM]

    Raises
    ------
    DomainError
        For an unknown category or an MDA outside the range.

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2, expanded circling approach radii.
    """
    return expanded_radius_cell(category, mda_ft_msl).radius_nm


def legacy_radius_cell(category: str) -> RadiusCell:
    """TERPS legacy (standard) radius cell of a category, with its provenance ("V2").

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2, standard circling approach radii.
    """
    return LEGACY_RADII[check_category(category)]


def legacy_radius_nm(category: str) -> float:
    """TERPS legacy (standard) circling radius: 1.3/1.5/1.7/2.3/4.5 NM for A-E.

    Parameters
    ----------
    category : str
        "A" to "E".

    Returns
    -------
    float
        Radius from each runway threshold. [NM]

    Raises
    ------
    DomainError
        For an unknown category.

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2, standard circling approach radii.
    """
    return legacy_radius_cell(category).radius_nm


# --------------------------------------------------------------------------------------------
# ICAO PANS-OPS radius: R = 2r + S
# --------------------------------------------------------------------------------------------

ICAO_DESIGN_WIND_KT = 25.0
"""Wind added to TAS throughout the turn, 46 km/h (25 kt), [6] 7.2.2 b) ("V")."""

ICAO_DESIGN_BANK_DEG = 20.0
"""Average bank, [6] 7.2.2 c) ("V")."""

ICAO_MAX_TURN_RATE_DEG_PER_S = 3.0
"""The bank is reduced to give this rate when 20 degrees would exceed it, [6] 7.2.2 c) ("V")."""

ICAO_HEIGHT_ABOVE_AERODROME_FT = 1000.0
"""TAS is taken at aerodrome elevation + 300 m (1000 ft), [6] Table I-2-3-1 ("V")."""

ICAO_DESIGN_ISA_DEVIATION_C = 15.0
"""TAS is taken at ISA + 15 C ("M", confirmed "C" by the worked example of [5] Table I-4-7-2)."""

ICAO_STRAIGHT_SEGMENT_NM: Mapping[str, float] = MappingProxyType(
    {"A": 0.3, "B": 0.4, "C": 0.5, "D": 0.6, "E": 0.7})
"""Straight segment S per category, [5] Table I-4-7-1 ("M", confirmed "C" by the worked example)."""

# Doc 8168 procedure-design constants ([6] Part I Section 2 Chapter 3, 3.1.2.2; "V").
_DOC8168_RATE_CONSTANT = 3431.0        # rate = 3431 tan(bank) / (pi V)  [deg/s, V in kt]
_DOC8168_RADIUS_CONSTANT = 20.0        # r = V / (20 pi rate)             [NM]
# IAS -> TAS constants of the Doc 8168 procedure-design formula (REFERENCES section 8c).
_TAS_K = 171233.0
_TAS_T0 = 288.0
_TAS_LAPSE_C_PER_FT = 0.00198
_TAS_EXPONENT = 2.628

TROPOPAUSE_FT = 36089.0
ALTITUDE_MIN_FT = -2000.0


def tas_icao_procedure_kt(ias_kt: Numeric, *, altitude_ft: Numeric,
                          isa_deviation_c: Numeric) -> Numeric:
    """True airspeed by the ICAO procedure-design conversion.

    Parameters
    ----------
    ias_kt : numeric
        Indicated airspeed, 0 < IAS <= 400. [kt]
    altitude_ft : numeric
        Altitude, -2000 <= H <= 36089 (troposphere). [ft]
    isa_deviation_c : numeric
        Temperature deviation from ISA, -60 <= VAR <= 60. [degC]

    Returns
    -------
    numeric
        True airspeed. [kt]

    Raises
    ------
    DomainError
        If any input is outside its range.

    Notes
    -----
    TAS = IAS * 171233 * ((288 + VAR) - 0.00198 H)^0.5 / (288 - 0.00198 H)^2.628 [1]_.
    Compressibility is ignored (the formula is the one the procedure designer uses), so it
    suits circling and holding speeds, not cruise Mach numbers. At sea level in ISA it gives
    TAS = IAS to within 1e-6.

    References
    ----------
    .. [1] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 2 (TAS conversion used in turn
       area construction); the exact appendix number is from memory.
    """
    _check_range("IAS", ias_kt, 0.0, 400.0, "kt", low_inclusive=False)
    _check_range("altitude", altitude_ft, ALTITUDE_MIN_FT, TROPOPAUSE_FT, "ft")
    _check_range("ISA deviation", isa_deviation_c, -60.0, 60.0, "C")
    ias = np.asarray(ias_kt, dtype=float)
    h = np.asarray(altitude_ft, dtype=float)
    var = np.asarray(isa_deviation_c, dtype=float)
    tas = (ias * _TAS_K * np.sqrt((_TAS_T0 + var) - _TAS_LAPSE_C_PER_FT * h)   # [1]
           / (_TAS_T0 - _TAS_LAPSE_C_PER_FT * h) ** _TAS_EXPONENT)
    return as_float(tas)


def _doc8168_rate_deg_per_s(v_kt: float, bank_deg: float) -> float:
    if type(bank_deg) in SCALAR_TYPES:    # tand with math: the same value
        return float(_DOC8168_RATE_CONSTANT * math.tan(math.radians(bank_deg)) / (math.pi * v_kt))   # [6] 3.1.2.2
    return float(_DOC8168_RATE_CONSTANT * tand(bank_deg) / (math.pi * v_kt))   # [6] 3.1.2.2


def _doc8168_radius_nm(v_kt: float, rate_deg_per_s: float) -> float:
    return v_kt / (_DOC8168_RADIUS_CONSTANT * math.pi * rate_deg_per_s)        # [6] 3.1.2.2


@dataclass(frozen=True, slots=True, kw_only=True)
class IcaoCirclingRadius:
    """The PANS-OPS visual manoeuvring radius and every step of its construction.

    Attributes:
        category: "A" to "E".
        airport_elevation_ft: aerodrome elevation. [ft MSL]
        altitude_ft: altitude of the TAS conversion (elevation + 1000 ft). [ft]
        isa_deviation_c: temperature of the TAS conversion (ISA + 15). [degC]
        ias_kt: the category's maximum circling IAS. [kt]
        tas_kt: TAS at `altitude_ft`. [kt]
        wind_kt: design wind added to TAS (25 kt). [kt]
        tas_plus_wind_kt: the speed used for the turn. [kt]
        bank_deg: 20 degrees, or less to keep 3 deg/s. [deg]
        turn_rate_deg_per_s: rate of turn at that bank. [deg/s]
        turn_radius_nm: r. [NM]
        straight_segment_nm: S. [NM]
        radius_nm: R = 2r + S, from each threshold. [NM]
    """

    category: str
    airport_elevation_ft: float
    altitude_ft: float
    isa_deviation_c: float
    ias_kt: float
    tas_kt: float
    wind_kt: float
    tas_plus_wind_kt: float
    bank_deg: float
    turn_rate_deg_per_s: float
    turn_radius_nm: float
    straight_segment_nm: float
    radius_nm: float

    def __post_init__(self) -> None:
        check_category(self.category)
        if not 0.0 < self.bank_deg <= ICAO_DESIGN_BANK_DEG + 1e-9:
            raise DomainError(f"bank {self.bank_deg:g} deg must be in (0, 20]")
        if self.turn_rate_deg_per_s > ICAO_MAX_TURN_RATE_DEG_PER_S + 1e-9:
            raise DomainError(f"turn rate {self.turn_rate_deg_per_s:g} deg/s exceeds 3 deg/s")
        if not math.isclose(self.tas_plus_wind_kt, self.tas_kt + self.wind_kt, rel_tol=1e-9):
            raise DomainError("tas_plus_wind_kt must equal tas_kt + wind_kt")
        if not math.isclose(self.radius_nm, 2.0 * self.turn_radius_nm + self.straight_segment_nm,
                            rel_tol=1e-9):
            raise DomainError("radius_nm must equal 2 * turn_radius_nm + straight_segment_nm")


AIRPORT_ELEVATION_MIN_FT = -1500.0
AIRPORT_ELEVATION_MAX_FT = 16000.0


def icao_circling_radius(category: str, *, airport_elevation_ft: float) -> IcaoCirclingRadius:
    """PANS-OPS visual manoeuvring (circling) radius R = 2r + S for an aerodrome.

    Parameters
    ----------
    category : str
        "A" to "E".
    airport_elevation_ft : float
        Aerodrome elevation, -1500 <= elevation <= 16000. [ft MSL]

    Returns
    -------
    IcaoCirclingRadius
        The radius and every intermediate value.

    Raises
    ------
    DomainError
        For an unknown category or an elevation outside the range.

    Notes
    -----
    * V = TAS + 25 kt, TAS from the category's maximum circling IAS (100/135/180/205/240 kt)
      at aerodrome elevation + 1000 ft and ISA + 15 [2]_ [3]_.
    * Bank 20 degrees, or the bank giving 3 deg/s if that is less [2]_:
      rate = 3431 tan(bank) / (pi V); at 3 deg/s, tan(bank) = 3 pi V / 3431 [3]_.
    * r = V / (20 pi rate) [3]_; R = 2r + S with S = 0.3/0.4/0.5/0.6/0.7 NM [1]_ [2]_.

    For an aerodrome at 1000 ft this reproduces the published 1.68/2.66/4.20/5.28/6.94 NM
    within 0.03 NM [1]_.

    References
    ----------
    .. [1] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 7, Tables I-4-7-1 and
       I-4-7-2 (worked example for an aerodrome at 300 m / 1000 ft).
    .. [2] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 4 Chapter 7, 7.2.1-7.2.2.
    .. [3] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 2 Chapter 3, 3.1.2.2 and
       Table I-2-3-1.
    """
    check_category(category)
    _check_range("airport elevation", airport_elevation_ft, AIRPORT_ELEVATION_MIN_FT,
                 AIRPORT_ELEVATION_MAX_FT, "ft")
    ias = ICAO_MAX_CIRCLING_IAS_KT[category]
    altitude = airport_elevation_ft + ICAO_HEIGHT_ABOVE_AERODROME_FT          # [3] Table I-2-3-1
    tas = float(tas_icao_procedure_kt(ias, altitude_ft=altitude,
                                      isa_deviation_c=ICAO_DESIGN_ISA_DEVIATION_C))
    v = tas + ICAO_DESIGN_WIND_KT                                             # [2] 7.2.2 b)
    bank = ICAO_DESIGN_BANK_DEG
    rate = _doc8168_rate_deg_per_s(v, bank)
    if rate > ICAO_MAX_TURN_RATE_DEG_PER_S:                                   # [2] 7.2.2 c)
        rate = ICAO_MAX_TURN_RATE_DEG_PER_S
        bank = float(atand(rate * math.pi * v / _DOC8168_RATE_CONSTANT))     # [3] 3.1.2.2
    r = _doc8168_radius_nm(v, rate)
    s = ICAO_STRAIGHT_SEGMENT_NM[category]
    return IcaoCirclingRadius(
        category=category, airport_elevation_ft=float(airport_elevation_ft),
        altitude_ft=float(altitude), isa_deviation_c=ICAO_DESIGN_ISA_DEVIATION_C,
        ias_kt=ias, tas_kt=tas, wind_kt=ICAO_DESIGN_WIND_KT, tas_plus_wind_kt=v,
        bank_deg=bank, turn_rate_deg_per_s=rate, turn_radius_nm=r,
        straight_segment_nm=s, radius_nm=2.0 * r + s)                         # [1] R = 2r + S


# --------------------------------------------------------------------------------------------
# The area radius of a criteria set, and the radius this aircraft needs
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True, slots=True, kw_only=True)
class AreaRadius:
    """The published circling-area radius for a category under a criteria set.

    Attributes:
        category: "A" to "E".
        criteria: one of `CRITERIA_SETS`.
        radius_nm: radius of the arcs around each usable runway threshold. [NM]
        basis: one or two plain sentences saying how the radius was found.
        provenance: "V2" (legacy; verified expanded cells), "M" (expanded cells from memory),
            "C" (ICAO, computed by the published construction).
        source: the citation.
        mda_ft_msl: the circling MDA used (expanded only). [ft MSL]
        mda_band: the expanded table's MDA band label (expanded only).
        icao: the ICAO construction (ICAO only).
    """

    category: str
    criteria: str
    radius_nm: float
    basis: str
    provenance: str
    source: str
    mda_ft_msl: float | None = None
    mda_band: str | None = None
    icao: IcaoCirclingRadius | None = None

    def __post_init__(self) -> None:
        check_category(self.category)
        check_criteria(self.criteria)
        provenance_label(self.provenance)
        if not (math.isfinite(self.radius_nm) and self.radius_nm > 0.0):
            raise DomainError(f"radius {self.radius_nm!r} NM must be positive")

    @property
    def from_memory(self) -> bool:
        """True when the radius is from memory and the brief must say so."""
        return is_from_memory(self.provenance)


_ICAO_AREA_SOURCE = ("ICAO Doc 8168 Vol II Part I Sec 4 Ch 7 (7.2.1-7.2.2); Vol I Part I Sec 4 "
                     "Ch 7, Tables I-4-7-1/-2")


def circling_area_radius_nm(category: str, *, criteria: str, mda_ft_msl: float | None = None,
                            airport_elevation_ft: float | None = None) -> AreaRadius:
    """The circling-area radius of a category under a criteria set.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        ``"terps-legacy"`` (fixed radius), ``"terps-expanded"`` (needs `mda_ft_msl`) or
        ``"icao"`` (needs `airport_elevation_ft`).
    mda_ft_msl : float, optional
        Circling MDA. [ft MSL]
    airport_elevation_ft : float, optional
        Aerodrome elevation. [ft MSL]

    Returns
    -------
    AreaRadius

    Raises
    ------
    DomainError
        For an unknown category or criteria set, a missing argument the set needs, or a value
        outside its range.

    Notes
    -----
    Arguments a set does not need are ignored. The area is the arcs of this radius around each
    usable runway threshold, joined by tangents [1]_ [2]_.

    References
    ----------
    .. [1] FAA AIM 5-4-20 and TPP page B2.
    .. [2] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 4 Chapter 7, 7.2.1.
    """
    check_category(category)
    check_criteria(criteria)
    if criteria == "terps-legacy":
        cell = legacy_radius_cell(category)
        basis = (f"TERPS legacy (standard) circling radius, fixed per category: Cat {category} "
                 f"{cell.radius_nm:g} NM from each runway threshold (procedures without the "
                 "negative-C symbol).")
        return AreaRadius(category=category, criteria=criteria, radius_nm=cell.radius_nm,
                          basis=basis, provenance=cell.provenance, source=cell.source)
    if criteria == "terps-expanded":
        if mda_ft_msl is None:
            raise DomainError("the terps-expanded radius needs the circling MDA (ft MSL)")
        band = expanded_mda_band(mda_ft_msl)
        cell = expanded_radius_cell(category, mda_ft_msl)
        basis = (f"TERPS expanded circling radius (negative-C procedures) for a circling MDA of "
                 f"{mda_ft_msl:g} ft MSL, band {band.label} ft: Cat {category} "
                 f"{cell.radius_nm:g} NM from each runway threshold.")
        if cell.from_memory:
            basis += " This table cell is from memory, not verified: check the chart legend."
        return AreaRadius(category=category, criteria=criteria, radius_nm=cell.radius_nm,
                          basis=basis, provenance=cell.provenance, source=cell.source,
                          mda_ft_msl=float(mda_ft_msl), mda_band=band.label)
    if airport_elevation_ft is None:
        raise DomainError("the icao radius needs the aerodrome elevation (ft MSL)")
    c = icao_circling_radius(category, airport_elevation_ft=airport_elevation_ft)
    basis = (f"PANS-OPS R = 2r + S: IAS {c.ias_kt:g} kt is TAS {c.tas_kt:.1f} kt at "
             f"{c.altitude_ft:g} ft (aerodrome + 1000 ft, ISA+15), plus {c.wind_kt:g} kt wind = "
             f"{c.tas_plus_wind_kt:.1f} kt; bank {c.bank_deg:.1f} deg, "
             f"{c.turn_rate_deg_per_s:.2f} deg/s, r = {c.turn_radius_nm:.3f} NM; "
             f"S = {c.straight_segment_nm:g} NM; R = {c.radius_nm:.2f} NM.")
    return AreaRadius(category=category, criteria=criteria, radius_nm=c.radius_nm, basis=basis,
                      provenance="C", source=_ICAO_AREA_SOURCE, icao=c)


# --------------------------------------------------------------------------------------------
# Where the area's arcs are centred: runway ends or landing thresholds
# --------------------------------------------------------------------------------------------
ARC_CENTRE_RUNWAY_END = "runway-end"
ARC_CENTRE_THRESHOLD = "landing-threshold"


@dataclass(frozen=True, slots=True, kw_only=True)
class ArcCentreRule:
    """Which point of each usable runway the circling-area arcs are drawn about.

    Attributes:
        criteria: the criteria set.
        centre: ``"runway-end"`` or ``"landing-threshold"``; the two differ only where a threshold
            is displaced.
        text: one sentence for the brief.
        provenance: "V" / "V2" / "M" (see the module docstring).
        source: where the rule is published.
    """

    criteria: str
    centre: str
    text: str
    provenance: str
    source: str


_ARC_SOURCE_TERPS = ("AIM 5-4-20(b)(1): circling protected areas are the tangential connection of arcs "
                     "drawn from each runway end (read); FAA Order 8260.3 circling area construction, "
                     "'an arc from the center of the end of each usable runway' (from memory, not read)")
_ARC_SOURCE_ICAO = ("ICAO Doc 8168 Vol I Part I Sec 4 Ch 7, 7.2.3: arcs centred on each runway threshold "
                    "(read in a verbatim quotation); Vol II Part I Sec 4 Ch 7, 7.2.1.1 a) arc centred on "
                    "the threshold of each usable runway (items b and c read in the primary text, item a in "
                    "a reproduction); threshold: the beginning of the part of the runway usable for "
                    "landing, ICAO Annex 14 Vol I, Ch 1 (from memory)")


def circling_arc_centre(criteria: str) -> ArcCentreRule:
    """Whether a criteria set centres the circling-area arcs on the runway ends or on the landing
    thresholds (they differ only where a threshold is displaced).

    * FAA TERPS (both radius tables): the runway ends [1]_. The AIM's wording ("arcs drawn from
      each runway end") is the one read in the primary text; the Order's own construction text
      is recalled, not read.
    * ICAO PANS-OPS: the runway thresholds [2]_ [3]_, and a threshold is where the part of the
      runway usable for landing begins, so a displaced threshold is the centre.

    On a runway with a displaced threshold the TERPS area is therefore larger than the ICAO-style
    construction about the same points would be: the end lies behind the landing threshold.

    References
    ----------
    .. [1] FAA, Aeronautical Information Manual, 5-4-20(b)(1).
    .. [2] ICAO Doc 8168 Vol I, 5th ed., Part I Section 4 Chapter 7, 7.2.3.
    .. [3] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 4 Chapter 7, 7.2.1.1.
    """
    check_criteria(criteria)
    if criteria in TERPS_CRITERIA:
        return ArcCentreRule(criteria=criteria, centre=ARC_CENTRE_RUNWAY_END, provenance="V",
                             text="TERPS: the circling-area arcs are centred on the runway ends, "
                                  "not on a displaced threshold (AIM 5-4-20).",
                             source=_ARC_SOURCE_TERPS)
    return ArcCentreRule(criteria=criteria, centre=ARC_CENTRE_THRESHOLD, provenance="V2",
                         text="PANS-OPS: the circling-area arcs are centred on the landing thresholds, "
                              "a displaced threshold included (Doc 8168 Vol II Part I Sec 4 Ch 7).",
                         source=_ARC_SOURCE_ICAO)


@dataclass(frozen=True, slots=True, kw_only=True)
class RequiredRadius:
    """The 2r + S radius this aircraft needs today, built as the ICAO design builds its own.

    Attributes:
        tas_kt: this aircraft's TAS at the MDA. [kt]
        wind_kt: today's wind speed, added to TAS (worst case). [kt]
        tas_plus_wind_kt: the speed used for the turn. [kt]
        bank_deg: the planned bank. [deg]
        turn_rate_deg_per_s: rate at that bank and speed. [deg/s]
        turn_radius_nm: r. [NM]
        straight_segment_nm: S. [NM]
        radius_nm: 2r + S. [NM]
    """

    tas_kt: float
    wind_kt: float
    tas_plus_wind_kt: float
    bank_deg: float
    turn_rate_deg_per_s: float
    turn_radius_nm: float
    straight_segment_nm: float
    radius_nm: float

    def __post_init__(self) -> None:
        if not math.isclose(self.tas_plus_wind_kt, self.tas_kt + self.wind_kt, rel_tol=1e-9):
            raise DomainError("tas_plus_wind_kt must equal tas_kt + wind_kt")
        if not math.isclose(self.radius_nm, 2.0 * self.turn_radius_nm + self.straight_segment_nm,
                            rel_tol=1e-9):
            raise DomainError("radius_nm must equal 2 * turn_radius_nm + straight_segment_nm")


def required_radius_nm(*, tas_kt: float, wind_kt: float, bank_deg: float,
                       straight_segment_nm: float) -> RequiredRadius:
    """The circling radius this aircraft needs: 2r + S at its own TAS, wind and bank.

    Parameters
    ----------
    tas_kt : float
        TAS at the circling altitude, 0 < TAS <= 400. [kt]
    wind_kt : float
        Wind speed, 0 <= wind <= 150; added in full to TAS, as the ICAO design adds its 25 kt.
        [kt]
    bank_deg : float
        Planned bank, 0 < bank < 90. [deg]
    straight_segment_nm : float
        Straight segment, 0 <= S <= 5. [NM]

    Returns
    -------
    RequiredRadius

    Raises
    ------
    DomainError
        If any input is outside its range.

    Notes
    -----
    Same construction as `icao_circling_radius` ([1]_, [2]_) but without the 3 deg/s limit:
    the bank is the crew's plan. rate = 3431 tan(bank) / (pi V), r = V / (20 pi rate), i.e.
    r = V^2 / (68 620 tan(bank)) NM, within 0.01 % of V^2 / (g tan(bank)).
    Compare `radius_nm` with the published area radius: when it is larger, the turn as planned
    does not fit the protected area.

    References
    ----------
    .. [1] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 4 Chapter 7, 7.2.2.
    .. [2] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 2 Chapter 3, 3.1.2.2.
    """
    _check_range("TAS", tas_kt, 0.0, 400.0, "kt", low_inclusive=False)
    _check_range("wind", wind_kt, 0.0, 150.0, "kt")
    _check_range("bank", bank_deg, 0.0, 90.0, "deg", low_inclusive=False, high_inclusive=False)
    _check_range("straight segment", straight_segment_nm, 0.0, 5.0, "NM")
    v = float(tas_kt) + float(wind_kt)
    rate = _doc8168_rate_deg_per_s(v, float(bank_deg))
    r = _doc8168_radius_nm(v, rate)
    return RequiredRadius(tas_kt=float(tas_kt), wind_kt=float(wind_kt), tas_plus_wind_kt=v,
                          bank_deg=float(bank_deg), turn_rate_deg_per_s=rate, turn_radius_nm=r,
                          straight_segment_nm=float(straight_segment_nm),
                          radius_nm=2.0 * r + float(straight_segment_nm))


# --------------------------------------------------------------------------------------------
# Obstacle clearance, lowest circling height, minimum visibility
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True, slots=True, kw_only=True)
class ObstacleClearance:
    """Required obstacle clearance in the circling area.

    Attributes:
        category, criteria: what it applies to.
        clearance_ft, clearance_m: the clearance above the highest obstacle. [ft], [m]
        provenance: "V", "V2", "C" or "M".
        source: the citation.
    """

    category: str
    criteria: str
    clearance_ft: float
    clearance_m: float
    provenance: str
    source: str


@dataclass(frozen=True, slots=True, kw_only=True)
class MinimumCirclingHeight:
    """The lowest circling height the criteria allow for a category.

    Attributes:
        category, criteria: what it applies to.
        height_ft, height_m: the height above the airport (TERPS HAA; ICAO OCH above aerodrome
            elevation). [ft], [m]
        provenance: "V", "V2", "C" or "M".
        source: the citation.
    """

    category: str
    criteria: str
    height_ft: float
    height_m: float
    provenance: str
    source: str


@dataclass(frozen=True, slots=True, kw_only=True)
class MinimumCirclingVisibility:
    """The lowest circling visibility the criteria give for a category.

    Attributes:
        category, criteria: what it applies to.
        visibility_sm, visibility_m: the minimum visibility. [SM], [m]
        provenance: "V", "V2", "C" or "M".
        source: the citation.
        note: how the value is meant (e.g. "at the lowest HAA; grows with HAA").
    """

    category: str
    criteria: str
    visibility_sm: float
    visibility_m: float
    provenance: str
    source: str
    note: str


_TERPS_ROC_FT = 300.0
_TERPS_ROC_SOURCE = "AIM 5-4-20 (circling MDA gives 300 ft obstacle clearance within the area)"
_ICAO_MOC_M: Mapping[str, float] = MappingProxyType(
    {"A": 90.0, "B": 90.0, "C": 120.0, "D": 120.0, "E": 150.0})
_ICAO_TABLE_SOURCE = ("ICAO Doc 8168 Vol I Part I Sec 4 Ch 7, Table I-4-7-3; from memory, "
                      "not verified")
_ICAO_MOC_SOURCE = _ICAO_TABLE_SOURCE + " (trade press: clearance 295 ft rising to nearly 500 ft)"
_TERPS_HAA_FT: Mapping[str, float] = MappingProxyType(
    {"A": 350.0, "B": 450.0, "C": 450.0, "D": 550.0, "E": 550.0})
_TERPS_HAA_SOURCE = ("FAA Order 8260.3 (TERPS) minimum circling HAA; from memory, not verified "
                     "(a 350/450/550 ft standard is quoted in a secondary source)")
_ICAO_OCH_M: Mapping[str, float] = MappingProxyType(
    {"A": 120.0, "B": 150.0, "C": 180.0, "D": 210.0, "E": 240.0})
_TERPS_VIS_SM: Mapping[str, float] = MappingProxyType(
    {"A": 1.0, "B": 1.0, "C": 1.5, "D": 2.0, "E": 2.0})
_TERPS_VIS_SOURCE = "FAA Order 8260.3 (TERPS) circling visibility table; from memory, not verified"
_ICAO_VIS_KM: Mapping[str, float] = MappingProxyType(
    {"A": 1.9, "B": 2.8, "C": 3.7, "D": 4.6, "E": 6.5})


def circling_obstacle_clearance_ft(category: str, *, criteria: str) -> ObstacleClearance:
    """Required obstacle clearance in the circling area.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    ObstacleClearance
        TERPS: 300 ft for every category [1]_ ("V"). ICAO: MOC 90/90/120/120/150 m
        (295/295/394/394/492 ft) [2]_ ("M", corroborated in part by a secondary source).

    Raises
    ------
    DomainError
        For an unknown category or criteria set.

    References
    ----------
    .. [1] FAA AIM 5-4-20.
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 7, Table I-4-7-3.
    """
    check_category(category)
    if check_criteria(criteria) == "icao":
        m = _ICAO_MOC_M[category]
        return ObstacleClearance(category=category, criteria=criteria, clearance_ft=m * M_TO_FT,
                                 clearance_m=m, provenance="M", source=_ICAO_MOC_SOURCE)
    return ObstacleClearance(category=category, criteria=criteria, clearance_ft=_TERPS_ROC_FT,
                             clearance_m=_TERPS_ROC_FT * FT_TO_M, provenance="V",
                             source=_TERPS_ROC_SOURCE)


def minimum_circling_height_ft(category: str, *, criteria: str) -> MinimumCirclingHeight:
    """The lowest circling height for a category.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    MinimumCirclingHeight
        TERPS: HAA 350/450/450/550/550 ft [1]_ ("M"). ICAO: lowest OCH above aerodrome
        elevation 120/150/180/210/240 m (394/492/591/689/787 ft) [2]_ ("M").

    Raises
    ------
    DomainError
        For an unknown category or criteria set.

    References
    ----------
    .. [1] FAA Order 8260.3 (TERPS), circling minimums (not read).
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 7, Table I-4-7-3.
    """
    check_category(category)
    if check_criteria(criteria) == "icao":
        m = _ICAO_OCH_M[category]
        return MinimumCirclingHeight(category=category, criteria=criteria, height_ft=m * M_TO_FT,
                                     height_m=m, provenance="M", source=_ICAO_TABLE_SOURCE)
    ft = _TERPS_HAA_FT[category]
    return MinimumCirclingHeight(category=category, criteria=criteria, height_ft=ft,
                                 height_m=ft * FT_TO_M, provenance="M", source=_TERPS_HAA_SOURCE)


def minimum_circling_visibility_sm(category: str, *, criteria: str) -> MinimumCirclingVisibility:
    """The lowest circling visibility for a category.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    MinimumCirclingVisibility
        TERPS: 1/1/1.5/2/2 SM at the lowest HAA, growing with HAA [1]_ ("M").
        ICAO: 1.9/2.8/3.7/4.6/6.5 km [2]_ ("M"), also in SM.

    Raises
    ------
    DomainError
        For an unknown category or criteria set.

    Notes
    -----
    The published procedure's visibility governs; these are the criteria's floors, for
    comparison. Doc 8168 says its table is not meant as operating minima [2]_.

    References
    ----------
    .. [1] FAA Order 8260.3 (TERPS), circling visibility (not read).
    .. [2] ICAO Doc 8168 Vol I, 5th ed., 2006, Part I Section 4 Chapter 7, Table I-4-7-3 and
       7.3.2.
    """
    check_category(category)
    if check_criteria(criteria) == "icao":
        m = _ICAO_VIS_KM[category] * KM_TO_M
        return MinimumCirclingVisibility(
            category=category, criteria=criteria, visibility_sm=m * M_TO_SM, visibility_m=m,
            provenance="M", source=_ICAO_TABLE_SOURCE,
            note="procedure-design value; Doc 8168 says it is not meant as operating minima")
    sm = _TERPS_VIS_SM[category]
    return MinimumCirclingVisibility(
        category=category, criteria=criteria, visibility_sm=sm, visibility_m=sm * SM_TO_M,
        provenance="M", source=_TERPS_VIS_SOURCE,
        note="at the lowest circling HAA; the published minimum grows with HAA")


# --------------------------------------------------------------------------------------------
# MDA rounding
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True, slots=True, kw_only=True)
class RoundingRule:
    """How a criteria set rounds a computed MDA.

    Attributes:
        criteria: one of `CRITERIA_SETS`.
        increment_ft: the MDA is rounded up to the next multiple of this. [ft]
        provenance: "V", "V2", "C" or "M".
        source: the citation.
    """

    criteria: str
    increment_ft: float
    provenance: str
    source: str


_MDA_ROUNDING: Mapping[str, RoundingRule] = MappingProxyType({
    "terps-legacy": RoundingRule(
        criteria="terps-legacy", increment_ft=20.0, provenance="M",
        source="AIM 5-4-20 states the 20 ft rounding for LNAV MDAs; applying it to circling is "
               "from memory"),
    "terps-expanded": RoundingRule(
        criteria="terps-expanded", increment_ft=20.0, provenance="M",
        source="AIM 5-4-20 states the 20 ft rounding for LNAV MDAs; applying it to circling is "
               "from memory"),
    "icao": RoundingRule(
        criteria="icao", increment_ft=10.0, provenance="M",
        source="ICAO Doc 8168 Vol II (OCA/H promulgated in 5 m or 10 ft steps); from memory"),
})


def mda_rounding_rule(criteria: str) -> RoundingRule:
    """The MDA rounding rule of a criteria set, with its provenance (all "M" for circling)."""
    return _MDA_ROUNDING[check_criteria(criteria)]


def round_mda_up_ft(value_ft: float, *, criteria: str) -> float:
    """Round a computed circling MDA up to the criteria's increment.

    Parameters
    ----------
    value_ft : float
        Computed MDA, -1500 <= value <= 20000. [ft MSL]
    criteria : str
        One of `CRITERIA_SETS`.

    Returns
    -------
    float
        TERPS: the next multiple of 20 ft; ICAO: the next multiple of 10 ft. A value already on
        a multiple (within 1e-6 ft) is kept. [ft MSL]

    Raises
    ------
    DomainError
        For an unknown criteria set or a value outside the range.

    Notes
    -----
    The AIM states the 20 ft rounding for LNAV MDAs [1]_; using it for circling MDAs is from
    memory. The ICAO 10 ft step is from memory [2]_. See `mda_rounding_rule`.

    References
    ----------
    .. [1] FAA AIM 5-4-20 (LNAV MDA rounded up to the next 20 ft).
    .. [2] ICAO Doc 8168 Vol II, 5th ed., 2006 (promulgation of OCA/H).
    """
    step = mda_rounding_rule(criteria).increment_ft
    _check_range("MDA", value_ft, MDA_MIN_FT, MDA_MAX_FT, "ft MSL")
    return float(math.ceil(value_ft / step - 1e-6 / step) * step)


# --------------------------------------------------------------------------------------------
# Straight-in or circling-only
# --------------------------------------------------------------------------------------------

FAA_ALIGNMENT_LIMIT_DEG = 30.0
"""Straight-in only within 30 degrees of the runway, [3] 5-4-20 c) ("V")."""
FAA_ALIGNMENT_LIMIT_GPS_DEG = 15.0
"""15 degrees for GPS procedures, [3] 5-4-20 c) ("V")."""
FAA_MAX_GRADIENT_FT_PER_NM = 400.0
"""TERPS non-precision final, maximum descent gradient ("V2", TERPS quoted in a forum)."""
FAA_OPTIMUM_GRADIENT_FT_PER_NM = 318.0
"""TERPS optimum descent gradient, about 3 degrees ("V2")."""
ICAO_ALIGNMENT_LIMIT_AB_DEG = 30.0
ICAO_ALIGNMENT_LIMIT_CDE_DEG = 15.0
ICAO_MAX_GRADIENT_AB_PCT = 6.5
ICAO_MAX_GRADIENT_CDE_PCT = 6.1


def gradient_ft_per_nm_from_angle_deg(angle_deg: Numeric) -> Numeric:
    """Descent gradient of a path angle: tan(angle) x feet per NM (3 deg gives 318.4 ft/NM).

    Raises DomainError unless 0 <= angle < 90 degrees.
    """
    _check_range("path angle", angle_deg, 0.0, 90.0, "deg", high_inclusive=False)
    return as_float(tand(angle_deg) * NM_TO_FT)


def angle_deg_from_gradient_ft_per_nm(gradient_ft_per_nm: Numeric) -> Numeric:
    """Path angle of a descent gradient: atan(gradient / feet per NM) (400 ft/NM is 3.77 deg).

    Raises DomainError for a negative or non-finite gradient.
    """
    _check_range("gradient", gradient_ft_per_nm, 0.0, math.inf, "ft/NM")
    if type(gradient_ft_per_nm) in SCALAR_TYPES:     # one number: math, the same operations
        return math.degrees(math.atan(float(gradient_ft_per_nm) / NM_TO_FT))
    return as_float(atand(np.asarray(gradient_ft_per_nm, dtype=float) / NM_TO_FT))


def descent_gradient_ft_per_nm(*, faf_altitude_ft: Numeric, threshold_elevation_ft: Numeric,
                               tch_ft: Numeric, distance_nm: Numeric) -> Numeric:
    """Descent gradient of a non-precision final from the FAF to the threshold crossing height.

    Parameters
    ----------
    faf_altitude_ft : numeric
        Altitude at the final approach fix. [ft MSL]
    threshold_elevation_ft : numeric
        Threshold elevation. [ft MSL]
    tch_ft : numeric
        Threshold crossing height, 0 <= TCH <= 200. [ft]
    distance_nm : numeric
        Distance from the FAF to the threshold, 0 < d <= 30. [NM]

    Returns
    -------
    numeric
        (FAF altitude - (threshold elevation + TCH)) / distance. [ft/NM]

    Raises
    ------
    DomainError
        If the distance or TCH is out of range, or the FAF is below the threshold crossing
        point (the gradient would be a climb).

    References
    ----------
    .. [1] FAA Order 8260.3 (TERPS), non-precision final descent gradient, measured from the FAF
       to the TCH ("V2", quoted in secondary sources).
    """
    _check_range("TCH", tch_ft, 0.0, 200.0, "ft")
    _check_range("FAF to threshold distance", distance_nm, 0.0, 30.0, "NM", low_inclusive=False)
    _check_range("FAF altitude", faf_altitude_ft, MDA_MIN_FT, MDA_MAX_FT, "ft")
    _check_range("threshold elevation", threshold_elevation_ft, AIRPORT_ELEVATION_MIN_FT,
                 AIRPORT_ELEVATION_MAX_FT, "ft")
    if all(type(v) in SCALAR_TYPES for v in (faf_altitude_ft, threshold_elevation_ft, tch_ft, distance_nm)):
        drop_f = float(faf_altitude_ft) - (float(threshold_elevation_ft) + float(tch_ft))
        if drop_f >= 0.0:                    # one number each: the same operations without numpy
            return drop_f / float(distance_nm)
    drop = (np.asarray(faf_altitude_ft, dtype=float)
            - (np.asarray(threshold_elevation_ft, dtype=float) + np.asarray(tch_ft, dtype=float)))
    if np.any(drop < 0.0):
        raise DomainError("FAF altitude is below the threshold crossing point "
                          "(threshold elevation + TCH); the final would be a climb")
    return as_float(drop / np.asarray(distance_nm, dtype=float))


@dataclass(frozen=True, slots=True, kw_only=True)
class CirclingOnlyReason:
    """One reason a procedure gets circling minima only.

    Attributes:
        code: "alignment" or "gradient".
        text: one plain sentence with the citation.
        value: the procedure's value, in `unit`.
        limit: the criteria's limit, in `unit`.
        unit: "deg", "ft/NM" or "pct".
    """

    code: str
    text: str
    value: float
    limit: float
    unit: str


@dataclass(frozen=True, slots=True, kw_only=True)
class StraightInAssessment:
    """Whether straight-in minima are possible, and why not.

    Attributes:
        criteria, category: what was assessed.
        rnav_gps: True for a GPS procedure (FAA 15 degree alignment limit).
        alignment_deg: angle between final course and runway course, 0-180. [deg]
        alignment_limit_deg: the limit applied. [deg]
        gradient_ft_per_nm, gradient_pct, gradient_deg: the final's descent gradient.
        gradient_limit_ft_per_nm, gradient_limit_pct: the limit applied.
        reasons: why straight-in is not authorised (empty when it is).
        straight_in_allowed: True when there is no reason.
    """

    criteria: str
    category: str
    rnav_gps: bool
    alignment_deg: float
    alignment_limit_deg: float
    gradient_ft_per_nm: float
    gradient_pct: float
    gradient_deg: float
    gradient_limit_ft_per_nm: float
    gradient_limit_pct: float
    reasons: tuple[CirclingOnlyReason, ...]
    straight_in_allowed: bool

    def __post_init__(self) -> None:
        if self.straight_in_allowed != (len(self.reasons) == 0):
            raise DomainError("straight_in_allowed must be True exactly when there is no reason")
        if not 0.0 <= self.alignment_deg <= 180.0:
            raise DomainError(f"alignment {self.alignment_deg:g} deg must be in [0, 180]")


def straight_in_assessment(*, final_course_deg: float, runway_course_deg: float,
                           gradient_ft_per_nm: float, category: str, criteria: str,
                           rnav_gps: bool = False) -> StraightInAssessment:
    """Does the procedure's geometry allow straight-in minima, or circling only?

    Parameters
    ----------
    final_course_deg : float
        Final approach course (same reference as the runway course). [deg]
    runway_course_deg : float
        Runway course in the landing direction. [deg]
    gradient_ft_per_nm : float
        Descent gradient of the final, FAF to TCH, >= 0 (see `descent_gradient_ft_per_nm`).
        [ft/NM]
    category : str
        "A" to "E" (ICAO limits depend on it).
    criteria : str
        One of `CRITERIA_SETS`.
    rnav_gps : bool
        True for a GPS procedure (FAA alignment limit 15 degrees).

    Returns
    -------
    StraightInAssessment

    Raises
    ------
    DomainError
        For an unknown category or criteria set, a non-finite course or a negative gradient.

    Notes
    -----
    The alignment is the smallest angle between the two courses (course 355 vs runway 005 is
    10 degrees). Limits are exceeded strictly ("within 30 degrees" allows 30).

    * FAA: alignment > 30 degrees (> 15 for GPS) [1]_; gradient > 400 ft/NM [2]_.
    * ICAO: alignment > 30 degrees for Cat A/B, > 15 for C/D/E; gradient > 6.5 % (A/B),
      > 6.1 % (C/D/E) [3]_. `rnav_gps` does not change the ICAO limits.

    The FAA's third reason (final course crossing the extended centreline at or after the
    threshold) needs the procedure's geometry and is not assessed here.

    References
    ----------
    .. [1] FAA AIM 5-4-20 c).
    .. [2] FAA Order 8260.3 (TERPS), non-precision final: optimum 318, maximum 400 ft/NM ("V2").
    .. [3] ICAO Doc 8168 Vol II, 5th ed., 2006, Part I Section 4 Chapters 5 and 7 ("V2").
    """
    check_category(category)
    check_criteria(criteria)
    _check_range("final course", final_course_deg, -720.0, 720.0, "deg")
    _check_range("runway course", runway_course_deg, -720.0, 720.0, "deg")
    gradient_deg = float(angle_deg_from_gradient_ft_per_nm(gradient_ft_per_nm))
    gradient = float(gradient_ft_per_nm)
    gradient_pct = gradient / NM_TO_FT * 100.0
    if type(final_course_deg) in SCALAR_TYPES and type(runway_course_deg) in SCALAR_TYPES:   # wrap_180 with floats
        alignment = abs((float(final_course_deg) - float(runway_course_deg) + 180.0) % 360.0 - 180.0)
    else:
        alignment = abs(float(wrap_180(final_course_deg - runway_course_deg)))

    reasons: list[CirclingOnlyReason] = []
    if criteria == "icao":
        ab = category in ("A", "B")
        align_limit = ICAO_ALIGNMENT_LIMIT_AB_DEG if ab else ICAO_ALIGNMENT_LIMIT_CDE_DEG
        grad_limit_pct = ICAO_MAX_GRADIENT_AB_PCT if ab else ICAO_MAX_GRADIENT_CDE_PCT
        grad_limit_ft = grad_limit_pct / 100.0 * NM_TO_FT
        cats = "A/B" if ab else "C/D/E"
        if alignment > align_limit:
            reasons.append(CirclingOnlyReason(
                code="alignment", value=alignment, limit=align_limit, unit="deg",
                text=(f"Final course is {alignment:.0f} deg off the runway, more than the "
                      f"{align_limit:g} deg allowed for Cat {cats} straight-in (Doc 8168 Vol II "
                      "Part I Sec 4).")))
        if gradient_pct > grad_limit_pct:
            reasons.append(CirclingOnlyReason(
                code="gradient", value=gradient_pct, limit=grad_limit_pct, unit="pct",
                text=(f"Final descent gradient {gradient_pct:.1f} % is steeper than the "
                      f"{grad_limit_pct:g} % maximum for Cat {cats} (Doc 8168 Vol II Part I "
                      "Sec 4 Ch 5).")))
    else:
        align_limit = FAA_ALIGNMENT_LIMIT_GPS_DEG if rnav_gps else FAA_ALIGNMENT_LIMIT_DEG
        grad_limit_ft = FAA_MAX_GRADIENT_FT_PER_NM
        grad_limit_pct = grad_limit_ft / NM_TO_FT * 100.0
        if alignment > align_limit:
            kind = "a GPS procedure" if rnav_gps else "straight-in minima"
            reasons.append(CirclingOnlyReason(
                code="alignment", value=alignment, limit=align_limit, unit="deg",
                text=(f"Final course is {alignment:.0f} deg off the runway, more than the "
                      f"{align_limit:g} deg allowed for {kind} (AIM 5-4-20).")))
        if gradient > grad_limit_ft:
            reasons.append(CirclingOnlyReason(
                code="gradient", value=gradient, limit=grad_limit_ft, unit="ft/NM",
                text=(f"Final descent gradient {gradient:.0f} ft/NM is steeper than the TERPS "
                      f"maximum of {grad_limit_ft:g} ft/NM (FAA Order 8260.3).")))

    return StraightInAssessment(
        criteria=criteria, category=category, rnav_gps=bool(rnav_gps), alignment_deg=alignment,
        alignment_limit_deg=align_limit, gradient_ft_per_nm=gradient, gradient_pct=gradient_pct,
        gradient_deg=gradient_deg, gradient_limit_ft_per_nm=grad_limit_ft,
        gradient_limit_pct=grad_limit_pct, reasons=tuple(reasons),
        straight_in_allowed=not reasons)
