"""briefer.model: invariants of hand-built models, look-ups, round trips.

The models are validated in __post_init__, so a model built by hand (a test, the TUI) gets the
same checks and messages as one read from a file; from_mapping adds the dotted path. Most checks
here are of our own rules; where a number is derived, the comment shows the arithmetic.
"""

from __future__ import annotations

import dataclasses
import math
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from briefer.errors import DataFileError, DomainError
from briefer.io.yamlload import dump_yaml, load_airfield, load_bytes, load_profile
from briefer.model import (
    AircraftProfile,
    Airfield,
    Approach,
    BriefOptions,
    BriefRequest,
    CirclingMinimum,
    Configuration,
    FamiliarPattern,
    FieldError,
    Fix,
    InvariantError,
    LatLon,
    Runway,
    Sector,
    Threshold,
    Weather,
    WindAdditive,
    normalise_designator,
    reciprocal_designator,
)
from briefer.units import INHG_TO_HPA

BAD = Path(__file__).parent / "bad_files"


@pytest.fixture(scope="module")
def profile() -> AircraftProfile:
    return load_profile(BAD / "good-profile.yaml")


@pytest.fixture(scope="module")
def airfield() -> Airfield:
    return load_airfield(BAD / "good-airfield.yaml")


def config(**changes: object) -> Configuration:
    base = dict(name="flaps-10", vref_kt=70, circling_speed_kt=85, vs1g_kt=55, aoa_ref=6, aoa_stall=15,
                bank_target_deg=20, bank_limit_deg=30)
    base.update(changes)
    return Configuration(**base)  # type: ignore[arg-type]


# --- hand-built models are validated -------------------------------------------------------------
@pytest.mark.parametrize(("changes", "message"), [
    pytest.param({"vref_kt": 50}, "vref_kt: expected above vs1g_kt (55), got 50", id="vref-below-vs1g"),
    pytest.param({"vref_kt": "70"}, "vref_kt: expected a number in knots, got '70'", id="text-for-number"),
    pytest.param({"vref_kt": True}, "vref_kt: expected a number in knots, got true", id="bool-for-number"),
    pytest.param({"vref_kt": math.nan}, "vref_kt: expected a finite number in knots, got nan", id="nan"),
    pytest.param({"bank_limit_deg": 90}, "bank_limit_deg: expected a number in degrees between 5 and 60, got 90",
                 id="bank-90"),
    pytest.param({"aoa_buffet": 16}, "aoa_buffet: expected above aoa_ref (6) and at most aoa_stall (15), got 16",
                 id="buffet-above-stall"),
    pytest.param({"bank_target_deg": 35}, "bank_target_deg: expected at most bank_limit_deg (30), got 35",
                 id="target-above-limit"),
    pytest.param({"name": "  "}, "name: expected text, got an empty value", id="blank-name"),
])
def test_configuration_invariants(changes: dict[str, object], message: str) -> None:
    with pytest.raises(InvariantError) as info:
        config(**changes)
    assert str(info.value) == message
    assert isinstance(info.value, DomainError)


def test_models_are_frozen_and_normalised() -> None:
    c = config()
    assert isinstance(c.vref_kt, float) and c.vref_kt == 70.0
    with pytest.raises(dataclasses.FrozenInstanceError):
        c.vref_kt = 80  # type: ignore[misc]
    assert dataclasses.replace(c, vref_kt=72).vref_kt == 72.0
    with pytest.raises(InvariantError):
        dataclasses.replace(c, vref_kt=50)


def test_familiar_pattern_forms() -> None:
    assert FamiliarPattern(height_ft=1500, speed_kt=170, bank_deg=40).offset_nm is None
    with pytest.raises(InvariantError, match="missing the offset: give offset_nm, or speed_kt and bank_deg"):
        FamiliarPattern(height_ft=1000)
    with pytest.raises(InvariantError, match="missing required key 'speed_kt'"):
        FamiliarPattern(height_ft=1000, bank_deg=30)


