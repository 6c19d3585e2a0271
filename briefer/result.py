"""The immutable result of a briefing: `Brief` and its parts.

`briefer.brief.build_brief` is the only place that builds a `Brief`; every renderer (app, text
card, PDF card, JSON) only reads it. Positions are metres in the airfield's local frame
(x east, y north of the reference point) unless a name says otherwise; courses are true unless the
name ends in `_mag`.
"""

from __future__ import annotations

from briefer._dataclass import dataclass, field
from typing import Literal

import numpy as np

Severity = Literal["danger", "warning", "info"]
SEVERITY_ORDER = {"danger": 0, "warning": 1, "info": 2}


def frozen_array(values) -> np.ndarray:
    """A read-only float array (so a frozen Brief stays frozen)."""
    arr = np.array(values, dtype=float)
    arr.setflags(write=False)
    return arr


def frozen_own(arr: np.ndarray) -> np.ndarray:
    """`frozen_array` of a float array the caller just made and hands over (no copy: the same
    array, made read-only)."""
    if type(arr) is not np.ndarray or arr.dtype != np.float64:
        return frozen_array(arr)
    arr.setflags(write=False)
    return arr


@dataclass(frozen=True, slots=True, kw_only=True)
class VisibilityMention:
    """A visibility that a text of the brief names: the words written there (the tool's default
    units) and the value, so that a renderer says it in the crew's display units
    (`briefer.display_units.said_in`).

    Attributes:
        text: The words as they stand in the text ('3.0 SM', '2 1/2 SM', '2800 m').
        visibility_sm: The value. [SM]
        required: A charted requirement (said as charted, with the metres beside it), not a
            reported or planned visibility.
        metre_minimums: The minimums are charted in metres.
    """

    text: str
    visibility_sm: float
    required: bool = False
    metre_minimums: bool = False


@dataclass(frozen=True, slots=True, kw_only=True)
class Finding:
    """Something the crew must see: an impossible case, a limit, a hazard, or a note.

    Attributes:
        severity: "danger" (cannot be flown as briefed), "warning" (limit or hazard), "info".
        code: a stable identifier for tests and JSON (e.g. "ceiling-below-mda").
        text: one plain sentence for the screen and the card (in the default display units).
        visibilities: The visibilities the text names, in the order they stand there.
    """

    severity: Severity
    code: str
    text: str
    visibilities: tuple[VisibilityMention, ...] = ()


@dataclass(frozen=True, slots=True, kw_only=True)
class BriefHeader:
    airfield_ident: str
    airfield_name: str
    approach_name: str
    landing_runway: str
    profile_name: str
    configuration_name: str
    criteria: str
    airfield_elevation_ft: float
    magnetic_variation_deg: float
    weight_lb: float


@dataclass(frozen=True, slots=True, kw_only=True)
class CategoryInfo:
    """Approach category: certified from VREF, raised by the speed actually flown (14 CFR 97.3)."""

    category: str
    certified_category: str
    raised: bool
    reason: str
    vref_kt: float                    # VREF of the configuration at today's landing weight
    circling_speed_kt: float          # the IAS planned in the circle, wind additive included
    wind_additive_kt: float
    category_vref_kt: float = float("nan")   # VREF at the maximum landing weight: sets the certified category


@dataclass(frozen=True, slots=True, kw_only=True)
class CirclingOnly:
    code: str
    text: str
    value: float
    limit: float


@dataclass(frozen=True, slots=True, kw_only=True)
class ColdCorrection:
    method: str
    correction_ft: float
    corrected_mda_ft: float
    oat_c: float


@dataclass(frozen=True, slots=True, kw_only=True)
class MinimumsInfo:
    authorised: bool
    not_authorised_reason: str
    mda_ft: float | None
    height_above_airport_ft: float | None
    visibility_required_sm: float | None
    visibility_required_text: str | None   # as charted, with its unit ("1 1/4 SM" style or "3700 m")
    visibility_reported_sm: float | None
    ceiling_reported_ft: float | None
    visibility_ok: bool | None        # None: not reported
    ceiling_ok: bool | None           # ceiling (AGL) at or above the HAA; None: no ceiling reported
    lowest_height_ft: float           # criteria's lowest circling height for the category
    lowest_height_provenance: str
    obstacle_clearance_ft: float
    obstacle_clearance_provenance: str
    controlling_obstacle: str | None  # highest obstacle inside the area, if the airfield lists any
    obstacle_clearance_actual_ft: float | None
    circling_only_reasons: tuple[CirclingOnly, ...]
    straight_in_available: bool
    cold: ColdCorrection | None
    visibility_in_metres: bool = False   # the minimums give the visibility in metres


@dataclass(frozen=True, slots=True, kw_only=True)
class AreaInfo:
    criteria: str
    radius_nm: float
    basis: str
    provenance: str
    required_radius_nm: float         # 2r + S with this aircraft's TAS, today's wind, planned bank
    centres_xy_m: np.ndarray          # usable thresholds (N, 2)
    boundary_xy_m: np.ndarray         # closed polyline of the area boundary (M, 2)
    sectors_xy_m: tuple[np.ndarray, ...]   # polygons of not-authorised sectors (clipped)
    sector_texts: tuple[str, ...]


@dataclass(frozen=True, slots=True, kw_only=True)
class PerformanceInfo:
    mda_pressure_altitude_ft: float
    oat_at_mda_c: float
    isa_deviation_c: float
    density_altitude_ft: float
    ias_kt: float
    tas_kt: float
    bank_target_deg: float
    bank_limit_deg: float
    turn_radius_nm: float
    turn_rate_deg_per_s: float
    time_180_s: float
    load_factor: float
    stall_speed_kt: float             # in the turn at the bank target, at today's weight
    stall_margin_pct: float
    aoa_in_turn: float
    aoa_stall: float
    aoa_unit: str
    stall_bank_deg: float | None      # bank at which the wing stalls at the planned IAS


