"""Plant data of an air cooler: a historian CSV read into SI, its bad and unsteady rows set aside, and the fouling of
every remaining row by the tube-side heat balance (:func:`revamp.monitoring_air.monitor_air`) (layer 6).

Standard columns (SI unless a unit is given in ``columns``): ``timestamp``, ``tube_flow`` [kg/s], ``tube_t_in``,
``tube_t_out`` [K], ``air_t_in`` [K] (the ambient at the cooler), and, when the plant has them, ``air_flow`` [kg/s] (a
measured air flow, rare) or ``fan_power`` [W] (the fans' shaft or motor power). The air flow of each row comes from
one of three places (``air_flow_from``):

* ``"stated"``: the air flow (or face velocity) of the air cooler's service, the same in every row;
* ``"measured"``: the ``air_flow`` column;
* ``"fan_power"``: the ``fan_power`` column through the fan laws (same fans, another speed or pitch,
  :func:`revamp.correlations.air.air_flow_from_fan_power`), from the design point of the stated service: its air
  flow, and the fan power the rating gives there.

Every row keeps its place; a row with a problem gets its reasons in ``flag`` (as for shell-and-tube data,
:mod:`revamp.monitoring.data`): missing or non-numeric cells, a bad, duplicated or out-of-order timestamp, a
flat-lined sensor, a flow or fan power <= 0, and a tube outlet that is not between the ambient and the tube inlet (a
cooled stream). The steady-state filter (:func:`revamp.monitoring.steady.steady_filter`) looks at the tube flow, the
air flow, the tube inlet and the ambient.

The band is wider than a shell-and-tube one: the air flow is stated, not measured (see
:func:`revamp.monitoring_air.monitor_air`, whose band this is).

References
----------
JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell, ch. 8 (fan laws).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from .errors import InputError
from .units import require, to_si

__all__ = ["AIR_COLUMNS", "AIR_FLOW_FROM", "AIR_FLOW_UNCERTAINTY", "AirPlantMonitoring", "monitor_air_data",
           "read_air_plant_data"]

#: standard column -> quantity kind (None: the timestamp)
AIR_COLUMNS = {"timestamp": None, "tube_flow": "mass_flow", "tube_t_in": "temperature", "tube_t_out": "temperature",
               "air_t_in": "temperature", "air_flow": "mass_flow", "fan_power": "power"}
_REQUIRED = ("timestamp", "tube_flow", "tube_t_in", "tube_t_out", "air_t_in")
#: where each row's air flow comes from -> the column it needs (None: none)
AIR_FLOW_FROM = {"stated": None, "measured": "air_flow", "fan_power": "fan_power"}
#: default relative standard uncertainty of the air flow by its source [-]: a stated flow (fan data sheet, blade
#: pitch rarely known better) and one scaled from the fan power (the design point is still stated) 15 %, a measured
#: one 5 % (common practice, no source)
AIR_FLOW_UNCERTAINTY = {"stated": 0.15, "fan_power": 0.15, "measured": 0.05}
_DAY = 86400.0


def _column_spec(columns, need):
    spec = {c: (c, None) for c in need}
    for key, val in (columns or {}).items():
        if key not in AIR_COLUMNS:
            raise InputError(f"columns.{key}", key, f"one of {list(AIR_COLUMNS)}")
        if key not in need:
            continue
        if isinstance(val, str):
            spec[key] = (val, None)
        elif isinstance(val, (tuple, list)) and len(val) == 2:
            spec[key] = (str(val[0]), val[1])
        else:
            raise InputError(f"columns.{key}", val, "a column name or a (name, unit) pair")
    return spec


def read_air_plant_data(data, columns=None, *, air_flow_from="stated", dialect=None, flat_rows: int = 6):
    """Read and check an air cooler's plant data.

    Parameters
    ----------
    data : str, path or pandas.DataFrame
        A CSV file or a DataFrame.
    columns : dict, optional
        Standard name -> source column, or (column, unit) with a unit pint understands (``"t/h"``, ``"degC"``,
        ``"kW"``). Unmapped columns are read by their standard names, in SI.
    air_flow_from : {"stated", "measured", "fan_power"}
        Which air column is needed besides the required ones (see the module text).
    dialect : CsvDialect, dict or None
        How the file is written (:class:`revamp.monitoring.data.CsvDialect`).
    flat_rows : int
        A sensor unchanged over this many consecutive rows or more is flagged as flat-lined.

    Returns
    -------
    revamp.monitoring.data.PlantData
        ``frame`` with the standard columns in SI, ``row``, ``flag`` and ``valid``; ``counts`` by reason.
    """
    from .monitoring import data as md

    if air_flow_from not in AIR_FLOW_FROM:
        raise InputError("air_flow_from", air_flow_from, f"one of {sorted(AIR_FLOW_FROM)}")
    need = _REQUIRED + ((AIR_FLOW_FROM[air_flow_from],) if AIR_FLOW_FROM[air_flow_from] else ())
    d = md.CsvDialect.make(dialect)
    if isinstance(data, pd.DataFrame):
        raw, lines = data, [d.delimiter.join(str(c) for c in data.columns)]
    else:
        try:
            raw = pd.read_csv(data, dtype=str, keep_default_na=False, sep=d.delimiter, encoding="utf-8-sig")
        except (OSError, ValueError) as exc:
            raise InputError("data", str(data), f"a readable CSV file or a DataFrame ({exc})") from None
        lines = md._first_lines(data)
    spec = _column_spec(columns, need)
    missing = [f"{src} (for {key})" for key, (src, _) in spec.items() if src not in raw.columns]
    if missing:
        problem = md.dialect_problem(lines, [src for src, _ in spec.values()], d)
        if problem is not None:
            raise problem
        raise InputError("data.columns", list(raw.columns)[:12], f"to contain {', '.join(missing)}")

    def checks(out, add):
        for key in ("tube_flow", "air_flow", "fan_power"):
            if key in out:
                add(out[key].to_numpy() <= 0, f"{key} <= 0")
        ti, to, ta = (out[k].to_numpy() for k in ("tube_t_in", "tube_t_out", "air_t_in"))
        add(ti <= ta, "no driving force (tube inlet not above the ambient)")
        add((ti > ta) & ~((to < ti) & (to > ta)), "tube outlet not between the ambient and the tube inlet")

    return _flag_rows(raw, spec, need, AIR_COLUMNS, d, flat_rows, checks)


def _flag_rows(raw, spec, need, kinds, d, flat_rows, checks):
    """The columns ``need`` of a plant-data table ``raw`` (its cells as read) in SI, each row flagged with its
    reasons: missing, bad, duplicated or unsorted timestamps, missing or non-numeric cells, flat-lined sensors, and
    the kind's own physical checks ``checks(out, add)``. Shared by the air cooler's and the condensers' readers.

    ``spec`` maps each needed name to (source column, unit or None), ``kinds`` each name to its quantity kind, ``d``
    is the :class:`revamp.monitoring.data.CsvDialect`; returns a :class:`revamp.monitoring.data.PlantData`."""
    from .monitoring import data as md

    n = len(raw)
    reasons = [[] for _ in range(n)]

    def add(mask, text):
        for i in np.flatnonzero(mask):
            reasons[i].append(text)

    out = pd.DataFrame({"row": np.arange(n)})
    src_t = raw[spec["timestamp"][0]]
    blank_t = src_t.isna().to_numpy() | (src_t.astype(str).str.strip() == "").to_numpy()
    if pd.api.types.is_datetime64_any_dtype(src_t):
        ts, unplaced, used = src_t, np.zeros(n, dtype=bool), md.DialectUsed(dialect=d)
    else:
        ts, unplaced, used = md._read_times(src_t.astype(object).where(blank_t, src_t.astype(str)), blank_t, d)
    add(blank_t, "missing timestamp")
    add(ts.isna().to_numpy() & ~blank_t & ~unplaced, "bad timestamp")
    add(unplaced, f"timestamp not a time in {d.timezone}")
    out["timestamp"] = ts.to_numpy()
    for key in need[1:]:
        src, unit = spec[key]
        col = raw[src]
        text = col.astype(str).str.strip()
        blank = col.isna().to_numpy() | text.isin(["", "nan", "NaN", "NA", "N/A", "null", "None"]).to_numpy()
        num = md._numbers(text, blank, d.decimal)
        kind = kinds[key]
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
class AirPlantMonitoring:
    """The fouling of an air cooler from its plant data, one value per used row.

    Attributes
    ----------
    table : pandas.DataFrame
        Every row of the data: ``timestamp``, ``row``, ``flag``, ``valid``, ``steady``, ``used``, the measured
        columns in SI, ``air_flow`` [kg/s] as used, and for the used rows ``duty`` [W], ``U_actual``, ``U_clean``
        [W/m²K, bare outside-tube area], ``Rf``, ``Rf_low``, ``Rf_high`` [m²K/W, total fouling on the bare
        outside-tube area, with its band of one standard uncertainty] and ``t_out_air`` [K, implied by the balance].
    counts : dict
        Rows by reason (``rows``, ``valid``, each flag), and ``steady``, ``used``.
    air_flow_from : str
        Where the air flow came from (``stated``, ``measured``, ``fan_power``).
    air_flow_uncertainty, t_uncertainty : float
        The standard uncertainties used for the band: relative on the air flow [-], absolute on each temperature [K].
    steady : SteadyFilter or None
        The steady-state filter's settings and counts (None when it was switched off).
    notes : tuple of str
    dialect : DialectUsed
    """

    table: pd.DataFrame = field(repr=False)
    counts: dict
    air_flow_from: str
    air_flow_uncertainty: float
    t_uncertainty: float
    steady: object = None
    notes: tuple = ()
    dialect: object = field(default=None, repr=False)

    @property
    def used(self) -> pd.DataFrame:
        """The used rows."""
        return self.table[self.table["used"]]

    def trend(self):
        """``(slope [m²K/W per s], intercept [m²K/W])`` of a straight line fitted to Rf over time by least squares
        (a description of the data, no fouling model), or None with fewer than 10 used rows."""
        return _rf_trend(self.used)

    @property
    def summary(self) -> dict:
        """What the report states: the rows, the fouling of the last week of data with its band, the first week's,
        the straight-line change per year, and where the air flow came from (SI; JSON-ready)."""
        u = self.used
        out = {"rows": int(self.counts.get("rows", 0)), "valid rows": int(self.counts.get("valid", 0)),
               "steady rows": int(self.counts.get("steady", 0)), "used rows": int(len(u)),
               "air flow from": self.air_flow_from,
               "air flow uncertainty [-]": self.air_flow_uncertainty,
               "temperature uncertainty [K]": self.t_uncertainty}
        return _fouling_summary(out, u, self.trend())


def _rf_trend(u: pd.DataFrame):
    """``(slope [m²K/W per s], intercept [m²K/W])`` of a least-squares line through the used rows' Rf over time, or
    None with fewer than 10 finite values or no time span (shared by the air cooler's and the condenser's results)."""
    if len(u) < 10:
        return None
    t = (pd.to_datetime(u["timestamp"]) - pd.to_datetime(u["timestamp"]).iloc[0]).dt.total_seconds().to_numpy()
    y = u["Rf"].to_numpy(float)
    ok = np.isfinite(y)
    if ok.sum() < 10 or np.ptp(t[ok]) <= 0:
        return None
    slope, intercept = np.polyfit(t[ok], y[ok], 1)
    return float(slope), float(intercept)


def _fouling_summary(out: dict, u, trend) -> dict:
    """``out`` with the fouling of the used rows ``u`` added: the last week's median with its band, the first
    week's, the last row used, and the straight-line change per year from ``trend`` (SI). Shared by the air
    cooler's and the condensers' plant-data summaries."""
    if len(u):
        ts = pd.to_datetime(u["timestamp"])
        last = u[ts >= ts.max() - pd.Timedelta(days=7)]
        first = u[ts <= ts.min() + pd.Timedelta(days=7)]
        out["fouling, last week (median) [m²K/W]"] = float(np.nanmedian(last["Rf"]))
        out["band, last week (median) [m²K/W]"] = [float(np.nanmedian(last["Rf_low"])),
                                                   float(np.nanmedian(last["Rf_high"]))]
        out["fouling, first week (median) [m²K/W]"] = float(np.nanmedian(first["Rf"]))
        out["last row used"] = str(ts.max())
    if trend is not None:
        out["straight-line change per year [m²K/W]"] = trend[0] * 365.25 * _DAY
    return out


def _steady_settings(steady):
    if steady is None or steady is True:
        return {}
    if steady is False:
        return None
    if not isinstance(steady, dict):
        raise InputError("steady", steady, "true, false or a mapping of window, flow_rsd, t_range, min_rows")
    for key in steady:
        if key not in ("window", "flow_rsd", "t_range", "min_rows"):
            raise InputError(f"steady.{key}", key, "one of window, flow_rsd, t_range, min_rows")
    return dict(steady)


def monitor_air_data(exchanger, service, data, columns=None, *, air_flow_from="stated", uncertainty=None,
                     steady=None, dialect=None, flat_rows: int = 6, **rating_kw) -> AirPlantMonitoring:
    """The fouling of an air cooler from its plant data.

    Parameters
    ----------
    exchanger : revamp.AirCooler
    service : revamp.AirService
        The air cooler's service: its tube fluid, the altitude, and the stated air flow (or face velocity), which
        is also the design point for ``air_flow_from="fan_power"``. Its flows and temperatures are replaced by the
        data's, its fouling is ignored.
    data : str, path or pandas.DataFrame
        The plant data (see the module text for the columns).
    columns : dict, optional
        Standard name -> source column or (column, unit).
    air_flow_from : {"stated", "measured", "fan_power"}
    uncertainty : dict, optional
        ``{"air_flow": relative [-], "temperature": absolute [K]}``; defaults: :data:`AIR_FLOW_UNCERTAINTY` by the
        air flow's source, and 1.5 K (a class 1 type K thermocouple, IEC 60584).
    steady : None, bool or dict
        Steady-state filter settings (``window``, ``flow_rsd``, ``t_range``, ``min_rows``); None or True: the
        defaults of :func:`revamp.monitoring.steady.steady_filter`; False: every valid row is used.
    dialect : CsvDialect, dict or None
    flat_rows : int
    **rating_kw
        Methods of the clean rating (:func:`revamp.rating_air.rate_air_cooler`).

    Returns
    -------
    AirPlantMonitoring

    Raises
    ------
    InputError
        Bad settings or an unreadable file (with the field named), or no row left to use.
    """
    from .aircooler import AirCooler
    from .correlations.air import R_AIR, air_flow_from_fan_power, pressure_at_altitude
    from .monitoring.steady import steady_filter
    from .monitoring_air import monitor_air
    from .rating_air import rate_air_cooler
    from .service import Stream
    from .service_air import AirService

    if not isinstance(exchanger, AirCooler):
        raise InputError("exchanger", exchanger, "a revamp.AirCooler")
    if not isinstance(service, AirService):
        raise InputError("service", service, "a revamp.AirService (its tube fluid and stated air flow)")
    if np.ndim(service.air_flow) or np.ndim(service.face_velocity) or np.ndim(service.air_in):
        raise InputError("service", "an array service", "one stated service (its air flow is the design point)")
    unc = dict(uncertainty or {})
    for key in unc:
        if key not in ("air_flow", "temperature"):
            raise InputError(f"uncertainty.{key}", key, "air_flow or temperature")
    pdata = read_air_plant_data(data, columns, air_flow_from=air_flow_from, dialect=dialect, flat_rows=flat_rows)
    frame = pdata.frame.copy()
    n = len(frame)
    notes = []
    p_air = pressure_at_altitude(service.altitude)
    if air_flow_from == "measured":
        m_air = frame["air_flow"].to_numpy(float)
    elif air_flow_from == "fan_power":
        design = rate_air_cooler(exchanger, service, **rating_kw)
        t_fan = frame["air_t_in"].to_numpy(float)
        m_design = float(design.air_flow)
        m_air = np.asarray(air_flow_from_fan_power(frame["fan_power"].to_numpy(float), float(design.fan_power),
                                                   m_design, float(service.air_in) / t_fan), dtype=float)
        notes.append(f"air flow from the fan power by the fan laws, from the design point of the stated service "
                     f"({m_design:.1f} kg/s at a fan power of {float(design.fan_power) / 1e3:.1f} kW, ambient "
                     f"{float(service.air_in) - 273.15:.1f} °C)" + ("; induced draft: the air density at the fans "
                                                                   "is taken at the ambient (the air outlet is not "
                                                                   "measured)" if exchanger.draft == "induced"
                                                                   else ""))
    elif service.air_flow is not None:
        m_air = np.full(n, float(service.air_flow))
    else:  # a stated face velocity: the mass flow at each row's ambient density
        m_air = (float(service.face_velocity) * p_air / (R_AIR * frame["air_t_in"].to_numpy(float))
                 * exchanger.face_area * exchanger.bundles)
    frame["air_flow"] = m_air
    settings = _steady_settings(steady)
    sfilter = None
    if settings is None:
        steady_mask = frame["valid"].to_numpy(bool)
    else:
        canon = pd.DataFrame({"timestamp": frame["timestamp"], "shell_flow": frame["air_flow"],
                              "tube_flow": frame["tube_flow"], "shell_t_in": frame["air_t_in"],
                              "tube_t_in": frame["tube_t_in"]})
        try:
            sfilter = steady_filter(canon, frame["valid"].to_numpy(bool), **settings)
        except InputError as exc:
            raise InputError(exc.field, exc.value, exc.allowed) from None
        steady_mask = sfilter.mask
    used = frame["valid"].to_numpy(bool) & steady_mask & np.isfinite(m_air) & (m_air > 0)
    frame["steady"] = steady_mask
    frame["used"] = used
    counts = {**pdata.counts, "steady": int(np.sum(steady_mask & frame["valid"].to_numpy(bool))),
              "used": int(used.sum())}
    if not used.any():
        raise InputError("data", f"{n} row(s), {counts['valid']} valid, {counts['steady']} steady",
                         "plant data with at least one valid, steady row to compute a fouling resistance from")
    u_air = float(require(to_si(unc.get("air_flow", AIR_FLOW_UNCERTAINTY[air_flow_from]), "dimensionless",
                                "uncertainty.air_flow"), "uncertainty.air_flow", ge=0, lt=1))
    u_t = float(require(to_si(unc.get("temperature", 1.5), "temperature_difference", "uncertainty.temperature"),
                        "uncertainty.temperature", ge=0))
    rows = frame[used]
    svc = AirService(tube=Stream(service.tube.fluid, rows["tube_flow"].to_numpy(float),
                                 rows["tube_t_in"].to_numpy(float)),
                     air_in=rows["air_t_in"].to_numpy(float), air_flow=rows["air_flow"].to_numpy(float),
                     altitude=service.altitude)
    mon = monitor_air(exchanger, svc, rows["tube_t_out"].to_numpy(float), air_flow_uncertainty=u_air,
                      t_uncertainty=u_t, **rating_kw)
    for col, values in (("duty", mon.duty), ("U_actual", mon.U_actual), ("U_clean", mon.U_clean),
                        ("Rf", mon.fouling), ("Rf_low", mon.fouling_low), ("Rf_high", mon.fouling_high),
                        ("t_out_air", mon.t_out_air)):
        full = np.full(n, np.nan)
        full[used] = values
        frame[col] = full
    notes += list(mon.notes)
    if air_flow_from == "stated":
        notes.insert(0, "air flow as stated in the service (not measured): the same in every row")
    return AirPlantMonitoring(table=frame, counts=counts, air_flow_from=air_flow_from, air_flow_uncertainty=u_air,
                              t_uncertainty=u_t, steady=sfilter, notes=tuple(notes), dialect=pdata.dialect)
