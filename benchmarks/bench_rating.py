"""Benchmark of the rating engine, reported as ratios measured in one run (speed is a figure, not a test).

1. One scalar ``rate()`` against a plain-Python scalar implementation of the same steps (kept below: properties
   from the same fluid objects, Gnielinski / Sieder-Tate tube side, Bell-Delaware shell side with Taborek's fits,
   series resistances, 1-2N effectiveness, the outlet and wall-temperature iteration to 1e-6 K). Target <= 30x.
2. 10,000 spread cases against 10,000 identical ones in one call each. Target <= 3x.
3. Cases per second with constant-property fluids, 10,000 spread cases in one call. Target >= 1,000,000.

Run: ``make bench`` or ``python benchmarks/bench_rating.py``. Prints medians; asserts nothing.
"""
from __future__ import annotations

import math
import statistics
import time

import numpy as np

import revamp as rv
from revamp.correlations.shell_bell import TABOREK_FITS

N_VECTOR = 10_000
N_SCALAR = 100
REPEATS = 5


def exchanger():
    return rv.ShellAndTube(
        shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m", tube_count=158,
        tube_passes=4, tube_pitch="31.75 mm", layout=90, baffle_spacing="127 mm", baffle_cut=0.25,
        tube_material="carbon steel",
    )


OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=4.0e-4, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)


def services(water: bool, n: int, seed: int = 1, spread: bool = True):
    rng = np.random.default_rng(seed)
    tube_fluid = rv.fluids.water(pressure="6 bar") if water else CRUDE

    def u(lo, hi):
        return rng.uniform(lo, hi, n) if spread else np.full(n, 0.5 * (lo + hi))

    shell = rv.Stream(OIL, flow=u(3.0, 8.0), t_in=u(440.0, 480.0))
    tube = rv.Stream(tube_fluid, flow=u(10.0, 25.0), t_in=u(295.0, 320.0))
    return rv.Service(shell=shell, tube=tube, fouling_shell=2e-4, fouling_tube=u(0.0, 5e-4))


# ---------------------------------------------------------------------- the same steps in plain Python (reference)
def _taborek(Re, ratio, layout, kind):
    c = TABOREK_FITS[layout]
    k1, k2, k3, k4 = ("a1", "a2", "a3", "a4") if kind == "j" else ("b1", "b2", "b3", "b4")
    band = 0 if Re < 10 else 1 if Re < 100 else 2 if Re < 1e3 else 3 if Re < 1e4 else 4
    return c[k1][band] * (1.33 / ratio) ** (c[k3] / (1.0 + 0.14 * Re ** c[k4])) * Re ** c[k2][band]


def plain_rate(hx, svc):
    """One scalar rating in plain Python (floats and the math module only), E shell, one parallel train."""
    g = hx.bell()
    sf, tf = svc.shell.fluid, svc.tube.fluid
    ms, ts, mt, tt = float(svc.shell.flow), float(svc.shell.t_in), float(svc.tube.flow), float(svc.tube.t_in)
    rfs, rft = float(svc.fouling_shell), float(svc.fouling_tube)
    do, di, L, npass = hx.tube_od, hx.tube_id, hx.tube_length, hx.tube_passes
    area, ntp, n_sh = hx.area_outside, hx.tubes_per_pass, hx.shells
    rr = hx.tube_roughness / di
    # geometry-only parts of the Bell-Delaware corrections
    leak = g.Ssb + g.Stb
    rs, rlm = g.Ssb / leak, leak / g.Sm
    Jc = 0.55 + 0.72 * g.Fc
    Jl = 0.44 * (1 - rs) + (1 - 0.44 * (1 - rs)) * math.exp(-2.2 * rlm)
    rss = g.Nss / g.Nc
    byp = g.Fsbp * (1 - (2 * rss) ** (1 / 3)) if rss < 0.5 else 0.0
    ri, ro = g.Lbi / g.Lbc, g.Lbo / g.Lbc
    xs, xt, tws, twt = ts, tt, 0.5 * (ts + tt), 0.5 * (ts + tt)
    sgn = -1.0 if ts > tt else 1.0
    for _ in range(60):
        tms, tmt = 0.5 * (ts + xs), 0.5 * (tt + xt)
        ps, pt = sf.props(tms), tf.props(tmt)
        mws, mwt = sf.props(tws).viscosity, tf.props(twt).viscosity
        # tube side
        v = mt / (pt.density * ntp * math.pi * di * di / 4)
        Re = pt.density * v * di / pt.viscosity
        Pr = pt.heat_capacity * pt.viscosity / pt.conductivity

        def gn(R):
            f = (0.790 * math.log(R) - 1.64) ** -2
            return (f / 8) * (R - 1000) * Pr / (1 + 12.7 * math.sqrt(f / 8) * (Pr ** (2 / 3) - 1)) * (1 + (di / L) ** (2 / 3))

        def lam(R):
            return max(1.86 * (R * Pr * di / L) ** (1 / 3), 3.66)

        if Re <= 2300:
            Nu = lam(Re)
        elif Re >= 1e4:
            Nu = gn(Re)
        else:
            w = (Re - 2300) / (1e4 - 2300)
            Nu = (1 - w) * lam(2300) + w * gn(1e4)
        phi_t = (pt.viscosity / mwt) ** 0.14
        h_t = Nu * phi_t * pt.conductivity / di
        # shell side
        G = ms / g.Sm
        Res = do * G / ps.viscosity
        Prs = ps.heat_capacity * ps.viscosity / ps.conductivity
        j = _taborek(Res, g.pitch / do, g.layout, "j")
        laminar = Res < 100
        Jb = math.exp(-(1.35 if laminar else 1.25) * byp)
        n1 = 1 / 3 if laminar else 0.6
        Js = ((g.Nb - 1) + ri ** (1 - n1) + ro ** (1 - n1)) / ((g.Nb - 1) + ri + ro)
        Jr = 1.0  # turbulent here
        h_s = j * ps.heat_capacity * G * Prs ** (-2 / 3) * (ps.viscosity / mws) ** 0.14 * Jc * Jl * Jb * Js * Jr
        # resistances, U, effectiveness (1-2N, shells in series)
        kw = hx.tube_material.conductivity(0.5 * (tws + twt))
        Rsf, Rw, Rtf = 1 / h_s, do * math.log(do / di) / (2 * kw), do / (di * h_t)
        U = 1 / (Rsf + rfs + Rw + rft * do / di + Rtf)
        Cs, Ct = ms * ps.heat_capacity, mt * pt.heat_capacity
        cmin, cmax = min(Cs, Ct), max(Cs, Ct)
        cr, ntu = cmin / cmax, U * area / cmin
        s = math.sqrt(1 + cr * cr)
        e1 = 2 / (1 + cr + s / math.tanh(ntu / n_sh * s / 2))
        if n_sh > 1:
            y = ((1 - e1 * cr) / (1 - e1)) ** n_sh
            e1 = (y - 1) / (y - cr)
        q = e1 * cmin * abs(ts - tt)
        to_s, to_t = ts + sgn * q / Cs, tt - sgn * q / Ct
        flux = U * (tms - tmt)
        nws, nwt = tms - flux * Rsf, tmt + flux * Rtf
        step = max(abs(to_s - xs), abs(to_t - xt), abs(nws - tws), abs(nwt - twt))
        xs, xt, tws, twt = to_s, to_t, nws, nwt
        if step < 1e-6:
            break
    return q, to_s, to_t


