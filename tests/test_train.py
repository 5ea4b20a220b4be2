"""Tests of the train network solve (revamp.train).

Sources: the energy balance of each stream and the effectiveness-NTU definitions (q = ε·C_min·(T_hot,in - T_cold,in),
C·ΔT on each side; Kays & London 1984, ch. 2), which with constant properties and a constant wall conductivity make
every exchanger's effectiveness independent of its inlet temperatures: the train is then a linear system in the
temperatures, written out independently below and solved with numpy. All units, geometry and fluids are invented.
"""
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import options as op
from revamp.errors import InputError
from revamp.train import Furnace, Match, Point, Split, Train

C2K = 273.15
# constant-property fluids (invented, crude-like, residue-like and kerosene-like)
CRUDE_C = rv.fluids.constant(density=830.0, heat_capacity=2300.0, viscosity=2.0e-3, conductivity=0.12, name="crude")
RESID_C = rv.fluids.constant(density=900.0, heat_capacity=2600.0, viscosity=4.0e-3, conductivity=0.11, name="resid")
KERO_C = rv.fluids.constant(density=760.0, heat_capacity=2500.0, viscosity=0.6e-3, conductivity=0.13, name="kero")
# petroleum fractions (temperature-dependent properties)
CRUDE_P = rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")])
RESID_P = rv.fluids.petroleum(api=18, watson_k=11.6, viscosity=[("100 degC", "30 cSt"), ("150 degC", "9 cSt")])
KERO_P = rv.fluids.petroleum(api=45, watson_k=11.7, viscosity=[("40 degC", "1.5 cSt"), ("100 degC", "0.75 cSt")])


def hx(tube_count=500, passes=2, k_wall=45.0, **kw):
    """An invented AES-like exchanger; a number as tube material is a constant wall conductivity [W/m/K]."""
    return rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                           tube_count=tube_count, tube_passes=passes, tube_pitch="25.4 mm", layout=90,
                           baffle_spacing="450 mm", baffle_cut=0.25, tube_material=k_wall, **kw)


def interlinked(crude, resid, kero, crude_flow="60 kg/s", resid_in="340 degC", **train_kw):
    """Crude through E-101, E-102, E-104 while the residue goes E-104 then E-102 (a loop across two streams)."""
    return Train(
        streams={"crude": rv.Stream(crude, crude_flow, "35 degC"), "resid": rv.Stream(resid, "30 kg/s", resid_in),
                 "kero": rv.Stream(kero, "38 kg/s", "190 degC")},
        exchangers={"E-101": Match(hx(), shell="kero", tube="crude", fouling_shell=2e-4, fouling_tube=5e-4),
                    "E-102": Match(hx(420), shell="resid", tube="crude", fouling_shell=5e-4, fouling_tube=7e-4),
                    "E-104": Match(hx(460), shell="resid", tube="crude", fouling_shell=5e-4, fouling_tube=7e-4)},
        routes={"crude": ["E-101", "E-102", "E-104"], "resid": ["E-104", "E-102"], "kero": ["E-101"]},
        **train_kw)


@pytest.fixture(scope="module")
def linear():
    return interlinked(CRUDE_C, RESID_C, KERO_C, furnace=Furnace("crude", "360 degC", 0.85, "60 MW")).solve()


@pytest.fixture(scope="module")
def real():
    return interlinked(CRUDE_P, RESID_P, KERO_P, furnace=Furnace("crude", "360 degC", 0.85, "60 MW")).solve()


