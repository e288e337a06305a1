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
(:mod:`.batched_sparse`). Every step is capped, then an Armijo search on the scaled
residual accepts it (switched off once the residual is at round-off); a sample stops
when its residual *and* its Newton step are both small, and leaves the active set.
Chunks are independent and run side by side on threads. Samples the fast path does not
finish, and models whose γ depend on composition, take the careful path: a damped fixed
point on ln γ around a convex Newton solve with an Armijo search on f, which converges
from any start.

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
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, field, replace
from functools import cached_property

import numpy as np

from .activity.base import BoundModel
from .batched_sparse import SparseCholesky, SparseRows, weighted_sum
from .errors import UnknownNameError
from .system import PROTON, ChemicalSystem

LN10 = np.log(10.0)
RESIDUAL_TOLERANCE = 1e-10     # relative mass-balance residual that counts as converged
STEP_TOLERANCE = 1e-8          # largest Newton step (ln units) a converged sample may need
GAMMA_TOLERANCE = 1e-12        # change of ln γ between careful rounds that ends them
STEP_CAP = 4.0                 # largest change of any ln a in one Newton step
LN_C_CEILING = 300.0           # keeps exp() finite on wild iterates
IONIC_STRENGTH_CAP = 1.5       # u² stays below this × the fully dissociated ionic strength
ROUND_OFF = 1e-13              # relative residual below which the line search is switched off
CHUNK_SIZE = 8192              # samples per chunk: amortises numpy's per-call cost
MAX_THREADS = 4                # most threads a batch uses by default
FAST_ITERATIONS = 60
CAREFUL_OUTER_ITERATIONS = 200
CAREFUL_INNER_ITERATIONS = 100
GUESS_ITERATIONS = 4           # safeguarded 1-D Newton steps of the initial guess
GUESS_TOLERANCE = 0.2          # ln a(H+) accuracy of the guess; more does not pay
GUESS_SWEEPS = 2               # rescalings of the other free activities for their complexes
SWEEP_LIMIT = 1e20             # largest factor one rescaling may apply
ARMIJO = 1e-4
MAX_HALVINGS = 30
MIN_DAMPING = 1.0 / 64         # smallest weight of a new ln γ in a careful round
STATUSES = ("converged", "max-iterations", "non-finite", "infeasible")
CONVERGED, MAX_ITERATIONS, NON_FINITE, INFEASIBLE = range(len(STATUSES))  # codes while solving
_STATUS_NAMES = np.array(STATUSES)
METHODS = ("auto", "careful")


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


def solve(system: ChemicalSystem, totals: np.ndarray, bound: BoundModel,
          fixed_log10_activity: np.ndarray | None = None, *,
          method: str = "auto", threads: int | None = None) -> Equilibrium:
    """Solve the batch: *totals* (n, c) in mol/kg, fixed log10 activities (n, c), NaN = free.

    *method* ``"auto"`` uses the fast path where the activity model allows it and the
    careful path for the rest; ``"careful"`` uses the careful path for every sample
    (slower; for samples the fast path failed). Chunks of :data:`CHUNK_SIZE` samples are
    solved on up to *threads* threads (default :func:`default_threads`); the answers do
    not depend on it. Returns an :class:`Equilibrium`; samples that fail carry their
    status, never a silent answer. Totals of the proton component may be negative
    (added base).
    """
    if method not in METHODS:
        raise UnknownNameError("solver method", method, METHODS)
    totals = np.atleast_2d(np.asarray(totals, dtype=float))
    n, c = totals.shape
    fixed = (np.full((n, c), np.nan) if fixed_log10_activity is None
             else np.atleast_2d(np.asarray(fixed_log10_activity, dtype=float)))
    free = np.isnan(fixed[0]) if n else np.ones(c, dtype=bool)
    if np.count_nonzero(np.isnan(fixed) != free):
        raise ValueError("every sample of a batch must fix the same components")
    structure = _structure(system, free)
    s = len(system.species)
    out = _Outputs.empty(n, c, s)
    infeasible = _infeasible(structure, totals)
    out.status[infeasible] = INFEASIBLE
    fast = (method == "auto" and bound.depends_on_ionic_strength_only
            and FAST_ITERATIONS > 0)
    todo = np.flatnonzero(~infeasible)
    coupling = _coupling(structure, bound, fast)

    def ln_k(rows: np.ndarray) -> np.ndarray:
        return LN10 * system.log10_k(bound.t_C[rows], samples_last=True)

    def run(rows: np.ndarray) -> None:
        problem = _Problem.build(structure, totals[rows], ln_k(rows), fixed[rows], coupling)
        _solve_chunk(problem, bound_slice(bound, rows), fast, out, rows)

    chunks = [todo[start:start + CHUNK_SIZE] for start in range(0, todo.size, CHUNK_SIZE)]
    workers = min(threads or default_threads(), len(chunks))
    if workers > 1:  # chunks are independent and write disjoint rows of `out`
        structure.guess_plan  # noqa: B018 - built once, before the threads share it
        with ThreadPoolExecutor(workers) as pool:
            for done in [pool.submit(run, rows) for rows in chunks]:
                done.result()
    else:
        for rows in chunks:
            run(rows)
    if infeasible.any():  # report the state at the totals given, flagged
        rows = np.flatnonzero(infeasible)
        problem = _Problem.build(structure, totals[rows], ln_k(rows), fixed[rows])
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
                       notes=list(getattr(bound, "notes", [])))


