"""Invariants of the train solve's fast paths: each shortcut gives what the plain form gives.

These compare two forms of the same computation (no external reference is needed for an identity): the reduced
linear system against the dense one of all ports, a probe rating started from its base case against one started
from the inlets, the few-case passes against full ratings, and a fluid's viscosity-only call against its full
property call.
"""
from __future__ import annotations

import numpy as np
import pytest

import revamp as rv
from revamp import rating as rating_mod
from revamp.train import Match, Split, Train
from revamp.train import passes
from revamp.train import solver as sv

CRUDE_P = rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")])
RESID_P = rv.fluids.petroleum(api=18, watson_k=11.6, viscosity=[("100 degC", "30 cSt"), ("150 degC", "9 cSt")])
KERO_P = rv.fluids.petroleum(api=45, watson_k=11.7, viscosity=[("40 degC", "1.5 cSt"), ("100 degC", "0.75 cSt")])
KERO_C = rv.fluids.constant(density=760.0, heat_capacity=2500.0, viscosity=0.6e-3, conductivity=0.13, name="kero")


def hx(tube_count=500):
    """An invented AES-like exchanger."""
    return rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                           tube_count=tube_count, tube_passes=2, tube_pitch="25.4 mm", layout=90,
                           baffle_spacing="450 mm", baffle_cut=0.25, tube_material="carbon steel")


def interlinked(crude_flow=60.0):
    """Crude through E-101, E-102, E-104 while the residue goes E-104 then E-102 (a loop across two streams)."""
    return Train(
        streams={"crude": rv.Stream(CRUDE_P, crude_flow, "35 degC"), "resid": rv.Stream(RESID_P, 30, "340 degC"),
                 "kero": rv.Stream(KERO_P, 38, "190 degC")},
        exchangers={"E-101": Match(hx(), shell="kero", tube="crude", fouling_shell=2e-4, fouling_tube=5e-4),
                    "E-102": Match(hx(420), shell="resid", tube="crude", fouling_shell=5e-4, fouling_tube=7e-4),
                    "E-104": Match(hx(460), shell="resid", tube="crude", fouling_shell=5e-4, fouling_tube=7e-4)},
        routes={"crude": ["E-101", "E-102", "E-104"], "resid": ["E-104", "E-102"], "kero": ["E-101"]})


def split_bypass(crude_flow=60.0):
    """A split with a bypassed branch and a split whose branches hold two exchangers and one (remixes)."""
    return Train(
        streams={"crude": rv.Stream(CRUDE_P, crude_flow, "35 degC"), "resid": rv.Stream(RESID_P, 30, "340 degC"),
                 "kero": rv.Stream(KERO_C, 38, "190 degC")},
        exchangers={"A": Match(hx(300), shell="kero", tube="crude"), "B": Match(hx(300), shell="resid", tube="crude"),
                    "C": Match(hx(380), shell="resid", tube="crude"), "D": Match(hx(420), shell="kero", tube="crude")},
        routes={"crude": [Split([["A"], []], [0.8, 0.2]), Split([["B", "D"], ["C"]], [0.45, 0.55])],
                "resid": ["C", "B"], "kero": ["D", "A"]})


@pytest.mark.parametrize("make", [interlinked, split_bypass])
@pytest.mark.parametrize("probe", [0.0, sv._PROBE_K])
def test_reduced_linear_solve_equals_the_dense_one(make, probe):
    tr = make(np.linspace(40.0, 90.0, 5))
    plan = sv._Plan(tr)
    idx = np.arange(plan.ncase)
    # inlets and outlets away from the supply temperatures (a mid-solve state), different per case
    x = sv._initial(plan) + np.random.default_rng(7).uniform(0.0, 15.0, (plan.ncase, plan.n))
    ratings = sv._rate_all(plan, x, idx, probe=probe)
    linear, newton = sv._coefficients(ratings, x, plan, idx.size, probe)
    for coefs in filter(None, (linear, newton)):
        reduced, bad_r = sv._linear_solve(plan, x, coefs, idx)
        dense, bad_d = sv._linear_solve_dense(plan, x, coefs, idx)
        assert not bad_r.any() and not bad_d.any()
        np.testing.assert_allclose(reduced, dense, rtol=0, atol=1e-9)  # the same system: rounding only [K]


@pytest.mark.parametrize("n", [4, 80], ids=["LAPACK", "sparse from the feeds"])
def test_reduced_linear_solve_flags_the_same_bad_cases(monkeypatch, n):
    from revamp.train import linear as lin

    tr = interlinked(np.linspace(40.0, 90.0, n))
    plan = sv._Plan(tr)
    idx = np.arange(plan.ncase)
    x = sv._initial(plan)
    linear, _ = sv._coefficients(sv._rate_all(plan, x + 5.0, idx), x, plan, idx.size, 0.0)
    J, c = linear["E-102"]
    J[0][1][2] = np.nan  # one case's map is not finite
    reduced, bad_r = sv._linear_solve(plan, x, linear, idx)
    monkeypatch.setattr(lin, "_SPARSE_CASES", 10 ** 9)  # the reference: LAPACK on the dense system of all ports
    dense, bad_d = sv._linear_solve_dense(plan, x, linear, idx)
    np.testing.assert_array_equal(bad_r, bad_d)
    assert bad_r.tolist() == [i == 2 for i in range(n)]
    np.testing.assert_allclose(reduced[~bad_r], dense[~bad_d], rtol=0, atol=1e-9)


