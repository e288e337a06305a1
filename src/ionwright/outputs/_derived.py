"""Quantities derived from a speciated solution, as water chemists report them.

The pH on the scale of the standard buffers (:mod:`._conventional_ph`), charge-balance
error, alkalinity and hardness as CaCO3, CO2 partial pressure, the
un-ionised ammonia fraction, total dissolved solids and the Langelier index, each from
the species of the result and the constants of its own tables. Per-litre values use the
recipe's solution (water per litre from its given or estimated density). A quantity
that does not apply (no ammonia, no carbonate) is ``None``, so the keys never change.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ._conventional_ph import conventional_pH
from ..chemistry._formula import Formula, parse_formula
from ..core._acid_base import alkalinity_weights
from ..core._system import WATER, log10_k_at

CALCIUM_CARBONATE = parse_formula("CaCO3")
NITROGEN = parse_formula("N")
CALCITE = "calcite"
_CO2 = parse_formula("CO2")
_AMMONIA = parse_formula("NH3")
_HARDNESS_IONS = (parse_formula("Ca2+"), parse_formula("Mg2+"))
_BICARBONATE = parse_formula("HCO3-")
KEYS = ("pH_standards_scale", "charge_balance_error_percent", "alkalinity_mg_per_L_as_CaCO3",
        "hardness_mg_per_L_as_CaCO3", "log10_pCO2_atm", "unionized_ammonia_fraction",
        "unionized_ammonia_mg_per_L_as_N", "tds_mg_per_L", "langelier_index")


def alkalinity(result) -> float:
    """Total alkalinity of *result* in eq per kg of water."""
    return float(alkalinity_weights(result.system, result.temperature_C) @ result.molality)


def charge_balance_error_percent(result) -> float:
    """100·(Σ cation eq − Σ anion eq)/(Σ cation eq + Σ anion eq) over all species."""
    z, m = result.system.charge, result.molality
    cations = float(np.where(z > 0, z, 0.0) @ m)
    anions = float(np.where(z < 0, -z, 0.0) @ m)
    total = cations + anions
    return 100.0 * (cations - anions) / total if total > 0 else 0.0


def derived_quantities(result) -> dict[str, float | None]:
    """The ``"derived"`` object of the JSON result (keys in :data:`KEYS`)."""
    per_litre = water_kg_per_L(result)
    alk = alkalinity(result)
    ammonia = _ammonia(result)
    values = {
        "pH_standards_scale": conventional_pH(result),
        "charge_balance_error_percent": charge_balance_error_percent(result),
        "alkalinity_mg_per_L_as_CaCO3": alk * per_litre * _caco3_mg_per_eq(),
        "hardness_mg_per_L_as_CaCO3": _hardness(result) * per_litre
        * CALCIUM_CARBONATE.molar_mass * 1000.0,
        "log10_pCO2_atm": log10_pco2(result),
        "unionized_ammonia_fraction": None if ammonia is None else ammonia[0],
        "unionized_ammonia_mg_per_L_as_N": None if ammonia is None
        else ammonia[1] * per_litre * NITROGEN.molar_mass * 1000.0,
        "tds_mg_per_L": _dissolved_mass(result) * per_litre * 1000.0,
        "langelier_index": langelier_index(result, alk),
    }
    return {key: values[key] for key in KEYS}


def water_kg_per_L(result) -> float:
    """kg of water per litre of the result's solution."""
    from ..inputs._recipe import solution_of

    return solution_of(result.recipe, result.tables).water_kg_per_L


def log10_pco2(result) -> float | None:
    """log10 of the CO2 partial pressure (atm) in equilibrium with the solution.

    From the tables' CO2 gas constant, log10 p = Σ ν log10 a(dissolved form) − log10 K_H;
    None when the tables have no CO2 gas or the solution no carbonate.
    """
    for gas in result.tables.gases.values():
        if parse_formula(gas.formula) == _CO2 and set(gas.reaction) <= {*result.system.species,
                                                                         WATER}:
            log_a = sum(coeff * _log10_activity(result, name)
                        for name, coeff in gas.reaction.items())
            t = np.array([result.temperature_C])
            return float(log_a - log10_k_at(gas.logk, t)[0])
    return None


