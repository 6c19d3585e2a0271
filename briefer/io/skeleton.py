"""Starting points for data files typed by hand: the commented airfield skeleton in chart form
(what `briefer new-airfield` prints) and complete, valid examples of each file kind (which the
draft checks use to stand in for keys a form has not reached yet)."""

from __future__ import annotations

import copy
from typing import Any

from briefer.model import KIND_AIRFIELD, KIND_PROFILE

AIRFIELD_SKELETON = """\
# A new airfield, typed from the approach chart and the airport diagram (no coordinates needed).
# Fill every empty value: the comment says what goes there and where the documents print it.
# Then run:  briefer check THIS-FILE.yaml   (it names the line and the field of any mistake)
# Units are in the key names: _ft feet, _m metres, _nm nautical miles, _deg_mag degrees magnetic.
# Where a key has a twin in another unit (length_ft or length_m, distance_nm, distance_ft or
# distance_m, heading/bearing _deg_mag or _deg_true, elevation_ft or tdze_ft) give one of them.
# Invent nothing: the published procedure, the flight manual and local rules govern.
kind: airfield
format_version: 1
ident:                       # identifier, 2 to 8 letters or digits
name:                        # airfield name
elevation_ft:                # field elevation (airport diagram)
magnetic_variation_deg:      # variation as printed, east positive: 9 for 9 E, -8.5 for 8.5 W
# reference_point: {lat_deg: , lon_deg: }   # optional; without it the airfield lives in a local
#                              frame measured from the first runway's threshold_a
runways:
  - threshold_a:
      designator:            # the runway end you list first, e.g. '13' (in quotes)
      elevation_ft:          # its threshold elevation (or tdze_ft: the touchdown zone elevation)
      # displaced_threshold_m:   # only if the landing threshold is displaced from the runway end
    threshold_b:
      designator:            # the other end, e.g. '31'
      elevation_ft:
    heading_deg_mag:         # runway heading from threshold_a toward threshold_b, e.g. 131.9
    length_ft:               # runway length as printed, end to end (or length_m:)
    width_m:                 # optional
  # A second runway: the same keys, then where it lies, either one threshold from a threshold
  # of a runway above (or from ARP, the reference point):
  #   position: {threshold: '18', from_point: '13', distance_ft: 2941, bearing_deg_mag: 222.5}
  # or where the two centrelines cross, measured from one threshold of each runway:
  #   crossing:
  #     - {threshold: '13', distance_ft: 2100}
  #     - {threshold: '18', distance_ft: 800}
obstacles:                   # delete this list if the chart shows none
  - name:                    # e.g. tower
    kind: other              # tower, mast, building, chimney, wind-turbine, terrain, trees, power-line, other
    from_point:              # the threshold you measure from, e.g. '13' (or ARP)
    distance_nm:             # measured on the chart (or distance_ft:)
    bearing_deg_mag:         # from that threshold to the obstacle
    elevation_ft:            # top of the obstacle, above sea level, as printed
approaches:
  - name:                    # as the chart names it, e.g. VOR-A
    runway:                  # the runway the final course serves, e.g. '31'; leave empty for circling only
    final_course_deg_mag:    # final approach course (plan view)
    criteria:                # terps-legacy, terps-expanded or icao (what the minimums were built to)
    faf:
      name:                  # final approach fix
      distance_nm:           # from the FAF to the MAP along the final course (profile view)
      altitude_ft:           # FAF crossing altitude (profile view)
    map_fix:
      name:                  # missed approach point
      threshold:             # the MAP at this threshold, e.g. '31' (add distance_nm: if it is before it)
      # or at a facility off the runway: from_point: '13', distance_nm: 0.6, bearing_deg_mag: 126
    circling:                # the minimums box, per category: MDA and visibility, or not authorised
      A: {mda_ft: , visibility_sm: }
      B: {mda_ft: , visibility_sm: }
      C: {mda_ft: , visibility_sm: }
      D: {mda_ft: , visibility_sm: }
      # E: {not_authorised: true, reason: as printed}   (visibility_m: for metres)
    # straight_in:             # if straight-in minimums are published for the runway
    #   runway: '31'
    #   minimums:
    #     A: {mda_ft: , visibility_sm: }
    # not_authorised_sectors:  # circling NA notes, e.g. "NA south of runway 09/27"
    #   - {runway: 09/27, side: south, reason: as printed}
    #   - {threshold: '15', from_deg_mag: 40, to_deg_mag: 110, reason: as printed}
    missed_approach:         # the missed-approach text as printed
"""

