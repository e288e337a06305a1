"""The plugin manager: hooks, the built-in plugin, conflicts, switches, broken plugins.

Each test builds a fresh registry (pluggy lesson: a fresh plugin manager per test);
tests that touch the cached default registry clear it before and after.
"""

from __future__ import annotations

import inspect
import pickle
import textwrap
import typing
import warnings

import pytest

import ionwright
from ionwright import hookimpl
from ionwright.plugins import hookspecs
from ionwright.errors import (BrokenPluginError, PluginConflictError, PluginConflictWarning,
                              PluginError, TableError, UnknownNameError)
from ionwright.plugins._registry import (BUILTIN, Registry, build_table, default_registry,
                               plugin_manager)
from ionwright.data._loader import parse_table

PLUGIN_VARIABLES = ("IONWRIGHT_NO_PLUGINS", "IONWRIGHT_TRACE_PLUGINS",
                    "IONWRIGHT_EXCLUDE_PLUGINS", "IONWRIGHT_PLUGIN_CONFLICTS", "IONWRIGHT_TABLES")

# A small in-house table on top of core: one invented acid (demo values, not data).
ACID_TABLE = textwrap.dedent('''
    [about]
    name = "bench-acid"
    format_version = 1
    [sources]
    demo = "invented demo value for the tests"
    [components."Bz-"]
    formula = "C3H3O2-"
    source = "demo"
    [species.HBz]
    formula = "C3H4O2"
    from = { "Bz-" = 1, "H+" = 1 }
    log10_k = 4.30
    source = "demo"
    [reagents."bench acid"]
    formula = "C3H4O2"
    makes = { "Bz-" = 1, "H+" = 1 }
    source = "demo"
''')


@pytest.fixture(autouse=True)
def clean_environment(monkeypatch, tmp_path):
    """No plugin switches from the developer's shell, no per-user tables, fresh caches."""
    for name in PLUGIN_VARIABLES:
        monkeypatch.delenv(name, raising=False)
    monkeypatch.setattr("ionwright.plugins._registry.user_tables_dir",
                        lambda: tmp_path / "no-user-tables")
    default_registry.cache_clear()
    yield
    default_registry.cache_clear()


def registry_with(*plugins, policy: str | None = None, table_files=()) -> Registry:
    """A registry of ionwright's own plugin plus *plugins* (objects with a plugin_name)."""
    manager = plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"})
    for plugin in plugins:
        manager.register(plugin, name=plugin.plugin_name)
    return Registry(manager, policy=policy, table_files=table_files, environ={})


class Offers:
    """A test plugin offering fixed tables, models and reagents."""

    def __init__(self, name: str, tables=None, models=None, reagents=None) -> None:
        self.plugin_name = name
        self._tables, self._models, self._reagents = tables, models, reagents

    @hookimpl
    def register_tables(self):
        return self._tables

    @hookimpl
    def register_activity_models(self):
        return self._models

    @hookimpl
    def register_reagents(self):
        return self._reagents


class Raises:
    plugin_name = "flaky-lab"

    @hookimpl
    def register_tables(self):
        raise OSError("share //lab/tables not mounted")


def acid_table(name: str = "bench-acid") -> ionwright.data.ConstantTable:
    return parse_table(ACID_TABLE.replace('"bench-acid"', f'"{name}"'), origin=f"<{name}>")


# -- the hook specifications ------------------------------------------------------------
def hook_specs():
    return [f for _, f in inspect.getmembers(hookspecs, inspect.isfunction)
            if hasattr(f, "ionwright_spec")]


def test_every_hook_is_a_typed_stub_whose_docstring_says_when_what_and_returns():
    specs = hook_specs()
    assert {f.__name__ for f in specs} == {"register_tables", "register_activity_models",
                                           "register_reagents", "register_parameter_tables"}
    for spec in specs:
        doc = inspect.getdoc(spec) or ""
        assert "Called once" in doc, spec.__name__
        assert "Return" in doc and "None" in doc, spec.__name__
        hints = typing.get_type_hints(spec, globalns=vars(hookspecs))
        assert "return" in hints, spec.__name__
        source = inspect.getsource(spec)
        assert source.rstrip().endswith('"""'), f"{spec.__name__} must be a stub"


