"""The airfield form: a circling-only approach from an off-field facility typed through the forms
(with the aircraft), saved, and briefed; the brief must equal `build_brief` on the saved files.

References: the loader (`briefer.io.yamlload`, the data-file format of README "Data files") reads
the saved files; `briefer.brief.build_brief` computes the brief the app must show.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest
from forms_support import brief_json, form_app, keys_of, open_new_form, type_fields, wait_until
from test_app_support import settle
from test_forms_profile import NEW_AIRCRAFT

from briefer.io.yamlload import load_airfield, load_profile
from briefer.model import KIND_AIRFIELD, KIND_PROFILE, Airfield, BriefRequest, Weather
from briefer.tui.forms.airfield_form import AIRFIELD_FORM
from briefer.tui.forms.app_hooks import form_loses
from briefer.tui.forms.check import check_texts
from briefer.tui.forms.plan import plan_scene
from briefer.tui.forms.screen import FormScreen, widget_id
from briefer.tui.forms.spec import to_mapping, to_texts
from briefer.tui.forms.store import file_text, save_model, target_folder
from briefer.tui.forms.values import number_text


@pytest.fixture(autouse=True)
def _config_home(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


AP = ("approaches", 0)
NEW_AIRFIELD = [
    (("ident",), "T5ZQ"), (("name",), "Test Ridge"), (("elevation_ft",), "4200"),
    (("magnetic_variation_deg",), "3E"),
    (("runways", 0, "threshold_a", "designator"), "08"), (("runways", 0, "threshold_a", "elevation_ft"), "4200"),
    (("runways", 0, "threshold_b", "designator"), "26"), (("runways", 0, "threshold_b", "elevation_ft"), "4190"),
    (("runways", 0, "heading_deg_mag"), "081.5"), (("runways", 0, "length_ft"), "6500"),
    (AP + ("name",), "VOR-B"), (AP + ("final_course_deg_mag",), "300"),
    (AP + ("map_fix", "name"), "TZR VOR"), (AP + ("map_fix", "from_point"), "08"),
    (AP + ("map_fix", "distance_nm"), "1.2"), (AP + ("map_fix", "bearing_deg_mag"), "200"),
    (AP + ("faf", "name"), "TZR6D"), (AP + ("faf", "distance_nm"), "5.5"), (AP + ("faf", "altitude_ft"), "6000"),
    (AP + ("circling", 0, "minimum"), "4800"), (AP + ("circling", 0, "visibility"), "1"),
    (AP + ("circling", 1, "minimum"), "4800"), (AP + ("circling", 1, "visibility"), "1 1/4"),
    (AP + ("circling", 2, "minimum"), "4900"), (AP + ("circling", 2, "visibility"), "2"),
    (AP + ("circling", 3, "minimum"), "4960"), (AP + ("circling", 3, "visibility"), "3600m"),
    (AP + ("missed_approach",), "Climb to 7000 direct TZR and hold."),
    (AP + ("criteria",), "terps-expanded"),
]
SECTOR = [(AP + ("not_authorised_sectors", 0, "where"), "south of 08/26"),
          (AP + ("not_authorised_sectors", 0, "reason"), "terrain")]


async def test_type_an_airfield_and_an_aircraft_save_both_and_brief_with_them():
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "2", AIRFIELD_FORM)
        await type_fields(pilot, NEW_AIRFIELD)
        add = screen.query_one("#" + widget_id("add", AP + ("not_authorised_sectors",)))
        add.focus()
        await pilot.press("enter")
        for _ in range(20):
            await pilot.pause(0.02)
        await type_fields(pilot, SECTOR)
        screen.revalidate()
        assert screen.verdict.ok, (screen.verdict.errors, screen.verdict.required, screen.verdict.general)
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen)
        await settle(app, pilot)
        assert (app.inputs.airfield, app.inputs.approach) == ("T5ZQ", "VOR-B")

        await pilot.press("1")
        await pilot.pause()
        await pilot.press("f2")
        await pilot.pause()
        await type_fields(pilot, NEW_AIRCRAFT)
        await pilot.press("ctrl+s")
        await pilot.pause()
        await settle(app, pilot)

        airfield = load_airfield(target_folder(KIND_AIRFIELD).folder / "t5zq-test-ridge.yaml")
        profile = load_profile(target_folder(KIND_PROFILE).folder / "test-turboprop.yaml")
        assert airfield.reference_point is None and airfield.runways[0].heading_deg_mag == 81.5
        ap = airfield.approach("VOR-B")
        assert ap.runway is None and ap.map_fix.from_point == "08" and ap.map_fix.bearing_deg_mag == 200
        assert [m.category for m in ap.circling] == ["A", "B", "C", "D"]
        assert ap.circling[1].visibility_sm == 1.25 and ap.circling[3].visibility_m == 3600
        assert ap.not_authorised_sectors[0].side == "south"
        want = BriefRequest(profile=profile, airfield=airfield, approach="VOR-B",
                            landing_runway=app.inputs.landing_runway, weather=Weather(**app.request.weather.to_mapping()))
        assert app.inputs.profile == "test-turboprop"
        assert brief_json(app.request) == brief_json(want)
        # save -> load -> save: the same bytes
        path = target_folder(KIND_AIRFIELD).folder / "t5zq-test-ridge.yaml"
        assert file_text(KIND_AIRFIELD, airfield).encode() == path.read_bytes()


def _q7hm_texts():
    from pathlib import Path

    twin = Path(__file__).parent / "chart_twins" / "q7hm-qorvel-mesa-chart.yaml"
    return to_texts(AIRFIELD_FORM, load_airfield(twin).to_mapping()), load_airfield(twin)


def test_a_chart_form_airfield_reads_back_through_the_form_and_saves_byte_identical(tmp_path):
    texts, model = _q7hm_texts()
    verdict = check_texts(AIRFIELD_FORM, texts)
    assert verdict.ok, (verdict.errors, verdict.general)
    assert verdict.model == model
    path = tmp_path / "q7hm.yaml"
    save_model(KIND_AIRFIELD, verdict.model, path, overwrite=False)
    again = load_airfield(path)
    assert again == model
    assert file_text(KIND_AIRFIELD, again).encode() == path.read_bytes()


@pytest.mark.parametrize(("fpath", "text", "words"), [
    (("runways", 0, "heading_deg_mag"), "400", "between 0 and 360"),
    (("runways", 0, "length_ft"), "9184 NM", "expected a number in 'ft' or 'm'"),
    (("approaches", 1, "map_fix", "bearing_deg_mag"), "north", "got 'north'"),
    (("approaches", 1, "circling", 0, "visibility"), "2 NM", "expected SM"),
    (("elevation_ft",), "99999", "between -1500 and 15000"),
])
def test_every_field_refuses_bad_input_beside_it(fpath, text, words):
    texts, _ = _q7hm_texts()
    cur = texts
    for tok in fpath[:-1]:
        cur = cur[tok]
    cur[fpath[-1]] = text
    verdict = check_texts(AIRFIELD_FORM, texts)
    assert words in verdict.errors[fpath]
    assert verdict.model is None


def test_the_plan_view_moves_with_a_wrong_bearing():
    texts, _ = _q7hm_texts()
    good, _notes = plan_scene(to_mapping(AIRFIELD_FORM, texts).mapping)
    texts["approaches"][1]["map_fix"]["bearing_deg_mag"] = "306.3"        # 180 degrees off
    bad, _notes = plan_scene(to_mapping(AIRFIELD_FORM, texts).mapping)

    def map_label(scene):
        return [i.point for i in scene.items if getattr(i, "text", None) == "M"]

    assert map_label(good) != map_label(bad)


# --- airfields with latitude/longitude (every demo file, every import) --------------------------
DEMO_FILES = sorted((Path(__file__).resolve().parents[1] / "airfields_demo").glob("*.yaml"))


def _positions(mapping) -> list[tuple[str, float]]:
    """Every latitude/longitude of a file mapping, with where it sits."""
    out = []

    def walk(value, where):
        if isinstance(value, dict):
            for k, v in value.items():
                if k in ("lat_deg", "lon_deg"):
                    out.append((f"{where}.{k}", v))
                else:
                    walk(v, f"{where}.{k}")
        elif isinstance(value, list):
            for i, v in enumerate(value):
                walk(v, f"{where}[{i}]")

    walk(mapping, "")
    return out


@pytest.mark.parametrize("path", DEMO_FILES, ids=lambda p: p.stem)
def test_a_latitude_longitude_airfield_reads_back_through_the_form_to_the_last_digit(path, tmp_path):
    """The form shows a file's latitude/longitude and gives them back unchanged: the model the
    form's texts give equals the file's, and save -> load -> save is byte-identical."""
    model = load_airfield(path)
    texts = to_texts(AIRFIELD_FORM, model.to_mapping())
    assert texts["runways"][0]["threshold_a"]["lat_deg"] == number_text(model.runways[0].threshold_a.lat_deg)
    verdict = check_texts(AIRFIELD_FORM, texts)
    assert verdict.ok, (verdict.errors, verdict.required, verdict.general)
    assert verdict.model == model
    assert _positions(verdict.model.to_mapping()) == _positions(model.to_mapping())
    assert form_loses(AIRFIELD_FORM, model.to_mapping(), model) == ""
    out = tmp_path / "again.yaml"
    save_model(KIND_AIRFIELD, verdict.model, out, overwrite=False)
    again = load_airfield(out)
    assert again == model
    assert file_text(KIND_AIRFIELD, again).encode() == out.read_bytes()


def test_an_imported_airfield_reads_back_through_the_form():
    """The import's file (positions to six decimals, no variation: the World Magnetic Model's)."""
    from briefer.io.runway_import import import_airfield
    from briefer.io.yamlload import load_bytes

    root = Path(__file__).resolve().parents[1] / "examples" / "open-airport-data"
    result = import_airfield("W5TB", root / "airports.csv", root / "runways.csv")
    mapping = dict(result.mapping, approaches=[{
        "name": "VOR-A", "final_course_deg_mag": 40, "criteria": "terps-legacy",
        "faf": {"name": "F1", "distance_nm": 5, "altitude_ft": 3500},
        "map_fix": {"name": "M1", "threshold": "04"}, "circling": {"A": {"mda_ft": 2400, "visibility_sm": 1}}}])
    model = Airfield.from_mapping(mapping)
    assert model.variation_model is not None and model.runways[0].threshold_b.displaced_threshold_m
    texts = to_texts(AIRFIELD_FORM, model.to_mapping())
    assert texts["magnetic_variation_deg"] == ""                # still the model's, as the file says
    verdict = check_texts(AIRFIELD_FORM, texts)
    assert verdict.ok and verdict.model == model
    assert _positions(verdict.model.to_mapping()) == _positions(mapping)
    text = file_text(KIND_AIRFIELD, verdict.model)
    assert file_text(KIND_AIRFIELD, load_bytes(text.encode(), file="x.yaml", expected_kind=KIND_AIRFIELD)) == text


def test_the_form_shows_latitude_longitude_only_where_the_file_has_them():
    """Latitude/longitude lines where a file has them; the chart's placement lines (heading,
    length, distances and bearings) where it has those (or nothing yet)."""
    from briefer.tui.forms.screen import _child
    from briefer.tui.forms.spec import shown

    runway = _child(AIRFIELD_FORM.items, "runways")
    threshold = _child(runway.items, "threshold_a")
    lat = _child(threshold.items, "lat_deg")
    heading, position, crossing = (_child(runway.items, k) for k in ("heading_deg_mag", "position", "crossing"))
    assert shown(lat, {"lat_deg": "36.933184"}) and not shown(lat, {"lat_deg": ""})
    by_coordinates = {"threshold_a": {"lat_deg": "36.933184"}, "heading_deg_mag": "", "position": {}, "crossing": []}
    assert not any(shown(i, by_coordinates) for i in (heading, position, crossing))
    by_chart = {"threshold_a": {"lat_deg": ""}, "heading_deg_mag": "", "position": {}, "crossing": []}
    assert all(shown(i, by_chart) for i in (heading, position, crossing))
    both = dict(by_coordinates, heading_deg_mag="131")         # never hide what holds text
    assert shown(heading, both)


async def test_edit_a_latitude_longitude_airfield_add_an_approach_and_brief_it():
    """F3 on a demo airfield given by latitude/longitude opens it; an approach typed from the
    chart is added; the saved file keeps every latitude/longitude and the brief uses the new
    approach."""
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press("2")
        await pilot.pause()
        app.inputs = replace(app.inputs, airfield="Q7HM", approach="VOR-A", landing_runway="31")
        await settle(app, pilot)
        await pilot.press("f3")
        await pilot.pause()
        screen = app.screen
        assert isinstance(screen, FormScreen), "F3 did not open the form"
        lat = screen._inputs[("runways", 0, "threshold_a", "lat_deg")]
        assert lat.value == "36.933184"
        assert ("approaches", 0, "map_fix", "distance_nm") not in screen._inputs    # a MAP by lat/lon
        n = len(screen.texts["approaches"])
        add = screen.query_one("#" + widget_id("add", ("approaches",)))
        add.focus()
        await pilot.press("enter")
        await pilot.pause()
        ap = ("approaches", n)
        assert (ap + ("map_fix", "lat_deg")) not in screen._inputs     # a new approach: chart numbers
        assert (ap + ("map_fix", "distance_nm")) in screen._inputs
        await type_fields(pilot, [
            (ap + ("name",), "NDB-C"), (ap + ("final_course_deg_mag",), "130"),
            (ap + ("map_fix", "name"), "QMN NDB"), (ap + ("map_fix", "from_point"), "ARP"),
            (ap + ("map_fix", "distance_nm"), "0.8"), (ap + ("map_fix", "bearing_deg_mag"), "300"),
            (ap + ("faf", "name"), "QMN5"), (ap + ("faf", "distance_nm"), "5"),
            (ap + ("faf", "altitude_ft"), "7800"),
            (ap + ("circling", 0, "minimum"), "6700"), (ap + ("circling", 0, "visibility"), "1"),
            (ap + ("circling", 1, "minimum"), "6700"), (ap + ("circling", 1, "visibility"), "1 1/4"),
            (ap + ("circling", 2, "minimum"), "6760"), (ap + ("circling", 2, "visibility"), "2"),
            (ap + ("circling", 3, "minimum"), "NA"), (ap + ("circling", 3, "reason"), "terrain"),
            (ap + ("criteria",), "terps-legacy"),
        ])
        screen.revalidate()
        assert screen.verdict.ok, (screen.verdict.errors, screen.verdict.required, screen.verdict.general)
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen), screen.status_text
        await settle(app, pilot)
        path = target_folder(KIND_AIRFIELD).folder / "q7hm-qorvel-mesa.yaml"
        saved = load_airfield(path)
        demo = load_airfield(DEMO_FILES[0])
        assert _positions(saved.to_mapping()) == _positions(demo.to_mapping())      # to the last digit
        assert saved.approaches[:n] == demo.approaches and saved.approaches[n].name == "NDB-C"
        assert file_text(KIND_AIRFIELD, saved).encode() == path.read_bytes()
        assert (app.inputs.airfield, app.inputs.approach) == ("Q7HM", "NDB-C")
        assert app.request.airfield == saved


def _burst(app, text: str) -> None:
    """Keys as a fast typist or a slow link delivers them: all queued at once, before the app
    has handled the first (the Pilot's own press waits for each)."""
    from textual import events

    for char, key in zip(text, keys_of(text)):
        key = "enter" if char == "\r" else key
        event = events.Key(key, char if char.isprintable() else None)
        event.set_sender(app)
        app._driver.send_message(event)


async def test_keys_typed_right_after_enter_on_add_land_in_the_new_row():
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "2", AIRFIELD_FORM)
        rpath = AP + ("not_authorised_sectors",)
        screen.query_one("#" + widget_id("add", rpath)).focus()
        await pilot.pause()
        _burst(app, "\rsouth of 08/26\tterrain")
        for _ in range(25):
            await pilot.pause(0.02)
        assert screen.texts["approaches"][0]["not_authorised_sectors"] == [
            {"where": "south of 08/26", "reason": "terrain"}]
        # the same after ctrl+n in a group, and on an item of fields (a runway)
        screen.query_one("#" + widget_id("add", ("runways",))).focus()
        await pilot.pause()
        _burst(app, "\r18\t")
        for _ in range(25):
            await pilot.pause(0.02)
        assert screen.texts["runways"][1]["threshold_a"]["designator"] == "18"


