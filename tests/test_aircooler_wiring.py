"""Air coolers in the unit file, the demo, the unit table and the batch: an entry of ``kind: air cooler`` is checked
by path, loaded into an air-cooler case beside the shell-and-tube ones, and studied in a report of its own."""
from __future__ import annotations

import copy
import re

import numpy as np
import pytest
import yaml

from revamp import report, unitfile
from revamp.unitfile import AirCoolerCase, ExchangerCase
from revamp.unitfile._aircooler import AIR_COOLER_SCHEMA
from test_aircooler_unitfile import ENTRY
from test_unitfile import make_unit, write_unit


def _unit_with_air_cooler(entry=None, shell_and_tube=("E-1",)):
    doc = make_unit(*shell_and_tube) if shell_and_tube else make_unit("E-1")
    if not shell_and_tube:
        doc["exchangers"] = []
    doc["exchangers"].append(copy.deepcopy(ENTRY if entry is None else entry))
    return doc


def _set(node, dotted, value):
    keys = dotted.split(".")
    for k in keys[:-1]:
        node = node[int(k)] if isinstance(node, list) else node[k]
    node[keys[-1]] = value


def test_schema_file_holds_the_air_cooler_entry():
    """unit_schema.json carries the entry as the air-cooler module describes it (the two stay in step)."""
    s = unitfile.schema()
    assert s["$defs"]["air_cooler"] == AIR_COOLER_SCHEMA
    assert s["properties"]["exchangers"]["items"]["then"] == {"$ref": "#/$defs/air_cooler"}


def test_unit_with_an_air_cooler_checks_clean_and_loads_both_kinds(tmp_path):
    path = write_unit(tmp_path / "unit.yaml", _unit_with_air_cooler())
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    assert unit.tags == ["E-1", "AC-101"]
    assert isinstance(unit.exchanger("E-1"), ExchangerCase)
    ac = unit.exchanger("AC-101")
    assert isinstance(ac, AirCoolerCase) and ac.kind == "air cooler"
    # 150 °C = 423.15 K and 35 °C = 308.15 K (definition of the Celsius scale); 25 kg/s as written
    assert ac.service.tube.t_in == pytest.approx(423.15) and ac.service.air_in == pytest.approx(308.15)
    assert ac.service.tube.flow == pytest.approx(25.0) and ac.exchanger.bays == 2
    # 15.9 mm fin height, 394 fins per metre, as written (mm -> m by definition)
    assert ac.exchanger.fin.height == pytest.approx(0.0159) and ac.exchanger.fin.per_length == pytest.approx(394.0)


@pytest.mark.parametrize("where, value, path", [
    ("geometry.tube_od", "25 kg", "exchangers[1].geometry.tube_od"),
    ("geometry.draft", "sideways", "exchangers[1].geometry.draft"),
    ("geometry.fin.bond", "glued", "exchangers[1].geometry.fin.bond"),
    ("tube_side.flow", "-5 kg/s", "exchangers[1].tube_side.flow"),
    ("tube_side.fluid.density", "heavy", "exchangers[1].tube_side.fluid.density"),
    ("air_side.t_in", "35 furlongs", "exchangers[1].air_side.t_in"),
    ("air_side.humidity", "50 %", "exchangers[1].air_side.humidity"),
    ("hot_day.ambient", "40 degC", "exchangers[1].hot_day.ambient"),
    ("options.0.type", "paint_it", "exchangers[1].options[0].type"),
    ("colour", "red", "exchangers[1].colour"),
])
def test_check_names_each_bad_field_by_its_path(tmp_path, where, value, path):
    doc = _unit_with_air_cooler()
    _set(doc["exchangers"][1], where, value)
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    assert path in [p.path for p in problems], problems
    assert all(p.path.startswith("exchangers[1]") for p in problems), problems  # the shell-and-tube one is fine
    with pytest.raises(unitfile.UnitFileError):
        unitfile.load(tmp_path / "unit.yaml")


def test_every_bad_field_at_once(tmp_path):
    doc = _unit_with_air_cooler()
    x = doc["exchangers"][1]
    x["air_side"]["t_in"], x["tube_side"]["flow"], x["geometry"]["fin"]["bond"] = "hot", "-1 kg/s", "glued"
    paths = {p.path for p in unitfile.check(write_unit(tmp_path / "unit.yaml", doc))}
    assert {"exchangers[1].air_side.t_in", "exchangers[1].tube_side.flow", "exchangers[1].geometry.fin.bond"} <= paths


def test_a_misspelt_kind_is_named_and_lists_the_kinds(tmp_path):
    doc = _unit_with_air_cooler(dict(ENTRY, kind="air coolr"))
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    kind = [p for p in problems if p.path == "exchangers[1].kind"]
    assert kind and "air cooler" in kind[0].message and "shell and tube" in kind[0].message


