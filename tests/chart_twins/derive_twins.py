"""Write the chart-form twins of the demo airfields (run by hand; the outputs are committed).

Each twin gives every position as an approach chart and an airport diagram would: runways by
magnetic heading (0.1 deg) and length (1 ft); a second runway's threshold at a distance and a
bearing from the first runway's threshold; the missed approach point at a threshold, a distance
before it on the final course, or at a distance and a bearing from a threshold; the final
approach fix by its distance to the missed approach point along the final course (0.1 NM);
obstacles by distance and bearing from the reference point (Qorvel Mesa) or the nearest
threshold. Distances the chart prints (final approach fix to missed approach point, missed
approach point before a threshold, an off-field facility 1 NM or more away) are in NM to 0.1 NM;
distances measured on the airport diagram or the plan view (runway positions, obstacles, a
facility under 1 NM away) in feet to 1 ft; bearings to 0.1 deg. The numbers are computed once from the demo files' latitude/longitude with
geographiclib's inverse geodesic (C. F. F. Karney, "Algorithms for geodesics," J. Geodesy 87,
2013), then rounded.

Qorvel Mesa keeps its reference point (the first runway is placed from it); the other two leave
it out and live in a local frame.

    python tests/chart_twins/derive_twins.py
"""

from __future__ import annotations

from pathlib import Path

from geographiclib.geodesic import Geodesic

from briefer import units
from briefer.io import catalog
from briefer.io.yamlload import dump_yaml, load_airfield
from briefer.model import Airfield

HERE = Path(__file__).parent
DEMO = Path(str(catalog.builtin_files("airfield")[0])).parent
GEOD = Geodesic.WGS84
KEEP_REFERENCE_POINT = {"Q7HM"}
ON_COURSE_M = 5.0            # a fix this close to the final course line through a threshold is on it
AT_THRESHOLD_M = 1.0


def inverse(p: object, q: object) -> tuple[float, float]:
    """(distance m, azimuth deg true at p) from p to q."""
    r = GEOD.Inverse(p.lat_deg, p.lon_deg, q.lat_deg, q.lon_deg)  # type: ignore[attr-defined]
    return r["s12"], r["azi1"] % 360.0


def distance(m: float, *, measured: bool = False) -> dict[str, float]:
    """A distance as the documents give it: measured on the airport diagram or the plan view
    (feet), or printed on the chart (NM to 0.1 from 1 NM up)."""
    nm = m * units.M_TO_NM
    if measured or nm < 1.0:
        return {"distance_ft": float(round(m * units.M_TO_FT))}
    return {"distance_nm": round(nm, 1)}


def magnetic(true_deg: float, var: float) -> float:
    return round((true_deg - var) % 360.0, 1) % 360.0


def placed(frm: str, p: object, q: object, var: float, *, measured: bool = False) -> dict[str, object]:
    d, az = inverse(p, q)
    return {"from_point": frm, **distance(d, measured=measured), "bearing_deg_mag": magnetic(az, var)}


def nearest(af: Airfield, q: object) -> object:
    return min(af.thresholds, key=lambda t: inverse(t, q)[0])


def twin(af: Airfield) -> dict[str, object]:
    var = af.magnetic_variation_deg
    data = af.to_mapping()
    keep_ref = af.ident in KEEP_REFERENCE_POINT
    if not keep_ref:
        del data["reference_point"]
    runways = []
    for i, rw in enumerate(af.runways):
        a, b = rw.threshold_a, rw.threshold_b
        length, heading = inverse(a, b)
        out: dict[str, object] = {
            "threshold_a": {k: v for k, v in a.to_mapping().items() if k not in ("lat_deg", "lon_deg")},
            "threshold_b": {k: v for k, v in b.to_mapping().items() if k not in ("lat_deg", "lon_deg")},
            "heading_deg_mag": magnetic(heading, var),
            "length_ft": float(round(length * units.M_TO_FT)),
        }
        if rw.width_m is not None:
            out["width_m"] = rw.width_m
        if i == 0 and keep_ref:
            out["position"] = {"threshold": a.designator, **placed("ARP", af.reference_point, a, var)}
        elif i > 0:
            first = af.runways[0].threshold_a
            out["position"] = {"threshold": a.designator, **placed(first.designator, first, a, var)}
        runways.append(out)
    data["runways"] = runways
    obstacles = []
    for ob in af.obstacles:
        m = {k: v for k, v in ob.to_mapping().items() if k not in ("lat_deg", "lon_deg")}
        elevation = {k: m.pop(k) for k in ("elevation_ft", "height_agl_ft") if k in m}
        if keep_ref:
            m.update(placed("ARP", af.reference_point, ob, var, measured=True))
        else:
            t = nearest(af, ob)
            m.update(placed(t.designator, t, ob, var, measured=True))
        m.update(elevation)
        obstacles.append(m)
    data["obstacles"] = obstacles
    approaches = []
    for ap, ap_map in zip(af.approaches, data["approaches"]):
        course_true = (ap.final_course_deg_mag + var) % 360.0
        fix = ap.map_fix
        t = nearest(af, fix)
        d, az = inverse(t, fix)
        if d < AT_THRESHOLD_M:
            map_fix = {"name": fix.name, "threshold": t.designator}
        else:
            on_course = [th for th in af.thresholds
                         if abs(((inverse(th, fix)[1] - (course_true + 180.0)) + 180.0) % 360.0 - 180.0)
                         * inverse(th, fix)[0] * 3.14159 / 180.0 < ON_COURSE_M]
            if on_course:
                th = min(on_course, key=lambda x: inverse(x, fix)[0])
                map_fix = {"name": fix.name, "threshold": th.designator,
                           "distance_nm": round(inverse(th, fix)[0] * units.M_TO_NM, 1)}
            else:
                map_fix = {"name": fix.name, **placed(t.designator, t, fix, var)}
        faf_d, _ = inverse(fix, ap.faf)
        ap_map["map_fix"] = map_fix
        ap_map["faf"] = {"name": ap.faf.name, "distance_nm": round(faf_d * units.M_TO_NM, 1),
                         "altitude_ft": ap.faf.altitude_ft}
        approaches.append(ap_map)
    data["approaches"] = approaches
    return data


HEADER = """\
# Chart-form twin of the demo airfield {name} ({file}), for tests: every position as an approach
# chart and an airport diagram give it (headings 0.1 deg magnetic, lengths 1 ft, charted distances
# 0.1 NM, distances measured on the diagram 1 ft, bearings 0.1 deg), computed once from the demo
# file's latitude/longitude by
# tests/chart_twins/derive_twins.py. {frame}
# Invented airfield: the name, identifier, fixes and procedures are fictional; not for navigation.
"""


def main() -> None:
    for path in sorted(DEMO.glob("*.yaml")):
        af = load_airfield(path)
        data = twin(af)
        Airfield.from_mapping(data)        # the twin must load
        frame = ("Keeps the reference point." if af.ident in KEEP_REFERENCE_POINT
                 else "No reference point: a local frame.")
        text = HEADER.format(name=af.name, file=path.name, frame=frame) + dump_yaml(data)
        (HERE / f"{path.stem}-chart.yaml").write_text(text)
        print(f"wrote {path.stem}-chart.yaml")


if __name__ == "__main__":
    main()
