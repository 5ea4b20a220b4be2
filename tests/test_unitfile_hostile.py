"""Hostile and silently wrong unit files: each is refused by ``check`` with a path-named problem, quickly.

Where the failure used to be a hang, the check runs in a subprocess with a time limit, so that a regression fails
the test instead of hanging the suite. The limits (file size, nesting depth, expanded size, plausible magnitudes)
are common practice with no source, chosen far above any real unit file and far below what takes the tool down.
"""
from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest
import yaml
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st
from test_unitfile import CSV_HEADER, make_unit, write_unit

from revamp import unitfile

ROW = "2030-01-01T00:00:00,10,423.15,400,12,303.15,320\n"


def _check_in_subprocess(path, timeout=60):
    """``unitfile.check(path)`` in a fresh interpreter with a time limit: [(path, value, message)]."""
    code = ("import json, sys\nfrom revamp import unitfile\n"
            "print(json.dumps([(p.path, p.value, p.message) for p in unitfile.check(sys.argv[1])]))\n")
    env = dict(os.environ, PYTHONPATH=os.pathsep.join(filter(None, [os.getcwd(), os.environ.get("PYTHONPATH")])))
    proc = subprocess.run([sys.executable, "-c", code, str(path)], capture_output=True, text=True, timeout=timeout,
                          check=False, env=env)
    assert proc.returncode == 0, proc.stderr[-2000:]
    return [tuple(p) for p in json.loads(proc.stdout)]


# ------------------------------------------------------------------------------------------ strings that explode
@pytest.mark.parametrize("where, value, path", [
    ("shell_side.t_in", "9**9**9 K", "exchangers[0].shell_side.t_in"),
    ("shell_side.t_in", "10**400 K", "exchangers[0].shell_side.t_in"),
    ("revamp.target", {"UA": "9**9**9 kW/K"}, "exchangers[0].revamp.target.UA"),
    ("revamp.target", {"UA": "1 kW/K**9**9**9"}, "exchangers[0].revamp.target.UA"),
    ("economics.capacity_margin", "5 USD/t**9**9**9", "economics.capacity_margin"),
    ("plant_data", {"file": "plant.csv", "columns": {"shell_t_in": {"column": "shell_t_in", "unit": "K**9**9**9"}}},
     "exchangers[0].plant_data.columns.shell_t_in.unit"),
])
def test_exploding_quantity_strings_are_refused_quickly(tmp_path, where, value, path):
    """pint evaluates Python integer powers: '9**9**8 K' alone took 82 s and 9**9**9 never ends."""
    (tmp_path / "plant.csv").write_text(CSV_HEADER + ROW)
    doc = make_unit()
    if where.startswith("economics."):
        doc["economics"][where.split(".")[1]] = value
    else:
        node = doc["exchangers"][0]
        *head, last = where.split(".")
        for part in head:
            node = node[part]
        node[last] = value
    problems = _check_in_subprocess(write_unit(tmp_path / "unit.yaml", doc))
    assert [p for p in problems if p[0] == path], problems


def _alias_bomb(depth: int, width: int = 2) -> str:
    """A small YAML block whose combined options multiply by ``width`` at every level through aliases."""
    lines = ["x-anchors:", "  - &a0 {type: clean}"]
    lines += [f"  - &a{n} {{type: combined, options: [{', '.join([f'*a{n - 1}'] * width)}]}}"
              for n in range(1, depth + 1)]
    return "\n".join(lines) + "\n"


@pytest.mark.parametrize("depth, width, words", [
    (16, 2, "levels deep (aliases included)"),   # 2**16 leaves, 33 levels: the depth check stops it first
    (8, 4, "aliases are expanded"),              # 4**8 = 65,536 leaves in 19 levels: the size check stops it
])
def test_alias_bomb_is_refused_quickly(tmp_path, depth, width, words):
    """Depth 16 was still running after 180 s: depth and expanded size are measured (linearly) before anything
    walks the document."""
    doc = make_unit()
    doc["exchangers"][0]["options"] = ["BOMB"]
    text = _alias_bomb(depth, width) + yaml.safe_dump(doc, sort_keys=False).replace("BOMB", f"*a{depth}")
    path = tmp_path / "bomb.yaml"
    path.write_text(text)
    assert len(text) < 4096
    problems = _check_in_subprocess(path, timeout=30)
    assert any(words in p[2] for p in problems), problems


