"""Read a constant table from TOML into frozen records, collecting every problem.

The loader checks what one file can check on its own (syntax, keys, types, formulas,
ranges, sources); references between tables and reaction balance are checked when
tables are merged (:mod:`ionwright.chemistry._tableset`). Names of components and
species, and the names reactions refer to, are written the way ionwright writes them
(:func:`~ionwright.chemistry._names.canonical_name`: ``Ca+2`` in a file becomes ``Ca2+``).
"""

from __future__ import annotations

import re
import sys
from pathlib import Path
from typing import Any, Callable

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from ..errors import FormulaError, TableError
from ._text import read_utf8
from ..chemistry._formula import parse_formula
from ..chemistry._names import canonical_name
from ..chemistry._records import Component, ConstantTable, LogK, Phase, Reagent, Species, frozen_map

FORMAT_VERSION = 1

_LOGK_KEYS = {"log10_k", "enthalpy_kJ", "heat_capacity_J", "analytic", "range_C", "uncertainty",
              "enthalpy_uncertainty_kJ", "function", "range_reason"}
_COMMON = {"source", "from_memory", "note", "formula"}
_ALLOWED = {
    "components": _COMMON | {"ion_size", "tj_a", "tj_b", "setschenow"},
    "species": _COMMON | _LOGK_KEYS | {"from", "ion_size", "tj_a", "tj_b", "setschenow"},
    "solids": _COMMON | _LOGK_KEYS | {"dissolves_to"},
    "gases": _COMMON | _LOGK_KEYS | {"dissolves_to"},
    "reagents": _COMMON | {"makes", "aliases"},
    "couples": _COMMON | _LOGK_KEYS | {"from"},
}
_SECTIONS = {"about", "sources", *_ALLOWED}
#: Sections whose entry names carry a charge, and are written the one way ionwright does.
_CHARGED_NAMES = {"components", "species", "couples"}
_TOML_POSITION = re.compile(r"\(at line (\d+), column (\d+)\)")


def load_table(path: str | Path) -> ConstantTable:
    """Load the table in file *path*; raise :class:`TableError` listing every problem."""
    path = Path(path)
    text = read_utf8(path, lambda problem, hint: TableError(str(path), [problem], hint))
    return parse_table(text, origin=str(path))


