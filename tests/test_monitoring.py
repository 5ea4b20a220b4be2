"""Tests for revamp.monitoring: data flags, steady filter, reconciliation, cleaning interval, and monitor() round trip.

Sources: the reconciliation formula x̂ = x − V Aᵀ(A V Aᵀ)⁻¹(A x − b) (Kuehn & Davidson 1961; Narasimhan & Jordache
2000), solved by hand for two- and three-measurement cases; the optimal cleaning interval for linear fouling from the
Epstein (1979) / Ma & Epstein (1981) condition, solved by hand; unit factors from NIST SP 811 (1 lb = 0.45359237 kg
exactly, T[K] = (T[°F] + 459.67)/1.8).
"""
import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import fluids
from revamp.errors import InputError
from revamp.geometry import ShellAndTube
from revamp.monitoring import (
    linear_closed_form,
    optimal_cleaning_interval,
    read_plant_data,
    reconcile_heat_balance,
    reconcile_linear,
    steady_state,
)
from revamp.monitoring.reconcile import side_duties

DAY = 86400.0


# ------------------------------------------------------------------------------------------------- reconciliation
def test_two_measurements_of_one_quantity_move_in_proportion_to_variance():
    # Hand solution of x̂ = x − V Aᵀ(A V Aᵀ)⁻¹(A x − b), A = [1, −1], b = 0 (Narasimhan & Jordache 2000, ch. 3):
    # A x = 100 − 110 = −10; A V Aᵀ = 1 + 4 = 5; λ = −2; x̂1 = 100 + 1·2 = 102; x̂2 = 110 − 4·2 = 102
    out = reconcile_linear([100.0, 110.0], [1.0, 4.0], [[1.0, -1.0]])
    assert out == pytest.approx([102.0, 102.0])
    moves = out - np.array([100.0, 110.0])
    assert moves[0] / 1.0 == pytest.approx(-moves[1] / 4.0)  # each moved ∝ its variance


def test_splitter_three_flows_by_hand():
    # F1 = F2 + F3 with readings 100, 60, 50 and variances 4, 1, 1: r = 100 − 110 = −10, A V Aᵀ = 6, λ = −10/6;
    # x̂ = x − V Aᵀ λ  ->  F1 = 100 + 40/6, F2 = 60 − 10/6, F3 = 50 − 10/6 (by hand)
    out = reconcile_linear([100.0, 60.0, 50.0], [4.0, 1.0, 1.0], [[1.0, -1.0, -1.0]])
    assert out == pytest.approx([100 + 40 / 6, 60 - 10 / 6, 50 - 10 / 6])
    assert out[0] == pytest.approx(out[1] + out[2])


def test_reconcile_linear_broadcasts_over_rows():
    x = np.array([[100.0, 110.0], [50.0, 40.0]])
    out = reconcile_linear(x, np.array([[1.0, 4.0], [1.0, 1.0]]), [[1.0, -1.0]])
    assert out == pytest.approx(np.array([[102.0, 102.0], [45.0, 45.0]]))


def test_heat_balance_only_uncertain_measurement_moves():
    # If only the tube outlet is uncertain, reconciliation puts the whole error there, and the hand balance gives
    # Tt_out = Tt_in + Q_shell/(m_t cp_t) = 300 + 10·2500·50/(20·2000) = 331.25 K
    x = np.array([10.0, 450.0, 400.0, 20.0, 300.0, 326.0])
    sigma = np.array([1e-9, 1e-9, 1e-9, 1e-9, 1e-9, 1.0])
    hb = reconcile_heat_balance(x, sigma, 2500.0, 2000.0)
    assert hb.x[5] == pytest.approx(331.25, abs=1e-6)
    assert hb.x[:5] == pytest.approx(x[:5], abs=1e-6)
    assert hb.duty == pytest.approx(1.25e6, rel=1e-9)
    # balance error before: (1.25e6 − 1.04e6)/mean = 0.21e6/1.145e6
    assert hb.balance_error == pytest.approx(0.21 / 1.145, rel=1e-9)


