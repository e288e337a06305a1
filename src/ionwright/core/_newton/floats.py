"""One sample's numbers on Python floats: numpy's elementwise rules (a NaN wins a max,
division by zero gives ±inf or NaN) without numpy's per-call cost.

The one-sample shortcuts of the guess and the fast path use these so that a sample
solved alone has the bits it has in a batch.
"""

from __future__ import annotations

import math


def fmax(a: float, b: float) -> float:
    """np.maximum of two floats: a NaN wins, and of equal values (0.0 and −0.0) the
    second, as there."""
    return a if a > b or a != a else b


def fmin(a: float, b: float) -> float:
    """np.minimum of two floats: a NaN wins, and of equal values the second, as there."""
    return a if a < b or a != a else b


def fdiv(a: float, b: float) -> float:
    """a / b as numpy divides: ±inf for a non-zero over zero, NaN for 0/0 or NaN."""
    try:
        return a / b
    except ZeroDivisionError:
        if a != a or a == 0.0:
            return math.nan
        return math.copysign(math.inf, a) * math.copysign(1.0, b)


def largest_magnitude(values: list[float]) -> float:
    """The largest |v| (NaN if any is NaN), 0 for none: a column's max of np.abs."""
    if not values:
        return 0.0
    total = sum(values)
    if total == total:  # no NaN (nor +inf with −inf): the builtin max is exact
        return max(map(abs, values))
    out = abs(values[0])
    for v in values[1:]:
        out = fmax(out, abs(v))
    return out


def scaled_merit(res: list[float], scale: list[float]) -> float:
    """Σ (r/s)², added in order: the merit of one sample's scaled residuals."""
    acc = 0.0
    for r, s in zip(res, scale):
        q = r / s
        acc += q * q
    return acc


def sum_of_squares(values: list[float]) -> float:
    """Σ v², added in order (the batch's ordered sum of v·v)."""
    acc = 0.0
    for v in values:
        acc += v * v
    return acc
