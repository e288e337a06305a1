"""The constants of constants/metals.toml that the metals checks rely on, against their
re-read published values; temperature functions against the enthalpies their authors state.

Each row names its source (all re-read, see the table's header for what was and was not).
Where the table converts a published constant (another reaction, another ionic strength),
the conversion is redone here from the published number, independently of the table.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.core._system import log10_k_at

R = 8.314462618  # J/(mol K), CODATA
T25 = 298.15


@pytest.fixture(scope="module")
def tables():
    return ionwright.load_tables(["core", "metals"])


def k25(tables, name: str) -> float:
    entry = tables.species.get(name) or tables.solids[name]
    return float(log10_k_at(entry.logk, np.array([25.0]))[0])


def enthalpy_kJ(tables, name: str) -> float:
    """ΔH° at 25 °C implied by the table's temperature function (van 't Hoff slope)."""
    entry = tables.species.get(name) or tables.solids[name]
    lo, hi = log10_k_at(entry.logk, np.array([24.9, 25.1]))
    return math.log(10) * R * T25 ** 2 * (hi - lo) / 0.2 / 1000.0


# (entry, log K at 25 °C, tolerance, source)  — all re-read
REREAD = [
    ("FeOH^2+", -2.19, 0.005, "Stefánsson 2007, abstract"),
    ("Fe(OH)2+", -5.76, 0.005, "Stefánsson 2007, abstract"),
    ("Fe(OH)3", -14.30, 0.005, "Stefánsson 2007, abstract"),
    ("Fe(OH)4-", -21.71, 0.005, "Stefánsson 2007, abstract"),
    ("Fe2(OH)2^4+", -2.92, 0.005, "Stefánsson 2007, abstract"),
    ("ferrihydrite", 3.50, 0.005, "Stefánsson 2007, abstract"),
    ("FeCO3", 5.5, 0.005, "Bruno, Wersin & Stumm 1992, abstract (I = 0)"),
    ("Fe(CO3)2^2-", 7.1, 0.005, "Bruno, Wersin & Stumm 1992, abstract (I = 0)"),
    ("siderite", -10.8, 0.005, "Bruno, Wersin & Stumm 1992, abstract (I = 0)"),
    ("MnCO3", 4.8, 0.005, "Luo & Millero 2003, abstract"),
    ("rhodochrosite", -10.3, 0.005, "Luo & Millero 2003, abstract"),
    ("AlOH^2+", -4.98, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("Al(OH)2+", -10.63, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("Al(OH)3", -15.66, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("Al(OH)4-", -22.91, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("gibbsite", 7.75, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("BaOH+", -13.32, 0.005, "Brown & Ekberg 2016 via Wikipedia 'Hydrolysis constant'"),
    ("SrHCO3+", 1.18, 0.005, "Busenberg, Plummer & Parker 1984, abstract"),
    ("SrCO3", 2.81, 0.005, "Busenberg, Plummer & Parker 1984, abstract"),
    ("strontianite", -9.271, 0.002, "Busenberg, Plummer & Parker 1984, abstract"),
    ("BaHCO3+", 0.982, 0.005, "Busenberg & Plummer 1986, abstract"),
    ("BaCO3", 2.71, 0.005, "Busenberg & Plummer 1986, abstract"),
    ("witherite", -8.562, 0.002, "Busenberg & Plummer 1986, abstract"),
    ("celestite", -6.637, 0.002, "Reardon & Armstrong 1987, abstract (their expression)"),
    ("CuHCO3+", 1.8, 0.005, "Byrne & Miller 1985, abstract (I = 0)"),
    ("HAsO4^2-", 11.58, 0.005, "Raposo et al. 2002, abstract"),
    ("H2AsO4-", 7.06, 0.005, "Raposo et al. 2002, abstract"),
    ("H3AsO4", 2.25, 0.005, "Raposo et al. 2002, abstract"),
]


@pytest.mark.parametrize("name, published, tol, source", REREAD, ids=[r[0] for r in REREAD])
def test_reread_log_k_at_25C(tables, name, published, tol, source):
    assert k25(tables, name) == pytest.approx(published, abs=tol), source


@pytest.mark.parametrize("name, byrne_miller", [("CuCO3", 6.82), ("Cu(CO3)2^2-", 10.6)])
def test_recalled_copper_carbonate_constants_agree_with_byrne_and_miller(tables, name,
                                                                         byrne_miller):
    # Byrne & Miller (1985) Geochim. Cosmochim. Acta 49, abstract (re-read), I = 0: an
    # independent check of the IUPAC values recalled in the table (6.75 and 10.3)
    assert k25(tables, name) == pytest.approx(byrne_miller, abs=0.35)


def test_gibbsite_solubility_of_may_et_al_1979_is_within_their_spread(tables):
    # May, Helmke & Jackson (1979), abstract: *Ks0 = 1.29e8 for synthetic gibbsite, and
    # the natural gibbsite's ΔfG° 0.9 kcal/mol less negative (≈ 0.66 log units more
    # soluble). Brown & Ekberg's 7.75 lies within that crystal-to-crystal spread.
    may = math.log10(1.29e8)
    assert abs(k25(tables, "gibbsite") - may) < 0.66


# (entry, ΔH° kJ/mol stated beside the expression, tolerance, source)  — re-read
STATED_ENTHALPIES = [
    ("strontianite", -1.67, 0.3, "Busenberg, Plummer & Parker 1984"),
    ("SrHCO3+", 25.30, 0.3, "Busenberg, Plummer & Parker 1984"),
    ("SrCO3", 21.83, 0.3, "Busenberg, Plummer & Parker 1984"),
    ("witherite", 2.94, 0.3, "Busenberg & Plummer 1986"),
    ("BaHCO3+", 23.26, 0.3, "Busenberg & Plummer 1986"),
    ("BaCO3", 14.84, 0.3, "Busenberg & Plummer 1986"),
    ("FeOH^2+", 42.68, 0.05, "Byrne, Luo & Young 2000 (10.2 kcal/mol)"),
]


@pytest.mark.parametrize("name, stated, tol, source", STATED_ENTHALPIES,
                         ids=[r[0] for r in STATED_ENTHALPIES])
def test_temperature_function_has_the_stated_enthalpy(tables, name, stated, tol, source):
    assert enthalpy_kJ(tables, name) == pytest.approx(stated, abs=tol), source


@pytest.mark.xfail(strict=True, reason="Reardon & Armstrong (1987) state ΔH° = -1.67 ± 0.92 "
                   "kJ/mol for celestite, but the slope of their own log K expression at 25 °C "
                   "gives about -3.5 kJ/mol; the table keeps the expression as published")
def test_celestite_expression_has_the_stated_enthalpy(tables):
    assert enthalpy_kJ(tables, "celestite") == pytest.approx(-1.67, abs=0.92)


def co2_gas_to_carbonate(tables) -> float:
    """log K of CO2(g) + H2O = CO3-2 + 2H+ from core's constants at 25 °C."""
    return (float(log10_k_at(tables.gases["CO2(g)"].logk, np.array([25.0]))[0])
            - k25(tables, "CO2") - k25(tables, "HCO3-"))


