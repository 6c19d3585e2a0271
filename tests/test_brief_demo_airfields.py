"""The demo briefs read as a pilot would: the sensible facts of each demo airfield and approach.

Each test pins what a crew would check first on the brief of one invented demo case: the
category, the minimums line, why an approach is circling-only, which side the circle is flown
on, which way the missed-approach turn goes, the cold correction. Facts come from the demo data
files (their header comments say what each one exercises) and from hand geometry shown in the
comments. Where the brief looks wrong to a pilot, the test states the right behaviour and is
marked xfail(strict=True) with the reason, for the core owner to fix (and unmarked once fixed).
"""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from briefer.brief import build_brief, demo_request, situation
from briefer.io import catalog
from briefer.model import BriefRequest, Weather

UTC = "2000-01-01 00:00Z"
FAIR = dict(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=6.0, ceiling_ft=4000.0)
DOWNWIND_SHAPES = ("downwind-join", "break-and-return")


def request(profile: str, airfield: str, approach: str, runway: str, **weather) -> BriefRequest:
    return BriefRequest(profile=catalog.find_profile(profile), airfield=catalog.find_airfield(airfield),
                        approach=approach, landing_runway=runway, weather=Weather(**(FAIR | weather)))


def brief_of(req: BriefRequest):
    return build_brief(req, computed_utc=UTC)


def codes(b, severity: str | None = None) -> set[str]:
    return {f.code for f in b.findings if severity is None or f.severity == severity}


def lateral_m(req: BriefRequest, b) -> np.ndarray:
    """Lateral position of every track point, metres right of the landing centreline."""
    return np.asarray(situation(req).runway.to_runway_coords(b.plan.track_xy_m)[1])


# =============================================================================================
# V2RL Ellisvane Valley: TERPS expanded; ridge and mast south, circling not authorised south
# =============================================================================================
@pytest.fixture(scope="module")
def v2rl_demo():
    """The built-in demo: the bizjet, RNAV (GPS) RWY 09, circling to land 27, wind 240/10G16."""
    return brief_of(demo_request())


def test_v2rl_demo_category_d_raised_from_c(v2rl_demo):
    """demo-bizjet file: category C by VREF, circles at a category D speed (14 CFR 97.3)."""
    c = v2rl_demo.category
    assert (c.certified_category, c.category, c.raised) == ("C", "D", True)
    assert 141.0 <= c.circling_speed_kt < 166.0          # the Cat D band (14 CFR 97.3)


def test_v2rl_demo_minimums_line(v2rl_demo):
    """V2RL file, circling D: MDA 1860, 2.5 SM; HAA 740 (1860 - 1120); ceiling 1100 and 3 SM are fine."""
    m = v2rl_demo.minimums
    assert m.authorised and (m.mda_ft, m.height_above_airport_ft, m.visibility_required_sm) == (1860.0, 740.0, 2.5)
    assert m.ceiling_ok is True and m.visibility_ok is True
    assert m.straight_in_available is False              # landing 27, the approach serves 09
    assert m.circling_only_reasons == ()                 # the procedure has straight-in minima for 09
    assert codes(v2rl_demo, "danger") == set()


def test_v2rl_demo_reciprocal_plan_on_the_north_side(v2rl_demo):
    """Arriving eastbound on the 09 final to land westbound on 27: a reciprocal shape (break off
    and return, or a teardrop). The south is not authorised, so the downwind is on the north side,
    which is the right of runway 27 (landing westbound, north is on the right)."""
    p = v2rl_demo.plan
    assert p.feasible and p.inside_area
    assert p.shape in ("break-and-return", "teardrop")
    assert p.side == "right"
    assert np.min(lateral_m(demo_request(), v2rl_demo)) > -1.0     # never south of the centreline
    assert any("south" in t for t in v2rl_demo.area.sector_texts)
    assert p.sector_clearance_nm is not None and p.sector_clearance_nm > -0.001


def test_v2rl_demo_missed_approach_turns_toward_the_runway(v2rl_demo):
    """On the north downwind, flying east, the runway is on the right: climbing turn right."""
    assert v2rl_demo.missed_approach.turn_direction == "right"
    assert dict(v2rl_demo.missed_approach.by_leg)["downwind"] == "right"
    assert v2rl_demo.missed_approach.instruction.startswith("Climb to 3500")


