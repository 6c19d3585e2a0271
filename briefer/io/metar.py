"""METAR/SPECI decoder: the groups a circling briefing needs, decoded without guessing.

`decode_metar(text)` is pure (no I/O) and returns a frozen `MetarReport`. Every group is either
decoded, recognised and kept as text (RVR, present weather, trend, remarks), or listed in
`MetarReport.skipped` with the reason. Groups coded as missing (slashes, ``M/M``) decode to
``None``, never to zero. A report that cannot be decoded at all raises `MetarError`, and no other
exception leaves `decode_metar` whatever the input string.

Code forms (summarised in docs/REFERENCES.md §10):

* header ``METAR|SPECI [COR] CCCC ddhhmmZ [AUTO] [COR] [NIL]`` [2]_, [3]_;
* wind ``dddff(f)[Gfmfm(fm)]KT|MPS|KMH``, ``VRBffKT``, calm ``00000KT``, variable sector
  ``dddVddd``; direction from true north [1]_, [3]_;
* visibility in statute miles with fractions (``1 1/2SM``, ``M1/4SM`` less than, ``P6SM``
  more than) [1]_, [2]_ or in metres (``0800``; ``9999`` = 10 km or more, ``0000`` = less than
  50 m), with an optional directional minimum (``1500SW``) [3]_; ``CAVOK`` [3]_;
* RVR ``Rdd[LCR]/...``, present weather, recent weather ``RE..`` and wind shear ``WS ..`` (text);
* cloud ``FEW|SCT|BKN|OVC hhh [CB|TCU]``, ``VVhhh``, ``SKC|CLR|NSC|NCD``; heights in hundreds of
  feet above ground; the ceiling is the lowest layer reported as broken, overcast or the vertical
  visibility into an obscuration [2]_;
* temperature/dew point ``TT/TdTd`` in whole degrees Celsius, ``M`` = minus [3]_;
* altimeter ``Aaaaa`` (hundredths of inHg) or ``Qpppp`` (whole hPa) [1]_, [3]_;
* trend (``NOSIG``, ``BECMG``, ``TEMPO`` and what follows up to ``RMK``) and remarks are kept as
  text and never change the decoded observation.

References
----------
.. [1] FAA, Aeronautical Information Manual, ch. 7 §1, "Key to aviation routine weather report
   (METAR) and aerodrome forecasts (TAF)".
.. [2] Office of the Federal Coordinator for Meteorology, Federal Meteorological Handbook No. 1,
   "Surface Weather Observations and Reports", ch. 9 (sky condition; §9.3 d ceiling) and ch. 12
   (coding).
.. [3] WMO, Manual on Codes, WMO-No. 306, Vol. I.1, Part A, FM 15 METAR / FM 16 SPECI.
"""

from __future__ import annotations

import re
import string
from briefer._dataclass import dataclass, field
from fractions import Fraction
from typing import Any

from briefer.errors import BriefingError
from briefer.safetext import escape_text
from briefer.units import (
    HPA_TO_INHG,
    INHG_TO_HPA,
    KM_TO_M,
    KMH_TO_MPS,
    M_TO_SM,
    MPS_TO_KT,
    SM_TO_M,
)

__all__ = [
    "CloudLayer",
    "MetarError",
    "MetarReport",
    "decode_metar",
    "weather_from_metar",
]


class MetarError(BriefingError, ValueError):
    """A METAR that cannot be decoded at all; the message names the group that failed.

    Attributes:
        group: the offending group as written (``None`` for an empty report).
    """

    def __init__(self, message: str, *, group: str | None = None) -> None:
        self.group = group
        super().__init__(message)


