"""``ionwright batch IN -o OUT``: speciate every row of a CSV or Parquet table.

The input is read and written in chunks of ``--chunk-rows`` rows (pandas ``read_csv``
chunks, pyarrow ``iter_batches``), so memory stays bounded however large the file.
A progress bar shows on a terminal (with tqdm installed), refreshed every second; when
stderr is a file a progress line is written at intervals instead; a summary follows at the
end with the rows' statuses, the blank and below-limit cells, and the rows flagged for
their charge balance. The exit status is 1 when any row is invalid or did not converge
(``--accept-partial``: 0); the output is written all the same.

The output is written under a temporary name in the output's folder and renamed when the
last row is written, so the output name holds either a complete table or nothing: an
interruption (Ctrl-C, SIGTERM) or an error removes the partial file and prints how far
the run got. Input that is not a table (not UTF-8, empty, ragged, unclosed quotes,
semicolons, a Parquet name on another file) is refused before any row is solved.
"""

from __future__ import annotations

import argparse
import os
import re
import signal
import sys
import time
from collections import deque
from contextlib import contextmanager
from pathlib import Path
from typing import Any, Callable, Iterator, Sequence

from ...batch._cells import (BELOW_LIMIT_COLUMN, DEFAULT_DETECTION_POLICY, DETECTION_POLICIES,
                             NOT_ANALYSED_COLUMN)
from ...batch._derived_columns import BALANCE_FLAG_COLUMN, derived_options
from ...errors import RecipeError
from ...outputs._cautions import CHARGE_BALANCE_LIMIT
from ...outputs._derived_ions import TDS_CONVENTIONS
from .._batch_progress import BatchProgress, count_rows
from ...inputs._recipe import DEFAULT_TABLES
from ...status import CONVERGED, INVALID, SOLVER_STATUSES
from .._paths import check_output_path

