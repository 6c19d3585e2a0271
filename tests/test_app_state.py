"""The app's state without a terminal: inputs -> request, field parsers, the saved-inputs file."""

from __future__ import annotations

import pytest
from test_app_support import METAR, demo_catalog, demo_inputs

from briefer.errors import DataFileError
from briefer.tui.inputs_file import dump_inputs, inputs_from_bytes, load_inputs, save_inputs
from briefer.tui.state import (
    InputError,
    WeatherInputs,
    parse_altimeter_hpa,
    parse_wind_text,
    request_from_inputs,
)


def test_typed_values_override_the_report():
    inputs = demo_inputs().with_weather(report=METAR)
    inputs = inputs.with_weather(**{k: None for k in ("wind_from_deg", "wind_speed_kt", "wind_gust_kt",
                                                       "altimeter_hpa", "visibility_sm", "ceiling_ft")})
    request, report = request_from_inputs(inputs, demo_catalog())
    assert report is not None
    assert request.weather.wind_speed_kt == 12      # from the report (30012KT)
    assert request.weather.oat_c == 9               # typed (the report says -2)


def test_bad_inputs_name_their_field():
    cat = demo_catalog()
    with pytest.raises(InputError) as e:
        request_from_inputs(demo_inputs().with_weather(report="XX"), cat)
    assert e.value.field == "report"
    with pytest.raises(InputError) as e:
        request_from_inputs(demo_inputs().with_weather(wind_gust_kt=5.0), cat)
    assert e.value.field == "wind"


@pytest.mark.parametrize(("text", "hpa"), [
    ("1013", 1013.0), ("Q0998", 998.0),
    pytest.param("29.92", 29.92 * 33.8638866667, id="inHg"),   # 1 inHg = 33.8639 hPa (units.INHG_TO_HPA)
    pytest.param("A2992", 29.92 * 33.8638866667, id="A-group"),
    ("", None)])
def test_altimeter_in_either_unit(text, hpa):
    got = parse_altimeter_hpa(text)
    assert got == (None if hpa is None else pytest.approx(hpa, rel=1e-6))


@pytest.mark.parametrize("text", ["12", "500", "abc", "Q12345"])
def test_altimeter_rejects_nonsense(text):
    with pytest.raises(ValueError):
        parse_altimeter_hpa(text)


def test_wind_text():
    assert parse_wind_text("250/15G25", "true") == (250.0, 15.0, 25.0)
    assert parse_wind_text("calm", "true") == (None, 0.0, None)
    assert parse_wind_text("", "true") is None
    with pytest.raises(ValueError):
        parse_wind_text("westerly", "true")


def test_file_round_trip(tmp_path):
    inputs = demo_inputs().with_weather(report=METAR, wind_reference="magnetic")
    path = save_inputs(inputs, tmp_path / "b.yaml")
    assert load_inputs(path) == inputs
    assert "kind: briefing-inputs" in dump_inputs(inputs)


@pytest.mark.parametrize(("text", "message"), [
    ("kind: airfield\n", "b.yaml:1: kind: expected kind: briefing-inputs, got 'airfield'"),
    ("kind: briefing-inputs\nprofile: x\nairfield: y\napproach: z\nlanding_runway: '27'\nwether: {}\n",
     "b.yaml:6: wether: unknown key 'wether' (did you mean 'weather'?)"),
    ("kind: briefing-inputs\nprofile: x\nairfield: y\napproach: z\nlanding_runway: '27'\n"
     "weather:\n  oat_c: warm\n", "b.yaml:7: weather.oat_c: expected a number, got 'warm'"),
])
def test_file_errors_name_file_line_and_key(text, message):
    with pytest.raises(DataFileError) as e:
        inputs_from_bytes(text.encode(), file="b.yaml")
    assert str(e.value) == message


def test_weather_explicit_only_typed_values():
    assert WeatherInputs().explicit() == {}
    w = WeatherInputs(wind_speed_kt=0.0)
    assert w.explicit() == {"wind_speed_kt": 0.0, "wind_from_deg": None, "wind_gust_kt": None,
                            "wind_reference": "true"}


