"""Batch: reports per exchanger and an index, offline, escaped, atomic, one failure never stopping the others."""
from __future__ import annotations

import hashlib
import re
import subprocess
import sys
from pathlib import Path

import pytest
from test_unitfile import make_unit, write_unit

from revamp import report

NASTY = "E<1> & \"q\" '../x"


@pytest.fixture(scope="module")
def batch_run(tmp_path_factory):
    """One batch on three exchangers: a good one with a nasty tag, one invalid in the file, one that fails to rate."""
    root = tmp_path_factory.mktemp("batch")
    doc = make_unit(NASTY, "E-2", "E-3")
    doc["unit"]["name"] = "Unit <b>bold</b> & co"
    doc["exchangers"][1]["tube_side"]["flow"] = "-5 kg/s"            # refused by the file check
    # water at 1 bar entering at 95 degC, heated towards 150 degC at a small flow: it would boil (99.6 degC at
    # 1 bar, IAPWS-IF97) at the outlet. The file check cannot know the outlet; the rating refuses it in the kernel.
    doc["exchangers"][2]["tube_side"].update(fluid={"kind": "water", "name": "water", "pressure": "1 bar"},
                                             flow="0.3 kg/s", t_in="95 degC")
    unit_path = write_unit(root / "unit.yaml", doc)
    out = root / "out"
    proc = subprocess.run([sys.executable, "-m", "revamp.cli", "batch", unit_path, "--out", str(out),
                           "--jobs", "2", "--quiet"], capture_output=True, text=True, check=False, timeout=600)
    return {"root": root, "out": out, "proc": proc, "unit": Path(unit_path)}


def _html_files(out):
    return sorted(out.glob("*.html"))


def test_exit_code_and_index_path(batch_run):
    proc = batch_run["proc"]
    assert proc.returncode == 1, proc.stderr
    assert proc.stdout.strip() == str((batch_run["out"] / "index.html").resolve())
    assert "E-2: FAILED: exchangers[1].tube_side.flow: -5 kg/s: must be > 0" in proc.stderr
    assert "E-3: FAILED: InputError" in proc.stderr and "boil" in proc.stderr
    assert "Traceback" not in proc.stderr


def test_files_written_and_named_safely(batch_run):
    out = batch_run["out"]
    names = sorted(p.name for p in out.iterdir())
    assert "index.html" in names and "plotly.min.js" in names
    safe = report.safe_name(NASTY)
    assert f"{safe}.html" in names and "E-3.html" in names and "E-2.html" not in names
    assert all(re.fullmatch(r"[A-Za-z0-9][A-Za-z0-9._-]*", n) for n in names), names
    # nothing left half-written or outside DIR
    assert not [n for n in names if n.endswith(".tmp") or n.startswith(".")]
    assert sorted(p.name for p in batch_run["root"].iterdir()) == ["out", "unit.yaml"]


def test_user_text_is_escaped(batch_run):
    out = batch_run["out"]
    escaped = report.esc(NASTY)
    for page in _html_files(out):
        text = page.read_text(encoding="utf-8")
        assert NASTY not in text, page.name
        assert "<b>bold</b>" not in text, page.name
    index = (out / "index.html").read_text(encoding="utf-8")
    assert escaped in index and "Unit &lt;b&gt;bold&lt;/b&gt; &amp; co" in index
    good = (out / f"{report.safe_name(NASTY)}.html").read_text(encoding="utf-8")
    assert escaped in good


def test_offline_no_cdn(batch_run):
    for page in _html_files(batch_run["out"]):
        text = page.read_text(encoding="utf-8")
        assert not re.search(r"""(?:src|href)\s*=\s*["']?(?:https?:)?//""", text, re.IGNORECASE), page.name
        assert not re.search(r"cdn\.|cdnjs|jsdelivr|unpkg|require\.js|mathjax", text, re.IGNORECASE), page.name
        assert '<script src="plotly.min.js"' in text
    js = batch_run["out"] / "plotly.min.js"
    assert js.stat().st_size > 1_000_000


