"""Benchmark of the zone-by-zone condenser rating: one case, a vectorized coolant sweep against the same cases one
by one, the single-phase rating of the same exchanger for scale, and the condensing-pressure search.

Run: ``make bench`` or ``python benchmarks/bench_condenser.py``. Prints medians and their ratios; asserts nothing.
"""
from __future__ import annotations

import statistics
import time

import numpy as np

import revamp as rv

HX = rv.ShellAndTube(shell_id="0.6 m", tube_od="19.05 mm", tube_wall="1.65 mm", tube_length="4 m", tube_count=400,
                     tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="0.5 m", baffle_cut=0.25)
VAPOUR = rv.fluids.pure("n-Hexane", pressure="1.5 bar")
WATER = rv.fluids.water("3 bar")
SVC = rv.Service(shell=rv.Stream(VAPOUR, "6 kg/s", quality=1.0), tube=rv.Stream(WATER, "50 kg/s", "30 degC"),
                 fouling_shell=1e-4, fouling_tube=3e-4)
LIQUID = rv.Service(shell=rv.Stream(VAPOUR, "6 kg/s", "60 degC"), tube=rv.Stream(WATER, "50 kg/s", "30 degC"))


def median_seconds(fn, repeat=5):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def main(n=100):
    flows = np.linspace(20.0, 120.0, n)
    sweep_svc = SVC.replace(tube=SVC.tube.replace(flow=flows))
    one = median_seconds(lambda: rv.rate(HX, SVC))
    single = median_seconds(lambda: rv.rate(HX, LIQUID))
    sweep = median_seconds(lambda: rv.rate(HX, sweep_svc), repeat=3)
    loop = median_seconds(lambda: [rv.rate(HX, SVC.replace(tube=SVC.tube.replace(flow=float(f))))
                                   for f in flows[:10]], repeat=3) * n / 10
    search = median_seconds(lambda: rv.condensing_pressure_for(HX, SVC, "8 kg/s"), repeat=1)
    print(f"condenser, one case: {one * 1e3:.0f} ms ({one / single:.0f}x the single-phase rating, "
          f"{single * 1e3:.1f} ms); {n}-case coolant sweep: {sweep * 1e3:.0f} ms; one by one: {loop * 1e3:.0f} ms "
          f"(estimated from 10); loop / sweep = {loop / sweep:.1f}x")
    print(f"condensing_pressure_for (Brent on log p): {search * 1e3:.0f} ms = {search / one:.0f} ratings")


if __name__ == "__main__":
    main()