def test_tags_are_unique_across_kinds(tmp_path):
    doc = _unit_with_air_cooler(dict(ENTRY, tag="E-1"))
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    assert [p.path for p in problems] == ["exchangers[1].tag"] and "unique" in problems[0].message


def test_a_broken_air_cooler_does_not_stop_the_others(tmp_path):
    doc = _unit_with_air_cooler()
    doc["exchangers"][1]["tube_side"]["flow"] = "-5 kg/s"
    unit, problems, entries = unitfile.load_partial(write_unit(tmp_path / "unit.yaml", doc))
    assert unit.tags == ["E-1"] and entries == [("E-1", 0), ("AC-101", 1)]
    assert [p.path for p in problems] == ["exchangers[1].tube_side.flow"]


def test_shell_and_tube_may_say_its_kind(tmp_path):
    doc = make_unit("E-1")
    doc["exchangers"][0]["kind"] = "shell and tube"
    assert unitfile.check(write_unit(tmp_path / "unit.yaml", doc)) == []


def test_the_demo_has_an_air_cooler_and_checks_clean():
    from revamp.cli import demo_unit_path

    assert unitfile.check(demo_unit_path()) == []
    unit = unitfile.load(demo_unit_path())
    coolers = [c for c in unit.exchangers if isinstance(c, AirCoolerCase)]
    assert len(coolers) == 1
    ac = coolers[0]
    kinds = {type(o).__name__ for o in ac.options}
    assert {"FanUpgrade", "AddBays"} <= kinds
    assert ac.hot_day_ambient and ac.t_out_target is not None and ac.exchanger.tube_rows % ac.exchanger.tube_passes == 0
    # the train is still the shell-and-tube preheat train: the air cooler is not one of its matches
    assert ac.tag not in unit.network.exchangers


def test_unit_table_gives_the_air_cooler_a_row():
    from revamp.cli import demo_unit_path

    unit = unitfile.load(demo_unit_path())
    table = report.unit_table(unit)
    row = table.loc["AC-301"]
    assert "error" not in table.columns or not isinstance(row.get("error"), str)
    assert row["duty today [kW]"] > 0 and isinstance(row["controlling resistance"], str)


def test_interpolated_limit_by_definition():
    """Linear interpolation between the two sweep points that bracket the target (definition)."""
    from revamp.report.air import _interpolated_limit

    amb = np.array([290.0, 300.0, 310.0])
    out = np.array([320.0, 330.0, 340.0])
    # target 335 lies halfway between 330 (at 300 K) and 340 (at 310 K): 305 K
    assert _interpolated_limit(amb, out, 335.0) == pytest.approx(305.0)
    assert _interpolated_limit(amb, out, 350.0) is None  # never reached inside the sweep
    assert _interpolated_limit(amb, out, 310.0) is None  # already lost at the coldest point
    assert _interpolated_limit(amb, out, None) is None


def test_study_energy_balance_and_hot_day_physics():
    """The study's ratings keep the energy balance on both streams (first law), and the hottest day gives less duty
    than the same flows at today's ambient (a hotter ambient, less driving force)."""
    from revamp.cli import demo_unit_path
    from revamp.report.air import run_air_case

    unit = unitfile.load(demo_unit_path())
    study = run_air_case(unit.exchanger("AC-301"))
    for r in study.ratings.values():
        tube = float(r.C_tube) * (float(r.service.tube.t_in) - float(r.t_out_tube))
        air = float(r.C_air) * (float(r.t_out_air) - float(r.service.air_in))
        assert tube == pytest.approx(float(r.duty), rel=2e-2) and air == pytest.approx(float(r.duty), rel=2e-2)
    # the hottest day is rated at the revamp flows: against the revamp rating at today's (cooler) ambient
    assert study.ratings["hottest day"].duty < study.ratings["revamp"].duty
    assert study.ratings["today (clean)"].duty > study.ratings["today"].duty  # fouling costs duty
    assert list(study.options.index)[0] == "base" and len(study.options) == 1 + len(study.case.options)


def test_run_air_case_refuses_a_shell_and_tube_case(tmp_path):
    from revamp.errors import InputError
    from revamp.report.air import run_air_case

    unit = unitfile.load(write_unit(tmp_path / "unit.yaml", make_unit("E-1")))
    with pytest.raises(InputError, match="case"):
        run_air_case(unit.exchangers[0])