def test_app_demo_with_one_weather_option_keeps_the_rest_of_the_demo_weather():
    """Issue 11 item 2, in the app command: `briefer app --demo --wind 090/30` opens on the demo's
    temperature, altimeter, visibility and ceiling (briefer.demo) with the typed wind; `--oat-c -5`
    keeps the demo's wind."""
    from briefer.cli import build_parser
    from briefer.commands.app import inputs_from_args

    p, _ = build_parser()
    _, inputs, _ = inputs_from_args(p.parse_args(["app", "--demo", "--wind", "090/30"]))
    w = inputs.weather
    assert (w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt) == (90.0, 30.0, None)
    assert (w.oat_c, w.altimeter_hpa, w.visibility_sm, w.ceiling_ft) == (9.0, 1009.0, 3.0, 1100.0)
    _, inputs, _ = inputs_from_args(p.parse_args(["app", "--demo", "--oat-c", "-5"]))
    w = inputs.weather
    assert (w.wind_from_deg, w.wind_speed_kt, w.wind_gust_kt, w.oat_c) == (240.0, 10.0, 16.0, -5.0)


def test_app_command_demo_inputs_do_not_import_the_brief():
    # The first frame must not wait for the brief and the core: inputs_from_args for the demo
    # case leaves briefer.brief unimported (checked in a fresh process).
    import subprocess
    import sys

    code = ("import sys; from briefer.cli import build_parser; from briefer.commands.app import inputs_from_args; "
            "p, _ = build_parser(); inputs_from_args(p.parse_args(['app'])); print('briefer.brief' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.split()
    assert out[-1] == "False"


def test_one_reader_of_typed_numbers_fields_and_counts():
    """The weather fields and the instructor's seed and deck size read through one function."""
    from briefer.tui.state import parse_optional_number

    assert parse_optional_number(" ", what="lb", lo=0, hi=10) is None
    assert parse_optional_number("12.5", what="lb", lo=0, hi=20) == 12.5
    with pytest.raises(ValueError, match=r"expected 0 to 10 lb, got 12.5"):
        parse_optional_number("12.5", what="lb", lo=0, hi=10)
    assert parse_optional_number("7", what="", lo=1, hi=50, whole=True) == 7
    with pytest.raises(ValueError, match=r"expected a whole number, got '1.5'"):
        parse_optional_number("1.5", what="", lo=1, hi=50, whole=True)
    with pytest.raises(ValueError, match=r"expected 0 to 2\^63-1, got -2"):
        parse_optional_number("-2", what="", lo=0, hi=2**63 - 1, whole=True, range_words="0 to 2^63-1")


def test_the_briefing_fields_refuse_what_the_model_refuses():
    """The briefing step's typed numbers use the model's declared ranges (briefer.model, the one
    declaration of BriefRequest's and Weather's fields): the weight field accepted 0 to 2,000,000
    lb while a landing weight must be 300 to 1,500,000 lb."""
    from dataclasses import fields

    from briefer.model import BriefRequest, Weather
    from briefer.tui.briefing_screen import NUMBER_FIELDS, number_parser

    declared = {"weight": (BriefRequest, "weight_lb"), "bank": (BriefRequest, "bank_deg"),
                "oat": (Weather, "oat_c"), "visibility": (Weather, "visibility_sm"),
                "ceiling": (Weather, "ceiling_ft")}
    assert set(NUMBER_FIELDS) == set(declared)
    for key, (cls, name) in declared.items():
        rng, _ = NUMBER_FIELDS[key]
        field_range = next(f.metadata["spec"].range for f in fields(cls) if f.name == name)
        assert (rng.lo, rng.hi) == (field_range.lo, field_range.hi), key
        read = number_parser(key)
        assert read(f"{rng.lo:g}") == rng.lo and read(f"{rng.hi:g}") == rng.hi
        with pytest.raises(ValueError):
            read(f"{rng.hi * 1.01 + 1:g}")
    with pytest.raises(ValueError, match="300"):
        number_parser("weight")("100")
