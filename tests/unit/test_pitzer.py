"""Pitzer model: parameter table, equations, notes and validity checks."""

from __future__ import annotations

import math
import textwrap

import numpy as np
import pytest
from scipy.integrate import quad

from ionwright.activity import DaviesModel, ExtendedDebyeHuckelModel, PitzerModel
from ionwright.activity._base import SpeciesProperties
from ionwright.activity._pitzer import NOT_FORMED_LN_GAMMA, SERIES_BELOW, _g, j_function
from ionwright.data._pitzer_table import ALPHA_2_2, bundled_parameters, parse_parameters
from ionwright.errors import TableError
from ionwright.chemistry._water import debye_huckel_A, osmotic_A_phi

CATIONS = ("Na+", "K+", "H+", "Ca2+", "Mg2+")
ANIONS = ("Cl-", "SO4^2-", "OH-", "HCO3-", "CO3^2-")


def species(names, setschenow=None):
    """SpeciesProperties for *names* with charges read from the names."""
    from ionwright.chemistry._formula import parse_formula

    z = np.array([parse_formula(n).charge for n in names], dtype=float)
    nan = np.full(len(names), np.nan)
    b = np.zeros(len(names)) if setschenow is None else np.asarray(setschenow, float)
    return SpeciesProperties(tuple(names), z, nan, nan, nan, b)


def table(body: str) -> str:
    return textwrap.dedent('''
        [about]
        name = "t"
        format_version = 1
        [sources]
        x = "test values"
    ''') + textwrap.dedent(body)


# -- the bundled table --------------------------------------------------------------------

def test_bundled_table_covers_every_pair_the_issue_names():
    params = bundled_parameters()
    for c in CATIONS:
        for a in ANIONS:
            assert (c, a) in params.binary or (c, a) in params.zero_by_design, (c, a)


def test_every_bundled_value_names_a_source_and_is_marked_from_memory():
    params = bundled_parameters()
    for entry in params.binary.values():
        assert entry.source in params.sources
    # re-read: K+–NO3- (in a secondary table; see its note and the table header) and the
    # K+ phthalates (Fluid Phase Equilibria 2005, abstract)
    assert sorted(e.label for e in params.binary.values() if not e.from_memory) == [
        "K+–HPhthalate-", "K+–NO3-", "K+–Phthalate^2-"]


def test_bundled_single_salt_values_match_reference_inputs_section_3():
    # /work/shared/reference-inputs.md §3 (Pitzer & Mayorga 1973; HMW84), all from memory
    p = bundled_parameters().binary
    assert (p["Na+", "Cl-"].beta0, p["Na+", "Cl-"].beta1, p["Na+", "Cl-"].c_phi) == (
        0.0765, 0.2664, 0.00127)
    assert p["Mg2+", "SO4^2-"].beta2 == -37.23
    assert (p["Mg2+", "SO4^2-"].alpha1, p["Mg2+", "SO4^2-"].alpha2) == ALPHA_2_2
    assert p["Ca2+", "Cl-"].alpha1 == 2.0
    # P&M print (4/3)β0 = 0.4212 for CaCl2: the table holds β0 = 0.3159
    assert 4 / 3 * p["Ca2+", "Cl-"].beta0 == pytest.approx(0.4212, abs=1e-4)
    assert 2 ** 2.5 / 3 * p["Mg2+", "Cl-"].c_phi == pytest.approx(0.00979, abs=1e-5)


def test_fitted_ionic_strength_follows_the_salt_stoichiometry():
    p = bundled_parameters().binary
    assert p["Na+", "Cl-"].max_ionic_strength == 6.0
    assert p["Ca2+", "Cl-"].max_ionic_strength == pytest.approx(3.0)    # 1 m × 3 (narrowed)
    assert p["Mg2+", "SO4^2-"].max_ionic_strength == pytest.approx(12.0)  # 3 m × 4
    assert p["Na+", "HCO3-"].max_ionic_strength is None


# -- table validation ----------------------------------------------------------------------

