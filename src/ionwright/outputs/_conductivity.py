"""Electrical conductivity of a speciated solution at its own temperature.

κ = Σ |z_i| c_i λ_i over the free ions and charged complexes (c in mol/L), with each ion's
equivalent conductivity lowered from its limiting value λ°_i(T)
(:mod:`ionwright.chemistry._ionic_conductivity`) by the Debye–Hückel–Onsager theory in its
extended form (Robinson & Stokes 1959, eqs. 7.36 and 7.41):

    λ_i = λ°_i − (R_i λ°_i + E_i) √I / (1 + B a √I),
    R_i = 2.801e6 |z_i z̄| q_i / ((εT)^{3/2} (1 + √q_i))        (relaxation),
    E_i = 41.25 |z_i| / (η (εT)^{1/2})                        (electrophoresis; η in P),
    q_i = |z_i z̄| / (|z_i| + |z̄|) · (λ°_i + λ̄°) / (|z̄| λ°_i + |z_i| λ̄°),

I the ionic strength in mol/L, ε the dielectric constant of water and η its viscosity at
T. For one salt this is the Onsager equation with its ion-size denominator; in a mixture
each ion's counter-ion is the equivalent-weighted mean of the ions of opposite sign (z̄,
λ̄°), which is our generalisation. a = :data:`CLOSEST_APPROACH_ANGSTROM` for every ion.

Stated range: the theory is a limiting law made to reach about I = 0.1 mol/kg; checked
against the KCl conductivity standards to 1 mol/kg (tests/reference). Past
:data:`VALID_IONIC_STRENGTH` the result warns. Ion pairs count with their own charge (a
neutral pair carries no current), which is how association lowers conductivity.

References
----------
Robinson, R.A. & Stokes, R.H. (1959) Electrolyte Solutions, 2nd ed., Butterworths, ch. 7.
Onsager, L. (1927) Phys. Z. 28, 277–298.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ..chemistry._formula import Formula
from ..chemistry._ionic_conductivity import is_listed, limiting
from ..chemistry._viscosity import viscosity_mPa_s
from ..chemistry._water import debye_huckel_B, dielectric_constant

KELVIN = 273.15
RELAXATION = 2.801e6
ELECTROPHORESIS = 41.25
#: Distance of closest approach used in the extended form, Å  # common practice
CLOSEST_APPROACH_ANGSTROM = 4.0
#: Ionic strength (mol/kg) past which the conductivity carries a warning.
VALID_IONIC_STRENGTH = 0.5
#: Share of the conductivity carried by ions without a listed λ° worth a note.
ROUGH_SHARE_NOTE = 0.05
METHOD = ("limiting ionic conductivities (CRC, Lange) scaled with water's viscosity, "
          "extended Debye–Hückel–Onsager correction (Robinson & Stokes 1959)")


@dataclass(frozen=True)
class Conductivity:
    """κ in mS/cm per sample and the cautions that go with it: each a text and the
    samples (n,) it applies to."""

    mS_per_cm: npt.NDArray[np.float64]                        # (n,)
    flags: tuple[tuple[str, npt.NDArray[np.bool_]], ...]

    @property
    def notes(self) -> tuple[str, ...]:
        """The texts of the flags that apply to any sample."""
        return tuple(text for text, where in self.flags if where.any())


def conductivity(molality: npt.NDArray[np.float64], formulas: list[Formula],
                 names: list[str], t_C: npt.ArrayLike, water_kg_per_L: npt.ArrayLike
                 ) -> Conductivity:
    """Conductivity of *n* samples: *molality* (n, s) of species with *formulas* (s)."""
    m = np.atleast_2d(np.asarray(molality, dtype=float))
    t = np.broadcast_to(np.asarray(t_C, dtype=float), m.shape[:1])
    conc = m * np.broadcast_to(np.asarray(water_kg_per_L, dtype=float), m.shape[:1])[:, None]
    charged = [i for i, f in enumerate(formulas) if f.charge != 0]
    z = np.array([formulas[i].charge for i in charged], dtype=float)
    c = conc[:, charged]
    lam0 = np.stack([limiting(formulas[i], t) for i in charged], axis=1) if charged else c
    lam = _corrected(lam0, z, c, t)
    carried = np.abs(z) * c * lam
    kappa = carried.sum(axis=1)
    shares = carried / np.where(kappa > 0, kappa, 1.0)[:, None]
    strength = 0.5 * m[:, charged] @ z ** 2
    return Conductivity(kappa, _flags(shares, z, [names[i] for i in charged],
                                      [formulas[i] for i in charged], strength))


def _corrected(lam0: np.ndarray, z: np.ndarray, c: np.ndarray, t: np.ndarray) -> np.ndarray:
    """Equivalent conductivities at the solution's ionic strength, (n, ions)."""
    if not z.size:
        return lam0
    strength = 0.5 * (c * z ** 2).sum(axis=1)                      # mol/L
    root = np.sqrt(strength)[:, None]
    eps_t = (dielectric_constant(t) * (t + KELVIN))[:, None]
    eta_poise = (viscosity_mPa_s(t) / 100.0)[:, None]
    zbar, lambar = _counter_ions(lam0, z, c)
    zi = np.abs(z)[None, :]
    q = zi * zbar / (zi + zbar) * (lam0 + lambar) / (zbar * lam0 + zi * lambar)
    relaxation = RELAXATION * zi * zbar * q / (eps_t ** 1.5 * (1.0 + np.sqrt(q)))
    electrophoresis = ELECTROPHORESIS * zi / (eta_poise * np.sqrt(eps_t))
    shield = 1.0 + np.asarray(debye_huckel_B(t))[:, None] * CLOSEST_APPROACH_ANGSTROM * root
    return np.maximum(lam0 - (relaxation * lam0 + electrophoresis) * root / shield, 0.0)


