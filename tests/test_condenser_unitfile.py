"""Condensers in the unit file (``kind: condenser``): checked by path, built into a case beside the other kinds, and
studied; the study's numbers are the engine's own (consistency: the same calls made directly)."""
from __future__ import annotations

import copy

import numpy as np
import pytest

from revamp import unitfile
from revamp.errors import InputError
from revamp.unitfile import CondenserCase, ExchangerCase
from revamp.unitfile._condenser import CONDENSER_SCHEMA
from test_unitfile import make_unit, write_unit

CP = pytest.importorskip("CoolProp.CoolProp")

GEOMETRY = {"shell_id": "0.6 m", "tube_od": "19.05 mm", "tube_wall": "1.65 mm", "tube_length": "2.5 m",
            "tube_count": 400, "tube_passes": 2, "tube_pitch": "23.81 mm", "layout": 30, "baffle_spacing": "0.5 m",
            "baffle_cut": "25 %", "tube_material": "carbon steel"}
ENTRY = {
    "tag": "C-1", "kind": "condenser", "description": "hexane overhead condenser (invented)",
    "condensing_side": "shell", "geometry": GEOMETRY,
    "vapour": {"fluid": "n-Hexane", "pressure": "1.5 bar", "quality": 1.0, "flow": "6 kg/s",
               "fouling": "0.0001 m**2*K/W", "dp_allowed": "30 kPa"},
    "coolant": {"fluid": {"kind": "water", "pressure": "3 bar"}, "flow": "40 kg/s", "t_in": "30 degC",
                "fouling": "0.0003 m**2*K/W", "dp_allowed": "70 kPa"},
    "revamp": {"vapour_load": "7.5 kg/s"},
    "allowed": {"pressure": "1.7 bar"},
    "options": [{"type": "coolant_change", "flow_ratio": 1.3}],
}


def _unit(entry=None):
    doc = make_unit("E-1")
    doc["exchangers"].append(copy.deepcopy(ENTRY if entry is None else entry))
    return doc


def _set(node, dotted, value):
    keys = dotted.split(".")
    for k in keys[:-1]:
        node = node[int(k)] if isinstance(node, list) else node[k]
    node[keys[-1]] = value


def test_schema_file_holds_the_condenser_entry():
    """unit_schema.json carries the entry as the condenser module describes it (the two stay in step)."""
    s = unitfile.schema()
    assert s["$defs"]["condenser"] == CONDENSER_SCHEMA
    assert s["properties"]["exchangers"]["items"]["else"]["then"] == {"$ref": "#/$defs/condenser"}


def test_unit_with_a_condenser_checks_clean_and_loads(tmp_path):
    path = write_unit(tmp_path / "unit.yaml", _unit())
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    assert unit.tags == ["E-1", "C-1"]
    assert isinstance(unit.exchanger("E-1"), ExchangerCase)
    c = unit.exchanger("C-1")
    assert isinstance(c, CondenserCase) and c.kind == "condenser"
    assert (c.condensing_side, c.coolant_side) == ("shell", "tube")
    # saturated vapour in: its inlet is n-hexane's saturation temperature at 1.5 bar (CoolProp, independent)
    assert c.service.shell.t_in == pytest.approx(CP.PropsSI("T", "P", 1.5e5, "Q", 1.0, "n-Hexane"), abs=0.01)
    assert c.service.shell.quality == 1.0 and c.service.shell.flow == pytest.approx(6.0)
    # 30 °C = 303.15 K (definition of the Celsius scale); 1.5 bar = 1.5e5 Pa; 1.7 bar = 1.7e5 Pa (definitions)
    assert c.service.tube.t_in == pytest.approx(303.15)
    assert c.allowed_pressure == pytest.approx(1.7e5)
    # the revamp load as written, and its ratio to today's flow: 7.5 / 6 = 1.25 (arithmetic)
    assert c.vapour_load == pytest.approx(7.5) and c.throughput == pytest.approx(1.25)
    assert c.revamp_service.shell.flow == pytest.approx(7.5) and c.revamp_service.tube.flow == pytest.approx(40.0)
    assert c.service.fouling_shell == pytest.approx(1e-4) and c.service.fouling_tube == pytest.approx(3e-4)
    assert c.dp_allowed == {"condensing": pytest.approx(3e4), "coolant": pytest.approx(7e4)}


