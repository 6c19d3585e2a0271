"""Check a form with the loader's own rules and place each message beside its field.

One validation path: the texts become the draft of the data file (`spec.to_mapping`), and the
draft is checked with the loader's readers and words: each typed field inside its own mapping
(`briefer.io.drafts.field_message`: an unfinished form does not mask it), and the whole draft by
the model reader the YAML loader calls (`Model.from_mapping`: cross-field rules, the layout of
runways and fixes). A required entry still empty is the model's own `required_keys()`. Saving
reads the very file text back with the loader itself (`briefer.tui.forms.store`).

No Textual import here.
"""

from __future__ import annotations

import re
from briefer._dataclass import dataclass, field
from typing import Any

from briefer.errors import DataFileError
from briefer.io import drafts
from briefer.model import join_path
from briefer.tui.forms.spec import Built, FormPath, FormSpec, get_path, to_mapping
from briefer.tui.forms.values import number_text

_MISSING = re.compile(r"missing required key '([^']+)'")
_ITEM = re.compile(r"([a-z_]+)\[(\d+)\]")
MORE_CROSS_FIELD = 6
"""At most this many more cross-field messages after the loader's first (one read each)."""


@dataclass
class Verdict:
    """What the loader says about a form.

    Attributes:
        model: The model the whole form gives (None while anything is wrong or missing).
        errors: Form path -> message (bad input).
        required: Form path -> reminder for a required entry still empty.
        general: Messages that belong to no field (shown in the status line).
        built: The draft and the field owners.
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


def _parent(path: str) -> str:
    if path.endswith("]") and "[" in path:
        return path[: path.rindex("[")]
    return path.rpartition(".")[0]


class Checker:
    """Checks a form's texts; remembers each field's message for a mapping that did not change
    (a keystroke re-checks the fields of its own mapping, and the whole draft)."""

    def __init__(self, spec: FormSpec) -> None:
        self.spec = spec
        self._cache: dict[str, tuple[str, str, str | None]] = {}

    def _field_message(self, draft: dict[str, Any], path: str) -> str | None:
        """The loader's message for one field. A field that read fine and was not edited is not
        read again when a sibling changes (the whole-draft read still sees cross-field rules);
        one that had a message is."""
        parent = _parent(path)
        sub = get_path(draft, parent) if parent else draft
        value, around = repr(get_path(draft, path)), repr(sub)
        hit = self._cache.get(path)
        if hit is not None and hit[0] == value and (hit[2] is None or hit[1] == around):
            return hit[2]
        try:
            msg = drafts.field_message(self.spec.kind, draft, path)
        except (KeyError, IndexError, TypeError, ValueError):
            msg = None
        self._cache[path] = (value, around, msg)
        return msg

    def check(self, texts: dict[str, Any]) -> Verdict:
        built = to_mapping(self.spec, texts)
        draft = built.mapping
        verdict = Verdict(model=None, errors=dict(built.text_errors), built=built)
        for path, owner in built.owners.items():
            if owner in verdict.errors or owner not in built.fields:
                continue
            parent = _parent(path)
            sub = get_path(draft, parent) if parent else draft
            if not isinstance(sub, dict):
                continue
            key = path[len(parent) + 1:] if parent else path
            if key in sub:
                msg = self._field_message(draft, path)
                if msg:
                    verdict.errors[owner] = msg
            elif owner not in built.typed and owner not in verdict.required and self._required(parent, key):
                verdict.required[owner] = "required"
        self._drop_echoes(verdict, built, draft)
        try:      # the loader's reader of the whole file (`yamlload.model_from_document` calls it)
            model = self.spec.read_model(draft)
        except DataFileError as exc:
            self._place(verdict, built, exc)
            self._more_cross_field(verdict, built, draft, exc)
        else:
            if not verdict.errors and not verdict.required:
                verdict.model = model
        return verdict

    def _more_cross_field(self, verdict: Verdict, built: Built, draft: dict[str, Any], exc: DataFileError) -> None:
        """The loader stops at its first error. When that lies in an item of a list whose items
        do not depend on each other (an approach, an obstacle: `FormSpec.independent`), the draft
        is read again without it, so the crew sees every such message at once (up to
        `MORE_CROSS_FIELD` more)."""
        kept = {key: list(range(len(draft.get(key) or []))) for key in self.spec.independent}
        trial = dict(draft)
        for _ in range(MORE_CROSS_FIELD):
            m = _ITEM.match(exc.context or "")
            if m is None or m.group(1) not in kept or len(trial[m.group(1)]) <= 1:
                return
            key, index = m.group(1), int(m.group(2))
            del kept[key][index]
            trial[key] = [item for i, item in enumerate(trial[key]) if i != index]
            try:
                self.spec.read_model(trial)
            except DataFileError as again:
                exc = again
            else:
                return
            hit = _ITEM.match(exc.context or "")
            context = exc.context
            if hit is not None and hit.group(1) in kept:      # back to the form's numbering
                context = f"{hit.group(1)}[{kept[hit.group(1)][int(hit.group(2))]}]{context[hit.end():]}"
            self._place(verdict, built, DataFileError(exc.message, context=context))

    @staticmethod
    def _drop_echoes(verdict: Verdict, built: Built, draft: dict[str, Any]) -> None:
        """A message that names a sibling field which is itself wrong or empty, or quotes a value
        the sibling does not hold ("expected above vref_kt (133)" while VREF says 110), compares
        with a stand-in value, not the crew's: it is not shown (the whole-draft read still
        reports a real cross-field problem)."""
        by_owner = {owner: path for path, owner in built.owners.items() if owner in built.fields}
        for owner in list(verdict.errors):
            path = by_owner.get(owner)
            if path is None or owner in built.text_errors:
                continue
            parent = _parent(path)
            sub = get_path(draft, parent) if parent else draft
            for sibling, sib_owner in built.owners.items():
                if sib_owner == owner or sib_owner not in built.fields or _parent(sibling) != parent:
                    continue
                name = sibling[len(parent) + 1:] if parent else sibling
                if not re.search(rf"\b{re.escape(name)}\b", verdict.errors[owner]):
                    continue
                bad = sib_owner in verdict.errors or (isinstance(sub, dict) and name not in sub)
                quoted = re.search(rf"\b{re.escape(name)} \(([^)]*)\)", verdict.errors[owner])
                if not bad and quoted and isinstance(sub, dict):     # compared with another value
                    bad = quoted.group(1) != number_text(sub.get(name))
                if bad:
                    del verdict.errors[owner]
                    break

    def _required(self, parent: str, key: str) -> bool:
        try:
            cls, _category = drafts.model_class_at(self.spec.kind, parent)
        except (KeyError, IndexError):
            return False
        return key in cls.required_keys()

    @staticmethod
    def _place(verdict: Verdict, built: Built, exc: DataFileError) -> None:
        context = exc.context or ""
        m = _MISSING.match(exc.message)
        target = join_path(context, m.group(1)) if m else context
        owner = _owner(built, target)
        if owner is None:
            verdict.general.append(f"{target}: {exc.message}" if target else exc.message)
            return
        if owner in verdict.errors or owner in verdict.required:
            return
        typed = any(t[: len(owner)] == owner for t in built.typed)
        if m or not typed:         # nothing typed there yet: a reminder, not an error
            verdict.required[owner] = "required" if m else exc.message
        else:
            verdict.errors[owner] = exc.message


def check_texts(spec: FormSpec, texts: dict[str, Any]) -> Verdict:
    """Check a form's texts once (see `Checker` to check as the crew types)."""
    return Checker(spec).check(texts)
