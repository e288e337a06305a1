"""The Pitzer parameter sets against published mean activity coefficients of single salts.

Each salt of the shared fixture ``published_mean_activity.py`` (``SALTS`` of issue 12 and
``MORE_SALTS`` of issue 13; the source beside each record there: the CRC Handbook table
from Hamer & Wu 1972, re-read for CaCl2 and CaBr2 and otherwise recalled; Robinson &
Stokes 1959 App. 8.10, recalled) is checked at every tabulated molality within the fitted
range of its parameters (``max_molality`` in pitzer.toml), to the issue's ±2 %; a known
disagreement past a range narrowed because of it is kept as a strict xfail too. Where the two disagree by more, the point is a strict xfail with the
reason: the disagreement is known, and a fix of either side will show up as an XPASS.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from published_mean_activity import MORE_SALTS, SALTS, SaltData

from ionwright.activity import PitzerModel
import ionwright
from ionwright.activity._base import SpeciesProperties
from ionwright.data._pitzer_table import bundled_parameters

TOLERANCE = 0.02   # the issue's ±2 % on γ± in the fitted range

RECALLED_BOTH = ("both the parameters (Pitzer & Mayorga 1973) and the tabulated γ± "
                 "(Robinson & Stokes 1959) are recalled, not re-read; one of them is off")
KNOWN = {
    ("KOH", 2.0): f"γ± 2.9 % below the table at 2 mol/kg: {RECALLED_BOTH}",
    ("NaH2PO4", 2.0): f"γ± 2.9 % below the table at 2 mol/kg: {RECALLED_BOTH}",
    ("sodium acetate", 3.0): f"γ± 2.1 % above the table at 3 mol/kg: {RECALLED_BOTH}",
    ("potassium acetate", 3.0): f"γ± 3.6 % above the table at 3 mol/kg: {RECALLED_BOTH}",
    ("CaCl2", 2.0): ("γ± 2.0 % above the CRC table (re-read) at 2 mol/kg: Pitzer & Mayorga "
                     "fitted Robinson & Stokes' data, the CRC table follows a later "
                     "evaluation (Staples & Nuttall 1977)"),
    **{("CaBr2", m): ("γ± 2.0–2.5 % below the CRC table (re-read) at every molality: the "
                      "near-constant ratio points to the tables' different extrapolation "
                      "to infinite dilution (Goldberg & Nuttall 1978 for the CRC values), or "
                      "to a misremembered (4/3)β0 = 0.5088")
       for m in (0.1, 0.2, 0.5, 1.0)},
    **{("MgSO4", m): ("γ± 10–12 % above the table at every molality, by a near-constant "
                      "factor: the molality dependence agrees (see the ratio test below), so "
                      "the difference lies below 0.1 mol/kg, in how the tabulated γ± were "
                      "extrapolated to infinite dilution (Robinson & Stokes 1959) and how the "
                      "2:2 parameters with β2 (Pitzer & Mayorga 1974, adopted by Harvie, "
                      "Møller & Weare 1984) describe the ion pairing there")
       for m in (0.1, 0.2, 0.5, 1.0, 2.0)},
}


BY_NAME = {s.salt: s for s in (*SALTS, *MORE_SALTS)}


def mean_activity_coefficient(salt: SaltData, m: float) -> float:
    """γ± of *salt* at molality *m*, 25 °C, from the bound Pitzer model (bundled table)."""
    nan = np.full(2, np.nan)
    z_cation, z_anion = salt.charges
    props = SpeciesProperties((salt.cation, salt.anion),
                              np.array([z_cation, -z_anion], dtype=float),
                              nan, nan, nan, np.zeros(2))
    bound = PitzerModel().bind(props, np.array([25.0]))
    mol = np.array([[salt.nu_cation * m, salt.nu_anion * m]])
    ln_gamma = bound.ln_gamma(np.array([math.sqrt(salt.ionic_strength(m))]), mol)[0]
    nu = salt.nu_cation + salt.nu_anion
    return math.exp((salt.nu_cation * ln_gamma[0] + salt.nu_anion * ln_gamma[1]) / nu)


def _points():
    params = bundled_parameters()
    for salt in BY_NAME.values():
        fit = params.binary[(salt.cation, salt.anion)].max_molality
        for m, gamma in salt.gamma.items():
            if fit is not None and m > fit and (salt.salt, m) not in KNOWN:
                continue
            marks = ([pytest.mark.xfail(strict=True, reason=KNOWN[(salt.salt, m)])]
                     if (salt.salt, m) in KNOWN else [])
            yield pytest.param(salt, m, gamma, id=f"{salt.salt}-{m:g}", marks=marks)


@pytest.mark.parametrize("salt, m, published", list(_points()))
def test_mean_activity_coefficient_within_two_percent(salt, m, published):
    # source of `published`: salt.source in published_mean_activity.py (the CRC Handbook
    # table, re-read for CaCl2 and CaBr2, otherwise recalled; Robinson & Stokes 1959, recalled)
    assert mean_activity_coefficient(salt, m) == pytest.approx(published, rel=TOLERANCE)


def test_every_binary_salt_with_data_has_parameters():
    params = bundled_parameters()
    assert all((s.cation, s.anion) in params.binary for s in BY_NAME.values())


@pytest.mark.parametrize("m", [0.2, 0.5, 1.0, 2.0])
def test_magnesium_sulfate_molality_dependence_matches_the_table(m):
    """γ±(m)/γ±(0.1): the part of γ± the osmotic data above 0.1 mol/kg fix, free of the
    extrapolation to infinite dilution that separates the absolute values (see KNOWN)."""
    # Robinson & Stokes (1959) App. 8.10, MgSO4 at 25 °C   # from memory
    salt = BY_NAME["MgSO4"]
    ratio = mean_activity_coefficient(salt, m) / mean_activity_coefficient(salt, 0.1)
    assert ratio == pytest.approx(salt.gamma[m] / salt.gamma[0.1], rel=TOLERANCE)


def test_every_known_disagreement_names_a_tabulated_point():
    assert all(m in BY_NAME[name].gamma for name, m in KNOWN)


def test_the_known_mgso4_disagreement_is_said_on_the_result():
    """The MgSO4 strict xfails above must not be silent: the table marks the pair
    (``disagrees``) and a solve with Mg2+ and SO4^2- as main ions warns."""
    result = ionwright.solve({"activity_model": "pitzer", "dissolve": {"MgSO4": 0.5}})
    assert any("Mg2+–SO4^2- parameters disagree" in n.text for n in result.notices)
    minor = ionwright.solve({"activity_model": "pitzer",
                             "dissolve": {"NaCl": 0.5, "MgSO4": 0.001}})
    assert not any("disagree" in n.text for n in minor.notices)


#: How a careful user makes each salt of KNOWN (potassium acetate has no ingredient name)
_RECIPES = {"potassium acetate": lambda m: {"acetic acid": m, "KOH": m}}


@pytest.mark.parametrize("name, m", sorted(KNOWN))
def test_every_known_disagreement_is_said_on_the_result(name, m):
    """Each strict xfail above is a point where the result warns: the range of the pair
    was narrowed below it (``max_molality``, the line says why) or the table marks the pair
    as failing its published check (``disagrees``)."""
    dissolve = _RECIPES.get(name, lambda m: {name: m})(m)
    result = ionwright.solve({"activity_model": "pitzer", "dissolve": dissolve})
    said = [n.text for n in result.notices
            if "past the fitted range" in n.text or "disagree with a published" in n.text]
    assert said, result.warnings
