"""Water analyses: mapping analytes, per-litre conversion, carbonate from alkalinity
and pH (with activity corrections), balancing, and the errors."""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.outputs._derived import charge_balance_error_percent, water_kg_per_L
from ionwright import load_tables
from ionwright.errors import RecipeError
from ionwright.chemistry._formula import molar_mass
from ionwright.core._system import log10_k_at

MEQ_PER_MG_CACO3 = 2.0 / molar_mass("CaCO3")  # 1 mmol CaCO3 = 2 meq

# Alkalinity weights typed here by hand for the species of a Na-K-Ca-Mg-Cl-carbonate
# water (Dickson 1981 zero levels: H2CO3*, H2O), independent of the code's own rule.
HAND_WEIGHTS = {"HCO3-": 1, "CO3^2-": 2, "OH-": 1, "H+": -1, "NaCO3-": 2, "NaHCO3": 1,
                "CaHCO3+": 1, "CaCO3": 2, "MgHCO3+": 1, "MgCO3": 2, "CaOH+": 1,
                "MgOH+": 1}


def saline(model, alkalinity="250 mg/L as CaCO3", ph=8.1, **extra):
    analysis = {"temperature_C": 15.0, "pH": ph, "Na": "2300 mg/L", "K": "40 mg/L",
                "Ca": "120 mg/L", "Mg": "60 mg/L", "Cl": "3900 mg/L",
                "alkalinity": alkalinity, **extra}
    return ionwright.solve({"activity_model": model, "analysis": analysis})


@pytest.mark.parametrize("model", ["ideal", "davies", "extended-debye-huckel",
                                   "truesdell-jones"])
def test_solved_sample_reproduces_the_measured_alkalinity(model):
    result = saline(model)
    assert result.ionic_strength > 0.08  # activity corrections matter here
    alk = sum(w * result.species_molality(s) for s, w in HAND_WEIGHTS.items()
              if s in result.system.species)
    per_litre = alk * water_kg_per_L(result)
    assert per_litre == pytest.approx(250 * MEQ_PER_MG_CACO3 * 1e-3, rel=1e-9)
    assert result.pH == pytest.approx(8.1, abs=1e-12)


def test_activity_corrections_change_the_carbonate_total():
    ideal = dict(saline("ideal", ph=9.3).recipe.components)["CO3^2-"]
    davies = dict(saline("davies", ph=9.3).recipe.components)["CO3^2-"]
    assert abs(davies / ideal - 1) > 0.02


def test_carbonate_total_matches_the_closed_form_without_ion_pairs():
    # K+ and Cl- form no carbonate pairs in the core table, so with ideal activities
    # C_T = (A - Kw/[H+] + [H+]) / (α1 + 2 α2), with the table's own constants.
    ph, t = 8.6, 25.0
    result = ionwright.solve({"activity_model": "ideal", "analysis": {
        "temperature_C": t, "pH": ph, "K": "200 mg/L", "Cl": "150 mg/L",
        "alkalinity": "4.0 meq/L"}})
    tables = load_tables(["core"])
    tc = np.array([t])
    log_k2 = float(log10_k_at(tables.species["HCO3-"].logk, tc)[0])   # CO3 + H = HCO3
    log_k1 = float(log10_k_at(tables.species["CO2"].logk, tc)[0])      # HCO3 + H = CO2 + H2O
    log_kw = float(log10_k_at(tables.species["OH-"].logk, tc)[0])      # H2O - H = OH
    h = 10.0 ** -ph
    shares = np.array([1.0, 10 ** log_k2 * h, 10 ** (log_k2 + log_k1) * h * h])  # CO3, HCO3, CO2
    alpha = shares / shares.sum()
    alk = 4.0e-3 / water_kg_per_L(result)
    expected = (alk - 10 ** log_kw / h + h) / (2 * alpha[0] + alpha[1])
    assert dict(result.recipe.components)["CO3^2-"] == pytest.approx(expected, rel=1e-9)


def test_per_litre_values_become_per_kg_of_water():
    result = ionwright.solve({"analysis": {"pH": 7.0, "Ca": "48 mg/L", "Cl": "85 mg/L",
                                           "NO3": "2.1 mg/L as N", "SiO2": "12 mg/L",
                                           "ammonia": "0.8 mg/L as N",
                                           "PO4": "0.3 mg/L as P", "F": "0.5 mg/L",
                                           "Mg": "0.5 meq/L", "K": "0.1 mmol/L"}})
    per_litre = water_kg_per_L(result)
    assert 0.9965 < per_litre < 0.9971  # water at 25 °C is 0.99705 kg/L
    totals = dict(result.recipe.components)
    expect = {"Ca2+": 48e-3 / molar_mass("Ca"), "NO3-": 2.1e-3 / molar_mass("N"),
              "H4SiO4": 12e-3 / molar_mass("SiO2"), "NH3": 0.8e-3 / molar_mass("N"),
              "PO4^3-": 0.3e-3 / molar_mass("P"), "F-": 0.5e-3 / molar_mass("F"),
              "Mg2+": 0.25e-3, "K+": 0.1e-3, "Cl-": 85e-3 / molar_mass("Cl")}
    for component, mol_per_L in expect.items():
        assert totals[component] == pytest.approx(mol_per_L / per_litre, rel=1e-12)


def test_named_analytes_and_sulfide():
    result = ionwright.solve({"analysis": {"pH": 7.0, "Na": "10 mg/L",
                                           "sulfide": "0.32 mg/L", "silica": "6 mg/L"}})
    totals = dict(result.recipe.components)
    assert totals["HS-"] == pytest.approx(0.32e-3 / molar_mass("S") / water_kg_per_L(result))
    assert "H4SiO4" in totals


