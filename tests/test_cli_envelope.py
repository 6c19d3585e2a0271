"""`briefer envelope`: wiring of the command (the verdicts are the core's, see test_envelope).

Coarse grids (--direction-step-deg 30 or 90, --speed-step-kt 10 or 20) keep these tests quick;
the default grid is 36 x 41.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose

from briefer.brief import build_brief, demo_request, envelope_for, situation
from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.core.manoeuvre.envelope import DOES_NOT_FIT, REASON_AREA, REASON_BANK, REASON_VISIBILITY, REASON_WIND

COARSE = ["--direction-step-deg", "30", "--speed-step-kt", "10"]


def run_text(capsys, argv: list[str]) -> str:
    code = main(argv)
    out, err = capsys.readouterr()
    assert code == 0, err
    assert err == ""
    return out


def run_json(capsys, argv: list[str]) -> dict:
    return json.loads(run_text(capsys, [*argv, "--json"]))


def run_error(capsys, argv: list[str]) -> str:
    try:
        code = main(argv)
    except SystemExit as exc:
        code = exc.code
    out, err = capsys.readouterr()
    assert code == 2 and out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err
    return lines[0]


@pytest.fixture(scope="module")
def demo_json():
    """The demo's coarse envelope as JSON (computed once)."""
    import contextlib
    import io

    buf = io.StringIO()
    with contextlib.redirect_stdout(buf):
        assert main(["envelope", "--demo", *COARSE, "--json"]) == 0
    return json.loads(buf.getvalue())


# --- JSON ------------------------------------------------------------------------------------------
def test_json_axes_and_grid(demo_json):
    d = demo_json
    assert d["schema"] == "briefer.envelope/1"
    assert d["wind_from_relative_deg"] == [30.0 * i for i in range(12)]
    assert d["wind_speed_kt"] == [0.0, 10.0, 20.0, 30.0, 40.0]
    assert np.asarray(d["status"]).shape == (12, 5) == np.asarray(d["reasons"]).shape
    assert set(np.unique(d["status"])) <= {0, 1, 2}
    assert d["status_names"] == {"0": "does not fit", "1": "marginal", "2": "fits"}
    assert d["reason_bits"] == {"bank": REASON_BANK, "area": REASON_AREA, "sector": 16,
                                "visibility": REASON_VISIBILITY, "stall": 32, "wind": REASON_WIND, "limit": 64}
    assert d["cautions"] == list(CAUTIONS)


def test_json_true_directions_are_relative_plus_the_runway_course(demo_json):
    d = demo_json
    course = situation(demo_request()).runway.landing_course_deg_true
    assert d["runway_course_deg_true"] == course
    assert_allclose(d["wind_from_deg_true"], (np.asarray(d["wind_from_relative_deg"]) + course) % 360.0, atol=1e-9)


def test_json_is_the_envelope_of_the_situation(demo_json):
    """Wiring: the command passes the situation and the grid to envelope_for, nothing else."""
    env = envelope_for(demo_request(), wind_from_relative_deg=np.arange(0.0, 360.0, 30.0),
                       wind_speed_kt=np.arange(0.0, 41.0, 10.0))
    assert demo_json["status"] == env.status.tolist()
    assert demo_json["reasons"] == env.reasons.tolist()
    assert demo_json["bank_deg"] == env.bank_deg and demo_json["bank_limit_deg"] == env.bank_limit_deg
    assert demo_json["area_radius_m"] == env.area_radius_m
    assert [c["shape"] for c in demo_json["candidates"]] == [shape for shape, _ in env.candidates]
    nofit = np.asarray(demo_json["status"]) == DOES_NOT_FIT
    bank = np.asarray(demo_json["bank_needed_deg"], dtype=object)
    assert all(v is None for v in bank[nofit])           # NaN -> null


def test_json_header(demo_json):
    d = demo_json
    assert (d["airfield"], d["approach"], d["landing_runway"], d["profile"]) == (
        "V2RL", "RNAV (GPS) RWY 09", "27", "demo-bizjet")
    assert d["today"] == {"wind_from_deg_true": 240.0, "wind_speed_kt": 10.0}   # demo_request weather
    assert d["visibility_reported"] is True and d["category"] == "D"


