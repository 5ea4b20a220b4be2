"""The unit file's plant_data settings reach monitor(): CSV dialect, steady filter, cleanings, drift tolerance, and
the run length the projection ("Rf at end of run") must honour.

Data are invented here: the rating engine makes the outlets of the unit file's own exchanger at a fouling law set by
the test, and the expected values follow from that law and from the settings written into the file.
"""
import numpy as np
import pandas as pd
import pytest

import revamp as rv
from revamp import unitfile
from test_unitfile import CSV_HEADER, make_unit, write_unit

DAY = 86400.0


def _unit(tmp_path, **plant):
    (tmp_path / "plant").mkdir(exist_ok=True)
    path = tmp_path / "plant" / "e1.csv"
    if not path.exists():
        d = plant.get("delimiter", ",")  # one placeholder row (check wants data below the header); the tests
        path.write_text(CSV_HEADER.replace(",", d)  # write the real rows from the exchanger once it is built
                        + d.join(["2031-03-01 00:00", "10", "420", "400", "12", "300", "320"]) + "\n")
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {"file": "plant/e1.csv", "fouling_side": "tube", **plant}
    return write_unit(tmp_path / "unit.yaml", doc), path


def _data(case, days=42, rate=4e-4 / 42 / DAY, seed=0):
    """Hourly rows of the case's exchanger at Rf = 1e-4 + rate·t (tube side, outside area), with small noise."""
    n = days * 24
    rng = np.random.default_rng(seed)
    t = np.arange(n) * 3600.0
    svc = case.service
    m_s = float(svc.shell.flow) * (1 + 0.02 * np.sin(t / 50000.0)) * (1 + rng.normal(0, 0.002, n))
    m_t = float(svc.tube.flow) * (1 + 0.02 * np.cos(t / 70000.0)) * (1 + rng.normal(0, 0.002, n))
    ts_in = float(svc.shell.t_in) + 0.5 * np.sin(t / 90000.0)
    tt_in = float(svc.tube.t_in) + 0.3 * np.sin(t / 40000.0)
    ex = case.exchanger
    rf = 1e-4 + rate * t
    r = rv.rate(ex, rv.Service(shell=rv.Stream(svc.shell.fluid, m_s, ts_in), tube=rv.Stream(svc.tube.fluid, m_t, tt_in),
                               fouling_tube=rf * ex.tube_id / ex.tube_od))
    return pd.DataFrame({"timestamp": pd.date_range("2031-03-01", periods=n, freq="h"), "shell_flow": m_s,
                         "shell_t_in": ts_in + rng.normal(0, 0.05, n), "shell_t_out": r.t_out_shell + rng.normal(0, 0.05, n),
                         "tube_flow": m_t, "tube_t_in": tt_in + rng.normal(0, 0.05, n),
                         "tube_t_out": r.t_out_tube + rng.normal(0, 0.05, n)})


def test_semicolon_file_is_one_problem_naming_the_separator(tmp_path):
    (tmp_path / "plant").mkdir()
    (tmp_path / "plant" / "e1.csv").write_text(CSV_HEADER.replace(",", ";") + "2031-03-01 00:00;10,5;420,1;400,2;12,0;"
                                                                               "303,1;320,4\n")
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {"file": "plant/e1.csv"}
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    assert len(problems) == 1  # not one per column
    p = problems[0]
    assert p.path == "exchangers[0].plant_data.delimiter"
    assert "';'" in p.message and "decimal ','" in p.message
    doc["exchangers"][0]["plant_data"].update(delimiter=";", decimal=",")
    assert unitfile.check(write_unit(tmp_path / "unit.yaml", doc)) == []


@pytest.mark.parametrize("key, value, words", [
    ("timezone", "Mars/Olympus", "IANA"),
    ("cleanings", ["soon"], "date"),
    ("steady", {"t_range": "-1 delta_degC"}, "> 0"),
    ("steady", {"windows": "4 h"}, "not a known field"),
    ("decimal", ";", "one of"),
    ("dayfirst", "yes", "true or false"),
    ("drift_tolerance", "150 %", "< 1"),
])
def test_bad_plant_data_settings_name_their_path(tmp_path, key, value, words):
    path, _ = _unit(tmp_path, **{key: value})
    problems = unitfile.check(path)
    assert problems, (key, value)
    assert any(p.path.startswith(f"exchangers[0].plant_data.{key}") and words in p.message for p in problems), \
        [str(p) for p in problems]


