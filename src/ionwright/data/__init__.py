"""Constant tables: frozen records, the TOML loader, and merged table sets."""

from ._loader import load_table, parse_table
from ..chemistry._records import Component, ConstantTable, LogK, Phase, Reagent, Species
from ..chemistry._tableset import Override, Resolved, TableSet

__all__ = ["load_table", "parse_table", "Component", "ConstantTable", "LogK", "Phase",
           "Reagent", "Species", "Override", "Resolved", "TableSet"]
