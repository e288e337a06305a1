"""The fast path of a batched solve: Newton on (ln a, √I) together, for activity models
whose γ depend on ionic strength alone, with a capped step and an Armijo line search."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ...activity._base import BoundModel
from .._sparse import SparseCholesky, weighted_sum
from .numerics import (ARMIJO, LN_C_CEILING, MAX_HALVINGS, RESIDUAL_TOLERANCE, ROUND_OFF,
                       STEP_CAP, STEP_TOLERANCE, any_set, all_set, at, clip, column_max)
from .structure import Problem, bound_slice, model_terms

FAST_ITERATIONS = 60


@dataclass
class Linearised:
    """Residuals (m, k), their scales (m, k) and the Jacobian at k samples.

    m = f + 1: the free mass balances, then I − u². The Jacobian is [[A, a], [bᵀ, d]]
    with A (f, f) = Σ ν νᵀ c, whose non-zero entries are rows of *prod*, a (f, k) =
    ∂r/∂u, b (f, k) = ∂I/∂y and d (k,) = ∂(I − u²)/∂u.
    """

    res: np.ndarray
    scale: np.ndarray
    prod: np.ndarray
    a: np.ndarray
    d: np.ndarray

    def merit(self, scale: np.ndarray | None = None) -> np.ndarray:
        return weighted_sum((self.res / (self.scale if scale is None else scale)) ** 2)

    def measures(self) -> tuple[np.ndarray, np.ndarray]:
        """(worst relative residual, merit) at the linearisation's own scales."""
        scaled = self.res / self.scale
        return np.abs(scaled).max(axis=0), weighted_sum(scaled * scaled)

    def select(self, keep: np.ndarray) -> "Linearised":
        """The linearisation of the samples *keep* (a mask or indices) only."""
        return Linearised(*(getattr(self, name)[..., keep] for name in PARTS))


PARTS = ("res", "scale", "prod", "a", "d")


def augmented(problem: Problem, bound: BoundModel, y: np.ndarray,
              u: np.ndarray) -> Linearised:
    """Residuals (mass balances, I − u²), their scales and Jacobian at (y (c, k), u)."""
    st, cp = problem.structure, problem.coupling
    assert cp is not None  # the fast path always has one (coupling_for)
    nf = st.nf
    phi, dphi = model_terms(bound, cp, u)
    lnc = cp.nu @ np.concatenate((y, phi))                            # ln c − ln K
    lnc += problem.ln_k
    np.minimum(lnc, LN_C_CEILING, out=lnc)
    conc = np.exp(lnc, out=lnc)
    prod = cp.weights @ conc                                           # (q + p(f+1), k)
    first = cp.side_row
    side = prod[first:first + nf + 1] * dphi[0] if cp.terms else np.zeros((nf + 1, u.size))
    for p in range(1, cp.terms):
        first += nf + 1
        side += prod[first:first + nf + 1] * dphi[p]
    res = np.empty((nf + 1, u.size))
    np.subtract(prod[:nf], problem.totals, out=res[:nf])
    np.subtract(prod[2 * nf], u * u, out=res[nf])
    scale = np.empty_like(res)
    np.add(prod[nf:2 * nf], problem.scale_floor, out=scale[:nf])
    np.maximum(prod[2 * nf], u * u, out=scale[nf])
    scale[nf] += 1e-300
    side[nf] -= 2.0 * u
    return Linearised(res, scale, prod, side[:nf], side[nf])


def newton_step(lin: Linearised, factor: SparseCholesky
                 ) -> tuple[np.ndarray, np.ndarray]:
    """(dy (f, k), du (k,)) solving J·step = −res by Cholesky of A and u's Schur complement."""
    nf = lin.a.shape[0]
    return factor.solve_bordered(lin.prod, lin.res[:nf], lin.res[nf], lin.a,
                                 lin.prod[2 * nf + 1:3 * nf + 1], lin.d)


