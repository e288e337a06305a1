"""Analyses fitted to what was measured, many at once: the carbonate total that gives the
measured alkalinity at the measured pH, and the total of the ion that makes a sample
electroneutral (``balance_on``), found with the engine's own speciation.

The reading of an analysis (:mod:`ionwright.inputs._analysis`) leaves these as an
:class:`~ionwright.inputs._analysis.AnalysisFit`; :func:`fit_analyses` resolves a list of
them (a batch's rows) with one vectorised Newton iteration over all of them, and
:func:`fit_analysis` one of them (a single solve) by the same code, so that a batch row
and the single solve of that row fit the same totals.

Each Newton step costs one batched solve of every row still fitting: the Jacobian is read
from that solve's speciation (what one more mole of carbonate or of the balancing ion
adds to the alkalinity and to the charge, at the fixed pH), not from extra solves.

An analysis that states a redox level is fitted at it: with the oxidation states linked
(:func:`ionwright.chemistry._redox.electron_tables`) and the pe held, so that the sample
the engine solves afterwards, at the same pe, gives back the measured alkalinity. A
dissolved oxygen holds the pe that its O2 pressure gives at the measured pH.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace

import numpy as np

from ..activity._pairs import ion_pairs_of
from ..chemistry._constants import LN10
from ..chemistry._redox import ELECTRON, analysed_apart, electron_tables, in_linked_basis
from ..chemistry._tableset import TableSet
from ..core import _solver as solver
from ..core._acid_base import alkalinity_weights_at, series
from ..core._sparse import weighted_sum
from ..core._system import WATER, ChemicalSystem, compile_system
from ._compiled import TRACE
from ..errors import ConvergenceError, IonwrightError, RecipeError
from ..status import MAX_ITERATIONS
from ..inputs._analysis import CARBONATE, AnalysisFit, analysis_mixture, finish_analysis
from ..inputs._recipe import Recipe
from ..plugins._registry import Registry, default_registry
from ..plugins._table_sets import load_tables
from ._redox_level import pe_held_by_o2

FIT_TOLERANCE = 1e-12
FIT_ROUNDS = 60
DENSITY_ROUNDS = 8
#: Relative change of the fitted totals between make-up rounds below which they have
#: settled (the density they imply moves the per-kg values far less than this)
SETTLE_TOLERANCE = 1e-10
FLOOR = 1e-4  # smallest fitted total relative to its scale; below it there is no solution
#: Scale of the alkalinity residual relative to the ions' charge when the alkalinity is
#: (near) zero, as a Gran titration of an acid water can give
ALKALINITY_SCALE_FLOOR = 1e-3


def fit_analysis(recipe: Recipe, fit: AnalysisFit, registry: Registry | None) -> Recipe:
    """*recipe* with the totals of its analysis fitted (raises what a fit raises)."""
    found = fit_analyses([(recipe, fit)], registry)[0]
    if isinstance(found, IonwrightError):
        raise found
    return found


def fit_analyses(items: Sequence[tuple[Recipe, AnalysisFit]], registry: Registry | None
                 ) -> list[Recipe | IonwrightError]:
    """Each recipe with its analysis fitted, or the error that stopped its fit.

    The recipes share their tables and activity model (the rows of one batch). The
    per-litre values depend on the density and the density on the fitted totals, so
    making up and fitting alternate until every row's fitted totals settle.
    """
    if not items:
        return []
    registry = registry or default_registry()
    first = items[0][0]
    tables = load_tables(first.tables, registry)
    model = registry.model(first.activity_model)
    n = len(items)
    fitted: list[dict[str, float]] = [{} for _ in range(n)]
    as_given: list[dict[str, float] | None] = [None] * n
    mixtures: list = [None] * n
    jacobians: list[np.ndarray | None] = [None] * n
    out: list[Recipe | IonwrightError | None] = [None] * n
    for i, (_, fit) in enumerate(items):
        if fit.ph is None:  # the reader asks for a pH before it leaves anything to fit
            out[i] = RecipeError(fit.where, "fitting needs the measured pH", "add pH")
    settled = [out[i] is not None for i in range(n)]
    for _ in range(DENSITY_ROUNDS):
        active = [i for i in range(n) if not settled[i]]
        if not active:
            break
        targets = []
        for i in active:
            fit = items[i][1]
            try:
                mixtures[i] = analysis_mixture(fit, fitted[i], tables)
            except IonwrightError as exc:
                out[i], settled[i] = exc, True
                continue
            totals = dict(mixtures[i].molalities("component"))
            if as_given[i] is None:
                as_given[i] = dict(totals)
            solution = mixtures[i].solution
            litres_per_kg = solution.volume_L / solution.water_kg
            targets.append((i, Target(fit.where, fit.t_C, float(fit.ph or 0.0), totals,
                                      None if fit.alkalinity is None
                                      else fit.alkalinity[0] * litres_per_kg,
                                      None if fit.balance is None else fit.balance[1],
                                      fitted[i], jacobians[i], held_pe(fit, tables),
                                      _apart(items[i][0], totals, tables))))
        found = fit_totals([t for _, t in targets], tables, model)
        for (i, _), got in zip(targets, found):
            if isinstance(got, IonwrightError):
                out[i], settled[i] = got, True
                continue
            new, jacobians[i] = got
            done = bool(fitted[i]) and all(abs(new[c] - fitted[i][c])
                                           <= SETTLE_TOLERANCE * abs(new[c])
                                           for c in new)
            fitted[i] = new
            settled[i] = done
    for i, (recipe, fit) in enumerate(items):
        if out[i] is None:
            out[i] = replace(recipe, **finish_analysis(fit, mixtures[i], fitted[i],
                                                       as_given[i] or {}, tables))
    return [o for o in out if o is not None]


def _apart(recipe: Recipe, totals: Mapping[str, float], tables: TableSet) -> frozenset[str]:
    """The couples an analysis with *totals* measured in both forms (none for a couple
    that sets its level)."""
    setting = recipe.redox_couple.reduced if recipe.redox_couple else None
    return analysed_apart(tables, (c for c, v in totals.items() if v > 0), setting)


@dataclass(frozen=True)
class Target:
    """One sample to fit: its known totals (mol/kg water), fixed pH and temperature, the
    alkalinity to reach (eq/kg water) and/or the ion to balance on, and a starting point."""

    where: str
    t_C: float
    ph: float
    totals: Mapping[str, float]
    alkalinity: float | None
    balance: str | None
    guess: Mapping[str, float]
    jacobian: np.ndarray | None = None   # (k, k) from a previous fit of the same sample
    pe: float | None = None              # the pe held (the oxidation states linked)
    apart: frozenset[str] = frozenset()  # couples analysed in both forms, kept as analysed

    @property
    def unknowns(self) -> tuple[str, ...]:
        return ((CARBONATE,) if self.alkalinity is not None else ()) + \
            ((self.balance,) if self.balance else ())


def fit_totals(targets: Sequence[Target], tables: TableSet, model
               ) -> list[tuple[dict[str, float], np.ndarray] | IonwrightError]:
    """The fitted totals of each target with the Jacobian it ended with (for the next
    round's start), or its error; targets that fit the same unknowns are fitted together
    by :func:`fit_rows`."""
    out: list[tuple[dict[str, float], np.ndarray] | IonwrightError] = [
        RecipeError("fit", "not fitted")] * len(targets)
    by_unknowns: dict[tuple, list[int]] = {}
    for k, target in enumerate(targets):
        by_unknowns.setdefault((target.unknowns, target.balance, target.pe is not None,
                                target.apart), []).append(k)
    for (unknowns, balance, linked, apart), members in by_unknowns.items():
        names = list(dict.fromkeys(c for k in members for c in targets[k].totals))
        chosen = [targets[k] for k in members]
        totals = np.array([[t.totals.get(c, 0.0) for c in names] for t in chosen])
        guess = np.array([[t.guess.get(u, 0.0) for u in unknowns] for t in chosen])
        alkalinity = (np.array([t.alkalinity for t in chosen], dtype=float)
                      if CARBONATE in unknowns else None)
        size = len(unknowns)
        jacobian = np.array([t.jacobian if t.jacobian is not None
                             else np.full((size, size), np.nan) for t in chosen])
        pe = np.array([t.pe for t in chosen], dtype=float) if linked else None
        x, jac, errors = fit_rows(names, totals, np.array([t.t_C for t in chosen]),
                                  np.array([t.ph for t in chosen]), alkalinity, balance,
                                  guess, tables, model, chosen[0].where, jacobian, pe, apart)
        for j, k in enumerate(members):
            out[k] = errors[j] or (dict(zip(unknowns, x[j].tolist())), jac[j])
    return out


def fit_rows(names: Sequence[str], totals: np.ndarray, t_C: np.ndarray, ph: np.ndarray,
             alkalinity: np.ndarray | None, balance: str | None, guess: np.ndarray,
             tables: TableSet, model, where: str = "analysis",
             jacobian: np.ndarray | None = None, pe: np.ndarray | None = None,
             apart: frozenset[str] = frozenset()
             ) -> tuple[np.ndarray, np.ndarray, list[IonwrightError | None]]:
    """Fit n samples given as arrays: *totals* (n, len(names)) of the components *names*
    (mol/kg water), the fixed pH, the alkalinity (eq/kg water) when carbonate is fitted,
    the ion to balance on, and a starting point *guess* (n, k), 0 where there is none.
    *jacobian* (n, k, k), NaN where unknown, starts the secant updates (a previous round's).
    With *pe* (n,) the oxidation states are linked (but for the couples *apart*) and that
    pe held.
    Returns the fitted totals (n, k), the Jacobians they ended with, and each sample's
    error (None when it fitted)."""
    unknowns = ((CARBONATE,) if alkalinity is not None else ()) + ((balance,) if balance
                                                                    else ())
    if pe is not None:
        tables = electron_tables(tables, apart)
        names, totals = in_linked_columns(names, totals, tables)
        if balance and balance not in tables.components:
            raise RecipeError(f"{where} balance_on", f"{balance} is linked to another "
                              "oxidation state by the redox level stated",
                              "balance on an ion no couple links, such as Cl or Na")
    names = list(names) + [u for u in unknowns if u not in names]
    full = np.zeros((totals.shape[0], len(names)))
    full[:, :totals.shape[1]] = totals
    for u in unknowns:
        full[:, names.index(u)] = np.maximum(full[:, names.index(u)], TRACE)
    used: list[bool] = list(np.any(full > 0, axis=0))
    comps = [c for c, u in zip(names, used) if u and c != ELECTRON] + (
        [ELECTRON] if pe is not None else [])
    # one system for all: a component a sample lacks gets a trace total (as a recipe's
    # batches do), which changes no digit of its fit, and one Newton run serves them all
    traced = np.where(full > 0, full, TRACE)
    k = len(unknowns)
    jac = np.full((full.shape[0], k, k), np.nan) if jacobian is None else jacobian.copy()
    system = compile_system(tables, comps, ion_pairs_of(model))
    index = [names.index(c) if c in names else -1 for c in system.components]
    base = np.array([traced[:, i] if i >= 0 else np.zeros(full.shape[0]) for i in index]).T
    held = np.full(base.shape, np.nan)
    held[:, 0] = -ph
    if pe is not None:
        held[:, system.components.index(ELECTRON)] = -pe
    return _fit_group(system, base, t_C, held, alkalinity, balance, guess, jac, unknowns,
                      tables, model, where)


def held_pe(fit: AnalysisFit, tables: TableSet) -> float | None:
    """The pe an analysis's fit holds: its stated or found pe, or the pe that a dissolved
    oxygen's O2 pressure gives at the measured pH; None without a redox level."""
    if fit.pe is not None or fit.redox is None or fit.redox.o2_pressure_atm is None:
        return fit.pe
    return pe_held_by_o2(tables, fit.redox.o2_pressure_atm, float(fit.ph or 0.0), fit.t_C)


def in_linked_columns(names: Sequence[str], totals: np.ndarray, linked: TableSet
                     ) -> tuple[list[str], np.ndarray]:
    """Components *names* and *totals* (n, len(names)) rewritten in the components of the
    *linked* set (1 Fe2+ is 1 Fe3+ and 1 e-)."""
    parts = [in_linked_basis({name: 1.0}, linked) for name in names]
    out = list(dict.fromkeys(c for p in parts for c in p if c != WATER))
    matrix = np.zeros((len(names), len(out)))
    for i, p in enumerate(parts):
        for c, nu in p.items():
            if c != WATER:
                matrix[i, out.index(c)] += nu
    return out, totals @ matrix


def _fit_group(system: ChemicalSystem, base: np.ndarray, t_C: np.ndarray, held: np.ndarray,
               alkalinity_given: np.ndarray | None, balance: str | None, guess: np.ndarray,
               start_jacobian: np.ndarray, unknowns: tuple[str, ...], tables: TableSet,
               model, where: str
               ) -> tuple[np.ndarray, np.ndarray, list[IonwrightError | None]]:
    """Newton's method on every sample of one system at once (see the module docstring):
    the first step uses *start_jacobian* where it is known, else the Jacobian read from
    the speciation; later steps update it by Broyden's rule (the secant for one unknown),
    so the fit converges faster than linearly."""
    n, k = base.shape[0], len(unknowns)
    comps = system.components
    cols = [comps.index(c) for c in unknowns]
    weights = alkalinity_weights_at(system, t_C)
    with_alkalinity = alkalinity_given is not None
    alkalinity = np.zeros(n) if alkalinity_given is None else alkalinity_given
    charges = np.abs(np.array([0.0 if c == ELECTRON else tables.entry(c).charge
                               for c in comps], dtype=float))
    charge_scale = weighted_sum(np.ascontiguousarray((charges * base).T))
    scales = []
    if with_alkalinity:
        scales.append(np.maximum(np.abs(alkalinity), np.maximum(
            ALKALINITY_SCALE_FLOOR * charge_scale, 1e-15)))
    if len(unknowns) > int(with_alkalinity):
        scales.append(charge_scale + np.abs(alkalinity))
    scale = np.stack(scales, axis=1)
    floor = FLOOR * scale
    ph = -held[:, 0]
    first = _first_guess(system, weights, t_C, ph, alkalinity) if with_alkalinity else None
    x = np.empty((n, k))
    for u, name in enumerate(unknowns):
        start = (first if name == CARBONATE and first is not None
                 else np.maximum(base[:, cols[u]], 1e-6))
        x[:, u] = np.where(guess[:, u] > 0, guess[:, u], start)
    x = np.maximum(x, floor)
    result: list[IonwrightError | None] = [None] * n
    active = np.arange(n)
    residual = np.full(n, np.inf)
    jacobian = start_jacobian.copy()
    known = np.isfinite(jacobian).all(axis=(1, 2))
    last_x = last_res = np.zeros((0, k))
    for round_ in range(FIT_ROUNDS):
        res, read, failed = _evaluate(system, model, base[active], cols, x[active],
                                      t_C[active], held[active], weights[active],
                                      alkalinity[active], with_alkalinity, scale[active])
        if round_ == 0:
            jacobian[active] = np.where(known[active, None, None], jacobian[active], read)
        else:
            jacobian[active] = _broyden(jacobian[active], x[active] - last_x,
                                        res - last_res)
        broken = failed.astype(bool)
        for j in np.flatnonzero(broken):
            status, iterations, worst = failed[j]
            result[int(active[j])] = ConvergenceError(status, iterations, worst,
                                                      f"fitting {where}")
        residual[active] = np.max(np.abs(res), axis=1)
        done = ~broken & (residual[active] <= FIT_TOLERANCE)
        keep = ~done & ~broken
        active, res = active[keep], res[keep]
        if not active.size:
            break
        step = _solve_small(jacobian[active], -res)
        last_x, last_res = x[active].copy(), res
        trial = x[active] + step
        ok = np.isfinite(trial) & (trial > floor[active])
        x[active] = np.where(ok, trial, np.maximum(0.1 * x[active], floor[active]))
    for r in active:  # out of rounds: no positive total fits, or a slow fit
        result[r] = _not_fitted(system, model, base[r], cols, x[r], floor[r], weights[r],
                                scale[r], unknowns, float(residual[r]), tables, where,
                                float(t_C[r]), held[r], float(alkalinity[r]),
                                with_alkalinity, balance)
    return x, jacobian, result


def _broyden(jac: np.ndarray, dx: np.ndarray, dres: np.ndarray) -> np.ndarray:
    """Broyden's update of Jacobians (m, k, k) after steps *dx* that changed the residuals
    by *dres* (m, k); a row whose step was zero keeps its Jacobian."""
    predicted = np.einsum("mij,mj->mi", jac, dx)
    norm = np.einsum("mi,mi->m", dx, dx)
    with np.errstate(divide="ignore", invalid="ignore"):
        update = (dres - predicted)[:, :, None] * dx[:, None, :] / norm[:, None, None]
    return np.where((norm > 0)[:, None, None] & np.isfinite(update), jac + update, jac)


def _evaluate(system: ChemicalSystem, model, base: np.ndarray, cols: list[int],
              x: np.ndarray, t_C: np.ndarray, held: np.ndarray, weights: np.ndarray,
              alkalinity: np.ndarray, with_alkalinity: bool, scale: np.ndarray):
    """Scaled residuals (m, k), their Jacobian (m, k, k) with respect to the unknowns, and
    per row a failure (status, iterations, residual) of the solve or 0, from one solve
    with the log10 activities *held* (m, c: the pH, and the pe when one is held)."""
    batch = base.copy()
    batch[:, cols] = x
    eq = solver.solve(system, batch, model.bind(system.properties, t_C), held)
    m = eq.molality
    rows: list[np.ndarray] = []        # quantities whose residual is fitted, per species
    targets: list[np.ndarray] = []
    if with_alkalinity:
        rows.append(weights)
        targets.append(alkalinity)
    if len(cols) > int(with_alkalinity):
        rows.append(np.broadcast_to(system.charge, m.shape))
        targets.append(np.zeros(m.shape[0]))
    res = np.stack([weighted_sum(np.ascontiguousarray((q * m).T)) - target
                    for q, target in zip(rows, targets)], axis=1) / scale
    jac = np.empty((m.shape[0], len(rows), len(cols)))
    for u, col in enumerate(cols):
        carried = system.nu[:, col] * m                      # mol of the unknown in each
        for r, q in enumerate(rows):                         # species, and what it adds
            jac[:, r, u] = weighted_sum(np.ascontiguousarray((q * carried).T)) / x[:, u]
    jac /= scale[:, :, None]
    failed = np.zeros(m.shape[0], dtype=object)
    for j in np.flatnonzero(~eq.success):
        failed[j] = (str(eq.status[j]), int(eq.iterations[j]), float(eq.residual[j]))
    res[~eq.success] = np.nan
    return res, jac, failed


def _solve_small(jac: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    """Solutions (m, k) of m systems of 1 or 2 equations, written out (Cramer's rule) so
    that each row's answer does not depend on the others."""
    if jac.shape[1] == 1:
        with np.errstate(divide="ignore", invalid="ignore"):
            return rhs / jac[:, :, 0]
    a, b, c, d = jac[:, 0, 0], jac[:, 0, 1], jac[:, 1, 0], jac[:, 1, 1]
    det = a * d - b * c
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.stack([(rhs[:, 0] * d - b * rhs[:, 1]) / det,
                         (a * rhs[:, 1] - rhs[:, 0] * c) / det], axis=1)


def _first_guess(system: ChemicalSystem, weights: np.ndarray, t_C: np.ndarray,
                 ph: np.ndarray, alkalinity: np.ndarray) -> np.ndarray:
    """Carbonate from ideal carbonic-acid fractions at each pH (n,)."""
    members = series(system, system.components.index(CARBONATE))
    formation = system.log10_k(t_C)[:, members]
    level = formation - system.nu[members, 0] * ph[:, None]
    share = np.exp((level - level.max(axis=1, keepdims=True)) * LN10)
    share /= share.sum(axis=1, keepdims=True)
    per_mole = (share * weights[:, members]).sum(axis=1)
    with np.errstate(divide="ignore", invalid="ignore"):
        guess = np.where(per_mole > 0, alkalinity / per_mole, np.abs(alkalinity))
    return np.maximum(guess, 1e-9)


def _not_fitted(system: ChemicalSystem, model, base: np.ndarray, cols: list[int],
                x: np.ndarray, floor: np.ndarray, weights: np.ndarray, scale: np.ndarray,
                unknowns: tuple[str, ...], residual: float, tables: TableSet, where: str,
                t_C: float, held: np.ndarray, alkalinity: float, with_alkalinity: bool,
                balance: str | None) -> IonwrightError:
    """The error of a sample that did not fit: an unknown that would have to be at or
    below zero (each tried at its floor), else the fit's own non-convergence."""
    direction = [1.0] * with_alkalinity + (
        [float(np.sign(tables.entry(balance).charge))] if balance else [])
    k = len(unknowns)
    trial = np.where(np.eye(k, dtype=bool), floor[None, :], x[None, :])
    lowest, _, failed = _evaluate(system, model, np.repeat(base[None, :], k, axis=0), cols,
                                  trial, np.full(k, t_C), np.repeat(held[None, :], k, axis=0),
                                  np.repeat(weights[None, :], k, axis=0),
                                  np.full(k, alkalinity), with_alkalinity,
                                  np.repeat(scale[None, :], k, axis=0))
    for i in range(k):
        if not failed[i] and direction[i] * lowest[i, i] >= 0:
            return _infeasible(unknowns[i], lowest[i] * scale, where, alkalinity, balance)
    return ConvergenceError(MAX_ITERATIONS, FIT_ROUNDS, residual,
                            f"fitting carbonate or balance for {where}",
                            tolerance=FIT_TOLERANCE,
                            what="scaled residual of the fitted alkalinity or charge")


def _infeasible(unknown: str, res: np.ndarray, where: str, alkalinity: float,
                balance: str | None) -> RecipeError:
    """The error for an unknown that would have to be negative (*res* in mol/kg)."""
    if unknown == CARBONATE:
        without = alkalinity + res[0]
        return RecipeError(f"{where} alkalinity", "is at or below what the other ions give at "
                           f"the measured pH ({1e3 * without:.4g} meq/kg without carbonate): "
                           "no positive carbonate total fits",
                           "check the alkalinity, its unit and the pH")
    return RecipeError(f"{where} balance_on", f"balancing on {balance} would need a negative "
                       "total: the other ions already carry too much charge of its sign",
                       "balance on an ion of the opposite charge")
