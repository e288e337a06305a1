"""Buffer designer: what to weigh and how much titrant gives a pH at the use temperature.

A buffer is named by a reagent of the tables (``"HEPES"``, ``"Tris"``) or by its
component family (``"phosphate"``, ``"acetate"``, ``"citrate"``). Its weighable forms are
the named reagents that make the buffer component with protons and a counter-ion, and for
carbon-free components the salts composed from the formula (NaH2PO4, Na2HPO4). Two ways
to make it: weigh one form and titrate it with a stock to the pH at the use temperature,
or weigh an acid form and its salt in the ratio that gives the pH (a conjugate pair).
The card gives the grams, the titrant volume, the final ionic strength, the buffer
capacity and the pH drift per °C at use, and the pH the meter should read at the bench
temperature (the same solution at the bench temperature) so that it is right at use.

References
----------
Good, N.E. et al. (1966) Biochemistry 5, 467–477 (the zwitterionic buffers).
Goldberg, R.N., Kishore, N. & Lennen, R.M. (2002) J. Phys. Chem. Ref. Data 31, 231–370
(buffer ionization constants and their temperature dependence, in the core table).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np

from ..chemistry._density import ingredient_solute
from ..engine._compiled import CompiledRecipe
from ..engine._solve import compile_recipe
from ._target import (dose_uncertainty, find_dose, read_stock, split_name_and_quantity,
                      stock_cautions)
from ..plugins._table_sets import load_tables
from ..notices import CAUTION, of_category, texts
from ..errors import (IonwrightError, RecipeError, UnknownNameError, UnreachableTargetError,
                      names_its_arguments)
from ..chemistry._ingredients import Makeup, makeup
from ..chemistry._names import split_name
from ..plugins._registry import Registry, default_registry
from ..inputs._checks import as_number, check_ph, check_temperature, positive
from ..inputs._mixing import entry_for, mix
from ..inputs._recipe import DEFAULT_TABLES, DISSOLVE_DIMENSIONS, read_recipe
from ..outputs._result import Result
from ..core._acid_base import ideal_shares
from ..core._sensitivity import buffer_capacity
from ..core._system import PROTON, WATER, log10_k_at
from ..inputs._units import expect, parse_quantity
from ..chemistry._constants import LN10

#: Relative step of the titrant dose over which the totals' rate of change is taken (the
#: totals are smooth in the dose: a central difference is exact to about 1e-12)
DOSE_STEP = 1e-6

#: Buffer families named by their anion rather than by a reagent.
FAMILIES = {"phosphate": "PO4^3-", "acetate": "CH3COO-", "citrate": "Cit^3-",
            "carbonate": "CO3^2-", "borate": "B(OH)4-", "phthalate": "Phthalate^2-",
            "sulfate": "SO4^2-"}
COUNTER_IONS = ("Na+", "K+", "Cl-")
DRIFT_STEP_C = 0.5          # half-width of the temperature difference for the drift
CONCENTRATION_DIMENSIONS = ("molarity", "molality")


@dataclass(frozen=True)
class BufferForm:
    """A weighable form of a buffer: the ingredient and the protons it carries."""

    name: str
    makeup: Makeup
    protons: float

    @property
    def molar_mass(self) -> float:
        return self.makeup.molar_mass


def buffer_component(name: str, tables) -> str:
    """The component a buffer name stands for (``"HEPES"`` → ``"HEPES-"``)."""
    if not isinstance(name, str) or not name.strip():
        raise RecipeError("buffer", f"{name!r} must name a buffer",
                          'give a reagent of the tables or a family, e.g. "HEPES" or '
                          '"phosphate"')
    if name.casefold() in FAMILIES:
        return FAMILIES[name.casefold()]
    if name in tables.components and name not in (PROTON, WATER):
        return name
    reagent = tables.reagent(name)
    if reagent is not None:
        made = makeup(reagent.name, tables)
        buffering = [c for c in made.per_mole if c not in (PROTON, WATER, *COUNTER_IONS)
                     and _protonated(c, tables)]
        if len(buffering) == 1:
            return buffering[0]
    known = [*FAMILIES, *(r for r in tables.reagent_names() if _buffer_like(r, tables))]
    raise UnknownNameError("buffer", name, known, "name a reagent of the tables (e.g. "
                           "HEPES, Tris) or a family (phosphate, acetate, citrate)")


def _buffer_like(reagent: str, tables) -> bool:
    made = makeup(reagent, tables)
    return any(_protonated(c, tables) for c in made.per_mole
               if c not in (PROTON, WATER, *COUNTER_IONS))


def _protonated(component: str, tables) -> dict[float, str]:
    """{protons: species} of the species formed from *component* and H+ only."""
    out = {}
    for name in tables.species:
        stoich = {k: v for k, v in tables.resolve(name).stoichiometry.items() if k != WATER}
        if set(stoich) == {component, PROTON} and stoich[component] == 1:
            out[stoich[PROTON]] = name
    return out


def buffer_forms(component: str, tables, cation: str = "Na+") -> list[BufferForm]:
    """Weighable forms of *component*, fewest protons first.

    Named reagents count when they make one mole of the component with protons, water
    and at most one kind of counter-ion; for a carbon-free component the acid and its
    *cation* salts are composed from the formula as well. Hydrates come after the
    anhydrous form of the same proton count.
    """
    found: dict[tuple[float, str], BufferForm] = {}
    for name in tables.reagent_names():
        made = makeup(name, tables)
        parts = {k: v for k, v in made.per_mole.items() if k not in (PROTON, WATER)}
        if parts.get(component) != 1:
            continue
        others = set(parts) - {component}
        if others and not (len(others) == 1 and others <= set(COUNTER_IONS)):
            continue
        if others and others != {cation} and others != {"Cl-"}:
            continue
        protons = made.per_mole.get(PROTON, 0.0)
        found[(protons, name)] = BufferForm(name, made, protons)
    entry = tables.components[component]
    if "C" not in entry.elements and entry.charge < 0:
        body = split_name(entry.formula)[0]
        metal = cation.rstrip("+")
        for protons in range(-entry.charge + 1):
            metals = -entry.charge - protons
            text = ((f"{metal}{metals if metals > 1 else ''}" if metals else "")
                    + (f"H{protons if protons > 1 else ''}" if protons else "") + body)
            try:
                made = makeup(text, tables)
            except IonwrightError:  # a composed formula that does not split is no form
                continue
            if made.per_mole.get(component) == 1:
                found.setdefault((float(protons), text), BufferForm(text, made, float(protons)))
    forms = sorted(found.values(), key=lambda f: (f.protons, f.makeup.per_mole.get(WATER, 0.0),
                                                  f.name))
    return forms


def mean_protons(component: str, tables, pH: float, t_C: float) -> float:
    """Average protons bound per buffer molecule at *pH* and *t_C* (ideal solution)."""
    species = _protonated(component, tables)
    k = np.array([0.0, *species])
    log10_k = np.array([0.0, *(float(_log10_k_total(tables, s, t_C)) for s in species.values())])
    return float(k @ ideal_shares(log10_k, k, pH))


def _log10_k_total(tables, species: str, t_C: float) -> float:
    """log10 K of formation of *species* from components at *t_C*."""
    res = tables.resolve(species)
    return sum(m * float(log10_k_at(lk, np.array([t_C]))[0]) for _, m, lk in res.terms)


@dataclass
class Weighed:
    """One thing to weigh out for the batch."""

    name: str
    formula: str
    molar_mass: float
    moles: float

    @property
    def grams(self) -> float:
        return self.moles * self.molar_mass


@dataclass
class BufferCard:
    """The recipe card of a designed buffer."""

    buffer: str
    component: str
    target_pH: float
    use_temperature_C: float
    bench_temperature_C: float
    volume_L: float
    concentration: str
    weigh: list[Weighed]
    method: str                         # "titrate" or "conjugate pair"
    result: Result                      # the buffer at use
    ionic_strength: float
    capacity_mmol_per_L_pH: float
    drift_per_C: float
    bench_pH: float
    titrant: str | None = None
    titrant_mL: float | None = None
    cautions: list[str] = field(default_factory=list)
    #: standard uncertainty of the titrant volume from the constants (mL)
    titrant_mL_uncertainty: float | None = None
    warnings: list[str] = field(default_factory=list)   # plausibility of the design

    def to_dict(self) -> dict[str, Any]:
        return {
            "buffer": self.buffer, "component": self.component, "method": self.method,
            "target_pH": self.target_pH, "pH": self.result.pH,
            "use_temperature_C": self.use_temperature_C,
            "bench_temperature_C": self.bench_temperature_C, "volume_L": self.volume_L,
            "concentration": self.concentration,
            "weigh": [{"name": w.name, "formula": w.formula, "molar_mass_g_per_mol": w.molar_mass,
                       "mol": w.moles, "g": w.grams} for w in self.weigh],
            "titrant": self.titrant, "titrant_mL": self.titrant_mL,
            "titrant_mL_uncertainty": self.titrant_mL_uncertainty,
            "pH_uncertainty": self.result.pH_uncertainty,
            "ionic_strength": self.ionic_strength,
            "buffer_capacity_mmol_per_L_per_pH": self.capacity_mmol_per_L_pH,
            "pH_drift_per_C": self.drift_per_C, "bench_pH": self.bench_pH,
            "cautions": self.cautions, "warnings": [*self.warnings, *self.result.warnings]}

    def report(self) -> str:
        head = (f"{self.buffer} buffer, {self.concentration}, pH {self.target_pH:.2f} at "
                f"{self.use_temperature_C:g} °C, {_volume_text(self.volume_L)}")
        lines = [head, "=" * len(head), "weigh out"]
        for w in self.weigh:
            lines.append(f"  {w.name:<30}{_mass_text(w.grams):>12}   ({w.formula}, "
                         f"{w.molar_mass:.2f} g/mol; {1000 * w.moles:.4g} mmol)")
        bench = f"{self.bench_temperature_C:g} °C"
        if self.method == "titrate":
            lines.append(f"dissolve in about 80 % of the volume, then titrate with "
                         f"{self.titrant}: about {_small_volume_text(self.titrant_mL or 0.0)}"
                         f" (± {_small_volume_text(self.titrant_mL_uncertainty or 0.0)} from "
                         "the constants)")
            lines.append(f"  stop when the meter reads pH {self.bench_pH:.2f} at {bench}")
        else:
            lines.append("dissolve (a conjugate pair: no titration needed)")
            lines.append(f"  the meter should read pH {self.bench_pH:.2f} at {bench}")
        lines.append(f"make up to {_volume_text(self.volume_L)} with water and mix")
        lines += ["", f"at use ({self.use_temperature_C:g} °C)",
                  f"  pH                 {self.result.pH:8.3f} ± "
                  f"{self.result.pH_uncertainty:.3f} made by weight (constants, 1 s.d.)",
                  f"  ionic strength     {self.ionic_strength:8.4f} mol/kg",
                  f"  buffer capacity    {self.capacity_mmol_per_L_pH:8.2f} mmol/(L·pH)",
                  f"  pH drift           {self.drift_per_C:+8.4f} per °C",
                  f"  meter at {bench:<9} {self.bench_pH:8.3f} (same solution)"]
        notes = [*self.cautions, *self.warnings, *(n.text for n in self.result.notices
                                                   if n.category != CAUTION)]
        lines += ["", "cautions and notes"] + [f"  - {n}" for n in notes]
        lines.append("  - the meter reading assumes a meter calibrated at the bench "
                     "temperature; temperature compensation corrects the electrode, not "
                     "the buffer")
        return "\n".join(lines)


def _volume_text(volume_L: float) -> str:
    return f"{volume_L:g} L" if volume_L >= 1 else f"{1000 * volume_L:g} mL"


def _mass_text(grams: float) -> str:
    """A mass to weigh, to 0.1 mg on a balance, in mg below 0.1 g (never "0.0000 g")."""
    return f"{grams:.4f} g" if grams >= 0.1 else f"{1000 * grams:.4g} mg"


def _small_volume_text(mL: float) -> str:
    """A titrant volume to the µL a pipette gives (never "0.000 mL")."""
    return f"{mL:.3f} mL" if mL >= 1 else f"{1000 * mL:.3g} uL"


@names_its_arguments
def design_buffer(buffer: str, pH: float, concentration: str, *, temperature_C: float = 25.0,
                  with_: Sequence[str] = (), volume: str = "1 L", titrant: str | None = None,
                  bench_temperature_C: float | None = None, pair: bool = False,
                  form: str | None = None, activity_model: str = "davies",
                  tables: Sequence[str] = DEFAULT_TABLES, registry: Registry | None = None
                  ) -> BufferCard:
    """Design *buffer* at *pH* and *temperature_C*; see the module docstring.

    *titrant* (``"NaOH 10 mol/L"``) titrates one weighed form; *pair* weighs an acid form
    and its salt instead. *form* names the form to weigh (default: the closest one on the
    far side of the target from the titrant).
    """
    registry = registry or default_registry()
    pH = check_ph(as_number(pH, "pH", "7.4"), "pH")
    t_use = check_temperature(temperature_C, "temperature_C")
    t_bench = check_temperature(t_use if bench_temperature_C is None else bench_temperature_C,
                                "bench_temperature_C")
    table_set = load_tables(tuple(tables), registry)
    component = buffer_component(buffer, table_set)
    amount = positive(expect(parse_quantity(concentration, "concentration"),
                             CONCENTRATION_DIMENSIONS, "concentration"), "concentration")
    volume_q = positive(expect(parse_quantity(volume, "volume"), ("volume",), "volume"),
                        "volume")
    extras = [split_name_and_quantity(w, "with_") for w in with_]
    base = {"temperature_C": t_use, "activity_model": activity_model, "tables": list(tables),
            "volume": volume}
    titrant_name = titrant_stock = ""
    cation = "Na+"
    if titrant is not None:
        titrant_name, titrant_stock = split_name_and_quantity(titrant, "titrant")
        made = makeup(titrant_name, table_set)
        cation = next((c for c in ("K+", "Na+") if c in made.per_mole), "Na+")
    forms = buffer_forms(component, table_set, cation)
    if not forms:
        raise RecipeError(f"buffer {buffer!r}", "the tables hold no weighable form of "
                          f"{component}", "add a named reagent for it to a table")
    n_bar = mean_protons(component, table_set, pH, t_use)
    if pair and titrant is not None:
        raise RecipeError("pair", "a conjugate pair needs no titrant",
                          "give either a titrant or the conjugate pair")
    if pair:
        acid, salt = _pair(forms, n_bar, buffer, form, component, table_set)
        card = _pair_card(buffer, component, pH, amount.text, acid, salt, extras, base,
                          t_use, t_bench, volume_q.value, registry)
        card.warnings = plausibility(card, amount.value, table_set)
        return card
    if titrant is None:
        raise RecipeError("titrant", f"buffer {buffer!r} needs a titrant or the "
                          "conjugate pair", 'give a titrant such as "NaOH 1 mol/L" (or an '
                          "acid), or ask for the conjugate pair")
    protons = made.per_mole.get(PROTON, 0.0)
    if protons == 0:
        raise RecipeError(f"titrant {titrant!r}", "is neither an acid nor a base",
                          'use e.g. "NaOH 1 mol/L" or "HCl 1 mol/L"')
    stock = read_stock(titrant_name, titrant_stock, table_set, t_bench, "titrant")
    weighed = _titration_form(forms, n_bar, protons, buffer, form, component, table_set)
    dissolve = {weighed.name: amount.text, **dict(extras)}
    batch = _Batch.of(base, [*dissolve, titrant_name], table_set, volume_q.value, registry)

    def totals_of(doses: np.ndarray) -> np.ndarray:
        return np.array([batch.totals({**dissolve, titrant_name: f"{float(d)!r} mol/L"})
                         for d in doses])

    ceiling = (max(forms[-1].protons, 1.0) + 1.0) * amount.value + 0.01
    dose, state = find_dose(batch.bench, totals_of, ceiling, pH, titrant_name, "mol per L")
    mL = 1000.0 * dose * volume_q.value / stock.moles_per_L
    if mL >= 1000.0 * volume_q.value:
        raise RecipeError(f"titrant {titrant!r}", f"would take {mL:.5g} mL, more than the "
                          f"whole batch of {_volume_text(volume_q.value)}",
                          "use a more concentrated titrant (e.g. 1 to 10 mol/L)")
    final = {**dissolve, titrant_name: f"{float(dose)!r} mol/L"}
    _check_titrant_fits(batch, final, mL / 1000.0 * stock.water_kg_per_L, mL, titrant)
    card = _card(batch, final, buffer, component, pH, amount.text, t_bench, "titrate",
                 list(dissolve))
    card.titrant, card.titrant_mL = f"{titrant_name} {titrant_stock}", mL
    step = DOSE_STEP * max(dose, 1e-12)
    rate = (totals_of(np.array([dose + step]))[0] - totals_of(np.array([dose - step]))[0]) \
        / (2.0 * step)
    card.titrant_mL_uncertainty = (mL / dose * dose_uncertainty(
        state, card.result.pH_uncertainty, rate)) if dose > 0 else 0.0
    card.cautions = stock_cautions(stock, batch.bench) + card.cautions
    card.warnings = plausibility(card, amount.value, table_set)
    return card


def _check_titrant_fits(batch: _Batch, final: dict[str, str], titrant_water_kg: float,
                        mL: float, titrant: str) -> None:
    """Refuse a titrant whose own water is more than the finished batch holds: the steps
    (dissolve, titrate, make up) cannot be followed, however little water goes in first."""
    _, water_kg = batch.molalities(final)
    if titrant_water_kg > water_kg:
        raise RecipeError(f"titrant {titrant!r}", f"its {mL:.5g} mL bring "
                          f"{titrant_water_kg:.3g} kg of water, more than the {water_kg:.3g} kg "
                          f"the finished {_volume_text(batch.volume_L)} holds beside its "
                          "solutes: the batch cannot be made this way",
                          "use a more concentrated titrant, a lower buffer concentration or "
                          "the conjugate pair")


#: Share of the batch volume left for the titrant by the card's steps (dissolve in about
#: 80 % of the volume, titrate, make up)  # common practice
TITRANT_ROOM = 0.2
#: A buffer is useful within one pH unit of a pKa (common practice); beyond, its capacity
#: falls below about a third of its best
USEFUL_RANGE = 1.0
#: Capacity below this share of the best a buffer of this concentration can give
#: (β_max = ln 10 · C / 4, at pH = pKa) is worth a warning
LOW_CAPACITY_SHARE = 0.1
#: Capacity (mmol/(L·pH)) below which the buffer holds no pH at the bench at all: air's
#: CO2 alone dissolves about 0.014 mmol/L at 420 µatm (K_H 10^-1.47 mol/(kg·atm), from
#: memory), a tenth of a pH unit at this capacity
MIN_CAPACITY_MMOL = 0.1


def plausibility(card: BufferCard, concentration: float, tables) -> list[str]:
    """Warnings for a card that works on paper but not at the bench: a pH outside the
    buffer's useful range, a capacity too low to hold the pH, a titrant volume that does not
    fit the steps of the card."""
    out = []
    pkas = pka_values(card.component, tables, card.use_temperature_C)
    nearest = min(pkas, key=lambda p: abs(p - card.target_pH)) if pkas else None
    if nearest is not None and abs(card.target_pH - nearest) > USEFUL_RANGE:
        out.append(f"pH {card.target_pH:g} is outside the useful range of {card.buffer} "
                   f"(pKa {nearest:.2f} ± {USEFUL_RANGE:g} at {card.use_temperature_C:g} °C, "
                   f"common practice): it holds the pH poorly there; choose a buffer whose "
                   f"pKa is within {USEFUL_RANGE:g} of the target")
    best = LN10 * concentration / 4.0 * 1000.0
    if card.capacity_mmol_per_L_pH < MIN_CAPACITY_MMOL:
        out.append(f"buffer capacity {card.capacity_mmol_per_L_pH:.3g} mmol/(L·pH) is below "
                   f"{MIN_CAPACITY_MMOL:g}: a trace of acid, base or the air's CO2 moves this "
                   "pH; check the concentration (buffers are usually made at 1 to 100 "
                   "mmol/L)")
    elif card.capacity_mmol_per_L_pH < LOW_CAPACITY_SHARE * best:
        out.append(f"buffer capacity {card.capacity_mmol_per_L_pH:.3g} mmol/(L·pH) is under "
                   f"{100 * LOW_CAPACITY_SHARE:g} % of the {best:.3g} this concentration gives "
                   "at its pKa: a small addition of acid or base will move the pH; choose a "
                   "buffer with a pKa nearer the target or a higher concentration")
    if card.titrant_mL is not None and card.titrant_mL > TITRANT_ROOM * 1000.0 * card.volume_L:
        out.append(f"the titrant takes {card.titrant_mL:.4g} mL, more than the "
                   f"{100 * TITRANT_ROOM:g} % of the batch the steps leave for it: dissolve "
                   "the solids in less water first, or use a more concentrated titrant")
    return out


def pka_values(component: str, tables, t_C: float) -> list[float]:
    """Stepwise pKa values of *component*'s acid forms at *t_C*, from the tables."""
    species = _protonated(component, tables)
    formation = {0.0: 0.0, **{k: _log10_k_total(tables, s, t_C) for k, s in species.items()}}
    steps = sorted(formation)
    return [formation[b] - formation[a] for a, b in zip(steps, steps[1:]) if b - a == 1.0]