@settings(max_examples=40, deadline=None)
@given(ms=st.floats(2, 50), mt=st.floats(2, 50), th=st.floats(400, 500), dth=st.floats(5, 60),
       tc=st.floats(290, 350), err=st.floats(0.01, 0.2), sign=st.sampled_from([-1.0, 1.0]), s_flow=st.floats(0.005, 0.05), s_t=st.floats(0.1, 2.0))
def test_heat_balance_closes_and_moves_follow_the_lagrange_condition(ms, mt, th, dth, tc, err, sign, s_flow, s_t):
    err = sign * err  # a tube flow reading 1-20 % off, so the balance is open before reconciliation
    cps, cpt = 2400.0, 4180.0
    q = ms * cps * dth
    x = np.array([ms, th, th - dth, mt * (1 + err), tc, tc + q / (mt * cpt)])
    sigma = np.array([s_flow * ms, s_t, s_t, s_flow * mt, s_t, s_t])
    hb = reconcile_heat_balance(x, sigma, cps, cpt)
    qs, qt = side_duties(hb.x, cps, cpt)
    assert abs(qs + qt) <= 1e-8 * abs(qs)  # the balance closes
    # first-order optimality of weighted least squares: (x̂ − x)_i / σ_i² ∝ ∂f/∂x_i at x̂ (one multiplier)
    xh = hb.x
    grad = np.array([cps * (xh[1] - xh[2]), cps * xh[0], -cps * xh[0], cpt * (xh[4] - xh[5]), cpt * xh[3],
                     -cpt * xh[3]])
    lam = (xh - x) / sigma**2 / grad
    assert np.allclose(lam, lam[0], rtol=1e-5, atol=0)


# --------------------------------------------------------------------------------------------------------- cleaning
def test_cleaning_interval_linear_closed_form_by_hand():
    # c(t) = k t, no downtime: J = (k t²/2 + C)/t, minimum at t = sqrt(2C/k) (Epstein 1979 condition c(t) = J(t));
    # k = 2e-6 $/s², C = 1e5 $  ->  t = sqrt(1e11) = 316227.766 s
    assert linear_closed_form(2e-6, 1e5) == pytest.approx(316227.766, rel=1e-9)
    r = optimal_cleaning_interval(lambda t: 2e-6 * t, 1e5)
    assert r.interval == pytest.approx(316227.766, rel=1e-5)
    # with downtime t_d = 3 days costing c_d = 0.01 $/s: k t² + 2 k t_d t − 2(C + c_d t_d) = 0 (by hand)
    td, cd = 3 * DAY, 0.01
    by_hand = -td + np.sqrt(td**2 + 2 * (1e5 + cd * td) / 2e-6)
    r = optimal_cleaning_interval(lambda t: 2e-6 * t, 1e5, downtime=td, downtime_cost_rate=cd)
    assert r.interval == pytest.approx(by_hand, rel=1e-5)
    assert linear_closed_form(2e-6, 1e5, td, cd) == pytest.approx(by_hand, rel=1e-12)
    # at the optimum the instantaneous loss rate equals the cycle-average cost rate (Ma & Epstein 1981)
    assert r.loss_rate_at_interval == pytest.approx(r.cost_rate, rel=1e-5)


def test_cleaning_interval_asymptotic_meets_optimality_condition():
    r = optimal_cleaning_interval(lambda t: 1.0 - np.exp(-t / (60 * DAY)), 2e5, downtime="3 day")
    assert not r.bounded
    assert r.loss_rate_at_interval == pytest.approx(r.cost_rate, rel=1e-5)  # Ma & Epstein (1981)


def test_cleaning_never_pays_is_bounded():
    r = optimal_cleaning_interval(lambda t: np.zeros_like(t), 1e5, t_max="100 day")
    assert r.bounded and r.interval == pytest.approx(100 * DAY)