def _hand_linear_system(res):
    """The train as a linear system, built from the engine's ε and C of each exchanger (ε-NTU definitions).

    Unknowns: crude after E-101, E-102, E-104 (c1, c2, c4); residue after E-104 and E-102 (r4, r2); kero after E-101
    (k1). For an exchanger with hot inlet Th, cold inlet Tc: q = ε·Cmin·(Th - Tc); Th_out = Th - q/Ch;
    Tc_out = Tc + q/Cc (the shell side is the hot side in all three).
    """
    tc0, tr0, tk0 = 35 + C2K, 340 + C2K, 190 + C2K
    a = {}
    for tag, r in res.ratings.items():
        cmin = min(r.C_shell, r.C_tube)
        a[tag] = (r.effectiveness * cmin / r.C_shell, r.effectiveness * cmin / r.C_tube)  # (hot, cold)
    # order: c1, c2, c4, r4, r2, k1
    A, b = np.zeros((6, 6)), np.zeros(6)
    ah, ac = a["E-101"]   # kero (hot, tk0) vs crude (cold, tc0)
    A[0, 0] = 1; b[0] = tc0 + ac * (tk0 - tc0)                         # c1
    A[5, 5] = 1; b[5] = tk0 - ah * (tk0 - tc0)                         # k1
    ah, ac = a["E-102"]   # residue in = r4, crude in = c1
    A[1, 1] = 1; A[1, 0] = -(1 - ac); A[1, 3] = -ac                    # c2 = c1 + ac (r4 - c1)
    A[4, 4] = 1; A[4, 3] = -(1 - ah); A[4, 0] = -ah                    # r2 = r4 - ah (r4 - c1)
    ah, ac = a["E-104"]   # residue in = tr0, crude in = c2
    A[2, 2] = 1; A[2, 1] = -(1 - ac); b[2] = ac * tr0                  # c4 = c2 + ac (tr0 - c2)
    A[3, 3] = 1; A[3, 1] = -ah; b[3] = (1 - ah) * tr0                  # r4 = tr0 - ah (tr0 - c2)
    return dict(zip(["c1", "c2", "c4", "r4", "r2", "k1"], np.linalg.solve(A, b)))


def test_linear_train_matches_numpy_solution(linear):
    res = linear
    assert res.converged
    sol = _hand_linear_system(res)
    ex = res.exchangers
    # energy balance and ε-NTU definitions: the network solve equals the hand-built linear system to 1e-6 K
    assert ex.loc["E-101", "t_out_tube"] == pytest.approx(sol["c1"], abs=1e-6)
    assert ex.loc["E-102", "t_out_tube"] == pytest.approx(sol["c2"], abs=1e-6)
    assert ex.loc["E-104", "t_out_tube"] == pytest.approx(sol["c4"], abs=1e-6)
    assert ex.loc["E-104", "t_out_shell"] == pytest.approx(sol["r4"], abs=1e-6)
    assert ex.loc["E-102", "t_out_shell"] == pytest.approx(sol["r2"], abs=1e-6)
    assert ex.loc["E-101", "t_out_shell"] == pytest.approx(sol["k1"], abs=1e-6)
    assert res.furnace_inlet == pytest.approx(sol["c4"], abs=1e-6)
    assert res.final_temperatures["resid"] == pytest.approx(sol["r2"], abs=1e-6)


def test_constant_properties_make_effectiveness_independent_of_inlets(linear):
    # the premise of the linear check: ε of a constant-property exchanger does not move with its inlets
    r = linear.ratings["E-102"]
    moved = rv.rate(r.exchanger, r.service.replace(shell=r.service.shell.replace(t_in=r.service.shell.t_in + 40)))
    assert moved.effectiveness == pytest.approx(r.effectiveness, rel=1e-9)


@pytest.mark.parametrize("which", ["linear", "real"])
def test_each_rating_reproduces_its_solved_outlets(which, request):
    res = request.getfixturevalue(which)
    assert res.converged
    ex = res.exchangers
    for tag, m in res.train.exchangers.items():
        own = rv.rate(m.exchanger, rv.Service(
            shell=rv.Stream(res.train.streams[m.shell].fluid, ex.loc[tag, "flow_shell"], ex.loc[tag, "t_in_shell"]),
            tube=rv.Stream(res.train.streams[m.tube].fluid, ex.loc[tag, "flow_tube"], ex.loc[tag, "t_in_tube"]),
            fouling_shell=m.fouling_shell, fouling_tube=m.fouling_tube))
        # the closing ratings start from the state the last linear step predicts: they stop within the rating's own
        # 1e-6 K step of a rating from the inlets, and the duty within that step times the capacity rate
        assert own.t_out_shell == pytest.approx(ex.loc[tag, "t_out_shell"], abs=1e-6)
        assert own.t_out_tube == pytest.approx(ex.loc[tag, "t_out_tube"], abs=1e-6)
        assert own.duty == pytest.approx(ex.loc[tag, "duty"], abs=1e-6 * own.C_tube)
    # each outlet feeds the next inlet on its route (within the solve tolerance)
    assert ex.loc["E-102", "t_in_tube"] == pytest.approx(ex.loc["E-101", "t_out_tube"], abs=1e-5)
    assert ex.loc["E-104", "t_in_tube"] == pytest.approx(ex.loc["E-102", "t_out_tube"], abs=1e-5)
    assert ex.loc["E-102", "t_in_shell"] == pytest.approx(ex.loc["E-104", "t_out_shell"], abs=1e-5)
    assert ex.loc["E-104", "t_in_shell"] == pytest.approx(340 + C2K, abs=1e-9)


