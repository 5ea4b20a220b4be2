"""Heat balance and data reconciliation by weighted least squares.

Measurements x with variances V are adjusted to x̂ that satisfy the constraints A·x̂ = b while minimising
(x̂ − x)ᵀ V⁻¹ (x̂ − x). For linear constraints the answer is closed form (Kuehn & Davidson 1961; Narasimhan &
Jordache 2000, the linear steady-state chapter):

    x̂ = x − V Aᵀ (A V Aᵀ)⁻¹ (A x − b)

so that each measurement moves in proportion to its variance (and to its weight in the constraint).

The exchanger's energy balance, m_s·cp_s·(Ts_in − Ts_out) + m_t·cp_t·(Tt_in − Tt_out) = 0, is bilinear in flow and
temperature difference. It is reconciled by successive linearisation (Narasimhan & Jordache 2000, the nonlinear
steady-state chapter; Knepper & Gorman 1980): the constraint is linearised at the current estimate, the linear formula applied to the original
measurements, and the step repeated until the balance closes. The six measurements per row are the two flows and
four temperatures; cp of each side is held at its value at the measured mean temperature of that side (its change
over the small temperature adjustments is neglected). All rows are reconciled at once (arrays, no loops over rows).

References
----------
(Journal details recalled from memory, not re-read; the method is the textbook weighted least-squares projection.)
Kuehn, D. R., Davidson, H. (1961). Computer control II: mathematics of control. Chem. Eng. Prog. 57(6), 44-47.
Narasimhan, S., Jordache, C. (2000). Data Reconciliation and Gross Error Detection. Gulf Publishing, Houston.
Knepper, J. C., Gorman, J. W. (1980). Statistical analysis of constrained data sets. AIChE J. 26, 260-264.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["BalanceDrift", "HeatBalance", "balance_drift", "reconcile_heat_balance", "reconcile_linear", "side_duties"]


def reconcile_linear(x, variance, A, b=None):
    """Weighted least-squares reconciliation against linear constraints A·x̂ = b.

    Parameters
    ----------
    x : array_like, shape (..., n)
        Measurements (any units, each consistent with A and b).
    variance : array_like, shape (..., n) or (..., n, n)
        Variances (diagonal) or covariance matrices of the measurements.
    A : array_like, shape (m, n) or (..., m, n)
        Constraint matrix.
    b : array_like, shape (..., m) or None
        Constraint right-hand side (zeros by default).

    Returns
    -------
    numpy.ndarray, shape (..., n)
        Reconciled values x̂ = x − V Aᵀ (A V Aᵀ)⁻¹ (A x − b).

    Examples
    --------
    Two meters read the same flow, 100 and 110, with variances 1 and 4: the balance x1 − x2 = 0 moves the first by
    2 and the second by 8 (in proportion to the variances), both to 102.

    >>> reconcile_linear([100.0, 110.0], [1.0, 4.0], [[1.0, -1.0]])
    array([102., 102.])
    """
    x = np.asarray(x, dtype=float)
    V = np.asarray(variance, dtype=float)
    if V.ndim == x.ndim:  # diagonal
        V = V[..., :, None] * np.eye(x.shape[-1])
    A = np.asarray(A, dtype=float)
    r = np.einsum("...mn,...n->...m", A, x)
    if b is not None:
        r = r - np.asarray(b, dtype=float)
    VAt = V @ np.swapaxes(A, -1, -2)
    S = A @ VAt
    lam = np.linalg.solve(S, r[..., None])[..., 0]
    return x - np.einsum("...nm,...m->...n", VAt, lam)


def side_duties(x, cp_shell, cp_tube):
    """Heat released by each side [W]: (m_s·cp_s·(Ts_in − Ts_out), m_t·cp_t·(Tt_in − Tt_out)).

    ``x`` has the six measurements on its last axis: shell flow [kg/s], shell in, shell out [K], tube flow [kg/s],
    tube in, tube out [K]. The hot side's value is positive, the cold side's negative; a closed balance sums to 0.
    """
    x = np.asarray(x, dtype=float)
    return (x[..., 0] * cp_shell * (x[..., 1] - x[..., 2]), x[..., 3] * cp_tube * (x[..., 4] - x[..., 5]))


@dataclass(frozen=True)
class HeatBalance:
    """Heat balance of each row before and after reconciliation.

    Attributes
    ----------
    duty_shell, duty_tube : ndarray
        Duty from each side's measurements [W], positive (heat given up by the hot side, taken by the cold side).
    balance_error : ndarray
        (duty_hot − duty_cold) / mean of the two [-].
    duty : ndarray
        Reconciled duty [W] (both sides agree after reconciliation).
    x : ndarray, shape (..., 6)
        Reconciled measurements (shell flow, shell in, shell out, tube flow, tube in, tube out).
    residual : ndarray
        Relative closure left after the iterations [-] (|f| / duty).
    iterations : int
        Linearisation steps taken.
    """

    duty_shell: np.ndarray
    duty_tube: np.ndarray
    balance_error: np.ndarray
    duty: np.ndarray
    x: np.ndarray
    residual: np.ndarray
    iterations: int


def reconcile_heat_balance(x, sigma, cp_shell, cp_tube, tol: float = 1e-10, max_iter: int = 20,
                           start=None) -> HeatBalance:
    """Reconcile flows and temperatures of each row so that the shell-side and tube-side duties agree.

    Parameters
    ----------
    x : array_like, shape (..., 6)
        Measurements: shell flow [kg/s], shell inlet, shell outlet [K], tube flow [kg/s], tube inlet, tube outlet [K].
    sigma : array_like, shape (..., 6) or (6,)
        Standard deviations of the measurements, same units.
    cp_shell, cp_tube : array_like, shape (...)
        Heat capacity of each side [J/kg/K].
    tol : float
        Stop when the largest relative closure |f|/duty and the relative change of the multiplier are below this.
    max_iter : int
        Most linearisation steps.
    start : array_like, shape like x, or None
        First linearisation point (default the readings); a nearby solution saves steps (Monte Carlo draws).

    Returns
    -------
    HeatBalance

    References
    ----------
    Narasimhan & Jordache (2000), successive linearisation of bilinear balances.
    """
    x = np.asarray(x, dtype=float)
    V = np.broadcast_to(np.asarray(sigma, dtype=float) ** 2, x.shape)
    cps = np.asarray(cp_shell, dtype=float)
    cpt = np.asarray(cp_tube, dtype=float)
    qs, qt = side_duties(x, cps, cpt)
    shell_hot = qs > 0
    duty_shell, duty_tube = np.abs(qs), np.abs(qt)
    hot = np.where(shell_hot, duty_shell, duty_tube)
    cold = np.where(shell_hot, duty_tube, duty_shell)
    with np.errstate(divide="ignore", invalid="ignore"):
        err = (hot - cold) / (0.5 * (hot + cold))
    # one constraint per row: the closed form reduces to scalars; work on the six components separately
    xs = [x[..., j] for j in range(6)]
    vs = [V[..., j] for j in range(6)]
    h = list(xs) if start is None else [np.broadcast_to(np.asarray(start, dtype=float)[..., j], xs[j].shape)
                                        for j in range(6)]
    it = 0
    resid = np.zeros(x.shape[:-1])
    lam_old = np.zeros(x.shape[:-1])
    for it in range(1, max_iter + 1):
        a = [cps * (h[1] - h[2]), cps * h[0], -cps * h[0], cpt * (h[4] - h[5]), cpt * h[3], -cpt * h[3]]
        f = a[0] * h[0] + a[3] * h[3]  # m_s·cp_s·ΔT_s + m_t·cp_t·ΔT_t
        # linearised: f(h) + a·(x_new − h) = 0  ->  the closed form with one constraint, applied to the readings
        r = f
        s = 0.0
        for j in range(6):
            r = r + a[j] * (xs[j] - h[j])
            s = s + a[j] * a[j] * vs[j]
        with np.errstate(divide="ignore", invalid="ignore"):
            lam = r / s
            h = [xs[j] - vs[j] * a[j] * lam for j in range(6)]
            settled = np.abs(lam - lam_old) <= tol * np.abs(lam)
            qs_new = h[0] * cps * (h[1] - h[2])
            resid = np.abs(qs_new + h[3] * cpt * (h[4] - h[5])) / np.abs(qs_new)
        lam_old = lam
        # stop when the balance closes and the multiplier has settled (the linearisation point is then the optimum);
        # NaN rows do not hold the loop
        if not np.any(resid > tol) and not np.any(~settled & np.isfinite(lam)):
            break
    xh = np.stack(h, axis=-1)
    duty = np.abs(side_duties(xh, cps, cpt)[0])
    return HeatBalance(duty_shell=duty_shell, duty_tube=duty_tube, balance_error=err, duty=duty, x=xh,
                       residual=resid, iterations=it)


# ------------------------------------------------------------------------------------------------ drift of the closure
@dataclass(frozen=True)
class BalanceDrift:
    """A trend of the heat-balance closure over time: the mark of a drifting sensor.

    Attributes
    ----------
    detected : bool
        The closure moved by at least ``tolerance`` over the data span, and the trend stands out of the scatter
        (|t| >= 4 for the slope of a straight line through the closure).
    change : float
        Fitted change of the closure (Q_hot − Q_cold)/mean over the span [-]; negative: the cold side reads more
        duty as time goes on.
    t_stat : float
        The slope over its standard error (rows taken as independent, so it overstates the evidence for serially
        correlated data; the ``tolerance`` on the size is what guards against that).
    tolerance : float
        Smallest change flagged [-].
    span : float
        Time covered by the rows tested [s].
    rows : int
        Rows tested.
    side : str or None
        ``"shell"`` or ``"tube"``: the side whose temperatures are suspect, when the closure follows that side's
        m·cp·t pattern clearly better than the other's (the two sides' flows must vary differently for the data to
        tell); None otherwise.
    kelvin : float or None
        Change over the span of that side's measured temperature difference |T_in − T_out| that the trend implies
        [K]; positive: the side reads more duty as time goes on.
    evidence : float
        n·ln(RSS_other / RSS_best) of the two one-side drift fits (an AIC difference; >= 10 names the side).
    reason : str
        One sentence for the report.
    """

    detected: bool
    change: float
    t_stat: float
    tolerance: float
    span: float
    rows: int
    side: str | None = None
    kelvin: float | None = None
    evidence: float = 0.0
    reason: str = ""


def _line(x, y):
    """Least-squares y = a + b·x: (b, standard error of b, residual sum of squares)."""
    xc = x - x.mean()
    sxx = float(np.sum(xc * xc))
    if sxx <= 0:
        return 0.0, np.inf, float(np.sum((y - y.mean()) ** 2))
    b = float(np.sum(xc * (y - y.mean())) / sxx)
    rss = float(np.sum((y - y.mean() - b * xc) ** 2))
    se = np.sqrt(rss / max(x.size - 2, 1) / sxx)
    return b, se, rss


def balance_drift(t, duty_shell, duty_tube, shell_hot, c_shell, c_tube, tolerance: float = 0.02,
                  evidence: float = 10.0) -> BalanceDrift:
    """Test the heat-balance closure for a trend over time, and name the suspect side when the data allow.

    Fouling lowers the duty of both sides alike, so the closure of a sound set of instruments scatters about a
    constant; a drifting sensor makes it trend. A temperature on one side drifting by δ(t) changes that side's duty
    by C·δ(t) (C = m·cp of the side), so a linear drift δ = k·t adds ±C·k·t to Q_hot − Q_cold. Each side's pattern
    is fitted in turn; the side whose pattern fits clearly better (by ``evidence`` in n·ln(RSS ratio), an AIC
    difference; Burnham & Anderson 2002 read > 10 as no support for the other) is named. With flows that move
    together (or not at all) the two patterns are alike and no side is named. The rule is common practice in
    plant-data work, with no single source; a flow-meter drift (a pattern Q·t) is not told apart from a temperature
    drift on the same side.

    Parameters
    ----------
    t : array_like
        Time of each row [s].
    duty_shell, duty_tube : array_like
        Measured duty of each side, magnitudes [W].
    shell_hot : array_like of bool
        True where the shell side is the hot side.
    c_shell, c_tube : array_like
        m·cp of each side [W/K].
    tolerance : float
        Smallest change of the closure over the span that is flagged [-].
    evidence : float
        AIC difference needed to name a side.

    Returns
    -------
    BalanceDrift

    References
    ----------
    Burnham, K. P., Anderson, D. R. (2002). Model Selection and Multimodel Inference, 2nd ed. Springer.
    """
    t, qs, qt, c_s, c_t = (np.asarray(a, dtype=float) for a in (t, duty_shell, duty_tube, c_shell, c_tube))
    hot_s = np.asarray(shell_hot, dtype=bool)
    hot, cold = np.where(hot_s, qs, qt), np.where(hot_s, qt, qs)
    with np.errstate(divide="ignore", invalid="ignore"):
        err = (hot - cold) / (0.5 * (hot + cold))
    ok = np.isfinite(t) & np.isfinite(err) & np.isfinite(c_s) & np.isfinite(c_t)
    n = int(ok.sum())
    span = float(np.ptp(t[ok])) if n else 0.0
    if n < 10 or span <= 0:
        return BalanceDrift(False, 0.0, 0.0, tolerance, span, n, reason=f"not tested ({n} rows)")
    t, err, hot, cold, c_s, c_t, hot_s = (a[ok] for a in (t, err, hot, cold, c_s, c_t, hot_s))
    b, se, _ = _line(t, err)
    change, t_stat = b * span, (b / se if se > 0 else np.inf)
    days = span / 86400.0
    detected = abs(change) >= tolerance and abs(t_stat) >= 4.0
    head = f"heat-balance closure moved by {change:+.1%} over {days:.0f} days"
    if not detected:
        return BalanceDrift(False, change, t_stat, tolerance, span, n,
                            reason=f"{head} (flagged from {tolerance:.0%}): no drift flagged")
    r = hot - cold
    tt = t - t.min()
    fits = {}
    for side, c, sign in (("shell", c_s, np.where(hot_s, 1.0, -1.0)), ("tube", c_t, np.where(hot_s, -1.0, 1.0))):
        k, _, rss = _line(sign * c * tt, r)  # Q_hot − Q_cold = a + sign·C·k·t
        fits[side] = (k * span, max(rss, 1e-300))
    best = min(fits, key=lambda k: fits[k][1])
    other = "tube" if best == "shell" else "shell"
    ev = float(n * np.log(fits[other][1] / fits[best][1]))
    if ev >= evidence:
        kelvin = float(fits[best][0])
        return BalanceDrift(True, change, t_stat, tolerance, span, n, best, kelvin, ev,
                            f"{head}: a sensor drift is likely; the {best}-side temperatures are suspect (the "
                            f"closure follows that side's m·cp; its temperature difference drifted by "
                            f"{kelvin:+.2g} K). Fouling figures from these rows are biased; to lean on the "
                            f"{other} side, raise the uncertainty of {best}_t_in and {best}_t_out")
    return BalanceDrift(True, change, t_stat, tolerance, span, n, None, None, ev,
                        f"{head}: a sensor drift is likely, but the data cannot tell which side (the two flows do "
                        f"not vary differently enough); check both sides' thermocouples and flow meters. Fouling "
                        f"figures from these rows are biased")
