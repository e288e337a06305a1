"""Check a constant-table file: alone (syntax, keys, units, sources) and on top of other
tables (known names, element and charge balance), listing every problem, not only the
first. ``ionwright tables check`` prints what :func:`check_table` finds.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..chemistry._records import ConstantTable
from ..chemistry._tableset import KINDS as SECTIONS
from ..chemistry._tableset import TableSet
from ..data._loader import load_table, parse_table, tomllib
from ..data._text import read_utf8
from ..errors import TableError
from ..inputs._recipe import DEFAULT_TABLES
from ..plugins._registry import Registry, build_table, default_registry
from ._provenance import describe_override

SINGULAR = {"components": "component", "species": "species", "solids": "solid",
            "gases": "gas", "reagents": "reagent"}
#: The tables a file is checked on top of, unless others are named: a recipe's default.
DEFAULT_CONTEXT = DEFAULT_TABLES


@dataclass(frozen=True)
class TableCheck:
    """What checking a table file found: every problem, and notes on a clean file (its
    entry counts, what it uses from the context tables, what it overrides)."""

    path: str
    problems: tuple[str, ...]
    notes: tuple[str, ...]

    @property
    def ok(self) -> bool:
        return not self.problems


def check_table(path: str | Path, context: Sequence[str] | None = None,
                registry: Registry | None = None) -> TableCheck:
    """Check the table file *path*, alone and on top of the *context* tables (names the
    registry knows, or paths; default: a recipe's default tables). Raises :class:`TableError` when a
    context table itself cannot be read."""
    registry = registry or default_registry()
    tables = [_context_table(name, registry) for name in (context or DEFAULT_CONTEXT)]
    problems, notes = check_file(Path(path), tables)
    return TableCheck(str(path), tuple(problems), tuple(notes))


def _context_table(name: str, registry: Registry) -> ConstantTable:
    if name in registry.tables:
        return registry.tables[name].load()
    return load_table(name)


def check_file(path: Path, context: Sequence) -> tuple[list[str], list[str]]:
    """(problems, notes) of table file *path*, alone and on top of the *context* tables.

    Entries that pass the file's own checks are also checked against the context (known
    names, element and charge balance), so one run lists every problem.
    """
    try:
        text = read_utf8(path, lambda problem, hint: TableError(str(path), [f"{problem}; {hint}"]))
    except TableError as exc:
        return exc.problems, []
    problems: list[str] = []
    try:
        table = parse_table(text, origin=str(path))
    except TableError as exc:
        if any(p.startswith("TOML syntax error") for p in exc.problems):
            return duplicate_entries(text) or exc.problems, []
        problems = exc.problems
        table = _valid_part(text, str(path))
        if table is None:
            return problems, []
    below = [t for t in context if t.name != table.name]
    try:
        merged = TableSet([*below, table])
    except TableError as exc:
        return problems + exc.problems, []
    if problems:
        return problems, []
    counts = ", ".join(f"{n} {s if n != 1 else SINGULAR[s]}" for s in SECTIONS
                       if (n := len(getattr(table, s))))
    notes = [f"table {table.name!r}: {counts or 'no entries'}"]
    own = {n for s in ("components", "species") for n in getattr(table, s)}
    borrowed = sorted({name for s in ("species", "solids", "gases", "reagents")
                       for record in getattr(table, s).values()
                       for name in (getattr(record, "reaction", None) or record.makes or ())
                       if name not in own})
    if borrowed:
        providers = [t.name for t in below
                     if any(n in t.components or n in t.species for n in borrowed)]
        notes.append(f"uses from {', '.join(providers)}: {', '.join(borrowed)}")
    notes += [f"overrides: {describe_override(ov)}" for ov in merged.overrides
              if ov.new.table == table.name]
    return [], notes


def _valid_part(text: str, origin: str):
    """The entries of *text* that pass the loader's checks alone, for the context check.

    An entry with a bad value (a unit slip, no source) still takes part through its
    skeleton (formula and reaction only), so that its balance is checked too and the
    entries built on it do not report a missing name.
    """
    data = tomllib.loads(text)
    header: dict[str, Any] = {k: data[k] for k in ("about", "sources") if k in data}
    kept: dict[str, dict] = {}
    for section in SECTIONS:
        entries = data.get(section)
        for name, entry in (entries.items() if isinstance(entries, dict) else ()):
            for candidate in (entry, _skeleton(section, entry)):
                try:
                    build_table({**header, section: {name: candidate}}, origin)
                except TableError:
                    continue
                kept.setdefault(section, {})[name] = candidate
                break
    try:
        return build_table({**header, **kept}, origin)
    except TableError:  # the header itself is broken: nothing more can be checked
        return None


_SKELETON_KEYS = {"components": ("formula",), "species": ("formula", "from"),
                  "solids": ("formula", "dissolves_to"), "gases": ("formula", "dissolves_to"),
                  "reagents": ("formula", "makes")}


def _skeleton(section: str, entry) -> dict:
    """Only what the balance check needs from *entry*, with placeholder value and source."""
    if not isinstance(entry, dict):
        return {}
    out = {k: entry[k] for k in _SKELETON_KEYS[section] if k in entry}
    if section in ("species", "solids", "gases"):
        out["log10_k"] = 0.0
    return {**out, "source": "(placeholder for the balance check)"}


_HEADER = re.compile(r"^\s*\[(?!\[)(?P<key>[^\]]+)\]\s*(#.*)?$")
_KEY_LINE = re.compile(r"""^\s*(?P<key>(?:"[^"]*"|'[^']*'|[A-Za-z0-9_\-]+)"""
                       r"""(?:\s*\.\s*(?:"[^"]*"|'[^']*'|[A-Za-z0-9_\-]+))*)\s*=""")
