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
AC = rv.AirCooler(bays=1, bundles_per_bay=1, tube_rows=6, tubes_per_row=50, tube_passes=1, tube_length="6 m",
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
    # the fouling within 10 % of the true one (stated tolerance, no source): the hand has one mean U over the whole
    # surface and the saturation temperature constant; the engine integrates the local U along the tubes (each
    # length of tube meets fresh air, and 1 - exp(-NTU) is concave: a mean U gives a few per cent more duty, read
    # as a cleaner condenser) and lowers the saturation temperature with the tube-side pressure drop (0.2-0.3 K
    # here); CoolProp's air cp against the engine's fit (within 0.5 %)
    assert np.allclose(m.fouling, rf_true, rtol=0.10), m.fouling
    assert np.all(m.fouling_low < m.fouling) and np.all(m.fouling < m.fouling_high)
    assert np.all((m.fouling_low < rf_true) & (rf_true < m.fouling_high))  # the band holds the true fouling
    # the note states the band it used: 15 % on a stated air flow, 2 % on a measured condensate flow (the defaults)
    assert "±15% air flow" in m.notes[-1] and "±2% condensate flow" in m.notes[-1], m.notes
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


def test_unit_file_plant_data_reaches_the_study_and_its_report(hand, tmp_path):
    """``kind: condenser`` with ``exchanger: air cooler`` and ``plant_data``: checked by path, loaded, monitored in
    the study (the fouling of the hand's rows again) and shown in the report."""
    from test_condenser_unitfile import _unit
    from test_unitfile import write_unit

    from revamp import unitfile
    from revamp.report import condenser as report
    from revamp.studies.condenser import run_condenser_case

    m_air, t_air, rf_true, m_cond, t_sat, q = hand
    n = 9
    k = np.full(n, 1)  # the middle hand row, the stated air flow's
    ts = pd.date_range("2026-01-01", periods=n, freq="h")
    live = np.arange(n)  # live transmitters: never exactly flat
    pd.DataFrame({"time": ts.strftime("%Y-%m-%d %H:%M"), "ambient": t_air[k] - 273.15 + 1e-3 * live,
                  "p": P / 1e5 + 1e-5 * live, "condensate": m_cond[k] * (1 + 1e-6 * live)}).to_csv(
        tmp_path / "acc.csv", index=False)
    geometry = {"bays": 1, "bundles_per_bay": 1, "tube_rows": 6, "tubes_per_row": 50, "tube_passes": 1,
                "tube_length": "6 m", "tube_od": "25.4 mm", "tube_wall": "2.11 mm", "transverse_pitch": "63.5 mm",
                "row_pitch": "55 mm", "tube_material": "carbon steel",
                "fin": {"height": "15.9 mm", "thickness": "0.4 mm", "per_length": "394 /m", "material": "aluminium",
                        "bond": "embedded"},
                "fans_per_bay": 2, "fan_diameter": "3.66 m", "fan_efficiency": 0.65, "draft": "forced"}
    entry = {"tag": "C-1", "kind": "condenser", "exchanger": "air cooler", "geometry": geometry,
             "vapour": {"fluid": "n-Pentane", "pressure": "3 bar", "quality": 1.0, "flow": float(m_cond[1])},
             "air_side": {"t_in": float(t_air[1]), "flow": float(m_air[1])},
             "plant_data": {"file": "acc.csv", "condensing_from": "pressure", "duty_from": "condensate",
                            "air_flow_from": "stated", "steady": False,
                            "columns": {"timestamp": "time", "air_t_in": {"column": "ambient", "unit": "degC"},
                                        "condensing_pressure": {"column": "p", "unit": "bar"},
                                        "condensate_flow": "condensate"}}}
    path = write_unit(tmp_path / "unit.yaml", _unit(entry))
    assert unitfile.check(path) == []
    case = unitfile.load(path).exchanger("C-1")
    assert case.exchanger.area == pytest.approx(AC.area)  # the same condenser as the hand's
    assert case.plant_data.monitor_options()["duty_from"] == "condensate"
    study = run_condenser_case(case, increments=INCREMENTS)
    assert study.monitoring is not None, study.monitoring_error
    # consistency: the study's numbers are monitor_air_condenser's at the engine's default increments
    direct = monitor_air_condenser(case.exchanger, case.service.replace(air_in=study.monitoring.used["air_t_in"]
                                                                        .to_numpy(float)),
                                   condensing_pressure=study.monitoring.used["condensing_pressure"].to_numpy(float),
                                   condensate_flow=study.monitoring.used["condensate_flow"].to_numpy(float))
    assert np.allclose(study.monitoring.used["Rf"], direct.fouling, rtol=1e-9)
    # and the hand's true fouling lies within the band (16 increments resolve the local U more finely than the
    # hand's single mean U: the value itself reads 10-15 % low, see the first test)
    used = study.monitoring.used
    assert np.all((used["Rf_low"] < rf_true) & (rf_true < used["Rf_high"]))
    items = report.monitoring_items(study)
    assert "condensing-side balance" in items[1].layout.title.text
    for change, where in ((("duty_from", "guessed"), "plant_data.duty_from"),
                          (("air_flow_from", "wind"), "plant_data.air_flow_from"),
                          (("columns", {"coolant_flow": "x"}), "plant_data.columns.coolant_flow")):
        bad = {**entry, "plant_data": {**entry["plant_data"], change[0]: change[1]}}
        problems = unitfile.check(write_unit(tmp_path / "bad.yaml", _unit(bad)))
        assert f"exchangers[1].{where}" in [p.path for p in problems], (change, problems)


def test_air_flow_from_the_fan_power_follows_the_fan_laws(hand):
    """Fan laws (Kröger 2004, ch. 8): at one air density, flow ~ speed and power ~ speed³, so eight times the fan
    power moves twice the air; and the ratio to the stated design point fixes the flows."""
    m_air, t_air, rf_true, m_cond, *_ = hand
    n = 6
    frame = pd.DataFrame({"timestamp": pd.date_range("2026-01-01", periods=n, freq="h").strftime("%Y-%m-%d %H:%M"),
                          "air_t_in": t_air[1], "condensing_pressure": P * (1 + 1e-5 * np.arange(n)),
                          "condensate_flow": m_cond[1] * (1 + 1e-6 * np.arange(n)),
                          "fan_power": np.where(np.arange(n) % 2 == 0, 10e3, 80e3)})
    svc = rv.AirService(tube=rv.Stream(VAPOUR, 1.0, quality=1.0), air_in=t_air[1], air_flow=m_air[1])
    m = monitor_condenser_data(AC, svc, frame, air_flow_from="fan_power", steady=False, flat_rows=n + 1,
                               increments=INCREMENTS)
    air = m.table["air_flow"].to_numpy(float)
    assert air[1] / air[0] == pytest.approx(2.0, rel=1e-9)
    assert "fan laws" in " ".join(m.notes)
    assert m.uncertainty["air_flow"] == pytest.approx(0.15)
    with pytest.raises(InputError) as err:  # the fan-power column is needed, by its name
        monitor_condenser_data(AC, svc, frame.drop(columns="fan_power"), air_flow_from="fan_power", steady=False)
    assert err.value.field == "data.columns"
