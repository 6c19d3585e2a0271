"""The core's scalar paths (one Python number in, a float out, computed with `math`) give the
array path's numbers to the last bit and raise the same errors.

A brief computes most of its single figures (turn, stall, angle of attack, atmosphere at the
MDA, sight picture) through these paths; the golden briefs pin them too, but only at the demo
cases' values. Here every function is called with random numbers over its range, once as a
float and once as a 0-d array (which takes the array path), and the two answers compared with
``==``. The references for the formulas themselves are in each module's own tests.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from briefer.core import turn
from briefer.errors import DomainError

RNG_SEED = 20261203
N = 3000


def _outcome(fn, *args, **kwargs):
    try:
        return ("ok", fn(*args, **kwargs))
    except DomainError as exc:
        return ("error", str(exc))


def _assert_same(fn, args: tuple, kwargs: dict) -> None:
    """fn on floats == fn on 0-d arrays, bit for bit (or the same error message)."""
    scalar = _outcome(fn, *args, **kwargs)
    arrays = _outcome(fn, *(np.asarray(a) for a in args), **{k: np.asarray(v) for k, v in kwargs.items()})
    assert scalar[0] == arrays[0], (fn.__name__, args, kwargs, scalar, arrays)
    if scalar[0] == "error":
        assert scalar[1] == arrays[1]
        return
    assert type(scalar[1]) is float, (fn.__name__, type(scalar[1]))
    assert scalar[1] == float(arrays[1]) or (math.isnan(scalar[1]) and math.isnan(float(arrays[1]))), (
        fn.__name__, args, kwargs, scalar[1].hex(), float(arrays[1]).hex())


def _turn_cases():
    rng = np.random.default_rng(RNG_SEED)
    for i in range(N):
        tas, bank, ias = rng.uniform(40, 400), rng.uniform(0.5, 75), rng.uniform(60, 250)
        vs = rng.uniform(40, 140)
        vref, w, aref = vs * rng.uniform(1.05, 1.5), rng.uniform(0.5, 1.5), rng.uniform(0, 10)
        if i % 40 == 0:      # the ends and outside of the ranges
            bank = [0.0, 90.0, -1.0, 89.999, math.nan, 30.0][i // 40 % 6]
            tas = [tas, 0.0, 1000.0, 1001.0, math.inf][i // 40 % 5]
        yield float(tas), float(bank), float(ias), float(vs), float(vref), float(w), float(aref)


@pytest.mark.parametrize("name", ["turn_radius_m", "turn_radius_nm", "turn_radius_ft", "turn_rate_deg_per_s"])
def test_turn_tas_bank_functions(name):
    fn = getattr(turn, name)
    for tas, bank, *_ in _turn_cases():
        _assert_same(fn, (tas, bank), {})


def test_turn_load_factor_and_stall():
    for tas, bank, ias, vs, _vref, w, _aref in _turn_cases():
        _assert_same(turn.load_factor, (bank,), {})
        _assert_same(turn.stall_speed_factor, (bank,), {})
        _assert_same(turn.stall_speed_in_turn_kt, (vs, bank), {"weight_ratio": w})
        _assert_same(turn.stall_bank_deg, (ias, vs), {"weight_ratio": w})
        _assert_same(turn.stall_bank_deg, (vs * math.sqrt(w) * (1.0 + 1e-13), vs), {"weight_ratio": w})
        _assert_same(turn.bank_for_radius_deg, (tas,), {"radius_m": tas * 10.0})


def test_turn_angle_of_attack():
    for _tas, bank, ias, vs, vref, w, aref in _turn_cases():
        stall = aref + 9.0
        kw = {"vref_kt": vref, "vs1g_kt": vs, "aoa_ref": aref, "aoa_stall": stall, "weight_ratio": w}
        _assert_same(turn.angle_of_attack_in_turn, (ias, bank), kw)
        _assert_same(turn.angle_of_attack_in_turn, (ias, bank), {**kw, "vref_kt": vs * 0.9})      # error
        _assert_same(turn.angle_of_attack_in_turn, (ias, bank), {**kw, "aoa_stall": aref - 1.0})  # error


def _atmosphere_cases():
    rng = np.random.default_rng(RNG_SEED + 1)
    for i in range(N):
        pa = rng.uniform(-5000.0, 60000.0) if i % 3 else rng.uniform(-2000.0, 15000.0)
        oat, alt, elev = rng.uniform(-60.0, 50.0), rng.uniform(-2000.0, 60000.0), rng.uniform(-1000.0, 12000.0)
        hpa, cas = rng.uniform(850.0, 1100.0), rng.uniform(40.0, 600.0)
        if i % 50 == 0:      # the ends and outside of the ranges
            pa = [-5000.0, 60000.0, 60001.0, -5001.0, math.nan][i // 50 % 5]
            hpa = [850.0, 1100.0, 849.0, 1013.25][i // 50 % 4]
            oat = [-100.0, 60.0, 61.0, oat][i // 50 % 4]
        yield float(pa), float(oat), float(alt), float(elev), float(hpa), float(cas)


def test_atmosphere():
    from briefer.core import atmosphere as atm
    for pa, oat, alt, elev, hpa, cas in _atmosphere_cases():
        _assert_same(atm.isa_temperature_k, (pa,), {})
        _assert_same(atm.isa_temperature_c, (pa,), {})
        if -5000.0 <= pa <= 60000.0:
            _assert_same(atm.isa_pressure_altitude_ft, (float(atm.isa_pressure_hpa(pa)),), {})
        _assert_same(atm.pressure_altitude_ft, (alt,), {"altimeter_hpa": hpa})
        _assert_same(atm.oat_at_altitude_c, (oat,), {"surface_elevation_ft": elev, "altitude_ft": alt})
        _assert_same(atm.density_ratio, (pa,), {"oat_c": oat})
        _assert_same(atm.density_altitude_ft, (pa,), {"oat_c": oat})
        _assert_same(atm.tas_from_cas_kt, (cas,), {"pressure_altitude_ft": pa, "oat_c": oat})


def test_sight_picture():
    from briefer.core import sightpicture as sp
    rng = np.random.default_rng(RNG_SEED + 2)
    for i in range(N):
        h, d, dep = float(rng.uniform(1.0, 5000.0)), float(rng.uniform(0.01, 10.0)), float(rng.uniform(0.01, 89.99))
        if i % 50 == 0:
            d, dep = [0.0, -1.0, math.inf, d][i // 50 % 4], [90.0, 95.0, 0.0, dep][i // 50 % 4]
        _assert_same(sp.depression_angle_deg, (h, d), {})
        _assert_same(sp.offset_for_depression_nm, (h, dep), {})


def test_linspace_is_numpys():
    from briefer.core.geometry import linspace as _linspace
    rng = np.random.default_rng(RNG_SEED + 3)
    for _ in range(N):
        a = float(rng.uniform(-1e4, 1e4))
        for b, num in ((a + 2500.0, 8), (a + float(rng.uniform(-1e4, 1e4)), 6), (a, 5)):
            mine, numpys = _linspace(a, b, num), np.linspace(a, b, num)
            assert mine.dtype == numpys.dtype and np.array_equal(mine, numpys)


def test_wind_components():
    from briefer.core import wind
    rng = np.random.default_rng(RNG_SEED + 4)
    for i in range(N):
        wdir, ws, crs = float(rng.uniform(0.0, 360.0)), float(rng.uniform(0.0, 60.0)), float(rng.uniform(-720.0, 720.0))
        if i % 50 == 0:
            wdir, crs = [360.0, 361.0, -0.5, wdir][i // 50 % 4], [math.nan, math.inf, crs][i // 50 % 3]
        for fn, args in ((lambda *a: wind.wind_components_kt(*a[:2], course_deg=a[2]).headwind_kt, (wdir, ws, crs)),
                         (lambda *a: wind.wind_components_kt(*a[:2], course_deg=a[2]).crosswind_from_right_kt,
                          (wdir, ws, crs))):
            _assert_same(fn, args, {})


def test_runway_course_is_wrapped_atan2_in_degrees():
    """geometry.runway_axes's landing course (math) against angles.wrap_360(angles.atand2) (numpy)."""
    from briefer.core import angles, geometry
    rng = np.random.default_rng(RNG_SEED + 5)
    for _ in range(N):
        de, dn = (float(v) for v in rng.uniform(-4000.0, 4000.0, 2))
        if abs(de) + abs(dn) < 1.0:
            continue
        course = geometry.runway_axes((0.0, 0.0), (de, dn)).landing_course_deg_true
        assert course == float(angles.wrap_360(angles.atand2(de, dn))), (de, dn)
    for de, dn in ((0.0, 100.0), (0.0, -100.0), (100.0, 0.0), (-100.0, 0.0), (-1e-300, 100.0)):
        course = geometry.runway_axes((0.0, 0.0), (de, dn)).landing_course_deg_true
        assert course == float(angles.wrap_360(angles.atand2(de, dn)))


