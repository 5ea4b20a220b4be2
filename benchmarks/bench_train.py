"""Benchmark of the train solve: a 10-exchanger interlinked train against scalar ratings, and a 1,000-case sweep
against one solve.

Run: ``make bench`` or ``python benchmarks/bench_train.py``. Prints medians and ratios (of the median CPU times and
of the fastest ones); asserts nothing (speed is a figure, not a test). Goals: one solve costs at most 30 scalar
ratings of its exchangers; a 1,000-case throughput sweep costs at most 5 single solves.
"""
from __future__ import annotations

import statistics
import time

import numpy as np

import revamp as rv
from revamp.train import Furnace, Match, Train

REPEATS = 7
SWEEP_REPEATS = 5
N_SWEEP = 1000


def fluids(constant: bool):
    if constant:  # invented constant properties
        return {"crude": rv.fluids.constant(830, 2300, 2.0e-3, 0.12), "kero": rv.fluids.constant(760, 2500, 6e-4, 0.13),
                "diesel": rv.fluids.constant(800, 2500, 1.2e-3, 0.12), "hvgo": rv.fluids.constant(880, 2600, 3e-3, 0.11),
                "resid": rv.fluids.constant(900, 2700, 4e-3, 0.11)}
    return {"crude": rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")]),
            "kero": rv.fluids.petroleum(api=45, watson_k=11.7, viscosity=[("40 degC", "1.5 cSt"), ("100 degC", "0.75 cSt")]),
            "diesel": rv.fluids.petroleum(api=35, watson_k=11.6, viscosity=[("40 degC", "3.5 cSt"), ("100 degC", "1.4 cSt")]),
            "hvgo": rv.fluids.petroleum(api=21, watson_k=11.8, viscosity=[("100 degC", "25 cSt"), ("150 degC", "8 cSt")]),
            "resid": rv.fluids.petroleum(api=15, watson_k=11.7, viscosity=[("100 degC", "60 cSt"), ("150 degC", "15 cSt")])}


def train(constant: bool, crude_flow=60.0) -> Train:
    """Crude through E-1..E-10; diesel, vacuum gas oil and residue each cross it three times in reverse order
    (every hot stream closes loops with the crude), kerosene once. Invented data."""
    f = fluids(constant)

    def hx(n):
        return rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                               tube_count=n, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="450 mm",
                               baffle_cut=0.25, tube_material="carbon steel")

    hot = {"E-1": "kero", "E-2": "diesel", "E-3": "hvgo", "E-4": "resid", "E-5": "diesel", "E-6": "hvgo",
           "E-7": "resid", "E-8": "diesel", "E-9": "hvgo", "E-10": "resid"}
    matches = {t: Match(hx(380 + 10 * i), shell=s, tube="crude", fouling_shell=3e-4, fouling_tube=5e-4)
               for i, (t, s) in enumerate(hot.items())}
    return Train(
        streams={"crude": rv.Stream(f["crude"], crude_flow, "35 degC"), "kero": rv.Stream(f["kero"], 30, "180 degC"),
                 "diesel": rv.Stream(f["diesel"], 25, "270 degC"), "hvgo": rv.Stream(f["hvgo"], 25, "300 degC"),
                 "resid": rv.Stream(f["resid"], 30, "340 degC")},
        exchangers=matches,
        routes={"crude": list(hot), "kero": ["E-1"], "diesel": ["E-8", "E-5", "E-2"], "hvgo": ["E-9", "E-6", "E-3"],
                "resid": ["E-10", "E-7", "E-4"]},
        furnace=Furnace("crude", "360 degC", 0.85))


def _timed(fn):
    """Wall and process (CPU) time of one call [s]: on a shared machine the CPU time moves less with the load."""
    w0, c0 = time.perf_counter(), time.process_time()
    out = fn()
    return time.perf_counter() - w0, time.process_time() - c0, out


def run(constant: bool, tol: float):
    tr = train(constant)
    res = tr.solve(tol=tol)
    services = [(r.exchanger, r.service) for r in res.ratings.values()]

    def thirty():
        for k in range(30):
            hx, svc = services[k % len(services)]
            rv.rate(hx, svc)

    sweep = train(constant, crude_flow=np.linspace(40.0, 90.0, N_SWEEP))
    # interleaved, so that a busy machine slows all three alike; medians of each
    solves, ratings, sweeps, sres = [], [], [], None
    for k in range(REPEATS):
        solves.append(_timed(lambda: tr.solve(tol=tol))[:2])
        ratings.append(_timed(thirty)[:2])
        if k < SWEEP_REPEATS:
            *t, sres = _timed(lambda: sweep.solve(tol=tol))
            sweeps.append(t)
    (t_solve, c_solve), (t_30, c_30), (t_sweep, c_sweep) = (
        tuple(statistics.median(v[j] for v in runs) for j in (0, 1)) for runs in (solves, ratings, sweeps))
    # the fastest CPU time of each too: the run least disturbed by other load on a shared machine
    f_solve, f_30, f_sweep = (min(v[1] for v in runs) for runs in (solves, ratings, sweeps))
    name = "constant properties" if constant else "petroleum fractions"
    print(f"{name}, tol {tol:g} K: one solve {t_solve * 1e3:.0f} ms ({res.iterations} passes of "
          f"{len(tr.exchangers)} exchangers, the last rating each in full; converged {res.converged}); "
          f"30 scalar ratings {t_30 * 1e3:.0f} ms -> solve / 30 ratings = {t_solve / t_30:.2f} "
          f"(CPU time: median {c_solve / c_30:.2f}, fastest {f_solve / f_30:.2f}; goal <= 1)")
    print(f"    {N_SWEEP}-case sweep {t_sweep * 1e3:.0f} ms ({sres.iterations} passes, "
          f"{int(np.sum(sres.converged))}/{N_SWEEP} converged) -> sweep / one solve = {t_sweep / t_solve:.2f} "
          f"(CPU time: median {c_sweep / c_solve:.2f}, fastest {f_sweep / f_solve:.2f}; goal <= 5)")


if __name__ == "__main__":
    rv.rate(*(lambda r: (r.exchanger, r.service))(next(iter(train(False).solve(max_iter=1).ratings.values()))))
    for constant in (True, False):
        for tol in (1e-6, 1e-3):
            run(constant, tol)
