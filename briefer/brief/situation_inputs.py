"""The composed inputs of one request (`Situation`), shared by every section of the brief and by
the wind envelope: positions, category, minimums, area, atmosphere at the MDA, TAS and the plan
solver's inputs, each computed once.

Choices made here where the issues are silent (said again in the output where it matters):
- The circling speed is the configuration's circling speed scaled to the landing weight
  (sqrt(W/Wref)) plus the profile's wind additive; it sets the category (14 CFR 97.3).
- Missing temperature: ISA at the field; missing altimeter: standard pressure. A variable wind
  is planned as calm (and counts as a tailwind for the additive).
- Not authorised: the plan is still solved at the criteria's lowest circling height (the turn the
  performance figures describe), but the brief recommends no plan and draws no planned picture.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from briefer._dataclass import dataclass

import numpy as np

from briefer import units
from briefer.core import atmosphere, criteria, geometry, maneuver, turn, wind
from briefer.core.airfield_geometry import AirfieldGeometry
from briefer.core.layout import Layout
from briefer.model import Approach, BriefRequest, Configuration, Threshold

STANDARD_ALTIMETER_HPA = 1013.25
EDGE_TOLERANCE_M = 1.0   # a track on a sector's edge (e.g. the centreline of a side sector) is authorised
UNREPORTED_VISIBILITY_FACTOR = 3.0   # x area radius: a visibility that never limits a plan


@dataclass(frozen=True, slots=True)
class Situation:
    """What the plan solver and the envelope share: the composed inputs of one request."""

    request: BriefRequest
    approach: Approach                # request.selected_approach(), looked up once
    layout: Layout                    # every threshold, fix and obstacle in the local frame
    runway: geometry.RunwayFrame
    landing_threshold: Threshold      # the landing runway's threshold (request.landing_runway)
    area: geometry.ProtectedArea
    area_rw: geometry.ProtectedArea   # the same area in runway axes: (right_m, along_m) as (east, north)
    area_radius: criteria.AreaRadius
    inputs: maneuver.CircleInputs
    visibility_m: float
    visibility_reported: bool
    bank_limit_deg: float
    aoa_margin_fn: Callable[[float], float]
    category: criteria.CategoryDetermination
    mda_ft: float | None
    plan_mda_ft: float
    circling_ias_kt: float
    wind_additive_kt: float
    wind_from_true: float | None
    wind_speed_kt: float
    oat_c: float
    altimeter_hpa: float
    thresholds_xy: dict[str, np.ndarray]   # every threshold's local position, by designator
    pressure_altitude_ft: float            # at the MDA (or the plan's height when not authorised)
    oat_at_mda_c: float
    headwind_kt: float                     # steady, on the landing runway; a variable wind counts as tailwind
    crosswind_kt: float                    # steady, from the right, on the landing runway (0 for a variable wind)
    configuration: Configuration          # request.selected_configuration(), looked up once
    airfield_geometry: AirfieldGeometry    # runway axes, arc centres, sectors, area: the one composition
    category_speed_kt: float               # profile.approach_category_speed_kt(): the speed that fixes the category

    @property
    def circling_authorised(self) -> bool:
        """Whether the approach publishes circling minimums for the category flown (else no plan)."""
        return self.mda_ft is not None

    def track_local(self, track_rw: np.ndarray) -> np.ndarray:
        track_rw = np.asarray(track_rw, dtype=float).reshape(-1, 2)
        return self.runway.from_runway_coords(track_rw[:, 0], track_rw[:, 1])

    def margin_fn(self, track_rw: np.ndarray) -> float:
        """Smallest protected-area margin [m] of one runway-frame track (N, 2)."""
        return float(self.margins_fn(np.asarray(track_rw, dtype=float)[None, ...])[0][0])

    def margins_fn(self, tracks_rw: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Vectorised: tracks (..., N, 2) in the runway frame -> the smallest margin of each (...)
        and whether a not-authorised sector sets it.

        The area's one track-margin rule (`ProtectedArea.track_margins_m`) with a sector edge
        tolerance of EDGE_TOLERANCE_M: a not-authorised sector is a hard limit once entered, but
        flying along its edge (a side sector's edge is the centreline, where the final is flown)
        does not shrink the margin.
        """
        pts = np.asarray(tracks_rw, dtype=float)[..., ::-1]      # (right, along): runway axes as (east, north)
        return self.area_rw.track_margins_m(pts, sector_edge_tolerance_m=EDGE_TOLERANCE_M)


