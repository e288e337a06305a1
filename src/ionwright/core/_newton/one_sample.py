"""One sample's solve on Python floats: the float mirror of the batched Newton core.

A single solve (``ionwright.solve``) runs the batch's steps with its numbers on Python
floats, because numpy's ~1 µs per call dominates vectors of a few dozen numbers. Every
function here repeats one vector operation of :mod:`.guess`, :mod:`.fast`,
:mod:`.structure` or the solver in the batch's order, with numpy's rules for max, min and
division (:mod:`.floats`), numpy's own ``exp`` and ``log`` and the written-out sparse
products (``SparseRows.apply_one``), so that a sample alone has the bits it has in any
batch. Change an operation here and in its vector twin together:
``tests/unit/test_one_sample.py`` holds one parity test per operation.
"""

from __future__ import annotations

import math
from typing import NamedTuple, cast

import numpy as np

from ...activity._base import BoundModel, TermsModel
from .guess import (_BRACKET_START, GUESS_ITERATIONS, GUESS_SWEEPS, GUESS_TOLERANCE,
                    SWEEP_LIMIT, _OnePlan, guess_plan)
from .numerics import (ARMIJO, IONIC_STRENGTH_CAP, LN_C_CEILING, MAX_HALVINGS,
                       RESIDUAL_TOLERANCE, ROUND_OFF, STEP_CAP, STEP_TOLERANCE)
from .floats import fdiv, fmax, fmin, largest_magnitude, scaled_merit, sum_of_squares
from . import fast as vector_fast  # FAST_ITERATIONS read when called (tests lower it)
from .structure import Coupling, Problem


# -- activity coefficients ----------------------------------------------------------------
def model_terms(bound: BoundModel, coupling: Coupling, u: float
                ) -> tuple[list, list]:
    """:func:`.structure.model_terms` for one sample at u, as lists of Python floats. A model may
    give ``terms_one(u)`` with the bits of its ``terms`` on floats (Davies does)."""
    if coupling.own_terms and hasattr(bound, "terms_one"):
        return bound.terms_one(u)
    at_u = np.array([u])
    if coupling.own_terms:
        phi, dphi = cast(TermsModel, bound).terms(at_u)
        return phi[:, 0].tolist(), dphi[:, 0].tolist()
    return bound.ln_gamma(at_u)[0].tolist(), bound.d_ln_gamma_du(at_u)[0].tolist()


def ln_gamma(coupling: "Coupling | None", bound: BoundModel, u: float) -> list:
    """:func:`.structure.ln_gamma_at` for one sample at u, as a list of Python floats."""
    if coupling is not None and coupling.own_terms:
        return coupling.gamma.apply_one(model_terms(bound, coupling, u)[0])
    return bound.ln_gamma(np.array([u]))[0].tolist()


# -- the initial guess -----------------------------------------------------------------
def _exp_capped(values) -> list:
    """exp(min(v, ceiling)) of each value, by numpy's exponential (the batch's bits)."""
    return np.exp([LN_C_CEILING if v > LN_C_CEILING else v for v in values]).tolist()


