"""Read aircraft-profile and airfield YAML files into validated models, with precise errors.

Every failure is one `DataFileError` naming the file, the line and the dotted field, and saying
what was expected, e.g.::

    lemon.yaml:14: runways[1].threshold_b.elevation_ft: expected a number in feet, got 'abc'

Safety: the text is parsed with PyYAML's safe loader machinery into nodes (`yaml.SafeLoader`,
no Python object tags), and the nodes are turned into plain dicts, lists and scalars here, which
records the line of every key and catches duplicate keys (plain `safe_load` silently keeps the
last one). Two deliberate departures from YAML 1.1 resolution: a plain scalar of decimal digits
is a decimal integer even with a leading zero (``030`` is thirty, not octal 24; ``09`` is nine,
not the text '09'), and merge keys (``<<``) are refused.

File format: a mapping whose ``kind`` key says what the file holds (``aircraft-profile`` or
``airfield``), an optional ``format_version: 1``, then the model's fields (see
``briefer/schemas/*.schema.json`` and README "Data files").
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from briefer._dataclass import dataclass, field
from os import PathLike
from typing import Any

import yaml
from yaml.constructor import ConstructorError, SafeConstructor
from yaml.nodes import MappingNode, Node, ScalarNode, SequenceNode

from briefer.errors import DataFileError
from briefer.io.safefile import MAX_DATA_BYTES, read_regular_file
from briefer.model import (
    KIND_AIRFIELD,
    KIND_PROFILE,
    KINDS,
    AircraftProfile,
    Airfield,
    FieldError,
    _describe,
    did_you_mean,
    join_path,
)
from briefer.safetext import control_character, excerpt

MAX_FILE_BYTES = MAX_DATA_BYTES
MAX_NODES = 200_000
MAX_DEPTH = 64
MAX_DIGITS = 100

_MODELS: dict[str, Any] = {KIND_PROFILE: AircraftProfile, KIND_AIRFIELD: Airfield}
_INT_TAG = "tag:yaml.org,2002:int"
_STR_TAG = "tag:yaml.org,2002:str"
_MAP_TAG = "tag:yaml.org,2002:map"
_SEQ_TAG = "tag:yaml.org,2002:seq"
_MERGE_TAG = "tag:yaml.org,2002:merge"
_FLOAT_TAG = "tag:yaml.org,2002:float"
_DECIMAL = re.compile(r"[-+]?[0-9]+")
_SCALAR_TAGS = {f"tag:yaml.org,2002:{t}" for t in ("str", "int", "float", "bool", "null", "timestamp")}


class _Loader(yaml.SafeLoader):
    """SafeLoader whose plain decimal-digit scalars resolve to int (leading zeros included)."""


class _FastLoader(getattr(yaml, "CSafeLoader", yaml.SafeLoader)):  # type: ignore[misc]
    """The same rules on libyaml's parser (several times faster). A file it rejects is parsed
    again by `_Loader`, whose error messages are the ones we document and test."""


for _cls in (_Loader, _FastLoader):
    _cls.yaml_implicit_resolvers = {k: list(v) for k, v in yaml.SafeLoader.yaml_implicit_resolvers.items()}
    for _ch in "-+0123456789":
        _cls.yaml_implicit_resolvers.setdefault(_ch, []).insert(0, (_INT_TAG, re.compile(r"^[-+]?[0-9]+$")))


@dataclass
class YamlDocument:
    """A parsed YAML mapping with the line of every dotted path in it."""

    data: dict[str, Any]
    file: str
    lines: dict[str, int] = field(default_factory=dict)

    def line_of(self, path: str) -> int | None:
        """Line of `path`, or of its nearest enclosing item when it is not in the file."""
        while True:
            if path in self.lines:
                return self.lines[path]
            if not path:
                return None
            path = _parent(path)

    def error(self, message: str, path: str = "", *, locator: str | None = None) -> DataFileError:
        """A `DataFileError` at `path` (the line taken from `locator`, default `path`)."""
        return DataFileError(message, file=self.file, line=self.line_of(path if locator is None else locator),
                             context=path or None)

    def from_field_error(self, exc: FieldError) -> DataFileError:
        return self.error(exc.message, exc.context or "", locator=exc.locator)


def _parent(path: str) -> str:
    """'a.b[2]' -> 'a.b', 'a.b' -> 'a', 'a' -> ''."""
    if path.endswith("]") and "[" in path:
        return path[: path.rindex("[")]
    return path.rpartition(".")[0]


# --------------------------------------------------------------------------------------------
# Reading
# --------------------------------------------------------------------------------------------
def _read_bytes(path: str | PathLike[str]) -> tuple[bytes, str]:
    name = str(path)
    return read_regular_file(path, limit=MAX_FILE_BYTES, what="a YAML file"), name


def parse_yaml_mapping(data: bytes, file: str, *, empty_message: str | None = None) -> YamlDocument:
    """Parse bytes of YAML into a `YamlDocument` whose top level is a mapping (`empty_message`:
    what an empty or comment-only file is told, default the data-file wording)."""
    if len(data) > MAX_FILE_BYTES:
        raise DataFileError(f"the file is larger than {MAX_FILE_BYTES // 1_000_000} MB; "
                            "expected a small YAML file", file=file)
    if b"\x00" in data:
        raise DataFileError("expected a YAML text file, got binary data", file=file)
    bom = 3 if data.startswith(b"\xef\xbb\xbf") else 0   # a byte order mark is allowed, and dropped
    try:
        text = data[bom:].decode("utf-8")
    except UnicodeDecodeError as exc:
        start = bom + exc.start          # in the file (the error counts from after the mark)
        line = data[:start].count(b"\n") + 1
        raise DataFileError(f"expected UTF-8 text, got the byte 0x{data[start]:02x}", file=file,
                            line=line) from None
    node = _fast_node(text)
    loader = None
    try:
        loader = _Loader(text)
        if node is _FAILED:
            node = loader.get_single_node()
    except RecursionError:
        raise DataFileError(f"nested more than {MAX_DEPTH} levels deep; expected a small YAML file",
                            file=file) from None
    except yaml.MarkedYAMLError as exc:
        raise DataFileError(f"not valid YAML: {_yaml_problem(exc)}", file=file,
                            line=_mark_line(exc.problem_mark or exc.context_mark)) from None
    except yaml.reader.ReaderError as exc:
        line = text[: exc.position].count("\n") + 1
        raise DataFileError(f"not valid YAML: unacceptable character #x{exc.character:04x}" if isinstance(
            exc.character, int) else f"not valid YAML: {exc.reason}", file=file, line=line) from None
    except yaml.YAMLError as exc:
        raise DataFileError(f"not valid YAML: {exc}", file=file) from None
    finally:
        if loader is not None:
            loader.dispose()
    if node is None and empty_message is not None:
        raise DataFileError(empty_message, file=file)
    if node is None:
        raise DataFileError(f"the file is empty; expected a YAML mapping starting with "
                            f"'kind: {KIND_PROFILE}' or 'kind: {KIND_AIRFIELD}'", file=file)
    doc = YamlDocument(data={}, file=file)
    doc.lines[""] = node.start_mark.line + 1
    if not isinstance(node, MappingNode):
        got = "a list" if isinstance(node, SequenceNode) else f"the single value {excerpt(node.value)}"
        raise DataFileError(f"expected a mapping of keys at the top level, got {got}", file=file,
                            line=node.start_mark.line + 1)
    builder = _Builder(doc)
    doc.data = builder.convert(node, "")
    return doc


_FAILED = object()


def _fast_node(text: str) -> Any:
    """The root node by libyaml, or _FAILED (any problem: the pure-Python loader reports it)."""
    if _FastLoader is _Loader:
        return _FAILED
    loader = _FastLoader(text)
    try:
        return loader.get_single_node()
    except Exception:      # noqa: BLE001 - re-parsed below for the exact, documented message
        return _FAILED
    finally:
        loader.dispose()


def _mark_line(mark: Any) -> int | None:
    return mark.line + 1 if mark is not None else None


def _yaml_problem(exc: yaml.MarkedYAMLError) -> str:
    """PyYAML's problem, with its context when that helps (and where it started)."""
    problem, context = exc.problem or "", exc.context or ""
    if not problem:
        return context or "cannot parse the file"
    if context and problem.startswith("but "):
        return f"{context}, {problem}"
    start, end = _mark_line(exc.context_mark), _mark_line(exc.problem_mark)
    if context and start is not None and start != end:
        return f"{problem} ({context} on line {start})"
    return problem


