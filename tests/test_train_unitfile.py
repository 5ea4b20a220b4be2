"""The unit file's network section: loading it as a Train, and every inconsistency named by path (revamp check).

All units, exchangers and fluids are invented; expected values are the same train built directly in Python (the
loader must only translate the file) and the paths the file's own layout gives.
"""
import copy

import pytest
import yaml

import revamp as rv
from revamp import unitfile
from revamp.train import Furnace, Match, Point, Train

CRUDE = {"kind": "constant", "name": "crude", "density": 830, "heat_capacity": 2300, "viscosity": 0.002,
         "conductivity": 0.12}
RESID = {"kind": "constant", "name": "resid", "density": 900, "heat_capacity": 2600, "viscosity": 0.004,
         "conductivity": 0.11}
GEOM = {"shell_id": "787 mm", "tube_od": "19.05 mm", "tube_wall": "2.11 mm", "tube_length": "6.1 m",
        "tube_count": 500, "tube_passes": 2, "tube_pitch": "25.4 mm", "layout": 90, "baffle_spacing": "450 mm",
        "baffle_cut": 0.25, "tube_material": "carbon steel"}


def unit_doc():
    ex = []
    for tag, fs, ft in (("E-1", 5e-4, 7e-4), ("E-2", 4e-4, 6e-4)):
        ex.append({"tag": tag, "geometry": dict(GEOM),
                   "shell_side": {"stream": "resid", "fouling": fs, "dp_allowed": "70 kPa"},
                   "tube_side": {"stream": "crude", "fluid": dict(CRUDE), "flow": "60 kg/s", "t_in": "95 degC",
                                 "fouling": ft}})
    # a cooler outside the network, as today
    ex.append({"tag": "C-1", "geometry": dict(GEOM),
               "shell_side": {"fluid": dict(RESID), "flow": 10, "t_in": "150 degC"},
               "tube_side": {"fluid": {"kind": "water"}, "flow": 30, "t_in": "30 degC"}})
    return {"version": 1, "unit": {"name": "test unit"}, "exchangers": ex,
            "network": {"streams": {"crude": {"fluid": dict(CRUDE), "flow": "60 kg/s", "t_in": "35 degC"},
                                    "resid": {"fluid": dict(RESID), "flow": "30 kg/s", "t_in": "340 degC",
                                              "rundown": "200 degC"}},
                        "routes": {"crude": ["E-1", {"point": "desalter", "t_min": "90 degC"}, "E-2"],
                                   "resid": ["E-2", "E-1"]},
                        "furnace": {"stream": "crude", "outlet": "360 degC", "efficiency": "85 %",
                                    "max_duty": "50 MW"},
                        "throughput": 1.2}}


def write(tmp_path, doc):
    path = tmp_path / "unit.yaml"
    path.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
    return path


def test_network_loads_as_the_same_train(tmp_path):
    path = write(tmp_path, unit_doc())
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    assert unit.network_throughput == 1.2
    tr = unit.network
    assert list(tr.exchangers) == ["E-1", "E-2"]  # the cooler stays outside
    # the side without its own flow and inlet took its stream's (the resid's supply)
    e1 = unit.exchanger("E-1")
    assert e1.service.shell.flow == 30 and e1.service.shell.t_in == pytest.approx(613.15)
    assert e1.service.tube.t_in == pytest.approx(95 + 273.15)  # its own inlet stays for its own study
    direct = Train(
        streams={"crude": rv.Stream(rv.fluids.constant(830, 2300, 0.002, 0.12), 60, "35 degC"),
                 "resid": rv.Stream(rv.fluids.constant(900, 2600, 0.004, 0.11), 30, "340 degC")},
        exchangers={t: Match(unit.exchanger(t).exchanger, shell="resid", tube="crude", fouling_shell=fs,
                             fouling_tube=ft, dp_max_shell=70e3)
                    for t, fs, ft in (("E-1", 5e-4, 7e-4), ("E-2", 4e-4, 6e-4))},
        routes={"crude": ["E-1", Point("desalter", t_min="90 degC"), "E-2"], "resid": ["E-2", "E-1"]},
        furnace=Furnace("crude", "360 degC", 0.85, "50 MW"), rundown={"resid": "200 degC"})
    a, b = tr.solve(), direct.solve()
    assert a.furnace_inlet == pytest.approx(b.furnace_inlet, abs=1e-9)
    assert a.furnace_duty == pytest.approx(b.furnace_duty, rel=1e-12)
    assert [c.name for c in a.limits] == [c.name for c in b.limits]
    assert a.streams.loc["resid", "trim_duty"] == pytest.approx(b.streams.loc["resid", "trim_duty"], rel=1e-12)