@dataclass(frozen=True, slots=True, kw_only=True)
class WindInfo:
    reported: bool
    from_deg_true: float | None
    speed_kt: float
    gust_kt: float | None
    headwind_kt: float                # on the landing runway; negative = tailwind
    crosswind_from_right_kt: float
    gust_headwind_kt: float | None
    gust_crosswind_from_right_kt: float | None
    variable_from_deg_true: float | None = None
    variable_to_deg_true: float | None = None
    crosswind_limit_kt: float | None = None   # the configuration's maximum demonstrated crosswind
    tailwind_limit_kt: float | None = None    # the configuration's tailwind limit for landing
    limits_source: str = "not given"          # "profile": both given; "part": one given; "not given"


@dataclass(frozen=True, slots=True, kw_only=True)
class Alternative:
    shape: str
    side: str
    feasible: bool
    bank_deg: float
    area_margin_nm: float | None
    why_not: str
    why_not_visibilities: tuple[VisibilityMention, ...] = ()   # the visibilities `why_not` names


@dataclass(frozen=True, slots=True, kw_only=True)
class PlanInfo:
    feasible: bool
    shape: str
    shape_text: str
    side: str                         # side of the landing runway the downwind is on
    bank_deg: float
    offset_nm: float
    abeam_to_roll_in_s: float
    roll_in_distance_nm: float        # along the downwind, past abeam the threshold (<0 before)
    break_off_s: float | None
    break_off_angle_deg: float | None
    roll_out_distance_nm: float       # before the threshold
    downwind_heading_deg_mag: float | None
    final_heading_deg_mag: float
    leave_mda_text: str
    leave_mda_in_turn: bool
    leave_mda_distance_nm: float      # track distance to the threshold where descent starts
    leave_mda_heading_deg_mag: float
    inside_area: bool
    area_margin_nm: float             # smallest margin, not-authorised sectors included
    area_edge_margin_nm: float        # to the radius boundary alone
    sector_clearance_nm: float | None  # to the nearest not-authorised sector (0 = on its edge)
    runway_within_visibility: bool | None
    max_distance_from_threshold_nm: float
    track_xy_m: np.ndarray            # (N, 2) local frame
    roll_in_xy_m: np.ndarray
    descent_xy_m: np.ndarray
    reasons: tuple[str, ...]
    alternatives: tuple[Alternative, ...]
    break_off_direction: str | None = None        # "left"/"right" off the inbound course
    break_off_heading_deg_mag: float | None = None   # heading to fly on the break-off (or offset) leg


@dataclass(frozen=True, slots=True, kw_only=True)
class SightPictureInfo:
    circling_height_ft: float
    planned_offset_nm: float
    planned_depression_deg: float
    familiar_height_ft: float
    familiar_offset_nm: float
    familiar_depression_deg: float
    familiar_offset_at_circling_nm: float
    familiar_possible: bool
    familiar_bank_required_deg: float | None
    familiar_load_factor: float | None
    familiar_stall_speed_kt: float | None
    familiar_stall_margin_pct: float | None
    familiar_aoa: float | None
    familiar_exceeds_bank_limit: bool
    overshoot_nm: float
    familiar_track_xy_m: np.ndarray   # (N, 2) local frame: the turn the familiar picture gives


@dataclass(frozen=True, slots=True, kw_only=True)
class MissedApproachInfo:
    turn_direction: str               # initial climbing turn toward the landing runway, on downwind
    by_leg: tuple[tuple[str, str], ...]   # (leg name, "left"/"right")
    instruction: str


@dataclass(frozen=True, slots=True, kw_only=True)
class RunwayDrawing:
    designator: str
    a_xy_m: np.ndarray                # threshold A (the landing threshold, displaced or not)
    b_xy_m: np.ndarray
    landing: bool
    a_end_xy_m: np.ndarray | None = None   # runway end behind a displaced threshold A; None if not displaced
    b_end_xy_m: np.ndarray | None = None


@dataclass(frozen=True, slots=True, kw_only=True)
class ObstacleDrawing:
    name: str
    xy_m: np.ndarray
    elevation_ft: float
    inside_area: bool


@dataclass(frozen=True, slots=True, kw_only=True)
class WeatherUsed:
    source: str                       # "manual", "report", "report+manual", "standard"
    report: str | None
    oat_c: float
    altimeter_hpa: float
    visibility_sm: float | None
    ceiling_ft: float | None


@dataclass(frozen=True, slots=True, kw_only=True)
class Brief:
    """Every number the crew needs for one circling approach. Built only by `build_brief`."""

    header: BriefHeader
    category: CategoryInfo
    minimums: MinimumsInfo
    area: AreaInfo
    performance: PerformanceInfo
    wind: WindInfo
    weather: WeatherUsed
    plan: PlanInfo
    sight_picture: SightPictureInfo
    missed_approach: MissedApproachInfo
    runways: tuple[RunwayDrawing, ...]
    obstacles: tuple[ObstacleDrawing, ...]
    findings: tuple[Finding, ...]
    cautions: tuple[str, ...]
    computed_utc: str = field(default="")

    @property
    def warnings(self) -> tuple[Finding, ...]:
        """Findings, most severe first."""
        return tuple(sorted(self.findings, key=lambda f: SEVERITY_ORDER[f.severity]))
