"""Equilibrium with solids and gases: a change of basis for gases, an active set for solids.

A gas held at a partial pressure fixes the activity of a new basis entity: the gas takes
the place of one component (its *pivot*), every species' stoichiometry and log K are
re-expressed in the new basis, and the solver runs with the gas activity (its pressure)
fixed. The amount taken up is the mass-balance residual of the gas row.

A solid adds the amount ξ that dissolves (negative: precipitates) as an unknown, with the
condition SI = 0 while it is present. Swapping a solid into the basis as well would leave
totals such as m(SO4) − m(Ca), which are zero for gypsum in pure water, and the solver
rightly refuses non-positive totals; so the amounts are found by Newton's method on SI(ξ)
instead, whose Jacobian Pᵀ (∂y/∂T) P comes from the implicit-function theorem on the
converged mass balances (:mod:`._response`). It is symmetric positive definite
when the solids present are linearly independent: the phase rule. The active set follows
DESIGN.md: ``"equilibrate"`` solids are present in excess; ``"may-form"`` solids
join when supersaturated and leave when their precipitated amount would turn negative; a
solid given as an amount leaves when it has all dissolved. The mass of water is held at
1 kg: water released or taken up by a phase (gypsum's two waters) is not added.

References
----------
Morel, F. & Morgan, J. (1972) Environ. Sci. Technol. 6, 58–67 (tableau; change of basis).
Smith, W.R. & Missen, R.W. (1982) Chemical Reaction Equilibrium Analysis, Wiley, ch. 2
(stoichiometric basis, phase rule).
Nocedal, J. & Wright, S.J. (2006) Numerical Optimization, 2nd ed., Springer, ch. 16
(active sets), ch. 19 (fraction-to-the-boundary rule).
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any, cast

import numpy as np

from . import _solver as solver
from ..errors import RESIDUAL_TOLERANCE, PhaseRuleError, RecipeError, UnknownNameError
from ..notices import SOLVER, VALIDITY, Notice
from ..status import CONVERGED, MAX_ITERATIONS, succeeded
from ..chemistry._formula import parse_formula
from ._constant_terms import LogKShift
from ._response import response
from ._solver import Equilibrium, bound_slice
from ._system import PROTON, WATER, ChemicalSystem, log10_k_at
from ..chemistry._tableset import Resolved, TableSet
from ..chemistry._constants import LN10

EQUILIBRATE = "equilibrate"
MAY_FORM = "may-form"
AMOUNT = "amount"
SOLID_WORDS = (EQUILIBRATE, MAY_FORM)

ATM_PER_UNIT = {"atm": 1.0, "matm": 1e-3, "uatm": 1e-6, "µatm": 1e-6, "μatm": 1e-6,
                "bar": 1 / 1.01325, "mbar": 1e-3 / 1.01325, "kPa": 1 / 101.325,
                "Pa": 1 / 101325.0}
MOL_PER_UNIT = {"mol": 1.0, "mmol": 1e-3, "umol": 1e-6, "µmol": 1e-6, "μmol": 1e-6}
GRAMS_PER_UNIT = {"g": 1.0, "mg": 1e-3, "kg": 1e3}
_PRESSURE = re.compile(r"^\s*(?:10\s*\^\s*(?P<exp>[-+]?\d+(?:\.\d*)?)|(?P<num>[-+]?(?:\d+\.?\d*|"
                       r"\.\d+)(?:[eE][-+]?\d+)?))\s*(?P<unit>[A-Za-zµμ]*)\s*$")
_AMOUNT = re.compile(r"^\s*(?P<num>[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*"
                     r"(?P<unit>[A-Za-zµμ]+)\s*$")

#: log10 of the partial pressures (atm) a gas may be held at: below, a gas has no effect on
#: any result; above, real-gas behaviour (not modelled) dominates
LOG10_PRESSURE_RANGE = (-20.0, 3.0)
SI_TOLERANCE = 1e-10        # |SI| of a present solid that counts as saturated
ACTIVATION_SI = 1e-9        # SI above which an absent solid joins the active set
MAX_PHASE_ITERATIONS = 60
LINE_SEARCH_HALVINGS = 30   # halvings of a phase step before it is taken as it is
ARMIJO = 1e-4               # share of the predicted decrease a step must achieve
FRACTION_TO_BOUNDARY = 0.9  # never step more than this share of the way to a zero total
START_AMOUNT = 1e-8         # mol/kg a dissolving solid starts from when none is in solution
FIXED_COLUMN_ALLOWANCE = 1.0  # mol/kg: ionic-strength room for fixed activities (see inner)
#: Share of a component a precipitate may leave dissolved that a solve still resolves.
RESOLVED_SHARE = 1e-9
LOG_STEP_CAP = 6.0          # largest change of ln(distance to the precipitation limit)


# -- what the recipe asks for ----------------------------------------------------------------
@dataclass(frozen=True)
class SolidChoice:
    """One entry of ``[solids]``: a mode, and for ``"amount"`` the mol per kg of water."""

    name: str
    mode: str
    amount_mol_per_kg: float | None = None
    given: str = ""


@dataclass(frozen=True)
class GasChoice:
    """One entry of ``[gases]``: the gas (table name) and its partial pressure."""

    name: str
    log10_pressure_atm: float
    given: str = ""

    @property
    def pressure_atm(self) -> float:
        return 10.0 ** self.log10_pressure_atm


@dataclass(frozen=True)
class PhaseChoice:
    """The ``[solids]`` and ``[gases]`` of a recipe, checked against the tables."""

    solids: tuple[SolidChoice, ...] = ()
    gases: tuple[GasChoice, ...] = ()

    def __bool__(self) -> bool:
        return bool(self.solids or self.gases)


def read_phases(raw: Mapping[str, Any], tables: TableSet, origin: str = "(mapping)"
                ) -> PhaseChoice:
    """The :class:`PhaseChoice` of a recipe's raw ``solids`` and ``gases`` tables."""
    solids = [_solid_choice(name, value, tables, origin)
              for name, value in _table(raw, "solids", origin).items()]
    gases = [_gas_choice(name, value, tables, origin)
             for name, value in _table(raw, "gases", origin).items()]
    return PhaseChoice(tuple(s for s in solids if s is not None), tuple(gases))


