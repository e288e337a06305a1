"""In-house constants of the Marlow Street Cosmetics Lab, as an ionwright plugin.

The lab, its notebooks, its two preservative acids (sorbelic acid and corvelic acid),
calcium corvelate and every number in ``marlow-lab.toml`` are invented: FICTIONAL demo
data for ionwright's examples and tests, not measurements of any real substance.

The table is offered through the ``register_tables`` hook as a package resource, read
only when a recipe asks for ``tables = ["core", "marlow-lab"]``. The lab's stock codes
are offered through ``register_reagents``.
"""

from __future__ import annotations

from importlib.resources import files

from ionwright import hookimpl

TABLE_NAME = "marlow-lab"
STOCK_LIST = ("Marlow Street Cosmetics Lab (fictional) stock list SL-2025-03: catalogue "
              "codes of purchased chemicals (composition from the formula; invented demo data)")


@hookimpl
def register_tables():
    """The lab's constant table, a TOML resource inside this package."""
    return {TABLE_NAME: files(__name__) / f"{TABLE_NAME}.toml"}


@hookimpl
def register_reagents():
    """The lab's catalogue codes, so that recipes can name the bottle on the shelf."""
    return {
        "MSL-0031": {"formula": "NaH2PO4·H2O",
                     "makes": {"Na+": 1, "PO4-3": 1, "H+": 2, "H2O": 1},
                     "aliases": ["stock 31 sodium dihydrogen phosphate monohydrate"],
                     "source": STOCK_LIST},
        "MSL-0107": {"formula": "KC7H9O3",
                     "makes": {"K+": 1, "Sorbelate-": 1},  # needs the marlow-lab table
                     "aliases": ["stock 107 potassium sorbelate"],
                     "source": STOCK_LIST},
    }
