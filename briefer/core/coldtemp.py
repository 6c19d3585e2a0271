"""Cold-temperature altitude correction (ICAO approximate formula and the AIM/ICAO table).

When the air is colder than standard, a pressure altimeter over-reads: the aircraft is lower
than indicated. The correction is added to the published altitudes (heights above the aerodrome,
i.e. above the altimeter-setting source).

Two methods, and the output says which one was used:

* ``"sea-level-table"`` reproduces the published "ICAO Cold Temperature Error Table" (AIM TBL
  7-3-1): the formula for an aerodrome at sea level (Hss = 0, t0 = the reported temperature),
  rounded UP to the next 10 ft. It is conservative at elevated aerodromes.
* ``"airport-elevation"`` applies the formula with the real aerodrome elevation (the reported
  temperature reduced to sea level, Hss = elevation), unrounded. It is smaller at elevated
  aerodromes.

No correction (0 ft, ``applicable=False``) is returned when the temperature is at or above the
temperature the formula treats as standard (t0 >= 15 degC, where the formula would go negative):
the formula is for cold temperatures only and warm-temperature corrections are not applied.

Validity ranges (a `DomainError` is raised outside them, never a silent NaN): height above the
aerodrome 0 to 30,000 ft; aerodrome elevation -2,000 to 15,000 ft; aerodrome temperature
-100 to +60 degC.

References
----------
.. [1] ICAO, "Procedures for Air Navigation Services - Aircraft Operations," Doc 8168, Vol I,
   Part III, Section 1, Chapter 4, 4.3 "Temperature correction" (approximate formula
   Correction = H (15 - t0) / (273 + t0 - 0.5 L0 (H + Hss)), L0 = 0.0065 K/m = 0.00198 degC/ft),
   and Table III-1-4-1 b).
.. [2] FAA, "Aeronautical Information Manual," 7-3-1 "Cold Temperature Barometric Altimeter
   Errors, Setting Procedures and Cold Temperature Airports", TBL 7-3-1 "ICAO Cold Temperature
   Error Table" and its worked example (-12 degC, height 2,994 ft: add about 300 ft).
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass
from typing import Literal

import numpy as np

from briefer import units
from briefer.core import angles
from briefer.core._types import Numeric
from briefer.core.ranges import checked as _checked  # the one range check of the core
from briefer.errors import DomainError

__all__ = [
    "METHODS",
    "ColdTemperatureCorrection",
    "cold_temperature_correction_ft",
    "cold_temperature_correction",
    "sea_level_temperature_c",
]

Method = Literal["airport-elevation", "sea-level-table"]
METHODS: tuple[str, ...] = ("airport-elevation", "sea-level-table")

L0_C_PER_FT = 0.00198                  # [1] ISA lapse rate as the formula writes it
STANDARD_SEA_LEVEL_C = 15.0            # [1] ISA sea-level temperature as the formula writes it
FORMULA_ZERO_C_IN_K = 273.0            # [1] the formula rounds 273.15 K to 273
TABLE_ROUNDING_FT = 10.0               # [2] the table is rounded up to the next 10 ft
HEIGHT_RANGE_FT = (0.0, 30000.0)
ELEVATION_RANGE_FT = (-2000.0, 15000.0)
OAT_RANGE_C = (-100.0, 60.0)
# Float slack before rounding up, so an exact multiple of 10 ft is not pushed up by rounding.
_ROUND_SLACK_FT = 1e-9


def sea_level_temperature_c(airport_oat_c: Numeric, *, airport_elevation_ft: Numeric) -> Numeric:
    """Aerodrome temperature reduced to sea level with the formula's lapse rate.

    Parameters
    ----------
    airport_oat_c : numeric
        Reported aerodrome temperature, -100 to +60. [degC]
    airport_elevation_ft : numeric
        Aerodrome (altimeter-setting source) elevation, -2,000 to 15,000. [ft]

    Returns
    -------
    numeric
        t0 = t_aerodrome + L0 h_aerodrome, L0 = 0.00198 degC/ft. [degC]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [1] ICAO Doc 8168, Vol I, Part III, Section 1, Chapter 4, 4.3.
    """
    t = _checked("airport_oat_c", airport_oat_c, *OAT_RANGE_C, "degC")
    elev = _checked("airport_elevation_ft", airport_elevation_ft, *ELEVATION_RANGE_FT, "ft")
    return angles.as_float(t + L0_C_PER_FT * elev)                      # [1] eq. t0 = t_ad + L0 h_ad


def _formula_ft(height_ft: np.ndarray, t0_c: np.ndarray, hss_ft: np.ndarray) -> np.ndarray:
    num = height_ft * (STANDARD_SEA_LEVEL_C - t0_c)
    den = FORMULA_ZERO_C_IN_K + t0_c - 0.5 * L0_C_PER_FT * (height_ft + hss_ft)
    return num / den                                                   # [1] eq. 4.3 approximate correction


def cold_temperature_correction_ft(height_above_airport_ft: Numeric, *, airport_oat_c: Numeric,
                                   airport_elevation_ft: Numeric = 0.0,
                                   method: Method = "airport-elevation") -> Numeric:
    """Cold-temperature correction to add to an altitude.

    Parameters
    ----------
    height_above_airport_ft : numeric
        Height of the altitude to correct above the aerodrome (the altimeter-setting source),
        0 to 30,000. [ft]
    airport_oat_c : numeric
        Reported aerodrome temperature, -100 to +60. [degC]
    airport_elevation_ft : numeric, optional
        Aerodrome elevation, -2,000 to 15,000; ignored by ``"sea-level-table"``. [ft]
    method : {"airport-elevation", "sea-level-table"}, optional
        ``"airport-elevation"`` (default): the formula with t0 = t + L0 elevation and
        Hss = elevation, unrounded. ``"sea-level-table"``: the formula with Hss = 0 and
        t0 = the reported temperature, rounded up to the next 10 ft, which reproduces AIM TBL
        7-3-1 cell for cell.

    Returns
    -------
    numeric
        Correction, >= 0; 0 when t0 >= 15 degC (no cold correction applies). [ft]

    Raises
    ------
    DomainError
        If an input is outside its range or the method is unknown.

    Notes
    -----
    Correction = H (15 - t0) / (273 + t0 - 0.5 L0 (H + Hss)) [1]_. The AIM allows segment
    corrections to be rounded to the nearest 100 ft or up, and the MDA/DA correction to be used
    as is or rounded up, never down [2]_; this function does not do that rounding. Heights above
    the table's 5,000 ft column are computed by the formula (the AIM permits using the 5,000 ft
    column instead, which gives less).

    References
    ----------
    .. [1] ICAO Doc 8168, Vol I, Part III, Section 1, Chapter 4, 4.3.
    .. [2] FAA AIM 7-3-1, TBL 7-3-1.
    """
    if method not in METHODS:
        raise DomainError(f"method = {method!r}: expected one of {', '.join(METHODS)}")
    h = _checked("height_above_airport_ft", height_above_airport_ft, *HEIGHT_RANGE_FT, "ft")
    t = _checked("airport_oat_c", airport_oat_c, *OAT_RANGE_C, "degC")
    elev = _checked("airport_elevation_ft", airport_elevation_ft, *ELEVATION_RANGE_FT, "ft")
    if method == "sea-level-table":
        t0 = t                                                         # [2] table: aerodrome at sea level
        raw = _formula_ft(h, t0, np.zeros_like(elev))
        corr = np.ceil(np.maximum(raw, 0.0) / TABLE_ROUNDING_FT - _ROUND_SLACK_FT) * TABLE_ROUNDING_FT
    else:
        t0 = t + L0_C_PER_FT * elev                                    # [1] eq. t0 = t_ad + L0 h_ad
        corr = _formula_ft(h, t0, elev)
    corr = np.where(t0 >= STANDARD_SEA_LEVEL_C, 0.0, np.maximum(corr, 0.0))
    return angles.as_float(corr)


@dataclass(frozen=True, slots=True, kw_only=True)
class ColdTemperatureCorrection:
    """A cold-temperature correction and how it was made.

    Attributes
    ----------
    height_above_airport_ft : float
        Height corrected. [ft]
    airport_oat_c : float
        Reported aerodrome temperature. [degC]
    airport_elevation_ft : float
        Aerodrome elevation. [ft]
    method : {"airport-elevation", "sea-level-table"}
        Method used.
    sea_level_temperature_c : float
        t0 the formula used (the reported temperature for the table method). [degC]
    applicable : bool
        False when t0 >= 15 degC (no cold correction; `correction_ft` is 0).
    correction_ft : float
        Correction to add, >= 0. [ft]
    """

    height_above_airport_ft: float
    airport_oat_c: float
    airport_elevation_ft: float
    method: str
    sea_level_temperature_c: float
    applicable: bool
    correction_ft: float

    def __post_init__(self) -> None:
        if self.method not in METHODS:
            raise DomainError(f"method = {self.method!r}: expected one of {', '.join(METHODS)}")
        if not (math.isfinite(self.correction_ft) and self.correction_ft >= 0.0):
            raise DomainError(f"correction_ft = {self.correction_ft} must be finite and >= 0")
        if not self.applicable and self.correction_ft != 0.0:
            raise DomainError("a correction that does not apply must be 0 ft")

    @property
    def corrected_height_above_airport_ft(self) -> float:
        """Height plus correction. [ft]"""
        return self.height_above_airport_ft + self.correction_ft


def cold_temperature_correction(height_above_airport_ft: float, *, airport_oat_c: float,
                                airport_elevation_ft: float = 0.0,
                                method: Method = "airport-elevation") -> ColdTemperatureCorrection:
    """Cold-temperature correction with its method and applicability (scalar inputs).

    Same parameters, errors and references as :func:`cold_temperature_correction_ft`.
    """
    corr = float(cold_temperature_correction_ft(height_above_airport_ft, airport_oat_c=airport_oat_c,
                                                airport_elevation_ft=airport_elevation_ft, method=method))
    if method == "sea-level-table":
        t0 = float(airport_oat_c)
    else:
        t0 = float(sea_level_temperature_c(airport_oat_c, airport_elevation_ft=airport_elevation_ft))
    return ColdTemperatureCorrection(
        height_above_airport_ft=float(height_above_airport_ft),
        airport_oat_c=float(airport_oat_c),
        airport_elevation_ft=float(airport_elevation_ft),
        method=method,
        sea_level_temperature_c=t0,
        applicable=t0 < STANDARD_SEA_LEVEL_C,
        correction_ft=corr,
    )
