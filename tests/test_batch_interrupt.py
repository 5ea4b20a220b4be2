"""A batch that is interrupted or killed leaves no process behind and an output folder that tells the truth.

The real-process tests start ``revamp batch`` on the demo unit in a subprocess of its own session, wait for the
first report, stop the batch the way a user or a scheduler does (SIGTERM to the main process as ``timeout`` sends,
SIGINT to the whole process group as a terminal's Ctrl-C does, SIGKILL to the main process), then check with psutil
that no worker or kernel of that run is still there and that the folder is consistent: no temporaries, every report
in the folder listed in the index, and the index saying the run did not finish. Their time is bounded: the first
report of the demo comes within a few minutes even on a loaded machine, and everything must be gone 30 s after the
signal (the batch allows 3 s for a polite stop, its workers poll their parent every 0.5 s).
"""
from __future__ import annotations

import os
import re
import signal
import subprocess
import sys
import time
from pathlib import Path

import psutil
import pytest
from test_unitfile import make_unit, write_unit

from revamp import batch
from revamp.cli import demo_unit_path
from revamp.errors import InputError

FIRST_REPORT_WITHIN = 420.0  # s: the demo's first study (kernel start, ratings, plant data) on a loaded machine
GONE_WITHIN = 30.0  # s


def _reports(out: Path) -> set:
    """The exchanger reports (the index and the unit's own pages, each linked from its own section, are not)."""
    from revamp.batch import UNIT_PAGES

    pages = {"index.html"} | {file for _, _, file in UNIT_PAGES.values()}
    return {p.name for p in out.glob("*.html") if p.name not in pages}


def _linked(index_text: str) -> set:
    summary = re.search(r'<section id="summary">(.*?)</section>', index_text, re.DOTALL).group(1)
    return set(re.findall(r'<a href="([^"]+)"', summary))


def _start_and_stop(tmp_path, how: str):
    """Run a real batch of the demo unit, stop it after its first report; return what is needed to check."""
    out = tmp_path / "out"
    env = {**os.environ, "PYTHONPATH": os.pathsep.join(filter(None, [str(Path(__file__).resolve().parents[1]),
                                                                      os.environ.get("PYTHONPATH")]))}
    proc = subprocess.Popen([sys.executable, "-m", "revamp.cli", "batch", str(demo_unit_path()), "--out", str(out),
                             "--jobs", "2", "--quiet"], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            env=env, start_new_session=True)
    seen = {}  # every descendant of the batch ever observed: pid -> psutil.Process (which knows its start time)
    files = set()  # the kernels' connection files
    try:
        main = psutil.Process(proc.pid)
        deadline = time.monotonic() + FIRST_REPORT_WITHIN
        # the first report and the index that lists it (a kill cannot be held off: the two land a moment apart)
        while not (out.is_dir() and _reports(out) and (out / "index.html").is_file()):
            assert proc.poll() is None, f"the batch ended before its first report: {proc.communicate()}"
            assert time.monotonic() < deadline, "no report within the time allowed"
            _note_descendants(main, seen, files)
            time.sleep(0.2)
        _note_descendants(main, seen, files)
        if how == "TERM":
            os.kill(proc.pid, signal.SIGTERM)
        elif how == "INT group":
            os.killpg(proc.pid, signal.SIGINT)
        else:
            os.kill(proc.pid, signal.SIGKILL)
        stdout, stderr = proc.communicate(timeout=GONE_WITHIN)
        _, alive = psutil.wait_procs(list(seen.values()), timeout=GONE_WITHIN)
        return {"out": out, "code": proc.returncode, "stderr": stderr, "seen": seen, "files": files,
                "alive": [(p.pid, " ".join(p.cmdline()[:4])) for p in alive if p.is_running()]}
    finally:
        if proc.poll() is None:
            proc.kill()
        for p in seen.values():  # never leave anything running, whatever the test found
            try:
                p.kill()
            except psutil.Error:
                pass


def _note_descendants(main, seen: dict, files: set) -> None:
    try:
        children = main.children(recursive=True)
    except psutil.NoSuchProcess:
        return
    for child in children:
        seen.setdefault(child.pid, child)
        try:
            cmd = child.cmdline()
        except psutil.Error:
            continue
        if "-f" in cmd[:-1]:  # a kernel is started with "-f <connection file>"
            files.add(cmd[cmd.index("-f") + 1])


