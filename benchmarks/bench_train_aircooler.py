"""Benchmark of an air cooler in a train and of an air cooler's plant data.

1. The 10-exchanger train of ``bench_train.py`` with and without an air cooler as the diesel's rundown cooler: the
   cost the air cooler adds to one solve, and a 200-case ambient sweep of that train against one solve.
2. A year of hourly plant data (8,760 rows) of the demo-like air cooler monitored, against one scalar rating.

Run: ``make bench`` or ``python benchmarks/bench_train_aircooler.py``. Prints medians and ratios; asserts nothing.
"""
from __future__ import annotations

import pathlib
import statistics
import sys
import time

import numpy as np
import pandas as pd

import revamp as rv
from revamp.monitoring_air_data import monitor_air_data
from revamp.train import AirSide, Match

sys.path.insert(0, str(pathlib.Path(__file__).parent))
from bench_train import train as ten_exchanger_train  # noqa: E402

AC = rv.AirCooler(bays=2, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=4, tube_length="9.14 m",
                  tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                  fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m"))


def median_seconds(fn, repeat=5):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def with_air_cooler(base, ambient="35 degC"):
    routes = dict(base.routes)
    routes["diesel"] = list(routes["diesel"]) + ["AC-1"]
    matches = {**base.exchangers, "AC-1": Match(AC, tube="diesel", air=AirSide(ambient, air_flow="250 kg/s"),
                                                fouling_tube=2e-4)}
    return base.replace(exchangers=matches, routes=routes)


def main():
    base = ten_exchanger_train(constant=False)
    air = with_air_cooler(base)
    t_base = median_seconds(lambda: base.solve(tol=1e-6))
    t_air = median_seconds(lambda: air.solve(tol=1e-6))
    sweep = with_air_cooler(base, np.linspace(278.15, 318.15, 200))
    t_sweep = median_seconds(lambda: sweep.solve(tol=1e-6), repeat=3)
    print(f"10-exchanger train: {t_base * 1e3:.0f} ms; with an air cooler rundown: {t_air * 1e3:.0f} ms "
          f"(x{t_air / t_base:.2f}); 200-ambient sweep of it: {t_sweep * 1e3:.0f} ms (x{t_sweep / t_air:.2f} one "
          f"solve, {t_sweep / t_air / 200:.3f} of a solve per case)")

    oil = rv.fluids.petroleum(api=45, watson_k=11.7, viscosity=[("40 degC", "1.6 cSt"), ("150 degC", "0.55 cSt")])
    svc = rv.AirService(tube=rv.Stream(oil, 22.0, "140 degC"), air_in="35 degC", air_flow="200 kg/s")
    n = 8760
    rng = np.random.default_rng(0)
    t = np.arange(n)
    amb = 293.15 + 9 * np.sin(2 * np.pi * t / n) + 3.5 * np.sin(2 * np.pi * t / 24) + rng.normal(0, 0.2, n)
    flow = 22.0 * (1 + 0.02 * rng.standard_normal(n))
    t_in = 413.15 + rng.normal(0, 0.3, n)
    r = rv.rate(AC, svc.replace(tube=svc.tube.replace(flow=flow, t_in=t_in), air_in=amb, fouling_tube=3e-4))
    frame = pd.DataFrame({"timestamp": pd.date_range("2031-01-01", periods=n, freq="h").strftime("%Y-%m-%d %H:%M"),
                          "tube_flow": flow, "tube_t_in": t_in, "tube_t_out": r.t_out_tube + rng.normal(0, 0.3, n),
                          "air_t_in": amb})
    one = median_seconds(lambda: rv.rate(AC, svc))
    mon = median_seconds(lambda: monitor_air_data(AC, svc, frame, steady={"window": "3 h", "t_range": 3.0}),
                         repeat=3)
    print(f"air cooler plant data, {n:,} hourly rows: {mon * 1e3:.0f} ms (x{mon / one:.0f} one scalar rating of "
          f"{one * 1e3:.1f} ms; {mon / one / n:.3f} of a rating per row)")


if __name__ == "__main__":
    main()
