"""Plane geometry of a circling area: local frame, runway axes, protected area and sectors.

Positions are metres east (x) and north (y) of the airfield reference point on the local tangent
plane of the WGS-84 ellipsoid. Points are numpy arrays whose last axis has length 2 (east, north);
a single point ``(e, n)`` gives scalar results, an ``(N, 2)`` array gives ``(N,)`` results.

References
----------
.. [1] National Imagery and Mapping Agency, "Department of Defense World Geodetic System 1984,"
   NIMA TR8350.2, 3rd ed., 2000: defining parameters a and 1/f (Table 3.1), and the standard
   geodetic-to-Cartesian formulas N = a / sqrt(1 - e^2 sin^2(lat)), X = N cos(lat) cos(lon),
   Y = N cos(lat) sin(lon), Z = N (1 - e^2) sin(lat) at height 0 (chapter 4; equation numbers
   not checked, from memory).
.. [2] B. Hofmann-Wellenhof, H. Lichtenegger, E. Wasle, "GNSS - Global Navigation Satellite
   Systems," Springer, 2008, chapter on reference systems: the local-level east-north-up
   rotation (section from memory). The tests check the frame against geographiclib.
.. [3] FAA, Aeronautical Information Manual, para. 5-4-20(b)(1): the circling area is formed by
   arcs of radius R about the end of each runway joined by tangent lines.
.. [4] ICAO Doc 8168 (PANS-OPS), 5th ed., 2006, Vol II, Part I, Section 4, Chapter 7, 7.2.1
   (arcs about each usable runway threshold joined by tangents) and Vol I, Part I, Section 4,
   Chapter 7, 7.3.4 (a sector may be excluded; circling is then prohibited in the whole sector).
.. [5] A. M. Andrew, "Another efficient algorithm for convex hulls in two dimensions,"
   Information Processing Letters 9(5), 1979, pp. 216-219 (monotone chain hull).
"""

from __future__ import annotations

import functools
import math
from briefer._dataclass import dataclass, field
from collections.abc import Callable, Mapping
from typing import Any, Literal, Union

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core._types import Numeric
from briefer.errors import DomainError
from briefer.core.angles import as_float, atand2, cosd, sind, wrap_180, wrap_360

from briefer.core.ufuncs import clip as _uclip

__all__ = [
    "WGS84_A_M",
    "WGS84_F",
    "MAX_FRAME_RANGE_M",
    "LocalFrame",
    "bearing_deg",
    "distance_m",
    "RunwayFrame",
    "runway_axes",
    "runway_end_xy",
    "circling_centres_m",
    "BearingSector",
    "SideSector",
    "Sector",
    "side_of_centreline",
    "ProtectedArea",
    "convex_hull",
    "distance_to_segments_m",
    "area_in_runway_axes",
    "true_from_magnetic_deg",
    "magnetic_from_true_deg",
]

ArrayLike = npt.ArrayLike if TYPE_CHECKING else object

WGS84_A_M = 6378137.0                 # [1] Table 3.1, semi-major axis
WGS84_F = 1.0 / 298.257223563         # [1] Table 3.1, flattening
_E2 = WGS84_F * (2.0 - WGS84_F)       # first eccentricity squared
_B_M = WGS84_A_M * (1.0 - WGS84_F)    # semi-minor axis

MAX_FRAME_RANGE_M = 100_000.0
"""Largest distance from the reference point the local frame accepts. The tangent plane shortens
a distance s from the origin by about s^2 / (2 R^2) (1.2e-4 at 100 km) and turns bearings by the
meridian convergence (see `bearing_deg`); a circling area is under 15 km across."""

_FEW_POINTS = 16                      # ProtectedArea.contains: up to this many points on floats
_COINCIDENT_M = 1e-6                  # two points closer than this are one point
_CONTAINS_TOL_M = 1e-6                # boundary points count as inside within this tolerance


def true_from_magnetic_deg(deg_mag: float, variation_deg: float) -> float:
    """A true direction from a magnetic one; variation east positive (true = magnetic + variation). [deg]"""
    if type(deg_mag) is float and type(variation_deg) is float:
        return (deg_mag + variation_deg) % 360.0          # wrap_360 of one float: the same value
    return float(wrap_360(deg_mag + variation_deg))


def magnetic_from_true_deg(deg_true: float, variation_deg: float) -> float:
    """A magnetic direction from a true one; variation east positive (magnetic = true - variation). [deg]"""
    if type(deg_true) is float and type(variation_deg) is float:
        return (deg_true - variation_deg) % 360.0         # wrap_360 of one float: the same value
    return float(wrap_360(deg_true - variation_deg))


# --------------------------------------------------------------------------------------------
# points helpers
# --------------------------------------------------------------------------------------------
def _points(points: ArrayLike, name: str = "points") -> npt.NDArray[np.float64]:
    arr = np.asarray(points, dtype=float)
    if arr.ndim == 0 or arr.shape[-1] != 2:
        raise DomainError(f"{name} must have a last axis of length 2 (east_m, north_m); got shape {arr.shape}")
    if not math.isfinite(np.add.reduce(arr, axis=None)) and not np.isfinite(arr).all():   # one pass when finite
        raise DomainError(f"{name} must be finite; got {arr[~np.isfinite(arr)].ravel()[:3]}")
    return arr


_F64 = np.dtype(np.float64)     # the float arrays' own dtype: an identity test before the equality test


def _one_point(point: Any) -> tuple[float, float] | None:
    """One finite point given as a tuple of two floats or a float array of shape (2,), as two
    floats; None for anything else (the caller takes its general path)."""
    if type(point) is tuple:
        if len(point) == 2 and type(point[0]) is float and type(point[1]) is float:
            e, n = point
        else:
            return None
    elif type(point) is np.ndarray and point.shape == (2,) and (point.dtype is _F64 or point.dtype == np.float64):
        e, n = point.tolist()
    else:
        return None
    return (e, n) if math.isfinite(e) and math.isfinite(n) else None


def _point(point: ArrayLike, name: str) -> tuple[float, float]:
    one = _one_point(point)
    if one is not None:
        return one
    arr = _points(point, name)
    if arr.shape != (2,):
        raise DomainError(f"{name} must be one point (east_m, north_m); got shape {arr.shape}")
    return (float(arr[0]), float(arr[1]))


def linspace(start: float, stop: float, num: int) -> npt.NDArray[np.float64]:
    """numpy.linspace(start, stop, num) of two numbers (num >= 2), by its own steps (arange *
    step + start, the last point set to stop) without its argument handling: the same array."""
    step = (stop - start) / (num - 1)
    if step == 0.0 or not math.isfinite(step):
        return np.linspace(start, stop, num)
    y = np.arange(0.0, num) * step
    y += start
    y[-1] = stop
    return y


def _cross(o: npt.NDArray[np.float64], a: npt.NDArray[np.float64], b: npt.NDArray[np.float64]) -> Numeric:
    return (a[..., 0] - o[..., 0]) * (b[..., 1] - o[..., 1]) - (a[..., 1] - o[..., 1]) * (b[..., 0] - o[..., 0])


# --------------------------------------------------------------------------------------------
# local frame
# --------------------------------------------------------------------------------------------
def _ecef_m(lat_deg: Numeric, lon_deg: Numeric) -> tuple[Numeric, Numeric, Numeric]:
    """Earth-centred coordinates of a point on the ellipsoid (height 0)."""
    s, c = sind(lat_deg), cosd(lat_deg)
    n_m = WGS84_A_M / np.sqrt(1.0 - _E2 * s * s)            # [1] prime-vertical radius N
    return n_m * c * cosd(lon_deg), n_m * c * sind(lon_deg), n_m * (1.0 - _E2) * s   # [1] X, Y, Z


@functools.lru_cache(maxsize=64)
def _frame_axes(lat0_deg: float, lon0_deg: float, *_signs: float) -> tuple[npt.NDArray[np.float64], ...]:
    """Origin (ECEF) and east/north/up unit vectors of a local frame, computed once per reference
    point (read-only arrays)."""
    out = LocalFrame._axes_uncached(LocalFrame(lat0_deg=lat0_deg, lon0_deg=lon0_deg))
    for a in out:
        a.flags.writeable = False
    return out


