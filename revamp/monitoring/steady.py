"""Steady-state filter for plant data.

Rule (common practice, no single source; a formal statistical alternative is the R-test of Cao & Rhinehart 1995,
J. Process Control 5, 363-374, not used here): a row is steady when, over the trailing time window (t − ``window``, t]
(default 4 h), each flow's relative standard deviation (std/mean) is at most ``flow_rsd`` (default 2 %)
and each inlet temperature's range (max − min) is at most ``t_range`` (default 2 K), and the window holds at least
``min_rows`` valid readings. A trailing window is used because the outlets lag the inlets: a row is trusted when the
exchanger has seen steady inlets for a while before it. Only valid rows (no flag) enter the windows.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import require, to_si

__all__ = ["SteadyFilter", "steady_filter", "steady_state"]

_FLOWS = ("shell_flow", "tube_flow")
_INLETS = ("shell_t_in", "tube_t_in")


@dataclass(frozen=True)
class SteadyFilter:
    """The steady-state filter's settings, and how many rows each setting removed.

    A row can fail more than one setting: it is then counted under each, so the counts by setting may add up to more
    than ``removed``.

    Attributes
    ----------
    window : float
        Trailing window [s].
    flow_rsd : float
        Largest relative standard deviation of each flow in the window [-].
    t_range : float
        Largest range of each inlet temperature in the window [K].
    min_rows : int
        Fewest valid readings in the window.
    checked : int
        Rows that entered the filter (valid, with finite flows and inlets).
    steady : int
        Rows kept.
    removed : int
        Rows of ``checked`` not kept.
    removed_min_rows : int
        Rows whose window held fewer than ``min_rows`` readings.
    removed_flow_rsd : dict
        Flow column -> rows whose window broke ``flow_rsd`` on that flow.
    removed_t_range : dict
        Inlet column -> rows whose window broke ``t_range`` on that inlet.
    mask : numpy.ndarray of bool
        True where the row is steady (all rows of the frame).
    """

    window: float
    flow_rsd: float
    t_range: float
    min_rows: int
    checked: int
    steady: int
    removed: int
    removed_min_rows: int
    removed_flow_rsd: dict
    removed_t_range: dict
    mask: np.ndarray = field(repr=False, compare=False)


def steady_filter(frame: pd.DataFrame, valid=None, window="4 h", flow_rsd: float = 0.02, t_range: float = 2.0,
                  min_rows: int = 3) -> SteadyFilter:
    """Steady rows, and the rows each setting removed.

    Parameters
    ----------
    frame : pandas.DataFrame
        Canonical SI columns (``timestamp``, ``shell_flow``, ``tube_flow``, ``shell_t_in``, ``tube_t_in``) in time
        order.
    valid : array_like of bool or None
        Rows that may enter the windows (default: all rows with finite values).
    window : float or str
        Trailing window length [s, or a string such as ``"4 h"``].
    flow_rsd : float or str
        Largest relative standard deviation of each flow in the window [-, or e.g. ``"2 %"``].
    t_range : float or str
        Largest range of each inlet temperature in the window [K, or e.g. ``"3 delta_degC"``].
    min_rows : int
        Fewest valid rows in the window (>= 1).

    Returns
    -------
    SteadyFilter
    """
    seconds = float(require(to_si(window, "time", "steady.window"), "steady.window", gt=0))
    flow_rsd = float(require(to_si(flow_rsd, "dimensionless", "steady.flow_rsd"), "steady.flow_rsd", gt=0))
    t_range = float(require(to_si(t_range, "temperature_difference", "steady.t_range"), "steady.t_range", gt=0))
    if isinstance(min_rows, bool) or not isinstance(min_rows, (int, np.integer)) or min_rows < 1:
        raise InputError("steady.min_rows", min_rows, "a whole number >= 1")
    cols = list(_FLOWS + _INLETS)
    ok = np.ones(len(frame), dtype=bool) if valid is None else np.asarray(valid, dtype=bool).copy()
    ok &= frame["timestamp"].notna().to_numpy()
    for c in cols:
        ok &= np.isfinite(frame[c].to_numpy(dtype=float))
    steady = np.zeros(len(frame), dtype=bool)
    few = 0
    by_flow = {c: 0 for c in _FLOWS}
    by_inlet = {c: 0 for c in _INLETS}
    if ok.any():
        sub = frame.loc[ok, ["timestamp"] + cols].set_index("timestamp")
        roll = sub.rolling(pd.Timedelta(seconds=seconds), min_periods=1)
        count = roll["shell_flow"].count().to_numpy()
        good = count >= min_rows
        few = int((~good).sum())
        for c in _FLOWS:
            rsd = (roll[c].std() / roll[c].mean().abs()).to_numpy()
            # a single reading has no spread (std NaN): it fails only through min_rows
            fail = np.where(np.isfinite(rsd), rsd, np.where(count < 2, 0.0, np.inf)) > flow_rsd
            by_flow[c] = int(fail.sum())
            good &= ~fail
        for c in _INLETS:
            fail = (roll[c].max() - roll[c].min()).to_numpy() > t_range
            by_inlet[c] = int(fail.sum())
            good &= ~fail
        steady[np.flatnonzero(ok)] = good
    n_ok, n_st = int(ok.sum()), int(steady.sum())
    return SteadyFilter(window=seconds, flow_rsd=flow_rsd, t_range=t_range, min_rows=int(min_rows), checked=n_ok,
                        steady=n_st, removed=n_ok - n_st, removed_min_rows=few, removed_flow_rsd=by_flow,
                        removed_t_range=by_inlet, mask=steady)


def steady_state(frame: pd.DataFrame, valid=None, window="4 h", flow_rsd: float = 0.02, t_range: float = 2.0,
                 min_rows: int = 3) -> np.ndarray:
    """Boolean mask of steady rows: :func:`steady_filter` ``.mask`` (same parameters).

    Returns
    -------
    numpy.ndarray of bool
        True where the row is steady (always False for a row that is not valid).
    """
    return steady_filter(frame, valid, window, flow_rsd, t_range, min_rows).mask
