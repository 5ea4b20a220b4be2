"""A fleet: several units' batches in one run, on one executor, with an index of the units above theirs.

``revamp batch a.yaml b.yaml --out DIR [--cluster ADDRESS]`` writes each unit's reports and index into
``DIR/<unit>/`` and a fleet index ``DIR/index.html`` listing every unit with its counts. One unit that cannot be
read fails alone (its row says why); the others go on. All units share one executor (a cluster is started once).
"""
from __future__ import annotations

import contextlib
import time
from dataclasses import dataclass, field
from pathlib import Path

from . import report
from .errors import InputError

__all__ = ["FleetResult", "run_fleet"]


@dataclass(frozen=True)
class FleetResult:
    """Where the fleet index is, each unit's :class:`~revamp.batch.BatchResult` (None when the unit failed whole),
    and the units that failed whole with the reason."""

    index_path: Path
    units: dict = field(default_factory=dict)
    failures: dict = field(default_factory=dict)
    seconds: float = 0.0


def _fleet_index(rows: list, prov: dict) -> str:
    header = ["unit", "file", "exchangers", "reports", "failed", "status"]
    body = []
    for r in rows:
        name = report.esc(r["name"])
        link = f'<a href="{report.esc(r["folder"])}/index.html">{name}</a>' if r["ok"] else name
        cls = "rv-status-ok" if r["ok"] and not r["failed"] else "rv-status-failed"
        cells = [link, report.esc(r["file"]), str(r["exchangers"]), str(r["reports"]), str(r["failed"]),
                 f'<span class="{cls}">{report.esc(r["status"])}</span>']
        body.append("<tr>" + "".join(f"<td>{c}</td>" for c in cells) + "</tr>")
    table = ('<table class="rv-table"><thead><tr>' + "".join(f"<th>{report.esc(h)}</th>" for h in header)
             + "</tr></thead><tbody>" + "".join(body) + "</tbody></table>")
    n_ex = sum(r["exchangers"] for r in rows)
    intro = f"<p>{len(rows)} unit(s), {n_ex} exchanger(s); each unit's own index is linked from its name.</p>"
    return report.page("Fleet — revamp studies", intro + '<section id="units"><h2>Units</h2>' + table + "</section>",
                       prov)


def run_fleet(unit_files, out_dir, jobs: int = 2, only=None, progress: bool = True, units: str = "SI",
              cluster=None, timeout: float = 900) -> FleetResult:
    """Batch every unit file into ``out_dir/<unit>/`` and write the fleet index; see :func:`revamp.batch.run_batch`.

    Raises
    ------
    InputError
        On a bad ``cluster`` or ``jobs``, or no unit file (nothing is written).
    """
    from .batch import run_batch
    from .executor import executor_for
    from .unitfile import UnitFileError

    start = time.perf_counter()
    files = [Path(f) for f in unit_files]
    if not files:
        raise InputError("file", "(none)", "one or more unit files")
    executor = executor_for(cluster) if cluster else None
    out = Path(out_dir).resolve()
    out.mkdir(parents=True, exist_ok=True)
    report.copy_plotly_js(out)
    taken, rows, results, failures = [], [], {}, {}
    with executor if executor is not None else contextlib.nullcontext():
        for f in files:
            name = report.safe_name(f.stem, taken)
            taken.append(name)
            row = {"name": f.stem, "folder": name, "file": str(f), "exchangers": 0, "reports": 0, "failed": 0,
                   "ok": False, "status": ""}
            rows.append(row)
            try:
                res = run_batch(f, out / name, jobs=jobs, only=only, progress=progress, units=units,
                                executor=executor, timeout=timeout)
            except (UnitFileError, InputError, OSError) as exc:  # this unit fails whole; the fleet goes on
                reason = " ".join(str(exc).split())[:300]
                row.update(status=f"not run: {reason}")
                failures[f.stem] = reason
                results[f.stem] = None
                continue
            results[f.stem] = res
            row.update(ok=True, exchangers=len(res.reports) + len(res.failures), reports=len(res.reports),
                       failed=len(res.failures), status="ok" if not res.failures else "some exchangers failed")
    prov = report.provenance(None, None, parameters={"units": len(files), "cluster": cluster or "none",
                                                     "jobs": jobs})
    index = report.write_atomic(out / "index.html", _fleet_index(rows, prov))
    return FleetResult(index_path=index.resolve(), units=results, failures=failures,
                       seconds=time.perf_counter() - start)
