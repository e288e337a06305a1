"""Sweeps: a titration, a dilution series, a temperature series or a pH series, in one batch.

Every point of a sweep is one sample of a single vectorised solve. Along a titration the
slope dpH/dV and the buffer capacity β = dC_b/dpH come from the implicit-function theorem
at each converged point (:mod:`ionwright.sensitivity`), not from differences of solves;
equivalence points are the inflections of the curve, the local maxima of |dpH/dV|, refined
on finer batches around each one. A sweep stops where the solution would leave the
activity model's range of ionic strength, or the solver fails; the points before are kept
and the message says where and why.

References
----------
Van Slyke, D.D. (1922) J. Biol. Chem. 52, 525–570 (buffer value).
Gran, G. (1952) Analyst 77, 661–671, and Skoog, D.A., West, D.M. & Holler, F.J. Fundamentals
of Analytical Chemistry (end points at the maximum of dpH/dV).
"""

from __future__ import annotations

import csv
import io
import math
import numbers
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field, replace
from functools import cached_property
from pathlib import Path
from typing import Any

import numpy as np

from ..notices import INPUT, VALIDITY, Notice, texts
from ..outputs._cautions import dissolved_levels, drinking_water_caution
from ..outputs._model_numbers import beyond_model_range
from ..status import succeeded
from ..chemistry._density import component_solute, ingredient_solute
from ..engine._compiled import CompiledRecipe
from ..engine._solve import compile_recipe
from ._closed_sample import closed_sample_notes
from ._target import read_stock, split_name_and_quantity
from ..errors import RecipeError, names_its_arguments
from ..chemistry._ingredients import makeup
from ..core._phases import PhaseEquilibrium, _take
from ..plugins._registry import Registry
from ..inputs._mixing import Entry, mix
from ..inputs._recipe import Recipe, solution_of
from ..core._sensitivity import buffer_capacity, pH_change
from ..inputs._units import expect, parse_quantity
from ..chemistry._water import VALID_RANGE_C
from ..core._saturation import saturation_indices
from ..outputs._osmolality import WATER_KG_PER_MOL, osmotic_coefficients
from ..outputs._uncertainty import Propagation, propagation

DEFAULT_POINTS = 101
DEFAULT_SPECIES = 6
REFINE_ROUNDS = 3
REFINE_POINTS = 17
#: A local maximum of |dpH/dV| counts as an equivalence point when it stands this many
#: times above the lower of the minima on either side (a visible inflection).
PROMINENCE = 3.0


