"""Generate practice scenarios that exercise a chosen emphasis, reproducibly from a seed.

`generate_scenario(airfield=..., profile=..., emphasis=..., seed=...)` draws everything from one
``random.Random(seed)`` (no global random state): the approach and landing runway, the weight, the
weather, then checks with the brief (and the wind envelope) that the case really exercises its
emphasis before returning it:

* ``tailwind-on-base``: a wind in the envelope's MARGINAL band whose component along the base
  turn (the middle of the turn to final, heading square to the runway toward it) is a tailwind of
  at least `TAILWIND_ON_BASE_MIN_KT` (and 40 % of the wind), on the side the plan flies;
* ``low-visibility``: a reported visibility within `LOW_VIS_MARGIN_SM` (statute-mile reports) or
  `LOW_VIS_MARGIN_M` (metre reports) of the required visibility, sometimes just below it;
* ``reciprocal``: an approach and runway whose arrival is within `RECIPROCAL_WITHIN_DEG` of the
  reciprocal of the landing course, with the wind favouring the landing runway;
* ``hot-high`` / ``cold``: a temperature `HOT_ISA_DEVIATION_C` above / `COLD_ISA_DEVIATION_C`
  below ISA at the field (far from ISA; largest at a high or a cold field);
* ``familiar-picture``: the approach and runway where the profile's familiar pattern fails worst
  at circling height (no bank can make the turn, or it needs more than the bank limit);
* ``gusty-category``: a gust whose additive raises the circling speed into the next category.

The weather is written as a METAR-style report first and the values are decoded from it, so the
report the student reads and the values the brief uses cannot disagree.
"""

from __future__ import annotations

import math
import random
from collections.abc import Callable, Sequence
from briefer._dataclass import dataclass, field
from fractions import Fraction
from typing import Any

from briefer import units
from briefer.core import angles
from briefer.errors import DomainError
from briefer.vocabulary import SEED_MAX, SEED_WORDS
from briefer.wording import signed
from briefer.model import AircraftProfile, Airfield, BriefRequest, Weather
from briefer.instructor.scenario_format import EMPHASES, EMPHASIS_TITLES, LoadedScenario, Scenario, ScenarioWeather

TAILWIND_ON_BASE_MIN_KT = 5.0
TAILWIND_ON_BASE_MIN_FRACTION = 0.4
TAILWIND_MAX_ON_FINAL_KT = 2.0            # keep the landing plausible (no tailwind warning in the brief)
MODERATE_WIND_KT = 22
LOW_VIS_MARGIN_SM = 0.5
LOW_VIS_MARGIN_M = 800.0
LOW_VIS_BELOW_CHANCE = 0.3                # how often the report is just below the minimum
RECIPROCAL_WITHIN_DEG = 60.0
ALIGNED_WITHIN_DEG = 30.0                 # an arrival this close to the landing course is a straight-in
HOT_ISA_DEVIATION_C = (20, 30)
COLD_ISA_DEVIATION_C = (25, 40)
MAX_OAT_C = 48
MIN_OAT_C = -45
WEIGHT_FRACTION = (0.85, 1.0)
WEIGHT_STEP_LB = 100.0
DEFAULT_SEED_MAX = 999_999

# Reportable statute-mile visibilities (FMH-1 / AIM 7-1 METAR key), 1/4 SM and above.
SM_STEPS: tuple[Fraction, ...] = tuple(Fraction(n, 16) for n in (4, 5, 6, 8, 10, 12, 14)) + tuple(
    Fraction(n, 8) for n in range(8, 16)) + tuple(Fraction(n, 4) for n in range(8, 13)) + tuple(
    Fraction(n) for n in range(4, 11))


@dataclass(frozen=True, slots=True, kw_only=True)
class Generated:
    """A generated scenario, with what it was checked against.

    Attributes:
        scenario: the scenario (write it with `briefer.instructor.scenario_format.write_scenario`).
        loaded: the scenario resolved (request and decoded report).
        brief: its brief.
        checks: plain sentences: what makes this case exercise its emphasis (with numbers).
    """

    scenario: Scenario
    loaded: LoadedScenario
    brief: Any
    checks: tuple[str, ...]


