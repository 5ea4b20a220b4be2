"""Sensor drift seen in the heat-balance closure, and data sets that span cleanings.

The data are invented here: the rating engine makes outlet temperatures at a fouling law set by each test, then a
drift or cleanings are injected. The expected values follow from what was injected (the drift in kelvin, the side it
was put on, the cleaning instants, the fouling rate of each run), never from the monitoring's own output.

Rules under test (common practice, no single source): a sensor drift shows as a trend of the heat-balance closure
over time, since fouling changes the duty of both sides alike; a temperature drift on one side adds C·δ(t) to that
side's duty (C = m·cp of the side), so when the two sides' flows vary differently the side is told apart by which
C·t pattern the closure follows. A cleaning shows as a sudden drop of Rf to near its start-of-run level.
"""
import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp.errors import InputError
from revamp.monitoring.cleaning import find_cleanings
from test_monitoring import HX, OIL, SERVICE, WATER

DAY = 86400.0
CP_OIL, CP_WATER = 2300.0, 4180.0  # the constant-property fluids of test_monitoring


def _series(rf, n, m_s, m_t, seed=0, t_noise=0.1, start="2031-03-01"):
    """Hourly rows rated at fouling rf (tube side, outside basis); flows given per row with 0.2 % meter noise (a
    perfectly constant reading would be flagged as a stuck sensor); noise on temperatures."""
    rng = np.random.default_rng(seed)
    m_s = np.asarray(m_s, float) * (1 + rng.normal(0, 0.002, n))
    m_t = np.asarray(m_t, float) * (1 + rng.normal(0, 0.002, n))
    t = np.arange(n) * 3600.0
    ts_in = 420.0 + 2.0 * np.sin(t / 90000.0)
    tt_in = 305.0 + 1.0 * np.sin(t / 30000.0)
    svc = rv.Service(shell=rv.Stream(OIL, m_s, ts_in), tube=rv.Stream(WATER, m_t, tt_in),
                     fouling_tube=np.asarray(rf) * HX.tube_id / HX.tube_od)
    r = rv.rate(HX, svc)
    noise = lambda: rng.normal(0, t_noise, n) if t_noise else 0.0
    return pd.DataFrame({"timestamp": pd.date_range(start, periods=n, freq="h"), "shell_flow": m_s,
                         "shell_t_in": ts_in + noise(), "shell_t_out": r.t_out_shell + noise(), "tube_flow": m_t,
                         "tube_t_in": tt_in + noise(), "tube_t_out": r.t_out_tube + noise()})


def _square(n, period_h, low, high):
    return np.where((np.arange(n) // period_h) % 2 == 0, high, low)


N = 24 * 30
T = np.arange(N) * 3600.0
LAW = 1e-4 + 3e-4 * T / T[-1]


# ------------------------------------------------------------------------------------------------------------ drift
def test_tube_side_thermocouple_drift_is_flagged_with_its_side():
    # tube (cooling water) flow switches between 18 and 25 kg/s every two days; the shell flow is constant
    m_t = _square(N, 48, 18.0, 25.0)
    df = _series(LAW, N, np.full(N, 20.0), m_t, seed=1)
    df["tube_t_out"] += 1.5 * T / T[-1]  # the cold outlet reads 1.5 K high by the end (injected)
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False)
    d = m.drift
    assert d.detected
    assert d.side == "tube"
    assert d.kelvin == pytest.approx(1.5, abs=0.15)  # the injected drift of the tube side's temperature rise
    # the closure (hot − cold)/mean moves by −C_t·1.5 K / Q over the run: the cold side reads more duty
    q = np.asarray(m.table["duty_shell"], float)
    assert d.change == pytest.approx(-np.mean(1.5 * m_t * CP_WATER / q), rel=0.2)
    assert "tube" in m.summary["heat-balance drift"]


def test_shell_side_drift_is_told_apart_when_the_shell_flow_varies():
    m_s = _square(N, 36, 15.0, 22.0)
    df = _series(LAW, N, m_s, np.full(N, 25.0), seed=2)
    df["shell_t_out"] -= 2.0 * T / T[-1]  # the hot outlet reads 2 K low by the end: the hot side's drop grows
    d = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False).drift
    assert d.detected and d.side == "shell"
    assert d.kelvin == pytest.approx(2.0, abs=0.2)


