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
    parser.add_argument("--explain", action="store_true",
                        help="after the report, list every constant used: value at 25 °C "
                        "and at the solve's temperature, method, table, source, overrides "
                        "(the JSON always has them as \"constants_used\")")
    parser.add_argument("--compare-models", action="store_true",
                        help="solve with every activity model and show pH, I, key "
                        "activities and SI side by side, with the model to trust")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...engine._solve import solve

    if args.compare_models:
        from ...design._compare import compare_models

        comparison = compare_models(args.recipe)
        print(json.dumps(comparison.to_dict(), indent=2, ensure_ascii=False) if args.json
              else comparison.report())
        return 0
    result = solve(args.recipe)
    print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False) if args.json
          else result.report())
    if args.explain and not args.json:
        from ...outputs._provenance import explain

        print("\n" + explain(result))
    return 0
