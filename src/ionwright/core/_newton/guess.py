"""The initial guess of a batched solve: an acid–base-only proton balance, then
rescalings of the other free activities for their complexes."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from ...activity._base import BoundModel
from .._sparse import SparseRows, weighted_sum
from .floats import fdiv, fmax, fmin
from .numerics import IONIC_STRENGTH_CAP, LN_C_CEILING, all_set, clip
from .structure import Families, Problem, Structure, ln_gamma_at, ln_gamma_one

GUESS_ITERATIONS = 4           # safeguarded 1-D Newton steps of the initial guess
GUESS_TOLERANCE = 0.2          # ln a(H+) accuracy of the guess; more does not pay
GUESS_SWEEPS = 2               # rescalings of the other free activities for their complexes
SWEEP_LIMIT = 1e20             # largest factor one rescaling may apply


def guess_plan(st: Structure) -> GuessPlan:
    """The :class:`GuessPlan` of *st*, built once and kept on the structure."""
    plan = st.memo.get("guess_plan")
    if plan is None:
        plan = st.memo["guess_plan"] = GuessPlan.of(st)
    return plan


@dataclass(frozen=True)
class GuessPlan:
    """What the initial guess needs that depends on the structure alone.

    For the proton balance: the lone proton-bearing species (``lone``), the distinct
    powers ν of a(H+) that occur and, per term (lone species, then every member of the
    families whose proton number varies, padding included), the index of its power.
    ``moments`` maps those terms to [Σν⁺c, Σν⁺²c, Σν⁻c, Σν⁻²c] of the lone species and,
    per varying family, [Σw, Σνw, Σν⁺w, Σν⁻w, Σν⁺νw, Σν⁻νw]; ``families`` sums the
    four family contributions over families. For the share-out among members: the
    distinct ν(H+) of all families and each member's index into them.
    """

    lone: np.ndarray
    powers: np.ndarray
    term_power: np.ndarray
    moments: SparseRows
    families: SparseRows
    family_powers: np.ndarray
    family_power: np.ndarray
    members: SparseRows             # (F, F·M): sums the members of each family
    one: "_OnePlan"                 # the index arrays as lists, for one sample

    @classmethod
    def of(cls, st: "Structure") -> "GuessPlan":
        fam = st.families
        lone = np.concatenate([fam.proton_only, fam.fixed_members])
        lone_nu = st.nu_dense[lone, st.proton]
        member_nu = fam.proton_numbers[fam.varying]                 # (Fv, M)
        nf, width = member_nu.shape
        powers = np.unique(np.concatenate([lone_nu, member_nu.ravel(), [0.0]]))
        pos, neg = np.maximum(lone_nu, 0.0), np.maximum(-lone_nu, 0.0)
        lone_rows = np.zeros((4, lone.size + nf * width))
        lone_rows[:, :lone.size] = [pos, pos * pos, neg, neg * neg]
        family_rows = np.zeros((6 * nf, lone.size + nf * width))
        for f in range(nf):
            cols = lone.size + f * width + np.arange(width)
            v = member_nu[f]
            vp, vn = np.maximum(v, 0.0), np.maximum(-v, 0.0)
            for q, weight in enumerate((np.ones(width), v, vp, vn, vp * v, vn * v)):
                family_rows[q * nf + f, cols] = weight
        blocks = np.kron(np.eye(4), np.ones((1, nf)))               # (4, 4 Fv)
        family_powers, where = np.unique(fam.proton_numbers, return_inverse=True)
        term_power = np.searchsorted(powers, np.concatenate([lone_nu, member_nu.ravel()]))
        return cls(lone, powers, term_power,
                   SparseRows(np.concatenate([lone_rows, family_rows])), SparseRows(blocks),
                   family_powers, where.reshape(fam.members.shape),
                   SparseRows(np.kron(np.eye(fam.members.shape[0]),
                                      np.ones((1, fam.members.shape[1])))),
                   _OnePlan(lone.tolist(), powers.tolist(), term_power.tolist(),
                            fam.members.tolist(), fam.owners.tolist(), fam.varying.tolist(),
                            [(f, w) for f, w in enumerate(fam.constant_protons.tolist()) if w],
                            family_powers.tolist(), where.ravel().tolist(),
                            st.sweep_rows.tolist(), st.sweep_components.tolist()))



def initial_guess(problem: Problem, bound: BoundModel) -> tuple[np.ndarray, np.ndarray]:
    """Cheap start: acid–base only proton balance, then rescaled for the complexes.

    Complexes of two or more components are ignored at first, so each other component
    is shared among itself and its protonated or hydrolysed forms in proportions set by
    a(H+) alone, with γ at the fully dissociated ionic strength; the proton balance of
    that reduced problem fixes a(H+). :data:`GUESS_SWEEPS` rescalings of each other
    free activity by total / carried then account for the complexes. Returns
    (y (c, k), u (k,)).
    """
    if problem.size == 1:
        return _initial_guess_one(problem, bound)
    st = problem.structure
    fam = st.families
    h_col = st.proton
    u0 = np.sqrt(problem.u_max ** 2 / IONIC_STRENGTH_CAP)
    base = problem.ln_k - ln_gamma_at(problem.coupling, bound, u0)             # (s, k)
    y = problem.fixed_y.copy()
    member_k = np.exp(np.minimum(member_bases(base, fam), LN_C_CEILING))  # (F, M, k)
    if h_col < 0:
        h = np.zeros(problem.size)
    elif not st.free[h_col]:
        h = problem.fixed_y[h_col]
    else:
        h = guess_proton(problem, base, y, member_k[fam.varying])
    if fam.owners.size:
        plan = guess_plan(st)
        x = np.exp(plan.family_powers[:, None] * h)         # a(H+)^ν for each distinct ν
        partition = plan.members @ (member_k * x[plan.family_power]).reshape(-1, problem.size)
        y[fam.owners] = (np.log(np.maximum(problem.full_totals[fam.owners], 1e-300))
                         - np.log(partition))
    if h_col >= 0:
        y[h_col] = h
    conc = np.exp(np.minimum(base + st.nu @ y, LN_C_CEILING))
    wanted = problem.totals[st.sweep_rows]
    for _ in range(GUESS_SWEEPS):
        ratio = clip(wanted / (st.sweep_carried @ conc), SWEEP_LIMIT ** -1, SWEEP_LIMIT)
        log_ratio = np.log(ratio)
        y[st.sweep_components] += log_ratio
        conc *= np.exp(st.sweep_nu @ log_ratio)              # c_i ∝ Π_j a_j^ν_ij
    u = np.sqrt(clip(st.half_z2 @ conc, 0.0, problem.u_max ** 2)[0])
    return y, u


def member_bases(base: np.ndarray, fam: Families) -> np.ndarray:
    """ln K − ln γ of each family member (F, M, k); −inf for padding."""
    out = base[np.maximum(fam.members, 0)]
    out[fam.members < 0] = -np.inf
    return out


def guess_proton(problem: Problem, base: np.ndarray, y_fixed: np.ndarray,
                 member_k: np.ndarray) -> np.ndarray:
    """h = ln a(H+) solving the reduced proton balance P(h) = N(h), per sample.

    P collects the protons carried (ν > 0, and −T(H+) when negative), N those given up
    (ν < 0, and T(H+) when positive); Newton steps on g = ln P − ln N, which is monotone
    and nearly linear far from its root, are kept inside a shrinking bracket and fall
    back to bisection outside it. Every term is K·a(H+)^ν with K computed once (the lone
    species and *member_k*, the members of the families whose proton number varies), so
    an iteration needs one exponential per distinct ν, and two sparse products give
    P, dP/dh, N and dN/dh of every sample.
    """
    st = problem.structure
    fam = st.families
    plan = guess_plan(st)
    k = problem.size
    lone_lnc = (base + st.nu @ y_fixed)[plan.lone] if (~st.free).any() else base[plan.lone]
    term_k = np.concatenate([np.exp(np.minimum(lone_lnc, LN_C_CEILING)),
                             member_k.reshape(-1, k)])
    nv = fam.varying.size
    fam_tot = problem.full_totals[fam.owners[fam.varying]]
    const = weighted_sum(problem.full_totals[fam.owners], fam.constant_protons)
    t_h = problem.full_totals[st.proton]
    fixed_part = np.zeros((4, k))                           # [P, dP/dh, N, dN/dh]
    fixed_part[0] = np.maximum(const, 0.0) + np.maximum(-t_h, 0.0)
    fixed_part[2] = np.maximum(-const, 0.0) + np.maximum(t_h, 0.0)
    lo, hi, h = (np.full(k, v) for v in _BRACKET_START)
    settled = np.zeros(k, dtype=bool)
    share = np.empty((4, nv, k))
    with np.errstate(divide="ignore", invalid="ignore"):
        for _ in range(GUESS_ITERATIONS):  # all samples at once; settled ones stay put
            x = np.exp(plan.powers[:, None] * h)            # a(H+)^ν for each distinct ν
            moments = plan.moments @ (term_k * x[plan.term_power])
            balance = fixed_part + moments[:4]
            if nv:
                total, s_nu, s_pos, s_neg, s_pos_nu, s_neg_nu = moments[4:].reshape(6, nv, k)
                mean = s_nu / total
                np.divide(s_pos, total, out=share[0])
                np.divide(s_pos_nu, total, out=share[1])
                share[1] -= share[0] * mean
                np.divide(s_neg, total, out=share[2])
                np.multiply(share[2], mean, out=share[3])
                share[3] -= s_neg_nu / total
                share *= fam_tot
                balance += plan.families @ share.reshape(4 * nv, k)
            h, lo, hi, settled = _bracketed_step(h, lo, hi, settled, *balance)
            if all_set(settled):
                break
    return h


_BRACKET_START = tuple(float(np.log(v)) for v in (1e-17, 10.0, 1e-7))  # lo, hi, h


# -- one sample: the same steps with its numbers on Python floats -------------------------

class _OnePlan(NamedTuple):
    """The structure's index arrays as lists, for the one-sample guess."""

    lone: list
    powers: list
    term_power: list
    members: list           # (F, M) species, −1 for padding
    owners: list
    varying: list
    constant_protons: list  # (family, ν) of the families whose ν(H+) does not vary
    family_powers: list
    family_power: list      # flat (F·M)
    sweep_rows: list
    sweep_components: list


