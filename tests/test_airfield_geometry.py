"""The one layout -> runway axes -> centres -> sectors -> area composition (core.airfield_geometry).

Reference: geographiclib (C. F. F. Karney, "Algorithms for geodesics," J. Geodesy 87, 2013) for
distances and azimuths on WGS-84; AIM 5-4-20(b)(1) for the arcs about each runway end.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from geographiclib.geodesic import Geodesic

from briefer.core.airfield_geometry import AirfieldGeometry
from briefer.io import catalog

AIRFIELDS = sorted(e.name for e in catalog.list_airfields(use_config=False) if e.builtin and e.error is None)


@pytest.mark.parametrize("name", AIRFIELDS)
def test_thresholds_and_runway_axes_agree_with_the_geodesic(name):
    """Each runway's length and landing course from the local frame agree with the WGS-84
    geodesic between its thresholds (0.5 m; 0.05 deg after the meridian convergence, which is
    under 0.01 deg within 5 km of the reference point at these latitudes)."""
    af = catalog.find_airfield(name, use_config=False)
    if af.reference_point is None or any(t.lat_deg is None for t in af.thresholds):
        pytest.skip("an airfield in chart form: no coordinates to compare with")
    geo = AirfieldGeometry(af)
    assert set(geo.thresholds_xy_m) == {t.designator for t in af.thresholds}
    for rw in af.runways:
        a, b = rw.threshold_a, rw.threshold_b
        g = Geodesic.WGS84.Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg)
        axes = geo.runway(a.designator)
        assert axes.length_m == pytest.approx(g["s12"], abs=0.5)
        assert math.remainder(axes.landing_course_deg_true - g["azi1"], 360.0) == pytest.approx(0.0, abs=0.05)
        ea, eb = geo.runway_ends_xy_m(rw)
        assert np.hypot(*(eb - ea)) == pytest.approx(g["s12"], abs=0.5)


@pytest.mark.parametrize("name", AIRFIELDS)
def test_area_is_built_about_the_arc_centres_with_the_sectors_cut(name):
    """The area: arcs of R about every threshold (no demo threshold is displaced, so the TERPS
    runway ends and the ICAO thresholds coincide), each approach's sectors cut out."""
    af = catalog.find_airfield(name, use_config=False)
    geo = AirfieldGeometry(af)
    for crit in ("terps-legacy", "icao"):
        assert np.allclose(geo.arc_centres_m(crit), np.array(list(geo.thresholds_xy_m.values())))
    for appr in af.approaches:
        area = geo.area(criteria=appr.criteria, radius_m=3000.0, approach=appr)
        assert area.radius_m == 3000.0
        assert len(area.excluded) == len(appr.not_authorised_sectors)
    assert geo.sectors(None) == ()