def _table(raw: Mapping[str, Any], key: str, origin: str) -> Mapping[str, Any]:
    value = raw.get(key, {})
    if not isinstance(value, Mapping):
        example = ('gypsum = "equilibrate"' if key == "solids" else 'CO2 = "420 uatm"')
        raise RecipeError(f"{origin} [{key}]", f"must be a table, got {value!r}",
                          f"e.g. [{key}] then {example}")
    return value


def _solid_choice(name: str, value: Any, tables: TableSet, origin: str) -> SolidChoice | None:
    if name not in tables.solids:
        raise UnknownNameError("solid", name, tables.solids,
                               "`ionwright tables show solids` lists them")
    where = f"{origin} [solids] {name!r}"
    if isinstance(value, str):
        word = value.strip().lower()
        if word in SOLID_WORDS:
            return SolidChoice(name, word, given=value)
    amount = _solid_amount(value, tables.solids[name].formula, where)
    if amount == 0.0:
        return None
    return SolidChoice(name, AMOUNT, amount, given=str(value))


def _solid_amount(value: Any, formula: str, where: str) -> float:
    """mol per kg of water from a number (mol/kg), ``"2 g"``, ``"5 mmol"`` and the like."""
    hint = ('"equilibrate" (in excess), "may-form", or an amount per kg of water '
            'such as "2 g", "5 mmol" or 0.01 (mol)')
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        number, unit = float(value), "mol"
    else:
        match = _AMOUNT.match(str(value))
        if not match or match["unit"] not in {**MOL_PER_UNIT, **GRAMS_PER_UNIT}:
            raise RecipeError(where, f"{value!r} is not a mode or an amount", hint)
        number, unit = float(match["num"]), match["unit"]
    if not math.isfinite(number) or number < 0:
        raise RecipeError(where, f"amount {value!r} must be ≥ 0", hint)
    if unit in MOL_PER_UNIT:
        return number * MOL_PER_UNIT[unit]
    return number * GRAMS_PER_UNIT[unit] / parse_formula(formula).molar_mass


def _gas_choice(name: str, value: Any, tables: TableSet, origin: str) -> GasChoice:
    table_name = name if name in tables.gases else f"{name}(g)"
    if table_name not in tables.gases:
        bare = [g.removesuffix("(g)") for g in tables.gases]
        raise UnknownNameError("gas", name, [*tables.gases, *bare],
                               "`ionwright tables show gases` lists them")
    return GasChoice(table_name, log10_pressure(value, f"{origin} [gases] {name!r}"),
                     str(value))


def log10_pressure(value: Any, where: str = "pressure") -> float:
    """log10 of a partial pressure in atm from ``"420 uatm"``, ``"10^-3.5 atm"``, ``"0.03 bar"``.

    A plain number is in atm. Units: atm, matm, uatm (µatm), bar, mbar, kPa, Pa.
    """
    hint = 'e.g. "420 uatm", "10^-3.5 atm", "0.03 bar" or a number in atm'
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        exponent, number, unit = None, float(value), "atm"
    else:
        match = _PRESSURE.match(str(value))
        if not match:
            raise RecipeError(where, f"cannot read the partial pressure {value!r}", hint)
        exponent = match["exp"]
        number = math.nan if exponent is not None else float(match["num"])
        unit = match["unit"] or "atm"
    if unit not in ATM_PER_UNIT:
        near = [u for u in ATM_PER_UNIT if u.lower() == unit.lower()]
        raise RecipeError(where, f"unknown pressure unit {unit!r}",
                          f"did you mean {near[0]!r}?" if near else
                          f"units: {', '.join(ATM_PER_UNIT)}")
    if exponent is not None:
        log10_p = float(exponent) + math.log10(ATM_PER_UNIT[unit])
    else:
        if not math.isfinite(number) or number <= 0:
            raise RecipeError(where, f"partial pressure {value!r} must be > 0",
                              "remove the gas to leave it out; " + hint)
        log10_p = math.log10(number) + math.log10(ATM_PER_UNIT[unit])
    low, high = LOG10_PRESSURE_RANGE
    if not low <= log10_p <= high:
        raise RecipeError(where, f"partial pressure {value!r} is outside 1e{low:g} to "
                          f"1e{high:g} atm, where the ideal-gas law behind Henry's law holds "
                          "and a gas can matter", "remove the gas to leave it out, or check "
                          "the unit; " + hint)
    return log10_p


def components_needed(choice: PhaseChoice, tables: TableSet) -> set[str]:
    """Components that gases and dissolving solids can bring into solution.

    A ``"may-form"`` solid brings nothing: it forms only from what is there.
    """
    out: set[str] = set()
    for gas in choice.gases:
        out |= set(tables.resolve(gas.name, "gases").stoichiometry)
    for solid in choice.solids:
        if solid.mode != MAY_FORM:
            out |= set(tables.resolve(solid.name, "solids").stoichiometry)
    return out - {WATER, PROTON}


# -- phase constants in components -----------------------------------------------------------
@dataclass(frozen=True)
class PhaseReaction:
    """A solid or gas as a dissolution into solver components, with log10 K(T)."""

    name: str
    kind: str                    # "solid" | "gas"
    stoichiometry: np.ndarray    # (c,) per mole dissolved, in the system's components
    water: float                 # H2O released per mole dissolved
    resolved: Resolved
    molar_mass: float

    def log10_k(self, t_C: np.ndarray) -> np.ndarray:
        """log10 K of dissolution into components at *t_C*, shape (n,).

        The table gives K of dissolution into the species of ``dissolves_to``; a product
        that is itself a species formed from components (OH-, CO2(aq)) divides K by its
        formation constant: :meth:`TableSet.resolve` gives those terms negative multipliers.
        """
        t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
        out = np.zeros(t_C.shape)
        for _, mult, logk in self.resolved.terms:
            out = out + mult * np.asarray(log10_k_at(logk, t_C), dtype=float)
        return out


