"""The same solution written in g, mmol, mol/L or mg/L gives the same speciation."""

from __future__ import annotations

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

import ionwright
from ionwright.chemistry._formula import molar_mass

POOL = ["NaCl", "KCl", "CaCl2·2H2O", "MgSO4·7H2O", "KH2PO4", "Na2HPO4·7H2O", "NaHCO3",
        "citric acid monohydrate", "NH4Cl", "Na2SO4"]
FORMULAS = {"citric acid monohydrate": "C6H8O7·H2O"}


@st.composite
def solutions(draw):
    names = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=4, unique=True))
    moles = {n: draw(st.floats(min_value=1e-4, max_value=0.05)) for n in names}
    return {"water_kg": draw(st.floats(min_value=0.2, max_value=2.0)),
            "temperature_C": draw(st.floats(min_value=5.0, max_value=45.0)),
            "moles": moles}


def grams(name: str, mol: float) -> float:
    return mol * molar_mass(FORMULAS.get(name, name))


def solve(case, basis, amounts):
    return ionwright.solve({"temperature_C": case["temperature_C"], **basis,
                            "dissolve": amounts})


@given(solutions())
def test_same_solution_in_any_units_gives_the_same_speciation(case):
    """Invariant: pH, every species' molality and the water mass do not depend on the
    units the amounts are written in (g or mmol in weighed water; mol/L or mg/L made up
    to the same final volume; mol/L in the same weighed water)."""
    moles = case["moles"]
    water = {"water": f"{case['water_kg']!r} kg"}
    by_mass = solve(case, water, {n: f"{grams(n, m)!r} g" for n, m in moles.items()})
    volume = by_mass.recipe.solution.volume_L
    made_up = {"volume": f"{volume!r} L"}
    others = [
        solve(case, water, {n: f"{1000 * m!r} mmol" for n, m in moles.items()}),
        solve(case, made_up, {n: f"{m / volume!r} mol/L" for n, m in moles.items()}),
        solve(case, made_up, {n: f"{1000 * grams(n, m) / volume!r} mg/L"
                              for n, m in moles.items()}),
        solve(case, water, {n: f"{m / volume!r} mol/L" for n, m in moles.items()}),
    ]
    for other in others:
        assert other.system.species == by_mass.system.species
        assert abs(other.pH - by_mass.pH) < 1e-9
        np.testing.assert_allclose(other.molality, by_mass.molality, rtol=1e-8, atol=1e-30)
        assert abs(other.recipe.solution.water_kg / by_mass.recipe.solution.water_kg - 1) < 1e-10
