"""Tolerances, caps and small array helpers shared by the steps of the batched Newton solve."""

from __future__ import annotations

import numpy as np

from ...errors import RESIDUAL_TOLERANCE  # noqa: F401 (relative mass-balance residual
from ...chemistry._constants import LN10  # noqa: F401 (the Newton steps read it here)
#                                          that counts as converged; errors quote it)

STEP_TOLERANCE = 1e-8          # largest Newton step (ln units) a converged sample may need
STEP_CAP = 4.0                 # largest change of any ln a in one Newton step
LN_C_CEILING = 300.0           # keeps exp() finite on wild iterates
IONIC_STRENGTH_CAP = 1.5       # u² stays below this × the fully dissociated ionic strength
ROUND_OFF = 1e-13              # relative residual below which the line search is switched off
ARMIJO = 1e-4
MAX_HALVINGS = 30


def clip(x: np.ndarray, lo, hi) -> np.ndarray:
    """np.clip without its Python-level overhead (NaN stays NaN, as with np.clip)."""
    return np.minimum(np.maximum(x, lo), hi)


def any_set(mask: np.ndarray) -> bool:
    return bool(np.count_nonzero(mask) > 0)


def all_set(mask: np.ndarray) -> bool:
    return bool(np.count_nonzero(mask) == mask.size)


def column_max(a: np.ndarray) -> np.ndarray:
    """Largest entry of each column (sample) of a (m, k) array; 0 when m = 0."""
    return a.max(axis=0) if a.shape[0] else np.zeros(a.shape[1:])


def at(cols: np.ndarray | slice, rows: np.ndarray) -> tuple:
    """Index of the free components *cols* at samples *rows* of a (c, k) array."""
    return (cols, rows) if isinstance(cols, slice) else (cols[:, None], rows)
