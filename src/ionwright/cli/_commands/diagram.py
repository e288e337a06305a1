"""``ionwright diagram RECIPE --element Fe --plot fe.png``: a pe–pH predominance diagram."""

from __future__ import annotations

import argparse


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "diagram", help="draw the pe–pH predominance diagram of an element",
        description="Solve the recipe over a grid of pH and pe (its totals, temperature, "
        "activity model and solids as written) and draw which species or solid holds most "
        "of the element at each point, with water's stability limits.")
    parser.add_argument("recipe", help="recipe TOML file")
    parser.add_argument("--element", required=True, help="element symbol, e.g. Fe, Mn, N, S")
    parser.add_argument("--plot", required=True, metavar="FILE", help="figure (.png or .svg)")
    parser.add_argument("--pH", default="0:14", metavar="A:B", help="pH range (0:14)")
    parser.add_argument("--pe", default="-12:22", metavar="A:B", help="pe range (-12:22)")
    parser.add_argument("--points", type=int, default=151,
                        help="grid points along each axis (151)")
    parser.add_argument("--solid", action="append", default=[], metavar="NAME",
                        help="a solid allowed to form besides the recipe's (repeatable), "
                        "e.g. --solid ferrihydrite --solid siderite")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...design._plots import save
    from ...design._predominance import predominance
    from ...design._predominance_plot import predominance_figure
    from .._flags import as_flags
    from .._paths import check_plot_path

    check_plot_path(args.plot)
    with as_flags({"element": "--element", "pH": "--pH", "pe": "--pe", "points": "--points",
                   "solids": "--solid"}):
        diagram = predominance(args.recipe, args.element, pH=args.pH, pe=args.pe,
                               points=args.points, solids=tuple(args.solid))
    save(predominance_figure(diagram), args.plot)
    areas = ", ".join(n + (" (solid)" if s else "") for n, s in zip(diagram.names,
                                                                      diagram.solid))
    print(f"{args.plot}: {diagram.element} at {diagram.total_mol_per_kg:.3g} mol/kg, "
          f"{diagram.t_C:g} °C; areas: {areas}")
    if not any(diagram.solid) and not args.solid and diagram.solids_of_element:
        print(f"No solid of {diagram.element} was allowed to form; name those to consider "
              f"with --solid (repeatable). Solids of {diagram.element} the tables hold: "
              f"{', '.join(diagram.solids_of_element)}.")
    return 0