@dataclass(frozen=True, slots=True, kw_only=True)
class LocalFrame:
    """East/north metres on the tangent plane of the WGS-84 ellipsoid at a reference point.

    Parameters
    ----------
    lat0_deg : float
        Geodetic latitude of the reference point, -90..90. [deg]
    lon0_deg : float
        Longitude of the reference point (any value; wrapped). [deg]

    Notes
    -----
    `to_local` takes the point on the ellipsoid (height 0) to earth-centred coordinates [1]_,
    subtracts the reference point and keeps the east and north components of the local
    east-north-up frame [2]_ (an orthographic projection onto the tangent plane). `to_geodetic`
    is its exact inverse: the point on the ellipsoid straight below (along the local vertical) the
    plane point, found from a quadratic, then tan(lat) = z / ((1 - e^2) p) for a point on the
    ellipsoid.

    Accuracy: a distance s measured from the reference point is shortened by about
    s^2 / (2 R^2), 2e-6 at 10 km; distances between two points within 10 km of the reference
    agree with the geodesic to better than 1e-4 relative, far inside the 0.1 % the area needs.
    Heights are ignored (the area is drawn on the ellipsoid). Valid within
    `MAX_FRAME_RANGE_M` of the reference point; farther points raise `DomainError`.

    References
    ----------
    .. [1] NIMA TR8350.2, 3rd ed., 2000 (module references).
    .. [2] Hofmann-Wellenhof et al., "GNSS", Springer, 2008 (module references).
    """

    lat0_deg: float
    lon0_deg: float

    def __post_init__(self) -> None:
        if not (math.isfinite(self.lat0_deg) and -90.0 <= self.lat0_deg <= 90.0):
            raise DomainError(f"lat0_deg must be within -90..90; got {self.lat0_deg}")
        if not math.isfinite(self.lon0_deg):
            raise DomainError(f"lon0_deg must be finite; got {self.lon0_deg}")

    def _axes(self) -> tuple[npt.NDArray[np.float64], ...]:
        lat0, lon0 = self.lat0_deg, self.lon0_deg         # the signs keep -0.0 apart from 0.0 in the cache
        return _frame_axes(lat0, lon0, math.copysign(1.0, lat0), math.copysign(1.0, lon0))

    def _axes_uncached(self) -> tuple[npt.NDArray[np.float64], ...]:
        sp, cp = float(sind(self.lat0_deg)), float(cosd(self.lat0_deg))
        sl, cl = float(sind(self.lon0_deg)), float(cosd(self.lon0_deg))
        east = np.array([-sl, cl, 0.0])                      # [2] ENU rotation, row 1
        north = np.array([-sp * cl, -sp * sl, cp])           # [2] row 2
        up = np.array([cp * cl, cp * sl, sp])                # [2] row 3
        origin = np.array([float(v) for v in _ecef_m(self.lat0_deg, self.lon0_deg)])
        return origin, east, north, up

    def to_local(self, lat_deg: Numeric, lon_deg: Numeric) -> tuple[Numeric, Numeric]:
        """East and north of a geodetic position.

        Parameters
        ----------
        lat_deg : numeric
            Geodetic latitude, -90..90. [deg]
        lon_deg : numeric
            Longitude. [deg]

        Returns
        -------
        east_m, north_m : numeric
            Position on the tangent plane. [m]

        Raises
        ------
        DomainError
            If any latitude is outside -90..90 or any point lies farther than
            `MAX_FRAME_RANGE_M` from the reference point.
        """
        lat = np.asarray(lat_deg, dtype=float)
        lon = np.asarray(lon_deg, dtype=float)
        one = lat.ndim == 0 and lon.ndim == 0           # one point: plain float checks, no broadcast
        if one:
            if not (math.isfinite(lat) and math.isfinite(lon)):
                raise DomainError("lat_deg and lon_deg must be finite")
            if abs(float(lat)) > 90.0:
                raise DomainError(f"lat_deg must be within -90..90; got {lat[np.abs(lat) > 90.0].ravel()[:3]}")
        else:
            if not (np.isfinite(lat).all() and np.isfinite(lon).all()):
                raise DomainError("lat_deg and lon_deg must be finite")
            if (np.abs(lat) > 90.0).any():
                raise DomainError(f"lat_deg must be within -90..90; got {lat[np.abs(lat) > 90.0].ravel()[:3]}")
        origin, east, north, up = self._axes()
        x, y, z = _ecef_m(lat, lon)
        if one:
            d = np.array([x, y, z], dtype=float) - origin
        else:
            d = np.stack(np.broadcast_arrays(x, y, z), axis=-1) - origin
        e_m, n_m, u_m = d @ east, d @ north, d @ up
        reach = np.maximum(np.hypot(e_m, n_m), -u_m)
        if (reach > MAX_FRAME_RANGE_M).any():
            raise DomainError(f"position is {float(np.max(reach)):.0f} m from the reference point; "
                              f"the local frame is valid within {MAX_FRAME_RANGE_M:.0f} m")
        return as_float(e_m), as_float(n_m)

    def to_geodetic(self, east_m: Numeric, north_m: Numeric) -> tuple[Numeric, Numeric]:
        """Geodetic latitude and longitude of a point of the tangent plane (inverse of `to_local`).

        Parameters
        ----------
        east_m, north_m : numeric
            Position on the tangent plane, within `MAX_FRAME_RANGE_M` of the origin. [m]

        Returns
        -------
        lat_deg, lon_deg : numeric
            Geodetic latitude and longitude (-180..180) on the ellipsoid. [deg]

        Raises
        ------
        DomainError
            If any point is farther than `MAX_FRAME_RANGE_M` from the origin.
        """
        e_m, n_m = np.broadcast_arrays(np.asarray(east_m, dtype=float), np.asarray(north_m, dtype=float))
        if not (np.all(np.isfinite(e_m)) and np.all(np.isfinite(n_m))):
            raise DomainError("east_m and north_m must be finite")
        if np.any(np.hypot(e_m, n_m) > MAX_FRAME_RANGE_M):
            raise DomainError(f"point is {float(np.max(np.hypot(e_m, n_m))):.0f} m from the origin; "
                              f"the local frame is valid within {MAX_FRAME_RANGE_M:.0f} m")
        origin, east, north, up = self._axes()
        q = origin + e_m[..., None] * east + n_m[..., None] * north
        w = np.array([1.0 / WGS84_A_M**2, 1.0 / WGS84_A_M**2, 1.0 / _B_M**2])
        # point q + u * up on the ellipsoid: a u^2 + b u + c = 0, root nearest u = 0
        a = float(np.sum(w * up * up))
        b = 2.0 * np.sum(w * q * up, axis=-1)
        c = np.sum(w * q * q, axis=-1) - 1.0
        u = -2.0 * c / (b + np.sqrt(b * b - 4.0 * a * c))   # stable form of the small root
        p = q + u[..., None] * up
        rho = np.hypot(p[..., 0], p[..., 1])
        lat = atand2(p[..., 2], (1.0 - _E2) * rho)           # [1] Z / rho = (1 - e^2) tan(lat) at height 0
        lon = atand2(p[..., 1], p[..., 0])
        return as_float(lat), as_float(lon)


    def true_bearing_deg(self, p_from: ArrayLike, p_to: ArrayLike) -> Numeric:
        """Bearing from one point to another corrected to true north at their midpoint.

        Parameters
        ----------
        p_from, p_to : array_like, shape (..., 2)
            Points of this frame (east, north). [m]

        Returns
        -------
        numeric
            Bearing clockwise from true north at the midpoint, [0, 360). [deg]

        Notes
        -----
        `bearing_deg` plus the convergence of the meridians at the midpoint,
        gamma = (lon_mid - lon0) * sin(lat0): the first-order angle between the local meridian at
        longitude lon0 + d_lon and the frame's north (derived here from the east-north-up axes,
        not taken from a publication; the tests check it against geodesic azimuths to 1e-3 deg
        for points within 15 km of the reference point).
        """
        a, b = np.broadcast_arrays(_points(p_from, "p_from"), _points(p_to, "p_to"))
        mid = (a + b) / 2.0
        _, lon_mid = self.to_geodetic(mid[..., 0], mid[..., 1])
        gamma = wrap_180(np.asarray(lon_mid) - self.lon0_deg) * sind(self.lat0_deg)
        return as_float(wrap_360(np.asarray(bearing_deg(a, b)) + gamma))

def bearing_deg(p_from: ArrayLike, p_to: ArrayLike) -> Numeric:
    """Bearing from one point to another in the local frame.

    Parameters
    ----------
    p_from, p_to : array_like, shape (..., 2)
        Points (east, north), broadcast against each other. [m]

    Returns
    -------
    numeric
        Bearing clockwise from the reference point's true north, [0, 360). [deg]

    Raises
    ------
    DomainError
        If any pair of points coincides (no bearing exists).

    Notes
    -----
    bearing = atan2(d_east, d_north). The frame's north is true north at the reference point; at
    a point d_east away the meridian is turned by the convergence, about
    d_east / (R cos(lat0)) * sin(lat0) radians: 0.05 deg at 5 km at latitude 45, 0.10 deg at
    5 km at latitude 65. Bearings of runways within a few km of the reference point are true to
    that amount; `LocalFrame.true_bearing_deg` removes it.
    """
    a, b = np.broadcast_arrays(_points(p_from, "p_from"), _points(p_to, "p_to"))
    d = b - a
    if np.any(np.hypot(d[..., 0], d[..., 1]) < _COINCIDENT_M):
        raise DomainError("bearing between coincident points is undefined")
    return as_float(wrap_360(atand2(d[..., 0], d[..., 1])))


