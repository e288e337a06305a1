"""Quantities derived from speciated solutions, as water chemists report them: one
assembly for a single result and for every row of a batch.

The pH on the scale of the standard buffers (:mod:`._conventional_ph`), charge-balance
error, alkalinity (total and carbonate) and hardness as CaCO3, CO2 partial pressure and
dissolved CO2, un-ionised ammonia both ways (:mod:`._derived_ammonia`), free, combined and
total chlorine as Cl2 and the breakpoint dose of the ammonia (:mod:`._derived_chlorine`),
total dissolved solids in both conventions (:mod:`._derived_ions`), the saturation pH with
the Langelier and Ryznar indices (:mod:`._derived_carbonate`). :func:`derived_arrays` computes them for
n solved samples at once; :func:`derived_quantities` is the ``"derived"`` object of one
result, the same numbers. Per-litre values use the solution's water per litre (given or
estimated density). A quantity that does not apply (no ammonia, no carbonate) is NaN in
arrays and ``None`` in the JSON, so the keys never change.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ..core._acid_base import ALKALINITY_END_POINT_PH
from ._conventional_ph import conventional_pH_of
from ._derived_ammonia import (NITROGEN, activity_corrected_fraction, as_nitrogen_mg_per_L,
                               emerson_fraction_of)
from ._derived_chlorine import breakpoint_mass_ratio, chlorine_arrays
from ._derived_carbonate import (CALCITE, alkalinity_eq_per_kg, carbonate_alkalinity_eq_per_kg,
                                 dissolved_co2_mg_per_L, langelier_index, log10_pco2_atm,
                                 ryznar_index, saturation_pH)
from ._derived_ions import (CALCIUM_CARBONATE, TDS_CALCULATED, TDS_CONVENTIONS, TDS_SPECIES,
                            charge_balance_error_percent as _charge_balance_error,
                            hardness_mg_per_L_as_CaCO3, tds_calculated_mg_per_L,
                            tds_species_sum_mg_per_L)
from ._solved_samples import SolvedSamples, samples_of_result
from ..errors import RecipeError

#: mg of CaCO3 per equivalent of alkalinity
CACO3_MG_PER_EQ = CALCIUM_CARBONATE.molar_mass / 2.0 * 1000.0
#: The numbers of the ``"derived"`` object, in order.
NUMBER_KEYS = ("pH_standards_scale", "charge_balance_error_percent",
               "alkalinity_mg_per_L_as_CaCO3", "carbonate_alkalinity_mg_per_L_as_CaCO3",
               "hardness_mg_per_L_as_CaCO3", "log10_pCO2_atm", "dissolved_CO2_mg_per_L",
               "unionized_ammonia_fraction", "unionized_ammonia_mg_per_L_as_N",
               "unionized_ammonia_fraction_emerson", "unionized_ammonia_mg_per_L_as_N_emerson",
               "tds_mg_per_L", "tds_calculated_mg_per_L", "tds_species_sum_mg_per_L",
               "saturation_pH", "langelier_index", "ryznar_index",
               "free_chlorine_mg_per_L_as_Cl2", "combined_chlorine_mg_per_L_as_Cl2",
               "total_chlorine_mg_per_L_as_Cl2", "breakpoint_chlorine_mg_per_L_as_Cl2")
#: Every key of the ``"derived"`` object: the numbers, then the TDS convention used.
KEYS = (*NUMBER_KEYS, "tds_convention")
#: TDS convention by default: the calculated sum for analyses, the species sum otherwise.
TDS_AUTO = "auto"


def derived_arrays(s: SolvedSamples, tds: str = TDS_AUTO) -> dict[str, np.ndarray]:
    """Every number of :data:`NUMBER_KEYS` for each sample of *s*, shape (n,) each.

    *tds* chooses what ``tds_mg_per_L`` holds: ``"calculated"`` (Standard Methods
    1030E), ``"species-sum"``, or ``"auto"`` (calculated for analyses, species sum for
    recipes); both conventions are always given under their own keys too.
    """
    check_tds_convention(tds)
    w = s.water_kg_per_L
    alk = alkalinity_eq_per_kg(s)
    carbonate_alk = carbonate_alkalinity_eq_per_kg(s)
    calculated = tds_calculated_mg_per_L(s, carbonate_alk)
    species_sum = tds_species_sum_mg_per_L(s)
    phs = saturation_pH(s, carbonate_alk)
    free = activity_corrected_fraction(s)
    emerson = emerson_fraction_of(s)
    return {
        "pH_standards_scale": conventional_pH_of(s),
        "charge_balance_error_percent": _charge_balance_error(s),
        "alkalinity_mg_per_L_as_CaCO3": alk * w * CACO3_MG_PER_EQ,
        "carbonate_alkalinity_mg_per_L_as_CaCO3": carbonate_alk * w * CACO3_MG_PER_EQ,
        "hardness_mg_per_L_as_CaCO3": hardness_mg_per_L_as_CaCO3(s),
        "log10_pCO2_atm": log10_pco2_atm(s),
        "dissolved_CO2_mg_per_L": dissolved_co2_mg_per_L(s),
        "unionized_ammonia_fraction": free,
        "unionized_ammonia_mg_per_L_as_N": as_nitrogen_mg_per_L(s, free),
        "unionized_ammonia_fraction_emerson": emerson,
        "unionized_ammonia_mg_per_L_as_N_emerson": as_nitrogen_mg_per_L(s, emerson),
        "tds_mg_per_L": np.where(tds_is_calculated(s, tds), calculated, species_sum),
        "tds_calculated_mg_per_L": calculated,
        "tds_species_sum_mg_per_L": species_sum,
        "saturation_pH": phs,
        "langelier_index": langelier_index(s, phs),
        "ryznar_index": ryznar_index(s, phs),
        **chlorine_arrays(s),
    }


def check_tds_convention(tds: str) -> None:
    """Refuse a TDS convention that is not one of ours."""
    if tds not in (TDS_AUTO, *TDS_CONVENTIONS):
        raise RecipeError("tds", f"{tds!r} is not a TDS convention",
                          f"give one of {', '.join((TDS_AUTO, *TDS_CONVENTIONS))}")


def tds_is_calculated(s: SolvedSamples, tds: str) -> np.ndarray:
    """Which samples report the calculated TDS under *tds* (n,) bool."""
    if tds == TDS_AUTO:
        return np.asarray(s.analysis, dtype=bool)
    return np.full(s.n, tds == TDS_CALCULATED)


def derived_quantities(result) -> dict[str, Any]:
    """The ``"derived"`` object of the JSON result (keys in :data:`KEYS`)."""
    samples = samples_of_result(result)
    arrays = derived_arrays(samples)
    values: dict[str, Any] = {key: _number(arrays[key][0]) for key in NUMBER_KEYS}
    values["tds_convention"] = (TDS_CALCULATED if tds_is_calculated(samples, TDS_AUTO)[0]
                                else TDS_SPECIES)
    return values


def _number(value: float) -> float | None:
    return float(value) if math.isfinite(value) else None


def alkalinity(result) -> float:
    """Total alkalinity of *result* in eq per kg of water."""
    return float(alkalinity_eq_per_kg(samples_of_result(result))[0])


def charge_balance_error_percent(result) -> float:
    """100·(Σ cation eq − Σ anion eq)/(Σ cation eq + Σ anion eq) over all species."""
    return float(_charge_balance_error(samples_of_result(result))[0])


def water_kg_per_L(result) -> float:
    """kg of water per litre of the result's solution."""
    return float(samples_of_result(result).water_kg_per_L[0])


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


