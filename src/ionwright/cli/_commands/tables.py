"""``ionwright tables list|show|check``: the constant tables ionwright can see, and checks.

``list`` shows every registered table (name, where it comes from, entry counts), the
activity models, and every plugin problem or name conflict. ``show NAME`` prints a
table's entries with their sources, or, for a species/solid/gas/component/reagent name,
its definition in every table that has it; ``show reagents`` (or species, solids,
gases, components) lists every entry of that kind.
``check FILE...`` checks each table file on its own (syntax, duplicate entries, keys,
units, ranges, sources) and in the context of the default tables (references and
balance), lists every problem, and exits 0 only when every file is clean.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

SECTIONS = ("components", "species", "solids", "gases", "reagents")
SINGULAR = {"components": "component", "species": "species", "solids": "solid",
            "gases": "gas", "reagents": "reagent", "couples": "couple"}
#: shown by `tables show` after the sections: redox couples, used at a stated redox level
COUPLES = "couples"
REAGENT_LAYER = "reagents:"


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "tables", help="list, show and check constant tables",
        description="List the constant tables ionwright can see, show their entries with "
        "sources, and check table files before use.")
    sub = parser.add_subparsers(dest="tables_command", required=True, metavar="ACTION")
    listing = sub.add_parser("list", help="every registered table: name, origin, counts")
    listing.set_defaults(run=run_list)
    show = sub.add_parser("show", help="a table's entries, or where a name is defined",
                          description="NAME is a table name or file (its entries with "
                          "sources); 'reagents', 'species', 'solids', 'gases' or 'components' "
                          "(every entry of that kind); or a species, solid, gas, component "
                          "or reagent name (its definition in every table).")
    show.add_argument("name", metavar="NAME-OR-SPECIES")
    show.set_defaults(run=run_show)
    check = sub.add_parser("check", help="check table files; exit 0 only when all are clean",
                           description="Check each file alone (TOML syntax, duplicate "
                           "entries, keys, units, ranges, sources) and together with the "
                           "context tables (unknown components, element and charge balance).")
    check.add_argument("files", nargs="+", metavar="FILE")
    check.add_argument("--with", dest="context", action="append", metavar="TABLE",
                       help="context table (repeatable; default: the recipe default, core)")
    check.set_defaults(run=run_check)


# -- list ------------------------------------------------------------------------------
def run_list(args: argparse.Namespace) -> int:
    from ...plugins._registry import default_registry

    registry = default_registry()
    rows = []
    broken: list[tuple[str, str]] = []
    for name, offer in registry.tables.items():
        table, problem = _load(offer)
        counts = ("/".join(str(len(getattr(table, s))) for s in SECTIONS) if table
                  else "cannot be read")
        where = _provider(registry, offer.provider)  # a table file's path is in its label
        if registry.describe(offer.provider).startswith("plugin"):
            where += f": {offer.source}"
        rows.append((name, counts, where))
        if problem:
            broken.append((name, problem))
    for provider, layer in registry.reagent_layers.items():
        rows.append((layer.name, f"0/0/0/0/{len(layer.reagents)}",
                     f"plugin {provider!r}: register_reagents()"))
    width = max(len(r[0]) for r in rows) + 2
    print(f"{'table':<{width}}{'entries*':<22}from")
    for name, counts, origin in rows:
        print(f"{name:<{width}}{counts:<22}{origin}")
    print("* components/species/solids/gases/reagents")
    print("\nactivity models: " + ", ".join(
        f"{n} ({_provider(registry, registry.owner('activity model', n))})"
        for n in registry.models))
    _print_environment(registry)
    for name, problem in broken:
        print(f"\ntable {name!r} cannot be read:\n{problem}", file=sys.stderr)
    for p in registry.problems:
        print(f"\nplugin problem: {p.provider}: {p.problem}", file=sys.stderr)
    if registry.problems:
        print("  (solves refuse to run until each is fixed, or excluded with "
              "IONWRIGHT_EXCLUDE_PLUGINS=NAME)", file=sys.stderr)
    return 1 if broken or registry.problems else 0


def _print_environment(registry) -> None:
    """The per-user folder, IONWRIGHT_TABLES, exclusions and name conflicts."""
    from importlib.metadata import entry_points

    from ...plugins._registry import (ENTRY_POINT_GROUP, EXCLUDE_VAR, NO_PLUGINS_VAR, TABLES_VAR,
                           excluded_names, switched_on, user_tables_dir)

    folder = user_tables_dir()
    print(f"per-user tables folder: {folder}"
          + (" (off: IONWRIGHT_NO_PLUGINS)" if switched_on(os.environ, NO_PLUGINS_VAR)
             else "" if folder.is_dir() else " (none)"))
    if os.environ.get(TABLES_VAR):
        print(f"{TABLES_VAR}: {os.environ[TABLES_VAR]}")
    excluded = excluded_names(os.environ)
    if excluded:
        known = {ep.name for ep in entry_points(group=ENTRY_POINT_GROUP)}
        for name in sorted(excluded):
            what = "an installed plugin" if name in known else "a table file, or nothing"
            print(f"excluded by {EXCLUDE_VAR}: {name} ({what})")
    for c in registry.conflicts:
        print(f"conflict: {c.kind} {c.name!r} is registered by {registry.describe(c.replaced)} "
              f"and {registry.describe(c.kept)}; the latter is used")


def _provider(registry, provider: str) -> str:
    from ...plugins._registry import BUILTIN

    return "ionwright (bundled)" if provider == BUILTIN else registry.describe(provider)


def _load(offer):
    """(table, None) or (None, the problems as text) for a registered table offer."""
    from ...errors import IonwrightError

    try:
        return offer.load(), None
    except IonwrightError as exc:
        return None, str(exc)


# -- show ------------------------------------------------------------------------------
def run_show(args: argparse.Namespace) -> int:
    from ...errors import UnknownNameError
    from ...plugins._registry import default_registry
    from ...data._loader import load_table

    registry = default_registry()
    name = args.name
    if name in SECTIONS:
        return _show_section(registry, name)
    if name in registry.tables:
        table, problem = _load(registry.tables[name])
        if problem:
            print(problem, file=sys.stderr)
            return 1
        _show_table(table)
        return 0
    if name.endswith(".toml") or Path(name).is_file():
        _show_table(load_table(name))
        return 0
    tables, unreadable = _all_tables(registry)
    found = [(t, s, rec) for t in tables for s, rec in _definitions(t, name)]
    if not found:
        known = {n for t in tables for s in SECTIONS for n in getattr(t, s)} | set(registry.tables)
        raise UnknownNameError("table, species, solid, gas, component or reagent", name, known,
                               "`ionwright tables list` shows the tables")
    for table, section, record in found:
        print(f"{SINGULAR[section]} {record.name!r} in table {table.name!r} ({table.origin})")
        print("  " + _describe(section, record))
        print(f"  source: {table.citation(record.source)}"
              + ("  [from memory: verify]" if getattr(record, "from_memory", False) else ""))
    if len({t.name for t, section, _ in found if section != COUPLES}) > 1:
        print(f"\n{name!r} is defined in {len(found)} tables; in a recipe, the table listed "
              f"later in `tables = [...]` wins (and the result warns about the override)")
    for table_name, problem in unreadable:
        print(f"\n(table {table_name!r} could not be read and was not searched:\n{problem})",
              file=sys.stderr)
    return 0


def _definitions(table, name: str):
    """(section, record) of every entry of *table* called *name* (reagents also by alias;
    components and species in any spelling of their charge)."""
    from ...chemistry._names import canonical_name

    for section in (*SECTIONS, COUPLES):
        records = getattr(table, section, {})
        if name in records:
            yield section, records[name]
        elif section in ("components", "species") and canonical_name(name) in records:
            yield section, records[canonical_name(name)]
        elif section == "reagents":
            for reagent in records.values():
                if name.casefold() in {a.casefold() for a in (reagent.name, *reagent.aliases)}:
                    yield section, reagent


def _all_tables(registry):
    tables, unreadable = [], []
    for name, offer in registry.tables.items():
        table, problem = _load(offer)
        if table is None:
            unreadable.append((name, problem))
        else:
            tables.append(table)
    return [*tables, *registry.reagent_layers.values()], unreadable


def _show_table(table) -> None:
    about = dict(table.about)
    print(f"table {table.name!r}: {about.get('title', '')}")
    print(f"  file: {table.origin}")
    for key in ("licence", "standard_state"):
        if key in about:
            print(f"  {key}: {about[key]}")
    for section in (*SECTIONS, COUPLES):
        records = getattr(table, section, {})
        if not records:
            continue
        used = " (used only when a recipe states a redox level)" if section == COUPLES else ""
        print(f"\n{section} ({len(records)}){used}")
        for record in records.values():
            memory = " [from memory]" if getattr(record, "from_memory", False) else ""
            print(f"  {record.name:<24}{_describe(section, record)}  "
                  f"[{record.source}]{memory}")
    if table.sources:
        print("\nsources")
        for key, citation in table.sources.items():
            print(f"  {key}: {citation}")


def _describe(section: str, record) -> str:
    """One line: the reaction and log K for species/phases, formula and makes otherwise."""
    if section == "components":
        size = f", ion size {record.ion_size:g} Å" if record.ion_size is not None else ""
        return f"component {record.formula} (charge {record.charge:+d}){size}".replace(
            "charge +0", "neutral")
    if section == "reagents":
        makes = (_terms(record.makes) if record.makes is not None
                 else "split from the formula")
        aliases = f"; aliases {', '.join(record.aliases)}" if record.aliases else ""
        return f"{record.formula} -> {makes}{aliases}"
    from ...outputs._provenance import equation

    logk = record.logk
    extra = "".join([
        f" ± {logk.uncertainty:g}" if logk.uncertainty is not None else "",
        f", ΔH° {logk.enthalpy_kJ:g} kJ/mol" if logk.enthalpy_kJ is not None else "",
        f", ΔCp° {logk.heat_capacity_J:g} J/(mol K)" if logk.heat_capacity_J is not None else "",
        ", analytic" if logk.analytic is not None else "",
        f", {logk.range_C[0]:g}–{logk.range_C[1]:g} °C" if logk.range_C else ""])
    shown = "species" if section == COUPLES else section   # a couple forms its component
    return f"{equation(shown, record)}; log K {logk.log10_k:g}{extra}"


def _terms(amounts) -> str:
    """'2 Na+ + H4SiO4 − 2 H+' from a mapping of name to coefficient."""
    text = ""
    for name, c in amounts.items():
        sign = " − " if c < 0 else " + "
        size = "" if abs(c) == 1 else f"{abs(c):g} "
        text += f"{sign}{size}{name}" if text else f"{'−' if c < 0 else ''}{size}{name}"
    return text


def _show_section(registry, section: str) -> int:
    """Every entry of one kind (e.g. all reagents) in every registered table."""
    from ...plugins._registry import reagent_needs
    from ...inputs._recipe import DEFAULT_TABLES

    tables, unreadable = _all_tables(registry)
    defined: dict[str, list[str]] = {}
    for t in tables:
        for n in (*t.components, *t.species):
            defined.setdefault(n, []).append(t.name)
    default = {n for n, where in defined.items() if set(where) & set(DEFAULT_TABLES)}
    heading = "formula -> makes" if section == "reagents" else "definition"
    print(f"{SINGULAR[section]:<34}{'table':<22}{heading}")
    for table in tables:
        for record in getattr(table, section).values():
            print(f"{record.name:<34}{table.name:<22}{_describe(section, record)}")
            needs = reagent_needs(record, default) if section == "reagents" else []
            if table.name.startswith(REAGENT_LAYER) and needs:
                where = "; ".join(f"{n} (in {', '.join(defined.get(n, ['no registered table']))})"
                                  for n in needs)
                print(f"{'':<34}offered only when the recipe's tables define {where}")
    for table_name, problem in unreadable:
        print(f"\n(table {table_name!r} could not be read:\n{problem})", file=sys.stderr)
    return 0


# -- check -----------------------------------------------------------------------------
def run_check(args: argparse.Namespace) -> int:
    from ...outputs._table_check import check_table

    clean = True
    for file in args.files:
        found = check_table(file, context=args.context or None)
        if found.problems:
            clean = False
            print(f"{file}: {len(found.problems)} problem(s)")
            print("\n".join(f"  - {p}" for p in found.problems))
        else:
            print(f"{file}: ok; {found.notes[0]}")
            for line in found.notes[1:]:
                print(f"  {line}")
    if not clean:
        print("hint: fix the problems listed, then run `ionwright tables check` on the file "
              "again", file=sys.stderr)
    return 0 if clean else 1
