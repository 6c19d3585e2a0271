"""Check a form with the loader's own model readers and place each message beside its field.

One validation path: the texts become the file's mapping (`spec.to_mapping`), and the mapping is
read by the very functions the YAML loader calls (`Model.from_mapping`, and for each group and
repeated item the reader of that part), so the form says exactly what `briefer check` would say
about the saved file, in the same words.

A reader stops at its first problem. So that a field further down is checked while one above it
is still empty or wrong, each group and item is also read on its own, and a part of the whole
file that is missing or wrong is stood in for by the same part of a complete example
(`FormSpec.template`) before the file is read again; a message that may come from a stand-in
(`FormSpec.depends`) is not shown.

No Textual import here.
"""

from __future__ import annotations

import copy
import re
from dataclasses import dataclass, field
from typing import Any

from briefer.errors import DataFileError
from briefer.model import FieldError, join_path
from briefer.tui.forms.spec import Built, FormPath, FormSpec, get_path, set_path, split_path, to_mapping

_MISSING = re.compile(r"missing required key '([^']+)'")
MAX_ROUNDS = 40


@dataclass
class Verdict:
    """What the loader says about a form.

    Attributes:
        model: The model the whole form gives (None while anything is wrong or missing).
        errors: Form path -> message (bad input).
        required: Form path -> message for a required entry still empty.
        general: Messages that belong to no field (shown in the status line).
        built: The file mapping and the field owners.
    """

    model: Any
    errors: dict[FormPath, str] = field(default_factory=dict)
    required: dict[FormPath, str] = field(default_factory=dict)
    general: list[str] = field(default_factory=list)
    built: Built | None = None

    @property
    def ok(self) -> bool:
        return self.model is not None and not self.errors and not self.required and not self.general

    def first_problem(self) -> tuple[FormPath | None, str] | None:
        """The first problem in form order (for the status line)."""
        if self.errors:
            path = min(self.errors, key=_order_key)
            return path, self.errors[path]
        if self.required:
            path = min(self.required, key=_order_key)
            return path, self.required[path]
        if self.general:
            return None, self.general[0]
        return None


def _order_key(path: FormPath) -> tuple:
    return tuple((0, p) if isinstance(p, int) else (1, str(p)) for p in path)


def _target(exc: DataFileError) -> tuple[str, bool]:
    """(dotted path the message is about, is a missing required key)."""
    context = exc.context or ""
    m = _MISSING.match(exc.message)
    if m:
        return join_path(context, m.group(1)), True
    return context, False


def _owner(built: Built, path: str) -> FormPath | None:
    while True:
        if path in built.owners:
            return built.owners[path]
        if not path:
            return None
        if path.endswith("]") and "[" in path:
            path = path[: path.rindex("[")]
        else:
            path = path.rpartition(".")[0]


def _region(doc: Any, base: str, path: str) -> str:
    """The part of `doc` (the mapping at `base`) stood in for when `path` is wrong: the key
    below `base` (with its list index)."""
    rel = split_path(path)[len(split_path(base)):]
    if not rel:
        return ""
    region = join_path(base, str(rel[0]))
    if len(rel) > 1 and isinstance(rel[1], int) and isinstance(doc, dict) and isinstance(doc.get(rel[0]), list):
        region = f"{region}[{rel[1]}]"
    return region


def _template_part(template: Any, path: str) -> Any:
    """The template's part at `path`; a list index beyond it, or a category it lacks, takes
    its first."""
    cur = template
    for tok in split_path(path):
        if isinstance(tok, int):
            if not isinstance(cur, list) or not cur:
                return None
            cur = cur[tok] if tok < len(cur) else cur[0]
        elif isinstance(cur, dict):
            if tok in cur:
                cur = cur[tok]
            elif len(tok) == 1 and tok.isupper() and cur and all(isinstance(x, dict) for x in cur.values()):
                cur = next(iter(cur.values()))
            else:
                return None
        else:
            return None
    return cur


def _relative_set(doc: Any, base: str, path: str, value: Any) -> bool:
    rel = split_path(path)[len(split_path(base)):]
    return set_path(doc, ".".join(f"[{t}]" if isinstance(t, int) else t for t in rel).replace(".[", "["),
                    value)


def _inside(path: str, region: str) -> bool:
    return path == region or path.startswith(region + ".") or path.startswith(region + "[")


class _Placer:
    def __init__(self, built: Built, verdict: Verdict) -> None:
        self.built = built
        self.verdict = verdict

    def place(self, exc: DataFileError) -> None:
        target, missing = _target(exc)
        owner = _owner(self.built, target)
        message = exc.message
        if owner is None:
            text = f"{target}: {message}" if target else message
            if text not in self.verdict.general:
                self.verdict.general.append(text)
            return
        if owner in self.verdict.errors or owner in self.verdict.required:
            return
        typed = any(t[: len(owner)] == owner for t in self.built.typed)
        if not typed:      # nothing typed there yet: a reminder, not an error
            self.verdict.required[owner] = "required" if missing else message
        else:
            self.verdict.errors[owner] = message


def _read_part(read: Any, doc: Any, base: str, template: Any, placer: _Placer,
               depends: dict[str, tuple[str, ...]] | None = None) -> Any:
    """Read `doc` (the mapping at `base`) with `read`; place each message, standing in the
    template's part for what is wrong and reading again. The model, or None if anything was
    wrong or stood in for."""
    doc = copy.deepcopy(doc)
    stood_in: list[str] = []
    for _ in range(MAX_ROUNDS):
        try:
            model = read(doc)
        except FieldError as exc:
            target, missing = _target(exc)
            region = _region(doc, base, target)
            names = {str(split_path(r)[-1] if not r.endswith("]") else split_path(r)[-2]) for r in stood_in}
            reads = (depends or {}).get(str(split_path(target)[0]) if target else "", ())
            from_stand_in = any(_inside(target, r) for r in stood_in) or not missing and (
                any(n in exc.message for n in names) or any(str(split_path(r)[0]) in reads for r in stood_in))
            if not from_stand_in:
                placer.place(exc)
            if template is None or not region or region in stood_in:
                return None
            stand_in = _template_part(template, region)
            if stand_in is None or not _relative_set(doc, base, region, stand_in):
                return None
            stood_in.append(region)
        else:
            return None if stood_in else model
    return None


def check_texts(spec: FormSpec, texts: dict[str, Any]) -> Verdict:
    """Read a form's texts as the loader reads the file; every message placed by its field."""
    built = to_mapping(spec, texts)
    verdict = Verdict(model=None, errors=dict(built.text_errors), built=built)
    placer = _Placer(built, verdict)
    template = spec.template() if spec.template is not None else None
    for path, reader, part in built.checks:
        _read_part(reader, part, path, template, placer)
    model = _read_part(spec.read_model, built.mapping, "", template, placer, dict(spec.depends))
    if not (verdict.errors or verdict.required or verdict.general):
        verdict.model = model
    return verdict
