"""`build_brief(request) -> Brief`: the one place that composes the core.

It never raises for a valid request: situations that cannot be flown (category not authorised,
no plan fits the bank limit, the plan leaves the protected area, ceiling below the MDA, the MDA
too close to the controlling obstacle) become findings in the Brief, most severe first.

Choices made here where the issues are silent (said again in the output where it matters):
- The circling speed is the configuration's circling speed scaled to the landing weight
  (sqrt(W/Wref)) plus the profile's wind additive; it sets the category (14 CFR 97.3).
- HAA is the MDA minus the airfield elevation; the circle's height for the glide path is the
  MDA minus the landing threshold elevation.
- Missing temperature: ISA at the field; missing altimeter: standard pressure (both reported
  as findings). A variable wind is planned as calm and flagged.
- The cold-temperature correction is shown when the reported temperature is at or below 0 °C,
  by the method the request names (default: the table method, the more conservative).
- The sight-picture comparison is made in still air (the planned offset comes from the plan,
  which is solved in the actual wind).
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass, replace
from datetime import datetime, timezone

import numpy as np

from briefer import units
from briefer.cautions import CAUTIONS
from briefer.core import atmosphere, coldtemp, criteria, geometry, maneuver, sightpicture, turn, wind
from briefer.errors import DomainError
from briefer.model import Approach, BriefRequest, Sector
from briefer.result import (
    Alternative, AreaInfo, Brief, BriefHeader, CategoryInfo, CirclingOnly, ColdCorrection, Finding,
    MinimumsInfo, MissedApproachInfo, ObstacleDrawing, PerformanceInfo, PlanInfo, RunwayDrawing,
    SightPictureInfo, WeatherUsed, WindInfo, frozen_array,
)

STANDARD_ALTIMETER_HPA = 1013.25
COLD_CORRECTION_AT_OR_BELOW_C = 0.0
TAILWIND_WARNING_KT = 2.0
EDGE_TOLERANCE_M = 1.0
CENTRELINE_BAND_M = 30.0   # points this close to the extended centreline are "on the final"
UNREPORTED_VISIBILITY_FACTOR = 3.0   # x area radius: a visibility that never limits a plan     # a track on a sector's edge (e.g. the centreline of a side sector) is authorised
STALL_MARGIN_WARNING_PCT = 15.0

SHAPE_TEXT = {
    "downwind-join": "Join a downwind, 180° turn to final",
    "break-and-return": "Break off, fly downwind, 180° turn to final",
    "teardrop": "Pass the field, teardrop turn back to final",
    "direct-turn": "Turn directly onto final",
    "overfly-circuit": "Overfly, turn onto a downwind, 180° turn to final",
}


@dataclass(frozen=True, slots=True)
class Situation:
    """What the plan solver and the envelope share: the composed inputs of one request."""

    request: BriefRequest
    frame: geometry.LocalFrame
    runway: geometry.RunwayFrame
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

    def track_local(self, track_rw: np.ndarray) -> np.ndarray:
        track_rw = np.asarray(track_rw, dtype=float).reshape(-1, 2)
        return self.runway.from_runway_coords(track_rw[:, 0], track_rw[:, 1])

    def margin_fn(self, track_rw: np.ndarray) -> float:
        """Smallest protected-area margin [m] of one runway-frame track (N, 2)."""
        return float(self.margins_fn(np.asarray(track_rw, dtype=float)[None, ...])[0])

    def margins_fn(self, tracks_rw: np.ndarray) -> np.ndarray:
        """Vectorised: tracks (..., N, 2) in the runway frame -> smallest margin of each (...).

        The margin is the distance left to the radius boundary. A not-authorised sector is a
        hard limit: a point more than EDGE_TOLERANCE_M inside one makes the margin minus its
        depth, but flying along its edge (a side sector's edge is the centreline, where the
        final is flown) does not shrink the margin.
        """
        tracks_rw = np.asarray(tracks_rw, dtype=float)
        pts = tracks_rw.reshape(-1, 2)[:, ::-1]          # (right, along): runway axes as (east, north)
        margin = self.area_rw.radius_m - np.asarray(self.area_rw.distance_to_hull_m(pts), dtype=float)
        for sec in self.area_rw.excluded:
            clear = np.asarray(sec.clearance_m(pts), dtype=float)
            margin = np.where(clear < -EDGE_TOLERANCE_M, np.minimum(margin, clear), margin)
        return margin.reshape(tracks_rw.shape[:-1]).min(axis=-1)


def _true(deg_mag: float, variation_deg: float) -> float:
    return float(units.wrap_360(deg_mag + variation_deg))


def _mag(deg_true: float, variation_deg: float) -> float:
    return float(units.wrap_360(deg_true - variation_deg))


def _sector_text(sector: Sector) -> str:
    return f"Circling not authorised {sector.where_text()}" + (f": {sector.reason}" if sector.reason else "")


def _area_in_runway_axes(area: geometry.ProtectedArea, rf: geometry.RunwayFrame) -> geometry.ProtectedArea:
    """The protected area rotated into runway axes, with (right_m, along_m) playing (east_m,
    north_m): a rotation (both frames have 'right' clockwise of 'ahead'), so distances, sides
    and clockwise bearing ranges carry over, bearings measured from the landing course. The
    envelope measures its many tracks here without converting each point back."""
    def pseudo(p) -> tuple[float, float]:
        along, right = rf.to_runway_coords(np.asarray(p, dtype=float))
        return float(right), float(along)

    course = rf.landing_course_deg_true
    sectors: list[geometry.Sector] = []
    for sec in area.excluded:
        if isinstance(sec, geometry.BearingSector):
            sectors.append(geometry.BearingSector(centre_m=pseudo(sec.centre_m),
                                                  from_deg_true=float(units.wrap_360(sec.from_deg_true - course)),
                                                  to_deg_true=float(units.wrap_360(sec.to_deg_true - course))))
        else:
            sectors.append(geometry.SideSector(line_a_m=pseudo(sec.line_a_m), line_b_m=pseudo(sec.line_b_m),
                                               side=sec.side))
    return geometry.ProtectedArea(centres_m=[pseudo(c) for c in area.centres_m], radius_m=area.radius_m,
                                  excluded=tuple(sectors))


def situation(request: BriefRequest) -> Situation:
    """Compose the inputs every part of the brief shares. Raises DomainError only for
    inputs outside the physical models' validity (never for a case that cannot be flown)."""
    prof, cfg, af, appr = (request.profile, request.selected_configuration(), request.airfield,
                           request.selected_approach())
    var = af.magnetic_variation_deg
    crit = request.options.criteria or appr.criteria
    weight_factor = prof.weight_speed_factor(request.landing_weight_lb)

    frame = geometry.LocalFrame(lat0_deg=af.reference_point.lat_deg, lon0_deg=af.reference_point.lon_deg)
    xy = {t.designator: np.array(frame.to_local(t.lat_deg, t.lon_deg), dtype=float) for t in af.thresholds}
    land, opp = af.runway_by_designator(request.landing_runway)
    rf = geometry.runway_axes(xy[land.designator], xy[opp.designator])

    wx = request.weather
    wind_from = wx.wind_from_deg_true(var)
    speed = wx.wind_speed_kt or 0.0
    if wind_from is None:
        speed_for_plan = 0.0
        headwind = -speed          # variable: worst case for the additive and tailwind checks
    else:
        speed_for_plan = speed
        headwind = float(wind.wind_components_kt(wind_from, speed, course_deg=rf.landing_course_deg_true).headwind_kt)
    additive = 0.0
    if request.options.apply_wind_additive:
        additive = prof.wind_additive.additive_kt(headwind_kt=headwind, gust_increment_kt=wx.gust_increment_kt)
    circling_ias = cfg.circling_speed_kt * weight_factor + additive
    det = criteria.category_for_approach(vref_kt=prof.approach_category_speed_kt(),
                                         circling_speed_kt=circling_ias, criteria=crit)
    entry = appr.circling_minimum(det.category)
    mda = entry.mda_ft if entry is not None else None
    # Not authorised: the plan is still drawn at the criteria's lowest height, to show the turn.
    plan_mda = mda if mda is not None else (
        af.elevation_ft + criteria.minimum_circling_height_ft(det.category, criteria=crit).height_ft)

    radius = criteria.circling_area_radius_nm(det.category, criteria=crit, mda_ft_msl=plan_mda,
                                              airport_elevation_ft=af.elevation_ft)
    sectors = tuple(geometry.charted_sector(sec, af, xy) for sec in appr.not_authorised_sectors)
    on_ends = criteria.circling_arc_centre(crit).centre == criteria.ARC_CENTRE_RUNWAY_END
    area = geometry.ProtectedArea(centres_m=geometry.circling_centres_m(af, xy, on_runway_ends=on_ends),
                                  radius_m=radius.radius_nm * units.NM_TO_M, excluded=sectors)

    area_rw = _area_in_runway_axes(area, rf)

    oat = wx.oat_c if wx.oat_c is not None else float(atmosphere.isa_temperature_c(af.elevation_ft))
    alt_hpa = wx.altimeter_hpa if wx.altimeter_hpa is not None else STANDARD_ALTIMETER_HPA
    pa = float(atmosphere.pressure_altitude_ft(plan_mda, altimeter_hpa=alt_hpa))
    oat_mda = float(atmosphere.oat_at_altitude_c(oat, surface_elevation_ft=af.elevation_ft, altitude_ft=plan_mda))
    tas = float(atmosphere.tas_from_cas_kt(circling_ias, pressure_altitude_ft=pa, oat_c=oat_mda))
    bank = request.bank_deg if request.bank_deg is not None else cfg.bank_target_deg

    map_xy = np.array(frame.to_local(appr.map_fix.lat_deg, appr.map_fix.lon_deg), dtype=float)
    ax, ay = rf.to_runway_coords(map_xy)
    arrival_course = float(units.wrap_360(_true(appr.final_course_deg_mag, var) - rf.landing_course_deg_true))
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

    return Situation(request=request, frame=frame, runway=rf, area=area, area_rw=area_rw, area_radius=radius,
                     inputs=inputs,
                     visibility_m=float(vis_m), visibility_reported=vis_reported,
                     bank_limit_deg=cfg.bank_limit_deg, aoa_margin_fn=aoa_margin, category=det, mda_ft=mda,
                     plan_mda_ft=plan_mda, circling_ias_kt=circling_ias, wind_additive_kt=additive,
                     wind_from_true=wind_from, wind_speed_kt=speed, oat_c=oat, altimeter_hpa=alt_hpa,
                     thresholds_xy=xy, pressure_altitude_ft=pa, oat_at_mda_c=oat_mda, headwind_kt=headwind)


