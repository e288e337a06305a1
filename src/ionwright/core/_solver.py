"""Vectorised Newton–Raphson solve of the tableau mass balances over a batch of samples.

Unknowns per sample are y_j = ln a_j of the free components and u = √I. With γ held
fixed, the mass balances are the gradient of the strictly convex function
f(y) = Σ_i c_i(y) − Σ_j T_j y_j, whose Hessian Σ_i ν_i ν_iᵀ c_i is positive definite.

Samples are solved in chunks of :data:`CHUNK_SIZE`, with the sample axis last so that
every operation runs over contiguous vectors of samples. The fast path (models whose γ
depend on ionic strength alone) puts u into the Newton step. Such a model gives
ln γ = W φ(u) with p ≪ s terms φ, so ln c = [ν | −W] [ln a; φ] + ln K is one sparse
product, and the residuals, their scales and the whole Jacobian (whose u column is
Σ_p (rows scaled by W_p) c · ∂φ_p/∂u) are a second one, for a whole chunk. The
mass-balance block is factorised by a batched sparse Cholesky (planned once per system,
in a minimum-degree order) and u is eliminated through its Schur complement
(:mod:`.batched_sparse`); the steps live in :mod:`.newton`. Every step is capped, then
an Armijo search on the scaled residual accepts it (switched off once the residual is at
round-off); a sample stops when its residual *and* its Newton step are both small, and
leaves the active set. Chunks are independent and run side by side on threads. Samples
the fast path does not finish, and models whose γ depend on composition, take the careful
path: a damped fixed point on ln γ around a convex Newton solve with an Armijo search on
f, which converges from any start.

Every per-sample number is computed with elementwise operations, sparse products and
reductions written out in a fixed order, never with dense BLAS calls whose rounding
depends on the batch size, so a sample's answer is bit for bit the same whether it is
solved alone or among a million others (some waters are so close to singular that
rounding alone moves them by 1e-12).

References
----------
Morel, F. & Morgan, J. (1972) Environ. Sci. Technol. 6, 58–67 (tableau formulation).
Nocedal, J. & Wright, S.J. (2006) Numerical Optimization, 2nd ed., Springer, ch. 3
(line searches, Armijo condition) and ch. 11 (Newton's method for equations).
Golub, G.H. & Van Loan, C.F. (2013) Matrix Computations, 4th ed., §4.2 (Cholesky)
and §3.2.10 (block elimination by a Schur complement).
"""

from __future__ import annotations

import os
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, field

import numpy as np

from ..activity._base import BoundModel
from ..notices import VALIDITY, Notice, wrap
from ..status import SOLVER_STATUSES, succeeded
from ..errors import UnknownNameError
from ._newton import fast as _fast
from ._newton import one_sample
from ._newton.careful import careful_path
from ._newton.fast import fast_path
from ._newton.guess import guess_plan, initial_guess
from ._newton.numerics import LN10, LN_C_CEILING, RESIDUAL_TOLERANCE, all_set, any_set, column_max
from ._newton.structure import (Problem, bound_slice, coupling_for, ln_gamma_at,
                                samples_infeasible, structure_of)
from ._system import ChemicalSystem

CHUNK_SIZE = 8192              # samples per chunk: amortises numpy's per-call cost
MAX_THREADS = 4                # most threads a batch uses by default
STATUSES = SOLVER_STATUSES
CONVERGED, MAX_ITERATIONS, NON_FINITE, INFEASIBLE = range(len(STATUSES))  # codes while solving
_STATUS_NAMES = np.array(STATUSES)
METHODS = ("auto", "careful")
__all__ = ["Equilibrium", "solve", "default_threads", "bound_slice", "STATUSES", "METHODS"]


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
    notes: list[Notice] = field(default_factory=list)

    @property
    def success(self) -> np.ndarray:
        return succeeded(self.status)


