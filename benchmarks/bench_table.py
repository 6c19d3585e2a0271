"""Every figure of the speed targets' table, each as a ratio against a yardstick measured in the
same run (medians of interleaved runs). Run by hand: ``python benchmarks/bench_table.py``.

| what | yardstick | target |
|---|---|---|
| ``build_brief(demo)`` in process (CPU) | the plain-Python scalar reference envelope, 6 x 5 cells | <= 5 ms |
| ``envelope_for(demo)``, the real envelope, 36 x 41 winds (CPU) | the same | <= 50 ms |
| edit -> brief shown in the app (wall, headless) | the same (wall), run before each edit | <= 16 ms |
| the app's first frame | a minimal Textual app's first frame | <= 1.5 x |
| ``briefer --version`` | ``python -c pass`` | <= 2 x |
| ``briefer brief --demo`` | ``python -c "import numpy, yaml, rich.console"`` | <= 1.3 x |

The first three targets are times; as ratios they are the target over the yardstick's time on
the machine the targets were set on (``YARDSTICK_REFERENCE_MS``: the scalar reference's median
CPU time on the 2-core reference VM, shared, 2026-12-03), so a slower or faster machine moves
the yardstick and the figure together. The whole-process rows run A and B in turn and take the
median of the pairwise ratios (the first pair warms the file cache).

To measure another checkout (e.g. before a change): run this file from outside any checkout with
``PYTHONPATH=<that checkout>``; the processes it starts inherit it. Timings depend on the load:
say the load (``uptime``) with the figures and repeat when it is high.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

import bench_app  # noqa: E402
import bench_brief  # noqa: E402

YARDSTICK_REFERENCE_MS = 26.0
TARGET_BRIEF_MS, TARGET_ENVELOPE_MS, TARGET_EDIT_MS = 5.0, 50.0, 16.0
TARGET_FIRST_FRAME, TARGET_VERSION, TARGET_BRIEF_PROCESS = 1.5, 2.0, 1.3


def _row(what: str, figure: str, yardstick: str, ratio: float, target: float, note: str = "") -> str:
    verdict = "met" if ratio <= target else "NOT met"
    return f"| {what} | {figure} | {yardstick} | {ratio:.2f} | <= {target:.2f} {note}| {verdict} |"


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--rounds", type=int, default=9, help="interleaved rounds of the in-process figures (9)")
    p.add_argument("--edits", type=int, default=15, help="edits timed in the app (15)")
    p.add_argument("--process-runs", type=int, default=11, help="process pairs per start-up figure (11)")
    args = p.parse_args(argv)

    from briefer.brief import build_brief, demo_request, envelope_for

    import briefer

    import compileall

    # bytecode compiled first, as an installed package is (a checkout run with
    # PYTHONDONTWRITEBYTECODE would otherwise compile on every start)
    compileall.compile_dir(os.path.dirname(briefer.__file__), quiet=1)
    print(f"briefer from {os.path.dirname(briefer.__file__)}; load average {os.getloadavg()[0]:.2f}")
    request = demo_request()
    yard = bench_brief._yardstick_envelope()
    figures = {"brief": lambda: build_brief(request, computed_utc=bench_brief.COMPUTED_UTC),
               "envelope": lambda: envelope_for(request)}
    for fn in (yard, *figures.values()):
        fn()
    res = bench_brief.interleaved_ratios(figures, yard, rounds=args.rounds, calls={"brief": 9, "envelope": 1})
    edit = bench_app.edit_to_brief(runs=args.edits, yardstick=yard)
    shown, yard_wall = edit["shown"], edit["yardstick"]
    edit_ratio = statistics.median(s / y for s, y in zip(shown, yard_wall))
    frame_app, frame_min, frame_ratio, _, frame_filled = bench_app.first_frame_pairs(args.process_runs)
    py = sys.executable
    ver = bench_brief.process_pairs([py, "-m", "briefer", "--version"], [py, "-c", "pass"], runs=args.process_runs)
    proc = bench_brief.process_pairs([py, "-m", "briefer", "brief", "--demo"],
                                     [py, "-c", "import numpy, yaml, rich.console"], runs=args.process_runs)

    ref = YARDSTICK_REFERENCE_MS
    b, e = res["brief"], res["envelope"]
    print(f"load average after the run {os.getloadavg()[0]:.2f}\n")
    print("| what | figure | yardstick | ratio | target ratio | |")
    print("|---|---|---|---|---|---|")
    print(_row("build_brief(demo) in process", f"{b[0]:.1f} ms CPU", f"{b[1]:.1f} ms", b[2],
               TARGET_BRIEF_MS / ref, f"({TARGET_BRIEF_MS:g} ms / {ref:g} ms) "))
    print(_row("envelope_for(demo), 36x41 winds", f"{e[0]:.1f} ms CPU", f"{e[1]:.1f} ms", e[2],
               TARGET_ENVELOPE_MS / ref, f"({TARGET_ENVELOPE_MS:g} ms / {ref:g} ms) "))
    print(_row("edit -> brief shown in the app", f"{statistics.median(shown) * 1e3:.1f} ms wall",
               f"{statistics.median(yard_wall) * 1e3:.1f} ms", edit_ratio, TARGET_EDIT_MS / ref,
               f"({TARGET_EDIT_MS:g} ms / {ref:g} ms) "))
    print(_row("app first frame", f"{frame_app:.0f} ms (step filled {frame_filled:.0f} ms)",
               f"minimal app {frame_min:.0f} ms", frame_ratio, TARGET_FIRST_FRAME))
    print(_row("briefer --version", f"{ver[0]:.0f} ms", f"python -c pass {ver[1]:.0f} ms", ver[2], TARGET_VERSION))
    print(_row("briefer brief --demo", f"{proc[0]:.0f} ms", f"import numpy, yaml, rich.console {proc[1]:.0f} ms",
               proc[2], TARGET_BRIEF_PROCESS))
    print(f"\nedit -> brief parts (medians): build_brief in the worker "
          f"{statistics.median(edit['worker']) * 1e3:.1f} ms, push into the widgets "
          f"{statistics.median(edit['push']) * 1e3:.1f} ms")
    return 0


if __name__ == "__main__":
    sys.exit(main())
