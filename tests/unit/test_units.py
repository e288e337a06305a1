"""Quantities with units: parsing, dimensions, bases ("as N"), and the errors."""

from __future__ import annotations

import pytest

from ionwright.errors import RecipeError
from ionwright.chemistry._formula import parse_formula
from ionwright.inputs._units import basis_moles_per_mole, expect, parse_quantity


@pytest.mark.parametrize("text, value, dimension", [
    ("3.40 g", 3.40, "mass"),
    ("250 mg", 0.25, "mass"),
    ("12 mmol", 0.012, "amount"),
    ("5 µmol", 5e-6, "amount"),        # micro sign U+00B5
    ("5 μmol", 5e-6, "amount"),        # Greek mu U+03BC
    ("5 umol", 5e-6, "amount"),
    ("1.0 mol/L", 1.0, "molarity"),
    ("25 mM", 0.025, "molarity"),
    ("12.5 mL", 0.0125, "volume"),
    ("12.5 ml", 0.0125, "volume"),
    ("0.1 mol/kg", 0.1, "molality"),
    ("48 mg/L", 0.048, "mass_per_volume"),
    ("48 mg/l", 0.048, "mass_per_volume"),
    ("3 µg/L", 3e-6, "mass_per_volume"),
    ("1.02 g/mL", 1020.0, "mass_per_volume"),
    ("2 % w/v", 20.0, "mass_per_volume"),
    ("3.2 meq/L", 3.2e-3, "equivalents"),
    ("10 % w/w", 0.10, "mass_fraction"),
    ("1e-3 mol", 1e-3, "amount"),
    # per 100 mL and per decilitre, in either case of L (issue 16: "g/100 ml" was refused
    # and "g/dL" was offered "g/L", ten times off)
    ("0.9 g/100 mL", 9.0, "mass_per_volume"),
    ("0.9 g/100 ml", 9.0, "mass_per_volume"),
    ("0.9 g/dL", 9.0, "mass_per_volume"),
    ("90 mg/dl", 0.9, "mass_per_volume"),
    ("35 ppm", 35e-6, "mass_fraction"),
    ("5 ppb", 5e-9, "mass_fraction"),   # "did you mean 'ppm'" was a thousand times off
])
def test_quantities_parse_to_base_units(text, value, dimension):
    q = parse_quantity(text, "k")
    assert q.dimension == dimension
    assert q.value == pytest.approx(value, rel=1e-15)


def test_powers_of_ten_convert_exactly():
    assert parse_quantity("5 µmol", "k").value == 5e-6
    assert parse_quantity("12.5 mL", "k").value == 0.0125


def test_basis_is_read_after_as():
    q = parse_quantity("2.1 mg/L as N", "k")
    assert q.basis == parse_formula("N") and q.value == pytest.approx(2.1e-3)
    assert parse_quantity("160 mg/L as CaCO3", "k").basis == parse_formula("CaCO3")


@pytest.mark.parametrize("text, problem", [
    ("3 gallons", "unknown unit 'gallons'"),
    ("3 %", "unknown unit"),
    ("-3 g", "must be a finite amount ≥ 0"),
    ("g", "does not start with a number"),
    ("3", "has no unit"),
    ("3 mmol as N", "applies to masses only"),
    ("3 mg/L as Qq", "is not a formula"),
])
def test_bad_quantities_name_the_key(text, problem):
    with pytest.raises(RecipeError) as err:
        parse_quantity(text, "recipe.toml [dissolve] 'NaCl'")
    assert problem in str(err.value)
    assert "[dissolve] 'NaCl'" in str(err.value)


def test_a_mass_per_kg_is_not_offered_an_amount_per_kg():
    """"mg/kg" once got "did you mean 'mol/kg'": a mass is no amount, the hint says which
    units mean a mass per kg of solution and which an amount per kg of water. Since issue
    15 mg/kg, g/kg and ug/kg are read as per kg of solution (as ppm); a mass per kg they do
    not list is refused with that hint."""
    assert parse_quantity("35 mg/kg", "k") == parse_quantity("35 ppm", "k").__class__(
        parse_quantity("35 ppm", "k").value, "mass_fraction", "35 mg/kg", None, -6)
    with pytest.raises(RecipeError) as err:
        parse_quantity("35 ng/kg", "k")
    assert "did you mean" not in str(err.value)
    assert "ppm" in err.value.hint and "mmol/kg" in err.value.hint


def test_close_unit_is_suggested():
    with pytest.raises(RecipeError, match="did you mean 'mmol'"):
        parse_quantity("3 mmmol", "k")


def test_a_number_without_quotes_is_refused_as_a_quantity():
    with pytest.raises(RecipeError, match="in quotes"):
        parse_quantity(3.0, "k")


def test_wrong_dimension_names_the_key_and_what_it_needs():
    q = parse_quantity("3 g", "k")
    with pytest.raises(RecipeError) as err:
        expect(q, ("molarity", "mass_per_volume"), "[analysis] Ca")
    text = str(err.value)
    assert "[analysis] Ca" in text and "is a mass" in text and "per litre" in text


@pytest.mark.parametrize("basis, target, per_mole", [
    ("N", "NO3-", 1.0),        # one N per nitrate
    ("N", "NH4+", 1.0),
    ("P", "PO4^3-", 1.0),
    ("SiO2", "H4SiO4", 1.0),   # one Si each
    ("N", "N2O5", 2.0),        # two N per N2O5
    ("CaCO3", "Ca2+", 1.0),    # shared Ca
    ("CaCO3", "Mg2+", 1.0),    # by equivalents: 2 eq per mol of each
    ("CaCO3", "Na+", 0.5),
])
def test_basis_moles_per_mole(basis, target, per_mole):
    assert basis_moles_per_mole(parse_formula(basis), parse_formula(target), "k") == per_mole


def test_unrelated_basis_is_an_error():
    with pytest.raises(RecipeError, match="share no element"):
        basis_moles_per_mole(parse_formula("P"), parse_formula("NO3-"), "[analysis] NO3")
