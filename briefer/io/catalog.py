"""Find aircraft profiles and airfields by name or by file.

Where the files come from, in this order (the first match wins, so a user's file can stand in for
a built-in one of the same name):

1. folders given by the caller (command-line options);
2. folders listed in the user's config file, ``$XDG_CONFIG_HOME/briefer/config.yaml`` (default
   ``~/.config/briefer/config.yaml``; ``%APPDATA%\\briefer\\config.yaml`` on Windows)::

       profile_dirs: [~/flying/profiles]      # relative paths are relative to the config file
       airfield_dirs: [~/flying/airfields]
       display_units: icao                    # us (the default: lb, SM) or icao (kg, m/km, hPa)

3. the invented demo data: the repository's top-level ``profiles/`` and ``airfields_demo/``,
   shipped in the wheel as ``briefer/data/profiles`` and ``briefer/data/airfields_demo`` and read
   there (beside the installed package's modules; through `importlib.resources` only for a
   package that is not a folder, a zip), so it is found after a plain ``pip install .`` as well.

A folder contributes its ``*.yaml`` and ``*.yml`` files (not sub-folders). A profile is found by
its ``name`` or its file name without the extension; an airfield by its ``ident``, its ``name`` or
its file name (case, spaces and punctuation ignored). Anything that looks like a path (contains a
slash, ends in .yaml/.yml, or is an existing file) is loaded as that file.
"""

from __future__ import annotations

import os
import re
import sys
from collections.abc import Callable, Iterable, Sequence
from briefer._dataclass import dataclass
from os import PathLike
from typing import TYPE_CHECKING, Any

from briefer.errors import BriefingError, DataFileError
from briefer.io.safefile import read_regular_file
from briefer.io.yamlload import load_airfield, load_bytes, load_profile, model_from_document, parse_yaml_mapping
from briefer.model import KIND_AIRFIELD, KIND_PROFILE, AircraftProfile, Airfield, did_you_mean
from briefer.safetext import excerpt

if TYPE_CHECKING:   # pathlib (and the urllib and ipaddress modules it imports) loads only where a Path is made:
    from pathlib import Path   # finding a name in the built-in files and an absent config file need none

CONFIG_KEYS = {KIND_PROFILE: "profile_dirs", KIND_AIRFIELD: "airfield_dirs"}
UNITS_KEY = "display_units"
"""The config file's display-units preference (briefer.display_units: us or icao)."""
_SUFFIXES = (".yaml", ".yml")
_WHAT = {KIND_PROFILE: "aircraft profile", KIND_AIRFIELD: "airfield"}


class NotFoundError(BriefingError, LookupError):
    """No profile or airfield of that name; the message lists what exists."""


@dataclass(frozen=True, slots=True, kw_only=True)
class CatalogEntry:
    """One data file the catalog knows: what it holds and where it is.

    ``name`` is the profile name or the airfield ident (the file name when the file is broken);
    ``title`` the profile description or the airfield name; ``error`` the one-line error of a
    broken file (None when it loads).
    """

    kind: str
    name: str
    title: str
    source: str
    builtin: bool
    error: str | None = None


@dataclass(frozen=True, slots=True, kw_only=True)
class CatalogConfig:
    """The user's config file: extra folders to search, and the display units (None: not set)."""

    profile_dirs: tuple[Path, ...] = ()
    airfield_dirs: tuple[Path, ...] = ()
    display_units: str | None = None
    source: str | None = None

    def dirs(self, kind: str) -> tuple[Path, ...]:
        return self.profile_dirs if kind == KIND_PROFILE else self.airfield_dirs


# --------------------------------------------------------------------------------------------
# The config file
# --------------------------------------------------------------------------------------------
def _config_base() -> str | None:
    base = os.environ.get("XDG_CONFIG_HOME")
    if not base and sys.platform == "win32":
        base = os.environ.get("APPDATA")
    return base


def config_path() -> Path:
    """Where the user's config file lives (it need not exist)."""
    from pathlib import Path

    base = _config_base()
    root = Path(base) if base else Path.home() / ".config"
    return root / "briefer" / "config.yaml"


