"""The app's state: the frozen inputs model, the loaded catalog, and the one function that turns
inputs into a BriefRequest (the app computes nothing else itself).

No Textual import here, so the state and the file format can be tested without a terminal.
"""

from __future__ import annotations

import re
from briefer._dataclass import dataclass, field, replace
from typing import TYPE_CHECKING, Any

from briefer.errors import BriefingError, DomainError

if TYPE_CHECKING:   # the model (and numpy, through briefer.units) load with the catalog, after the first frame
    from briefer.model import AircraftProfile, Airfield

WEATHER_KEYS = ("wind_from_deg", "wind_speed_kt", "wind_gust_kt", "oat_c", "altimeter_hpa",
                "visibility_sm", "ceiling_ft")


@dataclass(frozen=True, slots=True, kw_only=True)
class WeatherInputs:
    """The weather as the crew gave it. Every value is an explicit entry (None = not typed);
    a value not typed comes from the pasted report, if any.

    ``report`` is the METAR/SPECI text ('' = none). ``wind_speed_kt`` None means no wind typed
    (the report's wind is used); a typed calm is speed 0 with no direction.
    """

    wind_from_deg: float | None = None
    wind_speed_kt: float | None = None
    wind_gust_kt: float | None = None
    wind_reference: str = "true"
    oat_c: float | None = None
    altimeter_hpa: float | None = None
    visibility_sm: float | None = None
    ceiling_ft: float | None = None
    report: str = ""

    def explicit(self) -> dict[str, Any]:
        """The typed values only (keys of `briefer.model.Weather`)."""
        out = {k: getattr(self, k) for k in WEATHER_KEYS if getattr(self, k) is not None}
        if self.wind_speed_kt is not None:
            out["wind_from_deg"] = self.wind_from_deg
            out["wind_gust_kt"] = self.wind_gust_kt
            out["wind_reference"] = self.wind_reference
        return out

    def cleared(self) -> WeatherInputs:
        """No typed values (the report, if any, fills everything)."""
        return WeatherInputs(report=self.report)


@dataclass(frozen=True, slots=True, kw_only=True)
class BriefingInputs:
    """Everything the crew chose or typed: names into the catalog, and the weather.

    Names, not models: the file format saves these, and the catalog resolves them.
    """

    profile: str
    configuration: str | None = None
    airfield: str
    approach: str
    landing_runway: str
    weight_lb: float | None = None
    bank_deg: float | None = None
    criteria: str | None = None
    weather: WeatherInputs = field(default_factory=WeatherInputs)

    def with_weather(self, **changes: Any) -> BriefingInputs:
        return replace(self, weather=replace(self.weather, **changes))


@dataclass(frozen=True, slots=True, kw_only=True)
class CatalogItem:
    """One entry of a list the crew picks from: a loaded model, or a broken file and why."""

    name: str
    title: str
    source: str
    builtin: bool
    model: Any = None
    error: str | None = None


