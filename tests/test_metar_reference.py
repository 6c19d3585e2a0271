"""Cross-check of briefer.io.metar against an independent decoder: the PyPI `metar` library.

Every report of tests/reference/metar_reports.yaml (hand-decoded from AIM 7-1, FMH-1 ch. 9/12 and
WMO FM 15) is also decoded by `metar.Metar.Metar(..., strict=False)`, and the two must agree on
wind direction, speed and gust in kt, visibility in SM with its less-than/more-than qualifier,
ceiling (lowest BKN/OVC/VV height the library reports, FMH-1 ch. 9 §9.3 d), temperature, dew
point and altimeter. Where the library reads a group differently on purpose of its own, or cannot
read it, the field is skipped for that report with the reason beside it in KNOWN_DIFFERENCES.
"""

from __future__ import annotations

import warnings
from pathlib import Path
from typing import Any, Callable

import pytest
import yaml

from briefer.io.metar import MetarReport, decode_metar
from briefer.units import INHG_TO_HPA, MPS_TO_KT

Metar = pytest.importorskip("metar.Metar")

CASES = yaml.safe_load((Path(__file__).parent / "reference" / "metar_reports.yaml").read_text())["cases"]
# Both decoders read the same integers and the library converts with its own factors; rel 1e-9
# allows float rounding only (altimeter is compared in the unit reported, see below).
REL = 1e-9

# (case id, field) -> why the library's answer differs from the code's definition, or why it has
# no answer. Our value for each of these is checked by hand in test_metar.py.
KNOWN_DIFFERENCES: dict[tuple[str, str], str] = {
    ("all_groups_missing_auto", "visibility"):
        "the library reads '////' (visibility not reported, FM 15 solidi) as 10 km",
    ("metric_0000", "visibility"):
        "the library reads 0000 as 0 m without qualifier; FM 15 defines it as less than 50 m "
        "(checked below in test_metric_0000_library_value_inside_our_bound)",
    ("duplicate_wind_keeps_first", "wind_speed"):
        "the library keeps the second of two wind groups; we keep the first and list the second",
    ("duplicate_wind_keeps_first", "ceiling"):
        "after the second wind group the library leaves BKN025 unparsed",
    ("gust_not_above_mean_skipped", "wind_dir"):
        "the library accepts a gust below the mean (15G10); we skip the inconsistent group",
    ("gust_not_above_mean_skipped", "wind_speed"): "as above",
    ("gust_not_above_mean_skipped", "wind_gust"): "as above",
    ("improper_fraction_and_garbled_altimeter", "visibility"):
        "the library accepts 1/3 SM, not a reportable US fraction (halves to sixteenths)",
    ("improper_fraction_and_garbled_altimeter", "altimeter"):
        "the library accepts A1234 (12.34 inHg, about 418 hPa); we skip it as implausible",
    **{("direction_out_of_range_skipped", f): "the library stops at the invalid 37015KT and leaves "
       "every later group unparsed" for f in ("visibility", "ceiling", "temperature", "dew_point",
                                              "altimeter")},
}
FIELDS = ("wind_dir", "wind_speed", "wind_gust", "visibility", "ceiling", "temperature",
          "dew_point", "altimeter")