def test_sparse_solve_from_the_feeds_sends_a_vanishing_pivot_to_the_dense_solve(monkeypatch):
    from revamp.train import linear as lin

    tr = interlinked(np.linspace(40.0, 90.0, 80))
    plan = sv._Plan(tr)
    idx = np.arange(plan.ncase)
    x = sv._initial(plan)
    linear, _ = sv._coefficients(sv._rate_all(plan, x + 5.0, idx), x, plan, idx.size, 0.0)
    monkeypatch.setattr(lin, "_PIVOT_MIN", 10.0)  # every pivot counts as weak: every case goes to LAPACK
    got, bad = sv._linear_solve(plan, x, linear, idx)
    monkeypatch.setattr(lin, "_SPARSE_CASES", 10 ** 9)
    want, _ = sv._linear_solve(plan, x, linear, idx)
    assert not bad.any()
    np.testing.assert_array_equal(got, want)


@pytest.mark.parametrize("make", [interlinked, split_bypass])
@pytest.mark.parametrize("probe", [0.0, sv._PROBE_K])
def test_sparse_elimination_equals_lapack_on_network_systems(monkeypatch, make, probe):
    from revamp.train import linear as lin

    tr = make(np.linspace(40.0, 90.0, 80))
    plan = sv._Plan(tr)
    idx = np.arange(plan.ncase)
    x = sv._initial(plan) + np.random.default_rng(3).uniform(0.0, 15.0, (plan.ncase, plan.n))
    linear, newton = sv._coefficients(sv._rate_all(plan, x, idx, probe=probe), x, plan, idx.size, probe)
    systems = []
    real = lin._solve_cases
    monkeypatch.setattr(lin, "_solve_cases", lambda A, b: systems.append((A.copy(), b.copy())) or real(A, b))
    for coefs in filter(None, (linear, newton)):
        got, bad = sv._linear_solve(plan, x, coefs, idx)  # sparse elimination (from _SPARSE_CASES cases on)
        sparse_systems = len(systems)
        with monkeypatch.context() as m:
            m.setattr(lin, "_SPARSE_CASES", 10 ** 9)
            want, bad_want = sv._linear_solve(plan, x, coefs, idx)  # LAPACK (numpy.linalg), an independent solver
        del systems[sparse_systems:]
        assert not bad.any() and not bad_want.any()
        np.testing.assert_allclose(got, want, rtol=1e-12, atol=0)
    # a network with splits builds its dense system first: the same elimination on it
    assert bool(systems) == (plan.fed() is None)
    for A, b in systems:
        got, weak = lin._sparse_solve(A.copy(), b.copy())
        assert not weak.any()
        want = np.linalg.solve(A, b[..., None])[..., 0]  # LAPACK (numpy.linalg), an independent solver
        np.testing.assert_allclose(got, want, rtol=1e-12, atol=0)


def test_sparse_elimination_sends_a_vanishing_pivot_to_the_dense_solve():
    from revamp.train import linear as lin

    rng = np.random.default_rng(11)
    nc, m = 100, 6
    A = np.eye(m) - 0.15 * rng.uniform(0.0, 1.0, (nc, m, m)) * (rng.uniform(size=(1, m, m)) < 0.4)
    A[7, 0, :] = [0.0, 1.0, 0.0, 0.0, 0.0, 0.0]  # case 7: a zero on the diagonal, nonsingular by rows
    A[7, 1, :] = [1.0, 0.0, 0.0, 0.0, 0.0, 0.0]
    b = rng.uniform(300.0, 600.0, (nc, m))
    want = np.linalg.solve(A, b[..., None])[..., 0]
    _, weak = lin._sparse_solve(A.copy(), b.copy())
    assert weak[7]
    got, bad = lin._solve_cases(A.copy(), b.copy())
    assert not bad.any()
    np.testing.assert_allclose(got, want, rtol=1e-12, atol=0)
    A[3, 2, 2] = np.nan  # a map that is not finite: NaN for that case only, flagged
    got, bad = lin._solve_cases(A.copy(), b.copy())
    assert bad.tolist() == [i == 3 for i in range(nc)] and np.isnan(got[3]).all()
    np.testing.assert_allclose(np.delete(got, 3, axis=0), np.delete(want, 3, axis=0), rtol=1e-12, atol=0)


def _service(ts, tt, n=1):
    return rv.Service(shell=rv.Stream(RESID_P, np.full(n, 30.0), ts), tube=rv.Stream(CRUDE_P, np.full(n, 60.0), tt),
                      fouling_shell=np.full(n, 5e-4), fouling_tube=np.full(n, 7e-4))


def test_probe_blocks_started_from_their_base_case_reach_the_same_outlets():
    ts = np.array([600.0, 560.0])
    tt = np.array([420.0, 380.0])
    p = sv._PROBE_K
    ts3, tt3 = np.concatenate([ts, ts + p, ts]), np.concatenate([tt, tt, tt + p])
    svc = _service(ts3, tt3, 6)
    chained = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                              blocks=3)
    cold = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False)
    # the base block starts from the inlets in both: the same numbers
    np.testing.assert_array_equal(chained.t_out_shell[:2], cold.t_out_shell[:2])
    # the probe blocks stop within the rating's iteration tolerance (1e-6 K steps) of the same fixed point
    np.testing.assert_allclose(chained.t_out_shell, cold.t_out_shell, rtol=0, atol=1e-5)
    np.testing.assert_allclose(chained.t_out_tube, cold.t_out_tube, rtol=0, atol=1e-5)
    # and they match the full rating of each case alone
    for i in range(6):
        alone = rv.rate(hx(420), rv.Service(shell=rv.Stream(RESID_P, 30.0, float(ts3[i])),
                                            tube=rv.Stream(CRUDE_P, 60.0, float(tt3[i])),
                                            fouling_shell=5e-4, fouling_tube=7e-4))
        assert chained.t_out_tube[i] == pytest.approx(alone.t_out_tube, abs=1e-5)


