"""briefer.io.metar and `briefer metar` (issue 7).

Reference reports: tests/reference/metar_reports.yaml, decoded by hand from the code's definition
(AIM 7-1 key to aviation weather, FMH-1 ch. 9 and 12, WMO FM 15; summaries in docs/REFERENCES.md §10).
Every station identifier is invented and contains a digit.
"""

from __future__ import annotations

import dataclasses
import json
import string
from pathlib import Path
from typing import Any

import pytest
import yaml
from hypothesis import given, settings
from hypothesis import strategies as st

from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.errors import BriefingError
from briefer.io.metar import (
    CloudLayer,
    MetarError,
    MetarReport,
    decode_metar,
    weather_from_metar,
)
from briefer.units import (
    HPA_TO_INHG,
    INHG_TO_HPA,
    KMH_TO_MPS,
    M_TO_SM,
    MPS_TO_KT,
    SM_TO_M,
)

REFERENCE = Path(__file__).parent / "reference" / "metar_reports.yaml"
DATA = yaml.safe_load(REFERENCE.read_text())
CASES = DATA["cases"]
# The conversions below use the same exact constants as the decoder; only binary floating point
# rounding can differ (a product versus a quotient), hence rel 1e-12.
REL = 1e-12
TO_KT = {"KT": 1.0, "MPS": MPS_TO_KT, "KMH": KMH_TO_MPS * MPS_TO_KT}


def expected_mapping(case: dict[str, Any]) -> dict[str, Any]:
    """The full expected `MetarReport.to_mapping()` of a case: defaults, the case, derived units."""
    e = {**DATA["defaults"], **case["expect"]}
    e["observed_day_of_month"], e["observed_hour_utc"], e["observed_minute_utc"] = e.pop("time") or (None,) * 3
    to_kt = TO_KT.get(e["wind_unit"], 1.0)
    for what in ("speed", "gust"):
        v = e[f"wind_{what}_as_reported"]
        e[f"wind_{what}_kt"] = None if v is None else v * to_kt
    if "visibility_sm" in e:                       # statute miles reported: SM_TO_M
        e["visibility_m"] = e["visibility_sm"] * SM_TO_M
    elif "visibility_m" in e:                      # metres reported: M_TO_SM
        e["visibility_sm"] = e["visibility_m"] * M_TO_SM
    else:
        e["visibility_m"] = e["visibility_sm"] = None
    if "altimeter_inhg" in e:                      # A group: INHG_TO_HPA
        e["altimeter_hpa"] = e["altimeter_inhg"] * INHG_TO_HPA
    elif "altimeter_hpa" in e:                     # Q group: HPA_TO_INHG
        e["altimeter_inhg"] = e["altimeter_hpa"] * HPA_TO_INHG
    else:
        e["altimeter_inhg"] = e["altimeter_hpa"] = None
    e["clouds"] = [dict(zip(("group", "amount", "height_ft", "cloud_type"), row)) for row in e["clouds"]]
    return e


def assert_same(actual: Any, expected: Any, where: str) -> None:
    if isinstance(expected, float) or (isinstance(expected, int) and not isinstance(expected, bool)
                                       and isinstance(actual, float)):
        assert actual == pytest.approx(expected, rel=REL, abs=0.0), where
    elif isinstance(expected, dict):
        assert set(actual) == set(expected), where
        for k in expected:
            assert_same(actual[k], expected[k], f"{where}.{k}")
    elif isinstance(expected, list):
        assert isinstance(actual, list) and len(actual) == len(expected), f"{where}: {actual!r}"
        for n, (a, x) in enumerate(zip(actual, expected)):
            assert_same(a, x, f"{where}[{n}]")
    else:
        assert actual == expected and type(actual) is type(expected), f"{where}: {actual!r} != {expected!r}"


def test_reference_file_has_forty_cases_with_ids_and_sources():
    """Issue 7 asks for at least 40 reports, each with an id and its source."""
    assert len(CASES) >= 40
    assert len({c["id"] for c in CASES}) == len(CASES)
    assert all(c.get("source") and c.get("note") for c in CASES)


def test_reference_stations_are_invented():
    """DEVELOPERS.md Data: invented stations only; a digit in the identifier rules out a real one."""
    for c in CASES:
        station = decode_metar(c["report"]).station
        assert any(ch.isdigit() for ch in station), c["id"]


@pytest.mark.parametrize("case", [pytest.param(c, id=c["id"]) for c in CASES])
def test_reference_report(case):
    """Each field against the hand decoding in metar_reports.yaml (source named per case)."""
    report = decode_metar(case["report"])
    actual = report.to_mapping()
    assert actual.pop("raw") == case["report"].strip()
    actual["skipped"] = [s["group"] for s in actual["skipped"]]
    expected = expected_mapping(case)
    assert set(actual) == set(expected)
    for key in expected:
        assert_same(actual[key], expected[key], f"{case['id']}: {key}")


