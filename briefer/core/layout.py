"""The airfield in the local frame: thresholds, fixes and obstacles from coordinates or chart numbers.

An airfield file gives each position either as latitude/longitude or as the numbers an approach
chart and an airport diagram print: a runway by its heading and length, placed from another
runway's threshold (a distance and a bearing, or where the two centrelines cross); a missed
approach point at a threshold or a distance before it on the final course, or at a distance and a
bearing from a threshold; the final approach fix by its distance to the missed approach point
along the final course; an obstacle by a distance and a bearing. This module turns both forms into
one set of points of the local frame (metres east and north), which is all the brief uses.

The frame
---------
* With a reference point: the tangent plane of `briefer.core.geometry.LocalFrame` at it (origin
  at the reference point); latitude/longitude are projected with ``LocalFrame.to_local``.
* Without one: a plane with its origin at threshold A of the first runway and its y axis toward
  true north there. Nothing is on the earth; the brief says so.

Chart numbers on the plane (elementary plane geometry; bearings clockwise from north,
true = magnetic + variation, east variation positive):

* the point at distance d and true bearing b from P:  P + d (sin b, cos b);
* the far threshold of a runway of length L and true heading h from threshold A:  A + L (sin h, cos h);
* a fix d before T on the final course c (true):  T - d (sin c, cos c);
* two centrelines crossing a from threshold K (of a runway already placed, landing direction u_K)
  and b from threshold N (of the new runway, landing direction u_N): the crossing is
  X = K + a u_K and N = X - b u_N. The runways meet where the numbers say only if both distances
  lie on the runways (0 <= a <= length) and the centrelines are not near parallel.

Accuracy against the geodesic (WGS-84): the plane's north is true north at the origin; at a point
e metres east of it true north is turned by the convergence of the meridians, about
e / (R cos(lat)) * sin(lat) radians (0.05 deg at 5 km, latitude 45). With a reference point a
true bearing measured at a point is turned back by that amount before it is drawn (`LocalFrame`
gives the point's longitude); the plane also shortens a distance s from the origin by about
s^2 / (2 R^2). The tests compare the placements with geographiclib's direct geodesic problem
(C. F. F. Karney, "Algorithms for geodesics," J. Geodesy 87, 2013). Without a reference point
there is no earth to err against: the plane is the airfield as the chart draws it.

The model (`briefer.model`) calls `layout_airfield` once per airfield and keeps the result; an
impossible layout raises `LayoutError` naming the field, which the loaders turn into
``file:line: field: message``.
"""

from __future__ import annotations

import math
from briefer._dataclass import dataclass
from typing import Any

from briefer import units
from briefer.core.geometry import LocalFrame
from briefer.errors import DomainError

__all__ = [
    "ARP",
    "CROSSING_MIN_ANGLE_DEG",
    "Layout",
    "LayoutError",
    "point_at",
    "before_on_course",
    "far_threshold",
    "crossing_threshold",
    "layout_airfield",
]

ARP = "ARP"
"""How a placement names the airfield reference point (``from_point: ARP``)."""

CROSSING_MIN_ANGLE_DEG = 10.0
"""Centrelines closer than this to parallel do not give a usable crossing point: a small error in a
heading moves it by kilometres (place such a runway by a distance and a bearing instead)."""

Point = tuple[float, float]


class LayoutError(DomainError):
    """Chart numbers that cannot be placed; ``field`` is the dotted path of the culprit."""

    def __init__(self, message: str, *, field: str = "") -> None:
        self.message = message
        self.field = field
        super().__init__(f"{field}: {message}" if field else message)


# --------------------------------------------------------------------------------------------
# plane geometry
# --------------------------------------------------------------------------------------------
def _unit(bearing_deg_true: float) -> Point:
    b = math.radians(bearing_deg_true)
    return (math.sin(b), math.cos(b))


def point_at(origin_m: Point, distance_m: float, bearing_deg_true: float) -> Point:
    """The point `distance_m` from `origin_m` on the true bearing: P + d (sin b, cos b). [m]"""
    ue, un = _unit(bearing_deg_true)
    return (origin_m[0] + distance_m * ue, origin_m[1] + distance_m * un)


def before_on_course(point_m: Point, distance_m: float, course_deg_true: float) -> Point:
    """The point `distance_m` before `point_m` on a course flown toward it: T - d (sin c, cos c). [m]"""
    return point_at(point_m, distance_m, course_deg_true + 180.0)


