"""Sparse products, ordered sums and the bordered Cholesky solve over a batch."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ionwright.core._sparse import SparseCholesky, SparseRows, weighted_sum


def _loop_sum(a: np.ndarray, w: np.ndarray) -> np.ndarray:
    acc = np.zeros(a.shape[1:])
    for wi, row in zip(w, a):
        if wi:
            acc += wi * row
    return acc


@settings(deadline=None, max_examples=60)
@given(st.integers(1, 9), st.integers(1, 40), st.integers(0, 2**31 - 1))
def test_weighted_sum_has_the_bits_of_the_plain_loop(m, k, seed):
    rng = np.random.default_rng(seed)
    a = rng.normal(size=(m, k)) * 10.0 ** rng.integers(-8, 8, size=(m, 1))
    w = rng.normal(size=m)
    w[rng.random(m) < 0.3] = 0.0
    assert np.array_equal(weighted_sum(a, w), _loop_sum(a, w))
    assert np.array_equal(weighted_sum(a), _loop_sum(a, np.ones(m)))


def test_weighted_sum_keeps_trailing_shapes_and_empty_inputs():
    a = np.arange(24.0).reshape(2, 3, 4)
    assert np.array_equal(weighted_sum(a), a[0] + a[1])
    assert weighted_sum(np.zeros((0, 5))).shape == (5,)


def test_a_sparse_product_does_not_depend_on_the_batch():
    rng = np.random.default_rng(2)
    dense = rng.normal(size=(7, 5)) * (rng.random((7, 5)) < 0.5)
    x = rng.normal(size=(5, 300))
    rows = SparseRows(dense)
    whole = rows @ x
    assert whole == pytest.approx(dense @ x, rel=1e-12, abs=1e-12)
    for j in (0, 17, 299):
        assert np.array_equal(rows @ x[:, j:j + 1], whole[:, j:j + 1])


def _random_spd(f: int, k: int, seed: int):
    """k matrices A = Σ ν νᵀ c over a random incidence, as the solver builds them."""
    rng = np.random.default_rng(seed)
    nu = (rng.random((3 * f, f)) < 0.3) * rng.integers(1, 3, (3 * f, f)).astype(float)
    nu[:f] += np.eye(f)
    plan = SparseCholesky.plan(nu != 0, first_row=0)
    conc = rng.uniform(0.1, 2.0, (3 * f, k))
    prod = np.stack([(nu[:, i] * nu[:, j])[:, None] * conc for i, j in plan.entries]).sum(1)
    prod = np.concatenate([prod, np.zeros((1, k))])
    dense = np.einsum("si,sj,sk->kij", nu, nu, conc)
    return plan, prod, dense, rng


def _border(rng, f: int, k: int) -> tuple[np.ndarray, ...]:
    """Random (top, last, a, b, d) of a bordered system, the corner well away from zero."""
    return (rng.normal(size=(f, k)), rng.normal(size=k), rng.normal(size=(f, k)),
            rng.normal(size=(f, k)), rng.normal(size=k) - 5.0)


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_the_bordered_solve_solves_the_bordered_system(seed):
    f, k = 6, 40
    plan, prod, dense, rng = _random_spd(f, k, seed)
    top, last, a, b, d = _border(rng, f, k)
    x, t = plan.solve_bordered(prod, top, last, a, b, d)
    for j in range(k):
        full = np.zeros((f + 1, f + 1))
        full[:f, :f], full[:f, f], full[f, :f], full[f, f] = dense[j], a[:, j], b[:, j], d[j]
        expect = np.linalg.solve(full, -np.concatenate([top[:, j], [last[j]]]))
        assert np.concatenate([x[:, j], [t[j]]]) == pytest.approx(expect, rel=1e-9, abs=1e-9)


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_one_sample_takes_the_same_operations_as_the_batch(seed):
    """The one-sample path runs on Python floats; it must give the batch's bits."""
    f, k = 6, 25
    plan, prod, _, rng = _random_spd(f, k, seed)
    top, last, a, b, d = _border(rng, f, k)
    x, t = plan.solve_bordered(prod, top, last, a, b, d)
    rhs = rng.normal(size=(f, 2, k))
    whole = plan.solve(prod, rhs)
    for j in range(k):
        cut = slice(j, j + 1)
        xj, tj = plan.solve_bordered(prod[:, cut], top[:, cut], last[cut], a[:, cut],
                                     b[:, cut], d[cut])
        assert np.array_equal(xj[:, 0], x[:, j]) and tj[0] == t[j]
        assert np.array_equal(plan.solve(prod[:, cut], rhs[:, :, cut])[:, :, 0], whole[:, :, j])


def test_a_vanishing_schur_complement_gives_no_border_step():
    f, k = 3, 2
    plan, prod, _, rng = _random_spd(f, k, 5)
    zero = np.zeros((f, k))
    for cut in (slice(0, 2), slice(0, 1)):
        x, t = plan.solve_bordered(prod[:, cut], np.ones((f, k))[:, cut], np.ones(k)[cut],
                                   zero[:, cut], zero[:, cut], np.zeros(k)[cut])
        assert np.all(t == 0.0) and np.all(np.isfinite(x))


@settings(deadline=None, max_examples=40)
@given(st.integers(1, 12), st.integers(1, 120), st.integers(0, 2**31 - 1))
def test_the_written_out_one_sample_product_has_the_kernels_bits(m, n, seed):
    """apply_one is generated Python (±1 left out, long rows split into statements); each
    row must still be the kernel's 0.0 + w·x + … in column order, NaN and ±inf included."""
    rng = np.random.default_rng(seed)
    dense = rng.choice([0.0, 0.0, 1.0, -1.0, 0.5, -2.25, 3e-7, 1e12], size=(m, n))
    dense *= np.where(rng.random((m, n)) < 0.5, rng.normal(size=(m, n)), 1.0)
    dense[0] = 0.0                                          # an empty row
    x = rng.normal(size=n) * 10.0 ** rng.integers(-200, 200, size=n)
    x[rng.random(n) < 0.02] = np.inf
    x[rng.random(n) < 0.02] = np.nan
    x[rng.random(n) < 0.05] = -0.0
    rows = SparseRows(dense)
    with np.errstate(invalid="ignore", over="ignore"):
        batched = (rows @ x[:, None])[:, 0]
    one = np.array(rows.apply_one(x.tolist()))
    assert np.array_equal(one, batched, equal_nan=True)
    numbers = ~np.isnan(batched)                            # a NaN's sign bit is arbitrary
    assert np.array_equal(np.signbit(one[numbers]), np.signbit(batched[numbers]))


def test_a_written_out_product_splits_a_row_of_hundreds_of_terms():
    dense = np.full((2, 500), 0.3)
    x = np.linspace(-1.0, 1.0, 500)
    rows = SparseRows(dense)
    assert np.array_equal(rows.apply_one(x.tolist()), (rows @ x[:, None])[:, 0])


def test_a_single_solve_does_not_import_scipy():
    """One sample's products run as written-out Python, so `ionwright solve` starts
    without scipy's import (about 0.15 s of its cold start), its JSON (uncertainty
    included) too; a batch imports it."""
    import subprocess
    import sys

    code = ("import sys, ionwright\n"
            "ionwright.solve({'dissolve': {'NaHCO3': 0.002, 'CaCl2': 0.001}}).to_dict()\n"
            "print(any(m.split('.')[0] == 'scipy' for m in sys.modules))\n")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True)
    assert done.stdout.strip() == "False"
