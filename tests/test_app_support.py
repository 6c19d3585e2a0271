"""Shared helpers for the app tests (no tests here)."""

from __future__ import annotations

import io

from rich.console import Console

from briefer.brief import build_brief, demo_request
from briefer.tui.state import AppCatalog, BriefingInputs, WeatherInputs, request_from_inputs

_CATALOG: AppCatalog | None = None

METAR = "METAR V2RL 121753Z 30012KT 4SM BR BKN012 OVC025 M02/M05 A2990"


def demo_catalog() -> AppCatalog:
    """The built-in demo data only (no user config), loaded once."""
    global _CATALOG
    if _CATALOG is None:
        _CATALOG = AppCatalog.load(use_config=False)
    return _CATALOG


def demo_inputs() -> BriefingInputs:
    r = demo_request()
    wx = r.weather
    return BriefingInputs(profile=r.profile.name, airfield=r.airfield.ident, approach=r.approach,
                          landing_runway=r.landing_runway,
                          weather=WeatherInputs(**{k: getattr(wx, k) for k in (
                              "wind_from_deg", "wind_speed_kt", "wind_gust_kt", "wind_reference", "oat_c",
                              "altimeter_hpa", "visibility_sm", "ceiling_ft")}))


def expected_brief(app):
    """What build_brief gives for the app's current inputs (the app must show the same)."""
    request, report = request_from_inputs(app.inputs, app.catalog)
    return build_brief(request, weather_report=report)


async def settle(app, pilot, *, envelope: bool = False, timeout_s: float = 10.0) -> None:
    """Wait until the brief (and, if asked, the envelope) answers the current inputs."""
    steps = int(timeout_s / 0.02)
    for _ in range(steps):
        await pilot.pause(0.02)
        if app.settled and (not envelope or (app.envelope is not None and app.envelope_request is app.request)):
            await pilot.pause()
            if app.settled:
                return
    raise AssertionError("the app did not settle")


def text_of(widget, width: int = 100) -> str:
    """Plain text of what a Static shows."""
    console = Console(file=io.StringIO(), width=width, color_system=None, legacy_windows=False)
    console.print(widget.content)
    return console.file.getvalue()
