"""Safety cautions and data-quality warnings attached to results.

Where a number can hurt someone the report says so: corrosive pH (US EPA 40 CFR
261.22), toxic gas that an acid solution releases (H2S from sulfide, HCN from cyanide,
chlorine from hypochlorite), free ammonia above pH 9.5, and a charge-balance error
beyond ±5 % that makes an analysis doubtful. Gas checks look for the species by
formula, so they apply to any table that has them and are skipped only when the
solution holds none of that species. The cautions never replace local codes, measured
values or licensed practice.
"""

from __future__ import annotations

import numpy as np

from ._derived import charge_balance_error_percent
from ..chemistry._formula import Formula, parse_formula
from ..core._system import log10_k_at
from ..notices import CAUTION, DATA_QUALITY, Notice
from ._speciation import Speciation

CORROSIVE_LOW_PH = 2.0     # 40 CFR 261.22(a)(1): pH ≤ 2 or ≥ 12.5 is corrosive
CORROSIVE_HIGH_PH = 12.5
#: Share of a total present as the volatile acid (H2S, HCN) worth a caution: 1 %, which
#: for sulfide (pKa ≈ 7) is below pH ≈ 9 and for cyanide (pKa ≈ 9.2) below pH ≈ 11.
VOLATILE_SHARE = 0.01
#: Hypochlorite releases chlorine when acidified; below about pH 5 (with chloride)
#: chlorine is a real share of the free chlorine  # common practice
CHLORINE_RELEASE_PH = 5.0
FREE_AMMONIA_PH = 9.5      # above it, most ammonia is free NH3  # common practice
CHARGE_BALANCE_LIMIT = 5.0  # % acceptance guide for water analyses  # common practice
DEFER = "follow your site's safety rules, local codes and licensed practice"
_VOLATILE = (("H2S", "sulfide", "hydrogen sulfide"), ("HCN", "cyanide", "hydrogen cyanide"))
_HYPOCHLORITE = (parse_formula("ClO-"), parse_formula("HClO"))
_AMMONIA = parse_formula("NH3")


def is_corrosive(ph: np.ndarray | float) -> np.ndarray | bool:
    """Whether a pH counts as corrosive (40 CFR 261.22), for one pH or an array of them."""
    return (ph <= CORROSIVE_LOW_PH) | (ph >= CORROSIVE_HIGH_PH)


def corrosive_notice(ph: float | None = None) -> Notice:
    """The caution for a corrosive pH (*ph* None: the text shared by many samples)."""
    which = "" if ph is None else f" {ph:.2f} is corrosive"
    return Notice(CAUTION, "corrosive-ph",
                  f"CAUTION: {'corrosive pH' if ph is None else 'pH' + which} (pH ≤ "
                  f"{CORROSIVE_LOW_PH:g} or ≥ {CORROSIVE_HIGH_PH:g}, US EPA 40 CFR 261.22); "
                  f"wear eye and skin protection and {DEFER}",
                  {"pH": ph, "limits": [CORROSIVE_LOW_PH, CORROSIVE_HIGH_PH]})


def cautions(result: Speciation) -> list[Notice]:
    """Every caution and data-quality notice that applies to *result*."""
    out = []
    ph = result.pH
    if is_corrosive(ph):
        out.append(corrosive_notice(ph))
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
    if ph < CHLORINE_RELEASE_PH and any(_species(result, f) for f in _HYPOCHLORITE):
        out.append(Notice(
            CAUTION, "chlorine-release",
            f"CAUTION: hypochlorite at pH {ph:.2f} (below about {CHLORINE_RELEASE_PH:g}) "
            f"releases chlorine gas; never mix hypochlorite with acid, ventilate, and {DEFER}",
            {"pH": ph}))
    ammonia = _share(result, _AMMONIA)
    if ammonia is not None and ph > FREE_AMMONIA_PH:
        out.append(Notice(
            CAUTION, "free-ammonia",
            f"CAUTION: ammonia at pH {ph:.2f} (above {FREE_AMMONIA_PH:g}): "
            f"{100 * ammonia[0]:.3g} % is free NH3, which escapes as an irritant gas "
            f"and is toxic to fish; ventilate and {DEFER}", {"share": ammonia[0], "pH": ph}))
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
