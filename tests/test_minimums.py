"""Tests of briefer.core.minimums: practice circling minimums on hand-built obstacle sets.

Every expected MDA is derived by hand in the comment beside it from the criteria values that
briefer.core.criteria holds, with their provenance (docs/REFERENCES.md sections 2-4):

* TERPS obstacle clearance 300 ft: AIM 5-4-20 ("V").
* TERPS lowest circling HAA 350/450/450/550/550 ft (A-E): FAA Order 8260.3, from memory ("M").
* TERPS legacy radii 1.3/1.5/1.7/2.3/4.5 NM: AIM 5-4-20, TPP page B2 ("V2").
* TERPS expanded radii by circling MDA band (TPP page B2): Cat A 1.3 NM up to 7000 ft and
  1.4 NM above ("V2" for 1001-7000, the 7001-9000 cell is "M"); Cat C 2.7/2.8/2.9/3.0 NM for
  "1000 or less"/"1001-3000"/"3001-5000"/"5001-7000" (2.7 and 3.0 "V2", 2.8 and 2.9 "M").
  The table is used as printed; these tests check the iteration over it, not the cells.
* MDA rounding: TERPS up to 20 ft (AIM 5-4-20 states it for LNAV MDAs; for circling from
  memory, "M"); ICAO up to 10 ft (from memory, "M").
* ICAO MOC 90/90/120/120/150 m and lowest OCH 120/150/180/210/240 m: Doc 8168 Vol I Table
  I-4-7-3, from memory ("M"); 90 m = 295.2756 ft, 120 m = 393.7008 ft (exact metre/foot).

Geometry: one threshold at the origin unless said otherwise, so an obstacle's distance from the
area's centre is simply its position in NM.
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from briefer.core import criteria as cr
from briefer.core import geometry
from briefer.core.minimums import (
    MAX_EXPANDED_ITERATIONS,
    PRACTICE_NOTICE,
    ObstaclePoint,
    PracticeMinimums,
    practice_minimum,
    practice_minimums,
    practice_minimums_for_airfield,
)
from briefer.errors import DomainError
from briefer.units import FT_TO_M, NM_TO_M

ORIGIN = [(0.0, 0.0)]


def ob(name: str, east_nm: float, elevation_ft: float, north_nm: float = 0.0) -> ObstaclePoint:
    return ObstaclePoint(name=name, xy_m=(east_nm * NM_TO_M, north_nm * NM_TO_M), elevation_ft=elevation_ft)


def pm(category: str, criteria: str, obstacles, *, elevation_ft: float = 0.0, centres=ORIGIN, excluded=()):
    return practice_minimum(category, criteria=criteria, centres_m=centres, airport_elevation_ft=elevation_ft,
                            obstacles=obstacles, excluded=excluded)


# ----------------------------------------------------------------------------------------------
# Fixed radius (TERPS legacy)
# ----------------------------------------------------------------------------------------------

def test_legacy_obstacle_controls():
    # Cat A legacy R = 1.3 NM: 'mast' at 1.0 NM is inside, 'hill' at 1.5 NM outside.
    # MDA = 900 + 300 = 1200 ft (a multiple of 20); floor 500 + 350 = 850 ft; HAA 1200 - 500 = 700.
    r = pm("A", "terps-legacy", [ob("mast", 1.0, 900), ob("hill", 1.5, 1500)], elevation_ft=500)
    assert r.radius_nm == 1.3
    assert r.controlling.name == "mast" and r.controlling.elevation_ft == 900
    assert r.controlling.distance_nm == pytest.approx(1.0, abs=1e-12)
    assert r.mda_unrounded_ft == 1200 and r.mda_ft == 1200 and r.haa_ft == 700
    assert r.controlled_by == "obstacle"
    assert r.iterations == 1 and r.steps[0].mda_guess_ft is None     # legacy radius needs no MDA


def test_legacy_larger_category_takes_the_farther_obstacle():
    # Cat B legacy R = 1.5 NM: 'hill' at 1.45 NM is inside now: 1500 + 300 = 1800 ft.
    r = pm("B", "terps-legacy", [ob("mast", 1.0, 900), ob("hill", 1.45, 1500)], elevation_ft=500)
    assert r.controlling.name == "hill" and r.mda_ft == 1800


def test_legacy_rounds_up_to_20_ft():
    # 905 + 300 = 1205 -> next multiple of 20 = 1220 (AIM 5-4-20 LNAV rule; circling "M")
    r = pm("A", "terps-legacy", [ob("mast", 1.0, 905)], elevation_ft=500)
    assert r.mda_unrounded_ft == 1205 and r.mda_ft == 1220
    assert r.rounding_increment_ft == 20 and r.rounding_provenance == "M"


def test_lowest_height_controls():
    # Cat D: 1050 + 300 = 1350 ft < floor 1000 + 550 = 1550 ft -> 1550 rounds up to 1560.
    r = pm("D", "terps-legacy", [ob("shed", 0.5, 1050)], elevation_ft=1000)
    assert r.controlled_by == "lowest-height"
    assert r.controlling.name == "shed"          # still reported: the highest obstacle inside
    assert r.mda_unrounded_ft == 1550 and r.mda_ft == 1560 and r.haa_ft == 560


def test_no_obstacles():
    # Cat C: 200 + 450 = 650 -> 660 (20 ft steps)
    r = pm("C", "terps-legacy", [], elevation_ft=200)
    assert r.controlling is None and r.controlled_by == "lowest-height" and r.mda_ft == 660


def test_equal_obstacles_first_charted_wins():
    r = pm("A", "terps-legacy", [ob("first", 0.5, 900), ob("second", 0.6, 900)])
    assert r.controlling.name == "first"


def test_two_thresholds_measure_from_the_hull():
    # thresholds 2 NM apart on an east-west line: an obstacle 1.2 NM north of the midpoint is
    # 1.2 NM from the hull (inside Cat A 1.3), one 1.2 NM east of the east threshold too, one
    # 1.4 NM north is outside. 700 + 300 = 1000 ft.
    centres = [(0.0, 0.0), (2 * NM_TO_M, 0.0)]
    obs = [ob("mid", 1.0, 600, north_nm=1.2), ob("east", 3.2, 700), ob("far", 1.0, 5000, north_nm=1.4)]
    r = pm("A", "terps-legacy", obs, centres=centres)
    assert r.controlling.name == "east" and r.mda_ft == 1000
    assert r.controlling.distance_nm == pytest.approx(1.2, abs=1e-9)


# ----------------------------------------------------------------------------------------------
# ICAO: computed radius, 10 ft rounding, metric clearances
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize(("obstacle_ft", "expected"), [
    # Cat A: MOC 90 m = 295.2756 ft, lowest OCH 120 m = 393.7008 ft above a sea-level field
    pytest.param(100.0, 400.0, id="100+295.28=395.28 -> 400"),
    pytest.param(104.6, 400.0, id="104.6+295.28=399.88 -> 400"),
    pytest.param(105.0, 410.0, id="105+295.28=400.28 -> 410"),
    pytest.param(50.0, 400.0, id="50+295.28=345.28 < 393.70 floor -> 400"),
])
def test_icao_cat_a(obstacle_ft, expected):
    r = pm("A", "icao", [ob("o", 1.0, obstacle_ft)])
    assert r.obstacle_clearance_ft == pytest.approx(90.0 / FT_TO_M, rel=1e-12)
    assert r.lowest_height_ft == pytest.approx(120.0 / FT_TO_M, rel=1e-12)
    assert r.mda_ft == expected and r.rounding_increment_ft == 10
    # the ICAO radius is R = 2r + S, computed (criteria "C"), about 1.67 NM at sea level (REFERENCES 4b)
    assert r.radius_provenance == "C" and 1.6 < r.radius_nm < 1.75
    assert set(r.from_memory) >= {"obstacle clearance", "lowest circling height", "MDA rounding", "visibility"}


# ----------------------------------------------------------------------------------------------
# TERPS expanded: the radius depends on the MDA -> iterate, band edges
# ----------------------------------------------------------------------------------------------

def test_expanded_edge_1000_stays_in_the_lowest_band():
    # Cat C, sea level. Floor 0 + 450 = 450 -> 460 (band "1000 or less", R 2.7 NM).
    # 'near' (2.0 NM, 700 ft) is inside: 700 + 300 = 1000 ft, still "1000 or less", R 2.7 NM:
    # 'edge' at 2.75 NM stays outside. Settled after one evaluation.
    r = pm("C", "terps-expanded", [ob("near", 2.0, 700), ob("edge", 2.75, 900)])
    assert r.mda_ft == 1000 and r.radius_nm == 2.7 and r.mda_band == "1000 or less"
    assert r.controlling.name == "near"
    assert [(s.mda_guess_ft, s.radius_nm, s.controlling_obstacle, s.mda_ft) for s in r.steps] == [
        (460.0, 2.7, "near", 1000.0)]


def test_expanded_edge_1001_moves_to_the_next_band_and_iterates():
    # 701 + 300 = 1001 -> 1020 (20 ft steps): band "1001-3000", R 2.8 NM, which now holds 'edge'
    # (2.75 NM, 900 ft): 900 + 300 = 1200, still band "1001-3000": settled.
    r = pm("C", "terps-expanded", [ob("near", 2.0, 701), ob("edge", 2.75, 900)])
    assert [(s.mda_guess_ft, s.radius_nm, s.controlling_obstacle, s.mda_ft) for s in r.steps] == [
        (460.0, 2.7, "near", 1020.0),
        (1020.0, 2.8, "edge", 1200.0)]
    assert r.mda_ft == 1200 and r.radius_nm == 2.8 and r.mda_band == "1001-3000"
    assert r.controlling.name == "edge"


@pytest.mark.parametrize(("edge_ft", "expected_mda", "expected_radius", "n_steps"), [
    # 2700 + 300 = 3000 -> band "1001-3000" (2.8 NM): 'beyond' at 2.85 NM stays out
    pytest.param(2700.0, 3000.0, 2.8, 2, id="3000 stays in 1001-3000"),
    # 2701 + 300 = 3001 -> 3020, band "3001-5000" (2.9 NM): 'beyond' (2.85 NM, 2900) is in:
    # 2900 + 300 = 3200, same band: settled after three evaluations
    pytest.param(2701.0, 3200.0, 2.9, 3, id="3001 moves to 3001-5000"),
])
def test_expanded_edge_3000(edge_ft, expected_mda, expected_radius, n_steps):
    obs = [ob("near", 2.0, 701), ob("edge", 2.75, edge_ft), ob("beyond", 2.85, 2900)]
    r = pm("C", "terps-expanded", obs)
    assert r.mda_ft == expected_mda and r.radius_nm == expected_radius and r.iterations == n_steps
    mdas = [s.mda_ft for s in r.steps]
    assert mdas == sorted(mdas)                    # never goes down (monotone radius table)


def test_expanded_cat_a_edge_7000():
    # Cat A: 1.3 NM up to 7000 ft, 1.4 NM from 7001 ft. Elevation 6500: floor 6850 -> 6860.
    # 6700 + 300 = 7000 -> R stays 1.3: 'outer' at 1.35 NM is out.
    stay = pm("A", "terps-expanded", [ob("inner", 1.0, 6700), ob("outer", 1.35, 7000)], elevation_ft=6500)
    assert stay.mda_ft == 7000 and stay.radius_nm == 1.3 and stay.iterations == 1
    # 6701 + 300 = 7001 -> 7020 -> R 1.4: 'outer' (7000) is in: 7300, band 7001-9000: settled
    move = pm("A", "terps-expanded", [ob("inner", 1.0, 6701), ob("outer", 1.35, 7000)], elevation_ft=6500)
    assert move.mda_ft == 7300 and move.radius_nm == 1.4 and move.iterations == 2
    assert move.radius_provenance == "M" and "area radius" in move.from_memory   # 7001-9000 cell "M"


def test_expanded_takes_the_least_self_consistent_mda():
    # 'tall' (2.75 NM, 3500 ft) would give 3800 ft and R 2.9 NM, itself consistent; but starting
    # from the floor the MDA 1000 ft gives R 2.7 NM, which leaves 'tall' outside: 1000 is a
    # fixed point too, and the least one (see the Notes of practice_minimum).
    r = pm("C", "terps-expanded", [ob("near", 2.0, 700), ob("tall", 2.75, 3500)])
    assert r.mda_ft == 1000 and r.controlling.name == "near"


def _band_radius(category: str, mda_ft: float) -> float:
    return cr.expanded_radius_nm(category, mda_ft_msl=mda_ft)


@settings(max_examples=100, deadline=None)
@given(category=st.sampled_from(cr.CATEGORIES),
       elevation_ft=st.integers(-200, 8000),
       obstacles=st.lists(st.tuples(st.floats(0.0, 6.0), st.floats(0.0, 359.0), st.integers(0, 9000)),
                          max_size=12))
def test_expanded_iteration_property(category, elevation_ft, obstacles):
    """Invariants: settles within the cap, the final radius is the one of the final MDA, every
    obstacle inside that radius is cleared, the MDAs never go down, and the result is the least
    of all fixed points (found by brute force over the six bands)."""
    obs = [ObstaclePoint(name=f"o{i}", xy_m=(d * NM_TO_M * np.sin(np.radians(b)), d * NM_TO_M * np.cos(np.radians(b))),
                         elevation_ft=e) for i, (d, b, e) in enumerate(obstacles)]
    r = pm(category, "terps-expanded", obs, elevation_ft=elevation_ft)
    assert 1 <= r.iterations <= MAX_EXPANDED_ITERATIONS
    assert r.radius_nm == _band_radius(category, r.mda_ft)
    for o in obs:
        if np.hypot(*o.xy_m) <= r.radius_nm * NM_TO_M - 1e-6:
            assert r.mda_ft >= o.elevation_ft + 300.0
    mdas = [s.mda_ft for s in r.steps]
    assert mdas == sorted(mdas)
    floor = elevation_ft + cr.minimum_circling_height_ft(category, criteria="terps-expanded").height_ft
    fixed = []
    for cells in cr.EXPANDED_RADII:
        radius = cells[category].radius_nm
        inside = [o.elevation_ft for o in obs if np.hypot(*o.xy_m) <= radius * NM_TO_M + 1e-6]
        m = cr.round_mda_up_ft(max([floor] + [e + 300.0 for e in inside]), criteria="terps-expanded")
        if _band_radius(category, m) == radius:
            fixed.append(m)
    assert r.mda_ft == min(fixed)


# ----------------------------------------------------------------------------------------------
# Not-authorised sectors
# ----------------------------------------------------------------------------------------------

RUNWAY_EW = [(0.0, 0.0), (2000.0, 0.0)]


def test_side_sector_excludes_its_obstacles():
    # Runway east-west; 'ridge' 0.8 NM north (2000 ft), 'silo' 0.8 NM south (800 ft).
    # Without a sector the ridge controls: 2000 + 300 = 2300. With circling not authorised north
    # (the left of 0 -> 2000 m east), the silo controls: 800 + 300 = 1100.
    obs = [ob("ridge", 0.5, 2000, north_nm=0.8), ob("silo", 0.5, 800, north_nm=-0.8)]
    north = geometry.SideSector(line_a_m=RUNWAY_EW[0], line_b_m=RUNWAY_EW[1], side="left")
    without = pm("B", "terps-legacy", obs, centres=RUNWAY_EW)
    with_sector = pm("B", "terps-legacy", obs, centres=RUNWAY_EW, excluded=[north])
    assert without.controlling.name == "ridge" and without.mda_ft == 2300 and without.ignored_in_sectors == ()
    assert with_sector.controlling.name == "silo" and with_sector.mda_ft == 1100
    assert with_sector.ignored_in_sectors == ("ridge",)


def test_bearing_sector_excludes_its_obstacles():
    # Sector 040-110 deg true from the origin threshold: 'mast' at bearing 090 is in it, 'tree'
    # at bearing 180 is not. Cat A legacy (1.3 NM): 450 + 300 = 750 -> 760 without the mast.
    obs = [ob("mast", 1.0, 900), ob("tree", 0.0, 450, north_nm=-1.0)]
    sector = geometry.BearingSector(centre_m=(0.0, 0.0), from_deg_true=40.0, to_deg_true=110.0)
    r = pm("A", "terps-legacy", obs, excluded=[sector])
    assert r.controlling.name == "tree" and r.mda_ft == 760 and r.ignored_in_sectors == ("mast",)
    # an excluded obstacle outside the radius is simply outside, not "ignored"
    far = pm("A", "terps-legacy", [ob("mast", 2.0, 900)], excluded=[sector])
    assert far.ignored_in_sectors == ()


# ----------------------------------------------------------------------------------------------
# Provenance and invariants of the results
# ----------------------------------------------------------------------------------------------

def test_terps_provenance_is_carried():
    r = pm("C", "terps-legacy", [ob("o", 1.0, 500)])
    assert r.obstacle_clearance_provenance == "V"          # AIM 5-4-20 (300 ft)
    assert r.lowest_height_provenance == "M"                # Order 8260.3, from memory
    assert r.visibility_provenance == "M" and r.visibility_sm == 1.5   # Cat C 1.5 SM, from memory
    assert r.radius_provenance == "V2"                      # legacy table, secondary source
    assert r.from_memory == ("lowest circling height", "MDA rounding", "visibility")
    assert r.notice == PRACTICE_NOTICE == "PRACTICE VALUES — NOT A PUBLISHED PROCEDURE"


def test_result_invariants_are_checked():
    r = pm("A", "terps-legacy", [ob("mast", 1.0, 900)])
    with pytest.raises(DomainError, match="clear the controlling obstacle"):
        dataclasses.replace(r, mda_ft=1180.0, haa_ft=1180.0, mda_unrounded_ft=1170.0)
    with pytest.raises(DomainError, match="haa_ft"):
        dataclasses.replace(r, haa_ft=1.0)
    with pytest.raises(DomainError, match="whole step"):
        dataclasses.replace(r, mda_ft=1240.0, haa_ft=1240.0)


@pytest.mark.parametrize("bad", [dict(category="F"), dict(criteria="pans-ops"), dict(elevation_ft=1e6)])
def test_bad_input_is_a_domain_error(bad):
    kw = dict(category="A", criteria="terps-legacy", elevation_ft=0.0) | bad
    with pytest.raises(DomainError):
        pm(kw["category"], kw["criteria"], [], elevation_ft=kw["elevation_ft"])


def test_practice_minimums_all_categories():
    res = practice_minimums(criteria="terps-legacy", centres_m=ORIGIN, airport_elevation_ft=0.0, obstacles=[])
    # floors 350/450/450/550/550 -> 360/460/460/560/560 (20 ft steps)
    assert [r.mda_ft for r in res] == [360.0, 460.0, 460.0, 560.0, 560.0]


# ----------------------------------------------------------------------------------------------
# From the airfield model (wiring; numbers hand-derived from the demo file)
# ----------------------------------------------------------------------------------------------

@pytest.fixture(scope="module")
def valley():
    from briefer.io import catalog

    return catalog.find_airfield("V2RL")


def test_valley_with_the_south_sector(valley):
    # NDB-B: circling not authorised south of 09/27. Cat C (expanded): north-hill 1560 ft
    # (2.2 NM from the runway) controls: 1560 + 300 = 1860 ft, band 1001-3000 (R 2.8 NM).
    res = practice_minimums_for_airfield(valley, approach="NDB-B")
    assert isinstance(res, PracticeMinimums) and res.criteria == "terps-expanded"
    c = res.category("C")
    assert c.controlling.name == "north-hill" and c.mda_ft == 1860 and c.haa_ft == 1860 - 1120
    assert "south-ridge" in c.ignored_in_sectors
    assert c.published_mda_ft == 1880                       # the demo chart's own line, for comparison
    assert res.approach_name == "NDB-B" and len(res.sectors) == 1
    assert res.notice == PRACTICE_NOTICE
    assert res.category("E").published_mda_ft is None and "not authorised" in res.category("E").published_note


def test_valley_without_sectors(valley):
    # No approach, no sectors: the ridge-mast (2410 ft) is inside Cat B-E: 2710 -> 2720 (20 ft).
    res = practice_minimums_for_airfield(valley, criteria="terps-legacy")
    assert res.criteria_basis == "chosen"
    assert res.category("D").controlling.name == "ridge-mast" and res.category("D").mda_ft == 2720
    assert res.category("D").ignored_in_sectors == ()
    with pytest.raises(DomainError, match="no practice minimum"):
        practice_minimums_for_airfield(valley, categories=["A"]).category("B")


def test_controlling_obstacle_is_the_highest_inside_the_authorised_area():
    """One rule for the brief and practice minimums (AIM 5-4-20; Doc 8168 Vol I Part I Sec 4 Ch 7,
    7.3.4: an excluded sector does not count). Area: one centre, R = 1000 m, the sector "east of"
    a north-south line through the centre cut out. Hand-placed obstacles:
    0: 900 ft at (-500, 0) inside; 1: 1200 ft at (500, 0) in the sector; 2: 1200 ft at (0, 1500)
    outside the radius; 3: 900 ft at (0, -500) inside (ties with 0: the first charted wins);
    4: 800 ft at (-1000, 0) exactly on the arc (the boundary counts as inside)."""
    from briefer.core.geometry import ProtectedArea, side_of_centreline
    from briefer.core.minimums import controlling_obstacle_index

    east = side_of_centreline((0.0, -3000.0), (0.0, 3000.0), "east")
    area = ProtectedArea(centres_m=[(0.0, 0.0)], radius_m=1000.0, excluded=(east,))
    pts = [(-500.0, 0.0), (500.0, 0.0), (0.0, 1500.0), (0.0, -500.0), (-1000.0, 0.0)]
    assert controlling_obstacle_index(area, pts, [900.0, 1200.0, 1200.0, 900.0, 800.0]) == 0
    assert controlling_obstacle_index(area, pts, [900.0, 1200.0, 1200.0, 900.0, 950.0]) == 4
    assert controlling_obstacle_index(area, pts[1:3], [1200.0, 1200.0]) is None
    assert controlling_obstacle_index(area, np.zeros((0, 2)), []) is None
