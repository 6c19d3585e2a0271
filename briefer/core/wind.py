"""Wind: parsing a reported wind, components on a course, crab angle, ground speed, vectors.

Directions are where the wind blows FROM, in degrees, and must share one reference (true or
magnetic) with the course they are compared to; the caller applies the magnetic variation.

Sign conventions (also in each docstring):

* ``headwind_kt`` positive = headwind, negative = tailwind;
* ``crosswind_from_right_kt`` positive = from the right of the course, negative = from the left;
* crab (wind correction) angle positive = heading to the right of the course;
* wind vectors point where the air moves TO: east and north components.

Validity ranges (a `DomainError` is raised outside them, never a silent NaN): direction 0 to 360
deg; wind speed 0 to 250 kt; gust above the mean speed and at most 250 kt; TAS 0 < TAS <= 1000 kt;
course any finite angle (wrapped).

References
----------
.. [1] FAA, "Pilot's Handbook of Aeronautical Knowledge," FAA-H-8083-25, Chapter "Airplane
   Performance" (crosswind and headwind component chart) and Chapter "Navigation" (wind
   triangle: wind correction angle and ground speed).
.. [2] WMO, "Manual on Codes," WMO-No. 306, Vol I.1, FM 15 METAR, surface wind group
   dddffGfmfmKT / MPS, VRB and the dndndnVdxdxdx variation group; also FAA, "Federal Meteorological
   Handbook No. 1," Chapter 12 (calm reported as 00000KT).
"""

from __future__ import annotations

import math
import re
from briefer._dataclass import dataclass
from typing import Literal, NamedTuple

import numpy as np

from briefer.core.ufuncs import clip as _uclip

from briefer import units
from briefer.core import angles
from briefer.core._types import Numeric
from briefer.core.ranges import SCALAR_TYPES as _S
from briefer.core.ranges import checked as _checked  # the one range check of the core
from briefer.core.ranges import checked_float as _checked_f
from briefer.errors import DomainError

__all__ = [
    "WIND_SPEED_MAX_KT",
    "Wind",
    "WindComponents",
    "WindVector",
    "parse_wind",
    "wind_components_kt",
    "worst_wind_components_kt",
    "wind_triangle",
    "crab_angle_deg",
    "ground_speed_kt",
    "heading_for_course_deg",
    "wind_vector_kt",
]

WIND_SPEED_MAX_KT = 250.0
TAS_MAX_KT = 1000.0
Reference = Literal["true", "magnetic"]
_REFERENCES = ("true", "magnetic")


def _finite(name: str, value: Numeric) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(arr)):
        raise DomainError(f"{name} must be a finite number of degrees")
    return arr


def _direction(name: str, value: Numeric) -> np.ndarray:
    return _checked(name, value, 0.0, 360.0, "deg")


def _wind_speed(name: str, value: Numeric) -> np.ndarray:
    return _checked(name, value, 0.0, WIND_SPEED_MAX_KT, "kt")


