"""An analysis fitted to what was measured: the carbonate total that gives the measured
alkalinity at the measured pH, and the total of the ion that makes the sample
electroneutral (``balance_on``), found with the engine's own speciation.

The reading of the analysis (:mod:`ionwright.inputs._analysis`) leaves these as an
:class:`~ionwright.inputs._analysis.AnalysisFit`; :func:`fit_analysis` resolves it.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import replace

import numpy as np

from ..activity._pairs import ion_pairs_of
from ..chemistry._tableset import TableSet
from ..core import _solver as solver
from ..core._acid_base import alkalinity_weights, ideal_shares, series
from ..core._system import ChemicalSystem, compile_system
from ..errors import ConvergenceError, RecipeError
from ..status import MAX_ITERATIONS
from ..inputs._analysis import CARBONATE, AnalysisFit, analysis_mixture, finish_analysis
from ..inputs._recipe import Recipe
from ..plugins._registry import Registry, default_registry
from ..plugins._table_sets import load_tables

FIT_TOLERANCE = 1e-12
FIT_ROUNDS = 60
DENSITY_ROUNDS = 8
STEP = 1e-7
FLOOR = 1e-4  # smallest fitted total relative to its scale; below it there is no solution


def fit_analysis(recipe: Recipe, fit: AnalysisFit, registry: Registry | None) -> Recipe:
    """*recipe* with the totals of its analysis fitted. The per-litre values depend on the
    density and the density on the fitted totals, so fitting and making up alternate
    until the fitted totals settle."""
    tables = load_tables(recipe.tables, registry)
    alkalinity, balance, ph = fit.alkalinity, fit.balance, fit.ph
    if ph is None:  # the reader asks for a pH before it leaves anything to fit
        raise RecipeError(fit.where, "fitting needs the measured pH", "add pH")
    fitted: dict[str, float] = {}
    as_given: dict[str, float] | None = None
    for _ in range(DENSITY_ROUNDS):
        mixture = analysis_mixture(fit, fitted, tables)
        totals = dict(mixture.molalities("component"))
        as_given = dict(totals) if as_given is None else as_given
        litres_per_kg = mixture.solution.volume_L / mixture.solution.water_kg
        new = fit_carbonate_and_balance(
            tables, registry, recipe.activity_model, fit.t_C, ph, totals,
            None if alkalinity is None else alkalinity[0] * litres_per_kg,
            None if balance is None else balance[1], fit.where, fitted)
        settled = fitted and all(abs(new[c] - fitted[c]) <= 1e-12 * abs(new[c]) for c in new)
        fitted = new
        if settled:
            break
    return replace(recipe, **finish_analysis(fit, mixture, fitted, as_given or {}, tables))


def fit_carbonate_and_balance(tables: TableSet, registry: Registry | None, model_name: str,
                              t_C: float, ph: float, totals: Mapping[str, float],
                              alkalinity: float | None, balance: str | None,
                              where: str, guess: Mapping[str, float] | None = None
                              ) -> dict[str, float]:
    """Carbonate total and/or balancing-ion total (mol/kg) that reproduce the analysis.

    At the fixed pH, the unknowns (total CO3-2 for *alkalinity* in eq/kg, the total of
    component *balance* for zero charge) are found by Newton's method with
    finite-difference derivatives; each iteration solves the sample and its perturbed
    copies as one batch, so constants, activity coefficients and ion pairs are the
    engine's own. *guess* (a previous fit) is the starting point where given.
    """
    unknowns = ([CARBONATE] if alkalinity is not None else []) + ([balance] if balance else [])
    start = dict(totals)
    model = (registry or default_registry()).model(model_name)
    system = compile_system(tables, [c for c, v in start.items() if v > 0] + unknowns,
                            ion_pairs_of(model))
    weights = alkalinity_weights(system, t_C)
    base = np.array([start.get(c, 0.0) for c in system.components])
    cols = [system.components.index(c) for c in unknowns]
    scale = np.array(([alkalinity] if alkalinity is not None else [])
                     + ([sum(abs(tables.entry(c).charge) * v for c, v in start.items())
                         + (alkalinity or 0.0)] if balance else []))
    floor = FLOOR * scale
    # which way each residual moves as its unknown grows: +1 alkalinity, z for the ion
    direction = np.array([1.0] * (alkalinity is not None)
                         + ([float(np.sign(tables.entry(balance).charge))] if balance else []))

    def residuals(rows: np.ndarray) -> np.ndarray:
        """Scaled residuals for each row of unknowns, all solved as one batch."""
        batch = np.repeat(base[None, :], len(rows), axis=0)
        batch[:, cols] = rows
        fixed = np.full(batch.shape, np.nan)
        fixed[:, 0] = -ph
        bound = model.bind(system.properties, np.full(len(rows), t_C))
        eq = solver.solve(system, batch, bound, fixed)
        if not eq.success.all():
            bad = int(np.flatnonzero(~eq.success)[0])
            raise ConvergenceError(str(eq.status[bad]), int(eq.iterations[bad]),
                                   float(eq.residual[bad]), f"fitting {where}")
        return _residuals(eq.molality, weights, system.charge, alkalinity,
                          balance is not None) / scale

    x = np.array([(guess or {}).get(c) or _first_guess(c, start, alkalinity, system, t_C, ph)
                  for c in unknowns])
    x = np.maximum(x, floor)
    k = len(x)
    lowest = residuals(np.where(np.eye(k, dtype=bool), floor, x))  # each unknown at its floor
    for i in range(k):
        if direction[i] * lowest[i, i] >= 0:
            _infeasible(unknowns[i], lowest[i] * scale, alkalinity, balance, where)
    for _ in range(FIT_ROUNDS):
        res = residuals(np.vstack([x, x * (1.0 + STEP * np.eye(k))]))
        if np.all(np.abs(res[0]) <= FIT_TOLERANCE):
            return dict(zip(unknowns, x.tolist()))
        jac = (res[1:] - res[0]).T / (x * STEP)
        trial = x + np.linalg.lstsq(jac, -res[0], rcond=None)[0]
        x = np.where(trial > floor, trial, np.maximum(0.1 * x, floor))
    raise ConvergenceError(MAX_ITERATIONS, FIT_ROUNDS, float(np.max(np.abs(res[0]))),
                           f"fitting carbonate or balance for {where}", tolerance=FIT_TOLERANCE,
                           what="scaled residual of the fitted alkalinity or charge")


def _residuals(molality: np.ndarray, weights: np.ndarray, charge: np.ndarray,
               alkalinity: float | None, balancing: bool) -> np.ndarray:
    """Residuals (alkalinity − given, Σ z·m) in mol/kg, per sample of the batch."""
    out = []
    if alkalinity is not None:
        out.append(molality @ weights - alkalinity)
    if balancing:
        out.append(molality @ charge)
    return np.stack(out, axis=1)


def _first_guess(component: str, totals: Mapping[str, float], alkalinity: float | None,
                 system: ChemicalSystem, t_C: float, ph: float) -> float:
    """Start: carbonate from ideal carbonic-acid fractions; the balancing ion as given."""
    if component != CARBONATE or alkalinity is None:
        return max(totals.get(component, 0.0), 1e-6)
    formation = system.log10_k(np.array([t_C]))[0]
    weights = alkalinity_weights(system, t_C)
    carbonate = series(system, system.components.index(CARBONATE))
    shares = ideal_shares(formation[carbonate], system.nu[carbonate, 0], ph)
    per_mole = float(shares @ weights[carbonate])
    return max(alkalinity / per_mole if per_mole > 0 else alkalinity, 1e-9)


def _infeasible(unknown: str, res: np.ndarray, alkalinity: float | None,
                balance: str | None, where: str) -> None:
    """Raise the error for an unknown that would have to be negative (*res* in mol/kg)."""
    if unknown == CARBONATE:
        without = alkalinity + res[0]
        raise RecipeError(f"{where} alkalinity", "is at or below what the other ions give at "
                          f"the measured pH ({1e3 * without:.4g} meq/kg without carbonate): "
                          "no positive carbonate total fits",
                          "check the alkalinity, its unit and the pH")
    raise RecipeError(f"{where} balance_on", f"balancing on {balance} would need a negative "
                      "total: the other ions already carry too much charge of its sign",
                      "balance on an ion of the opposite charge")
