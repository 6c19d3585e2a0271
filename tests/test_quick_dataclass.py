"""briefer._dataclass.dataclass behaves as the standard library's dataclasses.dataclass (the
reference: the same class body decorated by both must give the same instances, reprs, equality,
hashes, errors, fields and replace)."""

from __future__ import annotations

import copy
import dataclasses
import inspect
from typing import ClassVar

import pytest

from briefer import _dataclass


@pytest.fixture(autouse=True, params=["quick", "compiled"])
def init_kind(request, monkeypatch):
    """Every test runs on both ``__init__``s a quick class has: the one made without compiling
    (its first instances) and the compiled one that replaces it (from the first instance on,
    here, instead of after ``UPGRADE_AFTER``)."""
    if request.param == "compiled":
        monkeypatch.setattr(_dataclass, "UPGRADE_AFTER", 1)
    return request.param


def _pair(make):
    """The same class body decorated by the standard and the quick decorator."""
    return make(dataclasses.dataclass, dataclasses.field), make(_dataclass.dataclass, _dataclass.field)


def _frozen_kw(dc, field):
    @dc(frozen=True, slots=True, kw_only=True)
    class Point:
        """A point."""
        label: ClassVar[str] = "point"
        x_m: float
        y_m: float = 0.0
        tags: tuple[str, ...] = ()
        extra: dict = field(default_factory=dict, compare=False, repr=False)
        cache: list = field(default_factory=list, init=False, repr=False, compare=False)

        def __post_init__(self) -> None:
            if self.x_m < 0:
                raise ValueError("x_m must be >= 0")
            object.__setattr__(self, "tags", tuple(self.tags))
    return Point


def _frozen_positional(dc, field):
    @dc(frozen=True, slots=True)
    class Pair:
        a: int
        b: str = "b"
        c: float = field(default=1.5, compare=False)
    return Pair


def _mutable(dc, field):
    @dc
    class Box:
        items: list = field(default_factory=list)
        n: int = 0
    return Box


def _inherited(dc, field):
    class Mixin:
        __slots__ = ()
        kind: ClassVar[str] = "mixin"

        def describe(self) -> str:
            return f"{self.kind}:{self.name}"

    @dc(frozen=True, slots=True, kw_only=True)
    class Base(Mixin):
        name: str
        size: int = 1

    @dc(frozen=True, slots=True, kw_only=True)
    class Child(Base):
        kind: ClassVar[str] = "child"
        colour: str = "red"
    return Base, Child


def test_frozen_keyword_only_class_matches_the_standard_one():
    std, quick = _pair(_frozen_kw)
    for cls in (std, quick):
        assert cls.label == "point"
        assert cls.__slots__ == ("x_m", "y_m", "tags", "extra", "cache")
    a_std, a_q = std(x_m=1.0, tags=["a"]), quick(x_m=1.0, tags=["a"])
    assert repr(a_std) == repr(a_q) == "_frozen_kw.<locals>.Point(x_m=1.0, y_m=0.0, tags=('a',))"
    assert a_q == quick(x_m=1.0, tags=("a",), extra={"z": 1})        # extra not compared
    assert a_q != quick(x_m=2.0)
    assert a_q != a_std                                                # other class: NotImplemented both ways
    assert hash(a_q) == hash(quick(x_m=1.0, tags=("a",))) and hash(a_std) == hash(std(x_m=1.0, tags=("a",)))
    assert hash(a_q) == hash(a_std)                                    # same field tuple
    for inst, cls in ((a_std, std), (a_q, quick)):
        with pytest.raises(dataclasses.FrozenInstanceError):
            inst.x_m = 3.0
        with pytest.raises(dataclasses.FrozenInstanceError):
            del inst.y_m
        with pytest.raises(TypeError):
            cls(1.0)                                                   # keyword-only
        with pytest.raises(TypeError):
            cls()                                                      # x_m missing
        with pytest.raises(ValueError, match="x_m must be"):
            cls(x_m=-1.0)
        assert inst.cache == [] and inst.extra == {}
        assert [f.name for f in dataclasses.fields(inst)] == ["x_m", "y_m", "tags", "extra", "cache"]
        assert dataclasses.is_dataclass(inst)
        r = dataclasses.replace(inst, y_m=5.0)
        assert (r.x_m, r.y_m, r.tags) == (1.0, 5.0, ("a",))
        assert dataclasses.asdict(inst) == {"x_m": 1.0, "y_m": 0.0, "tags": ("a",), "extra": {}, "cache": []}
        assert copy.deepcopy(inst) == inst
    assert quick.__init__.__qualname__.endswith("Point.__init__")
    assert quick.__doc__ == "A point."


