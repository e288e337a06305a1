"""The Monte Carlo check of the linear uncertainty: arguments, agreement, one batch."""

from __future__ import annotations

import pytest

import ionwright
from ionwright.design._monte_carlo import MonteCarloCheck

BUFFER = {"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025}}


@pytest.mark.parametrize("samples", [1, 0, -5, 2.5, "100", True, 10**7])
def test_bad_sample_counts_are_refused(samples):
    with pytest.raises(ionwright.RecipeError, match="samples"):
        ionwright.monte_carlo(BUFFER, samples=samples)


def test_agreement_rule():
    check = MonteCarloCheck(10, 10, 0, (0.105, 0.100), {"calcite": (1e-12, 0.0)})
    assert check.agrees(check.pH) and check.confirmed
    assert not check.agrees((0.125, 0.100))


def test_buffer_check_confirms_and_is_reproducible():
    first = ionwright.monte_carlo(BUFFER, samples=2000, seed=3)
    again = ionwright.monte_carlo(BUFFER, samples=2000, seed=3)
    assert first == again
    assert first.confirmed and first.converged == 2000
    assert first.pH[1] == pytest.approx(ionwright.solve(BUFFER).pH_uncertainty)
    data = first.to_dict()
    assert data["pH"]["agrees"] and data["samples"] == 2000


def test_phases_are_sampled_too():
    """Calcite at equilibrium under air: the sampled Ksp and CO2 solubility move the pH as
    the linear figure says; the SI of the present calcite stays zero in every sample."""
    check = ionwright.monte_carlo({"dissolve": {"NaCl": 0.01},
                                   "solids": {"calcite": "equilibrate"},
                                   "gases": {"CO2": "420 uatm"}}, samples=2000)
    assert check.confirmed
    assert check.saturation_indices["calcite"][0] < 1e-6
