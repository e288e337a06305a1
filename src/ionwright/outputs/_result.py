"""The result of one speciation: numbers, warnings, and the fixed-schema JSON object."""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import Any

import numpy as np

from ._cautions import cautions
from ._buffer_quantities import buffer_quantities, recipe_in_grams
from ._conductivity import METHOD as CONDUCTIVITY_METHOD, result_conductivity
from ._derived import derived_quantities, solution_summary
from ._osmolality import Osmotic, osmotic
from ..notices import DATA_QUALITY, INPUT, VALIDITY, Notice, texts, wrap
from ._model_numbers import beyond_model_range, model_range_notice, model_validity_notes
from ._phase_report import phase_summary
from ..inputs._mixing import Solution
from ..inputs._recipe import solution_of
from ._provenance import constants_used, ion_pairs, override_warnings
from ._redox import redox_summary, salted_oxygen_notice
from ._speciation import Speciation
from ._supersaturation import supersaturation_warnings
from ._uncertainty import (ResultUncertainty, near_corrosive_notice, result_uncertainty,
                           uncertainty_object)

IMBALANCE_WARNING = 1e-6  # relative charge imbalance worth a warning with a fixed pH


@dataclass
class Result(Speciation):
    """Speciation of one recipe; ``to_dict()`` is the JSON contract, ``report()`` the text."""

    # -- formulation quantities -------------------------------------------------------
    @cached_property
    def osmotic(self) -> Osmotic:
        """Osmotic coefficient, osmolality and water activity (outputs/_osmolality.py)."""
        return osmotic(self)

    @property
    def osmolality_mOsm_per_kg(self) -> float:
        return self.osmotic.osmolality_mOsm_per_kg

    @cached_property
    def conductivity_mS_per_cm(self) -> float:
        """Electrical conductivity at the solution temperature (outputs/_conductivity.py)."""
        return float(self._conductivity.mS_per_cm[0])

    @property
    def conductivity_notes(self) -> list[str]:
        """What to know about the conductivity value (rough λ°, past the method's range)."""
        return list(self._conductivity.notes)

    @cached_property
    def _conductivity(self):
        """κ with its notes (rough λ°, past the range), which go with the number itself."""
        return result_conductivity(self)

    @cached_property
    def solution(self) -> Solution:
        """Water, volume and density of the recipe's solution (given or estimated)."""
        return solution_of(self.recipe, self.tables)

    @cached_property
    def buffer(self) -> dict[str, float | None]:
        """Buffer capacity and ionic strength per kg of water and per litre."""
        return buffer_quantities(self, self.solution.water_kg_per_L)

    @cached_property
    def redox(self) -> dict[str, Any]:
        """pe, Eh_V, the stated level, each couple's pe and the O2 saturation."""
        return redox_summary(self)

    @property
    def pe(self) -> float | None:
        """−log10 a(e-) when the recipe states a redox level, else None."""
        return self.redox["pe"]

    @property
    def Eh_V(self) -> float | None:
        """Eh in volts against the standard hydrogen electrode (None without a level)."""
        return self.redox["Eh_V"]

    def recipe_grams(self) -> list[dict[str, Any]]:
        """Each ingredient in g/kg water, g/L and grams for the recipe's batch."""
        return recipe_in_grams(self, self.solution.water_kg, self.solution.volume_L)

    @cached_property
    def uncertainty(self) -> ResultUncertainty:
        """Uncertainty of pH, activities and saturation indices from the constants'
        uncertainties (outputs/_uncertainty.py)."""
        return result_uncertainty(self)

    @property
    def pH_uncertainty(self) -> float:
        """Standard uncertainty of the pH from the constants (0 where the pH is fixed)."""
        return self.uncertainty.pH

    @cached_property
    def notices(self) -> list[Notice]:
        """Everything the reader should know about this result, as typed notices."""
        out = list(self.notes)
        if self.recipe.solution is not None:  # stocks dosed from an extrapolated density
            out.extend(wrap(self.recipe.solution.warnings, INPUT, "stock-density"))
        if beyond_model_range(self.model, self.ionic_strength):
            out.append(model_range_notice(self.model, self.ionic_strength))
        out.extend(model_validity_notes(self))
        out.extend(wrap(supersaturation_warnings(self), VALIDITY, "supersaturated"))
        out.extend(self.recipe.redox_notices)
        out.extend(salted_oxygen_notice(self))
        out.extend(self._held_imbalance())
        out.extend(override_warnings(self))
        out.extend(cautions(self))
        out.extend(near_corrosive_notice(self, self.uncertainty))
        return out

    def _held_imbalance(self) -> list[Notice]:
        """A notice when a held pH or pe leaves the solution charged: holding an activity
        drops that component's balance, so nothing keeps Σz·m at zero."""
        imbalance, scale = self.charge_balance
        if not (scale > 0 and abs(imbalance) / scale > IMBALANCE_WARNING):
            return []
        data = {"imbalance_mol_per_kg": imbalance, "scale_mol_per_kg": scale}
        share = f"Σz·m = {imbalance:+.3g} mol/kg ({100 * imbalance / scale:+.2g} % of Σ|z|·m)"
        if "pH" in self.recipe.fix:
            return [Notice(DATA_QUALITY, "fixed-ph-imbalance",
                           f"with pH fixed at {self.recipe.fix['pH']:g} the solution is not "
                           f"electroneutral: {share}; an unlisted ion or acid/base would "
                           "make up the difference", data)]
        if "pe" in self.recipe.fix:
            return [Notice(DATA_QUALITY, "fixed-pe-imbalance",
                           f"with pe held at {self.recipe.fix['pe']:.4g} and the pH free, the "
                           f"charge balance is not held: {share}. The held pe gives or takes "
                           "electrons that no ion balances (the oxidation states moved to "
                           "reach it); an O2 pressure (dissolved_oxygen, or O2 under "
                           "[gases]) holds the redox level and keeps the solution "
                           "electroneutral", data)]
        return []

    @property
    def warnings(self) -> list[str]:
        """The texts of :attr:`notices` (the ``"warnings"`` of the JSON contract)."""
        return texts(self.notices)

    # -- outputs ----------------------------------------------------------------------
    def species_rows(self) -> list[dict[str, Any]]:
        """One row per species, sorted by molality (largest first)."""
        order = np.argsort(-self.molality, kind="stable")
        spread = self.uncertainty.log10_activity
        return [{"name": self.system.species[i], "charge": int(self.system.charge[i]),
                 "molality": float(self.molality[i]), "activity": float(self.activity[i]),
                 "log_gamma": float(self.log10_gamma[i]),
                 "log10_activity_uncertainty": spread[self.system.species[i]]}
                for i in order]

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of the command-line contract (see DESIGN.md)."""
        return {
            "converged": self.converged,
            "temperature_C": self.temperature_C,
            "activity_model": self.model.name,
            "pH": self.pH,
            "pH_uncertainty": self.pH_uncertainty,
            "pe": self.pe,
            "Eh_V": self.Eh_V,
            "ionic_strength": self.ionic_strength,
            "osmotic_coefficient": self.osmotic.osmotic_coefficient,
            "water_activity": self.osmotic.water_activity,
            "osmolality_mOsm_per_kg": self.osmolality_mOsm_per_kg,
            "osmotic_method": self.osmotic.method,
            "conductivity_mS_per_cm": self.conductivity_mS_per_cm,
            "conductivity_method": CONDUCTIVITY_METHOD,
            "conductivity_notes": self.conductivity_notes,
            "buffer": self.buffer,
            "recipe_grams": self.recipe_grams(),
            "species": self.species_rows(),
            "totals": {c: float(self.totals.get(c, 0.0)) for c in self.system.components},
            "saturation_indices": self.saturation_indices,
            "uncertainty": uncertainty_object(self),
            "uncertainty_contributors": self.uncertainty.contributors,
            "distribution": self.distribution(),
            "iterations": int(self.equilibrium.iterations[0]),
            "residual": float(self.equilibrium.residual[0]),
            "constants_used": constants_used(self),
            "ion_pairs": ion_pairs(self),
            "derived": derived_quantities(self),
            "solution": solution_summary(self),
            "phases": phase_summary(self),
            "redox": self.redox,
            "warnings": self.warnings,
            "notices": [n.to_dict() for n in self.notices],
        }

    def to_frame(self):
        """Species as a pandas DataFrame indexed by name (pandas imported only here).

        Each species' row has its ``log10_activity_uncertainty`` (from the constants).
        The solution's own quantities (pH and its uncertainty, ionic strength and buffer capacity per kg and
        per litre, osmolality, water activity, conductivity) are in ``frame.attrs``.
        """
        import pandas as pd

        frame = pd.DataFrame(self.species_rows()).set_index("name")
        frame.attrs.update({"pH": self.pH, "pH_uncertainty": self.pH_uncertainty,
                            "pe": self.pe, "Eh_V": self.Eh_V,
                            "temperature_C": self.temperature_C,
                            **self.buffer,
                            "osmolality_mOsm_per_kg": self.osmolality_mOsm_per_kg,
                            "water_activity": self.osmotic.water_activity,
                            "conductivity_mS_per_cm": self.conductivity_mS_per_cm})
        return frame

    def report(self) -> str:
        from ._report import text_report

        return text_report(self)