def envelope_for(request: BriefRequest, **kwargs) -> maneuver.Envelope:
    """The wind envelope of the request's situation (every 10° x 0-40 kt by default).

    Same rule as the brief: cells where nothing fits at the descent point are solved again
    with the roll-out closer (roll_out_steps_m), and take the first verdict that fits. The
    envelope is an overview: its turns are solved with instant bank (no roll-in ramps), which
    moves a roll-out by a few metres; the brief's own plan keeps the profile's roll rate.
    """
    s = situation(request)
    s = replace(s, inputs=replace(s.inputs, roll_rate_deg_per_s=None))
    common = dict(margin_fn=s.margins_fn, visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                  area_radius_m=s.area_radius.radius_nm * units.NM_TO_M)
    common.update(kwargs)
    env = maneuver.wind_envelope(s.inputs, **common)
    fields = ("status", "reasons", "bank_needed_deg", "best_candidate", "area_margin_m",
              "max_distance_from_runway_m")
    for d in roll_out_steps_m(s.inputs):
        rows = np.flatnonzero(np.any(env.status == maneuver.DOES_NOT_FIT, axis=1))
        if not rows.size:
            break
        sub = dict(common, wind_from_relative_deg=env.wind_from_relative_deg[rows], wind_speed_kt=env.wind_speed_kt)
        closer = maneuver.wind_envelope(replace(s.inputs, roll_out_distance_m=d), **sub)
        merged = {}
        for name in fields:
            arr = np.array(getattr(env, name), copy=True)
            old_rows, new_rows = arr[rows], getattr(closer, name)
            take = (env.status[rows] == maneuver.DOES_NOT_FIT) & (closer.status != maneuver.DOES_NOT_FIT)
            arr[rows] = np.where(take, new_rows, old_rows)
            merged[name] = arr
        env = replace(env, **merged)
    return env


