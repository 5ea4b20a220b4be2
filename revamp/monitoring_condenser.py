"""Fouling of a condenser from plant data: a shell-and-tube one by the coolant-side heat balance, an air-cooled one
by its condensing side (:func:`monitor_air_condenser`, at the end) (layer 6).

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

from dataclasses import dataclass, field

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
        step = max(1, int(np.ceil(idx.size / MAX_RATED_ROWS)))
        rated = idx[::step] if idx[-1] in idx[::step] else np.append(idx[::step], idx[-1])
        bins = np.round(np.log(flat["p"][rated]) / PRESSURE_BIN)
        for b in np.unique(bins):
            rows = rated[bins == b]
            p_bin = float(np.median(flat["p"][rows]))
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


# ------------------------------------------------------------------------------------------------- plant data files
def read_condenser_plant_data(data, columns=None, *, condensing_from="pressure", dialect=None, flat_rows: int = 6):
    """Read and check a condenser's plant data (a CSV file or a DataFrame).

    Standard columns (SI unless ``columns`` gives a unit): ``timestamp``, ``coolant_flow`` [kg/s], ``coolant_t_in``,
    ``coolant_t_out`` [K], and ``condensing_pressure`` [Pa] or ``condensing_t`` [K] (``condensing_from``); and
    ``condensate_t`` [K], the condensate outlet, read when the data has it (subcooling). Every row
    keeps its place; a row with a problem gets its reasons in ``flag`` (missing or non-numeric cells, bad,
    duplicated or unsorted timestamps, a flat-lined sensor, a flow <= 0, a coolant outlet not above its inlet).

    Returns
    -------
    revamp.monitoring.data.PlantData
    """
    if condensing_from not in _FROM:
        raise InputError("condensing_from", condensing_from, f"one of {', '.join(_FROM)}")
    need = _REQUIRED + (_FROM[condensing_from],)

    def checks(out, add):
        add(out["coolant_flow"].to_numpy() <= 0, "coolant_flow <= 0")
        add(~(out["coolant_t_out"].to_numpy() > out["coolant_t_in"].to_numpy()),
            "coolant outlet not above its inlet")
        if "condensate_t" in out:
            add(~(out["condensate_t"].to_numpy() > out["coolant_t_in"].to_numpy()),
                "condensate not above the coolant inlet")

    return _read_plant(data, columns, need, CONDENSER_COLUMNS, checks, dialect, flat_rows)


def _read_plant(data, columns, need, known, checks, dialect, flat_rows):
    """Read the columns ``need`` (and ``condensate_t`` when the data has it) of a plant-data CSV or DataFrame into
    SI, each row flagged with its reasons; ``checks(out, add)`` adds the kind's own physical checks."""
    from .monitoring import data as md

    d = md.CsvDialect.make(dialect)
    optional = (columns or {}).get("condensate_t", "condensate_t")
    optional = optional if isinstance(optional, str) else str(optional[0])
    if isinstance(data, pd.DataFrame):
        raw, lines = data.astype(str), [d.delimiter.join(str(c) for c in data.columns)]
    else:
        try:
            raw = pd.read_csv(data, dtype=str, keep_default_na=False, sep=d.delimiter, encoding="utf-8-sig")
        except (OSError, ValueError) as exc:
            raise InputError("data", str(data), f"a readable CSV file or a DataFrame ({exc})") from None
        lines = md._first_lines(data)
    if optional in raw.columns and "condensate_t" not in need:  # the condensate outlet, when the plant measures it
        need = tuple(need) + ("condensate_t",)
    spec = {c: (c, None) for c in need}
    for key, val in (columns or {}).items():
        if key not in known:
            raise InputError(f"columns.{key}", key, f"one of {list(known)}")
        if key in need:
            spec[key] = (val, None) if isinstance(val, str) else (str(val[0]), val[1])
    missing = [f"{src} (for {key})" for key, (src, _) in spec.items() if src not in raw.columns]
    if missing:
        problem = md.dialect_problem(lines, [src for src, _ in spec.values()], d)
        if problem is not None:
            raise problem
        raise InputError("data.columns", list(raw.columns)[:12], f"to contain {', '.join(missing)}")
    n = len(raw)
    reasons = [[] for _ in range(n)]

    def add(mask, text):
        for i in np.flatnonzero(mask):
            reasons[i].append(text)

    out = pd.DataFrame({"row": np.arange(n)})
    src_t = raw[spec["timestamp"][0]]
    blank_t = (src_t.astype(str).str.strip() == "").to_numpy()
    ts, unplaced, used = md._read_times(src_t.astype(object).where(blank_t, src_t.astype(str)), blank_t, d)
    add(blank_t, "missing timestamp")
    add(ts.isna().to_numpy() & ~blank_t & ~unplaced, "bad timestamp")
    add(unplaced, f"timestamp not a time in {d.timezone}")
    out["timestamp"] = ts.to_numpy()
    for key in need[1:]:
        src, unit = spec[key]
        text = raw[src].astype(str).str.strip()
        blank = text.isin(["", "nan", "NaN", "NA", "N/A", "null", "None"]).to_numpy()
        num = md._numbers(text, blank, d.decimal)
        kind = known[key]
        if unit is None and kind == "temperature" and np.isfinite(num).any() and np.nanmedian(num) < md._KELVIN_FLOOR:
            raise InputError(f"columns.{key}", src, f"given with its unit, e.g. ({src!r}, 'degC'): a bare column is "
                             f"read as kelvin, and its values (median {np.nanmedian(num):.4g}) would be below "
                             f"{md._KELVIN_FLOOR:.0f} K")
        add(blank, f"missing {key}")
        add(~np.isfinite(num) & ~blank, f"non-numeric {key}")
        out[key] = md._convert(num, unit, kind, key)
    have_t = out["timestamp"].notna().to_numpy()
    add(out["timestamp"].duplicated(keep="first").to_numpy() & have_t, "duplicated timestamp")
    tnum = np.where(have_t, out["timestamp"].to_numpy().astype("datetime64[ns]").astype(np.int64),
                    np.iinfo(np.int64).min)
    earlier = np.zeros(n, dtype=bool)
    earlier[1:] = tnum[1:] < np.maximum.accumulate(tnum)[:-1]
    add(earlier & have_t, "unsorted timestamp")
    for key in need[1:]:
        add(md._flat_runs(out[key].to_numpy(), flat_rows, 0.0), f"flat-lined {key}")
    checks(out, add)
    out["flag"] = ["; ".join(r) for r in reasons]
    out["valid"] = out["flag"] == ""
    counts: dict = {}
    for r in reasons:
        for text in r:
            counts[text] = counts.get(text, 0) + 1
    counts = {"rows": n, "valid": int(out["valid"].sum()), **dict(sorted(counts.items()))}
    return md.PlantData(frame=out, counts=counts, dialect=used)


