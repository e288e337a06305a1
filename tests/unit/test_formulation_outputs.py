"""Osmotic coefficient and conductivity: vectorised over samples, and their known limits."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.chemistry import parse_formula
from ionwright.chemistry._viscosity import viscosity_mPa_s
from ionwright.chemistry._water import debye_huckel_A
from ionwright.outputs._conductivity import conductivity
from ionwright.outputs._osmolality import osmotic_coefficients


def test_davies_osmotic_coefficient_matches_its_closed_form():
    """For ln γ = −ln10·A·z²(√I/(1+√I) − 0.3I), Gibbs–Duhem integrates in closed form:
    Σm(φ−1) = −2A ln10 [I√I/(1+√I) − I + 2√I − 2 ln(1+√I) − 0.15 I²] (derived here)."""
    result = ionwright.solve({"activity_model": "davies", "dissolve": {"CaCl2": 0.05}})
    strength, total = result.ionic_strength, float(np.sum(result.molality))
    u, a = np.sqrt(strength), float(debye_huckel_A(25.0))
    closed = -2 * a * np.log(10) * (strength * u / (1 + u) - strength + 2 * u
                                    - 2 * np.log(1 + u) - 0.15 * strength ** 2)
    assert result.osmotic.osmotic_coefficient == pytest.approx(1 + closed / total, abs=1e-9)


@pytest.mark.parametrize("model", ["ideal", "davies", "truesdell-jones", "pitzer"])
def test_osmotic_coefficients_of_a_batch_equal_each_sample_alone(model):
    result = ionwright.solve({"activity_model": model, "dissolve": {"NaCl": 0.3}})
    m = np.vstack([result.molality, 0.2 * result.molality, 0 * result.molality])
    t = np.full(3, 25.0)
    together = osmotic_coefficients(result.model, result.system.properties, m, t)
    alone = [osmotic_coefficients(result.model, result.system.properties, m[i:i + 1], t[:1])[0]
             for i in range(3)]
    assert together == pytest.approx(alone, rel=1e-12)
    assert together[2] == 1.0


def test_conductivity_of_a_batch_equals_each_sample_alone():
    names = ["K+", "Cl-", "Ca2+"]
    formulas = [parse_formula(n) for n in names]
    m = np.array([[0.01, 0.03, 0.01], [0.1, 0.1, 0.0], [0.0, 0.0, 0.0]])
    t = np.array([5.0, 25.0, 40.0])
    together = conductivity(m, formulas, names, t, np.ones(3)).mS_per_cm
    alone = [conductivity(m[i:i + 1], formulas, names, t[i:i + 1], np.ones(1)).mS_per_cm[0]
             for i in range(3)]
    assert together == pytest.approx(alone, rel=1e-12)
    assert together[2] == 0.0


def test_conductivity_rises_with_temperature_and_dilution_lowers_molar_conductivity():
    warm = [ionwright.solve({"temperature_C": t, "dissolve": {"NaCl": 0.05}})
            .conductivity_mS_per_cm for t in (5.0, 25.0, 45.0)]
    assert warm[0] < warm[1] < warm[2]
    molar = [ionwright.solve({"dissolve": {"NaCl": m}}).conductivity_mS_per_cm / m
             for m in (0.001, 0.01, 0.1)]
    assert molar[0] > molar[1] > molar[2]


@pytest.mark.parametrize("t_C, published", [(0.0, 1.7914), (25.0, 0.8900), (50.0, 0.5465)])
def test_water_viscosity(t_C, published):
    """CRC "Viscosity of water", mPa·s  # from memory; within 0.2 %."""
    assert float(viscosity_mPa_s(t_C)) == pytest.approx(published, rel=2e-3)


def test_an_ion_without_a_limiting_conductivity_is_named():
    result = ionwright.solve({"dissolve": {"HEPES": 0.1, "NaOH": 0.1}})
    notes = result.to_dict()["conductivity_notes"]
    assert any("HEPES-" in n and "rough" in n for n in notes)
    assert not any("conductivity" in w for w in result.warnings)  # the note goes with κ
