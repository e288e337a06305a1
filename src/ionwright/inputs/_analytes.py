"""The analytes a water analysis may list, and the component each one is counted as.

One list serves every reader of analyses (a recipe's ``[analysis]`` and the columns of a
batch), so that ``Fe``, ``iron``, ``Fe(III)`` or ``NO2`` mean the same thing everywhere.

An analyte is written as a formula (``Ca``, ``SO4``, ``NO2``, ``Fe3+``), a name (``iron``,
``silica``, ``nitrite``) or an element with its oxidation state in Roman numerals
(``Fe(II)``, ``As(III)``). It maps to the one component of the tables made of the same
elements other than H and O; where several are (Fe2+ and Fe3+, arsenate and arsenite,
nitrate, nitrite and ammonia), the stated oxidation state, the charge or the oxygen count
decides. A bare element with two oxidation states in the tables takes the usual one of
natural waters (:data:`USUAL_STATES`) unless the analysis says otherwise with a state key
(:data:`STATE_KEYS`, e.g. ``iron_state = "Fe(III)"``), and the conversion says so.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Mapping

from ..chemistry._formula import Formula, parse_formula
from ..chemistry._tableset import TableSet
from ..errors import FormulaError, RecipeError, close_matches

#: Keys of an ``[analysis]`` that are not analytes.
NAMED_KEYS = {"temperature_C", "pH", "alkalinity", "balance_on", "density",
              "iron_state", "arsenic_state"}
#: State key → the element whose bare symbol it settles.
STATE_KEYS = {"iron_state": "Fe", "arsenic_state": "As"}
#: Oxidation state a bare element takes when the tables hold it in two. Dissolved iron
#: in groundwater (filtered, anoxic) is mostly Fe(II); arsenic in oxic water mostly
#: As(V).  # common practice
USUAL_STATES = {"Fe": 2, "As": 5}
#: Analytes written by name (case-insensitive), and the formula their mass refers to.
ANALYTE_NAMES = {
    "ammonia": "NH3", "sulfide": "S", "silica": "SiO2", "nitrite": "NO2", "nitrate": "NO3",
    "sulfate": "SO4", "chloride": "Cl", "fluoride": "F", "bromide": "Br", "phosphate": "PO4",
    "boron": "B", "sodium": "Na", "potassium": "K", "calcium": "Ca", "magnesium": "Mg",
    "iron": "Fe", "manganese": "Mn", "aluminium": "Al", "aluminum": "Al", "copper": "Cu",
    "zinc": "Zn", "lead": "Pb", "cadmium": "Cd", "nickel": "Ni", "strontium": "Sr",
    "barium": "Ba", "lithium": "Li", "arsenic": "As",
}
#: Chlorine residuals, in mg/L "as Cl2" (one mol Cl2 per mol of Cl(+I)), and the note a
#: conversion carries. Either is the total of free chlorine (OCl-) that the equilibrium
#: shares out between HOCl, OCl-, Cl2 and, with ammonia, the chloramines.
CHLORINE_KEYS = {
    "total_chlorine": "",
    "free_chlorine": "free chlorine as Cl2 is taken as the chlorine total: with ammonia in "
                     "the analysis the equilibrium turns part of it into chloramines (give "
                     "total_chlorine for such water)",
}
HYPOCHLORITE = parse_formula("ClO-")
ROMAN = {"I": 1, "II": 2, "III": 3, "IV": 4, "V": 5, "VI": 6, "VII": 7}
_STATED = re.compile(r"^\s*(?P<element>[A-Z][a-z]?)\s*\((?P<roman>[IVX]+)\)\s*$")
_NAMED_STATE = re.compile(r"^\s*(?P<name>[a-z]+)\s*\((?P<roman>[ivx]+)\)\s*$")
PROTON, WATER = "H+", "H2O"
LIGHT = {"H", "O"}
#: Oxidation states of H and O, by which the state of the rest of a component follows.
_LIGHT_STATES = {"H": 1, "O": -2}


@dataclass(frozen=True)
class Analyte:
    """What an analysis key counts: *component*, the *formula* its mass refers to, the mol
    of component per mol of that formula, and a *note* when an oxidation state was
    assumed or taken from a state key (empty otherwise)."""

    component: str
    formula: Formula
    per_mole: float
    note: str = ""
    settled_by: str = ""     # the state key that chose the component, if one did


def map_analyte(key: str, tables: TableSet, where: str,
                states: Mapping[str, int] | None = None) -> Analyte:
    """The :class:`Analyte` of analysis *key*; *states* (element → oxidation state, from
    :func:`read_states`) settles a bare element the tables hold in two states."""
    if key.casefold() in CHLORINE_KEYS:
        return _chlorine(key.casefold(), tables, where)
    text, stated = _spelled_out(key, where)
    try:
        formula = parse_formula(text)
    except FormulaError:
        raise _unknown(key, tables, where) from None
    heavy = set(formula.elements) - LIGHT
    if "C" in heavy:
        raise RecipeError(where, f"{key!r}: carbonate is given as alkalinity, with the pH",
                          'e.g. alkalinity = "160 mg/L as CaCO3"')
    if not heavy:
        raise RecipeError(where, f"{key!r} names no element but H and O",
                          "give the pH as pH, alkalinity as alkalinity")
    candidates = [c for c, comp in tables.components.items()
                  if c not in (PROTON, WATER) and set(comp.elements) - LIGHT == heavy]
    if not candidates:
        raise RecipeError(where, f"the tables have no component for {key!r} (made of "
                          f"{', '.join(sorted(heavy))})", "add the ion to a table "
                          "(`ionwright tables show components` lists them) or remove the entry")
    component, note, settled_by = _choose(key, formula, stated, candidates, tables, where,
                                          states or {})
    elements = tables.components[component].elements
    ratios = {formula.elements[el] / elements[el] for el in heavy}
    if len(ratios) != 1:
        raise RecipeError(where, f"{key!r} does not map onto {component} one to one",
                          "give the ion's own formula")
    return Analyte(component, formula, ratios.pop(), note, settled_by)


def _chlorine(key: str, tables: TableSet, where: str) -> Analyte:
    """The :class:`Analyte` of a chlorine residual: hypochlorite, counted as Cl2."""
    component = next((c for c, comp in tables.components.items()
                      if parse_formula(comp.formula) == HYPOCHLORITE), None)
    if component is None:
        raise RecipeError(where, f"{key!r}: the tables have no free chlorine (hypochlorite) "
                          "component", 'add "chlorine" to the recipe\'s tables')
    return Analyte(component, parse_formula("Cl2"), 1.0, CHLORINE_KEYS[key])


def check_states_used(states_given: Mapping[str, object], analytes: list[Analyte],
                      where: str) -> None:
    """Refuse a state key that settled no analyte (no bare Fe or As in the analysis): an
    option that does nothing is a slip the user should hear about."""
    used = {a.settled_by for a in analytes}
    for key, element in STATE_KEYS.items():
        if key in states_given and key not in used:
            raise RecipeError(f"{where} {key}", f"settles no analyte: the analysis has no "
                              f"bare {element} (keys such as {element}({_roman(USUAL_STATES[element])}) "
                              "state their own state)",
                              f"remove {key}, or give the analyte as {element} = \"...\"")


def read_states(section: Mapping[str, object], tables: TableSet,
                where: str) -> dict[str, int]:
    """Element → oxidation state from the state keys of an ``[analysis]`` *section*
    (``iron_state = "Fe(III)"``; ``"III"`` and ``3`` are read the same), each a state the
    tables hold the element in."""
    states = {}
    for key, element in STATE_KEYS.items():
        if key not in section:
            continue
        value = section[key]
        here = f"{where} {key}"
        held = _held_states(tables, element)
        example = f'{key} = "{element}({_roman(max(held, default=USUAL_STATES[element]))})"'
        text = str(value).strip()
        match = _STATED.match(text) or _STATED.match(f"{element}({text})")
        if isinstance(value, int) and not isinstance(value, bool):
            state = value
        elif isinstance(value, str) and match is not None and match["element"] == element \
                and match["roman"] in ROMAN:
            state = ROMAN[match["roman"]]
        else:
            raise RecipeError(here, f"{value!r} is not an oxidation state of {element}",
                              f"e.g. {example}")
        if state not in held:
            raise RecipeError(here, f"{element}({_roman(state)}) is not in the tables, which "
                              f"hold {_describe(held, element)}", f"e.g. {example}")
        states[element] = state
    return states


def _held_states(tables: TableSet, element: str) -> dict[int, str]:
    """Oxidation state → component, for the components made of *element* (with H, O)."""
    return {_oxidation_state(tables, c, element): c for c, comp in tables.components.items()
            if c not in (PROTON, WATER) and set(comp.elements) - LIGHT == {element}}


def _describe(held: Mapping[int, str], element: str) -> str:
    """'Fe(II) (Fe2+) and Fe(III) (Fe3+)', or 'no Fe' when *held* is empty."""
    if not held:
        return f"no {element}"
    return " and ".join(f"{element}({_roman(s)}) ({c})" for s, c in sorted(held.items()))


def _spelled_out(key: str, where: str) -> tuple[str, int | None]:
    """(formula text, stated oxidation state or None) of an analysis *key*."""
    named = _NAMED_STATE.match(key.casefold())
    if named is not None and named["name"] in ANALYTE_NAMES:   # iron(III)
        key = f"{ANALYTE_NAMES[named['name']]}({named['roman'].upper()})"
    stated = _STATED.match(key)
    if stated is not None:
        if stated["roman"] not in ROMAN:
            raise RecipeError(where, f"{key!r}: {stated['roman']!r} is not an oxidation state",
                              f"write it in Roman numerals, e.g. {stated['element']}(III)")
        return stated["element"], ROMAN[stated["roman"]]
    return ANALYTE_NAMES.get(key.casefold(), key), None


def _choose(key: str, formula: Formula, stated: int | None, candidates: list[str],
            tables: TableSet, where: str, states: Mapping[str, int]) -> tuple[str, str, str]:
    """(component, note, state key used) among *candidates*: by stated state, charge or
    oxygen count, else by a state key or the usual state."""
    heavy = sorted(set(formula.elements) - LIGHT)
    element = heavy[0] if len(heavy) == 1 else None
    if stated is not None:
        held = _held_states(tables, element or "")
        if stated not in held:
            raise RecipeError(where, f"the tables hold {_describe(held, element or '')}, not "
                              f"{element}({_roman(stated)})", "name a state the tables hold, "
                              "or add a component for this one to a table")
        return held[stated], "", ""
    if len(candidates) > 1 and formula.charge:
        candidates = [c for c in candidates if tables.components[c].charge == formula.charge] \
            or candidates
    if len(candidates) > 1:
        exact = [c for c in candidates if _without_hydrogen(tables.components[c].elements)
                 == _without_hydrogen(formula.elements)]
        candidates = exact or candidates
    usual = _usual(key, element, candidates, tables, states) if len(candidates) > 1 else None
    if usual is not None:
        return usual
    if len(candidates) > 1:
        raise RecipeError(where, f"{key!r} could be {' or '.join(candidates)}",
                          "write the ion more fully (SO4, or S for sulfide), or its state "
                          "(Fe(III))")
    return candidates[0], "", ""


def _usual(key: str, element: str | None, candidates: list[str], tables: TableSet,
           states: Mapping[str, int]) -> tuple[str, str, str] | None:
    """(component, note, state key used or "") of a bare element held in several states:
    the state key's state, else the usual one; None for an element without a usual
    state."""
    if element not in USUAL_STATES:
        return None
    state_key = next(k for k, e in STATE_KEYS.items() if e == element)
    held = {_oxidation_state(tables, c, element): c for c in candidates}
    given = states.get(element)
    if given in held:   # read_states checked it against the tables
        return held[given], f"taken as {element}({_roman(given)}), as {state_key} says", \
            state_key
    usual = USUAL_STATES[element]
    if usual not in held:
        return None
    others = [f"{element}({_roman(s)})" for s in sorted(held) if s != usual]
    return held[usual], (f"taken as {element}({_roman(usual)}), the usual state of dissolved "
                         f"{key}; if the sample holds another, write {' or '.join(others)} "
                         f"(or set {state_key} in an [analysis])"), ""


def _oxidation_state(tables: TableSet, component: str, element: str) -> int:
    """Oxidation state of *element* in *component*, from its charge with H as +1 and O
    as -2 (the only other elements of the candidates)."""
    comp = tables.components[component]
    rest = comp.charge - sum(_LIGHT_STATES[el] * n for el, n in comp.elements.items()
                             if el in _LIGHT_STATES)
    return round(rest / comp.elements[element]) if element in comp.elements else 0


def _roman(state: int) -> str:
    return next((r for r, n in ROMAN.items() if n == state), str(state))


def _without_hydrogen(elements: Mapping[str, float]) -> dict[str, float]:
    return {el: n for el, n in elements.items() if el != "H"}


def _unknown(key: str, tables: TableSet, where: str) -> RecipeError:
    """The error for a key that is neither a formula of the tables nor a known name."""
    symbols = {el for comp in tables.components.values() for el in comp.elements} - LIGHT
    known = [*ANALYTE_NAMES, *sorted(symbols), *sorted(NAMED_KEYS), *CHLORINE_KEYS]
    close = close_matches(key, known)
    suggestion = f"did you mean {' or '.join(map(repr, close))}? " if close else ""
    return RecipeError(where, f"unknown analysis key {key!r}", f"{suggestion}analytes are "
                       "element or ion formulas (Ca, SO4, NO3, Fe, Fe(III)) or names (iron, "
                       "silica, nitrite, free_chlorine, total_chlorine); other keys: "
                       + ", ".join(sorted(NAMED_KEYS)))
