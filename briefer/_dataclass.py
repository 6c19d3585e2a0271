"""``dataclass``: the standard library's decorator, made quicker to apply (start-up time).

Python 3.11's ``dataclasses.dataclass`` compiles every generated method (``__init__``,
``__repr__``, ``__eq__``, ``__hash__``, ``__setattr__``, ``__delattr__``) from source, one
``exec`` each: about a millisecond a class, and briefer defines about a hundred dataclasses, so
that compiling was a third of ``briefer brief``'s own start-up. Here nothing is compiled when a
class is defined. ``__init__`` (its signature must be exact) is a precompiled template whose
parameters are renamed and counted for the class (``code.replace``, no ``exec``); once a class
has made `UPGRADE_AFTER` instances, its own ``__init__`` is compiled from the standard source
and replaces the template (the classes a brief makes a few times never pay for compiling, the
ones made often run the compiled one). The other methods are closures over the field names,
with the same behaviour as the generated ones:

* ``__repr__``: ``Name(a=1, b='x')`` over the fields with ``repr=True``;
* ``__eq__``: the tuples of the fields with ``compare=True``, for instances of the same class
  (``NotImplemented`` otherwise);
* ``__hash__``: as the standard table decides (frozen with eq: the hash of that tuple; eq and
  not frozen: unhashable; an explicit ``__hash__`` kept);
* frozen: ``__setattr__`` / ``__delattr__`` raise ``dataclasses.FrozenInstanceError``.

The class is a real dataclass: ``dataclasses.fields``, ``replace``, ``asdict`` and
``is_dataclass`` work on it. Anything outside the options briefer uses (``order``,
``unsafe_hash``, ``weakref_slot``, ``InitVar``, ``KW_ONLY``, annotations that are not strings,
another Python than 3.11) goes to the standard decorator unchanged.
"""

from __future__ import annotations

import dataclasses as _dc
import itertools as _itertools
import sys
import types as _types
from dataclasses import MISSING, Field, FrozenInstanceError, field, fields, replace

__all__ = ["MISSING", "Field", "FrozenInstanceError", "dataclass", "field", "fields", "replace"]

_QUICK = sys.version_info[:2] == (3, 11)     # the private helpers below are 3.11's


def dataclass(cls: type | None = None, /, *, init: bool = True, repr: bool = True, eq: bool = True,
              order: bool = False, unsafe_hash: bool = False, frozen: bool = False, match_args: bool = True,
              kw_only: bool = False, slots: bool = False, weakref_slot: bool = False):
    """``dataclasses.dataclass`` (same arguments, same result), quicker to apply."""

    def wrap(c: type) -> type:
        if (_QUICK and init and not order and not unsafe_hash and not weakref_slot
                and _plain_annotations(c)):
            return _process(c, repr=repr, eq=eq, frozen=frozen, match_args=match_args, kw_only=kw_only,
                            slots=slots)
        extra = {"weakref_slot": True} if weakref_slot else {}     # (Python 3.10 has no weakref_slot)
        return _dc.dataclass(c, init=init, repr=repr, eq=eq, order=order, unsafe_hash=unsafe_hash, frozen=frozen,
                             match_args=match_args, kw_only=kw_only, slots=slots, **extra)

    return wrap if cls is None else wrap(cls)


def _is_classvar(annotation: str) -> bool:
    return annotation.lstrip().startswith(("ClassVar", "typing.ClassVar"))


def _plain_annotations(cls: type) -> bool:
    """Every annotation a string (``from __future__ import annotations``), none an InitVar or KW_ONLY."""
    for a in cls.__dict__.get("__annotations__", {}).values():
        if not isinstance(a, str) or "InitVar" in a or "KW_ONLY" in a:
            return False
    return True


def _own_field(cls: type, name: str, annotation: str, kw_only: bool) -> Field:
    default = getattr(cls, name, MISSING)
    if isinstance(default, Field):
        f = default
    else:
        if isinstance(default, type(_dc.Field.name)):      # a slot left by an earlier decoration
            default = MISSING
        f = field(default=default)
    f.name = name
    f.type = annotation
    f._field_type = _dc._FIELD                              # type: ignore[attr-defined]
    if f.kw_only is MISSING:
        f.kw_only = kw_only
    if f.default.__class__.__hash__ is None:
        raise ValueError(f"mutable default {type(f.default)} for field {f.name} is not allowed: use default_factory")
    return f


