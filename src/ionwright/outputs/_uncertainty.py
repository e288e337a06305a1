"""How far to believe a result: the uncertainty the constants' uncertainties give it.

Linear propagation: with D the exact derivatives of a result with respect to each
constant's log10 K (:func:`ionwright.core._sensitivity.log_k_response`) and σ each
constant's standard uncertainty (:mod:`._constant_uncertainty`), independent,
u(result)² = Σ_e D_e² (σ_e² + σ_ΔH,e²). Vectorised over a batch, so that a single result,
a batch, a sweep and the design tools read the same numbers. The shares of u² name the
constants that matter most. The activity model's own uncertainty is not in these numbers:
the spread between the models valid at the ionic strength is shown beside them, never
added in (:mod:`ionwright.design._compare`).

References
----------
JCGM 100:2008, Evaluation of measurement data – Guide to the expression of uncertainty
in measurement (GUM), §5.1 (law of propagation of uncertainty, uncorrelated inputs).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from ..chemistry._tableset import TableSet
from ..core._constant_terms import ConstantTerms, constant_terms
from ..core._phases import PhaseEquilibrium, _take, gas_basis
from ..core._response import is_exact
from ..core._saturation import formable_solids
from ..core._sensitivity import LogKResponse, log_k_response, pH_log_k_derivative
from ..core._solver import Equilibrium, bound_slice
from ..chemistry._redox import ELECTRON
from ..core._system import ChemicalSystem
from ..notices import CAUTION, Notice
from ._cautions import DEFER, corrosive_limits
from ._constant_uncertainty import ConstantUncertainty, constant_uncertainty

METHOD = "linear (implicit-function theorem), constants independent, 1 s.d."
CONTRIBUTORS_SHOWN = 3
#: Share of u² below which a constant is not named as a contributor.
MIN_SHARE = 1e-3
#: Standard deviations within which a result near a corrosive limit is pointed out
#: (about 95 % for a normal distribution)  # common practice
NEAR_LIMIT_SD = 2.0
CONSTANT_PART, ENTHALPY_PART = "log K", "ΔH°"
CHUNK_ROWS = 8192   # samples whose derivatives are held at once in a batch


@dataclass(frozen=True)
class Propagation:
    """Derivatives and constant uncertainties of a solved batch, and what they give."""

    response: LogKResponse
    constants: ConstantUncertainty
    exact: bool = True    # γ moves with the ionic strength in the derivatives

    @property
    def terms(self) -> ConstantTerms:
        return self.response.terms

    def sd(self, derivative: np.ndarray) -> np.ndarray:
        """Standard uncertainty of the result whose derivatives (n, ..., E) are given."""
        return self.constants.sd(derivative)

    def pH(self) -> np.ndarray:
        """u(pH), (n,): zero where the pH is fixed."""
        return self.sd(self.response.pH)

    def log10_activity(self, nu: np.ndarray) -> np.ndarray:
        """u(log10 a) of every species (n, s), *nu* their stoichiometry in components."""
        return self.sd(self.response.species(nu))

    def saturation_index(self, tables: TableSet, name: str) -> np.ndarray:
        """u(SI) of solid *name*, (n,)."""
        return self.sd(self.response.saturation_index(tables.resolve(name, "solids")))

    def contributors(self, derivative: np.ndarray, k: int, shown: int = CONTRIBUTORS_SHOWN
                     ) -> list[dict[str, Any]]:
        """The *shown* constants (log K or ΔH°) that add most to u² of sample *k*'s
        result, with their share of u², their uncertainty and the derivative; constants
        below :data:`MIN_SHARE` of u² are not named."""
        by_constant, by_enthalpy = self.constants.variance_parts(derivative[k:k + 1])
        parts = np.concatenate([by_constant[0], by_enthalpy[0]])
        total = float(parts.sum())
        if not total > 0:
            return []
        size = self.terms.size
        out = []
        for p in np.argsort(-parts, kind="stable")[:shown]:
            if parts[p] < MIN_SHARE * total:
                break
            e = int(p % size)
            section, name = self.terms.entries[e]
            enthalpy_part = bool(p >= size)
            sigma = (self.constants.enthalpy[k, e] if enthalpy_part
                     else self.constants.log10_k[e])
            out.append({"constant": name, "kind": section, "parameter":
                        ENTHALPY_PART if enthalpy_part else CONSTANT_PART,
                        "share": float(parts[p] / total),
                        "log10_k_uncertainty": float(sigma),
                        "stated": bool(self.constants.stated[e]) or enthalpy_part,
                        "class": self.constants.classes[e],
                        "sensitivity": float(derivative[k, e])})
        return out


def propagation(system: ChemicalSystem, tables: TableSet, state: PhaseEquilibrium,
                solids: tuple[str, ...] | None = None) -> Propagation:
    """The :class:`Propagation` of a batch solved with its phases, covering the
    saturation indices of *solids* (default: every solid it can form)."""
    terms = constant_terms(system, tables, phase_entries(system, tables, state, solids))
    response = log_k_response(state.basis, state.equilibrium, state.bound, state.free, terms,
                              state.solids, state.present)
    return Propagation(response, constant_uncertainty(tables, terms, state.t_C),
                       is_exact(state.bound))


def batch_pH_uncertainty(system: ChemicalSystem, tables: TableSet, equilibrium: Equilibrium,
                         bound, pH_fixed: bool, pe_fixed: bool = False) -> np.ndarray:
    """u(pH) (n,) of a batch solved without solids or gases (the batch runner's rows), by
    the adjoint (:func:`pH_log_k_derivative`), in chunks of :data:`CHUNK_ROWS` samples."""
    free = np.ones(system.n_components, dtype=bool)
    free[0] = not pH_fixed
    if pe_fixed:
        free[system.components.index(ELECTRON)] = False
    terms = constant_terms(system, tables)
    n = equilibrium.molality.shape[0]
    out = np.empty(n)
    for start in range(0, n, CHUNK_ROWS):
        rows = np.arange(start, min(start + CHUNK_ROWS, n))
        bound_rows = bound_slice(bound, rows)
        derivative = pH_log_k_derivative(system, _take(equilibrium, rows), bound_rows, free,
                                         terms)
        sigma = constant_uncertainty(tables, terms, bound_rows.t_C)
        out[rows] = sigma.sd(derivative)
    return out


def phase_entries(system: ChemicalSystem, tables: TableSet, state: PhaseEquilibrium | None,
                  solids: tuple[str, ...] | None = None) -> list[tuple[str, str]]:
    """(section, name) of the solids and gases whose log K a result reads."""
    names = formable_solids(system, tables) if solids is None else solids
    out = [("solids", name) for name in names]
    if state is not None:
        out += [("solids", s.name) for s in state.solids]
        out += [("gases", g.name) for g in state.basis.gases]
    return out


def result_propagation(result) -> Propagation:
    """The :class:`Propagation` of one result (a sample of a batch, or a single solve)."""
    system, tables = result.system, result.tables
    state = result.state
    t = np.array([result.temperature_C])
    if state is not None:
        rows = np.array([result.sample])
        terms = constant_terms(system, tables, phase_entries(system, tables, state))
        bound = bound_slice(state.bound, rows)
        response = log_k_response(state.basis, _take(state.equilibrium, rows), bound,
                                  state.free, terms, state.solids, state.present[rows])
    else:
        fixed = np.zeros(system.n_components, dtype=bool)
        fixed[0] = "pH" in result.recipe.fix
        if "pe" in result.recipe.fix:   # a held pe, like a held pH, does not move
            fixed[system.components.index(ELECTRON)] = True
        terms = constant_terms(system, tables, phase_entries(system, tables, None))
        bound = result.model.bind(system.properties, t)
        response = log_k_response(gas_basis(system, [], fixed), result.equilibrium, bound,
                                  ~fixed, terms)
    return Propagation(response, constant_uncertainty(tables, terms, t), is_exact(bound))


@dataclass(frozen=True)
class ResultUncertainty:
    """The uncertainty of one result's pH, species activities and saturation indices."""

    pH: float
    log10_activity: dict[str, float]
    saturation_indices: dict[str, float]
    contributors: dict[str, Any]
    defaults: list[dict]
    stated: int
    enthalpy_stated: int
    pH_fixed: bool
    exact: bool

    def to_dict(self) -> dict[str, Any]:
        """The ``"uncertainty"`` object of the JSON result."""
        return {"method": METHOD, "pH": self.pH, "pH_fixed": self.pH_fixed,
                "log10_activity": self.log10_activity,
                "saturation_indices": self.saturation_indices,
                "constants_with_stated_uncertainty": self.stated,
                "enthalpy_uncertainties_stated": self.enthalpy_stated,
                "defaults_used": self.defaults,
                "activity_coefficients": "move with the ionic strength" if self.exact else
                "held at their converged values (a model whose coefficients depend on the "
                "composition): the figures leave out that second-order share",
                "not_included": "the activity model's own uncertainty (see the spread "
                                "between models), the amounts dissolved, the measured pH"}


def uncertainty_object(result) -> dict[str, Any]:
    """The ``"uncertainty"`` object of a result's JSON, with the checks a tool added."""
    checks = {k: v for k, v in result.uncertainty_checks.items() if k != "lines"}
    return {**result.uncertainty.to_dict(), **checks}


def result_uncertainty(result) -> ResultUncertainty:
    """The :class:`ResultUncertainty` of one result."""
    prop = result_propagation(result)
    response = prop.response
    species = prop.log10_activity(result.system.nu)[0]
    si = {name: prop.response.saturation_index(result.tables.resolve(name, "solids"))
          for name in result.saturation_indices}
    pH_fixed = "pH" in result.recipe.fix
    contributors: dict[str, Any] = {
        "pH": [] if pH_fixed else prop.contributors(response.pH, 0),
        "saturation_indices": {name: prop.contributors(d, 0) for name, d in si.items()}}
    return ResultUncertainty(
        pH=0.0 if pH_fixed else float(prop.pH()[0]),
        log10_activity={name: float(v) for name, v in zip(result.system.species, species)},
        saturation_indices={name: float(prop.sd(d)[0]) for name, d in si.items()},
        contributors=contributors, defaults=prop.constants.defaults_used(),
        stated=int(prop.constants.stated.sum()),
        enthalpy_stated=int(np.count_nonzero(prop.constants.enthalpy[0] > 0)),
        pH_fixed=pH_fixed, exact=prop.exact)


def near_corrosive_notice(result, uncertainty: ResultUncertainty) -> list[Notice]:
    """A caution when the pH is not corrosive but within :data:`NEAR_LIMIT_SD` of its
    uncertainty of a corrosive limit (the caution itself never depends on it)."""
    if uncertainty.pH_fixed or uncertainty.pH <= 0:
        return []
    h_limit, oh_limit = corrosive_limits()
    system = result.system
    log10_h = -result.pH
    u_h = uncertainty.log10_activity[system.species[0]]
    near = None
    if log10_h < h_limit <= log10_h + NEAR_LIMIT_SD * u_h:
        near = "low"
    oh = next((s for s in system.species if s == "OH-"), None)
    if oh is not None:
        log10_oh = float(np.log10(result.species_activity(oh)))
        if log10_oh < oh_limit <= log10_oh + NEAR_LIMIT_SD * uncertainty.log10_activity[oh]:
            near = "high"
    if near is None:
        return []
    return [Notice(CAUTION, "near-corrosive",
                   f"CAUTION: pH {result.pH:.2f} ± {uncertainty.pH:.2f} is within "
                   f"{NEAR_LIMIT_SD:g} standard uncertainties of the corrosive limit "
                   f"({'pH 2' if near == 'low' else 'pH 12.5 at 25 °C'}): the solution may "
                   f"be corrosive; measure it, treat it as corrosive until then, and {DEFER}",
                   {"pH": result.pH, "pH_uncertainty": uncertainty.pH, "side": near})]


def report_lines(result) -> list[str]:
    """The report's "uncertainty" section: pH ± u, its main constants, SI ± u, defaults."""
    unc = result.uncertainty
    lines = ["", f"uncertainty from the constants ({METHOD})"]
    if unc.pH_fixed:
        lines.append("  pH                 fixed by the recipe (its uncertainty is not "
                     "the constants')")
    else:
        lines.append(f"  pH                 ± {unc.pH:.3f}")
        for c in unc.contributors["pH"]:
            lines.append(f"    {c['constant']:<17}{c['parameter']} ± {c['log10_k_uncertainty']:.3g}"
                         f" ({'stated' if c['stated'] else 'class default'}): "
                         f"{100 * c['share']:.0f} % of the variance")
    if unc.saturation_indices:
        width = max(len(name) for name in unc.saturation_indices)
        lines.append("  saturation index")
        for name, u in unc.saturation_indices.items():
            lines.append(f"    {name:<{width}}  ± {u:.2f}")
    for d in unc.defaults:
        names = ", ".join(d["constants"][:6]) + (" …" if len(d["constants"]) > 6 else "")
        lines.append(f"  default ± {d['log10_k_uncertainty']:g} ({d['class']}): {names}")
    lines += result.uncertainty_checks.get("lines", [])
    return lines