def test_batch_writes_the_air_coolers_report_and_the_index_lists_it(tmp_path):
    from revamp.batch import run_batch

    path = write_unit(tmp_path / "unit.yaml", _unit_with_air_cooler(shell_and_tube=()))
    res = run_batch(path, tmp_path / "out", jobs=1, progress=False)
    assert res.failures == {}, res.failures
    page = res.reports["AC-101"].read_text(encoding="utf-8")
    assert "Study of one air cooler" in page and "Hot day" in page and "ambient" in page
    assert "Traceback" not in page
    index = res.index_path.read_text(encoding="utf-8")
    summary = re.search(r'<section id="summary">(.*?)</section>', index, re.DOTALL).group(1)
    row = [r for r in re.findall(r"<tr>(.*?)</tr>", summary, re.DOTALL) if "AC-101" in r]
    assert row and 'href="AC-101.html"' in row[0] and "rv-status-ok" in row[0]


def test_revamp_throughput_scales_the_tube_flow_only(tmp_path):
    path = write_unit(tmp_path / "unit.yaml", _unit_with_air_cooler(dict(ENTRY, revamp={"throughput": "120 %"})))
    assert unitfile.check(path) == []
    ac = unitfile.load(path).exchanger("AC-101")
    # 120 % of 25 kg/s = 30 kg/s (definition of the per cent); the air and the inlets as today
    assert ac.throughput == pytest.approx(1.2) and ac.revamp_service.tube.flow == pytest.approx(30.0)
    assert ac.revamp_service.air_flow == pytest.approx(ac.service.air_flow)
    assert ac.revamp_service.tube.t_in == pytest.approx(ac.service.tube.t_in)
    assert unitfile.load(write_unit(tmp_path / "u2.yaml", _unit_with_air_cooler())).exchanger("AC-101").revamp_service \
        is None


@pytest.mark.parametrize("revamp, path", [
    ({"throughput": -1}, "exchangers[1].revamp.throughput"),
    ({"throughput": 11}, "exchangers[1].revamp.throughput"),
    ({"throughput": "fast"}, "exchangers[1].revamp.throughput"),
    ({}, "exchangers[1].revamp.throughput"),
    ({"throughput": 1.2, "side": "shell"}, "exchangers[1].revamp.side"),
])
def test_bad_revamp_is_named_by_its_path(tmp_path, revamp, path):
    doc = _unit_with_air_cooler(dict(ENTRY, revamp=revamp))
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    assert path in [p.path for p in problems], problems


def test_study_at_the_revamp_conditions():
    """The demo's air cooler carries more kerosene at the revamp rates: more duty, a hotter outlet (the same air)."""
    from revamp.cli import demo_unit_path
    from revamp.report.air import air_summary, run_air_case

    study = run_air_case(unitfile.load(demo_unit_path()).exchanger("AC-301"))
    today, rev = study.ratings["today"], study.ratings["revamp"]
    assert rev.duty > today.duty and rev.t_out_tube > today.t_out_tube
    assert "revamp" in study.basis
    s = air_summary(study)
    assert s["duty_revamp"] == pytest.approx(float(rev.duty)) and s["kind"] == "air cooler"


def test_a_limit_search_that_leaves_the_fluid_range_falls_back_to_the_sweep(monkeypatch):
    """When the search for the limiting ambient cannot run, the report keeps the sweep and reads the limit off it by
    linear interpolation (definition), saying so."""
    import importlib

    from revamp.cli import demo_unit_path
    from revamp.errors import InputError
    from revamp.report.air import run_air_case

    hot_day_module = importlib.import_module("revamp.hot_day")
    real = hot_day_module.hot_day

    def refusing(exchanger, service, ambient, t_out_target=None, **kw):
        if t_out_target is not None:
            raise InputError("service.tube", "kerosene at 253 K", "within the fluid's single-phase range")
        return real(exchanger, service, ambient, **kw)

    monkeypatch.setattr(hot_day_module, "hot_day", refusing)
    case = unitfile.load(demo_unit_path()).exchanger("AC-301")
    study = run_air_case(case)
    assert "interpolation" in study.hot_note and study.hot.t_out_target is None
    amb, out = study.hot.ambient, study.hot.t_out_tube
    k = int(np.flatnonzero(out > case.t_out_target)[0])
    expected = amb[k - 1] + (case.t_out_target - out[k - 1]) * (amb[k] - amb[k - 1]) / (out[k] - out[k - 1])
    from revamp.units import format_quantity

    assert format_quantity(expected, "temperature") in study.hot_note


def test_interpolated_limit_takes_the_ambients_in_any_order():
    from revamp.report.air import _interpolated_limit

    # the same sweep as above, listed hottest first: still 305 K (linear interpolation, definition)
    assert _interpolated_limit(np.array([310.0, 290.0, 300.0]), np.array([340.0, 320.0, 330.0]), 335.0) == \
        pytest.approx(305.0)