def test_superheat_and_the_tube_side(tmp_path):
    entry = copy.deepcopy(ENTRY)
    entry["condensing_side"] = "tube"
    entry["vapour"].pop("quality")
    entry["vapour"]["superheat"] = "10 K"
    unit = unitfile.load(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    c = unit.exchanger("C-1")
    assert (c.condensing_side, c.coolant_side) == ("tube", "shell")
    # 10 K above the dew point at 1.5 bar (CoolProp), as a vapour
    assert c.service.tube.t_in == pytest.approx(CP.PropsSI("T", "P", 1.5e5, "Q", 1.0, "n-Hexane") + 10.0, abs=0.01)
    assert c.service.tube.phase == "vapour"


@pytest.mark.parametrize("where, value, path", [
    ("geometry.tube_od", "25 kg", "exchangers[1].geometry.tube_od"),
    ("geometry.colour", "red", "exchangers[1].geometry.colour"),
    ("vapour.pressure", "-1 bar", "exchangers[1].vapour.pressure"),
    ("vapour.flow", "5 furlongs", "exchangers[1].vapour.flow"),
    ("vapour.quality", 1.5, "exchangers[1].vapour.quality"),
    ("vapour.fluid", "n-Pentane&n-Hexane", "exchangers[1].vapour.fluid"),
    ("vapour.fluid", "NoSuchFluid", "exchangers[1].vapour.fluid"),
    ("coolant.t_in", "35 furlongs", "exchangers[1].coolant.t_in"),
    ("coolant.t_in", "95 degC", "exchangers[1].coolant.t_in"),     # above hexane's dew point at 1.5 bar
    ("coolant.fluid.kind", "lava", "exchangers[1].coolant.fluid"),
    ("revamp.throughput", 1.2, "exchangers[1].revamp"),              # with vapour_load as well: one of the two
    ("allowed.pressure", "hot", "exchangers[1].allowed.pressure"),
    ("condensing_side", "both", "exchangers[1].condensing_side"),
    ("exchanger", "plate", "exchangers[1].exchanger"),
    ("options.0.type", "paint_it", "exchangers[1].options[0].type"),
    ("options.0.flow_ratio", -1, "exchangers[1].options[0].flow_ratio"),
    ("plant_data", {"file": "nowhere.csv"}, "exchangers[1].plant_data.file"),
    ("colour", "red", "exchangers[1].colour"),
])
def test_check_names_each_bad_field_by_its_path(tmp_path, where, value, path):
    doc = _unit()
    _set(doc["exchangers"][1], where, value)
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    assert path in [p.path for p in problems], problems
    assert all(p.path.startswith("exchangers[1]") for p in problems), problems  # the shell-and-tube one is fine
    with pytest.raises(unitfile.UnitFileError):
        unitfile.load(tmp_path / "unit.yaml")


def test_insert_in_condensing_tubes_is_refused_by_path(tmp_path):
    entry = copy.deepcopy(ENTRY)
    entry["condensing_side"] = "tube"
    entry["options"] = [{"type": "twisted_tape", "twist_ratio": 4}]
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].options[0].type"], problems


def test_plant_data_columns_are_checked_against_the_file(tmp_path):
    (tmp_path / "c1.csv").write_text("timestamp,coolant_flow,coolant_t_in,coolant_t_out\n"
                                     "2031-01-01 00:00,40,303.15,313.15\n", encoding="utf-8")
    entry = copy.deepcopy(ENTRY)
    entry["plant_data"] = {"file": "c1.csv", "condensing_from": "pressure"}
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].plant_data.columns.condensing_pressure"], problems


@pytest.mark.parametrize("text,words", [("", "header row"),
                                        ("timestamp,coolant_flow,coolant_t_in,coolant_t_out,condensing_pressure\n",
                                         "at least one data row")])
def test_plant_data_file_without_header_or_rows_is_named_at_check(tmp_path, text, words):
    # the same reading of a plant file's head as an air cooler's (common practice, no source: bad input is named)
    (tmp_path / "c1.csv").write_text(text, encoding="utf-8")
    entry = copy.deepcopy(ENTRY)
    entry["plant_data"] = {"file": "c1.csv", "condensing_from": "pressure"}
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].plant_data.file"], problems
    assert words in str(problems[0])


