"""Finding an airfield by ident or name in the user's folders (briefer.io.catalog.find_airfield):
the catalog skips files whose text cannot hold the name asked for (start-up), and must still find
a name written in any YAML way (an escape, a folded line, quotes), in folder order, and still list
every valid file when nothing matches. Expected values: the YAML 1.1 specification's scalar
rules (escapes in double quotes, line folding of plain scalars, doubled single quotes).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from briefer.io import catalog

DEMO = Path(__file__).resolve().parent.parent / "airfields_demo" / "v2rl-ellisvane-valley.yaml"


def _airfield(folder: Path, stem: str, ident_line: str, name_line: str) -> None:
    text = DEMO.read_text(encoding="utf-8")
    text = text.replace("ident: V2RL\n", ident_line + "\n", 1).replace("name: Ellisvane Valley\n", name_line + "\n", 1)
    (folder / f"{stem}.yaml").write_text(text, encoding="utf-8")


@pytest.fixture()
def folder(tmp_path: Path) -> Path:
    _airfield(tmp_path, "a-first", 'ident: "Z\\x39ZZ"', 'name: "Esc\\u0061ped Field"')     # Z9ZZ, Escaped Field
    _airfield(tmp_path, "b-second", "ident: Y8YY", "name: Folded\n  Long Field")          # 'Folded Long Field'
    _airfield(tmp_path, "c-third", "ident: 'X7XX'", "name: 'O''Hollow Field'")              # O'Hollow Field
    return tmp_path


@pytest.mark.parametrize("asked, ident", [("Z9ZZ", "Z9ZZ"), ("escaped field", "Z9ZZ"), ("y8yy", "Y8YY"),
                                          ("Folded Long Field", "Y8YY"), ("x7xx", "X7XX"),
                                          ("O'Hollow Field", "X7XX"), ("OHollow field", "X7XX")])
def test_a_name_written_any_yaml_way_is_found(folder: Path, asked: str, ident: str) -> None:
    af = catalog.find_airfield(asked, dirs=[folder], use_config=False)
    assert af.ident == ident


def test_not_found_lists_every_valid_file(folder: Path) -> None:
    with pytest.raises(catalog.NotFoundError) as exc:
        catalog.find_airfield("W6WW", dirs=[folder], use_config=False)
    for ident in ("Z9ZZ", "Y8YY", "X7XX", "V2RL", "Q7HM"):
        assert ident in str(exc.value)


def test_the_first_file_in_folder_order_wins(tmp_path: Path) -> None:
    _airfield(tmp_path, "a-one", "ident: Z9ZZ", "name: First Field")
    _airfield(tmp_path, "b-two", "ident: Z9ZZ", "name: Second Field")
    assert catalog.find_airfield("Z9ZZ", dirs=[tmp_path], use_config=False).name == "First Field"
