"""Molality ↔ molarity of NaCl solutions against a published density table.

Source: CRC Handbook of Chemistry and Physics, "Concentrative Properties of Aqueous
Solutions: Density, Refractive Index, Freezing Point Depression, and Viscosity",
sodium chloride, 20 °C: mass %, molality m / mol kg⁻¹, molarity c / mol L⁻¹ and
density ρ / g cm⁻³. Every row below is from memory; each is self-consistent
(m = w/((1−w)M), c = wρ/M to the printed digits). The check is the density estimate
of ionwright.density (Kell water + Millero ionic volumes + limiting-law term), which
the table does not feed: 0.5 % is the issue's tolerance.
"""

from __future__ import annotations

import pytest

import ionwright
from ionwright.chemistry._formula import molar_mass
from ionwright.inputs._recipe import read_recipe

M_NACL = molar_mass("NaCl")

# mass %, m, c, ρ  — CRC Handbook, NaCl, 20 °C  # from memory
CRC_NACL_20C = [
    (1.0, 0.173, 0.172, 1.0053),
    (2.0, 0.349, 0.346, 1.0125),
    (5.0, 0.901, 0.885, 1.0340),
    (10.0, 1.901, 1.832, 1.0707),
    (15.0, 3.020, 2.845, 1.1085),
    (20.0, 4.278, 3.928, 1.1478),
    (26.0, 6.012, 5.326, 1.1972),
]


@pytest.mark.parametrize("percent, m, c, rho", CRC_NACL_20C)
def test_the_table_rows_are_self_consistent(percent, m, c, rho):
    w = percent / 100
    assert w / ((1 - w) * M_NACL) * 1000 == pytest.approx(m, abs=0.0015)
    assert w * rho * 1000 / M_NACL == pytest.approx(c, abs=0.0015)


@pytest.mark.parametrize("percent, m, c, rho", CRC_NACL_20C)
def test_molarity_to_molality(percent, m, c, rho):
    recipe = read_recipe({"temperature_C": 20.0, "dissolve": {"NaCl": f"{c} mol/L"}})
    assert dict(recipe.dissolve)["NaCl"] == pytest.approx(m, rel=0.005)


@pytest.mark.parametrize("percent, m, c, rho", CRC_NACL_20C)
def test_molality_to_molarity_and_density(percent, m, c, rho):
    recipe = read_recipe({"temperature_C": 20.0, "water": "1 kg", "dissolve": {"NaCl": m}})
    sol = recipe.solution
    assert sol.density_g_per_mL == pytest.approx(rho, rel=0.005)
    assert m * sol.water_kg / sol.volume_L == pytest.approx(c, rel=0.005)


@pytest.mark.parametrize("percent, m, c, rho", CRC_NACL_20C)
def test_mass_percent_to_molality_needs_no_density(percent, m, c, rho):
    recipe = read_recipe({"temperature_C": 20.0, "dissolve": {"NaCl": f"{percent} % w/w"}})
    assert dict(recipe.dissolve)["NaCl"] == pytest.approx(m, abs=0.0015)


def test_the_estimate_is_reported_as_an_estimate():
    data = ionwright.solve({"temperature_C": 20.0,
                            "dissolve": {"NaCl": "1.832 mol/L"}}).to_dict()["solution"]
    assert data["density"] == "estimated" and "Millero" in data["density_method"]
    assert data["density_g_per_mL"] == pytest.approx(1.0707, rel=0.005)