def phase_reaction(system: ChemicalSystem, tables: TableSet, name: str, kind: str
                   ) -> PhaseReaction | None:
    """The reaction of solid or gas *name* in *system*'s components (None if one is absent)."""
    resolved = tables.resolve(name, {"solid": "solids", "gas": "gases"}[kind])
    column = {c: j for j, c in enumerate(system.components)}
    stoich = np.zeros(system.n_components)
    for comp, coeff in resolved.stoichiometry.items():
        if comp == WATER:
            continue
        if comp not in column:
            return None
        stoich[column[comp]] = coeff
    record = (tables.solids if kind == "solid" else tables.gases)[name]
    return PhaseReaction(name, kind, stoich, float(resolved.stoichiometry.get(WATER, 0.0)),
                         resolved, parse_formula(record.formula).molar_mass)


# -- gases: the change of basis ----------------------------------------------------------------
@dataclass(frozen=True)
class GasBasis:
    """A system with each gas in place of its pivot component; the solver sees it as a system.

    With A the matrix whose rows are the new basis entities in old components (unit rows,
    and the gases' stoichiometry in the pivot rows): ν' = ν A⁻¹, log K' = log K + ν' κ
    with κ the gases' log K of dissolution in their rows, ν'(H2O) = ν(H2O) − ν' b with b
    their water, and the totals T' = T A⁻¹ (row vectors).
    """

    base: ChemicalSystem
    gases: tuple[PhaseReaction, ...]
    pivots: tuple[int, ...]
    inverse: np.ndarray          # A⁻¹, (c, c)
    nu: np.ndarray               # (s, c)
    nu_water: np.ndarray         # (s,)
    components: tuple[str, ...]

    # what the solver reads from a system
    @property
    def species(self) -> tuple[str, ...]:
        return self.base.species

    @property
    def charge(self) -> np.ndarray:
        return self.base.charge

    @property
    def properties(self):
        return self.base.properties

    @property
    def n_components(self) -> int:
        return self.base.n_components

    @property
    def component_charge(self) -> np.ndarray:
        return self.base.component_charge

    def kappa(self, t_C: np.ndarray) -> np.ndarray:
        """log10 K of each gas in its pivot column, zero elsewhere: shape (n, c)."""
        t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
        out = np.zeros((t_C.size, self.n_components))
        for gas, col in zip(self.gases, self.pivots):
            out[:, col] = gas.log10_k(t_C)
        return out

    def log10_k(self, t_C: np.ndarray, samples_last: bool = False) -> np.ndarray:
        out = self.base.log10_k(t_C) + self.kappa(t_C) @ self.nu.T
        return np.ascontiguousarray(out.T) if samples_last else out

    def new_totals(self, totals: np.ndarray) -> np.ndarray:
        return totals @ self.inverse

    def new_direction(self, direction: np.ndarray) -> np.ndarray:
        """A change of old totals (n, c) as a change of the new totals."""
        return direction @ self.inverse

    def old_log_activity(self, y: np.ndarray, ln_aw: np.ndarray, t_C: np.ndarray
                         ) -> np.ndarray:
        """ln a of the old components from the new-basis ln a (n, c)."""
        water = np.zeros(self.n_components)
        for gas, col in zip(self.gases, self.pivots):
            water[col] = gas.water
        shifted = y + LN10 * self.kappa(t_C) - ln_aw[:, None] * water[None, :]
        return shifted @ self.inverse.T


def gas_basis(system: ChemicalSystem, gases: Sequence[PhaseReaction], fixed: np.ndarray
              ) -> GasBasis:
    """Swap each gas into the basis in place of a free, non-proton component it contains.

    Pivots are chosen by Gaussian elimination with the largest remaining coefficient, so
    the gases must be linearly independent of each other and of the fixed components.
    """
    c = system.n_components
    matrix = np.eye(c)
    reduced: list[np.ndarray] = []
    pivots: list[int] = []
    for gas in gases:
        row = gas.stoichiometry.copy()
        for prev, col in zip(reduced, pivots):
            row = row - row[col] / prev[col] * prev
        candidates = np.abs(row) * (~fixed) * (np.arange(c) != 0)
        candidates[pivots] = 0.0
        if candidates.max(initial=0.0) <= 1e-9:
            others = [g.name for g in gases if g is not gas] + (["the fixed pH"]
                                                                   if fixed[0] else [])
            raise PhaseRuleError([gas.name], f"its composition is a combination of "
                                 f"{', '.join(others) or 'the protons alone'}, so its "
                                 "pressure cannot be held as well")
        col = int(np.argmax(candidates))
        reduced.append(row)
        pivots.append(col)
        matrix[col] = gas.stoichiometry
    inverse = np.linalg.inv(matrix)
    nu = system.nu @ inverse
    water = np.zeros(c)
    for gas, col in zip(gases, pivots):
        water[col] = gas.water
    names = list(system.components)
    for gas, col in zip(gases, pivots):
        names[col] = gas.name
    return GasBasis(system, tuple(gases), tuple(pivots), inverse, _clean(nu),
                    system.nu_water - _clean(nu) @ water, tuple(names))


def _clean(a: np.ndarray) -> np.ndarray:
    """Round-off of an exact rational change of basis back to the nearest simple value."""
    rounded = np.round(a * 840.0) / 840.0   # 840 = lcm(1..8): stoichiometric fractions
    return np.where(np.abs(a - rounded) < 1e-9, rounded, a)


# -- the batched equilibrium with phases -----------------------------------------------------
@dataclass
class PhaseEquilibrium:
    """Equilibrium of a batch with solids and gases; arrays over samples (n)."""

    equilibrium: Equilibrium          # in the system's own components
    inner: Equilibrium                # as solved, in the gas basis
    basis: GasBasis
    free: np.ndarray                  # (c,) columns with a mass balance in the gas basis
    solids: tuple[PhaseReaction, ...]
    modes: tuple[SolidChoice, ...]
    dissolved: np.ndarray             # (n, m) mol/kg of each solid into solution
    present: np.ndarray               # (n, m) solid at equilibrium with the solution
    saturation_index: np.ndarray      # (n, m)
    gas_uptake: np.ndarray            # (n, g) mol/kg of each gas into solution
    totals: np.ndarray                # (n, c) in solution, system components
    gas_log10_pressure: np.ndarray    # (n, g) atm
    t_C: np.ndarray                   # (n,)
    bound: Any = None
    skipped: dict[str, list[str]] = field(default_factory=dict)  # solid → missing components
    traced: np.ndarray | None = None  # (n, c) components carried at a trace (design.TRACE)
    notes: list[Notice] = field(default_factory=list)

    @property
    def status(self) -> np.ndarray:
        return self.equilibrium.status

    def solid_matrix(self) -> np.ndarray:
        """(m, c) stoichiometry of the solids in the gas basis."""
        if not self.solids:
            return np.zeros((0, self.basis.n_components))
        return self.basis.new_direction(np.array([s.stoichiometry for s in self.solids]))