def _circling_only(request: BriefRequest, appr: Approach, s: Situation, category: str,
                   crit: str) -> tuple[tuple[CirclingOnly, ...], bool]:
    """Why the approach is circling-only (alignment, gradient), measured against the runway the
    procedure serves, or the best-aligned runway when it serves none."""
    af, var = request.airfield, request.airfield.magnetic_variation_deg
    final_true = _true(appr.final_course_deg_mag, var)
    best = None
    for rw in af.runways:
        for des in (rw.threshold_a.designator, rw.threshold_b.designator):
            if appr.runway is not None and des != appr.runway:
                continue
            thr, opp = af.runway_by_designator(des)
            a, b = s.thresholds_xy[thr.designator], s.thresholds_xy[opp.designator]
            course = geometry.runway_axes(a, b).landing_course_deg_true
            diff = abs(float(units.wrap_180(final_true - course)))
            if best is None or diff < best[0]:
                best = (diff, thr, a, course)
    _, thr, a, course = best
    faf = np.array(s.frame.to_local(appr.faf.lat_deg, appr.faf.lon_deg))
    dist_nm = float(np.hypot(*(faf - a))) * units.M_TO_NM
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
        reasons = (CirclingOnly(code="no-runway", text="the procedure serves no runway (circling only)",
                                value=0.0, limit=0.0),)
    straight_in = (assess.straight_in_allowed and appr.straight_in is not None
                   and appr.straight_in.runway == request.landing_runway)
    return reasons, straight_in


def _familiar_track(plan: maneuver.Plan, offset_m: float, radius_m: float) -> np.ndarray:
    """The turn the familiar picture gives (still air): a downwind at the familiar offset, the
    planned bank held from the planned roll-in point, then straight ahead (runway frame)."""
    sign = 1.0 if plan.side == "right" else -1.0
    x_ri = plan.roll_in_xy_m[0] if plan.roll_in_xy_m is not None else 0.0
    down = np.column_stack([np.linspace(x_ri + 2500.0, x_ri, 8), np.full(8, sign * offset_m)])
    th = np.linspace(0.0, math.pi, 37)
    turn_pts = np.column_stack([x_ri - radius_m * np.sin(th), sign * (offset_m - radius_m * (1 - np.cos(th)))])
    y_end = sign * (offset_m - 2 * radius_m)
    final = np.column_stack([np.linspace(x_ri, x_ri + 1500.0, 6), np.full(6, y_end)])
    return np.vstack([down, turn_pts, final])


def _empty_xy() -> np.ndarray:
    return frozen_array(np.zeros((0, 2)))


