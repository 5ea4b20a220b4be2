"""The unit file: every problem listed with its path, nothing computed on invalid input, safe YAML, safe paths.

Unit conversions checked here use exact definitions (1 lb = 0.45359237 kg, NIST SP 811 appendix B; T[K] =
(T[°F] + 459.67)/1.8, NIST SP 811 §B.8), not our own outputs.
"""
from __future__ import annotations

import copy
import json
import os

import jsonschema
import pytest
import yaml

from revamp import unitfile
from revamp.units import DIMENSIONS

# ----------------------------------------------------------------------------------------------- shared small units
# (test_cli, test_batch and test_browser import these builders: constant-property fluids, fast, no CoolProp)
OIL = {"kind": "constant", "name": "test oil", "density": "850 kg/m**3", "heat_capacity": "2.2 kJ/kg/K",
       "viscosity": "2 cP", "conductivity": "0.12 W/m/K"}
WATER = {"kind": "constant", "name": "test water", "density": 995, "heat_capacity": 4180, "viscosity": 8e-4,
         "conductivity": 0.6}


def make_exchanger(tag="E-1"):
    return {
        "tag": tag,
        "description": "test exchanger",
        "geometry": {"shell_id": "0.5 m", "tube_od": "19.05 mm", "tube_wall": "2.11 mm", "tube_length": "5 m",
                     "tube_count": 200, "tube_passes": 2, "tube_pitch": "25.4 mm", "layout": 90,
                     "baffle_spacing": "0.3 m", "baffle_cut": "25 %"},
        "shell_side": {"fluid": copy.deepcopy(OIL), "flow": "10 kg/s", "t_in": "150 degC",
                       "fouling": "0.0003 m**2*K/W", "dp_allowed": "70 kPa"},
        "tube_side": {"fluid": copy.deepcopy(WATER), "flow": "12 kg/s", "t_in": "30 degC",
                      "fouling": "0.0002 m**2*K/W", "dp_allowed": "70 kPa"},
        "revamp": {"throughput": 1.2, "target": {"duty": "2 MW"}},
        "options": [{"type": "clean", "label": "clean", "side": "both", "capex": 20000},
                    {"type": "add_shells", "label": "one more shell", "n": 1, "capex": "300000 USD"}],
    }


def make_unit(*tags):
    return {
        "version": 1,
        "unit": {"name": "Test unit", "description": "invented for the tests"},
        "economics": {"currency": "USD", "energy_price": "9 USD/GJ", "heater_efficiency": "85 %",
                      "hours_per_year": "8400 h", "discount_rate": 0.1, "horizon": "10 yr"},
        "exchangers": [make_exchanger(t) for t in (tags or ("E-1",))],
    }


def write_unit(path, doc) -> str:
    path.write_text(yaml.safe_dump(doc, sort_keys=False, allow_unicode=True), encoding="utf-8")
    return str(path)


CSV_HEADER = "timestamp,shell_flow,shell_t_in,shell_t_out,tube_flow,tube_t_in,tube_t_out\n"


# ------------------------------------------------------------------------------------------------------ valid file
def test_valid_unit_loads_with_si_values(tmp_path):
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][1]["shell_side"]["flow"] = "43800 lb/h"
    doc["exchangers"][1]["shell_side"]["t_in"] = "390 degF"
    path = write_unit(tmp_path / "unit.yaml", doc)
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    assert unit.tags == ["E-1", "E-2"]
    case = unit.exchanger("E-2")
    # 43800 lb/h × 0.45359237 kg/lb / 3600 s/h (exact definition of the pound)
    assert case.service.shell.flow == pytest.approx(43800 * 0.45359237 / 3600, rel=1e-12)
    # (390 + 459.67) / 1.8 K (definition of the Rankine and Fahrenheit scales)
    assert case.service.shell.t_in == pytest.approx((390 + 459.67) / 1.8, rel=1e-12)
    # revamp flows are today's × 1.2
    assert case.revamp_service.tube.flow == pytest.approx(1.2 * 12.0)
    assert case.target == {"duty": pytest.approx(2e6)}
    assert case.limits == {"dp_shell": pytest.approx(70e3), "dp_tube": pytest.approx(70e3)}
    assert case.capex == {"clean": 20000.0, "one more shell": 300000.0}
    assert [o.label for o in case.options] == ["clean", "one more shell"]
    # 9 USD/GJ, 85 %, 8400 h, 10 yr
    assert case.economics.energy_price == pytest.approx(9.0)
    assert case.economics.efficiency == pytest.approx(0.85)
    assert unit.economics.hours_per_year == pytest.approx(8400)
    assert unit.economics.horizon_years == pytest.approx(10.0)
    assert len(unit.sha256) == 64


