"""Survey inputs: ppm and mg/kg (per kg of solution), mmol per kg of solution, negative
(Gran) alkalinity and DIC, in recipes' analyses and batch columns alike."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import ionwright
from ionwright.chemistry._formula import molar_mass
from ionwright.inputs._analysis import read_analysis
from ionwright.inputs._mixing import Entry, make_up_litres
from ionwright.inputs._analysis import analysis_mixture
from ionwright.inputs._units import parse_quantity

SEAWATER_LIKE = {"temperature_C": 20.0, "pH": 8.1, "density": "1.024 g/mL"}  # invented


def _components(analysis: dict) -> dict:
    return dict(ionwright.solve({"analysis": analysis}).recipe.components)


def test_mg_per_kg_and_ppm_are_per_kg_of_solution():
    assert parse_quantity("35 mg/kg", "x").value == parse_quantity("35 ppm", "x").value
    a = _components({**SEAWATER_LIKE, "Na": "10780 mg/kg", "Cl": "19350 ppm"})
    b = _components({**SEAWATER_LIKE, "Na": "10780 ppm", "Cl": "19350 mg/kg"})
    assert a == b
    # per kg of solution: mol/kg water = (g per g solution / M) × mass of solution per
    # kg of water (the solution's mass is water + salts)
    na = 10.780 / molar_mass("Na")                 # mol per kg of solution
    salts = 10.780 + 19.350                         # g per kg of solution
    assert a["Na+"] == pytest.approx(na * 1000 / (1000 - salts), rel=1e-9)


def test_mmol_per_kg_of_solution_needs_no_litre():
    a = _components({**SEAWATER_LIKE, "Na": "468.9 mmol/kg solution",
                     "Cl": "545.9 mmol/kg soln"})
    salts = 0.4689 * molar_mass("Na") + 0.5459 * molar_mass("Cl")
    assert a["Na+"] == pytest.approx(0.4689 * 1000 / (1000 - salts), rel=1e-9)
    assert parse_quantity("10 mmol/kg of solution", "x").dimension == "per_mass_solution"
    assert parse_quantity("10 mmol/kg", "x").dimension == "molality"   # per kg of water


def test_a_negative_gran_alkalinity_of_an_acid_water_fits_its_carbonate():
    acid = {"temperature_C": 10.0, "pH": 4.3, "Ca": "2 mg/L", "Na": "3 mg/L",
            "SO4": "12 mg/L", "Cl": "2 mg/L", "alkalinity": "-0.040 meq/L"}
    result = ionwright.solve({"analysis": acid})
    assert result.pH == pytest.approx(4.3, abs=1e-12)
    assert result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(
        -0.040 * molar_mass("CaCO3") / 2, rel=1e-6)
    assert dict(result.recipe.components)["CO3^2-"] > 0
    with pytest.raises(ionwright.RecipeError, match="more than zero"):
        ionwright.solve({"analysis": {**acid, "pH": 7.0}})
    with pytest.raises(ionwright.RecipeError, match="zero or negative"):
        ionwright.solve({"analysis": {**acid, "alkalinity": "0.5 meq/L"}})


def test_dic_gives_the_carbonate_total():
    sample = {"pH": 7.6, "Ca": "40 mg/L", "Na": "20 mg/L", "Cl": "30 mg/L",
              "DIC": "24 mg/L as C"}
    result = ionwright.solve({"analysis": sample})
    per_litre = result.solution.water_kg_per_L
    assert dict(result.recipe.components)["CO3^2-"] == pytest.approx(
        0.024 / molar_mass("C") / per_litre, rel=1e-12)
    mmol = ionwright.solve({"analysis": {**sample, "DIC": f"{24 / molar_mass('C')!r} mmol/L"}})
    assert mmol.pH == pytest.approx(result.pH, abs=1e-9)
    with pytest.raises(ionwright.RecipeError, match="basis"):
        ionwright.solve({"analysis": {**sample, "DIC": "24 mg/L"}})
    with pytest.raises(ionwright.RecipeError, match="both fix"):
        ionwright.solve({"analysis": {**sample, "alkalinity": "100 mg/L as CaCO3"}})


def test_batch_columns_take_the_same_units():
    frame = pd.DataFrame({"pH": [8.1, 4.3, 7.6], "density [g/mL]": [1.024, np.nan, np.nan],
                          "Na [mmol/kg solution]": [468.9, 0.13, 0.87],
                          "Cl [mg/kg]": [19350.0, 2.0, 30.0],
                          "Ca [ppm]": [412.0, 2.0, 40.0],
                          "alkalinity [meq/L]": [2.3, -0.04, np.nan],
                          "DIC [mg/L as C]": [np.nan, np.nan, 24.0]})
    out = ionwright.solve_batch(frame)
    assert out["status"].tolist() == ["converged"] * 3, out["message"].tolist()
    for k, analysis in enumerate([
            {"pH": 8.1, "density": "1.024 g/mL", "Na": "468.9 mmol/kg solution",
             "Cl": "19350.0 mg/kg", "Ca": "412.0 ppm", "alkalinity": "2.3 meq/L"},
            {"pH": 4.3, "Na": "0.13 mmol/kg solution", "Cl": "2.0 mg/kg", "Ca": "2.0 ppm",
             "alkalinity": "-0.04 meq/L"},
            {"pH": 7.6, "Na": "0.87 mmol/kg solution", "Cl": "30.0 mg/kg", "Ca": "40.0 ppm",
             "DIC": "24.0 mg/L as C"}]):
        single = ionwright.solve({"analysis": analysis})
        assert out["SI(calcite)"].iloc[k] == pytest.approx(single.saturation_indices["calcite"],
                                                           abs=1e-9)
        assert out["charge balance error [%]"].iloc[k] == pytest.approx(
            single.to_dict()["derived"]["charge_balance_error_percent"], abs=1e-9)


def test_making_up_a_litre_for_many_rows_is_mix_for_each():
    tables = ionwright.load_tables(["core", "metals", "organics"])
    rows = [{"pH": 7.5, "Ca": "80 mg/L", "Na": "30 mg/L", "Cl": "50 mg/L", "SO4": "2 mmol/L",
             "silica": "20 mg/L", "Mg": "12 ppm"},
            {"pH": 7.5, "Ca": "8 mg/L", "Na": "3 g/L", "Cl": "5 g/L", "SO4": "0.2 mmol/L",
             "silica": "2 mg/L", "Mg": "1200 ppm"}]
    fits = [read_analysis(r, "x", tables) for r in rows]
    alone = [analysis_mixture(f, {}, tables) for f in fits]
    entries = [Entry(a.solute, a.kind, a.key, a.given,
                     per_litre=np.array([a.per_litre, b.per_litre]),
                     per_kg_water=np.array([a.per_kg_water, b.per_kg_water]),
                     per_gram_solution=np.array([a.per_gram_solution, b.per_gram_solution]))
               for a, b in zip(fits[0].given, fits[1].given)]
    together = make_up_litres(entries, np.array([25.0, 25.0]))
    for k in range(2):
        assert together.water_kg[k] == alone[k].solution.water_kg
        assert together.mass_g[k] == alone[k].solution.mass_g
        assert [m[k] for m in together.moles] == list(alone[k].moles)
