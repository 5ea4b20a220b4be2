"""Condenser monitoring from the coolant-side heat balance (``revamp.monitoring_condenser``): it recovers a known
fouling resistance from rows built by an independent hand calculation, reads plant-data files, and names bad input."""
from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import revamp as rv
from revamp.errors import InputError
from revamp.monitoring_condenser import monitor_condenser, monitor_condenser_data

CP = pytest.importorskip("CoolProp.CoolProp")

P = 3.0e5          # condensing pressure [Pa]
P_WATER = 4.0e5    # cooling-water pressure [Pa]
VAPOUR = rv.fluids.pure("n-Pentane", pressure=P)
WATER = rv.fluids.water(P_WATER)
# a wide shell and few baffles: a low vapour velocity, so that the condensing-side pressure drop (and the fall of the
# saturation temperature it causes, which the hand calculation leaves out) stays small
HX = rv.ShellAndTube(shell_id="0.8 m", tube_od="19.05 mm", tube_wall="1.65 mm", tube_length="4.88 m", tube_count=700,
                     tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="1.2 m", baffle_cut=0.35,
                     tube_material="carbon steel")
INCREMENTS = 8


def _hand_rows(rf_true, m_c, t_in):
    """Coolant outlets of a total condenser with total fouling ``rf_true`` (outside area), by hand.

    Independent pieces: the saturation temperature and latent heat of n-pentane from CoolProp (PropsSI), the heat
    capacity of water from CoolProp, and the effectiveness of an exchanger with one stream at constant temperature,
    eps = 1 - exp(-NTU) (any flow arrangement; Incropera & DeWitt 2002, eq. 11.35). Only the clean coefficient is
    the engine's (the fouling is what is being recovered, not the film coefficients): the U of the condensing zone
    of the rating of the same total condenser (vapour flow = duty / latent heat) with the fouling in place, for the
    whole surface, iterated to a fixed point (where the whole surface condenses).
    """
    t_sat = CP.PropsSI("T", "P", P, "Q", 1.0, "n-Pentane")
    h_fg = CP.PropsSI("H", "P", P, "Q", 1.0, "n-Pentane") - CP.PropsSI("H", "P", P, "Q", 0.0, "n-Pentane")
    area = np.pi * HX.tube_od * HX.tube_length * HX.tube_count  # outside area (geometry, definition)
    t_out = t_in + 10.0
    for _ in range(200):
        cp = np.array([CP.PropsSI("C", "T", t, "P", P_WATER, "Water") for t in 0.5 * (t_in + t_out)])
        q = m_c * cp * (t_out - t_in)
        # the clean resistances of the surface as it operates, fouled, condensing the vapour flow the duty implies
        # (the films depend on the state: the condensing film on its temperature difference)
        svc = rv.Service(shell=rv.Stream(VAPOUR, q / h_fg, quality=1.0), tube=rv.Stream(WATER, m_c, t_in),
                         fouling_tube=rf_true * HX.tube_id / HX.tube_od)  # on the inside area: rf_true outside
        r = rv.rate(HX, svc, increments=INCREMENTS)
        z = r.zones[r.zones["zone"] == "condensing"].sort_values("case")
        U = z["U"].to_numpy(float)  # in service: 1/U = clean resistances + rf_true, over the condensing surface
        new = t_in + (1.0 - np.exp(-U * area / (m_c * cp))) * (t_sat - t_in)
        if np.max(np.abs(new - t_out)) < 1e-4:
            break
        t_out = 0.5 * (t_out + new)
    else:
        raise AssertionError("the hand calculation did not settle")
    cp = np.array([CP.PropsSI("C", "T", t, "P", P_WATER, "Water") for t in 0.5 * (t_in + t_out)])
    return t_out, t_sat, h_fg, m_c * cp * (t_out - t_in)


@pytest.fixture(scope="module")
def hand():
    m_c = np.array([70.0, 90.0, 110.0])
    t_in = np.array([300.15, 303.15, 306.15])
    rf_true = 4.0e-4
    t_out, t_sat, h_fg, q = _hand_rows(rf_true, m_c, t_in)
    return m_c, t_in, rf_true, t_out, t_sat, h_fg, q


