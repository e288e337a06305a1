"""Cells of a batch table read as numbers, with the two gaps a lab report has.

* a **blank** cell means *not analysed*: the ion is left out of that row (as if 0) and
  the row says so; a blank pH leaves the pH free, a blank temperature means 25 °C;
* ``"<0.05"`` means *below the detection limit* of 0.05 (in the column's unit): the
  value used follows a policy, ``"zero"``, ``"half"`` (the default: half the limit, a
  common substitution in water-quality statistics  # common practice) or ``"limit"``.

Anything else that is not a number makes its row invalid, with the cell quoted.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from ..errors import RecipeError

if TYPE_CHECKING:
    import pandas as pd

DETECTION_POLICIES = {"zero": 0.0, "half": 0.5, "limit": 1.0}
DEFAULT_DETECTION_POLICY = "half"
#: "<0.05", "< 0.05", "<5e-2": a detection limit written before the number
_BELOW = r"^\s*<\s*(?P<limit>[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*$"


@dataclass(frozen=True)
class Cells:
    """One column read: numbers (NaN where blank or unreadable), and which cells were
    blank, below a detection limit (with the limit), or text that is no number."""

    numbers: np.ndarray
    blank: np.ndarray
    below: np.ndarray
    limit: np.ndarray
    unreadable: np.ndarray


def check_policy(policy: str) -> float:
    """The share of the detection limit that *policy* stands for; refuse an unknown one."""
    if policy not in DETECTION_POLICIES:
        raise RecipeError("detection_limit", f"{policy!r} is not a policy for values below "
                          "the detection limit", f"give one of {', '.join(DETECTION_POLICIES)} "
                          f"(default {DEFAULT_DETECTION_POLICY})")
    return DETECTION_POLICIES[policy]


def read_cells(raw: pd.Series, policy: str = DEFAULT_DETECTION_POLICY) -> Cells:
    """Read the cells of one column (see the module docstring)."""
    import pandas as pd

    share = check_policy(policy)
    numbers = pd.to_numeric(raw, errors="coerce").to_numpy(dtype=float, copy=True)
    blank = raw.isna().to_numpy().copy()
    below = np.zeros(len(raw), dtype=bool)
    limit = np.full(len(raw), np.nan)
    if not pd.api.types.is_numeric_dtype(raw):
        text = raw.astype(str)
        blank |= text.str.strip().eq("").to_numpy(dtype=bool)
        candidates = ~blank & np.isnan(numbers)
        if candidates.any():
            found = text[candidates].str.extract(_BELOW)["limit"]
            values = pd.to_numeric(found, errors="coerce").to_numpy(dtype=float)
            rows = np.flatnonzero(candidates)
            hit = np.isfinite(values)
            below[rows[hit]] = True
            limit[rows[hit]] = values[hit]
            numbers[rows[hit]] = share * values[hit]
    unreadable = ~blank & ~below & np.isnan(numbers)
    return Cells(numbers, blank, below, limit, unreadable)


def numeric_column(raw: pd.Series) -> bool:
    """Whether every non-blank cell of *raw* is a number or a detection limit (so that a
    column of "<0.05" cells is read, not carried through as a label)."""
    cells = read_cells(raw)
    return not cells.unreadable.any() and not cells.blank.all()


NOT_ANALYSED_COLUMN = "not analysed"
BELOW_LIMIT_COLUMN = "below detection limit"


class Gaps:
    """The gaps of a table, row by row: columns left blank (not analysed), cells below a
    detection limit, and other notes on what was assumed."""

    def __init__(self, n: int, policy: str = DEFAULT_DETECTION_POLICY) -> None:
        self.policy = policy
        self.share = check_policy(policy)
        self.blank: list[list[str]] = [[] for _ in range(n)]
        self.below: list[list[str]] = [[] for _ in range(n)]
        self.notes: list[list[str]] = [[] for _ in range(n)]

    def add(self, header: str, cells: Cells) -> None:
        """Record the blank and below-limit cells of the column *header*."""
        for r in np.flatnonzero(cells.blank):
            self.blank[r].append(header)
        for r in np.flatnonzero(cells.below):
            self.below[r].append(f"{header} <{cells.limit[r]:g}")

    def note(self, mask: np.ndarray, text: str) -> None:
        """Note *text* on the rows of *mask*."""
        for r in np.flatnonzero(mask):
            self.notes[r].append(text)

    def columns(self) -> dict[str, np.ndarray]:
        """The two output columns: which cells of a row were blank, which below a limit."""
        return {NOT_ANALYSED_COLUMN: np.array(["; ".join(b) for b in self.blank], dtype=object),
                BELOW_LIMIT_COLUMN: np.array(["; ".join(b) for b in self.below], dtype=object)}

    def message(self, r: int) -> str:
        """What row *r*'s message says of its gaps ("" when it has none)."""
        parts = []
        if self.blank[r]:
            parts.append(f"not analysed (blank, left out): {', '.join(self.blank[r])}")
        if self.below[r]:
            taken = {"zero": "taken as zero", "half": "taken as half the limit",
                     "limit": "taken at the limit"}[self.policy]
            parts.append(f"below detection limit ({taken}): {', '.join(self.below[r])}")
        return "; ".join(parts + self.notes[r])

    def counts(self) -> tuple[int, int]:
        """(blank cells, cells below a detection limit) of the whole table."""
        return sum(map(len, self.blank)), sum(map(len, self.below))
