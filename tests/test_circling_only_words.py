"""The words for a circling-only procedure say "circling only" once: the renderers put the reason
after the label "Circling only", and the finding reads "Circling only: <reason>." (a wording slip
found reading an imported airfield's brief in the app: "Circling only: the procedure serves no
runway (circling only).")."""

from __future__ import annotations

import re

import yaml

from briefer.brief import build_brief
from briefer.io import catalog
from briefer.model import Airfield, BriefRequest, Weather

FAIR = dict(wind_from_deg=0.0, wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.25, visibility_sm=10.0,
            ceiling_ft=5000.0)


def test_a_procedure_that_serves_no_runway_says_circling_only_once():
    # The demo's lettered VOR-A, its final course turned onto runway 31 so that the only reason
    # left for circling only is that the procedure names no runway.
    path = next(p for p in catalog.builtin_files("airfield") if "q7hm" in p.name)
    mapping = yaml.safe_load(path.read_text())
    for appr in mapping["approaches"]:
        if appr["name"] == "VOR-A":
            appr["final_course_deg_mag"] = 312
    req = BriefRequest(profile=catalog.find_profile("demo-twin", use_config=False),
                       airfield=Airfield.from_mapping(mapping), approach="VOR-A", landing_runway="31",
                       weather=Weather(**FAIR))
    brief = build_brief(req, computed_utc="2000-01-01 00:00Z")
    reasons = [r.text for r in brief.minimums.circling_only_reasons]
    assert [r.code for r in brief.minimums.circling_only_reasons] == ["no-runway"]
    for text in reasons + [f.text for f in brief.findings]:
        assert len(re.findall(r"circling[ -]only", text, re.I)) <= 1, text
