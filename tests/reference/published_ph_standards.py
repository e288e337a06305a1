"""Published pH(S) values of the standard reference buffers, as data for the tests.

pH(S) is conventional: Harned cells (Pt | H2 | buffer + KCl | AgCl | Ag) measure
p(a_H γ_Cl), extrapolated to no added chloride, and the Bates–Guggenheim convention
log10 γ_Cl = −A√I/(1 + 1.5√I) turns it into pH(S) (Buck et al. 2002, §5). The tests
therefore compare :func:`ionwright.outputs._conventional_ph.conventional_pH` (the model's pH with
its own γ_Cl replaced by the convention's) with pH(S); see that module.

Where each number comes from (re-reading status in brackets):

* IUPAC primary standards, Buck, R.P. et al. (2002) Pure Appl. Chem. 74, 2169–2200,
  Table 3 (pH(PS) from 0 to 50 °C). The report was found (es.scribd.com copy, first page
  re-read) but its tables were not reachable with the search tool, so the rows below are
  recalled [memory], except where a re-read source is named. The recalled rows agree with
  the two-decimal table of JIS Z 8802 (re-read via horiba.com, "Standard pH of Reference
  Solution, by Temperature") within 0.01 at every temperature JIS lists (JIS recipes are
  on the amount-concentration scale, so the last digit need not agree;
  :data:`JIS_Z_8802`, checked in the tests).
* Potassium hydrogen phthalate: Hetzer, H.B., Durst, R.A., Robinson, R.A. & Bates, R.G.
  (1977) J. Res. Natl. Bur. Stand. 81A, 21–24, pH(S) = 2073.44/T − 13.3270 + 0.045199 T −
  3.4846e-5 T², 0–60 °C [re-read in the abstract], the values IUPAC (2002) adopted
  (4.004 at 5 °C, 4.057 at 50 °C, as issue 12 quotes them).
* 25 °C values re-read in abstracts: carbonate 10.012 and citrate 3.776 (Staples, B.R. &
  Bates, R.G. (1969) J. Res. Natl. Bur. Stand. 73A, 37–41, "Two new standards for the pH
  scale"; borax 9.180 is quoted there as the former upper limit of the scale).
* Phosphate standards at 25 °C: 6.865 (1:1) and 7.413 (1:3.5), re-read in Partanen, J.I. &
  Minkkinen, P.O. (1996) Acta Chem. Scand. 50, 1081 (abstract).
* Phosphate 1:3.5 (0.008695 + 0.03043 mol/kg): 7.415 at 25 °C and 7.395 at 37 °C as quoted
  for the NBS physiological phosphate standard by Roy, L.N., Roy, R.N. et al. (2012) Open
  Electrochem. J. 4, 20 [re-read, secondary]; IUPAC (2002) as recalled gives 7.413 and
  7.386.
* Tris: 0.01667 mol/kg Tris + 0.05 mol/kg Tris·HCl, the NBS physiological Tris standard
  (Durst, R.A. & Staples, B.R. (1972) Clin. Chem. 18, 206): 7.699 at 25 °C, 7.382 at 37 °C
  [memory].
* HEPES: Roy et al. (2009) J. Solution Chem. 38, 449 publish pH(S) of HEPES/NaHEPES/NaCl
  buffers 5–55 °C (abstract re-read); their table was not reachable, so no HEPES check.
"""

from __future__ import annotations

from dataclasses import dataclass, field

TEMPERATURES_C = (0.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 35.0, 37.0, 40.0, 50.0)


@dataclass(frozen=True)
class Standard:
    """One reference buffer: what is dissolved (mol per kg of water) and pH(S) by °C."""

    name: str
    dissolve: dict[str, float]
    pH_S: dict[float, float]
    source: str
    re_read: frozenset[float] = field(default_factory=frozenset)  # temperatures re-read

    def recalled(self, t_C: float) -> bool:
        """Whether the value at *t_C* is recalled rather than re-read."""
        return t_C not in self.re_read


def _row(values) -> dict[float, float]:
    return {t: v for t, v in zip(TEMPERATURES_C, values) if v is not None}


def _hetzer_1977(t_C: float) -> float:
    """pH(S) of 0.05 mol/kg KHP, Hetzer et al. (1977) equation (re-read), rounded as
    the IUPAC table prints it."""
    T = t_C + 273.15
    return round(2073.44 / T - 13.3270 + 0.045199 * T - 3.4846e-5 * T * T, 3)


