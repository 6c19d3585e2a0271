"""Hostile files and faults: device nodes, FIFOs, huge and malformed files, kills mid-write.

Every case must end in one clear line (exit 2), never a traceback, a hang or lost data. FIFO and
device cases are skipped only where the platform cannot make them (said in the skip reason).
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest
from cli_helpers import run_error
from hostile_corpus import CASES, _scenario as scenario_with, can_make_device, can_make_fifo, make_device, make_fifo

from briefer.errors import BriefingError, DataFileError
from briefer.io import atomic
from briefer.io.atomic import FileWriteError, write_bytes_atomic

ROOT = Path(__file__).resolve().parents[1]
needs_fifo = pytest.mark.skipif(not can_make_fifo(), reason="this platform cannot make a FIFO (os.mkfifo)")
needs_device = pytest.mark.skipif(not can_make_device(),
                                  reason="making a device node (os.mknod) needs root on this platform")


def _briefer(*args: str, env: dict[str, str] | None = None, timeout: float = 60,
             cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    """Run `python -m briefer ARGS` in a child (a hang fails the test by the timeout)."""
    full_env = {**os.environ, "PYTHONPATH": str(ROOT), **(env or {})}
    return subprocess.run([sys.executable, "-m", "briefer", *args], capture_output=True, text=True,
                          timeout=timeout, env=full_env, cwd=cwd)


def _one_line_error(proc: subprocess.CompletedProcess[str]) -> str:
    assert proc.returncode == 2, (proc.returncode, proc.stdout, proc.stderr)
    assert "Traceback" not in proc.stderr
    lines = (proc.stdout + proc.stderr).strip().splitlines()   # `check` reports on stdout
    assert len(lines) == 1, (proc.stdout, proc.stderr)
    return lines[0]


# --- 17.1: --force replaces only regular files ------------------------------------------------------
@needs_device
def test_force_refuses_a_device_node(tmp_path: Path) -> None:
    dev = make_device(tmp_path / "full")
    with pytest.raises(FileWriteError, match="it is a device; only a regular file is replaced"):
        write_bytes_atomic(dev, b"x", overwrite=True)
    assert dev.is_char_device()


@needs_fifo
def test_force_refuses_a_fifo(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    fifo = make_fifo(tmp_path / "card.txt")
    line = run_error(capsys, ["brief", "--demo", "--out", str(fifo), "--format", "txt", "--force"])
    assert line.endswith("card.txt: it is a FIFO (named pipe); only a regular file is replaced")
    assert fifo.is_fifo()


def test_force_refuses_a_directory_and_a_link_to_one(tmp_path: Path) -> None:
    (tmp_path / "d").mkdir()
    (tmp_path / "link").symlink_to(tmp_path / "d")
    for p in (tmp_path / "d", tmp_path / "link"):
        with pytest.raises(FileWriteError, match="it is a directory"):
            write_bytes_atomic(p, b"x", overwrite=True)
    assert (tmp_path / "link").is_symlink() and (tmp_path / "d").is_dir()


def test_force_through_a_symlink_replaces_the_target_and_keeps_the_link(tmp_path: Path) -> None:
    (tmp_path / "real.txt").write_text("old")
    (tmp_path / "card.txt").symlink_to("real.txt")
    write_bytes_atomic(tmp_path / "card.txt", b"new", overwrite=True)
    assert (tmp_path / "card.txt").is_symlink()
    assert (tmp_path / "real.txt").read_text() == "new"


# --- 17.3 and 17.4: FIFOs and endless files as input -------------------------------------------------
@needs_fifo
@pytest.mark.parametrize("args", [
    ["check", "{fifo}"],
    ["brief", "--demo", "--profile", "{fifo}"],
    ["brief", "--demo", "--airfield", "{fifo}"],
    ["scenario", "show", "{scenario}"],
])
def test_a_fifo_as_input_is_refused_at_once(tmp_path: Path, args: list[str]) -> None:
    fifo = make_fifo(tmp_path / "p.yaml")
    scenario = tmp_path / "s.yaml"
    scenario.write_bytes(scenario_with(b"airfield: p.yaml"))
    argv = [a.format(fifo=fifo, scenario=scenario) for a in args]
    line = _one_line_error(_briefer(*argv, timeout=60))
    assert "is a FIFO (named pipe)" in line


@needs_fifo
def test_a_fifo_as_the_config_file_is_refused(tmp_path: Path) -> None:
    (tmp_path / "briefer").mkdir()
    make_fifo(tmp_path / "briefer" / "config.yaml")
    line = _one_line_error(_briefer("brief", "--profile", "demo-bizjet", "--airfield", "V2RL", "--approach",
                                    "RNAV (GPS) RWY 09", "--runway", "27",
                                    env={"XDG_CONFIG_HOME": str(tmp_path)}))
    assert "config.yaml: is a FIFO (named pipe), expected a YAML config file" in line


@needs_fifo
def test_a_fifo_as_saved_inputs_is_refused(tmp_path: Path) -> None:
    fifo = make_fifo(tmp_path / "in.yaml")
    code = textwrap.dedent(f"""
        from briefer.tui.inputs_file import load_inputs
        from briefer.errors import DataFileError
        try:
            load_inputs({str(fifo)!r})
        except DataFileError as exc:
            print(exc)
    """)
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60,
                          env={**os.environ, "PYTHONPATH": str(ROOT)})
    assert "is a FIFO (named pipe)" in proc.stdout, proc.stderr


def test_dev_zero_as_saved_inputs_is_refused_without_reading() -> None:
    if not os.path.exists("/dev/zero"):
        pytest.skip("this platform has no /dev/zero")
    code = textwrap.dedent("""
        import resource
        resource.setrlimit(resource.RLIMIT_AS, (2_000_000_000, 2_000_000_000))
        from briefer.tui.inputs_file import load_inputs
        from briefer.errors import DataFileError
        try:
            load_inputs('/dev/zero')
        except DataFileError as exc:
            print(exc)
    """)
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60,
                          env={**os.environ, "PYTHONPATH": str(ROOT)})
    assert proc.stdout.strip() == "/dev/zero: is a device, expected a saved-inputs YAML file", proc.stderr


def test_a_file_over_the_size_limit_is_refused_before_reading(tmp_path: Path,
                                                                monkeypatch: pytest.MonkeyPatch) -> None:
    from briefer.io.safefile import MAX_DATA_BYTES, read_regular_file

    big = tmp_path / "big.yaml"
    with open(big, "wb") as fh:
        fh.truncate(MAX_DATA_BYTES * 1000)         # sparse: 5 GB on paper
    from briefer.io import safefile

    def no_read(*args: object) -> bytes:
        raise AssertionError("read a file over the limit")

    monkeypatch.setattr(safefile.os, "read", no_read)
    with pytest.raises(DataFileError, match="larger than the limit of 5,000,000 bytes"):
        read_regular_file(big)
    from briefer.tui.inputs_file import load_inputs

    with pytest.raises(DataFileError, match="larger than the limit of 5,000,000 bytes"):
        load_inputs(big)


# --- 17.6: malformed YAML is one line naming the file and line ---------------------------------------
@pytest.mark.parametrize("name", sorted(CASES))
def test_every_corpus_file_is_one_clear_error(tmp_path: Path, name: str) -> None:
    from briefer.io.yamlload import load_any
    from briefer.instructor.scenario_format import load_scenario
    from briefer.tui.inputs_file import load_inputs

    path = tmp_path / name
    path.write_bytes(CASES[name])
    for loader in (load_any, load_inputs, load_scenario):
        with pytest.raises(BriefingError) as info:
            loader(path)
        text = str(info.value)
        assert "\n" not in text and "\x1b" not in text and "\x07" not in text
        assert len(text) < 600, text
        text.encode("ascii", "backslashreplace").decode("ascii")
        text.encode("utf-8")                       # no lone surrogate in a message


@pytest.mark.parametrize("name, expected", [
    ("bel-in-plain-text.yaml", ":3: not valid YAML: unacceptable character #x0007"),
    ("esc-escaped-in-quotes.yaml", ":3: name: a control character (\\x1b) in the text 'a\\x1b[31mred\\x07'"),
    ("lone-surrogate.yaml", ":3: name: a control character (\\ud800) in the text '\\ud800x'"),
    ("nesting-500.yaml", ":2: "),
    ("int-5000-digits.yaml", ":3: vref_kt: a number of 5000 characters; expected at most 100"),
    ("bool-tag-abc.yaml", ":3: name: cannot read the value 'abc' as bool"),
])
def test_yaml_tracebacks_become_one_line(tmp_path: Path, name: str, expected: str) -> None:
    from briefer.io.yamlload import load_any

    path = tmp_path / name
    path.write_bytes(CASES[name])
    with pytest.raises(DataFileError) as info:
        load_any(path)
    assert str(info.value).startswith(str(path) + expected), str(info.value)


def test_a_lone_surrogate_never_reaches_a_written_card(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    prof = tmp_path / "prof.yaml"
    good = (ROOT / "profiles" / "demo-bizjet.yaml").read_text()
    prof.write_text(good.replace("name: demo-bizjet", 'name: "\\uD800x"', 1))
    out = tmp_path / "card.txt"
    line = run_error(capsys, ["brief", "--demo", "--profile", str(prof), "--out", str(out)])
    assert "control character (\\ud800)" in line
    assert not out.exists()


# --- 17.7: long names, unsearchable folders -----------------------------------------------------------
@pytest.mark.parametrize("option", ["--profile", "--airfield", "--profile-dir", "--airfield-dir", "--out"])
def test_a_300_character_name_is_one_line(option: str, capsys: pytest.CaptureFixture[str]) -> None:
    long = "a" * 300
    argv = ["brief", "--demo", option, long]
    line = run_error(capsys, argv)
    assert len(line) < 400 and "Traceback" not in line


def test_out_under_an_unsearchable_folder(tmp_path: Path, capsys: pytest.CaptureFixture[str],
                                          monkeypatch: pytest.MonkeyPatch) -> None:
    """The folder's search permission refused (simulated, since root may search any folder)."""
    folder = tmp_path / "locked"
    folder.mkdir()
    real_stat = os.stat

    def stat(path, *args, **kwargs):  # type: ignore[no-untyped-def]
        if str(path).startswith(str(folder) + os.sep):
            raise PermissionError(13, "Permission denied", str(path))
        return real_stat(path, *args, **kwargs)

    monkeypatch.setattr(atomic.os, "stat", stat)
    line = run_error(capsys, ["brief", "--demo", "--out", str(folder / "card.txt")])
    assert line.endswith("card.txt: permission denied")


