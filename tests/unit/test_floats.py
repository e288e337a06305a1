"""One sample's float helpers follow numpy's elementwise rules exactly."""

from __future__ import annotations

import math

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from ionwright.core._newton.floats import fdiv, fmax, fmin, largest_magnitude, sum_of_squares

SPECIAL = st.sampled_from([0.0, -0.0, 1.0, -3.5, 1e-310, math.inf, -math.inf, math.nan])
FLOATS = st.one_of(st.floats(allow_nan=True, allow_infinity=True), SPECIAL)


def _same(a: float, b) -> bool:
    b = float(b)
    return (math.isnan(a) and math.isnan(b)) or (a == b and math.copysign(1, a) ==
                                                 math.copysign(1, b))


@given(FLOATS, FLOATS)
def test_max_min_and_division_are_numpys(a, b):
    with np.errstate(all="ignore"):
        assert _same(fmax(a, b), np.maximum(a, b))
        assert _same(fmin(a, b), np.minimum(a, b))
        assert _same(fdiv(a, b), np.divide(a, b))


@given(st.lists(FLOATS, max_size=12))
def test_the_largest_magnitude_is_a_column_max_of_abs(values):
    expect = np.abs(np.array(values)).max() if values else 0.0
    assert _same(largest_magnitude(values), expect)


@given(st.lists(st.floats(-1e150, 1e150), max_size=12))
def test_the_sum_of_squares_adds_in_order(values):
    acc = 0.0
    for v in np.array(values, dtype=float):
        acc = np.float64(acc) + v * v
    assert _same(sum_of_squares(values), acc)