def build_brief(request: BriefRequest, *, computed_utc: str | None = None, weather_report=None) -> Brief:
    """Every number the crew needs for one circling approach (see the module docstring).

    ``weather_report`` is the decoded METAR the weather came from, if any (briefer.io.metar):
    its text is kept in the brief and its variable wind sector, unsure ceiling and skipped
    groups become findings.
    """
    s = situation(request)
    prof, cfg, af, appr = (request.profile, request.selected_configuration(), request.airfield,
                           request.selected_approach())
    var, elev = af.magnetic_variation_deg, af.elevation_ft
    crit = request.options.criteria or appr.criteria
    det = s.category
    cat = det.category
    land, opp = af.runway_by_designator(request.landing_runway)
    weight_ratio = request.landing_weight_lb / prof.reference_weight_lb
    wx = request.weather
    findings: list[Finding] = []

    def add(severity: str, code: str, text: str) -> None:
        findings.append(Finding(severity=severity, code=code, text=text))

    displaced = [t for t in af.thresholds if t.displaced_m > 0]
    if displaced:
        which = ", ".join(f"{t.designator} by {t.displaced_m:.0f} m" for t in displaced)
        add("info", "displaced-threshold", f"Displaced threshold ({which}). "
            + criteria.circling_arc_centre(crit).text)

    # --- category and minimums ---------------------------------------------------------
    if wx.gust_increment_kt > 0 and request.options.apply_wind_additive:
        steady = prof.wind_additive.additive_kt(headwind_kt=s.headwind_kt, gust_increment_kt=0.0)
        steady_ias = s.circling_ias_kt - s.wind_additive_kt + steady
        steady_cat = criteria.category_for_approach(vref_kt=prof.approach_category_speed_kt(),
                                                    circling_speed_kt=steady_ias, criteria=crit).category
        if steady_cat != cat:
            add("warning", "gust-raises-category",
                f"The gust additive raises the circling speed to {s.circling_ias_kt:.0f} kt and the category "
                f"from {steady_cat} to {cat}.")
    if det.raised:
        add("warning", "category-raised",
            f"Circling at {s.circling_ias_kt:.0f} kt IAS puts you in category {cat} (certified "
            f"{det.certified_category}): use the category {cat} minimums and area.")
    entry = appr.circling_minimum(cat)
    authorised = entry is not None
    na_reason = "" if authorised else (appr.circling_not_authorised_reason(cat) or "not authorised")
    if not authorised:
        names_it = re.search(rf"\bcategory\s+{cat}\b", na_reason, flags=re.IGNORECASE) is not None
        lead = "Circling is not authorised" + ("" if names_it else f" for category {cat}")
        add("danger", "not-authorised", f"{lead}: {na_reason.rstrip('.')}.")
    mda = s.mda_ft
    haa = None if mda is None else mda - elev
    vis_req = None
    vis_charted = None
    if entry is not None:
        vis_charted = (f"{entry.visibility_sm:g} SM" if entry.visibility_sm is not None
                       else f"{entry.visibility_m:.0f} m" if entry.visibility_m is not None else None)
        vis_req = entry.visibility_sm if entry.visibility_sm is not None else (
            entry.visibility_as_charted_m * units.M_TO_SM if entry.visibility_as_charted_m is not None else None)
    vis_ok = None if (wx.visibility_sm is None or vis_req is None) else wx.visibility_sm >= vis_req - 1e-9
    ceil_ok = None if (wx.ceiling_ft is None or haa is None) else wx.ceiling_ft >= haa
    if vis_ok is False:
        add("danger", "visibility-below-minimum",
            f"Reported visibility {wx.visibility_sm:g} SM is below the required {vis_charted} "
            f"({vis_req:.2f} SM).")
    if ceil_ok is False:
        add("danger", "ceiling-below-mda",
            f"Reported ceiling {wx.ceiling_ft:.0f} ft is below the circling height ({haa:.0f} ft HAA).")
    lowest = criteria.minimum_circling_height_ft(cat, criteria=crit)
    roc = criteria.circling_obstacle_clearance_ft(cat, criteria=crit)
    if haa is not None and haa < lowest.height_ft:
        add("warning", "below-lowest-height",
            f"HAA {haa:.0f} ft is below the criteria's lowest circling height {lowest.height_ft:.0f} ft "
            f"(value {criteria.provenance_label(lowest.provenance)}).")
    reasons, straight_in = _circling_only(request, appr, s, cat, crit)
    for r in reasons:
        add("info", f"circling-only-{r.code}", f"Circling only: {r.text.rstrip('.')}.")
    if straight_in:
        add("info", "straight-in-published",
            f"Straight-in minimums are published for runway {request.landing_runway}: circle only if you "
            "cannot descend straight in (the plan below is for that case).")

    cold = None
    if wx.oat_c is not None and wx.oat_c <= COLD_CORRECTION_AT_OR_BELOW_C and haa is not None:
        cc = coldtemp.cold_temperature_correction(haa, airport_oat_c=wx.oat_c, airport_elevation_ft=elev,
                                                  method=request.options.cold_temperature_method)
        if cc.applicable and cc.correction_ft > 0:
            cold = ColdCorrection(method=cc.method, correction_ft=float(cc.correction_ft),
                                  corrected_mda_ft=float(mda + cc.correction_ft), oat_c=float(wx.oat_c))
            add("warning", "cold-temperature",
                f"Cold temperature ({wx.oat_c:.0f} °C): add {cc.correction_ft:.0f} ft, fly the MDA as "
                f"{mda + cc.correction_ft:.0f} ft ({cc.method}).")

    # --- obstacles and area ------------------------------------------------------------
    obstacles = []
    controlling = None
    for ob in af.obstacles:
        oxy = np.array(s.frame.to_local(ob.lat_deg, ob.lon_deg), dtype=float)
        inside = bool(s.area.contains(oxy))
        obstacles.append(ObstacleDrawing(name=ob.name, xy_m=frozen_array(oxy), elevation_ft=ob.elevation_ft,
                                         inside_area=inside))
        if inside and (controlling is None or ob.elevation_ft > controlling.elevation_ft):
            controlling = ob
    clearance_actual = None
    if controlling is not None and mda is not None:
        clearance_actual = mda - controlling.elevation_ft
        if clearance_actual < roc.clearance_ft:
            add("danger", "obstacle-clearance",
                f"The MDA clears {controlling.name} ({controlling.elevation_ft:.0f} ft) by only "
                f"{clearance_actual:.0f} ft; the criteria ask for {roc.clearance_ft:.0f} ft.")
    radius = s.area_radius
    if radius.from_memory:
        add("info", "radius-from-memory",
            f"The {crit} radius {radius.radius_nm:.1f} NM is from memory, not checked against the published table.")

    # --- performance -------------------------------------------------------------------
    ias = s.circling_ias_kt
    tas = s.inputs.tas_kt
    pa, oat_mda = s.pressure_altitude_ft, s.oat_at_mda_c
    isa_dev = oat_mda - float(atmosphere.isa_temperature_c(pa))
    bank_target = s.inputs.bank_deg
    tp = turn.turn_performance(tas, bank_target)
    vs_turn = float(turn.stall_speed_in_turn_kt(cfg.vs1g_kt, bank_target, weight_ratio=weight_ratio))
    stall_margin = (ias - vs_turn) / vs_turn * 100.0
    aoa = cfg.aoa_stall - s.aoa_margin_fn(bank_target)
    try:
        stall_bank = float(turn.stall_bank_deg(ias, cfg.vs1g_kt, weight_ratio=weight_ratio))
    except DomainError:
        stall_bank = None
    if stall_margin < STALL_MARGIN_WARNING_PCT:
        add("warning", "stall-margin",
            f"At {bank_target:.0f}° bank the stall speed is {vs_turn:.0f} kt: only {stall_margin:.0f} % below "
            f"the circling speed.")
    if wx.oat_c is None:
        add("info", "oat-assumed", f"No temperature given: ISA at the field ({s.oat_c:.0f} °C) assumed.")
    if wx.altimeter_hpa is None:
        add("info", "altimeter-assumed", "No altimeter setting given: standard pressure assumed.")
    required = criteria.required_radius_nm(tas_kt=tas, wind_kt=max(s.wind_speed_kt, wx.wind_gust_kt or 0.0),
                                           bank_deg=bank_target,
                                           straight_segment_nm=criteria.ICAO_STRAIGHT_SEGMENT_NM[cat])
    if required.radius_nm > radius.radius_nm:
        add("warning", "area-smaller-than-turn",
            f"Your turn today needs {required.radius_nm:.1f} NM of area; the protected area is "
            f"{radius.radius_nm:.1f} NM. Keep the turn tight and inside it.")

    # --- wind ----------------------------------------------------------------------------
    course_true = s.runway.landing_course_deg_true
    if s.wind_from_true is not None:
        comp = wind.wind_components_kt(s.wind_from_true, s.wind_speed_kt, course_deg=course_true)
        hw, xw = float(comp.headwind_kt), float(comp.crosswind_from_right_kt)
    else:
        hw, xw = 0.0 - s.wind_speed_kt, 0.0      # 0 - 0 = +0: no "-0 kt" for calm
    ghw = gxw = None
    if wx.wind_gust_kt is not None and s.wind_from_true is not None:
        gc = wind.wind_components_kt(s.wind_from_true, wx.wind_gust_kt, course_deg=course_true)
        ghw, gxw = float(gc.headwind_kt), float(gc.crosswind_from_right_kt)
    if hw < -TAILWIND_WARNING_KT:
        add("warning", "tailwind", f"Tailwind of {-hw:.0f} kt on runway {request.landing_runway}.")
    if s.wind_from_true is None and s.wind_speed_kt > 0:
        add("warning", "variable-wind", "Variable wind: planned as calm; see the wind envelope for every direction.")
    wind_info = WindInfo(reported=wx.wind_speed_kt is not None and s.wind_speed_kt > 0,
                         from_deg_true=s.wind_from_true, speed_kt=s.wind_speed_kt, gust_kt=wx.wind_gust_kt,
                         headwind_kt=hw, crosswind_from_right_kt=xw, gust_headwind_kt=ghw,
                         gust_crosswind_from_right_kt=gxw)

    # --- the plan ------------------------------------------------------------------------
    choice, roll_out_shortened = _choose(s, radius.radius_nm * units.NM_TO_M)
    best = choice.ranked[0] if choice.ranked else None
    plan = best.plan if best is not None else None
    plan_info, missed = _plan_info(s, choice, best, request, appr, var)
    feasible = plan_info.feasible
    if best is None:
        if straight_in:
            add("info", "straight-in",
                "The arrival is aligned with the landing runway and straight-in minimums are published: "
                "fly the straight-in; no circle is planned.")
        else:
            add("danger", "no-plan-shape",
                "No circling plan applies: the arrival is aligned with the landing runway. Descend straight in "
                "if the runway is in sight in time for a normal descent; otherwise fly the missed approach.")
    elif choice.bank_needed_deg is None:
        add("danger", "no-plan-fits",
            f"No plan passes every check up to the bank limit of {s.bank_limit_deg:.0f}°; the best one, shown, "
            + "fails: " + "; ".join(best.failures or plan.reasons or ("see the alternatives",)) + ".")
    elif choice.bank_needed_deg > bank_target + 1e-6:
        add("warning", "bank-raised",
            f"The plan needs {choice.bank_needed_deg:.0f}° bank, more than the {bank_target:.0f}° target.")
    if feasible and not plan_info.inside_area:
        add("danger", "leaves-area", f"The plan leaves the protected area by {-plan_info.area_margin_nm:.2f} NM.")
    if feasible and plan_info.runway_within_visibility is False:
        add("warning", "beyond-visibility",
            f"The track goes {plan_info.max_distance_from_threshold_nm:.1f} NM from the runway, beyond the "
            f"reported visibility: you may lose sight of it.")
    if best is not None and best.verdict == "marginal":
        add("warning", "plan-marginal", "The plan is marginal: " + "; ".join(best.marginal) + ".")
    if roll_out_shortened and feasible:
        add("info", "roll-out-shortened",
            f"Rolled out at {plan_info.roll_out_distance_nm:.2f} NM final instead of the descent point, "
            f"so that the plan fits the area and the visibility.")
    if feasible and plan_info.leave_mda_in_turn:
        add("info", "descent-in-turn", "The descent from the MDA starts in the final turn: " + plan_info.leave_mda_text)

    # --- sight picture -------------------------------------------------------------------
    fp = prof.familiar_pattern
    fam_offset_nm = fp.offset_nm if fp.offset_nm is not None else 2.0 * float(turn.turn_radius_nm(fp.speed_kt, fp.bank_deg))
    circ_h = s.plan_mda_ft - elev
    planned_offset_nm = plan_info.offset_nm if feasible and plan_info.offset_nm > 0 else 2 * tp.radius_nm
    cmp = sightpicture.compare_sight_picture(
        circling_height_ft=circ_h, planned_offset_nm=planned_offset_nm, familiar_height_ft=fp.height_ft,
        familiar_offset_nm=fam_offset_nm, tas_kt=tas, ias_kt=ias, bank_planned_deg=plan_info.bank_deg,
        bank_limit_deg=s.bank_limit_deg, vs1g_kt=cfg.vs1g_kt, vref_kt=cfg.vref_kt, aoa_ref=cfg.aoa_ref,
        aoa_stall=cfg.aoa_stall, weight_ratio=weight_ratio)
    fam_track = _empty_xy()
    if feasible:
        fam_rw = _familiar_track(plan, cmp.familiar_offset_at_circling_m, float(turn.turn_radius_m(tas, plan.bank_deg)))
        fam_track = frozen_array(s.track_local(fam_rw))
    if not cmp.familiar_possible:
        add("warning", "familiar-picture",
            f"Your usual {fp.height_ft:.0f} ft pattern picture ({cmp.familiar_depression_deg:.1f}° below the horizon) "
            f"at circling height puts you only {cmp.familiar_offset_at_circling_nm:.2f} NM out: no bank can make "
            f"that turn at {ias:.0f} kt; the wing stalls first.")
    elif cmp.familiar_exceeds_bank_limit or (cmp.familiar_stall_margin_pct or 100) < STALL_MARGIN_WARNING_PCT:
        add("warning", "familiar-picture",
            f"Your usual {fp.height_ft:.0f} ft pattern picture at circling height puts you "
            f"{cmp.familiar_offset_at_circling_nm:.2f} NM out: the turn would need {cmp.familiar_bank_required_deg:.0f}° "
            f"bank, {cmp.familiar_load_factor:.2f} g, stall margin {cmp.familiar_stall_margin_pct:.0f} %; "
            f"holding {plan_info.bank_deg:.0f}° overshoots by {cmp.overshoot_nm:.2f} NM.")
    sight = SightPictureInfo(
        circling_height_ft=circ_h, planned_offset_nm=planned_offset_nm,
        planned_depression_deg=float(cmp.planned_depression_deg), familiar_height_ft=fp.height_ft,
        familiar_offset_nm=fam_offset_nm, familiar_depression_deg=float(cmp.familiar_depression_deg),
        familiar_offset_at_circling_nm=float(cmp.familiar_offset_at_circling_nm),
        familiar_possible=bool(cmp.familiar_possible), familiar_bank_required_deg=cmp.familiar_bank_required_deg,
        familiar_load_factor=cmp.familiar_load_factor, familiar_stall_speed_kt=cmp.familiar_stall_speed_kt,
        familiar_stall_margin_pct=cmp.familiar_stall_margin_pct, familiar_aoa=cmp.familiar_aoa,
        familiar_exceeds_bank_limit=bool(cmp.familiar_exceeds_bank_limit), overshoot_nm=float(cmp.overshoot_nm),
        familiar_track_xy_m=fam_track)

    # --- drawings ------------------------------------------------------------------------
    runways = []
    for rw in af.runways:
        a, b = s.thresholds_xy[rw.threshold_a.designator], s.thresholds_xy[rw.threshold_b.designator]
        runways.append(RunwayDrawing(designator=rw.designator, a_xy_m=frozen_array(a), b_xy_m=frozen_array(b),
                                     landing=rw.matches(request.landing_runway)))
    clip_m = radius.radius_nm * units.NM_TO_M + s.runway.length_m / 2.0   # draw sectors within the area
    sector_polys = tuple(frozen_array(sec.polygon(clip_m)) for sec in s.area.excluded)
    area_info = AreaInfo(criteria=crit, radius_nm=radius.radius_nm, basis=radius.basis,
                         provenance=criteria.provenance_label(radius.provenance),
                         required_radius_nm=required.radius_nm, centres_xy_m=frozen_array(s.area.centres_m),
                         boundary_xy_m=frozen_array(s.area.boundary()), sectors_xy_m=sector_polys,
                         sector_texts=tuple(_sector_text(x) for x in appr.not_authorised_sectors))

    minimums = MinimumsInfo(
        authorised=authorised, not_authorised_reason=na_reason, mda_ft=mda, height_above_airport_ft=haa,
        visibility_required_sm=vis_req, visibility_required_text=vis_charted, visibility_reported_sm=wx.visibility_sm, ceiling_reported_ft=wx.ceiling_ft,
        visibility_ok=vis_ok, ceiling_ok=ceil_ok, lowest_height_ft=lowest.height_ft,
        lowest_height_provenance=criteria.provenance_label(lowest.provenance),
        obstacle_clearance_ft=roc.clearance_ft,
        obstacle_clearance_provenance=criteria.provenance_label(roc.provenance),
        controlling_obstacle=None if controlling is None else f"{controlling.name} {controlling.elevation_ft:.0f} ft",
        obstacle_clearance_actual_ft=clearance_actual, circling_only_reasons=reasons,
        straight_in_available=straight_in, cold=cold)
    perf = PerformanceInfo(
        mda_pressure_altitude_ft=pa, oat_at_mda_c=oat_mda, isa_deviation_c=isa_dev,
        density_altitude_ft=float(atmosphere.density_altitude_ft(pa, oat_c=oat_mda)), ias_kt=ias, tas_kt=tas,
        bank_target_deg=bank_target, bank_limit_deg=s.bank_limit_deg, turn_radius_nm=float(tp.radius_nm),
        turn_rate_deg_per_s=float(tp.turn_rate_deg_per_s), time_180_s=float(tp.time_180_s),
        load_factor=float(tp.load_factor), stall_speed_kt=vs_turn, stall_margin_pct=stall_margin,
        aoa_in_turn=aoa, aoa_stall=cfg.aoa_stall, aoa_unit=prof.aoa_unit, stall_bank_deg=stall_bank)
    if weather_report is not None:
        if weather_report.wind_variable_from_deg is not None:
            add("warning", "variable-wind-sector",
                f"The wind varies between {weather_report.wind_variable_from_deg:03.0f}° and "
                f"{weather_report.wind_variable_to_deg:03.0f}°: brief the worst direction (see the wind envelope).")
        if weather_report.ceiling_may_be_lower:
            add("warning", "ceiling-unsure", "The report does not rule out a ceiling lower than stated.")
        if weather_report.skipped:
            add("info", "report-skipped", "Report groups not used: "
                + ", ".join(f"{g} ({why})" for g, why in weather_report.skipped) + ".")
    source = "manual" if any(v is not None for v in (wx.wind_speed_kt, wx.oat_c, wx.altimeter_hpa,
                                                     wx.visibility_sm, wx.ceiling_ft)) else "standard"
    if weather_report is not None:
        source = "report"
    weather = WeatherUsed(source=source, report=None if weather_report is None else weather_report.raw, oat_c=s.oat_c, altimeter_hpa=s.altimeter_hpa,
                          visibility_sm=wx.visibility_sm, ceiling_ft=wx.ceiling_ft)
    header = BriefHeader(airfield_ident=af.ident, airfield_name=af.name, approach_name=appr.name,
                         landing_runway=request.landing_runway, profile_name=prof.name,
                         configuration_name=cfg.name, criteria=crit, airfield_elevation_ft=elev,
                         magnetic_variation_deg=var, weight_lb=request.landing_weight_lb)
    category_info = CategoryInfo(category=cat, certified_category=det.certified_category, raised=det.raised,
                                 reason=det.reason, vref_kt=cfg.vref_kt * prof.weight_speed_factor(request.landing_weight_lb),
                                 circling_speed_kt=ias, wind_additive_kt=s.wind_additive_kt)
    if computed_utc is None:
        computed_utc = datetime.now(timezone.utc).strftime("%Y-%m-%d %H:%MZ")
    return Brief(header=header, category=category_info, minimums=minimums, area=area_info, performance=perf,
                 wind=wind_info, weather=weather, plan=plan_info, sight_picture=sight, missed_approach=missed,
                 runways=tuple(runways), obstacles=tuple(obstacles), findings=tuple(findings),
                 cautions=CAUTIONS, computed_utc=computed_utc)