def test_schema_is_valid_and_every_kind_is_known():
    schema = unitfile.schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    kinds = set()

    def walk(node):
        if isinstance(node, dict):
            if "x-kind" in node:
                kinds.add(node["x-kind"])
            for v in node.values():
                walk(v)
        elif isinstance(node, list):
            for v in node:
                walk(v)

    walk(schema)
    assert kinds, "the schema annotates its quantities"
    assert kinds <= set(DIMENSIONS) | {"money", "energy_price", "money_per_mass", "thermal_conductance"}


def test_demo_unit_is_valid():
    from revamp.cli import demo_unit_path

    path = demo_unit_path()
    jsonschema.validate(yaml.safe_load(path.read_text()), unitfile.schema())
    assert unitfile.check(path) == []


# ---------------------------------------------------------------------------------------------------- broken files
def _set(doc, dotted, value):
    parts = dotted.split(".")
    node = doc
    for p in parts[:-1]:
        node = node[int(p)] if p.isdigit() else node[p]
    last = parts[-1]
    if value is _DELETE:
        del node[int(last) if last.isdigit() else last]
    else:
        node[int(last) if last.isdigit() else last] = value


_DELETE = object()

# (change to make on a two-exchanger unit, the path the problem must name, words the message must contain)
BROKEN = [
    ("exchangers.1.tube_side.flow", "-5 kg/s", "exchangers[1].tube_side.flow: -5 kg/s: must be > 0", ""),
    ("exchangers.0.tube_side.flow", _DELETE, "exchangers[0].tube_side.flow", "must be given"),
    ("exchangers.0.tube_side.flow", "5 m", "exchangers[0].tube_side.flow: 5 m", "mass flow"),
    ("exchangers.0.tube_side.t_in", "30 degX", "exchangers[0].tube_side.t_in", "temperature"),
    ("exchangers.0.geometry.tube_count", "many", "exchangers[0].geometry.tube_count", "integer"),
    ("exchangers.0.geometry.tube_count", 0, "exchangers[0].geometry.tube_count", ">= 1"),
    ("exchangers.0.geometry.layout", 33, "exchangers[0].geometry.layout", "one of"),
    ("exchangers.0.geometry.shell_id", [1, 2], "exchangers[0].geometry.shell_id", "number"),
    ("exchangers.0.geometry.colour", "red", "exchangers[0].geometry.colour", "not a known field"),
    ("exchangers.0.geometry.baffle_cut", "70 %", "exchangers[0].geometry.baffle_cut", "< 0.5"),
    ("exchangers.0.geometry.tube_wall", "12 mm", "exchangers[0].geometry.tube_wall", ""),
    ("exchangers.0.shell_side.fouling", "-0.001 m**2*K/W", "exchangers[0].shell_side.fouling", ">= 0"),
    ("exchangers.0.shell_side.fluid.kind", "plasma", "exchangers[0].shell_side.fluid.kind", "one of"),
    ("exchangers.0.shell_side.fluid", {"kind": "petroleum", "api": 30,
                                       "viscosity": [["40 degC", "5 cSt"], ["100 degC", "2 cSt"]]},
     "exchangers[0].shell_side.fluid.watson_k", "must be given"),
    ("exchangers.0.shell_side.fluid", {"kind": "petroleum", "api": 30, "watson_k": 11.8,
                                       "viscosity": [["40 degC", "5 cSt"], ["100 degC", "2 cP"]]},
     "exchangers[0].shell_side.fluid.viscosity[1][1]", "kinematic viscosity"),
    ("exchangers.0.revamp.target", {"duty": "2 MW", "t_out_tube": "80 degC"}, "exchangers[0].revamp.target",
     "exactly one"),
    ("exchangers.0.revamp.flows", {"shell": "12 kg/s"}, "exchangers[0].revamp", "not both"),
    ("exchangers.0.options.0", {"type": "twisted_tape", "twist_ratio": 0.5}, "exchangers[0].options[0].twist_ratio",
     "> 1"),
    ("exchangers.0.options.0", {"type": "magic"}, "exchangers[0].options[0].type", "one of"),
    ("exchangers.0.options.1.n", _DELETE, "exchangers[0].options[1].n", "must be given"),
    ("exchangers.0.options.0.capex", "20000 EUR", "exchangers[0].options[0].capex", "USD"),
    ("exchangers.1.tag", "E-1", "exchangers[1].tag", "unique"),
    ("economics.energy_price", "9 EUR/GJ", "economics.energy_price",
     "in the unit's currency USD (economics.currency), not EUR"),
    ("economics.energy_price", "9 GJ", "economics.energy_price", "price per energy"),
    ("economics.heater_efficiency", 1.5, "economics.heater_efficiency", "<= 1"),
    ("economics.currency", "dollars", "economics.currency", "currency code"),
    ("unit", _DELETE, "unit", "must be given"),
    ("exchangers.0.plant_data", {"file": "../outside.csv"}, "exchangers[0].plant_data.file", "inside"),
    ("exchangers.0.plant_data", {"file": "/etc/passwd"}, "exchangers[0].plant_data.file", "relative"),
    ("exchangers.0.plant_data", {"file": "nope.csv"}, "exchangers[0].plant_data.file", "existing file"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "columns": {"shell_flow": "FI-101"}},
     "exchangers[0].plant_data.columns.shell_flow", "column of plant.csv"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "columns": {"shell_flow": {"column": "shell_flow",
                                                                                   "unit": "degC"}}},
     "exchangers[0].plant_data.columns.shell_flow.unit", "mass flow"),
    # the fouling cycle: run length > 0, downtime >= 0, both durations; the side is shell or tube
    ("economics.run_length", "-30 day", "economics.run_length: -30 day: must be > 0", ""),
    ("economics.run_length", 0, "economics.run_length: 0: must be > 0", ""),
    ("economics.run_length", "18 kg", "economics.run_length: 18 kg", "duration"),
    ("economics.cleaning_downtime", "-1 day", "economics.cleaning_downtime: -1 day: must be >= 0", ""),
    ("economics.cleaning_downtime", "5 m", "economics.cleaning_downtime: 5 m", "duration"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "fouling_side": "both"},
     "exchangers[0].plant_data.fouling_side: both", "one of: shell, tube"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "fouling_side": "Tube"},
     "exchangers[0].plant_data.fouling_side: Tube", "one of: shell, tube"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "run_length": "-18 month"},
     "exchangers[0].plant_data.run_length: -18 month", "must be > 0"),
    ("exchangers.1.plant_data", {"file": "plant.csv", "run_length": "540 degC"},
     "exchangers[1].plant_data.run_length: 540 degC", "duration"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "cleaning_downtime": "-5 day"},
     "exchangers[0].plant_data.cleaning_downtime: -5 day", "must be >= 0"),
    ("exchangers.0.plant_data", {"file": "plant.csv", "cleaning_downtime": "a week"},
     "exchangers[0].plant_data.cleaning_downtime: a week", "duration"),
]