def test_enthalpy_balances_close(linear):
    res = linear
    ex, s = res.exchangers, res.streams
    for tag in ex.index:  # each exchanger: heat lost by the hot side = heat taken by the cold side
        r = res.ratings[tag]
        assert r.C_shell * (ex.loc[tag, "t_in_shell"] - ex.loc[tag, "t_out_shell"]) == pytest.approx(
            r.C_tube * (ex.loc[tag, "t_out_tube"] - ex.loc[tag, "t_in_tube"]), rel=1e-9)
    # constant cp: each stream's heat = m·cp·(final - supply); hot streams give what the crude takes
    for name, cp in (("crude", 2300.0), ("resid", 2600.0), ("kero", 2500.0)):
        assert s.loc[name, "duty"] == pytest.approx(s.loc[name, "flow"] * cp * (s.loc[name, "final"] -
                                                                                 s.loc[name, "supply"]), rel=1e-6)
    assert s["duty"].sum() == pytest.approx(0.0, abs=1e-6 * s.loc["crude", "duty"])
    # furnace: absorbed = m·cp·(outlet - inlet), fired = absorbed / efficiency
    assert res.furnace_absorbed == pytest.approx(60 * 2300.0 * (360 + C2K - res.furnace_inlet), rel=1e-9)
    assert res.furnace_duty == pytest.approx(res.furnace_absorbed / 0.85, rel=1e-12)


def test_upstream_gain_partly_lost_downstream(linear):
    base = linear
    cleaned = base.train.apply({"E-101": op.Clean()}).solve()
    # E-101's own duty gain at the base inlets, rated alone
    r = base.ratings["E-101"]
    isolated = rv.rate(r.exchanger, r.service.clean()).duty - r.duty
    assert isolated > 0
    gain_e101 = cleaned.exchangers.loc["E-101", "duty"] - base.exchangers.loc["E-101", "duty"]
    rise = cleaned.furnace_inlet - base.furnace_inlet
    assert rise > 0
    # the furnace inlet rises by less than E-101's extra duty alone would raise it (m·cp·ΔT < ΔQ)
    assert 60 * 2300.0 * rise < gain_e101
    # downstream exchangers recover less
    for tag in ("E-102", "E-104"):
        assert cleaned.exchangers.loc[tag, "duty"] < base.exchangers.loc[tag, "duty"]
    # fuel saved comes from the train: smaller than the isolated duty gain over the efficiency
    saved = base.furnace_duty - cleaned.furnace_duty
    assert 0 < saved < isolated / 0.85


def test_sweep_broadcasts_and_matches_single_solves():
    flows = np.array([45.0, 60.0, 75.0])
    sweep = interlinked(CRUDE_P, RESID_P, KERO_P, crude_flow=flows,
                        furnace=Furnace("crude", "360 degC", 0.85)).solve()
    assert np.shape(sweep.furnace_inlet) == (3,) and np.all(sweep.converged)
    for i, f in enumerate(flows):
        one = interlinked(CRUDE_P, RESID_P, KERO_P, crude_flow=f, furnace=Furnace("crude", "360 degC", 0.85)).solve()
        assert sweep.furnace_inlet[i] == pytest.approx(one.furnace_inlet, abs=1e-5)
        assert sweep.exchangers.loc[("E-102", i), "duty"] == pytest.approx(one.exchangers.loc["E-102", "duty"],
                                                                           rel=1e-7)


