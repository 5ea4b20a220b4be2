"""Plant data of an air cooler from the unit file: read, filtered, monitored, studied and reported.

The synthetic data of the recovery test are written by hand, not by our rating: each row's outlet comes from the
cross-flow effectiveness of one tube row with the tube fluid mixed and the air unmixed (Incropera et al. 2007,
*Fundamentals of Heat and Mass Transfer*, 6th ed., Table 11.3), the air's heat capacity from CoolProp, and the fouled
coefficient ``1/U = 1/U_clean + Rf``, where ``U_clean`` is the clean bundle's rating at the row's state: the
reference against which fouling is defined (the definition of Rf), not an expected value. The known Rf is the input.
Fan laws by definition (Q ~ N, P ~ N³ at constant density). Everything else is invented.
"""
from __future__ import annotations

import copy
import math

import numpy as np
import pandas as pd
import pytest
import yaml

import revamp as rv
from revamp import unitfile
from revamp.errors import InputError
from revamp.monitoring_air_data import monitor_air_data, read_air_plant_data
from revamp.studies.air import air_monitoring, run_air_case

CP = 2300.0
OIL_DOC = {"kind": "constant", "name": "product", "density": 800, "heat_capacity": CP, "viscosity": 1e-3,
           "conductivity": 0.12}

ENTRY = yaml.safe_load("""
tag: AC-1
kind: air cooler
geometry:
  bays: 1
  bundles_per_bay: 1
  tube_rows: 1
  tubes_per_row: 60
  tube_passes: 1
  tube_length: 9.14 m
  tube_od: 25.4 mm
  tube_wall: 2.11 mm
  transverse_pitch: 63.5 mm
  row_pitch: 55 mm
  tube_material: carbon steel
  fin: {height: 15.9 mm, thickness: 0.4 mm, per_length: 394 /m, material: aluminium, bond: embedded}
  fans_per_bay: 2
  fan_diameter: 3.0 m
  fan_efficiency: 0.65
  draft: forced
tube_side: {flow: 10 kg/s, t_in: 120 degC, fouling: 0.0002 m**2*K/W}
air_side: {t_in: 30 degC, flow: 150 kg/s}
plant_data:
  file: ac1.csv
  columns:
    tube_flow: {column: FI-1, unit: t/h}
    tube_t_in: {column: TI-1, unit: degC}
    tube_t_out: {column: TI-2, unit: degC}
    air_t_in: {column: TAMB, unit: degC}
  steady: false
""")
ENTRY["tube_side"]["fluid"] = dict(OIL_DOC)


def unit_doc(entry=None):
    return {"version": 1, "unit": {"name": "test unit"}, "exchangers": [copy.deepcopy(entry or ENTRY)]}


def write(tmp_path, doc, frame=None):
    if frame is not None:
        frame.to_csv(tmp_path / "ac1.csv", index=False)
    path = tmp_path / "unit.yaml"
    path.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
    return path


def _air_cp(t_kelvin):
    from CoolProp.CoolProp import PropsSI

    return PropsSI("Cpmass", "T", float(t_kelvin), "P", 101325.0, "Air")  # CoolProp (independent library)


def hand_data(ac, rf, n=40, seed=1):
    """Rows of (tube flow, inlet, ambient) and the outlet a bundle fouled by ``rf`` gives, by hand."""
    rng = np.random.default_rng(seed)
    m = 10.0 * (1 + 0.05 * rng.standard_normal(n))
    t_in = 393.15 + 3.0 * rng.standard_normal(n)
    amb = 303.15 + 6.0 * np.sin(np.linspace(0, 6, n))
    rf = np.broadcast_to(rf, (n,))
    clean = rv.rate(ac, rv.AirService(tube=rv.Stream(rv.fluids.constant(800, CP, 1e-3, 0.12), m, t_in), air_in=amb,
                                      air_flow=150.0))
    t_out = np.empty(n)
    for i in range(n):
        U = 1.0 / (1.0 / float(clean.U_clean[i]) + rf[i])
        c_t = m[i] * CP
        t_air_out = amb[i] + 10.0
        for _ in range(6):  # air cp at its mean temperature (a fixed point, settles in a few steps)
            c_a = 150.0 * _air_cp(0.5 * (amb[i] + t_air_out))
            c_min, c_max = min(c_t, c_a), max(c_t, c_a)
            assert c_min == c_t  # the tube fluid is Cmin (mixed): the relation below applies
            ntu, cr = U * ac.area / c_min, c_min / c_max
            eps = 1.0 - math.exp(-(1.0 / cr) * (1.0 - math.exp(-cr * ntu)))  # Incropera Table 11.3, Cmin mixed
            q = eps * c_min * (t_in[i] - amb[i])
            t_air_out = amb[i] + q / c_a
        t_out[i] = t_in[i] - q / c_t
    stamps = pd.date_range("2031-01-01", periods=n, freq="D").strftime("%Y-%m-%d %H:%M")
    return pd.DataFrame({"timestamp": stamps, "FI-1": m * 3.6, "TI-1": t_in - 273.15, "TI-2": t_out - 273.15,
                         "TAMB": amb - 273.15})


