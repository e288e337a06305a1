"""The ``ionwright`` command line: a thin layer over the library, one module a command."""

from ._main import build_parser, main

__all__ = ["build_parser", "main"]