def far_threshold(threshold_m: Point, length_m: float, heading_deg_true: float) -> Point:
    """The opposite threshold of a runway of the given length and true heading. [m]"""
    return point_at(threshold_m, length_m, heading_deg_true)


def crossing_threshold(known_m: Point, known_heading_deg_true: float, known_distance_m: float,
                       heading_deg_true: float, distance_m: float) -> Point:
    """Threshold N of a runway whose centreline crosses a known one where the chart says.

    The crossing lies `known_distance_m` from the known threshold K along its landing heading
    (X = K + a u_K) and `distance_m` from N along N's landing heading, so N = X - b u_N. [m]
    """
    x = point_at(known_m, known_distance_m, known_heading_deg_true)
    return before_on_course(x, distance_m, heading_deg_true)


def _angle_between_lines_deg(a_deg: float, b_deg: float) -> float:
    """Angle between two undirected lines, [0, 90]. [deg]"""
    d = abs((a_deg - b_deg) % 180.0)
    return min(d, 180.0 - d)


def _dist(p: Point, q: Point) -> float:
    return math.hypot(q[0] - p[0], q[1] - p[1])


def _bearing(p: Point, q: Point) -> float:
    return math.degrees(math.atan2(q[0] - p[0], q[1] - p[1])) % 360.0


# --------------------------------------------------------------------------------------------
# the layout of an airfield
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True)
class Layout:
    """Every position of an airfield in one plane frame (east, north) [m].

    Attributes
    ----------
    frame : LocalFrame or None
        The tangent plane at the reference point, or None (no reference point: a local frame
        that is not tied to the earth).
    origin : str
        What sits at (0, 0): 'the reference point' or 'threshold 13'.
    thresholds_m : dict
        Threshold designator -> position.
    obstacles_m : tuple
        One position per obstacle, in file order.
    fixes_m : dict
        Approach name -> (final approach fix, missed approach point).
    headings_deg : dict
        Threshold designator -> landing heading (toward the opposite threshold) on the plane:
        from the plane's north, which is true north at the origin. [deg]
    """

    frame: LocalFrame | None
    origin: str
    thresholds_m: dict[str, Point]
    obstacles_m: tuple[Point, ...]
    fixes_m: dict[str, tuple[Point, Point]]
    headings_deg: dict[str, float]

    @property
    def georeferenced(self) -> bool:
        """True when the frame is tied to the earth by a reference point."""
        return self.frame is not None

    def distance_from_origin_m(self, point_m: Point) -> float:
        return math.hypot(point_m[0], point_m[1])


