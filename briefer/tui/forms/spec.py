"""A form described as data: fields, nested groups and repeating groups, in the order a crew reads
the documents; and the two conversions between the texts typed in a form and the mapping the
data file holds.

The texts of a form are a tree like the file: a dict of field texts, a dict for a nested group,
a list of dicts for a repeating group. `to_mapping` turns it into the file's mapping (each field
read by `briefer.tui.forms.values`) and records which field wrote each dotted path of the file, so
that the loader's messages can be shown beside the field they are about.

No Textual import here.
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Mapping, Sequence
from briefer._dataclass import dataclass, field
from typing import Any, Union

from briefer.model import join_path
from briefer.tui.forms import values as v

FormPath = tuple[Union[str, int], ...]
"""Where a text lives in the form's tree: ('configurations', 0, 'vref_kt')."""


@dataclass(frozen=True, slots=True)
class Field:
    """One text field.

    Attributes:
        key: Its key in the form's tree (and in the file, for the simple kinds).
        label: What the crew reads (the chart's or the flight manual's word).
        kind: How its text is read: 'text', 'number', 'minimum' (MDA or NA), 'visibility',
            'flag' (yes/no), 'sector', 'choice'.
        unit: The unit shown beside the field (and accepted as a suffix).
        width: Input width in cells.
        hint: Placeholder (an example, or the default the chart leaves out).
        alt: Other typed units: unit -> (file key, factor).
        owns: The file keys this field writes (default: its key).
        reveal: Shown only when it holds text as the form is built: a form the chart does not
            print but a file may hold (latitude/longitude of an imported or hand-written
            airfield), kept and editable, out of the way of a crew entering the chart's numbers.
        chart: A chart number placing a point (heading, length, distance, bearing...): left out
            where the point is given by latitude/longitude instead, unless it holds text.
    """

    key: str
    label: str
    kind: str = "text"
    unit: str = ""
    width: int = 10
    hint: str = ""
    alt: Mapping[str, tuple[str, float]] = field(default_factory=dict)
    owns: tuple[str, ...] = ()
    reveal: bool = False
    chart: bool = False

    @property
    def file_keys(self) -> tuple[str, ...]:
        if self.owns:
            return self.owns
        return (self.key,) + tuple(k for k, _ in self.alt.values())

    def read(self, text: str) -> dict[str, Any]:
        """The file entries this text gives (raises `values.FormTextError`)."""
        kind = self.kind
        if kind == "number":
            return v.read_number(text, self.unit, alt=self.alt, key=self.key)
        if kind == "minimum":
            return v.read_minimum(text)
        if kind == "visibility":
            return v.read_visibility(text)
        if kind == "flag":
            return v.read_flag(text, self.key)
        if kind == "sector":
            return v.read_sector(text)
        if kind == "variation":
            return v.read_variation(text)
        t = text.strip()
        if kind == "choice":
            t = t.lower()
        return {self.key: t} if t else {}

    def show(self, data: Mapping[str, Any]) -> str:
        """The text this field shows for a file mapping."""
        kind = self.kind
        if kind == "minimum":
            return v.minimum_text(data)
        if kind == "visibility":
            return v.visibility_text(data)
        if kind == "sector":
            return v.sector_text(data)
        if kind == "variation":
            return v.variation_text(data.get(self.key)) if data.get(self.key) is not None else ""
        for key in self.file_keys:
            if data.get(key) is not None:
                value = data[key]
                for unit, (alt_key, _) in self.alt.items():
                    if key == alt_key:
                        return f"{v.number_text(value)} {unit}"
                return v.number_text(value)
        return ""


Check = Callable[[Any, str], Any]
"""A model reader of the loader, `(mapping, dotted path) -> model`, raising `FieldError`."""


@dataclass(frozen=True, slots=True)
class Group:
    """A nested mapping under `key` (or, with key None, a heading over fields of the same mapping).

    Attributes:
        optional: Left out of the file when every field in it is empty.
        check: The loader's reader of this mapping, to check it on its own.
    """

    key: str | None
    title: str
    items: tuple[Item, ...]
    optional: bool = False
    check: Check | None = None
    note: str = ""
    chart: bool = False


@dataclass(frozen=True, slots=True)
class Repeat:
    """A repeating group: a list of mappings (or a mapping keyed by the field `by`, as the file's
    per-category minimums are).

    Attributes:
        item_title: 'Configuration', 'Runway'... (numbered on screen).
        row: Shown as one short row per item (else as a block of fields).
        check: The loader's reader of one item (`(mapping, path)`; with `by`, the item's key is
            passed first: `(key, mapping, path)`).
        new_item: Texts of a new item, given the items already there.
        optional: Left out of the file when empty.
    """

    key: str
    title: str
    item_title: str
    items: tuple[Field, ...] | tuple[Item, ...]
    row: bool = False
    by: str | None = None
    check: Callable[..., Any] | None = None
    new_item: Callable[[Sequence[Mapping[str, Any]]], dict[str, Any]] | None = None
    optional: bool = False
    note: str = ""
    chart: bool = False