def distance_m(p_from: ArrayLike, p_to: ArrayLike) -> Numeric:
    """Straight-line distance between points of the local frame.

    Parameters
    ----------
    p_from, p_to : array_like, shape (..., 2)
        Points (east, north), broadcast against each other. [m]

    Returns
    -------
    numeric
        Distance. [m]
    """
    d = _points(p_to, "p_to") - _points(p_from, "p_from")
    return as_float(np.hypot(d[..., 0], d[..., 1]))


# --------------------------------------------------------------------------------------------
# runway frame
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class RunwayFrame:
    """Axes of a landing runway: along the landing direction from the threshold, and to the right.

    Attributes
    ----------
    threshold_xy_m : tuple of float
        Landing threshold (east, north). [m]
    opposite_threshold_xy_m : tuple of float
        The other end of the runway. [m]
    landing_course_deg_true : float
        Course from the threshold toward the opposite end, [0, 360). [deg]
    along_unit : tuple of float
        Unit vector (east, north) in the landing direction.
    right_unit : tuple of float
        Unit vector (east, north) to the right of the landing direction.
    length_m : float
        Distance between the thresholds. [m]
    """

    threshold_xy_m: tuple[float, float]
    opposite_threshold_xy_m: tuple[float, float]
    landing_course_deg_true: float
    along_unit: tuple[float, float]
    right_unit: tuple[float, float]
    length_m: float

    def __post_init__(self) -> None:
        if not self.length_m > 0.0:
            raise DomainError(f"runway length must be positive; got {self.length_m} m")
        ue, un = self.along_unit
        re_, rn = self.right_unit
        if abs(math.hypot(ue, un) - 1.0) > 1e-9 or abs(re_ - un) > 1e-9 or abs(rn + ue) > 1e-9:
            raise DomainError("along_unit must be a unit vector and right_unit = (along_n, -along_e)")

    def to_runway_coords(self, points: ArrayLike) -> tuple[Numeric, Numeric]:
        """Runway coordinates of points of the local frame.

        Parameters
        ----------
        points : array_like, shape (..., 2)
            Points (east, north). [m]

        Returns
        -------
        along_m : numeric
            Distance past the threshold in the landing direction (negative = before it, on the
            approach side). [m]
        right_m : numeric
            Distance to the right of the extended centreline seen in the landing direction
            (negative = left). [m]
        """
        one = _one_point(points)
        if one is not None:          # one point: the same two products and sum as the matmul of (2,) by (2,)
            de, dn = one[0] - float(self.threshold_xy_m[0]), one[1] - float(self.threshold_xy_m[1])
            (ue, un), (re_, rn) = self.along_unit, self.right_unit
            return de * float(ue) + dn * float(un), de * float(re_) + dn * float(rn)
        d = _points(points) - np.asarray(self.threshold_xy_m)
        along = d @ np.asarray(self.along_unit)
        right = d @ np.asarray(self.right_unit)
        return as_float(along), as_float(right)

    def from_runway_coords(self, along_m: Numeric, right_m: Numeric) -> npt.NDArray[np.float64]:
        """Points of the local frame from runway coordinates (inverse of `to_runway_coords`).

        Parameters
        ----------
        along_m, right_m : numeric
            As returned by `to_runway_coords`. [m]

        Returns
        -------
        ndarray, shape (..., 2)
            Points (east, north). [m]
        """
        if (type(along_m) is np.ndarray and type(right_m) is np.ndarray and along_m.dtype == np.float64
                and right_m.dtype == np.float64 and along_m.shape == right_m.shape):
            if along_m.ndim == 1:              # a track: each column as one pass (the (N, 1) x (2,)
                return _track_from_runway(self, along_m, right_m)   # broadcasts loop row by row)
            a, r = along_m, right_m            # already float arrays of one shape: nothing to broadcast
        else:
            a, r = np.broadcast_arrays(np.asarray(along_m, dtype=float), np.asarray(right_m, dtype=float))
        return (np.asarray(self.threshold_xy_m) + a[..., None] * np.asarray(self.along_unit)
                + r[..., None] * np.asarray(self.right_unit))


