"""Section builder "performance": the atmosphere at the MDA, TAS, the turn at the target bank,
stall speed and margin, angle of attack, and the area the turn needs today. Findings' wording
for these (stall margin, assumed temperature or altimeter, area smaller than the turn) lives here.

Missing temperature: ISA at the field; missing altimeter: standard pressure (both findings).
"""

from __future__ import annotations

from briefer._dataclass import dataclass

from briefer.brief.findings import FindingList, SectionResult
from briefer.brief.situation_inputs import Situation
from briefer.core import atmosphere, criteria, turn
from briefer.errors import DomainError
from briefer.result import PerformanceInfo

STALL_MARGIN_WARNING_PCT = 15.0


@dataclass(frozen=True, slots=True, kw_only=True)
class Performance(SectionResult):
    """The brief's performance part and the radius the turn needs today."""

    performance: PerformanceInfo
    required_radius_nm: float


def performance_section(s: Situation) -> Performance:
    """TAS, turn, stall margin and angle of attack at the target bank; the radius needed today."""
    request = s.request
    prof, cfg, wx = request.profile, s.configuration, request.weather
    weight_ratio = request.landing_weight_lb / prof.reference_weight_lb
    found = FindingList()
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
        found.add("warning", "stall-margin",
                  f"At {bank_target:.0f}° bank the stall speed is {vs_turn:.0f} kt: only {stall_margin:.0f} % "
                  f"below the circling speed.")
    if wx.oat_c is None:
        found.add("info", "oat-assumed", f"No temperature given: ISA at the field ({s.oat_c:.0f} °C) assumed.")
    if wx.altimeter_hpa is None:
        found.add("info", "altimeter-assumed", "No altimeter setting given: standard pressure assumed.")
    radius = s.area_radius
    required = criteria.required_radius_nm(tas_kt=tas, wind_kt=max(s.wind_speed_kt, wx.wind_gust_kt or 0.0),
                                           bank_deg=bank_target,
                                           straight_segment_nm=criteria.ICAO_STRAIGHT_SEGMENT_NM[s.category.category])
    if required.radius_nm > radius.radius_nm:
        found.add("warning", "area-smaller-than-turn",
                  f"Your turn today needs {required.radius_nm:.1f} NM of area; the protected area is "
                  f"{radius.radius_nm:.1f} NM. Keep the turn tight and inside it.")
    perf = PerformanceInfo(
        mda_pressure_altitude_ft=pa, oat_at_mda_c=oat_mda, isa_deviation_c=isa_dev,
        density_altitude_ft=float(atmosphere.density_altitude_ft(pa, oat_c=oat_mda)), ias_kt=ias, tas_kt=tas,
        bank_target_deg=bank_target, bank_limit_deg=s.bank_limit_deg, turn_radius_nm=float(tp.radius_nm),
        turn_rate_deg_per_s=float(tp.turn_rate_deg_per_s), time_180_s=float(tp.time_180_s),
        load_factor=float(tp.load_factor), stall_speed_kt=vs_turn, stall_margin_pct=stall_margin,
        aoa_in_turn=aoa, aoa_stall=cfg.aoa_stall, aoa_unit=prof.aoa_unit, stall_bank_deg=stall_bank)
    return Performance(performance=perf, required_radius_nm=required.radius_nm, findings=tuple(found))
