"""`briefer list`: what the catalog finds, where, and why a file is broken.

The user's config file is isolated (XDG_CONFIG_HOME points at an empty temporary folder) so that
only the folders a test gives and the built-in demo data are seen.
"""

from __future__ import annotations

import json
import shutil

import pytest
from cli_helpers import run_error

from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.io import catalog

DEMO_PROFILES = {"demo-bizjet", "demo-trainer", "demo-twin"}
DEMO_AIRFIELDS = {"V2RL", "Q7HM", "X4CD"}


@pytest.fixture(autouse=True)
def no_user_config(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


def run_json(capsys, argv: list[str]) -> dict:
    code = main(["list", *argv, "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    assert err == ""
    data = json.loads(out)
    assert data["cautions"] == list(CAUTIONS)
    return data


def demo_file(kind_folder: str, name: str):
    kind = {"profiles": "aircraft-profile", "airfields_demo": "airfield"}[kind_folder]
    return catalog.builtin_folder(kind) / name


def test_lists_the_demo_data(capsys):
    d = run_json(capsys, [])
    assert {p["name"] for p in d["profiles"]} == DEMO_PROFILES
    assert {a["ident"] for a in d["airfields"]} == DEMO_AIRFIELDS
    for row in d["profiles"] + d["airfields"]:
        assert row["builtin"] is True and row["error"] is None and row["shadowed_by"] is None
        assert row["file"].endswith(".yaml")


def test_airfield_rows_carry_name_runways_and_approaches(capsys):
    """Values from the demo file v2rl-ellisvane-valley.yaml."""
    d = run_json(capsys, ["--airfields"])
    v2rl = next(a for a in d["airfields"] if a["ident"] == "V2RL")
    assert v2rl["name"] == "Ellisvane Valley"
    assert v2rl["elevation_ft"] == 1120
    assert v2rl["runways"] == ["09/27"]
    assert v2rl["approaches"] == ["RNAV (GPS) RWY 09", "NDB-B"]
    assert v2rl["file"].endswith("v2rl-ellisvane-valley.yaml")


def test_profile_rows_carry_description_and_configurations(capsys):
    """Values from the demo file demo-bizjet.yaml."""
    d = run_json(capsys, ["--profiles"])
    assert "airfields" not in d
    bizjet = next(p for p in d["profiles"] if p["name"] == "demo-bizjet")
    assert bizjet["configurations"] == ["flaps-20", "flaps-35"]
    assert bizjet["default_configuration"] == "flaps-20"
    assert bizjet["description"].startswith("Invented")


def test_airfields_only(capsys):
    assert "profiles" not in run_json(capsys, ["--airfields"])


def test_profiles_and_airfields_together_is_a_usage_error(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["list", "--profiles", "--airfields"])
    assert exc.value.code == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "not allowed with" in err[0]


def test_broken_file_is_listed_with_its_error(capsys, tmp_path):
    (tmp_path / "broken.yaml").write_text("kind: airfield\nformat_version: 1\nident: ZZZZ\nnmae: x\n")
    d = run_json(capsys, ["--airfields", "--airfield-dir", str(tmp_path)])
    broken = d["airfields"][0]                       # user folders come first
    assert broken["file"] == str(tmp_path / "broken.yaml")
    assert broken["ident"] is None and broken["name"] == "broken"
    assert broken["builtin"] is False
    assert broken["error"].startswith(str(tmp_path / "broken.yaml") + ":4:")
    assert "unknown key 'nmae'" in broken["error"] and "did you mean 'name'" in broken["error"]
    assert broken["approaches"] == []
    assert {a["ident"] for a in d["airfields"][1:]} == DEMO_AIRFIELDS   # the rest still listed


def test_a_user_file_shadows_the_builtin_of_the_same_name(capsys, tmp_path):
    """First match wins (catalog): a user copy of V2RL stands in for the built-in one."""
    mine = tmp_path / "my-valley.yaml"
    mine.write_bytes(demo_file("airfields_demo", "v2rl-ellisvane-valley.yaml").read_bytes())
    d = run_json(capsys, ["--airfields", "--airfield-dir", str(tmp_path)])
    rows = [a for a in d["airfields"] if a["ident"] == "V2RL"]
    assert [r["file"] for r in rows][0] == str(mine)
    assert rows[0]["shadowed_by"] is None and rows[0]["builtin"] is False
    assert rows[1]["builtin"] is True and rows[1]["shadowed_by"] == str(mine)


def test_profile_dir_is_searched(capsys, tmp_path):
    src = demo_file("profiles", "demo-twin.yaml").read_text()
    (tmp_path / "my-twin.yaml").write_text(src.replace("name: demo-twin", "name: my-twin"))
    d = run_json(capsys, ["--profiles", "--profile-dir", str(tmp_path)])
    assert d["profiles"][0]["name"] == "my-twin" and d["profiles"][0]["file"] == str(tmp_path / "my-twin.yaml")


def test_config_file_folders_are_searched(capsys, tmp_path, monkeypatch):
    home = tmp_path / "xdg"
    folder = tmp_path / "fields"
    (home / "briefer").mkdir(parents=True)
    folder.mkdir()
    shutil.copyfile(str(demo_file("airfields_demo", "q7hm-qorvel-mesa.yaml")), folder / "mesa.yaml")
    (home / "briefer" / "config.yaml").write_text(f"airfield_dirs: [{folder}]\n")
    monkeypatch.setenv("XDG_CONFIG_HOME", str(home))
    d = run_json(capsys, ["--airfields"])
    assert d["airfields"][0]["file"] == str(folder / "mesa.yaml")


def test_missing_folder_is_one_line_exit_2(capsys, tmp_path):
    line = run_error(capsys, ["list", "--airfield-dir", str(tmp_path / "nope")])
    assert "no such folder" in line


def test_text_output(capsys, tmp_path):
    (tmp_path / "broken.yaml").write_text("kind: airfield\nformat_version: 1\nident: ZZZZ\nnmae: x\n")
    shutil.copyfile(str(demo_file("airfields_demo", "x4cd-tarnwick-coastal.yaml")), tmp_path / "coast.yaml")
    code = main(["list", "--airfield-dir", str(tmp_path)])
    out = capsys.readouterr().out
    assert code == 0
    assert "Aircraft profiles" in out and "Airfields" in out
    for name in DEMO_PROFILES | DEMO_AIRFIELDS:
        assert name in out
    assert "BROKEN:" in out and "unknown key 'nmae'" in out
    assert "shadowed by" in out
    assert "approaches: VOR RWY 33; RNP RWY 15" in out
    assert "flaps-20 (default)" in out
    assert "NOT FOR NAVIGATION" in out