def test_positional_class_matches_the_standard_one():
    std, quick = _pair(_frozen_positional)
    for cls in (std, quick):
        p = cls(1)
        assert (p.a, p.b, p.c) == (1, "b", 1.5)
        assert cls(1, "x", 9.0) == cls(1, "x", 2.0)                   # c not compared
        assert cls.__match_args__ == ("a", "b", "c")
        assert copy.copy(cls(2, "y")) == cls(2, "y")
        assert cls.__doc__.startswith("Pair(")
    assert repr(std(1)) == repr(quick(1)) == "_frozen_positional.<locals>.Pair(a=1, b='b', c=1.5)"


def test_mutable_class_is_unhashable_and_assignable_as_the_standard_one():
    std, quick = _pair(_mutable)
    for cls in (std, quick):
        b = cls()
        b.n = 3
        b.items.append(1)
        assert b == cls([1], 3) and cls().items is not cls().items
        assert cls.__hash__ is None
        with pytest.raises(TypeError):
            hash(b)


def test_inheritance_and_class_variables_as_the_standard_one():
    (sb, sc), (qb, qc) = _pair(_inherited)
    for base, child in ((sb, sc), (qb, qc)):
        c = child(name="n", colour="blue")
        assert (c.name, c.size, c.colour, c.describe()) == ("n", 1, "blue", "child:n")
        assert [f.name for f in dataclasses.fields(child)] == ["name", "size", "colour"]
        assert child.__slots__ == ("colour",)
        assert base(name="n") != child(name="n")
        assert dataclasses.replace(c, size=4).size == 4


def test_mutable_defaults_and_missing_annotations_are_refused_as_by_the_standard_one():
    for dc, fld in ((dataclasses.dataclass, dataclasses.field), (_dataclass.dataclass, _dataclass.field)):
        with pytest.raises(ValueError, match="mutable default"):
            @dc
            class Bad:
                items: list = []
        with pytest.raises(TypeError, match="no type annotation"):
            @dc
            class Bad2:
                items = fld(default=1)
        with pytest.raises(TypeError, match="non-default argument"):
            @dc
            class Bad3:
                a: int = 1
                b: int


def test_other_pythons_get_the_standard_decorator(monkeypatch):
    monkeypatch.setattr(_dataclass, "_QUICK", False)     # as on Python 3.10 or 3.12+
    std, quick = _pair(_frozen_kw)
    assert repr(std(x_m=2.0)) == repr(quick(x_m=2.0))
    assert quick.__init__.__qualname__.endswith("Point.__init__")


def test_the_compiled_init_replaces_the_quick_one_after_some_instances(init_kind):
    """Both ``__init__``s give the same instances, defaults, factories and argument errors as
    the standard decorator's (reference), before and after the switch."""
    std, quick = _pair(_frozen_positional)
    first = quick.__init__
    for i in range(_dataclass.UPGRADE_AFTER + 2):
        assert repr(quick(i)).split(".")[-1] == repr(std(i)).split(".")[-1]
        assert quick(i, "x", c=2.5) == quick(i, "x", 2.5)
        for args, kwargs in (((), {}), ((1, "b", 1.0, 2), {}), ((1,), {"zz": 1}), ((1,), {"a": 2})):
            errors = []
            for cls in (std, quick):
                with pytest.raises(TypeError) as exc:
                    cls(*args, **kwargs)
                errors.append(str(exc.value))
            assert errors[0] == errors[1]
    assert quick.__init__ is not first                                 # compiled by now
    assert str(inspect.signature(quick)) == str(inspect.signature(std))


def _slotted_family(dc, field):
    @dc(frozen=True, slots=True, kw_only=True)
    class Base:
        a: int
        b: tuple = field(default_factory=tuple)
        c: float = field(default=2.5, init=False)

    @dc(frozen=True, slots=True, kw_only=True)
    class Child(Base):
        d: str = "d"

        def __post_init__(self) -> None:
            object.__setattr__(self, "d", self.d.upper())
    return Base, Child


def test_frozen_slotted_fields_inherited_or_not_are_set_as_by_the_standard_one(init_kind):
    """The compiled ``__init__`` of a frozen slotted class sets each field through its slot
    (inherited slots included, a default factory, a field not in ``__init__``): the same
    instances as the standard decorator's, still frozen."""
    (std_base, std_child), (quick_base, quick_child) = _pair(_slotted_family)
    for _ in range(_dataclass.UPGRADE_AFTER + 2):
        for std, quick, kwargs in ((std_base, quick_base, {"a": 1}), (std_child, quick_child, {"a": 2, "d": "x"}),
                                   (std_child, quick_child, {"a": 3, "b": (1,)})):
            s, q = std(**kwargs), quick(**kwargs)
            assert repr(q).split(".")[-1] == repr(s).split(".")[-1]
            assert [getattr(q, f.name) for f in dataclasses.fields(q)] == [getattr(s, f.name) for f in dataclasses.fields(s)]
            with pytest.raises(dataclasses.FrozenInstanceError):
                q.a = 5
