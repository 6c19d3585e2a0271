"""No function in briefer/ over 120 lines (docs/ARCHITECTURE.md: small functions whose names say
what each step does). Counted from the `def` line to the last line of the body, docstring
included, with an AST walk (nested functions counted on their own as well as in their parent)."""

from __future__ import annotations

import ast
from pathlib import Path

import briefer

MAX_LINES = 120
PACKAGE = Path(briefer.__file__).parent

EXCEPTIONS: dict[str, str] = {
    # "module/path.py:function": "why it may stay long (and who is splitting it)",
}
"""Functions allowed over the limit for now, each with its reason. Empty: none is."""


def long_functions(root: Path = PACKAGE, limit: int = MAX_LINES) -> dict[str, int]:
    """'path:name' -> lines, for every function of the package longer than `limit` lines."""
    out = {}
    for path in sorted(root.rglob("*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
                lines = node.end_lineno - node.lineno + 1
                if lines > limit:
                    out[f"{path.relative_to(root).as_posix()}:{node.name}"] = lines
    return out


def test_no_function_over_120_lines():
    too_long = {k: v for k, v in long_functions().items() if k not in EXCEPTIONS}
    assert not too_long, f"functions over {MAX_LINES} lines (split them into named steps): {too_long}"


def test_every_exception_is_still_needed():
    """An exception whose function was split (or renamed) is removed from the list."""
    assert not set(EXCEPTIONS) - set(long_functions())


def test_the_walk_finds_a_long_function(tmp_path):
    """The check itself: a 121-line function is found, a 120-line one is not."""
    body = "\n".join(f"    x{i} = {i}" for i in range(119))
    (tmp_path / "m.py").write_text(f"def long():\n{body}\n    return 0\n\n\ndef short():\n{body}\n")
    assert long_functions(tmp_path) == {"m.py:long": 121}
