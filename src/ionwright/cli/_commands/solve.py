"""``ionwright solve RECIPE``: speciate one recipe and print the report or JSON."""

from __future__ import annotations

import argparse
import json

from .._flags import as_flags


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
    parser.add_argument("--uncertainty", nargs="+", metavar="METHOD",
                        help="check the uncertainty from the constants: 'linear' adds the "
                        "spread of pH between the activity models valid here; "
                        "'monte-carlo N' also samples the constants N times (1000 is "
                        "a good start) and compares with the linear figure")
    parser.set_defaults(run=run)


def _samples(words: list[str] | None) -> int | None:
    """Monte Carlo samples asked for by --uncertainty (0: linear only; None: not asked)."""
    if words is None:
        return None
    from ...errors import RecipeError

    method, rest = words[0], words[1:]
    if method == "linear" and not rest:
        return 0
    if method == "monte-carlo" and len(rest) == 1 and rest[0].isdigit():
        return int(rest[0])
    raise RecipeError("--uncertainty", f"{' '.join(words)!r} is not understood",
                      "give 'linear' or 'monte-carlo N' (e.g. --uncertainty monte-carlo 1000)",
                      parameter="--uncertainty")


def run(args: argparse.Namespace) -> int:
    from ...engine._solve import solve

    if args.compare_models:
        from ...design._compare import compare_models

        comparison = compare_models(args.recipe)
        print(json.dumps(comparison.to_dict(), indent=2, ensure_ascii=False) if args.json
              else comparison.report())
        return 0
    samples = _samples(args.uncertainty)
    if samples is None:
        result = solve(args.recipe)
    else:
        from ...design._uncertainty_checks import solve_with_uncertainty

        with as_flags({"samples": "--uncertainty monte-carlo N"}):
            result = solve_with_uncertainty(args.recipe, samples)
    print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False) if args.json
          else result.report())
    if args.explain and not args.json:
        from ...outputs._provenance import explain

        print("\n" + explain(result))
    return 0
