"""The careful path of a batched solve: a damped fixed point on ln γ around a convex
Newton solve, for composition-dependent models and for samples the fast path left."""

from __future__ import annotations

import numpy as np

from ...activity._base import BoundModel
from .._sparse import weighted_sum
from .numerics import (ARMIJO, LN_C_CEILING, MAX_HALVINGS, RESIDUAL_TOLERANCE, ROUND_OFF,
                       STEP_CAP, STEP_TOLERANCE)
from .structure import Problem, ln_gamma_at

CAREFUL_OUTER_ITERATIONS = 200
CAREFUL_INNER_ITERATIONS = 100
GAMMA_TOLERANCE = 1e-12        # change of ln γ between careful rounds that ends them
MIN_DAMPING = 1.0 / 64         # smallest weight of a new ln γ in a careful round


def careful_path(problem: Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
                 iterations: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Solve with ln γ and ln a(H2O) frozen per round, then update them, damped.

    Each round solves the convex problem exactly at the current ln γ, then moves ln γ a
    fraction ω towards its value at the new composition; ω halves for a sample whose
    change grew. A sample is done when its change is below :data:`GAMMA_TOLERANCE` with
    the inner solve converged; its concentrations then satisfy the mass balances at the
    ln γ returned. Returns (converged, ln γ (s, k), ln a(H2O) (k,)); y, u updated in place.
    """
    st = problem.structure
    k = problem.size
    ln_g = ln_gamma_at(problem.coupling, bound, u)
    ln_aw = np.zeros(k)
    ok = np.zeros(k, dtype=bool)
    omega = np.ones(k)
    last_change = np.full(k, np.inf)
    active = np.arange(k)
    for _ in range(CAREFUL_OUTER_ITERATIONS):
        every = active.size == k
        sub = problem if every else problem.take(active)
        b = bound if every else bound.take(active)
        offset = sub.ln_k + ln_aw[active] * st.nu_water[:, None] - ln_g[:, active]
        ya = y[:, active]
        inner_ok, conc = convex_newton(sub, offset, ya, iterations, active)
        y[:, active] = ya
        ionic = np.minimum(weighted_sum(conc, 0.5 * st.z2), sub.u_max ** 2)
        u[active] = np.sqrt(ionic)
        new_g = b.ln_gamma(u[active], conc.T).T
        new_aw = b.ln_water_activity(conc.T)
        new_aw = np.zeros(active.size) if new_aw is None else new_aw
        change = np.maximum(np.max(np.abs(new_g - ln_g[:, active]), axis=0, initial=0.0),
                            np.abs(new_aw - ln_aw[active]))
        finished = inner_ok & (change <= GAMMA_TOLERANCE)
        ok[active[finished]] = True
        grew = change > last_change[active]
        omega[active] = np.where(grew, np.maximum(omega[active] * 0.5, MIN_DAMPING),
                                 omega[active])
        go = ~finished
        rows = active[go]
        weight = omega[rows]
        ln_g[:, rows] += weight * (new_g[:, go] - ln_g[:, rows])
        ln_aw[rows] += weight * (new_aw[go] - ln_aw[rows])
        last_change[rows] = change[go]
        active = rows
        if not active.size:
            break
    return ok, ln_g, ln_aw


def convex_newton(problem: Problem, offset: np.ndarray, y: np.ndarray,
                  iterations: np.ndarray, rows: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Minimise f(y) = Σ exp(offset + ν y) − T·y over the free y, for every sample.

    Newton steps from a Cholesky solve of the Hessian, capped, with an Armijo search on
    f (off once the gradient is at round-off); a sample stops when its gradient and its
    step are both small. *y* (c, k) is updated in place; *iterations* counts at *rows*.
    Returns (converged, concentrations (s, k) at the final y).
    """
    st = problem.structure
    cols = np.flatnonzero(st.free)
    nf = st.nf
    fixed = ~st.free
    base = offset + (st.nu_of_fixed @ np.ascontiguousarray(y[fixed]) if fixed.any() else 0.0)
    nu_f = st.nu_of_free
    yf = y[cols].copy()
    k = problem.size
    done = np.zeros(k, dtype=bool)
    conc = np.exp(np.minimum(base + nu_f @ yf, LN_C_CEILING))
    weights = st.weights
    active = np.arange(k)
    for _ in range(CAREFUL_INNER_ITERATIONS):
        ca = conc[:, active]
        prod = weights @ ca
        grad = prod[:nf] - problem.totals[:, active]
        scale = prod[nf:2 * nf] + problem.scale_floor[:, active]
        rel = np.max(np.abs(grad) / scale, axis=0, initial=0.0)
        step = st.factor.solve(prod, -grad[:, None, :])[:, 0]
        size = np.max(np.abs(step), axis=0, initial=0.0)
        finished = (rel <= 0.1 * RESIDUAL_TOLERANCE) & (size <= STEP_TOLERANCE)
        if finished.any():
            idx = active[finished]
            yf[:, idx] += step[:, finished]
            conc[:, idx] = np.exp(np.minimum(base[:, idx] + nu_f @ yf[:, idx], LN_C_CEILING))
            done[idx] = True
        go = ~finished
        active, step, grad, rel = active[go], step[:, go], grad[:, go], rel[go]
        if not active.size:
            break
        iterations[rows[active]] += 1
        step *= np.minimum(1.0, STEP_CAP / np.maximum(np.max(np.abs(step), axis=0,
                                                             initial=0.0), 1e-300))
        slope = weighted_sum(grad * step)
        f0 = objective(conc[:, active], problem.totals[:, active], yf[:, active])
        # below f's own rounding no decrease can be seen: take the full Newton step
        blind = ~(np.abs(slope) > ROUND_OFF * (np.abs(f0) + weighted_sum(conc[:, active])))
        alpha = np.ones(active.size)
        pending = np.arange(active.size)
        for _ in range(MAX_HALVINGS):
            idx = active[pending]
            trial = yf[:, idx] + alpha[pending] * step[:, pending]
            ct = np.exp(np.minimum(base[:, idx] + nu_f @ trial, LN_C_CEILING))
            ft = objective(ct, problem.totals[:, idx], trial)
            ok = ft < f0[pending] + ARMIJO * alpha[pending] * slope[pending]
            ok |= blind[pending] | (rel[pending] <= ROUND_OFF) | ~(slope[pending] < 0)
            ok &= np.isfinite(ft)
            yf[:, idx[ok]], conc[:, idx[ok]] = trial[:, ok], ct[:, ok]
            pending = pending[~ok]
            if not pending.size:
                break
            alpha[pending] *= 0.5
        if pending.size:  # no decrease at machine precision: take the Newton step anyway
            idx = active[pending]
            yf[:, idx] += step[:, pending]
            conc[:, idx] = np.exp(np.minimum(base[:, idx] + nu_f @ yf[:, idx], LN_C_CEILING))
    y[cols] = yf
    return done, conc


def objective(conc: np.ndarray, totals: np.ndarray, yf: np.ndarray) -> np.ndarray:
    return weighted_sum(conc) - weighted_sum(totals * yf)
