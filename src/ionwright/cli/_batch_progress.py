"""How far ``ionwright batch`` has got, row by row: a tqdm bar on a terminal, refreshed
every second even while a chunk is being solved, and a plain line at intervals when
stderr is a file (a log of a long run)."""

from __future__ import annotations

import sys
import threading
import time
from pathlib import Path

#: Seconds between refreshes of the bar on a terminal
REFRESH_SECONDS = 1.0
#: Seconds between progress lines when stderr is not a terminal
LINE_SECONDS = 10.0


class BatchProgress:
    """Called with the number of rows done so far (absolute); shows it on stderr."""

    def __init__(self, total: int | None, line_seconds: float = LINE_SECONDS) -> None:
        self.total = total
        self.done = 0
        self.started = time.perf_counter()
        self.bar = None
        self.interval = REFRESH_SECONDS
        self._lock = threading.Lock()
        self._stop = threading.Event()
        if sys.stderr.isatty():
            try:
                from tqdm import tqdm
            except ImportError:
                tqdm = None
            if tqdm is not None:
                self.bar = tqdm(total=total, unit="rows", unit_scale=True, file=sys.stderr,
                                mininterval=0.0)
        else:
            self.interval = line_seconds
        self._ticker = threading.Thread(target=self._tick, daemon=True)

    def __enter__(self) -> BatchProgress:
        self._ticker.start()
        return self

    def __call__(self, done: int) -> None:
        with self._lock:
            self.done = max(self.done, done)
            if self.bar is not None:
                self.bar.update(self.done - self.bar.n)

    def _tick(self) -> None:
        while not self._stop.wait(self.interval):
            with self._lock:
                if self.bar is not None:
                    self.bar.refresh()
                else:
                    print(self.line(), file=sys.stderr, flush=True)

    def line(self) -> str:
        """One progress line: rows done, share, rate and time left where known."""
        elapsed = time.perf_counter() - self.started
        rate = self.done / elapsed if elapsed > 0 else 0.0
        text = f"ionwright batch: {self.done:,} rows"
        if self.total:
            text += f" of {self.total:,} ({100 * self.done / self.total:.0f} %)"
            if rate > 0:
                text += f", about {(self.total - self.done) / rate:,.0f} s left"
        return text + f"; {rate:,.0f} rows/s"

    def __exit__(self, *exc) -> None:
        self._stop.set()
        self._ticker.join()
        if self.bar is not None:
            self.bar.close()


def count_rows(path: Path) -> int | None:
    """Rows in the file, cheaply (Parquet metadata; CSV newlines); None if unknown."""
    if path.suffix.lower() == ".parquet":
        import pyarrow.parquet as pq

        return pq.ParquetFile(path).metadata.num_rows
    lines = 0
    with open(path, "rb") as handle:
        for block in iter(lambda: handle.read(1 << 20), b""):
            lines += block.count(b"\n")
    return max(lines - 1, 0)