def test_cleaning_bad_inputs():
    with pytest.raises(InputError, match="cleaning_cost"):
        optimal_cleaning_interval(lambda t: t, -1.0)
    with pytest.raises(InputError, match="loss_rate"):
        optimal_cleaning_interval(3.0, 1.0)


# ------------------------------------------------------------------------------------------------------- plant data
def _frame(n=24):
    ts = pd.date_range("2031-01-01", periods=n, freq="h")
    rng = np.random.default_rng(0)
    return pd.DataFrame({
        "timestamp": ts.astype(str),
        "shell_flow": 10 + rng.normal(0, 0.05, n), "shell_t_in": 450 + rng.normal(0, 0.1, n),
        "shell_t_out": 400 + rng.normal(0, 0.1, n), "tube_flow": 20 + rng.normal(0, 0.05, n),
        "tube_t_in": 300 + rng.normal(0, 0.1, n), "tube_t_out": 330 + rng.normal(0, 0.1, n)})


def test_clean_data_has_no_flags():
    pdata = read_plant_data(_frame())
    assert pdata.frame["valid"].all()
    assert pdata.counts == {"rows": 24, "valid": 24}


def test_every_bad_data_reason_is_reported_and_counted():
    df = _frame(40).astype(object)
    df.loc[1, "shell_flow"] = np.nan                       # missing
    df.loc[2, "tube_t_in"] = "bad"                        # non-numeric
    df.loc[3, "timestamp"] = ""                           # missing timestamp
    df.loc[4, "timestamp"] = "not a date"                 # bad timestamp
    df.loc[6, "timestamp"] = df.loc[5, "timestamp"]       # duplicated
    df.loc[8, "timestamp"] = "2030-12-31 00:00:00"        # earlier than the rows above: unsorted
    df.loc[10:17, "tube_flow"] = 20.0                     # flat-lined for 8 rows
    df.loc[20, "shell_flow"] = 0.0                        # flow <= 0
    df.loc[22, "shell_t_out"] = 460.0                     # hot side heats up
    df.loc[24, "tube_t_out"] = 290.0                      # cold side cools down
    df.loc[26, "tube_t_out"] = 455.0                      # cold outlet above hot inlet
    df.loc[28, "shell_t_out"] = 295.0                     # hot outlet below cold inlet
    df.loc[30, "tube_t_in"] = df.loc[30, "shell_t_in"]    # equal inlets
    pdata = read_plant_data(df)
    f = pdata.frame
    assert len(f) == 40  # nothing dropped
    expect = {1: "missing shell_flow", 2: "non-numeric tube_t_in", 3: "missing timestamp", 4: "bad timestamp",
              6: "duplicated timestamp", 8: "unsorted timestamp", 20: "flow <= 0 shell_flow",
              22: "shell outlet above inlet on the hot side", 24: "tube outlet below inlet on the cold side",
              26: "cold outlet above hot inlet", 28: "hot outlet below cold inlet",
              30: "no driving force (equal inlets)"}
    for row, reason in expect.items():
        assert reason in f.loc[row, "flag"], (row, f.loc[row, "flag"])
    for row in range(10, 18):
        assert "flat-lined tube_flow" in f.loc[row, "flag"]
    assert f.loc[9, "flag"] == "" and f.loc[18, "flag"] == ""
    c = pdata.counts
    assert c["flat-lined tube_flow"] == 8
    # every row is either valid or flagged with at least one counted reason
    assert c["rows"] == 40 and c["valid"] == int(f["valid"].sum()) == int((f["flag"] == "").sum())
    reasons = [r for flag in f["flag"] for r in flag.split("; ") if r]
    assert sum(v for k, v in c.items() if k not in ("rows", "valid")) == len(reasons)


@settings(max_examples=30, deadline=None)
@given(cells=st.lists(st.tuples(st.integers(0, 29), st.integers(0, 6), st.sampled_from(["", "x", None, -1.0])),
                      max_size=15))