def test_wind_additive_common_practice() -> None:
    """Half the steady headwind plus the full gust increment, 5 to 20 kt (common practice)."""
    rule = WindAdditive(headwind_fraction=0.5, gust_fraction=1.0, min_kt=5, max_kt=20)
    assert rule.additive_kt(headwind_kt=10, gust_increment_kt=6) == 11  # 0.5*10 + 6
    assert rule.additive_kt(headwind_kt=2, gust_increment_kt=0) == 5     # 1 kt raised to the floor
    assert rule.additive_kt(headwind_kt=30, gust_increment_kt=15) == 20  # 30 kt capped
    assert rule.additive_kt(headwind_kt=-10, gust_increment_kt=0) == 5   # a tailwind adds nothing


def test_weight_scaling_and_category_speed() -> None:
    bizjet = load_profile(Path(__file__).parent.parent / "profiles" / "demo-bizjet.yaml")
    # sqrt(31000 / 28000) = 1.05221...; the lowest VREF (flaps-35, 116 kt) x 1.05221 = 122.06 kt
    assert bizjet.weight_speed_factor(31000) == pytest.approx(math.sqrt(31000 / 28000), rel=1e-12)
    assert bizjet.approach_category_speed_kt() == pytest.approx(116 * math.sqrt(31000 / 28000), rel=1e-12)
    assert bizjet.vref_kt_at(28000) == 126  # the default configuration at the reference weight
    twin = load_profile(Path(__file__).parent.parent / "profiles" / "demo-twin.yaml")
    assert twin.approach_category_speed_kt(use_vso=True) == pytest.approx(1.3 * 64)  # 14 CFR 97.3: 1.3 VSO
    with pytest.raises(DomainError, match="positive number of pounds"):
        twin.weight_speed_factor(0)


def test_configuration_lookup(profile: AircraftProfile) -> None:
    assert profile.configuration() is profile.configurations[0]
    assert profile.configuration("FLAPS-10").name == "flaps-10"
    with pytest.raises(DomainError) as info:
        profile.configuration("flaps-01")
    assert str(info.value) == ("aircraft profile 'test-single' has no configuration 'flaps-01' "
                               "(did you mean 'flaps-10'?) (configurations: flaps-10)")


# --- runways, designators, approaches -------------------------------------------------------------
@pytest.mark.parametrize(("given_", "expected"), [(9, "09"), ("9", "09"), ("27l", "27L"), (" 36 ", "36"),
                                                   ("0", None), ("37", None), ("9X", None), (True, None)])
def test_normalise_designator(given_: object, expected: str | None) -> None:
    assert normalise_designator(given_) == expected


@pytest.mark.parametrize(("designator", "reciprocal"), [("09", "27"), ("18", "36"), ("36", "18"), ("04L", "22R"),
                                                        ("22R", "04L"), ("13C", "31C")])
def test_reciprocal_designator(designator: str, reciprocal: str) -> None:
    """Reciprocals differ by 18 (180 degrees); L and R swap, C stays (ICAO Annex 14, 5.2.2)."""
    assert reciprocal_designator(designator) == reciprocal


def test_runway_by_designator(airfield: Airfield) -> None:
    landing, opposite = airfield.runway_by_designator("27")
    assert (landing.designator, opposite.designator) == ("27", "09")
    assert airfield.runway("27/09") is airfield.runways[0]
    # 0.030 deg of longitude at 45 N on the mean sphere: 6371008.8 * radians(0.03) * cos(45) = 2358.7 m
    # along the parallel; the great circle between the ends is shorter by far less than 1e-6
    assert airfield.runways[0].threshold_distance_m == pytest.approx(6371008.8 * math.radians(0.03) * math.cos(math.radians(45)),
                                                         rel=1e-6)
    with pytest.raises(DomainError) as info:
        airfield.runway_by_designator("26")
    assert str(info.value) == "airfield T1ST has no runway '26' (runways: 09/27)"


