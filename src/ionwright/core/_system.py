"""Compile a chemical system: components, species, stoichiometry and log K at T.

Given a merged table set and the components a recipe contains, the system holds every
species that can form from them, as arrays ready for the vectorised solver. Water (H2O)
is a component whose activity is fixed by the activity model, so it has no mass balance.
The electron (e-, when a recipe states a redox level) is the last component and has no
species of its own: it counts in no charge balance and no ionic strength.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property, partial
from typing import Iterable, Sequence

import numpy as np

from ..chemistry import _temperature as temperature
from ..activity._base import SpeciesProperties
from ..activity._pairs import FORMS_EVERY_SPECIES, IGNORED_COMPONENTS, IonPairSet
from ._sparse import SparseRows
from ..chemistry._records import LogK
from ..chemistry._redox import ELECTRON
from ..chemistry._names import canonical_name
from ..chemistry._tableset import Resolved, TableSet
from ..errors import UnknownNameError
from ..notices import VALIDITY, Notice

WATER = "H2O"
PROTON = "H+"
KELVIN = 273.15
#: A constant without temperature dependence used further than this from 25 °C is noted.
FLAT_CONSTANT_SPAN_C = 5.0
#: Entries named in the text of the notice on constants without temperature dependence.
FLAT_NAMES_SHOWN = 6


def log10_k_at(logk: LogK, t_C: np.ndarray) -> np.ndarray:
    """log10 K of one reaction at temperatures *t_C* by the description it carries."""
    t_C = np.asarray(t_C, dtype=float)
    terms = temperature.basis(t_C.ravel() + KELVIN)
    out = np.zeros(terms.shape[1])
    for weight, term in zip(basis_coefficients(logk), terms):  # in order: same bits for any n
        out += weight * term
    return out.reshape(t_C.shape)


def basis_coefficients(logk: LogK) -> np.ndarray:
    """Weights (5,) of :func:`temperature.basis` that give this reaction's log10 K(T)."""
    return temperature.basis_coefficients(logk.log10_k, logk.enthalpy_kJ,
                                          logk.heat_capacity_J, logk.analytic, logk.function)