def _track_from_runway(rf: RunwayFrame, a: npt.NDArray[np.float64],
                       r: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    """`RunwayFrame.from_runway_coords` of two 1-d float arrays: each column as
    (threshold + along * along_unit) + right * right_unit, the broadcast's operations in its order."""
    out = np.empty((a.shape[0], 2))
    tmp = np.empty_like(a)
    for k in (0, 1):
        col = out[:, k]
        np.multiply(a, float(rf.along_unit[k]), out=col)
        np.add(float(rf.threshold_xy_m[k]), col, out=col)
        np.multiply(r, float(rf.right_unit[k]), out=tmp)
        np.add(col, tmp, out=col)
    return out


def runway_axes(threshold_xy: ArrayLike, opposite_threshold_xy: ArrayLike) -> RunwayFrame:
    """Landing course, unit axes and length of a runway from its two thresholds.

    Parameters
    ----------
    threshold_xy : array_like, shape (2,)
        Landing threshold (east, north). [m]
    opposite_threshold_xy : array_like, shape (2,)
        The far end of the runway. [m]

    Returns
    -------
    RunwayFrame

    Raises
    ------
    DomainError
        If the two thresholds coincide.
    """
    t = _point(threshold_xy, "threshold_xy")
    o = _point(opposite_threshold_xy, "opposite_threshold_xy")
    de, dn = o[0] - t[0], o[1] - t[1]
    length = math.hypot(de, dn)
    if length < _COINCIDENT_M:
        raise DomainError(f"runway thresholds coincide at {t}")
    ue, un = de / length, dn / length
    return RunwayFrame(threshold_xy_m=t, opposite_threshold_xy_m=o,   # wrap_360(atand2(de, dn)) with math: the same
                       landing_course_deg_true=math.degrees(math.atan2(de, dn)) % 360.0,
                       along_unit=(ue, un), right_unit=(un, -ue), length_m=length)


def runway_end_xy(threshold_xy: ArrayLike, opposite_threshold_xy: ArrayLike,
                  displaced_m: float) -> npt.NDArray[np.float64]:
    """The runway end behind a displaced landing threshold.

    The end lies on the centreline, `displaced_m` behind the threshold as seen on final, i.e.
    away from the opposite threshold: ``T + d (T - O) / |T - O|``.

    Parameters
    ----------
    threshold_xy, opposite_threshold_xy : array_like, shape (2,)
        The landing threshold and the opposite one (east, north). [m]
    displaced_m : float
        Distance from the runway end to the landing threshold (>= 0). [m]

    Returns
    -------
    ndarray, shape (2,)
        The runway end (east, north); the threshold itself when `displaced_m` is 0. [m]
    """
    t = _point(threshold_xy, "threshold_xy")
    if displaced_m == 0.0:
        return np.array(t, dtype=float)
    if not (math.isfinite(displaced_m) and displaced_m > 0.0):
        raise DomainError(f"displaced_m must be a non-negative number of metres, got {displaced_m!r}")
    o = _point(opposite_threshold_xy, "opposite_threshold_xy")
    de, dn = t[0] - o[0], t[1] - o[1]
    length = math.hypot(de, dn)
    if length < _COINCIDENT_M:
        raise DomainError(f"runway thresholds coincide at {t}")
    return np.array((t[0] + displaced_m * de / length, t[1] + displaced_m * dn / length), dtype=float)


def circling_centres_m(airfield: Any, thresholds_xy: Mapping[str, ArrayLike], *,
                       on_runway_ends: bool) -> npt.NDArray[np.float64]:
    """The centres of the circling-area arcs, one per runway threshold, in the order of
    ``airfield.thresholds``.

    With `on_runway_ends` (FAA [3]_), a displaced threshold's centre is its runway end (see
    `runway_end_xy`); otherwise (ICAO [4]_), and wherever no threshold is displaced, the centres
    are the landing thresholds themselves. Which one a criteria set uses is
    `briefer.core.criteria.circling_arc_centre`.

    Parameters
    ----------
    airfield : Airfield
        Its runways' thresholds (``designator``, ``displaced_m``).
    thresholds_xy : mapping
        Landing threshold positions (east, north) by designator. [m]
    on_runway_ends : bool
        Centre the arcs on the runway ends rather than the landing thresholds.

    Returns
    -------
    ndarray, shape (N, 2)
        [m]
    """
    return np.array(_circling_centre_pairs(airfield, thresholds_xy, on_runway_ends=on_runway_ends), dtype=float)


def _circling_centre_pairs(airfield: Any, thresholds_xy: Mapping[str, ArrayLike], *,
                           on_runway_ends: bool) -> tuple[tuple[float, float], ...]:
    """`circling_centres_m` as (east, north) float pairs (the rows of its array)."""
    centres = []
    for rw in airfield.runways:
        for thr, opp in ((rw.threshold_a, rw.threshold_b), (rw.threshold_b, rw.threshold_a)):
            p = np.asarray(thresholds_xy[thr.designator], dtype=float)
            if on_runway_ends and thr.displaced_m > 0.0:
                p = runway_end_xy(p, thresholds_xy[opp.designator], thr.displaced_m)
            e, n = p.tolist()
            centres.append((e, n))
    return tuple(centres)


# --------------------------------------------------------------------------------------------
# distances to segments and hulls
# --------------------------------------------------------------------------------------------
def distance_to_segments_m(points: ArrayLike, starts: ArrayLike, ends: ArrayLike) -> npt.NDArray[np.float64]:
    """Distance from each point to the nearest of several segments.

    Parameters
    ----------
    points : array_like, shape (..., 2)
        Points. [m]
    starts, ends : array_like, shape (K, 2)
        Segment end points; a segment whose ends coincide is a point. [m]

    Returns
    -------
    ndarray, shape (...)
        Distance to the nearest segment. [m]
    """
    return _segments_distance_m(_points(points), np.asarray(starts, dtype=float), ends)


def _segments_distance_m(q: npt.NDArray[np.float64], a: npt.NDArray[np.float64],
                         ends: ArrayLike) -> npt.NDArray[np.float64]:
    """`distance_to_segments_m` of checked points `q` from the float segment starts `a`."""
    if a.shape[0] == 1:                                         # one segment: no (..., K, 2) temporaries
        return _segment_distance_m(q, a[0].tolist(), np.asarray(ends, dtype=float)[0].tolist())
    p = q[..., None, :]                                        # (..., 1, 2)
    d = np.asarray(ends, dtype=float) - a                      # (K, 2)
    dd = np.sum(d * d, axis=-1)
    t = np.sum((p - a) * d, axis=-1) / np.where(dd > 0.0, dd, 1.0)
    t = np.minimum(np.maximum(np.where(dd > 0.0, t, 0.0), 0.0), 1.0)    # clip
    closest = a + t[..., None] * d
    return np.min(np.hypot(p[..., 0] - closest[..., 0], p[..., 1] - closest[..., 1]), axis=-1)


def _segment_distance_m(q: npt.NDArray[np.float64], a: tuple[float, float] | list[float],
                        b: tuple[float, float] | list[float]) -> npt.NDArray[np.float64]:
    """`_segments_distance_m` of one segment a -> b given as floats (the ends' arithmetic on
    floats: the same IEEE operations as on numpy scalars)."""
    (ax, ay), (bx, by) = a, b
    sx, sy = bx - ax, by - ay
    ss = sx * sx + sy * sy
    rx, ry = q[..., 0] - ax, q[..., 1] - ay
    if ss > 0.0:
        t = np.minimum(np.maximum((rx * sx + ry * sy) / ss, 0.0), 1.0)   # clip: the sign of a 0 never reaches the distance
        rx, ry = rx - t * sx, ry - t * sy
    return np.sqrt(rx * rx + ry * ry)


def convex_hull(points: ArrayLike) -> npt.NDArray[np.float64]:
    """Convex hull of a few points, counter-clockwise, without repeated or collinear vertices.

    Parameters
    ----------
    points : array_like, shape (N, 2)
        Points, N >= 1. [m]

    Returns
    -------
    ndarray, shape (H, 2)
        Hull vertices counter-clockwise (H = 1 for coincident points, H = 2 for collinear
        points: the two extreme points). [m]

    Notes
    -----
    Andrew's monotone chain [1]_, then any vertex within 1 micrometre of the segment joining its
    neighbours is dropped, so nearly collinear thresholds give a segment.

    References
    ----------
    .. [1] A. M. Andrew, Information Processing Letters 9(5), 1979, pp. 216-219.
    """
    return np.array(_hull_vertices(_points(points)))


def _hull_vertices(pts: npt.NDArray[np.float64]) -> list[tuple[float, float]]:
    """`convex_hull` of checked points, as a list of (east, north) floats."""
    if pts.ndim != 2 or pts.shape[0] < 1:
        raise DomainError(f"points must be an (N, 2) array with N >= 1; got shape {pts.shape}")
    return _hull_of(list(map(tuple, pts.tolist())))


def _hull_of(points: list[tuple[float, float]]) -> list[tuple[float, float]]:
    """`_hull_vertices` of checked points given as (east, north) float tuples, N >= 1."""
    uniq: list[tuple[float, float]] = []
    for e, n in sorted(points):
        if all(math.hypot(e - u[0], n - u[1]) >= _COINCIDENT_M for u in uniq):
            uniq.append((e, n))
    if len(uniq) <= 2:        # one point, or a segment: the chains give the sorted points themselves
        return uniq

    def turn(o: tuple[float, float], a: tuple[float, float], b: tuple[float, float]) -> float:
        return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])

    def chain(seq: list[tuple[float, float]]) -> list[tuple[float, float]]:
        out: list[tuple[float, float]] = []
        for q in seq:
            while len(out) >= 2 and turn(out[-2], out[-1], q) <= 0.0:    # [1] keep strict left turns
                out.pop()
            out.append(q)
        return out

    hull = chain(uniq)[:-1] + chain(uniq[::-1])[:-1]
    # drop vertices lying within 1 micrometre of the segment joining their neighbours, so that
    # nearly collinear thresholds give a segment (a segment, not the line: a far vertex of a thin
    # triangle is close to the line through the other two but not to the segment)
    changed = True
    while changed and len(hull) >= 3:
        changed = False
        for i in range(len(hull)):
            u, v, w = hull[i - 1], hull[i], hull[(i + 1) % len(hull)]
            gap = float(distance_to_segments_m(np.array(v), np.array([u]), np.array([w])))
            if gap < _COINCIDENT_M:
                del hull[i]
                changed = True
                break
    return hull