def _below_end_point(pH: float) -> str:
    """A note for the alkalinity of a sample already below the titration end point: the
    value is the proton-condition total, which a titration to that end point cannot see."""
    if pH >= ALKALINITY_END_POINT_PH:
        return ""
    return (f" (proton-condition total, Dickson 1981; at pH {pH:.2f} the sample is below the "
            f"{ALKALINITY_END_POINT_PH:g} end point, so a titration to it finds none)")


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
              f"  alkalinity                 {d['alkalinity_mg_per_L_as_CaCO3']:8.4g} mg/L as CaCO3"
              + _below_end_point(result.pH),
              f"  hardness                   {d['hardness_mg_per_L_as_CaCO3']:8.4g} mg/L as CaCO3",
              f"  total dissolved solids     {d['tds_mg_per_L']:8.4g} mg/L ("
              + ("Standard Methods 1030E calculated sum" if d["tds_convention"] == TDS_CALCULATED
                 else "sum of dissolved species") + ")"]
    if d["log10_pCO2_atm"] is not None:
        lines.append(f"  log10 pCO2                 {d['log10_pCO2_atm']:8.3f} (atm)")
    if d["dissolved_CO2_mg_per_L"] is not None:
        lines.append(f"  dissolved CO2              {d['dissolved_CO2_mg_per_L']:8.4g} mg/L")
    if d["unionized_ammonia_fraction"] is not None:
        lines.append(f"  un-ionised ammonia         {100 * d['unionized_ammonia_fraction']:8.3g} % "
                     f"of total; {d['unionized_ammonia_mg_per_L_as_N']:.3g} mg/L as N "
                     "(activity-corrected)")
    if d["unionized_ammonia_fraction_emerson"] is not None:
        lines.append(f"                             "
                     f"{100 * d['unionized_ammonia_fraction_emerson']:8.3g} % of total; "
                     f"{d['unionized_ammonia_mg_per_L_as_N_emerson']:.3g} mg/L as N "
                     "(Emerson et al. 1975, conditional)")
    lines += _chlorine_lines(d)
    if d["langelier_index"] is not None:
        lines.append(f"  Langelier index            {d['langelier_index']:+8.2f} "
                     f"(pHs {d['saturation_pH']:.2f}; > 0 scale-forming, < 0 dissolves CaCO3)")
        lines.append(f"  Ryznar index               {d['ryznar_index']:8.2f} "
                     "(below about 6 scale-forming, above about 7 corrosive)")
    return lines


def _chlorine_lines(d: dict[str, Any]) -> list[str]:
    """The report's chlorine residuals and the breakpoint dose of the ammonia, where they
    apply."""
    lines = []
    if d["total_chlorine_mg_per_L_as_Cl2"] is not None:
        free = d["free_chlorine_mg_per_L_as_Cl2"] or 0.0
        combined = d["combined_chlorine_mg_per_L_as_Cl2"] or 0.0
        lines.append(f"  chlorine, free / combined  {free:8.4g} / {combined:.4g} mg/L as Cl2 "
                     f"(total {d['total_chlorine_mg_per_L_as_Cl2']:.4g}"
                     + ("; an equilibrium estimate, see the notices)" if combined else ")"))
    if d["breakpoint_chlorine_mg_per_L_as_Cl2"] is not None:
        dose = d["breakpoint_chlorine_mg_per_L_as_Cl2"]
        lines.append(f"  chlorine demand of ammonia {dose:8.4g} "
                     f"mg/L as Cl2 (breakpoint, {breakpoint_mass_ratio():.2f} mg Cl2 per mg NH3-N, "
                     "stoichiometric; in practice 8–10, more with other reductants)")
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
