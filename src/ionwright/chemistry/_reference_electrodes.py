"""Reference electrodes: their potential against the standard hydrogen electrode at T.

A measured ORP is a potential against the meter's reference electrode; adding that
electrode's potential gives Eh. Potentials are linear in temperature near room
temperature (15–35 °C in the source table); beyond, the result says so.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import UnknownNameError

#: Where the linear temperature description was read (°C).
TABLE_RANGE_C = (15.0, 35.0)
_TABLE = ("potentials of calomel and Ag/AgCl reference electrodes against the standard "
          "hydrogen electrode, 15–35 °C, re-read as reproduced in a public glossary "
          "(metaglossary.com, 'reference electrode'); attributed to Sawyer, D.T., "
          "Sobkowiak, A. & Roberts, J.L. (1995) Electrochemistry for Chemists, 2nd ed., "
          "Wiley  # from memory (the attribution)")


@dataclass(frozen=True)
class ReferenceElectrode:
    """A reference electrode: E (V vs SHE) at 25 °C and its slope dE/dT (V/K)."""

    name: str
    volts_25C: float
    volts_per_K: float
    source: str
    from_memory: bool = False

    def potential_V(self, t_C: float) -> float:
        """Potential against the standard hydrogen electrode at *t_C* (°C)."""
        return self.volts_25C + self.volts_per_K * (t_C - 25.0)


# Slopes: the least-squares line through the table's 15, 20, 25, 30 and 35 °C values.
ELECTRODES = {e.name: e for e in (
    ReferenceElectrode("SHE", 0.0, 0.0, "the definition of Eh"),
    ReferenceElectrode("saturated calomel", 0.2444, -0.000675, _TABLE),
    ReferenceElectrode("Ag/AgCl, saturated KCl", 0.199, -0.00100, _TABLE),
    ReferenceElectrode("Ag/AgCl, 3.5 M KCl", 0.205, -0.00075, _TABLE),
    ReferenceElectrode("Ag/AgCl, 3 M KCl", 0.210, -0.00075,
                       "0.210 V at 25 °C, the value electrode makers print  # from memory; "
                       "slope taken from the 3.5 M KCl line", from_memory=True),
)}
_ALIASES = {
    "she": "SHE", "nhe": "SHE", "hydrogen": "SHE", "standard hydrogen": "SHE",
    "sce": "saturated calomel", "calomel": "saturated calomel",
    "calomel saturated kcl": "saturated calomel", "hg/hg2cl2 saturated kcl": "saturated calomel",
    "ag/agcl saturated kcl": "Ag/AgCl, saturated KCl", "ag/agcl sat kcl": "Ag/AgCl, saturated KCl",
    "ag/agcl saturated": "Ag/AgCl, saturated KCl", "ag/agcl 3.5 m kcl": "Ag/AgCl, 3.5 M KCl",
    "ag/agcl 3.5m kcl": "Ag/AgCl, 3.5 M KCl", "ag/agcl 3 m kcl": "Ag/AgCl, 3 M KCl",
    "ag/agcl 3m kcl": "Ag/AgCl, 3 M KCl",
}


def reference_electrode(name: object) -> ReferenceElectrode:
    """The electrode called *name* (case, commas, dots and 'sat.' forgiven)."""
    key = " ".join(str(name).replace(",", " ").replace("sat.", "saturated")
                   .replace("(", " ").replace(")", " ").lower().split())
    found = _ALIASES.get(key) or next((n for n in ELECTRODES if n.lower() == key), None)
    if found is None:
        raise UnknownNameError("reference electrode", str(name), list(ELECTRODES),
                               "name the meter's reference electrode as one of these "
                               "(an ORP reading means nothing without it)")
    return ELECTRODES[found]
