"""Safety cautions and data-quality warnings attached to results.

Where a number can hurt someone the report says so: corrosive pH (US EPA 40 CFR
261.22), toxic gas that an acid solution releases (H2S from sulfide, HCN from cyanide,
chlorine from hypochlorite), chloramines from hypochlorite with ammonia (and their harm in
water for dialysis or fish), free ammonia above pH 9.5, lead, copper, cadmium and arsenic
in water (regulated in drinking water), and a charge-balance error
beyond ±5 % that makes an analysis doubtful. Gas checks look for the species by
formula, so they apply to any table that has them and are skipped only when the
solution holds none of that species. The cautions never replace local codes, measured
values or licensed practice.
"""

from __future__ import annotations

from typing import Iterable, Mapping

import numpy as np

from ._derived import charge_balance_error_percent
from ..chemistry._formula import Formula, molar_mass, parse_formula
from ..chemistry._ingredients import makeup
from ..chemistry._redox import unlinked
from ..chemistry._tableset import TableSet
from ..chemistry._water import log10_kw
from ..core._system import log10_k_at
from ..inputs._analytes import HYPOCHLORITE
from ..notices import CAUTION, DATA_QUALITY, VALIDITY, Notice
from ._derived_chlorine import (CHLORINE_TRACE, ammonia_nitrogen, as_cl2_mg_per_L,
                                breakpoint_mass_ratio, combined_chlorine, free_chlorine,
                                trichloramine_share)
from ._redox import pe_of
from ._solved_samples import SolvedSamples, samples_of_result, species_share
from ._speciation import Speciation

#: 40 CFR 261.22(a)(1) (revised as of July 1, 2019; re-read): an aqueous waste with a pH
#: ≤ 2 or ≥ 12.5, by a pH meter using SW-846 Method 9040C, is corrosive.
CORROSIVE_LOW_PH = 2.0
CORROSIVE_HIGH_PH = 12.5
#: Method 9040C reads the pH of the sample at 25 °C  # from memory
CORROSIVE_REFERENCE_C = 25.0
CORROSIVE_RULE = ("the US EPA corrosivity characteristic (40 CFR 261.22) is pH ≤ 2 or ≥ 12.5 "
                  "measured at 25 °C; judged here on the hydrogen- and hydroxide-ion "
                  "activities it implies, which hold at any temperature (common practice)")
#: Share of a total present as the volatile acid (H2S, HCN) worth a caution: 1 %, which
#: for sulfide (pKa ≈ 7) is below pH ≈ 9 and for cyanide (pKa ≈ 9.2) below pH ≈ 11.
VOLATILE_SHARE = 0.01
#: Hypochlorite releases chlorine when acidified; below about pH 5 (with chloride)
#: chlorine is a real share of the free chlorine  # common practice
CHLORINE_RELEASE_PH = 5.0
FREE_AMMONIA_PH = 9.5      # above it, most ammonia is free NH3  # common practice
CHARGE_BALANCE_LIMIT = 5.0  # % acceptance guide for water analyses  # common practice
DEFER = "follow your site's safety rules, local codes and licensed practice"
#: Elements whose level in drinking water is regulated and that a solve can put a number
#: on (lead and copper from pipes, cadmium, arsenic); the caution names each one present.
DRINKING_WATER_ELEMENTS = {"Pb": "lead", "Cu": "copper", "Cd": "cadmium", "As": "arsenic"}
DRINKING_WATER_ADVICE = ("these metals are regulated in drinking water, and decisions on them "
                         "(tap sampling, action levels, corrosion control, lead service lines, "
                         "compliance) follow local codes, measured values and licensed practice")
_VOLATILE = (("H2S", "sulfide", "hydrogen sulfide"), ("HCN", "cyanide", "hydrogen cyanide"))
CHLORINE_GAS = parse_formula("Cl2")
NITROGEN_MG_PER_MOL = 1000.0 * molar_mass("N")
CHLORAMINE_GAS_TEXT = ("dichloramine and nitrogen trichloride (NCl3, which forms at low pH "
                       "and high chlorine-to-ammonia ratios) are volatile, irritant and toxic "
                       "gases; never mix bleach with ammonia or ammonium-containing cleaners, "
                       f"ventilate, and {DEFER}")