def test_every_hook_is_collected_from_a_plugin():
    model = ionwright.activity.DaviesModel()
    model_copy = type("Copy", (), {"name": "davies-copy", "title": "t", "reference": "r",
                                   "max_ionic_strength": 0.5, "bind": model.bind})()
    plugin = Offers("all-hooks", tables={"bench-acid": acid_table()},
                    models={"davies-copy": model_copy},
                    reagents={"lab salt": {"formula": "NaCl", "source": "stock list (demo)"}})
    registry = registry_with(plugin)
    assert registry.owner("table", "bench-acid") == "all-hooks"
    assert registry.owner("activity model", "davies-copy") == "all-hooks"
    assert set(registry.reagent_layers["all-hooks"].reagents) == {"lab salt"}
    assert not registry.problems


def test_bundled_tables_and_models_come_through_the_same_hooks():
    registry = registry_with()
    assert registry.owner("table", "core") == BUILTIN
    assert {"ideal", "davies", "extended-debye-huckel", "truesdell-jones"} <= set(registry.models)
    assert all(registry.owner("activity model", n) == BUILTIN for n in registry.models)
    assert registry.table("core").counts["species"] > 40


# -- conflicts --------------------------------------------------------------------------
def two_labs():
    return (Offers("lab-one", tables={"bench-acid": acid_table()}),
            Offers("lab-two", tables={"bench-acid": acid_table()}))


def test_conflict_warns_by_default_naming_both_and_the_later_wins():
    with pytest.warns(PluginConflictWarning, match=r"table 'bench-acid' is registered by "
                      r"both plugin 'lab-one' and plugin 'lab-two'"):
        registry = registry_with(*two_labs())
    assert registry.owner("table", "bench-acid") == "lab-two"
    assert [(c.kind, c.name, c.kept, c.replaced) for c in registry.conflicts] == [
        ("table", "bench-acid", "lab-two", "lab-one")]


def test_conflict_raises_under_the_raise_policy():
    with pytest.raises(PluginConflictError, match="plugin 'lab-one' and plugin 'lab-two'") as info:
        registry_with(*two_labs(), policy="raise")
    assert (info.value.kind, info.value.name) == ("table", "bench-acid")
    assert "IONWRIGHT_PLUGIN_CONFLICTS=warn" in str(info.value)


def test_conflict_is_quiet_under_ignore_but_still_recorded():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        registry = registry_with(*two_labs(), policy="ignore")
    assert registry.owner("table", "bench-acid") == "lab-two"
    assert len(registry.conflicts) == 1


def test_conflict_policy_from_the_environment_and_unknown_policies(monkeypatch):
    monkeypatch.setenv("IONWRIGHT_PLUGIN_CONFLICTS", "raise")
    manager = plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"})
    for lab in two_labs():
        manager.register(lab, name=lab.plugin_name)
    with pytest.raises(PluginConflictError):
        Registry(manager, table_files=())
    with pytest.raises(UnknownNameError, match="plugin conflict policy 'loud'") as info:
        registry_with(policy="loud")
    assert "warn, raise, ignore" in str(info.value)


def test_a_plugin_table_named_like_a_bundled_one_is_a_loud_conflict():
    with pytest.warns(PluginConflictWarning, match="table 'core'"):
        registry = registry_with(Offers("rogue", tables={"core": acid_table("core")}))
    assert registry.owner("table", "core") == "rogue"


def test_reagents_offered_by_two_plugins_follow_the_policy():
    salt = {"formula": "NaCl", "source": "stock list (demo)"}
    with pytest.warns(PluginConflictWarning, match="reagent 'lab salt'"):
        registry = registry_with(Offers("lab-one", reagents={"lab salt": salt}),
                                 Offers("lab-two", reagents={"lab salt": salt}))
    assert "lab salt" not in registry.reagent_layers["lab-one"].reagents
    assert "lab salt" in registry.reagent_layers["lab-two"].reagents


# -- broken plugins: named, never skipped silently, solves refuse ------------------------
def test_a_hook_that_raises_is_named_and_solves_refuse():
    registry = registry_with(Raises())
    assert [(p.provider, p.problem) for p in registry.problems] == [
        ("flaky-lab", "register_tables() raised OSError: share //lab/tables not mounted")]
    with pytest.raises(BrokenPluginError) as info:
        ionwright.solve({"dissolve": {"NaCl": 0.1}}, registry=registry)
    message = str(info.value)
    assert "flaky-lab: register_tables() raised OSError" in message
    assert "IONWRIGHT_EXCLUDE_PLUGINS=flaky-lab" in message
    assert isinstance(info.value, PluginError)


