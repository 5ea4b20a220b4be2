"""Unit-file entries of kind 'air cooler': a valid entry builds and rates; every bad field is named by its path.

Expected values are the entry's own numbers (the loader must only translate the file; unit conversions by
definition) and the paths the file's layout gives: no outside source is needed.
"""
import copy

import pytest
import yaml

import revamp as rv
from revamp.unitfile._aircooler import AirCoolerCase, air_cooler_problems, build_air_cooler

ENTRY = yaml.safe_load("""
tag: AC-101
kind: air cooler
geometry:
  bays: 2
  bundles_per_bay: 1
  tube_rows: 4
  tubes_per_row: 46
  tube_passes: 4
  tube_length: 9.14 m
  tube_od: 25.4 mm
  tube_wall: 2.11 mm
  transverse_pitch: 63.5 mm
  row_pitch: 55 mm
  tube_material: carbon steel
  fin: {height: 15.9 mm, thickness: 0.4 mm, per_length: 394 /m, material: aluminium, bond: embedded}
  fans_per_bay: 2
  fan_diameter: 3.66 m
  fan_efficiency: 0.65
  draft: forced
tube_side:
  fluid: {kind: constant, density: 800 kg/m**3, heat_capacity: 2.3 kJ/kg/K, viscosity: 1 cP, conductivity: 0.12}
  flow: 25 kg/s
  t_in: 150 degC
  fouling: 0.0003 m**2*K/W
air_side: {t_in: 35 degC, flow: 300 kg/s, altitude: 300 m, fouling: 0.0001 m**2*K/W}
hot_day: {ambient: [20 degC, 30 degC, 40 degC], t_out_target: 60 degC}
options:
  - {type: add_bays, n: 1}
  - {type: fan_upgrade, speed_ratio: 1.1}
  - {type: clean_fins}
  - {type: twisted_tape, twist_ratio: 4}
""")


def test_valid_entry_builds_and_rates():
    problems = []
    case = build_air_cooler(3, ENTRY, problems)
    assert problems == [] and isinstance(case, AirCoolerCase)
    assert case.service.altitude == pytest.approx(300.0) and len(case.options) == 4
    assert case.t_out_target == pytest.approx(333.15)  # 60 °C (definition of the Celsius scale)
    r = rv.rate(case.exchanger, case.service)
    assert r.duty > 0


@pytest.mark.parametrize("path, value, where", [
    (("geometry", "tube_passes"), 3, "exchangers[3].geometry.tube_passes"),
    (("geometry", "fin", "bond"), "glued", "exchangers[3].geometry.fin.bond"),
    (("geometry", "tube_lenght"), "9 m", "exchangers[3].geometry.tube_lenght"),
    (("tube_side", "flow"), "-5 kg/s", "exchangers[3].tube_side.flow"),
    (("air_side", "t_in"), "35 furlongs", "exchangers[3].air_side.t_in"),
    (("air_side", "fouling"), -1, "exchangers[3].air_side.fouling"),
    (("tube_side", "fouling"), -1, "exchangers[3].tube_side.fouling"),
    (("hot_day", "ambient"), "hot", "exchangers[3].hot_day.ambient"),
])
def test_bad_fields_are_named(path, value, where):
    entry = copy.deepcopy(ENTRY)
    node = entry
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value
    problems = air_cooler_problems(3, entry)
    assert problems, "a bad value must be reported"
    assert any(p.path == where for p in problems), [str(p) for p in problems]


def test_bad_option_is_named():
    entry = copy.deepcopy(ENTRY)
    entry["options"] = [{"type": "fan_upgrade", "speed_ratio": 5}, {"type": "paint_it"},
                        {"type": "more_rows", "tube_rows": 6}]
    paths = {p.path for p in air_cooler_problems(0, entry)}
    assert {"exchangers[0].options[0].speed_ratio", "exchangers[0].options[1].type",
            "exchangers[0].options[2].tube_passes"} <= paths


def test_every_bad_field_is_reported_at_once():
    entry = copy.deepcopy(ENTRY)
    entry["air_side"]["t_in"] = "35 furlongs"
    entry["tube_side"]["fouling"] = -1
    entry["geometry"]["fin"]["bond"] = "glued"
    paths = {p.path for p in air_cooler_problems(1, entry)}
    assert {"exchangers[1].air_side.t_in", "exchangers[1].tube_side.fouling",
            "exchangers[1].geometry.fin.bond"} <= paths
