"""Import one airfield's runways from the open airport database's CSV files.

The public-domain open airport database (OurAirports) is distributed as CSV files; two of them
are read here, in their published column layout (the database's data dictionary):

* ``airports.csv``: ``ident``, ``type``, ``name``, ``latitude_deg``, ``longitude_deg``,
  ``elevation_ft`` (among other columns, which are not read);
* ``runways.csv``: ``airport_ident``, ``length_ft``, ``width_ft``, ``closed``, and for each end,
  low (``le_``) and high (``he_``): ``ident``, ``latitude_deg``, ``longitude_deg``,
  ``elevation_ft``, ``heading_degT``, ``displaced_threshold_ft``.

`import_airfield` returns the airfield as the YAML mapping of the airfield format (without
approaches, which the crew adds from the chart), the YAML text with its comments, and notes:
closed runways left out, values the database does not give (reported, never guessed), the
checks of its headings and lengths against the positions.

Reading is streaming and reads only the rows of the wanted identifier: the file is read in
blocks, split into lines, and a line is parsed as CSV only when it holds the identifier (a
record whose quoted field spans several lines is kept whole). No line may exceed
`MAX_LINE_BYTES`, so a file without line breaks (a sparse or binary file) is refused at once
instead of being loaded whole. A bad file is one line ``FILE:LINE:COLUMN: message`` (COLUMN is
the CSV field number, from 1), a `CsvImportError`, exit code 2 at the command line.

Choices where the database is silent (said in the notes of each import):

* An end's latitude and longitude are taken as the runway end; a displaced threshold is placed
  ``displaced_threshold_ft`` along the centreline towards the other end, and its elevation is
  interpolated linearly between the two ends' elevations (the database gives none there).
* The magnetic variation is not in the database: the file leaves it out, so it is computed from
  the World Magnetic Model when the file is read, until the chart's value is added.
"""

from __future__ import annotations

import csv
import io
import math
import os
from briefer._dataclass import dataclass, field
from os import PathLike
from pathlib import Path
from typing import Any, Iterator

from briefer.errors import DataFileError
from briefer.units import FT_TO_M

MAX_LINE_BYTES = 1 << 20
BLOCK_BYTES = 1 << 20
HEADING_CHECK_DEG = 2.0
LENGTH_CHECK_FRACTION = 0.05

AIRPORT_COLUMNS = ("ident", "type", "name", "latitude_deg", "longitude_deg", "elevation_ft")
END_FIELDS = ("ident", "latitude_deg", "longitude_deg", "elevation_ft", "heading_degT", "displaced_threshold_ft")
RUNWAY_COLUMNS = (("airport_ident", "length_ft", "width_ft", "closed")
                  + tuple(f"le_{f}" for f in END_FIELDS) + tuple(f"he_{f}" for f in END_FIELDS))


class CsvImportError(DataFileError):
    """A bad CSV file: ``FILE:LINE:COLUMN: message`` (COLUMN is the CSV field number)."""

    def __init__(self, message: str, *, file: str, line: int, column: int) -> None:
        self.column = column
        super().__init__(message, file=file, line=line)

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.column}: {self.message}"


@dataclass(frozen=True, slots=True)
class _Row:
    line: int
    values: dict[str, str]
    columns: dict[str, int]
    file: str

    def error(self, name: str, message: str) -> CsvImportError:
        return CsvImportError(f"{name}: {message}", file=self.file, line=self.line, column=self.columns[name])

    def text(self, name: str) -> str:
        return self.values[name].strip()

    def number(self, name: str, *, lo: float = -math.inf, hi: float = math.inf) -> float | None:
        """The field as a number; None when empty; a bad number is an error naming the field."""
        raw = self.text(name)
        if not raw:
            return None
        try:
            value = float(raw)
        except ValueError:
            raise self.error(name, f"expected a number, got {raw[:40]!r}") from None
        if not (math.isfinite(value) and lo <= value <= hi):
            raise self.error(name, f"expected a number between {lo:g} and {hi:g}, got {raw[:40]!r}")
        return value


