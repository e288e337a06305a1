"""Pitzer model: thermodynamic consistency, symmetry and batching, over random inputs."""

from __future__ import annotations

import math
from types import MappingProxyType

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ionwright.activity import PitzerModel
from ionwright.activity._base import SpeciesProperties
from ionwright.data._pitzer_table import ALPHA_2_2, CationAnion, PitzerParameters
from ionwright.chemistry._formula import parse_formula
from ionwright.chemistry._water import osmotic_A_phi

SALTS = [("Na+", "Cl-"), ("Ca2+", "Cl-"), ("Na+", "SO4^2-"), ("Mg2+", "SO4^2-")]
MIXTURE = ["Na+", "K+", "H+", "Ca2+", "Mg2+", "MgOH+", "Cl-", "SO4^2-", "OH-", "HCO3-",
           "CO3^2-", "HSO4-", "CO2", "CaCO3"]


def species(names):
    z = np.array([parse_formula(n).charge for n in names], dtype=float)
    nan = np.full(len(names), np.nan)
    return SpeciesProperties(tuple(names), z, nan, nan, nan, np.zeros(len(names)))


def single_salt_model(cation, anion, beta0, beta1, beta2, c_phi):
    zc, za = parse_formula(cation).charge, -parse_formula(anion).charge
    alpha1, alpha2 = ALPHA_2_2 if (zc, za) == (2, 2) else (2.0, 12.0)
    entry = CationAnion(cation, anion, zc, za, beta0, beta1, beta2 if zc == za == 2 else 0.0,
                        c_phi, alpha1, alpha2, None, MappingProxyType({}), "test")
    empty = MappingProxyType({})
    params = PitzerParameters("test", 25.0, (0.0, 50.0), MappingProxyType({"test": "t"}),
                              MappingProxyType({(cation, anion): entry}), empty, empty, empty,
                              empty, empty)
    return PitzerModel(params), entry


def mean_ln_gamma_and_phi(model, cation, anion, m, t_C):
    """ln γ± and φ of the single salt at molalities *m* (array) from the mixture code."""
    zc, za = parse_formula(cation).charge, -parse_formula(anion).charge
    g = math.gcd(zc, za)
    nu_c, nu_a = za // g, zc // g
    bound = model.bind(species([cation, anion]), np.full(m.size, t_C))
    mol = np.stack([nu_c * m, nu_a * m], axis=1)
    lng = bound.ln_gamma(np.zeros(m.size), mol)
    return (nu_c * lng[:, 0] + nu_a * lng[:, 1]) / (nu_c + nu_a), bound.osmotic_coefficient(mol)


parameters = st.tuples(st.sampled_from(SALTS), st.floats(-0.2, 0.5), st.floats(-1.0, 4.0),
                       st.floats(-60.0, 0.0), st.floats(-0.05, 0.05))


@given(parameters, st.floats(0.01, 6.0), st.floats(0.0, 60.0))
def test_mixture_equations_reduce_to_the_single_salt_form(salt_params, m, t_C):
    """For one salt the HMW84 single-ion sums give Pitzer & Mayorga's γ± and φ exactly."""
    (cation, anion), b0, b1, b2, cphi = salt_params
    model, e = single_salt_model(cation, anion, b0, b1, b2, cphi)
    zc, za = e.z_cation, e.z_anion
    g = math.gcd(zc, za)
    nu_c, nu_a = za // g, zc // g
    nu = nu_c + nu_a
    strength = 0.5 * m * (nu_c * zc ** 2 + nu_a * za ** 2)
    s = math.sqrt(strength)
    a_phi = float(osmotic_A_phi(t_C))
    f_gamma = -a_phi * (s / (1 + 1.2 * s) + 2 / 1.2 * math.log(1 + 1.2 * s))
    f_phi = -a_phi * s / (1 + 1.2 * s)

    def b_gamma_term(beta, alpha):
        x = alpha * s
        return 2 * beta / (alpha ** 2 * strength) * (1 - (1 + x - x * x / 2) * math.exp(-x))

    b_gamma = 2 * e.beta0 + b_gamma_term(e.beta1, e.alpha1) + b_gamma_term(e.beta2, e.alpha2)
    b_phi = e.beta0 + e.beta1 * math.exp(-e.alpha1 * s) + e.beta2 * math.exp(-e.alpha2 * s)
    pair = 2 * nu_c * nu_a / nu
    triple = 2 * (nu_c * nu_a) ** 1.5 / nu
    ln_gamma = zc * za * f_gamma + m * pair * b_gamma + m * m * triple * 1.5 * e.c_phi
    phi = 1 + zc * za * f_phi + m * pair * b_phi + m * m * triple * e.c_phi
    got_gamma, got_phi = mean_ln_gamma_and_phi(model, cation, anion, np.array([m]), t_C)
    assert got_gamma[0] == pytest.approx(ln_gamma, rel=1e-10, abs=1e-12)
    assert got_phi[0] == pytest.approx(phi, rel=1e-10)