def equilibrate(system: ChemicalSystem, tables: TableSet, totals: np.ndarray, bound,
                t_C: np.ndarray, choice: PhaseChoice,
                fixed_log10_activity: np.ndarray | None = None,
                shift: LogKShift | None = None) -> PhaseEquilibrium:
    """Solve a batch with the recipe's solids and gases; *totals* (n, c) in mol/kg; with
    *shift*, each sample's constants changed by its row of the shift.

    Samples that fail keep their status (never a silent answer); a recipe whose phases
    break the phase rule raises :class:`PhaseRuleError` before anything is solved.
    """
    totals = np.atleast_2d(np.asarray(totals, dtype=float))
    n, c = totals.shape
    t_C = np.broadcast_to(np.asarray(t_C, dtype=float), (n,)).copy()
    fixed = (np.full((n, c), np.nan) if fixed_log10_activity is None
             else np.array(np.broadcast_to(fixed_log10_activity, (n, c)), dtype=float))
    # a gas's components are in the system (components_needed), so none is None
    gases = [cast(PhaseReaction, phase_reaction(system, tables, g.name, "gas"))
             for g in choice.gases]
    basis = gas_basis(system, gases, ~np.isnan(fixed[0]))
    for gas, col in zip(choice.gases, basis.pivots):
        fixed[:, col] = gas.log10_pressure_atm
    solids, modes, skipped = [], [], {}
    for s in choice.solids:
        reaction = phase_reaction(system, tables, s.name, "solid")
        if reaction is not None:
            solids.append(reaction)
            modes.append(s)
        else:
            skipped[s.name] = sorted(set(tables.resolve(s.name, "solids").stoichiometry)
                                     - set(system.components) - {WATER})
    free = np.isnan(fixed[0])
    check_phase_rule(basis, solids, modes, free)
    work = _Work(basis, bound, t_C, fixed, totals, tuple(solids), tuple(modes), free, shift)
    state = work.run()
    state.skipped = skipped
    return state


def solids_fix_totals_notes(state: PhaseEquilibrium, components: Sequence[str],
                            given: np.ndarray) -> list[Notice]:
    """A notice when the solids held at equilibrium leave no freedom to the components
    they are made of (as many independent solids as such components, as cerussite and
    hydrocerussite at a fixed pH): the phase rule then sets those components' activities
    from the solids alone, and the amounts the recipe gave of them (a water's carbonate,
    its measured alkalinity) are taken up or released by the solids, not kept. *given*
    (n, c) marks the system *components* whose totals the recipe gave (not a trace)."""
    basis, solids, modes, free = state.basis, state.solids, state.modes, state.free
    held = [s for s, m in zip(solids, modes) if m.mode == EQUILIBRATE]
    if len(held) < 2:   # one solid in excess fixing its one metal is the usual question
        return []
    rows = basis.new_direction(np.array([s.stoichiometry for s in held]))[:, free]
    involved = np.flatnonzero(np.any(np.abs(rows) > 1e-12, axis=0))
    if involved.size != len(held) or np.linalg.matrix_rank(rows[:, involved]) < len(held):
        return []
    names = [str(n) for n in np.array(basis.components)[free][involved]]
    stated = [n for n in names if n in components and given[:, components.index(n)].any()]
    if not stated:
        return []
    solid_names = " and ".join(s.name for s in held)
    return [Notice(VALIDITY, "solids-fix-totals",
                   f"{solid_names} held at equilibrium fix the activities of "
                   f"{' and '.join(names)} (the phase rule leaves them no freedom here): the "
                   f"solution's {' and '.join(stated)} come from the solids, not from what the "
                   "recipe gives, which the solids take up or release; to keep what was given, "
                   'hold one solid at "equilibrate" and make the others "may-form"',
                   {"solids": [s.name for s in held], "components": names, "given": stated})]


def check_phase_rule(basis: GasBasis, solids: Sequence[PhaseReaction],
                     modes: Sequence[SolidChoice], free: np.ndarray) -> None:
    """Raise :class:`PhaseRuleError` when the solids held present cannot all coexist.

    Each ``"equilibrate"`` solid fixes one combination of the free components; they must
    be linearly independent (so no more of them than free components), and none may be
    fixed by the gases and pH alone.
    """
    held = [s for s, m in zip(solids, modes) if m.mode == EQUILIBRATE]
    if not held:
        return
    rows = basis.new_direction(np.array([s.stoichiometry for s in held]))[:, free]
    names = [s.name for s in held]
    n_free = int(free.sum())
    if len(held) > n_free:
        raise PhaseRuleError(names, f"{len(held)} solids are held at equilibrium but the "
                             f"solution has only {n_free} free component(s) "
                             f"({', '.join(np.array(basis.components)[free])})")
    for k, row in enumerate(rows):
        if np.allclose(row, 0.0):
            raise PhaseRuleError([names[k]], "its saturation is set by the fixed pH and gas "
                                 "pressures alone, so it cannot be held at equilibrium too")
    if np.linalg.matrix_rank(rows, tol=1e-9) < len(held):
        raise PhaseRuleError(names, "their compositions are linearly dependent (for "
                             "example two forms of one mineral), so they cannot all be at "
                             "equilibrium at once")