# --- constants of the code -----------------------------------------------------------------
CEILING_AMOUNTS = frozenset({"BKN", "OVC", "VV"})          # FMH-1 §9.3 d
CLOUD_FREE_CODES = frozenset({"SKC", "CLR", "NSC", "NCD"})
TREND_STARTS = frozenset({"NOSIG", "BECMG", "TEMPO"})
CLOUD_HEIGHT_UNIT_FT = 100.0        # cloud heights are coded in hundreds of feet
ALTIMETER_A_PER_INHG = 100         # Aaaaa: hundredths of inHg
CAVOK_VISIBILITY_M = 10.0 * KM_TO_M  # CAVOK and 9999: 10 km or more (FM 15)
METRIC_NIL_VISIBILITY_M = 50.0       # 0000: less than 50 m (FM 15)
SM_FRACTION_DENOMINATORS = frozenset({2, 4, 8, 16})
# Plausibility bounds for a station's altimeter setting. The lowest and highest sea-level
# pressures on record are about 870 and 1084 hPa (from memory); outside these bounds the group is
# taken as garbled and skipped rather than believed.
# Plausibility bounds for temperature and wind: the extreme surface temperatures on record are
# about -89 and +57 degC and the strongest measured surface gusts about 220 kt (from memory); a
# group beyond these bounds is taken as garbled, flagged and skipped rather than believed.
TEMPERATURE_MIN_C = -90.0
TEMPERATURE_MAX_C = 60.0
WIND_MAX_KT = 250.0
ALTIMETER_MIN_HPA = 850.0
ALTIMETER_MAX_HPA = 1100.0
_MAX_GROUP_IN_MESSAGE = 40

_SPEED_UNIT_TO_KT = {"KT": 1.0, "MPS": MPS_TO_KT, "KMH": KMH_TO_MPS * MPS_TO_KT}
_ASCII_UPPER = str.maketrans(string.ascii_lowercase, string.ascii_uppercase)


def _rx(pattern: str) -> re.Pattern[str]:
    """Compile a group pattern; ASCII only, so that no other script's digits decode."""
    return re.compile(pattern, re.ASCII)


_STATION_RE = _rx(r"[A-Z][A-Z0-9]{3}")
_TIME_RE = _rx(r"(\d{2})(\d{2})(\d{2})Z")
_WIND_RE = _rx(
    r"(?P<dir>\d{3}|VRB|///)(?P<spd>\d{2,3}|//)(?:G(?P<gust>\d{2,3}|//))?(?P<unit>KT|MPS|KMH)")
_VARIABLE_SECTOR_RE = _rx(r"(\d{3})V(\d{3})")
_SM_RE = _rx(r"(?P<q>[MP])?(?:(?P<whole>\d{1,2}) )?(?:(?P<num>\d{1,2})/(?P<den>\d{1,2})|"
             r"(?P<int>\d{1,2}))SM")
_SM_WHOLE_RE = _rx(r"\d{1,2}")
_SM_FRACTION_RE = _rx(r"\d{1,2}/\d{1,2}SM")
_METRIC_VIS_RE = _rx(r"(\d{4})(NDV)?")
_DIRECTIONAL_VIS_RE = _rx(r"(\d{4})(N|NE|E|SE|S|SW|W|NW)")
_RVR_RE = _rx(r"R\d{2}[LCR]?/(?:[PM]?\d{4}(?:V[PM]?\d{4})?(?:FT)?/?[UDN]?|/{4,}(?:FT)?)")
_PHENOMENA = "DZ|RA|SN|SG|IC|PL|GR|GS|UP|BR|FG|FU|VA|DU|SA|HZ|PY|PO|SQ|FC|SS|DS"
_DESCRIPTORS = "MI|BC|PR|DR|BL|SH|TS|FZ"
_WEATHER_RE = _rx(rf"(?P<int>[-+]|VC)?(?P<desc>{_DESCRIPTORS})?(?P<ph>(?:{_PHENOMENA})*)")
_RECENT_WEATHER_RE = _rx(rf"RE(?:{_DESCRIPTORS})?(?:{_PHENOMENA})*")
_CLOUD_RE = _rx(r"(?P<amt>FEW|SCT|BKN|OVC|///)(?P<h>\d{3}|///)(?P<type>CB|TCU|///)?")
_VV_RE = _rx(r"VV(?P<h>\d{3}|///)")
_TEMP_RE = _rx(r"(?P<t>M?\d{2}|M|//)/(?P<d>M?\d{2}|M|//)?")
_ALTIMETER_RE = _rx(r"(?P<u>[AQ])(?P<v>\d{4}|////)")
_RUNWAY_RE = _rx(r"R(?:WY)?\d{2}[LCR]?")


