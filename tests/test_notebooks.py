"""The notebooks: committed without outputs, a papermill ``parameters`` cell, and every cell runs (nbval, lax).

Each notebook runs under ``pytest --nbval-lax`` in a subprocess (the nbval plugin executes every cell in a fresh
kernel and fails on any error; lax mode does not compare outputs). Plain ``pytest`` from the repository root runs
this file, so no extra Makefile or CI command is needed.
"""
from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import nbformat
import pytest

ROOT = Path(__file__).resolve().parent.parent
NOTEBOOKS = sorted((ROOT / "notebooks").glob("*.ipynb"))


def test_the_three_notebooks_are_there():
    assert {p.name for p in NOTEBOOKS} >= {"exchanger_study.ipynb", "resistance_primer.ipynb",
                                           "unit_summary.ipynb"}


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_committed_clean_with_parameters_cell(path):
    nb = nbformat.read(path, as_version=4)
    nbformat.validate(nb)
    code = [c for c in nb.cells if c.cell_type == "code"]
    assert all(not c.get("outputs") and c.get("execution_count") is None for c in code), "outputs committed"
    tagged = [c for c in code if "parameters" in c.metadata.get("tags", [])]
    assert len(tagged) == 1 and "interactive" in tagged[0].source


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.name)
def test_notebook_runs_under_nbval(path):
    cmd = [sys.executable, "-m", "pytest", "--nbval-lax", "--nbval-current-env", "-p", "no:cacheprovider", "-q",
           "-o", "addopts=", "-W", "ignore::DeprecationWarning", str(path)]
    proc = subprocess.run(cmd, cwd=ROOT, capture_output=True, text=True, check=False, timeout=900)
    assert proc.returncode == 0, proc.stdout[-4000:] + proc.stderr[-2000:]
