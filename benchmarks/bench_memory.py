"""Benchmark: peak memory and time of one exchanger's study on a long plant-data file (one-minute rows).

For each size (50k, 200k, 525k rows: a year of one-minute data is 525,600 rows) a fresh Python process copies the
demo unit into a temporary folder, writes an invented one-minute CSV for one exchanger (the demo's hourly series
interpolated to minutes, with sensor noise) and runs the study the batch's notebook runs for it,
``report.run_case`` (ratings, ``monitor()`` with 100 Monte Carlo draws for the band, the options), and builds what
the notebook displays of it (tables and figures of the plant data and the options). The child reports
its peak resident memory (``resource.getrusage``: the whole process, imports included) and the time of the study,
wall and CPU (the CPU time is the steadier figure on a shared machine).

Run: ``python benchmarks/bench_memory.py [--rows 50000 200000 525600] [--tag E-104]``. Prints figures; asserts
nothing. The budget the study is built to hold: 1.5 GB peak for a year of one-minute data.
"""
from __future__ import annotations

import argparse
import json
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

CHILD = r"""
import json, resource, sys, time, warnings
from pathlib import Path
import numpy as np, pandas as pd

unit_path, tag, rows = Path(sys.argv[1]), sys.argv[2], int(sys.argv[3])
from revamp import report, unitfile

unit, _, _ = unitfile.load_partial(unit_path, only=[tag])
case = unit.exchanger(tag)
src = pd.read_csv(case.plant_data.file, parse_dates=["timestamp"])
# one-minute rows: the hourly series interpolated (its bad rows kept where they fall), plus sensor noise
t_h = (src["timestamp"] - src["timestamp"].iloc[0]).dt.total_seconds().to_numpy()
t_m = np.arange(rows) * 60.0 % (t_h[-1] + 3600.0)
rng = np.random.default_rng(1)
out = {"timestamp": src["timestamp"].iloc[0] + pd.to_timedelta(np.arange(rows) * 60.0, unit="s")}
for col in src.columns[1:7]:
    y = pd.to_numeric(src[col], errors="coerce").to_numpy(dtype=float)
    ok = np.isfinite(y)
    v = np.interp(t_m, t_h[ok], y[ok])
    out[col] = v * (1 + 0.002 * rng.standard_normal(rows)) if col.endswith("flow") else v + 0.1 * rng.standard_normal(rows)
pd.DataFrame(out).to_csv(case.plant_data.file, index=False, float_format="%.5f")
del src, out
base = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
start, cpu = time.perf_counter(), time.process_time()
with warnings.catch_warnings():
    warnings.simplefilter("ignore")
    result = report.run_case(case)
    shown = report.monitoring_items(result) + report.study_items(result)  # what the notebook displays
seconds, cpu = time.perf_counter() - start, time.process_time() - cpu
mon = result["monitoring"]
print(json.dumps({"seconds": seconds, "cpu": cpu, "peak_kb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
                  "before_kb": base, "rows": len(mon.table) if mon is not None else 0,
                  "error": result["monitoring_error"]}))
"""


def measure(rows: int, tag: str) -> dict:
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        shutil.copy(ROOT / "data" / "demo" / "unit.yaml", work / "unit.yaml")
        shutil.copytree(ROOT / "data" / "demo" / "plant", work / "plant")
        proc = subprocess.run([sys.executable, "-c", CHILD, str(work / "unit.yaml"), tag, str(rows)],
                              capture_output=True, text=True)
        if proc.returncode != 0:
            return {"rows": rows, "error": proc.stderr.strip().splitlines()[-1] if proc.stderr else "failed"}
        return json.loads(proc.stdout.strip().splitlines()[-1])


def main(argv=None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rows", type=int, nargs="+", default=[50_000, 200_000, 525_600])
    ap.add_argument("--tag", default="E-104")
    args, _ = ap.parse_known_args(argv)  # run_all.py passes its own arguments through
    print(f"report.run_case on {args.tag} with one-minute plant data, 100 Monte Carlo draws (one process per size)")
    for n in args.rows:
        r = measure(n, args.tag)
        if "seconds" not in r:
            print(f"  {n:>8,} rows: failed: {r['error']}")
            continue
        note = f"   plant data NOT used: {r['error']}" if r.get("error") else ""
        print(f"  {n:>8,} rows: peak {r['peak_kb'] / 1e6:5.2f} GB (before the study {r['before_kb'] / 1e6:4.2f} GB), "
              f"{r['seconds']:6.1f} s ({r['cpu']:6.1f} s CPU), {r['cpu'] / n * 1e6:5.1f} µs CPU a row{note}")


if __name__ == "__main__":
    main()
