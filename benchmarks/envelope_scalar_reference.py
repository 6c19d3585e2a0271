"""Plain-Python scalar reference of the wind envelope (loops and the math module only).

It re-derives everything the vectorised ``briefer.core.manoeuvre.envelope.wind_envelope`` does,
one cell, one candidate, one bank level and one track point at a time, without numpy:
crab angles, turn timing (with optional roll ramps and Gauss-Legendre nodes found here by
Newton's method), the closed-form solve of each plan shape, the track samples, the margins,
the ranking key and the verdicts. ``tests/test_envelope.py`` checks that both agree on a small
grid; ``bench_envelope.py`` times both.

Only the unit constants come from briefer (no bare conversion literal outside units.py).
"""

from __future__ import annotations

import math
from typing import Callable

from briefer.units import FT_TO_M, G0_MPS2, KT_TO_MPS

FITS, MARGINAL, DOES_NOT_FIT = 2, 1, 0
REASON_BANK, REASON_AREA, REASON_VISIBILITY, REASON_WIND, REASON_SECTOR, REASON_STALL = 1, 2, 4, 8, 16, 32
ROLL_OUT_STEPS = (0.66, 0.33, 0.0)     # of the way from the stabilised distance to the descent point
TWO_PI = 2.0 * math.pi
N_RAMP = 3


def legendre_nodes(n: int = 8) -> tuple[list[float], list[float]]:
    """Gauss-Legendre nodes and weights on [-1, 1] by Newton's method on P_n."""
    xs, ws = [], []
    for i in range(1, n + 1):
        x = math.cos(math.pi * (i - 0.25) / (n + 0.5))
        for _ in range(100):
            p0, p1 = 1.0, x
            for k in range(2, n + 1):
                p0, p1 = p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k
            dp = n * (x * p1 - p0) / (x * x - 1.0)
            dx = p1 / dp
            x -= dx
            if abs(dx) < 1e-15:
                break
        xs.append(x)
        ws.append(2.0 / ((1.0 - x * x) * dp * dp))
    return xs, ws


GL_X, GL_W = legendre_nodes(8)


def wrap_2pi(a: float) -> float:
    a = a % TWO_PI
    return 0.0 if a > TWO_PI - 1e-9 else a


def crab(track: float, v: float, wx: float, wy: float) -> tuple[float, float, bool]:
    w_n = -wx * math.sin(track) + wy * math.cos(track)
    w_u = wx * math.cos(track) + wy * math.sin(track)
    q = w_n / v
    ok = abs(q) < 1.0
    q = max(-1.0, min(1.0, q))
    gs = v * math.sqrt(1.0 - q * q) + w_u
    return track - math.asin(q), gs, ok and gs > 0.0


class TurnRef:
    """One turn: timing and the air-mass path of a right turn entered on heading 0."""

    def __init__(self, angle: float, bank: float, v: float, k: float | None) -> None:
        self.a, self.v, self.k = angle, v, k
        if k is None:
            self.wp = G0_MPS2 * math.tan(bank) / v
            self.tr, self.dp, self.c = 0.0, 0.0, 0.0
            self.tc = angle / self.wp
        else:
            self.c = G0_MPS2 / (v * k)
            d_full = self.c * -math.log(math.cos(bank))
            if angle >= 2.0 * d_full:
                phi, self.dp = bank, d_full
            else:
                phi, self.dp = math.acos(math.exp(-angle / (2.0 * self.c))), 0.5 * angle
            self.wp = G0_MPS2 * math.tan(phi) / v
            self.tc = (angle - 2.0 * self.dp) / max(self.wp, 1e-12) if angle >= 2.0 * d_full else 0.0
            self.tr = phi / k
        self.total = 2.0 * self.tr + self.tc

    def _h_in(self, u: float) -> float:
        return self.c * -math.log(math.cos(self.k * u))  # type: ignore[operator]

    def _ramp(self, tau: float) -> tuple[float, float]:
        cs = sn = 0.0
        for x, w in zip(GL_X, GL_W):
            h = self._h_in(0.5 * tau * (x + 1.0))
            cs += 0.5 * tau * w * math.cos(h)
            sn += 0.5 * tau * w * math.sin(h)
        return self.v * cs, self.v * sn

    def air(self, t: float) -> tuple[float, float]:
        tc_ = min(max(t - self.tr, 0.0), self.tc)
        rp = self.v / max(self.wp, 1e-12)
        hb = self.dp + self.wp * tc_
        x = rp * (math.sin(hb) - math.sin(self.dp))
        y = rp * (math.cos(self.dp) - math.cos(hb))
        if self.k is not None:
            c1, s1 = self._ramp(min(t, self.tr))
            cr, sr = self._ramp(self.tr)
            c3, s3 = self._ramp(min(max(self.total - t, 0.0), self.tr))
            ca, sa = math.cos(self.a), math.sin(self.a)
            x += c1 + ca * (cr - c3) + sa * (sr - s3)
            y += s1 + sa * (cr - c3) - ca * (sr - s3)
        return x, y

    def ground(self, t: float, psi0: float, sign: float, wx: float, wy: float) -> tuple[float, float]:
        """Displacement from the turn's start after t seconds."""
        ax, ay = self.air(t)
        c0, s0 = math.cos(psi0), math.sin(psi0)
        return ax * c0 - sign * ay * s0 + wx * t, ax * s0 + sign * ay * c0 + wy * t


