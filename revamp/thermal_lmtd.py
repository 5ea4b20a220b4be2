"""The log-mean temperature difference and its F correction (1-2N shells, shells in series).

Moved verbatim from :mod:`revamp.thermal`, which re-exports every name here (the effectiveness-NTU side stays there).
Holds too the input checks both modules use (:func:`_arr`, :func:`_check_shells`). All functions broadcast over numpy
arrays; scalars in give floats out.

References
----------
.. [1] Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Mean temperature difference in design.
   Trans. ASME 62, 283-294.
.. [2] Kern, D. Q. (1950). Process Heat Transfer. McGraw-Hill, ch. 7 (1-2 exchanger, shells in series).
"""
from __future__ import annotations

import numpy as np

from ._arrays import as_out as _out
from .errors import InputError

__all__ = ["F_1_2N", "F_series", "lmtd", "lmtd_kernel"]


def _arr(x, field):
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, x, "a number or an array of numbers") from None
    if not np.all(np.isfinite(a)):
        raise InputError(field, x, "finite (no NaN or infinity)")
    return a


def _check_shells(shells):
    if isinstance(shells, bool) or not isinstance(shells, (int, np.integer)) or shells < 1:
        raise InputError("shells", shells, "a whole number of shells in series >= 1")
    return int(shells)


# ---------------------------------------------------------------------------------------------------------- LMTD
def lmtd(dt1, dt2):
    """Logarithmic mean of the two terminal temperature differences.

    LMTD = (dt1 - dt2) / ln(dt1/dt2), equal to dt1 when dt1 == dt2 (computed in a form that stays accurate near
    equality). For counterflow dt1 = Th,in - Tc,out and dt2 = Th,out - Tc,in.

    Parameters
    ----------
    dt1, dt2 : float or array_like
        Terminal temperature differences [K], both > 0.

    Returns
    -------
    float or numpy.ndarray
        Log-mean temperature difference [K].

    Raises
    ------
    InputError
        When a difference is zero or negative: the temperatures cross (or touch) at that end, there is no driving
        force and no finite area can do the duty.

    Examples
    --------
    >>> round(lmtd(20.0, 10.0), 4)   # 10 / ln 2
    14.427
    >>> lmtd(10.0, 10.0)
    10.0
    """
    a = _arr(dt1, "terminal temperature difference")
    b = _arr(dt2, "terminal temperature difference")
    bad = (a <= 0) | (b <= 0)
    if np.any(bad):
        shown = a if np.any(a <= 0) else b
        raise InputError("terminal temperature difference", shown,
                         "> 0 K at both ends: a zero or negative difference means the temperatures cross (or "
                         "touch), there is no driving force and no finite area meets the duty")
    hi, lo = np.maximum(a, b), np.minimum(a, b)  # symmetric by construction
    x = hi / lo - 1.0  # >= 0
    small = x < 1e-4
    xs = np.where(small, 1.0, x)
    general = lo * xs / np.log1p(xs)
    series = lo * (1.0 + x / 2.0 - x * x / 12.0)
    return _out(np.where(small, series, general))


def lmtd_kernel(dt1, dt2):
    """Log-mean of two terminal differences without input checks: 0 where one difference is 0 (the limit), NaN
    where one is negative (crossed temperatures). The rating loop's kernel; see :func:`lmtd`."""
    hi, lo = np.maximum(dt1, dt2), np.minimum(dt1, dt2)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = hi / lo - 1.0
        small = x < 1e-4
        xs = np.where(small, 1.0, x)
        general = lo * xs / np.log1p(xs)
        series = lo * (1.0 + x / 2.0 - x * x / 12.0)
        out = np.where(small, series, general)
    out = np.where(lo == 0.0, 0.0, out)
    return np.where(lo < 0.0, np.nan, out)


def rated_lmtd_f(eps, ntu, w, shell_min, c_shell, c_tube, dt_in, counterflow):
    """LMTD and F of a rated exchanger from its effectiveness, without input checks (the rating's kernel).

    The terminal differences come from ``1 - eps`` (``w``, the effectiveness relation's complement, and
    ``1 - eps·Cmin/Cmax`` at the Cmax stream's outlet), so there is no cancellation near eps = 1; F = (Q/UA)/LMTD
    = eps·dT_in/(NTU·LMTD), never above 1, and exactly 1 in counterflow (NaN where the LMTD is not finite).
    """
    cr = np.where(shell_min, c_shell / c_tube, c_tube / c_shell)
    far = (1.0 - cr) + cr * w  # 1 - eps Cmin/Cmax: the approach at the Cmax stream's outlet, per dT
    a_s = np.where(shell_min, w, far) * dt_in  # |t_out,shell - t_in,tube|
    b_t = np.where(shell_min, far, w) * dt_in  # |t_out,tube - t_in,shell|
    lm = lmtd_kernel(a_s, b_t)
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.minimum(eps * dt_in / ntu / lm, 1.0)  # (Q/UA)/LMTD
    if counterflow:
        f = np.where(np.isfinite(lm), 1.0, np.nan)
    return lm, f


