"""Batch: one comparison report per exchanger of a unit file, and an index page.

:func:`run_batch` runs ``notebooks/exchanger_study.ipynb`` with papermill once per exchanger (in parallel worker
processes, with a progress bar), converts each executed notebook to HTML without its code cells, and writes
``DIR/<safe tag>.html``, ``DIR/index.html`` and ``DIR/plotly.min.js`` (the reports open offline). One exchanger's
failure (an invalid entry in the file, or an error while running its study) is recorded in the index with its reason
and never stops the others; a report left from an earlier run of a failed exchanger is removed, so that no older
report stands beside an index that says the exchanger failed.

Workers write into a temporary ``DIR/.run-*`` folder; each finished report is moved into ``DIR`` atomically and the
index rewritten, so the folder is consistent at every moment: the index names the reports of this run, and says so
while the run is still going. An interrupt (Ctrl-C, or SIGTERM as ``timeout`` and job schedulers send) stops the
workers and their kernels, removes the temporaries and leaves either the folder as it was (nothing finished yet) or an
index that states the run was interrupted and which reports are from it; :class:`BatchInterrupted` is then raised.
Workers also die with the batch's main process when it is killed outright (they watch their parent).
"""
from __future__ import annotations

import datetime as _dt
import json
import operator
import os
import shutil
import signal
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass, field
from multiprocessing import get_context
from pathlib import Path

from . import report
from .batch_processes import (  # noqa: F401  (re-exported: the batch's names for them)
    _no_interrupts,
    _sigterm_interrupts,
    _Stopped,
    _stop_processes,
    _stop_workers,
    _worker_init,
    available_cores,
)
from .errors import InputError

__all__ = ["SUMMARY_FIELDS", "BatchInterrupted", "BatchResult", "available_cores", "notebook_path",
           "render_notebook", "run_batch"]


def notebook_path(name: str = "exchanger_study.ipynb") -> Path:
    """A notebook shipped with the package (``revamp/notebooks``; in a checkout a link to ``notebooks/``)."""
    path = Path(__file__).resolve().parent / "notebooks" / name
    if not path.is_file():
        raise InputError("notebook", str(path), "present: the notebooks ship inside the package (reinstall revamp)")
    return path


@dataclass
class BatchResult:
    """What a batch wrote: the index, each report by tag, the failures by tag with their reason, the timings [s],
    and notes on how it ran (e.g. ``--jobs`` capped to the cores available)."""

    index_path: Path
    reports: dict = field(default_factory=dict)
    failures: dict = field(default_factory=dict)
    seconds: float = 0.0
    per_exchanger: dict = field(default_factory=dict)
    notes: list = field(default_factory=list)


class BatchInterrupted(KeyboardInterrupt):
    """A batch stopped by SIGINT (Ctrl-C) or SIGTERM, after its workers and kernels were stopped and its temporaries
    removed. ``signum`` is the signal, ``index_path`` the index stating the interruption (None when nothing of the run
    was written: the output folder is then as it was), ``done``/``total`` the exchangers finished and planned."""

    def __init__(self, signum: int, index_path=None, done: int = 0, total: int = 0):
        self.signum, self.index_path, self.done, self.total = signum, index_path, done, total
        super().__init__(self.message)

    @property
    def message(self) -> str:
        name = signal.Signals(self.signum).name if self.signum in set(signal.Signals) else str(self.signum)
        if self.index_path is None:
            return f"batch interrupted ({name}) before any report was finished; the output folder is as it was"
        return (f"batch interrupted ({name}): {self.done} of {self.total} exchanger(s) done in this run; "
                f"the index says which: {self.index_path}")


def _drop_noise(nb):
    """Outputs a reader should not see in a report: stderr streams (library chatter) and papermill's own markers."""
    for cell in nb.cells:
        if cell.get("cell_type") == "code":
            cell["outputs"] = [o for o in cell.get("outputs", [])
                               if not (o.get("output_type") == "stream" and o.get("name") == "stderr")]
    return nb


