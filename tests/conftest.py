"""Shared test helpers: every built-in demo case (profile x airfield x approach x landing runway),
enumerated once for the sweeps that use them (golden briefs, brief never raises, brief and
envelope agree). Import with ``from conftest import demo_landings`` (the tests folder is on the
path, as for the other helper modules)."""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from briefer.io import catalog


def demo_landings() -> Iterator[tuple[str, Any, Any, str, str]]:
    """(label, profile, airfield, approach name, landing designator) for every built-in profile x
    airfield x approach x runway end, in name order; label is "profile/airfield/approach/runway"."""
    profiles = sorted(e.name for e in catalog.list_profiles(use_config=False) if e.builtin and e.error is None)
    airfields = sorted(e.name for e in catalog.list_airfields(use_config=False) if e.builtin and e.error is None)
    for p in profiles:
        prof = catalog.find_profile(p, use_config=False)
        for a in airfields:
            af = catalog.find_airfield(a, use_config=False)
            for appr in af.approaches:
                for rw in af.runways:
                    for des in (rw.threshold_a.designator, rw.threshold_b.designator):
                        yield f"{p}/{a}/{appr.name}/{des}", prof, af, appr.name, des


def designator_heading_deg(designator: str) -> float:
    """The landing runway's designator x 10 as its magnetic heading (close enough for a crosswind
    or a tailwind in a test's weather)."""
    return int(designator.rstrip("LCR")) * 10.0
