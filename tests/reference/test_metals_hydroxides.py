"""Iron(III) and aluminium over their hydroxides: the published solubility minima.

Sources: ferrihydrite and Fe(III) hydrolysis, Stefánsson, A. (2007) Environ. Sci. Technol.
41, 6117–6123 (abstract re-read: log Ks0 = 3.50, hydrolysis constants at I = 0); gibbsite
and Al hydrolysis, Brown & Ekberg (2016) as tabulated in the Wikipedia article "Hydrolysis
constant" (re-read), whose constants place the minimum where May, Helmke & Jackson (1979)
Geochim. Cosmochim. Acta 43, 861 measured it (re-read: gibbsite solubility curves pH 4–9
with Al3+, AlOH2+, Al(OH)2+ and Al(OH)4- as the mononuclear species). The numerical
thresholds are the acceptance items of issue 17.
"""

from __future__ import annotations

import numpy as np
import pytest

from _metals import dissolved, solve

BACKGROUND = {"NaCl": 0.01}


def iron_over_ferrihydrite(pH: float) -> float:
    return dissolved(solve(BACKGROUND, pH, {"ferrihydrite": "equilibrate"}), "Fe")


def aluminium_over_gibbsite(pH: float) -> float:
    return dissolved(solve(BACKGROUND, pH, {"gibbsite": "equilibrate"}), "Al")


def test_dissolved_iron_iii_over_ferrihydrite_is_below_1e7_at_ph_8():
    assert iron_over_ferrihydrite(8.0) < 1e-7


def test_dissolved_iron_iii_over_ferrihydrite_is_above_1e6_at_ph_3():
    assert iron_over_ferrihydrite(3.0) > 1e-6


def test_ferrihydrite_solubility_at_ph_3_follows_the_published_constants():
    # From Stefánsson (2007) alone, at I = 0: [Fe3+] = 10^(3.50 - 9), [FeOH2+] = 10^(3.50 -
    # 2.19 - 6), [Fe(OH)2+] = 10^(3.50 - 5.76 - 3): 4.48e-5 in all. The engine's value at
    # I ≈ 0.01 lies within a factor of two of it (activity corrections of Fe3+).
    by_hand = 10 ** (3.50 - 9) + 10 ** (3.50 - 2.19 - 6) + 10 ** (3.50 - 5.76 - 3)
    assert iron_over_ferrihydrite(3.0) == pytest.approx(by_hand, rel=1.0)


def test_dissolved_aluminium_over_gibbsite_is_lowest_near_ph_6():
    grid = np.arange(4.5, 8.51, 0.25)
    solubility = [aluminium_over_gibbsite(pH) for pH in grid]
    lowest = grid[int(np.argmin(solubility))]
    assert 5.75 <= lowest <= 6.5
    # a real minimum: at least tenfold higher two units either side
    assert solubility[0] > 10 * min(solubility)
    assert solubility[-1] > 10 * min(solubility)