def test_recursive_alias_is_refused(tmp_path):
    path = tmp_path / "loop.yaml"
    path.write_text("unit: &u {name: x, self: *u}\nexchangers: []\n")
    problems = unitfile.check(path)
    assert problems and problems[0].path.startswith("(line"), [str(p) for p in problems]
    assert "must not contain itself" in problems[0].message or "alias" in problems[0].message


def test_nesting_through_aliases_is_refused(tmp_path):
    """A chain of anchors each holding the previous one nests 300 levels with a flat text."""
    lines = ["x-chain:", "  - &a0 [x]"] + [f"  - &a{n} [*a{n - 1}]" for n in range(1, 300)]
    path = tmp_path / "chain.yaml"
    path.write_text("\n".join(lines) + "\nunit: {name: x}\nexchangers: [*a299]\n")
    problems = unitfile.check(path)
    assert len(problems) == 1 and "aliases included" in problems[0].message, [str(p) for p in problems]


def test_deep_nesting_is_refused_without_a_recursion_error(tmp_path):
    """300 nested combined options used to escape as RecursionError."""
    option = {"type": "clean"}
    for _ in range(300):
        option = {"type": "combined", "options": [option, {"type": "clean"}]}
    doc = make_unit()
    doc["exchangers"][0]["options"] = [option]
    path = tmp_path / "deep.yaml"
    # the flow style keeps the writer itself shallow enough; the reader is what is tested
    path.write_text(json.dumps(doc))
    problems = _check_in_subprocess(path)
    assert problems and "levels deep" in problems[0][2], problems


@pytest.mark.parametrize("device", ["/dev/zero", "/dev/urandom"])
def test_devices_are_refused_at_once(device):
    if not os.path.exists(device):
        pytest.skip(f"no {device} here")
    problems = _check_in_subprocess(device, timeout=30)
    assert problems == [(device, "(file)", "must be a regular file (not a folder, pipe or device)")]


def test_fifo_is_refused_at_once(tmp_path):
    if not hasattr(os, "mkfifo"):
        pytest.skip("no FIFOs here")
    fifo = tmp_path / "unit.yaml"
    os.mkfifo(fifo)
    problems = _check_in_subprocess(fifo, timeout=30)
    assert problems and "regular file" in problems[0][2], problems


def test_folder_and_huge_file_are_refused(tmp_path):
    assert "regular file" in unitfile.check(tmp_path)[0].message
    big = tmp_path / "big.yaml"
    big.write_text("unit: {name: x}\n# " + "x" * (3 * 1024 * 1024) + "\n")
    problems = unitfile.check(big)
    assert len(problems) == 1 and "at most" in problems[0].message and "KiB" in problems[0].message


# ----------------------------------------------------------------------- what the batch refused, check refuses first
def _unit_with(tmp_path, change):
    (tmp_path / "plant.csv").write_text(CSV_HEADER + ROW)
    doc = make_unit("E-1", "E-2")
    change(doc, doc["exchangers"][0])
    return write_unit(tmp_path / "unit.yaml", doc)


def _opt(spec):
    return lambda d, x: x["options"].append(spec)