def solve(system: ChemicalSystem, totals: np.ndarray, bound: BoundModel,
          fixed_log10_activity: np.ndarray | None = None, *,
          method: str = "auto", threads: int | None = None,
          on_chunk: Callable[[int], None] | None = None,
          log10_k_shift: np.ndarray | None = None) -> Equilibrium:
    """Solve the batch: *totals* (n, c) in mol/kg, fixed log10 activities (n, c), NaN = free.

    *method* ``"auto"`` uses the fast path where the activity model allows it and the
    careful path for the rest; ``"careful"`` uses the careful path for every sample
    (slower; for samples the fast path failed). Chunks of :data:`CHUNK_SIZE` samples are
    solved on up to *threads* threads (default :func:`default_threads`); the answers do
    not depend on it. Returns an :class:`Equilibrium`; samples that fail carry their
    status, never a silent answer. Totals of the proton component may be negative
    (added base). *on_chunk*, if given, is called with the number of samples of each chunk
    as it finishes (from the thread that solved it), for progress reports.
    *log10_k_shift* (n, s), when given, is added to each sample's log10 K of formation
    (constants that differ from row to row: the Monte Carlo check).
    """
    if method not in METHODS:
        raise UnknownNameError("solver method", method, METHODS)
    totals = _as_table(totals)
    n, c = totals.shape
    if fixed_log10_activity is None:
        fixed = np.empty((n, c))
        fixed.fill(np.nan)
    else:
        fixed = _as_table(fixed_log10_activity)
    free = np.isnan(fixed[0]) if n else np.ones(c, dtype=bool)
    if n > 1 and np.count_nonzero(np.isnan(fixed) != free):
        raise ValueError("every sample of a batch must fix the same components")
    structure = structure_of(system, free)
    s = len(system.species)
    out = _Outputs.empty(n, c, s)
    infeasible = samples_infeasible(structure, totals)
    out.status[infeasible] = INFEASIBLE
    fast = (method == "auto" and bound.depends_on_ionic_strength_only
            and _fast.FAST_ITERATIONS > 0)
    todo = (~infeasible).nonzero()[0]
    coupling = coupling_for(structure, bound, fast)

    def ln_k(rows: np.ndarray | slice) -> np.ndarray:
        log10_k = system.log10_k(bound.t_C[rows], samples_last=True)
        if log10_k_shift is not None:
            log10_k = log10_k + log10_k_shift[rows].T
        return LN10 * log10_k

    def run(rows: np.ndarray) -> None:
        if rows.size == n:  # the whole batch in one chunk: nothing to slice
            problem = Problem.build(structure, totals, ln_k(slice(None)), fixed, coupling)
            _solve_chunk(problem, bound, fast, out, rows)
            return
        problem = Problem.build(structure, totals[rows], ln_k(rows), fixed[rows], coupling)
        _solve_chunk(problem, bound_slice(bound, rows), fast, out, rows)

    def run_and_report(rows: np.ndarray) -> None:
        run(rows)
        if on_chunk is not None:
            on_chunk(int(rows.size))

    chunks = [todo[start:start + CHUNK_SIZE] for start in range(0, todo.size, CHUNK_SIZE)]
    workers = min(threads or default_threads(), len(chunks)) if len(chunks) > 1 else 1
    if workers > 1:  # chunks are independent and write disjoint rows of `out`
        guess_plan(structure)  # built once, before the threads share it
        with ThreadPoolExecutor(workers) as pool:
            for done in [pool.submit(run_and_report, rows) for rows in chunks]:
                done.result()
    else:
        for rows in chunks:
            run_and_report(rows)
    if any_set(infeasible):  # report the state at the totals given, flagged
        rows = np.flatnonzero(infeasible)
        problem = Problem.build(structure, totals[rows], ln_k(rows), fixed[rows])
        y = problem.fixed_y.copy()
        lnc = problem.ln_k + structure.nu @ y
        _store(out, rows, problem, y, np.zeros(rows.size), np.zeros_like(lnc),
               np.zeros(rows.size), np.exp(np.minimum(lnc, LN_C_CEILING)))
    out.status[~out.finite & (out.status != INFEASIBLE)] = NON_FINITE
    # never trust a flag alone: a sample is converged only if its residual says so
    out.status[(out.status == CONVERGED) & ~(out.residual <= RESIDUAL_TOLERANCE)] = \
        MAX_ITERATIONS
    return Equilibrium(log_activity=out.y, molality=out.conc, ln_gamma=out.ln_g,
                       ionic_strength=out.u * out.u, ln_water_activity=out.ln_aw,
                       residual=out.residual, iterations=out.iterations,
                       status=_STATUS_NAMES[out.status],
                       notes=wrap(getattr(bound, "notes", ()), VALIDITY, "activity-model"))


def _as_table(values) -> np.ndarray:
    """*values* as a 2-D float array (a row for a 1-D input), without a copy if it is one."""
    if isinstance(values, np.ndarray) and values.ndim == 2 and values.dtype == np.float64:
        return values
    return np.atleast_2d(np.asarray(values, dtype=float))


