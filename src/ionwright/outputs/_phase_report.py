"""Solids and gases of a result, for its JSON object and its text report."""

from __future__ import annotations

from typing import Any

from ._speciation import Speciation


def phase_summary(result: Speciation) -> dict[str, dict[str, Any]]:
    """The ``phases`` entry of a result's JSON (empty for a recipe without phases)."""
    return dict(getattr(result, "phases", {}) or {})


def phase_lines(result: Speciation) -> list[str]:
    """Lines of the text report on solids and gases (none for a recipe without phases)."""
    phases = phase_summary(result)
    if not phases:
        return []
    lines = ["", "solids and gases (per kg of water; + into solution, − out of it)"]
    for name, p in phases.items():
        amount = f"{p['into_solution_mol_per_kg']:+11.4e} mol/kg"
        if p["kind"] == "gas":
            lines.append(f"  {name:<18}{p['partial_pressure_atm']:10.3e} atm {amount}  "
                         f"{'taken up' if p['into_solution_mol_per_kg'] >= 0 else 'released'}")
            continue
        grams = f"({p['into_solution_g_per_kg']:+.4g} g/kg)"
        detail = p["state"]
        if "saturation_index" in p and p["state"] != "saturated":
            detail += f", SI {p['saturation_index']:.2f}"
        if "needs" in p:
            detail += f" (needs {', '.join(p['needs'])}{_unlinked(result, p['needs'])})"
        lines.append(f"  {name:<18}{p['mode']:<17}{amount} {grams:<16} {detail}")
    return lines


def _unlinked(result: Speciation, needs: list[str]) -> str:
    """Why a solid that needs the other form of a redox couple cannot form: with no
    redox level stated the oxidation states stay as given (Fe(II) is not oxidised to the
    Fe(III) of ferrihydrite), and how to state one; empty otherwise."""
    if (getattr(result, "redox", None) or {}).get("stated"):
        return ""
    couples = getattr(result.tables, "couples", {})
    present = set(result.system.components)
    partners = [name for name, couple in couples.items()
                if name in present and set(needs) & set(couple.reaction)]
    if not partners:
        return ""
    return (f": {', '.join(partners)} turns into it only under a stated redox level, such "
            "as [gases] O2 or [fix] pe, Eh, ORP or dissolved_oxygen")
