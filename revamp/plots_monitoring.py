"""Plotly figures of plant-data monitoring (no physics here: everything comes from a :class:`Monitoring`).

- :func:`fouling_trend`: fouling resistance against time, the rows used, the Monte Carlo band (daily medians), the
  fitted model and its projection to the end of the run; with several runs in the data, the earlier runs' fits and
  the cleanings between them;
- :func:`heat_balance`: heat-balance closure against the tolerance, rows flagged shown apart; a sensor drift found
  in the closure is named in the title;
- :func:`duty_lost`: duty lost to fouling (daily median) and the energy lost to date.

:func:`fouling_trend` and :func:`duty_lost` take ``units="SI"`` or ``"US"`` for the axes. Every function takes
``resample``: ``"D"`` (the default, for static reports: a year of hourly rows drawn as 365 daily points keeps a
report small) or ``None`` to draw every row (interactive use; WebGL markers).
"""
from __future__ import annotations

import html

import numpy as np
import pandas as pd
import plotly.graph_objects as go
from plotly.subplots import make_subplots

from .errors import InputError
from .report.labels import rescale, resistance_axis, unit_of
from .units import from_si

__all__ = ["duty_lost", "fouling_trend", "heat_balance"]


def _check(mon):
    if not hasattr(mon, "table") or "Rf" not in getattr(mon, "table", {}):
        raise InputError("monitoring", type(mon).__name__, "a Monitoring from revamp.monitor()")


def _text(label) -> str:
    """Text for a plotly label: ``<``, ``>``, ``&`` escaped so that plotly shows it as written."""
    return html.escape(str(label), quote=False)


def _per(tab, cols, rule, q=None):
    """Rows of ``tab`` grouped into periods ``rule`` (a pandas offset alias, e.g. "D"): the median of ``cols`` per
    period, or the ``q`` quantile; periods without data dropped."""
    t = tab.set_index("timestamp")[cols]
    g = t[t.index.notna()].resample(rule)
    return (g.median() if q is None else g.quantile(q)).dropna(how="all")


def _daily(tab, cols):
    return _per(tab, cols, "1D")


def fouling_trend(mon, units: str = "SI", run_length=None, resample="D") -> go.Figure:
    """Fouling resistance vs time with the band, the fitted model and its projection.

    Parameters
    ----------
    mon : Monitoring
        The result of :func:`revamp.monitor`.
    units : {"SI", "US"}
        Display units.
    run_length : float or None
        Project the model to this run time [s]; default the summary's projection length.
    resample : str or None
        Period of the points drawn (pandas offset alias): ``"D"`` (default) draws the median Rf and the median band
        of each day, which keeps a static report small; ``None`` draws every row.
    """
    _check(mon)
    tab = mon.table
    used = tab[tab["used"]]
    factor, label = resistance_axis(units)  # the unit of every resistance chart (10⁻⁴ m²·K/W in SI)
    conv = lambda v: np.asarray(v, dtype=float) * factor
    other = tab[~tab["used"] & np.isfinite(tab["Rf"])]
    if resample:
        pts, other_pts = _per(used, ["Rf", "Rf_low", "Rf_high"], resample), _per(other, ["Rf"], resample)
        what = f" ({'daily' if resample in ('D', '1D') else resample} medians)"
    else:
        pts, other_pts, what = used.set_index("timestamp"), other.set_index("timestamp"), ""
    scatter = go.Scatter if resample else go.Scattergl  # WebGL only for the many points of every row
    fig = go.Figure()
    if len(pts):
        fig.add_trace(go.Scatter(x=pts.index, y=conv(pts["Rf_high"]), mode="lines", line={"width": 0},
                                 showlegend=False, hoverinfo="skip"))
        fig.add_trace(go.Scatter(x=pts.index, y=conv(pts["Rf_low"]), mode="lines", line={"width": 0},
                                 fill="tonexty", fillcolor="rgba(31,119,180,0.2)",
                                 name="band (daily median)" if resample else "band"))
    fig.add_trace(scatter(x=pts.index, y=conv(pts["Rf"]), mode="markers",
                               marker={"size": 4 if resample else 3, "color": "rgba(31,119,180,0.6)"},
                               name="Rf, steady rows"))
    if len(other_pts):
        fig.add_trace(scatter(x=other_pts.index, y=conv(other_pts["Rf"]), mode="markers",
                                   marker={"size": 3, "color": "rgba(150,150,150,0.6)", "symbol": "x"},
                                   name="not steady or flagged"))
    if mon.trend is not None and len(used):
        t0 = used["timestamp"].iloc[0] - pd.to_timedelta(used["run_time"].iloc[0], unit="s")
        t_end = run_length if run_length is not None else \
            float(mon.summary.get("projection run time [day]", 0.0)) * 86400.0
        t_end = max(t_end, float(used["run_time"].max()))
        rt = np.linspace(0.0, float(used["run_time"].max()), 200)
        fig.add_trace(go.Scatter(x=t0 + pd.to_timedelta(rt, unit="s"), y=conv(mon.trend(rt)), mode="lines",
                                 line={"color": "black"}, name=f"fit: {_text(mon.trend.model)} (lowest AIC)"))
        rp = np.linspace(float(used["run_time"].max()), t_end, 100)
        fig.add_trace(go.Scatter(x=t0 + pd.to_timedelta(rp, unit="s"), y=conv(mon.trend(rp)), mode="lines",
                                 line={"color": "black", "dash": "dash"}, name="projection"))
    _earlier_runs(fig, mon, tab, conv)
    fig.update_yaxes(exponentformat="none", rangemode="tozero")
    fig.update_layout(title="Fouling resistance from plant data" + what, xaxis_title="time",
                      yaxis_title=f"fouling resistance, outside area [{label}]", legend={"orientation": "h", "y": -0.2})
    return fig