def situation(request: BriefRequest) -> Situation:
    """Compose the inputs every part of the brief shares. Raises DomainError only for
    inputs outside the physical models' validity (never for a case that cannot be flown)."""
    prof, cfg, af, appr = (request.profile, request.selected_configuration(), request.airfield,
                           request.selected_approach())
    var = af.magnetic_variation_deg
    crit = request.options.criteria or appr.criteria
    weight_factor = prof.weight_speed_factor(request.landing_weight_lb)

    geo = AirfieldGeometry(af)
    layout, xy = af.layout, geo.thresholds_xy_m
    land, opp = af.runway_by_designator(request.landing_runway)
    rf = geo.runway_of_ends(land, opp)

    wx = request.weather
    wind_from = wx.wind_from_deg_true(var)
    speed = wx.wind_speed_kt or 0.0
    if wind_from is None:
        speed_for_plan = 0.0
        headwind = -speed          # variable: worst case for the additive and tailwind checks
        crosswind = 0.0
    else:
        speed_for_plan = speed
        comp = wind.wind_components_kt(wind_from, speed, course_deg=rf.landing_course_deg_true)
        headwind, crosswind = float(comp.headwind_kt), float(comp.crosswind_from_right_kt)
    additive = 0.0
    if request.options.apply_wind_additive:
        additive = prof.wind_additive.additive_kt(headwind_kt=headwind, gust_increment_kt=wx.gust_increment_kt)
    circling_ias = cfg.circling_speed_kt * weight_factor + additive
    category_speed = prof.approach_category_speed_kt()
    det = criteria.category_for_approach(vref_kt=category_speed,
                                         circling_speed_kt=circling_ias, criteria=crit)
    entry = appr.circling_minimum(det.category)
    mda = entry.mda_ft if entry is not None else None
    # Not authorised: the plan is still drawn at the criteria's lowest height, to show the turn.
    plan_mda = mda if mda is not None else (
        af.elevation_ft + criteria.minimum_circling_height_ft(det.category, criteria=crit).height_ft)

    radius = criteria.circling_area_radius_nm(det.category, criteria=crit, mda_ft_msl=plan_mda,
                                              airport_elevation_ft=af.elevation_ft)
    area = geo.area(criteria=crit, radius_m=radius.radius_nm * units.NM_TO_M, approach=appr)

    area_rw = geometry.area_in_runway_axes(area, rf)

    oat = wx.oat_c if wx.oat_c is not None else float(atmosphere.isa_temperature_c(af.elevation_ft))
    alt_hpa = wx.altimeter_hpa if wx.altimeter_hpa is not None else STANDARD_ALTIMETER_HPA
    pa = float(atmosphere.pressure_altitude_ft(plan_mda, altimeter_hpa=alt_hpa))
    oat_mda = float(atmosphere.oat_at_altitude_c(oat, surface_elevation_ft=af.elevation_ft, altitude_ft=plan_mda))
    tas = float(atmosphere.tas_from_cas_kt(circling_ias, pressure_altitude_ft=pa, oat_c=oat_mda))
    bank = request.bank_deg if request.bank_deg is not None else cfg.bank_target_deg

    # the missed approach point as two floats (fixes_xy_m's array read as one point: the same floats)
    ax, ay = rf.to_runway_coords(tuple(map(float, layout.fixes_m[appr.name][1])))
    arrival_course = (geometry.true_from_magnetic_deg(appr.final_course_deg_mag, var)   # angles.wrap_360 of a float
                      - rf.landing_course_deg_true) % 360.0
    rel_wind = 0.0 if wind_from is None else float(wind_from - rf.landing_course_deg_true)
    inputs = maneuver.CircleInputs(
        tas_kt=tas, bank_deg=min(bank, 60.0), wind=maneuver.runway_wind_from(rel_wind, speed_for_plan),
        arrival_x_m=float(ax), arrival_y_m=float(ay), arrival_course_deg=arrival_course,
        circling_height_ft=plan_mda - land.elevation_ft, glide_path_deg=land.glide_path_deg, tch_ft=land.tch_ft,
        stabilised_height_ft=request.stabilised_height_ft, roll_rate_deg_per_s=prof.roll_rate_deg_per_s,
        runway_length_m=float(rf.length_m))

    if wx.visibility_sm is not None:
        vis_m, vis_reported = wx.visibility_sm * units.SM_TO_M, True
    else:
        # Not reported: visibility does not constrain the plan (the brief says it was not checked).
        vis_m, vis_reported = UNREPORTED_VISIBILITY_FACTOR * radius.radius_nm * units.NM_TO_M, False
    weight_ratio = request.landing_weight_lb / prof.reference_weight_lb

    aoa_by_bank: dict[float, float] = {}     # ranked once per plan at a few bank levels: computed once each

    def aoa_margin(bank_deg: float) -> float:
        m = aoa_by_bank.get(bank_deg)
        if m is None:
            m = aoa_by_bank[bank_deg] = cfg.aoa_stall - float(turn.angle_of_attack_in_turn(
                circling_ias, bank_deg, vref_kt=cfg.vref_kt, vs1g_kt=cfg.vs1g_kt, aoa_ref=cfg.aoa_ref,
                aoa_stall=cfg.aoa_stall, weight_ratio=weight_ratio))
        return m

    return Situation(request=request, approach=appr, layout=layout, runway=rf, landing_threshold=land, area=area, area_rw=area_rw, area_radius=radius,
                     inputs=inputs,
                     visibility_m=float(vis_m), visibility_reported=vis_reported,
                     bank_limit_deg=cfg.bank_limit_deg, aoa_margin_fn=aoa_margin, category=det, mda_ft=mda,
                     plan_mda_ft=plan_mda, circling_ias_kt=circling_ias, wind_additive_kt=additive,
                     wind_from_true=wind_from, wind_speed_kt=speed, oat_c=oat, altimeter_hpa=alt_hpa,
                     thresholds_xy=xy, pressure_altitude_ft=pa, oat_at_mda_c=oat_mda, headwind_kt=headwind, crosswind_kt=crosswind, configuration=cfg,
                     airfield_geometry=geo, category_speed_kt=category_speed)
