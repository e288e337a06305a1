"""Where the bundled constant tables live: one folder, found the same way by every reader.

The tables are kept once, in the repository's top-level ``constants/`` folder. A wheel
carries that folder as ``ionwright/constants`` (``force-include`` in pyproject.toml), so an
installed package reads it as a package resource; a source checkout (an editable install)
reads the top-level folder itself. No symbolic link is needed in either case.
"""

from __future__ import annotations

from importlib.resources import files
from importlib.resources.abc import Traversable
from pathlib import Path

from ..errors import TableError

FOLDER = "constants"


def bundled_folder() -> Traversable:
    """The folder holding ionwright's own tables (core.toml, pitzer.toml, ...)."""
    packaged = files("ionwright") / FOLDER
    if packaged.is_dir():
        return packaged
    checkout = Path(__file__).resolve().parents[3] / FOLDER
    if checkout.is_dir():
        return checkout
    raise TableError("ionwright's bundled tables",
                     [f"the folder is missing: neither {packaged} nor {checkout} exists"],
                     hint="reinstall ionwright (pip install ionwright, or pip install -e . "
                     "in a source checkout)")