def test_few_case_passes_use_outlet_maps_and_rate_in_full_once(monkeypatch):
    light, full = [], []
    engine = rating_mod._rate_shell_and_tube

    def counting(into):
        def call(*a, **kw):
            into.append(kw.get("outlets_only", False))
            return engine(*a, **kw)
        return call

    monkeypatch.setattr(passes, "_rate_shell_and_tube", counting(light))  # the solver's outlet-map calls
    monkeypatch.setattr(rating_mod, "_rate_shell_and_tube", counting(full))  # through rate()
    res = interlinked().solve()
    assert res.converged and res.iterations > 2
    # the first and the probing passes ask for outlet maps (a closing pass without probes rates in full)
    assert all(light) and len(light) in (3 * (res.iterations - 1), 3 * res.iterations)
    assert full == [False] * 3  # each exchanger rated in full once, at its solved inlets


def test_few_case_solve_equals_full_rating_passes(monkeypatch):
    fast = interlinked().solve()
    monkeypatch.setattr(sv, "_FLOAT_CASES", 0)  # every pass rates in full, as a sweep does
    full = interlinked().solve()
    for tag in ("E-101", "E-102", "E-104"):
        for col in ("t_out_shell", "t_out_tube"):  # both solved to 1e-6 K [K]
            assert fast.exchangers.loc[tag, col] == pytest.approx(full.exchangers.loc[tag, col], abs=1e-5)
        assert fast.exchangers.loc[tag, "duty"] == pytest.approx(full.exchangers.loc[tag, "duty"], rel=1e-6)


# ------------------------------------------------------------------------------ the viscosity-only call of fluids
def _fluids():
    water = rv.fluids.water("10 bar")
    return [
        ("constant", KERO_C, np.array([250.0, 300.0, 450.0])),
        ("table", rv.fluids.table(T=["50 degC", "100 degC", "150 degC"], density=[850, 820, 780],
                                  heat_capacity=[2000, 2200, 2400], viscosity=["4 cP", "2 cP", "1 cP"],
                                  conductivity=[0.13, 0.125, 0.12]),
         np.array([300.0, 323.15, 350.0, 400.0, 423.15, 440.0])),  # inside and (extrapolated) outside the points
        ("petroleum", RESID_P, np.array([280.0, 373.15, 420.0, 600.0, 640.0])),
        ("coolprop water", water, np.array([280.0, 300.0, 350.0, 400.0, 450.0])),
        ("coolprop pure", rv.fluids.pure("Toluene", "5 bar"), np.array([250.0, 300.0, 350.0, 400.0])),
        ("condensing (condensate)", rv.fluids.condensing(water), np.array([290.0, 330.0, 420.0])),
    ]


@pytest.mark.parametrize("kind,fluid,temps", _fluids(), ids=[k for k, _, _ in _fluids()])
def test_viscosity_only_call_equals_props_viscosity_exactly(kind, fluid, temps):
    temps = temps[temps < fluid.t_max]
    np.testing.assert_array_equal(fluid.viscosity_at(temps), fluid.props(temps).viscosity)  # arrays
    grid = temps.reshape(-1, 1) + np.zeros((1, 2))
    np.testing.assert_array_equal(fluid.viscosity_at(grid), fluid.props(grid).viscosity)  # any shape
    for t in temps.tolist():  # Python floats: the scalar paths
        v = fluid.viscosity_at(t)
        assert type(v) is float and v == fluid.props(t).viscosity
    assert fluid.viscosity_at(f"{temps[0] - 273.15} degC") == fluid.props(f"{temps[0] - 273.15} degC").viscosity


@pytest.mark.parametrize("fluid", [CRUDE_P, RESID_P, KERO_P], ids=["crude", "residue", "kerosene"])
def test_rating_kernel_of_a_petroleum_fraction_equals_props_and_viscosity_at_exactly(fluid):
    t_mean = np.linspace(fluid.t_min, fluid.t_max - 1.0, 37)
    t_wall = t_mean[::-1] + 0.25
    rho, cp, mu, k, mu_w = fluid._rating_props(t_mean, t_wall)
    p = fluid.props(t_mean)
    for got, want in ((rho, p.density), (cp, p.heat_capacity), (mu, p.viscosity), (k, p.conductivity)):
        np.testing.assert_array_equal(got, want)
    np.testing.assert_array_equal(mu_w, fluid.viscosity_at(t_wall))


@pytest.mark.parametrize("fluid", [RESID_P, rv.fluids.water("10 bar")], ids=["petroleum", "coolprop"])
def test_viscosity_only_call_refuses_what_props_refuses(fluid):
    too_hot = fluid.tc + 5.0 if hasattr(fluid, "tc") else fluid.t_max + 5.0  # not a liquid there
    for T in (too_hot, np.array([400.0, too_hot])):
        with pytest.raises(rv.errors.InputError):
            fluid.props(T)
        with pytest.raises(rv.errors.InputError):
            fluid.viscosity_at(T)
    with pytest.raises(rv.errors.InputError):
        fluid.viscosity_at(np.array([400.0, np.nan]))