@dataclass
class ImportResult:
    """One imported airfield.

    Attributes:
        mapping: the airfield file's mapping (no approaches; no variation, which the World
            Magnetic Model then supplies); values the database lacks are None.
        text: the YAML text to save (the mapping, with comments and the notes).
        notes: closed runways left out, missing values, checks, the choices made.
        missing: dotted paths of the values the database does not give (to be typed in).
    """

    ident: str
    mapping: dict[str, Any]
    text: str
    notes: list[str] = field(default_factory=list)
    missing: list[str] = field(default_factory=list)


# --------------------------------------------------------------------------------------------
# Streaming the rows of one identifier
# --------------------------------------------------------------------------------------------
def _chunks(path: Path, name: str) -> Iterator[tuple[int, bytes]]:
    """(number of the first line, whole lines joined by b'\\n') of a file, read in blocks.

    Refuses a line longer than `MAX_LINE_BYTES` (a sparse or binary file) before reading on."""
    try:
        fh = open(path, "rb")
    except OSError as exc:
        raise CsvImportError(f"cannot read the file ({exc.strerror or exc})", file=name, line=1, column=1) from None
    with fh:
        tail = b""
        number = 0                      # lines yielded so far
        while True:
            block = fh.read(BLOCK_BYTES)
            if not block:
                break
            data = tail + block
            cut = data.rfind(b"\n")
            if cut >= 0:
                chunk, tail = data[:cut], data[cut + 1:]
                yield number + 1, chunk
                number += chunk.count(b"\n") + 1
            else:
                tail = data
            if len(tail) > MAX_LINE_BYTES:
                raise CsvImportError(f"line {number + 1} is longer than {MAX_LINE_BYTES // 1024} KiB: not a CSV "
                                     "file of the open airport database (a sparse or binary file?)",
                                     file=name, line=number + 1, column=1)
        if tail:
            yield number + 1, tail


def _decode(raw: bytes, name: str, line: int) -> str:
    if b"\x00" in raw:
        raise CsvImportError("binary data (a NUL byte): not a CSV file", file=name, line=line, column=1)
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise CsvImportError(f"not UTF-8 text (byte {exc.start + 1} of the line)", file=name, line=line,
                             column=1) from None


def _header(chunks: Iterator[tuple[int, bytes]], name: str) -> tuple[list[str], tuple[int, bytes] | None]:
    """The header's fields, and the first chunk's remaining lines (if any)."""
    first = next(chunks, None)
    head, sep, rest = first[1].partition(b"\n") if first is not None else (b"", b"", b"")
    if not head.strip(b"\r\xef\xbb\xbf \t"):
        raise CsvImportError(f"empty file: expected the header line of the open airport database's {name}",
                             file=name, line=1, column=1)
    header = next(csv.reader([_decode(head, name, 1).lstrip("\ufeff")]))
    return [h.strip() for h in header], ((2, rest) if sep else None)


def _records(path: Path, name: str, key_column: str, key: str, wanted: tuple[str, ...]) -> Iterator[_Row]:
    """The rows whose `key_column` equals `key`, with only the `wanted` columns.

    The key is looked for as the file spells identifiers, in upper case (or all in lower case);
    a mixed-case spelling in the file is not found. A block of lines that does not hold the key
    and neither starts nor ends inside
    a quoted field is skipped whole; the others are read line by line and the candidate records
    parsed by the csv module."""
    chunks = _chunks(path, name)
    header, rest = _header(chunks, name)
    columns = {h: i for i, h in enumerate(header)}
    for col in wanted:
        if col not in columns:
            raise CsvImportError(f"missing column '{col}' in the header (the open airport database's {name} "
                                 f"layout has it)", file=name, line=1, column=len(header) + 1)
    needles = (key.upper().encode("utf-8"), key.lower().encode("utf-8"))   # the key as the file spells it
    want_index = [(c, columns[c]) for c in wanted]
    last = max(i for _, i in want_index)
    pending: list[bytes] = []           # the lines of a record whose quoted field goes on
    pending_line = 0

    def parse(record: list[bytes], start: int) -> _Row | None:
        text = "\n".join(_decode(r, name, start + i) for i, r in enumerate(record))
        fields = next(csv.reader([text]), [])
        if len(fields) <= last:
            raise CsvImportError(f"expected {len(header)} fields, got {len(fields)}", file=name, line=start,
                                 column=len(fields) + 1)
        values = {c: fields[i] for c, i in want_index}
        if values[key_column].strip().upper() != key.upper():
            return None
        return _Row(line=start, values=values, columns={c: i + 1 for c, i in want_index}, file=name)

    for first_line, chunk in _chain([rest] if rest is not None else [], chunks):
        if not pending and needles[0] not in chunk and needles[1] not in chunk and chunk.count(b'"') % 2 == 0:
            continue                    # no candidate here, and no quoted field crosses its ends
        for offset, raw in enumerate(chunk.split(b"\n")):
            number = first_line + offset
            if pending:
                pending.append(raw)
                if raw.count(b'"') % 2 == 0:
                    continue
                record, start, pending = pending, pending_line, []
            elif raw.count(b'"') % 2 == 1:      # a quoted field goes on to the next line
                pending, pending_line = [raw], number
                continue
            else:
                record, start = [raw], number
            if any(n in r for r in record for n in needles):
                row = parse(record, start)
                if row is not None:
                    yield row
    if pending:
        raise CsvImportError("a quoted field is not closed before the end of the file", file=name,
                             line=pending_line, column=1)