def default_threads() -> int:
    """Threads a large batch is solved on: the cores this process may use, at most
    :data:`MAX_THREADS`. numpy's loops and the sparse kernels release the GIL, so
    independent chunks run side by side."""
    try:
        cores = len(os.sched_getaffinity(0))
    except AttributeError:  # pragma: no cover - platforms without affinity
        cores = os.cpu_count() or 1
    return max(1, min(cores, MAX_THREADS))


# -- one chunk ------------------------------------------------------------------------------

@dataclass
class _Outputs:
    """The arrays of an :class:`Equilibrium` being filled chunk by chunk."""

    y: np.ndarray
    u: np.ndarray
    ln_g: np.ndarray
    ln_aw: np.ndarray
    conc: np.ndarray
    residual: np.ndarray
    finite: np.ndarray
    iterations: np.ndarray
    status: np.ndarray              # codes into STATUSES

    @classmethod
    def empty(cls, n: int, c: int, s: int) -> "_Outputs":
        finite, status = np.empty(n, dtype=bool), np.empty(n, dtype=np.int8)
        finite.fill(True)
        status.fill(MAX_ITERATIONS)
        return cls(np.zeros((n, c)), np.zeros(n), np.zeros((n, s)), np.zeros(n),
                   np.zeros((n, s)), np.zeros(n), finite, np.zeros(n, dtype=int), status)


def _solve_chunk(problem: Problem, bound: BoundModel, fast: bool, out: _Outputs,
                 rows: np.ndarray) -> None:
    """Solve one chunk and store its answers at *rows* of *out*."""
    k = problem.size
    st = problem.structure
    iterations = np.zeros(k, dtype=int)
    done = np.zeros(k, dtype=bool)
    y, u = one_sample.initial_guess(problem, bound) if k == 1 else initial_guess(problem, bound)
    ln_g = np.zeros((problem.ln_k.shape[0], k))
    ln_aw = np.zeros(k)
    if fast:
        done = (one_sample.fast_path(problem, bound, y, u, iterations) if k == 1
                else fast_path(problem, bound, y, u, iterations))
        if k == 1 and done[0]:
            ln_g = np.array(one_sample.ln_gamma(problem.coupling, bound, float(u[0])))[:, None]
        elif all_set(done):
            ln_g = ln_gamma_at(problem.coupling, bound, u)
        elif any_set(done):
            done_rows = np.flatnonzero(done)
            ln_g[:, done] = ln_gamma_at(problem.coupling, bound_slice(bound, done_rows),
                                      u[done])
    rest = (~done).nonzero()[0]
    careful = rest.size > 0
    if careful:
        sub, sub_bound = problem.take(rest), bound_slice(bound, rest)
        y0, u0 = (one_sample.initial_guess(sub, sub_bound) if rest.size == 1
                  else initial_guess(sub, sub_bound))
        its = np.zeros(rest.size, dtype=int)
        ok, g0, aw0 = careful_path(sub, sub_bound, y0, u0, its)
        y[:, rest], u[rest], ln_g[:, rest], ln_aw[rest] = y0, u0, g0, aw0
        iterations[rest] += its
        done[rest] = ok
    if k == 1:
        conc = one_sample.concentrations(problem, y, ln_g, ln_aw if careful else None)
    else:
        lnc = st.nu @ y
        lnc += problem.ln_k
        if careful:  # only the careful path moves a(H2O)
            lnc += ln_aw * st.nu_water[:, None]
        lnc -= ln_g
        conc = np.exp(np.minimum(lnc, LN_C_CEILING))
    _store(out, rows, problem, y, u, ln_g, ln_aw, conc)
    out.iterations[rows] = iterations
    out.status[rows[done]] = CONVERGED


def _store(out: _Outputs, rows: np.ndarray, problem: Problem, y: np.ndarray,
           u: np.ndarray, ln_g: np.ndarray, ln_aw: np.ndarray, conc: np.ndarray) -> None:
    st = problem.structure
    out.y[rows], out.u[rows], out.ln_g[rows], out.ln_aw[rows] = y.T, u, ln_g.T, ln_aw
    out.conc[rows] = conc.T
    if conc.shape[1] == 1:  # one sample: the same operations on Python floats
        out.residual[rows], out.finite[rows] = one_sample.residual(problem, conc)
        return
    r = st.nu_free @ conc - problem.totals
    scale = st.abs_nu_free @ conc + problem.scale_floor
    out.residual[rows] = column_max(np.abs(r) / scale)
    out.finite[rows] = np.isfinite(conc).all(axis=0) & np.isfinite(out.residual[rows])