def default_threads() -> int:
    """Threads a large batch is solved on: the cores this process may use, at most
    :data:`MAX_THREADS`. numpy's loops and the sparse kernels release the GIL, so
    independent chunks run side by side."""
    try:
        cores = len(os.sched_getaffinity(0))
    except AttributeError:  # pragma: no cover - platforms without affinity
        cores = os.cpu_count() or 1
    return max(1, min(cores, MAX_THREADS))


def bound_slice(bound: BoundModel, rows: np.ndarray) -> BoundModel:
    """The bound model restricted to samples *rows*, increasing indices (as from
    ``np.flatnonzero``); all of them is the model itself."""
    if rows.size == bound.t_C.shape[0]:
        return bound
    return bound.take(rows)


# -- the fixed structure of a system --------------------------------------------------------

_STRUCTURES: dict[tuple, "_Structure"] = {}
_SEEN: dict[tuple, tuple] = {}  # (id(system), free) → (system, structure): skips the key
STRUCTURE_CACHE_SIZE = 256


def _structure(system: ChemicalSystem, free: np.ndarray) -> "_Structure":
    """The :class:`_Structure` of *system* with *free* components, built once and reused
    (engine and batch compile the same systems again and again)."""
    seen = _SEEN.get((id(system), free.tobytes()))
    if seen is not None and seen[0] is system:  # the same (immutable) system again
        return seen[1]
    key = (system.components, system.species, system.nu.tobytes(), system.nu_water.tobytes(),
           system.charge.tobytes(), free.tobytes())
    found = _STRUCTURES.get(key)
    if found is None:
        if len(_STRUCTURES) >= STRUCTURE_CACHE_SIZE:
            _STRUCTURES.clear()
            _SEEN.clear()
        found = _STRUCTURES[key] = _Structure.build(system, free)
    if len(_SEEN) >= STRUCTURE_CACHE_SIZE:
        _SEEN.clear()
    _SEEN[(id(system), free.tobytes())] = (system, found)  # holds the system: ids stay unique
    return found


@dataclass(frozen=True)
class _Families:
    """Species grouped by the one non-proton component they carry (with coefficient 1).

    ``members`` (F, M) indexes the species of each family, padded with ``-1``, and
    ``proton_numbers`` (F, M) gives their ν(H+); ``owners`` (F,) is the component of each
    family. ``varying`` lists the families whose members differ in ν(H+) (the others
    carry a fixed number of protons). ``proton_only`` species (H+, OH-) carry no other
    component; ``fixed_members`` belong to components of fixed activity. Used by the
    initial guess only.
    """

    members: np.ndarray
    proton_numbers: np.ndarray
    owners: np.ndarray
    varying: np.ndarray
    constant_protons: np.ndarray    # (F,) ν(H+) of the families that do not vary
    proton_only: np.ndarray
    fixed_members: np.ndarray

    @classmethod
    def of(cls, nu: np.ndarray, h_col: int, free: np.ndarray) -> "_Families":
        others = np.ones(nu.shape[1], dtype=bool)
        if h_col >= 0:
            others[h_col] = False
        carried = nu[:, others] != 0
        lone = (carried.sum(axis=1) == 1) & (np.abs(nu[:, others]).max(axis=1, initial=0) == 1)
        owner = np.full(nu.shape[0], -1)
        if carried.shape[1]:
            owner[lone] = np.flatnonzero(others)[np.argmax(carried[lone], axis=1)]
        owned_free = lone & free[np.maximum(owner, 0)]
        owners = np.unique(owner[owned_free])
        groups = [np.flatnonzero(owned_free & (owner == o)) for o in owners]
        width = max((g.size for g in groups), default=0)
        members = np.full((owners.size, width), -1)
        for f, g in enumerate(groups):
            members[f, :g.size] = g
        h_nu = nu[:, h_col] if h_col >= 0 else np.zeros(nu.shape[0])
        protons = np.where(members >= 0, h_nu[members], 0.0)
        varying = np.array([np.unique(h_nu[g]).size > 1 for g in groups], dtype=bool)
        constant = np.array([h_nu[g[0]] for g in groups]) if groups else np.zeros(0)
        return cls(members=members, proton_numbers=protons, owners=owners,
                   varying=np.flatnonzero(varying), constant_protons=np.where(varying, 0.0,
                                                                              constant),
                   proton_only=np.flatnonzero(~carried.any(axis=1)),
                   fixed_members=np.flatnonzero(lone & ~owned_free))


