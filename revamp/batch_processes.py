"""Batch worker processes and their lifetime: the cores to use, workers that die with their parent (and stop the
kernel they started), SIGTERM turned into an interrupt, and steps that an interrupt may not cut in half."""
from __future__ import annotations

import os
import signal
import tempfile
import threading
import time
from contextlib import contextmanager

__all__ = ["available_cores"]


def available_cores() -> int:
    """Cores this process may run on (its CPU affinity where the system tells it, else the CPU count)."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):
        return max(1, os.cpu_count() or 1)


def _stop_processes(procs, grace: float = 3.0) -> None:
    """SIGTERM the processes, then SIGKILL whatever is still there after ``grace`` seconds."""
    import psutil

    procs = [p for p in procs if p is not None]
    for p in procs:
        try:
            p.terminate()
        except psutil.Error:
            pass
    _, alive = psutil.wait_procs(procs, timeout=grace)
    for p in alive:
        try:
            p.kill()
        except psutil.Error:
            pass
    psutil.wait_procs(alive, timeout=grace)


def _stop_workers(workers, grace: float = 3.0) -> None:
    """Stop the pool's worker processes and the kernels they started.

    The kernels (grandchildren, each in its own session) are stopped through psutil; the workers (children) through
    their multiprocessing handles, which must be the ones to reap them, or the pool would wait for them forever.
    """
    import psutil

    kernels = []
    for w in workers:
        try:
            kernels += psutil.Process(w.pid).children(recursive=True)
        except psutil.Error:
            pass
    for w in workers:
        w.terminate()  # the worker's own SIGTERM handler stops its kernel too
    _stop_processes(kernels, grace)
    for w in workers:
        w.join(grace)
        if w.is_alive():
            w.kill()
            w.join(grace)


def _worker_exit(signum=None, frame=None) -> None:
    """End this worker and the kernel it started (a kernel runs in its own session: it must be stopped by name)."""
    import psutil

    try:
        _stop_processes(psutil.Process().children(recursive=True), grace=1.0)
    finally:
        os._exit(1)


def _watch_parent(parent_pid: int, period: float = 0.5) -> None:
    while True:
        time.sleep(period)
        if os.getppid() != parent_pid:  # the batch's main process is gone (killed outright): do not go on alone
            _worker_exit()


def _worker_init(parent_pid: int, tmp_dir: str) -> None:
    """Set up a worker: interrupts are the main process's business (it stops the workers in order), SIGTERM ends the
    worker with its kernel, and a watcher thread ends both when the main process disappears. The worker's and its
    kernels' temporary files (the kernel connection files among them) go into the run's temporary folder, so that a
    stopped kernel leaves nothing behind once that folder is removed."""
    os.makedirs(tmp_dir, exist_ok=True)
    os.environ["TMPDIR"] = tmp_dir
    tempfile.tempdir = tmp_dir
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, _worker_exit)
    threading.Thread(target=_watch_parent, args=(parent_pid,), name="watch-parent", daemon=True).start()


class _Stopped(KeyboardInterrupt):
    """SIGTERM (or a signal held off during a step) turned into an interrupt, with its number."""

    def __init__(self, signum: int):
        self.signum = signum
        super().__init__(signum)


@contextmanager
def _sigterm_interrupts():
    """Inside the block SIGTERM interrupts like Ctrl-C (main thread only; the previous handler is restored)."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def handler(signum, frame):
        raise _Stopped(signum)

    old = signal.signal(signal.SIGTERM, handler)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, old)


@contextmanager
def _no_interrupts(deliver: bool = True):
    """Hold SIGINT and SIGTERM off for a short step that must not be cut in half (main thread only).

    With ``deliver`` a signal that came meanwhile interrupts right after the step; without, it is dropped (the
    clean-up after an interrupt).
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    pending = []
    old = {sig: signal.signal(sig, lambda signum, frame: pending.append(signum))
           for sig in (signal.SIGINT, signal.SIGTERM)}
    try:
        yield
    finally:
        for sig, handler in old.items():
            signal.signal(sig, handler)
    if pending and deliver:
        raise _Stopped(pending[0])
