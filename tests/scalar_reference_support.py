"""The plain-Python scalar reference of the wind envelope (benchmarks/envelope_scalar_reference.py:
loops and the math module), loaded once for the tests that compare the vectorised code with it
(no tests here)."""

from __future__ import annotations

import importlib.util
from pathlib import Path


def _load():
    path = Path(__file__).resolve().parent.parent / "benchmarks" / "envelope_scalar_reference.py"
    spec = importlib.util.spec_from_file_location("envelope_scalar_reference", path)
    mod = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    spec.loader.exec_module(mod)
    return mod


REF = _load()