Item = Union[Field, Group, Repeat]


def _latlon_given(texts: Mapping[str, Any]) -> bool:
    """The mapping's point is given by latitude/longitude (a runway: its threshold A's)."""
    a = texts.get("threshold_a")
    return not _empty(texts.get("lat_deg", "")) or (isinstance(a, Mapping) and not _empty(a.get("lat_deg", "")))


def shown(item: Item, texts: Mapping[str, Any]) -> bool:
    """Whether an item gets its lines in the mapping whose texts are `texts`: not a field shown
    only when it holds text (`Field.reveal`), nor a chart placement of a point given by
    latitude/longitude (`chart`), while it holds no text."""
    if item.key is None:
        return True
    empty = _empty(texts.get(item.key, ""))
    if empty and isinstance(item, Field) and item.reveal:
        return False
    return not (empty and item.chart and _latlon_given(texts))


@dataclass(frozen=True, slots=True)
class FormSpec:
    """A whole form: what it edits and how the file is checked.

    Attributes:
        kind: The file kind ('aircraft-profile', 'airfield').
        title: 'Aircraft profile'.
        items: Top-level items in document order.
        read_model: The loader's reader of the whole mapping (`Model.from_mapping`).
        name_key: The file key that names the file ('name', 'ident').
        header: The file's first keys (kind, format_version).
        independent: Top-level lists whose items do not refer to each other (approaches,
            obstacles): a cross-field message in one does not hide those of the others.
    """

    kind: str
    title: str
    items: tuple[Item, ...]
    read_model: Callable[[Any], Any]
    name_key: str
    header: Mapping[str, Any] = field(default_factory=dict)
    independent: tuple[str, ...] = ()


# --------------------------------------------------------------------------------------------
# Texts -> mapping
# --------------------------------------------------------------------------------------------
@dataclass
class Built:
    """The file mapping a form's texts give.

    Attributes:
        mapping: The file's mapping (header keys first).
        text_errors: Field -> message for text whose form the field does not take.
        owners: Dotted file path -> the form path that shows its errors (fields, groups, items).
        checks: (dotted path, reader, mapping) of every group and item to check on its own
            (the reader takes the mapping).
        typed: Form paths of fields that hold text.
        fields: Form paths of every field.
    """

    mapping: dict[str, Any]
    text_errors: dict[FormPath, str] = field(default_factory=dict)
    owners: dict[str, FormPath] = field(default_factory=dict)
    checks: list[tuple[str, Callable[[Any], Any], dict[str, Any]]] = field(default_factory=list)
    typed: set[FormPath] = field(default_factory=set)
    fields: set[FormPath] = field(default_factory=set)


def _empty(texts: Any) -> bool:
    if isinstance(texts, str):
        return not texts.strip()
    if isinstance(texts, Mapping):
        return all(_empty(t) for t in texts.values())
    if isinstance(texts, list):
        return all(_empty(t) for t in texts)
    return texts is None


def _fill(items: Sequence[Item], texts: Mapping[str, Any], out: dict[str, Any], path: str, fpath: FormPath,
          built: Built) -> None:
    for item in items:
        if isinstance(item, Field):
            text = texts.get(item.key, "")
            here = fpath + (item.key,)
            built.fields.add(here)
            for key in item.file_keys:
                built.owners[join_path(path, key)] = here
            if isinstance(text, str) and text.strip():
                built.typed.add(here)
            try:
                out.update(item.read(text if isinstance(text, str) else ""))
            except v.FormTextError as exc:
                built.text_errors[here] = str(exc)
        elif isinstance(item, Group):
            if item.key is None:
                _fill(item.items, texts, out, path, fpath, built)
                continue
            sub_texts = texts.get(item.key) or {}
            sub_path, sub_fpath = join_path(path, item.key), fpath + (item.key,)
            built.owners[sub_path] = sub_fpath
            if item.optional and _empty(sub_texts):
                continue
            sub: dict[str, Any] = {}
            _fill(item.items, sub_texts, sub, sub_path, sub_fpath, built)
            out[item.key] = sub
            if item.check is not None:
                built.checks.append((sub_path, lambda m, c=item.check, p=sub_path: c(m, p), sub))
        else:
            _fill_repeat(item, texts.get(item.key) or [], out, path, fpath, built)