class _Builder:
    """Nodes -> plain Python values, recording lines, refusing duplicates, cycles and tags."""

    def __init__(self, doc: YamlDocument) -> None:
        self.doc = doc
        self.count = 0
        self.active: set[int] = set()
        self.constructor = SafeConstructor()

    def fail(self, message: str, node: Node, path: str) -> DataFileError:
        return DataFileError(message, file=self.doc.file, line=node.start_mark.line + 1, context=path or None)

    def convert(self, node: Node, path: str, depth: int = 0) -> Any:
        self.count += 1
        if depth > MAX_DEPTH:
            raise self.fail(f"nested more than {MAX_DEPTH} levels deep", node, excerpt(path, 40)[1:-1])
        if self.count > MAX_NODES:
            raise self.fail(f"more than {MAX_NODES} values (too many aliases?)", node, path)
        if id(node) in self.active:
            raise self.fail("a recursive alias (an anchor that contains itself)", node, path)
        if isinstance(node, ScalarNode):
            return self.scalar(node, path)
        self.active.add(id(node))
        try:
            if isinstance(node, MappingNode):
                return self.mapping(node, path, depth)
            return self.sequence(node, path, depth)  # type: ignore[arg-type]
        finally:
            self.active.discard(id(node))

    def mapping(self, node: MappingNode, path: str, depth: int) -> dict[str, Any]:
        if node.tag != _MAP_TAG:
            raise self.fail(f"unsupported YAML tag {node.tag!r}", node, path)
        out: dict[str, Any] = {}
        for key_node, value_node in node.value:
            if key_node.tag == _MERGE_TAG:
                raise self.fail("merge keys ('<<') are not supported; write the keys out", key_node, path)
            if not isinstance(key_node, ScalarNode):
                raise self.fail("expected a plain key, got a list or mapping used as a key", key_node, path)
            key = key_node.value
            bad = control_character(key)
            if bad is not None:
                raise self.fail(f"a control character ({bad}) in the key {excerpt(key)}", key_node, path)
            sub = join_path(path, key)
            line = key_node.start_mark.line + 1
            if key in out:
                raise self.fail(f"duplicate key '{key}' (first given on line {self.doc.lines[sub]})",
                                key_node, sub)
            self.doc.lines[sub] = line
            out[key] = self.convert(value_node, sub, depth + 1)
        return out

    def sequence(self, node: SequenceNode, path: str, depth: int) -> list[Any]:
        if node.tag != _SEQ_TAG:
            raise self.fail(f"unsupported YAML tag {node.tag!r}", node, path)
        items = []
        for i, item in enumerate(node.value):
            sub = f"{path}[{i}]"
            self.doc.lines[sub] = item.start_mark.line + 1
            items.append(self.convert(item, sub, depth + 1))
        return items

    def scalar(self, node: ScalarNode, path: str) -> Any:
        if node.tag not in _SCALAR_TAGS:
            raise self.fail(f"unsupported YAML tag {excerpt(node.tag)}", node, path)
        bad = control_character(node.value, allow_newline=True)
        if bad is not None:
            raise self.fail(f"a control character ({bad}) in the text {excerpt(node.value)}", node, path)
        if node.tag in (_INT_TAG, _FLOAT_TAG) and len(node.value) > MAX_DIGITS:
            raise self.fail(f"a number of {len(node.value)} characters; expected at most {MAX_DIGITS}",
                            node, path)
        try:
            if node.tag == _INT_TAG and _DECIMAL.fullmatch(node.value):
                return int(node.value, 10)
            return self.constructor.construct_object(node, deep=True)
        except ConstructorError as exc:
            raise self.fail(f"cannot read the value {excerpt(node.value)}: {exc.problem or exc}",
                            node, path) from None
        except (ValueError, KeyError, TypeError, OverflowError, IndexError, AttributeError):
            what = node.tag.rsplit(":", 1)[-1]
            raise self.fail(f"cannot read the value {excerpt(node.value)} as {what}", node, path) from None


