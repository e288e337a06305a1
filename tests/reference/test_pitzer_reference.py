"""Pitzer model against published activity and osmotic coefficients, and in full solves.

Robinson, R.A. & Stokes, R.H. (1959) Electrolyte Solutions, 2nd ed., Butterworths,
Appendix 8.10 (γ± and φ of single salts at 25 °C). Every tabulated value below is
# from memory: the appendix was not re-read, and reference-inputs.md §12 lists all
# Robinson–Stokes numbers as memory. The 1 % tolerance is the issue's.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.activity import PitzerModel
from ionwright.activity._base import SpeciesProperties

# Robinson & Stokes (1959) App. 8.10, 25 °C, m / mol kg-1 → γ±   # from memory
NACL_GAMMA = {0.1: 0.778, 0.5: 0.681, 1.0: 0.657, 2.0: 0.668, 3.0: 0.714}
KCL_GAMMA = {0.1: 0.770, 0.5: 0.649, 1.0: 0.604, 2.0: 0.573, 3.0: 0.569}
HCL_GAMMA = {0.1: 0.796, 0.5: 0.757, 1.0: 0.809, 2.0: 1.009, 3.0: 1.316}
# Robinson & Stokes (1959) App. 8.10, 25 °C: osmotic coefficients   # from memory
NACL_PHI = {1.0: 0.936, 3.0: 1.045}
KCL_PHI = {1.0: 0.899}


def _one_to_one(cation: str, anion: str, m: float) -> tuple[float, float]:
    """γ± and φ of a 1:1 salt at molality *m*, 25 °C, from the bound Pitzer model."""
    nan = np.full(2, np.nan)
    props = SpeciesProperties((cation, anion), np.array([1.0, -1.0]), nan, nan, nan,
                              np.zeros(2))
    bound = PitzerModel().bind(props, np.array([25.0]))
    mol = np.array([[m, m]])
    gamma = math.exp(bound.ln_gamma(np.array([math.sqrt(m)]), mol)[0].mean())
    return gamma, float(bound.osmotic_coefficient(mol)[0])


@pytest.mark.parametrize("m, expected", NACL_GAMMA.items())
def test_mean_activity_coefficient_of_sodium_chloride(m, expected):
    # Robinson & Stokes (1959) Appendix 8.10, NaCl at 25 °C   # from memory
    assert _one_to_one("Na+", "Cl-", m)[0] == pytest.approx(expected, rel=0.01)


@pytest.mark.parametrize("m, expected", NACL_PHI.items())
def test_osmotic_coefficient_of_sodium_chloride(m, expected):
    # Robinson & Stokes (1959) Appendix 8.10, NaCl at 25 °C   # from memory
    assert _one_to_one("Na+", "Cl-", m)[1] == pytest.approx(expected, rel=0.01)


@pytest.mark.parametrize("m, expected", KCL_GAMMA.items())
def test_mean_activity_coefficient_of_potassium_chloride(m, expected):
    # Robinson & Stokes (1959) Appendix 8.10, KCl at 25 °C   # from memory
    assert _one_to_one("K+", "Cl-", m)[0] == pytest.approx(expected, rel=0.01)


def test_osmotic_coefficient_of_potassium_chloride():
    # Robinson & Stokes (1959) Appendix 8.10, KCl at 25 °C   # from memory
    assert _one_to_one("K+", "Cl-", 1.0)[1] == pytest.approx(KCL_PHI[1.0], rel=0.01)


@pytest.mark.parametrize("m, expected", HCL_GAMMA.items())
def test_mean_activity_coefficient_of_hydrochloric_acid(m, expected):
    # Robinson & Stokes (1959) Appendix 8.10, HCl at 25 °C   # from memory
    assert _one_to_one("H+", "Cl-", m)[0] == pytest.approx(expected, rel=0.01)


# -- full engine solves -----------------------------------------------------------------

BRINE = {"title": "Saltmarsh pickle brine (a scenario of our own)", "temperature_C": 25.0,
         "activity_model": "pitzer", "dissolve": {"NaCl": 3.0, "NaHCO3": 0.01}}


def test_a_sodium_chloride_brine_solves_with_pitzer():
    result = ionwright.solve(BRINE)
    assert result.converged
    out = result.to_dict()
    assert out["activity_model"] == "pitzer"
    assert 7.0 < out["pH"] < 8.2
    # a(H2O) of 3 mol/kg NaCl from φ = 1.045 (Robinson & Stokes 1959 App. 8.10, from
    # memory): ln a = −M_w·2m·φ; the bicarbonate adds 0.3 % to Σm
    assert out["water_activity"] == pytest.approx(math.exp(-0.018015 * 6.0 * 1.045), rel=0.002)
    assert out["osmotic_coefficient"] == pytest.approx(1.045, rel=0.01)
    # the pairs the Pitzer parameters describe are not in the solved system at all
    assert {e["species"] for e in out["ion_pairs"]["left_out"]} == {"NaCO3-", "NaHCO3"}
    assert not {"NaCO3-", "NaHCO3"} & {s["name"] for s in out["species"]}


def test_the_result_reports_the_model_at_the_solved_composition():
    """log γ and a(H2O) in the result are the model's own values at the result's molality."""
    result = ionwright.solve(BRINE)
    bound = PitzerModel().bind(result.system.properties, np.array([25.0]))
    mol = result.molality[None, :]
    u = np.sqrt([result.ionic_strength])
    expected = bound.ln_gamma(u, mol)[0] / math.log(10)
    formed = expected < 50  # not-formed pairs carry the sentinel, compare the others
    assert result.log10_gamma[formed] == pytest.approx(expected[formed], abs=1e-8)
    assert result.equilibrium.ln_water_activity[0] == pytest.approx(
        bound.ln_water_activity(mol)[0], rel=1e-8)
    # NaCl mean activity coefficient at about 3 mol/kg: 0.714 (R&S 1959, from memory)
    mean = 10 ** (0.5 * (result.log10_gamma[result.system.index("Na+")]
                         + result.log10_gamma[result.system.index("Cl-")]))
    assert mean == pytest.approx(0.714, rel=0.01)


def test_a_seawater_like_brine_solves_and_stays_electroneutral():
    # Major-ion makeup close to mean seawater (a scenario of our own, not a standard)
    recipe = {"activity_model": "pitzer", "dissolve": {
        "NaCl": 0.4186, "KCl": 0.0102, "CaCl2": 0.0103, "MgCl2": 0.0528, "Na2SO4": 0.0282,
        "NaHCO3": 0.0018, "Na2CO3": 0.0002}}
    result = ionwright.solve(recipe)
    assert result.converged
    imbalance, scale = result.charge_balance
    assert abs(imbalance) / scale < 1e-9
    assert 0.6 < result.ionic_strength < 0.8
    assert 7.5 < result.pH < 8.8
    assert set(result.saturation_indices) >= {"calcite", "gypsum"}