def test_tags_are_unique_across_kinds(tmp_path):
    entry = copy.deepcopy(ENTRY)
    entry["tag"] = "E-1"
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert "exchangers[1].tag" in [p.path for p in problems]


def test_a_condensing_curve_table_file(tmp_path):
    """A process data sheet's curve: temperature, heat released and vapour fraction, with their units."""
    # an invented curve; the phase properties are invented too, of the order of a light hydrocarbon's (SI)
    (tmp_path / "curve.csv").write_text(
        "temperature,heat_released,vapour_fraction,liquid_density,liquid_heat_capacity,liquid_viscosity,"
        "liquid_conductivity,vapour_density,vapour_heat_capacity,vapour_viscosity,vapour_conductivity\n"
        "85,0,1,600,2400,0.0002,0.11,5,1900,0.000008,0.018\n"
        "80,150,0.5,605,2380,0.00021,0.111,5.1,1890,0.0000079,0.0179\n"
        "75,300,0,610,2360,0.00022,0.112,5.2,1880,0.0000078,0.0178\n", encoding="utf-8")
    entry = copy.deepcopy(ENTRY)
    entry["vapour"].pop("fluid")
    entry["vapour"].update(curve="curve.csv", curve_units={"temperature": "degC", "heat_released": "kJ/kg"},
                           critical_pressure="30 bar")
    entry["coolant"]["t_in"] = "30 degC"
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert problems == []
    unit = unitfile.load(tmp_path / "unit.yaml")
    c = unit.exchanger("C-1")
    assert c.curve_file == (tmp_path / "curve.csv").resolve()
    from revamp.batch_remote import unit_files

    assert "curve.csv" in unit_files(unit, (tmp_path / "unit.yaml").resolve())  # sent to a cluster's workers too
    # 85 °C dew point and 300 kJ/kg latent heat, as the table says (unit definitions)
    assert c.vapour.fluid.t_dew == pytest.approx(358.15) and c.vapour.fluid.latent == pytest.approx(3e5)
    entry["vapour"]["curve_units"]["heat_released"] = "kWh"
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].vapour.curve_units.heat_released"], problems


@pytest.fixture(scope="module")
def study(tmp_path_factory):
    from revamp.studies.condenser import run_condenser_case

    path = write_unit(tmp_path_factory.mktemp("u") / "unit.yaml", _unit())
    case = unitfile.load(path).exchanger("C-1")
    return case, run_condenser_case(case, increments=6)


def test_the_study_equals_direct_engine_calls(study):
    """Consistency: every number of the study is the engine's own answer to the same question."""
    import revamp as rv
    from revamp.options_condenser import compare_condenser

    case, s = study
    direct = rv.rate(case.exchanger, case.revamp_service, increments=6)
    assert float(s.ratings["revamp"].duty) == pytest.approx(float(direct.duty), rel=1e-9)
    assert float(s.ratings["revamp"].t_out_coolant) == pytest.approx(float(direct.t_out_coolant), rel=1e-9)
    clean = rv.rate(case.exchanger, case.service.replace(fouling_shell=0.0, fouling_tube=0.0), increments=6)
    assert float(s.ratings["today (clean)"].U_clean) == pytest.approx(float(clean.U_clean), rel=1e-9)
    held = rv.condensing_pressure_for(case.exchanger, case.revamp_service, 7.5, increments=6)
    assert s.pressure.pressure == pytest.approx(held.pressure, rel=1e-9)
    assert s.holds == (held.pressure <= 1.7e5)
    table = compare_condenser(case.exchanger, case.revamp_service, case.options, vapour_load=7.5, increments=6)
    assert np.allclose(s.options["duty"].to_numpy(float), table["duty"].to_numpy(float), rtol=1e-9)
    assert s.options.loc["base", "condensing_pressure"] == pytest.approx(held.pressure, rel=1e-6)


