"""The display-units preference (issue 11 item 10): ``--units us|icao`` on `briefer brief`, the
config file's ``display_units`` key, and the app's toggle.

Conversions: NIST SP 811 (2008) Appendix B: 1 statute mile = 1609.344 m, 1 lb = 0.45359237 kg
(exact). Demo case (invented): 31000 lb = 14061.36 kg; reported 3 SM = 4828.03 m, shown in
100 m steps rounded down as 4800 m (ICAO Annex 3 reports visibility below 5 km in 100 m steps);
required 2 1/2 SM = 4023.36 m; altimeter 1009 hPa.
"""

from __future__ import annotations

import json

import pytest
from cli_helpers import run_error

from briefer.cli import main
from briefer.display_units import (altimeter_words, check_units, metric_visibility_words, next_units,
                                   visibility_reported_words, visibility_required_words, weight_words)

DEMO_ICAO = ("14061 kg", "1009 hPa", "4800 m", "2 1/2 SM = 4023 m")


@pytest.fixture(autouse=True)
def _no_user_config(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path / "config-home"))


def _out(capsys, argv: list[str]) -> str:
    assert main(argv) == 0
    return capsys.readouterr().out


def _write_config(tmp_path, text: str):
    folder = tmp_path / "config-home" / "briefer"
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / "config.yaml"
    path.write_text(text)
    return path


def test_formatters_by_set():
    assert weight_words(31000.0, "us") == "31000 lb" and weight_words(31000.0, "icao") == "14061 kg"
    assert altimeter_words(1009.0, "icao") == "1009 hPa"
    assert altimeter_words(1009.0, "us", spec=".1f") == "1009.0 hPa"
    assert visibility_reported_words(3.0, metre_minimums=False, units="us") == "3 SM"
    assert visibility_reported_words(3.0, metre_minimums=False, units="icao") == "4800 m"
    # 5 SM = 8046.72 m -> whole km rounded down; 4000 m exactly stays 4000 m
    assert metric_visibility_words(5.0) == "8 km"
    assert metric_visibility_words(4000.0 / 1609.344) == "4000 m"
    assert metric_visibility_words(None) == "not reported"
    assert visibility_required_words("2 1/2 SM", 2.5, metre_minimums=False, units="icao") == "2 1/2 SM = 4023 m"
    assert visibility_required_words("2 1/2 SM", 2.5, metre_minimums=False, units="us") == "2 1/2 SM"
    assert visibility_required_words("2800 m", 2800 / 1609.344, metre_minimums=True, units="icao") == "2800 m"
    assert check_units(" ICAO ") == "icao" and next_units("us") == "icao" and next_units("icao") == "us"
    with pytest.raises(ValueError):
        check_units("metric")


def test_text_brief_in_icao_units(capsys):
    out = _out(capsys, ["brief", "--demo", "--units", "icao"])
    for words in DEMO_ICAO:
        assert words in out, words
    assert "31000 lb" not in out and "reported 3 SM" not in out
    assert "MDA        1860 ft" in out          # MDA stays in feet


def test_text_brief_default_is_us(capsys):
    default = _out(capsys, ["brief", "--demo"])
    us = _out(capsys, ["brief", "--demo", "--units", "us"])
    assert default == us
    assert "31000 lb" in default and "reported 3 SM" in default and " kg" not in default


def test_json_is_the_same_in_either_set(capsys):
    a = json.loads(_out(capsys, ["brief", "--demo", "--json"]))
    b = json.loads(_out(capsys, ["brief", "--demo", "--json", "--units", "icao"]))
    a.pop("computed_utc", None), b.pop("computed_utc", None)
    assert a == b


def test_text_card_in_icao_units(capsys, tmp_path):
    card = tmp_path / "card.txt"
    _out(capsys, ["brief", "--demo", "--units", "icao", "--out", str(card)])
    text = card.read_text()
    for words in ("14061 kg", "altimeter 1009 hPa", "visibility 4800 m"):
        assert words in text, words
    # the VISIBILITY box: charted 2 1/2 SM, its note wrapped inside the box
    box = " ".join(cell.strip() for line in text.splitlines() if line.startswith(" |")
                   for cell in line.strip().strip("|").split("|")[3:4])
    assert "2 1/2 SM" in box and "= 4023 m; reported 4800 m OK" in " ".join(box.split()), box
    assert "31000 lb" not in text