# --- individual rules, with the exact reason or message --------------------------------------
@pytest.mark.parametrize(("report", "group", "reason"), [
    pytest.param("Q4LM 121853Z 27015G10KT 5SM", "27015G10KT", "gust 10 not above mean speed 15",
                 id="gust_not_above_mean_REFERENCES_10"),
    pytest.param("Q4LM 121853Z 37015KT 5SM", "37015KT", "wind direction 370 outside 000-360",
                 id="direction_over_360_AIM_7_1"),
    pytest.param("Q4LM 121853Z 00015KT 5SM", "00015KT", "wind direction 000 is only used for calm (00000)",
                 id="direction_000_with_speed_AIM_7_1_calm"),
    pytest.param("Q4LM 121853Z 27000KT 5SM", "27000KT", "zero speed with a direction; calm is coded 00000",
                 id="zero_speed_with_direction_AIM_7_1_calm"),
    pytest.param("Q4LM 121853Z 5SM 280V350", "280V350", "variable wind sector without a wind group before it",
                 id="sector_without_wind_AIM_7_1"),
    pytest.param("Q4LM 121853Z 27015KT 1/3SM", "1/3SM",
                 "1/3 is not a proper fraction in halves, quarters, eighths or sixteenths",
                 id="thirds_REFERENCES_10_visibility_US"),
    pytest.param("Q4LM 121853Z 27015KT 0 1/2SM", "0 1/2SM", "whole number 0 before a fraction",
                 id="zero_whole_number_both_groups_skipped"),
    pytest.param("Q4LM 121853Z 27015KT 5SM 3SM", "3SM", "second visibility group; the first is kept",
                 id="duplicate_visibility"),
    pytest.param("Q4LM 121853Z 27015KT 5SM A1234", "A1234", "altimeter 418 hPa outside the plausible 850-1100 hPa",
                 id="altimeter_implausible_12.34_inHg_x_INHG_TO_HPA_is_418_hPa"),
    pytest.param("Q4LM 121853Z 27015KT CAVOK BKN020", "BKN020", "cloud group contradicts CAVOK",
                 id="cloud_after_cavok_FM15"),
    pytest.param("Q4LM 121853Z 27015KT 5SM CLR BKN020", "BKN020", "contradicts CLR before it",
                 id="cloud_after_clr_REFERENCES_10"),
    pytest.param("Q4LM 121853Z 27015KT 1500SW", "1500SW",
                 "directional minimum visibility without a prevailing visibility before it",
                 id="directional_minimum_alone_FM15"),
    pytest.param("Q4LM 321853Z 27015KT", "321853Z", "day 32 outside 1-31", id="day_32_FM15_header"),
    pytest.param("Q4LM 122460Z 27015KT", "122460Z", "time 2460Z is not a valid UTC time", id="hour_24_FM15_header"),
    pytest.param("Q4LM 121853Z 27015KT WS", "WS", "wind shear group without a runway or ALL RWY after it",
                 id="wind_shear_alone_FM15"),
    pytest.param("Q4LM 121853Z NIL 27015KT", "27015KT", "group after NIL (missing report)", id="after_nil_FM15"),
])
def test_skipped_reason(report, group, reason):
    """Brief of issue 7: a partly decodable report lists what it skipped and why."""
    assert (group, reason) in decode_metar(report).skipped


@pytest.mark.parametrize(("text", "message", "group"), [
    pytest.param("", "cannot decode METAR: the report is empty", None, id="empty"),
    pytest.param("  \n\t ", "cannot decode METAR: the report is empty", None, id="white_space"),
    pytest.param("=", "cannot decode METAR: the report is empty", None, id="end_sign_only"),
    pytest.param("METAR", "cannot decode METAR: the report ends before the station identifier", "METAR",
                 id="type_only"),
    pytest.param("METAR 121853Z 27015KT 5SM",
                 "cannot decode METAR: no station identifier (four letters or digits, first a letter) "
                 "where expected: group '121853Z'", "121853Z", id="no_station"),
    pytest.param("hello, world",
                 "cannot decode METAR: no station identifier (four letters or digits, first a letter) "
                 "where expected: group 'HELLO,'", "HELLO,", id="junk"),
    pytest.param("Q4LM", "cannot decode METAR for Q4LM: no observation group after the header", "Q4LM",
                 id="station_only"),
    pytest.param("Q4LM 121853Z NOSIG RMK AO2",
                 "cannot decode METAR for Q4LM: no observation group after the header", "Q4LM",
                 id="trend_and_remarks_only"),
    pytest.param("ABCD EFGH 1234567",
                 "cannot decode METAR for ABCD: no observation group decoded; group 'EFGH': unrecognised group",
                 "EFGH", id="junk_with_station_shape"),
])
def test_undecodable_raises_metar_error(text, message, group):
    """Brief of issue 7: undecodable -> MetarError naming the group that failed."""
    with pytest.raises(MetarError) as info:
        decode_metar(text)
    assert str(info.value) == message
    assert info.value.group == group
    assert isinstance(info.value, BriefingError)