def render_notebook(nb) -> str:
    """The HTML body of an executed notebook, without code cells or prompts (nbconvert, 'basic' template)."""
    from nbconvert import HTMLExporter

    exporter = HTMLExporter(template_name="basic")
    exporter.exclude_input = True
    exporter.exclude_input_prompt = True
    exporter.exclude_output_prompt = True
    body, _ = exporter.from_notebook_node(_drop_noise(nb))
    return body


def _one_line(text: str, limit: int = 300) -> str:
    line = " ".join(str(text).split())
    return line if len(line) <= limit else line[: limit - 3] + "..."


def _run_one(job: dict) -> dict:
    """Run the study notebook for one exchanger; write its report into the run's temporary folder (the main process
    moves it into place). Runs in a worker process. A ``kind: train`` job writes the unit's train page instead."""
    if job.get("kind") in UNIT_PAGES:  # a page of the whole unit (the train, the cleaning plan)
        from importlib import import_module

        module, fn, _ = UNIT_PAGES[job["kind"]]
        return {**getattr(import_module(module, __package__), fn)(job), "kind": job["kind"], "tag": job["tag"]}
    import nbformat
    import papermill as pm

    start = time.perf_counter()
    if job.get("quiet_kernel", True):  # the kernels' start-up chatter would garble the progress bar
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, 2)
        os.close(devnull)
    tag, stage = job["tag"], Path(job["stage"])
    work = Path(tempfile.mkdtemp(prefix="job-", dir=stage))
    summary_path, executed = work / "summary.json", work / "executed.ipynb"
    status, reason, staged_tables = "ok", "", None
    try:
        pm.execute_notebook(str(job["notebook"]), str(executed), parameters={
            "unit_file": job["unit_file"], "tag": tag, "interactive": False, "summary_path": str(summary_path),
            "units": job.get("units", "SI")}, kernel_name="python3", progress_bar=False, log_output=False,
            cwd=str(work), execution_timeout=job.get("timeout", 900))
    except Exception as exc:  # PapermillExecutionError carries the notebook's own error: show that
        status = "failed"
        ename, evalue = getattr(exc, "ename", None), getattr(exc, "evalue", None)
        reason = _one_line(f"{ename}: {evalue}" if ename else f"{exc.__class__.__name__}: {exc}")
    summary = {}
    if summary_path.is_file():
        try:
            summary = json.loads(summary_path.read_text(encoding="utf-8"))
        except ValueError:
            summary = {}
    staged = None
    try:
        if executed.is_file():
            nb = nbformat.read(executed, as_version=4)
            prov = report.provenance(job["unit_file"], tag, extra_files=job.get("extra_files", ()),
                                     parameters={"interactive": False, "units": job.get("units", "SI")},
                                     inputs=job.get("inputs"))
            prov["unit_file"] = job.get("source_unit_file") or prov.get("unit_file")  # as the user named it
            title = f"{tag} — {job.get('description') or 'revamp study'}"
            body = render_notebook(nb)
            if status == "failed":
                body = (f'<p class="rv-status-failed">This study stopped with an error: {report.esc(reason)}</p>'
                        + body)
            staged = str(report.write_atomic(stage / job["file"], report.page(title, body, prov)))
    except Exception as exc:
        status, reason = "failed", reason or _one_line(f"report not written: {exc.__class__.__name__}: {exc}")
    finally:
        if (work / "tables").is_dir():  # the report's tables as CSV (the notebook wrote them), staged like the report
            staged_tables = stage / f"tables-{Path(job['file']).stem}"
            shutil.rmtree(staged_tables, ignore_errors=True)
            shutil.move(str(work / "tables"), str(staged_tables))
            staged_tables = str(staged_tables)
        shutil.rmtree(work, ignore_errors=True)
    return {"tag": tag, "status": status, "reason": reason, "summary": summary, "staged": staged,
            "staged_tables": staged_tables, "seconds": time.perf_counter() - start}


