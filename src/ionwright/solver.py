"""Vectorised Newton–Raphson solve of the tableau mass balances over a batch of samples.

Unknowns per sample are y_j = ln a_j of the free components and u = √I. With γ held
fixed, the mass balances are the gradient of the strictly convex function
f(y) = Σ_i c_i(y) − Σ_j T_j y_j, whose Hessian Σ_i ν_i ν_iᵀ c_i is positive definite.
The fast path adds u as an unknown (so activity coefficients move inside the Newton step)
and uses a step cap with a backtracking line search on the scaled residual. Samples it
does not finish, and models whose γ depend on composition, go to the careful path:
a damped fixed point on γ around a convex Newton solve with an Armijo search on f.

References
----------
Morel, F. & Morgan, J. (1972) Environ. Sci. Technol. 6, 58–67 (tableau formulation).
Nocedal, J. & Wright, S.J. (2006) Numerical Optimization, 2nd ed., Springer, ch. 3
(line searches, Armijo condition).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .activity.base import BoundModel
from .system import ChemicalSystem

LN10 = np.log(10.0)
RESIDUAL_TOLERANCE = 1e-12     # relative mass-balance residual the iterations aim for
PROMISED_TOLERANCE = 1e-10     # what a converged result guarantees (see solve)
STEP_TOLERANCE = 1e-8         # a last Newton step this small leaves round-off only
STEP_CAP = 4.0                 # largest change of any ln a in one Newton step
LN_C_CEILING = 300.0           # keeps exp() finite on wild iterates
FAST_ITERATIONS = 60
CAREFUL_OUTER_ITERATIONS = 200
CAREFUL_INNER_ITERATIONS = 100
ARMIJO = 1e-4
MAX_HALVINGS = 30
STATUSES = ("converged", "max-iterations", "non-finite", "infeasible")


@dataclass
class Equilibrium:
    """Raw solver output for a batch: arrays over samples (n) and species (s)."""

    log_activity: np.ndarray        # (n, c) ln a of components
    molality: np.ndarray            # (n, s)
    ln_gamma: np.ndarray            # (n, s)
    ionic_strength: np.ndarray      # (n,)
    ln_water_activity: np.ndarray   # (n,)
    residual: np.ndarray            # (n,) worst relative mass-balance residual
    iterations: np.ndarray          # (n,)
    status: np.ndarray              # (n,) of str, one of STATUSES
    notes: list[str] = field(default_factory=list)

    @property
    def success(self) -> np.ndarray:
        return self.status == "converged"


@dataclass
class _Problem:
    """Everything fixed during one solve, sliced per active sample set."""

    nu: np.ndarray          # (s, c)
    nu_free: np.ndarray     # (s, f)
    nu_water: np.ndarray    # (s,)
    z2: np.ndarray          # (s,)
    free: np.ndarray        # (c,) bool
    ln_k: np.ndarray        # (n, s)
    totals: np.ndarray      # (n, f)
    full_totals: np.ndarray  # (n, c)
    fixed_y: np.ndarray     # (n, c) ln a for fixed components (ignored where free)
    scale_floor: np.ndarray  # (n, f)
    u_max: np.ndarray       # (n,)


def solve(system: ChemicalSystem, totals: np.ndarray, bound: BoundModel,
          fixed_log10_activity: np.ndarray | None = None) -> Equilibrium:
    """Solve the batch: *totals* (n, c) in mol/kg, fixed log10 activities (n, c), NaN = free.

    Returns an :class:`Equilibrium`; samples that fail carry their status, never a
    silent answer. Totals of the proton component may be negative (added base).
    """
    totals = np.atleast_2d(np.asarray(totals, dtype=float))
    n, c = totals.shape
    fixed = (np.full((n, c), np.nan) if fixed_log10_activity is None
             else np.atleast_2d(np.asarray(fixed_log10_activity, dtype=float)))
    free = np.isnan(fixed[0])
    if not np.array_equal(np.isnan(fixed), np.broadcast_to(free, (n, c))):
        raise ValueError("every sample of a batch must fix the same components")
    t_C = bound.t_C
    problem = _Problem(
        nu=system.nu, nu_free=system.nu[:, free], nu_water=system.nu_water,
        z2=system.charge ** 2, free=free, ln_k=LN10 * system.log10_k(t_C),
        totals=totals[:, free], full_totals=totals, fixed_y=np.nan_to_num(LN10 * fixed),
        scale_floor=np.maximum(np.abs(totals[:, free]), 1e-300),
        u_max=np.sqrt(_ionic_strength_ceiling(system, totals)))
    y, u = _initial_guess(problem, bound)
    status = np.full(n, "max-iterations", dtype=object)
    iterations = np.zeros(n, dtype=int)
    infeasible = _infeasible(system, totals, free)
    status[infeasible] = "infeasible"
    todo = np.flatnonzero(~infeasible)
    if bound.depends_on_ionic_strength_only and todo.size:
        done = _fast_path(problem, bound, y, u, todo, iterations)
        status[todo[done]] = "converged"
        todo = todo[~done]
    if todo.size:
        ok = _careful_path(problem, bound, y, u, todo, iterations)
        status[todo] = np.where(ok, "converged", status[todo])
    ln_g, ln_aw, lnc = _state(problem, bound, y, u, np.arange(n))
    conc = np.exp(lnc)
    residual = _relative_residual(problem, conc, np.arange(n))
    bad = ~np.all(np.isfinite(conc), axis=1) | ~np.isfinite(residual)
    status[bad & (status != "infeasible")] = "non-finite"
    status[(status == "converged") & ~(residual <= PROMISED_TOLERANCE)] = "max-iterations"
    return Equilibrium(log_activity=y, molality=conc, ln_gamma=ln_g, ionic_strength=u * u,
                       ln_water_activity=ln_aw, residual=residual, iterations=iterations,
                       status=status.astype(str), notes=list(getattr(bound, "notes", [])))


def _ionic_strength_ceiling(system: ChemicalSystem, totals: np.ndarray) -> np.ndarray:
    """1.5 × the ionic strength if every component were a free ion (bounds the u unknown)."""
    z2 = system.charge[: system.n_components] ** 2
    free_ions = 0.5 * np.abs(totals) @ np.maximum(z2, 1.0)
    return 1.5 * free_ions + 1e-6


def _infeasible(system: ChemicalSystem, totals: np.ndarray, free: np.ndarray) -> np.ndarray:
    """Samples whose free non-proton totals are not positive: no positive solution exists."""
    proton = np.array([name == "H+" for name in system.components])
    check = free & ~proton
    return np.any(totals[:, check] <= 0.0, axis=1) | ~np.all(np.isfinite(totals), axis=1)


def _initial_guess(problem: _Problem, bound: BoundModel) -> tuple[np.ndarray, np.ndarray]:
    """Cheap start: acid–base only proton balance, bracketed on a pH grid and bisected.

    Complexes of two or more components are ignored and each other component takes the
    free activity its own protonation series allows; the proton balance of that reduced
    problem is monotone in ln a(H+), so a grid and a few bisections find it. Returns
    (y, u) with u = √I of the guess.
    """
    n = problem.ln_k.shape[0]
    nu = problem.nu
    u0 = np.sqrt(np.minimum(0.5 * problem.u_max ** 2 / 1.5, 0.5 * problem.u_max ** 2))
    base = problem.ln_k - bound.ln_gamma(u0)                       # (n, s)
    others = nu[:, 1:] != 0
    lone = (others.sum(axis=1) == 1) & (np.abs(nu[:, 1:]).max(axis=1, initial=0) == 1)
    proton_only = ~others.any(axis=1)
    owner = (np.where(lone, np.argmax(others, axis=1) + 1, -1) if others.shape[1]
             else np.full(nu.shape[0], -1))
    ln_tot = np.log(np.maximum(problem.full_totals, 1e-300))       # (n, c)

    def balance(h: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Proton-balance residual and y at ln a(H+) = h, for h of shape (n, ...)."""
        lnw = base[:, None, :] + h[..., None] * nu[None, None, :, 0]     # (n, g, s)
        y = np.repeat(h[..., None], nu.shape[1], axis=-1).copy()
        for j in range(1, nu.shape[1]):
            members = owner == j
            if members.any():
                y[..., j] = ln_tot[:, None, j] - _logsumexp(lnw[..., members])
            else:
                y[..., j] = ln_tot[:, None, j]
        keep = lone | proton_only
        lnc = lnw[..., keep] + np.einsum("ngc,sc->ngs", y[..., 1:], nu[keep][:, 1:])
        r = np.exp(np.minimum(lnc, LN_C_CEILING)) @ nu[keep, 0] - problem.full_totals[:, None, 0]
        return r, y

    if not problem.free[0]:
        h = problem.fixed_y[:, 0]
    else:
        grid = np.linspace(np.log(1e-16), np.log(10.0), 36)
        r, _ = balance(np.broadcast_to(grid, (n, grid.size)))
        above = r > 0
        first = np.where(above.any(axis=1), np.argmax(above, axis=1), grid.size - 1)
        lo = grid[np.maximum(first - 1, 0)]
        hi = grid[first]
        for _ in range(12):
            mid = 0.5 * (lo + hi)
            rm, _ = balance(mid[:, None])
            up = rm[:, 0] > 0
            hi, lo = np.where(up, mid, hi), np.where(up, lo, mid)
        h = 0.5 * (lo + hi)
    _, y = balance(h[:, None])
    y = y[:, 0, :]
    y = np.where(problem.free[None, :], y, problem.fixed_y)
    conc = np.exp(np.minimum(base + y @ nu.T, LN_C_CEILING))
    u = np.sqrt(np.clip(0.5 * conc @ problem.z2, 0.0, problem.u_max ** 2))
    return y, u


