"""``monitor()``: plant data -> measured U, fouling resistance with its band, trend, projection and cleaning interval.

The steps, each in its own module: read and flag the data (:mod:`.data`), keep steady windows (:mod:`.steady`),
reconcile the heat balance (:mod:`.reconcile`), then

- U_actual [W/m²K, outside area] from the reconciled duty through the exchanger's effectiveness-NTU relation
  (ε = Q/(C_min·ΔT_inlets), NTU from :func:`revamp.thermal.ntu_from_effectiveness` with
  :func:`revamp.rating.arrangement`, U = NTU·C_min/A);
- U_clean: the clean-surface U at the measured operating state. Film coefficients depend on the stream
  temperatures, which fouling itself shifts (a fouled crude exchanger runs its crude colder, so more viscous), so
  the rows are rated (one vectorized :func:`revamp.rating.rate` call) with the fouling found so far and that
  rating's ``U_clean`` taken; Rf = 1/U_actual − 1/U_clean(Rf) [m²K/W, outside area] is solved per row by secant
  steps (one vectorized call each, 3-5 in all). A rating with no fouling at the same flows and inlets gives the
  duty a clean exchanger would have (``duty_clean``, and the duty lost to fouling);
- a Monte Carlo band: ``mc_draws`` copies of the measurements with Gaussian errors of the stated standard deviations
  go through the same reconciliation and NTU inversion and the clean U (first-order sensitivities from one stacked
  rating by default, or every draw rated, stacked in chunks), streamed in blocks of rows so that only the
  percentiles of each row are kept (memory bounded whatever the number of rows); Rf_low/Rf_high are those
  percentiles;
- fouling trend models fitted to the steady, unflagged rows (:mod:`revamp.fouling.models`, chosen by AIC);
- duty and cost lost to fouling to date; projection of Rf and duty; the optimal cleaning interval (:mod:`.cleaning`).

The vectorized helpers live in :mod:`.engine`.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..errors import InputError
from ..fouling.models import FoulingFit, film_temperature, fit_best
from ..units import require, to_si
from . import engine as _e
from .cleaning import CleaningInterval, Cycle, find_cleanings, optimal_cleaning_interval
from .data import read_plant_data
from .reconcile import BalanceDrift, balance_drift, reconcile_heat_balance
from .steady import SteadyFilter, steady_filter

__all__ = ["DEFAULT_UNCERTAINTY", "Horizon", "Monitoring", "monitor"]

#: Standard deviations (1σ) of the measurements: flows relative [-], temperatures absolute [K].
DEFAULT_UNCERTAINTY = _e.DEFAULT_UNCERTAINTY
_X = _e._X


@dataclass(frozen=True)
class Horizon:
    """The run time the monitoring projects to, and where it came from.

    Attributes
    ----------
    run_time : float
        Run time since the current run's start [s].
    source : str
        ``"run_length"`` (given to :func:`monitor`) or ``"twice the data span"`` (none given: twice the span of the
        current run's rows).
    """

    run_time: float
    source: str


@dataclass(frozen=True)
class Monitoring:
    """What the plant data says about the exchanger.

    Attributes
    ----------
    table : pandas.DataFrame
        One row per data row: measurements (SI), ``duty_shell``, ``duty_tube``, ``balance_error`` [-], ``duty``
        (reconciled) [W], ``U_actual``, ``U_clean`` [W/m²K], ``Rf``, ``Rf_low``, ``Rf_high`` [m²K/W, outside area],
        ``effectiveness``, ``effectiveness_clean``, ``effectiveness_ratio`` [-], ``duty_clean``, ``duty_lost`` [W],
        ``Re_tube``, ``Pr_tube``, ``T_film`` [K], ``shear_tube`` [Pa], ``run_time`` [s], ``steady``, ``flag``,
        ``used`` (steady and unflagged: enters the fit).
    summary : pandas.Series
        Row counts by reason, current Rf with band, fouling rate, chosen model, projection, interval, losses.
    trend : FoulingFit or None
        The model chosen by AIC (None when too few rows are usable).
    fits : dict
        Every model tried: name -> FoulingFit or the reason it could not be fitted.
    counts : dict
        Rows per flag reason (nothing is dropped without a count).
    reference : dict
        The conditions used for projection (medians of the last tenth of the used rows): flows, inlets [SI].
    cleaning : CleaningInterval or None
    run_start : pandas.Timestamp
        Time zero of the run (the last cleaning): ``run_time`` counts from it.
    dialect : DialectUsed
        How the plant data file was read (date order and why, UTC, hints).
    steady_filter : SteadyFilter or None
        The steady-state filter's settings and the rows each removed (None with ``steady=False``).
    drift : BalanceDrift
        The test of the heat-balance closure for a trend over time (a drifting sensor), with the suspect side.
    cycles : tuple of Cycle
        The runs between cleanings in the data, each with its own fit; ``trend`` and ``fits`` are the last one's.
    horizon : Horizon
        The run time the summary projects to ("Rf at end of run"), and where it came from.
    """

    table: pd.DataFrame
    summary: pd.Series
    trend: FoulingFit | None
    fits: dict
    counts: dict
    reference: dict
    cleaning: CleaningInterval | None
    exchanger: object = field(repr=False)
    service: object = field(repr=False)
    run_start: object = None
    _duty_curve: tuple = field(repr=False, default=())
    dialect: object = None
    steady_filter: SteadyFilter | None = None
    drift: BalanceDrift | None = None
    cycles: tuple = ()
    horizon: Horizon | None = None

    def duty_at(self, rf):
        """Duty [W] at the reference conditions with a fouling resistance ``rf`` [m²K/W, outside area]."""
        grid, duty = self._duty_curve
        return np.interp(np.asarray(rf, dtype=float), grid, duty)

    def project(self, when) -> pd.DataFrame:
        """Projected Rf [m²K/W, outside area] and duty [W] at the reference conditions, from the trend.

        Parameters
        ----------
        when : float, str, timestamp or a list of them
            Run times since the run start [s, or strings such as ``"300 day"``], or dates (``"2032-06-30"``,
            ``pandas.Timestamp``).
        """
        if self.trend is None:
            raise InputError("trend", None, "a fitted fouling model (too few steady, unflagged rows)")
        values = when if isinstance(when, (list, tuple, np.ndarray, pd.Index, pd.Series)) else [when]
        t = np.array([self._run_time(v) for v in values], dtype=float)
        rf = np.asarray(self.trend(t), dtype=float)
        return pd.DataFrame({"run_time": t, "date": self.run_start + pd.to_timedelta(t, unit="s"), "Rf": rf,
                             "duty": self.duty_at(rf)})

    def _run_time(self, value) -> float:
        if isinstance(value, (pd.Timestamp, np.datetime64)) or hasattr(value, "isoformat"):
            return float((pd.Timestamp(value) - self.run_start).total_seconds())
        try:
            return float(to_si(value, "time", "when"))
        except InputError:
            if isinstance(value, str):
                try:
                    return float((pd.Timestamp(value) - self.run_start).total_seconds())
                except (ValueError, TypeError):
                    pass
            raise InputError("when", value, "a run time (s or e.g. '300 day') or a date (e.g. '2032-06-30')") \
                from None


def _start(value, used, where: str = "run_start") -> pd.Timestamp:
    """A date as a naive timestamp on the data's clock (UTC when the data were put in UTC)."""
    try:
        t = pd.Timestamp(value)
    except (ValueError, TypeError):
        t = pd.NaT
    if pd.isna(t):
        raise InputError(where, value, "a date and time, e.g. '2031-03-01 06:00'")
    if t.tzinfo is not None:
        return t.tz_convert("UTC").tz_localize(None) if used.utc else t.tz_localize(None)
    if used.utc and used.dialect.timezone:
        return t.tz_localize(used.dialect.timezone).tz_convert("UTC").tz_localize(None)
    return t


def _more_summary(sfilter, used, drift, cycles, horizon) -> dict:
    """Summary lines on the projection horizon, the runs, the closure drift, how the file was read and what each
    steady-state setting removed."""
    s: dict = {"projection horizon from": "run_length (given)" if horizon.source == "run_length" else
               "no run length given: twice the data span of the current run"}
    s["runs in the data"] = "; ".join(f"{c.start:%Y-%m-%d %H:%M} ({c.source}, {c.rows} rows used"
                                      f"{', ' + c.fit.model + ' fit' if c.fit is not None else ''})" for c in cycles)
    s["heat-balance drift"] = drift.reason
    if sfilter is not None:
        s["steady filter: rows checked"] = sfilter.checked
        s[f"steady filter: removed, fewer than {sfilter.min_rows} rows in {sfilter.window / 3600:.3g} h"] = \
            sfilter.removed_min_rows
        for col, k in sfilter.removed_flow_rsd.items():
            s[f"steady filter: removed, {col} varies > {sfilter.flow_rsd:.3g} (relative std)"] = k
        for col, k in sfilter.removed_t_range.items():
            s[f"steady filter: removed, {col} range > {sfilter.t_range:.3g} K"] = k
    if used is not None and used.hints:
        s["plant data file"] = "; ".join(used.hints)
    return s


def _runs(tab, rf, valid, run_start, cleanings, used_dialect, fouling_side, beta, E, models):
    """Split the rows into runs between cleanings, fit each, and set ``cycle``, ``cycle_time`` and ``run_time``.

    Returns (cycles, trend, fits) with the current (last) run's trend and fits."""
    ts = tab["timestamp"]
    used = tab["used"].to_numpy()
    first = ts[valid].min() if valid.any() else pd.NaT
    given: list = []
    if cleanings is not None:
        if isinstance(cleanings, (str, pd.Timestamp)) or not hasattr(cleanings, "__iter__"):
            raise InputError("cleanings", cleanings, "a list of dates (e.g. ['2031-04-10 12:00'])")
        given = [_start(c, used_dialect, f"cleanings[{i}]") for i, c in enumerate(cleanings)]
    if run_start is not None:
        given.append(_start(run_start, used_dialect))
    starts: list = []
    if given:
        starts = [(t, "given") for t in sorted(set(given))]
    elif cleanings is None and used.sum() >= 4:
        rows = np.flatnonzero(used & np.isfinite(rf))
        starts = [(ts.iloc[rows[i]], "detected") for i in find_cleanings(rf[rows])]
    if pd.notna(first) and (not starts or starts[0][0] > first):
        starts.insert(0, (first, "data start"))
    if not starts:
        tab["cycle"], tab["cycle_time"], tab["run_time"] = -1, np.nan, np.nan
        return [], None, {}
    t_starts = np.array([t for t, _ in starts], dtype="datetime64[ns]")
    have_t = ts.notna().to_numpy()
    k = np.searchsorted(t_starts, ts.to_numpy().astype("datetime64[ns]"), side="right") - 1
    k = np.where(have_t, np.maximum(k, 0), -1)
    tab["cycle"] = k
    origin = pd.Series(pd.to_datetime(t_starts[np.maximum(k, 0)]))
    tab["cycle_time"] = np.where(have_t, (ts - origin).dt.total_seconds().to_numpy(), np.nan)
    tab["run_time"] = (ts - pd.Timestamp(t_starts[-1])).dt.total_seconds().to_numpy()
    names = tuple(models) if models else ("linear", "asymptotic", "threshold")
    cycles, trend, fits = [], None, {}
    for j, (start, source) in enumerate(starts):
        sel = used & (k == j)
        rows_j = np.flatnonzero(k == j)
        end = ts.iloc[rows_j].max() if rows_j.size else start
        fit, note, fits_j = None, "", {}
        if sel.sum() >= 4:
            cond = None
            if fouling_side == "tube":
                cond = {"Re": tab["Re_tube"].to_numpy()[sel], "Pr": tab["Pr_tube"].to_numpy()[sel],
                        "T_film": tab["T_film"].to_numpy()[sel], "shear": tab["shear_tube"].to_numpy()[sel],
                        "beta": beta, "E": E}
            try:
                fit, fits_j = fit_best(tab["cycle_time"].to_numpy()[sel], rf[sel], conditions=cond, models=names)
            except InputError as exc:
                note, fits_j = str(exc), {"error": str(exc)}
        else:
            note = f"{int(sel.sum())} steady, unflagged rows: too few to fit"
            if j == len(starts) - 1 and len(starts) > 1:
                fits_j = {"error": f"the current run (since {start:%Y-%m-%d %H:%M}) has {note}"}
        cycles.append(Cycle(index=j, start=pd.Timestamp(start), end=end, rows=int(sel.sum()), source=source,
                            fit=fit, note=note))
        trend, fits = fit, fits_j
    return cycles, trend, fits


# --------------------------------------------------------------------------------------------------------- monitor
def monitor(exchanger, service, data, columns=None, uncertainty=None, *, steady=None, balance_tolerance=0.10,
            mc_draws: int = 200, band=(5.0, 95.0), seed=0, run_start=None, run_length=None, models=None,
            fouling_side: str = "tube", beta: float = -0.66, E=None, cleaning=None, duty_value=None,
            sort: bool = False, flat_rows: int = 6, clean_u: str = "operating", mc_clean: str = "linear",
            mc_chunk: int = 100_000, dialect=None, cleanings=None, drift_tolerance: float = 0.02) -> Monitoring:
    """Measured U and fouling of an exchanger from plant data.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
        The exchanger as built.
    service : revamp.Service
        Supplies the two fluids; its flows, inlet temperatures and fouling are replaced by the measured ones.
    data : str, path or pandas.DataFrame
        Plant data (see :func:`revamp.monitoring.read_plant_data`).
    columns : dict or None
        Canonical column -> source name or (name, unit).
    uncertainty : dict or None
        Measurement standard deviations (1σ): ``flow`` relative [-] (default 0.02), ``temperature`` [K]
        (default 0.5), or per column (``"tube_t_out": 1.0``).
    steady : dict, False or None
        Settings of the steady-state filter, :func:`revamp.monitoring.steady_filter` (``window``, ``flow_rsd``,
        ``t_range``, ``min_rows``; numbers in SI or strings with units); ``False`` keeps every valid row. The rows
        each setting removed are in ``Monitoring.steady_filter``.
    balance_tolerance : float
        Rows whose |balance_error| exceeds this are flagged ``heat balance does not close`` [-].
    mc_draws : int
        Monte Carlo draws for the band (0 for none).
    band : (float, float)
        Percentiles of the band [%].
    seed : int
        Seed of the random draws (reproducible bands).
    run_start : str, timestamp or None
        Start of the current run (the last cleaning); it counts as a given cleaning (see ``cleanings``).
    run_length : float, str or None
        Run length to project to [s or e.g. ``"365 day"``]; default twice the data span of the current run (said in
        ``Monitoring.horizon`` and the summary). A unit file's ``run_length`` belongs here.
    cleanings : list of dates, or None
        Cleanings in the data: each starts a new run, fitted on its own. None (with no ``run_start``) finds them
        where Rf falls back (:func:`revamp.monitoring.cleaning.find_cleanings`); ``[]`` takes the data as one run.
    drift_tolerance : float
        Smallest change of the heat-balance closure over the data span flagged as a sensor drift [-].
    models : sequence of str or None
        Fouling models to try (default all that apply).
    fouling_side : {"tube", "shell"}
        Where the deposit forms: sets the side the projected Rf is put on, and the threshold model (tube side only)
        is fitted only for ``"tube"``.
    beta, E : float
        Threshold model: Reynolds exponent, and a fixed activation energy [J/mol] (None to fit it).
    cleaning : dict or None
        ``cost`` (one cleaning) [currency], ``downtime`` [s or str], optional ``downtime_cost_rate`` [currency/s,
        default: the value of the whole clean duty] and ``t_max``; needs ``duty_value``.
    duty_value : float or None
        Value of heat [currency/J] (e.g. fuel price / furnace efficiency): prices the lost duty.
    sort : bool
        Re-order rows by time instead of flagging out-of-order ones.
    flat_rows : int
        Rows unchanged before a sensor counts as flat-lined.
    clean_u : {"operating", "clean"}
        Which clean U Rf is measured against: ``"operating"`` (default) the clean-surface U at the measured operating
        state (film coefficients at the stream temperatures the fouled exchanger really has; a few rating calls);
        ``"clean"`` the U of a clean exchanger at the same flows and inlets (one call; it carries the change in film
        coefficients that fouling causes through the temperatures into Rf, e.g. +30 % of Rf for a crude in
        transitional flow).
    mc_clean : {"linear", "full"}
        How the draws' clean U is found: ``"linear"`` from first-order sensitivities (one stacked rating of the rows
        with each input nudged; fast), ``"full"`` by rating every draw × row (stacked, in chunks; ~20 µs a case).
    mc_chunk : int
        Largest number of cases per rating call (a case costs about 1 kB at the peak of a rating call). The Monte
        Carlo draws are streamed in blocks of rows (:data:`revamp.monitoring.engine.MC_BLOCK_CASES` draws × rows at
        a time), so that memory grows with the rows (under 2 kB a row in all: the data read, the table) but not with
        rows × draws.
    dialect : CsvDialect, dict or None
        How the CSV file is written (``delimiter``, ``decimal``, ``timestamp_format``, ``dayfirst``, ``timezone``);
        see :class:`revamp.monitoring.CsvDialect`. With a ``timezone`` the times (and ``run_start``, when written
        without an offset) are in UTC.

    Returns
    -------
    Monitoring

    Notes
    -----
    Besides the reasons of :func:`revamp.monitoring.read_plant_data`, a row can be flagged ``heat balance does not
    close (|error| > 10%)``, ``no clean U: the rating gave no result at these conditions`` or ``no U: effectiveness
    outside what the arrangement can reach``; valid rows that fail the steady-state rule are counted as
    ``not steady``. Only unflagged steady rows (``used``) enter the trend fit; every row stays in the table.
    The data may span cleanings: each run is fitted on its own (``Monitoring.cycles``) and the trend, rate and
    projection are the current run's. ``run_time`` counts from the current run's start (negative for earlier runs),
    ``cycle_time`` from each row's own run start, ``cycle`` numbers the runs from 0.
    """
    from ..rating import arrangement as hx_arrangement

    if fouling_side not in ("tube", "shell"):
        raise InputError("fouling_side", fouling_side, "'tube' or 'shell'")
    if clean_u not in ("operating", "clean"):
        raise InputError("clean_u", clean_u, "'operating' or 'clean'")
    if mc_clean not in ("linear", "full"):
        raise InputError("mc_clean", mc_clean, "'linear' or 'full'")
    if isinstance(mc_draws, bool) or not isinstance(mc_draws, (int, np.integer)) or mc_draws < 0:
        raise InputError("mc_draws", mc_draws, "a whole number of Monte Carlo draws >= 0")
    drift_tolerance = float(require(to_si(drift_tolerance, "dimensionless", "drift_tolerance"), "drift_tolerance",
                                    gt=0))
    if steady is not False and steady is not None and not isinstance(steady, dict):
        raise InputError("steady", steady, "a dict of window, flow_rsd, t_range, min_rows, or False")
    for key in (steady or {}):
        if key not in ("window", "flow_rsd", "t_range", "min_rows"):
            raise InputError(f"steady.{key}", key, "one of 'window', 'flow_rsd', 't_range', 'min_rows'")
    pdata = read_plant_data(data, columns, sort=sort, flat_rows=flat_rows, dialect=dialect)
    tab = pdata.frame.copy()
    n = len(tab)
    if n == 0:
        raise InputError("data", "(no rows)", "plant data with at least one row below the header")
    valid = tab["valid"].to_numpy().copy()
    x = tab[_X].to_numpy(dtype=float)
    sig = _e.sigmas(uncertainty, x)
    arr_name, shells = hx_arrangement(exchanger)

    # heat balance and reconciliation (valid rows)
    cp_s = _e.cp(service.shell.fluid, 0.5 * (x[:, 1] + x[:, 2]))
    cp_t = _e.cp(service.tube.fluid, 0.5 * (x[:, 4] + x[:, 5]))
    xv = np.where(valid[:, None], x, np.nan)
    hb = reconcile_heat_balance(xv, sig, cp_s, cp_t)
    tab["duty_shell"], tab["duty_tube"], tab["balance_error"] = hb.duty_shell, hb.duty_tube, hb.balance_error
    tab["duty"] = hb.duty
    for j, col in enumerate(_X):
        tab[col + "_rec"] = hb.x[:, j]
    open_balance = valid & (np.abs(hb.balance_error) > balance_tolerance)
    flags = tab["flag"].to_numpy(dtype=object)
    text = f"heat balance does not close (|error| > {balance_tolerance:.0%})"
    for i in np.flatnonzero(open_balance):
        flags[i] = text
    tab["flag"] = flags
    counts = dict(pdata.counts)
    counts[text] = int(open_balance.sum())

    # U actual, clean rating
    # clean rating at the same flows and inlets: the duty a clean exchanger would give (duty lost to fouling)
    clean, warnings = _e.rate_clean(exchanger, service, hb.x, max(mc_chunk, 1))
    area = float(exchanger.area_outside)
    U_act, eps = _e.u_actual(hb.x, hb.duty, cp_s, cp_t, area, arr_name, shells)
    with np.errstate(divide="ignore", invalid="ignore"):
        rf = 1.0 / U_act - 1.0 / clean["U_clean"]
    state = clean
    if clean_u == "operating":
        # the clean U at the measured operating state: film coefficients depend on the stream temperatures, which
        # fouling changes, so rate at the fouling found and take that rating's clean-surface U. Rf solves
        # Rf = g(Rf) = 1/U_actual − 1/U_clean(Rf): secant steps per row, one vectorized rating each
        def g(rf_try):
            st, w = _e.rate_clean(exchanger, service, hb.x, max(mc_chunk, 1), rf_try, fouling_side)
            with np.errstate(divide="ignore", invalid="ignore"):
                return 1.0 / U_act - 1.0 / st["U_clean"], st, w

        with np.errstate(divide="ignore", invalid="ignore"):
            x0, g0 = np.zeros(n), 1.0 / U_act - 1.0 / clean["U_clean"]
        x1 = g0
        g1, state, warnings = g(x1)
        for _ in range(6):
            with np.errstate(divide="ignore", invalid="ignore"):
                d = (g1 - x1) - (g0 - x0)
                x2 = np.clip(np.where(np.abs(d) > 1e-14, x1 - (g1 - x1) * (x1 - x0) / d, g1), -0.01, 0.05)
            done = np.nanmax(np.abs(x2 - x1), initial=0.0) < 1e-9
            x0, g0 = x1, g1
            x1 = x2
            g1, state, warnings = g(x1)
            if done:
                break
        rf = g1
    rf_rated = rf if clean_u == "operating" else np.zeros(n)  # the fouling the clean U was rated at
    tab["U_actual"], tab["U_clean"], tab["Rf"] = U_act, state["U_clean"], rf
    tab["effectiveness"], tab["effectiveness_clean"] = eps, clean["effectiveness"]
    with np.errstate(divide="ignore", invalid="ignore"):
        tab["effectiveness_ratio"] = eps / clean["effectiveness"]
    tab["duty_clean"] = clean["duty"]
    tab["duty_lost"] = clean["duty"] - hb.duty
    tab["Re_tube"], tab["Pr_tube"], tab["shear_tube"] = state["Re_tube"], state["Pr_tube"], state["shear_tube"]
    tab["T_film"] = film_temperature(0.5 * (hb.x[:, 4] + hb.x[:, 5]), state["t_wall_tube"])
    no_rating = ~np.isfinite(state["U_clean"]) & valid & ~open_balance  # the rating gave NaN for these cases
    no_u = valid & ~open_balance & ~no_rating & ~np.isfinite(rf)
    text_r = "no clean U: the rating gave no result at these conditions"
    text_u = "no U: effectiveness outside what the arrangement can reach"
    flags = tab["flag"].to_numpy(dtype=object)
    flags[no_rating] = text_r
    flags[no_u] = text_u
    tab["flag"] = flags
    counts[text_r] = int(no_rating.sum())
    counts[text_u] = int(no_u.sum())

    # Monte Carlo band: streamed in blocks of rows (engine.MC_BLOCK_CASES draws × rows at a time)
    rf_low = rf_high = np.full(n, np.nan)
    u_low = u_high = np.full(n, np.nan)
    rows = np.flatnonzero(np.isfinite(rf))
    if mc_draws and rows.size:
        mc = _e.mc_band(exchanger, service, x[rows], sig[rows], cp_s[rows], cp_t[rows], hb.x[rows],
                        state["U_clean"][rows], rf_rated[rows], draws=mc_draws, band=band, seed=seed, area=area,
                        arrangement=arr_name, shells=shells, mc_clean=mc_clean, chunk=max(mc_chunk, 1),
                        side=fouling_side)
        rf_low, rf_high = np.full(n, np.nan), np.full(n, np.nan)
        u_low, u_high = np.full(n, np.nan), np.full(n, np.nan)
        rf_low[rows], rf_high[rows], u_low[rows], u_high[rows] = mc.rf_low, mc.rf_high, mc.u_low, mc.u_high
    tab["Rf_low"], tab["Rf_high"], tab["U_low"], tab["U_high"] = rf_low, rf_high, u_low, u_high

    # steady filter and the rows used
    ok = valid & ~open_balance & np.isfinite(rf)
    sfilter = None
    if steady is False:
        st = ok.copy()
    else:
        sfilter = steady_filter(tab, valid=valid, **(steady or {}))
        st = sfilter.mask
    tab["steady"] = st
    tab["used"] = ok & st
    counts["not steady"] = int((ok & ~st).sum())
    counts["used"] = int(tab["used"].sum())

    ts = tab["timestamp"]
    cycles, trend, fits = _runs(tab, rf, valid, run_start, cleanings, pdata.dialect, fouling_side, beta, E, models)
    t0 = cycles[-1].start if cycles else pd.NaT
    used = tab["used"].to_numpy()
    current = used & (tab["cycle"].to_numpy() == (len(cycles) - 1))

    # drift of the heat-balance closure (valid rows, open balance included: a drift is what opens it)
    tsec = (ts - ts[valid].min()).dt.total_seconds().to_numpy() if valid.any() else np.full(n, np.nan)
    shell_hot = x[:, 1] > x[:, 4]
    drift = balance_drift(np.where(valid, tsec, np.nan), hb.duty_shell, hb.duty_tube, shell_hot, x[:, 0] * cp_s,
                          x[:, 3] * cp_t, tolerance=drift_tolerance)

    # reference conditions and duty vs Rf there
    reference, duty_curve = {}, ()
    if used.any():
        tail = np.flatnonzero(used)
        tail = tail[int(0.9 * tail.size):]
        reference = {col: float(np.median(hb.x[tail, j])) for j, col in enumerate(_X)}
        rf_top = max(float(np.nanmax(rf[used])) * 3.0, 1e-3)
        grid = np.linspace(0.0, rf_top, 61)
        duty_curve = (grid, _e.duty_vs_rf(exchanger, service, reference, grid, fouling_side))

    # losses to date (valid rows; each row stands for the time to the next, capped at 3 median steps)
    tnum = tsec
    lost = tab["duty_lost"].to_numpy()
    have = np.isfinite(lost) & np.isfinite(tnum) & valid & ~open_balance
    energy = 0.0
    if have.sum() >= 2:
        tt, ll = tnum[have], lost[have]
        dt = np.diff(tt)
        dt = np.minimum(dt, 3.0 * np.median(dt))
        energy = float(np.sum(ll[:-1] * dt))

    # projection and cleaning
    ctime = tab["cycle_time"].to_numpy()
    span = float(np.nanmax(ctime[current]) - np.nanmin(ctime[current])) if current.any() else 0.0
    if run_length is not None:
        horizon = Horizon(float(require(to_si(run_length, "time", "run_length"), "run_length", gt=0)), "run_length")
    else:
        horizon = Horizon(2.0 * max(span, 1.0), "twice the data span")
    t_end = horizon.run_time
    clean_res = None
    if cleaning is not None and trend is not None and duty_curve:
        if duty_value is None:
            raise InputError("duty_value", None, "a value of heat [currency/J] to price the lost duty for cleaning")
        c = dict(cleaning)
        q0 = float(np.interp(0.0, *duty_curve))

        def loss_rate(t):
            return duty_value * (q0 - np.interp(trend(np.asarray(t, dtype=float)), *duty_curve))

        clean_res = optimal_cleaning_interval(
            loss_rate, c.pop("cost"), downtime=c.pop("downtime", 0.0),
            downtime_cost_rate=c.pop("downtime_cost_rate", duty_value * q0), **c)

    summary = _e.summary(tab, counts, trend, t_end, duty_curve, energy, duty_value, clean_res, warnings)
    summary = pd.concat([summary, pd.Series(_more_summary(sfilter, pdata.dialect, drift, cycles, horizon),
                                            dtype=object)])
    return Monitoring(table=tab, summary=summary, trend=trend, fits=fits, counts=counts, reference=reference,
                      cleaning=clean_res, exchanger=exchanger, service=service, run_start=t0,
                      _duty_curve=duty_curve, dialect=pdata.dialect, steady_filter=sfilter, drift=drift,
                      cycles=tuple(cycles), horizon=horizon)
