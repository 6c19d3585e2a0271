"""Drafts of data files (what a form holds while the crew types): one field checked with the
loader's own message, a whole draft checked, and the YAML text a draft saves as.

A draft is the plain mapping a file would hold (``{"kind": "airfield", "ident": "Q7HM",
"runways": [{...}], ...}``), possibly incomplete. The functions here use the loaders' rules and
messages, never their own:

* `parse_scalar` reads one typed value as the YAML loader would (``093.2`` -> 93.2, ``09`` -> 9,
  ``true`` -> True, ``NA`` -> 'NA'; a value that is not a plain scalar stays text).
* `field_message` checks one field of a draft as the loader checks it (type, range, unit, the
  accepted forms) and returns the loader's message for that field, or None. Fields the crew
  has not reached yet (required keys missing further down the form) do not count against it.
* `draft_error` checks a whole draft (every cross-field rule, the layout of the runways and
  fixes) and returns the loader's first `DataFileError` (``context`` is the dotted field), or None.
* `draft_yaml` gives the text a valid draft saves as: the model's own order and values, whole
  numbers written without '.0'. Loading that text and calling `draft_yaml` on the result gives the
  same bytes again (save -> load -> save is byte-identical).
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from typing import Any

import yaml
from yaml.nodes import ScalarNode

from briefer.errors import DataFileError
from briefer.io.yamlload import YamlDocument, _Builder, _Loader, dump_yaml, load_bytes
from briefer.model import (
    BEARING,
    DISTANCE,
    ELEVATION,
    HEADING,
    KIND_AIRFIELD,
    KIND_PROFILE,
    LENGTH,
    VISIBILITY,
    AircraftProfile,
    Airfield,
    Approach,
    CirclingMinimum,
    FieldError,
    StraightIn,
    StraightInMinimum,
    join_path,
)

__all__ = ["parse_scalar", "field_message", "draft_error", "draft_yaml", "whole_numbers", "model_class_at"]

_MODELS: dict[str, Any] = {KIND_PROFILE: AircraftProfile, KIND_AIRFIELD: Airfield}
_TOKEN = re.compile(r"([^.\[\]]+)|\[(\d+)\]")


def parse_scalar(text: str) -> Any:
    """One typed value read with the data files' rules (None for an empty field)."""
    text = text.strip()
    if not text:
        return None
    loader = _Loader(text)
    try:
        node = loader.get_single_node()
    except yaml.YAMLError:
        return text
    finally:
        loader.dispose()
    if not isinstance(node, ScalarNode) or node.style is not None:
        return text if not isinstance(node, ScalarNode) else node.value
    try:
        return _Builder(YamlDocument(data={}, file="field")).scalar(node, "")
    except DataFileError:
        return text


def whole_numbers(value: Any) -> Any:
    """Whole-number floats as ints (6012 rather than 6012.0), recursively; loads back equal."""
    if isinstance(value, float) and value.is_integer() and abs(value) < 1e15:
        return int(value)
    if isinstance(value, dict):
        return {k: whole_numbers(v) for k, v in value.items()}
    if isinstance(value, list):
        return [whole_numbers(v) for v in value]
    return value


def _tokens(path: str) -> list[str | int]:
    return [m.group(1) if m.group(1) is not None else int(m.group(2)) for m in _TOKEN.finditer(path)]


def model_class_at(kind: str, path: str) -> tuple[Any, str | None]:
    """(model class, category letter or None) of the mapping at a dotted path of a draft, e.g.
    ``runways[1]`` -> (Runway, None), ``approaches[0].circling.B`` -> (CirclingMinimum, 'B')."""
    cls: Any = _MODELS[kind]
    category = None
    tokens = _tokens(path)
    i = 0
    while i < len(tokens):
        tok = tokens[i]
        if isinstance(tok, int):
            i += 1
            continue
        if cls is Approach and tok == "circling":
            cls, category = CirclingMinimum, (str(tokens[i + 1]).upper() if i + 1 < len(tokens) else None)
            i += 2
            continue
        if cls is StraightIn and tok == "minimums":
            cls, category = StraightInMinimum, (str(tokens[i + 1]).upper() if i + 1 < len(tokens) else None)
            i += 2
            continue
        nested = cls.nested_models()
        if tok not in nested:
            raise KeyError(f"no model at '{path}'")
        cls = nested[tok]
        i += 1
    return cls, category


def _get(data: Any, tokens: list[str | int]) -> Any:
    for tok in tokens:
        if isinstance(tok, int):
            data = data[tok] if isinstance(data, list) and tok < len(data) else None
        else:
            data = data.get(tok) if isinstance(data, Mapping) else None
        if data is None:
            return None
    return data


def _example(kind: str) -> dict[str, Any]:
    """A complete valid document of the kind, to stand in for required keys not typed yet."""
    from briefer.io.skeleton import filled_example

    return filled_example(kind)


