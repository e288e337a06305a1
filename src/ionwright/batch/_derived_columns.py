"""The derived quantities of a batch row as output columns, from the one assembly the
single solve uses (:func:`ionwright.outputs._derived.derived_arrays`).

Each quantity of the ``"derived"`` object of a result gets a column whose header names
its unit and convention; the charge-balance error gets a flag at a threshold the caller
sets; ions come back in mg/L and meq/L on request. Per-row cautions that the single
solve gives as notices (toxic gas, chlorine, free ammonia, an analysis out of balance)
are flags here, joined into the row's message by the runner.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..outputs._cautions import (CHARGE_BALANCE_LIMIT, batch_caution_flags)
from ..errors import RecipeError
from ..outputs._derived import (NUMBER_KEYS, TDS_AUTO, check_tds_convention, derived_arrays,
                                tds_is_calculated)
from ..outputs._derived_ions import TDS_CALCULATED, TDS_SPECIES, ion_columns
from ..outputs._conductivity import conductivity
from ..outputs._osmolality import WATER_KG_PER_MOL, osmotic_coefficients
from ..outputs._solved_samples import SolvedSamples
from ..chemistry._formula import parse_formula
from ..chemistry._redox import ELECTRON, couple_forms, linked_couples, unlinked

#: Output column of each number of the ``"derived"`` object (fractions become percent).
DERIVED_COLUMNS = {
    "pH_standards_scale": "pH, standards' scale",
    "charge_balance_error_percent": "charge balance error [%]",
    "alkalinity_mg_per_L_as_CaCO3": "total alkalinity, solved [mg/L as CaCO3]",
    "carbonate_alkalinity_mg_per_L_as_CaCO3": "carbonate alkalinity [mg/L as CaCO3]",
    "hardness_mg_per_L_as_CaCO3": "hardness [mg/L as CaCO3]",
    "log10_pCO2_atm": "log10 pCO2 [atm]",
    "dissolved_CO2_mg_per_L": "dissolved CO2 [mg/L]",
    "unionized_ammonia_fraction": "un-ionised NH3, activity-corrected [%]",
    "unionized_ammonia_mg_per_L_as_N": "un-ionised NH3, activity-corrected [mg/L as N]",
    "unionized_ammonia_fraction_emerson": "un-ionised NH3, Emerson et al. 1975 [%]",
    "unionized_ammonia_mg_per_L_as_N_emerson": "un-ionised NH3, Emerson et al. 1975 "
                                               "[mg/L as N]",
    "tds_mg_per_L": "TDS [mg/L]",
    "tds_calculated_mg_per_L": "TDS, Standard Methods 1030E calculated [mg/L]",
    "tds_species_sum_mg_per_L": "TDS, sum of species [mg/L]",
    "saturation_pH": "saturation pH (calcite)",
    "langelier_index": "Langelier index",
    "ryznar_index": "Ryznar index",
    "free_chlorine_mg_per_L_as_Cl2": "free chlorine [mg/L as Cl2]",
    "combined_chlorine_mg_per_L_as_Cl2": "combined chlorine [mg/L as Cl2]",
    "total_chlorine_mg_per_L_as_Cl2": "total chlorine [mg/L as Cl2]",
    "breakpoint_chlorine_mg_per_L_as_Cl2": "breakpoint chlorine dose of the ammonia "
                                           "[mg/L as Cl2]",
}
PERCENT_KEYS = ("unionized_ammonia_fraction", "unionized_ammonia_fraction_emerson")
BALANCE_FLAG_COLUMN = "charge balance flag"
TDS_CONVENTION_COLUMN = "TDS convention"
_CONVENTION_WORDS = {TDS_CALCULATED: "Standard Methods 1030E calculated",
                     TDS_SPECIES: "sum of species"}


def ion_mass_column(component: str) -> str:
    return f"{component} total [mg/L]"


def ion_equivalents_column(component: str) -> str:
    return f"{component} total [meq/L]"


#: The formulation columns (``formulation=True``): the single result's formulation section.
FORMULATION_COLUMNS = ("osmolality [mOsm/kg]", "osmotic coefficient", "water activity",
                       "conductivity [mS/cm]")


@dataclass(frozen=True)
class DerivedOptions:
    """What the caller chose: the TDS convention, the charge-balance threshold (%),
    whether ions come back in mg/L and meq/L, and whether the formulation columns
    (osmolality, water activity, conductivity) are wanted."""

    tds: str = TDS_AUTO
    balance_limit: float = CHARGE_BALANCE_LIMIT
    ions: bool = False
    formulation: bool = False


def derived_options(tds: str, balance_limit: float, ions: bool,
                    formulation: bool = False) -> DerivedOptions:
    """The :class:`DerivedOptions` of a call, checked (errors name the argument)."""
    check_tds_convention(tds)
    if isinstance(balance_limit, bool) or not isinstance(balance_limit, (int, float)) \
            or not 0 < balance_limit < 100:
        raise RecipeError("balance_limit", f"{balance_limit!r} is not a percentage between "
                          "0 and 100", "give the charge-balance error (%) to flag rows at, "
                          "e.g. 5")
    return DerivedOptions(tds, float(balance_limit), bool(ions), bool(formulation))


def derived_headers(components: tuple[str, ...], options: DerivedOptions) -> list[str]:
    """Every derived column, in output order, for a plan over *components*."""
    headers = [DERIVED_COLUMNS[k] for k in NUMBER_KEYS]
    headers += [TDS_CONVENTION_COLUMN, BALANCE_FLAG_COLUMN]
    if options.formulation:
        headers += list(FORMULATION_COLUMNS)
    if options.ions:
        for comp in components:
            if comp != "H+":
                headers += [ion_mass_column(comp), ion_equivalents_column(comp)]
    return headers


class DerivedTable:
    """The derived columns of n rows, filled group by group."""

    def __init__(self, n: int, components: tuple[str, ...], options: DerivedOptions) -> None:
        self.options = options
        self.columns: dict[str, np.ndarray] = {}
        for header in derived_headers(components, options):
            self.columns[header] = np.full(n, np.nan)
        self.columns[TDS_CONVENTION_COLUMN] = np.full(n, "", dtype=object)
        self.columns[BALANCE_FLAG_COLUMN] = np.zeros(n, dtype=bool)

    def fill(self, rows: np.ndarray, samples: SolvedSamples) -> list[tuple[str, np.ndarray]]:
        """Fill *rows* from their solved *samples*; return (text, mask over *rows*) of
        every per-row caution and data-quality flag."""
        arrays = derived_arrays(samples, self.options.tds)
        for key in NUMBER_KEYS:
            scale = 100.0 if key in PERCENT_KEYS else 1.0
            self.columns[DERIVED_COLUMNS[key]][rows] = scale * arrays[key]
        calculated = tds_is_calculated(samples, self.options.tds)
        self.columns[TDS_CONVENTION_COLUMN][rows] = np.where(
            calculated, _CONVENTION_WORDS[TDS_CALCULATED], _CONVENTION_WORDS[TDS_SPECIES])
        limit = self.options.balance_limit
        off = np.abs(arrays["charge_balance_error_percent"]) > limit
        self.columns[BALANCE_FLAG_COLUMN][rows] = off
        if self.options.ions:
            mixed = _mixed_states(samples)
            for comp, (mg, meq) in ion_columns(samples).items():
                if comp in mixed:
                    continue
                self.columns[ion_mass_column(comp)][rows] = mg
                if meq is not None:
                    self.columns[ion_equivalents_column(comp)][rows] = meq
        formulation = self._fill_formulation(rows, samples) if self.options.formulation else []
        flags = [(f"DATA QUALITY: charge-balance error beyond ±{limit:g} % (see "
                  f"'{DERIVED_COLUMNS['charge_balance_error_percent']}'): an ion may be "
                  "missing or mismeasured; check the analysis before relying on the "
                  "results, and base decisions on measured values, local codes and "
                  "licensed practice", off)]
        return flags + formulation + batch_caution_flags(samples)

    def _fill_formulation(self, rows: np.ndarray, samples: SolvedSamples
                          ) -> list[tuple[str, np.ndarray]]:
        """Osmolality, φ, a(H2O) and conductivity of *rows*, as the single result's
        formulation section gives them, with the conductivity's cautions as row flags."""
        phi = osmotic_coefficients(samples.model, samples.system.properties, samples.molality,
                                   samples.t_C, samples.ln_water_activity)
        total = samples.molality.sum(axis=1)
        osmolality, phi_col, water, kappa = (self.columns[h] for h in FORMULATION_COLUMNS)
        osmolality[rows] = 1000.0 * phi * total
        phi_col[rows] = phi
        water[rows] = np.exp(-WATER_KG_PER_MOL * phi * total)
        names = list(samples.system.species)
        formulas = [parse_formula(samples.tables.entry(n).formula) for n in names]
        found = conductivity(samples.molality, formulas, names, samples.t_C,
                             samples.water_kg_per_L)
        kappa[rows] = found.mS_per_cm
        return list(found.flags)


def _mixed_states(samples: SolvedSamples) -> set[str]:
    """Components whose total holds several oxidation states in rows solved with them
    linked (Fe3+ then counts all iron, e- the electrons): their ion columns stay empty
    rather than name one state for the sum."""
    base = unlinked(samples.tables)
    if base is None:
        return set()
    linked = linked_couples(samples.tables)
    return {ELECTRON, *(other for named, other in couple_forms(base).items() if named in linked)}
