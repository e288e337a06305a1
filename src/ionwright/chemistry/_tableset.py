"""An ordered set of constant tables merged into one namespace, with overrides recorded.

Later tables override earlier ones entry by entry; every override is kept (never
silent) so that results can show old and new values and both sources. Reactions are
checked for known references and element and charge balance once the set is merged.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping, Sequence, Union

from ..errors import TableError, UnknownNameError
from ._names import canonical_name
from ._records import Component, ConstantTable, LogK, Phase, Reagent, Species

KINDS = ("components", "species", "solids", "gases", "reagents")
#: An entry of a constant table.
Record = Union[Component, Species, Phase, Reagent]
BALANCE_TOLERANCE = 1e-9


@dataclass(frozen=True)
class Override:
    """One entry of a later table replacing an entry of the same name in an earlier one."""

    kind: str
    name: str
    new: Record
    old: Record


@dataclass(frozen=True)
class Resolved:
    """A species, solid or gas expressed in components, with the log K terms it adds up."""

    name: str
    stoichiometry: Mapping[str, float]
    terms: tuple[tuple[str, float, LogK], ...]  # (entry name, multiplier, its LogK)


class TableSet:
    """Merged view of tables in priority order (later wins)."""

    def __init__(self, tables: Sequence[ConstantTable]) -> None:
        if not tables:
            raise TableError("(no tables)", ["a recipe needs at least one constant table"])
        self.tables = tuple(tables)
        self.overrides: list[Override] = []
        merged: dict[str, dict] = {kind: {} for kind in KINDS}
        for table in tables:
            for kind in KINDS:
                for name, record in getattr(table, kind).items():
                    if name in merged[kind]:
                        self.overrides.append(Override(kind, name, record, merged[kind][name]))
                    merged[kind][name] = record
        self.components: dict[str, Component] = merged["components"]
        self.species: dict[str, Species] = merged["species"]
        self.solids: dict[str, Phase] = merged["solids"]
        self.gases: dict[str, Phase] = merged["gases"]
        self.reagents: dict[str, Reagent] = merged["reagents"]
        self.couples: dict[str, Species] = {}
        for table in tables:  # later tables override earlier ones, like the other kinds
            self.couples.update(table.couples)
        self._reagent_index = {}
        for reagent in self.reagents.values():
            for label in (reagent.name, *reagent.aliases):
                self._reagent_index[label.casefold()] = reagent
        self._resolved: dict[str, Resolved] = {}
        self.memo: dict[str, dict] = {}  # results derived from the (immutable) set, by kind
        problems = self.problems()
        if problems:
            raise TableError(" + ".join(t.origin for t in tables), problems)

    # -- lookups ----------------------------------------------------------------------
    def table(self, name: str) -> ConstantTable:
        """The table called *name* in this set."""
        for table in self.tables:
            if table.name == name:
                return table
        raise UnknownNameError("table", name, [t.name for t in self.tables])

    def citation(self, record) -> str:
        """Full citation of a record's source, looked up in the table it came from."""
        return self.table(record.table).citation(record.source)

    def reagent(self, name: str) -> Reagent | None:
        """The named reagent *name* (case-insensitive, aliases included), or None."""
        return self._reagent_index.get(name.casefold())

    def reagent_names(self) -> list[str]:
        return sorted({r.name for r in self.reagents.values()})

    def entry(self, name: str) -> Component | Species:
        """A component or species by name, in any spelling of its charge (``Ca+2``)."""
        name = self.species_name(name)
        if name in self.components:
            return self.components[name]
        if name in self.species:
            return self.species[name]
        raise UnknownNameError("component or species", name,
                               [*self.components, *self.species],
                               "`ionwright tables show NAME` lists what a table defines")

    def species_name(self, name: str) -> str:
        """*name* as this set spells it: a component or species given in another spelling
        of its charge (``CO3-2`` for ``CO3^2-``) gets the set's spelling; other names are
        returned unchanged."""
        if name in self.components or name in self.species:
            return name
        return canonical_name(name)

    def resolve(self, name: str, kind: str = "species") -> Resolved:
        """Express a component, species, solid or gas in components, summing log K terms."""
        if kind == "species":
            name = self.species_name(name)
        key = f"{kind}:{name}"
        if key not in self._resolved:
            self._resolved[key] = self._resolve(name, kind, ())
        return self._resolved[key]

    def _resolve(self, name: str, kind: str, chain: tuple[str, ...]) -> Resolved:
        if kind == "species" and name in self.components:
            return Resolved(name, {name: 1.0}, ())
        by_kind: dict[str, Mapping[str, Species] | Mapping[str, Phase]] = {
            "species": self.species, "solids": self.solids, "gases": self.gases}
        record = by_kind[kind].get(name)
        if record is None:
            raise UnknownNameError(kind.rstrip("s"), name, getattr(self, kind))
        if name in chain:
            raise TableError(record.table, [f"{kind} {name!r} is defined through itself: "
                                            f"{' -> '.join((*chain, name))}"])
        stoichiometry: dict[str, float] = {}
        terms: list[tuple[str, float, LogK]] = [(name, 1.0, record.logk)]
        # A species is formed FROM its parts, so their formation constants multiply in;
        # a solid or gas dissolves INTO its parts, so theirs divide out.
        sign = 1.0 if kind == "species" else -1.0
        for part, coeff in record.reaction.items():
            sub = self._resolve(part, "species", (*chain, name))
            for comp, nu in sub.stoichiometry.items():
                stoichiometry[comp] = stoichiometry.get(comp, 0.0) + coeff * nu
            terms.extend((n, sign * coeff * m, lk) for n, m, lk in sub.terms)
        stoichiometry = {c: v for c, v in stoichiometry.items() if abs(v) > BALANCE_TOLERANCE}
        return Resolved(name, stoichiometry, tuple(terms))

    def active_couples(self) -> dict[str, Species]:
        """The redox couples this set can use: those whose named component and whose
        parts it defines (a couple of metals' iron is idle in a set without metals)."""
        known = {**self.components, **self.species}
        return {name: couple for name, couple in self.couples.items()
                if name in self.components and all(part in known for part in couple.reaction)}

    # -- checks -----------------------------------------------------------------------
    def problems(self) -> list[str]:
        """Every missing basis, unknown reference, unbalanced reaction or cycle."""
        out = [f"the table set needs component {c!r}; add it to a table"
               for c in ("H+", "H2O") if c not in self.components]
        out += [f"species {name!r} (table {record.table!r}) has the name of component "
                f"{name!r} (table {self.components[name].table!r}), which would hide it: "
                "give the species a name of its own" for name, record in self.species.items()
                if name in self.components]
        known: dict[str, Component | Species] = {**self.components, **self.species}
        for kind, records, key in (("species", self.species, "from"),
                                   ("solid", self.solids, "dissolves_to"),
                                   ("gas", self.gases, "dissolves_to")):
            for record in records.values():
                out.extend(_reaction_problems(kind, record, record.reaction, key, known))
        for couple in self.active_couples().values():
            out.extend(_reaction_problems("couple", couple, couple.reaction, "from", known))
        for reagent in self.reagents.values():
            if reagent.makes is not None:
                out.extend(_reaction_problems("reagent", reagent, reagent.makes, "makes", known,
                                              charge=0))
        if not out:
            for kind in ("species", "solids", "gases"):
                for name in getattr(self, kind):
                    try:
                        self.resolve(name, kind)
                    except TableError as exc:
                        out.extend(exc.problems)
        return out


