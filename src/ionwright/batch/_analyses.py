"""The rows of a batch that are water analyses, converted together: every column read once,
the samples made up to a litre as arrays (:func:`ionwright.inputs._mixing.make_up_litres`),
and the carbonate and balancing totals fitted for all rows at once
(:func:`ionwright.engine._fits.fit_totals`, the fit the single solve uses).

Each step is the one a recipe's ``[analysis]`` goes through
(:mod:`ionwright.inputs._analysis`), applied to a column of values instead of one cell:
the same entries (:func:`~ionwright.inputs._analysis._analyte_entry` with arrays), the same
make-up, the same fit and its density rounds, the same protons for a sample without pH.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any, Mapping, Sequence

import numpy as np

from ..chemistry._density import component_solute
from ..chemistry._redox import analysed_apart
from ..chemistry._tableset import TableSet
from ..core._acid_base import ALKALINITY_END_POINT_PH
from ..engine._fits import DENSITY_ROUNDS, SETTLE_TOLERANCE, fit_rows
from ..errors import IonwrightError, RecipeError
from ..inputs._analysis import (ALKALINITY_DIMENSIONS, ANALYTE_DIMENSIONS, CARBONATE,
                                DIC_ANALYTE, DIC_DIMENSIONS, _analyte_entry)
from ..inputs._analytes import Analyte, map_analyte
from ..inputs._mixing import Entry, make_up_litres
from ..inputs._units import (CALCIUM_CARBONATE, CALCIUM_CARBONATE_EQUIVALENTS, Quantity,
                             expect, parse_quantity)

PROTON = "H+"


@dataclass
class Converted:
    """Per-row results of the conversion (rows of the analysis subset)."""

    totals: list[dict[str, float]]
    water_kg_per_L: np.ndarray
    problem: list[str]


@dataclass(frozen=True)
class _Column:
    """An analyte column read once: what it counts and its unit (of one unit's value)."""

    header: str
    key: str
    solute: Any
    analyte: Analyte
    quantity: Quantity


def convert_analyses(columns: Sequence[Any], values: Mapping[str, np.ndarray],
                     t_C: np.ndarray, ph: np.ndarray, balance: Sequence[str],
                     tables: TableSet, model, pe: np.ndarray | None = None) -> Converted:
    """Convert m analysis rows: *columns* are the plan's analysis columns, *values* their
    cells for these rows, *ph* NaN where not measured, *balance* the ion to balance on
    ("" for none), *pe* the pe a row holds (NaN for none: its fit then links no
    oxidation states). A row that cannot be converted gets its problem, never an
    exception."""
    m = t_C.shape[0]
    problem = [""] * m
    analytes: list[_Column] = []
    alkalinity = np.zeros(m)
    density = np.full(m, np.nan)
    dic: _Column | None = None
    for col in columns:
        v = np.nan_to_num(values[col.header])
        used = v != 0
        where = f"column {col.header!r}"
        try:
            if col.key == "alkalinity":
                alkalinity = _alkalinity(col, v, ph, problem)
            elif col.key == "density":
                density = np.where(used, parse_quantity(f"1 {col.unit}", where)
                                   .with_number(v).value / 1000.0, np.nan)
                _flag(problem, used & ((density < 0.5) | (density > 3.0)),
                      f"{where}: not a plausible density of an aqueous solution")
            elif col.key == "DIC":
                dic = _column_analyte(col, DIC_ANALYTE, DIC_DIMENSIONS, tables)
                if dic.quantity.basis is None and dic.quantity.dimension in (
                        "mass_per_volume", "mass_fraction"):
                    raise RecipeError(where, "a mass of DIC needs its basis",
                                      "write the header as 'DIC [mg/L as C]', or give mmol/L")
            else:
                analytes.append(_column_analyte(col, map_analyte(col.key, tables, where),
                                                ANALYTE_DIMENSIONS, tables))
        except IonwrightError as exc:
            _flag(problem, used, f"{where}: {getattr(exc, 'problem', str(exc))}")
    if dic is not None:
        both = (np.nan_to_num(values[dic.header]) != 0) & (alkalinity != 0)
        _flag(problem, both, "alkalinity and DIC both fix the carbonate total; give one")
        analytes.append(dic)
    seen: dict[str, str] = {}
    for a in analytes:
        if a.solute.name in seen:
            _flag(problem, (np.nan_to_num(values[a.header]) != 0)
                  & (np.nan_to_num(values[seen[a.solute.name]]) != 0),
                  f"column {a.header!r} maps to {a.solute.name}, as column "
                  f"{seen[a.solute.name]!r} does; give each ion once")
        seen.setdefault(a.solute.name, a.header)
    entries = [_analyte_entry(a.solute, a.analyte,
                              a.quantity.with_number(np.nan_to_num(values[a.header])),
                              f"column {a.header!r}", f"[analysis] {a.key}")
               for a in analytes]
    targets = _balance_components(balance, analytes, ph, tables, problem)
    totals: list[dict[str, float]] = [{} for _ in range(m)]
    water = np.full(m, np.nan)
    has_alkalinity = (alkalinity != 0) & np.isfinite(ph)
    held = np.full(m, np.nan) if pe is None else pe
    keys = [(targets[r], bool(has_alkalinity[r]), bool(np.isfinite(held[r])))
            for r in range(m)]
    for key in sorted(set(keys)):
        rows = np.array([r for r in range(m) if keys[r] == key and not problem[r]], dtype=int)
        if not rows.size:
            continue
        try:
            _convert_group(rows, key, entries, t_C, ph, held, density, alkalinity, tables,
                           model, totals, water, problem)
        except RecipeError as exc:   # a balance ion that the held pe links
            _flag(problem, np.isin(np.arange(m), rows), f"{exc.problem}; {exc.hint}")
    return Converted(totals, water, problem)


def _column_analyte(col, analyte: Analyte, dimensions: tuple[str, ...],
                    tables: TableSet) -> _Column:
    where = f"column {col.header!r}"
    quantity = expect(parse_quantity(f"1 {col.unit}", where), dimensions, where)
    return _Column(col.header, col.key, component_solute(analyte.component, tables), analyte,
                   replace(quantity, text=col.header))


def _alkalinity(col, v: np.ndarray, ph: np.ndarray, problem: list[str]) -> np.ndarray:
    """Alkalinity (eq/L) of each row from the column's unit, with the reader's checks."""
    where = f"column {col.header!r}"
    quantity = expect(parse_quantity(f"1 {col.unit}", where), ALKALINITY_DIMENSIONS, where)
    if quantity.dimension == "mass_per_volume":
        if quantity.basis != CALCIUM_CARBONATE:
            raise RecipeError(where, "a mass of alkalinity must be written as CaCO3",
                              "name the column 'alkalinity [mg/L as CaCO3]', or give meq/L")
        eq = (quantity.with_number(v).value / CALCIUM_CARBONATE.molar_mass
              * CALCIUM_CARBONATE_EQUIVALENTS)
    else:
        eq = quantity.with_number(v).value
    given = eq != 0
    _flag(problem, given & ~np.isfinite(ph), f"{where}: alkalinity needs the measured pH "
          "to fix the carbonate system; add the field pH")
    above = ph > ALKALINITY_END_POINT_PH
    _flag(problem, given & above & (eq < 0), f"{where}: above the carbonic-acid end point "
          f"(pH {ALKALINITY_END_POINT_PH:g}) a sample's alkalinity is more than zero")
    _flag(problem, given & ~above & np.isfinite(ph) & (eq > 0), f"{where}: at or below the "
          f"carbonic-acid end point (pH {ALKALINITY_END_POINT_PH:g}) the alkalinity is zero "
          "or negative (Gran)")
    return eq


def _balance_components(balance: Sequence[str], analytes: Sequence[_Column],
                        ph: np.ndarray, tables: TableSet, problem: list[str]) -> list[str]:
    """The component each row balances on ("" for none), checked as the reader does."""
    by_key = {a.key: a.solute.name for a in analytes}
    found: dict[str, str | RecipeError] = {}
    out = []
    for r, key in enumerate(balance):
        if not key:
            out.append("")
            continue
        if key not in found:
            try:
                component = (by_key.get(key)
                             or map_analyte(key, tables, "balance_on").component)
                if tables.components[component].charge == 0:
                    raise RecipeError("balance_on", f"{key!r} ({component}) carries no charge",
                                      "balance on a major ion such as Cl or Na")
                found[key] = component
            except RecipeError as exc:
                found[key] = exc
        hit = found[key]
        if isinstance(hit, RecipeError):
            problem[r] = problem[r] or f"column 'balance_on': {hit.problem}; {hit.hint}"
        elif not np.isfinite(ph[r]):
            problem[r] = problem[r] or ("column 'balance_on': balancing needs the measured "
                                        "pH (without it, the pH itself is found from "
                                        "electroneutrality)")
        out.append(hit if isinstance(hit, str) else "")
    return out


def _convert_group(rows: np.ndarray, key: tuple[str, bool, bool], entries: Sequence[Entry],
                   t_C: np.ndarray, ph: np.ndarray, pe: np.ndarray, density: np.ndarray,
                   alkalinity: np.ndarray, tables: TableSet, model,
                   totals: list[dict[str, float]], water: np.ndarray,
                   problem: list[str]) -> None:
    """Rows that fit the same unknowns: make up and fit, in rounds, until the fitted totals
    settle (as :func:`ionwright.engine._fits.fit_analyses` does for one analysis)."""
    balance, with_alkalinity, linked = key
    unknowns = ((CARBONATE,) if with_alkalinity else ()) + ((balance,) if balance else ())
    picked = [_take(e, rows) for e in entries]
    fitted = np.zeros((rows.size, len(unknowns)))
    jacobian = np.full((rows.size, len(unknowns), len(unknowns)), np.nan)
    settled = np.zeros(rows.size, dtype=bool)
    made = _made_up(picked, unknowns, fitted, rows, t_C, density, tables, fitted_yet=False)
    for round_ in range(DENSITY_ROUNDS if unknowns else 0):
        live = np.flatnonzero(~settled & made.ok)
        if not live.size:
            break
        made = _made_up(picked, unknowns, fitted, rows, t_C, density, tables,
                        fitted_yet=round_ > 0)
        found = np.zeros((live.size, len(unknowns)))
        ended = np.zeros((live.size, len(unknowns), len(unknowns)))
        errors: list = [None] * live.size
        for apart, at in _by_couples_apart(made, live, tables, linked):
            part, here = live[at], rows[live[at]]
            found[at], ended[at], errs = fit_rows(
                made.names, made.totals[part], t_C[here], ph[here],
                alkalinity[here] * (1.0 / made.water[part]) if with_alkalinity else None,
                balance or None, fitted[part] if round_ > 0 else np.zeros_like(fitted[part]),
                tables, model, "analysis", jacobian[part], pe[here] if linked else None, apart)
            for j, e in zip(at.tolist(), errs):
                errors[j] = e
        jacobian[live] = ended
        for j, k in enumerate(live.tolist()):
            if errors[j] is not None:
                problem[rows[k]] = str(errors[j]).replace("\n  hint: ", "; ").splitlines()[0]
                settled[k] = True
                continue
            values = found[j]
            settled[k] = round_ > 0 and bool(np.all(np.abs(values - fitted[k])
                                                    <= SETTLE_TOLERANCE * np.abs(values)))
            fitted[k] = values
    names = [*made.names, *[u for u in unknowns if u not in made.names]]
    for k, r in enumerate(rows.tolist()):
        if problem[r]:
            continue
        if not made.ok[k]:
            problem[r] = ("the analysis leaves no room for water: more is dissolved than a "
                          "litre can hold; check the amounts and their units")
            continue
        row = dict(zip(made.names, made.totals[k].tolist()))
        row.update(zip(unknowns, fitted[k].tolist()))
        if not np.isfinite(ph[r]):
            _protons(row, tables, problem, r)
        totals[r] = {c: row[c] for c in names if c in row}
        water[r] = made.water[k]


@dataclass(frozen=True)
class _MadeUp:
    """Rows made up to a litre: water (kg), component totals (n, names) per kg of water,
    and which rows had room for the water."""

    water: np.ndarray
    names: list[str]
    totals: np.ndarray
    ok: np.ndarray


def _made_up(entries: Sequence[Entry], unknowns: tuple[str, ...], fitted: np.ndarray,
             rows: np.ndarray, t_C: np.ndarray, density: np.ndarray, tables: TableSet,
             fitted_yet: bool) -> _MadeUp:
    """The rows made up to a litre with the *fitted* totals in place of the analytes they
    replace (:func:`ionwright.inputs._analysis.analysis_mixture` for arrays); totals are
    summed per component in order of first mention, as ``Mixture.molalities`` does."""
    kept = [e for e in entries if e.solute.name not in unknowns or not fitted_yet]
    extra = [Entry(component_solute(c, tables), "component", "", "",
                   per_kg_water=fitted[:, u]) for u, c in enumerate(unknowns)] \
        if fitted_yet else []
    parts = [*kept, *extra]
    litre = make_up_litres(parts, t_C[rows], density[rows])
    names = list(dict.fromkeys(e.solute.name for e in parts))
    totals = np.zeros((rows.size, len(names)))
    with np.errstate(divide="ignore", invalid="ignore"):
        for e, moles in zip(parts, litre.moles):
            j = names.index(e.solute.name)
            totals[:, j] = totals[:, j] + moles / litre.water_kg
    return _MadeUp(litre.water_kg, names, totals, litre.ok)


def _protons(row: dict[str, float], tables: TableSet, problem: list[str], r: int) -> None:
    """Protons that make a sample without pH electroneutral (the pH follows), refusing a
    sample whose ions all carry one sign, as the reader does."""
    signs = {np.sign(tables.entry(c).charge) for c, v in row.items() if v > 0}
    missing = [kind for sign, kind in ((-1, "anion"), (1, "cation")) if signs and sign not in signs]
    if missing:
        problem[r] = (f"lists no {missing[0]} and no pH: its ions would be balanced with "
                      f"{'hydroxide' if missing[0] == 'anion' else 'acid'} alone; give the "
                      "measured pH and the other ions")
        return
    row[PROTON] = -sum(tables.entry(c).charge * v for c, v in row.items())


def _take(entry: Entry, rows: np.ndarray) -> Entry:
    """*entry* with its per-row coefficients restricted to *rows*."""
    def pick(value):
        return value[rows] if isinstance(value, np.ndarray) else value
    return replace(entry, absolute=pick(entry.absolute), per_kg_water=pick(entry.per_kg_water),
                   per_litre=pick(entry.per_litre),
                   per_gram_solution=pick(entry.per_gram_solution))


def _flag(problem: list[str], mask: np.ndarray, text: str) -> None:
    for r in np.flatnonzero(mask):
        if not problem[r]:
            problem[r] = text


def _by_couples_apart(made, live: np.ndarray, tables: TableSet, linked: bool):
    """(couples kept apart, positions in *live*) for the rows of *live* that keep the same
    couples as analysed: those whose two forms a row measured, when it holds a pe."""
    if not linked:
        yield frozenset(), np.arange(live.size)
        return
    apart = [analysed_apart(tables, (c for c, v in zip(made.names, made.totals[k]) if v > 0))
             for k in live.tolist()]
    for kept in dict.fromkeys(apart):
        yield kept, np.array([j for j, a in enumerate(apart) if a == kept], dtype=int)