# --- the result ----------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class CloudLayer:
    """One cloud group. ``None`` parts were coded as slashes (not reported).

    Attributes:
        group: the group as written, e.g. ``"BKN011"``.
        amount: ``FEW``, ``SCT``, ``BKN``, ``OVC`` or ``VV`` (vertical visibility).
        height_ft: base (or vertical visibility) above ground [ft].
        cloud_type: ``CB`` or ``TCU``.
    """

    group: str
    amount: str | None
    height_ft: float | None
    cloud_type: str | None = None

    def __post_init__(self) -> None:
        if self.amount is not None and self.amount not in {"FEW", "SCT", "BKN", "OVC", "VV"}:
            raise MetarError(f"cloud amount {self.amount!r} is not FEW, SCT, BKN, OVC or VV")
        if self.height_ft is not None and self.height_ft < 0:
            raise MetarError(f"cloud height {self.height_ft} ft is negative")

    @property
    def forms_ceiling(self) -> bool:
        """Broken, overcast or vertical visibility (FMH-1 ch. 9 §9.3 d)."""
        return self.amount in CEILING_AMOUNTS


@dataclass(frozen=True, slots=True, kw_only=True)
class MetarReport:
    """A decoded METAR or SPECI. ``None`` means "not reported" (never zero).

    Directions are from true north [deg]. ``wind_speed_as_reported`` and
    ``wind_gust_as_reported`` are in ``wind_unit`` (KT, MPS or KMH); the ``_kt`` fields are
    converted. ``visibility_is_less_than`` (``M1/4SM``, ``0000``) and ``visibility_is_at_least``
    (``P6SM``, ``9999``, ``CAVOK``) qualify both visibility fields. ``ceiling_ft`` is the lowest
    BKN/OVC/VV layer with a reported height; ``ceiling_may_be_lower`` is True when the sky was
    not reported, or a layer that is or could be a ceiling lies below it without an amount or
    height, so that ``None`` or the value given must not be read as "no lower ceiling".
    """

    raw: str
    station: str
    report_type: str | None = None          # "METAR" or "SPECI"; None if the word is absent
    observed_day_of_month: int | None = None
    observed_hour_utc: int | None = None
    observed_minute_utc: int | None = None
    auto: bool = False
    corrected: bool = False
    nil: bool = False

    wind_from_deg_true: float | None = None  # None when calm, VRB or not reported
    wind_is_variable: bool = False           # VRB
    wind_is_calm: bool = False               # 00000KT
    wind_speed_kt: float | None = None
    wind_gust_kt: float | None = None
    wind_unit: str | None = None
    wind_speed_as_reported: float | None = None
    wind_gust_as_reported: float | None = None
    wind_variable_from_deg: float | None = None   # dddVddd, true
    wind_variable_to_deg: float | None = None

    visibility_group: str | None = None
    visibility_m: float | None = None
    visibility_sm: float | None = None
    visibility_is_less_than: bool = False
    visibility_is_at_least: bool = False
    visibility_minimum_m: float | None = None
    visibility_minimum_direction: str | None = None
    cavok: bool = False

    rvr: tuple[str, ...] = ()
    present_weather: tuple[str, ...] | None = ()  # None: coded "//" (not observable)
    clouds: tuple[CloudLayer, ...] = ()
    cloud_free_code: str | None = None       # SKC, CLR, NSC or NCD
    ceiling_ft: float | None = None
    ceiling_may_be_lower: bool = False

    temperature_c: float | None = None
    dew_point_c: float | None = None
    altimeter_inhg: float | None = None
    altimeter_hpa: float | None = None
    altimeter_unit: str | None = None        # the unit reported: "inHg" (A) or "hPa" (Q)

    recent_weather: tuple[str, ...] = ()
    wind_shear: tuple[str, ...] = ()
    trend: str | None = None
    remarks: str | None = None
    skipped: tuple[tuple[str, str], ...] = field(default=())

    def __post_init__(self) -> None:
        if self.visibility_is_less_than and self.visibility_is_at_least:
            raise MetarError("visibility cannot be both 'less than' and 'at least'")
        if self.wind_from_deg_true is not None and not 0.0 < self.wind_from_deg_true <= 360.0:
            raise MetarError(f"wind direction {self.wind_from_deg_true} deg outside (0, 360]")
        if (self.wind_gust_kt is not None and self.wind_speed_kt is not None
                and self.wind_gust_kt <= self.wind_speed_kt):
            raise MetarError(f"gust {self.wind_gust_kt} kt not above mean {self.wind_speed_kt} kt")
        for name in ("wind_speed_kt", "wind_gust_kt", "visibility_m", "visibility_sm", "ceiling_ft"):
            value = getattr(self, name)
            if value is not None and value < 0:
                raise MetarError(f"{name} = {value} is negative")

    def to_mapping(self) -> dict[str, Any]:
        """Plain JSON-ready mapping; keys are the field names (they carry units)."""
        out: dict[str, Any] = {}
        for name in self.__dataclass_fields__:
            value = getattr(self, name)
            if name == "clouds":
                value = [{"group": c.group, "amount": c.amount, "height_ft": c.height_ft,
                          "cloud_type": c.cloud_type} for c in value]
            elif name == "skipped":
                value = [{"group": g, "reason": r} for g, r in value]
            elif isinstance(value, tuple):
                value = list(value)
            out[name] = value
        return out


