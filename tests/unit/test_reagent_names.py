"""Names people use for ingredients: salt names, synonyms, hydrates, suggestions (issue 19)."""

from __future__ import annotations

import pytest

import ionwright
from ionwright.chemistry._ingredients import makeup
from ionwright.chemistry._salt_names import AmbiguousSaltName, formula_from_name
from ionwright.errors import RecipeError, UnknownNameError

TABLES = ["core", "metals", "organics"]


@pytest.mark.parametrize("name, formula", [
    ("sodium chloride", "NaCl"), ("potassium chloride", "KCl"),
    ("calcium chloride dihydrate", "CaCl2·2H2O"), ("magnesium sulfate heptahydrate", "MgSO4·7H2O"),
    ("disodium hydrogen phosphate dodecahydrate", "Na2HPO4·12H2O"),
    ("potassium dihydrogen phosphate", "KH2PO4"), ("monopotassium phosphate", "KH2PO4"),
    ("trisodium phosphate", "Na3PO4"), ("sodium bicarbonate", "NaHCO3"),
    ("sodium hydrogen carbonate", "NaHCO3"), ("sodium carbonate", "Na2CO3"),
    ("aluminium sulfate", "Al2(SO4)3"), ("ammonium sulfate", "(NH4)2SO4"),
    ("calcium hydroxide", "Ca(OH)2"), ("iron(III) chloride hexahydrate", "FeCl3·6H2O"),
    ("sodium hydroxide", "NaOH"), ("hydrochloric acid", "HCl"), ("sulphuric acid", "H2SO4"),
    ("sodium sulfate anhydrous", "Na2SO4"),
])
def test_salt_names_read_as_formulas(name, formula):
    assert formula_from_name(name) == formula


@pytest.mark.parametrize("name", ["glucose", "sodium acetate", "HEPES", "NaCl", "sodium"])
def test_other_names_are_not_salt_names(name):
    assert formula_from_name(name) is None


def test_a_phosphate_without_its_cation_count_is_refused_with_the_three_meanings():
    with pytest.raises(AmbiguousSaltName, match=r"NaH2PO4.*Na2HPO4.*Na3PO4"):
        formula_from_name("sodium phosphate")
    with pytest.raises(RecipeError, match="sodium phosphate"):
        ionwright.solve({"dissolve": {"sodium phosphate": 0.01}})


@pytest.mark.parametrize("name", ["sodium chloride", "glacial acetic acid", "sodium benzoate",
                                  "potassium sorbate", "lactic acid", "triethanolamine",
                                  "HEPES sodium salt", "EDTA disodium", "Tris base",
                                  "TRIS hydrochloride", "dextrose", "glycerin"])
def test_names_of_issue_19_are_accepted(name):
    result = ionwright.solve({"tables": TABLES, "dissolve": {name: 0.01}})
    assert result.converged


def test_a_named_salt_makes_what_its_formula_makes():
    tables = ionwright.load_tables(TABLES)
    assert dict(makeup("sodium chloride", tables).per_mole) == {"Na+": 1.0, "Cl-": 1.0}
    assert makeup("calcium chloride dihydrate", tables).molar_mass == pytest.approx(147.01,
                                                                                     abs=0.01)


@pytest.mark.parametrize("typed, first", [
    ("NaCL", "NaCl"), ("kh2po4", "KH2PO4"), ("sodium chlorde", "sodium chloride"),
    ("sodim benzoate", "sodium benzoate"), ("potasium sorbate", "potassium sorbate"),
    ("glucse", "glucose"), ("triethanolamin", "triethanolamine"),
])
def test_suggestions_rank_by_the_whole_name(typed, first):
    with pytest.raises(UnknownNameError) as caught:
        ionwright.solve({"tables": TABLES, "dissolve": {typed: 0.01}})
    assert caught.value.suggestions[0] == first
    assert f"did you mean {first!r}" in str(caught.value)


def test_sodium_chloride_never_suggests_sodium_hepes():
    with pytest.raises(UnknownNameError) as caught:
        ionwright.solve({"tables": TABLES, "dissolve": {"sodium chlorid": 0.01}})
    assert "sodium HEPES" not in caught.value.suggestions


def test_a_glucose_formula_does_not_become_acetic_acid():
    """Element balance must not turn C6H12O6 into three acetic acids: the formula is
    refused with the organic hint, the name works."""
    with pytest.raises(RecipeError, match="organic ingredients must be named reagents"):
        ionwright.solve({"tables": TABLES, "dissolve": {"C6H12O6": 0.1}})
    made = makeup("glucose", ionwright.load_tables(TABLES))
    assert dict(made.per_mole) == {"Glucose": 1.0}
