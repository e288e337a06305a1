"""``ionwright tables list|show|check`` and ``ionwright solve --explain`` from the command line."""

from __future__ import annotations

import json
import textwrap

import pytest

from ionwright.cli._main import main
from ionwright.plugins._registry import default_registry

PLUGIN_VARIABLES = ("IONWRIGHT_NO_PLUGINS", "IONWRIGHT_TRACE_PLUGINS",
                    "IONWRIGHT_EXCLUDE_PLUGINS", "IONWRIGHT_PLUGIN_CONFLICTS", "IONWRIGHT_TABLES")

# An in-house table on top of core (invented demo values, not data).
CLEAN = textwrap.dedent('''
    [about]
    name = "bench"
    format_version = 1
    title = "bench constants (demo)"
    [sources]
    nb7 = "bench notebook 7 (demo values for the tests)"
    [components."Lac-"]
    formula = "C3H5O3-"
    source = "nb7"
    [species.HLac]
    formula = "C3H6O3"
    from = { "Lac-" = 1, "H+" = 1 }
    log10_k = 3.86
    enthalpy_kJ = 0.3
    source = "nb7"
    [species.CH3COOH]
    from = { "CH3COO-" = 1, "H+" = 1 }
    log10_k = 4.80
    source = "nb7"
    [solids."calcium lactate"]
    formula = "CaC6H10O6"
    dissolves_to = { "Ca2+" = 1, "Lac-" = 2 }
    log10_k = -3.0
    source = "nb7"
''')


@pytest.fixture(autouse=True)
def clean_environment(monkeypatch, tmp_path):
    for name in PLUGIN_VARIABLES:
        monkeypatch.delenv(name, raising=False)
    monkeypatch.setattr("ionwright.plugins._registry.user_tables_dir",
                        lambda: tmp_path / "no-user-tables")
    default_registry.cache_clear()
    yield
    default_registry.cache_clear()


def run(capsys, *argv: str) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def write(tmp_path, name: str, text: str) -> str:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return str(path)


# -- check -------------------------------------------------------------------------------
def test_check_passes_a_clean_in_house_table_that_uses_core_components(tmp_path, capsys):
    code, out, _ = run(capsys, "tables", "check", write(tmp_path, "bench.toml", CLEAN))
    assert code == 0
    assert "bench.toml: ok; table 'bench': 1 component, 2 species, 1 solid" in out
    assert "uses from core: CH3COO-, Ca2+, H+" in out
    assert ("overrides: species 'CH3COOH' from table 'bench' overrides table 'core': "
            "log K 4.756 -> 4.8") in out


def test_check_reports_a_toml_syntax_error_with_file_and_line(tmp_path, capsys):
    path = write(tmp_path, "typo.toml", CLEAN.replace("log10_k = 3.86", "log10_k = 3.86.1"))
    code, out, _ = run(capsys, "tables", "check", path)
    assert code == 1
    assert "typo.toml: 1 problem(s)" in out
    assert "TOML syntax error at line 14, column 15" in out


def test_check_names_a_duplicate_entry_and_both_lines(tmp_path, capsys):
    twice = CLEAN + textwrap.dedent('''
        [species.HLac]
        from = { "Lac-" = 1, "H+" = 1 }
        log10_k = 3.9
        source = "nb7"
    ''')
    code, out, _ = run(capsys, "tables", "check", write(tmp_path, "twice.toml", twice))
    assert code == 1
    assert "duplicate: species 'HLac' is defined twice (line 11 and line 27)" in out
    repeated_key = CLEAN.replace("log10_k = 3.86\n", "log10_k = 3.86\nlog10_k = 3.87\n")
    code, out, _ = run(capsys, "tables", "check", write(tmp_path, "key.toml", repeated_key))
    assert "duplicate: species 'HLac': log10_k is given twice (line 14 and line 15)" in out