@dataclass
class Sweep:
    """The table of a sweep: one row per point, in the order of the swept variable."""

    kind: str                         # "titration", "dilution", "temperature", "pH"
    variable: str                     # column name of the swept quantity, with its unit
    values: np.ndarray                # (n,) the swept quantity at the points kept
    bench: CompiledRecipe
    state: PhaseEquilibrium           # the points kept
    species: tuple[str, ...]
    beta: np.ndarray                  # (n,) mol/kg per pH
    slope: np.ndarray | None = None   # (n,) dpH per unit of the variable (titrations)
    equivalence: list[dict[str, float]] = field(default_factory=list)
    saturation: dict[str, np.ndarray] = field(default_factory=dict)
    notices: list[Notice] = field(default_factory=list)
    stopped: str = ""                 # why the sweep ended early ("" if complete)
    titrant: str = ""                 # the titrant of a titration, e.g. "NaOH 0.1 mol/L"

    @property
    def warnings(self) -> list[str]:
        """The texts of :attr:`notices`."""
        return texts(self.notices)

    @property
    def complete(self) -> bool:
        return not self.stopped

    @property
    def pH(self) -> np.ndarray:
        return self.bench.pH(self.state)

    @property
    def ionic_strength(self) -> np.ndarray:
        return self.state.equilibrium.ionic_strength

    @cached_property
    def _propagation(self) -> Propagation:
        """The constants' uncertainty carried to every point (outputs/_uncertainty.py)."""
        return propagation(self.bench.system, self.bench.tables, self.state,
                           tuple(self.saturation))

    @property
    def pH_uncertainty(self) -> np.ndarray:
        """Standard uncertainty of the pH at each point from the constants (zero where
        the pH is held)."""
        return self._propagation.pH()

    def saturation_uncertainty(self, solid: str) -> np.ndarray:
        """Standard uncertainty of the saturation index of *solid* at each point."""
        return self._propagation.saturation_index(self.bench.tables, solid)

    @cached_property
    def osmotic_coefficient(self) -> np.ndarray:
        """φ at each point: the model's own water activity, or the Gibbs–Duhem estimate
        from its activity coefficients (outputs/_osmolality.py), as a single result."""
        eq = self.state.equilibrium
        return osmotic_coefficients(self.bench.model, self.bench.system.properties,
                                    eq.molality, self.state.t_C, eq.ln_water_activity)

    @property
    def osmolality(self) -> np.ndarray:
        """mOsm per kg of water at each point: 1000 φ Σm."""
        return 1000.0 * self.osmotic_coefficient * self.state.equilibrium.molality.sum(axis=1)

    @property
    def water_activity(self) -> np.ndarray:
        """a(H2O) = exp(−M_w φ Σm) at each point."""
        return np.exp(-WATER_KG_PER_MOL * self.osmolality / 1000.0)

    def molality(self, species: str) -> np.ndarray:
        """Molality of *species* at each point (zero where one of its components is absent)."""
        system = self.bench.system
        i = system.index(species)
        values = self.state.equilibrium.molality[:, i]
        if self.state.traced is None:
            return values
        absent = np.any(self.state.traced[:, system.nu[i] != 0], axis=1)
        return np.where(absent, 0.0, values)

    def fraction(self, component: str) -> dict[str, np.ndarray]:
        """Share of *component*'s dissolved total in each species that carries it."""
        system = self.bench.system
        j = system.components.index(component)
        carried = self.state.equilibrium.molality * system.nu[:, j][None, :]
        total = carried.sum(axis=1)
        return {system.species[i]: carried[:, i] / total
                for i in np.flatnonzero(system.nu[:, j] > 0)}

    def rows(self) -> list[dict[str, Any]]:
        out = []
        u_pH = self.pH_uncertainty
        u_si = {name: self.saturation_uncertainty(name) for name in self.saturation}
        osmolality, water = self.osmolality, self.water_activity
        for k, value in enumerate(self.values):
            row = {self.variable: float(value), "pH": float(self.pH[k]),
                   "pH_uncertainty": float(u_pH[k]),
                   "ionic_strength": float(self.ionic_strength[k]),
                   "buffer_capacity_mol_per_kg_per_pH": float(self.beta[k]),
                   "osmolality_mOsm_per_kg": float(osmolality[k]),
                   "water_activity": float(water[k])}
            if self.slope is not None:
                row[f"dpH_per_{self.variable.split('_', 1)[1]}"] = float(self.slope[k])
            for s in self.species:
                row[f"m({s})"] = float(self.molality(s)[k])
            for name, si in self.saturation.items():
                row[f"SI({name})"] = float(si[k])
                row[f"u(SI({name}))"] = float(u_si[name][k])
            for j, phase in enumerate(self.state.solids):  # + dissolved, − precipitated
                if phase.kind == "solid":
                    row[f"into_solution({phase.name})_g_per_kg"] = float(
                        self.state.dissolved[k, j] * phase.molar_mass)
            out.append(row)
        return out

    def into_solution(self, solid: str) -> np.ndarray:
        """mol of *solid* per kg of water gone into solution at each point (negative where
        it precipitated: the sludge of a coagulant dose)."""
        names = [p.name for p in self.state.solids if p.kind == "solid"]
        if solid not in names:
            from ..errors import UnknownNameError

            raise UnknownNameError("solid of this sweep", solid, names,
                                   "list it under [solids] in the recipe")
        j = next(j for j, p in enumerate(self.state.solids) if p.name == solid)
        return self.state.dissolved[:, j].copy()

    def to_csv(self) -> str:
        rows = self.rows()
        buffer = io.StringIO()
        if rows:
            writer = csv.DictWriter(buffer, fieldnames=list(rows[0]))
            writer.writeheader()
            for row in rows:
                writer.writerow({k: f"{v:.10g}" for k, v in row.items()})
        return buffer.getvalue()

    def to_dict(self) -> dict[str, Any]:
        return {"kind": self.kind, "variable": self.variable, "complete": self.complete,
                "stopped": self.stopped, "activity_model": self.bench.model.name,
                "equivalence_points": self.equivalence, "warnings": self.warnings,
                "notices": [n.to_dict() for n in self.notices],
                "rows": self.rows()}


