"""Benchmark of the air-cooler rating: one vectorized sweep against the same cases rated one by one.

Run: ``make bench`` or ``python benchmarks/bench_aircooler.py``. Prints medians and their ratio; asserts nothing.
"""
from __future__ import annotations

import statistics
import time

import numpy as np

import revamp as rv
from revamp import fluids
from revamp.hot_day import hot_day

OIL = fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)
AC = rv.AirCooler(bays=2, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=4, tube_length="9.14 m",
                  tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                  fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m"))
SVC = rv.AirService(tube=rv.Stream(OIL, flow="25 kg/s", t_in="150 degC"), air_in="35 degC", air_flow="300 kg/s",
                    fouling_tube=0.0003, fouling_air=0.0001)


def median_seconds(fn, repeat=5):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def main(n=200):
    ambient = np.linspace(263.15, 323.15, n)
    one = median_seconds(lambda: rv.rate(AC, SVC))
    sweep = median_seconds(lambda: rv.rate(AC, SVC.replace(air_in=ambient)))
    loop = median_seconds(lambda: [rv.rate(AC, SVC.replace(air_in=float(t))) for t in ambient[:20]], repeat=3)
    loop = loop * n / 20
    hd = median_seconds(lambda: hot_day(AC, SVC, ambient=ambient[:25], t_out_target="60 degC"), repeat=3)
    print(f"one case: {one * 1e3:.1f} ms; {n}-case sweep: {sweep * 1e3:.1f} ms; {n} cases one by one: "
          f"{loop * 1e3:.0f} ms (estimated from 20); loop / sweep = {loop / sweep:.1f}x")
    print(f"hot_day (25 ambients + the limit by Brent's method): {hd * 1e3:.0f} ms")


if __name__ == "__main__":
    main()