def _earlier_runs(fig, mon, tab, conv):
    """The fits of the runs before the current one (grey), and a vertical line at each cleaning."""
    cycles = tuple(getattr(mon, "cycles", ()) or ())
    rf = tab["Rf"].to_numpy(dtype=float)
    top = float(np.nanmax(rf)) if np.isfinite(rf).any() else 1e-4
    for c in cycles[:-1]:
        rows = tab[tab["used"] & (tab["cycle"] == c.index)]
        if c.fit is None or not len(rows):
            continue
        rt = np.linspace(0.0, float(rows["cycle_time"].max()), 100)
        fig.add_trace(go.Scatter(x=c.start + pd.to_timedelta(rt, unit="s"), y=conv(c.fit(rt)), mode="lines",
                                 line={"color": "gray"}, name=f"fit of the run from {c.start:%Y-%m-%d}: "
                                                              f"{_text(c.fit.model)}"))
    for c in cycles[1:]:
        fig.add_trace(go.Scatter(x=[c.start, c.start], y=conv([0.0, top]), mode="lines",
                                 line={"color": "seagreen", "dash": "dot"},
                                 name=f"cleaning {c.start:%Y-%m-%d} ({c.source})"))


def heat_balance(mon, tolerance=None, resample="D") -> go.Figure:
    """Heat-balance closure (hot-side minus cold-side duty over their mean) against time, with the tolerance band.

    Parameters
    ----------
    mon : Monitoring
    tolerance : float or None
        Drawn as ± lines [-]; default read from the flag text of the run (10 % if not found).
    resample : str or None
        ``"D"`` (default): the daily median closure of the rows kept with its 5-95 % range of the day, and the daily
        median of the rows flagged; ``None``: every row.
    """
    _check(mon)
    tab = mon.table
    tol = tolerance
    if tol is None:
        tol = 0.10
        for key in mon.counts:
            if key.startswith("heat balance does not close"):
                try:
                    tol = float(key.split(">")[1].split("%")[0]) / 100.0
                except (IndexError, ValueError):
                    pass
    ok = tab["flag"] == ""
    bad = ~ok & np.isfinite(tab["balance_error"])
    fig = go.Figure()
    if resample:
        kept = tab[ok]
        med = _per(kept, ["balance_error"], resample)["balance_error"]
        lo = _per(kept, ["balance_error"], resample, 0.05)["balance_error"].reindex(med.index)
        hi = _per(kept, ["balance_error"], resample, 0.95)["balance_error"].reindex(med.index)
        fig.add_trace(go.Scatter(x=med.index, y=100 * hi, mode="lines", line={"width": 0}, showlegend=False,
                                 hoverinfo="skip"))
        fig.add_trace(go.Scatter(x=med.index, y=100 * lo, mode="lines", line={"width": 0}, fill="tonexty",
                                 fillcolor="rgba(31,119,180,0.2)", name="rows kept, 5-95 % of the day"))
        fig.add_trace(go.Scatter(x=med.index, y=100 * med, mode="lines+markers", marker={"size": 3},
                                 name="rows kept, daily median" if resample in ("D", "1D") else
                                 f"rows kept, median per {resample}"))
        if bad.any():
            b = _per(tab[bad], ["balance_error"], resample)["balance_error"]
            fig.add_trace(go.Scatter(x=b.index, y=100 * b, mode="markers",
                                     marker={"size": 5, "color": "firebrick", "symbol": "x"},
                                     name="rows flagged, daily median"))
    else:
        fig.add_trace(go.Scattergl(x=tab.loc[ok, "timestamp"], y=100 * tab.loc[ok, "balance_error"],
                                   mode="markers", marker={"size": 3}, name="rows kept"))
        if bad.any():
            fig.add_trace(go.Scattergl(x=tab.loc[bad, "timestamp"], y=100 * tab.loc[bad, "balance_error"],
                                       mode="markers", marker={"size": 5, "color": "firebrick", "symbol": "x"},
                                       name="rows flagged"))
    for sign in (1, -1):
        fig.add_hline(y=sign * 100 * tol, line={"dash": "dash", "color": "gray"})
    title = "Heat balance closure (before reconciliation)"
    drift = getattr(mon, "drift", None)
    if drift is not None and drift.detected:
        side = f", {drift.side}-side temperatures suspect" if drift.side else ", side not identifiable"
        title += f"<br><sub>sensor drift: the closure moved by {drift.change:+.1%} over the data{side}</sub>"
    fig.update_layout(title=title, xaxis_title="time",
                      yaxis_title="hot-side minus cold-side duty, over their mean [%]")
    return fig


