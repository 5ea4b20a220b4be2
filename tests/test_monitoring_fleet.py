"""Fleet monitoring (revamp.monitoring.fleet.monitor_many): the same answer wherever it runs, failures per exchanger.

The fleet rows are checked against monitor() run directly on each exchanger (the function must only distribute the
work); data are invented (the demo generator).
"""
import sys
from pathlib import Path

import numpy as np
import pytest

from revamp import unitfile
from revamp.cli import demo_unit_path
from revamp.executor import executor_for
from revamp.monitoring import monitor
from revamp.monitoring.fleet import monitor_many

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "data"))
pytest.importorskip("distributed")


@pytest.fixture(scope="module")
def cases():
    import generate_plant_data as gen

    unit = unitfile.load(demo_unit_path())
    out = []
    for k, case in enumerate(unit.exchangers[:3]):
        df = gen.generate(case.exchanger, case.service, hours=24 * 20, fouling_law=gen.Linear(a=2e-5, b_per_year=6e-4),
                          seed=k, bad_rows=False).drop(columns=["rf_true"])
        out.append((case.tag, case.exchanger, case.service, df, {"mc_draws": 0}))
    return out


def test_fleet_rows_equal_direct_monitoring_in_process_and_on_a_cluster(cases):
    a = monitor_many(cases, min_rows=100)
    b = monitor_many(cases, executor=executor_for("local:2"), min_rows=100)
    for tag, exchanger, service, df, kw in cases:
        m = monitor(exchanger, service, df, **kw)
        used = m.table[m.table["used"]]
        assert a.loc[tag, "rf_now"] == pytest.approx(float(used["Rf"].iloc[-1]), rel=1e-12)
        assert a.loc[tag, "rows_used"] == len(used)
    assert np.allclose(a["rf_now"].to_numpy(float), b["rf_now"].to_numpy(float), rtol=1e-12)


def test_one_bad_exchanger_fails_alone(cases):
    bad = ("BAD", cases[0][1], cases[0][2], cases[0][3].drop(columns=["tube_t_out"]), {"mc_draws": 0})
    rows = monitor_many(list(cases[:1]) + [bad])
    assert rows.loc[cases[0][0], "ok"] and not rows.loc["BAD", "ok"]
    assert "tube_t_out" in rows.loc["BAD", "error"]
