"""Instructor scenarios: the file format, its loader and writer.

A scenario is one practice circling case an instructor hands a student: an airfield, an approach,
a landing runway, an aircraft profile (and configuration), the weather as a METAR-style report AND
as values, a landing weight, what the case is meant to exercise (the emphasis), the seed it was
generated from, a title and notes. The format is our own (``kind: scenario``; JSON Schema in
``briefer/schemas/scenario.schema.json``)::

    kind: scenario
    format_version: 1
    title: V2RL RNAV (GPS) RWY 09, circle to 27 - tailwind on base
    airfield: V2RL                 # ident, name, or a YAML file (relative to this file)
    approach: RNAV (GPS) RWY 09
    landing_runway: '27'
    profile: demo-bizjet           # name or a YAML file
    configuration: flaps-20        # optional: the profile's default
    weight_lb: 30200               # optional: the maximum landing weight
    weather:
      report: METAR V2RL 121550Z 26014KT 3SM BR BKN011 09/06 A2980
      wind_from_deg: 260           # values: filled from the report where left out, and
      wind_speed_kt: 14            # checked against it where given
      ...
    emphasis: tailwind-on-base
    seed: 42
    notes: Tailwind of 9 kt in the base turn ...

Loading reuses `briefer.io.yamlload` (safe parsing with the line of every key) and the model
machinery of `briefer.model` (unknown keys with a close-match suggestion, dotted paths), so an
error reads like every other data file's::

    lesson3.yaml:9: weather.wind_speed_kt: expected 14 (as in the report), got 41

Generating scenarios is in `briefer.instructor.generation`; the instructor deck in
`briefer.instructor.deck`.
"""

from __future__ import annotations

import numbers
import os
from collections.abc import Mapping, Sequence
from briefer._dataclass import dataclass
from os import PathLike
from pathlib import Path
from typing import Any, ClassVar

from briefer import vocabulary
from briefer.vocabulary import SEED_MAX, SEED_WORDS
from briefer.errors import BriefingError, DataFileError
from briefer.safetext import excerpt
from briefer.io.metar import MetarError, MetarReport, decode_metar, weather_from_metar
from briefer.model import (
    LANDING_WEIGHT_MIN_FRACTION,
    WEIGHT_LB,
    BriefRequest,
    FieldError,
    InvariantError,
    Weather,
    _describe,
    _fmt,
    _Model,
    choice_field,
    check_declared,
    custom_field,
    designator_field,
    join_path,
    model_field,
    num_field,
    text_field,
)

KIND_SCENARIO = "scenario"
SCENARIO_FORMAT_VERSION = 1

EMPHASES: tuple[str, ...] = vocabulary.EMPHASES
"""What a scenario is meant to exercise."""

EMPHASIS_TITLES: Mapping[str, str] = {
    "tailwind-on-base": "tailwind on base",
    "low-visibility": "visibility near the minimum",
    "reciprocal": "circle to the reciprocal",
    "hot-high": "hot and high",
    "cold": "cold temperature",
    "familiar-picture": "the familiar picture trap",
    "gusty-category": "a gust changes the category",
}

NOTES_MAX = 2000
REPORT_WIND_TOL_KT = 0.5           # report values are whole knots
REPORT_TEMPERATURE_TOL_C = 0.5     # and whole degrees Celsius
REPORT_ALTIMETER_TOL_HPA = 0.5     # A2992 is 1013.2 hPa; Q1013 is 1013 hPa
REPORT_VISIBILITY_TOL_SM = 1e-6
REPORT_CEILING_TOL_FT = 0.5

_REPORT_FIELDS: tuple[tuple[str, float], ...] = (
    ("wind_from_deg", REPORT_WIND_TOL_KT),
    ("wind_speed_kt", REPORT_WIND_TOL_KT),
    ("wind_gust_kt", REPORT_WIND_TOL_KT),
    ("oat_c", REPORT_TEMPERATURE_TOL_C),
    ("altimeter_hpa", REPORT_ALTIMETER_TOL_HPA),
    ("visibility_sm", REPORT_VISIBILITY_TOL_SM),
    ("ceiling_ft", REPORT_CEILING_TOL_FT),
)


# --------------------------------------------------------------------------------------------
# The model
# --------------------------------------------------------------------------------------------
def _decode(report: str) -> MetarReport:
    try:
        return decode_metar(report)
    except MetarError as exc:
        raise InvariantError(f"cannot decode the report: {exc}", field="report") from None


