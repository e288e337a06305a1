"""Redox levels of batch rows: the columns ``pe``, ``Eh [mV]`` (or ``[V]``), ``ORP [mV]``
with ``electrode``, and ``dissolved_oxygen [mg/L]`` (or ``[%]`` of saturation with air),
each cell read as a recipe's ``[fix]`` or ``[analysis]`` reads that key
(:func:`ionwright.inputs._redox_level.read_redox_level`, same checks and messages), into
one pe per row. A row's dissolved oxygen is held as the pe its O2 pressure gives at the
row's pH (which it therefore needs), as an analysis fit holds it.
"""

from __future__ import annotations

import math
from typing import Any, Mapping, Sequence

import numpy as np

from ..chemistry._tableset import TableSet
from ..engine._redox_level import pe_held_by_o2
from ..errors import IonwrightError
from ..inputs._redox_level import read_redox_level

PE_HEADER = "pe"
ELECTRODE_HEADER = "electrode"
#: Redox keys written with a unit in their header (``Eh [mV]``)
WITH_UNIT = ("Eh", "ORP", "dissolved_oxygen")


def row_levels(columns: Sequence[Any], values: Mapping[str, np.ndarray],
               electrode: Sequence[str], t_C: np.ndarray, ph: np.ndarray,
               tables: TableSet, problem: list[str]) -> tuple[np.ndarray, list[str]]:
    """The pe each row holds (NaN without a level) and what reading it found (an ORP
    converted beyond its electrode's table; "" for nothing); a row whose cells state no
    valid level gets its problem. *columns* are the plan's columns of kind ``redox``."""
    n = t_C.shape[0]
    pe = np.full(n, np.nan)
    notes = [""] * n
    for r in range(n):
        if problem[r]:
            continue
        cells: dict[str, Any] = {c.key: float(values[c.header][r]) if c.key == PE_HEADER
                                 else f"{float(values[c.header][r])!r} {c.unit}"
                                 for c in columns if math.isfinite(values[c.header][r])}
        if electrode[r]:
            cells["electrode"] = electrode[r]
        if not cells:
            continue
        try:
            level = read_redox_level(cells, float(t_C[r]), "row", "columns")
        except IonwrightError as exc:
            problem[r] = _message(exc, columns)
            continue
        if level is None:
            continue
        if level.o2_pressure_atm is None:
            pe[r] = level.pe
        elif math.isfinite(ph[r]):
            pe[r] = pe_held_by_o2(tables, level.o2_pressure_atm, float(ph[r]), float(t_C[r]))
        else:
            header = next(c.header for c in columns if c.key == "dissolved_oxygen")
            problem[r] = (f"column {header!r}: a batch row holds its dissolved oxygen as "
                          "the pe that its O2 pressure gives at the row's pH: give the pH "
                          "(or state pe, Eh or ORP)")
            continue
        notes[r] = "; ".join(notice.text for notice in level.notices)
    return pe, notes


def _message(exc: IonwrightError, columns: Sequence[Any]) -> str:
    """The reader's error, naming the column its key came from."""
    where = getattr(exc, "where", "")
    problem = getattr(exc, "problem", str(exc))
    hint = getattr(exc, "hint", "")
    said = f"{problem} ({hint})" if hint else problem
    for header, key in [(c.header, c.key) for c in columns] + [(ELECTRODE_HEADER,) * 2]:
        if where.endswith(f" {key}"):
            return f"column {header!r}: {said}"
    return f"redox columns: {said}"
