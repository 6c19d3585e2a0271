"""Every word of every demo brief (issue 11): all built-in profiles x airfields x approaches x
landing runways x a grid of winds, through every finding, caution and label of the text brief,
the text card and the JSON, fails on:

* metres in a feet/NM brief (metres belong only to metre visibility minimums and reports);
* a negative duration or distance printed as such ("outbound -23 s", "-0.40 NM");
* "-0" (a value that rounds to zero has no sign);
* "n/r" followed by a unit ("n/r ft");
* "nan" or "inf" printed;
* a sum shown that does not add up ("163 kt IAS = 152 kt + 11 kt");
* a signed crosswind next to a side word ("-4 kt from the right").

Our own wording rules (no published source needed); the cases are the demo data.
"""

from __future__ import annotations

import io
import json
import re

import pytest
from rich.console import Console

from briefer.brief import build_brief
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.brief_json import brief_to_dict
from briefer.render.card import card_text
from briefer.render.views import BriefView

# relative to the landing runway's designator heading (magnetic): calm, and 8 directions at a
# moderate and a strong gusty wind
WINDS = [None] + [(rel, spd, gust) for rel in range(0, 360, 90) for spd, gust in ((12.0, None), (28.0, 40.0))] + [
    (45.0, 20.0, None), (225.0, 20.0, None)]

METRES = re.compile(r"(?<![\w.])\d[\d,.]* ?m\b(?!/)")
NEGATIVE = re.compile(r"(?<![\w/])-\d[\d.]*\s?(s|NM|ft|m|SM|kt|%)(?![\w/])")
MINUS_ZERO = re.compile(r"(?<![\w])[-\u2212]0(\.0+)?(?![\d.])")
NR_UNIT = re.compile(r"n/r\s?(ft|kt|NM|SM|m|s|%|°)")
NAN = re.compile(r"\b(nan|inf)\b", re.IGNORECASE)
SUM = re.compile(r"(\d+) kt IAS = (\d+) kt \+ (\d+) kt")
SIGNED_SIDE = re.compile(r"[-+]\d+ kt from the (left|right)")


def _cases():
    profiles = sorted(e.name for e in catalog.list_profiles(use_config=False) if e.builtin and e.error is None)
    airfields = sorted(e.name for e in catalog.list_airfields(use_config=False) if e.builtin and e.error is None)
    for a in airfields:
        af = catalog.find_airfield(a, use_config=False)
        for appr in af.approaches:
            for rw in af.runways:
                for des in (rw.threshold_a.designator, rw.threshold_b.designator):
                    yield a, af, appr.name, des, profiles


def _texts(b) -> dict[str, str]:
    c = Console(record=True, width=100, file=io.StringIO())
    c.print(BriefView(b))
    j = brief_to_dict(b)
    words = [f["text"] for f in j["warnings"]] + list(j["cautions"]) + [j["category_reason"], j["category_text"],
                                                                        j["plan"]["leave_mda"]] + j["plan"]["reasons"]
    words += [a["why_not"] for a in j["plan"]["alternatives"]]
    return {"text": " ".join(c.export_text().split()), "card": " ".join(card_text(b).split()),
            "json": " ".join(" | ".join(words).split())}


@pytest.mark.parametrize("airfield", sorted(e.name for e in catalog.list_airfields(use_config=False)
                                            if e.builtin and e.error is None))
def test_every_word_of_every_demo_brief(airfield):
    problems: list[str] = []
    n = 0
    for a, af, appr, des, profiles in _cases():
        if a != airfield:
            continue
        hdg = int(des.rstrip("LCR")) * 10.0
        for p in profiles:
            prof = catalog.find_profile(p, use_config=False)
            for wind in WINDS:
                wx = dict(oat_c=15.0, altimeter_hpa=1013.0, visibility_sm=3.0, ceiling_ft=2000.0)
                if wind is not None:
                    rel, spd, gust = wind
                    wx.update(wind_from_deg=(hdg + rel) % 360.0 or 360.0, wind_speed_kt=spd, wind_gust_kt=gust,
                              wind_reference="magnetic")
                b = build_brief(BriefRequest(profile=prof, airfield=af, approach=appr, landing_runway=des,
                                             weather=Weather(**wx)), computed_utc="2000-01-01 00:00Z")
                n += 1
                label = f"{p}/{a}/{appr}/{des}/{wind}"
                metric = b.minimums.visibility_in_metres
                for where, text in _texts(b).items():
                    checks = [("negative", NEGATIVE), ("-0", MINUS_ZERO), ("n/r unit", NR_UNIT), ("nan", NAN),
                              ("signed side", SIGNED_SIDE)]
                    if not metric:
                        checks.append(("metres", METRES))
                    for name, rx in checks:
                        m = rx.search(text)
                        if m:
                            problems.append(f"{label} [{where}] {name}: ...{text[max(0, m.start() - 60):m.end() + 20]}...")
                    for total, base, add in SUM.findall(text):
                        if int(total) != int(base) + int(add):
                            problems.append(f"{label} [{where}] sum: {total} != {base} + {add}")
    assert n > 0
    kinds = {}
    for pr in problems:
        kinds.setdefault(pr.split("] ", 1)[1].split(":", 1)[0], pr)
    assert not problems, f"{len(problems)} problems; one of each kind: " + "\n".join(kinds.values())