# --------------------------------------------------------------------------------------------
# The weather report
# --------------------------------------------------------------------------------------------
@dataclass(slots=True)
class WeatherPlan:
    """The weather as it will be coded (whole units, as a report codes them)."""

    wind_from_deg: int | None = None          # true, 10..360; None with a speed = variable
    wind_speed_kt: int = 0
    wind_gust_kt: int | None = None
    visibility_sm: Fraction | None = None     # statute-mile reports
    visibility_m: int | None = None           # metre reports
    weather: tuple[str, ...] = ()
    clouds: tuple[tuple[str, int], ...] = ()  # (amount, height in hundreds of feet)
    temperature_c: int = 15
    dew_point_c: int = 10
    altimeter_hundredths_inhg: int | None = None
    altimeter_hpa: int | None = None
    day: int = 1
    hour: int = 12
    minute: int = 50


def _sm_text(v: Fraction) -> str:
    whole, rest = divmod(v, 1)
    if rest == 0:
        return f"{int(whole)}SM"
    frac = f"{rest.numerator}/{rest.denominator}"
    return f"{int(whole)} {frac}SM" if whole else f"{frac}SM"


def _difference_text(diff, unit: str) -> str:
    """'1/8 SM above it', '300 m below it', 'exactly the minimum' (a Fraction in SM, or metres)."""
    if diff == 0:
        return "exactly the minimum"
    mag = abs(diff)
    text = _sm_text(Fraction(mag))[:-2] if isinstance(diff, Fraction) else f"{mag:.0f}"
    return f"{text}{unit} {'above' if diff > 0 else 'below'} it"


def _temp_text(t: int) -> str:
    return f"M{-t:02d}" if t < 0 else f"{t:02d}"


def station_of(ident: str) -> str:
    """The report's station: the airfield ident when it is a 4-character location indicator."""
    s = ident.upper()
    if len(s) == 4 and s[0].isalpha() and s.isalnum():
        return s
    return (s + "XXXX")[:4] if s[:1].isalpha() else "XXXX"


def format_report(station: str, w: WeatherPlan) -> str:
    """A METAR-style report of the plan (the groups `briefer.io.metar` decodes)."""
    groups = ["METAR", station, f"{w.day:02d}{w.hour:02d}{w.minute:02d}Z"]
    if w.wind_speed_kt == 0:
        groups.append("00000KT")
    else:
        d = "VRB" if w.wind_from_deg is None else f"{w.wind_from_deg:03d}"
        g = f"G{w.wind_gust_kt:02d}" if w.wind_gust_kt else ""
        groups.append(f"{d}{w.wind_speed_kt:02d}{g}KT")
    if w.visibility_sm is not None:
        groups.append(_sm_text(w.visibility_sm))
    elif w.visibility_m is not None:
        groups.append(f"{min(w.visibility_m, 9999):04d}")
    groups.extend(w.weather)
    if w.clouds:
        groups.extend(f"{a}{h:03d}" for a, h in w.clouds)
    else:
        groups.append("SKC")
    groups.append(f"{_temp_text(w.temperature_c)}/{_temp_text(w.dew_point_c)}")
    if w.altimeter_hundredths_inhg is not None:
        groups.append(f"A{w.altimeter_hundredths_inhg:04d}")
    elif w.altimeter_hpa is not None:
        groups.append(f"Q{w.altimeter_hpa:04d}")
    return " ".join(groups)


# --------------------------------------------------------------------------------------------
# The situation being generated
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True)
class Pair:
    """An approach and a landing runway, and the angle between the arrival and the landing course."""

    approach: str
    runway: str
    landing_course_deg_true: float
    arrival_off_reciprocal_deg: float   # 0 = arrival exactly on the reciprocal of the landing course
    arrival_off_landing_deg: float      # 0 = aligned with the landing course


def landing_course_deg_true(airfield: Airfield, designator: str) -> float:
    """The landing course of a runway end, true (as `briefer.brief` computes it)."""
    from briefer.core.airfield_geometry import AirfieldGeometry

    return float(AirfieldGeometry(airfield).runway(designator).landing_course_deg_true)


