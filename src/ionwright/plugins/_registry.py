"""The plugin manager and the registry of tables, activity models and reagents it collects.

Built by a factory, not at import time, from the environment of that moment:

``IONWRIGHT_NO_PLUGINS=1``
    only ionwright's own plugin: no entry points and no per-user tables folder, for
    reproducible runs (tables a recipe names by path, and ``IONWRIGHT_TABLES``, still count).
``IONWRIGHT_TRACE_PLUGINS=1``
    print every plugin loaded and every hook called to stderr.
``IONWRIGHT_EXCLUDE_PLUGINS=NAME[,NAME...]``
    leave out these plugins (entry-point names) or table files (path or file name).
``IONWRIGHT_PLUGIN_CONFLICTS=warn|raise|ignore``
    what a name registered twice does: ``warn`` (default) lets the later registration win
    with a :class:`~ionwright.errors.PluginConflictWarning` naming both, ``raise`` stops
    with :class:`~ionwright.errors.PluginConflictError`, ``ignore`` lets the later win quietly.
``IONWRIGHT_TABLES=PATH[:PATH...]``
    table files, or folders of ``*.toml``, separated by :data:`os.pathsep`, registered by
    their ``[about] name`` (after the per-user folder ``user_config_dir("ionwright")/tables``).

Registration order, lowest first: ionwright's own plugin, entry points by name, the
per-user folder (files by name), ``IONWRIGHT_TABLES`` in order. A plugin or table file
that fails is recorded, never skipped: solves refuse to run, naming every failure, until
it is fixed or excluded explicitly.
"""

from __future__ import annotations

import os
import sys
import warnings
from collections.abc import Callable, Iterable, Iterator, Mapping
from contextlib import redirect_stdout
from dataclasses import dataclass, replace
from functools import lru_cache
from importlib.metadata import EntryPoint, entry_points
from ..data._parameter_tables import ParameterTable
try:
    from importlib.resources.abc import Traversable
except ImportError:  # Python 3.10
    from importlib.abc import Traversable
from pathlib import Path
from typing import Any

import pluggy

from . import _builtin as builtin_plugin
from ._guard import GuardedModel
from . import hookspecs
from ..errors import (BrokenPluginError, PluginConflictError, PluginConflictWarning,
                     PluginError, TableError, UnknownNameError)
from ..data._loader import FORMAT_VERSION, _Builder, load_table, parse_table
from ..data._text import NOT_UTF8_HINT, not_utf8
from ..chemistry._records import ConstantTable, Reagent, frozen_map

ENTRY_POINT_GROUP = "ionwright"
BUILTIN = "ionwright.builtin"
NO_PLUGINS_VAR = "IONWRIGHT_NO_PLUGINS"
TRACE_VAR = "IONWRIGHT_TRACE_PLUGINS"
EXCLUDE_VAR = "IONWRIGHT_EXCLUDE_PLUGINS"
CONFLICTS_VAR = "IONWRIGHT_PLUGIN_CONFLICTS"
TABLES_VAR = "IONWRIGHT_TABLES"
CONFLICT_POLICIES = ("warn", "raise", "ignore")
DEFAULT_CONFLICT_POLICY = "warn"
REAGENT_LAYER_PREFIX = "reagents:"
MODEL_ATTRIBUTES = ("name", "title", "max_ionic_strength", "reference", "bind")
_OFF_WORDS = {"", "0", "false", "no", "off"}


@dataclass(frozen=True)
class PluginProblem:
    """Something a plugin or table file got wrong, with who got it wrong."""

    provider: str  # entry-point name, or the path of a table file
    problem: str


@dataclass(frozen=True)
class Conflict:
    """A name registered twice; *kept* is the later registration, which is used."""

    kind: str
    name: str
    kept: str
    replaced: str


@dataclass
class TableOffer:
    """A table a plugin or file offers: where it comes from and, once read, the table."""

    name: str
    provider: str
    source: Any
    loaded: ConstantTable | None = None

    @property
    def origin(self) -> str:
        if isinstance(self.source, ConstantTable):
            return self.source.origin
        return str(self.source) if self.provider == BUILTIN else (
            f"{self.source} (plugin {self.provider!r})")

    def load(self) -> ConstantTable:
        """The table, read on first use; raise :class:`TableError` if it is malformed."""
        if self.loaded is None:
            table = self._read()
            if table.name != self.name:
                raise PluginError(self.provider, f"offers table {self.name!r} but the file "
                                  f"calls itself {table.name!r} in [about] name")
            self.loaded = table
        return self.loaded

    def _read(self) -> ConstantTable:
        if isinstance(self.source, ConstantTable):
            return self.source
        if isinstance(self.source, (str, Path)):
            return load_table(self.source)
        try:
            text = self.source.read_text(encoding="utf-8")
        except UnicodeDecodeError as exc:
            raise TableError(self.origin, [not_utf8(exc.object, exc.start)],
                             NOT_UTF8_HINT) from None
        return parse_table(text, origin=self.origin)


