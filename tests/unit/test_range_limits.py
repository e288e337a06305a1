"""The two kinds of narrowed range: for a salt's two ions, and for ions lacking a model's
per-ion parameters (activity/_validity.py), judged row by row over a batch."""

from __future__ import annotations

import numpy as np

from ionwright.activity import SpeciesProperties, UnparameterisedIonLimit, ValidityLimit
from ionwright.activity._validity import exceeded_rows

NAN = np.nan
# Na+ and Cl- have a and b; Br- has neither
PROPS = SpeciesProperties(("Na+", "Cl-", "Br-"), np.array([1.0, -1.0, -1.0]),
                          np.full(3, 4.0), np.array([4.0, 3.5, NAN]),
                          np.array([0.075, 0.015, NAN]), np.zeros(3))
LACKING = UnparameterisedIonLimit(0.1, "test evidence", parameters=("tj_a", "tj_b"),
                                  kind="ions without a and b")
SALT = ValidityLimit("Na+", "Cl-", 1.0, "test evidence")


def test_rows_are_judged_by_main_ions_and_strength():
    molality = np.array([[0.5, 0.0, 0.5],      # NaBr at I = 0.5: past 0.1
                         [0.05, 0.0, 0.05],    # NaBr at I = 0.05: within
                         [1.02, 1.0, 0.02],    # Br- under 10 % of I: not a main ion
                         [2.0, 2.0, 0.0]])     # NaCl at I = 2: past the salt's 1.0
    hits = exceeded_rows((LACKING, SALT), PROPS, molality)
    assert hits.tolist() == [[True, False], [False, False], [False, True], [False, True]]


def test_the_ions_lacking_parameters_are_named():
    assert LACKING.ions(PROPS, np.array([0.5, 0.0, 0.5])) == ["Br-"]
    assert LACKING.label == "ions without a and b"
    assert SALT.label == "Na+ with Cl-"


def test_a_limit_for_some_temperatures_only_applies_there():
    warm = UnparameterisedIonLimit(0.1, "e", applies_C=(45.0, 100.0),
                                   parameters=("tj_b",), kind="k")
    hits = exceeded_rows((warm,), PROPS, np.array([[0.5, 0.0, 0.5]] * 2),
                         np.array([25.0, 50.0]))
    assert hits[:, 0].tolist() == [False, True]