@dataclass
class _Batch:
    """A batch made up to volume: its ingredients mixed for the water, at any amounts."""

    bench: CompiledRecipe
    base: dict
    volume_L: float
    solutes: dict

    @classmethod
    def of(cls, base: dict, names: Sequence[str], tables, volume_L: float,
           registry: Registry) -> _Batch:
        plain = {k: v for k, v in base.items() if k != "volume"}
        bench = compile_recipe({**plain, "dissolve": {n: 1e-3 for n in names}}, registry)
        solutes = {}
        for name in names:
            made = makeup(name, tables)
            solutes[name] = ingredient_solute(made.name, made.formula, made.per_mole, tables)
        return cls(bench, base, volume_L, solutes)

    def molalities(self, amounts: dict[str, str]) -> tuple[dict[str, float], float]:
        """{ingredient: mol per kg of water} and the kg of water of the batch."""
        entries = []
        for name, text in amounts.items():
            where = f"buffer ingredient {name!r}"
            quantity = expect(parse_quantity(text, where), DISSOLVE_DIMENSIONS, where)
            entries.append(entry_for(self.solutes[name], "ingredient", quantity, where, name))
        made = mix(entries, self.base["temperature_C"], volume_L=self.volume_L,
                   where="buffer batch")
        water = made.solution.water_kg
        return {n: m / water for n, m in zip(amounts, made.moles)}, water

    def totals(self, amounts: dict[str, str]) -> np.ndarray:
        molal, _ = self.molalities(amounts)
        return sum((m * self.bench.direction(n) for n, m in molal.items()),
                   np.zeros(self.bench.system.n_components))

    def recipe(self, amounts: dict[str, str]):
        return read_recipe({**self.base, "dissolve": amounts}, self.bench.registry)