ROLL_OUT_STEPS = (0.66, 0.33, 0.0)   # of the way from the stabilised distance to the descent point


def roll_out_steps_m(inputs: maneuver.CircleInputs) -> tuple[float, ...]:
    """The closer roll-outs tried, in order, when no plan fits at the descent point: steps
    toward the stabilised distance (descending in the final turn). The brief and the envelope
    use the same steps."""
    geo = maneuver.descent_geometry(inputs)
    return tuple(geo.stabilised_distance_m + f * (geo.roll_out_distance_m - geo.stabilised_distance_m)
                 for f in ROLL_OUT_STEPS)


def _choose(s: Situation, area_radius_m: float) -> tuple[maneuver.PlanChoice, bool]:
    """Rank the plans at the default roll-out (the descent point); if none fits, roll out
    closer, step by step (roll_out_steps_m)."""
    kwargs = dict(margin_fn=s.margin_fn, visibility_m=s.visibility_m, bank_limit_deg=min(s.bank_limit_deg, 60.0),
                  area_radius_m=area_radius_m, aoa_margin_fn=s.aoa_margin_fn)
    first = maneuver.choose_plan(s.inputs, **kwargs)
    if first.bank_needed_deg is not None or not first.ranked:
        return first, False
    for d in roll_out_steps_m(s.inputs):
        closer = maneuver.choose_plan(replace(s.inputs, roll_out_distance_m=d), **kwargs)
        if closer.bank_needed_deg is not None:
            return closer, True
    return first, False


