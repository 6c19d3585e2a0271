"""The core's one range check: a value (or every element of an array) within its validity range,
else a `DomainError` that quotes the value and the range. Core functions raise it for inputs
outside their models' validity, never a silent NaN."""

from __future__ import annotations

import math

import numpy as np

from briefer.core._types import Numeric
from briefer.errors import DomainError

__all__ = ["SCALAR_TYPES", "checked", "checked_float"]

SCALAR_TYPES = frozenset((float, int, np.float64))   # what the scalar paths of the core take as one number


def checked(name: str, value: Numeric, lo: float, hi: float, unit: str, *,
             lo_open: bool = False, hi_open: bool = False) -> np.ndarray:
    """Float array of `value`; DomainError naming the first element outside [lo, hi] (or NaN/inf).

    The one range check of the core (atmosphere, turn, wind, coldtemp, criteria, sight picture,
    manoeuvre inputs); `lo_open` and `hi_open` exclude the ends; `hi` may be infinite. The
    message quotes the value and the valid range, e.g. "tas_kt = 0 kt is outside the valid range
    0 < tas_kt <= 1000 kt".
    """
    if type(value) is float or type(value) is int or type(value) is np.float64:  # scalar fast path, same rule as below
        v = float(value)
        if math.isfinite(v) and (v > lo if lo_open else v >= lo) and (v < hi if hi_open else v <= hi):
            return np.asarray(v)
    arr = np.asarray(value, dtype=float)
    with np.errstate(invalid="ignore"):
        below = arr <= lo if lo_open else arr < lo
        above = arr >= hi if hi_open else arr > hi
        bad = ~np.isfinite(arr) | below | above
    if bad.any():
        first = float(arr[bad].flat[0]) if arr.ndim else float(arr)
        lo_op = "<" if lo_open else "<="
        hi_op = "<" if hi_open else "<="
        raise DomainError(f"{name} = {first:g} {unit} is outside the valid range "
                          f"{lo:g} {lo_op} {name} {hi_op} {hi:g} {unit}".replace("  ", " ").rstrip())
    return arr


def checked_float(name: str, value: float, lo: float, hi: float, unit: str, *,
                  lo_open: bool = False, hi_open: bool = False) -> float:
    """`checked` for one number (a float, an int or a numpy float64): the same rule and error,
    the value as a Python float (the core's scalar paths compute on it with `math`)."""
    v = float(value)
    if math.isfinite(v) and (v > lo if lo_open else v >= lo) and (v < hi if hi_open else v <= hi):
        return v
    checked(name, value, lo, hi, unit, lo_open=lo_open, hi_open=hi_open)   # raises the same DomainError
    return v
