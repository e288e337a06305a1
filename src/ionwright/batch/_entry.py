"""The public entry point of batches, :func:`ionwright.solve_batch`: a frame (or, on a
dask cluster, files) of samples in, one row of results per sample out, solved here or on
a cluster (:mod:`._run` reads and solves a frame, :mod:`._distributed` spreads the work)."""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any, Iterable, Sequence

from ..errors import RecipeError, UnknownNameError
from ..inputs._recipe import DEFAULT_TABLES
from ..outputs._cautions import CHARGE_BALANCE_LIMIT
from ..outputs._derived import TDS_AUTO
from ._cells import DEFAULT_DETECTION_POLICY, check_policy
from ._derived_columns import derived_options
from ._distributed import dask_client, files_on_cluster, frame_on_cluster
from ._progress import ProgressCallback
from ._run import ENGINES, PARTITION_ROWS, _check_frame, _solve_frame

if TYPE_CHECKING:
    import pandas as pd

    from ..plugins._registry import Registry


def solve_batch(frame: pd.DataFrame | str | Path | Sequence[str | Path], *,
                output: str | Path | None = None, species: Sequence[str] | None = None,
                model: str = "davies", tables: Sequence[str] = DEFAULT_TABLES,
                labels: Iterable[str] = (), engine: str = "local",
                address: str | None = None, partition_rows: int = PARTITION_ROWS,
                threads: int | None = None, registry: Registry | None = None,
                tds: str = TDS_AUTO, balance_limit: float = CHARGE_BALANCE_LIMIT,
                ions: bool = False, formulation: bool = False,
                detection_limit: str = DEFAULT_DETECTION_POLICY,
                progress: ProgressCallback | None = None,
                processes: bool = True) -> pd.DataFrame:
    """Speciate every row of *frame*; the input columns first, then the results.

    With ``engine="dask"``, *frame* may instead be CSV or Parquet files, folders or globs
    (``"wells-*.csv"``): the workers read them, solve them and write partitioned Parquet
    into the folder *output*, so the table never passes through this process, and the
    return value is the count of rows by status of each part.

    Parameters
    ----------
    frame
        One row per sample; see :mod:`ionwright.batch._run` for how columns are read.
        Or (dask engine) the files to read on the workers.
    output
        The folder of Parquet parts written by the workers (files input only).
    species
        Species whose molality to report (default: every species the columns can form).
    model, tables
        Activity model and constant tables, as in a recipe.
    labels
        Columns to carry through unread (text columns naming no ingredient always are).
    engine
        ``"local"`` (this process) or ``"dask"`` (the same work in partitions of
        *partition_rows* rows on a dask cluster: a local one, or the scheduler at
        *address*; needs ``pip install ionwright[distributed]``). *processes* False
        starts the local cluster's workers as threads of this process.
    threads
        Threads of the local solve (default: the cores available, at most
        :data:`ionwright.solver.MAX_THREADS`); the dask engine solves each partition on
        one thread and leaves the parallelism to the cluster. Answers do not depend on it.
    tds
        What the ``TDS [mg/L]`` column holds: ``"calculated"`` (the Standard Methods
        1030E calculated sum), ``"species-sum"`` (every dissolved species), or
        ``"auto"`` (calculated for rows read as analyses, species sum for recipes); both
        are also given in their own columns.
    balance_limit
        Charge-balance error (%) beyond which a row is flagged (default 5).
    ions
        Also give each component's total in mg/L and meq/L.
    formulation
        Also give osmolality, osmotic coefficient, water activity and conductivity at the
        row's temperature, as the formulation section of a single result does.
    detection_limit
        What a cell such as ``"<0.05"`` (below the detection limit) stands for:
        ``"zero"``, ``"half"`` (default) or ``"limit"``. A blank cell is "not analysed":
        the ion is left out and the row says so (columns ``not analysed`` and ``below
        detection limit`` list them).
    progress
        Called as ``progress(done, total)`` as rows finish (from the solver's threads
        too; the local engine reports solved chunks, the dask engine partitions; total
        is 0 while unknown, when the workers read the files).

    Returns
    -------
    pandas.DataFrame
        Same index and row order as *frame*; never fewer rows. For files: one row per
        Parquet part with its rows and their statuses.
    """
    if engine not in ENGINES:
        raise UnknownNameError("engine", engine, ENGINES, f"engines: {', '.join(ENGINES)}")
    files = isinstance(frame, (str, Path)) or (isinstance(frame, (list, tuple)) and all(
        isinstance(f, (str, Path)) for f in frame))
    if files and engine != "dask":
        raise RecipeError("frame", "files are read on the workers of the dask engine",
                          'give engine="dask" and output="FOLDER", or read the table '
                          "with pandas and pass the DataFrame")
    if files and output is None:
        raise RecipeError("output", "the dask engine writes the solved files into a folder",
                          'give output="solved/"')
    if not files:
        _check_frame(frame)
    options: dict[str, Any] = dict(species=None if species is None else list(species),
                                   model=model, tables=list(tables), labels=list(labels),
                                   derived=derived_options(tds, balance_limit, ions, formulation),
                                   detection_limit=detection_limit)
    check_policy(detection_limit)
    if files:
        with dask_client(address, processes) as client:
            return files_on_cluster(frame, output, options, client,  # type: ignore[arg-type]
                                    progress, list(labels))
    if engine == "dask":
        return frame_on_cluster(frame, {**options, "threads": 1}, address, partition_rows,
                                progress)
    return _solve_frame(frame, registry=registry, threads=threads, progress=progress,
                        **options)