def test_non_text_raises_metar_error():
    with pytest.raises(MetarError, match="expected text, got NoneType"):
        decode_metar(None)  # type: ignore[arg-type]


def test_other_scripts_digits_do_not_decode():
    """FM 15 groups are written in ASCII digits; anything else is skipped, not read as a number."""
    r = decode_metar("Q4LM 121853Z \u0662\u0667\u0660\u0661\u0665KT 10SM CLR 15/05 A2992")
    assert r.wind_speed_kt is None
    assert r.skipped == (("\u0662\u0667\u0660\u0661\u0665KT", "unrecognised group"),)


def test_missing_groups_are_none_never_zero():
    """Brief of issue 7 / FM 15: solidi mean "not reported"."""
    r = decode_metar("METAR Q4LM 121853Z AUTO /////KT //// ////// M/M A////")
    for name in ("wind_from_deg_true", "wind_speed_kt", "wind_gust_kt", "visibility_m", "visibility_sm",
                 "ceiling_ft", "temperature_c", "dew_point_c", "altimeter_inhg", "altimeter_hpa"):
        assert getattr(r, name) is None, name
    assert r.ceiling_may_be_lower  # FMH-1 9.3 d: the sky was not observed


def test_ceiling_is_lowest_of_unordered_layers():
    """FMH-1 ch. 9 §9.3 d: the lowest BKN/OVC/VV, whatever order the layers come in."""
    r = decode_metar("Q4LM 121853Z 27015KT 5SM OVC030 BKN012 SCT005 15/10 A2992")
    assert r.ceiling_ft == 1200.0  # BKN012 = 12 x 100 ft
    assert not r.ceiling_may_be_lower


def test_cloud_layer_forms_ceiling():
    """FMH-1 ch. 9 §9.3 d: BKN, OVC and VV form a ceiling; FEW and SCT do not."""
    assert [CloudLayer(group=a, amount=a, height_ft=100.0).forms_ceiling
            for a in ("FEW", "SCT", "BKN", "OVC", "VV")] == [False, False, True, True, True]


@pytest.mark.parametrize(("changes", "message"), [
    pytest.param({"visibility_is_less_than": True, "visibility_is_at_least": True},
                 "visibility cannot be both 'less than' and 'at least'", id="both_qualifiers"),
    pytest.param({"wind_from_deg_true": 0.0}, "wind direction 0.0 deg outside (0, 360]", id="direction_0"),
    pytest.param({"wind_speed_kt": 20.0, "wind_gust_kt": 15.0}, "gust 15.0 kt not above mean 20.0 kt",
                 id="gust_below_mean"),
    pytest.param({"ceiling_ft": -100.0}, "ceiling_ft = -100.0 is negative", id="negative_ceiling"),
])
def test_report_built_by_hand_is_validated(changes, message):
    """STYLE C: invariants are checked in __post_init__, also for models built by hand."""
    with pytest.raises(MetarError) as info:
        MetarReport(raw="Q4LM", station="Q4LM", **changes)
    assert str(info.value) == message


def test_report_is_frozen():
    r = decode_metar("Q4LM 121853Z 27015KT 5SM BKN025 15/10 A2992")
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.ceiling_ft = 100.0  # type: ignore[misc]


# --- weather_from_metar ------------------------------------------------------------------------
WEATHER_KEYS = {"wind_from_deg", "wind_speed_kt", "wind_gust_kt", "wind_reference", "oat_c",
                "altimeter_hpa", "visibility_sm", "ceiling_ft"}


