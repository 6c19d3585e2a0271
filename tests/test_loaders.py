"""briefer.io.yamlload and briefer.io.atomic: precise one-line errors, round trips, atomic writes.

The malformed files live in tests/bad_files/ (each is a small valid base, good-profile.yaml or
good-airfield.yaml, with one defect). Every case asserts the exact message, file:line: field:
what was expected. These are checks of our own messages and rules, not of published values;
the plausibility ranges are the ones documented in briefer/model.py.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest
import yaml

from briefer.errors import BriefingError, DataFileError
from briefer.io import atomic, safefile, yamlload
from briefer.io.atomic import FileWriteError, write_bytes_atomic, write_text_atomic
from briefer.io.yamlload import (
    dump_yaml,
    load_airfield,
    load_any,
    load_bytes,
    load_profile,
    parse_yaml_mapping,
)
from briefer.model import AircraftProfile, Airfield

BAD = Path(__file__).parent / "bad_files"


@pytest.fixture
def in_bad_files(monkeypatch: pytest.MonkeyPatch) -> Path:
    """Run in tests/bad_files so that messages name the file as the user typed it."""
    monkeypatch.chdir(BAD)
    return BAD


CASES = [
    # --- aircraft profiles: types, keys, ranges ------------------------------------------------
    ("p-wrong-type.yaml",
     "p-wrong-type.yaml:13: configurations[0].vref_kt: expected a number in knots, got 'fast'"),
    ("p-list-for-number.yaml",
     "p-list-for-number.yaml:9: familiar_pattern.height_ft: expected a number in feet, got a list"),
    ("p-null-value.yaml",
     "p-null-value.yaml:6: roll_rate_deg_per_s: expected a number in degrees per second, got an empty value"),
    ("p-infinite.yaml",
     "p-infinite.yaml:13: configurations[0].vref_kt: expected a finite number in knots, got inf"),
    ("p-bool.yaml",
     "p-bool.yaml:8: aoa_indexer: expected true or false, got 'maybe'"),
    ("p-missing-key.yaml",
     "p-missing-key.yaml:12: configurations[0]: missing required key 'vs1g_kt'"),
    ("p-unknown-key.yaml",
     "p-unknown-key.yaml:19: configurations[0]: unknown key 'bank_limit_degs' (did you mean 'bank_limit_deg'?)"),
    ("p-unknown-top-key.yaml",
     "p-unknown-top-key.yaml:4: unknown key 'refrence_weight_lb' (did you mean 'reference_weight_lb'?)"),
    ("p-unknown-key-no-match.yaml",
     "p-unknown-key-no-match.yaml:21: unknown key 'colour' (allowed: kind, format_version, name, description, "
     "reference_weight_lb, max_landing_weight_lb, aoa_unit, roll_rate_deg_per_s, stall_warning, aoa_indexer, "
     "wind_additive, familiar_pattern, configurations, default_configuration, vso_kt, category_speed_kt)"),
    ("p-speed-range.yaml",
     "p-speed-range.yaml:13: configurations[0].vref_kt: expected a number in knots between 20 and 300, got 700"),
    ("p-bank-range.yaml",
     "p-bank-range.yaml:19: configurations[0].bank_limit_deg: expected a number in degrees between 5 and 60, got 75"),
    ("p-aoa-degrees.yaml",
     "p-aoa-degrees.yaml:17: configurations[0].aoa_stall: expected an angle of attack in degrees between 5 and 40, "
     "got 60"),
    ("p-stall-warning.yaml",
     "p-stall-warning.yaml:7: stall_warning: expected 'horn', 'shaker', 'pusher', 'aural', 'buffet' or 'none', "
     "got 'hron' (did you mean 'horn'?)"),
    ("p-configs-not-list.yaml",
     "p-configs-not-list.yaml:11: configurations: expected a list of configurations, got a mapping"),
    ("p-empty-configs.yaml",
     "p-empty-configs.yaml:11: configurations: expected at least 1 configuration, got an empty list"),
    ("p-duplicate-key.yaml",
     "p-duplicate-key.yaml:17: configurations[0].vref_kt: duplicate key 'vref_kt' (first given on line 13)"),
    ("p-format-version.yaml",
     "p-format-version.yaml:3: format_version: expected 1 (the only format this version reads), got 2"),
    ("p-kind-typo.yaml",
     "p-kind-typo.yaml:2: kind: expected 'aircraft-profile' or 'airfield', got 'aircraft-profil' "
     "(did you mean 'aircraft-profile'?)"),
    ("p-no-kind.yaml",
     "p-no-kind.yaml:2: missing required key 'kind' (expected 'aircraft-profile' or 'airfield')"),
    # --- aircraft profiles: cross-field rules ---------------------------------------------------
    ("p-stall-aoa.yaml",
     "p-stall-aoa.yaml:17: configurations[0].aoa_stall: expected above aoa_ref (6), got 5"),
    ("p-circling-below-vref.yaml",
     "p-circling-below-vref.yaml:14: configurations[0].circling_speed_kt: expected at least vref_kt (70), got 65"),
    ("p-vref-below-vs1g.yaml",
     "p-vref-below-vs1g.yaml:13: configurations[0].vref_kt: expected above vs1g_kt (72), got 70"),
    ("p-default-config.yaml",
     "p-default-config.yaml:20: default_configuration: no configuration named 'flaps-01' (did you mean 'flaps-10'?)"),
    ("p-duplicate-config.yaml",
     "p-duplicate-config.yaml:20: configurations[1].name: duplicate configuration name 'Flaps-10' "
     "(also configurations[0])"),
    ("p-familiar-both.yaml",  # like every 'not both': the line of the second key, and the keys given
     "p-familiar-both.yaml:11: familiar_pattern.speed_kt: give either offset_nm, or speed_kt and bank_deg, not both "
     "(got offset_nm and speed_kt)"),
    ("p-familiar-speed-only.yaml",
     "p-familiar-speed-only.yaml:8: familiar_pattern: missing required key 'bank_deg' (speed_kt needs bank_deg)"),
    ("p-weight-kg.yaml",  # 2400 lb entered as 1090 kg
     "p-weight-kg.yaml:5: max_landing_weight_lb: expected within a factor of 2 of reference_weight_lb (2400), "
     "got 1090"),
    ("p-wind-additive.yaml",
     "p-wind-additive.yaml:10: wind_additive.max_kt: expected at least min_kt (15), got 10"),
    # --- airfields ------------------------------------------------------------------------------
    ("lemon.yaml",
     "lemon.yaml:16: runways[1].threshold_b.elevation_ft: expected a number in feet, got 'abc'"),
    ("a-elevation-range.yaml",
     "a-elevation-range.yaml:6: elevation_ft: expected a number in feet between -1500 and 15000, got 20000"),
    ("a-latitude-range.yaml",
     "a-latitude-range.yaml:5: reference_point.lat_deg: expected a number in degrees between -90 and 90, got 95"),
    ("a-bad-designator.yaml",
     "a-bad-designator.yaml:9: runways[0].threshold_a.designator: expected a runway designator such as '09' or "
     "'27L', got '9X'"),
    ("a-not-reciprocal.yaml",
     "a-not-reciprocal.yaml:10: runways[0].threshold_b.designator: expected '27' (the reciprocal of '09'), got '26'"),
    ("a-runway-too-short.yaml",  # 0.001 deg of longitude at 45 N: about 79 m
     "a-runway-too-short.yaml:10: runways[0].threshold_b: thresholds '09' and '27' are 79 m apart; "
     "expected 300 m to 6 km"),
    ("a-runway-bearing.yaml",  # the two thresholds' coordinates swapped
     "a-runway-bearing.yaml:9: runways[0]: the bearing from threshold '09' to '27' is 270 degrees magnetic "
     "(270 true); expected within 15 degrees of 090 for designator '09' (check the coordinates and "
     "magnetic_variation_deg)"),
    ("a-threshold-elevation.yaml",
     "a-threshold-elevation.yaml:10: runways[0].threshold_b.elevation_ft: expected within 300 ft of the airfield "
     "elevation (500), got 1495"),
    ("a-no-runways.yaml",
     "a-no-runways.yaml:8: runways: expected at least 1 runway, got an empty list"),
    ("a-approach-runway.yaml",
     "a-approach-runway.yaml:13: approaches[0].runway: no runway '18' at this airfield (runways: 09/27)"),
    ("a-duplicate-approach.yaml",
     "a-duplicate-approach.yaml:21: approaches[1].name: approach name 'vor rwy 09' is also used by approaches[0]"),
    ("a-criteria.yaml",
     "a-criteria.yaml:15: approaches[0].criteria: expected 'terps-legacy', 'terps-expanded' or 'icao', "
     "got 'terps-expandd' (did you mean 'terps-expanded'?)"),
    ("a-faf-altitude.yaml",
     "a-faf-altitude.yaml:16: approaches[0].faf: missing required key 'altitude_ft'"),
    ("a-fix-far-away.yaml",  # one degree of latitude north of the field: about 60 NM
     "a-fix-far-away.yaml:16: approaches[0].faf: the fix is 60.3 NM from the reference point; expected within 30 NM"),
    ("a-mda-below-field.yaml",
     "a-mda-below-field.yaml:19: approaches[0].circling.A.mda_ft: expected 250 to 3000 ft above the airfield "
     "elevation (500), got 600 (100 ft above)"),
    ("a-both-visibilities.yaml",
     "a-both-visibilities.yaml:20: approaches[0].circling.B.visibility_m: give either visibility_sm or visibility_m, "
     "not both"),
    ("a-na-with-mda.yaml",
     "a-na-with-mda.yaml:21: approaches[0].circling.C.mda_ft: expected no mda_ft for a category that is not "
     "authorised"),
    ("a-unknown-category.yaml",
     "a-unknown-category.yaml:21: approaches[0].circling: unknown category 'F' (expected 'A', 'B', 'C', 'D' or 'E')"),
    ("a-sector-runway.yaml",
     "a-sector-runway.yaml:22: approaches[0].not_authorised_sectors[0].runway: no runway '18/36' at this airfield "
     "(runways: 09/27)"),
    ("a-sector-threshold.yaml",
     "a-sector-threshold.yaml:22: approaches[0].not_authorised_sectors[0].threshold: no runway threshold '36' at "
     "this airfield (thresholds: 09, 27)"),
    ("a-sector-side-along.yaml",
     "a-sector-side-along.yaml:22: approaches[0].not_authorised_sectors[0].side: 'east' lies along runway 09/27 "
     "(axis 090 true), not to one side of it"),
    ("a-sector-both-forms.yaml",
     "a-sector-both-forms.yaml:22: approaches[0].not_authorised_sectors[0].side: give either threshold, "
     "from_deg_mag and to_deg_mag, or runway and side, not both (got threshold and side)"),
    # --- any file: not YAML, not a mapping, not a file --------------------------------------------
    ("g-empty.yaml",
     "g-empty.yaml: the file is empty; expected a YAML mapping starting with 'kind: aircraft-profile' or "
     "'kind: airfield'"),
    ("g-comments-only.yaml",
     "g-comments-only.yaml: the file is empty; expected a YAML mapping starting with 'kind: aircraft-profile' or "
     "'kind: airfield'"),
    ("g-directory.yaml", "g-directory.yaml: is a directory, expected a YAML file"),
    ("g-binary.yaml", "g-binary.yaml: expected a YAML text file, got binary data"),
    ("g-latin1.yaml", "g-latin1.yaml:3: expected UTF-8 text, got the byte 0xe9"),
    ("g-broken-yaml.yaml", "g-broken-yaml.yaml:4: not valid YAML: mapping values are not allowed here"),
    ("g-unclosed-bracket.yaml",
     "g-unclosed-bracket.yaml:3: not valid YAML: expected ',' or '}', but got ':' "
     "(while parsing a flow mapping on line 2)"),
    ("g-tab-indent.yaml", "g-tab-indent.yaml:3: not valid YAML: found character '\\t' that cannot start any token"),
    ("g-two-documents.yaml",
     "g-two-documents.yaml:2: not valid YAML: expected a single document in the stream, but found another document"),
    ("g-top-list.yaml", "g-top-list.yaml:1: expected a mapping of keys at the top level, got a list"),
    ("g-top-scalar.yaml",
     "g-top-scalar.yaml:1: expected a mapping of keys at the top level, got the single value 'just some text'"),
    ("g-key-is-mapping.yaml", "g-key-is-mapping.yaml:2: expected a plain key, got a list or mapping used as a key"),
    ("g-merge-key.yaml",
     "g-merge-key.yaml:4: familiar_pattern: merge keys ('<<') are not supported; write the keys out"),
    ("g-python-tag.yaml",
     "g-python-tag.yaml:2: name: unsupported YAML tag 'tag:yaml.org,2002:python/object/apply:os.system'"),
    ("g-recursive-alias.yaml",
     "g-recursive-alias.yaml:2: name[0]: a recursive alias (an anchor that contains itself)"),
    ("no-such-file.yaml", "no-such-file.yaml: no such file"),
]


@pytest.mark.parametrize(("name", "message"), [pytest.param(n, m, id=n) for n, m in CASES])
def test_bad_file_gives_one_exact_error(in_bad_files: Path, name: str, message: str) -> None:
    with pytest.raises(DataFileError) as info:
        load_any(name)
    assert str(info.value) == message
    assert "\n" not in str(info.value)


def test_every_bad_fixture_is_in_the_table() -> None:
    """No fixture is left untested (the two bases are the valid ones)."""
    on_disk = {p.name for p in BAD.iterdir() if p.name not in ("good-profile.yaml", "good-airfield.yaml")}
    assert on_disk == {n for n, _ in CASES} - {"no-such-file.yaml"}
    assert len(CASES) >= 30


def test_the_bases_load(in_bad_files: Path) -> None:
    assert isinstance(load_any("good-profile.yaml"), AircraftProfile)
    assert isinstance(load_any("good-airfield.yaml"), Airfield)


def test_error_carries_file_line_field_and_message(in_bad_files: Path) -> None:
    with pytest.raises(DataFileError) as info:
        load_any("lemon.yaml")
    err = info.value
    assert (err.file, err.line, err.context, err.message) == (
        "lemon.yaml", 16, "runways[1].threshold_b.elevation_ft", "expected a number in feet, got 'abc'")
    assert isinstance(err, BriefingError) and isinstance(err, ValueError)


def test_load_profile_refuses_an_airfield_file(in_bad_files: Path) -> None:
    with pytest.raises(DataFileError) as info:
        load_profile("good-airfield.yaml")
    assert str(info.value) == ("good-airfield.yaml:2: kind: expected 'aircraft-profile', got 'airfield' "
                               "(this is not an aircraft profile file)")
    with pytest.raises(DataFileError) as info:
        load_airfield("good-profile.yaml")
    assert str(info.value) == ("good-profile.yaml:2: kind: expected 'airfield', got 'aircraft-profile' "
                               "(this is not an airfield file)")


def test_path_objects_are_accepted(in_bad_files: Path) -> None:
    assert load_profile(BAD / "good-profile.yaml").name == "test-single"


# --- YAML reading details ------------------------------------------------------------------------
def test_leading_zero_numbers_are_decimal_not_octal() -> None:
    """030 is thirty degrees (YAML 1.1 would read octal 24, and '090' as text)."""
    doc = parse_yaml_mapping(b"a: 030\nb: 090\nc: 09\nd: -007\ne: '030'\n", "x.yaml")
    assert doc.data == {"a": 30, "b": 90, "c": 9, "d": -7, "e": "030"}


def test_designators_written_as_numbers_are_normalised(in_bad_files: Path) -> None:
    text = (BAD / "good-airfield.yaml").read_text().replace('designator: "09"', "designator: 9").replace(
        'designator: "27"', "designator: 27").replace('runway: "09"', "runway: 09")
    field = load_bytes(text.encode(), file="x.yaml")
    assert isinstance(field, Airfield)
    assert [t.designator for t in field.thresholds] == ["09", "27"]
    assert field.approaches[0].runway == "09"


def test_lines_point_at_keys_and_list_items() -> None:
    doc = parse_yaml_mapping(b"# c\nkind: x\nrunways:\n  - a: 1\n    b: 2\n  - a: 3\n", "x.yaml")
    assert doc.lines == {"": 2, "kind": 2, "runways": 3, "runways[0]": 4, "runways[0].a": 4, "runways[0].b": 5,
                         "runways[1]": 6, "runways[1].a": 6}
    assert doc.line_of("runways[1].missing") == 6  # the nearest enclosing item
    assert doc.line_of("nowhere.at.all") == 2


def test_duplicate_key_in_a_flow_mapping() -> None:
    with pytest.raises(DataFileError) as info:
        parse_yaml_mapping(b"kind: airfield\nreference_point: {lat_deg: 1, lat_deg: 2}\n", "x.yaml")
    assert str(info.value) == "x.yaml:2: reference_point.lat_deg: duplicate key 'lat_deg' (first given on line 2)"


def test_alias_bomb_is_refused() -> None:
    """A 'billion laughs' document stops at the node limit instead of eating the memory."""
    lines = ["a0: &a0 [x, x, x, x, x, x, x, x, x, x]"]
    lines += [f"a{i}: &a{i} [{', '.join([f'*a{i - 1}'] * 10)}]" for i in range(1, 8)]
    with pytest.raises(DataFileError) as info:
        parse_yaml_mapping("\n".join(lines).encode(), "bomb.yaml")
    assert "more than 200000 values (too many aliases?)" in str(info.value)


def test_byte_order_mark_is_accepted() -> None:
    assert parse_yaml_mapping("\ufeffkind: airfield\n".encode(), "x.yaml").data == {"kind": "airfield"}


def test_a_bad_byte_after_a_byte_order_mark_is_named_at_its_line() -> None:
    """A file that starts with a byte order mark and has a byte that is not UTF-8 further on: the
    message names that byte and its line (it named the byte three places before it, counting from
    after the mark: 'line 2 ... the byte 0x0a' for a 0xff on line 5)."""
    for data, line in ((b"\xef\xbb\xbfkind: airfield\nname: ab\xffcd\n", 2), (b"\xef\xbb\xbfkind: a\n\n\n\n\xff", 5)):
        with pytest.raises(DataFileError) as err:
            parse_yaml_mapping(data, "f.yaml")
        assert str(err.value) == f"f.yaml:{line}: expected UTF-8 text, got the byte 0xff"


def test_unreadable_file(in_bad_files: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    def refuse(*args: object, **kwargs: object) -> None:
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(safefile, "_open", refuse)
    with pytest.raises(DataFileError) as info:
        load_any("good-profile.yaml")
    assert str(info.value) == "good-profile.yaml: cannot read the file (permission denied)"


# --- round trips -------------------------------------------------------------------------------------
@pytest.mark.parametrize("name", ["good-profile.yaml", "good-airfield.yaml"])
def test_round_trip_through_mapping_and_yaml(name: str) -> None:
    model = load_any(BAD / name)
    again = type(model).from_mapping(model.to_mapping())
    assert again == model
    assert load_bytes(dump_yaml(model).encode(), file="dumped.yaml") == model


def test_dump_quotes_digit_only_text() -> None:
    """A configuration called '10' stays text after dump and load (the loader reads 10 as a number)."""
    text = (BAD / "good-profile.yaml").read_text().replace("flaps-10", "'10'")
    profile = load_bytes(text.encode(), file="x.yaml")
    assert "name: '10'" in dump_yaml(profile)
    assert load_bytes(dump_yaml(profile).encode(), file="y.yaml") == profile


def test_dump_yaml_is_plain_safe_yaml() -> None:
    model = load_any(BAD / "good-airfield.yaml")
    assert yaml.safe_load(dump_yaml(model))["kind"] == "airfield"


# --- atomic writes ---------------------------------------------------------------------------------
def test_write_then_refuse_to_overwrite(tmp_path: Path) -> None:
    target = tmp_path / "card.txt"
    assert write_text_atomic(target, "first") == target
    with pytest.raises(FileWriteError) as info:
        write_text_atomic(target, "second")
    assert str(info.value) == f"cannot write {target}: the file already exists (not overwritten; ask to overwrite it)"
    assert isinstance(info.value, BriefingError)
    assert target.read_text() == "first"
    write_text_atomic(target, "second", overwrite=True)
    assert target.read_text() == "second"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["card.txt"]


def test_bytes_and_permissions(tmp_path: Path) -> None:
    target = write_bytes_atomic(tmp_path / "card.pdf", b"%PDF-1.4\n\x00\xff")
    assert target.read_bytes() == b"%PDF-1.4\n\x00\xff"
    umask = os.umask(0)
    os.umask(umask)
    assert target.stat().st_mode & 0o777 == 0o666 & ~umask


def test_failure_leaves_no_partial_file(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    target = tmp_path / "card.txt"
    target.write_text("old complete card")

    def disk_full(fd: int) -> None:
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(atomic.os, "fsync", disk_full)
    for overwrite in (False, True):
        fresh = tmp_path / "new.txt"
        with pytest.raises(FileWriteError):
            write_text_atomic(fresh, "x" * 100_000, overwrite=overwrite)
        assert not fresh.exists()
    with pytest.raises(FileWriteError) as info:
        write_text_atomic(target, "new card", overwrite=True)
    assert str(info.value) == f"cannot write {target}: no space left on the device"
    assert target.read_text() == "old complete card"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["card.txt"]


def test_file_appearing_meanwhile_is_not_overwritten(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    target = tmp_path / "card.txt"
    real_link = os.link

    def someone_else_was_faster(src: str, dst: str) -> None:
        Path(dst).write_text("theirs")
        real_link(src, dst)

    monkeypatch.setattr(atomic.os, "link", someone_else_was_faster)
    with pytest.raises(FileWriteError):
        write_text_atomic(target, "mine")
    assert target.read_text() == "theirs"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["card.txt"]


def test_unwritable_and_missing_places(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    with pytest.raises(FileWriteError) as info:
        write_text_atomic(tmp_path / "no" / "card.txt", "x")
    assert str(info.value) == f"cannot write {tmp_path / 'no' / 'card.txt'}: no such directory: {tmp_path / 'no'}"
    with pytest.raises(FileWriteError) as info:
        write_text_atomic(tmp_path, "x", overwrite=True)
    assert str(info.value) == f"cannot write {tmp_path}: it is a directory"

    def denied(*args: object, **kwargs: object) -> int:  # works even when the tests run as root
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(atomic.os, "open", denied)
    with pytest.raises(FileWriteError) as info:
        write_text_atomic(tmp_path / "card.txt", "x")
    assert str(info.value) == f"cannot write {tmp_path / 'card.txt'}: permission denied"


def test_reading_and_writing_say_why_in_one_wording(tmp_path: Path) -> None:
    """A file name longer than the file system allows (POSIX NAME_MAX, 255 bytes on Linux file
    systems) fails alike for the loaders and the atomic writer: the same words after each one's
    own opening."""
    long_name = tmp_path / ("x" * 300 + ".yaml")
    with pytest.raises(DataFileError) as read:
        safefile.read_regular_file(long_name)
    with pytest.raises(FileWriteError) as write:
        write_text_atomic(long_name, "x")
    assert str(read.value).endswith("cannot read the file (the file name is too long)")
    assert str(write.value).endswith(": the file name is too long")