def _fill_repeat(rep: Repeat, rows: list[Any], out: dict[str, Any], path: str, fpath: FormPath,
                 built: Built) -> None:
    sub_path, sub_fpath = join_path(path, rep.key), fpath + (rep.key,)
    built.owners[sub_path] = sub_fpath
    if rep.optional and _empty(rows):
        return
    if rep.by is None:
        items: list[Any] = []
        for i, row in enumerate(rows):
            ipath, ifpath = f"{sub_path}[{i}]", sub_fpath + (i,)
            built.owners[ipath] = ifpath
            m: dict[str, Any] = {}
            _fill(rep.items, row, m, ipath, ifpath, built)
            items.append(m)
            if rep.check is not None:
                built.checks.append((ipath, lambda mm, c=rep.check, p=ipath: c(mm, p), m))
        out[rep.key] = items
        return
    keyed: dict[str, Any] = {}
    for i, row in enumerate(rows):
        ifpath = sub_fpath + (i,)
        key = str(row.get(rep.by, "")).strip().upper()
        if not key:
            if not _empty({k: t for k, t in row.items() if k != rep.by}):
                built.text_errors[ifpath + (rep.by,)] = "expected a category letter"
            continue
        ipath = join_path(sub_path, key)
        if key in keyed:
            built.text_errors[ifpath + (rep.by,)] = f"category {key} given twice"
            continue
        built.owners[ipath] = ifpath
        built.owners[join_path(ipath, rep.by)] = ifpath + (rep.by,)
        m = {}
        _fill([f for f in rep.items if not (isinstance(f, Field) and f.key == rep.by)], row, m, ipath,
              ifpath, built)
        keyed[key] = m
        if rep.check is not None:
            built.checks.append((ipath, lambda mm, c=rep.check, k=key, p=ipath: c(k, mm, p), m))
    out[rep.key] = keyed


def to_mapping(spec: FormSpec, texts: Mapping[str, Any]) -> Built:
    """The file mapping of a form's texts (header keys first, then the form's order)."""
    built = Built(mapping=dict(spec.header))
    _fill(spec.items, texts, built.mapping, "", (), built)
    return built


# --------------------------------------------------------------------------------------------
# Mapping -> texts
# --------------------------------------------------------------------------------------------
def _texts(items: Sequence[Item], data: Mapping[str, Any], out: dict[str, Any]) -> None:
    for item in items:
        if isinstance(item, Field):
            out[item.key] = item.show(data)
        elif isinstance(item, Group):
            if item.key is None:
                _texts(item.items, data, out)
            else:
                sub: dict[str, Any] = {}
                _texts(item.items, data.get(item.key) or {}, sub)
                out[item.key] = sub
        else:
            value = data.get(item.key)
            rows: list[dict[str, Any]] = []
            if item.by is None:
                for entry in value or []:
                    row: dict[str, Any] = {}
                    _texts(item.items, entry, row)
                    rows.append(row)
            else:
                for key, entry in (value or {}).items():
                    row = {}
                    _texts(item.items, {**entry, item.by: key}, row)
                    rows.append(row)
            out[item.key] = rows


def to_texts(spec: FormSpec, mapping: Mapping[str, Any]) -> dict[str, Any]:
    """The texts a form shows for a file mapping (`to_mapping` reads them back to it)."""
    out: dict[str, Any] = {}
    _texts(spec.items, mapping, out)
    return out


def _blank(items: Sequence[Item], *, starting_rows: bool) -> dict[str, Any]:
    """Empty texts for `items`; repeating groups get the rows they start with, or none."""
    out: dict[str, Any] = {}
    for item in items:
        if isinstance(item, Field):
            out[item.key] = ""
        elif isinstance(item, Group):
            inner = _blank(item.items, starting_rows=starting_rows)
            if item.key is None:
                out.update(inner)
            else:
                out[item.key] = inner
        else:
            rows: list[dict[str, Any]] = []
            if starting_rows and item.new_item is not None and not item.optional:
                rows.append(item.new_item(rows))
            out[item.key] = rows
    return out


def blank_texts(spec: FormSpec) -> dict[str, Any]:
    """The texts of a new, empty form (repeating groups get the rows they start with)."""
    return _blank(spec.items, starting_rows=True)


def new_row(rep: Repeat, rows: Sequence[Mapping[str, Any]]) -> dict[str, Any]:
    """Texts of a row added to a repeating group."""
    if rep.new_item is not None:
        return rep.new_item(rows)
    return _blank(rep.items, starting_rows=False)


# --------------------------------------------------------------------------------------------
# Dotted paths
# --------------------------------------------------------------------------------------------
def split_path(path: str) -> list[str | int]:
    """'approaches[0].circling.A' -> ['approaches', 0, 'circling', 'A']."""
    out: list[str | int] = []
    for part in path.split("."):
        while "[" in part:
            head, _, rest = part.partition("[")
            if head:
                out.append(head)
            idx, _, part = rest.partition("]")
            out.append(int(idx))
        if part:
            out.append(part)
    return out


def get_path(data: Any, path: str) -> Any:
    cur = data
    for tok in split_path(path):
        try:
            cur = cur[tok]
        except (KeyError, IndexError, TypeError):
            return None
    return cur


def set_path(data: Any, path: str, value: Any) -> bool:
    """Set the value at a dotted path (its parent must exist); False when it cannot."""
    toks = split_path(path)
    cur = data
    for tok in toks[:-1]:
        try:
            cur = cur[tok]
        except (KeyError, IndexError, TypeError):
            return False
    last = toks[-1]
    if isinstance(cur, dict):
        cur[last] = copy.deepcopy(value)
        return True
    if isinstance(cur, list) and isinstance(last, int) and last < len(cur):
        cur[last] = copy.deepcopy(value)
        return True
    return False