def _chain(first: list[tuple[int, bytes]], rest: Iterator[tuple[int, bytes]]) -> Iterator[tuple[int, bytes]]:
    yield from first
    yield from rest


# --------------------------------------------------------------------------------------------
# Building the airfield
# --------------------------------------------------------------------------------------------
def _airport(path: Path, name: str, ident: str) -> _Row:
    found: _Row | None = None
    for row in _records(path, name, "ident", ident, AIRPORT_COLUMNS):
        if found is not None:
            raise row.error("ident", f"duplicate identifier '{row.text('ident')}' (also line {found.line})")
        found = row
    if found is None:
        raise CsvImportError(f"no airport with the identifier '{ident}'", file=name, line=1, column=1)
    return found


def _end(row: _Row, prefix: str) -> dict[str, Any]:
    return {
        "ident": row.text(f"{prefix}ident"),
        "lat": row.number(f"{prefix}latitude_deg", lo=-90, hi=90),
        "lon": row.number(f"{prefix}longitude_deg", lo=-180, hi=180),
        "elev": row.number(f"{prefix}elevation_ft", lo=-1500, hi=30000),
        "heading": row.number(f"{prefix}heading_degT", lo=0, hi=360),
        "displaced_ft": row.number(f"{prefix}displaced_threshold_ft", lo=0, hi=20000),
    }


def _toward(frame: Any, a: tuple[float, float], b: tuple[float, float], metres: float) -> tuple[float, float]:
    """The point `metres` from a towards b, along the straight line in the local frame."""
    ax, ay = frame.to_local(a[0], a[1])
    bx, by = frame.to_local(b[0], b[1])
    d = math.hypot(bx - ax, by - ay)
    lat, lon = frame.to_geodetic(ax + metres * (bx - ax) / d, ay + metres * (by - ay) / d)
    return float(lat), float(lon)


