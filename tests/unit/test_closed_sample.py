"""A sample whose pH was measured (an analysis) or held ([fix] pH) is a closed bottle for
every design tool: the pH fixes its protons at its own temperature, and a dose, a titrant,
water or warming moves the pH from there, as a poured solution with a fixed pH carries its
protons into a mixture (issue 16: titrating an analysis gave a flat pH at its measured
value, and a dose to a target was refused)."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.design import _sweep as sweep

# an invented lake-survey sample (demo data)
LAKE = ('title = "north basin, 2 m"\n[analysis]\ntemperature_C = 12.0\npH = 7.2\n'
        'Ca = "88 mg/L"\nMg = "24 mg/L"\nNa = "31 mg/L"\nK = "3 mg/L"\nCl = "45 mg/L"\n'
        'SO4 = "62 mg/L"\nalkalinity = "265 mg/L as CaCO3"\n')
ALKALINITY_EQ_PER_L = 265.0 / 50.04 / 1000.0   # mg/L as CaCO3 over g CaCO3 per equivalent
LOTION = {"title": "lotion line phosphate (demo)", "water": "1 kg",
          "dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.02}, "fix": {"pH": 7.0}}


@pytest.fixture
def lake(tmp_path):
    path = tmp_path / "lake.toml"
    path.write_text(LAKE, encoding="utf-8")
    return path


def _closed_notes(notices) -> list:
    return [n for n in notices if n.code == "closed-sample"]


def test_a_dose_to_a_measured_sample_poured_back_with_it_gives_the_target(lake):
    """The dose for the sample as written, added to a litre of it poured into nothing
    else, gives the target: target and [[pour]] treat the measured pH alike."""
    found = ionwright.target(lake, 8.3, "NaOH", stock="1 mol/L")
    millilitres = found.to_dict()["stock_mL_for_recipe"]
    poured = ionwright.solve({"temperature_C": 12.0,
                              "pour": [{"recipe": str(lake), "volume": "1 L"}],
                              "add": [{"stock": "NaOH", "concentration": "1 mol/L",
                                       "volume": f"{millilitres!r} mL"}]})
    assert poured.pH == pytest.approx(8.3, abs=1e-9)
    assert _closed_notes(found.result.notices)
    assert "[[pour]] of the whole sample" in found.report()   # an [[add]] beside a held pH
    # what the dose adds is alkalinity, one equivalent per mole of NaOH
    added = found.amount_mol_per_kg * 50.04 * 1000.0
    assert found.result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(
        265.0 + added, rel=2e-3)


def test_a_held_recipe_is_dosed_from_its_held_ph():
    base = ionwright.target(LOTION, 7.4, "NaOH")
    assert base.pH == pytest.approx(7.4, abs=1e-9)
    assert 0 < base.amount_mol_per_kg < 0.045
    assert _closed_notes(base.result.notices)


def test_titrating_an_analysis_with_acid_ends_at_its_alkalinity(lake):
    """Total alkalinity is the acid a sample takes to its carbonic-acid end point (the
    definition, from memory: Stumm & Morgan 1996, Aquatic Chemistry, ch. 4): the titration
    of the analysis starts at its measured pH, falls, and has its inflection where the acid
    added equals the alkalinity."""
    titrated = sweep.titration(lake, "HCl 0.02 mol/L", "400 mL")
    assert titrated.pH[0] == pytest.approx(7.2, abs=1e-9)
    assert np.all(np.diff(titrated.pH) < 0)
    (end,) = [e for e in titrated.equivalence if 3.5 < e["pH"] < 5.5]
    litres = ionwright.solve(lake).solution.volume_L
    expected_mL = ALKALINITY_EQ_PER_L * litres / 0.02 * 1000.0
    assert end["titrant_mL"] == pytest.approx(expected_mL, rel=0.01)
    assert _closed_notes(titrated.notices)


def test_a_titration_point_of_a_held_recipe_is_the_recipe_poured_with_the_titrant(tmp_path):
    """The point at V mL is the whole held recipe poured out, with V mL of titrant added."""
    path = tmp_path / "lotion.toml"
    path.write_text('water = "1 kg"\n[dissolve]\nKH2PO4 = 0.025\nNa2HPO4 = 0.02\n'
                    '[fix]\npH = 7.0\n', encoding="utf-8")
    titrated = sweep.titration(path, "NaOH 0.1 mol/L", "60 mL", points=7)
    litres = ionwright.solve(path).solution.volume_L
    for volume, ph in zip(titrated.values[1:], titrated.pH[1:]):
        poured = ionwright.solve({"pour": [{"recipe": str(path), "volume": f"{litres!r} L"}],
                                  "add": [{"stock": "NaOH", "concentration": "0.1 mol/L",
                                           "volume": f"{float(volume)!r} mL"}]})
        assert poured.pH == pytest.approx(float(ph), abs=1e-9)
    assert titrated.pH[0] == pytest.approx(7.0, abs=1e-9) and titrated.pH[-1] > 7.1


def test_diluting_an_analysis_moves_its_ph(lake):
    diluted = sweep.dilution(lake, "1:100", points=5)
    assert diluted.pH[0] == pytest.approx(7.2, abs=1e-9)
    assert np.ptp(diluted.pH) > 0.01
    assert _closed_notes(diluted.notices)


@pytest.mark.parametrize("recipe", [
    {"dissolve": {"NaHCO3": 0.004, "CaCl2": 0.003}, "fix": {"pH": 7.8}},
    {"dissolve": {"NaHCO3": 0.004, "CaCl2": 0.003}, "fix": {"pH": 8.6},
     "solids": {"calcite": "may-form"}},
    {"dissolve": {"NaHCO3": 0.004, "CaCl2": 0.003}, "fix": {"pH": 7.0},
     "solids": {"calcite": "equilibrate"}},
    {"dissolve": {"NaCl": 0.01}, "fix": {"pH": 6.0}, "gases": {"CO2": "420 uatm"}},
], ids=["plain", "calcite may form", "calcite in excess", "open to CO2"])
def test_the_closed_sample_starts_at_the_fixed_ph(recipe):
    """Its protons count what solids and gases exchanged at the fixed pH, so that solved
    with the pH free it is where it started, to round-off."""
    from ionwright.engine._solve import compile_recipe

    held = compile_recipe(recipe)
    closed = held.closed()
    assert "pH" not in closed.recipe.fix and closed is not held
    state = closed.solve(closed.base)
    assert closed.pH(state)[0] == pytest.approx(recipe["fix"]["pH"], abs=1e-9)
    free = compile_recipe({"dissolve": {"NaCl": 0.01}})
    assert free.closed() is free       # a recipe that fixes no pH is closed already
