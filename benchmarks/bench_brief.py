"""Benchmark: one brief, one wind envelope, and the whole `briefer brief --demo` process.

Run by hand: ``python benchmarks/bench_brief.py [--repeat N] [--profile]``. Prints medians (after
a warm-up) against the targets, each figure as a ratio against its yardstick measured in the same
run (interleaved, medians): build_brief and envelope_for against the plain-Python scalar reference
envelope on a fixed grid; ``briefer --version`` against ``python -c pass`` (target <= 2x) and
``briefer brief --demo`` against ``python -c "import numpy, yaml, rich.console"`` (target <= 1.3x).
With ``--profile``, the top functions of a cProfile run of each, by cumulative time.

Targets: build_brief(demo_request()) <= 5 ms; envelope_for(demo_request()) on the default
36 x 41 grid <= 50 ms (the real envelope: protected area, sectors, roll-out steps, roll ramps).

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


def _yardstick_envelope() -> Callable[[], object]:
    """The in-process yardstick: the plain-Python scalar reference envelope (one cell, one level,
    one candidate, one point at a time) on a fixed 6 x 5 grid of the bench_envelope scenario."""
    sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
    from bench_envelope import AREA_R_M, VIS_M, scenario, stadium_margin_scalar
    from envelope_scalar_reference import envelope_scalar

    inp = scenario()
    return lambda: envelope_scalar(inp, margin_track_fn=stadium_margin_scalar, visibility_m=VIS_M,  # noqa: E731
                                   bank_limit_deg=30.0, area_radius_m=AREA_R_M,
                                   wind_from_relative_deg=[0.0, 60.0, 120.0, 180.0, 240.0, 300.0],
                                   wind_speed_kt=[0.0, 10.0, 20.0, 30.0, 40.0])


def _once_ms(fn: Callable[[], object], calls: int) -> float:
    """Median CPU time of this process over ``calls`` calls of fn (on a shared machine the CPU
    time moves less than the wall time with the other load). [ms]"""
    t = []
    for _ in range(calls):
        t0 = time.process_time()
        fn()
        t.append((time.process_time() - t0) * 1e3)
    return statistics.median(t)


def interleaved_ratios(figures: dict[str, Callable[[], object]], yardstick: Callable[[], object], *, rounds: int,
                       calls: dict[str, int]) -> dict[str, tuple[float, float, float]]:
    """Per figure: (median CPU ms, median yardstick CPU ms, median of the per-round ratios), the
    figure and the yardstick timed in turn in every round (the machine's speed drifts)."""
    out: dict[str, list[tuple[float, float]]] = {k: [] for k in figures}
    for _ in range(rounds):
        for name, fn in figures.items():
            y = _once_ms(yardstick, 1)
            f = _once_ms(fn, calls[name])
            out[name].append((f, y))
    return {k: (statistics.median(f for f, _ in v), statistics.median(y for _, y in v),
                statistics.median(f / y for f, y in v)) for k, v in out.items()}


def process_pairs(a: list[str], b: list[str], *, runs: int) -> tuple[float, float, float]:
    """(median ms of A, median ms of B, median of the pairwise ratios A/B), A and B run in turn."""
    env = dict(os.environ, COLUMNS="100")
    pairs = []
    for _ in range(runs + 1):
        t = []
        for cmd in (a, b):
            t0 = time.perf_counter()
            subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL, env=env)
            t.append((time.perf_counter() - t0) * 1e3)
        pairs.append(tuple(t))
    pairs = pairs[1:]                                   # the first pair warms the file cache
    return (statistics.median(x for x, _ in pairs), statistics.median(y for _, y in pairs),
            statistics.median(x / y for x, y in pairs))


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeat", type=int, default=30, help="timed calls per figure (default 30)")
    p.add_argument("--rounds", type=int, default=9, help="interleaved rounds for the ratios (default 9)")
    p.add_argument("--process-repeat", type=int, default=15, help="process pairs (default 15)")
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
    yard = _yardstick_envelope()
    yard()
    print("\nratios against the yardstick measured in the same run (interleaved rounds, medians of CPU time); "
          "yardstick: the plain-Python scalar reference envelope, 6 x 5 cells of the bench_envelope scenario")
    res = interleaved_ratios({"build_brief(demo_request())": brief, "envelope_for(demo_request())": envelope},
                             yard, rounds=args.rounds,
                             calls={"build_brief(demo_request())": 9, "envelope_for(demo_request())": 1})
    for name, (f, y, r) in res.items():
        print(f"  {name:<34} {f:8.2f} ms  yardstick {y:8.2f} ms  ratio {r:.4f}")

    # whole processes against their yardsticks, in turn (bytecode compiled first, as an installed
    # package is: a tree run with PYTHONDONTWRITEBYTECODE would otherwise compile on every start)
    root = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    subprocess.run([sys.executable, "-m", "compileall", "-q", os.path.join(root, "briefer")], check=True,
                   stdout=subprocess.DEVNULL)
    py = sys.executable
    print("\nwhole processes, A and B in turn (medians; ratio = median of the pairwise A/B):")
    for label, a, b, target in (
            ("briefer --version / python -c pass", [py, "-m", "briefer", "--version"], [py, "-c", "pass"], 2.0),
            ("briefer brief --demo / import numpy, yaml, rich.console", [py, "-m", "briefer", "brief", "--demo"],
             [py, "-c", "import numpy, yaml, rich.console"], 1.3)):
        ma, mb, r = process_pairs(a, b, runs=args.process_repeat)
        print(f"  {label:<58} {ma:7.1f} / {mb:7.1f} ms  ratio {r:.2f}  target <= {target:g}: "
              f"{'OK' if r <= target else 'MISSED'}")
    if args.profile:
        print("\nbuild_brief hotspots (briefer functions, cumulative):")
        print(profile_top(brief, calls=20, top=args.top))
        print("envelope_for hotspots (briefer functions, cumulative):")
        print(profile_top(envelope, calls=3, top=args.top))
    return 0


if __name__ == "__main__":
    sys.exit(main())
