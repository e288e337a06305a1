"""Parameter tables of activity models arrive through the register_parameter_tables hook,
ionwright's own Pitzer table like a third party's (and in-house parameters override it
entry by entry, as in-house constant tables do)."""

from __future__ import annotations

import textwrap

import pytest

import ionwright
from ionwright import hookimpl
from ionwright.plugins import ParameterTable, Registry, plugin_manager
from ionwright.plugins._registry import BUILTIN

LAB = textwrap.dedent('''
    [about]
    name = "lab-pitzer"
    format_version = 1
    title = "a lab's re-fitted NaCl (FICTIONAL demo data)"
    reference_temperature_C = 25.0
    derivative_range_C = [0.0, 50.0]
    [sources]
    lab = "Hollow Oak Brewery lab notebook (fictional)"
    [[cation_anion]]
    cation = "Na+"
    anion = "Cl-"
    beta0 = 0.0800
    beta1 = 0.2600
    c_phi = 0.0010
    source = "lab"
''')
BRINE = {"activity_model": "pitzer", "dissolve": {"NaCl": 2.0, "CaCl2": 0.1}}


class LabParameters:
    plugin_name = "lab-parameters"

    def __init__(self, tables) -> None:
        self.tables = tables

    @hookimpl
    def register_parameter_tables(self):
        return self.tables


def registry_with(*plugins) -> Registry:
    manager = plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"})
    for plugin in plugins:
        manager.register(plugin, name=plugin.plugin_name)
    return Registry(manager, table_files=(), environ={})


def test_the_bundled_pitzer_table_comes_through_the_hook():
    registry = registry_with()
    offer = registry.parameter_tables["pitzer"]
    assert offer.model == "pitzer" and offer.provider == BUILTIN
    params = registry.model("pitzer").parameters
    assert ("Na+", "Cl-") in params.binary and "pitzer.toml" in params.origin


def test_in_house_parameters_override_entry_by_entry(tmp_path):
    path = tmp_path / "lab-pitzer.toml"
    path.write_text(LAB, encoding="utf-8")
    registry = registry_with(LabParameters({"lab-pitzer": ParameterTable("pitzer", path)}))
    params = registry.model("pitzer").parameters
    assert params.binary[("Na+", "Cl-")].beta0 == 0.0800          # the lab's
    assert ("Ca2+", "Cl-") in params.binary                       # the bundled one kept
    bundled = ionwright.solve(BRINE, registry_with())
    lab = ionwright.solve(BRINE, registry)
    assert lab.pH != bundled.pH


def test_a_table_for_a_model_nobody_registers_is_a_plugin_problem(tmp_path):
    registry = registry_with(LabParameters({"x": ParameterTable("no-such-model", tmp_path)}))
    assert any("no-such-model" in p.problem for p in registry.problems)
    with pytest.raises(ionwright.BrokenPluginError):
        registry.require_healthy()


def test_a_malformed_offer_is_a_plugin_problem():
    registry = registry_with(LabParameters({"x": "pitzer.toml"}))
    assert any("must be an ionwright.plugins.ParameterTable" in p.problem
               for p in registry.problems)


def test_tables_check_is_callable_from_python(tmp_path):
    """ionwright.check_table finds what `ionwright tables check` prints."""
    good = tmp_path / "good.toml"
    good.write_text(textwrap.dedent('''
        [about]
        name = "good"
        format_version = 1
        [sources]
        s = "a citation"
        [species."NaCl"]
        from = { "Na+" = 1, "Cl-" = 1 }
        log10_k = -0.5
        source = "s"
    '''), encoding="utf-8")
    found = ionwright.check_table(good)
    assert found.ok and found.notes[0].startswith("table 'good': 1 species")
    bad = tmp_path / "bad.toml"
    bad.write_text(good.read_text(encoding="utf-8").replace('"Cl-" = 1', '"Cl-" = 2'),
                   encoding="utf-8")
    found = ionwright.check_table(bad)
    assert not found.ok and any("does not balance in charge" in p for p in found.problems)


def test_an_ion_named_as_the_tables_name_it_takes_the_charge_its_name_ends_with():
    """Organic ions are no formulas (HPhthalate-): a parameter table may name them as the
    constant tables do; a name with no charge at all is still a problem."""
    from ionwright.data._pitzer_table import parse_parameters
    from ionwright.errors import TableError

    head = ('[about]\nname = "lab"\nformat_version = 1\nreference_temperature_C = 25.0\n'
            '[sources]\nlab = "our cells"\n')
    entry = '[[cation_anion]]\ncation = "K+"\nanion = "{}"\nbeta0 = 0.1\nbeta1 = 0.0\n' \
            'c_phi = 0.0\nsource = "lab"\n'
    params = parse_parameters(head + entry.format("HPhthalate-"), "lab.toml")
    assert params.binary["K+", "HPhthalate-"].z_anion == 1
    assert parse_parameters(head + entry.format("Phthalate-2"), "lab.toml").binary[
        "K+", "Phthalate^2-"].z_anion == 2
    with pytest.raises(TableError, match="Phthalate"):
        parse_parameters(head + entry.format("Phthalate"), "lab.toml")
