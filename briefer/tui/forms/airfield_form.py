"""The airfield form: the airfield, its runways and each approach in the order a crew reads the
airport diagram and the approach chart (chart form: headings, lengths, distances and bearings; no
coordinates needed), and its side panel, a plan view drawn from what is entered.

No Textual import here.
"""

from __future__ import annotations

from typing import Any

from rich.console import Group as RichGroup
from rich.text import Text

from briefer.model import (
    CATEGORIES,
    CRITERIA,
    FORMAT_VERSION,
    KIND_AIRFIELD,
    OBSTACLE_KINDS,
    Airfield,
    CirclingMinimum,
    CrossingPoint,
    Fix,
    Obstacle,
    Sector,
    StraightInMinimum,
)
from briefer.tui.forms.check import Verdict
from briefer.tui.forms.spec import Field, FormPath, FormSpec, Group, Repeat

DISTANCE_ALT = {"ft": ("distance_ft", 1.0), "m": ("distance_m", 1.0)}
BEARING_ALT = {"°T": ("bearing_deg_true", 1.0)}
TDZE_ALT = {"TDZE": ("tdze_ft", 1.0)}
"""'5990 TDZE': the chart prints the touchdown zone elevation instead of the threshold's."""

_LATLON = (Field("lat_deg", "Latitude", "number", "°", width=12, reveal=True),
           Field("lon_deg", "Longitude", "number", "°", width=12, reveal=True))
"""A file's latitude/longitude (an imported or hand-written airfield): shown where the file has
them, kept to the last digit; the chart's numbers need none."""


def _threshold(key: str, title: str) -> Group:
    return Group(key, title, (
        Field("designator", "Designator", width=5, hint="13"),
        *_LATLON,
        Field("elevation_ft", "Elevation", "number", "ft", width=7, hint="or TDZE", alt=TDZE_ALT),
        Field("displaced_threshold_m", "Displaced by", "number", "m", width=8, hint="optional"),
        Field("tch_ft", "TCH", "number", "ft", width=7, hint="50"),
        Field("glide_path_deg", "Glide path", "number", "°", width=7, hint="3.0"),
    ))


def _fix(key: str, title: str, *, faf: bool) -> Group:
    place: tuple[Field, ...] = (
        Field("name", "Name", width=10, hint="QRV VOR" if not faf else "QMA6D"),
        *_LATLON,
    )
    if faf:
        place += (Field("distance_nm", "Before the MAP", "number", "NM", width=6, alt=DISTANCE_ALT, chart=True),
                  Field("altitude_ft", "Altitude", "number", "ft", width=7),
                  # a file may place its FAF as the MAP is placed (shown when it does)
                  Field("threshold", "At threshold", width=5, reveal=True),
                  Field("from_point", "From point", width=5, reveal=True),
                  Field("bearing_deg_mag", "Bearing from it", "number", "°M", width=6, alt=BEARING_ALT,
                        reveal=True))
        note = "(distance along the final course to the MAP)"
    else:
        place += (Field("threshold", "At threshold", width=5, hint="13", chart=True),
                  Field("distance_nm", "Distance", "number", "NM", width=8, alt=DISTANCE_ALT, hint="optional",
                        chart=True),
                  Field("from_point", "or from point", width=6, hint="13/ARP", chart=True),
                  Field("bearing_deg_mag", "Bearing from it", "number", "°M", width=6, alt=BEARING_ALT, chart=True),
                  Field("altitude_ft", "Altitude", "number", "ft", width=7, reveal=True))
        note = "(at a threshold, a distance before it, or a distance and bearing from a point)"
    return Group(key, f"{title} {note}", place, check=lambda m, p: Fix.from_mapping(m, path=p))


def _next_category(rows) -> dict[str, Any]:
    used = {str(r.get("category", "")).strip().upper() for r in rows}
    letter = next((c for c in CATEGORIES if c not in used), "")
    return {"category": letter, "minimum": "", "visibility": "", "reason": ""}


MINIMUM_ROW = (
    Field("category", "", width=2),
    Field("minimum", "MDA", "minimum", "ft", width=6, owns=("mda_ft", "not_authorised"), hint="or NA"),
    Field("visibility", "vis", "visibility", "SM/m", width=6, owns=("visibility_sm", "visibility_m")),
    Field("reason", "", width=10, hint="NA reason"),
)


