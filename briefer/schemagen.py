"""The JSON Schemas of the data files, generated from the models' declarations.

Each file format is declared once, with the model's fields (`briefer.model.Spec`: kind, range,
choices, help text; `briefer.model.Forms`: alternative forms). The loader checks a file with
those declarations; this module writes the same declarations as JSON Schema (draft 2020-12) in
``briefer/schemas/<kind>.schema.json``, for editors and other tools. The schemas are checked in
and a test regenerates them and compares::

    python -m briefer.schemagen            # rewrite briefer/schemas/*.schema.json
    python -m briefer.schemagen --check    # exit 1 if a checked-in schema is stale

Rules between fields that JSON Schema cannot say (a threshold within 300 ft of the airfield, a
fix within 30 NM) stay in the loader's code; the models' help texts name them.
"""

from __future__ import annotations

import argparse
import json
import sys
from dataclasses import MISSING
from pathlib import Path
from typing import Any

from briefer import model
from briefer.io.atomic import write_text_atomic
from briefer.model import CATEGORIES, FORMAT_VERSION, Spec, declared_fields

__all__ = ["GENERATED_KINDS", "DESIGNATOR_PATTERN", "file_schema", "schema_text", "schema_path", "main"]

SCHEMA_DIALECT = "https://json-schema.org/draft/2020-12/schema"
DESIGNATOR_PATTERN = "^(0?[1-9]|[12][0-9]|3[0-6])[LCRlcr]?$"
SCHEMA_DIR = Path(__file__).resolve().parent / "schemas"


GENERATED_KINDS = (model.KIND_PROFILE, model.KIND_AIRFIELD, "scenario")
"""The file kinds, each with its schema generated from the declarations."""


def _models() -> dict[str, Any]:
    """The top-level model of each generated file kind."""
    from briefer.instructor.scenario_format import KIND_SCENARIO, Scenario

    return {model.KIND_PROFILE: model.AircraftProfile, model.KIND_AIRFIELD: model.Airfield, KIND_SCENARIO: Scenario}


class _Optional:
    """Stands for the dataclass field of a file key that is no field (always optional)."""

    name = ""
    default = None


def _nullable(f: Any, spec: Spec) -> bool:
    """Null allowed: the spec says so, or else the field is optional (the loader reads null as absent)."""
    return f.default is None if spec.nullable is None else spec.nullable


def _with_null(types: str | list[str], nullable: bool) -> str | list[str]:
    if not nullable:
        return types
    return [*types, "null"] if isinstance(types, list) else [types, "null"]


def _property(f: Any, spec: Spec, defs: dict[str, Any]) -> dict[str, Any]:
    """The schema of one declared field."""
    nullable, kind = _nullable(f, spec), spec.kind
    out: dict[str, Any]
    if kind == "number":
        out = {"type": _with_null("number", nullable)}
        if spec.range is not None:
            out.update(minimum=spec.range.lo, maximum=spec.range.hi)
    elif kind == "text":
        out = {"type": _with_null("string", nullable)}
        if spec.pattern:
            out["pattern"] = f"^{spec.pattern}$"
        else:
            out.update(minLength=0 if spec.empty_ok else 1, maxLength=spec.max_length)
    elif kind == "choice":
        out = {"enum": [*spec.choices, *([None] if nullable else [])]}
    elif kind == "flag":
        out = {"type": "boolean"}
    elif kind == "designator":
        out = {"type": _with_null(["string", "integer"], nullable), "pattern": DESIGNATOR_PATTERN,
               "minimum": 1, "maximum": 36}
    elif kind == "model":
        ref = {"$ref": f"#/$defs/{_define(spec.model, defs, spec.schema_ref)}"}
        out = {"anyOf": [ref, {"type": "null"}]} if nullable else ref
    elif kind == "models":
        out = {"type": "array"}
        if spec.min_items:
            out["minItems"] = spec.min_items
        if spec.max_items is not None:
            out["maxItems"] = spec.max_items
        out["items"] = {"$ref": f"#/$defs/{_define(spec.model, defs)}"}
    elif kind == "categories":
        ref = {"$ref": f"#/$defs/{_define(spec.model, defs)}"}
        out = {"type": "object", "minProperties": spec.min_items, "additionalProperties": False,
               "properties": {c: ref for c in CATEGORIES}}
    elif kind == "custom":
        out = dict(spec.schema or {})
        if "type" in out:
            out["type"] = _with_null(out["type"], nullable)
    else:  # pragma: no cover - a declaration error
        raise ValueError(f"{f.name}: unknown field kind {kind!r}")
    if spec.help:
        out["description"] = spec.help
    return out


