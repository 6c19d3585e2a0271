"""The brief's header (what was briefed) and the runways as drawn."""

from __future__ import annotations

from briefer.brief.situation_inputs import Situation
from briefer.core import geometry
from briefer.result import BriefHeader, RunwayDrawing, frozen_array


def brief_header(s: Situation) -> BriefHeader:
    """Airfield, approach, landing runway, profile, configuration, criteria and weight briefed."""
    request = s.request
    prof, cfg, af, appr = request.profile, s.configuration, request.airfield, s.approach
    return BriefHeader(airfield_ident=af.ident, airfield_name=af.name, approach_name=appr.name,
                       landing_runway=request.landing_runway, profile_name=prof.name,
                       configuration_name=cfg.name, criteria=request.options.criteria or appr.criteria,
                       airfield_elevation_ft=af.elevation_ft, magnetic_variation_deg=af.magnetic_variation_deg,
                       weight_lb=request.landing_weight_lb)


def runway_drawings(s: Situation) -> tuple[RunwayDrawing, ...]:
    """Every runway's two thresholds in the local frame, the landing one marked; the runway end
    behind a displaced threshold too."""
    runways = []
    for rw in s.request.airfield.runways:
        a, b = s.thresholds_xy[rw.threshold_a.designator], s.thresholds_xy[rw.threshold_b.designator]
        ends = [frozen_array(geometry.runway_end_xy(p, q, th.displaced_m)) if th.displaced_m > 0 else None
                for p, q, th in ((a, b, rw.threshold_a), (b, a, rw.threshold_b))]
        runways.append(RunwayDrawing(designator=rw.designator, a_xy_m=frozen_array(a), b_xy_m=frozen_array(b),
                                     landing=rw.matches(s.request.landing_runway),
                                     a_end_xy_m=ends[0], b_end_xy_m=ends[1]))
    return tuple(runways)