def unitfile_tags() -> list:
    from revamp import unitfile

    return unitfile.load(demo_unit_path()).tags


def _is_kernel(p) -> bool:
    try:
        return "ipykernel" in " ".join(p.cmdline())
    except psutil.Error:
        return True  # gone already; it was seen as a descendant (kernels are the only short-lived ones)


@pytest.mark.parametrize("how", ["TERM", "INT group", "KILL"])
def test_stopped_batch_leaves_no_process_and_a_consistent_folder(tmp_path, how):
    r = _start_and_stop(tmp_path, how)
    out = r["out"]
    assert any(_is_kernel(p) for p in r["seen"].values()), "the test never saw a kernel: it could not fail"
    assert r["alive"] == [], f"still running after {how}: {r['alive']}"
    index = (out / "index.html").read_text(encoding="utf-8")
    reports, linked = _reports(out), _linked(index)
    assert reports == linked, "a report in the folder that the index does not list, or the reverse"
    n = len(unitfile_tags())  # the demo's exchangers (revamp/demo/unit.yaml)
    assert 1 <= len(reports) < n
    assert not [p.name for p in out.iterdir() if p.name.endswith(".tmp")]
    if how == "KILL":  # nothing runs in the main process any more: the index says the run may have stopped
        assert "If no batch is running any more, this run stopped before it finished" in index
        assert r["code"] == -signal.SIGKILL
        return
    signame = "SIGTERM" if how == "TERM" else "SIGINT"
    assert f"was interrupted ({signame})" in index
    assert index.count(">not run<") == n - len(reports)
    assert not [p.name for p in out.iterdir() if p.name.startswith(".run-")], "temporaries left behind"
    assert r["files"] and not [f for f in r["files"] if Path(f).exists()], "kernel connection files left behind"
    assert r["code"] == 128 + (signal.SIGTERM if how == "TERM" else signal.SIGINT)
    lines = r["stderr"].strip().splitlines()
    assert len(lines) == 1 and "Traceback" not in r["stderr"] and "interrupted" in lines[0], r["stderr"]


# ------------------------------------------------------------------------- the folder logic, without processes
def _fake_execute(results, then_raise=None):
    """A stand-in for the worker pool: stage each given report, hand it over, then optionally interrupt."""
    def execute(jobs_list, workers, on_result, tmp_dir):
        by_tag = {j["tag"]: j for j in jobs_list}
        for tag, status in results:
            job = by_tag[tag]
            staged = Path(job["stage"]) / job["file"]
            staged.write_text(f"new report of {tag}", encoding="utf-8")
            on_result({"tag": tag, "status": status, "reason": "" if status == "ok" else "boom", "summary": {},
                       "staged": str(staged), "seconds": 1.0})
        if then_raise is not None:
            raise then_raise
    return execute


def _old_folder(out: Path, *names):
    out.mkdir()
    (out / "index.html").write_text("older index", encoding="utf-8")
    for name in names:
        (out / name).write_text("older report", encoding="utf-8")


def test_interrupt_before_any_report_leaves_the_folder_as_it_was(tmp_path, monkeypatch):
    path = write_unit(tmp_path / "u.yaml", make_unit("E-1", "E-2"))
    out = tmp_path / "out"
    _old_folder(out, "E-1.html")
    monkeypatch.setattr(batch, "_execute", _fake_execute([], then_raise=KeyboardInterrupt()))
    with pytest.raises(batch.BatchInterrupted) as info:
        batch.run_batch(path, out, jobs=1, progress=False)
    assert info.value.index_path is None and "as it was" in info.value.message
    assert (out / "index.html").read_text() == "older index" and (out / "E-1.html").read_text() == "older report"
    assert not [p for p in out.iterdir() if p.name.startswith(".")]


def test_interrupt_after_one_report_states_which_are_from_this_run(tmp_path, monkeypatch):
    path = write_unit(tmp_path / "u.yaml", make_unit("E-1", "E-2", "E-3"))
    out = tmp_path / "out"
    _old_folder(out, "E-1.html", "E-2.html", "E-3.html")
    monkeypatch.setattr(batch, "_execute", _fake_execute([("E-2", "ok")],
                                                         then_raise=batch._Stopped(signal.SIGTERM)))
    with pytest.raises(batch.BatchInterrupted) as info:
        batch.run_batch(path, out, jobs=1, progress=False)
    assert info.value.signum == signal.SIGTERM and (info.value.done, info.value.total) == (1, 3)
    index = (out / "index.html").read_text(encoding="utf-8")
    assert "was interrupted (SIGTERM)" in index and "1 of 3 exchanger(s) were done" in index
    assert _linked(index) == {"E-2.html"} and index.count(">not run<") == 2
    assert (out / "E-2.html").read_text() == "new report of E-2"
    assert not [p for p in out.iterdir() if p.name.startswith(".")]