@pytest.mark.parametrize("where, value, path, words", BROKEN, ids=[b[2] + " " + b[3] for b in BROKEN])
def test_each_problem_names_its_path(tmp_path, where, value, path, words):
    (tmp_path / "plant.csv").write_text(CSV_HEADER + "2030-01-01,1,400,350,1,300,320\n")
    (tmp_path.parent / "outside.csv").write_text(CSV_HEADER)
    doc = make_unit("E-1", "E-2")
    _set(doc, where, value)
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    hits = [str(p) for p in problems if str(p).startswith(path)]
    assert hits, f"no problem at {path}; got {[str(p) for p in problems]}"
    assert any(words in h for h in hits), hits
    with pytest.raises(unitfile.UnitFileError) as info:
        unitfile.load(tmp_path / "unit.yaml")
    assert info.value.problems == problems


def test_model_constructor_errors_get_the_full_path(tmp_path):
    """Errors raised by the geometry, fluid and stream constructors come back as problems under their path."""
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][0]["geometry"]["tube_wall"] = "12 mm"  # thicker than half a 19.05 mm tube
    doc["exchangers"][1]["shell_side"]["fluid"] = {"kind": "petroleum", "api": 30, "watson_k": 11.8,
                                                   "viscosity": [["40 degC", "5 cSt"], ["40 degC", "2 cSt"]]}
    # water at 1 bar boils at 99.6 °C (IAPWS-IF97 saturation line, common steam-table value): 130 °C is vapour
    doc["exchangers"][1]["tube_side"]["fluid"] = {"kind": "water", "pressure": "1 bar"}
    doc["exchangers"][1]["tube_side"]["t_in"] = "130 degC"
    problems = {p.path: p for p in unitfile.check(write_unit(tmp_path / "u.yaml", doc))}
    assert set(problems) == {"exchangers[0].geometry.tube_wall", "exchangers[1].shell_side.fluid.viscosity",
                             "exchangers[1].tube_side.t_in"}
    assert "saturation" in problems["exchangers[1].tube_side.t_in"].message