@pytest.mark.parametrize("offers, expected", [
    (Offers("m1", tables=["core.toml"]), "register_tables() must return a mapping"),
    (Offers("m2", tables={"x": 42}), "table 'x' must be a ConstantTable, a path or a "
                                     "package resource, got int"),
    (Offers("m3", tables={"": acid_table()}), "table name '' must be a non-empty string"),
    (Offers("m4", models={"fast": object()}), "activity model 'fast' lacks name, title, "
                                              "max_ionic_strength, reference, bind"),
    (Offers("m5", models={"sit2": ionwright.activity.DaviesModel()}),
     "activity model offered as 'sit2' calls itself 'davies'"),
    (Offers("m6", reagents={"lab salt": {"formula": "NaCl"}}),
     "reagent 'lab salt': missing source"),
    (Offers("m7", reagents={"lab salt": {"formula": "NaCl", "makes": {"Na+": 1, "H+": 1},
                                         "colour": "white", "source": "s"}}),
     "reagent 'lab salt': unknown key(s) colour"),
])
def test_malformed_hook_results_name_the_plugin_and_the_entry(offers, expected):
    registry = registry_with(offers)
    assert len(registry.problems) == 1
    assert registry.problems[0].provider == offers.plugin_name
    assert expected in registry.problems[0].problem
    with pytest.raises(BrokenPluginError, match=offers.plugin_name):
        registry.model("davies")


def test_an_unbalanced_plugin_table_is_refused_when_used_and_names_plugin_and_entry(tmp_path):
    bad = tmp_path / "bench-acid.toml"
    bad.write_text(ACID_TABLE.replace('from = { "Bz-" = 1, "H+" = 1 }',
                                      'from = { "Bz-" = 1, "H+" = 2 }'), encoding="utf-8")
    registry = registry_with(Offers("bench-lab", tables={"bench-acid": bad}))
    assert not registry.problems  # read lazily: nothing is broken until the table is used
    ionwright.solve({"dissolve": {"NaCl": 0.01}}, registry=registry)  # core alone still works
    with pytest.raises(TableError) as info:
        ionwright.solve({"tables": ["core", "bench-acid"], "dissolve": {"NaCl": 0.01}},
                        registry=registry)
    message = str(info.value)
    assert "species 'HBz' (table 'bench-acid')" in message
    assert "C3H4O2 has +0, 1 Bz- + 2 H+ has +1" in message  # both sides of the reaction
    assert str(bad) in message


def test_a_table_whose_about_name_differs_from_the_offered_name_is_refused(tmp_path):
    path = tmp_path / "t.toml"
    path.write_text(ACID_TABLE, encoding="utf-8")
    registry = registry_with(Offers("bench-lab", tables={"house": path}))
    with pytest.raises(PluginError, match="offers table 'house' but the file calls itself "
                       "'bench-acid'"):
        registry.table("house")


def write_entry_point(folder, name: str, module: str, code: str) -> None:
    """A minimal installed distribution with an `ionwright` entry point, on disk."""
    (folder / f"{module}.py").write_text(code, encoding="utf-8")
    info = folder / f"{module}-0.1.dist-info"
    info.mkdir()
    (info / "METADATA").write_text(f"Metadata-Version: 2.1\nName: {module}\nVersion: 0.1\n",
                                   encoding="utf-8")
    (info / "entry_points.txt").write_text(f"[ionwright]\n{name} = {module}\n", encoding="utf-8")


def test_a_plugin_that_raises_on_import_blocks_solves_until_excluded(tmp_path, monkeypatch):
    write_entry_point(tmp_path, "lab-licence", "ionwright_test_broken_plugin",
                      'raise RuntimeError("licence server unreachable")\n')
    monkeypatch.syspath_prepend(str(tmp_path))
    recipe = {"dissolve": {"NaCl": 0.01}}
    with pytest.raises(BrokenPluginError) as info:
        ionwright.solve(recipe)
    assert ("lab-licence: failed to import (ionwright_test_broken_plugin): RuntimeError: "
            "licence server unreachable") in str(info.value)
    assert "IONWRIGHT_EXCLUDE_PLUGINS=lab-licence" in str(info.value)
    monkeypatch.setenv("IONWRIGHT_EXCLUDE_PLUGINS", "lab-licence")
    default_registry.cache_clear()
    assert ionwright.solve(recipe).converged
    monkeypatch.delenv("IONWRIGHT_EXCLUDE_PLUGINS")
    monkeypatch.setenv("IONWRIGHT_NO_PLUGINS", "1")
    default_registry.cache_clear()
    assert ionwright.solve(recipe).converged