def test_rerun_with_only_removes_the_older_report_of_a_failed_exchanger(tmp_path, monkeypatch):
    doc = make_unit("E-1", "E-2", "E-3")
    doc["exchangers"][0]["tube_side"]["flow"] = "-5 kg/s"  # refused by the file check: no study runs
    path = write_unit(tmp_path / "u.yaml", doc)
    out = tmp_path / "out"
    _old_folder(out, "E-1.html", "E-2.html", "E-3.html")
    monkeypatch.setattr(batch, "_execute", _fake_execute([("E-2", "failed")]))
    monkeypatch.setattr(batch, "_run_one", None)  # nothing may run for real
    res = batch.run_batch(path, out, jobs=1, only=["E-1", "E-2"], progress=False)
    assert set(res.failures) == {"E-1", "E-2"}
    assert not (out / "E-1.html").exists(), "an older report beside an index that says E-1 failed"
    assert (out / "E-2.html").read_text() == "new report of E-2"  # this run's report, stating its failure
    assert (out / "E-3.html").read_text() == "older report"  # not in --only: not touched
    index = (out / "index.html").read_text(encoding="utf-8")
    assert _linked(index) == {"E-2.html"} and "run-state" not in index


def test_a_worker_that_returns_nothing_is_failed_not_left_running(tmp_path, monkeypatch):
    path = write_unit(tmp_path / "u.yaml", make_unit("E-1", "E-2"))
    monkeypatch.setattr(batch, "_execute", _fake_execute([("E-1", "ok")]))
    res = batch.run_batch(path, tmp_path / "out", jobs=1, progress=False)
    assert res.failures == {"E-2": "no result came back from the worker"}


def test_jobs_capped_to_the_cores_with_a_note(tmp_path, monkeypatch):
    path = write_unit(tmp_path / "u.yaml", make_unit("E-1"))
    got = {}

    def execute(jobs_list, workers, on_result, tmp_dir):
        got["workers"] = workers

    monkeypatch.setattr(batch, "_execute", execute)
    monkeypatch.setattr(batch, "available_cores", lambda: 3)
    res = batch.run_batch(path, tmp_path / "out", jobs=1000, progress=False)
    assert got["workers"] == 1  # one exchanger: one worker is enough
    assert len(res.notes) == 1 and "--jobs 1000 capped to 3" in res.notes[0]
    path2 = write_unit(tmp_path / "u2.yaml", make_unit("E-1", "E-2", "E-3", "E-4"))
    batch.run_batch(path2, tmp_path / "out2", jobs=1000, progress=False)
    assert got["workers"] == 3
    for bad in (0, -1, 2.5, "2", True):
        with pytest.raises(InputError, match="jobs"):
            batch.run_batch(path, tmp_path / "out3", jobs=bad, progress=False)


def test_available_cores_is_what_this_process_may_use():
    # the CPU affinity mask is the operating system's own statement of it (Linux: sched_getaffinity(2))
    expected = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    assert batch.available_cores() == expected


def test_a_later_run_removes_the_temporaries_of_a_killed_one(tmp_path, monkeypatch):
    path = write_unit(tmp_path / "u.yaml", make_unit("E-1"))
    out = tmp_path / "out"
    out.mkdir()
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()  # a process id that no longer exists (the batch killed outright)
    abandoned = out / f"{batch._stage_prefix()}{dead.pid}-abc"
    in_use = out / f"{batch._stage_prefix()}{os.getpid()}-def"  # this process is alive: its folder stays
    elsewhere = out / ".run-otherhost-1-ghi"  # another host's run: not ours to judge
    for d in (abandoned, in_use, elsewhere):
        (d / "job-1").mkdir(parents=True)
    monkeypatch.setattr(batch, "_execute", _fake_execute([("E-1", "ok")]))
    batch.run_batch(path, out, jobs=1, progress=False)
    assert not abandoned.exists() and in_use.is_dir() and elsewhere.is_dir()
