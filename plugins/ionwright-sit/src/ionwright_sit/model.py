"""The specific ion interaction theory (SIT) as an ionwright activity model.

log10 γ_j = −z_j² D + Σ_k ε(j,k) m_k, with D = A √I / (1 + 1.5 √I): a Debye–Hückel term
with the fixed denominator B·a_j = 1.5 kg^½ mol^−½, plus one ε per cation–anion pair,
summed over the molalities m_k of the ions of opposite charge. ε between ions of the
same sign is zero by the theory. A (log10 units) comes from water's density and
dielectric constant at T (:func:`ionwright.water.debye_huckel_A`); ε are 25 °C values
and are used unchanged at other temperatures (with a note). Neutral species get
ionwright's Setschenow term b·I where their table gives b, else γ = 1. Water activity
is taken as 1.

Because γ depends on the composition, not on ionic strength alone, the bound model sets
``depends_on_ionic_strength_only = False``: the solver then uses its damped fixed point
on γ with the molalities of the previous iterate.

References
----------
Grenthe, I., Plyasunov, A.V. & Spahiu, K. (1997) Estimations of medium effects on
thermodynamic data. In Grenthe & Puigdomènech (eds) Modelling in Aquatic Chemistry,
OECD Nuclear Energy Agency, Paris, ch. IX.
Guillaumont, R. et al. (2003) Update on the Chemical Thermodynamics of U, Np, Pu, Am
and Tc, OECD NEA / Elsevier, Appendix B (ε values and the NEA-TDB guidelines).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from ionwright.activity import IonPairSet, LeftOut, SpeciesProperties
from ionwright.chemistry import debye_huckel_A

from .coefficients import EpsilonTable, bundled_epsilon, merged_epsilon, read_epsilon

LN10 = np.log(10.0)
SIT_DENOMINATOR = 1.5          # B·a_j in kg^½ mol^−½, fixed by the SIT convention
MAX_IONIC_STRENGTH = 3.5       # mol/kg; SIT is used to about 3.5–4 m (NEA-TDB guidance)
EPSILON_TEMPERATURE_C = 25.0
TEMPERATURE_NOTE_C = 5.0       # warn when used this far from the ε temperature


@dataclass
class BoundSIT:
    """SIT bound to a set of species and per-sample temperatures."""

    species: SpeciesProperties
    t_C: np.ndarray
    A: np.ndarray                 # (n,) Debye–Hückel A at each sample's temperature
    epsilon: np.ndarray           # (s, s) symmetric ε in kg/mol, zero for unlisted pairs
    notes: list[str] = field(default_factory=list)
    depends_on_ionic_strength_only: bool = False

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        """ln γ (n, s) at u = √I; without *molality* only the Debye–Hückel term counts."""
        z2 = self.species.charge[None, :] ** 2
        debye = self.A[:, None] * u[:, None] / (1.0 + SIT_DENOMINATOR * u[:, None])
        log_gamma = -z2 * debye + self.species.setschenow[None, :] * (u * u)[:, None]
        if molality is not None:
            log_gamma = log_gamma + molality @ self.epsilon
        return LN10 * log_gamma

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        """∂ ln γ / ∂u at fixed molalities (the ε term does not depend on u)."""
        z2 = self.species.charge[None, :] ** 2
        d_debye = self.A[:, None] / (1.0 + SIT_DENOMINATOR * u[:, None]) ** 2
        return LN10 * (-z2 * d_debye + self.species.setschenow[None, :] * (2.0 * u)[:, None])

    def ln_water_activity(self, molality: np.ndarray) -> None:
        return None

    def take(self, rows: np.ndarray) -> "BoundSIT":
        """The same model for samples *rows* only."""
        return replace(self, t_C=self.t_C[rows], A=self.A[rows])


class SITModel:
    """Specific ion interaction theory with the ε of an :class:`EpsilonTable`."""

    name = "sit"
    title = "specific ion interaction theory (SIT, one ε per cation–anion pair)"
    max_ionic_strength = MAX_IONIC_STRENGTH
    reference = ("Grenthe, Plyasunov & Spahiu (1997) in Modelling in Aquatic Chemistry, "
                 "OECD NEA, ch. IX; ε from the NEA-TDB selection (Guillaumont et al. 2003)")

    def __init__(self, table: EpsilonTable | None = None) -> None:
        self._table = table
        self._offered: list = []

    def use_parameter_tables(self, tables) -> None:
        """The ε tables offered for "sit" through ionwright's ``register_parameter_tables``
        hook (this plugin's own, and any in-house one), merged in order when first used."""
        self._offered = list(tables)
        self._table = None

    @property
    def table(self) -> EpsilonTable:
        """The ε in use: those given, else the offered tables merged, else the bundled."""
        if self._table is None:
            self._table = (merged_epsilon([read_epsilon(t.text(), t.origin) if t.is_file
                                           else t.source for t in self._offered])
                           if self._offered else bundled_epsilon())
        return self._table

    @property
    def ion_pairs(self) -> IonPairSet:
        return described_pairs(self.table)

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> BoundSIT:
        t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
        names, charge = species.names, species.charge
        eps = np.zeros((len(names), len(names)))
        used, missing = [], {}
        for i, cation in enumerate(names):
            if charge[i] <= 0:
                continue
            for k, anion in enumerate(names):
                if charge[k] >= 0:
                    continue
                found = self.table.get(cation, anion)
                if found is None:
                    missing.setdefault(cation, []).append(anion)
                else:
                    eps[i, k] = eps[k, i] = found.value
                    used.append(found)
        notes = self._notes(used, missing, t_C)
        return BoundSIT(species, t_C, np.asarray(debye_huckel_A(t_C), dtype=float), eps, notes)

    def _notes(self, used, missing, t_C: np.ndarray) -> list[str]:
        notes = []
        if used:
            by_source: dict[str, list[str]] = {}
            for e in used:
                spread = f" ± {e.uncertainty:g}" if e.uncertainty is not None else ""
                by_source.setdefault(e.source, []).append(f"{e.cation}/{e.anion} {e.value:g}{spread}")
            memory = " (recalled from memory: verify)" if any(e.from_memory for e in used) else ""
            parts = "; ".join(f"{', '.join(pairs)} [{key}: {self.table.citation(key)}]"
                              for key, pairs in by_source.items())
            notes.append(f"sit: ε in kg/mol at 25 °C from table {self.table.name!r}{memory}: "
                         f"{parts}")
        if missing:
            pairs = "; ".join(f"{c} with {', '.join(a)}" for c, a in missing.items())
            count = sum(len(a) for a in missing.values())
            notes.append(f"sit: no ε for {count} cation–anion pair(s), taken as 0: {pairs}")
        far = np.abs(t_C - EPSILON_TEMPERATURE_C) > TEMPERATURE_NOTE_C
        if far.any():
            notes.append(f"sit: ε are 25 °C values and were used unchanged at "
                         f"{', '.join(f'{t:g}' for t in np.unique(t_C[far]))} °C")
        return notes


def described_pairs(table: EpsilonTable) -> IonPairSet:
    """The complexes SIT forms: none made of a cation and an anion that have an ε.

    An ε describes the whole short-range interaction of its two ions, weak association
    included, so a complex of just those two ions (NaCO3-, NaSO4-, NaHPO4-, ...) would
    count it twice (NEA-TDB practice, Grenthe, Plyasunov & Spahiu 1997).
    """
    rules = tuple(LeftOut(reason=f"described by ε({e.cation}, {e.anion}) of table {table.name!r}",
                          made_of=(e.cation, e.anion),
                          evidence="Grenthe, Plyasunov & Spahiu (1997), ch. IX")
                  for e in sorted(table.pairs.values(), key=lambda e: (e.cation, e.anion)))
    return IonPairSet(summary="every complex of the tables except those made of a "
                              "cation–anion pair that has an ε (the ε describe them)",
                      left_out=rules)
