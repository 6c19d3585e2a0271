"""Frozen dataclasses of the inputs: aircraft profiles, airfields, approaches, weather, requests.

Every model is ``@dataclass(frozen=True, slots=True, kw_only=True)``; every dimensional field carries
its unit in its name. Each model checks its own invariants in ``__post_init__`` (types, plausible
ranges, cross-field rules) and raises `InvariantError` (a `DomainError`) naming the field, so a model
built by hand in a test or the TUI is validated exactly like one read from a file.

Each file format is declared once, here: every field carries a `Spec` (its kind, plausible range or
choices, unit and help text), and alternative forms of a model are `Forms` rules. The checks
(`check_declared`, first in every ``__post_init__``) and the JSON Schemas (`briefer.schemagen`,
checked in as ``briefer/schemas/*.schema.json``) are both made from these declarations. Rules
between fields that a schema cannot say (a threshold within 300 ft of the airfield, a fix within
30 NM, VREF above the stall speed) are the models' own code, after the declared checks.

``Model.from_mapping(data)`` builds a model from plain mappings and lists (what a YAML or JSON reader
gives) and ``model.to_mapping()`` gives them back; the two round-trip. ``from_mapping`` rejects unknown
keys (with a close-match suggestion) and missing required keys, and turns every invariant failure
into a `FieldError`, a `DataFileError` whose ``context`` is the dotted path of the field
(``runways[1].threshold_b.elevation_ft``). The loaders in ``briefer.io`` add the file and the line.

This module is pure: no file I/O, no YAML.
"""

from __future__ import annotations

import datetime as _dt
import math
import numbers
import re
from collections.abc import Mapping
from briefer._dataclass import MISSING, dataclass, field, fields
from typing import Any, ClassVar

from briefer import units, vocabulary
from briefer.errors import DataFileError, DomainError

FORMAT_VERSION = 1
"""The one data-file format version this release reads and writes."""

KIND_PROFILE = "aircraft-profile"
KIND_AIRFIELD = "airfield"
KINDS = (KIND_PROFILE, KIND_AIRFIELD)

CATEGORIES = vocabulary.CATEGORIES
CRITERIA = vocabulary.CRITERIA_SETS
STALL_WARNINGS = ("horn", "shaker", "pusher", "aural", "buffet", "none")
WIND_REFERENCES = ("true", "magnetic")
SIDES = ("north", "east", "south", "west")
SIDE_BEARING_DEG_TRUE = {side: 90.0 * i for i, side in enumerate(SIDES)}
OBSTACLE_KINDS = ("tower", "mast", "building", "chimney", "wind-turbine", "terrain", "trees",
                  "power-line", "other")
COLD_TEMPERATURE_METHODS = ("sea-level-table", "airport-elevation")

EARTH_MEAN_RADIUS_M = 6_371_008.8
"""IUGG mean Earth radius, for the plausibility distances only (the geometry lives in core)."""


@dataclass(frozen=True, slots=True)
class Range:
    """A closed plausibility range ``lo <= value <= hi``."""

    lo: float
    hi: float

    def __contains__(self, value: float) -> bool:
        return self.lo <= value <= self.hi


# Plausibility ranges (a value outside is a typo or a unit mix-up, not an aircraft or an airfield).
ELEVATION_FT = Range(-1500, 15000)
LAT_DEG = Range(-90, 90)
LON_DEG = Range(-180, 180)
SPEED_KT = Range(20, 300)
BANK_DEG = Range(5, 60)
ROLL_RATE_DEG_PER_S = Range(5, 400)
WEIGHT_LB = Range(300, 1_500_000)
AOA_ANY = Range(-30, 100)
AOA_REF_DEG = Range(-5, 25)
AOA_STALL_DEG = Range(5, 40)
FRACTION = Range(0, 1)
ADDITIVE_KT = Range(0, 40)
PATTERN_HEIGHT_FT = Range(300, 3000)
PATTERN_OFFSET_NM = Range(0.2, 5)
TCH_FT = Range(20, 120)
GLIDE_PATH_DEG = Range(2, 7)
RUNWAY_WIDTH_M = Range(10, 100)
RUNWAY_LENGTH_M = Range(300, 6000)
DISPLACED_THRESHOLD_M = Range(0, 3000)
VARIATION_DEG = Range(-90, 90)
COURSE_DEG = Range(0, 360)
ALTITUDE_FT = Range(-1500, 30000)
OBSTACLE_HEIGHT_AGL_FT = Range(0, 3000)
VISIBILITY_SM = Range(0.25, 10)
VISIBILITY_M = Range(400, 16000)
CIRCLING_HAA_FT = Range(250, 3000)
STRAIGHT_IN_HAT_FT = Range(150, 3000)
FAF_HEIGHT_FT = Range(300, 10000)
THRESHOLD_ELEVATION_SPREAD_FT = 300.0
THRESHOLD_FROM_ARP_KM = 10.0
OBSTACLE_FROM_ARP_KM = 50.0
FIX_FROM_ARP_NM = 30.0
DESIGNATOR_TOLERANCE_DEG = 15.0
SIDE_MIN_ANGLE_TO_RUNWAY_DEG = 30.0
WIND_SPEED_KT = Range(0, 150)
CROSSWIND_LIMIT_KT = Range(5, 60)
TAILWIND_LIMIT_KT = Range(0, 30)
WIND_GUST_KT = Range(1, 200)
OAT_C = Range(-90, 60)
ALTIMETER_HPA = Range(870, 1090)
ALTIMETER_INHG = Range(25.7, 32.2)
WX_VISIBILITY_SM = Range(0, 100)
CEILING_FT = Range(0, 50000)
STABILISED_HEIGHT_FT = Range(100, 1500)
CHART_DISTANCE_NM = Range(0, 30)
CHART_DISTANCE_FT = Range(0, 180000)
CHART_DISTANCE_M = Range(0, 55000)
RUNWAY_LENGTH_FT = Range(984, 19685)       # RUNWAY_LENGTH_M in feet, rounded inward
ARP = "ARP"
"""How a chart placement names the airfield reference point (``from_point: ARP``)."""
LANDING_WEIGHT_MIN_FRACTION = 0.4
WEIGHT_RATIO_LIMIT = 2.0
TEXT_MAX = 500


# --------------------------------------------------------------------------------------------
# Errors
# --------------------------------------------------------------------------------------------
class InvariantError(DomainError):
    """A model invariant failed. ``field`` is the dotted path of the field inside the model."""

    def __init__(self, message: str, *, field: str = "") -> None:
        self.message = message
        self.field = field
        super().__init__(f"{field}: {message}" if field else message)


class FieldError(DataFileError):
    """A `DataFileError` raised while reading a mapping (no file or line yet).

    ``context`` is the dotted path shown to the user; ``locator`` is the dotted path whose line
    the loader should report (the key itself for an unknown key, the parent mapping for a
    missing one).
    """

    def __init__(self, message: str, *, context: str = "", locator: str | None = None) -> None:
        super().__init__(message, context=context or None)
        self.locator = context if locator is None else locator


# --------------------------------------------------------------------------------------------
# Small helpers: wording, paths, checks
# --------------------------------------------------------------------------------------------
_UNIT_WORDS = (
    ("_deg_per_s", "degrees per second"),
    ("_deg_mag", "degrees magnetic"),
    ("_deg", "degrees"),
    ("_kt", "knots"),
    ("_ft", "feet"),
    ("_lb", "pounds"),
    ("_nm", "nautical miles"),
    ("_sm", "statute miles"),
    ("_hpa", "hectopascals"),
    ("_inhg", "inches of mercury"),
    ("_m", "metres"),
    ("_c", "degrees Celsius"),
    ("_fraction", ""),
)


def _a_number(name: str, unit: str | None = None) -> str:
    """'a number in feet' for 'elevation_ft' (the unit comes from the name's suffix)."""
    if unit is None:
        unit = next((w for suffix, w in _UNIT_WORDS if name.endswith(suffix)), "")
        if name.endswith("_fraction"):
            return "a fraction"
    return f"a number in {unit}" if unit else "a number"