def langelier_index(result, alkalinity_eq_per_kg: float) -> float | None:
    """Langelier index pH − pHs, with pHs from the tables' own constants.

    pHs is the pH at which the water, with its calcium and alkalinity, would be just
    saturated with calcite: pHs = log K(CaCO3 + H+ = Ca+2 + HCO3-) − log10(γ_Ca m_Ca)
    − log10(γ_HCO3 · alkalinity), with total calcium and the result's γ. None without
    calcium, carbonate, calcite in the tables, or with alkalinity ≤ 0.

    References
    ----------
    Langelier, W.F. (1936) J. Am. Water Works Assoc. 28, 1500–1521.
    """
    calcium = _component(result, _HARDNESS_IONS[0])
    bicarbonate = _species(result, _BICARBONATE)
    if (calcium is None or bicarbonate is None or CALCITE not in result.tables.solids
            or alkalinity_eq_per_kg <= 0 or result.totals.get(calcium, 0.0) <= 0):
        return None
    t = np.array([result.temperature_C])
    calcite = result.tables.resolve(CALCITE, "solids")
    log_k_reaction = sum(m * float(log10_k_at(lk, t)[0]) for _, m, lk in calcite.terms)
    log_k_reaction += float(result.system.log10_k(t)[0][result.system.index(bicarbonate)])
    log_ca = np.log10(result.totals[calcium]) + result.log10_gamma[result.system.index(calcium)]
    log_alk = np.log10(alkalinity_eq_per_kg) + result.log10_gamma[
        result.system.index(bicarbonate)]
    return float(result.pH - (log_k_reaction - log_ca - log_alk))


def _ammonia(result) -> tuple[float, float] | None:
    """(free NH3 / total ammonia, free NH3 in mol/kg water), or None without ammonia."""
    free = _species(result, _AMMONIA)
    if free is None:
        return None
    total = result.parent_total(free)
    if total <= 0:
        return None
    m = result.species_molality(free)
    return m / total, m


def _hardness(result) -> float:
    """Total calcium plus magnesium, mol/kg water."""
    found = (_component(result, ion) for ion in _HARDNESS_IONS)
    return sum(result.totals.get(c, 0.0) for c in found if c is not None)


def _dissolved_mass(result) -> float:
    """Mass of every dissolved species, g per kg of water."""
    masses = np.array([_formula(result, name).molar_mass for name in result.system.species])
    return float(masses @ result.molality)


def _caco3_mg_per_eq() -> float:
    return CALCIUM_CARBONATE.molar_mass / 2.0 * 1000.0


def _formula(result, name: str) -> Formula:
    return parse_formula(result.tables.entry(name).formula)


def _component(result, formula: Formula) -> str | None:
    return next((c for c in result.system.components if _formula(result, c) == formula), None)


def _species(result, formula: Formula) -> str | None:
    return next((s for s in result.system.species if _formula(result, s) == formula), None)


def _log10_activity(result, name: str) -> float:
    if name == WATER:
        return result.log10_water_activity
    return float(np.log10(result.species_activity(name)))


# -- output -------------------------------------------------------------------------------

def solution_summary(result) -> dict[str, Any]:
    """The ``"solution"`` object of the JSON result: water, volume, density, conversions."""
    from ..inputs._recipe import solution_of

    sol = solution_of(result.recipe, result.tables)
    return {"water_kg": sol.water_kg, "volume_L": sol.volume_L,
            "density_g_per_mL": sol.density_g_per_mL, "density": sol.density_how,
            "density_method": sol.density_method, "rough_volumes": list(sol.rough_volumes),
            "conversions": [{"key": c.key, "given": c.given, "value": c.value,
                             "unit": c.unit, "note": c.note} for c in sol.conversions]}