def test_every_problem_is_listed_at_once(tmp_path):
    doc = make_unit("E-1", "E-2", "E-3")
    doc["exchangers"][0]["tube_side"]["flow"] = "-1 kg/s"
    doc["exchangers"][1]["geometry"]["layout"] = 12
    doc["exchangers"][2]["shell_side"]["t_in"] = "hot"
    doc["economics"]["discount_rate"] = 2
    paths = [p.path for p in unitfile.check(write_unit(tmp_path / "u.yaml", doc))]
    assert paths == ["economics.discount_rate", "exchangers[0].tube_side.flow", "exchangers[1].geometry.layout",
                     "exchangers[2].shell_side.t_in"]


def test_link_out_of_the_folder_is_refused(tmp_path):
    inside = tmp_path / "unit"
    inside.mkdir()
    (tmp_path / "secret.csv").write_text(CSV_HEADER)
    os.symlink(tmp_path / "secret.csv", inside / "plant.csv")
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {"file": "plant.csv"}
    problems = unitfile.check(write_unit(inside / "unit.yaml", doc))
    assert [p.path for p in problems] == ["exchangers[0].plant_data.file"]
    assert "inside" in problems[0].message


def test_plant_data_mapping_is_built(tmp_path):
    (tmp_path / "plant").mkdir()
    (tmp_path / "plant" / "e1.csv").write_text("time,F1,T1,T2,F2,T3,T4\n2030-01-01,36,150,120,12,300,320\n")
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {
        "file": "plant/e1.csv",
        "columns": {"timestamp": "time", "shell_flow": {"column": "F1", "unit": "t/h"},
                    "shell_t_in": {"column": "T1", "unit": "degC"}, "shell_t_out": {"column": "T2", "unit": "degC"},
                    "tube_flow": {"column": "F2", "unit": "kg/s"}, "tube_t_in": {"column": "T3", "unit": "K"},
                    "tube_t_out": {"column": "T4", "unit": "K"}},
        "uncertainty": {"flow": "2 %", "temperature": "0.5 delta_degC"}}
    case = unitfile.load(write_unit(tmp_path / "unit.yaml", doc)).exchanger("E-1")
    assert case.plant_data.file == (tmp_path / "plant" / "e1.csv").resolve()
    assert case.plant_data.columns["shell_flow"] == ("F1", "t/h")
    assert case.plant_data.columns["tube_t_in"] == ("T3", "K")
    assert case.plant_data.uncertainty == {"flow": pytest.approx(0.02), "temperature": pytest.approx(0.5)}


