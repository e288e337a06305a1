"""Checks of the files a command will write, made before any work starts.

A missing folder, a wrong suffix or an output that is the input itself is refused at once
with the flag and the path, rather than after minutes of solving (or, worse, after the
input has been overwritten).
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path

from ..errors import RecipeError

PLOT_SUFFIXES = (".png", ".svg")


def check_output_path(path: str | Path, flag: str, suffixes: Sequence[str],
                      inputs: Sequence[str | Path] = ()) -> Path:
    """*path* if a command can write it: a known suffix, an existing folder, not a folder
    itself and none of *inputs*; else an error naming *flag*."""
    path = Path(path)
    where = f"{flag} {str(path)!r}"
    if path.suffix.lower() not in suffixes:
        raise RecipeError(where, f"must end in {' or '.join(suffixes)}",
                          f"name the file with one of those suffixes, e.g. out{suffixes[0]}")
    folder = path.parent
    if not folder.is_dir():
        raise RecipeError(where, f"the folder {str(folder)!r} does not exist",
                          f"create it first (mkdir -p {folder}) or write somewhere else")
    if path.is_dir():
        raise RecipeError(where, "is a folder", "give a file name inside it")
    for source in inputs:
        if path.exists() and Path(source).exists() and path.samefile(source):
            raise RecipeError(where, f"is the input file {str(source)!r}: writing it would "
                              "destroy the input", "write the output to another file")
    return path


def check_plot_path(path: str | Path) -> Path:
    """The ``--plot`` file, checked before the sweep is solved."""
    return check_output_path(path, "--plot", PLOT_SUFFIXES)
