"""What a user reads about redox: the aeration demo, why ferrihydrite cannot form in an
anoxic sample, how much of each component is left in solution, and the uncertainty class
of the constants made with electrons."""

from __future__ import annotations

import json

import pytest

import ionwright
from ionwright.chemistry._redox import electron_tables
from ionwright.cli import main
from ionwright.outputs._constant_uncertainty import CLASS_DEFAULTS, REDOX, constant_class

WELL = {"title": "fictional well, as pumped", "temperature_C": 12.0,
        "dissolve": {"FeCl2": "0.10 mmol/kg", "NaHCO3": "3.0 mmol/kg"},
        "solids": {"ferrihydrite": "may-form"}}


def test_the_aeration_demo_tells_its_story_and_answers_it(capsys):
    assert main(["demo", "aeration"]) == 0
    out = capsys.readouterr().out
    assert "Birch Hollow waterworks" in out and "local codes" in out
    assert "pe " in out and "Eh +0.797 V" in out
    assert "ferrihydrite" in out and "-1.0000e-04 mol/kg" in out and "saturated" in out
    assert main(["demo", "aeration", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["phases"]["ferrihydrite"]["into_solution_mol_per_kg"] == pytest.approx(
        -1e-4, rel=1e-6)


def test_an_anoxic_sample_says_why_ferrihydrite_cannot_form():
    report = ionwright.solve(WELL).report()
    line = next(x for x in report.splitlines() if x.lstrip().startswith("ferrihydrite "))
    assert "cannot form (needs Fe3+: Fe2+ turns into it only under a stated redox level" \
        in line and "[gases] O2" in line


def test_with_a_redox_level_the_hint_is_gone():
    aerated = ionwright.solve({**WELL, "gases": {"O2": "0.21 atm"}}).report()
    assert "turns into it" not in aerated


def test_the_report_gives_each_component_in_solution():
    """The aerated well keeps 3.9e-11 mol/kg of its 1e-4 mol/kg of iron in solution: the
    report says how much, not only the species' shares of it."""
    result = ionwright.solve({**WELL, "gases": {"O2": "0.21 atm", "CO2": "10^-2.5 atm"}})
    line = next(x for x in result.report().splitlines() if x.startswith("  Fe³⁺"))
    dissolved = float(line.split()[1])
    iron = [row["molality"] for row in result.species_rows() if "Fe" in row["name"]]
    assert dissolved == pytest.approx(sum(iron), rel=1e-3)
    assert dissolved < 1e-9


@pytest.mark.parametrize("section, name", [("species", "O2"), ("species", "H2"),
                                           ("species", "Fe2+"), ("species", "HS-")])
def test_constants_made_with_electrons_are_redox_half_reactions(section, name):
    tables = electron_tables(ionwright.load_tables(["core", "metals", "redox"]))
    assert constant_class(section, getattr(tables, section)[name]) == REDOX


def test_the_report_names_the_redox_class_default():
    report = ionwright.solve({**WELL, "gases": {"O2": "0.21 atm"}}).report()
    line = next(x for x in report.splitlines() if "(redox half-reaction)" in x)
    assert f"± {CLASS_DEFAULTS[REDOX][0]:g}" in line and "O2" in line and "Fe2+" in line
