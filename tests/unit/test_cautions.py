"""Safety cautions and data-quality warnings: when they appear and when they do not."""

from __future__ import annotations

import textwrap

import numpy as np
import pytest

import ionwright
from ionwright.outputs._cautions import corrosive_limits

# Hypochlorite and cyanide are not in the core table; this small table adds them.
# HOCl pKa 7.53 (Morris, J.C. (1966) J. Phys. Chem. 70, 3798)  # from memory
# HCN pKa 9.21 (Smith & Martell, Critical Stability Constants)  # from memory
EXTRA = textwrap.dedent('''
    [about]
    name = "oxidants"
    format_version = 1
    title = "hypochlorite and cyanide for the caution tests"

    [sources]
    Morris1966 = "Morris, J.C. (1966) J. Phys. Chem. 70, 3798"
    SmithMartell = "Smith & Martell, Critical Stability Constants"
    stoichiometry = "composition from the formula"

    [components."OCl-"]
    source = "Morris1966"
    [components."CN-"]
    source = "SmithMartell"

    [species.HOCl]
    from = { "OCl-" = 1, "H+" = 1 }
    log10_k = 7.53
    source = "Morris1966"
    [species.HCN]
    from = { "CN-" = 1, "H+" = 1 }
    log10_k = 9.21
    source = "SmithMartell"

    [reagents."sodium hypochlorite"]
    formula = "NaOCl"
    makes = { "Na+" = 1, "OCl-" = 1 }
    source = "stoichiometry"
    [reagents."sodium cyanide"]
    formula = "NaCN"
    makes = { "Na+" = 1, "CN-" = 1 }
    source = "stoichiometry"
''')


@pytest.fixture
def extra(tmp_path):
    path = tmp_path / "oxidants.toml"
    path.write_text(EXTRA, encoding="utf-8")
    return str(path)


def cautions_of(recipe):
    return [w for w in ionwright.solve(recipe).warnings
            if w.startswith(("CAUTION", "DATA QUALITY"))]


def mentions(warnings, word):
    return [w for w in warnings if word in w]


def test_acidified_sulfide_warns_of_hydrogen_sulfide():
    found = cautions_of({"dissolve": {"NaHS": 0.001, "HCl": 0.0008}})
    assert mentions(found, "H2S") and mentions(found, "local codes")
    assert mentions(found, "atm over it")  # the core table has H2S(g)


def test_alkaline_sulfide_does_not_warn():
    assert not mentions(cautions_of({"dissolve": {"NaHS": 0.001, "NaOH": 0.01}}), "H2S")


def test_ammonia_above_ph_9_5_warns_of_free_ammonia():
    assert mentions(cautions_of({"dissolve": {"NH4Cl": 0.001, "NaOH": 0.003}}), "free NH3")
    assert not mentions(cautions_of({"dissolve": {"NH4Cl": 0.001}}), "NH3")


def test_hypochlorite_with_acid_warns_of_chlorine(extra):
    acid = {"tables": ["core", extra],
            "dissolve": {"sodium hypochlorite": 0.001, "HCl": 0.01}}
    found = cautions_of(acid)
    assert mentions(found, "chlorine") and mentions(found, "never mix")
    plain = {"tables": ["core", extra], "dissolve": {"sodium hypochlorite": 0.001}}
    assert not mentions(cautions_of(plain), "chlorine")


def test_chlorine_check_is_skipped_only_because_hypochlorite_is_absent():
    assert not mentions(cautions_of({"dissolve": {"NaCl": 0.01, "HCl": 0.01}}), "chlorine")


def test_cyanide_below_ph_11_warns_of_hydrogen_cyanide(extra):
    found = cautions_of({"tables": ["core", extra], "dissolve": {"sodium cyanide": 0.001},
                         "fix": {"pH": 8.0}})
    assert mentions(found, "HCN")
    high = {"tables": ["core", extra], "dissolve": {"sodium cyanide": 0.001, "NaOH": 0.05}}
    assert not mentions(cautions_of(high), "HCN")


def test_corrosive_ph_is_flagged():
    assert mentions(cautions_of({"dissolve": {"HCl": 0.05}}), "corrosive")
    assert mentions(cautions_of({"dissolve": {"NaOH": 0.1}}), "corrosive")
    assert not mentions(cautions_of({"dissolve": {"NaCl": 0.1}}), "corrosive")


@pytest.mark.parametrize("t_C", [0.0, 25.0, 60.0, 95.0])
def test_the_corrosive_caution_holds_at_any_temperature(t_C):
    """40 CFR 261.22(a)(1) (re-read, 2019 revision): pH ≤ 2 or ≥ 12.5, read at 25 °C (the
    method's temperature, from memory). 0.1 mol/kg NaOH is at pH 11.9 at 60 °C and 11.2 at
    95 °C, yet as corrosive as at 25 °C: the caution follows the hydroxide activity (the
    activity of pH 12.5 at 25 °C), which warming hardly moves, and says so."""
    base = ionwright.solve({"temperature_C": t_C, "dissolve": {"NaOH": 0.1}})
    (caution,) = [w for w in base.warnings if "corrosive" in w]
    assert "hydroxide activity" in caution and "25 °C" in caution
    assert "40 CFR 261.22" in caution and "local codes" in caution
    acid = ionwright.solve({"temperature_C": t_C, "dissolve": {"HCl": 0.02}})
    assert any("corrosive" in w and "hydrogen-ion activity" in w for w in acid.warnings)
    mild = ionwright.solve({"temperature_C": t_C, "dissolve": {"NaOH": 0.01, "HCl": 0.001}})
    assert not mentions(mild.warnings, "corrosive")


def test_the_corrosive_limit_is_the_hydroxide_activity_of_ph_12_5_at_25_c():
    _, oh_limit = corrosive_limits()
    at_limit = ionwright.solve({"temperature_C": 25.0, "dissolve": {"NaCl": 0.01},
                                "fix": {"pH": 12.5}})
    hydroxide = at_limit.species_activity("OH-")
    assert np.log10(hydroxide) == pytest.approx(oh_limit, abs=1e-9)


def test_charge_balance_beyond_five_percent_is_a_data_quality_warning():
    unbalanced = {"analysis": {"pH": 7.5, "Ca": "40 mg/L", "Cl": "30 mg/L",
                               "alkalinity": "80 mg/L as CaCO3"}}
    assert mentions(cautions_of(unbalanced), "DATA QUALITY")
    balanced = {"analysis": {**unbalanced["analysis"], "balance_on": "Cl"}}
    assert not mentions(cautions_of(balanced), "DATA QUALITY")
