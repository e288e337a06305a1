"""Provenance: every constant a solve used, its values, method, table, source, overrides."""

from __future__ import annotations

import json
import textwrap

import numpy as np
import pytest

import ionwright
from ionwright.plugins._registry import default_registry
from ionwright.outputs._provenance import constants_used, explain, override_warnings
from ionwright.core._system import log10_k_at

# A stricter in-house review of one core constant (demo value and source, not data).
REVIEW = textwrap.dedent('''
    [about]
    name = "{name}"
    format_version = 1
    [sources]
    review = "{citation}"
    [species.CH3COOH]
    from = {{ "CH3COO-" = 1, "H+" = 1 }}
    log10_k = {log10_k}
    enthalpy_kJ = 0.41
    source = "review"
''')

RECIPE = {"temperature_C": 37.0, "dissolve": {"acetic acid": 0.01, "sodium acetate": 0.01,
                                             "CaCl2": 0.001, "NaHCO3": 0.002}}


@pytest.fixture(autouse=True)
def no_plugins(monkeypatch):
    """Only ionwright's own plugin, so that the bundled core table is what is compared."""
    monkeypatch.setenv("IONWRIGHT_NO_PLUGINS", "1")
    monkeypatch.delenv("IONWRIGHT_TABLES", raising=False)
    default_registry.cache_clear()
    yield
    default_registry.cache_clear()


def review(tmp_path, name="review", log10_k=4.80, citation="Bench review 2025 (demo)"):
    path = tmp_path / f"{name}.toml"
    path.write_text(REVIEW.format(name=name, log10_k=log10_k, citation=citation), encoding="utf-8")
    return str(path)


def by_name(result) -> dict[str, dict]:
    return {e["name"]: e for e in constants_used(result)}


def test_every_species_constant_of_the_system_is_listed_once_with_its_fields():
    result = ionwright.solve(RECIPE)
    entries = constants_used(result)
    names = [e["name"] for e in entries]
    assert len(names) == len(set(names))
    formed = {r.name for r in result.system.resolved if r.terms}
    assert formed <= set(names)
    core = result.tables.table("core")
    t = np.array([37.0])
    for e in entries:
        section = {"species": "species", "solid": "solids", "gas": "gases"}[e["kind"]]
        record = getattr(result.tables, section)[e["name"]]
        assert e["log10_k_25C"] == record.logk.log10_k
        assert e["log10_k_at_T"] == pytest.approx(float(log10_k_at(record.logk, t)[0]))
        assert e["temperature_method"] in {"van 't Hoff", "van 't Hoff + ΔCp°", "analytic",
                                           "none", "water ionization"}
        assert e["table"] == "core" and e["table_origin"] == core.origin
        assert e["source"] == core.citation(record.source)  # the full citation, not the key
        assert e["from_memory"] == record.from_memory
        assert e["overrides"] == []
    assert by_name(result)["CH3COOH"]["reaction"] == "CH3COO- + H+ = CH3COOH"
    assert by_name(result)["OH-"]["reaction"] == "H2O = OH- + H+"


def test_solids_with_a_saturation_index_are_listed_with_their_dissolution():
    result = ionwright.solve(RECIPE)
    calcite = by_name(result)["calcite"]
    assert calcite["kind"] == "solid"
    assert calcite["reaction"] == "calcite = Ca2+ + CO3^2-"
    assert calcite["temperature_method"] == "analytic"
    assert set(result.saturation_indices) <= {e["name"] for e in constants_used(result)
                                              if e["kind"] == "solid"}