def read_yaml_mapping(path: str | PathLike[str]) -> YamlDocument:
    """Read a YAML file whose top level is a mapping (bad files raise `DataFileError`)."""
    data, name = _read_bytes(path)
    return parse_yaml_mapping(data, name)


# --------------------------------------------------------------------------------------------
# Models
# --------------------------------------------------------------------------------------------
def _kind(doc: YamlDocument) -> str:
    if "kind" not in doc.data:
        raise doc.error(f"missing required key 'kind' (expected {KIND_PROFILE!r} or {KIND_AIRFIELD!r})")
    kind = doc.data["kind"]
    if kind not in KINDS:
        hint = did_you_mean(kind, KINDS) if isinstance(kind, str) else ""
        shown = excerpt(kind, 40) if isinstance(kind, str) else _describe(kind)
        raise doc.error(f"expected {KIND_PROFILE!r} or {KIND_AIRFIELD!r}, got {shown}{hint}", "kind")
    return kind


def model_from_document(doc: YamlDocument, expected_kind: str | None = None) -> AircraftProfile | Airfield:
    """Build the model a parsed document describes (checking its ``kind``)."""
    kind = _kind(doc)
    if expected_kind is not None and kind != expected_kind:
        raise doc.error(f"expected {expected_kind!r}, got {excerpt(kind, 40)} (this is not "
                        f"{'an aircraft profile' if expected_kind == KIND_PROFILE else 'an airfield'} file)",
                        "kind")
    try:
        return _MODELS[kind].from_mapping(doc.data)
    except FieldError as exc:
        raise doc.from_field_error(exc) from None


