"""The hostile-file corpus: data files an adversary would hand briefer, built into a folder.

Each case is (name, bytes) for a regular file; the special files (FIFO, device node, symlink loop,
directory) are made by `make_special` where the platform can make them. The tests load every case
through every loader and expect a one-line `BriefingError` (or a model), never anything else.
Imported as a plain module: pytest puts tests/ on sys.path.
"""

from __future__ import annotations

import os
import stat
import sys
from pathlib import Path

PROFILE_HEAD = b"kind: aircraft-profile\nformat_version: 1\n"


DEMO_SCENARIO = (Path(__file__).resolve().parents[1] / "scenarios"
                 / "v2rl-low-visibility-by-hand.yaml").read_bytes()


def _scenario(line: bytes, key: bytes = b"airfield: V2RL") -> bytes:
    """The demo scenario with the line starting `key` replaced by `line`."""
    assert key in DEMO_SCENARIO
    return DEMO_SCENARIO.replace(key, line, 1)


def _deep(n: int) -> bytes:
    return b"kind: airfield\nx: " + b"[" * n + b"]" * n + b"\n"


CASES: dict[str, bytes] = {
    "bel-in-plain-text.yaml": PROFILE_HEAD + b"name: a\x07b\n",
    "esc-in-plain-text.yaml": PROFILE_HEAD + b"name: a\x1b[31mred\n",
    "esc-escaped-in-quotes.yaml": PROFILE_HEAD + b'name: "a\\e[31mred\\a"\n',
    "nul-escaped-in-quotes.yaml": PROFILE_HEAD + b'name: "a\\0b"\n',
    "c1-csi-in-quotes.yaml": PROFILE_HEAD + b'name: "a\\x9b31mred"\n',
    "bidi-override.yaml": PROFILE_HEAD + 'name: "abc\u202edef"\n'.encode(),
    "control-in-key.yaml": PROFILE_HEAD + b'"na\\eme": x\n',
    "lone-surrogate.yaml": PROFILE_HEAD + b'name: "\\uD800x"\n',
    "nesting-500.yaml": _deep(500),
    "nesting-5000.yaml": _deep(5000),
    "int-5000-digits.yaml": PROFILE_HEAD + b"vref_kt: " + b"9" * 5000 + b"\n",
    "float-5000-digits.yaml": PROFILE_HEAD + b"vref_kt: 1." + b"9" * 5000 + b"\n",
    "bool-tag-abc.yaml": PROFILE_HEAD + b"name: !!bool abc\n",
    "int-tag-abc.yaml": PROFILE_HEAD + b"name: !!int abc\n",
    "float-tag-abc.yaml": PROFILE_HEAD + b"name: !!float abc\n",
    "timestamp-tag-abc.yaml": PROFILE_HEAD + b"name: !!timestamp 2020-99-99\n",
    "binary-tag.yaml": PROFILE_HEAD + b"name: !!binary aGVsbG8=\n",
    "null-tag-abc.yaml": PROFILE_HEAD + b"name: !!null abc\n",
    "alias-bomb.yaml": (b"a: &a [x,x,x,x,x,x,x,x,x]\nb: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]\n"
                        b"c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]\nd: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]\n"
                        b"e: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]\nf: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]\n"),
    "non-utf8.yaml": PROFILE_HEAD + b"name: caf\xe9\n",
    "nul-byte.yaml": PROFILE_HEAD + b"name: a\x00b\n",
    "empty.yaml": b"",
    "comments-only.yaml": b"# nothing here\n# at all\n",
    "huge-line.yaml": PROFILE_HEAD + b"name: " + b"x" * 200_000 + b"\n",
    "many-keys.yaml": PROFILE_HEAD + b"".join(b"k%d: 1\n" % i for i in range(20_000)),
    "scenario-passwd.yaml": _scenario(b"airfield: /etc/passwd"),
    "scenario-dotdot.yaml": _scenario(b"airfield: ../../../../../../etc/hostname"),
    "scenario-home.yaml": _scenario(b"profile: ~/.bashrc", key=b"profile: demo-twin"),
    "scenario-esc-title.yaml": _scenario(b'title: "\\e]0;owned\\a"', key=b"title: 'V2RL RNAV (GPS) RWY 09, circle to 27: mist at the minimum'"),
}


def write_corpus(folder: Path) -> list[Path]:
    """Write the regular-file cases into `folder`; returns their paths."""
    folder.mkdir(parents=True, exist_ok=True)
    out = []
    for name, data in CASES.items():
        p = folder / name
        p.write_bytes(data)
        out.append(p)
    return out


def can_make_fifo() -> bool:
    return hasattr(os, "mkfifo") and sys.platform != "win32"


def can_make_device() -> bool:
    return hasattr(os, "mknod") and hasattr(os, "geteuid") and os.geteuid() == 0


def make_fifo(path: Path) -> Path:
    os.mkfifo(path)
    return path


def make_device(path: Path) -> Path:
    """A character device with /dev/full's numbers (1, 7): writes fail with ENOSPC."""
    os.mknod(path, 0o666 | stat.S_IFCHR, os.makedev(1, 7))
    return path
