"""Wiring tests of `briefer.brief.build_brief` (STYLE F, orchestrator layer).

These tests check that the right inputs reach the right core function and that its result flows
into the Brief unchanged: published radii and minimums, the category raise, findings instead of
exceptions, the cold correction, the plan's roll-out on the centreline, the sight picture and the
stable JSON form. The physics itself is checked in the core tests (test_criteria, test_maneuver,
test_sightpicture, test_coldtemp ...), not here again.

Where an expected value is read from the demo data it says so; hand-derived values show their
arithmetic.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from conftest import demo_landings, designator_heading_deg
from numpy.testing import assert_allclose

from briefer import brief as brief_mod
from briefer import units
from briefer.brief import build_brief, demo_request, situation
from briefer.cautions import CAUTIONS
from briefer.commands._common import _jsonable
from briefer.core import coldtemp, criteria, maneuver
from briefer.io import catalog
from briefer.model import BriefOptions, BriefRequest, Weather
from briefer.render.brief_json import SCHEMA, brief_to_dict

# A fixed time stamp keeps the briefs comparable (the stamp is not under test here).
UTC = "2000-01-01 00:00Z"

# Plain, unremarkable weather for the wiring cases: calm, ISA-ish, good visibility, high ceiling.
FAIR = dict(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=6.0, ceiling_ft=4000.0)


def request(profile: str, airfield: str, approach: str, runway: str, **kw) -> BriefRequest:
    wx = dict(FAIR)
    wx.update(kw.pop("weather", {}))
    return BriefRequest(profile=catalog.find_profile(profile), airfield=catalog.find_airfield(airfield),
                        approach=approach, landing_runway=runway, weather=Weather(**wx), **kw)


def brief_of(req: BriefRequest, **kw):
    return build_brief(req, computed_utc=UTC, **kw)


def codes(b) -> list[str]:
    return [f.code for f in b.findings]


def finding(b, code: str):
    found = [f for f in b.findings if f.code == code]
    assert len(found) == 1, (code, codes(b))
    return found[0]


# A wind faster than the aircraft (twin, about 104 kt TAS at V2RL): no plan can be flown.
NO_PLAN = request("demo-twin", "V2RL", "RNAV (GPS) RWY 09", "27", weather=dict(wind_from_deg=263.0, wind_speed_kt=110.0))


@pytest.fixture(scope="module")
def demo_brief():
    return brief_of(demo_request())


# One case per criteria set of the demo data (the approach's own criteria, see the airfield files).
CASES = [
    pytest.param(("demo-bizjet", "V2RL", "RNAV (GPS) RWY 09", "27"), id="terps-expanded-V2RL"),
    pytest.param(("demo-twin", "Q7HM", "VOR-A", "13"), id="terps-legacy-Q7HM"),
    pytest.param(("demo-bizjet", "X4CD", "VOR RWY 33", "15"), id="icao-X4CD"),
]


# --- published radii and minimums flow through unchanged -------------------------------------------
@pytest.mark.parametrize("case", CASES)
def test_area_radius_is_the_criteria_value(case):
    """area.radius_nm is criteria.circling_area_radius_nm for the approach's criteria, the
    category that applies and the MDA of that category (unchanged, not recomputed)."""
    req = request(*case)
    b = brief_of(req)
    appr = req.selected_approach()
    cat = b.category.category
    expected = criteria.circling_area_radius_nm(cat, criteria=appr.criteria,
                                                mda_ft_msl=appr.circling_minimum(cat).mda_ft,
                                                airport_elevation_ft=req.airfield.elevation_ft)
    assert b.area.criteria == appr.criteria == b.header.criteria
    assert b.area.radius_nm == expected.radius_nm
    assert b.area.basis == expected.basis
    assert b.area.provenance == criteria.provenance_label(expected.provenance)


def test_area_radius_call_receives_category_criteria_and_mda(monkeypatch):
    """Spy on the core call: the applied category (D, raised), the approach's criteria
    (terps-expanded, V2RL file) and the category D circling MDA (1860 ft, V2RL file)."""
    calls = []
    real = criteria.circling_area_radius_nm

    def spy(category, **kw):
        calls.append((category, kw))
        return real(category, **kw)

    monkeypatch.setattr(brief_mod.criteria, "circling_area_radius_nm", spy)
    b = brief_of(demo_request())
    assert calls, "circling_area_radius_nm was not called"
    category, kw = calls[0]
    assert category == b.category.category == "D"
    assert kw["criteria"] == "terps-expanded"
    assert kw["mda_ft_msl"] == 1860.0                    # V2RL RNAV (GPS) RWY 09, circling D
    assert kw["airport_elevation_ft"] == 1120.0          # V2RL elevation


def test_criteria_option_overrides_the_approach_criteria():
    """options.criteria reaches the category rule and the radius: under ICAO the demo bizjet's
    circling speed stays within the Cat C maximum circling IAS (180 kt), so no raise."""
    req = replace(demo_request(), options=BriefOptions(criteria="icao"))
    b = brief_of(req)
    assert b.area.criteria == "icao" and b.header.criteria == "icao"
    expected = criteria.category_for_approach(vref_kt=req.profile.approach_category_speed_kt(),
                                              circling_speed_kt=b.category.circling_speed_kt, criteria="icao")
    assert b.category.category == expected.category == "C"
    assert b.area.radius_nm == criteria.circling_area_radius_nm(
        "C", criteria="icao", mda_ft_msl=1860.0, airport_elevation_ft=1120.0).radius_nm


@pytest.mark.parametrize("case", CASES)
def test_minimums_flow_from_the_approach_table(case):
    """MDA and visibility are the approach's circling line for the category; HAA = MDA - airfield
    elevation (the airfield's elevation, not the threshold's)."""
    req = req_ = request(*case)
    b = brief_of(req_)
    entry = req.selected_approach().circling_minimum(b.category.category)
    assert b.minimums.authorised is True
    assert b.minimums.mda_ft == entry.mda_ft
    assert b.minimums.height_above_airport_ft == entry.mda_ft - req.airfield.elevation_ft
    if entry.visibility_sm is not None:
        assert b.minimums.visibility_required_sm == entry.visibility_sm
    else:   # charted in metres (ICAO file): converted with the units constant, nothing else
        assert_allclose(b.minimums.visibility_required_sm, entry.visibility_as_charted_m * units.M_TO_SM,
                        rtol=1e-12)


def test_demo_minimums_hand_checked(demo_brief):
    """V2RL file, RNAV (GPS) RWY 09, circling D: MDA 1860 ft, 2.5 SM; HAA = 1860 - 1120 = 740 ft."""
    m = demo_brief.minimums
    assert (m.mda_ft, m.height_above_airport_ft, m.visibility_required_sm) == (1860.0, 740.0, 2.5)


def test_lowest_height_and_clearance_are_the_criteria_values(demo_brief):
    lowest = criteria.minimum_circling_height_ft("D", criteria="terps-expanded")
    roc = criteria.circling_obstacle_clearance_ft("D", criteria="terps-expanded")
    assert demo_brief.minimums.lowest_height_ft == lowest.height_ft
    assert demo_brief.minimums.obstacle_clearance_ft == roc.clearance_ft


# --- the category ----------------------------------------------------------------------------------
def test_category_raised_when_circling_above_the_band(demo_brief):
    """14 CFR 97.3: the category follows the speed flown. The demo bizjet is C by VREF but
    circles at the configuration's circling speed scaled to the weight plus the wind additive;
    the brief passes exactly that speed to category_for_approach."""
    req = demo_request()
    prof, cfg, wx = req.profile, req.selected_configuration(), req.weather
    c = demo_brief.category
    additive = prof.wind_additive.additive_kt(headwind_kt=demo_brief.wind.headwind_kt,
                                              gust_increment_kt=wx.gust_increment_kt)
    assert_allclose(c.wind_additive_kt, additive, rtol=1e-12)
    assert_allclose(c.circling_speed_kt,
                    cfg.circling_speed_kt * prof.weight_speed_factor(req.landing_weight_lb) + additive, rtol=1e-12)
    expected = criteria.category_for_approach(vref_kt=prof.approach_category_speed_kt(),
                                              circling_speed_kt=c.circling_speed_kt, criteria="terps-expanded")
    assert (c.certified_category, c.category, c.raised) == (expected.certified_category, expected.category, True)
    assert (c.certified_category, c.category) == ("C", "D")   # demo-bizjet file comment
    from briefer.brief.minimums_and_area import _reason_as_printed

    assert c.reason == _reason_as_printed(expected.reason)    # the same sentence, speeds in whole knots
    assert "category-raised" in codes(demo_brief)
    assert demo_brief.performance.ias_kt == c.circling_speed_kt


def test_wind_additive_can_be_switched_off():
    req = replace(demo_request(), options=BriefOptions(apply_wind_additive=False))
    b = brief_of(req)
    assert b.category.wind_additive_kt == 0.0
    assert_allclose(b.category.circling_speed_kt,
                    req.selected_configuration().circling_speed_kt
                    * req.profile.weight_speed_factor(req.landing_weight_lb), rtol=1e-12)


def test_no_raise_finding_when_the_category_holds():
    """ICAO keeps Cat C up to 180 kt (Doc 8168 Table I-4-1-2): no raise, no finding."""
    b = brief_of(request("demo-bizjet", "X4CD", "VOR RWY 33", "15"))
    assert b.category.raised is False and b.category.category == b.category.certified_category
    assert "category-raised" not in codes(b)


def test_category_not_authorised_is_a_danger_finding_not_an_exception():
    """V2RL file: circling E is not authorised (with a reason). The trainer is Cat E."""
    req = request("demo-trainer", "V2RL", "RNAV (GPS) RWY 09", "27")
    b = brief_of(req)
    assert b.category.category == "E"
    m = b.minimums
    assert m.authorised is False and m.mda_ft is None and m.height_above_airport_ft is None
    assert m.visibility_required_sm is None
    assert m.not_authorised_reason == req.selected_approach().circling_not_authorised_reason("E")
    f = finding(b, "not-authorised")
    assert f.severity == "danger" and m.not_authorised_reason in f.text
    assert b.warnings[0].severity == "danger"


def test_category_without_a_line_is_not_authorised():
    """X4CD RNP RWY 15 publishes no Cat E circling line (X4CD file)."""
    b = brief_of(request("demo-trainer", "X4CD", "RNP RWY 15", "33"))
    assert b.minimums.authorised is False
    assert finding(b, "not-authorised").severity == "danger"


# --- weather findings ------------------------------------------------------------------------------
@pytest.mark.parametrize(("ceiling_ft", "ok"), [
    pytest.param(739.0, False, id="1-ft-below-HAA"),      # HAA 740 (hand: 1860 - 1120)
    pytest.param(740.0, True, id="at-HAA"),               # "at or above the HAA" (result.py)
])
def test_ceiling_against_the_haa(ceiling_ft, ok):
    b = brief_of(demo_request(ceiling_ft=ceiling_ft))
    assert b.minimums.ceiling_ok is ok
    assert b.minimums.ceiling_reported_ft == ceiling_ft
    assert ("ceiling-below-mda" in codes(b)) is (not ok)
    if not ok:
        assert finding(b, "ceiling-below-mda").severity == "danger"


@pytest.mark.parametrize(("visibility_sm", "ok"), [
    pytest.param(2.25, False, id="below-2.5"),            # Cat D requires 2.5 SM (V2RL file)
    pytest.param(2.5, True, id="at-2.5"),
])
def test_visibility_against_the_minimum(visibility_sm, ok):
    b = brief_of(demo_request(visibility_sm=visibility_sm))
    assert b.minimums.visibility_ok is ok
    assert ("visibility-below-minimum" in codes(b)) is (not ok)
    if not ok:
        assert finding(b, "visibility-below-minimum").severity == "danger"


def test_missing_weather_is_assumed_and_said():
    """No temperature: ISA at the field; no altimeter: standard; both become info findings."""
    b = brief_of(demo_request(oat_c=None, altimeter_hpa=None, visibility_sm=None, ceiling_ft=None))
    assert {"oat-assumed", "altimeter-assumed"} <= set(codes(b))
    assert b.weather.altimeter_hpa == brief_mod.STANDARD_ALTIMETER_HPA
    assert b.minimums.visibility_ok is None and b.minimums.ceiling_ok is None


def test_variable_wind_is_planned_calm_and_flagged():
    """VRB/8: the plan is solved in calm air and the wind counts as a tailwind for the checks."""
    vrb = demo_request(wind_from_deg=None, wind_speed_kt=8.0, wind_gust_kt=None)
    s = situation(vrb)
    assert s.wind_from_true is None
    assert s.inputs.wind == maneuver.runway_wind_from(0.0, 0.0)
    b = brief_of(vrb)
    assert finding(b, "variable-wind").severity == "warning"
    assert b.wind.from_deg_true is None
    assert b.wind.headwind_kt == -8.0 and b.wind.crosswind_from_right_kt == 0.0
    calm = brief_of(demo_request(wind_from_deg=None, wind_speed_kt=0.0, wind_gust_kt=None))
    assert "variable-wind" not in codes(calm)
    # same additive (a tailwind adds nothing), same calm-air plan
    assert b.category.circling_speed_kt == calm.category.circling_speed_kt
    assert_allclose(b.plan.track_xy_m, calm.plan.track_xy_m, atol=1e-9)


def test_tailwind_finding():
    """Runway 27's true course is about 262 deg (V2RL file: 271 M, variation 8.5 W); a wind from
    082 true is a tailwind of almost all its speed."""
    b = brief_of(demo_request(wind_from_deg=82.0, wind_speed_kt=10.0, wind_gust_kt=None))
    assert b.wind.headwind_kt < -9.0
    assert finding(b, "tailwind").severity == "warning"


# --- cold temperature ------------------------------------------------------------------------------
@pytest.mark.parametrize("method", ["sea-level-table", "airport-elevation"])
@pytest.mark.parametrize("oat_c", [0.0, -20.0])
def test_cold_correction_at_or_below_zero(oat_c, method):
    """At or below 0 degC the correction of coldtemp (by the method asked) is added to the MDA,
    and the finding names the method."""
    req = request("demo-bizjet", "X4CD", "VOR RWY 33", "15", weather={"oat_c": oat_c},
                  options=BriefOptions(cold_temperature_method=method))
    b = brief_of(req)
    m = b.minimums
    expected = coldtemp.cold_temperature_correction(m.height_above_airport_ft, airport_oat_c=oat_c,
                                                    airport_elevation_ft=req.airfield.elevation_ft, method=method)
    assert m.cold is not None
    assert m.cold.method == method == expected.method
    assert m.cold.correction_ft == expected.correction_ft
    assert m.cold.corrected_mda_ft == m.mda_ft + expected.correction_ft
    assert m.cold.oat_c == oat_c
    f = finding(b, "cold-temperature")
    assert method in f.text and f.severity == "warning"


def test_no_cold_correction_above_zero():
    b = brief_of(request("demo-bizjet", "X4CD", "VOR RWY 33", "15", weather={"oat_c": 1.0}))
    assert b.minimums.cold is None
    assert "cold-temperature" not in codes(b)


# --- the plan --------------------------------------------------------------------------------------
def _roll_out_lateral_m(req: BriefRequest, b) -> np.ndarray:
    """Lateral offsets [m] of the track from the roll-out point to its end, in the runway frame."""
    along, right = situation(req).runway.to_runway_coords(b.plan.track_xy_m)
    roll_out_m = b.plan.roll_out_distance_nm * units.NM_TO_M
    i = int(np.argmin(np.abs(along + roll_out_m)))
    assert abs(along[i] + roll_out_m) < 1.0, "no track point at the roll-out distance"
    return np.asarray(right)[i:]


def test_demo_plan_rolls_out_on_the_centreline(demo_brief):
    lateral = _roll_out_lateral_m(demo_request(), demo_brief)
    assert np.max(np.abs(lateral)) < 1.0


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(wind_from=st.integers(0, 35).map(lambda i: 10.0 * i), speed=st.integers(0, 30).map(float))
def test_plan_rolls_out_on_the_centreline_in_any_wind(wind_from, speed):
    """Whatever the wind, a flyable plan's roll-out point lies on the extended centreline
    (< 1 m): the crab, not the track, absorbs the crosswind."""
    req = demo_request(wind_from_deg=wind_from, wind_speed_kt=speed, wind_gust_kt=None)
    b = brief_of(req)
    if not b.plan.feasible:
        assert any(f.severity == "danger" for f in b.findings)
        return
    assert np.max(np.abs(_roll_out_lateral_m(req, b))) < 1.0


def test_plan_track_is_in_the_local_frame(demo_brief):
    """The JSON and the drawings read local metres: the track ends at the landing threshold."""
    s = situation(demo_request())
    assert_allclose(demo_brief.plan.track_xy_m[-1], s.runway.threshold_xy_m, atol=1e-6)


def test_plan_that_does_not_fit_is_a_danger_finding():
    """Hot day at the mesa (Q7HM, +32 degC): the bizjet's turn outgrows the 2.3 NM legacy Cat D
    area even at the bank limit; the brief says so as danger findings, it does not raise."""
    b = brief_of(request("demo-bizjet", "Q7HM", "RNAV (GPS) RWY 31", "13",
                         weather=dict(wind_from_deg=150.0, wind_speed_kt=12.0, oat_c=32.0)))
    assert {"no-plan-fits", "leaves-area"} <= {f.code for f in b.findings if f.severity == "danger"}


def test_no_plan_leaves_nan_fields_not_an_exception():
    """A 110 kt wind down the runway, faster than the twin's circling TAS: no plan can be flown;
    the plan's numbers are NaN (null in JSON) and a danger finding says why."""
    b = brief_of(NO_PLAN)
    assert b.plan.feasible is False
    assert math.isnan(b.plan.offset_nm) and len(b.plan.track_xy_m) == 0
    assert "no-plan-fits" in codes(b) and finding(b, "no-plan-fits").severity == "danger"


