"""``ionwright batch IN -o OUT``: speciate every row of a CSV or Parquet table.

The input is read and written in chunks of ``--chunk-rows`` rows (pandas ``read_csv``
chunks, pyarrow ``iter_batches``), so memory stays bounded however large the file.
A progress bar shows on a terminal (with tqdm installed); a summary follows at the
end. The exit status is 1 when any row failed; the output is written all the same.
"""

from __future__ import annotations

import argparse
import sys
import time
from collections import deque
from pathlib import Path
from typing import Any, Iterator

from ...errors import RecipeError

FORMATS = (".csv", ".parquet")
CHUNK_ROWS = 50_000
IN_FLIGHT_PER_WORKER = 2       # chunks queued on a cluster per worker


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "batch", help="speciate every row of a CSV or Parquet table",
        description="Speciate every row of a table of samples (ingredient molalities, or "
        "analyses with units in the headers, e.g. 'Ca [mg/L]'), writing the input columns "
        "followed by pH, ionic strength, species, saturation indices, status and message. "
        "Rows are never dropped; the exit status is 1 if any row failed.")
    parser.add_argument("input", help="input table (.csv or .parquet)")
    parser.add_argument("-o", "--output", required=True, help="output table (.csv or .parquet)")
    parser.add_argument("--species", nargs="+", default=None, metavar="NAME",
                        help="species whose molality to report (default: all)")
    parser.add_argument("--model", default="davies", help="activity model (default davies)")
    parser.add_argument("--tables", nargs="+", default=["core"], help="constant tables")
    parser.add_argument("--label", action="append", default=[], metavar="COLUMN",
                        help="a column to carry through unread (repeatable)")
    parser.add_argument("--engine", choices=("local", "dask"), default="local",
                        help="solve here (local) or on a dask cluster (needs the "
                        "distributed extra)")
    parser.add_argument("--address", default=None,
                        help="dask scheduler address (default: start a local cluster)")
    parser.add_argument("--threads", type=int, default=None, metavar="N",
                        help="threads of a local solve (default: the cores available, at "
                        "most 4); the answers do not depend on it")
    parser.add_argument("--chunk-rows", type=int, default=CHUNK_ROWS,
                        help=f"rows read, solved and written at a time (default {CHUNK_ROWS})")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    source, target = Path(args.input), Path(args.output)
    for path, role in ((source, "input"), (target, "output")):
        if path.suffix.lower() not in FORMATS:
            raise RecipeError(f"{role} {str(path)!r}", "is neither .csv nor .parquet",
                              "name the file with one of those suffixes")
    if not source.is_file():
        raise RecipeError(f"input {str(source)!r}", "does not exist", "check the path")
    if args.chunk_rows < 1:
        raise RecipeError("--chunk-rows", f"{args.chunk_rows} must be ≥ 1")
    if args.threads is not None and args.threads < 1:
        raise RecipeError("--threads", f"{args.threads} must be ≥ 1")
    options = dict(species=args.species, model=args.model, tables=args.tables,
                   labels=args.label)
    started = time.perf_counter()
    counts = {"rows": 0, "converged": 0, "failed": 0, "invalid": 0}
    chunks = _read_chunks(source, args.chunk_rows)
    with _Progress(source, args.chunk_rows) as bar, _Writer(target) as writer:
        for solved in _solved_chunks(chunks, options, args.engine, args.address,
                                     args.threads):
            writer.write(solved)
            status = solved["status"].value_counts()
            counts["rows"] += len(solved)
            for key in ("converged", "failed", "invalid"):
                counts[key] += int(status.get(key, 0))
            bar(len(solved))
    elapsed = time.perf_counter() - started
    rate = counts["rows"] / elapsed if elapsed > 0 else 0.0
    print(f"{counts['rows']} rows: {counts['converged']} converged, {counts['failed']} "
          f"failed, {counts['invalid']} invalid; {elapsed:.2f} s ({rate:,.0f} rows/s); "
          f"written to {target}")
    if counts["failed"]:
        print(f"ionwright batch: {counts['failed']} row(s) failed; see their 'message' column",
              file=sys.stderr)
    return 1 if counts["failed"] else 0


