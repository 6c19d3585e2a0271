"""The plan's own small steps held to the rules they replace, to the last bit.

``plans.inputs_at_level`` is ``dataclasses.replace`` of the two fields a level changes (the
same inputs, the same checks); ``plans._distance_to_runway_m`` clips in one ufunc call where the
rule is ``np.minimum(np.maximum(x, 0), L)`` (the distances are the same numbers: the clip and the
pair differ at most in the sign of a zero, which ``hypot`` does not see). The sources of truth
are those two expressions, written out here.
"""

from __future__ import annotations

import dataclasses
import pickle

import numpy as np
import pytest

from briefer.core.manoeuvre import plans
from briefer.core.manoeuvre.legs import runway_wind_from
from briefer.core.manoeuvre.solver import CircleInputs
from briefer.errors import DomainError


def _inputs(**kw) -> CircleInputs:
    base = dict(tas_kt=140.0, bank_deg=25.0, wind=runway_wind_from(30.0, 12.0), arrival_x_m=4000.0,
                arrival_y_m=10.0, arrival_course_deg=165.0, circling_height_ft=600.0, runway_length_m=2500.0,
                roll_rate_deg_per_s=10.0)
    base.update(kw)
    return CircleInputs(**base)


@pytest.mark.parametrize("bank, roll_out", [(25.0, None), (30.0, 2946.1242970133103), (60.0, 0.0), (27.5, 1e4)])
@pytest.mark.parametrize("given", [dict(), dict(roll_out_distance_m=1500.0, roll_rate_deg_per_s=None)])
def test_inputs_at_level_is_dataclasses_replace(bank, roll_out, given):
    inp = _inputs(**given)
    got = plans.inputs_at_level(inp, bank_deg=bank, roll_out_distance_m=roll_out)
    want = dataclasses.replace(inp, bank_deg=bank, roll_out_distance_m=roll_out)
    assert type(got) is CircleInputs and got == want
    assert pickle.dumps(got, 5) == pickle.dumps(want, 5)


@pytest.mark.parametrize("bank, roll_out", [(0.0, None), (61.0, None), (25.0, -1.0), (25.0, float("nan"))])
def test_inputs_at_level_checks_as_replace_does(bank, roll_out):
    inp = _inputs()
    with pytest.raises(DomainError) as want:
        dataclasses.replace(inp, bank_deg=bank, roll_out_distance_m=roll_out)
    with pytest.raises(DomainError) as got:
        plans.inputs_at_level(inp, bank_deg=bank, roll_out_distance_m=roll_out)
    assert str(got.value) == str(want.value)


@pytest.mark.parametrize("length_m", [0.0, 2500.0, 3.3, 1e-300])
def test_distance_to_runway_is_the_min_max_rule(length_m):
    rng = np.random.default_rng(7)
    edges = [0.0, -0.0, length_m, -length_m, np.nextafter(length_m, 0.0), np.nextafter(length_m, 1e9),
             np.nextafter(0.0, 1.0), np.nextafter(0.0, -1.0), 5e307, -5e307, np.inf, -np.inf, np.nan]
    x = np.concatenate([rng.normal(0.0, 3000.0, 20000), edges])
    for y in (np.concatenate([rng.normal(0.0, 3000.0, 20000), np.linspace(-1.0, 1.0, len(edges))]),
              np.zeros(len(x)), -np.zeros(len(x))):
        want = np.hypot(x - np.minimum(np.maximum(x, 0.0), length_m), y)
        got = plans._distance_to_runway_m(x, y, length_m)
        assert got.tobytes() == want.tobytes()
