"""Temperature dependence of equilibrium constants: log10 K(T) from 25 °C data.

Four published forms, whichever a constant table provides: van 't Hoff with a constant
ΔH°, van 't Hoff with a constant ΔCp°, an analytic expression in T, and a named function
of this package (:data:`FUNCTIONS`: the ionization of water, so that the solver and the
water properties share one Kw). All functions take T in kelvin as a float or numpy array
and broadcast over the other arguments, so a batch of samples at different temperatures
is one call.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import numpy.typing as npt

from ..errors import TableError
from ._water import KELVIN_OFFSET, log10_kw
from ._constants import LN10

ArrayOrFloat = float | npt.NDArray[np.float64]

T_REF = 298.15
"""Reference temperature of tabulated constants, K."""

R = 8.314462618
"""Molar gas constant, J mol⁻¹ K⁻¹ (CODATA 2018: N_A·k, exact, here to 10 digits)."""

_ANALYTIC_TERMS = 5  # a, b, c, d, e
BASIS_SIZE = 6       # the analytic terms and log10 Kw of water


def _water_ionization(T: ArrayOrFloat) -> ArrayOrFloat:
    """log10 Kw at *T* (K) and 1 atm: the formation constant of OH- from H2O − H+."""
    return log10_kw(np.asarray(T, dtype=float) - KELVIN_OFFSET)


FUNCTIONS = {"water ionization": (
    _water_ionization, "log10 Kw of Bandura & Lvov (2006) at 1 atm, ionwright.chemistry.log10_kw")}
"""Named temperature functions a table may give as ``function``: name → (f(T) in K,
description). Each is one row of :func:`basis`."""


def van_t_hoff(log_k25: ArrayOrFloat, enthalpy_kJ: ArrayOrFloat, T: ArrayOrFloat) -> ArrayOrFloat:
    """log10 K at *T* from log10 K at 298.15 K and a temperature-independent ΔH°.

    log10 K(T) = log10 K(T_r) − ΔH°/(R ln 10) · (1/T − 1/T_r).

    Parameters
    ----------
    log_k25 : float or ndarray
        log10 K at :data:`T_REF`.
    enthalpy_kJ : float or ndarray
        Standard reaction enthalpy ΔH° in kJ/mol.
    T : float or ndarray
        Temperature in K.

    References
    ----------
    van 't Hoff, J.H. (1884), Études de dynamique chimique, Amsterdam.
    """
    T = np.asarray(T, dtype=float)
    enthalpy_J = np.asarray(enthalpy_kJ, dtype=float) * 1000.0
    return log_k25 - enthalpy_J / (R * LN10) * (1.0 / T - 1.0 / T_REF)


def van_t_hoff_cp(log_k25: ArrayOrFloat, enthalpy_kJ: ArrayOrFloat, heat_capacity_J: ArrayOrFloat,
                  T: ArrayOrFloat) -> ArrayOrFloat:
    """log10 K at *T* from log10 K, ΔH° (kJ/mol) and a constant ΔCp° (J/mol/K) at 298.15 K.

    With ΔH(T) = ΔH° + ΔCp°(T − T_r), integration of the van 't Hoff equation gives
    ln K(T) = ln K(T_r) − ΔH°/R (1/T − 1/T_r) + ΔCp°/R (T_r/T − 1 + ln(T/T_r)).
    This is the form Goldberg et al. use for their buffer tables (about 274–350 K).

    References
    ----------
    Clarke, E.C.W. & Glew, D.N. (1966), Trans. Faraday Soc. 62, 539–547.
    Goldberg, R.N., Kishore, N. & Lennen, R.M. (2002), J. Phys. Chem. Ref. Data 31, 231–370.
    """
    T = np.asarray(T, dtype=float)
    heat_capacity = np.asarray(heat_capacity_J, dtype=float)
    heat_capacity_term = heat_capacity / (R * LN10) * (T_REF / T - 1.0 + np.log(T / T_REF))
    return van_t_hoff(log_k25, enthalpy_kJ, T) + heat_capacity_term


def _analytic_coefficients(coeffs: Sequence[float]) -> npt.NDArray[np.float64]:
    """Pad (a, b, c, d, e) with zeros; refuse more than five terms."""
    values = np.asarray(coeffs, dtype=float)
    if values.ndim != 1 or values.size > _ANALYTIC_TERMS:
        raise TableError("(analytic log K expression)", [
            f"expected at most {_ANALYTIC_TERMS} coefficients (a, b, c, d, e) of "
            f"log10 K = a + b·T + c/T + d·log10 T + e/T², got {np.ravel(values).tolist()}"])
    return np.pad(values, (0, _ANALYTIC_TERMS - values.size))


def analytic(coeffs: Sequence[float], T: ArrayOrFloat) -> ArrayOrFloat:
    """log10 K = a + b·T + c/T + d·log10 T + e/T² at *T* (K).

    Parameters
    ----------
    coeffs : sequence of float
        (a, b, c, d, e); a shorter sequence leaves the missing trailing terms at zero.
    T : float or ndarray
        Temperature in K.

    Raises
    ------
    TableError
        If more than five coefficients are given.

    References
    ----------
    Plummer, L.N. & Busenberg, E. (1982), Geochim. Cosmochim. Acta 46, 1011–1040
    (the form of their log K(T) expressions).
    """
    a, b, c, d, e = _analytic_coefficients(coeffs)
    T = np.asarray(T, dtype=float)
    return a + b * T + c / T + d * np.log10(T) + e / T**2


def delta_h_from_analytic(coeffs: Sequence[float], T: ArrayOrFloat) -> ArrayOrFloat:
    """ΔH° in kJ/mol implied by an analytic log10 K(T) expression, at *T* (K).

    From the van 't Hoff equation ΔH° = R ln 10 · T² · d log10 K/dT
    = R ln 10 · (b·T² − c + d·T/ln 10 − 2e/T).

    References
    ----------
    Plummer, L.N. & Busenberg, E. (1982), Geochim. Cosmochim. Acta 46, 1011–1040.
    """
    _, b, c, d, e = _analytic_coefficients(coeffs)
    T = np.asarray(T, dtype=float)
    return R * LN10 * (b * T**2 - c + d * T / LN10 - 2.0 * e / T) / 1000.0


def basis(T: ArrayOrFloat) -> npt.NDArray[np.float64]:
    """The functions (1, T, 1/T, log10 T, 1/T², log10 Kw(T)) of *T* (K), shape (6, n).

    Every form above is a fixed combination of them (:func:`basis_coefficients`), so a
    table of reactions at a batch of temperatures is one small weighted sum.
    """
    T = np.atleast_1d(np.asarray(T, dtype=float))
    out = np.empty((BASIS_SIZE, T.size))
    out[0] = 1.0
    out[1] = T
    np.divide(1.0, T, out=out[2])
    np.log10(T, out=out[3])
    np.multiply(out[2], out[2], out=out[4])
    out[5] = _water_ionization(T)
    return out


def basis_coefficients(log_k25: float, enthalpy_kJ: float | None = None,
                       heat_capacity_J: float | None = None,
                       analytic_terms: Sequence[float] | None = None,
                       function: str | None = None) -> npt.NDArray[np.float64]:
    """Weights (6,) of :func:`basis` giving the same log10 K(T) as the form these data take.

    A named function is its own row; an analytic expression is its own coefficients; van
    't Hoff puts ΔH°/(R ln 10) on 1/T; a constant ΔCp° adds ΔCp°/(R ln 10)·(T_r/T − 1 +
    ln 10·log10 T − ln T_r).
    """
    out = np.zeros(BASIS_SIZE)
    if function is not None:
        out[list(FUNCTIONS).index(function) + _ANALYTIC_TERMS] = 1.0
        return out
    if analytic_terms is not None:
        out[:_ANALYTIC_TERMS] = _analytic_coefficients(analytic_terms)
        return out
    out[0] = log_k25
    if enthalpy_kJ is not None:
        h = enthalpy_kJ * 1000.0 / (R * LN10)
        out[0] += h / T_REF
        out[2] -= h
    if heat_capacity_J is not None:
        g = heat_capacity_J / (R * LN10)
        out[0] -= g * (1.0 + np.log(T_REF))
        out[2] += g * T_REF
        out[3] += g * LN10
    return out
