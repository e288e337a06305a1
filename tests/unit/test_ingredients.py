"""Ingredients into components: named reagents, neutral species, and formula splitting."""

from __future__ import annotations

import pytest

from ionwright import load_tables
from ionwright.errors import RecipeError, UnknownNameError
from ionwright.chemistry._ingredients import makeup


@pytest.fixture(scope="module")
def core():
    return load_tables(["core"])


@pytest.mark.parametrize("formula, expected", [
    ("NaCl", {"Na+": 1, "Cl-": 1}),
    ("KH2PO4", {"K+": 1, "PO4^3-": 1, "H+": 2}),
    ("Na2HPO4·7H2O", {"Na+": 2, "PO4^3-": 1, "H+": 1, "H2O": 7}),
    ("NaOH", {"Na+": 1, "H+": -1, "H2O": 1}),
    ("Ca(OH)2", {"Ca2+": 1, "H+": -2, "H2O": 2}),
    ("NaHCO3", {"Na+": 1, "CO3^2-": 1, "H+": 1}),
    ("MgSO4.7H2O", {"Mg2+": 1, "SO4^2-": 1, "H2O": 7}),
    ("NH4Cl", {"NH3": 1, "H+": 1, "Cl-": 1}),
    ("HCl", {"H+": 1, "Cl-": 1}),
    ("Na2S", {"Na+": 2, "HS-": 1, "H+": -1}),
])
def test_inorganic_formulas_split_by_element_and_charge_balance(core, formula, expected):
    made = makeup(formula, core)
    assert made.how in ("split", "species")  # NaHCO3 is also an ion pair of the table
    assert made.per_mole == pytest.approx({k: float(v) for k, v in expected.items()})


def test_named_reagent_uses_its_makes(core):
    made = makeup("citric acid", core)
    assert made.how == "reagent"
    assert made.per_mole == {"Cit^3-": 1.0, "H+": 3.0}
    assert made.molar_mass == pytest.approx(192.12, abs=0.01)  # C6H8O7, IUPAC 2021 weights


def test_reagent_names_are_case_insensitive(core):
    assert makeup("TRIS", core).per_mole == makeup("Tris", core).per_mole


def test_organic_formula_is_refused_with_a_hint(core):
    # glucose balances into three acetic acids by elements alone: that must not happen
    with pytest.raises(RecipeError) as err:
        makeup("C6H12O6", core)
    assert "named reagents" in str(err.value)


def test_ion_as_ingredient_is_refused(core):
    with pytest.raises(RecipeError) as err:
        makeup("HCO3-", core)
    assert "must be neutral" in str(err.value)


def test_unknown_name_suggests_close_matches(core):
    with pytest.raises(UnknownNameError) as err:
        makeup("citric acd", core)
    assert "citric acid" in str(err.value)


def test_unsplittable_formula_says_what_to_do(core):
    with pytest.raises(RecipeError) as err:
        makeup("Na2SO3", core)  # sulfite: no S(IV) component in the core table
    assert "cannot be made from the components" in str(err.value)
