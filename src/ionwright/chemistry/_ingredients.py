"""What one mole of an ingredient puts into solution, in components.

An ingredient is a named reagent of the tables (``"citric acid"``), a neutral component
or species (``"CO2"``, ``"NH3"``), the name of an inorganic salt, acid or base
(``"sodium chloride"``, ``"calcium chloride dihydrate"``: :mod:`._salt_names`), or a
neutral formula that splits into components by element and charge balance (``"KH2PO4"``,
``"MgSO4·7H2O"``). H+ and H2O take up the protons and water. Carbon-bearing formulas split
only into carbonate: an organic molecule balances into many wrong things (glucose into
three acetic acids), so organic ingredients must be named reagents. An unknown name gets
suggestions ranked by similarity of the whole name (:mod:`._name_match`).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from itertools import combinations
from typing import Mapping

import numpy as np

from ..errors import FormulaError, IonwrightError, RecipeError, UnknownNameError
from ._formula import parse_formula
from ._name_match import suggestions
from ._redox import in_linked_basis, unlinked
from ._salt_names import AmbiguousSaltName, formula_from_name
from ._tableset import TableSet

CARBONATE = "CO3^2-"
BASIS = ("H+", "H2O")
MAX_SPLIT_PARTS = 5


@dataclass(frozen=True)
class Makeup:
    """Components made by one mole of an ingredient, and how that was decided."""

    name: str
    formula: str
    per_mole: Mapping[str, float]
    how: str  # "reagent", "species", "named salt", "split"

    @property
    def molar_mass(self) -> float:
        return parse_formula(self.formula).molar_mass


def makeup(name: str, tables: TableSet) -> Makeup:
    """The :class:`Makeup` of ingredient *name*; raise a clear error when it has none.

    An unknown name or a formula that makes nothing is refused with the names it may have
    meant: close reagent names, and formulas within one slip of it (case: ``NaCL`` for
    NaCl; one extra character: ``NaOHH`` for NaOH) that the tables can make.
    """
    base = unlinked(tables)
    if base is not None:  # a linked set: the make-up of the unlinked one, in its components
        made = makeup(name, base)
        return replace(made, per_mole=in_linked_basis(made.per_mole, tables))
    if not isinstance(name, str) or not name.strip():
        raise RecipeError("ingredient", f"{name!r} must be a name (text)",
                          'give a named reagent or a formula, e.g. "NaOH" or "citric acid"')
    known = tables.memo.setdefault("makeup", {})
    if name not in known:
        try:
            known[name] = _makeup(name, tables)
        except (UnknownNameError, RecipeError) as exc:
            unmade = isinstance(exc, UnknownNameError) or exc.problem.startswith("cannot be made")
            if not unmade:
                raise
            near = suggestions(name, _labels(tables), lambda text: _makeable(text, tables))
            if not near:
                raise
            raise UnknownNameError("ingredient", name, (), "`ionwright tables show "
                                   "reagents` lists the named reagents", near=near) from None
    return known[name]


def _labels(tables: TableSet) -> list[str]:
    """Every name and alias of the tables' reagents."""
    return sorted({label for r in tables.reagents.values() for label in (r.name, *r.aliases)})


def _makeable(text: str, tables: TableSet) -> bool:
    """Whether *text* (a formula or a salt name) is an ingredient the tables can make."""
    try:
        _makeup(text, tables)
    except (IonwrightError, AmbiguousSaltName):
        return False
    return True