def solve(shape: str, sigma: float, c: dict) -> dict:
    """One shape, one side, one wind, one bank: {'ok', 'legs': [...], 'time'} (see the core)."""
    v, wx, wy, bank, k = c["v"], c["wx"], c["wy"], c["bank"], c["k"]
    x0, y0, c0, d = c["x0"], c["y0"], c["c0"], c["d"]
    psi_f, gs_f, ok_f = crab(0.0, v, wx, wy)
    psi_d, gs_d, ok_d = crab(math.pi, v, wx, wy)
    psi0, gs0, ok0 = crab(c0, v, wx, wy)
    g0x, g0y = gs0 * math.cos(c0), gs0 * math.sin(c0)
    ok = ok_f and ok_d and ok0
    legs: list[dict] = []

    def turn(psi_a: float, angle: float, sgn: float, nominal: float) -> dict:
        tr = TurnRef(angle, bank, v, k)
        dx, dy = tr.ground(tr.total, psi_a, sgn, wx, wy)
        return {"kind": "turn", "turn": tr, "psi0": psi_a, "sign": sgn, "dx": dx, "dy": dy, "t": tr.total,
                "nominal": nominal}

    def straight(gx: float, gy: float, t: float) -> dict:
        return {"kind": "straight", "gx": gx, "gy": gy, "t": t}

    try:
        if shape in ("downwind-join", "break-and-return"):
            fin = turn(psi_d, wrap_2pi(sigma * (psi_f - psi_d)), sigma, math.pi)
            x_ri, y_ri = -d - fin["dx"], -fin["dy"]
            final_side = [fin]
            if shape == "downwind-join":
                # offset: the larger of what the 180 deg final turn needs and what the join reaches
                # with no crossing leg; if the join reaches further, base turn + base leg + final turn
                jn = turn(psi0, wrap_2pi(sigma * (psi_d - psi0)), sigma, wrap_2pi(sigma * (math.pi - c0)))
                y_a = y0 + jn["dy"]
                psi_b, gs_b, ok_b = crab(-sigma * math.pi / 2.0, v, wx, wy)
                if sigma * y_a > sigma * y_ri:
                    bt = turn(psi_d, wrap_2pi(sigma * (psi_b - psi_d)), sigma, math.pi / 2.0)
                    fin = turn(psi_b, wrap_2pi(sigma * (psi_f - psi_b)), sigma, math.pi)
                    ok = ok and ok_b and bt["turn"].a < math.pi and fin["turn"].a < math.pi
                    offset = max(sigma * y_a, -sigma * (bt["dy"] + fin["dy"]))
                    t_base = (offset + sigma * (bt["dy"] + fin["dy"])) / gs_b
                    x_ri, y_ri = -d - fin["dx"] - bt["dx"], sigma * offset
                else:
                    bt = turn(psi_d, 0.0, sigma, math.pi / 2.0)      # no base turn: one 180 deg final turn
                    offset, t_base = sigma * y_ri, 0.0
                final_side = [bt, straight(0.0, -sigma * gs_b, t_base), fin]
                ok = ok and offset > 0.0
                tj = (offset - sigma * y_a) / (sigma * g0y)
                xj = x0 + g0x * tj + jn["dx"]
                legs = [straight(g0x, g0y, tj), jn]
            else:
                ok = ok and sigma * y_ri > 0.0
                beta = c["beta"]
                psi_b = psi0 - sigma * beta
                br = turn(psi0, beta, -sigma, beta)
                gbx, gby = v * math.cos(psi_b) + wx, v * math.sin(psi_b) + wy
                jn = turn(psi_b, wrap_2pi(sigma * (psi_d - psi_b)), sigma, wrap_2pi(sigma * (math.pi - c0) + beta))
                ok = ok and sigma * gby > 1e-6
                tj = (y_ri - y0 - br["dy"] - jn["dy"]) / gby
                xj = x0 + br["dx"] + gbx * tj + jn["dx"]
                legs = [br, straight(gbx, gby, tj), jn]
            tdw = (xj - x_ri) / gs_d
            ok = ok and tj >= 0.0 and tdw >= 0.0
            legs += [straight(-gs_d, 0.0, tdw)] + final_side + [straight(gs_f, 0.0, d / gs_f)]
        elif shape == "teardrop":
            th = c["theta"]
            psi_t = psi0 - sigma * th
            off = turn(psi0, th, -sigma, th)
            gtx, gty = v * math.cos(psi_t) + wx, v * math.sin(psi_t) + wy
            fin = turn(psi_t, wrap_2pi(sigma * (psi_f - psi_t)), sigma, wrap_2pi(-sigma * c0 + th))
            bx = -d - x0 - off["dx"] - fin["dx"]
            by = -y0 - off["dy"] - fin["dy"]
            det = g0x * gty - g0y * gtx
            ok = ok and abs(det) > 1e-6 * v
            t1 = (bx * gty - by * gtx) / det
            t2 = (g0x * by - g0y * bx) / det
            ok = ok and t1 >= 0.0 and t2 >= 0.0 and sigma * (-fin["dy"]) > 0.0
            legs = [straight(g0x, g0y, t1), off, straight(gtx, gty, t2), fin, straight(gs_f, 0.0, d / gs_f)]
        elif shape == "overfly-circuit":
            # upwind to the crosswind turn point, then a rectangular circuit: crosswind, downwind and
            # base tracks held; the downwind offset is the smallest one both ends reach (see the core)
            psi_x, gs_x, ok_x = crab(sigma * math.pi / 2.0, v, wx, wy)
            psi_b, gs_b, ok_b = crab(-sigma * math.pi / 2.0, v, wx, wy)
            ok = ok and ok_x and ok_b and g0x > 1e-6 * v
            t_up = max((c["turn_x"] - x0) / g0x, 0.0)
            cw = turn(psi0, wrap_2pi(sigma * (psi_x - psi0)), sigma, wrap_2pi(math.pi / 2.0 - sigma * c0))
            dwt = turn(psi_x, wrap_2pi(sigma * (psi_d - psi_x)), sigma, math.pi / 2.0)
            bt = turn(psi_d, wrap_2pi(sigma * (psi_b - psi_d)), sigma, math.pi / 2.0)
            fin = turn(psi_b, wrap_2pi(sigma * (psi_f - psi_b)), sigma, math.pi / 2.0)
            ok = ok and all(leg["turn"].a < math.pi for leg in (dwt, bt, fin))
            y_a = y0 + g0y * t_up + cw["dy"] + dwt["dy"]
            y_b = -(bt["dy"] + fin["dy"])
            offset = max(sigma * y_a, sigma * y_b)
            t_xw = (offset - sigma * y_a) / gs_x
            t_base = (offset - sigma * y_b) / gs_b
            x_j = x0 + g0x * t_up + cw["dx"] + dwt["dx"]
            x_ri = -d - fin["dx"] - bt["dx"]
            t_dw = (x_j - x_ri) / gs_d
            ok = ok and offset > 0.0 and t_dw >= 0.0
            legs = [straight(g0x, g0y, t_up), cw, straight(0.0, sigma * gs_x, t_xw), dwt, straight(-gs_d, 0.0, t_dw),
                    bt, straight(0.0, -sigma * gs_b, t_base), fin, straight(gs_f, 0.0, d / gs_f)]
        else:  # direct-turn
            ang = wrap_2pi(sigma * (psi_f - psi0))
            fin = turn(psi0, ang, sigma, wrap_2pi(-sigma * c0))
            ok = ok and abs(g0y) > 1e-6 * v and ang <= math.pi
            t1 = -(y0 + fin["dy"]) / g0y
            roll_out = -(x0 + g0x * t1 + fin["dx"])
            ok = ok and t1 >= 0.0 and roll_out >= c["d_stab"] - 1e-6
            legs = [straight(g0x, g0y, t1), fin, straight(gs_f, 0.0, roll_out / gs_f)]
    except (ZeroDivisionError, ValueError, OverflowError):
        ok = False
    return {"ok": ok, "legs": legs}