@dataclass(frozen=True, slots=True, kw_only=True)
class Wind:
    """A reported surface wind.

    Attributes
    ----------
    from_deg : float or None
        Direction the wind blows from, 0 to 360; None when variable (VRB) or calm. [deg]
    speed_kt : float
        Mean speed, 0 to 250. [kt]
    gust_kt : float or None
        Gust (maximum) speed, greater than `speed_kt`; None when no gust is reported. [kt]
    reference : {"true", "magnetic"}
        Reference of the directions: METAR winds are true, tower/ATIS winds magnetic.
    variable_from_deg, variable_to_deg : float or None
        Extremes of a reported direction variation (METAR "240V300", clockwise from the first
        to the second), both or neither. [deg]
    """

    from_deg: float | None
    speed_kt: float
    gust_kt: float | None = None
    reference: Reference = "true"
    variable_from_deg: float | None = None
    variable_to_deg: float | None = None

    def __post_init__(self) -> None:
        if self.from_deg is not None:
            _direction("from_deg", self.from_deg)
        _wind_speed("speed_kt", self.speed_kt)
        if self.gust_kt is not None:
            _wind_speed("gust_kt", self.gust_kt)
            if not self.gust_kt > self.speed_kt:
                raise DomainError(f"gust_kt = {self.gust_kt:g} kt must be greater than "
                                  f"speed_kt = {self.speed_kt:g} kt")
        if self.reference not in _REFERENCES:
            raise DomainError(f"reference = {self.reference!r}: expected 'true' or 'magnetic'")
        if (self.variable_from_deg is None) != (self.variable_to_deg is None):
            raise DomainError("variable_from_deg and variable_to_deg must be given together")
        if self.variable_from_deg is not None:
            _direction("variable_from_deg", self.variable_from_deg)
            _direction("variable_to_deg", self.variable_to_deg)  # type: ignore[arg-type]
            lo, hi = self.variable_from_deg % 360.0, self.variable_to_deg % 360.0  # type: ignore[operator]
            if lo == hi:
                raise DomainError(f"the variable sector {self.variable_from_deg:03.0f}V"
                                  f"{self.variable_to_deg:03.0f} has no width (its two directions must differ)")
            # WMO-No. 306 FM 15: the sector dndndnVdxdxdx is given clockwise and contains the mean.
            if self.from_deg is not None and (self.from_deg - lo) % 360.0 > (hi - lo) % 360.0:
                raise DomainError(f"the mean direction {self.from_deg:03.0f} lies outside the variable "
                                  f"sector {self.variable_from_deg:03.0f}V{self.variable_to_deg:03.0f} "
                                  "(given clockwise, it must contain the mean)")

    @property
    def is_calm(self) -> bool:
        """True when the mean speed and the gust are zero/absent."""
        return self.speed_kt == 0.0 and self.gust_kt is None

    @property
    def is_variable(self) -> bool:
        """True when the direction is variable (VRB) or has a reported variation sector."""
        return (self.from_deg is None and not self.is_calm) or self.variable_from_deg is not None

    @property
    def max_speed_kt(self) -> float:
        """The gust when reported, else the mean speed. [kt]"""
        return self.speed_kt if self.gust_kt is None else self.gust_kt


_NUM = r"\d{1,3}(?:\.\d+)?"
_VAR = r"(?:\s+(?P<vf>\d{3})V(?P<vt>\d{3}))?"
_METAR_RE = re.compile(rf"^(?P<dir>\d{{3}}|VRB)(?P<spd>\d{{2,3}})(?:G(?P<gst>\d{{2,3}}))?(?P<unit>KT|MPS){_VAR}$")
_SLASH_RE = re.compile(
    rf"^(?P<dir>{_NUM}|VRB)\s*[/@]\s*(?P<spd>{_NUM})(?:\s*G\s*(?P<gst>{_NUM}))?\s*(?P<unit>KTS?|MPS)?{_VAR}$")
_FORMS = ("270/15, 270/15G25, 270@15, 27015KT, 27015G25KT, VRB05KT, VRB/5, 00000KT, calm; "
          "optionally followed by a variation group such as 240V300")


def parse_wind(text: str, *, reference: Reference = "true") -> Wind:
    """Read a wind written the way crews and reports write it.

    Parameters
    ----------
    text : str
        "270/15", "270/15G25", "270@15", "270/15KT", "27015KT", "27015G25KT", "27008MPS",
        "VRB05KT", "VRB/5", "00000KT", "0/0" or "calm" (any case), optionally followed by a
        METAR variation group such as "240V300".
    reference : {"true", "magnetic"}, optional
        Reference of the direction (METAR: true; tower/ATIS: magnetic).

    Returns
    -------
    Wind
        Calm (speed 0, no gust) has ``from_deg=None``; VRB has ``from_deg=None``. Speeds in MPS
        are converted to knots.

    Raises
    ------
    DomainError
        If the text matches none of the forms, or a value is out of range (direction 0 to 360,
        speed 0 to 250 kt, gust greater than the speed). The message quotes the text.

    References
    ----------
    .. [2] WMO-No. 306, FM 15 METAR, surface wind group; FMH-1 Chapter 12.
    """
    raw = text
    s = " ".join(str(text).strip().upper().split())
    if s == "CALM":
        return Wind(from_deg=None, speed_kt=0.0, reference=reference)
    m = _METAR_RE.match(s) or _SLASH_RE.match(s)
    if m is None:
        raise DomainError(f"cannot read the wind {raw!r}: expected a form such as {_FORMS}")
    factor = units.MPS_TO_KT if m.group("unit") == "MPS" else 1.0
    speed = float(m.group("spd")) * factor
    gust = None if m.group("gst") is None else float(m.group("gst")) * factor
    direction = None if m.group("dir") == "VRB" else float(m.group("dir"))
    vf = None if m.group("vf") is None else float(m.group("vf"))
    vt = None if m.group("vt") is None else float(m.group("vt"))
    if speed == 0.0 and gust is None:
        direction = None
    try:
        return Wind(from_deg=direction, speed_kt=speed, gust_kt=gust, reference=reference,
                    variable_from_deg=vf, variable_to_deg=vt)
    except DomainError as exc:
        raise DomainError(f"wind {raw!r}: {exc}") from None


