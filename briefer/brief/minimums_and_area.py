"""Section builder "minimums and area": category, circling minimums and their checks against the
weather, why the approach is circling-only, the cold-temperature correction, the obstacles and
the controlling one, and the protected area as drawn. Findings' wording for these lives here.

Choices made here where the issues are silent: HAA is the MDA minus the airfield elevation; the
cold-temperature correction is shown when the reported temperature is at or below 0 °C, by the
method the request names (default: the table method, the more conservative).
"""

from __future__ import annotations

import functools
import re
from briefer._dataclass import dataclass


from briefer import units
from briefer.brief.circling_only import circling_only_reasons
from briefer.brief.findings import FindingList, SectionResult
from briefer.brief.situation_inputs import Situation
from briefer.brief.variation import variation_findings
from briefer.core import coldtemp, criteria, minimums
from briefer.model import Sector
from briefer.wording import visibility_words
from briefer.result import (
    AreaInfo, CategoryInfo, ColdCorrection, MinimumsInfo, ObstacleDrawing, VisibilityMention, frozen_array, frozen_own,
)

COLD_CORRECTION_AT_OR_BELOW_C = 0.0


@dataclass(frozen=True, slots=True, kw_only=True)
class MinimumsAndArea(SectionResult):
    """The brief's category, minimums and obstacles."""

    category: CategoryInfo
    minimums: MinimumsInfo
    obstacles: tuple[ObstacleDrawing, ...]