CHLORAMINE_KINETICS_TEXT = ("VALIDITY: chloramine speciation is kinetically controlled "
                            "(formation in seconds to minutes, dichloramine and NCl3 slower, "
                            "breakpoint oxidation over hours); these figures are the "
                            "substitution equilibrium, an approximation best below about 5 mg "
                            "Cl2 per mg NH3-N")
CHLORAMINE_WATER_TEXT = ("CAUTION: chloraminated water must not be used untreated for "
                         "haemodialysis (chloramine causes haemolysis) or for fish and other "
                         "aquatic life (toxic through the gills); unlike free chlorine it does "
                         "not leave on standing, aerating or boiling, and is removed with "
                         "activated (catalytic) carbon or a dechlorinating agent, verified by "
                         "a total-chlorine test (common practice); follow the dialysis "
                         "unit's, aquarium's or discharge permit's rules, local codes and "
                         "licensed practice")
_AMMONIA = parse_formula("NH3")
_HYDROXIDE = parse_formula("OH-")


def cautions(result: Speciation) -> list[Notice]:
    """Every caution and data-quality notice that applies to *result*."""
    out = []
    ph = result.pH
    hydroxide = _species(result, _HYDROXIDE)
    log10_oh = (np.log10(result.species_activity(hydroxide)) if hydroxide is not None
                else np.nan)
    corrosive = corrosive_caution(-ph, log10_oh, ph, result.temperature_C)
    if corrosive is not None:
        out.append(corrosive)
    for formula, parent, gas in _VOLATILE:
        found = _share(result, parse_formula(formula))
        if found is not None and found[0] >= VOLATILE_SHARE:
            out.append(Notice(
                CAUTION, "toxic-gas",
                f"CAUTION: {parent} at pH {ph:.2f}: {100 * found[0]:.3g} % of it is "
                f"dissolved {formula} ({gas}), a toxic gas that escapes from the "
                f"solution{_pressure(result, found[1])}; acid releases more; "
                f"ventilate, never acidify it, and {DEFER}",
                {"species": found[1], "share": found[0], "pH": ph}))
    out.extend(chlorine_cautions(result))
    ammonia = _share(result, _AMMONIA)
    if ammonia is not None and ph > FREE_AMMONIA_PH:
        out.append(Notice(
            CAUTION, "free-ammonia",
            f"CAUTION: ammonia at pH {ph:.2f} (above {FREE_AMMONIA_PH:g}): "
            f"{100 * ammonia[0]:.3g} % is free NH3, which escapes as an irritant gas "
            f"and is toxic to fish; ventilate and {DEFER}", {"share": ammonia[0], "pH": ph}))
    levels = dissolved_levels(result.totals, result.tables)
    metals = drinking_water_caution(levels)
    if metals is not None:
        out.append(metals)
    out.extend(_balanced_by_protons(result))
    error = charge_balance_error_percent(result)
    if abs(error) > CHARGE_BALANCE_LIMIT:
        out.append(Notice(
            DATA_QUALITY, "charge-balance",
            f"DATA QUALITY: the charge-balance error is {error:+.1f} %, beyond the "
            f"±{CHARGE_BALANCE_LIMIT:g} % usually accepted for a water analysis: an "
            f"ion may be missing or mismeasured; check the analysis before relying "
            f"on the results (or balance_on a major ion), and base decisions on "
            f"measured values, local codes and licensed practice",
            {"error_percent": error, "limit_percent": CHARGE_BALANCE_LIMIT}))
    return out


