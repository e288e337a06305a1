"""The ion-pair set of an activity model: which of the tables' complexes it forms.

An activity model is data as well as equations. Weak complexes such as NaCO3- or
NaHPO4- are one way of describing the interaction between two ions; an activity
coefficient fitted to the same solutions is another. A model whose coefficients already
carry an interaction must not form the complex as well (the interaction would be counted
twice), so each model states the complexes of the constant tables it leaves out, and why.
The system compiled for a solve holds only the species the model forms; the result lists
what was left out (``ion_pairs`` in the JSON, ``--explain`` in text).

A rule names species directly (``species``) or by what they are made of (``made_of``:
every species whose components, H+ and H2O aside, are exactly those of these ions).
``made_of = ("Na+", "CO3^2-")`` (or ``("Na+", "HCO3-")``: HCO3- is CO3^2- and H+) covers
NaCO3- and NaHCO3 and any such complex a user table adds. Components themselves are
always formed. Models without an ``ion_pairs`` attribute (a
plugin's, say) form every species of the tables.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from ..errors import IonPairSetError

IGNORED_COMPONENTS = frozenset({"H+", "H2O"})

ComponentsOf = Callable[[str], "frozenset[str] | None"]
"""Maps an ion's name to the components it is made of (H+ and H2O aside), or None."""


@dataclass(frozen=True)
class LeftOut:
    """One rule of an ion-pair set: the complexes it matches are not formed, and why.

    ``reason`` says why in a sentence a user reads in the result; ``evidence`` names the
    measurement or publication the decision rests on.
    """

    reason: str
    species: tuple[str, ...] = ()
    made_of: tuple[str, ...] = ()
    evidence: str = ""

    def __post_init__(self) -> None:
        if not self.species and not self.made_of:
            raise IonPairSetError("a rule must name species or the ions they are made of")
        if not self.reason.strip():
            raise IonPairSetError(f"the rule for {self.label} needs a reason")
        object.__setattr__(self, "species", tuple(self.species))
        object.__setattr__(self, "made_of", tuple(self.made_of))

    @property
    def label(self) -> str:
        """What the rule covers, as a reader would name it ('Na+ with CO3^2-', 'NaSO4-')."""
        parts = list(self.species)
        if self.made_of:
            parts.append("complexes of " + " with ".join(self.made_of))
        return ", ".join(parts)

    def matches(self, name: str, made_of: frozenset[str], components_of: ComponentsOf) -> bool:
        """Whether the species *name*, made of the components *made_of* (H+ and H2O
        aside), is left out; *components_of* gives the same for each ion of the rule
        (None for a name the tables do not know, which matches nothing)."""
        if name in self.species:
            return True
        if not self.made_of:
            return False
        parts = [components_of(ion) for ion in self.made_of]
        known = [p for p in parts if p is not None]
        return len(known) == len(parts) and made_of == frozenset[str]().union(*known)


@dataclass(frozen=True)
class IonPairSet:
    """The complexes an activity model forms: every species of the tables but those its
    rules leave out. ``summary`` is one line for the model's documentation."""

    summary: str
    left_out: tuple[LeftOut, ...] = ()

    def __post_init__(self) -> None:
        object.__setattr__(self, "left_out", tuple(self.left_out))

    def reason_left_out(self, name: str, made_of: frozenset[str],
                        components_of: ComponentsOf) -> str | None:
        """The reason the species is not formed, or None when the model forms it
        (arguments as for :meth:`LeftOut.matches`)."""
        for rule in self.left_out:
            if rule.matches(name, made_of, components_of):
                return rule.reason
        return None


FORMS_EVERY_SPECIES = IonPairSet("forms every species of the constant tables")


def ion_pairs_of(model) -> IonPairSet:
    """The ion-pair set *model* states (every species, for a model that states none)."""
    pairs = getattr(model, "ion_pairs", None)
    if pairs is None:
        return FORMS_EVERY_SPECIES
    if not isinstance(pairs, IonPairSet):
        raise IonPairSetError(f"activity model {getattr(model, 'name', model)!r} has "
                              f"ion_pairs of type {type(pairs).__name__}; it must be an "
                              f"ionwright.activity.IonPairSet",
                              "ion_pairs = IonPairSet(summary, left_out=(LeftOut(...), ...)), "
                              "or leave it out to form every species")
    return pairs
