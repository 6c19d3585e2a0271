"""A familiar-picture trap beyond the stall is a DANGER that says the wing stalls (issue 11
item 11), never a negative "stall margin" in a warning.

The stall speed in a level turn is VS1G sqrt(n) with n = 1 / cos(bank) (FAA Airplane Flying
Handbook FAA-H-8083-3, "Load factor and stall speed"): when it exceeds the IAS flown, the margin
(IAS - VS) / VS is negative and the wing stalls before the bank is reached. The demo trainer at
the mesa (Q7HM RNAV 31, circle to 13, calm) needs about 68 deg for its usual picture at circling
height, where its stall speed is above its circling speed.
"""

from __future__ import annotations

import io
import re

from rich.console import Console

from briefer.brief import build_brief
from briefer.io import catalog
from briefer.model import BriefRequest, Weather
from briefer.render.card import card_text
from briefer.render.views import BriefView


def _brief():
    return build_brief(BriefRequest(profile=catalog.find_profile("demo-trainer"), airfield=catalog.find_airfield("Q7HM"),
                                    approach="RNAV (GPS) RWY 31", landing_runway="13",
                                    weather=Weather(wind_speed_kt=0.0, oat_c=15.0, altimeter_hpa=1013.0,
                                                    visibility_sm=6.0, ceiling_ft=4000.0)), computed_utc="x")


def test_trap_beyond_the_stall_is_a_danger_that_says_the_wing_stalls():
    b = _brief()
    s = b.sight_picture
    assert s.familiar_stall_margin_pct < 0          # the premise (hand check in the docstring)
    f = next(f for f in b.findings if f.code == "familiar-picture")
    assert f.severity == "danger" and "the wing stalls" in f.text
    c = Console(record=True, width=200, file=io.StringIO())
    c.print(BriefView(b))
    outputs = {"text": c.export_text(), "card": card_text(b)}
    from briefer.tui.views import sight_comparison

    c2 = Console(record=True, width=120, file=io.StringIO())
    c2.print(sight_comparison(b))
    outputs["app"] = c2.export_text()
    from briefer.instructor.deck import trap_lines

    outputs["deck"] = "\n".join(trap_lines(b))
    for name, text in outputs.items():
        flat = " ".join(text.split())
        assert not re.search(r"stall margin -\d", flat), name
        assert not re.search(r"-\d+ %", flat), name
        assert re.search(r"wing stalls|WING STALLS|STALLS", flat), name
