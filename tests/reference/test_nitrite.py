"""Nitrite, the NO2 analyte of water analyses: its acid constant against the published one."""

from __future__ import annotations

import pytest

import ionwright

# Perrin (1982), as tabulated in the CRC Handbook of Chemistry and Physics (86th ed., 2005),
# "Dissociation constants of inorganic acids and bases", p. 8-40: nitrous acid pKa 3.25 at
# 25 °C, zero ionic strength (re-read).
PKA_NITROUS_ACID = 3.25


def test_nitrous_acid_is_half_dissociated_at_its_published_pka():
    result = ionwright.solve({"activity_model": "ideal", "dissolve": {"NaNO2": 1e-3},
                              "fix": {"pH": PKA_NITROUS_ACID}})
    ratio = result.species_molality("HNO2") / result.species_molality("NO2-")
    assert ratio == pytest.approx(1.0, rel=1e-9)


def test_nitrite_given_as_n_is_counted_as_nitrite():
    result = ionwright.solve({"analysis": {"pH": 7.0, "Na": "5 mg/L", "Cl": "7 mg/L",
                                           "NO2": "0.3 mg/L as N"}})
    assert result.to_dict()["totals"]["NO2-"] > 0
    assert "NO3-" not in result.to_dict()["totals"]