@dataclass
class _Work:
    """The Newton iteration on the solids' dissolved amounts for one batch."""

    basis: GasBasis
    bound: Any
    t_C: np.ndarray
    fixed: np.ndarray
    totals: np.ndarray
    solids: tuple[PhaseReaction, ...]
    modes: tuple[SolidChoice, ...]
    free: np.ndarray
    shift: LogKShift | None = None

    def __post_init__(self) -> None:
        n, m = self.totals.shape[0], len(self.solids)
        self.new_totals = self.basis.new_totals(self.totals)
        c = self.totals.shape[1]
        self.p_old = np.array([s.stoichiometry for s in self.solids]).reshape(m, c)
        self.p_new = self.basis.new_direction(self.p_old) if m else self.p_old
        self.water = np.array([s.water for s in self.solids])
        self.log10_k = (np.array([s.log10_k(self.t_C) for s in self.solids]).T if m
                      else np.zeros((n, 0)))
        self.kappa_shift = np.zeros((n, c))       # the shift of the gases' log K
        self.species_shift = None                 # of the species' log K in the gas basis
        if self.shift is not None:
            for gas, col in zip(self.basis.gases, self.basis.pivots):
                self.kappa_shift[:, col] = self.shift.phase(gas.resolved, "gases")
            self.species_shift = self.shift.species() + self.kappa_shift @ self.basis.nu.T
            for k, solid in enumerate(self.solids):
                self.log10_k[:, k] = self.log10_k[:, k] + self.shift.phase(solid.resolved,
                                                                           "solids")
        mode = np.array([x.mode for x in self.modes], dtype=object)
        self.may_form = mode == MAY_FORM
        self.ceiling = np.where(self.may_form, 0.0, np.inf)[None, :].repeat(n, 0)
        for k, x in enumerate(self.modes):
            if x.mode == AMOUNT:
                self.ceiling[:, k] = x.amount_mol_per_kg
        # columns whose totals the solver needs positive
        self.positive = self.free.copy()
        self.positive[0] = False

    # -- one batched inner solve -----------------------------------------------------------
    def inner(self, xi: np.ndarray, rows: np.ndarray) -> tuple[Equilibrium, np.ndarray]:
        """Solve samples *rows* with dissolved amounts *xi* (len(rows), m); SI (len, m)."""
        new_totals = self.new_totals[rows] + xi @ self.p_new
        # A fixed column has no mass balance; the solver reads its total only to bound
        # the ionic strength, which a fixed pH or gas can raise beyond what the totals
        # imply (CO2 in pure water has a zero carbonate total). Samples that still reach
        # the bound are caught by _capped_ionic_strength.
        fixed_columns = ~self.free
        new_totals[:, fixed_columns] = np.maximum(np.abs(new_totals[:, fixed_columns]),
                                                  FIXED_COLUMN_ALLOWANCE)
        eq = solver.solve(cast(ChemicalSystem, self.basis),  # a basis reads as a system
                          new_totals, bound_slice(self.bound, rows), self.fixed[rows],
                          log10_k_shift=None if self.species_shift is None
                          else self.species_shift[rows])
        return eq, self.saturation(eq, rows)

    def old_log_activity(self, eq: Equilibrium, rows: np.ndarray) -> np.ndarray:
        """ln a of the system's own components for samples *rows* of the gas basis."""
        old = self.basis.old_log_activity(eq.log_activity, eq.ln_water_activity, self.t_C[rows])
        if self.shift is None:
            return old
        return old + LN10 * self.kappa_shift[rows] @ self.basis.inverse.T

    def saturation(self, eq: Equilibrium, rows: np.ndarray) -> np.ndarray:
        if not self.solids:
            return np.zeros((rows.size, 0))
        old = self.old_log_activity(eq, rows)
        log_iap = (old @ self.p_old.T + eq.ln_water_activity[:, None] * self.water) / LN10
        si = log_iap - self.log10_k[rows]
        return np.where(succeeded(eq.status)[:, None], si, np.nan)

    # -- the whole iteration -----------------------------------------------------------------
    def run(self) -> PhaseEquilibrium:
        n, m = self.totals.shape[0], len(self.solids)
        xi = np.zeros((n, m))
        present = np.zeros((n, m), dtype=bool)
        if m:
            supply = ~self.may_form[None, :]
            absent = supply & ~(self.room(xi, np.arange(n)) > 0)
            xi = np.where(absent, np.minimum(START_AMOUNT, self.ceiling), 0.0)
            present = np.broadcast_to(supply, (n, m)).copy()
        eq, si = self.inner(xi, np.arange(n))
        failed = ~succeeded(eq.status)
        if m:
            eq, si, present, failed = self.iterate(xi, present, eq, si, ~failed)
        return self.finish(eq, xi, present, si, failed)

    def room(self, xi: np.ndarray, rows: np.ndarray) -> np.ndarray:
        """How far each solid alone can precipitate before a total reaches zero (n, m).

        The distance is in mol/kg of that solid; infinite for a solid that uses no
        component whose total must stay positive.
        """
        base = self.new_totals[rows] + xi @ self.p_new
        out = np.full(xi.shape, np.inf)
        for k in range(xi.shape[1]):
            p = self.p_new[k]
            uses = self.positive & (p > 1e-12)
            if uses.any():
                out[:, k] = np.min(base[:, uses] / p[uses], axis=1)
        return out

    def iterate(self, xi, present, eq, si, pending):
        """Newton steps on the pending samples until their solids are settled.

        The Jacobian comes from the response of the mass balances at fixed activity
        coefficients; a model whose coefficients depend on the composition (Pitzer) makes
        it inexact, and SI then converges only linearly (halite in 7 mol/kg NaCl: a factor
        0.8 a step). Each step's actual change of SI corrects it (Broyden's update of the
        difference to the analytic Jacobian, kept while the set of present solids stays
        the same), which restores fast convergence.
        """
        failed = ~pending.copy()
        n, m = xi.shape
        correction = np.zeros((n, m, m))   # stays zero for models of ionic strength alone
        for _ in range(MAX_PHASE_ITERATIONS):
            rows = np.flatnonzero(pending)
            if not rows.size:
                break
            before = present[rows].copy()
            xi[rows], present[rows] = self.activate(xi[rows], present[rows], si[rows])
            correction[rows[np.any(before != present[rows], axis=1)]] = 0.0
            done = self.satisfied(si[rows], present[rows])
            pending[rows[done]] = False
            rows = rows[~done]
            if not rows.size:
                break
            step, H = self.newton_step(eq, rows, si[rows], present[rows], correction[rows])
            candidates = [self.take_step(xi[rows], step, present[rows], rows, logarithmic)
                          for logarithmic in (True, False)]
            sub_eq, sub_si, new_xi, new_present = self.line_search(
                xi[rows], present[rows], si[rows], candidates, rows)
            if self.inexact:
                small = self.small_step(xi[rows], new_xi, rows)
                kept = present[rows] & new_present & small[:, None]
                correction[rows] = _broyden(H - correction[rows], H, new_xi - xi[rows],
                                            sub_si - si[rows], kept)
            xi[rows], present[rows] = new_xi, new_present
            eq = _merge(eq, sub_eq, rows)
            si[rows] = sub_si
            bad = ~succeeded(sub_eq.status)
            failed[rows[bad]] = True
            pending[rows[bad]] = False
        failed |= pending
        return eq, si, present, failed

    @property
    def inexact(self) -> bool:
        """True when the analytic Jacobian leaves out part of γ's change (a model whose
        coefficients depend on the composition), so that secant corrections pay."""
        return not getattr(self.bound, "depends_on_ionic_strength_only", True)

    def small_step(self, xi, new_xi, rows) -> np.ndarray:
        """Rows whose step changed no positive total by half or more: a secant across a
        larger step would carry the curvature of that step into the Jacobian."""
        before = self.new_totals[rows] + xi @ self.p_new
        after = self.new_totals[rows] + new_xi @ self.p_new
        change = np.abs(after - before) / np.maximum(np.abs(before), 1e-300)
        return np.all(np.where(self.positive[None, :], change < 0.5, True), axis=1)

    def line_search(self, xi, present, si, candidates, rows):
        """(equilibrium, SI, ξ, present) after the first of *candidates* (each a pair of
        ξ and present solids) that lowers the violation, its step halved as needed.

        A full Newton step can overshoot far past the solubility when the solid uses up a
        component that sets the pH (calcite under fixed CO2 eats the alkalinity: SI +1.7
        becomes −10 and the next step returns, a cycle). Backtracking on the violation
        ‖SI‖² of present solids plus the supersaturation of absent ones (Armijo, halving)
        keeps every step a descent; points between two feasible amounts are feasible, since
        the bounds are linear. The logarithmic step of :meth:`take_step` bends each solid's
        step on its own; where solids share a component (cerussite and hydrocerussite at a
        fixed pH) the bent direction may not descend at all, and the plain Newton step,
        cut only at the boundary, is tried in its place.
        """
        before = _violation(si, present)
        new_xi, new_present = (a.copy() for a in candidates[0])
        alpha = np.ones(rows.size)
        eq, new_si = self.inner(new_xi, rows)
        for option in range(len(candidates)):
            for _ in range(LINE_SEARCH_HALVINGS):
                after = _violation(new_si, new_present)
                worse = succeeded(eq.status) & ~(after <= (1.0 - ARMIJO * alpha) * before)
                if not worse.any():
                    return eq, new_si, new_xi, new_present
                alpha[worse] *= 0.5
                target = candidates[option][0]
                trial = xi[worse] + alpha[worse, None] * (target[worse] - xi[worse])
                sub_eq, sub_si = self.inner(trial, rows[worse])
                eq = _merge(eq, sub_eq, np.flatnonzero(worse))
                new_si[worse] = sub_si
                new_xi[worse] = trial
            if option + 1 < len(candidates):   # the next candidate, at full length
                worse = succeeded(eq.status) & ~(_violation(new_si, new_present)
                                                        <= (1.0 - ARMIJO * alpha) * before)
                if not worse.any():
                    break
                alpha[worse] = 1.0
                new_xi[worse] = candidates[option + 1][0][worse]
                new_present[worse] = candidates[option + 1][1][worse]
                sub_eq, sub_si = self.inner(new_xi[worse], rows[worse])
                eq = _merge(eq, sub_eq, np.flatnonzero(worse))
                new_si[worse] = sub_si
        return eq, new_si, new_xi, new_present

    def activate(self, xi, present, si):
        """(ξ, present) after letting absent solids that are supersaturated join, one
        independent solid at a time.

        A supersaturated solid whose composition in the free components is a multiple c
        of a present "may-form" solid's (two oxides of one metal at a fixed pH and pe:
        pyrolusite and hausmannite) cannot join it: the phase rule leaves room for one.
        It takes that solid's place when it is the more stable of the two (SI_j >
        c·SI_i), holding the same precipitate (ξ_j = ξ_i / c, the solution unchanged);
        otherwise the active set could never trade them and the solids would not settle.
        """
        can = ~present & (si > ACTIVATION_SI) & np.isfinite(si)
        for k in np.flatnonzero(can.any(axis=1)):
            for j in np.argsort(-np.nan_to_num(si[k], nan=-np.inf)):
                if not can[k, j]:
                    continue
                if self.independent(present[k] | (np.arange(len(si[k])) == j)):
                    present[k, j] = True
                    continue
                swap = self.parallel_partner(j, present[k])
                if swap is not None and si[k, j] > swap[1] * si[k, swap[0]]:
                    i, c = swap
                    xi[k, j], xi[k, i] = xi[k, i] / c, 0.0
                    present[k, j], present[k, i] = True, False
        return xi, present

    def parallel_partner(self, j: int, present: np.ndarray) -> tuple[int, float] | None:
        """(i, c) of a present "may-form" solid i whose free composition times c > 0 is
        solid *j*'s (both "may-form"), or None."""
        if not self.may_form[j]:
            return None
        row = self.p_new[j, self.free]
        for i in np.flatnonzero(present & self.may_form):
            other = self.p_new[i, self.free]
            c = float(row @ other) / float(other @ other) if other.any() else 0.0
            if c > 0 and np.allclose(row, c * other, rtol=0.0, atol=1e-9 * np.abs(row).max()):
                return int(i), c
        return None

    def independent(self, mask: np.ndarray) -> bool:
        rows = self.p_new[mask][:, self.free]
        return np.linalg.matrix_rank(rows, tol=1e-9) == int(mask.sum())

    def satisfied(self, si, present):
        """Present solids at SI = 0 and absent ones not supersaturated."""
        ok_present = np.where(present, np.abs(si) <= SI_TOLERANCE, True)
        ok_absent = np.where(present, True, ~(si > ACTIVATION_SI))
        return np.all(ok_present & ok_absent, axis=1)

    def newton_step(self, eq: Equilibrium, rows, si, present, correction):
        """(Δξ, H): Δξ solves H Δξ = −SI on the present solids (zero for the absent), with
        H = P R Pᵀ/ln 10 + *correction*, the Jacobian of SI in ξ."""
        sub = _take(eq, rows)
        R = response(self.basis, sub, bound_slice(self.bound, rows), self.free)  # (r, f, f)
        pf = self.p_new[:, self.free]                                           # (m, f)
        H = np.einsum("if,rfg,jg->rij", pf, R, pf) / LN10 + correction
        both = present[:, :, None] & present[:, None, :]
        m = si.shape[1]
        H = np.where(both, H, 0.0) + np.where(~present, 1.0, 0.0)[:, :, None] * np.eye(m)
        rhs = np.where(present, -np.nan_to_num(si), 0.0)
        return np.linalg.solve(H, rhs[..., None])[..., 0], H

    def take_step(self, xi, step, present, rows, logarithmic: bool = True):
        """Step in ln(distance to the precipitation limit); a solid reaching its bound leaves.

        Newton on SI in the variable w = ln(ξ − ξ_limit) is Newton on ξ for small steps,
        but can neither cross the limit nor creep towards the solubility from a trace
        start (SI is close to linear in w there). A fraction-to-boundary rule guards the
        joint step of solids that share a component. Without *logarithmic* the Newton
        step is taken in ξ itself, cut only by that rule.
        """
        if logarithmic:
            room = self.room(xi, rows)
            finite = np.isfinite(room) & (room > 0)
            dw = np.clip(np.where(finite, step / np.where(finite, room, 1.0), 0.0),
                         -LOG_STEP_CAP, LOG_STEP_CAP)
            step = np.where(finite, room * np.expm1(dw), step)
        base = self.new_totals[rows] + xi @ self.p_new
        change = step @ self.p_new
        shrinking = self.positive[None, :] & (change < 0)
        ratio = np.where(shrinking, base / np.where(shrinking, -change, 1.0), np.inf)
        limit = FRACTION_TO_BOUNDARY * np.min(ratio, axis=1, initial=np.inf)
        # a total may grow by at most e^LOG_STEP_CAP in a step: SI is linear in the log of
        # a trace total, not in the total (two solids sharing a trace of lead)
        growing = self.positive[None, :] & (change > 0) & (base > 0)
        growth = np.where(growing, np.expm1(LOG_STEP_CAP) * base
                          / np.where(growing, change, 1.0), np.inf)
        limit = np.minimum(limit, np.min(growth, axis=1, initial=np.inf))
        alpha = np.minimum(1.0, limit)
        new = xi + alpha[:, None] * step
        ceiling = self.ceiling[rows]
        over = present & (new >= ceiling)
        new = np.where(over, ceiling, new)
        return new, present & ~over

    def finish(self, eq, xi, present, si, failed) -> PhaseEquilibrium:
        n = xi.shape[0]
        status = eq.status.astype(object)
        status[failed & (status == CONVERGED)] = MAX_ITERATIONS
        capped = _capped_ionic_strength(eq, self.basis.charge) & (status == CONVERGED)
        status[capped] = MAX_ITERATIONS
        notes = list(eq.notes)
        if capped.any():
            notes.append(Notice(
                SOLVER, "ionic-strength-ceiling", f"{int(capped.sum())} sample(s) reached the "
                "solver's ceiling on ionic strength (a fixed pH or gas can hold more ions than "
                "the totals bound) and are reported as not converged rather than wrong",
                {"samples": int(capped.sum())}))
        old_y = self.old_log_activity(eq, np.arange(n))
        with_solids = self.totals + xi @ self.p_old
        new_with_solids = self.basis.new_totals(with_solids)
        carried = eq.molality @ self.basis.nu
        uptake = np.stack([carried[:, col] - new_with_solids[:, col]
                           for col in self.basis.pivots], axis=1) if self.basis.pivots \
            else np.zeros((n, 0))
        in_solution = with_solids + (uptake @ np.array([g.stoichiometry for g in
                                                       self.basis.gases])
                                     if self.basis.gases else 0.0)
        outer = Equilibrium(log_activity=old_y, molality=eq.molality, ln_gamma=eq.ln_gamma,
                            ionic_strength=eq.ionic_strength,
                            ln_water_activity=eq.ln_water_activity, residual=eq.residual,
                            iterations=eq.iterations, status=status.astype(str),
                            notes=notes)
        inner = Equilibrium(**{**eq.__dict__, "status": status.astype(str)})
        pressures = self.fixed[:, list(self.basis.pivots)]
        return PhaseEquilibrium(outer, inner, self.basis, self.free, self.solids, self.modes,
                                xi, present, si, uptake, in_solution, pressures, self.t_C,
                                self.bound)