@dataclass(frozen=True)
class _Structure:
    """What is fixed for a system and a set of free components, as sparse matrices.

    ``nu`` (s, c) forms ln c from ln a. ``weights`` (q, s) maps c to, row by row: the
    free mass balances Σ ν c (f), their scales Σ |ν| c (f), the ionic strength ½ Σ z² c,
    its gradient in y (f) and the structurally non-zero entries of the Hessian Σ ν νᵀ c,
    in the order ``factor`` reads them. ``weights_u`` (f + 1, s) maps c·∂lnγ/∂u to the u
    column of the Jacobian; :meth:`coupling` joins both to an activity model's terms.
    """

    nu_dense: np.ndarray
    nu: SparseRows                  # (s, c)
    nu_of_free: SparseRows          # (s, f): the free columns of ν
    nu_of_fixed: SparseRows         # (s, c − f): the fixed columns of ν
    nu_free: SparseRows             # (f, s): Σ ν c of the free components
    abs_nu_free: SparseRows
    nu_water: np.ndarray
    z2: np.ndarray
    half_z2: SparseRows             # (1, s): the ionic strength ½ Σ z² c
    free: np.ndarray
    fixed_columns: np.ndarray       # components of fixed activity
    must_be_positive: np.ndarray    # (c,) free components other than H+
    ion_weights: np.ndarray         # (c,) ½ max(z², 1): bound on I from the totals
    only_fixed: np.ndarray          # species made of fixed components alone
    weights: np.ndarray
    weights_u: np.ndarray
    factor: SparseCholesky
    nf: int
    proton: int
    families: _Families
    sweep_rows: np.ndarray          # rows of the free totals rescaled by the guess
    sweep_components: np.ndarray    # their components
    sweep_carried: SparseRows       # Σ ν c of the rescaled components only
    sweep_nu: SparseRows            # (s, r): ν of the species in the rescaled components
    couplings: dict = field(default_factory=dict, compare=False)

    @cached_property
    def guess_plan(self) -> "_GuessPlan":
        return _GuessPlan.of(self)

    def coupling(self, weights: np.ndarray, own_terms: bool) -> "_Coupling":
        """The :class:`_Coupling` to a model with term weights *weights* (s, p), cached."""
        key = (weights.shape, weights.tobytes(), own_terms)
        found = self.couplings.get(key)
        if found is None:
            if len(self.couplings) >= STRUCTURE_CACHE_SIZE:
                self.couplings.clear()
            found = self.couplings[key] = _Coupling.build(self, weights, own_terms)
        return found

    @classmethod
    def build(cls, system: ChemicalSystem, free: np.ndarray) -> "_Structure":
        nu = system.nu
        nu_f = nu[:, free]
        nf, s = nu_f.shape[1], nu.shape[0]
        z2 = system.charge ** 2
        factor = SparseCholesky.plan(nu_f != 0, first_row=3 * nf + 1)
        hessian = (np.stack([nu_f[:, i] * nu_f[:, j] for i, j in factor.entries])
                   if factor.entries else np.zeros((0, s)))
        weights = np.concatenate([nu_f.T, np.abs(nu_f).T, 0.5 * z2[None, :],
                                  0.5 * z2[None, :] * nu_f.T, hessian, np.zeros((1, s))])
        weights_u = np.concatenate([-nu_f.T, -0.5 * z2[None, :]])
        proton = system.components.index(PROTON) if PROTON in system.components else -1
        scaled = free.copy()
        if proton >= 0:
            scaled[proton] = False
        sweep_rows = np.flatnonzero(scaled[free])
        sweep_components = np.flatnonzero(scaled)
        rows = SparseRows
        return cls(sweep_rows=sweep_rows, sweep_components=sweep_components,
                   sweep_nu=rows(nu[:, sweep_components]),
                   sweep_carried=rows(nu_f.T[sweep_rows]),
                   nu_dense=nu, nu=rows(nu), nu_of_free=rows(nu_f),
                   nu_of_fixed=rows(nu[:, ~free]), nu_free=rows(nu_f.T),
                   abs_nu_free=rows(np.abs(nu_f).T),
                   nu_water=system.nu_water, z2=z2, half_z2=rows(0.5 * z2[None, :]),
                   free=free, fixed_columns=np.flatnonzero(~free), must_be_positive=scaled,
                   ion_weights=0.5 * np.maximum(z2[:free.size], 1.0),
                   only_fixed=np.flatnonzero(~np.any(nu_f != 0, axis=1)), weights=weights,
                   weights_u=weights_u, factor=factor, nf=nf, proton=proton,
                   families=_Families.of(nu, proton, free))