# -- the four kinds --------------------------------------------------------------------------
@names_its_arguments
def titration(recipe: str | Path | Mapping[str, Any] | Recipe, titrant: str, to: str, *,
              sample: str | None = None, points: int = DEFAULT_POINTS,
              species: Sequence[str] = (), beyond_range: bool = False,
              registry: Registry | None = None) -> Sweep:
    """Add *titrant* (``"HCl 0.1 mol/L"``) from none to *to* (``"50 mL"``) to a sample.

    The sample is the recipe as made (1 kg of water for a per-kg recipe) or *sample*
    (``"25 mL"``) of it; the titrant's water dilutes it.
    """
    name, strength = split_name_and_quantity(titrant, "titrant")
    opened = compile_recipe(recipe, registry, also=(name,))
    bench = opened.closed()
    t = bench.recipe.temperature_C
    stock = read_stock(name, strength, bench.tables, t, "titrant")
    final = expect(parse_quantity(to, "to"), ("volume",), "to").value
    if final <= 0:
        raise RecipeError("to", f"{to!r} must be more than zero", 'e.g. to="50 mL"')
    water = _sample_water(bench, sample)
    step = bench.direction(stock.ingredient)

    def totals_at(volume_L: np.ndarray) -> np.ndarray:
        w = water + volume_L * stock.water_kg_per_L
        return (water * bench.base[None, :]
                + (volume_L * stock.moles_per_L)[:, None] * step[None, :]) / w[:, None]

    def slope_at(state: PhaseEquilibrium, volume_L: np.ndarray) -> np.ndarray:
        """dpH per mL of titrant: the totals' change per mL, pushed through the response."""
        w = water + volume_L * stock.water_kg_per_L
        totals = totals_at(volume_L)
        change = (stock.moles_per_L * step[None, :]
                  - stock.water_kg_per_L * totals) / w[:, None] / 1000.0
        return pH_change(state, change)

    volumes = np.linspace(0.0, final, _points(points))
    state = bench.solve(totals_at(volumes))
    sweep = _finish(bench, "titration", "titrant_mL", 1000.0 * volumes, state, species,
                    beyond_range)
    sweep.notices[:0] = closed_sample_notes(opened, "titrated", "titrant")
    sweep.titrant = stock.label
    kept = sweep.values.size
    if kept:
        sweep.slope = slope_at(sweep.state, volumes[:kept])
        sweep.equivalence = _equivalence_points(bench, volumes[:kept], sweep.slope,
                                                totals_at, slope_at)
    return sweep


@names_its_arguments
def dilution(recipe: str | Path | Mapping[str, Any] | Recipe, ratio: str, *,
             points: int = DEFAULT_POINTS, species: Sequence[str] = (),
             beyond_range: bool = False, registry: Registry | None = None) -> Sweep:
    """Dilute the recipe with water from as made to *ratio* (``"1:1000"``, by volume)."""
    lo, hi = _range(ratio, "ratio")
    if lo <= 0 or hi <= lo:
        raise RecipeError("ratio", f"{ratio!r} must be 1:N with N > 1", 'e.g. "1:1000"')
    opened = compile_recipe(recipe, registry)
    bench = opened.closed()
    factors = np.logspace(0.0, math.log10(hi / lo), _points(points))
    totals = np.array([_diluted(bench, f) for f in factors])
    sweep = _finish(bench, "dilution", "dilution_factor", factors, bench.solve(totals),
                    species, beyond_range)
    sweep.notices[:0] = closed_sample_notes(opened, "diluted", "water added")
    return sweep