# (what to change in exchangers[0], the path the problem must name, words its message must contain)
REFUSED = [
    # a dict of capex by label kept the second figure silently
    (lambda d, x: x["options"].append({"type": "add_shells", "n": 2, "label": "clean", "capex": 1}),
     "exchangers[0].options[2].label", "distinct"),
    (lambda d, x: x.__setitem__("options", [{"type": "clean"}, {"type": "clean", "capex": 5}]),
     "exchangers[0].options[1]", "distinct"),
    (lambda d, x: x["options"][0].__setitem__("label", "base"), "exchangers[0].options[0].label", "study's own rows"),
    (lambda d, x: x["options"][0].__setitem__("label", "Today"), "exchangers[0].options[0].label", "study's own rows"),
    # TEMA: the pitch is larger than the tube od (tubes would touch), common practice
    (_opt({"type": "new_bundle", "tube_pitch": "10 mm"}), "exchangers[0].options[2].tube_pitch", "tube_od"),
    # a tape of 10 mm in a 14.8 mm bore: delta/d = 0.68, beyond the tested 0 <= delta/d < 0.25 (Manglik & Bergles 1993)
    (_opt({"type": "twisted_tape", "twist_ratio": 4, "thickness": "10 mm"}), "exchangers[0].options[2].thickness",
     "thickness ratio"),
    # an 8 mm wire in a 14.8 mm bore: e/d = 0.54, more than half the bore (the coil would fill it)
    (_opt({"type": "wire_coil", "pitch": "20 mm", "wire_diameter": "8 mm"}),
     "exchangers[0].options[2].wire_diameter", "wire ratio"),
    (_opt({"type": "retube", "material": -1}), "exchangers[0].options[2].tube_material", "conductivity > 0"),
    (_opt({"type": "retube", "tube_wall": "9.5 mm"}), "exchangers[0].options[2].tube_wall", "bore"),
    (_opt({"type": "combined", "options": [{"type": "clean", "side": "tube"}, {"type": "retube", "material": -1}]}),
     "exchangers[0].options[2].tube_material", "conductivity > 0"),
    # equal inlets give no driving force (second law)
    (lambda d, x: x["revamp"].__setitem__("t_in", {"tube": "150 degC"}), "exchangers[0].revamp.t_in",
     "must differ from the other side's inlet"),
    (lambda d, x: x["shell_side"].__setitem__("flow", "1e300 kg/s"), "exchangers[0].shell_side.flow", "<= 100000"),
    (lambda d, x: x["revamp"].__setitem__("flows", {"tube": "1e300 kg/s"}) or x["revamp"].pop("throughput"),
     "exchangers[0].revamp.flows.tube", "<= 100000"),
    (lambda d, x: x["geometry"].__setitem__("shells", 10000), "exchangers[0].geometry.shells", "<= 20"),
    (lambda d, x: x["geometry"].__setitem__("tube_count", 10 ** 9), "exchangers[0].geometry.tube_count", "<= 100000"),
    # a 19.05 mm tube with a 9.5 mm wall has a 0.05 mm bore, 0.045 mm roughness: e/d = 0.9 (Moody 1944 chart ends
    # at e/d = 0.05, from memory); the message names the bore, not a friction-factor field deep in the rating
    (lambda d, x: x["geometry"].__setitem__("tube_wall", "9.5 mm"), "exchangers[0].geometry.tube_wall", "bore"),
    (lambda d, x: x["geometry"].__setitem__("tube_roughness", "2 mm"), "exchangers[0].geometry.tube_roughness",
     "relative roughness"),
    (lambda d, x: d["economics"].__setitem__("energy_price", "1e400 USD/GJ"), "economics.energy_price", "finite"),
    (lambda d, x: d["economics"].__setitem__("energy_price", "1e300 USD/GJ"), "economics.energy_price", "<= 0.01"),
    (lambda d, x: x["options"][0].__setitem__("capex", "1e400 USD"), "exchangers[0].options[0].capex", "finite"),
    (lambda d, x: x["options"][0].__setitem__("capex", 1e300), "exchangers[0].options[0].capex", "<= 1e+12"),
    # a zero measurement uncertainty used to drop the plant-data section
    (lambda d, x: x.__setitem__("plant_data", {"file": "plant.csv", "uncertainty": {"flow": 0}}),
     "exchangers[0].plant_data.uncertainty.flow", "> 0"),
    (lambda d, x: x.__setitem__("plant_data", {"file": "plant.csv", "uncertainty": {"temperature": 0}}),
     "exchangers[0].plant_data.uncertainty.temperature", "> 0"),
]


@pytest.mark.parametrize("change, path, words", REFUSED, ids=[f"{r[1]} {r[2]}" for r in REFUSED])
def test_check_refuses_what_the_study_would(tmp_path, change, path, words):
    problems = unitfile.check(_unit_with(tmp_path, change))
    hits = [str(p) for p in problems if p.path == path]
    assert any(words in h for h in hits), [str(p) for p in problems]
    # for the batch: the other exchanger is untouched; a wrong option leaves out that option only
    unit, _, _ = unitfile.load_partial(tmp_path / "unit.yaml")
    if ".options[" in path:
        assert unit.tags == ["E-1", "E-2"]
        case = unit.exchanger("E-1")
        assert path in {p.path for p in case.refused_options}
        refused = {int(p.path.split(".options[")[1].split("]")[0]) for p in case.refused_options}
        assert len(case.options) == len(_doc_options(tmp_path)) - len(refused)
    elif not path.startswith("economics"):
        assert unit.tags == ["E-2"]