def _reaction_problems(kind: str, record, reaction: Mapping[str, float], key: str,
                       known: Mapping[str, Component | Species], charge: int | None = None
                       ) -> list[str]:
    where = f"{kind} {record.name!r} (table {record.table!r})"
    missing = [name for name in reaction if name not in known]
    if missing:
        return [f"{where}: {key} names {', '.join(repr(m) for m in missing)}, which no "
                f"table defines as a component or species"]
    target_charge = getattr(record, "charge", 0) if charge is None else charge
    elements: dict[str, float] = {}
    total_charge = 0.0
    for name, coeff in reaction.items():
        part = known[name]
        total_charge += coeff * part.charge
        for el, n in part.elements.items():
            elements[el] = elements.get(el, 0.0) + coeff * n
    target = dict(record.elements)
    diffs = {el: elements.get(el, 0.0) - target.get(el, 0.0) for el in {*elements, *target}}
    out = []
    unbalanced = {el: d for el, d in diffs.items() if abs(d) > BALANCE_TOLERANCE}
    if unbalanced:
        out.append(f"{where}: {key} does not balance in elements: {record.formula} has "
                   f"{_fmt(target)}, {_fmt_reaction(reaction)} has {_fmt(elements)}")
    if abs(total_charge - target_charge) > BALANCE_TOLERANCE:
        out.append(f"{where}: {key} does not balance in charge: {record.formula} has "
                   f"{target_charge:+g}, {_fmt_reaction(reaction)} has {total_charge:+g}")
    return out


def _fmt(elements: Mapping[str, float]) -> str:
    items = sorted((el, n) for el, n in elements.items() if abs(n) > BALANCE_TOLERANCE)
    return " ".join(f"{el}{n:g}" for el, n in items) or "nothing"


def _fmt_reaction(reaction: Mapping[str, float]) -> str:
    return " + ".join(f"{c:g} {n}" for n, c in reaction.items())