# ------------------------------------------------------------------------------------------------ recovery
def test_unit_file_plant_data_recovers_a_known_fouling(tmp_path):
    doc = unit_doc()
    path = write(tmp_path, doc)
    frame0 = pd.DataFrame({"timestamp": ["2031-01-01 00:00"], "FI-1": [36.0], "TI-1": [120.0], "TI-2": [60.0],
                           "TAMB": [30.0]})
    frame0.to_csv(tmp_path / "ac1.csv", index=False)
    exchanger = unitfile.load(path).exchanger("AC-1").exchanger
    rf_known = np.linspace(1e-4, 4e-4, 40)  # the input: a deposit growing over the rows
    write(tmp_path, doc, hand_data(exchanger, rf_known))
    case = unitfile.load(path).exchanger("AC-1")
    mon, error = air_monitoring(case)
    assert error == "" and mon is not None
    assert mon.counts["used"] == 40
    rf = mon.table["Rf"].to_numpy()
    # stated tolerance: the air's heat capacity here is CoolProp's, the engine's its own air table; the outlets are
    # written to the CSV at full precision, so the rest is the inversion itself
    assert rf == pytest.approx(rf_known, rel=0.01, abs=2e-6)
    # the band contains the known value and is widest through the stated air flow (±15 % by default)
    assert np.all((mon.table["Rf_low"] <= rf_known) & (rf_known <= mon.table["Rf_high"]))
    assert mon.air_flow_from == "stated" and mon.air_flow_uncertainty == pytest.approx(0.15)


def test_the_straight_line_through_the_data_has_the_known_slope(tmp_path):
    doc = unit_doc()
    frame0 = pd.DataFrame({"timestamp": ["2031-01-01 00:00"], "FI-1": [36.0], "TI-1": [120.0], "TI-2": [60.0],
                           "TAMB": [30.0]})
    path = write(tmp_path, doc, frame0)
    exchanger = unitfile.load(path).exchanger("AC-1").exchanger
    rf_known = 1e-4 + 3e-4 * np.arange(40) / 39.0  # 3e-4 m²K/W over 39 days
    write(tmp_path, doc, hand_data(exchanger, rf_known))
    mon = air_monitoring(unitfile.load(path).exchanger("AC-1"))[0]
    slope, _ = mon.trend()
    assert slope * 86400.0 * 39.0 == pytest.approx(3e-4, rel=0.05)


# ------------------------------------------------------------------------------------------------ air flow sources
def _ac_and_service():
    ac = rv.AirCooler(bays=1, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=2, tube_length="9.14 m",
                      tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                      tube_material="carbon steel",
                      fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m", material="aluminium",
                                 bond="embedded"),
                      fans_per_bay=2, fan_diameter="3.66 m", fan_efficiency=0.65, draft="forced")
    oil = rv.fluids.constant(800, CP, 1e-3, 0.12)
    svc = rv.AirService(tube=rv.Stream(oil, 12.0, 393.15), air_in="30 degC", air_flow="150 kg/s")
    return ac, svc


def _frame(n=12, **extra):
    stamps = pd.date_range("2031-01-01", periods=n, freq="h").strftime("%Y-%m-%d %H:%M")
    f = pd.DataFrame({"timestamp": stamps, "tube_flow": 12.0 + 0.01 * np.arange(n),
                      "tube_t_in": 393.15 + 0.02 * np.arange(n), "tube_t_out": 340.0 + 0.03 * np.arange(n),
                      "air_t_in": 303.15 - 0.01 * np.arange(n)})
    for k, v in extra.items():
        f[k] = v
    return f


