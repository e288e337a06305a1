"""Sparse linear algebra over a batch: products with sample-last blocks, and a Cholesky
factorisation planned once for a sparsity pattern and run for many matrices at once.

Every operation adds in a fixed order that does not depend on the number of samples,
so a sample's answer has the same bits whether it is solved alone or among a million.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

_KERNEL: list = []  # scipy's CSR × dense kernel, found on first use (keeps import quick)


def _csr_matvecs():
    """scipy's own CSR kernel, called directly (the public ``@`` costs ~10 µs per call),
    or None for a scipy without it, which then takes the public route."""
    if not _KERNEL:
        try:
            from scipy.sparse._sparsetools import csr_matvecs
        except ImportError:  # pragma: no cover
            csr_matvecs = None
        _KERNEL.append(csr_matvecs)
    return _KERNEL[0]

PIVOT_FLOOR = 1e-14            # relative Cholesky pivot below which it is regularised


def weighted_sum(a: np.ndarray, weights: np.ndarray | None = None) -> np.ndarray:
    """Σ_i w_i a[i] over the first axis of *a* (w = 1 when None), added in index order.

    One call to the CSR kernel whatever the number of rows, and the same bits as the
    loop ``acc = 0; acc += w_i a[i]`` over the non-zero w_i (numpy's own sum is pairwise
    and depends on the shape).
    """
    m = a.shape[0]
    indptr, indices, data = _sum_plan(m, weights)
    flat = np.ascontiguousarray(a, dtype=float).reshape(m, math.prod(a.shape[1:]))
    out = np.zeros(flat.shape[1])
    kernel = _csr_matvecs()
    if kernel is None:  # pragma: no cover
        for i, w in zip(indices, data):
            out += w * flat[i]
    elif indices.size:
        kernel(1, m, flat.shape[1], indptr, indices, data, flat.ravel(), out)
    return out.reshape(a.shape[1:])


_SUM_PLANS: dict[tuple, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}


def _sum_plan(m: int, weights: np.ndarray | None) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The one-row CSR matrix (indptr, indices, data) of *weights* over *m* rows, cached
    (the solver sums with a handful of fixed weight vectors, many times)."""
    key = (m, None if weights is None else np.asarray(weights, dtype=float).tobytes())
    plan = _SUM_PLANS.get(key)
    if plan is None:
        if len(_SUM_PLANS) > 4096:
            _SUM_PLANS.clear()
        w = np.ones(m) if weights is None else np.asarray(weights, dtype=float)[:m]
        keep = np.flatnonzero(w)
        plan = _SUM_PLANS[key] = (np.array([0, keep.size], dtype=np.int32),
                                  keep.astype(np.int32), w[keep])
    return plan


class SparseRows:
    """A constant sparse matrix M (m, n) for products M @ X with X (n, k), k samples.

    Each output row is Σ_j M_ij X_j added in column order, so the result for one
    sample does not depend on k.
    """

    def __init__(self, dense: np.ndarray):
        from scipy.sparse import csr_array  # imported here: keeps `import ionwright` quick

        self.matrix = csr_array(np.asarray(dense, dtype=float))
        self.shape = self.matrix.shape
        self.kernel = _csr_matvecs()
        self._arrays = (self.matrix.indptr, self.matrix.indices, self.matrix.data)

    def __matmul__(self, x: np.ndarray) -> np.ndarray:
        m, n = self.shape
        if self.kernel is None or x.ndim != 2:
            return self.matrix @ x
        if not (x.flags.c_contiguous and x.dtype == np.float64):
            x = np.ascontiguousarray(x, dtype=float)
        k = x.shape[1]
        out = np.zeros((m, k))
        self.kernel(m, n, k, *self._arrays, x.reshape(-1), out.reshape(-1))
        return out


