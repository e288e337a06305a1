"""pH of pure water in equilibrium with the CO2 of the atmosphere: about 5.6.

"Rain in equilibrium with atmospheric CO2 has a pH of about 5.6"  # common practice
With no gas phase in a recipe, the same state is made by dissolving the CO2 that the
table's Henry constant (Plummer & Busenberg 1982) gives at a CO2 partial pressure of
10^-3.4 atm (about 400 µatm), found by matching the derived log10 pCO2.
"""

from __future__ import annotations

import math

import pytest

import ionwright

LOG10_PCO2_AIR = -3.4  # about 400 µatm  # common practice


def water_at(log10_pco2: float, t_C: float = 25.0):
    """Pure water holding as much CO2 as a gas at 10^log10_pco2 atm gives (secant)."""
    def log_p(total):
        result = ionwright.solve({"temperature_C": t_C, "dissolve": {"CO2": total}})
        return result.to_dict()["derived"]["log10_pCO2_atm"] - log10_pco2, result

    a, b = 1e-5, 2e-5
    fa, _ = log_p(a)
    fb, result = log_p(b)
    for _ in range(30):
        if abs(fb) < 1e-12:
            break
        a, b = b, math.exp(math.log(b) - fb * (math.log(b) - math.log(a)) / (fb - fa))
        fa, (fb, result) = fb, log_p(b)
    return result


def test_ph_of_water_under_air_is_about_5_6():
    result = water_at(LOG10_PCO2_AIR)
    assert result.to_dict()["derived"]["log10_pCO2_atm"] == pytest.approx(-3.4, abs=1e-9)
    assert result.pH == pytest.approx(5.6, abs=0.05)


def test_matches_the_closed_form_with_the_tables_constants():
    # [derived] with K_H = 10^-1.468 and K1 = 10^-6.352 (Plummer & Busenberg 1982, 25 °C):
    # [H+]² ≈ K1·K_H·pCO2 + Kw → pH 5.61 (activity coefficients ≈ 1 at I ≈ 2e-6)
    h = math.sqrt(10 ** (-6.352 - 1.468 - 3.4) + 10 ** -13.995)
    assert water_at(LOG10_PCO2_AIR).pH == pytest.approx(-math.log10(h), abs=0.002)
