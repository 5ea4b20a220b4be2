"""One executor seam: run independent tasks in this process, in a local process pool, or on a Dask cluster.

Batch reports, fleet monitoring and train Monte Carlo submit their tasks through :func:`executor_for`, chosen at the
edge (the command line or the caller); nothing else in the package knows where a task runs.

- ``InProcess``: one task after the other, here (tests, a laptop with one core, debugging).
- ``ProcessPool``: ``jobs`` worker processes on this machine (spawned, so a worker never inherits our state).
- ``DaskCluster``: a Dask ``distributed`` client, either to a running scheduler (``"tcp://host:8786"``) or to a
  ``LocalCluster`` of N single-threaded worker processes (``"local:N"``). Tasks carry their inputs (no shared file
  system is assumed); a task whose worker is lost is run again by the scheduler, and one that raises is retried
  ``retries`` times before it counts as failed. Dask is an optional extra (``pip install revamp[dask]``).

Every executor yields :class:`TaskOutcome` as tasks finish (in any order): a task that fails is reported with its
error and never stops the others. Dask adds about 1 ms of overhead per task, so tasks should carry well over 10 ms of
work (the callers chunk accordingly).

References
----------
Rocklin, M. (2015). Dask: parallel computation with blocked algorithms and task scheduling. Proc. 14th Python in
    Science Conf., 130-136.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass

from .errors import InputError

__all__ = ["TaskOutcome", "InProcess", "ProcessPool", "DaskCluster", "executor_for", "usable_cores"]

_LOCAL_RE = re.compile(r"^local:(\d{1,4})$")
_ADDRESS_RE = re.compile(r"^(tcp|tls|inproc|ucx|ws|wss)://[A-Za-z0-9_.\-\[\]:]{1,200}$")


@dataclass(frozen=True)
class TaskOutcome:
    """What one task gave: ``value`` when ``ok``, else the one-line ``error``."""

    index: int
    ok: bool
    value: object = None
    error: str = ""


def usable_cores() -> int:
    """Cores this process may run on."""
    try:
        return max(len(os.sched_getaffinity(0)), 1)
    except (AttributeError, OSError):
        return max(os.cpu_count() or 1, 1)


def _one_line(exc: BaseException, limit: int = 300) -> str:
    text = " ".join(f"{exc.__class__.__name__}: {exc}".split())
    return text if len(text) <= limit else text[:limit - 3] + "..."


class InProcess:
    """Run each task here, one after the other."""

    name = "in-process"
    workers = 1

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        return False

    def run(self, fn, items):
        for i, item in enumerate(items):
            try:
                yield TaskOutcome(i, True, fn(item))
            except Exception as exc:  # one task's failure never stops the others
                yield TaskOutcome(i, False, error=_one_line(exc))


class ProcessPool:
    """Run tasks in ``jobs`` spawned worker processes on this machine."""

    name = "process pool"

    def __init__(self, jobs: int):
        self.workers = int(jobs)
        self._pool = None

    def __enter__(self):
        from concurrent.futures import ProcessPoolExecutor
        from multiprocessing import get_context

        self._pool = ProcessPoolExecutor(max_workers=self.workers, mp_context=get_context("spawn"))
        return self

    def __exit__(self, *exc):
        if self._pool is not None:
            self._pool.shutdown(wait=True, cancel_futures=True)
        return False

    def run(self, fn, items):
        from concurrent.futures import as_completed

        futures = {self._pool.submit(fn, item): i for i, item in enumerate(items)}
        for fut in as_completed(futures):
            i = futures[fut]
            try:
                yield TaskOutcome(i, True, fut.result())
            except Exception as exc:
                yield TaskOutcome(i, False, error=_one_line(exc))


class DaskCluster:
    """Run tasks on a Dask ``distributed`` cluster: an address, or ``local:N`` for a ``LocalCluster``.

    Parameters
    ----------
    address : str
        ``"tcp://host:8786"`` (a running scheduler) or ``"local:N"`` (N worker processes on this machine).
    retries : int
        Times a task that raised is run again before it counts as failed (a lost worker's tasks are rerun by the
        scheduler whatever this says).
    """

    name = "dask"

    def __init__(self, address: str, retries: int = 1):
        self.address, self.retries = address, int(retries)
        self._cluster = self._client = None
        m = _LOCAL_RE.match(address)
        self.workers = int(m.group(1)) if m else 0

    def __enter__(self):
        self._depth = getattr(self, "_depth", 0) + 1
        if self._client is not None:  # nested use (a fleet shares one cluster): the outermost block owns it
            return self
        try:
            from distributed import Client, LocalCluster
        except ImportError:
            raise InputError("--cluster", self.address,
                             "a run without a cluster, or Dask installed (pip install 'revamp[dask]')") from None
        if _LOCAL_RE.match(self.address):
            self._cluster = LocalCluster(n_workers=self.workers, threads_per_worker=1, processes=True,
                                         dashboard_address=":0", silence_logs=40)  # a free port: no clash with another cluster
            self._client = Client(self._cluster)
        else:
            try:
                self._client = Client(self.address, timeout="20s")
            except OSError as exc:
                raise InputError("--cluster", self.address, f"the address of a running Dask scheduler "
                                                            f"({_one_line(exc)})") from None
            self.workers = len(self._client.scheduler_info().get("workers", {}))
        return self

    def __exit__(self, *exc):
        self._depth -= 1
        if self._depth > 0:
            return False
        if self._client is not None:
            self._client.close()
        if self._cluster is not None:
            self._cluster.close()
        self._client = self._cluster = None
        return False

    @property
    def client(self):
        return self._client

    def run(self, fn, items):
        from distributed import as_completed

        items = list(items)
        futures = self._client.map(fn, items, pure=False, retries=self.retries)
        index = {f.key: i for i, f in enumerate(futures)}
        for fut in as_completed(futures):
            i = index[fut.key]
            try:
                yield TaskOutcome(i, True, fut.result())
            except Exception as exc:
                yield TaskOutcome(i, False, error=_one_line(exc))
            finally:
                fut.release()


def executor_for(cluster: str | None = None, jobs: int = 1, retries: int = 1):
    """The executor a caller asked for, checked at the edge.

    Parameters
    ----------
    cluster : str, optional
        ``None`` (this machine), ``"local:N"`` (a Dask LocalCluster of N workers) or a scheduler address
        (``"tcp://host:8786"``).
    jobs : int
        Without a cluster: 1 runs in this process, more in a process pool of that many workers.

    Examples
    --------
    >>> executor_for(None, 1).name
    'in-process'
    >>> executor_for("local:2").workers
    2
    """
    if cluster is None or cluster == "":
        if isinstance(jobs, bool) or not isinstance(jobs, int) or jobs < 1:
            raise InputError("--jobs", jobs, "a whole number >= 1")
        return InProcess() if jobs == 1 else ProcessPool(jobs)
    if not isinstance(cluster, str):
        raise InputError("--cluster", cluster, "'local:N' or a scheduler address such as 'tcp://host:8786'")
    m = _LOCAL_RE.match(cluster)
    if m:
        n = int(m.group(1))
        if not 1 <= n <= 4 * usable_cores():
            raise InputError("--cluster", cluster, f"local:N with N from 1 to {4 * usable_cores()} "
                                                   f"(this machine has {usable_cores()} usable cores)")
        return DaskCluster(cluster, retries=retries)
    if _ADDRESS_RE.match(cluster):
        return DaskCluster(cluster, retries=retries)
    raise InputError("--cluster", cluster, "'local:N' or a scheduler address such as 'tcp://host:8786'")