def test_weather_from_metar_values():
    """AIM 7-1 key: 31015G27KT, 1 1/2SM, BKN011 ceiling, M02, A2992."""
    w = weather_from_metar(decode_metar("METAR Q4LM 121853Z 31015G27KT 1 1/2SM BKN011 M02/M05 A2992"))
    assert set(w) == WEATHER_KEYS
    assert w["wind_from_deg"] == 310.0 and w["wind_reference"] == "true"
    assert (w["wind_speed_kt"], w["wind_gust_kt"]) == (15.0, 27.0)
    assert w["visibility_sm"] == 1.5 and w["ceiling_ft"] == 1100.0 and w["oat_c"] == -2.0
    # A2992 = 29.92 inHg; hPa with the named constant
    assert w["altimeter_hpa"] == pytest.approx(29.92 * INHG_TO_HPA, rel=REL)


def test_weather_from_metar_not_reported_is_none():
    """Brief of issue 7: None where not reported (FM 15 solidi)."""
    w = weather_from_metar(decode_metar("METAR Q4LM 121853Z AUTO /////KT //// ////// M/M A////"))
    assert w == dict.fromkeys(WEATHER_KEYS - {"wind_reference"}) | {"wind_reference": "true"}


def test_weather_from_metar_wind_without_mean_speed_is_not_reported():
    """FM 15 solidi for the speed only: a direction or gust without the mean is not a usable wind."""
    r = decode_metar("Q4LM 121853Z 270//G25KT 10SM CLR 15/05 A2992")
    assert (r.wind_from_deg_true, r.wind_speed_kt, r.wind_gust_kt) == (270.0, None, 25.0)
    w = weather_from_metar(r)
    assert (w["wind_from_deg"], w["wind_speed_kt"], w["wind_gust_kt"]) == (None, None, None)


def test_weather_from_metar_mps_in_knots():
    """FM 15 MPS: 5 m/s x MPS_TO_KT."""
    w = weather_from_metar(decode_metar("X7PD 121850Z 24005MPS 9999 SCT040 15/10 Q1013"))
    assert w["wind_speed_kt"] == pytest.approx(5 * MPS_TO_KT, rel=REL)
    assert w["altimeter_hpa"] == 1013.0


# --- properties (hypothesis) -------------------------------------------------------------------
VALID = [c["report"] for c in CASES]
PIECES = ["METAR", "SPECI", "COR", "AUTO", "NIL", "Q4LM", "121853Z", "27015G25KT", "VRB03KT", "/////KT",
          "280V350", "1", "1/2SM", "M1/4SM", "P6SM", "9999", "0000", "1500SW", "CAVOK", "R04/4500FT",
          "-RA", "//", "BKN011", "OVC///", "///008", "VV///", "//////", "NSC", "M02/M05", "M/M", "02/",
          "A2992", "Q////", "NOSIG", "TEMPO", "RMK", "WS", "ALL", "RWY", "RETSRA", "=", "/", "G", "KT",
          "V", "SM", "0", "999999999999999999999Z"]


def check_decodes_or_metar_error(text: str) -> None:
    try:
        r = decode_metar(text)
    except MetarError as exc:
        assert "\n" not in str(exc)  # one line on stderr (STYLE E)
        return
    # Invariants of any decoded report (FMH-1 9.3 d; REFERENCES 10 gust criterion).
    heights = [c.height_ft for c in r.clouds if c.amount in ("BKN", "OVC", "VV") and c.height_ft is not None]
    assert r.ceiling_ft == (min(heights) if heights else None)
    if r.wind_gust_kt is not None and r.wind_speed_kt is not None:
        assert r.wind_gust_kt > r.wind_speed_kt
    # Every skipped group is a group of the input (ASCII letters folded, end sign removed).
    groups = text.translate(str.maketrans(string.ascii_lowercase, string.ascii_uppercase)).split()
    groups[-1] = groups[-1].rstrip("=")
    for group, _reason in r.skipped:
        assert all(part in groups for part in group.split()), group
    json.dumps(r.to_mapping())  # always serialisable


@settings(max_examples=300, deadline=None)
@given(st.text())
def test_random_text_only_raises_metar_error(text):
    """Brief of issue 7: never anything but MetarError, on any string."""
    check_decodes_or_metar_error(text)


@settings(max_examples=300, deadline=None)
@given(st.lists(st.sampled_from(PIECES), max_size=25))
def test_random_metar_like_groups_only_raise_metar_error(pieces):
    check_decodes_or_metar_error(" ".join(pieces))


@st.composite
def mutated_reports(draw):
    groups = draw(st.sampled_from(VALID)).split()
    for _ in range(draw(st.integers(1, 4))):
        if not groups:
            break
        k = draw(st.integers(0, len(groups) - 1))
        op = draw(st.sampled_from(["drop", "duplicate", "garble", "swap", "insert"]))
        if op == "drop":
            del groups[k]
        elif op == "duplicate":
            groups.insert(k, groups[k])
        elif op == "garble":
            g = groups[k]
            i = draw(st.integers(0, len(g)))
            groups[k] = g[:i] + draw(st.text(alphabet="0123456789/MPVGKTSRABCDEFNOQWZ ", max_size=3)) + g[i + 1:]
        elif op == "swap":
            j = draw(st.integers(0, len(groups) - 1))
            groups[k], groups[j] = groups[j], groups[k]
        else:
            groups.insert(k, draw(st.sampled_from(PIECES)))
    return " ".join(groups)