FORMATS = (".csv", ".parquet")
NOT_CONVERGED = "not converged"   # rows with any solver status but converged
CHUNK_ROWS = 50_000
IN_FLIGHT_PER_WORKER = 2       # chunks queued on a cluster per worker


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "batch", help="speciate every row of a CSV or Parquet table",
        description="Speciate every row of a table of samples (ingredient molalities, or "
        "analyses with units in the headers, e.g. 'Ca [mg/L]'), writing the input columns "
        "followed by pH, ionic strength, species, saturation indices, status and message. "
        "Rows are never dropped; the exit status is 1 if any row is invalid or did not converge "
        "(--accept-partial makes it 0). The output is "
        "written only when complete (an interrupted run leaves none). Parquet files need "
        "pip install \"ionwright[parquet]\"; the progress bar on a terminal needs "
        "\"ionwright[progress]\"; --engine dask needs \"ionwright[distributed]\".")
    parser.add_argument("input", help="input table (.csv or .parquet); with --engine dask "
                        "and an output folder also a folder or a quoted glob ('wells-*.csv')")
    parser.add_argument("-o", "--output", required=True,
                        help="output table (.csv or .parquet); with --engine dask a folder "
                        "(ending in /) receives Parquet parts written by the workers")
    parser.add_argument("--species", nargs="+", default=None, metavar="NAME",
                        help="species whose molality to report (default: all)")
    parser.add_argument("--model", default="davies", help="activity model (default davies)")
    parser.add_argument("--tables", nargs="+", default=list(DEFAULT_TABLES), help="constant tables")
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
    parser.add_argument("--tds", choices=("auto", *TDS_CONVENTIONS), default="auto",
                        help="what the 'TDS [mg/L]' column holds: 'calculated' (Standard "
                        "Methods 1030E calculated sum), 'species-sum' (every dissolved "
                        "species), or 'auto' (calculated for analyses, the species sum "
                        "for recipes; the default); both also have their own columns")
    parser.add_argument("--balance-limit", type=float, default=CHARGE_BALANCE_LIMIT,
                        metavar="PERCENT", help="flag rows whose charge-balance error is "
                        f"beyond this many percent (default {CHARGE_BALANCE_LIMIT:g})")
    parser.add_argument("--ions", action="store_true",
                        help="also give each ion's total in mg/L and meq/L")
    parser.add_argument("--formulation", action="store_true",
                        help="also give osmolality, osmotic coefficient, water activity and "
                        "conductivity at each row's temperature")
    parser.add_argument("--detection-limit", choices=tuple(DETECTION_POLICIES),
                        default=DEFAULT_DETECTION_POLICY,
                        help="what a cell such as '<0.05' (below the detection limit) "
                        "stands for: zero, half the limit (the default) or the limit; a "
                        "blank cell means not analysed (left out, noted in the row)")
    parser.add_argument("--accept-partial", action="store_true",
                        help="exit 0 even when some rows are invalid or did not converge "
                        "(the default is 1, so that scripts notice)")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    if args.engine == "dask" and _is_folder(args.output):
        return _run_on_workers(args)
    source, target = Path(args.input), Path(args.output)
    if source.suffix.lower() not in FORMATS:
        raise RecipeError(f"input {str(source)!r}", "is neither .csv nor .parquet",
                          "name the file with one of those suffixes")
    if not source.is_file():
        raise RecipeError(f"input {str(source)!r}", "does not exist", "check the path")
    check_output_path(target, "-o", FORMATS, inputs=[source])
    if args.chunk_rows < 1:
        raise RecipeError("--chunk-rows", f"{args.chunk_rows} must be ≥ 1",
                          f"give a number of rows, e.g. {CHUNK_ROWS}")
    if args.threads is not None and args.threads < 1:
        raise RecipeError("--threads", f"{args.threads} must be ≥ 1",
                          "give a number of threads, or leave it out to use the cores")
    started = time.perf_counter()
    counts = {"rows": 0, CONVERGED: 0, NOT_CONVERGED: 0, INVALID: 0, "blank": 0, "below": 0,
              "flagged": 0}
    from ...batch._run import text_columns_of

    chunks = _read_chunks(source, args.chunk_rows, args.label)
    first = next(chunks)
    text = text_columns_of(first)   # read once: every chunk reads its columns alike
    options = dict(species=args.species, model=args.model, tables=args.tables,
                   labels=args.label, text_columns=text,
                   derived=derived_options(args.tds, args.balance_limit, args.ions,
                                           args.formulation),
                   detection_limit=args.detection_limit)
    try:
        with _stopped_by_signals(), BatchProgress(count_rows(source)) as bar, \
                _Writer(target, [*args.label, *text], inputs=list(first.columns)) as writer:
            for solved in _solved_chunks(_chain(first, chunks), options, args.engine,
                                         args.address, args.threads,
                                         lambda done: bar(counts["rows"] + done)):
                writer.write(solved)
                _count(solved, counts)
                bar(counts["rows"])
    except Interrupted as stop:
        print(f"ionwright batch: interrupted by {stop.signal_name} after {counts['rows']} "
              f"rows ({counts[CONVERGED]} converged, {counts[NOT_CONVERGED]} not converged, "
              f"{counts[INVALID]} invalid); {target} was not written (a batch writes its "
              "output only when complete)", file=sys.stderr)
        return 128 + stop.signal_number
    elapsed = time.perf_counter() - started
    rate = counts["rows"] / elapsed if elapsed > 0 else 0.0
    failed, invalid = counts[NOT_CONVERGED], counts[INVALID]
    print(f"{counts['rows']} rows: {counts[CONVERGED]} converged, {failed} not converged, "
          f"{invalid} invalid; {elapsed:.2f} s ({rate:,.0f} rows/s); written to {target}")
    print(f"{counts['blank']} blank cells (not analysed, left out), {counts['below']} below a "
          f"detection limit (taken as {args.detection_limit}); {counts['flagged']} rows with "
          f"a charge-balance error beyond ±{args.balance_limit:g} %")
    if failed:
        print(f"ionwright batch: {failed} row(s) did not converge; see their 'status' and "
              "'message' columns", file=sys.stderr)
    if invalid:
        print(f"ionwright batch: {invalid} row(s) are invalid; their 'message' column says "
              "which cell and why", file=sys.stderr)
    if (failed or invalid) and not args.accept_partial:
        print("ionwright batch: exit status 1 (some rows have no result); --accept-partial "
              "exits 0 with the same output", file=sys.stderr)
        return 1
    return 0


