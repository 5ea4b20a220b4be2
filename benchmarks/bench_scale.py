"""Scale-out: a synthetic fleet's plant data in this process vs a Dask LocalCluster of 2 workers, and the per-task
overhead of each executor (invented data: the demo unit's exchangers, each repeated with other fouling rates).

Prints wall times and their ratios; nothing is asserted.
"""
import sys
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "data"))


def noop(x):
    return x


def overhead(executor, n=400):
    with executor:
        t = time.perf_counter()
        list(executor.run(noop, range(n)))
        return (time.perf_counter() - t) / n


def main():
    import generate_plant_data as gen

    from revamp import unitfile
    from revamp.cli import demo_unit_path
    from revamp.executor import executor_for
    from revamp.monitoring.fleet import monitor_many

    unit = unitfile.load(demo_unit_path())
    shell_and_tube = [c for c in unit.exchangers if getattr(c, "kind", "shell and tube") != "air cooler"]
    rng = np.random.default_rng(5)
    cases = []
    for k in range(60):
        case = shell_and_tube[k % len(shell_and_tube)]
        side = case.plant_data.fouling_side if case.plant_data and case.plant_data.fouling_side else "tube"
        law = gen.Linear(a=rng.uniform(0, 1e-4), b_per_year=rng.uniform(2e-4, 1e-3))
        df = gen.generate(case.exchanger, case.service, hours=24 * 60, fouling_law=law, seed=k, fouling_side=side,
                          bad_rows=False).drop(columns=["rf_true"])
        cases.append((f"{case.tag}#{k}", case.exchanger, case.service, df, {"mc_draws": 50, "fouling_side": side}))
    rows = sum(len(c[3]) for c in cases)
    t = time.perf_counter()
    a = monitor_many(cases, min_rows=5000)
    t_in = time.perf_counter() - t
    cluster = executor_for("local:2")
    t = time.perf_counter()
    with cluster:  # one cluster for both runs: the first pays start-up and each worker's imports and caches
        t_start = time.perf_counter() - t
        t = time.perf_counter()
        b = monitor_many(cases, executor=cluster, min_rows=5000)
        t_cold = time.perf_counter() - t
        t = time.perf_counter()
        monitor_many(cases, executor=cluster, min_rows=5000)
        t_warm = time.perf_counter() - t
    same = np.allclose(a["rf_now"].to_numpy(float), b["rf_now"].to_numpy(float), equal_nan=True)
    t_dask = t_warm
    print(f"fleet of {len(cases)} exchangers, {rows:,} hourly rows, 50 Monte Carlo draws each: in-process "
          f"{t_in:.1f} s; LocalCluster(2): start {t_start:.1f} s, first run {t_cold:.1f} s (workers import and "
          f"build their property tables), warm run {t_warm:.1f} s: speed-up {t_in / t_warm:.2f}x warm, "
          f"{t_in / (t_start + t_cold):.2f}x cold; same results: {same}")
    o_in = overhead(executor_for(None, 1))
    o_pool = overhead(executor_for(None, 2))
    o_dask = overhead(executor_for("local:2"))
    print(f"per-task overhead: in-process {o_in * 1e6:.0f} us, process pool {o_pool * 1e3:.2f} ms, "
          f"Dask LocalCluster {o_dask * 1e3:.2f} ms")
    per_task = t_in / max(len(cases), 1)
    print(f"one exchanger is {per_task:.2f} s of work, {per_task / max(o_dask, 1e-9):,.0f}x the Dask overhead: "
          f"on 32 workers the same fleet would take about {t_in / 32 + o_dask * len(cases) / 32:.1f} s of compute "
          f"(plus cluster start-up and data transfer), if the scheduler keeps every worker busy")


if __name__ == "__main__":
    main()
