"""The command ends without the interpreter's teardown when nothing is left to clean up
(briefer.cli.run), and loses nothing by it: the whole output arrives, files are complete, a
closed pipe is quiet, errors keep their exit codes; with an exit handler or another thread
running, the normal exit runs and the handler is called.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

BRIEFER = [sys.executable, "-m", "briefer"]


def _run(args: list[str], **kw) -> subprocess.CompletedProcess:
    return subprocess.run(BRIEFER + args, capture_output=True, text=True, encoding="utf-8", timeout=120, **kw)


def test_the_whole_text_brief_arrives():
    done = _run(["brief", "--demo"], env=dict(os.environ, COLUMNS="80"))
    assert done.returncode == 0 and done.stderr == ""
    lines = done.stdout.splitlines()
    assert lines[0].startswith("V2RL") and "CAUTIONS" in done.stdout
    assert lines[-1].startswith("╰") and lines[-1].endswith("╯")              # the box's last line


def test_the_whole_json_brief_and_card_arrive(tmp_path):
    done = _run(["brief", "--demo", "--json"])
    assert done.returncode == 0
    assert json.loads(done.stdout)["cautions"]
    card = tmp_path / "card.pdf"
    done = _run(["brief", "--demo", "--out", str(card)])
    assert done.returncode == 0
    data = card.read_bytes()
    assert data.startswith(b"%PDF") and data.rstrip().endswith(b"%%EOF")


def test_errors_keep_their_exit_codes_and_messages():
    done = _run(["brief", "--bank-deg", "75", "--demo"])
    assert done.returncode == 2 and "--bank-deg" in done.stderr and done.stdout == ""
    done = _run(["brief", "--airfield", "NOSUCH", "--profile", "demo-twin", "--approach", "x", "--runway", "09"])
    assert done.returncode == 2 and "NOSUCH" in done.stderr and "Traceback" not in done.stderr


def test_a_closed_pipe_is_quiet():
    shell = subprocess.run(f"'{sys.executable}' -m briefer brief --demo | head -1", shell=True, capture_output=True,
                           text=True, timeout=120)
    assert shell.stdout.startswith("V2RL") and "Error" not in shell.stderr and "Traceback" not in shell.stderr


@pytest.mark.parametrize("setup", [
    "import atexit; atexit.register(lambda: print('handler ran', flush=True))",
    "import threading, time; threading.Thread(target=lambda: (time.sleep(0.3), print('thread ran', flush=True))).start()",
])
def test_an_exit_handler_or_a_thread_gets_the_normal_exit(setup):
    code = f"{setup}\nimport sys; sys.argv = ['briefer', '--version']\nfrom briefer.cli import run; run()"
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert done.returncode == 0
    assert done.stdout.splitlines()[0].startswith("briefer ") and "ran" in done.stdout.splitlines()[-1]


def test_the_app_collects_its_garbage(monkeypatch):
    """cli.run turns the cyclic collector off for a command; the app, which runs for hours,
    turns it back on before it starts."""
    import gc

    import briefer.tui.app
    from briefer.cli import build_parser
    from briefer.commands import app as app_command

    seen = []

    class FakeApp:
        def __init__(self, *args, **kwargs) -> None:
            pass

        def run(self) -> None:
            seen.append(gc.isenabled())

    monkeypatch.setattr(briefer.tui.app, "BriefingApp", FakeApp)
    parser, _ = build_parser("app")
    gc.disable()
    try:
        assert app_command.run(parser.parse_args(["app", "--demo"])) == 0
    finally:
        gc.enable()
    assert seen == [True]


@pytest.mark.skipif(not os.path.exists("/dev/full"), reason="needs /dev/full (a device that is always full)")
@pytest.mark.parametrize("args", [["brief", "--demo"], ["brief", "--demo", "--json"], ["--version"]])
def test_output_that_cannot_be_written_is_one_message_and_exit_code_2(args):
    """Writing to a full disk ended in a Python traceback (exit 1): one line now names the
    problem, exit code 2 (bad input or a failed write never crashes)."""
    with open("/dev/full", "w") as full:
        done = subprocess.run(BRIEFER + args, stdout=full, stderr=subprocess.PIPE, text=True, timeout=120)
    assert done.returncode == 2, done.stderr
    assert "Traceback" not in done.stderr and "No space left on device" in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1