def _is_folder(output: str) -> bool:
    """Whether *output* names a folder (ends with a slash, exists as one, or has no
    suffix): the dask engine then writes Parquet parts there from the workers."""
    path = Path(output)
    return output.endswith(("/", os.sep)) or path.is_dir() or not path.suffix


def _run_on_workers(args: argparse.Namespace) -> int:
    """``--engine dask -o FOLDER/``: the workers read the input (files, a folder or a
    glob), solve it and write Parquet parts; this process holds only the counts."""
    import glob

    from ...batch._distributed import dask_client, files_on_cluster

    if not glob.glob(args.input):
        raise RecipeError(f"input {args.input!r}", "matches no file or folder",
                          "check the path or the glob pattern (quote it for the shell)")
    options = dict(species=args.species, model=args.model, tables=args.tables,
                   labels=args.label,
                   derived=derived_options(args.tds, args.balance_limit, args.ions,
                                           args.formulation),
                   detection_limit=args.detection_limit)
    started = time.perf_counter()
    with _stopped_by_signals(), BatchProgress(None) as bar, \
            dask_client(args.address) as client:
        counts = files_on_cluster(args.input, args.output, options, client,
                                  lambda done, total: bar(done), args.label)
    elapsed = time.perf_counter() - started
    total = counts.sum(numeric_only=True)
    rows = int(total.get("rows", 0))
    invalid = int(total.get(INVALID, 0))
    failed = sum(int(total.get(s, 0)) for s in SOLVER_STATUSES if s != CONVERGED)
    print(f"{rows} rows: {int(total.get(CONVERGED, 0))} converged, {failed} not converged, "
          f"{invalid} invalid; {elapsed:.2f} s ({rows / max(elapsed, 1e-9):,.0f} rows/s); "
          f"written to {args.output} as {len(counts)} Parquet part(s) by the workers")
    print(f"{int(total.get('blank cells', 0))} blank cells (not analysed, left out), "
          f"{int(total.get('below limit', 0))} below a detection limit (taken as "
          f"{args.detection_limit}); {int(total.get('balance flagged', 0))} rows with a "
          f"charge-balance error beyond ±{args.balance_limit:g} %")
    if (failed or invalid) and not args.accept_partial:
        print(f"ionwright batch: {failed + invalid} row(s) have no result (see 'status' and "
              "'message'); exit status 1 (--accept-partial exits 0)", file=sys.stderr)
        return 1
    return 0


def _count(solved, counts: dict[str, int]) -> None:
    """Add a solved chunk's rows, statuses, gaps and flags to *counts*."""
    status = solved["status"].value_counts()
    counts["rows"] += len(solved)
    counts[CONVERGED] += int(status.get(CONVERGED, 0))
    counts[INVALID] += int(status.get(INVALID, 0))
    counts[NOT_CONVERGED] += sum(int(status.get(s, 0)) for s in SOLVER_STATUSES
                                 if s != CONVERGED)
    for key, column in (("blank", NOT_ANALYSED_COLUMN), ("below", BELOW_LIMIT_COLUMN)):
        cells = solved[column].astype(str)
        counts[key] += int(cells.str.count("; ").add(cells.ne("").astype(int)).sum())
    counts["flagged"] += int(solved[BALANCE_FLAG_COLUMN].sum())


def _solved_chunks(chunks: Iterator[Any], options: dict, engine: str,
                   address: str | None, threads: int | None = None,
                   progress: Callable[[int], None] | None = None) -> Iterator[Any]:
    """Each chunk solved, in input order: here, or a few at a time on a dask cluster;
    *progress* hears the rows done of the chunk being solved here."""
    from ...batch._distributed import dask_client, solve_partition
    from ...batch._run import _check_frame, _solve_frame

    if engine == "local":
        for chunk in chunks:
            _check_frame(chunk)
            yield _solve_frame(chunk, threads=threads, **options,
                               progress=None if progress is None
                               else lambda done, total: progress(done))
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


def _chain(first: Any, rest: Iterator[Any]) -> Iterator[Any]:
    yield first
    yield from rest