def test_a_plugin_with_a_misspelt_hook_is_named(tmp_path, monkeypatch):
    write_entry_point(tmp_path, "typo-lab", "ionwright_test_typo_plugin", textwrap.dedent('''
        from ionwright import hookimpl

        @hookimpl
        def register_table():
            return {}
    '''))
    monkeypatch.syspath_prepend(str(tmp_path))
    registry = default_registry()
    assert [p.provider for p in registry.problems] == ["typo-lab"]
    assert "declares a hook ionwright does not have" in registry.problems[0].problem
    assert "register_table" in registry.problems[0].problem


def test_plugin_manager_without_a_problem_list_raises_at_once(tmp_path, monkeypatch):
    write_entry_point(tmp_path, "lab-licence", "ionwright_test_broken_plugin2",
                      'raise ImportError("no module named labdb")\n')
    monkeypatch.syspath_prepend(str(tmp_path))
    with pytest.raises(PluginError, match="plugin 'lab-licence': failed to import"):
        plugin_manager()


def test_trace_switch_prints_plugins_and_hook_calls(monkeypatch, capsys):
    monkeypatch.setenv("IONWRIGHT_TRACE_PLUGINS", "1")
    Registry(plugin_manager(), table_files=())
    err = capsys.readouterr().err
    assert "ionwright plugins: register_tables() of 'ionwright.builtin': core" in err
    assert "register_activity_models() of 'ionwright.builtin'" in err
    monkeypatch.setenv("IONWRIGHT_TRACE_PLUGINS", "0")
    Registry(plugin_manager(), table_files=())
    assert capsys.readouterr().err == ""


# -- named reagents offered by a plugin ---------------------------------------------------
def test_plugin_reagents_form_a_layer_below_the_recipe_tables():
    plugin = Offers("stockroom", reagents={
        "stock 12": {"formula": "KCl", "makes": {"K+": 1, "Cl-": 1}, "source": "stock list"},
        "stock 40": {"formula": "C3H4O2", "makes": {"Bz-": 1, "H+": 1}, "source": "stock list"}},
        tables={"bench-acid": acid_table()})
    registry = registry_with(plugin)
    core_only = registry.layers(["core"])
    assert [t.name for t in core_only] == ["reagents:stockroom", "core"]
    assert set(core_only[0].reagents) == {"stock 12"}  # stock 40 needs Bz-: not offered
    both = registry.layers(["core", "bench-acid"])
    assert set(both[0].reagents) == {"stock 12", "stock 40"}
    result = ionwright.solve({"dissolve": {"stock 12": 0.05}}, registry=registry)
    assert result.totals["K+"] == pytest.approx(0.05)
    with pytest.raises(UnknownNameError, match="unknown ingredient 'stock 40'"):
        ionwright.solve({"dissolve": {"stock 40": 0.01}}, registry=registry)


def test_a_table_reagent_overrides_a_plugin_reagent_and_the_result_says_so():
    plugin = Offers("stockroom", reagents={
        "acetic acid": {"formula": "CH3COOH", "makes": {"CH3COO-": 1, "H+": 1},
                        "source": "stock list"}})
    result = ionwright.solve({"dissolve": {"acetic acid": 0.01}}, registry=registry_with(plugin))
    assert any(w.startswith("reagent 'acetic acid' from table 'core' overrides table "
                            "'reagents:stockroom'") for w in result.warnings)


def test_build_table_applies_the_loader_checks_to_a_mapping():
    with pytest.raises(TableError, match="species 'X': missing log10_k"):
        build_table({"about": {"name": "m", "format_version": 1},
                     "species": {"X": {"formula": "HCl", "from": {"H+": 1, "Cl-": 1},
                                       "source": "s"}}}, origin="<mapping>")


def test_new_plugin_errors_pickle_with_their_fields():
    for error in (BrokenPluginError([("lab", "it broke")]),
                  PluginConflictError("table", "core", "plugin 'a'", "plugin 'b'")):
        clone = pickle.loads(pickle.dumps(error))
        assert type(clone) is type(error) and str(clone) == str(error)
    assert pickle.loads(pickle.dumps(BrokenPluginError([("lab", "x")]))).problems == [("lab", "x")]