def test_text_card_default_is_us(capsys, tmp_path):
    card = tmp_path / "card.txt"
    _out(capsys, ["brief", "--demo", "--out", str(card)])
    text = card.read_text()
    assert "31000 lb" in text and "reported 3 SM" in text and " kg" not in text


def test_pdf_card_in_icao_units(capsys, tmp_path):
    pypdf = pytest.importorskip("pypdf")
    card = tmp_path / "card.pdf"
    _out(capsys, ["brief", "--demo", "--units", "icao", "--out", str(card)])
    text = " ".join(" ".join(p.extract_text().split()) for p in pypdf.PdfReader(str(card)).pages)
    for words in ("14061 kg", "1009 hPa", "4800 m"):
        assert words in text, words


def test_config_display_units_is_honoured(capsys, tmp_path):
    _write_config(tmp_path, "display_units: icao\n")
    out = _out(capsys, ["brief", "--demo"])
    assert "14061 kg" in out and "4800 m" in out
    assert "31000 lb" in _out(capsys, ["brief", "--demo", "--units", "us"])   # the option wins


def test_config_bad_display_units_is_one_clear_error(capsys, tmp_path):
    path = _write_config(tmp_path, "profile_dirs: []\ndisplay_units: metric\n")
    line = run_error(capsys, ["brief", "--demo"])
    assert str(path) in line and ":2" in line and "display_units" in line and "metric" in line, line
    assert "us" in line and "icao" in line, line


def test_bad_units_option_is_an_error(capsys):
    line = run_error(capsys, ["brief", "--demo", "--units", "metric"])
    assert "--units" in line, line


async def test_app_switches_display_units_with_u_and_the_palette(tmp_path):
    from test_app_support import demo_catalog, demo_inputs, settle, text_of
    from textual.widgets import Input

    from briefer.tui.app import BriefingApp

    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01)
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        await pilot.press("5")                              # the brief view
        await pilot.pause()
        shown = text_of(app.main.query_one("#brief-full"))
        assert "31000 lb" in shown and "reported 3 SM" in shown
        await pilot.press("u")
        await pilot.pause()
        assert app.main.units == "icao"
        shown = text_of(app.main.query_one("#brief-full"))
        for words in DEMO_ICAO:
            assert words in shown, words
        await pilot.press("4")                              # the weather step
        await pilot.pause()
        weather = text_of(app.main.query_one("#implies-weather"))
        assert "altimeter 1009 hPa" in weather and "4800 m vs 2 1/2 SM = 4023 m" in weather, weather
        await pilot.press("1")
        await pilot.pause()
        assert "14061 kg" in text_of(app.main.query_one("#implies-aircraft"))
        # typing u into a field types a letter, it does not switch the units
        await pilot.press("4")
        await pilot.click("#oat")
        await pilot.press("u")
        assert app.main.units == "icao" and "u" in app.main.query_one("#oat", Input).value
        await pilot.press("escape")
        titles = {c.title: c for c in app.get_system_commands(app.main)}
        assert "Display units (US / ICAO)" in titles
        await titles["Display units (US / ICAO)"].callback()   # what the palette entry runs
        await pilot.pause()
        await pilot.pause()
        assert app.main.units == "us"


async def test_app_card_export_uses_the_display_units(tmp_path):
    from test_app_support import demo_catalog, demo_inputs, settle
    from textual.widgets import Input

    from briefer.tui.app import BriefingApp

    path = tmp_path / "card.txt"
    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.01, units="icao")
    async with app.run_test(size=(100, 40)) as pilot:
        await settle(app, pilot)
        await pilot.press("ctrl+e")
        await pilot.pause()
        app.screen.query_one("#path-input", Input).value = str(path)
        await pilot.press("enter")
        await pilot.pause()
    assert "14061 kg" in path.read_text()
