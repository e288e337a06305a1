"""In-house tables without packaging: IONWRIGHT_TABLES and the per-user tables folder."""

from __future__ import annotations

import os
import textwrap

import pytest

import ionwright
from ionwright.errors import BrokenPluginError, PluginConflictWarning, UnknownNameError
from ionwright.plugins._registry import (Registry, default_registry, in_house_table_files,
                                        plugin_manager)

PLUGIN_VARIABLES = ("IONWRIGHT_NO_PLUGINS", "IONWRIGHT_TRACE_PLUGINS",
                    "IONWRIGHT_EXCLUDE_PLUGINS", "IONWRIGHT_PLUGIN_CONFLICTS", "IONWRIGHT_TABLES")


def house_table(name: str, log10_k: float = 4.80) -> str:
    """An in-house table that re-measures acetic acid (demo value, not data)."""
    return textwrap.dedent(f'''
        [about]
        name = "{name}"
        format_version = 1
        [sources]
        bench = "in-house titration, notebook 7 (demo value for the tests)"
        [species.CH3COOH]
        from = {{ "CH3COO-" = 1, "H+" = 1 }}
        log10_k = {log10_k}
        source = "bench"
    ''')


@pytest.fixture(autouse=True)
def user_folder(monkeypatch, tmp_path):
    """A per-user tables folder inside tmp_path; no plugin switches; fresh caches."""
    for name in PLUGIN_VARIABLES:
        monkeypatch.delenv(name, raising=False)
    folder = tmp_path / "config" / "tables"
    monkeypatch.setattr("ionwright.plugins._registry.user_tables_dir", lambda: folder)
    default_registry.cache_clear()
    yield folder
    default_registry.cache_clear()


def acetic(tables):
    return {"tables": tables, "dissolve": {"acetic acid": 0.01}}


def test_ionwright_tables_registers_files_and_folders_by_their_about_name(tmp_path, monkeypatch):
    single = tmp_path / "one.toml"
    single.write_text(house_table("house-a"), encoding="utf-8")
    folder = tmp_path / "shared"
    folder.mkdir()
    (folder / "b.toml").write_text(house_table("house-b", 4.70), encoding="utf-8")
    (folder / "readme.txt").write_text("not a table", encoding="utf-8")
    monkeypatch.setenv("IONWRIGHT_TABLES", os.pathsep.join([str(single), str(folder)]))
    registry = default_registry()
    assert registry.owner("table", "house-a") == str(single)
    assert registry.owner("table", "house-b") == str(folder / "b.toml")
    result = ionwright.solve(acetic(["core", "house-b"]))
    assert [e["log10_k_25C"] for e in result.to_dict()["constants_used"]
            if e["name"] == "CH3COOH"] == [4.70]


def test_the_per_user_folder_registers_tables_and_no_plugins_turns_it_off(user_folder,
                                                                          monkeypatch):
    user_folder.mkdir(parents=True)
    (user_folder / "mine.toml").write_text(house_table("mine"), encoding="utf-8")
    assert ionwright.solve(acetic(["core", "mine"])).converged
    monkeypatch.setenv("IONWRIGHT_NO_PLUGINS", "1")
    default_registry.cache_clear()
    with pytest.raises(UnknownNameError, match="unknown constant table 'mine'"):
        ionwright.solve(acetic(["core", "mine"]))


def test_same_name_in_folder_and_environment_is_a_conflict_and_the_later_wins(
        user_folder, tmp_path, monkeypatch):
    user_folder.mkdir(parents=True)
    (user_folder / "house.toml").write_text(house_table("house", 4.80), encoding="utf-8")
    later = tmp_path / "house-v2.toml"
    later.write_text(house_table("house", 4.79), encoding="utf-8")
    monkeypatch.setenv("IONWRIGHT_TABLES", str(later))
    with pytest.warns(PluginConflictWarning, match=r"table 'house' is registered by both "
                      r"table file .*house.toml and table file .*house-v2.toml"):
        registry = default_registry()
    assert registry.table("house").origin == str(later)


def test_a_missing_or_broken_in_house_file_blocks_solves_until_excluded(tmp_path, monkeypatch):
    broken = tmp_path / "broken.toml"
    broken.write_text(house_table("broken").replace("log10_k = 4.8", "log10_k = 4.8 4.9"),
                      encoding="utf-8")
    missing = tmp_path / "gone.toml"
    monkeypatch.setenv("IONWRIGHT_TABLES", os.pathsep.join([str(broken), str(missing)]))
    with pytest.raises(BrokenPluginError) as info:
        ionwright.solve(acetic(["core"]))
    message = str(info.value)
    assert f"{broken}: TOML syntax error at line 9" in message
    assert f"{missing}: named by IONWRIGHT_TABLES, but there is no such file" in message
    monkeypatch.setenv("IONWRIGHT_EXCLUDE_PLUGINS", f"broken.toml,{missing}")
    default_registry.cache_clear()
    assert ionwright.solve(acetic(["core"])).converged


def test_recipe_paths_need_no_registration(tmp_path):
    path = tmp_path / "bench.toml"
    path.write_text(house_table("bench"), encoding="utf-8")
    result = ionwright.solve(acetic(["core", str(path)]))
    assert any("from table 'bench' overrides table 'core'" in w for w in result.warnings)


def test_in_house_files_are_listed_in_registration_order(user_folder, tmp_path):
    user_folder.mkdir(parents=True)
    for name in ("b.toml", "a.toml"):
        (user_folder / name).write_text(house_table(name[0]), encoding="utf-8")
    env_file = tmp_path / "z.toml"
    env = {"IONWRIGHT_TABLES": str(env_file)}
    files = [p.name for p, _ in in_house_table_files(env)]
    assert files == ["a.toml", "b.toml", "z.toml"]
    registry = Registry(plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"}), environ={})
    assert {"a", "b"} <= set(registry.tables)
