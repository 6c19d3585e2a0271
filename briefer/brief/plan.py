"""Section builder "plan": the manoeuvre plan chosen in the actual wind (shape, side, bank,
offset, timing, where to leave the MDA), its area and visibility margins, the alternatives, and
the missed-approach turn direction. Findings' wording for these (no plan, bank raised, leaves
the area, beyond visibility, marginal, roll-out shortened, descent in the turn) lives here.
"""

from __future__ import annotations

import dataclasses
from briefer._dataclass import dataclass

import numpy as np

from briefer import units
from briefer.brief.findings import FindingList, SectionResult
from briefer.brief.roll_out import choose_with_closer_roll_out
from briefer.brief.situation_inputs import Situation
from briefer.core import geometry, maneuver
from briefer.core.manoeuvre.missed import missed_turns_by_leg
from briefer.core.manoeuvre.ranking import reason_visibility_words
from briefer.result import Alternative, MissedApproachInfo, PlanInfo, VisibilityMention, frozen_array, frozen_own

CENTRELINE_BAND_M = 30.0   # points this close to the extended centreline are "on the final"

SHAPE_TEXT = {
    "downwind-join": "Join a downwind, 180° turn to final",
    "break-and-return": "Break off, fly downwind, 180° turn to final",
    "teardrop": "Pass the field, teardrop turn back to final",
    "direct-turn": "Turn directly onto final",
    "overfly-circuit": "Overfly, turn onto a downwind, 180° turn to final",
}


@dataclass(frozen=True, slots=True, kw_only=True)
class PlanPart(SectionResult):
    """The brief's plan and missed-approach parts and the solver's plan behind them."""

    plan: PlanInfo
    missed_approach: MissedApproachInfo
    solved: maneuver.Plan | None          # the best ranked plan (None: the arrival is a straight-in)


def plan_section(s: Situation, *, bank_target_deg: float, straight_in: bool,
                 withheld: tuple[str, ...] = ()) -> PlanPart:
    """Choose the plan (closer roll-outs if none fits at the descent point) and check it.

    `withheld`: why no plan may be recommended whatever the geometry (the aircraft's wind limits
    exceeded); then the plan part says so and no track is drawn.
    """
    found = FindingList()
    choice, roll_out_shortened = choose_with_closer_roll_out(s, s.area_radius.radius_nm * units.NM_TO_M)
    best = choice.ranked[0] if choice.ranked else None
    plan = best.plan if best is not None else None
    alts = _alternatives(s, choice)
    if withheld:
        info = dataclasses.replace(_no_plan_info(s, best, ()), reasons=tuple(withheld), shape="none",
                                   shape_text="No plan recommended", side="-")
        return PlanPart(plan=info, missed_approach=MissedApproachInfo(
            turn_direction="", by_leg=(), instruction=s.request.selected_approach().missed_approach),
            solved=None, findings=())
    if plan is None or not plan.feasible:
        info, missed = _no_plan_info(s, best, alts), MissedApproachInfo(
            turn_direction="", by_leg=(), instruction=s.request.selected_approach().missed_approach)
    else:
        info, missed = _plan_info(s, best, alts), _missed_approach(s, plan)
    feasible = info.feasible
    if best is None:
        if straight_in:
            found.add("info", "straight-in",
                      "The arrival is aligned with the landing runway and straight-in minimums are published: "
                      "fly the straight-in; no circle is planned.")
        else:
            found.add("danger", "no-plan-shape",
                      "No circling plan applies: the arrival is aligned with the landing runway. Descend straight "
                      "in if the runway is in sight in time for a normal descent; otherwise fly the missed approach.")
    elif choice.bank_needed_deg is None:
        text = (f"No plan passes every check up to the bank limit of {s.bank_limit_deg:.0f}°; the best one, "
                "shown, fails: " + "; ".join(best.failures or plan.reasons or ("see the alternatives",)) + ".")
        found.add("danger", "no-plan-fits", text, _visibilities_named(s, text))
    elif choice.bank_needed_deg > bank_target_deg + 1e-6:
        found.add("warning", "bank-raised",
                  f"The plan needs {choice.bank_needed_deg:.0f}° bank, more than the {bank_target_deg:.0f}° target.")
    if feasible and not info.inside_area:
        found.add("danger", "leaves-area", f"The plan leaves the protected area by {-info.area_margin_nm:.2f} NM.")
    if feasible and info.runway_within_visibility is False:
        found.add("warning", "beyond-visibility",
                  f"The track goes {info.max_distance_from_threshold_nm:.1f} NM from the runway, beyond the "
                  f"reported visibility: you may lose sight of it.")
    if best is not None and best.verdict == "marginal":
        text = "The plan is marginal: " + "; ".join(best.marginal) + "."
        found.add("warning", "plan-marginal", text, _visibilities_named(s, text))
    if roll_out_shortened and feasible:
        found.add("info", "roll-out-shortened",
                  f"Rolled out at {info.roll_out_distance_nm:.2f} NM final instead of the descent point, "
                  f"so that the plan fits the area and the visibility.")
    if feasible and info.leave_mda_in_turn:
        found.add("info", "descent-in-turn", f"The descent from the MDA starts before the roll-out, {info.leave_mda_text}.")
    return PlanPart(plan=info, missed_approach=missed, solved=plan, findings=tuple(found))


