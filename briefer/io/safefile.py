"""Read a file only when it is a regular file of a bounded size (the one way briefer reads files).

Rules (README "Files briefer reads"):

- the path is checked with `os.stat` before it is opened: a directory, FIFO, device node or
  socket is refused with a one-line error, never opened (a FIFO would block for ever, `/dev/zero`
  never ends);
- it is then opened with ``O_NONBLOCK`` (a FIFO swapped in between the check and the open cannot
  hang the open) and the open descriptor is checked again with `os.fstat`;
- the size is checked against a stated limit before reading (`MAX_DATA_BYTES`, 5 MB, for data
  files, saved inputs, scenarios and the config file), and the read stops one byte past it in case
  the file grew meanwhile.

Every failure is a `DataFileError` naming the file (control characters in the name escaped).
"""

from __future__ import annotations

import errno
import os
import stat
from os import PathLike

from briefer.errors import DataFileError

MAX_DATA_BYTES = 5_000_000
"""Largest data file (profile, airfield, scenario, saved inputs, config) briefer reads: 5 MB."""

_OPEN_FLAGS = (os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0)
               | getattr(os, "O_CLOEXEC", 0) | getattr(os, "O_BINARY", 0))


_open = os.open   # one name for the opening call (tests stand in a refusal)


def kind_of(mode: int) -> str:
    """What a file of this st_mode is, in words ('a FIFO (named pipe)', 'not a regular file')."""
    if stat.S_ISDIR(mode):
        return "a directory"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


_ERRNO_WORDS = {
    errno.ENOSPC: "no space left on the device",
    errno.EROFS: "the file system is read-only",
    errno.ENAMETOOLONG: "the file name is too long",
    errno.ELOOP: "too many levels of symbolic links",
    errno.ENOTDIR: "a part of the path is not a folder",
}


def os_reason(exc: OSError) -> str:
    """Why an operating-system call on a file failed, in the tool's words: one wording for
    reading (`_os_reason`) and for writing (`briefer.io.atomic`)."""
    if isinstance(exc, PermissionError):
        return "permission denied"
    return _ERRNO_WORDS.get(exc.errno or 0, exc.strerror or str(exc))


def _os_reason(exc: OSError) -> str:
    """A failed read, said as the loaders say it."""
    if isinstance(exc, FileNotFoundError):
        return "no such file"
    if exc.errno == errno.ENOTDIR:
        return f"no such file ({os_reason(exc)})"
    return f"cannot read the file ({os_reason(exc)})"


def _check(mode: int, size: int, name: str, limit: int, what: str) -> None:
    if not stat.S_ISREG(mode):
        raise DataFileError(f"is {kind_of(mode)}, expected {what}", file=name)
    if size > limit:
        raise DataFileError(f"the file is {size:,} bytes, larger than the limit of {limit:,} bytes; "
                            f"expected {what}", file=name)


def read_regular_file(path: str | PathLike[str], *, limit: int = MAX_DATA_BYTES,
                      what: str = "a YAML file", name: str | None = None) -> bytes:
    """The bytes of `path`, which must be a regular file (or a symlink to one) of at most `limit`
    bytes; raises `DataFileError` otherwise (`name` is how errors name the file, default `path`)."""
    shown = str(path) if name is None else name
    try:
        st = os.stat(path)
    except (OSError, ValueError) as exc:
        reason = _os_reason(exc) if isinstance(exc, OSError) else "cannot read the file (a NUL in the name)"
        raise DataFileError(reason, file=shown) from None
    _check(st.st_mode, st.st_size, shown, limit, what)
    try:
        fd = _open(path, _OPEN_FLAGS)
    except OSError as exc:
        raise DataFileError(_os_reason(exc), file=shown) from None
    try:
        st = os.fstat(fd)
        _check(st.st_mode, st.st_size, shown, limit, what)
        if hasattr(os, "set_blocking"):
            os.set_blocking(fd, True)  # a regular file: reads never block anyway
        chunks: list[bytes] = []
        total = 0
        while total <= limit:
            chunk = os.read(fd, min(1 << 20, limit + 1 - total))
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
    except OSError as exc:
        raise DataFileError(_os_reason(exc), file=shown) from None
    finally:
        os.close(fd)
    if total > limit:
        raise DataFileError(f"the file grew past the limit of {limit:,} bytes while being read", file=shown)
    return b"".join(chunks)
