"""The initial guess of a batched solve: an acid–base-only proton balance, then
rescalings of the other free activities for their complexes."""

from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from ...activity._base import BoundModel
from .._sparse import SparseRows, weighted_sum
from .numerics import IONIC_STRENGTH_CAP, LN_C_CEILING, all_set, clip
from .structure import Families, Problem, Structure, ln_gamma_at

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
