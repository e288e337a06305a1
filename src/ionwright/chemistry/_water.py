"""Properties of liquid water at about 1 atm, 0–100 °C: density, dielectric constant,
the Debye–Hückel slopes derived from them, and the ionization constant of water.

Every function takes a temperature in °C as a float or a numpy array and returns a
result of the same shape (a numpy float for a scalar), so activity models can evaluate
a whole batch of samples at once. Temperatures outside :data:`VALID_RANGE_C` are not
refused here; callers that care compare against it and warn.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
import numpy.typing as npt

from ..errors import UnknownNameError
from ._constants import LN10

ArrayOrFloat = float | npt.NDArray[np.float64]

VALID_RANGE_C: tuple[float, float] = (0.0, 100.0)
"""Temperature range (°C) for which every function in this module is stated to hold."""

KELVIN_OFFSET = 273.15

# CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010). e, k and N_A are exact
# since the 2019 SI redefinition; ε0 is a measured value with relative uncertainty 1.5e-10.
ELEMENTARY_CHARGE = 1.602176634e-19  # C
BOLTZMANN = 1.380649e-23  # J/K
AVOGADRO = 6.02214076e23  # 1/mol
VACUUM_PERMITTIVITY = 8.8541878128e-12  # F/m

STANDARD_PRESSURE_BAR = 1.01325
WATER_MOLAR_MASS_G = 18.015268  # g/mol, IAPWS-95 value, as used by Bandura & Lvov (2006)
_METRE_PER_ANGSTROM = 1e-10

_KELL_NUMERATOR = (999.83952, 16.945176, -7.9870401e-3, -46.170461e-6, 105.56302e-9,
                   -280.54253e-12)
_KELL_DENOMINATOR_T = 16.879850e-3

_MALMBERG_MARYOTT = (87.740, -0.40008, 9.398e-4, -1.410e-6)

# U1..U9 of Bradley & Pitzer (1979) from Pitzer (1991), Appendix, seen in secondary copies.
_BRADLEY_PITZER = (3.4279e2, -5.0866e-3, 9.4690e-7, -2.0525, 3.1159e3, -1.8289e2,
                   -8.0325e3, 4.2142e6, 2.1417)

# Bandura & Lvov (2006) coefficients, from memory (not read in the paper). They give pKw
# 13.9945 (25 °C), 14.946 (0 °C), 13.264 (50 °C), the paper's values as remembered, and
# match calorimetric ΔH° and ΔCp° of ionization (tests/reference/test_water.py).
_BL_N = 6
_BL_ALPHA = (-0.864671, 8659.19, -22786.2)
_BL_BETA = (0.642044, -56.8534, -0.375754)
_BL_IDEAL_GAS = (0.61415, 48251.33, -67707.93, 10102100.0)


def density(t_C: ArrayOrFloat) -> ArrayOrFloat:
    """Density of air-free water at 1 atm, in kg/m³.

    Parameters
    ----------
    t_C : float or ndarray
        Temperature in °C (the fit holds for 0–150 °C).

    References
    ----------
    Kell, G.S. (1975), J. Chem. Eng. Data 20, 97–105, eq. (16).
    """
    t = np.asarray(t_C, dtype=float)
    return np.polynomial.polynomial.polyval(t, _KELL_NUMERATOR) / (1.0 + _KELL_DENOMINATOR_T * t)


def _malmberg_maryott(t_C: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    """Malmberg & Maryott (1956), J. Res. NBS 56, 1: cubic in t/°C, 0–100 °C."""
    return np.asarray(np.polynomial.polynomial.polyval(t_C, _MALMBERG_MARYOTT), dtype=float)


def _bradley_pitzer(t_C: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    """Bradley & Pitzer (1979), J. Phys. Chem. 83, 1599, evaluated at 1.01325 bar."""
    u1, u2, u3, u4, u5, u6, u7, u8, u9 = _BRADLEY_PITZER
    T = t_C + KELVIN_OFFSET
    eps_1000_bar = u1 * np.exp(u2 * T + u3 * T**2)
    c = u4 + u5 / (u6 + T)
    b = u7 + u8 / T + u9 * T
    return eps_1000_bar + c * np.log((b + STANDARD_PRESSURE_BAR) / (b + 1000.0))


DIELECTRIC_METHODS: dict[str, Callable[[npt.NDArray[np.float64]], npt.NDArray[np.float64]]] = {
    "malmberg-maryott": _malmberg_maryott,
    "bradley-pitzer": _bradley_pitzer,
}
"""Dielectric-constant equations by name; the first is the default everywhere."""


def dielectric_constant(t_C: ArrayOrFloat, method: str = "malmberg-maryott") -> ArrayOrFloat:
    """Relative static permittivity ε of water at about 1 atm (dimensionless).

    Parameters
    ----------
    t_C : float or ndarray
        Temperature in °C.
    method : {"malmberg-maryott", "bradley-pitzer"}
        Which published equation to use. They differ by about 0.1 (0.1 %) at 25 °C,
        which moves the Debye–Hückel slopes by about 0.15 %.

    Raises
    ------
    UnknownNameError
        If *method* is not one of :data:`DIELECTRIC_METHODS`.

    References
    ----------
    Malmberg, C.G. & Maryott, A.A. (1956), J. Res. Natl. Bur. Stand. 56, 1–8.
    Bradley, D.J. & Pitzer, K.S. (1979), J. Phys. Chem. 83, 1599–1603.
    """
    try:
        equation = DIELECTRIC_METHODS[method]
    except KeyError:
        raise UnknownNameError(
            "dielectric-constant method", method, DIELECTRIC_METHODS,
            listing=f"known methods: {', '.join(DIELECTRIC_METHODS)}",
        ) from None
    return equation(np.asarray(t_C, dtype=float))


def _screening_factors(t_C: ArrayOrFloat, method: str) -> tuple[ArrayOrFloat, ArrayOrFloat]:
    """Return (Bjerrum-type length e²/(4πε0εkT) in m, κ/√I in m⁻¹ kg^½ mol^-½).

    κ² = 2 e² N_A ρ_w I / (ε0 ε k T) on the molal scale (ρ_w in kg/m³, I in mol/kg).
    """
    t = np.asarray(t_C, dtype=float)
    eps = dielectric_constant(t, method)
    kT = BOLTZMANN * (t + KELVIN_OFFSET)
    permittivity = VACUUM_PERMITTIVITY * eps
    bjerrum_length = ELEMENTARY_CHARGE**2 / (4.0 * np.pi * permittivity * kT)
    kappa_per_root_i = np.sqrt(2.0 * ELEMENTARY_CHARGE**2 * AVOGADRO * density(t)
                               / (permittivity * kT))
    return bjerrum_length, kappa_per_root_i


def debye_huckel_A(t_C: ArrayOrFloat, method: str = "malmberg-maryott") -> ArrayOrFloat:
    """Debye–Hückel limiting slope A for log10 γ, molal scale, in kg^½ mol^-½.

    A = (1/ln 10) · e²/(8π ε0 ε k T) · κ/√I, from :func:`dielectric_constant` (*method*)
    and :func:`density`, with CODATA 2018 constants. About 0.511 at 25 °C.

    References
    ----------
    Debye, P. & Hückel, E. (1923), Phys. Z. 24, 185; Robinson, R.A. & Stokes, R.H. (1959),
    Electrolyte Solutions, 2nd ed., ch. 9.
    """
    bjerrum_length, kappa = _screening_factors(t_C, method)
    return bjerrum_length * kappa / (2.0 * LN10)


def debye_huckel_B(t_C: ArrayOrFloat, method: str = "malmberg-maryott") -> ArrayOrFloat:
    """Debye–Hückel parameter B = κ/√I, molal scale, in Å⁻¹ kg^½ mol^-½.

    Multiplied by an ion-size parameter in Å it gives the denominator term of the extended
    Debye–Hückel equation. About 0.329 at 25 °C.

    References
    ----------
    Debye, P. & Hückel, E. (1923), Phys. Z. 24, 185; Robinson, R.A. & Stokes, R.H. (1959),
    Electrolyte Solutions, 2nd ed., ch. 9.
    """
    _, kappa = _screening_factors(t_C, method)
    return kappa * _METRE_PER_ANGSTROM


def osmotic_A_phi(t_C: ArrayOrFloat, method: str = "malmberg-maryott") -> ArrayOrFloat:
    """Debye–Hückel slope Aφ for the osmotic coefficient (natural log), in kg^½ mol^-½.

    Aφ = (1/3)(2π N_A ρ_w)^½ (e²/(4π ε0 ε k T))^{3/2}, which equals A·ln(10)/3. Pitzer's
    tables use the Bradley–Pitzer dielectric constant (Aφ ≈ 0.391 at 25 °C); pass
    ``method="bradley-pitzer"`` to match them.

    References
    ----------
    Pitzer, K.S. (1991), Activity Coefficients in Electrolyte Solutions, 2nd ed., CRC
    Press, ch. 3.
    """
    bjerrum_length, kappa = _screening_factors(t_C, method)
    return bjerrum_length * kappa / 6.0


def log10_kw(t_C: ArrayOrFloat, density_kg_m3: ArrayOrFloat | None = None) -> ArrayOrFloat:
    """log10 of the ionization constant of water, Kw = a(H+) a(OH-), molal scale.

    Parameters
    ----------
    t_C : float or ndarray
        Temperature in °C.
    density_kg_m3 : float or ndarray, optional
        Density of water in kg/m³ (the unit :func:`density` returns). Defaults to the
        Kell (1975) value at 1 atm, which gives Kw at 1 atm (saturation above 100 °C).

    Returns
    -------
    float or ndarray
        log10 Kw, e.g. −13.995 at 25 °C.

    References
    ----------
    Bandura, A.V. & Lvov, S.N. (2006), J. Phys. Chem. Ref. Data 35, 15–30.
    """
    t = np.asarray(t_C, dtype=float)
    rho_kg_m3 = density(t) if density_kg_m3 is None else np.asarray(density_kg_m3, float)
    rho = rho_kg_m3 / 1000.0  # the fit is written in g/cm³
    T = t + KELVIN_OFFSET
    a0, a1, a2 = _BL_ALPHA
    b0, b1, b2 = _BL_BETA
    g0, g1, g2, g3 = _BL_IDEAL_GAS
    q = rho * np.exp(a0 + a1 / T + a2 * rho ** (2.0 / 3.0) / T**2)
    pkw_ideal_gas = g0 + g1 / T + g2 / T**2 + g3 / T**3
    pkw = (-2.0 * _BL_N * (np.log10(1.0 + q) - q / (q + 1.0) * rho * (b0 + b1 / T + b2 * rho))
           + pkw_ideal_gas + 2.0 * np.log10(WATER_MOLAR_MASS_G / 1000.0))
    return -pkw