def _execute(jobs_list: list, workers: int, on_result, tmp_dir: str) -> None:
    """Run each job in worker processes; call ``on_result(result)`` in this process as each one ends. The workers
    and their kernels keep their temporary files in ``tmp_dir``.

    An interrupt (KeyboardInterrupt, or SIGTERM inside :func:`_sigterm_interrupts`) stops every worker and its
    kernel before it propagates. Always in worker processes: a worker silences its own stderr, never ours.
    """
    pool = ProcessPoolExecutor(max_workers=workers, mp_context=get_context("spawn"), initializer=_worker_init,
                               initargs=(os.getpid(), tmp_dir))
    try:
        futures = {pool.submit(_run_one, job): job for job in jobs_list}
        for fut in as_completed(futures):
            job = futures[fut]
            try:
                res = fut.result()
            except Exception as exc:  # a worker that died: that exchanger fails, the others go on
                res = {"tag": job["tag"], "kind": job.get("kind"), "status": "failed", "staged": None, "summary": {},
                       "seconds": 0.0, "file": None,
                       "reason": _one_line(f"{exc.__class__.__name__}: {exc}")}
            on_result(res)
    except BaseException:
        with _no_interrupts(deliver=False):
            _stop_workers(list((getattr(pool, "_processes", None) or {}).values()))
            pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown(wait=True)


#: exchanger kind -> its study notebook (the others use the batch's notebook, ``exchanger_study.ipynb``)
KIND_NOTEBOOKS = {"air cooler": "air_cooler_study.ipynb", "condenser": "condenser_study.ipynb"}

#: columns of the index table: (summary key, header, formatter)
SUMMARY_FIELDS = [
    ("duty_today", "duty today [kW]", lambda v: f"{v / 1e3:,.0f}"),
    ("duty_revamp", "duty at revamp [kW]", lambda v: f"{v / 1e3:,.0f}"),
    ("target", "target", str),
    ("meets_target", "meets target as is", lambda v: "yes" if v else "no"),
    ("screening_as_is", "limits as is", str),
    ("recommendation", "recommendation", str),
    ("condensing_pressure", "condensing pressure held [bar]", lambda v: f"{v / 1e5:.3g}"),
]


#: pages of the whole unit, written by a job of their own beside the exchanger reports:
#: kind -> (module, function computing and staging the page, file name)
UNIT_PAGES = {"train": (".batch_train", "run_train_page", "train.html"),
              "cleaning": (".batch_cleaning", "run_cleaning_page", "cleaning.html")}


def _pages_html(pages: dict | None) -> str:
    """The index's sections on the unit's own pages (the train, the cleaning plan), in that order."""
    from .batch_cleaning import index_section as cleaning_section
    from .batch_train import index_section as train_section

    pages = pages or {}
    return train_section(pages.get("train")) + cleaning_section(pages.get("cleaning"))


def _index_html(unit, rows: list[dict], prov: dict, progress: str = "", pages: dict | None = None) -> str:
    header = ["exchanger", "description", "status"] + [h for _, h, _ in SUMMARY_FIELDS] + ["reason"]
    lines = ['<section id="summary"><h2>Exchangers</h2><table class="rv-table"><thead><tr>'
             + "".join(f"<th>{report.esc(h)}</th>" for h in header) + "</tr></thead><tbody>"]
    for r in rows:
        tag = report.esc(r["tag"])
        link = f'<a href="{report.esc(r["file"])}">{tag}</a>' if r.get("file") else tag
        cls = "rv-status-ok" if r["status"] == "ok" else "rv-status-failed"
        cells = [link, report.esc(r.get("description", "")), f'<span class="{cls}">{report.esc(r["status"])}</span>']
        numeric = set()
        for key, _, fmt in SUMMARY_FIELDS:
            value = r.get("summary", {}).get(key)
            if isinstance(value, float):
                numeric.add(len(cells))
            try:
                cells.append(report.esc(fmt(value)) if value is not None else "")
            except (TypeError, ValueError):
                cells.append(report.esc(value))
        cells.append(report.esc(r.get("reason", "")))
        lines.append("<tr>" + "".join(f'<td class="num">{c}</td>' if i in numeric else f"<td>{c}</td>"
                                      for i, c in enumerate(cells)) + "</tr>")
    lines.append("</tbody></table></section>")
    chart = _index_chart(rows)
    failed = sum(r["status"] == "failed" for r in rows)
    waiting = sum(r["status"] == NOT_RUN for r in rows)
    intro = (f"<p>{len(rows)} exchanger(s), {len(rows) - failed - waiting} report(s) written, {failed} failed"
             + (f", {waiting} not run" if waiting else "") + ". "
             + f"{report.esc(unit.description) if unit else ''}</p>")
    state = f'<p class="rv-status-failed" id="run-state">{report.esc(progress)}</p>' if progress else ""
    return report.page(f"{unit.name if unit else 'Unit'} — revamp study",
                       state + intro + _pages_html(pages) + "".join(lines) + chart, prov)


