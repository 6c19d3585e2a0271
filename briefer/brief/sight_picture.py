"""Section builder "sight picture": the runway's depression angle on the planned downwind and in
the crew's familiar pattern, what holding the familiar picture at circling height would demand,
and its track. The familiar-picture finding's wording lives here.

The comparison is made in still air (the planned offset comes from the plan, which is solved in
the actual wind).
"""

from __future__ import annotations

from briefer._dataclass import dataclass

import numpy as np

from briefer.brief.findings import FindingList, SectionResult
from briefer.brief.performance import STALL_MARGIN_WARNING_PCT
from briefer.brief.situation_inputs import Situation
from briefer.core import maneuver, sightpicture, turn
from briefer.result import PerformanceInfo, PlanInfo, SightPictureInfo, frozen_array, frozen_own
from briefer.wording import stall_margin_words


@dataclass(frozen=True, slots=True, kw_only=True)
class SightPicturePart(SectionResult):
    """The brief's sight-picture part."""

    sight_picture: SightPictureInfo


def sight_picture_section(s: Situation, plan_info: PlanInfo, solved: maneuver.Plan | None,
                  perf: PerformanceInfo) -> SightPicturePart:
    """Compare the planned picture with the familiar one flown at circling height."""
    request = s.request
    prof, cfg = request.profile, s.configuration
    weight_ratio = request.landing_weight_lb / prof.reference_weight_lb
    found = FindingList()
    feasible = plan_info.feasible
    tas, ias = s.inputs.tas_kt, s.circling_ias_kt
    fp = prof.familiar_pattern
    fam_offset_nm = fp.offset_nm if fp.offset_nm is not None else 2.0 * float(turn.turn_radius_nm(fp.speed_kt, fp.bank_deg))
    circ_h = s.plan_mda_ft - request.airfield.elevation_ft
    planned_offset_nm = plan_info.offset_nm if feasible and plan_info.offset_nm > 0 else 2 * perf.turn_radius_nm
    cmp = sightpicture.compare_sight_picture(
        circling_height_ft=circ_h, planned_offset_nm=planned_offset_nm, familiar_height_ft=fp.height_ft,
        familiar_offset_nm=fam_offset_nm, tas_kt=tas, ias_kt=ias, bank_planned_deg=plan_info.bank_deg,
        bank_limit_deg=s.bank_limit_deg, vs1g_kt=cfg.vs1g_kt, vref_kt=cfg.vref_kt, aoa_ref=cfg.aoa_ref,
        aoa_stall=cfg.aoa_stall, weight_ratio=weight_ratio)
    if not feasible:
        fam_track = frozen_array(np.zeros((0, 2)))
    else:
        fam_rw = sightpicture.familiar_turn_track_m(
            side=solved.side, roll_in_along_m=solved.roll_in_xy_m[0] if solved.roll_in_xy_m is not None else 0.0,
            offset_m=cmp.familiar_offset_at_circling_m,
            radius_m=(cmp.planned_turn_radius_m if solved.bank_deg == plan_info.bank_deg    # the same turn
                      else float(turn.turn_radius_m(tas, solved.bank_deg))))
        fam_track = frozen_own(s.track_local(fam_rw))
    if not cmp.familiar_possible:
        found.add("warning", "familiar-picture",
                  f"Your usual {fp.height_ft:.0f} ft pattern picture ({cmp.familiar_depression_deg:.1f}° below the "
                  f"horizon) at circling height puts you only {cmp.familiar_offset_at_circling_nm:.2f} NM out: no "
                  f"bank can make that turn at {ias:.0f} kt; the wing stalls first.")
    elif cmp.familiar_stall_margin_pct is not None and round(cmp.familiar_stall_margin_pct) < 0:
        found.add("danger", "familiar-picture",
                  f"Your usual {fp.height_ft:.0f} ft pattern picture at circling height puts you "
                  f"{cmp.familiar_offset_at_circling_nm:.2f} NM out: the turn would need "
                  f"{cmp.familiar_bank_required_deg:.0f}° bank, where the wing stalls at {ias:.0f} kt; holding "
                  f"{plan_info.bank_deg:.0f}° overshoots by {cmp.overshoot_nm:.2f} NM.")
    elif cmp.familiar_exceeds_bank_limit or (cmp.familiar_stall_margin_pct or 100) < STALL_MARGIN_WARNING_PCT:
        found.add("warning", "familiar-picture",
                  f"Your usual {fp.height_ft:.0f} ft pattern picture at circling height puts you "
                  f"{cmp.familiar_offset_at_circling_nm:.2f} NM out: the turn would need "
                  f"{cmp.familiar_bank_required_deg:.0f}° bank, {cmp.familiar_load_factor:.2f} g, "
                  f"{stall_margin_words(cmp.familiar_stall_margin_pct)}; holding {plan_info.bank_deg:.0f}° overshoots by "
                  f"{cmp.overshoot_nm:.2f} NM.")
    nan = float("nan")     # no plan, no planned picture (the trap is still shown)
    sight = SightPictureInfo(
        circling_height_ft=circ_h, planned_offset_nm=planned_offset_nm if feasible else nan,
        planned_depression_deg=float(cmp.planned_depression_deg) if feasible else nan, familiar_height_ft=fp.height_ft,
        familiar_offset_nm=fam_offset_nm, familiar_depression_deg=float(cmp.familiar_depression_deg),
        familiar_offset_at_circling_nm=float(cmp.familiar_offset_at_circling_nm),
        familiar_possible=bool(cmp.familiar_possible), familiar_bank_required_deg=cmp.familiar_bank_required_deg,
        familiar_load_factor=cmp.familiar_load_factor, familiar_stall_speed_kt=cmp.familiar_stall_speed_kt,
        familiar_stall_margin_pct=cmp.familiar_stall_margin_pct, familiar_aoa=cmp.familiar_aoa,
        familiar_exceeds_bank_limit=bool(cmp.familiar_exceeds_bank_limit), overshoot_nm=float(cmp.overshoot_nm),
        familiar_track_xy_m=fam_track)
    return SightPicturePart(sight_picture=sight, findings=tuple(found))
