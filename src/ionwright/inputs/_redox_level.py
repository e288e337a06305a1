"""How a recipe states its redox level, read from ``[fix]`` (or a water analysis's
``[analysis]``, with the same keys and messages) into one pe or one O2 pressure.

Accepted, one at a time: ``pe = 4.0``; ``Eh = "0.35 V"`` (against the standard hydrogen
electrode); ``ORP = "215 mV"`` with ``electrode = "Ag/AgCl, 3 M KCl"`` (the meter's
reference electrode, whose potential at the recipe's temperature is added); and
``dissolved_oxygen = "8.2 mg/L"`` or ``"95 %"`` (of saturation with air), which stands for
the O2 pressure that holds that much oxygen in fresh water at that temperature. An O2
pressure may also be given under ``[gases]`` (``O2 = "0.21 atm"``).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any, Mapping

from ..chemistry._oxygen import air_o2_pressure_atm, saturation_mg_per_L
from ..chemistry._redox import pe_from_eh
from ..chemistry._reference_electrodes import TABLE_RANGE_C, reference_electrode
from ..errors import RecipeError
from ..notices import VALIDITY, Notice
from ._checks import as_number
from ._units import expect, parse_quantity

REDOX_KEYS = {"pe", "Eh", "ORP", "electrode", "dissolved_oxygen"}
#: pe values a recipe may state; natural waters lie within about −8 to +17
#: (the stability field of water at pH 0–14)  # common practice
PLAUSIBLE_PE = (-15.0, 25.0)
_VOLTS = re.compile(r"^\s*(?P<number>[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?)\s*(?P<unit>mV|V)\s*$")
_PERCENT = re.compile(r"^\s*(?P<number>\d+(\.\d*)?|\.\d+)\s*%\s*(saturation|sat\.?)?\s*$")


@dataclass(frozen=True)
class RedoxLevel:
    """A recipe's redox level: a pe to hold, or an O2 pressure (atm) to hold, and how
    the recipe stated it (for the report)."""

    pe: float | None = None
    o2_pressure_atm: float | None = None
    stated: str = ""
    notices: tuple[Notice, ...] = ()


def read_redox_level(fix: Mapping[str, Any], t_C: float, origin: str,
                     section: str = "[fix]") -> RedoxLevel | None:
    """The redox level the table *fix* (``[fix]`` or ``[analysis]``, named by *section*)
    states at *t_C* (°C), or None."""
    given = [k for k in ("pe", "Eh", "ORP", "dissolved_oxygen") if k in fix]
    where = f"{origin} {section}"
    if "electrode" in fix and "ORP" not in fix:
        raise RecipeError(f"{where} electrode", "names a reference electrode but no ORP "
                          "reading", 'add the reading: ORP = "215 mV"')
    if len(given) > 1:
        raise RecipeError(where, f"states the redox level twice ({', '.join(given)})",
                          "keep one: pe, Eh, ORP (with its electrode) or dissolved_oxygen")
    if not given:
        return None
    key = given[0]
    if key == "pe":
        pe = as_number(fix["pe"], f"{where} pe", "4.0")
        return RedoxLevel(pe=_plausible(pe, f"{where} pe"), stated=f"pe {pe:g}")
    if key == "Eh":
        eh = _volts(fix["Eh"], f"{where} Eh")
        pe = _plausible(float(pe_from_eh(eh, t_C)), f"{where} Eh")
        return RedoxLevel(pe=pe, stated=f"Eh {eh:.4g} V (against the standard hydrogen "
                          "electrode)")
    if key == "ORP":
        return _orp(fix, t_C, where)
    return _oxygen(fix["dissolved_oxygen"], t_C, f"{where} dissolved_oxygen")


def _orp(fix: Mapping[str, Any], t_C: float, where: str) -> RedoxLevel:
    reading = _volts(fix["ORP"], f"{where} ORP")
    if "electrode" not in fix:
        raise RecipeError(f"{where} ORP", "an ORP reading depends on the meter's reference "
                          "electrode, which is not named",
                          'add electrode = "Ag/AgCl, 3 M KCl" (or "Ag/AgCl, saturated KCl", '
                          '"saturated calomel", "SHE" for a reading already against hydrogen)')
    electrode = reference_electrode(fix["electrode"])
    eh = reading + electrode.potential_V(t_C)
    pe = _plausible(float(pe_from_eh(eh, t_C)), f"{where} ORP")
    lo, hi = TABLE_RANGE_C
    extrapolated = electrode.name != "SHE" and not lo <= t_C <= hi
    beyond = (f"; its potential is known for {lo:g}–{hi:g} °C and was extended linearly"
              if extrapolated else "")
    notices = (Notice(VALIDITY, "orp-electrode-extrapolated",
                      f"the ORP was converted to Eh at {t_C:g} °C, outside {lo:g}–{hi:g} °C "
                      f"where the potential of the {electrode.name} reference electrode is "
                      f"tabulated: its potential ({electrode.potential_V(t_C):+.4f} V) is "
                      "extrapolated along the table's line, so Eh and pe carry an error "
                      "that grows away from the table and is not estimated; to avoid it, "
                      "convert the reading with the maker's electrode potential at this "
                      "temperature and give Eh",
                      {"temperature_C": t_C, "table_range_C": [lo, hi],
                       "electrode": electrode.name,
                       "electrode_potential_V": electrode.potential_V(t_C)}),
               ) if extrapolated else ()
    return RedoxLevel(pe=pe, stated=f"ORP {1000 * reading:.4g} mV against {electrode.name} "
                      f"({electrode.potential_V(t_C):+.4f} V at {t_C:g} °C): Eh "
                      f"{eh:.4f} V{beyond}", notices=notices)


def _oxygen(value: Any, t_C: float, where: str) -> RedoxLevel:
    """Dissolved O2 as the O2 pressure of air that holds as much at *t_C* (fresh water)."""
    percent = _PERCENT.match(value) if isinstance(value, str) else None
    if percent:
        fraction = float(percent["number"]) / 100.0
        stated = f"dissolved oxygen {100 * fraction:g} % of saturation"
    else:
        quantity = expect(parse_quantity(value, where), ("mass_per_volume",), where)
        if quantity.basis is not None:
            raise RecipeError(where, f"{value!r}: dissolved oxygen is given as O2",
                              'drop the "as ..." part, e.g. "8.2 mg/L"')
        mg_per_L = quantity.value * 1000.0
        fraction = mg_per_L / float(saturation_mg_per_L(t_C))
        stated = f"dissolved oxygen {mg_per_L:.4g} mg/L ({100 * fraction:.3g} % of saturation)"
    if not 0.0 < fraction <= 5.0:
        raise RecipeError(where, f"{value!r} is {100 * fraction:.3g} % of saturation with air",
                          "give a measured value above zero (up to a few hundred % under "
                          "pure oxygen); for anoxic water state pe or Eh instead")
    return RedoxLevel(o2_pressure_atm=fraction * float(air_o2_pressure_atm(t_C)), stated=stated)


def _volts(value: Any, where: str) -> float:
    """A potential written with its unit ("0.35 V", "-120 mV"), in volts."""
    match = _VOLTS.match(value) if isinstance(value, str) else None
    if not match:
        raise RecipeError(where, f"{value!r} is not a potential with its unit",
                          'write the number and V or mV in quotes, e.g. "0.35 V" or '
                          '"-120 mV"')
    number = float(match["number"])
    return number / 1000.0 if match["unit"] == "mV" else number


def _plausible(pe: float, where: str) -> float:
    low, high = PLAUSIBLE_PE
    if not (math.isfinite(pe) and low <= pe <= high):
        raise RecipeError(where, f"gives pe {pe:.3g}, outside {low:g} to {high:g}",
                          "check the sign and the unit (mV or V) of the value")
    return pe