def test_nothing_dropped_and_every_reason_counted(cells):
    # invariant (common practice, no source): any corruption keeps every row, and the counts add up to the reasons
    df = _frame(30).astype(object)
    for row, col, value in cells:
        df.iloc[row, col] = value
    pdata = read_plant_data(df)
    f, c = pdata.frame, pdata.counts
    assert len(f) == 30 and list(f["row"]) == list(range(30))
    reasons = [r for flag in f["flag"] for r in flag.split("; ") if r]
    assert sum(v for k, v in c.items() if k not in ("rows", "valid")) == len(reasons)
    assert c["valid"] + int((f["flag"] != "").sum()) == 30


def test_sort_reorders_and_counts():
    df = _frame(10).iloc[[0, 1, 2, 5, 3, 4, 6, 7, 8, 9]].reset_index(drop=True)
    flagged = read_plant_data(df)
    assert "unsorted timestamp" in flagged.frame.loc[4, "flag"]
    pdata = read_plant_data(df, sort=True)
    assert pdata.frame["timestamp"].is_monotonic_increasing
    assert pdata.frame["valid"].all() and pdata.counts["re-ordered"] > 0


def test_column_mapping_with_units():
    df = pd.DataFrame({"Time": ["2031-01-01 00:00", "2031-01-01 01:00"], "FI101": [79365.0, 79365.0],
                       "TI101": [350.0, 351.0], "TI102": [250.0, 251.0], "FI102": [20.0, 20.1],
                       "TI103": [80.0, 80.5], "TI104": [100.0, 100.5]})
    cols = {"timestamp": "Time", "shell_flow": ("FI101", "lb/h"), "shell_t_in": ("TI101", "degF"),
            "shell_t_out": ("TI102", "degF"), "tube_flow": "FI102", "tube_t_in": ("TI103", "degF"),
            "tube_t_out": ("TI104", "degF")}
    f = read_plant_data(df, columns=cols).frame
    # NIST SP 811: 1 lb = 0.45359237 kg; T[K] = (T[°F] + 459.67)/1.8
    assert f.loc[0, "shell_flow"] == pytest.approx(79365.0 * 0.45359237 / 3600.0, rel=1e-12)
    assert f.loc[0, "shell_t_in"] == pytest.approx((350.0 + 459.67) / 1.8, rel=1e-12)
    assert f.loc[1, "tube_flow"] == 20.1  # bare name: already SI
    with pytest.raises(InputError, match="columns.shell_flow"):
        read_plant_data(df, columns={**cols, "shell_flow": ("FI101", "degF")})
    with pytest.raises(InputError, match="FI999"):
        read_plant_data(df, columns={**cols, "tube_flow": "FI999"})
    with pytest.raises(InputError, match="columns.flow"):
        read_plant_data(df, columns={"flow": "FI101"})


def test_csv_path(tmp_path):
    path = tmp_path / "plant.csv"
    _frame(5).to_csv(path, index=False)
    pdata = read_plant_data(str(path))
    assert pdata.counts["valid"] == 5
    with pytest.raises(InputError, match="data"):
        read_plant_data(str(tmp_path / "missing.csv"))


# ------------------------------------------------------------------------------------------------------ steady state
def test_steady_filter_rejects_the_window_after_a_step():
    df = read_plant_data(_frame(48)).frame
    df.loc[20:, "shell_flow"] *= 1.3  # a 30 % step at row 20
    st_mask = steady_state(df, window="4 h", flow_rsd=0.02, t_range=2.0)
    assert st_mask[5:20].all()         # steady before the step (after the first rows fill the window)
    # the window (t − 4 h, t] of hourly rows holds 4 rows: rows 20-22 see both levels, row 23 only the new one
    assert not st_mask[20:23].any()
    assert st_mask[23:].all()
    assert not st_mask[:2].any()       # fewer than min_rows readings in the first window


def test_steady_filter_inlet_temperature_range():
    df = read_plant_data(_frame(24)).frame
    df.loc[10, "tube_t_in"] += 5.0  # one 5 K excursion
    st_mask = steady_state(df, window="3 h", t_range=2.0)
    assert not st_mask[10:13].any() and st_mask[13:].all()  # windows (t − 3 h, t] that contain row 10