def _runway(row: _Row, ref: tuple[float, float], result: ImportResult, index: int) -> dict[str, Any] | None:
    """The runway mapping of one database row, or None (left out, with a note)."""
    from briefer.core.geometry import LocalFrame, bearing_deg
    from briefer.model import normalise_designator, reciprocal_designator

    le, he = _end(row, "le_"), _end(row, "he_")
    name = f"{le['ident'] or '?'}/{he['ident'] or '?'}"
    where = f"runways.csv line {row.line}"
    if row.text("closed") in ("1", "true", "yes"):
        result.notes.append(f"Runway {name} is closed in the database ({where}): left out.")
        return None
    da, db = normalise_designator(le["ident"]), normalise_designator(he["ident"])
    if da is None or db is None or db != reciprocal_designator(da):
        result.notes.append(f"Runway {name} ({where}) has no pair of reciprocal runway designators "
                            "(a water lane, a helipad or a one-way strip?): left out.")
        return None
    lacking = [f"{p}{k}" for p, e in (("le_", le), ("he_", he)) for k, v in
               (("latitude_deg", e["lat"]), ("longitude_deg", e["lon"])) if v is None]
    if lacking:
        result.notes.append(f"Runway {name} ({where}): the database gives no position for "
                            f"{', '.join(lacking)}: left out (add it from the airport diagram).")
        return None
    frame = LocalFrame(lat0_deg=ref[0], lon0_deg=ref[1])
    ends = {"a": le, "b": he}
    thresholds: dict[str, dict[str, Any]] = {}
    for key, end, other in (("a", le, he), ("b", he, le)):
        th: dict[str, Any] = {"designator": normalise_designator(end["ident"]), "lat_deg": end["lat"],
                              "lon_deg": end["lon"], "elevation_ft": end["elev"]}
        path = f"runways[{index}].threshold_{key}"
        if end["elev"] is None:
            result.missing.append(f"{path}.elevation_ft")
            result.notes.append(f"Threshold {th['designator']}: the database gives no elevation "
                                f"({where}); left empty, type it from the chart.")
        if end["displaced_ft"]:
            metres = end["displaced_ft"] * FT_TO_M
            th["lat_deg"], th["lon_deg"] = _toward(frame, (end["lat"], end["lon"]), (other["lat"], other["lon"]),
                                                   metres)
            th["displaced_threshold_m"] = round(metres, 1)
            if end["elev"] is not None and other["elev"] is not None:
                full = _distance(frame, end, other)
                th["elevation_ft"] = round(end["elev"] + (other["elev"] - end["elev"]) * metres / full, 0)
                result.notes.append(f"Threshold {th['designator']} is displaced {end['displaced_ft']:g} ft: placed "
                                    "along the centreline from the runway end; its elevation interpolated "
                                    "between the ends' elevations (the database gives none there).")
        th["lat_deg"], th["lon_deg"] = round(th["lat_deg"], 6), round(th["lon_deg"], 6)
        thresholds[key] = th
    rw: dict[str, Any] = {"threshold_a": thresholds["a"], "threshold_b": thresholds["b"]}
    width_ft = row.number("width_ft", lo=0, hi=2000)
    if width_ft is None:
        result.notes.append(f"Runway {name}: the database gives no width.")
    elif 10 <= width_ft * FT_TO_M <= 100:
        rw["width_m"] = round(width_ft * FT_TO_M, 1)
    else:
        result.notes.append(f"Runway {name}: width {width_ft:g} ft is outside 10 to 100 m: left out.")
    _check_heading_and_length(row, name, ends, frame, result, bearing_deg)
    return rw


def _distance(frame: Any, p: dict[str, Any], q: dict[str, Any]) -> float:
    ax, ay = frame.to_local(p["lat"], p["lon"])
    bx, by = frame.to_local(q["lat"], q["lon"])
    return math.hypot(bx - ax, by - ay)


def _check_heading_and_length(row: _Row, name: str, ends: dict[str, Any], frame: Any, result: ImportResult,
                              bearing_deg: Any) -> None:
    le, he = ends["a"], ends["b"]
    course = float(bearing_deg(frame.to_local(le["lat"], le["lon"]), frame.to_local(he["lat"], he["lon"])))
    for end, c in ((le, course), (he, (course + 180.0) % 360.0)):
        if end["heading"] is None:
            result.notes.append(f"Runway {name}: no heading for end {end['ident']} in the database (the positions "
                                f"give {c:05.1f}° true).")
        elif abs((end["heading"] - c + 180.0) % 360.0 - 180.0) > HEADING_CHECK_DEG:
            result.notes.append(f"Runway {name}: the database heading of end {end['ident']}, {end['heading']:g}° true, "
                                f"differs from the positions' {c:05.1f}° true; the positions are used.")
    length_ft = row.number("length_ft", lo=0, hi=50000)
    measured_ft = _distance(frame, le, he) / FT_TO_M
    if length_ft is None:
        result.notes.append(f"Runway {name}: no length in the database (the positions give {measured_ft:.0f} ft).")
    elif abs(length_ft - measured_ft) > LENGTH_CHECK_FRACTION * length_ft:
        result.notes.append(f"Runway {name}: the database length {length_ft:g} ft differs from the ends' distance "
                            f"{measured_ft:.0f} ft by more than {LENGTH_CHECK_FRACTION:.0%}; the positions are used.")