def _visibilities_named(s: Situation, text: str, words: str | None = None) -> tuple[VisibilityMention, ...]:
    """The plan's visibility, where the ranking's reasons in `text` name it (`words`: its words,
    `reason_visibility_words(s.visibility_m)`, when the caller has them)."""
    if words is None:
        words = reason_visibility_words(s.visibility_m)
    named = text.count(words)
    if not named:
        return ()
    return (VisibilityMention(text=words, visibility_sm=s.visibility_m * units.M_TO_SM),) * named


def _alternatives(s: Situation, choice: maneuver.PlanChoice) -> tuple[Alternative, ...]:
    nm = units.M_TO_NM
    out = []
    words = reason_visibility_words(s.visibility_m) if len(choice.ranked) > 1 else ""
    for rp in choice.ranked[1:]:
        why_not = rp.why_not_first or "; ".join(rp.failures)
        out.append(Alternative(shape=rp.plan.shape, side=rp.plan.side, feasible=rp.verdict != "does not fit",
                               bank_deg=rp.plan.bank_deg,
                               area_margin_nm=None if rp.area_margin_m is None else rp.area_margin_m * nm,
                               why_not=why_not, why_not_visibilities=_visibilities_named(s, why_not, words)))
    return tuple(out)


def _empty_xy() -> np.ndarray:
    return frozen_array(np.zeros((0, 2)))


def _no_plan_info(s: Situation, best: maneuver.RankedPlan | None, alts: tuple[Alternative, ...]) -> PlanInfo:
    """The plan part when no plan is flyable (or none applies: a straight-in arrival)."""
    plan = best.plan if best is not None else None
    var = s.request.airfield.magnetic_variation_deg
    nan = float("nan")
    shape = plan.shape if plan is not None else "none"
    reasons = (tuple(best.failures or plan.reasons) if plan is not None
               else ("the arrival is aligned with the landing runway (a straight-in)",))
    return PlanInfo(
        feasible=False, shape=shape, shape_text=SHAPE_TEXT.get(shape, "No circling plan"),
        side=plan.side if plan is not None else "-",
        bank_deg=plan.bank_deg if plan is not None else s.inputs.bank_deg, offset_nm=nan, abeam_to_roll_in_s=nan,
        roll_in_distance_nm=nan, break_off_s=None, break_off_angle_deg=None, roll_out_distance_nm=nan,
        downwind_heading_deg_mag=None,
        final_heading_deg_mag=geometry.magnetic_from_true_deg(s.runway.landing_course_deg_true, var),
        leave_mda_text="no flyable plan", leave_mda_in_turn=False,
        leave_mda_distance_nm=nan, leave_mda_heading_deg_mag=nan, inside_area=False, area_margin_nm=nan,
        area_edge_margin_nm=nan, sector_clearance_nm=None,
        runway_within_visibility=None, max_distance_from_threshold_nm=nan, track_xy_m=_empty_xy(),
        roll_in_xy_m=frozen_array([[nan, nan]]), descent_xy_m=frozen_array([[nan, nan]]),
        reasons=reasons, alternatives=alts)