def minimums_and_area_section(s: Situation) -> MinimumsAndArea:
    """Category, minimums, circling-only reasons, cold correction and obstacle clearance."""
    request = s.request
    prof, cfg, af, appr = request.profile, s.configuration, request.airfield, s.approach
    crit = request.options.criteria or appr.criteria
    det = s.category
    cat = det.category
    wx = request.weather
    found = FindingList()
    variation_findings(af, found)
    displaced = [t for t in af.thresholds if t.displaced_m > 0]
    if displaced:
        which = ", ".join(f"{t.designator} by {t.displaced_m:.0f} m" for t in displaced)
        found.add("info", "displaced-threshold", f"Displaced threshold ({which}). "
                  + criteria.circling_arc_centre(crit).text)
    _category_findings(s, crit, found)

    entry = appr.circling_minimum(cat)
    authorised = s.circling_authorised
    na_reason = "" if authorised else (appr.circling_not_authorised_reason(cat) or "not authorised")
    if not authorised:
        names_it = re.search(rf"\bcategory\s+{cat}\b", na_reason, flags=re.IGNORECASE) is not None
        lead = "Circling is not authorised" + ("" if names_it else f" for category {cat}")
        found.add("danger", "not-authorised", f"{lead}: {na_reason.rstrip('.')}.")
    mda = s.mda_ft
    haa = None if mda is None else mda - af.elevation_ft
    vis_req = None
    vis_charted = None
    in_metres = entry is not None and entry.visibility_sm is None and entry.visibility_m is not None
    if entry is not None:
        vis_charted = (visibility_words(entry.visibility_sm, metres=False) if entry.visibility_sm is not None
                       else f"{entry.visibility_m:.0f} m" if entry.visibility_m is not None else None)
        vis_req = entry.visibility_sm if entry.visibility_sm is not None else (
            entry.visibility_as_charted_m * units.M_TO_SM if entry.visibility_as_charted_m is not None else None)
    vis_ok = None if (wx.visibility_sm is None or vis_req is None) else wx.visibility_sm >= vis_req - 1e-9
    ceil_ok = None if (wx.ceiling_ft is None or haa is None) else wx.ceiling_ft >= haa
    if vis_ok is False:
        reported = visibility_words(wx.visibility_sm, metres=in_metres)
        found.add("danger", "visibility-below-minimum", f"Reported visibility {reported} is below the required "
                  f"{vis_charted}.", (
                      VisibilityMention(text=reported, visibility_sm=wx.visibility_sm, metre_minimums=in_metres),
                      VisibilityMention(text=vis_charted, visibility_sm=vis_req, required=True,
                                        metre_minimums=in_metres)))
    if ceil_ok is False:
        found.add("danger", "ceiling-below-mda",
                  f"Reported ceiling {wx.ceiling_ft:.0f} ft is below the circling height ({haa:.0f} ft HAA).")
    lowest = criteria.minimum_circling_height_ft(cat, criteria=crit)
    roc = criteria.circling_obstacle_clearance_ft(cat, criteria=crit)
    if haa is not None and haa < lowest.height_ft:
        found.add("warning", "below-lowest-height",
                  f"HAA {haa:.0f} ft is below the criteria's lowest circling height {lowest.height_ft:.0f} ft "
                  f"(value {criteria.provenance_label(lowest.provenance)}).")
    reasons, straight_in = circling_only_reasons(s, cat, crit)
    for r in reasons:
        found.add("info", f"circling-only-{r.code}", f"Circling only: {r.text.rstrip('.')}.")
    if straight_in:
        found.add("info", "straight-in-published",
                  f"Straight-in minimums are published for runway {request.landing_runway}: circle only if you "
                  "cannot descend straight in (the plan below is for that case).")
    cold = _cold_correction(s, haa, found)

    obstacles, controlling = _obstacles(s)
    clearance_actual = None
    if controlling is not None and mda is not None:
        clearance_actual = mda - controlling.elevation_ft
        if clearance_actual < roc.clearance_ft:
            found.add("danger", "obstacle-clearance",
                      f"The MDA clears {controlling.name} ({controlling.elevation_ft:.0f} ft) by only "
                      f"{clearance_actual:.0f} ft; the criteria ask for {roc.clearance_ft:.0f} ft.")
    radius = s.area_radius
    if radius.from_memory:
        found.add("info", "radius-from-memory",
                  f"The {crit} radius {radius.radius_nm:.1f} NM is from memory, not checked against the "
                  "published table.")

    minimums = MinimumsInfo(
        authorised=authorised, not_authorised_reason=na_reason, mda_ft=mda, height_above_airport_ft=haa,
        visibility_required_sm=vis_req, visibility_required_text=vis_charted, visibility_reported_sm=wx.visibility_sm,
        ceiling_reported_ft=wx.ceiling_ft,
        visibility_ok=vis_ok, ceiling_ok=ceil_ok, lowest_height_ft=lowest.height_ft,
        lowest_height_provenance=criteria.provenance_label(lowest.provenance),
        obstacle_clearance_ft=roc.clearance_ft,
        obstacle_clearance_provenance=criteria.provenance_label(roc.provenance),
        controlling_obstacle=None if controlling is None else f"{controlling.name} {controlling.elevation_ft:.0f} ft",
        obstacle_clearance_actual_ft=clearance_actual, circling_only_reasons=reasons,
        straight_in_available=straight_in, cold=cold, visibility_in_metres=in_metres)
    category = CategoryInfo(category=cat, certified_category=det.certified_category, raised=det.raised,
                            reason=_reason_as_printed(det.reason),
                            vref_kt=cfg.vref_kt * prof.weight_speed_factor(request.landing_weight_lb),
                            circling_speed_kt=s.circling_ias_kt, wind_additive_kt=s.wind_additive_kt,
                            category_vref_kt=s.category_speed_kt)
    return MinimumsAndArea(category=category, minimums=minimums, obstacles=obstacles, findings=tuple(found))


@functools.lru_cache(maxsize=64)      # a pure function of a string: the same text for the same reason
def _reason_as_printed(reason: str) -> str:
    """The criteria's reason with its speeds in whole knots and the VREF named as the one at the
    maximum landing weight (the brief also shows VREF at today's weight)."""
    reason = _VREF_KT.sub(lambda m: f"the category speed {float(m.group(1)):.0f} kt at maximum landing weight", reason)
    return _CIRCLING_KT.sub(lambda m: f"circling at {float(m.group(1)):.0f} kt IAS", reason)


_VREF_KT = re.compile(r"VREF (\d+(?:\.\d+)?) kt")
_CIRCLING_KT = re.compile(r"circling at (\d+(?:\.\d+)?) kt")