def duty_lost(mon, units: str = "SI", resample="D") -> go.Figure:
    """Duty lost to fouling (clean-exchanger duty minus reconciled duty), daily median, and energy lost to date.

    ``resample="D"`` (default) draws the energy lost to date at the end of each day; ``None`` at every row. The
    bars are daily medians either way.
    """
    _check(mon)
    tab = mon.table
    valid = tab[np.isfinite(tab["duty_lost"]) & (tab["flag"] == "")]
    day = _daily(valid, ["duty_lost"])
    p, plabel = from_si(day["duty_lost"].to_numpy(), "power", units)
    factor, plabel = rescale(plabel)  # kW -> MW, Btu/h -> MMBtu/h
    p = np.asarray(p, dtype=float) * factor
    e_factor, elabel = (1e-9, "GJ") if units == "SI" else (1.0 / 1.05505585262e9, "MMBtu")  # 1 MMBtu = 1.055 GJ
    fig = make_subplots(specs=[[{"secondary_y": True}]])
    fig.add_trace(go.Bar(x=day.index, y=p, name=f"duty lost, daily median [{plabel}]"), secondary_y=False)
    if len(valid) > 1:
        t = valid["run_time"].to_numpy()
        dt = np.diff(t, prepend=t[0])
        dt = np.minimum(dt, 3 * np.median(dt[1:]) if len(dt) > 1 else dt)
        energy = pd.Series(np.cumsum(valid["duty_lost"].to_numpy() * dt) * e_factor,
                           index=pd.DatetimeIndex(valid["timestamp"]))
        if resample:
            energy = energy[energy.index.notna()].resample(resample).last().dropna()
        fig.add_trace(go.Scatter(x=energy.index, y=energy.to_numpy(), mode="lines",
                                 name=f"energy lost to date [{elabel}]"), secondary_y=True)
    fig.update_layout(title="Duty lost to fouling", xaxis_title="time", legend={"orientation": "h", "y": -0.2})
    # ticks of their own on each axis from zero, plain numbers with separators (ticks synced to the other axis and
    # SI suffixes gave -0.68k, 3.96k, 8.61k)
    fig.update_yaxes(title_text=f"duty lost [{unit_of(plabel)}]", secondary_y=False, rangemode="tozero",
                     tickformat=",", exponentformat="none")
    fig.update_yaxes(title_text=f"energy lost to date [{elabel}]", secondary_y=True, rangemode="tozero",
                     tickformat=",", exponentformat="none", tickmode="auto", showgrid=False)
    return fig