def _titration_form(forms: list[BufferForm], n_bar: float, titrant_protons: float,
                    buffer: str, wanted: str | None, component: str, tables) -> BufferForm:
    if wanted is not None:
        return _named_form(forms, wanted, buffer, component, tables)
    if titrant_protons < 0:       # a base raises the pH: start from a more acidic form
        fitting = [f for f in forms if f.protons >= n_bar - 1e-9]
        pick = min(fitting, key=lambda f: f.protons) if fitting else None
    else:
        fitting = [f for f in forms if f.protons <= n_bar + 1e-9]
        pick = max(fitting, key=lambda f: f.protons) if fitting else None
    if pick is None:
        direction = "acidic" if titrant_protons < 0 else "basic"
        raise RecipeError(f"buffer {buffer!r}", f"has no form {direction} enough to titrate "
                          f"to this pH with that titrant (forms: "
                          f"{', '.join(f.name for f in forms)})",
                          "titrate the other way (an acid instead of a base) or use the conjugate pair")
    same = [f for f in forms if f.protons == pick.protons]
    return same[0]


def _named_form(forms: list[BufferForm], wanted: str, buffer: str, component: str,
                tables) -> BufferForm:
    """The form called *wanted*: a listed form, or any ingredient (a hydrate, a potassium
    salt) that makes one *component* with protons, water and one counter-ion."""
    for f in forms:
        if f.name.casefold() == wanted.casefold():
            return f
    try:
        made = makeup(wanted, tables)
    except IonwrightError:
        made = None
    if made is not None:
        parts = {k: v for k, v in made.per_mole.items() if k not in (PROTON, WATER)}
        others = set(parts) - {component}
        if parts.get(component) == 1 and len(others) <= 1 and others <= set(COUNTER_IONS):
            return BufferForm(made.name, made, made.per_mole.get(PROTON, 0.0))
    raise RecipeError(f"form {wanted!r}", f"is not a weighable form of {buffer} "
                      f"({component} with protons, water and one counter-ion)",
                      f"forms in the tables: {', '.join(f.name for f in forms)}; or a hydrate "
                      "of one, written as a formula (e.g. NaH2PO4·H2O)")