def candidate_pairs(airfield: Airfield, *, approach: str | None = None, runway: str | None = None) -> list[Pair]:
    """Every approach x landing runway that needs a circle (arrival more than 30 degrees off the
    landing course), restricted to the given approach and runway."""
    approaches = [airfield.approach(approach)] if approach else list(airfield.approaches)
    if runway:
        designators = [airfield.runway_by_designator(runway)[0].designator]
    else:
        designators = [t.designator for t in airfield.thresholds]
    out = []
    for ap in approaches:
        final_true = (ap.final_course_deg_mag + airfield.magnetic_variation_deg) % 360.0
        for des in designators:
            course = landing_course_deg_true(airfield, des)
            off_landing = abs(float(angles.wrap_180(final_true - course)))
            out.append(Pair(approach=ap.name, runway=des, landing_course_deg_true=course,
                            arrival_off_reciprocal_deg=180.0 - off_landing, arrival_off_landing_deg=off_landing))
    circles = [p for p in out if p.arrival_off_landing_deg > ALIGNED_WITHIN_DEG]
    if not circles:
        named = f"{approach} to runway {runway}" if (approach and runway) else "any approach and runway given"
        raise DomainError(f"{airfield.ident}: {named} arrives within {ALIGNED_WITHIN_DEG:.0f}° of the landing "
                          "course: that is a straight-in, not a circle")
    return circles


@dataclass
class _Ctx:
    airfield: Airfield
    profile: AircraftProfile
    configuration: str | None
    rng: random.Random
    seed: int
    checks: list[str] = field(default_factory=list)

    @property
    def station(self) -> str:
        return station_of(self.airfield.ident)

    def request(self, pair: Pair, weather: Weather, weight_lb: float) -> BriefRequest:
        return BriefRequest(profile=self.profile, configuration=self.configuration, airfield=self.airfield,
                            approach=pair.approach, landing_runway=pair.runway, weather=weather, weight_lb=weight_lb)


def _metric(airfield: Airfield, pair: Pair) -> bool:
    return airfield.approach(pair.approach).criteria == "icao"


def _isa_c(elevation_ft: float) -> float:
    from briefer.core import atmosphere

    return float(atmosphere.isa_temperature_c(elevation_ft))


def _round_wind_dir(deg_true: float) -> int:
    d = int(round((deg_true % 360.0) / 10.0)) * 10
    return 360 if d == 0 else d


def _base_weather(ctx: _Ctx, pair: Pair, *, metric: bool) -> WeatherPlan:
    """A benign report: a moderate wind favouring the landing runway, good visibility, a ceiling
    well above the circling height, a temperature near ISA."""
    r = ctx.rng
    elev = ctx.airfield.elevation_ft
    w = WeatherPlan(day=r.randint(1, 28), hour=r.randint(0, 23), minute=50)
    w.wind_from_deg = _round_wind_dir(pair.landing_course_deg_true + r.uniform(-50.0, 50.0))
    w.wind_speed_kt = r.randint(4, 12)
    if metric:
        w.visibility_m = r.choice((6000, 7000, 8000, 9999))
        w.altimeter_hpa = r.randint(1002, 1028)
    else:
        w.visibility_sm = Fraction(r.choice((5, 6, 7, 10)))
        w.altimeter_hundredths_inhg = r.randint(2960, 3036)
    w.temperature_c = int(round(_isa_c(elev) + r.uniform(-8.0, 8.0)))
    w.dew_point_c = w.temperature_c - r.randint(2, 8)
    w.clouds = (("SCT", 0), ("BKN", 0))      # heights set once the circling height is known
    return w


def _set_clouds(w: WeatherPlan, haa_ft: float, rng: random.Random, *, low: bool = False) -> None:
    """A ceiling above the circling height: 100-500 ft above it when `low`, else 500-2000 ft."""
    extra = rng.randint(1, 5) if low else rng.randint(5, 20)
    base = max(1, math.ceil(haa_ft / 100.0) + extra)
    w.clouds = (("SCT", max(1, base - rng.randint(2, 4))), ("OVC" if low else "BKN", base)) if base > 5 else (
        ("BKN", base),)


def _weather_of(ctx: _Ctx, w: WeatherPlan) -> tuple[str, ScenarioWeather]:
    from briefer.io.metar import decode_metar
    from briefer.io.weather_input import weather_fields

    report = format_report(ctx.station, w)
    return report, ScenarioWeather(report=report, **weather_fields(report=decode_metar(report)))


