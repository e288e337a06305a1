"""``ionwright sweep RECIPE --add "HCl 0.1 mol/L" --to "50 mL"`` and other sweeps."""

from __future__ import annotations

import argparse
import json
import sys


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "sweep", help="titrate, dilute, warm or hold a recipe at a range of pH; table out",
        description="Solve a recipe at many points in one batch and print a table (CSV, or "
        "JSON) of pH, ionic strength, buffer capacity, chosen species and saturation "
        "indices. Titrations also report their equivalence points. A water analysis (or "
        "a recipe with [fix] pH) starts at its measured pH as a closed sample: titrated with "
        "acid it ends at its alkalinity.")
    parser.add_argument("recipe", help="recipe TOML file")
    kind = parser.add_mutually_exclusive_group(required=True)
    kind.add_argument("--add", metavar="TITRANT", help='titrant, e.g. "HCl 0.1 mol/L"')
    kind.add_argument("--dilute", metavar="1:N", help='dilute up to 1:N by volume, e.g. 1:1000')
    kind.add_argument("--temperature", metavar="A:B", help="from A to B °C, e.g. 5:60")
    kind.add_argument("--pH", metavar="A:B", help="hold the pH from A to B, e.g. 2:12")
    parser.add_argument("--to", help='titrant volume to add up to, e.g. "50 mL"')
    parser.add_argument("--sample", help='volume (or mass) of the sample titrated, e.g. '
                        '"25 mL" (default: the recipe as made)')
    parser.add_argument("--hold-pH", dest="hold_pH", action="store_true",
                        help="with --temperature: hold a fixed or measured pH at every "
                        "temperature (default: the closed sample is warmed, its pH follows)")
    parser.add_argument("--points", type=int, default=101, help="number of points (101)")
    parser.add_argument("--species", nargs="+", action="extend", default=[], metavar="NAME",
                        help="species to tabulate, as in batch (NAME NAME ..., or "
                        "comma-separated; repeatable)")
    parser.add_argument("--beyond-range", action="store_true",
                        help="keep points past the activity model's range (with a warning)")
    parser.add_argument("--json", action="store_true", help="print JSON instead of CSV")
    parser.add_argument("--plot", metavar="FILE", help="also draw a figure (.png or .svg)")
    parser.add_argument("--plot-kind", default="auto",
                        choices=("auto", "titration", "pH", "distribution", "saturation",
                                 "capacity"),
                        help="which figure (default: by sweep: a titration curve, pH "
                        "against dilution, saturation indices against temperature, or the "
                        "species against a held pH)")
    parser.add_argument("--component", help="component whose species --plot-kind "
                        "distribution draws (default: the first besides H+)")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...design import _sweep as sweeps
    from ...errors import RecipeError
    from .._flags import as_flags
    from .._paths import check_plot_path

    common = {"points": args.points, "beyond_range": args.beyond_range,
              "species": tuple(name.strip() for given in args.species
                               for name in given.split(",") if name.strip())}
    if args.add and not args.to:
        raise RecipeError("--to", "a titration needs --to", 'e.g. --to "50 mL"')
    if args.hold_pH and not args.temperature:
        raise RecipeError("--hold-pH", "applies to temperature sweeps only",
                          "use it with --temperature A:B, or leave it out")
    if args.plot:
        check_plot_path(args.plot)
    flags = {"titrant": "--add", "to": "--to", "sample": "--sample", "ratio": "--dilute",
             "points": "--points", "species": "--species", "beyond_range": "--beyond-range",
             "span": "--temperature" if args.temperature else "--pH"}
    with as_flags(flags):
        if args.add:
            result = sweeps.titration(args.recipe, args.add, args.to, sample=args.sample,
                                      **common)
        elif args.dilute:
            result = sweeps.dilution(args.recipe, args.dilute, **common)
        elif args.temperature:
            result = sweeps.temperature_series(args.recipe, args.temperature,
                                               hold_pH=args.hold_pH, **common)
        else:
            result = sweeps.pH_series(args.recipe, args.pH, **common)
    print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False) if args.json
          else result.to_csv(), end="" if not args.json else "\n")
    if not args.json:
        for ep in result.equivalence:
            print(f"# equivalence point: {ep['titrant_mL']:.4g} mL, pH {ep['pH']:.3f}",
                  file=sys.stderr)
        for w in result.warnings:
            if w != f"the sweep {result.stopped}":   # said once, below
                print(f"# warning: {w}", file=sys.stderr)
    if args.plot and result.values.size:
        with as_flags({"kind": "--plot-kind"}):
            _plot(result, args)
    if result.stopped:
        stopped = result.stopped.replace("beyond_range=True", "--beyond-range")
        print(f"ionwright: sweep {stopped}", file=sys.stderr)
        return 1
    return 0


def _plot(result, args) -> None:
    from ...design import _plots as plots

    kind = args.plot_kind
    if kind == "auto":
        kind = {"titration": "titration", "dilution": "pH", "pH": "distribution",
                "temperature": "saturation" if result.saturation else "pH"}[result.kind]
    if kind == "titration":
        figure = plots.titration_curve(result)
    elif kind == "pH":
        figure = plots.ph_curve(result)
    elif kind == "distribution":
        component = args.component or next(c for c in result.bench.system.components
                                           if c != "H+")
        figure = plots.species_distribution(result, component)
    elif kind == "saturation":
        figure = plots.saturation_curve(result)
    else:
        figure = plots.buffer_capacity_curve(result)
    plots.save(figure, args.plot)
