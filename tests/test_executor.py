"""The executor seam (revamp.executor): the same results wherever tasks run, failures isolated, lost workers retried.

Dask's LocalCluster runs for real here (two worker processes), as the batch and the Monte Carlo use it.

Expected values are by construction (each task returns its input squared, or its input plus 100): an
invariant of where the work runs, needing no outside source.
"""
import os
import pathlib

import pytest

from revamp.errors import InputError
from revamp.executor import DaskCluster, InProcess, ProcessPool, executor_for

pytest.importorskip("distributed")


def square(x):
    if x == 5:
        raise ValueError("five is refused")
    return x * x


def die_once(arg):
    """Kill the worker process the first time item 3 runs (a lost worker), then behave."""
    x, marker = arg
    if x == 3 and not os.path.exists(marker):
        pathlib.Path(marker).write_text("died")
        os._exit(1)
    return x + 100


def _collect(ex, fn, items):
    with ex:
        out = {o.index: o for o in ex.run(fn, items)}
    return [out[i] for i in range(len(items))]


@pytest.mark.parametrize("make", [lambda: InProcess(), lambda: ProcessPool(2), lambda: DaskCluster("local:2")])
def test_same_results_everywhere_and_a_failing_task_fails_alone(make):
    got = _collect(make(), square, list(range(8)))
    assert [o.value for o in got if o.ok] == [x * x for x in range(8) if x != 5]
    bad = got[5]
    assert not bad.ok and "five is refused" in bad.error


def test_a_lost_worker_task_is_run_again_on_dask(tmp_path):
    marker = str(tmp_path / "died")
    got = _collect(DaskCluster("local:2", retries=1), die_once, [(x, marker) for x in range(6)])
    assert os.path.exists(marker)  # the worker really died once
    assert all(o.ok for o in got)
    assert [o.value for o in got] == [x + 100 for x in range(6)]


@pytest.mark.parametrize("cluster, jobs, field", [
    ("local:0", 1, "--cluster"), ("local:99999", 1, "--cluster"), ("ftp://x", 1, "--cluster"),
    ("tcp://host; rm -rf /", 1, "--cluster"), (None, 0, "--jobs"), (None, True, "--jobs"),
])
def test_bad_choices_are_named(cluster, jobs, field):
    with pytest.raises(InputError) as e:
        executor_for(cluster, jobs)
    assert e.value.field == field
