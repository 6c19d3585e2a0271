"""Time drawing a typical plan view on braille/ASCII canvases and as paper primitives.

Run by hand: `python benchmarks/bench_canvas.py`. Prints medians (and min-max) over repeats.
Target: a few ms per frame at the 80x24 plan size (48x20 cells); an earlier measurement of
Textual's whole render pipeline on a simpler drawing gave 1.7-3.1 ms.

"draw" = `render_plan` (new canvas, fit, every item, labels, north arrow, scale bar);
"+rich" = draw, then render the canvas into Rich segments (what Textual's `render()` costs);
"+text" = draw, then `to_text()` (the text card).
"""

from __future__ import annotations

import io
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))

from rich.console import Console  # noqa: E402
from test_scene import example_scene  # noqa: E402  (the shared invented example)

from briefer.render.planview import render_plan  # noqa: E402
from briefer.render.paper import scene_to_primitives  # noqa: E402

REPEATS = 200


def timed(fn, repeats=REPEATS):
    fn()  # warm up
    out = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        out.append((time.perf_counter() - t0) * 1e3)
    return statistics.median(out), min(out), max(out)


def main() -> None:
    console = Console(file=io.StringIO(), width=200, color_system="truecolor", force_terminal=True)
    scenes = {"arcs of 24 pts": example_scene(n=24), "arcs of 360 pts": example_scene(n=360)}
    print(f"{'scene':16} {'canvas':8} {'cells':>7}  {'draw ms':>18}  {'+rich ms':>18}  {'+text ms':>18}")
    for name, scene in scenes.items():
        npts = sum(len(getattr(i, "points", ())) for i in scene.items)
        for ascii in (False, True):
            for cols, rows in ((48, 20), (128, 45)):
                kind = "ascii" if ascii else "braille"
                draw = timed(lambda: render_plan(scene, cols, rows, ascii=ascii))
                rich = timed(lambda: list(console.render(render_plan(scene, cols, rows, ascii=ascii))))
                text = timed(lambda: render_plan(scene, cols, rows, ascii=ascii).to_text())
                cells = [f"{m:6.2f} ({lo:.2f}-{hi:.2f})" for m, lo, hi in (draw, rich, text)]
                print(f"{name:16} {kind:8} {cols:>3}x{rows:<3}  " + "  ".join(cells))
        prims = timed(lambda: scene_to_primitives(scene, (8, 8, 120, 90)), repeats=50)
        print(f"{name:16} primitives 120x90 mm: {prims[0]:.2f} ms "
              f"({npts} polyline points)")


if __name__ == "__main__":
    main()
