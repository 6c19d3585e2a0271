"""The instructor commands: `briefer practice-minimums` and `briefer scenario new|show|deck`.

Wiring only (the numbers are checked in test_minimums and test_scenarios): JSON keys, the
cautions and the practice notice in every output, files written atomically and reproducibly,
bad input as one line on stderr with exit code 2.
"""

from __future__ import annotations

import io
import json
from pathlib import Path

import pytest
from pypdf import PdfReader

from briefer.cautions import CAUTIONS, SHORT_CAUTION
from briefer.cli import main
from briefer.core.minimums import PRACTICE_NOTICE


def run_json(capsys, argv: list[str]) -> dict:
    code = main([*argv, "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    data = json.loads(out)
    assert data["cautions"] == list(CAUTIONS)
    return data


def run_text(capsys, argv: list[str]) -> str:
    code = main(argv)
    out, err = capsys.readouterr()
    assert code == 0, err
    return out


def run_error(capsys, argv: list[str]) -> str:
    """Run a failing command; return its single stderr line."""
    try:
        code = main(argv)
    except SystemExit as exc:      # argparse usage errors exit through parser.exit(2, ...)
        code = exc.code
    out, err = capsys.readouterr()
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err
    return lines[0]


# --- practice-minimums -----------------------------------------------------------------------------

CATEGORY_KEYS = {"category", "radius_nm", "radius_provenance", "mda_band", "steps", "controlling_obstacle",
                 "ignored_in_sectors", "obstacle_clearance_ft", "lowest_height_ft", "mda_unrounded_ft", "mda_ft",
                 "haa_ft", "controlled_by", "rounding_increment_ft", "visibility_sm", "visibility_m",
                 "from_memory", "iterations", "published_mda_ft"}


def test_practice_minimums_json(capsys):
    data = run_json(capsys, ["practice-minimums", "--airfield", "V2RL", "--approach", "NDB-B"])
    assert data["notice"] == PRACTICE_NOTICE and data["practice"] is True
    assert data["airfield_ident"] == "V2RL" and data["criteria"] == "terps-expanded" and data["approach"] == "NDB-B"
    assert [c["category"] for c in data["categories"]] == ["A", "B", "C", "D", "E"]
    c = data["categories"][2]
    assert CATEGORY_KEYS <= c.keys()
    # north-hill 1560 + 300 = 1860 ft (hand-derived in test_minimums)
    assert c["controlling_obstacle"]["name"] == "north-hill" and c["mda_ft"] == 1860
    assert "south-ridge" in c["ignored_in_sectors"]
    assert "lowest circling height" in data["from_memory"]


def test_practice_minimums_criteria_and_category(capsys):
    data = run_json(capsys, ["practice-minimums", "--airfield", "X4CD", "--criteria", "terps-legacy",
                             "--category", "b", "--category", "D"])
    assert data["criteria"] == "terps-legacy" and data["criteria_basis"] == "chosen"
    assert [c["category"] for c in data["categories"]] == ["B", "D"]


def test_practice_minimums_table_has_notice_and_caution(capsys):
    out = run_text(capsys, ["practice-minimums", "--airfield", "Q7HM"])
    assert out.count(PRACTICE_NOTICE) == 2 and SHORT_CAUTION.split(" - ")[0] in out
    assert "Controlling obstacle" in out and "tower" in out


def test_practice_minimums_plan(capsys, monkeypatch):
    monkeypatch.setenv("BRIEFER_ASCII", "1")
    out = run_text(capsys, ["practice-minimums", "--airfield", "V2RL", "--approach", "NDB-B", "--plan",
                            "--category", "C"])
    assert "Plan view" in out and "1560 C" in out       # the controlling obstacle, with its category
    assert "#" in out and "^" in out                     # runway and obstacles (ASCII canvas glyphs)
    assert PRACTICE_NOTICE in out


@pytest.mark.parametrize(("argv", "start"), [
    (["practice-minimums", "--airfield", "NOPE"], "briefer practice-minimums: error: no airfield named 'NOPE'"),
    (["practice-minimums", "--airfield", "V2RL", "--approach", "VOR-Z"],
     "briefer practice-minimums: error: airfield V2RL has no approach 'VOR-Z'"),
    (["practice-minimums", "--airfield", "V2RL", "--criteria", "pans-ops"], "briefer practice-minimums: error: argument"),
    (["practice-minimums"], "briefer practice-minimums: error: the following arguments are required: --airfield"),
])
def test_practice_minimums_errors(capsys, argv, start):
    assert run_error(capsys, argv).startswith(start)


# --- scenario new / show ---------------------------------------------------------------------------

NEW = ["scenario", "new", "--airfield", "V2RL", "--profile", "demo-bizjet", "--emphasis", "reciprocal",
       "--seed", "21"]


def test_scenario_new_json(capsys, tmp_path):
    out = tmp_path / "s.yaml"
    data = run_json(capsys, [*NEW, "--out", str(out)])
    assert data["seed"] == 21 and data["written_to"] == str(out) and out.is_file()
    assert data["scenario"]["kind"] == "scenario" and data["scenario"]["emphasis"] == "reciprocal"
    assert data["scenario"]["weather"]["report"].startswith("METAR V2RL ")
    assert data["checks"] and data["brief"]["schema"] == "briefer.brief/1"


def test_scenario_new_is_reproducible_and_prints_the_brief(capsys, tmp_path):
    a, b = tmp_path / "a.yaml", tmp_path / "b.yaml"
    text = run_text(capsys, [*NEW, "--out", str(a)])
    run_text(capsys, [*NEW, "--out", str(b)])
    assert a.read_bytes() == b.read_bytes()
    assert "scenario written to" in text and "seed 21" in text
    assert "PRACTICE SCENARIO" in text and "Brief the circle" in text and "CAUTIONS" in text
    assert "MINIMUMS AND AREA" in text                  # the brief (render/views.BriefView)


def test_scenario_new_without_out_prints_the_yaml(capsys):
    text = run_text(capsys, NEW)
    assert "kind: scenario" in text and "emphasis: reciprocal" in text


def test_scenario_new_refuses_to_overwrite(capsys, tmp_path):
    out = tmp_path / "s.yaml"
    out.write_text("keep me", encoding="utf-8")
    line = run_error(capsys, [*NEW, "--out", str(out)])
    assert line.startswith("briefer scenario: error: cannot write") and "already exists" in line
    assert out.read_text(encoding="utf-8") == "keep me"
    run_text(capsys, [*NEW, "--out", str(out), "--force"])
    assert "kind: scenario" in out.read_text(encoding="utf-8")


@pytest.mark.parametrize(("argv", "start"), [
    (["scenario", "new", "--airfield", "V2RL", "--profile", "demo-trainer", "--emphasis", "cold", "--seed", "1"],
     "briefer scenario: error: circling is not authorised for demo-trainer (category E) at V2RL"),
    (["scenario", "new", "--airfield", "V2RL", "--profile", "demo-bizjet", "--emphasis", "windy"],
     "briefer scenario new: error: argument --emphasis: invalid choice"),
    (["scenario", "new", "--airfield", "V2RL", "--profile", "demo-bizjet", "--seed", "-4"],
     "briefer scenario new: error: argument --seed: expected a whole number from 0 to 2^63-1, got -4"),
    (["scenario", "new", "--airfield", "V2RL", "--profile", "demo-bizjet", "--runway", "18"],
     "briefer scenario: error: airfield V2RL has no runway '18'"),
    (["scenario"], "briefer scenario: error: missing ACTION: new, show or deck"),
])
def test_scenario_errors(capsys, argv, start):
    assert run_error(capsys, argv).startswith(start)


def test_scenario_show(capsys, tmp_path):
    out = tmp_path / "s.yaml"
    run_text(capsys, [*NEW, "--out", str(out)])
    text = run_text(capsys, ["scenario", "show", str(out)])
    assert "PRACTICE SCENARIO" in text and "The brief (answer)" in text
    data = run_json(capsys, ["scenario", "show", str(out)])
    assert data["scenario"]["seed"] == 21
    broken = out.read_text(encoding="utf-8").replace("emphasis: reciprocal", "emphasis: recip")
    out.write_text(broken, encoding="utf-8")
    line = run_error(capsys, ["scenario", "show", str(out)])
    assert line.startswith(f"briefer scenario: error: {out}:") and "emphasis: expected" in line


# --- scenario deck ---------------------------------------------------------------------------------

DECK = ["scenario", "deck", "--count", "2", "--airfield", "V2RL", "--airfield", "Q7HM", "--profile", "demo-bizjet",
        "--emphasis", "cold", "--emphasis", "familiar-picture", "--seed", "99"]


def test_deck_is_byte_for_byte_reproducible(capsys, tmp_path):
    a, b = tmp_path / "a.pdf", tmp_path / "b.pdf"
    text = run_text(capsys, [*DECK, "--out", str(a)])
    run_text(capsys, [*DECK, "--out", str(b)])
    assert a.read_bytes() == b.read_bytes()
    assert "deck of 2 scenarios" in text and "seed 99" in text and "NOT FOR NAVIGATION" in text
    reader = PdfReader(io.BytesIO(a.read_bytes()))
    assert str(reader.metadata.get("/CreationDate", "")).startswith("D:2000")   # fixed date
    pages = [p.extract_text() for p in reader.pages]
    # per scenario: the student page, then the answer (the card: its front page and detail pages)
    kinds = ["student" if "STUDENT PAGE" in p else "answer" if "ANSWER" in p else "?" for p in pages]
    assert "?" not in kinds and kinds[0] == "student"
    starts = [i for i, k in enumerate(kinds) if k == "student"] + [len(pages)]
    assert len(starts) == 3                                        # two scenarios
    for n, (s0, s1) in enumerate(zip(starts, starts[1:]), 1):
        first_answer = kinds.index("answer", s0)
        student = " ".join(pages[s0:first_answer])
        answer = " ".join(pages[first_answer:s1])
        assert f"STUDENT PAGE {n}/2" in student and f"ANSWER {n}/2" in answer
        assert "METAR " in student and "BRIEF THE CIRCLE" in student and "CAUTIONS" in student
        assert "GRADING TOLERANCES" not in student and "THE PLAN" not in student
        assert "GRADING TOLERANCES" in answer and "THE SIGHT-PICTURE TRAP" in answer and "CAUTIONS" in answer
        assert "common practice" in answer and "MDA -0/+100" in answer


def test_deck_json_and_other_seed(capsys, tmp_path):
    a = tmp_path / "a.pdf"
    data = run_json(capsys, [*DECK[:-1], "100", "--out", str(a)])
    assert data["count"] == 2 and data["seed"] == 100 and len(data["scenarios"]) == 2
    assert {s["emphasis"] for s in data["scenarios"]} == {"cold", "familiar-picture"}


@pytest.mark.parametrize(("extra", "start"), [
    (["--out", "deck.txt"], "briefer scenario: error: cannot write deck.txt: a deck is a PDF"),
    (["--count", "0", "--out", "d.pdf"], "briefer scenario deck: error: argument --count: expected 1 to 50"),
])
def test_deck_errors(capsys, tmp_path, monkeypatch, extra, start):
    monkeypatch.chdir(tmp_path)
    argv = [a for a in DECK if a not in ("--count", "2")] if "--count" in extra else DECK
    assert run_error(capsys, [*argv, *extra]).startswith(start)
    assert not Path("deck.txt").exists() and not Path("d.pdf").exists()


def test_deck_refuses_to_overwrite(capsys, tmp_path):
    out = tmp_path / "d.pdf"
    out.write_bytes(b"old")
    assert "already exists" in run_error(capsys, [*DECK, "--out", str(out)])
    assert out.read_bytes() == b"old"