def switched_on(environ: Mapping[str, str], variable: str) -> bool:
    """True when the environment switch *variable* is set to anything but 0/false/no/off."""
    return environ.get(variable, "").strip().lower() not in _OFF_WORDS


def excluded_names(environ: Mapping[str, str]) -> set[str]:
    """Plugin names and table files listed in ``IONWRIGHT_EXCLUDE_PLUGINS``."""
    return {n.strip() for n in environ.get(EXCLUDE_VAR, "").split(",") if n.strip()}


def conflict_policy(value: str | None) -> str:
    """The conflict policy *value* (default ``warn``), checked against the allowed ones."""
    policy = (value or DEFAULT_CONFLICT_POLICY).strip().lower()
    if policy not in CONFLICT_POLICIES:
        raise UnknownNameError("plugin conflict policy", policy, CONFLICT_POLICIES,
                               f"{CONFLICTS_VAR} takes {', '.join(CONFLICT_POLICIES)}")
    return policy


def user_tables_dir() -> Path:
    """The per-user folder whose ``*.toml`` tables are registered by name."""
    from platformdirs import user_config_dir  # imported here: keeps `import ionwright` lean

    return Path(user_config_dir("ionwright")) / "tables"


def in_house_table_files(environ: Mapping[str, str] | None = None) -> list[tuple[Path, str]]:
    """(path, where it was named) of every in-house table file, in registration order."""
    env = os.environ if environ is None else environ
    found: list[tuple[Path, str]] = []
    if not switched_on(env, NO_PLUGINS_VAR):
        folder = user_tables_dir()
        if folder.is_dir():
            found += [(p, f"the per-user tables folder {folder}")
                      for p in sorted(folder.glob("*.toml"))]
    for entry in env.get(TABLES_VAR, "").split(os.pathsep):
        if not entry.strip():
            continue
        path = Path(entry.strip()).expanduser()
        if path.is_dir():
            found += [(p, f"folder {path} of {TABLES_VAR}") for p in sorted(path.glob("*.toml"))]
        else:
            found.append((path, TABLES_VAR))
    excluded = excluded_names(env)
    return [(p, how) for p, how in found if not _file_excluded(p, excluded)]


def _file_excluded(path: Path, excluded: set[str]) -> bool:
    return bool({str(path), path.name, str(path.resolve())} & excluded)


def _tracer(environ: Mapping[str, str]) -> Callable[[str], None]:
    if not switched_on(environ, TRACE_VAR):
        return lambda text: None
    return lambda text: print(f"ionwright plugins: {text}", file=sys.stderr)


def plugin_manager(problems: list[PluginProblem] | None = None,
                   environ: Mapping[str, str] | None = None) -> pluggy.PluginManager:
    """A fresh plugin manager: ionwright's own plugin and, unless switched off, entry points.

    A plugin that fails to import or declares a hook ionwright does not know is appended
    to *problems*; without a list it raises :class:`PluginError` at once.
    """
    env = os.environ if environ is None else environ
    trace = _tracer(env)
    manager = pluggy.PluginManager("ionwright")
    manager.add_hookspecs(hookspecs)
    manager.register(builtin_plugin, name=BUILTIN)
    if switched_on(env, NO_PLUGINS_VAR):
        trace(f"{NO_PLUGINS_VAR} is set: entry points not loaded")
        return manager
    excluded = excluded_names(env)
    for ep in sorted(entry_points(group=ENTRY_POINT_GROUP), key=lambda e: e.name):
        if ep.name in excluded:
            trace(f"entry point {ep.name!r} excluded by {EXCLUDE_VAR}")
            continue
        failure = _register(manager, ep)
        trace(f"entry point {ep.name!r} = {ep.value}: {failure or 'registered'}")
        if failure and problems is None:
            raise PluginError(ep.name, failure)
        if failure and problems is not None:
            problems.append(PluginProblem(ep.name, failure))
    return manager