# --------------------------------------------------------------------------------------------
# not-authorised sectors
# --------------------------------------------------------------------------------------------
def _ray_distance_m(p: npt.NDArray[np.float64], apex: npt.NDArray[np.float64],
                    direction: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    d = p - apex
    t = np.maximum(d @ direction, 0.0)
    return np.hypot(d[..., 0] - t * direction[0], d[..., 1] - t * direction[1])


@dataclass(frozen=True, slots=True, kw_only=True)
class BearingSector:
    """A sector where circling is not authorised: bearings from a centre, to infinity.

    Attributes
    ----------
    centre_m : tuple of float
        Apex of the sector (usually a runway threshold), (east, north). [m]
    from_deg_true, to_deg_true : float
        The sector runs clockwise from `from_deg_true` to `to_deg_true` (bearings from the
        centre); e.g. 300 -> 060 is the 120 deg wedge across north. Equal bearings are refused.
        [deg]

    Notes
    -----
    ICAO Doc 8168 Vol I, Part I, Section 4, Chapter 7, 7.3.4 [4]_ (module references): circling
    is prohibited in the whole sector. The sector is closed (its edges belong to it).
    """

    centre_m: tuple[float, float]
    from_deg_true: float
    to_deg_true: float

    def __post_init__(self) -> None:
        object.__setattr__(self, "centre_m", _point(self.centre_m, "centre_m"))
        for name in ("from_deg_true", "to_deg_true"):
            if not math.isfinite(getattr(self, name)):
                raise DomainError(f"{name} must be finite; got {getattr(self, name)}")
        if self.span_deg < 1e-9:
            raise DomainError(f"sector from {self.from_deg_true} to {self.to_deg_true} deg true is empty")

    @property
    def span_deg(self) -> float:
        """Angular width of the sector measured clockwise, (0, 360). [deg]"""
        return float(wrap_360(self.to_deg_true - self.from_deg_true))

    def _directions(self) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
        f, t = self.from_deg_true, self.to_deg_true
        return (np.array([float(sind(f)), float(cosd(f))]), np.array([float(sind(t)), float(cosd(t))]))

    def contains(self, points: ArrayLike) -> Union[bool, npt.NDArray[np.bool_]]:
        """Whether points lie in the sector (the apex and the edges included)."""
        inside = np.asarray(self.clearance_m(points)) <= _CONTAINS_TOL_M
        return bool(inside) if inside.ndim == 0 else inside

    def clearance_m(self, points: ArrayLike) -> Numeric:
        """Signed distance to the sector: positive outside (distance to it), negative inside.

        Inside, the value is minus the distance to the nearer edge ray; the apex and edges give 0.
        """
        p = _points(points)
        apex = np.asarray(self.centre_m)
        d_from, d_to = self._directions()
        dist = np.minimum(_ray_distance_m(p, apex, d_from), _ray_distance_m(p, apex, d_to))
        d = p - apex
        rel = wrap_360(atand2(d[..., 0], d[..., 1]) - self.from_deg_true)
        inside = rel < self.span_deg
        return as_float(np.where(inside, -dist, dist))

    def polygon(self, radius_m: float, *, n: int = 64) -> npt.NDArray[np.float64]:
        """Closed polygon for drawing: the sector clipped to a circle of `radius_m` about its apex.

        Returns
        -------
        ndarray, shape (M, 2)
            Apex, arc clockwise from `from_deg_true` to `to_deg_true`, apex again. [m]
        """
        if not (math.isfinite(radius_m) and radius_m > 0.0):
            raise DomainError(f"radius_m must be positive; got {radius_m}")
        k = max(2, int(math.ceil(n * self.span_deg / 360.0)) + 1)
        brg = self.from_deg_true + np.linspace(0.0, self.span_deg, k)
        apex = np.asarray(self.centre_m)
        arc = apex + radius_m * np.stack([sind(brg), cosd(brg)], axis=-1)
        return np.vstack([apex, arc, apex])


@dataclass(frozen=True, slots=True, kw_only=True)
class SideSector:
    """A sector where circling is not authorised: one side of a runway centreline (half-plane).

    Attributes
    ----------
    line_a_m, line_b_m : tuple of float
        Two points of the centreline (the runway thresholds), (east, north). [m]
    side : {"left", "right"}
        The excluded side, seen looking from `line_a_m` toward `line_b_m`.

    Notes
    -----
    The half-plane is bounded by the whole (extended) line through both points and is closed.
    Build one from a compass side name ("north of runway 09/27") with `side_of_centreline`.
    """

    line_a_m: tuple[float, float]
    line_b_m: tuple[float, float]
    side: Literal["left", "right"]

    def __post_init__(self) -> None:
        object.__setattr__(self, "line_a_m", _point(self.line_a_m, "line_a_m"))
        object.__setattr__(self, "line_b_m", _point(self.line_b_m, "line_b_m"))
        if self.side not in ("left", "right"):
            raise DomainError(f"side must be 'left' or 'right'; got {self.side!r}")
        if math.dist(self.line_a_m, self.line_b_m) < _COINCIDENT_M:
            raise DomainError(f"centreline points coincide at {self.line_a_m}")

    @property
    def outward_unit(self) -> tuple[float, float]:
        """Unit normal (east, north) pointing into the excluded side."""
        de, dn = self.line_b_m[0] - self.line_a_m[0], self.line_b_m[1] - self.line_a_m[1]
        length = math.hypot(de, dn)
        ue, un = de / length, dn / length
        return (-un, ue) if self.side == "left" else (un, -ue)

    def clearance_m(self, points: ArrayLike) -> Numeric:
        """Signed distance to the excluded half-plane: positive outside, negative inside."""
        return as_float(self._clearance_m(_points(points)))

    def _clearance_m(self, p: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
        """`clearance_m` of points already checked (an (n, 2) stack, n >= 2: see track_margins_m)."""
        return -((p - np.asarray(self.line_a_m)) @ np.asarray(self.outward_unit))

    def contains(self, points: ArrayLike) -> Union[bool, npt.NDArray[np.bool_]]:
        """Whether points lie on the excluded side (the centreline itself included)."""
        inside = np.asarray(self.clearance_m(points)) <= _CONTAINS_TOL_M
        return bool(inside) if inside.ndim == 0 else inside

    def polygon(self, radius_m: float, *, about_m: ArrayLike | None = None,
                n: int = 64) -> npt.NDArray[np.float64]:
        """Closed polygon for drawing: the half-plane clipped to a circle.

        Parameters
        ----------
        radius_m : float
            Radius of the clipping circle. [m]
        about_m : array_like, shape (2,), optional
            Centre of the clipping circle; default the midpoint of the two centreline points. [m]
        n : int
            Points on a full circle.

        Returns
        -------
        ndarray, shape (M, 2)
            The circular segment on the excluded side (closed: last point = first), the whole
            circle if it lies inside the half-plane, or an empty (0, 2) array if it misses it. [m]
        """
        if not (math.isfinite(radius_m) and radius_m > 0.0):
            raise DomainError(f"radius_m must be positive; got {radius_m}")
        (ae, an), (be, bn) = self.line_a_m, self.line_b_m
        ce, cn = _point(about_m, "about_m") if about_m is not None else ((ae + be) / 2.0, (an + bn) / 2.0)
        nrm = self.outward_unit
        # how far the circle's centre is inside: -clearance_m(c), its (2,) @ (2,) product written out
        h = (ce - ae) * nrm[0] + (cn - an) * nrm[1]
        if h >= radius_m:
            brg = np.linspace(0.0, 360.0, max(n, 8) + 1)[:-1]
            circle = np.array((ce, cn)) + radius_m * np.stack([sind(brg), cosd(brg)], axis=-1)
            return np.vstack([circle, circle[:1]])
        if h <= -radius_m:
            return np.empty((0, 2))
        half = math.degrees(math.acos(-h / radius_m))   # half-angle of the arc on the excluded side
        centre_brg = math.degrees(math.atan2(nrm[0], nrm[1]))   # atand2 of two floats
        k = max(2, int(math.ceil(n * 2.0 * half / 360.0)) + 1)
        brg = np.radians(centre_brg + linspace(-half, half, k))   # sind's and cosd's radians, once
        arc = np.empty((k + 1, 2))
        arc[:k, 0] = ce + radius_m * np.sin(brg)      # c[0] + ...: the same float64 sum
        arc[:k, 1] = cn + radius_m * np.cos(brg)
        arc[k] = arc[0]
        return arc


Sector = Union[BearingSector, SideSector]

_COMPASS = {"north": (0.0, 1.0), "south": (0.0, -1.0), "east": (1.0, 0.0), "west": (-1.0, 0.0)}
_AMBIGUOUS_SIDE_DEG = 15.0


def side_of_centreline(threshold_xy: ArrayLike, opposite_threshold_xy: ArrayLike,
                       compass_side: str) -> SideSector:
    """The half-plane on a named compass side of a runway centreline.

    Parameters
    ----------
    threshold_xy, opposite_threshold_xy : array_like, shape (2,)
        The runway's two thresholds (east, north). [m]
    compass_side : {"north", "south", "east", "west"}
        The side named on the chart (case-insensitive).

    Returns
    -------
    SideSector
        With `side` resolved to "left" or "right" of threshold -> opposite threshold.

    Raises
    ------
    DomainError
        For an unknown name, or when the centreline runs within 15 deg of the named direction
        (e.g. "east of" a north-south runway is clear, "north of" it is not).
    """
    key = compass_side.strip().lower()
    if key not in _COMPASS:
        raise DomainError(f"compass side must be one of {sorted(_COMPASS)}; got {compass_side!r}")
    rw = runway_axes(threshold_xy, opposite_threshold_xy)
    ce, cn = _COMPASS[key]
    left = (-rw.along_unit[1], rw.along_unit[0])
    cos_left = left[0] * ce + left[1] * cn
    if abs(cos_left) < math.sin(math.radians(_AMBIGUOUS_SIDE_DEG)):
        raise DomainError(f"'{compass_side}' of a centreline on {rw.landing_course_deg_true:.0f} deg true is "
                          f"ambiguous (the line runs within {_AMBIGUOUS_SIDE_DEG:.0f} deg of {key})")
    return SideSector(line_a_m=rw.threshold_xy_m, line_b_m=rw.opposite_threshold_xy_m,
                      side="left" if cos_left > 0.0 else "right")


# --------------------------------------------------------------------------------------------
# protected area
# --------------------------------------------------------------------------------------------
def _bisector_depth_m(sec: BearingSector, track: npt.NDArray[np.float64],
                      edge_tolerance_m: float | None) -> npt.NDArray[np.float64]:
    """Smallest clearance of each polyline (..., N, 2) at its crossings of the sector's bisector
    line (east, north), counted as in `ProtectedArea.margin_m` (within the edge tolerance it does
    not count: +inf). [m]"""
    brg = math.radians(sec.from_deg_true + sec.span_deg / 2.0)
    ux, uy = math.sin(brg), math.cos(brg)
    cx, cy = sec.centre_m
    side = (track[..., 0] - cx) * uy - (track[..., 1] - cy) * ux        # signed distance to the bisector line
    a, b = side[..., :-1], side[..., 1:]
    cross = a * b < 0.0
    out = np.full(track.shape[:-2], np.inf)
    if not cross.any():
        return out
    idx = np.nonzero(cross)
    t = a[idx] / (a[idx] - b[idx])
    p0, p1 = track[..., :-1, :][idx], track[..., 1:, :][idx]
    c = _counted_clearance_m(sec.clearance_m(p0 + t[:, None] * (p1 - p0)), edge_tolerance_m)
    np.minimum.at(out, idx[:-1], c)
    return out


def _track_columns(tracks: ArrayLike) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64],
                                               npt.NDArray[np.float64]]:
    """Tracks (..., N, 2), N >= 1, checked as `_points` checks them, and their east and north
    coordinates as two contiguous arrays (made with one pass each, whatever the tracks' layout)."""
    t = np.asarray(tracks, dtype=float)
    if t.ndim < 2 or t.shape[-1] != 2 or t.shape[-2] < 1:
        t = _points(tracks, "track")                       # its errors first (last axis, finite)
        raise DomainError(f"track must be an (N, 2) array with N >= 1; got shape {t.shape}")
    e, n = t[..., 0].ravel(), t[..., 1].ravel()
    if not (math.isfinite(np.add.reduce(e)) and math.isfinite(np.add.reduce(n))):
        _points(t, "track")                                 # raises if any is not finite
    return t, e, n


