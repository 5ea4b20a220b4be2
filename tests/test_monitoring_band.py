"""The Monte Carlo band of monitor() is streamed in blocks of rows: memory does not grow with rows × draws.

What is checked is an invariant, not a number: the band does not depend on how the rows are blocked (same seed, same
draws, bit for bit), no step ever holds more than the stated number of draws × rows, and the peak memory of a band
stays far below what one (draws, rows, 6) array of the measurements would take. The band's coverage of a known
fouling resistance is checked in test_monitoring.py.
"""
import math
import tracemalloc

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import fluids
from revamp.errors import InputError
from revamp.geometry import ShellAndTube
from revamp.monitoring import engine

HX = ShellAndTube(shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m", tube_count=158,
                  tube_passes=2, tube_pitch="31.75 mm", layout=90, baffle_spacing="250 mm", baffle_cut=0.25,
                  shells=1, tube_material=50.0)
OIL = fluids.constant(density=820.0, heat_capacity=2300.0, viscosity=1.2e-3, conductivity=0.12)
WATER = fluids.constant(density=995.0, heat_capacity=4180.0, viscosity=7.5e-4, conductivity=0.62)
SERVICE = rv.Service(shell=rv.Stream(OIL, 20.0, 420.0), tube=rv.Stream(WATER, 25.0, 305.0))
KW = {"uncertainty": {"flow": 0.01, "temperature": 0.2}, "steady": False, "seed": 7}
BAND = ["Rf_low", "Rf_high", "U_low", "U_high"]


def _plant(n, rf_outside=3e-4, seed=0):
    """n hourly rows rated by rv.rate at a known tube-side fouling, with sensor noise; a few rows spoiled."""
    rng = np.random.default_rng(seed)
    t = np.arange(n) * 3600.0
    m_s = 20.0 * (1 + 0.05 * np.sin(t / 40000.0))
    m_t = 25.0 * (1 + 0.04 * np.cos(t / 55000.0))
    ts_in = 420.0 + 3 * np.sin(t / 90000.0)
    tt_in = 305.0 + 1.5 * np.sin(t / 30000.0)
    svc = rv.Service(shell=rv.Stream(OIL, m_s, ts_in), tube=rv.Stream(WATER, m_t, tt_in),
                     fouling_tube=np.full(n, rf_outside) * HX.tube_id / HX.tube_od)
    r = rv.rate(HX, svc)
    df = pd.DataFrame({
        "timestamp": pd.date_range("2031-03-01", periods=n, freq="h"),
        "shell_flow": m_s * (1 + rng.normal(0, 0.01, n)), "shell_t_in": ts_in + rng.normal(0, 0.2, n),
        "shell_t_out": r.t_out_shell + rng.normal(0, 0.2, n), "tube_flow": m_t * (1 + rng.normal(0, 0.01, n)),
        "tube_t_in": tt_in + rng.normal(0, 0.2, n), "tube_t_out": r.t_out_tube + rng.normal(0, 0.2, n)})
    df.loc[3, "tube_flow"] = np.nan  # a row with no band, between rows with one
    return df


DATA = _plant(60)


def _band(monkeypatch, block, data=DATA, **kw):
    monkeypatch.setattr(engine, "MC_BLOCK_CASES", block)
    return rv.monitor(HX, SERVICE, data, **{**KW, **kw}).table[BAND].to_numpy()


@pytest.mark.parametrize("mc_clean", ["linear", "full"])
def test_blocked_band_equals_one_block_bit_for_bit(monkeypatch, mc_clean):
    draws = 40
    whole = _band(monkeypatch, 10**9, mc_draws=draws, mc_clean=mc_clean)  # every row in one block
    blocked = _band(monkeypatch, 7 * draws, mc_draws=draws, mc_clean=mc_clean)  # 7 rows a block
    assert np.isfinite(whole[4:]).all() and np.isnan(whole[3]).all()
    np.testing.assert_array_equal(blocked, whole)


