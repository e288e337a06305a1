"""An interrupted batch leaves either a complete output file or none under the output name.

The batch runs as a real process; once its first chunk is written (to the temporary file in
the output's folder) it is sent SIGINT or SIGTERM. It must stop with a summary of how far
it got, remove the partial file, leave no file under the output name and print no
traceback; left alone, the same batch writes the complete file.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time

import pandas as pd
import pytest

pytestmark = pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")

ROWS, CHUNK = 400, 40


@pytest.fixture
def waters(tmp_path):
    """Analyses (each row read as a recipe and fitted: slow enough to interrupt)."""
    source = tmp_path / "wells.csv"
    pd.DataFrame({"site": [f"well-{k}" for k in range(ROWS)], "pH": 7.5,
                  "Ca [mg/L]": [40.0 + k % 20 for k in range(ROWS)], "Cl [mg/L]": 70.0,
                  "Na [mg/L]": 10.0, "alkalinity [mg/L as CaCO3]": 50.0}).to_csv(source,
                                                                                 index=False)
    return source


def _start(source, target):
    return subprocess.Popen([sys.executable, "-m", "ionwright", "batch", str(source), "-o",
                             str(target), "--chunk-rows", str(CHUNK)],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)


def _partials(folder, target):
    return [p for p in folder.iterdir() if p.name.startswith(f".{target.name}.partial")]


@pytest.mark.parametrize("signal_number", [signal.SIGINT, signal.SIGTERM])
def test_an_interrupted_batch_leaves_no_output_and_says_how_far_it_got(
        waters, tmp_path, signal_number):
    target = tmp_path / "speciated.csv"
    process = _start(waters, target)
    try:
        deadline = time.monotonic() + 120
        while not _partials(tmp_path, target) and process.poll() is None:
            assert time.monotonic() < deadline, "the batch wrote nothing in 120 s"
            time.sleep(0.05)
        assert process.poll() is None, "the batch finished before it could be interrupted"
        process.send_signal(signal_number)
        out, err = process.communicate(timeout=120)
    finally:
        if process.poll() is None:
            process.kill()
    assert process.returncode == 128 + signal_number, err
    assert "Traceback" not in err
    name = signal.Signals(signal_number).name
    assert f"interrupted by {name} after" in err and "was not written" in err
    assert not target.exists()
    assert not _partials(tmp_path, target)


def test_a_batch_left_alone_writes_every_row(waters, tmp_path):
    target = tmp_path / "speciated.csv"
    process = _start(waters, target)
    out, err = process.communicate(timeout=600)
    assert process.returncode == 0, err
    assert len(pd.read_csv(target)) == ROWS
    assert not _partials(tmp_path, target)
    assert f"{ROWS} rows: {ROWS} converged" in out
