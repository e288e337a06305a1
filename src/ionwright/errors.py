"""Exception classes of ionwright.

Every error a user can cause derives from :class:`IonwrightError`; concrete errors also
inherit the builtin they resemble so that ``except ValueError`` keeps working (the
ionwright base comes first so that its message format wins over, e.g., KeyError's quoting). Each
keeps its fields, builds its message in ``__str__`` and pickles (batch workers send them
between processes).
"""

from __future__ import annotations

import difflib
import functools
import inspect
import re
from collections.abc import Callable, Iterable
from typing import ParamSpec, TypeVar

P = ParamSpec("P")
T = TypeVar("T")


def close_matches(name: str, choices: Iterable[str], n: int = 3) -> list[str]:
    """Names among *choices* that look like *name* (case-insensitive), best first."""
    choices = list(choices)
    lowered = {c.lower(): c for c in choices}
    hits = difflib.get_close_matches(name.lower(), list(lowered), n=n, cutoff=0.6)
    return [lowered[h] for h in hits]


class IonwrightError(Exception):
    """Root of all errors raised by ionwright for bad input or unsolvable problems.

    :attr:`message` says what is wrong and where, :attr:`hint` how to fix it; both are
    rendered when read, so that the command line can set :attr:`flags` (argument name →
    option) and have the same error name the options the user typed.
    """

    def __init__(self, message: str = "", hint: str = "") -> None:
        super().__init__(message, hint)
        self._message = message
        self._hint = hint
        self.flags: dict[str, str] = {}

    @property
    def message(self) -> str:
        return self._with_flags(self._what())

    @property
    def hint(self) -> str:
        return self._with_flags(self._hint)

    def _what(self) -> str:
        return self._message

    def __str__(self) -> str:
        return f"{self.message}\n  hint: {self.hint}" if self._hint else self.message

    def _with_flags(self, text: str) -> str:
        """*text* with each argument written ``name=`` replaced by its command-line option,
        when the command line has set :attr:`flags`."""
        for name, flag in getattr(self, "flags", {}).items():
            text = re.sub(rf"(?<![\w-]){re.escape(name)}=(True\b)?",
                          functools.partial(_as_option, flag=flag), text)
        return text

    def __reduce__(self):  # keep the subclass and its fields when pickled
        return (_rebuild, (type(self), self.__dict__))


def _as_option(match: re.Match[str], flag: str) -> str:
    """``pair=True`` → ``--pair``; ``to="50 mL"`` → ``--to "50 mL"``; ``titrant=`` before a
    space or the end → ``--titrant``."""
    if match[1]:
        return flag
    rest = match.string[match.end():]
    return flag if not rest or rest[0].isspace() or rest[0] in ").,;" else f"{flag} "


def _rebuild(cls, state):
    obj = cls.__new__(cls)
    Exception.__init__(obj, state.get("_message", ""), state.get("_hint", ""))
    obj.__dict__.update(state)
    return obj


class FormulaError(IonwrightError, ValueError):
    """A chemical formula could not be read."""

    def __init__(self, text: str, position: int, problem: str) -> None:
        marker = " " * position + "^"
        super().__init__(
            f"cannot read formula {text!r}: {problem}\n    {text}\n    {marker}",
            "write charges as Ca2+ or CO3^2-, hydrates as MgSO4·7H2O, phases as (aq), (g), (s)",
        )
        self.text, self.position, self.problem = text, position, problem


class TableError(IonwrightError, ValueError):
    """A constant table is malformed; lists every problem found, not only the first."""

    def __init__(self, origin: str, problems: list[str], hint: str = "") -> None:
        lines = "\n".join(f"  - {p}" for p in problems)
        super().__init__(
            f"constant table {origin} has {len(problems)} problem(s):\n{lines}",
            hint or "fix the entries above; `ionwright tables check FILE` re-checks a file",
        )
        self.origin, self.problems = origin, problems


class RecipeError(IonwrightError, ValueError):
    """A recipe or an argument asks for something that cannot be done; names the key or
    the argument at fault.

    *where* is the recipe key (with the recipe it is in) or, for an argument of a library
    function, the argument's name (the :func:`argument` context sets *parameter*).
    Messages write arguments as ``name=``; the command line sets :attr:`flags` (argument
    name → option) so that the same error names its options instead.
    """

    def __init__(self, where: str, problem: str, hint: str = "",
                 parameter: str | None = None) -> None:
        super().__init__(problem, hint)
        self.where, self.problem, self.parameter = where, problem, parameter

    def _what(self) -> str:
        flags = getattr(self, "flags", {})
        if self.parameter is None:
            place = f"recipe {self.where}"
        elif self.parameter in flags:
            place = flags[self.parameter] + self.where[len(self.parameter):]
        else:
            place = f"argument {self.where}"
        return f"{place}: {self.problem}"


def names_its_arguments(function: Callable[P, T]) -> Callable[P, T]:
    """Decorate a library function so that a :class:`RecipeError` raised inside whose
    ``where`` starts with one of its parameter names (``to``, ``titrant``) is marked as
    about that argument: its message then says ``argument to: ...``, and the command line
    names the option instead (:func:`ionwright.cli._flags.as_flags`)."""
    names = set(inspect.signature(function).parameters)

    @functools.wraps(function)
    def wrapper(*args: P.args, **kwargs: P.kwargs) -> T:
        try:
            return function(*args, **kwargs)
        except RecipeError as exc:
            head = exc.where.partition(" ")[0]
            if exc.parameter is None and head in names:
                exc.parameter = head
            raise

    return wrapper


