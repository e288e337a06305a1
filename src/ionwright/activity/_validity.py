"""Where an activity model holds, by kind of solution, and the warnings when it does not.

A model states one ionic strength it holds to in general (``max_ionic_strength``) and
may narrow it for particular kinds of solution: a :class:`ValidityLimit` names a cation
and an anion (the salt whose measured mean activity coefficients showed the limit) and
the ionic strength up to which the model stays within 3 % of them (or, where the evidence
is a pH standard, within its ±0.02 pH). The limit applies to a solution in which both
ions carry at least :data:`SIGNIFICANT_SHARE` of the ionic strength and, for a limit
that only some temperatures need (``applies_C``), at those temperatures; past it, the
result warns, naming the model, the kind of solution and the range. Ions are matched by
formula, so "Ca+2" and "Ca2+" are the same ion.

A model whose parameters are per ion may narrow its range for a solution in which an ion
without its own parameters is a main ion (:class:`UnparameterisedIonLimit`): that ion
falls back to a simpler equation, which holds only as far as that equation does.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..chemistry._formula import parse_formula
from ..errors import FormulaError

SIGNIFICANT_SHARE = 0.1    # an ion is a main ion of the solution at ≥ 10 % of I
RANGE_TOLERANCE = 1e-3     # relative: "up to about": 0.1000009 is within 0.1
TOLERANCE_PERCENT = 3      # the agreement with measured γ± that a range promises


@dataclass(frozen=True)
class RangeLimit:
    """What every narrowed range has: the ionic strength it holds to, the evidence, the
    temperatures it applies at and the agreement it promises."""

    max_ionic_strength: float
    evidence: str
    applies_C: tuple[float, float] = (-50.0, 400.0)
    promise: str = f"{TOLERANCE_PERCENT} % of measured mean activity coefficients"

    @property
    def label(self) -> str:
        """The kind of solution, as the plural subject of "... are main ions"."""
        raise NotImplementedError

    def main_ions(self, properties, share: np.ndarray, strength: np.ndarray) -> np.ndarray:
        """(n,) booleans: the kind of solution the limit is about, from the species
        *properties* and each species' *share* (n, s) of the ionic *strength* (n,)."""
        raise NotImplementedError

    @property
    def temperatures(self) -> str:
        """'' for a limit at every temperature, else ' at 45–100 °C'."""
        lo, hi = self.applies_C
        return "" if (lo, hi) == (-50.0, 400.0) else f" at {lo:g}–{hi:g} °C"

    def applies(self, t_C: float | np.ndarray) -> bool | np.ndarray:
        """Whether the limit is in force at *t_C* (one or many °C)."""
        return (self.applies_C[0] <= t_C) & (t_C <= self.applies_C[1])


@dataclass(frozen=True)
class ValidityLimit(RangeLimit):
    """The model holds to *max_ionic_strength* (mol/kg) where *cation* and *anion* are
    main ions of the solution, at the temperatures *applies_C* (°C, inclusive; all by
    default); *evidence* names the measurements that set it and *promise* what agreement
    the range stands for."""

    cation: str = ""
    anion: str = ""

    def __init__(self, cation: str, anion: str, max_ionic_strength: float, evidence: str,
                 applies_C: tuple[float, float] = (-50.0, 400.0),
                 promise: str = RangeLimit.promise) -> None:
        super().__init__(max_ionic_strength, evidence, applies_C, promise)
        object.__setattr__(self, "cation", cation)
        object.__setattr__(self, "anion", anion)

    @property
    def label(self) -> str:
        return f"{self.cation} with {self.anion}"

    def main_ions(self, properties, share: np.ndarray, strength: np.ndarray) -> np.ndarray:
        cation = _position(tuple(properties.names), self.cation)
        anion = _position(tuple(properties.names), self.anion)
        if cation is None or anion is None:
            return np.zeros(share.shape[0], dtype=bool)
        return np.minimum(share[:, cation], share[:, anion]) >= SIGNIFICANT_SHARE * strength


@dataclass(frozen=True)
class UnparameterisedIonLimit(RangeLimit):
    """The model holds to *max_ionic_strength* where an ion lacking any of the model's
    per-ion *parameters* (fields of
    :class:`~ionwright.activity._base.SpeciesProperties`, NaN where unknown) is a main
    ion; *kind* names such ions in words ("ions without Truesdell–Jones a and b")."""

    parameters: tuple[str, ...] = ()
    kind: str = ""

    @property
    def label(self) -> str:
        return self.kind

    def main_ions(self, properties, share: np.ndarray, strength: np.ndarray) -> np.ndarray:
        main = share >= SIGNIFICANT_SHARE * strength[:, None]
        return np.any(main & self._lacking(properties)[None, :], axis=1)

    def ions(self, properties, molality: np.ndarray) -> list[str]:
        """The main ions of one composition *molality* (s,) that lack the parameters."""
        share = 0.5 * np.asarray(molality, dtype=float) * np.asarray(properties.charge) ** 2
        main = self._lacking(properties) & (share >= SIGNIFICANT_SHARE * share.sum())
        return [n for n, hit in zip(properties.names, main) if hit]

    def _lacking(self, properties) -> np.ndarray:
        """(s,) booleans: charged species without one of the parameters."""
        lacking = np.zeros(len(properties.names), dtype=bool)
        for name in self.parameters:
            lacking |= np.isnan(np.asarray(getattr(properties, name), dtype=float))
        return lacking & (np.asarray(properties.charge) != 0)