def _pair(forms: list[BufferForm], n_bar: float, buffer: str, wanted: str | None,
          component: str, tables) -> tuple[BufferForm, BufferForm]:
    """The acid form and salt that bracket the target (most protons first)."""
    if wanted is not None:
        names = [w.strip() for w in wanted.split(",")]
        if len(names) != 2:
            raise RecipeError("form", f"{wanted!r}: a pair needs two forms, acid first",
                              'e.g. form "NaH2PO4,Na2HPO4"')
        acid, salt = (_named_form(forms, n, buffer, component, tables) for n in names)
        return acid, salt
    acids = [f for f in forms if f.protons >= n_bar - 1e-9]
    salts = [f for f in forms if f.protons <= n_bar + 1e-9]
    if acids and salts:
        acid = min(acids, key=lambda f: f.protons)
        acid = next(f for f in forms if f.protons == acid.protons)
        salt_k = max(f.protons for f in salts if f.protons < acid.protons) if any(
            f.protons < acid.protons for f in salts) else None
        if salt_k is not None:
            salt = next(f for f in forms if f.protons == salt_k)
            return acid, salt
    raise RecipeError(f"buffer {buffer!r}", "has no acid form and salt in the tables that "
                      f"bracket this pH (forms: {', '.join(f.name for f in forms)})",
                      "titrate instead (give a titrant)")


