"""Batch on a Dask cluster (revamp batch --cluster local:N) and a fleet of units.

The LocalCluster runs for real (two worker processes): the reports must carry the same numbers as the in-process run
(the same notebook on the same inputs, sent to the workers as bytes), a worker lost mid-batch must not lose a report,
and one unreadable unit of a fleet fails alone. The units are the small invented ones of the unit-file tests.
"""
from __future__ import annotations

import copy
import json
import re

import pytest
from test_unitfile import make_unit, write_unit

from revamp.batch import notebook_path, run_batch
from revamp.fleet import run_fleet

pytest.importorskip("distributed")


def _summaries(index_html: str) -> list:
    rows = re.findall(r"<tr>(.*?)</tr>", re.search(r'<section id="summary">(.*?)</section>', index_html,
                                                   re.DOTALL).group(1), re.DOTALL)
    return [re.sub(r"<[^>]+>", "", r) for r in rows if "<td>" in r]


@pytest.fixture(scope="module")
def unit(tmp_path_factory):
    root = tmp_path_factory.mktemp("cluster")
    return root, write_unit(root / "unit.yaml", make_unit("E-1", "E-2"))


def test_cluster_batch_gives_the_reports_of_the_local_batch(unit):
    root, path = unit
    local = run_batch(path, root / "local", jobs=1, progress=False)
    remote = run_batch(path, root / "remote", progress=False, cluster="local:2")
    assert sorted(local.reports) == sorted(remote.reports) == ["E-1", "E-2"]
    assert not remote.failures
    a = _summaries(local.index_path.read_text(encoding="utf-8"))
    b = _summaries(remote.index_path.read_text(encoding="utf-8"))
    assert a == b  # the same numbers in the index: duty today and at revamp, target, limits, recommendation
    page = (root / "remote" / "E-1.html").read_text(encoding="utf-8")
    assert str(path) in page  # provenance names the unit file as the user gave it, not a worker's copy


def _killer_notebook(tmp_path, marker):
    """The study notebook with one more cell, after the parameters: the first time it runs, it kills the worker
    process that runs it (its kernel's parent), as a node lost in the middle of a batch."""
    nb = json.loads(notebook_path().read_text(encoding="utf-8"))
    cell = copy.deepcopy(nb["cells"][2])
    cell.update(id="lose-the-worker", outputs=[], execution_count=None)
    cell["metadata"] = {}
    cell["source"] = [f"import os, pathlib, signal\n", f"m = pathlib.Path({str(marker)!r})\n",
                      "if not m.exists():\n", "    m.write_text('lost')\n",
                      "    os.kill(os.getppid(), signal.SIGKILL)\n"]
    nb["cells"].insert(2, cell)
    path = tmp_path / "study_losing_a_worker.ipynb"
    path.write_text(json.dumps(nb), encoding="utf-8")
    return path


def test_a_worker_lost_mid_batch_loses_no_report(tmp_path):
    path = write_unit(tmp_path / "unit.yaml", make_unit("E-1", "E-2"))
    marker = tmp_path / "lost"
    res = run_batch(path, tmp_path / "out", progress=False, cluster="local:2",
                    notebook=_killer_notebook(tmp_path, marker))
    assert marker.exists()  # a worker really was killed
    assert sorted(res.reports) == ["E-1", "E-2"] and not res.failures


def test_fleet_index_and_one_bad_unit_fails_alone(tmp_path):
    good = write_unit(tmp_path / "north.yaml", make_unit("E-1"))
    bad = tmp_path / "south.yaml"
    bad.write_text("unit: [not, a, mapping]\n", encoding="utf-8")
    fleet = run_fleet([good, bad], tmp_path / "fleet", jobs=1, progress=False)
    index = fleet.index_path.read_text(encoding="utf-8")
    assert 'href="north/index.html"' in index and "south" in index and "not run" in index
    assert fleet.units["south"] is None and "south" in fleet.failures
    assert sorted(fleet.units["north"].reports) == ["E-1"]
    assert (tmp_path / "fleet" / "north" / "E-1.html").is_file()
