"""Write files atomically: a reader sees the old file or the complete new one, never a part.

The data go to a temporary file in the target's directory, are flushed and fsynced, and the
temporary file is then moved into place (`os.replace`, or a hard link when overwriting is not
allowed, so that a file appearing meanwhile is not overwritten either). On any failure the
temporary file is removed. The new file gets the usual permissions (0666 less the umask).
"""

from __future__ import annotations

import errno
import os
import secrets
from os import PathLike
from pathlib import Path

from briefer.errors import BriefingError


class FileWriteError(BriefingError):
    """A file could not be written (exists and may not be overwritten, no directory, no permission)."""

    def __init__(self, path: str | PathLike[str], reason: str) -> None:
        self.path = str(path)
        self.reason = reason
        super().__init__(f"cannot write {self.path}: {reason}")

    def __str__(self) -> str:
        return f"cannot write {self.path}: {self.reason}"


def _reason(exc: OSError) -> str:
    if isinstance(exc, PermissionError):
        return "permission denied"
    if exc.errno == errno.ENOSPC:
        return "no space left on the device"
    if exc.errno == errno.EROFS:
        return "the file system is read-only"
    return exc.strerror or str(exc)


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


def write_bytes_atomic(path: str | PathLike[str], data: bytes, *, overwrite: bool = False) -> Path:
    """Write `data` to `path` atomically and return the path.

    Raises `FileWriteError` if the file exists and `overwrite` is false, if the directory is
    missing, or if it cannot be written.
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    if target.is_dir():
        raise FileWriteError(target, "it is a directory")
    if not directory.is_dir():
        raise FileWriteError(target, f"no such directory: {directory}")
    if not overwrite and os.path.lexists(target):
        raise FileWriteError(target, "the file already exists (not overwritten; ask to overwrite it)")
    tmp = directory / f".{target.name}.{secrets.token_hex(6)}.tmp"
    try:
        fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0), 0o666)
    except OSError as exc:
        raise FileWriteError(target, _reason(exc)) from None
    try:
        try:
            with os.fdopen(fd, "wb") as fh:
                fh.write(data)
                fh.flush()
                os.fsync(fh.fileno())
            if overwrite:
                os.replace(tmp, target)
            else:
                try:
                    os.link(tmp, target)
                except FileExistsError:
                    raise FileWriteError(target, "the file already exists (not overwritten; ask to overwrite it)"
                                         ) from None
                except OSError:  # no hard links here (some file systems): check, then move
                    if os.path.lexists(target):
                        raise FileWriteError(
                            target, "the file already exists (not overwritten; ask to overwrite it)") from None
                    os.replace(tmp, target)
        except FileWriteError:
            raise
        except OSError as exc:
            raise FileWriteError(target, _reason(exc)) from None
    finally:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
    _fsync_dir(directory)
    return target


def write_text_atomic(path: str | PathLike[str], text: str, *, overwrite: bool = False,
                      encoding: str = "utf-8") -> Path:
    """Write `text` to `path` atomically (UTF-8 by default); see `write_bytes_atomic`."""
    return write_bytes_atomic(path, text.encode(encoding), overwrite=overwrite)