def _axis_clearance_m(sec: Sector, e: npt.NDArray[np.float64], n: npt.NDArray[np.float64],
                      edge_tolerance_m: float | None) -> npt.NDArray[np.float64] | None:
    """A side sector's clearance of the points when its line runs along an axis (outward unit
    (+-1, +-0) or (+-0, +-1): the runway frame's centreline) and only clearances below minus a
    tolerance >= 0 count: -(d . u) is then the one coordinate difference d, negated or not, to
    the last bit (the other product is a zero, which leaves a nonzero sum as it is); a zero
    clearance may differ in sign, which does not count. None otherwise."""
    if not isinstance(sec, SideSector) or edge_tolerance_m is None or not edge_tolerance_m >= 0.0:
        return None
    ux, uy = sec.outward_unit
    (ax, ay) = sec.line_a_m
    if uy == 0.0 and abs(ux) == 1.0:
        d = e - ax if ax != 0.0 else e
        return -d if ux > 0.0 else d
    if ux == 0.0 and abs(uy) == 1.0:
        d = n - ay if ay != 0.0 else n
        return -d if uy > 0.0 else d
    return None


def _side_clearances_beside_m(sec: SideSector, pts: list[list[float]], tol_m: float) -> list[float] | None:
    """A side sector's clearance of a few points (east, north floats) for the test clearance >=
    -tol_m alone: -((p - a) . u) on floats, None when a point lies so near the test's edge that
    the rounding could decide it (the caller then takes `SideSector._clearance_m`).

    `_clearance_m`'s product of (2,) rows may fuse a multiply and an add (BLAS), so its last bit
    can differ from the floats' two products and sum: by at most a few units in the last place
    of the products, far inside the band of 1e-9 of their size (+ 1e-9 m) kept clear of the
    edge here, so the test gives the same answer. [m]"""
    (ae, an), (ue, un) = sec.line_a_m, sec.outward_unit
    out = []
    for e, n in pts:
        pe, pn = (e - ae) * ue, (n - an) * un
        c = -(pe + pn)
        if abs(c + tol_m) <= 1e-9 * (abs(pe) + abs(pn) + 1.0):
            return None
        out.append(c)
    return out


def _no_stack() -> npt.NDArray[np.float64]:
    """The points' stack, never asked for by a hull of one or two vertices (`_track_hull_margin_m`)."""
    raise AssertionError("a hull of one or two vertices needs no stack of the points")  # pragma: no cover


def _per_track(op: np.ufunc, values: npt.NDArray[np.float64], shp: tuple[int, ...]) -> npt.NDArray[np.float64]:
    """``op.reduce`` (minimum or maximum) of each track's values (points of tracks of shape ``shp``);
    a track of one point is its value (no reduction loop per point)."""
    v = values.reshape(shp)
    return v[..., 0] if shp[-1] == 1 else op.reduce(v, axis=-1)


def _counted_clearance_m(clearance_m: Numeric, edge_tolerance_m: float | None) -> npt.NDArray[np.float64]:
    """A sector's signed clearance where it limits the area margin (`ProtectedArea.margin_m`):
    everywhere without a tolerance; with one, only more than `edge_tolerance_m` inside the sector
    (+inf elsewhere). [m]"""
    c = np.asarray(clearance_m, dtype=float)
    return c if edge_tolerance_m is None else np.where(c < -edge_tolerance_m, c, np.inf)


