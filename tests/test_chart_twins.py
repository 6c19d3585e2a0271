"""Acceptance: the demo airfields written in chart form give the same brief as their lat/lon form.

The twins in tests/chart_twins/ give every position as the documents do (runway headings to
0.1 deg magnetic, lengths to 1 ft, the final approach fix by its charted distance to the missed
approach point to 0.1 NM, positions measured on the airport diagram in feet, bearings to
0.1 deg), computed once from the demo files' latitude/longitude with geographiclib
(tests/chart_twins/derive_twins.py). Two of them have no reference point and live in a local
frame. For every demo profile, approach and landing runway (calm and a 20 kt wind 70 deg off the
runway), every number of the brief's JSON agrees within the tolerances of the chart-entry issue:
0.01 NM for distances, 1 s for times, 1 deg for angles, 10 ft for heights; positions within
0.01 NM (after moving the local frame's origin onto the lat/lon frame's point for the same
threshold); other numbers within 1 %. Texts agree with their numbers masked; choices (category,
shape, side, feasibility) agree exactly.

One allowance, stated: where the lat/lon brief itself finds two plans equally good (its first
alternative is feasible and its area margin is within 0.01 NM of the chosen plan's, i.e. the
ranking separates them by metres, or the brief says "either may be flown"), the chart form may
choose the other one; the test then checks that the twin chose one of the tied plans and
compares everything but the plan, the sight picture and the missed-approach turn, which follow
the plan.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from briefer.brief import build_brief
from briefer.commands._common import _jsonable
from briefer.io import catalog
from briefer.io.yamlload import load_airfield
from briefer.model import BriefRequest, Weather
from briefer.render.brief_json import brief_to_dict
from briefer.units import NM_TO_M

DEMO = Path(str(catalog.builtin_files("airfield")[0])).parent     # the demo airfields, wherever they live
TWINS = Path(__file__).parent / "chart_twins"
TOLERANCES = (("_nm", 0.01), ("_s", 1.0), ("_deg", 1.0), ("_deg_mag", 1.0), ("_deg_true", 1.0), ("_ft", 10.0))
POSITION_TOL_M = 0.01 * NM_TO_M
NUMBER = re.compile(r"-?\d+(\.\d+)?")


def _tolerance(key: str, value: float) -> float:
    for suffix, tol in TOLERANCES:
        if key.endswith(suffix):
            return tol
    return max(1e-6, 0.01 * abs(value))      # other numbers (kt, %, load factor): 1 %


def _is_point(v: Any) -> bool:
    return (isinstance(v, list) and len(v) == 2 and all(isinstance(x, (int, float)) and not isinstance(x, bool)
                                                        for x in v))


def _compare(a: Any, b: Any, path: str, offset: np.ndarray, out: list[str]) -> None:
    """Differences beyond tolerance between the lat/lon brief `a` and the twin's `b`."""
    key = re.sub(r"\[\d+\]$", "", path.rsplit(".", 1)[-1])
    if isinstance(a, dict):
        if not isinstance(b, dict) or set(a) != set(b):
            out.append(f"{path}: keys differ")
            return
        for k in a:
            _compare(a[k], b[k], f"{path}.{k}", offset, out)
    elif _is_point(a):
        d = math.hypot(a[0] - b[0] - offset[0], a[1] - b[1] - offset[1])
        if d > POSITION_TOL_M:
            out.append(f"{path}: {d:.1f} m apart")
    elif isinstance(a, list) and a and all(_is_point(p) for p in a) and len(a) > 2:
        _compare_polyline(np.asarray(a, dtype=float), np.asarray(b, dtype=float) + offset, path, out)
    elif isinstance(a, list):
        if not isinstance(b, list) or len(a) != len(b):
            out.append(f"{path}: {len(a)} items against {len(b) if isinstance(b, list) else b!r}")
            return
        for i, (x, y) in enumerate(zip(a, b)):
            _compare(x, y, f"{path}[{i}]", offset, out)
    elif isinstance(a, str) and isinstance(b, str):
        if NUMBER.sub("#", a) != NUMBER.sub("#", b):
            out.append(f"{path}: {a!r} against {b!r}")
    elif isinstance(a, bool) or a is None or isinstance(a, str):
        if a != b:
            out.append(f"{path}: {a!r} against {b!r}")
    elif isinstance(b, bool) or not isinstance(b, (int, float)):
        out.append(f"{path}: {a!r} against {b!r}")
    elif abs(a - b) > _tolerance(key, a):
        out.append(f"{path}: {a!r} against {b!r}")


def _compare_polyline(a: np.ndarray, b: np.ndarray, path: str, out: list[str]) -> None:
    """Two drawn lines (tracks, area outlines) within the position tolerance of each other: every
    vertex of each is that close to the other line (their point counts may differ by a few)."""
    def farthest(p: np.ndarray, q: np.ndarray) -> float:
        seg_a, seg_b = q[:-1], q[1:]
        d = seg_b - seg_a
        L2 = np.maximum((d * d).sum(axis=1), 1e-12)
        t = np.clip(((p[:, None, :] - seg_a[None]) * d[None]).sum(axis=2) / L2, 0.0, 1.0)
        proj = seg_a[None] + t[..., None] * d[None]
        return float(np.max(np.min(np.hypot(*(p[:, None, :] - proj).transpose(2, 0, 1)), axis=1)))
    worst = max(farthest(a, b), farthest(b, a))
    if worst > POSITION_TOL_M:
        out.append(f"{path}: lines {worst:.1f} m apart")


