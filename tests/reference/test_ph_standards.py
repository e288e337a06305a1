"""pH of published standard buffers and of pure water, against their sources.

Primary pH standards: Buck, R.P. et al. (2002) "Measurement of pH. Definition, standards,
and procedures", Pure Appl. Chem. 74, 2169–2200, Table 3 (values of pH(PS) of primary
standards). The values are conventional (Bates–Guggenheim convention), hence the ±0.03
tolerance the project set for an ion-association model.
"""

from __future__ import annotations

import pytest

import ionwright
from ionwright.chemistry._water import log10_kw

MODELS = ["davies", "extended-debye-huckel"]
KHP = {"potassium hydrogen phthalate": 0.05}
PHOSPHATE = {"KH2PO4": 0.025, "Na2HPO4": 0.025}


def ph(dissolve, model, t=25.0):
    return ionwright.solve({"dissolve": dissolve, "activity_model": model,
                            "temperature_C": t}).pH


@pytest.mark.parametrize("model", MODELS)
def test_potassium_hydrogen_phthalate_standard(model):
    assert ph(KHP, model) == pytest.approx(4.005, abs=0.03)  # Buck et al. 2002, Table 3


@pytest.mark.parametrize("model", MODELS)
def test_equimolal_phosphate_standard(model):
    assert ph(PHOSPHATE, model) == pytest.approx(6.865, abs=0.03)  # Buck et al. 2002, Table 3


@pytest.mark.parametrize("model", MODELS)
def test_equimolal_phosphate_standard_at_37_C(model):
    assert ph(PHOSPHATE, model, 37.0) == pytest.approx(6.840, abs=0.03)  # Buck 2002 Table 3, from memory


@pytest.mark.parametrize("model", MODELS)
def test_borax_standard(model):
    assert ph({"borax": 0.01}, model) == pytest.approx(9.180, abs=0.03)  # Buck 2002 Table 3, from memory


@pytest.mark.parametrize("model", MODELS)
def test_carbonate_standard(model):
    # the ion-association models leave the weak Na–carbonate pairs out (activity/ion_association.py)
    assert ph({"NaHCO3": 0.025, "Na2CO3": 0.025}, model) == pytest.approx(10.012, abs=0.02)  # Buck 2002


@pytest.mark.parametrize("t, pkw", [(25.0, 13.995), (0.0, 14.95)])
def test_pure_water_is_neutral_at_half_pkw(t, pkw):
    # Bandura, A.V. & Lvov, S.N. (2006) J. Phys. Chem. Ref. Data 35, 15: pKw 13.995 at
    # 25 °C and about 14.95 at 0 °C; the core table uses Harned & Robinson (1940).
    for model in MODELS:
        assert ph({}, model, t) == pytest.approx(pkw / 2, abs=0.02)
        assert ph({}, model, t) == pytest.approx(-float(log10_kw(t)) / 2, abs=0.01)


def test_acetic_acid_constant_and_the_square_root_rule():
    # Ka of acetic acid ≈ 1.8e-5 (common practice); for a weak acid at C with ideal
    # activities, [H+] ≈ √(Ka·C) when that is under 5 % of C (common practice).
    tables = ionwright.load_tables(["core"])
    ka = 10 ** -tables.species["CH3COOH"].logk.log10_k
    assert ka == pytest.approx(1.8e-5, rel=0.05)
    for c in (0.01, 0.1, 0.5):
        result = ionwright.solve({"dissolve": {"acetic acid": c}, "activity_model": "ideal"})
        h = result.species_molality("H+")
        approx = (ka * c) ** 0.5
        assert approx / c < 0.05
        assert h == pytest.approx(approx, rel=0.05)
    # and where the rule's condition fails, the exact solve departs from it by more
    dilute = ionwright.solve({"dissolve": {"acetic acid": 1e-4}, "activity_model": "ideal"})
    assert (ka * 1e-4) ** 0.5 / 1e-4 > 0.05
    assert dilute.species_molality("H+") < 0.9 * (ka * 1e-4) ** 0.5  # 3.40e-5 vs 4.19e-5