@dataclass(frozen=True)
class CondenserPlantMonitoring:
    """The fouling of a condenser from its plant data, one value per used row.

    Attributes
    ----------
    table : pandas.DataFrame
        Every row: ``timestamp``, ``row``, ``flag``, ``valid``, ``steady``, ``used``, the measured columns in SI,
        and for the used rows ``duty`` [W], ``t_condensing`` [K], ``vapour_flow`` [kg/s], ``U_actual``,
        ``U_clean`` [W/m²K], ``Rf``, ``Rf_low``, ``Rf_high`` [m²K/W, total fouling with its band].
    counts : dict
        Rows by reason (``rows``, ``valid``, each flag), and ``steady``, ``used``.
    condensing_from : str
    uncertainty : dict
    notes : tuple of str
    basis : str
        What the fouling is computed from, for reports (``"coolant-side heat balance"``, or the condensing-side
        balance of an air-cooled condenser).
    """

    table: pd.DataFrame = field(repr=False)
    counts: dict
    condensing_from: str
    uncertainty: dict
    notes: tuple = ()
    basis: str = "coolant-side heat balance"

    @property
    def used(self) -> pd.DataFrame:
        """The used rows."""
        return self.table[self.table["used"]]

    def trend(self):
        """``(slope [m²K/W per s], intercept [m²K/W])`` of a straight line fitted to Rf over time (a description of
        the data, no fouling model), or None with fewer than 10 used rows."""
        u = self.used
        if len(u) < 10:
            return None
        t = (pd.to_datetime(u["timestamp"]) - pd.to_datetime(u["timestamp"]).iloc[0]).dt.total_seconds().to_numpy()
        y = u["Rf"].to_numpy(float)
        ok = np.isfinite(y)
        if ok.sum() < 10 or np.ptp(t[ok]) <= 0:
            return None
        slope, intercept = np.polyfit(t[ok], y[ok], 1)
        return float(slope), float(intercept)

    @property
    def summary(self) -> dict:
        """The rows, the fouling of the last and first weeks of data (medians, with the band), the straight-line
        change per year (SI; JSON-ready)."""
        u = self.used
        out = {"rows": int(self.counts.get("rows", 0)), "valid rows": int(self.counts.get("valid", 0)),
               "steady rows": int(self.counts.get("steady", 0)), "used rows": int(len(u)),
               "condensing temperature from": self.condensing_from}
        if len(u):
            ts = pd.to_datetime(u["timestamp"])
            last = u[ts >= ts.max() - pd.Timedelta(days=7)]
            first = u[ts <= ts.min() + pd.Timedelta(days=7)]
            out["fouling, last week (median) [m²K/W]"] = float(np.nanmedian(last["Rf"]))
            out["band, last week (median) [m²K/W]"] = [float(np.nanmedian(last["Rf_low"])),
                                                       float(np.nanmedian(last["Rf_high"]))]
            out["fouling, first week (median) [m²K/W]"] = float(np.nanmedian(first["Rf"]))
            out["last row used"] = str(ts.max())
        trend = self.trend()
        if trend is not None:
            out["straight-line change per year [m²K/W]"] = trend[0] * 365.25 * _DAY
        return out


def _dew_points(service, side, p):
    """The dew point [K] at each measured condensing pressure (NaN where the pressure is not a number > 0)."""
    from .rating_condenser import _curve_of

    p = np.asarray(p, dtype=float)
    ok = np.isfinite(p) & (p > 0)
    out = np.full(p.shape, np.nan)
    if ok.any():
        out[ok] = _curve_of(getattr(service, side).fluid).temperature_at_pressure(p[ok])
    return out


