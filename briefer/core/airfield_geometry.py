"""An airfield's plane geometry, composed once: its positions in the local frame (the airfield's
`briefer.core.layout.Layout`, from coordinates or chart numbers), the landing runway's axes, the
circling area's arc centres under a criteria set, the charted not-authorised sectors, and the
protected area.

Every part of the tool that needs the area or a runway's axes (the brief, practice minimums,
scenario generation) asks this one object, so the composition layout -> thresholds -> centres ->
sectors -> area is written once.

References
----------
.. [1] FAA, Aeronautical Information Manual, 5-4-20(b)(1): arcs about each runway end joined by
   tangents.
.. [2] ICAO Doc 8168 (PANS-OPS), 5th ed., 2006, Vol II, Part I, Section 4, Chapter 7, 7.2.1
   (arcs about each usable runway threshold) and Vol I, Part I, Section 4, Chapter 7, 7.3.4
   (excluded sectors).
"""

from __future__ import annotations

from briefer._dataclass import dataclass, field
from typing import Any

import numpy as np
TYPE_CHECKING = False
if TYPE_CHECKING:    # numpy.typing for the type checker only (its import is slow)
    import numpy.typing as npt

from briefer.core import criteria as cr
from briefer.core import geometry

__all__ = ["AirfieldGeometry"]


@dataclass(frozen=True, slots=True)
class AirfieldGeometry:
    """The plane geometry of one airfield (a `briefer.model.Airfield`, duck-typed: its
    ``layout``, ``runways``, ``obstacles``, ``magnetic_variation_deg``).

    Attributes
    ----------
    airfield : Airfield
    thresholds_xy_m : dict of str -> ndarray, shape (2,)
        Every landing threshold by designator, as the layout places it (derived). [m]
    """

    airfield: Any
    thresholds_xy_m: dict[str, npt.NDArray[np.float64]] = field(init=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "thresholds_xy_m", {
            d: np.array(p, dtype=float) for d, p in self.airfield.layout.thresholds_m.items()})

    @property
    def layout(self) -> Any:
        """The airfield's `briefer.core.layout.Layout` (frame, origin, every position)."""
        return self.airfield.layout

    def fixes_xy_m(self, approach: Any) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
        """The approach's final approach fix and missed approach point. [m]"""
        faf, map_fix = self.airfield.layout.fixes_m[approach.name]
        return np.array(faf, dtype=float), np.array(map_fix, dtype=float)

    def obstacles_xy_m(self) -> list[npt.NDArray[np.float64]]:
        """Every obstacle's position, in the order of ``airfield.obstacles``. [m]"""
        return [np.array(p, dtype=float) for p in self.airfield.layout.obstacles_m]

    def runway(self, designator: str) -> geometry.RunwayFrame:
        """Axes of the runway landed on at `designator` (landing course true, length)."""
        return self.runway_of_ends(*self.airfield.runway_by_designator(designator))

    def runway_of_ends(self, land: Any, opposite: Any) -> geometry.RunwayFrame:
        """`runway` of the thresholds already looked up (landing, opposite)."""
        return geometry.runway_axes(self.thresholds_xy_m[land.designator], self.thresholds_xy_m[opposite.designator])

    def runway_ends_xy_m(self, runway: Any) -> tuple[npt.NDArray[np.float64], npt.NDArray[np.float64]]:
        """The two thresholds of a runway (``threshold_a``, ``threshold_b``). [m]"""
        return self.thresholds_xy_m[runway.threshold_a.designator], self.thresholds_xy_m[runway.threshold_b.designator]

    def arc_centres_m(self, criteria: str) -> npt.NDArray[np.float64]:
        """The circling-area arc centres under a criteria set: runway ends (TERPS [1]_) or landing
        thresholds (PANS-OPS [2]_), see `briefer.core.criteria.circling_arc_centre`. [m]"""
        on_ends = cr.circling_arc_centre(criteria).centre == cr.ARC_CENTRE_RUNWAY_END
        return geometry.circling_centres_m(self.airfield, self.thresholds_xy_m, on_runway_ends=on_ends)

    def sectors(self, approach: Any | None) -> tuple[geometry.Sector, ...]:
        """The approach's charted not-authorised sectors (none without an approach)."""
        if approach is None:
            return ()
        return tuple(geometry.charted_sector(s, self.airfield, self.thresholds_xy_m)
                     for s in approach.not_authorised_sectors)

    def area(self, *, criteria: str, radius_m: float, approach: Any | None = None) -> geometry.ProtectedArea:
        """The protected area: arcs of `radius_m` about the criteria's centres, the approach's
        sectors cut out."""
        on_ends = cr.circling_arc_centre(criteria).centre == cr.ARC_CENTRE_RUNWAY_END     # as arc_centres_m
        centres = geometry._circling_centre_pairs(self.airfield, self.thresholds_xy_m, on_runway_ends=on_ends)
        return geometry.ProtectedArea(centres_m=centres, radius_m=radius_m, excluded=self.sectors(approach))