def _broyden(analytic: np.ndarray, H: np.ndarray, step: np.ndarray, change: np.ndarray,
             kept: np.ndarray) -> np.ndarray:
    """The correction to the analytic Jacobian after a step (Broyden's update).

    *H* (r, m, m) was used for *step* (r, m) and SI then changed by *change*; the updated
    H' = H + (ΔSI − H Δξ) Δξᵀ / (Δξᵀ Δξ) on the solids present before and after (*kept*),
    and the correction returned is H' − *analytic*, zero where the step was empty or the
    change not finite.
    """
    step = np.where(kept, step, 0.0)
    change = np.where(kept, change, 0.0)
    norm = np.einsum("ri,ri->r", step, step)
    usable = (norm > 0) & np.all(np.isfinite(change), axis=1)
    miss = change - np.einsum("rij,rj->ri", H, step)
    update = np.einsum("ri,rj->rij", miss, step) / np.where(usable, norm, 1.0)[:, None, None]
    both = kept[:, :, None] & kept[:, None, :]
    corrected = H + np.where(both & usable[:, None, None], update, 0.0)
    return np.where(both & usable[:, None, None], corrected - analytic, 0.0)


def _violation(si: np.ndarray, present: np.ndarray) -> np.ndarray:
    """Σ SI² of present solids plus Σ (SI > 0)² of absent ones, per sample (n,)."""
    si = np.nan_to_num(si, nan=np.inf)
    return np.sum(np.where(present, si, np.maximum(si, 0.0)) ** 2, axis=1)


