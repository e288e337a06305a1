"""The README's own examples work as written, and DEVELOPERS.md lists every recipe key."""

from __future__ import annotations

import re
import sys
from pathlib import Path

import pytest

import ionwright
from ionwright.inputs import _analysis, _recipe

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


@pytest.mark.parametrize("keys, heading", [
    (_recipe.TOP_KEYS, "top-level"), (_recipe.FIX_KEYS, "[fix]"), (_recipe.ADD_KEYS, "[[add]]"),
    (_recipe.POUR_KEYS, "[[pour]]"), (_analysis.NAMED_KEYS, "[analysis]")])
def test_developers_lists_every_recipe_key(keys, heading):
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    section = text[text.index("## Recipe keys"):]
    section = section[:section.index("\n## ", 3)]
    missing = [k for k in keys if f"`{k}`" not in section]
    assert not missing, f"{heading} keys missing from DEVELOPERS.md: {missing}"