@dataclass(frozen=True, slots=True, kw_only=True)
class WindComponents:
    """Wind components along and across a course.

    Attributes
    ----------
    headwind_kt : numeric
        Along the course; positive = headwind, negative = tailwind. [kt]
    crosswind_from_right_kt : numeric
        Across the course; positive = from the right, negative = from the left. [kt]
    """

    headwind_kt: Numeric
    crosswind_from_right_kt: Numeric


class WindVector(NamedTuple):
    """Motion of the air mass (where it blows TO): east and north components. [kt]"""

    east_kt: Numeric
    north_kt: Numeric


def wind_components_kt(wind_from_deg: Numeric, wind_speed_kt: Numeric, *, course_deg: Numeric) -> WindComponents:
    """Headwind and crosswind components of a wind on a course (or runway heading).

    Parameters
    ----------
    wind_from_deg : numeric
        Direction the wind blows from, 0 to 360, same reference as the course. [deg]
    wind_speed_kt : numeric
        Wind speed, 0 to 250. [kt]
    course_deg : numeric
        Course, runway heading or track, any finite angle. [deg]

    Returns
    -------
    WindComponents
        headwind_kt = W cos(wind - course) (negative = tailwind);
        crosswind_from_right_kt = W sin(wind - course) (negative = from the left). [kt]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Airplane Performance", crosswind component chart.
    """
    if type(wind_from_deg) in _S and type(wind_speed_kt) in _S and type(course_deg) in _S:
        # one number each: math, the array path's operations (tests/test_scalar_paths.py)
        wdir_f = _checked_f("wind_from_deg", wind_from_deg, 0.0, 360.0, "deg")
        ws_f = _checked_f("wind_speed_kt", wind_speed_kt, 0.0, WIND_SPEED_MAX_KT, "kt")
        if not math.isfinite(course_deg):
            raise DomainError("course_deg must be a finite number of degrees")
        rel_rad = math.radians(wdir_f - float(course_deg))
        return WindComponents(headwind_kt=ws_f * math.cos(rel_rad), crosswind_from_right_kt=ws_f * math.sin(rel_rad))
    wdir = _direction("wind_from_deg", wind_from_deg)
    ws = _wind_speed("wind_speed_kt", wind_speed_kt)
    crs = _finite("course_deg", course_deg)
    rel = wdir - crs
    return WindComponents(headwind_kt=angles.as_float(ws * angles.cosd(rel)),           # [1] eq. W cos(angle)
                          crosswind_from_right_kt=angles.as_float(ws * angles.sind(rel)))  # [1] eq. W sin(angle)


def _in_sector(direction: np.ndarray, start: float, end: float) -> np.ndarray:
    """Whether directions lie in the clockwise sector from start to end."""
    width = (end - start) % 360.0
    return ((direction - start) % 360.0) <= width + 1e-9