async def test_a_second_runway_placed_where_the_centrelines_cross():
    """The airport diagram's 'runway 18 crosses 09/27 3000 ft from threshold 08, 2000 ft from
    threshold 18', typed into the crossing rows, places the runway as the file form does
    (`briefer.core.layout.crossing_threshold`)."""
    from briefer.core.layout import crossing_threshold

    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await open_new_form(app, pilot, "2", AIRFIELD_FORM)
        await type_fields(pilot, NEW_AIRFIELD)
        screen.query_one("#" + widget_id("add", ("runways",))).focus()
        await pilot.press("enter")
        await pilot.pause()
        rw = ("runways", 1)
        await type_fields(pilot, [
            (rw + ("threshold_a", "designator"), "18"), (rw + ("threshold_a", "elevation_ft"), "4195"),
            (rw + ("threshold_b", "designator"), "36"), (rw + ("threshold_b", "elevation_ft"), "4185"),
            (rw + ("heading_deg_mag",), "175"), (rw + ("length_ft",), "5000")])
        for _ in range(2):
            screen.query_one("#" + widget_id("add", rw + ("crossing",))).focus()
            await pilot.press("enter")
            await pilot.pause()
        await type_fields(pilot, [
            (rw + ("crossing", 0, "threshold"), "08"), (rw + ("crossing", 0, "distance_ft"), "3000"),
            (rw + ("crossing", 1, "threshold"), "18"), (rw + ("crossing", 1, "distance_ft"), "610 m")])
        screen.revalidate()
        assert screen.verdict.ok, (screen.verdict.errors, screen.verdict.required, screen.verdict.general)
        model = screen.verdict.model
        crossing = model.runways[1].crossing
        assert [(c.threshold, c.distance_ft, c.distance_m) for c in crossing] == [("08", 3000, None),
                                                                                  ("18", None, 610)]
        lay = model.layout
        want = crossing_threshold(lay.thresholds_m["08"], lay.headings_deg["08"], 3000 * 0.3048,
                                  (175 + 3) % 360, 610)
        assert lay.thresholds_m["18"] == pytest.approx(want, abs=0.5)
        assert "runway 2" not in " ".join(plan_scene(screen.verdict.built.mapping)[1])      # drawn
        # the file form reads back through the form (nothing lost)
        texts = to_texts(AIRFIELD_FORM, model.to_mapping())
        assert check_texts(AIRFIELD_FORM, texts).model == model


