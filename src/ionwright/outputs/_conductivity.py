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
    """κ in mS/cm per sample, the share of it carried by ions without a listed λ°, and
    the warnings that go with them."""

    mS_per_cm: npt.NDArray[np.float64]       # (n,)
    notes: tuple[str, ...]
    rough_share: npt.NDArray[np.float64]     # (n,)


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
    charged_formulas = [formulas[i] for i in charged]
    rough = [j for j, f in enumerate(charged_formulas) if not is_listed(f)]
    share = carried[:, rough].sum(axis=1) / np.where(kappa > 0, kappa, 1.0)
    return Conductivity(kappa, tuple(_notes(carried, kappa, share, [names[i] for i in charged],
                                            rough)), share)


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


def _notes(carried: np.ndarray, kappa: np.ndarray, share: np.ndarray, names: list[str],
           rough: list[int]) -> list[str]:
    """Warnings for one or more samples: ions with a rough λ° (at positions *rough* of
    *names*, carrying *share* of the conductivity)."""
    notes = []
    if rough:
        if np.max(share) > ROUGH_SHARE_NOTE:
            listed = ", ".join(names[j] for j in rough
                               if np.max(carried[:, j] / np.where(kappa > 0, kappa, 1.0)) > 0.01)
            notes.append(f"conductivity: {100 * float(np.max(share)):.0f} % is carried by ions "
                         f"without a published limiting conductivity here ({listed}), counted "
                         "with a rough 30 S cm²/eq; the value is an estimate")
    return notes


def strength_note(ionic_strength: float) -> list[str]:
    """A warning when the solution is beyond the conductivity method's range."""
    if ionic_strength <= VALID_IONIC_STRENGTH:
        return []
    return [f"conductivity: ionic strength {ionic_strength:.3g} mol/kg is past the "
            f"{VALID_IONIC_STRENGTH:g} mol/kg the Onsager-type correction is checked to; "
            "the value is rough, measure it"]


def result_conductivity(result) -> Conductivity:
    """The :class:`Conductivity` of one speciated result (cached on the result's memo)."""
    from ..chemistry._formula import parse_formula
    from ..outputs._derived import water_kg_per_L

    names = list(result.system.species)
    formulas = [parse_formula(result.tables.entry(n).formula) for n in names]
    found = conductivity(result.molality[None, :], formulas, names,
                         np.array([result.temperature_C]), np.array([water_kg_per_L(result)]))
    return Conductivity(found.mS_per_cm, found.notes + tuple(strength_note(result.ionic_strength)),
                        found.rough_share)
