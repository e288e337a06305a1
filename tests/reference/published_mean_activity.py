"""Published mean activity coefficients γ± of single salts in water at 25 °C, as test data.

Shared by the reference tests of every activity model (ion-association models here,
Pitzer in the brines tests). γ± is stoichiometric: (a₊^ν₊ a₋^ν₋)^(1/ν) over the salt's
total molality, so a model that forms ion pairs is compared through the free ions'
activities (:func:`stoichiometric_mean_activity`).

Sources (re-reading status in brackets):

* CRC Handbook of Chemistry and Physics (92nd ed.), "Mean activity coefficients of
  electrolytes as a function of concentration", p. 5-106, from Hamer, W.J. & Wu, Y.C.
  (1972) J. Phys. Chem. Ref. Data 1, 1047 and Goldberg et al. (1978–1981). CaCl2 re-read
  [re-read: the table's first page, paperzz.com and is.muni.cz copies]; the later pages
  (K, Mg, Na salts) were not reachable, so those rows are recalled [memory].
* Robinson, R.A. & Stokes, R.H. (1959) Electrolyte Solutions, 2nd ed., Appendix 8.10, for
  the salts the recalled CRC rows do not cover (NaOH, KOH, MgCl2, K2SO4, MgSO4, KNO3)
  [memory]; their 0.01 mol/kg points are the CRC table's as recalled [memory] (at 0.01
  every 1:1 salt is within 0.5 % of 0.90, so they anchor the low end, nothing more).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ionwright.chemistry import parse_formula

CRC_2011 = "CRC Handbook (92nd ed.) p. 5-106, from Hamer & Wu (1972)"
ROBINSON_STOKES = "Robinson & Stokes (1959) Electrolyte Solutions, App. 8.10"


@dataclass(frozen=True)
class SaltData:
    """One salt: its ions and stoichiometry, and γ± by molality (mol/kg)."""

    salt: str
    cation: str
    nu_cation: int
    anion: str
    nu_anion: int
    gamma: dict[float, float]
    source: str
    re_read: bool = False

    @property
    def charges(self) -> tuple[int, int]:
        """(z of the cation, |z| of the anion)."""
        return (parse_formula(self.cation).charge, -parse_formula(self.anion).charge)

    @property
    def charge_type(self) -> str:
        """'1:1', '2:1' (CaCl2), '1:2' (Na2SO4) or '2:2' (MgSO4): cation : anion charge."""
        return "{}:{}".format(*self.charges)

    def ionic_strength(self, m: float) -> float:
        """Ionic strength of the fully dissociated salt at molality *m*."""
        z_cation, z_anion = self.charges
        return 0.5 * m * (self.nu_cation * z_cation ** 2 + self.nu_anion * z_anion ** 2)


SALTS = (
    SaltData("NaCl", "Na+", 1, "Cl-", 1,
             {0.001: 0.965, 0.01: 0.903, 0.05: 0.822, 0.1: 0.779, 0.2: 0.734, 0.5: 0.681,
              1.0: 0.657, 2.0: 0.668}, CRC_2011),
    SaltData("KCl", "K+", 1, "Cl-", 1,
             {0.001: 0.965, 0.01: 0.901, 0.05: 0.816, 0.1: 0.768, 0.2: 0.717, 0.5: 0.649,
              1.0: 0.604, 2.0: 0.573}, CRC_2011),
    SaltData("HCl", "H+", 1, "Cl-", 1,
             {0.001: 0.965, 0.01: 0.905, 0.05: 0.830, 0.1: 0.796, 0.2: 0.767, 0.5: 0.757,
              1.0: 0.809, 2.0: 1.009}, CRC_2011),
    SaltData("NaOH", "Na+", 1, "OH-", 1,
             {0.01: 0.899, 0.1: 0.766, 0.2: 0.727, 0.5: 0.690, 1.0: 0.678, 2.0: 0.709},
             ROBINSON_STOKES),
    SaltData("KOH", "K+", 1, "OH-", 1,
             {0.01: 0.900, 0.1: 0.798, 0.2: 0.760, 0.5: 0.732, 1.0: 0.756, 2.0: 0.888},
             ROBINSON_STOKES),
    SaltData("CaCl2", "Ca2+", 1, "Cl-", 2,
             {0.001: 0.888, 0.01: 0.727, 0.05: 0.577, 0.1: 0.517, 0.2: 0.469, 0.5: 0.444,
              1.0: 0.495, 2.0: 0.784}, CRC_2011, re_read=True),
    SaltData("MgCl2", "Mg2+", 1, "Cl-", 2,
             {0.1: 0.529, 0.2: 0.489, 0.5: 0.481, 1.0: 0.570, 2.0: 1.053}, ROBINSON_STOKES),
    SaltData("Na2SO4", "Na+", 2, "SO4^2-", 1,
             {0.01: 0.714, 0.05: 0.536, 0.1: 0.453, 0.2: 0.371, 0.5: 0.270, 1.0: 0.204,
              2.0: 0.154}, CRC_2011),
    SaltData("K2SO4", "K+", 2, "SO4^2-", 1,
             {0.1: 0.436, 0.2: 0.356, 0.5: 0.261}, ROBINSON_STOKES),
    SaltData("MgSO4", "Mg2+", 1, "SO4^2-", 1,
             {0.1: 0.150, 0.2: 0.107, 0.5: 0.0675, 1.0: 0.0485, 2.0: 0.0417}, ROBINSON_STOKES),
    SaltData("KNO3", "K+", 1, "NO3-", 1,
             {0.01: 0.899, 0.1: 0.739, 0.2: 0.663, 0.5: 0.545, 1.0: 0.443, 2.0: 0.333},
             ROBINSON_STOKES),
)
"""Every salt of issue 12 with its published γ± at 25 °C."""

CRC_CALCIUM_BROMIDE = "CRC Handbook (92nd ed.) p. 5-106, CaBr2 column (Goldberg & Nuttall 1978)"

MORE_SALTS = (
    # Robinson & Stokes (1959) App. 8.10, 25 °C   # from memory (brines, issue 13)
    SaltData("HBr", "H+", 1, "Br-", 1,
             {0.1: 0.805, 0.5: 0.789, 1.0: 0.871, 2.0: 1.167, 3.0: 1.674}, ROBINSON_STOKES),
    SaltData("HNO3", "H+", 1, "NO3-", 1,
             {0.1: 0.791, 0.5: 0.720, 1.0: 0.724, 2.0: 0.793, 3.0: 0.909}, ROBINSON_STOKES),
    SaltData("NaBr", "Na+", 1, "Br-", 1,
             {0.1: 0.782, 0.5: 0.697, 1.0: 0.687, 2.0: 0.731, 3.0: 0.812}, ROBINSON_STOKES),
    SaltData("KBr", "K+", 1, "Br-", 1,
             {0.1: 0.772, 0.5: 0.657, 1.0: 0.617, 2.0: 0.593, 3.0: 0.595}, ROBINSON_STOKES),
    SaltData("NaF", "Na+", 1, "F-", 1, {0.1: 0.765, 0.5: 0.632, 1.0: 0.573}, ROBINSON_STOKES),
    SaltData("KF", "K+", 1, "F-", 1,
             {0.1: 0.775, 0.5: 0.670, 1.0: 0.645, 2.0: 0.658}, ROBINSON_STOKES),
    SaltData("NaNO3", "Na+", 1, "NO3-", 1,
             {0.1: 0.762, 0.5: 0.617, 1.0: 0.548, 2.0: 0.480, 3.0: 0.437}, ROBINSON_STOKES),
    SaltData("NaH2PO4", "Na+", 1, "H2PO4-", 1,
             {0.1: 0.744, 0.5: 0.563, 1.0: 0.468, 2.0: 0.379, 3.0: 0.320}, ROBINSON_STOKES),
    SaltData("KH2PO4", "K+", 1, "H2PO4-", 1, {0.1: 0.731, 0.5: 0.529, 1.0: 0.421},
             ROBINSON_STOKES),
    SaltData("sodium acetate", "Na+", 1, "CH3COO-", 1,
             {0.1: 0.791, 0.5: 0.735, 1.0: 0.757, 2.0: 0.846, 3.0: 0.965}, ROBINSON_STOKES),
    SaltData("potassium acetate", "K+", 1, "CH3COO-", 1,
             {0.1: 0.796, 0.5: 0.746, 1.0: 0.783, 2.0: 0.901, 3.0: 1.044}, ROBINSON_STOKES),
    # CRC Handbook, 25 °C (re-read: the table's first page, like CaCl2 above)
    SaltData("CaBr2", "Ca2+", 1, "Br-", 2,
             {0.1: 0.540, 0.2: 0.502, 0.5: 0.500, 1.0: 0.604, 2.0: 1.125},
             CRC_CALCIUM_BROMIDE, re_read=True),
)
"""Further salts whose Pitzer parameters issue 13 added (tests/reference/test_pitzer_binaries.py)."""


CRC_BARIUM_CHLORIDE = "CRC Handbook (92nd ed.) p. 5-106, BaCl2 column (Goldberg & Nuttall 1978)"

FURTHER_SALTS = (
    # The audit of the ion-association models beyond issue 12's salts (tables core and
    # metals). Robinson & Stokes (1959) App. 8.10, 25 °C   # from memory
    SaltData("LiCl", "Li+", 1, "Cl-", 1,
             {0.1: 0.790, 0.2: 0.757, 0.5: 0.739, 1.0: 0.774, 2.0: 0.921}, ROBINSON_STOKES),
    SaltData("NH4Cl", "NH4+", 1, "Cl-", 1,
             {0.1: 0.770, 0.2: 0.718, 0.5: 0.649, 1.0: 0.603, 2.0: 0.570}, ROBINSON_STOKES),
    SaltData("NH4NO3", "NH4+", 1, "NO3-", 1,
             {0.1: 0.740, 0.2: 0.677, 0.5: 0.582, 1.0: 0.504}, ROBINSON_STOKES),
    SaltData("SrCl2", "Sr2+", 1, "Cl-", 2,
             {0.1: 0.511, 0.2: 0.462, 0.5: 0.430, 1.0: 0.482}, ROBINSON_STOKES),
    SaltData("Ca(NO3)2", "Ca2+", 1, "NO3-", 2,
             {0.1: 0.488, 0.2: 0.429, 0.5: 0.381, 1.0: 0.35}, ROBINSON_STOKES),
    SaltData("Mg(NO3)2", "Mg2+", 1, "NO3-", 2,
             {0.1: 0.522, 0.2: 0.490, 0.5: 0.484, 1.0: 0.546}, ROBINSON_STOKES),
    SaltData("MgBr2", "Mg2+", 1, "Br-", 2,
             {0.1: 0.550, 0.2: 0.523, 0.5: 0.555, 1.0: 0.709}, ROBINSON_STOKES),
    SaltData("Li2SO4", "Li+", 2, "SO4^2-", 1,
             {0.1: 0.468, 0.2: 0.398, 0.5: 0.313, 1.0: 0.269}, ROBINSON_STOKES),
    SaltData("ZnSO4", "Zn2+", 1, "SO4^2-", 1,
             {0.1: 0.150, 0.2: 0.104, 0.5: 0.0630, 1.0: 0.0435}, ROBINSON_STOKES),
    SaltData("CuSO4", "Cu2+", 1, "SO4^2-", 1,
             {0.1: 0.150, 0.2: 0.104, 0.5: 0.0620, 1.0: 0.0423}, ROBINSON_STOKES),
    # CRC Handbook, 25 °C (re-read: the table's first page, paperzz.com/doc/8778636 and
    # is.muni.cz copies, like CaCl2 and CaBr2 above)
    SaltData("BaCl2", "Ba2+", 1, "Cl-", 2,
             {0.01: 0.721, 0.02: 0.653, 0.05: 0.559, 0.1: 0.492, 0.2: 0.436, 0.5: 0.391,
              1.0: 0.393}, CRC_BARIUM_CHLORIDE, re_read=True),
)
"""Salts the audit of issue 12's remaining gaps added for the ion-association models."""


def stoichiometric_mean_activity(result, salt: SaltData, m: float) -> float:
    """γ± of *salt* at molality *m* from a solved *result*: the free ions' activities over
    the salt's total ion molalities (ion pairs count against it, as in the measurements)."""
    a_cation = result.species_activity(salt.cation)
    a_anion = result.species_activity(salt.anion)
    nu = salt.nu_cation + salt.nu_anion
    product = a_cation ** salt.nu_cation * a_anion ** salt.nu_anion
    ideal = (salt.nu_cation * m) ** salt.nu_cation * (salt.nu_anion * m) ** salt.nu_anion
    return float(np.exp(np.log(product / ideal) / nu))