def _logsumexp(a: np.ndarray) -> np.ndarray:
    peak = np.max(a, axis=-1, keepdims=True)
    return (peak + np.log(np.sum(np.exp(a - peak), axis=-1, keepdims=True)))[..., 0]


def _state(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
           rows: np.ndarray, molality: np.ndarray | None = None):
    """ln γ, ln a(H2O) and ln c for the samples *rows* at (y, u)."""
    ln_g = bound_slice(bound, rows).ln_gamma(u[rows], molality)
    ln_aw = np.zeros(rows.size)
    if molality is not None:
        aw = bound_slice(bound, rows).ln_water_activity(molality)
        if aw is not None:
            ln_aw = aw
    lnc = problem.ln_k[rows] + y[rows] @ problem.nu.T + ln_aw[:, None] * problem.nu_water - ln_g
    return ln_g, ln_aw, np.minimum(lnc, LN_C_CEILING)


def bound_slice(bound: BoundModel, rows: np.ndarray) -> BoundModel:
    """The bound model restricted to samples *rows* (models slice their per-sample arrays)."""
    if rows.size == bound.t_C.shape[0] and np.array_equal(rows, np.arange(rows.size)):
        return bound
    return bound.take(rows)


def _relative_residual(problem: _Problem, conc: np.ndarray, rows: np.ndarray) -> np.ndarray:
    """Worst |Σ ν c − T| / max(Σ |ν| c, |T|) over the free components of each sample."""
    r = conc @ problem.nu_free - problem.totals[rows]
    scale = np.maximum(conc @ np.abs(problem.nu_free), problem.scale_floor[rows])
    return np.max(np.abs(r) / scale, axis=1) if r.shape[1] else np.zeros(rows.size)


