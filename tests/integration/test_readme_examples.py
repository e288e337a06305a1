"""The README's own examples work as written, and DEVELOPERS.md lists every recipe key."""

from __future__ import annotations

import re
import shlex
import sys
from pathlib import Path

import pytest

import ionwright
from ionwright.inputs import _analytes, _recipe

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[2]


def blocks(document: str, language: str) -> list[str]:
    text = (ROOT / document).read_text(encoding="utf-8")
    return re.findall(rf"```{language}\n(.*?)```", text, flags=re.S)


def test_the_readme_recipe_solves_as_written():
    (recipe,) = [b for b in blocks("README.md", "toml") if "[dissolve]" in b]
    result = ionwright.solve(tomllib.loads(recipe))
    assert result.pH == pytest.approx(7.0)          # its [fix] pH
    assert dict(result.recipe.dissolve)["KH2PO4"] == pytest.approx(0.025, rel=1e-3)


def readme_commands() -> list[str]:
    """Every `ionwright ...` line of the README's shell blocks, continuations joined."""
    lines = []
    for block in blocks("README.md", "bash"):
        for line in block.replace("\\\n", " ").splitlines():
            command = line.split(" #")[0].strip()
            if command.startswith("ionwright "):
                lines.append(command)
    return lines


# the files the README's commands name beside its recipe: an invented lake analysis,
# samples, wells and lotion bases (demo data)
ANALYSIS = ('title = "north basin"\n[analysis]\ntemperature_C = 12.0\npH = 7.6\n'
            'Ca = "46 mg/L"\nMg = "8.5 mg/L"\nNa = "9.2 mg/L"\nCl = "14 mg/L"\n'
            'SO4 = "22 mg/L"\nalkalinity = "128 mg/L as CaCO3"\n')
SAMPLES = "site,NaCl,CaCl2\ninlet,0.01,0.001\noutlet,0.02,0.002\n"
WELLS = ("well,pH,Ca [mg/L],Mg [mg/L],Na [mg/L],Cl [mg/L],NO3 [mg/L as N],"
         "alkalinity [mg/L as CaCO3]\nnorth,7.6,46,8.5,9.2,14,<0.05,128\n"
         "south,7.9,38,,12,20,1.2,110\n")   # invented survey wells (issue 15)
LOTIONS = "line,NaCl,KCl\nA,0.15,0.005\nB,0.3,0.01\n"   # invented lotion-line bases


@pytest.mark.parametrize("command", readme_commands())
def test_every_readme_command_runs_as_written(command, tmp_path, monkeypatch, capsys):
    """Run in a folder holding the README's recipe as recipe.toml (issue 16: the target
    example failed on the recipe's [fix] pH)."""
    from ionwright.cli._main import main

    (recipe,) = [b for b in blocks("README.md", "toml") if "[dissolve]" in b]
    (tmp_path / "recipe.toml").write_text(recipe, encoding="utf-8")
    (tmp_path / "analysis.toml").write_text(ANALYSIS, encoding="utf-8")
    (tmp_path / "samples.csv").write_text(SAMPLES, encoding="utf-8")
    (tmp_path / "wells.csv").write_text(WELLS, encoding="utf-8")
    (tmp_path / "lotions.csv").write_text(LOTIONS, encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    status = main(shlex.split(command)[1:])
    out, err = capsys.readouterr()
    assert status == 0, err
    assert out.strip() and "Traceback" not in err


def test_the_readme_shows_the_commands():
    assert len(readme_commands()) >= 10


@pytest.mark.parametrize("keys, heading", [
    (_recipe.TOP_KEYS, "top-level"), (_recipe.FIX_KEYS, "[fix]"), (_recipe.ADD_KEYS, "[[add]]"),
    (_recipe.POUR_KEYS, "[[pour]]"), (_analytes.NAMED_KEYS, "[analysis]")])
def test_developers_lists_every_recipe_key(keys, heading):
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    section = text[text.index("## Recipe keys"):]
    section = section[:section.index("\n## ", 3)]
    missing = [k for k in keys if f"`{k}`" not in section]
    assert not missing, f"{heading} keys missing from DEVELOPERS.md: {missing}"


def test_every_optional_extra_is_named_where_users_and_contributors_read():
    """Each extra of pyproject.toml (but the test tools) is in the README as a pip command
    and in DEVELOPERS.md with what needs it (issue 16: they were mentioned nowhere)."""
    extras = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))[
        "project"]["optional-dependencies"]
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    developers = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    for extra in set(extras) - {"test"}:
        assert f'"ionwright[{extra}]"' in readme, extra
        assert f"`{extra}`" in developers, extra