def test_report_sections_and_provenance(batch_run):
    text = (batch_run["out"] / f"{report.safe_name(NASTY)}.html").read_text(encoding="utf-8")
    for heading in ("The base case today and at the revamp conditions", "Which resistance controls U",
                    "What the plant data says", "The options side by side", "Recommendation", "Cautions",
                    "What produced this report"):
        assert heading in text, heading
    assert "licensed engineers" in text and "Screening-level results" in text
    assert hashlib.sha256(batch_run["unit"].read_bytes()).hexdigest() in text
    assert "numpy" in text and "plotly" in text and " UTC" in text
    assert "The inputs of this exchanger" in text and "tube_count: 200" in text
    assert text.count("Plotly.newPlot") >= 2
    assert "import revamp" not in text and "load_partial" not in text  # no code cells
    assert len(text) < 400_000  # plotly.js is not inlined in each report


def test_failures_recorded_in_index_and_others_go_on(batch_run):
    index = (batch_run["out"] / "index.html").read_text(encoding="utf-8")
    summary = re.search(r'<section id="summary">(.*?)</section>', index, re.DOTALL).group(1)
    rows = re.findall(r"<tr>(.*?)</tr>", summary, re.DOTALL)
    body = [r for r in rows if "<td>" in r]
    assert len(body) == 3
    good, file_bad, run_bad = body
    assert "rv-status-ok" in good and f'href="{report.safe_name(NASTY)}.html"' in good
    assert "rv-status-failed" in file_bad and "must be &gt; 0" in file_bad and "href=" not in file_bad
    assert "rv-status-failed" in run_bad and "boil" in run_bad and 'href="E-3.html"' in run_bad
    failed_report = (batch_run["out"] / "E-3.html").read_text(encoding="utf-8")
    assert "stopped with an error" in failed_report


def test_only_and_unknown_tag(tmp_path):
    from revamp.batch import run_batch
    from revamp.errors import InputError

    path = write_unit(tmp_path / "u.yaml", make_unit("E-1", "E-2"))
    with pytest.raises(InputError, match="E-7"):
        run_batch(path, tmp_path / "out", only=["E-7"], progress=False)


def test_write_atomic_leaves_no_partial_file(tmp_path, monkeypatch):
    target = tmp_path / "r.html"
    target.write_text("old")

    class Boom(Exception):
        pass

    def broken_replace(src, dst):
        raise Boom()

    monkeypatch.setattr(report.pages.os, "replace", broken_replace)
    with pytest.raises(Boom):
        report.write_atomic(target, "new")
    assert target.read_text() == "old"
    assert [p.name for p in tmp_path.iterdir()] == ["r.html"]


def test_safe_names_are_unique_and_tame():
    taken = []
    for tag in ["E-1", "e-1", "../../etc/passwd", "index", "", "A/B", "A:B"]:
        name = report.safe_name(tag, taken)
        assert re.fullmatch(r"[A-Za-z0-9][A-Za-z0-9._-]*", name) and name.lower() not in {t.lower() for t in taken}
        assert name.lower() != "index"
        taken.append(name)


def test_relative_out_dir_and_summary(tmp_path, monkeypatch):
    """A relative --out works (the kernels run elsewhere) and the index carries the exchanger's numbers."""
    from revamp.cli import main

    path = write_unit(tmp_path / "u.yaml", make_unit("E-1"))
    monkeypatch.chdir(tmp_path)
    assert main(["batch", path, "--out", "rel", "--jobs", "1", "--quiet"]) == 0
    index = (tmp_path / "rel" / "index.html").read_text(encoding="utf-8")
    summary = re.search(r'<section id="summary">(.*?)</section>', index, re.DOTALL).group(1)
    assert 'href="E-1.html"' in summary and "rv-status-ok" in summary
    assert re.search(r'<td class="num">[\d,]+</td>', summary), "duty figures missing from the index"


