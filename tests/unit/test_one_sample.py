"""The one-sample float mirror (core/_newton/one_sample.py) has, operation by operation,
the bits of the vector Newton core it mirrors (one parity test per operation)."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.activity import DaviesModel, ExtendedDebyeHuckelModel, TruesdellJonesModel
from ionwright.core._newton import fast, guess, one_sample
from ionwright.core._newton.numerics import LN_C_CEILING
from ionwright.core._newton.structure import (Problem, coupling_for, ln_gamma_at, model_terms,
                                              structure_of)
from ionwright.core._system import compile_system

MODELS = [DaviesModel(), ExtendedDebyeHuckelModel(), TruesdellJonesModel()]
COMPONENTS = ["Na+", "Ca2+", "Mg2+", "Cl-", "SO4^2-", "CO3^2-"]


def _problems(model, n: int = 12, seed: int = 1):
    """n random brackish waters as one problem, and the same waters one by one."""
    rng = np.random.default_rng(seed)
    system = compile_system(ionwright.load_tables(["core"]), COMPONENTS)
    c = system.n_components
    totals = np.exp(rng.uniform(np.log(1e-5), np.log(0.3), (n, c)))
    totals[:, 0] = rng.uniform(-0.02, 0.02, n)
    t = rng.uniform(5.0, 45.0, n)
    bound = model.bind(system.properties, t)
    st = structure_of(system, np.ones(c, dtype=bool))
    coupling = coupling_for(st, bound, True)
    ln_k = np.log(10.0) * system.log10_k(t, samples_last=True)
    fixed = np.full(totals.shape, np.nan)
    batch = Problem.build(st, totals, ln_k, fixed, coupling)
    alone = [(Problem.build(st, totals[k:k + 1], ln_k[:, k:k + 1], fixed[k:k + 1], coupling),
              bound.take(np.array([k]))) for k in range(n)]
    return batch, bound, alone


@pytest.mark.parametrize("model", MODELS, ids=lambda m: m.name)
def test_model_terms_and_ln_gamma(model):
    batch, bound, alone = _problems(model)
    u = np.linspace(0.01, 0.9, batch.size)
    phi, dphi = model_terms(bound, batch.coupling, u)
    ln_g = ln_gamma_at(batch.coupling, bound, u)
    for k, (problem, b) in enumerate(alone):
        p1, d1 = one_sample.model_terms(b, problem.coupling, float(u[k]))
        assert p1 == phi[:, k].tolist() and d1 == dphi[:, k].tolist()
        assert one_sample.ln_gamma(problem.coupling, b, float(u[k])) == ln_g[:, k].tolist()


@pytest.mark.parametrize("model", MODELS, ids=lambda m: m.name)
def test_initial_guess(model):
    batch, bound, alone = _problems(model)
    y, u = guess.initial_guess(batch, bound)
    for k, (problem, b) in enumerate(alone):
        yk, uk = one_sample.initial_guess(problem, b)
        assert np.array_equal(yk[:, 0], y[:, k]) and np.array_equal(uk, u[k:k + 1])


@pytest.mark.parametrize("model", MODELS, ids=lambda m: m.name)
def test_linearisation(model):
    batch, bound, alone = _problems(model)
    y, u = guess.initial_guess(batch, bound)
    lin = fast.augmented(batch, bound, y, u)
    for k, (problem, b) in enumerate(alone):
        given = (problem.ln_k[:, 0].tolist(), problem.totals[:, 0].tolist(),
                 problem.scale_floor[:, 0].tolist())
        one = one_sample.augmented(problem, b, y[:, k].tolist(), float(u[k]), given)
        assert one.res == lin.res[:, k].tolist() and one.scale == lin.scale[:, k].tolist()
        assert one.prod == lin.prod[:, k].tolist() and one.a == lin.a[:, k].tolist()
        assert one.d == float(lin.d[k])


@pytest.mark.parametrize("model", MODELS, ids=lambda m: m.name)
def test_fast_path(model):
    batch, bound, alone = _problems(model)
    y, u = guess.initial_guess(batch, bound)
    iterations = np.zeros(batch.size, dtype=int)
    done = fast.fast_path(batch, bound, y, u, iterations)
    for k, (problem, b) in enumerate(alone):
        yk, uk = one_sample.initial_guess(problem, b)
        its = np.zeros(1, dtype=int)
        ok = one_sample.fast_path(problem, b, yk, uk, its)
        assert ok[0] == done[k] and its[0] == iterations[k]
        assert np.array_equal(yk[:, 0], y[:, k]) and uk[0] == u[k]


@pytest.mark.parametrize("careful", [False, True])
def test_concentrations_and_residual(careful):
    batch, bound, alone = _problems(DaviesModel())
    y, u = guess.initial_guess(batch, bound)
    st = batch.structure
    ln_g = ln_gamma_at(batch.coupling, bound, u)
    ln_aw = np.linspace(-0.05, 0.0, batch.size)
    lnc = st.nu @ y
    lnc += batch.ln_k
    if careful:
        lnc += ln_aw * st.nu_water[:, None]
    lnc -= ln_g
    conc = np.exp(np.minimum(lnc, LN_C_CEILING))
    res = np.abs(st.nu_free @ conc - batch.totals) / (st.abs_nu_free @ conc + batch.scale_floor)
    for k, (problem, _) in enumerate(alone):
        one = one_sample.concentrations(problem, y[:, k:k + 1], ln_g[:, k:k + 1],
                                        ln_aw[k:k + 1] if careful else None)
        assert np.array_equal(one[:, 0], conc[:, k])
        worst, finite = one_sample.residual(problem, one)
        assert worst == res[:, k].max() and finite
