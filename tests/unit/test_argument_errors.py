"""Library errors name Python arguments; the command line names its options instead."""

from __future__ import annotations

import ast
import re
import subprocess
import sys
from pathlib import Path

import pytest

import ionwright
from ionwright.design import _sweep as sweeps
from ionwright.errors import RecipeError

PACKAGE = Path(ionwright.__file__).resolve().parent
FLAG = re.compile(r"(?<![\w-])--[a-z]")
RECIPE = {"dissolve": {"NaCl": 0.01, "NaHCO3": 0.002}}


def _strings_outside_docstrings(tree: ast.AST) -> list[str]:
    docstrings = {id(node.body[0].value) for node in ast.walk(tree)
                  if isinstance(node, (ast.Module, ast.FunctionDef, ast.ClassDef,
                                       ast.AsyncFunctionDef))
                  and node.body and isinstance(node.body[0], ast.Expr)
                  and isinstance(node.body[0].value, ast.Constant)}
    return [node.value for node in ast.walk(tree)
            if isinstance(node, ast.Constant) and isinstance(node.value, str)
            and id(node) not in docstrings]


def test_no_library_text_names_a_command_line_option():
    found = []
    for path in PACKAGE.rglob("*.py"):
        if "cli" in path.relative_to(PACKAGE).parts:
            continue
        tree = ast.parse(path.read_text(encoding="utf-8"))
        found += [f"{path.name}: {s!r}" for s in _strings_outside_docstrings(tree)
                  if FLAG.search(s)]
    assert found == []


def test_a_bad_argument_is_named_as_the_python_argument():
    with pytest.raises(RecipeError) as err:
        sweeps.titration(RECIPE, "HCl 0.1 mol/L", to="0 mL")
    assert err.value.parameter == "to"
    assert str(err.value).startswith("argument to: '0 mL' must be more than zero")
    assert "--" not in str(err.value)


def test_hints_written_as_python_arguments_name_the_options_on_the_command_line():
    error = RecipeError("to", "'0 mL' must be more than zero",
                        'e.g. to="50 mL"; give either titrant= or pair=True', parameter="to")
    assert str(error).startswith("argument to: ")
    error.flags = {"to": "--to", "titrant": "--titrant", "pair": "--pair"}
    assert str(error) == ("--to: '0 mL' must be more than zero\n  hint: e.g. --to \"50 mL\"; "
                          "give either --titrant or --pair")


def _cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True)


def test_the_command_line_names_its_options(tmp_path):
    recipe = tmp_path / "r.toml"
    recipe.write_text('[dissolve]\nNaCl = 0.01\n', encoding="utf-8")
    proc = _cli("sweep", str(recipe), "--add", "HCl 0.1 mol/L", "--to", "0 mL")
    assert proc.returncode == 2
    assert "ionwright: error: --to: '0 mL' must be more than zero" in proc.stderr
    assert "argument" not in proc.stderr
    proc = _cli("sweep", str(recipe), "--temperature", "5:x")
    assert "--temperature: '5:x' must be two numbers A:B" in proc.stderr
    proc = _cli("buffer", "HEPES", "--pH", "7.4", "--conc", "0 mmol/L", "--titrant",
                "NaOH 1 mol/L")
    assert "ionwright: error: --conc: '0 mmol/L' must be more than zero" in proc.stderr
