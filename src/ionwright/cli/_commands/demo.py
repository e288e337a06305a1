"""``ionwright demo``: solve a bundled scenario of our own and print the report."""

from __future__ import annotations

import argparse
import json
import sys
from fnmatch import fnmatch
from importlib.resources import files

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

DEMOS = {"brewery": "brewery-rinse.toml", "lake": "lake-*.toml",
         "aeration": "well-aeration.toml"}
"""Demo name → file name or pattern; a pattern of several files makes a survey report."""


def register(subparsers) -> None:
    parser = subparsers.add_parser("demo", help="solve a bundled example and print the report")
    parser.add_argument("name", nargs="?", default="brewery", choices=sorted(DEMOS),
                        help="which demo (default: brewery)")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ...engine._solve import solve

    folder = files("ionwright") / "demos"
    names = sorted(p.name for p in folder.iterdir() if fnmatch(p.name, DEMOS[args.name]))
    if len(names) > 1:
        return _survey([(folder / n).read_text(encoding="utf-8") for n in names], args.json)
    text = (folder / names[0]).read_text(encoding="utf-8")
    result = solve(tomllib.loads(text))
    if args.json:
        print(json.dumps(result.to_dict(), indent=2, ensure_ascii=False))
        return 0
    story = [line[2:] for line in text.splitlines() if line.startswith("# ")]
    print("\n".join(story))
    print()
    print(result.report())
    return 0


def _survey(texts: list[str], as_json: bool) -> int:
    """Solve several samples; print one table and each sample's cautions."""
    from ...engine._solve import solve
    from ...notices import CAUTION, DATA_QUALITY, of_category
    from ...outputs._derived import survey_table

    samples = []
    for text in texts:
        result = solve(tomllib.loads(text))
        label = result.recipe.title.split(": ", 1)[-1] or "sample"
        samples.append((label, result))
    if as_json:
        print(json.dumps([{"sample": r.recipe.title, **r.to_dict()} for _, r in samples],
                         indent=2, ensure_ascii=False))
        return 0
    print("\n".join(line[2:] for line in texts[0].splitlines() if line.startswith("# ")))
    print()
    print(survey_table(samples))
    print("\nCBE: charge-balance error; alk, hard: alkalinity and hardness; SI calc:\n"
          "saturation index of calcite; LSI: Langelier index; NH3 N: un-ionised ammonia.")
    for label, result in samples:
        for notice in of_category(result.notices, CAUTION, DATA_QUALITY):
            print(f"\n{label}: {notice.text}")
    folder = files("ionwright") / "demos"
    print(f"\nEach sample in full: `ionwright solve {folder}/lake-3-deep.toml` (and the others).")
    return 0