@dataclass(frozen=True, slots=True, kw_only=True)
class ProtectedArea:
    """Circling area: every point within R of the convex hull of the usable thresholds, minus
    the not-authorised sectors.

    Attributes
    ----------
    centres_m : tuple of (float, float)
        Usable runway thresholds (east, north); an (N, 2) array is accepted. [m]
    radius_m : float
        Radius R of the arcs about each threshold. [m]
    excluded : tuple of Sector
        Sectors where circling is not authorised.
    hull_m : tuple of (float, float)
        Convex hull of the centres, counter-clockwise (derived; 1 vertex for one centre, 2 for
        collinear centres). [m]

    Notes
    -----
    The FAA [3]_ and ICAO [4]_ areas are arcs of radius R about each threshold joined by
    tangents. With one R for all arcs this is exactly {p : dist(p, hull) <= R}: the tangent
    joining two arcs is the edge of the hull pushed out by R, and each arc is the set of points
    nearest a hull vertex. One centre gives a circle, two (or collinear ones) a stadium.

    `margin_m` is R - dist(p, hull), positive inside, then limited by each excluded sector's
    signed clearance (positive outside the sector, minus the depth into it inside):
    margin = min(R - dist(p, hull), min over sectors of clearance). A point in an excluded
    sector therefore has a negative margin even when it is near a threshold, and a point near a
    sector edge has a margin no larger than its distance to the sector. Outside the authorised
    area the magnitude is at most the true distance back into it.

    References
    ----------
    See the module references [3]_ and [4]_.
    """

    centres_m: tuple[tuple[float, float], ...]
    radius_m: float
    excluded: tuple[Sector, ...] = ()
    hull_m: tuple[tuple[float, float], ...] = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        given = self.centres_m
        if type(given) in (list, tuple) and given and all(type(p) is tuple and _one_point(p) is not None
                                                        for p in given):
            # finite (east, north) float pairs: the same checks and floats without an array
            centres = tuple(given)
        else:
            centres = self._checked_centres()
        if not (math.isfinite(self.radius_m) and self.radius_m > 0.0):
            raise DomainError(f"radius_m must be positive and finite; got {self.radius_m}")
        for s in self.excluded:
            if not isinstance(s, (BearingSector, SideSector)):
                raise DomainError(f"excluded sectors must be BearingSector or SideSector; got {type(s).__name__}")
        object.__setattr__(self, "centres_m", centres)
        object.__setattr__(self, "excluded", tuple(self.excluded))
        object.__setattr__(self, "radius_m", float(self.radius_m))
        object.__setattr__(self, "hull_m", tuple(_hull_of(list(centres))))

    def _checked_centres(self) -> tuple[tuple[float, float], ...]:
        c = _points(self.centres_m, "centres_m")
        if c.ndim == 1:
            c = c[None, :]
        if c.ndim != 2 or c.shape[0] < 1:
            raise DomainError(f"centres_m must be an (N, 2) array with N >= 1; got shape {c.shape}")
        return tuple(map(tuple, c.tolist()))

    def _edges(self) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
        h = np.asarray(self.hull_m)
        if len(h) == 2:               # a stadium: one segment (a->b and b->a are the same)
            return h[:1], h[1:]
        return h, np.roll(h, -1, axis=0)

    def distance_to_hull_m(self, points: ArrayLike) -> Numeric:
        """Distance from points to the convex hull of the centres (0 inside the hull). [m]"""
        return as_float(self._distance_to_hull_m(_points(points)))

    def _distance_to_hull_m(self, p: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
        """`distance_to_hull_m` of points already checked."""
        if len(self.hull_m) <= 2:     # a circle or a stadium: one segment (a point's is of zero length)
            return _segment_distance_m(p, self.hull_m[0], self.hull_m[-1])
        a, b = self._edges()
        dist = _segments_distance_m(p, a, b)
        if len(self.hull_m) >= 3:     # counter-clockwise: inside when left of (or on) every edge
            cr = _cross(a, b, p[..., None, :])
            dist = np.where(np.all(cr >= 0.0, axis=-1), 0.0, dist)
        return dist

    def margin_m(self, points: ArrayLike, *, sector_edge_tolerance_m: float | None = None) -> Numeric:
        """Distance left before leaving the authorised area; negative outside it. [m]

        The one area-margin rule: R - dist(p, hull), limited by the excluded sectors (see Notes
        of the class).

        Parameters
        ----------
        points : array_like, shape (..., 2)
            Points (east, north). [m]
        sector_edge_tolerance_m : float or None
            None: every sector limits the margin by its signed clearance (the geometric margin:
            a point near a sector has only its distance to it left). A number t: a sector counts
            only where a point is more than t inside it (minus its depth), so a track flown
            along a sector's edge (the final on the centreline that bounds a side sector) keeps
            its radius margin. [m]
        """
        p = _points(points)           # checked once: the parts below take it as it is
        margin = self.radius_m - self._distance_to_hull_m(p)
        for s in self.excluded:
            c = s._clearance_m(p) if isinstance(s, SideSector) else s.clearance_m(p)
            margin = np.minimum(margin, _counted_clearance_m(c, sector_edge_tolerance_m))
        return as_float(margin)

    def contains(self, points: ArrayLike) -> Union[bool, npt.NDArray[np.bool_]]:
        """Whether points are inside the authorised area (the boundary counts as inside)."""
        p = _points(points)
        if p.ndim == 2 and 0 < p.shape[0] <= _FEW_POINTS and len(self.hull_m) <= 2:
            return self._contains_few(p)
        inside = np.asarray(self.margin_m(p)) >= -_CONTAINS_TOL_M
        return bool(inside) if inside.ndim == 0 else inside

    def _contains_few(self, p: npt.NDArray[np.float64]) -> npt.NDArray[np.bool_]:
        """`contains` of a few checked points (K, 2) when the hull is one segment (or a point):
        `margin_m`'s distance to the segment written out on floats, point by point (the same
        IEEE operations as `_segment_distance_m`'s arrays), each sector's clearance as
        `margin_m` computes it (a side sector's on floats where that cannot change the answer,
        `_side_clearances_beside_m`)."""
        (ax, ay), (bx, by) = self.hull_m[0], self.hull_m[-1]
        sx, sy = bx - ax, by - ay
        ss = sx * sx + sy * sy
        r = self.radius_m
        margins = []
        pts = p.tolist()
        for e, n in pts:
            rx, ry = e - ax, n - ay
            if ss > 0.0:
                t = min(max((rx * sx + ry * sy) / ss, 0.0), 1.0)   # the sign of a 0 never reaches the distance
                rx, ry = rx - t * sx, ry - t * sy
            margins.append(r - math.sqrt(rx * rx + ry * ry))
        for sec in self.excluded:
            c = _side_clearances_beside_m(sec, pts, _CONTAINS_TOL_M) if isinstance(sec, SideSector) else None
            if c is None:
                c = (sec._clearance_m(p) if isinstance(sec, SideSector)
                     else np.asarray(sec.clearance_m(p), dtype=float)).tolist()
            margins = [min(m, x) for m, x in zip(margins, c)]
        return np.array([m >= -_CONTAINS_TOL_M for m in margins], dtype=bool)

    def track_margin_m(self, tracks: ArrayLike, *, sector_edge_tolerance_m: float | None = None) -> Numeric:
        """Smallest margin (`margin_m`) along each track; negative if it leaves. [m]

        The first part of `track_margins_m` (the one track-margin rule).
        """
        return as_float(self.track_margins_m(tracks, sector_edge_tolerance_m=sector_edge_tolerance_m)[0])

    def track_margins_m(self, tracks: ArrayLike, *, sector_edge_tolerance_m: float | None = None,
                        ) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.bool_]]:
        """Smallest margin (`margin_m`) along each track read as a polyline, and whether a
        not-authorised sector sets it. [m]

        The one track-margin rule. Inside a sector given by bearings, the depth along a straight
        piece is deepest at an end or where the piece crosses the sector's bisector, so that
        crossing counts too: a track sampled sparsely along its straights still finds how far it
        enters the sector.

        Parameters
        ----------
        tracks : array_like, shape (..., N, 2), N >= 1
            Tracks (east, north). [m]
        sector_edge_tolerance_m : float or None
            As in `margin_m`.

        Returns
        -------
        margin : ndarray, shape (...)
            One margin per track. [m]
        by_sector : ndarray of bool, shape (...)
            Whether that margin is a not-authorised sector's (deeper than the radius margin).
        """
        quick = self._axis_hull_margin_m(tracks)
        if quick is not None:
            t, e, n, hull_margin = quick
        else:
            t, e, n = _track_columns(tracks)
        out_shape = t.shape[:-2]
        t = t.reshape((-1,) + t.shape[-2:])                 # (tracks, N, 2)
        shp = t.shape[:-1]
        stack: list[npt.NDArray[np.float64]] = []

        def pts() -> npt.NDArray[np.float64]:               # the points as one (T N, 2) stack, made once
            if not stack:
                stack.append(np.stack([e, n], axis=-1))
            return stack[0]

        if quick is None:
            hull_margin = self._track_hull_margin_m(e, n, shp, pts)
        margin = hull_margin
        for sec in self.excluded:
            # the smallest counted clearance of a track is its smallest clearance where that counts
            # (counted: below -tolerance, else +inf), the same number without a test per point
            c = _axis_clearance_m(sec, e, n, sector_edge_tolerance_m)
            if c is None:
                c = sec._clearance_m(pts()) if isinstance(sec, SideSector) else np.asarray(sec.clearance_m(pts()),
                                                                                          dtype=float)
            low = _per_track(np.minimum, c, shp)
            depth = _counted_clearance_m(low, sector_edge_tolerance_m)
            if isinstance(sec, BearingSector) and shp[-1] >= 2:
                depth = np.minimum(depth, _bisector_depth_m(sec, t, sector_edge_tolerance_m))
            margin = np.minimum(margin, depth)
        return margin.reshape(out_shape), (margin < hull_margin).reshape(out_shape)

    def _axis_hull_margin_m(self, tracks: ArrayLike) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64],
                                                             npt.NDArray[np.float64], npt.NDArray[np.float64]] | None:
        """`track_margins_m`'s tracks and radius part when the hull is a point or a segment along
        an axis (the runway frame's centreline): the tracks as an array, their east and north
        columns (as `_track_columns` makes them) and each track's R - the largest distance to the
        hull; None otherwise, or for tracks that are not all finite (`_track_columns` then checks
        them and raises its error).

        The finiteness test comes after the radius part, on its T numbers: a point that is not
        finite makes its track's largest squared distance inf or NaN, so the margin is not
        finite; along an axis no operation of the radius part meets inf - inf or 0 * inf, so
        such a point raises no floating-point warning either."""
        (ax, ay), (bx, by) = self.hull_m[0], self.hull_m[-1]
        if len(self.hull_m) > 2 or (ax != bx and ay != by):
            return None
        t = np.asarray(tracks, dtype=float)
        if t.ndim < 2 or t.shape[-1] != 2 or t.shape[-2] < 1:
            return None
        t3 = t.reshape((-1,) + t.shape[-2:])
        e, n = t3[..., 0].ravel(), t3[..., 1].ravel()       # as `_track_columns` makes them
        hull_margin = self._track_hull_margin_m(e, n, t3.shape[:-1], _no_stack)
        if not math.isfinite(np.add.reduce(hull_margin, axis=None)):
            return None
        return t, e, n, hull_margin

    def track_hull_margin_m(self, track: ArrayLike) -> float:
        """Smallest R - dist(p, hull) along one track (N, 2), N >= 1: the radius part of
        `track_margins_m` (no sector), the same number as ``radius_m - max(distance_to_hull_m)``
        to the last bit (R - x rounds monotonically). [m]"""
        t, e, n = _track_columns(track)
        if t.ndim != 2:
            raise DomainError(f"track must be an (N, 2) array with N >= 1; got shape {t.shape}")
        stack: list[npt.NDArray[np.float64]] = []

        def pts() -> npt.NDArray[np.float64]:
            if not stack:
                stack.append(np.stack([e, n], axis=-1))
            return stack[0]

        return float(self._track_hull_margin_m(e, n, t.shape[:-1], pts))

    def _track_hull_margin_m(self, e: npt.NDArray[np.float64], n: npt.NDArray[np.float64], shp: tuple[int, ...],
                             pts: Callable[[], npt.NDArray[np.float64]]) -> npt.NDArray[np.float64]:
        """min over each track of R - dist(p, hull), points (east ``e``, north ``n``, or ``pts()``
        as one (T N, 2) stack) of tracks of shape ``shp``.

        With one or two hull vertices (a circle, a stadium) the distance is to one segment, and
        R - sqrt(max of the squared distances) is the same number as the smallest R - distance
        (sqrt and the subtraction round monotonically): one square root per track. [m]
        """
        if len(self.hull_m) > 2:
            return _per_track(np.minimum, self.radius_m - np.asarray(self.distance_to_hull_m(pts()), dtype=float), shp)
        (ax, ay), (bx, by) = self.hull_m[0], self.hull_m[-1]
        sx, sy = bx - ax, by - ay
        ss = sx * sx + sy * sy
        # a term with a zero factor (a vertex at the origin, a segment along an axis: the runway
        # frame) is left out: p - 0 is p, and q + (+-0) is q or a zero that is squared below
        # (in place where the operands are this function's own: the same operations, fewer arrays)
        rx = e - ax if ax != 0.0 else e
        ry = n - ay if ay != 0.0 else n
        if ss > 0.0:                          # as distance_to_segments_m does for one segment
            if sx != 0.0 and sy != 0.0:
                t = rx * sx
                t += ry * sy
            else:
                t = ry * sy if sx == 0.0 else rx * sx
            t /= ss
            _uclip(t, 0.0, 1.0, out=t)
            if sx != 0.0:
                rx = rx - t * sx
            if sy != 0.0:
                np.multiply(t, sy, out=t)
                ry = np.subtract(ry, t, out=t)
        d2 = rx * rx
        if ry is e or ry is n:
            d2 += ry * ry
        else:                                 # ry is this function's own array
            np.multiply(ry, ry, out=ry)
            d2 += ry
        return self.radius_m - np.sqrt(_per_track(np.maximum, d2, shp))

    def sector_clearance_m(self, points: ArrayLike) -> float:
        """Smallest signed clearance of the points to any excluded sector (negative: inside one);
        +inf without sectors. [m]"""
        p = _points(points)           # checked once: a side sector's own rule takes it as it is
        return float(min((np.minimum.reduce(sec._clearance_m(p) if isinstance(sec, SideSector) else sec.clearance_m(p),
                                            axis=None)       # np.min's own reduction, without its wrappers
                          for sec in self.excluded), default=math.inf))

    def boundary(self, n: int = 180) -> npt.NDArray[np.float64]:
        """Closed polyline of the area's outline (sectors not cut; draw them with their polygons).

        Parameters
        ----------
        n : int
            Points on a full turn of arc (shared between the arcs by their angle), >= 8.

        Returns
        -------
        ndarray, shape (M, 2)
            Counter-clockwise, last point equal to the first: each arc about a hull vertex from
            the outward normal of the edge before it to that of the edge after it; the straight
            tangent segments join consecutive arcs. [m]
        """
        if n < 8:
            raise DomainError(f"n must be at least 8; got {n}")
        h = np.asarray(self.hull_m)
        if len(h) == 1:
            ang = np.linspace(0.0, 2.0 * math.pi, n + 1)[:-1]
            circle = h[0] + self.radius_m * np.stack([np.cos(ang), np.sin(ang)], axis=-1)
            return np.vstack([circle, circle[:1]])
        # edge i: vertex i -> i+1; its outward (right-hand) normal angle atan2(-(dx), dy), the
        # differences and the negation on the hull's floats (the same operations as on its array)
        hull = self.hull_m
        nxt = hull[1:] + hull[:1]
        normal_ang = np.arctan2(np.array([-(q[0] - p[0]) for p, q in zip(hull, nxt)]),
                                np.array([q[1] - p[1] for p, q in zip(hull, nxt)])).tolist()
        arcs, counts = [], []
        for i in range(len(h)):
            start = normal_ang[i - 1]
            sweep = (normal_ang[i] - start) % (2.0 * math.pi)
            k = max(2, int(math.ceil(n * sweep / (2.0 * math.pi))) + 1)
            arcs.append((start, sweep))
            counts.append(k)
        m = sum(counts)
        ang = np.empty(m)                                     # every arc's angles: one cos, one sin
        o = 0
        for (start, sweep), k in zip(arcs, counts):
            # start + linspace(0, sweep, k) in place: (i * step + 0) + start is i * step + start
            # (i * step >= +0), and the last angle is start + sweep
            seg = ang[o:o + k]
            np.multiply(np.arange(0.0, k), sweep / (k - 1), out=seg)
            seg[-1] = sweep
            seg += start
            o += k
        poly = np.empty((m + 1, 2))
        poly[:m, 0] = h[:, 0].repeat(counts) + self.radius_m * np.cos(ang)
        poly[:m, 1] = h[:, 1].repeat(counts) + self.radius_m * np.sin(ang)
        poly[m] = poly[0]
        return poly


