"""An exchanger's study takes its inlets from the unit's train (unitfile.network_inlets).

Expected values: the train's own solve (each exchanger's inlet is where the stream left the one before it on its
route: route continuity, by definition of the network), and the study's ratings at exactly those services.
"""
import pytest
from test_train_unitfile import unit_doc, write

from revamp import unitfile
from revamp.studies import study_exchanger


def test_inlets_come_from_the_train_and_reach_the_study(tmp_path):
    path = write(tmp_path, unit_doc())
    today, revamp, text = unitfile.network_inlets(path, "E-2")
    unit = unitfile.load(path)
    res = unit.network.solve(tol=1e-6)
    # crude meets E-1 then E-2: E-2's tube inlet is E-1's crude outlet (no heat taken at the desalter point)
    assert float(today.tube.t_in) == pytest.approx(float(res.ratings["E-1"].t_out_tube), abs=2e-3)
    # the residue meets E-2 first: its shell inlet is the residue's supply temperature, 340 degC
    assert float(today.shell.t_in) == pytest.approx(340 + 273.15, abs=1e-9)
    assert float(revamp.tube.flow) == pytest.approx(1.2 * float(today.tube.flow), rel=1e-12)  # throughput 1.2
    assert "from the train" in text
    study = study_exchanger(unit.exchanger("E-2"), service_today=today, service_revamp=revamp, mc_draws=0)
    assert float(study.today.service.tube.t_in) == pytest.approx(float(today.tube.t_in), rel=1e-12)


def test_an_exchanger_outside_the_network_keeps_its_own_inlets(tmp_path):
    path = write(tmp_path, unit_doc())
    assert unitfile.network_inlets(path, "C-1") == (None, None, "")


def test_each_option_is_valued_by_the_train_not_by_its_own_duty(tmp_path):
    # an upstream gain is partly lost downstream (energy balance of the train): the fired duty the train saves is
    # less than the exchanger's own duty gain; the report shows both side by side
    import revamp as rv
    from revamp import report

    doc = unit_doc()
    doc["exchangers"][0]["options"] = [{"type": "twisted_tape", "label": "tape", "twist_ratio": 4,
                                        "thickness": "0.8 mm"}]
    path = write(tmp_path, doc)
    ts = unitfile.network_option_values(path, "E-1")
    assert list(ts.table.index) == ["base", "E-1: tape"]
    items = report.train_value_items(ts, "E-1", "USD")
    table = items[1]
    gain = table.loc["tape", "duty gain in this exchanger [MW]"]
    saved = table.loc["tape", "fired duty saved by the train [MW]"]
    eff = 0.85  # the furnace's efficiency in the file: fired = absorbed / efficiency
    assert gain > 0 and 0 < saved * eff < gain
    assert unitfile.network_option_values(path, "C-1") is None  # not in the network
    assert isinstance(rv.train.TrainStudy, type)
