"""Langelier index against its working formula with published constants.

Langelier, W.F. (1936) J. Am. Water Works Assoc. 28, 1500–1521: LSI = pH − pHs with
pHs = (pK2 − pKs) + p[Ca2+] + p[Alk] (+ activity terms)  # from memory
With the Plummer & Busenberg (1982) constants at 25 °C, log Ks − log K2 =
−8.480 + 10.329, so pHs = 1.849 + p[Ca] + p[Alk] [derived] (reference-inputs §11),
with ideal activities. The engine takes its constants from the core table (the same
Plummer & Busenberg expressions), so the two agree to the rounding of 1.849.
"""

from __future__ import annotations

import math

import pytest

import ionwright
from ionwright.outputs._derived import alkalinity


@pytest.mark.parametrize("ph", [7.2, 7.8, 8.4])
def test_langelier_index_with_ideal_activities(ph):
    result = ionwright.solve({"activity_model": "ideal",
                              "dissolve": {"CaCl2": 0.001, "NaHCO3": 0.002},
                              "fix": {"pH": ph}})
    alk = alkalinity(result)
    phs = 1.849 - math.log10(0.001) - math.log10(alk)
    assert result.to_dict()["derived"]["langelier_index"] == pytest.approx(ph - phs, abs=0.002)


def test_sign_says_scale_forming_or_dissolving():
    hard = {"analysis": {"pH": 8.3, "Ca": "120 mg/L", "alkalinity": "250 mg/L as CaCO3",
                         "balance_on": "Cl"}}
    soft = {"analysis": {"pH": 6.8, "Ca": "6 mg/L", "alkalinity": "20 mg/L as CaCO3",
                         "balance_on": "Na"}}
    assert ionwright.solve(hard).to_dict()["derived"]["langelier_index"] > 0.5
    assert ionwright.solve(soft).to_dict()["derived"]["langelier_index"] < -1.5
