"""The pH response of an equilibrium to an addition, and the buffer capacity β = dC_b/dpH.

Both come from the exact derivative of the converged equilibrium (:mod:`._response`).
Solids held at equilibrium take part through a Schur complement: the amounts they
dissolve adjust so that their SI stays zero; gases stay at their pressures.

References
----------
Van Slyke, D.D. (1922) J. Biol. Chem. 52, 525–570 (buffer value β = dB/dpH).
"""

from __future__ import annotations

import numpy as np

from ._phases import PhaseEquilibrium
from ._response import response
from ..chemistry._constants import LN10



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
