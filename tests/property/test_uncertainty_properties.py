"""The linear uncertainty against the Monte Carlo one, on random dilute recipes."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ionwright.core._constant_terms import constant_terms
from ionwright.core._sensitivity import state_log_k_response
from ionwright.design._monte_carlo import monte_carlo
from ionwright.engine._solve import compile_recipe

ACIDS = ("acetic acid", "KH2PO4", "NaHCO3", "NH4Cl", "citric acid", "H3BO3")
SAMPLES = 4000   # the sampling error of a standard deviation is then about 1.1 %

def _none_or(low: float, high: float):
    """Zero, or a value from *low* to *high* (never a subnormal trace)."""
    return st.one_of(st.just(0.0), st.floats(low, high))


recipes = st.builds(
    lambda acid, amount, base, salt, t: {
        "temperature_C": t,
        "dissolve": {acid: amount, "NaOH": base * amount, "NaCl": salt}},
    st.sampled_from(ACIDS), st.floats(1e-3, 0.05), _none_or(0.01, 1.5),
    _none_or(1e-4, 0.05), st.floats(5.0, 45.0))


@settings(max_examples=15)
@given(recipes)
def test_linear_uncertainty_agrees_with_monte_carlo(recipe):
    """u(pH) and u(SI) from linear propagation agree with the standard deviation of
    4,000 solves with sampled constants within 10 % (issue 20)."""
    check = monte_carlo(recipe, samples=SAMPLES, seed=7)
    assert check.converged == SAMPLES
    assert check.agrees(check.pH), check.pH
    for name, pair in check.saturation_indices.items():
        assert check.agrees(pair), (name, pair)


@settings(max_examples=15)
@given(recipes)
def test_a_constant_that_does_not_enter_contributes_nothing(recipe):
    """The solubility product of a solid that is not in the recipe moves no activity:
    its derivatives are exactly zero."""
    compiled = compile_recipe(recipe)
    state = compiled.solve(compiled.base)
    absent = [("solids", name) for name in ("calcite", "gypsum", "halite")]
    terms = constant_terms(compiled.system, compiled.tables, absent)
    response = state_log_k_response(state, terms)
    for section, name in absent:
        e = terms.column(section, name)
        assert np.all(response.components[0, :, e] == 0.0)
        assert np.all(response.species(compiled.system.nu)[0, :, e] == 0.0)