def test_unit_level_problem_stops_the_batch_before_any_run(tmp_path, capsys):
    """A problem outside the exchangers (here the economics) leaves nothing to run: problems listed, exit 1."""
    from revamp.cli import main

    doc = make_unit("E-1")
    doc["economics"]["energy_price"] = "cheap"
    path = write_unit(tmp_path / "u.yaml", doc)
    assert main(["batch", path, "--out", str(tmp_path / "out"), "--quiet"]) == 1
    err = capsys.readouterr().err
    assert "economics.energy_price: cheap: must be a price per energy" in err and "Traceback" not in err
    assert not (tmp_path / "out").exists()


# ------------------------------------------------------------------------------- cycle-averaged money in the report
@pytest.fixture(scope="module")
def demo_cases():
    from revamp import unitfile
    from revamp.cli import demo_unit_path

    unit = unitfile.load(demo_unit_path())
    return {tag: report.run_case(unit.exchanger(tag), mc_draws=0) for tag in ("E-102", "E-103")}


def _option_cases(case):
    out = {"base": (case.exchanger, case.revamp_service)}
    out.update({o.label: o.apply(case.exchanger, case.revamp_service) for o in case.options})
    return out


def _direct_cycle_average(ex, svc, model, start=0.0, design_shell=None):
    import numpy as np

    import revamp as rv
    from revamp.economics import cycle_average

    # a run of one year (the report's stated default), no downtime, the study's 21 Simpson points; ``start`` [s] is
    # how far into its run the exchanger already is (0 for an option installed at a shutdown: it starts clean); the
    # shell side (no growth model) goes linearly from where the option leaves it to its design value (the stated rule)
    shell = svc.fouling_shell if design_shell is None else np.linspace(svc.fouling_shell, design_shell, 21)
    return cycle_average(lambda rf: rv.rate(ex, svc.replace(fouling_tube=rf, fouling_shell=shell)).duty,
                         lambda t: model(np.asarray(t, dtype=float) + start), "365 day", points=21).duty_mean


def test_cycle_average_of_a_linear_trend_equals_direct_ratings(demo_cases):
    import numpy as np

    result = demo_cases["E-102"]
    case, mon, table = result.case, result.monitoring, result.study.table
    assert mon.trend.model == "linear" and result.cycle.side.value == "tube"
    # the trend is Rf on the outside area; on the tube's own surface the same deposit is Rf·di/do (the rating
    # refers a tube-side resistance to the outside area by do/di: resistances in series, common practice)
    ratio = case.exchanger.tube_id / case.exchanger.tube_od
    model = lambda t: np.maximum(mon.trend(t), 0.0) * ratio
    # the base case goes on fouling from the age of the last plant-data row; every option starts clean
    age = float(np.nanmax(mon.table["run_time"]))
    direct = {k: _direct_cycle_average(ex, svc, model, age if k == "base" else 0.0)
              for k, (ex, svc) in _option_cases(case).items()}
    assert table["duty_cycle_avg"].to_dict() == pytest.approx(direct, rel=1e-9)
    # the money uses the cycle-averaged gain: heat × 8400 h/yr × 9 USD/GJ / 0.85 heater efficiency (the demo
    # unit file's economics; fuel saved = heat / efficiency, common practice); no capacity flow in the file
    gain = direct["wire-coil inserts"] - direct["base"]
    assert table.loc["wire-coil inserts", "annual_value"] == pytest.approx(gain * 8400 * 3600 * 9e-9 / 0.85,
                                                                           rel=1e-9)
    text = " ".join(x for x in report.study_items(result) if isinstance(x, str))
    assert "Duty averaged over the run" in text and "365 days" in text and "tube side" in text \
        and "linear model" in text
    assert "duty_cycle_avg" not in text  # the report's words, not the column's identifier
    assert any("duty_cycle_avg" in c for c in report.study_table(result.study).columns)