# --------------------------------------------------------------------------------------------- monitor() round trip

HX = ShellAndTube(shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m", tube_count=158,
                  tube_passes=2, tube_pitch="31.75 mm", layout=90, baffle_spacing="250 mm", baffle_cut=0.25,
                  shells=1, tube_material=50.0)
OIL = fluids.constant(density=820.0, heat_capacity=2300.0, viscosity=1.2e-3, conductivity=0.12)
WATER = fluids.constant(density=995.0, heat_capacity=4180.0, viscosity=7.5e-4, conductivity=0.62)
SERVICE = rv.Service(shell=rv.Stream(OIL, 20.0, 420.0), tube=rv.Stream(WATER, 25.0, 305.0))


def _plant(rf_outside, n=300, seed=0, flow_noise=0.0, t_noise=0.0):
    """A series rated by rv.rate at a known fouling (tube side, given on the outside basis), plus noise."""
    rng = np.random.default_rng(seed)
    t = np.arange(n) * 3600.0
    m_s = 20.0 * (1 + 0.05 * np.sin(t / 40000.0))
    m_t = 25.0 * (1 + 0.04 * np.cos(t / 55000.0))
    ts_in = 420.0 + 3 * np.sin(t / 90000.0)
    tt_in = 305.0 + 1.5 * np.sin(t / 30000.0)
    rf = np.broadcast_to(rf_outside, (n,))
    svc = rv.Service(shell=rv.Stream(OIL, m_s, ts_in), tube=rv.Stream(WATER, m_t, tt_in),
                     fouling_tube=rf * HX.tube_id / HX.tube_od)
    r = rv.rate(HX, svc)
    return pd.DataFrame({
        "timestamp": pd.date_range("2031-03-01", periods=n, freq="h"),
        "shell_flow": m_s * (1 + rng.normal(0, flow_noise, n)) if flow_noise else m_s,
        "shell_t_in": ts_in + rng.normal(0, t_noise, n), "shell_t_out": r.t_out_shell + rng.normal(0, t_noise, n),
        "tube_flow": m_t * (1 + rng.normal(0, flow_noise, n)) if flow_noise else m_t,
        "tube_t_in": tt_in + rng.normal(0, t_noise, n), "tube_t_out": r.t_out_tube + rng.normal(0, t_noise, n)})


def test_round_trip_exact_without_noise():
    # data made by the rating engine at a known Rf (set by this test) give that Rf back: the e-NTU inversion undoes
    # the rating (Kays & London 1984 relations are exact inverses) and the clean U is the same engine's
    df = _plant(4e-4, n=60)
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False)
    assert m.table["Rf"].to_numpy() == pytest.approx(np.full(60, 4e-4), rel=1e-6)
    assert m.table["balance_error"].abs().max() < 1e-9  # the engine's data close the balance exactly
    for col in ("duty", "balance_error", "U_actual", "U_clean", "Rf", "Rf_low", "Rf_high", "steady", "flag"):
        assert col in m.table.columns


def test_round_trip_with_noise_inside_band():
    df = _plant(4e-4, n=300, seed=4, flow_noise=0.01, t_noise=0.2)
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.01, "temperature": 0.2}, steady=False, mc_draws=200)
    tab = m.table
    inside = ((tab["Rf_low"] <= 4e-4) & (4e-4 <= tab["Rf_high"])).mean()
    assert 0.8 <= inside <= 0.99  # a 5-95 % band should hold the truth about 90 % of the time
    assert np.median(tab["Rf"]) == pytest.approx(4e-4, rel=0.1)
    assert m.summary["Rf now low [m2K/W]"] < 4e-4 < m.summary["Rf now high [m2K/W]"]