def _config_absent() -> bool:
    """True when there is nothing at `config_path()` (told without making a Path)."""
    base = _config_base()
    if not base:
        base = os.path.expanduser("~")
        if base.startswith("~"):          # no home directory: config_path() says so
            return False
        base = os.path.join(base, ".config")
    return not os.path.lexists(os.path.join(base, "briefer", "config.yaml"))


def load_config(path: str | PathLike[str] | None = None) -> CatalogConfig:
    """Read the config file (an absent file is an empty config; a bad one a `DataFileError`)."""
    if path is None and _config_absent():
        return CatalogConfig()
    from pathlib import Path

    p = Path(path) if path is not None else config_path()
    if not os.path.lexists(p):
        return CatalogConfig()
    data = read_regular_file(p, what="a YAML config file")
    doc = parse_yaml_mapping(data, str(p), empty_message=(
        "the config file is empty; expected a mapping with profile_dirs: and/or airfield_dirs: "
        "(lists of folders), or delete the file"))
    allowed = (*CONFIG_KEYS.values(), UNITS_KEY)
    for key in doc.data:
        if key not in allowed:
            hint = did_you_mean(key, allowed) or f" (allowed: {', '.join(allowed)})"
            raise doc.error(f"unknown key '{key}'{hint}", "", locator=key)
    units = doc.data.get(UNITS_KEY)
    if units is not None:
        from briefer.display_units import UNIT_SETS, check_units

        try:
            units = check_units(units)
        except ValueError:
            raise doc.error(f"expected one of {', '.join(UNIT_SETS)}, got {units!r}", UNITS_KEY) from None
    found: dict[str, tuple[Path, ...]] = {}
    for key in CONFIG_KEYS.values():
        value = doc.data.get(key, [])
        if value is None:
            value = []
        if isinstance(value, str):
            value = [value]
        if not isinstance(value, list):
            raise doc.error(f"expected a list of folders, got {type(value).__name__}", key)
        dirs = []
        for i, item in enumerate(value):
            where = f"{key}[{i}]"
            if not isinstance(item, str) or not item.strip():
                raise doc.error(f"expected a folder path, got {excerpt(str(item), 40)}", where)
            folder = Path(os.path.expandvars(item.strip())).expanduser()
            if not folder.is_absolute():
                folder = p.parent / folder
            if not os.path.isdir(folder):
                raise doc.error(f"no such folder: {folder}", where)
            dirs.append(folder)
        found[key] = tuple(dirs)
    return CatalogConfig(profile_dirs=found["profile_dirs"], airfield_dirs=found["airfield_dirs"],
                         display_units=units, source=str(p))


def configured_units() -> str:
    """The display units the config file asks for ('us' when it says nothing or does not exist);
    a bad value is the config file's `DataFileError` (file, line, key)."""
    from briefer.display_units import DEFAULT_UNITS

    return load_config().display_units or DEFAULT_UNITS


# --------------------------------------------------------------------------------------------
# Sources
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True)
class _Source:
    name: str
    stem: str
    read: Callable[[], bytes]
    builtin: bool


BUILTIN_FOLDERS = {KIND_PROFILE: "profiles", KIND_AIRFIELD: "airfields_demo", "scenario": "scenarios"}
"""The demo data's folders: top level in the repository (editable examples a user sees first),
``briefer/data/<folder>`` inside an installed package (pyproject maps one onto the other)."""


def builtin_folder(kind: str) -> Any:
    """The folder of the shipped demo files of a kind ("aircraft-profile", "airfield",
    "scenario"): inside the installed package, else the repository's top-level folder when running
    from a checkout (an `importlib.resources` Traversable for a package in a zip file)."""
    from pathlib import Path

    name = BUILTIN_FOLDERS[kind]
    package = Path(__file__).resolve().parent.parent
    for folder in (package / "data" / name, package.parent / name):
        if folder.is_dir():
            return folder
    from importlib import resources   # a package inside a zip file (importing it costs ~30 ms at start-up)

    return resources.files("briefer") / "data" / name