def test_cycle_average_of_a_threshold_trend_is_rebuilt_per_option(demo_cases):
    import numpy as np

    import revamp as rv

    result = demo_cases["E-103"]
    case, mon, table = result.case, result.monitoring, result.study.table
    assert mon.trend.model == "threshold"
    p, c = mon.trend.params, mon.trend.conditions
    ratio = case.exchanger.tube_id / case.exchanger.tube_od
    direct = {}
    for label, (ex, svc) in _option_cases(case).items():
        r = rv.rate(ex, svc.replace(fouling_tube=0.0))  # the option clean on the fouling side
        t_bulk = 0.5 * (float(svc.tube.t_in) + float(r.t_out_tube))
        t_film = t_bulk + 0.55 * (float(r.t_wall_tube) - t_bulk)  # Ebert & Panchal 1995 weighting, from memory
        # dRf/dt = α_ref·Re^β·Pr^-0.33·exp(-E/R·(1/T_film - 1/T_ref)) - γ·τ_w (Ebert & Panchal 1995), R = 8.314462618
        # J/mol/K (CODATA 2018); a net removal is taken as no growth (the report's stated rule)
        rate = p["alpha_ref"] * float(r.Re_tube) ** c["beta"] * float(r.Pr_tube) ** -0.33 \
            * np.exp(-p["E"] / 8.314462618 * (1 / t_film - 1 / c["T_ref"])) - p["gamma"] * float(r.shear_tube)
        growth = max(rate, 0.0)
        direct[label] = _direct_cycle_average(ex, svc, lambda t, g=growth: ratio * (max(p["Rf0"], 0.0) + g * t),
                                              design_shell=case.revamp_service.fouling_shell)
    assert table["duty_cycle_avg"].to_dict() == pytest.approx(direct, rel=1e-9)
    text = " ".join(x for x in report.study_items(result) if isinstance(x, str))
    assert "threshold model rebuilt" in text


def test_fouling_side_is_the_larger_design_resistance_on_the_outside_area():
    import revamp as rv
    from revamp.report.case import fouling_side

    oil = rv.fluids.constant(density=850.0, heat_capacity=2200.0, viscosity=2e-3, conductivity=0.12)
    ex = rv.ShellAndTube(shell_id="0.5 m", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="5 m",
                         tube_count=200, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="0.3 m",
                         baffle_cut=0.25)
    svc = rv.Service(shell=rv.Stream(oil, 10.0, 420.0), tube=rv.Stream(oil, 12.0, 300.0))
    do, di = 19.05e-3, 19.05e-3 - 2 * 2.11e-3
    # 3.5e-4 on the tube's own surface is 3.5e-4·do/di = 4.47e-4 on the outside area: more than 4e-4 on the shell
    assert fouling_side(rv.rate(ex, svc.replace(fouling_shell=4e-4, fouling_tube=3.5e-4)))[0] == "tube"
    assert 3.5e-4 * do / di > 4e-4
    # 3e-4 inside is 3.83e-4 outside: less than 4e-4
    side, why = fouling_side(rv.rate(ex, svc.replace(fouling_shell=4e-4, fouling_tube=3e-4)))
    assert side == "shell" and 3e-4 * do / di < 4e-4 and "does not say" in why
    assert fouling_side(rv.rate(ex, svc))[0] == "tube"  # no fouling at all: a tie, the tube side


def test_no_plant_data_no_cycle(batch_run):
    # the batch's units have no plant data: the report keeps the snapshot money and says nothing of a cycle
    text = (batch_run["out"] / f"{report.safe_name(NASTY)}.html").read_text(encoding="utf-8")
    assert "duty_cycle_avg" not in text and "The options side by side" in text