def test_check_lists_every_problem_of_a_file_not_only_the_first(tmp_path, capsys):
    bad = (CLEAN
           .replace('from = { "Lac-" = 1, "H+" = 1 }', 'from = { "Lac-" = 1, "H+" = 2 }')
           .replace("enthalpy_kJ = 0.3", "enthalpy_kJ = 300000")                  # J/mol, not kJ/mol
           .replace('dissolves_to = { "Ca2+" = 1, "Lac-" = 2 }',
                    'dissolves_to = { "Ca2+" = 1, "Lactato-" = 2 }')       # unknown name
           .replace('[species.CH3COOH]\nfrom = { "CH3COO-" = 1, "H+" = 1 }\nlog10_k = 4.80\n'
                    'source = "nb7"',
                    '[species.CH3COOH]\nfrom = { "CH3COO-" = 1, "H+" = 1 }\nlog10_k = 4.80\n'
                    'range_C = [60.0, 5.0]')                               # no source, range
           + '[components."Zn2+"]\nion_size = 60\nsource = "nb7"\n')       # Å out of range
    code, out, _ = run(capsys, "tables", "check", write(tmp_path, "bad.toml", bad))
    assert code == 1
    assert "bad.toml: 7 problem(s)" in out
    for expected in (
            "species 'HLac': enthalpy_kJ = 300000.0 kJ/mol is outside ±500; is it in J/mol?",
            "species 'CH3COOH': missing source",
            "species 'CH3COOH': range_C = [60.0, 5.0] must be two ordered temperatures in °C",
            "component 'Zn2+': ion size 60.0 Å must be in (0, 15] Å",
            "species 'HLac' (table 'bench'): from does not balance in charge",
            "solid 'calcium lactate' (table 'bench'): dissolves_to names 'Lactato-', which no "
            "table defines as a component or species"):
        assert expected in out


def test_check_shows_both_sides_of_an_unbalanced_reaction(tmp_path, capsys):
    bad = CLEAN.replace('from = { "Lac-" = 1, "H+" = 1 }', 'from = { "Lac-" = 1, "H+" = 2 }')
    code, out, _ = run(capsys, "tables", "check", write(tmp_path, "unbalanced.toml", bad))
    assert code == 1
    assert ("species 'HLac' (table 'bench'): from does not balance in elements: C3H6O3 "
            "has C3 H6 O3, 1 Lac- + 2 H+ has C3 H7 O3") in out
    assert "from does not balance in charge: C3H6O3 has +0, 1 Lac- + 2 H+ has +1" in out


def test_check_exits_zero_only_when_every_file_is_clean(tmp_path, capsys):
    good = write(tmp_path, "good.toml", CLEAN)
    bad = write(tmp_path, "bad.toml", CLEAN.replace('source = "nb7"\n', "", 1))
    code, out, _ = run(capsys, "tables", "check", good, bad)
    assert code == 1 and "good.toml: ok" in out and "bad.toml: 1 problem(s)" in out
    assert run(capsys, "tables", "check", good, good)[0] == 0


def test_check_alone_with_an_explicit_context(tmp_path, capsys):
    """A table checked against a context that lacks core's components fails on them."""
    base = write(tmp_path, "base.toml", textwrap.dedent('''
        [about]
        name = "base"
        format_version = 1
        [components."H+"]
        source = "basis of the test"
        [components.H2O]
        source = "basis of the test"
    '''))
    code, out, _ = run(capsys, "tables", "check", "--with", base,
                       write(tmp_path, "bench.toml", CLEAN))
    assert code == 1
    assert "names 'CH3COO-', which no table defines" in out


# -- list and show -----------------------------------------------------------------------
def test_list_shows_every_table_with_origin_counts_and_models(tmp_path, capsys, monkeypatch):
    monkeypatch.setenv("IONWRIGHT_TABLES", write(tmp_path, "bench.toml", CLEAN))
    code, out, _ = run(capsys, "tables", "list")
    assert code == 0
    core_line = next(line for line in out.splitlines() if line.startswith("core "))
    assert "ionwright (bundled)" in core_line and "core.toml" in core_line
    bench_line = next(line for line in out.splitlines() if line.startswith("bench "))
    assert "1/2/1/0/0" in bench_line and "table file" in bench_line
    assert "activity models: ideal (ionwright (bundled)), davies" in out


def test_list_reports_a_broken_table_file_and_exits_nonzero(tmp_path, capsys, monkeypatch):
    monkeypatch.setenv("IONWRIGHT_TABLES", write(tmp_path, "broken.toml", "[about\n"))
    code, _, err = run(capsys, "tables", "list")
    assert code == 1
    assert "broken.toml: TOML syntax error at line 1" in err
    assert "IONWRIGHT_EXCLUDE_PLUGINS" in err


def test_show_a_table_lists_entries_with_sources(capsys):
    code, out, _ = run(capsys, "tables", "show", "core")
    assert code == 0
    line = next(x for x in out.splitlines() if x.strip().startswith("CH3COOH "))
    assert "CH3COO- + H+ = CH3COOH; log K 4.756" in line and "[GKL2002]" in line
    assert "\nsources\n" in out and "GKL2002: Goldberg, R.N., Kishore, N. & Lennen" in out