def builtin_files(kind: str) -> list[Any]:
    """The shipped demo files of a kind (see `builtin_folder`), sorted by name."""
    folder = builtin_folder(kind)
    if not folder.is_dir():
        return []
    return sorted((f for f in folder.iterdir() if f.is_file() and f.name.endswith(_SUFFIXES)),
                  key=lambda f: f.name)


def _builtin_paths(kind: str) -> list[str] | None:
    """The paths of `builtin_files` as text, without making a Path (None: a package that is not
    in a folder, whose files only `builtin_files` reads)."""
    name = BUILTIN_FOLDERS[kind]
    package = os.path.dirname(os.path.dirname(os.path.realpath(__file__)))
    for folder in (os.path.join(package, "data", name), os.path.join(os.path.dirname(package), name)):
        if os.path.isdir(folder):
            paths = (os.path.join(folder, f) for f in sorted(os.listdir(folder)) if f.endswith(_SUFFIXES))
            return [p for p in paths if os.path.isfile(p)]
    return None


def _read_file(path: str) -> bytes:
    with open(path, "rb") as f:
        return f.read()


def search_dirs(kind: str, dirs: Sequence[str | PathLike[str]] = (), *, use_config: bool = True) -> list[Path]:
    """The user folders searched for a kind: `dirs`, then the config file's."""
    out = []
    if dirs:
        from pathlib import Path

        out = [Path(d).expanduser() for d in dirs]
    for d in out:
        if not os.path.isdir(d):
            raise DataFileError("no such folder", file=str(d))
    if use_config:
        out.extend(load_config().dirs(kind))
    return out


def _sources(kind: str, dirs: Sequence[str | PathLike[str]], use_config: bool) -> list[_Source]:
    sources = []
    for folder in search_dirs(kind, dirs, use_config=use_config):
        try:
            files = sorted(folder.iterdir())
        except OSError as exc:
            raise DataFileError(f"cannot list the folder ({exc.strerror or exc})", file=str(folder)) from None
        for f in files:
            if f.suffix in _SUFFIXES and os.path.isfile(f):
                sources.append(_Source(str(f), f.stem, lambda f=f: read_regular_file(f), False))
    paths = _builtin_paths(kind)
    if paths is None:
        for t in builtin_files(kind):
            sources.append(_Source(str(t), t.name.rsplit(".", 1)[0], t.read_bytes, True))
        return sources
    for path in paths:
        sources.append(_Source(path, os.path.basename(path).rsplit(".", 1)[0], lambda p=path: _read_file(p), True))
    return sources


def _bytes(source: _Source) -> bytes:
    try:
        return source.read()
    except OSError as exc:
        raise DataFileError(f"cannot read the file ({exc.strerror or exc})", file=source.name) from None


def _document(source: _Source) -> Any:
    """The parsed file of a source (a `YamlDocument`; unreadable or bad YAML: `DataFileError`)."""
    return parse_yaml_mapping(_bytes(source), source.name)


def _load(source: _Source, kind: str) -> Any:
    return model_from_document(_document(source), kind)


def _entry(source: _Source, kind: str) -> CatalogEntry:
    try:
        model = _load(source, kind)
    except DataFileError as exc:
        return CatalogEntry(kind=kind, name=source.stem, title="", source=source.name,
                            builtin=source.builtin, error=str(exc))
    if kind == KIND_PROFILE:
        return CatalogEntry(kind=kind, name=model.name, title=model.description, source=source.name,
                            builtin=source.builtin)
    return CatalogEntry(kind=kind, name=model.ident, title=model.name, source=source.name, builtin=source.builtin)


def _list(kind: str, dirs: Sequence[str | PathLike[str]], use_config: bool) -> list[CatalogEntry]:
    return [_entry(s, kind) for s in _sources(kind, dirs, use_config)]


def list_profiles(*, dirs: Sequence[str | PathLike[str]] = (), use_config: bool = True) -> list[CatalogEntry]:
    """Every aircraft profile file the catalog sees (user folders first, then built-in)."""
    return _list(KIND_PROFILE, dirs, use_config)