def load_bytes(data: bytes, *, file: str, expected_kind: str | None = None) -> AircraftProfile | Airfield:
    """Load a profile or airfield from bytes (``file`` names it in errors)."""
    return model_from_document(parse_yaml_mapping(data, file), expected_kind)


def load_profile(path: str | PathLike[str]) -> AircraftProfile:
    """Load an ``aircraft-profile`` YAML file."""
    data, name = _read_bytes(path)
    return load_bytes(data, file=name, expected_kind=KIND_PROFILE)  # type: ignore[return-value]


def load_airfield(path: str | PathLike[str]) -> Airfield:
    """Load an ``airfield`` YAML file."""
    data, name = _read_bytes(path)
    return load_bytes(data, file=name, expected_kind=KIND_AIRFIELD)  # type: ignore[return-value]


def load_any(path: str | PathLike[str]) -> AircraftProfile | Airfield:
    """Load a data file of either kind (by its ``kind`` key)."""
    data, name = _read_bytes(path)
    return load_bytes(data, file=name)


class _Dumper(yaml.SafeDumper):
    """SafeDumper that quotes digit-only text, which this module's loader would read as a number."""


def _represent_str(dumper: yaml.SafeDumper, value: str) -> yaml.ScalarNode:
    style = "'" if _DECIMAL.fullmatch(value) else None
    return dumper.represent_scalar(_STR_TAG, value, style=style)


_Dumper.add_representer(str, _represent_str)


def dump_yaml(model: AircraftProfile | Airfield | Mapping[str, Any]) -> str:
    """YAML text of a model (its ``to_mapping()``), keys in the model's order; loads back equal."""
    mapping = model if isinstance(model, Mapping) else model.to_mapping()
    return yaml.dump(dict(mapping), Dumper=_Dumper, sort_keys=False, allow_unicode=True,
                     default_flow_style=False)
