"""Copper(II) speciation against the IUPAC evaluation of Powell et al. (2007).

Source of every check: Powell, K.J. et al. (2007) Chemical speciation of environmentally
significant metals with inorganic ligands. Part 2: The Cu2+–OH−, Cl−, CO32−, SO42−, and
PO43− systems (IUPAC Technical Report). Pure Appl. Chem. 79, 895–950, abstract (re-read):
in weakly acidic fresh water Cu(II) is dominated by Cu2+(aq) with CuSO4(aq) as a minor
species; in seawater by CuCO3(aq), with Cu(OH)+, Cu2+, CuCl+, Cu(CO3)OH−, Cu(OH)2(aq) and
Cu(CO3)2 2− as minor species; in weakly acidic saline water by Cu2+ and CuCl+, with CuSO4
and CuCl2 minor. The constants themselves are the report's values as recalled (flagged in
constants/metals.toml). The waters are typical compositions (common practice), not the
report's exact model solutions.
"""

from __future__ import annotations

import pytest

from _metals import dominant, shares, solve

COPPER = 1e-8  # mol/kg, a trace: it must not change the background chemistry

# Seawater major ions, S = 35 (mol/kg; rounded, common practice), as neutral salts.
SEAWATER = {"NaCl": 0.420, "MgCl2": 0.0546, "MgSO4": 0.0282, "CaCl2": 0.0103,
            "KCl": 0.0102, "NaHCO3": 0.00205}

# A soft fresh water (common practice): 0.5 mmol Ca, 0.2 mmol Mg, 1 mmol bicarbonate.
FRESH_WATER = {"CaCl2": 0.0005, "MgSO4": 0.0002, "NaHCO3": 0.001}


@pytest.mark.parametrize("model", ["davies", "truesdell-jones"])
def test_copper_in_seawater_is_mostly_its_carbonate_complex(model):
    result = solve({**SEAWATER, "CuCl2": COPPER}, pH=8.1, model=model)
    found = shares(result, "Cu")
    assert dominant(result, "Cu") == "CuCO3"
    assert found["CuCO3"] > 0.5
    # the minor species the report lists are each present at a few per cent or more
    for minor in ("Cu2+", "CuOH+", "CuCl+", "Cu(OH)2", "Cu(CO3)2^2-"):
        assert 0.005 < found[minor] < found["CuCO3"], minor


def test_copper_in_weakly_acidic_fresh_water_is_mostly_the_free_ion():
    result = solve({**FRESH_WATER, "CuSO4": COPPER}, pH=6.0)
    found = shares(result, "Cu")
    assert dominant(result, "Cu") == "Cu2+"
    assert found["Cu2+"] > 0.85
    # CuSO4(aq) is the minor species named by the report: the largest of the rest but small
    others = {k: v for k, v in found.items() if k not in ("Cu2+", "CuCO3")}
    assert max(others, key=others.get) == "CuSO4"
    assert found["CuSO4"] < 0.1


def test_copper_in_weakly_acidic_saline_water_is_free_ion_and_chloride():
    result = solve({**SEAWATER, "CuCl2": COPPER}, pH=5.5)
    found = shares(result, "Cu")
    ranked = sorted(found, key=found.get, reverse=True)
    assert set(ranked[:2]) == {"Cu2+", "CuCl+"}  # the report names both, in no order
    assert found["Cu2+"] + found["CuCl+"] > 0.75
    assert {"CuSO4", "CuCl2"} <= set(ranked[2:4])
