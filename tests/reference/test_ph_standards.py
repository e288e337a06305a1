"""pH standards as a test family: every model, every standard, every tabulated temperature.

Like is compared with like: pH(S) of a standard is a conventional value (the Harned
cell's p(a_H γ_Cl) plus the Bates–Guggenheim log10 γ_Cl), so the check compares it with
the model's pH on the same scale, :func:`ionwright.outputs._conventional_ph.conventional_pH`
(the model's own log10 γ_Cl swapped for the convention's). The engine's own pH,
−log10 a(H+) with the model's single-ion γ(H+), differs from it by
log10 γ_Cl(model) − log10 γ_Cl(convention): at I = 0.1 mol/kg and 25 °C about +0.002
(Davies), −0.013 (extended Debye–Hückel, Kielland å = 3 Å for Cl-), −0.007
(Truesdell–Jones); :func:`test_the_engine_ph_and_the_standards_scale_differ_by_chloride`
pins those numbers. The values and their sources are in ``published_ph_standards.py``;
values not re-read there are recalled (``# from memory`` in the sense of the project
rules) and say so in each test id's source.

Tolerance ±0.02 pH (issue 12). Known disagreements are strict xfails with the reason.
The ideal model (valid to I = 0.001 mol/kg) is outside its range for every standard.
"""

from __future__ import annotations

import pytest
from published_ph_standards import (JIS_Z_8802, ROY_2012_PHOSPHATE, STANDARDS,
                                    Standard)

import ionwright
from ionwright.outputs._conventional_ph import (bates_guggenheim_log10_gamma_chloride,
                                       conventional_pH, model_log10_gamma_chloride)
from ionwright.plugins import default_registry

TOLERANCE = 0.02
MODELS = ("davies", "extended-debye-huckel", "truesdell-jones", "pitzer")

_PHTHALATE_SIZES = ("HPhthalate- has no published ion size known to the table (the model "
                    "uses its 4 Å default) and the phthalic-acid pK2(T) is recalled: the "
                    "size-based models read 0.022–0.032 high, Davies (no sizes) is within "
                    "0.009")
_PITZER = ("the bundled Pitzer parameters lack the K+ interactions with hydrogen tartrate "
           "and dihydrogen citrate, and the phosphate and borate ones carry no temperature "
           "derivatives (the result says both); update these marks when the model changes")
_PHOSPHATE_50 = ("at 50 °C Davies leaves the 1:3.5 standard (most Na+ and HPO4^2-) 0.023 high "
                 "while the 1:1 standard stays within 0.013; the model's range for Na+ with "
                 "HPO4^2- above 45 °C says so")
_BORAX_0 = ("at 0 °C the boric-acid pK of Manov et al. (1944) (re-read) is 9.500, which "
            "leaves the borax standard 0.021–0.022 low; the constant's range starts at "
            "5 °C and says why")
KNOWN_GAPS: dict[tuple[str, str], tuple[frozenset | None, str]] = {
    # (model, standard) -> (temperatures, None for all; reason)
    ("davies", "phosphate 1:3.5 (0.008695 + 0.03043 m)"): (frozenset({50.0}), _PHOSPHATE_50),
    ("davies", "borax 0.01 m"): (frozenset({0.0}), _BORAX_0),
    ("extended-debye-huckel", "hydrogen phthalate 0.05 m"): (None, _PHTHALATE_SIZES),
    ("truesdell-jones", "hydrogen phthalate 0.05 m"): (None, _PHTHALATE_SIZES),
    ("truesdell-jones", "borax 0.01 m"): (frozenset({0.0}), _BORAX_0),
    ("pitzer", "tartrate (saturated at 25 °C)"): (frozenset({25.0, 30.0, 35.0, 37.0}), _PITZER),
    ("pitzer", "dihydrogen citrate 0.05 m"): (None, _PITZER),
    ("pitzer", "phosphate 1:3.5 (0.008695 + 0.03043 m)"): (frozenset({50.0}), _PITZER),
    ("pitzer", "borax 0.01 m"): (frozenset({0.0}), _PITZER),
}


def _cases():
    for model in MODELS:
        for std in STANDARDS:
            for t_C, value in std.pH_S.items():
                temps, reason = KNOWN_GAPS.get((model, std.name), (frozenset(), ""))
                gap = temps is None or t_C in temps
                marks = [pytest.mark.xfail(strict=True, reason=reason)] if gap else []
                recalled = " [from memory]" if std.recalled(t_C) else ""
                yield pytest.param(model, std, t_C, value, marks=marks,
                                   id=f"{model}-{std.name}-{t_C:g}C{recalled}")