def test_recovers_a_known_fouling_from_hand_calculated_rows(hand):
    m_c, t_in, rf_true, t_out, t_sat, h_fg, q = hand
    svc = rv.Service(shell=rv.Stream(VAPOUR, 1.0, quality=1.0), tube=rv.Stream(WATER, m_c, t_in))
    m = monitor_condenser(HX, svc, t_out, condensing_pressure=P, increments=INCREMENTS)
    # the duty and vapour flow are the hand's own balance (CoolProp cp and h_fg; the monitor uses the package's
    # water table and CoolProp h_fg): within 0.2 % (the stated error bound of the water table, and the cp at the mean)
    assert np.allclose(m.duty, q, rtol=2e-3)
    assert np.allclose(m.vapour_flow, q / h_fg, rtol=2e-3)
    assert np.allclose(m.t_condensing, t_sat, atol=1e-3)
    # the fouling within 10 % of the true one: the hand calculation has the saturation temperature constant, the
    # engine lowers it along the path with the condensing-side pressure drop (a few tenths of a kelvin here), and
    # takes the clean U zone by zone (stated tolerance, no source)
    assert np.allclose(m.fouling, rf_true, rtol=0.10), m.fouling
    # the band brackets its own value and is positive (definition of a band)
    assert np.all(m.fouling_low < m.fouling) and np.all(m.fouling < m.fouling_high)
    assert np.allclose(1.0 / m.U_actual - 1.0 / m.U_clean, m.fouling, rtol=1e-9)


def test_more_fouling_is_seen_as_more_fouling(hand):
    """Law: a hotter coolant outlet at the same flows and condensing pressure means a cleaner exchanger."""
    m_c, t_in, rf_true, t_out, *_ = hand
    svc = rv.Service(shell=rv.Stream(VAPOUR, 1.0, quality=1.0), tube=rv.Stream(WATER, m_c[1], t_in[1]))
    lo = monitor_condenser(HX, svc, t_out[1] - 0.5, condensing_pressure=P, increments=INCREMENTS)
    hi = monitor_condenser(HX, svc, t_out[1] + 0.5, condensing_pressure=P, increments=INCREMENTS)
    assert float(lo.fouling) > float(hi.fouling)


def test_plant_data_file_and_its_flags(hand, tmp_path):
    m_c, t_in, rf_true, t_out, *_ = hand
    n = 12
    k = np.arange(n) % 3
    frame = pd.DataFrame({
        "timestamp": pd.date_range("2031-01-01", periods=n, freq="h").strftime("%Y-%m-%d %H:%M"),
        "cw flow": m_c[k] * 3.6,  # t/h (1 kg/s = 3.6 t/h, definition)
        "cw in": t_in[k] - 273.15, "cw out": t_out[k] - 273.15,
        "p": P / 1e5 * (1.0 + 1e-5 * np.arange(n))})  # a live transmitter: never exactly flat
    frame.loc[5, "cw out"] = frame.loc[5, "cw in"] - 1.0  # an impossible reading: flagged, never used
    path = tmp_path / "c.csv"
    frame.to_csv(path, index=False)
    cols = {"coolant_flow": ("cw flow", "t/h"), "coolant_t_in": ("cw in", "degC"), "coolant_t_out": ("cw out", "degC"),
            "condensing_pressure": ("p", "bar")}
    svc = rv.Service(shell=rv.Stream(VAPOUR, 1.0, quality=1.0), tube=rv.Stream(WATER, 90.0, 303.15))
    m = monitor_condenser_data(HX, svc, path, cols, steady=False, increments=INCREMENTS)
    assert m.counts["rows"] == n and m.counts["valid"] == n - 1
    assert "coolant outlet not above its inlet" in m.table.loc[5, "flag"]
    used = m.used
    assert len(used) == n - 1
    # as recovered above from the same rows (stated tolerance as there)
    assert np.allclose(used["Rf"].to_numpy(float), rf_true, rtol=0.10)
    assert m.summary["used rows"] == n - 1