@names_its_arguments
def temperature_series(recipe: str | Path | Mapping[str, Any] | Recipe, span: str, *,
                       points: int = DEFAULT_POINTS, species: Sequence[str] = (),
                       beyond_range: bool = False, hold_pH: bool = False,
                       registry: Registry | None = None) -> Sweep:
    """The recipe as made, warmed or cooled from one temperature to another (``"5:60"``, °C).

    The sample is closed: its totals stay as they are and the pH follows the temperature.
    A pH the recipe fixes (a measured pH of an analysis, or [fix] pH) sets the proton
    content at the recipe's own temperature, which then stays fixed too. With *hold_pH*
    the pH is held at that value at every temperature instead, as if an acid or base were
    added while it warms. A note in the sweep's warnings says which.
    """
    lo, hi = _range(span, "span")
    bench = compile_recipe(recipe, registry)
    totals, fixed, note = _closed_sample(bench, hold_pH)
    temps = np.linspace(lo, hi, _points(points))
    low, high = VALID_RANGE_C
    inside = (temps >= low) & (temps <= high)
    stopped = ""
    if not inside.all():
        first = temps[~inside][0]
        stopped = (f"stopped before {first:g} °C: the water properties and constants hold "
                   f"for {low:g}–{high:g} °C only; {int(inside.sum())} of {temps.size} "
                   "points kept")
        temps = temps[inside]
        if not temps.size:
            raise RecipeError("span", f"{span!r} lies outside {low:g}–{high:g} °C",
                              f"give temperatures between {low:g} and {high:g} °C")
    totals = np.repeat(totals[None, :], temps.size, axis=0)
    state = bench.solve(totals, temps, fixed=np.repeat(fixed[None, :], temps.size, axis=0))
    sweep = _finish(bench, "temperature", "temperature_C", temps, state, species,
                    beyond_range)
    sweep.stopped = sweep.stopped or stopped
    sweep.notices.insert(0, Notice(INPUT, "closed-sample", note, {"hold_pH": hold_pH}))
    if hold_pH and "pH" in bench.recipe.fix and sweep.values.size:
        free = sweep.state.free.copy()   # β of the solution at each held pH, as pH_series
        free[0] = True
        sweep.beta = buffer_capacity(replace(sweep.state, free=free))
    return sweep


def _closed_sample(bench: CompiledRecipe, hold_pH: bool) -> tuple[np.ndarray, np.ndarray, str]:
    """(totals, fixed log10 activities, note) of the recipe warmed as a closed sample.

    A fixed pH becomes the proton content it implies at the recipe's temperature (from the
    solved speciation, Σ ν(H+) m), so that warming changes the pH as it would in a closed
    bottle; *hold_pH* keeps the pH fixed instead.
    """
    if "pH" not in bench.recipe.fix:
        return bench.base, bench.fixed(), ("the sample is warmed closed: its totals stay "
                                           "fixed and the pH follows the temperature")
    if hold_pH:
        return bench.base, bench.fixed(), (
            f"the pH is held at {bench.recipe.fix['pH']:g} at every temperature, as if an "
            "acid or base were added while the sample warms (hold_pH); without it the closed "
            "sample's pH follows the temperature")
    closed = bench.closed()
    (note,) = closed_sample_notes(bench, "warmed", "temperature")
    return closed.base, closed.fixed(), note.text + " (hold_pH keeps the pH fixed instead)"


@names_its_arguments
def pH_series(recipe: str | Path | Mapping[str, Any] | Recipe, span: str, *,
              points: int = DEFAULT_POINTS, species: Sequence[str] = (),
              beyond_range: bool = False, registry: Registry | None = None) -> Sweep:
    """The recipe held at each pH from one value to another (``"2:12"``).

    The pH is fixed as if by an acid or base the recipe does not list; β at each point is
    that of the solution brought to that pH.
    """
    lo, hi = _range(span, "span")
    bench = compile_recipe(recipe, registry)
    values = np.linspace(lo, hi, _points(points))
    fixed = np.repeat(bench.fixed()[None, :], values.size, axis=0)
    fixed[:, 0] = -values
    totals = np.repeat(bench.base[None, :], values.size, axis=0)
    state = bench.solve(totals, fixed=fixed)
    sweep = _finish(bench, "pH", "pH_set", values, state, species, beyond_range)
    if sweep.values.size:
        free = sweep.state.free.copy()
        free[0] = True
        sweep.beta = buffer_capacity(replace(sweep.state, free=free))
    return sweep