# --- the sight picture -----------------------------------------------------------------------------
def test_planned_depression_is_atan_haa_over_offset(demo_brief):
    """Hand derivation: the runway seen from the downwind sits atan(h / d) below the horizon,
    h = circling height 740 ft (1860 - 1120), d = planned offset in feet."""
    sp, pl = demo_brief.sight_picture, demo_brief.plan
    assert sp.circling_height_ft == 740.0
    assert sp.planned_offset_nm == pl.offset_nm
    expected = math.degrees(math.atan(740.0 / (pl.offset_nm * units.NM_TO_FT)))
    assert_allclose(sp.planned_depression_deg, expected, rtol=1e-12)


def test_familiar_depression_is_atan_of_the_profile_pattern(demo_brief):
    """The profile's familiar pattern (height, offset) gives the familiar angle:
    demo-bizjet 1500 ft at 1.5 NM -> atan(1500 / (1.5 x 6076.1)) = 9.35 deg (hand)."""
    fp = demo_request().profile.familiar_pattern
    sp = demo_brief.sight_picture
    assert sp.familiar_height_ft == fp.height_ft
    expected = math.degrees(math.atan(fp.height_ft / (sp.familiar_offset_nm * units.NM_TO_FT)))
    assert_allclose(sp.familiar_depression_deg, expected, rtol=1e-12)
    assert_allclose(sp.familiar_depression_deg, 9.35, atol=0.01)


