"""Every reaction in every bundled and example table balances in elements and charge.

The check is written here from the raw TOML (formula arithmetic only), independently of
the balance check in ionwright.tables.tableset, and walks every constant table found in
constants/ and plugins/. A table may use the components of core and metals.
"""

from __future__ import annotations

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib
from pathlib import Path

import pytest

from ionwright.chemistry._formula import parse_formula

ROOT = Path(__file__).resolve().parents[2]
TABLE_SECTIONS = {"about", "sources", "components", "species", "solids", "gases", "reagents"}
REACTION_KEY = {"species": "from", "solids": "dissolves_to", "gases": "dissolves_to",
                "reagents": "makes"}
TOLERANCE = 1e-9


def constant_tables() -> list[Path]:
    """TOML files shaped like constant tables (other TOML, e.g. parameter sets, is skipped)."""
    found = []
    for path in sorted([*ROOT.glob("constants/*.toml"), *ROOT.glob("plugins/**/*.toml")]):
        data = tomllib.loads(path.read_text(encoding="utf-8"))
        if set(data) <= TABLE_SECTIONS and "format_version" in data.get("about", {}):
            found.append(path)
    return found


CORE = tomllib.loads((ROOT / "constants" / "core.toml").read_text(encoding="utf-8"))
#: organics sits on core and metals (their metal ions)
METALS = tomllib.loads((ROOT / "constants" / "metals.toml").read_text(encoding="utf-8"))


def formulas(*tables: dict) -> dict[str, str]:
    out = {}
    for data in tables:
        for section in ("components", "species"):
            for name, entry in data.get(section, {}).items():
                out[name] = entry.get("formula", name)
    return out


def composition(text: str) -> tuple[dict[str, float], int]:
    f = parse_formula(text)
    return dict(f.elements), f.charge


def test_the_walk_finds_the_bundled_and_both_example_tables():
    names = {p.name for p in constant_tables()}
    assert {"core.toml", "marlow-lab.toml"} <= names
    assert "epsilon.toml" not in names  # the SIT plugin's own format, not a constant table


@pytest.mark.parametrize("path", constant_tables(), ids=lambda p: str(p.relative_to(ROOT)))
def test_every_reaction_balances(path):
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    known = formulas(CORE, METALS, data)
    problems = []
    for section, key in REACTION_KEY.items():
        for name, entry in data.get(section, {}).items():
            if key not in entry:
                assert section == "reagents", f"{section} {name!r} has no {key}"
                continue
            target, target_charge = composition(entry.get("formula", name))
            elements: dict[str, float] = {}
            charge = 0.0
            for part, coeff in entry[key].items():
                assert part in known, f"{section} {name!r}: {part!r} is defined nowhere"
                els, z = composition(known[part])
                charge += coeff * z
                for el, n in els.items():
                    elements[el] = elements.get(el, 0.0) + coeff * n
            diff = {el: elements.get(el, 0.0) - target.get(el, 0.0)
                    for el in {*elements, *target}}
            if any(abs(d) > TOLERANCE for d in diff.values()) or abs(charge - target_charge) > TOLERANCE:
                problems.append(f"{section} {name!r}: {entry[key]} gives {elements} charge "
                                f"{charge:+g}, formula has {target} charge {target_charge:+d}")
    assert not problems, "\n".join(problems)