def worst_wind_components_kt(wind: Wind, *, course_deg: float) -> WindComponents:
    """The least favourable components of a reported wind on a course.

    Uses the gust when reported. Over the reported direction (a single direction, the variation
    sector, or every direction when VRB) it returns the smallest headwind (largest tailwind) and
    the crosswind of largest magnitude (with its side; from the right on a tie). Calm gives 0, 0.

    Parameters
    ----------
    wind : Wind
        The reported wind; its reference must match the course's.
    course_deg : float
        Course or runway heading. [deg]

    Returns
    -------
    WindComponents
        The two worst cases (they need not occur together). [kt]

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Airplane Performance", crosswind component chart.
    """
    crs = float(_finite("course_deg", course_deg))
    speed = wind.max_speed_kt
    if wind.is_calm or speed == 0.0:
        return WindComponents(headwind_kt=0.0, crosswind_from_right_kt=0.0)
    if wind.variable_from_deg is not None:
        start, end = wind.variable_from_deg, wind.variable_to_deg
    elif wind.from_deg is None:
        start, end = 0.0, 360.0 - 1e-9
    else:
        start = end = wind.from_deg
    # the extremes lie at the sector ends or where the wind is straight behind or abeam
    candidates = np.array([start, end, crs + 180.0, crs + 90.0, crs - 90.0]) % 360.0
    candidates = candidates[_in_sector(candidates, start % 360.0, end % 360.0)]
    comps = wind_components_kt(candidates, speed, course_deg=crs)
    head = np.asarray(comps.headwind_kt)
    cross = np.asarray(comps.crosswind_from_right_kt)
    worst_cross = cross[np.argmax(np.round(np.abs(cross), 9) + 1e-12 * (cross > 0))]
    return WindComponents(headwind_kt=float(np.min(head)), crosswind_from_right_kt=float(worst_cross))


def _tas(tas_kt: Numeric) -> np.ndarray:
    return _checked("tas_kt", tas_kt, 0.0, TAS_MAX_KT, "kt", lo_open=True)