async def test_a_saved_file_is_briefed_even_when_a_brief_was_being_built_with_the_old_one():
    """The form saves while the brief of the same names is being built from the file as it was:
    that brief must not be the last word (the app builds one brief at a time)."""
    from briefer.tui.forms.app_hooks import _catalog_with
    from briefer.tui.forms.screen import Saved

    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        old_request, old_brief, inputs = app.request, app.brief, app.inputs
        changed = replace(old_request.airfield, elevation_ft=old_request.airfield.elevation_ft + 10)
        app.computing = True                      # a brief of these inputs is on its way
        app.use_catalog(_catalog_with(app.catalog, Saved(KIND_AIRFIELD, changed, Path("x.yaml"))), inputs)
        app._brief_done(inputs, old_request, old_brief)      # ... and arrives, built from the old file
        await settle(app, pilot)
        assert app.request.airfield.elevation_ft == changed.elevation_ft


def test_cross_field_messages_of_several_approaches_and_obstacles_show_at_once():
    """The loader stops at its first error; the form shows each approach's and obstacle's own."""
    texts, _ = _q7hm_texts()
    texts["approaches"][0]["map_fix"]["threshold"] = "04"                 # no threshold 04 here
    texts["approaches"][1]["map_fix"]["distance_nm"] = "40"               # a MAP 40 NM away
    texts["approaches"][1]["map_fix"]["distance_ft"] = ""
    texts["obstacles"][2]["from_point"] = "22"                            # no threshold 22 either
    verdict = check_texts(AIRFIELD_FORM, texts)
    where = {p[:2] for p in verdict.errors}
    assert {("approaches", 0), ("approaches", 1), ("obstacles", 2)} <= where, verdict.errors
    assert "04" in verdict.errors[("approaches", 0, "map_fix", "threshold")]
    assert "22" in verdict.errors[("obstacles", 2, "from_point")]
    assert verdict.model is None