def _collect_fields(cls: type, frozen: bool, kw_only: bool) -> dict[str, Field]:
    all_fields: dict[str, Field] = {}
    any_frozen_base = has_bases = False
    for b in cls.__mro__[-1:0:-1]:
        base_fields = getattr(b, _dc._FIELDS, None)          # type: ignore[attr-defined]
        if base_fields is not None:
            has_bases = True
            all_fields.update((f.name, f) for f in base_fields.values())
            if getattr(b, _dc._PARAMS).frozen:               # type: ignore[attr-defined]
                any_frozen_base = True
    annotations = cls.__dict__.get("__annotations__", {})
    for name, annotation in annotations.items():
        if _is_classvar(annotation):
            continue
        f = _own_field(cls, name, annotation, kw_only)
        all_fields[name] = f
        if isinstance(getattr(cls, name, None), Field):
            if f.default is MISSING:
                delattr(cls, name)
            else:
                setattr(cls, name, f.default)
    for name, value in cls.__dict__.items():
        if isinstance(value, Field) and name not in annotations:
            raise TypeError(f"{name!r} is a field but has no type annotation")
    if has_bases and any_frozen_base != frozen:
        raise TypeError("cannot inherit non-frozen dataclass from a frozen one" if any_frozen_base
                        else "cannot inherit frozen dataclass from a non-frozen one")
    return all_fields


def _init_source(cls: type, all_fields: dict[str, Field], frozen: bool, slots: bool, tag: str,
                 env: dict[str, object]) -> str:
    """The source of ``__init__`` with the standard decorator's signature and body, named
    ``__init_<tag>__``; its defaults go into ``env`` under names carrying ``tag``."""
    init_fields = [f for f in all_fields.values() if f.init]
    positional = [f for f in init_fields if not f.kw_only]
    keyword = [f for f in init_fields if f.kw_only]
    self_name = "__dataclass_self__" if "self" in all_fields else "self"

    def param(f: Field) -> str:
        if f.default is not MISSING:
            env[f"__dataclass_dflt_{tag}_{f.name}__"] = f.default
            return f"{f.name}=__dataclass_dflt_{tag}_{f.name}__"
        if f.default_factory is not MISSING:
            return f"{f.name}=__dataclass_HAS_DEFAULT_FACTORY__"
        return f.name

    body = []
    for f in all_fields.values():
        dflt = f"__dataclass_dflt_{tag}_{f.name}__"
        if f.default_factory is not MISSING:
            env[dflt] = f.default_factory
            value = f"{dflt}() if {f.name} is __dataclass_HAS_DEFAULT_FACTORY__ else {f.name}" if f.init else f"{dflt}()"
        elif f.init:
            value = f.name
        elif slots and f.default is not MISSING:
            env[dflt] = f.default
            value = dflt
        else:
            continue
        slot_set = _slot_setter(cls, f.name) if frozen and slots else None
        if slot_set is not None:      # the slot's own setter: what object.__setattr__ ends in, without the look-up
            env[f"__dataclass_set_{tag}_{f.name}__"] = slot_set
            body.append(f"__dataclass_set_{tag}_{f.name}__({self_name},{value})")
        else:
            body.append(f"__dataclass_builtins_object__.__setattr__({self_name},{f.name!r},{value})" if frozen
                        else f"{self_name}.{f.name}={value}")
    if hasattr(cls, "__post_init__"):
        body.append(f"{self_name}.__post_init__()")
    params = [self_name] + [param(f) for f in positional] + (["*"] + [param(f) for f in keyword] if keyword else [])
    return f"def __init_{tag}__({','.join(params)}):\n " + ("\n ".join(body) if body else "pass") + "\n"


def _slot_setter(cls: type, name: str):
    """The ``__set__`` of the slot that holds field `name` of a slotted class (found along the
    class's MRO, as ``object.__setattr__`` finds it on an instance of the class), or None when
    the name is not a plain slot there (then ``object.__setattr__`` is used)."""
    for klass in cls.__mro__:
        if name in klass.__dict__:
            d = klass.__dict__[name]
            return d.__set__ if type(d) is _types.MemberDescriptorType else None
    return None


def _check_defaults_order(all_fields: dict[str, Field]) -> None:
    seen_default = False
    for f in all_fields.values():
        if not f.init or f.kw_only:
            continue
        if f.default is not MISSING or f.default_factory is not MISSING:
            seen_default = True
        elif seen_default:
            raise TypeError(f"non-default argument {f.name!r} follows default argument")


UPGRADE_AFTER = 16
"""Instances made with the quick ``__init__`` before the class's own is compiled."""

_HAS_DEFAULT_FACTORY = _dc._HAS_DEFAULT_FACTORY          # type: ignore[attr-defined]
_PLAIN, _FACTORY_ARG, _FACTORY, _DEFAULT = range(4)


