"""Steady-state filter for plant data.

Rule (common practice, no single source; a formal statistical alternative is the R-test of Cao & Rhinehart 1995,
J. Process Control 5, 363-374, not used here): a row is steady when, over the trailing time window (t − ``window``, t]
(default 4 h), each flow's relative standard deviation (std/mean) is at most ``flow_rsd`` (default 2 %)
and each inlet temperature's range (max − min) is at most ``t_range`` (default 2 K), and the window holds at least
``min_rows`` valid readings. A trailing window is used because the outlets lag the inlets: a row is trusted when the
exchanger has seen steady inlets for a while before it. Only valid rows (no flag) enter the windows.
"""
from __future__ import annotations

import numpy as np
import pandas as pd

from ..units import require, to_si

__all__ = ["steady_state"]


def steady_state(frame: pd.DataFrame, valid=None, window="4 h", flow_rsd: float = 0.02, t_range: float = 2.0,
                 min_rows: int = 3) -> np.ndarray:
    """Boolean mask of steady rows.

    Parameters
    ----------
    frame : pandas.DataFrame
        Canonical SI columns (``timestamp``, ``shell_flow``, ``tube_flow``, ``shell_t_in``, ``tube_t_in``) in time
        order.
    valid : array_like of bool or None
        Rows that may enter the windows (default: all rows with finite values).
    window : float or str
        Trailing window length [s, or a string such as ``"4 h"``].
    flow_rsd : float
        Largest relative standard deviation of each flow in the window [-].
    t_range : float
        Largest range of each inlet temperature in the window [K].
    min_rows : int
        Fewest valid rows in the window.

    Returns
    -------
    numpy.ndarray of bool
        True where the row is steady (always False for a row that is not valid).
    """
    seconds = require(to_si(window, "time", "window"), "window", gt=0)
    require(flow_rsd, "flow_rsd", gt=0)
    require(t_range, "t_range", gt=0)
    cols = ["shell_flow", "tube_flow", "shell_t_in", "tube_t_in"]
    ok = np.ones(len(frame), dtype=bool) if valid is None else np.asarray(valid, dtype=bool).copy()
    ok &= frame["timestamp"].notna().to_numpy()
    for c in cols:
        ok &= np.isfinite(frame[c].to_numpy(dtype=float))
    steady = np.zeros(len(frame), dtype=bool)
    if not ok.any():
        return steady
    sub = frame.loc[ok, ["timestamp"] + cols].set_index("timestamp")
    roll = sub.rolling(pd.Timedelta(seconds=float(seconds)), min_periods=1)
    count = roll["shell_flow"].count().to_numpy()
    good = count >= min_rows
    for c in ("shell_flow", "tube_flow"):
        rsd = (roll[c].std() / roll[c].mean().abs()).to_numpy()
        good &= np.nan_to_num(rsd, nan=np.inf) <= flow_rsd
    for c in ("shell_t_in", "tube_t_in"):
        rng = (roll[c].max() - roll[c].min()).to_numpy()
        good &= rng <= t_range
    steady[np.flatnonzero(ok)] = good
    return steady
