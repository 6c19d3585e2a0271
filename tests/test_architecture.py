"""Layering and house rules that a grep can check (docs/ARCHITECTURE.md; DEVELOPERS.md, Conventions)."""

from __future__ import annotations

import os
import re
import subprocess
import sys
from pathlib import Path

PKG = Path(__file__).resolve().parent.parent / "briefer"

UI_OR_IO = re.compile(r"^\s*(import|from)\s+(textual|rich|fpdf|yaml|briefer\.(tui|render|io|commands|cli))\b", re.M)


def test_core_imports_no_ui_or_io():
    """The core is pure computation: no UI, PDF, YAML or renderer imports (docs/ARCHITECTURE.md)."""
    offenders = [str(p.relative_to(PKG)) for p in (PKG / "core").rglob("*.py") if UI_OR_IO.search(p.read_text())]
    assert offenders == []


def test_no_bare_conversion_literals_outside_units():
    """Conversion factors live in units.py only (DEVELOPERS.md, Conventions)."""
    literals = ("0.3048", "1852", "1609.344", "6076", "33.86", "3386", "273.15", "0.514444")
    offenders = []
    for p in PKG.rglob("*.py"):
        if p.name == "units.py":
            continue
        for n, line in enumerate(p.read_text().splitlines(), 1):
            code = line.split("#", 1)[0]
            if any(lit in code for lit in literals):
                offenders.append(f"{p.relative_to(PKG)}:{n}: {line.strip()}")
    assert offenders == []