# --- the JSON form ---------------------------------------------------------------------------------
ISSUE_4_KEYS = [
    "category", "mda_ft", "height_above_airport_ft", "area.radius_nm", "area.criteria", "tas_kt",
    "plan.offset_nm", "plan.abeam_to_roll_in_s", "plan.roll_in_distance_nm", "plan.bank_deg",
    "plan.roll_out_distance_nm", "plan.inside_area", "plan.area_margin_nm", "plan.track",
    "sight_picture.planned_depression_deg", "sight_picture.familiar_depression_deg",
    "sight_picture.familiar_bank_required_deg", "sight_picture.familiar_load_factor",
    "sight_picture.familiar_stall_margin_pct", "missed_approach.turn_direction", "warnings", "cautions",
]


def _get(d: dict, dotted: str):
    for part in dotted.split("."):
        assert part in d, dotted
        d = d[part]
    return d


def test_json_has_every_issue_4_key(demo_brief):
    d = brief_to_dict(demo_brief)
    for key in ISSUE_4_KEYS:
        _get(d, key)
    assert d["schema"] == SCHEMA == "briefer.brief/1"


def test_json_values_are_the_brief_values(demo_brief):
    d, b = brief_to_dict(demo_brief), demo_brief
    assert d["category"] == b.category.category
    assert d["mda_ft"] == b.minimums.mda_ft and d["height_above_airport_ft"] == b.minimums.height_above_airport_ft
    assert d["area"]["radius_nm"] == b.area.radius_nm and d["tas_kt"] == b.performance.tas_kt
    assert d["plan"]["offset_nm"] == b.plan.offset_nm
    assert len(d["plan"]["track"]) == len(b.plan.track_xy_m)
    assert [w["code"] for w in d["warnings"]] == [f.code for f in b.warnings]
    assert d["missed_approach"]["turn_direction"] == b.missed_approach.turn_direction