def _plan_info(s: Situation, best: maneuver.RankedPlan, alts: tuple[Alternative, ...]) -> PlanInfo:
    """The plan part of a flyable plan: headings magnetic, distances in NM, track in the local frame."""
    plan = best.plan
    var = s.request.airfield.magnetic_variation_deg
    course = s.runway.landing_course_deg_true
    nm = units.M_TO_NM
    nan = float("nan")
    lm = plan.leave_mda
    lm_hdg_mag = geometry.magnetic_from_true_deg(course + lm.heading_deg, var)
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
    # the track, the roll-in point and the leave-MDA point to the local frame in one call (a
    # point's result does not depend on the others: the same values as three calls)
    local = s.track_local(np.concatenate((plan.track_xy_m,       # a feasible plan's track: a float (N, 2) array
                                          np.array([plan.roll_in_xy_m, (lm.x_m, lm.y_m)], dtype=float))))
    frozen_own(local)                              # read-only: the three parts are views of it
    track_local, roll_in, descent = local[:-2], local[-2:-1], local[-1:]
    vis_ok = None
    if s.visibility_reported and best.visibility_margin_m is not None:
        vis_ok = best.visibility_margin_m >= 0
    margin = best.area_margin_m if best.area_margin_m is not None else nan
    track_pts = track_local
    edge_margin = s.area.track_hull_margin_m(track_pts)      # R - the largest distance to the hull
    sector_clear = None
    # The clearance shown is the manoeuvre's: flying on the extended centreline (the final, or a
    # straight-in arrival) passes a side sector's edge or a sector's apex at the threshold by design.
    off_line = np.abs(np.asarray(plan.track_xy_m)[:, 1]) > CENTRELINE_BAND_M
    if s.area.excluded:
        off_pts = track_pts.compress(off_line, axis=0)       # the rows of track_pts[off_line]
        if len(off_pts):
            sector_clear = s.area.sector_clearance_m(off_pts) * nm
    break_dir, break_hdg = _break_off(plan, course, var)
    shape_text = SHAPE_TEXT.get(plan.shape, plan.shape)
    base_s = dict(zip(plan.leg_names, plan.leg_times_s)).get("base", 0.0)
    if plan.shape == "downwind-join" and base_s >= 1.0:
        shape_text = f"Join a wide downwind, base leg {base_s:.0f} s, turn to final"
    return PlanInfo(
        feasible=True, shape=plan.shape, shape_text=shape_text, side=plan.side,
        bank_deg=plan.bank_deg, offset_nm=(plan.offset_m or 0.0) * nm,
        abeam_to_roll_in_s=nan if plan.abeam_to_roll_in_s is None else plan.abeam_to_roll_in_s,
        roll_in_distance_nm=nan if plan.roll_in_distance_m is None else plan.roll_in_distance_m * nm,
        break_off_s=plan.break_off_s if plan.shape in ("break-and-return", "teardrop") else None,
        break_off_angle_deg=break_angle, roll_out_distance_nm=plan.roll_out_distance_m * nm,
        downwind_heading_deg_mag=(None if plan.downwind_heading_deg is None
                                  else geometry.magnetic_from_true_deg(course + plan.downwind_heading_deg, var)),
        final_heading_deg_mag=geometry.magnetic_from_true_deg(course + (plan.final_heading_deg or 0.0), var),
        leave_mda_text=lm_text, leave_mda_in_turn=lm.in_turn, leave_mda_distance_nm=lm.along_track_to_threshold_m * nm,
        leave_mda_heading_deg_mag=lm_hdg_mag, inside_area=margin >= 0, area_margin_nm=margin * nm,
        area_edge_margin_nm=edge_margin * nm, sector_clearance_nm=sector_clear,
        runway_within_visibility=vis_ok,
        max_distance_from_threshold_nm=(plan.max_distance_from_runway_m or plan.max_distance_from_threshold_m or 0.0) * nm,
        track_xy_m=track_local, roll_in_xy_m=roll_in, descent_xy_m=descent, reasons=tuple(plan.notes),
        alternatives=alts, break_off_direction=break_dir, break_off_heading_deg_mag=break_hdg)


BREAK_LEGS = {"break-and-return": ("break turn", "break leg"), "teardrop": ("offset turn", "offset leg")}


def _break_off(plan: maneuver.Plan, course_true: float, var: float) -> tuple[str | None, float | None]:
    """Which way the break-off (teardrop: offset) turn goes off the inbound course, and the
    heading held on the leg after it (crab included), magnetic."""
    names = BREAK_LEGS.get(plan.shape)
    if names is None or names[0] not in plan.leg_names or names[1] not in plan.leg_names:
        return None, None
    turn_leg = plan.legs[plan.leg_names.index(names[0])]
    straight = plan.legs[plan.leg_names.index(names[1])]
    direction = getattr(turn_leg, "direction", None)
    heading = getattr(straight, "heading_deg", None)
    if direction not in ("left", "right") or heading is None:
        return None, None
    return direction, geometry.magnetic_from_true_deg(course_true + float(heading), var)


def _missed_approach(s: Situation, plan: maneuver.Plan) -> MissedApproachInfo:
    """Which way to turn for the missed approach, leg by leg, and the main direction."""
    runs, main = missed_turns_by_leg(plan)       # (leg name, direction) of each segment of the guide
    by_leg: list[tuple[str, str]] = []
    for leg_name, direction in runs:
        if by_leg and by_leg[-1][0] == leg_name:
            if by_leg[-1][1] != direction:
                by_leg[-1] = (leg_name, by_leg[-1][1] + "/" + direction)
            continue
        by_leg.append((leg_name, direction))
    return MissedApproachInfo(turn_direction=main, by_leg=tuple(by_leg), instruction=s.approach.missed_approach)