def test_drift_with_steady_flows_is_flagged_without_a_side():
    # both flows constant: C_shell·t and C_tube·t are the same pattern, so the data cannot say which side drifts
    df = _series(LAW, N, np.full(N, 20.0), np.full(N, 25.0), seed=3)
    df["tube_t_out"] += 1.5 * T / T[-1]
    d = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False).drift
    assert d.detected and d.side is None and d.kelvin is None
    assert "cannot tell" in d.reason


def test_no_drift_no_flag():
    df = _series(LAW, N, _square(N, 36, 15.0, 22.0), _square(N, 48, 18.0, 25.0), seed=4)
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False)
    assert not m.drift.detected and m.drift.side is None
    assert abs(m.drift.change) < 0.01  # the data close the balance up to noise
    with pytest.raises(InputError, match="drift_tolerance"):
        rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, drift_tolerance=0)


# ----------------------------------------------------------------------------------------------------------- cycles
C1, C2 = pd.Timestamp("2031-03-21 00:00"), pd.Timestamp("2031-04-10 12:00")  # cleanings (invented)
RATES = (3e-4 / 20 / DAY, 1.5e-4 / 20 / DAY, 4.5e-4 / 20 / DAY)  # fouling rate of each run [m²K/W/s] (invented)
RESTART = (0.5e-4, 0.2e-4, 0.3e-4)  # Rf left just after each cleaning


def _three_runs(seed=5):
    n = 24 * 60
    times = pd.date_range("2031-03-01", periods=n, freq="h")
    starts = np.array([times[0], C1, C2], dtype="datetime64[ns]")
    tn = times.to_numpy().astype("datetime64[ns]")
    k = np.searchsorted(starts[1:], tn, side="right")
    age = (tn - starts[k]) / np.timedelta64(1, "s")
    rf = np.array(RESTART)[k] + np.array(RATES)[k] * age
    flows = (20.0 * (1 + 0.03 * np.sin(np.arange(n) / 11.0)), 25.0 * (1 + 0.03 * np.cos(np.arange(n) / 7.0)))
    df = _series(rf, n, *flows, seed=seed)
    # the first cleaning took the exchanger out of service for 18 h: no rows then
    out = (times >= C1 - pd.Timedelta(hours=18)) & (times < C1)
    return df[~out].reset_index(drop=True)


def test_cleanings_are_found_and_the_rate_is_the_current_runs():
    df = _three_runs()
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",))
    assert len(m.cycles) == 3
    assert [c.start for c in m.cycles] == [pd.Timestamp("2031-03-01"), C1, C2]  # the first rows after each cleaning
    assert [c.source for c in m.cycles] == ["data start", "detected", "detected"]
    for c, rate in zip(m.cycles, RATES):
        assert c.fit.params["b"] == pytest.approx(rate, rel=0.1)
    assert m.run_start == C2
    assert m.trend.params["b"] == pytest.approx(RATES[2], rel=0.1)  # the current run's rate, not a blend
    assert m.summary["fouling rate now [m2K/W per day]"] == pytest.approx(RATES[2] * DAY, rel=0.1)
    # run_time counts from the current run's start; cycle_time from each row's own run
    tab = m.table
    assert tab.loc[tab["timestamp"] == C2, "run_time"].iloc[0] == 0.0
    assert tab.loc[tab["timestamp"] == C1, "cycle_time"].iloc[0] == 0.0
    assert list(np.unique(tab["cycle"])) == [0, 1, 2]


def test_given_cleaning_dates_split_the_data():
    df = _three_runs()
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",), cleanings=[C1, str(C2)])
    assert [c.source for c in m.cycles] == ["data start", "given", "given"]
    assert [c.start for c in m.cycles] == [pd.Timestamp("2031-03-01"), C1, C2]
    assert m.trend.params["b"] == pytest.approx(RATES[2], rel=0.1)
    one = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",), cleanings=[])
    assert len(one.cycles) == 1  # told there was no cleaning: one run
    with pytest.raises(InputError, match="cleanings"):
        rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, cleanings=["soon"])


def test_one_run_without_cleanings_stays_one_cycle():
    df = _series(LAW, N, np.full(N, 20.0), np.full(N, 25.0), seed=6)
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",))
    assert len(m.cycles) == 1 and m.cycles[0].source == "data start"
    assert m.trend.params["b"] == pytest.approx(3e-4 / T[-1], rel=0.1)  # the law set above


