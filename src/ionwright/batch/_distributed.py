"""The dask engine: frames of samples spread over a cluster in partitions, and tables too
large for the client read and written by the workers themselves.

* :func:`frame_on_cluster` maps a frame the caller holds over the cluster, partition by
  partition, and gathers the solved rows in order;
* :func:`files_on_cluster` never brings the table to the client: each worker reads its
  block of the CSV or Parquet input (``dask.dataframe`` over files, folders or globs),
  solves it and writes its own Parquet part (``part-00000.parquet``, ...) into the output
  folder; the client receives only each part's counts of rows by status.

Every partition is solved by :func:`ionwright.batch._run._solve_frame` on one thread: the
cluster's workers are the parallelism. Needs ``pip install "ionwright[distributed]"``.
"""

from __future__ import annotations

from contextlib import contextmanager
from pathlib import Path
from typing import TYPE_CHECKING, Any, Iterator, Mapping, Sequence

from ..errors import IonwrightError, RecipeError
from ._cells import BELOW_LIMIT_COLUMN, NOT_ANALYSED_COLUMN
from ._derived_columns import BALANCE_FLAG_COLUMN
from ._progress import ProgressCallback, RowProgress
from ._run import STATUS_COLUMN, _solve_frame, text_columns_of

if TYPE_CHECKING:
    import pandas as pd

LOCAL_WORKERS = 2              # worker processes of the default local dask cluster
#: Bytes of CSV read by one task (dask.dataframe's blocksize): about 100,000 rows of a
#: survey table
CSV_BLOCK_BYTES = 16_000_000
PART_NAME = "part-{:05d}.parquet"


@contextmanager
def dask_client(address: str | None = None, processes: bool = True) -> Iterator[Any]:
    """A dask.distributed client: of the scheduler at *address*, else of a new local
    cluster (closed on exit; *processes* False runs its workers as threads)."""
    try:
        from dask.distributed import Client, LocalCluster
    except ImportError:
        raise IonwrightError("the dask engine needs dask.distributed, which is not "
                             "installed", 'pip install "ionwright[distributed]", or use '
                             'engine="local"') from None
    cluster = None if address else LocalCluster(n_workers=LOCAL_WORKERS, threads_per_worker=1,
                                                 processes=processes, dashboard_address=None)
    client = Client(address or cluster)
    try:
        yield client
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


def solve_partition(part: pd.DataFrame, options: Mapping[str, Any]) -> pd.DataFrame:
    """One task of the dask engine: the local solve of one partition of rows."""
    return _solve_frame(part, **options)


def frame_on_cluster(frame: pd.DataFrame, options: Mapping[str, Any], address: str | None,
                     partition_rows: int, progress: ProgressCallback | None = None
                     ) -> pd.DataFrame:
    """The rows in partitions of *partition_rows*, mapped over a dask cluster, in order;
    *progress* hears of each partition as it finishes."""
    import pandas as pd

    if partition_rows < 1:
        raise RecipeError("partition_rows", f"{partition_rows} must be ≥ 1",
                          "give a number of rows per task, e.g. 65536")
    parts = [frame.iloc[i:i + partition_rows] for i in range(0, len(frame), partition_rows)]
    with dask_client(address) as client:
        if not parts:
            return _solve_frame(frame, **options)
        from dask.distributed import as_completed

        futures = client.map(solve_partition, parts, options=dict(options), pure=False)
        rows = RowProgress(len(frame), progress)
        for done in as_completed(futures):
            rows.advance(len(parts[futures.index(done)]))
        return pd.concat(client.gather(futures))


