"""Plain-text report of a result: what a chemist reads first, then the detail.

Species are shown in their pretty form (``CO₃²⁻``); JSON and tables keep the ASCII form
(``CO3^2-``), see :mod:`ionwright.chemistry._names`.
"""

from __future__ import annotations

from ..chemistry._names import pretty_name
from ..notices import CAUTION
from ._buffer_quantities import report_lines as formulation_lines
from ._derived import report_lines as derived_lines
from ._phase_report import phase_lines
from ._provenance import constants_section
from ._redox import report_lines as redox_lines
from ._uncertainty import report_lines as uncertainty_lines

SPECIES_SHOWN = 25
MIN_SHOWN_MOLALITY = 1e-12


def text_report(result) -> str:
    """The report printed by ``ionwright solve`` without ``--json``."""
    r = result
    lines = []
    if r.recipe.title:
        lines += [r.recipe.title, "=" * len(r.recipe.title)]
    spread = "  (fixed)" if r.uncertainty.pH_fixed else f" ± {r.pH_uncertainty:.3f} (constants, 1 s.d.)"
    lines += [
        f"pH                 {r.pH:8.3f}{spread}",
        *([f"pe                 {r.pe:8.2f}   (Eh {r.Eh_V:+.3f} V)"] if r.pe is not None else []),
        f"ionic strength     {r.ionic_strength:10.4g} mol/kg",
        f"temperature        {r.temperature_C:8.1f} °C",
        f"activity model     {r.model.name} ({r.model.title})",
        f"tables             {', '.join(t.name for t in r.tables.tables)}",
        "",
        f"{'species':<16}{'molality':>12}{'activity':>12}{'log γ':>9}",
        f"{'':<16}{'mol/kg':>12}{'':>12}{'':>9}",
    ]
    rows = [row for row in r.species_rows() if row["molality"] >= MIN_SHOWN_MOLALITY]
    for row in rows[:SPECIES_SHOWN]:
        lines.append(f"{pretty_name(row['name']):<16}{row['molality']:12.4e}{row['activity']:12.4e}"
                     f"{row['log_gamma']:9.3f}")
    hidden = len(r.species_rows()) - min(len(rows), SPECIES_SHOWN)
    if hidden:
        lines.append(f"(+{hidden} species below {MIN_SHOWN_MOLALITY:g} mol/kg or past the "
                     f"first {SPECIES_SHOWN}; the JSON result lists all)")
    dist = r.distribution()
    if dist:
        lines += ["", "where each component is (mol/kg in solution, and the share of it "
                  "in each species)"]
        for comp, shares in dist.items():
            dissolved = float(r.system.nu[:, r.system.components.index(comp)] @ r.molality)
            parts = [f"{pretty_name(name)} {100 * f:.1f} %" for name, f in shares.items()
                     if f >= 0.001]
            lines.append(f"  {pretty_name(comp):<12} {dissolved:10.3e}  " + ", ".join(parts))
    if r.saturation_indices:
        lines += ["", "saturation index (log IAP/Ksp; > 0 supersaturated)"]
        for name, si in r.saturation_indices.items():
            lines.append(f"  {name:<20}{round(si, 2) + 0.0:8.2f}")   # no "-0.00"
    lines += redox_lines(r)
    lines += phase_lines(r)
    lines += uncertainty_lines(r)
    lines += derived_lines(r)
    lines += formulation_lines(r)
    lines += constants_section(r)
    if r.notices:  # cautions first, as a reader must not miss them
        lines += ["", "warnings"]
        lines += [f"  - {n.text}" for n in sorted(r.notices, key=lambda n: n.category != CAUTION)]
    return "\n".join(lines)