def _read_chunks(path: Path, rows: int, labels: Sequence[str] = ()) -> Iterator[Any]:
    """The table at *path* in chunks of *rows*, always at least one (perhaps empty) chunk.

    Problems of the file itself (encoding, shape, quotes, separators) are refused with the
    file's name, the line where known and a way to fix it.
    """
    where = f"input {str(path)!r}"
    if path.suffix.lower() == ".csv":
        yield from _csv_chunks(path, rows, labels, where)
        return
    try:
        import pyarrow.parquet as pq
    except ImportError:
        raise RecipeError(where, "Parquet needs pyarrow", 'pip install "ionwright[parquet]", '
                          "or give a .csv file") from None
    import pyarrow as pa

    try:
        handle = pq.ParquetFile(path)
    except (pa.ArrowInvalid, OSError) as exc:
        raise RecipeError(where, f"is not a Parquet file ({exc})", "give a Parquet file, or "
                          "save the table as CSV and name it .csv") from None
    found = False
    for batch in handle.iter_batches(batch_size=rows):
        found = True
        yield batch.to_pandas()
    if not found:  # no rows: the columns alone, so that the output still gets its header
        yield handle.schema_arrow.empty_table().to_pandas()


_FIELDS = re.compile(r"Expected (\d+) fields in line (\d+), saw (\d+)")
_OPEN_QUOTE = re.compile(r"EOF inside string starting at row (\d+)")


def _csv_chunks(path: Path, rows: int, labels: Sequence[str], where: str) -> Iterator[Any]:
    import pandas as pd

    from ...data._text import NOT_UTF8_HINT, first_not_utf8

    start = 0
    try:
        _check_header(path, where)
        reader = pd.read_csv(path, chunksize=rows, encoding="utf-8",
                             dtype={label: str for label in labels})
        for chunk in reader:
            if start == 0:
                _check_separator(chunk, where)
            chunk.index = range(start, start + len(chunk))
            start += len(chunk)
            yield chunk
    except UnicodeDecodeError:
        raise RecipeError(where, first_not_utf8(path) or "is not UTF-8 text",
                          NOT_UTF8_HINT) from None
    except pd.errors.EmptyDataError:
        raise RecipeError(where, "is empty: it has no header line naming the columns",
                          "the first line names the columns, e.g. sample,NaCl,CaCl2") from None
    except pd.errors.ParserError as exc:
        raise _csv_problem(str(exc), where) from None


def _check_header(path: Path, where: str) -> None:
    """Refuse a header that names a column twice (pandas would rename the second copy and
    read it as an unknown ingredient)."""
    import csv
    from collections import Counter

    with open(path, encoding="utf-8-sig", newline="") as handle:
        header = next(csv.reader(handle), [])
    twice = [name for name, count in Counter(h.strip() for h in header).items()
             if count > 1 and name]
    if twice:
        raise RecipeError(where, f"its header names column(s) {', '.join(map(repr, twice))} "
                          "more than once", "rename or drop the copies: each column is read "
                          "once")


def _csv_problem(text: str, where: str) -> RecipeError:
    fields = _FIELDS.search(text)
    if fields:
        wanted, line, saw = fields.groups()
        return RecipeError(where, f"line {line} has {saw} values where the header has "
                           f"{wanted} columns", "give each row one value per column (a text "
                           "value holding a comma needs quotes)")
    quote = _OPEN_QUOTE.search(text)
    if quote:
        return RecipeError(where, f"a quoted value opened on data row {quote.group(1)} is "
                           "never closed", 'close the quote (") or remove it')
    return RecipeError(where, f"cannot be read as CSV ({text.strip()})",
                       "check that it is a comma-separated table with a header line")


def _check_separator(chunk, where: str) -> None:
    """Refuse a table read as one column whose header holds semicolons or tabs: another
    separator, which would otherwise solve every row as pure water."""
    if len(chunk.columns) != 1:
        return
    header = str(chunk.columns[0])
    for mark, name in ((";", "semicolons"), ("\t", "tabs")):
        if mark in header:
            raise RecipeError(where, f"reads as one column {header!r}: its values are "
                              f"separated by {name} ({mark!r}), not commas",
                              "save the table as comma-separated values (CSV) with a point "
                              "as the decimal mark")


class Interrupted(Exception):
    """SIGINT or SIGTERM arrived while a batch was running."""

    def __init__(self, signal_number: int) -> None:
        super().__init__(signal_number)
        self.signal_number = signal_number
        self.signal_name = signal.Signals(signal_number).name


