"""Cleaning schedule of a 10-exchanger preheat train over 3 years in weekly periods (invented train).

Prints the wall time, the number of batched train solves and of train states solved, and the plan's cost against the
reference policies. Nothing is asserted (timing belongs here, not in tests).
"""
import time

import numpy as np

import revamp as rv
from revamp.cleaning import schedule_cleaning
from revamp.fouling.growth import Asymptotic, Linear
from revamp.train import Furnace, Match, Train


def ten_exchanger_train():
    crude = rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")])
    resid = rv.fluids.petroleum(api=18, watson_k=11.6, viscosity=[("100 degC", "30 cSt"), ("150 degC", "9 cSt")])
    gasoil = rv.fluids.petroleum(api=33, watson_k=11.9, viscosity=[("40 degC", "4 cSt"), ("100 degC", "1.6 cSt")])
    kero = rv.fluids.petroleum(api=45, watson_k=11.7, viscosity=[("40 degC", "1.5 cSt"), ("100 degC", "0.75 cSt")])

    def hx(n):
        return rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                               tube_count=n, tube_passes=2, tube_pitch="25.4 mm", layout=90,
                               baffle_spacing="450 mm", baffle_cut=0.25, tube_material="carbon steel")

    streams = {"crude": rv.Stream(crude, "70 kg/s", "30 degC"), "resid": rv.Stream(resid, "32 kg/s", "345 degC"),
               "gasoil": rv.Stream(gasoil, "22 kg/s", "280 degC"), "kero": rv.Stream(kero, "20 kg/s", "200 degC")}
    sides = [("kero", 420), ("gasoil", 420), ("kero", 380), ("resid", 460), ("gasoil", 460), ("resid", 480),
             ("gasoil", 440), ("resid", 500), ("resid", 500), ("resid", 520)]
    tags = [f"E-{101 + k}" for k in range(10)]
    matches = {t: Match(hx(n), shell=s, tube="crude", fouling_shell=2e-4) for t, (s, n) in zip(tags, sides)}
    routes = {"crude": tags}
    for s in ("kero", "gasoil", "resid"):
        routes[s] = [t for t, (h, _) in reversed(list(zip(tags, sides))) if h == s]  # hot streams run counter-current
    return Train(streams=streams, exchangers=matches, routes=routes,
                 furnace=Furnace("crude", "365 degC", 0.86, "90 MW"))


def main():
    train = ten_exchanger_train()
    rng = np.random.default_rng(7)
    week = 7 * 86400.0
    fouling = {}
    for k, tag in enumerate(train.exchangers):
        if k < 5:  # cold end: slower, asymptotic
            fouling[tag] = Asymptotic(rf_inf=rng.uniform(3e-4, 6e-4), time_constant=rng.uniform(20, 40) * week,
                                      rf_now=rng.uniform(0, 2e-4))
        else:  # hot end: faster, linear
            fouling[tag] = Linear(rate=rng.uniform(0.8, 2.0) * 1e-4 / (10 * week), rf_now=rng.uniform(0, 3e-4))
    t = time.perf_counter()
    t_one = time.perf_counter()
    train.solve()
    t_one = time.perf_counter() - t_one
    t = time.perf_counter()
    plan = schedule_cleaning(train, fouling, horizon="3 yr", period="1 week", cleaning_cost=60000.0,
                             downtime="5 day", crews=1, fuel_price="9 USD/GJ", start="2027-01-04",
                             blackouts=[("2027-12-15", "2028-01-10")], time_limit="60 s")
    wall = time.perf_counter() - t
    print(f"10 exchangers, {len(plan.timeline)} weekly periods: {wall:.1f} s wall, {plan.solves} batched train "
          f"solves of {plan.states:,} states in all (one scalar train solve: {t_one * 1000:.0f} ms, so the states "
          f"cost {wall / max(plan.states, 1) / t_one:.3f} of a scalar solve each)")
    print(plan.compare.round(0).to_string())
    print(plan.optimality.describe())


if __name__ == "__main__":
    main()
