"""Batch: the cleaning page of a unit whose file has a ``cleaning`` section (run beside the exchanger reports).

:func:`run_cleaning_page` fits each scheduled exchanger's fouling law (from its plant data, or as the file gives it),
finds the plan with :func:`revamp.cleaning.schedule_cleaning` on the unit's train, and writes ``cleaning.html`` into
the run's temporary folder (the batch moves it in beside the index that links it). :func:`index_section` is the
index's link to it.
"""
from __future__ import annotations

import time
from pathlib import Path

from . import report
from .batch_train import page_failed, page_section

__all__ = ["CLEANING_FILE", "index_section", "run_cleaning_page"]

CLEANING_FILE = "cleaning.html"


def run_cleaning_page(job: dict) -> dict:
    """Compute and write the cleaning page. Runs in a worker process; never raises (a failure is returned)."""
    from .cleaning import schedule_cleaning
    from .report.cleaning import cleaning_page
    from .unitfile import load_partial
    from .unitfile._cleaning import cleaning_inputs

    start = time.perf_counter()
    out = Path(job["out"])
    try:
        unit, _, _ = load_partial(job["unit_file"])
        if unit is None or unit.network is None or unit.cleaning is None:
            raise ValueError("the network or the cleaning section could not be built (see the unit file's problems)")
        plan = schedule_cleaning(unit.network, **cleaning_inputs(unit))
        prov = report.provenance(job["unit_file"], None, parameters={"page": "cleaning"})
        prov["unit_file"] = job.get("source_unit_file") or prov.get("unit_file")  # as the user named it
        html = cleaning_page(plan, f"{unit.name} — when to clean which bundle", prov)
        staged = report.write_atomic(Path(job["stage"]) / CLEANING_FILE if job.get("stage") else out / CLEANING_FILE,
                                     html)
        best = plan.optimality.best_reference
        summary = {"cleanings": int(len(plan.cleanings)), "total": float(plan.cost["total"]),
                   "currency": plan.currency, "best_reference": best,
                   "saving": float(plan.optimality.saving_over_best_reference)}
        return {"status": "ok", "reason": "", "file": CLEANING_FILE, "summary": summary, "staged": str(staged),
                "seconds": time.perf_counter() - start}
    except Exception as exc:  # recorded in the index, never stops the batch
        return page_failed(exc, start)


def index_section(result: dict | None) -> str:
    """The index's section on the cleaning plan (empty when the unit has no cleaning section)."""
    return page_section("cleaning", "Cleaning plan", CLEANING_FILE, "When to clean which bundle", result,
                        _cleaning_text)


def _cleaning_text(s: dict) -> str:
    return (f"{s['cleanings']} cleaning(s) over the horizon, {s['total']:,.0f} {report.esc(s['currency'])} in fuel "
            f"and cleaning; {100 * s['saving']:.3g} % below the best reference policy "
            f"({report.esc(s['best_reference'])}).")