def report_lines(result) -> list[str]:
    """The solution and derived-quantity sections of the text report."""
    from ..inputs._recipe import solution_of

    sol = solution_of(result.recipe, result.tables)
    how = ("given" if sol.density_how == "given" else "estimated: " + sol.density_method)
    lines = ["", (f"solution           {sol.water_kg:.5g} kg water in {sol.volume_L:.5g} L; "
                  f"density {sol.density_g_per_mL:.5f} g/mL"), f"  ({how})"]
    if sol.rough_volumes:
        lines.append(f"  rough volume from molar mass for: {', '.join(sol.rough_volumes)}")
    if sol.conversions:
        lines += ["", "inputs as given, and per kg of water"]
        for c in sol.conversions:
            lines.append(f"  {c.key:<30} {c.given:>22}  →  {c.value:.5g} {c.unit}"
                         + (f"  ({c.note})" if c.note else ""))
    d = derived_quantities(result)
    lines += ["", "derived",
              f"  pH, standards' scale       {d['pH_standards_scale']:8.3f} (what a meter "
              "calibrated with IUPAC/NIST buffers reads; Bates–Guggenheim convention)",
              f"  charge-balance error       {d['charge_balance_error_percent']:+8.2f} %",
              f"  alkalinity                 {d['alkalinity_mg_per_L_as_CaCO3']:8.4g} mg/L as CaCO3",
              f"  hardness                   {d['hardness_mg_per_L_as_CaCO3']:8.4g} mg/L as CaCO3",
              f"  total dissolved solids     {d['tds_mg_per_L']:8.4g} mg/L"]
    if d["log10_pCO2_atm"] is not None:
        lines.append(f"  log10 pCO2                 {d['log10_pCO2_atm']:8.3f} (atm)")
    if d["unionized_ammonia_fraction"] is not None:
        lines.append(f"  un-ionised ammonia         {100 * d['unionized_ammonia_fraction']:8.3g} % "
                     f"of total; {d['unionized_ammonia_mg_per_L_as_N']:.3g} mg/L as N")
    if d["langelier_index"] is not None:
        lines.append(f"  Langelier index            {d['langelier_index']:+8.2f} "
                     "(> 0 scale-forming, < 0 dissolves CaCO3)")
    return lines


def survey_table(samples: list[tuple[str, Any]]) -> str:
    """A one-line-per-sample table of derived quantities for several (label, result)."""
    head = (f"{'sample':<27}{'T °C':>6}{'pH':>6}{'CBE %':>7}{'alk':>7}{'hard':>7}"
            f"{'log pCO2':>9}{'SI calc':>8}{'LSI':>6}{'NH3 N':>8}")
    units = (f"{'':<27}{'':>6}{'':>6}{'':>7}{'mg/L CaCO3':>14}{'':>9}{'':>8}{'':>6}"
             f"{'mg/L':>8}")
    lines = [head, units]
    for label, r in samples:
        d = derived_quantities(r)
        si = r.saturation_indices.get(CALCITE)
        lines.append(
            f"{label[:26]:<27}{r.temperature_C:6.1f}{r.pH:6.2f}"
            f"{d['charge_balance_error_percent']:+7.1f}{d['alkalinity_mg_per_L_as_CaCO3']:7.0f}"
            f"{d['hardness_mg_per_L_as_CaCO3']:7.0f}{_cell(d['log10_pCO2_atm'], '9.2f')}"
            f"{_cell(si, '+8.2f')}{_cell(d['langelier_index'], '+6.2f')}"
            f"{_cell(d['unionized_ammonia_mg_per_L_as_N'], '8.3f')}")
    return "\n".join(lines)


def _cell(value: float | None, spec: str) -> str:
    """*value* formatted by *spec* (width first after any sign), or a dash when None."""
    width = int(spec.lstrip("+").split(".")[0])
    return f"{'–':>{width}}" if value is None else f"{value:{spec}}"