def test_v2rl_demo_controlling_obstacle(v2rl_demo):
    """north-hill (1560 ft, V2RL file) is inside the Cat D area: 1860 - 1560 = 300 ft, the TERPS
    300 ft (AIM 5-4-20), so no obstacle-clearance finding."""
    m = v2rl_demo.minimums
    assert m.controlling_obstacle.startswith("north-hill")
    assert m.obstacle_clearance_actual_ft == 300.0 and m.obstacle_clearance_ft == 300.0
    assert "obstacle-clearance" not in codes(v2rl_demo)


def test_v2rl_demo_turn_fits_the_expanded_area(v2rl_demo):
    """The Cat D expanded radius (1001-3000 ft band) is larger than what this turn needs today."""
    assert v2rl_demo.area.radius_nm == 3.7                # docs/REFERENCES.md 2c, D 1001-3000
    assert v2rl_demo.area.required_radius_nm < v2rl_demo.area.radius_nm
    assert "area-smaller-than-turn" not in codes(v2rl_demo)


def test_v2rl_ndb_b_is_circling_only_by_gradient():
    """V2RL file comment: (3300 - 1170) ft over 3.4 NM = 626 ft/NM, above the TERPS 400 ft/NM
    (docs/REFERENCES.md 5). The final course (272 M) is aligned with 27, so not by alignment."""
    b = brief_of(request("demo-bizjet", "V2RL", "NDB-B", "09"))
    reasons = b.minimums.circling_only_reasons
    assert [r.code for r in reasons] == ["gradient"]
    assert_allclose(reasons[0].value, 626.0, atol=3.0)   # hand value above; TCH and rounding
    assert reasons[0].limit == 400.0
    assert "circling-only-gradient" in codes(b, "info")
    assert b.minimums.straight_in_available is False


def test_v2rl_ndb_b_to_09_circles_north():
    """NDB-B arrives westbound; landing 09 (eastbound) the north is on the left: a left-hand
    circle, missed-approach turn left."""
    req = request("demo-bizjet", "V2RL", "NDB-B", "09")
    b = brief_of(req)
    assert b.plan.feasible and b.plan.inside_area
    assert b.plan.side == "left"
    assert np.max(lateral_m(req, b)) < 1.0               # never right of 09, i.e. never south
    assert b.missed_approach.turn_direction == "left"
    assert b.minimums.mda_ft == 1900.0                   # V2RL file, NDB-B circling D


def test_v2rl_ndb_b_to_27_offers_a_circuit():
    """NDB-B is circling-only because its final is too steep, and its MAP (VRL NDB) lies about
    1.1 km past threshold 27 at 780 ft HAA: no normal straight-in descent exists. A pilot circles:
    overfly, north downwind (the right of 27), 180 to final, missed-approach turn right."""
    b = brief_of(request("demo-bizjet", "V2RL", "NDB-B", "27"))
    assert "no-plan-shape" not in codes(b)
    assert b.plan.feasible and b.plan.side == "right"    # the north side of 27
    assert b.missed_approach.turn_direction == "right"


def test_v2rl_trainer_category_e_not_authorised():
    """V2RL file: category E not authorised (ridges both sides). A danger finding, never an error."""
    b = brief_of(request("demo-trainer", "V2RL", "RNAV (GPS) RWY 09", "27"))
    assert b.category.category == "E"
    assert b.minimums.authorised is False and "ridges" in b.minimums.not_authorised_reason
    assert "not-authorised" in codes(b, "danger")


def test_v2rl_twin_category_b_raised_from_a():
    """demo-twin file: category A by VREF, circles at 100 kt, above the A band (< 91 kt): B."""
    b = brief_of(request("demo-twin", "V2RL", "RNAV (GPS) RWY 09", "27"))
    assert (b.category.certified_category, b.category.category) == ("A", "B")
    assert b.minimums.mda_ft == 1600.0 and b.minimums.visibility_required_sm == 1.0   # V2RL file, B
    assert b.plan.feasible and b.plan.side == "right"