def _index_chart(rows) -> str:
    import plotly.graph_objects as go

    done = [r for r in rows if r.get("summary", {}).get("duty_revamp") is not None]
    if not done:
        return ""
    tags = [report.plot_text(r["tag"]) for r in done]
    fig = go.Figure()
    fig.add_bar(name="today", x=tags, y=[r["summary"].get("duty_today", 0) / 1e3 for r in done])
    fig.add_bar(name="at revamp, as is", x=tags, y=[r["summary"]["duty_revamp"] / 1e3 for r in done])
    if any(r["summary"].get("target_duty") for r in done):
        fig.add_scatter(name="target duty", x=tags, y=[r["summary"]["target_duty"] / 1e3
                                                       if r["summary"].get("target_duty") else None for r in done],
                        mode="markers", marker={"symbol": "line-ew-open", "size": 28, "line": {"width": 3}})
    fig.update_layout(barmode="group", yaxis_title="duty [kW]", height=420, margin={"t": 40},
                      title="Duty of each exchanger today and at the revamp conditions")
    return '<section id="chart"><h2>Duties</h2>' + report.figure_html(fig, "unit-duties") + "</section>"


#: status of an exchanger whose study this run has not (yet) finished
NOT_RUN = "not run"


def _stage_prefix() -> str:
    """``.run-<host>-``: a run's temporary folder is named by its host and process id, so that a later run can tell
    one abandoned by a killed batch (its process gone) from one still in use."""
    import socket

    return f".run-{report.safe_name(socket.gethostname())}-"


def _remove_abandoned_stages(out: Path) -> None:
    """Remove the temporary folders that batches on this host left in ``out`` when they were killed outright."""
    prefix = _stage_prefix()
    for path in out.glob(prefix + "*"):
        pid = path.name[len(prefix):].split("-", 1)[0]
        if not (path.is_dir() and pid.isdigit()):
            continue
        try:
            os.kill(int(pid), 0)
        except ProcessLookupError:
            shutil.rmtree(path, ignore_errors=True)
        except OSError:  # alive (owned by someone else): leave it
            pass