def test_balance_on_makes_the_sample_electroneutral():
    unbalanced = saline("davies")
    balanced = saline("davies", balance_on="Cl")
    assert abs(charge_balance_error_percent(unbalanced)) > 1.0
    assert abs(charge_balance_error_percent(balanced)) < 1e-8
    before, after = (dict(r.recipe.components) for r in (unbalanced, balanced))
    assert after["Cl-"] != pytest.approx(before["Cl-"])
    assert after["Na+"] == pytest.approx(before["Na+"], rel=1e-4)  # density moves a little
    note = next(c for c in balanced.recipe.solution.conversions if c.key == "[analysis] Cl")
    assert "balanced" in note.note


def test_balance_on_an_ion_that_was_not_measured():
    result = ionwright.solve({"analysis": {"pH": 7.5, "Ca": "40 mg/L", "SO4": "20 mg/L",
                                           "alkalinity": "90 mg/L as CaCO3",
                                           "balance_on": "Na"}})
    assert abs(charge_balance_error_percent(result)) < 1e-8
    assert dict(result.recipe.components)["Na+"] > 0


def test_without_ph_the_ph_follows_from_electroneutrality():
    result = ionwright.solve({"analysis": {"Na": "23 mg/L", "Cl": "35.45 mg/L",
                                           "NH4": "1.8 mg/L", "SO4": "4.8 mg/L"}})
    assert not result.recipe.fix
    assert abs(charge_balance_error_percent(result)) < 1e-6
    assert 4.0 < result.pH < 7.0  # ammonium sulfate makes it slightly acid


def test_given_density_is_used():
    result = ionwright.solve({"analysis": {"pH": 7.0, "Na": "1000 mg/L", "Cl": "1540 mg/L",
                                           "density": "1.0030 g/mL"}})
    sol = result.recipe.solution
    assert sol.density_how == "given"
    assert sol.density_g_per_mL == pytest.approx(1.0030)


@pytest.mark.parametrize("analysis, where, problem", [
    ({"pH": 7, "Hg": "0.1 mg/L"}, "[analysis] Hg", "no component for 'Hg'"),
    ({"pH": 7, "SO3": "0.1 mg/L"}, "[analysis] SO3", "'SO3' could be SO4^2- or HS-"),
    ({"pH": 7, "HCO3": "100 mg/L"}, "[analysis] HCO3", "carbonate is given as alkalinity"),
    ({"Ca": "10 mg/L", "alkalinity": "50 mg/L as CaCO3"}, "[analysis] alkalinity",
     "needs the measured pH"),
    ({"pH": 4.2, "alkalinity": "0.1 meq/L"}, "[analysis] alkalinity", "below the carbonic"),
    ({"pH": 7, "alkalinity": "50 mg/L as HCO3"}, "[analysis] alkalinity", "as CaCO3"),
    ({"pH": 10.5, "Na": "1 mg/L", "alkalinity": "0.01 meq/L"}, "[analysis] alkalinity",
     "no positive carbonate total"),
    ({"pH": 7, "Na": "1 mg/L", "SO4": "300 mg/L", "balance_on": "Cl"},
     "[analysis] balance_on", "negative"),
    ({"pH": 7, "SiO2": "10 mg/L", "balance_on": "SiO2"}, "[analysis] balance_on",
     "carries no charge"),
    ({"Na": "1 mg/L", "balance_on": "Na"}, "[analysis] balance_on", "needs the measured pH"),
    ({"pH": 7, "NH4": "1 mg/L", "ammonia": "1 mg/L"}, "[analysis] ammonia", "give each ion once"),
    ({"pH": 7, "Ca": "3 g"}, "[analysis] Ca", "is a mass, but"),
    ({"pH": 7, "Ca": "-3 mg/L"}, "[analysis] Ca", "≥ 0"),
    ({"pH": 7, "SiO2": "1 meq/L"}, "[analysis] SiO2", "equivalents need an ion"),
    ({"pH": "7"}, "[analysis] pH", "must be a number"),
    ({"pH": 7, "colour": "blue"}, "[analysis] colour", "unknown analysis key"),
])
def test_bad_analyses_name_the_key(analysis, where, problem):
    with pytest.raises(RecipeError) as err:
        ionwright.solve({"analysis": analysis})
    assert where in str(err.value) and problem in str(err.value)


def test_analysis_cannot_be_mixed_with_dissolve():
    with pytest.raises(RecipeError, match="cannot be combined with dissolve"):
        ionwright.solve({"analysis": {"pH": 7, "Na": "1 mg/L"}, "dissolve": {"NaCl": 0.1}})


def test_issue_example_is_read():
    result = ionwright.solve({"analysis": {
        "temperature_C": 12.0, "pH": 7.9, "Ca": "48 mg/L", "Mg": "11 mg/L", "Na": "20 mg/L",
        "K": "3 mg/L", "Cl": "35 mg/L", "SO4": "40 mg/L", "NO3": "2.1 mg/L as N",
        "alkalinity": "160 mg/L as CaCO3", "ammonia": "0.8 mg/L as N"}})
    derived = result.to_dict()["derived"]
    assert derived["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(160.0, rel=1e-9)
    # hardness from the given Ca and Mg: 2.5·48 + 4.1·11 mg/L as CaCO3 by hand
    hand = (48 / molar_mass("Ca") + 11 / molar_mass("Mg")) * molar_mass("CaCO3")
    assert derived["hardness_mg_per_L_as_CaCO3"] == pytest.approx(hand, rel=1e-9)
    assert math.isfinite(derived["langelier_index"])
