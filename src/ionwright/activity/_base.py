"""The common interface of activity models, vectorised over a batch of samples.

A model is prepared once for a set of species and a batch of temperatures; the bound
model then returns natural-log activity coefficients for every sample and species.
Models whose coefficients depend only on ionic strength also return the derivative with
respect to u = √I, which lets the solver keep ionic strength inside the Newton step.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import ClassVar, Protocol

import numpy as np
from ..chemistry._constants import LN10



@dataclass(frozen=True)
class SpeciesProperties:
    """What activity models may know about each species, as arrays over species."""

    names: tuple[str, ...]
    charge: np.ndarray            # (s,)
    ion_size: np.ndarray          # (s,) Å, NaN where unknown (Kielland å)
    tj_a: np.ndarray              # (s,) Å, NaN where unknown
    tj_b: np.ndarray              # (s,) kg/mol, NaN where unknown
    setschenow: np.ndarray        # (s,) kg/mol, 0 where unknown (neutral species)


class BoundModel(Protocol):
    """An activity model bound to species and per-sample temperatures."""

    depends_on_ionic_strength_only: bool
    notes: list[str]
    t_C: np.ndarray

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        """ln γ, shape (n, s), at u = √I of shape (n,)."""

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        """∂ ln γ / ∂u, shape (n, s); only for models of ionic strength alone."""

    def ln_water_activity(self, molality: np.ndarray) -> np.ndarray | None:
        """ln a(H2O) of shape (n,), or None when the model takes a(H2O) = 1."""

    def take(self, rows: np.ndarray) -> "BoundModel":
        """The model restricted to samples *rows*."""


class TermsModel(BoundModel, Protocol):
    """A bound model of ionic strength alone that gives γ as weighted terms
    (:class:`IonicStrengthModel`): ln γ = ``weights`` @ φ(u)."""

    weights: np.ndarray

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(φ, ∂φ/∂u), each (p, n), at u of shape (n,)."""


class ActivityModel(Protocol):
    """A named activity model with a stated range of validity.

    It may also carry ``ion_pairs``, the :class:`~ionwright.activity._pairs.IonPairSet`
    of the tables' complexes it forms (every species when absent).
    """

    name: str
    title: str
    max_ionic_strength: float
    reference: str

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> BoundModel:
        """Prepare the model for *species* at temperatures *t_C* (°C, shape (n,))."""


def unset_array() -> np.ndarray:
    """The empty array a bound model's array fields hold until :meth:`bind` sets them
    (fields without defaults cannot follow the defaulted ones of the base class)."""
    return np.empty(0)


@dataclass
class IonicStrengthModel:
    """Base for models of the form ln γ_i = Σ_p w_ip φ_p(√I, T).

    A subclass gives the species weights ``weights`` (s, p), fixed for the species, and
    :meth:`terms`, the functions φ_p of u and temperature with their u-derivatives. The
    solver uses that split directly (γ of every species from p ≪ s functions, with the
    sample axis last); :meth:`ln_gamma` and :meth:`d_ln_gamma_du` follow from it.
    """

    species: SpeciesProperties
    t_C: np.ndarray
    notes: list[str] = field(default_factory=list)
    depends_on_ionic_strength_only: bool = True
    weights: np.ndarray = field(default_factory=unset_array)  # (s, p)
    #: fields sliced by take(); subclasses add theirs
    per_sample: ClassVar[tuple[str, ...]] = ("t_C",)

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(φ, ∂φ/∂u), each of shape (p, n), at u = √I of shape (n,)."""
        raise NotImplementedError

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        return _combine(self.weights, self.terms(u)[0], u.shape[0])

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        return _combine(self.weights, self.terms(u)[1], u.shape[0])

    def ln_water_activity(self, molality: np.ndarray) -> None:
        return None

    def take(self, rows: np.ndarray) -> "IonicStrengthModel":
        """The same model for the samples *rows* only (per-sample arrays are sliced)."""
        return replace(self, **{name: getattr(self, name)[rows] for name in self.per_sample})


def neutral_weights(species: SpeciesProperties) -> np.ndarray:
    """Weights (s,) of the term u² = I: the Setschenow term ln10·b·I of neutral species."""
    return LN10 * species.setschenow


def _combine(weights: np.ndarray, phi: np.ndarray, n: int) -> np.ndarray:
    """Σ_p w_ip φ_p as an (n, s) array, added term by term (same bits for any n)."""
    out = np.zeros((n, weights.shape[0]))
    for p in range(weights.shape[1]):
        out += phi[p][:, None] * weights[:, p][None, :]
    return out