@dataclass(frozen=True)
class SparseCholesky:
    """A Cholesky factorisation A = L Lᵀ planned once for a sparsity pattern, then run
    for k matrices at once with every operation over contiguous sample vectors.

    Components that never meet in a species (K+ and Ca+2, say) give zero entries; a
    greedy minimum-degree order keeps the fill small, and only the non-zero entries of
    L are stored and updated. ``entries`` lists the non-zero (i, j), i ≤ j, of A in the
    order their rows follow ``first_row`` in the product handed to :meth:`solve`; the
    row after them must be zero (it stands for the fill).
    """

    order: tuple[int, ...]                  # elimination order of the components
    position: tuple[int, ...]               # where each component comes in that order
    entries: tuple[tuple[int, int], ...]
    source: np.ndarray                      # per entry of L: row of A (or the zero row)
    columns: tuple[tuple[int, int], ...]    # per column: (first, end) entries of L, diag first
    updates: tuple[tuple[tuple[int, int, int], ...], ...]  # per column: (target, src, mult)
    lower: tuple[tuple[tuple[int, int], ...], ...]   # per column j: (entry, row i > j)

    @classmethod
    def plan(cls, present: np.ndarray, first_row: int) -> "SparseCholesky":
        """The plan for A = Σ ν νᵀ c whose species–component incidence is *present*."""
        f = present.shape[1]
        meet = (present.T.astype(int) @ present.astype(int)) > 0
        order = minimum_degree(meet)
        pattern = meet[np.ix_(order, order)].copy()
        for j in range(f):                                  # symbolic elimination: fill
            below = np.flatnonzero(pattern[j + 1:, j]) + j + 1
            pattern[np.ix_(below, below)] = True
        entries = [(min(i, j), max(i, j)) for i in range(f) for j in range(i, f) if meet[i, j]]
        row_of = {e: first_row + n for n, e in enumerate(entries)}
        index, source, columns, lower = {}, [], [], []
        for j in range(f):
            rows = [j, *(i for i in range(j + 1, f) if pattern[i, j])]
            start = len(source)
            for i in rows:
                index[i, j] = len(source)
                a, b = sorted((order[i], order[j]))
                source.append(row_of.get((a, b), -1))
            columns.append((start, len(source)))
            lower.append(tuple((index[i, j], i) for i in rows[1:]))
        updates = []
        for j in range(f):
            ops = []
            for p in range(j):
                if (j, p) in index:
                    ops.extend((index[i, j], index[i, p], index[j, p])
                               for i in range(j, f) if (i, p) in index)
            updates.append(tuple(ops))
        zero_row = first_row + len(entries)
        source = np.array([zero_row if r < 0 else r for r in source], dtype=int)
        return cls(tuple(order), tuple(int(i) for i in np.argsort(order)), tuple(entries),
                   source, tuple(columns),
                   tuple(updates), tuple(lower))

    def solve(self, prod: np.ndarray, b: np.ndarray) -> np.ndarray:
        """X (f, r, k) with A X = B (f, r, k), A's entries read from the rows of *prod*.

        A pivot lost to round-off is raised to :data:`PIVOT_FLOOR` × its diagonal, which
        turns the step into a slightly damped one instead of a failure.
        """
        f, r, k = b.shape
        if k == 1:
            return self._solve_one(prod[:, 0], b[:, :, 0])[:, :, None]
        low = np.take(prod, self.source, axis=0)
        inv = np.empty((f, k))
        tmp = np.empty(k)
        for j, (start, end) in enumerate(self.columns):
            diagonal = low[start].copy()
            for target, src, mult in self.updates[j]:
                np.multiply(low[src], low[mult], out=tmp)
                low[target] -= tmp
            pivot = np.maximum(low[start], PIVOT_FLOOR * diagonal + 1e-300)
            np.sqrt(pivot, out=low[start])
            np.divide(1.0, low[start], out=inv[j])
            low[start + 1:end] *= inv[j]
        z = b[list(self.order)]
        t = np.empty((r, k))
        for j in range(f):                      # forward: L z = b
            z[j] *= inv[j]
            for entry, i in self.lower[j]:
                np.multiply(z[j], low[entry], out=t)
                z[i] -= t
        for j in range(f - 1, -1, -1):          # back: Lᵀ x = z
            for entry, i in self.lower[j]:
                np.multiply(z[i], low[entry], out=t)
                z[j] -= t
            z[j] *= inv[j]
        x = np.empty_like(z)
        x[list(self.order)] = z
        return x


    def solve_bordered(self, prod: np.ndarray, top: np.ndarray, last: np.ndarray,
                       a: np.ndarray, b: np.ndarray, d: np.ndarray
                       ) -> tuple[np.ndarray, np.ndarray]:
        """(x (f, k), t (k,)) with [[A, a], [bᵀ, d]] [x; t] = −[top; last] for k samples.

        A is factorised as in :meth:`solve` and t eliminated through the Schur complement
        d − bᵀA⁻¹a of the border; t is 0 where the complement vanishes or t is not finite.
        """
        k = d.size
        if k == 1:
            x, t = self.bordered_one(prod[:, 0], top[:, 0].tolist(), float(last[0]),
                                      a[:, 0].tolist(), b[:, 0].tolist(), float(d[0]))
            return np.array(x)[:, None], np.array([t])
        rhs = np.empty((a.shape[0], 2, k))
        np.negative(top, out=rhs[:, 0])
        rhs[:, 1] = a
        sol = self.solve(prod, rhs)
        p, q = sol[:, 0], sol[:, 1]
        schur = d - weighted_sum(b * q)
        with np.errstate(divide="ignore", invalid="ignore"):
            t = (-last - weighted_sum(b * p)) / schur
        t[~np.isfinite(t)] = 0.0
        q *= t
        p -= q
        return p, t

    def bordered_one(self, prod: np.ndarray, top: list, last: float, a: list, b: list,
                     d: float) -> tuple[list, float]:
        """:meth:`solve_bordered` for one sample (*prod* a column, the rest Python floats),
        operation for operation on Python floats: (x as a list, t)."""
        low, inv = self._factor_one(prod)
        p = self._substitute_one(low, inv, [-v for v in top])
        q = self._substitute_one(low, inv, a)
        acc = 0.0
        for bj, qj in zip(b, q):
            acc += bj * qj
        schur = d - acc
        acc = 0.0
        for bj, pj in zip(b, p):
            acc += bj * pj
        t = (-last - acc) / schur if schur != 0.0 else 0.0
        if not math.isfinite(t):
            t = 0.0
        return [pj - qj * t for pj, qj in zip(p, q)], t

    def _solve_one(self, prod: np.ndarray, b: np.ndarray) -> np.ndarray:
        """:meth:`solve` for one sample, on Python floats: the same IEEE operations in the
        same order (so the same bits) without numpy's per-call cost."""
        if not b.shape[0]:
            return np.empty(b.shape)
        low, inv = self._factor_one(prod)
        return np.array([self._substitute_one(low, inv, given) for given in b.T.tolist()]).T

    def _factor_one(self, prod: np.ndarray) -> tuple[list, list]:
        """L (its stored entries) and the inverse pivots for one sample, as in :meth:`solve`."""
        low = prod[self.source].tolist()
        inv = [0.0] * len(self.columns)
        for j, (start, end) in enumerate(self.columns):
            diagonal = low[start]
            for target, src, mult in self.updates[j]:
                low[target] -= low[src] * low[mult]
            pivot = max(low[start], PIVOT_FLOOR * diagonal + 1e-300)
            low[start] = pivot if math.isnan(pivot) else math.sqrt(pivot)
            inv_j = inv[j] = 1.0 / low[start]
            for e in range(start + 1, end):
                low[e] *= inv_j
        return low, inv

    def _substitute_one(self, low: list, inv: list, given: list) -> list:
        """x with L Lᵀ x = *given* (component order in and out), for one sample."""
        f = len(inv)
        z = [given[o] for o in self.order]
        for j in range(f):                      # forward: L z = b
            zj = z[j] = z[j] * inv[j]
            for entry, i in self.lower[j]:
                z[i] -= zj * low[entry]
        for j in range(f - 1, -1, -1):          # back: Lᵀ x = z
            zj = z[j]
            for entry, i in self.lower[j]:
                zj -= z[i] * low[entry]
            z[j] = zj * inv[j]
        return [z[p] for p in self.position]


def minimum_degree(meet: np.ndarray) -> list[int]:
    """A greedy minimum-degree elimination order of the graph *meet* (ties: lowest index).

    References
    ----------
    George, A. & Liu, J.W.H. (1989) SIAM Review 31, 1–19 (the minimum degree ordering).
    """
    graph = meet.copy()
    np.fill_diagonal(graph, False)
    left = list(range(graph.shape[0]))
    order = []
    while left:
        degree = [int(graph[v, left].sum()) for v in left]
        v = left[int(np.argmin(degree))]
        near = [w for w in left if graph[v, w]]
        for a in near:
            for b in near:
                if a != b:
                    graph[a, b] = True
        order.append(v)
        left.remove(v)
    return order
