"""App speed, run by hand: `python benchmarks/bench_app.py`.

1. `briefer --version` start-up vs `python -c pass` (target: within 2x; must not import Textual).
2. The app's first frame vs a minimal Textual app's first frame, in a fresh process each
   (headless run_test; target within 1.5x). "First frame" = the first screen update written to the
   (headless) terminal, timed from the process's first line (imports included): the screen's
   frame (title lines, tabs, caution); the step shown follows, filled ("step filled": its lists
   and fields), then the brief, in a worker ("first brief"), each timed separately. (This was the end of the first
   `pilot.pause()` before, which waits for an idle CPU, i.e. for the first brief too.)
3. Edit -> brief shown (in process, headless, with the app's own debounce; target <= 16 ms
   median): from an edit of the wind field to the brief built for it pushed into the widgets and
   the next frame written to the (headless) terminal, with (b) build_brief in the worker and (c)
   the push into the widgets; build_brief alone for comparison. (This was the end of a
   `pilot.pause()` after the push before, which sleeps at least 20 ms and then waits for an idle
   CPU: it timed the pause, not the frame.)
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import time
from collections.abc import Callable

PY = sys.executable
RUNS = 9

MINIMAL_APP = r"""
import sys, time
t0 = time.perf_counter()
from textual.app import App as _App
_first = []
_real_display = _App._display
def _display(self, screen, renderable):     # the first frame: the first update written to the terminal
    if renderable is not None and not _first:
        _first.append(time.perf_counter() - t0)
    return _real_display(self, screen, renderable)
_App._display = _display
from textual.app import App
from textual.widgets import Footer, Static
class Minimal(App):
    def compose(self):
        yield Static("hello"); yield Footer()
async def main():
    app = Minimal()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        print(_first[0])
import asyncio; asyncio.run(main())
"""

BRIEFER_APP = r"""
import sys, time
t0 = time.perf_counter()
from textual.app import App as _App
_first = []
_real_display = _App._display
def _display(self, screen, renderable):     # the first frame: the first update written to the terminal
    if renderable is not None and not _first:
        _first.append(time.perf_counter() - t0)
    return _real_display(self, screen, renderable)
_App._display = _display
from briefer.cli import build_parser
from briefer.commands.app import inputs_from_args
from briefer.tui.app import BriefingApp
_filled = []
_real_push = BriefingApp._push_inputs
def _push(self, *a):                        # the inputs pushed into the lists and fields
    _real_push(self, *a)
    _pushed.append(1)
_pushed = []
BriefingApp._push_inputs = _push
def _display2(self, screen, renderable):    # the first frame after that: the step shown filled
    _display(self, screen, renderable)
    if renderable is not None and _pushed and not _filled and not self._batch_count:
        _filled.append(time.perf_counter() - t0)
_App._display = _display2
async def main():
    try:
        p, _ = build_parser("app")          # what `briefer app` builds: the app command's options only
    except TypeError:                       # an older checkout: every command's options
        p, _ = build_parser()
    args = p.parse_args(["app"])
    cat, inputs, _ = inputs_from_args(args)
    app = BriefingApp(cat, inputs)
    async with app.run_test(size=(80, 24)) as pilot:
        while not (app.settled and app.brief is not None):
            await pilot.pause(0.005)
        print(_filled[0] if _filled else float("nan"), _first[0], time.perf_counter() - t0)