def _makeup(name: str, tables: TableSet) -> Makeup:
    reagent = tables.reagent(name)
    if reagent is not None:
        if reagent.makes is not None:
            return Makeup(reagent.name, reagent.formula, dict(reagent.makes), "reagent")
        return Makeup(reagent.name, reagent.formula,
                      _split(name, reagent.formula, tables), "reagent")
    if name in tables.components or name in tables.species:
        entry = tables.entry(name)
        if entry.charge != 0:
            raise RecipeError(f"[dissolve] {name!r}", f"is an ion (charge {entry.charge:+d}); "
                              "ingredients must be neutral", "give a salt or an acid, e.g. "
                              "NaHCO3 or HCl, so that the counter-ion is counted too")
        stoich = tables.resolve(name).stoichiometry
        return Makeup(name, entry.formula, dict(stoich), "species")
    try:
        salt = formula_from_name(name)
    except AmbiguousSaltName as exc:
        raise RecipeError(f"[dissolve] {name!r}", str(exc), "write the name of one salt or "
                          "its formula") from None
    if salt is not None:
        return Makeup(name, salt, _split(name, salt, tables), "named salt")
    try:
        formula = parse_formula(name)
    except FormulaError:
        raise UnknownNameError("ingredient", name, tables.reagent_names(),
                               "named reagents: `ionwright tables show reagents`; "
                               "or write a formula such as KH2PO4") from None
    if formula.charge != 0:
        raise RecipeError(f"[dissolve] {name!r}", f"has charge {formula.charge:+d}; "
                          "ingredients must be neutral", "give the whole salt, e.g. Na2SO4")
    return Makeup(name, name, _split(name, name, tables), "split")


def _split(name: str, text: str, tables: TableSet) -> dict[str, float]:
    """Components (with H+ and H2O) that balance formula *text* in elements and charge."""
    formula = parse_formula(text)
    elements = dict(formula.elements)
    heavy = set(elements) - {"H", "O"}
    candidates = [c for c, comp in tables.components.items()
                  if c not in BASIS and comp.elements
                  and set(comp.elements) <= heavy | {"H", "O"}
                  and set(comp.elements) & heavy]
    if "C" in heavy:
        candidates = [c for c in candidates
                      if "C" not in tables.components[c].elements or c == CARBONATE]
    solutions = []
    for size in range(1, min(len(candidates), MAX_SPLIT_PARTS) + 1):
        for subset in combinations(candidates, size):
            found = _balance(elements, formula.charge, subset, tables)
            if found is not None:
                solutions.append(found)
    if len(solutions) == 1:
        return solutions[0]
    if not solutions:
        raise RecipeError(f"[dissolve] {name!r}", "cannot be made from the components of "
                          "the tables by element and charge balance",
                          _organic_hint(heavy) or "add a named reagent for it to a table "
                          "([reagents] with formula and makes), or use a listed name")
    options = "; ".join(" + ".join(f"{v:g} {k}" for k, v in s.items()) for s in solutions)
    raise RecipeError(f"[dissolve] {name!r}", f"splits into components in more than one way "
                      f"({options})", "name a reagent whose `makes` says which is meant")


def _organic_hint(heavy: set[str]) -> str:
    if "C" in heavy:
        return ("organic ingredients must be named reagents (e.g. \"citric acid\", "
                "\"Tris\"); `ionwright tables show reagents` lists them")
    return ""


def _balance(elements: dict[str, float], charge: int, subset: tuple[str, ...],
             tables: TableSet) -> dict[str, float] | None:
    """Integer positive amounts of *subset* (plus any H+, H2O) matching the formula."""
    columns = [*subset, *BASIS]
    rows = sorted({*elements, *(el for c in columns for el in tables.components[c].elements)})
    a = np.array([[tables.components[c].elements.get(el, 0.0) for c in columns] for el in rows]
                 + [[tables.components[c].charge for c in columns]], dtype=float)
    b = np.array([elements.get(el, 0.0) for el in rows] + [charge], dtype=float)
    if np.linalg.matrix_rank(a) < len(columns):
        return None
    x, *_ = np.linalg.lstsq(a, b, rcond=None)
    if not np.allclose(a @ x, b, atol=1e-9):
        return None
    amounts = x[: len(subset)]
    if np.any(amounts < 0.5) or not np.allclose(amounts, np.round(amounts), atol=1e-9):
        return None
    out = {c: float(round(v)) for c, v in zip(subset, amounts)}
    for c, v in zip(BASIS, x[len(subset):]):
        if abs(v) > 1e-9:
            out[c] = float(np.round(v, 9))
    return out
