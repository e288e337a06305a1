"""Pitzer ion-interaction model: activity coefficients, osmotic coefficient, water activity.

ln γ of every ion and neutral species and ln a(H2O) come from the virial expansion of
the excess Gibbs energy in the form of Harvie, Møller & Weare (1984): β0, β1, β2 and Cφ
for each cation–anion pair, θ and ψ for mixing (with the unsymmetrical E-θ terms of
higher-order electrostatics) and λ for neutral species. Everything is vectorised over
the batch axis with ion-pair parameter matrices; Aφ comes from water at each sample's
temperature. Parameters are read from ``constants/pitzer.toml`` (schema in its header).

Which species exist is part of the model. Ion pairs whose association the binary
parameters already describe (NaSO4-, MgSO4, ... listed in the parameter table) are not
formed: :attr:`PitzerModel.ion_pairs` leaves them out of the compiled system (the result's
``ion_pairs`` says so); a species list bound directly that still holds one gives it
ln γ = :data:`NOT_FORMED_LN_GAMMA`, so it stays at a negligible molality. The complexes HSO4-, CaCO3, MgCO3,
MgOH+ (Harvie, Møller & Weare's explicit ones), CaOH+ and every complex the parameters
do not cover are kept with the formation constants of the constant table. Cation–anion
pairs and neutral species without parameters are named in a note, never silently zero.

References
----------
Pitzer, K.S. (1973) J. Phys. Chem. 77, 268–277 (the equations).
Pitzer, K.S. & Mayorga, G. (1973) J. Phys. Chem. 77, 2300–2308; (1974) J. Solution
Chem. 3, 539–546 (α1 and α2 by charge type).
Pitzer, K.S. & Kim, J.J. (1974) J. Am. Chem. Soc. 96, 5701–5707 (mixtures: θ, ψ).
Pitzer, K.S. (1975) J. Solution Chem. 4, 249–265 (unsymmetrical mixing, J(x)).
Harvie, C.E., Møller, N. & Weare, J.H. (1984) Geochim. Cosmochim. Acta 48, 723–751.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from functools import cached_property

import numpy as np

from ..chemistry._water import WATER_MOLAR_MASS_G, osmotic_A_phi
from ._base import LN10, SpeciesProperties
from ._pairs import IonPairSet, LeftOut
from ..data._parameter_tables import ParameterTable
from ..data._pitzer_table import (DERIVATIVE_KEYS, CationAnion, PitzerParameters,
                                  bundled_parameters, merged_parameters, parse_parameters)

PITZER_B = 1.2                      # kg^½ mol^-½, Pitzer (1973)
# J(x) ≈ x / (4 + C1 x^-C2 exp(−C3 x^C4)), Pitzer (1975); within about 1 % for x ≥ 0.1
J_APPROXIMATION = (4.581, 0.7237, 0.0120, 0.528)
NOT_FORMED_LN_GAMMA = 230.0         # γ ≈ 1e100: keeps a not-formed pair at ~1e-100 of its
                                    # ideal molality while every number stays finite
SIGNIFICANT_SHARE = 0.01            # an ion matters if it carries ≥ 1 % of I
TEMPERATURE_TOLERANCE_C = 0.5       # closer than this to 25 °C counts as 25 °C
IONIC_STRENGTH_FLOOR = 1e-100       # keeps B'/I and E-θ/I finite in pure water
SERIES_BELOW = 0.1                  # g(x), g'(x) by their series below this x
SERIES_TERMS = 10                   # k = 2..11: truncation below 1e-15 at x = 0.1
WATER_KG_PER_MOL = WATER_MOLAR_MASS_G / 1000.0




# ---------------------------------------------------------------------------------------
# Functions of the equations
# ---------------------------------------------------------------------------------------

def j_function(x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """J(x) and J'(x) of unsymmetrical mixing, by Pitzer's approximation.

    J(x) = x / (4 + C1 x^(−C2) exp(−C3 x^C4)); J' is its exact derivative, so that the
    model stays thermodynamically consistent (Gibbs–Duhem holds to round-off).

    References
    ----------
    Pitzer, K.S. (1975) J. Solution Chem. 4, 249–265, eq. (47).
    """
    c1, c2, c3, c4 = J_APPROXIMATION
    x = np.maximum(np.asarray(x, dtype=float), 1e-300)
    ln_x = np.log(x)
    x_c4 = np.exp(c4 * ln_x)
    tail = c1 * np.exp(-c2 * ln_x - c3 * x_c4)
    denom = 4.0 + tail
    j = x / denom
    jp = (1.0 + tail * (c2 + c3 * c4 * x_c4) / denom) / denom
    return j, jp


def _series_coefficients() -> tuple[np.ndarray, np.ndarray]:
    """Power-series coefficients (in x^0, x^1, ...) of g(x) and g'(x).

    1 − (1+x)e^−x = Σ_{k≥2} (−1)^k (k−1) x^k/k! and
    1 − (1+x+x²/2)e^−x = Σ_{k≥3} (−1)^(k+1) (k−1)(k−2)/2 · x^k/k!.
    """
    ks = np.arange(2, 2 + SERIES_TERMS)
    fact = np.array([math.factorial(k) for k in ks], dtype=float)
    g = 2.0 * (-1.0) ** ks * (ks - 1) / fact
    gp = -((-1.0) ** (ks + 1)) * (ks - 1) * (ks - 2) / fact
    return g, gp


_G_SERIES, _GP_SERIES = _series_coefficients()


def _g(x: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """g(x) = 2[1 − (1+x)e^−x]/x², g'(x) = −2[1 − (1+x+x²/2)e^−x]/x² and e^−x (Pitzer 1973).

    Below :data:`SERIES_BELOW` g and g' come from their power series: the closed forms
    cancel there. e^−x is returned because B^φ needs it too.
    """
    e = np.exp(-x)
    small = x < SERIES_BELOW
    xs = np.where(small, SERIES_BELOW, x)
    es = np.where(small, np.exp(-SERIES_BELOW), e)
    g = 2.0 * (1.0 - (1.0 + xs) * es) / xs ** 2
    gp = -2.0 * (1.0 - (1.0 + xs + 0.5 * xs ** 2) * es) / xs ** 2
    if small.any():
        g = np.where(small, np.polynomial.polynomial.polyval(x, _G_SERIES), g)
        gp = np.where(small, np.polynomial.polynomial.polyval(x, _GP_SERIES), gp)
    return g, gp, e


def debye_huckel_f_gamma(ionic_strength: np.ndarray, a_phi: np.ndarray) -> np.ndarray:
    """f^γ = −Aφ [√I/(1 + b√I) + (2/b) ln(1 + b√I)], the long-range term of ln γ / z².

    References
    ----------
    Pitzer, K.S. (1973) J. Phys. Chem. 77, 268–277.
    """
    s = np.sqrt(ionic_strength)
    return -a_phi * (s / (1.0 + PITZER_B * s) + (2.0 / PITZER_B) * np.log1p(PITZER_B * s))


# ---------------------------------------------------------------------------------------
# Layout: the parameter matrices of one species list
# ---------------------------------------------------------------------------------------

@dataclass(frozen=True)
class _LikeCharge:
    """The ions of one sign grouped by charge for the E-θ terms, which depend on charges only.

    Sums over ion pairs of Eθ become sums over charge classes: with M_z the molality of
    the ions of charge z, Σ_j m_j Eθ_ij = Σ_z Eθ(z_i, z) M_z. No (n, k, k) array is built.
    """

    member: np.ndarray      # (k, g) 1 where ion i has the charge of class g
    classes: np.ndarray     # (q, 2) the two classes of each unlike charge pair
    pairs: np.ndarray       # (q, 3) z_i z_j, z_i², z_j² of each unlike charge pair

    @classmethod
    def of(cls, z: np.ndarray) -> _LikeCharge:
        charges = np.unique(z)
        member = (z[:, None] == charges[None, :]).astype(float)
        classes = np.array([(i, j) for i in range(charges.size)
                            for j in range(i + 1, charges.size)], dtype=int).reshape(-1, 2)
        a, b = charges[classes[:, 0]], charges[classes[:, 1]]
        return cls(member, classes, np.stack([a * b, a * a, b * b], axis=1).reshape(-1, 3))

    def e_theta(self, ionic_strength: np.ndarray, a_phi: np.ndarray):
        """Eθ and Eθ' = ∂Eθ/∂I of each unlike charge pair, (n, q).

        Eθ = z_i z_j/(4I) [J(x_ij) − J(x_ii)/2 − J(x_jj)/2], x_ij = 6 z_i z_j Aφ √I
        (Pitzer 1975, eqs. 41–44).
        """
        x = 6.0 * self.pairs[None, :, :] * (a_phi * np.sqrt(ionic_strength))[:, None, None]
        j, jp = j_function(x)
        weights = np.array([1.0, -0.5, -0.5])
        strength = ionic_strength[:, None]
        zz = self.pairs[:, 0]
        e = zz / (4.0 * strength) * (j @ weights)
        ep = -e / strength + zz / (8.0 * strength ** 2) * ((x * jp) @ weights)
        return e, ep

    def sums(self, m: np.ndarray, ionic_strength: np.ndarray, a_phi: np.ndarray):
        """(Σ_j m_j Eθ_ij per ion (n, k), Σ_{i<j} m_i m_j Eθ_ij, the same of Eθ') (n,)."""
        n, k = m.shape
        if not self.classes.size:
            return np.zeros((n, k)), np.zeros(n), np.zeros(n)
        e, ep = self.e_theta(ionic_strength, a_phi)
        by_class = m @ self.member                                   # (n, g)
        first, second = by_class[:, self.classes[:, 0]], by_class[:, self.classes[:, 1]]
        per_class = np.zeros_like(by_class)
        np.add.at(per_class.T, self.classes[:, 0], (e * second).T)
        np.add.at(per_class.T, self.classes[:, 1], (e * first).T)
        both = first * second
        return per_class @ self.member.T, np.sum(e * both, axis=1), np.sum(ep * both, axis=1)


@dataclass(frozen=True)
class _Layout:
    """Index sets and parameter arrays for one species list (temperature-free).

    Binary parameters are flat over the P cation–anion pairs that have them (pairs
    without parameters add nothing). The β1 and β2 terms are grouped by their α: g(α√I)
    depends on the sample and α only, so the functions are evaluated once per distinct
    α and mixed in with one matrix product.
    """

    formed: np.ndarray                      # (s,) bool
    cat: np.ndarray                         # species index of each cation
    ani: np.ndarray
    neu: np.ndarray
    zc: np.ndarray                          # (nc,) charges
    za: np.ndarray                          # (na,) absolute charges
    pair_c: np.ndarray                      # (P,) cation (index into cat) of each pair
    pair_a: np.ndarray                      # (P,) anion (index into ani) of each pair
    to_c: np.ndarray                        # (P, nc) 1 where pair p holds cation c
    to_a: np.ndarray                        # (P, na) 1 where pair p holds anion a
    beta0: np.ndarray                       # (P,) at the reference temperature
    d_beta0: np.ndarray                     # (P,) per K
    alphas: np.ndarray                      # (u,) distinct α of the β1, β2 terms
    beta_by_alpha: np.ndarray               # (u, P) β1 or β2 that goes with each α
    d_beta_by_alpha: np.ndarray             # (u, P) per K
    c_phi: np.ndarray                       # (P,)
    d_c_phi: np.ndarray                     # (P,)
    c_scale: np.ndarray                     # (P,) 1 / (2 √(zc za)): Cφ → C
    theta_c: np.ndarray                     # (nc, nc)
    theta_a: np.ndarray                     # (na, na)
    psi_c: np.ndarray                       # (nc, nc·na)  ψ_cc'a, rows c, columns (c', a)
    psi_a: np.ndarray                       # (na, na·nc)  ψ_aa'c, rows a, columns (a', c)
    psi_c_for_a: np.ndarray                 # (na, nc·nc)  ψ_cc'a, rows a
    psi_a_for_c: np.ndarray                 # (nc, na·na)  ψ_aa'c, rows c
    lam_c: np.ndarray                       # (nn, nc)
    lam_a: np.ndarray                       # (nn, na)
    like_c: _LikeCharge
    like_a: _LikeCharge


def _layout(params: PitzerParameters, species: SpeciesProperties) -> _Layout:
    names = species.names
    z = species.charge
    formed = np.array([n not in params.not_formed for n in names])
    cat = np.flatnonzero(formed & (z > 0))
    ani = np.flatnonzero(formed & (z < 0))
    neu = np.flatnonzero(formed & (z == 0))
    zc, za = z[cat], -z[ani]
    nc, na, nn = cat.size, ani.size, neu.size
    found = [(i, j, params.binary.get((names[c], names[a])))
             for i, c in enumerate(cat) for j, a in enumerate(ani)]
    found = [(i, j, e) for i, j, e in found if e is not None]
    pair_c = np.array([i for i, _, _ in found], dtype=int)
    pair_a = np.array([j for _, j, _ in found], dtype=int)
    entries = [e for _, _, e in found]
    value = {k: np.array([getattr(e, k) if e else 0.0 for e in entries]) for k in
             DERIVATIVE_KEYS}
    slope = {k: np.array([e.d_dT.get(k, 0.0) if e else 0.0 for e in entries]) for k in
             DERIVATIVE_KEYS}
    terms = [(e.alpha1, "beta1", p) for p, e in enumerate(entries) if e and e.beta1] + [
        (e.alpha2, "beta2", p) for p, e in enumerate(entries) if e and e.beta2]
    alphas = np.unique([a for a, _, _ in terms])
    by_alpha = np.zeros((alphas.size, len(entries)))
    d_by_alpha = np.zeros_like(by_alpha)
    for alpha, key, p in terms:
        row = np.searchsorted(alphas, alpha)
        by_alpha[row, p] += value[key][p]
        d_by_alpha[row, p] += slope[key][p]
    psi_cca = _psi_tensor(params, [names[c] for c in cat], [names[a] for a in ani])
    psi_aac = _psi_tensor(params, [names[a] for a in ani], [names[c] for c in cat])
    lam_c, lam_a = np.zeros((nn, nc)), np.zeros((nn, na))
    for k, n in enumerate(neu):
        known = [(i, params.lam.get((names[n], names[c]))) for i, c in enumerate(cat)]
        known_a = [(j, params.lam.get((names[n], names[a]))) for j, a in enumerate(ani)]
        if any(v is not None for _, v in known + known_a):
            for i, v in known:
                lam_c[k, i] = v or 0.0
            for j, v in known_a:
                lam_a[k, j] = v or 0.0
        elif species.setschenow[n] != 0.0:
            # λ_ni = ln10·b·z_i²/4 for every ion gives ln γ_n = ln10·b·I (Setschenow)
            lam_c[k] = LN10 * species.setschenow[n] * zc ** 2 / 4.0
            lam_a[k] = LN10 * species.setschenow[n] * za ** 2 / 4.0
    return _Layout(
        formed=formed, cat=cat, ani=ani, neu=neu, zc=zc, za=za, pair_c=pair_c,
        pair_a=pair_a, to_c=(pair_c[:, None] == np.arange(nc)[None, :]).astype(float),
        to_a=(pair_a[:, None] == np.arange(na)[None, :]).astype(float),
        beta0=value["beta0"], d_beta0=slope["beta0"], alphas=alphas,
        beta_by_alpha=by_alpha, d_beta_by_alpha=d_by_alpha, c_phi=value["c_phi"],
        d_c_phi=slope["c_phi"], c_scale=1.0 / (2.0 * np.sqrt(zc[pair_c] * za[pair_a])),
        theta_c=_theta_matrix(params, [names[c] for c in cat]),
        theta_a=_theta_matrix(params, [names[a] for a in ani]),
        psi_c=psi_cca.reshape(nc, nc * na), psi_a=psi_aac.reshape(na, na * nc),
        psi_c_for_a=psi_cca.transpose(2, 0, 1).reshape(na, nc * nc),
        psi_a_for_c=psi_aac.transpose(2, 0, 1).reshape(nc, na * na),
        lam_c=lam_c, lam_a=lam_a, like_c=_LikeCharge.of(zc), like_a=_LikeCharge.of(za))


def _theta_matrix(params: PitzerParameters, names: list[str]) -> np.ndarray:
    out = np.zeros((len(names), len(names)))
    for i, a in enumerate(names):
        for j, b in enumerate(names):
            if i != j:
                out[i, j] = params.theta.get(frozenset((a, b)), 0.0)
    return out


def _psi_tensor(params: PitzerParameters, like: list[str], other: list[str]) -> np.ndarray:
    out = np.zeros((len(like), len(like), len(other)))
    for i, a in enumerate(like):
        for j, b in enumerate(like):
            if i == j:
                continue
            for k, c in enumerate(other):
                out[i, j, k] = params.psi.get((frozenset((a, b)), c), 0.0)
    return out


# ---------------------------------------------------------------------------------------
# The bound model
# ---------------------------------------------------------------------------------------

@dataclass(frozen=True)
class _Terms:
    """Quantities shared by ln γ and ln a(H2O) at one composition (n samples)."""

    mc: np.ndarray
    ma: np.ndarray
    mn: np.ndarray
    pair: np.ndarray        # (n, P) m_c m_a of the pairs with parameters
    I: np.ndarray
    Z: np.ndarray
    B: np.ndarray           # (n, P)
    B_prime: np.ndarray
    B_phi: np.ndarray
    C: np.ndarray
    mix_c: np.ndarray       # (n, nc): Σ_c' m_c' (θ_cc' + Eθ_cc')
    mix_a: np.ndarray       # (n, na)
    pairs_c: np.ndarray     # (n,): Σ_c<c' m_c m_c' (θ + Eθ)
    pairs_a: np.ndarray
    pairs_c_prime: np.ndarray   # (n,): Σ_c<c' m_c m_c' Eθ'
    pairs_a_prime: np.ndarray
    psi_c: np.ndarray       # (n, nc): Σ_c' Σ_a m_c' m_a ψ_cc'a
    psi_a: np.ndarray       # (n, na): Σ_a' Σ_c m_a' m_c ψ_aa'c


@dataclass
class BoundPitzer:
    """The Pitzer model bound to a species list and per-sample temperatures."""

    species: SpeciesProperties
    t_C: np.ndarray
    layout: _Layout
    a_phi: np.ndarray                    # (n,)
    delta_t: np.ndarray                  # (n,) T − reference temperature, K
    notes: list[str] = field(default_factory=list)
    depends_on_ionic_strength_only: bool = False

    def take(self, rows: np.ndarray) -> BoundPitzer:
        """The same model for the samples *rows* only."""
        return replace(self, t_C=self.t_C[rows], a_phi=self.a_phi[rows],
                       delta_t=self.delta_t[rows])

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        """ln γ (n, s) at the composition *molality* (n, s).

        Without a composition only the Debye–Hückel part z² f^γ(I = u²) is known; the
        solver uses that for its first guess. Species not formed in this model get
        :data:`NOT_FORMED_LN_GAMMA`.
        """
        lay = self.layout
        out = np.zeros((u.shape[0], len(self.species.names)))
        if molality is None:
            f = debye_huckel_f_gamma(u * u, self.a_phi)
            charged = np.concatenate([lay.cat, lay.ani])
            out[:, charged] = self.species.charge[charged] ** 2 * f[:, None]
        else:
            t = self._terms(np.asarray(molality, dtype=float))
            lnc, lna, lnn = self._ln_gamma_terms(t)
            out[:, lay.cat], out[:, lay.ani], out[:, lay.neu] = lnc, lna, lnn
        out[:, ~lay.formed] = NOT_FORMED_LN_GAMMA
        return out

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        raise NotImplementedError("the Pitzer model depends on composition, not on ionic "
                                  "strength alone; the solver's careful path handles it")

    def ln_water_activity(self, molality: np.ndarray) -> np.ndarray:
        """ln a(H2O) = −M_w φ Σ m (n,), with φ from the Pitzer osmotic equation."""
        total, excess = self._osmotic_sums(np.asarray(molality, dtype=float))
        return -WATER_KG_PER_MOL * (total + excess)

    def osmotic_coefficient(self, molality: np.ndarray) -> np.ndarray:
        """φ (n,); 1 where the solution holds no solute."""
        total, excess = self._osmotic_sums(np.asarray(molality, dtype=float))
        return 1.0 + np.divide(excess, total, out=np.zeros_like(total), where=total > 0)

    # -- the equations ------------------------------------------------------------------
    def _terms(self, m: np.ndarray) -> _Terms:
        lay = self.layout
        n = m.shape[0]
        mc, ma, mn = m[:, lay.cat], m[:, lay.ani], m[:, lay.neu]
        strength = 0.5 * (mc @ lay.zc ** 2 + ma @ lay.za ** 2)
        safe = np.maximum(strength, IONIC_STRENGTH_FLOOR)
        Z = mc @ lay.zc + ma @ lay.za
        dt = self.delta_t[:, None]
        g, gp, e = _g(lay.alphas[None, :] * np.sqrt(safe)[:, None])      # (n, u)

        def mix(f: np.ndarray) -> np.ndarray:
            """Σ over the α groups of f(α√I) · β(T), flat over pairs: (n, P)."""
            return f @ lay.beta_by_alpha + dt * (f @ lay.d_beta_by_alpha)

        b0 = lay.beta0 + dt * lay.d_beta0
        e_c, e_cc, e_cc_prime = lay.like_c.sums(mc, safe, self.a_phi)
        e_a, e_aa, e_aa_prime = lay.like_a.sums(ma, safe, self.a_phi)
        theta_c, theta_a = mc @ lay.theta_c, ma @ lay.theta_a
        every_ca = (mc[:, :, None] * ma[:, None, :]).reshape(n, -1)
        every_ac = (ma[:, :, None] * mc[:, None, :]).reshape(n, -1)
        return _Terms(
            mc=mc, ma=ma, mn=mn, pair=mc[:, lay.pair_c] * ma[:, lay.pair_a], I=strength, Z=Z,
            B=b0 + mix(g),
            B_prime=mix(gp) / safe[:, None], B_phi=b0 + mix(e),
            C=(lay.c_phi + dt * lay.d_c_phi) * lay.c_scale,
            mix_c=theta_c + e_c, mix_a=theta_a + e_a,
            pairs_c=0.5 * np.sum(mc * theta_c, axis=1) + e_cc,
            pairs_a=0.5 * np.sum(ma * theta_a, axis=1) + e_aa,
            pairs_c_prime=e_cc_prime, pairs_a_prime=e_aa_prime,
            psi_c=every_ca @ lay.psi_c.T, psi_a=every_ac @ lay.psi_a.T)

    def _ln_gamma_terms(self, t: _Terms):
        """ln γ of cations, anions and neutral species (Harvie, Møller & Weare 1984)."""
        lay = self.layout
        F = (debye_huckel_f_gamma(t.I, self.a_phi)
             + np.sum(t.pair * t.B_prime, axis=1) + t.pairs_c_prime + t.pairs_a_prime)
        sum_mc_ma_c = np.sum(t.pair * t.C, axis=1)
        ca = 2.0 * t.B + t.Z[:, None] * t.C
        n = t.mc.shape[0]
        aa = (t.ma[:, :, None] * t.ma[:, None, :]).reshape(n, -1)
        cc = (t.mc[:, :, None] * t.mc[:, None, :]).reshape(n, -1)
        lnc = (lay.zc ** 2 * F[:, None]
               + (t.ma[:, lay.pair_a] * ca) @ lay.to_c
               + 2.0 * t.mix_c
               + t.psi_c + 0.5 * aa @ lay.psi_a_for_c.T
               + lay.zc * sum_mc_ma_c[:, None]
               + 2.0 * t.mn @ lay.lam_c)
        lna = (lay.za ** 2 * F[:, None]
               + (t.mc[:, lay.pair_c] * ca) @ lay.to_a
               + 2.0 * t.mix_a
               + t.psi_a + 0.5 * cc @ lay.psi_c_for_a.T
               + lay.za * sum_mc_ma_c[:, None]
               + 2.0 * t.mn @ lay.lam_a)
        lnn = 2.0 * (t.mc @ lay.lam_c.T + t.ma @ lay.lam_a.T)
        return lnc, lna, lnn

    def _osmotic_sums(self, m: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(Σ m, Σ m·(φ − 1)) over the species formed in this model."""
        lay = self.layout
        t = self._terms(m)
        s = np.sqrt(t.I)
        inner = (-self.a_phi * t.I * s / (1.0 + PITZER_B * s)
                 + np.sum(t.pair * (t.B_phi + t.Z[:, None] * t.C), axis=1)
                 + t.pairs_c + t.pairs_a + t.I * (t.pairs_c_prime + t.pairs_a_prime)
                 + 0.5 * (np.sum(t.mc * t.psi_c, axis=1) + np.sum(t.ma * t.psi_a, axis=1))
                 + np.sum((t.mn @ lay.lam_c) * t.mc, axis=1)
                 + np.sum((t.mn @ lay.lam_a) * t.ma, axis=1))
        total = m[:, lay.formed].sum(axis=1)
        return total, 2.0 * inner


# ---------------------------------------------------------------------------------------
# The model, its notes and its validity checks
# ---------------------------------------------------------------------------------------

class PitzerModel:
    """Pitzer ion-interaction model (Harvie–Møller–Weare form) with a parameter table."""

    name = "pitzer"
    title = "Pitzer ion interaction (β0, β1, β2, Cφ, θ, ψ, λ; unsymmetrical mixing)"
    max_ionic_strength = 6.0
    reference = ("Pitzer (1973) J. Phys. Chem. 77, 268; Harvie, Møller & Weare (1984) "
                 "Geochim. Cosmochim. Acta 48, 723")
    provides_water_activity = True

    def __init__(self, parameters: PitzerParameters | None = None) -> None:
        self._parameters = parameters
        self._tables: list[ParameterTable] = []

    def use_parameter_tables(self, tables: Sequence[ParameterTable]) -> None:
        """The parameter tables offered for this model (``register_parameter_tables``),
        read when first needed; later ones override earlier ones entry by entry."""
        self._tables = list(tables)
        self._parameters = None
        self.__dict__.pop("ion_pairs", None)

    @cached_property
    def ion_pairs(self) -> IonPairSet:
        """The complexes this model forms: all but the parameter table's ``not_formed``."""
        params = self.parameters
        return IonPairSet(
            summary="every complex of the tables except those the Pitzer parameters "
                    "describe (the parameter table's not_formed list)",
            left_out=tuple(LeftOut(reason=reason, species=(name,), evidence=params.origin)
                           for name, reason in params.not_formed.items()))

    @property
    def parameters(self) -> PitzerParameters:
        """The parameters in use: those given, else the tables the registry handed over
        (merged in order), else, for a model made by hand outside a registry, the bundled
        table."""
        if self._parameters is None:
            if not self._tables:
                self._parameters = bundled_parameters()
            else:
                self._parameters = merged_parameters([
                    parse_parameters(t.text(), t.origin) if t.is_file else t.source
                    for t in self._tables])
        return self._parameters

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> BoundPitzer:
        t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
        params = self.parameters
        return BoundPitzer(species=species, t_C=t_C, layout=_layout(params, species),
                           a_phi=np.asarray(osmotic_A_phi(t_C), dtype=float),
                           delta_t=t_C - params.reference_temperature_C,
                           notes=_bind_notes(params, species, t_C))

    # -- checks on a solved composition -----------------------------------------------
    def missing_parameters(self, species: SpeciesProperties, molality: np.ndarray) -> list[str]:
        """Pairs and neutral species that matter in *molality* (s,) but have no parameters."""
        params = self.parameters
        ions, neutrals = _significant(params, species, molality)
        cations = [n for n, z in ions if z > 0]
        anions = [n for n, z in ions if z < 0]
        out = [f"{c}–{a}" for c in cations for a in anions
               if (c, a) not in params.binary and (c, a) not in params.zero_by_design]
        lam_known = {n for n, _ in params.lam}
        out += [f"{n} (no λ)" for n in neutrals
                if n not in lam_known and species.setschenow[species.names.index(n)] == 0.0]
        return out

    def beyond_fitted_range(self, species: SpeciesProperties, molality: np.ndarray) -> list[str]:
        """Pairs that matter in *molality* (s,) present beyond the salt molality of their fit.

        The salt molality of a pair in a mixture is the most of its neutral salt the two
        ions could make, min(m_c/ν_c, m_a/ν_a): past its fit the binary parameters
        describe a concentration they never saw, and the model is not valid there.
        """
        return [f"{entry.label} (fitted to {entry.max_molality:g} mol/kg, here "
                f"{salt:.3g} mol/kg)" for entry, salt, _ in self._fits(species, molality)
                if salt > entry.max_molality]

    def disagreeing_pairs(self, species: SpeciesProperties,
                          molality: np.ndarray) -> list[CationAnion]:
        """Binary entries that matter in *molality* and carry a published check they fail
        (``disagrees`` in the table): the model is not trusted for them."""
        params = self.parameters
        ions, _ = _significant(params, species, molality)
        pairs = [(c, a) for c, zc in ions for a, za in ions if zc > 0 > za]
        return [params.binary[p] for p in pairs
                if p in params.binary and params.binary[p].disagrees]

    def stretched_in_ionic_strength(self, species: SpeciesProperties,
                                    molality: np.ndarray) -> list[str]:
        """Pairs within their salt molality but used at an ionic strength past their fit.

        A minor salt in a concentrated medium (KH2PO4 in 2 mol/kg KCl) is the usual
        case: its B(I) is extrapolated, which is the common practice of mixture models
        but worth a warning; it does not make the model invalid.
        """
        strength = _ionic_strength(self.parameters, species, molality)
        return [f"{entry.label} (fitted to I ≤ {entry.max_ionic_strength:g})"
                for entry, salt, _ in self._fits(species, molality)
                if salt <= entry.max_molality and strength > entry.max_ionic_strength]

    def _fits(self, species: SpeciesProperties, molality: np.ndarray):
        """(entry, salt molality, ionic strength) of each significant pair with a fitted range."""
        params = self.parameters
        ions, _ = _significant(params, species, molality)
        index = {name: i for i, name in enumerate(species.names)}
        out = []
        for c, zc in ions:
            for a, za in ions:
                entry = params.binary.get((c, a)) if zc > 0 > za else None
                if entry is None or entry.max_molality is None:
                    continue
                g = math.gcd(entry.z_cation, entry.z_anion)
                nu_c, nu_a = entry.z_anion // g, entry.z_cation // g
                salt = min(molality[index[c]] / nu_c, molality[index[a]] / nu_a)
                out.append((entry, float(salt), entry.max_ionic_strength))
        return out

    def validity_notes(self, species: SpeciesProperties, molality: np.ndarray) -> list[str]:
        """Warnings about a solved composition: missing parameters, fits exceeded."""
        out = []
        missing = self.missing_parameters(species, molality)
        if missing:
            out.append(f"pitzer: no parameters for {', '.join(missing)}, although these "
                       f"ions carry ≥ {100 * SIGNIFICANT_SHARE:g} % of the ionic strength; "
                       f"their interactions were taken as zero and the activity "
                       f"coefficients are uncertain")
        for entry in self.disagreeing_pairs(species, molality):
            out.append(f"pitzer: the {entry.label} parameters disagree with a published "
                       f"check ({entry.disagrees}); treat the activity coefficients of "
                       f"these ions as estimates")
        beyond = self.beyond_fitted_range(species, molality)
        if beyond:
            out.append(f"pitzer: past the fitted range of {'; '.join(beyond)}; the "
                       f"parameters are extrapolated and the result is not trusted")
        stretched = self.stretched_in_ionic_strength(species, molality)
        if stretched:
            strength = _ionic_strength(self.parameters, species, molality)
            out.append(f"pitzer: ionic strength {strength:.3g} mol/kg is past the single-salt "
                       f"fit of {'; '.join(stretched)}; their B(I) is extrapolated "
                       f"(usual for a minor salt in a concentrated medium)")
        return out


def _ionic_strength(params: PitzerParameters, species: SpeciesProperties,
                    molality: np.ndarray) -> float:
    formed = np.array([n not in params.not_formed for n in species.names])
    return float(0.5 * np.sum((molality * species.charge ** 2)[formed]))


def _significant(params: PitzerParameters, species: SpeciesProperties, molality: np.ndarray):
    """(ions as (name, z), neutral names) carrying ≥ SIGNIFICANT_SHARE of I (formed only)."""
    molality = np.asarray(molality, dtype=float)
    strength = _ionic_strength(params, species, molality)
    if strength <= 0:
        return [], []
    ions, neutrals = [], []
    for name, z, m in zip(species.names, species.charge, molality):
        if name in params.not_formed:
            continue
        if z != 0 and 0.5 * m * z * z >= SIGNIFICANT_SHARE * strength:
            ions.append((name, int(z)))
        elif z == 0 and m >= SIGNIFICANT_SHARE * strength:
            neutrals.append(name)
    return ions, neutrals


def _bind_notes(params: PitzerParameters, species: SpeciesProperties,
                t_C: np.ndarray) -> list[str]:
    """What the model does with this species list: pairs not formed, missing, T used."""
    names, z = species.names, species.charge
    formed = [(n, int(c)) for n, c in zip(names, z) if n not in params.not_formed]
    cations = [n for n, c in formed if c > 0]
    anions = [n for n, c in formed if c < 0]
    notes = []
    absent = [n for n in names if n in params.not_formed]
    if absent:
        notes.append(f"pitzer: ion pairs {', '.join(absent)} are not formed as separate "
                     f"species; the Pitzer parameters of their ions describe the "
                     f"association (Harvie, Møller & Weare 1984 practice)")
    known = {n for pair in params.binary for n in pair}
    bare = [n for n in cations + anions if n not in known]
    gaps = [f"{c}–{a}" for c in cations for a in anions
            if c in known and a in known and (c, a) not in params.binary
            and (c, a) not in params.zero_by_design]
    if bare:
        notes.append(f"pitzer: no interaction parameters at all for {', '.join(bare)}; "
                     f"only the Debye–Hückel term and the charge-weighted C sum apply to "
                     f"them (their pair terms are zero)")
    if gaps:
        notes.append(f"pitzer: no binary parameters for {', '.join(gaps)}; taken as zero")
    lam_known = {n for n, _ in params.lam}
    neutral = [(n, b) for n, c, b in zip(names, z, species.setschenow)
               if c == 0 and n not in params.not_formed and n not in lam_known]
    from_setschenow = [n for n, b in neutral if b != 0.0]
    without = [n for n, b in neutral if b == 0.0]
    if from_setschenow:
        notes.append(f"pitzer: λ of {', '.join(from_setschenow)} derived from the "
                     f"Setschenow coefficient of the constant table (ln γ = ln10·b·I)")
    if without:
        notes.append(f"pitzer: no λ for the neutral species {', '.join(without)}; γ = 1")
    notes += _temperature_notes(params, cations, anions, t_C)
    return notes


def _temperature_notes(params: PitzerParameters, cations: list[str], anions: list[str],
                       t_C: np.ndarray) -> list[str]:
    lo, hi = float(np.min(t_C)), float(np.max(t_C))
    t_ref = params.reference_temperature_C
    if max(abs(lo - t_ref), abs(hi - t_ref)) <= TEMPERATURE_TOLERANCE_C:
        return []
    span = f"{lo:g}" if lo == hi else f"{lo:g}–{hi:g}"
    used = [params.binary[(c, a)] for c in cations for a in anions if (c, a) in params.binary]
    fixed = [e.label for e in used if not e.d_dT]
    sloped = [e.label for e in used if e.d_dT]
    notes = []
    if fixed:
        notes.append(f"pitzer: no temperature derivatives for {', '.join(fixed)}; their "
                     f"{t_ref:g} °C values were used at {span} °C")
    d_lo, d_hi = params.derivative_range_C
    if sloped and (lo < d_lo or hi > d_hi):
        notes.append(f"pitzer: the temperature derivatives of {', '.join(sloped)} are first "
                     f"derivatives at {t_ref:g} °C, trusted for {d_lo:g}–{d_hi:g} °C; used "
                     f"at {span} °C")
    if used:
        notes.append(f"pitzer: θ, ψ and λ are {t_ref:g} °C values; used at {span} °C")
    return notes