def list_airfields(*, dirs: Sequence[str | PathLike[str]] = (), use_config: bool = True) -> list[CatalogEntry]:
    """Every airfield file the catalog sees (user folders first, then built-in)."""
    return _list(KIND_AIRFIELD, dirs, use_config)


# --------------------------------------------------------------------------------------------
# Finding
# --------------------------------------------------------------------------------------------
def _loose(text: str) -> str:
    return re.sub(r"[^a-z0-9]", "", text.lower())


def _looks_like_path(text: str) -> bool:
    return "/" in text or os.sep in text or text.lower().endswith(_SUFFIXES) or os.path.isfile(text)


def _names(model: Any, kind: str) -> Iterable[str]:
    return (model.name,) if kind == KIND_PROFILE else (model.ident, model.name)


def _mentions(data: bytes, wanted: str) -> bool:
    """False when the file's text cannot hold a value that is `wanted` loosely (`_loose`): every
    value is written out in the text (a folded line or a quote doubled leaves its letters and
    digits in order), except through an escape, so a file with a backslash is always read."""
    return b"\\" in data or wanted in _loose(data.decode("utf-8", "replace"))


def _may_be_named(data: dict[str, Any], kind: str, wanted: str) -> bool:
    """False when the file's own name keys (text, as the model takes them) are not `wanted`:
    then its model, which carries those names, is not either, and need not be built."""
    keys = ("name",) if kind == KIND_PROFILE else ("ident", "name")
    values = [data.get(k) for k in keys]
    if not all(isinstance(v, str) for v in values):
        return True                                  # let the model say what it makes of them
    return any(_loose(v) == wanted for v in values)


def _find(kind: str, name_or_path: str | PathLike[str], dirs: Sequence[str | PathLike[str]],
          use_config: bool, names_only: bool = False) -> Any:
    text = str(name_or_path).strip()
    if isinstance(name_or_path, PathLike) or (not names_only and _looks_like_path(text)):
        path = os.path.expanduser(text)
        return load_profile(path) if kind == KIND_PROFILE else load_airfield(path)
    wanted = _loose(text)
    sources = _sources(kind, dirs, use_config)
    for source in sources:                           # in priority order: the first match wins
        if _loose(source.stem) == wanted:
            return _load(source, kind)               # named by its file: a broken file says why
        try:
            data = _bytes(source)
            if not _mentions(data, wanted):
                continue                             # the name asked for is nowhere in its text
            doc = parse_yaml_mapping(data, source.name)
            if not _may_be_named(doc.data, kind, wanted):
                continue                             # its names are not the one asked for
            model = model_from_document(doc, kind)
        except DataFileError:
            continue
        if any(_loose(n) == wanted for n in _names(model, kind)):
            return model
    available = []                                   # not found: what the valid files are named
    for source in sources:
        try:
            model = _load(source, kind)
        except DataFileError:
            continue
        available.append(model.name if kind == KIND_PROFILE else model.ident)
    hint = did_you_mean(text, available)
    listing = ", ".join(sorted(set(available))) or "none"
    raise NotFoundError(f"no {_WHAT[kind]} named {excerpt(text)}{hint}; available: {listing} (or give a file path)")


def find_profile(name_or_path: str | PathLike[str], *, dirs: Sequence[str | PathLike[str]] = (),
                 use_config: bool = True, names_only: bool = False) -> AircraftProfile:
    """The aircraft profile with this name (or in this file; with `names_only` a str is only ever
    a name, a file is given as a Path)."""
    return _find(KIND_PROFILE, name_or_path, dirs, use_config, names_only)  # type: ignore[no-any-return]


def find_airfield(name_or_path: str | PathLike[str], *, dirs: Sequence[str | PathLike[str]] = (),
                  use_config: bool = True, names_only: bool = False) -> Airfield:
    """The airfield with this ident or name (or in this file; with `names_only` a str is only
    ever a name, a file is given as a Path)."""
    return _find(KIND_AIRFIELD, name_or_path, dirs, use_config, names_only)  # type: ignore[no-any-return]