@settings(max_examples=5, deadline=None)
@given(flow=st.floats(30, 90), resid_in=st.floats(280, 360))
def test_energy_conservation_over_the_train(flow, resid_in):
    # what the hot streams give, the crude takes (no loss term in the network)
    res = interlinked(CRUDE_P, RESID_P, KERO_P, crude_flow=flow, resid_in=resid_in + C2K).solve()
    s = res.streams
    assert res.converged
    assert s["duty"].sum() == pytest.approx(0.0, abs=1e-7 * abs(s.loc["crude", "duty"]))
    # second law: no stream leaves hotter than the hottest supply or colder than the coldest
    assert s["final"].max() <= s["supply"].max() and s["final"].min() >= s["supply"].min()


def test_split_point_and_rundown():
    tr = Train(
        streams={"crude": rv.Stream(CRUDE_C, "60 kg/s", "35 degC"), "resid": rv.Stream(RESID_C, "30 kg/s", "340 degC"),
                 "kero": rv.Stream(KERO_C, "38 kg/s", "190 degC")},
        exchangers={"E-101": Match(hx(), shell="kero", tube="crude"),
                    "E-103A": Match(hx(300), shell="resid", tube="crude"),
                    "E-103B": Match(hx(300), shell="kero", tube="crude")},
        routes={"crude": ["E-101", Point("desalter", "60 degC", "150 degC"),
                          Split([["E-103A"], ["E-103B"]], [0.4, 0.6])],
                "resid": ["E-103A"], "kero": ["E-103B", "E-101"]},
        rundown={"resid": "150 degC"})
    res = tr.solve()
    ex = res.exchangers
    assert ex.loc["E-103A", "flow_tube"] == pytest.approx(0.4 * 60) and ex.loc["E-103B", "flow_tube"] == \
        pytest.approx(0.6 * 60)
    # the desalter sees the crude leaving E-101
    assert res.points.loc["desalter", "temperature"] == pytest.approx(ex.loc["E-101", "t_out_tube"], abs=1e-9)
    # remix of constant-cp branches: the mass-weighted mean (energy balance of mixing)
    mix = 0.4 * ex.loc["E-103A", "t_out_tube"] + 0.6 * ex.loc["E-103B", "t_out_tube"]
    assert res.final_temperatures["crude"] == pytest.approx(mix, abs=1e-9)
    # trim cooler takes the residue from its final temperature to the rundown limit: m·cp·ΔT
    final = res.final_temperatures["resid"]
    assert final > 150 + C2K
    assert res.streams.loc["resid", "trim_duty"] == pytest.approx(30 * 2600.0 * (final - 150 - C2K), rel=1e-9)
    # the crude's pressure drop: in series, added; across the branches, the larger one (the other branch is
    # throttled to match: common practice, no source)
    dp = ex.loc["E-101", "dp_tube"] + max(ex.loc["E-103A", "dp_tube"], ex.loc["E-103B", "dp_tube"])
    assert res.streams.loc["crude", "dp"] == pytest.approx(dp, rel=1e-12)
    ok = {c.name: c.ok for c in res.limits}
    assert ok["desalter temperature"] == (60 + C2K <= res.points.loc["desalter", "temperature"] <= 150 + C2K)


def test_non_convergence_is_reported_not_hidden():
    res = interlinked(CRUDE_P, RESID_P, KERO_P).solve(max_iter=2)
    assert res.converged is False
    assert any("did not converge" in w for w in res.warnings)
    assert res.all_ok is False


def _base_kw():
    return dict(streams={"crude": rv.Stream(CRUDE_C, 60.0, 308.15), "kero": rv.Stream(KERO_C, 38.0, 463.15)},
                exchangers={"E-101": Match(hx(), shell="kero", tube="crude"),
                            "E-102": Match(hx(), shell="kero", tube="crude")},
                routes={"crude": ["E-101", "E-102"], "kero": ["E-102", "E-101"]})