# --------------------------------------------------------------------------- the fouling cycle as the unit file says
def _plant_generator():
    """The invented-plant-data generator of data/ (a script, not part of the package), imported by path."""
    import importlib.util

    path = Path(__file__).resolve().parent.parent / "data" / "generate_plant_data.py"
    spec = importlib.util.spec_from_file_location("generate_plant_data", path)
    module = importlib.util.module_from_spec(spec)
    sys.modules.setdefault(spec.name, module)  # its dataclasses look their module up while being built
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def filed_cycle(tmp_path_factory):
    """One exchanger whose file gives the side (tube), its own run length and the unit's downtime.

    The test exchanger's design fouling is 3e-4 on the shell and 2e-4 inside the tube, i.e. 2e-4·do/di = 2.57e-4 on
    the outside area: the rule without the field would take the shell side, so the tube side can only come from the
    file. The plant data are invented: 60 days of a linear tube-side deposit (data/generate_plant_data.py)."""
    import revamp as rv
    from revamp import unitfile

    root = tmp_path_factory.mktemp("cycle")
    doc = make_unit("E-1")
    doc["economics"].update(run_length="400 day", cleaning_downtime="6 day")
    # the plant data are made from the exchanger as built (loaded first without them), then the file names them
    case = unitfile.load(write_unit(root / "unit.yaml", doc)).exchanger("E-1")
    gen = _plant_generator()
    df = gen.generate(case.exchanger, case.service, hours=24 * 60, fouling_law=gen.Linear(a=5e-5, b_per_year=8e-4),
                      seed=3, fouling_side="tube", bad_rows=False)
    df.drop(columns=["rf_true"]).to_csv(root / "plant.csv", index=False)
    doc["exchangers"][0]["plant_data"] = {"file": "plant.csv", "fouling_side": "tube", "run_length": "200 day"}
    path = write_unit(root / "unit.yaml", doc)
    calls = []
    real_monitor = rv.monitor

    def spy(*args, **kwargs):
        calls.append(kwargs.get("fouling_side"))
        return real_monitor(*args, **kwargs)

    rv.monitor = spy
    try:
        result = report.run_case(unitfile.load(path).exchanger("E-1"), mc_draws=0)
    finally:
        rv.monitor = real_monitor
    return {"result": result, "monitor_sides": calls}


def test_fouling_side_from_the_file_reaches_monitor_and_cycle(filed_cycle):
    result = filed_cycle["result"]
    do, di = 19.05e-3, 19.05e-3 - 2 * 2.11e-3
    assert 3e-4 > 2e-4 * do / di  # the design fouling alone would point at the shell side
    assert filed_cycle["monitor_sides"] == ["tube"]
    assert result.monitoring_error is None and result.cycle_error is None
    side, why = result.fouling_side.value, result.fouling_side.source
    assert side == "tube" and result.cycle.side.value == "tube"
    assert why.startswith("from the unit file") and "exchangers[0].plant_data.fouling_side" in why
    text = " ".join(x for x in report.study_items(result) if isinstance(x, str))
    assert "Side: from the unit file" in text and "inferred" not in text