def within(ionic_strength: float | np.ndarray, limit: float) -> bool | np.ndarray:
    """Whether *ionic_strength* (one or many) is within *limit* (with
    :data:`RANGE_TOLERANCE`)."""
    return ionic_strength <= limit * (1.0 + RANGE_TOLERANCE)


def exceeded_rows(limits, properties, molality: np.ndarray,
                  t_C: float | np.ndarray | None = None) -> np.ndarray:
    """(n, r) booleans: sample n is of the kind of solution limit r is about and at an
    ionic strength past it, at a temperature the limit applies at. *molality* is (n, s)
    over the species of *properties* (their names, charges and per-ion parameters); *t_C*
    is one temperature or (n,) of them (None: every limit applies)."""
    molality = np.atleast_2d(np.asarray(molality, dtype=float))
    share = 0.5 * molality * np.asarray(properties.charge, dtype=float) ** 2
    strength = share.sum(axis=1)
    out = np.zeros((molality.shape[0], len(limits)), dtype=bool)
    for r, limit in enumerate(limits):
        out[:, r] = (limit.main_ions(properties, share, strength)
                     & (strength > limit.max_ionic_strength * (1.0 + RANGE_TOLERANCE)))
        if t_C is not None:
            out[:, r] &= limit.applies(np.asarray(t_C, dtype=float))
    return out


@lru_cache(maxsize=256)
def _position(names: tuple[str, ...], ion: str) -> int | None:
    """Index of *ion* among *names*, compared as formulas (None when absent)."""
    wanted = _formula(ion)
    for i, name in enumerate(names):
        if name == ion or (wanted is not None and _formula(name) == wanted):
            return i
    return None


@lru_cache(maxsize=1024)
def _formula(name: str):
    try:
        return parse_formula(name)
    except FormulaError:
        return None


class StatedValidity:
    """Mixin for models with a ``validity`` tuple of :class:`RangeLimit` (for a salt or for
    ions without the model's parameters): the
    ``validity_notes`` and ``beyond_fitted_range`` checks results and comparisons call."""

    name: str
    validity: tuple[RangeLimit, ...] = ()

    def _exceeded(self, species, molality, t_C) -> tuple[list[RangeLimit], float]:
        molality = np.asarray(molality, dtype=float)
        flags = exceeded_rows(self.validity, species, molality, t_C)[0]
        strength = float(0.5 * np.sum(molality * species.charge ** 2))
        return [limit for limit, hit in zip(self.validity, flags) if hit], strength

    def beyond_fitted_range(self, species, molality, t_C: float | None = None) -> list[str]:
        """Kinds of solution this composition (at *t_C* °C; None: any temperature) is,
        past the range the model holds to."""
        hits, _ = self._exceeded(species, molality, t_C)
        return [f"{_named(h, species, molality)}{h.temperatures} (within {h.promise} only to I ≈ "
                f"{h.max_ionic_strength:g})" for h in hits]

    def validity_notes(self, species, molality, t_C: float | None = None) -> list[str]:
        """A warning for each kind of solution this composition (at *t_C* °C) is past
        the range of."""
        hits, strength = self._exceeded(species, molality, t_C)
        return [validity_message(self.name, h, strength, _named(h, species, molality))
                for h in hits]


def _named(limit: RangeLimit, species, molality) -> str:
    """The kind of solution of *limit* with the ions that make it so, where that varies."""
    if isinstance(limit, UnparameterisedIonLimit):
        return f"{limit.label} ({', '.join(limit.ions(species, molality))})"
    return limit.label


def validity_message(model: str, limit: RangeLimit, strength: float, label: str = "") -> str:
    """The warning for a solution at ionic strength *strength* past *limit* (*label*:
    its kind of solution in words, by default the limit's own)."""
    return (f"{model}: where {label or limit.label} are main ions{limit.temperatures}, the model is "
            f"within {limit.promise} only up to "
            f"I ≈ {limit.max_ionic_strength:g} mol/kg ({limit.evidence}); this solution "
            f"is at I = {strength:.3g} mol/kg: treat activity coefficients and pH as "
            f"estimates, or use a model that holds here")