def _find_example(cls: Any, kind: str) -> dict[str, Any] | None:
    """The first mapping of the example document that `cls` reads."""
    root = _example(kind)
    stack: list[tuple[Any, str]] = [(root, "")]
    while stack:
        value, path = stack.pop(0)
        if isinstance(value, Mapping):
            try:
                here, _ = model_class_at(kind, path)
            except (KeyError, IndexError):
                here = None
            if here is cls and path:
                return dict(value)
            stack.extend((v, join_path(path, str(k))) for k, v in value.items())
        elif isinstance(value, list):
            stack.extend((v, f"{path}[{i}]") for i, v in enumerate(value))
    return None


_TWINS = (HEADING.keys, LENGTH.keys, DISTANCE.keys, BEARING.keys, ELEVATION.keys, VISIBILITY.keys,
          ("position", "crossing"), ("lat_deg", "threshold", "from_point"), ("lon_deg", "threshold", "from_point"),
          ("mda_ft", "not_authorised"))
"""Keys that stand for one another in a form (the model's alternative units and forms, and the
alternatives of a position or a minimum)."""


def _about(exc: FieldError, path: str) -> bool:
    where = exc.context or ""
    return where == path or where.startswith(path + ".") or where.startswith(path + "[")


def _try(cls: Any, category: str | None, mapping: dict[str, Any], parent_path: str) -> FieldError | None:
    try:
        if category is not None:
            cls.from_category(category, mapping, path=parent_path)
        else:
            cls.from_mapping(mapping, path=parent_path)
    except FieldError as exc:
        return exc
    return None


def field_message(kind: str, draft: Mapping[str, Any], path: str) -> str | None:
    """The loader's message about the field at `path` of a draft, or None when it is fine.

    The field is checked inside its own mapping (its runway, fix, obstacle...): first with the
    mapping as typed, its required keys not typed yet taken from a valid example; if another
    field of the mapping fails first, again with the example's other fields (in the draft's own
    form: a MAP from a facility stays one), so an unfinished form does not mask the field.
    Cross-field rules between mappings (runways that cannot meet, a fix 40 NM away) are
    `draft_error`'s.
    """
    tokens = _tokens(path)
    if not tokens or isinstance(tokens[-1], int):
        return None
    key = str(tokens[-1])
    parent_path = path[: path.rindex(".")] if "." in path else ""
    cls, category = model_class_at(kind, parent_path) if parent_path else (_MODELS[kind], None)
    sub = _get(draft, tokens[:-1]) if len(tokens) > 1 else draft
    if not isinstance(sub, Mapping):
        return None
    top = cls is _MODELS[kind]
    example = _example(kind) if top else (_find_example(cls, kind) or {})
    filled = dict(sub)
    if top:
        filled.setdefault("kind", kind)
    for k in cls.required_keys():
        if k not in filled and k in example:
            filled[k] = example[k]
    exc = _try(cls, category, filled, parent_path)
    if exc is None:
        return None
    if _about(exc, path):
        return exc.message
    # Another field failed first: the example's fields, in the draft's form, and this one.
    given = set(sub)
    form = {k for group in _TWINS for k in group if k in given and k != key}
    drop = {k for group in _TWINS for k in group if (given & set(group)) - {k} and k not in given}
    trial = {k: v for k, v in example.items() if k not in drop and k != "category"}
    trial.update({k: sub[k] for k in form | {key} if k in sub})
    for group in _TWINS:
        if key in group:
            for twin in group:
                if twin != key and twin not in form:
                    trial.pop(twin, None)
    if top:
        trial["kind"] = kind
    exc = _try(cls, category, trial, parent_path)
    return exc.message if exc is not None and _about(exc, path) else None


def draft_error(kind: str, draft: Mapping[str, Any], *, file: str = "draft") -> DataFileError | None:
    """The loader's first error for a whole draft (``context`` = the dotted field), or None."""
    data = dict(draft)
    data.setdefault("kind", kind)
    try:
        load_bytes(dump_yaml(data).encode("utf-8"), file=file, expected_kind=kind)
    except DataFileError as exc:
        return exc
    return None


def draft_yaml(kind: str, draft: Mapping[str, Any] | AircraftProfile | Airfield, *, header: str = "") -> str:
    """The YAML text a draft (or a model) saves as; raises the loader's `DataFileError` when the
    draft is not valid. ``header`` (comment lines) goes first. save -> load -> save is
    byte-identical."""
    if isinstance(draft, (AircraftProfile, Airfield)):
        model = draft
    else:
        model = load_bytes(dump_yaml({**dict(draft), "kind": kind}).encode("utf-8"), file="draft",
                           expected_kind=kind)
    return header + dump_yaml(whole_numbers(model.to_mapping()))
