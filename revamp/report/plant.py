"""The plant-data section of one exchanger's report: the findings, the row counts, the fitted trend, the fouling chart.

Display only: the analysis itself is :mod:`revamp.monitoring`'s (a ``MonitoringResult`` reached through the study's
``result.monitoring``); this module puts it in the report's units and words. :mod:`revamp.report.case` re-exports
these names.
"""
from __future__ import annotations

import re

from .labels import resistance_axis
from .pages import plot_text, temperatures_in



def monitoring_items(result, system: str = "SI") -> list:
    """What the plant-data section shows: the findings, the row counts by reason, and the fouling figure."""
    import pandas as pd

    mon = result.monitoring
    if mon is None:
        why = result.monitoring_error or "the unit file gives no plant data for this exchanger"
        return [f"No plant-data analysis: {why}."]
    summ = mon.summary
    rows = {_plain_columns(str(k)[len("rows: "):]): v for k, v in summ.items() if str(k).startswith("rows: ")}
    findings = {}
    for k, v in summ.items():
        k = str(k)
        if k.startswith("rows: ") or k == "warnings":
            continue
        if k == "model fit" and getattr(mon, "trend", None) is not None:
            v = fit_text(mon.trend, system)
        elif isinstance(v, float) and (k.endswith("[m2K/W]") or k.endswith("[m2K/W per day]")):
            # on the resistance charts' axis unit (10⁻⁴ m²·K/W), rates per year: no exponents
            factor, rf_unit = resistance_axis(system)
            if k.endswith("per day]"):
                k, v = k[:k.rindex("[")] + f"[{rf_unit} per year]", v * factor * 365.25
            else:
                k, v = k[:k.rindex("[")] + f"[{rf_unit}]", v * factor
        elif k.endswith(" [-]") and "error" in k and isinstance(v, float):  # a fraction: shown in per cent
            k, v = k[:-len(" [-]")] + " [%]", 100.0 * v
        elif isinstance(v, str):
            v = temperatures_in(v, system)
        findings[_plain_columns(k)] = v if isinstance(v, (int, float)) and not isinstance(v, bool) else str(v)
    items = [pd.DataFrame({"value": list(findings.values())}, index=list(findings), dtype=object),
             pd.DataFrame({"rows": [int(v) for v in rows.values()]}, index=list(rows))]
    try:
        from .. import plots_monitoring as pm
    except ImportError:  # the plant-data figures module is optional here: fall back to the fouling chart alone
        items.append(rf_figure(mon))
    else:
        items += [pm.fouling_trend(mon, system), pm.heat_balance(mon), pm.duty_lost(mon, system)]
    warnings = summ.get("warnings") if "warnings" in summ else None
    if warnings:
        items.append(f"Notes from the analysis: {temperatures_in(str(warnings), system)}")
    return items


#: plant-data column identifiers -> the words a reader knows them by (row labels of the plant-data tables)
_COLUMN_WORDS = {"shell_flow": "shell-side flow", "tube_flow": "tube-side flow",
                 "shell_t_in": "shell inlet temperature", "shell_t_out": "shell outlet temperature",
                 "tube_t_in": "tube inlet temperature", "tube_t_out": "tube outlet temperature"}
_COLUMN_RE = re.compile(r"\b(" + "|".join(_COLUMN_WORDS) + r")\b")


def _plain_columns(text: str) -> str:
    """``"missing tube_flow"`` -> ``"missing tube-side flow"``."""
    return _COLUMN_RE.sub(lambda m: _COLUMN_WORDS[m.group(1)], text)


#: fouling-model parameters: name -> (words, what it is: "rf" a resistance, "rate" per year, or (factor, unit))
_FIT_PARAMS = {"a": ("Rf at the run start", "rf"), "Rf0": ("Rf at the run start", "rf"),
               "b": ("fouling rate", "rate"), "Rf_inf": ("asymptotic Rf", "rf"),
               "tau": ("time constant", (1.0 / 86400.0, "days")),
               "alpha_ref": ("deposition coefficient at the reference film temperature", "rate"),
               "E": ("activation energy", (1e-3, "kJ/mol")), "gamma": ("removal coefficient", "rate per Pa")}


