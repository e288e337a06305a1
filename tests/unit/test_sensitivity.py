"""Derivatives from the Jacobian at the solution against careful finite differences."""

from __future__ import annotations

import numpy as np
import pytest

from ionwright.engine._compiled import CompiledRecipe
from ionwright.engine._solve import compile_recipe
from ionwright.core._sensitivity import buffer_capacity, pH_change

LN10 = np.log(10.0)


def _fd_beta(bench: CompiledRecipe, direction: np.ndarray, h: float) -> float:
    """Central difference of the pH over ±h mol/kg along *direction* (two solves)."""
    totals = bench.base[None, :] + np.array([[-h], [h]]) * direction[None, :]
    ph = bench.pH(bench.solve(totals))
    return float(2 * h / abs(ph[1] - ph[0]))


RECIPES = {
    "acetate, Davies": {"dissolve": {"acetic acid": 0.05, "sodium acetate": 0.03, "NaCl": 0.1}},
    "phosphate, Truesdell-Jones": {"activity_model": "truesdell-jones",
                                   "dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025}},
    "carbonate, extended DH": {"activity_model": "extended-debye-huckel",
                               "dissolve": {"NaHCO3": 0.01, "CaCl2": 0.001}},
    "open to CO2": {"dissolve": {"NaOH": 0.002}, "gases": {"CO2": "420 uatm"}},
    "calcite at saturation": {"dissolve": {"NaCl": 0.01}, "solids": {"calcite": "equilibrate"}},
    "gypsum and CO2": {"solids": {"gypsum": "equilibrate"}, "gases": {"CO2": "10^-2 atm"},
                       "dissolve": {"NaHCO3": 0.002}},
}


@pytest.mark.parametrize("name", list(RECIPES))
def test_buffer_capacity_from_the_jacobian_matches_a_finite_difference(name):
    bench = compile_recipe(RECIPES[name])
    base = np.zeros(bench.system.n_components)
    base[0] = -1.0          # strong base: protons removed
    analytic = float(buffer_capacity(bench.solve(bench.base))[0])
    # a careful difference: small enough for truncation (β varies on 0.1 pH), large
    # enough that solver round-off (1e-10 relative) stays below 1e-6 of the difference
    h = 1e-4 * analytic
    assert analytic == pytest.approx(_fd_beta(bench, base, h), rel=2e-5)


def test_ph_response_to_an_ingredient_matches_a_finite_difference():
    bench = compile_recipe({"dissolve": {"HEPES": 0.05, "NaCl": 0.15, "NaOH": 0.02}})
    step = bench.direction("NaOH")
    state = bench.solve(bench.base)
    analytic = float(pH_change(state, step)[0])
    h = 1e-6
    ph = bench.pH(bench.solve(bench.base[None, :] + np.array([[-h], [h]]) * step[None, :]))
    assert analytic == pytest.approx((ph[1] - ph[0]) / (2 * h), rel=1e-5)


def test_ideal_buffer_capacity_matches_van_slykes_formula():
    # Van Slyke (1922): β = ln10 (H + OH + C Ka H / (Ka + H)²) for one weak acid, ideal
    bench = compile_recipe({"activity_model": "ideal",
                          "dissolve": {"acetic acid": 0.0005, "sodium acetate": 0.0003}})
    state = bench.solve(bench.base)
    h = 10 ** -bench.pH(state)[0]
    system = bench.system
    ka = 10 ** -float(system.log10_k(np.array([25.0]))[0, system.index("CH3COOH")])
    oh = state.equilibrium.molality[0, system.index("OH-")]
    expected = LN10 * (h + oh + 0.0008 * ka * h / (ka + h) ** 2)
    assert float(buffer_capacity(state)[0]) == pytest.approx(expected, rel=1e-8)


def test_fixed_ph_has_no_buffer_capacity():
    bench = compile_recipe({"dissolve": {"NaCl": 0.01}, "fix": {"pH": 7.0}})
    assert np.isnan(buffer_capacity(bench.solve(bench.base))[0])
