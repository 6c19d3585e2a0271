"""Importing an airfield from the open airport database's CSV files (briefer.io.runway_import).

Every airport and runway here is invented (identifiers, names and positions), in the database's
published column layout (its data dictionary: airports.csv and runways.csv). External checks: the
displaced threshold's distance from its runway end by geographiclib's geodesic (Karney 2013), and
the imported airfield's briefs against the hand-written demo file they were taken from.
"""

from __future__ import annotations

import json
import subprocess
import sys
import time
import tracemalloc
from pathlib import Path

import pytest
import yaml
from geographiclib.geodesic import Geodesic

from briefer.brief import build_brief
from briefer.errors import BriefingError
from briefer.io import catalog
from briefer.io.runway_import import CsvImportError, import_airfield, write_import
from briefer.model import Airfield, BriefRequest, FieldError, Weather
from briefer.render.brief_json import brief_to_dict

ROOT = Path(__file__).resolve().parents[1]
EXAMPLES = ROOT / "examples" / "open-airport-data"
AIRPORTS = EXAMPLES / "airports.csv"
RUNWAYS = EXAMPLES / "runways.csv"
UTC = "2000-01-01 00:00Z"


def _import(ident: str, airports: Path = AIRPORTS, runways: Path = RUNWAYS):
    return import_airfield(ident, airports, runways)


def _copy(tmp_path: Path, name: str, text: str | bytes) -> Path:
    p = tmp_path / name
    p.write_bytes(text if isinstance(text, bytes) else text.encode("utf-8"))
    return p


# --- the same brief as the hand-written file -------------------------------------------------
def test_imported_two_runway_airfield_gives_the_same_briefs_as_its_hand_written_file() -> None:
    hand = catalog.find_airfield("Q7HM")
    result = _import("q7hm")
    data = yaml.safe_load(result.text)
    assert data == json.loads(json.dumps(result.mapping))            # the text is the mapping
    assert len(data["runways"]) == 2 and not result.missing
    # What the crew adds from the chart: the approaches, the obstacles and the variation of record.
    written = hand.to_mapping()
    data.update(approaches=written["approaches"], obstacles=written["obstacles"],
                magnetic_variation_deg=written["magnetic_variation_deg"])
    imported = Airfield.from_mapping(data)
    assert imported.variation_model is None
    wx = Weather(wind_from_deg=200.0, wind_speed_kt=12.0, oat_c=25.0, altimeter_hpa=1012.0, visibility_sm=5.0,
                 ceiling_ft=3000.0)
    compared = 0
    for profile in ("demo-trainer", "demo-twin", "demo-bizjet"):
        for ap in hand.approaches:
            for th in hand.thresholds:
                kw = dict(profile=catalog.find_profile(profile), approach=ap.name, landing_runway=th.designator,
                          weather=wx)
                a = brief_to_dict(build_brief(BriefRequest(airfield=hand, **kw), computed_utc=UTC))
                b = brief_to_dict(build_brief(BriefRequest(airfield=imported, **kw), computed_utc=UTC))
                # compared as JSON text: every digit, and a NaN (no plan) equals a NaN
                assert json.dumps(a, sort_keys=True) == json.dumps(b, sort_keys=True), (profile, ap.name, th.designator)
                compared += 1
    assert compared == 3 * len(hand.approaches) * 4


# --- what the import writes ------------------------------------------------------------------
def test_displaced_threshold_is_placed_from_the_runway_end() -> None:
    result = _import("W5TB")
    (rw,) = result.mapping["runways"]
    th22 = rw["threshold_b"]
    assert th22["designator"] == "22" and th22["displaced_threshold_m"] == pytest.approx(900 * 0.3048, abs=0.05)
    # the runway end 22 in the CSV: 47.126201, -100.792376; the threshold 900 ft from it (geographiclib)
    g = Geodesic.WGS84.Inverse(47.126201, -100.792376, th22["lat_deg"], th22["lon_deg"])
    assert g["s12"] == pytest.approx(274.32, abs=0.3)
    # interpolated elevation: 1858 + (1846 - 1858) * 274.32 / 1800 = 1856.2 -> 1856
    assert th22["elevation_ft"] == 1856
    assert any("displaced 900 ft" in n for n in result.notes)
    assert "displaced_threshold_m: 274.3" in result.text