def _fast_path(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
               todo: np.ndarray, iterations: np.ndarray) -> np.ndarray:
    """Newton on (y_free, u) together; returns which of *todo* converged (y, u updated)."""
    free = problem.free
    nf = int(free.sum())
    converged = np.zeros(todo.size, dtype=bool)
    last_step = np.full(todo.size, np.inf)
    active = np.arange(todo.size)
    for _ in range(FAST_ITERATIONS):
        rows = todo[active]
        b = bound_slice(bound, rows)
        res, jac, scale = _augmented(problem, b, y[rows], u[rows], rows)
        merit0 = np.sum((res / scale) ** 2, axis=1)
        done = _converged(res, scale) & (last_step[active] <= STEP_TOLERANCE)
        if done.any():
            converged[active[done]] = True
            active, rows = active[~done], rows[~done]
            res, jac, scale, merit0 = res[~done], jac[~done], scale[~done], merit0[~done]
            b = bound_slice(bound, rows)
        if not active.size:
            break
        iterations[rows] += 1
        step = _linear_solve(jac, -res)
        dy, du = step[:, :nf], step[:, nf]
        biggest = np.max(np.abs(dy), axis=1, initial=0.0)
        shrink = np.minimum(1.0, STEP_CAP / np.maximum(biggest, 1e-300))
        dy *= shrink[:, None]
        du *= shrink
        last_step[active] = np.max(np.abs(dy), axis=1, initial=0.0)
        y0, u0 = y[rows][:, free], u[rows]
        alpha = np.ones(rows.size)
        pending = np.ones(rows.size, dtype=bool)
        for _ in range(MAX_HALVINGS):
            yt = y[rows].copy()
            yt[:, free] = y0 + alpha[:, None] * dy
            ut = np.clip(u0 + alpha * du, 0.0, problem.u_max[rows])
            rt, _, _ = _augmented(problem, b, yt, ut, rows, jacobian=False)
            merit = np.sum((rt / scale) ** 2, axis=1)
            ok = np.isfinite(merit) & (merit <= (1.0 - 2 * ARMIJO * alpha) * merit0)
            ok |= merit0 < 1e-28  # at round-off: take the full step
            accept = pending & ok
            sel = rows[accept]
            y[sel[:, None], np.flatnonzero(free)[None, :]] = yt[accept][:, free]
            u[sel] = ut[accept]
            pending &= ~ok
            if not pending.any():
                break
            alpha = np.where(pending, alpha * 0.5, alpha)
        # samples whose search failed keep their point; the careful path takes them
        active = active[~pending]
    return converged