def test_version_does_not_import_textual_or_fpdf():
    """`briefer --version` and the look-ups start fast: no Textual, no PDF library (issue: start-up)."""
    code = ("import sys; from briefer.cli import main; main(['--version']); "
            "print('textual' in sys.modules, 'fpdf' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip().splitlines()[-1] == "False False"


def test_help_does_not_import_textual_or_fpdf():
    code = ("import sys\nfrom briefer.cli import build_parser\nbuild_parser()\n"
            "print('textual' in sys.modules, 'fpdf' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip() == "False False"


def _modules_after(code: str) -> set[str]:
    out = subprocess.run([sys.executable, "-c", code + "\nimport sys; print(' '.join(sorted(sys.modules)))"],
                         capture_output=True, text=True, check=True).stdout
    return set(out.strip().splitlines()[-1].split())


def test_model_imports_no_numpy():
    """Loading a file format (briefer.model) and the unit constants needs no numpy: the
    vocabulary and units are plain Python (issue: one source of truth, start-up)."""
    mods = _modules_after("import briefer.model, briefer.units, briefer.vocabulary")
    assert "numpy" not in mods


def test_the_brief_and_the_envelope_import_no_numpy_typing():
    """numpy.typing is for the type checker only: its import was about 12 M instructions of a
    `briefer brief` process (issue: start-up). Every module of the brief and the envelope,
    missed approach included, names its array types without importing it at run time."""
    mods = _modules_after("import briefer.brief, briefer.core.manoeuvre.missed, briefer.render.views")
    assert "numpy" in mods and "numpy.typing" not in mods


def test_the_app_draws_its_first_frame_without_the_model():
    """The app's modules (what `briefer app` imports to draw its first frame) import no
    briefer.model: the model, about 30 M instructions of start-up with its dataclasses, loads with
    the catalog after the first frame (the briefing fields read the model's ranges when a value
    is first read)."""
    mods = _modules_after("import briefer.commands.app, briefer.tui.app")
    assert "briefer.tui.briefing_screen" in mods
    assert "briefer.model" not in mods and "numpy" not in mods


def test_the_brief_command_imports_no_pathlib(tmp_path):
    """`briefer brief --demo` finds its built-in files and the (absent) config file with os.path:
    importing pathlib was part of the command's start-up beyond numpy, yaml and rich (issue:
    speed, start-up). A path object is made only where one is returned."""
    code = """
import contextlib, io, sys
from briefer.cli import main
with contextlib.redirect_stdout(io.StringIO()):
    try:
        main(["brief", "--demo"])
    except SystemExit:
        pass
print("pathlib" in sys.modules)
"""
    env = {**os.environ, "XDG_CONFIG_HOME": str(tmp_path), "HOME": str(tmp_path)}
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, env=env).stdout
    assert out.strip().splitlines()[-1] == "False"


def test_every_help_imports_no_numpy():
    """`briefer --help` and `briefer <command> --help` print without loading numpy (one process,
    commands in turn: the first one that loads numpy is named)."""
    code = """
import contextlib, io, sys
from briefer.cli import build_parser, main
parser, commands = build_parser()
for argv in [["--help"]] + [[name, "--help"] for name in sorted(commands)]:
    with contextlib.redirect_stdout(io.StringIO()):
        try:
            main(argv)
        except SystemExit:
            pass
    if "numpy" in sys.modules:
        print("numpy after", argv)
        break
else:
    print("clean", len(commands))
"""
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip().splitlines()[-1].startswith("clean"), out


def test_the_repository_stands_alone():
    """Code, tests and benchmarks cite published documents or the project's own docs/, never a
    document outside the repository; every section of docs/REFERENCES.md they cite exists."""
    root = PKG.parent
    outside = re.compile(r"\.\./shared|TECH-NOTE[S]|STYLE\.md|CHART-ENTRY|(?<!docs/)(REFERENCES|ARCHITECTURE)\.md")
    cited = re.compile(r"docs/REFERENCES\.md,? (?:sections? |§)?(\d+[a-z]?)")
    headings = set(re.findall(r"^#{2,3} (\d+[a-z]?)\.", (root / "docs" / "REFERENCES.md").read_text(), re.M))
    offenders, missing = [], []
    for folder in ("briefer", "tests", "benchmarks"):
        for p in (root / folder).rglob("*"):
            if p.suffix not in (".py", ".yaml", ".md") or not p.is_file() or p.name == "test_architecture.py":
                continue
            text = p.read_text(errors="replace")
            offenders += [f"{p.relative_to(root)}: {m.group(0)}" for m in outside.finditer(text)]
            missing += [f"{p.relative_to(root)}: {m.group(1)}" for m in cited.finditer(text)
                        if m.group(1) not in headings]
    assert offenders == []
    assert missing == []


def test_instructor_feature_has_no_import_cycle_and_its_pdf_page_reads_the_deck():
    """briefer/instructor/ never imports its PDF renderer (render/deck_pdf.py imports the deck, one
    way), and the renderer does not call the core's geometry: it draws what the deck built."""
    instructor = PKG / "instructor"
    for p in instructor.glob("*.py"):
        assert not re.search(r"^\s*(from|import)\s+briefer\.render\.deck_pdf\b", p.read_text(), re.M), p.name
    renderer = (PKG / "render" / "deck_pdf.py").read_text()
    assert not re.search(r"^\s*(from|import)\s+briefer\.core\b", renderer, re.M)


def test_ci_tests_the_installed_package():
    """Under CI (.ci/run sets CI=true) the suite imports briefer from the installed wheel, not
    from the checkout: `.venv/bin/pytest` from the repository root does not put the checkout on
    sys.path (tests/ has no __init__.py), while `python -m pytest` would."""
    import os

    import briefer

    if os.environ.get("CI", "").lower() != "true":
        import pytest

        pytest.skip("only under CI")
    assert "site-packages" in Path(briefer.__file__).parts, briefer.__file__


def test_ci_runs_exactly_the_readme_test_command():
    root = PKG.parent
    readme = (root / "README.md").read_text()
    ci = (root / ".ci" / "run").read_text()
    start = "python3 -m venv .venv && .venv/bin/pip install '.[test]' && .venv/bin/pytest"
    readme_lines = [line for line in readme.splitlines() if line.startswith(start)]
    ci_lines = [line for line in ci.splitlines() if line.startswith(start)]
    assert len(readme_lines) == 1 and ci_lines == readme_lines, (readme_lines, ci_lines)
    assert not (root / "tests" / "__init__.py").exists()
