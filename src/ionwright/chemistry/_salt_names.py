"""Formulas of inorganic salts, acids and bases from the names on their bottles.

"sodium chloride" is NaCl, "calcium chloride dihydrate" CaCl2·2H2O, "disodium hydrogen
phosphate dodecahydrate" Na2HPO4·12H2O, "monopotassium phosphate" KH2PO4, "aluminium
sulfate" Al2(SO4)3, "sodium hydroxide" NaOH, "hydrochloric acid" HCl. A name is read as
[count prefix] cation [count prefix] anion [hydrate], the counts balancing the charges;
an anion that carries protons takes as many as the named cations leave open. The formula
then goes the usual way (split into components by element and charge balance).

A phosphate or arsenate named without its cation count ("sodium phosphate") is refused:
on a lab shelf that name means any of three salts.
"""

from __future__ import annotations

import re
from math import gcd

#: cation words: (formula, charge)
CATIONS = {
    "sodium": ("Na", 1), "potassium": ("K", 1), "lithium": ("Li", 1), "ammonium": ("NH4", 1),
    "calcium": ("Ca", 2), "magnesium": ("Mg", 2), "strontium": ("Sr", 2), "barium": ("Ba", 2),
    "zinc": ("Zn", 2), "cadmium": ("Cd", 2), "nickel": ("Ni", 2), "lead": ("Pb", 2),
    "manganese": ("Mn", 2), "manganese(ii)": ("Mn", 2), "iron(ii)": ("Fe", 2),
    "ferrous": ("Fe", 2), "iron(iii)": ("Fe", 3), "ferric": ("Fe", 3), "copper": ("Cu", 2),
    "copper(ii)": ("Cu", 2), "cupric": ("Cu", 2), "aluminium": ("Al", 3), "aluminum": ("Al", 3),
    "lead(ii)": ("Pb", 2), "zinc(ii)": ("Zn", 2), "nickel(ii)": ("Ni", 2),
    "cadmium(ii)": ("Cd", 2), "aluminium(iii)": ("Al", 3), "aluminum(iii)": ("Al", 3),
}
#: anion words: (formula, charge, protons it can take)
ANIONS = {
    "chloride": ("Cl", -1, 0), "bromide": ("Br", -1, 0), "fluoride": ("F", -1, 0),
    "nitrate": ("NO3", -1, 0), "hydroxide": ("OH", -1, 0), "sulfate": ("SO4", -2, 1),
    "sulphate": ("SO4", -2, 1), "carbonate": ("CO3", -2, 1), "phosphate": ("PO4", -3, 2),
    "bicarbonate": ("HCO3", -1, 0), "bisulfate": ("HSO4", -1, 0), "bisulphate": ("HSO4", -1, 0),
    "nitrite": ("NO2", -1, 0), "arsenate": ("AsO4", -3, 2),
    "arsenite": ("AsO2", -1, 0),   # as sold: the meta-arsenite (sodium arsenite is NaAsO2)
    "hypochlorite": ("OCl", -1, 0),
}
#: acids named as such
ACIDS = {"hydrochloric acid": "HCl", "sulfuric acid": "H2SO4", "sulphuric acid": "H2SO4",
         "nitric acid": "HNO3", "phosphoric acid": "H3PO4", "orthophosphoric acid": "H3PO4",
         "hydrofluoric acid": "HF", "hydrobromic acid": "HBr"}
COUNTS = {"mono": 1, "di": 2, "tri": 3, "tetra": 4, "penta": 5, "hexa": 6, "hepta": 7,
          "octa": 8, "nona": 9, "deca": 10, "undeca": 11, "dodeca": 12, "tetradeca": 14,
          "hexadeca": 16, "octadeca": 18}
HYDRATE = re.compile(rf"({'|'.join(sorted(COUNTS, key=len, reverse=True))})hydrate$")
ANHYDROUS = "anhydrous"
#: words a name may be made of (for suggestions of misspelt names)
VOCABULARY = (*CATIONS, *ANIONS, "hydrogen", "dihydrogen", ANHYDROUS,
              *(f"{p}hydrate" for p in COUNTS), *(f"{p}{c}" for p in ("mono", "di", "tri")
                                                   for c in CATIONS))