def model_schema(cls: Any, defs: dict[str, Any], variant: str | None = None) -> dict[str, Any]:
    """The schema of a model's mapping (its nested models go into `defs`)."""
    properties: dict[str, Any] = {}
    required: list[str] = []
    after = {anchor: (key, spec) for key, (anchor, spec) in cls._extra_fields.items()}
    for f, spec in declared_fields(cls):
        properties[f.name] = _property(f, spec, defs)
        if f.default is MISSING and f.default_factory is MISSING:
            required.append(f.name)
        if f.name in after:                # a file key that is no field (altimeter_inhg), after its twin
            key, extra = after[f.name]
            properties[key] = _property(_Optional, extra, defs)
    node: dict[str, Any] = {"type": "object"}
    if cls._help:
        node["description"] = cls._help
    node.update(properties=properties, required=required, additionalProperties=False)
    rules = [rule.schema() for rule in cls._forms]
    extra = cls.schema_extra(variant, node)
    if extra:
        rules.append(extra)
    leftover = []
    for rule in filter(None, rules):       # side by side when they share no keyword, else allOf
        if set(rule) & set(node):
            leftover.append(rule)
        else:
            node.update(rule)
    if leftover:
        node["allOf"] = leftover
    return node


def _define(cls: Any, defs: dict[str, Any], variant: str | None = None) -> str:
    """Put the schema of a nested model into `defs` (children first); its name there."""
    name = variant or cls.__name__
    if name not in defs:
        defs[name] = None                  # a placeholder while the children are defined
        node = model_schema(cls, defs, variant)
        del defs[name]
        defs[name] = node
    return name


def file_schema(kind: str) -> dict[str, Any]:
    """The whole schema of a file kind."""
    cls = _models()[kind]
    defs: dict[str, Any] = {}
    body = model_schema(cls, defs)
    header = {"kind": {"const": kind, "description": f"What the file holds: always '{kind}'."},
              "format_version": {"const": FORMAT_VERSION,
                                 "description": "Data-file format version (optional; only 1 exists)."}}
    out: dict[str, Any] = {"$schema": SCHEMA_DIALECT, "$id": f"urn:briefer:schema:{kind}:{FORMAT_VERSION}",
                           "title": cls._title, "description": cls._help, "type": "object",
                           "additionalProperties": False, "required": ["kind", *body["required"]],
                           "properties": {**header, **body["properties"]}}
    out.update({k: v for k, v in body.items()
                if k not in ("type", "description", "properties", "required", "additionalProperties")})
    if defs:
        out["$defs"] = defs
    return out


def schema_text(kind: str) -> str:
    """The text of a kind's schema file (2-space indent, UTF-8, a final newline)."""
    return json.dumps(file_schema(kind), indent=2, ensure_ascii=False) + "\n"


def schema_path(kind: str, folder: Path = SCHEMA_DIR) -> Path:
    return folder / f"{kind}.schema.json"


def stale(folder: Path = SCHEMA_DIR) -> list[str]:
    """The kinds whose checked-in schema differs from the declarations."""
    out = []
    for kind in _models():
        path = schema_path(kind, folder)
        if not path.exists() or path.read_text(encoding="utf-8") != schema_text(kind):
            out.append(kind)
    return out


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m briefer.schemagen",
                                     description="Write (or check) the data files' JSON Schemas from the "
                                                 "models' declarations.")
    parser.add_argument("--check", action="store_true", help="only compare; exit 1 if a schema is stale")
    parser.add_argument("--folder", type=Path, default=SCHEMA_DIR, help="where the schemas live")
    args = parser.parse_args(argv)
    if args.check:
        old = stale(args.folder)
        for kind in old:
            print(f"{schema_path(kind, args.folder)}: stale; run python -m briefer.schemagen", file=sys.stderr)
        return 1 if old else 0
    for kind in _models():
        path = schema_path(kind, args.folder)
        text = schema_text(kind)
        if not path.exists() or path.read_text(encoding="utf-8") != text:
            write_text_atomic(path, text, overwrite=True)
            print(f"wrote {path}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
