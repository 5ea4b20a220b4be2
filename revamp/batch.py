"""Batch: one comparison report per exchanger of a unit file, and an index page.

:func:`run_batch` runs ``notebooks/exchanger_study.ipynb`` with papermill once per exchanger (in parallel worker
processes, with a progress bar), converts each executed notebook to HTML without its code cells, and writes
``DIR/<safe tag>.html``, ``DIR/index.html`` and ``DIR/plotly.min.js`` (the reports open offline). One exchanger's
failure (an invalid entry in the file, or an error while running its study) is recorded in the index with its reason
and never stops the others. Every file is written atomically.
"""
from __future__ import annotations

import json
import os
import shutil
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass, field
from multiprocessing import get_context
from pathlib import Path

from . import report
from .errors import InputError

__all__ = ["SUMMARY_FIELDS", "BatchResult", "notebook_path", "render_notebook", "run_batch"]


def notebook_path(name: str = "exchanger_study.ipynb") -> Path:
    """A notebook shipped with the package (``revamp/notebooks``; in a checkout a link to ``notebooks/``)."""
    path = Path(__file__).resolve().parent / "notebooks" / name
    if not path.is_file():
        raise InputError("notebook", str(path), "present: the notebooks ship inside the package (reinstall revamp)")
    return path


@dataclass
class BatchResult:
    """What a batch wrote: the index, each report by tag, the failures by tag with their reason, the timings [s]."""

    index_path: Path
    reports: dict = field(default_factory=dict)
    failures: dict = field(default_factory=dict)
    seconds: float = 0.0
    per_exchanger: dict = field(default_factory=dict)


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
    """Run the study notebook for one exchanger; write its report. Runs in a worker process."""
    import nbformat
    import papermill as pm

    start = time.perf_counter()
    if job.get("quiet_kernel", True):  # the kernels' start-up chatter would garble the progress bar
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, 2)
        os.close(devnull)
    tag, out = job["tag"], Path(job["out"])
    work = Path(tempfile.mkdtemp(prefix=".run-", dir=out))
    summary_path, executed = work / "summary.json", work / "executed.ipynb"
    status, reason = "ok", ""
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
    report_file = None
    try:
        if executed.is_file():
            nb = nbformat.read(executed, as_version=4)
            prov = report.provenance(job["unit_file"], tag, extra_files=job.get("extra_files", ()),
                                     parameters={"interactive": False, "units": job.get("units", "SI")},
                                     inputs=job.get("inputs"))
            title = f"{tag} — {job.get('description') or 'revamp study'}"
            body = render_notebook(nb)
            if status == "failed":
                body = (f'<p class="rv-status-failed">This study stopped with an error: {report.esc(reason)}</p>'
                        + body)
            report.write_atomic(out / job["file"], report.page(title, body, prov))
            report_file = job["file"]
    except Exception as exc:
        status, reason = "failed", reason or _one_line(f"report not written: {exc.__class__.__name__}: {exc}")
    finally:
        if (work / "tables").is_dir():  # the report's tables as CSV (the notebook wrote them), kept per exchanger
            shutil.rmtree(out / "tables" / Path(job["file"]).stem, ignore_errors=True)
            (out / "tables").mkdir(exist_ok=True)
            shutil.move(str(work / "tables"), str(out / "tables" / Path(job["file"]).stem))
        shutil.rmtree(work, ignore_errors=True)
    return {"tag": tag, "status": status, "reason": reason, "summary": summary, "file": report_file,
            "seconds": time.perf_counter() - start}


#: columns of the index table: (summary key, header, formatter)
SUMMARY_FIELDS = [
    ("duty_today", "duty today [kW]", lambda v: f"{v / 1e3:,.0f}"),
    ("duty_revamp", "duty at revamp [kW]", lambda v: f"{v / 1e3:,.0f}"),
    ("target", "target", str),
    ("meets_target", "meets target as is", lambda v: "yes" if v else "no"),
    ("screening_as_is", "limits as is", str),
    ("recommendation", "recommendation", str),
]