def library_decode(text: str) -> Any:
    """The library's decoding. It wants upper case (our decoder folds case itself) and warns about
    groups it leaves unparsed (strict=False); those warnings are expected here."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RuntimeWarning)
        try:
            return Metar.Metar(text.upper(), strict=False)
        except Metar.ParserError as exc:  # pragma: no cover - none of the current reports
            pytest.skip(f"the library cannot parse this report: {exc}")


def value(obj: Any, unit: str | None = None) -> float | None:
    if obj is None:
        return None
    return obj.value(unit) if unit else obj.value()


def library_ceiling_ft(m: Any) -> float | None:
    heights = [h.value("FT") for cover, h, _ in m.sky if cover in ("BKN", "OVC", "VV") and h is not None]
    return min(heights) if heights else None


def compare(ours: float | None, theirs: float | None, what: str) -> None:
    if ours is None:
        assert theirs is None, f"{what}: we have not reported, the library has {theirs}"
    else:
        assert theirs == pytest.approx(ours, rel=REL), what


def check_wind_dir(r: MetarReport, m: Any) -> None:
    if r.wind_is_calm:
        # 00000KT: we give no direction (none exists); the library gives 0 with zero speed.
        assert value(m.wind_dir) == 0.0 and value(m.wind_speed, "KT") == 0.0
        return
    compare(r.wind_from_deg_true, value(m.wind_dir), "wind direction (VRB and ///: none)")


def check_visibility(r: MetarReport, m: Any) -> None:
    compare(r.visibility_sm, value(m.vis, "SM"), "visibility SM")
    if m.vis is not None:
        # The library keeps M/P as "<"/">" on its distance (declared in its type stubs).
        qualifier = {"<": "less", ">": "more"}.get(m.vis._gtlt or "")
        ours = "less" if r.visibility_is_less_than else "more" if r.visibility_is_at_least else None
        if r.visibility_group in ("9999", "9999NDV", "CAVOK") and qualifier is None:
            # The library gives 10000 m without a qualifier; FM 15 defines 9999 as "10 km or more".
            return
        assert qualifier == ours, "visibility qualifier"


def check_altimeter(r: MetarReport, m: Any) -> None:
    # Compared in the unit reported: the library's inHg<->hPa factor is not the NIST conventional
    # one of briefer.units (see test_library_inhg_factor_close_to_nist).
    if r.altimeter_unit == "hPa":
        compare(r.altimeter_hpa, value(m.press, "HPA"), "altimeter hPa")
    else:
        compare(r.altimeter_inhg, value(m.press, "IN"), "altimeter inHg")


def check_speed(which: str) -> Callable[[MetarReport, Any], None]:
    def check(r: MetarReport, m: Any) -> None:
        theirs = getattr(m, f"wind_{which}")
        if r.wind_unit in (None, "KT"):
            compare(getattr(r, f"wind_{which}_kt"), value(theirs, "KT"), f"wind {which} kt")
        else:
            # MPS/KMH compared in the unit reported: the library's m/s->kt factor is rounded
            # (see test_library_mps_factor_close_to_exact); our kt value is checked by hand.
            compare(getattr(r, f"wind_{which}_as_reported"), value(theirs, r.wind_unit),
                    f"wind {which} {r.wind_unit}")
    return check


CHECKS: dict[str, Callable[[MetarReport, Any], None]] = {
    "wind_dir": check_wind_dir,
    "wind_speed": check_speed("speed"),
    "wind_gust": check_speed("gust"),
    "visibility": check_visibility,
    "ceiling": lambda r, m: compare(r.ceiling_ft, library_ceiling_ft(m), "ceiling ft (FMH-1 9.3 d)"),
    "temperature": lambda r, m: compare(r.temperature_c, value(m.temp, "C"), "temperature C"),
    "dew_point": lambda r, m: compare(r.dew_point_c, value(m.dewpt, "C"), "dew point C"),
    "altimeter": check_altimeter,
}


@pytest.mark.parametrize("field", FIELDS)
@pytest.mark.parametrize("case", [pytest.param(c, id=c["id"]) for c in CASES])
def test_agrees_with_metar_library(case, field):
    """Same report, independent decoder (PyPI `metar`); sources of the reports in the YAML."""
    reason = KNOWN_DIFFERENCES.get((case["id"], field))
    if reason:
        pytest.skip(reason)
    CHECKS[field](decode_metar(case["report"]), library_decode(case["report"]))


def test_known_differences_name_real_cases():
    ids = {c["id"] for c in CASES}
    assert {case_id for case_id, _ in KNOWN_DIFFERENCES} <= ids
    assert {f for _, f in KNOWN_DIFFERENCES} <= set(FIELDS)


def test_metric_0000_library_value_inside_our_bound():
    """FM 15: 0000 = less than 50 m; the library's 0 m lies inside that bound."""
    r = decode_metar("METAR X7PD 121850Z 00000KT 0000 FG VV000 03/03 Q1030")
    m = library_decode("METAR X7PD 121850Z 00000KT 0000 FG VV000 03/03 Q1030")
    assert r.visibility_is_less_than and value(m.vis, "M") < r.visibility_m


def test_library_inhg_factor_close_to_nist():
    """A2992: the library's hPa differs from 29.92 x INHG_TO_HPA (NIST SP 811 conventional inch of
    mercury) by less than 1e-5 relative, i.e. under 0.01 hPa: a different rounding of the factor."""
    m = library_decode("METAR Q4LM 121853Z 27015KT 5SM BKN025 15/10 A2992")
    assert value(m.press, "HPA") == pytest.approx(29.92 * INHG_TO_HPA, rel=1e-5)


def test_library_mps_factor_close_to_exact():
    """24005MPS: the library's kt differs from 5 x MPS_TO_KT (1 kt = 1852/3600 m/s exactly,
    NIST SP 811) by less than 1e-5 relative: a rounded factor, not a different reading."""
    m = library_decode("METAR X7PD 121850Z 24005MPS 6000 BKN012 15/10 Q1013")
    assert value(m.wind_speed, "KT") == pytest.approx(5 * MPS_TO_KT, rel=1e-5)
