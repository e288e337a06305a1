"""Buffer quantities per kg and per litre, the recipe in grams, hydrates as buffer forms."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.design._buffer import design_buffer

HEPES = {"dissolve": {"HEPES": "50 mmol/L", "NaOH": "25 mmol/L"}, "volume": "2 L"}


def test_buffer_capacity_of_a_half_neutralised_weak_acid():
    """β = ln10·C·α(1−α) + water terms (Van Slyke 1922): 0.0288 mol/(kg·pH) at α = ½."""
    result = ionwright.solve({"activity_model": "ideal", "dissolve": {"HEPES": 0.05,
                                                                      "NaOH": 0.025}})
    h = 10 ** -result.pH
    alpha = result.species_molality("HEPES-") / 0.05
    expected = np.log(10) * (0.05 * alpha * (1 - alpha) + h + 10 ** -13.995 / h)
    assert result.buffer["buffer_capacity_mol_per_kg_per_pH"] == pytest.approx(expected,
                                                                                rel=1e-3)


def test_per_litre_values_use_the_solution_water():
    result = ionwright.solve(HEPES)
    b, sol = result.buffer, result.solution
    assert b["ionic_strength_mol_per_L"] == pytest.approx(result.ionic_strength
                                                          * sol.water_kg_per_L)
    assert b["buffer_capacity_mol_per_L_per_pH"] == pytest.approx(
        b["buffer_capacity_mol_per_kg_per_pH"] * sol.water_kg_per_L)
    frame = result.to_frame()
    assert frame.attrs["ionic_strength_mol_per_L"] == b["ionic_strength_mol_per_L"]
    data = result.to_dict()
    assert data["buffer"] == b and "osmolality_mOsm_per_kg" in data


def test_fixed_pH_has_no_buffer_capacity():
    result = ionwright.solve({"dissolve": {"NaCl": 0.1}, "fix": {"pH": 7.0}})
    assert result.buffer["buffer_capacity_mol_per_kg_per_pH"] is None


def test_recipe_in_grams_per_litre_and_per_batch():
    result = ionwright.solve(HEPES)
    rows = {r["ingredient"]: r for r in result.to_dict()["recipe_grams"]}
    assert rows["HEPES"]["g_per_L"] == pytest.approx(0.050 * 238.30, rel=1e-4)
    assert rows["HEPES"]["g_per_batch"] == pytest.approx(2 * 0.050 * 238.30, rel=1e-4)


def test_a_hydrate_is_a_buffer_form():
    """`buffer --form` takes a hydrate or a salt name, not only the listed forms."""
    card = design_buffer("phosphate", 7.2, "50 mmol/L", titrant="NaOH 1 mol/L",
                         form="NaH2PO4·2H2O")
    assert card.weigh[0].name == "NaH2PO4·2H2O"
    assert card.weigh[0].grams == pytest.approx(0.05 * 156.01, rel=1e-3)
    pair = design_buffer("phosphate", 7.2, "50 mmol/L", pair=True,
                         form="NaH2PO4·2H2O,disodium hydrogen phosphate heptahydrate")
    assert [w.formula for w in pair.weigh] == ["NaH2PO4·2H2O", "Na2HPO4·7H2O"]