def monitor_condenser_data(exchanger, service, data, columns=None, *, condensing_from="pressure", uncertainty=None,
                           steady=None, dialect=None, flat_rows: int = 6, duty_from=None, air_flow_from=None,
                           **rating_kw) -> CondenserPlantMonitoring:
    """The fouling of a condenser from its plant data (read, checked, steady rows kept, balanced row by row).

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
    service : revamp.Service
        The condenser's service (its condensing fluid and coolant fluid; flows and temperatures come from the data).
    data : str, path or pandas.DataFrame
    columns : dict, optional
        Standard name -> source column or (column, unit).
    condensing_from : {"pressure", "temperature"}
        Which condensing measurement the data has.
    uncertainty : dict, optional
        As :func:`monitor_condenser`.
    steady : None, bool or dict
        Steady-state filter settings (``window``, ``flow_rsd``, ``t_range``, ``min_rows``) of
        :func:`revamp.monitoring.steady.steady_filter` (on the coolant flow, the coolant inlet and the condensing
        measurement); None or True: its defaults; False: every valid row is used.
    dialect : CsvDialect, dict or None
    flat_rows : int
    duty_from, air_flow_from : str, optional
        An air-cooled condenser only (:func:`monitor_air_condenser_data`, which an ``AirService`` is handed to):
        where the duty and the air flow of each row come from.
    **rating_kw
        For the clean rating.

    Returns
    -------
    CondenserPlantMonitoring

    Raises
    ------
    InputError
        Bad settings, an unreadable file (with the field named), or no row left to use.
    """
    from .monitoring.steady import steady_filter
    from .service_air import AirService

    if isinstance(service, AirService):
        return monitor_air_condenser_data(exchanger, service, data, columns, condensing_from=condensing_from,
                                          duty_from=duty_from or "condensate", air_flow_from=air_flow_from or "stated",
                                          uncertainty=uncertainty, steady=steady, dialect=dialect,
                                          flat_rows=flat_rows, **rating_kw)
    for name, value in (("duty_from", duty_from), ("air_flow_from", air_flow_from)):
        if value is not None:
            raise InputError(name, value, "None for a shell-and-tube condenser (its duty is the coolant's)")
    c_side, k_side = _sides(service)
    pdata = read_condenser_plant_data(data, columns, condensing_from=condensing_from, dialect=dialect,
                                      flat_rows=flat_rows)
    frame = pdata.frame.copy()
    counts = dict(pdata.counts)
    key = _FROM[condensing_from]
    valid = frame["valid"].to_numpy()
    if steady is False:
        is_steady = valid.copy()
    else:
        settings = {} if steady in (None, True) else dict(steady)
        if not isinstance(steady, (dict, bool, type(None))):
            raise InputError("steady", steady, "true, false or a mapping of window, flow_rsd, t_range, min_rows")
        view = pd.DataFrame({"timestamp": frame["timestamp"], "shell_flow": frame["coolant_flow"],
                             "tube_flow": frame["coolant_flow"], "tube_t_in": frame["coolant_t_in"],
                             "shell_t_in": frame[key] if key == "condensing_t" else _dew_points(service, c_side,
                                                                                               frame[key])})
        is_steady = np.asarray(steady_filter(view, valid=valid, **settings).mask, dtype=bool) & valid
    frame["steady"] = is_steady
    frame["used"] = is_steady
    counts["steady"] = int(is_steady.sum())
    counts["used"] = int(is_steady.sum())
    if not is_steady.any():
        raise InputError("data", f"{counts['rows']} rows, {counts['valid']} valid", "at least one valid, steady row")
    u = frame[is_steady]
    coolant = getattr(service, k_side)
    svc = service.replace(**{k_side: coolant.replace(flow=u["coolant_flow"].to_numpy(float),
                                                     t_in=u["coolant_t_in"].to_numpy(float))})
    meas = {"condensing_pressure" if key == "condensing_pressure" else "condensing_temperature":
            u[key].to_numpy(float)}
    if "condensate_t" in u:
        meas["t_condensate"] = u["condensate_t"].to_numpy(float)
    m = monitor_condenser(exchanger, svc, u["coolant_t_out"].to_numpy(float), uncertainty=uncertainty, **meas,
                          **rating_kw)
    for col, values in (("duty", m.duty), ("t_condensing", m.t_condensing), ("vapour_flow", m.vapour_flow),
                        ("U_actual", m.U_actual), ("U_clean", m.U_clean), ("Rf", m.fouling),
                        ("Rf_low", m.fouling_low), ("Rf_high", m.fouling_high)):
        frame[col] = np.nan
        frame.loc[is_steady, col] = values
    unc = dict(DEFAULT_UNCERTAINTY)
    unc.update({k: float(v) for k, v in (uncertainty or {}).items() if isinstance(v, (int, float))})
    return CondenserPlantMonitoring(table=frame, counts=counts, condensing_from=condensing_from, uncertainty=unc,
                                    notes=m.notes)