@dataclass(frozen=True)
class _GuessPlan:
    """What the initial guess needs that depends on the structure alone.

    For the proton balance: the lone proton-bearing species (``lone``), the distinct
    powers ν of a(H+) that occur and, per term (lone species, then every member of the
    families whose proton number varies, padding included), the index of its power.
    ``moments`` maps those terms to [Σν⁺c, Σν⁺²c, Σν⁻c, Σν⁻²c] of the lone species and,
    per varying family, [Σw, Σνw, Σν⁺w, Σν⁻w, Σν⁺νw, Σν⁻νw]; ``families`` sums the
    four family contributions over families. For the share-out among members: the
    distinct ν(H+) of all families and each member's index into them.
    """

    lone: np.ndarray
    powers: np.ndarray
    term_power: np.ndarray
    moments: SparseRows
    families: SparseRows
    family_powers: np.ndarray
    family_power: np.ndarray
    members: SparseRows             # (F, F·M): sums the members of each family

    @classmethod
    def of(cls, st: "_Structure") -> "_GuessPlan":
        fam = st.families
        lone = np.concatenate([fam.proton_only, fam.fixed_members])
        lone_nu = st.nu_dense[lone, st.proton]
        member_nu = fam.proton_numbers[fam.varying]                 # (Fv, M)
        nf, width = member_nu.shape
        powers = np.unique(np.concatenate([lone_nu, member_nu.ravel(), [0.0]]))
        pos, neg = np.maximum(lone_nu, 0.0), np.maximum(-lone_nu, 0.0)
        lone_rows = np.zeros((4, lone.size + nf * width))
        lone_rows[:, :lone.size] = [pos, pos * pos, neg, neg * neg]
        family_rows = np.zeros((6 * nf, lone.size + nf * width))
        for f in range(nf):
            cols = lone.size + f * width + np.arange(width)
            v = member_nu[f]
            vp, vn = np.maximum(v, 0.0), np.maximum(-v, 0.0)
            for q, weight in enumerate((np.ones(width), v, vp, vn, vp * v, vn * v)):
                family_rows[q * nf + f, cols] = weight
        blocks = np.kron(np.eye(4), np.ones((1, nf)))               # (4, 4 Fv)
        family_powers, where = np.unique(fam.proton_numbers, return_inverse=True)
        return cls(lone, powers,
                   np.searchsorted(powers, np.concatenate([lone_nu, member_nu.ravel()])),
                   SparseRows(np.concatenate([lone_rows, family_rows])), SparseRows(blocks),
                   family_powers, where.reshape(fam.members.shape),
                   SparseRows(np.kron(np.eye(fam.members.shape[0]),
                                      np.ones((1, fam.members.shape[1])))))


@dataclass(frozen=True)
class _Coupling:
    """A structure's products joined to an activity model whose ln γ = W φ(u).

    ``nu`` (s, c + p) = [ν | −W] gives ln c − ln K from [ln a; φ] in one product.
    ``weights`` is the structure's rows followed by p blocks of f + 1 rows,
    weights_u·diag(W_p), so that the u column of the Jacobian is Σ_p (block p @ c)·∂φ_p/∂u
    without an (s, k) array of ∂lnγ/∂u. ``gamma`` (s, p) is W itself. A model without
    terms of its own is coupled with W = identity and φ = ln γ (*own_terms* false).
    """

    nu: SparseRows
    weights: SparseRows
    gamma: SparseRows
    side_row: int
    terms: int
    own_terms: bool

    @classmethod
    def build(cls, st: _Structure, weights: np.ndarray, own_terms: bool) -> "_Coupling":
        blocks = [st.weights_u * weights[:, p][None, :] for p in range(weights.shape[1])]
        return cls(nu=SparseRows(np.concatenate([st.nu_dense, -weights], axis=1)),
                   weights=SparseRows(np.concatenate([st.weights, *blocks])),
                   gamma=SparseRows(weights), side_row=st.weights.shape[0],
                   terms=weights.shape[1], own_terms=own_terms)


def _coupling(structure: _Structure, bound: BoundModel, fast: bool) -> "_Coupling | None":
    """The coupling the solve needs: the model's own terms, else ln γ as terms on the
    fast path, else none (composition-dependent models use ln γ directly)."""
    weights = getattr(bound, "weights", None)
    if weights is not None:
        return structure.coupling(np.asarray(weights, dtype=float), True)
    if fast:
        return structure.coupling(np.eye(structure.nu_dense.shape[0]), False)
    return None


def _terms(bound: BoundModel, coupling: _Coupling, u: np.ndarray
           ) -> tuple[np.ndarray, np.ndarray]:
    """(φ, ∂φ/∂u) of the coupled model at u, sample axis last."""
    if coupling.own_terms:
        return bound.terms(u)
    return (np.ascontiguousarray(bound.ln_gamma(u).T),
            np.ascontiguousarray(bound.d_ln_gamma_du(u).T))


def _ln_gamma(coupling: "_Coupling | None", bound: BoundModel, u: np.ndarray) -> np.ndarray:
    """ln γ (s, k) at u from the model's terms where it has them (γ at I alone)."""
    if coupling is not None and coupling.own_terms:
        return coupling.gamma @ bound.terms(u)[0]
    return np.ascontiguousarray(bound.ln_gamma(u).T)