@dataclass(frozen=True, slots=True, kw_only=True)
class ScenarioWeather(Weather):
    """The weather of a scenario: a METAR-style ``report`` (what the student reads) and the
    values (what the brief uses). With a report, every value the report carries must agree
    with it (the file form fills the values left out from the report), and the wind is true.
    """

    _what: ClassVar[str] = "scenario weather"
    _help: ClassVar[str] = (
        "The weather as a METAR-style report (what the student reads) and as values (what the brief uses). With a "
        "report, values left out are taken from it and values given must agree with it (wind within "
        f"{_fmt(REPORT_WIND_TOL_KT)} kt and degrees, temperature {_fmt(REPORT_TEMPERATURE_TOL_C)} C, altimeter "
        f"{_fmt(REPORT_ALTIMETER_TOL_HPA)} hPa); the wind is then true.")

    report: str | None = text_field("A METAR-style report, e.g. 'METAR V2RL 121550Z 26014KT 3SM BR BKN011 09/06 "
                                    "A2980'.", default=None)

    def __post_init__(self) -> None:
        Weather.__post_init__(self)
        report = self.report
        if report is None:
            return
        if self.wind_reference != "true":
            raise InvariantError("expected 'true' with a report (a METAR wind is from true north), "
                                 f"got '{self.wind_reference}'", field="wind_reference")
        decoded = weather_from_metar(_decode(report))
        for name, tol in _REPORT_FIELDS:
            want, got = decoded[name], getattr(self, name)
            if want is None and got is None:
                continue
            if want is None:
                raise InvariantError(f"expected no value (the report gives none), got {_fmt(got)}", field=name)
            if got is None:
                raise InvariantError(f"missing: the report gives {_fmt(round(want, 6))}", field=name)
            if abs(want - got) > tol:
                raise InvariantError(f"expected {_fmt(round(want, 6))} (as in the report), got {_fmt(got)}",
                                     field=name)

    @classmethod
    def _read(cls, data: Mapping[str, Any], path: str) -> dict[str, Any]:
        kwargs = Weather._read.__func__(cls, data, path)  # type: ignore[attr-defined]
        report = kwargs.get("report")
        if isinstance(report, str) and report.strip():
            try:
                decoded = weather_from_metar(_decode(report))
            except InvariantError as exc:
                raise FieldError(exc.message, context=join_path(path, "report")) from None
            for name, _ in _REPORT_FIELDS:
                if name not in kwargs and decoded[name] is not None:
                    kwargs[name] = decoded[name]
        return kwargs

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        if "report" in out:
            out = {"report": out.pop("report"), **out}
        return out

    def as_weather(self) -> Weather:
        """The plain `Weather` of the values (what `BriefRequest` takes)."""
        return Weather(**{k: getattr(self, k) for k in Weather.keys() if k != "altimeter_inhg"})


@dataclass(frozen=True, slots=True, kw_only=True)
class Scenario(_Model):
    """One practice case (see the module docstring for the file form).

    ``airfield`` and ``profile`` are references resolved through `briefer.io.catalog` (an ident
    or name, or a YAML file; a relative path is taken from the scenario file's folder).
    ``emphasis`` is one of `EMPHASES`; ``seed`` the generator seed (None: written by hand).
    """

    _kind: ClassVar[str | None] = KIND_SCENARIO
    _what: ClassVar[str] = "a scenario"
    _title: ClassVar[str] = "briefer practice scenario"
    _help: ClassVar[str] = (
        f"One practice circling case for an instructor to hand a student (kind: {KIND_SCENARIO}). Invented data for "
        "training, not for navigation. Cross-field rules the loader also checks are given in the descriptions: the "
        "airfield, profile, approach, landing runway, configuration and weight must exist and fit together, and "
        "every weather value must agree with the report.")

    title: str = text_field("A one-line title for the student page.")
    airfield: str = text_field("The airfield: an ident or name the catalog knows, or a YAML file (a relative path "
                               "is taken from the scenario file's folder).")
    approach: str = text_field("The approach name as in the airfield file (case, spaces and punctuation ignored).")
    landing_runway: str = designator_field("The runway to land on, e.g. '27' or '09L' (quote a designator with a "
                                           "leading zero).")
    profile: str = text_field("The aircraft profile: a name the catalog knows, or a YAML file (relative to the "
                              "scenario file's folder).")
    configuration: str | None = text_field("A configuration of the profile (default: the profile's default "
                                           "configuration).", default=None)
    weight_lb: float | None = num_field(
        WEIGHT_LB, f"Landing weight (default: the maximum landing weight); between "
        f"{_fmt(100 * LANDING_WEIGHT_MIN_FRACTION)} % of the maximum landing weight and the maximum [lb].",
        default=None)
    weather: ScenarioWeather = model_field(ScenarioWeather)
    emphasis: str = choice_field(EMPHASES, "What the case is meant to exercise.")
    seed: int | None = custom_field(
        {"type": "integer", "minimum": 0, "maximum": SEED_MAX},
        "The seed the case was generated from ('briefer scenario new --seed N' makes it again); absent when "
        "written by hand.", default=None)
    notes: str = text_field("Notes for the instructor: what the case exercises, with its numbers.", default="",
                            empty_ok=True, max_length=NOTES_MAX)

    def __post_init__(self) -> None:
        check_declared(self)
        seed = self.seed
        if seed is not None and (isinstance(seed, bool) or not isinstance(seed, numbers.Integral)
                                 or not 0 <= seed <= SEED_MAX):
            raise InvariantError(f"expected {SEED_WORDS}, got {_describe(seed)}", field="seed")

    @classmethod
    def from_mapping(cls, data: Any, *, path: str = "") -> Any:
        if isinstance(data, Mapping) and "kind" not in data:
            raise FieldError(f"missing required key 'kind' (expected '{KIND_SCENARIO}')", context=path)
        return _Model.from_mapping.__func__(cls, data, path=path)  # type: ignore[attr-defined]

    def to_mapping(self) -> dict[str, Any]:
        out = _Model.to_mapping(self)
        if not out.get("notes"):
            out.pop("notes", None)
        return out