@settings(max_examples=300, deadline=None)
@given(mutated_reports())
def test_mutated_reports_only_raise_metar_error(text):
    """Reports with groups dropped, duplicated, garbled, swapped or inserted."""
    check_decodes_or_metar_error(text)


@settings(max_examples=100, deadline=None)
@given(st.sampled_from(CASES), st.sampled_from(["NOSIG", "BECMG 36030G45KT 0500 +TSRA VV001",
                                                "TEMPO 1/4SM FG OVC001 M10/M12 A2800"]))
def test_trend_never_changes_the_observation(case, trend):
    """FM 15: trend groups forecast a change; they do not overwrite the observed groups."""
    report = case["report"]
    if " RMK" in report or case["expect"].get("trend") or case["expect"].get("nil"):
        return
    a = decode_metar(report.rstrip("="))
    b = decode_metar(report.rstrip("=") + " " + trend)
    assert dataclasses.replace(b, raw=a.raw, trend=None) == a
    assert b.trend == trend


# --- the command -------------------------------------------------------------------------------
def run_cli(capsys, *argv: str) -> tuple[int, str, str]:
    code = main(["metar", *argv])
    out, err = capsys.readouterr()
    return code, out, err


def test_cli_json_keys_and_cautions(capsys):
    """DEVELOPERS.md CLI: keys carry units, numbers unrounded, cautions always present."""
    code, out, _ = run_cli(capsys, "METAR Q4LM 121853Z 31015G27KT 280V350 1 1/2SM -RA BKN011 OVC040 "
                                   "M02/M05 A2992 RMK AO2", "--json")
    assert code == 0
    data = json.loads(out)
    assert data["cautions"] == list(CAUTIONS)
    for key in ("wind_from_deg_true", "wind_speed_kt", "wind_gust_kt", "wind_variable_from_deg",
                "wind_variable_to_deg", "visibility_m", "visibility_sm", "ceiling_ft", "temperature_c",
                "dew_point_c", "altimeter_inhg", "altimeter_hpa", "skipped", "weather"):
        assert key in data, key
    assert data["ceiling_ft"] == 1100.0                  # BKN011 (FMH-1 9.3 d)
    assert data["visibility_m"] == pytest.approx(1.5 * SM_TO_M, rel=REL)   # unrounded
    assert data["altimeter_hpa"] == pytest.approx(29.92 * INHG_TO_HPA, rel=REL)
    assert data["clouds"][0] == {"group": "BKN011", "amount": "BKN", "height_ft": 1100.0, "cloud_type": None}
    assert set(data["weather"]) == WEATHER_KEYS


def test_cli_json_lists_skipped_groups(capsys):
    code, out, _ = run_cli(capsys, "Q4LM 121853Z 27015KT 5SM XYZ12 BKN025 15/10 A2992", "--json")
    assert code == 0
    assert json.loads(out)["skipped"] == [{"group": "XYZ12", "reason": "unrecognised group"}]


def test_cli_table(capsys):
    code, out, _ = run_cli(capsys, "METAR Q4LM 121853Z 31015G27KT 1 1/2SM BKN011 M02/M05 A2992 XYZ12")
    assert code == 0
    for text in ("310° true 15 kt gusting 27 kt", "1.5 SM (2414 m)", "1100 ft", "-2 °C / -5 °C",
                 "29.92 inHg (1013.2 hPa)", "XYZ12: unrecognised group", "NOT FOR NAVIGATION"):
        assert text in out, text


def test_cli_table_words_joined(capsys):
    """Unquoted groups are joined with spaces."""
    code, out, _ = run_cli(capsys, "Q4LM", "121853Z", "00000KT", "CAVOK", "10/05", "Q1020")
    assert code == 0
    assert "calm" in out and "CAVOK" in out


@pytest.mark.parametrize("junk", [pytest.param("hello world", id="words"), pytest.param("", id="empty"),
                                  pytest.param("Q4LM 121853Z", id="header_only")])
def test_cli_undecodable_is_one_line_exit_2(capsys, junk):
    """STYLE E: a BriefingError is one line on stderr and exit code 2."""
    code, out, err = run_cli(capsys, junk)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and err.startswith("briefer metar: error: cannot decode METAR")
