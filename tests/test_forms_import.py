"""The airfield form's import (F4): an identifier and the open airport database's two CSV files
fill the form with the airfield and its runways; the crew adds the approach from the chart and
saves; the brief equals `build_brief` on the saved file.

The CSV files are the invented examples in the database's published column layout (its data
dictionary: airports.csv and runways.csv); no real airport. The importer is
`briefer.io.runway_import.import_airfield` (tests/test_runway_import.py checks it against
geographiclib and the hand-written demo file).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from forms_support import brief_json, form_app, message_of, open_new_form, type_field, type_fields
from test_app_support import settle

from briefer.io.runway_import import import_airfield
from briefer.io.yamlload import load_airfield
from briefer.model import KIND_AIRFIELD, BriefRequest, Weather
from briefer.tui.forms.airfield_form import AIRFIELD_FORM, MISSING_WORDS
from briefer.tui.forms.import_dialog import ImportRunways
from briefer.tui.forms.plan import plan_scene
from briefer.tui.forms.profile_form import PROFILE_FORM
from briefer.tui.forms.screen import FormScreen
from briefer.tui.forms.store import file_text, target_folder

EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "open-airport-data"
AIRPORTS, RUNWAYS = EXAMPLES / "airports.csv", EXAMPLES / "runways.csv"


@pytest.fixture(autouse=True)
def _config_home(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


async def _open_new_airfield_form(app, pilot) -> FormScreen:
    return await open_new_form(app, pilot, "2", AIRFIELD_FORM)


async def _import(app, pilot, ident: str, airports: Path, runways: Path) -> None:
    await pilot.press("f4")
    await pilot.pause()
    dialog = app.screen
    assert isinstance(dialog, ImportRunways)
    for key, text in (("ident", ident), ("airports", str(airports)), ("runways", str(runways))):
        inp = dialog.query_one(f"#import-{key}")
        inp.value = text
    dialog.query_one("#import-runways").focus()
    await pilot.pause()
    await pilot.press("enter")
    for _ in range(100):                  # read in a thread
        await pilot.pause(0.02)
        if app.screen is not dialog and isinstance(app.screen, FormScreen):
            break


AP = ("approaches", 0)
APPROACH = [
    (AP + ("name",), "VOR-A"), (AP + ("final_course_deg_mag",), "055"),
    (AP + ("map_fix", "name"), "WTB VOR"), (AP + ("map_fix", "from_point"), "ARP"),
    (AP + ("map_fix", "distance_nm"), "0.6"), (AP + ("map_fix", "bearing_deg_mag"), "250"),
    (AP + ("faf", "name"), "WTB5"), (AP + ("faf", "distance_nm"), "5"), (AP + ("faf", "altitude_ft"), "3400"),
    (AP + ("circling", 0, "minimum"), "2400"), (AP + ("circling", 0, "visibility"), "1"),
    (AP + ("circling", 1, "minimum"), "2400"), (AP + ("circling", 1, "visibility"), "1 1/4"),
    (AP + ("circling", 2, "minimum"), "2460"), (AP + ("circling", 2, "visibility"), "2"),
    (AP + ("circling", 3, "minimum"), "NA"), (AP + ("circling", 3, "reason"), "terrain"),
    (AP + ("criteria",), "terps-expanded"),
]


async def test_import_fills_the_form_then_an_approach_is_added_saved_and_briefed():
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _open_new_airfield_form(app, pilot)
        await _import(app, pilot, "w5tb", AIRPORTS, RUNWAYS)
        assert app.screen is screen
        want = import_airfield("W5TB", AIRPORTS, RUNWAYS)
        assert screen._inputs[("ident",)].value == "W5TB"
        rw = screen.texts["runways"]
        assert len(rw) == len(want.mapping["runways"]) == 1          # the closed runway left out
        assert rw[0]["threshold_b"]["lat_deg"] == str(want.mapping["runways"][0]["threshold_b"]["lat_deg"])
        notes = str(screen.query_one("#form-notes").content)
        assert all(n in notes for n in want.notes)
        assert app.focused is screen._inputs[AP + ("name",)]          # the approach comes next
        for _ in range(25):                                             # ... and in view
            await pilot.pause(0.02)
        assert 0 < app.focused.region.y < 22 and app.focused.region.height == 1
        assert "notes above the fields" in screen.status_text
        assert any("World Magnetic Model" in n for n in plan_scene(screen.verdict.built.mapping)[1])
        await type_fields(pilot, APPROACH)
        screen.revalidate()
        assert screen.verdict.ok, (screen.verdict.errors, screen.verdict.required, screen.verdict.general)
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen), screen.status_text
        await settle(app, pilot)
        path = target_folder(KIND_AIRFIELD).folder / "w5tb-wendle-tarn-field.yaml"
        saved = load_airfield(path)
        assert saved.variation_model is not None           # no variation typed: the model's, noted
        th = saved.runways[0].threshold_b
        got = want.mapping["runways"][0]["threshold_b"]
        assert (th.lat_deg, th.lon_deg, th.displaced_threshold_m) == (got["lat_deg"], got["lon_deg"],
                                                                      got["displaced_threshold_m"])
        assert file_text(KIND_AIRFIELD, saved).encode() == path.read_bytes()
        assert (app.inputs.airfield, app.inputs.approach) == ("W5TB", "VOR-A")
        want_request = BriefRequest(profile=app.request.profile, airfield=saved, approach="VOR-A",
                                    landing_runway=app.inputs.landing_runway,
                                    weather=Weather(**app.request.weather.to_mapping()))
        assert brief_json(app.request) == brief_json(want_request)


async def test_values_the_database_lacks_are_flagged_beside_their_fields():
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _open_new_airfield_form(app, pilot)
        await _import(app, pilot, "B6NS", AIRPORTS, RUNWAYS)
        for fpath in (("elevation_ft",), ("runways", 0, "threshold_a", "elevation_ft")):
            assert screen._inputs[fpath].value == ""
            assert message_of(screen, fpath) == MISSING_WORDS, fpath
        assert app.focused is screen._inputs[("elevation_ft",)]          # the first value to type
        assert "2 values to type from the chart" in screen.status_text
        await type_field(pilot, ("elevation_ft",), "165")
        screen.revalidate()
        assert message_of(screen, ("elevation_ft",)) == ""


def _bad_runways(tmp_path: Path) -> Path:
    lines = RUNWAYS.read_text(encoding="utf-8").splitlines()
    lines[1] = lines[1].replace("9184", "9l84")                     # a letter l for a digit 1
    bad = tmp_path / "runways.csv"
    bad.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return bad


async def test_a_bad_csv_file_is_the_importers_file_line_column_message_in_the_dialog(tmp_path):
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _open_new_airfield_form(app, pilot)
        bad = _bad_runways(tmp_path)
        await _import(app, pilot, "Q7HM", AIRPORTS, bad)
        dialog = app.screen
        assert isinstance(dialog, ImportRunways)                 # still open, nothing filled
        message = str(dialog.query_one("#import-message").content)
        assert message == f"✗ {bad}:2:4: length_ft: expected a number, got '9l84'"
        for missing, words in ((tmp_path / "none.csv", "cannot read the file"),):
            dialog.query_one("#import-airports").value = str(missing)
            dialog.query_one("#import-runways").focus()
            await pilot.press("enter")
            for _ in range(50):
                await pilot.pause(0.02)
            assert words in str(dialog.query_one("#import-message").content)
        await pilot.press("escape")
        await pilot.pause()
        assert app.screen is screen and screen.texts["runways"][0]["threshold_a"]["designator"] == ""


async def test_the_aircraft_form_has_no_import():
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "1", PROFILE_FORM)
        await pilot.press("f4")
        await pilot.pause()
        assert app.screen is screen


async def test_keys_typed_right_after_f4_land_in_the_dialogs_fields():
    """F4, the identifier, Tab and the first file typed in one burst (a fast typist, a slow
    link): each lands in its own field of the dialog."""
    from textual import events

    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await _open_new_airfield_form(app, pilot)
        for key, char in [("f4", None), ("W", "W"), ("5", "5"), ("T", "T"), ("B", "B"), ("tab", None),
                          ("a", "a"), ("tab", None), ("r", "r")]:
            event = events.Key(key, char)
            event.set_sender(app)
            app._driver.send_message(event)
        for _ in range(25):
            await pilot.pause(0.02)
        dialog = app.screen
        assert isinstance(dialog, ImportRunways)
        assert [dialog.query_one(f"#import-{k}").value for k in ("ident", "airports", "runways")] == ["W5TB", "a", "r"]
