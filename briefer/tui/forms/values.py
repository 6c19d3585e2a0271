"""What a pilot types in a form field -> the values the data file holds, and back.

Only the form of the text is read here (a number with or without its unit, `1 1/4` statute
miles, `1600m`, `NA`, `south of 09/27`); whether the value is plausible is the loader's business
(`briefer.model`), so text that is not a number at all is passed on as text and the loader says
what it expected. A unit the field does not take is refused here, naming the accepted forms.

No Textual import here.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from briefer._dataclass import dataclass, field
from typing import Any

from briefer import units

UNIT_ALIASES: Mapping[str, tuple[str, ...]] = {
    "ft": ("ft", "feet", "'"),
    "kt": ("kt", "kts", "kn", "knots"),
    "lb": ("lb", "lbs"),
    "NM": ("nm",),
    "SM": ("sm",),
    "m": ("m",),
    "°": ("°", "deg"),
    "°M": ("°m", "°", "m", "deg", "degm"),
    "°T": ("°t", "°", "t", "deg"),
    "°/s": ("°/s", "deg/s", "/s"),
    "": (),
}
"""Accepted suffixes (lower case) of each unit shown beside a field."""

_NUMBER = re.compile(r"\s*([-+]?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d*)?|[-+]?\.\d+)\s*(.*?)\s*")
_FRACTION = re.compile(r"\s*(?:(\d+)\s+)?(\d+)\s*/\s*(\d+)\s*(.*?)\s*")
NOT_AUTHORISED = ("na", "n/a", "nil", "not authorised", "not authorized")
TRUE_WORDS = ("yes", "y", "true", "on")
FALSE_WORDS = ("no", "n", "false", "off")
SIDES = ("north", "east", "south", "west")


class FormTextError(ValueError):
    """Text whose form the field does not take (a unit it does not accept, say)."""


@dataclass(frozen=True, slots=True)
class Read:
    """The file entries one field gives: ``entries`` (key -> value) to put into its mapping."""

    entries: dict[str, Any] = field(default_factory=dict)


def _number(text: str) -> tuple[float | int, str] | None:
    """'093.2' -> (93.2, ''), '7,700 ft' -> (7700, 'ft'), 'abc' -> None."""
    m = _NUMBER.fullmatch(text)
    if not m:
        return None
    raw = m.group(1).replace(",", "")
    value: float | int = float(raw) if ("." in raw) else int(raw)
    return value, m.group(2)


def tidy_number(value: float | int) -> float | int:
    """An integral float as an int (6640.0 -> 6640), so files read as a chart prints them."""
    if isinstance(value, float) and math.isfinite(value) and value.is_integer() and abs(value) < 1e15:
        return int(value)
    return value


def forms_of(unit: str) -> str:
    """'6640 or 6640 ft' for the accepted forms of a unit."""
    aliases = UNIT_ALIASES.get(unit, ())
    return "a number" + (f" or a number with '{aliases[0]}'" if aliases else "")


def read_number(text: str, unit: str, *, alt: Mapping[str, tuple[str, float]] | None = None,
                key: str) -> dict[str, Any]:
    """A number in `unit` (its suffix optional) -> {key: value}; `alt` maps another typed unit to
    (another key, factor) ('m' -> ('length_m', 1)). Text that is not a number goes on as text."""
    t = text.strip()
    if not t:
        return {}
    got = _number(t)
    if got is None:
        return {key: t}
    value, suffix = got
    s = suffix.lower()
    if not s or s in UNIT_ALIASES.get(unit, ()):
        return {key: value}
    for alt_unit, (alt_key, factor) in (alt or {}).items():
        if s in UNIT_ALIASES.get(alt_unit, (alt_unit.lower(),)):
            return {alt_key: tidy_number(value * factor) if factor != 1 else value}
    accepted = [unit] + list(alt or {})
    shown = " or ".join(f"'{u}'" for u in accepted if u)
    raise FormTextError(f"expected a number in {shown or 'no unit'}, got '{t}'")


def read_visibility(text: str) -> dict[str, Any]:
    """'1', '1 1/4', '3/4 SM', '1.25', '1600m', '1600 m' -> visibility_sm or visibility_m.

    A bare number is statute miles up to 10 and metres from 400 (the ranges the file format
    accepts do not overlap)."""
    t = text.strip()
    if not t:
        return {}
    m = _FRACTION.fullmatch(t)
    if m:
        whole, num, den, suffix = m.groups()
        if suffix.lower() not in ("", "sm"):
            raise FormTextError(f"expected statute miles ('1 1/4' or '1 1/4 SM'), got '{t}'")
        if int(den) == 0:
            raise FormTextError(f"expected a fraction such as '3/4', got '{t}'")
        return {"visibility_sm": (int(whole or 0) + int(num) / int(den))}
    got = _number(t)
    if got is None:
        return {"visibility_sm": t}
    value, suffix = got
    s = suffix.lower()
    if s == "sm":
        return {"visibility_sm": value}
    if s in ("m", "meters", "metres"):
        return {"visibility_m": value}
    if s == "km":
        return {"visibility_m": tidy_number(value * units.KM_TO_M)}
    if s:
        raise FormTextError(f"expected SM ('1 1/4', '2 SM') or metres ('1600m'), got '{t}'")
    if value >= 400:
        return {"visibility_m": value}
    if value <= 10:
        return {"visibility_sm": value}
    raise FormTextError(f"expected SM (up to 10) or metres (from 400); write the unit: '{t} SM' or '{t}m'")


def read_minimum(text: str) -> dict[str, Any]:
    """A category's MDA: '6640' (ft) or 'NA' (not authorised)."""
    t = text.strip()
    if t.lower() in NOT_AUTHORISED:
        return {"not_authorised": True}
    return read_number(t, "ft", key="mda_ft")