def _capped_ionic_strength(eq: Equilibrium, charge: np.ndarray) -> np.ndarray:
    """Samples whose ionic strength unknown disagrees with ½ Σ z² m of their molalities.

    The solver bounds √I by a ceiling from the totals; fixed activities (a pH, a gas) can
    need more, and a sample held at that ceiling must not pass as converged.
    """
    ionic = 0.5 * eq.molality @ charge ** 2
    return np.abs(ionic - eq.ionic_strength) > 1e-6 * np.maximum(ionic, 1e-12)


def _take(eq: Equilibrium, rows: np.ndarray) -> Equilibrium:
    """The samples *rows* of a batch equilibrium."""
    return Equilibrium(log_activity=eq.log_activity[rows], molality=eq.molality[rows],
                       ln_gamma=eq.ln_gamma[rows], ionic_strength=eq.ionic_strength[rows],
                       ln_water_activity=eq.ln_water_activity[rows],
                       residual=eq.residual[rows], iterations=eq.iterations[rows],
                       status=eq.status[rows], notes=eq.notes)


def _merge(eq: Equilibrium, sub: Equilibrium, rows: np.ndarray) -> Equilibrium:
    """*eq* with samples *rows* replaced by *sub* (iterations added up)."""
    out = {}
    for name in ("log_activity", "molality", "ln_gamma", "ionic_strength",
                 "ln_water_activity", "residual", "status"):
        arr = getattr(eq, name).copy()
        if name == "status":
            arr = arr.astype(object)
        arr[rows] = getattr(sub, name)
        out[name] = arr.astype(str) if name == "status" else arr
    iterations = eq.iterations.copy()
    iterations[rows] += sub.iterations
    return Equilibrium(**out, iterations=iterations, notes=eq.notes)