@pytest.mark.parametrize("model, std, t_C, pH_S", list(_cases()))
def test_standard_buffer_on_the_standards_scale(model: str, std: Standard, t_C: float,
                                                pH_S: float):
    """Source: std.source (see published_ph_standards.py); ±0.02 pH on the same scale."""
    result = ionwright.solve({"dissolve": std.dissolve, "activity_model": model,
                              "temperature_C": t_C})
    # in range: the standards are at I ≤ 0.1 mol/kg (1:1 phosphate 0.100001 as solved)
    assert result.ionic_strength <= 1.0001 * default_registry().model(model).max_ionic_strength
    assert conventional_pH(result) == pytest.approx(pH_S, abs=TOLERANCE), std.source


@pytest.mark.parametrize("model", MODELS[:3])
def test_the_carbonate_standard_holds_without_conversion_too(model):
    """Acceptance of issue 12: the carbonate standard at 25 °C within ±0.02 with the
    default model (Davies), here for every ion-association model on the engine's own pH.
    Staples & Bates (1969) J. Res. NBS 73A, 37: pH(S) 10.012 (re-read)."""
    result = ionwright.solve({"dissolve": {"NaHCO3": 0.025, "Na2CO3": 0.025},
                              "activity_model": model})
    assert result.pH == pytest.approx(10.012, abs=TOLERANCE)


def _known_gaps():
    for (model, name), (temps, _) in KNOWN_GAPS.items():
        std = next(s for s in STANDARDS if s.name == name)
        for t_C in sorted(std.pH_S if temps is None else temps):
            yield pytest.param(model, std, t_C, id=f"{model}-{name}-{t_C:g}C")


@pytest.mark.parametrize("model, std, t_C", list(_known_gaps()))
def test_every_known_disagreement_comes_with_a_warning(model: str, std: Standard, t_C: float):
    """Issue 12: no model states a range in which it fails these references without a
    warning. Each strict xfail above must come with a validity notice on the result."""
    result = ionwright.solve({"dissolve": std.dissolve, "activity_model": model,
                              "temperature_C": t_C})
    assert abs(conventional_pH(result) - std.pH_S[t_C]) > TOLERANCE  # still a gap
    assert [n for n in result.notices if n.category == "validity"], result.notices


def test_the_default_model_is_the_one_checked_for_the_carbonate_standard():
    result = ionwright.solve({"dissolve": {"NaHCO3": 0.025, "Na2CO3": 0.025}})
    assert result.model.name == "davies"
    assert result.pH == pytest.approx(10.012, abs=TOLERANCE)  # Staples & Bates (1969)


@pytest.mark.parametrize("model, expected", [("davies", 0.002),
                                             ("extended-debye-huckel", -0.013),
                                             ("truesdell-jones", -0.007)])
def test_the_engine_ph_and_the_standards_scale_differ_by_chloride(model, expected):
    """pH(engine) − pH(standards' scale) = log10 γ_Cl(model) − log10 γ_Cl(convention),
    in 0.1 mol/kg NaCl at 25 °C (the values the module docstring states)."""
    result = ionwright.solve({"dissolve": {"NaCl": 0.1}, "activity_model": model})
    difference = result.pH - conventional_pH(result)
    assert difference == pytest.approx(expected, abs=0.0015)
    assert difference == pytest.approx(
        model_log10_gamma_chloride(result)
        - bates_guggenheim_log10_gamma_chloride(result.ionic_strength, 25.0), abs=1e-12)


def test_recalled_rows_agree_with_the_japanese_standard():
    """The recalled IUPAC rows against JIS Z 8802 (re-read, two decimals, amount-
    concentration recipes): agreement within 0.01 at every temperature JIS lists."""
    by_name = {s.name: s for s in STANDARDS}
    for name, row in JIS_Z_8802.items():
        for t_C, value in row.items():
            assert by_name[name].pH_S[t_C] == pytest.approx(value, abs=0.01), (name, t_C)


def test_recalled_physiological_phosphate_agrees_with_the_nbs_values_quoted_by_roy():
    """Roy et al. (2012) Open Electrochem. J. 4, 20 (re-read): 7.415 (25 °C), 7.395 (37 °C)."""
    phosphate = next(s for s in STANDARDS if s.name.startswith("phosphate 1:3.5"))
    for t_C, value in ROY_2012_PHOSPHATE.items():
        assert phosphate.pH_S[t_C] == pytest.approx(value, abs=0.01)


@pytest.mark.parametrize("t, pkw", [(25.0, 13.995), (0.0, 14.946), (50.0, 13.264)])
def test_pure_water_is_neutral_at_half_pkw(t, pkw):
    # Bandura, A.V. & Lvov, S.N. (2006) J. Phys. Chem. Ref. Data 35, 15: pKw at 0.1 MPa
    # 14.946 (0 °C), 13.995 (25 °C), 13.264 (50 °C), re-read in the CRC Handbook table
    # "Ionization constant of water as a function of temperature and pressure" (05_20)
    from ionwright.chemistry._water import log10_kw

    for model in ("davies", "extended-debye-huckel"):
        assert ionwright.solve({"activity_model": model, "temperature_C": t}).pH == \
            pytest.approx(pkw / 2, abs=0.01)
        assert -float(log10_kw(t)) == pytest.approx(pkw, abs=0.002)


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