def _category_findings(s: Situation, crit: str, found: FindingList) -> None:
    """A gust additive or the circling speed that raises the category."""
    request = s.request
    prof, wx, det = request.profile, request.weather, s.category
    cat = det.category
    if wx.gust_increment_kt > 0 and request.options.apply_wind_additive:
        steady = prof.wind_additive.additive_kt(headwind_kt=s.headwind_kt, gust_increment_kt=0.0)
        steady_ias = s.circling_ias_kt - s.wind_additive_kt + steady
        steady_cat = criteria.category_at_speed(vref_kt=s.category_speed_kt,
                                                circling_speed_kt=steady_ias, criteria=crit)
        if steady_cat != cat:
            found.add("warning", "gust-raises-category",
                      f"The gust additive raises the circling speed to {s.circling_ias_kt:.0f} kt and the category "
                      f"from {steady_cat} to {cat}.")
    if det.raised:
        found.add("warning", "category-raised",
                  f"Circling at {s.circling_ias_kt:.0f} kt IAS puts you in category {cat} (certified "
                  f"{det.certified_category}): use the category {cat} minimums and area.")


def _cold_correction(s: Situation, haa: float | None, found: FindingList) -> ColdCorrection | None:
    """The cold-temperature correction of the MDA, when the reported temperature calls for one."""
    request = s.request
    wx, af, mda = request.weather, request.airfield, s.mda_ft
    if wx.oat_c is None or wx.oat_c > COLD_CORRECTION_AT_OR_BELOW_C or haa is None:
        return None
    cc = coldtemp.cold_temperature_correction(haa, airport_oat_c=wx.oat_c, airport_elevation_ft=af.elevation_ft,
                                              method=request.options.cold_temperature_method)
    if not (cc.applicable and cc.correction_ft > 0):
        return None
    found.add("warning", "cold-temperature",
              f"Cold temperature ({wx.oat_c:.0f} °C): add {cc.correction_ft:.0f} ft, fly the MDA as "
              f"{mda + cc.correction_ft:.0f} ft ({cc.method}).")
    return ColdCorrection(method=cc.method, correction_ft=float(cc.correction_ft),
                          corrected_mda_ft=float(mda + cc.correction_ft), oat_c=float(wx.oat_c))


def _obstacles(s: Situation):
    """Every obstacle as drawn (inside the area or not) and the controlling one
    (`core.minimums.controlling_obstacle_index`)."""
    obs = s.request.airfield.obstacles
    xy = frozen_array(s.layout.obstacles_m).reshape(-1, 2)     # read-only: each obstacle's row is a read-only view
    inside = minimums.obstacles_inside(s.area, xy).tolist() if obs else ()
    drawn = tuple(ObstacleDrawing(name=ob.name, xy_m=oxy, elevation_ft=ob.elevation_ft, inside_area=bool(ins))
                  for ob, oxy, ins in zip(obs, xy, inside))
    idx = minimums.highest_inside_index(inside, [ob.elevation_ft for ob in obs]) if obs else None
    return drawn, None if idx is None else obs[idx]


def _sector_text(sector: Sector) -> str:
    return f"Circling not authorised {sector.where_text()}" + (f": {sector.reason}" if sector.reason else "")


def area_info(s: Situation, required_radius_nm: float) -> AreaInfo:
    """The protected area as drawn: boundary, centres, not-authorised sectors and their texts."""
    request = s.request
    appr = s.approach
    crit = request.options.criteria or appr.criteria
    radius = s.area_radius
    clip_m = radius.radius_nm * units.NM_TO_M + s.runway.length_m / 2.0   # draw sectors within the area
    sector_polys = tuple(frozen_own(sec.polygon(clip_m)) for sec in s.area.excluded)
    return AreaInfo(criteria=crit, radius_nm=radius.radius_nm, basis=radius.basis,
                    provenance=criteria.provenance_label(radius.provenance),
                    required_radius_nm=required_radius_nm, centres_xy_m=frozen_array(s.area.centres_m),
                    boundary_xy_m=frozen_own(s.area.boundary()), sectors_xy_m=sector_polys,
                    sector_texts=tuple(_sector_text(x) for x in appr.not_authorised_sectors))