# -- what is reported ------------------------------------------------------------------------
def describe(state: PhaseEquilibrium, k: int) -> dict[str, dict[str, Any]]:
    """The JSON ``phases`` object of sample *k*: per solid and gas, what went where.

    ``into_solution_mol_per_kg`` is positive for an amount dissolved or taken up and
    negative for an amount precipitated or released, per kg of water.
    """
    out: dict[str, dict[str, Any]] = {}
    for j, (solid, mode) in enumerate(zip(state.solids, state.modes)):
        xi = float(state.dissolved[k, j])
        entry: dict[str, Any] = {
            "kind": "solid", "mode": mode.mode, "state": _solid_state(state, k, j),
            "into_solution_mol_per_kg": xi, "into_solution_g_per_kg": xi * solid.molar_mass,
            "saturation_index": float(state.saturation_index[k, j])}
        if mode.amount_mol_per_kg is not None:  # given as an amount
            entry["available_mol_per_kg"] = mode.amount_mol_per_kg
            entry["left_mol_per_kg"] = mode.amount_mol_per_kg - xi
        out[solid.name] = entry
    for name, missing in state.skipped.items():
        out[name] = {"kind": "solid", "mode": MAY_FORM, "state": "cannot form",
                     "into_solution_mol_per_kg": 0.0, "into_solution_g_per_kg": 0.0,
                     "needs": missing}
    for g, gas in enumerate(state.basis.gases):
        out[gas.name] = {"kind": "gas",
                         "partial_pressure_atm": float(10.0 ** state.gas_log10_pressure[k, g]),
                         "into_solution_mol_per_kg": float(state.gas_uptake[k, g])}
    return out


def failure(state: PhaseEquilibrium, k: int) -> tuple[str, str]:
    """(what failed, hint) for sample *k* whose status is not converged.

    When the mass balances converged but the solids did not settle, the fault is the
    solver's, not the recipe's: the message quotes the SI tolerance it missed and does not
    send the user to check their totals.
    """
    eq = state.equilibrium
    if not state.solids:
        return "", ""
    taken = _taken_up(state, k)
    if taken[0]:
        return taken
    if not (eq.residual[k] <= RESIDUAL_TOLERANCE):
        return "", ""
    si = state.saturation_index[k]
    off = np.where(state.present[k], np.abs(si), np.maximum(si, 0.0))
    j = int(np.nanargmax(np.nan_to_num(off, nan=np.inf)))
    return (f"the solids did not settle in {MAX_PHASE_ITERATIONS} steps: "
            f"{state.solids[j].name} is at SI {si[j]:.3g} (tolerance ±{SI_TOLERANCE:g})",
            "the recipe is not at fault: this is a limit of the solver; please report it with "
            "the recipe; meanwhile hold one solid at \"equilibrate\" or leave one out")


def _taken_up(state: PhaseEquilibrium, k: int) -> tuple[str, str]:
    """(what failed, hint) when a precipitating solid of sample *k* has taken all but a
    share below :data:`RESOLVED_SHARE` of a component: the amount left dissolved is the
    difference of two nearly equal numbers, which double precision cannot resolve, so
    the solve fails there although the recipe is sound; empty when none has."""
    p = np.array([s.stoichiometry for s in state.solids])            # (m, c)
    xi = state.dissolved[k]
    given = state.totals[k] - xi @ p
    for j in np.flatnonzero(xi < 0):
        for c in np.flatnonzero((p[j] > 0) & state.free[: p.shape[1]]):
            if c == 0 or given[c] <= 0:
                continue
            if state.totals[k, c] <= RESOLVED_SHARE * given[c]:
                return (f"{state.solids[j].name} takes up all but less than "
                        f"{RESOLVED_SHARE:g} of the recipe's {state.basis.components[c]}: "
                        "its solubility here lies below what the solver can tell apart "
                        "from the total",
                        "the recipe is not at fault: where a solid holds practically "
                        "all of a metal (an oxide at high pe and pH), leave the solid out "
                        "and read its SI, or draw the pe–pH picture with `ionwright "
                        "diagram`, which settles such points exactly")
    return "", ""


def _solid_state(state: PhaseEquilibrium, k: int, j: int) -> str:
    if state.present[k, j]:
        return "saturated"
    if state.modes[j].mode == AMOUNT:
        return "all dissolved"
    return "not formed"