def charted_sector(sector: Any, airfield: Any, thresholds_xy: Mapping[str, ArrayLike]) -> Sector:
    """The geometry of a charted not-authorised sector.

    Parameters
    ----------
    sector : briefer.model.Sector (duck-typed)
        ``kind`` "bearings" (``threshold``, ``from_deg_mag``, ``to_deg_mag``, clockwise) or
        "side" (``runway``, ``side``: north/east/south/west).
    airfield : briefer.model.Airfield (duck-typed)
        For ``magnetic_variation_deg`` (east positive: true = magnetic + variation) and
        ``runway(designator)``.
    thresholds_xy : mapping
        Threshold designator -> local position. [m]

    Returns
    -------
    BearingSector or SideSector
    """
    var = airfield.magnetic_variation_deg
    if sector.kind == "bearings":
        return BearingSector(centre_m=tuple(np.asarray(thresholds_xy[sector.threshold], dtype=float)),
                             from_deg_true=float(wrap_360(sector.from_deg_mag + var)),
                             to_deg_true=float(wrap_360(sector.to_deg_mag + var)))
    rw = airfield.runway(sector.runway)
    return side_of_centreline(thresholds_xy[rw.threshold_a.designator], thresholds_xy[rw.threshold_b.designator],
                              sector.side)


def area_in_runway_axes(area: ProtectedArea, runway: RunwayFrame) -> ProtectedArea:
    """The protected area rotated into runway axes, with (right_m, along_m) playing (east_m, north_m).

    Both frames have "right" clockwise of "ahead", so this is a rotation (and a shift): distances,
    sides and clockwise bearing ranges carry over, bearings measured from the landing course. The
    plan solver and the envelope measure their many runway-frame tracks here without converting
    each point back.

    Parameters
    ----------
    area : ProtectedArea
        The area in the local frame (east, north). [m]
    runway : RunwayFrame
        The landing runway's axes.

    Returns
    -------
    ProtectedArea
        The same area, points as (right_m, along_m). [m]
    """
    (te, tn), ((ue, un), (re_, rn)) = runway.threshold_xy_m, (runway.along_unit, runway.right_unit)
    te, tn, ue, un, re_, rn = float(te), float(tn), float(ue), float(un), float(re_), float(rn)

    def pseudo(p: ArrayLike) -> tuple[float, float]:
        one = _one_point(p)
        if one is not None:     # `RunwayFrame.to_runway_coords` of one point: the same operations on floats
            de, dn = one[0] - te, one[1] - tn
            return de * re_ + dn * rn, de * ue + dn * un
        along, right = runway.to_runway_coords(np.asarray(p, dtype=float))
        return float(right), float(along)

    course = runway.landing_course_deg_true
    sectors: list[Sector] = []
    for sec in area.excluded:
        if isinstance(sec, BearingSector):
            sectors.append(BearingSector(centre_m=pseudo(sec.centre_m),
                                         from_deg_true=float(wrap_360(sec.from_deg_true - course)),
                                         to_deg_true=float(wrap_360(sec.to_deg_true - course))))
        else:
            sectors.append(SideSector(line_a_m=pseudo(sec.line_a_m), line_b_m=pseudo(sec.line_b_m), side=sec.side))
    return ProtectedArea(centres_m=[pseudo(c) for c in area.centres_m], radius_m=area.radius_m,
                         excluded=tuple(sectors))
