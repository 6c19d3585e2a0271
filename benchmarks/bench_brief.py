"""Benchmark: one brief, one wind envelope, and the whole `briefer brief --demo` process.

Run by hand: ``python benchmarks/bench_brief.py [--repeat N] [--profile]``. Prints medians (after
a warm-up) against the targets of issue 4, and with ``--profile`` the top functions of a cProfile
run of each, by cumulative time, to show where to speed up.

Targets (issue 4): build_brief(demo_request()) <= 5 ms; envelope_for(demo_request()) on the
default 36 x 41 grid <= 50 ms. The whole-process time has no target; it is printed so that start-up
regressions show.

Timings depend on the machine and its load: compare runs on the same machine, quiet; on a loaded
machine compare the minimum and the CPU median of interleaved runs (old tree, new tree, old, new).
"""

from __future__ import annotations

import argparse
import cProfile
import io
import os
import pstats
import statistics
import subprocess
import sys
import time
from collections.abc import Callable

from briefer.brief import build_brief, demo_request, envelope_for

TARGET_BRIEF_MS = 5.0
TARGET_ENVELOPE_MS = 50.0
COMPUTED_UTC = "2000-01-01 00:00Z"     # fixed, so the clock is not timed


def median_ms(fn: Callable[[], object], *, repeat: int, warmup: int) -> tuple[float, float, float, float]:
    """(median, min, max) wall time of fn() in ms, after `warmup` untimed calls, and the median
    CPU time of this process (less sensitive than wall time to other processes on a loaded machine)."""
    for _ in range(warmup):
        fn()
    times, cpu = [], []
    for _ in range(repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        fn()
        times.append((time.perf_counter() - t0) * 1e3)
        cpu.append((time.process_time() - c0) * 1e3)
    return statistics.median(times), min(times), max(times), statistics.median(cpu)


def process_ms(argv: list[str], *, repeat: int) -> tuple[float, float, float]:
    """(median, min, max) wall time in ms of `python -m briefer <argv>` as a new process."""
    env = dict(os.environ, COLUMNS="100")
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "briefer", *argv], check=True, stdout=subprocess.DEVNULL, env=env)
        times.append((time.perf_counter() - t0) * 1e3)
    return statistics.median(times), min(times), max(times)


def profile_top(fn: Callable[[], object], *, calls: int, top: int) -> str:
    """The `top` functions by cumulative time over `calls` calls of fn (per-call ms)."""
    prof = cProfile.Profile()
    prof.enable()
    for _ in range(calls):
        fn()
    prof.disable()
    stats = pstats.Stats(prof)
    rows = []
    for (file, line, name), (_cc, nc, _tt, ct, _callers) in stats.stats.items():  # type: ignore[attr-defined]
        if "briefer" not in file:
            continue
        short = file.split("briefer/", 1)[-1] if "briefer/" in file else file
        rows.append((ct / calls * 1e3, nc / calls, f"{short}:{line}({name})"))
    rows.sort(reverse=True)
    out = io.StringIO()
    out.write(f"  {'cum ms/call':>11}  {'calls/call':>10}  function\n")
    for ct, nc, where in rows[:top]:
        out.write(f"  {ct:11.2f}  {nc:10.1f}  {where}\n")
    return out.getvalue()


def line(label: str, stats: tuple[float, ...], target: float | None = None) -> str:
    med, lo, hi = stats[:3]
    cpu = f", cpu median {stats[3]:.2f}" if len(stats) > 3 else ""
    verdict = "" if target is None else f"  target <= {target:g} ms: {'OK' if med <= target else 'MISSED'}"
    return f"{label:<44} median {med:8.2f} ms (min {lo:.2f}, max {hi:.2f}{cpu}){verdict}"


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeat", type=int, default=30, help="timed calls per figure (default 30)")
    p.add_argument("--process-repeat", type=int, default=5, help="process runs (default 5)")
    p.add_argument("--profile", action="store_true", help="also print the cProfile hotspots")
    p.add_argument("--top", type=int, default=25, help="hotspots to print (default 25)")
    args = p.parse_args(argv)

    request = demo_request()
    brief = lambda: build_brief(request, computed_utc=COMPUTED_UTC)   # noqa: E731
    envelope = lambda: envelope_for(request)                           # noqa: E731
    env = envelope()
    print(f"envelope grid: {env.status.shape[0]} directions x {env.status.shape[1]} speeds, "
          f"{len(env.candidates)} candidates")
    print(line("build_brief(demo_request())", median_ms(brief, repeat=args.repeat, warmup=5), TARGET_BRIEF_MS))
    print(line("envelope_for(demo_request())", median_ms(envelope, repeat=max(5, args.repeat // 3), warmup=2),
               TARGET_ENVELOPE_MS))
    print(line("briefer brief --demo (whole process)", process_ms(["brief", "--demo"], repeat=args.process_repeat)))
    print(line("briefer brief --demo --json (whole process)",
               process_ms(["brief", "--demo", "--json"], repeat=args.process_repeat)))
    print(line("briefer --version (whole process)", process_ms(["--version"], repeat=args.process_repeat)))
    if args.profile:
        print("\nbuild_brief hotspots (briefer functions, cumulative):")
        print(profile_top(brief, calls=20, top=args.top))
        print("envelope_for hotspots (briefer functions, cumulative):")
        print(profile_top(envelope, calls=3, top=args.top))
    return 0


if __name__ == "__main__":
    sys.exit(main())