def test_fitted_model_recovers_known_linear_law():
    t = np.arange(400) * 3600.0
    law = 1e-4 + 3e-4 * t / t[-1]  # Rf = a + b t with a = 1e-4, b = 3e-4 per 399 h (set by the test)
    df = _plant(law, n=400, seed=5, flow_noise=0.005, t_noise=0.1)
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, steady=False, mc_draws=20,
                   models=("linear",))
    f = m.trend
    assert f.model == "linear"
    assert f.params["b"] == pytest.approx(3e-4 / t[-1], rel=0.1)
    assert abs(f.params["b"] - 3e-4 / t[-1]) < 4 * f.stderr["b"] + 1e-3 * 3e-4 / t[-1]
    assert f.params["a"] == pytest.approx(1e-4, abs=2e-5)
    proj = m.project(["10 day", "30 day"])
    assert proj["Rf"].is_monotonic_increasing and proj["duty"].is_monotonic_decreasing  # fouling lowers duty


def test_monitor_keeps_and_counts_bad_rows():
    df = _plant(3e-4, n=80, seed=6, flow_noise=0.005, t_noise=0.1).astype(object)
    df.loc[10, "tube_flow"] = None
    df.loc[20, "shell_t_out"] = "Bad Input"
    df.loc[30, "tube_t_out"] = 300.0  # the cold side cooled: impossible
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, mc_draws=10, steady=False)
    assert len(m.table) == 80  # nothing dropped
    assert m.counts["missing tube_flow"] == 1 and m.counts["non-numeric shell_t_out"] == 1
    assert m.counts["tube outlet below inlet on the cold side"] == 1
    assert np.isnan(m.table.loc[[10, 20, 30], "Rf"]).all()
    assert m.counts["used"] == int(m.table["used"].sum()) == 77
    with pytest.raises(InputError, match="fouling_side"):
        rv.monitor(HX, SERVICE, df, fouling_side="both")


def test_cleaning_projection_and_losses_in_monitor():
    t = np.arange(300) * 3600.0
    df = _plant(1e-4 + 4e-4 * t / t[-1], n=300, seed=9, flow_noise=0.005, t_noise=0.1)
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, steady=False, mc_draws=20,
                   duty_value=1e-8, cleaning={"cost": 2000.0, "downtime": "1 day"}, models=("linear",))
    # the loss rate the interval was found for meets the optimality condition of Ma & Epstein (1981)
    assert m.cleaning is not None and not m.cleaning.bounded
    assert m.cleaning.loss_rate_at_interval == pytest.approx(m.cleaning.cost_rate, rel=1e-4)
    # energy lost to date: the duty lost (clean minus actual, > 0 when fouled) integrated over time
    lost = m.table["duty_lost"].to_numpy()
    assert np.all(lost[50:] > 0)
    by_hand = np.sum(lost[:-1] * 3600.0)  # hourly rows
    assert m.summary["energy lost to fouling to date [J]"] == pytest.approx(by_hand, rel=1e-9)
    assert m.summary["cost lost to fouling to date"] == pytest.approx(by_hand * 1e-8, rel=1e-9)
    # projection by run time and by date agree
    by_time = m.project("20 day")
    by_date = m.project(m.run_start + pd.Timedelta(days=20))
    assert by_time["Rf"].iloc[0] == pytest.approx(by_date["Rf"].iloc[0], rel=1e-12)
    with pytest.raises(InputError, match="when"):
        m.project("next spring")


def test_monte_carlo_linearized_clean_u_matches_full_rating():
    df = _plant(3e-4, n=40, seed=10, flow_noise=0.01, t_noise=0.2)
    kw = {"uncertainty": {"flow": 0.01, "temperature": 0.2}, "steady": False, "mc_draws": 100, "seed": 3}
    lin = rv.monitor(HX, SERVICE, df, mc_clean="linear", **kw).table
    full = rv.monitor(HX, SERVICE, df, mc_clean="full", **kw).table
    # same draws: first-order clean U differs from the full rating only at second order (a few 1e-4 of U)
    width = (full["Rf_high"] - full["Rf_low"]).to_numpy()
    assert np.abs(lin["Rf_low"] - full["Rf_low"]).max() < 0.02 * width.min()
    assert np.abs(lin["Rf_high"] - full["Rf_high"]).max() < 0.02 * width.min()


