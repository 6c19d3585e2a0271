"""Golden briefs: every demo case's JSON, to the last digit, is what it was when the file was taken.

A refactor or a speed change must leave every number of every demo brief unchanged. The golden
file holds, for each case (profile x airfield x approach x landing runway x weather), a short
digest of each top-level key of the brief's JSON (floats as Python writes them, i.e. to the last
digit), so a failure names the case and the keys that moved.

A change that is *meant* to change the brief (a corrected rule, a new field) regenerates the file
with ``BRIEFER_REGEN_GOLDEN=1 python -m pytest tests/test_golden_briefs.py`` and says so in its
commit message, after a reviewer has looked at the moved keys.
"""

from __future__ import annotations

import hashlib
import json
import os
from pathlib import Path

import pytest
from conftest import demo_landings, designator_heading_deg

from briefer.brief import build_brief
from briefer.commands._common import _jsonable
from briefer.model import BriefRequest, Weather
from briefer.render.brief_json import brief_to_dict

pytestmark = pytest.mark.slow   # a sweep or fuzz: `-m "not slow"` skips it in a quick run

GOLDEN = Path(__file__).parent / "golden" / "demo_briefs.json"
UTC = "2000-01-01 00:00Z"
FAIR = dict(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=6.0, ceiling_ft=4000.0)


def _weathers(landing_designator: str) -> dict[str, dict]:
    """Weathers relative to the landing runway (designator x 10 as its magnetic heading)."""
    hdg = designator_heading_deg(landing_designator)
    mag = dict(wind_reference="magnetic")
    return {
        "calm": dict(FAIR),
        "crosswind-left-25": dict(FAIR, wind_from_deg=(hdg - 90.0) % 360.0, wind_speed_kt=25.0, **mag),
        "crosswind-right-35": dict(FAIR, wind_from_deg=(hdg + 90.0) % 360.0, wind_speed_kt=35.0, **mag),
        "tailwind-15": dict(FAIR, wind_from_deg=(hdg + 180.0) % 360.0, wind_speed_kt=15.0, **mag),
        "gusty": dict(FAIR, wind_from_deg=(hdg + 40.0) % 360.0, wind_speed_kt=20.0, wind_gust_kt=38.0, **mag),
        "cold-low": dict(FAIR, oat_c=-35.0, altimeter_hpa=1035.0, visibility_sm=1.0, ceiling_ft=300.0),
        "hot-high": dict(FAIR, oat_c=45.0, altimeter_hpa=995.0, wind_from_deg=(hdg + 150.0) % 360.0,
                         wind_speed_kt=10.0, **mag),
    }


def demo_cases():
    """(label, request) for every built-in profile x airfield x approach x runway end x weather."""
    for label, prof, af, approach, des in demo_landings():
        for name, wx in _weathers(des).items():
            yield (f"{label}/{name}", BriefRequest(profile=prof, airfield=af, approach=approach, landing_runway=des,
                                                   weather=Weather(**wx)))


def digests(req: BriefRequest) -> dict[str, str]:
    d = _jsonable(brief_to_dict(build_brief(req, computed_utc=UTC)))
    return {k: hashlib.sha256(json.dumps(v, sort_keys=True, allow_nan=False).encode()).hexdigest()[:16]
            for k, v in sorted(d.items())}


def test_every_demo_brief_is_unchanged_to_the_last_digit():
    now = {label: digests(req) for label, req in demo_cases()}
    if os.environ.get("BRIEFER_REGEN_GOLDEN") == "1":
        GOLDEN.parent.mkdir(exist_ok=True)
        GOLDEN.write_text(json.dumps(now, indent=0, sort_keys=True) + "\n")
        pytest.skip("golden file regenerated")
    golden = json.loads(GOLDEN.read_text())
    assert sorted(now) == sorted(golden), "the set of demo cases changed"
    moved = {label: sorted(k for k in set(now[label]) | set(golden[label])
                           if now[label].get(k) != golden[label].get(k))
             for label in now}
    moved = {label: keys for label, keys in moved.items() if keys}
    assert not moved, f"{len(moved)} demo briefs moved; first: {list(moved.items())[:5]}"
