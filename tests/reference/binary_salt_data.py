"""Published mean activity coefficients of single salts at 25 °C, for the Pitzer checks.

One record per salt: its ions and stoichiometry, the tabulated γ± by molality, and the
source of the table. Kept in one data module (no tests here) so that it can be merged with
other reference tables of the same kind.

Sources
-------
RS1959: Robinson, R.A. & Stokes, R.H. (1959) Electrolyte Solutions, 2nd ed., Butterworths,
    Appendix 8.10 (γ± of single salts at 25 °C). Every value is # from memory: the appendix
    was not re-read.
CRC: CRC Handbook of Chemistry and Physics, "Mean Activity Coefficients of Electrolytes as a
    Function of Concentration" (from Hamer & Wu 1972, Staples 1977–1981 and Goldberg et al.
    1978–1981), 25 °C; re-read in a stored copy of the table (the 92nd edition, p. 5-106), the
    CaBr2 and CaCl2 columns.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class BinarySalt:
    """γ± of one salt M(ν_M) X(ν_X) at 25 °C, molality → γ±, with its source."""

    name: str
    cation: str
    anion: str
    z_cation: int
    z_anion: int             # absolute value
    nu_cation: int
    nu_anion: int
    gamma: dict[float, float]
    source: str
    from_memory: bool


def _one_one(name, cation, anion, gamma, source="RS1959", from_memory=True):
    return BinarySalt(name, cation, anion, 1, 1, 1, 1, gamma, source, from_memory)


def _two_one(name, cation, anion, gamma, source="RS1959", from_memory=True):
    return BinarySalt(name, cation, anion, 2, 1, 1, 2, gamma, source, from_memory)


def _one_two(name, cation, anion, gamma, source="RS1959", from_memory=True):
    return BinarySalt(name, cation, anion, 1, 2, 2, 1, gamma, source, from_memory)


def _two_two(name, cation, anion, gamma, source="RS1959", from_memory=True):
    return BinarySalt(name, cation, anion, 2, 2, 1, 1, gamma, source, from_memory)


SALTS = {s.name: s for s in [
    # Robinson & Stokes (1959) App. 8.10, 25 °C   # from memory
    _one_one("NaCl", "Na+", "Cl-", {0.1: 0.778, 0.5: 0.681, 1.0: 0.657, 2.0: 0.668, 3.0: 0.714}),
    _one_one("KCl", "K+", "Cl-", {0.1: 0.770, 0.5: 0.649, 1.0: 0.604, 2.0: 0.573, 3.0: 0.569}),
    _one_one("HCl", "H+", "Cl-", {0.1: 0.796, 0.5: 0.757, 1.0: 0.809, 2.0: 1.009, 3.0: 1.316}),
    _one_one("HBr", "H+", "Br-", {0.1: 0.805, 0.5: 0.789, 1.0: 0.871, 2.0: 1.167, 3.0: 1.674}),
    _one_one("HNO3", "H+", "NO3-", {0.1: 0.791, 0.5: 0.720, 1.0: 0.724, 2.0: 0.793,
                                    3.0: 0.909}),
    _one_one("NaBr", "Na+", "Br-", {0.1: 0.782, 0.5: 0.697, 1.0: 0.687, 2.0: 0.731, 3.0: 0.812}),
    _one_one("KBr", "K+", "Br-", {0.1: 0.772, 0.5: 0.657, 1.0: 0.617, 2.0: 0.593, 3.0: 0.595}),
    _one_one("NaF", "Na+", "F-", {0.1: 0.765, 0.5: 0.632, 1.0: 0.573}),
    _one_one("KF", "K+", "F-", {0.1: 0.775, 0.5: 0.670, 1.0: 0.645, 2.0: 0.658}),
    _one_one("NaNO3", "Na+", "NO3-", {0.1: 0.762, 0.5: 0.617, 1.0: 0.548, 2.0: 0.480,
                                      3.0: 0.437}),
    _one_one("KNO3", "K+", "NO3-", {0.1: 0.739, 0.5: 0.545, 1.0: 0.443, 2.0: 0.333,
                                    3.0: 0.269}),
    _one_one("NaOH", "Na+", "OH-", {0.1: 0.766, 0.5: 0.690, 1.0: 0.678, 2.0: 0.709,
                                    3.0: 0.784}),
    _one_one("KOH", "K+", "OH-", {0.1: 0.798, 0.5: 0.732, 1.0: 0.756, 2.0: 0.888, 3.0: 1.081}),
    _one_one("NaH2PO4", "Na+", "H2PO4-", {0.1: 0.744, 0.5: 0.563, 1.0: 0.468, 2.0: 0.379,
                                          3.0: 0.320}),
    _one_one("KH2PO4", "K+", "H2PO4-", {0.1: 0.731, 0.5: 0.529, 1.0: 0.421}),
    _one_one("sodium acetate", "Na+", "CH3COO-", {0.1: 0.791, 0.5: 0.735, 1.0: 0.757,
                                                  2.0: 0.846, 3.0: 0.965}),
    _one_one("potassium acetate", "K+", "CH3COO-", {0.1: 0.796, 0.5: 0.746, 1.0: 0.783,
                                                    2.0: 0.901, 3.0: 1.044}),
    _one_two("Na2SO4", "Na+", "SO4^2-", {0.1: 0.445, 1.0: 0.204, 2.0: 0.155}),
    _two_two("MgSO4", "Mg2+", "SO4^2-", {0.1: 0.150, 0.2: 0.107, 0.5: 0.0675, 1.0: 0.0485,
                                        2.0: 0.0417}),
    # CRC Handbook, mean activity coefficients at 25 °C (re-read)
    _two_one("CaCl2", "Ca2+", "Cl-", {0.1: 0.517, 0.2: 0.469, 0.5: 0.444, 1.0: 0.495,
                                      2.0: 0.784}, source="CRC", from_memory=False),
    _two_one("CaBr2", "Ca2+", "Br-", {0.1: 0.540, 0.2: 0.502, 0.5: 0.500, 1.0: 0.604,
                                      2.0: 1.125}, source="CRC", from_memory=False),
]}