class IonPairSetError(IonwrightError, ValueError):
    """An activity model's ion-pair rule that cannot work: no species named, no reason
    given, or ``ion_pairs`` of the wrong type (:mod:`ionwright.activity._pairs`)."""

    def __init__(self, problem: str,
                 hint: str = "give species=(...) or made_of=(...), and a reason") -> None:
        super().__init__(f"ion-pair rule: {problem}", hint)
        self.problem = problem


class UnknownNameError(IonwrightError, KeyError):
    """A name (ingredient, species, model, table, solid, gas) is not known."""

    def __init__(self, kind: str, name: str, known: Iterable[str], listing: str = "",
                 near: list[str] | None = None) -> None:
        if near is None:  # callers with a better ranking of their own pass it as *near*
            near = close_matches(name, sorted(known))
        hint = f"did you mean {', '.join(repr(n) for n in near)}?" if near else ""
        if listing:
            hint = f"{hint} {listing}".strip()
        super().__init__(f"unknown {kind} {name!r}", hint)
        self.kind, self.name, self.suggestions = kind, name, near


#: Relative mass-balance residual the solver accepts (core/_newton/numerics.py uses it).
RESIDUAL_TOLERANCE = 1e-10
MASS_BALANCE = "relative mass-balance residual"


class ConvergenceError(IonwrightError, ArithmeticError):
    """The solver did not reach its tolerance; carries the diagnostics and the tolerance.

    *status* is one of :data:`ionwright.status.SOLVER_STATUSES`; *residual* is the worst
    relative residual of *what* was solved and *tolerance* the one it had to reach (the
    solver's :data:`RESIDUAL_TOLERANCE` unless a fit says otherwise).
    """

    def __init__(self, status: str, iterations: int, residual: float, detail: str = "",
                 hint: str = "", tolerance: float = RESIDUAL_TOLERANCE,
                 what: str = MASS_BALANCE) -> None:
        balanced = residual <= tolerance   # NaN is not
        converged = ("the mass balances" if what == MASS_BALANCE else f"the {what}")
        found = (f"{converged} converged (worst {what} {residual:.3g}, tolerance "
                 f"{tolerance:.3g})" if balanced else
                 f"worst {what} {residual:.3g} (tolerance {tolerance:.3g})")
        super().__init__(
            f"solver stopped with status {status!r} after {iterations} iterations; {found}"
            + (f"; {detail}" if detail else ""),
            hint or "check that the totals are physically possible (e.g. a fixed pH with "
            "an impossible charge), or try another activity model",
        )
        self.status, self.iterations, self.residual, self.detail = (
            status, iterations, residual, detail)
        self.tolerance, self.what = tolerance, what


class PluginError(IonwrightError, RuntimeError):
    """A plugin failed to load or returned something malformed; names the plugin."""

    def __init__(self, plugin: str, problem: str) -> None:
        super().__init__(
            f"plugin {plugin!r}: {problem}",
            "fix or uninstall the plugin, or run with IONWRIGHT_NO_PLUGINS=1",
        )
        self.plugin, self.problem = plugin, problem


class BrokenPluginError(PluginError):
    """Plugins or in-house table files failed; ionwright refuses to solve until each is
    fixed or excluded explicitly. Lists every failure, not only the first."""

    def __init__(self, problems: list[tuple[str, str]]) -> None:
        names = list(dict.fromkeys(plugin for plugin, _ in problems))
        lines = "\n".join(f"  - {plugin}: {problem}" for plugin, problem in problems)
        IonwrightError.__init__(
            self, f"{len(problems)} plugin problem(s); ionwright does not solve with a broken "
            f"plugin or table file:\n{lines}",
            f"fix or uninstall it, or exclude it explicitly with "
            f"IONWRIGHT_EXCLUDE_PLUGINS={','.join(names)} (IONWRIGHT_NO_PLUGINS=1 turns every "
            f"third-party plugin and the per-user tables folder off)")
        self.plugin, self.problem, self.problems = ", ".join(names), lines, problems


class PluginConflictError(PluginError):
    """Two plugins or table files register the same name under the 'raise' conflict policy."""

    def __init__(self, kind: str, name: str, first: str, second: str) -> None:
        IonwrightError.__init__(
            self, f"{kind} {name!r} is registered by both {first} and {second}",
            "rename or exclude one of them (IONWRIGHT_EXCLUDE_PLUGINS=NAME), or set "
            "IONWRIGHT_PLUGIN_CONFLICTS=warn to let the later one win with a warning")
        self.plugin, self.problem = second, f"{kind} {name!r} also registered by {first}"
        self.kind, self.name, self.first, self.second = kind, name, first, second


class PluginConflictWarning(UserWarning):
    """A name registered twice under the 'warn' conflict policy: the later one wins."""


class PhaseRuleError(IonwrightError, ValueError):
    """Solids and gases held at equilibrium that cannot coexist (the phase rule)."""

    def __init__(self, phases: list[str], problem: str) -> None:
        super().__init__(
            f"phases {', '.join(repr(p) for p in phases)}: {problem}",
            'hold fewer phases fixed: make a solid "may-form" or remove it, or '
            "leave a gas or the pH free")
        self.phases, self.problem = phases, problem


class UnreachableTargetError(IonwrightError, ValueError):
    """A target that the adjusting ingredient cannot reach; carries the reachable range."""

    def __init__(self, ingredient: str, quantity: str, target: float,
                 reachable: tuple[float, float], detail: str, hint: str) -> None:
        lo, hi = reachable
        super().__init__(
            f"{quantity} {target:g} cannot be reached with {ingredient}: it reaches "
            f"{lo:.3f} to {hi:.3f} {detail}", hint)
        self.ingredient, self.quantity, self.target = ingredient, quantity, target
        self.reachable, self.detail = reachable, detail
