"""pH on the scale of the standard buffers: the model's γ(Cl-) swapped for the convention's."""

from __future__ import annotations

import math

import pytest

import ionwright
from ionwright.outputs._conventional_ph import (bates_guggenheim_log10_gamma_chloride,
                                       conventional_pH, model_log10_gamma_chloride)
from ionwright.chemistry._water import debye_huckel_A


def test_the_convention_is_debye_huckel_with_ba_1_5():
    for strength, t in ((0.01, 25.0), (0.1, 5.0), (0.05, 50.0)):
        root = math.sqrt(strength)
        expected = -debye_huckel_A(t) * root / (1 + 1.5 * root)
        assert bates_guggenheim_log10_gamma_chloride(strength, t) == pytest.approx(expected)


@pytest.mark.parametrize("model", ["davies", "extended-debye-huckel", "truesdell-jones",
                                   "pitzer"])
def test_with_chloride_present_the_model_coefficient_is_the_results_own(model):
    result = ionwright.solve({"dissolve": {"NaCl": 0.05, "KH2PO4": 0.01},
                              "activity_model": model})
    own = result.log10_gamma[result.system.index("Cl-")]
    assert model_log10_gamma_chloride(result) == pytest.approx(own, abs=1e-12)


@pytest.mark.parametrize("model", ["davies", "extended-debye-huckel", "truesdell-jones"])
def test_a_trace_of_chloride_gets_the_coefficient_of_its_ionic_strength(model):
    """Models of ionic strength alone: trace Cl- in a phosphate buffer has the γ of Cl- in
    NaCl at the same ionic strength."""
    buffer = ionwright.solve({"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025},
                              "activity_model": model})
    salt = ionwright.solve({"dissolve": {"NaCl": buffer.ionic_strength},
                            "activity_model": model})
    assert salt.ionic_strength == pytest.approx(buffer.ionic_strength, rel=1e-5)
    assert model_log10_gamma_chloride(buffer) == pytest.approx(
        salt.log10_gamma[salt.system.index("Cl-")], abs=1e-6)


def test_a_trace_of_chloride_works_for_a_composition_dependent_model():
    result = ionwright.solve({"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025},
                              "activity_model": "pitzer"})
    value = model_log10_gamma_chloride(result)
    assert -0.2 < value < -0.05
    assert math.isfinite(conventional_pH(result))


def test_the_scales_meet_at_infinite_dilution():
    result = ionwright.solve({"activity_model": "extended-debye-huckel"})
    assert conventional_pH(result) == pytest.approx(result.pH, abs=1e-4)


def test_the_result_reports_it_as_a_derived_quantity():
    result = ionwright.solve({"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025},
                              "activity_model": "extended-debye-huckel"})
    derived = result.to_dict()["derived"]
    assert derived["pH_standards_scale"] == pytest.approx(conventional_pH(result))
    assert derived["pH_standards_scale"] - result.pH == pytest.approx(0.0135, abs=0.001)
    assert "pH, standards' scale" in result.report()
