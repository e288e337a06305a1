"""Exact derivatives of a converged equilibrium with respect to the totals.

At a solution the mass balances r(y, u; T) = Σ_i ν_i c_i(y, u) − T = 0 and the ionic
strength condition ½ Σ z_i² c_i − u² = 0 hold, so by the implicit-function theorem
dz/dT = J⁻¹ with J the Jacobian of (r, I − u²) in z = (ln a of the free components, √I):
the solver's own Newton matrix, evaluated once at the answer. From it come the pH
response to any addition, the buffer capacity β = dC_b/dpH, and the saturation Jacobian
that the solid-phase Newton uses. Solids held at equilibrium take part through a Schur
complement: the amounts they dissolve adjust so that their SI stays zero.

For activity models whose γ depend on composition and not only on ionic strength, γ is
held at its converged value in J (the derivative is then that of the γ-frozen problem,
and :func:`is_exact` says so).

References
----------
Krantz, S.G. & Parks, H.R. (2002) The Implicit Function Theorem, Birkhäuser, ch. 1.
Van Slyke, D.D. (1922) J. Biol. Chem. 52, 525–570 (buffer value β = dB/dpH).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ._solver import Equilibrium

if TYPE_CHECKING:  # pragma: no cover
    from ._phases import PhaseEquilibrium

LN10 = np.log(10.0)


def is_exact(bound) -> bool:
    """Whether the derivatives include the activity coefficients' own change."""
    return bool(bound.depends_on_ionic_strength_only)


def response(system, equilibrium: Equilibrium, bound, free: np.ndarray) -> np.ndarray:
    """d ln a(free components) / d T(free components) at the solution, shape (n, f, f).

    *system* is anything with ``nu`` and ``charge`` (a ChemicalSystem or a gas basis);
    *free* marks the components that have a mass balance.
    """
    conc = equilibrium.molality
    u = np.sqrt(np.maximum(equilibrium.ionic_strength, 0.0))
    nu_f = system.nu[:, free]
    z2 = system.charge ** 2
    n, nf = conc.shape[0], nu_f.shape[1]
    jac = np.zeros((n, nf + 1, nf + 1))
    jac[:, :nf, :nf] = np.einsum("si,ns,sj->nij", nu_f, conc, nu_f, optimize=True)
    if is_exact(bound):
        dg = bound.d_ln_gamma_du(u)
        cdg = conc * dg
        jac[:, :nf, nf] = -cdg @ nu_f
        jac[:, nf, :nf] = 0.5 * (conc * z2) @ nu_f
        jac[:, nf, nf] = -0.5 * cdg @ z2 - 2.0 * u
    else:
        jac[:, nf, nf] = -1.0
    rhs = np.zeros((n, nf + 1, nf))
    rhs[:, :nf, :] = np.eye(nf)
    return np.linalg.solve(jac, rhs)[:, :nf, :]


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
