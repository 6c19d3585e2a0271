"""Tests of briefer.core.criteria against published criteria values.

Provenance marks follow docs/REFERENCES.md: V (primary text read), V2 (secondary source quoting the
primary), C (recomputed from a published formula), M (from memory). Every check cites the primary
document; the secondary sources behind each V2 value are listed in docs/REFERENCES.md.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import pytest
import yaml
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from briefer.core import criteria as cr
from briefer.errors import DomainError
from briefer.units import FT_TO_M, KM_TO_M, M_TO_FT, M_TO_SM, NM_TO_FT, SM_TO_M

REFERENCE = Path(__file__).parent / "reference"


def _load(name: str) -> dict:
    with open(REFERENCE / name, encoding="utf-8") as f:
        return yaml.safe_load(f)


EXPANDED = _load("expanded_circling_radii.yaml")
ICAO_EXAMPLE = _load("icao_circling_radii.yaml")


# ----------------------------------------------------------------------------------------------
# Names
# ----------------------------------------------------------------------------------------------

def test_names():
    # the issue fixes these names; the sets are those of AIM 5-4-20 (legacy/expanded) and Doc 8168
    assert cr.CRITERIA_SETS == ("terps-legacy", "terps-expanded", "icao")
    assert cr.CATEGORIES == ("A", "B", "C", "D", "E")      # 14 CFR 97.3; Doc 8168 Table I-4-1-2


@pytest.mark.parametrize("bad", ["F", "a", "", "CAT C"])
def test_unknown_category_is_a_domain_error(bad):
    with pytest.raises(DomainError, match="approach category"):
        cr.legacy_radius_nm(bad)


@pytest.mark.parametrize("bad", ["terps", "ICAO", "pans-ops", ""])
def test_unknown_criteria_is_a_domain_error(bad):
    with pytest.raises(DomainError, match="unknown criteria"):
        cr.design_circling_speed_kt("C", criteria=bad)


def test_provenance_labels():
    # docs/REFERENCES.md "How to read the verification marks"
    assert cr.is_from_memory("M") and not cr.is_from_memory("V2")
    assert cr.provenance_label("M") == "from memory, not verified"
    with pytest.raises(DomainError):
        cr.provenance_label("X")


# ----------------------------------------------------------------------------------------------
# Categories: 14 CFR 97.3 and Doc 8168 Vol I Table I-4-1-2
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("speed_kt, expected", [
    # 14 CFR 97.3 (V2): A < 91, B 91-<121, C 121-<141, D 141-<166, E >= 166; half-open bands
    pytest.param(50.0, "A", id="97.3-50"),
    pytest.param(90.9, "A", id="97.3-90.9"),
    pytest.param(91.0, "B", id="97.3-91.0"),
    pytest.param(120.9, "B", id="97.3-120.9"),
    pytest.param(121.0, "C", id="97.3-121.0"),
    pytest.param(140.9, "C", id="97.3-140.9"),
    pytest.param(141.0, "D", id="97.3-141.0"),
    pytest.param(165.9, "D", id="97.3-165.9"),
    pytest.param(166.0, "E", id="97.3-166.0"),
    pytest.param(250.0, "E", id="97.3-250"),
])
def test_category_from_speed_bands(speed_kt, expected):
    assert cr.category_from_speed(speed_kt) == expected


@pytest.mark.parametrize("bad", [0.0, -10.0, math.nan, math.inf, 301.0])
def test_category_from_speed_rejects_impossible_speeds(bad):
    with pytest.raises(DomainError, match="speed"):
        cr.category_from_speed(bad)


@pytest.mark.parametrize("criteria", cr.CRITERIA_SETS)
def test_speed_bands(criteria):
    # 14 CFR 97.3 (V2) and Doc 8168 Table I-4-1-2 VAT column (V2): same bands
    assert cr.category_speed_band_kt("A", criteria=criteria) == (0.0, 91.0)
    assert cr.category_speed_band_kt("B", criteria=criteria) == (91.0, 121.0)
    assert cr.category_speed_band_kt("C", criteria=criteria) == (121.0, 141.0)
    assert cr.category_speed_band_kt("D", criteria=criteria) == (141.0, 166.0)


def test_cat_e_band_differs():
    # 14 CFR 97.3: E is 166 kt or more (V2); Doc 8168 Table I-4-1-2: E 166-210 kt (V2)
    assert cr.category_speed_band_kt("E", criteria="terps-expanded") == (166.0, None)
    assert cr.category_speed_band_kt("E", criteria="icao") == (166.0, 211.0)


@pytest.mark.parametrize("category, expected", [
    # Doc 8168 Vol I Table I-4-1-2, maximum circling IAS (V2; V in Vol II 7.2.2 a))
    ("A", 100.0), ("B", 135.0), ("C", 180.0), ("D", 205.0), ("E", 240.0)])
def test_icao_design_circling_speed(category, expected):
    assert cr.design_circling_speed_kt(category, criteria="icao") == expected


@pytest.mark.parametrize("category, expected", [
    # AIM 5-4-7: TERPS design "typically" uses the category's highest speed (V2 via REFERENCES
    # section 1b: "TERPS protects roughly the category upper speed"); Cat E has no upper limit
    ("A", 90.0), ("B", 120.0), ("C", 140.0), ("D", 165.0), ("E", None)])
def test_terps_design_circling_speed(category, expected):
    assert cr.design_circling_speed_kt(category, criteria="terps-legacy") == expected


def test_category_without_circling_speed_is_certified():
    # 14 CFR 97.3: the category comes from VREF at maximum certificated landing weight
    d = cr.category_for_approach(vref_kt=132.0, criteria="terps-expanded")
    assert (d.certified_category, d.category, d.raised) == ("C", "C", False)
    assert d.circling_speed_kt is None


@pytest.mark.parametrize("vref_kt, circling_kt, certified, applies", [
    # P/CG "Aircraft approach category": a Cat A aircraft circling faster than 90 kt must use
    # Cat B (V2)
    pytest.param(85.0, 95.0, "A", "B", id="PCG-catA-circling-95"),
    # AIM 5-4-7: an aircraft flying 130 kt must use Cat C (V2, wording of the AIM example)
    pytest.param(85.0, 130.0, "A", "C", id="AIM-5-4-7-130kt"),
    # 14 CFR 97.3 half-open band: 90.9 kt stays A, 91.0 kt is B
    pytest.param(80.0, 90.9, "A", "A", id="97.3-90.9-stays"),
    pytest.param(80.0, 91.0, "A", "B", id="97.3-91.0-raises"),
    # the category never drops below the certified one (14 CFR 97.3: category is certified)
    pytest.param(130.0, 100.0, "C", "C", id="97.3-slow-circle-keeps-C"),
    pytest.param(150.0, 170.0, "D", "E", id="97.3-D-to-E"),
])
def test_terps_circling_speed_raises_category(vref_kt, circling_kt, certified, applies):
    d = cr.category_for_approach(vref_kt=vref_kt, circling_speed_kt=circling_kt,
                                 criteria="terps-expanded")
    assert d.certified_category == certified
    assert d.category == applies
    assert d.raised == (applies != certified)
    assert d.within_design_speed
    if d.raised:
        assert "must" in d.reason and f"Cat {applies}" in d.reason


@pytest.mark.parametrize("vref_kt, circling_kt, applies, within", [
    # Doc 8168 Table I-4-1-2 (V2): Cat A area built for 100 kt, so a 95 kt circle stays A
    # (the TERPS/ICAO difference of REFERENCES section 1b: A 91 vs 100 kt)
    pytest.param(85.0, 95.0, "A", True, id="8168-A-95-stays"),
    pytest.param(85.0, 100.0, "A", True, id="8168-A-100-edge"),
    pytest.param(85.0, 101.0, "B", True, id="8168-A-101-to-B"),
    # Cat C 121-140 VAT, circling up to 180 kt (V2, REFERENCES section 1b)
    pytest.param(130.0, 175.0, "C", True, id="8168-C-175-stays"),
    pytest.param(130.0, 190.0, "D", True, id="8168-C-190-to-D"),
    # above the Cat E maximum of 240 kt no category protects the circle
    pytest.param(130.0, 250.0, "E", False, id="8168-above-240"),
])
def test_icao_circling_speed_against_max_circling_ias(vref_kt, circling_kt, applies, within):
    d = cr.category_for_approach(vref_kt=vref_kt, circling_speed_kt=circling_kt, criteria="icao")
    assert d.category == applies
    assert d.within_design_speed is within
    if not within:
        assert "no PANS-OPS circling area" in d.reason


def test_icao_vat_above_cat_e_is_a_domain_error():
    # Doc 8168 Table I-4-1-2: Cat E VAT 166-210 kt (V2)
    with pytest.raises(DomainError, match="Cat E"):
        cr.category_for_approach(vref_kt=215.0, criteria="icao")


@settings(max_examples=200)
@given(vref=st.floats(40.0, 210.0), circ=st.floats(40.0, 300.0))
def test_category_property_terps(vref, circ):
    # 14 CFR 97.3: the category applied is the higher of the VREF and circling-speed categories
    d = cr.category_for_approach(vref_kt=vref, circling_speed_kt=circ, criteria="terps-legacy")
    expected = max(cr.category_from_speed(vref), cr.category_from_speed(circ), key=cr.CATEGORIES.index)
    assert d.category == expected
    assert cr.CATEGORIES.index(d.category) >= cr.CATEGORIES.index(d.certified_category)


@settings(max_examples=200)
@given(vref=st.floats(40.0, 210.0), circ=st.floats(40.0, 240.0))
def test_category_property_icao(vref, circ):
    # Doc 8168 Table I-4-1-2: the applied category's maximum circling IAS covers the speed,
    # and the next lower category (if above the certified one) does not
    d = cr.category_for_approach(vref_kt=vref, circling_speed_kt=circ, criteria="icao")
    assert circ <= cr.design_circling_speed_kt(d.category, criteria="icao")
    idx = cr.CATEGORIES.index(d.category)
    if d.raised:
        assert circ > cr.design_circling_speed_kt(cr.CATEGORIES[idx - 1], criteria="icao")


def test_category_determination_checks_itself():
    # invariant: the applied category is never below the certified one
    with pytest.raises(DomainError):
        cr.CategoryDetermination(criteria="icao", vref_kt=130.0, circling_speed_kt=None,
                                 certified_category="C", category="B", raised=True,
                                 within_design_speed=True, design_circling_speed_kt=135.0,
                                 reason="", source="")


# ----------------------------------------------------------------------------------------------
# TERPS legacy radii: AIM 5-4-20 / TPP page B2 (V2)
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("category, radius_nm", [
    ("A", 1.3), ("B", 1.5), ("C", 1.7), ("D", 2.3), ("E", 4.5)])
def test_legacy_radius(category, radius_nm):
    # AIM 5-4-20 standard circling radii (V2: two independent secondary reproductions)
    assert cr.legacy_radius_nm(category) == radius_nm
    cell = cr.legacy_radius_cell(category)
    assert cell.provenance == "V2" and not cell.from_memory


# ----------------------------------------------------------------------------------------------
# TERPS expanded radii: AIM 5-4-20 / TPP page B2, cell by cell
# ----------------------------------------------------------------------------------------------

def _probe_mdas(band: dict) -> list[float]:
    """MDAs inside a band: its lowest whole foot, its top and a middle value."""
    lo = band["above_ft"] + 1 if band["above_ft"] is not None else -1000
    hi = band["up_to_ft"] if band["up_to_ft"] is not None else 15000
    return [float(lo), float(hi), (lo + hi) / 2.0]


def _cells(provenance: str):
    bands = {b["label"]: b for b in EXPANDED["bands"]}
    for label, row in EXPANDED["cells"].items():
        for cat, cell in row.items():
            if cell["provenance"] == provenance:
                yield pytest.param(bands[label], cat, cell,
                                   id=f"{cat}-{label.replace(' ', '')}-{provenance}-{cell['source']}")


@pytest.mark.parametrize("band, category, cell", list(_cells("V2")))
def test_expanded_radius_verified_cell(band, category, cell):
    """Hard check: AIM 5-4-20 expanded table cells read in secondary sources (V2); the id names
    the source kind, docs/REFERENCES.md section 2c gives the address."""
    for mda in _probe_mdas(band):
        got = cr.expanded_radius_cell(category, mda)
        assert got.radius_nm == cell["radius_nm"]
        assert got.provenance == "V2"
        assert cr.expanded_radius_nm(category, mda_ft_msl=mda) == cell["radius_nm"]


@pytest.mark.parametrize("band, category, cell", list(_cells("M")))
def test_expanded_radius_from_memory_cell(band, category, cell):
    """From memory (M): NOT a published oracle. A lookup-table regression that also checks the
    cell stays labelled as from memory, so the brief marks it."""
    for mda in _probe_mdas(band):
        got = cr.expanded_radius_cell(category, mda)
        assert got.radius_nm == cell["radius_nm"]      # from memory, lookup regression
        assert got.provenance == "M" and got.from_memory
        assert "from memory" in got.source


def test_expanded_table_has_every_cell():
    # AIM 5-4-20 table shape: 6 MDA bands x 5 categories
    assert [b.label for b in cr.EXPANDED_MDA_BANDS] == [b["label"] for b in EXPANDED["bands"]]
    assert len(cr.EXPANDED_RADII) == 6
    assert all(set(row) == set(cr.CATEGORIES) for row in cr.EXPANDED_RADII)


@pytest.mark.parametrize("mda_ft, band_label", [
    # AIM 5-4-20 expanded table band headings (V2): "1000 or less", "1001-3000", ... "9001 and above"
    (1000.0, "1000 or less"), (1001.0, "1001-3000"),
    (3000.0, "1001-3000"), (3001.0, "3001-5000"),
    (5000.0, "3001-5000"), (5001.0, "5001-7000"),
    (7000.0, "5001-7000"), (7001.0, "7001-9000"),
    (9000.0, "7001-9000"), (9001.0, "9001 and above"),
    (-200.0, "1000 or less"), (14000.0, "9001 and above"),
    # a fractional MDA above a band's top goes to the next (larger-radius) band: design choice,
    # regression value, no published source
    (1000.4, "1001-3000"),
])
def test_expanded_band_edges(mda_ft, band_label):
    assert cr.expanded_mda_band(mda_ft).label == band_label


def test_expanded_band_edge_changes_radius():
    # AIM 5-4-20 expanded table, Cat B (V2): 1.7 NM at 1000 ft or less, 1.8 NM from 1001 ft;
    # 1.8 at 5000 ft, 1.9 NM from 5001 ft
    assert cr.expanded_radius_nm("B", mda_ft_msl=1000.0) == 1.7
    assert cr.expanded_radius_nm("B", mda_ft_msl=1001.0) == 1.8
    assert cr.expanded_radius_nm("B", mda_ft_msl=5000.0) == 1.8
    assert cr.expanded_radius_nm("B", mda_ft_msl=5001.0) == 1.9


@pytest.mark.parametrize("bad", [-1600.0, 20001.0, math.nan])
def test_expanded_radius_rejects_impossible_mda(bad):
    with pytest.raises(DomainError, match="circling MDA"):
        cr.expanded_radius_nm("C", mda_ft_msl=bad)


def test_expanded_radius_grows_with_mda_and_category():
    # AIM 5-4-20: the expanded radius accounts for the TAS increase with MDA altitude (V);
    # invariant: never smaller at a higher band or a faster category
    for cat in cr.CATEGORIES:
        radii = [row[cat].radius_nm for row in cr.EXPANDED_RADII]
        assert radii == sorted(radii)
    for row in cr.EXPANDED_RADII:
        radii = [row[c].radius_nm for c in cr.CATEGORIES]
        assert radii == sorted(radii)
    # AIM 5-4-20: expanded areas are larger than (or equal to) the legacy ones
    for cat in cr.CATEGORIES:
        assert cr.EXPANDED_RADII[0][cat].radius_nm >= cr.legacy_radius_nm(cat)


# ----------------------------------------------------------------------------------------------
# ICAO IAS -> TAS: Doc 8168 procedure-design formula (REFERENCES section 8c)
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("ias_kt, tas_kt", [
    # REFERENCES section 8c check values (C): ISA+15 at 600 m = 1968.5 ft; they are recomputed
    # with this formula, so they pin the implementation, not the formula. Printed to 0.1 kt.
    (100.0, 105.6), (135.0, 142.6), (180.0, 190.1), (205.0, 216.5), (240.0, 253.5)])
def test_tas_check_values_600m_isa_plus_15(ias_kt, tas_kt):
    got = cr.tas_icao_procedure_kt(ias_kt, altitude_ft=600.0 * M_TO_FT, isa_deviation_c=15.0)
    assert_allclose(got, tas_kt, atol=0.05)   # values printed to 0.1 kt


def test_tas_forum_example():
    # Doc 8168 TAS formula as used in a public PANS-OPS script and forum post (V2): IAS 150 kt at
    # 20,000 ft and -15 C gives about 209.6 kt. ISA at 20,000 ft by the 2 C/1000 ft rule is
    # 15 - 40 = -25 C, so -15 C is ISA+10.
    got = cr.tas_icao_procedure_kt(150.0, altitude_ft=20000.0, isa_deviation_c=10.0)
    assert_allclose(got, 209.6, atol=0.05)    # printed to 0.1 kt


def test_tas_sea_level_isa_is_ias():
    # hand-derived: at H = 0, VAR = 0 the formula is IAS * 171233 * 288^0.5 / 288^2.628 = IAS
    assert_allclose(cr.tas_icao_procedure_kt(120.0, altitude_ft=0.0, isa_deviation_c=0.0),
                    120.0, rtol=1e-6)          # 171233 is printed to 6 figures


@pytest.mark.parametrize("altitude_ft", [0.0, 2000.0, 5000.0, 10000.0, 20000.0, 30000.0])
def test_tas_matches_isa_density_at_isa(altitude_ft):
    # ICAO Doc 7488 standard atmosphere (via the ambiance package): at ISA, TAS = EAS/sqrt(sigma),
    # and at circling speeds IAS ~ EAS. Doc 8168 rounds 288.15 K to 288 and 0.0019812 to 0.00198.
    ambiance = pytest.importorskip("ambiance")
    sigma = float(ambiance.Atmosphere(altitude_ft * FT_TO_M).density[0] / 1.225)
    got = cr.tas_icao_procedure_kt(100.0, altitude_ft=altitude_ft, isa_deviation_c=0.0)
    assert_allclose(got, 100.0 / math.sqrt(sigma), rtol=1e-3)   # rounded constants, <0.1 %


def test_tas_vectorised_and_monotonic():
    # invariants: TAS grows with altitude and with temperature; arrays work
    h = np.linspace(0.0, 30000.0, 31)
    tas = cr.tas_icao_procedure_kt(150.0, altitude_ft=h, isa_deviation_c=15.0)
    assert tas.shape == h.shape and np.all(np.diff(tas) > 0)
    t = np.linspace(-40.0, 40.0, 17)
    tas_t = cr.tas_icao_procedure_kt(150.0, altitude_ft=5000.0, isa_deviation_c=t)
    assert np.all(np.diff(tas_t) > 0)


@pytest.mark.parametrize("kwargs", [
    dict(ias_kt=0.0, altitude_ft=0.0, isa_deviation_c=0.0),
    dict(ias_kt=100.0, altitude_ft=40000.0, isa_deviation_c=0.0),
    dict(ias_kt=100.0, altitude_ft=0.0, isa_deviation_c=80.0),
    dict(ias_kt=np.array([100.0, -1.0]), altitude_ft=0.0, isa_deviation_c=0.0),
])
def test_tas_domain(kwargs):
    ias = kwargs.pop("ias_kt")
    with pytest.raises(DomainError):
        cr.tas_icao_procedure_kt(ias, **kwargs)


# ----------------------------------------------------------------------------------------------
# ICAO circling radius: Doc 8168 Vol I Tables I-4-7-1/-2 worked example
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("row", [pytest.param(r, id=f"I-4-7-2-cat{r['category']}")
                                 for r in ICAO_EXAMPLE["rows"]])
def test_icao_radius_worked_example(row):
    # Doc 8168 Vol I Tables I-4-7-1/-2 (V2), aerodrome at 300 m / 1000 ft
    c = cr.icao_circling_radius(row["category"], airport_elevation_ft=ICAO_EXAMPLE["airport_elevation_ft"])
    assert c.ias_kt == row["ias_kt"]                          # Table I-4-1-2 circling column
    assert c.straight_segment_nm == row["straight_segment_nm"]  # Table I-4-7-1 (M, confirmed C)
    assert_allclose(c.radius_nm, row["radius_nm"], atol=0.03)  # REFERENCES 4b: reproduces within 0.03 NM
    assert c.wind_kt == 25.0                                  # Vol II 7.2.2 b): 46 km/h (25 kt), V
    assert c.altitude_ft == 2000.0                            # Table I-2-3-1: elevation + 300 m (1000 ft)
    assert c.isa_deviation_c == 15.0                          # ISA+15 (M, confirmed C)


def test_icao_cat_c_tas_plus_wind_215():
    # Doc 8168 Vol I Table I-4-7-2 Cat C "TAS + wind = 215 kt" (V2); printed to 1 kt
    c = cr.icao_circling_radius("C", airport_elevation_ft=1000.0)
    assert_allclose(c.tas_plus_wind_kt, 215.0, atol=0.5)


@pytest.mark.parametrize("category, v_kt, r_nm", [
    # REFERENCES section 4b recomputation (C) at 600 m: TAS + wind and r. Computed with the same
    # formulas, so these pin the steps, not the method; our TAS altitude is 2000 ft, not 1968.5 ft.
    ("A", 130.6, 0.693), ("B", 167.6, 1.125), ("C", 215.1, 1.853), ("D", 241.5, 2.336),
    ("E", 278.5, 3.106)])
def test_icao_intermediate_values(category, v_kt, r_nm):
    c = cr.icao_circling_radius(category, airport_elevation_ft=1000.0)
    assert_allclose(c.tas_plus_wind_kt, v_kt, atol=0.2)   # 31.5 ft of altitude is ~0.1 kt
    assert_allclose(c.turn_radius_nm, r_nm, atol=0.003)


def test_icao_bank_limited_by_3_deg_per_s():
    # Doc 8168 Vol II 7.2.2 c) (V): 20 deg or the bank giving 3 deg/s, whichever is less.
    # Cat A at 130.6 kt: 20 deg would give 3431 tan20 / (pi 130.6) = 3.04 deg/s, so the bank is
    # reduced to atan(3 pi 130.6 / 3431) = 19.7 deg (REFERENCES 4b, C)
    a = cr.icao_circling_radius("A", airport_elevation_ft=1000.0)
    assert_allclose(a.turn_rate_deg_per_s, 3.0, rtol=1e-12)
    assert_allclose(a.bank_deg, 19.7, atol=0.1)
    for cat in "BCDE":
        c = cr.icao_circling_radius(cat, airport_elevation_ft=1000.0)
        assert c.bank_deg == 20.0 and c.turn_rate_deg_per_s < 3.0


def test_icao_radius_grows_with_elevation():
    # Doc 8168 Vol II 7.2.2: TAS at elevation + 300 m, so higher aerodromes get larger areas
    radii = [cr.icao_circling_radius("C", airport_elevation_ft=e).radius_nm
             for e in np.linspace(-1000.0, 12000.0, 14)]
    assert np.all(np.diff(radii) > 0)


def test_icao_radius_rejects_absurd_elevation():
    with pytest.raises(DomainError, match="airport elevation"):
        cr.icao_circling_radius("C", airport_elevation_ft=30000.0)


# ----------------------------------------------------------------------------------------------
# Dispatch: circling_area_radius_nm
# ----------------------------------------------------------------------------------------------

def test_area_radius_legacy():
    # AIM 5-4-20 standard radius Cat D 2.3 NM (V2)
    a = cr.circling_area_radius_nm("D", criteria="terps-legacy")
    assert (a.radius_nm, a.provenance, a.icao) == (2.3, "V2", None)
    assert "legacy" in a.basis


def test_area_radius_expanded_marks_memory():
    # AIM 5-4-20 expanded, Cat D 1001-3000 ft is from memory (M): the basis must say so
    a = cr.circling_area_radius_nm("D", criteria="terps-expanded", mda_ft_msl=1200.0)
    assert a.radius_nm == 3.7                      # from memory, lookup regression
    assert a.from_memory and "from memory" in a.basis
    assert a.mda_band == "1001-3000"
    # AIM 5-4-20 expanded, Cat C 1000 ft or less = 2.7 NM (V2): no memory warning
    b = cr.circling_area_radius_nm("C", criteria="terps-expanded", mda_ft_msl=800.0)
    assert b.radius_nm == 2.7 and not b.from_memory and "from memory" not in b.basis


def test_area_radius_icao_carries_construction():
    # Doc 8168 Vol I Table I-4-7-2 Cat C: 4.20 NM at a 1000 ft aerodrome (V2, within 0.03)
    a = cr.circling_area_radius_nm("C", criteria="icao", airport_elevation_ft=1000.0)
    assert_allclose(a.radius_nm, 4.20, atol=0.03)
    assert a.icao is not None and a.icao.radius_nm == a.radius_nm
    assert a.provenance == "C"


@pytest.mark.parametrize("criteria, kwargs, missing", [
    ("terps-expanded", {}, "MDA"),
    ("terps-expanded", {"airport_elevation_ft": 500.0}, "MDA"),
    ("icao", {"mda_ft_msl": 1200.0}, "elevation"),
])
def test_area_radius_missing_argument(criteria, kwargs, missing):
    with pytest.raises(DomainError, match=missing):
        cr.circling_area_radius_nm("C", criteria=criteria, **kwargs)


# ----------------------------------------------------------------------------------------------
# Required radius for this aircraft today: same 2r + S construction
# ----------------------------------------------------------------------------------------------

def test_required_radius_reproduces_icao_design():
    # Doc 8168 Vol II 7.2.2: with the design TAS, 25 kt wind, 20 deg bank and S, the required
    # radius equals the published design radius (Cat C, 1000 ft aerodrome, 20 deg bank)
    c = cr.icao_circling_radius("C", airport_elevation_ft=1000.0)
    req = cr.required_radius_nm(tas_kt=c.tas_kt, wind_kt=25.0, bank_deg=20.0,
                                straight_segment_nm=0.5)
    assert_allclose(req.radius_nm, c.radius_nm, rtol=1e-12)   # same formulas


def test_required_radius_turn_physics():
    # REFERENCES 7c (C): 140 kt at 20 deg bank gives R = 4768 ft (0.785 NM) and 2.84 deg/s by
    # exact physics r = V^2 / (g tan bank); Doc 8168's 3431 constant differs by < 0.02 %
    req = cr.required_radius_nm(tas_kt=140.0, wind_kt=0.0, bank_deg=20.0, straight_segment_nm=0.0)
    assert_allclose(req.turn_radius_nm * NM_TO_FT, 4768.0, rtol=1e-3)   # table printed to 1 ft
    assert_allclose(req.turn_rate_deg_per_s, 2.84, atol=0.005)
    assert_allclose(req.radius_nm, 2.0 * req.turn_radius_nm, rtol=1e-12)  # S = 0: R = 2r


def test_required_radius_monotonic():
    # invariants: more wind or more speed -> larger; more bank -> smaller
    base = cr.required_radius_nm(tas_kt=150.0, wind_kt=10.0, bank_deg=25.0, straight_segment_nm=0.5)
    assert cr.required_radius_nm(tas_kt=160.0, wind_kt=10.0, bank_deg=25.0,
                                 straight_segment_nm=0.5).radius_nm > base.radius_nm
    assert cr.required_radius_nm(tas_kt=150.0, wind_kt=20.0, bank_deg=25.0,
                                 straight_segment_nm=0.5).radius_nm > base.radius_nm
    assert cr.required_radius_nm(tas_kt=150.0, wind_kt=10.0, bank_deg=30.0,
                                 straight_segment_nm=0.5).radius_nm < base.radius_nm


@pytest.mark.parametrize("kwargs", [
    dict(tas_kt=0.0, wind_kt=0.0, bank_deg=20.0, straight_segment_nm=0.5),
    dict(tas_kt=120.0, wind_kt=-5.0, bank_deg=20.0, straight_segment_nm=0.5),
    dict(tas_kt=120.0, wind_kt=5.0, bank_deg=90.0, straight_segment_nm=0.5),
    dict(tas_kt=120.0, wind_kt=5.0, bank_deg=0.0, straight_segment_nm=0.5),
    dict(tas_kt=120.0, wind_kt=5.0, bank_deg=20.0, straight_segment_nm=-0.1),
])
def test_required_radius_domain(kwargs):
    with pytest.raises(DomainError):
        cr.required_radius_nm(**kwargs)


# ----------------------------------------------------------------------------------------------
# Obstacle clearance, lowest height, visibility
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("criteria", ["terps-legacy", "terps-expanded"])
@pytest.mark.parametrize("category", cr.CATEGORIES)
def test_terps_obstacle_clearance_300ft(criteria, category):
    # AIM 5-4-20: the circling MDA gives 300 ft obstacle clearance within the area (V)
    oc = cr.circling_obstacle_clearance_ft(category, criteria=criteria)
    assert oc.clearance_ft == 300.0 and oc.provenance == "V"
    assert_allclose(oc.clearance_m, 300.0 * FT_TO_M, rtol=1e-12)


@pytest.mark.parametrize("category, moc_ft", [
    # Doc 8168 Vol I Table I-4-7-3 MOC 90/90/120/120/150 m = 295/295/394/394/492 ft: from memory
    # (M). Corroborated by a second source (trade press, REFERENCES 1b/4c): "begins at 295 ft and
    # increases to nearly 500 ft" - which checks A/B (295) and E (< 500) only.
    ("A", 295.0), ("B", 295.0), ("C", 394.0), ("D", 394.0), ("E", 492.0)])
def test_icao_moc(category, moc_ft):
    oc = cr.circling_obstacle_clearance_ft(category, criteria="icao")
    assert_allclose(oc.clearance_ft, moc_ft, atol=0.5)    # ft column rounded to 1 ft
    assert oc.provenance == "M"


def test_icao_moc_corroborated_range():
    # trade press (V2, REFERENCES 1b): PANS-OPS circling clearance begins at 295 ft and rises to
    # nearly 500 ft for the largest aircraft
    values = [cr.circling_obstacle_clearance_ft(c, criteria="icao").clearance_ft for c in cr.CATEGORIES]
    assert round(min(values)) == 295 and 450 < max(values) < 500


@pytest.mark.parametrize("category, terps_ft, icao_ft", [
    # from memory (M), lookup regression: TERPS minimum HAA 350/450/450/550/550 ft (a
    # "350/450/550" standard is quoted in a secondary source, REFERENCES 3); Doc 8168 Table
    # I-4-7-3 lowest OCH 120..240 m = 394/492/591/689/787 ft (M)
    ("A", 350.0, 394.0), ("B", 450.0, 492.0), ("C", 450.0, 591.0), ("D", 550.0, 689.0),
    ("E", 550.0, 787.0)])
def test_minimum_circling_height(category, terps_ft, icao_ft):
    t = cr.minimum_circling_height_ft(category, criteria="terps-expanded")
    assert t.height_ft == terps_ft and t.provenance == "M"
    i = cr.minimum_circling_height_ft(category, criteria="icao")
    assert_allclose(i.height_ft, icao_ft, atol=0.5)        # ft column rounded to 1 ft
    assert i.provenance == "M"


@pytest.mark.parametrize("category, terps_sm, icao_km", [
    # from memory (M), lookup regression: TERPS 1/1/1.5/2/2 SM at the lowest HAA; Doc 8168 Table
    # I-4-7-3 1.9/2.8/3.7/4.6/6.5 km
    ("A", 1.0, 1.9), ("B", 1.0, 2.8), ("C", 1.5, 3.7), ("D", 2.0, 4.6), ("E", 2.0, 6.5)])
def test_minimum_circling_visibility(category, terps_sm, icao_km):
    t = cr.minimum_circling_visibility_sm(category, criteria="terps-legacy")
    assert t.visibility_sm == terps_sm and t.provenance == "M"
    assert_allclose(t.visibility_m, terps_sm * SM_TO_M, rtol=1e-12)
    i = cr.minimum_circling_visibility_sm(category, criteria="icao")
    assert_allclose(i.visibility_m, icao_km * KM_TO_M, rtol=1e-12)
    assert_allclose(i.visibility_sm, icao_km * KM_TO_M * M_TO_SM, rtol=1e-12)
    assert i.provenance == "M"


def test_icao_visibility_in_sm_hand_check():
    # hand-derived: 1.9 km / 1.609344 km per SM = 1.18 SM
    assert_allclose(cr.minimum_circling_visibility_sm("A", criteria="icao").visibility_sm, 1.18, atol=0.005)


# ----------------------------------------------------------------------------------------------
# MDA rounding
# ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("value_ft, criteria, expected", [
    # AIM 5-4-20 example circling MDA 1180 ft (V) is already on the 20 ft step
    pytest.param(1180.0, "terps-expanded", 1180.0, id="AIM-example-1180"),
    # FAA: next 20 ft (AIM states it for LNAV, V; for circling from memory, M)
    pytest.param(1161.0, "terps-expanded", 1180.0, id="faa-1161"),
    pytest.param(1180.5, "terps-legacy", 1200.0, id="faa-1180.5"),
    pytest.param(-35.0, "terps-legacy", -20.0, id="faa-below-sea-level"),
    # ICAO: next 10 ft, from memory (M)
    pytest.param(1181.0, "icao", 1190.0, id="icao-1181"),
    pytest.param(1190.0, "icao", 1190.0, id="icao-1190"),
])
def test_round_mda_up(value_ft, criteria, expected):
    assert cr.round_mda_up_ft(value_ft, criteria=criteria) == expected


def test_rounding_rule_provenance():
    # circling rounding is from memory under every set (REFERENCES 3): the brief must say so
    assert all(cr.mda_rounding_rule(c).provenance == "M" for c in cr.CRITERIA_SETS)


@settings(max_examples=200)
@given(value=st.floats(-1500.0, 20000.0), criteria=st.sampled_from(cr.CRITERIA_SETS))
def test_round_mda_up_property(value, criteria):
    # invariant: rounded up, by less than one step, onto a multiple of the step
    step = cr.mda_rounding_rule(criteria).increment_ft
    got = cr.round_mda_up_ft(value, criteria=criteria)
    assert value - 1e-6 <= got < value + step
    assert got % step == 0


# ----------------------------------------------------------------------------------------------
# Circling only: gradient and alignment (REFERENCES section 5)
# ----------------------------------------------------------------------------------------------

def test_three_degrees_is_318_ft_per_nm():
    # REFERENCES section 5 (C): tan 3 deg x 6076.1 ft = 318.4 ft/NM; atan(400/6076.1) = 3.77 deg
    assert_allclose(cr.gradient_ft_per_nm_from_angle_deg(3.0), 318.4, atol=0.05)   # printed to 0.1
    assert_allclose(cr.angle_deg_from_gradient_ft_per_nm(400.0), 3.77, atol=0.005)  # printed to 0.01
    assert_allclose(cr.angle_deg_from_gradient_ft_per_nm(
        cr.gradient_ft_per_nm_from_angle_deg(3.0)), 3.0, rtol=1e-12)


def test_descent_gradient_hand_made():
    # hand-derived: FAF 2000 ft, threshold 100 ft, TCH 40 ft, 5 NM: (2000 - 140) / 5 = 372 ft/NM
    got = cr.descent_gradient_ft_per_nm(faf_altitude_ft=2000.0, threshold_elevation_ft=100.0,
                                        tch_ft=40.0, distance_nm=5.0)
    assert_allclose(got, 372.0, rtol=1e-12)


@pytest.mark.parametrize("kwargs", [
    dict(faf_altitude_ft=100.0, threshold_elevation_ft=100.0, tch_ft=40.0, distance_nm=5.0),
    dict(faf_altitude_ft=2000.0, threshold_elevation_ft=100.0, tch_ft=40.0, distance_nm=0.0),
    dict(faf_altitude_ft=2000.0, threshold_elevation_ft=100.0, tch_ft=-1.0, distance_nm=5.0),
])
def test_descent_gradient_domain(kwargs):
    with pytest.raises(DomainError):
        cr.descent_gradient_ft_per_nm(**kwargs)


def _assess(final, runway, gradient=300.0, category="C", criteria="terps-expanded", gps=False):
    return cr.straight_in_assessment(final_course_deg=final, runway_course_deg=runway,
                                     gradient_ft_per_nm=gradient, category=category,
                                     criteria=criteria, rnav_gps=gps)


@pytest.mark.parametrize("final, runway, expected", [
    # hand-derived smallest angle between courses, wrapping through north
    (355.0, 5.0, 10.0), (5.0, 355.0, 10.0), (350.0, 20.0, 30.0), (10.0, 190.0, 180.0),
    (0.0, 360.0, 0.0), (270.0, 90.0, 180.0), (123.0, 100.0, 23.0)])
def test_alignment_wraps(final, runway, expected):
    assert_allclose(_assess(final, runway).alignment_deg, expected, atol=1e-9)


@pytest.mark.parametrize("final, runway, gps, allowed", [
    # AIM 5-4-20 c) (V): straight-in only within 30 deg of the runway, 15 deg for GPS procedures
    pytest.param(350.0, 20.0, False, True, id="AIM-30-at-limit-across-north"),
    pytest.param(349.0, 20.0, False, False, id="AIM-31"),
    pytest.param(5.0, 350.0, True, True, id="AIM-GPS-15-at-limit"),
    pytest.param(6.0, 350.0, True, False, id="AIM-GPS-16"),
    pytest.param(6.0, 350.0, False, True, id="AIM-non-GPS-16"),
])
def test_faa_alignment(final, runway, gps, allowed):
    a = _assess(final, runway, gps=gps)
    assert a.straight_in_allowed is allowed
    if not allowed:
        (reason,) = a.reasons
        assert reason.code == "alignment" and reason.unit == "deg"
        assert reason.limit == (15.0 if gps else 30.0)


@pytest.mark.parametrize("gradient, allowed", [
    # TERPS non-precision final (V2): maximum 400 ft/NM, above it circling only
    (318.4, True), (400.0, True), (401.0, False)])
def test_faa_gradient(gradient, allowed):
    a = _assess(100.0, 100.0, gradient=gradient)
    assert a.straight_in_allowed is allowed
    if not allowed:
        (reason,) = a.reasons
        assert (reason.code, reason.value, reason.limit, reason.unit) == ("gradient", 401.0, 400.0, "ft/NM")


@pytest.mark.parametrize("category, offset_deg, allowed", [
    # Doc 8168 Vol II Part I Sec 4 (V2): alignment <= 30 deg for Cat A/B, <= 15 deg for C/D/E
    ("A", 30.0, True), ("B", 31.0, False), ("C", 15.0, True), ("D", 16.0, False),
    ("E", 25.0, False), ("A", 25.0, True)])
def test_icao_alignment(category, offset_deg, allowed):
    a = _assess(360.0 - offset_deg / 2.0, offset_deg / 2.0, category=category, criteria="icao")
    assert a.straight_in_allowed is allowed


@pytest.mark.parametrize("category, pct, allowed", [
    # Doc 8168 Vol II Part I Sec 4 Ch 5 (V2): max 6.5 % (Cat A/B), 6.1 % (Cat C/D/E)
    ("A", 6.5, True), ("B", 6.6, False), ("C", 6.1, True), ("C", 6.2, False), ("E", 6.4, False)])
def test_icao_gradient(category, pct, allowed):
    a = _assess(90.0, 90.0, gradient=pct / 100.0 * NM_TO_FT, category=category, criteria="icao")
    assert a.straight_in_allowed is allowed
    assert_allclose(a.gradient_pct, pct, rtol=1e-12)
    if not allowed:
        assert a.reasons[0].unit == "pct"


def test_both_reasons_listed():
    # AIM 5-4-20 c) and TERPS gradient: both reasons are reported, alignment first
    a = _assess(40.0, 0.0, gradient=450.0)
    assert [r.code for r in a.reasons] == ["alignment", "gradient"]
    assert not a.straight_in_allowed


@settings(max_examples=200)
@given(final=st.floats(0.0, 360.0), runway=st.floats(0.0, 360.0), turns=st.integers(-1, 1))
def test_alignment_symmetric_and_periodic(final, runway, turns):
    # invariants: swapping the courses or adding whole turns does not change the alignment
    a = _assess(final, runway).alignment_deg
    assert 0.0 <= a <= 180.0
    assert_allclose(_assess(runway, final).alignment_deg, a, atol=1e-9)
    assert_allclose(_assess(final + 360.0 * turns, runway).alignment_deg, a, atol=1e-9)


def test_negative_gradient_is_a_domain_error():
    with pytest.raises(DomainError, match="gradient"):
        _assess(0.0, 0.0, gradient=-10.0)


@settings(max_examples=300)
@given(vref=st.floats(40.0, 215.0), circ=st.floats(-10.0, 320.0),
       crit=st.sampled_from(["terps-legacy", "terps-expanded", "icao"]))
def test_category_at_speed_is_the_category_of_category_for_approach(vref, circ, crit):
    # the same rule (14 CFR 97.3; Doc 8168 Table I-4-1-2) without its texts: the same category,
    # or the same error for a speed or VAT outside the rule
    try:
        expected = cr.category_for_approach(vref_kt=vref, circling_speed_kt=circ, criteria=crit).category
    except DomainError as exc:
        with pytest.raises(DomainError, match=re.escape(str(exc))):
            cr.category_at_speed(vref_kt=vref, circling_speed_kt=circ, criteria=crit)
        return
    assert cr.category_at_speed(vref_kt=vref, circling_speed_kt=circ, criteria=crit) == expected