@pytest.mark.parametrize("change, path", [
    ({"routes": {"crude": ["E-101", "E-102", "E-101"], "kero": ["E-102", "E-101"]}}, "routes['crude'][2]"),
    ({"routes": {"crude": ["E-101", "E-102"], "kero": ["E-102", "E-101"], "naphtha": ["E-101"]}},
     "routes['naphtha']"),
    ({"routes": {"crude": ["E-101", "E-109"], "kero": ["E-102", "E-101"]}}, "routes['crude'][1]"),
    ({"routes": {"crude": ["E-101"], "kero": ["E-102", "E-101"]}}, "exchangers['E-102'].tube"),
    ({"furnace": Furnace("vacuum residue", "360 degC")}, "furnace.stream"),
    ({"routes": {"crude": [Split([["E-101"], ["E-102"]], [0.5, 0.5])], "kero": ["E-102", "E-101"]},
      "rundown": {"diesel": 400.0}}, "rundown['diesel']"),
])
def test_bad_networks_are_path_named(change, path):
    kw = _base_kw()
    kw.update(change)
    with pytest.raises(InputError) as info:
        Train(**kw)
    assert info.value.field == path


def test_bad_parts_are_path_named():
    kw = _base_kw()
    kw["exchangers"] = {**kw["exchangers"], "E-101": Match(hx(), shell="diesel", tube="crude")}
    with pytest.raises(InputError) as info:
        Train(**kw)
    assert info.value.field == "exchangers['E-101'].shell"
    with pytest.raises(InputError) as info:  # flows that do not balance at a remix
        Split([["E-101"], ["E-102"]], [0.5, 0.6])
    assert info.value.field == "fractions"
    with pytest.raises(InputError) as info:
        Match(hx(), shell="crude", tube="crude")
    assert info.value.field == "tube"
    with pytest.raises(InputError) as info:
        Train(**_base_kw()).apply({"E-107": op.Clean()})
    assert info.value.field == "options['E-107']"


# ------------------------------------------------------------------------------------------- options and throughput
ECON = {"energy_price": 9.0, "price_per": "GJ", "operating_time": "8000 h", "discount_rate": 0.1, "horizon": 10,
        "capex": {"clean E-102": 60e3, "inserts E-101 + clean E-104": 250e3}}
SETS = {"clean E-102": {"E-102": op.Clean()},
        "inserts E-101 + clean E-104": {"E-101": op.TwistedTape(4.0), "E-104": op.Clean()}}


@pytest.fixture(scope="module")
def study():
    tr = interlinked(CRUDE_C, RESID_C, KERO_C, furnace=Furnace("crude", "360 degC", 0.85, "60 MW"))
    return tr, rv.compare_train(tr, SETS, economics=ECON)


def test_compare_train_rows_are_train_solves(study):
    tr, s = study
    t = s.table
    assert list(t.index) == ["base", *SETS]
    for label, opts in SETS.items():
        direct = tr.apply(opts).solve()
        assert t.loc[label, "furnace_inlet"] == pytest.approx(direct.furnace_inlet, abs=1e-6)
        assert t.loc[label, "furnace_duty"] == pytest.approx(direct.furnace_duty, rel=1e-9)
        saved = t.loc["base", "furnace_duty"] - direct.furnace_duty
        assert t.loc[label, "furnace_duty_saved"] == pytest.approx(saved, rel=1e-6)
        for tag in tr.exchangers:
            assert t.loc[label, f"duty {tag}"] == pytest.approx(direct.exchangers.loc[tag, "duty"], rel=1e-9)
        # money by hand: saved fired duty [W] × 8000 h × 3600 s/h / 1e9 J/GJ × 9 per GJ
        value = saved * 8000 * 3600 / 1e9 * 9.0
        assert t.loc[label, "annual_value"] == pytest.approx(value, rel=1e-6)
        assert t.loc[label, "payback"] == pytest.approx(ECON["capex"][label] / value, rel=1e-6)
        # NPV = -capex + value × (1 - 1.1^-10) / 0.1 (annuity factor, Brealey, Myers & Allen 2020, ch. 2)
        assert t.loc[label, "npv"] == pytest.approx(-ECON["capex"][label] + value * (1 - 1.1 ** -10) / 0.1,
                                                    rel=1e-6)


def test_compare_train_does_not_double_count(study):
    _, s = study
    label = "inserts E-101 + clean E-104"
    saved_absorbed = s.table.loc[label, "furnace_duty_saved"] * 0.85
    # the exchangers' gains rated one by one at the base inlets add up to more than the train recovers
    assert s.isolated_gains.loc[label].sum() > saved_absorbed
    # and the train's duty changes show an exchanger downstream losing duty
    assert (s.duty_changes.loc[label] < 0).any() or (s.duty_changes.loc["clean E-102"] < 0).any()


