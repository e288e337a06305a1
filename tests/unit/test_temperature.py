"""Unit tests of ionwright.temperature: the van 't Hoff forms and the analytic log K(T)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ionwright.errors import TableError
from ionwright.chemistry._temperature import (
    T_REF,
    R,
    analytic,
    basis,
    basis_coefficients,
    delta_h_from_analytic,
    van_t_hoff,
    van_t_hoff_cp,
)

LN10 = math.log(10.0)

log10_k = st.floats(-20.0, 20.0)
enthalpy_kJ = st.floats(-200.0, 200.0)
heat_capacity_J = st.floats(-500.0, 500.0)
kelvin = st.floats(273.15, 373.15)

deterministic = settings(derandomize=True, deadline=None, max_examples=200)


def slope_in_inverse_T(log_k_of_T, T: float, step: float = 1e-9) -> float:
    """Central-difference d log10 K / d(1/T) at *T*."""
    x = 1.0 / T
    return (log_k_of_T(1.0 / (x + step)) - log_k_of_T(1.0 / (x - step))) / (2.0 * step)


@deterministic
@given(log10_k, enthalpy_kJ)
def test_van_t_hoff_returns_log_k25_at_the_reference_temperature(log_k25, dh):
    """At T = 298.15 K the van 't Hoff correction vanishes, whatever ΔH°."""
    assert van_t_hoff(log_k25, dh, T_REF) == pytest.approx(log_k25, abs=1e-12)


@deterministic
@given(log10_k, enthalpy_kJ, kelvin)
def test_van_t_hoff_slope_in_inverse_T_is_minus_delta_h_over_R_ln10(log_k25, dh, T):
    """d log10 K / d(1/T) = −ΔH°/(R ln 10) everywhere (constant ΔH°)."""
    slope = slope_in_inverse_T(lambda t: van_t_hoff(log_k25, dh, t), T)
    assert slope == pytest.approx(-dh * 1000.0 / (R * LN10), rel=1e-6, abs=1e-3)


@deterministic
@given(log10_k, enthalpy_kJ, heat_capacity_J, kelvin)
def test_van_t_hoff_cp_slope_follows_delta_h_of_T(log_k25, dh, dcp, T):
    """With constant ΔCp°, d log10 K / d(1/T) = −[ΔH° + ΔCp°(T − T_r)]/(R ln 10)."""
    slope = slope_in_inverse_T(lambda t: van_t_hoff_cp(log_k25, dh, dcp, t), T)
    delta_h_at_T = dh * 1000.0 + dcp * (T - T_REF)
    assert slope == pytest.approx(-delta_h_at_T / (R * LN10), rel=1e-6, abs=1e-3)


@deterministic
@given(log10_k, enthalpy_kJ, heat_capacity_J)
def test_van_t_hoff_cp_returns_log_k25_at_the_reference_temperature(log_k25, dh, dcp):
    """Both correction terms vanish at T_r."""
    assert van_t_hoff_cp(log_k25, dh, dcp, T_REF) == pytest.approx(log_k25, abs=1e-12)


@deterministic
@given(log10_k, enthalpy_kJ, kelvin)
def test_van_t_hoff_cp_with_zero_cp_is_van_t_hoff(log_k25, dh, T):
    """ΔCp° = 0 turns the heat-capacity form into the plain van 't Hoff form."""
    assert van_t_hoff_cp(log_k25, dh, 0.0, T) == pytest.approx(van_t_hoff(log_k25, dh, T),
                                                               abs=1e-12)


@deterministic
@given(log10_k, enthalpy_kJ, heat_capacity_J, kelvin)
def test_van_t_hoff_cp_is_an_analytic_expression_with_the_same_enthalpy(log_k25, dh, dcp, T):
    """Constant ΔCp° is a + c/T + d·log10 T with d = ΔCp°/R; its ΔH(T) is ΔH° + ΔCp°(T−T_r).

    Expanding the integrated form independently checks both van_t_hoff_cp and
    delta_h_from_analytic (the latter against a ΔH not computed by numerical derivatives).
    """
    h, k = dh * 1000.0 / (R * LN10), dcp / (R * LN10)
    coeffs = (log_k25 + h / T_REF - k * (1.0 + math.log(T_REF)), 0.0, -h + k * T_REF, dcp / R)
    assert analytic(coeffs, T) == pytest.approx(van_t_hoff_cp(log_k25, dh, dcp, T), abs=1e-9)
    assert delta_h_from_analytic(coeffs, T) == pytest.approx(dh + dcp * (T - T_REF) / 1000.0,
                                                             abs=1e-9)


coefficients = st.tuples(st.floats(-500, 500), st.floats(-0.5, 0.5), st.floats(-5e4, 5e4),
                         st.floats(-200, 200), st.floats(-5e6, 5e6))


@deterministic
@given(coefficients, kelvin)
def test_delta_h_from_analytic_matches_the_numerical_derivative(coeffs, T):
    """ΔH° = −R ln 10 · d log10 K / d(1/T) for every a + bT + c/T + d log10 T + e/T²."""
    slope = slope_in_inverse_T(lambda t: analytic(coeffs, t), T, step=1e-8)
    expected_kJ = -R * LN10 * slope / 1000.0
    assert delta_h_from_analytic(coeffs, T) == pytest.approx(expected_kJ, rel=1e-5, abs=1e-4)


