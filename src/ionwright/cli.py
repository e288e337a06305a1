"""The ``ionwright`` command line: a thin layer over the library, one function a command."""

from __future__ import annotations

import argparse
import json
import sys
from importlib.resources import files
from typing import Sequence

from .errors import IonwrightError

DEMO = "brewery-rinse.toml"


def _solve(args: argparse.Namespace) -> int:
    from .engine import solve

    result = solve(args.recipe)
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
    else:
        print(result.report())
    return 0


def _demo(args: argparse.Namespace) -> int:
    from .engine import solve
    from .recipe import read_recipe

    resource = files("ionwright") / "demos" / DEMO
    import tomllib

    recipe = read_recipe(tomllib.loads(resource.read_text(encoding="utf-8")))
    result = solve(recipe)
    print(f"ionwright demo: {DEMO}\n")
    print(resource.read_text(encoding="utf-8").split("\n\n")[0].replace("# ", "").strip())
    print()
    print(result.to_dict() if args.json else result.report())
    return 0


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="ionwright",
        description="Activity-corrected aqueous ionic equilibria: pH, speciation, "
                    "saturation. Results are estimates: decisions on drinking water, "
                    "discharges or product release follow local codes, measured values "
                    "and licensed practice.")
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    solve = sub.add_parser("solve", help="speciate a recipe file")
    solve.add_argument("recipe", help="recipe TOML file")
    solve.add_argument("--json", action="store_true", help="print the result as JSON")
    solve.set_defaults(run=_solve)
    demo = sub.add_parser("demo", help="solve a bundled example and print the report")
    demo.add_argument("--json", action="store_true", help="print the result as JSON")
    demo.set_defaults(run=_demo)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        return args.run(args)
    except IonwrightError as exc:
        print(f"ionwright: error: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:  # output piped into head and closed: not our error
        return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