@contextmanager
def _stopped_by_signals() -> Iterator[None]:
    """Turn SIGINT and SIGTERM into :class:`Interrupted` while the batch runs, so that the
    partial output is removed and a summary printed (the default SIGTERM kills outright)."""
    def stop(number, frame):
        raise Interrupted(number)

    previous = {}
    try:
        for number in (signal.SIGINT, signal.SIGTERM):
            previous[number] = signal.signal(number, stop)
    except ValueError:  # not the main thread: signals stay as they are
        pass
    try:
        yield
    finally:
        for number, handler in previous.items():
            signal.signal(number, handler)


class _Writer:
    """Appends solved chunks to a CSV or Parquet file, one schema for the whole file
    (written by pyarrow, which writes CSV many times faster than pandas).

    Rows go to a temporary file in the output's folder, renamed to the output name when
    the writer closes without an error; on an error or interruption it is deleted.
    Columns named in *text* (labels) are always written as text; so is every input
    column of a CSV output, so that a cell is written as it was read even when a later
    chunk holds text where the first held numbers. In a Parquet output every other input
    column is read as numbers and written as numbers, even where a cell held a detection
    limit ("<0.05", kept in the 'below detection limit' column) or text (its row invalid,
    the text quoted in its message).
    """

    def __init__(self, path: Path, text: Sequence[str] = (), inputs: Sequence[str] = ()) -> None:
        self.path = path
        self.partial = path.with_name(f".{path.name}.partial-{os.getpid()}{path.suffix}")
        self.parquet = path.suffix.lower() == ".parquet"
        self.started = False
        self.writer: Any = None             # pyarrow's Parquet or CSV writer, once opened
        self.schema = None
        self.text = set(text) | (set() if self.parquet else set(inputs))
        self.numbers = set(inputs) - self.text
        self.kinds: dict[str, str] = {}

    def __enter__(self) -> "_Writer":
        return self

    def write(self, frame) -> None:
        try:
            import pyarrow as pa
        except ImportError:  # CSV without pyarrow: pandas writes it (more slowly)
            if self.parquet:
                raise RecipeError(f"output {str(self.path)!r}", "Parquet needs pyarrow",
                                  'pip install "ionwright[parquet]", or write .csv') from None
            frame.to_csv(self.partial, mode="a" if self.started else "w",
                         header=not self.started, index=False)
            self.started = True
            return
        table = pa.Table.from_pandas(self._pinned(frame), preserve_index=False)
        if self.schema is None:
            self.schema = table.schema
            if self.parquet:
                import pyarrow.parquet as pq

                self.writer = pq.ParquetWriter(self.partial, self.schema)
            else:
                import pyarrow.csv as pa_csv

                self.writer = pa_csv.CSVWriter(self.partial, self.schema)
        self.writer.write_table(table.cast(self.schema))
        self.started = True

    def _pinned(self, frame):
        """The columns as numbers or as text, fixed by the first chunk (a later chunk with
        text in a number column writes it as missing; its row says why it is invalid)."""
        import pandas as pd

        if not self.kinds:
            self.kinds = {c: self._kind(frame[c], str(c)) for c in frame.columns}
        out = {}
        for c in frame.columns:
            if self.kinds[c] == "number":
                out[c] = pd.to_numeric(frame[c], errors="coerce").astype(float)
            elif self.kinds[c] == "bool":
                out[c] = frame[c].astype("boolean")
            else:
                out[c] = frame[c].astype("string")
        return pd.DataFrame(out)

    def _kind(self, column, name: str) -> str:
        """"number", "bool" or "text": how the column *name* is written throughout."""
        import pandas as pd

        if name in self.text:
            return "text"
        if pd.api.types.is_bool_dtype(column):
            return "bool"
        if name in self.numbers or pd.api.types.is_numeric_dtype(column):
            return "number"
        return "text"

    def __exit__(self, kind, value, traceback) -> None:
        try:
            if self.writer is not None:
                self.writer.close()
        finally:
            if kind is None and self.started:
                os.replace(self.partial, self.path)
            else:
                self.partial.unlink(missing_ok=True)
