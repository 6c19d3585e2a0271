"""Magnetic variation from the World Magnetic Model, for airfields whose file gives none.

The variation (declination) is computed with the WMM2025 coefficients at the airfield reference
point, on the ground (height 0 above the WGS-84 ellipsoid), on a given date. The chart's own
variation (the variation of record) always wins where a file gives one; `compare` says when the
two differ by more than `DISAGREEMENT_DEG` (a typing error, or a very old chart).

The model is computed by the ``pygeomag`` package (a port of the model's reference C code, with
the WMM2025 coefficient file), imported only when a variation is needed. It was chosen over
``wmm-calculator`` (the model's own Python module): both reproduce the technical report's test
values to 0.005 deg, but ``pygeomag`` installs in 2 MB against 15 MB (with ``geomaglib``), imports
in about 15 ms against about 1 s and computes a point in about 0.4 ms against 20 ms.

References
----------
.. [1] A. Chulliat et al., "The US/UK World Magnetic Model for 2025-2030: Technical Report",
   NOAA National Centers for Environmental Information and British Geological Survey, 2025
   (the model, its 2025.0-2030.0 validity and the test values table; the tests reproduce it).
"""

from __future__ import annotations

import datetime as _dt
import functools
import math
from briefer._dataclass import dataclass

from briefer.errors import DomainError

MODEL_NAME = "WMM2025"
VALID_FROM_YEAR = 2025.0
VALID_TO_YEAR = 2030.0
DISAGREEMENT_DEG = 3.0
"""A file's variation further than this from the model's is flagged in the brief."""

SOURCE = ("World Magnetic Model WMM2025 (The US/UK World Magnetic Model for 2025-2030: Technical "
          "Report), at the airfield reference point, height 0")


@dataclass(frozen=True, slots=True, kw_only=True)
class ModelVariation:
    """The model's variation at a point on a date.

    Attributes:
        variation_deg: declination, east positive (true = magnetic + variation). [deg]
        lat_deg, lon_deg: the point. [deg]
        date: the date the model was evaluated for.
        model: the model's name ("WMM2025").
    """

    variation_deg: float
    lat_deg: float
    lon_deg: float
    date: _dt.date
    model: str = MODEL_NAME

    def text(self) -> str:
        """'9.2° W (WMM2025 at the reference point, 2026-12-03)'."""
        return f"{format_variation(self.variation_deg)} ({self.model} at the reference point, {self.date.isoformat()})"


def format_variation(variation_deg: float) -> str:
    """'9.2° W' for -9.2, '0.0°' for 0."""
    if round(variation_deg, 1) == 0.0:
        return "0.0°"
    return f"{abs(variation_deg):.1f}° {'E' if variation_deg > 0 else 'W'}"


def decimal_year(date: _dt.date) -> float:
    """The date as a decimal year (day of year counted from 0 on 1 January)."""
    start = _dt.date(date.year, 1, 1)
    days = (_dt.date(date.year + 1, 1, 1) - start).days
    return date.year + (date - start).days / days


@functools.lru_cache(maxsize=1)
def _geomag():
    from pygeomag import GeoMag  # imported only when a variation is needed

    return GeoMag(coefficients_file="wmm/WMM_2025.COF")


def declination_deg(lat_deg: float, lon_deg: float, year: float, *, height_km: float = 0.0) -> float:
    """The WMM2025 declination at a point and decimal year, east positive [deg] [1]_.

    Raises
    ------
    DomainError
        For a point off the globe or a year outside the model's 2025.0-2030.0 validity.
    """
    for name, value, lo, hi in (("latitude", lat_deg, -90.0, 90.0), ("longitude", lon_deg, -180.0, 180.0)):
        if not (math.isfinite(value) and lo <= value <= hi):
            raise DomainError(f"{name} must be between {lo:g} and {hi:g} degrees, got {value!r}")
    if not (math.isfinite(year) and VALID_FROM_YEAR <= year < VALID_TO_YEAR):
        raise DomainError(f"the World Magnetic Model {MODEL_NAME} is valid from {VALID_FROM_YEAR:.1f} to "
                          f"{VALID_TO_YEAR:.1f}; the date {year:.2f} is outside it (give the chart's variation)")
    return float(_geomag().calculate(glat=lat_deg, glon=lon_deg, alt=height_km, time=year).d)


@functools.lru_cache(maxsize=256)
def model_variation(lat_deg: float, lon_deg: float, date: _dt.date) -> ModelVariation:
    """The model's variation on the ground at a point on a date (cached per point and day)."""
    return ModelVariation(variation_deg=declination_deg(lat_deg, lon_deg, decimal_year(date)),
                          lat_deg=float(lat_deg), lon_deg=float(lon_deg), date=date)


def today_utc() -> _dt.date:
    """Today's date in UTC (the date a variation is computed for)."""
    return _dt.datetime.now(_dt.timezone.utc).date()


def difference_deg(a_deg: float, b_deg: float) -> float:
    """|a - b| as the smallest angle between two variations [deg]."""
    return abs((a_deg - b_deg + 180.0) % 360.0 - 180.0)
