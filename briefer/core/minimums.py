"""Practice circling minimums: what the design criteria would give at an airfield.

For a teaching exercise, not a published procedure: from the airfield's runway thresholds, its
charted obstacles and a criteria set, compute for each approach category the protected area
radius, the controlling (highest) obstacle inside it, the minimum altitude (obstacle elevation
plus the category's obstacle clearance, not below the airfield elevation plus the category's
lowest circling height, rounded up the way the criteria round), its height above the airport and
the criteria's lowest visibility. Every value carries its provenance; values from memory are
flagged so that no output passes them off as checked. Every result says
``PRACTICE VALUES — NOT A PUBLISHED PROCEDURE``.

The TERPS expanded radius depends on the circling MDA, which depends on the obstacles inside the
radius: see `practice_minimum` for the fixed-point iteration and why it ends.

Pure: no I/O and no UI. `practice_minimums_for_airfield` reads the airfield model (a frozen
dataclass of `briefer.model`, imported for type checking only) and builds the geometry itself.

References
----------
.. [1] FAA, Aeronautical Information Manual, 5-4-20 (circling area built from arcs about each
   runway threshold; 300 ft obstacle clearance inside it; legacy and expanded radii; LNAV MDA
   rounded up to the next 20 ft).
.. [2] FAA, U.S. Terminal Procedures Publication, page B2 (standard and expanded circling
   approach radii by category and circling MDA).
.. [3] FAA Order 8260.3 (TERPS), circling: minimum HAA and visibility (not read; values from
   memory, see `briefer.core.criteria`).
.. [4] ICAO Doc 8168 (PANS-OPS), 5th ed., 2006: Vol I Part I Section 4 Chapter 7, Table
   I-4-7-3 (MOC, lowest OCH, minimum visibility; from memory) and 7.3.4 (sector exclusion);
   Vol II Part I Section 4 Chapter 7 (visual manoeuvring area) and 5.4.4 (OCA/H for circling).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from briefer._dataclass import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from briefer.core import criteria as cr
from briefer.core import geometry
from briefer.core.airfield_geometry import AirfieldGeometry
from briefer.errors import DomainError
from briefer.units import M_TO_NM, M_TO_SM, NM_TO_M

if TYPE_CHECKING:   # pragma: no cover - the model is only read, never imported at run time
    from briefer.model import Airfield, Approach

__all__ = [
    "PRACTICE_NOTICE",
    "ObstaclePoint",
    "ControllingObstacle",
    "RadiusStep",
    "PracticeCategoryMinimum",
    "PracticeMinimums",
    "practice_minimum",
    "practice_minimums",
    "practice_minimums_for_airfield",
    "controlling_obstacle_index",
    "highest_inside_index",
    "obstacles_inside",
]

PRACTICE_NOTICE = "PRACTICE VALUES — NOT A PUBLISHED PROCEDURE"
"""The line every output of practice minimums carries."""

MAX_EXPANDED_ITERATIONS = len(cr.EXPANDED_MDA_BANDS) + 1
"""Evaluations the expanded-radius iteration may take: one per band plus the settling check.
The sequence of bands is non-decreasing (see `practice_minimum`), so it cannot take more."""

CONTROLLED_BY_OBSTACLE = "obstacle"
CONTROLLED_BY_LOWEST_HEIGHT = "lowest-height"


# --------------------------------------------------------------------------------------------
# Inputs and results
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class ObstaclePoint:
    """A charted obstacle in the local frame.

    Attributes:
        name: as charted.
        xy_m: position (east, north) of the local frame. [m]
        elevation_ft: top of the obstacle. [ft MSL]
    """

    name: str
    xy_m: tuple[float, float]
    elevation_ft: float

    def __post_init__(self) -> None:
        xy = tuple(float(v) for v in self.xy_m)
        if len(xy) != 2 or not all(math.isfinite(v) for v in xy):
            raise DomainError(f"obstacle {self.name!r}: xy_m must be two finite numbers; got {self.xy_m!r}")
        object.__setattr__(self, "xy_m", xy)
        if not math.isfinite(self.elevation_ft):
            raise DomainError(f"obstacle {self.name!r}: elevation_ft must be finite; got {self.elevation_ft}")
        object.__setattr__(self, "elevation_ft", float(self.elevation_ft))


@dataclass(frozen=True, slots=True, kw_only=True)
class ControllingObstacle:
    """The highest obstacle inside the authorised area.

    Attributes:
        name: as charted.
        elevation_ft: its top. [ft MSL]
        xy_m: its position in the local frame. [m]
        distance_nm: distance from the nearest threshold (from the hull of the thresholds;
            0 between them). [NM]
    """

    name: str
    elevation_ft: float
    xy_m: tuple[float, float]
    distance_nm: float


@dataclass(frozen=True, slots=True, kw_only=True)
class RadiusStep:
    """One evaluation of the radius -> controlling obstacle -> MDA chain.

    Attributes:
        mda_guess_ft: the MDA the radius was looked up for (None: the radius does not depend on
            the MDA). [ft MSL]
        mda_band: the expanded table's band of that guess (None outside terps-expanded).
        radius_nm: the radius used. [NM]
        controlling_obstacle: name of the highest obstacle inside, or None.
        mda_ft: the MDA this radius gives (rounded). [ft MSL]
    """

    mda_guess_ft: float | None
    mda_band: str | None
    radius_nm: float
    controlling_obstacle: str | None
    mda_ft: float


@dataclass(frozen=True, slots=True, kw_only=True)
class PracticeCategoryMinimum:
    """Practice circling minimums of one category, with every step and its provenance.

    Provenance codes are those of `briefer.core.criteria` ("V", "V2", "C", "M"); "M" means from
    memory, not verified, and is listed in `from_memory`.

    Attributes:
        category, criteria: what was computed.
        airport_elevation_ft: airfield elevation. [ft MSL]
        radius_nm, radius_basis, radius_provenance, radius_source: the protected area radius.
        mda_band: the expanded table's band of the final MDA (terps-expanded only).
        steps: the evaluations made (one unless the radius depends on the MDA).
        controlling: the highest obstacle inside the authorised area, or None.
        ignored_in_sectors: obstacles within the radius but inside a not-authorised sector.
        obstacle_clearance_ft, obstacle_clearance_provenance, obstacle_clearance_source.
        lowest_height_ft, lowest_height_provenance, lowest_height_source: the lowest circling
            height above the airfield. [ft]
        mda_unrounded_ft: max(obstacle + clearance, elevation + lowest height). [ft MSL]
        controlled_by: "obstacle" or "lowest-height" (which term of the max governs).
        rounding_increment_ft, rounding_provenance, rounding_source: the rounding rule.
        mda_ft: the practice minimum altitude (rounded up). [ft MSL]
        haa_ft: its height above the airport. [ft]
        visibility_sm, visibility_m, visibility_provenance, visibility_source, visibility_note:
            the criteria's lowest circling visibility.
        published_mda_ft, published_visibility_sm, published_note: the chosen approach's own
            circling line for comparison (None when no approach was given or none is published).
    """

    category: str
    criteria: str
    airport_elevation_ft: float
    radius_nm: float
    radius_basis: str
    radius_provenance: str
    radius_source: str
    mda_band: str | None
    steps: tuple[RadiusStep, ...]
    controlling: ControllingObstacle | None
    ignored_in_sectors: tuple[str, ...]
    obstacle_clearance_ft: float
    obstacle_clearance_provenance: str
    obstacle_clearance_source: str
    lowest_height_ft: float
    lowest_height_provenance: str
    lowest_height_source: str
    mda_unrounded_ft: float
    controlled_by: str
    rounding_increment_ft: float
    rounding_provenance: str
    rounding_source: str
    mda_ft: float
    haa_ft: float
    visibility_sm: float
    visibility_m: float
    visibility_provenance: str
    visibility_source: str
    visibility_note: str
    published_mda_ft: float | None = None
    published_visibility_sm: float | None = None
    published_note: str = ""

    def __post_init__(self) -> None:
        cr.check_category(self.category)
        cr.check_criteria(self.criteria)
        for code in (self.radius_provenance, self.obstacle_clearance_provenance, self.lowest_height_provenance,
                     self.rounding_provenance, self.visibility_provenance):
            cr.provenance_label(code)
        if self.controlled_by not in (CONTROLLED_BY_OBSTACLE, CONTROLLED_BY_LOWEST_HEIGHT):
            raise DomainError(f"controlled_by must be 'obstacle' or 'lowest-height'; got {self.controlled_by!r}")
        tol = 1e-6
        if self.mda_ft < self.mda_unrounded_ft - tol:
            raise DomainError(f"MDA {self.mda_ft:g} ft is below the unrounded value {self.mda_unrounded_ft:g} ft")
        if self.mda_ft >= self.mda_unrounded_ft + self.rounding_increment_ft - tol:
            raise DomainError(f"MDA {self.mda_ft:g} ft is rounded up by a whole step or more")
        if self.mda_ft < self.airport_elevation_ft + self.lowest_height_ft - tol:
            raise DomainError("MDA is below the airfield elevation plus the lowest circling height")
        if self.controlling is not None and self.mda_ft < self.controlling.elevation_ft + self.obstacle_clearance_ft - tol:
            raise DomainError("MDA does not clear the controlling obstacle by the required clearance")
        if not math.isclose(self.haa_ft, self.mda_ft - self.airport_elevation_ft, abs_tol=1e-9):
            raise DomainError("haa_ft must equal mda_ft - airport_elevation_ft")
        if not self.steps:
            raise DomainError("at least one step is needed")

    @property
    def notice(self) -> str:
        """The practice notice (the same for every result)."""
        return PRACTICE_NOTICE

    @property
    def from_memory(self) -> tuple[str, ...]:
        """Names of the values behind this result that are from memory, not verified."""
        items = (("area radius", self.radius_provenance),
                 ("obstacle clearance", self.obstacle_clearance_provenance),
                 ("lowest circling height", self.lowest_height_provenance),
                 ("MDA rounding", self.rounding_provenance),
                 ("visibility", self.visibility_provenance))
        return tuple(name for name, code in items if cr.is_from_memory(code))

    @property
    def iterations(self) -> int:
        """How many radius evaluations were made."""
        return len(self.steps)


@dataclass(frozen=True, slots=True, kw_only=True)
class PracticeMinimums:
    """Practice circling minimums of an airfield under one criteria set.

    Attributes:
        airfield_ident, airfield_name: the airfield.
        airport_elevation_ft: its elevation. [ft MSL]
        criteria: the criteria set; criteria_basis says why this set.
        approach_name: the approach whose not-authorised sectors were applied (None: none).
        sectors: the sectors applied, in words.
        categories: one result per category.
        notes: plain sentences about what these values are and are not.
        notice: always `PRACTICE_NOTICE`.
    """

    airfield_ident: str
    airfield_name: str
    airport_elevation_ft: float
    criteria: str
    criteria_basis: str
    approach_name: str | None
    sectors: tuple[str, ...]
    categories: tuple[PracticeCategoryMinimum, ...]
    notes: tuple[str, ...] = ()
    notice: str = field(default=PRACTICE_NOTICE)

    def __post_init__(self) -> None:
        cr.check_criteria(self.criteria)
        if self.notice != PRACTICE_NOTICE:
            raise DomainError("practice minimums always carry the practice notice")

    def category(self, category: str) -> PracticeCategoryMinimum:
        """The result for one category."""
        for c in self.categories:
            if c.category == category.upper():
                return c
        raise DomainError(f"no practice minimum for category {category!r} "
                          f"(computed: {', '.join(c.category for c in self.categories)})")

    @property
    def from_memory(self) -> tuple[str, ...]:
        """Every value from memory behind any category (names, in first-seen order)."""
        seen: dict[str, None] = {}
        for c in self.categories:
            for name in c.from_memory:
                seen.setdefault(name, None)
        return tuple(seen)


# --------------------------------------------------------------------------------------------
# The computation
# --------------------------------------------------------------------------------------------
def controlling_obstacle_index(area: geometry.ProtectedArea, points_m: Any,
                               elevations_ft: Sequence[float]) -> int | None:
    """The controlling obstacle: the highest one inside the authorised area.

    Parameters
    ----------
    area : ProtectedArea
        The circling area, not-authorised sectors cut out; an obstacle on its boundary counts
        as inside (`ProtectedArea.contains`), the conservative reading.
    points_m : array_like, shape (K, 2)
        Obstacle positions (east, north). [m]
    elevations_ft : sequence of float
        Their elevations, same order. [ft]

    Returns
    -------
    int or None
        Index of the highest obstacle inside (the first charted wins a tie); None if none is.

    Notes
    -----
    The MDA must clear the highest obstacle in the circling area by the criteria's required
    obstacle clearance: FAA Order 8260.3 (TERPS) circling ROC, ICAO Doc 8168 Vol II Part I
    Sec 4 Ch 7 (MOC) [1]_ [4]_.
    """
    if len(elevations_ft) == 0:
        return None
    return highest_inside_index(obstacles_inside(area, points_m), elevations_ft)


def obstacles_inside(area: geometry.ProtectedArea, points_m: Any) -> np.ndarray:
    """Whether each obstacle (K, 2) (east, north) [m] is inside the authorised area, its boundary
    included (`ProtectedArea.contains`, all in one call): shape (K,)."""
    inside = area.contains(np.asarray(points_m, dtype=float).reshape(-1, 2))
    if type(inside) is np.ndarray and inside.ndim == 1:     # already what atleast_1d(asarray(.)) returns
        return inside
    return np.atleast_1d(np.asarray(inside))


def highest_inside_index(inside: Sequence[bool] | np.ndarray, elevations_ft: Sequence[float]) -> int | None:
    """Index of the highest obstacle among those ``inside`` (the first charted wins a tie); None
    if none is (:func:`controlling_obstacle_index`)."""
    best: int | None = None
    for i, is_inside in enumerate(inside):
        if is_inside and (best is None or elevations_ft[i] > elevations_ft[best]):
            best = i
    return best


@dataclass(frozen=True, slots=True)
class _Field:
    """The geometry shared by every radius: the area's centres and sectors, the obstacles."""

    centres_m: Any
    excluded: tuple[geometry.Sector, ...]
    obstacles: tuple[ObstaclePoint, ...]
    distance_m: np.ndarray       # distance to the hull of the thresholds


