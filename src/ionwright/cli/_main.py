"""The ``ionwright`` command line: a thin layer over the library, one module a command."""

from __future__ import annotations

import argparse
import importlib
import sys
from typing import Sequence

from ._commands import COMMANDS
from ..errors import IonwrightError

ABOUT = ("Activity-corrected aqueous ionic equilibria: pH, speciation, saturation. "
         "Results are estimates: decisions on drinking water, discharges or product "
         "release follow local codes, measured values and licensed practice.")


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="ionwright", description=ABOUT)
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    for name in COMMANDS:
        importlib.import_module(f"._commands.{name}", __package__).register(sub)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    try:
        return args.run(args)
    except IonwrightError as exc:
        print(f"ionwright: error: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:  # output piped into `head` and closed early
        return 0
    except KeyboardInterrupt:  # Ctrl-C: no traceback, the shell's status for SIGINT
        print("ionwright: interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