UNSAFE = [
    "unit: !!python/object/apply:os.system ['echo owned']\nexchangers: []\n",
    "unit: !!python/name:os.system\nexchangers: []\n",
    "unit: !custom {name: x}\nexchangers: []\n",
]


@pytest.mark.parametrize("text", UNSAFE)
def test_object_tags_are_refused(tmp_path, text):
    path = tmp_path / "evil.yaml"
    path.write_text(text)
    problems = unitfile.check(path)
    assert len(problems) == 1
    assert problems[0].path == "(line 1)"
    assert "tags are refused" in str(problems[0])


@pytest.mark.parametrize("text, words", [
    ("unit: {name: x\n", "valid YAML"),
    ("", "must hold a unit"),
    ("- just\n- a list\n", "mapping"),
    ("unit: {name: a}\nunit: {name: b}\nexchangers: []\n", "repeat a key"),
])
def test_malformed_yaml(tmp_path, text, words):
    path = tmp_path / "bad.yaml"
    path.write_text(text)
    problems = unitfile.check(path)
    assert problems and any(words in str(p) for p in problems), [str(p) for p in problems]


def test_missing_file_is_one_problem(tmp_path):
    problems = unitfile.check(tmp_path / "none.yaml")
    assert len(problems) == 1 and "readable file" in str(problems[0])


def test_check_never_rates(tmp_path, monkeypatch):
    import revamp.rating

    def boom(*args, **kwargs):  # pragma: no cover - must not be called
        raise AssertionError("check() ran a rating")

    monkeypatch.setattr(revamp.rating, "rate", boom)
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][1]["tube_side"]["flow"] = "-5 kg/s"
    assert unitfile.check(write_unit(tmp_path / "u.yaml", doc))
    assert unitfile.check(write_unit(tmp_path / "v.yaml", make_unit())) == []


def test_partial_load_keeps_the_valid_exchangers(tmp_path):
    doc = make_unit("E-1", "E-2", "E-3")
    doc["exchangers"][1]["geometry"]["tube_count"] = -3
    unit, problems, entries = unitfile.load_partial(write_unit(tmp_path / "u.yaml", doc))
    assert unit.tags == ["E-1", "E-3"]
    assert [p.path for p in problems] == ["exchangers[1].geometry.tube_count"]
    assert entries == [("E-1", 0), ("E-2", 1), ("E-3", 2)]


def test_schema_and_json_agree_on_the_demo():
    schema_text = unitfile.SCHEMA_PATH.read_text()
    assert json.loads(schema_text) == unitfile.schema()


# ------------------------------------------------------------------------------------------ never a traceback (fuzz)
from hypothesis import HealthCheck, given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402


def _paths(node, prefix=()):
    """Every (path) to a value inside a parsed unit document."""
    yield prefix
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, (*prefix, k))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _paths(v, (*prefix, i))


_ALL_PATHS = [p for p in _paths(make_unit("E-1", "E-2")) if p]
_JUNK = st.one_of(st.none(), st.booleans(), st.integers(-10**6, 10**6), st.floats(allow_nan=True),
                  st.text(max_size=12), st.sampled_from(["-5 kg/s", "1e400 m", "nan", "12 parsecs", "0 K", "../x"]),
                  st.lists(st.integers(), max_size=3), st.dictionaries(st.text(max_size=4), st.integers(), max_size=2))


