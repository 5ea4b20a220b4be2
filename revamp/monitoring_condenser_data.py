"""Plant data files of a shell-and-tube condenser: reading and checking the rows, and the fouling of every steady
row by the coolant-side heat balance (layer 6).

Moved here from :mod:`revamp.monitoring_condenser` (which holds the row-by-row balance, :func:`monitor_condenser`,
and re-exports every name of this module); the method and its band are described there.

References
----------
JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from .errors import InputError
from .monitoring_air_data import _flag_rows, _fouling_summary, _rf_trend
from .monitoring_condenser import (_FROM, _REQUIRED, CONDENSER_COLUMNS, DEFAULT_UNCERTAINTY, _sides,
                                   monitor_condenser)

__all__ = ["CondenserPlantMonitoring", "monitor_condenser_data", "read_condenser_plant_data"]


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
    return _flag_rows(raw, spec, need, known, d, flat_rows, checks)


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
        return _rf_trend(self.used)

    @property
    def summary(self) -> dict:
        """The rows, the fouling of the last and first weeks of data (medians, with the band), the straight-line
        change per year (SI; JSON-ready)."""
        u = self.used
        out = {"rows": int(self.counts.get("rows", 0)), "valid rows": int(self.counts.get("valid", 0)),
               "steady rows": int(self.counts.get("steady", 0)), "used rows": int(len(u)),
               "condensing temperature from": self.condensing_from}
        return _fouling_summary(out, u, self.trend())


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
    from .monitoring_condenser_air import monitor_air_condenser_data
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