def _minimums(key: str, title: str, reader: Any, *, optional: bool) -> Repeat:
    return Repeat(key, title, "Category", MINIMUM_ROW, row=True, by="category", optional=optional,
                  check=lambda cat, m, p: reader.from_category(cat, m, path=p), new_item=_next_category)


def _new_approach(rows) -> dict[str, Any]:
    return {"name": "", "runway": "", "final_course_deg_mag": "", "criteria": "",
            "map_fix": {"name": "", "threshold": "", "distance_nm": "", "from_point": "", "bearing_deg_mag": ""},
            "faf": {"name": "", "distance_nm": "", "altitude_ft": ""},
            "circling": [{"category": c, "minimum": "", "visibility": "", "reason": ""} for c in "ABCD"],
            "straight_in": {"runway": "", "minimums": []},
            "not_authorised_sectors": [], "missed_approach": "", "rnav_gps": ""}


CROSSING_ALT = {"NM": ("distance_nm", 1.0), "m": ("distance_m", 1.0)}


def _new_crossing(rows) -> dict[str, Any]:
    return {"threshold": "", "distance_ft": ""}


def _new_runway(rows) -> dict[str, Any]:
    row: dict[str, Any] = {
        "threshold_a": {"designator": "", "elevation_ft": "", "displaced_threshold_m": "", "tch_ft": "",
                        "glide_path_deg": ""},
        "threshold_b": {"designator": "", "elevation_ft": "", "displaced_threshold_m": "", "tch_ft": "",
                        "glide_path_deg": ""},
        "heading_deg_mag": "", "length_ft": "", "width_m": ""}
    if rows:
        row["position"] = {"threshold": "", "from_point": "", "distance_nm": "", "bearing_deg_mag": ""}
    return row


APPROACH_ITEMS = (
    Field("name", "Approach", width=16, hint="VOR-A"),
    Field("runway", "Runway served", width=5, hint="blank: circling only"),
    Field("final_course_deg_mag", "Final course", "number", "°M", width=6),
    _fix("map_fix", "MAP", faf=False),
    _fix("faf", "FAF", faf=True),
    _minimums("circling", "Circling minimums (MDA ft or NA, visibility SM or m)", CirclingMinimum, optional=False),
    Group("straight_in", "Straight-in minimums (optional)", (
        Field("runway", "Runway", width=5),
        _minimums("minimums", "", StraightInMinimum, optional=True),
    ), optional=True),
    Repeat("not_authorised_sectors", "Circling NA ('south of 09/27' or '13 040-110')", "Sector", (
        Field("where", "NA", "sector", width=16, owns=("side", "runway", "threshold", "from_deg_mag", "to_deg_mag")),
        Field("reason", "", width=12, hint="reason"),
    ), row=True, optional=True, check=lambda m, p: Sector.from_mapping(m, path=p)),
    Field("missed_approach", "Missed approach", width=30),
    Field("criteria", "Criteria", "choice", width=14, hint="/".join(CRITERIA)),
    Field("rnav_gps", "RNAV (GPS)", "flag", width=5, hint="no"),
)

RUNWAY_ITEMS = (
    _threshold("threshold_a", "Threshold A"),
    _threshold("threshold_b", "Threshold B"),
    Field("heading_deg_mag", "Heading A to B", "number", "°M", width=6, alt={"°T": ("heading_deg_true", 1.0)},
          chart=True),
    Field("length_ft", "Length", "number", "ft", width=6, alt={"m": ("length_m", 1.0)}, chart=True),
    Field("width_m", "Width", "number", "m", width=8, hint="optional"),
    Group("position", "Placed (runways after the first): its threshold at a distance and bearing from a point",
          (
        Field("threshold", "Its threshold", width=5, hint="A"),
        Field("from_point", "From point", width=6, hint="13/ARP"),
        Field("distance_nm", "Distance", "number", "NM", width=6, alt=DISTANCE_ALT),
        Field("bearing_deg_mag", "Bearing", "number", "°M", width=6, alt=BEARING_ALT),
    ), optional=True, chart=True),
    Repeat("crossing", "or where the centrelines cross: a threshold of this runway and one of a runway "
           "before it, each with its distance to the crossing", "Crossing", (
        Field("threshold", "From threshold", width=5, hint="18"),
        Field("distance_ft", "", "number", "ft", width=6, alt=CROSSING_ALT),
    ), row=True, optional=True, new_item=_new_crossing, chart=True,
        check=lambda m, p: CrossingPoint.from_mapping(m, path=p)),
)


