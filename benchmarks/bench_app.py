"""App speed, run by hand: `python benchmarks/bench_app.py`.

1. `briefer --version` start-up vs `python -c pass` (target: within 2x; must not import Textual).
2. The app's first frame vs a minimal Textual app's first frame, in a fresh process each
   (headless run_test; target within 1.5x). "First frame" = the screen is composed and painted;
   the brief itself follows in a worker, timed separately ("first brief").
3. Recompute + redraw after a keystroke (in process, headless; target <= 16 ms median): the time
   from an edit of the wind field to the brief shown, and build_brief alone for comparison.
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
from textual.app import App
from textual.widgets import Footer, Static
class Minimal(App):
    def compose(self):
        yield Static("hello"); yield Footer()
async def main():
    app = Minimal()
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        print(time.perf_counter() - t0)
import asyncio; asyncio.run(main())
"""

BRIEFER_APP = r"""
import sys, time
t0 = time.perf_counter()
from briefer.cli import build_parser
from briefer.commands.app import inputs_from_args
from briefer.tui.app import BriefingApp
async def main():
    p, _ = build_parser(); args = p.parse_args(["app"])
    cat, inputs, _ = inputs_from_args(args)
    app = BriefingApp(cat, inputs)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        t1 = time.perf_counter() - t0
        while not (app.settled and app.brief is not None):
            await pilot.pause(0.005)
        print(t1, time.perf_counter() - t0)
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

    async def run() -> list[float]:
        sys.path.insert(0, "tests")
        from test_app_support import demo_catalog, demo_inputs, settle

        from briefer.tui.app import BriefingApp

        app = BriefingApp(demo_catalog(), demo_inputs(), debounce_s=0.0)
        out = []
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            await pilot.press("4")
            await pilot.pause()
            from textual.widgets import Input

            wind = app.main.query_one("#wind", Input)
            for i in range(RUNS * 2):
                text = f"{250 + i}/15"
                t = time.perf_counter()
                wind.value = text                      # what one keystroke ends in: a new field value
                while not (app.settled and app.brief_inputs == app.inputs and
                           app.inputs.weather.wind_from_deg == 250 + i):
                    await asyncio.sleep(0.0005)
                app.main.refresh()
                await pilot.pause()                    # the redraw
                out.append(time.perf_counter() - t)
        return out

    ks = asyncio.run(run())
    print(f"build_brief alone         {median_ms(bb)}")
    print(f"edit -> brief shown       {median_ms(ks)}  (headless, debounce 0; the app waits 100 ms first)")


if __name__ == "__main__":
    startup()
    first_frame()
    keystroke()