def test_max_throughput_stops_at_the_binding_limit():
    tr = interlinked(CRUDE_C, RESID_C, KERO_C, furnace=Furnace("crude", "360 degC", 0.85, "40 MW"))
    tp = tr.max_throughput("crude", low=0.5, high=2.0, points=21)
    assert tp.binding == ("furnace duty",)
    below = tr.scaled(tp.factor, "crude").solve()
    above = tr.scaled(tp.factor + tp.resolution, "crude").solve()
    assert below.furnace_duty <= 40e6 < above.furnace_duty
    # an allowed tube-side pressure drop on E-101 binds first when tight enough
    m = tr.exchangers["E-101"]
    dp_today = tr.solve().exchangers.loc["E-101", "dp_tube"]
    tight = tr.replace(exchangers={**tr.exchangers, "E-101": m.replace(dp_max_tube=1.05 * dp_today)})
    tp2 = tight.max_throughput("crude", points=21)
    assert tp2.binding == ("E-101 dp_tube",) and 1.0 < tp2.factor < tp.factor
    assert tp2.result.exchangers.loc["E-101", "dp_tube"] <= 1.05 * dp_today


def test_compare_train_throughput_is_on_todays_flow():
    tr = interlinked(CRUDE_C, RESID_C, KERO_C, furnace=Furnace("crude", "360 degC", 0.85, "40 MW"))
    s = rv.compare_train(tr, {"clean E-101": {"E-101": op.Clean()}}, revamp=1.2, throughput=True, points=11)
    own = tr.max_throughput(points=11)
    assert s.table.loc["base", "max_throughput"] == pytest.approx(own.factor, rel=1e-12)
    cleaned = tr.apply({"E-101": op.Clean()}).max_throughput(points=11)
    assert s.table.loc["clean E-101", "max_throughput"] == pytest.approx(cleaned.factor, rel=1e-12)
    # more heat recovered before the furnace: its duty limit is reached at a larger flow (physics, no source needed)
    assert cleaned.factor > own.factor and cleaned.binding == ("furnace duty",)


def test_bypass_branch_mixes_back_at_the_inlet_temperature():
    tr = Train(streams={"crude": rv.Stream(CRUDE_C, "60 kg/s", "35 degC"),
                        "kero": rv.Stream(KERO_C, "38 kg/s", "190 degC")},
               exchangers={"E-101": Match(hx(), shell="kero", tube="crude")},
               routes={"crude": [Split([["E-101"], []], [0.7, 0.3])], "kero": ["E-101"]})
    res = tr.solve()
    ex = res.exchangers
    assert ex.loc["E-101", "flow_tube"] == pytest.approx(42.0)
    # constant cp: the remix is the mass-weighted mean of the exchanger outlet and the bypassed crude (energy balance)
    assert res.final_temperatures["crude"] == pytest.approx(0.7 * ex.loc["E-101", "t_out_tube"] + 0.3 * 308.15,
                                                            abs=1e-9)
    assert res.streams.loc["crude", "duty"] == pytest.approx(60 * 2300.0 * (res.final_temperatures["crude"] - 308.15),
                                                             rel=1e-9)


def test_equal_pressure_drop_split():
    def split_train(n_a, n_b, flow="60 kg/s"):
        return Train(streams={"crude": rv.Stream(CRUDE_C, flow, "35 degC"),
                              "kero": rv.Stream(KERO_C, "38 kg/s", "190 degC")},
                     exchangers={"A": Match(hx(n_a), shell="kero", tube="crude"),
                                 "B": Match(hx(n_b), shell="kero", tube="crude")},
                     routes={"crude": [Split([["A"], ["B"]], "equal_dp")], "kero": ["A", "B"]})

    # identical branches: half the flow each (symmetry)
    res = split_train(400, 400).solve()
    assert res.converged
    assert res.exchangers.loc["A", "flow_tube"] == pytest.approx(30.0, rel=1e-6)
    # different branches: the definition, equal pressure drops, with the flows balancing at the remix
    for flow in ("60 kg/s", np.array([40.0, 80.0])):
        res = split_train(300, 500, flow).solve()
        ex = res.exchangers
        assert np.all(res.converged)
        dp_a, dp_b = (ex.xs(t, level="tag") if res.shape else ex.loc[[t]] for t in ("A", "B"))
        assert np.allclose(dp_a["dp_tube"].to_numpy(), dp_b["dp_tube"].to_numpy(), rtol=1e-4)
        total = dp_a["flow_tube"].to_numpy() + dp_b["flow_tube"].to_numpy()
        assert np.allclose(total, np.broadcast_to(np.asarray(flow if not isinstance(flow, str) else 60.0), total.shape))
        # the bigger bundle (more tubes, lower velocity) takes more of the flow
        assert np.all(dp_b["flow_tube"].to_numpy() > dp_a["flow_tube"].to_numpy())
    with pytest.raises(InputError) as info:
        Split([["A"], []], "equal_dp")
    assert info.value.field == "branches[1]"


