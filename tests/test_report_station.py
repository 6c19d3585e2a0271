"""A weather report from another station than the airfield is named, not accepted silently
(issue 11 item 13)."""

from __future__ import annotations

import json

from briefer.cli import main

OTHER = "METAR Q4LM 011850Z 24012G22KT 3SM BR OVC011 M02/M04 A2990"
SAME = "METAR V2RL 011850Z 24012G22KT 3SM BR OVC011 M02/M04 A2990"


def _warnings(capsys, metar):
    assert main(["brief", "--demo", "--metar", metar, "--json"]) == 0
    return {w["code"]: w for w in json.loads(capsys.readouterr().out)["warnings"]}


def test_report_from_another_station_is_a_finding_naming_both(capsys):
    w = _warnings(capsys, OTHER)
    f = w["report-other-station"]
    assert f["severity"] == "warning"
    assert "Q4LM" in f["text"] and "V2RL" in f["text"]


def test_report_from_the_airfield_itself_is_not(capsys):
    assert "report-other-station" not in _warnings(capsys, SAME)