def import_airfield(ident: str, airports_csv: str | PathLike[str], runways_csv: str | PathLike[str]) -> ImportResult:
    """Read one airfield from the database's two CSV files (see the module docstring).

    The function the app's airfield form calls, as the command does. Raises `CsvImportError`
    for a bad file, naming the file, line and column.
    """
    ident = ident.strip().upper()
    apath, rpath = Path(airports_csv), Path(runways_csv)
    aname, rname = os.fspath(airports_csv), os.fspath(runways_csv)
    airport = _airport(apath, aname, ident)
    result = ImportResult(ident=ident, mapping={}, text="")
    lat = airport.number("latitude_deg", lo=-90, hi=90)
    lon = airport.number("longitude_deg", lo=-180, hi=180)
    if lat is None or lon is None:
        raise airport.error("latitude_deg" if lat is None else "longitude_deg",
                            "empty: the airport has no reference point in the database")
    elev = airport.number("elevation_ft", lo=-1500, hi=30000)
    if elev is None:
        result.missing.append("elevation_ft")
        result.notes.append("The database gives no airport elevation: left empty, type it from the chart.")
    if airport.text("type") == "closed_airport":
        result.notes.append("The database marks this airport as closed.")
    runways: list[dict[str, Any]] = []
    seen: dict[str, int] = {}
    for row in _records(rpath, rname, "airport_ident", ident, RUNWAY_COLUMNS):
        for col in ("le_ident", "he_ident"):
            key = row.text(col).upper()
            if key and key in seen:
                raise row.error(col, f"duplicate runway end '{row.text(col)}' at {ident} (also line {seen[key]})")
            if key:
                seen[key] = row.line
        rw = _runway(row, (lat, lon), result, len(runways))
        if rw is not None:
            runways.append(rw)
    if not runways:
        result.notes.append("No usable runway in the database: add the runways from the airport diagram.")
    result.mapping = {"kind": "airfield", "format_version": 1, "ident": ident, "name": airport.text("name") or ident,
                      "reference_point": {"lat_deg": lat, "lon_deg": lon}, "elevation_ft": elev,
                      "runways": runways, "approaches": []}
    result.notes.append("No magnetic variation in the database: it is computed from the World Magnetic Model "
                        "when the file is read; add the chart's variation of record (magnetic_variation_deg).")
    result.text = airfield_yaml(result)
    return result


# --------------------------------------------------------------------------------------------
# Writing
# --------------------------------------------------------------------------------------------
def _scalar(value: Any) -> str:
    if value is None:
        return "null"
    if isinstance(value, str):
        return '"' + value.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(value, float) and value.is_integer() and abs(value) < 1e15:
        return str(int(value))
    return repr(value)


def _flow(mapping: dict[str, Any]) -> str:
    return "{" + ", ".join(f"{k}: {_scalar(v)}" for k, v in mapping.items()) + "}"


def airfield_yaml(result: ImportResult) -> str:
    """The YAML text of an import: the airfield format, with the notes as comments."""
    m = result.mapping
    out = io.StringIO()
    out.write(f"# Imported from the open airport database (airports.csv, runways.csv) for {result.ident}.\n")
    out.write("# Check every value against the current chart before use. Notes of the import:\n")
    for note in result.notes:
        out.write(f"#  - {note}\n")
    for key in ("kind", "format_version", "ident", "name"):
        out.write(f"{key}: {_scalar(m[key])}\n")
    out.write(f"reference_point: {_flow(m['reference_point'])}\n")
    out.write(f"elevation_ft: {_scalar(m['elevation_ft'])}\n")
    out.write("# magnetic_variation_deg: (not in the database; the World Magnetic Model gives it until the chart's "
              "value is added here)\n")
    out.write("runways:\n" if m["runways"] else "runways: []\n")
    for rw in m["runways"]:
        out.write(f"  - threshold_a: {_flow(rw['threshold_a'])}\n")
        out.write(f"    threshold_b: {_flow(rw['threshold_b'])}\n")
        if "width_m" in rw:
            out.write(f"    width_m: {_scalar(rw['width_m'])}\n")
    out.write("approaches: []   # add the approaches from the chart (the app's airfield form)\n")
    return out.getvalue()


def write_import(result: ImportResult, out_dir: str | PathLike[str], *, overwrite: bool = False) -> Path:
    """Save the import as ``<out_dir>/<ident lower case>.yaml``, atomically."""
    from briefer.io.atomic import write_text_atomic

    return write_text_atomic(Path(out_dir) / f"{result.ident.lower()}.yaml", result.text, overwrite=overwrite)
