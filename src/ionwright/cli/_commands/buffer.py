"""``ionwright buffer HEPES --pH 7.4 --conc "50 mmol/L" ...``: a buffer recipe card."""

from __future__ import annotations

import argparse
import json

from ...inputs._recipe import DEFAULT_TABLES


#: design_buffer's parameters and the flags that give them.
FLAGS = {"pH": "--pH", "concentration": "--conc", "temperature_C": "--temperature",
         "bench_temperature_C": "--bench-temperature", "with_": "--with", "volume": "--volume",
         "titrant": "--titrant", "pair": "--pair", "form": "--form",
         "activity_model": "--model", "tables": "--tables"}


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "buffer", help="design a buffer: what to weigh, how much titrant, the bench pH",
        description="Design a buffer for a pH at its use temperature: grams to weigh, mL of "
        "titrant (or an acid form and its salt), final ionic strength, buffer capacity, pH "
        "drift per °C, and the pH the meter should read at the bench temperature.")
    parser.add_argument("buffer", help="a buffer reagent (HEPES, Tris, MES, ...) or family "
                        "(phosphate, acetate, citrate)")
    parser.add_argument("--pH", type=float, required=True, help="pH wanted at use")
    parser.add_argument("--conc", required=True, help='total buffer, e.g. "50 mmol/L"')
    parser.add_argument("--temperature", type=float, default=25.0,
                        help="use temperature in °C (default 25)")
    parser.add_argument("--bench-temperature", type=float, default=None,
                        help="temperature at which the pH is adjusted (default: the use "
                        "temperature)")
    parser.add_argument("--with", dest="with_", action="append", default=[],
                        metavar="INGREDIENT AMOUNT",
                        help='another ingredient, e.g. "NaCl 150 mmol/L" (repeatable)')
    parser.add_argument("--volume", default="1 L", help='batch volume (default "1 L")')
    parser.add_argument("--titrant", help='titrating stock, e.g. "NaOH 10 mol/L"')
    parser.add_argument("--pair", action="store_true",
                        help="weigh an acid form and its salt instead of titrating")
    parser.add_argument("--form", help="the form to weigh (for --pair: ACID,SALT)")
    parser.add_argument("--model", default="davies", help="activity model (default davies)")
    parser.add_argument("--tables", nargs="+", default=list(DEFAULT_TABLES), help="constant tables")
    parser.add_argument("--json", action="store_true", help="print the card as JSON")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...design._buffer import design_buffer
    from .._flags import as_flags

    with as_flags(FLAGS):
        card = design_buffer(args.buffer, args.pH, args.conc, temperature_C=args.temperature,
                             with_=args.with_, volume=args.volume, titrant=args.titrant,
                             bench_temperature_C=args.bench_temperature, pair=args.pair,
                             form=args.form, activity_model=args.model, tables=args.tables)
    print(json.dumps(card.to_dict(), indent=2, ensure_ascii=False) if args.json
          else card.report())
    return 0