@dataclass(frozen=True, slots=True, kw_only=True)
class AppCatalog:
    """What the catalog found, loaded: profiles and airfields (first of a name wins)."""

    profiles: tuple[CatalogItem, ...]
    airfields: tuple[CatalogItem, ...]
    loaders: dict = field(default_factory=dict, compare=False, repr=False)
    _models: dict = field(default_factory=dict, compare=False, repr=False)

    @classmethod
    def load(cls, *, profile_dirs=(), airfield_dirs=(), use_config: bool = True) -> AppCatalog:
        """Read every profile and airfield file the catalog sees (a broken file is listed with
        its error, never raised)."""
        from briefer.io import catalog
        from briefer.io.yamlload import load_airfield, load_profile

        def items(entries) -> tuple[CatalogItem, ...]:
            out: list[CatalogItem] = []
            seen: set[str] = set()
            for e in entries:
                key = e.name.lower()
                if key not in seen:        # the first of a name wins, as in the catalog
                    seen.add(key)
                    out.append(CatalogItem(name=e.name, title=e.title, source=e.source, builtin=e.builtin,
                                           error=e.error))
            return tuple(out)

        # Models are read when first needed (the lists only need names).
        return cls(profiles=items(catalog.list_profiles(dirs=profile_dirs, use_config=use_config)),
                   airfields=items(catalog.list_airfields(dirs=airfield_dirs, use_config=use_config)),
                   loaders={"profile": load_profile, "airfield": load_airfield})

    @classmethod
    def of(cls, profiles: list[AircraftProfile], airfields: list[Airfield]) -> AppCatalog:
        """A catalog of models already loaded (tests, `--profile FILE`)."""
        return cls(profiles=tuple(CatalogItem(name=p.name, title=p.description, source="", builtin=False, model=p)
                                  for p in profiles),
                   airfields=tuple(CatalogItem(name=a.ident, title=a.name, source="", builtin=False, model=a)
                                   for a in airfields))

    def with_models(self, profile: AircraftProfile | None = None, airfield: Airfield | None = None) -> AppCatalog:
        """This catalog with a model added in front (a file named on the command line)."""
        cat = self
        if profile is not None and self.profile(profile.name) is not profile:
            cat = replace(cat, profiles=(CatalogItem(name=profile.name, title=profile.description, source="",
                                                     builtin=False, model=profile),)
                          + tuple(i for i in cat.profiles if i.name.lower() != profile.name.lower()))
        if airfield is not None and self.airfield(airfield.ident) is not airfield:
            cat = replace(cat, airfields=(CatalogItem(name=airfield.ident, title=airfield.name, source="",
                                                      builtin=False, model=airfield),)
                          + tuple(i for i in cat.airfields if i.name.lower() != airfield.ident.lower()))
        return cat

    def profile(self, name: str) -> AircraftProfile | None:
        return self._find("profile", self.profiles, name)

    def airfield(self, name: str) -> Airfield | None:
        return self._find("airfield", self.airfields, name)

    def model_of(self, kind: str, item: CatalogItem) -> Any:
        """The item's model, read on first use (None for a broken file)."""
        if item.model is not None or item.error is not None:
            return item.model
        key = (kind, item.source)
        if key not in self._models:
            try:
                self._models[key] = self.loaders[kind](item.source)
            except BriefingError:
                self._models[key] = None
        return self._models[key]

    def loaded(self) -> AppCatalog:
        """This catalog with every model read (`CatalogItem.model` set; a file that fails gets
        its `error`). For screens that want all models at once."""
        def fill(kind: str, items: tuple[CatalogItem, ...]) -> tuple[CatalogItem, ...]:
            out = []
            for it in items:
                model = self.model_of(kind, it)
                err = it.error if model is not None or it.error else "cannot be read"
                out.append(replace(it, model=model, error=None if model is not None else err))
            return tuple(out)

        return replace(self, profiles=fill("profile", self.profiles), airfields=fill("airfield", self.airfields))

    def _find(self, kind: str, items: tuple[CatalogItem, ...], name: str) -> Any:
        wanted = _loose(name)
        for it in items:                    # by list name (profile name, airfield ident) first
            if _loose(it.name) == wanted:
                return self.model_of(kind, it)
        for it in items:                    # then an airfield's full name
            if kind == "airfield" and it.error is None and _loose(it.title) == wanted:
                return self.model_of(kind, it)
        return None


class LazyCatalog:
    """An `AppCatalog` read on first use (`AppCatalog.load(**kwargs)`), so that the app's first
    frame does not wait for the files, the YAML reader and numpy. Reads like the catalog."""

    def __init__(self, **load_kwargs: Any) -> None:
        self._load_kwargs = load_kwargs
        self._catalog: AppCatalog | None = None

    @property
    def catalog(self) -> AppCatalog:
        if self._catalog is None:
            self._catalog = AppCatalog.load(**self._load_kwargs)
        return self._catalog

    def __getattr__(self, name: str) -> Any:
        if name.startswith("_"):
            raise AttributeError(name)
        return getattr(self.catalog, name)


def _loose(text: str) -> str:
    return re.sub(r"[^a-z0-9]", "", text.lower())


# --------------------------------------------------------------------------------------------
# Inputs -> request
# --------------------------------------------------------------------------------------------
class InputError(DomainError):
    """An input the app cannot use; ``field`` names the input (for the inline message)."""

    def __init__(self, message: str, *, field: str) -> None:
        self.field = field
        self.message = message
        super().__init__(message)


def decode_report(text: str):
    """The decoded METAR/SPECI (or None for no text); raises MetarError."""
    if not text.strip():
        return None
    from briefer.io.metar import decode_metar

    return decode_metar(text)


def weather_fields(weather: WeatherInputs) -> tuple[dict[str, Any], Any]:
    """Model weather fields: the report's, then the typed values over them (the one rule of
    `briefer.io.weather_input`); and the report."""
    from briefer.io.weather_input import weather_fields as combined

    try:
        report = decode_report(weather.report)
    except BriefingError as exc:
        raise InputError(str(exc), field="report") from None
    return combined(report=report, typed=weather.explicit()), report


# Where a model field's error is shown in the app.
FIELD_OF = {"wind_from_deg": "wind", "wind_speed_kt": "wind", "wind_gust_kt": "wind", "wind_reference": "wind",
            "oat_c": "oat", "altimeter_hpa": "altimeter", "visibility_sm": "visibility", "ceiling_ft": "ceiling",
            "weight_lb": "weight", "bank_deg": "bank", "configuration": "configuration",
            "approach": "approach", "landing_runway": "runway", "profile": "profile", "airfield": "airfield"}