def test_v2rl_a_plan_that_goes_south_is_flagged():
    """Whatever the wind, a plan that enters the south sector is a danger finding (never quiet)."""
    for wind_from in range(0, 360, 30):
        req = demo_request(wind_from_deg=float(wind_from), wind_speed_kt=25.0, wind_gust_kt=None)
        b = brief_of(req)
        if b.plan.feasible and np.min(lateral_m(req, b)) < -1.0:
            assert not b.plan.inside_area
            assert "leaves-area" in codes(b, "danger")


# =============================================================================================
# Q7HM Qorvel Mesa: hot and high, TERPS legacy radii
# =============================================================================================
def test_q7hm_vor_a_is_circling_only_by_alignment():
    """Q7HM file: VOR-A final 040 M = 049 T (variation 9 E); runway 36 runs 007 T (thresholds:
    2084 m north, 256 m east -> atan(256/2084) = 7.0 deg); 49 - 7 = 42 deg > 30 (AIM 5-4-20)."""
    b = brief_of(request("demo-twin", "Q7HM", "VOR-A", "13"))
    reasons = b.minimums.circling_only_reasons
    assert [r.code for r in reasons] == ["alignment"]
    assert_allclose(reasons[0].value, 42.0, atol=0.5)
    assert reasons[0].limit == 30.0
    assert b.minimums.straight_in_available is False


@pytest.mark.parametrize("runway", ["13", "31", "18"])
def test_q7hm_vor_a_circles_to_the_other_runways(runway):
    b = brief_of(request("demo-twin", "Q7HM", "VOR-A", runway))
    assert b.plan.feasible and b.plan.inside_area
    assert b.minimums.mda_ft == 6640.0                    # Q7HM file, VOR-A circling B


def test_q7hm_vor_a_to_36_has_a_plan():
    b = brief_of(request("demo-trainer", "Q7HM", "VOR-A", "36"))
    assert "no-plan-fits" not in codes(b)
    assert b.plan.feasible and b.plan.inside_area


def test_q7hm_rnav_31_straight_in_and_circling_lines():
    """Q7HM file: RNAV (GPS) RWY 31 is aligned; straight-in for 31, circling lines for the rest."""
    straight = brief_of(request("demo-twin", "Q7HM", "RNAV (GPS) RWY 31", "31"))
    assert straight.minimums.straight_in_available is True
    assert straight.minimums.circling_only_reasons == ()
    circle = brief_of(request("demo-twin", "Q7HM", "RNAV (GPS) RWY 31", "13"))
    assert circle.minimums.straight_in_available is False
    assert circle.minimums.mda_ft == 6600.0              # Q7HM file, circling B


def test_q7hm_true_airspeed_well_above_indicated():
    """Hot and high: at about 6,600 ft the TAS is roughly 2 % per 1000 ft above the IAS (common
    practice): 100 x (1 + 0.02 x 6.6) = 113 kt for the twin in ISA."""
    b = brief_of(request("demo-twin", "Q7HM", "VOR-A", "13"))
    assert b.performance.ias_kt == 100.0
    assert_allclose(b.performance.tas_kt, 113.0, rtol=0.02)


def test_q7hm_legacy_radius_is_fixed_per_category():
    """TERPS legacy radii (docs/REFERENCES.md 2b): B 1.5 NM for the twin, D 2.3 NM for the bizjet,
    whatever the MDA."""
    assert brief_of(request("demo-twin", "Q7HM", "VOR-A", "13")).area.radius_nm == 1.5
    assert brief_of(request("demo-bizjet", "Q7HM", "VOR-A", "13")).area.radius_nm == 2.3


def test_q7hm_hot_day_bizjet_turn_outgrows_the_legacy_area():
    """At +32 degC the bizjet's TAS (about 184 kt) needs more than the 2.3 NM legacy Cat D area:
    the brief must say so, and not brief a plan that leaves the area as fine."""
    b = brief_of(request("demo-bizjet", "Q7HM", "RNAV (GPS) RWY 31", "13", wind_from_deg=150.0,
                         wind_speed_kt=12.0, oat_c=32.0, altimeter_hpa=1012.0))
    assert b.area.required_radius_nm > b.area.radius_nm
    assert "area-smaller-than-turn" in codes(b, "warning")
    assert not b.plan.inside_area and "leaves-area" in codes(b, "danger")