IUPAC_2002 = "Buck et al. (2002) Pure Appl. Chem. 74, 2169, Table 3"

STANDARDS = (
    Standard("tartrate (saturated at 25 °C)", {"potassium hydrogen tartrate": 0.0341},
             _row([None, None, None, None, None, 3.557, 3.552, 3.549, 3.548, 3.547, 3.549]),
             IUPAC_2002 + " (0.0341 mol/kg, saturated at 25 °C)"),
    Standard("dihydrogen citrate 0.05 m", {"potassium dihydrogen citrate": 0.05},
             _row([3.863, 3.840, 3.820, 3.802, 3.788, 3.776, 3.766, 3.759, 3.756, 3.754,
                   3.749]),
             IUPAC_2002 + "; 25 °C re-read in Staples & Bates (1969)", frozenset({25.0})),
    Standard("hydrogen phthalate 0.05 m", {"potassium hydrogen phthalate": 0.05},
             {t: _hetzer_1977(t) for t in TEMPERATURES_C},
             "Hetzer et al. (1977) J. Res. NBS 81A, 21 (equation re-read); = " + IUPAC_2002,
             frozenset(TEMPERATURES_C)),
    Standard("phosphate 1:1 (0.025 + 0.025 m)", {"KH2PO4": 0.025, "Na2HPO4": 0.025},
             _row([6.984, 6.951, 6.923, 6.900, 6.881, 6.865, 6.853, 6.844, 6.841, 6.838,
                   6.833]),
             IUPAC_2002 + "; 25 °C re-read in Partanen & Minkkinen (1996)", frozenset({25.0})),
    Standard("phosphate 1:3.5 (0.008695 + 0.03043 m)",
             {"KH2PO4": 0.008695, "Na2HPO4": 0.03043},
             _row([7.534, 7.500, 7.472, 7.448, 7.429, 7.413, 7.400, 7.389, 7.386, 7.380,
                   7.367]),
             IUPAC_2002 + "; 25 °C re-read in Partanen & Minkkinen (1996)", frozenset({25.0})),
    Standard("borax 0.01 m", {"borax": 0.01},
             _row([9.464, 9.395, 9.332, 9.276, 9.225, 9.180, 9.139, 9.102, 9.088, 9.068,
                   9.011]),
             IUPAC_2002 + "; 25 °C re-read in Staples & Bates (1969)", frozenset({25.0})),
    Standard("carbonate (0.025 + 0.025 m)", {"NaHCO3": 0.025, "Na2CO3": 0.025},
             _row([10.317, 10.245, 10.179, 10.118, 10.062, 10.012, 9.966, 9.926, 9.910,
                   9.889, 9.828]),
             IUPAC_2002 + "; 25 °C re-read in Staples & Bates (1969)", frozenset({25.0})),
    Standard("Tris 1:3 (0.01667 Tris + 0.05 m Tris·HCl)", {"Tris": 0.01667, "Tris-HCl": 0.05},
             {25.0: 7.699, 37.0: 7.382},
             "Durst & Staples (1972) Clin. Chem. 18, 206, NBS physiological Tris standard"),
)
"""Every standard and its pH(S) by temperature (°C)."""

ROY_2012_PHOSPHATE = {25.0: 7.415, 37.0: 7.395}
"""Phosphate 1:3.5 as quoted by Roy et al. (2012) Open Electrochem. J. 4, 20 [re-read]."""

JIS_Z_8802 = {
    # JIS Z 8802 (2011), via horiba.com [re-read]; amount-concentration recipes, 2 decimals
    "hydrogen phthalate 0.05 m": _row([4.01, 4.01, 4.00, 4.00, 4.00, 4.01, 4.01, 4.02, None,
                                       4.03, 4.06]),
    "phosphate 1:1 (0.025 + 0.025 m)": _row([6.98, 6.95, 6.92, 6.90, 6.88, 6.86, 6.85, 6.84,
                                             None, 6.84, 6.83]),
    "borax 0.01 m": _row([9.46, 9.39, 9.33, 9.27, 9.22, 9.18, 9.14, 9.10, None, 9.07, 9.01]),
    "carbonate (0.025 + 0.025 m)": {0.0: 10.32, 10.0: 10.18, 25.0: 10.02},
}
"""Two-decimal values of the Japanese standard, a re-read check on the recalled rows."""
