"""Ideal solution: every activity coefficient is 1 (the limit I → 0 of every model)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .base import IonicStrengthModel, SpeciesProperties


@dataclass
class _BoundIdeal(IonicStrengthModel):
    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        return np.zeros((u.shape[0], len(self.species.names)))

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        return np.zeros((u.shape[0], len(self.species.names)))


class IdealModel:
    name = "ideal"
    title = "ideal solution (γ = 1)"
    max_ionic_strength = 1e-3
    reference = "limit of infinite dilution"

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundIdeal:
        return _BoundIdeal(species, t_C)