def _weight(ctx: _Ctx) -> float:
    mlw = ctx.profile.max_landing_weight_lb
    lo, hi = WEIGHT_FRACTION
    w = math.floor(mlw * ctx.rng.uniform(lo, hi) / WEIGHT_STEP_LB) * WEIGHT_STEP_LB
    return float(min(mlw, max(w, math.ceil(0.4 * mlw / WEIGHT_STEP_LB) * WEIGHT_STEP_LB)))


def _brief(req: BriefRequest, report: str) -> Any:
    from briefer.brief import build_brief
    from briefer.io.metar import decode_metar
    from briefer.instructor.scenario_format import scenario_time_text

    decoded = decode_metar(report)
    return build_brief(req, weather_report=decoded, computed_utc=scenario_time_text(decoded))


@dataclass
class _Case:
    pair: Pair
    plan: WeatherPlan
    weight_lb: float
    report: str = ""
    weather: ScenarioWeather | None = None
    request: BriefRequest | None = None
    brief: Any = None

    def build(self, ctx: _Ctx) -> _Case:
        self.report, self.weather = _weather_of(ctx, self.plan)
        self.request = ctx.request(self.pair, self.weather.as_weather(), self.weight_lb)
        self.brief = _brief(self.request, self.report)
        return self


def _start(ctx: _Ctx, pair: Pair, *, low_clouds: bool = False) -> _Case:
    """A benign case for a pair, clouds placed above the circling height of its category."""
    metric = _metric(ctx.airfield, pair)
    case = _Case(pair=pair, plan=_base_weather(ctx, pair, metric=metric), weight_lb=_weight(ctx)).build(ctx)
    haa = case.brief.minimums.height_above_airport_ft
    if haa is None:
        haa = case.brief.sight_picture.circling_height_ft
    _set_clouds(case.plan, haa, ctx.rng, low=low_clouds)
    return case.build(ctx)


def _authorised(case: _Case) -> bool:
    return bool(case.brief.minimums.authorised)


def _shuffled(rng: random.Random, items: Sequence[Any]) -> list[Any]:
    out = list(items)
    rng.shuffle(out)
    return out


# --------------------------------------------------------------------------------------------
# The emphases
# --------------------------------------------------------------------------------------------
def base_tailwind_kt(*, wind_from_deg_true: float, wind_speed_kt: float, landing_course_deg_true: float,
                     side: str) -> float:
    """Tailwind component in the base turn: where the turn to final heads square to the runway,
    toward it (runway frame of `briefer.core.manoeuvre.legs`: a right-hand pattern's base heads
    left). Positive = tailwind (it carries the aircraft through the centreline).

    tail = sigma * W * sin(wind_from - landing_course), sigma = +1 for a right-hand pattern.
    """
    sigma = 1.0 if side == "right" else -1.0
    return sigma * wind_speed_kt * float(angles.sind(wind_from_deg_true - landing_course_deg_true))


def _tail_ok(tail_kt: float, speed_kt: float) -> bool:
    return tail_kt >= max(TAILWIND_ON_BASE_MIN_KT, TAILWIND_ON_BASE_MIN_FRACTION * speed_kt)


