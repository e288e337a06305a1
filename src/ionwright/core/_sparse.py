"""Sparse linear algebra over a batch: products with sample-last blocks, and a Cholesky
factorisation planned once for a sparsity pattern and run for many matrices at once.

Every operation adds in a fixed order that does not depend on the number of samples,
so a sample's answer has the same bits whether it is solved alone or among a million.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

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
    indptr, indices, data, terms = _sum_plan(m, weights)
    flat = np.ascontiguousarray(a, dtype=float).reshape(m, math.prod(a.shape[1:]))
    if flat.shape[1] == 1:  # one sample: the kernel's additions on floats
        column, acc = flat[:, 0].tolist(), 0.0
        for i, w in terms:
            acc += w * column[i]
        return np.array([acc]).reshape(a.shape[1:])
    out = np.zeros(flat.shape[1])
    kernel = _csr_matvecs()
    if kernel is None:  # pragma: no cover
        for i, w in terms:
            out += w * flat[i]
    elif indices.size:
        kernel(1, m, flat.shape[1], indptr, indices, data, flat.ravel(), out)
    return out.reshape(a.shape[1:])


_SUM_PLANS: dict[tuple, tuple] = {}


def _sum_plan(m: int, weights: np.ndarray | None) -> tuple:
    """The one-row CSR matrix (indptr, indices, data) of *weights* over *m* rows, and its
    (row, weight) pairs as Python numbers, cached (the solver sums with a handful of
    fixed weight vectors, many times)."""
    key = (m, None if weights is None else np.asarray(weights, dtype=float).tobytes())
    plan = _SUM_PLANS.get(key)
    if plan is None:
        if len(_SUM_PLANS) > 4096:
            _SUM_PLANS.clear()
        w = np.ones(m) if weights is None else np.asarray(weights, dtype=float)[:m]
        keep = np.flatnonzero(w)
        plan = _SUM_PLANS[key] = (np.array([0, keep.size], dtype=np.int32),
                                  keep.astype(np.int32), w[keep],
                                  list(zip(keep.tolist(), w[keep].tolist())))
    return plan


class SparseRows:
    """A constant sparse matrix M (m, n) for products M @ X with X (n, k), k samples.

    Each output row is Σ_j M_ij X_j added in column order, so the result for one
    sample does not depend on k.
    """

    def __init__(self, dense: np.ndarray):
        dense = np.asarray(dense, dtype=float)
        rows, cols = np.nonzero(dense)                      # row by row, columns in order
        indptr = np.zeros(dense.shape[0] + 1, dtype=np.int32)
        np.cumsum(np.bincount(rows, minlength=dense.shape[0]), out=indptr[1:])
        self.shape = dense.shape
        self._arrays = (indptr, cols.astype(np.int32), dense[rows, cols])

    @cached_property
    def apply_one(self):
        """x ↦ M @ x for one sample's vector of Python floats (a function, written out as
        straight-line code for M on first use): each row added in column order from 0.0
        as the kernel does, so the same bits as the batched product."""
        return _straight_line_product(*self._arrays)

    def __matmul__(self, x: np.ndarray) -> np.ndarray:
        """M @ X for X (n, k): one sample by :attr:`apply_one` (scipy is then not even
        imported, which keeps a single solve's start quick), more by scipy's kernel."""
        if x.ndim == 1:
            return (self @ x[:, None])[:, 0]
        m, n = self.shape
        k = x.shape[1]
        if k == 1:
            return np.array(self.apply_one(x[:, 0].tolist()), dtype=float).reshape(m, 1)
        kernel = _csr_matvecs()
        if kernel is None:  # pragma: no cover - a scipy without the kernel
            from scipy.sparse import csr_array

            indptr, indices, data = self._arrays
            return csr_array((data, indices, indptr), shape=self.shape) @ x
        if not (x.flags.c_contiguous and x.dtype == np.float64):
            x = np.ascontiguousarray(x, dtype=float)
        out = np.zeros((m, k))
        kernel(m, n, k, *self._arrays, x.reshape(-1), out.reshape(-1))
        return out


_TERMS_PER_STATEMENT = 48      # keeps each generated expression shallow for the compiler


def _straight_line_product(indptr: np.ndarray, indices: np.ndarray, data: np.ndarray):
    """A Python function x ↦ M @ x (lists of floats) for the CSR matrix M, written out as
    one sum per row: ``0.0 + w·x[j] + …`` in column order, the kernel's own sequence of
    IEEE operations, at a fraction of the cost of looping over the entries."""
    lines, names = ["def product(x):"], []
    for i in range(indptr.size - 1):
        terms = [(int(j), float(w)) for j, w in zip(indices[indptr[i]:indptr[i + 1]],
                                                    data[indptr[i]:indptr[i + 1]])]
        name = f"r{i}"
        names.append(name)
        lines.append(f"    {name} = 0.0")
        for start in range(0, len(terms), _TERMS_PER_STATEMENT):
            parts = [_term(j, w) for j, w in terms[start:start + _TERMS_PER_STATEMENT]]
            lines.append(f"    {name} = {name}{''.join(parts)}")
    lines.append(f"    return [{', '.join(names)}]")
    scope: dict = {}
    exec("\n".join(lines), scope)  # noqa: S102 - code generated from numbers alone
    return scope["product"]


def _term(j: int, w: float) -> str:
    """`` + w·x[j]`` as source; ×1 and ×(−1) are exact, so they are left out."""
    if w == 1.0:
        return f" + x[{j}]"
    if w == -1.0:
        return f" - x[{j}]"
    if not math.isfinite(w):
        return f" + float({str(w)!r}) * x[{j}]"
    return f" + {w!r} * x[{j}]"


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
        index: dict[tuple[int, int], int] = {}
        source: list[int] = []
        columns: list[tuple[int, int]] = []
        lower: list[tuple[tuple[int, int], ...]] = []
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
            ops: list[tuple[int, int, int]] = []
            for p in range(j):
                if (j, p) in index:
                    ops.extend((index[i, j], index[i, p], index[j, p])
                               for i in range(j, f) if (i, p) in index)
            updates.append(tuple(ops))
        zero_row = first_row + len(entries)
        sources = np.array([zero_row if r < 0 else r for r in source], dtype=int)
        return cls(tuple(order), tuple(int(i) for i in np.argsort(order)), tuple(entries),
                   sources, tuple(columns),
                   tuple(updates), tuple(lower))

    @cached_property
    def _source_list(self) -> list[int]:
        return self.source.tolist()

    def solve(self, prod: np.ndarray, b: np.ndarray) -> np.ndarray:
        """X (f, r, k) with A X = B (f, r, k), A's entries read from the rows of *prod*.

        A pivot lost to round-off is raised to :data:`PIVOT_FLOOR` × its diagonal, which
        turns the step into a slightly damped one instead of a failure.
        """
        f, r, k = b.shape
        if k == 1:
            return self._solve_one(prod[:, 0].tolist(), b[:, :, 0])[:, :, None]
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
            x, t = self.bordered_one(prod[:, 0].tolist(), top[:, 0].tolist(), float(last[0]),
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

    def bordered_one(self, prod: list, top: list, last: float, a: list, b: list,
                     d: float) -> tuple[list, float]:
        """:meth:`solve_bordered` for one sample, operation for operation on Python
        floats (*prod* one sample's rows as a list): (x as a list, t)."""
        p, q = self._one(prod, ([-v for v in top], a))
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

    def _solve_one(self, prod: list, b: np.ndarray) -> np.ndarray:
        """:meth:`solve` for one sample, on Python floats: the same IEEE operations in the
        same order (so the same bits) without numpy's per-call cost."""
        if not b.shape[0]:
            return np.empty(b.shape)
        return np.array(self._one(prod, b.T.tolist())).T

    @cached_property
    def _one(self):
        """f(prod, right-hand sides) → solutions, for one sample: :meth:`solve`'s
        factorisation and substitutions written out as straight-line Python for this
        plan (every entry of L a local variable), the same operations in the same order."""
        lines = ["def solve_one(p, given):"]
        lines += [f"    l{e} = p[{row}]" for e, row in enumerate(self.source.tolist())]
        for j, (start, end) in enumerate(self.columns):
            lines.append(f"    d = l{start}")
            lines += [f"    l{t} = l{t} - l{src} * l{mult}" for t, src, mult in self.updates[j]]
            lines += [f"    v = max(l{start}, {PIVOT_FLOOR!r} * d + 1e-300)",
                      f"    l{start} = v if v != v else sqrt(v)",
                      f"    i{j} = 1.0 / l{start}"]
            lines += [f"    l{e} = l{e} * i{j}" for e in range(start + 1, end)]
        lines += ["    out = []", "    for g in given:"]
        lines += [f"        z{k} = g[{o}]" for k, o in enumerate(self.order)]
        for j in range(len(self.columns)):                   # forward: L z = b
            lines.append(f"        z{j} = z{j} * i{j}")
            lines += [f"        z{i} = z{i} - z{j} * l{e}" for e, i in self.lower[j]]
        for j in range(len(self.columns) - 1, -1, -1):       # back: Lᵀ x = z
            lines += [f"        z{j} = z{j} - z{i} * l{e}" for e, i in self.lower[j]]
            lines.append(f"        z{j} = z{j} * i{j}")
        lines.append(f"        out.append([{', '.join(f'z{k}' for k in self.position)}])")
        lines.append("    return out")
        scope = {"sqrt": math.sqrt}
        exec("\n".join(lines), scope)  # noqa: S102 - code generated from the plan alone
        return scope["solve_one"]


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