def chlorine_cautions(result: Speciation) -> list[Notice]:
    """The cautions on free chlorine and chloramines of *result*: chlorine gas from
    hypochlorite below about pH 5, chloramines (NCl3 above all) from hypochlorite with
    ammonia, chloramine in water for dialysis or fish, and the kinetic limits of the
    equilibrium speciation."""
    samples = samples_of_result(result)
    ph = result.pH
    out = []
    reduced = _reduced_chlorine(result, samples)
    if reduced is not None:
        out.append(reduced)
    free = float(free_chlorine(samples)[0])
    if ph < CHLORINE_RELEASE_PH and free >= CHLORINE_TRACE:
        gas = _share_of(result, CHLORINE_GAS, free)
        out.append(Notice(
            CAUTION, "chlorine-release",
            f"CAUTION: hypochlorite at pH {ph:.2f} (below about {CHLORINE_RELEASE_PH:g}) "
            f"releases chlorine gas: {100 * gas[0]:.3g} % of the free chlorine is dissolved "
            f"Cl2{_pressure(result, gas[1]) if gas[1] else ''}; never mix hypochlorite with "
            f"acid, ventilate, and {DEFER}", {"pH": ph, "Cl2_share": gas[0]}))
    combined = float(combined_chlorine(samples)[0])
    if not combined >= CHLORINE_TRACE:
        return out
    mg = float(as_cl2_mg_per_L(samples, np.array([combined]))[0])
    ncl3 = float(trichloramine_share(samples)[0])
    out.append(Notice(
        CAUTION, "chloramine-gas",
        f"CAUTION: hypochlorite with ammonia forms chloramines ({mg:.3g} mg/L as Cl2 of "
        f"combined chlorine, {100 * ncl3:.3g} % of it as nitrogen trichloride NCl3): "
        f"{CHLORAMINE_GAS_TEXT}", {"combined_chlorine_mg_per_L_as_Cl2": mg,
                                    "NCl3_share": ncl3}))
    out.append(Notice(CAUTION, "chloramine-water-use", CHLORAMINE_WATER_TEXT,
                      {"combined_chlorine_mg_per_L_as_Cl2": mg}))
    out.append(Notice(VALIDITY, "chloramine-kinetics", _kinetics_text(samples),
                      {"combined_chlorine_mg_per_L_as_Cl2": mg}))
    return out


def dosed_chlorine(result: Speciation) -> float:
    """Free chlorine the recipe brought (mol of OCl- per kg water), counted in the tables
    without the redox couples: a linked set has turned it into chloride and electrons."""
    base = unlinked(result.tables) or result.tables
    name = next((c for c, comp in base.components.items()
                 if parse_formula(comp.formula) == HYPOCHLORITE), None)
    if name is None:
        return 0.0
    recipe = result.recipe
    brought = sum(amount * makeup(ingredient, base).per_mole.get(name, 0.0)
                  for ingredient, amount in recipe.dissolve)
    return brought + sum(amount for c, amount in recipe.components if c == name)


def _reduced_chlorine(result: Speciation, samples: SolvedSamples) -> Notice | None:
    """The notice for hypochlorite that a stated redox level reduced to chloride."""
    if unlinked(result.tables) is None:
        return None
    dosed = dosed_chlorine(result)
    if dosed < CHLORINE_TRACE:
        return None
    left = np.nan_to_num(free_chlorine(samples)) + np.nan_to_num(combined_chlorine(samples))
    share = float(left[0]) / dosed
    if share > 0.99:
        return None
    mg = float(as_cl2_mg_per_L(samples, np.array([dosed]))[0])
    pe = pe_of(result) or 0.0
    return Notice(VALIDITY, "chlorine-reduced",
                  f"VALIDITY: at the stated redox level (pe {pe:.2f}) equilibrium "
                  f"reduces {100 * (1 - share):.3g} % of the {mg:.3g} mg/L of chlorine (as "
                  f"Cl2) the recipe brings to chloride; real water keeps free and combined "
                  f"chlorine for hours to days, so these results show where it ends, not what "
                  f"is there after dosing; for the residuals, state no redox level",
                  {"dosed_mg_per_L_as_Cl2": mg, "left_share": share})


def _share_of(result: Speciation, formula: Formula, total: float) -> tuple[float, str | None]:
    """(molality of species *formula* / *total*, its name), (0, None) without it."""
    name = _species(result, formula)
    return (0.0, None) if name is None else (result.species_molality(name) / total, name)


def _kinetics_text(samples: SolvedSamples) -> str:
    """Why chloramine speciation is an approximation here, with the sample's Cl2 : N."""
    chlorine = as_cl2_mg_per_L(samples, np.nan_to_num(free_chlorine(samples))
                               + np.nan_to_num(combined_chlorine(samples)))[0]
    nitrogen = float(ammonia_nitrogen(samples)[0]) * samples.water_kg_per_L[0] \
        * NITROGEN_MG_PER_MOL
    ratio = chlorine / nitrogen
    past = (f"; at {ratio:.3g} mg Cl2 per mg NH3-N this sample is past the breakpoint "
            f"({breakpoint_mass_ratio():.2f}), where real water loses its ammonia to N2 and "
            f"its combined chlorine within hours, which no equilibrium here includes"
            if ratio >= breakpoint_mass_ratio() else "")
    return f"{CHLORAMINE_KINETICS_TEXT}{past}; measure free and total chlorine"