def _viscous_split(flow):
    return Train(streams={"crude": rv.Stream(CRUDE_P, flow, "35 degC"), "kero": rv.Stream(KERO_P, 38, "190 degC"),
                          "resid": rv.Stream(RESID_P, 30, "340 degC")},
                 exchangers={"A": Match(hx(300), shell="kero", tube="crude"),
                             "B": Match(hx(400), shell="kero", tube="crude"),
                             "C": Match(hx(420), shell="resid", tube="crude")},
                 routes={"crude": [Split([["A"], ["B"]], "equal_dp"), "C"], "kero": ["A", "B"], "resid": ["C"]})


def _equal_dp_holds(res, flow):
    # the definition: equal branch pressure drops, with the flows balancing at the remix (no source needed)
    ex = res.exchangers
    dp_a, dp_b = (ex.xs(t, level="tag") if res.shape else ex.loc[[t]] for t in ("A", "B"))
    ok = np.atleast_1d(res.converged)
    np.testing.assert_allclose(dp_a["dp_tube"].to_numpy()[ok], dp_b["dp_tube"].to_numpy()[ok], rtol=1e-6)
    np.testing.assert_allclose((dp_a["flow_tube"].to_numpy() + dp_b["flow_tube"].to_numpy())[ok],
                               np.broadcast_to(flow, ok.shape)[ok], rtol=1e-12)


@pytest.mark.parametrize("flow", [54.0, 58.0])
def test_equal_pressure_drop_split_of_viscous_fractions_converges(flow):
    # petroleum fractions: a branch given less crude heats it more, which cuts its pressure drop further (the
    # effective exponent of dp on the share is well above turbulent flow's 1.8); at these flows the shares used to
    # swing between two values until the case was given up
    res = _viscous_split(flow).solve()
    assert res.converged
    _equal_dp_holds(res, flow)


def test_equal_pressure_drop_split_of_viscous_fractions_in_a_sweep():
    # the same train swept: the cases that converge hold the definition; any that does not is flagged and named in
    # the warnings, never dropped (today 30 of these 31; the share update is outside the Newton step, and where the
    # shares' pull on the temperatures is strong a case's change can stop shrinking near 1e-4 K)
    flows = np.linspace(30.0, 90.0, 31)
    res = _viscous_split(flows).solve()
    assert np.count_nonzero(res.converged) >= 29
    _equal_dp_holds(res, flows)
    if not np.all(res.converged):
        assert any("did not converge" in w for w in res.warnings)


def test_network_services_are_the_solved_inlets():
    from revamp.train import network_services

    tr = interlinked(CRUDE_C, RESID_C, KERO_C)
    ns = network_services(tr, revamp=1.2)
    for key, res in ns.results.items():
        assert res.converged
        svcs = getattr(ns, key)
        for tag, m in tr.exchangers.items():
            svc, row = svcs[tag], res.exchangers.loc[tag]
            assert svc.shell.t_in == row["t_in_shell"] and svc.tube.t_in == row["t_in_tube"]
            assert svc.fouling_tube == m.fouling_tube
            # rating the exchanger alone at that service gives the network's outlets back
            assert rv.rate(m.exchanger, svc).t_out_tube == pytest.approx(row["t_out_tube"], abs=1e-9)
    # at revamp every flow is 1.2 times today's
    assert ns.revamp["E-102"].tube.flow == pytest.approx(1.2 * ns.today["E-102"].tube.flow)
    assert ns.revamp["E-102"].shell.flow == pytest.approx(36.0)