def test_cycle_uses_the_files_run_length_and_downtime(filed_cycle):
    """duty_cycle_avg equals cycle_average evaluated directly on rv.rate calls with the file's run length (the
    exchanger's 200 day, overriding the unit's 400 day) and the unit's 6 day downtime; the base case starts at its
    plant-data age, every option clean."""
    import numpy as np

    import revamp as rv
    from revamp.economics import cycle_average

    result = filed_cycle["result"]
    case, mon, table = result.case, result.monitoring, result.study.table
    cycle = result.cycle
    assert mon.trend.model != "threshold"  # a model used as fitted (a threshold one is rebuilt per option)
    day = 86400.0  # s (SI definition of the day)
    assert cycle.run_length.value == 200 * day and cycle.downtime.value == 6 * day
    ratio = case.exchanger.tube_id / case.exchanger.tube_od  # outside-area Rf to the tube's own surface
    model = lambda t: np.maximum(mon.trend(t), 0.0) * ratio
    age = float(np.nanmax(mon.table["run_time"]))
    assert cycle.base_age == pytest.approx(age)

    def direct(ex, svc, start, downtime):
        # the shell side (no growth model) goes linearly from where the option leaves it to its design value
        shell = np.linspace(svc.fouling_shell, case.revamp_service.fouling_shell, 21)
        return cycle_average(lambda rf: rv.rate(ex, svc.replace(fouling_tube=rf, fouling_shell=shell)).duty,
                             lambda t: model(np.asarray(t, dtype=float) + start), 200 * day, downtime,
                             points=21).duty_mean

    expected = {k: direct(ex, svc, age if k == "base" else 0.0, 6 * day) for k, (ex, svc) in _option_cases(case).items()}
    assert table["duty_cycle_avg"].to_dict() == pytest.approx(expected, rel=1e-9)
    # the downtime counts with no duty: the average is the on-stream one × 200/(200 + 6) (definition of the mean
    # over a cycle, Epstein 1979's cycle average)
    on_stream = direct(case.exchanger, case.revamp_service, age, 0.0)
    assert table.loc["base", "duty_cycle_avg"] == pytest.approx(on_stream * 200 / 206, rel=1e-9)
    text = " ".join(x for x in report.study_items(result) if isinstance(x, str))
    assert "Run length 200 days (from the unit file, exchangers[0].plant_data.run_length)" in text
    assert "cleaning downtime 6 days" in text and "economics.cleaning_downtime" in text


def test_fouling_side_given_wins_and_a_bad_one_is_refused():
    import revamp as rv
    from revamp.errors import InputError
    from revamp.report.case import fouling_side

    oil = rv.fluids.constant(density=850.0, heat_capacity=2200.0, viscosity=2e-3, conductivity=0.12)
    ex = rv.ShellAndTube(shell_id="0.5 m", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="5 m",
                         tube_count=200, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="0.3 m",
                         baffle_cut=0.25)
    r = rv.rate(ex, rv.Service(shell=rv.Stream(oil, 10.0, 420.0), tube=rv.Stream(oil, 12.0, 300.0),
                               fouling_shell=1e-3, fouling_tube=0.0))
    assert fouling_side(r)[0] == "shell" and fouling_side(r)[1].startswith("inferred: ")
    side, why = fouling_side(r, "tube", "exchangers[0].plant_data.fouling_side")
    assert side == "tube" and why == "from the unit file (exchangers[0].plant_data.fouling_side: tube)"
    with pytest.raises(InputError, match="fouling_side"):
        fouling_side(r, "both")


def test_a_refused_option_fails_its_row_not_the_exchanger(tmp_path):
    # requirement: one bad option fails that option's row, not the whole report (the file check still names it)
    from revamp import unitfile
    from revamp.batch import _plan, notebook_path
    from revamp.studies import study_exchanger

    doc = make_unit("E-1")
    doc["exchangers"][0]["options"].append({"type": "new_bundle", "label": "too tight", "tube_pitch": "10 mm"})
    path = write_unit(tmp_path / "u.yaml", doc)
    unit, problems, entries = unitfile.load_partial(path)
    assert any(p.path.startswith("exchangers[0].options[2]") for p in problems)
    rows, jobs = _plan(unit, problems, entries, notebook_path(), Path(path), 60, "SI")
    assert rows[0]["status"] != "failed" and [j["tag"] for j in jobs] == ["E-1"]
    result = study_exchanger(unit.exchanger("E-1"), mc_draws=0)
    assert "too tight" not in [str(i) for i in result.study.table.index]
    assert any("Option not rated" in n.text and "options[2]" in n.text for n in result.notes)
    assert any("Option not rated" in str(i) for i in report.study_items(result))