def test_show_a_species_defined_in_several_tables(tmp_path, capsys, monkeypatch):
    monkeypatch.setenv("IONWRIGHT_TABLES", write(tmp_path, "bench.toml", CLEAN))
    code, out, _ = run(capsys, "tables", "show", "CH3COOH")
    assert code == 0
    assert "species 'CH3COOH' in table 'core'" in out
    assert "species 'CH3COOH' in table 'bench'" in out
    assert "source: bench notebook 7 (demo values for the tests)" in out
    assert "defined in 2 tables; in a recipe, the table listed later" in out


def test_show_an_unknown_name_suggests_close_ones(capsys):
    code, _, err = run(capsys, "tables", "show", "calcit")
    assert code == 2
    assert "unknown table, species, solid, gas, component or reagent 'calcit'" in err
    assert "'calcite'" in err


def test_show_reagents_lists_table_and_plugin_reagents(tmp_path, capsys, monkeypatch):
    (tmp_path / "ionwright_test_stockroom.py").write_text(textwrap.dedent('''
        from ionwright import hookimpl

        @hookimpl
        def register_reagents():
            return {"stock 9": {"formula": "C3H5O3Na", "makes": {"Na+": 1, "Lac-": 1},
                                "source": "stock list (demo)"}}
    '''), encoding="utf-8")
    info = tmp_path / "ionwright_test_stockroom-0.1.dist-info"
    info.mkdir()
    (info / "METADATA").write_text("Metadata-Version: 2.1\nName: ionwright-test-stockroom\n"
                                   "Version: 0.1\n", encoding="utf-8")
    (info / "entry_points.txt").write_text("[ionwright]\nstockroom = ionwright_test_stockroom\n",
                                           encoding="utf-8")
    monkeypatch.syspath_prepend(str(tmp_path))
    monkeypatch.setenv("IONWRIGHT_TABLES", write(tmp_path, "bench.toml", CLEAN))
    code, out, _ = run(capsys, "tables", "show", "reagents")
    assert code == 0
    assert any(x.startswith("citric acid ") and "core" in x for x in out.splitlines())
    assert "stock 9" in out and "reagents:stockroom" in out
    assert "offered only when the recipe's tables define Lac- (in bench)" in out


# -- solve --explain -----------------------------------------------------------------------
def test_solve_explain_prints_every_constant_and_json_has_them(tmp_path, capsys):
    recipe = write(tmp_path, "r.toml", textwrap.dedent(f'''
        temperature_C = 30.0
        tables = ["core", "{tmp_path / 'bench.toml'}"]
        [dissolve]
        "acetic acid" = 0.01
    '''))
    write(tmp_path, "bench.toml", CLEAN)
    code, out, _ = run(capsys, "solve", recipe, "--explain")
    assert code == 0
    assert "\nconstants (" in out                     # the short report section
    assert "CH3COOH (species): CH3COO- + H+ = CH3COOH" in out
    assert "overrides table core: log K 4.756 at 25 °C" in out
    assert "species 'CH3COOH' from table 'bench' overrides table 'core'" in out  # warnings
    code, out, _ = run(capsys, "solve", recipe, "--json")
    used = {e["name"]: e for e in json.loads(out)["constants_used"]}
    assert used["CH3COOH"]["table"] == "bench"
    assert used["CH3COOH"]["overrides"][0]["log10_k_25C"] == 4.756


def test_show_a_kind_lists_every_entry_of_it(capsys):
    code, out, _ = run(capsys, "tables", "show", "gases")
    assert code == 0
    lines = out.splitlines()
    assert lines[0].split() == ["gas", "table", "definition"]
    assert any(x.startswith("CO2(g) ") and "CO2(g) = CO2; log K -1.468" in x for x in lines)


def test_show_lists_a_tables_redox_couples_and_finds_a_couple_by_name(capsys):
    code, out, _ = run(capsys, "tables", "show", "redox")
    assert code == 0
    assert "couples (" in out and "used only when a recipe states a redox level" in out
    assert "Fe3+ + e- = Fe2+; log K 13.033" in out
    code, out, _ = run(capsys, "tables", "show", "Fe2+")
    assert "couple 'Fe2+' in table 'redox'" in out
    assert "component 'Fe2+' in table 'metals'" in out
    assert "wins" not in out   # a component and the couple that links it override nothing