class _Run:
    """One batch run's output folder: its temporary folder, the index rows, and the moves that keep them consistent.

    Every change of the folder goes through :meth:`settle` (a report moved in atomically, or an older report of a
    failed exchanger removed) followed by an index rewrite, so a reader (or a kill) never finds an index that
    disagrees with the reports beside it.
    """

    def __init__(self, out: Path, unit, rows: list, params: dict, unit_file: Path):
        self.out, self.unit, self.rows, self.params, self.unit_file = out, unit, rows, params, unit_file
        self.by_tag = {r["tag"]: r for r in rows}
        self.started = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M:%S UTC")
        _remove_abandoned_stages(out)
        self.stage = Path(tempfile.mkdtemp(prefix=f"{_stage_prefix()}{os.getpid()}-", dir=out))
        self.index_written = False
        self.pages = {}  # kind -> result of the unit's own pages (train, cleaning)

    def settle(self, res: dict) -> Path:
        """Take one finished exchanger into the folder and rewrite the index: its report moved in, or an older report
        of it removed if it failed. The index is rendered before the move, so that the two land a moment apart.
        The unit's own pages (jobs of a kind in :data:`UNIT_PAGES`) are moved in the same way, each linked from its own
        section."""
        if res.get("kind") in UNIT_PAGES:
            self.pages[res["kind"]] = res
            text = self._index_text(self.running_text())
            if res.get("staged") and Path(res["staged"]).parent != self.out:
                os.replace(res["staged"], self.out / UNIT_PAGES[res["kind"]][2])
            return self._write(text)
        row = self.by_tag[res["tag"]]
        row.update({k: res[k] for k in ("status", "reason", "summary")})
        if res.get("staged"):
            row["file"] = row["fname"]
        text = self._index_text(self.running_text())
        if res.get("staged"):
            os.replace(res["staged"], self.out / row["fname"])
        if res.get("staged_tables"):  # the report's tables as CSV, one folder per exchanger
            tables = self.out / "tables" / Path(row["fname"]).stem
            shutil.rmtree(tables, ignore_errors=True)
            tables.parent.mkdir(exist_ok=True)
            os.replace(res["staged_tables"], tables)
        return self._write(text)

    def write_index(self, progress: str = "") -> Path:
        """Rewrite the index; ``progress`` is a statement on the run shown at its top (none once it is complete)."""
        return self._write(self._index_text(progress))

    def _index_text(self, progress: str) -> str:
        prov = report.provenance(self.unit_file, None, parameters=self.params)
        return _index_html(self.unit, self.rows, prov, progress, self.pages)

    def _write(self, text: str) -> Path:
        for row in self.rows:  # an older report must not stand beside an index that says the exchanger failed
            if row["status"] == "failed" and not row.get("file"):
                (self.out / row["fname"]).unlink(missing_ok=True)
        path = report.write_atomic(self.out / "index.html", text)
        self.index_written = True
        return path

    def counts(self) -> tuple:
        done = sum(r["status"] != NOT_RUN for r in self.rows)
        return done, len(self.rows)

    def running_text(self) -> str:
        done, total = self.counts()
        return (f"Batch run started {self.started}: {done} of {total} exchanger(s) done so far. If no batch is "
                f"running any more, this run stopped before it finished: only the exchangers with a status other "
                f"than '{NOT_RUN}' are from it, and a report of a '{NOT_RUN}' exchanger in this folder is from an "
                f"earlier run.")

    def interrupted_text(self, signum: int) -> str:
        done, total = self.counts()
        name = signal.Signals(signum).name if signum in set(signal.Signals) else str(signum)
        when = _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M:%S UTC")
        return (f"This batch run (started {self.started}) was interrupted ({name}) at {when}: {done} of {total} "
                f"exchanger(s) were done and are listed with their status and report; the exchangers marked "
                f"'{NOT_RUN}' were not studied in this run, and a report of theirs in this folder, if any, is from "
                f"an earlier run.")

    def cleanup(self) -> None:
        shutil.rmtree(self.stage, ignore_errors=True)