_KEY_PART = re.compile(r""""([^"]*)"|'([^']*)'|([A-Za-z0-9_\-]+)""")


def duplicate_entries(text: str) -> list[str]:
    """Every entry or key defined twice in TOML *text*, with both line numbers.

    TOML rejects duplicates itself but names only a line; this names the entry. It
    reads table headers and ``key =`` lines, skipping multi-line strings and arrays.
    """
    seen: dict[tuple[str, ...], int] = {}
    problems = []
    table: tuple[str, ...] = ()
    in_string = False
    depth = 0
    for number, line in enumerate(text.splitlines(), start=1):
        if line.count('"""') % 2 == 1 or line.count("'''") % 2 == 1:
            in_string = not in_string
            continue
        if in_string:
            continue
        if depth > 0:
            depth += _bracket_balance(line)
            continue
        header = _HEADER.match(line)
        if header:
            table = _key_parts(header.group("key"))
            repeated = _seen_before(seen, table, number, header=True)
            if repeated:  # keys below a repeated header belong to that second copy
                problems += repeated
                table = (*table, f"(copy at line {number})")
            continue
        key = _KEY_LINE.match(line)
        if key:
            problems += _seen_before(seen, table + _key_parts(key.group("key")), number)
            depth = max(_bracket_balance(line[key.end():]), 0)
    return problems


def _key_parts(key: str) -> tuple[str, ...]:
    return tuple(next(g for g in m.groups() if g is not None) for m in _KEY_PART.finditer(key))


def _bracket_balance(text: str) -> int:
    text = re.sub(r'"[^"]*"|\'[^\']*\'|#.*$', "", text)
    return text.count("[") + text.count("{") - text.count("]") - text.count("}")


def _seen_before(seen: dict, path: tuple[str, ...], number: int, header: bool = False) -> list[str]:
    if path not in seen:
        seen[path] = number
        return []
    first = seen[path]
    if len(path) == 2 and path[0] in SINGULAR:
        what = f"{SINGULAR[path[0]]} {path[1]!r} is defined twice"
    elif len(path) > 2 and path[0] in SINGULAR:
        what = f"{SINGULAR[path[0]]} {path[1]!r}: {'.'.join(path[2:])} is given twice"
    else:
        what = f"[{'.'.join(path)}] is given twice" if header else f"{'.'.join(path)} is given twice"
    return [f"duplicate: {what} (line {first} and line {number}); TOML allows each once: "
            f"merge them or delete one"]