@pytest.mark.parametrize("req", [
    pytest.param(demo_request(), id="demo"),
    pytest.param(NO_PLAN, id="no-plan-NaN-fields"),
    pytest.param(request("demo-trainer", "V2RL", "RNAV (GPS) RWY 09", "27"), id="not-authorised-None-fields"),
])
def test_json_is_strict_json_with_the_cautions(req):
    d = _jsonable(brief_to_dict(brief_of(req)))
    text = json.dumps(d, allow_nan=False)       # NaN/inf would raise here
    again = json.loads(text)
    assert again["cautions"] == list(CAUTIONS)
    assert again["schema"] == "briefer.brief/1"


# --- never raises over the demo data ---------------------------------------------------------------
def _weathers(landing_designator: str) -> dict[str, dict]:
    """Weathers relative to the landing runway (`designator_heading_deg`)."""
    hdg = designator_heading_deg(landing_designator)
    mag = dict(wind_reference="magnetic")
    return {
        "calm": dict(FAIR),
        "strong-crosswind": dict(FAIR, wind_from_deg=(hdg + 90.0) % 360.0, wind_speed_kt=35.0, **mag),
        "tailwind": dict(FAIR, wind_from_deg=(hdg + 180.0) % 360.0, wind_speed_kt=15.0, **mag),
        "gusty": dict(FAIR, wind_from_deg=(hdg + 40.0) % 360.0, wind_speed_kt=20.0, wind_gust_kt=38.0, **mag),
        "vrb": dict(FAIR, wind_from_deg=None, wind_speed_kt=6.0),
        "cold": dict(FAIR, oat_c=-35.0, altimeter_hpa=1035.0, visibility_sm=1.0, ceiling_ft=300.0),
        "hot": dict(FAIR, oat_c=45.0, altimeter_hpa=995.0, visibility_sm=None, ceiling_ft=None),
    }


def _all_demo_requests():
    for label, prof, af, approach, des in demo_landings():
        for name, wx in _weathers(des).items():
            yield (f"{label}/{name}", BriefRequest(profile=prof, airfield=af, approach=approach, landing_runway=des,
                                                   weather=Weather(**wx)))


def test_build_brief_never_raises_over_the_demo_data():
    """Every demo profile x airfield x approach x landing runway x weather gives a Brief whose
    JSON is strict: whatever cannot be flown is a finding."""
    failures, count = [], 0
    for label, req in _all_demo_requests():
        count += 1
        try:
            b = brief_of(req)
            json.dumps(_jsonable(brief_to_dict(b)), allow_nan=False)
        except Exception as exc:   # noqa: BLE001 - collect them all, then report
            failures.append(f"{label}: {type(exc).__name__}: {exc}")
            continue
        assert b.cautions == CAUTIONS
        cannot_fly = not b.minimums.authorised or (not b.plan.feasible and not b.minimums.straight_in_available)
        if cannot_fly:
            assert any(f.severity == "danger" for f in b.findings), label
    assert count >= 3 * 3 * 2 * 2 * 7     # profiles x airfields x approaches x runway ends x weathers
    assert failures == []