@dataclass(frozen=True)
class ChemicalSystem:
    """Components and species of one recipe's chemistry, as solver-ready arrays."""

    tables: TableSet
    components: tuple[str, ...]      # solver components, H+ first, e- last, no H2O
    species: tuple[str, ...]         # components (but e-) first, then formed species
    nu: np.ndarray                   # (s, c) stoichiometry in solver components
    nu_water: np.ndarray             # (s,) coefficient of H2O
    charge: np.ndarray               # (s,)
    properties: SpeciesProperties
    resolved: tuple[Resolved, ...]   # one per species
    ion_pairs: IonPairSet = FORMS_EVERY_SPECIES   # the activity model's choice of complexes
    left_out: tuple[tuple[str, str], ...] = ()    # (species, reason): could form, not formed

    @property
    def n_components(self) -> int:
        return len(self.components)

    @cached_property
    def component_charge(self) -> np.ndarray:
        """(c,) charge of each component as the solver counts it: the electron's is 0."""
        out = np.zeros(self.n_components)
        rows = self.n_components - (self.components[-1] == ELECTRON)
        out[:rows] = self.charge[:rows]
        return out

    def log10_k(self, t_C: np.ndarray, samples_last: bool = False) -> np.ndarray:
        """log10 K of formation of every species at *t_C* of shape (n,): (n, s), or
        (s, n) with *samples_last* (the solver's layout). Summed term by term over the
        temperature basis, so a sample's values do not depend on the batch."""
        t_C = np.asarray(t_C, dtype=float)
        if t_C.size == 1:  # single solves come back to the same temperature: kept, read-only
            return self._remember((float(t_C.ravel()[0]), samples_last),
                                  lambda: self._log10_k(t_C, samples_last, read_only=True))
        return self._log10_k(t_C, samples_last)

    def _log10_k(self, t_C: np.ndarray, samples_last: bool, read_only: bool = False):
        out = self._log10_k_rows @ temperature.basis(t_C + KELVIN)
        out = out if samples_last else out.T
        if read_only:
            out.setflags(write=False)
        return out

    def _remember(self, key: tuple, make):
        """The value kept under *key*, made on first use (at most 64 kept per system)."""
        memo = self._memo
        found = memo.get(key)
        if found is None:
            if len(memo) >= 64:
                memo.clear()
            found = memo[key] = make()
        return found

    @cached_property
    def _memo(self) -> dict:
        """Results kept per temperature: log10 K of one temperature, notes of a span."""
        return {}

    @cached_property
    def _log10_k_rows(self) -> SparseRows:
        return SparseRows(self._log10_k_weights)

    @cached_property
    def _log10_k_weights(self) -> np.ndarray:
        """(s, 6): each species' formation log10 K as weights of the temperature basis."""
        out = np.zeros((len(self.species), temperature.BASIS_SIZE))
        for i, res in enumerate(self.resolved):
            for _, mult, logk in res.terms:
                out[i] += mult * basis_coefficients(logk)
        return out

    def temperature_notes(self, t_C: np.ndarray) -> list[Notice]:
        """A notice for each constant used outside the temperature range it is known for
        (at any of the temperatures *t_C*)."""
        if t_C.size == 1:
            lo = hi = float(t_C.reshape(-1)[0])
        else:
            lo, hi = float(np.min(t_C)), float(np.max(t_C))
        return list(self._remember(("notes", lo, hi), lambda: tuple(self._notes(lo, hi))))

    def temperature_checks(self) -> list[tuple[str, LogK]]:
        """(entry name, its log K) of every constant whose use can be outside what it is
        known for: with a stated range, or without temperature dependence. Each once."""
        seen: dict[str, LogK] = {}
        for res in self.resolved:
            for name, _, logk in res.terms:
                if name not in seen and (logk.range_C is not None
                                         or logk.method.startswith("none")):
                    seen[name] = logk
        return list(seen.items())

    def _notes(self, lo: float, hi: float) -> list[Notice]:
        span = np.array([lo, hi])
        outside = [(name, logk) for name, logk in self.temperature_checks()
                   if constant_outside(logk, span).any()]
        ranged = [constant_notice(name, logk, _span(lo, hi)) for name, logk in outside
                  if logk.range_C is not None]
        flat = [name for name, logk in outside if logk.range_C is None]
        return ranged + ([flat_constants_notice(flat, _span(lo, hi))] if flat else [])

    def index(self, species: str) -> int:
        """Position of *species* in :attr:`species`, written any way ionwright reads
        (``Fe+3``, ``Fe3+``, ``Fe+++``); an unknown name is an error naming close ones."""
        if species in self._positions:
            return self._positions[species]
        found = self._positions.get(canonical_name(species))
        if found is None:
            raise UnknownNameError("species", species, self.species,
                                   "this result's species: see to_frame() or the JSON")
        return found

    @cached_property
    def strong_ion_charges(self) -> dict[str, float]:
        """Charges of the components no species protonates (Na+, Ca2+, Cl-, not H+ or
        PO4^3-): whatever the pH, they stay ions, so their ionic strength is a floor."""
        protonated = np.any((self.nu > 0) & (self.nu[:, [0]] > 0), axis=0)
        return {c: float(self.charge[self.index(c)]) for j, c in enumerate(self.components)
                if c != PROTON and not protonated[j]}

    @cached_property
    def _positions(self) -> dict[str, int]:
        return {name: i for i, name in enumerate(self.species)}


def constant_outside(logk: LogK, t_C: np.ndarray) -> np.ndarray:
    """Where (at which temperatures of *t_C*) *logk* is used outside what it is known for:
    beyond its stated range, or, without temperature dependence, more than
    :data:`FLAT_CONSTANT_SPAN_C` from 25 °C. The one rule for results, sweeps and batches."""
    if logk.range_C is not None:
        return (t_C < logk.range_C[0]) | (t_C > logk.range_C[1])
    if logk.method.startswith("none"):
        return np.abs(t_C - 25.0) > FLAT_CONSTANT_SPAN_C
    return np.zeros(np.shape(t_C), dtype=bool)


def constant_notice(name: str, logk: LogK, used: str = "") -> Notice:
    """The notice for entry *name* used outside what its log K is known for; *used* says at
    which temperatures (°C), when they are known."""
    if logk.range_C is None:
        return flat_constants_notice([name], used)
    at = f"; used at {used} °C" if used else ""
    why = f" ({logk.range_reason})" if logk.range_reason else ""
    lo, hi = logk.range_C
    return Notice(VALIDITY, "temperature-range",
                  f"log K of {name!r} is known for {lo:g}–{hi:g} °C{why}{at}",
                  {"entry": name, "range_C": [lo, hi]})


