"""Batch: the train page of a unit whose file has a ``network`` section (run beside the exchanger reports).

:func:`run_train_page` solves the network today and at the revamp conditions, rates every exchanger's options at train
level (each re-solving the whole train) with each one's throughput limit, and writes ``DIR/train.html``; it runs in a
batch worker process like the exchanger studies. :func:`index_section` is the index's link to it.
"""
from __future__ import annotations

import time
from pathlib import Path

from . import report

__all__ = ["TRAIN_FILE", "index_section", "page_failed", "page_section", "run_train_page"]

TRAIN_FILE = "train.html"
#: solve tolerance of the page [K]: screening-level (a thousandth of a kelvin on every exchanger inlet)
PAGE_TOL = 1e-3


def run_train_page(job: dict) -> dict:
    """Compute and write the train page. Runs in a worker process; never raises (a failure is returned)."""
    from .report.train import train_page
    from .train import compare_train
    from .unitfile import load_partial
    from .unitfile._network import AtDesignFouling, train_options

    start = time.perf_counter()
    out = Path(job["out"])
    try:
        unit, _, _ = load_partial(job["unit_file"])
        net = unit.network
        if net is None:
            raise ValueError("the network could not be built (see the problems of its exchangers)")
        options, eco = train_options(unit)
        # the one basis of every study in the unit: each option at the end of its run (its exchanger change applied,
        # the design fouling kept), as the exchanger reports judge it; a cleaning's worth over time is the cleaning
        # plan's page
        options = {k: {t: AtDesignFouling(o) for t, o in v.items()} for k, v in options.items()}
        points = int(job.get("points", 21))
        today = net.solve(tol=PAGE_TOL)
        study = compare_train(net, options, economics=eco, revamp=unit.network_throughput, throughput=True,
                              tol=PAGE_TOL, points=points)
        throughput = study.throughput["base"]  # today's train, no option
        prov = report.provenance(job["unit_file"], None, parameters={"page": "train", "tol": PAGE_TOL})
        prov["unit_file"] = job.get("source_unit_file") or prov.get("unit_file")  # as the user named it
        html = train_page(f"{unit.name} — preheat train", today, study, throughput, unit.network_throughput,
                          unit.economics.currency, prov)
        # into the run's temporary folder when there is one: the batch moves it in beside the index that links it
        staged = report.write_atomic(Path(job["stage"]) / TRAIN_FILE if job.get("stage") else out / TRAIN_FILE, html)
        base = study.table.loc["base"]
        summary = {"furnace_inlet": today.furnace_inlet, "furnace_duty": today.furnace_duty,
                   "furnace_duty_revamp": float(base["furnace_duty"]), "max_throughput": throughput.factor,
                   "binding": ", ".join(throughput.binding), "limits_revamp": base["limits"]}
        return {"status": "ok", "reason": "", "file": TRAIN_FILE, "summary": summary, "staged": str(staged),
                "seconds": time.perf_counter() - start}
    except Exception as exc:  # recorded in the index, never stops the batch
        return page_failed(exc, start)


def page_failed(exc: BaseException, start: float) -> dict:
    """The result of a unit page's job that failed (recorded in the index; never stops the batch)."""
    return {"status": "failed", "reason": f"{exc.__class__.__name__}: {exc}"[:300], "file": None, "summary": {},
            "seconds": time.perf_counter() - start}


def page_section(section_id: str, heading: str, file: str, link_text: str, result: dict | None, text) -> str:
    """The index's section on one of the unit's pages: a link and ``text(summary)``, or why the page failed (empty
    when the unit has no such page)."""
    if not result:
        return ""
    if result["status"] != "ok":
        return (f'<section id="{section_id}"><h2>{heading}</h2><p class="rv-status-failed">This page failed: '
                f"{report.esc(result['reason'])}</p></section>")
    return (f'<section id="{section_id}"><h2>{heading}</h2><p><a href="{file}">{link_text}</a>: '
            f"{text(result['summary'])}</p></section>")


def index_section(result: dict | None) -> str:
    """The index's section on the train (empty when the unit has no network)."""
    return page_section("train", "Preheat train", TRAIN_FILE, "The train as one network", result, _train_text)


def _train_text(s: dict) -> str:

    def c(t):
        return "n/a" if t is None else f"{t - 273.15:.1f} °C"

    def mw(w):
        return "n/a" if w is None else f"{w / 1e6:.2f} MW"

    tp = s.get("max_throughput")
    return (f"Furnace inlet today {c(s.get('furnace_inlet'))}, fired duty {mw(s.get('furnace_duty'))} "
            f"({mw(s.get('furnace_duty_revamp'))} at the revamp conditions; limits there: "
            f"{report.esc(s.get('limits_revamp', ''))}). Largest throughput today: "
            + (f"{tp:.3f}× ({report.esc(s.get('binding') or 'no limit reached in the search')})" if tp == tp else
               "none in the searched range") + ".")