@settings(max_examples=50, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(where=st.sampled_from(_ALL_PATHS), junk=_JUNK)
def test_any_junk_anywhere_gives_problems_not_a_traceback(tmp_path, where, junk):
    """Invariant: whatever value sits wherever, check() returns a list of Problems (each naming a path) and
    never raises; load() raises only UnitFileError."""
    doc = make_unit("E-1", "E-2")
    node = doc
    for p in where[:-1]:
        node = node[p]
    node[where[-1]] = junk
    path = tmp_path / "fuzz.yaml"
    path.write_text(yaml.safe_dump(doc, allow_unicode=True), encoding="utf-8")
    problems = unitfile.check(path)
    assert isinstance(problems, list)
    assert all(isinstance(p, unitfile.Problem) and p.path for p in problems)
    if problems:
        with pytest.raises(unitfile.UnitFileError):
            unitfile.load(path)


def test_docs_name_every_field_of_the_schema():
    """docs/unit-file.md stays in step with the schema: every field name the schema knows is documented."""
    doc = (unitfile.SCHEMA_PATH.parent.parent / "docs" / "unit-file.md").read_text(encoding="utf-8")
    names = set()

    def walk(node):
        if isinstance(node, dict):
            names.update(k for k in node.get("properties", {}) if isinstance(k, str))
            for v in node.values():
                walk(v)
        elif isinstance(node, list):
            for v in node:
                walk(v)

    walk(unitfile.schema())
    missing = sorted(n for n in names if f"`{n}`" not in doc)
    assert not missing, f"fields not in docs/unit-file.md: {missing}"


def test_docs_state_every_upper_bound_of_the_schema():
    """docs/unit-file.md's Limits table gives, for every field with an upper bound in the schema, that bound."""
    import re

    text = (unitfile.SCHEMA_PATH.parent.parent / "docs" / "unit-file.md").read_text(encoding="utf-8")
    table = text.split("## Limits", 1)[1]
    rows = {}
    for line in table.splitlines():
        if line.startswith("| `"):
            cells = line.split("|")
            numbers = {float(n) for n in re.findall(r"\d+(?:\.\d+)?(?:e\d+)?", cells[2])}
            for name in re.findall(r"`([^`]+)`", cells[1]):
                rows.setdefault(name.split(".")[-1], set()).update(numbers)
    bounds = []

    def walk(node):
        if isinstance(node, dict):
            for name, sub in (node.get("properties") or {}).items():
                if isinstance(sub, dict):
                    for key in ("x-le", "x-lt", "maximum", "exclusiveMaximum"):
                        if key in sub:
                            bounds.append((name, float(sub[key])))
            for v in node.values():
                walk(v)
        elif isinstance(node, list):
            for v in node:
                walk(v)

    walk(unitfile.schema())
    money = unitfile.schema()["$defs"]["money"]["x-le"]
    bounds.append(("capex", float(money)))
    assert bounds
    missing = [(n, b) for n, b in bounds if b not in rows.get(n, set())]
    assert not missing, f"upper bounds not stated in the Limits table of docs/unit-file.md: {missing}"


def test_docs_state_the_reading_limits():
    from revamp import units
    from revamp.unitfile import _reading

    text = (unitfile.SCHEMA_PATH.parent.parent / "docs" / "unit-file.md").read_text(encoding="utf-8")
    assert f"{_reading.MAX_FILE_BYTES // (1024 * 1024)} MiB" in text
    assert f"{_reading.MAX_DEPTH} levels deep" in text
    assert f"{_reading.MAX_NODES:,} values" in text
    assert f"at most {units.MAX_QUANTITY_LENGTH} characters" in text
    assert f"up to {units.MAX_UNIT_EXPONENT}" in text
    assert f"at most {units.MAX_UNIT_PARENTHESES} deep" in text


# ---------------------------------------------------------------------------------------------- the fouling cycle
def test_fouling_cycle_fields_load_with_overrides(tmp_path):
    """economics.run_length / cleaning_downtime are the unit's; an exchanger's plant_data overrides them."""
    (tmp_path / "plant.csv").write_text(CSV_HEADER + "2030-01-01,1,400,350,1,300,320\n")
    doc = make_unit("E-1", "E-2", "E-3")
    doc["economics"].update(run_length="18 month", cleaning_downtime="5 day")
    doc["exchangers"][0]["plant_data"] = {"file": "plant.csv", "fouling_side": "shell", "run_length": "540 day",
                                          "cleaning_downtime": 0}
    doc["exchangers"][1]["plant_data"] = {"file": "plant.csv", "fouling_side": "tube"}
    path = write_unit(tmp_path / "unit.yaml", doc)
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    day = 86400.0  # s (SI definition of the day, 24 h)
    # pint's month is year/12 with year = 365.25 day (pint default_en.txt, the Julian year)
    assert unit.economics.run_length == pytest.approx(18 * 365.25 / 12 * day, rel=1e-12)
    assert unit.economics.cleaning_downtime == pytest.approx(5 * day, rel=1e-12)
    e1, e2, e3 = (unit.exchanger(t) for t in ("E-1", "E-2", "E-3"))
    assert (e1.fouling_side, e1.run_length, e1.cleaning_downtime) == ("shell", pytest.approx(540 * day), 0.0)
    assert e1.plant_data.fouling_side == "shell"
    assert e1.cycle_from == {"fouling_side": "exchangers[0].plant_data.fouling_side",
                             "run_length": "exchangers[0].plant_data.run_length",
                             "cleaning_downtime": "exchangers[0].plant_data.cleaning_downtime"}
    assert e2.fouling_side == "tube" and e2.run_length == pytest.approx(18 * 365.25 / 12 * day, rel=1e-12)
    assert e2.cycle_from["run_length"] == "economics.run_length"
    assert e2.cycle_from["cleaning_downtime"] == "economics.cleaning_downtime"
    # no plant data, no side: nothing given for the side, the unit's run length still applies
    assert e3.fouling_side is None and "fouling_side" not in e3.cycle_from
    assert e3.cleaning_downtime == pytest.approx(5 * day)


def test_fouling_cycle_fields_absent_are_none(tmp_path):
    unit = unitfile.load(write_unit(tmp_path / "unit.yaml", make_unit("E-1")))
    case = unit.exchanger("E-1")
    assert (case.fouling_side, case.run_length, case.cleaning_downtime, case.cycle_from) == (None, None, None, {})
    assert unit.economics.run_length is None and unit.economics.cleaning_downtime is None


def test_check_command_lists_every_cycle_problem(tmp_path, capsys):
    """`revamp check` prints each bad cycle field on its own line with its path, and exits 1."""
    from revamp.cli import main

    (tmp_path / "plant.csv").write_text(CSV_HEADER + "2030-01-01,1,400,350,1,300,320\n")
    doc = make_unit("E-1")
    doc["economics"]["run_length"] = "-18 month"
    doc["exchangers"][0]["plant_data"] = {"file": "plant.csv", "fouling_side": "inside",
                                          "cleaning_downtime": "5 kg"}
    assert main(["check", write_unit(tmp_path / "unit.yaml", doc)]) == 1
    out = capsys.readouterr()
    text = out.out + out.err
    assert "economics.run_length: -18 month: must be > 0" in text
    assert "exchangers[0].plant_data.fouling_side: inside: must be one of: shell, tube" in text
    assert "exchangers[0].plant_data.cleaning_downtime: 5 kg: must be a duration" in text
    assert "Traceback" not in text


def test_demo_unit_states_its_fouling_cycle():
    from revamp.cli import demo_unit_path

    unit = unitfile.load(demo_unit_path())
    e101 = unit.exchanger("E-101")
    # the demo file: economics.run_length "365 day"; E-101 overrides with "540 day" and "5 day", side tube
    assert (e101.fouling_side, e101.run_length, e101.cleaning_downtime) == ("tube", 540 * 86400.0, 5 * 86400.0)
    assert unit.exchanger("E-102").run_length == 365 * 86400.0 and unit.exchanger("E-102").fouling_side is None
