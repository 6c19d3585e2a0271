"""Time the kneeboard card: in process (layout, PDF, text) and as a whole command.

Run by hand: `python benchmarks/bench_card.py [--runs N]`. Prints medians (and min-max).
Target (issue 6): a PDF card in well under a second, and the whole
`briefer brief --demo --out x.pdf --force` command under a second. An earlier measurement gave
7 ms for a much simpler fpdf2 card and 260-340 ms to import fpdf.

In process (the brief built once, fpdf already imported):
  "layout" = card_layout (the plan-view scene and every line of text);
  "pdf"    = card_pdf_bytes (layout, fitting the page, drawing, output);
  "text"   = card_text (layout and the 80-column card with the ASCII plan view).
Whole command (a fresh process each run, warm disk cache): the PDF card, the text card, and the
same command without a card (the difference is the card's share, the fpdf import included).
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from briefer.brief import build_brief, demo_request
from briefer.render.card import card_pdf_bytes, card_text
from briefer.render.card_layout import card_layout

BRIEFER = [sys.executable, "-m", "briefer"]


def timed(fn, repeats: int) -> tuple[float, float, float]:
    fn()  # warm up (imports fpdf the first time)
    out = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        out.append((time.perf_counter() - t0) * 1e3)
    return statistics.median(out), min(out), max(out)


def command(args: list[str], runs: int) -> tuple[float, float, float]:
    out = []
    env = dict(os.environ, NO_COLOR="1")
    for _ in range(runs):
        t0 = time.perf_counter()
        subprocess.run(BRIEFER + args, check=True, stdout=subprocess.DEVNULL, env=env)
        out.append((time.perf_counter() - t0) * 1e3)
    return statistics.median(out), min(out), max(out)


def fmt(t: tuple[float, float, float]) -> str:
    return f"{t[0]:8.1f} ms  ({t[1]:.1f}-{t[2]:.1f})"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=9, help="fresh processes per command (default 9)")
    parser.add_argument("--repeats", type=int, default=30, help="in-process repeats (default 30)")
    args = parser.parse_args()

    t0 = time.perf_counter()
    import fpdf  # noqa: F401  (timed once: the import the PDF command pays)
    print(f"import fpdf (this process, once)       {(time.perf_counter() - t0) * 1e3:8.1f} ms")
    brief = build_brief(demo_request(), computed_utc="2000-01-01 12:00Z")
    print(f"in process, demo brief, {args.repeats} repeats:")
    print(f"  layout                               {fmt(timed(lambda: card_layout(brief), args.repeats))}")
    print(f"  pdf (half-letter)                    {fmt(timed(lambda: card_pdf_bytes(brief), args.repeats))}")
    print(f"  pdf (A5)                             {fmt(timed(lambda: card_pdf_bytes(brief, page='a5'), args.repeats))}")
    print(f"  text                                 {fmt(timed(lambda: card_text(brief), args.repeats))}")
    print(f"  pdf size                             {len(card_pdf_bytes(brief)):8d} bytes")

    with tempfile.TemporaryDirectory() as tmp:
        pdf, txt = str(Path(tmp) / "x.pdf"), str(Path(tmp) / "x.txt")
        print(f"whole command, fresh process, {args.runs} runs:")
        print(f"  briefer brief --demo --out x.pdf --force  {fmt(command(['brief', '--demo', '--out', pdf, '--force'], args.runs))}")
        print(f"  briefer brief --demo --out x.txt --force  {fmt(command(['brief', '--demo', '--out', txt, '--force'], args.runs))}")
        print(f"  briefer brief --demo (no card)            {fmt(command(['brief', '--demo'], args.runs))}")
        print(f"  briefer --version                         {fmt(command(['--version'], args.runs))}")
    print(f"load average {os.getloadavg()[0]:.2f} on {os.cpu_count()} CPUs (figures are noisy above ~1 per CPU)")


if __name__ == "__main__":
    main()
