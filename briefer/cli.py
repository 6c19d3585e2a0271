"""The argparse front door.

Sub-commands live one per module in `briefer.commands` and are found at start-up (no central
list to edit). A command module defines:

    NAME: str                 the sub-command word
    HELP: str                 one line for `briefer --help`
    ORDER: int (optional)     position in the help listing
    add_arguments(parser)     argparse set-up; must not import heavy modules
    run(args) -> int          the work; imports what it needs (numpy, textual, fpdf) lazily

Every `BriefingError` becomes one line on stderr and exit code 2; anything else is a bug and
shows a traceback.
"""

from __future__ import annotations

import sys

from briefer import __version__
from briefer.errors import BriefingError

TYPE_CHECKING = False        # typing.TYPE_CHECKING without importing typing (start-up)
if TYPE_CHECKING:
    import argparse
    from types import ModuleType

# argparse and the command modules are imported when a parser is built, not at import: the
# console script imports this module, and `briefer --version` needs neither.


def _terminal_columns() -> int:
    """The terminal's width as ``shutil.get_terminal_size().columns`` says it (COLUMNS, else the
    terminal of stdout, else 80), without importing shutil and the archive modules it brings."""
    import os

    try:
        columns = int(os.environ["COLUMNS"])
    except (KeyError, ValueError):
        columns = 0
    if columns <= 0:
        try:
            columns = os.get_terminal_size(sys.__stdout__.fileno()).columns or 80
        except (AttributeError, ValueError, OSError):
            columns = 80
    return columns


def _parser_class() -> type:
    import argparse

    def help_formatter(prog: str) -> argparse.HelpFormatter:
        # argparse's own width (the terminal's less 2); argparse makes a formatter for every
        # option it adds, and the default one imports shutil to ask the width
        return argparse.HelpFormatter(prog, width=_terminal_columns() - 2)

    class _Parser(argparse.ArgumentParser):
        """ArgumentParser whose usage errors are one line and exit code 2."""

        def __init__(self, *args, **kwargs) -> None:
            kwargs.setdefault("formatter_class", help_formatter)
            super().__init__(*args, **kwargs)

        def error(self, message: str) -> None:  # type: ignore[override]
            self.exit(2, f"{self.prog}: error: {message} (see '{self.prog} --help')\n")

    return _Parser


def _command_modules(word: str | None = None) -> list[ModuleType]:
    """Every command module, in help order; with ``word``, only the module of that command
    when there is one (``briefer brief ...`` imports and sets up one command, not all of them)."""
    import importlib
    import os

    import briefer.commands as pkg

    names = sorted({f[:-3] for d in pkg.__path__ for f in os.listdir(d)
                    if f.endswith(".py") and not f.startswith("_")})
    own = None if word is None else word.replace("-", "_")
    if own in names:
        mod = importlib.import_module(f"briefer.commands.{own}")
        if getattr(mod, "NAME", None) == word and hasattr(mod, "run"):
            return [mod]
    mods = []
    for name in names:
        mod = importlib.import_module(f"briefer.commands.{name}")
        if hasattr(mod, "NAME") and hasattr(mod, "run"):
            mods.append(mod)
    mods.sort(key=lambda m: (getattr(m, "ORDER", 100), m.NAME))
    return mods


def _state_ranges(parser: argparse.ArgumentParser) -> None:
    """Every range-checked option's help ends with its range (one place, so none is missed)."""
    import argparse

    from briefer.commands._common import ranged

    for action in parser._actions:
        if isinstance(action.type, ranged):
            rng = action.type.help_text("").strip()
            if not action.help:
                action.help = rng.strip("()")
            elif action.type.describe() not in action.help:
                action.help = f"{action.help} {rng}"
        choices = getattr(action, "choices", None)
        if isinstance(choices, dict):          # sub-parsers (`scenario new|show|deck`)
            for sub in choices.values():
                if isinstance(sub, argparse.ArgumentParser):
                    _state_ranges(sub)