def test_figures_show_the_runs_and_the_drift():
    from revamp import plots_monitoring as pm

    m = rv.monitor(HX, SERVICE, _three_runs(), mc_draws=0, steady=False, models=("linear",))
    names = [tr.name for tr in pm.fouling_trend(m).data]
    assert "cleaning 2031-03-21 (detected)" in names and "cleaning 2031-04-10 (detected)" in names
    assert sum(1 for x in names if x and x.startswith("fit of the run from")) == 2  # the two earlier runs
    df = _series(LAW, N, np.full(N, 20.0), _square(N, 48, 18.0, 25.0), seed=1)
    df["tube_t_out"] += 1.5 * T / T[-1]
    title = pm.heat_balance(rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False)).layout.title.text
    assert "sensor drift" in title and "tube-side" in title


def test_demo_generators_drifting_thermocouple_is_found(monkeypatch):
    # the demo data generator (data/generate_plant_data.py) drifts the tube outlet thermocouple linearly by `drift`
    # K over the series; its process variations move the two flows independently
    import importlib.util
    import pathlib
    import sys

    path = pathlib.Path(__file__).resolve().parents[1] / "data" / "generate_plant_data.py"
    spec = importlib.util.spec_from_file_location("generate_plant_data", path)
    gen = importlib.util.module_from_spec(spec)
    monkeypatch.setitem(sys.modules, spec.name, gen)
    spec.loader.exec_module(gen)
    df = gen.generate(HX, SERVICE, hours=24 * 40, fouling_law=gen.Linear(a=1e-4, b_per_year=2e-3), seed=3,
                      drift=1.5, bad_rows=False)
    d = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False).drift
    assert d.detected and d.side == "tube"
    assert d.kelvin == pytest.approx(1.5, abs=0.3)  # the generator's 1.5 K (its 0.3 K noise on each reading)
    clean = gen.generate(HX, SERVICE, hours=24 * 40, fouling_law=gen.Linear(a=1e-4, b_per_year=2e-3), seed=3,
                         drift=0.0, bad_rows=False)
    assert not rv.monitor(HX, SERVICE, clean, mc_draws=0, steady=False).drift.detected


# ------------------------------------------------------------------------------------- find_cleanings on its own
@settings(max_examples=40, deadline=None)
@given(lengths=st.lists(st.integers(40, 200), min_size=1, max_size=4),
       growth=st.lists(st.floats(20.0, 200.0), min_size=4, max_size=4),
       restart=st.lists(st.floats(0.0, 5.0), min_size=4, max_size=4), seed=st.integers(0, 1000))
def test_find_cleanings_returns_the_injected_restarts(lengths, growth, restart, seed):
    # invented saw-tooth: run k grows linearly by growth[k] noise standard deviations from restart[k]; the first row
    # of each run after the first is a cleaning (expected indices from how the series was made)
    rng = np.random.default_rng(seed)
    parts = [restart[k] + growth[k] * np.linspace(0.0, 1.0, n) for k, n in enumerate(lengths)]
    rf = (np.concatenate(parts) + rng.normal(0.0, 1.0, sum(lengths))) * 1e-6
    expected = np.cumsum(lengths)[:-1]
    assert list(find_cleanings(rf)) == list(expected)


@settings(max_examples=20, deadline=None)
@given(n=st.integers(20, 400), slope=st.floats(0.0, 50.0), seed=st.integers(0, 1000))
def test_find_cleanings_sees_none_in_one_run(n, slope, seed):
    # one run: steady growth (or none) plus noise never reads as a cleaning
    rng = np.random.default_rng(seed)
    rf = (slope * np.linspace(0.0, 1.0, n) + rng.normal(0.0, 1.0, n)) * 1e-6
    assert find_cleanings(rf).size == 0


def test_find_cleanings_window_is_checked():
    with pytest.raises(InputError, match="window"):
        find_cleanings(np.zeros(50), window=2)


def test_leaning_on_the_sound_side_moves_the_rate_back():
    # with the drifting side's temperatures given a large uncertainty, the reconciled duty follows the other side,
    # so the fitted rate comes closer to the law the data were made with (3e-4 over the series)
    m_t = _square(N, 48, 18.0, 25.0)
    df = _series(LAW, N, np.full(N, 20.0), m_t, seed=1)
    df["tube_t_out"] += 1.5 * T / T[-1]
    law = 3e-4 / T[-1]
    plain = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",))
    assert "raise the uncertainty of tube_t_in and tube_t_out" in plain.drift.reason
    lean = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, models=("linear",),
                      uncertainty={"tube_t_in": 5.0, "tube_t_out": 5.0})
    assert abs(lean.trend.params["b"] - law) < 0.5 * abs(plain.trend.params["b"] - law)
