"""Lead, zinc and cadmium speciation and lead solubility against published statements.

Sources (all re-read, abstracts):
* Powell, K.J. et al. (2009) Pure Appl. Chem. 81, 2425–2476 (IUPAC, Pb): in weakly acidic
  fresh water (pH < 6) Pb(II) is dominated by Pb2+ with PbSO4(aq) minor; at 8.0 < pH < 9.0
  by the carbonato species PbCO3(aq) and Pb(CO3)2 2−.
* Powell, K.J. et al. (2013) Pure Appl. Chem. 85, 2249–2311 (IUPAC, Zn): in fresh water at
  pH < 8 Zn(II) is dominated by Zn2+; ZnCO3(aq) dominates only at pH > 8.4; in seawater at
  pH 8.2 Zn2+ dominates.
* Powell, K.J. et al. (2011) Pure Appl. Chem. 83, 1163–1214 (IUPAC, Cd): in weakly alkaline
  fresh water (7.5 < pH < 8.6) Cd2+ still dominates, whereas for Cu(II) and Pb(II) the
  carbonato species MCO3(aq) dominates there.
* Schock, M.R. (1980) Response of lead solubility to dissolved carbonate in drinking water.
  J. Am. Water Works Assoc. 72, 695 (EPA-600/J-80-294), abstract: lead below 0.05 mg/L
  from hydroxide and carbonate solubility alone is possible only under very restricted pH
  and dissolved-carbonate conditions; the solubility trend with carbonate reverses with
  pH. Schock's pipe loops ran at log TIC = -3.6, -3.0 and -2.7 (mol/L).
The constants behind the checks are in constants/metals.toml with their sources; the
waters are typical compositions (common practice).
"""

from __future__ import annotations

import numpy as np
import pytest

from _metals import dissolved, dominant, shares, solve

TRACE = 1e-8  # mol/kg
FRESH_WATER = {"CaCl2": 0.0005, "MgSO4": 0.0002, "NaHCO3": 0.002}  # common practice
SEAWATER = {"NaCl": 0.420, "MgCl2": 0.0546, "MgSO4": 0.0282, "CaCl2": 0.0103,
            "KCl": 0.0102, "NaHCO3": 0.00205}  # S = 35, rounded (common practice)
LEAD_MG_PER_MOL = 207.2e3
SCHOCK_LIMIT_MG_L = 0.05  # the level Schock (1980) discusses


def test_lead_in_weakly_acidic_fresh_water_is_the_free_ion_with_sulfate_minor():
    found = shares(solve({**FRESH_WATER, "Pb(NO3)2": TRACE}, pH=5.8), "Pb")
    assert max(found, key=found.get) == "Pb2+"
    assert found["Pb2+"] > 0.85
    assert 0.001 < found["PbSO4"] < 0.1


@pytest.mark.parametrize("pH", [8.2, 8.8])
def test_lead_in_weakly_alkaline_fresh_water_is_mostly_carbonato_species(pH):
    found = shares(solve({**FRESH_WATER, "Pb(NO3)2": TRACE}, pH=pH), "Pb")
    assert max(found, key=found.get) == "PbCO3"
    assert found["PbCO3"] + found["Pb(CO3)2^2-"] > 0.5


def test_zinc_in_fresh_water_below_ph_8_is_the_free_ion():
    for pH in (6.0, 7.0, 7.8):
        found = shares(solve({**FRESH_WATER, "ZnSO4": TRACE}, pH=pH), "Zn")
        assert max(found, key=found.get) == "Zn2+", pH
        assert found["Zn2+"] > 0.5, pH


def test_zinc_carbonate_dominates_only_above_ph_8_4():
    assert dominant(solve({**FRESH_WATER, "ZnSO4": TRACE}, pH=8.2), "Zn") == "Zn2+"
    assert dominant(solve({**FRESH_WATER, "ZnSO4": TRACE}, pH=9.0), "Zn") == "ZnCO3"


def test_zinc_in_seawater_at_ph_8_2_is_mostly_the_free_ion():
    found = shares(solve({**SEAWATER, "ZnCl2": TRACE}, pH=8.2), "Zn")
    assert max(found, key=found.get) == "Zn2+"
    for minor in ("ZnCl+", "ZnCl2", "ZnCO3", "ZnSO4"):
        assert found[minor] < found["Zn2+"], minor


@pytest.mark.parametrize("pH", [7.6, 8.0, 8.5])
def test_cadmium_stays_free_where_copper_and_lead_are_carbonate_complexes(pH):
    water = {**FRESH_WATER, "CdSO4": TRACE, "CuSO4": TRACE, "Pb(NO3)2": TRACE}
    result = solve(water, pH=pH)
    assert dominant(result, "Cd") == "Cd2+"
    if pH >= 8.0:  # the carbonato species take over from pH about 7.5–8 in this water
        assert dominant(result, "Cu") == "CuCO3"
        assert dominant(result, "Pb") == "PbCO3"


def lead_solubility_mg_per_L(log_tic: float, pH: float) -> float:
    """Dissolved lead over the less soluble of cerussite and hydrocerussite (the stable
    solid at that pH), in mg/L (≈ mg/kg at these strengths)."""
    each = [dissolved(solve({"NaHCO3": 10 ** log_tic}, pH, {solid: "equilibrate"}), "Pb")
            for solid in ("cerussite", "hydrocerussite")]
    return min(each) * LEAD_MG_PER_MOL


PH_GRID = np.arange(6.5, 11.01, 0.5)


def test_lead_below_0_05_mg_per_L_only_in_a_restricted_window():
    low = [lead_solubility_mg_per_L(-3.6, pH) for pH in PH_GRID]
    high = [lead_solubility_mg_per_L(-2.7, pH) for pH in PH_GRID]
    # possible at Schock's highest loop carbonate, and only near neutral-to-mildly-alkaline pH
    below = [pH for pH, v in zip(PH_GRID, high) if v < SCHOCK_LIMIT_MG_L]
    assert below and 7.0 <= min(below) and max(below) <= 9.0
    # not possible at any pH at his lowest loop carbonate (25 mg/L as CaCO3)
    assert min(low) > SCHOCK_LIMIT_MG_L


def test_lead_solubility_trend_with_carbonate_reverses_with_ph():
    # at neutral pH more carbonate lowers lead (less free Pb2+ over the carbonates); at
    # high pH it raises it (Pb(CO3)2 2− complexation): the reversal Schock (1980) reports
    assert lead_solubility_mg_per_L(-2.0, 7.0) < lead_solubility_mg_per_L(-3.0, 7.0)
    assert lead_solubility_mg_per_L(-2.0, 10.0) > lead_solubility_mg_per_L(-3.0, 10.0)