def _tailwind_on_base(ctx: _Ctx, pairs: list[Pair]) -> _Case:
    import numpy as np

    from briefer.brief import envelope_for
    from briefer.core import maneuver

    dirs_true = np.arange(10.0, 361.0, 10.0)
    speeds = np.arange(6.0, 31.0, 2.0)
    for pair in pairs:
        case = _start(ctx, pair)
        if not _authorised(case):
            continue
        rel_all = dirs_true - pair.landing_course_deg_true
        # only directions that can give a tailwind on base (|sin| >= 0.4) without a tailwind on final
        keep = (np.abs(angles.sind(rel_all)) >= TAILWIND_ON_BASE_MIN_FRACTION) & (angles.cosd(rel_all) >= -0.1)
        dirs, rel = dirs_true[keep], rel_all[keep]
        env = envelope_for(case.request, wind_from_relative_deg=rel, wind_speed_kt=speeds)
        cells = []
        for i, j in zip(*np.nonzero(env.status == maneuver.MARGINAL)):
            if env.best_candidate[i, j] < 0:
                continue
            shape, side = env.candidates[int(env.best_candidate[i, j])]
            d, s = float(dirs[i]), float(speeds[j])
            tail = base_tailwind_kt(wind_from_deg_true=d, wind_speed_kt=s,
                                    landing_course_deg_true=pair.landing_course_deg_true, side=side)
            head_final = s * float(angles.cosd(d - pair.landing_course_deg_true))
            if shape != "direct-turn" and _tail_ok(tail, s) and head_final >= -TAILWIND_MAX_ON_FINAL_KT:
                cells.append((int(d), int(s)))
        # moderate winds first (a 30 kt wind is a case for a diversion, not for a circle)
        for d, s in sorted(_shuffled(ctx.rng, cells), key=lambda c: c[1] > MODERATE_WIND_KT)[:6]:
            case.plan.wind_from_deg, case.plan.wind_speed_kt, case.plan.wind_gust_kt = d, s, None
            case.build(ctx)
            b = case.brief
            if not (b.plan.feasible and b.minimums.authorised):
                continue
            tail = base_tailwind_kt(wind_from_deg_true=d, wind_speed_kt=s,
                                    landing_course_deg_true=pair.landing_course_deg_true, side=b.plan.side)
            if not _tail_ok(tail, s):
                continue
            cell = envelope_for(case.request, wind_from_relative_deg=[d - pair.landing_course_deg_true],
                                wind_speed_kt=[float(s)])
            if int(cell.status[0, 0]) != maneuver.MARGINAL:
                continue
            why = "; ".join(cell.reason_texts(0, 0))
            ctx.checks.append(f"Wind {d:03d}/{s} kt true: a {tail:.0f} kt tailwind in the base turn of the "
                              f"{b.plan.side}-hand pattern ({b.plan.shape_text.lower()}).")
            ctx.checks.append(f"The wind envelope rates this wind MARGINAL: {why}.")
            return case
    raise DomainError(f"{ctx.airfield.ident}: no wind puts a tailwind on the base turn within the envelope's "
                      f"marginal band for {ctx.profile.name} (approaches tried: "
                      f"{', '.join(sorted({p.approach for p in pairs}))})")


def _low_visibility(ctx: _Ctx, pairs: list[Pair]) -> _Case:
    for pair in pairs:
        case = _start(ctx, pair, low_clouds=True)
        req_sm = case.brief.minimums.visibility_required_sm
        if not _authorised(case) or req_sm is None:
            continue
        case.plan.dew_point_c = case.plan.temperature_c - ctx.rng.randint(0, 1)
        below = ctx.rng.random() < LOW_VIS_BELOW_CHANCE
        if case.plan.visibility_m is not None:
            req_m = round(req_sm * units.SM_TO_M)
            steps = [v for v in range(100, 10000, 100) if abs(v - req_m) <= LOW_VIS_MARGIN_M]
            pool = [v for v in steps if (v < req_m) == below] or steps
            vis_m = ctx.rng.choice(pool)
            case.plan.visibility_m, case.plan.visibility_sm = vis_m, None
            case.plan.weather = ("BR",) if vis_m >= 1000 else ("FG",)
            text = f"{vis_m} m against the required {req_m} m ({_difference_text(vis_m - req_m, ' m')})"
        else:
            steps = [v for v in SM_STEPS if abs(float(v) - req_sm) <= LOW_VIS_MARGIN_SM + 1e-9]
            pool = [v for v in steps if (float(v) < req_sm - 1e-9) == below] or steps
            vis = ctx.rng.choice(pool)
            case.plan.visibility_sm, case.plan.visibility_m = vis, None
            case.plan.weather = ("BR",) if vis >= Fraction(5, 8) else ("FG",)
            req = Fraction(req_sm).limit_denominator(16)
            text = (f"{_sm_text(vis)[:-2]} SM against the required {_sm_text(req)[:-2]} SM "
                    f"({_difference_text(vis - req, ' SM')})")
        case.build(ctx)
        ok = case.brief.minimums.visibility_ok
        ctx.checks.append(f"Reported visibility {text}: "
                          + ("at or above the minimum, but the runway may be lost in the turn." if ok else
                             "BELOW the minimum: the approach may not be continued to land."))
        return case
    raise DomainError(f"{ctx.airfield.ident}: no authorised circling line for {ctx.profile.name} to set a "
                      "visibility against")