def _fmt(value: float) -> str:
    """A number as a person writes it: 20000, 1.25, -7.5."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if math.isfinite(value) and float(value).is_integer():
        return str(int(value))
    return f"{value:.10g}"


def _describe(value: Any) -> str:
    """What the user wrote, for 'got ...'."""
    if value is None:
        return "an empty value"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, numbers.Real):
        return _fmt(float(value)) if not isinstance(value, numbers.Integral) else str(int(value))
    if isinstance(value, str):
        return repr(value if len(value) <= 40 else value[:37] + "...")
    if isinstance(value, Mapping):
        return "a mapping"
    if isinstance(value, (list, tuple)):
        return "a list"
    if isinstance(value, _dt.datetime):
        return "a date and time"
    if isinstance(value, _dt.date):
        return "a date"
    if isinstance(value, bytes):
        return "binary data"
    return f"a {type(value).__name__}"


def did_you_mean(word: str, options: Any) -> str:
    """' (did you mean 'x'?)' for the closest option, or ''."""
    import difflib          # only when a word is wrong (start-up)

    options = list(options)
    lowered = {o.lower(): o for o in options}
    match = difflib.get_close_matches(str(word).lower(), list(lowered), n=1, cutoff=0.6)
    return f" (did you mean '{lowered[match[0]]}'?)" if match else ""


def _one_of(options: Any) -> str:
    quoted = [f"'{o}'" for o in options]
    return quoted[0] if len(quoted) == 1 else ", ".join(quoted[:-1]) + " or " + quoted[-1]


def join_path(path: str, name: str) -> str:
    """'runways[1]' + 'threshold_b' -> 'runways[1].threshold_b'; 'a' + '[2]' -> 'a[2]'."""
    if not path:
        return name
    if not name:
        return path
    return f"{path}{name}" if name.startswith("[") else f"{path}.{name}"


def _set(obj: Any, name: str, value: Any) -> None:
    object.__setattr__(obj, name, value)


def check_number(name: str, value: Any, rng: Range | None = None, *, optional: bool = False,
                 unit: str | None = None) -> float | None:
    """A number named `name` checked for type, finiteness and range; raises `InvariantError`."""
    what = _a_number(name, unit)
    if value is None:
        if optional:
            return None
        raise InvariantError(f"expected {what}, got an empty value", field=name)
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise InvariantError(f"expected {what}, got {_describe(value)}", field=name)
    number = float(value)
    if not math.isfinite(number):
        raise InvariantError(f"expected a finite {what[2:]}, got {_fmt(number)}", field=name)
    if rng is not None and number not in rng:
        raise InvariantError(
            f"expected {what} between {_fmt(rng.lo)} and {_fmt(rng.hi)}, got {_fmt(number)}",
            field=name)
    return number


def _num(obj: Any, name: str, rng: Range | None = None, *, optional: bool = False,
         unit: str | None = None) -> float | None:
    """Check a numeric field of a model (see `check_number`); store it as a float."""
    number = check_number(name, getattr(obj, name), rng, optional=optional, unit=unit)
    _set(obj, name, number)
    return number


def _text(obj: Any, name: str, *, optional: bool = False, empty_ok: bool = False,
          choices: tuple[str, ...] | None = None, max_length: int = TEXT_MAX) -> str | None:
    """Check a text field; choices are matched case-insensitively and stored in lower case."""
    value = getattr(obj, name)
    if value is None and optional:
        return None
    if choices is not None:
        if isinstance(value, str) and value.strip().lower() in choices:
            value = value.strip().lower()
            _set(obj, name, value)
            return value
        hint = did_you_mean(value, choices) if isinstance(value, str) else ""
        raise InvariantError(f"expected {_one_of(choices)}, got {_describe(value)}{hint}", field=name)
    if not isinstance(value, str):
        raise InvariantError(f"expected text, got {_describe(value)}", field=name)
    value = value.strip()
    if not value and not empty_ok:
        raise InvariantError("expected text, got an empty value", field=name)
    if len(value) > max_length:
        raise InvariantError(f"expected at most {max_length} characters, got {len(value)}", field=name)
    _set(obj, name, value)
    return value


def _flag(obj: Any, name: str) -> bool:
    value = getattr(obj, name)
    if not isinstance(value, bool):
        raise InvariantError(f"expected true or false, got {_describe(value)}", field=name)
    return value


_DESIGNATOR = re.compile(r"(0?[1-9]|[12][0-9]|3[0-6])([LCR]?)")
_NORMAL_DESIGNATORS = frozenset(f"{n:02d}{s}" for n in range(1, 37) for s in ("", "L", "C", "R"))


def normalise_designator(value: Any) -> str | None:
    """'9' -> '09', '27l' -> '27L', 27 -> '27'; None if it is not a runway designator."""
    if type(value) is str and value in _NORMAL_DESIGNATORS:     # already normal: itself
        return value
    if isinstance(value, bool):
        return None
    if isinstance(value, numbers.Integral):
        value = str(int(value))
    if not isinstance(value, str):
        return None
    m = _DESIGNATOR.fullmatch(value.strip().upper())
    if not m:
        return None
    return f"{int(m.group(1)):02d}{m.group(2)}"


def _designator(obj: Any, name: str, *, optional: bool = False) -> str | None:
    value = getattr(obj, name)
    if value is None and optional:
        return None
    norm = normalise_designator(value)
    if norm is None:
        raise InvariantError(
            f"expected a runway designator such as '09' or '27L', got {_describe(value)}", field=name)
    _set(obj, name, norm)
    return norm


def _items(obj: Any, name: str, cls: type, *, min_items: int = 0, what: str = "") -> tuple[Any, ...]:
    """Check a sequence field holds `cls` instances; store it as a tuple."""
    value = getattr(obj, name)
    what = what or cls.__name__
    if isinstance(value, (str, bytes, Mapping)) or not hasattr(value, "__iter__"):
        raise InvariantError(f"expected a list of {what}, got {_describe(value)}", field=name)
    items = tuple(value)
    for i, item in enumerate(items):
        if not isinstance(item, cls):
            raise InvariantError(f"expected {what}, got {_describe(item)}", field=f"{name}[{i}]")
    if len(items) < min_items:
        raise InvariantError(f"expected at least {min_items} {what}, got an empty list", field=name)
    _set(obj, name, items)
    return items


def _instance(obj: Any, name: str, cls: type, *, optional: bool = False) -> None:
    value = getattr(obj, name)
    if value is None and optional:
        return
    if not isinstance(value, cls):
        raise InvariantError(f"expected {getattr(cls, '_what', cls.__name__)}, got {_describe(value)}", field=name)


def _distance_m(lat1: float, lon1: float, lat2: float, lon2: float) -> float:
    """Great-circle distance (haversine on the mean sphere; plausibility checks only)."""
    p1, p2 = math.radians(lat1), math.radians(lat2)
    dp, dl = p2 - p1, math.radians(lon2 - lon1)
    h = math.sin(dp / 2) ** 2 + math.cos(p1) * math.cos(p2) * math.sin(dl / 2) ** 2
    return 2 * EARTH_MEAN_RADIUS_M * math.asin(min(1.0, math.sqrt(h)))


def _bearing_deg_true(lat1: float, lon1: float, lat2: float, lon2: float) -> float:
    """Initial great-circle bearing from point 1 to point 2, [0, 360)."""
    p1, p2 = math.radians(lat1), math.radians(lat2)
    dl = math.radians(lon2 - lon1)
    y = math.sin(dl) * math.cos(p2)
    x = math.cos(p1) * math.sin(p2) - math.sin(p1) * math.cos(p2) * math.cos(dl)
    return math.degrees(math.atan2(y, x)) % 360.0


def _angle_diff_deg(a: float, b: float) -> float:
    """Smallest absolute difference of two directions, [0, 180]."""
    return abs((a - b + 180.0) % 360.0 - 180.0)


def _plural(what: str) -> str:
    """'a configuration' -> 'configurations', 'an approach' -> 'approaches'."""
    noun = what.split(" ", 1)[1] if what.startswith(("a ", "an ")) else what
    return noun + ("es" if noun.endswith("ch") else "s")


_LOOSE_NAMES: dict[str, str] = {}     # name -> its loose form: a pure function of the string, never stale
_LOOSE_NAMES_MAX = 1024


def _loose(name: str) -> str:
    """'RNAV (GPS) RWY 09' -> 'rnavgpsrwy09' (for forgiving look-ups by name).

    Each brief looks its approach up by name (every approach's name made loose once more): the
    loose form of a string already seen is remembered, up to `_LOOSE_NAMES_MAX` strings."""
    loose = _LOOSE_NAMES.get(name) if type(name) is str else None
    if loose is None:
        loose = re.sub(r"[^a-z0-9]", "", name.lower())
        if type(name) is str and len(_LOOSE_NAMES) < _LOOSE_NAMES_MAX:
            _LOOSE_NAMES[name] = loose
    return loose


# --------------------------------------------------------------------------------------------
# Declaring a file format: each field's kind, range or choices, and help text, once
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True)
class Spec:
    """How one field of a file format reads, declared once with the model's field.

    The model's checks (`check_declared`, called first in every ``__post_init__``) and the JSON
    Schemas (`briefer.schemagen`, which writes ``briefer/schemas/*.schema.json``) both read it.
    ``kind`` is 'number', 'text', 'choice', 'flag', 'designator', 'model' (one nested model),
    'models' (a list of them), 'categories' (nested models keyed by approach category A to E) or
    'custom' (checked by the model's own code; ``schema`` gives its JSON Schema). A field whose
    default is None is optional: the file may leave it out or write it empty (null).
    """

    kind: str
    help: str = ""
    range: Range | None = None
    unit: str | None = None                # the unit's words when the name's suffix gives none
    choices: tuple[str, ...] = ()
    empty_ok: bool = False
    max_length: int = TEXT_MAX             # text: the most characters
    pattern: str | None = None             # text: a regular expression the whole text matches
    pattern_words: str = ""                # ... said in words, for the message
    model: Any = None                      # 'model', 'models', 'categories': the nested model class
    min_items: int = 0
    max_items: int | None = None
    schema: Mapping[str, Any] | None = None  # 'custom': its JSON Schema
    schema_ref: str | None = None          # 'model': a named variant of the nested model's schema
    others: tuple[str, ...] = ()           # number: the keys of the same quantity in other units
    nullable: bool | None = None           # schema: null allowed (default: when optional); False for
                                           # a key whose presence selects a form (lat_deg, distance_nm)


def declared(spec: Spec, *, default: Any = MISSING, default_factory: Any = MISSING) -> Any:
    """A dataclass field carrying its `Spec`."""
    return field(default=default, default_factory=default_factory, metadata={"spec": spec})


def num_field(rng: Range | None, help: str, *, default: Any = MISSING, unit: str | None = None,
              nullable: bool | None = None) -> Any:
    """A number within `rng` (its unit from the name's suffix, or `unit`)."""
    return declared(Spec("number", help, range=rng, unit=unit, nullable=nullable), default=default)


def text_field(help: str, *, default: Any = MISSING, empty_ok: bool = False, pattern: str | None = None,
               pattern_words: str = "", max_length: int = TEXT_MAX) -> Any:
    """A line of text (at most `max_length` characters, stripped)."""
    return declared(Spec("text", help, empty_ok=empty_ok, pattern=pattern, pattern_words=pattern_words,
                         max_length=max_length), default=default)


def choice_field(choices: tuple[str, ...], help: str, *, default: Any = MISSING) -> Any:
    """One of `choices` (case-insensitive in the file, stored in lower case)."""
    return declared(Spec("choice", help, choices=choices), default=default)


def flag_field(help: str, *, default: Any = False) -> Any:
    """true or false."""
    return declared(Spec("flag", help), default=default)


def designator_field(help: str, *, default: Any = MISSING, nullable: bool | None = None) -> Any:
    """A runway designator such as '09' or '27L' (9 and '9' mean '09')."""
    return declared(Spec("designator", help, nullable=nullable), default=default)


def model_field(model: Any, help: str = "", *, default: Any = MISSING, default_factory: Any = MISSING,
                schema_ref: str | None = None, nullable: bool | None = None) -> Any:
    """One nested model (a mapping in the file)."""
    return declared(Spec("model", help, model=model, schema_ref=schema_ref, nullable=nullable), default=default,
                    default_factory=default_factory)


def models_field(model: Any, help: str = "", *, min_items: int = 0, max_items: int | None = None,
                 default: Any = MISSING) -> Any:
    """A list of nested models."""
    return declared(Spec("models", help, model=model, min_items=min_items, max_items=max_items), default=default)


def categories_field(model: Any, help: str, *, min_items: int = 1) -> Any:
    """Nested models keyed by approach category ('A' to 'E') in the file."""
    return declared(Spec("categories", help, model=model, min_items=min_items))


def custom_field(schema: Mapping[str, Any], help: str, *, default: Any = MISSING) -> Any:
    """A field the model checks with its own code; `schema` is its JSON Schema."""
    return declared(Spec("custom", help, schema=schema), default=default)


_SPECS: dict[type, tuple[tuple[Any, Spec], ...]] = {}


_KEYS: dict[type, tuple[str, ...]] = {}          # by model class: keys(), required_keys(), nested_models()
_REQUIRED: dict[type, tuple[str, ...]] = {}
_NESTED: dict[tuple[type, str], dict[str, type]] = {}


def declared_fields(cls: type) -> tuple[tuple[Any, Spec], ...]:
    """(dataclass field, Spec) of every declared field of a model class, in the file's order."""
    found = _SPECS.get(cls)
    if found is None:
        found = _SPECS[cls] = tuple((f, f.metadata["spec"]) for f in fields(cls)  # type: ignore[arg-type]
                                    if f.init and "spec" in f.metadata)
    return found


def _noun(what: str) -> str:
    """'a configuration' -> 'configuration'."""
    return what.split(" ", 1)[1] if what.startswith(("a ", "an ")) else what


def check_declared(obj: Any) -> None:
    """Check every declared field of a model in the file's order (type, finiteness, range,
    choices, nested models); store the normalised values. Raises `InvariantError`."""
    for f, spec in declared_fields(type(obj)):
        name, optional, kind = f.name, f.default is None, spec.kind
        if kind == "number":
            try:
                _num(obj, name, spec.range, optional=optional, unit=spec.unit)
            except InvariantError as exc:
                if not spec.others:
                    raise
                raise InvariantError(f"{exc.message} (or give {_one_of(spec.others).replace(chr(39), '')})",
                                     field=exc.field) from None
        elif kind == "text":
            value = _text(obj, name, optional=optional, empty_ok=spec.empty_ok, max_length=spec.max_length)
            if spec.pattern and value is not None and not re.fullmatch(spec.pattern, value):
                raise InvariantError(f"expected {spec.pattern_words}, got {_describe(value)}", field=name)
        elif kind == "choice":
            _text(obj, name, optional=optional, choices=spec.choices)
        elif kind == "flag":
            _flag(obj, name)
        elif kind == "designator":
            _designator(obj, name, optional=optional)
        elif kind == "model":
            _instance(obj, name, spec.model, optional=optional)
        elif kind == "models":
            _items(obj, name, spec.model, min_items=spec.min_items, what=_noun(spec.model._what))
        elif kind == "categories":
            _check_categories(obj, name, spec.model, min_items=spec.min_items)
    for rule in type(obj)._forms:
        if rule.checked:
            check_forms(obj, rule)


@dataclass(frozen=True, slots=True)
class Forms:
    """Alternative forms of part of a model: ``forms`` lists the keys of each form (given
    together); at most one form, exactly one when ``required``. ``what`` names the part for the
    messages ('offset'). A model lists its rules in ``_forms``: `check_declared` checks them
    (`check_forms`) unless ``checked`` is False (the model's own code checks that rule, in its own
    words), and the schema says them (`schema`)."""

    what: str
    forms: tuple[tuple[str, ...], ...]
    required: bool = True
    checked: bool = True

    @property
    def keys(self) -> tuple[str, ...]:
        return tuple(k for form in self.forms for k in form)

    def words(self) -> str:
        """'offset_nm, or speed_kt and bank_deg'."""
        return ", or ".join(_and(form) for form in self.forms)

    def schema(self) -> dict[str, Any]:
        """The rule as JSON Schema: one form, whole (``oneOf``); or at most one (``not``), each
        form whole (``dependentRequired``)."""
        return self.schema_one() if self.required else self.schema_at_most_one()

    def schema_one(self) -> dict[str, Any]:
        """Exactly one form, whole."""
        if all(len(form) == 1 for form in self.forms):
            return {"oneOf": [{"required": list(form)} for form in self.forms]}
        return {"oneOf": [{"required": list(form),
                           "not": schema_any_key([k for other in self.forms if other is not form for k in other])}
                          for form in self.forms]}

    def schema_at_most_one(self) -> dict[str, Any]:
        """No two forms together; a form of several keys whole."""
        pairs = [[a, b] for i, form in enumerate(self.forms) for other in self.forms[i + 1:]
                 for a in form for b in other]
        out: dict[str, Any] = {"not": {"anyOf": [{"required": p} for p in pairs]}} if pairs else {}
        together = {k: [o for o in form if o != k] for form in self.forms if len(form) > 1 for k in form}
        if together:
            out["dependentRequired"] = together
        return out


def schema_any_key(keys: Any) -> dict[str, Any]:
    """JSON Schema: the mapping has one of these keys (used under ``not``)."""
    keys = list(keys)
    return {"required": keys} if len(keys) == 1 else {"anyOf": [{"required": [k]} for k in keys]}


def _and(keys: tuple[str, ...] | list[str]) -> str:
    """'a', 'a and b', 'a, b and c'."""
    keys = list(keys)
    return keys[0] if len(keys) == 1 else ", ".join(keys[:-1]) + " and " + keys[-1]


def check_forms(obj: Any, rule: Forms) -> tuple[str, ...] | None:
    """Check that `obj` gives one form of `rule` whole (see `Forms`); the form given, or None."""
    given = [form for form in rule.forms if any(getattr(obj, k) not in (None, ()) for k in form)]
    if len(given) > 1:
        got = [next(k for k in form if getattr(obj, k) not in (None, ())) for form in given[:2]]
        also = f" (got {got[0]} and {got[1]})" if any(len(form) > 1 for form in rule.forms) else ""
        raise InvariantError(f"give either {rule.words()}, not both{also}", field=got[1])
    if not given:
        if rule.required:
            raise InvariantError(f"missing the {rule.what}: give {rule.words()}")
        return None
    form = given[0]
    have = [k for k in form if getattr(obj, k) not in (None, ())]
    missing = [k for k in form if k not in have]
    if missing:
        raise InvariantError(f"missing required key '{missing[0]}' ({_and(have)} "
                             f"{'needs' if len(have) == 1 else 'need'} {_and(missing)})")
    return form


# --------------------------------------------------------------------------------------------
# Reading mappings
# --------------------------------------------------------------------------------------------
class _Model:
    """Mixin giving frozen dataclasses ``from_mapping`` / ``to_mapping``.

    Subclasses declare their fields with a `Spec` each (`num_field`, `text_field`, `model_field`,
    `models_field`...: what the loader checks and what the schema says) and name themselves in
    ``_what`` for messages. ``_read`` may be overridden for fields whose file form differs from
    the model.
    """

    __slots__ = ()
    _kind: ClassVar[str | None] = None   # the file kind of a top-level model
    _what: ClassVar[str] = "value"
    _extra_fields: ClassVar[dict[str, tuple[str, Spec]]] = {}   # file keys that are no field: key ->
                                                                # (the field it follows, its Spec)
    _title: ClassVar[str] = ""            # a top-level model: its schema's title
    _help: ClassVar[str] = ""             # what the model is, for its schema
    _forms: ClassVar[tuple[Forms, ...]] = ()   # alternative forms, checked after the fields

    @classmethod
    def keys(cls) -> tuple[str, ...]:
        """Every key the file form of this model accepts, in the order files should use."""
        found = _KEYS.get(cls)
        if found is None:
            header = ("kind", "format_version") if cls._kind else ()
            found = _KEYS[cls] = header + tuple(cls._extra_fields) + tuple(f.name for f in fields(cls)  # type: ignore[arg-type]
                                                                             if f.init)
        return found

    @classmethod
    def required_keys(cls) -> tuple[str, ...]:
        found = _REQUIRED.get(cls)
        if found is None:
            found = _REQUIRED[cls] = tuple(f.name for f in fields(cls)  # type: ignore[arg-type]
                                           if f.init and f.default is MISSING and f.default_factory is MISSING)
        return found

    @classmethod
    def from_mapping(cls, data: Any, *, path: str = "") -> Any:
        """Build the model from a mapping; errors are `FieldError` with the dotted path."""
        if not isinstance(data, Mapping):
            raise FieldError(f"expected a mapping ({cls._what}), got {_describe(data)}", context=path)
        if cls._kind:
            _check_header(data, cls._kind, path)
        allowed = cls.keys()
        for key in data:
            if key not in allowed:
                hint = did_you_mean(key, allowed) or f" (allowed: {', '.join(allowed)})"
                raise FieldError(f"unknown key '{key}'{hint}", context=path,
                                 locator=join_path(path, str(key)))
        for key in cls.required_keys():
            if key not in data:
                raise FieldError(f"missing required key '{key}'", context=path)
        kwargs = cls._read(data, path)
        return cls._build(kwargs, path)

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        """Schema rules beyond the declared fields and forms (a model with rules of its own
        overrides it); `variant` names a variant of the model's schema, `node` is the schema so far."""
        return None

    @classmethod
    def nested_models(cls, kind: str = "") -> dict[str, type]:
        """Fields holding a nested model ('model'), a list of them ('models'), or either ('')."""
        found = _NESTED.get((cls, kind))
        if found is None:
            found = _NESTED[cls, kind] = {f.name: s.model for f, s in declared_fields(cls)
                                          if s.kind in ("model", "models") and (s.kind == kind or not kind)}
        return dict(found)

    @classmethod
    def _read(cls, data: Mapping[str, Any], path: str) -> dict[str, Any]:
        kwargs: dict[str, Any] = {}
        one, many = cls.nested_models("model"), cls.nested_models("models")
        for f in fields(cls):  # type: ignore[arg-type]
            if f.name not in data or not f.init:
                continue
            value = data[f.name]
            sub = join_path(path, f.name)
            if f.name in one and not (value is None and f.default is None):
                value = one[f.name].from_mapping(value, path=sub)
            elif f.name in many:
                item_cls = many[f.name]
                if not isinstance(value, list):
                    raise FieldError(f"expected a list of {_plural(item_cls._what)}, got {_describe(value)}",
                                     context=sub)
                value = tuple(item_cls.from_mapping(item, path=f"{sub}[{i}]")
                              for i, item in enumerate(value))
            kwargs[f.name] = value
        return kwargs

    @classmethod
    def _build(cls, kwargs: dict[str, Any], path: str) -> Any:
        try:
            return cls(**kwargs)
        except InvariantError as exc:
            raise FieldError(exc.message, context=join_path(path, exc.field)) from None

    def to_mapping(self) -> dict[str, Any]:
        """Plain dicts, lists and scalars; ``from_mapping(m.to_mapping()) == m``. None is left out."""
        out: dict[str, Any] = {"kind": self._kind, "format_version": FORMAT_VERSION} if self._kind else {}
        for f in fields(self):  # type: ignore[arg-type]
            value = getattr(self, f.name)
            if value is None or not f.init:     # init=False fields are derived, not part of the file
                continue
            if isinstance(value, _Model):
                value = value.to_mapping()
            elif isinstance(value, tuple):
                value = [v.to_mapping() if isinstance(v, _Model) else v for v in value]
            out[f.name] = value
        return out


def _check_header(data: Mapping[str, Any], kind: str, path: str) -> None:
    """Check the optional ``kind`` and ``format_version`` keys of a top-level file mapping."""
    if "kind" in data and data["kind"] != kind:
        got = data["kind"]
        hint = did_you_mean(got, KINDS) if isinstance(got, str) and got not in KINDS else ""
        raise FieldError(f"expected '{kind}', got {_describe(got)}{hint}", context=join_path(path, "kind"))
    if "format_version" in data:
        version = data["format_version"]
        if isinstance(version, bool) or version != FORMAT_VERSION:
            raise FieldError(f"expected {FORMAT_VERSION} (the only format this version reads), "
                             f"got {_describe(version)}", context=join_path(path, "format_version"))


# --------------------------------------------------------------------------------------------
# Aircraft profile
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class WindAdditive(_Model):
    """The speed added to VREF for wind: a fraction of the headwind plus a fraction of the gust
    increment, not below ``min_kt`` and not above ``max_kt``.

    The common practice "half the steady headwind plus the full gust increment, 5 to 20 kt" is
    ``headwind_fraction=0.5, gust_fraction=1.0, min_kt=5, max_kt=20``. The aircraft flight manual
    governs.
    """

    _what: ClassVar[str] = "a wind additive"
    _help: ClassVar[str] = ("Speed added to VREF for wind: headwind_fraction x headwind + gust_fraction x gust "
                            "increment, between min_kt and max_kt.")

    headwind_fraction: float = num_field(FRACTION, "Fraction of the steady headwind added to VREF (0.5 = half).",
                                         default=0.5)
    gust_fraction: float = num_field(FRACTION, "Fraction of the gust increment added (1.0 = all of it).",
                                     default=1.0)
    min_kt: float = num_field(ADDITIVE_KT, "Smallest additive [kt].", default=0.0)
    max_kt: float = num_field(ADDITIVE_KT, "Largest additive [kt]; at least min_kt.", default=20.0)

    def __post_init__(self) -> None:
        check_declared(self)
        if self.max_kt < self.min_kt:
            raise InvariantError(f"expected at least min_kt ({_fmt(self.min_kt)}), got {_fmt(self.max_kt)}",
                                 field="max_kt")

    def additive_kt(self, *, headwind_kt: float, gust_increment_kt: float) -> float:
        """The additive for a headwind component (negative = tailwind, counts as zero) and a
        gust increment (gust minus steady speed) [kt]."""
        raw = self.headwind_fraction * max(headwind_kt, 0.0) + self.gust_fraction * max(gust_increment_kt, 0.0)
        return min(self.max_kt, max(self.min_kt, raw))


@dataclass(frozen=True, slots=True, kw_only=True)
class FamiliarPattern(_Model):
    """The visual pattern the crew flies every day, for comparing sight pictures.

    ``height_ft`` is above the field. The lateral offset of the downwind leg from the runway is
    given either directly (``offset_nm``) or by the speed and bank of the continuous 180-degree
    turn from downwind to final (``speed_kt`` and ``bank_deg``; the offset is then the turn's
    diameter, which the sight-picture code computes).
    """

    _what: ClassVar[str] = "a familiar pattern"
    _help: ClassVar[str] = "The everyday visual pattern: height and either offset_nm, or speed_kt and bank_deg."
    _forms: ClassVar[tuple[Forms, ...]] = (Forms("offset", (("offset_nm",), ("speed_kt", "bank_deg"))),)

    height_ft: float = num_field(PATTERN_HEIGHT_FT, "Height of the everyday pattern above the field [ft].")
    offset_nm: float | None = num_field(PATTERN_OFFSET_NM, "Lateral offset of the downwind leg [NM].", default=None)
    speed_kt: float | None = num_field(SPEED_KT, "Speed of the 180-degree turn to final [kt] (with bank_deg, "
                                       "instead of offset_nm).", default=None)
    bank_deg: float | None = num_field(BANK_DEG, "Bank of that turn [deg].", default=None)

    def __post_init__(self) -> None:
        check_declared(self)


_AOA = "angle of attack"


@dataclass(frozen=True, slots=True, kw_only=True)
class Configuration(_Model):
    """One flap/gear configuration. Speeds are at the profile's reference weight, 1 g.

    Angles of attack are in the profile's ``aoa_unit``: ``aoa_ref`` at VREF (1 g, reference
    weight), ``aoa_stall`` at the stall, ``aoa_buffet`` (optional) at the onset of buffet.
    ``bank_target_deg`` is the bank the crew plans to fly when circling, ``bank_limit_deg`` the
    most the operator or the flight manual allows. ``max_demonstrated_crosswind_kt`` (optional) is
    the flight manual's demonstrated crosswind for landing (14 CFR 25.237(a)), and
    ``tailwind_limit_kt`` (optional) its tailwind limit for landing.
    """

    _what: ClassVar[str] = "a configuration"
    _help: ClassVar[str] = "One flap/gear configuration; speeds at the profile's reference weight."

    name: str = text_field("Configuration name, unique in the profile.")
    vref_kt: float = num_field(SPEED_KT, "VREF at the reference weight [kt]; above vs1g_kt.")
    circling_speed_kt: float = num_field(SPEED_KT, "Speed flown in the circle at the reference weight [kt]; "
                                                   "at least vref_kt.")
    vs1g_kt: float = num_field(SPEED_KT, "1-g stall speed at the reference weight [kt].")
    aoa_ref: float = num_field(AOA_ANY, "Angle of attack at VREF, 1 g, reference weight [aoa_unit].", unit=_AOA)
    aoa_stall: float = num_field(AOA_ANY, "Angle of attack at the stall [aoa_unit]; above aoa_ref.", unit=_AOA)
    aoa_buffet: float | None = num_field(AOA_ANY, "Angle of attack at buffet onset [aoa_unit]; above aoa_ref, at "
                                                  "most aoa_stall.", default=None, unit=_AOA)
    bank_target_deg: float = num_field(BANK_DEG, "Bank planned in the circle [deg].")
    bank_limit_deg: float = num_field(BANK_DEG, "Most bank allowed [deg]; at least bank_target_deg.")
    max_demonstrated_crosswind_kt: float | None = num_field(
        CROSSWIND_LIMIT_KT, "Optional: the flight manual's maximum demonstrated crosswind for landing [kt] "
        "(14 CFR 25.237(a)); beyond it the brief gives a DANGER and no recommended plan.", default=None)
    tailwind_limit_kt: float | None = num_field(
        TAILWIND_LIMIT_KT, "Optional: the flight manual's tailwind limit for landing [kt]; beyond it the brief "
        "gives a DANGER and no recommended plan.", default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        if self.vref_kt <= self.vs1g_kt:
            raise InvariantError(f"expected above vs1g_kt ({_fmt(self.vs1g_kt)}), got {_fmt(self.vref_kt)}",
                                 field="vref_kt")
        if self.circling_speed_kt < self.vref_kt:
            raise InvariantError(f"expected at least vref_kt ({_fmt(self.vref_kt)}), "
                                 f"got {_fmt(self.circling_speed_kt)}", field="circling_speed_kt")
        if self.aoa_stall <= self.aoa_ref:
            raise InvariantError(f"expected above aoa_ref ({_fmt(self.aoa_ref)}), got {_fmt(self.aoa_stall)}",
                                 field="aoa_stall")
        if self.aoa_buffet is not None and not self.aoa_ref < self.aoa_buffet <= self.aoa_stall:
            raise InvariantError(f"expected above aoa_ref ({_fmt(self.aoa_ref)}) and at most aoa_stall "
                                 f"({_fmt(self.aoa_stall)}), got {_fmt(self.aoa_buffet)}", field="aoa_buffet")
        if self.bank_target_deg > self.bank_limit_deg:
            raise InvariantError(f"expected at most bank_limit_deg ({_fmt(self.bank_limit_deg)}), "
                                 f"got {_fmt(self.bank_target_deg)}", field="bank_target_deg")


@dataclass(frozen=True, slots=True, kw_only=True)
class AircraftProfile(_Model):
    """An aircraft as the crew flies it: speeds, angles of attack, habits.

    Speeds in the configurations are at ``reference_weight_lb``; at another weight W the speeds
    scale with sqrt(W / W_ref) (same lift coefficient, so the same angle of attack).

    The approach category is fixed by the speed at the maximum certificated landing weight
    (14 CFR 97.3; ICAO Doc 8168 Vol I Part I Sec 4 Ch 1): ``category_speed_kt`` when the flight
    manual publishes it; otherwise the lowest VREF of the configurations (the full landing
    configuration) scaled to ``max_landing_weight_lb``. ``vso_kt`` (optional) is the stall speed
    in the landing configuration at maximum landing weight; `approach_category_speed_kt` gives
    1.3 VSO when asked (14 CFR 97.3: "1.3 VSO if VREF is not specified").
    """

    _kind: ClassVar[str | None] = KIND_PROFILE
    _what: ClassVar[str] = "an aircraft profile"
    _title: ClassVar[str] = "briefer aircraft profile"
    _help: ClassVar[str] = (
        f"An invented or user aircraft profile for briefer (kind: {KIND_PROFILE}). Cross-field rules the loader "
        f"also checks: max_landing_weight_lb within a factor of {_fmt(WEIGHT_RATIO_LIMIT)} of reference_weight_lb; "
        f"default_configuration names a configuration; configuration names unique; with aoa_unit 'deg', aoa_ref "
        f"{_fmt(AOA_REF_DEG.lo)}..{_fmt(AOA_REF_DEG.hi)} and aoa_stall {_fmt(AOA_STALL_DEG.lo)}.."
        f"{_fmt(AOA_STALL_DEG.hi)}; vso_kt below the landing VREF at max landing weight.")

    name: str = text_field("Short name, used to find the profile (e.g. demo-twin).")
    description: str = text_field("One line about the aircraft.", default="", empty_ok=True)
    reference_weight_lb: float = num_field(WEIGHT_LB, "Weight at which the configuration speeds are given [lb].")
    max_landing_weight_lb: float = num_field(WEIGHT_LB, "Maximum certificated landing weight [lb].")
    aoa_unit: str = text_field("Unit of the angles of attack: 'deg', 'units' (indexer units) or a named unit.",
                               default="deg")
    roll_rate_deg_per_s: float = num_field(ROLL_RATE_DEG_PER_S, "Typical roll rate when rolling into the circling "
                                                                "bank [deg/s].")
    stall_warning: str = choice_field(STALL_WARNINGS, "The stall warning system.")
    aoa_indexer: bool = flag_field("True when the crew flies an AoA indexer.")
    wind_additive: WindAdditive = model_field(WindAdditive, default_factory=WindAdditive)
    familiar_pattern: FamiliarPattern = model_field(FamiliarPattern)
    configurations: tuple[Configuration, ...] = models_field(Configuration, min_items=1)
    default_configuration: str = text_field("Name of the configuration used unless another is chosen.")
    vso_kt: float | None = num_field(SPEED_KT, "Stall speed, landing configuration, max landing weight [kt] "
                                               "(1.3 VSO sets the category without a VREF).", default=None)
    category_speed_kt: float | None = num_field(SPEED_KT, "Published speed fixing the approach category [kt] "
                                                          "(else VREF scaled to max landing weight).", default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        ratio = self.max_landing_weight_lb / self.reference_weight_lb
        if not 1 / WEIGHT_RATIO_LIMIT <= ratio <= WEIGHT_RATIO_LIMIT:
            raise InvariantError(
                f"expected within a factor of {_fmt(WEIGHT_RATIO_LIMIT)} of reference_weight_lb "
                f"({_fmt(self.reference_weight_lb)}), got {_fmt(self.max_landing_weight_lb)}",
                field="max_landing_weight_lb")
        if self.aoa_unit.lower() in ("deg", "degrees", "degree"):
            _set(self, "aoa_unit", "deg")
        configs = self.configurations
        seen: dict[str, int] = {}
        for i, c in enumerate(configs):
            key = c.name.lower()
            if key in seen:
                raise InvariantError(f"duplicate configuration name '{c.name}' (also configurations[{seen[key]}])",
                                     field=f"configurations[{i}].name")
            seen[key] = i
            if self.aoa_unit == "deg":
                for name, rng in (("aoa_ref", AOA_REF_DEG), ("aoa_stall", AOA_STALL_DEG)):
                    value = getattr(c, name)
                    if value not in rng:
                        raise InvariantError(
                            f"expected an angle of attack in degrees between {_fmt(rng.lo)} and "
                            f"{_fmt(rng.hi)}, got {_fmt(value)}", field=f"configurations[{i}].{name}")
        factor = math.sqrt(self.max_landing_weight_lb / self.reference_weight_lb)
        for i, c in enumerate(configs):
            # What a brief computes at the maximum landing weight must stay in the speed range the
            # criteria handle (so that `check` and `brief` accept the same files).
            for name, extra in (("vref_kt", 0.0), ("circling_speed_kt", self.wind_additive.max_kt)):
                top = getattr(c, name) * factor + extra
                if top > SPEED_KT.hi:
                    more = f" plus the largest wind additive {_fmt(extra)} kt" if extra else ""
                    raise InvariantError(
                        f"{_fmt(getattr(c, name))} kt at the reference weight becomes {top:.0f} kt (at the "
                        f"maximum landing weight{more}), above the {_fmt(SPEED_KT.hi)} kt the briefs handle",
                        field=f"configurations[{i}].{name}")
        if self.default_configuration.lower() not in seen:
            names = [c.name for c in configs]
            hint = did_you_mean(self.default_configuration, names) or f" (configurations: {', '.join(names)})"
            raise InvariantError(f"no configuration named '{self.default_configuration}'{hint}",
                                 field="default_configuration")
        if self.vso_kt is not None:
            landing = min(configs, key=lambda c: c.vref_kt)
            vref_mlw = self.vref_kt_at(self.max_landing_weight_lb, landing.name)
            if self.vso_kt >= vref_mlw:
                raise InvariantError(
                    f"expected below the landing VREF at max landing weight ({vref_mlw:.0f}), "
                    f"got {_fmt(self.vso_kt)}", field="vso_kt")

    def configuration(self, name: str | None = None) -> Configuration:
        """The configuration called `name` (case-insensitive), or the default one."""
        wanted = (name or self.default_configuration).strip().lower()
        for c in self.configurations:
            if c.name.lower() == wanted:
                return c
        names = [c.name for c in self.configurations]
        raise DomainError(f"aircraft profile '{self.name}' has no configuration '{name}'"
                          f"{did_you_mean(name or '', names)} (configurations: {', '.join(names)})")

    def weight_speed_factor(self, weight_lb: float) -> float:
        """sqrt(W / W_ref): the factor on every speed of the profile at weight W (same AoA)."""
        if not (weight_lb > 0 and math.isfinite(weight_lb)):
            raise DomainError(f"weight must be a positive number of pounds, got {weight_lb!r}")
        return math.sqrt(weight_lb / self.reference_weight_lb)

    def vref_kt_at(self, weight_lb: float, configuration: str | None = None) -> float:
        """VREF of a configuration scaled to a weight [kt]."""
        return self.configuration(configuration).vref_kt * self.weight_speed_factor(weight_lb)

    def approach_category_speed_kt(self, *, use_vso: bool = False) -> float:
        """The speed that fixes the approach category, at maximum landing weight [kt].

        ``category_speed_kt`` if published; else the lowest VREF of the configurations scaled to
        the maximum landing weight; with ``use_vso=True`` and a ``vso_kt``, 1.3 VSO (14 CFR 97.3
        "VREF, or if VREF is not specified, 1.3 VSO").
        """
        if self.category_speed_kt is not None:
            return self.category_speed_kt
        if use_vso:
            if self.vso_kt is None:
                raise DomainError(f"aircraft profile '{self.name}' gives no vso_kt")
            return 1.3 * self.vso_kt
        landing = min(self.configurations, key=lambda c: c.vref_kt)
        return self.vref_kt_at(self.max_landing_weight_lb, landing.name)



# --------------------------------------------------------------------------------------------
# Airfield, runways, obstacles, approaches
# --------------------------------------------------------------------------------------------
# -- blocks of fields several models share, declared once -------------------------------------
COORDINATES = Forms("coordinates", (("lat_deg", "lon_deg"),), required=False, checked=False)
DISTANCE = Forms("distance", (("distance_nm",), ("distance_ft",), ("distance_m",)), required=False, checked=False)
BEARING = Forms("bearing", (("bearing_deg_mag",), ("bearing_deg_true",)), required=False, checked=False)
HEADING = Forms("heading", (("heading_deg_mag",), ("heading_deg_true",)), required=False, checked=False)
LENGTH = Forms("length", (("length_ft",), ("length_m",)), required=False, checked=False)
VISIBILITY = Forms("visibility", (("visibility_sm",), ("visibility_m",)), required=False, checked=False)
ELEVATION = Forms("elevation", (("elevation_ft",), ("tdze_ft",)), checked=False)
PLACE_KEYS = ("from_point", *DISTANCE.keys, *BEARING.keys)
"""The keys of a chart placement: a distance and a bearing from a threshold or ARP."""
_UNIT_RANGES = {"distance_nm": CHART_DISTANCE_NM, "distance_ft": CHART_DISTANCE_FT, "distance_m": CHART_DISTANCE_M,
                "bearing_deg_mag": COURSE_DEG, "bearing_deg_true": COURSE_DEG,
                "heading_deg_mag": COURSE_DEG, "heading_deg_true": COURSE_DEG,
                "length_ft": RUNWAY_LENGTH_FT, "length_m": RUNWAY_LENGTH_M}
_FROM_POINT_SCHEMA = {"type": ["string", "integer"],
                      "pattern": "^((0?[1-9]|[12][0-9]|3[0-6])[LCRlcr]?|[Aa][Rr][Pp]|[Rr]eference[ _][Pp]oint)$",
                      "minimum": 1, "maximum": 36}

Block = dict[str, tuple[str, Any]]
"""Shared field declarations: name -> (annotation, dataclass field)."""


def coordinate_fields(*, required: bool = False) -> Block:
    """lat_deg and lon_deg (WGS-84, north and east positive)."""
    default, ann = (MISSING, "float") if required else (None, "float | None")
    return {"lat_deg": (ann, declared(Spec("number", "Latitude, north positive [deg].", range=LAT_DEG,
                                           nullable=False), default=default)),
            "lon_deg": (ann, declared(Spec("number", "Longitude, east positive [deg].", range=LON_DEG,
                                           nullable=False), default=default))}


def unit_fields(rule: Forms, helps: Mapping[str, str]) -> Block:
    """One quantity the file gives in one of several units (`DISTANCE`, `BEARING`...): each key
    optional, in its range; a range error names the other keys accepted."""
    return {key: ("float | None", declared(Spec("number", helps[key], range=_UNIT_RANGES[key], nullable=False,
                                                others=tuple(k for k in rule.keys if k != key)), default=None))
            for key in rule.keys}


def distance_fields(text: str) -> Block:
    """distance_nm, distance_ft, distance_m; help ``text`` + the unit."""
    return unit_fields(DISTANCE, {"distance_nm": f"{text} [NM].", "distance_ft": f"{text} [ft].",
                                  "distance_m": f"{text} [m]."})


def placement_fields(distance_text: str, *, required: bool = False) -> Block:
    """from_point with a distance and a bearing from it (`PLACE_KEYS`)."""
    help = "What the distance and bearing are measured from: a runway threshold ('13') or ARP (the reference point)."
    return {"from_point": ("str" if required else "str | None",
                           declared(Spec("custom", help, schema=_FROM_POINT_SCHEMA, nullable=False),
                                    default=MISSING if required else None)),
            **distance_fields(distance_text),
            **unit_fields(BEARING, {"bearing_deg_mag": "Bearing from from_point, magnetic [deg].",
                                    "bearing_deg_true": "Bearing from from_point, true [deg]."})}


def with_fields(*blocks: Block, after: str | None = None) -> Any:
    """Class decorator (below ``@dataclass``): insert shared blocks of fields after the field
    `after` (first when None), so a block declared once keeps the file's key order in each model."""
    def insert(cls: Any) -> Any:
        own = list(cls.__dict__.get("__annotations__", {}).items())
        at = 0 if after is None else [k for k, _ in own].index(after) + 1
        added = [(k, ann) for block in blocks for k, (ann, _) in block.items()]
        cls.__annotations__ = dict(own[:at] + added + own[at:])
        for block in blocks:
            for k, (_, f) in block.items():
                setattr(cls, k, f)
        return cls
    return insert


# -- chart numbers: one value in one of several units -----------------------------------------
def _one_unit(obj: Any, rule: Forms, *, required: bool = False, hint: str = "") -> str | None:
    """A quantity the file may give in one of several units (`DISTANCE`: ``distance_nm``,
    ``distance_ft``, ``distance_m``): at most one of them (their ranges are the fields' own).
    Returns the key given, or None."""
    given = [n for n in rule.keys if getattr(obj, n) is not None]
    if len(given) > 1:
        raise InvariantError(f"give either {given[0]} or {given[1]}, not both", field=given[1])
    if not given:
        if required:
            raise InvariantError(f"missing the {rule.what}: give {_one_of(rule.keys).replace(chr(39), '')}{hint}")
        return None
    return given[0]


def _from_point(obj: Any) -> str | None:
    """``from_point``: a threshold designator, or the airfield reference point ('ARP')."""
    value = obj.from_point
    if value is None:
        return None
    if isinstance(value, str) and value.strip().lower().replace("_", " ") in ("arp", "reference point"):
        _set(obj, "from_point", ARP)
        return ARP
    norm = normalise_designator(value)
    if norm is None:
        raise InvariantError(f"expected a runway threshold such as '09' or 'ARP' (the reference point), "
                             f"got {_describe(value)}", field="from_point")
    _set(obj, "from_point", norm)
    return norm


class _Placed:
    """Mixin of the chart placements: a distance (NM, ft or m) and a bearing (magnetic or true)."""

    __slots__ = ()

    @property
    def distance_as_m(self) -> float | None:
        """The distance given, in metres (None if none). [m]"""
        for key, factor in (("distance_nm", units.NM_TO_M), ("distance_ft", units.FT_TO_M), ("distance_m", 1.0)):
            value = getattr(self, key)
            if value is not None:
                return value * factor
        return None

    def true_bearing_deg(self, magnetic_variation_deg: float) -> float:
        """The bearing given, referred to true north (true = magnetic + variation, east positive). [deg]"""
        if self.bearing_deg_true is not None:  # type: ignore[attr-defined]
            return float(self.bearing_deg_true) % 360.0  # type: ignore[attr-defined]
        return (self.bearing_deg_mag + magnetic_variation_deg) % 360.0  # type: ignore[attr-defined]

    def _check_distance(self, *, required: bool) -> str | None:
        return _one_unit(self, DISTANCE, required=required)

    def _check_bearing(self, *, required: bool) -> str | None:
        return _one_unit(self, BEARING, required=required, hint=" (from the point named in from_point)")

    def _check_from_bearing(self) -> None:
        """from_point with a distance and a bearing, all three or none of them."""
        _from_point(self)
        bearing = self._check_bearing(required=False)
        if self.from_point is not None:  # type: ignore[attr-defined]
            self._check_distance(required=True)
            if bearing is None:
                raise InvariantError("missing the bearing: give bearing_deg_mag or bearing_deg_true "
                                     "(from the point named in from_point)")
        elif bearing is not None:
            raise InvariantError(f"{bearing} needs from_point (the threshold or ARP it is measured from)",
                                 field=bearing)


def _coordinates(obj: Any) -> bool:
    """Optional lat_deg/lon_deg, both or neither; True when given."""
    lat, lon = obj.lat_deg is not None, obj.lon_deg is not None
    if lat != lon:
        missing = "lon_deg" if lat else "lat_deg"
        raise InvariantError(f"missing required key '{missing}' (latitude and longitude go together)")
    return lat


def _no_coordinates_with(obj: Any, keys: tuple[str, ...], form: str) -> None:
    given = [k for k in keys if getattr(obj, k) not in (None, ())]
    if given:
        raise InvariantError(f"give either lat_deg/lon_deg or {form}, not both", field=given[0])


def _placed_from(*, excluding: tuple[str, ...] = ()) -> dict[str, Any]:
    """JSON Schema: the form 'from_point with one distance and one bearing' (none of `excluding`)."""
    out: dict[str, Any] = {"required": ["from_point"], "allOf": [DISTANCE.schema_one(), BEARING.schema_one()]}
    if excluding:
        out["not"] = schema_any_key(excluding)
    return out


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(coordinate_fields(required=True))
class LatLon(_Model):
    """A point on the WGS-84 ellipsoid [degrees; north and east positive]."""

    _what: ClassVar[str] = "a position"
    _help: ClassVar[str] = "A position (WGS-84)."

    def __post_init__(self) -> None:
        check_declared(self)


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(coordinate_fields(), after="designator")
class Threshold(_Model):
    """One runway threshold (landing end): position, elevation, threshold crossing height and
    the glide path the visual approach aids (or the crew) fly to it.

    ``lat_deg``/``lon_deg`` and ``elevation_ft`` are the *landing* threshold (where the glide path
    aims). ``displaced_threshold_m`` (optional) is how far that threshold lies inside the runway:
    the distance along the centreline from the runway end (the start of the pavement, behind the
    threshold as seen on final) to the landing threshold. Absent or 0: the threshold is at the
    runway end. The runway end itself is derived, never stored twice (see `Runway`).

    The position is ``lat_deg``/``lon_deg``, or left out when the runway is given by the chart's
    heading and length (`Runway`). The elevation is ``elevation_ft`` (the threshold elevation)
    or ``tdze_ft`` when the chart prints the touchdown zone elevation instead (then used as the
    threshold's elevation; the file keeps the key it was given).
    """

    _what: ClassVar[str] = "a runway threshold"
    _help: ClassVar[str] = ("A runway threshold (landing end): coordinates, or none when the runway is given by the "
                            "chart's heading and length.")
    _forms: ClassVar[tuple[Forms, ...]] = (
        COORDINATES, ELEVATION)

    designator: str = designator_field("Runway designator, e.g. '09' or '27L' (quote it; 9 and '9' mean '09').")
    elevation_ft: float | None = num_field(
        ELEVATION_FT, f"Threshold elevation [ft]; within {_fmt(THRESHOLD_ELEVATION_SPREAD_FT)} ft of the airfield "
        "elevation.", default=None, nullable=False)
    tdze_ft: float | None = num_field(
        ELEVATION_FT, "Touchdown zone elevation, when the chart prints it instead of the threshold elevation (used "
        "as the threshold's elevation) [ft].", default=None, nullable=False)
    tch_ft: float = num_field(TCH_FT, "Threshold crossing height [ft] (default 50).", default=50.0)
    glide_path_deg: float = num_field(GLIDE_PATH_DEG, "Visual glide path to this threshold [deg] (default 3.0).",
                                      default=3.0)
    displaced_threshold_m: float | None = num_field(
        DISPLACED_THRESHOLD_M, "Distance from the runway end to this landing threshold along the centreline [m]; "
        "absent or 0: the threshold is at the runway end. lat_deg/lon_deg/elevation_ft are the landing threshold.",
        default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        _coordinates(self)
        if self.elevation_ft is None and self.tdze_ft is None:
            raise InvariantError("missing required key 'elevation_ft' (or tdze_ft, the touchdown zone elevation)")
        if self.tdze_ft is not None:
            if self.elevation_ft is not None and self.elevation_ft != self.tdze_ft:
                raise InvariantError("give either elevation_ft or tdze_ft, not both", field="tdze_ft")
            _set(self, "elevation_ft", self.tdze_ft)

    @property
    def displaced_m(self) -> float:
        """The displacement of the landing threshold from the runway end, 0 when not displaced [m]."""
        return self.displaced_threshold_m or 0.0

    @property
    def has_coordinates(self) -> bool:
        return self.lat_deg is not None

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        if self.tdze_ft is not None:
            del out["elevation_ft"]
        return out


_RECIPROCAL_SUFFIX = {"": "", "L": "R", "R": "L", "C": "C"}


def reciprocal_designator(designator: str) -> str:
    """'09' -> '27', '04L' -> '22R'."""
    number, suffix = int(designator[:2]), designator[2:]
    other = (number + 18 - 1) % 36 + 1
    return f"{other:02d}{_RECIPROCAL_SUFFIX[suffix]}"


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(placement_fields("Distance from from_point", required=True), after="threshold")
class RunwayPosition(_Placed, _Model):
    """Where a runway given by heading and length lies: its threshold ``threshold`` (default
    threshold A) at a distance and a bearing from ``from_point`` (a threshold of a runway listed
    before it, or ARP, the reference point)."""

    _what: ClassVar[str] = "a runway position"
    _help: ClassVar[str] = ("Where a runway given by heading and length lies: one of its thresholds at a distance "
                            "and a bearing from a threshold of a runway listed before it, or from ARP.")

    threshold: str | None = designator_field("Which threshold of this runway is placed (default threshold_a).",
                                             default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        self._check_from_bearing()

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        return {"allOf": _placed_from()["allOf"]}


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(distance_fields("Distance from the threshold to the crossing, along the runway"), after="threshold")
class CrossingPoint(_Model):
    """One half of 'the centrelines cross ``distance`` from threshold ``threshold``'."""

    _what: ClassVar[str] = "a crossing distance"
    _help: ClassVar[str] = "Where the centrelines cross, measured from one threshold along its runway."

    threshold: str = designator_field("A threshold of this runway or of a runway listed before it.")

    def __post_init__(self) -> None:
        check_declared(self)
        _one_unit(self, DISTANCE, required=True)

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        return {"allOf": [DISTANCE.schema_one()]}

    distance_as_m = _Placed.distance_as_m


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(unit_fields(HEADING, {
                 "heading_deg_mag": "Heading from threshold_a toward threshold_b, magnetic, as the airport diagram "
                                    "prints it [deg].",
                 "heading_deg_true": "The same heading, true [deg]."}),
             unit_fields(LENGTH, {"length_ft": "Distance between the thresholds [ft].",
                                  "length_m": "Distance between the thresholds [m]."}), after="threshold_b")
class Runway(_Model):
    """A runway: its two thresholds (reciprocal designators, 300 m to 6 km apart).

    Two forms. Coordinates: both thresholds carry ``lat_deg``/``lon_deg``. Chart: the thresholds
    carry no coordinates; ``heading_deg_mag`` (or ``heading_deg_true``) is the heading from
    threshold A toward threshold B as the airport diagram prints it, ``length_ft`` (or
    ``length_m``) the runway's length as printed, end to end (the landing thresholds lie
    ``displaced_threshold_m`` inside the ends, when given); the runway is placed by ``position`` (one threshold
    at a distance and a bearing from a threshold of a runway listed before it, or from ARP) or by
    ``crossing`` (the two centrelines cross at the given distances from a threshold of each
    runway). The first chart runway of an airfield without a reference point needs neither: its
    threshold A is the origin of the local frame (`briefer.core.layout`).
    """

    _what: ClassVar[str] = "a runway"
    _help: ClassVar[str] = (
        f"A runway: reciprocal thresholds {_fmt(RUNWAY_LENGTH_M.lo)} m to {_fmt(RUNWAY_LENGTH_M.hi / units.KM_TO_M)} "
        f"km apart, whose heading fits the designator (magnetic, within {_fmt(DESIGNATOR_TOLERANCE_DEG)} deg). Either "
        "both thresholds carry coordinates, or the runway is given by heading_deg_mag (or heading_deg_true) and "
        "length_ft (or length_m) and placed by position or crossing (the first runway of an airfield without a "
        "reference point needs neither: its threshold_a is the origin).")

    threshold_a: Threshold = model_field(Threshold)
    threshold_b: Threshold = model_field(Threshold)
    width_m: float | None = num_field(RUNWAY_WIDTH_M, "Runway width [m].", default=None)
    position: RunwayPosition | None = model_field(RunwayPosition, default=None, nullable=False)
    crossing: tuple[CrossingPoint, ...] = models_field(
        CrossingPoint, "The centrelines cross at these distances from one threshold of this runway and one of a "
        "runway listed before it.", default=())

    _CHART_KEYS: ClassVar[tuple[str, ...]] = (*HEADING.keys, *LENGTH.keys, "position", "crossing")

    def __post_init__(self) -> None:
        check_declared(self)
        crossing = self.crossing
        a, b = self.threshold_a, self.threshold_b
        if b.designator != reciprocal_designator(a.designator):
            raise InvariantError(
                f"expected '{reciprocal_designator(a.designator)}' (the reciprocal of '{a.designator}'), "
                f"got '{b.designator}'", field="threshold_b.designator")
        if a.has_coordinates != b.has_coordinates:
            bare = "threshold_b" if a.has_coordinates else "threshold_a"
            other = "threshold_a" if a.has_coordinates else "threshold_b"
            raise InvariantError(f"missing lat_deg and lon_deg ({other} has them): give both thresholds' "
                                 f"coordinates, or neither and the runway's heading and length", field=bare)
        if a.has_coordinates:
            _no_coordinates_with(self, self._CHART_KEYS, "the chart's heading and length")
        else:
            _one_unit(self, HEADING, required=True,
                      hint=" (from threshold A toward threshold B, as the airport diagram prints it)")
            _one_unit(self, LENGTH, required=True)
            if self.position is not None and crossing:
                raise InvariantError("give either position or crossing, not both", field="crossing")
            if self.position is not None and self.position.threshold not in (None, a.designator, b.designator):
                raise InvariantError(f"expected '{a.designator}' or '{b.designator}' (a threshold of this runway), "
                                     f"got '{self.position.threshold}'", field="position.threshold")
            if crossing and len(crossing) != 2:
                raise InvariantError(f"expected 2 crossing distances (one from a threshold of this runway, one "
                                     f"from a threshold of a runway before it), got {len(crossing)}",
                                     field="crossing")
        length_m = self.threshold_distance_m
        if self.chart_form and self.displaced and length_m < RUNWAY_LENGTH_M.lo:
            raise InvariantError(
                f"the displaced thresholds ({_fmt(a.displaced_m)} m and {_fmt(b.displaced_m)} m) leave "
                f"{length_m:.0f} m between the landing thresholds of a {self.end_to_end_m:.0f} m runway; "
                f"expected at least {_fmt(RUNWAY_LENGTH_M.lo)} m", field="threshold_b.displaced_threshold_m"
                if b.displaced_m else "threshold_a.displaced_threshold_m")
        if length_m not in RUNWAY_LENGTH_M:
            raise InvariantError(
                f"thresholds '{a.designator}' and '{b.designator}' are {length_m:.0f} m apart; expected "
                f"{_fmt(RUNWAY_LENGTH_M.lo)} m to {_fmt(RUNWAY_LENGTH_M.hi / units.KM_TO_M)} km",
                field="threshold_b")

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        crossing = node["properties"]["crossing"]
        node["properties"]["crossing"] = {"type": "array", "minItems": 2, "maxItems": 2, **crossing}
        with_coordinates = {"required": list(COORDINATES.keys)}
        without = {"not": schema_any_key(COORDINATES.keys)}
        return {"oneOf": [{"properties": {"threshold_a": with_coordinates, "threshold_b": with_coordinates},
                           "not": schema_any_key(cls._CHART_KEYS)},
                          {"properties": {"threshold_a": without, "threshold_b": without},
                           "allOf": [HEADING.schema_one(), LENGTH.schema_one()]}],
                "not": {"anyOf": [{"required": list(HEADING.keys)}, {"required": list(LENGTH.keys)},
                                  {"required": ["position", "crossing"]}]}}

    @property
    def chart_form(self) -> bool:
        """True when the runway is given by heading and length (no coordinates)."""
        return not self.threshold_a.has_coordinates

    @property
    def designator(self) -> str:
        """'09/27'."""
        return f"{self.threshold_a.designator}/{self.threshold_b.designator}"

    @property
    def threshold_distance_m(self) -> float:
        """Landing-threshold-to-landing-threshold distance: the charted length less the displaced
        thresholds, or from the coordinates (spherical; for display and plausibility). [m]"""
        a, b = self.threshold_a, self.threshold_b
        if self.length_ft is not None or self.length_m is not None:
            end_to_end = self.length_m if self.length_m is not None else self.length_ft * units.FT_TO_M  # type: ignore[operator]
            return end_to_end - a.displaced_m - b.displaced_m
        return _distance_m(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg)  # type: ignore[arg-type]

    @property
    def end_to_end_m(self) -> float:
        """Runway-end-to-runway-end length: the landing thresholds' distance plus both
        displacements (the ends lie on the centreline behind their thresholds) [m]."""
        return self.threshold_distance_m + self.threshold_a.displaced_m + self.threshold_b.displaced_m

    @property
    def displaced(self) -> bool:
        """True when either landing threshold lies inside the runway (displaced)."""
        return self.threshold_a.displaced_m > 0 or self.threshold_b.displaced_m > 0

    def true_heading_deg(self, magnetic_variation_deg: float) -> float:
        """The charted heading from threshold A toward B, referred to true north. [deg]"""
        if self.heading_deg_true is not None:
            return float(self.heading_deg_true) % 360.0
        if self.heading_deg_mag is None:
            raise DomainError(f"runway {self.designator} is given by coordinates, not by a charted heading")
        return (self.heading_deg_mag + magnetic_variation_deg) % 360.0

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        if not self.crossing:
            del out["crossing"]
        return out

    def ends(self, designator: str) -> tuple[Threshold, Threshold] | None:
        """(landing threshold, opposite threshold) for a designator of this runway, else None."""
        d = normalise_designator(designator)
        if d == self.threshold_a.designator:
            return self.threshold_a, self.threshold_b
        if d == self.threshold_b.designator:
            return self.threshold_b, self.threshold_a
        return None

    def matches(self, text: str) -> bool:
        """True for '27', '09/27' or '27/09' naming this runway."""
        parts = [normalise_designator(p) for p in str(text).split("/")]
        mine = {self.threshold_a.designator, self.threshold_b.designator}
        if len(parts) == 1:
            return parts[0] in mine
        return len(parts) == 2 and set(parts) == mine


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(coordinate_fields(), placement_fields("Distance from from_point"), after="kind")
class Obstacle(_Placed, _Model):
    """A charted obstacle. ``elevation_ft`` is the top, above mean sea level. Its position is
    ``lat_deg``/``lon_deg``, or ``from_point`` (a threshold or ARP) with a distance
    (``distance_nm``, ``distance_ft`` or ``distance_m``) and a bearing (``bearing_deg_mag`` or
    ``bearing_deg_true``) from it."""

    _what: ClassVar[str] = "an obstacle"
    _help: ClassVar[str] = (f"A charted obstacle (within {_fmt(OBSTACLE_FROM_ARP_KM)} km of the reference point): "
                            "lat_deg/lon_deg, or from_point with a distance and a bearing.")

    name: str = text_field("Obstacle name.")
    kind: str = choice_field(OBSTACLE_KINDS, "What it is (default 'other').", default="other")
    elevation_ft: float = num_field(ALTITUDE_FT, "Elevation of the top, MSL [ft].")
    height_agl_ft: float | None = num_field(OBSTACLE_HEIGHT_AGL_FT, "Height above the ground [ft].", default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        if _coordinates(self):
            _no_coordinates_with(self, PLACE_KEYS, "from_point, distance and bearing")
        else:
            self._check_from_bearing()
            if self.from_point is None:
                raise InvariantError("missing the position: give lat_deg and lon_deg, or from_point (a threshold "
                                     "or ARP) with distance_nm and bearing_deg_mag")
        if self.height_agl_ft is not None and self.elevation_ft - self.height_agl_ft not in ELEVATION_FT:
            raise InvariantError(
                f"the ground under the obstacle would be at {_fmt(self.elevation_ft - self.height_agl_ft)} ft "
                f"(elevation_ft minus height_agl_ft); expected {_fmt(ELEVATION_FT.lo)} to "
                f"{_fmt(ELEVATION_FT.hi)} ft", field="height_agl_ft")

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        return {"oneOf": [{"required": list(COORDINATES.keys), "not": schema_any_key(PLACE_KEYS)},
                          _placed_from(excluding=COORDINATES.keys)]}


_FIX_DISTANCE = "With threshold: before it on the final course; with from_point: from it"


@dataclass(frozen=True, slots=True, kw_only=True)
@with_fields(coordinate_fields(), after="name")
@with_fields(placement_fields(_FIX_DISTANCE), after="threshold")
class Fix(_Placed, _Model):
    """A named point of the approach (final approach fix, missed approach point).

    Its position is one of: ``lat_deg``/``lon_deg``; ``threshold`` (at that threshold, or a
    distance before it on the final approach course); ``from_point`` (a threshold or ARP) with a
    distance and a bearing from it (an off-field facility); or, for the final approach fix only, a
    distance alone: that far before the missed approach point along the final approach course.
    Distances are ``distance_nm``, ``distance_ft`` or ``distance_m``; bearings ``bearing_deg_mag``
    or ``bearing_deg_true``. The schema of the final approach fix is the variant
    'FinalApproachFix' (altitude required, and the distance alone).
    """

    _what: ClassVar[str] = "a fix"
    _help: ClassVar[str] = ("A fix (the missed approach point; altitude optional): coordinates; at a threshold or a "
                            "distance before it on the final approach course; or a distance and a bearing from a "
                            "threshold or ARP (an off-field facility).")

    name: str = text_field("Fix name.")
    threshold: str | None = designator_field("At this threshold, or distance_nm before it on the final approach "
                                             "course.", default=None, nullable=False)
    altitude_ft: float | None = num_field(ALTITUDE_FT, "Altitude at the fix, MSL [ft].", default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        if _coordinates(self):
            _no_coordinates_with(self, ("threshold", *PLACE_KEYS), "a position from the chart")
        else:
            self._check_from_bearing()
            if self.threshold is not None and self.from_point is not None:
                raise InvariantError("give either threshold (at it or a distance before it on the final course) "
                                     "or from_point with a distance and a bearing, not both", field="from_point")
            if self.threshold is not None:
                self._check_distance(required=False)
            elif self.from_point is None and self._check_distance(required=False) is None:
                raise InvariantError("missing the position: give lat_deg and lon_deg; threshold (at it, or "
                                     "distance_nm before it on the final course); from_point with distance_nm "
                                     "and bearing_deg_mag; or, for the final approach fix, distance_nm before "
                                     "the missed approach point")

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        at_threshold_not = [*DISTANCE.schema_at_most_one()["not"]["anyOf"],
                            *({"required": [k]} for k in ("from_point", *BEARING.keys))]
        forms = [{"required": list(COORDINATES.keys), "not": schema_any_key(("threshold", *PLACE_KEYS))},
                 {"required": ["threshold"], "not": {"anyOf": at_threshold_not}},
                 _placed_from(excluding=(*COORDINATES.keys, "threshold"))]
        if variant == "FinalApproachFix":
            node["description"] = ("The final approach fix (altitude required): coordinates; a distance before the "
                                   "missed approach point along the final approach course; a distance before a "
                                   "threshold; or a distance and a bearing from a threshold or ARP.")
            node["required"].append("altitude_ft")
            node["properties"]["altitude_ft"]["type"] = "number"
            for key, prop in node["properties"].items():
                if key in DISTANCE.keys:
                    prop["description"] = prop["description"].replace(
                        " [", "; alone: before the missed approach point on the final course [")
            forms.append({"allOf": [DISTANCE.schema_one()],
                          "not": schema_any_key((*COORDINATES.keys, "threshold", "from_point", *BEARING.keys))})
        return {"oneOf": forms}

    @property
    def has_coordinates(self) -> bool:
        return self.lat_deg is not None

    @property
    def before_map_only(self) -> bool:
        """True when the position is a distance alone (before the missed approach point)."""
        return self.lat_deg is None and self.threshold is None and self.from_point is None


@dataclass(frozen=True, slots=True, kw_only=True)
class _CategoryMinimum(_Model):
    """Minimums for one approach category: an MDA (feet MSL) and a visibility (statute miles or
    metres, as charted), or 'not authorised' with an optional reason."""

    _what: ClassVar[str] = "a category minimum"

    category: str      # the key above the mapping in the file (see `from_category`), so not declared
    mda_ft: float | None = num_field(ALTITUDE_FT, "Minimum descent altitude, MSL [ft].", default=None)
    visibility_sm: float | None = num_field(VISIBILITY_SM, "Visibility [statute miles] (or visibility_m).",
                                            default=None)
    visibility_m: float | None = num_field(VISIBILITY_M, "Visibility [m] (or visibility_sm).", default=None)
    not_authorised: bool = flag_field("True when this category may not use the line.")
    reason: str = text_field("Why not authorised (optional).", default="", empty_ok=True)

    def __post_init__(self) -> None:
        category = self.category
        if not isinstance(category, str) or category.strip().upper() not in CATEGORIES:
            raise InvariantError(f"expected {_one_of(CATEGORIES)}, got {_describe(category)}", field="category")
        _set(self, "category", category.strip().upper())
        check_declared(self)
        given = [k for k in ("mda_ft", "visibility_sm", "visibility_m") if getattr(self, k) is not None]
        if self.not_authorised:
            if given:
                raise InvariantError(f"expected no {given[0]} for a category that is not authorised",
                                     field=given[0])
            return
        if self.mda_ft is None:
            raise InvariantError("missing required key 'mda_ft' (or not_authorised: true)")
        if self.visibility_sm is None and self.visibility_m is None:
            raise InvariantError("missing the visibility: give visibility_sm or visibility_m")
        if self.visibility_sm is not None and self.visibility_m is not None:
            raise InvariantError("give either visibility_sm or visibility_m, not both", field="visibility_m")

    @classmethod
    def schema_extra(cls, variant: str | None, node: dict[str, Any]) -> dict[str, Any] | None:
        given = ("mda_ft", *VISIBILITY.keys)
        return {"oneOf": [{"required": ["not_authorised"], "properties": {"not_authorised": {"const": True}},
                           "not": schema_any_key(given)},
                          {"required": ["mda_ft"], "properties": {"not_authorised": {"const": False}},
                           **VISIBILITY.schema_one()}]}

    @property
    def authorised(self) -> bool:
        return not self.not_authorised

    @property
    def visibility_as_charted_m(self) -> float | None:
        """The visibility in metres, whichever unit the chart used [m]."""
        if self.visibility_m is not None:
            return self.visibility_m
        if self.visibility_sm is not None:
            return self.visibility_sm * units.SM_TO_M
        return None

    @classmethod
    def from_category(cls, category: str, data: Any, *, path: str) -> Any:
        """Read the file form (keyed by category, so without a 'category' key)."""
        if isinstance(data, Mapping) and "category" in data:
            raise FieldError("unknown key 'category' (the category is the key above)",
                             context=path, locator=join_path(path, "category"))
        if not isinstance(data, Mapping):
            raise FieldError(f"expected a mapping ({cls._what}), got {_describe(data)}", context=path)
        return cls.from_mapping({**data, "category": category}, path=path)

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        del out["category"]
        if not self.not_authorised:
            del out["not_authorised"]
        if not self.reason:
            del out["reason"]
        return out


@dataclass(frozen=True, slots=True, kw_only=True)
class CirclingMinimum(_CategoryMinimum):
    """Circling minimums for one category (MDA in feet MSL), or not authorised."""

    _what: ClassVar[str] = "a circling minimum"
    _help: ClassVar[str] = "Circling minimums of one category: MDA and one visibility, or not_authorised: true."


@dataclass(frozen=True, slots=True, kw_only=True)
class StraightInMinimum(_CategoryMinimum):
    """Straight-in minimums for one category (MDA in feet MSL), or not authorised."""

    _what: ClassVar[str] = "a straight-in minimum"
    _help: ClassVar[str] = "Straight-in minimums of one category: MDA and one visibility, or not_authorised: true."


def _read_by_category(value: Any, cls: Any, path: str) -> tuple[Any, ...]:
    if not isinstance(value, Mapping):
        raise FieldError(f"expected a mapping of categories A to E, got {_describe(value)}", context=path)
    out = []
    for key, item in value.items():
        category = str(key).strip().upper()
        if category not in CATEGORIES:
            raise FieldError(f"unknown category '{key}' (expected {_one_of(CATEGORIES)})",
                             context=path, locator=join_path(path, str(key)))
        out.append(cls.from_category(category, item, path=join_path(path, str(key))))
    return tuple(out)


def _check_categories(obj: Any, name: str, cls: type, *, min_items: int) -> None:
    items = _items(obj, name, cls, min_items=min_items, what=cls._what[2:])  # type: ignore[attr-defined]
    seen = set()
    for m in items:
        if m.category in seen:
            raise InvariantError(f"category {m.category} given twice", field=f"{name}.{m.category}")
        seen.add(m.category)
    _set(obj, name, tuple(sorted(items, key=lambda m: m.category)))


@dataclass(frozen=True, slots=True, kw_only=True)
class StraightIn(_Model):
    """Straight-in minimums of an approach for its runway, per category."""

    _what: ClassVar[str] = "straight-in minimums"
    _help: ClassVar[str] = "Straight-in minimums of the approach."

    runway: str = designator_field("The approach's runway.")
    minimums: tuple[StraightInMinimum, ...] = categories_field(StraightInMinimum,
                                                               "Straight-in minimums by category A to E.")

    def __post_init__(self) -> None:
        check_declared(self)

    @classmethod
    def _read(cls, data: Mapping[str, Any], path: str) -> dict[str, Any]:
        kwargs = dict(data)
        kwargs["minimums"] = _read_by_category(data["minimums"], StraightInMinimum,
                                               join_path(path, "minimums"))
        return kwargs

    def to_mapping(self) -> dict[str, Any]:
        return {"runway": self.runway, "minimums": {m.category: m.to_mapping() for m in self.minimums}}

    def minimum(self, category: str) -> StraightInMinimum | None:
        """The authorised minimum for a category, or None."""
        return next((m for m in self.minimums if m.category == category.upper() and m.authorised), None)


@dataclass(frozen=True, slots=True, kw_only=True)
class Sector(_Model):
    """A sector where circling is not authorised, in one of two forms.

    * bearings: ``threshold`` with ``from_deg_mag`` and ``to_deg_mag``: the sector spans the
      bearings from that threshold measured clockwise from ``from_deg_mag`` to ``to_deg_mag``
      (magnetic; 300 to 030 crosses north);
    * side: ``runway`` ('09/27' or one end '27') with ``side`` ('north', 'east', 'south' or
      'west', true compass): the half-plane on that side of the runway's centreline. The side
      must lie at least 30 degrees off the centreline (north of a north-south runway is
      meaningless); `briefer.core.geometry.side_of_centreline` builds the half-plane.
    """

    _what: ClassVar[str] = "a sector"
    _help: ClassVar[str] = ("A sector where circling is not authorised: bearings from a threshold, or one side of a "
                            "runway.")
    _forms: ClassVar[tuple[Forms, ...]] = (
        Forms("sector", (("threshold", "from_deg_mag", "to_deg_mag"), ("runway", "side"))),)

    threshold: str | None = designator_field("Threshold the bearings are measured from.", default=None)
    from_deg_mag: float | None = num_field(COURSE_DEG, "First bearing from the threshold, magnetic [deg].",
                                           default=None)
    to_deg_mag: float | None = num_field(COURSE_DEG, "Last bearing, clockwise from from_deg_mag, magnetic [deg].",
                                         default=None)
    runway: str | None = custom_field(
        {"type": ["string", "integer"], "pattern": "^(0?[1-9]|[12][0-9]|3[0-6])[LCRlcr]?(/(0?[1-9]|[12][0-9]|3[0-6])"
         "[LCRlcr]?)?$"}, "Runway whose side is meant: '09/27' or one end '27'.", default=None)
    side: str | None = choice_field(SIDES, f"Compass side of the runway centreline (true); at least "
                                           f"{_fmt(SIDE_MIN_ANGLE_TO_RUNWAY_DEG)} deg off the centreline.",
                                    default=None)
    reason: str = text_field("Why circling is not authorised there.", default="", empty_ok=True)

    def __post_init__(self) -> None:
        check_declared(self)
        if self.threshold is not None:
            if _angle_diff_deg(self.from_deg_mag, self.to_deg_mag) == 0:  # type: ignore[arg-type]
                raise InvariantError(f"expected a bearing different from from_deg_mag "
                                     f"({_fmt(self.from_deg_mag)}), got {_fmt(self.to_deg_mag)}",  # type: ignore[arg-type]
                                     field="to_deg_mag")
        else:
            raw = self.runway
            parts = [normalise_designator(p) for p in raw.split("/")] if isinstance(raw, str) else [
                normalise_designator(raw)]
            if len(parts) > 2 or None in parts:
                raise InvariantError(f"expected a runway such as '09/27' or '27', got {_describe(raw)}",
                                     field="runway")
            _set(self, "runway", "/".join(parts))  # type: ignore[arg-type]

    @property
    def kind(self) -> str:
        """'bearings' or 'side'."""
        return "bearings" if self.threshold is not None else "side"

    def where_text(self) -> str:
        """'from threshold 15, 040°-110° M' or 'south of runway 09/27'."""
        if self.kind == "bearings":
            return f"from threshold {self.threshold}, {self.from_deg_mag:03.0f}°-{self.to_deg_mag:03.0f}° M"
        return f"{self.side} of runway {self.runway}"


@dataclass(frozen=True, slots=True, kw_only=True)
class Approach(_Model):
    """An instrument approach and its minimums.

    ``runway`` is the threshold the final course serves, or None for a circling-only procedure.
    ``map_fix`` is the missed approach point. ``criteria`` names the design criteria behind the
    circling area: 'terps-legacy', 'terps-expanded' or 'icao'. ``circling`` holds a minimum per
    category; a category that is absent is not published (treat as not authorised).
    """

    _what: ClassVar[str] = "an approach"
    _help: ClassVar[str] = (f"An instrument approach; FAF {_fmt(FAF_HEIGHT_FT.lo)} to {_fmt(FAF_HEIGHT_FT.hi)} ft above "
                            f"the airfield, fixes within {_fmt(FIX_FROM_ARP_NM)} NM.")

    name: str = text_field("Approach name as charted, unique at the airfield (e.g. 'RNAV (GPS) RWY 09', 'VOR-A').")
    runway: str | None = designator_field("Threshold the final course serves; null for a circling-only procedure.",
                                          default=None)
    final_course_deg_mag: float = num_field(COURSE_DEG, "Final approach course, magnetic [deg].")
    faf: Fix = model_field(Fix, schema_ref="FinalApproachFix")
    map_fix: Fix = model_field(Fix)
    criteria: str = choice_field(CRITERIA, "Design criteria of the circling area.")
    rnav_gps: bool = flag_field("True for an RNAV (GPS) / RNP procedure.")
    circling: tuple[CirclingMinimum, ...] = categories_field(
        CirclingMinimum, f"Circling minimums by category A to E; an absent category is not published. MDA "
        f"{_fmt(CIRCLING_HAA_FT.lo)} to {_fmt(CIRCLING_HAA_FT.hi)} ft above the airfield elevation.")
    not_authorised_sectors: tuple[Sector, ...] = models_field(Sector, default=())
    straight_in: StraightIn | None = model_field(StraightIn, default=None)
    missed_approach: str = text_field("Missed approach instructions, as charted.", default="", empty_ok=True)

    def __post_init__(self) -> None:
        check_declared(self)
        if self.faf.altitude_ft is None:
            raise InvariantError("missing required key 'altitude_ft'", field="faf")
        if self.straight_in is not None:
            if self.runway is None:
                raise InvariantError("a circling-only approach (no runway) has no straight-in minimums",
                                     field="straight_in")
            if self.straight_in.runway != self.runway:
                raise InvariantError(f"expected '{self.runway}' (the approach's runway), "
                                     f"got '{self.straight_in.runway}'", field="straight_in.runway")

    @classmethod
    def _read(cls, data: Mapping[str, Any], path: str) -> dict[str, Any]:
        rest = {k: v for k, v in data.items() if k != "circling"}
        kwargs = _Model._read.__func__(cls, rest, path)  # type: ignore[attr-defined]
        if kwargs["faf"].altitude_ft is None:
            raise FieldError("missing required key 'altitude_ft'", context=join_path(path, "faf"))
        kwargs["circling"] = _read_by_category(data["circling"], CirclingMinimum, join_path(path, "circling"))
        return kwargs

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        out["circling"] = {m.category: m.to_mapping() for m in self.circling}
        return out

    @property
    def circling_only(self) -> bool:
        """True when the procedure serves no runway (a circling-only, lettered procedure)."""
        return self.runway is None

    def circling_entry(self, category: str) -> CirclingMinimum | None:
        """The circling entry for a category as published (authorised or not), or None."""
        return next((m for m in self.circling if m.category == category.upper()), None)

    def circling_minimum(self, category: str) -> CirclingMinimum | None:
        """The authorised circling minimum for a category, or None (not authorised/published)."""
        entry = self.circling_entry(category)
        return entry if entry is not None and entry.authorised else None

    def circling_not_authorised_reason(self, category: str) -> str | None:
        """Why a category may not circle (None when it may)."""
        entry = self.circling_entry(category)
        if entry is None:
            return f"no circling minimum published for category {category.upper()}"
        if entry.not_authorised:
            return entry.reason or f"circling not authorised for category {entry.category}"
        return None


@dataclass(frozen=True, slots=True, kw_only=True)
class Airfield(_Model):
    """An airfield: reference point, elevation, magnetic variation, runways, obstacles, approaches.

    ``magnetic_variation_deg`` is east positive: true = magnetic + variation. A file may leave it
    out: it is then computed from the World Magnetic Model at the reference point for today's date
    (`briefer.core.magvar`), ``variation_model`` keeps that computation (None when the file gave
    the variation), and `to_mapping` leaves it out again, so a saved file keeps following the model.
    Without a reference point the model cannot be used and the variation is required.

    ``reference_point`` may be left out when every position is given by chart numbers
    (headings, lengths, distances and bearings): the airfield then lives in a local frame with
    its origin at the first runway's threshold A, tied to no place on the earth.

    ``layout`` (derived, not a file key) holds every threshold, fix and obstacle in the local frame
    (`briefer.core.layout.Layout`); it is computed once, when the airfield is built.
    """

    _kind: ClassVar[str | None] = KIND_AIRFIELD
    _what: ClassVar[str] = "an airfield"
    _title: ClassVar[str] = "briefer airfield"
    _help: ClassVar[str] = (
        f"An invented or user airfield for briefer (kind: {KIND_AIRFIELD}). Positions are latitude/longitude, or the "
        "numbers an approach chart and an airport diagram print (headings, lengths, distances and bearings); "
        "without reference_point every position must be chart numbers and the airfield lives in a local frame. "
        "Cross-field rules the loader also checks are given in the descriptions.")

    ident: str = text_field("Identifier, 2 to 8 letters or digits.", pattern="[A-Za-z0-9]{2,8}",
                            pattern_words="2 to 8 letters or digits")
    name: str = text_field("Airfield name.")
    reference_point: LatLon | None = model_field(
        LatLon, "The airfield reference point (ARP). Optional: leave it out to enter everything from the chart (a "
        "local frame with its origin at the first runway's threshold_a).", default=None)
    elevation_ft: float = num_field(ELEVATION_FT, "Airfield elevation [ft].")
    magnetic_variation_deg: float | None = num_field(
        VARIATION_DEG, "Magnetic variation, east positive: true = magnetic + variation [deg]. The chart's variation "
        "of record; when absent it is computed from the World Magnetic Model at the reference point for today's "
        "date. Required without a reference point (a local frame): give the chart's.", default=None)
    runways: tuple[Runway, ...] = models_field(Runway, min_items=1)
    obstacles: tuple[Obstacle, ...] = models_field(Obstacle, default=())
    approaches: tuple[Approach, ...] = models_field(Approach, min_items=1)
    variation_model: Any = field(default=None, init=False, compare=False, repr=False)
    layout: Any = field(default=None, init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        check_declared(self)
        _set(self, "ident", self.ident.upper())
        if self.magnetic_variation_deg is None:
            self._variation_from_model()
        runways, obstacles, approaches = self.runways, self.obstacles, self.approaches
        self._check_runways(runways)
        self._check_obstacles(obstacles)
        self._check_approaches(approaches)
        from briefer.core import layout as _layout   # pure computation; imported here, not at start-up

        try:
            _set(self, "layout", _layout.layout_airfield(self))
        except _layout.LayoutError as exc:
            raise InvariantError(exc.message, field=exc.field) from None
        self._check_chart_distances()
        for i, ap in enumerate(approaches):
            for j, sector in enumerate(ap.not_authorised_sectors):
                if sector.kind == "side":
                    self._check_side(sector, f"approaches[{i}].not_authorised_sectors[{j}]")

    def _variation_from_model(self) -> None:
        """Fill the variation from the World Magnetic Model (the file gives none)."""
        rp = getattr(self, "reference_point", None)
        if rp is None:
            raise InvariantError("missing: without a reference point the World Magnetic Model cannot be "
                                 "used; give the chart's magnetic variation", field="magnetic_variation_deg")
        from briefer.core import magvar   # imports the model's package only when needed

        try:
            mv = magvar.model_variation(rp.lat_deg, rp.lon_deg, magvar.today_utc())
        except DomainError as exc:
            raise InvariantError(f"not given, and the World Magnetic Model cannot give it: {exc}",
                                 field="magnetic_variation_deg") from None
        _set(self, "magnetic_variation_deg", mv.variation_deg)
        _set(self, "variation_model", mv)

    def to_mapping(self) -> dict[str, Any]:
        """As `_Model.to_mapping`; a variation computed from the model is left out again."""
        out = super(Airfield, self).to_mapping()
        if self.variation_model is not None:
            out.pop("magnetic_variation_deg", None)
        return out

    # -- cross-field rules -------------------------------------------------------------------
    def _from_arp_m(self, lat_deg: float | None, lon_deg: float | None) -> float:
        """Distance of a position given by coordinates from the reference point (0 when there is
        none: the layout then refuses the coordinates with its own message). [m]"""
        if self.reference_point is None or lat_deg is None or lon_deg is None:
            return 0.0
        return _distance_m(self.reference_point.lat_deg, self.reference_point.lon_deg, lat_deg, lon_deg)

    def _check_chart_distances(self) -> None:
        """Positions from chart numbers lie where the airfield's plausibility limits allow (one
        clear message for a MAP 40 NM away or a runway placed 20 km off)."""
        lay = self.layout
        origin = lay.origin
        for i, rw in enumerate(self.runways):
            if not rw.chart_form:
                continue
            for key in ("threshold_a", "threshold_b"):
                th = getattr(rw, key)
                km = lay.distance_from_origin_m(lay.thresholds_m[th.designator]) / units.KM_TO_M
                if km > THRESHOLD_FROM_ARP_KM:
                    raise InvariantError(f"the threshold would be {km:.1f} km from {origin}; expected within "
                                         f"{_fmt(THRESHOLD_FROM_ARP_KM)} km (check the runway's position)",
                                         field=f"runways[{i}].{key}")
        for i, ob in enumerate(self.obstacles):
            km = lay.distance_from_origin_m(lay.obstacles_m[i]) / units.KM_TO_M
            if ob.lat_deg is None and km > OBSTACLE_FROM_ARP_KM:
                raise InvariantError(f"the obstacle would be {km:.1f} km from {origin}; expected within "
                                     f"{_fmt(OBSTACLE_FROM_ARP_KM)} km", field=f"obstacles[{i}]")
        for i, ap in enumerate(self.approaches):
            for fix_key, xy in zip(("faf", "map_fix"), lay.fixes_m[ap.name]):
                nm = lay.distance_from_origin_m(xy) * units.M_TO_NM
                if not getattr(ap, fix_key).has_coordinates and nm > FIX_FROM_ARP_NM:
                    raise InvariantError(f"the fix would be {nm:.1f} NM from {origin}; expected within "
                                         f"{_fmt(FIX_FROM_ARP_NM)} NM (check its distance, its bearing and the "
                                         f"final course)", field=f"approaches[{i}].{fix_key}")

    def _check_runways(self, runways: tuple[Runway, ...]) -> None:
        seen: dict[str, int] = {}
        for i, rw in enumerate(runways):
            for key in ("threshold_a", "threshold_b"):
                th: Threshold = getattr(rw, key)
                where = f"runways[{i}].{key}"
                if th.designator in seen:
                    raise InvariantError(f"runway designator '{th.designator}' is also used by "
                                         f"runways[{seen[th.designator]}]", field=f"{where}.designator")
                km = self._from_arp_m(th.lat_deg, th.lon_deg) / units.KM_TO_M
                if km > THRESHOLD_FROM_ARP_KM:
                    raise InvariantError(f"the threshold is {km:.1f} km from the reference point; expected "
                                         f"within {_fmt(THRESHOLD_FROM_ARP_KM)} km", field=where)
                if abs(th.elevation_ft - self.elevation_ft) > THRESHOLD_ELEVATION_SPREAD_FT:
                    raise InvariantError(
                        f"expected within {_fmt(THRESHOLD_ELEVATION_SPREAD_FT)} ft of the airfield elevation "
                        f"({_fmt(self.elevation_ft)}), got {_fmt(th.elevation_ft)}", field=f"{where}.elevation_ft")
            seen[rw.threshold_a.designator] = i
            seen[rw.threshold_b.designator] = i
            a, b = rw.threshold_a, rw.threshold_b
            nominal = int(a.designator[:2]) * 10.0
            if rw.chart_form:
                true_deg = rw.true_heading_deg(self.magnetic_variation_deg)
                mag_deg = (true_deg - self.magnetic_variation_deg) % 360.0
                if _angle_diff_deg(mag_deg, nominal) > DESIGNATOR_TOLERANCE_DEG:
                    key = "heading_deg_mag" if rw.heading_deg_mag is not None else "heading_deg_true"
                    given = rw.heading_deg_mag if rw.heading_deg_mag is not None else rw.heading_deg_true
                    other = " (that is the heading of the other end, '" + b.designator + "')" if _angle_diff_deg(
                        mag_deg, nominal + 180.0) <= DESIGNATOR_TOLERANCE_DEG else ""
                    raise InvariantError(
                        f"expected a heading within {_fmt(DESIGNATOR_TOLERANCE_DEG)} degrees of {nominal:03.0f} "
                        f"magnetic for designator '{a.designator}' (threshold_a), got {_fmt(given)}"  # type: ignore[arg-type]
                        f"{' true (' + format(mag_deg, '05.1f') + ' magnetic)' if key == 'heading_deg_true' else ''}"
                        f"{other}", field=f"runways[{i}].{key}")
                continue
            true_deg = _bearing_deg_true(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg)  # type: ignore[arg-type]
            mag_deg = (true_deg - self.magnetic_variation_deg) % 360.0
            if _angle_diff_deg(mag_deg, nominal) > DESIGNATOR_TOLERANCE_DEG:
                raise InvariantError(
                    f"the bearing from threshold '{a.designator}' to '{b.designator}' is {mag_deg:03.0f} "
                    f"degrees magnetic ({true_deg:03.0f} true); expected within "
                    f"{_fmt(DESIGNATOR_TOLERANCE_DEG)} degrees of {nominal:03.0f} for designator "
                    f"'{a.designator}' (check the coordinates and magnetic_variation_deg)", field=f"runways[{i}]")

    def _check_obstacles(self, obstacles: tuple[Obstacle, ...]) -> None:
        for i, ob in enumerate(obstacles):
            km = self._from_arp_m(ob.lat_deg, ob.lon_deg) / units.KM_TO_M
            if km > OBSTACLE_FROM_ARP_KM:
                raise InvariantError(f"the obstacle is {km:.1f} km from the reference point; expected within "
                                     f"{_fmt(OBSTACLE_FROM_ARP_KM)} km", field=f"obstacles[{i}]")

    def _check_approaches(self, approaches: tuple[Approach, ...]) -> None:
        names: dict[str, int] = {}
        designators = [d for rw in self.runways for d in (rw.threshold_a.designator, rw.threshold_b.designator)]
        for i, ap in enumerate(approaches):
            where = f"approaches[{i}]"
            key = _loose(ap.name)
            if key in names:
                raise InvariantError(f"approach name '{ap.name}' is also used by approaches[{names[key]}]",
                                     field=f"{where}.name")
            names[key] = i
            if ap.runway is not None and ap.runway not in designators:
                raise InvariantError(f"no runway '{ap.runway}' at this airfield (runways: "
                                     f"{', '.join(rw.designator for rw in self.runways)})", field=f"{where}.runway")
            for fix_key in ("faf", "map_fix"):
                fix: Fix = getattr(ap, fix_key)
                nm = self._from_arp_m(fix.lat_deg, fix.lon_deg) * units.M_TO_NM
                if nm > FIX_FROM_ARP_NM:
                    raise InvariantError(f"the fix is {nm:.1f} NM from the reference point; expected within "
                                         f"{_fmt(FIX_FROM_ARP_NM)} NM", field=f"{where}.{fix_key}")
            faf_height = ap.faf.altitude_ft - self.elevation_ft  # type: ignore[operator]
            if faf_height not in FAF_HEIGHT_FT:
                raise InvariantError(
                    f"expected {_fmt(FAF_HEIGHT_FT.lo)} to {_fmt(FAF_HEIGHT_FT.hi)} ft above the airfield "
                    f"elevation ({_fmt(self.elevation_ft)}), got {_fmt(ap.faf.altitude_ft)}",  # type: ignore[arg-type]
                    field=f"{where}.faf.altitude_ft")
            for m in ap.circling:
                if m.mda_ft is not None and m.mda_ft - self.elevation_ft not in CIRCLING_HAA_FT:
                    raise InvariantError(
                        f"expected {_fmt(CIRCLING_HAA_FT.lo)} to {_fmt(CIRCLING_HAA_FT.hi)} ft above the "
                        f"airfield elevation ({_fmt(self.elevation_ft)}), got {_fmt(m.mda_ft)} "
                        f"({_fmt(m.mda_ft - self.elevation_ft)} ft above)", field=f"{where}.circling.{m.category}.mda_ft")
            if ap.straight_in is not None:
                landing, _ = self.runway_by_designator(ap.straight_in.runway)
                for m in ap.straight_in.minimums:
                    if m.mda_ft is not None and m.mda_ft - landing.elevation_ft not in STRAIGHT_IN_HAT_FT:
                        raise InvariantError(
                            f"expected {_fmt(STRAIGHT_IN_HAT_FT.lo)} to {_fmt(STRAIGHT_IN_HAT_FT.hi)} ft above "
                            f"the threshold elevation ({_fmt(landing.elevation_ft)}), got {_fmt(m.mda_ft)} "
                            f"({_fmt(m.mda_ft - landing.elevation_ft)} ft above)",
                            field=f"{where}.straight_in.minimums.{m.category}.mda_ft")
            if ap.map_fix.before_map_only:
                raise InvariantError("a distance alone places the final approach fix before the missed approach "
                                     "point; give the missed approach point by threshold (at it, or distance_nm "
                                     "before it) or by from_point with distance_nm and bearing_deg_mag",
                                     field=f"{where}.map_fix")
            for j, sector in enumerate(ap.not_authorised_sectors):
                self._check_sector(sector, f"{where}.not_authorised_sectors[{j}]", designators)

    def _check_sector(self, sector: Sector, where: str, designators: list[str]) -> None:
        if sector.threshold is not None:
            if sector.threshold not in designators:
                raise InvariantError(f"no runway threshold '{sector.threshold}' at this airfield (thresholds: "
                                     f"{', '.join(designators)})", field=f"{where}.threshold")
            return
        runway = next((rw for rw in self.runways if rw.matches(sector.runway or "")), None)
        if runway is None:
            raise InvariantError(f"no runway '{sector.runway}' at this airfield (runways: "
                                 f"{', '.join(rw.designator for rw in self.runways)})", field=f"{where}.runway")

    def _check_side(self, sector: Sector, where: str) -> None:
        """A side sector lies to one side of its runway (checked on the layout)."""
        runway = self.runway(sector.runway or "")
        axis = self.layout.headings_deg[runway.threshold_a.designator]
        side = SIDE_BEARING_DEG_TRUE[sector.side]  # type: ignore[index]
        off_axis = min(_angle_diff_deg(side, axis), _angle_diff_deg(side, axis + 180.0))
        if off_axis < SIDE_MIN_ANGLE_TO_RUNWAY_DEG:
            raise InvariantError(f"'{sector.side}' lies along runway {runway.designator} (axis {axis:03.0f} "
                                 f"true), not to one side of it", field=f"{where}.side")

    # -- look-ups ----------------------------------------------------------------------------
    @property
    def thresholds(self) -> tuple[Threshold, ...]:
        """Every runway threshold of the airfield."""
        return tuple(t for rw in self.runways for t in (rw.threshold_a, rw.threshold_b))

    def runway(self, designator: str) -> Runway:
        """The runway named '27', '09/27' or '27/09'."""
        for rw in self.runways:
            if rw.matches(designator):
                return rw
        raise DomainError(self._no_runway(designator))

    def runway_by_designator(self, designator: str) -> tuple[Threshold, Threshold]:
        """(landing threshold, opposite threshold) for a landing designator such as '27'."""
        for rw in self.runways:
            ends = rw.ends(designator)
            if ends is not None:
                return ends
        raise DomainError(self._no_runway(designator))

    def _no_runway(self, designator: str) -> str:
        names = [rw.designator for rw in self.runways]
        return f"airfield {self.ident} has no runway '{designator}' (runways: {', '.join(names)})"

    def approach(self, name: str) -> Approach:
        """The approach called `name` (case, spaces and punctuation ignored)."""
        wanted = _loose(name)
        for ap in self.approaches:
            if _loose(ap.name) == wanted:
                return ap
        names = [ap.name for ap in self.approaches]
        raise DomainError(f"airfield {self.ident} has no approach '{name}'{did_you_mean(name, names)} "
                          f"(approaches: {', '.join(names)})")



# --------------------------------------------------------------------------------------------
# Weather and the request
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class Weather(_Model):
    """Today's weather; every item optional (None = not reported).

    ``wind_from_deg`` is the direction the wind blows from, in the reference ``wind_reference``
    names ('true' for a METAR, 'magnetic' for a tower or ATIS report); None with a speed means a
    variable wind. ``altimeter_hpa`` is QNH; the file form also accepts ``altimeter_inhg``.
    ``ceiling_ft`` is above the airfield.
    """

    _what: ClassVar[str] = "weather"
    _extra_fields: ClassVar[dict[str, tuple[str, Spec]]] = {
        "altimeter_inhg": ("altimeter_hpa", Spec("number", "Altimeter setting [inHg] (instead of altimeter_hpa).",
                                                 range=ALTIMETER_INHG, nullable=False))}
    _forms: ClassVar[tuple[Forms, ...]] = (
        Forms("altimeter", (("altimeter_hpa",), ("altimeter_inhg",)), required=False, checked=False),)

    wind_from_deg: float | None = num_field(COURSE_DEG, "Direction the wind blows from, in the reference "
                                                        "wind_reference names [deg]; needs wind_speed_kt.", default=None)
    wind_speed_kt: float | None = num_field(WIND_SPEED_KT, "Mean wind speed [kt]; without a direction the wind is "
                                                           "variable.", default=None)
    wind_gust_kt: float | None = num_field(WIND_GUST_KT, "Gusts, above wind_speed_kt [kt].", default=None)
    wind_reference: str = choice_field(WIND_REFERENCES, "Reference of wind_from_deg: 'true' (a METAR; required "
                                                        "with a report) or 'magnetic' (tower, ATIS).", default="true")
    oat_c: float | None = num_field(OAT_C, "Surface temperature [degC].", default=None)
    altimeter_hpa: float | None = num_field(ALTIMETER_HPA, "Altimeter setting (QNH) [hPa]; or give altimeter_inhg.",
                                            default=None)
    visibility_sm: float | None = num_field(WX_VISIBILITY_SM, "Reported visibility [statute miles].", default=None)
    ceiling_ft: float | None = num_field(CEILING_FT, "Ceiling above the airfield [ft].", default=None)

    def __post_init__(self) -> None:
        check_declared(self)
        if self.wind_from_deg is not None and self.wind_speed_kt is None:
            raise InvariantError("missing required key 'wind_speed_kt' (wind_from_deg needs a speed)")
        if self.wind_gust_kt is not None:
            if self.wind_speed_kt is None:
                raise InvariantError("missing required key 'wind_speed_kt' (wind_gust_kt needs a steady speed)")
            if self.wind_gust_kt <= self.wind_speed_kt:
                raise InvariantError(f"expected above wind_speed_kt ({_fmt(self.wind_speed_kt)}), "
                                     f"got {_fmt(self.wind_gust_kt)}", field="wind_gust_kt")

    @classmethod
    def _read(cls, data: Mapping[str, Any], path: str) -> dict[str, Any]:
        kwargs = _Model._read.__func__(cls, data, path)  # type: ignore[attr-defined]
        if "altimeter_inhg" in data:
            if "altimeter_hpa" in data:
                raise FieldError("give either altimeter_hpa or altimeter_inhg, not both",
                                 context=join_path(path, "altimeter_inhg"))
            try:
                inhg = check_number("altimeter_inhg", data["altimeter_inhg"],
                                    cls._extra_fields["altimeter_inhg"][1].range)
            except InvariantError as exc:
                raise FieldError(exc.message, context=join_path(path, exc.field)) from None
            kwargs["altimeter_hpa"] = inhg * units.INHG_TO_HPA  # type: ignore[operator]
        return kwargs

    def wind_from_deg_true(self, magnetic_variation_deg: float) -> float | None:
        """The wind direction referred to true north (None if not reported or variable) [deg]."""
        if self.wind_from_deg is None:
            return None
        if self.wind_reference == "magnetic":
            return (self.wind_from_deg + magnetic_variation_deg) % 360.0
        return self.wind_from_deg

    @property
    def gust_increment_kt(self) -> float:
        """Gust minus steady speed (0 without a gust) [kt]."""
        if self.wind_gust_kt is None or self.wind_speed_kt is None:
            return 0.0
        return self.wind_gust_kt - self.wind_speed_kt


@dataclass(frozen=True, slots=True, kw_only=True)
class BriefOptions(_Model):
    """Choices the crew makes that are not data: which criteria set to show (None = the
    approach's own), which cold-temperature method, whether to add the wind additive."""

    _what: ClassVar[str] = "options"

    criteria: str | None = choice_field(CRITERIA, "The criteria set to show (default: the approach's own).",
                                        default=None)
    cold_temperature_method: str = choice_field(COLD_TEMPERATURE_METHODS, "How the cold-temperature correction is "
                                                "computed.", default="sea-level-table")
    apply_wind_additive: bool = flag_field("Add the wind additive to the approach speed.", default=True)

    def __post_init__(self) -> None:
        check_declared(self)


@dataclass(frozen=True, slots=True, kw_only=True)
class BriefRequest(_Model):
    """Everything `build_brief` needs: aircraft, configuration, airfield, approach, landing
    runway, weather and the crew's choices.

    ``configuration`` None means the profile's default; ``weight_lb`` None means the maximum
    landing weight; ``bank_deg`` overrides the configuration's planned bank;
    ``stabilised_height_ft`` (above the threshold) defaults to 300 ft (common practice for a
    visual manoeuvre).
    """

    _what: ClassVar[str] = "a brief request"

    profile: AircraftProfile = model_field(AircraftProfile)
    configuration: str | None = text_field("A configuration of the profile (default: its default).", default=None)
    airfield: Airfield = model_field(Airfield)
    approach: str = text_field("The approach's name.")
    landing_runway: str = designator_field("The runway to land on.")
    weather: Weather = model_field(Weather, default_factory=Weather)
    weight_lb: float | None = num_field(WEIGHT_LB, "Landing weight (default: the maximum) [lb].", default=None)
    bank_deg: float | None = num_field(BANK_DEG, "Bank to plan (default: the configuration's) [deg].", default=None)
    stabilised_height_ft: float = num_field(STABILISED_HEIGHT_FT, "Height above the threshold to be stabilised "
                                                                  "at [ft].", default=300.0)
    options: BriefOptions = model_field(BriefOptions, default_factory=BriefOptions)

    def __post_init__(self) -> None:
        check_declared(self)
        for name, look_up in (("configuration", lambda: self.profile.configuration(self.configuration)),
                              ("approach", lambda: self.airfield.approach(self.approach)),
                              ("landing_runway", lambda: self.airfield.runway_by_designator(self.landing_runway))):
            try:
                look_up()
            except DomainError as exc:
                raise InvariantError(str(exc), field=name) from None
        if self.weight_lb is not None:
            mlw = self.profile.max_landing_weight_lb
            low = LANDING_WEIGHT_MIN_FRACTION * mlw
            if not low <= self.weight_lb <= mlw:
                raise InvariantError(f"expected a landing weight between {low:.0f} and the maximum landing "
                                     f"weight {_fmt(mlw)}, got {_fmt(self.weight_lb)}", field="weight_lb")

    @property
    def landing_weight_lb(self) -> float:
        """The weight to brief: ``weight_lb`` or the maximum landing weight [lb]."""
        return self.weight_lb if self.weight_lb is not None else self.profile.max_landing_weight_lb

    def selected_configuration(self) -> Configuration:
        return self.profile.configuration(self.configuration)

    def selected_approach(self) -> Approach:
        return self.airfield.approach(self.approach)

    def landing_threshold(self) -> Threshold:
        return self.airfield.runway_by_designator(self.landing_runway)[0]