def dissolved_levels(totals: Mapping[str, float], tables: TableSet) -> dict[str, float]:
    """mg per kg of water of each element of :data:`DRINKING_WATER_ELEMENTS` dissolved,
    from component *totals* (mol/kg water); elements absent are left out."""
    levels: dict[str, float] = {}
    for component, molality in totals.items():
        elements = tables.components[component].elements if component in tables.components \
            else {}
        for element in DRINKING_WATER_ELEMENTS.keys() & elements.keys():
            if molality > 0:
                levels[element] = levels.get(element, 0.0) + (
                    1000.0 * molality * elements[element] * molar_mass(element))
    return levels


def drinking_water_caution(levels: Mapping[str, float]) -> Notice | None:
    """The caution on lead, copper, cadmium and arsenic in water: their computed levels
    (mg per kg of water) are estimates, and decisions on them belong to local codes."""
    if not levels:
        return None
    shown = ", ".join(f"{DRINKING_WATER_ELEMENTS[e]} {_level(mg)}" for e, mg in levels.items())
    return Notice(CAUTION, "drinking-water-metals",
                  f"CAUTION: dissolved {shown} per kg of water, computed from published "
                  f"constants, not measured; {DRINKING_WATER_ADVICE}",
                  {"mg_per_kg_water": dict(levels)})


def drinking_water_text(elements: Iterable[str]) -> str:
    """The same caution without numbers, for a batch row (its columns hold the numbers)."""
    names = ", ".join(DRINKING_WATER_ELEMENTS[e] for e in elements)
    return (f"CAUTION: dissolved {names} computed from published constants, not measured; "
            f"{DRINKING_WATER_ADVICE}")


def _level(mg: float) -> str:
    return f"{mg:.3g} mg" if mg >= 0.1 else f"{1000 * mg:.3g} µg"


def _balanced_by_protons(result: Speciation) -> list[Notice]:
    """A notice when an analysis without pH needed much acid or hydroxide to balance.

    Without a measured pH the protons are set so that the sample is electroneutral; when
    they make up more than :data:`CHARGE_BALANCE_LIMIT` % of the ions' charge, the pH comes
    from a missing ion rather than from the sample.
    """
    solution = result.recipe.solution
    given = next((c for c in (solution.conversions if solution else ())
                  if c.key == "[analysis] pH" and c.given == "not measured"), None)
    if given is None:
        return []
    scale = sum(abs(result.tables.entry(c).charge) * m for c, m in result.totals.items()
                if c != "H+")
    share = 100.0 * abs(given.value) / scale if scale > 0 else 0.0
    if share <= CHARGE_BALANCE_LIMIT:
        return []
    what = "hydroxide" if given.value < 0 else "acid"
    return [Notice(DATA_QUALITY, "balanced-by-protons",
                   f"DATA QUALITY: the analysis gives no pH, and its ions were balanced with "
                   f"{1000 * abs(given.value):.3g} mmol/kg of {what} ({share:.3g} % of their "
                   f"charge): the computed pH {result.pH:.2f} reflects a missing or "
                   f"mismeasured ion, not the sample; give the measured pH (and alkalinity), "
                   f"or check the analysis", {"share_percent": share, "protons": given.value})]


def corrosive_limits() -> tuple[float, float]:
    """log10 a(H+) and log10 a(OH-) at or above which a solution is corrosive.

    The regulatory criterion is a pH measured at 25 °C; the pH of the same solution moves
    with temperature (water's Kw), the activity of its acid or base hardly does. The
    limits are therefore the activities at pH 2 and at pH 12.5 at 25 °C, and the caution
    holds at any temperature (0.1 mol/kg NaOH is corrosive at 60 °C, where its pH is 11.9).
    """
    return -CORROSIVE_LOW_PH, CORROSIVE_HIGH_PH + float(log10_kw(CORROSIVE_REFERENCE_C))


def corrosive_text() -> str:
    """The corrosive caution's advice, shared by a single result and every batch row."""
    return f"{CORROSIVE_RULE}; wear eye and skin protection and {DEFER}"


