"""What a batched solve fixes before it starts: a system's structure as sparse matrices,
its coupling to an activity model's terms, and one chunk's per-sample data."""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import cast

import numpy as np

from ...activity._base import BoundModel, TermsModel
from .._sparse import SparseCholesky, SparseRows, weighted_sum
from .._system import PROTON, ChemicalSystem
from .numerics import IONIC_STRENGTH_CAP, LN10, LN_C_CEILING


def bound_slice(bound: BoundModel, rows: np.ndarray) -> BoundModel:
    """The bound model restricted to samples *rows*, increasing indices (as from
    ``np.flatnonzero``); all of them is the model itself."""
    if rows.size == bound.t_C.shape[0]:
        return bound
    return bound.take(rows)


_STRUCTURES: dict[tuple, "Structure"] = {}
_SEEN: dict[tuple, tuple] = {}  # (id(system), free) → (system, structure): skips the key
STRUCTURE_CACHE_SIZE = 256


def structure_of(system: ChemicalSystem, free: np.ndarray) -> "Structure":
    """The :class:`Structure` of *system* with *free* components, built once and reused
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
        found = _STRUCTURES[key] = Structure.build(system, free)
    if len(_SEEN) >= STRUCTURE_CACHE_SIZE:
        _SEEN.clear()
    _SEEN[(id(system), free.tobytes())] = (system, found)  # holds the system: ids stay unique
    return found


@dataclass(frozen=True)
class Families:
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
    def of(cls, nu: np.ndarray, h_col: int, free: np.ndarray) -> "Families":
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
class Structure:
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
    families: Families
    sweep_rows: np.ndarray          # rows of the free totals rescaled by the guess
    sweep_components: np.ndarray    # their components
    sweep_carried: SparseRows       # Σ ν c of the rescaled components only
    sweep_nu: SparseRows            # (s, r): ν of the species in the rescaled components
    couplings: dict = field(default_factory=dict, compare=False)
    memo: dict = field(default_factory=dict, compare=False)  # plans built on the structure

    def coupling(self, weights: np.ndarray, own_terms: bool) -> "Coupling":
        """The :class:`Coupling` to a model with term weights *weights* (s, p), cached
        (found by identity first: a bound model comes back with the same array)."""
        seen = self.couplings.get((id(weights), own_terms))
        if seen is not None and seen[0] is weights:
            return seen[1]
        key = (weights.shape, weights.tobytes(), own_terms)
        found = self.couplings.get(key)
        if found is None:
            if len(self.couplings) >= STRUCTURE_CACHE_SIZE:
                self.couplings.clear()
            found = self.couplings[key] = Coupling.build(self, weights, own_terms)
        self.couplings[id(weights), own_terms] = (weights, found)  # holds it: ids stay unique
        return found

    @classmethod
    def build(cls, system: ChemicalSystem, free: np.ndarray) -> "Structure":
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
                   ion_weights=0.5 * np.maximum(system.component_charge ** 2, 1.0),
                   only_fixed=np.flatnonzero(~np.any(nu_f != 0, axis=1)), weights=weights,
                   weights_u=weights_u, factor=factor, nf=nf, proton=proton,
                   families=Families.of(nu, proton, free))


@dataclass(frozen=True)
class Coupling:
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
    def build(cls, st: Structure, weights: np.ndarray, own_terms: bool) -> "Coupling":
        blocks = [st.weights_u * weights[:, p][None, :] for p in range(weights.shape[1])]
        return cls(nu=SparseRows(np.concatenate([st.nu_dense, -weights], axis=1)),
                   weights=SparseRows(np.concatenate([st.weights, *blocks])),
                   gamma=SparseRows(weights), side_row=st.weights.shape[0],
                   terms=weights.shape[1], own_terms=own_terms)


def coupling_for(structure: Structure, bound: BoundModel, fast: bool) -> "Coupling | None":
    """The coupling the solve needs: the model's own terms, else ln γ as terms on the
    fast path, else none (composition-dependent models use ln γ directly)."""
    weights = getattr(bound, "weights", None)
    if weights is not None:
        return structure.coupling(np.asarray(weights, dtype=float), True)
    if fast:
        return structure.coupling(np.eye(structure.nu_dense.shape[0]), False)
    return None


def model_terms(bound: BoundModel, coupling: Coupling, u: np.ndarray
           ) -> tuple[np.ndarray, np.ndarray]:
    """(φ, ∂φ/∂u) of the coupled model at u, sample axis last."""
    if coupling.own_terms:
        return cast(TermsModel, bound).terms(u)
    return (np.ascontiguousarray(bound.ln_gamma(u).T),
            np.ascontiguousarray(bound.d_ln_gamma_du(u).T))


def ln_gamma_at(coupling: "Coupling | None", bound: BoundModel, u: np.ndarray) -> np.ndarray:
    """ln γ (s, k) at u from the model's terms where it has them (γ at I alone)."""
    if coupling is not None and coupling.own_terms:
        return coupling.gamma @ cast(TermsModel, bound).terms(u)[0]
    return np.ascontiguousarray(bound.ln_gamma(u).T)


@dataclass
class Problem:
    """The per-sample data of one chunk, sample axis last; :meth:`take` slices samples."""

    structure: Structure
    coupling: Coupling | None
    ln_k: np.ndarray         # (s, k)
    totals: np.ndarray       # (f, k)
    full_totals: np.ndarray  # (c, k)
    fixed_y: np.ndarray      # (c, k) ln a for fixed components (0 where free)
    scale_floor: np.ndarray  # (f, k)
    u_max: np.ndarray        # (k,)

    per_sample = ("ln_k", "totals", "full_totals", "fixed_y", "scale_floor", "u_max")

    @classmethod
    def build(cls, structure: Structure, totals: np.ndarray, ln_k: np.ndarray,
              fixed: np.ndarray, coupling: Coupling | None = None) -> "Problem":
        """From totals and fixed log10 a (k, c) and ln K already samples-last (s, k)."""
        free = structure.free
        t = np.ascontiguousarray(totals.T)
        fixed_y = np.zeros(t.shape)
        if structure.fixed_columns.size:
            fixed_y[structure.fixed_columns] = LN10 * fixed[:, structure.fixed_columns].T
        free_t = t if structure.nf == free.size else t[free]
        problem = cls(structure, coupling, ln_k, free_t, t, fixed_y,
                      np.maximum(np.abs(free_t), 1e-300), np.zeros(t.shape[1]))
        problem.u_max = np.sqrt(ionic_strength_ceiling(problem))
        return problem

    def take(self, rows: np.ndarray) -> "Problem":
        return replace(self, **{name: getattr(self, name)[..., rows]
                                for name in self.per_sample})

    @property
    def size(self) -> int:
        return self.u_max.shape[0]


def ionic_strength_ceiling(problem: Problem) -> np.ndarray:
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


def samples_infeasible(structure: Structure, totals: np.ndarray) -> np.ndarray:
    """Samples whose free non-proton totals are not positive: no positive solution exists."""
    not_positive = np.logical_or.reduce(totals[:, structure.must_be_positive] <= 0.0, axis=1)
    return not_positive | ~np.logical_and.reduce(np.isfinite(totals), axis=1)
