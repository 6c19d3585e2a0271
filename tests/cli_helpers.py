"""Helpers shared by the CLI tests (imported as a plain module: pytest puts tests/ on sys.path)."""

from __future__ import annotations

from briefer.cli import main


def run_error(capsys, argv: list[str]) -> str:
    """Run a failing command; return its single stderr line (exit 2, nothing on stdout, no traceback)."""
    try:
        code = main(argv)
    except SystemExit as exc:      # argparse usage errors exit through parser.exit(2, ...)
        code = exc.code
    out, err = capsys.readouterr()
    assert code == 2
    assert out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err
    return lines[0]