# --------------------------------------------------------------------------------------------
# Loading, resolving, writing
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class LoadedScenario:
    """A scenario with its references resolved.

    Attributes:
        scenario: the scenario as written.
        request: the `BriefRequest` it describes.
        report: the decoded weather report (None when the scenario has none).
        source: the file it came from (None when built in memory).
    """

    scenario: Scenario
    request: BriefRequest
    report: MetarReport | None
    source: str | None = None

    def brief(self) -> Any:
        """The brief of the scenario (reproducible: its time stamp is the report's, not the clock)."""
        from briefer.brief import build_brief

        return build_brief(self.request, weather_report=self.report, computed_utc=scenario_time_text(self.report))


def scenario_time_text(report: MetarReport | None) -> str:
    """A fixed time stamp for a scenario's brief: the report's observation time, or 'scenario'."""
    if report is None or report.observed_day_of_month is None:
        return "practice scenario"
    return (f"practice scenario, observed day {report.observed_day_of_month} "
            f"{report.observed_hour_utc:02d}{report.observed_minute_utc:02d}Z")


def _looks_like_path(text: str) -> bool:
    return "/" in text or os.sep in text or text.lower().endswith((".yaml", ".yml"))


REFERENCE_RULE = ("a catalog name, or a path to a YAML file inside the scenario's own folder "
                  "(relative, no '..' out of it, no '~', not absolute)")


def _reference(text: str, base_dir: Path | None) -> str | Path:
    """What a scenario's ``airfield``/``profile`` names: a catalog name (a str), or a file (a Path)
    inside `base_dir` (the scenario's folder, symbolic links resolved). Anything else, such as
    ``/etc/passwd``, ``../../x.yaml`` or ``~/.bashrc``, is refused: a data file cannot make briefer
    read a file outside its own folder. Without `base_dir` (a scenario built in memory) a path is
    used as given."""
    if not _looks_like_path(text):
        return text
    if base_dir is None:
        return Path(os.path.expanduser(text))
    if text.startswith("~") or os.path.isabs(text):
        raise DataFileError(f"expected {REFERENCE_RULE}, got {excerpt(text, 40)}")
    base = os.path.realpath(base_dir)
    full = os.path.realpath(os.path.join(base, text))
    if os.path.commonpath([base, full]) != base:
        raise DataFileError(f"expected {REFERENCE_RULE}, got {excerpt(text, 40)} (outside the folder)")
    return Path(full)