# =============================================================================================
# X4CD Tarnwick Coastal: ICAO, cold, sector by bearings east of the field
# =============================================================================================
def test_x4cd_cold_correction_at_minus_20():
    """-20 degC, HAA 756 ft (820 - 64): AIM TBL 7-3-1 row -20 gives 100 ft at 700 and 120 ft at
    800 ft; the sea-level-table method gives 110 ft (docs/REFERENCES.md 6b). MDA flown 930 ft."""
    b = brief_of(request("demo-bizjet", "X4CD", "VOR RWY 33", "15", oat_c=-20.0))
    cold = b.minimums.cold
    assert cold is not None and cold.method == "sea-level-table"
    assert b.minimums.height_above_airport_ft == 756.0
    assert 100.0 <= cold.correction_ft <= 120.0
    assert cold.correction_ft == 110.0 and cold.corrected_mda_ft == 930.0
    assert "cold-temperature" in codes(b, "warning")


def test_x4cd_icao_keeps_category_c():
    """ICAO Cat C covers circling up to 180 kt (Doc 8168 Table I-4-1-2): the bizjet stays C."""
    b = brief_of(request("demo-bizjet", "X4CD", "VOR RWY 33", "15"))
    assert b.category.category == "C" and not b.category.raised
    assert b.area.criteria == "icao"
    assert b.minimums.mda_ft == 820.0


def test_x4cd_plans_stay_out_of_the_east_sector():
    """Sector 040-110 M from threshold 15 (mast and chimney): every flyable plan inside the
    area keeps out of it (its apex, the threshold, may be touched)."""
    for approach, runway in (("VOR RWY 33", "15"), ("RNP RWY 15", "33")):
        for wind_from in (0.0, 90.0, 180.0, 270.0):
            b = brief_of(request("demo-bizjet", "X4CD", approach, runway, wind_from_deg=wind_from,
                                 wind_speed_kt=15.0))
            if b.plan.feasible and b.plan.inside_area:
                assert b.plan.sector_clearance_nm > -0.001, (approach, runway, wind_from)


def test_x4cd_trainer_not_authorised_on_rnp_15():
    """X4CD file: no category E circling line on RNP RWY 15."""
    b = brief_of(request("demo-trainer", "X4CD", "RNP RWY 15", "33"))
    assert b.minimums.authorised is False and "not-authorised" in codes(b, "danger")
    ok = brief_of(request("demo-trainer", "X4CD", "VOR RWY 33", "15"))
    assert ok.minimums.authorised is True and ok.minimums.mda_ft == 920.0


# =============================================================================================
# Across the demo data
# =============================================================================================
def _feasible_downwind_briefs():
    for profile in ("demo-bizjet", "demo-twin", "demo-trainer"):
        for ident in ("V2RL", "Q7HM", "X4CD"):
            af = catalog.find_airfield(ident)
            for appr in af.approaches:
                for rw in af.runways:
                    for des in (rw.threshold_a.designator, rw.threshold_b.designator):
                        b = brief_of(request(profile, ident, appr.name, des))
                        if b.plan.feasible and b.plan.shape in DOWNWIND_SHAPES:
                            yield f"{profile}/{ident}/{appr.name}/{des}", b


def test_missed_approach_turn_is_toward_the_downwind_side():
    """On a downwind on the right of the landing runway, flown the other way, the runway is on
    the right: the climbing turn toward it is to the right (and the same on the left)."""
    seen = 0
    for label, b in _feasible_downwind_briefs():
        seen += 1
        assert b.missed_approach.turn_direction == b.plan.side, label
    assert seen >= 10


STRAIGHT_IN = [
    pytest.param(("V2RL", "RNAV (GPS) RWY 09", "09"), id="V2RL-RNAV-09"),
    pytest.param(("Q7HM", "RNAV (GPS) RWY 31", "31"), id="Q7HM-RNAV-31"),
    pytest.param(("X4CD", "VOR RWY 33", "33"), id="X4CD-VOR-33"),
    pytest.param(("X4CD", "RNP RWY 15", "15"), id="X4CD-RNP-15"),
]


@pytest.mark.parametrize("case", STRAIGHT_IN)
def test_straight_in_landing_is_not_a_danger(case):
    """Landing on the runway the approach serves, with straight-in minima published and the final
    aligned: the normal straight-in, not a case that cannot be flown."""
    b = brief_of(request("demo-bizjet", *case))
    assert b.minimums.straight_in_available is True
    assert not codes(b, "danger")