def _reciprocal(ctx: _Ctx, pairs: list[Pair]) -> _Case:
    recips = [p for p in pairs if p.arrival_off_reciprocal_deg <= RECIPROCAL_WITHIN_DEG]
    if not recips:
        raise DomainError(f"{ctx.airfield.ident}: no approach and runway pair arrives within "
                          f"{RECIPROCAL_WITHIN_DEG:.0f}° of the reciprocal of the landing course")
    fallback = None
    for pair in recips:
        case = _start(ctx, pair)
        if not _authorised(case):
            continue
        for _ in range(6):
            case.plan.wind_from_deg = _round_wind_dir(pair.landing_course_deg_true + ctx.rng.uniform(-40.0, 40.0))
            case.plan.wind_speed_kt = ctx.rng.randint(8, 20)
            case.plan.wind_gust_kt = case.plan.wind_speed_kt + ctx.rng.randint(8, 12) if ctx.rng.random() < 0.3 else None
            case.build(ctx)
            if case.brief.plan.feasible:
                break
        fallback = fallback or case
        if case.brief.plan.feasible:
            break
    if fallback is None:
        raise DomainError(f"{ctx.airfield.ident}: circling to the reciprocal is not authorised for "
                          f"{ctx.profile.name}")
    pair = case.pair if case.brief.plan.feasible else fallback.pair
    case = case if case.brief.plan.feasible else fallback
    ctx.checks.append(f"{pair.approach} arrives {pair.arrival_off_reciprocal_deg:.0f}° off the reciprocal of "
                      f"runway {pair.runway}; the wind favours runway {pair.runway} "
                      f"(headwind {case.brief.wind.headwind_kt:.0f} kt).")
    return case


def _temperature(ctx: _Ctx, pairs: list[Pair], *, hot: bool) -> _Case:
    elev = ctx.airfield.elevation_ft
    isa = _isa_c(elev)
    for pair in pairs:
        case = _start(ctx, pair)
        if not _authorised(case):
            continue
        if hot:
            t = min(MAX_OAT_C, int(round(isa + ctx.rng.uniform(*HOT_ISA_DEVIATION_C))))
            if case.plan.altimeter_hpa is not None:
                case.plan.altimeter_hpa = ctx.rng.randint(1000, 1012)
            else:
                case.plan.altimeter_hundredths_inhg = ctx.rng.randint(2970, 2995)
            case.plan.dew_point_c = t - ctx.rng.randint(15, 30)
        else:
            t = max(MIN_OAT_C, int(round(isa - ctx.rng.uniform(*COLD_ISA_DEVIATION_C))))
            if case.plan.altimeter_hpa is not None:
                case.plan.altimeter_hpa = ctx.rng.randint(1025, 1045)
            else:
                case.plan.altimeter_hundredths_inhg = ctx.rng.randint(3030, 3080)
            case.plan.dew_point_c = t - ctx.rng.randint(1, 4)
        case.plan.temperature_c = t
        case.build(ctx)
        pf = case.brief.performance
        word = "above" if hot else "below"
        ctx.checks.append(f"{t} °C at {elev:.0f} ft is {abs(t - round(isa)):.0f} °C {word} ISA ({round(isa):.0f} °C); at the MDA "
                          f"ISA{signed(pf.isa_deviation_c)}: {pf.ias_kt:.0f} kt IAS is {pf.tas_kt:.0f} kt TAS, turn "
                          f"radius {pf.turn_radius_nm:.2f} NM.")
        cold = case.brief.minimums.cold
        if cold is not None:
            ctx.checks.append(f"Cold-temperature correction {cold.correction_ft:.0f} ft: fly the MDA as "
                              f"{cold.corrected_mda_ft:.0f} ft.")
        if hot and elev < 3000.0:
            ctx.checks.append(f"The field is at {elev:.0f} ft: the hot-and-high effect is larger at a high field.")
        return case
    raise DomainError(f"{ctx.airfield.ident}: no authorised circling line for {ctx.profile.name}")


def _familiar_score(b: Any) -> int:
    s = b.sight_picture
    if not s.familiar_possible:
        return 3
    if s.familiar_exceeds_bank_limit:
        return 2
    if s.familiar_stall_margin_pct is not None and s.familiar_stall_margin_pct < 15.0:
        return 1
    return 0