def _field(centres_m: Any, obstacles: Sequence[ObstaclePoint], excluded: Sequence[geometry.Sector]) -> _Field:
    obstacles = tuple(obstacles)
    for ob in obstacles:
        if not isinstance(ob, ObstaclePoint):
            raise DomainError(f"obstacles must be ObstaclePoint; got {type(ob).__name__}")
    # the radius does not matter for the hull distance; 1 m keeps ProtectedArea's checks happy
    area = geometry.ProtectedArea(centres_m=centres_m, radius_m=1.0, excluded=tuple(excluded))
    if not obstacles:
        return _Field(centres_m, area.excluded, (), np.zeros(0))
    pts = np.array([ob.xy_m for ob in obstacles], dtype=float)
    dist = np.asarray(area.distance_to_hull_m(pts), dtype=float).reshape(-1)
    return _Field(centres_m, area.excluded, obstacles, dist)


def _controlling(fld: _Field, radius_nm: float) -> tuple[int | None, tuple[str, ...]]:
    """Index of the controlling obstacle at this radius (`controlling_obstacle_index`), and the
    names of those within the radius but in a not-authorised sector."""
    if not fld.obstacles:
        return None, ()
    area = geometry.ProtectedArea(centres_m=fld.centres_m, radius_m=radius_nm * NM_TO_M, excluded=fld.excluded)
    pts = np.array([ob.xy_m for ob in fld.obstacles], dtype=float)
    inside = np.atleast_1d(np.asarray(area.contains(pts)))
    within = fld.distance_m <= area.radius_m + _INSIDE_TOL_M
    ignored = tuple(ob.name for ob, w, i in zip(fld.obstacles, within, inside) if w and not i)
    return controlling_obstacle_index(area, pts, [ob.elevation_ft for ob in fld.obstacles]), ignored


