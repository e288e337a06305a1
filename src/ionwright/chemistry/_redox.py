"""The electron as a component: linking oxidation states when a recipe states a redox level.

Without a stated redox level every oxidation state is its own component (Fe2+ and Fe3+,
NO3- and NH3), as in a table set without redox. Stating one (a pe, an Eh, an O2 pressure)
links them: each redox couple of the tables turns the component it names into a species
formed from the oxidised form and electrons (Fe2+ = Fe3+ + e-), so that every species,
solid and ingredient of that oxidation state follows through it. A couple may be kept
apart from the level (a water analysis that measured both its forms keeps them as
measured, :func:`analysed_apart`): its two forms then stay components of their own. pe = −log10 a(e-), and
Eh = pe · RT ln10 / F against the standard hydrogen electrode.

References
----------
Stumm, W. & Morgan, J.J. (1996) Aquatic Chemistry, 3rd ed., Wiley, ch. 8 (pe, the electron
as a component, Eh = 2.303 RT/F · pe).
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import replace

import numpy as np

from ._constants import LN10
from ._records import ConstantTable, Species, frozen_map
from ._tableset import TableSet
from ._temperature import R
from ._water import KELVIN_OFFSET

ELECTRON = "e-"
FARADAY = 96485.33212  # C/mol (CODATA 2018, exact: N_A·e)
_MEMO = "redox"
_NOT_PARTS = (ELECTRON, "H+", "H2O")


def nernst_slope_V(t_C):
    """RT ln10 / F in volts at *t_C* (°C): the Eh of one pe unit (0.05916 V at 25 °C)."""
    return R * (np.asarray(t_C, dtype=float) + KELVIN_OFFSET) * LN10 / FARADAY


def eh_from_pe(pe, t_C):
    """Eh (V against the standard hydrogen electrode) of *pe* at *t_C* (°C)."""
    return np.asarray(pe, dtype=float) * nernst_slope_V(t_C)


def pe_from_eh(eh_V, t_C):
    """pe of an Eh (V against the standard hydrogen electrode) at *t_C* (°C)."""
    return np.asarray(eh_V, dtype=float) / nernst_slope_V(t_C)


def holds_electron(tables: TableSet, name: str, kind: str) -> bool:
    """Whether species, solid or gas *name* is made with electrons (O2(g), pyrolusite)."""
    return ELECTRON in tables.resolve(name, kind).stoichiometry


def electron_tables(tables: TableSet, apart: frozenset[str] = frozenset()) -> TableSet:
    """*tables* with their redox couples linked, but for those named in *apart* (by the
    component each couple names): each linked couple's component becomes a species formed
    with electrons, keeping the component's ion-size parameters. Built once per set."""
    memo = tables.memo.setdefault(_MEMO, {})
    key = ("linked", apart)
    if key not in memo:
        couples = {name: c for name, c in tables.active_couples().items() if name not in apart}
        linked = TableSet([_linked_table(t, couples, tables) for t in tables.tables])
        linked.memo[_MEMO] = {"unlinked": tables, "self": linked}
        memo[key] = linked
    return memo[key]


def couple_forms(tables: TableSet) -> dict[str, str]:
    """The component each active couple names → the component of its other form (the
    other form may be a species, as H3AsO4 of arsenate: its one heavy component then)."""
    out = {}
    for named, couple in tables.active_couples().items():
        part = next(p for p in couple.reaction if p not in _NOT_PARTS)
        if part not in tables.components:
            heavy = [c for c in tables.resolve(part).stoichiometry if c not in _NOT_PARTS]
            if len(heavy) != 1:
                continue
            part = heavy[0]
        out[named] = part
    return out


def analysed_apart(tables: TableSet, analysed: Iterable[str],
                   setting: str | None = None) -> frozenset[str]:
    """The couples of *tables* (by the component each names) whose two forms are both
    among the *analysed* components: a water analysis that measured both keeps them as
    measured, whatever redox level it states, for natural waters are seldom in redox
    equilibrium. A couple sharing a form with one kept apart is kept apart too (with
    nitrate and ammonia measured, nitrite does not take the nitrate). The couple
    *setting* the level (``redox_couple``) is not kept apart."""
    present, forms = set(analysed), couple_forms(tables)
    apart = {named for named, other in forms.items()
             if named in present and other in present and named != setting}
    held = {form for named in apart for form in (named, forms[named])}
    return frozenset(apart | {named for named, other in forms.items()
                              if (named in held or other in held) and named != setting})


def linked_couples(tables: TableSet) -> frozenset[str]:
    """The couples (by the component each names) that a linked set links: those whose
    component it no longer has (empty for a set that is not linked)."""
    base = unlinked(tables)
    if base is None:
        return frozenset()
    return frozenset(named for named in base.active_couples() if named not in tables.components)


def unlinked(tables: TableSet) -> TableSet | None:
    """The set *tables* was linked from (None when *tables* is not linked)."""
    return tables.memo.get(_MEMO, {}).get("unlinked") if _is_linked(tables) else None


def _is_linked(tables: TableSet) -> bool:
    return tables.memo.get(_MEMO, {}).get("self") is tables


def in_linked_basis(amounts: Mapping[str, float], linked: TableSet) -> dict[str, float]:
    """*amounts* of unlinked components (an ingredient's make-up, a recipe's totals) in the
    components of *linked*: 1 Fe2+ is 1 Fe3+ and 1 e-."""
    out: dict[str, float] = {}
    for comp, amount in amounts.items():
        parts = ({comp: 1.0} if comp in linked.components or comp == "H2O"
                 else linked.resolve(comp).stoichiometry)
        for part, nu in parts.items():
            out[part] = out.get(part, 0.0) + nu * amount
    return out


def _linked_table(table: ConstantTable, couples: Mapping[str, Species],
                  tables: TableSet) -> ConstantTable:
    """*table* without the components the couples link, and with the couples it defines
    as species (carrying the linked component's formula and ion-size parameters)."""
    if not (set(table.components) & set(couples) or table.couples):
        return table
    own = {name: _as_species(couple, tables) for name, couple in couples.items()
           if couple.table == table.name}
    return replace(table,
                   components=frozen_map({k: v for k, v in table.components.items()
                                          if k not in couples}),
                   species=frozen_map({**table.species, **own}))


def _as_species(couple: Species, tables: TableSet) -> Species:
    component = tables.components[couple.name]
    return replace(couple, formula=component.formula, ion_size=component.ion_size,
                   tj_a=component.tj_a, tj_b=component.tj_b, setschenow=component.setschenow)