def _familiar_picture(ctx: _Ctx, pairs: list[Pair]) -> _Case:
    scored = []
    for pair in pairs:
        case = _start(ctx, pair)
        if _authorised(case):
            scored.append((_familiar_score(case.brief), case))
    if not scored or max(s for s, _ in scored) < 2:
        best = max((c.brief.sight_picture.familiar_bank_required_deg or 0.0 for _, c in scored), default=0.0)
        raise DomainError(f"the familiar pattern of {ctx.profile.name} still works at circling height at "
                          f"{ctx.airfield.ident} (it needs {best:.0f}° bank at most): choose another profile")
    top = max(s for s, _ in scored)
    case = ctx.rng.choice([c for s, c in scored if s == top])
    sp, fp = case.brief.sight_picture, ctx.profile.familiar_pattern
    need = ("no bank can make that turn (the wing stalls first)" if not sp.familiar_possible else
            f"it needs {sp.familiar_bank_required_deg:.0f}° bank, beyond the {case.brief.performance.bank_limit_deg:.0f}° "
            "limit")
    ctx.checks.append(f"The usual {fp.height_ft:.0f} ft pattern picture ({sp.familiar_depression_deg:.1f}° below the "
                      f"horizon) flown at {sp.circling_height_ft:.0f} ft puts the aircraft "
                      f"{sp.familiar_offset_at_circling_nm:.2f} NM from the runway: {need}.")
    return case


def _gusty_category(ctx: _Ctx, pairs: list[Pair]) -> _Case:
    from briefer.core import criteria, wind

    prof = ctx.profile
    cfg = prof.configuration(ctx.configuration)
    for pair in pairs:
        case = _start(ctx, pair)
        crit = ctx.airfield.approach(pair.approach).criteria
        for _ in range(40):
            weight = ctx.rng.choice((prof.max_landing_weight_lb, _weight(ctx)))
            d = _round_wind_dir(pair.landing_course_deg_true + ctx.rng.uniform(-70.0, 70.0))
            s = ctx.rng.randint(5, 18)
            g = s + ctx.rng.randint(8, 18)
            hw = float(wind.wind_components_kt(float(d), float(s), course_deg=pair.landing_course_deg_true).headwind_kt)
            base = cfg.circling_speed_kt * prof.weight_speed_factor(weight)
            steady = base + prof.wind_additive.additive_kt(headwind_kt=hw, gust_increment_kt=0.0)
            gusty = base + prof.wind_additive.additive_kt(headwind_kt=hw, gust_increment_kt=float(g - s))
            vref = prof.approach_category_speed_kt()
            cat_s = criteria.category_for_approach(vref_kt=vref, circling_speed_kt=steady, criteria=crit).category
            cat_g = criteria.category_for_approach(vref_kt=vref, circling_speed_kt=gusty, criteria=crit).category
            if cat_s == cat_g:
                continue
            case.weight_lb = float(weight)
            case.plan.wind_from_deg, case.plan.wind_speed_kt, case.plan.wind_gust_kt = d, s, g
            case.build(ctx)
            if any(f.code == "gust-raises-category" for f in case.brief.findings):
                m = case.brief.minimums
                mins = (f"its MDA is {m.mda_ft:.0f} ft" if m.authorised else
                        f"circling is NOT AUTHORISED for Cat {cat_g}")
                ctx.checks.append(f"Wind {d:03d}/{s}G{g} kt: the steady additive gives {steady:.0f} kt (Cat {cat_s}); "
                                  f"with the gust {gusty:.0f} kt, Cat {cat_g}: {mins}.")
                return case
    raise DomainError(f"no gust raises the category of {prof.name} at {ctx.airfield.ident}: its circling speed "
                      f"({cfg.circling_speed_kt:.0f} kt, additive up to {prof.wind_additive.max_kt:.0f} kt) stays "
                      "inside one category")