import asyncio; asyncio.run(main())
"""


def wall(cmd: list[str]) -> float:
    t = time.perf_counter()
    subprocess.run(cmd, check=True, capture_output=True)
    return time.perf_counter() - t


def median_ms(values: list[float]) -> str:
    return f"{statistics.median(values) * 1000:7.1f} ms (min {min(values) * 1000:.1f})"


def startup() -> None:
    base = [wall([PY, "-c", "pass"]) for _ in range(RUNS)]
    ver = [wall([PY, "-m", "briefer", "--version"]) for _ in range(RUNS)]
    print(f"python -c pass            {median_ms(base)}")
    print(f"briefer --version         {median_ms(ver)}   ratio {statistics.median(ver) / statistics.median(base):.2f}x")
    code = "import sys; from briefer.cli import main; main(['--version']); print('textual' in sys.modules)"
    out = subprocess.run([PY, "-c", code], capture_output=True, text=True, check=True).stdout.split()[-1]
    print(f"  --version imports Textual: {out}")


def first_frame_pairs(runs: int = RUNS) -> tuple[float, float, float, float, float]:
    """(briefer app first frame, minimal app first frame, median of the pairwise ratios, briefer's
    first brief, briefer's first frame with the step shown filled: its lists and fields), ms,
    medians, the two apps started in turn in fresh processes (the first pair warms the file cache
    and is not counted)."""
    frames, minimal, briefs, filled = [], [], [], []
    for i in range(runs + 1):
        m = float(subprocess.run([PY, "-c", MINIMAL_APP], capture_output=True, text=True, check=True).stdout.split()[-1])
        f, a, b = subprocess.run([PY, "-c", BRIEFER_APP], capture_output=True, text=True, check=True).stdout.split()[-3:]
        if i:
            minimal.append(m)
            frames.append(float(a))
            briefs.append(float(b))
            filled.append(float(f))
    return (statistics.median(frames) * 1e3, statistics.median(minimal) * 1e3,
            statistics.median(f / m for f, m in zip(frames, minimal)), statistics.median(briefs) * 1e3,
            statistics.median(filled) * 1e3)


def first_frame() -> None:
    app, minimal, ratio, brief, filled = first_frame_pairs()
    print(f"minimal app first frame   {minimal:7.1f} ms")
    print(f"briefer app first frame   {app:7.1f} ms   ratio {ratio:.2f}x (median of pairs)")
    print(f"briefer app step filled   {filled:7.1f} ms   (the first frame with the step's lists and fields)")
    print(f"briefer app first brief   {brief:7.1f} ms")


def edit_to_brief(runs: int = RUNS * 2, yardstick: Callable[[], object] | None = None
                  ) -> dict[str, list[float]]:
    """Edit -> brief shown in the app as a user has it (headless, the app's own debounce, on the
    weather step): from a new value in the wind field (what a keystroke ends in) to the brief built for it pushed into
    the widgets and the next frame written. Also (b) build_brief in the worker, (c) the push into
    the widgets, (d) the app thread's CPU time from the edit to that frame (the worker's is not in
    it: a figure the load moves less); with ``yardstick``, its wall time just before each edit. [s]"""
    import asyncio

    async def run() -> dict[str, list[float]]:
        sys.path.insert(0, os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "tests"))
        from test_app_support import demo_catalog, demo_inputs, settle
        from textual.widgets import Input

        import briefer.brief
        from briefer.tui.app import BriefingApp

        parts: dict[str, list[float]] = {"worker": [], "push": [], "shown": [], "app_cpu": [], "yardstick": []}
        real_build = briefer.brief.build_brief

        def timed_build(*a, **k):                 # (b) build_brief as the worker runs it
            t = time.perf_counter()
            try:
                return real_build(*a, **k)
            finally:
                parts["worker"].append(time.perf_counter() - t)

        briefer.brief.build_brief = timed_build
        real_done = BriefingApp._brief_done

        pushed = asyncio.Event()
        pushed_at: list[float] = []

        def timed_done(self, *a):                 # (c) pushing the results into the widgets
            t = time.perf_counter()
            real_done(self, *a)
            pushed_at.append(time.perf_counter())
            parts["push"].append(pushed_at[-1] - t)
            pushed.set()

        BriefingApp._brief_done = timed_done
        real_display = BriefingApp._display
        frames: list[float] = []
        frame_cpu: list[float] = []               # the app thread's CPU time at each frame
        framed = asyncio.Event()

        def timed_display(self, screen, renderable):   # a frame written to the terminal
            real_display(self, screen, renderable)
            if renderable is not None and not self._batch_count:
                if self.is_headless and hasattr(renderable, "render_segments"):
                    renderable.render_segments(self.console)   # the bytes a real terminal is sent
                frames.append(time.perf_counter())
                frame_cpu.append(time.thread_time())
                framed.set()

        BriefingApp._display = timed_display
        try:
            app = BriefingApp(demo_catalog(), demo_inputs())
            async with app.run_test(size=(80, 24)) as pilot:
                await settle(app, pilot)
                await pilot.press("4")                 # the weather step, where a crew types the wind
                await settle(app, pilot)
                wind = app.main.query_one("#wind", Input)
                for i in range(runs + 2):
                    if i == 2:                         # the first two edits warm up
                        for v in parts.values():
                            v.clear()
                    if yardstick is not None:
                        t = time.perf_counter()
                        yardstick()
                        parts["yardstick"].append(time.perf_counter() - t)
                    text = f"{250 + i}/15"
                    pushed.clear()
                    t, cpu = time.perf_counter(), time.thread_time()
                    wind.value = text                  # what one keystroke ends in: a new field value
                    while not (app.settled and app.brief_inputs == app.inputs
                               and app.inputs.weather.wind_from_deg == 250 + i):
                        await asyncio.wait_for(pushed.wait(), timeout=10.0)   # no polling: it would
                        pushed.clear()                                        # take the worker's CPU
                    done = pushed_at[-1]               # the brief is in the widgets: its frame next
                    while not (frames and frames[-1] >= done):
                        framed.clear()
                        await asyncio.wait_for(framed.wait(), timeout=10.0)
                    k = next(k for k, f in enumerate(frames) if f >= done)
                    parts["shown"].append(frames[k] - t)
                    parts["app_cpu"].append(frame_cpu[k] - cpu)
                    await pilot.pause()                # idle again before the next edit (not timed)
        finally:
            BriefingApp._display = real_display
            BriefingApp._brief_done = real_done
            briefer.brief.build_brief = real_build
        return parts

    return asyncio.run(run())


def keystroke() -> None:
    from briefer.brief import build_brief, demo_request

    req = demo_request()
    build_brief(req)
    bb = []
    for _ in range(RUNS * 2):
        t = time.perf_counter()
        build_brief(req)
        bb.append(time.perf_counter() - t)
    parts = edit_to_brief()
    print(f"build_brief alone         {median_ms(bb)}")
    print(f"edit -> brief shown       {median_ms(parts['shown'])}  (headless, the app's own debounce)")
    print(f"  (b) build_brief, worker {median_ms(parts['worker'])}")
    print(f"  (c) push to widgets     {median_ms(parts['push'])}")
    print(f"  (d) the app thread's CPU {median_ms(parts['app_cpu'])}  (from the edit to the frame; the worker's not in it)")


if __name__ == "__main__":
    startup()
    first_frame()
    keystroke()