def test_malachite_from_its_published_star_kps0(tables):
    # Preis & Gamsjäger (2002), abstract: log *Kps0 = 6.34 ± 0.10 for
    # ½Cu2(OH)2CO3 + 2H+ = Cu2+ + ½CO2(g) + 3/2 H2O
    expected = 2 * 6.34 + co2_gas_to_carbonate(tables)
    assert k25(tables, "malachite") == pytest.approx(expected, abs=0.01)


def test_smithsonite_from_its_published_star_kps0(tables):
    # Preis, Königsberger & Gamsjäger (2000), abstract: log *Kps0 = 7.25 ± 0.10 for
    # ZnCO3 + 2H+ = Zn2+ + CO2(g) + H2O
    assert k25(tables, "smithsonite") == pytest.approx(7.25 + co2_gas_to_carbonate(tables),
                                                       abs=0.01)


def test_hydrozincite_from_its_published_solubility_constant(tables):
    # Schindler, Reinert & Gamsjäger (1969), abstract: log [Zn2+] p(CO2)^0.4 [H+]^-2 =
    # 9.199 ± 0.050 at I = 0, per Zn
    expected = 5 * 9.199 + 2 * co2_gas_to_carbonate(tables)
    assert k25(tables, "hydrozincite") == pytest.approx(expected, abs=0.01)