def _register(manager: pluggy.PluginManager, ep: EntryPoint) -> str:
    """Import and register one entry point; the reason it failed, or '' on success."""
    try:
        with redirect_stdout(sys.stderr):  # what a plugin prints must not mix with --json
            plugin = ep.load()
    except Exception as exc:  # any import-time failure of third-party code, named below
        return f"failed to import ({ep.value}): {type(exc).__name__}: {exc}"
    try:
        manager.register(plugin, name=ep.name)
        manager.check_pending()
    except pluggy.PluginValidationError as exc:
        manager.unregister(name=ep.name)
        return f"declares a hook ionwright does not have: {exc}"
    except ValueError as exc:  # pluggy: name or object registered twice
        return f"cannot be registered: {exc}"
    return ""


class Registry:
    """Every table, activity model and reagent offered by the loaded plugins and files.

    Parameters
    ----------
    manager
        A plugin manager from :func:`plugin_manager`.
    problems
        Failures already met while loading plugins (kept, and reported on use).
    policy
        Conflict policy; default from ``IONWRIGHT_PLUGIN_CONFLICTS``, else ``warn``.
    table_files
        In-house table files to register; default :func:`in_house_table_files`.
    """

    def __init__(self, manager: pluggy.PluginManager, problems: Iterable[PluginProblem] = (),
                 policy: str | None = None, table_files: Iterable[Path] | None = None,
                 environ: Mapping[str, str] | None = None) -> None:
        env = os.environ if environ is None else environ
        self.manager = manager
        self.policy = conflict_policy(policy if policy is not None else env.get(CONFLICTS_VAR))
        self.problems: list[PluginProblem] = list(problems)
        self.conflicts: list[Conflict] = []
        self.tables: dict[str, TableOffer] = {}
        self.models: dict[str, Any] = {}
        self.reagent_layers: dict[str, ConstantTable] = {}
        self.parameter_tables: dict[str, ParameterTable] = {}
        self._owner: dict[tuple[str, str], str] = {}
        self._guarded: dict[str, GuardedModel] = {}
        self._files: set[str] = set()
        self._trace = _tracer(env)
        for provider, offered in self._call("register_tables"):
            for name, source in offered.items():
                self._offer_table(provider, name, source)
        for provider, offered in self._call("register_activity_models"):
            for name, model in offered.items():
                self._offer_model(provider, name, model)
        for provider, offered in self._call("register_reagents"):
            self._offer_reagents(provider, offered)
        for provider, offered in self._call("register_parameter_tables"):
            for name, table in offered.items():
                self._offer_parameter_table(provider, name, table)
        self._hand_out_parameter_tables()
        files = ([(Path(p), "the caller") for p in table_files] if table_files is not None
                 else in_house_table_files(env))
        for path, how in files:
            self._offer_file(path, how)

    # -- collecting -------------------------------------------------------------------
    def _call(self, hook: str) -> Iterator[tuple[str, Mapping]]:
        """(plugin name, non-empty result) of every implementation of *hook*, in order.

        Each implementation is called on its own (not through pluggy's joint call) so
        that a failing plugin is named and the others are still collected.
        """
        order = {name: i for i, (name, _) in enumerate(self.manager.list_name_plugin())}
        impls = sorted(getattr(self.manager.hook, hook).get_hookimpls(),
                       key=lambda impl: order.get(impl.plugin_name, len(order)))
        for impl in impls:
            try:
                with redirect_stdout(sys.stderr):
                    result = impl.function()
            except Exception as exc:  # a plugin's own failure, reported with its name
                self._problem(impl.plugin_name, f"{hook}() raised {type(exc).__name__}: {exc}")
                continue
            if result is None:
                continue
            if not isinstance(result, Mapping):
                self._problem(impl.plugin_name, f"{hook}() must return a mapping of name to "
                              f"entry, got {type(result).__name__}")
                continue
            self._trace(f"{hook}() of {impl.plugin_name!r}: {', '.join(map(str, result))}")
            yield impl.plugin_name, result

    def _problem(self, provider: str, problem: str) -> None:
        self._trace(f"problem with {provider!r}: {problem}")
        self.problems.append(PluginProblem(provider, problem))

    def _offer_table(self, provider: str, name: Any, source: Any) -> None:
        if not isinstance(name, str) or not name.strip():
            self._problem(provider, f"register_tables(): table name {name!r} must be a "
                          "non-empty string")
        elif not isinstance(source, (ConstantTable, Traversable, Path, str)):
            self._problem(provider, f"register_tables(): table {name!r} must be a "
                          f"ConstantTable, a path or a package resource, got "
                          f"{type(source).__name__}")
        else:
            self._claim("table", name, provider)
            self.tables[name] = TableOffer(name, provider, source)

    def _offer_model(self, provider: str, name: Any, model: Any) -> None:
        missing = [a for a in MODEL_ATTRIBUTES if not hasattr(model, a)]
        if not isinstance(name, str) or not name.strip():
            self._problem(provider, f"register_activity_models(): model name {name!r} must "
                          "be a non-empty string")
        elif missing:
            self._problem(provider, f"register_activity_models(): activity model {name!r} "
                          f"lacks {', '.join(missing)} (see ionwright.activity.base)")
        elif not callable(model.bind):
            self._problem(provider, f"register_activity_models(): {name!r}.bind is not callable")
        elif model.name != name:
            self._problem(provider, f"register_activity_models(): activity model offered as "
                          f"{name!r} calls itself {model.name!r} (its name attribute)")
        else:
            self._claim("activity model", name, provider)
            self.models[name] = model

    def _offer_parameter_table(self, provider: str, name: Any, table: Any) -> None:
        if not isinstance(name, str) or not name.strip():
            self._problem(provider, f"register_parameter_tables(): table name {name!r} must "
                          "be a non-empty string")
        elif not isinstance(table, ParameterTable):
            self._problem(provider, f"register_parameter_tables(): table {name!r} must be an "
                          f"ionwright.plugins.ParameterTable, got {type(table).__name__}")
        else:
            self._claim("parameter table", name, provider)
            self.parameter_tables[name] = replace(table, name=name, provider=provider)

    def _hand_out_parameter_tables(self) -> None:
        """Give every model the parameter tables offered for it, in registration order."""
        by_model: dict[str, list[ParameterTable]] = {}
        for table in self.parameter_tables.values():
            by_model.setdefault(table.model, []).append(table)
        for model_name, tables in by_model.items():
            model = self.models.get(model_name)
            if model is None or not hasattr(model, "use_parameter_tables"):
                for table in tables:
                    self._problem(table.provider, f"register_parameter_tables(): table "
                                  f"{table.name!r} is for activity model {model_name!r}, "
                                  "which no plugin registers or which reads no parameter "
                                  "tables")
                continue
            model.use_parameter_tables(tables)

    def _offer_reagents(self, provider: str, offered: Mapping) -> None:
        layer = REAGENT_LAYER_PREFIX + provider
        data = {"about": {"name": layer, "format_version": FORMAT_VERSION,
                          "title": f"named reagents offered by plugin {provider!r}"},
                "reagents": offered}
        try:
            table = build_table(data, origin=f"register_reagents() of plugin {provider!r}")
        except TableError as exc:
            self._problem(provider, "register_reagents(): " + "; ".join(exc.problems))
            return
        self.reagent_layers[provider] = table
        for name in table.reagents:
            earlier = self._claim("reagent", name, provider)
            if earlier is not None and earlier in self.reagent_layers:
                self.reagent_layers[earlier] = _without_reagent(self.reagent_layers[earlier], name)

    def _offer_file(self, path: Path, how: str) -> None:
        provider = str(path)
        self._files.add(provider)
        if not path.is_file():
            self._problem(provider, f"named by {how}, but there is no such file")
            return
        try:
            table = load_table(path)
        except TableError as exc:
            self._problem(provider, "; ".join(exc.problems))
            return
        self._trace(f"table file {provider} ({how}): table {table.name!r}")
        self._claim("table", table.name, provider)
        self.tables[table.name] = TableOffer(table.name, provider, table)

    def _claim(self, kind: str, name: str, provider: str) -> str | None:
        """Record *provider* as the owner of *name*; apply the policy to a conflict.

        Returns the provider it replaces, if any.
        """
        earlier = self._owner.get((kind, name))
        if earlier is not None:
            if self.policy == "raise":
                raise PluginConflictError(kind, name, self.describe(earlier),
                                          self.describe(provider))
            self.conflicts.append(Conflict(kind, name, kept=provider, replaced=earlier))
            if self.policy == "warn":
                warnings.warn(PluginConflictWarning(
                    f"{kind} {name!r} is registered by both {self.describe(earlier)} and "
                    f"{self.describe(provider)}; the later one ({self.describe(provider)}) is "
                    f"used. Set {CONFLICTS_VAR}=raise to make this an error, or exclude one "
                    f"with {EXCLUDE_VAR}"), stacklevel=2)
        self._owner[(kind, name)] = provider
        return earlier

    # -- lookups ----------------------------------------------------------------------
    def owner(self, kind: str, name: str) -> str:
        """The provider whose registration of *name* (a table, activity model or reagent) is used."""
        return self._owner[(kind, name)]

    def describe(self, provider: str) -> str:
        """'plugin NAME' or 'table file PATH'."""
        return f"table file {provider}" if provider in self._files else f"plugin {provider!r}"

    def require_healthy(self) -> None:
        """Raise :class:`BrokenPluginError` listing every recorded plugin problem."""
        if self.problems:
            raise BrokenPluginError([(p.provider, p.problem) for p in self.problems])

    def model(self, name: str):
        """The activity model called *name* (refused while a plugin is broken)."""
        self.require_healthy()
        try:
            model = self.models[name]
        except KeyError:
            raise UnknownNameError("activity model", name, self.models,
                                   f"known models: {', '.join(sorted(self.models))}") from None
        owner = self._owner.get(("activity model", name), BUILTIN)
        if owner == BUILTIN:
            return model
        if name not in self._guarded or self._guarded[name]._model is not model:
            self._guarded[name] = GuardedModel(model, owner)
        return self._guarded[name]

    def replacement_notes(self, model: str, tables: Iterable[str]) -> list[str]:
        """Warnings for a solve whose activity model or tables (by name) are a plugin's or
        a file's replacement of an earlier registration, ionwright's own included."""
        used = {("activity model", model), *(("table", t) for t in tables)}
        out = []
        for c in self.conflicts:
            if (c.kind, c.name) in used and self._owner.get((c.kind, c.name)) == c.kept:
                out.append(f"{c.kind} {c.name!r} here is the one of {self.describe(c.kept)}, "
                           f"which replaces the one of {self._who(c.replaced)}; set "
                           f"{CONFLICTS_VAR}=raise to refuse such replacements, or exclude it "
                           f"with {EXCLUDE_VAR}")
        return out

    def _who(self, provider: str) -> str:
        return "ionwright itself" if provider == BUILTIN else self.describe(provider)

    def table(self, name_or_path: str) -> ConstantTable:
        """A registered table by name, or a table file by path (refused while a plugin is broken)."""
        self.require_healthy()
        if name_or_path in self.tables:
            return self.tables[name_or_path].load()
        path = Path(name_or_path).expanduser()
        if path.suffix == ".toml" or path.exists():
            if not path.exists():
                raise TableError(str(path), ["no such file"], "check the path (a table named "
                                 "in a recipe is found relative to the recipe's folder)")
            return load_table(path)
        raise UnknownNameError("constant table", name_or_path, self.tables,
                               "give a registered name or a path to a .toml file; "
                               "`ionwright tables list` shows the registered ones")

    def layers(self, names: Iterable[str]) -> list[ConstantTable]:
        """The tables *names* in order, below them the plugins' reagents they can make."""
        tables = [self.table(name) for name in names]
        known = {n for t in tables for n in (*t.components, *t.species)}
        reagents = [_usable(layer, known) for layer in self.reagent_layers.values()]
        return [*(layer for layer in reagents if layer.reagents), *tables]


