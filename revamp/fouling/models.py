"""Fouling growth models fitted to plant data: linear, asymptotic, and the crude-oil threshold model.

Each model is fitted by least squares (scipy) to a series of fouling resistances ``Rf`` [m²K/W] against the run time
``t`` [s] (time since the last cleaning). A fit returns a :class:`FoulingFit`: parameters with their standard errors
(from the covariance of the least-squares estimate), the fit quality (R², RMSE) and Akaike's information criterion.
:func:`fit_best` fits every model and keeps the one with the lowest AIC (Akaike 1974); the AIC is the stated criterion
of choice because the models have different numbers of parameters and a plain R² always favours the bigger model.

Models
------
``linear``
    Rf = a + b·t. Constant deposition rate, no removal.
``asymptotic``
    Rf = Rf0 + Rf∞·(1 − exp(−t/τ)) (Kern & Seaton 1959), deposition minus a removal proportional to the deposit.
    ``Rf0`` is the resistance left after the last cleaning (set ``offset=False`` for the pure Kern-Seaton form).
``threshold``
    dRf/dt = α·Re^β·Pr^−0.33·exp(−E/(R·T_film)) − γ·τ_w (Ebert & Panchal 1995, 1997), crude-oil chemical-reaction
    fouling: deposition falls with velocity and rises with film temperature, removal grows with wall shear. It needs the
    flow conditions per row (tube-side Re, Pr, film temperature, wall shear), which the rating engine computes. β is
    fixed (−0.66 in Ebert & Panchal 1995; Panchal et al. 1999 used −0.88); α, E, γ and the initial Rf0 are fitted.
    α is reported at a reference film temperature (``alpha_ref``, the deposition rate coefficient at ``T_ref``), which
    keeps the fit well conditioned; ``alpha`` = alpha_ref·exp(E/(R·T_ref)) is also given.

References
----------
(Titles, books and pages recalled from memory except the journal references of Kern & Seaton and the AIC paper,
which are standard; check before quoting.)
Kern, D. Q., Seaton, R. E. (1959). A theoretical analysis of thermal surface fouling. Brit. Chem. Eng. 4, 258-262.
Ebert, W., Panchal, C. B. (1995/1997). Analysis of Exxon crude-oil-slip-stream coking data. In: Fouling Mitigation of
    Industrial Heat-Exchange Equipment, Begell House, 451-460.
Panchal, C. B., Kuru, W. C., Liao, C. F., Ebert, W. A., Palen, J. W. (1999). Threshold conditions for crude oil
    fouling. In: Understanding Heat Exchanger Fouling and its Mitigation, Begell House, 273-279.
Akaike, H. (1974). A new look at the statistical model identification. IEEE Trans. Autom. Control 19, 716-723.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError

__all__ = [
    "GAS_CONSTANT",
    "MODELS",
    "FoulingFit",
    "film_temperature",
    "fit_asymptotic",
    "fit_best",
    "fit_linear",
    "fit_threshold",
    "threshold_rate",
]

GAS_CONSTANT = 8.314462618  # J/mol/K (CODATA 2018)
_DAY = 86400.0
_RF_SCALE = 1e-4  # m²K/W: fits run on Rf/1e-4 and t in days, for conditioning


@dataclass(frozen=True)
class FoulingFit:
    """A fitted fouling growth model. Call it to project: ``fit(t)`` -> Rf [m²K/W] at run time ``t`` [s].

    Attributes
    ----------
    model : str
        ``"linear"``, ``"asymptotic"`` or ``"threshold"``.
    params, stderr : dict
        Parameter values and their standard errors, SI units (m²K/W, s, m²K/W/s, J/mol, m²K/W/s/Pa).
    r2 : float
        Coefficient of determination [-].
    rmse : float
        Root-mean-square residual [m²K/W].
    aic : float
        Akaike information criterion, n·ln(RSS/n) + 2k, k = fitted parameters + 1 (the noise variance) [-].
    n : int
        Number of points fitted.
    t_end : float
        Last run time in the data [s].
    conditions : dict
        Threshold model only: the flow conditions (Re, Pr, T_film [K], shear [Pa]) held for projection beyond the
        data (medians of the last tenth of the rows), and ``beta``, ``T_ref``.
    """

    model: str
    params: dict
    stderr: dict
    r2: float
    rmse: float
    aic: float
    n: int
    t_end: float
    conditions: dict = field(default_factory=dict)
    _curve: object = field(default=None, repr=False, compare=False)

    def __call__(self, t):
        """Projected fouling resistance [m²K/W] at run time ``t`` [s] (scalar or array)."""
        t = np.asarray(t, dtype=float)
        out = self._curve(t)
        return float(out) if out.ndim == 0 else out

    def rate(self, t):
        """Fouling rate dRf/dt [m²K/W/s] at run time ``t`` [s]."""
        t = np.asarray(t, dtype=float)
        p = self.params
        if self.model == "linear":
            out = np.full(t.shape, p["b"])
        elif self.model == "asymptotic":
            out = p["Rf_inf"] / p["tau"] * np.exp(-t / p["tau"])
        else:
            c = self.conditions
            out = np.full(t.shape, float(threshold_rate(c["Re"], c["Pr"], c["T_film"], c["shear"], p["alpha_ref"],
                                                        p["E"], p["gamma"], c["beta"], c["T_ref"])))
        return float(out) if out.ndim == 0 else out

    def describe(self) -> str:
        """One line: the model, its parameters with standard errors, and the fit quality."""
        parts = [f"{k} = {v:.4g} ± {self.stderr.get(k, np.nan):.2g}" for k, v in self.params.items()]
        return f"{self.model}: " + ", ".join(parts) + f"; R² = {self.r2:.3f}, RMSE = {self.rmse:.3g} m²K/W, " \
                                                      f"AIC = {self.aic:.1f}, n = {self.n}"


# ------------------------------------------------------------------------------------------------------ helpers
def _clean_inputs(t, rf, extra=None):
    t = np.asarray(t, dtype=float).ravel()
    rf = np.asarray(rf, dtype=float).ravel()
    if t.shape != rf.shape:
        raise InputError("rf", f"{rf.size} values", f"one value per time ({t.size} times)")
    ok = np.isfinite(t) & np.isfinite(rf)
    if extra is not None:
        for arr in extra:
            ok &= np.isfinite(arr)
    return t, rf, ok


def _stats(rf, pred, k):
    resid = rf - pred
    n = rf.size
    rss = float(np.sum(resid**2))
    tss = float(np.sum((rf - rf.mean()) ** 2))
    r2 = 1.0 - rss / tss if tss > 0 else np.nan
    rmse = float(np.sqrt(rss / n))
    aic = n * np.log(max(rss, 1e-300) / n) + 2 * (k + 1)
    return r2, rmse, float(aic)


def _stderr(pcov):
    with np.errstate(invalid="ignore"):
        return np.sqrt(np.clip(np.diag(pcov), 0, None)) if np.all(np.isfinite(pcov)) else np.full(len(pcov), np.nan)


def _need(n, k, model):
    if n < k + 2:
        raise InputError("rf", f"{n} usable points", f"at least {k + 2} finite points to fit the {model} model")


# --------------------------------------------------------------------------------------------------------- linear
def fit_linear(t, rf) -> FoulingFit:
    """Fit Rf = a + b·t by least squares.

    Parameters
    ----------
    t : array_like
        Run time since the last cleaning [s].
    rf : array_like
        Fouling resistance [m²K/W]. Non-finite points are ignored.

    Returns
    -------
    FoulingFit
        ``params`` a [m²K/W], b [m²K/W/s].

    Examples
    --------
    >>> day = 86400.0
    >>> f = fit_linear([0, 10 * day, 20 * day, 30 * day], [1e-4, 2e-4, 3e-4, 4e-4])
    >>> round(f.params["b"] * day, 8), round(f(40 * day), 6)
    (1e-05, 0.0005)
    """
    t, rf, ok = _clean_inputs(t, rf)
    t, rf = t[ok], rf[ok]
    _need(t.size, 2, "linear")
    x, y = t / _DAY, rf / _RF_SCALE
    M = np.column_stack([np.ones_like(x), x])  # ordinary least squares in closed form
    popt, *_ = np.linalg.lstsq(M, y, rcond=None)
    dof = max(x.size - 2, 1)
    pcov = np.linalg.inv(M.T @ M) * float(np.sum((y - M @ popt) ** 2)) / dof
    se = _stderr(pcov)
    a, b = float(popt[0] * _RF_SCALE), float(popt[1] * _RF_SCALE / _DAY)
    curve = lambda tt: a + b * tt
    r2, rmse, aic = _stats(rf, curve(t), 2)
    stderr = {"a": float(se[0] * _RF_SCALE), "b": float(se[1] * _RF_SCALE / _DAY)}
    return FoulingFit("linear", {"a": a, "b": b}, stderr,
                      r2, rmse, aic, int(t.size), float(t.max()), {}, curve)


# ----------------------------------------------------------------------------------------------------- asymptotic
def fit_asymptotic(t, rf, offset: bool = True) -> FoulingFit:
    """Fit the asymptotic model Rf = Rf0 + Rf∞·(1 − exp(−t/τ)) (Kern & Seaton 1959).

    Parameters
    ----------
    t : array_like
        Run time since the last cleaning [s].
    rf : array_like
        Fouling resistance [m²K/W].
    offset : bool
        Fit the initial resistance ``Rf0``; with ``False`` it is 0 (the original Kern-Seaton form).

    Returns
    -------
    FoulingFit
        ``params`` Rf0 [m²K/W] (if fitted), Rf_inf [m²K/W], tau [s]. The time constant is bounded to
        [1e-3, 1e4] × the data span; a τ at a bound means the data cannot tell the curve from a line.

    References
    ----------
    Kern, D. Q., Seaton, R. E. (1959). Brit. Chem. Eng. 4, 258-262.
    """
    t, rf, ok = _clean_inputs(t, rf)
    t, rf = t[ok], rf[ok]
    k = 3 if offset else 2
    _need(t.size, k, "asymptotic")
    x, y = t / _DAY, rf / _RF_SCALE
    span = max(float(x.max() - x.min()), 1e-6)

    def f(x, *p):
        if offset:
            r0, rinf, tau = p
        else:
            r0, (rinf, tau) = 0.0, p
        return r0 + rinf * (1.0 - np.exp(-x / tau))

    best = None
    for tau0 in (0.2 * span, span, 5 * span):  # a few starts: the fit is sensitive to the first guess of tau
        p0 = ([max(y[0], 0.0)] if offset else []) + [max(y.max() - min(y[0], 0), 1e-3), tau0]
        lo = ([-np.inf] if offset else []) + [-np.inf, 1e-3 * span]
        hi = ([np.inf] if offset else []) + [np.inf, 1e4 * span]
        try:
            from scipy import optimize  # imported on use: `revamp check` never fits
            popt, pcov = optimize.curve_fit(f, x, y, p0=p0, bounds=(lo, hi), maxfev=5000)
        except RuntimeError:
            continue
        rss = float(np.sum((y - f(x, *popt)) ** 2))
        if best is None or rss < best[0]:
            best = (rss, popt, pcov)
    if best is None:
        raise InputError("rf", "data", "a series the asymptotic model can be fitted to (the fit did not converge)")
    _, popt, pcov = best
    se = _stderr(pcov)
    names = (["Rf0"] if offset else []) + ["Rf_inf", "tau"]
    scale = ([_RF_SCALE] if offset else []) + [_RF_SCALE, _DAY]
    params = {n: float(v * s) for n, v, s in zip(names, popt, scale)}
    stderr = {n: float(v * s) for n, v, s in zip(names, se, scale)}
    r0, rinf, tau = params.get("Rf0", 0.0), params["Rf_inf"], params["tau"]
    curve = lambda tt: r0 + rinf * (1.0 - np.exp(-tt / tau))
    r2, rmse, aic = _stats(rf, curve(t), k)
    return FoulingFit("asymptotic", params, stderr, r2, rmse, aic, int(t.size), float(t.max()), {}, curve)


# ------------------------------------------------------------------------------------------------------ threshold
def film_temperature(t_bulk, t_wall):
    """Film temperature of the threshold model, T_film = T_b + 0.55·(T_w − T_b) [K].

    Parameters
    ----------
    t_bulk, t_wall : array_like
        Bulk and wall temperature [K].

    References
    ----------
    Ebert, W., Panchal, C. B. (1995), the 0.55 weighting (from memory; check against the paper).
    """
    t_bulk = np.asarray(t_bulk, dtype=float)
    return t_bulk + 0.55 * (np.asarray(t_wall, dtype=float) - t_bulk)


def threshold_rate(Re, Pr, T_film, shear, alpha_ref, E, gamma, beta=-0.66, T_ref=None):
    """Fouling rate of the threshold model, dRf/dt [m²K/W/s].

    dRf/dt = alpha_ref·Re^β·Pr^−0.33·exp(−E/R·(1/T_film − 1/T_ref)) − γ·τ_w

    Parameters
    ----------
    Re, Pr : array_like
        Tube-side Reynolds and Prandtl numbers [-].
    T_film : array_like
        Film temperature [K].
    shear : array_like
        Wall shear stress τ_w [Pa].
    alpha_ref : float
        Deposition coefficient at T_ref [m²K/W/s].
    E : float
        Activation energy [J/mol].
    gamma : float
        Removal coefficient [m²K/W/s/Pa].
    beta : float
        Reynolds exponent [-] (−0.66 Ebert & Panchal 1995; −0.88 Panchal et al. 1999).
    T_ref : float or None
        Reference film temperature [K]; None means no shift (then alpha_ref is the Arrhenius pre-factor α).

    References
    ----------
    Ebert, W., Panchal, C. B. (1995). Analysis of Exxon crude-oil-slip-stream coking data.
    """
    T_film = np.asarray(T_film, dtype=float)
    inv_ref = 0.0 if T_ref is None else 1.0 / T_ref
    dep = np.asarray(Re, dtype=float) ** beta * np.asarray(Pr, dtype=float) ** -0.33 \
        * np.exp(-E / GAS_CONSTANT * (1.0 / T_film - inv_ref))
    return alpha_ref * dep - gamma * np.asarray(shear, dtype=float)


def _cumtrapz(y, x):
    out = np.zeros_like(y)
    out[1:] = np.cumsum(0.5 * (y[1:] + y[:-1]) * np.diff(x))
    return out


def fit_threshold(t, rf, Re, Pr, T_film, shear, beta: float = -0.66, E: float | None = None) -> FoulingFit:
    """Fit the crude-oil threshold model (Ebert & Panchal form) to Rf measured under varying conditions.

    The model is integrated along the data: Rf(t) = Rf0 + ∫ dRf/dt dt (trapezoid rule over the rows, in time
    order; across gaps in the data the rate is interpolated linearly). For a given activation energy E the model is
    linear in (Rf0, alpha_ref, γ), so E is found by a bounded one-dimensional search with the other three solved
    by linear least squares at each step (variable projection), with alpha_ref >= 0 and γ >= 0 (a deposition and a
    removal term cannot change sign); the standard errors come from the Jacobian of all four parameters at the
    optimum (not meaningful for a coefficient that sits at its bound of 0). When the film temperature barely varies, E is not identifiable from the data:
    its standard error says so; pass ``E`` to fix it (e.g. from a published parameter set, Wilson et al. 2017).

    Parameters
    ----------
    t : array_like
        Run time since the last cleaning [s].
    rf : array_like
        Fouling resistance [m²K/W].
    Re, Pr : array_like
        Tube-side Reynolds and Prandtl numbers per row [-].
    T_film : array_like
        Film temperature per row [K] (see :func:`film_temperature`).
    shear : array_like
        Tube wall shear stress per row [Pa].
    beta : float
        Reynolds exponent, fixed [-].
    E : float or None
        Activation energy [J/mol]; None to fit it (searched in 10-300 kJ/mol).

    Returns
    -------
    FoulingFit
        ``params`` Rf0 [m²K/W], alpha_ref [m²K/W/s], E [J/mol], gamma [m²K/W/s/Pa], alpha [m²K/W/s] (derived);
        ``conditions`` Re, Pr, T_film, shear held for projection, beta, T_ref.

    References
    ----------
    Ebert, W., Panchal, C. B. (1995/1997); Panchal et al. (1999); Golub, G., Pereyra, V. (1973). The
    differentiation of pseudo-inverses and nonlinear least squares problems whose variables separate. SIAM J.
    Numer. Anal. 10, 413-432.
    """
    arrs = [np.asarray(a, dtype=float).ravel() for a in (Re, Pr, T_film, shear)]
    t, rf, ok = _clean_inputs(t, rf, arrs)
    k = 3 if E is not None else 4
    _need(int(ok.sum()), k, "threshold")
    order = np.argsort(t[ok], kind="stable")
    t, rf = t[ok][order], rf[ok][order]
    Re, Pr, T_film, shear = (a[ok][order] for a in arrs)
    T_ref = float(np.median(T_film))
    x = t / _DAY
    S = _cumtrapz(shear, x)  # ∫ τ dt, Pa·day

    def design(e):
        dep = Re**beta * Pr**-0.33 * np.exp(-e / GAS_CONSTANT * (1.0 / T_film - 1.0 / T_ref))
        D = _cumtrapz(dep, x)
        return np.column_stack([np.ones_like(x), D, -S])

    y = rf / _RF_SCALE

    def solve(e):
        # deposition and removal coefficients are physically >= 0: bounded linear least squares
        M = design(e)
        from scipy import optimize  # imported on use: `revamp check` never fits
        coef = optimize.lsq_linear(M, y, bounds=([-np.inf, 0.0, 0.0], [np.inf, np.inf, np.inf]), method="bvls").x
        return coef, float(np.sum((y - M @ coef) ** 2))

    if E is None:
        from scipy import optimize  # imported on use: `revamp check` never fits

        grid = np.arange(10.0, 301.0, 10.0)  # coarse grid first: the RSS in E can have more than one dip
        e0 = grid[int(np.argmin([solve(e * 1e3)[1] for e in grid]))]
        res = optimize.minimize_scalar(lambda e: solve(e * 1e3)[1], bounds=(max(e0 - 10, 10.0), min(e0 + 10, 300.0)),
                                       method="bounded", options={"xatol": 1e-3})
        E_fit = float(res.x) * 1e3
    else:
        E_fit = float(E)
    coef, rss = solve(E_fit)
    # Jacobian over (Rf0, alpha_ref, gamma[, E in kJ/mol]) for the covariance
    M = design(E_fit)
    J = M
    if E is None:
        h = 1e-3 * max(E_fit / 1e3, 1.0)
        dE = (design(E_fit + h * 1e3) @ coef - design(E_fit - h * 1e3) @ coef) / (2 * h)
        J = np.column_stack([M, dE])
    dof = max(y.size - J.shape[1], 1)
    try:
        cov = np.linalg.pinv(J.T @ J) * rss / dof
        se = np.sqrt(np.clip(np.diag(cov), 0, None))
    except np.linalg.LinAlgError:  # pragma: no cover
        se = np.full(J.shape[1], np.nan)
    rf0 = coef[0] * _RF_SCALE
    a_ref = coef[1] * _RF_SCALE / _DAY
    gam = coef[2] * _RF_SCALE / _DAY
    params = {"Rf0": float(rf0), "alpha_ref": float(a_ref), "E": E_fit, "gamma": float(gam),
              "alpha": float(a_ref * np.exp(E_fit / (GAS_CONSTANT * T_ref)))}
    stderr = {"Rf0": float(se[0] * _RF_SCALE), "alpha_ref": float(se[1] * _RF_SCALE / _DAY),
              "E": float(se[3] * 1e3) if E is None else 0.0, "gamma": float(se[2] * _RF_SCALE / _DAY)}
    # alpha's error from alpha_ref's alone (the correlation with E is not carried: compare alpha_ref, not alpha)
    stderr["alpha"] = float(stderr["alpha_ref"] * np.exp(E_fit / (GAS_CONSTANT * T_ref)))
    tail = slice(int(0.9 * t.size), None)
    cond = {"Re": float(np.median(Re[tail])), "Pr": float(np.median(Pr[tail])),
            "T_film": float(np.median(T_film[tail])), "shear": float(np.median(shear[tail])),
            "beta": float(beta), "T_ref": T_ref}
    fitted = (M @ coef) * _RF_SCALE
    rate_end = float(threshold_rate(cond["Re"], cond["Pr"], cond["T_film"], cond["shear"], a_ref, E_fit, gam,
                                    beta, T_ref))
    t_data, t_end, rf_end = t.copy(), float(t[-1]), float(fitted[-1])

    def curve(tt):
        inside = np.interp(tt, t_data, fitted)
        return np.where(tt > t_end, rf_end + rate_end * (tt - t_end), inside)

    r2, rmse, aic = _stats(rf, fitted, k)
    return FoulingFit("threshold", params, stderr, r2, rmse, aic, int(t.size), t_end, cond, curve)


MODELS = {"linear": fit_linear, "asymptotic": fit_asymptotic, "threshold": fit_threshold}


def fit_best(t, rf, conditions: dict | None = None, models=("linear", "asymptotic", "threshold")):
    """Fit each model and choose the one with the lowest AIC (Akaike 1974).

    Parameters
    ----------
    t : array_like
        Run time since the last cleaning [s].
    rf : array_like
        Fouling resistance [m²K/W].
    conditions : dict or None
        Per-row ``Re``, ``Pr``, ``T_film`` [K], ``shear`` [Pa] (and optionally ``beta``, ``E``) for the threshold
        model; without them the threshold model is skipped.
    models : sequence of str
        Names from :data:`MODELS`.

    Returns
    -------
    (best, fits) : (FoulingFit, dict)
        The chosen fit and every fit by name (a model that could not be fitted maps to its error message).
    """
    fits: dict = {}
    for name in models:
        if name not in MODELS:
            raise InputError("models", name, f"one of {sorted(MODELS)}")
        try:
            if name == "threshold":
                if conditions is None:
                    continue
                c = dict(conditions)
                fits[name] = fit_threshold(t, rf, c.pop("Re"), c.pop("Pr"), c.pop("T_film"), c.pop("shear"), **c)
            else:
                fits[name] = MODELS[name](t, rf)
        except InputError as exc:
            fits[name] = str(exc)
    ok = {k: v for k, v in fits.items() if isinstance(v, FoulingFit)}
    if not ok:
        raise InputError("rf", "data", "enough finite points to fit at least one fouling model")
    best = min(ok.values(), key=lambda f: f.aic)
    return best, fits
