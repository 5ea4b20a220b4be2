"""Batch jobs on a cluster: each job carries its inputs, and its report comes back as bytes.

A cluster's workers share no file system with the client. :func:`payload` packs a batch job with the files it reads
(the unit file, every plant-data file it names, the notebook) as bytes and their paths relative to the unit file's
folder; :func:`run_remote` (on a worker) lays them out in a temporary folder, runs the job there exactly as a local
worker would (:func:`revamp.batch._run_one`), and returns the report and its tables as bytes; :func:`receive` (on
the client) writes them into the run's temporary folder, from where the batch moves them in as for a local run.
"""
from __future__ import annotations

import io
import shutil
import tempfile
import zipfile
from pathlib import Path, PurePosixPath

from .errors import InputError

__all__ = ["payload", "run_remote", "receive", "unit_files"]

_NOTEBOOK = "__notebook__.ipynb"


def unit_files(unit, unit_file: Path) -> dict:
    """The files a job of this unit reads, by path relative to the unit file's folder: the unit file and every
    plant-data file (all of them: loading the unit checks each one)."""
    base = unit_file.parent
    files = {unit_file.name: unit_file}
    for case in unit.exchangers:
        if getattr(case, "curve_file", None) is not None:  # a condenser's condensing-curve table
            files[Path(case.curve_file).resolve().relative_to(base).as_posix()] = Path(case.curve_file).resolve()
        pd = getattr(case, "plant_data", None)
        if pd is None:
            continue
        path = Path(pd.file).resolve()
        try:
            rel = path.relative_to(base)
        except ValueError:
            raise InputError(f"exchangers[{case.tag!r}].plant_data.file", str(pd.file),
                             "a file in the unit file's folder or below it, to be sent to a cluster's workers "
                             "(they share no file system with this machine)") from None
        files[rel.as_posix()] = path
    return files


def payload(job: dict, files: dict) -> dict:
    """A job with its input files as bytes (``files``: relative path -> local path)."""
    data = {rel: Path(p).read_bytes() for rel, p in files.items()}
    unit_rel = Path(job["unit_file"]).name
    if job.get("notebook"):
        data[_NOTEBOOK] = Path(job["notebook"]).read_bytes()
    return {"job": dict(job), "files": data, "unit_rel": unit_rel}


def _safe(root: Path, rel: str) -> Path:
    parts = PurePosixPath(rel).parts
    if not parts or any(p in ("..", "") for p in parts) or PurePosixPath(rel).is_absolute():
        raise ValueError(f"refused file path in a task: {rel!r}")
    return root.joinpath(*parts)


def run_remote(task: dict) -> dict:
    """Run one batch job on a worker from its payload; the report and tables come back as bytes."""
    from .batch import _run_one

    root = Path(tempfile.mkdtemp(prefix="revamp-task-"))
    try:
        for rel, data in task["files"].items():
            path = _safe(root, rel)
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_bytes(data)
        job = dict(task["job"])
        job["source_unit_file"] = job["unit_file"]
        job["unit_file"] = str(root / task["unit_rel"])
        if job.get("notebook"):
            job["notebook"] = str(root / _NOTEBOOK)
        stage = root / "stage"
        stage.mkdir()
        job.update(stage=str(stage), out=str(root / "out"), quiet_kernel=False)
        (root / "out").mkdir()
        res = _run_one(job)
        out = {k: v for k, v in res.items() if k not in ("staged", "staged_tables")}
        if res.get("staged"):
            out["report_bytes"] = Path(res["staged"]).read_bytes()
        if res.get("staged_tables"):
            buf = io.BytesIO()
            with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
                for f in sorted(Path(res["staged_tables"]).rglob("*")):
                    if f.is_file():
                        z.write(f, f.relative_to(res["staged_tables"]).as_posix())
            out["tables_zip"] = buf.getvalue()
        return out
    finally:
        shutil.rmtree(root, ignore_errors=True)


def receive(res: dict, job: dict, stage: Path) -> dict:
    """Write what a worker sent back into the run's temporary folder; the result as a local worker gives it."""
    res = dict(res)
    name = job.get("file") or {"train": "train.html", "cleaning": "cleaning.html"}.get(job.get("kind"), "page.html")
    data = res.pop("report_bytes", None)
    if data is not None:
        target = stage / name
        target.write_bytes(data)
        res["staged"] = str(target)
    tables = res.pop("tables_zip", None)
    if tables is not None:
        folder = stage / f"tables-{Path(name).stem}"
        shutil.rmtree(folder, ignore_errors=True)
        folder.mkdir(parents=True)
        with zipfile.ZipFile(io.BytesIO(tables)) as z:
            for member in z.namelist():
                _safe(folder, member)  # refuse a path that would leave the folder
            z.extractall(folder)
        res["staged_tables"] = str(folder)
    return res
