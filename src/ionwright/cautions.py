"""Safety cautions attached to results where a number can hurt someone.

The thresholds are common practice (US EPA 40 CFR 261.22 for corrosivity); the cautions
never replace local codes, measured values or licensed practice.
"""

from __future__ import annotations

CORROSIVE_LOW_PH = 2.0     # 40 CFR 261.22(a)(1): pH ≤ 2 or ≥ 12.5 is corrosive
CORROSIVE_HIGH_PH = 12.5
DEFER = "follow your site's safety rules and local codes"


def cautions(result) -> list[str]:
    """Cautions for *result*: corrosive pH for now, more as the engine learns them."""
    out = []
    ph = result.pH
    if ph <= CORROSIVE_LOW_PH or ph >= CORROSIVE_HIGH_PH:
        out.append(f"CAUTION: pH {ph:.2f} is corrosive (pH ≤ {CORROSIVE_LOW_PH:g} or ≥ "
                   f"{CORROSIVE_HIGH_PH:g}, US EPA 40 CFR 261.22); wear eye and skin "
                   f"protection and {DEFER}")
    return out