@given(parameters, st.floats(0.02, 6.0), st.floats(0.0, 60.0))
def test_gibbs_duhem_links_phi_and_mean_gamma_of_random_single_salts(salt_params, m, t_C):
    """d ln γ±/dm = [d(φ m)/dm − 1]/m (Gibbs–Duhem at constant T, P), by central differences."""
    (cation, anion), b0, b1, b2, cphi = salt_params
    model, _ = single_salt_model(cation, anion, b0, b1, b2, cphi)
    h = 1e-5 * m
    ms = np.array([m - h, m + h])
    lng, phi = mean_ln_gamma_and_phi(model, cation, anion, ms, t_C)
    d_ln_gamma = (lng[1] - lng[0]) / (2 * h)
    d_phi_m = (phi[1] * ms[1] - phi[0] * ms[0]) / (2 * h)
    assert d_ln_gamma == pytest.approx((d_phi_m - 1) / m, rel=1e-5, abs=1e-7)


compositions = st.lists(st.floats(1e-3, 2.0), min_size=len(MIXTURE), max_size=len(MIXTURE))


@settings(max_examples=25)
@given(compositions, st.floats(0.0, 60.0))
def test_gibbs_duhem_and_cross_symmetry_hold_in_a_full_mixture(m, t_C):
    """Σ_i m_i ∂ln γ_i/∂m_j = ∂[Σm(φ−1)]/∂m_j and ∂ln γ_i/∂m_j = ∂ln γ_j/∂m_i.

    Both follow from ln γ_i = ∂(G^ex/w RT)/∂m_i; the mixture uses every θ, ψ, λ and the
    E-θ terms of the bundled table.
    """
    m = np.array(m)
    bound = PitzerModel().bind(species(MIXTURE), np.array([t_C]))
    k = len(MIXTURE)
    steps = np.full(k, 1e-5)  # absolute: tiny relative steps drown in round-off
    plus = m + np.diag(steps)
    minus = m - np.diag(steps)
    both = np.vstack([plus, minus])
    bound2 = PitzerModel().bind(species(MIXTURE), np.full(2 * k, t_C))
    lng = bound2.ln_gamma(np.zeros(2 * k), both)
    total = both.sum(axis=1)
    excess = total * (bound2.osmotic_coefficient(both) - 1)
    d_lng = (lng[:k] - lng[k:]) / (2 * steps[:, None])          # [j, i] = ∂ln γ_i/∂m_j
    d_excess = (excess[:k] - excess[k:]) / (2 * steps)
    assert d_lng @ m == pytest.approx(d_excess, rel=1e-5, abs=1e-6)
    assert d_lng == pytest.approx(d_lng.T, rel=1e-4, abs=1e-5)
    assert bound.ln_gamma(np.zeros(1), m[None, :]).shape == (1, k)


@given(compositions, st.randoms(use_true_random=False))
def test_activity_coefficients_do_not_depend_on_the_order_of_species(m, rnd):
    """Permuting the species list permutes ln γ and leaves a(H2O) unchanged."""
    m = np.array(m)
    order = list(range(len(MIXTURE)))
    rnd.shuffle(order)
    names = [MIXTURE[i] for i in order]
    first = PitzerModel().bind(species(MIXTURE), np.array([25.0]))
    second = PitzerModel().bind(species(names), np.array([25.0]))
    lng1 = first.ln_gamma(np.zeros(1), m[None, :])[0]
    lng2 = second.ln_gamma(np.zeros(1), m[order][None, :])[0]
    assert lng2 == pytest.approx(lng1[order], rel=1e-12, abs=1e-14)
    assert second.ln_water_activity(m[order][None, :]) == pytest.approx(
        first.ln_water_activity(m[None, :]), rel=1e-12)


@given(st.lists(st.tuples(compositions, st.floats(0.0, 60.0)), min_size=2, max_size=6))
def test_a_batch_equals_its_samples_bound_one_by_one(samples):
    """The vectorised model gives every sample the same γ and a(H2O) as a batch of one."""
    m = np.array([s[0] for s in samples])
    t = np.array([s[1] for s in samples])
    batch = PitzerModel().bind(species(MIXTURE), t)
    lng = batch.ln_gamma(np.zeros(len(t)), m)
    aw = batch.ln_water_activity(m)
    for k in range(len(t)):
        one = PitzerModel().bind(species(MIXTURE), t[k:k + 1])
        assert one.ln_gamma(np.zeros(1), m[k:k + 1])[0] == pytest.approx(lng[k], rel=1e-12,
                                                                          abs=1e-14)
        assert one.ln_water_activity(m[k:k + 1])[0] == pytest.approx(aw[k], rel=1e-12)