def _doc_options(tmp_path):
    return yaml.safe_load((tmp_path / "unit.yaml").read_text())["exchangers"][0]["options"]


# ---------------------------------------------------------------------------------------- silently wrong inputs
SILENT = [
    # a bare number for a temperature: 135 meant as degC was rated at 135 K
    (lambda d, x: x["shell_side"].__setitem__("t_in", 135), "exchangers[0].shell_side.t_in", "'135 degC'"),
    (lambda d, x: x["revamp"].__setitem__("t_in", {"shell": 420}), "exchangers[0].revamp.t_in.shell", "'420 degC'"),
    (lambda d, x: x["revamp"].__setitem__("target", {"t_out_tube": "350"}), "exchangers[0].revamp.target.t_out_tube",
     "bare number"),
    (lambda d, x: x["shell_side"].__setitem__("fluid", {
        "kind": "table", "T": [300, "500 K"], "density": [850, 800], "heat_capacity": [2000, 2400],
        "viscosity": [0.004, 0.001], "conductivity": [0.13, 0.11]}), "exchangers[0].shell_side.fluid.T[0]",
     "'300 degC'"),
    # a target on the impossible side of its inlet: the hot shell side (150 degC in) cannot leave at 160 degC, and
    # the cold tube side (30 degC in) cannot leave above the hot inlet (second law)
    (lambda d, x: x["revamp"].__setitem__("target", {"t_out_shell": "160 degC"}),
     "exchangers[0].revamp.target.t_out_shell", "must lie between"),
    (lambda d, x: x["revamp"].__setitem__("target", {"t_out_tube": "20 degC"}),
     "exchangers[0].revamp.target.t_out_tube", "heated"),
    (lambda d, x: x["revamp"].__setitem__("target", {"t_out_tube": "155 degC"}),
     "exchangers[0].revamp.target.t_out_tube", "must lie between"),
    # a mapped column without its unit would be read as SI (degC data as kelvin: every row discarded)
    (lambda d, x: x.__setitem__("plant_data", {"file": "plant.csv", "columns": {"shell_t_in": "shell_t_in"}}),
     "exchangers[0].plant_data.columns.shell_t_in", "must give its unit"),
    # an energy price in another currency names the mismatch
    (lambda d, x: d["economics"].update(currency="EUR", energy_price="8 USD/MMBTU"), "economics.energy_price",
     "currency EUR (economics.currency), not USD"),
    (lambda d, x: d["economics"].update(capacity_margin="5 EUR/t"), "economics.capacity_margin",
     "currency USD (economics.currency), not EUR"),
    # CoolProp's mixture syntax was rated as the first component alone
    (lambda d, x: x["tube_side"].__setitem__("fluid", {"kind": "pure", "fluid": "Water&Ethanol"}),
     "exchangers[0].tube_side.fluid.fluid", "one pure substance"),
    (lambda d, x: x["tube_side"].__setitem__("fluid", {"kind": "pure", "fluid": "HEOS::Water"}),
     "exchangers[0].tube_side.fluid.fluid", "one pure substance"),
]


@pytest.mark.parametrize("change, path, words", SILENT, ids=[f"{r[1]} {r[2]}" for r in SILENT])
def test_silently_wrong_inputs_are_refused(tmp_path, change, path, words):
    problems = unitfile.check(_unit_with(tmp_path, change))
    hits = [str(p) for p in problems if p.path == path]
    assert any(words in h for h in hits), [str(p) for p in problems]


def test_petroleum_below_its_range_names_the_temperature(tmp_path):
    """A petroleum fraction at 1 K overflowed inside its correlation; the problem names the inlet and the range."""
    def change(d, x):
        x["shell_side"]["fluid"] = {"kind": "petroleum", "api": 30, "watson_k": 11.8,
                                    "viscosity": [["40 degC", "5 cSt"], ["100 degC", "2 cSt"]]}
        x["shell_side"]["t_in"] = "1 K"
    problems = unitfile.check(_unit_with(tmp_path, change))
    assert [p.path for p in problems] == ["exchangers[0].shell_side.t_in"]
    assert "Error:" not in problems[0].message and "could not be built" not in problems[0].message


