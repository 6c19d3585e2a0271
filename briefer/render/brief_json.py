"""The JSON form of a Brief: a stable interface (`"schema": "briefer.brief/1"`).

Keys carry their units; numbers are unrounded; positions are metres east/north of the airfield
reference point. Additions are allowed within a schema version; renames and removals are not.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from briefer.wording import category_words, crosswind_side, crosswind_words, wind_components_text, wind_limits_words
from briefer.result import Brief

SCHEMA = "briefer.brief/1"


def _xy(arr: np.ndarray) -> list[list[float]]:
    return [[float(x), float(y)] for x, y in np.asarray(arr, dtype=float).reshape(-1, 2)]


def _runway(r: Any) -> dict[str, Any]:
    """A runway as drawn; the runway end behind a displaced threshold only when there is one."""
    out: dict[str, Any] = {"designator": r.designator, "a": _xy(r.a_xy_m)[0], "b": _xy(r.b_xy_m)[0],
                           "landing": r.landing}
    for key, end in (("a_end", r.a_end_xy_m), ("b_end", r.b_end_xy_m)):
        if end is not None:
            out[key] = _xy(end)[0]
    return out


def _plan_dict(pl: Any) -> dict[str, Any]:
    """The plan part of the JSON."""
    return {
        "feasible": pl.feasible, "shape": pl.shape, "shape_text": pl.shape_text, "side": pl.side,
        "bank_deg": pl.bank_deg, "offset_nm": pl.offset_nm,
        "abeam_to_roll_in_s": pl.abeam_to_roll_in_s,
        "roll_in_distance_nm": pl.roll_in_distance_nm,
        "break_off_s": pl.break_off_s, "break_off_angle_deg": pl.break_off_angle_deg,
        "break_off_direction": pl.break_off_direction,
        "break_off_heading_deg_mag": pl.break_off_heading_deg_mag,
        "roll_out_distance_nm": pl.roll_out_distance_nm,
        "downwind_heading_deg_mag": pl.downwind_heading_deg_mag,
        "final_heading_deg_mag": pl.final_heading_deg_mag,
        "leave_mda": pl.leave_mda_text, "leave_mda_in_turn": pl.leave_mda_in_turn,
        "leave_mda_distance_nm": pl.leave_mda_distance_nm,
        "leave_mda_heading_deg_mag": pl.leave_mda_heading_deg_mag,
        "inside_area": pl.inside_area, "area_margin_nm": pl.area_margin_nm,
        "area_edge_margin_nm": pl.area_edge_margin_nm, "sector_clearance_nm": pl.sector_clearance_nm,
        "runway_within_visibility": pl.runway_within_visibility,
        "max_distance_from_threshold_nm": pl.max_distance_from_threshold_nm,
        "roll_in": _xy(pl.roll_in_xy_m)[0], "descent_point": _xy(pl.descent_xy_m)[0],
        "track": _xy(pl.track_xy_m),
        "reasons": list(pl.reasons),
        "alternatives": [{"shape": alt.shape, "side": alt.side, "feasible": alt.feasible,
                          "bank_deg": alt.bank_deg, "area_margin_nm": alt.area_margin_nm,
                          "why_not": alt.why_not} for alt in pl.alternatives]}


def _sight_picture_dict(sp: Any) -> dict[str, Any]:
    """The sight-picture part of the JSON."""
    return {
        "circling_height_ft": sp.circling_height_ft,
        "planned_offset_nm": sp.planned_offset_nm,
        "planned_depression_deg": sp.planned_depression_deg,
        "familiar_height_ft": sp.familiar_height_ft,
        "familiar_offset_nm": sp.familiar_offset_nm,
        "familiar_depression_deg": sp.familiar_depression_deg,
        "familiar_offset_at_circling_nm": sp.familiar_offset_at_circling_nm,
        "familiar_possible": sp.familiar_possible,
        "familiar_bank_required_deg": sp.familiar_bank_required_deg,
        "familiar_load_factor": sp.familiar_load_factor,
        "familiar_stall_speed_kt": sp.familiar_stall_speed_kt,
        "familiar_stall_margin_pct": sp.familiar_stall_margin_pct,
        "familiar_aoa": sp.familiar_aoa,
        "familiar_exceeds_bank_limit": sp.familiar_exceeds_bank_limit,
        "overshoot_nm": sp.overshoot_nm,
        "familiar_track": _xy(sp.familiar_track_xy_m)}


def brief_to_dict(brief: Brief) -> dict[str, Any]:
    """The JSON-ready mapping of a Brief."""
    h, c, m, a, p, w, pl, sp, ma = (brief.header, brief.category, brief.minimums, brief.area,
                                   brief.performance, brief.wind, brief.plan, brief.sight_picture,
                                   brief.missed_approach)
    return {
        "schema": SCHEMA,
        "computed_utc": brief.computed_utc,
        "airfield": {"ident": h.airfield_ident, "name": h.airfield_name,
                     "elevation_ft": h.airfield_elevation_ft,
                     "magnetic_variation_deg": h.magnetic_variation_deg},
        "approach": h.approach_name,
        "landing_runway": h.landing_runway,
        "profile": h.profile_name,
        "configuration": h.configuration_name,
        "weight_lb": h.weight_lb,
        "category": c.category,
        "certified_category": c.certified_category,
        "category_raised": c.raised,
        "category_reason": c.reason,
        "vref_kt": c.vref_kt,
        "circling_speed_kt": c.circling_speed_kt,
        "wind_additive_kt": c.wind_additive_kt,
        "category_speed_at_max_landing_weight_kt": c.category_vref_kt,
        "circling_speed_before_additive_kt": c.circling_speed_kt - c.wind_additive_kt,
        "category_text": category_words(c),
        "authorised": m.authorised,
        "not_authorised_reason": m.not_authorised_reason,
        "mda_ft": m.mda_ft,
        "height_above_airport_ft": m.height_above_airport_ft,
        "visibility_required_sm": m.visibility_required_sm,
        "visibility_required_as_charted": m.visibility_required_text,
        "visibility_reported_sm": m.visibility_reported_sm,
        "ceiling_reported_ft": m.ceiling_reported_ft,
        "visibility_ok": m.visibility_ok,
        "ceiling_ok": m.ceiling_ok,
        "lowest_circling_height_ft": m.lowest_height_ft,
        "obstacle_clearance_ft": m.obstacle_clearance_ft,
        "controlling_obstacle": m.controlling_obstacle,
        "obstacle_clearance_actual_ft": m.obstacle_clearance_actual_ft,
        "circling_only_reasons": [{"code": r.code, "text": r.text, "value": r.value, "limit": r.limit}
                                  for r in m.circling_only_reasons],
        "straight_in_available": m.straight_in_available,
        "cold_temperature": None if m.cold is None else {
            "method": m.cold.method, "correction_ft": m.cold.correction_ft,
            "corrected_mda_ft": m.cold.corrected_mda_ft, "oat_c": m.cold.oat_c},
        "area": {"criteria": a.criteria, "radius_nm": a.radius_nm, "basis": a.basis,
                 "provenance": a.provenance, "required_radius_nm": a.required_radius_nm,
                 "centres": _xy(a.centres_xy_m), "boundary": _xy(a.boundary_xy_m),
                 "not_authorised_sectors": [{"text": t, "polygon": _xy(poly)}
                                            for t, poly in zip(a.sector_texts, a.sectors_xy_m)]},
        "tas_kt": p.tas_kt,
        "performance": {
            "ias_kt": p.ias_kt, "tas_kt": p.tas_kt,
            "mda_pressure_altitude_ft": p.mda_pressure_altitude_ft, "oat_at_mda_c": p.oat_at_mda_c,
            "isa_deviation_c": p.isa_deviation_c, "density_altitude_ft": p.density_altitude_ft,
            "bank_target_deg": p.bank_target_deg, "bank_limit_deg": p.bank_limit_deg,
            "turn_radius_nm": p.turn_radius_nm, "turn_rate_deg_s": p.turn_rate_deg_per_s,
            "time_180_s": p.time_180_s, "load_factor": p.load_factor,
            "stall_speed_kt": p.stall_speed_kt, "stall_margin_pct": p.stall_margin_pct,
            "aoa_in_turn": p.aoa_in_turn, "aoa_stall": p.aoa_stall, "aoa_unit": p.aoa_unit,
            "stall_bank_deg": p.stall_bank_deg},
        "wind": {"reported": w.reported, "from_deg_true": w.from_deg_true, "speed_kt": w.speed_kt,
                 "gust_kt": w.gust_kt, "headwind_kt": w.headwind_kt,
                 "crosswind_from_right_kt": w.crosswind_from_right_kt,
                 "crosswind_side": crosswind_side(w.crosswind_from_right_kt),
                 "crosswind_text": crosswind_words(w.crosswind_from_right_kt),
                 "components_text": wind_components_text(w),
                 "limits": {"crosswind_kt": w.crosswind_limit_kt, "tailwind_kt": w.tailwind_limit_kt,
                            "source": w.limits_source, "text": wind_limits_words(w)},
                 "gust_headwind_kt": w.gust_headwind_kt,
                 "gust_crosswind_from_right_kt": w.gust_crosswind_from_right_kt,
                 "variable_from_deg_true": w.variable_from_deg_true,
                 "variable_to_deg_true": w.variable_to_deg_true},
        "weather": {"source": brief.weather.source, "report": brief.weather.report,
                    "oat_c": brief.weather.oat_c, "altimeter_hpa": brief.weather.altimeter_hpa,
                    "visibility_sm": brief.weather.visibility_sm,
                    "ceiling_ft": brief.weather.ceiling_ft},
        "plan": _plan_dict(pl),
        "sight_picture": _sight_picture_dict(sp),
        "missed_approach": {"turn_direction": ma.turn_direction,
                            "by_leg": [{"leg": leg, "turn": d} for leg, d in ma.by_leg],
                            "instruction": ma.instruction},
        "runways": [_runway(r) for r in brief.runways],
        "obstacles": [{"name": o.name, "xy_m": _xy(o.xy_m)[0], "elevation_ft": o.elevation_ft,
                       "inside_area": o.inside_area} for o in brief.obstacles],
        "warnings": [{"severity": f.severity, "code": f.code, "text": f.text} for f in brief.warnings],
        "cautions": list(brief.cautions),
    }
