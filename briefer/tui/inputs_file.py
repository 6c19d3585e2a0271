"""The saved-inputs file: our own small YAML format (the BriefRequest's names plus the weather).

    kind: briefing-inputs
    format_version: 1
    profile: demo-bizjet
    configuration: flaps-20        # optional (null: the profile's default)
    airfield: V2RL
    approach: RNAV (GPS) RWY 09
    landing_runway: '27'
    weight_lb: null                # optional
    bank_deg: null                 # optional
    criteria: null                 # optional
    weather:                       # every key optional; values typed by the crew
      report: METAR ...            # the pasted report ('' or absent: none)
      wind_from_deg: 240           # wind_reference: true | magnetic
      ...

Written atomically (`briefer.io.atomic`); read with the safe YAML reader of `briefer.io.yamlload`,
so an error names the file, the line and the key.
"""

from __future__ import annotations

from dataclasses import fields
from os import PathLike
from pathlib import Path
from typing import Any

from briefer.errors import DataFileError
from briefer.model import _describe, did_you_mean
from briefer.tui.state import BriefingInputs, WeatherInputs

KIND = "briefing-inputs"
FORMAT_VERSION = 1
_TOP = ("kind", "format_version", "profile", "configuration", "airfield", "approach", "landing_runway",
        "weight_lb", "bank_deg", "criteria", "weather")
_REQUIRED = ("profile", "airfield", "approach", "landing_runway")
_NUMBERS = ("weight_lb", "bank_deg")
_TEXTS = ("configuration", "criteria")
_WEATHER = tuple(f.name for f in fields(WeatherInputs))


def inputs_to_mapping(inputs: BriefingInputs) -> dict[str, Any]:
    w = inputs.weather
    return {"kind": KIND, "format_version": FORMAT_VERSION, "profile": inputs.profile,
            "configuration": inputs.configuration, "airfield": inputs.airfield, "approach": inputs.approach,
            "landing_runway": inputs.landing_runway, "weight_lb": inputs.weight_lb, "bank_deg": inputs.bank_deg,
            "criteria": inputs.criteria, "weather": {k: getattr(w, k) for k in _WEATHER}}


def dump_inputs(inputs: BriefingInputs) -> str:
    from briefer.io.yamlload import dump_yaml

    return dump_yaml(inputs_to_mapping(inputs))


def save_inputs(inputs: BriefingInputs, path: str | PathLike[str], *, overwrite: bool = True) -> Path:
    """Write the inputs to `path` atomically; raises FileWriteError."""
    from briefer.io.atomic import write_text_atomic

    return write_text_atomic(path, dump_inputs(inputs), overwrite=overwrite)


def _unknown(doc, keys, allowed, where: str) -> None:
    for key in keys:
        if key not in allowed:
            hint = did_you_mean(str(key), allowed) or f" (allowed: {', '.join(allowed)})"
            path = f"{where}.{key}" if where else str(key)
            raise doc.error(f"unknown key '{key}'{hint}", path)


def _ranges() -> dict[str, Any]:
    """The model's plausibility range of every number a saved-inputs file holds (by key)."""
    from briefer import model as m

    return {"weight_lb": m.WEIGHT_LB, "bank_deg": m.BANK_DEG, "wind_from_deg": m.COURSE_DEG,
            "wind_speed_kt": m.WIND_SPEED_KT, "wind_gust_kt": m.WIND_GUST_KT, "oat_c": m.OAT_C,
            "altimeter_hpa": m.ALTIMETER_HPA, "visibility_sm": m.WX_VISIBILITY_SM, "ceiling_ft": m.CEILING_FT}


def _number(doc, value: Any, path: str) -> float | None:
    """A number of the file, checked against the model's range so that an error names the line."""
    import math

    from briefer.model import _fmt

    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise doc.error(f"expected a number, got {_describe(value)}", path)
    number = float(value)
    rng = _ranges().get(path.rpartition(".")[2])
    if not math.isfinite(number):
        raise doc.error(f"expected a finite number, got {_describe(value)}", path)
    if rng is not None and number not in rng:
        raise doc.error(f"expected {_fmt(rng.lo)} to {_fmt(rng.hi)}, got {_describe(value)}", path)
    return number


def _text(doc, value: Any, path: str, *, optional: bool = True) -> str | None:
    if value is None and optional:
        return None
    if isinstance(value, (int, float)) and not isinstance(value, bool) and path == "landing_runway":
        if isinstance(value, float) and not value.is_integer():
            raise doc.error(f"expected a runway designator such as '09' or '27L', got {_describe(value)}", path)
        value = f"{int(value):02d}"
    if not isinstance(value, str) or not value.strip():
        raise doc.error(f"expected text, got {_describe(value)}", path)
    return value.strip()


def inputs_from_bytes(data: bytes, *, file: str) -> BriefingInputs:
    """Parse a saved-inputs file; raises DataFileError naming file, line and key."""
    from briefer.io.yamlload import parse_yaml_mapping

    doc = parse_yaml_mapping(data, file)
    d = doc.data
    _unknown(doc, d, _TOP, "")
    if d.get("kind") != KIND:
        raise doc.error(f"expected kind: {KIND}, got {_describe(d.get('kind'))}", "kind")
    if d.get("format_version", FORMAT_VERSION) != FORMAT_VERSION:
        raise doc.error(f"expected format_version: {FORMAT_VERSION}, got {_describe(d.get('format_version'))}",
                        "format_version")
    for key in _REQUIRED:
        if key not in d:
            raise doc.error(f"missing required key '{key}'", "", locator="")
    kw: dict[str, Any] = {k: _text(doc, d[k], k, optional=False) for k in _REQUIRED}
    kw.update({k: _text(doc, d.get(k), k) for k in _TEXTS})
    kw.update({k: _number(doc, d.get(k), k) for k in _NUMBERS})
    wx = d.get("weather") or {}
    if not isinstance(wx, dict):
        raise doc.error(f"expected a mapping, got {type(wx).__name__}", "weather")
    _unknown(doc, wx, _WEATHER, "weather")
    wkw: dict[str, Any] = {}
    for k, v in wx.items():
        path = f"weather.{k}"
        if k == "report":
            if v is not None and not isinstance(v, str):
                raise doc.error(f"expected text, got {_describe(v)}", path)
            wkw[k] = v or ""
        elif k == "wind_reference":
            if v not in ("true", "magnetic"):
                raise doc.error(f"expected true or magnetic, got {_describe(v)}", path)
            wkw[k] = v
        else:
            wkw[k] = _number(doc, v, path)
    return BriefingInputs(weather=WeatherInputs(**wkw), **kw)


def load_inputs(path: str | PathLike[str]) -> BriefingInputs:
    """Read a saved-inputs file; raises DataFileError."""
    from briefer.io.safefile import read_regular_file

    data = read_regular_file(Path(path).expanduser(), what="a saved-inputs YAML file", name=str(path))
    return inputs_from_bytes(data, file=str(path))