def _pair_card(buffer, component, pH, concentration, acid, salt, extras, base, t_use, t_bench,
               volume_L, registry) -> BufferCard:
    tables = load_tables(tuple(base["tables"]), registry)
    batch = _Batch.of(base, [acid.name, salt.name, *dict(extras)], tables, volume_L, registry)

    def amounts(share: float) -> dict[str, str]:
        out = {}
        if share < 1.0:
            out[acid.name] = _scaled(concentration, 1.0 - share)
        if share > 0.0:
            out[salt.name] = _scaled(concentration, share)
        return {**out, **dict(extras)}

    def totals_of(shares: np.ndarray) -> np.ndarray:
        return np.array([batch.totals(amounts(min(float(s), 1.0))) for s in shares])

    try:
        share, _ = find_dose(batch.bench, totals_of, 1.0, pH, f"{acid.name} + {salt.name}",
                             f"share of {salt.name}")
    except UnreachableTargetError as exc:
        raise UnreachableTargetError(
            f"{acid.name} and {salt.name}", "pH", pH, exc.reachable,
            "(all acid form to all salt)", "titrate instead (give a titrant)") from None
    final = amounts(share)
    names = [n for n in (acid.name, salt.name) if n in final]
    return _card(batch, final, buffer, component, pH, concentration, t_bench,
                 "conjugate pair", [*names, *dict(extras)])


