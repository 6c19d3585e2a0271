"""The aircraft form: typed text -> the loader's model, the loader's messages beside the fields,
atomic saves into the user's folder, and the app briefing with the saved file at once.

The reference for every check here is the loader itself (`briefer.io.yamlload`, which reads the
data-file format documented in README "Data files"): the form must accept exactly what a file
would give, say what the loader says, and write files the loader reads back to the same model.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from forms_support import brief_json, form_app, message_of, open_new_form, type_field, type_fields
from test_app_support import settle

from briefer.errors import DataFileError
from briefer.io.catalog import builtin_files, list_profiles, load_config
from briefer.io.yamlload import dump_yaml, load_bytes, load_profile
from briefer.model import KIND_PROFILE, AircraftProfile
from briefer.tui.app import BriefingApp
from briefer.tui.forms import values
from briefer.tui.forms.check import check_texts
from briefer.tui.forms.profile_form import PROFILE_FORM
from briefer.tui.forms.screen import ConfirmClose, FormScreen
from briefer.tui.forms.spec import blank_texts, to_mapping, to_texts
from briefer.tui.forms.store import SaveError, file_text, save_model, target_folder
from briefer.tui.state import request_from_inputs


@pytest.fixture(autouse=True)
def _config_home(tmp_path, monkeypatch):
    """Each test has its own, empty user config folder."""
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


def _demo_profiles() -> list[AircraftProfile]:
    return [load_bytes(f.read_bytes(), file=f.name, expected_kind=KIND_PROFILE) for f in builtin_files(KIND_PROFILE)]


# --- what a pilot types -----------------------------------------------------------------------
@pytest.mark.parametrize(("text", "want"), [
    ("093.2", {"final_course_deg_mag": 93.2}), ("93", {"final_course_deg_mag": 93}),
    ("093°", {"final_course_deg_mag": 93}), ("93 °M", {"final_course_deg_mag": 93}),
    ("abc", {"final_course_deg_mag": "abc"}),          # not a number: the loader says so
    ("", {}),
])
def test_course_forms(text, want):
    assert values.read_number(text, "°M", key="final_course_deg_mag") == want


@pytest.mark.parametrize(("text", "want"), [
    ("1", {"visibility_sm": 1}), ("1 1/4", {"visibility_sm": 1.25}), ("3/4", {"visibility_sm": 0.75}),
    ("1 1/4 SM", {"visibility_sm": 1.25}), ("2.5", {"visibility_sm": 2.5}), ("1600m", {"visibility_m": 1600}),
    ("1600 m", {"visibility_m": 1600}), ("1600", {"visibility_m": 1600}), ("1.6 km", {"visibility_m": 1600}),
])
def test_visibility_forms(text, want):
    assert values.read_visibility(text) == want


def test_a_wrong_unit_names_the_accepted_forms():
    with pytest.raises(values.FormTextError, match="expected SM .* or metres"):
        values.read_visibility("2 NM")
    with pytest.raises(values.FormTextError, match="'ft'"):
        values.read_number("6640 m", "ft", key="mda_ft")
    assert values.read_number("7,700 ft", "ft", key="altitude_ft") == {"altitude_ft": 7700}


def test_na_and_sectors():
    assert values.read_minimum("NA") == {"not_authorised": True}
    assert values.read_minimum("6640") == {"mda_ft": 6640}
    assert values.read_sector("south of runway 09/27") == {"side": "south", "runway": "09/27"}
    assert values.read_sector("NA north of 13/31") == {"side": "north", "runway": "13/31"}
    assert values.read_sector("13 040-110") == {"threshold": "13", "from_deg_mag": 40, "to_deg_mag": 110}
    with pytest.raises(values.FormTextError, match="south of 09/27"):
        values.read_sector("somewhere")


# --- the form against the loader ---------------------------------------------------------------
@pytest.mark.parametrize("profile", _demo_profiles(), ids=lambda p: p.name)
def test_every_demo_profile_reads_back_through_the_form(profile):
    texts = to_texts(PROFILE_FORM, profile.to_mapping())
    verdict = check_texts(PROFILE_FORM, texts)
    assert verdict.ok, (verdict.errors, verdict.required, verdict.general)
    assert verdict.model == profile


def _complete_texts() -> dict:
    return to_texts(PROFILE_FORM, _demo_profiles()[0].to_mapping())


@pytest.mark.parametrize(("fpath", "text"), [
    (("reference_weight_lb",), "50"),
    (("configurations", 0, "vref_kt"), "400"),
    (("configurations", 0, "vref_kt"), "fast"),
    (("stall_warning",), "horm"),
    (("roll_rate_deg_per_s",), "1"),
    (("familiar_pattern", "height_ft"), "20000"),
    (("configurations", 0, "bank_target_deg"), "45"),     # above the bank limit: a cross-field rule
])
def test_a_bad_field_gets_the_loaders_own_message_beside_it(fpath, text):
    texts = _complete_texts()
    cur = texts
    for tok in fpath[:-1]:
        cur = cur[tok]
    cur[fpath[-1]] = text
    verdict = check_texts(PROFILE_FORM, texts)
    assert verdict.model is None
    assert fpath in verdict.errors
    # the loader, reading the same mapping as a file, says the same words
    with pytest.raises(DataFileError) as exc:
        load_bytes(dump_yaml(to_mapping(PROFILE_FORM, texts).mapping).encode(), file="x.yaml",
                   expected_kind=KIND_PROFILE)
    assert exc.value.message == verdict.errors[fpath]


def test_a_field_below_an_empty_one_is_still_checked():
    texts = blank_texts(PROFILE_FORM)
    texts["roll_rate_deg_per_s"] = "900"
    texts["configurations"][0]["aoa_stall"] = "x"
    verdict = check_texts(PROFILE_FORM, texts)
    assert "between 5 and 400" in verdict.errors[("roll_rate_deg_per_s",)]
    assert verdict.errors[("configurations", 0, "aoa_stall")] == "expected a number in angle of attack, got 'x'"
    assert verdict.required[("name",)] == "required"


# --- saving ----------------------------------------------------------------------------------
def test_save_load_save_is_byte_identical(tmp_path):
    for profile in _demo_profiles():
        path = tmp_path / f"{profile.name}.yaml"
        save_model(KIND_PROFILE, profile, path, overwrite=False)
        again = load_profile(path)
        assert again == profile
        assert file_text(KIND_PROFILE, again).encode() == path.read_bytes()
        path2 = tmp_path / f"{profile.name}-2.yaml"
        save_model(KIND_PROFILE, again, path2, overwrite=False)
        assert path2.read_bytes() == path.read_bytes()


def test_a_failed_save_keeps_the_existing_file(tmp_path, monkeypatch):
    profile = _demo_profiles()[0]
    path = tmp_path / "p.yaml"
    path.write_text("old contents\n")

    def broken_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", broken_replace)
    with pytest.raises(SaveError, match="no space left"):
        save_model(KIND_PROFILE, profile, path, overwrite=True)
    assert path.read_text() == "old contents\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["p.yaml"]      # no half-written file left


def test_first_save_creates_the_folder_and_lists_it_in_the_config(tmp_path):
    target = target_folder(KIND_PROFILE)
    assert not target.in_config and not target.folder.exists()
    profile = _demo_profiles()[0]
    written = save_model(KIND_PROFILE, profile, target.folder / "mine.yaml", overwrite=False, target=target)
    assert load_config().profile_dirs == (target.folder,)
    entries = [e for e in list_profiles() if e.source == str(written)]
    assert entries and entries[0].error is None


# --- in the app --------------------------------------------------------------------------------
NEW_AIRCRAFT = [
    (("name",), "test-turboprop"),
    (("description",), "Invented twin turboprop"),
    (("reference_weight_lb",), "12500"),
    (("max_landing_weight_lb",), "12,000"),
    (("configurations", 0, "name"), "landing"),
    (("configurations", 0, "vref_kt"), "110"),
    (("configurations", 0, "circling_speed_kt"), "125 kt"),
    (("configurations", 0, "vs1g_kt"), "85"),
    (("configurations", 0, "aoa_ref"), "6"),
    (("configurations", 0, "aoa_stall"), "14.5"),
    (("configurations", 0, "bank_target_deg"), "25"),
    (("configurations", 0, "bank_limit_deg"), "30"),
    (("default_configuration",), "landing"),
    (("roll_rate_deg_per_s",), "30"),
    (("stall_warning",), "shaker"),
    (("familiar_pattern", "height_ft"), "1500"),
    (("familiar_pattern", "offset_nm"), "1.2"),
]


def _app() -> BriefingApp:
    return form_app()


async def test_type_a_new_aircraft_save_it_and_the_brief_uses_it():
    app = _app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "1", PROFILE_FORM)
        assert isinstance(screen, FormScreen) and screen.spec is PROFILE_FORM
        await type_fields(pilot, NEW_AIRCRAFT)
        assert screen.verdict.ok, (screen.verdict.errors, screen.verdict.required)
        assert "✓ complete" in screen.status_text and "test-turboprop.yaml" in screen.status_text
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen)
        path = target_folder(KIND_PROFILE).folder / "test-turboprop.yaml"
        saved = load_profile(path)
        assert saved.name == "test-turboprop" and saved.max_landing_weight_lb == 12000
        assert saved.configurations[0].circling_speed_kt == 125
        await settle(app, pilot)
        assert app.inputs.profile == "test-turboprop"
        # the brief on screen is build_brief's on the saved file
        request, report = request_from_inputs(app.inputs, app.catalog)
        assert request.profile == saved
        assert brief_json(app.request, None) == brief_json(request, report)


async def test_a_bad_entry_is_refused_beside_the_field_and_nothing_is_saved():
    app = _app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "1", PROFILE_FORM)
        await type_fields(pilot, NEW_AIRCRAFT)
        await type_field(pilot, ("configurations", 0, "vref_kt"), "80")      # below Vs1g 85
        fpath = ("configurations", 0, "vref_kt")
        assert message_of(screen, fpath) == "✗ expected above vs1g_kt (85), got 80"
        assert screen._inputs[fpath].has_class("-invalid")
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert app.screen is screen                       # still open, nothing written
        assert "not saved" in screen.status_text
        assert app.focused is screen._inputs[fpath]       # the cursor goes to the problem
        assert not target_folder(KIND_PROFILE).folder.exists()


async def test_escape_with_unsaved_changes_asks_first():
    app = _app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "1", PROFILE_FORM)
        await pilot.press("escape")              # nothing typed: closes at once
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen)
        await pilot.press("f2")
        await pilot.pause()
        screen = app.screen
        await type_field(pilot, ("name",), "x1")
        await pilot.press("escape")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmClose)
        await pilot.press("escape")              # keep editing
        await pilot.pause()
        assert app.screen is screen and screen._inputs[("name",)].value == "x1"
        await pilot.press("escape", "d")         # discard
        await pilot.pause()
        assert not isinstance(app.screen, (FormScreen, ConfirmClose))


async def test_edit_a_demo_profile_saves_a_copy_in_the_user_folder():
    app = _app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        name = app.inputs.profile
        await pilot.press("f3")
        await pilot.pause()
        screen = app.screen
        assert isinstance(screen, FormScreen)
        assert screen._inputs[("name",)].value == name
        assert screen.verdict.ok
        await type_field(pilot, ("roll_rate_deg_per_s",), "35")
        await pilot.press("ctrl+s")
        await pilot.pause()
        path = target_folder(KIND_PROFILE).folder / f"{name}.yaml"
        assert load_profile(path).roll_rate_deg_per_s == 35
        await settle(app, pilot)
        assert app.catalog.profile(name).roll_rate_deg_per_s == 35
        assert app.request.profile.roll_rate_deg_per_s == 35


async def test_the_aircraft_form_fits_80x24_and_scrolls():
    app = _app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "1", PROFILE_FORM)
        for fpath, inp in screen._inputs.items():
            inp.focus()
            for _ in range(50):                  # scrolling into view takes a frame or two
                await pilot.pause(0.02)
                if 0 < inp.region.y < 22:
                    break
            region = inp.region
            assert region.width > 0 and region.x + region.width <= 80, fpath      # shown, not clipped
            assert 0 < region.y < 22, fpath                                      # scrolled into view


def test_a_cross_field_message_quotes_the_crews_value_not_an_example():
    """While the form is unfinished, a rule comparing two fields must not compare with a value the
    crew never typed (the loader reads the finished file with the typed values)."""
    texts = blank_texts(PROFILE_FORM)
    texts["reference_weight_lb"] = "12500"
    texts["max_landing_weight_lb"] = "12000"
    verdict = check_texts(PROFILE_FORM, texts)
    assert ("max_landing_weight_lb",) not in verdict.errors, verdict.errors
    texts = _complete_texts()
    ref = texts["reference_weight_lb"]
    texts["max_landing_weight_lb"] = str(3 * int(ref))   # more than twice: the loader's rule, typed values
    verdict = check_texts(PROFILE_FORM, texts)
    assert f"reference_weight_lb ({ref})" in verdict.errors[("max_landing_weight_lb",)]
