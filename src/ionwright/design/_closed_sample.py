"""A sample whose pH was measured or held, treated as a closed bottle by the design tools.

The engine's :meth:`~ionwright.engine._compiled.CompiledRecipe.closed` turns the fixed pH
into the protons it implies; this module words the note every tool adds when it does, so
that a titration, a dilution, a warming or a dose of an analysis says where its pH starts.
"""

from __future__ import annotations

from ..engine._compiled import CompiledRecipe
from ..notices import INPUT, Notice


def closed_sample_notes(bench: CompiledRecipe, doing: str, follows: str) -> list[Notice]:
    """The note for a tool that treats *bench*'s fixed pH as a closed sample's start (none
    when the recipe fixes no pH): the sample is *doing* ("titrated") and its pH follows
    *follows* ("titrant")."""
    if "pH" not in bench.recipe.fix:
        return []
    ph, t = bench.recipe.fix["pH"], bench.recipe.temperature_C
    return [Notice(INPUT, "closed-sample",
                   f"the sample is {doing} closed: the protons its pH {ph:g} implies at "
                   f"{t:g} °C stay in it with its totals, and the pH follows the {follows}", {"pH": ph, "temperature_C": t})]