def initial_guess(problem: Problem, bound: BoundModel) -> tuple[np.ndarray, np.ndarray]:
    """:func:`.guess.initial_guess` for one sample, its numbers on Python floats: the same
    operations in the same order (exponentials and logarithms by numpy)."""
    st = problem.structure
    one = guess_plan(st).one
    h_col = st.proton
    full = problem.full_totals[:, 0].tolist()
    u_max = float(problem.u_max[0])
    u0 = math.sqrt(u_max * u_max / IONIC_STRENGTH_CAP)
    base = [k - g for k, g in zip(problem.ln_k[:, 0].tolist(),
                                  ln_gamma(problem.coupling, bound, u0))]
    y = problem.fixed_y[:, 0].tolist()
    member_k = _exp_capped([base[i] if i >= 0 else -math.inf
                            for row in one.members for i in row])
    if h_col < 0:
        h = 0.0
    elif not st.free[h_col]:
        h = y[h_col]
    else:
        h = _proton(problem, one, base, y, member_k, full)
    if one.owners:
        x = np.exp([p * h for p in one.family_powers]).tolist()
        partition = guess_plan(st).members.apply_one(
            [k * x[i] for k, i in zip(member_k, one.family_power)])
        carried = np.log([fmax(full[o], 1e-300) for o in one.owners]).tolist()
        for o, a, b in zip(one.owners, carried, np.log(partition).tolist()):
            y[o] = a - b
    if h_col >= 0:
        y[h_col] = h
    conc = _exp_capped([b + v for b, v in zip(base, st.nu.apply_one(y))])
    totals = problem.totals[:, 0].tolist()
    wanted = [totals[r] for r in one.sweep_rows]
    low = SWEEP_LIMIT ** -1
    for _ in range(GUESS_SWEEPS):
        ratio = [fmin(fmax(fdiv(w, c), low), SWEEP_LIMIT)
                 for w, c in zip(wanted, st.sweep_carried.apply_one(conc))]
        log_ratio = np.log(ratio).tolist()
        for j, v in zip(one.sweep_components, log_ratio):
            y[j] += v
        conc = [c * e for c, e in zip(conc, np.exp(st.sweep_nu.apply_one(log_ratio)).tolist())]
    ionic = st.half_z2.apply_one(conc)[0]
    u = math.sqrt(fmin(fmax(ionic, 0.0), u_max * u_max))
    return np.array(y)[:, None], np.array([u])


def _proton(problem: Problem, one: _OnePlan, base: list, y: list, member_k: list,
                full: list) -> float:
    """:func:`.guess.guess_proton` for one sample, its numbers on Python floats."""
    st = problem.structure
    plan = guess_plan(st)
    width = len(one.members[0]) if one.members else 0
    if (~st.free).any():
        shifted = st.nu.apply_one(y)
        lone = [base[i] + shifted[i] for i in one.lone]
    else:
        lone = [base[i] for i in one.lone]
    term_k = _exp_capped(lone) + [member_k[f * width + m] for f in one.varying
                                  for m in range(width)]
    nv = len(one.varying)
    fam_tot = [full[one.owners[f]] for f in one.varying]
    const = 0.0
    for f, w in one.constant_protons:
        const += w * full[one.owners[f]]
    t_h = full[st.proton]
    given = fmax(const, 0.0) + fmax(-t_h, 0.0)
    taken = fmax(-const, 0.0) + fmax(t_h, 0.0)
    lo, hi, h = _BRACKET_START
    with np.errstate(divide="ignore", invalid="ignore"):
        for _ in range(GUESS_ITERATIONS):
            x = np.exp([p * h for p in one.powers]).tolist()
            moments = plan.moments.apply_one([c * x[i] for c, i in zip(term_k, one.term_power)])
            balance = [given + moments[0], 0.0 + moments[1], taken + moments[2],
                       0.0 + moments[3]]
            sums = [0.0, 0.0, 0.0, 0.0]
            for f in range(nv):  # the families' shares, summed as plan.families does
                total, s_nu, s_pos, s_neg, s_pos_nu, s_neg_nu = moments[4 + f::nv]
                t = fam_tot[f]
                if total == 0.0:  # every member underflowed: numpy's 0/0 makes NaN shares
                    total = math.nan
                mean = s_nu / total
                pos = s_pos / total
                neg = s_neg / total
                sums[0] += pos * t
                sums[1] += (s_pos_nu / total - pos * mean) * t
                sums[2] += neg * t
                sums[3] += (neg * mean - s_neg_nu / total) * t
            if nv:
                balance = [b + v for b, v in zip(balance, sums)]
            h, lo, hi, settled = _bracketed_step_one(h, lo, hi, *balance)
            if settled:
                break
    return h


