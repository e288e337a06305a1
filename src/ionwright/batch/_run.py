"""Batch speciation: a table of samples in, the same table with results out.

One row is one sample. Columns are read by their header:

* ``pH`` fixes the pH where a value is given (an empty cell leaves it free);
  ``temperature_C``, ``temperature [C]`` or ``temperature [°C]`` gives the temperature
  (25 °C when there is no such column);
* a plain name (``NaCl``, ``CaCl2``, ``NaHCO3``, ``citric acid``) is an ingredient in mol
  per kg of water;
* ``NAME [UNIT]`` is an analyte of a water analysis (``Ca [mg/L]``, ``SO4 [mmol/L]``,
  ``alkalinity [mg/L as CaCO3]``, ``density [g/mL]``) when NAME is one, else an
  ingredient in that unit (``NaCl [g/L]``); both are converted exactly as a recipe's
  ``[analysis]`` or ``[dissolve]`` would be (:mod:`ionwright.recipe`,
  :mod:`ionwright.analysis`);
* ``pe``, ``Eh [mV]``, ``ORP [mV]`` with a text column ``electrode``, or
  ``dissolved_oxygen [mg/L]`` (or ``[%]``) state a row's redox level as a recipe's
  ``[fix]`` does (:mod:`._redox_columns`); such rows are solved with the oxidation states
  linked and that pe held, and get ``solved pe`` and ``Eh [V]`` (NaN for other rows);
* a column of text that names no ingredient (a sample id, a site) is carried through.

The output holds every input column first, then the solved pH, the ionic strength, the
derived quantities, the molality of the chosen species, saturation indices, the gaps
(``not analysed``, ``below detection limit``), ``status`` (a word of
:mod:`ionwright.status`: converged, a solver status such as max-iterations, or invalid)
and ``message``; rows keep their order and index and none is dropped. Rows
that share a chemical system (the same components present and the same fixed pH or not)
are solved together by one batched solve, with temperature and totals per row; a row
that fails there is retried alone with the careful path before it is marked failed. A
blank cell is "not analysed" and ``"<0.05"`` below a detection limit (:mod:`._cells`);
a row with a bad cell (text that is no number, negative, an unknown unit or ingredient in
its column header) is marked invalid with a message that names the column. Rows that are
water analyses are converted together (:mod:`._analyses`); every row gets the derived
quantities of a single solve (:mod:`._derived_columns`). The public entry point is
:func:`ionwright.solve_batch` (:mod:`._entry`).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Callable, Iterable, Iterator, Mapping, Sequence

import numpy as np

from ..core import _solver as solver
from ..outputs._cautions import (CORROSIVE_HIGH_PH, CORROSIVE_LOW_PH, CORROSIVE_REFERENCE_C,
                                 DRINKING_WATER_ELEMENTS, corrosive_limits, corrosive_text,
                                 drinking_water_text)
from ..outputs._model_numbers import (beyond_model_range, far_beyond_model_range,
                                      far_beyond_text, model_range_notice)
from ..errors import IonwrightError, RecipeError, UnknownNameError
from ..activity._pairs import FORMS_EVERY_SPECIES, IonPairSet, ion_pairs_of
from ..activity._validity import exceeded_rows
from ..core._system import (PROTON, WATER, ChemicalSystem, compile_system, constant_notice,
                            constant_outside, flat_constants_notice)
from ..chemistry._density import Solute, ingredient_solute, volume_L_per_kg_water
from ..inputs._recipe import DEFAULT_TABLES, MOLALITY_CEILING, Recipe, solution_of
from ..engine._totals import component_totals, negative_totals
from ..outputs._solved_samples import SolvedSamples
from ._analyses import convert_analyses
from ._redox_columns import ELECTRODE_HEADER, PE_HEADER, WITH_UNIT, row_levels
from ._cells import (BELOW_LIMIT_COLUMN, DEFAULT_DETECTION_POLICY, NOT_ANALYSED_COLUMN, Gaps,
                     numeric_column, read_cells)
from ._progress import ProgressCallback, RowProgress
from ._derived_columns import DerivedOptions, DerivedTable, derived_headers
from ..core._newton.numerics import RESIDUAL_TOLERANCE
from ..status import CONVERGED, INVALID
from ..chemistry._constants import LN10
from ..core._phases import _take
from ..core._saturation import saturation_indices
from ..outputs._redox import couple_labels, couple_pe_rows
from ..chemistry._redox import ELECTRON, analysed_apart, eh_from_pe, electron_tables
from ..engine._fits import in_linked_columns
from ..outputs._uncertainty import batch_pH_uncertainty
from ..inputs._checks import PLAUSIBLE_PH
from ..inputs._solubility_limits import implausible_rows

if TYPE_CHECKING:
    import pandas as pd

    from ..plugins._registry import Registry
    from ..chemistry._tableset import TableSet

STATUS_COLUMN, MESSAGE_COLUMN = "status", "message"
PH_COLUMN = "solved pH"
PE_COLUMN = "solved pe"
EH_COLUMN = "Eh [V]"


def couple_pe_column(label: str) -> str:
    """Header of the pe a couple ("Fe3+/Fe2+") implies in each row (NaN where a form is
    absent), shown so that redox disequilibrium is visible."""
    return f"pe of {label}"
PH_UNCERTAINTY_COLUMN = "pH uncertainty, constants [1 s.d.]"
IONIC_STRENGTH_COLUMN = "ionic strength [mol/kg]"
TEMPERATURE_NAMES = ("temperature_C", "temperature [C]", "temperature [°C]")
BALANCE_COLUMN = "balance_on"
ENGINES = ("local", "dask")
PARTITION_ROWS = 65_536        # rows per task when the work is spread over a cluster
DEFAULT_TEMPERATURE_C = 25.0
_HEADER_UNIT = re.compile(r"^(?P<name>.*?)\s*\[(?P<unit>[^\]]*)\]\s*$")


def species_column(name: str) -> str:
    """Output column holding the molality of species *name*."""
    return f"m({name}) [mol/kg]"


def saturation_column(name: str) -> str:
    """Output column holding the saturation index of solid *name*."""
    return f"SI({name})"


# -- reading the columns -------------------------------------------------------------------

@dataclass(frozen=True)
class Column:
    """What one input column means: its kind, key and unit, or what is wrong with it."""

    header: str
    kind: str       # ingredient, amount, analysis, pH, temperature, balance_on, label
    key: str = ""                 # ingredient name or analysis key
    unit: str = ""
    components: tuple[str, ...] = ()   # components the column can bring
    problem: str = ""             # set when the column cannot be read at all
    note: str = ""                # how an analyte was read (Fe taken as Fe(II))


@dataclass
class Plan:
    """The columns of a frame and the chemistry they span (fixed by the header alone)."""

    columns: list[Column]
    components: tuple[str, ...]
    species: tuple[str, ...]
    solids: tuple[str, ...]
    table_names: tuple[str, ...] = DEFAULT_TABLES
    derived: DerivedOptions = DerivedOptions()
    couples: tuple[str, ...] = ()      # "oxidised/reduced" of the couples it can report

    def output_columns(self) -> list[str]:
        return [PH_COLUMN, PH_UNCERTAINTY_COLUMN, PE_COLUMN, EH_COLUMN,
                *map(couple_pe_column, self.couples), IONIC_STRENGTH_COLUMN,
                *derived_headers(self.components, self.derived),
                *map(species_column, self.species),
                *map(saturation_column, self.solids), NOT_ANALYSED_COLUMN, BELOW_LIMIT_COLUMN,
                STATUS_COLUMN, MESSAGE_COLUMN]


def plan_columns(headers: Sequence[str], tables: TableSet, species: Sequence[str] | None = None,
                 labels: Iterable[str] = (), text_columns: Iterable[str] = (),
                 ion_pairs: IonPairSet = FORMS_EVERY_SPECIES,
                 derived: DerivedOptions = DerivedOptions()) -> Plan:
    """Read every header; *species* None means every species the columns can form (those
    the activity model's *ion_pairs* set forms).

    *labels* are carried through unread; *text_columns* (columns holding text) that name
    no ingredient are carried through too, so a sample id never invalidates a row.
    """
    labels, text = set(labels), set(text_columns)
    columns = [_read_header(str(h), tables, str(h) in labels, str(h) in text)
               for h in headers]
    present = sorted({c for col in columns for c in col.components} - {PROTON, WATER})
    widest = compile_system(tables, present, ion_pairs)
    allowed = set(widest.components) | {WATER}
    solids = tuple(name for name in sorted(tables.solids)
                   if set(tables.resolve(name, "solids").stoichiometry) <= allowed)
    if species is None:
        chosen = widest.species
    else:
        known = set(tables.components) | set(tables.species)
        for name in species:
            if tables.species_name(name) not in known:
                raise UnknownNameError("species", name, known,
                                       "`ionwright tables show species` lists them")
        chosen = tuple(tables.species_name(name) for name in species)
    plan = Plan(columns, widest.components, tuple(chosen), solids, derived=derived,
                couples=tuple(couple_labels(tables, widest.components)))
    clash = sorted(set(plan.output_columns()) & {c.header for c in columns})
    if clash:
        raise RecipeError("batch input", f"column(s) {', '.join(map(repr, clash))} clash with "
                          "output columns", "rename them in the input")
    return plan


def _read_header(header: str, tables: TableSet, label: bool, text: bool) -> Column:
    from ..inputs._analysis import CARBONATE_KEYS
    from ..inputs._analytes import NAMED_KEYS, map_analyte
    from ..chemistry._ingredients import makeup
    from ..inputs._units import parse_quantity

    if label:
        return Column(header, "label")
    if header == "pH":
        return Column(header, "pH")
    if header == BALANCE_COLUMN:
        return Column(header, "balance_on", header)
    if header == PE_HEADER:
        return Column(header, "redox", header)
    if header == ELECTRODE_HEADER:
        return Column(header, "electrode", header)
    if header in TEMPERATURE_NAMES:
        return Column(header, "temperature")
    match = _HEADER_UNIT.match(header)
    if match is None:
        try:
            made = makeup(header, tables)
        except IonwrightError as exc:
            if text:
                return Column(header, "label")
            return Column(header, "ingredient", header,
                          problem=f"{_first_line(exc)} (name a column to carry through "
                          "unread as a label)")
        return Column(header, "ingredient", header, components=tuple(made.per_mole))
    name, unit = match["name"].strip(), match["unit"].strip()
    where = f"column {header!r}"
    if name in WITH_UNIT:  # read with its unit, cell by cell, as [fix] reads it
        return Column(header, "redox", name, unit)
    try:
        parse_quantity(f"1 {unit}", where)
    except RecipeError as exc:
        return Column(header, "amount", name, unit,
                      problem=f"{unit!r} is not a unit ionwright knows ({exc.hint})")
    if name in NAMED_KEYS or name in CARBONATE_KEYS:
        brings = ("CO3^2-",) if name in CARBONATE_KEYS else ()
        return Column(header, "analysis", name, unit, components=brings)
    try:
        analyte = map_analyte(name, tables, where)
        return Column(header, "analysis", name, unit, components=(analyte.component,),
                      note=analyte.note)
    except RecipeError as exc:
        as_analyte = f"as an analyte: {exc.problem} ({exc.hint})"
    try:
        made = makeup(name, tables)
    except IonwrightError as exc:
        return Column(header, "amount", name, unit,
                      problem=f"{_first_line(exc)}; {as_analyte}")
    return Column(header, "amount", name, unit, components=tuple(made.per_mole))


def _first_line(exc: Exception) -> str:
    return str(exc).replace("\n  hint: ", "; ").splitlines()[0]


# -- from cells to component totals -------------------------------------------------------

@dataclass
class Samples:
    """Per-row inputs of the solve: totals over the plan's components, T, fixed pH."""

    totals: np.ndarray            # (n, c)
    temperature: np.ndarray       # (n,)
    fixed_ph: np.ndarray          # (n,) NaN where free
    problem: list[str]            # (n,) "" or why the row is invalid
    water_kg_per_L: np.ndarray    # (n,) of the row's solution (given or estimated density)
    analysis: np.ndarray          # (n,) bool: rows read as water analyses
    gaps: Gaps                    # blank cells and values below a detection limit
    fixed_pe: np.ndarray          # (n,) NaN where no redox level is stated
    redox_notes: list[str]        # (n,) what reading a row's level found ("" for nothing)


def read_samples(frame: pd.DataFrame, plan: Plan, tables: TableSet, model: str,
                 registry: Registry, detection_limit: str = DEFAULT_DETECTION_POLICY
                 ) -> Samples:
    """Validate every cell and turn each valid row into component totals; blank cells and
    values below a detection limit are read as :mod:`._cells` says."""
    import pandas as pd

    n = len(frame)
    comps = plan.components
    col_of = {c: j for j, c in enumerate(comps)}
    totals = np.zeros((n, len(comps)))
    problem = [""] * n
    temperature = np.full(n, DEFAULT_TEMPERATURE_C)
    fixed_ph = np.full(n, np.nan)
    values: dict[str, np.ndarray] = {}
    gaps = Gaps(n, detection_limit)
    balance = [""] * n
    electrode = [""] * n
    for k, col in enumerate(plan.columns):
        if col.kind == "label":
            continue
        raw = frame.iloc[:, k]
        if col.kind == "balance_on":
            balance = _text_cells(raw, problem, BALANCE_COLUMN, "an ion, e.g. Cl")
            continue
        if col.kind == "electrode":
            electrode = _text_cells(raw, problem, ELECTRODE_HEADER,
                                    "the ORP meter's reference electrode, e.g. "
                                    "'Ag/AgCl, 3 M KCl'")
            continue
        if pd.api.types.is_bool_dtype(raw):  # yes/no values are no amount
            _flag(problem, raw.notna().to_numpy(), lambda r: f"column {col.header!r}: "
                  f"{bool(raw.iloc[r])} is a yes/no value, not a number (name a column to carry "
                  "through unread as a label)")
        cells = read_cells(raw, detection_limit)
        numbers, empty = cells.numbers, cells.blank
        if col.kind in ("pH", "temperature", "redox"):
            _flag(problem, cells.below, lambda r: f"column {col.header!r}: {raw.iloc[r]!r} "
                  f"is a detection limit, not a {col.key or col.kind}")
        else:
            gaps.add(col.header, cells)
        _flag(problem, cells.unreadable, lambda r: f"column {col.header!r}: {raw.iloc[r]!r} "
              "is not a number (leave the cell blank when it was not analysed, or write "
              "'<0.05' for below a detection limit of 0.05)")
        bad = ~empty & ~cells.unreadable & ~np.isfinite(numbers)
        _flag(problem, bad, lambda r: f"column {col.header!r}: {numbers[r]!r} is not finite")
        if col.problem:  # an unreadable column spoils every row that uses it
            _flag(problem, ~empty & (numbers != 0), lambda r: f"column {col.header!r}: "
                  f"{col.problem}")
        if col.kind == "pH":
            lo, hi = PLAUSIBLE_PH
            _flag(problem, np.isfinite(numbers) & ((numbers < lo) | (numbers > hi)),
                  lambda r: f"column {col.header!r}: {numbers[r]:g} is not a plausible pH")
            fixed_ph = np.where(np.isfinite(numbers), numbers, np.nan)
        elif col.kind == "temperature":
            from ..chemistry._water import VALID_RANGE_C
            lo, hi = VALID_RANGE_C
            _flag(problem, np.isfinite(numbers) & ((numbers < lo) | (numbers > hi)),
                  lambda r: f"column {col.header!r}: {numbers[r]:g} °C is outside "
                  f"{lo:g}–{hi:g} °C")
            temperature = np.where(np.isfinite(numbers), numbers, DEFAULT_TEMPERATURE_C)
            gaps.note(empty, f"temperature not given: {DEFAULT_TEMPERATURE_C:g} °C assumed")
        elif col.key != "alkalinity" and col.kind != "redox":  # Gran alkalinity, Eh < 0
            _flag(problem, numbers < 0, lambda r: f"column {col.header!r}: {numbers[r]:g} is "
                  "negative; amounts must be ≥ 0")
            if col.kind == "ingredient":  # plain mol/kg, as a recipe's plausibility check
                _flag(problem, numbers > MOLALITY_CEILING, lambda r: f"column {col.header!r}: "
                      f"{numbers[r]:g} mol per kg of water is beyond what any solution holds "
                      f"(above {MOLALITY_CEILING:g} mol/kg); check the amount and its unit")
        values[col.header] = numbers
    plain = [c for c in plan.columns if c.kind == "ingredient" and not c.problem]
    converted = [c for c in plan.columns if c.kind in ("amount", "analysis")]
    by_recipe = np.array([bool(b) for b in balance], dtype=bool)
    measured = by_recipe.copy()   # rows that are water analyses, converted together
    for col in converted:
        given = np.nan_to_num(values[col.header]) != 0
        by_recipe |= given
        measured = (measured | given) if col.kind == "analysis" else measured & ~given
    from ..chemistry._ingredients import makeup

    for col in plain:  # the same additions, in the same order, as component_totals
        amount = np.nan_to_num(values[col.header])
        for comp, nu in makeup(col.key, tables).per_mole.items():
            if comp in col_of:
                totals[:, col_of[comp]] += nu * amount
    water = 1.0 / volume_L_per_kg_water(
        [_solute(c.key, tables) for c in plain],
        np.stack([np.nan_to_num(values[c.header]) for c in plain], axis=1)
        if plain else np.zeros((n, 0)), temperature)
    analysis = np.zeros(n, dtype=bool)
    measured &= np.array([not p for p in problem], dtype=bool)
    for col in plain:  # a row with plain ingredients is a recipe, not an analysis
        measured &= ~(np.nan_to_num(values[col.header]) != 0)
    fixed_pe, redox_notes = row_levels([c for c in plan.columns if c.kind == "redox"],
                                       values, electrode, temperature, fixed_ph, tables,
                                       problem)
    measured &= np.array([not p for p in problem], dtype=bool)
    _analysis_rows(np.flatnonzero(measured), plan, values, temperature, fixed_ph, fixed_pe,
                   balance, tables, model, registry, problem, totals, water, analysis)
    for r, recipe in _recipe_rows(plan, values, by_recipe & ~measured, problem, tables, model,
                                  registry, balance, fixed_pe):
        row_totals, _ = component_totals(recipe, tables)
        totals[r] = [row_totals.get(c, 0.0) for c in comps]
        temperature[r] = recipe.temperature_C
        fixed_ph[r] = recipe.fix.get("pH", math.nan)
        water[r] = solution_of(recipe, tables).water_kg_per_L
        analysis[r] = recipe.from_analysis
    _flag(problem, negative_totals(comps, totals),
          lambda r: "the ingredients give a negative total of a component")
    return Samples(totals, temperature, fixed_ph, problem, water, analysis, gaps, fixed_pe,
                   redox_notes)


def _text_cells(raw, problem: list[str], header: str, what: str) -> list[str]:
    """The text of each cell of a column of names (``balance_on``, ``electrode``), ""
    where blank; a cell that is no text gives its row a problem."""
    import pandas as pd

    out = []
    for r, value in enumerate(raw.tolist()):
        if (not isinstance(value, str) and pd.isna(value)) \
                or (isinstance(value, str) and not value.strip()):
            out.append("")
        elif isinstance(value, str):
            out.append(value.strip())
        else:
            out.append("")
            if not problem[r]:
                problem[r] = (f"column {header!r}: {value!r} must name {what} (or leave "
                              "it blank)")
    return out


def _analysis_rows(rows: np.ndarray, plan: Plan, values: Mapping[str, np.ndarray],
                   temperature: np.ndarray, fixed_ph: np.ndarray, fixed_pe: np.ndarray,
                   balance: Sequence[str],
                   tables: TableSet, model: str, registry: Registry, problem: list[str],
                   totals: np.ndarray, water: np.ndarray, analysis: np.ndarray) -> None:
    """Convert the water-analysis *rows* together (:mod:`._analyses`) into *totals*,
    *water* per litre and *analysis*; a row that cannot be converted gets its problem."""
    if not rows.size:
        return
    columns = [c for c in plan.columns if c.kind == "analysis" and not c.problem]
    converted = convert_analyses(columns, {c.header: values[c.header][rows] for c in columns},
                                 temperature[rows], fixed_ph[rows],
                                 [balance[r] for r in rows], tables, registry.model(model),
                                 fixed_pe[rows])
    index = {c: j for j, c in enumerate(plan.components)}
    for k, r in enumerate(rows):
        if converted.problem[k]:
            problem[r] = converted.problem[k]
            continue
        for comp, value in converted.totals[k].items():
            totals[r, index[comp]] = value
        water[r] = converted.water_kg_per_L[k]
        analysis[r] = True


def _recipe_rows(plan: Plan, values: Mapping[str, np.ndarray], by_recipe: np.ndarray,
                 problem: list[str], tables: TableSet, model: str, registry: Registry,
                 balance: Sequence[str], fixed_pe: np.ndarray) -> Iterator[tuple[int, Recipe]]:
    """(row, complete recipe) of every valid row read as a recipe or an analysis; the
    analyses' fits are resolved together (:func:`ionwright.engine._fits.fit_analyses`),
    a row whose reading or fit fails gets its problem instead."""
    from ..engine._fits import fit_analyses
    from ..engine._resolve import resolve
    from ..inputs._analysis import AnalysisFit

    pending: list[tuple[int, Recipe, AnalysisFit]] = []
    for r in np.flatnonzero(by_recipe).tolist():
        if problem[r]:
            continue
        try:
            recipe = _recipe_row(plan, values, r, tables, model, registry, balance[r],
                                 float(fixed_pe[r]))
            if isinstance(recipe.pending, AnalysisFit):
                pending.append((r, recipe, recipe.pending))
                continue
            yield r, resolve(recipe, registry)
        except IonwrightError as exc:
            problem[r] = _row_message(exc, plan)
    fitted = fit_analyses([(recipe, fit) for _, recipe, fit in pending], registry)
    for (r, _, _), found in zip(pending, fitted):
        if isinstance(found, IonwrightError):
            problem[r] = _row_message(found, plan)
        else:
            yield r, found


def _solute(name: str, tables: TableSet) -> Solute:
    """What one mole of ingredient *name* weighs and occupies (for the density)."""
    from ..chemistry._ingredients import makeup

    made = makeup(name, tables)
    return ingredient_solute(made.name, made.formula, made.per_mole, tables)


def _flag(problem: list[str], mask: np.ndarray, message) -> None:
    """Give each row of *mask* that has no problem yet the problem *message(row)*."""
    for r in np.flatnonzero(mask):
        if not problem[r]:
            problem[r] = message(r)


def _recipe_row(plan: Plan, values: Mapping[str, np.ndarray], r: int, tables: TableSet,
                model: str, registry: Registry, balance_on: str = "",
                pe: float = math.nan) -> Recipe:
    """The recipe of row *r* read as a recipe or an analysis (balanced on the ion
    *balance_on* when given, holding *pe* when finite), as read: what needs an
    equilibrium is still pending."""
    from ..inputs._recipe import read_recipe

    cells = {c.header: float(values[c.header][r]) for c in plan.columns if c.header in values}
    analysis: dict[str, Any] = {c.key: f"{cells[c.header]!r} {c.unit}" for c in plan.columns
                if c.kind == "analysis" and cells[c.header] > 0}
    dissolve = {c.key: (float(cells[c.header]) if c.kind == "ingredient"
                        else f"{cells[c.header]!r} {c.unit}")
                for c in plan.columns if c.kind in ("ingredient", "amount")
                and cells[c.header] > 0}
    t = next((float(cells[c.header]) for c in plan.columns if c.kind == "temperature"
              and math.isfinite(cells[c.header])), DEFAULT_TEMPERATURE_C)
    ph = next((cells[c.header] for c in plan.columns if c.kind == "pH"), math.nan)
    data: dict[str, Any] = {"activity_model": model, "tables": list(plan.table_names)}
    if balance_on:
        if dissolve or not analysis:
            raise RecipeError(f"column {BALANCE_COLUMN!r}", "balance_on applies to analyses "
                              "(columns such as 'Ca [mg/L]')", "leave the cell blank for a "
                              "row of ingredients")
        analysis["balance_on"] = balance_on
    if analysis:
        if dissolve:
            raise RecipeError("row", "combines analysis columns with ingredient amounts",
                              "give a row either as an analysis or as a recipe")
        analysis["temperature_C"] = t
        if math.isfinite(ph):
            analysis["pH"] = float(ph)
        if math.isfinite(pe):
            analysis["pe"] = pe
        data["analysis"] = analysis
    else:
        data.update(temperature_C=t, dissolve=dissolve)
        fix = {k: v for k, v in (("pH", float(ph)), ("pe", pe)) if math.isfinite(v)}
        if fix:
            data["fix"] = fix
    return read_recipe(data, registry)


def _row_message(exc: IonwrightError, plan: Plan) -> str:
    """The error of a row's conversion, naming its column when the error names a key."""
    text = _first_line(exc)
    where = getattr(exc, "where", "")
    for col in plan.columns:
        if col.key and (where.endswith(f" {col.key}") or f"{col.key!r}" in where):
            return f"column {col.header!r}: {getattr(exc, 'problem', text)}"
    return text


# -- solving ------------------------------------------------------------------------------

@dataclass
class Solved:
    """Per-row outputs, filled group by group."""

    ph: np.ndarray
    ionic_strength: np.ndarray
    molality: np.ndarray          # (n, chosen species)
    saturation: np.ndarray        # (n, solids)
    status: np.ndarray
    message: np.ndarray           # (n,) of str
    derived: DerivedTable
    ph_uncertainty: np.ndarray    # (n,) from the constants' uncertainties
    pe: np.ndarray                # (n,) NaN for rows without a redox level
    eh: np.ndarray                # (n,) V against the standard hydrogen electrode
    couples_pe: dict[str, np.ndarray]   # "oxidised/reduced" → (n,) the pe it implies


def solve_samples(samples: Samples, plan: Plan, tables: TableSet, model_name: str,
                  registry: Registry, threads: int | None = None,
                  progress: RowProgress | None = None) -> Solved:
    """Solve every valid row, one batched solve per chemical system, telling *progress*
    as rows finish."""
    n = samples.totals.shape[0]
    out = Solved(np.full(n, np.nan), np.full(n, np.nan),
                 np.full((n, len(plan.species)), np.nan), np.full((n, len(plan.solids)), np.nan),
                 np.full(n, INVALID, dtype=object), np.array(samples.problem, dtype=object),
                 DerivedTable(n, plan.components, plan.derived), np.full(n, np.nan),
                 np.full(n, np.nan), np.full(n, np.nan),
                 {label: np.full(n, np.nan) for label in plan.couples})
    model = registry.model(model_name)
    proton = plan.components.index(PROTON)
    present = samples.totals > 0
    present[:, proton] = False
    fixed = np.isfinite(samples.fixed_ph)
    held_pe = np.isfinite(samples.fixed_pe)
    valid = np.array([not p for p in samples.problem], dtype=bool)
    progress = progress or RowProgress(n, None)
    progress.advance(int(np.count_nonzero(~valid)))  # invalid rows need no solve
    keys = np.concatenate([present, fixed[:, None], held_pe[:, None],
                           samples.analysis[:, None]], axis=1)
    candidates = np.flatnonzero(valid)
    if not candidates.size:
        return _with_gaps(out, samples.gaps)
    _, group = np.unique(_row_codes(keys[candidates]), return_inverse=True)
    order = np.argsort(group, kind="stable")
    bounds = np.flatnonzero(np.diff(group[order])) + 1
    for rows in np.split(candidates[order], bounds):
        comps = [plan.components[j] for j in np.flatnonzero(present[rows[0]])]
        group_tables, names, totals = tables, list(plan.components), samples.totals[rows]
        if held_pe[rows[0]]:   # the oxidation states linked, the electron held
            apart = analysed_apart(tables, comps) if samples.analysis[rows[0]] else frozenset()
            group_tables = electron_tables(tables, apart)
            names, totals = in_linked_columns(plan.components, totals, group_tables)
            comps = [c for j, c in enumerate(names)
                     if c not in (PROTON, ELECTRON) and totals[0, j] > 0] + [ELECTRON]
        system = compile_system(group_tables, comps, ion_pairs_of(model))
        aligned = np.zeros((len(rows), system.n_components))
        for j, c in enumerate(system.components):
            if c in names:
                aligned[:, j] = totals[:, names.index(c)]
        keep = _plausible(system, rows, aligned, samples, group_tables, out)
        progress.advance(int(np.count_nonzero(~keep)))
        if not keep.any():
            continue
        rows, aligned = rows[keep], aligned[keep]
        counter = progress.group(len(rows))
        _solve_group(system, rows, aligned, samples, plan, group_tables, model,
                     bool(fixed[rows[0]]), out, threads, counter.chunk)
        counter.close()
    return _with_gaps(out, samples.gaps)


def _plausible(system: ChemicalSystem, rows: np.ndarray, totals: np.ndarray, samples: Samples,
               tables: TableSet, out: Solved) -> np.ndarray:
    """Which of *rows* (with *totals* over the system's components) to solve: those no
    solution could hold (a soluble salt at ten times its solubility product, or an ionic
    strength past any model) are marked invalid, as a single solve refuses them
    (inputs/_solubility_limits.py)."""
    said = implausible_rows(system.components, system.strong_ion_charges, tables, totals,
                            samples.temperature[rows])
    refused = np.array([bool(m) for m in said], dtype=bool)
    for r, message in zip(rows[refused], np.array(said, dtype=object)[refused]):
        out.message[r] = message
    return ~refused


def _with_gaps(out: Solved, gaps: Gaps) -> Solved:
    """*out* with each row's gaps (blank cells, values below a limit) leading its message."""
    for r in range(len(out.message)):
        said = gaps.message(r)
        if said:
            out.message[r] = f"{said}; {out.message[r]}" if out.message[r] else said
    return out


def _solve_group(system: ChemicalSystem, rows: np.ndarray, totals: np.ndarray,
                 samples: Samples, plan: Plan, tables: TableSet, model, fixed: bool,
                 out: Solved, threads: int | None = None,
                 on_chunk: Callable[[int], None] | None = None) -> None:
    """Solve the *rows* of one chemical system, their *totals* (rows, components of
    *system*) at once, and fill their outputs in *out*."""
    t = samples.temperature[rows]
    pinned = np.full(totals.shape, np.nan)
    if fixed:
        pinned[:, 0] = -samples.fixed_ph[rows]
    electron = (system.components.index(ELECTRON) if ELECTRON in system.components
                else None)
    if electron is not None:
        pinned[:, electron] = -samples.fixed_pe[rows]
    bound = model.bind(system.properties, t)
    eq = solver.solve(system, totals, bound, pinned, threads=threads, on_chunk=on_chunk)
    status = eq.status.copy()
    for k in np.flatnonzero(status != CONVERGED):  # retry alone, carefully
        alone = solver.solve(system, totals[k:k + 1], model.bind(system.properties, t[k:k + 1]),
                             pinned[k:k + 1], method="careful")
        if alone.status[0] == CONVERGED:
            for name in ("log_activity", "molality", "ln_gamma", "ionic_strength",
                         "ln_water_activity", "residual", "iterations"):
                getattr(eq, name)[k] = getattr(alone, name)[0]
        status[k] = alone.status[0]
    ok = status == CONVERGED
    good = rows[ok]
    out.ph[good] = -eq.log_activity[ok, 0] / LN10
    converged = np.flatnonzero(ok)
    out.ph_uncertainty[good] = batch_pH_uncertainty(
        system, tables, _take(eq, converged), solver.bound_slice(bound, converged), fixed,
        electron is not None)
    if electron is not None:
        out.pe[good] = -eq.log_activity[ok, electron] / LN10
        out.eh[good] = eh_from_pe(out.pe[good], t[ok])
    out.ionic_strength[good] = eq.ionic_strength[ok]
    index = {name: i for i, name in enumerate(system.species)}
    for j, name in enumerate(plan.species):
        out.molality[good, j] = eq.molality[ok, index[name]] if name in index else 0.0
    _saturation(system, tables, eq, ok, t, plan, out.saturation, good)
    found = couple_pe_rows(system, tables, t[ok], eq.molality[ok],
                           _log10_activities(system, eq, ok), eq.ln_water_activity[ok] / LN10)
    for label, pe in found.items():
        if label in out.couples_pe:
            out.couples_pe[label][good] = pe
    solved = SolvedSamples(system, tables, model, t[ok], eq.log_activity[ok], eq.molality[ok],
                           eq.ln_gamma[ok], eq.ionic_strength[ok], eq.ln_water_activity[ok],
                           totals[ok], samples.water_kg_per_L[good], samples.analysis[good])
    flagged = []
    for text, mask in out.derived.fill(good, solved):
        over_group = np.zeros(len(rows), dtype=bool)
        over_group[ok] = mask
        flagged.append((text, over_group))
    metals = _drinking_water_flag(system, tables, totals)
    if metals is not None:
        flagged.append(metals)
    for note in set(samples.redox_notes[r] for r in rows) - {""}:   # an ORP extrapolated
        flagged.append((note, np.array([samples.redox_notes[r] == note for r in rows])))
    for col in plan.columns:  # an oxidation state assumed, as the single analysis says
        if col.note and col.components[0] in system.components:
            j = system.components.index(col.components[0])
            flagged.append((f"column {col.header!r}: {col.note}", totals[:, j] > 0))
    out.status[rows] = status  # the solver's own word where it did not converge
    out.message[rows] = _notes(system, model, out.ph[rows], out.ionic_strength[rows], t, ok,
                               eq.molality, _log10_hydroxide(system, tables, eq), flagged)
    for k in np.flatnonzero(~ok):
        out.message[rows[k]] = (f"the solver stopped with status {status[k]!r} after "
                                f"{int(eq.iterations[k])} iterations (worst relative "
                                f"residual {eq.residual[k]:.3g}, tolerance "
                                f"{RESIDUAL_TOLERANCE:.3g}), also when retried alone "
                                "with the careful path; check that the totals are possible")


def _log10_activities(system: ChemicalSystem, eq: solver.Equilibrium, ok: np.ndarray
                      ) -> np.ndarray:
    """log10 a (rows, species) of the converged rows *ok* (−inf for a zero molality)."""
    with np.errstate(divide="ignore"):
        return np.log10(eq.molality[ok]) + eq.ln_gamma[ok] / LN10


def _saturation(system: ChemicalSystem, tables: TableSet, eq: solver.Equilibrium,
                ok: np.ndarray, t: np.ndarray, plan: Plan, target: np.ndarray,
                good: np.ndarray) -> None:
    """SI = log10(IAP/Ksp), added up in the order :class:`ionwright.Result` uses."""
    found = saturation_indices(system, tables, eq.log_activity[ok], eq.ln_water_activity[ok],
                               t[ok], plan.solids)
    for j, name in enumerate(plan.solids):
        if name in found:
            target[good, j] = found[name]


def _drinking_water_flag(system: ChemicalSystem, tables: TableSet, totals: np.ndarray
                         ) -> tuple[str, np.ndarray] | None:
    """(caution, rows) for rows holding lead, copper, cadmium or arsenic, or None."""
    found = {e: [j for j, c in enumerate(system.components)
                 if e in tables.components[c].elements]
             for e in DRINKING_WATER_ELEMENTS}
    found = {e: cols for e, cols in found.items() if cols}
    if not found:
        return None
    rows = np.any(totals[:, [j for cols in found.values() for j in cols]] > 0, axis=1)
    return drinking_water_text(found), rows


def _notes(system: ChemicalSystem, model, ph: np.ndarray, ionic: np.ndarray, t: np.ndarray,
           ok: np.ndarray, molality: np.ndarray, log10_oh: np.ndarray,
           flagged: Sequence[tuple[str, np.ndarray]] = ()) -> np.ndarray:
    """Per-row warnings: model range (in general and for the kinds of solution the model
    states, :mod:`ionwright.activity._validity`), corrosive pH, constants used outside
    their range, and the *flagged* (text, row mask) cautions and data-quality notes.

    Each kind of note is a column of a flag matrix; rows sharing a pattern of flags
    share one joined message, so the text is built once per pattern, not per row.
    """
    texts: list[str] = []
    flags: list[np.ndarray] = []
    far = far_beyond_model_range(model, ionic)
    texts += [model_range_notice(model).text, far_beyond_text(model)]
    flags += [ok & beyond_model_range(model, ionic) & ~far, ok & far]
    limits = getattr(model, "validity", ())
    if limits:
        hits = exceeded_rows(limits, system.properties, molality, t)
        for r, rule in enumerate(limits):
            texts.append(f"{model.name}: within {rule.promise} only to I ≈ "
                         f"{rule.max_ionic_strength:g} mol/kg where {rule.label} are main "
                         f"ions{rule.temperatures} ({rule.evidence})")
            flags.append(ok & hits[:, r])
    h_limit, oh_limit = corrosive_limits()
    texts.append(f"CAUTION: corrosive: hydrogen-ion activity at or above that of pH "
                 f"{CORROSIVE_LOW_PH:g}, or hydroxide activity at or above that of pH "
                 f"{CORROSIVE_HIGH_PH:g} at {CORROSIVE_REFERENCE_C:g} °C; {corrosive_text()}")
    flags.append(ok & ((-ph >= h_limit) | (np.nan_to_num(log10_oh, nan=-np.inf) >= oh_limit)))
    for text, mask in flagged:
        texts.append(text)
        flags.append(ok & mask)
    checks = system.temperature_checks()
    for name, logk in checks:
        if logk.range_C is not None:
            texts.append(constant_notice(name, logk).text)
            flags.append(ok & constant_outside(logk, t))
    flat = [(name, logk) for name, logk in checks if logk.range_C is None]
    if flat:  # one rule for all of them: away from 25 °C
        texts.append(flat_constants_notice([name for name, _ in flat]).text)
        flags.append(ok & constant_outside(flat[0][1], t))
    matrix = np.stack(flags, axis=1)
    _, first, which = np.unique(_row_codes(matrix), return_index=True, return_inverse=True)
    joined = np.array(["; ".join(t for t, f in zip(texts, matrix[r]) if f) for r in first],
                      dtype=object)
    return joined[which]


def _log10_hydroxide(system: ChemicalSystem, tables: TableSet, eq) -> np.ndarray:
    """log10 a(OH-) of every sample (NaN without a hydroxide species)."""
    from ..chemistry._formula import parse_formula

    hydroxide = parse_formula("OH-")
    found = [i for i, name in enumerate(system.species)
             if parse_formula(tables.entry(name).formula) == hydroxide]
    if not found:
        return np.full(eq.molality.shape[0], np.nan)
    i = found[0]
    with np.errstate(divide="ignore"):
        return (np.log(eq.molality[:, i]) + eq.ln_gamma[:, i]) / LN10


def _row_codes(flags: np.ndarray) -> np.ndarray:
    """One sortable code per row of a boolean matrix (equal rows, equal codes)."""
    packed = np.packbits(flags, axis=1)
    width = max(8, -(-packed.shape[1] // 8) * 8)
    padded = np.zeros((flags.shape[0], width), dtype=np.uint8)
    padded[:, :packed.shape[1]] = packed
    if width == 8:
        return padded.view(np.uint64).ravel()
    return padded.view(np.dtype((np.void, width))).ravel()


# -- one frame --------------------------------------------------------------------------------

def _check_frame(frame: Any) -> None:
    """Refuse what is not a table of samples: not a DataFrame, or a column twice."""
    import pandas as pd

    if not isinstance(frame, pd.DataFrame):
        raise RecipeError("frame", f"a {type(frame).__name__} is not a table of samples",
                          "give a pandas DataFrame, one row a sample, e.g. "
                          "pd.DataFrame({'NaCl': [0.01, 0.02]})")
    twice = sorted({str(c) for c in frame.columns[frame.columns.duplicated()]})
    if twice:
        raise RecipeError("frame", f"column(s) {', '.join(map(repr, twice))} appear twice",
                          "rename or drop the copies: each column is read once")


def _solve_frame(frame: pd.DataFrame, *, species: Sequence[str] | None, model: str,
                 tables: Sequence[str], labels: Iterable[str], threads: int | None = None,
                 registry: Registry | None = None,
                 text_columns: Sequence[str] | None = None,
                 derived: DerivedOptions = DerivedOptions(),
                 detection_limit: str = DEFAULT_DETECTION_POLICY,
                 progress: ProgressCallback | None = None) -> pd.DataFrame:
    """The solve of one frame; *text_columns* None finds the columns of text in it, a list
    fixes them (the command line reads them once, from a file's first chunk, so that every
    chunk reads its columns alike)."""
    import pandas as pd

    from ..plugins._table_sets import load_tables
    from ..plugins._registry import default_registry

    registry = registry or default_registry()
    chosen = registry.model(model)  # an unknown model is an error of the call, not of a row
    table_set = load_tables(list(tables), registry)
    text = text_columns if text_columns is not None else text_columns_of(frame)
    plan = plan_columns([str(h) for h in frame.columns], table_set, species, labels,
                        [str(h) for h in text], ion_pairs_of(chosen), derived)
    plan.table_names = tuple(tables)
    samples = read_samples(frame, plan, table_set, model, registry, detection_limit)
    solved = solve_samples(samples, plan, table_set, model, registry, threads,
                           RowProgress(len(frame), progress))
    results = {PH_COLUMN: solved.ph, PH_UNCERTAINTY_COLUMN: solved.ph_uncertainty,
               PE_COLUMN: solved.pe, EH_COLUMN: solved.eh,
               **{couple_pe_column(label): pe for label, pe in solved.couples_pe.items()},
               IONIC_STRENGTH_COLUMN: solved.ionic_strength}
    results.update(solved.derived.columns)
    for j, name in enumerate(plan.species):
        results[species_column(name)] = solved.molality[:, j]
    for j, name in enumerate(plan.solids):
        results[saturation_column(name)] = solved.saturation[:, j]
    results.update(samples.gaps.columns())
    results[STATUS_COLUMN] = solved.status.astype(str)
    results[MESSAGE_COLUMN] = solved.message
    added = pd.DataFrame(results, index=frame.index)
    return pd.concat([frame, added], axis=1)


def text_columns_of(frame: pd.DataFrame) -> list[str]:
    """Columns holding text only (sample ids, sites): carried through unless they name an
    ingredient or analyte."""
    import pandas as pd

    return [str(h) for h in frame.columns if not pd.api.types.is_numeric_dtype(frame[h])
            and not pd.api.types.is_bool_dtype(frame[h])
            and pd.to_numeric(frame[h], errors="coerce").isna().all()
            and frame[h].notna().any() and not numeric_column(frame[h])]
