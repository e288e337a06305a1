"""Un-ionised ammonia fraction against Emerson, Russo, Lund & Thurston (1975).

Emerson, K., Russo, R.C., Lund, R.E. & Thurston, R.V. (1975) Aqueous ammonia
equilibrium calculations: effect of pH and temperature. J. Fish. Res. Board Can. 32,
2379–2383: pKa(NH4+) = 0.09018 + 2729.92/T (T in K, 0–50 °C) and
f = 1/(10^(pKa − pH) + 1)  # from memory (reference-inputs §8)

The engine does not use Emerson's expression: the core table's NH4+ constant is the
Bates & Pinching (1949) fit pKa = 2835.76/T − 0.6322 + 0.001225 T, which differs from
Emerson's by about 0.002 in pKa (0.5 % in f) at 0–30 °C. The issue's tolerance is
5 % relative. Dilute ammonium chloride at a fixed pH, so activity corrections are
negligible, as in Emerson's table (I → 0).
"""

from __future__ import annotations

import pytest

import ionwright


def emerson_fraction(t_C: float, ph: float) -> float:
    pka = 0.09018 + 2729.92 / (t_C + 273.15)
    return 1.0 / (10.0 ** (pka - ph) + 1.0)


def engine_fraction(t_C: float, ph: float) -> float:
    result = ionwright.solve({"temperature_C": t_C, "activity_model": "davies",
                              "dissolve": {"NH4Cl": 1e-5}, "fix": {"pH": ph}})
    return result.to_dict()["derived"]["unionized_ammonia_fraction"]


@pytest.mark.parametrize("t_C, ph, derived_percent", [
    (10.0, 8.0, 1.82),    # [derived] reference-inputs §8 table from Emerson's equation
    (10.0, 9.0, 15.65),   # [derived] idem
    (25.0, 7.0, 0.564),   # [derived] idem
    (25.0, 8.5, 15.2),    # [derived] idem
])
def test_fraction_matches_emersons_equation(t_C, ph, derived_percent):
    assert emerson_fraction(t_C, ph) * 100 == pytest.approx(derived_percent, rel=0.005)
    assert engine_fraction(t_C, ph) == pytest.approx(emerson_fraction(t_C, ph), rel=0.05)


@pytest.mark.parametrize("ph, printed_percent", [
    (7.0, 0.566),   # Emerson et al. (1975) table, 25 °C  # from memory
    (8.0, 5.38),    # idem  # from memory
    (9.0, 36.3),    # idem  # from memory
])
def test_fraction_matches_emersons_printed_table_at_25_C(ph, printed_percent):
    assert engine_fraction(25.0, ph) * 100 == pytest.approx(printed_percent, rel=0.05)


def test_unionised_ammonia_of_a_water_analysis():
    # 1.0 mg/L total ammonia as N at 20 °C, pH 8.0: Emerson's f = 3.81 % [derived]
    result = ionwright.solve({"analysis": {"temperature_C": 20.0, "pH": 8.0,
                                           "ammonia": "1.0 mg/L as N", "Cl": "20 mg/L",
                                           "balance_on": "Cl"}})
    derived = result.to_dict()["derived"]
    assert derived["unionized_ammonia_fraction"] == pytest.approx(emerson_fraction(20, 8.0),
                                                                  rel=0.05)
    assert derived["unionized_ammonia_mg_per_L_as_N"] == pytest.approx(
        1.0 * emerson_fraction(20, 8.0), rel=0.05)


def test_chloramine_nitrogen_is_not_counted_as_ammonia():
    # Ammonia left over after part of it is chlorinated: the fraction is free NH3 over the
    # ammonia that is still ammonia (NH3 + NH4+), so Emerson's f applies to it unchanged,
    # however much nitrogen the monochloramine holds.
    result = ionwright.solve({"temperature_C": 25.0,
                              "dissolve": {"NH4Cl": 1e-4, "sodium hypochlorite": 5e-5},
                              "fix": {"pH": 9.0}})
    out = result.to_dict()
    molality = {row["name"]: row["molality"] for row in out["species"]}
    assert molality["NH2Cl"] > 1e-5          # the chloramine is really there
    fraction = out["derived"]["unionized_ammonia_fraction"]
    free, ion = molality["NH3"], molality["NH4+"]
    assert fraction == pytest.approx(free / (free + ion), rel=1e-6)
    assert fraction == pytest.approx(emerson_fraction(25.0, 9.0), rel=0.05)
