"""Time and memory of `briefer import-runways` on a 100 MB runways file made of invented rows.

Run by hand: `python benchmarks/bench_import.py [--mb 100] [--runs 3] [--keep DIR]`.
Target (runway import issue): a 100 MB runways.csv imports in under 5 s and 200 MB of memory.

The file is written once into a temporary folder in the open airport database's column layout
(invented identifiers ZZ000001..., invented positions), with the wanted airport's rows at the very
end (the worst case for a scan). Reported, medians of fresh processes:
  "import"     = the whole command (Python start-up and imports included), and its peak
                 resident memory (the child's maxrss);
  "line scan"  = the yardstick measured in the same run: a plain Python loop over the file's
                 lines in binary mode, no parsing (the least any streaming reader must do);
  "csv.reader" = the csv module over every row (what a reader without the line filter costs).
"""

from __future__ import annotations

import argparse
import csv
import os
import random
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HEADER = ["id", "airport_ref", "airport_ident", "length_ft", "width_ft", "surface", "lighted", "closed",
          "le_ident", "le_latitude_deg", "le_longitude_deg", "le_elevation_ft", "le_heading_degT",
          "le_displaced_threshold_ft", "he_ident", "he_latitude_deg", "he_longitude_deg", "he_elevation_ft",
          "he_heading_degT", "he_displaced_threshold_ft"]
EXAMPLES = Path(__file__).resolve().parents[1] / "examples" / "open-airport-data"


def make_files(folder: Path, megabytes: int) -> tuple[Path, Path]:
    rnd = random.Random(20261203)
    runways = folder / "runways.csv"
    with open(runways, "w", newline="") as fh:
        w = csv.writer(fh, quoting=csv.QUOTE_NONNUMERIC, lineterminator="\n")
        w.writerow(HEADER)
        n = 0
        while fh.tell() < megabytes * 1_000_000:
            n += 1
            lat, lon = rnd.uniform(-60, 60), rnd.uniform(-179, 179)
            w.writerow([n, n, f"ZZ{n:06d}", rnd.randint(1500, 12000), rnd.randint(50, 200), "ASP", 1, 0,
                        "09", round(lat, 6), round(lon, 6), rnd.randint(0, 8000), 90.0, "",
                        "27", round(lat, 6), round(lon + 0.02, 6), rnd.randint(0, 8000), 270.0, ""])
        with open(EXAMPLES / "runways.csv", newline="") as src:   # the invented demo rows, last
            next(src)
            fh.write(src.read())
    airports = folder / "airports.csv"
    airports.write_bytes((EXAMPLES / "airports.csv").read_bytes())
    return airports, runways


def child(cmd: list[str]) -> tuple[float, float]:
    """(seconds, peak resident MB) of one fresh process."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    t0 = time.perf_counter()
    subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL)
    seconds = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    return seconds, max(after, before) / 1024.0      # ru_maxrss is in KiB on Linux


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--mb", type=int, default=100, help="size of the runways file in MB (default 100)")
    parser.add_argument("--runs", type=int, default=3, help="fresh processes per measurement (default 3)")
    parser.add_argument("--keep", type=Path, help="write the files here and keep them")
    args = parser.parse_args()
    folder = args.keep or Path(tempfile.mkdtemp(prefix="bench-import-"))
    folder.mkdir(parents=True, exist_ok=True)
    airports, runways = make_files(folder, args.mb)
    size_mb = runways.stat().st_size / 1e6
    out = folder / "out"
    out.mkdir(exist_ok=True)
    imp = [sys.executable, "-m", "briefer", "import-runways", "Q7HM", "--airports", str(airports),
           "--runways", str(runways), "--out", str(out), "--overwrite"]
    scan = [sys.executable, "-c", f"n=0\nfor line in open({str(runways)!r}, 'rb'): n += 1"]
    full = [sys.executable, "-c", f"import csv\nn=0\nfor r in csv.reader(open({str(runways)!r}, newline='')): n += 1"]
    # The child's peak memory is only seen once it is the largest so far: run the import first.
    results = {}
    for name, cmd in (("import", imp), ("line scan", scan), ("csv.reader", full)):
        runs = [child(cmd) for _ in range(args.runs)]
        results[name] = (statistics.median(r[0] for r in runs), max(r[1] for r in runs))
    print(f"runways.csv: {size_mb:.0f} MB, {os.cpu_count()} CPUs, Python {sys.version.split()[0]}")
    base = results["line scan"][0]
    for name, (sec, mb) in results.items():
        mem = f"{mb:6.0f} MB peak" if name == "import" else ""
        print(f"  {name:10s} {sec:6.2f} s  ({sec / base:4.2f} x line scan)  {mem}")
    sec, mb = results["import"]
    verdict = "meets" if (sec < 5.0 and mb < 200.0) else "MISSES"
    print(f"target: under 5 s and 200 MB for 100 MB: {verdict} ({sec:.2f} s, {mb:.0f} MB)")
    if not args.keep:
        for p in (out / "q7hm.yaml", airports, runways):
            p.unlink(missing_ok=True)
        out.rmdir()
        folder.rmdir()


if __name__ == "__main__":
    main()