def test_approach_lookup_ignores_case_and_punctuation(airfield: Airfield) -> None:
    assert airfield.approach("vor rwy09").name == "VOR RWY 09"
    with pytest.raises(DomainError, match=r"has no approach 'NDB-A' \(approaches: VOR RWY 09\)"):
        airfield.approach("NDB-A")


def test_circling_minimums_by_category(airfield: Airfield) -> None:
    ap = airfield.approaches[0]
    assert ap.circling_minimum("b") is not None and ap.circling_minimum("B").visibility_sm == 1.25
    assert ap.circling_minimum("C") is None
    assert ap.circling_not_authorised_reason("C") == "no circling minimum published for category C"
    assert ap.circling_not_authorised_reason("A") is None
    na = dataclasses.replace(ap, circling=ap.circling + (CirclingMinimum(category="C", not_authorised=True),))
    assert na.circling_not_authorised_reason("C") == "circling not authorised for category C"
    assert not ap.circling_only


def test_visibility_in_metres_either_way() -> None:
    # 1.25 SM x 1609.344 m/SM = 2011.68 m (statute mile, NIST SP 811)
    assert CirclingMinimum(category="B", mda_ft=900, visibility_sm=1.25).visibility_as_charted_m == pytest.approx(
        2011.68)
    assert CirclingMinimum(category="B", mda_ft=900, visibility_m=2800).visibility_as_charted_m == 2800


def test_sector_forms() -> None:
    assert Sector(threshold="27", from_deg_mag=300, to_deg_mag=30).kind == "bearings"
    side = Sector(runway="27/9", side="North")
    assert (side.kind, side.runway, side.side) == ("side", "27/09", "north")
    with pytest.raises(InvariantError, match="to_deg_mag: expected a bearing different from from_deg_mag"):
        Sector(threshold="27", from_deg_mag=0, to_deg_mag=360)
    with pytest.raises(InvariantError, match="missing required key 'to_deg_mag'"):
        Sector(threshold="27", from_deg_mag=0)


def test_straight_in_must_serve_the_approach_runway(airfield: Airfield) -> None:
    data = airfield.to_mapping()
    data["approaches"][0]["straight_in"] = {"runway": "27", "minimums": {"A": {"mda_ft": 800, "visibility_sm": 1}}}
    with pytest.raises(FieldError) as info:
        Airfield.from_mapping(data)
    assert str(info.value) == "approaches[0].straight_in.runway: expected '09' (the approach's runway), got '27'"
    data["approaches"][0]["runway"] = None
    with pytest.raises(FieldError, match="a circling-only approach \\(no runway\\) has no straight-in minimums"):
        Airfield.from_mapping(data)


def test_from_mapping_errors_carry_the_path_without_a_file() -> None:
    with pytest.raises(FieldError) as info:
        Threshold.from_mapping({"designator": "09", "lat_deg": 1, "lon_deg": 1, "elevation_ft": "x"},
                               path="runways[3].threshold_a")
    err = info.value
    assert isinstance(err, DataFileError) and err.file is None and err.line is None
    assert str(err) == "runways[3].threshold_a.elevation_ft: expected a number in feet, got 'x'"
    with pytest.raises(FieldError, match=r"^expected a mapping \(a runway\), got a list$"):
        Runway.from_mapping([1, 2])


# --- weather ------------------------------------------------------------------------------------
def test_weather_all_optional_and_checked() -> None:
    assert Weather() == Weather.from_mapping({})
    with pytest.raises(InvariantError, match="wind_gust_kt: expected above wind_speed_kt \\(20\\), got 15"):
        Weather(wind_from_deg=270, wind_speed_kt=20, wind_gust_kt=15)
    with pytest.raises(InvariantError, match="wind_from_deg needs a speed"):
        Weather(wind_from_deg=270)
    assert Weather(wind_speed_kt=5).wind_from_deg is None  # variable wind


