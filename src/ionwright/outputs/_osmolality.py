"""Osmolality and water activity of a speciated solution, for every activity model.

Osmolality is φ·Σm (every dissolved species, ions, pairs, neutral and inert solutes alike)
and ln a(H2O) = −M_w·φ·Σm. The osmotic coefficient φ comes from

* the model's own water activity, where it has one (Pitzer);
* otherwise the Gibbs–Duhem relation applied to the model's activity coefficients along
  the dilution path (all species molalities scaled by λ from 0 to 1, the speciation held):

      Σm·(φ − 1) = Σ m_i ln γ_i(m) − ∫₀¹ Σ m_i ln γ_i(λm) dλ,

  which for Davies reduces to a closed form and for any model of ionic strength alone
  reproduces the Debye–Hückel limiting law φ − 1 = −A_φ|z₊z₋|√I. It is an estimate: as
  good as the model's γ, and taken with the species of this solution (ion pairs lower
  Σm). The ideal model gives φ = 1.

The result says which was used (``osmotic_method``).

References
----------
Robinson, R.A. & Stokes, R.H. (1959) Electrolyte Solutions, 2nd ed., ch. 2 (osmotic
coefficient, Gibbs–Duhem); Pitzer, K.S. (1991) Activity Coefficients in Electrolyte
Solutions, 2nd ed., ch. 3.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..chemistry._water import WATER_MOLAR_MASS_G

WATER_KG_PER_MOL = WATER_MOLAR_MASS_G / 1000.0
#: Gauss–Legendre points of the dilution-path integral (in x = √λ, where it is smooth).
QUADRATURE_POINTS = 24


@dataclass(frozen=True)
class Osmotic:
    """φ, osmolality (mOsm/kg), water activity, and the words for how φ was found."""

    osmotic_coefficient: float
    osmolality_mOsm_per_kg: float
    water_activity: float
    method: str


def osmotic(result) -> Osmotic:
    """The :class:`Osmotic` quantities of one speciated *result*."""
    molality = np.asarray(result.molality, dtype=float)[None, :]
    total = float(molality.sum())
    phi = float(osmotic_coefficients(result.model, result.system.properties, molality,
                                     np.array([result.temperature_C]),
                                     result.equilibrium.ln_water_activity)[0])
    return Osmotic(phi, 1000.0 * phi * total, float(np.exp(-WATER_KG_PER_MOL * phi * total)),
                   method(result.model))


def osmotic_coefficients(model, properties, molality: np.ndarray, t_C: np.ndarray,
                         ln_water_activity: np.ndarray | None = None) -> np.ndarray:
    """φ of *n* samples (n,): *molality* (n, s) of the species of *properties* at *t_C*.

    *ln_water_activity* (n,) is the solver's own, used when the model provides one.
    """
    m = np.atleast_2d(np.asarray(molality, dtype=float))
    total = m.sum(axis=1)
    safe = np.where(total > 0, total, 1.0)
    if getattr(model, "provides_water_activity", False):
        ln_aw = (np.asarray(ln_water_activity, dtype=float) if ln_water_activity is not None
                 else model.bind(properties, np.asarray(t_C, dtype=float)).ln_water_activity(m))
        return np.where(total > 0, -ln_aw / (WATER_KG_PER_MOL * safe), 1.0)
    if model.name == "ideal":
        return np.ones(m.shape[0])
    excess = dilution_path_excess(model, properties, m, np.asarray(t_C, dtype=float))
    return np.where(total > 0, 1.0 + excess / safe, 1.0)


def dilution_path_excess(model, properties, molality: np.ndarray, t_C: np.ndarray
                         ) -> np.ndarray:
    """Σm·(φ − 1) per sample (n,) by Gibbs–Duhem along the dilution path (see the module).

    The model is bound once for every sample at every quadrature node and at the end
    point: row (i, k) holds sample i's molalities scaled by λ_k, the last node λ = 1.
    """
    n, s = molality.shape
    charge = np.asarray(properties.charge, dtype=float)
    strength = 0.5 * (molality @ charge ** 2)                     # (n,)
    x, w = _gauss_legendre()
    scale = np.append(x ** 2, 1.0)                                # λ = x², dλ = 2x dx
    k = scale.size
    rows = (molality[:, None, :] * scale[None, :, None]).reshape(n * k, s)
    u = np.sqrt(np.outer(strength, scale)).reshape(n * k)
    bound = model.bind(properties, np.repeat(t_C, k))
    ln_g = np.asarray(bound.ln_gamma(u, rows), dtype=float)
    along = np.einsum("rs,rs->r", ln_g, np.repeat(molality, k, axis=0)).reshape(n, k)
    integral = along[:, :-1] @ (w * 2.0 * x)                      # ∫₀¹ Σ m ln γ(λm) dλ
    return along[:, -1] - integral


@lru_cache(maxsize=1)
def _gauss_legendre() -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights on [0, 1]."""
    nodes, weights = np.polynomial.legendre.leggauss(QUADRATURE_POINTS)
    return 0.5 * (nodes + 1.0), 0.5 * weights


def method(model) -> str:
    """How φ is found for *model*, in words for the result."""
    name = model.name
    if getattr(model, "provides_water_activity", False):
        return f"{name} model (its osmotic coefficient)"
    if name == "ideal":
        return "ideal solution (φ = 1)"
    return (f"estimate: Gibbs–Duhem integration of the {name} activity coefficients "
            "along the dilution path")