@settings(max_examples=6, deadline=None)
@given(block=st.integers(1, 3000))
def test_band_does_not_depend_on_the_block_size(block):
    # a hypothesis test cannot take the monkeypatch fixture: call the engine with the block size directly
    m = rv.monitor(HX, SERVICE, DATA, mc_draws=0, **KW)
    t = m.table
    ok = np.isfinite(t["Rf"].to_numpy())
    x = t[engine._X].to_numpy(dtype=float)[ok]
    args = (HX, SERVICE, x, engine.sigmas(KW["uncertainty"], x), np.full(ok.sum(), 2300.0),
            np.full(ok.sum(), 4180.0), t[[c + "_rec" for c in engine._X]].to_numpy()[ok], t["U_clean"].to_numpy()[ok],
            t["Rf"].to_numpy()[ok])
    kw = {"draws": 30, "band": (5.0, 95.0), "seed": 1, "area": HX.area_outside, "arrangement": "E", "shells": 1}
    ref = engine.mc_band(*args, **kw, block_cases=10**9)
    got = engine.mc_band(*args, **kw, block_cases=block)
    assert got.blocks == math.ceil(ok.sum() / max(1, block // 30))
    for name in ("rf_low", "rf_high", "u_low", "u_high"):
        np.testing.assert_array_equal(getattr(got, name), getattr(ref, name))


def test_no_step_holds_all_rows_times_draws(monkeypatch):
    draws, block = 50, 500  # 10 rows a block
    seen = []
    real = engine.reconcile_heat_balance

    def spy(x, *a, **k):
        seen.append(np.shape(x))
        return real(x, *a, **k)

    monkeypatch.setattr(engine, "reconcile_heat_balance", spy)
    _band(monkeypatch, block, mc_draws=draws)
    rows = int(DATA.notna().all(axis=1).sum())
    assert len(seen) == math.ceil(rows / (block // draws))
    assert all(s[0] == draws and s[0] * s[1] <= block for s in seen)


def test_band_memory_stays_within_its_block(monkeypatch):
    # 2,000 rows × 400 draws: one (draws, rows, 6) float array of the drawn measurements alone is 38.4 MB, and the
    # reconciliation used to hold a few dozen arrays of draws × rows (a 260 MB peak). Streamed in blocks of 20,000
    # cases (and rated 2,000 cases at a time), the whole monitor() call must peak below half of that one array.
    data = _plant(2000, seed=3)
    monkeypatch.setattr(engine, "MC_BLOCK_CASES", 20_000)
    rv.monitor(HX, SERVICE, data, mc_draws=0, mc_chunk=2000, **KW)  # warm caches outside the measurement
    one_array = 400 * 2000 * 6 * 8
    tracemalloc.start()
    try:
        m = rv.monitor(HX, SERVICE, data, mc_draws=400, mc_chunk=2000, **KW)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert np.isfinite(m.table["Rf_low"].to_numpy()[10:]).all()
    assert peak < 0.5 * one_array, f"peak {peak / 1e6:.1f} MB"


@pytest.mark.parametrize("bad", [-1, 2.5, "100", True])
def test_mc_draws_must_be_a_whole_number(bad):
    with pytest.raises(InputError, match="mc_draws"):
        rv.monitor(HX, SERVICE, DATA, mc_draws=bad, **KW)


def test_no_draws_no_band():
    t = rv.monitor(HX, SERVICE, DATA, mc_draws=0, **KW).table
    assert np.isnan(t[BAND].to_numpy()).all() and np.isfinite(t["Rf"].to_numpy()[4:]).all()


def test_a_plant_data_failure_is_stated_in_the_report(monkeypatch):
    # the plant-data section is evidence, not a precondition: when monitor() fails (here out of memory) the study
    # goes on, and the section says why it has no analysis instead of disappearing
    from revamp import report, unitfile
    from revamp.cli import demo_unit_path

    def no_memory(*args, **kwargs):
        raise MemoryError("Unable to allocate 8.94 GiB for an array with shape (100, 1999771, 6)")

    monkeypatch.setattr(rv, "monitor", no_memory)
    unit, _, _ = unitfile.load_partial(demo_unit_path(), only=["E-104"])
    result = report.run_case(unit.exchanger("E-104"))
    assert result.monitoring is None and result.study is not None
    items = report.monitoring_items(result)
    assert items[0].startswith("No plant-data analysis: MemoryError: Unable to allocate"), items[0]