def test_closed_runways_and_helipads_are_left_out_with_a_note() -> None:
    result = _import("W5TB")
    assert [rw["threshold_a"]["designator"] for rw in result.mapping["runways"]] == ["04"]
    assert any("11/29 is closed" in n and "left out" in n for n in result.notes)
    assert any("H1/?" in n and "left out" in n for n in result.notes)


def test_missing_values_are_reported_never_guessed() -> None:
    result = _import("B6NS")
    assert result.mapping["name"] == "Brackmoor, North Strip"        # quoted comma
    assert result.mapping["elevation_ft"] is None
    assert result.missing == ["elevation_ft", "runways[0].threshold_a.elevation_ft"]
    assert "elevation_ft: null" in result.text
    with pytest.raises(FieldError, match="elevation_ft"):
        Airfield.from_mapping(yaml.safe_load(result.text))


def test_the_variation_is_left_to_the_world_magnetic_model() -> None:
    result = _import("Q7HM")
    assert "magnetic_variation_deg" not in result.mapping
    assert any("World Magnetic Model" in n for n in result.notes)


# --- malformed files -----------------------------------------------------------------------
AIRPORT_HEADER = ('"id","ident","type","name","latitude_deg","longitude_deg","elevation_ft","continent",'
                  '"iso_country","iso_region","municipality","scheduled_service","gps_code","iata_code",'
                  '"local_code","home_link","wikipedia_link","keywords"')


def _airports(*rows: str, header: str = AIRPORT_HEADER) -> str:
    return "\n".join((header,) + rows) + "\n"


ROW_Q = '1,"Q7HM","small_airport","Qorvel Mesa",36.9234,-107.6167,6012,"NA","ZZ","ZZ-U-A","","no","","","","","",""'


def test_missing_column(tmp_path: Path) -> None:
    a = _copy(tmp_path, "airports.csv", _airports(ROW_Q, header=AIRPORT_HEADER.replace('"elevation_ft",', "")))
    with pytest.raises(CsvImportError) as err:
        _import("Q7HM", airports=a)
    assert str(err.value).startswith(f"{a}:1:") and "missing column 'elevation_ft'" in str(err.value)


def test_bad_number_names_file_line_and_column(tmp_path: Path) -> None:
    a = _copy(tmp_path, "airports.csv", _airports(ROW_Q.replace("6012", "6o12")))
    with pytest.raises(CsvImportError) as err:
        _import("Q7HM", airports=a)
    assert str(err.value) == f"{a}:2:7: elevation_ft: expected a number, got '6o12'"
    r = _copy(tmp_path, "runways.csv", RUNWAYS.read_text().replace("36.933184", "north"))
    with pytest.raises(CsvImportError) as err:
        _import("Q7HM", runways=r)
    assert str(err.value) == f"{r}:2:10: le_latitude_deg: expected a number, got 'north'"


def test_bad_rows_of_other_airports_are_not_read(tmp_path: Path) -> None:
    other = '2,"W5TB","small_airport","Wendle",forty,-100,oops,"NA","ZZ","ZZ-U-A","","no","","","","","",""'
    a = _copy(tmp_path, "airports.csv", _airports(other, ROW_Q))
    assert _import("Q7HM", airports=a).mapping["elevation_ft"] == 6012


def test_duplicate_identifiers(tmp_path: Path) -> None:
    a = _copy(tmp_path, "airports.csv", _airports(ROW_Q, ROW_Q.replace("Qorvel Mesa", "Qorvel Two")))
    with pytest.raises(CsvImportError) as err:
        _import("Q7HM", airports=a)
    assert str(err.value) == f"{a}:3:2: ident: duplicate identifier 'Q7HM' (also line 2)"
    lines = RUNWAYS.read_text().splitlines()
    r = _copy(tmp_path, "runways.csv", "\n".join(lines[:3] + [lines[2].replace("910002", "910099")]) + "\n")
    with pytest.raises(CsvImportError, match=r":4:9: le_ident: duplicate runway end '18' at Q7HM \(also line 3\)"):
        _import("Q7HM", runways=r)