def test_threshold_model_fitted_with_engine_conditions():
    df = _plant(2e-4, n=50, seed=11, flow_noise=0.005, t_noise=0.1)
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, steady=False, mc_draws=0)
    tab = m.table
    # the conditions the threshold model uses come from the engine at the operating state
    assert (tab["Re_tube"] > 2300).all() and (tab["shear_tube"] > 0).all()
    assert ((tab["T_film"] > tab["tube_t_in"]) & (tab["T_film"] < tab["shell_t_in"])).all()
    assert "threshold" in m.fits
    shell_side = rv.monitor(HX, SERVICE, df, steady=False, mc_draws=0, fouling_side="shell")
    assert "threshold" not in shell_side.fits  # tube-side model only


def test_figures_build():
    from revamp import plots_monitoring as pm

    t = np.arange(200) * 3600.0
    df = _plant(1e-4 + 3e-4 * t / t[-1], n=200, seed=12, flow_noise=0.005, t_noise=0.1)
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, mc_draws=20)
    fig = pm.fouling_trend(m)
    names = [tr.name for tr in fig.data]
    assert "Rf, steady rows" in names and any(n and n.startswith("fit:") for n in names) and "projection" in names
    assert len(pm.heat_balance(m).data) >= 1
    us = pm.duty_lost(m, units="US")
    assert "MMBtu/h" in us.data[0].name  # US display unit of a duty
    with pytest.raises(InputError, match="monitoring"):
        pm.fouling_trend(object())


def test_figures_draw_daily_points_or_every_row():
    # the static reports draw a year of hourly rows as daily points; the expected points are pandas' own resample
    # of the same table (median per calendar day, quantiles of the day), computed here
    from revamp import plots_monitoring as pm

    t = np.arange(200) * 3600.0
    df = _plant(1e-4 + 3e-4 * t / t[-1], n=200, seed=13, flow_noise=0.005, t_noise=0.1)
    df.loc[[40, 41, 120], "tube_flow"] *= 1.5  # heat balance open by far more than 10 %: flagged rows
    m = rv.monitor(HX, SERVICE, df, uncertainty={"flow": 0.005, "temperature": 0.1}, mc_draws=20)
    tab = m.table
    by_day = lambda rows: rows.set_index("timestamp").resample("D")
    used = by_day(tab[tab["used"]])[["Rf", "Rf_low", "Rf_high"]].median().dropna(how="all")
    assert 8 <= len(used) <= 10  # 200 hours: parts of 9 calendar days

    fig = pm.fouling_trend(m)
    tr = {x.name: x for x in fig.data}
    assert fig.layout.title.text.endswith("(daily medians)")
    rf = tr["Rf, steady rows"]
    assert list(pd.to_datetime(rf.x)) == list(used.index)
    # SI display: 10⁻⁴ m²·K/W, the one unit of every resistance chart (revamp.report.labels.resistance_axis)
    assert np.asarray(rf.y, float) == pytest.approx(1e4 * used["Rf"].to_numpy(), rel=1e-12)
    assert np.asarray(tr["band (daily median)"].y, float) == pytest.approx(1e4 * used["Rf_low"].to_numpy(), rel=1e-12)
    assert np.asarray(fig.data[0].y, float) == pytest.approx(1e4 * used["Rf_high"].to_numpy(), rel=1e-12)
    every = pm.fouling_trend(m, resample=None)
    assert len(next(x for x in every.data if x.name == "Rf, steady rows").y) == int(tab["used"].sum())

    hb = pm.heat_balance(m)
    kept = by_day(tab[tab["flag"] == ""])["balance_error"]
    med = kept.median().dropna()
    tr = {x.name: x for x in hb.data}
    assert np.asarray(tr["rows kept, daily median"].y, float) == pytest.approx(100 * med.to_numpy(), rel=1e-12)
    assert np.asarray(tr["rows kept, 5-95 % of the day"].y, float) == pytest.approx(
        100 * kept.quantile(0.05).reindex(med.index).to_numpy(), rel=1e-12)
    assert np.asarray(hb.data[0].y, float) == pytest.approx(100 * kept.quantile(0.95).reindex(med.index).to_numpy(),
                                                            rel=1e-12)
    bad = tab[(tab["flag"] != "") & np.isfinite(tab["balance_error"])]
    assert len(bad) >= 3
    assert np.asarray(tr["rows flagged, daily median"].y, float) == pytest.approx(
        100 * by_day(bad)["balance_error"].median().dropna().to_numpy(), rel=1e-12)
    assert len(pm.heat_balance(m, resample=None).data[0].y) == int((tab["flag"] == "").sum())

    dl = pm.duty_lost(m)
    valid = tab[np.isfinite(tab["duty_lost"]) & (tab["flag"] == "")]
    lost = by_day(valid)["duty_lost"].median().dropna()
    assert np.asarray(dl.data[0].y, float) == pytest.approx(lost.to_numpy() / 1e6, rel=1e-12)  # MW (display unit)
    energy_daily, energy_all = dl.data[1], pm.duty_lost(m, resample=None).data[1]
    assert len(energy_all.y) == len(valid) and len(energy_daily.y) == len(lost)
    # the daily line is the running total at each day's last row
    last = pd.Series(np.asarray(energy_all.y, float), index=pd.to_datetime(energy_all.x)).resample("D").last()
    assert np.asarray(energy_daily.y, float) == pytest.approx(last.dropna().to_numpy(), rel=1e-12)