_INSIDE_TOL_M = 1e-6   # an obstacle on the area's edge counts as inside (as ProtectedArea.contains)


def _radius(category: str, criteria: str, mda_ft: float, elevation_ft: float) -> cr.AreaRadius:
    return cr.circling_area_radius_nm(category, criteria=criteria, mda_ft_msl=mda_ft,
                                      airport_elevation_ft=elevation_ft)


def _radius_and_mda(category: str, criteria: str, floor_ft: float, elev: float,
                    evaluate: Callable[[cr.AreaRadius, float | None], tuple[RadiusStep, int | None, tuple[str, ...], float]],
                    ) -> tuple[cr.AreaRadius, list[RadiusStep], int | None, tuple[str, ...], float]:
    """The area radius and the MDA it gives (`evaluate`): once, or under ``terps-expanded`` the
    fixed-point iteration of `practice_minimum` (Notes) until the radius repeats. Returns the
    radius, the steps, and the last step's controlling obstacle index, obstacles ignored in
    sectors and unrounded MDA."""
    steps: list[RadiusStep] = []
    if criteria == "terps-expanded":
        guess = cr.round_mda_up_ft(floor_ft, criteria=criteria)
        for _ in range(MAX_EXPANDED_ITERATIONS):
            radius = _radius(category, criteria, guess, elev)
            step, idx, ignored, raw = evaluate(radius, guess)
            steps.append(step)
            settled = _radius(category, criteria, step.mda_ft, elev)
            if settled.radius_nm == radius.radius_nm:
                radius = settled     # same radius; the band label of the final MDA
                break
            if step.mda_ft < guess:   # pragma: no cover - excluded by monotonicity (Notes)
                raise DomainError("the expanded-radius iteration went down; the radius table is not monotone")
            guess = step.mda_ft
        else:   # pragma: no cover - excluded by monotonicity (Notes)
            raise DomainError(f"the expanded-radius iteration did not settle in {MAX_EXPANDED_ITERATIONS} steps")
    else:
        radius = _radius(category, criteria, floor_ft, elev)
        step, idx, ignored, raw = evaluate(radius, None)
        steps.append(step)
    return radius, steps, idx, ignored, raw