def test_a_one_species_override_changes_exactly_that_constant(tmp_path):
    base = ionwright.solve(RECIPE)
    over = ionwright.solve({**RECIPE, "tables": ["core", review(tmp_path)]})
    assert base.system.species == over.system.species
    k_base = base.system.log10_k(np.array([37.0]))[0]
    k_over = over.system.log10_k(np.array([37.0]))[0]
    changed = [s for s, a, b in zip(base.system.species, k_base, k_over) if a != b]
    assert changed == ["CH3COOH"]
    old, new = by_name(base)["CH3COOH"], by_name(over)["CH3COOH"]
    assert new["log10_k_25C"] == 4.80 and new["table"] == "review"
    assert new["source"] == "Bench review 2025 (demo)"
    assert new["overrides"] == [{
        "table": "core", "table_origin": old["table_origin"], "log10_k_25C": 4.756,
        "log10_k_at_T": old["log10_k_at_T"], "temperature_method": "van 't Hoff + ΔCp°",
        "source": old["source"], "from_memory": old["from_memory"]}]
    others = {k: v for k, v in by_name(over).items() if k != "CH3COOH"}
    assert others == {k: v for k, v in by_name(base).items() if k != "CH3COOH"}
    assert ("species 'CH3COOH' from table 'review' overrides table 'core': log K 4.756 -> 4.8, "
            "ΔCp° 142 J/(mol K) -> none, range [1, 77] -> none") in over.warnings


def test_a_chain_of_overrides_lists_every_replaced_entry_newest_first(tmp_path):
    tables = ["core", review(tmp_path, "first", 4.78, "First review (demo)"),
              review(tmp_path, "second", 4.81, "Second review (demo)")]
    entry = by_name(ionwright.solve({**RECIPE, "tables": tables}))["CH3COOH"]
    assert entry["log10_k_25C"] == 4.81
    assert [(o["table"], o["log10_k_25C"], o["source"][:5]) for o in entry["overrides"]] == [
        ("first", 4.78, "First"), ("core", 4.756, "Goldb")]


def test_overrides_the_solve_did_not_use_are_named_in_one_warning(tmp_path):
    text = REVIEW.format(name="wide", log10_k=4.8, citation="c") + textwrap.dedent('''
        [species."NH4+"]
        from = { NH3 = 1, "H+" = 1 }
        log10_k = 9.25
        source = "review"
    ''')
    path = tmp_path / "wide.toml"
    path.write_text(text, encoding="utf-8")
    result = ionwright.solve({"tables": ["core", str(path)], "dissolve": {"NaCl": 0.01}})
    assert [n.text for n in override_warnings(result)] == [
        "table 'wide' also overrides 2 entries of table 'core' that this solve did not use: "
        "species 'CH3COOH', species 'NH4+'"]


def test_constants_used_is_in_the_json_result_and_serialises(tmp_path):
    result = ionwright.solve({**RECIPE, "tables": ["core", review(tmp_path)]})
    data = json.loads(json.dumps(result.to_dict(), ensure_ascii=False))
    assert data["constants_used"] == constants_used(result)
    assert {"name", "kind", "reaction", "log10_k_25C", "log10_k_at_T", "temperature_method",
            "uncertainty", "range_C", "range_reason", "table", "table_origin", "source",
            "from_memory", "note", "overrides"} == set(data["constants_used"][0])


def test_text_report_has_a_short_constants_section(tmp_path):
    report = ionwright.solve({**RECIPE, "tables": ["core", review(tmp_path)]}).report()
    section = report.split("\nconstants (", 1)[1].split("\n\n", 1)[0]
    assert "log K at 37 °C; the explained listing gives each with its source)" in section
    assert "  review          1 species" in section
    assert "  override        CH3COOH: log K 4.756 (core) -> 4.8 (review)" in section


def test_explain_shows_every_constant_with_values_method_table_and_source(tmp_path):
    result = ionwright.solve({**RECIPE, "tables": ["core", review(tmp_path)]})
    text = explain(result)
    for e in constants_used(result):
        assert f"{e['name']} ({e['kind']}): {e['reaction']}" in text
    # van 't Hoff by hand: 4.80 − ΔH°/(R ln 10)·(1/310.15 K − 1/298.15 K), ΔH° = 0.41 kJ/mol
    at_37 = 4.80 - 410.0 / (8.314462618 * np.log(10)) * (1 / 310.15 - 1 / 298.15)
    assert f"log K 4.8 at 25 °C, {at_37:.4f} at 37 °C (van 't Hoff)" in text
    assert "source Bench review 2025 (demo)" in text
    assert "overrides table core: log K 4.756 at 25 °C" in text
    assert "activity model davies" in text
