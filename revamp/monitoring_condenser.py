"""Fouling of a condenser from plant data: a shell-and-tube one by the coolant-side heat balance, an air-cooled one
by its condensing side (:func:`monitor_air_condenser`) (layer 6).

This module holds the row-by-row balance (:func:`monitor_condenser`); plant-data files are read and balanced in
:mod:`revamp.monitoring_condenser_data`, air-cooled condensers in :mod:`revamp.monitoring_condenser_air`; every
public name is re-exported here.

The vapour flow of a condenser is rarely measured well; the coolant's is. Each row gives the duty from the coolant
(flow, inlet and outlet temperatures: ``Q = m cp (T_out - T_in)``) and the condensing temperature from the measured
condensing pressure (the fluid's saturation, or a curve moved to that pressure) or from a measured condensing
temperature. The condenser is taken as a total condenser: the vapour enters at its dew point and leaves at its
bubble point, so that the condensing stream's temperature along the duty is its condensing curve, and the vapour
flow is ``Q`` over the latent heat. The mean temperature difference against the coolant in counterflow is then the
reciprocal of the mean of ``1/ΔT`` along the duty (for a pure fluid exactly the LMTD of the coolant against the
saturation temperature, for any flow arrangement); ``U_actual = Q / (A ΔT_m)``. The clean ``U`` is the zone-by-zone
rating of the clean exchanger (:func:`revamp.rating_condenser.rate_condenser`) at the measured state: the coolant
flow and inlet and that vapour flow, at the row's condensing pressure. ``Rf = 1/U_actual - 1/U_clean`` is the total
fouling on the exchanger's area basis (outside tube area).

The band is a linear propagation (JCGM 100) of one standard uncertainty on the coolant flow (relative), on each
temperature, and on the condensing pressure (relative), each varied alone with the clean U held, the effects added
in quadrature. It does not cover the model: a desuperheating or subcooling zone (taken as condensing here) and
non-condensables (which lower the condensing coefficient and show up as fouling).

References
----------
JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
Bell, K. J., and Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial
condensers. AIChE Symp. Ser. 69(131), 72-79 (the weighted temperature difference along a condensing curve).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from .errors import InputError
from .units import require, to_si

__all__ = ["AIR_CONDENSER_COLUMNS", "CONDENSER_COLUMNS", "CondenserMonitoring", "CondenserPlantMonitoring",
           "monitor_air_condenser", "monitor_air_condenser_data", "monitor_condenser", "monitor_condenser_data",
           "read_air_condenser_plant_data", "read_condenser_plant_data"]

#: standard column -> quantity kind (None: the timestamp)
CONDENSER_COLUMNS = {"timestamp": None, "coolant_flow": "mass_flow", "coolant_t_in": "temperature",
                     "coolant_t_out": "temperature", "condensing_pressure": "pressure",
                     "condensing_t": "temperature", "condensate_t": "temperature"}
_REQUIRED = ("timestamp", "coolant_flow", "coolant_t_in", "coolant_t_out")
_FROM = {"pressure": "condensing_pressure", "temperature": "condensing_t"}
#: the most rows whose fouling one analysis solves with the rating: with more used rows, every k-th is solved and
#: the others carried through their own heat balance (the clean resistance, which moves only with the coolant flow
#: and temperatures and the load, interpolated linearly between solved rows in row order)
MAX_RATED_ROWS = 480
#: rows are rated at the median pressure of their bin: bins of this width in ln(p) (2 %)
PRESSURE_BIN = 0.02
#: the largest total fouling searched [m²K/W, outside area]
RF_MAX = 0.005
#: the duty match of the fouling search, relative
DUTY_TOL = 1e-4
#: points along the duty for the mean temperature difference of a curve with a glide
_POINTS = 41
#: default standard uncertainties: coolant flow 2 % (a clamp-on or orifice meter), temperatures 0.5 K (a calibrated
#: RTD, IEC 60751 class A is ±0.15 K + 0.002|t|; installation adds more), condensing pressure 0.5 % of reading
#: (common practice, no source)
DEFAULT_UNCERTAINTY = {"flow": 0.02, "temperature": 0.5, "pressure": 0.005}
_DAY = 86400.0


@dataclass(frozen=True)
class CondenserMonitoring:
    """Fouling of a condenser from the coolant-side balance, one value per data row (SI).

    Attributes
    ----------
    duty : ndarray
        Coolant-side duty [W].
    t_condensing : ndarray
        Condensing (dew-point) temperature of the row [K].
    vapour_flow : ndarray
        Vapour flow implied by the duty for a total condenser [kg/s].
    dt_mean : ndarray
        Mean temperature difference [K].
    U_actual, U_clean : ndarray
        Overall coefficients [W/m²K] on the exchanger's area basis: as operating, and clean at the same state.
    fouling, fouling_low, fouling_high : ndarray
        Total fouling [m²K/W] and its band of one standard uncertainty (negative values kept: they say the data and
        the clean rating disagree).
    notes : tuple of str
    """

    duty: np.ndarray
    t_condensing: np.ndarray
    vapour_flow: np.ndarray
    dt_mean: np.ndarray
    U_actual: np.ndarray
    U_clean: np.ndarray
    fouling: np.ndarray
    fouling_low: np.ndarray
    fouling_high: np.ndarray
    notes: tuple = ()

    def to_frame(self) -> pd.DataFrame:
        """One row per data row (SI)."""
        return pd.DataFrame({k: getattr(self, k) for k in ("duty", "t_condensing", "vapour_flow", "dt_mean",
                                                            "U_actual", "U_clean", "fouling", "fouling_low",
                                                            "fouling_high")})


def _sides(service):
    from .service import Service

    if not isinstance(service, Service):
        raise InputError("service", type(service).__name__, "a revamp.Service of a shell-and-tube condenser (an "
                         "air-cooled condenser is balanced on its condensing side: monitor_air_condenser)")
    if service.shell.condensing == service.tube.condensing:
        raise InputError("service", service, "a condenser service: one vapour or two-phase stream, one coolant")
    return ("shell", "tube") if service.shell.condensing else ("tube", "shell")


def _pressure_at(curve, T):
    """Condensing pressure [Pa] whose dew point is ``T`` [K]
    (:meth:`revamp.fluids.CondensingFluid.pressure_at_dew_point`)."""
    return curve.pressure_at_dew_point(np.asarray(T, dtype=float))


def _dt_mean(curve, p, t_dew, t_in, t_out):
    """Mean temperature difference of the coolant (counterflow) against the condensing curve at pressure ``p``."""
    if curve.is_isothermal:
        a, b = t_dew - t_out, t_dew - t_in
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(np.abs(a - b) < 1e-9 * np.abs(b), b, (b - a) / np.log(b / a))
    f = np.linspace(0.0, 1.0, _POINTS)
    q = f * float(curve.latent)
    shift = t_dew[..., None] - float(curve.t_dew)  # the curve at the row's pressure, moved with its dew point
    T_h = np.asarray(curve.at(q)[0])[None, :] + shift if curve.pure_name is None else np.asarray(
        curve.temperature_at_pressure(p[..., None], q[None, :]))
    T_c = t_out[..., None] - f[None, :] * (t_out - t_in)[..., None]
    with np.errstate(divide="ignore", invalid="ignore"):
        inv = np.where(T_h > T_c, 1.0 / (T_h - T_c), np.inf)
    return 1.0 / np.trapezoid(inv, f, axis=-1)


def _solve_fouling(exchanger, service, c_side, k_side, curve, m_v, m_c, t_in, q, rating_kw):
    """The total fouling [m²K/W, outside area] at which the zone-by-zone rating gives duty ``q`` (Illinois regula
    falsi on each row, the rows as one array): all of it placed on the coolant side. Returns (rf, U_service,
    U_clean, area); NaN where the clean exchanger cannot give ``q`` or the fouling would exceed :data:`RF_MAX`."""
    from .rating_condenser import rate_condenser
    from .service import Stream

    to_surface = exchanger.tube_id / exchanger.tube_od if k_side == "tube" else 1.0
    coolant = getattr(service, k_side)

    def rated(rows, rf):
        svc = service.replace(**{c_side: Stream(curve, m_v[rows], quality=1.0),
                                 k_side: coolant.replace(flow=m_c[rows], t_in=t_in[rows])},
                              **{f"fouling_{c_side}": 0.0, f"fouling_{k_side}": rf * to_surface})
        return rate_condenser(exchanger, svc, **rating_kw)

    return _search_fouling(rated, q)


def _pressure_bins(idx, p):
    """The rows a plant-data reader rates: up to MAX_RATED_ROWS of the usable rows ``idx``, every ``step``-th and the
    last, grouped in bins of PRESSURE_BIN in ln(p) (``p`` per row [Pa]). Returns ``(rated, step, [(rows, median
    pressure of the bin), ...])``."""
    step = max(1, int(np.ceil(idx.size / MAX_RATED_ROWS)))
    rated = idx[::step] if idx[-1] in idx[::step] else np.append(idx[::step], idx[-1])
    bins = np.round(np.log(p[rated]) / PRESSURE_BIN)
    return rated, step, [(rated[bins == b], float(np.median(p[rated[bins == b]]))) for b in np.unique(bins)]


def _search_fouling(rated, q):
    """The root in ``rf`` of ``rated(rows, rf).duty = q`` on [0, RF_MAX], every row at once (Illinois regula
    falsi). ``rated(rows, rf)`` rates the rows ``rows`` (indices) with total fouling ``rf`` (outside area)."""
    n = q.size
    every = np.arange(n)
    lo, hi = np.zeros(n), np.full(n, RF_MAX)
    r0 = rated(every, lo)
    f_lo = np.asarray(r0.duty, dtype=float) - q
    f_hi = np.asarray(rated(every, hi).duty, dtype=float) - q
    area = float(r0.area)
    ok = (f_lo >= 0) & (f_hi <= 0)
    x = np.where(f_lo == 0, 0.0, np.nan)
    U, Uc = np.asarray(r0.U_service, dtype=float).copy(), np.asarray(r0.U_clean, dtype=float).copy()
    side = np.zeros(n)
    active = ok & (f_lo != 0)
    for _ in range(30):
        if not active.any():
            break
        rows = np.flatnonzero(active)
        xr = hi[rows] - f_hi[rows] * (hi[rows] - lo[rows]) / (f_hi[rows] - f_lo[rows])
        r = rated(rows, xr)
        fx = np.asarray(r.duty, dtype=float) - q[rows]
        x[rows], U[rows], Uc[rows] = xr, np.asarray(r.U_service, dtype=float), np.asarray(r.U_clean, dtype=float)
        done = np.abs(fx) <= DUTY_TOL * q[rows]
        below = fx < 0  # too much fouling: the root lies between lo and x
        hi[rows] = np.where(below, xr, hi[rows])
        lo[rows] = np.where(below, lo[rows], xr)
        f_lo[rows] = np.where(below, np.where(side[rows] == -1, 0.5 * f_lo[rows], f_lo[rows]), fx)
        f_hi[rows] = np.where(below, fx, np.where(side[rows] == 1, 0.5 * f_hi[rows], f_hi[rows]))
        side[rows] = np.where(below, -1, 1)
        active[rows[done]] = False
    x[~ok | active] = np.nan
    return x, U, Uc, area


def monitor_condenser(exchanger, service, t_out_coolant, *, condensing_pressure=None, condensing_temperature=None,
                      t_condensate=None, uncertainty=None, **rating_kw) -> CondenserMonitoring:
    """The fouling of a condenser from measured coolant-side data and its condensing pressure or temperature.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
    service : revamp.Service
        The condenser's service: its condensing stream (the fluid or curve; the flow is replaced by the one the
        balance implies) and the measured coolant flow and inlet (arrays for a data series). Fouling ignored.
    t_out_coolant : float, array_like or str
        Measured coolant outlet [K].
    condensing_pressure, condensing_temperature : float, array_like or str
        One of the two: the measured condensing (inlet) pressure [Pa] or condensing (dew-point) temperature [K].
    t_condensate : float, array_like or str, optional
        Measured condensate outlet [K], when the condensate leaves subcooled; default: at its bubble point.
    uncertainty : dict, optional
        Standard uncertainties ``{"flow": relative [-], "temperature": [K], "pressure": relative [-]}``; defaults
        :data:`DEFAULT_UNCERTAINTY`.
    **rating_kw
        For the ratings (:func:`revamp.rating_condenser.rate_condenser`: ``increments``, methods).

    Returns
    -------
    CondenserMonitoring

    Raises
    ------
    InputError
        Neither or both of the condensing measurements; a single case whose coolant is not heated or whose outlet is
        not below the condensing temperature.
    """
    from .rating_condenser import _curve_of

    c_side, k_side = _sides(service)
    if (condensing_pressure is None) == (condensing_temperature is None):
        raise InputError("condensing_pressure", "both" if condensing_pressure is not None else "neither",
                         "one of condensing_pressure or condensing_temperature")
    unc = dict(DEFAULT_UNCERTAINTY)
    for key, value in (uncertainty or {}).items():
        if key not in unc:
            raise InputError(f"uncertainty.{key}", key, f"one of {', '.join(unc)}")
        kind = "temperature_difference" if key == "temperature" else "dimensionless"
        unc[key] = float(require(to_si(value, kind, f"uncertainty.{key}"), f"uncertainty.{key}", ge=0))
    vapour, coolant = getattr(service, c_side), getattr(service, k_side)
    curve = _curve_of(vapour.fluid)
    t_out = np.asarray(to_si(t_out_coolant, "temperature", "t_out_coolant"), dtype=float)
    t_in = np.asarray(coolant.t_in, dtype=float)
    m_c = np.asarray(coolant.flow, dtype=float)
    if condensing_pressure is not None:
        p = np.asarray(to_si(condensing_pressure, "pressure", "condensing_pressure"), dtype=float)
        require(p, "condensing_pressure", gt=0)
        t_dew = np.asarray(curve.temperature_at_pressure(p), dtype=float)
    else:
        t_dew = np.asarray(to_si(condensing_temperature, "temperature", "condensing_temperature"), dtype=float)
        p = np.asarray(_pressure_at(curve, t_dew), dtype=float)
    glide = float(curve.t_dew) - float(curve.t_bubble)
    t_sub = None if t_condensate is None else np.asarray(to_si(t_condensate, "temperature", "t_condensate"),
                                                         dtype=float)
    shape = np.broadcast_shapes(t_out.shape, t_in.shape, m_c.shape, p.shape, np.shape(t_sub))
    t_out, t_in, m_c, p, t_dew = (np.broadcast_to(a, shape).astype(float) for a in (t_out, t_in, m_c, p, t_dew))
    t_bubble = t_dew - glide
    t_sub = t_bubble if t_sub is None else np.minimum(np.broadcast_to(t_sub, shape).astype(float), t_bubble)
    bad = ~((t_out > t_in) & (t_out < t_dew) & (t_in < t_bubble) & (m_c > 0) & (t_sub > t_in))
    notes = []
    if np.any(bad):
        if shape == ():
            raise InputError("t_out_coolant", float(t_out), f"above the coolant inlet {float(t_in):.2f} K and below "
                             f"the condensing temperature {float(t_dew):.2f} K (a heated coolant)")
        notes.append(f"{int(bad.sum())} row(s) with the coolant outlet not between its inlet and the condensing "
                     "temperature: NaN")

    def balance(m, ti, to, pp, td):
        cp = np.asarray(coolant.fluid.props(0.5 * (ti + to)).heat_capacity, dtype=float)
        return m * cp * (to - ti), _dt_mean(curve, pp, td, ti, to)

    q, dt = balance(m_c, t_in, t_out, p, t_dew)
    # heat released per kg of vapour: the latent heat, and the condensate's subcooling when it is measured
    per_kg = np.full(shape, float(curve.latent))
    if t_condensate is not None:
        t_mid = np.clip(0.5 * (t_bubble + t_sub), curve.t_min, curve.t_max - 0.05)
        per_kg = per_kg + np.asarray(curve.props(t_mid).heat_capacity, dtype=float) * (t_bubble - t_sub)
    m_v = q / per_kg
    # the fouling at which the rating gives the measured duty, solved on up to MAX_RATED_ROWS rows (bins of 2 % in
    # the condensing pressure, rated at each bin's median pressure and moved to each row's own pressure through the
    # balance), interpolated between the solved rows in row order for the others
    ok = np.ravel(~bad & np.isfinite(q) & (q > 0))
    idx = np.flatnonzero(ok)
    flat = {k: np.ravel(v) for k, v in (("p", p), ("q", q), ("m", m_c), ("ti", t_in), ("to", t_out),
                                        ("dt", dt), ("mv", m_v))}
    K = np.full(ok.size, np.nan)
    U_rated, Uc_rated = np.full(ok.size, np.nan), np.full(ok.size, np.nan)
    area = None
    if idx.size:
        rated, step, bins = _pressure_bins(idx, flat["p"])
        for rows, p_bin in bins:
            c = curve.at_pressure(p_bin)
            rf, U, Uc, area = _solve_fouling(exchanger, service, c_side, k_side, c, flat["mv"][rows], flat["m"][rows],
                                             flat["ti"][rows], flat["q"][rows], rating_kw)
            t_bin = np.full(rows.size, float(c.t_dew))
            dt_bin = _dt_mean(curve, np.full(rows.size, p_bin), t_bin, flat["ti"][rows], flat["to"][rows])
            K[rows] = rf - area * dt_bin / flat["q"][rows]  # = -1/U_clean on the balance's basis at the bin
            U_rated[rows], Uc_rated[rows] = U, Uc
        good = rated[np.isfinite(K[rated])]
        if good.size < rated.size:
            notes.append(f"{rated.size - good.size} rated row(s) where no fouling between 0 and {RF_MAX:g} m²K/W "
                         "gives the measured duty (the clean exchanger cannot, or the data disagree): NaN, and left "
                         "out of the interpolation")
        K[idx] = np.interp(idx, good, K[good]) if good.size else np.nan
        if good.size:
            K[rated[~np.isfinite(U_rated[rated]) | ~np.isfinite(K[rated])]] = np.nan
        if rated.size < idx.size:
            notes.append(f"fouling solved on every {step}th used row ({rated.size} rows), carried to the others "
                         "through their own heat balance")
    if area is None:
        from .exchanger import model_of

        area = float(model_of(exchanger).area)
    K = np.reshape(K, shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        U = q / (area * dt)
        rf = area * dt / q + K
        U_clean = -1.0 / K

    def rf_at(m=m_c, ti=t_in, to=t_out, pp=p, td=t_dew):
        qq, dd = balance(m, ti, to, pp, td)
        with np.errstate(divide="ignore", invalid="ignore"):
            return area * dd / qq + K

    deltas = []
    if unc["flow"] > 0:
        deltas.append(np.abs(rf_at(m=m_c * (1 + unc["flow"])) - rf))
    if unc["temperature"] > 0:
        deltas += [np.abs(rf_at(ti=t_in + unc["temperature"]) - rf), np.abs(rf_at(to=t_out + unc["temperature"]) - rf)]
        if condensing_temperature is not None:
            td2 = t_dew + unc["temperature"]
            deltas.append(np.abs(rf_at(td=td2, pp=_pressure_at(curve, td2)) - rf))
    if unc["pressure"] > 0 and condensing_pressure is not None:
        p2 = p * (1 + unc["pressure"])
        deltas.append(np.abs(rf_at(pp=p2, td=np.asarray(curve.temperature_at_pressure(p2), dtype=float)) - rf))
    band = np.sqrt(sum(d * d for d in deltas)) if deltas else np.zeros(shape)
    what = "pressure" if condensing_pressure is not None else "temperature"
    notes.append(f"coolant-side balance at the measured condensing {what}, the condensate "
                 + ("at its measured outlet" if t_condensate is not None else "taken at its bubble point")
                 + f"; the fouling (on the coolant side) at which the zone-by-zone rating gives the measured duty; "
                 f"band: ±{unc['flow']:.1%} coolant flow, ±{unc['temperature']:g} K per temperature"
                 + (f", ±{unc['pressure']:.1%} pressure" if condensing_pressure is not None else "")
                 + " (one standard uncertainty each, propagated through the balance, JCGM 100)")
    out = {k: np.where(bad, np.nan, v).astype(float) for k, v in (
        ("duty", q), ("t", t_dew), ("m_v", m_v), ("dt", dt), ("U", U), ("Uc", U_clean), ("rf", rf),
        ("lo", rf - band), ("hi", rf + band))}
    return CondenserMonitoring(out["duty"], out["t"], out["m_v"], out["dt"], out["U"], out["Uc"], out["rf"],
                               out["lo"], out["hi"], tuple(notes))


# Plant-data files and air-cooled condensers live in their own modules, which import from this one; their names
# are re-exported here on first use (PEP 562), so that importing either module first is no circular import.
_MOVED = {**dict.fromkeys(("CondenserPlantMonitoring", "_dew_points", "_read_plant", "monitor_condenser_data",
                           "read_condenser_plant_data"), "monitoring_condenser_data"),
          **dict.fromkeys(("_AIR_FLOW_U", "AIR_CONDENSER_COLUMNS", "AIR_DEFAULT_UNCERTAINTY", "AIR_FLOW_FROM",
                           "DUTY_FROM", "_air_flow_of", "monitor_air_condenser", "monitor_air_condenser_data",
                           "read_air_condenser_plant_data"), "monitoring_condenser_air")}


def __getattr__(name):
    if name in _MOVED:
        import importlib

        return getattr(importlib.import_module(f".{_MOVED[name]}", __package__), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __dir__():
    return sorted(list(globals()) + list(_MOVED))
