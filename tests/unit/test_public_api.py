"""The public surface: a curated ``__all__``, every name documented, internals private."""

from __future__ import annotations

import inspect
import subprocess
import sys

import pytest

import ionwright


def test_every_public_name_exists_and_says_what_it_is():
    for name in ionwright.__all__:
        obj = getattr(ionwright, name)
        if name == "__version__":
            continue
        assert inspect.getdoc(obj), f"ionwright.{name} has no docstring"


def test_the_design_tools_and_the_model_comparison_are_public():
    for name in ("design_buffer", "titration", "dilution", "temperature_series", "pH_series",
                 "compare_models", "target", "solve", "solve_batch", "Notice"):
        assert name in ionwright.__all__


def test_modules_behind_the_public_names_are_private():
    for name in ionwright.__all__:
        module = getattr(getattr(ionwright, name), "__module__", None) or ""
        inner = module.split(".")[2:] if module.startswith("ionwright.") else []
        assert all(part.startswith("_") for part in inner[-1:]), (name, module)


def test_importing_ionwright_loads_no_heavy_library():
    code = ("import sys, ionwright; print(sorted(m for m in sys.modules "
            "if m.split('.')[0] in ('scipy', 'pandas', 'matplotlib')))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.strip()
    assert out == "[]"


def test_species_are_found_by_any_spelling_and_unknown_ones_are_named():
    result = ionwright.solve({"dissolve": {"FeCl3": 0.001, "CaCl2": 0.001}})
    assert result.species_activity("Fe+3") == result.species_activity("Fe3+")
    assert result.species_molality("Ca++") == result.species_molality("Ca2+")
    with pytest.raises(ionwright.UnknownNameError, match="'Fe3\\+'"):
        result.species_molality("Fe+4")
