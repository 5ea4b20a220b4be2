"""The ``revamp`` command: exit codes, one line per error, no traceback unless --debug."""
from __future__ import annotations

import subprocess
import sys

import pytest
from test_unitfile import make_unit, write_unit

from revamp.cli import main


@pytest.fixture
def good(tmp_path):
    return write_unit(tmp_path / "unit.yaml", make_unit("E-1", "E-2"))


def test_check_ok(good, capsys):
    assert main(["check", good]) == 0
    assert "OK" in capsys.readouterr().out


def test_check_lists_every_problem_one_per_line(tmp_path, capsys):
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][1]["tube_side"]["flow"] = "-5 kg/s"
    doc["exchangers"][0]["geometry"]["layout"] = 12
    path = write_unit(tmp_path / "bad.yaml", doc)
    assert main(["check", path]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert err[0].startswith("exchangers[0].geometry.layout: 12: must be one of")
    assert err[1] == "exchangers[1].tube_side.flow: -5 kg/s: must be > 0 and <= 100000 kg/s"
    assert err[2].endswith("2 problem(s)")
    assert "Traceback" not in "\n".join(err)


def test_check_unsafe_yaml_without_traceback(tmp_path):
    path = tmp_path / "evil.yaml"
    path.write_text("unit: !!python/object/apply:os.system ['echo owned']\n")
    proc = subprocess.run([sys.executable, "-m", "revamp.cli", "check", str(path)], capture_output=True, text=True, check=False)
    assert proc.returncode == 1
    assert "owned" not in proc.stdout
    assert "tags are refused" in proc.stderr and "Traceback" not in proc.stderr


def test_rate_prints_rating_and_breakdown(good, capsys):
    assert main(["rate", good, "--tag", "E-2"]) == 0
    out = capsys.readouterr().out
    for name in ("duty", "U in service", "dp tube", "shell film", "shell fouling", "wall", "tube fouling",
                 "tube film"):
        assert name in out
    assert "°C" in out and "kPa" in out and "controlling resistance:" in out


def test_rate_us_units(good, capsys):
    assert main(["rate", good, "--tag", "E-1", "--units", "US", "--revamp"]) == 0
    out = capsys.readouterr().out
    assert "°F" in out and "psi" in out and "BTU/h" in out and "throughput × 1.2" in out
    # the unit file scales both flows by 1.2 and moves no inlet: each side says so
    assert "shell side (test oil): flow × 1.2" in out and "tube side (test water): flow × 1.2" in out
    assert out.count("inlet as today") == 2


def test_unknown_tag_is_one_line(good, capsys):
    assert main(["rate", good, "--tag", "E-9"]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "E-9" in err[0] and "E-1, E-2" in err[0]


def test_rate_on_broken_file_lists_problems(tmp_path, capsys):
    doc = make_unit()
    doc["exchangers"][0]["shell_side"]["flow"] = "many"
    assert main(["rate", write_unit(tmp_path / "b.yaml", doc), "--tag", "E-1"]) == 1
    err = capsys.readouterr().err
    assert "exchangers[0].shell_side.flow: many" in err and "Traceback" not in err


def test_debug_shows_the_traceback(good):
    from revamp.errors import InputError

    with pytest.raises(InputError, match="E-9"):
        main(["--debug", "rate", good, "--tag", "E-9"])


def test_infeasible_service_is_refused_by_path_before_rating(tmp_path, capsys):
    doc = make_unit()
    doc["exchangers"][0]["tube_side"]["t_in"] = "150 degC"  # equal inlets: no driving force
    assert main(["rate", write_unit(tmp_path / "x.yaml", doc), "--tag", "E-1"]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert err[0].startswith("exchangers[0].tube_side.t_in: 150 degC: must differ") and "inlet" in err[0]
    assert "Traceback" not in "\n".join(err)


def test_missing_file(tmp_path, capsys):
    assert main(["check", str(tmp_path / "nope.yaml")]) == 1
    assert "readable file" in capsys.readouterr().err


# ------------------------------------------------------------------------------------------- hostile input, jobs
def test_rate_is_not_refused_for_another_exchangers_missing_csv(tmp_path, capsys):
    doc = make_unit("E-1", "E-2")
    doc["exchangers"][0]["plant_data"] = {"file": "missing.csv"}
    path = write_unit(tmp_path / "unit.yaml", doc)
    assert main(["rate", path, "--tag", "E-2"]) == 0
    out = capsys.readouterr()
    assert "duty" in out.out and "1 problem(s) in other exchangers" in out.err
    # the exchanger whose CSV is missing is still refused, by path
    assert main(["rate", path, "--tag", "E-1"]) == 1
    assert "exchangers[0].plant_data.file: missing.csv: must be an existing file" in capsys.readouterr().err


def test_rate_is_refused_for_a_problem_of_the_whole_unit(tmp_path, capsys):
    doc = make_unit("E-1", "E-2")
    doc["economics"]["discount_rate"] = 3
    assert main(["rate", write_unit(tmp_path / "unit.yaml", doc), "--tag", "E-2"]) == 1
    assert "economics.discount_rate: 3" in capsys.readouterr().err


def test_terminal_escapes_are_shown_escaped():
    from revamp.cli import _shown

    assert _shown("E-1\x1b[2J\x00\nnext") == "E-1\\x1b[2J\\x00\nnext"


def test_jobs_are_capped_to_the_cores(good, tmp_path, monkeypatch, capsys):
    import revamp.batch
    from revamp.cli import _usable_cores

    seen = {}

    class Result:
        index_path, failures = tmp_path / "index.html", {}

    def fake_run_batch(file, out, jobs=None, **kwargs):
        seen["jobs"] = jobs
        return Result()

    monkeypatch.setattr(revamp.batch, "run_batch", fake_run_batch)
    assert main(["batch", good, "--out", str(tmp_path / "r"), "--jobs", "1000", "--quiet"]) == 0
    assert seen["jobs"] == _usable_cores() and "capped" in capsys.readouterr().err
    assert main(["batch", good, "--out", str(tmp_path / "r"), "--jobs", "0", "--quiet"]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("error: --jobs: 0: must be a whole number >= 1")


def test_check_of_the_demo_imports_no_heavy_library():
    # `revamp check` must start fast: CoolProp, plotly and scipy's optimizer are for rating and reports only
    from revamp.cli import demo_unit_path

    code = ("import sys\nfrom revamp.cli import main\nrc = main(['check', sys.argv[1]])\n"
            "heavy = [m for m in ('CoolProp', 'plotly', 'scipy.optimize', 'scipy.integrate', 'scipy.special') "
            "if m in sys.modules]\nprint(rc, heavy)\n")
    out = subprocess.run([sys.executable, "-c", code, str(demo_unit_path())], capture_output=True, text=True,
                         check=True).stdout.strip().splitlines()[-1]
    assert out == "0 []"


def test_check_refuses_boiling_water_without_coolprop(tmp_path):
    # water at 4 bar boils at 143.6 °C (steam tables, from memory): a 160 °C inlet is refused by the IF97 screen,
    # as the rating would refuse it, and CoolProp is still not imported
    doc = make_unit("E-1")
    doc["exchangers"][0]["tube_side"]["fluid"] = {"kind": "water", "name": "cooling water", "pressure": "4 bar"}
    doc["exchangers"][0]["tube_side"]["t_in"] = "160 degC"
    path = write_unit(tmp_path / "hot.yaml", doc)
    code = ("import sys\nfrom revamp.unitfile import check\n"
            "print([(p.path, p.message) for p in check(sys.argv[1])], 'CoolProp' in sys.modules)\n")
    out = subprocess.run([sys.executable, "-c", code, path], capture_output=True, text=True, check=True).stdout
    assert "exchangers[0].tube_side.t_in" in out and "below saturation 416.7" in out and out.rstrip().endswith("False")