def resolve_scenario(scenario: Scenario, *, base_dir: str | PathLike[str] | None = None,
                     profile_dirs: Sequence[str | PathLike[str]] = (),
                     airfield_dirs: Sequence[str | PathLike[str]] = (),
                     error: Any = None) -> LoadedScenario:
    """Resolve a scenario's references into a `BriefRequest`.

    ``error(message, field)`` builds the exception for a failure at a field (the loader passes
    one that adds the file and line); by default a `DataFileError` naming the field.
    """
    from briefer.io import catalog

    def fail(message: str, where: str) -> BriefingError:
        if error is not None:
            return error(message, where)
        return DataFileError(message, context=where)

    base = Path(base_dir) if base_dir is not None else None
    try:
        profile = catalog.find_profile(_reference(scenario.profile, base), dirs=profile_dirs, names_only=True)
    except BriefingError as exc:
        raise fail(str(exc), "profile") from None
    try:
        airfield = catalog.find_airfield(_reference(scenario.airfield, base), dirs=airfield_dirs, names_only=True)
    except BriefingError as exc:
        raise fail(str(exc), "airfield") from None
    try:
        request = BriefRequest(profile=profile, configuration=scenario.configuration, airfield=airfield,
                               approach=scenario.approach, landing_runway=scenario.landing_runway,
                               weather=scenario.weather.as_weather(), weight_lb=scenario.weight_lb)
    except InvariantError as exc:
        raise fail(exc.message, exc.field or "") from None
    report = decode_metar(scenario.weather.report) if scenario.weather.report else None
    return LoadedScenario(scenario=scenario, request=request, report=report)


def load_scenario(path: str | PathLike[str], *, profile_dirs: Sequence[str | PathLike[str]] = (),
                  airfield_dirs: Sequence[str | PathLike[str]] = ()) -> LoadedScenario:
    """Load a ``kind: scenario`` YAML file and resolve it (errors name file, line and field)."""
    from briefer.io.yamlload import read_yaml_mapping

    doc = read_yaml_mapping(path)
    kind = doc.data.get("kind")
    if "kind" in doc.data and kind != KIND_SCENARIO:
        shown = repr(kind) if isinstance(kind, str) else _describe(kind)
        raise doc.error(f"expected '{KIND_SCENARIO}', got {shown} (this is not a scenario file)", "kind")
    try:
        scenario = Scenario.from_mapping(doc.data)
    except FieldError as exc:
        raise doc.from_field_error(exc) from None
    loaded = resolve_scenario(scenario, base_dir=Path(path).parent, profile_dirs=profile_dirs,
                              airfield_dirs=airfield_dirs, error=lambda message, where: doc.error(message, where))
    return LoadedScenario(scenario=scenario, request=loaded.request, report=loaded.report, source=str(path))


SCENARIO_HEADER = ("# Practice scenario for briefer (kind: scenario). Invented data for training: not for\n"
                   "# navigation. The published procedure, the flight manual and local rules govern.\n")


def scenario_yaml(scenario: Scenario) -> str:
    """The YAML text of a scenario (loads back equal)."""
    from briefer.io.drafts import whole_numbers
    from briefer.io.yamlload import dump_yaml

    return SCENARIO_HEADER + dump_yaml(whole_numbers(scenario.to_mapping()))


def write_scenario(path: str | PathLike[str], scenario: Scenario, *, overwrite: bool = False) -> Path:
    """Write a scenario file atomically (refuses to overwrite unless asked)."""
    from briefer.io.atomic import write_text_atomic

    return write_text_atomic(path, scenario_yaml(scenario), overwrite=overwrite)


def reference_for(path_or_name: str, out_dir: str | PathLike[str] | None, *, name: str | None = None) -> str:
    """How a scenario written into `out_dir` should name an airfield or profile it was given:
    a catalog name as is; a file inside `out_dir` by its path relative to `out_dir`; a file
    elsewhere by `name` (its catalog name), since a scenario may only refer to files in its own
    folder (see `_reference`), else by its absolute path (which loading then refuses, saying why)."""
    if not _looks_like_path(path_or_name) and not os.path.isfile(path_or_name):
        return path_or_name
    p = Path(os.path.expanduser(path_or_name)).resolve()
    if out_dir is None:
        return str(p)
    try:
        rel = os.path.relpath(p, Path(out_dir).resolve())
    except ValueError:   # pragma: no cover - another drive on Windows
        return name or str(p)
    if rel == os.pardir or rel.startswith(os.pardir + os.sep):
        return name or str(p)
    return rel


__all__ = [
    "EMPHASES",
    "EMPHASIS_TITLES",
    "KIND_SCENARIO",
    "LoadedScenario",
    "Scenario",
    "ScenarioWeather",
    "load_scenario",
    "reference_for",
    "resolve_scenario",
    "scenario_time_text",
    "scenario_yaml",
    "write_scenario",
]
