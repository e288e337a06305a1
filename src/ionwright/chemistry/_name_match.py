"""Suggestions for an ingredient name the tables do not know, best first.

Three kinds of near miss, tried together and ranked by how alike the whole names are:

* a formula within one slip ("NaCL", "kh2po4", "NaOHH" → NaCl, KH2PO4, NaOH): every way of
  reading the letters as element symbols, with at most one character too many, that the
  tables can make;
* a salt name with a misspelt word ("sodium chlorde" → sodium chloride): each word put
  right against the words salt names are made of;
* a named reagent or alias ("sodim benzoate" → sodium benzoate).

Similarity is difflib's ratio of the whole case-folded names, so "sodium chloride" is close
to "sodium chlorite" and not to "sodium HEPES" merely for sharing a word.
"""

from __future__ import annotations

import difflib
from collections.abc import Callable, Iterable

from ._atomic_weights import ATOMIC_NUMBERS
from ._salt_names import VOCABULARY, AmbiguousSaltName, formula_from_name

CUTOFF = 0.6
MAX_SUGGESTIONS = 3
MAX_FORMULA_LENGTH = 24


def suggestions(name: str, labels: Iterable[str], makeable: Callable[[str], bool]) -> list[str]:
    """Up to three names close to *name*: reagent *labels*, case-repaired formulas and
    corrected salt names for which *makeable* (the tables can make it) is true."""
    scored: dict[str, float] = {}
    folded = name.casefold()
    for candidate in _formula_readings(name):
        if candidate != name and makeable(candidate):
            scored[candidate] = 1.0 + _ratio(folded, candidate.casefold())
    salt = _corrected_salt_name(name)
    if salt is not None and makeable(salt):
        scored[salt] = _ratio(folded, salt.casefold())
    for label in labels:
        score = _ratio(folded, label.casefold())
        if score >= CUTOFF and score > scored.get(label, 0.0):
            scored[label] = score
    ranked = sorted(scored.items(), key=lambda kv: (-kv[1], kv[0]))
    return [label for label, _ in ranked[:MAX_SUGGESTIONS]]


def _ratio(a: str, b: str) -> float:
    return difflib.SequenceMatcher(None, a, b).ratio()


def _formula_readings(name: str) -> list[str]:
    """Spellings of *name* whose letters read as element symbols, also with any one
    character left out (``CACL2`` → CaCl2, ``NaOHH`` → NaOH); none for a phrase."""
    if " " in name.strip() or len(name) > MAX_FORMULA_LENGTH:
        return []
    variants = [*_recased(name), *(v for i in range(len(name))
                                   for v in _recased(name[:i] + name[i + 1:]))]
    return list(dict.fromkeys(variants))


def _recased(text: str, limit: int = 16) -> list[str]:
    """Spellings of *text* whose letters read as element symbols (``CACL2`` → CaCl2)."""
    out: list[str] = []

    def walk(i: int, done: str) -> None:
        if len(out) >= limit:
            return
        if i == len(text):
            out.append(done)
            return
        if not text[i].isalpha():
            walk(i + 1, done + text[i])
            return
        two = text[i:i + 2].capitalize()
        if len(two) == 2 and two.isalpha() and two in ATOMIC_NUMBERS:
            walk(i + 2, done + two)
        if text[i].upper() in ATOMIC_NUMBERS:
            walk(i + 1, done + text[i].upper())

    walk(0, "")
    return out


def _corrected_salt_name(name: str) -> str | None:
    """*name* with each word replaced by the closest word of salt names, if that reads."""
    words = name.casefold().split()
    if len(words) < 2:
        return None
    fixed = []
    for word in words:
        near = difflib.get_close_matches(word, VOCABULARY, n=1, cutoff=0.75)
        fixed.append(near[0] if near else word)
    guess = " ".join(fixed)
    if guess == name.casefold():
        return None
    try:
        return guess if formula_from_name(guess) else None
    except AmbiguousSaltName:
        return None
