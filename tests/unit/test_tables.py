"""The table loader and merged table sets: every problem reported, with table and entry."""

from __future__ import annotations

import textwrap

import pytest

from ionwright.errors import TableError
from ionwright.data import TableSet, parse_table



@pytest.fixture
def make_table(mini_text):
    """Build the mini table with extra TOML appended."""
    def build(extra: str = ""):
        return parse_table(mini_text + textwrap.dedent(extra), origin="mini.toml")
    return build


def test_mini_table_loads_and_counts_entries(make_table):
    table = make_table()
    assert table.name == "mini"
    assert table.counts["components"] == 5
    assert set(table.species) == {"OH-", "CH3COOH"}
    assert table.components["CH3COO-"].charge == -1
    assert table.species["CH3COOH"].logk.method == "none (25 °C value)"


def test_syntax_error_names_file_and_line():
    with pytest.raises(TableError) as err:
        parse_table("[about]\nname = \"x\"\nformat_version = \n", origin="broken.toml")
    assert "broken.toml" in str(err.value)
    assert "line 3" in str(err.value)


def test_duplicate_key_is_a_syntax_error_with_its_line(mini_text):
    text = mini_text + '\n[species."OH-"]\nfrom = { H2O = 1 }\nlog_k = 1\nsource = "test"\n'
    with pytest.raises(TableError) as err:
        parse_table(text, origin="dup.toml")
    assert "line" in str(err.value)


def test_every_problem_is_listed_not_only_the_first(make_table):
    extra = '''
        [species.X1]
        formula = "NaCl"
        from = { "Na+" = 1, "Cl-" = 1 }
        log10_k = 0.5
        enthalpy_kJ = 5000
        source = "test"
        [species.X2]
        formula = "NaOH"
        from = { "Na+" = 1, "OH-" = 1 }
        log10_k = 0.1
        colour = "blue"
        source = "test"
        [species.X3]
        formula = "KCl"
        from = { "K+" = 1, "Cl-" = 1 }
        log10_k = 0.1
    '''
    with pytest.raises(TableError) as err:
        make_table(extra)
    problems = err.value.problems
    assert any("enthalpy_kJ = 5000" in p and "kJ/mol" in p for p in problems)
    assert any("unknown key(s) colour" in p for p in problems)
    assert any("X3" in p and "missing source" in p for p in problems)


def test_unbalanced_reaction_shows_both_sides(make_table):
    extra = '''
        [species.NaOH]
        from = { "Na+" = 1, "H2O" = 1 }
        log10_k = -14.2
        source = "test"
    '''
    with pytest.raises(TableError) as err:
        TableSet([make_table(extra)])
    message = str(err.value)
    assert "species 'NaOH'" in message
    assert "does not balance in elements" in message
    assert "H1 Na1 O1" in message and "H2 Na1 O1" in message
    assert "does not balance in charge" in message


def test_unknown_component_is_named(make_table):
    extra = '''
        [species.NaSO4]
        formula = "NaSO4-"
        from = { "Na+" = 1, "SO4^2-" = 1 }
        log10_k = 0.7
        source = "test"
    '''
    with pytest.raises(TableError) as err:
        TableSet([make_table(extra)])
    assert "'SO4^2-'" in str(err.value) and "no table defines" in str(err.value)


def test_later_table_overrides_and_the_override_is_recorded(make_table):
    override = textwrap.dedent('''
        [about]
        name = "house"
        format_version = 1
        [sources]
        lab = "in-house titration, 2026"
        [species.CH3COOH]
        from = { "CH3COO-" = 1, "H+" = 1 }
        log10_k = 4.80
        source = "lab"
    ''')
    house = parse_table(override, origin="house.toml")
    tables = TableSet([make_table(), house])
    assert tables.species["CH3COOH"].logk.log10_k == 4.80
    (record,) = tables.overrides
    assert record.name == "CH3COOH" and record.old.logk.log10_k == 4.756
    assert tables.citation(tables.species["CH3COOH"]) == "in-house titration, 2026"


def test_species_built_on_species_resolve_to_components_and_add_log_k(make_table):
    extra = '''
        [components."CO3^2-"]
        source = "test"
        [species."HCO3-"]
        from = { "CO3^2-" = 1, "H+" = 1 }
        log10_k = 10.3
        source = "test"
        [species.CO2]
        from = { "HCO3-" = 1, "H+" = 1, H2O = -1 }
        log10_k = 6.35
        source = "test"
    '''
    tables = TableSet([make_table(extra)])
    res = tables.resolve("CO2")
    assert res.stoichiometry == {"CO3^2-": 1.0, "H+": 2.0, "H2O": -1.0}
    assert sum(m * lk.log10_k for _, m, lk in res.terms) == pytest.approx(16.65)


def test_missing_basis_is_reported(mini_text):
    text = mini_text.replace('[components.H2O]\n    source = "test"\n', "")
    text = textwrap.dedent(text).replace('[components.H2O]\nsource = "test"\n', "")
    with pytest.raises(TableError) as err:
        TableSet([parse_table(text, origin="nowater.toml")])
    assert "needs component 'H2O'" in str(err.value)


def test_wrong_format_version_and_unknown_section(mini_text):
    text = mini_text.replace("format_version = 1", "format_version = 7") + "\n[minerals]\n"
    with pytest.raises(TableError) as err:
        parse_table(text, origin="v7.toml")
    problems = " ".join(err.value.problems)
    assert "format_version = 7" in problems and "unknown section [minerals]" in problems


def test_bundled_core_table_loads_and_balances():
    from ionwright import load_tables

    tables = load_tables(["core"])
    assert {"H+", "H2O", "CO3^2-", "PO4^3-", "Ca2+"} <= set(tables.components)
    assert {"calcite", "gypsum", "dolomite"} <= set(tables.solids)
    assert tables.problems() == []


def test_a_solid_dissolving_into_a_formed_species_divides_by_its_formation_constant(make_table):
    # NaOH(s) = Na+ + OH-; in components Na+ + H2O − H+, so log K(components) =
    # log Ksp − log K_f(OH-) = 1.5 − (−14.0) (mini table: log K_f(OH-) = −14.0).
    extra = '''
        [solids.sodium_hydroxide]
        formula = "NaOH"
        dissolves_to = { "Na+" = 1, "OH-" = 1 }
        log10_k = 1.5
        source = "test"
    '''
    tables = TableSet([make_table(extra)])
    res = tables.resolve("sodium_hydroxide", "solids")
    assert res.stoichiometry == {"Na+": 1.0, "H2O": 1.0, "H+": -1.0}
    assert sum(m * lk.log10_k for _, m, lk in res.terms) == pytest.approx(15.5)


def test_range_reason_needs_text_and_a_range(make_table):
    extra = '''
        [species.X1]
        formula = "NaCl"
        from = { "Na+" = 1, "Cl-" = 1 }
        log10_k = 0.5
        range_reason = "checked only here"
        source = "test"
    '''
    with pytest.raises(TableError) as err:
        make_table(extra)
    assert any("range_reason must be text, beside a range_C" in p for p in err.value.problems)