def test_a_unit_without_network_works_as_today(tmp_path):
    doc = unit_doc()
    del doc["network"]
    for x in doc["exchangers"][:2]:
        x["shell_side"] = {"fluid": dict(RESID), "flow": 30, "t_in": "300 degC"}
        del x["tube_side"]["stream"]
    path = write(tmp_path, doc)
    assert unitfile.check(path) == []
    assert unitfile.load(path).network is None


def _set(doc, dotted, value):
    node = doc
    parts = dotted.split(".")
    for p in parts[:-1]:
        node = node[int(p)] if p.isdigit() else node[p]
    last = parts[-1]
    if value is None:
        del node[int(last) if last.isdigit() else last]
    else:
        node[int(last) if last.isdigit() else last] = value


BROKEN = [
    # (change, the path the problem names, words of its message)
    ("exchangers.0.shell_side.stream", "naphtha", "exchangers[0].shell_side.stream", "network's streams"),
    ("exchangers.0.tube_side.fluid", dict(RESID), "exchangers[0].tube_side.fluid", "fluid of stream 'crude'"),
    ("network.routes.crude", ["E-1", "E-2", "E-1"], "network.routes.crude[2]", "once"),
    ("network.routes.crude", ["E-1", "E-9"], "network.routes.crude[1]", "tag of an exchanger"),
    ("network.routes.crude", ["E-1", "C-1", "E-2"], "network.routes.crude[1]", "names stream 'crude'"),
    ("network.routes.crude", ["E-1"], "exchangers[1].tube_side.stream", "route lists E-2"),
    ("network.routes.naphtha", ["E-1"], "network.routes.naphtha", "one of the streams"),
    ("network.furnace.stream", "vacuum residue", "network.furnace.stream", "one of the streams"),
    ("network.routes.crude", ["E-1", {"split": [["E-2"], []], "fractions": [0.5, 0.6]}],
     "network.routes.crude[1].fractions", "balance at the remix"),
    ("network.streams.crude.flow", "-5 kg/s", "network.streams.crude.flow", "> 0"),
    ("network.routes.crude", ["E-1", {"point": "desalter", "t_min": "20 degX"}, "E-2"],
     "network.routes.crude[1].t_min", "temperature"),
    ("exchangers.1.shell_side.stream", "crude", "exchangers[1].tube_side.stream", "differ from the other side"),
]


@pytest.mark.parametrize("dotted, value, path, words", BROKEN)
def test_check_names_every_network_inconsistency(tmp_path, dotted, value, path, words):
    doc = copy.deepcopy(unit_doc())
    _set(doc, dotted, value)
    problems = unitfile.check(write(tmp_path, doc))
    hits = [p for p in problems if p.path == path]
    assert hits, [str(p) for p in problems]
    assert words in hits[0].message, str(hits[0])
    with pytest.raises(unitfile.UnitFileError):
        unitfile.load(write(tmp_path, doc))


def test_a_side_without_stream_still_needs_its_flow(tmp_path):
    doc = unit_doc()
    del doc["exchangers"][2]["shell_side"]["flow"]
    problems = unitfile.check(write(tmp_path, doc))
    assert [(p.path, p.message) for p in problems] == [("exchangers[2].shell_side.flow", "must be given")]


def test_the_demo_unit_is_a_train():
    from revamp.cli import demo_unit_path

    unit = unitfile.load(demo_unit_path())
    tr = unit.network
    assert tr.routes["crude"][:2] == ("E-101", "E-102") and tr.routes["crude"][3:] == ("E-103", "E-104")
    assert tr.furnace.stream == "crude"
    res = tr.solve(tol=1e-3)
    assert res.converged
    # second law: the crude ends between its supply and the hottest hot-stream supply
    assert 35 + 273.15 < res.furnace_inlet < 340 + 273.15
    # each exchanger's crude inlet is the previous one's outlet (within the solve tolerance)
    ex = res.exchangers
    for a, b in (("E-101", "E-102"), ("E-102", "E-103"), ("E-103", "E-104")):
        assert ex.loc[b, "t_in_tube"] == pytest.approx(ex.loc[a, "t_out_tube"], abs=2e-3)


def test_equal_dp_split_in_the_file(tmp_path):
    doc = unit_doc()
    doc["network"]["routes"]["crude"] = [{"split": [["E-1"], ["E-2"]], "fractions": "equal_dp"}]
    doc["network"]["routes"]["resid"] = ["E-2", "E-1"]
    assert unitfile.check(write(tmp_path, doc)) == []
    res = unitfile.load(write(tmp_path, doc)).network.solve()
    # the definition: equal tube-side pressure drops in the two branches
    assert res.exchangers.loc["E-1", "dp_tube"] == pytest.approx(res.exchangers.loc["E-2", "dp_tube"], rel=1e-4)
    doc["network"]["routes"]["crude"] = [{"split": [["E-1"], ["E-2"]], "fractions": "by feel"}]
    problems = unitfile.check(write(tmp_path, doc))
    assert [p.path for p in problems] == ["network.routes.crude[0].fractions"]