def parse_table(text: str, origin: str) -> ConstantTable:
    """Parse TOML *text* of a table found at *origin* (a path or a plugin resource)."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        where = _TOML_POSITION.search(str(exc))
        at = f"line {where.group(1)}, column {where.group(2)}" if where else "unknown line"
        raise TableError(origin, [f"TOML syntax error at {at}: "
                                  f"{_TOML_POSITION.sub('', str(exc)).strip()}"]) from None
    except RecursionError:
        raise TableError(origin, ["nested too deeply to read (arrays or tables inside each "
                                  "other thousands of levels deep)"],
                         "a constant table needs no nested arrays: check that this is the "
                         "file you meant") from None
    return _Builder(data, origin).build()


class _Builder:
    """Turns the parsed TOML mapping into records, gathering problems as it goes."""

    def __init__(self, data: dict[str, Any], origin: str) -> None:
        self.data, self.origin = data, origin
        self.problems: list[str] = []
        about = data.get("about", {})
        self.name: str = about.get("name", "") if isinstance(about, dict) else ""
        self.sources: dict[str, str] = {}

    def build(self) -> ConstantTable:
        self._about()
        self._sources()
        built = {section: self._section(section, factory) for section, factory in (
            ("components", self._component), ("species", self._species),
            ("solids", self._phase("solid")), ("gases", self._phase("gas")),
            ("reagents", self._reagent), ("couples", self._couple))}
        if self.problems:
            raise TableError(self.origin, self.problems)
        return ConstantTable(
            name=self.name, origin=self.origin, about=frozen_map(self.data["about"]),
            sources=frozen_map(self.sources),
            **{k: frozen_map(v) for k, v in built.items()},
            counts=frozen_map({k: len(v) for k, v in built.items()}))

    # -- header -----------------------------------------------------------------------
    def _about(self) -> None:
        for section in self.data:
            if section not in _SECTIONS:
                self.problems.append(f"unknown section [{section}]; sections are "
                                     f"{', '.join(sorted(_SECTIONS))}")
        about = self.data.get("about")
        if not isinstance(about, dict):
            self.problems.append("missing [about] section with name and format_version")
            self.data["about"] = {}
            return
        if not isinstance(self.name, str) or not self.name.strip():
            self.problems.append("[about] needs name = \"...\" (the name recipes use)")
            self.name = "?"
        version = about.get("format_version")
        if version != FORMAT_VERSION:
            self.problems.append(f"[about] format_version = {version!r}; this ionwright "
                                 f"reads format_version = {FORMAT_VERSION}")

    def _sources(self) -> None:
        sources = self.data.get("sources", {})
        if not isinstance(sources, dict):
            self.problems.append("[sources] must be a table of key = \"citation\"")
            return
        for key, citation in sources.items():
            if not isinstance(citation, str) or not citation.strip():
                self.problems.append(f"[sources] {key}: the citation must be a non-empty string")
            else:
                self.sources[key] = citation

    # -- entries ----------------------------------------------------------------------
    def _section(self, section: str, factory: Callable[[str, dict], Any]) -> dict[str, Any]:
        entries = self.data.get(section, {})
        if not isinstance(entries, dict):
            self.problems.append(f"[{section}] must be a table of entries")
            return {}
        out: dict[str, Any] = {}
        spelled: dict[str, str] = {}
        for given, entry in entries.items():
            name = canonical_name(given) if section in _CHARGED_NAMES else given
            where = f"{section[:-1] if section != 'species' else 'species'} {name!r}"
            if name in spelled:
                self.problems.append(f"{where}: written both {spelled[name]!r} and {given!r}; "
                                     f"keep one")
                continue
            spelled[name] = given
            if not isinstance(entry, dict):
                self.problems.append(f"{where}: must be a table, got {entry!r}")
                continue
            unknown = set(entry) - _ALLOWED[section]
            if unknown:
                self.problems.append(f"{where}: unknown key(s) {', '.join(sorted(unknown))}; "
                                     f"allowed: {', '.join(sorted(_ALLOWED[section]))}")
                continue
            n_before = len(self.problems)
            self._check_source(where, entry)
            try:
                record = factory(name, entry)
            except TableError as exc:
                self.problems.extend(exc.problems)
                continue
            if record is not None and len(self.problems) == n_before:
                out[name] = record
        return out

    def _check_source(self, where: str, entry: dict) -> None:
        source = entry.get("source")
        if not isinstance(source, str) or not source.strip():
            self.problems.append(f"{where}: missing source = \"KEY\" (a key of [sources] "
                                 f"or a full citation)")

    def _formula(self, where: str, name: str, entry: dict):
        text = entry.get("formula", name)
        try:
            return parse_formula(text)
        except FormulaError as exc:
            how = "" if "formula" in entry else " (the name is not a formula: add formula = \"...\")"
            self.problems.append(f"{where}: {exc.problem} in formula {text!r}{how}")
            return None

    def _number(self, where: str, entry: dict, key: str, required: bool = False):
        value = entry.get(key)
        if value is None:
            if required:
                self.problems.append(f"{where}: missing {key}")
            return None
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            self.problems.append(f"{where}: {key} = {value!r} must be a number")
            return None
        return float(value)

    def _stoichiometry(self, where: str, entry: dict, key: str) -> dict[str, float] | None:
        value = entry.get(key)
        if not isinstance(value, dict) or not value:
            self.problems.append(f"{where}: {key} must be a table of name = coefficient")
            return None
        bad = [k for k, v in value.items()
               if isinstance(v, bool) or not isinstance(v, (int, float)) or v == 0]
        if bad:
            self.problems.append(f"{where}: {key} coefficient of {bad[0]!r} must be a non-zero "
                                 f"number, got {value[bad[0]]!r}")
            return None
        out: dict[str, float] = {}
        for k, v in value.items():
            name = canonical_name(k)
            if name in out:
                self.problems.append(f"{where}: {key} names {name!r} twice (as {k!r} too)")
                return None
            out[name] = float(v)
        return out

    def _logk(self, where: str, entry: dict) -> LogK | None:
        log10_k = self._number(where, entry, "log10_k", required=True)
        dh = self._number(where, entry, "enthalpy_kJ")
        dcp = self._number(where, entry, "heat_capacity_J")
        unc = self._number(where, entry, "uncertainty")
        dh_unc = self._number(where, entry, "enthalpy_uncertainty_kJ")
        analytic = _number_list(entry.get("analytic"))
        range_c = _number_list(entry.get("range_C"))
        if entry.get("analytic") is not None and analytic is None:
            self.problems.append(f"{where}: analytic must be a list of numbers [a, b, c, d, e]")
        if entry.get("range_C") is not None and (range_c is None or len(range_c) != 2):
            self.problems.append(f"{where}: range_C must be [low, high] in °C")
            range_c = None
        if log10_k is None:
            return None
        function = entry.get("function")
        if function is not None and not isinstance(function, str):
            self.problems.append(f"{where}: function must be a name such as \"water ionization\"")
            function = None
        span = None if range_c is None else (range_c[0], range_c[1])
        reason = entry.get("range_reason")
        if reason is not None and (not isinstance(reason, str) or span is None):
            self.problems.append(f"{where}: range_reason must be text, beside a range_C")
            reason = None
        record = LogK(log10_k, dh, dcp, analytic, span, unc, function, dh_unc, reason)
        problems = record.problems(where)
        self.problems.extend(problems)
        return None if problems else record

    def _component(self, name: str, entry: dict) -> Component | None:
        where = f"component {name!r}"
        formula = self._formula(where, name, entry)
        if formula is None:
            return None
        return Component(
            name=name, formula=entry.get("formula", name), charge=formula.charge,
            elements=frozen_map(formula.elements), table=self.name,
            source=entry.get("source", ""), ion_size=self._number(where, entry, "ion_size"),
            tj_a=self._number(where, entry, "tj_a"), tj_b=self._number(where, entry, "tj_b"),
            setschenow=self._number(where, entry, "setschenow"),
            from_memory=bool(entry.get("from_memory", False)), note=entry.get("note", ""))

    def _species(self, name: str, entry: dict, kind: str = "species") -> Species | None:
        where = f"{kind} {name!r}"
        formula = self._formula(where, name, entry)
        reaction = self._stoichiometry(where, entry, "from")
        logk = self._logk(where, entry)
        if formula is None or reaction is None or logk is None:
            return None
        return Species(
            name=name, formula=entry.get("formula", name), charge=formula.charge,
            elements=frozen_map(formula.elements), reaction=frozen_map(reaction), logk=logk,
            table=self.name, source=entry.get("source", ""),
            ion_size=self._number(where, entry, "ion_size"),
            tj_a=self._number(where, entry, "tj_a"), tj_b=self._number(where, entry, "tj_b"),
            setschenow=self._number(where, entry, "setschenow"),
            from_memory=bool(entry.get("from_memory", False)), note=entry.get("note", ""))

    def _couple(self, name: str, entry: dict) -> Species | None:
        """A redox couple: component *name* as a species formed from its oxidised form and
        electrons, used only when a recipe states a redox level (chemistry/_redox.py)."""
        return self._species(name, entry, "couple")

    def _phase(self, kind: str) -> Callable[[str, dict], Phase | None]:
        def build(name: str, entry: dict) -> Phase | None:
            where = f"{kind} {name!r}"
            formula = self._formula(where, name, entry)
            reaction = self._stoichiometry(where, entry, "dissolves_to")
            logk = self._logk(where, entry)
            if formula is None or reaction is None or logk is None:
                return None
            return Phase(kind=kind, name=name, formula=entry.get("formula", name),
                         elements=frozen_map(formula.elements), reaction=frozen_map(reaction),
                         logk=logk, table=self.name, source=entry.get("source", ""),
                         from_memory=bool(entry.get("from_memory", False)),
                         note=entry.get("note", ""))
        return build

    def _reagent(self, name: str, entry: dict) -> Reagent | None:
        where = f"reagent {name!r}"
        if "formula" not in entry:
            self.problems.append(f"{where}: missing formula")
            return None
        formula = self._formula(where, name, entry)
        if formula is None:
            return None
        makes = self._stoichiometry(where, entry, "makes") if "makes" in entry else None
        aliases = entry.get("aliases", [])
        if not isinstance(aliases, list) or not all(isinstance(a, str) for a in aliases):
            self.problems.append(f"{where}: aliases must be a list of names")
            aliases = []
        return Reagent(name=name, formula=entry["formula"],
                       elements=frozen_map(formula.elements), makes=None if makes is None else frozen_map(makes), table=self.name,
                       source=entry.get("source", ""), aliases=tuple(aliases),
                       note=entry.get("note", ""))


def _number_list(value: Any) -> tuple[float, ...] | None:
    if not isinstance(value, list) or not all(
            isinstance(v, (int, float)) and not isinstance(v, bool) for v in value):
        return None
    return tuple(float(v) for v in value)
