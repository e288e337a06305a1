"""Shared test settings: a deterministic Hypothesis profile for CI, small inline tables."""

from __future__ import annotations

import os
import textwrap

import pytest
from hypothesis import HealthCheck, settings

settings.register_profile("ci", derandomize=True, max_examples=60, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow], print_blob=True)
settings.register_profile("dev", max_examples=40, deadline=None)
settings.load_profile("ci" if os.environ.get("CI") else os.environ.get("HYPOTHESIS_PROFILE", "dev"))

MINI_TABLE = textwrap.dedent('''
    [about]
    name = "mini"
    format_version = 1
    title = "a small acid-base table for unit tests"

    [sources]
    HR1940 = "Harned, H.S. & Robinson, R.A. (1940) Trans. Faraday Soc. 36, 973"
    test = "values chosen for the tests"

    [components."H+"]
    ion_size = 9.0
    source = "test"
    [components.H2O]
    source = "test"
    [components."Na+"]
    ion_size = 4.0
    source = "test"
    [components."Cl-"]
    ion_size = 3.0
    source = "test"
    [components."CH3COO-"]
    ion_size = 4.0
    source = "test"

    [species."OH-"]
    from = { H2O = 1, "H+" = -1 }
    log10_k = -14.0
    source = "test"
    ion_size = 3.5
    [species.CH3COOH]
    from = { "CH3COO-" = 1, "H+" = 1 }
    log10_k = 4.756
    source = "test"

    [reagents."acetic acid"]
    formula = "CH3COOH"
    makes = { "CH3COO-" = 1, "H+" = 1 }
    source = "test"
''')


@pytest.fixture
def mini_text() -> str:
    """TOML text of the small acid-base test table."""
    return MINI_TABLE


@pytest.fixture
def mini_table_path(tmp_path):
    path = tmp_path / "mini.toml"
    path.write_text(MINI_TABLE, encoding="utf-8")
    return path