def practice_minimum(category: str, *, criteria: str, centres_m: Any, airport_elevation_ft: float,
                     obstacles: Sequence[ObstaclePoint] = (),
                     excluded: Sequence[geometry.Sector] = ()) -> PracticeCategoryMinimum:
    """Practice circling minimums of one category.

    Parameters
    ----------
    category : str
        "A" to "E".
    criteria : str
        One of `briefer.core.criteria.CRITERIA_SETS`.
    centres_m : array_like, shape (N, 2)
        The usable runway thresholds in the local frame (east, north). [m]
    airport_elevation_ft : float
        Airfield elevation (the HAA and the lowest height are referred to it). [ft MSL]
    obstacles : sequence of ObstaclePoint
        Charted obstacles in the same frame.
    excluded : sequence of geometry.Sector
        Sectors where circling is not authorised: their obstacles never control.

    Returns
    -------
    PracticeCategoryMinimum

    Raises
    ------
    DomainError
        For an unknown category or criteria set, bad geometry, or an elevation or MDA outside
        the criteria's range.

    Notes
    -----
    MDA = ceil_step(max(H + ROC, E + h_min)), with H the highest obstacle inside the authorised
    area, ROC the category's obstacle clearance [1]_ [4]_, E the airfield elevation, h_min the
    lowest circling height [3]_ [4]_, and ceil_step the criteria's rounding (20 ft TERPS, 10 ft
    ICAO; both from memory for circling, see `briefer.core.criteria.round_mda_up_ft`).

    Under ``terps-expanded`` the radius R(m) is looked up by the circling MDA m itself [2]_, so
    the MDA is a fixed point of g(m) = MDA(H(R(m))). The iteration starts from the lowest
    possible MDA, m0 = ceil_step(E + h_min), and repeats m(k+1) = g(m(k)):

    * R is non-decreasing in m (every column of the expanded table grows with the band), H is
      non-decreasing in R (a larger area holds every obstacle of a smaller one), so g is
      non-decreasing;
    * m1 = g(m0) >= m0 because g never goes below m0; by induction the sequence never
      decreases, so the band never goes down;
    * when two successive MDAs fall in the same band, the radius and so the MDA repeat: the
      sequence has settled. The band can rise at most five times (six bands), so at most
      `MAX_EXPANDED_ITERATIONS` evaluations are made; exceeding it raises DomainError (which
      the argument above rules out).

    The result is the least self-consistent MDA: any MDA m* with g(m*) = m* is >= every m(k).
    A band edge is decided by the rounded MDA as it would be charted: 1000 ft is in "1000 or
    less", 1020 ft in "1001-3000".

    The ICAO OCA/H is also "not below the OCA/H of the instrument approach that leads to the
    circle" [4]_ (5.4.4); that needs the procedure's design and is not applied here.
    """
    cr.check_category(category)
    cr.check_criteria(criteria)
    elev = float(airport_elevation_ft)
    if not (math.isfinite(elev) and cr.AIRPORT_ELEVATION_MIN_FT <= elev <= cr.AIRPORT_ELEVATION_MAX_FT):
        raise DomainError(f"airport elevation {elev:g} ft is outside the valid range "
                          f"[{cr.AIRPORT_ELEVATION_MIN_FT:g}, {cr.AIRPORT_ELEVATION_MAX_FT:g}] ft")
    fld = _field(centres_m, obstacles, excluded)
    roc = cr.circling_obstacle_clearance_ft(category, criteria=criteria)
    lowest = cr.minimum_circling_height_ft(category, criteria=criteria)
    rule = cr.mda_rounding_rule(criteria)
    vis = cr.minimum_circling_visibility_sm(category, criteria=criteria)
    floor_ft = elev + lowest.height_ft

    def evaluate(radius: cr.AreaRadius, guess: float | None) -> tuple[RadiusStep, int | None, tuple[str, ...], float]:
        idx, ignored = _controlling(fld, radius.radius_nm)
        raw = floor_ft if idx is None else max(fld.obstacles[idx].elevation_ft + roc.clearance_ft, floor_ft)
        mda = cr.round_mda_up_ft(raw, criteria=criteria)
        step = RadiusStep(mda_guess_ft=guess, mda_band=radius.mda_band, radius_nm=radius.radius_nm,
                          controlling_obstacle=None if idx is None else fld.obstacles[idx].name, mda_ft=mda)
        return step, idx, ignored, raw

    radius, steps, idx, ignored, raw = _radius_and_mda(category, criteria, floor_ft, elev, evaluate)
    mda = steps[-1].mda_ft
    controlling = None
    controlled_by = CONTROLLED_BY_LOWEST_HEIGHT
    if idx is not None:
        ob = fld.obstacles[idx]
        controlling = ControllingObstacle(name=ob.name, elevation_ft=ob.elevation_ft, xy_m=ob.xy_m,
                                          distance_nm=float(fld.distance_m[idx]) * M_TO_NM)
        if ob.elevation_ft + roc.clearance_ft >= floor_ft:
            controlled_by = CONTROLLED_BY_OBSTACLE
    return PracticeCategoryMinimum(
        category=category, criteria=criteria, airport_elevation_ft=elev,
        radius_nm=radius.radius_nm, radius_basis=radius.basis, radius_provenance=radius.provenance,
        radius_source=radius.source, mda_band=radius.mda_band, steps=tuple(steps), controlling=controlling,
        ignored_in_sectors=ignored, obstacle_clearance_ft=roc.clearance_ft,
        obstacle_clearance_provenance=roc.provenance, obstacle_clearance_source=roc.source,
        lowest_height_ft=lowest.height_ft, lowest_height_provenance=lowest.provenance,
        lowest_height_source=lowest.source, mda_unrounded_ft=raw, controlled_by=controlled_by,
        rounding_increment_ft=rule.increment_ft, rounding_provenance=rule.provenance,
        rounding_source=rule.source, mda_ft=mda, haa_ft=mda - elev, visibility_sm=vis.visibility_sm,
        visibility_m=vis.visibility_m, visibility_provenance=vis.provenance, visibility_source=vis.source,
        visibility_note=vis.note)