@pytest.mark.parametrize("flows", [60.0, np.linspace(40.0, 90.0, 12)], ids=["one case", "sweep"])
def test_chord_steps_reach_the_newton_solution_with_fewer_ratings(monkeypatch, flows):
    rated = []
    engine = rating_mod._rate_shell_and_tube

    def counting(hx_, svc, *a, **kw):
        rated.append(np.size(np.broadcast_arrays(svc.shell.flow, svc.tube.flow)[0]))
        return engine(hx_, svc, *a, **kw)

    monkeypatch.setattr(passes, "_rate_shell_and_tube", counting)
    monkeypatch.setattr(rating_mod, "_rate_shell_and_tube", counting)
    monkeypatch.setattr(sv, "_RELAX_PASSES", 0)  # a sweep's Newton passes (no single-evaluation passes first)
    chord = interlinked(flows).solve()
    with_chord = sum(rated)
    rated.clear()
    monkeypatch.setattr(sv, "_CHORD_FALL", 0.0)  # probes on every Newton pass
    newton = interlinked(flows).solve()
    assert np.all(chord.converged) and np.all(newton.converged)
    assert with_chord < sum(rated)
    for col in ("t_out_shell", "t_out_tube"):  # both solved to 1e-6 K [K]
        np.testing.assert_allclose(chord.exchangers[col].to_numpy(float), newton.exchangers[col].to_numpy(float),
                                   rtol=0, atol=1e-5)


# ------------------------------------------------------------------ warm starts, looser stops, chained probe blocks
def _counting_evaluations(monkeypatch):
    """Count the engine's evaluations of the outlet map (float path: calls of the one-case map; array path: cases
    passed to the tube-side kernel), through the names the engine looks up at call time."""
    from revamp.correlations import tube as tube_corr

    count = [0]
    iterate = rating_mod._iterate_one

    def iterate_counting(evaluate_one, *a, **kw):
        def counted(*x):
            count[0] += 1
            return evaluate_one(*x)
        return iterate(counted, *a, **kw)

    kernel = tube_corr.tube_side_kernel

    def kernel_counting(mt, *a, **kw):
        if np.size(mt) > rating_mod._FLOAT_CASES:
            count[0] += np.size(mt)
        return kernel(mt, *a, **kw)

    monkeypatch.setattr(rating_mod, "_iterate_one", iterate_counting)
    monkeypatch.setattr(tube_corr, "tube_side_kernel", kernel_counting)
    return count


@pytest.mark.parametrize("n", [2, 40], ids=["float path", "array path"])
def test_warm_started_rating_reaches_the_cold_outlets_with_fewer_evaluations(monkeypatch, n):
    ts, tt = np.linspace(560.0, 610.0, n), np.linspace(370.0, 420.0, n)
    svc = _service(ts, tt, n)
    count = _counting_evaluations(monkeypatch)
    cold = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False)
    from_inlets = count[0]
    # a start near the solution whose walls lag its outlets (as a network pass's prediction may): the walls'
    # steps count in the stop, so the outlets still come within the rating's 1e-6 K steps of the cold ones
    state = np.stack([cold.t_out_shell + 0.02, cold.t_out_tube - 0.02, cold.t_wall_shell + 3.0,
                      cold.t_wall_tube - 3.0])
    count[0] = 0
    with rating_mod.warm_start(state):
        warm = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False)
    np.testing.assert_allclose(warm.t_out_shell, cold.t_out_shell, rtol=0, atol=1e-5)
    np.testing.assert_allclose(warm.t_out_tube, cold.t_out_tube, rtol=0, atol=1e-5)
    np.testing.assert_allclose(warm.t_wall_tube, cold.t_wall_tube, rtol=0, atol=1e-4)
    assert count[0] < from_inlets


def test_a_looser_stop_moves_the_outlets_by_less_than_it():
    svc = _service(np.array([600.0, 560.0]), np.array([420.0, 380.0]), 2)
    tight = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False)
    loose = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                            tol=(0.5, 0.5))
    # stopped when the outlets moved by less than 0.5 K in a step; the iteration contracts, so the error is smaller
    assert np.all(np.abs(loose.t_out_tube - tight.t_out_tube) < 0.5)
    assert np.all(np.abs(loose.t_out_shell - tight.t_out_shell) < 0.5)


def test_chained_probe_blocks_on_the_array_path_reach_the_same_outlets(monkeypatch):
    ts, tt = np.linspace(560.0, 610.0, 12), np.linspace(370.0, 420.0, 12)
    p = sv._PROBE_K
    ts3, tt3 = np.concatenate([ts, ts + p, ts]), np.concatenate([tt, tt, tt + p])
    svc = _service(ts3, tt3, ts3.size)
    together = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                               blocks=3)  # 12 cases a block: below _CHAIN_CASES, one loop
    monkeypatch.setattr(rating_mod, "_CHAIN_CASES", 10)
    chained = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                              blocks=3)
    np.testing.assert_array_equal(chained.t_out_tube[:12], together.t_out_tube[:12])  # the base block alone
    np.testing.assert_allclose(chained.t_out_tube, together.t_out_tube, rtol=0, atol=1e-5)
    np.testing.assert_allclose(chained.t_out_shell, together.t_out_shell, rtol=0, atol=1e-5)
    # the finite differences the Newton step takes agree to ~1e-3 of the derivative
    d_chain = (chained.t_out_tube[12:24] - chained.t_out_tube[:12]) / p
    d_together = (together.t_out_tube[12:24] - together.t_out_tube[:12]) / p
    np.testing.assert_allclose(d_chain, d_together, rtol=0, atol=5e-4)


