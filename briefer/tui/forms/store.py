"""Where a form saves, and the save itself: the file text, checked by the loader, written
atomically into the user's folder.

The folder is the first one the user's config file lists for the kind (``profile_dirs`` or
``airfield_dirs``, see `briefer.io.catalog`). Without one, the first save creates
``profiles/`` or ``airfields/`` beside the config file and adds it to the config file (creating
that too), so the catalog finds the file next time.

No Textual import here.
"""

from __future__ import annotations

import re
from briefer._dataclass import dataclass
from pathlib import Path
from typing import Any

from briefer.errors import BriefingError, DataFileError
from briefer.io.atomic import FileWriteError, write_text_atomic
from briefer.io.catalog import CONFIG_KEYS, config_path, load_config
from briefer.io import drafts
from briefer.io.yamlload import load_bytes
from briefer.model import KIND_PROFILE

DEFAULT_FOLDERS = {KIND_PROFILE: "profiles"}
HEADER = ("# {what} entered in the briefer app. Check every number against the documents: the\n"
          "# published procedure and the aircraft flight manual govern. Not for navigation.\n")
_WHAT = {KIND_PROFILE: "Aircraft profile"}


class SaveError(BriefingError):
    """The form could not be saved (nothing was written, an existing file is unchanged)."""


@dataclass(frozen=True, slots=True)
class Target:
    """Where a save goes.

    Attributes:
        folder: The user's folder for the kind.
        in_config: The config file already lists it (else the first save adds it).
    """

    folder: Path
    in_config: bool


def target_folder(kind: str) -> Target:
    """The user's folder for a kind (it need not exist yet)."""
    try:
        config = load_config()
    except DataFileError as exc:
        raise SaveError(f"the config file cannot be read: {exc}") from None
    dirs = config.dirs(kind)
    if dirs:
        return Target(dirs[0], True)
    return Target(config_path().parent / DEFAULT_FOLDERS.get(kind, "airfields"), False)


def file_name(kind: str, name: str, title: str = "") -> str:
    """'my-twin.yaml', 'k1ab-lake-field.yaml' (lower case, letters, digits and dashes)."""
    words = f"{name} {title}" if kind != KIND_PROFILE and title else name
    slug = re.sub(r"[^a-z0-9]+", "-", words.lower()).strip("-") or "unnamed"
    return slug[:60] + ".yaml"


def file_text(kind: str, model: Any) -> str:
    """The data file of a model: a short header, then its mapping (whole numbers without '.0')."""
    return drafts.draft_yaml(kind, model, header=HEADER.format(what=_WHAT.get(kind, "Airfield")))


def _ensure_folder(kind: str, target: Target) -> None:
    """Create the folder and list it in the config file (the first save)."""
    try:
        target.folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise SaveError(f"cannot create the folder {target.folder}: {exc.strerror or exc}") from None
    if target.in_config:
        return
    cfg = config_path()
    key = CONFIG_KEYS[kind]
    try:
        text = cfg.read_text(encoding="utf-8") if cfg.exists() else ""
    except OSError as exc:
        raise SaveError(f"cannot read the config file {cfg}: {exc.strerror or exc}") from None
    if re.search(rf"(?m)^{key}\s*:", text):
        raise SaveError(f"the config file {cfg} has '{key}' without a folder; add one there, "
                        f"e.g. {key}: [{target.folder}]")
    if text and not text.endswith("\n"):
        text += "\n"
    text += f"{key}: [{_quoted(str(target.folder))}]\n"
    try:
        cfg.parent.mkdir(parents=True, exist_ok=True)
        write_text_atomic(cfg, text, overwrite=True)
    except (OSError, FileWriteError) as exc:
        raise SaveError(f"cannot update the config file {cfg}: {exc}") from None


def _quoted(text: str) -> str:
    return "'" + text.replace("'", "''") + "'"


def save_model(kind: str, model: Any, path: Path, *, overwrite: bool, target: Target | None = None) -> Path:
    """Write the model's file at `path`, atomically, after the loader has read the very text back
    to the same model. Raises `SaveError` (nothing written, an existing file kept)."""
    text = file_text(kind, model)
    try:
        again = load_bytes(text.encode("utf-8"), file=str(path), expected_kind=kind)
    except DataFileError as exc:
        raise SaveError(f"not saved: the file would not read back ({exc})") from None
    if again != model:
        raise SaveError("not saved: the file would not read back to the same values")
    if target is not None:
        _ensure_folder(kind, target)
    try:
        return write_text_atomic(path, text, overwrite=overwrite)
    except FileWriteError as exc:
        raise SaveError(str(exc)) from None