_AIRFIELD_EXAMPLE: dict[str, Any] = {
    "kind": KIND_AIRFIELD,
    "format_version": 1,
    "ident": "Z9EX",
    "name": "Example Field (invented)",
    "elevation_ft": 1200,
    "magnetic_variation_deg": 4.0,
    "runways": [
        {"threshold_a": {"designator": "09", "elevation_ft": 1195},
         "threshold_b": {"designator": "27", "elevation_ft": 1200},
         "heading_deg_mag": 86.0, "length_ft": 7000, "width_m": 45},
        {"threshold_a": {"designator": "18", "elevation_ft": 1190},
         "threshold_b": {"designator": "36", "elevation_ft": 1180},
         "heading_deg_mag": 176.0, "length_ft": 5000,
         "crossing": [{"threshold": "09", "distance_ft": 3000}, {"threshold": "18", "distance_ft": 2000}]},
        {"threshold_a": {"designator": "04", "elevation_ft": 1185},
         "threshold_b": {"designator": "22", "elevation_ft": 1190},
         "heading_deg_mag": 40.0, "length_ft": 4000,
         "position": {"threshold": "04", "from_point": "27", "distance_ft": 1500, "bearing_deg_mag": 200.0}},
    ],
    "obstacles": [
        {"name": "mast", "kind": "mast", "from_point": "27", "distance_nm": 1.5, "bearing_deg_mag": 45.0,
         "elevation_ft": 1750, "height_agl_ft": 550},
    ],
    "approaches": [
        {"name": "VOR RWY 27", "runway": "27", "final_course_deg_mag": 266.0, "criteria": "terps-expanded",
         "faf": {"name": "EXFAF", "distance_nm": 5.0, "altitude_ft": 2800},
         "map_fix": {"name": "EXMAP", "threshold": "27", "distance_nm": 0.5},
         "straight_in": {"runway": "27", "minimums": {"A": {"mda_ft": 1600, "visibility_sm": 1}}},
         "circling": {"A": {"mda_ft": 1700, "visibility_sm": 1}, "B": {"mda_ft": 1700, "visibility_sm": 1.25},
                      "C": {"mda_ft": 1800, "visibility_sm": 2}, "D": {"mda_ft": 1800, "visibility_sm": 2.25},
                      "E": {"not_authorised": True, "reason": "not published"}},
         "not_authorised_sectors": [{"runway": "09/27", "side": "north", "reason": "mast"}],
         "missed_approach": "Climb to 3000 on the 266 course and hold."},
        {"name": "NDB-A", "final_course_deg_mag": 20.0, "criteria": "terps-expanded",
         "faf": {"name": "EXNDF", "distance_nm": 4.0, "altitude_ft": 2600},
         "map_fix": {"name": "EX NDB", "from_point": "09", "distance_ft": 2500, "bearing_deg_mag": 120.0},
         "circling": {"A": {"mda_ft": 1800, "visibility_sm": 1}},
         "missed_approach": "Climb to 3000 direct EX NDB and hold."},
    ],
}


def filled_example(kind: str) -> dict[str, Any]:
    """A complete, valid document of the kind (a fresh copy): an invented chart-form airfield, or
    the first built-in aircraft profile."""
    if kind == KIND_AIRFIELD:
        return copy.deepcopy(_AIRFIELD_EXAMPLE)
    if kind == KIND_PROFILE:
        from briefer.io.catalog import builtin_files
        from briefer.io.yamlload import parse_yaml_mapping

        first = sorted(builtin_files(KIND_PROFILE), key=lambda t: t.name)[0]
        return parse_yaml_mapping(first.read_bytes(), first.name).data
    raise ValueError(f"unknown kind {kind!r}")