def read_flag(text: str, key: str) -> dict[str, Any]:
    t = text.strip().lower()
    if not t:
        return {}
    if t in TRUE_WORDS:
        return {key: True}
    if t in FALSE_WORDS:
        return {key: False}
    raise FormTextError(f"expected yes or no, got '{text.strip()}'")


_SIDE_FORM = re.compile(r"\s*(?:na\s+)?(north|east|south|west)\s+of\s+(?:runway\s+|rwy\s+)?(\S+)\s*", re.I)
_BEARING_FORM = re.compile(r"\s*(?:na\s+)?(?:from\s+)?(?:threshold\s+|thr\s+|rwy\s+)?(\S+?)[\s,:]+(\d+(?:\.\d*)?)\s*°?"
                           r"\s*(?:-|to|–)\s*(\d+(?:\.\d*)?)\s*°?\s*m?\s*", re.I)


def read_sector(text: str) -> dict[str, Any]:
    """'south of runway 09/27' (a side of a runway) or '13 040-110' (bearings from threshold 13,
    clockwise, magnetic) -> the sector's keys."""
    t = text.strip()
    if not t:
        return {}
    m = _SIDE_FORM.fullmatch(t)
    if m:
        return {"side": m.group(1).lower(), "runway": m.group(2)}
    m = _BEARING_FORM.fullmatch(t)
    if m:
        return {"threshold": m.group(1), "from_deg_mag": _number(m.group(2))[0],  # type: ignore[index]
                "to_deg_mag": _number(m.group(3))[0]}  # type: ignore[index]
    raise FormTextError(f"expected 'south of 09/27' (side of a runway) or '13 040-110' "
                        f"(bearings from threshold 13, clockwise, °M), got '{t}'")


# --------------------------------------------------------------------------------------------
# Back: file values -> the text a field shows
# --------------------------------------------------------------------------------------------
def number_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (int, float)):
        v = tidy_number(value)
        if isinstance(v, int):
            return str(v)
        short = f"{v:.10g}"
        return short if float(short) == v else repr(v)     # every digit the file holds, read back equal
    return str(value)


def visibility_text(entries: Mapping[str, Any]) -> str:
    if entries.get("visibility_m") is not None:
        return f"{number_text(entries['visibility_m'])}m"
    sm = entries.get("visibility_sm")
    if sm is None:
        return ""
    if isinstance(sm, (int, float)):
        whole, frac = divmod(float(sm), 1.0)
        for den in (2, 4, 8, 16):
            num = frac * den
            if frac and abs(num - round(num)) < 1e-9:
                f = f"{round(num)}/{den}"
                return f"{int(whole)} {f}" if whole else f
    return number_text(sm)


def minimum_text(entries: Mapping[str, Any]) -> str:
    if entries.get("not_authorised"):
        return "NA"
    return number_text(entries.get("mda_ft"))


def sector_text(entries: Mapping[str, Any]) -> str:
    if entries.get("side") is not None or entries.get("runway") is not None:
        return f"{entries.get('side', '')} of {entries.get('runway', '')}".strip()
    if entries.get("threshold") is not None:
        def deg(v: Any) -> str:
            return f"{v:03.0f}" if isinstance(v, (int, float)) and float(v).is_integer() else number_text(v)

        return f"{entries['threshold']} {deg(entries.get('from_deg_mag'))}-{deg(entries.get('to_deg_mag'))}"
    return ""


_VARIATION = re.compile(r"\s*([-+]?\d+(?:\.\d*)?)\s*°?\s*([EW]?)\s*", re.I)


def read_variation(text: str) -> dict[str, Any]:
    """Magnetic variation: '9E', '9° E', '9' (east), '4W', '-4' (west) -> magnetic_variation_deg,
    east positive."""
    t = text.strip()
    if not t:
        return {}
    m = _VARIATION.fullmatch(t)
    if not m:
        got = _number(t)
        if got is None:
            return {"magnetic_variation_deg": t}
        raise FormTextError(f"expected degrees east or west ('9E', '4W', or -4 for west), got '{t}'")
    value = _number(m.group(1))[0]  # type: ignore[index]
    if m.group(2).upper() == "W":
        if value < 0:
            raise FormTextError(f"expected '4W' or -4, not both signs, got '{t}'")
        value = -value
    return {"magnetic_variation_deg": value}


def variation_text(value: Any) -> str:
    if not isinstance(value, (int, float)):
        return number_text(value)
    return f"{number_text(abs(value))}{'W' if value < 0 else 'E'}" if value else "0"
