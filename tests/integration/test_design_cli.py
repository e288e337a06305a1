"""The target, buffer and sweep subcommands, end to end through the command line."""

from __future__ import annotations

import json

import pytest

from ionwright.cli._main import main

RINSE = """title = "brewery rinse (demo)"
temperature_C = 37.0
[dissolve]
HEPES = 0.05
NaCl = 0.15
"""


@pytest.fixture
def rinse(tmp_path):
    path = tmp_path / "rinse.toml"
    path.write_text(RINSE, encoding="utf-8")
    return path


def test_target_json(rinse, capsys):
    assert main(["target", str(rinse), "--pH", "7.40", "--adjust", "NaOH",
                 "--stock", "1 mol/L", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["ingredient"] == "NaOH"
    assert data["pH"] == pytest.approx(7.40, abs=1e-6)
    assert data["amount_mol_per_kg"] > 0 and data["stock_mL_per_kg_water"] > 0


def test_target_unreachable_is_a_clear_error(rinse, capsys):
    assert main(["target", str(rinse), "--pH", "2.0", "--adjust", "NaOH"]) == 2
    err = capsys.readouterr().err
    assert "cannot be reached with NaOH" in err and "hint" in err


def test_buffer_card(capsys):
    assert main(["buffer", "HEPES", "--pH", "7.4", "--conc", "50 mmol/L", "--temperature",
                 "37", "--with", "NaCl 150 mmol/L", "--volume", "1 L", "--titrant",
                 "NaOH 10 mol/L", "--bench-temperature", "22"]) == 0
    out = capsys.readouterr().out
    for text in ("HEPES", "NaCl", "mL", "ionic strength", "buffer capacity", "per °C",
                 "22 °C", "corrosive"):
        assert text in out


def test_sweep_csv_and_plot(rinse, tmp_path, capsys):
    plot = tmp_path / "curve.png"
    assert main(["sweep", str(rinse), "--add", "NaOH 0.5 mol/L", "--to", "150 mL",
                 "--points", "31", "--plot", str(plot)]) == 0
    captured = capsys.readouterr()
    assert captured.out.splitlines()[0].startswith("titrant_mL,pH,pH_uncertainty,ionic_strength")
    assert "equivalence point" in captured.err
    assert plot.stat().st_size > 1000


def test_sweep_stopped_keeps_the_rows_and_says_why(rinse, capsys):
    assert main(["sweep", str(rinse), "--temperature", "20:120", "--points", "11",
                 "--json"]) == 1
    captured = capsys.readouterr()
    data = json.loads(captured.out)
    assert not data["complete"] and len(data["rows"]) == 9
    assert "0–100 °C" in captured.err


def test_unknown_gas_in_a_recipe_is_a_clear_error(tmp_path, capsys):
    path = tmp_path / "bad.toml"
    path.write_text('[gases]\nC02 = "420 uatm"\n', encoding="utf-8")
    assert main(["solve", str(path)]) == 2
    assert "unknown gas 'C02'" in capsys.readouterr().err


@pytest.mark.parametrize("flags", [["--species", "HEPES-", "HHEPES"],
                                   ["--species", "HEPES-,HHEPES"],
                                   ["--species", "HEPES-", "--species", "HHEPES"]])
def test_sweep_species_are_given_as_batch_takes_them(rinse, capsys, flags):
    """Space-separated as in batch, comma-separated, or repeated (issue 16: the space form
    of batch was refused by sweep as 'unrecognized arguments')."""
    assert main(["sweep", str(rinse), "--pH", "6:8", "--points", "3", *flags]) == 0
    header = capsys.readouterr().out.splitlines()[0].split(",")
    assert [c for c in header if c.startswith("m(")] == ["m(HEPES-)", "m(HHEPES)"]