def test_analytic_treats_missing_trailing_coefficients_as_zero():
    """(a, b, c) means d = e = 0; an empty sequence is log K = 0."""
    T = np.array([280.0, 300.0, 350.0])
    np.testing.assert_allclose(analytic((1.5, 0.01, -300.0), T), 1.5 + 0.01 * T - 300.0 / T)
    np.testing.assert_allclose(analytic((1.5, 0.01, -300.0), T),
                               analytic((1.5, 0.01, -300.0, 0.0, 0.0), T))
    np.testing.assert_array_equal(analytic((), T), np.zeros(3))


def test_analytic_terms_have_the_documented_form():
    """Each coefficient multiplies its own term: a, b·T, c/T, d·log10 T, e/T²."""
    T = 320.0
    terms = [1.0, T, 1.0 / T, math.log10(T), 1.0 / T**2]
    for i, term in enumerate(terms):
        coeffs = [0.0] * 5
        coeffs[i] = 2.0
        assert analytic(coeffs, T) == pytest.approx(2.0 * term, rel=1e-14)


def test_analytic_refuses_more_than_five_coefficients():
    """A sixth coefficient is a malformed table entry, reported with the values given."""
    with pytest.raises(TableError) as info:
        analytic((1.0, 2.0, 3.0, 4.0, 5.0, 6.0), 300.0)
    (problem,) = info.value.problems
    assert "at most 5 coefficients" in problem
    assert "got [1.0, 2.0, 3.0, 4.0, 5.0, 6.0]" in problem
    with pytest.raises(TableError):
        delta_h_from_analytic((1.0, 2.0, 3.0, 4.0, 5.0, 6.0), 300.0)


def test_functions_broadcast_over_a_batch():
    """Arrays of constants and temperatures broadcast; a scalar stays a scalar."""
    T = np.linspace(275.0, 365.0, 7)
    log_k25 = np.array([[-7.198], [-4.756]])
    assert van_t_hoff_cp(log_k25, 3.6, -230.0, T).shape == (2, 7)
    assert van_t_hoff(-7.198, np.array([3.6, -0.41]), 310.15).shape == (2,)
    assert analytic((1.0, 0.0, 100.0), T).shape == (7,)
    assert delta_h_from_analytic((1.0, 0.0, 100.0), T).shape == (7,)
    assert np.ndim(van_t_hoff(-7.198, 3.6, 310.15)) == 0
    row = van_t_hoff_cp(-7.198, 3.6, -230.0, T)
    np.testing.assert_allclose(row, [van_t_hoff_cp(-7.198, 3.6, -230.0, t) for t in T])


# --- Checks against published values -------------------------------------------------


def test_phosphate_pk2_at_37_C_from_goldberg_parameters():
    """Goldberg, Kishore & Lennen (2002) phosphate pK2 = 7.198, ΔrH° = 3.6 kJ/mol,
    ΔrCp° = −230 J/K/mol at 298.15 K (all three from memory).

    [derived] Independent hand computation at T = 310.15 K, in the pK form
    pK(T) = pK + ΔH/(R ln10)·(1/T − 1/Tr) − ΔCp/(R ln10)·(Tr/T − 1 + ln(T/Tr)):
      1/T − 1/Tr            = −1.2977010e-4 K⁻¹
      Tr/T − 1 + ln(T/Tr)   = 0.96130904 − 1 + 0.03945934 = 7.683799e-4
      ΔH/(R ln10)           = 3600 / 19.144758 = 188.04103 K
      ΔCp/(R ln10)          = −230 / 19.144758 = −12.013733
      pK(37 °C) = 7.198 − 0.0244021 + 0.0092311 = 7.182829
    This checks the formula, not the data.
    """
    log10_k = van_t_hoff_cp(-7.198, 3.6, -230.0, 310.15)
    assert -log10_k == pytest.approx(7.182829, abs=2e-6)


@pytest.mark.parametrize("coeffs, goldberg_delta_h_kJ", [
    # Plummer & Busenberg (1982) K1 and K2 of carbonic acid (seen, see reference-inputs §7)
    ((-356.3094, -0.06091964, 21834.37, 126.8339, -1684915.0), 9.15),   # from memory
    ((-107.8871, -0.03252849, 5151.79, 38.92561, -563713.9), 14.70),    # from memory
])
def test_carbonate_delta_h_from_plummer_busenberg_matches_goldberg(coeffs, goldberg_delta_h_kJ):
    """ΔrH° at 25 °C implied by Plummer & Busenberg (1982)'s log K(T) expressions for
    carbonic acid agrees with the values selected by Goldberg, Kishore & Lennen (2002),
    Table (carbonate pK1, pK2; values from memory) to 0.3 kJ/mol (P&B give 9.11, 14.90)."""
    assert delta_h_from_analytic(coeffs, T_REF) == pytest.approx(goldberg_delta_h_kJ, abs=0.3)


@deterministic
@given(log10_k, enthalpy_kJ, heat_capacity_J, kelvin)
def test_the_temperature_basis_reproduces_every_closed_form(log_k25, dh, dcp, T):
    """The solver's weighted sum over (1, T, 1/T, log10 T, 1/T²) is the same function."""
    terms = basis(np.array([T]))[:, 0]
    assert basis_coefficients(log_k25) @ terms == pytest.approx(log_k25, abs=1e-12)
    assert basis_coefficients(log_k25, dh) @ terms == pytest.approx(
        van_t_hoff(log_k25, dh, T), abs=1e-11)
    assert basis_coefficients(log_k25, dh, dcp) @ terms == pytest.approx(
        van_t_hoff_cp(log_k25, dh, dcp, T), abs=1e-11)
    coeffs = (log_k25, 0.01, -dh * 10.0, 2.0, dcp * 1e3)
    assert basis_coefficients(0.0, analytic_terms=coeffs) @ terms == pytest.approx(
        analytic(coeffs, T), abs=1e-11)
