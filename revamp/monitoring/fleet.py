"""Plant data of many exchangers at once (a fleet), chunked into executor tasks.

:func:`monitor_many` runs :func:`revamp.monitor` for every exchanger given, grouping them into tasks of at least
``min_rows`` data rows each (Dask adds about a millisecond a task: a task should carry far more work than that), on
any executor of :mod:`revamp.executor` (in this process, a process pool, or a Dask cluster). What comes back is one
typed row per exchanger (:class:`FleetRow`): small, picklable and enough to rank a fleet; a failure is that
exchanger's row, never the whole fleet's.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import pandas as pd

from ..errors import InputError

__all__ = ["FleetRow", "monitor_many"]


@dataclass(frozen=True)
class FleetRow:
    """One exchanger of a fleet: how fouled it is and how fast it fouls (SI), or why there is no answer."""

    tag: str
    ok: bool
    rows: int = 0
    rows_used: int = 0
    rf_now: float = math.nan  # [m²K/W, outside area]
    rf_low: float = math.nan
    rf_high: float = math.nan
    rate: float = math.nan  # [m²K/W/s] at the last row
    model: str = ""
    duty_lost: float = math.nan  # [W] at the last used row
    drift: bool = False
    error: str = ""


def _row(tag, mon) -> FleetRow:
    tab = mon.table
    used = tab[tab["used"]]
    last = used.iloc[-1] if len(used) else None
    rate = math.nan
    if mon.trend is not None and last is not None:
        rate = float(mon.trend.rate(float(last["run_time"])))
    return FleetRow(tag=tag, ok=True, rows=int(len(tab)), rows_used=int(len(used)),
                    rf_now=float(last["Rf"]) if last is not None else math.nan,
                    rf_low=float(last["Rf_low"]) if last is not None else math.nan,
                    rf_high=float(last["Rf_high"]) if last is not None else math.nan,
                    rate=rate, model=mon.trend.model if mon.trend is not None else "",
                    duty_lost=float(last["duty_lost"]) if last is not None else math.nan,
                    drift=bool(getattr(mon.drift, "detected", False)))


def _task(chunk):
    """One executor task: monitor each exchanger of a chunk; a failure is that exchanger's row."""
    from .core import monitor

    out = []
    for tag, exchanger, service, data, kwargs in chunk:
        try:
            out.append(_row(tag, monitor(exchanger, service, data, **kwargs)))
        except Exception as exc:  # one exchanger's data never stops the fleet
            out.append(FleetRow(tag=tag, ok=False, error=" ".join(f"{exc.__class__.__name__}: {exc}".split())[:300]))
    return out


def _rows_of(data) -> int:
    if isinstance(data, pd.DataFrame):
        return len(data)
    return 1000  # a file: count it as a large task of its own


def monitor_many(cases, executor=None, min_rows: int = 20_000) -> pd.DataFrame:
    """Monitor many exchangers; one row per exchanger (a DataFrame of :class:`FleetRow` fields, indexed by tag).

    Parameters
    ----------
    cases : iterable of (tag, exchanger, service, data, kwargs)
        ``data`` a DataFrame or a CSV path (a path must be readable where the task runs), ``kwargs`` the other
        arguments of :func:`revamp.monitor` (e.g. ``mc_draws``, ``columns``).
    executor : optional
        From :func:`revamp.executor.executor_for`; default in this process.
    min_rows : int
        Exchangers are grouped into tasks of at least this many data rows.
    """
    from ..executor import InProcess

    cases = list(cases)
    tags = [c[0] for c in cases]
    if len(set(tags)) != len(tags):
        raise InputError("cases", "repeated tags", "one case per exchanger tag")
    chunks, current, size = [], [], 0
    for case in cases:
        current.append(case)
        size += _rows_of(case[3])
        if size >= min_rows:
            chunks.append(current)
            current, size = [], 0
    if current:
        chunks.append(current)
    rows = {}
    ex = executor if executor is not None else InProcess()
    with ex:
        for outcome in ex.run(_task, chunks):
            if outcome.ok:
                rows.update({r.tag: r for r in outcome.value})
            else:  # the task itself was lost for good: its exchangers say so
                rows.update({c[0]: FleetRow(tag=c[0], ok=False, error=outcome.error) for c in chunks[outcome.index]})
    frame = pd.DataFrame([rows[t].__dict__ for t in tags]).set_index("tag")
    return frame
