"""Osmolality and water activity against published and clinical figures.

Physiological saline, 0.9 % w/v NaCl (9 g/L, 0.1547 mol/kg): 287 mOsm/kg is the clinical
figure (# common practice); 286 mOsm/kg was measured by freezing-point depression by
Williams, E.L. (1999) Anesth. Analg. 89(6), letter to the editor,
doi:10.1213/00000539-199912000-00072 (re-read).
Its molal osmotic coefficient follows from the NaCl table of Robinson & Stokes (1959),
Appendix 8.10: φ = 0.9324 at 0.1 mol/kg and 0.9245 at 0.2 mol/kg  # from memory
"""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.chemistry._water import osmotic_A_phi

SALINE = {"dissolve": {"NaCl": "9 g/L"}}
SALINE_OSMOLALITY = 287.0           # mOsm/kg  # common practice
SALINE_MEASURED = 286.0             # mOsm/kg, Williams (1999), freezing point (re-read)
MODELS = ["davies", "extended-debye-huckel", "truesdell-jones", "pitzer"]


@pytest.mark.parametrize("model", MODELS)
def test_physiological_saline(model):
    """0.9 % w/v NaCl within 2.5 % of 287 mOsm/kg with every model that has activity
    coefficients (issue 19)."""
    result = ionwright.solve({**SALINE, "activity_model": model})
    assert result.osmolality_mOsm_per_kg == pytest.approx(SALINE_OSMOLALITY, rel=0.025)
    assert result.osmolality_mOsm_per_kg == pytest.approx(SALINE_MEASURED, rel=0.025)


def test_ideal_model_counts_every_particle_once():
    """The ideal model has φ = 1: saline comes out as its particles, 2 × 0.1549 mol/kg."""
    result = ionwright.solve({**SALINE, "activity_model": "ideal"})
    assert result.osmotic.osmotic_coefficient == 1.0
    assert result.osmolality_mOsm_per_kg == pytest.approx(1000 * float(np.sum(result.molality)))


_EDH_PAST_RANGE = pytest.mark.xfail(strict=True, reason=(
    "extended Debye–Hückel holds to about 0.1 mol/kg; at 0.2 mol/kg its φ is 1.9 % low"))
CASES = [pytest.param(model, m, phi, marks=_EDH_PAST_RANGE if (model, m) ==
                      ("extended-debye-huckel", 0.2) else ())
         for model in MODELS for m, phi in [(0.1, 0.9324), (0.2, 0.9245)]]


@pytest.mark.parametrize("model, molality, phi", CASES)
def test_sodium_chloride_osmotic_coefficient(model, molality, phi):
    """Robinson & Stokes (1959) App. 8.10  # from memory; within 1.5 %."""
    result = ionwright.solve({"activity_model": model, "dissolve": {"NaCl": molality}})
    assert result.osmotic.osmotic_coefficient == pytest.approx(phi, rel=0.015)


@pytest.mark.parametrize("model", ["ideal", *MODELS])
def test_glucose_adds_its_molality(model):
    """0.1 mol/kg glucose adds 100 ± 5 mOsm/kg to saline (issue 19)."""
    base = {"activity_model": model, "dissolve": {"NaCl": 0.1547}}
    plain = ionwright.solve(base)
    sweet = ionwright.solve({**base, "dissolve": {"NaCl": 0.1547, "glucose": 0.1}})
    added = sweet.osmolality_mOsm_per_kg - plain.osmolality_mOsm_per_kg
    assert added == pytest.approx(100.0, abs=5.0)


def test_dilute_limit_is_the_debye_huckel_limiting_law():
    """φ − 1 → −A_φ √I for a 1:1 salt (Debye–Hückel), from the Gibbs–Duhem integration."""
    result = ionwright.solve({"dissolve": {"NaCl": 1e-6}})
    slope = (1.0 - result.osmotic.osmotic_coefficient) / np.sqrt(result.ionic_strength)
    assert slope == pytest.approx(float(osmotic_A_phi(25.0)), rel=0.005)


def test_water_activity_and_osmolality_agree():
    """ln a(H2O) = −M_w · osmolality (the definition, any model)."""
    result = ionwright.solve({**SALINE, "activity_model": "truesdell-jones"})
    ln_aw = np.log(result.osmotic.water_activity)
    assert ln_aw == pytest.approx(-0.018015268 * result.osmolality_mOsm_per_kg / 1000, rel=1e-6)