@dataclass
class _Problem:
    """The per-sample data of one chunk, sample axis last; :meth:`take` slices samples."""

    structure: _Structure
    coupling: _Coupling | None
    ln_k: np.ndarray         # (s, k)
    totals: np.ndarray       # (f, k)
    full_totals: np.ndarray  # (c, k)
    fixed_y: np.ndarray      # (c, k) ln a for fixed components (0 where free)
    scale_floor: np.ndarray  # (f, k)
    u_max: np.ndarray        # (k,)

    per_sample = ("ln_k", "totals", "full_totals", "fixed_y", "scale_floor", "u_max")

    @classmethod
    def build(cls, structure: _Structure, totals: np.ndarray, ln_k: np.ndarray,
              fixed: np.ndarray, coupling: _Coupling | None = None) -> "_Problem":
        """From totals and fixed log10 a (k, c) and ln K already samples-last (s, k)."""
        free = structure.free
        t = np.ascontiguousarray(totals.T)
        fixed_y = np.zeros(t.shape)
        if structure.fixed_columns.size:
            fixed_y[structure.fixed_columns] = LN10 * fixed[:, structure.fixed_columns].T
        problem = cls(structure, coupling, ln_k, t[free], t, fixed_y,
                      np.maximum(np.abs(t[free]), 1e-300), np.zeros(t.shape[1]))
        problem.u_max = np.sqrt(_ionic_strength_ceiling(problem))
        return problem

    def take(self, rows: np.ndarray) -> "_Problem":
        return replace(self, **{name: getattr(self, name)[..., rows]
                                for name in self.per_sample})

    @property
    def size(self) -> int:
        return self.u_max.shape[0]


def _ionic_strength_ceiling(problem: _Problem) -> np.ndarray:
    """1.5 × the ionic strength if every component were a free ion (bounds u).

    Species made of fixed-activity components alone (H+ and OH- at a fixed pH) are not
    bounded by any total; their ideal molalities are added.
    """
    st = problem.structure
    ions = weighted_sum(np.abs(problem.full_totals), st.ion_weights)
    only_fixed = st.only_fixed
    if only_fixed.size:
        lnc = (problem.ln_k + st.nu @ problem.fixed_y)[only_fixed]
        ions += weighted_sum(np.exp(np.minimum(lnc, LN_C_CEILING)), 0.5 * st.z2[only_fixed])
    return IONIC_STRENGTH_CAP * ions + 1e-6


def _infeasible(structure: _Structure, totals: np.ndarray) -> np.ndarray:
    """Samples whose free non-proton totals are not positive: no positive solution exists."""
    return ((totals[:, structure.must_be_positive] <= 0.0).any(axis=1)
            | ~np.isfinite(totals).all(axis=1))


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
        return cls(np.zeros((n, c)), np.zeros(n), np.zeros((n, s)), np.zeros(n),
                   np.zeros((n, s)), np.zeros(n), np.ones(n, dtype=bool),
                   np.zeros(n, dtype=int), np.full(n, MAX_ITERATIONS, dtype=np.int8))


def _solve_chunk(problem: _Problem, bound: BoundModel, fast: bool, out: _Outputs,
                 rows: np.ndarray) -> None:
    """Solve one chunk and store its answers at *rows* of *out*."""
    k = problem.size
    st = problem.structure
    iterations = np.zeros(k, dtype=int)
    done = np.zeros(k, dtype=bool)
    y, u = _initial_guess(problem, bound)
    ln_g = np.zeros((problem.ln_k.shape[0], k))
    ln_aw = np.zeros(k)
    if fast:
        done = _fast_path(problem, bound, y, u, iterations)
        if _all(done):
            ln_g = _ln_gamma(problem.coupling, bound, u)
        elif _any(done):
            done_rows = np.flatnonzero(done)
            ln_g[:, done] = _ln_gamma(problem.coupling, bound_slice(bound, done_rows),
                                      u[done])
    rest = np.flatnonzero(~done)
    careful = rest.size > 0
    if careful:
        sub, sub_bound = problem.take(rest), bound_slice(bound, rest)
        y0, u0 = _initial_guess(sub, sub_bound)
        its = np.zeros(rest.size, dtype=int)
        ok, g0, aw0 = _careful_path(sub, sub_bound, y0, u0, its)
        y[:, rest], u[rest], ln_g[:, rest], ln_aw[rest] = y0, u0, g0, aw0
        iterations[rest] += its
        done[rest] = ok
    lnc = st.nu @ y
    lnc += problem.ln_k
    if careful:  # only the careful path moves a(H2O)
        lnc += ln_aw * st.nu_water[:, None]
    lnc -= ln_g
    _store(out, rows, problem, y, u, ln_g, ln_aw, np.exp(np.minimum(lnc, LN_C_CEILING)))
    out.iterations[rows] = iterations
    out.status[rows[done]] = CONVERGED


