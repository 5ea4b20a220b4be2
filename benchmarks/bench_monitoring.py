"""Benchmark: one year of hourly plant data (8,760 rows) through revamp.monitor().

Includes reading and flagging the CSV, the steady filter, the reconciliation, the clean-U ratings of every row (the
secant solve at the measured operating state: a few vectorized rating calls), 200 Monte Carlo draws for the band
(200 × 8,760 reconciliations and NTU inversions in one array; the clean U of the draws from first-order
sensitivities, one stacked rating), the model fits and the cleaning interval.

Run from the repository root: ``python benchmarks/bench_monitoring.py`` (prints the median of ``--repeat`` runs).
The demo data must exist (``python data/generate_plant_data.py``).
"""
from __future__ import annotations

import argparse
import statistics
import time
import warnings
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--tag", default="E-104", help="demo exchanger (default E-104)")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--draws", type=int, default=200)
    ap.add_argument("--full", action="store_true", help="rate every Monte Carlo draw instead of linearizing")
    args, _ = ap.parse_known_args()  # run_all.py passes its own arguments through

    import revamp as rv
    from revamp import unitfile

    unit = unitfile.load(ROOT / "data" / "demo" / "unit.yaml")
    case = unit.exchanger(args.tag)
    path = case.plant_data.file
    rv.monitor(case.exchanger, case.service, path, mc_draws=2)  # warm-up: imports, property tables
    times = []
    for _ in range(args.repeat):
        t0 = time.perf_counter()
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            m = rv.monitor(case.exchanger, case.service, path, mc_draws=args.draws,
                           mc_clean="full" if args.full else "linear", duty_value=9e-9 / 0.85,
                           cleaning={"cost": 60000.0, "downtime": "4 day"})
        times.append(time.perf_counter() - t0)
    print(f"monitor(): {len(m.table)} rows, {args.draws} Monte Carlo draws, {args.tag}, "
          f"clean U {'rated per draw' if args.full else 'linearized for the draws'}")
    print(f"median {statistics.median(times):.2f} s over {args.repeat} runs (min {min(times):.2f} s, "
          f"max {max(times):.2f} s)")


if __name__ == "__main__":
    main()
