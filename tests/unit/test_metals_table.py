"""The bundled metals table: it loads by name on top of core, checks clean, and the
water-treatment and laboratory ingredients of issue 17 split into its components."""

from __future__ import annotations

import subprocess
import sys
import pytest

import ionwright
from ionwright.chemistry._ingredients import makeup
from ionwright.data._bundled import bundled_folder


@pytest.fixture(scope="module")
def tables():
    return ionwright.load_tables(["core", "metals"])


def test_metals_is_a_bundled_table_that_checks_clean():
    path = bundled_folder() / "metals.toml"
    done = subprocess.run([sys.executable, "-m", "ionwright", "tables", "check", str(path)],
                          capture_output=True, text=True)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "table 'metals'" in done.stdout


def test_metals_overrides_nothing_in_core(tables):
    assert not tables.overrides


@pytest.mark.parametrize("ingredient, expected", [
    ("FeCl3", {"Fe3+": 1, "Cl-": 3}),
    ("FeCl3·6H2O", {"Fe3+": 1, "Cl-": 3, "H2O": 6}),
    ("FeSO4·7H2O", {"Fe2+": 1, "SO4^2-": 1, "H2O": 7}),
    ("Al2(SO4)3·18H2O", {"Al3+": 2, "SO4^2-": 3, "H2O": 18}),
    ("alum", {"Al3+": 2, "SO4^2-": 3, "H2O": 18}),
    ("CuSO4·5H2O", {"Cu2+": 1, "SO4^2-": 1, "H2O": 5}),
    ("ZnSO4·7H2O", {"Zn2+": 1, "SO4^2-": 1, "H2O": 7}),
    ("Pb(NO3)2", {"Pb2+": 1, "NO3-": 2}),
    ("SrCl2", {"Sr2+": 1, "Cl-": 2}),
    ("BaCl2", {"Ba2+": 1, "Cl-": 2}),
    ("NaBr", {"Na+": 1, "Br-": 1}),
    ("LiCl", {"Li+": 1, "Cl-": 1}),
    ("Na2HAsO4·7H2O", {"Na+": 2, "AsO4^3-": 1, "H+": 1, "H2O": 7}),
    ("As2O3", {"H3AsO3": 2, "H2O": -3}),
])
def test_ingredients_split_into_metals_components(tables, ingredient, expected):
    assert makeup(ingredient, tables).per_mole == expected


def test_alum_is_the_water_treatment_aluminium_sulfate(tables):
    reagent = tables.reagent("filter alum")
    assert reagent is not None and reagent.formula == "Al2(SO4)3·18H2O"
    assert makeup("alum", tables).molar_mass == pytest.approx(666.4, abs=0.1)


def test_a_recipe_without_metals_compiles_no_metal_species():
    result = ionwright.solve({"tables": ["core", "metals"], "dissolve": {"NaCl": 0.01}})
    assert not any(name.startswith(("Fe", "Al", "Cu")) for name in result.system.species)


@pytest.mark.parametrize("name, formula", [
    ("ferric chloride", "FeCl3"), ("iron(III) chloride hexahydrate", "FeCl3·6H2O"),
    ("ferrous sulfate heptahydrate", "FeSO4·7H2O"), ("iron(II) sulfate heptahydrate", "FeSO4·7H2O"),
    ("aluminium sulfate octadecahydrate", "Al2(SO4)3·18H2O"),
    ("aluminum sulfate tetradecahydrate", "Al2(SO4)3·14H2O"),
    ("copper(II) sulfate pentahydrate", "CuSO4·5H2O"), ("zinc sulphate heptahydrate", "ZnSO4·7H2O"),
    ("lead(II) nitrate", "Pb(NO3)2"), ("lead nitrate", "Pb(NO3)2"),
    ("strontium chloride hexahydrate", "SrCl2·6H2O"), ("barium chloride dihydrate", "BaCl2·2H2O"),
    ("sodium bromide", "NaBr"), ("lithium chloride", "LiCl"),
    ("disodium hydrogen arsenate heptahydrate", "Na2HAsO4·7H2O"), ("sodium arsenite", "NaAsO2"),
    ("manganese(II) sulfate monohydrate", "MnSO4·H2O"), ("nickel(II) sulfate hexahydrate",
                                                         "NiSO4·6H2O"),
    ("sodium nitrite", "NaNO2"), ("ferric sulfate", "Fe2(SO4)3"),
])
def test_names_people_use_make_what_their_formula_makes(tables, name, formula):
    assert makeup(name, tables).per_mole == makeup(formula, tables).per_mole


def test_sodium_arsenate_without_its_cation_count_is_refused_with_the_three_salts():
    with pytest.raises(ionwright.errors.RecipeError,
                       match=r"NaH2AsO4.*Na2HAsO4.*Na3AsO4"):
        ionwright.solve({"dissolve": {"sodium arsenate": 1e-4}})
