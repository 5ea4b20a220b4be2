"""Benchmark of the rating engine: one vectorized call for 10,000 cases vs a Python loop of scalar calls.

Run: ``make bench`` or ``python benchmarks/bench_rating.py``. Prints medians; asserts nothing (speed is a figure,
not a test).
"""
from __future__ import annotations

import statistics
import time

import numpy as np

import revamp as rv

N_VECTOR = 10_000
N_SCALAR = 200
REPEATS = 5


def exchanger():
    return rv.ShellAndTube(
        shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m", tube_count=158,
        tube_passes=4, tube_pitch="31.75 mm", layout=90, baffle_spacing="127 mm", baffle_cut=0.25,
        tube_material="carbon steel",
    )


def services(water: bool, n: int, seed: int = 1):
    rng = np.random.default_rng(seed)
    oil = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=4.0e-4, conductivity=0.132)
    crude = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)
    tube_fluid = rv.fluids.water(pressure="6 bar") if water else crude
    shell = rv.Stream(oil, flow=rng.uniform(3.0, 8.0, n), t_in=rng.uniform(440.0, 480.0, n))
    tube = rv.Stream(tube_fluid, flow=rng.uniform(10.0, 25.0, n), t_in=rng.uniform(295.0, 320.0, n))
    return rv.Service(shell=shell, tube=tube, fouling_shell=2e-4, fouling_tube=rng.uniform(0.0, 5e-4, n))


def _median_time(fn, repeats=REPEATS):
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def run(water: bool) -> dict:
    hx = exchanger()
    svc = services(water, N_VECTOR)
    rv.rate(hx, svc)  # warm-up (builds property tables)
    t_vec = _median_time(lambda: rv.rate(hx, svc))
    scalar_cases = [
        rv.Service(
            shell=rv.Stream(svc.shell.fluid, float(svc.shell.flow[i]), float(svc.shell.t_in[i])),
            tube=rv.Stream(svc.tube.fluid, float(svc.tube.flow[i]), float(svc.tube.t_in[i])),
            fouling_shell=2e-4, fouling_tube=float(svc.fouling_tube[i]),
        )
        for i in range(N_SCALAR)
    ]
    t_loop = _median_time(lambda: [rv.rate(hx, s) for s in scalar_cases], repeats=3)
    per_vec = t_vec / N_VECTOR
    per_loop = t_loop / N_SCALAR
    return {
        "fluids": "oil / water (IAPWS table)" if water else "constant properties",
        "vectorized cases/s": 1.0 / per_vec,
        "vectorized us/case": per_vec * 1e6,
        "scalar loop us/case": per_loop * 1e6,
        "speed-up (loop / vectorized)": per_loop / per_vec,
    }


def main():
    print(f"rating engine: {N_VECTOR} cases in one call vs a loop of {N_SCALAR} scalar calls (medians)")
    for water in (False, True):
        res = run(water)
        print(f"  {res['fluids']:<28} {res['vectorized cases/s']:>12,.0f} cases/s vectorized "
              f"({res['vectorized us/case']:.2f} us/case); scalar loop {res['scalar loop us/case']:.0f} us/case; "
              f"speed-up x{res['speed-up (loop / vectorized)']:.0f}")


if __name__ == "__main__":
    main()