def test_bom_and_crlf_are_read(tmp_path: Path) -> None:
    a = _copy(tmp_path, "airports.csv", b"\xef\xbb\xbf" + AIRPORTS.read_bytes().replace(b"\n", b"\r\n"))
    r = _copy(tmp_path, "runways.csv", b"\xef\xbb\xbf" + RUNWAYS.read_bytes().replace(b"\n", b"\r\n"))
    assert _import("Q7HM", a, r).mapping == _import("Q7HM").mapping


def test_quoted_field_over_two_lines(tmp_path: Path) -> None:
    row = ROW_Q.replace('"Qorvel Mesa"', '"Qorvel Mesa, ""old""\nnorth field"')
    a = _copy(tmp_path, "airports.csv", _airports(row))
    assert _import("Q7HM", airports=a).mapping["name"] == 'Qorvel Mesa, "old"\nnorth field'


def test_empty_file_and_unknown_ident(tmp_path: Path) -> None:
    a = _copy(tmp_path, "airports.csv", "")
    with pytest.raises(CsvImportError, match=r":1:1: empty file"):
        _import("Q7HM", airports=a)
    with pytest.raises(CsvImportError, match=r":1:1: no airport with the identifier 'ZZ9ZZ'"):
        _import("ZZ9ZZ")


def test_a_1_gb_sparse_file_is_refused_without_loading_it(tmp_path: Path) -> None:
    big = tmp_path / "runways.csv"
    with open(big, "wb") as fh:
        fh.truncate(1 << 30)                                     # 1 GiB of holes: no line breaks
    tracemalloc.start()
    t0 = time.perf_counter()
    with pytest.raises(CsvImportError) as err:
        _import("Q7HM", runways=big)
    seconds = time.perf_counter() - t0
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    assert str(err.value).startswith(f"{big}:1:1:")
    assert peak < 16 << 20, peak                                 # a few MiB of blocks, never the file
    assert seconds < 30                                          # loose: refused at the first block, not read


# --- the command ----------------------------------------------------------------------------
def _cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "briefer", *args], capture_output=True, text=True, cwd=ROOT)


def test_command_writes_atomically_and_reports_errors_on_one_line(tmp_path: Path) -> None:
    ok = _cli("import-runways", "W5TB", "--airports", str(AIRPORTS), "--runways", str(RUNWAYS), "--out", str(tmp_path))
    assert ok.returncode == 0, ok.stderr
    out = tmp_path / "w5tb.yaml"
    assert out.exists() and "11/29 is closed" in ok.stdout
    assert [p.name for p in tmp_path.iterdir()] == ["w5tb.yaml"]            # no temporary file left
    again = _cli("import-runways", "W5TB", "--airports", str(AIRPORTS), "--runways", str(RUNWAYS),
                 "--out", str(tmp_path))
    assert again.returncode == 2 and "already exists" in again.stderr
    bad = _copy(tmp_path, "bad.csv", _airports(ROW_Q.replace("36.9234", "x")))
    err = _cli("import-runways", "Q7HM", "--airports", str(bad), "--runways", str(RUNWAYS), "--out", str(tmp_path))
    assert err.returncode == 2
    assert err.stderr.strip().splitlines() == [f"briefer import-runways: error: {bad}:2:5: latitude_deg: "
                                               "expected a number, got 'x'"]


def test_write_import_does_not_overwrite(tmp_path: Path) -> None:
    result = _import("Q7HM")
    path = write_import(result, tmp_path)
    before = path.read_bytes()
    with pytest.raises(BriefingError, match="already exists"):
        write_import(result, tmp_path)
    assert path.read_bytes() == before
