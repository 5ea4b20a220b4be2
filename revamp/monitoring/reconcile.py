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

__all__ = ["HeatBalance", "reconcile_heat_balance", "reconcile_linear", "side_duties"]


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