def test_sweep_ratings_agree_with_a_fresh_rating_at_the_solved_inlets():
    res = interlinked(np.linspace(40.0, 90.0, 12)).solve()
    assert np.all(res.converged)
    ex = res.exchangers
    for tag, m in res.train.exchangers.items():
        rows = ex.xs(tag, level="tag")
        col = lambda name: rows[name].to_numpy(float)  # noqa: E731
        own = rv.rate(m.exchanger, rv.Service(
            shell=rv.Stream(res.train.streams[m.shell].fluid, col("flow_shell"), col("t_in_shell")),
            tube=rv.Stream(res.train.streams[m.tube].fluid, col("flow_tube"), col("t_in_tube")),
            fouling_shell=m.fouling_shell, fouling_tube=m.fouling_tube))
        # the sweep's last ratings may start from their last states: within the rating's 1e-6 K steps [K]
        np.testing.assert_allclose(own.t_out_tube, rows["t_out_tube"].to_numpy(), rtol=0, atol=1e-5)
        np.testing.assert_allclose(own.t_out_shell, rows["t_out_shell"].to_numpy(), rtol=0, atol=1e-5)


def test_intermediate_passes_never_end_a_case():
    # a pass whose ratings stop at a looser step may not decide convergence: with every later pass forbidden,
    # a solve that needs more than its first pass reports no converged case
    res = interlinked().solve(max_iter=1)
    assert not res.converged
    assert "did not converge" in " ".join(res.warnings)


@pytest.mark.parametrize("n", [9, 40], ids=["arrays then floats", "arrays"])
def test_outlet_map_from_the_stopping_evaluations_equals_a_last_evaluation(n):
    # without pressure drops the outlet map takes each case's numbers from the evaluation it stopped at; with them
    # the engine evaluates every case once more at its stopping state: the same numbers (rounding only)
    svc = rv.Service(shell=rv.Stream(RESID_P, np.linspace(15.0, 35.0, n), 600.0),
                     tube=rv.Stream(CRUDE_P, 60.0, np.linspace(350.0, 420.0, n)),
                     fouling_shell=5e-4, fouling_tube=7e-4)
    kept = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False)
    again = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=True)
    for name in ("t_out_shell", "t_out_tube", "t_wall_shell", "t_wall_tube", "effectiveness", "C_shell", "C_tube"):
        np.testing.assert_allclose(getattr(kept, name), getattr(again, name), rtol=1e-13, atol=0)
    assert np.all(np.isnan(kept.dp_tube)) and np.all(np.isfinite(again.dp_tube))



def test_single_evaluation_outlet_map_equals_the_loops_first_step():
    # a relaxed pass (no stop: tol inf) evaluates once at its start without the loop's bookkeeping; the loop with a
    # stop no case can miss ends at that same first evaluation: the same numbers, bit for bit
    n = 40
    svc = rv.Service(shell=rv.Stream(RESID_P, np.linspace(15.0, 35.0, n), 600.0),
                     tube=rv.Stream(CRUDE_P, 60.0, np.linspace(350.0, 420.0, n)),
                     fouling_shell=5e-4, fouling_tube=7e-4)
    start = np.stack((np.full(n, 520.0), np.full(n, 430.0), np.full(n, 500.0), np.full(n, 450.0)))
    with rv.rating.warm_start(start):
        single = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                                 tol=(np.inf, np.inf))
        looped = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True, with_dp=False,
                                                 tol=(1e300, 1e300))
    for name in ("t_out_shell", "t_out_tube", "t_wall_shell", "t_wall_tube", "effectiveness", "C_shell", "C_tube",
                 "state"):
        np.testing.assert_array_equal(getattr(single, name), getattr(looped, name))
    np.testing.assert_array_equal(single.state, start)  # evaluated at its start, which it keeps

def _near_edge_service(ex, edge, n, spread=(0.97, 1.08)):
    """A residue on the shell side at flows that put its Re around a band edge of Taborek's fits (10^k)."""
    def service(flows):
        return rv.Service(shell=rv.Stream(RESID_P, flows, 580.0), tube=rv.Stream(CRUDE_P, 60.0, 450.0),
                          fouling_shell=3e-4, fouling_tube=5e-4)

    m = 10.0
    for _ in range(3):  # Re is nearly proportional to the flow: a flow that puts Re at the edge
        m *= edge / rv.rate(ex, service(m)).Re_shell
    return service(m * np.linspace(*spread, n))


def _warm_and_cold(ex, svc, restart=True, monkeypatch=None):
    cold = rv.rate(ex, svc)
    state = np.stack([cold.t_out_shell + 0.3, cold.t_out_tube - 0.3, cold.t_wall_shell + 2.0,
                      cold.t_wall_tube - 2.0])
    if not restart:  # the cases that took halved steps are not rated again from their inlets
        monkeypatch.setattr(rating_mod, "_cold_at_seam", lambda warm_case, halved, tol_case: np.zeros_like(warm_case))
        one = rating_mod._iterate_one
        monkeypatch.setattr(rating_mod, "_iterate_one", lambda *a, **kw: one(*a, **{**kw, "warm": False}))
    with rating_mod.warm_start(state):
        return rv.rate(ex, svc), cold


@pytest.mark.parametrize("n", [6, 300], ids=["float path", "array path"])
@pytest.mark.parametrize("edge", [100.0, 1000.0, 1e4])
def test_warm_started_case_near_a_blended_band_edge_agrees_with_one_from_its_inlets(n, edge):
    # the fits are blended across their band edges (continuous, with a continuous slope): a warm-started case near an
    # edge converges by the rating's own step, like any other, without being rated again from its inlets
    ex = hx(420)
    svc = _near_edge_service(ex, edge, n)
    warm, cold = _warm_and_cold(ex, svc)
    assert np.count_nonzero(rating_mod._near_seam(cold.Re_shell)) >= 2
    for name in ("t_out_tube", "t_out_shell"):  # within the rating's 1e-6 K steps [K]
        np.testing.assert_allclose(getattr(warm, name), getattr(cold, name), rtol=0, atol=1e-6)
    assert not any("settled only" in w for w in cold.warnings)