def _augmented(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
               rows: np.ndarray, jacobian: bool = True):
    """Residual (mass balances, I − u²), its Jacobian and residual scales at (y, u)."""
    ln_g = bound.ln_gamma(u)
    lnc = problem.ln_k[rows] + y @ problem.nu.T - ln_g
    conc = np.exp(np.minimum(lnc, LN_C_CEILING))
    nu_f = problem.nu_free
    r_mass = conc @ nu_f - problem.totals[rows]
    ionic = 0.5 * conc @ problem.z2
    res = np.concatenate([r_mass, (ionic - u * u)[:, None]], axis=1)
    scale = np.concatenate([np.maximum(conc @ np.abs(nu_f), problem.scale_floor[rows]),
                            np.maximum(ionic, u * u)[:, None] + 1e-300], axis=1)
    if not jacobian:
        return res, None, scale
    dg = bound.d_ln_gamma_du(u)
    n, nf = r_mass.shape
    jac = np.empty((n, nf + 1, nf + 1))
    jac[:, :nf, :nf] = np.einsum("si,ns,sj->nij", nu_f, conc, nu_f, optimize=True)
    cdg = conc * dg
    jac[:, :nf, nf] = -cdg @ nu_f
    jac[:, nf, :nf] = 0.5 * (conc * problem.z2) @ nu_f
    jac[:, nf, nf] = -0.5 * cdg @ problem.z2 - 2.0 * u
    return res, jac, scale


def _converged(res: np.ndarray, scale: np.ndarray) -> np.ndarray:
    rel = np.abs(res) / scale
    return np.all(rel <= RESIDUAL_TOLERANCE, axis=1)