# ------------------------------------------------------------------------------------------------------ F factor
def F_1_2N(R, P):
    """LMTD correction F of a 1-2N exchanger (one shell pass, even tube passes), Bowman, Mueller & Nagle (1940).

    The formula is exact for two tube passes and is used for 4, 6 and 8 passes as well: against the exact 1-4
    relation (`ht`'s TEMA E with four passes, 0.05 <= R <= 4) it is within 0.6 % where F >= 0.8, slightly high.

    F = S ln[(1 - P)/(1 - P R)] / ((R - 1) ln{[2 - P (R + 1 - S)] / [2 - P (R + 1 + S)]}), S = sqrt(R² + 1);
    at R = 1: F = [P sqrt(2)/(1 - P)] / ln{[2 - P (2 - sqrt 2)] / [2 - P (2 + sqrt 2)]}.

    Parameters
    ----------
    R : float or array_like
        Heat capacity rate ratio (T1,in - T1,out)/(t2,out - t2,in) [-], >= 0.
    P : float or array_like
        Thermal effectiveness of the stream with the R denominator, (t2,out - t2,in)/(T1,in - t2,in) [-].

    Returns
    -------
    float or numpy.ndarray
        F [-]; NaN where no 1-2N exchanger of any size reaches (R, P) (a logarithm argument <= 0). Detect with
        ``numpy.isnan``.

    References
    ----------
    Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Trans. ASME 62, 283-294.

    Examples
    --------
    >>> F_1_2N(0.0, 0.5)   # one stream isothermal: F = 1
    1.0
    """
    R = _arr(R, "R")
    P = _arr(P, "P")
    if np.any(R < 0):
        raise InputError("R", R, ">= 0")
    R, P = np.broadcast_arrays(R, P)
    with np.errstate(divide="ignore", invalid="ignore"):
        near1 = np.abs(R - 1.0) < 1e-6
        Rg = np.where(near1, 2.0, R)
        Sg = np.sqrt(Rg * Rg + 1.0)
        a1 = (1.0 - P) / (1.0 - P * Rg)
        a2 = (2.0 - P * (Rg + 1.0 - Sg)) / (2.0 - P * (Rg + 1.0 + Sg))
        ok = (P > 0) & (P < 1) & (P * Rg < 1) & (a1 > 0) & (a2 > 0) & (a2 != 1.0)
        general = Sg * np.log(np.where(ok, a1, 1.0)) / ((Rg - 1.0) * np.log(np.where(ok, a2, 2.0)))
        general = np.where(ok, general, np.nan)
        s2 = np.sqrt(2.0)
        b = (2.0 - P * (2.0 - s2)) / (2.0 - P * (2.0 + s2))
        ok1 = (P > 0) & (P < 1) & (b > 0) & (b != 1.0)
        one = (P * s2 / (1.0 - P)) / np.log(np.where(ok1, b, 2.0))
        one = np.where(ok1, one, np.nan)
    F = np.where(near1, one, general)
    F = np.where(P == 0, 1.0, F)  # no duty: the limit is 1
    F = np.where((F > 0) & (F <= 1.0 + 1e-9), np.minimum(F, 1.0), np.nan)  # above 1 only by round-off
    return _out(F)


def _p_per_shell(R, P, shells):
    """Per-shell P of N identical shells in series in overall counterflow (Bowman et al. 1940; Kern 1950)."""
    if shells == 1:
        return P
    with np.errstate(divide="ignore", invalid="ignore"):
        near1 = np.abs(R - 1.0) < 1e-9
        Rg = np.where(near1, 0.5, R)
        X = ((1.0 - P * Rg) / (1.0 - P)) ** (1.0 / shells)
        general = (X - 1.0) / (X - Rg)
        one = P / (shells - (shells - 1) * P)
    return np.where(near1, one, general)


def F_series(R, P, shells):
    """LMTD correction F of N identical 1-2N shells in series (overall counterflow).

    The overall P is turned into the P of one shell, P1 = (X - 1)/(X - R) with X = [(1 - P R)/(1 - P)]^(1/N)
    (R = 1: P1 = P/(N - (N - 1) P)), and F = F_1_2N(R, P1): the counterflow NTU and the actual NTU both scale by N.

    Parameters
    ----------
    R, P : float or array_like
        As in :func:`F_1_2N`, for the whole train [-].
    shells : int
        Number of shells in series, >= 1.

    Returns
    -------
    float or numpy.ndarray
        F [-]; NaN, element by element, where no train of that many shells reaches (R, P): P >= 1, P R >= 1, or a
        per-shell P beyond the 1-2N limit. The feasible elements of an array keep their values.

    References
    ----------
    Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Trans. ASME 62, 283-294; Kern (1950), ch. 7.
    """
    shells = _check_shells(shells)
    R = _arr(R, "R")
    P = _arr(P, "P")
    R, P = np.broadcast_arrays(R, P)
    with np.errstate(invalid="ignore"):
        bad = (P < 0) | (P >= 1) | (P * R >= 1)
        R_ok = np.where(bad, 1.0, R)  # a feasible stand-in for the infeasible elements (their F is NaN below)
        P1 = _p_per_shell(R_ok, np.where(bad, 0.5, P), shells)
    F = np.asarray(F_1_2N(R_ok, P1), dtype=float)  # NaN where one shell cannot reach its share
    return _out(np.where(bad, np.nan, F))