@pytest.mark.parametrize("n", [6, 300], ids=["float path", "array path"])
def test_warm_started_case_that_halves_its_steps_at_a_jump_is_rated_again_from_its_inlets(monkeypatch, n):
    # a map with a jump (here: Taborek's j made to jump threefold at Re = 1000; the real fits are blended) has no
    # fixed point in the jump: a case there halves its steps and settles at the looser 1e-3 K stop, where its start
    # decides; a warm-started case that halved its steps is rated again from its inlets, so that it settles where
    # rate() alone does
    from revamp.correlations import shell_bell

    jump, ln_edge = np.log(3.0), np.log(1000.0)
    fit, fit_one = shell_bell._fit_ln, shell_bell._fit_ln_float

    def jumping(lr, ln_ratio, fits):
        out = fit(lr, ln_ratio, fits)
        out[0] = out[0] + np.where(np.asarray(lr) > ln_edge, jump, 0.0)  # j only
        return out

    monkeypatch.setattr(shell_bell, "_fit_ln", jumping)
    monkeypatch.setattr(shell_bell, "_fit_ln_float", lambda Re, lr, ln_ratio, coefs: fit_one(Re, lr, ln_ratio, coefs)
                        + (float(jump) if lr > ln_edge else 0.0))
    ex = hx(420)
    svc = _near_edge_service(ex, 1000.0, n, spread=(0.97, 1.03))
    warm, cold = _warm_and_cold(ex, svc)
    assert any("settled only" in w for w in cold.warnings)  # some cases settle in the jump
    for name in ("t_out_tube", "t_out_shell"):
        np.testing.assert_allclose(getattr(warm, name), getattr(cold, name), rtol=0, atol=1e-6)
    # the rule is what makes them agree: without it the warm start settles some cases elsewhere in the jump
    plain, _ = _warm_and_cold(ex, svc, restart=False, monkeypatch=monkeypatch)
    assert np.max(np.abs(plain.t_out_tube - cold.t_out_tube)) > 1e-4


def test_sweep_closing_pass_starts_warm_and_gives_the_same_solution(monkeypatch):
    flows = np.linspace(40.0, 90.0, 30)
    warm = interlinked(flows).solve()
    # the plain form: the closing pass rated from the inlets, as rate() alone does
    real = sv._rate_all

    def cold_closing(plan, x, idx, probe=0.0, warm=None, tol=None, **kw):
        if tol is None and not probe:
            warm = None
        return real(plan, x, idx, probe=probe, warm=warm, tol=tol, **kw)

    monkeypatch.setattr(sv, "_rate_all", cold_closing)
    cold = interlinked(flows).solve()
    assert np.all(warm.converged) and np.all(cold.converged)
    for col in ("t_out_shell", "t_out_tube"):  # each rating within its 1e-6 K steps of the other [K]
        np.testing.assert_allclose(warm.exchangers[col].to_numpy(float), cold.exchangers[col].to_numpy(float),
                                   rtol=0, atol=1e-5)
    # duties of a few MW: 1e-5 K on a stream of ~150 kW/K is a few watts
    np.testing.assert_allclose(warm.exchangers["duty"].to_numpy(float), cold.exchangers["duty"].to_numpy(float),
                               rtol=1e-6, atol=0)


# ------------------------------------------------------------------ a sweep's single-evaluation (relaxed) passes
def _relaxed_calls(monkeypatch):
    """Record the stopping step ``tol`` of every pass's ratings (an infinite one: a single-evaluation pass)."""
    calls = []
    real = sv._rate_all

    def recording(plan, x, idx, tol=None, **kw):
        calls.append((tol, idx.size))
        return real(plan, x, idx, tol=tol, **kw)

    monkeypatch.setattr(sv, "_rate_all", recording)
    return calls


def test_relaxed_sweep_reaches_the_newton_solution_with_fewer_evaluations(monkeypatch):
    flows = np.linspace(40.0, 90.0, 30)
    calls = _relaxed_calls(monkeypatch)
    count = _counting_evaluations(monkeypatch)
    relaxed = interlinked(flows).solve()
    n_relaxed, evals_relaxed = sum(1 for tol, _ in calls if tol is not None and np.isinf(tol[0])), count[0]
    calls.clear()
    count[0] = 0
    monkeypatch.setattr(sv, "_RELAX_PASSES", 0)  # the Newton passes from the first one on
    newton = interlinked(flows).solve()
    assert n_relaxed >= 3 and not any(tol is not None and np.isinf(tol[0]) for tol, _ in calls)
    assert np.all(relaxed.converged) and np.all(newton.converged)
    assert evals_relaxed < count[0]
    for col in ("t_out_shell", "t_out_tube"):  # both solved to 1e-6 K, each rating within its 1e-6 K steps [K]
        np.testing.assert_allclose(relaxed.exchangers[col].to_numpy(float), newton.exchangers[col].to_numpy(float),
                                   rtol=0, atol=1e-5)
    np.testing.assert_allclose(relaxed.exchangers["duty"].to_numpy(float), newton.exchangers["duty"].to_numpy(float),
                               rtol=1e-6, atol=0)