def test_the_report_formats_the_study(study):
    from revamp.report import condenser

    case, s = study
    zones = condenser.zone_table(s)
    # the zones' area shares add up to the whole exchanger (definition of a share)
    assert zones["area share"].sum() == pytest.approx(1.0, abs=1e-3)
    summary = condenser.condenser_summary(s)
    assert summary["kind"] == "condenser" and summary["meets_target"] == s.holds
    assert "kPa" in s.answer or "bar" in s.answer
    fig = condenser.curve_figure(s)
    assert len(fig.data) == 4  # condensing and coolant lines, today and at revamp
    assert isinstance(condenser.condenser_options_table(s).index[0], str)


def test_run_condenser_case_refuses_another_kind():
    from revamp.studies.condenser import run_condenser_case

    with pytest.raises(InputError) as exc:
        run_condenser_case(object())
    assert exc.value.field == "case"


def test_the_batch_runs_a_condenser_with_its_own_notebook(tmp_path):
    """The batch picks the study notebook by the exchanger's kind."""
    from pathlib import Path

    from revamp.batch import _plan, notebook_path

    path = Path(write_unit(tmp_path / "unit.yaml", _unit()))
    unit, problems, entries = unitfile.load_partial(path)
    rows, jobs = _plan(unit, problems, entries, notebook_path(), path, 60, "SI")
    by_tag = {j["tag"]: Path(j["notebook"]).name for j in jobs}
    assert by_tag == {"E-1": "exchanger_study.ipynb", "C-1": "condenser_study.ipynb"}


AIR_GEOMETRY = {"bays": 1, "bundles_per_bay": 1, "tube_rows": 4, "tubes_per_row": 46, "tube_passes": 2,
                "tube_length": "9.14 m", "tube_od": "25.4 mm", "tube_wall": "2.11 mm", "transverse_pitch": "63.5 mm",
                "row_pitch": "55 mm", "tube_material": "carbon steel",
                "fin": {"height": "15.9 mm", "thickness": "0.4 mm", "per_length": "394 /m", "material": "aluminium",
                        "bond": "embedded"},
                "fans_per_bay": 2, "fan_diameter": "3.66 m", "fan_efficiency": 0.65, "draft": "forced"}


def test_an_air_cooled_condenser(tmp_path):
    entry = {k: copy.deepcopy(v) for k, v in ENTRY.items() if k not in ("coolant", "condensing_side", "options")}
    entry.update(exchanger="air cooler", geometry=AIR_GEOMETRY, air_side={"t_in": "25 degC", "flow": "150 kg/s"},
                 options=[{"type": "fan_upgrade", "speed_ratio": 1.1}])
    entry["vapour"]["flow"] = "2 kg/s"
    path = write_unit(tmp_path / "unit.yaml", _unit(entry))
    assert unitfile.check(path) == []
    c = unitfile.load(path).exchanger("C-1")
    assert (c.condensing_side, c.coolant_side) == ("tube", "air")
    # 25 °C = 298.15 K (definition); the vapour in the tubes, saturated
    assert c.service.air_in == pytest.approx(298.15) and c.service.tube.quality == 1.0
    water = {"fluid": {"kind": "water"}, "flow": 1, "t_in": 300}
    for where, value, path_ in (("coolant", water, "exchangers[1].coolant"),
                                ("condensing_side", "shell", "exchangers[1].condensing_side"),
                                ("options", [{"type": "add_shells", "n": 1}], "exchangers[1].options[0].type")):
        bad = copy.deepcopy(entry)
        bad[where] = value
        problems = unitfile.check(write_unit(tmp_path / "bad.yaml", _unit(bad)))
        assert path_ in [p.path for p in problems], (where, problems)


def test_a_coolprop_mixture(tmp_path):
    entry = copy.deepcopy(ENTRY)
    entry["vapour"].pop("fluid")
    entry["vapour"]["mixture"] = "HEOS::n-Pentane[0.5]&n-Hexane[0.5]"
    assert unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry))) == []
    c = unitfile.load(tmp_path / "unit.yaml").exchanger("C-1")
    # a mixture condenses over a range: its dew point above its bubble point (phase rule; CoolProp gives both)
    assert c.vapour.fluid.t_dew > c.vapour.fluid.t_bubble + 1.0
    entry["vapour"]["mixture"] = "HEOS::Nothing[0.5]&n-Hexane[0.5]"
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].vapour.mixture"], problems
    entry["vapour"]["fluid"] = "n-Hexane"  # two ways at once
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == ["exchangers[1].vapour"], problems