# -- shared steps ----------------------------------------------------------------------------
def _finish(bench: CompiledRecipe, kind: str, variable: str, values: np.ndarray,
            state: PhaseEquilibrium, species: Sequence[str], beyond_range: bool = False
            ) -> Sweep:
    """Keep the points up to the first failure or the first beyond the model's range.

    With *beyond_range* the points past the model's range are kept, with a warning. A
    sweep that would keep no point at all is refused with the reason (never an empty
    sweep); a sweep cut short says where and why in ``stopped`` and in its warnings.
    """
    limit = bench.model.max_ionic_strength
    bad = ~succeeded(state.status)
    outside = beyond_model_range(bench.model, state.equilibrium.ionic_strength)
    beyond = outside & ~beyond_range
    stop = np.flatnonzero(bad | beyond)
    stopped = ""
    kept = values.size
    if stop.size:
        k = int(stop[0])
        kept = k
        at = f"{variable.replace('_', ' ')} {values[k]:.6g}"
        if bad[k]:
            why = f"the solver did not converge (status {str(state.status[k])!r})"
            hint = "check that the amounts are physically possible"
        else:
            why = (f"the ionic strength ({state.equilibrium.ionic_strength[k]:.4g} mol/kg) is "
                   f"beyond the {bench.model.name} model's range (up to about {limit:g})")
            hint = ("use a model valid at higher ionic strength (truesdell-jones, pitzer), a "
                    "shorter sweep, or beyond_range=True to go on with a warning")
        if kept == 0:
            raise RecipeError(f"{bench.recipe.origin}", f"no point of this {kind} sweep "
                              f"can be given: at its first point ({at}) {why}", hint)
        stopped = f"stopped at {at}: {why}; the {kept} points before it are kept; {hint}"
    rows = np.arange(kept)
    kept_state = _take_state(state, rows)
    chosen = tuple(species) or _default_species(bench, kept_state)
    for s in chosen:
        if s not in bench.system.species:
            _unknown_species(bench, s)
    notes = list(state.notes) + ([Notice(VALIDITY, "sweep-stopped", f"the sweep {stopped}")]
                                 if stopped else [])
    outside = np.asarray(outside)
    if beyond_range and outside[:kept].any():
        first = values[np.flatnonzero(outside[:kept])[0]]
        notes.append(Notice(
            VALIDITY, "model-range", f"from {variable.replace('_', ' ')} {first:.6g} on, the "
            f"ionic strength is beyond the {bench.model.name} model's range (up to about "
            f"{limit:g}); those points are less certain",
            {"model": bench.model.name, "from": float(first), "limit": limit}))
    notes.extend(_drinking_water_notes(bench, kept_state))
    return Sweep(kind, variable, values[:kept], bench, kept_state, chosen,
                 buffer_capacity(kept_state) if kept else np.zeros(0),
                 saturation=_saturation(bench, kept_state), notices=notes, stopped=stopped)


def _drinking_water_notes(bench: CompiledRecipe, state: PhaseEquilibrium) -> list[Notice]:
    """The lead/copper/cadmium/arsenic caution at the highest level any point reaches."""
    components = bench.system.components
    highest: dict[str, float] = {}
    for row in state.totals:
        for element, mg in dissolved_levels(dict(zip(components, row)), bench.tables).items():
            highest[element] = max(mg, highest.get(element, 0.0))
    caution = drinking_water_caution(highest)
    return [] if caution is None else [caution]


def _take_state(state: PhaseEquilibrium, rows: np.ndarray) -> PhaseEquilibrium:
    """The points *rows* of a batch with phases."""
    return replace(state, equilibrium=_take(state.equilibrium, rows),
                   inner=_take(state.inner, rows), dissolved=state.dissolved[rows],
                   present=state.present[rows], saturation_index=state.saturation_index[rows],
                   gas_uptake=state.gas_uptake[rows], totals=state.totals[rows],
                   gas_log10_pressure=state.gas_log10_pressure[rows], t_C=state.t_C[rows],
                   traced=None if state.traced is None else state.traced[rows],
                   bound=state.bound.take(rows) if state.bound is not None and rows.size
                   else state.bound)


def _default_species(bench: CompiledRecipe, state: PhaseEquilibrium) -> tuple[str, ...]:
    if not state.equilibrium.molality.shape[0]:
        return ()
    peak = state.equilibrium.molality.max(axis=0)
    order = [i for i in np.argsort(-peak) if bench.system.species[i] != "H2O"]
    return tuple(bench.system.species[i] for i in order[:DEFAULT_SPECIES])


def _unknown_species(bench: CompiledRecipe, name: str) -> None:
    from ..errors import UnknownNameError

    raise UnknownNameError("species in this recipe", name, bench.system.species,
                           "the recipe's species are listed by `ionwright solve RECIPE`")