# --------------------------------------------------------------------------------------------- text and YAML
@pytest.mark.parametrize("tag, words", [
    ("E\ud800", "lone surrogate"),
    ("E-1\x1b[2J\x1b[31m", "control character"),
    ("E\x00-1", "control character"),
    ("E-1\u202e", "invisible formatting"),
])
def test_unprintable_tags_are_refused_and_escaped(tmp_path, tag, words):
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][0]["tag"] = tag
    path = tmp_path / "unit.yaml"
    # JSON is YAML: its escapes carry a lone surrogate or NUL that a YAML writer would not
    path.write_text(json.dumps(doc), encoding="utf-8")
    problems = unitfile.check(path)
    for p in problems:  # every problem prints and encodes as UTF-8
        assert str(p).isprintable() and str(p).encode("utf-8")
    if "\ud800" in tag and problems and problems[0].path.startswith("(line"):
        # libyaml (PyYAML's C parser) refuses a surrogate escape itself; the pure-Python parser lets it through
        assert "valid YAML" in problems[0].message
        return
    hits = [p for p in problems if p.path == "exchangers[0].tag"]
    assert hits and words in hits[0].message, [str(p) for p in problems]
    # the batch names the refused exchanger by its tag shown escaped, never by the unprintable text itself
    unit, _, entries = unitfile.load_partial(path)
    assert entries[0][1] == 0 and entries[0][0] != tag
    assert entries[0][0].isprintable() and entries[0][0].encode("utf-8")
    assert unit.tags == ["E-2"]


def test_unprintable_description_is_refused_and_kept_printable_for_the_index(tmp_path):
    """A lone surrogate in a description crashed the batch index write (UnicodeEncodeError): the exchanger is
    refused, and the parsed document kept for display holds only text that encodes."""
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][0]["description"] = "pump \x00 around\x1b[2J"
    path = tmp_path / "unit.yaml"
    path.write_text(json.dumps(doc), encoding="utf-8")
    unit, problems, _ = unitfile.load_partial(path)
    assert [p.path for p in problems] == ["exchangers[0].description"]
    shown = unit.raw["exchangers"][0]["description"]
    assert shown.encode("utf-8") and shown.isprintable() and "\\x1b" in shown
    # a lone surrogate (which the pure-Python YAML parser lets through) is refused and cleaned the same way
    from revamp.unitfile._reading import _cleaned, _text_problems

    raw = {"exchangers": [{"tag": "E-1", "description": "pump \ud800 around"}]}
    assert [p.path for p in _text_problems(raw)] == ["exchangers[0].description"]
    assert _cleaned(raw)["exchangers"][0]["description"] == "pump \\ud800 around"


@pytest.mark.parametrize("text, path, words", [
    ("unit: {name: x}\nexchangers: [a\x00b]\n", "(character", "printable text"),
    ("unit: {name: x}\n? [a, b]\n: 1\nexchangers: []\n", "(line 2)", "text key"),
    ("unit: {name: x}\n1: a\nexchangers: []\n", "(line 2)", "text key"),
    ("unit: {name: \"x\\0y\"}\nexchangers: []\n", "unit.name", "control character"),
])
def test_yaml_oddities_are_problems(tmp_path, text, path, words):
    p = tmp_path / "odd.yaml"
    p.write_bytes(text.encode("utf-8"))
    problems = unitfile.check(p)
    assert any(q.path.startswith(path) and words in q.message for q in problems), [str(q) for q in problems]


# --------------------------------------------------------------------------------------------------- plant CSVs
def _with_csv(tmp_path, content, columns=None):
    (tmp_path / "p.csv").write_bytes(content if isinstance(content, bytes) else content.encode("utf-8"))
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {"file": "p.csv", **({"columns": columns} if columns else {})}
    return unitfile.check(write_unit(tmp_path / "unit.yaml", doc))


def test_csv_with_a_byte_order_mark_reads_like_pandas(tmp_path):
    """Spreadsheet programs write a UTF-8 BOM; pandas drops it, so must check (no invisible 'timestamp' column)."""
    assert _with_csv(tmp_path, b"\xef\xbb\xbf" + (CSV_HEADER + ROW).encode()) == []


