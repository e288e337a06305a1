"""Plugins loaded through real entry points: what they print never mixes with --json, and a
plugin that replaces one of ionwright's own names says so in the result."""

from __future__ import annotations

import json
import os
import subprocess
import sys
import textwrap

import pytest

PLUGIN = textwrap.dedent('''
    """A test plugin that talks at import and replaces the davies model with a copy."""
    from ionwright import hookimpl
    from ionwright.activity import DaviesModel

    print("noisy plugin here: loading")


    @hookimpl
    def register_activity_models():
        return {"davies": DaviesModel()}
''')


@pytest.fixture
def installed(tmp_path):
    """The plugin as an installed distribution: a module and its dist-info entry point."""
    site = tmp_path / "site"
    (site / "noisy_lab.py").parent.mkdir()
    (site / "noisy_lab.py").write_text(PLUGIN, encoding="utf-8")
    info = site / "noisy_lab-0.1.dist-info"
    info.mkdir()
    (info / "METADATA").write_text("Metadata-Version: 2.1\nName: noisy-lab\nVersion: 0.1\n",
                                   encoding="utf-8")
    (info / "entry_points.txt").write_text("[ionwright]\nnoisy-lab = noisy_lab\n",
                                           encoding="utf-8")
    return site


def test_text_printed_at_import_goes_to_stderr_and_the_replacement_is_reported(
        installed, tmp_path):
    recipe = tmp_path / "rinse.toml"
    recipe.write_text('[dissolve]\nNaCl = 0.1\nHEPES = 0.05\n', encoding="utf-8")
    env = {**os.environ, "PYTHONPATH": os.pathsep.join(
        [str(installed), os.environ.get("PYTHONPATH", "")]).rstrip(os.pathsep)}
    for name in ("IONWRIGHT_NO_PLUGINS", "IONWRIGHT_PLUGIN_CONFLICTS"):
        env.pop(name, None)
    proc = subprocess.run([sys.executable, "-m", "ionwright", "solve", str(recipe), "--json"],
                          capture_output=True, text=True, env=env, timeout=120)
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)              # nothing but the JSON object on stdout
    assert "noisy plugin here" in proc.stderr and "Traceback" not in proc.stderr
    notes = [w for w in data["warnings"] if "'davies'" in w and "replaces" in w]
    assert notes and "'noisy-lab'" in notes[0]
