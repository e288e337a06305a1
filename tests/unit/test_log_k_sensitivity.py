"""Derivatives of a solved state with respect to each constant's log10 K, checked against
finite differences of the same recipe solved with shifted constants (one batch)."""

from __future__ import annotations

import numpy as np
import pytest

from ionwright.core._constant_terms import LogKShift, constant_terms
from ionwright.core._sensitivity import state_log_k_response
from ionwright.engine._solve import compile_recipe

STEP = 1e-5
RECIPES = {
    "phosphate buffer": {"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025}},
    "fixed pH": {"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025}, "fix": {"pH": 7.0}},
    "calcite under air": {"dissolve": {"NaCl": 0.01}, "solids": {"calcite": "equilibrate"},
                          "gases": {"CO2": "420 uatm"}},
    "calcite closed": {"dissolve": {"CaCl2": 0.01, "NaHCO3": 0.005},
                       "solids": {"calcite": "equilibrate"}},
    "warm carbonate": {"temperature_C": 40.0, "dissolve": {"NaHCO3": 0.01, "CaCl2": 0.002}},
}


def _solved(recipe):
    compiled = compile_recipe(recipe)
    state = compiled.solve(compiled.base)
    phases = [("solids", s.name) for s in compiled.choice.solids]
    phases += [("gases", g.name) for g in compiled.choice.gases]
    terms = constant_terms(compiled.system, compiled.tables, phases)
    return compiled, state, terms


@pytest.mark.parametrize("name", list(RECIPES))
def test_derivatives_match_finite_differences(name):
    """d pH and d log10 a of every species per unit log10 K of every entry agree with
    finite differences to 1e-4 (the difference step's own error is about 1e-5)."""
    compiled, state, terms = _solved(RECIPES[name])
    response = state_log_k_response(state, terms)
    shifted = compiled.solve(np.repeat(compiled.base[None, :], terms.size, axis=0),
                             shift=LogKShift(terms, np.eye(terms.size) * STEP))
    dpH = (compiled.pH(shifted) - compiled.pH(state)[0]) / STEP
    np.testing.assert_allclose(response.pH[0], dpH, atol=1e-4)
    eq0, eq1 = state.equilibrium, shifted.equilibrium
    log_a0 = np.log10(eq0.molality) + eq0.ln_gamma / np.log(10.0)
    log_a1 = np.log10(eq1.molality) + eq1.ln_gamma / np.log(10.0)
    np.testing.assert_allclose(response.species(compiled.system.nu)[0].T,
                               (log_a1 - log_a0) / STEP, atol=1e-4)


def test_fixed_pH_does_not_move():
    """With the pH fixed, no constant moves it."""
    compiled, state, terms = _solved(RECIPES["fixed pH"])
    assert np.all(state_log_k_response(state, terms).pH == 0.0)


def test_saturated_solid_stays_saturated():
    """A solid held at equilibrium keeps SI = 0 whatever constant changes."""
    compiled, state, terms = _solved(RECIPES["calcite closed"])
    response = state_log_k_response(state, terms)
    d_si = response.saturation_index(compiled.tables.resolve("calcite", "solids"))
    np.testing.assert_allclose(d_si, 0.0, atol=1e-10)
    # and its Ksp moves the pH (calcite sets the carbonate in solution)
    assert abs(response.pH[0, terms.column("solids", "calcite")]) > 0.1


def test_buffer_pH_follows_its_pKa():
    """A 1:1 buffer of one weak acid moves with its pKa, one for one (Henderson–
    Hasselbalch: pH = pKa + log(base/acid) + activity terms that do not depend on it)."""
    compiled, state, terms = _solved(RECIPES["phosphate buffer"])
    response = state_log_k_response(state, terms)
    assert response.pH[0, terms.column("species", "H2PO4-")] == pytest.approx(1.0, abs=1e-3)


@pytest.mark.parametrize("name", ["phosphate buffer", "fixed pH", "warm carbonate"])
def test_adjoint_pH_derivative_equals_the_forward_one(name):
    """The batch's one-solve adjoint gives the forward derivatives of the pH."""
    from ionwright.core._sensitivity import pH_log_k_derivative

    compiled, state, terms = _solved(RECIPES[name])
    forward = state_log_k_response(state, terms).pH
    adjoint = pH_log_k_derivative(state.basis, state.equilibrium, state.bound, state.free,
                                  terms)
    np.testing.assert_allclose(adjoint, forward, atol=1e-12)


def test_batch_uncertainty_has_the_same_bits_alone_or_together():
    """A row's pH uncertainty does not depend on the rows solved beside it (the batch
    promise: partitions of a distributed batch equal the local one)."""
    from ionwright.outputs._uncertainty import batch_pH_uncertainty

    compiled = compile_recipe({"dissolve": {"NaHCO3": 0.01, "CaCl2": 0.002, "NH4Cl": 0.001}})
    rng = np.random.default_rng(5)
    totals = compiled.base[None, :] * rng.uniform(0.2, 2.0, (40, compiled.system.n_components))
    state = compiled.solve(totals)
    together = batch_pH_uncertainty(compiled.system, compiled.tables, state.equilibrium,
                                    state.bound, False)
    for k in (0, 7, 39):
        alone = compiled.solve(totals[k:k + 1])
        single = batch_pH_uncertainty(compiled.system, compiled.tables, alone.equilibrium,
                                      alone.bound, False)
        assert single[0] == together[k]
