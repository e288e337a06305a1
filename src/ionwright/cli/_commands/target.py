"""``ionwright target RECIPE --pH 7.40 --adjust NaOH``: the dose that gives a target pH."""

from __future__ import annotations

import argparse
import json

#: target's parameters and the flags that give them.
FLAGS = {"pH": "--pH", "adjust": "--adjust", "stock": "--stock"}


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "target", help="find the dose of an ingredient that gives a target pH",
        description="Find the amount of one ingredient (or the volume of its stock) that "
        "brings a recipe to a target pH at the recipe's temperature, solved exactly. A "
        "water analysis (or a recipe with [fix] pH) is dosed from its measured pH, as a "
        "closed sample.")
    parser.add_argument("recipe", help="recipe TOML file")
    parser.add_argument("--pH", type=float, required=True, help="target pH")
    parser.add_argument("--adjust", required=True,
                        help="the ingredient to dose (e.g. NaOH, HCl, \"citric acid\")")
    parser.add_argument("--stock", help='dose as a stock of this strength, e.g. "1 mol/L"')
    parser.add_argument("--json", action="store_true", help="print the result as JSON")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...design._target import target
    from .._flags import as_flags

    with as_flags(FLAGS):
        found = target(args.recipe, args.pH, args.adjust, stock=args.stock)
    print(json.dumps(found.to_dict(), indent=2, ensure_ascii=False) if args.json
          else found.report())
    return 0