def test_weather_altimeter_in_inches() -> None:
    # 29.92 inHg x 33.86389 hPa/inHg = 1013.21 hPa (conventional inch of mercury, NIST SP 811)
    wx = Weather.from_mapping({"altimeter_inhg": 29.92})
    assert wx.altimeter_hpa == pytest.approx(29.92 * INHG_TO_HPA)
    assert wx.altimeter_hpa == pytest.approx(1013.21, abs=0.01)
    with pytest.raises(FieldError) as info:
        Weather.from_mapping({"altimeter_inhg": 1013})
    assert str(info.value) == "altimeter_inhg: expected a number in inches of mercury between 25.7 and 32.2, got 1013"
    with pytest.raises(FieldError, match="give either altimeter_hpa or altimeter_inhg, not both"):
        Weather.from_mapping({"altimeter_inhg": 29.92, "altimeter_hpa": 1013})


def test_wind_direction_reference() -> None:
    """true = magnetic + variation (east positive): 350 magnetic with 15 E is 005 true."""
    wx = Weather(wind_from_deg=350, wind_speed_kt=10, wind_reference="magnetic")
    assert wx.wind_from_deg_true(15.0) == pytest.approx(5.0)
    assert Weather(wind_from_deg=350, wind_speed_kt=10).wind_from_deg_true(15.0) == 350
    assert Weather(wind_speed_kt=20, wind_gust_kt=32).gust_increment_kt == 12


# --- the request ---------------------------------------------------------------------------------
def test_brief_request(profile: AircraftProfile, airfield: Airfield) -> None:
    req = BriefRequest(profile=profile, airfield=airfield, approach="vor rwy 09", landing_runway="27")
    assert req.landing_weight_lb == 2400 and req.stabilised_height_ft == 300
    assert req.selected_configuration().name == "flaps-10"
    assert req.selected_approach().name == "VOR RWY 09"
    assert req.landing_threshold().designator == "27"
    assert req.options == BriefOptions()
    assert BriefRequest.from_mapping(req.to_mapping()) == req
    with pytest.raises(InvariantError) as info:
        BriefRequest(profile=profile, airfield=airfield, approach="VOR RWY 09", landing_runway="18")
    assert str(info.value) == "landing_runway: airfield T1ST has no runway '18' (runways: 09/27)"
    with pytest.raises(InvariantError, match="weight_lb: expected a landing weight between 960 and the maximum "
                                             "landing weight 2400, got 2500"):
        BriefRequest(profile=profile, airfield=airfield, approach="VOR RWY 09", landing_runway="27", weight_lb=2500)
    with pytest.raises(InvariantError, match="^configuration: aircraft profile 'test-single' has no configuration"):
        BriefRequest(profile=profile, airfield=airfield, approach="VOR RWY 09", landing_runway="27",
                     configuration="clean")


def test_brief_options() -> None:
    with pytest.raises(InvariantError, match="criteria: expected 'terps-legacy', 'terps-expanded' or 'icao', got 'faa'"):
        BriefOptions(criteria="faa")
    assert BriefOptions(cold_temperature_method="Airport-Elevation").cold_temperature_method == "airport-elevation"


# --- round trips -----------------------------------------------------------------------------------
def test_every_model_round_trips(profile: AircraftProfile, airfield: Airfield) -> None:
    approach = airfield.approaches[0]
    models = [profile, airfield, approach, approach.faf, approach.map_fix, airfield.runways[0],
              airfield.runways[0].threshold_a, airfield.reference_point, profile.configurations[0],
              profile.familiar_pattern, profile.wind_additive, Sector(runway="09/27", side="north"),
              Sector(threshold="27", from_deg_mag=300, to_deg_mag=30, reason="mast"),
              Weather(wind_from_deg=270, wind_speed_kt=20, wind_gust_kt=30, oat_c=-12, altimeter_hpa=1002),
              BriefOptions(criteria="icao"), LatLon(lat_deg=-33.5, lon_deg=151.0),
              Fix(name="F1", lat_deg=0, lon_deg=0, altitude_ft=3000)]
    for m in models:
        assert type(m).from_mapping(m.to_mapping()) == m, type(m).__name__


