"""The batched solver: chunks, determinism, the sparse Cholesky, stopping rules, paths."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.core import _sparse as batched_sparse
from ionwright.core import _solver as solver
from ionwright.core._newton import fast
from ionwright.core._newton import numerics
from ionwright.core._newton import structure as newton_structure
from ionwright.activity import DaviesModel
from ionwright.engine._totals import component_totals
from ionwright.inputs._recipe import read_recipe
from ionwright.core._system import compile_system

NATURAL = ["Ca2+", "Mg2+", "Na+", "K+", "Cl-", "SO4^2-", "CO3^2-"]


def _waters(n: int, seed: int = 3):
    """Random fresh-to-brackish waters of the natural-water system (our own scenario)."""
    rng = np.random.default_rng(seed)
    system = compile_system(ionwright.load_tables(["core"]), NATURAL)
    totals = np.exp(rng.uniform(np.log(1e-5), np.log(0.05), (n, system.n_components)))
    totals[:, 0] = rng.uniform(-0.01, 0.01, n)            # added acid or base
    return system, totals, rng.uniform(0.0, 40.0, n)


def _solve(system, totals, t, fixed=None, **kw):
    return solver.solve(system, totals, DaviesModel().bind(system.properties, t), fixed, **kw)


def test_random_natural_waters_all_converge_with_small_residuals():
    system, totals, t = _waters(3000)
    eq = _solve(system, totals, t)
    assert np.all(eq.status == "converged")
    assert eq.residual.max() <= 1e-10
    ph = -eq.log_activity[:, 0] / np.log(10)
    assert ph.min() < 3.5 and ph.max() > 10.5  # the draw spans acid to alkaline waters


def test_a_sample_is_bit_for_bit_the_same_alone_or_in_any_batch():
    # glycine with fluoride is close to singular (the H+/Gly- direction is soft): rounding
    # alone would move it by 1e-12, so this checks the arithmetic does not depend on n
    core = ionwright.load_tables(["core"])
    recipe = read_recipe({"dissolve": {"NaF": 0.0234375, "glycine": 0.0348051},
                          "temperature_C": 0.125})
    totals, _ = component_totals(recipe, core)
    system = compile_system(core, [c for c, v in totals.items() if v > 0 and c != "H+"])
    row = np.array([[totals.get(c, 0.0) for c in system.components]])
    rng = np.random.default_rng(0)
    others = row * rng.uniform(0.5, 2.0, (9, row.shape[1]))
    alone = _solve(system, row, np.array([0.125]))
    for position in (0, 4, 9):
        batch = np.insert(others, position, row[0], axis=0)
        temps = np.insert(rng.uniform(0, 40, 9), position, 0.125)
        together = _solve(system, batch, temps)
        assert np.array_equal(together.log_activity[position], alone.log_activity[0])
        assert np.array_equal(together.molality[position], alone.molality[0])


def test_chunking_does_not_change_any_answer(monkeypatch):
    system, totals, t = _waters(50)
    whole = _solve(system, totals, t)
    monkeypatch.setattr(solver, "CHUNK_SIZE", 7)
    chunked = _solve(system, totals, t)
    assert np.array_equal(whole.molality, chunked.molality)
    assert np.array_equal(whole.iterations, chunked.iterations)


def test_threads_do_not_change_any_answer(monkeypatch):
    """Chunks solved side by side on threads give the serial answers, bit for bit."""
    system, totals, t = _waters(400, seed=5)
    monkeypatch.setattr(solver, "CHUNK_SIZE", 37)
    serial = _solve(system, totals, t, threads=1)
    threaded = _solve(system, totals, t, threads=3)
    for name in ("log_activity", "molality", "ln_gamma", "residual", "iterations", "status"):
        assert np.array_equal(getattr(serial, name), getattr(threaded, name)), name
    assert solver.default_threads() >= 1


def test_the_careful_path_agrees_with_the_fast_path():
    system, totals, t = _waters(40)
    fast = _solve(system, totals, t)
    careful = _solve(system, totals, t, method="careful")
    assert np.all(careful.status == "converged")
    assert careful.log_activity[:, 0] == pytest.approx(fast.log_activity[:, 0], abs=1e-9)
    assert careful.molality == pytest.approx(fast.molality, rel=1e-8, abs=1e-30)


def test_an_unknown_method_is_named():
    system, totals, t = _waters(2)
    with pytest.raises(ionwright.UnknownNameError, match="solver method"):
        _solve(system, totals, t, method="fastest")


def test_a_returned_answer_needs_no_further_newton_step():
    """Stop on residual and step: from the answer, one more Newton step is below 1e-8."""
    system, totals, t = _waters(200)
    bound = DaviesModel().bind(system.properties, t)
    eq = solver.solve(system, totals, bound)
    free = np.ones(system.n_components, dtype=bool)
    structure = newton_structure.Structure.build(system, free)
    problem = newton_structure.Problem.build(
        structure, totals, np.log(10) * system.log10_k(t, True), np.full(totals.shape, np.nan),
        newton_structure.coupling_for(structure, bound, True))
    lin = fast.augmented(problem, bound, eq.log_activity.T.copy(), np.sqrt(eq.ionic_strength))
    dy, _ = fast.newton_step(lin, structure.factor)
    assert np.abs(dy).max() <= numerics.STEP_TOLERANCE
    assert lin.measures()[0].max() <= numerics.RESIDUAL_TOLERANCE


def test_a_fixed_high_pH_is_not_held_back_by_the_ionic_strength_cap():
    # at a fixed pH of 12.9 the OH- alone outweighs the salts' ionic strength; the cap on
    # u must count it (it once did not, and such samples never converged)
    system, totals, t = _waters(30)
    fixed = np.full(totals.shape, np.nan)
    fixed[:, 0] = -12.9
    eq = _solve(system, totals * 0.01, t, fixed)
    assert np.all(eq.status == "converged")
    assert np.all(eq.ionic_strength > 0.005)


def test_the_sparse_cholesky_solves_like_a_dense_solver():
    system, _, _ = _waters(1)
    free = np.ones(system.n_components, dtype=bool)
    plan = batched_sparse.SparseCholesky.plan(system.nu[:, free] != 0, first_row=0)
    f = int(free.sum())
    assert sorted(plan.order) == list(range(f))
    assert len(plan.source) < f * (f + 1) // 2          # the zeros are not stored
    rng = np.random.default_rng(1)
    k = 25
    conc = np.exp(rng.uniform(-30, 0, (system.nu.shape[0], k)))
    dense = np.einsum("si,sk,sj->ijk", system.nu, conc, system.nu)
    rows = np.array([dense[i, j] for i, j in plan.entries] + [np.zeros(k)])
    rhs = rng.normal(size=(f, 2, k))
    x = plan.solve(rows, rhs)
    for n in range(k):
        expected = np.linalg.solve(dense[:, :, n], rhs[:, :, n])
        assert x[:, :, n] == pytest.approx(expected, rel=1e-7, abs=1e-7 * np.abs(expected).max())


def test_the_careful_path_returns_concentrations_consistent_with_its_gammas():
    # a composition-dependent model (Pitzer) goes the careful path; its molalities must
    # satisfy the mass balances at the ln γ returned, and those ln γ must be the model's
    recipe = {"activity_model": "pitzer", "dissolve": {"NaCl": 2.0, "NaHCO3": 0.01}}
    result = ionwright.solve(recipe)
    eq = result.equilibrium
    assert eq.residual[0] <= 1e-10
    bound = result.model.bind(result.system.properties, np.array([25.0]))
    again = bound.ln_gamma(np.sqrt(eq.ionic_strength), eq.molality)
    assert again == pytest.approx(eq.ln_gamma, abs=1e-9)


class _OpaqueDavies:
    """Davies seen through the bare interface a plugin model may offer: ln γ and ∂ln γ/∂u
    of ionic strength alone, without the weights-and-terms split."""

    def __init__(self, bound):
        self._inner = bound
        self.t_C, self.notes = bound.t_C, []
        self.depends_on_ionic_strength_only = True

    def ln_gamma(self, u, molality=None):
        return self._inner.ln_gamma(u)

    def d_ln_gamma_du(self, u):
        return self._inner.d_ln_gamma_du(u)

    def ln_water_activity(self, molality):
        return None

    def take(self, rows):
        return _OpaqueDavies(self._inner.take(rows))


def test_a_model_without_terms_of_its_own_gives_the_same_answers():
    system, totals, t = _waters(300, seed=11)
    bound = DaviesModel().bind(system.properties, t)
    split = solver.solve(system, totals, bound)
    opaque = solver.solve(system, totals, _OpaqueDavies(bound))
    assert np.all(opaque.status == "converged")
    assert opaque.log_activity == pytest.approx(split.log_activity, rel=1e-11, abs=1e-11)
    assert opaque.molality == pytest.approx(split.molality, rel=1e-9, abs=1e-18)


def test_a_system_is_compiled_once_per_table_set():
    tables = ionwright.load_tables(["core"])
    first = compile_system(tables, ["Na+", "Cl-"])
    assert compile_system(tables, ["Cl-", "H+", "Na+", "H2O"]) is first
    assert compile_system(tables, ["Na+"]) is not first


def test_random_waters_alone_have_the_bits_they_have_together():
    """One sample takes the float shortcuts (bordered solve, Newton loop); a batch takes the
    vector code. Every answer must be the same, bit for bit, either way."""
    system, totals, t = _waters(300, seed=21)
    together = _solve(system, totals, t)
    for k in range(300):
        alone = _solve(system, totals[k:k + 1], t[k:k + 1])
        assert np.array_equal(alone.log_activity[0], together.log_activity[k]), k
        assert np.array_equal(alone.molality[0], together.molality[k]), k
        assert alone.iterations[0] == together.iterations[k]
        assert alone.status[0] == together.status[k]


def test_waters_at_a_fixed_pH_alone_have_the_bits_they_have_together():
    system, totals, t = _waters(60, seed=22)
    fixed = np.full(totals.shape, np.nan)
    fixed[:, 0] = -np.random.default_rng(4).uniform(3.0, 11.0, 60)   # log10 a(H+) = −pH
    together = _solve(system, totals, t, fixed)
    assert np.all(together.status == "converged")
    for k in range(60):
        alone = _solve(system, totals[k:k + 1], t[k:k + 1], fixed[k:k + 1])
        assert np.array_equal(alone.molality[0], together.molality[k]), k


def test_the_guess_alone_has_the_bits_it_has_together_even_at_extremes():
    """The one-sample guess runs on floats; totals down to 1e-300 (members that
    underflow, NaN shares) and strong acid or base must not part it from the batch's."""
    from ionwright.core._newton import one_sample
    from ionwright.core._newton.guess import initial_guess
    from ionwright.core._newton.structure import Problem, coupling_for, structure_of

    system, totals, t = _waters(200, seed=23)
    rng = np.random.default_rng(5)
    totals[:, 1:] = np.exp(rng.uniform(np.log(1e-300), np.log(2.0), totals[:, 1:].shape))
    totals[:, 0] = rng.choice([-2.0, -1e-3, 0.0, 1e-9, 1.5], 200)
    bound = DaviesModel().bind(system.properties, t)
    free = np.ones(system.n_components, dtype=bool)
    st = structure_of(system, free)
    coupling = coupling_for(st, bound, True)
    ln_k = np.log(10) * system.log10_k(t, samples_last=True)
    family = st.families.members[st.families.varying[0]]
    ln_k[np.ix_(family[family >= 0], np.arange(0, 200, 7))] = -800.0  # all members underflow
    fixed = np.full(totals.shape, np.nan)
    with np.errstate(all="ignore"):
        y, u = initial_guess(Problem.build(st, totals, ln_k, fixed, coupling), bound)
        for k in range(200):
            one = Problem.build(st, totals[k:k + 1], ln_k[:, k:k + 1], fixed[k:k + 1], coupling)
            yk, uk = one_sample.initial_guess(one, bound.take(np.array([k])))
            assert np.array_equal(yk[:, 0], y[:, k], equal_nan=True), k
            assert np.array_equal(uk, u[k:k + 1], equal_nan=True), k