@pytest.mark.parametrize("body, expected", [
    ('[[cation_anion]]\ncation = "Cl-"\nanion = "Na+"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'c_phi = 0.0\nsource = "x"', "must be positive"),
    ('[[cation_anion]]\ncation = "Ca2+"\nanion = "Cl-"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'beta2 = -3.0\nc_phi = 0.0\nsource = "x"', "needs alpha2"),
    ('[[cation_anion]]\ncation = "Na+"\nanion = "Cl-"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'c_phi = 0.0\nsource = "nowhere"', "not a key of [sources]"),
    ('[[cation_anion]]\ncation = "Na+"\nanion = "Cl-"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'cphi = 0.0\nsource = "x"', "unknown key"),
    ('[[cation_anion]]\ncation = "Na+"\nanion = "Cl-"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'source = "x"', "c_phi is required"),
    ('[[like_charge]]\nions = ["Na+", "Cl-"]\ntheta = 0.1\nsource = "x"', "same sign"),
    ('[[triplet]]\nions = ["Na+", "K+", "Ca2+"]\npsi = 0.1\nsource = "x"', "of the other"),
    ('[[neutral_ion]]\nneutral = "Na+"\nion = "Cl-"\nlambda = 0.1\nsource = "x"',
     "neutral species"),
    ('[[like_charge]]\nions = ["Na+", "K+"]\ntheta = 0.1\nsource = "x"\n'
     '[[like_charge]]\nions = ["K+", "Na+"]\ntheta = 0.2\nsource = "x"', "given twice"),
    ('[[cation_anion]]\ncation = "Al3+"\nanion = "SO4^2-"\nbeta0 = 0.1\nbeta1 = 0.2\n'
     'c_phi = 0.0\nsource = "x"', "needs alpha1"),
    ('[mystery]\nx = 1', "unknown section"),
])
def test_malformed_parameter_tables_are_refused_with_the_problem_named(body, expected):
    with pytest.raises(TableError) as info:
        parse_parameters(table(body), "test.toml")
    assert expected in str(info.value)


def test_alpha_defaults_by_charge_type():
    params = parse_parameters(table('''
        [[cation_anion]]
        cation = "Mg2+"
        anion = "SO4^2-"
        beta0 = 0.2
        beta1 = 3.0
        beta2 = -30.0
        c_phi = 0.0
        source = "x"
        [[cation_anion]]
        cation = "Na+"
        anion = "SO4^2-"
        beta0 = 0.02
        beta1 = 1.1
        c_phi = 0.005
        source = "x"
    '''), "t")
    assert (params.binary["Mg2+", "SO4^2-"].alpha1, params.binary["Mg2+", "SO4^2-"].alpha2) == (
        1.4, 12.0)
    assert params.binary["Na+", "SO4^2-"].alpha1 == 2.0


# -- the functions of the equations ---------------------------------------------------------

def _j_by_quadrature(x: float) -> float:
    """J(x) = (1/x) ∫0^∞ (1 + q + q²/2 − e^q) y² dy, q = −(x/y) e^−y (Pitzer 1975, eq. 41)."""
    def integrand(y):
        q = -(x / y) * math.exp(-y)
        rest = -math.expm1(q) + q + 0.5 * q * q if abs(q) > 1e-3 else -(
            q ** 3 / 6 + q ** 4 / 24 + q ** 5 / 120)
        return rest * y * y
    value, _ = quad(integrand, 0.0, np.inf, limit=500)
    return value / x


@pytest.mark.parametrize("x", [0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0])
def test_j_approximation_agrees_with_its_defining_integral(x):
    # Pitzer (1975) states about 1 % for his approximation; 1.5 % leaves room for quad
    j, _ = j_function(np.array([x]))
    assert j[0] == pytest.approx(_j_by_quadrature(x), rel=0.015)


def test_j_prime_is_the_derivative_of_j():
    x = np.geomspace(1e-3, 300, 40)
    h = 1e-6 * x
    numeric = (j_function(x + h)[0] - j_function(x - h)[0]) / (2 * h)
    assert j_function(x)[1] == pytest.approx(numeric, rel=1e-6)


def test_g_series_and_closed_form_meet():
    edge = np.array([SERIES_BELOW * (1 - 1e-12), SERIES_BELOW * (1 + 1e-12)])
    g, gp, _ = _g(edge)
    assert g[0] == pytest.approx(g[1], rel=1e-12) and gp[0] == pytest.approx(gp[1], rel=1e-11)
    x = np.array([0.5, 2.0])
    closed = 2 * (1 - (1 + x) * np.exp(-x)) / x ** 2
    assert _g(x)[0] == pytest.approx(closed, rel=1e-14)


# -- ln γ and water activity ---------------------------------------------------------------

def test_the_limiting_law_holds_as_ionic_strength_vanishes():
    # Debye–Hückel limiting law: ln γ = −ln10 · A z² √I as I → 0 (Robinson & Stokes 1959, ch. 9)
    names = ["Na+", "Ca2+", "Cl-", "SO4^2-"]
    bound = PitzerModel().bind(species(names), np.array([25.0]))
    m = np.array([[1e-8, 1e-8, 1e-8, 1e-8]])
    strength = 0.5 * np.sum(m * np.array([1, 4, 1, 4]))
    lng = bound.ln_gamma(np.sqrt([strength]), m)[0]
    limiting = -np.log(10) * float(debye_huckel_A(25.0)) * np.array([1, 4, 1, 4]) * math.sqrt(
        strength)
    assert lng == pytest.approx(limiting, rel=1e-3)


@pytest.mark.parametrize("other", [DaviesModel(), ExtendedDebyeHuckelModel()],
                         ids=lambda m: m.name)
def test_pitzer_agrees_with_the_other_models_in_dilute_solution(other):
    names = ["Na+", "Cl-"]
    props = species(names)
    props = SpeciesProperties(props.names, props.charge, np.array([4.0, 3.0]),
                              props.tj_a, props.tj_b, props.setschenow)
    t = np.array([25.0])
    for m in (1e-6, 1e-5, 1e-4):
        mol = np.array([[m, m]])
        pitzer = PitzerModel().bind(props, t).ln_gamma(np.sqrt([m]), mol)[0]
        theirs = other.bind(props, t).ln_gamma(np.sqrt([m]))[0]
        assert pitzer == pytest.approx(theirs, rel=5 * math.sqrt(m) + 1e-3)


def test_without_a_composition_only_the_debye_huckel_term_is_returned():
    bound = PitzerModel().bind(species(["Na+", "SO4^2-", "CO2"]), np.array([25.0]))
    u = np.array([0.3])
    s = u[0]
    f = -float(osmotic_A_phi(25.0)) * (s / (1 + 1.2 * s) + 2 / 1.2 * math.log(1 + 1.2 * s))
    assert bound.ln_gamma(u)[0] == pytest.approx([f, 4 * f, 0.0], rel=1e-12)


def test_water_activity_of_pure_water_is_one_and_tracks_the_osmotic_coefficient():
    bound = PitzerModel().bind(species(["Na+", "Cl-"]), np.array([25.0, 25.0]))
    m = np.array([[0.0, 0.0], [2.0, 2.0]])
    ln_aw = bound.ln_water_activity(m)
    phi = bound.osmotic_coefficient(m)
    assert ln_aw[0] == 0.0 and phi[0] == 1.0
    assert ln_aw[1] == pytest.approx(-0.018015268 * 4.0 * phi[1], rel=1e-12)


def test_temperature_derivatives_move_the_binary_parameters():
    # β(T) = β(25) + dβ/dT (T − 25): compare NaCl at 35 °C against the single-salt form
    # with the shifted parameters (Pitzer & Mayorga 1973 eqs. for γ±).
    m, t = 1.0, 35.0
    p = bundled_parameters().binary["Na+", "Cl-"]
    b0 = p.beta0 + 10 * p.d_dT["beta0"]
    b1 = p.beta1 + 10 * p.d_dT["beta1"]
    cphi = p.c_phi + 10 * p.d_dT["c_phi"]
    a_phi = float(osmotic_A_phi(t))
    s = math.sqrt(m)
    f = -a_phi * (s / (1 + 1.2 * s) + 2 / 1.2 * math.log(1 + 1.2 * s))
    b_gamma = 2 * b0 + 2 * b1 / (4 * m) * (1 - (1 + 2 * s - 2 * m) * math.exp(-2 * s))
    expected = f + m * b_gamma + m * m * 1.5 * cphi
    bound = PitzerModel().bind(species(["Na+", "Cl-"]), np.array([t]))
    assert bound.ln_gamma(np.array([s]), np.array([[m, m]]))[0].mean() == pytest.approx(
        expected, rel=1e-12)


def test_take_slices_the_per_sample_arrays():
    bound = PitzerModel().bind(species(["Na+", "Cl-"]), np.array([10.0, 25.0, 40.0]))
    m = np.full((3, 2), 1.5)
    part = bound.take(np.array([0, 2]))
    assert part.ln_gamma(np.ones(2), m[[0, 2]]) == pytest.approx(
        bound.ln_gamma(np.ones(3), m)[[0, 2]], rel=1e-14)


def test_setschenow_coefficient_becomes_an_equivalent_lambda():
    # λ_ni = ln10·b·z²/4 reproduces the Setschenow form ln γ = ln10·b·I
    bound = PitzerModel().bind(species(["Na+", "Cl-", "NH3"], [0, 0, 0.08]), np.array([25.0]))
    m = np.array([[0.7, 0.7, 0.01]])
    assert bound.ln_gamma(np.ones(1), m)[0, 2] == pytest.approx(np.log(10) * 0.08 * 0.7)
    assert any("NH3" in n and "Setschenow" in n for n in bound.notes)


# -- species not formed and notes ------------------------------------------------------------

def test_ion_pairs_described_by_the_parameters_are_not_formed_and_are_named():
    names = ["Na+", "SO4^2-", "NaSO4-", "H+", "HSO4-"]
    bound = PitzerModel().bind(species(names), np.array([25.0]))
    lng = bound.ln_gamma(np.ones(1), np.array([[1.0, 0.5, 0.0, 1e-7, 1e-8]]))[0]
    assert lng[2] == NOT_FORMED_LN_GAMMA
    assert lng[4] < 1.0  # HSO4- is an explicit complex (HMW84) and stays
    assert any("NaSO4-" in n and "not formed" in n for n in bound.notes)


def test_missing_pairs_are_listed_never_silently_zero():
    names = ["Na+", "MgOH+", "Cl-", "SO4^2-", "I-", "CaCO3"]
    notes = PitzerModel().bind(species(names), np.array([25.0])).notes
    text = " ".join(notes)
    assert "MgOH+–SO4^2-" in text            # MgOH+ has Cl- parameters only
    assert "no interaction parameters at all for I-" in text
    assert "no λ for the neutral species CaCO3" in text
    assert "Na+–Cl-" not in text


def test_pairs_zero_by_design_are_not_reported_missing():
    notes = PitzerModel().bind(species(["H+", "Ca2+", "OH-", "CO3^2-", "Cl-"]),
                               np.array([25.0])).notes
    assert not any("H+–OH-" in n or "Ca2+–CO3^2-" in n for n in notes)


def test_temperature_notes_name_what_has_no_derivative():
    names = ["Na+", "Cl-", "SO4^2-"]
    assert PitzerModel().bind(species(names), np.array([25.0])).notes == []
    warm = " ".join(PitzerModel().bind(species(names), np.array([37.0])).notes)
    assert "no temperature derivatives for Na+–SO4^2-" in warm
    assert "Na+–Cl-;" not in warm and "θ, ψ and λ are 25 °C values" in warm
    hot = " ".join(PitzerModel().bind(species(names), np.array([80.0])).notes)
    assert "trusted for 0–50 °C" in hot


# -- validity on a solved composition ---------------------------------------------------------

def test_validity_notes_flag_fits_exceeded_and_significant_missing_pairs():
    model = PitzerModel()
    props = species(["Na+", "Cl-", "I-"])
    assert model.validity_notes(props, np.array([5.0, 5.0, 0.0])) == []
    beyond = model.validity_notes(props, np.array([7.0, 7.0, 0.0]))
    assert len(beyond) == 1 and "Na+–Cl- (fitted to 6 mol/kg, here 7 mol/kg)" in beyond[0]
    missing = model.missing_parameters(props, np.array([1.0, 0.5, 0.5]))
    assert missing == ["Na+–I-"]
    assert model.missing_parameters(props, np.array([1.0, 0.999, 0.001])) == []  # trace I-


def test_a_minor_salt_in_a_strong_medium_is_stretched_not_beyond_its_fit():
    """KH2PO4 (fitted to 1.8 mol/kg) at 0.05 mol/kg in 2 mol/kg KCl: its B(I) is used past
    the ionic strength of its fit, which is warned about but leaves the model valid."""
    model = PitzerModel()
    props = species(["K+", "Cl-", "H2PO4-"])
    molality = np.array([2.05, 2.0, 0.05])
    assert model.beyond_fitted_range(props, molality) == []
    assert model.stretched_in_ionic_strength(props, molality) == [
        "K+–H2PO4- (fitted to I ≤ 1.8)"]
    assert any("B(I) is extrapolated" in n for n in model.validity_notes(props, molality))
    # the salt itself past its fit: beyond, not merely stretched
    alone = np.array([2.0, 0.0, 2.0])
    assert model.beyond_fitted_range(props, alone) == [
        "K+–H2PO4- (fitted to 1.8 mol/kg, here 2 mol/kg)"]
    assert model.stretched_in_ionic_strength(props, alone) == []