def _plan(unit, problems, entries, nb_path: Path, unit_file: Path, timeout, units):
    """The index rows (one per exchanger, failed already when the file has problems with it) and the worker jobs."""
    from .unitfile._building import OPTION_PATH

    taken, rows, jobs_list = [], [], []
    for tag, i in entries:
        fname = report.safe_name(tag, taken) + ".html"
        taken.append(fname[:-5])
        built = tag in unit.tags  # built without its refused options: those are stated in its report instead
        own = [p for p in problems if p.path.startswith(f"exchangers[{i}]")
               and not (built and OPTION_PATH.match(p.path))]
        desc = ""
        raw = (unit.raw.get("exchangers") or [])[i]
        if isinstance(raw, dict) and isinstance(raw.get("description"), str):
            desc = raw["description"]
        row = {"tag": tag, "description": desc, "file": None, "fname": fname, "status": NOT_RUN, "reason": "",
               "summary": {}}
        rows.append(row)
        if own:
            row.update(status="failed", reason=_one_line("; ".join(str(p) for p in own[:3])
                                                         + (f" (+{len(own) - 3} more)" if len(own) > 3 else "")))
            continue
        case = unit.exchanger(tag)
        extra = [case.plant_data.file] if getattr(case, "plant_data", None) else []
        extra += [case.curve_file] if getattr(case, "curve_file", None) is not None else []
        kind_nb = KIND_NOTEBOOKS.get(getattr(case, "kind", None))
        if kind_nb is not None:  # an air cooler, a condenser: a study notebook of its own
            nb_for = nb_path.with_name(kind_nb)
            nb_for = nb_for if nb_for.is_file() else notebook_path(kind_nb)
        else:
            nb_for = nb_path
        jobs_list.append({"tag": tag, "notebook": str(nb_for), "unit_file": str(unit_file),
                          "file": fname, "description": desc, "timeout": timeout, "units": units,
                          "extra_files": [str(e) for e in extra], "inputs": raw})
    return rows, jobs_list


def _execute_remote(executor, jobs_list: list, files: dict, stage: Path, on_result) -> None:
    """Run each job as a task of ``executor`` (a Dask cluster), its inputs sent along; ``on_result`` as for
    :func:`_execute`. A lost worker's task is run again by the scheduler; a task that fails fails its job only."""
    from .batch_remote import payload, receive, run_remote

    tasks = [payload(job, files) for job in jobs_list]
    with executor:
        for outcome in executor.run(run_remote, tasks):
            job = jobs_list[outcome.index]
            if outcome.ok:
                res = receive(outcome.value, job, stage)
            else:
                res = {"tag": job["tag"], "kind": job.get("kind"), "status": "failed", "staged": None, "summary": {},
                       "seconds": 0.0, "file": None, "reason": _one_line(outcome.error)}
            on_result(res)