def test_demo_generator_is_invented_reproducible_and_spoiled(monkeypatch):
    import importlib.util
    import pathlib
    import sys

    path = pathlib.Path(__file__).resolve().parents[1] / "data" / "generate_plant_data.py"
    spec = importlib.util.spec_from_file_location("generate_plant_data", path)
    gen = importlib.util.module_from_spec(spec)
    monkeypatch.setitem(sys.modules, spec.name, gen)  # dataclasses look their module up while the file runs
    spec.loader.exec_module(gen)
    assert "INVENTED" in gen.__doc__
    law = gen.Linear(a=1e-4, b_per_year=5e-4)
    a = gen.generate(HX, SERVICE, hours=600, fouling_law=law, seed=1)
    b = gen.generate(HX, SERVICE, hours=600, fouling_law=law, seed=1)
    pd.testing.assert_frame_equal(a, b)
    m = rv.monitor(HX, SERVICE, a, mc_draws=0)
    c = m.counts
    # the spoiled rows: 5 missing and 2 non-numeric cells, a duplicated row, a 12 h stuck sensor, a 3 h pump trip,
    # one impossible cold-side reading: every one counted, none dropped
    assert len(m.table) == 601
    assert sum(v for k, v in c.items() if k.startswith("missing")) == 5
    assert sum(v for k, v in c.items() if k.startswith("non-numeric")) == 2
    assert c["duplicated timestamp"] == 1 and c["flat-lined shell_t_out"] >= 12 and c["flow <= 0 tube_flow"] == 3
    assert c["tube outlet below inlet on the cold side"] >= 1


def test_clean_u_choice():
    df = _plant(4e-4, n=30)
    op = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False)
    cl = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, clean_u="clean")
    # same measured U; the clean-exchanger U differs from the clean-surface U at the operating state only through
    # the film coefficients, which fouling changes via the temperatures (small for these constant-property fluids)
    assert op.table["U_actual"].to_numpy() == pytest.approx(cl.table["U_actual"].to_numpy(), rel=1e-12)
    assert cl.table["Rf"].to_numpy() == pytest.approx(np.full(30, 4e-4), rel=0.05)
    with pytest.raises(InputError, match="clean_u"):
        rv.monitor(HX, SERVICE, df, clean_u="design")
