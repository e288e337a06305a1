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
    molality = np.asarray(result.molality, dtype=float)
    total = float(molality.sum())
    phi = _phi(result, molality, total)
    return Osmotic(phi, 1000.0 * phi * total, float(np.exp(-WATER_KG_PER_MOL * phi * total)),
                   _method(result))


def _phi(result, molality: np.ndarray, total: float) -> float:
    if total <= 0:
        return 1.0
    if getattr(result.model, "provides_water_activity", False):
        return float(-result.equilibrium.ln_water_activity[0] / (WATER_KG_PER_MOL * total))
    if result.model.name == "ideal":
        return 1.0
    excess = dilution_path_excess(result.model, result.system.properties, molality,
                                  result.temperature_C)
    return 1.0 + excess / total


def dilution_path_excess(model, properties, molality: np.ndarray, t_C: float) -> float:
    """Σm·(φ − 1) of one sample by Gibbs–Duhem along the dilution path (see the module).

    The model is bound once for the quadrature nodes and the end point together: row k
    holds the molalities scaled by λ_k, the last row the solution itself.
    """
    charge = np.asarray(properties.charge, dtype=float)
    strength = 0.5 * float(molality @ charge ** 2)
    x, w = _gauss_legendre()
    scale = np.append(x ** 2, 1.0)                           # λ = x², dλ = 2x dx
    bound = model.bind(properties, np.full(scale.size, float(t_C)))
    ln_g = np.asarray(bound.ln_gamma(np.sqrt(scale * strength), scale[:, None] * molality),
                      dtype=float)
    along = ln_g @ molality                                  # Σ m_i ln γ_i(λm), per λ
    integral = float(np.sum(w * along[:-1] * 2.0 * x))
    return float(along[-1]) - integral


@lru_cache(maxsize=1)
def _gauss_legendre() -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights on [0, 1]."""
    nodes, weights = np.polynomial.legendre.leggauss(QUADRATURE_POINTS)
    return 0.5 * (nodes + 1.0), 0.5 * weights


def _method(result) -> str:
    name = result.model.name
    if getattr(result.model, "provides_water_activity", False):
        return f"{name} model (its osmotic coefficient)"
    if name == "ideal":
        return "ideal solution (φ = 1)"
    return (f"estimate: Gibbs–Duhem integration of the {name} activity coefficients "
            "along the dilution path")