def _tie(plan: dict[str, Any]) -> bool:
    """The lat/lon brief's own plan choice is a tie (see the module docstring)."""
    alts = plan.get("alternatives") or []
    if not alts or not plan.get("feasible"):
        return False
    first = alts[0]
    if "either may be flown" in (first.get("why_not") or ""):
        return True
    m0, m1 = plan.get("area_margin_nm"), first.get("area_margin_nm")
    return bool(first.get("feasible")) and m0 is not None and m1 is not None and abs(m0 - m1) <= 0.01


def _alternatives(d: dict[str, Any]) -> dict[tuple[str, str], dict[str, Any]]:
    return {(a["shape"], a["side"]): a for a in d["plan"]["alternatives"]}


def _cases() -> list[Any]:
    profiles = sorted(e.name for e in catalog.list_profiles(use_config=False) if e.builtin and e.error is None)
    out = []
    for path in sorted(DEMO.glob("*.yaml")):
        af = load_airfield(path)
        for ap in af.approaches:
            for rw in af.runways:
                for des in (rw.threshold_a.designator, rw.threshold_b.designator):
                    for p in profiles:
                        out.append(pytest.param(path.stem, p, ap.name, des, id=f"{af.ident}/{ap.name}/{des}/{p}"))
    return out


WEATHERS = {"calm": {}, "wind": {"wind_speed_kt": 20.0, "wind_reference": "magnetic"}}


def _brief(profile: Any, airfield: Any, approach: str, runway: str, weather: Weather) -> dict[str, Any]:
    req = BriefRequest(profile=profile, airfield=airfield, approach=approach, landing_runway=runway, weather=weather)
    return _jsonable(brief_to_dict(build_brief(req, computed_utc="2000-01-01 00:00Z")))


@pytest.mark.parametrize(("stem", "profile", "approach", "runway"), _cases())
def test_chart_twin_gives_the_same_brief(stem: str, profile: str, approach: str, runway: str) -> None:
    latlon = load_airfield(DEMO / f"{stem}.yaml")
    twin = load_airfield(TWINS / f"{stem}-chart.yaml")
    prof = catalog.find_profile(profile, use_config=False)
    first = latlon.runways[0].threshold_a.designator
    offset = np.subtract(latlon.layout.thresholds_m[first], twin.layout.thresholds_m[first])
    for name, wx in WEATHERS.items():
        if "wind_speed_kt" in wx:
            wx = dict(wx, wind_from_deg=(int(runway[:2]) * 10.0 + 70.0) % 360.0)
        weather = Weather(**wx)
        a = _brief(prof, latlon, approach, runway, weather)
        b = _brief(prof, twin, approach, runway, weather)
        local = [w for w in b["warnings"] if w["code"] == "local-frame"]
        assert len(local) == (0 if twin.reference_point is not None else 1)
        b["warnings"] = [w for w in b["warnings"] if w["code"] != "local-frame"]
        diffs: list[str] = []
        if _tie(a["plan"]) and (a["plan"]["shape"], a["plan"]["side"]) != (b["plan"]["shape"], b["plan"]["side"]):
            tied = {(a["plan"]["shape"], a["plan"]["side"]), (a["plan"]["alternatives"][0]["shape"],
                                                             a["plan"]["alternatives"][0]["side"])}
            assert (b["plan"]["shape"], b["plan"]["side"]) in tied, name
            for k in ("plan", "missed_approach", "sight_picture"):
                a.pop(k), b.pop(k)
        else:
            alt_a, alt_b = _alternatives(a), _alternatives(b)
            if set(alt_a) != set(alt_b):
                diffs.append(f"plan.alternatives: {sorted(alt_a)} against {sorted(alt_b)}")
            for k in alt_a.keys() & alt_b.keys():
                x, y = alt_a[k], alt_b[k]
                if x["feasible"] != y["feasible"]:
                    diffs.append(f"plan.alternatives {k}: feasible {x['feasible']} against {y['feasible']}")
                elif x["area_margin_nm"] is not None and y["area_margin_nm"] is not None \
                        and abs(x["area_margin_nm"] - y["area_margin_nm"]) > 0.01:
                    diffs.append(f"plan.alternatives {k}: area margin {x['area_margin_nm']} against "
                                 f"{y['area_margin_nm']}")
            a["plan"].pop("alternatives"), b["plan"].pop("alternatives")
        for k in ("computed_utc",):
            a.pop(k, None), b.pop(k, None)
        _compare(a, b, "", offset, diffs)
        assert diffs == [], f"{name}: " + "; ".join(diffs[:8])