def _fill(self, values: dict[str, object], spec: tuple) -> None:
    """The body of every quick ``__init__``: set each field from the arguments (``values``, the
    ``__init__``'s locals) as the generated body would, then ``__post_init__``."""
    setter, plan, post_init, state = spec
    for name, how, extra in plan:
        if how == _PLAIN:
            setter(self, name, values[name])
        elif how == _FACTORY_ARG:
            value = values[name]
            setter(self, name, extra() if value is _HAS_DEFAULT_FACTORY else value)
        elif how == _FACTORY:
            setter(self, name, extra())
        else:
            setter(self, name, extra)
    state[0] -= 1
    if state[0] == 0:
        _compile_init(*state[1:])
    if post_init:
        self.__post_init__()


def _template(__dataclass_self__):
    _fill(__dataclass_self__, locals(), "__dataclass_spec__")


def _quick_init(cls_box: list[type], all_fields: dict[str, Field], frozen: bool, slots: bool):
    """An ``__init__`` with the standard signature made without compiling anything: the code of
    `_template` with the parameters renamed and counted (``code.replace``; its body reads them
    through ``locals()``), so defining a class costs no ``exec``. After `UPGRADE_AFTER`
    instances, the class's own ``__init__`` (generated source, as the standard decorator makes
    it) is compiled and put in its place, so a class made often runs the compiled one."""
    cls = cls_box[0]
    init_fields = [f for f in all_fields.values() if f.init]
    positional = [f for f in init_fields if not f.kw_only]
    keyword = [f for f in init_fields if f.kw_only]
    self_name = "__dataclass_self__" if "self" in all_fields else "self"
    plan = []
    for f in all_fields.values():
        if f.default_factory is not MISSING:
            plan.append((f.name, _FACTORY_ARG if f.init else _FACTORY, f.default_factory))
        elif f.init:
            plan.append((f.name, _PLAIN, None))
        elif slots and f.default is not MISSING:
            plan.append((f.name, _DEFAULT, f.default))

    def default(f: Field) -> object:
        return _HAS_DEFAULT_FACTORY if f.default_factory is not MISSING else f.default

    state = [UPGRADE_AFTER, cls_box, all_fields, frozen, slots]
    spec = (object.__setattr__ if frozen else setattr, tuple(plan), hasattr(cls, "__post_init__"), state)
    code = _template.__code__
    qualname = f"{cls.__qualname__}.__init__"
    code = code.replace(co_argcount=1 + len(positional), co_kwonlyargcount=len(keyword),
                        co_nlocals=1 + len(init_fields),
                        co_varnames=(self_name, *(f.name for f in positional), *(f.name for f in keyword)),
                        co_consts=tuple(spec if c == "__dataclass_spec__" else c for c in code.co_consts),
                        co_name="__init__", co_qualname=qualname)
    defaults = tuple(default(f) for f in positional if f.default is not MISSING or f.default_factory is not MISSING)
    fn = _types.FunctionType(code, _template.__globals__, "__init__", defaults or None)
    fn.__kwdefaults__ = {f.name: default(f) for f in keyword
                         if f.default is not MISSING or f.default_factory is not MISSING} or None
    _name_init(fn, cls, all_fields)
    return fn


def _name_init(fn, cls: type, all_fields: dict[str, Field]) -> None:
    fn.__name__ = "__init__"
    fn.__qualname__ = f"{cls.__qualname__}.__init__"
    fn.__module__ = cls.__module__
    fn.__annotations__ = {**{f.name: f.type for f in all_fields.values() if f.init}, "return": None}


def _compile_init(cls_box: list[type], all_fields: dict[str, Field], frozen: bool, slots: bool) -> None:
    """Compile the class's own ``__init__`` (the standard decorator's source) and put it in the
    class, in place of the quick one (same signature, same behaviour)."""
    cls = cls_box[0]
    env: dict[str, object] = {"__dataclass_HAS_DEFAULT_FACTORY__": _HAS_DEFAULT_FACTORY,
                              "__dataclass_builtins_object__": object}
    exec(_init_source(cls, all_fields, frozen, slots, "0", env), env)
    fn = env["__init_0__"]
    _name_init(fn, cls, all_fields)
    type.__setattr__(cls, "__init__", fn)


def _row(names: tuple[str, ...]):
    """self -> the tuple of those attributes."""
    if not names:
        return lambda self: ()
    if len(names) == 1:
        (name,) = names
        return lambda self: (getattr(self, name),)
    from operator import attrgetter

    return attrgetter(*names)