def test_first_guess_balances_energy_and_places_the_first_pass_between_the_supplies(monkeypatch):
    # the guess gives every exchanger one effectiveness; its outlets then balance the heat of the two streams at
    # their supply heat capacities (the effectiveness-NTU definitions), and the first relaxed pass rates each
    # exchanger at the guessed inlets, which lie between the coldest and the hottest supply temperature
    tr = interlinked(np.linspace(40.0, 90.0, 12))
    plan = sv._Plan(tr)
    idx = np.arange(plan.ncase)
    x, _ = sv._linear_solve(plan, sv._initial(plan), sv._guessed_maps(plan, idx), idx)
    for tag, m in tr.exchangers.items():
        ps, pt = plan.port(tag, "shell"), plan.port(tag, "tube")
        cp_s = tr.streams[m.shell].fluid.props(plan.supply[m.shell]).heat_capacity
        cp_t = tr.streams[m.tube].fluid.props(plan.supply[m.tube]).heat_capacity
        c_s, c_t = plan.flow[m.shell] * cp_s, plan.flow[m.tube] * cp_t
        np.testing.assert_allclose(c_s * (x[:, ps] - x[:, ps + 1]), c_t * (x[:, pt + 1] - x[:, pt]), rtol=1e-12)
        q_max = np.minimum(c_s, c_t) * np.abs(x[:, ps] - x[:, pt])
        np.testing.assert_allclose(np.abs(c_s * (x[:, ps] - x[:, ps + 1])), sv._GUESS_EPS * q_max, rtol=1e-12)
    seen = []
    real = sv._rate_all

    def first_pass(plan_, xa, idx_, **kw):
        seen.append(xa.copy())
        return real(plan_, xa, idx_, **kw)

    monkeypatch.setattr(sv, "_rate_all", first_pass)
    tr.solve(max_iter=12)
    inlets = seen[0][:, [plan.port(t, s) for t in tr.exchangers for s in ("shell", "tube")]]
    np.testing.assert_array_equal(inlets, x[:, [plan.port(t, s) for t in tr.exchangers for s in ("shell", "tube")]])
    supplies = [plan.supply[s] for s in tr.streams]
    assert np.all(inlets >= np.min(supplies) - 1e-9) and np.all(inlets <= np.max(supplies) + 1e-9)
    for tag in ("E-102", "E-104"):  # the crude reaches them heated, not at its supply temperature
        assert np.all(seen[0][:, plan.port(tag, "tube")] > plan.supply["crude"] + 10.0)


def test_relaxed_passes_never_end_a_case(monkeypatch):
    # a single-evaluation pass only steers the next one: with the passes cut short, nothing converged
    calls = _relaxed_calls(monkeypatch)
    monkeypatch.setattr(sv, "_RELAX_RESERVE", 0)  # relaxed passes up to max_iter
    res = interlinked(np.linspace(40.0, 90.0, 12)).solve(max_iter=4)
    assert len(calls) == 5  # four passes, then every case rated at its last inlets for the result
    assert all(tol is not None and np.isinf(tol[0]) for tol, _ in calls[:4])
    assert not np.any(res.converged)


def test_constant_property_sweep_takes_no_relaxed_pass(monkeypatch):
    # with constant properties the first pass's linear step is already exact but for the wall's conductivity
    calls = _relaxed_calls(monkeypatch)
    kero = rv.fluids.constant(density=760.0, heat_capacity=2500.0, viscosity=0.6e-3, conductivity=0.13)
    crude = rv.fluids.constant(density=830.0, heat_capacity=2300.0, viscosity=2.0e-3, conductivity=0.12)
    tr = Train(streams={"crude": rv.Stream(crude, np.linspace(40.0, 90.0, 12), "35 degC"),
                        "kero": rv.Stream(kero, 38, "190 degC")},
               exchangers={"E-1": Match(hx(), shell="kero", tube="crude")},
               routes={"crude": ["E-1"], "kero": ["E-1"]})
    assert np.all(tr.solve().converged)
    assert not any(tol is not None and np.isinf(tol[0]) for tol, _ in calls)


def test_constant_property_sweep_takes_plain_passes_to_the_one_case_solutions(monkeypatch):
    # constant-property streams on a carbon-steel tube (its conductivity depends on temperature): a sweep takes
    # plain passes, no probes, and reaches what each case's own solve (with its Newton probes) reaches
    kero = rv.fluids.constant(density=760.0, heat_capacity=2500.0, viscosity=0.6e-3, conductivity=0.13)
    crude = rv.fluids.constant(density=830.0, heat_capacity=2300.0, viscosity=2.0e-3, conductivity=0.12)
    resid = rv.fluids.constant(density=900.0, heat_capacity=2700.0, viscosity=4e-3, conductivity=0.11)

    def train(flow):
        return Train(streams={"crude": rv.Stream(crude, flow, "35 degC"), "resid": rv.Stream(resid, 30, "340 degC"),
                              "kero": rv.Stream(kero, 38, "190 degC")},
                     exchangers={"E-101": Match(hx(), shell="kero", tube="crude", fouling_tube=5e-4),
                                 "E-102": Match(hx(420), shell="resid", tube="crude", fouling_shell=5e-4),
                                 "E-104": Match(hx(460), shell="resid", tube="crude", fouling_shell=5e-4)},
                     routes={"crude": ["E-101", "E-102", "E-104"], "resid": ["E-104", "E-102"], "kero": ["E-101"]})

    flows = np.linspace(40.0, 90.0, 12)
    probes = []
    real = sv._rate_all

    def recording(plan, x, idx, probe=0.0, **kw):
        probes.append((idx.size, probe))
        return real(plan, x, idx, probe=probe, **kw)

    monkeypatch.setattr(sv, "_rate_all", recording)
    sweep = train(flows).solve()
    assert np.all(sweep.converged) and not any(p for _, p in probes)
    probes.clear()
    for k in (0, 7, 11):
        one = train(flows[k]).solve()
        assert one.converged
        rows = sweep.exchangers.xs(k, level="case")
        for col in ("t_out_shell", "t_out_tube"):  # both to 1e-6 K, each rating within its 1e-6 K steps [K]
            np.testing.assert_allclose(rows[col].to_numpy(float), one.exchangers[col].to_numpy(float), atol=1e-5,
                                       rtol=0)
    assert any(p for _, p in probes)  # a one-case solve keeps its probes