def _linear_solve(jac: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    """Batched solve; singular samples get a least-squares step instead of failing all."""
    try:
        return np.linalg.solve(jac, rhs[..., None])[..., 0]
    except np.linalg.LinAlgError:
        out = np.zeros_like(rhs)
        for k in range(jac.shape[0]):
            out[k] = np.linalg.lstsq(jac[k], rhs[k], rcond=None)[0]
        return out


def _careful_path(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
                  todo: np.ndarray, iterations: np.ndarray) -> np.ndarray:
    """Damped fixed point on γ around a convex Newton solve; returns converged flags."""
    ok = np.zeros(todo.size, dtype=bool)
    molality = None
    for outer in range(CAREFUL_OUTER_ITERATIONS):
        ln_g, ln_aw, lnc = _state(problem, bound, y, u, todo, molality)
        offset = problem.ln_k[todo] + ln_aw[:, None] * problem.nu_water - ln_g
        inner_ok = _convex_newton(problem, offset, y, todo, iterations)
        conc = np.exp(np.minimum(offset + y[todo] @ problem.nu.T, LN_C_CEILING))
        u_new = np.sqrt(np.minimum(0.5 * conc @ problem.z2, problem.u_max[todo] ** 2))
        change = np.abs(u_new ** 2 - u[todo] ** 2) / np.maximum(u_new ** 2, 1e-300)
        damping = 1.0 if outer < 5 else 0.5
        u[todo] = u[todo] + damping * (u_new - u[todo])
        molality = conc
        new_g, _, _ = _state(problem, bound, y, u, todo, molality)
        dg = np.max(np.abs(new_g - ln_g), axis=1, initial=0.0)
        ok = inner_ok & (change <= RESIDUAL_TOLERANCE) & (dg <= RESIDUAL_TOLERANCE)
        if ok.all():
            break
    return ok


def _convex_newton(problem: _Problem, offset: np.ndarray, y: np.ndarray, rows: np.ndarray,
                   iterations: np.ndarray) -> np.ndarray:
    """Minimise f(y) = Σ exp(offset + ν y) − T·y over free y for samples *rows*."""
    free = problem.free
    cols = np.flatnonzero(free)
    nu_f = problem.nu_free
    fixed_part = y[rows][:, ~free] @ problem.nu[:, ~free].T
    base = offset + fixed_part
    yf = y[rows][:, free]
    totals = problem.totals[rows]
    done = np.zeros(rows.size, dtype=bool)

    def objective(v):
        conc = np.exp(np.minimum(base + v @ nu_f.T, LN_C_CEILING))
        return conc, conc.sum(axis=1) - np.sum(totals * v, axis=1)

    conc, fval = objective(yf)
    for _ in range(CAREFUL_INNER_ITERATIONS):
        grad = conc @ nu_f - totals
        scale = np.maximum(conc @ np.abs(nu_f), problem.scale_floor[rows])
        done = np.all(np.abs(grad) / scale <= RESIDUAL_TOLERANCE * 0.1, axis=1)
        if done.all():
            break
        iterations[rows[~done]] += 1
        hess = np.einsum("si,ns,sj->nij", nu_f, conc, nu_f, optimize=True)
        step = _linear_solve(hess, -grad)
        biggest = np.max(np.abs(step), axis=1, initial=0.0)
        step *= np.minimum(1.0, STEP_CAP / np.maximum(biggest, 1e-300))[:, None]
        slope = np.sum(grad * step, axis=1)
        alpha = np.ones(rows.size)
        pending = ~done
        for _ in range(MAX_HALVINGS):
            trial = yf + alpha[:, None] * step
            ct, ft = objective(trial)
            ok = (ft <= fval + ARMIJO * alpha * slope) | (np.abs(slope) < 1e-300)
            accept = pending & ok
            yf[accept], conc[accept], fval[accept] = trial[accept], ct[accept], ft[accept]
            pending &= ~ok
            if not pending.any():
                break
            alpha = np.where(pending, alpha * 0.5, alpha)
        if pending.any():  # no decrease at machine precision: take the Newton step anyway
            trial = yf + step
            ct, ft = objective(trial)
            yf[pending], conc[pending], fval[pending] = trial[pending], ct[pending], ft[pending]
    y[rows[:, None], cols[None, :]] = yf
    return done