def _exp_capped(values) -> list:
    """exp(min(v, ceiling)) of each value, by numpy's exponential (the batch's bits)."""
    return np.exp([LN_C_CEILING if v > LN_C_CEILING else v for v in values]).tolist()


def _initial_guess_one(problem: Problem, bound: BoundModel) -> tuple[np.ndarray, np.ndarray]:
    """:func:`initial_guess` for one sample, its numbers on Python floats: the same
    operations in the same order (exponentials and logarithms by numpy)."""
    st = problem.structure
    one = guess_plan(st).one
    h_col = st.proton
    full = problem.full_totals[:, 0].tolist()
    u_max = float(problem.u_max[0])
    u0 = math.sqrt(u_max * u_max / IONIC_STRENGTH_CAP)
    base = [k - g for k, g in zip(problem.ln_k[:, 0].tolist(),
                                  ln_gamma_one(problem.coupling, bound, u0))]
    y = problem.fixed_y[:, 0].tolist()
    member_k = _exp_capped([base[i] if i >= 0 else -math.inf
                            for row in one.members for i in row])
    if h_col < 0:
        h = 0.0
    elif not st.free[h_col]:
        h = y[h_col]
    else:
        h = _proton_one(problem, one, base, y, member_k, full)
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


def _proton_one(problem: Problem, one: _OnePlan, base: list, y: list, member_k: list,
                full: list) -> float:
    """:func:`guess_proton` for one sample, its numbers on Python floats."""
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
    """:func:`_bracketed_step` for one sample on Python floats (ln by numpy)."""
    g = float(np.log(fdiv(p, n)))
    if g > 0:
        hi = h
    else:
        lo = h
    trial = h - fdiv(g, fdiv(dp, p) + fdiv(dn, n))
    new = trial if lo < trial < hi else 0.5 * (lo + hi)
    return new, lo, hi, abs(new - h) < GUESS_TOLERANCE or hi - lo < GUESS_TOLERANCE


def _bracketed_step(h, lo, hi, settled, p, dp, n, dn):
    """One safeguarded Newton step on g = ln P − ln N, arrays over samples: the bracket
    shrinks to the side of the root, a step leaving it becomes bisection, and settled
    samples stay put. Returns (h, lo, hi, settled)."""
    g = np.log(p / n)
    above = g > 0
    hi = np.where(above, h, hi)
    lo = np.where(above, lo, h)
    trial = h - g / (dp / p + dn / n)
    inside = (trial > lo) & (trial < hi)                    # False for NaN and ±inf
    new = np.where(settled, h, np.where(inside, trial, 0.5 * (lo + hi)))
    settled = settled | (np.abs(new - h) < GUESS_TOLERANCE) | (hi - lo < GUESS_TOLERANCE)
    return new, lo, hi, settled