def _bracketed_step_one(h: float, lo: float, hi: float, p: float, dp: float, n: float,
                        dn: float) -> tuple[float, float, float, bool]:
    """:func:`.guess._bracketed_step` for one sample on Python floats (ln by numpy)."""
    g = float(np.log(fdiv(p, n)))
    if g > 0:
        hi = h
    else:
        lo = h
    trial = h - fdiv(g, fdiv(dp, p) + fdiv(dn, n))
    new = trial if lo < trial < hi else 0.5 * (lo + hi)
    return new, lo, hi, abs(new - h) < GUESS_TOLERANCE or hi - lo < GUESS_TOLERANCE


# -- the fast path ---------------------------------------------------------------------

class _LinearisedOne(NamedTuple):
    """:class:`.fast.Linearised` for one sample, as lists of Python floats (d a float)."""

    res: list
    scale: list
    prod: list
    a: list
    d: float


def augmented(problem: Problem, bound: BoundModel, y: list, u: float,
              given: tuple[list, list, list]) -> _LinearisedOne:
    """:func:`.fast.augmented` for one sample on Python floats: y (c,) and u, with *given*
    its (ln K, free totals, scale floors) as lists. The same operations in the same
    order; the exponentials are numpy's, over the whole vector at once."""
    st, cp = problem.structure, problem.coupling
    assert cp is not None  # the fast path always has one (coupling_for)
    nf = st.nf
    ln_k, totals, floor = given
    phi, dphi = model_terms(bound, cp, u)
    lnc = cp.nu.apply_one(y + phi)
    conc = np.exp([LN_C_CEILING if (v := a + k) > LN_C_CEILING else v  # np.minimum's NaN
                   for a, k in zip(lnc, ln_k)]).tolist()
    prod = cp.weights.apply_one(conc)
    first = cp.side_row
    if cp.terms:
        d0 = dphi[0]
        side = [v * d0 for v in prod[first:first + nf + 1]]
    else:
        side = [0.0] * (nf + 1)
    for p in range(1, cp.terms):
        first += nf + 1
        dp = dphi[p]
        side = [acc + v * dp for acc, v in zip(side, prod[first:first + nf + 1])]
    uu = u * u
    ionic = prod[2 * nf]
    res = [v - t for v, t in zip(prod[:nf], totals)]
    res.append(ionic - uu)
    scale = [v + f for v, f in zip(prod[nf:2 * nf], floor)]
    scale.append(fmax(ionic, uu) + 1e-300)
    return _LinearisedOne(res, scale, prod, side[:nf], side[nf] - 2.0 * u)