def weather_from_metar(report: MetarReport) -> dict[str, Any]:
    """The briefing's weather inputs from a decoded report, as a plain dict.

    Keys: ``wind_from_deg`` (true; None when calm, VRB or not reported), ``wind_speed_kt``,
    ``wind_gust_kt``, ``wind_reference`` (always ``"true"``), ``oat_c``, ``altimeter_hpa``,
    ``visibility_sm``, ``ceiling_ft``. ``None`` where not reported. Two readings need the report
    itself: ``visibility_sm`` is a bound when ``report.visibility_is_less_than`` or
    ``report.visibility_is_at_least``; ``ceiling_ft`` None means "no ceiling reported", which is
    not "no ceiling" when ``report.ceiling_may_be_lower``. A wind group whose mean speed is not
    reported (``270//KT``) gives no wind at all: a direction or gust alone cannot be used.
    """
    speed_kt = report.wind_speed_kt
    return {
        "wind_from_deg": None if speed_kt is None else report.wind_from_deg_true,
        "wind_speed_kt": speed_kt,
        "wind_gust_kt": None if speed_kt is None else report.wind_gust_kt,
        "wind_reference": "true",
        "oat_c": report.temperature_c,
        "altimeter_hpa": report.altimeter_hpa,
        "visibility_sm": report.visibility_sm,
        "ceiling_ft": report.ceiling_ft,
    }


# --- the decoder ---------------------------------------------------------------------------
def _quote(group: str) -> str:
    if len(group) > _MAX_GROUP_IN_MESSAGE:
        group = group[:_MAX_GROUP_IN_MESSAGE] + "..."
    return repr(group)


class _Skip(Exception):
    """A recognised group whose content is invalid; the reason goes into `skipped`."""