def _plan_info(s: Situation, choice: maneuver.PlanChoice, best: maneuver.RankedPlan | None,
               request: BriefRequest, appr: Approach, var: float) -> tuple[PlanInfo, MissedApproachInfo]:
    plan = best.plan if best is not None else None
    course = s.runway.landing_course_deg_true
    nm = units.M_TO_NM
    alts = tuple(Alternative(shape=rp.plan.shape, side=rp.plan.side, feasible=rp.verdict != "does not fit",
                             bank_deg=rp.plan.bank_deg,
                             area_margin_nm=None if rp.area_margin_m is None else rp.area_margin_m * nm,
                             why_not=rp.why_not_first or "; ".join(rp.failures))
                 for rp in choice.ranked[1:])
    nan = float("nan")
    if plan is None or not plan.feasible:
        shape = plan.shape if plan is not None else "none"
        reasons = (tuple(best.failures or plan.reasons) if plan is not None
                   else ("the arrival is aligned with the landing runway (a straight-in)",))
        info = PlanInfo(
            feasible=False, shape=shape, shape_text=SHAPE_TEXT.get(shape, "No circling plan"),
            side=plan.side if plan is not None else "-",
            bank_deg=plan.bank_deg if plan is not None else s.inputs.bank_deg, offset_nm=nan, abeam_to_roll_in_s=nan, roll_in_distance_nm=nan,
            break_off_s=None, break_off_angle_deg=None, roll_out_distance_nm=nan, downwind_heading_deg_mag=None,
            final_heading_deg_mag=_mag(course, var), leave_mda_text="no flyable plan", leave_mda_in_turn=False,
            leave_mda_distance_nm=nan, leave_mda_heading_deg_mag=nan, inside_area=False, area_margin_nm=nan,
            area_edge_margin_nm=nan, sector_clearance_nm=None,
            runway_within_visibility=None, max_distance_from_threshold_nm=nan, track_xy_m=_empty_xy(),
            roll_in_xy_m=frozen_array([[nan, nan]]), descent_xy_m=frozen_array([[nan, nan]]),
            reasons=reasons, alternatives=alts)
        return info, MissedApproachInfo(turn_direction="", by_leg=(),
                                        instruction=appr.missed_approach)
    lm = plan.leave_mda
    lm_hdg_mag = _mag(course + lm.heading_deg, var)
    if lm.in_turn:
        lm_text = (f"in the final turn passing {lm_hdg_mag:03.0f}° M, {lm.along_track_to_threshold_m * nm:.1f} NM "
                   f"track distance from the threshold")
    else:
        lm_text = (f"at roll-out, {plan.roll_out_distance_m * nm:.2f} NM final, on a "
                   f"{s.inputs.glide_path_deg:.1f}° path")
    break_angle = None
    if plan.shape == "break-and-return":
        break_angle = s.inputs.break_angle_deg
    elif plan.shape == "teardrop":
        break_angle = s.inputs.teardrop_angle_deg
    track_local = frozen_array(s.track_local(plan.track_xy_m))
    roll_in = frozen_array(s.track_local(np.array([plan.roll_in_xy_m])))
    descent = frozen_array(s.track_local(np.array([[lm.x_m, lm.y_m]])))
    vis_ok = None
    if s.visibility_reported and best.visibility_margin_m is not None:
        vis_ok = best.visibility_margin_m >= 0
    margin = best.area_margin_m if best.area_margin_m is not None else nan
    track_pts = np.asarray(track_local)
    edge_margin = float(s.area.radius_m - np.max(s.area.distance_to_hull_m(track_pts)))
    sector_clear = None
    # The clearance shown is the manoeuvre's: flying on the extended centreline (the final, or a
    # straight-in arrival) passes a side sector's edge or a sector's apex at the threshold by design.
    off_line = np.abs(np.asarray(plan.track_xy_m)[:, 1]) > CENTRELINE_BAND_M
    if s.area.excluded and off_line.any():
        sector_clear = float(min(np.min(sec.clearance_m(track_pts[off_line])) for sec in s.area.excluded)) * nm
    shape_text = SHAPE_TEXT.get(plan.shape, plan.shape)
    base_s = dict(zip(plan.leg_names, plan.leg_times_s)).get("base", 0.0)
    if plan.shape == "downwind-join" and base_s >= 1.0:
        shape_text = f"Join a wide downwind, base leg {base_s:.0f} s, turn to final"
    info = PlanInfo(
        feasible=True, shape=plan.shape, shape_text=shape_text, side=plan.side,
        bank_deg=plan.bank_deg, offset_nm=(plan.offset_m or 0.0) * nm,
        abeam_to_roll_in_s=nan if plan.abeam_to_roll_in_s is None else plan.abeam_to_roll_in_s,
        roll_in_distance_nm=nan if plan.roll_in_distance_m is None else plan.roll_in_distance_m * nm,
        break_off_s=plan.break_off_s if plan.shape in ("break-and-return", "teardrop") else None,
        break_off_angle_deg=break_angle, roll_out_distance_nm=plan.roll_out_distance_m * nm,
        downwind_heading_deg_mag=None if plan.downwind_heading_deg is None else _mag(course + plan.downwind_heading_deg, var),
        final_heading_deg_mag=_mag(course + (plan.final_heading_deg or 0.0), var),
        leave_mda_text=lm_text, leave_mda_in_turn=lm.in_turn, leave_mda_distance_nm=lm.along_track_to_threshold_m * nm,
        leave_mda_heading_deg_mag=lm_hdg_mag, inside_area=margin >= 0, area_margin_nm=margin * nm,
        area_edge_margin_nm=edge_margin * nm, sector_clearance_nm=sector_clear,
        runway_within_visibility=vis_ok,
        max_distance_from_threshold_nm=(plan.max_distance_from_runway_m or plan.max_distance_from_threshold_m or 0.0) * nm,
        track_xy_m=track_local, roll_in_xy_m=roll_in, descent_xy_m=descent, reasons=tuple(plan.notes),
        alternatives=alts)
    guide = maneuver.missed_approach_turns(plan)
    by_leg: list[tuple[str, str]] = []
    for seg in guide.segments:
        if by_leg and by_leg[-1][0] == seg.leg_name:
            if by_leg[-1][1] != seg.direction:
                by_leg[-1] = (seg.leg_name, by_leg[-1][1] + "/" + seg.direction)
            continue
        by_leg.append((seg.leg_name, seg.direction))
    main = _main_missed_direction(guide, plan)
    missed = MissedApproachInfo(turn_direction=main, by_leg=tuple(by_leg), instruction=appr.missed_approach)
    return info, missed


