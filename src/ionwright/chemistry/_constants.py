"""Numbers every layer uses, defined once."""

from __future__ import annotations

import math

#: ln 10, for log10 ↔ ln (the same bits as numpy's ``np.log(10.0)``).
LN10 = math.log(10.0)