def _read_airfield(mapping: Any) -> Airfield:
    return Airfield.from_mapping(mapping)


AIRFIELD_FORM = FormSpec(
    kind=KIND_AIRFIELD,
    title="Airfield",
    name_key="ident",
    header={"kind": KIND_AIRFIELD, "format_version": FORMAT_VERSION},
    read_model=_read_airfield,
    independent=("approaches", "obstacles"),
    items=(
        Group(None, "Airfield (airport diagram)", (
            Field("ident", "Identifier", width=6, hint="Q7HM"),
            Field("name", "Name", width=20),
            Field("elevation_ft", "Elevation", "number", "ft", width=6),
            Field("magnetic_variation_deg", "Variation", "variation", "°", width=6, hint="9E / 4W"),
        )),
        Group("reference_point", "Reference point (optional: blank = local frame)", (
            Field("lat_deg", "Latitude", "number", "°", width=10),
            Field("lon_deg", "Longitude", "number", "°", width=10),
        ), optional=True),
        Repeat("runways", "Runways", "Runway", RUNWAY_ITEMS, new_item=_new_runway),
        Repeat("approaches", "Approaches (approach chart)", "Approach", APPROACH_ITEMS, new_item=_new_approach),
        Repeat("obstacles", "Obstacles (optional)", "Obstacle", (
            Field("name", "Name", width=10),
            Field("kind", "Kind", "choice", width=9, hint="tower"),
            *_LATLON,
            Field("from_point", "From point", width=6, hint="13/ARP", chart=True),
            Field("distance_nm", "Distance", "number", "NM", width=6, alt=DISTANCE_ALT, chart=True),
            Field("bearing_deg_mag", "Bearing", "number", "°M", width=6, alt=BEARING_ALT, chart=True),
            Field("elevation_ft", "Elevation", "number", "ft", width=6),
            Field("height_agl_ft", "Height AGL", "number", "ft", width=8, hint="optional"),
        ), optional=True, check=lambda m, p: Obstacle.from_mapping(m, path=p)),
    ),
)
"""The airfield form (obstacle kinds: see `briefer.model.OBSTACLE_KINDS`)."""

_ = OBSTACLE_KINDS


# --------------------------------------------------------------------------------------------
# The side panel: a plan view of what is entered
# --------------------------------------------------------------------------------------------
def airfield_side(verdict: Verdict, width: int, height: int, ascii: bool) -> Any:
    """The plan view of the runways, fixes, obstacles and not-authorised sectors entered so far
    (north up), and what is not drawn yet."""
    from briefer.render.planview import render_plan
    from briefer.tui.forms.plan import plan_scene

    draft = verdict.built.mapping if verdict.built is not None else {}
    scene, notes = plan_scene(draft)
    text = Text("PLAN (north up)\n", style="bold underline")
    rows = max(height - 2 - len(notes), 3)
    if scene is None:
        text.append("\n".join(notes) or "Enter a runway: its heading and length.")
        return text
    canvas = render_plan(scene, width, rows, ascii=ascii)
    return RichGroup(text, canvas, Text("\n".join(notes), style="dim"))


# --------------------------------------------------------------------------------------------
# Runways imported from the open airport database (`briefer.io.runway_import`)
# --------------------------------------------------------------------------------------------
IMPORTED_KEYS = ("ident", "name", "elevation_ft", "reference_point", "runways")
"""What an import fills in; the approaches, obstacles and variation the crew typed stay."""

MISSING_WORDS = "not in the database: type it from the chart"


def imported_texts(texts: dict[str, Any], mapping: dict[str, Any],
                   missing: list[str]) -> tuple[dict[str, Any], dict[FormPath, str]]:
    """The form's texts with an import's airfield, reference point and runways, and a note for
    each value the database lacks (form path -> words), to show beside its field.

    An approach row is there to type into: the import brings none (the chart gives them)."""
    from briefer.tui.forms.spec import split_path, to_texts

    shown = to_texts(AIRFIELD_FORM, {k: v for k, v in mapping.items() if k in IMPORTED_KEYS})
    out = {**texts, **{k: shown[k] for k in IMPORTED_KEYS}}
    if not out.get("approaches"):
        out["approaches"] = [_new_approach([])]
    flags = {tuple(split_path(p)): MISSING_WORDS for p in missing}
    return out, flags
