"""Benchmark: the vectorised wind envelope against the plain-Python scalar reference.

Run by hand: ``python benchmarks/bench_envelope.py``. Prints medians and the ratio, checks that
both give the same verdicts, and times one plan solve and a full candidate ranking.

Targets (issue 4): envelope of 36 directions x 41 speeds with every plan candidate <= 50 ms and
>= 50x faster than the scalar reference; the plan solving of one brief <= 5 ms.

The scenario (invented): 120 kt TAS, 25 deg bank target, 30 deg limit, arrival on the
reciprocal course 1.5 km past the far end of a 2500 m runway, 600 ft circling height, 4500 m
visibility, a
stadium-shaped area of R = 2.66 NM about the runway (one R about both thresholds).
Two more arrivals time the overfly circuit: ALIGNED with the landing runway 1250 m past its
threshold (both circuit sides), and 20 deg off it, 2 km before the threshold (the direct turn
and both circuit sides). A fourth crosses at 42 deg from 1550 m right of the runway, 2 km past
its threshold: the downwind join reaches beyond one final turn's offset (the wider downwind
with a base leg) and the direct turn.

The machine may be shared: each timing prints the median and the best run (the best is the
figure least disturbed by other load).
"""

from __future__ import annotations

import math
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))

from envelope_scalar_reference import envelope_scalar  # noqa: E402

from briefer.core.maneuver import (  # noqa: E402
    CircleInputs,
    candidate_plans,
    choose_plan,
    runway_wind_from,
    solve_plan,
    wind_envelope,
)
from briefer.units import NM_TO_M  # noqa: E402

RUNWAY_M = 2500.0
AREA_R_M = 2.66 * NM_TO_M
VIS_M = 4500.0


def stadium_margin(tracks: np.ndarray) -> np.ndarray:
    """Vectorised margin of tracks (..., N, 2): R minus the largest distance to the runway."""
    x, y = tracks[..., 0], tracks[..., 1]
    dx = x - np.minimum(np.maximum(x, 0.0), RUNWAY_M)
    return AREA_R_M - np.sqrt(np.max(dx * dx + y * y, axis=-1))


def stadium_margin_scalar(points: list[tuple[float, float]]) -> float:
    """Same margin, one point at a time."""
    worst = math.inf
    for x, y in points:
        worst = min(worst, AREA_R_M - math.hypot(x - min(max(x, 0.0), RUNWAY_M), y))
    return worst


def scenario(**kw: object) -> CircleInputs:
    base = dict(tas_kt=120.0, bank_deg=25.0, wind=runway_wind_from(0.0, 0.0), arrival_x_m=RUNWAY_M + 1500.0,
                arrival_y_m=0.0, arrival_course_deg=180.0, circling_height_ft=600.0, runway_length_m=RUNWAY_M)
    base.update(kw)
    return CircleInputs(**base)  # type: ignore[arg-type]


def timings_ms(fn, repeat: int) -> tuple[float, float]:
    """(median, best) of ``repeat`` runs. [ms]"""
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times) * 1e3, min(times) * 1e3


def median_ms(fn, repeat: int) -> float:
    return timings_ms(fn, repeat)[0]


def main() -> None:
    inp = scenario()
    dirs = np.arange(0.0, 360.0, 10.0)
    spds = np.arange(0.0, 41.0, 1.0)
    kw = dict(visibility_m=VIS_M, bank_limit_deg=30.0, area_radius_m=AREA_R_M)

    def vec():
        return wind_envelope(inp, margin_fn=stadium_margin, wind_from_relative_deg=dirs, wind_speed_kt=spds, **kw)

    def ref():
        return envelope_scalar(inp, margin_track_fn=stadium_margin_scalar, wind_from_relative_deg=list(dirs),
                               wind_speed_kt=list(spds), **kw)

    env = vec()
    t_vec, t_vec_best = timings_ms(vec, 31)
    t_ref = median_ms(ref, 3)
    r = ref()
    same = np.array_equal(env.status, np.array(r["status"])) and np.array_equal(env.reasons, np.array(r["reasons"]))
    print(f"grid {dirs.size} directions x {spds.size} speeds = {dirs.size * spds.size} cells, "
          f"{len(env.candidates)} candidates: {', '.join(f'{s} {d}' for s, d in env.candidates)}")
    print(f"vectorised envelope   median {t_vec:8.2f} ms  best {t_vec_best:8.2f} ms  (31 runs)")
    print(f"scalar reference      median {t_ref:8.1f} ms  (3 runs)")
    print(f"ratio                        {t_ref / t_vec:8.1f} x")
    print(f"same verdicts and reasons: {same}")
    counts = {name: int((env.status == code).sum()) for code, name in ((2, "fits"), (1, "marginal"),
                                                                      (0, "does not fit"))}
    print(f"cells: {counts}")

    for label, arr in (("aligned", scenario(arrival_x_m=1250.0, arrival_course_deg=0.0)),
                       ("20 deg off", scenario(arrival_x_m=-2000.0, arrival_y_m=-700.0, arrival_course_deg=20.0)),
                       ("42 deg crossing, wide join", scenario(arrival_x_m=2000.0, arrival_y_m=1550.0,
                                                               arrival_course_deg=42.0))):
        def vec_arr(arr=arr):
            return wind_envelope(arr, margin_fn=stadium_margin, wind_from_relative_deg=dirs, wind_speed_kt=spds, **kw)
        e = vec_arr()
        med, best = timings_ms(vec_arr, 31)
        print(f"vectorised envelope, {label} arrival ({len(e.candidates)} candidates: "
              f"{', '.join(f'{s} {d}' for s, d in e.candidates)})  median {med:8.2f} ms  best {best:8.2f} ms")
    arr = scenario(arrival_x_m=1250.0, arrival_course_deg=0.0)
    e = wind_envelope(arr, margin_fn=stadium_margin, wind_from_relative_deg=dirs, wind_speed_kt=spds, **kw)
    r = envelope_scalar(arr, margin_track_fn=stadium_margin_scalar, wind_from_relative_deg=list(dirs),
                        wind_speed_kt=list(spds), **kw)
    print("aligned arrival, same verdicts and reasons as the scalar reference: "
          f"{np.array_equal(e.status, np.array(r['status'])) and np.array_equal(e.reasons, np.array(r['reasons']))}")

    inp_ramps = scenario(roll_rate_deg_per_s=5.0)
    t_ramps = median_ms(lambda: wind_envelope(inp_ramps, margin_fn=stadium_margin, **kw), 7)
    print(f"vectorised envelope with 5 deg/s roll ramps  median {t_ramps:8.2f} ms  (7 runs)")

    windy = scenario(wind=runway_wind_from(60.0, 20.0))
    t_one = median_ms(lambda: solve_plan(windy, shape="break-and-return", side="left"), 201)
    t_all = median_ms(lambda: candidate_plans(windy), 101)
    t_choose = median_ms(lambda: choose_plan(windy, margin_fn=stadium_margin, **kw), 101)
    print(f"one plan solve (Plan with its track)   median {t_one:6.2f} ms")
    print(f"all {len(candidate_plans(windy))} candidate plans                 median {t_all:6.2f} ms")
    print(f"choose_plan (solve + rank, bank steps) median {t_choose:6.2f} ms")


if __name__ == "__main__":
    main()
