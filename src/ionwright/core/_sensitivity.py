"""Exact derivatives of a solved equilibrium: its response to an addition (the pH change
and the buffer capacity β = dC_b/dpH) and to each constant's log10 K.

All come from the implicit-function theorem on the converged mass balances
(:mod:`._response`). Solids held at equilibrium take part through a Schur complement:
the amounts they dissolve adjust so that their SI stays zero; gases stay at their
pressures, and a fixed pH stays fixed.

References
----------
Van Slyke, D.D. (1922) J. Biol. Chem. 52, 525–570 (buffer value β = dB/dpH).
Krantz, S.G. & Parks, H.R. (2002) The Implicit Function Theorem, Birkhäuser, ch. 1.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ._constant_terms import ConstantTerms
from ._phases import GasBasis, PhaseEquilibrium, _take
from ._response import is_exact, jacobian, response
from ._solver import Equilibrium, bound_slice
from ..chemistry._constants import LN10
from ..chemistry._tableset import Resolved
from ..status import succeeded


def log_activity_change(state: PhaseEquilibrium, direction: np.ndarray) -> np.ndarray:
    """d ln a of the system's components per unit step of the totals along *direction*.

    *direction* (n, c) or (c,) is a change of the totals in the system's own components
    (e.g. one mole of NaOH: Na+ +1, H+ −1). Gases stay at their pressures and solids
    present stay saturated. Returns (n, c); fixed components do not move.
    """
    basis, free = state.basis, state.free
    n = state.inner.molality.shape[0]
    d_new = basis.new_direction(np.broadcast_to(direction, (n, basis.n_components)))[:, free]
    R = response(basis, state.inner, state.bound, free)
    dy = np.einsum("nfg,ng->nf", R, d_new)
    if state.solids and state.present.any():
        pf = state.solid_matrix()[:, free]                              # (m, f)
        dy = dy - _solid_correction(R, pf, state.present, d_new)
    full = np.zeros((n, basis.n_components))
    full[:, free] = dy
    return full @ basis.inverse.T


def _solid_correction(R: np.ndarray, pf: np.ndarray, present: np.ndarray,
                      d_new: np.ndarray) -> np.ndarray:
    """R Pᵀ (P R Pᵀ)⁻¹ P R d over the present solids: keeps their SI from moving."""
    m = pf.shape[0]
    RP = np.einsum("nfg,mg->nfm", R, pf)                                 # (n, f, m)
    H = np.einsum("mf,nfk->nmk", pf, RP)
    both = present[:, :, None] & present[:, None, :]
    H = np.where(both, H, 0.0) + np.where(~present, 1.0, 0.0)[:, :, None] * np.eye(m)
    g = np.where(present, np.einsum("mf,nf->nm", pf, np.einsum("nfg,ng->nf", R, d_new)), 0.0)
    lam = np.linalg.solve(H, g[..., None])[..., 0]
    return np.einsum("nfm,nm->nf", RP, np.where(present, lam, 0.0))


def pH_change(state: PhaseEquilibrium, direction: np.ndarray) -> np.ndarray:
    """dpH per mol/kg along *direction* (n,); NaN where the pH is fixed."""
    if not state.free[0]:
        return np.full(state.inner.molality.shape[0], np.nan)
    return -log_activity_change(state, direction)[:, 0] / LN10


def buffer_capacity(state: PhaseEquilibrium, direction: np.ndarray | None = None
                    ) -> np.ndarray:
    """β = dC/dpH in mol/kg per pH unit, for additions along *direction*.

    The default direction removes protons (a strong base whose counter-ion is a
    spectator), the usual definition; β is positive for an acid as well (|dC/dpH|).
    """
    if direction is None:
        direction = np.zeros(state.basis.n_components)
        direction[0] = -1.0
    return 1.0 / np.abs(pH_change(state, direction))


# -- derivatives with respect to the constants ------------------------------------------------
@dataclass(frozen=True)
class LogKResponse:
    """d log10 a of each component of the system per unit change of each entry's log10 K.

    ``components`` (n, c, E) follows :class:`ConstantTerms` ``terms``; NaN for samples
    that did not converge. Every result read from the activities follows from it.
    """

    components: np.ndarray
    terms: ConstantTerms
    component_names: tuple[str, ...]

    @property
    def pH(self) -> np.ndarray:
        """dpH/dlog10 K_e, (n, E): zero for every entry when the pH is fixed."""
        return -self.components[:, 0, :]

    def species(self, nu: np.ndarray) -> np.ndarray:
        """d log10 a of every species (n, s, E), with *nu* (s, c) their stoichiometry in
        the components (water's activity is held: its share is of higher order)."""
        return self.terms.species[None, :, :] + np.einsum("sc,nce->nse", nu, self.components)

    def saturation_index(self, resolved: Resolved) -> np.ndarray:
        """dSI/dlog10 K_e (n, E) of the solid *resolved* into components."""
        out = -self.terms.row(resolved, "solids")[None, :]
        for comp, nu in resolved.stoichiometry.items():
            if comp in self.component_names:
                out = out + nu * self.components[:, self.component_names.index(comp), :]
        return out


def log_k_response(basis: GasBasis, equilibrium: Equilibrium, bound, free: np.ndarray,
                   terms: ConstantTerms, solids: tuple = (), present: np.ndarray | None = None
                   ) -> LogKResponse:
    """The :class:`LogKResponse` of a solved batch, by the implicit-function theorem.

    A change δ of entry e's log10 K changes ln c of every species i by ln 10 · G_ie δ
    (G: its multipliers, in the gas basis also through the gases' log K), hence the mass
    balances and the ionic-strength condition; their Jacobian J at the solution gives the
    change of the free activities, −J⁻¹ ∂r/∂K. Solids *present* (n, m) among *solids*
    (PhaseReaction) keep SI = 0 by dissolving more or less (Schur complement on their
    amounts); gases and fixed activities do not move. γ moves with the ionic strength
    where the model depends on it alone (:func:`._response.is_exact`), otherwise it is
    held at its converged value.
    """
    n, c, E = equilibrium.molality.shape[0], basis.n_components, terms.size
    kappa = np.zeros((c, E))
    for gas, col in zip(basis.gases, basis.pivots):
        kappa[col] = terms.row(gas.resolved, "gases")
    shift = terms.species + basis.nu @ kappa          # (s, E): d log10 K' in the gas basis
    out = np.full((n, c, E), np.nan)
    ok = np.flatnonzero(succeeded(equilibrium.status))
    if ok.size:
        sub = _take(equilibrium, ok)
        present = np.zeros((n, len(solids)), dtype=bool) if present is None else present
        dy = _free_change(basis, sub, bound_slice(bound, ok), free, shift, solids,
                          present[ok], terms, kappa)
        d_new = np.zeros((ok.size, c, E))
        d_new[:, free] = dy / LN10
        out[ok] = np.einsum("jk,nke->nje", basis.inverse, d_new + kappa[None])
    return LogKResponse(out, terms, basis.base.components)


def _free_change(basis, eq: Equilibrium, bound, free, shift, solids, present, terms, kappa):
    """d ln a of the free components (n, f, E) per unit of each log10 K."""
    conc, z2 = eq.molality, basis.charge ** 2
    jac = jacobian(basis, eq, bound, free)
    n, nf, E = conc.shape[0], int(free.sum()), shift.shape[1]
    rhs = np.zeros((n, nf + 1, E + nf))
    rhs[:, :nf, :E] = -LN10 * np.einsum("sf,ns,se->nfe", basis.nu[:, free], conc, shift)
    if is_exact(bound):
        rhs[:, nf, :E] = -0.5 * LN10 * (conc * z2) @ shift
    rhs[:, :nf, E:] = np.eye(nf)
    both = np.linalg.solve(jac, rhs)
    dy, R = both[:, :nf, :E], both[:, :nf, E:]
    if not solids or not present.any():
        return dy
    p_new = basis.new_direction(np.array([s.stoichiometry for s in solids]))   # (m, c)
    pf = p_new[:, free]
    own = np.array([terms.row(s.resolved, "solids") for s in solids])          # (m, E)
    explicit = p_new @ kappa - own          # dSI/dlog10 K at fixed free activities
    m = len(solids)
    H = np.einsum("if,nfg,jg->nij", pf, R, pf)
    H = np.where(present[:, :, None] & present[:, None, :], H, 0.0) \
        + np.where(~present, 1.0, 0.0)[:, :, None] * np.eye(m)
    g = -LN10 * explicit[None] - np.einsum("mf,nfe->nme", pf, dy)
    dxi = np.linalg.solve(H, np.where(present[:, :, None], g, 0.0))
    return dy + np.einsum("nfg,mg,nme->nfe", R, pf, dxi)


def pH_log_k_derivative(system, equilibrium: Equilibrium, bound, free: np.ndarray,
                        terms: ConstantTerms) -> np.ndarray:
    """dpH/dlog10 K_e (n, E) of a batch solved without solids or gases, by the adjoint:
    w = J⁻ᵀ e(H+) is one solve per sample whatever the number of constants, and
    dpH/dK = Σ_i q_i c_i G_ie with q = ν w (plus w_u · ½ z² where γ moves with I), the same
    numbers :func:`log_k_response` gives (tested); zero where the pH is fixed. Samples
    that did not converge are NaN."""
    n = equilibrium.molality.shape[0]
    out = np.full((n, terms.size), np.nan)
    ok = np.flatnonzero(succeeded(equilibrium.status))
    if not free[0]:
        out[ok] = 0.0
        return out
    if not ok.size:
        return out
    sub, sub_bound = _take(equilibrium, ok), bound_slice(bound, ok)
    jac = jacobian(system, sub, sub_bound, free)
    nf = int(free.sum())
    unit = np.zeros((ok.size, nf + 1, 1))
    unit[:, 0, 0] = 1.0                           # H+ is the first free component
    w = np.linalg.solve(np.swapaxes(jac, 1, 2), unit)[..., 0]
    nu_f = system.nu[:, free]
    q = np.zeros(sub.molality.shape)
    for j in range(nf):                 # added in a fixed order: the same bits in any batch
        q += w[:, j, None] * nu_f[None, :, j]
    if is_exact(sub_bound):
        q += 0.5 * w[:, nf:] * system.charge[None, :] ** 2
    weight = q * sub.molality
    derivative = np.zeros((ok.size, terms.size))
    for k in np.flatnonzero(np.any(terms.species != 0, axis=1)):
        derivative += weight[:, k, None] * terms.species[k][None, :]
    out[ok] = derivative
    return out


def state_log_k_response(state: PhaseEquilibrium, terms: ConstantTerms) -> LogKResponse:
    """:func:`log_k_response` of a batch solved with its solids and gases."""
    return log_k_response(state.basis, state.equilibrium, state.bound, state.free, terms,
                          state.solids, state.present)