def test_not_authorised_line_round_trips() -> None:
    data = {"name": "NDB-B", "final_course_deg_mag": 272, "criteria": "icao",
            "faf": {"name": "F", "lat_deg": 0, "lon_deg": 0, "altitude_ft": 3000},
            "map_fix": {"name": "M", "lat_deg": 0, "lon_deg": 0.01},
            "circling": {"A": {"mda_ft": 1700, "visibility_m": 1900},
                         "E": {"not_authorised": True, "reason": "ridge"}}}
    ap = Approach.from_mapping(data)
    assert ap.circling_only and ap.circling_not_authorised_reason("E") == "ridge"
    assert ap.to_mapping()["circling"] == {"A": {"mda_ft": 1700.0, "visibility_m": 1900.0},
                                           "E": {"not_authorised": True, "reason": "ridge"}}
    assert Approach.from_mapping(ap.to_mapping()) == ap


optional = lambda strategy: st.none() | strategy  # noqa: E731


@st.composite
def weathers(draw: st.DrawFn) -> Weather:
    speed = draw(optional(st.integers(0, 60)))
    direction = draw(optional(st.integers(1, 360))) if speed is not None else None
    gust = draw(optional(st.integers(speed + 1, speed + 30))) if speed is not None else None
    return Weather(wind_from_deg=direction, wind_speed_kt=speed, wind_gust_kt=gust,
                   wind_reference=draw(st.sampled_from(["true", "magnetic"])),
                   oat_c=draw(optional(st.floats(-60, 50, allow_nan=False))),
                   altimeter_hpa=draw(optional(st.floats(900, 1080, allow_nan=False))),
                   visibility_sm=draw(optional(st.floats(0, 10, allow_nan=False))),
                   ceiling_ft=draw(optional(st.integers(0, 20000))))


@settings(max_examples=150, deadline=None)
@given(weathers())
def test_weather_round_trips_through_yaml(wx: Weather) -> None:
    """Any valid weather survives to_mapping -> YAML -> from_mapping unchanged."""
    import yaml

    from briefer.io.yamlload import parse_yaml_mapping

    assert Weather.from_mapping(wx.to_mapping()) == wx
    text = yaml.safe_dump(wx.to_mapping())
    assert Weather.from_mapping(parse_yaml_mapping(text.encode() or b"{}", "w.yaml").data) == wx


@settings(max_examples=100, deadline=None)
@given(st.integers(1, 36), st.sampled_from(["", "L", "C", "R"]))
def test_designator_round_trip(number: int, suffix: str) -> None:
    d = normalise_designator(f"{number}{suffix}")
    assert d == f"{number:02d}{suffix}"
    assert reciprocal_designator(reciprocal_designator(d)) == d  # type: ignore[arg-type]


def test_profile_yaml_round_trip_keeps_every_field(profile: AircraftProfile) -> None:
    changed = dataclasses.replace(profile, vso_kt=50, category_speed_kt=72, aoa_indexer=True, description="x")
    assert load_bytes(dump_yaml(changed).encode(), file="p.yaml") == changed


@pytest.mark.parametrize(("key", "value", "message"), [
    pytest.param("wind_additive", None, "wind_additive: expected a mapping (a wind additive), got an empty value",
                 id="null-nested"),
    pytest.param("familiar_pattern", 3, "familiar_pattern: expected a mapping (a familiar pattern), got 3",
                 id="number-for-nested"),
    pytest.param("kind", "airfield", "kind: expected 'aircraft-profile', got 'airfield'", id="kind"),
])
def test_nested_and_header_errors(profile: AircraftProfile, key: str, value: object, message: str) -> None:
    data = profile.to_mapping()
    data[key] = value
    with pytest.raises(FieldError) as info:
        AircraftProfile.from_mapping(data)
    assert str(info.value) == message


def test_optional_nested_may_be_null(airfield: Airfield) -> None:
    data = airfield.to_mapping()
    data["approaches"][0]["straight_in"] = None
    assert Airfield.from_mapping(data).approaches[0].straight_in is None
