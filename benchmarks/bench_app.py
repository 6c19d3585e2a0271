"""App speed, run by hand: `python benchmarks/bench_app.py`.

1. `briefer --version` start-up vs `python -c pass` (target: within 2x; must not import Textual).
2. The app's first frame vs a minimal Textual app's first frame, in a fresh process each
   (headless run_test; target within 1.5x). "First frame" = the first screen update written to the
   (headless) terminal, timed from the process's first line (imports included); the brief itself
   follows in a worker, timed separately ("first brief"). (This was the end of the first
   `pilot.pause()` before, which waits for an idle CPU, i.e. for the first brief too.)
3. Recompute + redraw after a keystroke (in process, headless; target <= 16 ms median): the time
   from an edit of the wind field to the brief shown, split into (b) build_brief in the worker and
   (c) pushing the results into the widgets, then a forced full-screen repaint; build_brief alone
   for comparison.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time

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
async def main():
    p, _ = build_parser(); args = p.parse_args(["app"])
    cat, inputs, _ = inputs_from_args(args)
    app = BriefingApp(cat, inputs)
    async with app.run_test(size=(80, 24)) as pilot:
        while not (app.settled and app.brief is not None):
            await pilot.pause(0.005)
        print(_first[0], time.perf_counter() - t0)
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


def first_frame() -> None:
    minimal = [float(subprocess.run([PY, "-c", MINIMAL_APP], capture_output=True, text=True, check=True)
                     .stdout.split()[-1]) for _ in range(RUNS)]
    frames, briefs = [], []
    for _ in range(RUNS):
        a, b = subprocess.run([PY, "-c", BRIEFER_APP], capture_output=True, text=True, check=True).stdout.split()[-2:]
        frames.append(float(a))
        briefs.append(float(b))
    print(f"minimal app first frame   {median_ms(minimal)}")
    print(f"briefer app first frame   {median_ms(frames)}   ratio "
          f"{statistics.median(frames) / statistics.median(minimal):.2f}x")
    print(f"briefer app first brief   {median_ms(briefs)}")


def keystroke() -> None:
    import asyncio

    from briefer.brief import build_brief, demo_request

    req = demo_request()
    build_brief(req)
    bb = []
    for _ in range(RUNS * 2):
        t = time.perf_counter()
        build_brief(req)
        bb.append(time.perf_counter() - t)

    async def run() -> dict[str, list[float]]:
        sys.path.insert(0, "tests")
        from test_app_support import demo_catalog, demo_inputs, settle

        import briefer.brief
        from briefer.tui.app import BriefingApp

        parts: dict[str, list[float]] = {"worker": [], "push": [], "settled": [], "repaint": []}
        real_build = briefer.brief.build_brief

        def timed_build(*a, **k):                 # (b) build_brief as the worker runs it
            t = time.perf_counter()
            try:
                return real_build(*a, **k)
            finally:
                parts["worker"].append(time.perf_counter() - t)

        briefer.brief.build_brief = timed_build
        real_done = BriefingApp._brief_done

        def timed_done(self, *a):                 # (c) pushing the results into the widgets
            t = time.perf_counter()
            real_done(self, *a)
            parts["push"].append(time.perf_counter() - t)

        BriefingApp._brief_done = timed_done
        app = BriefingApp(demo_catalog(), demo_inputs(), debounce_s=0.0)
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            await pilot.press("4")
            await pilot.pause()
            from textual.widgets import Input

            wind = app.main.query_one("#wind", Input)
            for key in parts:
                parts[key].clear()
            for i in range(RUNS * 2):
                text = f"{250 + i}/15"
                t = time.perf_counter()
                wind.value = text                      # what one keystroke ends in: a new field value
                while not (app.settled and app.brief_inputs == app.inputs and
                           app.inputs.weather.wind_from_deg == 250 + i):
                    await asyncio.sleep(0.0005)
                t2 = time.perf_counter()
                parts["settled"].append(t2 - t)
                app.main.refresh()
                await pilot.pause()                    # a full repaint of the screen (more than a keystroke needs)
                parts["repaint"].append(time.perf_counter() - t2)
        BriefingApp._brief_done = real_done
        briefer.brief.build_brief = real_build
        return parts

    parts = asyncio.run(run())
    print(f"build_brief alone         {median_ms(bb)}")
    print(f"edit -> brief shown       {median_ms(parts['settled'])}  (headless, debounce 0; the app waits "
          f"100 ms first)")
    print(f"  (b) build_brief, worker {median_ms(parts['worker'])}")
    print(f"  (c) push to widgets     {median_ms(parts['push'])}")
    print(f"  full-screen repaint     {median_ms(parts['repaint'])}  (forced refresh of every widget + pause)")


if __name__ == "__main__":
    startup()
    first_frame()
    keystroke()
