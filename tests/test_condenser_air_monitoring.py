"""Plant data of an air-cooled condenser (``revamp.monitoring_condenser.monitor_air_condenser``): it recovers a known
fouling from rows built by an independent hand calculation, reads a plant-data file, and names bad input."""
from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import revamp as rv
from revamp.errors import InputError
from revamp.monitoring_condenser import monitor_air_condenser, monitor_condenser_data
from revamp.rating_condenser import rate_condenser

CP = pytest.importorskip("CoolProp.CoolProp")

P = 3.0e5  # condensing pressure [Pa]
VAPOUR = rv.fluids.pure("n-Pentane", pressure=P)
# one pass of many tubes: a low vapour velocity, so that the fall of the saturation temperature along the tubes
# (which the hand calculation leaves out) stays small
AC = rv.AirCooler(bays=1, bundles_per_bay=1, tube_rows=4, tubes_per_row=50, tube_passes=1, tube_length="8 m",
                  tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                  tube_material="carbon steel",
                  fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m", material="aluminium",
                             bond="embedded"),
                  fans_per_bay=2, fan_diameter="3.66 m", fan_efficiency=0.65, draft="forced")
INCREMENTS = 6


def _air_cp(T):
    return np.array([CP.PropsSI("C", "T", float(t), "P", 101325.0, "Air") for t in np.ravel(T)])


def _hand_rows(rf_true, m_air, t_air):
    """Condensate flows of a total air-cooled condenser with total fouling ``rf_true`` (bare outside area).

    Independent pieces: the saturation temperature and latent heat of n-pentane from CoolProp, the heat capacity of
    air from CoolProp (dry air at 1 atm), and the effectiveness of an exchanger with one stream at constant
    temperature, eps = 1 - exp(-NTU) (any flow arrangement; Incropera & DeWitt 2002, eq. 11.35). Only the clean
    coefficient is the engine's (the fouling is what is recovered): the U of the condensing zone of the rating of the
    same condenser with the fouling in place (inside the tubes, ``rf_true`` on the outside area), over the whole
    surface, iterated to the fixed point where the whole surface condenses.
    """
    t_sat = CP.PropsSI("T", "P", P, "Q", 1.0, "n-Pentane")
    h_fg = CP.PropsSI("H", "P", P, "Q", 1.0, "n-Pentane") - CP.PropsSI("H", "P", P, "Q", 0.0, "n-Pentane")
    area = np.pi * AC.tube_od * AC.tube_length * AC.tubes  # bare outside-tube area (geometry, definition)
    t_out = t_air + 10.0
    q = None
    for _ in range(200):
        cp = _air_cp(0.5 * (t_air + t_out))
        q = m_air * cp * (t_out - t_air)
        svc = rv.AirService(tube=rv.Stream(VAPOUR, q / h_fg, quality=1.0), air_in=t_air, air_flow=m_air,
                            fouling_tube=rf_true * AC.tube_id / AC.tube_od)
        r = rate_condenser(AC, svc, increments=INCREMENTS)
        z = r.zones[r.zones["zone"] == "condensing"].sort_values("case")
        U = z["U"].to_numpy(float)
        new = t_air + (1.0 - np.exp(-U * area / (m_air * cp))) * (t_sat - t_air)
        if np.max(np.abs(new - t_out)) < 1e-4:
            break
        t_out = 0.5 * (t_out + new)
    else:
        raise AssertionError("the hand calculation did not settle")
    cp = _air_cp(0.5 * (t_air + t_out))
    q = m_air * cp * (t_out - t_air)
    return q / h_fg, t_sat, q


@pytest.fixture(scope="module")
def hand():
    m_air = np.array([120.0, 150.0, 180.0])
    t_air = np.array([288.15, 298.15, 303.15])
    rf_true = 4.0e-4
    m_cond, t_sat, q = _hand_rows(rf_true, m_air, t_air)
    return m_air, t_air, rf_true, m_cond, t_sat, q