_YEAR = 365.25 * 86400.0  #: a Julian year [s]


def fit_text(fit, system: str = "SI") -> str:
    """One line on a fitted fouling trend (:class:`revamp.fouling.FoulingFit`) in display units: resistances on the
    resistance charts' axis unit, rates per year (365.25 days), the time constant in days, each with its standard
    error.

    >>> from revamp.fouling import FoulingFit
    >>> fit = FoulingFit("asymptotic", {"Rf_inf": 3e-4, "tau": 60 * 86400.0}, {"Rf_inf": 1e-6, "tau": 86400.0},
    ...                  r2=0.9, rmse=2e-5, aic=-100.0, n=500, t_end=0.0)
    >>> print(fit_text(fit))
    asymptotic: asymptotic Rf = 3.00 ± 0.010 [10⁻⁴ m²·K/W], time constant = 60.0 ± 1.0 [days]; R² = 0.900, RMSE = 0.20 [10⁻⁴ m²·K/W], AIC = -100.0, 500 points
    """
    from .labels import format_value, resistance_axis

    factor, rf_unit = resistance_axis(system)
    parts = []
    for name, value in fit.params.items():
        if name not in _FIT_PARAMS:  # a derived parameter (alpha from alpha_ref): not repeated
            continue
        words, what = _FIT_PARAMS[name]
        if what == "rf":
            f, unit = factor, rf_unit
        elif what == "rate":
            f, unit = factor * _YEAR, f"{rf_unit} per year"
        elif what == "rate per Pa":
            f, unit = factor * _YEAR, f"{rf_unit} per year per Pa of wall shear"
        else:
            f, unit = what
        se = fit.stderr.get(name, float("nan"))
        se_text = format_value(float(se) * f, 2)
        parts.append(f"{words} = {format_value(float(value) * f)} ± {se_text} [{unit}]")
    return (f"{fit.model}: " + ", ".join(parts) + f"; R² = {fit.r2:.3f}, RMSE = {format_value(fit.rmse * factor, 2)} "
            f"[{rf_unit}], AIC = {fit.aic:,.1f}, {fit.n:,} points")


def rf_figure(mon):
    """Fouling resistance from plant data against time: daily medians of the used rows with their band, and the
    fitted trend (plotly; daily points keep the report small)."""
    import pandas as pd
    import plotly.graph_objects as go

    t = mon.table
    used = t[t["used"]] if "used" in t else t
    daily = used.set_index(pd.to_datetime(used["timestamp"]))[["Rf", "Rf_low", "Rf_high", "run_time"]]
    daily = daily.resample("1D").median().dropna()
    x = list(daily.index)
    fig = go.Figure()
    fig.add_scatter(x=x, y=daily["Rf_high"] * 1e4, mode="lines", line={"width": 0}, showlegend=False,
                    hoverinfo="skip")
    fig.add_scatter(x=x, y=daily["Rf_low"] * 1e4, mode="lines", line={"width": 0}, fill="tonexty",
                    fillcolor="rgba(77,126,168,0.25)", name="5-95 % band")
    fig.add_scatter(x=x, y=daily["Rf"] * 1e4, mode="markers", marker={"size": 4}, name="measured Rf (daily median)")
    trend = getattr(mon, "trend", None)
    if callable(trend):
        try:
            fig.add_scatter(x=x, y=trend(daily["run_time"].to_numpy()) * 1e4, mode="lines",
                            name=f"fitted trend: {plot_text(getattr(trend, 'model', 'model'))}")
        except Exception:  # a trend that cannot be drawn must not hide the data
            pass
    fig.update_layout(title="Fouling resistance from plant data", yaxis_title="Rf [10⁻⁴ m²·K/W, outside area]",
                      height=420, legend={"orientation": "h", "y": -0.2})
    return fig