def run_batch(unit_file, out_dir, jobs: int = 2, only=None, progress: bool = True, notebook=None,
              timeout: float = 900, units: str = "SI", cluster=None, executor=None) -> BatchResult:
    """Write one report per exchanger of ``unit_file`` into ``out_dir`` and an index.

    Parameters
    ----------
    unit_file : path
        The unit file (validated first: an exchanger with problems is recorded as failed with them, the others run;
        problems outside the exchangers stop the batch with :class:`~revamp.unitfile.UnitFileError`).
    out_dir : path
        Output folder, created if needed.
    jobs : int
        Notebooks run at the same time (worker processes); capped to the cores available (:func:`available_cores`),
        with a note in :attr:`BatchResult.notes`.
    only : list of str, optional
        Tags to run (others are left out of the index).
    cluster : str, optional
        Run the jobs on a Dask cluster instead of local worker processes: ``"local:N"`` (a ``LocalCluster`` of N
        workers) or a scheduler address (``"tcp://host:8786"``); each job carries its input files (no shared file
        system), its report comes back to be written here. ``jobs`` is then not used.
    executor : optional
        An executor of :mod:`revamp.executor` to use instead of ``cluster`` (a fleet run shares one).

    Raises
    ------
    BatchInterrupted
        On Ctrl-C or SIGTERM, once the workers and their kernels are stopped and the temporaries removed.
    """
    from .unitfile import UnitFileError, load_partial

    start, given_jobs = time.perf_counter(), jobs
    try:
        jobs = operator.index(jobs) if not isinstance(jobs, bool) else None
    except TypeError:
        jobs = None
    if jobs is None or jobs < 1:
        raise InputError("jobs", given_jobs, "an integer >= 1")
    notes, cores = [], available_cores()
    if jobs > cores:
        notes.append(f"--jobs {jobs} capped to {cores}: the cores available to this process (each worker runs a "
                     f"notebook kernel of its own; more workers than cores only add memory)")
        jobs = cores
    unit_file = Path(unit_file).resolve()
    unit, problems, entries = load_partial(unit_file)
    if unit is None:
        raise UnitFileError(unit_file, problems)
    if only:
        known = [tag for tag, _ in entries]
        unknown = [t for t in only if t not in known]
        if unknown:
            raise InputError("--only", ", ".join(unknown), f"tags of the unit file: {', '.join(known)}")
        entries = [(t, i) for t, i in entries if t in only]
    out = Path(out_dir).resolve()  # the kernels run in their own folder: every path they get is absolute
    out.mkdir(parents=True, exist_ok=True)
    report.copy_plotly_js(out)
    nb_path = Path(notebook) if notebook else notebook_path()
    rows, jobs_list = _plan(unit, problems, entries, nb_path, unit_file, timeout, units)
    if getattr(unit, "network", None) is not None and not only:  # the train page, beside the exchanger studies
        jobs_list.insert(0, {"kind": "train", "tag": "(train)", "unit_file": str(unit_file), "out": str(out)})
        if getattr(unit, "cleaning", None) is not None:  # and the cleaning plan of that train
            jobs_list.insert(0, {"kind": "cleaning", "tag": "(cleaning)", "unit_file": str(unit_file),
                                 "out": str(out)})
    remote = executor
    if remote is None and cluster is not None:
        from .executor import executor_for

        remote = executor_for(cluster)
    remote_files = None
    if remote is not None:
        from .batch_remote import unit_files

        remote_files = unit_files(unit, unit_file)
    params = {"jobs": jobs, "only": " ".join(only or []) or "all", "units": units}
    if remote is not None:
        params["cluster"] = cluster or getattr(remote, "address", remote.name)
    from tqdm.auto import tqdm

    bar = tqdm(total=len(jobs_list), desc="reports", unit="exchanger", disable=not progress)
    per = {}
    run = _Run(out, unit, rows, params, unit_file)  # makes the run's temporary folder: the try below removes it

    def on_result(res):
        with _no_interrupts():  # a report moved in and the index that lists it go together
            run.settle(res)
        per[res["tag"]] = res["seconds"]
        bar.update(1)

    try:
        with _sigterm_interrupts():
            if jobs_list:
                for job in jobs_list:
                    job["stage"] = str(run.stage)
                if remote is not None:
                    _execute_remote(remote, jobs_list, remote_files, run.stage, on_result)
                else:
                    _execute(jobs_list, min(jobs, len(jobs_list)), on_result, str(run.stage / "tmp"))
            with _no_interrupts():
                for row in rows:  # every job settled; anything still open was lost with its worker
                    if row["status"] == NOT_RUN:
                        row.update(status="failed", reason="no result came back from the worker")
                index = run.write_index()
                from .report.export import write_batch_workbook  # one workbook: a sheet per table of every report

                write_batch_workbook(out / "tables", out / "tables.xlsx",
                                     [Path(r["file"]).stem for r in rows if r.get("file")])
    except KeyboardInterrupt as exc:
        bar.close()
        with _no_interrupts(deliver=False):
            signum = getattr(exc, "signum", signal.SIGINT)
            for row in rows:
                if row["status"] == NOT_RUN:
                    row["reason"] = "the run was interrupted before this exchanger's study finished"
            index = run.write_index(run.interrupted_text(signum)) if run.index_written else None
            run.cleanup()
            done, total = run.counts()
        raise BatchInterrupted(signum, index, done, total) from None
    finally:
        bar.close()
        run.cleanup()
    return BatchResult(index_path=index.resolve(),
                       reports={r["tag"]: (out / r["file"]).resolve() for r in rows if r.get("file")},
                       failures={r["tag"]: r["reason"] for r in rows if r["status"] != "ok"},
                       seconds=time.perf_counter() - start, per_exchanger=per, notes=notes)