# ------------------------------------------------------------------------------------------ air-cooled condensers
#: standard column of an air-cooled condenser's plant data -> quantity kind (None: the timestamp)
AIR_CONDENSER_COLUMNS = {"timestamp": None, "air_t_in": "temperature", "condensing_pressure": "pressure",
                         "condensing_t": "temperature", "condensate_flow": "mass_flow", "condensate_t": "temperature",
                         "air_flow": "mass_flow", "fan_power": "power"}
#: where each row's duty comes from -> the column it needs (None: the vapour flow stated in the service)
DUTY_FROM = {"condensate": "condensate_flow", "stated": None}
#: where each row's air flow comes from -> the column it needs (None: the service's stated air flow)
AIR_FLOW_FROM = {"stated": None, "measured": "air_flow", "fan_power": "fan_power"}
#: default standard uncertainties of an air-cooled condenser's balance: the air flow by its source (relative: a
#: stated or fan-law flow 15 %, a measured one 5 %, as for air coolers), the condensate flow 2 % (a meter on the
#: condensate), a vapour flow stated rather than measured 10 %, each temperature 1.5 K (a class 1 type K
#: thermocouple, IEC 60584; an ambient sensor sees sun and recirculation), the condensing pressure 0.5 % (common
#: practice, no source)
AIR_DEFAULT_UNCERTAINTY = {"air_flow": None, "flow": 0.02, "stated_flow": 0.10, "temperature": 1.5,
                           "pressure": 0.005}
_AIR_FLOW_U = {"stated": 0.15, "fan_power": 0.15, "measured": 0.05}


def _air_flow_of(exchanger, service, air_in):
    """The air mass flow [kg/s] of an AirService: given, or the face velocity at the ambient's density."""
    from .correlations.air import R_AIR, pressure_at_altitude

    if service.air_flow is not None:
        return np.asarray(service.air_flow, dtype=float)
    rho = pressure_at_altitude(service.altitude) / (R_AIR * np.asarray(air_in, dtype=float))
    return np.asarray(service.face_velocity, dtype=float) * rho * exchanger.face_area * exchanger.bundles


