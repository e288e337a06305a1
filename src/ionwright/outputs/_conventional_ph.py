"""pH on the conventional scale of the pH standards (the Bates–Guggenheim convention).

The pH(S) values of the IUPAC and NIST standard buffers come from Harned cells
(Pt | H2 | buffer + KCl | AgCl | Ag), which measure p(a_H γ_Cl) = −log10(m_H γ_H γ_Cl),
extrapolated to no added chloride. Only that product is measurable; the split into
a_H needs one conventional single-ion coefficient, the Bates–Guggenheim convention

    log10 γ_Cl = −A √I / (1 + 1.5 √I)        (I ≤ 0.1 mol/kg),

so pH(S) = p(a_H γ_Cl) + log10 γ_Cl(convention). A pH meter calibrated with those
buffers reads on the same scale. An activity model has its own γ_H and γ_Cl, so its
pH = −log10 a_H is comparable with pH(S) only after the same split:

    pH(conventional) = pH(model) − log10 γ_Cl(model) + log10 γ_Cl(convention),

where γ_Cl(model) is what the model gives a trace of chloride in the solution. For
Davies (one γ for every monovalent ion) the two log10 γ_Cl differ by 0.002 at
I = 0.1 mol/kg; for extended Debye–Hückel (Kielland å = 3 Å for Cl-) by 0.013, for
Truesdell–Jones by 0.007: the size of the difference the comparison removes.

References
----------
Bates, R.G. & Guggenheim, E.A. (1960) Pure Appl. Chem. 1, 163–168.
Buck, R.P. et al. (2002) Pure Appl. Chem. 74, 2169–2200 (IUPAC Recommendations), §5.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..chemistry._water import debye_huckel_A
from ..chemistry._constants import LN10
from ._solved_samples import SolvedSamples, samples_of_result

BATES_GUGGENHEIM_BA = 1.5   # kg^½ mol^-½, the fixed B·å of the convention
CONVENTION_MAX_IONIC_STRENGTH = 0.1  # mol/kg: where the convention is defined
CHLORIDE = "Cl-"


def bates_guggenheim_log10_gamma_chloride(ionic_strength, t_C):
    """log10 γ(Cl-) of the Bates–Guggenheim convention at *ionic_strength* and *t_C* °C."""
    root = np.sqrt(np.asarray(ionic_strength, dtype=float))
    return -debye_huckel_A(t_C) * root / (1.0 + BATES_GUGGENHEIM_BA * root)


def model_log10_gamma_chloride(result) -> float:
    """log10 γ(Cl-) that *result*'s activity model gives chloride in its solution (a
    trace of it, when the solution has none)."""
    return float(model_log10_gamma_chloride_of(samples_of_result(result))[0])


def model_log10_gamma_chloride_of(samples: SolvedSamples) -> np.ndarray:
    """:func:`model_log10_gamma_chloride` of every sample of *samples*: shape (n,)."""
    system = samples.system
    props = system.properties
    if CHLORIDE in props.names:
        return samples.log10_gamma[:, props.names.index(CHLORIDE)]
    entry = samples.tables.components.get(CHLORIDE)

    def size(attr: str) -> float:
        value = getattr(entry, attr, None) if entry is not None else None
        return np.nan if value is None else value

    props = replace(props, names=(*props.names, CHLORIDE),
                    charge=np.append(props.charge, -1.0),
                    ion_size=np.append(props.ion_size, size("ion_size")),
                    tj_a=np.append(props.tj_a, size("tj_a")),
                    tj_b=np.append(props.tj_b, size("tj_b")),
                    setschenow=np.append(props.setschenow, 0.0))
    bound = samples.model.bind(props, samples.t_C)
    u = np.sqrt(samples.ionic_strength)
    trace = np.zeros((samples.n, 1))
    ln_gamma = bound.ln_gamma(u, np.concatenate([samples.molality, trace], axis=1))
    return ln_gamma[:, -1] / LN10


def conventional_pH(result) -> float:
    """*result*'s pH on the scale of the pH standards (Bates–Guggenheim convention).

    Defined by the convention up to I = 0.1 mol/kg; above it the same formula is used,
    as for the physiological-strength standards (I = 0.16 mol/kg), and means less.
    """
    return float(conventional_pH_of(samples_of_result(result))[0])


def conventional_pH_of(samples: SolvedSamples) -> np.ndarray:
    """:func:`conventional_pH` of every sample of *samples*: shape (n,)."""
    convention = bates_guggenheim_log10_gamma_chloride(samples.ionic_strength, samples.t_C)
    return samples.pH - model_log10_gamma_chloride_of(samples) + convention