def _solved_chunks(chunks: Iterator[Any], options: dict, engine: str,
                   address: str | None, threads: int | None = None) -> Iterator[Any]:
    """Each chunk solved, in input order: here, or a few at a time on a dask cluster."""
    from ...batch._run import dask_client, solve_batch, solve_partition

    if engine == "local":
        for chunk in chunks:
            yield solve_batch(chunk, threads=threads, **options)
        return
    options = {**options, "threads": 1}  # the cluster's workers are the parallelism
    with dask_client(address) as client:
        workers = max(len(client.scheduler_info().get("workers", {})), 1)
        pending: deque = deque()
        for chunk in chunks:
            pending.append(client.submit(solve_partition, chunk, options, pure=False))
            while len(pending) >= IN_FLIGHT_PER_WORKER * workers:
                yield pending.popleft().result()
        while pending:
            yield pending.popleft().result()


def _read_chunks(path: Path, rows: int) -> Iterator[Any]:
    import pandas as pd

    if path.suffix.lower() == ".csv":
        start = 0
        for chunk in pd.read_csv(path, chunksize=rows):
            chunk.index = range(start, start + len(chunk))
            start += len(chunk)
            yield chunk
        return
    import pyarrow.parquet as pq

    for batch in pq.ParquetFile(path).iter_batches(batch_size=rows):
        yield batch.to_pandas()


class _Writer:
    """Appends solved chunks to a CSV or Parquet file, one schema for the whole file
    (written by pyarrow, which writes CSV many times faster than pandas)."""

    def __init__(self, path: Path) -> None:
        self.path = path
        self.parquet = path.suffix.lower() == ".parquet"
        self.started = False
        self.writer = None
        self.schema = None
        self.numeric: dict[str, bool] = {}

    def __enter__(self) -> "_Writer":
        return self

    def write(self, frame) -> None:
        try:
            import pyarrow as pa
        except ImportError:  # CSV without pyarrow: pandas writes it (more slowly)
            if self.parquet:
                raise RecipeError(f"output {str(self.path)!r}", "Parquet needs pyarrow",
                                  'pip install "ionwright[parquet]", or write .csv') from None
            frame.to_csv(self.path, mode="a" if self.started else "w",
                         header=not self.started, index=False)
            self.started = True
            return
        table = pa.Table.from_pandas(self._pinned(frame), preserve_index=False)
        if self.schema is None:
            self.schema = table.schema
            if self.parquet:
                import pyarrow.parquet as pq

                self.writer = pq.ParquetWriter(self.path, self.schema)
            else:
                import pyarrow.csv as pa_csv

                self.writer = pa_csv.CSVWriter(self.path, self.schema)
        self.writer.write_table(table.cast(self.schema))
        self.started = True

    def _pinned(self, frame):
        """The columns as numbers or as text, fixed by the first chunk (a later chunk with
        text in a number column writes it as missing; its row says why it is invalid)."""
        import pandas as pd

        if not self.numeric:
            self.numeric = {c: pd.api.types.is_numeric_dtype(frame[c]) for c in frame.columns}
        out = {}
        for c in frame.columns:
            if self.numeric[c]:
                out[c] = pd.to_numeric(frame[c], errors="coerce").astype(float)
            else:
                out[c] = frame[c].astype("string")
        return pd.DataFrame(out)

    def __exit__(self, *exc) -> None:
        if self.writer is not None:
            self.writer.close()


class _Progress:
    """A tqdm bar on a terminal, nothing otherwise; called with the rows just done."""

    def __init__(self, source: Path, chunk_rows: int) -> None:
        self.bar = None
        if not sys.stderr.isatty():
            return
        try:
            from tqdm import tqdm
        except ImportError:
            return
        self.bar = tqdm(total=_count_rows(source), unit="rows", unit_scale=True,
                        file=sys.stderr)

    def __enter__(self):
        return self

    def __call__(self, done: int) -> None:
        if self.bar is not None:
            self.bar.update(done)

    def __exit__(self, *exc) -> None:
        if self.bar is not None:
            self.bar.close()


def _count_rows(path: Path) -> int | None:
    """Rows in the file, cheaply (Parquet metadata; CSV newlines); None if unknown."""
    if path.suffix.lower() == ".parquet":
        import pyarrow.parquet as pq

        return pq.ParquetFile(path).metadata.num_rows
    lines = 0
    with open(path, "rb") as handle:
        for block in iter(lambda: handle.read(1 << 20), b""):
            lines += block.count(b"\n")
    return max(lines - 1, 0)