def _store(out: _Outputs, rows: np.ndarray, problem: _Problem, y: np.ndarray,
           u: np.ndarray, ln_g: np.ndarray, ln_aw: np.ndarray, conc: np.ndarray) -> None:
    st = problem.structure
    out.y[rows], out.u[rows], out.ln_g[rows], out.ln_aw[rows] = y.T, u, ln_g.T, ln_aw
    out.conc[rows] = conc.T
    r = st.nu_free @ conc - problem.totals
    scale = st.abs_nu_free @ conc + problem.scale_floor
    out.residual[rows] = _column_max(np.abs(r) / scale)
    out.finite[rows] = np.isfinite(conc).all(axis=0) & np.isfinite(out.residual[rows])


# -- the initial guess --------------------------------------------------------------------

def _initial_guess(problem: _Problem, bound: BoundModel) -> tuple[np.ndarray, np.ndarray]:
    """Cheap start: acid–base only proton balance, then rescaled for the complexes.

    Complexes of two or more components are ignored at first, so each other component
    is shared among itself and its protonated or hydrolysed forms in proportions set by
    a(H+) alone, with γ at the fully dissociated ionic strength; the proton balance of
    that reduced problem fixes a(H+). :data:`GUESS_SWEEPS` rescalings of each other
    free activity by total / carried then account for the complexes. Returns
    (y (c, k), u (k,)).
    """
    st = problem.structure
    fam = st.families
    h_col = st.proton
    u0 = np.sqrt(problem.u_max ** 2 / IONIC_STRENGTH_CAP)
    base = problem.ln_k - _ln_gamma(problem.coupling, bound, u0)             # (s, k)
    y = problem.fixed_y.copy()
    member_k = np.exp(np.minimum(_member_bases(base, fam), LN_C_CEILING))  # (F, M, k)
    if h_col < 0:
        h = np.zeros(problem.size)
    elif not st.free[h_col]:
        h = problem.fixed_y[h_col]
    else:
        h = _guess_proton(problem, base, y, member_k[fam.varying])
    if fam.owners.size:
        plan = st.guess_plan
        x = np.exp(plan.family_powers[:, None] * h)         # a(H+)^ν for each distinct ν
        partition = plan.members @ (member_k * x[plan.family_power]).reshape(-1, problem.size)
        y[fam.owners] = (np.log(np.maximum(problem.full_totals[fam.owners], 1e-300))
                         - np.log(partition))
    if h_col >= 0:
        y[h_col] = h
    conc = np.exp(np.minimum(base + st.nu @ y, LN_C_CEILING))
    wanted = problem.totals[st.sweep_rows]
    for _ in range(GUESS_SWEEPS):
        ratio = _clip(wanted / (st.sweep_carried @ conc), SWEEP_LIMIT ** -1, SWEEP_LIMIT)
        log_ratio = np.log(ratio)
        y[st.sweep_components] += log_ratio
        conc *= np.exp(st.sweep_nu @ log_ratio)              # c_i ∝ Π_j a_j^ν_ij
    u = np.sqrt(_clip(st.half_z2 @ conc, 0.0, problem.u_max ** 2)[0])
    return y, u


def _member_bases(base: np.ndarray, fam: _Families) -> np.ndarray:
    """ln K − ln γ of each family member (F, M, k); −inf for padding."""
    out = base[np.maximum(fam.members, 0)]
    out[fam.members < 0] = -np.inf
    return out