def practice_minimums(*, criteria: str, centres_m: Any, airport_elevation_ft: float,
                      obstacles: Sequence[ObstaclePoint] = (), excluded: Sequence[geometry.Sector] = (),
                      categories: Sequence[str] = cr.CATEGORIES) -> tuple[PracticeCategoryMinimum, ...]:
    """`practice_minimum` for several categories (default A to E); see it for the parameters."""
    return tuple(practice_minimum(c, criteria=criteria, centres_m=centres_m, airport_elevation_ft=airport_elevation_ft,
                                  obstacles=obstacles, excluded=excluded) for c in categories)


# --------------------------------------------------------------------------------------------
# From the airfield model
# --------------------------------------------------------------------------------------------
def _sector_text(sector: Any) -> str:
    return f"not authorised {sector.where_text()}" + (f" ({sector.reason})" if sector.reason else "")


def practice_minimums_for_airfield(airfield: Airfield, *, criteria: str | None = None,
                                   approach: Approach | str | None = None,
                                   categories: Sequence[str] = cr.CATEGORIES) -> PracticeMinimums:
    """Practice circling minimums of an airfield model for each category.

    Parameters
    ----------
    airfield : briefer.model.Airfield
        The airfield: every runway threshold is a usable threshold, every charted obstacle is
        considered.
    criteria : str, optional
        The criteria set; default: the approach's own, or (no approach) the set of the
        airfield's first approach.
    approach : Approach or str, optional
        An approach (or its name): its not-authorised sectors are applied and its published
        circling line is shown for comparison.
    categories : sequence of str
        The categories to compute (default A to E).

    Returns
    -------
    PracticeMinimums

    Raises
    ------
    DomainError
        For an unknown approach, category or criteria set.

    Notes
    -----
    Geometry as `briefer.brief` builds it (`briefer.core.airfield_geometry.AirfieldGeometry`):
    the airfield's local frame, bearings sectors turned from magnetic to true by the airfield's
    variation, side sectors as half-planes of the runway centreline. See `practice_minimum` for the computation.
    """
    appr = airfield.approach(approach) if isinstance(approach, str) else approach
    if criteria is None:
        if appr is not None:
            crit, basis = appr.criteria, f"the criteria of {appr.name}"
        else:
            first = airfield.approaches[0]
            crit, basis = first.criteria, f"the criteria of the airfield's first approach ({first.name})"
    else:
        crit, basis = cr.check_criteria(criteria), "chosen"
    geo = AirfieldGeometry(airfield)  # every position in the local frame, the centres and sectors
    centres = geo.arc_centres_m(crit)
    obstacles = tuple(ObstaclePoint(name=ob.name, xy_m=(float(p[0]), float(p[1])), elevation_ft=ob.elevation_ft)
                      for ob, p in zip(airfield.obstacles, geo.obstacles_xy_m()))
    sectors = tuple(appr.not_authorised_sectors) if appr is not None else ()
    excluded = geo.sectors(appr)
    results = []
    for cat in categories:
        res = practice_minimum(cr.check_category(cat.upper()), criteria=crit, centres_m=centres,
                               airport_elevation_ft=airfield.elevation_ft, obstacles=obstacles, excluded=excluded)
        if appr is not None:
            entry = appr.circling_entry(res.category)
            if entry is None:
                res = _with_published(res, None, None, f"{appr.name}: no circling line for Cat {res.category}")
            elif entry.not_authorised:
                res = _with_published(res, None, None, f"{appr.name}: Cat {res.category} not authorised")
            else:
                vis_sm = entry.visibility_sm if entry.visibility_sm is not None else (
                    entry.visibility_as_charted_m * M_TO_SM)
                res = _with_published(res, entry.mda_ft, vis_sm, f"{appr.name} (invented demo chart)")
        results.append(res)
    notes = [
        "Computed from the criteria and the airfield's charted obstacles for practice: a real "
        "procedure also accounts for terrain, vegetation, the instrument segments and the designer's "
        "judgement, so its minimums may be higher.",
        "Every runway threshold is taken as usable for the circling area.",
    ]
    if any(rw.displaced for rw in airfield.runways):
        notes.append("A threshold is displaced: " + cr.circling_arc_centre(crit).text)
    if crit == "terps-expanded":
        notes.append("The expanded radius depends on the MDA itself: the MDA was iterated until the radius "
                     "band settled (the least self-consistent MDA).")
    if crit == "icao":
        notes.append("ICAO: the OCA/H is also not below that of the instrument approach leading to the "
                     "circle; that is not applied here.")
    if crit in cr.TERPS_CRITERIA:
        notes.append("TERPS visibility: the criteria's floor at the lowest HAA; the published value grows "
                     "with the HAA.")
    return PracticeMinimums(
        airfield_ident=airfield.ident, airfield_name=airfield.name, airport_elevation_ft=airfield.elevation_ft,
        criteria=crit, criteria_basis=basis, approach_name=None if appr is None else appr.name,
        sectors=tuple(_sector_text(s) for s in sectors), categories=tuple(results), notes=tuple(notes))


def _with_published(res: PracticeCategoryMinimum, mda_ft: float | None, vis_sm: float | None,
                    note: str) -> PracticeCategoryMinimum:
    from dataclasses import replace

    return replace(res, published_mda_ft=mda_ft, published_visibility_sm=vis_sm, published_note=note)
