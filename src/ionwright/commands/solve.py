"""``ionwright solve RECIPE``: speciate one recipe and print the report or JSON."""

from __future__ import annotations

import argparse
import json


def register(subparsers) -> None:
    parser = subparsers.add_parser("solve", help="speciate a recipe file",
                                   description="Speciate a recipe: pH, ionic strength, every "
                                   "species' molality, activity and log γ.")
    parser.add_argument("recipe", help="recipe TOML file")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ..engine import solve

    result = solve(args.recipe)
    print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False) if args.json
          else result.report())
    return 0
