"""Every derived figure on the deck pages adds up (issue 11 item 9).

The deck's answer page states differences and sums next to the figures they come from ("1 1/8 SM
against the required 1 SM (1/8 SM above it)", "42 °C ... is 29 °C above ISA (13 °C)", "add 130 ft,
fly the MDA as 2030 ft", "1860 to 1960 ft (MDA -0/+100)"). Each is re-derived here from the
figures printed beside it, by plain arithmetic; no published value is needed.
"""

from __future__ import annotations

import re
from fractions import Fraction

import pytest

from briefer.errors import DomainError
from briefer.io import catalog
from briefer.instructor.deck import answer_text, grading_tolerances
from briefer.instructor.generation import generate_scenario

AIRFIELDS = ("V2RL", "X4CD", "Q7HM")
PROFILES = ("demo-bizjet", "demo-twin", "demo-trainer")
EMPHASES = ("low-visibility", "hot-high", "cold", "gusty-category")
SEEDS = (1, 2, 3)


def _cases():
    out = []
    for a in AIRFIELDS:
        for p in PROFILES:
            for e in EMPHASES:
                for seed in SEEDS:
                    try:
                        out.append(generate_scenario(airfield=catalog.find_airfield(a),
                                                     profile=catalog.find_profile(p), emphasis=e, seed=seed))
                    except DomainError:
                        continue
    return out


@pytest.fixture(scope="module")
def generated():
    cases = _cases()
    assert len(cases) > 40
    return cases


def _sm(text: str) -> Fraction:
    """'1 1/8' -> 9/8, '3/4' -> 3/4, '2' -> 2."""
    total = Fraction(0)
    for part in text.split():
        total += Fraction(part)
    return total


VIS_SM = re.compile(r"Reported visibility ([\d /]+?) SM against the required ([\d /.]+?) SM \((.+?)\)")
VIS_M = re.compile(r"Reported visibility (\d+) m against the required (\d+) m \((.+?)\)")
DIFF = re.compile(r"([\d /]+?) (SM|m) (above|below) it")
TEMP = re.compile(r"(-?\d+) °C at \d+ ft is (\d+) °C (above|below) ISA \((-?\d+) °C\)")
COLD = re.compile(r"Cold-temperature correction (\d+) ft: fly the MDA as (\d+) ft")


def test_low_visibility_difference_adds_up(generated):
    seen = 0
    for g in generated:
        for check in g.checks:
            m = VIS_SM.search(check)
            if m:
                reported, required, diff_text = _sm(m.group(1)), _sm(m.group(2)), m.group(3)
            else:
                m = VIS_M.search(check)
                if not m:
                    continue
                reported, required, diff_text = Fraction(m.group(1)), Fraction(m.group(2)), m.group(3)
            seen += 1
            if reported == required:
                assert diff_text == "exactly the minimum", check
                continue
            d = DIFF.fullmatch(diff_text)
            assert d, check
            sign = 1 if d.group(3) == "above" else -1
            assert sign * _sm(d.group(1)) == reported - required, check
    assert seen >= 5


def test_temperature_against_isa_adds_up(generated):
    seen = 0
    for g in generated:
        for check in g.checks:
            m = TEMP.search(check)
            if m:
                t, dev, word, isa = int(m.group(1)), int(m.group(2)), m.group(3), int(m.group(4))
                assert (t - isa) == (dev if word == "above" else -dev), check
                seen += 1
            c = COLD.search(check)
            if c:
                mda = g.brief.minimums.mda_ft
                assert int(c.group(2)) == round(mda) + int(c.group(1)), check
    assert seen >= 5


def test_grading_tolerances_add_up(generated):
    for g in generated:
        b = g.brief
        for tol in grading_tolerances(b):
            m = re.match(r"(-?\d+) to (-?\d+) (ft|kt IAS|deg)", tol.band)
            if not m:
                continue
            lo, hi = int(m.group(1)), int(m.group(2))
            if tol.item == "Altitude":
                assert (lo, hi) == (round(b.minimums.mda_ft), round(b.minimums.mda_ft) + 100), tol.band
            elif tol.item == "Airspeed":
                ias = round(b.performance.ias_kt)
                assert (lo, hi) == (ias - 5, ias + 5), tol.band
            elif tol.item == "Bank":
                target = int(re.search(r"target (\d+)", tol.band).group(1))
                assert lo == max(0, target - 5) and hi == min(round(b.performance.bank_limit_deg), target + 5)


def test_answer_page_repeats_the_checks(generated):
    for g in generated[:6]:
        text = " ".join(answer_text(g.scenario, g.brief, checks=g.checks).split())
        for c in g.checks:
            assert " ".join(c.split()) in text