def davies_log_gamma(z: int, ionic_strength: float, a: float = 0.509) -> float:
    s = math.sqrt(ionic_strength)
    return -a * z * z * (s / (1 + s) - 0.3 * ionic_strength)


def test_lead_carbonates_from_bilinski_and_schindler_at_i_0_3(tables):
    # Bilinski & Schindler (1982), abstract, 25 °C, I = 0.3 mol/dm3: per Pb,
    # cerussite log [Pb2+] p(CO2) [H+]^-2 = 5.20, hydrocerussite with p(CO2)^(2/3) = 6.80;
    # PbCO3(aq) 5.40, Pb(CO3)2 2- 8.86. Brought to I = 0 with Davies, as the table says.
    g1, g2 = davies_log_gamma(1, 0.3), davies_log_gamma(2, 0.3)
    to_zero = g2 - 2 * g1                        # M2+ and 2 H+ on the two sides
    co2 = co2_gas_to_carbonate(tables)
    assert k25(tables, "cerussite") == pytest.approx(5.20 + to_zero + co2, abs=0.01)
    assert k25(tables, "hydrocerussite") == pytest.approx(
        3 * (6.80 + to_zero) + 2 * co2, abs=0.02)
    # Pb2+ + CO3 2- = PbCO3(aq) and Pb2+ + 2 CO3 2- = Pb(CO3)2 2-: both gain -2 log γ2
    assert k25(tables, "PbCO3") == pytest.approx(5.40 - 2 * g2, abs=0.01)
    assert k25(tables, "Pb(CO3)2^2-") == pytest.approx(8.86 - 2 * g2, abs=0.01)


def test_cerussite_agrees_with_taylor_and_lopata_free_energy(tables):
    # Taylor & Lopata (1984), abstract: ΔfG°(cerussite) = -628.0 ± 3.9 kJ/mol. With
    # ΔfG°(Pb2+) = -24.4 and ΔfG°(CO3 2-) = -527.9 kJ/mol (CODATA, # from memory):
    dg = -24.4 - 527.9 + 628.0
    published = -dg * 1000 / (math.log(10) * R * T25)
    assert k25(tables, "cerussite") == pytest.approx(published, abs=0.7)  # their ±3.9 kJ/mol


def test_copper_carbonate_agrees_with_the_ultraviolet_determination(tables):
    # An ultraviolet spectroscopic determination of CuCO3(aq) and CuHCO3+ up to seawater
    # ionic strength (abstract re-read at discovery.researcher.life; authors not seen):
    # log beta0(CuCO3) = 6.89 extrapolated to I = 0; the recalled IUPAC 6.75 sits between
    # it and Byrne & Miller's 6.82, within the spread of the determinations.
    assert k25(tables, "CuCO3") == pytest.approx(6.89, abs=0.15)


@pytest.mark.xfail(strict=True, reason=(
    "barite's recalled analytic expression (Nordstrom et al. 1990) gives log Ksp -10.02 at "
    "22 °C, 0.10 above the measured -10.12 ± 0.05; left as recalled until a critical "
    "evaluation is re-read (issue 17 step 5)"))
def test_barite_solubility_product_at_22C_against_the_seawater_study(tables):
    # Thermodynamic solubility product of BaSO4 at 22 °C, (7.57 ± 0.87)e-11, from barite
    # solubility in dilute Na2SO4–NaNO3 solutions and seawater (abstract re-read at
    # discovery.researcher.life; authors and journal not seen)
    measured = math.log10(7.57e-11)
    uncertainty = math.log10(7.57 + 0.87) - math.log10(7.57)
    table = float(log10_k_at(tables.solids["barite"].logk, np.array([22.0]))[0])
    assert abs(table - measured) <= uncertainty