def test_bad_input_names_its_field():
    svc = rv.Service(shell=rv.Stream(VAPOUR, 1.0, quality=1.0), tube=rv.Stream(WATER, 90.0, 303.15))
    with pytest.raises(InputError) as exc:
        monitor_condenser(HX, svc, 313.15)
    assert exc.value.field == "condensing_pressure"
    with pytest.raises(InputError) as exc:
        monitor_condenser(HX, svc, 300.0, condensing_pressure=P)  # colder than the coolant inlet
    assert exc.value.field == "t_out_coolant"
    with pytest.raises(InputError) as exc:
        monitor_condenser(HX, svc, 313.15, condensing_pressure=P, uncertainty={"humidity": 0.1})
    assert exc.value.field == "uncertainty.humidity"
    liquid = rv.Service(shell=rv.Stream(WATER, 10.0, 350.0), tube=rv.Stream(WATER, 90.0, 303.15))
    with pytest.raises(InputError) as exc:
        monitor_condenser(HX, liquid, 313.15, condensing_pressure=P)
    assert exc.value.field == "service"
    with pytest.raises(InputError) as exc:
        monitor_condenser_data(HX, svc, pd.DataFrame({"timestamp": ["2031-01-01"]}), condensing_from="smell")
    assert exc.value.field == "condensing_from"


def test_mean_temperature_difference_along_a_glide_is_the_lmtd_of_a_straight_curve():
    """A curve straight in temperature against heat released, against a coolant in counterflow: the temperature
    difference is linear in the duty, and the reciprocal of the mean of 1/dT is then the LMTD of its end
    differences (calculus: the integral of 1/(a + b f) over f from 0 to 1)."""
    from revamp.monitoring_condenser import _dt_mean

    props = {"liquid_density": [600.0] * 3, "liquid_heat_capacity": [2400.0] * 3, "liquid_viscosity": [2e-4] * 3,
             "liquid_conductivity": [0.11] * 3, "vapour_density": [5.0] * 3, "vapour_heat_capacity": [1900.0] * 3,
             "vapour_viscosity": [8e-6] * 3, "vapour_conductivity": [0.018] * 3}  # invented, SI
    curve = rv.fluids.condensing_curve(table={"temperature": [358.15, 353.15, 348.15],
                                              "heat_released": [0.0, 1.5e5, 3.0e5], "vapour_fraction": [1.0, 0.5, 0.0],
                                              **props}, pressure=2e5, critical_pressure=3e6)
    t_in, t_out = np.array([303.15]), np.array([318.15])
    got = _dt_mean(curve, np.array([2e5]), np.array([358.15]), t_in, t_out)
    d1, d2 = 358.15 - 318.15, 348.15 - 303.15  # vapour inlet meets the coolant outlet (counterflow)
    assert got[0] == pytest.approx((d2 - d1) / np.log(d2 / d1), rel=1e-3)  # trapezoidal rule, 41 points


def test_the_steady_filter_drops_the_rows_of_a_moving_coolant_flow(hand, tmp_path):
    """Definition of the filter (revamp.monitoring.steady): a row whose 4 h window holds coolant flows 20 % apart
    (relative standard deviation above 2 %) is not steady and not used; rows of a settled flow are."""
    m_c, t_in, rf_true, t_out, *_ = hand
    n = 16
    k = np.where(np.arange(n) < 10, 1, np.arange(n) % 3)  # ten settled hours, then the flow jumps every hour
    frame = pd.DataFrame({
        "timestamp": pd.date_range("2031-01-01", periods=n, freq="h").strftime("%Y-%m-%d %H:%M"),
        "coolant_flow": m_c[k] * (1.0 + 1e-5 * np.arange(n)), "coolant_t_in": t_in[1] + 1e-3 * np.arange(n),
        "coolant_t_out": t_out[k] + 1e-3 * np.arange(n), "condensing_pressure": P * (1.0 + 1e-5 * np.arange(n))})
    svc = rv.Service(shell=rv.Stream(VAPOUR, 1.0, quality=1.0), tube=rv.Stream(WATER, 90.0, 303.15))
    m = monitor_condenser_data(HX, svc, frame, increments=INCREMENTS)
    used = m.table["used"].to_numpy()
    assert m.counts["valid"] == n
    assert used[3:10].all() and not used[11:].any(), used
