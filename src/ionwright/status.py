"""The one set of status words of a solve, shared by the solver, batches, sweeps and targets.

``converged`` is the only success. The solver stops a sample with ``max-iterations``
(the iteration limit, or a safeguard such as the ionic-strength cap was still active),
``non-finite`` (a number overflowed) or ``infeasible`` (the totals admit no solution).
A batch row whose input is refused before any solve is ``invalid``; its message names
the column at fault.
"""

from __future__ import annotations

import numpy as np

CONVERGED = "converged"
MAX_ITERATIONS = "max-iterations"
NON_FINITE = "non-finite"
INFEASIBLE = "infeasible"
INVALID = "invalid"

#: What the solver may report for a sample.
SOLVER_STATUSES = (CONVERGED, MAX_ITERATIONS, NON_FINITE, INFEASIBLE)
#: Every status word, the solver's and a batch row's ``invalid``.
STATUSES = (*SOLVER_STATUSES, INVALID)


def succeeded(status: np.ndarray) -> np.ndarray:
    """Which samples converged (an array of status words in, booleans out)."""
    return np.asarray(status) == CONVERGED
