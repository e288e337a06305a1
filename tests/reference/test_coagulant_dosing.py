"""Coagulant dosing (issue 17): alum and ferric chloride dosed to a pH with the hydroxide
precipitating, and the sludge a dose series forms.

The raw water is invented (the river intake of a made-up waterworks). What is checked
against the outside world is the stoichiometry of coagulation:

    Al2(SO4)3 + 6 HCO3- -> 2 Al(OH)3(s) + 3 SO4^2- + 6 CO2
    FeCl3     + 3 HCO3- -> Fe(OH)3(s)   + 3 Cl-    + 3 CO2

so that a mole of alum consumes six equivalents of alkalinity and a mole of ferric
chloride three: 0.45 mg/L as CaCO3 per mg/L of Al2(SO4)3·18H2O and 0.925 per mg/L of
FeCl3 (the usual alkalinity demand of coagulants  # common practice). Exactly, the
alkalinity lost is three equivalents per mole of hydroxide precipitated, since the
hydroxo complexes left dissolved are titrated back to the free ion at pH 4.5.
"""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.chemistry._formula import molar_mass

RIVER = {"title": "Millbrook river intake (invented)", "temperature_C": 15.0,
         "dissolve": {"NaHCO3": "1.2 mmol/L", "CaCl2": "0.5 mmol/L", "MgSO4": "0.15 mmol/L"}}
EQUIVALENTS = {"alum": 6, "FeCl3": 3}     # alkalinity consumed per mole of coagulant
FLOC = {"alum": "amorphous Al(OH)3", "FeCl3": "ferrihydrite"}
METAL = {"alum": ("Al3+", 2), "FeCl3": ("Fe3+", 1)}


def _jar(coagulant: str) -> dict:
    return {**RIVER, "solids": {FLOC[coagulant]: "may-form"}}


def _alkalinity(result) -> float:
    return result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"]


@pytest.mark.parametrize("coagulant", ["alum", "FeCl3"])
def test_a_dose_to_ph_precipitates_the_hydroxide_and_consumes_the_stoichiometric_alkalinity(
        coagulant):
    raw = ionwright.solve(RIVER)
    dosed = ionwright.target(_jar(coagulant), pH=6.6, adjust=coagulant)
    assert dosed.pH == pytest.approx(6.6, abs=1e-6)
    floc = dosed.result.to_dict()["phases"][FLOC[coagulant]]
    assert floc["state"] == "saturated" and floc["into_solution_mol_per_kg"] < 0
    metal, per_mole = METAL[coagulant]
    dosed_metal = per_mole * dosed.amount_mol_per_kg
    dissolved = dosed.result.to_dict()["totals"][metal]
    assert dissolved - floc["into_solution_mol_per_kg"] == pytest.approx(dosed_metal, rel=1e-9)
    assert dissolved < 0.1 * dosed_metal          # most of the dose is floc
    litre_kg = dosed.result.solution.water_kg / dosed.result.solution.volume_L
    dose_mg_per_L = dosed.amount_mol_per_kg * dosed.molar_mass * 1000.0 * litre_kg
    consumed = _alkalinity(raw) - _alkalinity(dosed.result)     # mg/L as CaCO3
    demand = EQUIVALENTS[coagulant] * molar_mass("CaCO3") / 2 / dosed.molar_mass
    assert consumed / dose_mg_per_L == pytest.approx(demand, rel=0.1)   # common practice
    # exactly: the floc carries off three OH- per metal; what stays dissolved (hydroxo
    # complexes) is still counted by an alkalinity titration to pH 4.5
    floc_eq_per_L = -3 * floc["into_solution_mol_per_kg"] * litre_kg
    consumed_eq_per_L = consumed / (molar_mass("CaCO3") / 2) / 1000.0
    assert consumed_eq_per_L == pytest.approx(floc_eq_per_L, rel=0.01)


def test_alum_without_the_floc_allowed_stays_dissolved_and_says_it_is_supersaturated():
    """Without [solids] every bit of aluminium stays in solution: the result must say that
    its hydroxide is past saturation, so nobody reads it as the treated water."""
    dosed = ionwright.target(RIVER, pH=6.6, adjust="alum")
    assert dosed.result.to_dict()["totals"]["Al3+"] == pytest.approx(
        2 * dosed.amount_mol_per_kg, rel=1e-9)
    assert dosed.result.saturation_indices["amorphous Al(OH)3"] > 0.5
    assert any("amorphous Al(OH)3 is supersaturated" in w for w in dosed.result.warnings)


def test_a_dose_sweep_reports_ph_falling_and_sludge_growing():
    sweep = ionwright.titration(_jar("alum"), "alum 10 g/L", "8 mL", points=9)
    assert sweep.complete
    sludge = -sweep.into_solution("amorphous Al(OH)3")
    assert sludge[0] == 0.0 and np.all(np.diff(sludge) >= 0) and sludge[-1] > 0
    assert np.all(np.diff(sweep.pH) < 0)
    row = sweep.rows()[-1]
    grams = row["into_solution(amorphous Al(OH)3)_g_per_kg"]
    assert grams == pytest.approx(-sludge[-1] * molar_mass("Al(OH)3"), rel=1e-12)


def test_a_sweep_point_equals_the_single_solve_of_that_dose():
    sweep = ionwright.titration(_jar("FeCl3"), "FeCl3 5 g/L", "6 mL", points=4)
    last = sweep.rows()[-1]
    single = ionwright.solve({**_jar("FeCl3"), "add": [
        {"stock": "FeCl3", "concentration": "5 g/L", "volume": "6 mL"}]})
    assert last["pH"] == pytest.approx(single.pH, abs=1e-8)
    floc = single.to_dict()["phases"]["ferrihydrite"]["into_solution_g_per_kg"]
    assert last["into_solution(ferrihydrite)_g_per_kg"] == pytest.approx(floc, rel=1e-6)


def test_an_unknown_solid_of_a_sweep_is_named():
    sweep = ionwright.titration(_jar("alum"), "alum 10 g/L", "2 mL", points=3)
    with pytest.raises(ionwright.errors.UnknownNameError, match="gibbsite"):
        sweep.into_solution("gibbsite")


def test_a_water_analysis_is_dosed_as_a_closed_sample_with_its_floc():
    analysis = {"temperature_C": 15.0, "pH": 7.8, "alkalinity": "60 mg/L as CaCO3",
                "Ca": "22 mg/L", "Mg": "4 mg/L", "Na": "9 mg/L", "Cl": "12 mg/L",
                "SO4": "15 mg/L"}                                   # invented river water
    dosed = ionwright.target({"analysis": analysis, "solids": {"ferrihydrite": "may-form"}},
                             pH=6.8, adjust="ferric chloride")
    assert dosed.pH == pytest.approx(6.8, abs=1e-6)
    floc = dosed.result.to_dict()["phases"]["ferrihydrite"]
    assert floc["into_solution_mol_per_kg"] == pytest.approx(
        -dosed.amount_mol_per_kg, rel=1e-3)          # ferric iron is nearly all floc