def _counter_ions(lam0: np.ndarray, z: np.ndarray, c: np.ndarray
                  ) -> tuple[np.ndarray, np.ndarray]:
    """Equivalent-weighted mean |charge| and λ° of the ions of opposite sign, (n, ions)."""
    equiv = c * np.abs(z)
    zbar = np.empty_like(lam0)
    lambar = np.empty_like(lam0)
    for sign in (1.0, -1.0):
        own = np.sign(z) == sign
        other = ~own
        weight = equiv[:, other].sum(axis=1)
        safe = np.where(weight > 0, weight, 1.0)
        mean_z = np.where(weight > 0, (equiv[:, other] * np.abs(z[other])).sum(axis=1) / safe,
                          1.0)
        mean_l = np.where(weight > 0, (equiv[:, other] * lam0[:, other]).sum(axis=1) / safe,
                          lam0[:, own].mean(axis=1) if own.any() else 1.0)
        zbar[:, own] = mean_z[:, None]
        lambar[:, own] = mean_l[:, None]
    return zbar, lambar


#: Where the method was seen to miss published tables (CRC Handbook, "Electrical
#: conductivity of aqueous solutions", 20 °C; tests/reference/test_conductivity_standards.py):
#: 2:2 sulfates 15–30 % low at 0.5–1 % (I ≈ 0.17–0.33), HCl 9 % high at 0.5 % (0.14 mol/kg).
#: The thresholds below are where a flag starts: an ion type carrying this share of κ, past
#: this ionic strength (mol/kg); set below the failing points, no table between  # common practice
TWO_TWO_SHARE, TWO_TWO_STRENGTH = 0.2, 0.02
ACID_SHARE, ACID_STRENGTH = 0.3, 0.05


def _flags(shares: np.ndarray, z: np.ndarray, names: list[str], formulas: list[Formula],
           strength: np.ndarray) -> tuple[tuple[str, np.ndarray], ...]:
    """The cautions of *n* samples: ions with a rough λ°, past the method's ionic strength,
    and the two kinds of solution it was seen to miss (2:2 salts, strong acid)."""
    rough = np.array([not is_listed(f) for f in formulas], dtype=bool)
    rough_share = shares[:, rough].sum(axis=1)
    listed = ", ".join(n for n, r, top in zip(names, rough, shares.max(axis=0, initial=0.0))
                       if r and top > 0.01)
    proton = np.array([f.elements == {"H": 1} and f.charge == 1 for f in formulas], dtype=bool)
    two_two = ((shares[:, z >= 2].sum(axis=1) >= TWO_TWO_SHARE)
               & (shares[:, z <= -2].sum(axis=1) >= TWO_TWO_SHARE)
               & (strength > TWO_TWO_STRENGTH))
    acid = (shares[:, proton].sum(axis=1) >= ACID_SHARE) & (strength > ACID_STRENGTH)
    return (
        (f"conductivity: more than {100 * ROUGH_SHARE_NOTE:g} % is carried by ions without a "
         f"published limiting conductivity here ({listed}), counted with a rough 30 S cm²/eq; "
         "the value is an estimate", rough_share > ROUGH_SHARE_NOTE),
        (f"conductivity: ionic strength past the {VALID_IONIC_STRENGTH:g} mol/kg the "
         "Onsager-type correction is checked to; the value is rough, measure it",
         strength > VALID_IONIC_STRENGTH),
        ("conductivity: 2:2 salts (MgSO4, CuSO4) read 15–30 % low at 0.5–1 % by mass against "
         "the CRC table (their ion pairs and the correction for 2:2 ions); measure it",
         two_two),
        ("conductivity: strong acid: H+ loses mobility faster than the correction says (0.5 % "
         "HCl reads about 9 % high against the CRC table); measure it", acid),
    )


def result_conductivity(result) -> Conductivity:
    """The :class:`Conductivity` of one speciated result (cached on the result's memo)."""
    from ..chemistry._formula import parse_formula
    from ..outputs._derived import water_kg_per_L

    names = list(result.system.species)
    formulas = [parse_formula(result.tables.entry(n).formula) for n in names]
    return conductivity(result.molality[None, :], formulas, names,
                        np.array([result.temperature_C]), np.array([water_kg_per_L(result)]))