def test_air_flow_from_fan_power_follows_the_fan_laws():
    ac, svc = _ac_and_service()
    design = rv.rate(ac, svc)
    n = 12
    # fan laws: flow ~ speed, power ~ speed³ at the design density (by definition); fans about 10 % faster, the
    # reading moving a little (a constant one would be flagged as a stuck sensor)
    wobble = 1.0 + 1e-4 * np.arange(n)
    frame = _frame(n, fan_power=float(design.fan_power) * 1.1 ** 3 * wobble)
    frame["air_t_in"] = 303.15 + 0.001 * np.arange(n)  # near the design ambient
    mon = monitor_air_data(ac, svc, frame, air_flow_from="fan_power", steady=False)
    air = mon.table["air_flow"].to_numpy()
    # mass flow ~ (P ρ²)^(1/3) for the same fan (Q ~ (P/ρ)^(1/3), m = ρ Q); ρ ~ 1/T at one pressure (ideal gas)
    expected = 150.0 * 1.1 * wobble ** (1 / 3) * (303.15 / (303.15 + 0.001 * np.arange(n))) ** (2 / 3)
    assert air == pytest.approx(expected, rel=1e-9)
    assert mon.air_flow_from == "fan_power"


def test_a_measured_air_flow_is_used_as_given():
    ac, svc = _ac_and_service()
    frame = _frame(air_flow=140.0 + np.arange(12.0))
    mon = monitor_air_data(ac, svc, frame, air_flow_from="measured", steady=False)
    assert mon.table["air_flow"].to_numpy() == pytest.approx(140.0 + np.arange(12.0))
    assert mon.air_flow_uncertainty == pytest.approx(0.05)  # the default for a measured air flow (stated in the code)
    narrow = (mon.table["Rf_high"] - mon.table["Rf_low"]).median()
    stated = monitor_air_data(ac, svc, _frame(), steady=False)
    assert narrow < (stated.table["Rf_high"] - stated.table["Rf_low"]).median()  # less doubt, narrower band


def test_more_stated_air_means_more_fouling_found():
    """The same outlets with more air stated: the clean bundle would do more, so more fouling explains them."""
    ac, svc = _ac_and_service()
    lo = monitor_air_data(ac, svc, _frame(), steady=False)
    hi = monitor_air_data(ac, svc.replace(air_flow=180.0), _frame(), steady=False)
    assert np.all(hi.table["Rf"] > lo.table["Rf"])


def test_bad_rows_are_flagged_with_their_reason():
    ac, svc = _ac_and_service()
    frame = _frame(20).astype(object)  # a historian export: text cells among the numbers
    frame.loc[3, "tube_t_out"] = 300.0  # below the ambient: impossible for a cooled stream
    frame.loc[5, "tube_flow"] = ""
    frame.loc[7, "tube_flow"] = 0.0
    frame.loc[10:17, "air_t_in"] = 303.0  # a stuck ambient transmitter (8 rows >= 6)
    data = read_air_plant_data(frame)
    flags = data.frame["flag"]
    assert "tube outlet not between the ambient and the tube inlet" in flags[3]
    assert "missing tube_flow" in flags[5] and "tube_flow <= 0" in flags[7]
    assert all("flat-lined air_t_in" in flags[i] for i in range(10, 18))
    mon = monitor_air_data(ac, svc, frame, steady=False)
    assert mon.counts["used"] == 20 - 1 - 1 - 1 - 8
    assert np.isnan(mon.table.loc[3, "Rf"])


@pytest.mark.parametrize("kwargs, field", [
    ({"air_flow_from": "guessed"}, "air_flow_from"),
    ({"air_flow_from": "measured"}, "data.columns"),
    ({"columns": {"wind": "W"}}, "columns.wind"),
    ({"uncertainty": {"air_flow": 1.5}}, "uncertainty.air_flow"),
    ({"uncertainty": {"pressure": 0.1}}, "uncertainty.pressure"),
    ({"steady": {"span": "2 h"}}, "steady.span"),
])
def test_bad_settings_name_the_field(kwargs, field):
    ac, svc = _ac_and_service()
    with pytest.raises(InputError) as err:
        monitor_air_data(ac, svc, _frame(), **kwargs)
    assert err.value.field == field