class _Builder:
    """Places the runways in file order, then the obstacles and the approaches' fixes."""

    def __init__(self, airfield: Any) -> None:
        self.af = airfield
        self.var = float(airfield.magnetic_variation_deg)
        ref = airfield.reference_point
        self.frame = None if ref is None else LocalFrame(lat0_deg=ref.lat_deg, lon0_deg=ref.lon_deg)
        self.points: dict[str, Point] = {} if self.frame is None else {ARP: (0.0, 0.0)}
        self.headings: dict[str, float] = {}
        self.lengths: dict[str, float] = {}      # designator -> length of its runway [m]
        self.runway_of: dict[str, str] = {}      # designator -> '09/27'
        self.convergence: dict[Point, float] = {}  # point -> meridian convergence there [deg]

    # -- helpers --------------------------------------------------------------------------------
    def geodetic(self, lat_deg: float, lon_deg: float, where: str) -> Point:
        if self.frame is None:
            raise LayoutError("latitude/longitude need the airfield's reference_point (or give the position "
                              "from the chart: from_point, distance_nm and bearing_deg_mag)", field=where)
        try:
            e, n = self.frame.to_local(lat_deg, lon_deg)
        except DomainError as exc:
            raise LayoutError(str(exc), field=where) from None
        return (float(e), float(n))

    def known(self, name: str, where: str) -> Point:
        """The position of a named threshold or the reference point, placed earlier."""
        if name in self.points:
            return self.points[name]
        if name == ARP:
            raise LayoutError("there is no reference point to measure from: give the airfield's "
                              "reference_point, or measure from a threshold", field=where)
        placed = [p for p in self.points if p != ARP]
        ahead = name in {t.designator for rw in self.af.runways for t in (rw.threshold_a, rw.threshold_b)}
        hint = (f"'{name}' is placed further down the file; measure from a runway listed before this one"
                if ahead else f"no threshold '{name}' at this airfield")
        options = ", ".join(placed + ([ARP] if self.frame is not None else [])) or "none yet"
        raise LayoutError(f"{hint} (placed so far: {options})", field=where)

    def placed_from(self, placement: Any, where: str) -> Point:
        """A point at a distance and a bearing from a named threshold or the reference point."""
        origin = self.known(placement.from_point, f"{where}.from_point")
        return point_at(origin, placement.distance_as_m, self.plane(origin, placement.true_bearing_deg(self.var)))

    def plane(self, at_m: Point, true_deg: float) -> float:
        """A true bearing measured at a point, as a bearing of the plane: less the convergence of
        the meridians there, gamma = (lon - lon0) sin(lat0) (first order; see
        `LocalFrame.true_bearing_deg`). Without a reference point the plane's north is true north
        everywhere (nothing is on the earth). [deg]"""
        if self.frame is None or at_m == (0.0, 0.0):
            return true_deg
        gamma = self.convergence.get(at_m)
        if gamma is None:
            _, lon = self.frame.to_geodetic(at_m[0], at_m[1])
            gamma = self.convergence[at_m] = ((float(lon) - self.frame.lon0_deg + 180.0) % 360.0 - 180.0) * (
                math.sin(math.radians(self.frame.lat0_deg)))
        return (true_deg - gamma) % 360.0

    # -- runways --------------------------------------------------------------------------------
    def runways(self) -> None:
        for i, rw in enumerate(self.af.runways):
            where = f"runways[{i}]"
            a, b = rw.threshold_a, rw.threshold_b
            if not rw.chart_form:
                pa = self.geodetic(a.lat_deg, a.lon_deg, f"{where}.threshold_a")
                pb = self.geodetic(b.lat_deg, b.lon_deg, f"{where}.threshold_b")
                heading = _bearing(pa, pb)
                length = _dist(pa, pb)
            else:
                heading = rw.true_heading_deg(self.var)
                length = rw.threshold_distance_m
                pa = self._place_chart_runway(rw, i, heading, length)
                pb = far_threshold(pa, length, self.plane(pa, heading))
                heading = _bearing(pa, pb)        # as drawn on the plane
            self.points[a.designator], self.points[b.designator] = pa, pb
            self.headings[a.designator], self.headings[b.designator] = heading, (heading + 180.0) % 360.0
            self.lengths[a.designator] = self.lengths[b.designator] = length
            self.runway_of[a.designator] = self.runway_of[b.designator] = rw.designator

    def _place_chart_runway(self, rw: Any, i: int, heading: float, length: float) -> Point:
        """Threshold A of a runway given by heading and length."""
        where = f"runways[{i}]"
        a = rw.threshold_a
        if rw.position is not None:
            pos = rw.position
            p = self.placed_from(pos, f"{where}.position")
            if pos.threshold in (None, a.designator):
                return p
            return far_threshold(p, length, self.plane(p, heading + 180.0))   # the placed end is threshold B
        if rw.crossing:
            return self._crossing(rw, i, heading, length)
        if i == 0 and self.frame is None:
            return (0.0, 0.0)
        if i == 0:
            raise LayoutError("missing the position: with a reference_point, say where the runway lies from it "
                              "(position: {threshold: '" + a.designator + "', from_point: ARP, distance_ft: ..., "
                              "bearing_deg_mag: ...}), or leave the reference point out", field=where)
        raise LayoutError("missing the position: place this runway from one listed before it, by "
                          "'position' (a threshold at a distance and a bearing from another threshold) or "
                          "'crossing' (where the two centrelines cross)", field=where)

    def _crossing(self, rw: Any, i: int, heading: float, length: float) -> Point:
        where = f"runways[{i}].crossing"
        mine = {rw.threshold_a.designator, rw.threshold_b.designator}
        own = [(j, c) for j, c in enumerate(rw.crossing) if c.threshold in mine]
        other = [(j, c) for j, c in enumerate(rw.crossing) if c.threshold not in mine]
        if len(own) != 1 or len(other) != 1:
            raise LayoutError(f"expected one threshold of this runway ({', '.join(sorted(mine))}) and one of a "
                              f"runway listed before it, got {', '.join(c.threshold for c in rw.crossing)}",
                              field=where)
        (jo, c_own), (jk, c_known) = own[0], other[0]
        k_pos = self.known(c_known.threshold, f"{where}[{jk}].threshold")
        k_heading = self.headings[c_known.threshold]
        k_length = self.lengths[c_known.threshold]
        own_heading = heading if c_own.threshold == rw.threshold_a.designator else (heading + 180.0) % 360.0
        angle = _angle_between_lines_deg(k_heading, own_heading)
        if angle < CROSSING_MIN_ANGLE_DEG:
            raise LayoutError(
                f"runways {self.runway_of[c_known.threshold]} and {rw.designator} are {angle:.0f} degrees apart: "
                f"near-parallel centrelines do not cross at a usable point; place the runway by 'position' "
                f"(a distance and a bearing from a threshold)", field=where)
        for j, c, runway, run_len in ((jk, c_known, self.runway_of[c_known.threshold], k_length),
                                      (jo, c_own, rw.designator, length)):
            if c.distance_as_m > run_len + 0.5:
                raise LayoutError(
                    f"runways {self.runway_of[c_known.threshold]} and {rw.designator} cannot cross "
                    f"{_show_distance(c)} from threshold {c.threshold}: runway {runway} is only "
                    f"{run_len * units.M_TO_FT:.0f} ft ({run_len:.0f} m) long", field=f"{where}[{j}]")
        x = point_at(k_pos, c_known.distance_as_m, k_heading)      # k_heading is already of the plane
        n = before_on_course(x, c_own.distance_as_m, self.plane(x, own_heading))
        if c_own.threshold == rw.threshold_a.designator:
            return n
        return far_threshold(n, length, self.plane(n, own_heading))

    # -- obstacles and fixes --------------------------------------------------------------------
    def obstacles(self) -> tuple[Point, ...]:
        out = []
        for i, ob in enumerate(self.af.obstacles):
            where = f"obstacles[{i}]"
            if ob.lat_deg is not None:
                out.append(self.geodetic(ob.lat_deg, ob.lon_deg, where))
            else:
                out.append(self.placed_from(ob, where))
        return tuple(out)

    def fixes(self) -> dict[str, tuple[Point, Point]]:
        out: dict[str, tuple[Point, Point]] = {}
        for i, ap in enumerate(self.af.approaches):
            where = f"approaches[{i}]"
            course = (float(ap.final_course_deg_mag) + self.var) % 360.0
            map_m = self._fix(ap.map_fix, f"{where}.map_fix", course, None)
            faf_m = self._fix(ap.faf, f"{where}.faf", course, map_m)
            out[ap.name] = (faf_m, map_m)
        return out

    def _fix(self, fix: Any, where: str, course_true: float, map_m: Point | None) -> Point:
        if fix.lat_deg is not None:
            return self.geodetic(fix.lat_deg, fix.lon_deg, where)
        if fix.from_point is not None:
            return self.placed_from(fix, where)
        if fix.threshold is not None:
            t = self.known(fix.threshold, f"{where}.threshold")
            d = fix.distance_as_m or 0.0
            return before_on_course(t, d, self.plane(t, course_true))
        if map_m is None:   # the model refuses this; kept as a guard for hand-built models
            raise LayoutError("a distance alone places a fix before the missed approach point; give the "
                              "missed approach point by threshold or from_point", field=where)
        return before_on_course(map_m, fix.distance_as_m, self.plane(map_m, course_true))

    def build(self) -> Layout:
        self.runways()
        obstacles = self.obstacles()
        fixes = self.fixes()
        thresholds = {k: v for k, v in self.points.items() if k != ARP}
        first = self.af.runways[0].threshold_a.designator
        return Layout(frame=self.frame, origin="the reference point" if self.frame is not None else f"threshold {first}",
                      thresholds_m=thresholds, obstacles_m=obstacles, fixes_m=fixes,
                      headings_deg=dict(self.headings))


def _show_distance(c: Any) -> str:
    for key, unit in (("distance_ft", "ft"), ("distance_m", "m"), ("distance_nm", "NM")):
        value = getattr(c, key, None)
        if value is not None:
            return f"{value:g} {unit}"
    return f"{c.distance_as_m:.0f} m"


def layout_airfield(airfield: Any) -> Layout:
    """Every threshold, obstacle and fix of an airfield in its local frame.

    Parameters
    ----------
    airfield : briefer.model.Airfield (duck-typed)
        Runways in file order (each placed from the reference point or from the runways before
        it), obstacles, approaches, ``magnetic_variation_deg`` (east positive) and an optional
        ``reference_point``.

    Returns
    -------
    Layout

    Raises
    ------
    LayoutError
        If a position refers to a point not placed yet, or the numbers cannot meet (centrelines
        that would cross beyond a runway's end, near-parallel crossings, latitude/longitude
        without a reference point).
    """
    return _Builder(airfield).build()
