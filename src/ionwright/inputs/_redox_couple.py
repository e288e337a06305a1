"""A water analysis whose redox level is set by one couple it measured in both forms.

``redox_couple = "Fe(III)/Fe(II)"`` in ``[analysis]`` says that the analysed Fe(II) and
Fe(III) set the redox level: the engine finds the pe at which the solved sample holds
the two forms in the ratio analysed (:mod:`ionwright.engine._couple`), and every other
couple of the tables follows at that pe. The two names are analytes of the same
analysis, written as there (``Fe(III)/Fe(II)``, ``As(V)/As(III)``, ``NO3/NO2``,
``NO3/ammonia``, ``SO4/sulfide``), the oxidised form first.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Mapping

from ..chemistry._redox import ELECTRON, couple_forms
from ..chemistry._tableset import TableSet
from ..errors import RecipeError
from ._analytes import map_analyte

COUPLE_KEY = "redox_couple"


@dataclass(frozen=True)
class CoupleConstraint:
    """The couple whose two analysed forms set the pe: the components of its oxidised
    and reduced forms (``Fe3+``, ``Fe2+``), the analysis keys and values as written, and
    the electrons of its half-reaction."""

    oxidised: str
    reduced: str
    keys: tuple[str, str]
    given: tuple[str, str]
    electrons: float

    @property
    def text(self) -> str:
        """How the analysis named the couple (``Fe(III)/Fe(II)``)."""
        return f"{self.keys[0]}/{self.keys[1]}"

    def stated(self, pe: float) -> str:
        """How the redox level was stated, with the pe it gave, for the report."""
        return (f"the {self.text} couple as analysed ({self.keys[0]} {self.given[0]}, "
                f"{self.keys[1]} {self.given[1]}), which gives pe {pe:.4g}")


def read_couple(section: Mapping[str, Any], components: Mapping[str, str],
                amounts: Mapping[str, float], tables: TableSet, where: str,
                states: Mapping[str, int]) -> CoupleConstraint | None:
    """The ``redox_couple`` of the ``[analysis]`` *section*, or None. *components* maps
    each analyte key to its component and *amounts* each component to the number given
    (0 when absent); refused when a form is not analysed or is zero, or when the tables
    link no such couple."""
    if COUPLE_KEY not in section:
        return None
    here = f"{where} {COUPLE_KEY}"
    value = section[COUPLE_KEY]
    parts = value.split("/") if isinstance(value, str) else []
    if len(parts) != 2 or not all(p.strip() for p in parts):
        raise RecipeError(here, f"{value!r} must name two analytes, oxidised form first",
                          'e.g. redox_couple = "Fe(III)/Fe(II)"')
    keys = []
    for part in (p.strip() for p in parts):
        component = components.get(part) or map_analyte(part, tables, here, states).component
        key = next((k for k, c in components.items() if c == component), None)
        if key is None:
            raise RecipeError(here, f"names {part!r} ({component}), which the analysis does "
                              "not list: a couple sets the pe only with both forms measured",
                              f'list both forms (e.g. Fe(II) = "1.2 mg/L" and Fe(III) = '
                              '"0.08 mg/L"), or state pe, Eh, ORP or dissolved_oxygen instead')
        if not amounts.get(component, 0.0) > 0:
            raise RecipeError(here, f"{key} is given as {section[key]!r}: with one form "
                              "absent the couple sets no pe (the ratio of its forms is zero "
                              "or infinite)", "a form below its detection limit bounds the "
                              "pe but does not set it; state pe, Eh, ORP or dissolved_oxygen "
                              "instead")
        keys.append((key, component))
    (ox_key, oxidised), (red_key, reduced) = keys
    electrons = _electrons(oxidised, reduced, tables)
    if electrons is None:
        swapped = _electrons(reduced, oxidised, tables) is not None
        raise RecipeError(here, f"{value!r}: the tables hold no couple reducing {oxidised} "
                          f"to {reduced}", f'write the oxidised form first: "{red_key}/'
                          f'{ox_key}"' if swapped else "couples the tables link: "
                          + ", ".join(f"{o}/{r}" for r, o in couple_forms(tables).items())
                          + " (the redox table must be among the tables)")
    return CoupleConstraint(oxidised, reduced, (ox_key, red_key),
                            (str(section[ox_key]), str(section[red_key])), electrons)


def _electrons(oxidised: str, reduced: str, tables: TableSet) -> float | None:
    """Electrons of the tables' couple reducing component *oxidised* to *reduced*, or
    None when they link no such couple."""
    if couple_forms(tables).get(reduced) != oxidised:
        return None
    return float(tables.active_couples()[reduced].reaction[ELECTRON])
