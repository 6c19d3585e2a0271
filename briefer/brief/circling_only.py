"""Why an approach is circling-only (alignment, descent gradient), and whether straight-in
minimums are published for the landing runway."""

from __future__ import annotations

import numpy as np

from briefer import units
from briefer.brief.situation_inputs import Situation
from briefer.core import criteria, geometry
from briefer.result import CirclingOnly


def circling_only_reasons(s: Situation, category: str, crit: str) -> tuple[tuple[CirclingOnly, ...], bool]:
    """Why the approach is circling-only (alignment, gradient), measured against the runway the
    procedure serves, or the best-aligned runway when it serves none; and whether a straight-in
    is published for the landing runway and allowed by the criteria."""
    request = s.request
    appr = s.approach
    af, var = request.airfield, request.airfield.magnetic_variation_deg
    final_true = geometry.true_from_magnetic_deg(appr.final_course_deg_mag, var)
    best = None
    for rw in af.runways:
        for des in (rw.threshold_a.designator, rw.threshold_b.designator):
            if appr.runway is not None and des != appr.runway:
                continue
            thr, opp = af.runway_by_designator(des)
            a = s.thresholds_xy[thr.designator]
            rf = s.runway if thr is s.landing_threshold else s.airfield_geometry.runway_of_ends(thr, opp)
            course = rf.landing_course_deg_true
            diff = abs((final_true - course + 180.0) % 360.0 - 180.0)    # angles.wrap_180 of two floats
            if best is None or diff < best[0]:
                best = (diff, thr, a, course)
    _, thr, a, course = best
    # the final approach fix's floats (`AirfieldGeometry.fixes_xy_m`'s array, its .tolist(), without the array)
    (fe, fn), (ae, an) = map(float, s.layout.fixes_m[appr.name][0]), a.tolist()
    dist_nm = float(np.hypot(fe - ae, fn - an)) * units.M_TO_NM     # (faf - a)'s two differences, on floats
    gradient = 0.0
    if appr.faf.altitude_ft is not None and dist_nm > 0:
        gradient = float(criteria.descent_gradient_ft_per_nm(faf_altitude_ft=appr.faf.altitude_ft,
                                                             threshold_elevation_ft=thr.elevation_ft,
                                                             tch_ft=thr.tch_ft, distance_nm=dist_nm))
    assess = criteria.straight_in_assessment(final_course_deg=final_true, runway_course_deg=course,
                                             gradient_ft_per_nm=gradient, category=category, criteria=crit,
                                             rnav_gps=appr.rnav_gps)
    reasons = tuple(CirclingOnly(code=r.code, text=r.text, value=float(r.value), limit=float(r.limit))
                    for r in assess.reasons)
    if appr.runway is None and not reasons:
        reasons = (CirclingOnly(code="no-runway", text="the procedure serves no runway",
                                value=0.0, limit=0.0),)
    straight_in = (assess.straight_in_allowed and appr.straight_in is not None
                   and appr.straight_in.runway == request.landing_runway)
    return reasons, straight_in