class _Decoder:
    """One pass over the groups of one report (internal)."""

    def __init__(self, raw: str, groups: list[str]) -> None:
        self.raw = raw
        self.groups = groups
        self.i = 0
        self.f: dict[str, Any] = {}
        self.skipped: list[tuple[str, str]] = []
        self.decoded = 0
        self.rvr: list[str] = []
        self.weather: list[str] = []
        self.weather_not_observable = False
        self.clouds: list[CloudLayer] = []
        self.recent: list[str] = []
        self.shear: list[str] = []

    # -- helpers
    def skip(self, group: str, reason: str) -> None:
        self.skipped.append((group, reason))

    def peek(self, k: int = 0) -> str | None:
        j = self.i + k
        return self.groups[j] if j < len(self.groups) else None

    # -- header
    def header(self) -> None:
        g = self.groups
        if g and g[0] in ("METAR", "SPECI"):
            self.f["report_type"] = g[0]
            self.i = 1
        if self.peek() == "COR":
            self.f["corrected"] = True
            self.i += 1
        station = self.peek()
        if station is None:
            raise MetarError("cannot decode METAR: the report ends before the station identifier",
                             group=g[-1] if g else None)
        if not _STATION_RE.fullmatch(station) or station == "AUTO":
            raise MetarError(f"cannot decode METAR: no station identifier (four letters or "
                             f"digits, first a letter) where expected: group {_quote(station)}",
                             group=station)
        self.f["station"] = station
        self.i += 1
        while (tok := self.peek()) is not None:
            if m := _TIME_RE.fullmatch(tok):
                if "observed_day_of_month" in self.f:
                    self.skip(tok, "second day/time group; the first is kept")
                else:
                    self.time(tok, m)
            elif tok == "AUTO":
                self.f["auto"] = True
            elif tok == "COR":
                self.f["corrected"] = True
            elif tok == "NIL":
                self.f["nil"] = True
            else:
                break
            self.i += 1

    def time(self, tok: str, m: re.Match[str]) -> None:
        day, hour, minute = (int(x) for x in m.groups())
        if not 1 <= day <= 31:
            self.skip(tok, f"day {day} outside 1-31")
        elif hour > 23 or minute > 59:
            self.skip(tok, f"time {hour:02d}{minute:02d}Z is not a valid UTC time")
        else:
            self.f.update(observed_day_of_month=day, observed_hour_utc=hour,
                          observed_minute_utc=minute)

    # -- body
    def body(self) -> None:
        while (tok := self.peek()) is not None:
            if tok in ("METAR", "SPECI") or _TIME_RE.fullmatch(tok):
                raise MetarError(f"cannot decode METAR: a second report starts at group {_quote(tok)}; "
                                 "give one report at a time", group=tok)
            if tok == "RMK":
                rest = self.groups[self.i + 1:]
                self.f["remarks"] = " ".join(rest)
                return
            if tok in TREND_STARTS:
                end = self.groups.index("RMK", self.i) if "RMK" in self.groups[self.i:] else len(self.groups)
                self.f["trend"] = " ".join(self.groups[self.i:end])
                self.i = end
                continue
            try:
                used = self.group(tok)
            except _Skip as exc:
                self.skip(tok, str(exc))
                used = 1
            else:
                if used == 0:
                    self.skip(tok, "unrecognised group")
                    used = 1
            self.i += used

    def group(self, tok: str) -> int:
        """Decode the group at self.i; return the number of groups used (0 = unrecognised)."""
        if m := _WIND_RE.fullmatch(tok):
            return self.wind(tok, m)
        if m := _VARIABLE_SECTOR_RE.fullmatch(tok):
            return self.variable_sector(tok, m)
        if tok == "CAVOK":
            return self.cavok()
        nxt = self.peek(1)
        if _SM_WHOLE_RE.fullmatch(tok) and nxt is not None and _SM_FRACTION_RE.fullmatch(nxt):
            text = f"{tok} {nxt}"  # "1 1/2SM": the two groups stand or fall together
            try:
                self.visibility_sm(text, _SM_RE.fullmatch(text))
            except _Skip as exc:
                self.skip(text, str(exc))
            return 2
        if m := _SM_RE.fullmatch(tok):
            self.visibility_sm(tok, m)
            return 1
        if tok in ("////", "////SM"):
            self.set_visibility(tok, None)
            return 1
        if m := _METRIC_VIS_RE.fullmatch(tok):
            self.visibility_metric(tok, m)
            return 1
        if m := _DIRECTIONAL_VIS_RE.fullmatch(tok):
            return self.visibility_directional(tok, m)
        if _RVR_RE.fullmatch(tok):
            self.rvr.append(tok)
            self.decoded += 1
            return 1
        if tok == "//":
            self.weather_not_observable = True
            self.decoded += 1
            return 1
        if (m := _WEATHER_RE.fullmatch(tok)) and (m["desc"] or m["ph"]):
            if self.f.get("cavok"):
                raise _Skip("weather group contradicts CAVOK")
            self.weather.append(tok)
            self.decoded += 1
            return 1
        if tok in CLOUD_FREE_CODES:
            return self.cloud_free(tok)
        if m := _CLOUD_RE.fullmatch(tok):
            return self.cloud(tok, m["amt"], m["h"], m["type"])
        if m := _VV_RE.fullmatch(tok):
            return self.cloud(tok, "VV", m["h"], None)
        if m := _TEMP_RE.fullmatch(tok):
            return self.temperature(tok, m)
        if m := _ALTIMETER_RE.fullmatch(tok):
            return self.altimeter(tok, m)
        if _RECENT_WEATHER_RE.fullmatch(tok) and len(tok) > 2:
            self.recent.append(tok)
            self.decoded += 1
            return 1
        if tok == "WS":
            return self.wind_shear()
        return 0

    def wind(self, tok: str, m: re.Match[str]) -> int:
        if "wind_unit" in self.f:
            raise _Skip("second wind group; the first is kept")
        unit = m["unit"]
        to_kt = _SPEED_UNIT_TO_KT[unit]
        speed = None if m["spd"] == "//" else float(m["spd"])
        gust = None if m["gust"] in (None, "//") else float(m["gust"])
        direction: float | None = None
        variable = m["dir"] == "VRB"
        calm = False
        if m["dir"] not in ("VRB", "///"):
            direction = float(m["dir"])
            if direction > 360:
                raise _Skip(f"wind direction {m['dir']} outside 000-360")
            if direction == 0:
                if speed != 0:
                    raise _Skip("wind direction 000 is only used for calm (00000)")
                calm = True
                direction = None
        if speed == 0 and not calm and m["dir"] != "///":
            raise _Skip("zero speed with a direction; calm is coded 00000")
        for what, value in (("speed", speed), ("gust", gust)):
            if value is not None and value * to_kt > WIND_MAX_KT:
                raise _Skip(f"wind {what} {value:g} {unit} is beyond any surface wind "
                            f"(more than {WIND_MAX_KT:.0f} kt)")
        if gust is not None:
            if calm:
                raise _Skip("gust with calm wind")
            if speed is not None and gust <= speed:
                raise _Skip(f"gust {m['gust']} not above mean speed {m['spd']}")
        self.f.update(
            wind_unit=unit, wind_from_deg_true=direction, wind_is_variable=variable,
            wind_is_calm=calm, wind_speed_as_reported=speed, wind_gust_as_reported=gust,
            wind_speed_kt=None if speed is None else speed * to_kt,
            wind_gust_kt=None if gust is None else gust * to_kt,
        )
        self.decoded += 1
        return 1

    def variable_sector(self, tok: str, m: re.Match[str]) -> int:
        if "wind_unit" not in self.f:
            raise _Skip("variable wind sector without a wind group before it")
        if "wind_variable_from_deg" in self.f:
            raise _Skip("second variable wind sector; the first is kept")
        lo, hi = float(m[1]), float(m[2])
        if not (0 < lo <= 360 and 0 < hi <= 360) or lo == hi:
            raise _Skip("variable sector directions must be 010-360 and differ")
        mean = self.f.get("wind_from_deg_true")
        if mean is not None and (mean - lo) % 360.0 > (hi - lo) % 360.0:
            raise _Skip(f"the mean wind direction {mean:03.0f} lies outside the variable sector "
                        f"{lo:03.0f}-{hi:03.0f} (clockwise)")
        self.f.update(wind_variable_from_deg=lo, wind_variable_to_deg=hi)
        self.decoded += 1
        return 1

    def set_visibility(self, tok: str, visibility_m: float | None, *, sm: float | None = None,
                       less: bool = False, more: bool = False) -> None:
        if "visibility_group" in self.f:
            raise _Skip("second visibility group; the first is kept")
        if sm is None and visibility_m is not None:
            sm = visibility_m * M_TO_SM
        self.f.update(visibility_group=tok, visibility_m=visibility_m, visibility_sm=sm,
                      visibility_is_less_than=less, visibility_is_at_least=more)
        self.decoded += 1

    def visibility_sm(self, tok: str, m: re.Match[str] | None) -> None:
        if m is None:  # pragma: no cover - the two-group form is checked before the call
            raise _Skip("unrecognised visibility")
        if m["int"] is not None:
            value = Fraction(int(m["int"]))
        else:
            num, den = int(m["num"]), int(m["den"])
            if den not in SM_FRACTION_DENOMINATORS or not 0 < num < den:
                raise _Skip(f"{num}/{den} is not a proper fraction in halves, quarters, eighths "
                            f"or sixteenths")
            value = Fraction(num, den)
            if m["whole"] is not None:
                whole = int(m["whole"])
                if whole == 0:
                    raise _Skip("whole number 0 before a fraction")
                value += whole
        if m["q"] == "M" and value == 0:
            raise _Skip("'less than zero' visibility")
        sm = float(value)
        self.set_visibility(tok, sm * SM_TO_M, sm=sm, less=m["q"] == "M", more=m["q"] == "P")

    def visibility_metric(self, tok: str, m: re.Match[str]) -> None:
        value = int(m[1])
        if value == 9999:
            self.set_visibility(tok, CAVOK_VISIBILITY_M, more=True)
        elif value == 0:
            self.set_visibility(tok, METRIC_NIL_VISIBILITY_M, less=True)
        else:
            self.set_visibility(tok, float(value))

    def visibility_directional(self, tok: str, m: re.Match[str]) -> int:
        if self.f.get("visibility_m") is None or self.f.get("visibility_sm") is None:
            raise _Skip("directional minimum visibility without a prevailing visibility before it")
        if "visibility_minimum_m" in self.f:
            raise _Skip("second directional minimum visibility; the first is kept")
        self.f.update(visibility_minimum_m=float(int(m[1])), visibility_minimum_direction=m[2])
        self.decoded += 1
        return 1

    def cavok(self) -> int:
        if self.clouds or "cloud_free_code" in self.f or self.weather:
            raise _Skip("CAVOK after cloud or weather groups contradicts them")
        self.set_visibility("CAVOK", CAVOK_VISIBILITY_M, more=True)
        self.f["cavok"] = True
        return 1

    def cloud_free(self, tok: str) -> int:
        if self.f.get("cavok"):
            raise _Skip("cloud group contradicts CAVOK")
        if self.clouds or "cloud_free_code" in self.f:
            raise _Skip("contradicts the sky groups before it")
        self.f["cloud_free_code"] = tok
        self.decoded += 1
        return 1

    def cloud(self, tok: str, amount: str, height: str, cloud_type: str | None) -> int:
        if self.f.get("cavok"):
            raise _Skip("cloud group contradicts CAVOK")
        if "cloud_free_code" in self.f:
            raise _Skip(f"contradicts {self.f['cloud_free_code']} before it")
        self.clouds.append(CloudLayer(
            group=tok,
            amount=None if amount == "///" else amount,
            height_ft=None if height == "///" else int(height) * CLOUD_HEIGHT_UNIT_FT,
            cloud_type=None if cloud_type in (None, "///") else cloud_type,
        ))
        self.decoded += 1
        return 1

    def temperature(self, tok: str, m: re.Match[str]) -> int:
        if "temperature_c" in self.f:
            raise _Skip("second temperature/dew point group; the first is kept")

        def value(text: str | None) -> float | None:
            if text is None or text in ("M", "//"):
                return None
            return -float(text[1:]) if text.startswith("M") else float(text)

        t, d = value(m["t"]), value(m["d"])
        for what, v in (("temperature", t), ("dew point", d)):
            if v is not None and not TEMPERATURE_MIN_C <= v <= TEMPERATURE_MAX_C:
                raise _Skip(f"{what} {v:g} degC outside the plausible {TEMPERATURE_MIN_C:g} to "
                            f"{TEMPERATURE_MAX_C:g} degC")
        if t is not None and d is not None and d > t:
            raise _Skip(f"dew point {d:g} degC above the temperature {t:g} degC (impossible)")
        # M00 (between -0.5 and 0 degC) decodes to 0.0, not -0.0.
        self.f.update(temperature_c=None if t is None else t + 0.0,
                      dew_point_c=None if d is None else d + 0.0)
        self.decoded += 1
        return 1

    def altimeter(self, tok: str, m: re.Match[str]) -> int:
        if "altimeter_unit" in self.f:
            raise _Skip("second altimeter group; the first is kept")
        unit = "inHg" if m["u"] == "A" else "hPa"
        if m["v"] == "////":
            inhg = hpa = None
        elif m["u"] == "A":
            inhg = int(m["v"]) / ALTIMETER_A_PER_INHG
            hpa = inhg * INHG_TO_HPA
        else:
            hpa = float(int(m["v"]))
            inhg = hpa * HPA_TO_INHG
        if hpa is not None and not ALTIMETER_MIN_HPA <= hpa <= ALTIMETER_MAX_HPA:
            raise _Skip(f"altimeter {hpa:.0f} hPa outside the plausible "
                        f"{ALTIMETER_MIN_HPA:.0f}-{ALTIMETER_MAX_HPA:.0f} hPa")
        self.f.update(altimeter_unit=unit, altimeter_inhg=inhg, altimeter_hpa=hpa)
        self.decoded += 1
        return 1

    def wind_shear(self) -> int:
        a, b = self.peek(1), self.peek(2)
        if a == "ALL" and b == "RWY":
            self.shear.append("WS ALL RWY")
            n = 3
        elif a is not None and _RUNWAY_RE.fullmatch(a):
            self.shear.append(f"WS {a}")
            n = 2
        else:
            raise _Skip("wind shear group without a runway or ALL RWY after it")
        self.decoded += 1
        return n

    # -- result
    def finish(self) -> MetarReport:
        f = self.f
        f["rvr"] = tuple(self.rvr)
        f["present_weather"] = (None if self.weather_not_observable and not self.weather
                                else tuple(self.weather))
        f["clouds"] = tuple(self.clouds)
        f["recent_weather"] = tuple(self.recent)
        f["wind_shear"] = tuple(self.shear)
        ceilings = [c.height_ft for c in self.clouds if c.forms_ceiling and c.height_ft is not None]
        ceiling = min(ceilings) if ceilings else None
        f["ceiling_ft"] = ceiling
        f["ceiling_may_be_lower"] = self.ceiling_may_be_lower(ceiling)
        f["skipped"] = tuple(self.skipped)
        return MetarReport(raw=self.raw, **f)

    def ceiling_may_be_lower(self, ceiling: float | None) -> bool:
        if self.f.get("cavok") or "cloud_free_code" in self.f:
            return False
        if not self.clouds:
            return True  # sky condition not reported at all
        for c in self.clouds:
            if c.forms_ceiling and c.height_ft is None:
                return True
            if c.amount is None and (c.height_ft is None or ceiling is None or c.height_ft < ceiling):
                return True
        return False