def test_settings_reach_monitor(tmp_path):
    path, csv = _unit(tmp_path, delimiter=";", decimal=",", dayfirst=True, timezone="UTC",
                      steady={"window": "3 h", "t_range": "5 delta_degC", "flow_rsd": "3 %", "min_rows": 2},
                      cleanings=[], drift_tolerance="3 %", run_length="720 day")
    case = unitfile.load(path).exchanger("E-1")
    opts = case.plant_data.monitor_options()
    assert opts["dialect"] == {"delimiter": ";", "decimal": ",", "dayfirst": True, "timezone": "UTC"}
    # the steady settings in SI as written: 3 h = 10800 s, 5 K, 3 % = 0.03
    assert opts["steady"] == {"window": pytest.approx(10800.0), "t_range": pytest.approx(5.0),
                              "flow_rsd": pytest.approx(0.03), "min_rows": 2}
    assert opts["cleanings"] == [] and opts["drift_tolerance"] == pytest.approx(0.03)
    df = _data(case)
    out = df.copy()
    out["timestamp"] = out["timestamp"].dt.strftime("%d/%m/%Y %H:%M")
    out.to_csv(csv, sep=";", decimal=",", index=False)
    m = rv.monitor(case.exchanger, case.service, case.plant_data.file, mc_draws=0, models=("linear",),
                   run_length=case.run_length, **opts)
    assert list(m.table["timestamp"]) == list(df["timestamp"])
    sf = m.steady_filter
    assert (sf.window, sf.t_range, sf.flow_rsd, sf.min_rows) == (pytest.approx(10800.0), pytest.approx(5.0),
                                                                 pytest.approx(0.03), 2)
    assert m.drift.tolerance == pytest.approx(0.03) and len(m.cycles) == 1
    # the unit file's run length is the projection horizon: 720 days, Rf there from the law set above
    assert m.horizon.run_time == pytest.approx(720 * DAY) and m.horizon.source == "run_length"
    assert m.summary["projection run time [day]"] == pytest.approx(720.0)
    assert m.summary["Rf at end of run [m2K/W]"] == pytest.approx(1e-4 + 4e-4 / 42 * 720, rel=0.1)


def test_without_run_length_the_default_is_said(tmp_path):
    path, csv = _unit(tmp_path)
    case = unitfile.load(path).exchanger("E-1")
    _data(case, days=10).to_csv(csv, index=False)
    m = rv.monitor(case.exchanger, case.service, case.plant_data.file, mc_draws=0, models=("linear",),
                   **case.plant_data.monitor_options())
    assert m.horizon.source == "twice the data span"
    span = (m.table["timestamp"].iloc[-1] - m.table.loc[m.table["used"], "timestamp"].iloc[0]).total_seconds()
    assert m.horizon.run_time == pytest.approx(2 * span)
    assert "no run length given" in m.summary["projection horizon from"]


def test_report_projects_to_the_unit_files_run_length(tmp_path):
    from revamp.report.case import run_case

    path, csv = _unit(tmp_path, run_length="720 day")
    case = unitfile.load(path).exchanger("E-1")
    _data(case).to_csv(csv, index=False)
    mon = run_case(case, mc_draws=0).monitoring
    assert mon is not None
    assert mon.summary["projection run time [day]"] == pytest.approx(720.0)  # the unit file's 720 days


@pytest.mark.parametrize("value, expected", [(False, False), (True, {})])
def test_steady_false_keeps_every_row_and_true_takes_the_defaults(tmp_path, value, expected):
    path, _ = _unit(tmp_path, steady=value)
    assert unitfile.load(path).exchanger("E-1").plant_data.monitor_options()["steady"] == expected