def sample(legs: list[dict], c: dict, turn_step_deg: float, n_straight: int) -> list[tuple[float, float]]:
    """Track points: each turn's arc every turn_step_deg of its calm angle (plus N_RAMP points in
    each roll ramp), each straight n_straight (the final straight 2)."""
    pts = []
    x, y = c["x0"], c["y0"]
    for leg in legs:
        if leg["kind"] == "turn":
            tr = leg["turn"]
            n = max(3, int(math.ceil(math.degrees(leg["nominal"]) / turn_step_deg - 1e-9)) + 1)
            times = [tr.tr + tr.tc * i / (n - 1) for i in range(n)]
            if tr.k is not None:       # N_RAMP points in each roll ramp, at equal times
                times = ([tr.tr * j / N_RAMP for j in range(N_RAMP)] + times
                         + [tr.tr + tr.tc + tr.tr * (j + 1) / N_RAMP for j in range(N_RAMP)])
            for t in times:
                dx, dy = tr.ground(t, leg["psi0"], leg["sign"], c["wx"], c["wy"])
                pts.append((x + dx, y + dy))
            x, y = x + leg["dx"], y + leg["dy"]
        else:
            n = 2 if leg is legs[-1] else n_straight        # the final straight: its two ends
            for i in range(n):
                f = i / (n - 1)
                pts.append((x + leg["gx"] * leg["t"] * f, y + leg["gy"] * leg["t"] * f))
            x, y = x + leg["gx"] * leg["t"], y + leg["gy"] * leg["t"]
    return pts