_GENERATORS: dict[str, Callable[[_Ctx, list[Pair]], _Case]] = {
    "tailwind-on-base": _tailwind_on_base,
    "low-visibility": _low_visibility,
    "reciprocal": _reciprocal,
    "hot-high": lambda ctx, pairs: _temperature(ctx, pairs, hot=True),
    "cold": lambda ctx, pairs: _temperature(ctx, pairs, hot=False),
    "familiar-picture": _familiar_picture,
    "gusty-category": _gusty_category,
}


def _check_authorised(ctx: _Ctx, pairs: list[Pair]) -> None:
    """Raise a clear error when no pair authorises circling for the profile's category (calm air)."""
    from briefer.brief import situation

    cats = []
    for pair in pairs:
        req = ctx.request(pair, Weather(), ctx.profile.max_landing_weight_lb)
        cat = situation(req).category.category
        if ctx.airfield.approach(pair.approach).circling_minimum(cat) is not None:
            return
        cats.append(cat)
    names = ", ".join(sorted({p.approach for p in pairs}))
    raise DomainError(f"circling is not authorised for {ctx.profile.name} (category {'/'.join(sorted(set(cats)))}) "
                      f"at {ctx.airfield.ident} on {names}")


# --------------------------------------------------------------------------------------------
# The front door
# --------------------------------------------------------------------------------------------
def new_seed() -> int:
    """A fresh seed (from the operating system) for when the user gives none."""
    import secrets

    return secrets.randbelow(DEFAULT_SEED_MAX + 1)


def generate_scenario(*, airfield: Airfield, profile: AircraftProfile, emphasis: str | None = None,
                      seed: int, approach: str | None = None, runway: str | None = None,
                      configuration: str | None = None, airfield_ref: str | None = None,
                      profile_ref: str | None = None) -> Generated:
    """A plausible scenario that exercises `emphasis`, the same for the same inputs and seed.

    Parameters
    ----------
    airfield, profile:
        The models.
    emphasis:
        One of `EMPHASES`; None draws one from the seed.
    seed:
        The seed of the one `random.Random` every choice comes from (0 to 2^63-1).
    approach, runway:
        Restrict the approach and the landing runway (default: drawn among the pairs that
        need a circle and suit the emphasis).
    configuration:
        The profile's configuration (default: its own default, the circling one).
    airfield_ref, profile_ref:
        How the scenario file names the airfield and profile (default: ident and name).

    Raises
    ------
    DomainError
        When the emphasis cannot be exercised here (the message says why), or for an unknown
        approach, runway or emphasis.
    """
    if not (isinstance(seed, int) and not isinstance(seed, bool) and 0 <= seed <= SEED_MAX):
        raise DomainError(f"seed must be {SEED_WORDS}; got {seed!r}")
    rng = random.Random(seed)
    if emphasis is None:
        emphasis = rng.choice(EMPHASES)
    if emphasis not in EMPHASES:
        raise DomainError(f"unknown emphasis {emphasis!r}; expected one of {', '.join(EMPHASES)}")
    profile.configuration(configuration)
    ctx = _Ctx(airfield=airfield, profile=profile, configuration=configuration, rng=rng, seed=seed)
    pairs = _shuffled(rng, candidate_pairs(airfield, approach=approach, runway=runway))
    _check_authorised(ctx, pairs)
    case = _GENERATORS[emphasis](ctx, pairs)
    b = case.brief
    title = (f"{airfield.ident} {case.pair.approach}, circle to {case.pair.runway}: "
             f"{EMPHASIS_TITLES[emphasis]}")
    notes = " ".join(ctx.checks) + f" (Generated from seed {seed}.)"
    scenario = Scenario(title=title, airfield=airfield_ref or airfield.ident, approach=case.pair.approach,
                        landing_runway=case.pair.runway, profile=profile_ref or profile.name,
                        configuration=configuration, weight_lb=case.weight_lb, weather=case.weather,
                        emphasis=emphasis, seed=seed, notes=notes)
    from briefer.io.metar import decode_metar

    loaded = LoadedScenario(scenario=scenario, request=case.request, report=decode_metar(case.report))
    return Generated(scenario=scenario, loaded=loaded, brief=b, checks=tuple(ctx.checks))


__all__ = [
    "Generated",
    "Pair",
    "WeatherPlan",
    "base_tailwind_kt",
    "candidate_pairs",
    "format_report",
    "generate_scenario",
    "landing_course_deg_true",
    "new_seed",
    "station_of",
]