def _main_missed_direction(guide: maneuver.MissedApproachGuide, plan: maneuver.Plan) -> str:
    """The turn direction that holds longest on the downwind (or over the whole plan)."""
    down_legs = {i for i, n in enumerate(plan.leg_names) if "downwind" in n}
    dirs = guide.direction
    if len(dirs) != len(plan.track_leg_index):
        raise IndexError("one missed-approach direction per track point")
    pool = [d for d, i in zip(dirs, np.asarray(plan.track_leg_index).tolist()) if i in down_legs] or dirs
    counts = {d: pool.count(d) for d in ("left", "right")}
    if not any(counts.values()):
        return ""
    return max(counts, key=counts.get)


def demo_request(**weather_overrides) -> BriefRequest:
    """The built-in invented case (briefer.demo): the business-jet-like demo profile circling from
    the RNAV approach to runway 09 to land on runway 27 at the valley airfield, in a westerly wind."""
    from briefer import demo
    from briefer.io import catalog
    from briefer.model import Weather

    wx = dict(demo.WEATHER)
    wx.update(weather_overrides)
    sit = demo.SITUATION
    return BriefRequest(profile=catalog.find_profile(sit["profile"]), airfield=catalog.find_airfield(sit["airfield"]),
                        approach=sit["approach"], landing_runway=sit["runway"], weather=Weather(**wx))


__all__ = ["Situation", "build_brief", "demo_request", "envelope_for", "situation"]
