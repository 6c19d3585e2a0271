"""Wind limits in the profile format (issue 11 item 6): per configuration, optional.

A flight manual states a maximum demonstrated crosswind (14 CFR 25.237(a): "a 90-degree cross
component of wind velocity, demonstrated to be safe for takeoff and landing") and, where
certified, a tailwind limit for landing. Both are optional keys of a configuration; the loader
checks them and the schema declares them.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
import yaml

from briefer.errors import DataFileError
from briefer.io import catalog
from briefer.io.yamlload import load_profile

ROOT = Path(__file__).resolve().parent.parent
SCHEMA = json.loads((ROOT / "briefer" / "schemas" / "aircraft-profile.schema.json").read_text())


def _write(tmp_path, cfg_extra: dict) -> Path:
    data = yaml.safe_load((ROOT / "tests" / "bad_files" / "good-profile.yaml").read_text())
    data["configurations"][0].update(cfg_extra)
    p = tmp_path / "p.yaml"
    p.write_text(yaml.safe_dump(data, sort_keys=False))
    return p


def test_limits_load_and_are_optional(tmp_path):
    prof = load_profile(_write(tmp_path, {"max_demonstrated_crosswind_kt": 24, "tailwind_limit_kt": 10}))
    cfg = prof.configurations[0]
    assert (cfg.max_demonstrated_crosswind_kt, cfg.tailwind_limit_kt) == (24.0, 10.0)
    bare = load_profile(_write(tmp_path, {}))
    assert bare.configurations[0].max_demonstrated_crosswind_kt is None
    assert bare.configurations[0].tailwind_limit_kt is None


@pytest.mark.parametrize("key, value", [("max_demonstrated_crosswind_kt", -3), ("max_demonstrated_crosswind_kt", 200),
                                        ("tailwind_limit_kt", 99), ("tailwind_limit_kt", "ten")])
def test_bad_limits_name_file_line_and_field(tmp_path, key, value):
    with pytest.raises(DataFileError) as exc:
        load_profile(_write(tmp_path, {key: value}))
    msg = str(exc.value)
    assert "p.yaml:" in msg and key in msg


def test_schema_declares_the_limits():
    """Optional numbers: left out, or empty (null, as the loader reads it); a number; never text."""
    jsonschema = pytest.importorskip("jsonschema")
    cfg = SCHEMA["$defs"]["Configuration"]
    for key in ("max_demonstrated_crosswind_kt", "tailwind_limit_kt"):
        assert cfg["properties"][key]["type"] == ["number", "null"]
        assert key not in cfg["required"]
        check = jsonschema.Draft202012Validator(cfg["properties"][key])
        assert check.is_valid(20) and check.is_valid(None) and not check.is_valid("ten")


def test_demo_profiles_give_limits_on_some_configurations_only():
    """The invented demo profiles: the bizjet and twin give limits, the trainer gives none (so the
    brief's 'not given' path is exercised by the demo data)."""
    given = {name: [c.max_demonstrated_crosswind_kt for c in catalog.find_profile(name).configurations]
             for name in ("demo-bizjet", "demo-twin", "demo-trainer")}
    assert all(v is not None for v in given["demo-bizjet"])
    assert all(v is not None for v in given["demo-twin"])
    assert all(v is None for v in given["demo-trainer"])