def request_from_inputs(inputs: BriefingInputs, catalog: AppCatalog):
    """The BriefRequest the inputs describe, and the decoded report (or None).

    Raises `InputError` naming the input at fault.
    """
    from briefer.model import BriefOptions, BriefRequest, InvariantError, Weather

    profile = catalog.profile(inputs.profile)
    if profile is None:
        raise InputError(f"no usable aircraft profile '{inputs.profile}'", field="profile")
    airfield = catalog.airfield(inputs.airfield)
    if airfield is None:
        raise InputError(f"no usable airfield '{inputs.airfield}'", field="airfield")
    fields, report = weather_fields(inputs.weather)
    try:
        weather = Weather(**fields)
    except InvariantError as exc:
        raise InputError(exc.message, field=FIELD_OF.get(exc.field.split(".")[-1], "wind")) from None
    except BriefingError as exc:
        raise InputError(str(exc), field="wind") from None
    try:
        request = BriefRequest(profile=profile, configuration=inputs.configuration, airfield=airfield,
                               approach=inputs.approach, landing_runway=inputs.landing_runway, weather=weather,
                               weight_lb=inputs.weight_lb, bank_deg=inputs.bank_deg,
                               options=BriefOptions(criteria=inputs.criteria))
    except InvariantError as exc:
        raise InputError(exc.message, field=FIELD_OF.get(exc.field.split(".")[0], "profile")) from None
    return request, report


# --------------------------------------------------------------------------------------------
# Field parsers (text typed in a field -> typed value; ValueError with a short message)
# --------------------------------------------------------------------------------------------
def parse_optional_number(text: str, *, what: str, lo: float, hi: float, whole: bool = False,
                          range_words: str | None = None) -> float | None:
    """A number typed in a field, `lo` to `hi` (None when the field is empty): the one reader of
    the app's typed numbers. `what` is the unit ('' for a count), `whole` asks for an integer,
    `range_words` says the range where `lo:g to hi:g` would not read well."""
    t = text.strip()
    if not t:
        return None
    kind = "a whole number" if whole else "a number"
    try:
        value = int(t) if whole else float(t)
    except ValueError:
        raise ValueError(f"expected {kind}{f' ({what})' if what else ''}, got '{t}'") from None
    if not lo <= value <= hi:
        within = range_words or f"{lo:g} to {hi:g}{f' {what}' if what else ''}"
        raise ValueError(f"expected {within}, got {value if whole else format(value, 'g')}")
    return value


def parse_altimeter_hpa(text: str) -> float | None:
    """'1013', 'Q1013', '29.92', 'A2992' -> hPa (inHg values are told apart by their range)."""
    from briefer.model import ALTIMETER_HPA, ALTIMETER_INHG

    t = text.strip().upper().replace(" ", "")
    if not t:
        return None
    if t.endswith("HPA"):
        t = t[:-3]
    m = re.fullmatch(r"A(\d{4})", t)
    if m:
        t = f"{int(m.group(1)) / 100:.2f}"
    m = re.fullmatch(r"Q(\d{3,4})", t)
    if m:
        t = m.group(1)
    if t.endswith("INHG"):
        t = t[:-4]
    try:
        value = float(t)
    except ValueError:
        raise ValueError(f"expected hPa (1013) or inHg (29.92), got '{text.strip()}'") from None
    if value in ALTIMETER_INHG:
        from briefer import units

        return value * units.INHG_TO_HPA
    if value in ALTIMETER_HPA:
        return value
    raise ValueError(f"expected {ALTIMETER_HPA.lo:g}-{ALTIMETER_HPA.hi:g} hPa or "
                     f"{ALTIMETER_INHG.lo:g}-{ALTIMETER_INHG.hi:g} inHg, got {value:g}")


def parse_wind_text(text: str, reference: str):
    """A typed wind -> (from_deg, speed_kt, gust_kt) or None for an empty field."""
    from briefer.core.wind import parse_wind

    if not text.strip():
        return None
    try:
        w = parse_wind(text, reference=reference)  # type: ignore[arg-type]
    except BriefingError as exc:
        raise ValueError(str(exc)) from None
    return (w.from_deg, w.speed_kt, w.gust_kt)


def format_wind(from_deg: float | None, speed_kt: float | None, gust_kt: float | None) -> str:
    if speed_kt is None:
        return ""
    if speed_kt == 0 and from_deg is None:
        return "calm"
    d = "VRB" if from_deg is None else f"{from_deg:03.0f}"
    g = "" if gust_kt is None else f"G{gust_kt:g}"
    return f"{d}/{speed_kt:g}{g}"


def format_number(value: float | None, spec: str = "g") -> str:
    return "" if value is None else format(value, spec)