def files_on_cluster(inputs: str | Path | Sequence[str | Path], output: str | Path,
                     options: Mapping[str, Any], client: Any,
                     progress: ProgressCallback | None = None,
                     labels: Sequence[str] = ()) -> pd.DataFrame:
    """Solve the CSV or Parquet *inputs* (files, folders or globs) on the cluster of
    *client*, the workers reading and writing: the output folder receives one Parquet
    part per input block. Returns the counts of rows by status per part (the only data
    the client holds)."""
    import dask
    import pandas as pd

    table = read_table(inputs, labels)
    folder = Path(output)
    if folder.exists() and not folder.is_dir():
        raise RecipeError(f"output {str(folder)!r}", "is a file; the dask engine writes a "
                          "folder of Parquet parts", "name a folder, e.g. solved/")
    if folder.is_dir() and any(folder.glob("part-*.parquet")):
        raise RecipeError(f"output {str(folder)!r}", "already holds Parquet parts",
                          "name a new folder, or remove the old parts")
    folder.mkdir(parents=True, exist_ok=True)
    sample = table.head(1000, npartitions=-1)   # a sample, to read every part's columns alike
    text = sorted(set(text_columns_of(sample)) | set(labels))
    options = {**options, "text_columns": text, "threads": 1}
    paths = [folder / PART_NAME.format(i) for i in range(table.npartitions)]
    tasks = [dask.delayed(solve_and_write)(block, str(path), options, text, pure=False)
             for block, path in zip(table.to_delayed(), paths)]
    from dask.distributed import as_completed

    futures = client.compute(tasks)
    done = 0
    counts = []
    try:
        for future in as_completed(futures):
            found = future.result()
            counts.append(found)
            done += int(found["rows"].iloc[0])
            if progress is not None:
                progress(done, 0)          # total 0: unknown until every block is read
    except BaseException:  # an error or an interruption: no partial table is left behind
        client.cancel(futures)
        for path in paths:
            path.unlink(missing_ok=True)
        raise
    table_counts = pd.concat(counts, ignore_index=True).fillna(0)
    return table_counts.sort_values("part", ignore_index=True)


def read_table(inputs: str | Path | Sequence[str | Path], labels: Sequence[str] = ()):
    """A dask DataFrame over the CSV or Parquet *inputs* (read lazily, on the workers);
    CSV cells are read as text and converted by the batch reader (so that "<0.05" and
    blanks read alike in every block)."""
    try:
        import dask.dataframe as dd
    except ImportError:
        raise IonwrightError("the dask engine needs dask.dataframe, which is not installed",
                             'pip install "ionwright[distributed]"') from None
    paths = [str(p) for p in ([inputs] if isinstance(inputs, (str, Path)) else inputs)]
    kinds = {_kind(p) for p in paths}
    if len(kinds) != 1:
        raise RecipeError(f"input {paths!r}", "mixes CSV and Parquet, or names neither",
                          "give .csv files (or globs) or .parquet files or folders")
    if kinds == {"parquet"}:
        return dd.read_parquet(paths)
    return dd.read_csv(paths, dtype=str, blocksize=CSV_BLOCK_BYTES, keep_default_na=True)


def _kind(path: str) -> str:
    lowered = path.lower().rstrip("/")
    if lowered.endswith(".csv"):
        return "csv"
    if lowered.endswith(".parquet") or Path(path).is_dir():
        return "parquet"
    return "unknown"


def solve_and_write(block: pd.DataFrame, path: str, options: Mapping[str, Any],
                    text: Sequence[str]) -> pd.DataFrame:
    """One worker's task: solve *block*, write it as the Parquet part *path*, return its
    counts of rows by status (one row: part, rows and a column per status)."""
    import pandas as pd

    solved = _solve_frame(block.reset_index(drop=True), **options)
    pinned = pin_types(solved, list(block.columns), text)
    pinned.to_parquet(path, index=False)
    statuses = solved[STATUS_COLUMN].value_counts().to_dict()
    part = int(Path(path).stem.split("-")[1])
    gaps = {key: int(cells.str.count("; ").add(cells.ne("").astype(int)).sum())
            for key, cells in (("blank cells", solved[NOT_ANALYSED_COLUMN].astype(str)),
                               ("below limit", solved[BELOW_LIMIT_COLUMN].astype(str)))}
    return pd.DataFrame([{"part": part, "rows": len(solved), **gaps,
                          "balance flagged": int(solved[BALANCE_FLAG_COLUMN].sum()),
                          **{str(k): int(v) for k, v in statuses.items()}}])


def pin_types(frame: pd.DataFrame, inputs: Sequence[str], text: Sequence[str]):
    """*frame* with every part's columns of one type: text columns as strings, the other
    input columns as numbers (what the batch read from them), flags as booleans, results
    as they are (numbers, or strings for status and messages)."""
    import pandas as pd

    out = {}
    for c in frame.columns:
        column = frame[c]
        if c in text:
            out[c] = column.astype("string")
        elif c in inputs:
            out[c] = pd.to_numeric(column, errors="coerce").astype(float)
        elif pd.api.types.is_bool_dtype(column):
            out[c] = column.astype(bool)
        elif pd.api.types.is_numeric_dtype(column):
            out[c] = column.astype(float)
        else:
            out[c] = column.astype("string")
    return pd.DataFrame(out)