def corrosive_caution(log10_h: float, log10_oh: float, ph: float, t_C: float) -> Notice | None:
    """The corrosive caution for a solution with these log10 activities, or None."""
    h_limit, oh_limit = corrosive_limits()
    if log10_h >= h_limit:
        what = (f"hydrogen-ion activity {10 ** log10_h:.3g} is at or above {10 ** h_limit:.3g}, "
                f"that of pH {CORROSIVE_LOW_PH:g}")
    elif np.isfinite(log10_oh) and log10_oh >= oh_limit:
        what = (f"hydroxide activity {10 ** log10_oh:.3g} is at or above {10 ** oh_limit:.3g}, "
                f"that of pH {CORROSIVE_HIGH_PH:g} at {CORROSIVE_REFERENCE_C:g} °C")
    else:
        return None
    return Notice(CAUTION, "corrosive-ph",
                  f"CAUTION: corrosive at pH {ph:.2f} ({t_C:g} °C): {what}; {corrosive_text()}",
                  {"pH": ph, "temperature_C": t_C,
                   "limits": [CORROSIVE_LOW_PH, CORROSIVE_HIGH_PH]})


def _species(result: Speciation, formula: Formula) -> str | None:
    tables = result.tables
    return next((s for s in result.system.species
                 if parse_formula(tables.entry(s).formula) == formula), None)


def _share(result: Speciation, formula: Formula) -> tuple[float, str] | None:
    """(share of its parent total that is the species *formula*, its name), or None."""
    name = _species(result, formula)
    if name is None:
        return None
    total = result.parent_total(name)
    if total <= 0:
        return None
    return result.species_molality(name) / total, name


def _pressure(result: Speciation, species: str) -> str:
    """", about N atm over it at equilibrium" from the tables' gas of *species*, if any."""
    t = np.array([result.temperature_C])
    for gas in result.tables.gases.values():
        if dict(gas.reaction) == {species: 1.0}:
            log_p = np.log10(result.species_activity(species)) - log10_k_at(gas.logk, t)[0]
            return f" (about {10 ** log_p:.2g} atm over it at equilibrium)"
    return ""


def batch_caution_flags(samples: SolvedSamples) -> list[tuple[str, np.ndarray]]:
    """The cautions of :func:`cautions` on gases, chlorine, chloramines (with their
    kinetic caveat) and free ammonia for every sample of a batch, as (text, mask (n,))
    pairs: one text per kind, so rows share their messages."""
    out = []
    ph = samples.pH
    for formula, parent, gas in _VOLATILE:
        share = species_share(samples, parse_formula(formula))
        if share is not None:
            out.append((f"CAUTION: {parent}: {100 * VOLATILE_SHARE:g} % or more of it is "
                        f"dissolved {formula} ({gas}), a toxic gas that escapes from the "
                        f"solution; acid releases more; ventilate, never acidify it, and "
                        f"{DEFER}", np.nan_to_num(share) >= VOLATILE_SHARE))
    with np.errstate(invalid="ignore"):
        free = np.nan_to_num(free_chlorine(samples)) >= CHLORINE_TRACE
        combined = np.nan_to_num(combined_chlorine(samples)) >= CHLORINE_TRACE
    if np.any(free):
        out.append((f"CAUTION: hypochlorite below about pH {CHLORINE_RELEASE_PH:g} releases "
                     f"chlorine gas; never mix hypochlorite with acid, ventilate, and {DEFER}",
                     free & (ph < CHLORINE_RELEASE_PH)))
    if np.any(combined):
        out.append((f"CAUTION: hypochlorite with ammonia forms chloramines: "
                    f"{CHLORAMINE_GAS_TEXT}", combined))
        out.append((CHLORAMINE_WATER_TEXT, combined))
        out.append((f"{CHLORAMINE_KINETICS_TEXT}; past about "
                    f"{breakpoint_mass_ratio():.1f} real water goes through breakpoint "
                    "(ammonia to N2, combined chlorine gone), which no equilibrium here "
                    "includes", combined))
    ammonia = species_share(samples, _AMMONIA)
    if ammonia is not None:
        out.append((f"CAUTION: ammonia above pH {FREE_AMMONIA_PH:g}: much of it is free NH3, "
                    f"which escapes as an irritant gas and is toxic to fish; ventilate and "
                    f"{DEFER}", np.isfinite(ammonia) & (ph > FREE_AMMONIA_PH)))
    return out
