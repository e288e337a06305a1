"""Progress of a batch, row by row: a callback told how many rows are done of how many.

The solver reports each finished chunk (from its threads); rows that need no solve
(invalid ones) and the rows of a finished group are counted as they complete, so the
count reaches the total exactly once per frame.
"""

from __future__ import annotations

import threading
from typing import Callable

#: progress(done, total): rows finished so far, rows in the frame
ProgressCallback = Callable[[int, int], None]


class RowProgress:
    """Counts finished rows and passes the count on; thread-safe, never past the total."""

    def __init__(self, total: int, callback: ProgressCallback | None) -> None:
        self.total = total
        self.done = 0
        self.callback = callback
        self._lock = threading.Lock()

    def advance(self, rows: int) -> None:
        """*rows* more rows are finished."""
        if self.callback is None or rows <= 0:
            return
        with self._lock:
            self.done = min(self.total, self.done + rows)
            done = self.done
        self.callback(done, self.total)

    def group(self, size: int) -> GroupProgress:
        """A counter for one group of *size* rows, topped up to *size* when it closes."""
        return GroupProgress(self, size)


class GroupProgress:
    """The rows of one solved group: chunks as they finish, the rest at the end."""

    def __init__(self, rows: RowProgress, size: int) -> None:
        self.rows, self.size, self.reported = rows, size, 0
        self._lock = threading.Lock()

    def chunk(self, n: int) -> None:
        with self._lock:
            n = min(n, self.size - self.reported)
            self.reported += n
        self.rows.advance(n)

    def close(self) -> None:
        self.chunk(self.size - self.reported)
