"""Activity models from third-party plugins, checked at every call so that a fault names
the plugin.

A plugin's model can raise, return arrays of the wrong shape, or return NaN; deep in the
solver any of these shows as a raw traceback or as thousands of iterations blamed on the
input. The registry hands out third-party models wrapped in :class:`GuardedModel`: its
bound model checks what each call returns (shape and finite values, given finite input)
and turns a failure into a :class:`~ionwright.errors.PluginError` naming the plugin, the
model and the call. ionwright's own models are not wrapped.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..errors import PluginError


class GuardedModel:
    """A third-party activity model: attributes pass through, :meth:`bind` is checked."""

    def __init__(self, model: Any, plugin: str) -> None:
        self._model = model
        self._plugin = plugin

    def __getattr__(self, name: str) -> Any:
        return getattr(self._model, name)

    def bind(self, species, t_C: np.ndarray) -> "GuardedBound":
        bound = _call(self._plugin, self._model.name, "bind", self._model.bind, species, t_C)
        if not callable(getattr(bound, "ln_gamma", None)):
            raise PluginError(self._plugin, f"activity model {self._model.name!r}: bind() "
                              f"returned {type(bound).__name__}, which has no ln_gamma()")
        return GuardedBound(bound, self._plugin, self._model.name, len(species.names))


class GuardedBound:
    """A bound model whose arrays are checked: (n, s) shapes and finite values."""

    def __init__(self, bound: Any, plugin: str, model: str, n_species: int) -> None:
        self._bound, self._plugin, self._model, self._s = bound, plugin, model, n_species

    def __getattr__(self, name: str) -> Any:
        return getattr(self._bound, name)

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        out = _call(self._plugin, self._model, "ln_gamma", self._bound.ln_gamma, u, molality)
        return self._checked("ln_gamma", out, (u.shape[0], self._s), u)

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        out = _call(self._plugin, self._model, "d_ln_gamma_du", self._bound.d_ln_gamma_du, u)
        return self._checked("d_ln_gamma_du", out, (u.shape[0], self._s), u)

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        phi, dphi = _call(self._plugin, self._model, "terms", self._bound.terms, u)
        p = np.shape(getattr(self._bound, "weights", np.zeros((0, 0))))[1]
        return (self._checked("terms", phi, (p, u.shape[0]), u),
                self._checked("terms", dphi, (p, u.shape[0]), u))

    def ln_water_activity(self, molality: np.ndarray) -> np.ndarray | None:
        out = _call(self._plugin, self._model, "ln_water_activity",
                    self._bound.ln_water_activity, molality)
        if out is None:
            return None
        return self._checked("ln_water_activity", out, (molality.shape[0],), molality)

    def take(self, rows: np.ndarray) -> "GuardedBound":
        taken = _call(self._plugin, self._model, "take", self._bound.take, rows)
        return GuardedBound(taken, self._plugin, self._model, self._s)

    def _checked(self, call: str, out: Any, shape: tuple[int, ...], given: np.ndarray
                 ) -> np.ndarray:
        out = np.asarray(out, dtype=float)
        if out.shape != shape:
            raise PluginError(self._plugin, f"activity model {self._model!r}: {call}() "
                              f"returned shape {out.shape}, expected {shape} (samples, "
                              "species)")
        if not np.isfinite(out).all() and np.isfinite(given).all():
            raise PluginError(self._plugin, f"activity model {self._model!r}: {call}() "
                              "returned NaN or infinite values for finite input")
        return out


def _call(plugin: str, model: str, call: str, function, *args) -> Any:
    """*function(*args)*; an exception becomes a PluginError naming plugin, model, call."""
    try:
        return function(*args)
    except PluginError:
        raise
    except Exception as exc:  # a plugin's own failure, reported with its name
        raise PluginError(plugin, f"activity model {model!r}: {call}() raised "
                          f"{type(exc).__name__}: {exc}") from None