def wind_triangle(track_rad: Numeric, tas: Numeric, w1: Numeric, w2: Numeric
                  ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The wind triangle: heading, ground speed and flyability of holding a track (array kernel).

    The one wind triangle of the tool: the plan solver, the legs and the course functions below
    all use it. Frame-agnostic: the track angle turns from axis 1 toward axis 2 (compass: axis 1
    north, axis 2 east; runway frame: along, right), and the wind vector (where the air moves
    TO) is given in the same axes and the same speed unit as `tas`.

    Parameters
    ----------
    track_rad : numeric
        Track to hold. [rad]
    tas : numeric
        True airspeed, > 0. [any speed unit]
    w1, w2 : numeric
        Wind vector components along axes 1 and 2. [same unit]

    Returns
    -------
    (heading_rad, ground_speed, ok)
        ``ok`` is False where the crosswind component reaches the TAS or the ground speed is
        not positive (values there are clipped, not meaningful).

    Notes
    -----
    With u the unit track and n the unit normal to its right, the air velocity
    V (cos psi, sin psi) plus the wind must have no n component [1]_:
    psi = track - asin(w_n / V), GS = V sqrt(1 - (w_n/V)^2) + w_u.

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Navigation", wind triangle.
    """
    su, cu = np.sin(track_rad), np.cos(track_rad)
    w_n = -w1 * su + w2 * cu
    w_u = w1 * cu + w2 * su
    q = w_n / tas
    ok = np.abs(q) < 1.0
    qc = _uclip(q, -1.0, 1.0)       # np.minimum(np.maximum(q, -1), 1): the same values, NaN and signed zeros kept
    psi = track_rad - np.arcsin(qc)
    gs = tas * np.sqrt(1.0 - qc * qc) + w_u
    return psi, gs, ok & (gs > 0.0)


def _course_triangle(tas_kt: Numeric, wind_from_deg: Numeric, wind_speed_kt: Numeric,
                     course_deg: Numeric) -> tuple[np.ndarray, np.ndarray]:
    """Crab angle [deg] and ground speed [kt] holding a compass course, by `wind_triangle`;
    raises DomainError where the course cannot be held."""
    tas = _tas(tas_kt)
    wv = wind_vector_kt(wind_from_deg, wind_speed_kt)
    course = np.asarray(course_deg, dtype=float)
    psi, gs, ok = wind_triangle(np.radians(course), tas, np.asarray(wv.north_kt), np.asarray(wv.east_kt))
    if not np.all(ok):
        xw = np.asarray(wind_components_kt(wind_from_deg, wind_speed_kt, course_deg=course_deg).crosswind_from_right_kt)
        if np.any(np.abs(xw) >= tas):
            raise DomainError("the crosswind is at least the true airspeed: the course cannot be held")
        raise DomainError("the headwind is at least the true airspeed along the course: "
                          "no progress over the ground")
    return np.degrees(psi) - course, gs


def crab_angle_deg(tas_kt: Numeric, *, wind_from_deg: Numeric, wind_speed_kt: Numeric,
                   course_deg: Numeric) -> Numeric:
    """Wind correction (crab) angle that holds a course.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    wind_from_deg : numeric
        Direction the wind blows from, 0 to 360. [deg]
    wind_speed_kt : numeric
        Wind speed, 0 to 250. [kt]
    course_deg : numeric
        Course to hold (same reference as the wind). [deg]

    Returns
    -------
    numeric
        asin(crosswind_from_right / TAS); positive = heading to the right of the course. [deg]

    Raises
    ------
    DomainError
        If an input is outside its range or the course cannot be held (crosswind at least the
        TAS, or no progress over the ground).

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Navigation", wind triangle (`wind_triangle`).
    """
    wca, _ = _course_triangle(tas_kt, wind_from_deg, wind_speed_kt, course_deg)
    return angles.as_float(wca)


def ground_speed_kt(tas_kt: Numeric, *, wind_from_deg: Numeric, wind_speed_kt: Numeric,
                    course_deg: Numeric) -> Numeric:
    """Ground speed along a course held with the crab angle.

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, 0 < TAS <= 1000. [kt]
    wind_from_deg : numeric
        Direction the wind blows from, 0 to 360. [deg]
    wind_speed_kt : numeric
        Wind speed, 0 to 250. [kt]
    course_deg : numeric
        Course held (same reference as the wind). [deg]

    Returns
    -------
    numeric
        GS = TAS cos(WCA) - headwind (`wind_triangle`). [kt]

    Raises
    ------
    DomainError
        If an input is outside its range, the crosswind is at least the TAS, or the headwind is
        at least the along-course air speed (ground speed <= 0).

    References
    ----------
    .. [1] FAA, PHAK, FAA-H-8083-25, "Navigation", wind triangle.
    """
    _, gs = _course_triangle(tas_kt, wind_from_deg, wind_speed_kt, course_deg)
    return angles.as_float(gs)


def heading_for_course_deg(tas_kt: Numeric, *, wind_from_deg: Numeric, wind_speed_kt: Numeric,
                           course_deg: Numeric) -> Numeric:
    """Heading that holds a course: course + crab angle, wrapped to [0, 360). [deg]

    See :func:`crab_angle_deg` for parameters and errors.
    """
    wca, _ = _course_triangle(tas_kt, wind_from_deg, wind_speed_kt, course_deg)
    return angles.as_float(angles.wrap_360(np.asarray(course_deg, dtype=float) + wca))


def wind_vector_kt(wind_from_deg: Numeric, wind_speed_kt: Numeric) -> WindVector:
    """Velocity of the air mass (where it moves TO), east and north components.

    Parameters
    ----------
    wind_from_deg : numeric
        Direction the wind blows from, 0 to 360. [deg]
    wind_speed_kt : numeric
        Wind speed, 0 to 250. [kt]

    Returns
    -------
    WindVector
        (east_kt, north_kt) = -W (sin(from), cos(from)); a wind from 270 moves the air east. [kt]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [2] WMO-No. 306 (wind direction is the direction the wind blows from).
    """
    wdir = _direction("wind_from_deg", wind_from_deg)
    ws = _wind_speed("wind_speed_kt", wind_speed_kt)
    return WindVector(east_kt=angles.as_float(-ws * angles.sind(wdir)),    # [2] eq. from-direction reversed
                      north_kt=angles.as_float(-ws * angles.cosd(wdir)))
