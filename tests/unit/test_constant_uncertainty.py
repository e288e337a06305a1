"""Each constant's standard uncertainty: stated by its table, or the default of its
class; the enthalpy's share away from 25 °C; the table format keeps both."""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.chemistry._temperature import R
from ionwright.data._loader import parse_table
from ionwright.errors import TableError
from ionwright.outputs._constant_uncertainty import (ACID_BASE, CLASS_DEFAULTS, COMPLEX, GAS,
                                                     HYDROLYSIS, ION_PAIR, SOLID,
                                                     WATER_IONIZATION, constant_class,
                                                     enthalpy_share)
from test_uncertainty import LAB as IN_HOUSE

# the in-house table of test_uncertainty.py with an enthalpy and its uncertainty
LAB = IN_HOUSE.replace("uncertainty = 0.05\n", "uncertainty = 0.05\nenthalpy_kJ = -3.6\n"
                       "enthalpy_uncertainty_kJ = 2.0\n")


@pytest.fixture(scope="module")
def tables():
    return ionwright.load_tables(["core", "metals", "organics"])


def test_the_loader_keeps_both_uncertainties():
    logk = parse_table(LAB, "lab.toml").species["H2PO4-"].logk
    assert logk.uncertainty == 0.05
    assert logk.enthalpy_uncertainty_kJ == 2.0


@pytest.mark.parametrize("line, message", [
    ("enthalpy_uncertainty_kJ = 2.0", "must be ≥ 0"),
    ("uncertainty = 0.05", "must be ≥ 0")])
def test_negative_uncertainties_are_refused(line, message):
    bad = LAB.replace(line, line.replace("= ", "= -"))
    with pytest.raises(TableError, match=message):
        parse_table(bad, "lab.toml")


def test_an_enthalpy_uncertainty_needs_an_enthalpy():
    bad = LAB.replace("enthalpy_kJ = -3.6\n", "")
    with pytest.raises(TableError, match="needs a temperature description"):
        parse_table(bad, "lab.toml")


@pytest.mark.parametrize("section, name, expected", [
    ("species", "OH-", WATER_IONIZATION), ("species", "H2PO4-", ACID_BASE),
    ("species", "CO2", ACID_BASE), ("species", "CaSO4", ION_PAIR),
    ("species", "FeOH^2+", HYDROLYSIS), ("solids", "calcite", SOLID),
    ("gases", "CO2(g)", GAS)])
def test_classes(tables, section, name, expected):
    assert constant_class(section, getattr(tables, section)[name]) == expected


def test_strong_complexes_are_not_ion_pairs(tables):
    strong = [name for name, rec in tables.species.items()
              if constant_class("species", rec) == COMPLEX]
    assert strong and all(abs(tables.species[n].logk.log10_k) > 4.0
                          or len([p for p in tables.species[n].reaction
                                  if p not in ("H+", "H2O")]) != 2 for n in strong)


def test_defaults_are_not_below_what_the_bundled_tables_state(tables):
    """Every class default is at least the median of the uncertainties the bundled tables
    state for that class (a constant nobody evaluated is not better known than one that
    was), and within a factor of three of it."""
    stated: dict[str, list[float]] = {}
    for section in ("species", "solids", "gases"):
        for record in getattr(tables, section).values():
            if record.logk.uncertainty is not None:
                stated.setdefault(constant_class(section, record), []).append(
                    record.logk.uncertainty)
    checked = 0
    for cls, values in stated.items():
        if len(values) >= 3:
            median = float(np.median(values))
            assert median <= CLASS_DEFAULTS[cls][0] <= 3 * median, cls
            checked += 1
    assert checked >= 4


def test_enthalpy_share_is_van_t_hoff():
    """u(log10 K) at T from u(ΔH°): u·1000/(R ln 10)·|1/T − 1/298.15|; zero at 25 °C."""
    logk = parse_table(LAB, "lab.toml").species["H2PO4-"].logk
    share = enthalpy_share((logk,), np.array([25.0, 60.0]))
    assert share[0, 0] == 0.0
    expected = 2000.0 / (R * math.log(10.0)) * abs(1 / 333.15 - 1 / 298.15)
    assert share[1, 0] == pytest.approx(expected, rel=1e-12)
