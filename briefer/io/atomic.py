"""Write files atomically: a reader sees the old file or the complete new one, never a part.

The data go to a temporary file in the target's directory, are flushed and fsynced, and the
temporary file is then moved into place (`os.replace`, or a hard link when overwriting is not
allowed, so that a file appearing meanwhile is not overwritten either). On any failure the
temporary file is removed, also when the process is ended by SIGTERM or SIGHUP during the write;
one left by a harder kill is removed by the next write into that folder once older than a minute.
The new file gets the usual permissions (0666 less the umask).

Only a regular file is ever replaced: a symbolic link to a regular file has its target replaced (the
link stays), while a directory, FIFO, device node or socket is refused (``--force`` once turned
``/dev/full`` into a regular file).
"""

from __future__ import annotations

import os
import re
import secrets
import signal
import stat
import threading
import time
from os import PathLike
from pathlib import Path
from typing import Any

from briefer.errors import BriefingError
from briefer.io import safefile
from briefer.safetext import escape_text


class FileWriteError(BriefingError):
    """A file could not be written (exists and may not be overwritten, no directory, no permission)."""

    def __init__(self, path: str | PathLike[str], reason: str) -> None:
        self.path = str(path)
        self.reason = reason
        super().__init__(f"cannot write {escape_text(self.path)}: {reason}")

    def __str__(self) -> str:
        return f"cannot write {escape_text(self.path)}: {self.reason}"


def _fsync_dir(directory: Path) -> None:
    try:
        fd = os.open(directory, os.O_RDONLY)
    except OSError:  # pragma: no cover - e.g. Windows cannot open directories
        return
    try:
        os.fsync(fd)
    except OSError:  # pragma: no cover
        pass
    finally:
        os.close(fd)


_TMP_RE = re.compile(r"^\..+\.[0-9a-f]{12}\.tmp$")
STALE_TMP_S = 60.0
"""A temporary file of ours older than this (seconds) is left from a killed write: removed."""

_pending: set[str] = set()
_installed: dict[int, Any] = {}


def _remove_pending(signum: int, frame: Any) -> None:
    """SIGTERM/SIGHUP during a write: remove the temporary files, then act as before."""
    for name in list(_pending):
        try:
            os.unlink(name)
        except OSError:
            pass
        _pending.discard(name)
    previous = _installed.get(signum, signal.SIG_DFL)
    signal.signal(signum, previous)
    _installed.pop(signum, None)
    if callable(previous):
        previous(signum, frame)
    elif previous == signal.SIG_DFL:
        os.kill(os.getpid(), signum)


def _catch_signals() -> list[int]:
    """Install `_remove_pending` for SIGTERM and SIGHUP (main thread only); the signals set."""
    if threading.current_thread() is not threading.main_thread():
        return []
    done = []
    for name in ("SIGTERM", "SIGHUP"):
        signum = getattr(signal, name, None)
        if signum is None or signum in _installed:
            continue
        try:
            _installed[signum] = signal.signal(signum, _remove_pending)
        except (ValueError, OSError):  # pragma: no cover - not allowed here
            continue
        done.append(signum)
    return done


def _release_signals(signums: list[int]) -> None:
    for signum in signums:
        if signum in _installed:
            signal.signal(signum, _installed.pop(signum))


def remove_stale_temporaries(directory: str | PathLike[str], *, older_than_s: float = STALE_TMP_S) -> int:
    """Remove our own temporary files (``.NAME.<12 hex>.tmp``, regular, ours) older than
    `older_than_s` in `directory`, left by a write that was killed; returns how many."""
    removed = 0
    now = time.time()
    try:
        names = os.listdir(directory)
    except OSError:
        return 0
    for name in names:
        if not _TMP_RE.match(name):
            continue
        full = os.path.join(directory, name)
        try:
            st = os.lstat(full)
            if (not stat.S_ISREG(st.st_mode) or now - st.st_mtime < older_than_s
                    or (hasattr(os, "geteuid") and st.st_uid != os.geteuid())):
                continue
            os.unlink(full)
            removed += 1
        except OSError:
            continue
    return removed


