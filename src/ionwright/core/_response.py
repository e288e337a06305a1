"""The derivative of a converged equilibrium with respect to its totals.

At a solution the mass balances r(y, u; T) = Σ_i ν_i c_i(y, u) − T = 0 and the ionic
strength condition ½ Σ z_i² c_i − u² = 0 hold, so by the implicit-function theorem
dz/dT = J⁻¹ with J the Jacobian of (r, I − u²) in z = (ln a of the free components, √I):
the solver's own Newton matrix, evaluated once at the answer. The method for solids uses
it for its saturation Jacobian, :mod:`._sensitivity` for the pH response and the buffer
capacity.

For activity models whose γ depend on composition and not only on ionic strength, γ is
held at its converged value in J (the derivative is then that of the γ-frozen problem,
and :func:`is_exact` says so).

References
----------
Krantz, S.G. & Parks, H.R. (2002) The Implicit Function Theorem, Birkhäuser, ch. 1.
"""

from __future__ import annotations

import numpy as np

from ._solver import Equilibrium


def is_exact(bound) -> bool:
    """Whether the derivatives include the activity coefficients' own change."""
    return bool(bound.depends_on_ionic_strength_only)


def response(system, equilibrium: Equilibrium, bound, free: np.ndarray) -> np.ndarray:
    """d ln a(free components) / d T(free components) at the solution, shape (n, f, f).

    *system* is anything with ``nu`` and ``charge`` (a ChemicalSystem or a gas basis);
    *free* marks the components that have a mass balance.
    """
    jac = jacobian(system, equilibrium, bound, free)
    n, nf = jac.shape[0], jac.shape[1] - 1
    rhs = np.zeros((n, nf + 1, nf))
    rhs[:, :nf, :] = np.eye(nf)
    return np.linalg.solve(jac, rhs)[:, :nf, :]


def jacobian(system, equilibrium: Equilibrium, bound, free: np.ndarray) -> np.ndarray:
    """The Jacobian (n, f+1, f+1) of the mass balances of the *free* components and the
    ionic-strength condition in (ln a of the free components, √I), at the solution.

    Sums over species are added species by species in a fixed order (elementwise over
    the samples), so a sample's Jacobian has the same bits alone or in any batch. Only the
    entries a species touches are updated, on a samples-last layout where each update is
    one contiguous vector operation."""
    conc = equilibrium.molality.T                      # (s, n): rows contiguous
    u = np.sqrt(np.maximum(equilibrium.ionic_strength, 0.0))
    nu_f = system.nu[:, free]
    z2 = system.charge ** 2
    n, nf = conc.shape[1], nu_f.shape[1]
    jac = np.zeros((nf + 1, nf + 1, n))
    exact = is_exact(bound)
    cdg = (conc * bound.d_ln_gamma_du(u).T) if exact else None
    for k in np.flatnonzero(np.any(nu_f != 0, axis=1) | (z2 != 0)):
        c = conc[k]
        touched = np.flatnonzero(nu_f[k])
        for a in touched:
            for b in touched:
                jac[a, b] += c * (nu_f[k, a] * nu_f[k, b])
        if cdg is not None:
            for a in touched:
                jac[a, nf] -= cdg[k] * nu_f[k, a]
                jac[nf, a] += 0.5 * z2[k] * c * nu_f[k, a]
            jac[nf, nf] -= 0.5 * z2[k] * cdg[k]
    if cdg is not None:
        jac[nf, nf] -= 2.0 * u
    else:
        jac[nf, nf] = -1.0
    return np.ascontiguousarray(jac.transpose(2, 0, 1))