# ------------------------------------------------------------------------------------------------ unit file problems
@pytest.mark.parametrize("change, path, words", [
    (lambda p: p.update(air_flow_from="guessed"), "exchangers[0].plant_data.air_flow_from", "one of"),
    (lambda p: p["columns"].update(tube_t_out="TI-2"), "exchangers[0].plant_data.columns.tube_t_out",
     "must give its unit"),
    (lambda p: p["columns"].update(tube_t_out={"column": "TI-9", "unit": "degC"}),
     "exchangers[0].plant_data.columns.tube_t_out", "must be a column of ac1.csv"),
    (lambda p: p["columns"].update(air_t_in={"column": "TAMB", "unit": "kg"}),
     "exchangers[0].plant_data.columns.air_t_in.unit", "temperature"),
    (lambda p: p.update(air_flow_from="fan_power"), "exchangers[0].plant_data.columns.fan_power",
     "air_flow_from: fan_power"),
    (lambda p: p.update(uncertainty={"air_flow": "150 %"}), "exchangers[0].plant_data.uncertainty.air_flow", "< 1"),
    (lambda p: p.update(steady={"window": "-2 h"}), "exchangers[0].plant_data.steady.window", "> 0"),
    (lambda p: p.update(file="../elsewhere.csv"), "exchangers[0].plant_data.file", "folder"),
    (lambda p: p.update(delimiter=";"), "exchangers[0].plant_data.delimiter", ","),
])
def test_unit_file_plant_data_problems_are_named(tmp_path, change, path, words):
    doc = unit_doc()
    change(doc["exchangers"][0]["plant_data"])
    frame = pd.DataFrame({"timestamp": ["2031-01-01 00:00", "2031-01-01 01:00"], "FI-1": [36.0, 36.1],
                          "TI-1": [120.0, 120.1], "TI-2": [60.0, 60.2], "TAMB": [30.0, 30.1]})
    problems = unitfile.check(write(tmp_path, doc, frame))
    mine = [p for p in problems if p.path == path]
    assert mine, problems
    assert words in mine[0].message


# ------------------------------------------------------------------------------------------------ study and report
def test_study_and_report_show_the_fouling_history(tmp_path):
    doc = unit_doc()
    frame0 = pd.DataFrame({"timestamp": ["2031-01-01 00:00"], "FI-1": [36.0], "TI-1": [120.0], "TI-2": [60.0],
                           "TAMB": [30.0]})
    path = write(tmp_path, doc, frame0)
    exchanger = unitfile.load(path).exchanger("AC-1").exchanger
    write(tmp_path, doc, hand_data(exchanger, 2e-4, n=20))
    study = run_air_case(unitfile.load(path).exchanger("AC-1"))
    from revamp.report import air

    items = air.monitoring_items(study)
    assert any(type(i).__name__ == "Figure" for i in items)
    assert "±15%" in items[0] and "stated in the unit file" in items[0]
    summary = air.air_summary(study)
    assert summary["fouling_now"] == pytest.approx(2e-4, rel=0.03, abs=5e-6)  # the hand data's input
    # without plant data the report says so (never a silent blank)
    del doc["exchangers"][0]["plant_data"]
    bare = run_air_case(unitfile.load(write(tmp_path, doc)).exchanger("AC-1"))
    assert air.monitoring_items(bare) == ["No plant-data analysis: the unit file gives no plant data for this air "
                                          "cooler."]


def test_demo_air_cooler_data_recover_the_generators_fouling():
    """The demo's invented series carries the fouling it was made with (rf_true, the generator's input)."""
    from revamp.cli import demo_unit_path

    path = demo_unit_path()
    unit, _, _ = unitfile.load_partial(path, only=["AC-301"])
    case = unit.exchanger("AC-301")
    mon, error = air_monitoring(case)
    assert error == ""
    used = mon.used
    truth = pd.read_csv(case.plant_data.file)["rf_true"].to_numpy()[used["row"].to_numpy()]
    last = used["timestamp"] >= used["timestamp"].max() - pd.Timedelta(days=30)
    # sensor noise of 0.3 K on each temperature (the generator's) averages out over a month of rows
    assert np.median(used["Rf"][last]) == pytest.approx(np.median(truth[last.to_numpy()]), rel=0.1)