def build_table(data: Mapping[str, Any], origin: str) -> ConstantTable:
    """A table from a mapping shaped like a table file, with the loader's own checks."""
    return _Builder(_plain(data), origin).build()


def reagent_needs(reagent: Reagent, known: Iterable[str]) -> list[str]:
    """Names in *reagent*'s ``makes`` that are not among the *known* components/species."""
    known = set(known)
    return [name for name in (reagent.makes or {}) if name not in known]


def _usable(layer: ConstantTable, known: set[str]) -> ConstantTable:
    unusable = [name for name, r in layer.reagents.items() if reagent_needs(r, known)]
    for name in unusable:
        layer = _without_reagent(layer, name)
    return layer


def _without_reagent(layer: ConstantTable, name: str) -> ConstantTable:
    kept = {n: r for n, r in layer.reagents.items() if n != name}
    return replace(layer, reagents=frozen_map(kept), counts=frozen_map({**layer.counts,
                                                                       "reagents": len(kept)}))


def _plain(value: Any) -> Any:
    """Mappings as dicts and tuples as lists, as the TOML loader would have produced."""
    if isinstance(value, Mapping):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, tuple):
        return [_plain(v) for v in value]
    return value


@lru_cache(maxsize=1)
def default_registry() -> Registry:
    """The registry built from the current environment's plugins and files (cached).

    Tests that change the environment call ``default_registry.cache_clear()``.
    """
    problems: list[PluginProblem] = []
    manager = plugin_manager(problems)
    return Registry(manager, problems)
