"""Benchmark of ``revamp batch`` on the demo unit with ``--jobs 2``: total time and per-notebook overhead.

Run: ``make bench`` or ``python benchmarks/bench_batch.py [--jobs N]``. Prints figures; asserts nothing.

The overhead of a notebook is what papermill and nbconvert add to the package's own work: a kernel start, the
imports, the execution round trips and the HTML conversion. It is measured two ways: a one-cell notebook that only
imports the package's modules, run through the same path; and each exchanger's notebook time minus the same study
computed in a warm process (unit file load + ``report.run_case``).

It also times a stop: ``revamp batch`` on the demo unit in a subprocess, SIGTERM once its first report is in, and
the seconds until the batch has exited and every worker and kernel it started is gone.
"""
from __future__ import annotations

import argparse
import os
import signal
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import nbformat
from nbformat.v4 import new_code_cell, new_notebook

from revamp import report, unitfile
from revamp.batch import run_batch
from revamp.cli import demo_unit_path


def trivial_notebook_seconds(work: Path) -> float:
    """Kernel start + ``import revamp`` + papermill + nbconvert for a one-cell notebook [s]."""
    import papermill as pm

    from revamp.batch import render_notebook

    nb = new_notebook(cells=[new_code_cell("import revamp.report, revamp.rating, revamp.study, revamp.monitoring, "
                                           "revamp.plots, revamp.unitfile, pandas, plotly.graph_objects")],
                      metadata={"kernelspec": {"name": "python3", "display_name": "Python 3", "language": "python"}})
    src, dst = work / "trivial.ipynb", work / "trivial_out.ipynb"
    nbformat.write(nb, src)
    start = time.perf_counter()
    pm.execute_notebook(str(src), str(dst), kernel_name="python3", progress_bar=False, log_output=False)
    render_notebook(nbformat.read(dst, as_version=4))
    return time.perf_counter() - start


def in_process_seconds(path: Path, tag: str) -> float:
    """The same study without a notebook: load the unit (this exchanger only) and run its case [s]."""
    start = time.perf_counter()
    unit, _, _ = unitfile.load_partial(path, only=[tag])
    report.run_case(unit.exchanger(tag))
    return time.perf_counter() - start


def stop_seconds(work: Path, jobs: int) -> tuple[float, int]:
    """Seconds from SIGTERM (sent once the first report is in) to the batch and all its descendants being gone, and
    the number of processes that were stopped."""
    import psutil

    out = work / "stopped"
    proc = subprocess.Popen([sys.executable, "-m", "revamp.cli", "batch", str(demo_unit_path()), "--out", str(out),
                             "--jobs", str(jobs), "--quiet"], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
                            start_new_session=True)
    seen = {}
    try:
        main_proc = psutil.Process(proc.pid)
        while not (out.is_dir() and any(p.name != "index.html" for p in out.glob("*.html"))):
            if proc.poll() is not None:
                raise RuntimeError("the batch ended before its first report")
            for child in main_proc.children(recursive=True):
                seen.setdefault(child.pid, child)
            time.sleep(0.2)
        for child in main_proc.children(recursive=True):
            seen.setdefault(child.pid, child)
        start = time.perf_counter()
        os.kill(proc.pid, signal.SIGTERM)
        proc.wait(timeout=120)
        psutil.wait_procs(list(seen.values()), timeout=120)
        return time.perf_counter() - start, len(seen)
    finally:
        if proc.poll() is None:
            proc.kill()


def main(argv=None):
    parser = argparse.ArgumentParser()
    parser.add_argument("--jobs", type=int, default=2)
    args = parser.parse_args(argv)
    path = demo_unit_path()
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        # warm the disk cache and the CoolProp import the same way for every measurement
        subprocess.run([sys.executable, "-c", "import revamp.fluids, CoolProp"], check=True)
        start = time.perf_counter()
        result = run_batch(path, work / "reports", jobs=args.jobs, progress=False)
        total = time.perf_counter() - start
        trivial = trivial_notebook_seconds(work)
        print(f"revamp batch on the demo unit ({len(result.per_exchanger)} exchangers, --jobs {args.jobs}): "
              f"{total:.1f} s total, {len(result.failures)} failed")
        overheads = []
        in_process_seconds(path, sorted(result.per_exchanger)[0])  # warm the imports: compare warm with warm
        for tag, seconds in sorted(result.per_exchanger.items()):
            inproc = in_process_seconds(path, tag)
            overheads.append(seconds - inproc)
            print(f"  {tag:<8} notebook {seconds:6.1f} s   same study in-process {inproc:5.1f} s   "
                  f"overhead {seconds - inproc:5.1f} s")
        print(f"per-notebook overhead: median {statistics.median(overheads):.1f} s (notebook minus in-process); "
              f"a one-cell notebook importing the package through papermill + nbconvert takes {trivial:.1f} s")
        size = sum(p.stat().st_size for p in (work / "reports").glob("*.html"))
        print(f"reports: {size / 1e3:.0f} kB of HTML in all, plus plotly.min.js once "
              f"({(work / 'reports' / 'plotly.min.js').stat().st_size / 1e6:.1f} MB)")
        seconds, count = stop_seconds(work, args.jobs)
        print(f"stop: SIGTERM after the first report; batch, workers and kernels ({count} processes) gone in "
              f"{seconds:.1f} s")


if __name__ == "__main__":
    main()
