"""Displaced thresholds: the runway end and the landing threshold kept apart, and the circling-area
arcs centred where the published criteria put them.

Sources checked against:
* FAA AIM 5-4-20(b)(1): circling protected areas are the tangential connection of arcs drawn from
  each runway end (TERPS: a displaced threshold does not move the centre; the end does).
* ICAO Doc 8168 Vol I Part I Sec 4 Ch 7, 7.2.3 and Vol II Part I Sec 4 Ch 7, 7.2.1.1: arcs centred
  on each runway threshold; the threshold is where the part of the runway usable for landing begins
  (ICAO Annex 14 Vol I Ch 1, from memory), so a displaced threshold is the centre.
The geometry of the end (on the centreline, behind the threshold as seen on final) is the plain
definition of a displaced threshold; the hand-derived numbers show their arithmetic.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest
from numpy.testing import assert_allclose

from briefer.brief import build_brief, situation
from briefer.core import criteria, geometry
from briefer.core.minimums import practice_minimums_for_airfield
from briefer.io import catalog
from briefer.model import Airfield, BriefOptions, BriefRequest, FieldError, InvariantError, Threshold, Weather

UTC = "2000-01-01 00:00Z"
FAIR = dict(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=6.0, ceiling_ft=4000.0)


def displaced_airfield(designator: str = "27", metres: float = 600.0) -> Airfield:
    """The demo valley airfield with one threshold displaced (landing threshold position unchanged)."""
    af = catalog.find_airfield("V2RL")
    runways = []
    for rw in af.runways:
        a, b = rw.threshold_a, rw.threshold_b
        if a.designator == designator:
            a = replace(a, displaced_threshold_m=metres)
        if b.designator == designator:
            b = replace(b, displaced_threshold_m=metres)
        runways.append(replace(rw, threshold_a=a, threshold_b=b))
    return replace(af, runways=tuple(runways))


def request(af: Airfield, *, criteria_set: str | None = None) -> BriefRequest:
    return BriefRequest(profile=catalog.find_profile("demo-twin"), airfield=af, approach="RNAV (GPS) RWY 09",
                        landing_runway="27", weather=Weather(**FAIR),
                        options=BriefOptions(criteria=criteria_set))


# --- model ---------------------------------------------------------------------------------
def test_the_field_round_trips_and_absent_means_not_displaced() -> None:
    af = displaced_airfield()
    again = Airfield.from_mapping(af.to_mapping())
    assert again == af
    rw = again.runways[0]
    assert rw.threshold_b.displaced_threshold_m == 600.0 and rw.threshold_b.displaced_m == 600.0
    assert rw.threshold_a.displaced_threshold_m is None and rw.threshold_a.displaced_m == 0.0
    assert rw.displaced
    # end to end = threshold to threshold + the displacement
    assert rw.end_to_end_m == pytest.approx(rw.threshold_distance_m + 600.0)
    # a file without the key writes none back (demo files unchanged)
    plain = catalog.find_airfield("V2RL")
    assert "displaced_threshold_m" not in plain.to_mapping()["runways"][0]["threshold_a"]


@pytest.mark.parametrize("value", [-1.0, 3001.0, "300 m", float("nan")])
def test_a_bad_displacement_names_the_field(value) -> None:
    data = catalog.find_airfield("V2RL").to_mapping()
    data["runways"][0]["threshold_b"]["displaced_threshold_m"] = value
    with pytest.raises(FieldError) as err:
        Airfield.from_mapping(data)
    assert "runways[0].threshold_b.displaced_threshold_m" in str(err.value)


def test_threshold_checks_the_range_when_built_by_hand() -> None:
    with pytest.raises(InvariantError):
        Threshold(designator="09", lat_deg=1.0, lon_deg=1.0, elevation_ft=100.0, displaced_threshold_m=-5.0)


# --- core rule and geometry ----------------------------------------------------------------
def test_runway_end_lies_behind_the_threshold_on_the_centreline() -> None:
    # threshold at the origin, opposite threshold 1000 m east: the end of a 300 m displacement is
    # 300 m west of the threshold: (0 - 300, 0).
    assert_allclose(geometry.runway_end_xy((0.0, 0.0), (1000.0, 0.0), 300.0), (-300.0, 0.0))
    # along a 3-4-5 diagonal: 50 m behind (30, 40) away from (0, 0) is (30 + 30, 40 + 40).
    assert_allclose(geometry.runway_end_xy((30.0, 40.0), (0.0, 0.0), 50.0), (60.0, 80.0))
    assert_allclose(geometry.runway_end_xy((5.0, 6.0), (1000.0, 0.0), 0.0), (5.0, 6.0))


@pytest.mark.parametrize("crit, centre", [("terps-legacy", "runway-end"), ("terps-expanded", "runway-end"),
                                          ("icao", "landing-threshold")])
def test_arc_centre_rule_per_criteria(crit: str, centre: str) -> None:
    rule = criteria.circling_arc_centre(crit)
    assert rule.centre == centre
    if centre == "runway-end":
        assert "AIM 5-4-20" in rule.source                      # AIM 5-4-20(b)(1): "each runway end"
    else:
        assert "Doc 8168" in rule.source and "7.2.1" in rule.source


def test_centres_follow_the_rule_only_where_a_threshold_is_displaced() -> None:
    af = displaced_airfield("27", 600.0)
    frame = geometry.LocalFrame(lat0_deg=af.reference_point.lat_deg, lon0_deg=af.reference_point.lon_deg)
    xy = {t.designator: np.array(frame.to_local(t.lat_deg, t.lon_deg)) for t in af.thresholds}
    ends = geometry.circling_centres_m(af, xy, on_runway_ends=True)
    thresholds = geometry.circling_centres_m(af, xy, on_runway_ends=False)
    assert_allclose(thresholds, [xy["09"], xy["27"]])
    assert_allclose(ends[0], xy["09"])                          # 09 is not displaced: its own threshold
    # 27's end is 600 m behind 27, i.e. further from 09
    assert np.hypot(*(ends[1] - xy["09"])) == pytest.approx(np.hypot(*(xy["27"] - xy["09"])) + 600.0)


# --- the brief -----------------------------------------------------------------------------
@pytest.mark.parametrize("crit", ["terps-expanded", "terps-legacy"])
def test_terps_brief_draws_the_arc_about_the_runway_end(crit: str) -> None:
    plain = situation(request(catalog.find_airfield("V2RL"), criteria_set=crit))
    s = situation(request(displaced_airfield("27", 600.0), criteria_set=crit))
    # the landing threshold (and so the plan's runway frame) is unchanged ...
    assert_allclose(s.runway.threshold_xy_m, plain.runway.threshold_xy_m)
    assert s.runway.length_m == pytest.approx(plain.runway.length_m)
    # ... but the area now reaches R beyond the runway end, 600 m behind threshold 27
    end = geometry.runway_end_xy(s.thresholds_xy["27"], s.thresholds_xy["09"], 600.0)
    assert_allclose(np.asarray(s.area.centres_m)[1], end)
    r = s.area.radius_m
    outward = (end - s.thresholds_xy["09"]) / np.hypot(*(end - s.thresholds_xy["09"]))
    left = np.array([-outward[1], outward[0]])                   # north of the centreline (the sector is south)
    p = end + (r - 60.0) * outward + 50.0 * left                  # |(r - 60, 50)| < r from the end
    assert s.area.margin_m(p) > 0.0
    assert plain.area.margin_m(p) < 0.0                           # ~600 m + r - 60 from threshold 27: outside


def test_icao_brief_keeps_the_arc_on_the_displaced_threshold() -> None:
    plain = situation(request(catalog.find_airfield("V2RL"), criteria_set="icao"))
    s = situation(request(displaced_airfield("27", 600.0), criteria_set="icao"))
    assert_allclose(np.asarray(s.area.centres_m), np.asarray(plain.area.centres_m))


def test_brief_says_which_centre_it_used() -> None:
    b = build_brief(request(displaced_airfield("27", 600.0)), computed_utc=UTC)
    f = [x for x in b.findings if x.code == "displaced-threshold"]
    assert len(f) == 1 and f[0].severity == "info"
    assert "27 by 600 m" in f[0].text and "runway ends" in f[0].text and "AIM 5-4-20" in f[0].text
    b_icao = build_brief(request(displaced_airfield("27", 600.0), criteria_set="icao"), computed_utc=UTC)
    f = [x for x in b_icao.findings if x.code == "displaced-threshold"]
    assert "landing thresholds" in f[0].text
    plain = build_brief(request(catalog.find_airfield("V2RL")), computed_utc=UTC)
    assert "displaced-threshold" not in [x.code for x in plain.findings]


def test_practice_minimums_use_the_same_rule() -> None:
    af = displaced_airfield("27", 600.0)
    res = practice_minimums_for_airfield(af, categories=("C",), criteria="terps-legacy")
    assert any("runway ends" in n for n in res.notes)


def test_the_runway_end_behind_a_displaced_threshold_is_drawn() -> None:
    from briefer.render.brief_json import brief_to_dict
    from briefer.render.brief_scene import scene_from_brief
    from briefer.render.scene import Polyline, Role

    b = build_brief(request(displaced_airfield("27", 600.0)), computed_utc=UTC)
    (rw,) = b.runways
    assert rw.a_end_xy_m is None
    # the end: 600 m behind threshold 27, away from 09
    assert np.hypot(*(rw.b_end_xy_m - rw.a_xy_m)) == pytest.approx(np.hypot(*(rw.b_xy_m - rw.a_xy_m)) + 600.0)
    d = brief_to_dict(b)["runways"][0]
    assert "a_end" not in d and d["b_end"] == pytest.approx(list(rw.b_end_xy_m))
    dashed = [i for i in scene_from_brief(b).items if isinstance(i, Polyline) and i.role == Role.RUNWAY and i.dashed]
    assert len(dashed) == 1
    plain = build_brief(request(catalog.find_airfield("V2RL")), computed_utc=UTC)
    assert "b_end" not in brief_to_dict(plain)["runways"][0]