@pytest.mark.skipif(not hasattr(os, "geteuid") or os.geteuid() == 0,
                    reason="root may search any folder: the permission bits cannot refuse it")
def test_out_under_a_folder_without_search_permission(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    folder = tmp_path / "locked"
    folder.mkdir()
    folder.chmod(0o600)
    try:
        line = run_error(capsys, ["brief", "--demo", "--out", str(folder / "card.txt")])
    finally:
        folder.chmod(0o700)
    assert "permission denied" in line


# --- 17.16: an empty config file is named as the config file -----------------------------------------
@pytest.mark.parametrize("text", ["", "# only a comment\n"])
def test_an_empty_config_file_says_so(tmp_path: Path, monkeypatch: pytest.MonkeyPatch,
                                      capsys: pytest.CaptureFixture[str], text: str) -> None:
    (tmp_path / "briefer").mkdir()
    (tmp_path / "briefer" / "config.yaml").write_text(text)
    monkeypatch.setenv("XDG_CONFIG_HOME", str(tmp_path))
    line = run_error(capsys, ["list"])
    assert "config.yaml: the config file is empty; expected a mapping with profile_dirs:" in line
    assert "aircraft-profile" not in line


# --- 17.17: no temporary file left by a killed write ----------------------------------------------------
def test_stale_temporaries_of_ours_are_removed_on_the_next_write(tmp_path: Path) -> None:
    old = tmp_path / ".card.pdf.0123456789ab.tmp"
    fresh = tmp_path / ".card.pdf.ba9876543210.tmp"
    other = tmp_path / ".card.pdf.notours.tmp"
    for p in (old, fresh, other):
        p.write_bytes(b"partial")
    past = time.time() - 120
    os.utime(old, (past, past))
    os.utime(other, (past, past))
    write_bytes_atomic(tmp_path / "other.txt", b"x")
    assert not old.exists()
    assert fresh.exists() and other.exists()


@pytest.mark.skipif(not hasattr(signal, "SIGHUP"), reason="this platform has no SIGHUP")
@pytest.mark.parametrize("signame", ["SIGTERM", "SIGHUP"])
def test_a_signal_during_a_write_removes_the_temporary_file(tmp_path: Path, signame: str) -> None:
    code = textwrap.dedent(f"""
        import os, signal
        from briefer.io import atomic
        real = os.fsync
        def fsync(fd):
            os.kill(os.getpid(), signal.{signame})
            real(fd)
        atomic.os.fsync = fsync
        atomic.write_bytes_atomic({str(tmp_path / 'card.txt')!r}, b'x' * 100000)
    """)
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60,
                          env={**os.environ, "PYTHONPATH": str(ROOT)})
    assert proc.returncode == -getattr(signal, signame), proc.stderr
    assert os.listdir(tmp_path) == []
