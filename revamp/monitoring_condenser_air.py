"""Plant data of an air-cooled condenser: its fouling balanced on the condensing side, one state
(:func:`monitor_air_condenser`) or a plant-data file (:func:`monitor_air_condenser_data`) (layer 6).

Moved here from :mod:`revamp.monitoring_condenser` (which re-exports every name of this module); the shell-and-tube
condenser's balance and the band's method are described there.

References
----------
JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
"""
from __future__ import annotations

import numpy as np
import pandas as pd

from .errors import InputError
from .monitoring_condenser import _FROM, RF_MAX, CondenserMonitoring, _dt_mean, _pressure_bins, _search_fouling
from .monitoring_condenser_data import CondenserPlantMonitoring, _dew_points, _read_plant
from .units import require, to_si

__all__ = ["AIR_CONDENSER_COLUMNS", "AIR_FLOW_FROM", "AIR_DEFAULT_UNCERTAINTY", "DUTY_FROM", "monitor_air_condenser",
           "monitor_air_condenser_data", "read_air_condenser_plant_data"]


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
        rated_rows, _, bins = _pressure_bins(idx, flat["p"])
        for rows, p_bin in bins:
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