def build_parser(only: str | None = None) -> tuple[argparse.ArgumentParser, dict[str, ModuleType]]:
    """The parser with every sub-command; with ``only``, that command alone (what
    ``briefer COMMAND ...`` needs, at a fraction of the start-up: argparse checks every option as
    it is added, and each command module is imported to be listed). A word that names no command
    gets every command listed, so the error names the choices."""
    _Parser = _parser_class()
    parser = _Parser(
        prog="briefer",
        description="Circling-approach briefing. Not for navigation: the published procedure, "
        "the aircraft flight manual, local rules and licensed practice govern.",
    )
    parser.add_argument("--version", action="version", version=f"briefer {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    commands: dict[str, ModuleType] = {}
    for mod in _command_modules(only):
        p = sub.add_parser(mod.NAME, help=mod.HELP, description=getattr(mod, "DESCRIPTION", mod.HELP))
        if only is not None and mod.NAME != only:
            continue
        if hasattr(mod, "add_arguments"):
            mod.add_arguments(p)
        _state_ranges(p)
        commands[mod.NAME] = mod
    return parser, commands


def _as_typed(message: str, argv: list[str]) -> str:
    """A message that starts with a field name ('altitude_ft = 99999 ft is outside ...') names
    the option the user typed instead ('--altitude-ft = 99999 ft ...'), when there is one."""
    head = message.split(" ", 1)[0].rstrip(":")
    option = "--" + head.replace("_", "-")
    if "_" in head and head.isidentifier() and any(a == option or a.startswith(option + "=") for a in argv):
        return message.replace(head, option)
    return message


_ASCII_FALLBACK = {"\u00b0": " deg", "\u2013": "-", "\u2014": "-", "\u2212": "-", "\u00d7": "x",
                   "\u00b1": "+/-", "\u2248": "~", "\u2192": "->", "\u2190": "<-", "\u2191": "^",
                   "\u2193": "v", "\u2026": "...", "\u2265": ">=", "\u2264": "<=", "\u00b2": "2",
                   "\u2018": "'", "\u2019": "'", "\u201c": '"', "\u201d": '"', "\u00a0": " ", "\u2022": "*",
                   "\u00b7": "."}


def _ascii_fallback(exc: UnicodeError) -> tuple[str, int]:
    """Codec error handler: a character the terminal cannot show becomes plain ASCII
    (the degree sign ' deg', dashes '-', others '?')."""
    if not isinstance(exc, UnicodeEncodeError):
        raise exc
    text = exc.object[exc.start:exc.end]
    return "".join(_ASCII_FALLBACK.get(ch, "?") for ch in text), exc.end


def _degrade_output_encoding() -> None:
    """On a stdout/stderr that cannot encode the degree sign (LC_ALL=C, PYTHONIOENCODING=ascii)
    print plain ASCII instead of failing with UnicodeEncodeError."""
    import codecs

    codecs.register_error("briefer-ascii", _ascii_fallback)
    for stream in (sys.stdout, sys.stderr):
        encoding = getattr(stream, "encoding", None) or "ascii"
        try:
            "\u00b0\u2014".encode(encoding)
        except (UnicodeEncodeError, LookupError):
            if hasattr(stream, "reconfigure"):
                try:
                    stream.reconfigure(errors="briefer-ascii")
                except (ValueError, OSError):  # pragma: no cover - a stream that cannot change
                    pass


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    _degrade_output_encoding()
    # `--version` answers before any command module is imported (fast start).
    if argv == ["--version"]:
        print(f"briefer {__version__}")
        return 0
    # the command word is the first argument (the main parser's own options are --version, -h)
    word = argv[0] if argv else "app"
    parser, commands = build_parser(only=None if word.startswith("-") else word)
    if not argv and "app" in commands:
        argv = ["app"]
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return 0
    try:
        return int(commands[args.command].run(args) or 0)
    except BriefingError as exc:
        from briefer.safetext import escape_text

        print(f"briefer {args.command}: error: {escape_text(_as_typed(str(exc), argv))}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        return 0
    except OSError as exc:       # the output cannot be written (a full disk, a closed terminal)
        _cannot_write(args.command, exc)
        return 2


def _cannot_write(command: str, exc: OSError) -> None:
    """Say on stderr that the output could not be written (no traceback)."""
    where = f" {exc.filename}" if getattr(exc, "filename", None) else " the output"
    try:
        print(f"briefer {command}: error: cannot write{where}: {exc.strerror or exc}", file=sys.stderr, flush=True)
    except OSError:  # pragma: no cover - stderr itself is gone
        pass


def _nothing_left_to_clean_up() -> bool:
    """No other thread and no exit handler: what the interpreter's teardown would do is only
    freeing memory the process gives back anyway."""
    import atexit

    threading = sys.modules.get("threading")
    if threading is not None and (threading.active_count() > 1 or getattr(threading, "_threading_atexits", None)):
        return False
    count = getattr(atexit, "_ncallbacks", None)
    return count is not None and count() == 0


def run() -> None:
    """The ``briefer`` command (and ``python -m briefer``): `main`, then the process ends.

    When the command is done and nothing is left to clean up (`_nothing_left_to_clean_up`), the
    output is flushed and the process ends at once, without the interpreter's teardown (collecting
    and freeing every object, unloading every module: a tenth of a brief's run). Otherwise, or
    when flushing fails, the normal exit runs (which reports a failed flush).

    The cyclic garbage collector is off while a command runs (reference counting still frees
    all but cycles): a command is short, and collecting while hundreds of modules and classes
    load took a twentieth of a brief's run. The app, which runs for hours, turns it back on.
    """
    import gc

    gc.disable()
    try:
        code = main()
    except OSError as exc:   # --version or the help could not be written (a command says so itself)
        if isinstance(exc, BrokenPipeError):
            code = 0
        else:
            _cannot_write(sys.argv[1] if len(sys.argv) > 1 else "app", exc)
            code = 2
    if _nothing_left_to_clean_up():
        try:
            for stream in (sys.stdout, sys.stderr):
                if stream is not None:
                    stream.flush()
        except OSError as exc:   # the output's last part cannot be written (a full disk)
            if code == 0:
                _cannot_write(sys.argv[1] if len(sys.argv) > 1 else "app", exc)
            import os

            os._exit(2)
        except Exception:  # noqa: BLE001 - the normal exit says what went wrong
            sys.exit(code)
        import os

        os._exit(code)
    sys.exit(code)


if __name__ == "__main__":
    run()