def flat_constants_notice(names: Sequence[str], used: str = "") -> Notice:
    """One notice for all the entries *names* whose log K has no temperature dependence,
    used away from 25 °C: a metals analysis uses dozens, one line each would bury the
    rest of the result. The data lists every entry; the text names the first few."""
    at = f" at {used} °C" if used else ""
    if len(names) == 1:
        text = (f"log K of {names[0]!r} has no temperature dependence in its table; the "
                f"25 °C value was used{at}")
    else:
        shown = ", ".join(names[:FLAT_NAMES_SHOWN])
        more = f" and {len(names) - FLAT_NAMES_SHOWN} more" if len(names) > FLAT_NAMES_SHOWN else ""
        text = (f"{len(names)} entries have no temperature dependence of log K in their "
                f"tables ({shown}{more}; the explained listing names them); their 25 °C "
                f"values were used{at}")
    return Notice(VALIDITY, "no-temperature-dependence", text,
                  {"entry": names[0], "entries": list(names)})


def _span(lo: float, hi: float) -> str:
    return f"{lo:g}" if lo == hi else f"{lo:g}–{hi:g}"


def compile_system(tables: TableSet, present: Iterable[str],
                   ion_pairs: IonPairSet = FORMS_EVERY_SPECIES) -> ChemicalSystem:
    """The system of every species that forms from the *present* components (plus H+, H2O)
    and that the activity model's *ion_pairs* set forms (:mod:`ionwright.activity._pairs`).

    Components may be named in any spelling of their charge (``Ca+2``); the system uses
    the tables' spelling (``Ca2+``). Systems are immutable, so each is compiled once per
    table set and pair set and reused.
    """
    present = frozenset(present) - {WATER, PROTON}
    known = tables.memo.setdefault("system", {})
    key = (present, ion_pairs)
    if key not in known:
        known[key] = _compile(tables, present, ion_pairs)
    return known[key]


def _compile(tables: TableSet, present: frozenset[str], ion_pairs: IonPairSet) -> ChemicalSystem:
    present = frozenset(tables.species_name(c) for c in present) - {WATER, PROTON}
    electron = (ELECTRON,) if ELECTRON in present else ()
    components = (PROTON, *sorted(present - {ELECTRON}, key=_component_order), *electron)
    allowed = set(components) | {WATER}
    resolved = [tables.resolve(c) for c in components if c != ELECTRON]
    left_out = []
    for name in tables.species:
        res = tables.resolve(name)
        if set(res.stoichiometry) <= allowed and name not in components:
            reason = ion_pairs.reason_left_out(name, _made_of(res), partial(_parts, tables))
            if reason is None:
                resolved.append(res)
            else:
                left_out.append((name, reason))
    col = {c: j for j, c in enumerate(components)}
    nu = np.zeros((len(resolved), len(components)))
    nu_water = np.zeros(len(resolved))
    for i, res in enumerate(resolved):
        for comp, coeff in res.stoichiometry.items():
            if comp == WATER:
                nu_water[i] = coeff
            else:
                nu[i, col[comp]] = coeff
    entries = [tables.entry(r.name) for r in resolved]

    def field(attr: str, default: float) -> np.ndarray:
        values = [getattr(e, attr, None) for e in entries]
        return np.array([default if v is None else v for v in values], dtype=float)

    charge = np.array([e.charge for e in entries], dtype=float)
    props = SpeciesProperties(
        names=tuple(r.name for r in resolved), charge=charge,
        ion_size=field("ion_size", np.nan), tj_a=field("tj_a", np.nan),
        tj_b=field("tj_b", np.nan), setschenow=field("setschenow", 0.0))
    return ChemicalSystem(tables, components, props.names, nu, nu_water, charge, props,
                          tuple(resolved), ion_pairs, tuple(left_out))


def _made_of(res: Resolved) -> frozenset[str]:
    """The components a species is made of, H+ and H2O aside (what ion-pair rules match)."""
    return frozenset(c for c in res.stoichiometry if c not in IGNORED_COMPONENTS)


def _parts(tables: TableSet, ion: str) -> frozenset[str] | None:
    """:func:`_made_of` of the component or species *ion* (in any spelling of its charge);
    None when no table knows it."""
    ion = tables.species_name(ion)
    if ion not in tables.components and ion not in tables.species:
        return None
    return _made_of(tables.resolve(ion))


def _component_order(name: str) -> str:
    return name.casefold()
