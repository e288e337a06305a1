"""Molar masses of common salts against published atomic weights and handbook values.

Two checks per compound:

1. The molar mass equals the sum, over a composition typed here by hand, of the CIAAW
   2021 standard atomic weights typed here (Prohaska, T. et al. (2022) Pure Appl. Chem.
   94, 573–600, Table 1; conventional values of Table 3 for the interval elements H, B,
   C, N, O, Mg, S, Cl) — this checks the parser and the transcription of the table.
2. It agrees to 0.01 g/mol with the molar mass printed in the CRC Handbook of Chemistry
   and Physics, 97th ed. (Haynes, W.M., ed., 2016), Section 4, "Physical Constants of
   Inorganic Compounds", molecular-weight column. The handbook figures were computed with
   the older IUPAC 2007 weights (H 1.00794, O 15.9994, S 32.065, ...), so the 2021
   conventional values give masses up to about 0.008 g/mol lower (borax, Na2HPO4·7H2O);
   0.01 g/mol is the tolerance that difference allows.
"""

from __future__ import annotations

import itertools
import math

import pytest

from ionwright.chemistry._atomic_weights import (
    ATOMIC_NUMBERS,
    NO_STANDARD_WEIGHT,
    STANDARD_ATOMIC_WEIGHTS,
)
from ionwright.chemistry._formula import parse_formula

# Prohaska et al. (2022), Table 1 / Table 3 (conventional values for interval elements).
CIAAW_2021 = {
    "H": 1.008,  # from memory (conventional; interval [1.00784, 1.00811])
    "B": 10.81,  # from memory (conventional; interval [10.806, 10.821])
    "C": 12.011,  # from memory (conventional; interval [12.0096, 12.0116])
    "N": 14.007,  # from memory (conventional; interval [14.00643, 14.00728])
    "O": 15.999,  # from memory (conventional; interval [15.99903, 15.99977])
    "Na": 22.98976928,  # from memory
    "Mg": 24.305,  # from memory (conventional; interval [24.304, 24.307])
    "P": 30.973761998,  # from memory
    "S": 32.06,  # from memory (conventional; interval [32.059, 32.076])
    "Cl": 35.45,  # from memory (conventional; interval [35.446, 35.457])
    "K": 39.0983,  # from memory
    "Ca": 40.078,  # from memory
}

# formula, composition typed by hand, CRC Handbook 97th ed. §4 molar mass / (g/mol)
COMPOUNDS = [
    ("NaCl", {"Na": 1, "Cl": 1}, 58.44),  # from memory (58.443)
    ("CaCO3", {"Ca": 1, "C": 1, "O": 3}, 100.09),  # from memory (100.087)
    ("MgSO4·7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}, 246.47),  # from memory (246.475)
    ("CaSO4·2H2O", {"Ca": 1, "S": 1, "O": 6, "H": 4}, 172.17),  # from memory (172.172)
    ("Na2HPO4·7H2O", {"Na": 2, "H": 15, "P": 1, "O": 11}, 268.07),  # from memory (268.066)
    ("KH2PO4", {"K": 1, "H": 2, "P": 1, "O": 4}, 136.09),  # from memory (136.086)
    ("Na2B4O7·10H2O", {"Na": 2, "B": 4, "O": 17, "H": 20}, 381.37),  # from memory (381.372)
    ("KCl", {"K": 1, "Cl": 1}, 74.55),  # from memory (74.551)
    ("NaHCO3", {"Na": 1, "H": 1, "C": 1, "O": 3}, 84.01),  # from memory (84.007)
    ("Na2CO3", {"Na": 2, "C": 1, "O": 3}, 105.99),  # from memory (105.988)
    ("CaCl2·2H2O", {"Ca": 1, "Cl": 2, "H": 4, "O": 2}, 147.01),  # from memory (147.014)
    ("(NH4)2SO4", {"N": 2, "H": 8, "S": 1, "O": 4}, 132.14),  # from memory (132.140)
    ("K2HPO4", {"K": 2, "H": 1, "P": 1, "O": 4}, 174.18),  # from memory (174.176)
    ("H3BO3", {"H": 3, "B": 1, "O": 3}, 61.83),  # from memory (61.833)
]


@pytest.mark.parametrize("text, composition, handbook", COMPOUNDS,
                         ids=[c[0] for c in COMPOUNDS])
def test_molar_mass(text: str, composition: dict[str, int], handbook: float) -> None:
    formula = parse_formula(text)
    assert dict(formula.elements) == composition
    expected = math.fsum(n * CIAAW_2021[symbol] for symbol, n in composition.items())
    assert formula.molar_mass == pytest.approx(expected, rel=1e-12)
    assert formula.molar_mass == pytest.approx(handbook, abs=0.01)


def test_table_covers_z_1_to_92() -> None:
    """Every element Z = 1–92 is known; the eight without a standard atomic weight
    (Prohaska et al. 2022, Table 1: no value for Tc, Pm, Po, At, Rn, Fr, Ra, Ac) have none."""
    assert sorted(ATOMIC_NUMBERS.values()) == list(range(1, 93))
    assert NO_STANDARD_WEIGHT == {"Tc", "Pm", "Po", "At", "Rn", "Fr", "Ra", "Ac"}
    assert set(STANDARD_ATOMIC_WEIGHTS) == set(ATOMIC_NUMBERS) - NO_STANDARD_WEIGHT


def test_weights_rise_with_z_except_the_known_inversions() -> None:
    """A typo check: atomic weight falls with rising Z only for Ar/K, Co/Ni, Te/I and
    Th/Pa (the well-known inversions of the periodic table)."""
    by_z = sorted((ATOMIC_NUMBERS[s], s, w) for s, w in STANDARD_ATOMIC_WEIGHTS.items())
    inversions = {(a, b) for (_, a, wa), (_, b, wb) in itertools.pairwise(by_z) if wb < wa}
    assert inversions == {("Ar", "K"), ("Co", "Ni"), ("Te", "I"), ("Th", "Pa")}