@pytest.mark.parametrize("key", ["f2", "f3"])
async def test_escape_on_an_untouched_airfield_form_closes_it_without_asking(key):
    app = form_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press("2")
        await pilot.pause()
        await pilot.press(key)
        await pilot.pause()
        assert isinstance(app.screen, FormScreen)
        assert not app.screen.dirty
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, FormScreen), type(app.screen).__name__


async def test_clearing_a_runways_latitude_longitude_shows_its_chart_lines_at_once():
    """A runway given by latitude/longitude has no heading or length lines (the coordinates place
    it). Clearing its latitude and longitude showed those lines only after the form was closed
    and opened again; now they appear once typing pauses, the cleared lines stay and the cursor
    stays in the field typed."""
    import yaml
    from textual.app import App

    mapping = yaml.safe_load((Path(__file__).parent.parent / "airfields_demo" / "q7hm-qorvel-mesa.yaml")
                             .read_text(encoding="utf-8"))
    mapping.update(runways=mapping["runways"][:1], approaches=[], obstacles=[])
    screen = FormScreen(AIRFIELD_FORM, mapping=mapping)

    class Host(App):
        def on_mount(self) -> None:
            self.push_screen(screen)

    rw = ("runways", 0)
    async with Host().run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        assert rw + ("heading_deg_mag",) not in screen._inputs        # placed by its coordinates
        await type_fields(pilot, [(rw + ("threshold_a", "lat_deg"), ""), (rw + ("threshold_a", "lon_deg"), "")])
        await pilot.pause(0.3)                                           # typing pauses: checked
        await wait_until(pilot, lambda: rw + ("length_ft",) in screen._inputs)   # the box rebuilt
        await pilot.pause()
        for key in ("heading_deg_mag", "length_ft"):
            assert rw + (key,) in screen._inputs, f"no {key} line after the coordinates were cleared"
        assert rw + ("threshold_a", "lat_deg") in screen._inputs           # the cleared lines stay
        assert screen.focused is screen._inputs[rw + ("threshold_a", "lon_deg")]
        # the status line names the item at fault (it read '1 to fix - : missing lat_deg ...')
        assert "1 to fix - Runway 1" in screen.status_text and " - :" not in screen.status_text
        await type_fields(pilot, [(rw + ("heading_deg_mag",), "131"), (rw + ("length_ft",), "8000")])
        assert screen.texts["runways"][0]["heading_deg_mag"] == "131"