@pytest.mark.parametrize("content, words", [
    ("timestamp," + "x" * (129 * 1024) + "\n" + ROW, "CSV"),       # a header field over csv's 128 KiB field limit
    (CSV_HEADER, "at least one data row"),                          # header only
    (CSV_HEADER + "2030-01-01T00:00:00+01:00,10,423.15,400,12,303.15,320\n"
     + "2030-01-01T01:00:00,10,423.15,400,12,303.15,320\n", "one time zone"),  # aware and naive mixed
    (CSV_HEADER + "2030-03-31T01:00:00+01:00,10,423.15,400,12,303.15,320\n"
     + "2030-03-31T03:00:00+02:00,10,423.15,400,12,303.15,320\n", "one time zone"),  # two offsets
    (CSV_HEADER + "2030-01-01T00:00:00+01:00,10,423.15,400,12,303.15,320\n" * 5000
     + "2030-07-01T00:00:00+02:00,10,423.15,400,12,303.15,320\n", "one time zone"),  # summer time months in
])
def test_csv_problems_are_named_by_path(tmp_path, content, words):
    problems = _with_csv(tmp_path, content)
    assert any(p.path.startswith("exchangers[0].plant_data") and words in p.message for p in problems), \
        [str(p) for p in problems]


def test_fifo_as_plant_data_is_refused(tmp_path):
    if not hasattr(os, "mkfifo"):
        pytest.skip("no FIFOs here")
    os.mkfifo(tmp_path / "p.csv")
    doc = make_unit()
    doc["exchangers"][0]["plant_data"] = {"file": "p.csv"}
    problems = _check_in_subprocess(write_unit(tmp_path / "unit.yaml", doc), timeout=30)
    assert [p[0] for p in problems] == ["exchangers[0].plant_data.file"] and "regular file" in problems[0][2]


# ---------------------------------------------------------------------------------- fuzz: quantities and nesting
_QUANTITY = st.one_of(
    st.text(alphabet="0123456789.eE+-*/^()% KkgmsCFdeglbhtUSDGJ", max_size=30),
    st.sampled_from(["9**9**9 K", "10**400 K", "1e400 kg/s", "1 m**13", "1 (((((m)))))", "-0 degC", "1e-320 m",
                     "135", "1e300 kg/s", "nan degC", "inf kg/s", "1 K**9**9**9", "5 USD/t**9**9**9"]))
_QUANTITY_PATHS = [("exchangers", 0, "shell_side", "t_in"), ("exchangers", 0, "tube_side", "flow"),
                   ("exchangers", 0, "geometry", "tube_wall"), ("exchangers", 0, "revamp", "throughput"),
                   ("economics", "energy_price"), ("economics", "capacity_margin"), ("economics", "horizon"),
                   ("exchangers", 1, "options", 0, "capex"), ("exchangers", 1, "shell_side", "fouling")]


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(where=st.sampled_from(_QUANTITY_PATHS), junk=_QUANTITY)
def test_any_quantity_string_gives_problems_not_a_traceback(tmp_path, where, junk):
    doc = make_unit("E-1", "E-2")
    node = doc
    for p in where[:-1]:
        node = node[p]
    node[where[-1]] = junk
    problems = unitfile.check(write_unit(tmp_path / "fuzz.yaml", doc))
    assert all(isinstance(p, unitfile.Problem) and p.path for p in problems)


def _nested(depth: int):
    option = {"type": "clean"}
    for _ in range(depth):
        option = {"type": "combined", "options": [option, {"type": "clean", "side": "tube"}]}
    return option


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(depth=st.integers(0, 40), wrap=st.integers(0, 40))
@example(depth=13, wrap=0)
@example(depth=14, wrap=0)
def test_any_nesting_gives_problems_not_a_traceback(tmp_path, depth, wrap):
    """Nested combined options, and junk wrapped in lists, at any depth: a list of problems, never an exception."""
    doc = make_unit("E-1")
    doc["exchangers"][0]["options"] = [_nested(depth)]
    junk = "x"
    for _ in range(wrap):
        junk = [junk]
    doc["exchangers"][0]["description"] = junk
    path = tmp_path / "nest.yaml"
    path.write_text(json.dumps(doc))
    problems = unitfile.check(path)
    assert all(isinstance(p, unitfile.Problem) and p.path for p in problems)
    # the innermost option sits 5 + 2 * depth levels deep (mapping, exchangers, exchanger, options, option, ...)
    assert bool(problems) == (wrap > 0 or 5 + 2 * depth > unitfile._reading.MAX_DEPTH), [str(p) for p in problems]