def monitor_air_condenser(exchanger, service, *, condensing_pressure=None, condensing_temperature=None,
                          condensate_flow=None, t_condensate=None, uncertainty=None, air_flow_source="stated",
                          **rating_kw) -> CondenserMonitoring:
    """The fouling of an air-cooled condenser from its condensing side, the measured ambient and a stated air flow.

    The condensing side gives the duty: the measured condensate flow (or the vapour flow stated in the service,
    the same in every row) times the heat each kilogram releases (the latent heat, and the condensate's
    subcooling when its outlet temperature is measured). The condenser is a total condenser: the vapour enters at
    its dew point, at the measured condensing pressure (or the pressure whose dew point is the measured condensing
    temperature, :meth:`revamp.fluids.CondensingFluid.pressure_at_dew_point`). The air leaves at
    ``T_air,in + Q / (m_air cp_air)``; the mean temperature difference is the reciprocal of the mean of ``1/ΔT``
    along the duty with the air in counterflow (for a pure fluid exactly the LMTD of the air against the
    saturation temperature, any arrangement); ``U_actual = Q / (A ΔT_m)`` on the bare outside-tube area. The clean
    ``U`` is that of the zone-by-zone rating (:func:`revamp.rating_condenser.rate_condenser`) at the row's state
    with the fouling that gives the measured duty (placed inside the tubes, referred to the bare outside area);
    ``Rf = 1/U_actual - 1/U_clean``.

    The band is wide and honest: one standard uncertainty on the air flow (15 % stated or from the fan power, 5 %
    measured), on the condensate flow (2 %, or 10 % for a stated vapour flow), on each temperature (1.5 K) and on
    the condensing pressure (0.5 %), each varied alone with the clean U held, added in quadrature (JCGM 100).
    Not covered: non-condensables, recirculation of warm air, wind, and a desuperheating zone.

    Parameters
    ----------
    exchanger : revamp.AirCooler
    service : revamp.AirService
        The condensing stream in the tubes (its fluid or curve; its flow is the stated vapour flow when
        ``condensate_flow`` is None), the measured ambient ``air_in`` and the air flow (arrays for a data series).
        Fouling ignored.
    condensing_pressure, condensing_temperature : float, array_like or str
        One of the two: the measured condensing (inlet) pressure [Pa] or dew-point temperature [K].
    condensate_flow : float, array_like or str, optional
        Measured condensate flow [kg/s]; default: the service's vapour flow (stated).
    t_condensate : float, array_like or str, optional
        Measured condensate outlet [K] (subcooling); default: at its bubble point.
    uncertainty : dict, optional
        Standard uncertainties ``{"air_flow": [-], "flow": [-], "temperature": [K], "pressure": [-]}`` (``flow``:
        the condensate or stated vapour flow); defaults :data:`AIR_DEFAULT_UNCERTAINTY`.
    air_flow_source : {"stated", "measured", "fan_power"}
        Where the air flow came from (sets the default air-flow uncertainty and the notes).
    **rating_kw
        For the ratings (``increments``, methods).

    Returns
    -------
    CondenserMonitoring
        ``dt_mean`` against the air; ``vapour_flow`` the condensate (or stated) flow.

    Raises
    ------
    InputError
        Not an air cooler and its service; neither or both condensing measurements; a single case whose air would
        leave at or above the condensing temperature (the data and the stated air flow disagree).

    References
    ----------
    JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
    Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell (air-cooled
    condensers; the air-side balance).
    """
    from .aircooler import AirCooler
    from .correlations.air import air_properties, pressure_at_altitude
    from .rating_condenser import _curve_of, rate_condenser
    from .service import Stream
    from .service_air import AirService

    if not isinstance(exchanger, AirCooler):
        raise InputError("exchanger", type(exchanger).__name__, "a revamp.AirCooler (an air-cooled condenser)")
    if not isinstance(service, AirService) or not service.tube.condensing:
        raise InputError("service", type(service).__name__, "a revamp.AirService with a vapour stream in the tubes")
    if air_flow_source not in AIR_FLOW_FROM:
        raise InputError("air_flow_source", air_flow_source, f"one of {', '.join(AIR_FLOW_FROM)}")
    if (condensing_pressure is None) == (condensing_temperature is None):
        raise InputError("condensing_pressure", "both" if condensing_pressure is not None else "neither",
                         "one of condensing_pressure or condensing_temperature")
    unc = dict(AIR_DEFAULT_UNCERTAINTY, air_flow=_AIR_FLOW_U[air_flow_source])
    if condensate_flow is None:
        unc["flow"] = unc["stated_flow"]
    for key, value in (uncertainty or {}).items():
        if key not in ("air_flow", "flow", "temperature", "pressure"):
            raise InputError(f"uncertainty.{key}", key, "one of air_flow, flow, temperature, pressure")
        kind = "temperature_difference" if key == "temperature" else "dimensionless"
        unc[key] = float(require(to_si(value, kind, f"uncertainty.{key}"), f"uncertainty.{key}", ge=0))
    curve = _curve_of(service.tube.fluid)
    ta = np.asarray(service.air_in, dtype=float)
    if condensing_pressure is not None:
        p = np.asarray(to_si(condensing_pressure, "pressure", "condensing_pressure"), dtype=float)
        require(p, "condensing_pressure", gt=0)
        t_dew = np.asarray(curve.temperature_at_pressure(p), dtype=float)
    else:
        t_dew = np.asarray(to_si(condensing_temperature, "temperature", "condensing_temperature"), dtype=float)
        p = np.asarray(curve.pressure_at_dew_point(t_dew), dtype=float)
    if condensate_flow is None:
        m_v = np.asarray(service.tube.flow, dtype=float)
    else:
        m_v = np.asarray(to_si(condensate_flow, "mass_flow", "condensate_flow"), dtype=float)
    t_sub = None if t_condensate is None else np.asarray(to_si(t_condensate, "temperature", "t_condensate"),
                                                         dtype=float)
    m_air = _air_flow_of(exchanger, service, ta)
    shape = np.broadcast_shapes(ta.shape, p.shape, m_v.shape, m_air.shape, np.shape(t_sub))
    ta, p, t_dew, m_v, m_air = (np.broadcast_to(a, shape).astype(float) for a in (ta, p, t_dew, m_v, m_air))
    glide = float(curve.t_dew) - float(curve.t_bubble)
    t_bubble = t_dew - glide
    t_sub = t_bubble if t_sub is None else np.minimum(np.broadcast_to(t_sub, shape).astype(float), t_bubble)
    p_air = pressure_at_altitude(service.altitude)

    def balance(mv=m_v, mair=m_air, t_a=ta, pp=p, td=t_dew, ts=t_sub):
        per_kg = float(curve.latent) + np.where(
            ts < td - glide, np.asarray(curve.props(np.clip(0.5 * (td - glide + ts), curve.t_min,
                                                            curve.t_max - 0.05)).heat_capacity, dtype=float)
            * (td - glide - ts), 0.0)
        qq = mv * per_kg
        t_out = t_a + qq / (mair * 1007.0)  # first estimate with cp = 1007 J/kg/K, then at the mean
        cp = np.asarray(air_properties(0.5 * (t_a + t_out), pressure=p_air).heat_capacity, dtype=float)
        t_out = t_a + qq / (mair * cp)
        with np.errstate(invalid="ignore"):
            dd = _dt_mean(curve, pp, td, t_a, np.minimum(t_out, td - 1e-6))
        return qq, dd, t_out, per_kg

    q, dt, t_air_out, per_kg = balance()
    bad = ~((m_v > 0) & (m_air > 0) & (ta < t_bubble) & (t_air_out < t_dew) & (t_sub > ta) & np.isfinite(q))
    notes = []
    if np.any(bad):
        if shape == ():
            raise InputError("air_in", float(ta), f"an ambient below the condensing temperature {float(t_dew):.2f} K "
                             f"with the air leaving below it too (it would leave at {float(t_air_out):.2f} K: the "
                             "condensing duty and the stated air flow disagree)")
        notes.append(f"{int(bad.sum())} row(s) where the air cannot carry the duty below the condensing temperature "
                     "(or a flow is not positive): NaN")
    ok = np.ravel(~bad)
    idx = np.flatnonzero(ok)
    flat = {k: np.ravel(v) for k, v in (("p", p), ("q", q), ("ta", ta), ("mair", m_air), ("mv", m_v),
                                        ("dt", dt), ("ts", t_sub))}
    K = np.full(ok.size, np.nan)
    U_r, Uc_r = np.full(ok.size, np.nan), np.full(ok.size, np.nan)
    area = float(exchanger.area)
    to_surface = exchanger.tube_id / exchanger.tube_od
    if idx.size:
        step = max(1, int(np.ceil(idx.size / MAX_RATED_ROWS)))
        rated_rows = idx[::step] if idx[-1] in idx[::step] else np.append(idx[::step], idx[-1])
        bins = np.round(np.log(flat["p"][rated_rows]) / PRESSURE_BIN)
        for b in np.unique(bins):
            rows = rated_rows[bins == b]
            p_bin = float(np.median(flat["p"][rows]))
            c = curve.at_pressure(p_bin)

            def rated(sub, rf, rows=rows, c=c):
                r_ = rows[sub]
                svc = service.replace(tube=Stream(c, flat["mv"][r_], quality=1.0), air_in=flat["ta"][r_],
                                      air_flow=flat["mair"][r_], face_velocity=None,
                                      fouling_tube=np.asarray(rf) * to_surface, fouling_air=0.0)
                return rate_condenser(exchanger, svc, **rating_kw)

            rf, U, Uc, _ = _search_fouling(rated, flat["q"][rows])
            dt_bin = _dt_mean(curve, np.full(rows.size, p_bin), np.full(rows.size, float(c.t_dew)), flat["ta"][rows],
                              np.minimum(np.ravel(t_air_out)[rows], float(c.t_dew) - 1e-6))
            K[rows] = rf - area * dt_bin / flat["q"][rows]
            U_r[rows], Uc_r[rows] = U, Uc
        good = rated_rows[np.isfinite(K[rated_rows])]
        if good.size < rated_rows.size:
            notes.append(f"{rated_rows.size - good.size} rated row(s) where no fouling between 0 and {RF_MAX:g} "
                         "m²K/W gives the measured duty (the clean condenser cannot, or the data disagree): NaN")
        K[idx] = np.interp(idx, good, K[good]) if good.size else np.nan
        K[rated_rows[~np.isfinite(K[rated_rows])]] = np.nan
        if rated_rows.size < idx.size:
            notes.append(f"{rated_rows.size} of {idx.size} rows rated; the clean resistance of the others "
                         "interpolated in row order")
    K = K.reshape(shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        U = q / (area * dt)
        rf = area * dt / q + K
        U_clean = -1.0 / K

    def rf_at(**changes):
        qq, dd, *_ = balance(**changes)
        with np.errstate(divide="ignore", invalid="ignore"):
            return area * dd / qq + K

    deltas = []
    if unc["air_flow"] > 0:
        deltas.append(np.abs(rf_at(mair=m_air * (1 + unc["air_flow"])) - rf))
    if unc["flow"] > 0:
        deltas.append(np.abs(rf_at(mv=m_v * (1 + unc["flow"])) - rf))
    if unc["temperature"] > 0:
        deltas.append(np.abs(rf_at(t_a=ta + unc["temperature"]) - rf))
        if t_condensate is not None:
            deltas.append(np.abs(rf_at(ts=np.minimum(t_sub + unc["temperature"], t_bubble)) - rf))
        if condensing_temperature is not None:
            td2 = t_dew + unc["temperature"]
            deltas.append(np.abs(rf_at(td=td2, pp=curve.pressure_at_dew_point(td2)) - rf))
    if unc["pressure"] > 0 and condensing_pressure is not None:
        p2 = p * (1 + unc["pressure"])
        deltas.append(np.abs(rf_at(pp=p2, td=np.asarray(curve.temperature_at_pressure(p2), dtype=float)) - rf))
    band = np.sqrt(sum(d * d for d in deltas)) if deltas else np.zeros(shape)
    what = "pressure" if condensing_pressure is not None else "temperature"
    duty_src = "measured condensate" if condensate_flow is not None else "stated vapour"
    air_src = {"measured": "measured", "stated": "stated", "fan_power": "from the fan power"}[air_flow_source]
    notes.append(f"air-cooled condenser: the duty from the {duty_src} flow at the measured condensing {what}, the "
                 "condensate " + ("at its measured outlet" if t_condensate is not None else "taken at its bubble point")
                 + f", the air flow {air_src} and the air heated by the duty; the fouling (inside the tubes, on the "
                 "bare outside area) at which the zone-by-zone rating gives that duty; "
                 f"band: ±{unc['air_flow']:.0%} air flow, "
                 f"±{unc['flow']:.0%} {'condensate' if condensate_flow is not None else 'vapour'} flow, "
                 f"±{unc['temperature']:g} K per temperature"
                 + (f", ±{unc['pressure']:.1%} pressure" if condensing_pressure is not None else "")
                 + " (one standard uncertainty each, propagated through the balance, JCGM 100)")
    out = {k: np.where(bad, np.nan, v).astype(float) for k, v in (
        ("duty", q), ("t", t_dew), ("m_v", m_v), ("dt", dt), ("U", U), ("Uc", U_clean), ("rf", rf),
        ("lo", rf - band), ("hi", rf + band))}
    return CondenserMonitoring(out["duty"], out["t"], out["m_v"], out["dt"], out["U"], out["Uc"], out["rf"],
                               out["lo"], out["hi"], tuple(notes))


def read_air_condenser_plant_data(data, columns=None, *, condensing_from="pressure", duty_from="condensate",
                                  air_flow_from="stated", dialect=None, flat_rows: int = 6):
    """Read and check an air-cooled condenser's plant data (a CSV file or a DataFrame).

    Standard columns (SI unless ``columns`` gives a unit): ``timestamp``, ``air_t_in`` [K] (the ambient at the
    condenser), ``condensing_pressure`` [Pa] or ``condensing_t`` [K] (``condensing_from``), ``condensate_flow``
    [kg/s] (``duty_from="condensate"``; none for ``"stated"``), ``air_flow`` [kg/s] or ``fan_power`` [W]
    (``air_flow_from`` ``"measured"`` or ``"fan_power"``; none for ``"stated"``), and ``condensate_t`` [K] when the
    data has it. Rows are flagged as for :func:`read_condenser_plant_data`, and where a flow or the fan power is not
    positive.

    Returns
    -------
    revamp.monitoring.data.PlantData
    """
    if condensing_from not in _FROM:
        raise InputError("condensing_from", condensing_from, f"one of {', '.join(_FROM)}")
    if duty_from not in DUTY_FROM:
        raise InputError("duty_from", duty_from, f"one of {', '.join(DUTY_FROM)}")
    if air_flow_from not in AIR_FLOW_FROM:
        raise InputError("air_flow_from", air_flow_from, f"one of {', '.join(AIR_FLOW_FROM)}")
    need = ("timestamp", "air_t_in", _FROM[condensing_from]) + tuple(
        c for c in (DUTY_FROM[duty_from], AIR_FLOW_FROM[air_flow_from]) if c)

    def checks(out, add):
        for key in ("condensate_flow", "air_flow", "fan_power", "condensing_pressure"):
            if key in out:
                add(out[key].to_numpy() <= 0, f"{key} <= 0")
        if "condensate_t" in out:
            add(~(out["condensate_t"].to_numpy() > out["air_t_in"].to_numpy()), "condensate not above the ambient")

    return _read_plant(data, columns, need, AIR_CONDENSER_COLUMNS, checks, dialect, flat_rows)


def monitor_air_condenser_data(exchanger, service, data, columns=None, *, condensing_from="pressure",
                               duty_from="condensate", air_flow_from="stated", uncertainty=None, steady=None,
                               dialect=None, flat_rows: int = 6, **rating_kw) -> CondenserPlantMonitoring:
    """The fouling of an air-cooled condenser from its plant data (read, checked, steady rows kept, balanced on the
    condensing side row by row: :func:`monitor_air_condenser`).

    Parameters
    ----------
    exchanger : revamp.AirCooler
    service : revamp.AirService
        The condenser's service: its condensing fluid or curve, its vapour flow (the duty's source with
        ``duty_from="stated"``), the stated air flow or face velocity (the design point with
        ``air_flow_from="fan_power"``) and the altitude.
    data : str, path or pandas.DataFrame
    columns : dict, optional
        Standard name (:data:`AIR_CONDENSER_COLUMNS`) -> source column or (column, unit).
    condensing_from : {"pressure", "temperature"}
    duty_from : {"condensate", "stated"}
        The measured condensate flow, or the vapour flow stated in the service (same every row, a wider band).
    air_flow_from : {"stated", "measured", "fan_power"}
        The service's air flow, an ``air_flow`` column, or a ``fan_power`` column through the fan laws from the
        design point of the stated service (:func:`revamp.correlations.air.air_flow_from_fan_power`).
    uncertainty : dict, optional
        As :func:`monitor_air_condenser`.
    steady : None, bool or dict
        Steady-state filter settings (on the air flow, the condensing flow, the ambient and the condensing
        temperature); None or True: defaults; False: every valid row.
    dialect : CsvDialect, dict or None
    flat_rows : int
    **rating_kw
        For the ratings.

    Returns
    -------
    CondenserPlantMonitoring

    Raises
    ------
    InputError
        Bad settings, an unreadable file (with the field named), or no row left to use.

    References
    ----------
    Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell, ch. 8 (fan laws).
    """
    from .aircooler import AirCooler
    from .correlations.air import R_AIR, air_flow_from_fan_power, fan_power, pressure_at_altitude
    from .monitoring.steady import steady_filter
    from .rating_condenser import rate_condenser
    from .service_air import AirService

    if not isinstance(exchanger, AirCooler):
        raise InputError("exchanger", type(exchanger).__name__, "a revamp.AirCooler (an air-cooled condenser)")
    if not isinstance(service, AirService) or not service.tube.condensing:
        raise InputError("service", type(service).__name__, "a revamp.AirService with a vapour stream in the tubes")
    if np.ndim(service.air_flow) or np.ndim(service.face_velocity) or np.ndim(service.air_in) or np.ndim(
            service.tube.flow):
        raise InputError("service", "an array service", "one stated service (its air flow is the design point)")
    pdata = read_air_condenser_plant_data(data, columns, condensing_from=condensing_from, duty_from=duty_from,
                                          air_flow_from=air_flow_from, dialect=dialect, flat_rows=flat_rows)
    frame = pdata.frame.copy()
    counts = dict(pdata.counts)
    key = _FROM[condensing_from]
    notes = []
    ta = frame["air_t_in"].to_numpy(float)
    if air_flow_from == "measured":
        m_air = frame["air_flow"].to_numpy(float)
    elif air_flow_from == "fan_power":
        # the design point: the stated air flow and the shaft power the fans need for it (the bundle's air-side
        # pressure drop at the stated service plus one velocity pressure, Kröger 2004, ch. 8), air at the ambient
        design = rate_condenser(exchanger, service, **rating_kw)
        m_design = float(_air_flow_of(exchanger, service, service.air_in))
        rho = pressure_at_altitude(service.altitude) / (R_AIR * float(service.air_in))
        p_design = float(fan_power(m_design / rho, float(design.dp_air), exchanger.fan_efficiency,
                                   exchanger.fan_area, rho))
        m_air = np.asarray(air_flow_from_fan_power(frame["fan_power"].to_numpy(float), p_design,
                                                   m_design, float(service.air_in) / ta), dtype=float)
        notes.append(f"air flow from the fan power by the fan laws, from the design point of the stated service "
                     f"({m_design:.1f} kg/s at {p_design / 1e3:.1f} kW, ambient "
                     f"{float(service.air_in) - 273.15:.1f} °C)")
    else:
        m_air = np.asarray(_air_flow_of(exchanger, service, ta), dtype=float) * np.ones(len(frame))
        notes.append("air flow as stated in the service (not measured): the same in every row")
    frame["air_flow"] = m_air
    m_v = frame["condensate_flow"].to_numpy(float) if duty_from == "condensate" else np.full(
        len(frame), float(service.tube.flow))
    valid = frame["valid"].to_numpy() & np.isfinite(m_air) & (m_air > 0)
    if steady is False:
        is_steady = valid.copy()
    else:
        if not isinstance(steady, (dict, bool, type(None))):
            raise InputError("steady", steady, "true, false or a mapping of window, flow_rsd, t_range, min_rows")
        settings = {} if steady in (None, True) else dict(steady)
        view = pd.DataFrame({"timestamp": frame["timestamp"], "shell_flow": m_air, "tube_flow": m_v,
                             "tube_t_in": frame[key] if key == "condensing_t" else _dew_points(service, "tube",
                                                                                               frame[key]),
                             "shell_t_in": ta})
        is_steady = np.asarray(steady_filter(view, valid=valid, **settings).mask, dtype=bool) & valid
    frame["steady"] = is_steady
    frame["used"] = is_steady
    counts["steady"] = counts["used"] = int(is_steady.sum())
    if not is_steady.any():
        raise InputError("data", f"{counts['rows']} rows, {counts['valid']} valid", "at least one valid, steady row")
    u = frame[is_steady]
    svc = service.replace(air_in=u["air_t_in"].to_numpy(float), air_flow=u["air_flow"].to_numpy(float),
                          face_velocity=None)
    meas = {"condensing_pressure" if key == "condensing_pressure" else "condensing_temperature":
            u[key].to_numpy(float)}
    if duty_from == "condensate":
        meas["condensate_flow"] = u["condensate_flow"].to_numpy(float)
    if "condensate_t" in u:
        meas["t_condensate"] = u["condensate_t"].to_numpy(float)
    m = monitor_air_condenser(exchanger, svc, uncertainty=uncertainty, air_flow_source=air_flow_from, **meas,
                              **rating_kw)
    for col, values in (("duty", m.duty), ("t_condensing", m.t_condensing), ("vapour_flow", m.vapour_flow),
                        ("U_actual", m.U_actual), ("U_clean", m.U_clean), ("Rf", m.fouling),
                        ("Rf_low", m.fouling_low), ("Rf_high", m.fouling_high)):
        frame[col] = np.nan
        frame.loc[is_steady, col] = values
    unc = dict(AIR_DEFAULT_UNCERTAINTY, air_flow=_AIR_FLOW_U[air_flow_from])
    unc.pop("stated_flow")
    if duty_from == "stated":
        unc["flow"] = AIR_DEFAULT_UNCERTAINTY["stated_flow"]
    unc.update({k: float(v) for k, v in (uncertainty or {}).items() if isinstance(v, (int, float))})
    return CondenserPlantMonitoring(table=frame, counts=counts, condensing_from=condensing_from, uncertainty=unc,
                                    notes=tuple(notes) + m.notes,
                                    basis="condensing-side balance of an air-cooled condenser (the duty from the "
                                          + ("measured condensate" if duty_from == "condensate" else "stated vapour")
                                          + " flow, the air heated by it)")
