"""The vectorized pieces behind :func:`revamp.monitoring.monitor`: measurement uncertainties, U from the reconciled
duty by effectiveness-NTU, batched ratings of many cases, the Monte Carlo band (streamed in blocks of rows, with the
linearized clean U of the draws), percentiles, the duty-vs-fouling curve and the summary. No I/O.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import require, to_si
from .data import COLUMNS
from .reconcile import reconcile_heat_balance

DEFAULT_UNCERTAINTY = {"flow": 0.02, "temperature": 0.5}
_X = list(COLUMNS[1:])  # shell_flow, shell_t_in, shell_t_out, tube_flow, tube_t_in, tube_t_out

def sigmas(uncertainty, x):
    """Standard deviations per row and measurement, shape like x (n, 6)."""
    spec = dict(DEFAULT_UNCERTAINTY)
    for key, val in (uncertainty or {}).items():
        if key not in ("flow", "temperature", *_X):
            raise InputError(f"uncertainty.{key}", key, f"'flow', 'temperature' or one of {_X}")
        spec[key] = val
    sig = np.empty_like(x)
    for j, col in enumerate(_X):
        is_flow = col.endswith("flow")
        val = spec.get(col, spec["flow" if is_flow else "temperature"])
        if is_flow:
            v = require(to_si(val, "dimensionless", f"uncertainty.{col}"), f"uncertainty.{col}", gt=0,
                        what="a relative standard deviation")
            sig[:, j] = v * np.abs(x[:, j])
        else:
            v = require(to_si(val, "temperature_difference", f"uncertainty.{col}"), f"uncertainty.{col}", gt=0,
                        what="a standard deviation [K]")
            sig[:, j] = v
    return sig


def u_actual(xr, duty, cp_s, cp_t, area, arrangement, shells):
    """U [W/m²K, outside area] and effectiveness from reconciled measurements (arrays of any shape)."""
    from .. import thermal

    C_s, C_t = xr[..., 0] * cp_s, xr[..., 3] * cp_t
    c_min, c_max = np.minimum(C_s, C_t), np.maximum(C_s, C_t)
    with np.errstate(divide="ignore", invalid="ignore"):
        cr = np.clip(c_min / c_max, 0.0, 1.0)
        eps = duty / (c_min * np.abs(xr[..., 1] - xr[..., 4]))
    ok = np.isfinite(eps) & np.isfinite(cr) & (eps > 0) & (eps < 1)
    ntu = np.full(eps.shape, np.nan)
    if ok.any():
        e_max = np.asarray(thermal.max_effectiveness(cr[ok], arrangement, shells))
        inside = eps[ok] < e_max
        vals = np.asarray(thermal.ntu_from_effectiveness(np.where(inside, eps[ok], 0.5 * e_max), cr[ok],
                                                         arrangement, shells), dtype=float)
        ntu[ok] = np.where(inside, vals, np.nan)
    return ntu * c_min / area, eps


def rate_clean(exchanger, service, xr, chunk, rf=None, side="tube"):
    """One rating of every case in xr (..., 6), in chunks of at most ``chunk`` cases.

    ``rf`` (shape xr.shape[:-1], outside basis [m²K/W], clipped at 0) puts that fouling on ``side``; None rates clean.
    The rating's ``U_clean`` is then the clean-surface U at that (fouled) operating state. Cases with unusable
    measurements, and cases the rating returns as NaN (a stream leaving its single-phase range), stay NaN.
    """
    from ..rating import rate
    from ..service import Service, Stream

    flat = xr.reshape(-1, 6)
    rf_flat = np.zeros(flat.shape[0]) if rf is None else np.clip(np.nan_to_num(np.asarray(rf, dtype=float).ravel()),
                                                                   0.0, None)
    ratio = exchanger.tube_id / exchanger.tube_od  # a tube-side resistance on its own surface = outside value · di/do
    keys = ("U_clean", "duty", "effectiveness", "Re_tube", "Pr_tube", "t_wall_tube", "shear_tube")
    out = {k: np.full(flat.shape[0], np.nan) for k in keys}
    warnings: list = []
    good = np.all(np.isfinite(flat), axis=1) & (flat[:, 0] > 0) & (flat[:, 3] > 0) & (flat[:, 1] != flat[:, 4])
    idx = np.flatnonzero(good)
    # the cases are arrays, so the rating never raises for one bad case: it returns NaN with a warning
    for start in range(0, idx.size, chunk):
        sel = idx[start:start + chunk]
        svc = Service(shell=Stream(service.shell.fluid, flat[sel, 0], flat[sel, 1]),
                      tube=Stream(service.tube.fluid, flat[sel, 3], flat[sel, 4]),
                      fouling_shell=rf_flat[sel] if side == "shell" else 0.0,
                      fouling_tube=rf_flat[sel] * ratio if side == "tube" else 0.0)
        r = rate(exchanger, svc)
        for k in keys:
            out[k][sel] = np.asarray(getattr(r, k), dtype=float).ravel()
        warnings.extend(r.warnings)
    return {k: v.reshape(xr.shape[:-1]) for k, v in out.items()}, list(dict.fromkeys(warnings))


_GRAD_COLS = (0, 1, 3, 4)  # the rating inputs among the six measurements: shell flow and inlet, tube flow and inlet


def clean_gradient(exchanger, service, x0, u0, rf0, side, chunk=None):
    """Sensitivities dU_clean/dx [W/m²K per unit of x] of the clean U at the reconciled rows, shape (4, rows).

    One stacked rating of the rows with each of the four rating inputs (shell flow, shell inlet, tube flow, tube
    inlet) nudged in turn (0.1 % of a flow, 0.05 K), by forward differences, rated ``chunk`` cases at a time
    (default: all 4 × rows at once). A draw's clean U is then U0 + Σ dU/dx_j·(x_j − x0_j) (:func:`apply_gradient`):
    for measurement errors of a few per cent the neglected second-order term is below 1e-4 of U
    (h ∝ m^0.8: ½·0.8·0.2·0.02² = 3e-5).
    """
    steps = np.array([1e-3 * x0[:, 0], np.full(len(x0), 0.05), 1e-3 * x0[:, 3], np.full(len(x0), 0.05)])
    stack = np.repeat(x0[None], 4, axis=0)
    for k, j in enumerate(_GRAD_COLS):
        stack[k, :, j] += steps[k]
    size = chunk if chunk else stack.shape[0] * stack.shape[1]
    u_p = rate_clean(exchanger, service, stack, max(int(size), 1), np.repeat(rf0[None], 4, axis=0), side)[0]["U_clean"]
    return (u_p - u0[None]) / steps


def apply_gradient(u0, grad, x0, xd):
    """Clean U of draws ``xd`` (..., rows, 6) to first order: U0 + Σ dU/dx_j·(x_j − x0_j)."""
    out = np.broadcast_to(u0, xd.shape[:-1]).copy()
    for k, j in enumerate(_GRAD_COLS):
        out += grad[k] * (xd[..., j] - x0[:, j])
    return out



#: Most Monte Carlo cases (draws × rows) held in memory at once by :func:`mc_band`. A case costs about 0.3 kB at
#: the peak of a block (the drawn and reconciled measurements, the reconciliation's work arrays, U and Rf of the
#: draws, the sort for the percentiles), so a block stays near 10 MB whatever the number of rows; blocks this small
#: also run faster than one large array (they stay in cache, and a block's reconciliation stops when its own rows
#: have closed).
MC_BLOCK_CASES = 25_000


@dataclass(frozen=True)
class Band:
    """Percentile band of the Monte Carlo draws, one value per row given to :func:`mc_band`.

    Attributes
    ----------
    rf_low, rf_high : ndarray
        Fouling resistance at the lower and upper percentile [m²K/W, outside area].
    u_low, u_high : ndarray
        Measured U at the lower and upper percentile [W/m²K, outside area].
    blocks : int
        Blocks of rows the draws were streamed in.
    """

    rf_low: np.ndarray
    rf_high: np.ndarray
    u_low: np.ndarray
    u_high: np.ndarray
    blocks: int


def mc_band(exchanger, service, x, sig, cp_s, cp_t, x_rec, u_clean, rf_rated, *, draws, band, seed, area,
            arrangement, shells, mc_clean="linear", chunk=100_000, side="tube", block_cases=None) -> Band:
    """Monte Carlo band of U and Rf per row, streamed in blocks of rows so that memory does not grow with rows.

    Each row gets ``draws`` copies of its measurements with Gaussian errors (standard deviations ``sig``); the
    copies go through the heat-balance reconciliation, the effectiveness-NTU inversion and the clean U (first
    order from :func:`clean_gradient`, or every copy rated for ``mc_clean="full"``), and only the percentiles of
    each row are kept. Rows are taken in blocks of at most ``block_cases`` draws × rows (default
    :data:`MC_BLOCK_CASES`); the draws are made row after row from one generator, so the band is the same, to the
    last bit, whatever the block size.

    Parameters
    ----------
    x, sig : ndarray, shape (rows, 6)
        Measurements and their standard deviations (SI: kg/s, K).
    cp_s, cp_t : ndarray, shape (rows,)
        Heat capacity of each side [J/kg/K].
    x_rec, u_clean, rf_rated : ndarray
        Reconciled measurements (rows, 6), clean U [W/m²K] and the fouling it was rated at [m²K/W] of each row.
    draws : int
        Draws per row.
    band : (float, float)
        Percentiles [%].
    seed : int
        Seed of the generator.
    area : float
        Outside area [m²].
    arrangement, shells
        As :func:`revamp.rating.arrangement` gives them.
    mc_clean : {"linear", "full"}
    chunk : int
        Largest number of cases per rating call.
    side : {"tube", "shell"}
        Side the fouling ``rf_rated`` is put on when rating.
    block_cases : int or None
        Most draws × rows held at once.

    Returns
    -------
    Band

    References
    ----------
    Narasimhan, S., Jordache, C. (2000). Data Reconciliation and Gross Error Detection. Gulf Publishing (the
    reconciliation each draw goes through).
    """
    n, draws = x.shape[0], int(draws)
    per = max(1, int(block_cases or MC_BLOCK_CASES) // max(draws, 1))  # rows per block
    chunk = max(int(chunk), 1)
    rng = np.random.default_rng(seed)
    out = [np.full(n, np.nan) for _ in range(4)]
    grad = clean_gradient(exchanger, service, x_rec, u_clean, rf_rated, side, chunk) if mc_clean == "linear" else None
    blocks = 0
    for start in range(0, n, per):
        s = slice(start, min(start + per, n))
        # (rows, draws, 6) row after row from one generator: the stream does not depend on the block size
        z = np.swapaxes(rng.standard_normal((s.stop - s.start, draws, 6)), 0, 1)
        xs = x[s][None] + z * sig[s][None]
        del z
        # closure to 1e-7 of the duty is ample for a band; start from the reconciled rows (fewer steps)
        hb = reconcile_heat_balance(xs, sig[s][None], cp_s[s], cp_t[s], tol=1e-7, start=x_rec[s][None])
        del xs
        u_d, _ = u_actual(hb.x, hb.duty, cp_s[s], cp_t[s], area, arrangement, shells)
        if grad is None:
            rf0 = np.broadcast_to(rf_rated[s], hb.x.shape[:-1])
            uc_d = rate_clean(exchanger, service, hb.x, chunk, rf0, side)[0]["U_clean"]
        else:
            uc_d = apply_gradient(u_clean[s], grad[:, s], x_rec[s], hb.x)
        del hb
        with np.errstate(divide="ignore", invalid="ignore"):
            rf_d = 1.0 / u_d - 1.0 / uc_d
        del uc_d
        lo, hi = band
        out[0][s], out[1][s] = nan_percentiles(rf_d, (lo, hi))
        out[2][s], out[3][s] = nan_percentiles(u_d, (lo, hi))
        blocks += 1
    return Band(rf_low=out[0], rf_high=out[1], u_low=out[2], u_high=out[3], blocks=blocks)


def nan_percentiles(a, qs):
    """Percentiles along axis 0 ignoring NaN (numpy's 'linear' method), vectorized over the columns."""
    srt = np.sort(a, axis=0)  # NaN sort last
    k = np.sum(np.isfinite(a), axis=0)
    out = []
    for q in qs:
        pos = q / 100.0 * np.maximum(k - 1, 0)
        lo = np.floor(pos).astype(int)
        hi = np.minimum(lo + 1, np.maximum(k - 1, 0))
        w = pos - lo
        v = np.take_along_axis(srt, lo[None], 0)[0] * (1 - w) + np.take_along_axis(srt, hi[None], 0)[0] * w
        out.append(np.where(k > 0, v, np.nan))
    return out


def cp(fluid, T):
    T = np.asarray(T, dtype=float)
    out = np.full(T.shape, np.nan)
    ok = np.isfinite(T)
    if ok.any():
        Tc = np.clip(T[ok], fluid.t_min, fluid.t_max - 1e-6 * max(fluid.t_max, 1.0))
        out[ok] = np.asarray(fluid.props(Tc).heat_capacity, dtype=float) * np.ones(Tc.shape)
    return out


def duty_vs_rf(exchanger, service, ref, grid, side):
    from ..rating import rate
    from ..service import Service, Stream

    do, di = exchanger.tube_od, exchanger.tube_id
    svc = Service(shell=Stream(service.shell.fluid, ref["shell_flow"], ref["shell_t_in"]),
                  tube=Stream(service.tube.fluid, ref["tube_flow"], ref["tube_t_in"]),
                  fouling_shell=grid if side == "shell" else 0.0,
                  fouling_tube=grid * di / do if side == "tube" else 0.0)
    return np.asarray(rate(exchanger, svc).duty, dtype=float)


def summary(tab, counts, trend, t_end, duty_curve, energy, duty_value, clean_res, warnings):
    used = tab["used"].to_numpy()
    s: dict = {f"rows: {k}": v for k, v in counts.items()}
    if used.any():
        last = np.flatnonzero(used)[-24:]  # the last day of hourly data
        s["Rf now [m2K/W]"] = float(np.median(tab["Rf"].to_numpy()[last]))
        s["Rf now low [m2K/W]"] = float(np.median(tab["Rf_low"].to_numpy()[last]))
        s["Rf now high [m2K/W]"] = float(np.median(tab["Rf_high"].to_numpy()[last]))
        s["U_actual now [W/m2K]"] = float(np.median(tab["U_actual"].to_numpy()[last]))
        s["U_clean now [W/m2K]"] = float(np.median(tab["U_clean"].to_numpy()[last]))
        s["heat balance error median [-]"] = float(np.median(tab["balance_error"].to_numpy()[used]))
    if trend is not None:
        s["model (lowest AIC)"] = trend.model
        s["model fit"] = trend.describe()
        s["fouling rate now [m2K/W per day]"] = float(trend.rate(trend.t_end)) * 86400.0
        s["projection run time [day]"] = t_end / 86400.0
        s["Rf at end of run [m2K/W]"] = float(trend(t_end))
        if duty_curve:
            s["duty at end of run [W]"] = float(np.interp(trend(t_end), *duty_curve))
    s["energy lost to fouling to date [J]"] = energy
    if duty_value is not None:
        s["cost lost to fouling to date"] = energy * duty_value
    if clean_res is not None:
        s["optimal cleaning interval [day]"] = clean_res.interval / 86400.0
        if clean_res.bounded:
            s["optimal cleaning interval [day]"] = f">= {clean_res.interval / 86400.0:.0f} (cleaning does not pay sooner)"
        s["cleaning: mean cost rate [per day]"] = clean_res.cost_rate * 86400.0
    s["warnings"] = "; ".join(warnings[:5])
    return pd.Series(s, dtype=object)