def _guess_proton(problem: _Problem, base: np.ndarray, y_fixed: np.ndarray,
                  member_k: np.ndarray) -> np.ndarray:
    """h = ln a(H+) solving the reduced proton balance P(h) = N(h), per sample.

    P collects the protons carried (ν > 0, and −T(H+) when negative), N those given up
    (ν < 0, and T(H+) when positive); Newton steps on g = ln P − ln N, which is monotone
    and nearly linear far from its root, are kept inside a shrinking bracket and fall
    back to bisection outside it. Every term is K·a(H+)^ν with K computed once (the lone
    species and *member_k*, the members of the families whose proton number varies), so
    an iteration needs one exponential per distinct ν, and two sparse products give
    P, dP/dh, N and dN/dh of every sample.
    """
    st = problem.structure
    fam = st.families
    plan = st.guess_plan
    k = problem.size
    lone_lnc = (base + st.nu @ y_fixed)[plan.lone] if (~st.free).any() else base[plan.lone]
    term_k = np.concatenate([np.exp(np.minimum(lone_lnc, LN_C_CEILING)),
                             member_k.reshape(-1, k)])
    nv = fam.varying.size
    fam_tot = problem.full_totals[fam.owners[fam.varying]]
    const = weighted_sum(problem.full_totals[fam.owners], fam.constant_protons)
    t_h = problem.full_totals[st.proton]
    fixed_part = np.zeros((4, k))                           # [P, dP/dh, N, dN/dh]
    fixed_part[0] = np.maximum(const, 0.0) + np.maximum(-t_h, 0.0)
    fixed_part[2] = np.maximum(-const, 0.0) + np.maximum(t_h, 0.0)
    lo = np.full(k, np.log(1e-17))
    hi = np.full(k, np.log(10.0))
    h = np.full(k, np.log(1e-7))
    settled = np.zeros(k, dtype=bool)
    share = np.empty((4, nv, k))
    with np.errstate(divide="ignore", invalid="ignore"):
        for _ in range(GUESS_ITERATIONS):  # all samples at once; settled ones stay put
            x = np.exp(plan.powers[:, None] * h)            # a(H+)^ν for each distinct ν
            moments = plan.moments @ (term_k * x[plan.term_power])
            balance = fixed_part + moments[:4]
            if nv:
                total, s_nu, s_pos, s_neg, s_pos_nu, s_neg_nu = moments[4:].reshape(6, nv, k)
                mean = s_nu / total
                np.divide(s_pos, total, out=share[0])
                np.divide(s_pos_nu, total, out=share[1])
                share[1] -= share[0] * mean
                np.divide(s_neg, total, out=share[2])
                np.multiply(share[2], mean, out=share[3])
                share[3] -= s_neg_nu / total
                share *= fam_tot
                balance += plan.families @ share.reshape(4 * nv, k)
            p, dp, n, dn = balance
            g = np.log(p / n)
            above = g > 0
            hi = np.where(above, h, hi)
            lo = np.where(above, lo, h)
            trial = h - g / (dp / p + dn / n)
            inside = (trial > lo) & (trial < hi)            # False for NaN and ±inf
            new = np.where(inside, trial, 0.5 * (lo + hi))
            new = np.where(settled, h, new)
            settled |= (np.abs(new - h) < GUESS_TOLERANCE) | (hi - lo < GUESS_TOLERANCE)
            h = new
            if _all(settled):
                break
    return h


# -- the fast path: u inside the Newton step ---------------------------------------------

@dataclass
class _Linearised:
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

    def select(self, keep: np.ndarray) -> "_Linearised":
        """The linearisation of the samples *keep* (a mask or indices) only."""
        return _Linearised(*(getattr(self, name)[..., keep] for name in _PARTS))


_PARTS = ("res", "scale", "prod", "a", "d")


def _augmented(problem: _Problem, bound: BoundModel, y: np.ndarray,
               u: np.ndarray) -> _Linearised:
    """Residuals (mass balances, I − u²), their scales and Jacobian at (y (c, k), u)."""
    st, cp = problem.structure, problem.coupling
    nf = st.nf
    phi, dphi = _terms(bound, cp, u)
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
    return _Linearised(res, scale, prod, side[:nf], side[nf])


def _newton_step(lin: _Linearised, factor: SparseCholesky
                 ) -> tuple[np.ndarray, np.ndarray]:
    """(dy (f, k), du (k,)) solving J·step = −res by Cholesky of A and u's Schur complement."""
    nf = lin.a.shape[0]
    return factor.solve_bordered(lin.prod, lin.res[:nf], lin.res[nf], lin.a,
                                 lin.prod[2 * nf + 1:3 * nf + 1], lin.d)


def _fast_path(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
               iterations: np.ndarray) -> np.ndarray:
    """Newton on (y_free, u) together; returns which samples converged (y, u updated)."""
    free = problem.structure.free
    cols = slice(None) if free.all() else np.flatnonzero(free)
    converged = np.zeros(problem.size, dtype=bool)
    active = np.arange(problem.size)
    sub, b = problem, bound
    lin = _augmented(sub, b, y, u)
    for it in range(1, FAST_ITERATIONS + 1):
        dy, du = _newton_step(lin, problem.structure.factor)
        biggest = _column_max(np.abs(dy))
        size = np.maximum(biggest, np.abs(du) / np.maximum(u[active], 1e-12))
        worst, merit = lin.measures()
        scale = lin.scale
        finished = (worst <= RESIDUAL_TOLERANCE) & (size <= STEP_TOLERANCE)
        if _any(finished):  # the last, tiny step is taken without a search
            rows = active[finished]
            iterations[rows] = it
            y[_at(cols, rows)] += dy[:, finished]
            u[rows] = _clip(u[rows] + du[finished], 0.0, problem.u_max[rows])
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
        lin, stuck = _line_search(sub, b, y, u, active, cols, merit, scale, dy, du, shrink,
                                  worst <= ROUND_OFF)
        if _any(stuck):  # no acceptable step: the careful path takes these samples
            iterations[active[stuck]] = it
            keep = ~stuck
            active = active[keep]
            if not active.size:
                return converged
            sub, b, lin = problem.take(active), bound_slice(bound, active), lin.select(keep)
    iterations[active] = FAST_ITERATIONS
    return converged


