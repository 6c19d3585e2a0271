"""``plan_checks_one`` (one plan in plain floats, the brief's ranking) against ``plan_checks``
(the array rule the judgement and the envelope use): the same failure and marginal bits for
every combination around each threshold, NaN margins included (the one verdict rule must not
depend on which path a plan takes)."""

from __future__ import annotations

import itertools

import numpy as np

from briefer.core.manoeuvre.ranking import (
    MARGINAL_AOA_DEG,
    MARGINAL_AREA_FRACTION,
    MARGINAL_BANK_DEG,
    MARGINAL_VISIBILITY_FRACTION,
    plan_checks,
    plan_checks_one,
)


def test_one_plan_in_floats_is_the_array_rule():
    limit, vis, radius = 35.0, 4800.0, 4900.0
    near = lambda x: [np.nextafter(x, -np.inf), x, np.nextafter(x, np.inf)]  # noqa: E731
    banks = near(limit) + near(limit - MARGINAL_BANK_DEG) + [20.0]
    areas = near(0.0) + near(MARGINAL_AREA_FRACTION * radius) + [-0.0, 900.0, float("nan")]
    dists = near(vis) + near(MARGINAL_VISIBILITY_FRACTION * vis) + [100.0, float("nan")]
    aoas = [None] + near(0.0) + near(MARGINAL_AOA_DEG) + [9.0, float("nan")]
    n = 0
    for bank, area, dist, aoa, sector, r in itertools.product(banks, areas, dists, aoas, (False, True),
                                                              (radius, None)):
        fail, marg = plan_checks(bank_deg=[bank], bank_limit_deg=limit, area_margin_m=[area], sector_bound=sector,
                                 visibility_m=vis, max_distance_from_runway_m=[dist], area_radius_m=r,
                                 aoa_margin_deg=None if aoa is None else [aoa])
        got = plan_checks_one(bank_deg=bank, bank_limit_deg=limit, area_margin_m=area, sector_bound=sector,
                              visibility_m=vis, max_distance_from_runway_m=dist, area_radius_m=r, aoa_margin_deg=aoa)
        assert got == (int(fail[0]), int(marg[0])), (bank, area, dist, aoa, sector, r)
        n += 1
    assert n > 5000