def _kind_of(mode: int) -> str:
    kind = safefile.kind_of(mode)
    return f"it is {kind}" + ("" if kind == "a directory" else "; only a regular file is replaced")


def resolve_target(path: str | PathLike[str], *, overwrite: bool = False) -> Path:
    """The file a write to `path` will replace, checked before any work is done.

    A symbolic link to a regular file is followed: the link's target is replaced and the link kept.
    A directory, FIFO, device node or socket (or a link to one) is refused, as is an existing file
    when `overwrite` is false. Raises `FileWriteError`.
    """
    target = Path(path)
    if not str(path):
        raise FileWriteError(path, "empty file name")
    try:
        if os.path.islink(target):
            target = Path(os.path.realpath(target))
        try:
            st = os.stat(target)
        except FileNotFoundError:
            st = None
        if st is not None and not stat.S_ISREG(st.st_mode):
            raise FileWriteError(path, _kind_of(st.st_mode))
        directory = target.parent if str(target.parent) else Path(".")
        if not os.path.isdir(directory):
            raise FileWriteError(path, f"no such directory: {escape_text(str(directory))}")
        if st is not None and not overwrite:
            raise FileWriteError(path, "the file already exists (not overwritten; ask to overwrite it)")
    except OSError as exc:
        raise FileWriteError(path, safefile.os_reason(exc)) from None
    return target


def write_bytes_atomic(path: str | PathLike[str], data: bytes, *, overwrite: bool = False) -> Path:
    """Write `data` to `path` atomically and return the path written.

    Only a regular file (or a symbolic link to one: the link's target is replaced) is replaced.
    Raises `FileWriteError` if the file exists and `overwrite` is false, if it is a directory, a
    FIFO, a device or a socket, if the directory is missing, or if it cannot be written. A temporary
    file is removed on failure and on SIGTERM/SIGHUP; ours left by a killed write (older than a
    minute) are removed on the next write into that folder.
    """
    target = resolve_target(path, overwrite=overwrite)
    directory = target.parent if str(target.parent) else Path(".")
    remove_stale_temporaries(directory)
    tmp = directory / f".{target.name}.{secrets.token_hex(6)}.tmp"
    signums = _catch_signals()
    _pending.add(str(tmp))
    try:
        try:
            fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0), 0o666)
        except OSError as exc:
            _pending.discard(str(tmp))
            raise FileWriteError(path, safefile.os_reason(exc)) from None
        try:
            with os.fdopen(fd, "wb") as fh:
                fh.write(data)
                fh.flush()
                os.fsync(fh.fileno())
            if overwrite:
                resolve_target(path, overwrite=True)  # still a regular file (or gone) just before
                os.replace(tmp, target)
            else:
                try:
                    os.link(tmp, target)
                except FileExistsError:
                    raise FileWriteError(path, "the file already exists (not overwritten; ask to overwrite it)"
                                         ) from None
                except OSError:  # no hard links here (some file systems): check, then move
                    if os.path.lexists(target):
                        raise FileWriteError(
                            path, "the file already exists (not overwritten; ask to overwrite it)") from None
                    os.replace(tmp, target)
        except FileWriteError:
            raise
        except OSError as exc:
            raise FileWriteError(path, safefile.os_reason(exc)) from None
        finally:
            try:
                os.unlink(tmp)
            except OSError:
                pass
            _pending.discard(str(tmp))
    finally:
        _release_signals(signums)
    _fsync_dir(directory)
    return target


def write_text_atomic(path: str | PathLike[str], text: str, *, overwrite: bool = False,
                      encoding: str = "utf-8") -> Path:
    """Write `text` to `path` atomically (UTF-8 by default); see `write_bytes_atomic`."""
    return write_bytes_atomic(path, text.encode(encoding), overwrite=overwrite)