def _line_search(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
                 active: np.ndarray, cols: np.ndarray | slice, merit0: np.ndarray,
                 scale0: np.ndarray, dy: np.ndarray, du: np.ndarray, shrink: np.ndarray,
                 at_round_off: np.ndarray) -> tuple[_Linearised, np.ndarray]:
    """Backtrack along (dy, du) until the scaled residual drops (Armijo); update y, u.

    *problem* and *bound* are restricted to *active*; *merit0* and *scale0* are the
    merit and residual scales at the starting point, kept for every trial so that the
    Newton direction is a descent direction of the merit. The full step is tried for
    every sample, then halved for the rejected ones only. Returns the linearisation at
    the accepted points and which samples found none.
    """
    yt = y[:, active]
    yt[cols] += dy
    ut = _clip(u[active] + du, 0.0, problem.u_max)
    out = _augmented(problem, bound, yt, ut)
    decrease = 1.0 - 2.0 * ARMIJO * shrink
    ok = _acceptable(out, scale0, merit0, decrease, at_round_off)
    if _all(ok):  # the usual case: every full step is taken
        y[:, active], u[active] = yt, ut
        return out, np.zeros(active.size, dtype=bool)
    y[:, active[ok]], u[active[ok]] = yt[:, ok], ut[ok]
    pending = np.flatnonzero(~ok)
    alpha = np.full(pending.size, 0.5)
    for _ in range(MAX_HALVINGS - 1):
        rows = active[pending]
        yt = y[:, rows]
        yt[cols] += alpha * dy[:, pending]
        ut = _clip(u[rows] + alpha * du[pending], 0.0, problem.u_max[pending])
        trial = _augmented(problem.take(pending), bound.take(pending), yt, ut)
        ok = _acceptable(trial, scale0[:, pending], merit0[pending],
                         1.0 - 2.0 * ARMIJO * alpha * shrink[pending], at_round_off[pending])
        y[:, rows[ok]], u[rows[ok]] = yt[:, ok], ut[ok]
        for name in _PARTS:
            getattr(out, name)[..., pending[ok]] = getattr(trial, name)[..., ok]
        pending, alpha = pending[~ok], 0.5 * alpha[~ok]
        if not pending.size:
            break
    stuck = np.zeros(active.size, dtype=bool)
    stuck[pending] = True
    return out, stuck


def _clip(x: np.ndarray, lo, hi) -> np.ndarray:
    """np.clip without its Python-level overhead (NaN stays NaN, as with np.clip)."""
    return np.minimum(np.maximum(x, lo), hi)


def _any(mask: np.ndarray) -> bool:
    return np.count_nonzero(mask) > 0


def _all(mask: np.ndarray) -> bool:
    return np.count_nonzero(mask) == mask.size


def _column_max(a: np.ndarray) -> np.ndarray:
    """Largest entry of each column (sample) of a (m, k) array; 0 when m = 0."""
    return a.max(axis=0) if a.shape[0] else np.zeros(a.shape[1:])


def _at(cols: np.ndarray | slice, rows: np.ndarray) -> tuple:
    """Index of the free components *cols* at samples *rows* of a (c, k) array."""
    return (cols, rows) if isinstance(cols, slice) else (cols[:, None], rows)


def _acceptable(trial: _Linearised, scale0: np.ndarray, merit0: np.ndarray,
                decrease: np.ndarray, at_round_off: np.ndarray) -> np.ndarray:
    """Which trial points lower the merit enough (Armijo), or are at round-off anyway."""
    merit = trial.merit(scale0)
    ok = np.isfinite(merit) & (merit <= decrease * merit0)
    if _any(at_round_off):
        ok |= at_round_off & np.isfinite(trial.res).all(axis=0)
    return ok


# -- the careful path: damped fixed point on ln γ around a convex Newton solve -----------

def _careful_path(problem: _Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
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
    ln_g = _ln_gamma(problem.coupling, bound, u)
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
        inner_ok, conc = _convex_newton(sub, offset, ya, iterations, active)
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


def _convex_newton(problem: _Problem, offset: np.ndarray, y: np.ndarray,
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
        f0 = _objective(conc[:, active], problem.totals[:, active], yf[:, active])
        # below f's own rounding no decrease can be seen: take the full Newton step
        blind = ~(np.abs(slope) > ROUND_OFF * (np.abs(f0) + weighted_sum(conc[:, active])))
        alpha = np.ones(active.size)
        pending = np.arange(active.size)
        for _ in range(MAX_HALVINGS):
            idx = active[pending]
            trial = yf[:, idx] + alpha[pending] * step[:, pending]
            ct = np.exp(np.minimum(base[:, idx] + nu_f @ trial, LN_C_CEILING))
            ft = _objective(ct, problem.totals[:, idx], trial)
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


def _objective(conc: np.ndarray, totals: np.ndarray, yf: np.ndarray) -> np.ndarray:
    return weighted_sum(conc) - weighted_sum(totals * yf)