# ------------------------------------------------------------------------------------------------------ timing
def _median_time(fn, repeats=REPEATS):
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def scalar_ratio() -> dict:
    hx = exchanger()
    svc = services(True, N_SCALAR)
    cases = [rv.Service(shell=rv.Stream(svc.shell.fluid, float(svc.shell.flow[i]), float(svc.shell.t_in[i])),
                        tube=rv.Stream(svc.tube.fluid, float(svc.tube.flow[i]), float(svc.tube.t_in[i])),
                        fouling_shell=2e-4, fouling_tube=float(svc.fouling_tube[i])) for i in range(N_SCALAR)]
    rv.rate(hx, cases[0])
    worst = max(abs(rv.rate(hx, c).duty / plain_rate(hx, c)[0] - 1) for c in cases[:10])
    t_engine = _median_time(lambda: [rv.rate(hx, c) for c in cases], 3) / N_SCALAR
    t_plain = _median_time(lambda: [plain_rate(hx, c) for c in cases], 3) / N_SCALAR
    return {"engine us": t_engine * 1e6, "plain us": t_plain * 1e6, "ratio": t_engine / t_plain,
            "duty agreement": worst}


def spread_ratio() -> dict:
    hx = exchanger()
    spread, same = services(True, N_VECTOR), services(True, N_VECTOR, spread=False)
    rv.rate(hx, spread)
    t_spread = _median_time(lambda: rv.rate(hx, spread))
    t_same = _median_time(lambda: rv.rate(hx, same))
    return {"spread s": t_spread, "identical s": t_same, "ratio": t_spread / t_same}


def constant_rate() -> dict:
    hx = exchanger()
    svc = services(False, N_VECTOR)
    rv.rate(hx, svc)
    t = _median_time(lambda: rv.rate(hx, svc))
    return {"cases/s": N_VECTOR / t}


def main():
    s = scalar_ratio()
    print(f"scalar rate(): {s['engine us']:.0f} us vs plain Python {s['plain us']:.0f} us: "
          f"ratio {s['ratio']:.1f}x (target <= 30x; duties agree to {s['duty agreement']:.1e})")
    p = spread_ratio()
    print(f"{N_VECTOR} spread cases {p['spread s'] * 1e3:.1f} ms vs {N_VECTOR} identical {p['identical s'] * 1e3:.1f} ms: "
          f"ratio {p['ratio']:.2f}x (target <= 3x; oil / IAPWS water)")
    c = constant_rate()
    print(f"constant-property fluids: {c['cases/s']:,.0f} cases/s in one call of {N_VECTOR} (target >= 1,000,000)")


if __name__ == "__main__":
    main()