def candidates(course_deg: float) -> list[tuple[str, str]]:
    c = (course_deg + 180.0) % 360.0 - 180.0
    delta, out = abs(c), []
    if 0.5 < delta <= 90.0:
        out.append(("direct-turn", "left" if c > 0 else "right"))
    if delta <= 30.0:
        out += [("overfly-circuit", "left"), ("overfly-circuit", "right")]
    if 30.0 <= delta <= 150.0:
        out.append(("downwind-join", "right" if math.sin(math.radians(c)) > 0 else "left"))
    if delta >= 120.0:
        out += [("break-and-return", "left"), ("break-and-return", "right"), ("teardrop", "left"),
                ("teardrop", "right")]
    return out


def bank_levels(bank: float, limit: float, step: float) -> list[float]:
    levels, b = [bank], bank + step
    while b < limit - 1e-9:
        levels.append(b)
        b += step
    if limit > bank + 1e-9:
        levels.append(limit)
    return [x for x in levels if x <= 60.0]


def checks(area: float, sector: bool, dist: float, bank: float, aoa: float | None, *, limit: float,
           vis: float, radius: float) -> tuple[int, int]:
    """(failure bits, marginal bits) of one flyable plan."""
    a_bit = REASON_SECTOR if sector else REASON_AREA
    fail = marg = 0
    if bank > limit:
        fail |= REASON_BANK
    elif bank > limit - 5.0:
        marg |= REASON_BANK
    if area < 0.0:
        fail |= a_bit
    elif area < 0.10 * radius:
        marg |= a_bit
    if vis - dist < 0.0:
        fail |= REASON_VISIBILITY
    elif dist > 0.90 * vis:
        marg |= REASON_VISIBILITY
    if aoa is not None:
        if aoa < 0.0:
            fail |= REASON_STALL
        elif aoa < 3.0:
            marg |= REASON_STALL
    return fail, marg


