"""The stock-density table reader: what it accepts, and every problem it reports."""

from __future__ import annotations

import textwrap

import pytest

from ionwright.chemistry._formula import parse_formula
from ionwright.data._stock_densities import bundled_stock_densities, parse_stock_densities
from ionwright.errors import TableError

GOOD = textwrap.dedent('''
    [about]
    format_version = 1
    [sources]
    T = "a test table"
    [[stock]]
    solute = "NaCl"
    label = "salt"
    temperature_C = 20.0
    mass_percent = [10.0, 20.0]
    density_g_per_mL = [1.07, 1.15]
    source = "T"
    read_in = ""
    recalled_rows = [20.0]
''')


def test_a_table_reads_with_pure_water_as_its_first_row():
    table = parse_stock_densities(GOOD, "good.toml")[parse_formula("NaCl")]
    assert table.fractions == (0.0, 0.1, 0.2)
    assert table.densities[0] == pytest.approx(0.998204, abs=1e-6)   # Kell (1975), 20 °C
    assert table.at(0.15).value == pytest.approx(1.11)
    assert table.at(0.15).recalled and not table.at(0.1).recalled and table.at(0.2).recalled
    assert not table.at(0.3).inside and table.at(0.3).value == pytest.approx(1.23)


@pytest.mark.parametrize("change, problem", [
    (("mass_percent = [10.0, 20.0]", "mass_percent = [20.0, 10.0]"), "must increase"),
    (("density_g_per_mL = [1.07, 1.15]", "density_g_per_mL = [1070, 1150]"), "unit slip"),
    (("source = \"T\"", "source = \"X\""), "not a key of [sources]"),
    (("recalled_rows = [20.0]", "recalled_rows = [25.0]"), "recalled row"),
    (("label = \"salt\"", "lable = \"salt\""), "unknown key"),
    (("density_g_per_mL = [1.07, 1.15]", "density_g_per_mL = [1.07]"), "same length"),
])
def test_every_problem_is_reported_with_its_entry(change, problem):
    old, new = change
    with pytest.raises(TableError, match="stock") as info:
        parse_stock_densities(GOOD.replace(old, new), "bad.toml")
    assert problem in str(info.value)


def test_the_bundled_table_covers_the_stocks_of_issue_13():
    tables = bundled_stock_densities()
    wanted = ["NaOH", "KOH", "HCl", "H2SO4", "HNO3", "H3PO4", "CH3COOH", "NH3", "NaCl", "KCl"]
    assert all(parse_formula(f) in tables for f in wanted)
    tops = {f: tables[parse_formula(f)].top for f in wanted}
    assert tops["NaOH"] == 0.5 and tops["HCl"] == 0.4 and tops["H3PO4"] == 0.85
    assert tops["CH3COOH"] == 1.0 and tops["NH3"] == 0.3
