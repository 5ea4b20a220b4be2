"""Optimal cleaning interval of a fouling exchanger (Epstein 1979; Ma & Epstein 1981).

A cycle is a run of length ``t_c`` followed by a cleaning that takes ``t_d`` (downtime) and costs ``C``. While the
exchanger runs, fouling costs money at a rate ``c(t)`` [currency/s] (the value of the duty lost to fouling at run
time ``t``); during the downtime the exchanger is out of service, which costs ``c_d`` [currency/s] (e.g. the value of
the whole clean duty, or 0 with a spare). The mean cost rate over a cycle is

    J(t_c) = (∫₀^t_c c(t) dt + C + c_d·t_d) / (t_c + t_d)

and the best interval minimises it. At the optimum dJ/dt_c = 0, i.e. c(t_c) = J(t_c): the instantaneous loss rate
equals the cycle-average loss rate including the downtime (Ma & Epstein 1981). For linear fouling with a loss rate
proportional to run time, c(t) = k·t, the optimum has the closed form t_c = √(t_d² + 2(C + c_d·t_d)/k) − t_d.

References
----------
(Ma & Epstein's title and pages from memory; Epstein 1979 as cited in the project's methods list.)
Epstein, N. (1979). Optimum evaporator cycles with scale formation. Can. J. Chem. Eng. 57, 659-661.
Ma, R. S. T., Epstein, N. (1981). Optimum cycles for falling rate processes. Can. J. Chem. Eng. 59, 631-633.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import require

__all__ = ["CleaningInterval", "Cycle", "find_cleanings", "linear_closed_form", "optimal_cleaning_interval"]


@dataclass(frozen=True)
class CleaningInterval:
    """The optimal cleaning interval and its economics.

    Attributes
    ----------
    interval : float
        Optimal run length between cleanings [s]; ``t_max`` (with ``bounded``) if cleaning never pays sooner.
    cost_rate : float
        Mean cost rate over the optimal cycle J [currency/s].
    loss_rate_at_interval : float
        Instantaneous loss rate c(t_c) at the optimum [currency/s] (equals ``cost_rate`` at an interior optimum).
    cycle_cost : float
        Cost of one cycle: lost duty over the run + cleaning + downtime [currency].
    bounded : bool
        True when the optimum lies at ``t_max`` (cleaning does not pay within the horizon searched).
    """

    interval: float
    cost_rate: float
    loss_rate_at_interval: float
    cycle_cost: float
    bounded: bool


def linear_closed_form(k, cleaning_cost, downtime=0.0, downtime_cost_rate=0.0):
    """Optimal interval for a loss rate c(t) = k·t: t_c = √(t_d² + 2(C + c_d·t_d)/k) − t_d [s].

    Parameters
    ----------
    k : float
        Growth of the loss rate [currency/s²].
    cleaning_cost : float
        C, cost of one cleaning [currency].
    downtime : float
        t_d, time out of service per cleaning [s].
    downtime_cost_rate : float
        c_d, cost rate while out of service [currency/s].

    Examples
    --------
    >>> linear_closed_form(k=2.0, cleaning_cost=100.0)
    10.0
    """
    C = cleaning_cost + downtime_cost_rate * downtime
    return float(np.sqrt(downtime**2 + 2.0 * C / k) - downtime)


def optimal_cleaning_interval(loss_rate, cleaning_cost, downtime=0.0, downtime_cost_rate=0.0,
                              t_max=3 * 365 * 86400.0, points: int = 4001) -> CleaningInterval:
    """Minimise the mean cost rate of a fouling-cleaning cycle (numerically, for any loss-rate curve).

    Parameters
    ----------
    loss_rate : callable
        c(t): cost rate of fouling [currency/s] at run time ``t`` [s]; must accept a numpy array.
    cleaning_cost : float
        Cost of one cleaning [currency] (>= 0).
    downtime : float or str
        Time out of service per cleaning [s, or a string such as ``"3 day"``].
    downtime_cost_rate : float
        Cost rate while out of service [currency/s] (>= 0).
    t_max : float or str
        Longest run length searched [s].
    points : int
        Grid points on [0, t_max] before the local refinement.

    Returns
    -------
    CleaningInterval

    Notes
    -----
    J(t_c) is evaluated on a grid (trapezoid integral of c), its minimum bracketed between grid points and refined
    with a bounded scalar search (the integral over the last stretch by a fine trapezoid).

    References
    ----------
    Epstein (1979); Ma & Epstein (1981), see the module docstring.
    """
    from ..units import to_si

    downtime = require(to_si(downtime, "time", "downtime"), "downtime", ge=0)
    t_max = require(to_si(t_max, "time", "t_max"), "t_max", gt=0)
    require(cleaning_cost, "cleaning_cost", ge=0)
    require(downtime_cost_rate, "downtime_cost_rate", ge=0)
    if not callable(loss_rate):
        raise InputError("loss_rate", loss_rate, "a function of run time t [s] returning a cost rate")
    fixed = cleaning_cost + downtime_cost_rate * downtime
    t = np.linspace(0.0, t_max, points)
    c = np.asarray(loss_rate(t), dtype=float) * np.ones_like(t)
    if not np.all(np.isfinite(c)):
        raise InputError("loss_rate", "non-finite values", "finite cost rates on [0, t_max]")
    integral = np.concatenate([[0.0], np.cumsum(0.5 * (c[1:] + c[:-1]) * np.diff(t))])
    with np.errstate(divide="ignore", invalid="ignore"):
        J = (integral + fixed) / (t + downtime)
    J[~np.isfinite(J)] = np.inf
    i = int(np.argmin(J))
    if i == points - 1:
        tc = t_max
        lost = float(integral[-1])
    else:
        lo, hi = t[max(i - 1, 0)], t[min(i + 1, points - 1)]
        base = float(integral[max(i - 1, 0)])

        def lost_to(tc):  # integral of c from 0 to tc: the grid's up to lo, then a fine trapezoid from lo to tc
            s = np.linspace(lo, tc, 201)
            c_s = np.asarray(loss_rate(s), dtype=float) * np.ones_like(s)
            return base + float(np.sum(0.5 * (c_s[1:] + c_s[:-1]) * np.diff(s)))

        from scipy import optimize  # imported here: a heavy module that `revamp check` never needs

        tc = float(optimize.minimize_scalar(lambda tc: (lost_to(tc) + fixed) / (tc + downtime),
                                            bounds=(max(lo, 1e-9 * t_max), hi), method="bounded",
                                            options={"xatol": 1e-9 * t_max}).x)
        lost = lost_to(tc)
    cycle = lost + fixed
    return CleaningInterval(interval=float(tc), cost_rate=float(cycle / (tc + downtime)),
                            loss_rate_at_interval=float(np.asarray(loss_rate(np.asarray(tc)), dtype=float)),
                            cycle_cost=float(cycle), bounded=bool(i == points - 1))


# -------------------------------------------------------------------------------------- runs between cleanings
@dataclass(frozen=True)
class Cycle:
    """One run between cleanings found in plant data.

    Attributes
    ----------
    index : int
        0 for the first run in the data.
    start : pandas.Timestamp
        Time zero of the run: a cleaning (``source`` ``"detected"`` or ``"given"``) or the first valid row
        (``"data start"``).
    end : pandas.Timestamp
        Time of the run's last row.
    rows : int
        Rows of the run used in the fit.
    source : str
        ``"data start"``, ``"detected"`` (Rf fell back, see :func:`find_cleanings`) or ``"given"``.
    fit : FoulingFit or None
        The model chosen by AIC for this run (None when it could not be fitted; see ``note``).
    note : str
        Why there is no fit, or "".
    """

    index: int
    start: object
    end: object
    rows: int
    source: str
    fit: object = None
    note: str = ""


def find_cleanings(rf, window: int = 9, sigmas: float = 6.0) -> np.ndarray:
    """Rows where a cleaning starts a new run: the fouling resistance falls back, suddenly and for good.

    For each row i the median of the ``window`` rows before it is compared with the lowest of the ``window`` rows
    from it on (the lowest, not the median, so that a run that fouls fast from the start is not hidden); where that
    drop exceeds ``sigmas`` standard errors of a difference of two medians (noise from the scatter of successive
    rows, σ = 1.4826·MAD(ΔRf)/√2; the median of w rows has a standard error of about 1.2533·σ/√w), the largest drop
    among the rows near it is a candidate. The candidate is placed where two straight lines, one on each side
    (2·``window`` rows each), fit the rows best (least squares). It is kept when the step between the two lines there
    (each refitted without the points more than 3σ off it, so that one low reading makes no step) exceeds twice that
    threshold (the placement picks the most extreme split, so the bar is raised) and is at least half of what the run
    had built up (the line's level before the step minus the lowest smoothed Rf of the run so far; itself above twice
    the threshold). The rule is common practice (no single source): fouling resistance does not fall by half its
    build-up within hours except by a cleaning. A cleaning that takes off less than about 7σ is not seen: pass the
    dates instead.

    Parameters
    ----------
    rf : array_like
        Fouling resistance of the rows, in time order [m²K/W] (finite).
    window : int
        Rows on each side compared (>= 3).
    sigmas : float
        Standard errors a drop must exceed.

    Returns
    -------
    numpy.ndarray of int
        Indices of the first row of each new run (empty when the data hold one run).
    """
    rf = np.asarray(rf, dtype=float)
    w = int(window)
    if w < 3:
        raise InputError("window", window, "a number of rows >= 3")
    if rf.size < 2 * w + 1:
        return np.zeros(0, dtype=int)
    s = pd.Series(rf)
    before = s.rolling(w).median().shift(1).to_numpy()
    after = s[::-1].rolling(w).min()[::-1].to_numpy()  # the lowest of the next rows: a fast-growing next run
    drop = np.nan_to_num(before - after, nan=-np.inf)
    d1 = np.diff(rf)
    sigma = 1.4826 * float(np.median(np.abs(d1 - np.median(d1)))) / np.sqrt(2.0)
    threshold = sigmas * np.sqrt(2.0) * 1.2533 * sigma / np.sqrt(w)
    smooth = s.rolling(w, center=True, min_periods=1).median().to_numpy()
    cand = np.flatnonzero(drop > threshold)
    picks: list[int] = []
    start = 0
    i = 0
    while i < cand.size:
        j = i
        while j + 1 < cand.size and cand[j + 1] - cand[j] <= w:
            j += 1
        group = cand[i:j + 1]
        c = int(group[np.argmax(drop[group])])
        at, level, jump = _locate(rf, c, w, start, 3.0 * sigma if sigma > 0 else np.inf)
        low = smooth[start:max(at - w // 2, start + 1)].min()
        build = level - low
        if build > 2.0 * threshold and jump > 2.0 * threshold and jump >= 0.5 * build:
            picks.append(at)
            start = at
        i = j + 1
    return np.asarray(picks, dtype=int)


def _line(y, clip):
    """A straight line through y against 0, 1, ..., robust to single outliers: least squares, then again without the
    points more than ``clip`` off it. Returns (coefficients or None, cost = Σ min(r², clip²))."""
    if y.size < 3:
        return None, 0.0
    x = np.arange(y.size, dtype=float)
    coef = np.polyfit(x, y, 1)
    keep = np.abs(y - np.polyval(coef, x)) <= clip
    if 3 <= keep.sum() < y.size:
        coef = np.polyfit(x[keep], y[keep], 1)
    r = y - np.polyval(coef, x)
    return coef, float(np.sum(np.minimum(r * r, clip * clip)))


def _locate(rf, c, w, start, clip):
    """Where near row ``c`` the series splits best into two straight lines (least squares), the level of the line
    before at its last row, and the step down between the two lines there. Medians place a drop only to within
    their window, and understate it, while the deposit grows fast."""
    lo, hi = max(c - w, start + w), min(c + w, rf.size - w)  # at least a window of rows on each side
    if lo > hi:
        return c, 0.0, 0.0
    best, best_rss = c, np.inf
    for j in range(lo, hi + 1):
        total = _line(rf[max(j - 2 * w, start):j], np.inf)[1] + _line(rf[j:j + 2 * w], np.inf)[1]
        if total < best_rss:
            best, best_rss = j, total
    left, right = rf[max(best - 2 * w, start):best], rf[best:best + 2 * w]
    cl, cr = _line(left, clip)[0], _line(right, clip)[0]
    level = float(np.polyval(cl, left.size - 1)) if cl is not None else float(np.median(left))
    after = float(np.polyval(cr, -1.0)) if cr is not None else float(np.median(right))
    return best, level, level - after