def _methods(cls_box: list[type], all_fields: dict[str, Field], *, repr: bool, eq: bool, frozen: bool,
             explicit_hash: bool) -> dict[str, object]:
    """``__repr__``, ``__eq__``, ``__hash__`` and the frozen ``__setattr__`` / ``__delattr__``, as
    the standard decorator makes them (``cls_box[0]``: the final class, after slots)."""
    out: dict[str, object] = {}
    if repr:
        names = tuple(f.name for f in all_fields.values() if f.repr)

        def __repr__(self) -> str:
            return (self.__class__.__qualname__ + "("
                    + ", ".join([f"{n}={getattr(self, n)!r}" for n in names]) + ")")
        out["__repr__"] = __repr__
    compared = tuple(f.name for f in all_fields.values() if f.compare)
    row = _row(compared)
    if eq:
        def __eq__(self, other):
            if other.__class__ is self.__class__:
                return row(self) == row(other)
            return NotImplemented
        out["__eq__"] = __eq__
    if frozen:
        names_set = frozenset(all_fields)

        def __setattr__(self, name, value):
            cls = cls_box[0]
            if type(self) is cls or name in names_set:
                raise FrozenInstanceError(f"cannot assign to field {name!r}")
            super(cls, self).__setattr__(name, value)

        def __delattr__(self, name):
            cls = cls_box[0]
            if type(self) is cls or name in names_set:
                raise FrozenInstanceError(f"cannot delete field {name!r}")
            super(cls, self).__delattr__(name)
        out["__setattr__"], out["__delattr__"] = __setattr__, __delattr__
    if eq and not explicit_hash:
        if frozen:
            hashed = _row(tuple(f.name for f in all_fields.values() if (f.compare if f.hash is None else f.hash)))

            def __hash__(self) -> int:
                return hash(hashed(self))
            out["__hash__"] = __hash__
        else:
            out["__hash__"] = None
    return out


def _process(cls: type, *, repr: bool, eq: bool, frozen: bool, match_args: bool, kw_only: bool, slots: bool) -> type:
    params = _dc._DataclassParams(True, repr, eq, False, False, frozen)          # type: ignore[attr-defined]
    cls.__dataclass_params__ = params                                           # type: ignore[attr-defined]
    all_fields = _collect_fields(cls, frozen, kw_only)
    attrs: dict[str, object] = {"__dataclass_params__": params, "__dataclass_fields__": all_fields}
    class_hash = cls.__dict__.get("__hash__", MISSING)
    explicit_hash = not (class_hash is MISSING or (class_hash is None and "__eq__" in cls.__dict__))
    cls_box = [cls]
    if "__init__" not in cls.__dict__:
        _check_defaults_order(all_fields)
        attrs["__init__"] = _quick_init(cls_box, all_fields, frozen, slots)
    for name, fn in _methods(cls_box, all_fields, repr=repr, eq=eq, frozen=frozen,
                             explicit_hash=explicit_hash).items():
        if name == "__hash__":
            attrs["__hash__"] = fn
            continue
        if name in cls.__dict__:
            if name in ("__setattr__", "__delattr__"):
                raise TypeError(f"Cannot overwrite attribute {name} in class {cls.__name__}")
            continue
        if callable(fn):
            fn.__qualname__ = f"{cls.__qualname__}.{name}"                        # type: ignore[attr-defined]
        attrs[name] = fn
    if not getattr(cls, "__doc__"):
        attrs["__doc__"] = f"{cls.__name__}({', '.join(all_fields)})"
    if match_args and "__match_args__" not in cls.__dict__:
        attrs["__match_args__"] = tuple(f.name for f in all_fields.values() if f.init and not f.kw_only)
    if slots:
        cls = cls_box[0] = _slotted(cls, all_fields, frozen, attrs)
        return cls
    for name, value in attrs.items():
        setattr(cls, name, value)
    return cls


def _slotted(cls: type, all_fields: dict[str, Field], frozen: bool, attrs: dict[str, object]) -> type:
    """The class made again with ``__slots__`` and `attrs` in its namespace, in one step (as
    ``dataclasses._add_slots`` makes it, without setting each method on the class first: every
    special method set on a class updates its slots)."""
    cls_dict = dict(cls.__dict__)
    cls_dict.update(attrs)
    inherited = set(_itertools.chain.from_iterable(map(_dc._get_slots, cls.__mro__[1:-1])))  # type: ignore[attr-defined]
    cls_dict["__slots__"] = tuple(name for name in all_fields if name not in inherited)
    for name in all_fields:
        cls_dict.pop(name, None)
    cls_dict.pop("__dict__", None)
    cls_dict.pop("__weakref__", None)
    cls_dict["__qualname__"] = cls.__qualname__
    if frozen:
        cls_dict.setdefault("__getstate__", _dc._dataclass_getstate)              # type: ignore[attr-defined]
        cls_dict.setdefault("__setstate__", _dc._dataclass_setstate)              # type: ignore[attr-defined]
    return type(cls)(cls.__name__, cls.__bases__, cls_dict)