def test_recovers_a_known_fouling_from_hand_calculated_rows(hand):
    m_air, t_air, rf_true, m_cond, t_sat, q = hand
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in=t_air, air_flow=m_air)
    m = monitor_air_condenser(AC, svc, condensing_pressure=P, condensate_flow=m_cond, increments=INCREMENTS)
    # the duty is the condensate flow times CoolProp's h_fg: the hand's own (definition)
    assert np.allclose(m.duty, q, rtol=1e-6)
    assert np.allclose(m.t_condensing, t_sat, atol=1e-3)
    # the fouling within 10 % of the true one: the hand has the saturation temperature constant and CoolProp's air
    # cp, the engine lowers the saturation temperature along the tubes and uses its own air cp fit (within 0.5 %),
    # and takes the clean U zone by zone (stated tolerance, no source)
    assert np.allclose(m.fouling, rf_true, rtol=0.10), m.fouling
    assert np.all(m.fouling_low < m.fouling) and np.all(m.fouling < m.fouling_high)
    # the band is wide: at least the effect of 15 % on the stated air flow (stated tolerance, no source)
    assert np.all(m.fouling_high - m.fouling > 0.1 * rf_true)


def test_the_measured_temperature_gives_the_same_fouling(hand):
    # the dew point of the pressure as the measurement instead (CoolProp saturation): the same state, the same Rf
    m_air, t_air, rf_true, m_cond, t_sat, q = hand
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in=t_air, air_flow=m_air)
    a = monitor_air_condenser(AC, svc, condensing_pressure=P, condensate_flow=m_cond, increments=INCREMENTS)
    b = monitor_air_condenser(AC, svc, condensing_temperature=t_sat, condensate_flow=m_cond, increments=INCREMENTS)
    assert np.allclose(a.fouling, b.fouling, rtol=1e-3)


def test_more_condensate_is_a_cleaner_condenser(hand):
    """Law: more duty at the same air flow, ambient and pressure means less fouling."""
    m_air, t_air, rf_true, m_cond, *_ = hand
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in=t_air[1], air_flow=m_air[1])
    lo = monitor_air_condenser(AC, svc, condensing_pressure=P, condensate_flow=m_cond[1] * 0.97,
                               increments=INCREMENTS)
    hi = monitor_air_condenser(AC, svc, condensing_pressure=P, condensate_flow=m_cond[1] * 1.03,
                               increments=INCREMENTS)
    assert float(lo.fouling) > float(hi.fouling)


def test_bad_input_names_its_field():
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in="25 degC", air_flow=150.0)
    with pytest.raises(InputError) as err:
        monitor_air_condenser(AC, svc, increments=INCREMENTS)
    assert err.value.field == "condensing_pressure"
    with pytest.raises(InputError) as err:  # a duty the stated air cannot carry below the condensing temperature
        monitor_air_condenser(AC, svc, condensing_pressure=P, condensate_flow=100.0, increments=INCREMENTS)
    assert err.value.field == "air_in"
    with pytest.raises(InputError) as err:
        monitor_air_condenser(AC, svc, condensing_pressure=P, uncertainty={"fan": 0.1}, increments=INCREMENTS)
    assert err.value.field == "uncertainty.fan"


def test_plant_data_file(hand, tmp_path):
    m_air, t_air, rf_true, m_cond, t_sat, q = hand
    n = 12
    k = np.arange(n) % 3
    ts = pd.date_range("2026-01-01", periods=n, freq="h")
    frame = pd.DataFrame({"time": ts.strftime("%Y-%m-%d %H:%M"), "ambient": (t_air[k] - 273.15).astype(object),
                          "p_cond": P / 1e5, "condensate": m_cond[k] * 3.6})
    frame.loc[5, "ambient"] = ""
    path = tmp_path / "acc.csv"
    frame.to_csv(path, index=False)
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in="25 degC", air_flow=m_air[1])
    # the stated air flow is the middle row's: the rows k == 1 are the hand's state
    m = monitor_condenser_data(AC, svc, path, columns={"timestamp": "time", "air_t_in": ("ambient", "degC"),
                                                        "condensing_pressure": ("p_cond", "bar"),
                                                        "condensate_flow": ("condensate", "t/h")},
                               steady=False, flat_rows=n + 1, increments=INCREMENTS)  # the pressure is constant
    assert m.counts["rows"] == n and m.counts["valid"] == n - 1
    assert "missing air_t_in" in m.table.loc[5, "flag"]
    rows = m.table[m.table["used"] & (np.arange(n) % 3 == 1)]
    assert np.allclose(rows["Rf"], rf_true, rtol=0.10)
    assert "air-cooled" in " ".join(m.notes) and m.basis.startswith("condensing-side")
    with pytest.raises(InputError) as err:
        monitor_condenser_data(AC, svc, path, columns={"timestamp": "time"}, steady=False)
    assert err.value.field == "data.columns"