def test_relaxed_passes_hand_over_to_newton_when_slow(monkeypatch):
    # a train whose relaxed passes converge slowly (here: any case needing one more counts as slow) goes on with
    # Newton passes after three relaxed ones, to the same solution
    flows = np.linspace(40.0, 90.0, 12)
    calls = _relaxed_calls(monkeypatch)
    monkeypatch.setattr(sv, "_RELAX_LEFT", 0)
    handed = interlinked(flows).solve()
    assert sum(1 for tol, _ in calls if tol is not None and np.isinf(tol[0])) == 3
    assert any(tol is not None and not np.isinf(tol[0]) and tol[0] > 0 for tol, _ in calls[3:])  # Newton passes
    monkeypatch.undo()
    plain = interlinked(flows).solve()
    assert np.all(handed.converged) and np.all(plain.converged)
    np.testing.assert_allclose(handed.exchangers["t_out_tube"].to_numpy(float),
                               plain.exchangers["t_out_tube"].to_numpy(float), rtol=0, atol=1e-5)


def test_relax_exit_rules():
    tol = 1e-6
    # ready: expected within tol/2 after the next pass (its change times the larger of its last and mean falls)
    ready, to_newton = sv._relax_exit(np.array([1e-5, 4e-6, 1e-5]), np.array([0.04, 0.1, 0.02]),
                                      np.array([0.04, 0.1, 0.2]), 5, tol)
    assert ready.tolist() == [True, True, False] and not to_newton
    # a loose tol: ready only within half of _RELAX_READY (the closing ratings stop at their own 1e-6 K steps)
    ready, _ = sv._relax_exit(np.array([1e-3, 1e-4]), np.array([0.1, 0.1]), np.array([0.1, 0.1]), 5, 1e-3)
    assert ready.tolist() == [False, True]
    # a failed case (no finite change) does not hold the others back
    ready, _ = sv._relax_exit(np.array([np.nan]), np.array([1.0]), np.array([1.0]), 5, tol)
    assert ready.tolist() == [True]
    # the median case would need more than _RELAX_LEFT more passes at its mean fall: Newton (from the fourth on)
    slow = (np.array([1.0, 1.0, 1e-3]), np.array([0.5, 0.5, 0.1]), np.array([0.5, 0.5, 0.1]))
    assert sv._relax_exit(*slow, 3, tol)[1] and not sv._relax_exit(*slow, 2, tol)[1]
    fast = (np.array([1.0, 1.0, 1e-3]), np.array([0.1, 0.1, 0.1]), np.array([0.1, 0.1, 0.1]))
    assert not sv._relax_exit(*fast, 3, tol)[1]


@pytest.mark.parametrize("n", [12, 300], ids=["few", "many"])
def test_settled_cases_are_evaluated_once_where_their_rating_stopped(monkeypatch, n):
    # a sweep builds its Ratings at the states its closing ratings stopped at: the same numbers as a rating from
    # the inlets (the same evaluation at the same state), with one evaluation instead of the iteration
    svc = rv.Service(shell=rv.Stream(RESID_P, np.linspace(15.0, 35.0, n), 600.0),
                     tube=rv.Stream(CRUDE_P, 60.0, np.linspace(350.0, 420.0, n)), fouling_shell=5e-4,
                     fouling_tube=7e-4)
    cold = rv.rate(hx(420), svc)
    stopped = rating_mod._rate_shell_and_tube(hx(420), svc, "bell-delaware", outlets_only=True).state
    count = _counting_evaluations(monkeypatch)
    with rating_mod.warm_start(stopped, np.ones(n, dtype=bool)):
        again = rv.rate(hx(420), svc)
    assert count[0] == n  # the one evaluation that builds the results, no iteration
    for name in ("t_out_shell", "t_out_tube", "duty", "U_service", "dp_shell", "dp_tube"):
        np.testing.assert_array_equal(getattr(again, name), getattr(cold, name))
    # half settled: the others iterate from the (moved) state they were given, to within the rating's steps
    half = np.arange(n) % 2 == 0
    moved = stopped + np.array([[0.3], [-0.3], [2.0], [-2.0]])
    with rating_mod.warm_start(np.where(half, stopped, moved), half):
        mixed = rv.rate(hx(420), svc)
    np.testing.assert_array_equal(mixed.t_out_tube[half], cold.t_out_tube[half])
    np.testing.assert_allclose(mixed.t_out_tube, cold.t_out_tube, rtol=0, atol=1e-5)


@pytest.mark.parametrize("max_iter", [6, 12])
def test_relaxed_passes_leave_room_for_the_closing_ones(monkeypatch, max_iter):
    # a caller's smaller max_iter: relaxed passes stop _RELAX_RESERVE passes short of it (none below three), so the
    # sweep still converges within max_iter passes, to the solution of an unbounded solve
    flows = np.linspace(40.0, 90.0, 12)
    calls = _relaxed_calls(monkeypatch)
    res = interlinked(flows).solve(max_iter=max_iter)
    relaxed = sum(1 for tol, _ in calls if tol is not None and np.isinf(tol[0]))
    assert relaxed == (0 if max_iter - sv._RELAX_RESERVE < 3 else max_iter - sv._RELAX_RESERVE)
    assert np.all(res.converged) and res.iterations <= max_iter
    free = interlinked(flows).solve()
    np.testing.assert_allclose(res.exchangers["t_out_tube"].to_numpy(float),
                               free.exchangers["t_out_tube"].to_numpy(float), rtol=0, atol=1e-5)