def fast_path(problem: Problem, bound: BoundModel, y: np.ndarray, u: np.ndarray,
              iterations: np.ndarray) -> np.ndarray:
    """:func:`.fast.fast_path` for a single sample, all its numbers on Python floats: the same
    IEEE operations in the same order, so the same bits, at a fraction of numpy's
    per-call cost (tested sample by sample). *y* (c, 1) and *u* (1,) are updated."""
    st = problem.structure
    cols = None if st.nf == st.free.size else st.free.nonzero()[0].tolist()
    nf, u_max = st.nf, float(problem.u_max[0])
    given = (problem.ln_k[:, 0].tolist(), problem.totals[:, 0].tolist(),
             problem.scale_floor[:, 0].tolist())
    y_now, u_now = y[:, 0].tolist(), float(u[0])
    lin = augmented(problem, bound, y_now, u_now, given)
    for it in range(1, vector_fast.FAST_ITERATIONS + 1):
        dy, du = st.factor.bordered_one(lin.prod, lin.res[:nf], lin.res[nf], lin.a,
                                        lin.prod[2 * nf + 1:3 * nf + 1], lin.d)
        biggest = largest_magnitude(dy)
        scale = lin.scale
        scaled = [r / s for r, s in zip(lin.res, scale)]
        worst = largest_magnitude(scaled)
        size = fmax(biggest, abs(du) / fmax(u_now, 1e-12))
        if worst <= RESIDUAL_TOLERANCE and size <= STEP_TOLERANCE:
            iterations[0] = it                 # the last, tiny step is taken without a search
            y[:, 0] = _moved(y_now, cols, dy, None)
            u[0] = fmin(fmax(u_now + du, 0.0), u_max)
            return np.ones(1, dtype=bool)
        at_round_off = worst <= ROUND_OFF
        merit = sum_of_squares(scaled)
        shrink = fmin(1.0, STEP_CAP / fmax(biggest, 1e-300))
        if shrink != 1.0:                      # × 1.0 is exact: the usual full step as is
            dy, du = [v * shrink for v in dy], du * shrink
        alpha = None                           # the full step first, then halvings
        for _ in range(MAX_HALVINGS):
            yt = _moved(y_now, cols, dy, alpha)
            if alpha is None:
                ut = fmin(fmax(u_now + du, 0.0), u_max)
                decrease = 1.0 - 2.0 * ARMIJO * shrink
            else:
                ut = fmin(fmax(u_now + alpha * du, 0.0), u_max)
                decrease = 1.0 - 2.0 * ARMIJO * alpha * shrink
            trial = augmented(problem, bound, yt, ut, given)
            m = scaled_merit(trial.res, scale)
            if (math.isfinite(m) and m <= decrease * merit) or (
                    at_round_off and all(math.isfinite(v) for v in trial.res)):
                y_now, u_now, lin = yt, ut, trial
                break
            alpha = 0.5 if alpha is None else 0.5 * alpha
        else:                                  # no acceptable step: the careful path takes it
            iterations[0] = it
            y[:, 0], u[0] = y_now, u_now
            return np.zeros(1, dtype=bool)
    iterations[0] = vector_fast.FAST_ITERATIONS
    y[:, 0], u[0] = y_now, u_now
    return np.zeros(1, dtype=bool)


def _moved(y: list, cols: list | None, step: list, alpha: float | None) -> list:
    """y with y[cols] += (alpha ×) step as a new list (cols None: every component)."""
    if cols is None:
        if alpha is None:
            return [a + v for a, v in zip(y, step)]
        return [a + alpha * v for a, v in zip(y, step)]
    out = list(y)
    if alpha is None:
        for j, v in zip(cols, step):
            out[j] += v
    else:
        for j, v in zip(cols, step):
            out[j] += alpha * v
    return out
# -- the answer ----------------------------------------------------------------------
def concentrations(problem: Problem, y: np.ndarray, ln_g: np.ndarray,
                        ln_aw: np.ndarray | None) -> np.ndarray:
    """exp(ln K + ν·y [+ ν_w ln a_w] − ln γ), capped, for one sample on Python floats
    (the batch's operations in its order); (s, 1)."""
    st = problem.structure
    lnc = [v + k for v, k in zip(st.nu.apply_one(y[:, 0].tolist()), problem.ln_k[:, 0].tolist())]
    if ln_aw is not None:
        aw = float(ln_aw[0])
        lnc = [v + aw * w for v, w in zip(lnc, st.nu_water.tolist())]
    capped = [LN_C_CEILING if (v := a - g) > LN_C_CEILING else v
              for a, g in zip(lnc, ln_g[:, 0].tolist())]
    return np.exp(capped)[:, None]


def residual(problem: Problem, conc: np.ndarray) -> tuple[float, bool]:
    """(worst relative mass-balance residual, all finite) of one sample's concentrations
    (s, 1), as the solver stores them for a batch."""
    st = problem.structure
    c = conc[:, 0].tolist()
    worst = largest_magnitude([
        (v - t) / (a + f) for v, t, a, f in zip(
            st.nu_free.apply_one(c), problem.totals[:, 0].tolist(),
            st.abs_nu_free.apply_one(c), problem.scale_floor[:, 0].tolist())])
    return worst, math.isfinite(worst) and all(map(math.isfinite, c))