def _saturation(bench: CompiledRecipe, state: PhaseEquilibrium) -> dict[str, np.ndarray]:
    """SI of every solid of the tables whose components the recipe has, per point."""
    eq = state.equilibrium
    return saturation_indices(bench.system, bench.tables, eq.log_activity,
                              eq.ln_water_activity, state.t_C)


def _equivalence_points(bench, volumes, slope, totals_at, slope_at) -> list[dict[str, float]]:
    """Inflections of pH(V): prominent local maxima of |dpH/dV|, refined in batches."""
    size = np.abs(slope)
    peaks = [k for k in range(1, size.size - 1)
             if size[k] > size[k - 1] and size[k] >= size[k + 1]
             and size[k] >= PROMINENCE * max(size[:k].min(), size[k + 1:].min())]
    if not peaks:
        return []
    step = volumes[1] - volumes[0]
    centres = volumes[peaks]
    half = np.full(len(peaks), step)
    for _ in range(REFINE_ROUNDS):
        grid = centres[:, None] + half[:, None] * np.linspace(-1, 1, REFINE_POINTS)[None, :]
        grid = np.clip(grid, volumes[0], volumes[-1])
        flat = grid.ravel()
        state = bench.solve(totals_at(flat))
        found = np.abs(slope_at(state, flat)).reshape(grid.shape)
        best = np.nanargmax(np.where(np.isfinite(found), found, -np.inf), axis=1)
        centres = grid[np.arange(len(peaks)), best]
        half = half * 2.0 / (REFINE_POINTS - 1)
    state = bench.solve(totals_at(centres))
    ph = bench.pH(state)
    slopes = slope_at(state, centres)
    return [{"titrant_mL": float(1000.0 * v), "pH": float(p), "dpH_per_mL": float(s)}
            for v, p, s in zip(centres, ph, slopes)]


def _sample_water(bench: CompiledRecipe, sample: str | None) -> float:
    """kg of water in the titrated sample."""
    solution = solution_of(bench.recipe, bench.tables)
    if sample is None:
        return solution.water_kg
    q = expect(parse_quantity(sample, "sample"), ("volume", "mass"), "sample")
    if q.value <= 0:
        raise RecipeError("sample", f"{sample!r} must be more than zero",
                          'give the volume or mass titrated, e.g. sample="25 mL"')
    if q.dimension == "volume":
        return q.value * solution.water_kg_per_L
    return q.value / solution.mass_g * solution.water_kg


def _diluted(bench: CompiledRecipe, factor: float) -> np.ndarray:
    """Totals (mol/kg) after making the recipe's solution up to *factor* times its volume."""
    recipe = bench.recipe
    solution = solution_of(recipe, bench.tables)
    entries = []
    for name, m in recipe.dissolve:
        made = makeup(name, bench.tables)
        entries.append(Entry(ingredient_solute(made.name, made.formula, made.per_mole,
                                               bench.tables), "ingredient", name, "",
                             absolute=m * solution.water_kg))
    for name, m in recipe.components:
        entries.append(Entry(component_solute(name, bench.tables), "component", name, "",
                             absolute=m * solution.water_kg))
    diluted = mix(entries, recipe.temperature_C, volume_L=factor * solution.volume_L,
                  where="dilution")
    return bench.base * solution.water_kg / diluted.solution.water_kg


def _range(text: str, where: str) -> tuple[float, float]:
    parts = str(text).split(":")
    try:
        lo, hi = (float(p) for p in parts)
    except ValueError:
        raise RecipeError(where, f"{text!r} must be two numbers A:B", 'e.g. "5:60"') from None
    if not (math.isfinite(lo) and math.isfinite(hi)) or lo == hi:
        raise RecipeError(where, f"{text!r} must be two different finite numbers A:B",
                          'e.g. "5:60"')
    return lo, hi


def _points(points: int) -> int:
    if isinstance(points, bool) or not isinstance(points, numbers.Integral):
        raise RecipeError("points", f"{points!r} must be a whole number",
                          "give a number of points between 2 and 100000")
    if not 2 <= int(points) <= 100_000:
        raise RecipeError("points", f"{points!r} must be between 2 and 100000",
                          "give a number of points between 2 and 100000")
    return int(points)
