"""``ionwright demo``: solve a bundled scenario of our own and print the report."""

from __future__ import annotations

import argparse
import json
import sys
from importlib.resources import files

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

DEMOS = {"brewery": "brewery-rinse.toml"}


def register(subparsers) -> None:
    parser = subparsers.add_parser("demo", help="solve a bundled example and print the report")
    parser.add_argument("name", nargs="?", default="brewery", choices=sorted(DEMOS),
                        help="which demo (default: brewery)")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ..engine import solve

    text = (files("ionwright") / "demos" / DEMOS[args.name]).read_text(encoding="utf-8")
    result = solve(tomllib.loads(text))
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
        return 0
    story = [line[2:] for line in text.splitlines() if line.startswith("# ")]
    print("\n".join(story))
    print()
    print(result.report())
    return 0