def fast_path(problem: Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
              iterations: np.ndarray) -> np.ndarray:
    """Newton on (y_free, u) together; returns which samples converged (y, u updated)."""
    free = problem.structure.free
    cols = slice(None) if free.all() else np.flatnonzero(free)
    converged = np.zeros(problem.size, dtype=bool)
    active = np.arange(problem.size)
    sub, b = problem, bound
    lin = augmented(sub, b, y, u)
    for it in range(1, FAST_ITERATIONS + 1):
        dy, du = newton_step(lin, problem.structure.factor)
        biggest = column_max(np.abs(dy))
        size = np.maximum(biggest, np.abs(du) / np.maximum(u[active], 1e-12))
        worst, merit = lin.measures()
        scale = lin.scale
        finished = (worst <= RESIDUAL_TOLERANCE) & (size <= STEP_TOLERANCE)
        if any_set(finished):  # the last, tiny step is taken without a search
            rows = active[finished]
            iterations[rows] = it
            y[at(cols, rows)] += dy[:, finished]
            u[rows] = clip(u[rows] + du[finished], 0.0, problem.u_max[rows])
            converged[rows] = True
            keep = ~finished
            active = active[keep]
            if not active.size:
                return converged
            sub, b = problem.take(active), bound_slice(bound, active)
            dy, du, worst, biggest = dy[:, keep], du[keep], worst[keep], biggest[keep]
            merit, scale = merit[keep], scale[:, keep]
        shrink = np.minimum(1.0, STEP_CAP / np.maximum(biggest, 1e-300))
        dy *= shrink
        du *= shrink
        lin, stuck = line_search(sub, b, y, u, active, cols, merit, scale, dy, du, shrink,
                                 worst <= ROUND_OFF)
        if any_set(stuck):  # no acceptable step: the careful path takes these samples
            iterations[active[stuck]] = it
            keep = ~stuck
            active = active[keep]
            if not active.size:
                return converged
            sub, b, lin = problem.take(active), bound_slice(bound, active), lin.select(keep)
    iterations[active] = FAST_ITERATIONS
    return converged


def line_search(problem: Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
                active: np.ndarray, cols: np.ndarray | slice, merit0: np.ndarray,
                scale0: np.ndarray, dy: np.ndarray, du: np.ndarray, shrink: np.ndarray,
                at_round_off: np.ndarray) -> tuple[Linearised, np.ndarray]:
    """Backtrack along (dy, du) until the scaled residual drops (Armijo); update y, u.

    *problem* and *bound* are restricted to *active*; *merit0* and *scale0* are the
    merit and residual scales at the starting point, kept for every trial so that the
    Newton direction is a descent direction of the merit. The full step is tried for
    every sample, then halved for the rejected ones only. Returns the linearisation at
    the accepted points and which samples found none.
    """
    yt = y[:, active]
    yt[cols] += dy
    ut = clip(u[active] + du, 0.0, problem.u_max)
    out = augmented(problem, bound, yt, ut)
    decrease = 1.0 - 2.0 * ARMIJO * shrink
    ok = acceptable(out, scale0, merit0, decrease, at_round_off)
    if all_set(ok):  # the usual case: every full step is taken
        y[:, active], u[active] = yt, ut
        return out, np.zeros(active.size, dtype=bool)
    y[:, active[ok]], u[active[ok]] = yt[:, ok], ut[ok]
    pending = np.flatnonzero(~ok)
    alpha = np.full(pending.size, 0.5)
    for _ in range(MAX_HALVINGS - 1):
        rows = active[pending]
        yt = y[:, rows]
        yt[cols] += alpha * dy[:, pending]
        ut = clip(u[rows] + alpha * du[pending], 0.0, problem.u_max[pending])
        trial = augmented(problem.take(pending), bound.take(pending), yt, ut)
        ok = acceptable(trial, scale0[:, pending], merit0[pending],
                        1.0 - 2.0 * ARMIJO * alpha * shrink[pending], at_round_off[pending])
        y[:, rows[ok]], u[rows[ok]] = yt[:, ok], ut[ok]
        for name in PARTS:
            getattr(out, name)[..., pending[ok]] = getattr(trial, name)[..., ok]
        pending, alpha = pending[~ok], 0.5 * alpha[~ok]
        if not pending.size:
            break
    stuck = np.zeros(active.size, dtype=bool)
    stuck[pending] = True
    return out, stuck


def acceptable(trial: Linearised, scale0: np.ndarray, merit0: np.ndarray,
               decrease: np.ndarray, at_round_off: np.ndarray) -> np.ndarray:
    """Which trial points lower the merit enough (Armijo), or are at round-off anyway."""
    merit = trial.merit(scale0)
    ok = np.isfinite(merit) & (merit <= decrease * merit0)
    if any_set(at_round_off):
        ok |= at_round_off & np.isfinite(trial.res).all(axis=0)
    return ok