def _index_html(unit, rows: list[dict], prov: dict) -> str:
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
    failed = sum(r["status"] != "ok" for r in rows)
    intro = (f"<p>{len(rows)} exchanger(s), {len(rows) - failed} report(s) written, {failed} failed. "
             f"{report.esc(unit.description) if unit else ''}</p>")
    return report.page(f"{unit.name if unit else 'Unit'} — revamp study", intro + "".join(lines) + chart, prov)


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


def run_batch(unit_file, out_dir, jobs: int = 2, only=None, progress: bool = True, notebook=None,
              timeout: float = 900, units: str = "SI") -> BatchResult:
    """Write one report per exchanger of ``unit_file`` into ``out_dir`` and an index.

    Parameters
    ----------
    unit_file : path
        The unit file (validated first: an exchanger with problems is recorded as failed with them, the others run;
        problems outside the exchangers stop the batch with :class:`~revamp.unitfile.UnitFileError`).
    out_dir : path
        Output folder, created if needed.
    jobs : int
        Notebooks run at the same time (worker processes).
    only : list of str, optional
        Tags to run (others are left out of the index).
    """
    from .unitfile import UnitFileError, load_partial

    start = time.perf_counter()
    if int(jobs) < 1:
        raise InputError("jobs", jobs, "an integer >= 1")
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
    taken, rows, jobs_list = [], [], []
    for tag, i in entries:
        fname = report.safe_name(tag, taken) + ".html"
        taken.append(fname[:-5])
        own = [p for p in problems if p.path.startswith(f"exchangers[{i}]")]
        desc = ""
        raw = (unit.raw.get("exchangers") or [])[i]
        if isinstance(raw, dict) and isinstance(raw.get("description"), str):
            desc = raw["description"]
        row = {"tag": tag, "description": desc, "file": None, "status": "ok", "reason": "", "summary": {}}
        rows.append(row)
        if own:
            row.update(status="failed", reason=_one_line("; ".join(str(p) for p in own[:3])
                                                         + (f" (+{len(own) - 3} more)" if len(own) > 3 else "")))
            continue
        case = unit.exchanger(tag)
        extra = [case.plant_data.file] if case.plant_data else []
        jobs_list.append({"tag": tag, "out": str(out), "notebook": str(nb_path), "unit_file": str(unit_file),
                          "file": fname, "description": desc, "timeout": timeout, "units": units,
                          "extra_files": [str(e) for e in extra], "inputs": raw})
    by_tag = {r["tag"]: r for r in rows}
    from tqdm.auto import tqdm

    bar = tqdm(total=len(jobs_list), desc="reports", unit="exchanger", disable=not progress)
    results = []
    if jobs_list:  # always in worker processes: a worker silences its own stderr, never ours
        with ProcessPoolExecutor(max_workers=min(int(jobs), len(jobs_list)), mp_context=get_context("spawn")) as pool:
            futures = {pool.submit(_run_one, job): job for job in jobs_list}
            for fut in as_completed(futures):
                job = futures[fut]
                try:
                    results.append(fut.result())
                except Exception as exc:  # a worker that died: that exchanger fails, the others go on
                    results.append({"tag": job["tag"], "status": "failed", "file": None, "summary": {},
                                    "reason": _one_line(f"{exc.__class__.__name__}: {exc}"), "seconds": 0.0})
                bar.update(1)
    bar.close()
    per = {}
    for res in results:
        by_tag[res["tag"]].update({k: res[k] for k in ("status", "reason", "summary", "file")})
        per[res["tag"]] = res["seconds"]
    prov = report.provenance(unit_file, None, parameters={"jobs": jobs, "only": " ".join(only or []) or "all",
                                                          "units": units})
    index = report.write_atomic(out / "index.html", _index_html(unit, rows, prov))
    from .report.export import write_batch_workbook  # one workbook: a sheet per table of every report

    write_batch_workbook(out / "tables", out / "tables.xlsx", [Path(r["file"]).stem for r in rows if r.get("file")])
    return BatchResult(index_path=index.resolve(),
                       reports={r["tag"]: (out / r["file"]).resolve() for r in rows if r.get("file")},
                       failures={r["tag"]: r["reason"] for r in rows if r["status"] != "ok"},
                       seconds=time.perf_counter() - start, per_exchanger=per)
