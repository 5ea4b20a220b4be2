"""Condenser plant-data monitoring on the demo condenser (C-401, a year of 3-hourly rows): the fouling solved with the
zone-by-zone rating on at most N rows and carried to the others through their heat balance, for two N.

Prints the median wall time of each and their ratio, and the last week's fouling against the invented truth of the
demo data (``data/generate_plant_data.py``). Timing is never asserted (``make bench``).
"""
from __future__ import annotations

import statistics
import time


def main(repeat: int = 3) -> None:
    import pandas as pd

    import revamp.monitoring_condenser as mc
    from revamp import unitfile
    from revamp.cli import demo_unit_path

    case = unitfile.load(demo_unit_path()).exchanger("C-401")
    truth = pd.read_csv(case.plant_data.file)["rf_true"].iloc[-56:].median() + float(case.service.fouling_shell)
    saved = mc.MAX_RATED_ROWS
    times = {}
    try:
        for n in (120, 480):
            mc.MAX_RATED_ROWS = n
            runs = []
            for _ in range(repeat):
                t = time.perf_counter()
                m = mc.monitor_condenser_data(case.exchanger, case.service, case.plant_data.file,
                                              **case.plant_data.monitor_options())
                runs.append(time.perf_counter() - t)
            times[n] = statistics.median(runs)
            last = m.summary["fouling, last week (median) [m²K/W]"]
            print(f"condenser monitoring, {n} solved rows: {times[n]:.2f} s; last week Rf {last:.3e} "
                  f"(invented truth {truth:.3e} m²K/W)")
    finally:
        mc.MAX_RATED_ROWS = saved
    print(f"ratio 480/120 solved rows: {times[480] / times[120]:.1f}x the time")


if __name__ == "__main__":
    main()
