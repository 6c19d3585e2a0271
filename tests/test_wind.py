"""briefer.core.wind: parsing, components, crab angle and ground speed against published
knowledge-test/handbook-style worked examples, hand-derived values and invariants."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from briefer import units
from briefer.core import angles
from briefer.core import wind as w
from briefer.errors import DomainError


# --- components: published examples ------------------------------------------------------------
def test_faa_knowledge_test_wind_component_chart_example():
    """FAA private-pilot knowledge-test question on the wind component chart (FAA-CT-8080
    testing supplement), as reproduced by a flight-school page (V2): runway 18, wind 220 deg at
    30 kt -> 23 kt headwind, 19 kt crosswind. The chart is read to whole knots: atol 0.5 kt.
    Hand-derived: 30 cos 40 = 22.98, 30 sin 40 = 19.28 (from the right: 220 is right of 180)."""
    c = w.wind_components_kt(220.0, 30.0, course_deg=180.0)
    assert_allclose(c.headwind_kt, 23.0, atol=0.5)
    assert_allclose(c.crosswind_from_right_kt, 19.0, atol=0.5)
    assert_allclose(c.headwind_kt, 30.0 * math.cos(math.radians(40.0)), rtol=1e-12)
    assert c.crosswind_from_right_kt > 0


def test_easa_question_bank_max_wind_for_crosswind_limit():
    """EASA ATPL performance question (V2, reproduced by a question-bank site): take-off runway 20,
    wind from 255 deg, crosswind limit 17 kt -> maximum wind 17/sin 55 = 20.75 kt (2 decimals)."""
    c = w.wind_components_kt(255.0, 20.75, course_deg=200.0)
    assert_allclose(c.crosswind_from_right_kt, 17.0, atol=5e-3)


def test_hand_derived_270_15_on_240():
    """Hand-derived: wind 270/15 on runway 240: angle 30 deg; head 15 cos 30 = 12.990,
    cross 15 sin 30 = 7.5 from the right."""
    c = w.wind_components_kt(270.0, 15.0, course_deg=240.0)
    assert_allclose(c.headwind_kt, 12.990381, atol=1e-6)
    assert_allclose(c.crosswind_from_right_kt, 7.5, atol=1e-12)


@pytest.mark.parametrize("wind_from, head, cross", [
    pytest.param(0.0, 10.0, 0.0, id="on-the-nose"),
    pytest.param(90.0, 0.0, 10.0, id="from-right"),
    pytest.param(180.0, -10.0, 0.0, id="tailwind"),
    pytest.param(270.0, 0.0, -10.0, id="from-left"),
    pytest.param(360.0, 10.0, 0.0, id="360-is-north"),
])
def test_sign_conventions_on_north_course(wind_from, head, cross):
    """Sign conventions (DEVELOPERS.md): headwind negative = tailwind, crosswind positive from
    the right; hand-derived on course 000 with 10 kt."""
    c = w.wind_components_kt(wind_from, 10.0, course_deg=0.0)
    assert_allclose([c.headwind_kt, c.crosswind_from_right_kt], [head, cross], atol=1e-12)


# --- wind triangle --------------------------------------------------------------------------------
def test_training_exercise_pure_crosswind_from_left():
    """A PPL navigation training site's worked exercise (secondary; hand-checked): TT 270, TAS 120,
    wind 180/30 -> WCA 14.5 deg to the left, TH 255.5, GS about 116 kt.
    Hand-derived: asin(30/120) = 14.4775 deg; 120 cos(14.4775) = 116.19 kt."""
    wca = w.crab_angle_deg(120.0, wind_from_deg=180.0, wind_speed_kt=30.0, course_deg=270.0)
    assert_allclose(wca, -14.5, atol=0.05)
    assert_allclose(w.heading_for_course_deg(120.0, wind_from_deg=180.0, wind_speed_kt=30.0, course_deg=270.0),
                    255.5, atol=0.05)
    assert_allclose(w.ground_speed_kt(120.0, wind_from_deg=180.0, wind_speed_kt=30.0, course_deg=270.0),
                    116.0, atol=0.5)


def test_training_exercise_quartering_headwind_from_right():
    """Same source (secondary; hand-checked): TT 045, TAS 110, wind 090/25 -> HW 17.7, XW 17.7 from
    the right, WCA 9.3 deg right, TH 054, GS about 91 kt.
    Hand-derived: 25 sin 45 = 17.678; asin(17.678/110) = 9.247; 110 cos 9.247 - 17.678 = 90.89."""
    c = w.wind_components_kt(90.0, 25.0, course_deg=45.0)
    assert_allclose([c.headwind_kt, c.crosswind_from_right_kt], [17.7, 17.7], atol=0.05)
    # the exercise rounds sin(WCA) to 0.161 before the arcsine and prints 9.3; exact 9.248: atol 0.06
    assert_allclose(w.crab_angle_deg(110.0, wind_from_deg=90.0, wind_speed_kt=25.0, course_deg=45.0), 9.3, atol=0.06)
    assert_allclose(w.heading_for_course_deg(110.0, wind_from_deg=90.0, wind_speed_kt=25.0, course_deg=45.0),
                    54.0, atol=0.5)
    assert_allclose(w.ground_speed_kt(110.0, wind_from_deg=90.0, wind_speed_kt=25.0, course_deg=45.0), 91.0, atol=0.5)


def test_straight_headwind_and_tailwind_ground_speed():
    """Hand-derived: GS = TAS - headwind with no crosswind (100 - 20 = 80; 80 + 15 = 95)."""
    assert_allclose(w.ground_speed_kt(100.0, wind_from_deg=180.0, wind_speed_kt=20.0, course_deg=180.0), 80.0)
    assert_allclose(w.ground_speed_kt(80.0, wind_from_deg=180.0, wind_speed_kt=15.0, course_deg=360.0), 95.0)


def test_zero_wind_ground_speed_equals_tas():
    """Limit (STYLE F): zero wind gives GS = TAS and no crab, arrays."""
    tas = np.array([60.0, 120.0, 250.0])
    assert_allclose(w.ground_speed_kt(tas, wind_from_deg=123.0, wind_speed_kt=0.0, course_deg=77.0), tas)
    assert_allclose(w.crab_angle_deg(tas, wind_from_deg=123.0, wind_speed_kt=0.0, course_deg=77.0), 0.0)


def test_crab_angle_impossible_raises():
    """Documented: crosswind >= TAS -> DomainError."""
    with pytest.raises(DomainError, match="crosswind"):
        w.crab_angle_deg(40.0, wind_from_deg=90.0, wind_speed_kt=45.0, course_deg=0.0)


def test_wind_vector_points_downwind():
    """Hand-derived: wind FROM 270 moves the air east; from 000 moves it south."""
    v = w.wind_vector_kt(270.0, 10.0)
    assert_allclose([v.east_kt, v.north_kt], [10.0, 0.0], atol=1e-12)
    east, north = w.wind_vector_kt(0.0, 10.0)
    assert_allclose([east, north], [0.0, -10.0], atol=1e-12)


def test_ground_velocity_from_vectors_matches_ground_speed():
    """Invariant: heading vector x TAS + wind vector has length GS and points along the course."""
    tas, wfrom, ws, crs = 130.0, 300.0, 28.0, 215.0
    hdg = w.heading_for_course_deg(tas, wind_from_deg=wfrom, wind_speed_kt=ws, course_deg=crs)
    wv = w.wind_vector_kt(wfrom, ws)
    east = tas * angles.sind(hdg) + wv.east_kt
    north = tas * angles.cosd(hdg) + wv.north_kt
    assert_allclose(math.hypot(east, north),
                    w.ground_speed_kt(tas, wind_from_deg=wfrom, wind_speed_kt=ws, course_deg=crs), rtol=1e-12)
    assert_allclose(angles.wrap_360(angles.atand2(east, north)), crs, atol=1e-9)


# --- properties -------------------------------------------------------------------------------------
@settings(max_examples=200, deadline=None)
@given(speed=st.floats(0.0, 250.0), course=st.floats(0.0, 360.0), offset=st.floats(0.0, 180.0))
def test_crosswind_symmetry(speed, course, offset):
    """Property (STYLE F): winds mirrored about the course have the same headwind and opposite
    crosswinds (090 vs 270 on a north course is the special case)."""
    right = w.wind_components_kt(float(angles.wrap_360(course + offset)), speed, course_deg=course)
    left = w.wind_components_kt(float(angles.wrap_360(course - offset)), speed, course_deg=course)
    assert_allclose(right.headwind_kt, left.headwind_kt, atol=1e-9)
    assert_allclose(right.crosswind_from_right_kt, -left.crosswind_from_right_kt, atol=1e-9)


def test_crosswind_symmetry_090_270():
    """The named case: 090 and 270 on course 000, same magnitude, opposite sign."""
    a = w.wind_components_kt(90.0, 17.0, course_deg=0.0)
    b = w.wind_components_kt(270.0, 17.0, course_deg=0.0)
    assert_allclose(a.crosswind_from_right_kt, -b.crosswind_from_right_kt, rtol=1e-12)


@settings(max_examples=200, deadline=None)
@given(wfrom=st.floats(0.0, 360.0), speed=st.floats(0.0, 250.0), course=st.floats(-720.0, 720.0))
def test_components_preserve_magnitude(wfrom, speed, course):
    """Property: head^2 + cross^2 = W^2 (a rotation), no NaN across the ranges."""
    c = w.wind_components_kt(wfrom, speed, course_deg=course)
    assert_allclose(math.hypot(c.headwind_kt, c.crosswind_from_right_kt), speed, atol=1e-9)


@settings(max_examples=200, deadline=None)
@given(tas=st.floats(100.0, 1000.0), wfrom=st.floats(0.0, 360.0), speed=st.floats(0.0, 99.0),
       course=st.floats(0.0, 360.0))
def test_wind_triangle_finite_when_wind_below_tas(tas, wfrom, speed, course):
    """Property: with wind slower than TAS the crab angle and GS exist and are finite."""
    wca = w.crab_angle_deg(tas, wind_from_deg=wfrom, wind_speed_kt=speed, course_deg=course)
    gs = w.ground_speed_kt(tas, wind_from_deg=wfrom, wind_speed_kt=speed, course_deg=course)
    assert math.isfinite(wca) and abs(wca) < 90.0
    assert tas - speed - 1e-9 <= gs <= tas + speed + 1e-9


@pytest.mark.parametrize("call", [
    pytest.param(lambda: w.wind_components_kt(361.0, 10.0, course_deg=0.0), id="direction-361"),
    pytest.param(lambda: w.wind_components_kt(-1.0, 10.0, course_deg=0.0), id="direction-negative"),
    pytest.param(lambda: w.wind_components_kt(90.0, 251.0, course_deg=0.0), id="speed-251"),
    pytest.param(lambda: w.wind_components_kt(90.0, -1.0, course_deg=0.0), id="speed-negative"),
    pytest.param(lambda: w.wind_components_kt(90.0, 10.0, course_deg=float("inf")), id="course-inf"),
    pytest.param(lambda: w.crab_angle_deg(0.0, wind_from_deg=0.0, wind_speed_kt=5.0, course_deg=0.0), id="tas-0"),
    pytest.param(lambda: w.ground_speed_kt(50.0, wind_from_deg=0.0, wind_speed_kt=60.0, course_deg=0.0),
                 id="headwind-above-tas"),
])
def test_domain_errors(call):
    with pytest.raises(DomainError):
        call()


# --- parsing ------------------------------------------------------------------------------------------
@pytest.mark.parametrize("text, from_deg, speed, gust", [
    pytest.param("270/15", 270.0, 15.0, None, id="slash"),
    pytest.param("270/15G25", 270.0, 15.0, 25.0, id="slash-gust"),
    pytest.param("270/15KT", 270.0, 15.0, None, id="slash-kt"),
    pytest.param("270@15", 270.0, 15.0, None, id="at"),
    pytest.param("27015KT", 270.0, 15.0, None, id="metar"),
    pytest.param("27015G25KT", 270.0, 15.0, 25.0, id="metar-gust"),
    pytest.param("36010KT", 360.0, 10.0, None, id="metar-north"),
    pytest.param("090105G120KT", 90.0, 105.0, 120.0, id="metar-3-digit-speed"),
    pytest.param(" 270/15g25 ", 270.0, 15.0, 25.0, id="lower-case-spaces"),
    pytest.param("VRB05KT", None, 5.0, None, id="vrb-metar"),
    pytest.param("VRB/5", None, 5.0, None, id="vrb-slash"),
    pytest.param("calm", None, 0.0, None, id="calm"),
    pytest.param("0/0", None, 0.0, None, id="zero-slash"),
    pytest.param("00000KT", None, 0.0, None, id="calm-metar"),
])
def test_parse_wind_forms(text, from_deg, speed, gust):
    """WMO FM 15 METAR wind group (dddffGfmfmKT, VRB, 00000KT for calm: FMH-1 ch. 12) and the
    slash forms crews write."""
    wind = w.parse_wind(text)
    assert (wind.from_deg, wind.speed_kt, wind.gust_kt) == (from_deg, speed, gust)
    assert wind.reference == "true"


def test_parse_wind_mps_converted():
    """WMO FM 15 allows MPS; 8 m/s = 8 / (1852/3600) kt = 15.55 kt (units.py)."""
    wind = w.parse_wind("27008MPS")
    assert_allclose(wind.speed_kt, 8.0 * units.MPS_TO_KT, rtol=1e-12)


def test_parse_wind_variation_group_and_reference():
    """WMO FM 15 variation group dndndnVdxdxdx; reference passed through."""
    wind = w.parse_wind("27015G25KT 240V300", reference="magnetic")
    assert (wind.variable_from_deg, wind.variable_to_deg, wind.reference) == (240.0, 300.0, "magnetic")
    assert wind.is_variable and not wind.is_calm and wind.max_speed_kt == 25.0


@pytest.mark.parametrize("text", ["27O15", "270", "270/", "/15", "400/10", "270/300", "270/15G10",
                                  "270/15G15", "27015", "VRB", "windy", ""])
def test_parse_wind_rejects_with_quoted_text(text):
    """Clear DomainError quoting the text (brief: direction 0..360, speed 0..250, gust > speed)."""
    with pytest.raises(DomainError, match=f"'{text}'"):
        w.parse_wind(text)


def test_wind_model_validates_itself():
    """STYLE C: the frozen model checks its invariants when built by hand."""
    good = w.Wind(from_deg=270.0, speed_kt=15.0, gust_kt=25.0)
    with pytest.raises(DomainError):
        dataclasses.replace(good, gust_kt=10.0)
    with pytest.raises(DomainError):
        dataclasses.replace(good, reference="grid")
    with pytest.raises(DomainError):
        dataclasses.replace(good, variable_from_deg=240.0)


# --- worst case ---------------------------------------------------------------------------------------
def test_worst_case_over_variation_sector_hand_derived():
    """Hand-derived: 270/15G25 varying 240-300 on runway 240: the worst is at 300 deg (60 deg off):
    headwind 25 cos 60 = 12.5, crosswind 25 sin 60 = 21.65 from the right."""
    c = w.worst_wind_components_kt(w.parse_wind("270/15G25 240V300"), course_deg=240.0)
    assert_allclose([c.headwind_kt, c.crosswind_from_right_kt], [12.5, 21.650635], atol=1e-6)


def test_worst_case_variable_and_calm():
    """Hand-derived: VRB 5 kt: the full speed as tailwind and as crosswind; calm: zero."""
    c = w.worst_wind_components_kt(w.parse_wind("VRB05KT"), course_deg=240.0)
    assert_allclose([c.headwind_kt, abs(c.crosswind_from_right_kt)], [-5.0, 5.0], atol=1e-9)
    calm = w.worst_wind_components_kt(w.parse_wind("calm"), course_deg=240.0)
    assert (calm.headwind_kt, calm.crosswind_from_right_kt) == (0.0, 0.0)


def test_worst_case_sector_crossing_abeam():
    """Hand-derived: sector 060-120 on course 000 contains 090 (abeam): crosswind 20 from the
    right; smallest headwind at 120: 20 cos 120 = -10 (a tailwind)."""
    wind = w.Wind(from_deg=90.0, speed_kt=20.0, variable_from_deg=60.0, variable_to_deg=120.0)
    c = w.worst_wind_components_kt(wind, course_deg=0.0)
    assert_allclose([c.headwind_kt, c.crosswind_from_right_kt], [-10.0, 20.0], atol=1e-9)


def test_worst_case_sector_across_north():
    """Hand-derived: sector 330-030 (through north) on course 180 includes 000 (straight
    tailwind, -10 kt) and its worst crosswind is at the ends, 10 sin 30 = 5 kt."""
    wind = w.Wind(from_deg=0.0, speed_kt=10.0, variable_from_deg=330.0, variable_to_deg=30.0)
    c = w.worst_wind_components_kt(wind, course_deg=180.0)
    assert_allclose([c.headwind_kt, abs(c.crosswind_from_right_kt)], [-10.0, 5.0], atol=1e-9)