def decode_metar(text: str) -> MetarReport:
    """Decode a METAR or SPECI report.

    Parameters
    ----------
    text : str
        One report; groups separated by white space, optionally ending with ``=``. ASCII
        letters are taken in upper case; any other character is left as it is (and so does not
        decode).

    Returns
    -------
    MetarReport
        The decoded groups; groups that could not be decoded are listed in ``skipped`` with the
        reason.

    Raises
    ------
    MetarError
        If the report is empty, has no station identifier, or nothing after the header can be
        decoded. No other exception is raised for any string.

    Notes
    -----
    Every decoded value follows the code's definition in [1]_, [2]_ and [3]_ of the module
    docstring; nothing is inferred. A group that repeats one already decoded (a second wind,
    visibility, temperature or altimeter group) is skipped and the first kept.
    """
    if not isinstance(text, str):
        raise MetarError(f"cannot decode METAR: expected text, got {type(text).__name__}")
    raw = escape_text(text.strip())        # shown as written, control characters escaped
    groups = raw.translate(_ASCII_UPPER).split()
    if groups and groups[-1].endswith("="):
        groups[-1] = groups[-1].rstrip("=")
        if not groups[-1]:
            groups.pop()
    for i, g in enumerate(groups[:-1]):
        if g.endswith("="):
            raise MetarError(f"cannot decode METAR: the report ends at {_quote(g)} and another "
                             "follows; give one report at a time", group=g)
    if not groups:
        raise MetarError("cannot decode METAR: the report is empty")
    decoder = _Decoder(raw, groups)
    decoder.header()
    if decoder.f.get("nil"):
        for tok in groups[decoder.i:]:
            decoder.skip(tok, "group after NIL (missing report)")
        return decoder.finish()
    decoder.body()
    if decoder.decoded == 0:
        station = decoder.f["station"]
        if decoder.skipped:
            group, reason = decoder.skipped[0]
            raise MetarError(f"cannot decode METAR for {station}: no observation group decoded; "
                             f"group {_quote(group)}: {reason}", group=group)
        raise MetarError(f"cannot decode METAR for {station}: no observation group after the "
                         f"header", group=station)
    return decoder.finish()