def _scaled(concentration: str, share: float) -> str:
    q = parse_quantity(concentration, "concentration")
    unit = "mol/L" if q.dimension == "molarity" else "mol/kg"
    return f"{float(q.value * share)!r} {unit}"


def _card(batch: _Batch, amounts: dict[str, str], buffer, component, pH, concentration,
          t_bench, method, weigh_names) -> BufferCard:
    bench = batch.bench
    t_use = batch.base["temperature_C"]
    recipe = batch.recipe(amounts)
    totals = batch.totals(amounts)
    temps = np.array([t_use, t_use - DRIFT_STEP_C, t_use + DRIFT_STEP_C, t_bench])
    state = bench.solve(np.repeat(totals[None, :], temps.size, axis=0), temps)
    result = replace(bench, recipe=recipe).result(state, 0)
    ph = bench.pH(state)
    molal, water_kg = batch.molalities(amounts)
    beta = float(buffer_capacity(state)[0]) * water_kg / batch.volume_L
    weigh = []
    for name in weigh_names:
        made = makeup(name, bench.tables)
        weigh.append(Weighed(made.name, made.formula, made.molar_mass, molal[name] * water_kg))
    cautions = texts(of_category(result.notices, CAUTION))
    return BufferCard(buffer, component, pH, t_use, t_bench, batch.volume_L, concentration,
                      weigh, method, result, result.ionic_strength, 1000.0 * beta,
                      float((ph[2] - ph[1]) / (2 * DRIFT_STEP_C)), float(ph[3]),
                      cautions=cautions)