def test_criteria_scalar_paths():
    from briefer.core import angles, criteria, geometry
    rng = np.random.default_rng(RNG_SEED + 6)
    for i in range(N):
        g = float(rng.uniform(0.0, 1200.0)) if i % 50 else [-1.0, math.inf, 0.0][i // 50 % 3]
        _assert_same(criteria.angle_deg_from_gradient_ft_per_nm, (g,), {})
        faf, thr, tch, dist = (float(rng.uniform(500.0, 5000.0)), float(rng.uniform(0.0, 3000.0)),
                               float(rng.uniform(0.0, 200.0)), float(rng.uniform(0.1, 30.0)))
        _assert_same(lambda a, b, c, d: criteria.descent_gradient_ft_per_nm(
            faf_altitude_ft=a, threshold_elevation_ft=b, tch_ft=c, distance_nm=d), (faf, thr, tch, dist), {})
        bank, v = float(rng.uniform(1.0, 60.0)), float(rng.uniform(60.0, 300.0))
        assert criteria._doc8168_rate_deg_per_s(v, bank) == criteria._doc8168_rate_deg_per_s(v, np.asarray(bank))
        mag, var = float(rng.uniform(-360.0, 720.0)), float(rng.uniform(-30.0, 30.0))
        assert geometry.true_from_magnetic_deg(mag, var) == float(angles.wrap_360(np.asarray(mag) + var))


def test_wrap_180_of_floats_is_numpys():
    """The float form of angles.wrap_180 written out in criteria.straight_in_assessment and the
    circling-only check: (a - b + 180) % 360 - 180 equals numpy's for every pair."""
    from briefer.core import angles
    rng = np.random.default_rng(RNG_SEED + 7)
    for a, b in rng.uniform(-720.0, 720.0, (N, 2)).tolist() + [(180.0, 0.0), (-180.0, 0.0), (0.0, 0.0), (360.0, 0.0)]:
        assert abs((a - b + 180.0) % 360.0 - 180.0) == abs(float(angles.wrap_180(a - b)))
        assert (a - b) % 360.0 == float(angles.wrap_360(a - b))      # the float form of wrap_360 (situation, geometry)