def envelope_scalar(inputs, *, margin_track_fn: Callable[[list[tuple[float, float]]], "float | tuple[float, bool]"],
                    visibility_m: float, bank_limit_deg: float, area_radius_m: float,
                    wind_from_relative_deg: list[float], wind_speed_kt: list[float], bank_step_deg: float = 5.0,
                    turn_step_deg: float = 7.5, n_straight: int = 5,
                    aoa_margin_fn: Callable[[float], float] | None = None, roll_out_steps: bool = True) -> dict:
    """The envelope cell by cell. Returns lists of lists: status, reasons, bank_needed (None
    where nothing fits), best (candidate index or -1), area, dist (None where none can be
    flown), roll_out (None where nothing fits).

    Levels: the default roll-out at each bank level, then (if nothing fits) each closer
    roll-out at each bank level; the first level whose best candidate has no failure, else the
    default roll-out's last bank level. ``margin_track_fn`` answers a margin, or (margin,
    whether a not-authorised sector sets it)."""
    tg = math.tan(math.radians(inputs.glide_path_deg))
    d_glide = (inputs.circling_height_ft - inputs.tch_ft) * FT_TO_M / tg
    d_stab = (inputs.stabilised_height_ft - inputs.tch_ft) * FT_TO_M / tg
    d = d_glide if inputs.roll_out_distance_m is None else inputs.roll_out_distance_m
    d = max(d, d_stab)
    roll_outs = [d] + ([max(d_stab + f * (d - d_stab), d_stab) for f in ROLL_OUT_STEPS] if roll_out_steps else [])
    cands = candidates(inputs.arrival_course_deg)
    banks = bank_levels(inputs.bank_deg, bank_limit_deg, bank_step_deg)
    length = inputs.runway_length_m
    k = None if inputs.roll_rate_deg_per_s is None else math.radians(inputs.roll_rate_deg_per_s)
    res: dict = {key: [] for key in ("status", "reasons", "bank_needed", "best", "area", "dist", "roll_out")}
    for wdir in wind_from_relative_deg:
        rows: dict = {key: [] for key in res}
        for spd in wind_speed_kt:
            wx = -spd * math.cos(math.radians(wdir)) * KT_TO_MPS
            wy = -spd * math.sin(math.radians(wdir)) * KT_TO_MPS
            cell = (DOES_NOT_FIT, REASON_WIND, None, -1, None, None, None)
            done = False
            for ri, d_r in enumerate(roll_outs):
                for bi, bank in enumerate(banks):
                    ctx = {"v": inputs.tas_kt * KT_TO_MPS, "wx": wx, "wy": wy, "bank": math.radians(bank), "k": k,
                           "x0": inputs.arrival_x_m, "y0": inputs.arrival_y_m,
                           "c0": math.radians(inputs.arrival_course_deg), "d": d_r, "d_stab": d_stab,
                           "beta": math.radians(inputs.break_angle_deg),
                           "theta": math.radians(inputs.teardrop_angle_deg), "turn_x": inputs.circuit_turn_past_threshold_m}
                    aoa = None if aoa_margin_fn is None else aoa_margin_fn(bank)
                    best = None
                    for ci, (shape, side) in enumerate(cands):
                        sol = solve(shape, 1.0 if side == "right" else -1.0, ctx)
                        if not sol["ok"]:
                            key = (10**6, 0.0, 0.0)
                            area = dist = None
                            fail = marg = 0
                        else:
                            pts = sample(sol["legs"], ctx, turn_step_deg, n_straight)
                            got = margin_track_fn(pts)
                            area, sector = got if isinstance(got, tuple) else (got, False)
                            dist = 0.0
                            for px, py in pts:
                                dist = max(dist, math.hypot(px - min(max(px, 0.0), length), py))
                            fail, marg = checks(area, sector, dist, bank, aoa, limit=bank_limit_deg, vis=visibility_m,
                                                radius=area_radius_m)
                            total = sum(leg["t"] for leg in sol["legs"])
                            key = (bin(fail).count("1"), -round(min(area, visibility_m - dist)), round(total, 1))
                        if best is None or key < best[0]:
                            best = (key, ci, area, dist, fail, marg)
                    if best is None:
                        done = True
                        break
                    key, ci, area, dist, fail, marg = best
                    if key[0] == 0:
                        cell = (FITS if marg == 0 else MARGINAL, marg, bank, ci, area, dist, d_r)
                        done = True
                        break
                    if ri == 0 and bi == len(banks) - 1:
                        if key[0] >= 10**6:
                            cell = (DOES_NOT_FIT, REASON_WIND, None, -1, None, None, None)
                        else:
                            cell = (DOES_NOT_FIT, REASON_BANK | fail, None, ci, area, dist, None)
                if done:
                    break
            for key, val in zip(("status", "reasons", "bank_needed", "best", "area", "dist", "roll_out"), cell):
                rows[key].append(val)
        for key in res:
            res[key].append(rows[key])
    return res