def test_json_without_reported_wind_or_visibility(capsys):
    d = run_json(capsys, ["envelope", "--profile", "demo-twin", "--airfield", "Q7HM", "--approach", "VOR-A",
                          "--runway", "13", "--direction-step-deg", "90", "--speed-step-kt", "20"])
    assert d["today"] is None and d["visibility_reported"] is False
    assert d["wind_speed_kt"] == [0.0, 20.0, 40.0]


def test_grid_options(capsys):
    d = run_json(capsys, ["envelope", "--demo", "--direction-step-deg", "90", "--max-wind-kt", "25",
                          "--speed-step-kt", "10"])
    assert d["wind_from_relative_deg"] == [0.0, 90.0, 180.0, 270.0]
    assert d["wind_speed_kt"] == [0.0, 10.0, 20.0, 25.0]    # the last step stops at the maximum


# --- text ------------------------------------------------------------------------------------------
def test_text_has_table_picture_legend_and_caution(capsys):
    out = run_text(capsys, ["envelope", "--demo", *COARSE])
    assert "V2RL" in out and "circle to land 27" in out
    assert "wind from" in out and "000 head" in out            # the table
    assert "ring every 10 kt" in out and "landing direction" in out   # the picture's legend
    assert "B bank" in out and "NOT FOR NAVIGATION" in out


def test_ascii_text_is_plain_ascii(capsys):
    out = run_text(capsys, ["envelope", "--demo", *COARSE, "--ascii"])
    assert out.isascii()
    assert "X today's wind" in out


def test_true_directions(capsys):
    out = run_text(capsys, ["envelope", "--demo", *COARSE, "--directions", "true", "--view", "picture"])
    lines = [x.strip() for x in out.splitlines()]
    assert "N" in lines and "S" in lines and "Up = true north." in lines
    assert "wind from" not in out                             # no table


def test_table_only(capsys):
    out = run_text(capsys, ["envelope", "--demo", *COARSE, "--view", "table"])
    assert "wind from" in out and "ring every" not in out


# --- errors ----------------------------------------------------------------------------------------
@pytest.mark.parametrize(("argv", "words"), [
    pytest.param(["--direction-step-deg", "7"], "must divide 360", id="step-not-dividing"),
    pytest.param(["--direction-step-deg", "0"], "--direction-step-deg: expected 1 to 90 deg", id="step-zero"),
    pytest.param(["--max-wind-kt", "0"], "--max-wind-kt", id="max-wind-zero"),
    pytest.param(["--max-wind-kt", "200"], "--max-wind-kt", id="max-wind-too-fast"),
    pytest.param(["--speed-step-kt", "-1"], "--speed-step-kt", id="negative-step"),
    pytest.param(["--band-kt", "0"], "--band-kt", id="band-zero"),
    pytest.param(["--radius-rows", "1"], "--radius-rows", id="tiny-picture"),
    pytest.param(["--airfield", "NOPE"], "no airfield named", id="unknown-airfield"),
    pytest.param(["--wind", "abc"], "cannot read the wind", id="bad-wind"),
])
def test_bad_inputs_are_one_line_exit_2(capsys, argv, words):
    line = run_error(capsys, ["envelope", "--demo", *argv])
    assert line.startswith("briefer envelope: error:") and words in line


# --- envelope and brief agree ----------------------------------------------------------------------
def test_envelope_agrees_with_the_brief_at_todays_wind():
    """The crew must not get two answers: where the brief flies a plan (the demo wind, 3 SM), the
    envelope's cell for that wind is not 'does not fit'."""
    req = demo_request(wind_gust_kt=None)
    b = build_brief(req, computed_utc="2000-01-01 00:00Z")
    assert b.plan.feasible and b.plan.inside_area
    course = situation(req).runway.landing_course_deg_true
    rel = (240.0 - course) % 360.0
    env = envelope_for(req, wind_from_relative_deg=[rel], wind_speed_kt=[10.0])
    assert env.status[0, 0] != DOES_NOT_FIT