class AmbiguousSaltName(ValueError):
    """A salt name that means more than one salt; the message says how to be exact."""


def formula_from_name(name: str) -> str | None:
    """The formula a salt, acid or base name stands for, or None if it is not one.

    Raises :class:`AmbiguousSaltName` for a name such as "sodium phosphate".
    """
    words = name.casefold().replace("-", " ").split()
    if not words:
        return None
    water = 0
    if words[-1] == ANHYDROUS:
        words = words[:-1]
    elif (hydrate := HYDRATE.match(words[-1])) is not None:
        water = COUNTS[hydrate.group(1)]
        words = words[:-1]
    if len(words) > 1 and words[0] == ANHYDROUS:
        words = words[1:]
    body = _acid(words) or _salt(words)
    if body is None:
        return None
    return body + (f"·{water}H2O" if water else "")


def _acid(words: list[str]) -> str | None:
    return ACIDS.get(" ".join(words))


def _salt(words: list[str]) -> str | None:
    if len(words) < 2:
        return None
    cation_count, cation = _counted(words[0], CATIONS)
    if cation is None:
        return None
    rest = words[1:]
    protons = None
    if rest[0] in ("hydrogen", "dihydrogen"):
        protons = 1 if rest[0] == "hydrogen" else 2
        rest = rest[1:]
    if len(rest) != 1:
        return None
    anion_count, anion = _counted(rest[0], ANIONS)
    if anion is None:
        return None
    (symbol, z), (group, q, takes) = CATIONS[cation], ANIONS[anion]
    if protons is None and takes == 2 and cation_count is None and anion_count is None:
        mono, di, tri = (_compose(symbol, z, n, group, q, takes, None, None) for n in (1, 2, 3))
        raise AmbiguousSaltName(
            f"{' '.join(words)!r} may mean any of three salts; name the one meant: "
            f"mono{cation} {anion} ({mono}), di{cation} {anion} ({di}) or "
            f"tri{cation} {anion} ({tri})")
    return _compose(symbol, z, cation_count, group, q, takes, protons, anion_count)


def _counted(word: str, names: dict) -> tuple[int | None, str | None]:
    """(count prefix or None, the listed word) of e.g. 'disodium' → (2, 'sodium')."""
    if word in names:
        return None, word
    for prefix, count in COUNTS.items():
        if word.startswith(prefix) and word[len(prefix):] in names:
            return count, word[len(prefix):]
    return None, None


def _compose(symbol: str, z: int, n_cation: int | None, group: str, q: int, takes: int,
             protons: int | None, n_anion: int | None) -> str | None:
    """The formula text balancing the charges, or None if the counts cannot balance."""
    if n_cation is not None and protons is None and takes:
        protons = -q - n_cation * z          # "monosodium phosphate": the rest are H
        if not 0 <= protons <= takes:
            return None
    protons = protons or 0
    charge = q + protons                      # of one anion with its protons
    if charge >= 0:
        return None
    if n_cation is None and n_anion is None:
        common = gcd(z, -charge)
        n_cation, n_anion = -charge // common, z // common
    elif n_cation is None:
        n_cation = -charge * (n_anion or 1) // z
    n_anion = n_anion or 1
    if n_cation * z + n_anion * charge != 0:
        return None
    anion = f"H{protons if protons > 1 else ''}{group}" if protons else group
    many = n_anion > 1
    polyatomic = len(re.findall(r"[A-Z]", anion)) > 1
    anion_text = (f"({anion}){n_anion}" if polyatomic else f"{anion}{n_anion}") if many else anion
    cation_text = symbol if n_cation == 1 else (
        f"({symbol}){n_cation}" if len(re.findall(r"[A-Z]", symbol)) > 1 else f"{symbol}{n_cation}")
    return cation_text + anion_text
