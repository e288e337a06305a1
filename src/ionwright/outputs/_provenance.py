"""Provenance of a result: which constant the solve used, from which table and source.

:func:`constants_used` is the ``"constants_used"`` list of the JSON result: one entry per
species, solid or gas whose log K entered the solve, with its value at 25 °C and at the
solve's temperature, how it was carried to that temperature, the table and full
citation it came from, and every entry of an earlier table it replaced.
:func:`override_warnings` puts each such replacement in the result warnings (never
silent); :func:`constants_section` and :func:`explain` are the text forms.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from ..core._system import log10_k_at
from ..chemistry._tableset import Override, TableSet
from ..notices import CONSTANTS, Notice
from ._speciation import Speciation

KIND = {"species": "species", "solids": "solid", "gases": "gas", "components": "component",
        "reagents": "reagent"}
PLURAL = {"species": "species", "solid": "solids", "gas": "gases"}

# (label, record attribute or LogK attribute, unit) compared when one entry overrides another
_COMPARED = (("log K", "log10_k", ""), ("ΔH°", "enthalpy_kJ", " kJ/mol"),
             ("ΔCp°", "heat_capacity_J", " J/(mol K)"), ("analytic", "analytic", ""),
             ("range", "range_C", " °C"), ("reaction", "reaction", ""),
             ("formula", "formula", ""), ("ion size", "ion_size", " Å"),
             ("tj_a", "tj_a", " Å"), ("tj_b", "tj_b", " kg/mol"),
             ("setschenow", "setschenow", " kg/mol"), ("makes", "makes", ""),
             ("aliases", "aliases", ""))


def constants_used(result) -> list[dict[str, Any]]:
    """One entry per species/solid/gas constant *result*'s solve used, in order of use.

    Species are those of the solved system (including the entries a species is built
    from), solids those with a saturation index in the result.
    """
    t = np.array([result.temperature_C])
    tables: TableSet = result.tables
    out = []
    for section, name in _used_entries(result):
        record = getattr(tables, section)[name]
        out.append({
            "name": name,
            "kind": KIND[section],
            "reaction": equation(section, record),
            **_logk_fields(record, t),
            "uncertainty": record.logk.uncertainty,
            "range_C": None if record.logk.range_C is None else list(record.logk.range_C),
            "range_reason": record.logk.range_reason,
            "table": record.table,
            "table_origin": tables.table(record.table).origin,
            "source": tables.citation(record),
            "from_memory": bool(record.from_memory),
            "note": record.note,
            "overrides": [{"table": old.table, "table_origin": tables.table(old.table).origin,
                           **_logk_fields(old, t), "source": tables.citation(old),
                           "from_memory": bool(old.from_memory)}
                          for old in _replaced(tables, section, record)],
        })
    return out


def ion_pairs(result) -> dict[str, Any]:
    """The ``"ion_pairs"`` object of the JSON result: the activity model's rule, the
    complexes its solve formed and those it left out, each with the reason."""
    system = result.system
    components = set(system.components)
    return {
        "model": result.model.name,
        "rule": system.ion_pairs.summary,
        "formed": [name for name in system.species if name not in components],
        "left_out": [{"species": name, "reason": reason} for name, reason in system.left_out],
    }


def ion_pair_lines(result) -> list[str]:
    """Text form of :func:`ion_pairs`: what the model formed and what it left out, and why."""
    pairs = ion_pairs(result)
    lines = [f"complexes of activity model {pairs['model']}: {pairs['rule']}",
             f"  formed: {', '.join(pairs['formed']) or 'none'}"]
    by_reason: dict[str, list[str]] = {}
    for entry in pairs["left_out"]:
        by_reason.setdefault(entry["reason"], []).append(entry["species"])
    for reason, names in by_reason.items():
        lines.append(f"  left out: {', '.join(names)} ({reason})")
    return lines


def override_warnings(result: Speciation) -> list[Notice]:
    """A notice for every entry of the table set that replaces an earlier table's entry.

    Replacements the solve used are described one by one (old and new values);
    the others are named, grouped by the pair of tables.
    """
    used = set(_used_entries(result))
    used |= {("components", c) for c in result.system.components}
    used |= {("reagents", m.name) for m in result.makeups if m.how == "reagent"}
    out: list[Notice] = []
    unused: dict[tuple[str, str], list[str]] = {}
    for ov in result.tables.overrides:
        if (ov.kind, ov.name) in used:
            out.append(Notice(CONSTANTS, "override", describe_override(ov),
                              {"kind": ov.kind, "name": ov.name, "table": ov.new.table,
                               "replaces": ov.old.table}))
        else:
            unused.setdefault((ov.new.table, ov.old.table), []).append(
                f"{KIND[ov.kind]} {ov.name!r}")
    for (new, old), names in unused.items():
        entries = "entry" if len(names) == 1 else "entries"
        out.append(Notice(CONSTANTS, "override-unused",
                          f"table {new!r} also overrides {len(names)} {entries} of table "
                          f"{old!r} that this solve did not use: {', '.join(names)}",
                          {"table": new, "replaces": old, "count": len(names)}))
    return out


def describe_override(ov: Override) -> str:
    """'species 'X' from table 'B' overrides table 'A': log K 4.76 -> 4.8'."""
    changes = [f"{label} {_show(a, unit)} -> {_show(b, unit)}"
               for label, attr, unit in _COMPARED
               if (a := _field(ov.old, attr)) != (b := _field(ov.new, attr))]
    if not changes:
        changes = ["same values" + (f" (source {ov.old.source!r} -> {ov.new.source!r})"
                                    if ov.old.source != ov.new.source else "")]
    return (f"{KIND[ov.kind]} {ov.name!r} from table {ov.new.table!r} overrides table "
            f"{ov.old.table!r}: {', '.join(changes)}")


def constants_section(result) -> list[str]:
    """The short "constants" section of the text report: counts by table, overrides."""
    entries = constants_used(result)
    if not entries:
        return []
    lines = ["", f"constants ({len(entries)} log K at {result.temperature_C:g} °C; "
                 f"the explained listing gives each with its source)"]
    by_table: dict[str, dict[str, int]] = {}
    memory: dict[str, int] = {}
    for e in entries:
        counts = by_table.setdefault(e["table"], {})
        counts[e["kind"]] = counts.get(e["kind"], 0) + 1
        memory[e["table"]] = memory.get(e["table"], 0) + e["from_memory"]
    for table, counts in by_table.items():
        parts = ", ".join(f"{n} {kind if n == 1 else PLURAL[kind]}" for kind, n in counts.items())
        recalled = f" ({memory[table]} from memory)" if memory[table] else ""
        lines.append(f"  {table:<16}{parts}{recalled}")
    left_out = [name for name, _ in result.system.left_out]
    if left_out:
        lines.append(f"  not formed      {', '.join(left_out)} (the {result.model.name} "
                     f"model describes them in its activity coefficients)")
    for e in entries:
        for old in e["overrides"]:
            lines.append(f"  override        {e['name']}: log K {old['log10_k_25C']:g} "
                         f"({old['table']}) -> {e['log10_k_25C']:g} ({e['table']})")
    return lines


def explain(result) -> str:
    """Every constant of *result* with values, temperature method, table, source, overrides."""
    t = result.temperature_C
    lines = [f"activity model {result.model.name}: {result.model.title}; "
             f"{getattr(result.model, 'reference', '')}",
             f"tables (later override earlier): "
             f"{', '.join(f'{tb.name} ({tb.origin})' for tb in result.tables.tables)}",
             "", *ion_pair_lines(result), "",
             f"constants used (log10 K: formation for species, dissolution for solids "
             f"and gases; at 25 °C and at {t:g} °C)"]
    for e in constants_used(result):
        known = (f", known {e['range_C'][0]:g}–{e['range_C'][1]:g} °C" if e["range_C"] else "")
        known += f" ({e['range_reason']})" if e["range_reason"] else ""
        spread = f" ± {e['uncertainty']:g}" if e["uncertainty"] is not None else ""
        lines += ["", f"{e['name']} ({e['kind']}): {e['reaction']}",
                  f"  log K {e['log10_k_25C']:g}{spread} at 25 °C, {e['log10_k_at_T']:.4f} at "
                  f"{t:g} °C ({e['temperature_method']}){known}",
                  f"  table {e['table']} ({e['table_origin']})",
                  f"  source {e['source']}" + ("  [from memory: verify]" if e["from_memory"]
                                               else "")]
        if e["note"]:
            lines.append(f"  note {e['note']}")
        for old in e["overrides"]:
            lines.append(f"  overrides table {old['table']}: log K {old['log10_k_25C']:g} at "
                         f"25 °C, {old['log10_k_at_T']:.4f} at {t:g} °C "
                         f"({old['temperature_method']}); source {old['source']}"
                         + ("  [from memory]" if old["from_memory"] else ""))
    return "\n".join(lines)


def equation(section: str, record) -> str:
    """The reaction as an equation: formation for species, dissolution for solids and gases."""
    forward = {k: c for k, c in record.reaction.items() if c > 0}
    backward = {k: -c for k, c in record.reaction.items() if c < 0}
    if section == "species":
        return f"{_side(forward)} = {_side({record.name: 1.0, **backward})}"
    return f"{_side({record.name: 1.0, **backward})} = {_side(forward)}"


# -- helpers ---------------------------------------------------------------------------
def _used_entries(result) -> list[tuple[str, str]]:
    """(section, name) of every entry whose log K the solve used, in first-use order:
    the system's species, the solids with a saturation index, and the solids and gases
    the recipe equilibrated with (``result.phases``)."""
    seen: dict[tuple[str, str], None] = {}
    for res in result.system.resolved:
        for name, _, _ in res.terms:
            seen[("species", name)] = None
    phases = [("solids", name) for name in result.saturation_indices]
    phases += [("gases" if p.get("kind") == "gas" else "solids", name)
               for name, p in (getattr(result, "phases", None) or {}).items()]
    for section, phase in phases:
        terms = result.tables.resolve(phase, section).terms
        for i, (name, _, _) in enumerate(terms):  # the first term is the phase itself
            seen[(section if i == 0 else "species", name)] = None
    return list(seen)


def _logk_fields(record, t: np.ndarray) -> dict[str, Any]:
    logk = record.logk
    return {"log10_k_25C": logk.log10_k, "log10_k_at_T": float(log10_k_at(logk, t)[0]),
            "temperature_method": "none" if logk.method.startswith("none") else logk.method}


def _replaced(tables: TableSet, section: str, record) -> list:
    """The records *record* replaced, newest first (a chain when several tables override)."""
    out, current = [], record
    for ov in reversed(tables.overrides):
        if ov.kind == section and ov.name == record.name and ov.new is current:
            out.append(ov.old)
            current = ov.old
    return out


def _side(terms: Mapping[str, float]) -> str:
    return " + ".join(name if c == 1 else f"{c:g} {name}" for name, c in terms.items())


def _field(record, attr: str):
    value = getattr(record, attr, None)
    if value is None and hasattr(record, "logk"):
        value = getattr(record.logk, attr, None)
    return dict(value) if isinstance(value, Mapping) else value


def _show(value, unit: str) -> str:
    if value is None:
        return "none"
    if isinstance(value, float):
        return f"{value:g}{unit}"
    if isinstance(value, dict):
        return _side(value) or "nothing"
    if isinstance(value, tuple):
        return "[" + ", ".join(f"{v:g}" if isinstance(v, float) else str(v) for v in value) + "]"
    return f"{value}{unit}"
