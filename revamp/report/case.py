"""One exchanger's study as the reports show it: the ratings, the plant data, the options, the summary for the index.

The notebooks call these and display what they return; the computing is the package's (``rate``, ``monitor``,
``compare``), the layout is here.
"""
from __future__ import annotations

import json

import numpy as np

from .pages import esc, figure_html, plot_text, table_html, write_atomic

#: Run length between cleanings taken for the cycle-averaged duty when the unit file gives none [day].
DEFAULT_RUN_LENGTH_DAYS = 365.0


def fouling_side(rating, given: str | None = None, where: str = "plant_data.fouling_side") -> tuple:
    """Where the deposit is taken to form, and why, as ``(side, reason)``.

    ``given`` is the side the unit file names (``where`` says which field); the reason then starts "from the unit
    file". Without it the side with the larger design fouling resistance is taken, compared on the outside-area
    basis of the resistance breakdown (``rating.resistances``); a tie goes to the tube side, and the reason starts
    "inferred:".
    """
    if given is not None:
        if given not in ("shell", "tube"):
            from ..errors import InputError

            raise InputError("fouling_side", given, "'shell' or 'tube'")
        return given, f"from the unit file ({where}: {given})"
    shell, tube = (float(rating.resistances[f"{s} fouling"]) for s in ("shell", "tube"))
    side = "shell" if shell > tube else "tube"
    values = f"{shell * 1e4:.2f} shell vs {tube * 1e4:.2f} tube, 10⁻⁴ m²·K/W on the outside area"
    rule = "its design fouling resistance is the larger" if shell != tube else "the design fouling resistances are equal"
    return side, (f"inferred: the unit file does not say which side fouls (plant_data.fouling_side), so the {side} "
                  f"side is taken: {rule} ({values})")


def cycle_fouling(trend, side: str, ratio: float, rating=None):
    """The fitted plant-data trend as a fouling model Rf(t) for a run from clean [m²K/W on the side's own surface].

    ``ratio`` converts the trend's outside-area Rf to the side's own surface (tube side: di/do of the exchanger the
    data come from, so the same deposit; shell side: 1). A linear or asymptotic trend is used as it was fitted,
    whatever the option (it knows nothing of velocity). A threshold trend (Ebert & Panchal 1995) is rebuilt at the
    clean ``rating`` of each option: its fitted Rf0, alpha_ref, E, gamma, with the rating's tube-side Re, Pr, wall
    shear and film temperature (T_b + 0.55·(T_w − T_b)), held for the run; a net rate below zero (removal beats
    deposition) is taken as no growth. Negative Rf from a fit is clipped to 0.

    References
    ----------
    Ebert, W., Panchal, C. B. (1995). Analysis of Exxon crude-oil-slip-stream coking data.
    """
    import numpy as np

    from ..fouling.models import film_temperature, threshold_rate

    if trend.model == "threshold" and side == "tube" and rating is not None:
        p, c = trend.params, trend.conditions
        t_bulk = 0.5 * (float(rating.service.tube.t_in) + float(rating.t_out_tube))
        growth = max(float(threshold_rate(float(rating.Re_tube), float(rating.Pr_tube),
                                          film_temperature(t_bulk, float(rating.t_wall_tube)),
                                          float(rating.shear_tube), p["alpha_ref"], p["E"], p["gamma"],
                                          c["beta"], c["T_ref"])), 0.0)
        rf0 = max(float(p["Rf0"]), 0.0)
        return lambda t: ratio * (rf0 + growth * np.asarray(t, dtype=float))
    return lambda t: ratio * np.maximum(np.asarray(trend(np.asarray(t, dtype=float)), dtype=float), 0.0)


def cycle_settings(case, monitoring, side: str, why: str) -> dict | None:
    """The ``cycle`` argument of :func:`revamp.compare` from the plant-data trend (None without a trend), with the
    sentence the report shows about it under ``"text"``."""
    trend = getattr(monitoring, "trend", None)
    if trend is None:
        return None
    ex = case.exchanger
    ratio = float(ex.tube_id) / float(ex.tube_od) if side == "tube" else 1.0
    given = getattr(case, "cycle_from", None) or {}
    run_length = getattr(case, "run_length", None)
    run_length = float(run_length) if run_length is not None else DEFAULT_RUN_LENGTH_DAYS * 86400.0
    downtime = getattr(case, "cleaning_downtime", None)
    downtime = float(downtime) if downtime is not None else 0.0
    cycle = {"side": side, "run_length": run_length, "downtime": downtime}
    run_time = monitoring.table["run_time"].to_numpy(dtype=float)
    age = float(np.nanmax(run_time)) if np.isfinite(run_time).any() else 0.0
    cycle["base_age"] = max(age, 0.0)
    if trend.model == "threshold" and side == "tube":
        cycle["fouling_for"] = lambda rating: cycle_fouling(trend, side, ratio, rating)
        how = ("threshold model rebuilt at each option's own clean tube velocity, wall shear and film temperature, "
               "so an option that raises velocity fouls more slowly; where removal beats deposition the deposit "
               "is taken not to grow")
    else:
        cycle["fouling"] = cycle_fouling(trend, side, ratio)
        how = (f"{trend.model} model used as fitted for every option (it does not depend on velocity, so it "
               f"cannot credit an option that fouls more slowly)")
    cycle["text"] = (f"duty_cycle_avg: the duty averaged over the next run until a cleaning, with the "
                     f"{side}-side fouling growing as the plant-data trend says; value, payback and NPV use it "
                     f"instead of the snapshot duty. {_cycle_time_text(run_length, downtime, given)}; the other side "
                     f"keeps its design fouling. "
                     f"Fouling model: {how}. Side: {why}. Doing nothing, the base case goes on fouling from where "
                     f"the plant data leave it ({age / 86400.0:.0f} days into its run); every option is installed at "
                     f"a shutdown and starts its run clean.")
    return cycle


def _cycle_time_text(run_length: float, downtime: float, given: dict) -> str:
    """The sentence on the run length and the cleaning downtime [s], saying where each came from."""
    days = lambda s: f"{s / 86400.0:.4g} days"
    if "run_length" in given:
        run = f"Run length {days(run_length)} (from the unit file, {given['run_length']})"
    else:
        run = f"Run length {days(run_length)} (the unit file gives none, so one year is taken)"
    if "cleaning_downtime" in given:
        down = (f"cleaning downtime {days(downtime)} per run, counted with no duty (from the unit file, "
                f"{given['cleaning_downtime']})")
    else:
        down = "no cleaning downtime counted (the unit file gives none)"
    return f"{run}, {down}"


def run_case(case, mc_draws: int = 100):
    """Everything a report on one exchanger shows, computed by the package (the notebooks only display it).

    Returns a dict: ``today``, ``today_clean``, ``revamp``, ``revamp_clean`` (Ratings), ``monitoring``
    (:class:`revamp.Monitoring` or None, with ``monitoring_error`` when the plant data could not be used),
    ``fouling_side`` (``(side, reason)``), ``cycle`` (the cycle settings of :func:`cycle_settings`, None without a
    fitted trend; ``cycle_error`` when the cycle-averaged study failed and the snapshot study was kept) and ``study``
    (:class:`revamp.Study` at the revamp conditions, or None when the file lists no option).
    """
    import revamp as rv

    out = {"case": case}
    out["today"] = rv.rate(case.exchanger, case.service)
    out["today_clean"] = rv.rate(case.exchanger, case.service.clean())
    out["revamp"] = rv.rate(case.exchanger, case.revamp_service)
    out["revamp_clean"] = rv.rate(case.exchanger, case.revamp_service.clean())
    where = (getattr(case, "cycle_from", None) or {}).get("fouling_side", "plant_data.fouling_side")
    out["fouling_side"] = side, why = fouling_side(out["today"], getattr(case, "fouling_side", None), where)
    out["monitoring"], out["monitoring_error"], out["cycle"], out["cycle_error"] = None, None, None, None
    if case.plant_data is not None:
        try:
            out["monitoring"] = rv.monitor(case.exchanger, case.service, case.plant_data.file,
                                           columns=case.plant_data.columns,
                                           uncertainty=case.plant_data.uncertainty or None, mc_draws=mc_draws,
                                           fouling_side=side)
        except Exception as exc:  # plant data is evidence, not a precondition: the study goes on without it
            out["monitoring_error"] = f"{exc.__class__.__name__}: {exc}"
        else:
            out["cycle"] = cycle_settings(case, out["monitoring"], side, why)
    out["study"] = None
    if case.options:
        kwargs = {"target": case.target or None, "limits": case.limits or None, "economics": case.economics,
                  "revamp": case.revamp_service}
        cycle = {k: v for k, v in (out["cycle"] or {}).items() if k != "text"} or None
        try:
            out["study"] = rv.compare(case.exchanger, case.service, list(case.options), cycle=cycle, **kwargs)
        except Exception as exc:
            if cycle is None:
                raise
            # the cycle average is an extra: when a rating along the run fails, keep the snapshot comparison
            out["cycle_error"] = f"{exc.__class__.__name__}: {exc}"
            out["study"] = rv.compare(case.exchanger, case.service, list(case.options), **kwargs)
    return out


RATING_COLUMNS = [("duty", "power"), ("t_out_shell", "temperature"), ("t_out_tube", "temperature"),
                  ("U_clean", "htc"), ("U_service", "htc"), ("h_shell", "htc"), ("h_tube", "htc"),
                  ("dp_shell", "pressure"), ("dp_tube", "pressure"), ("velocity_tube", "velocity"),
                  ("velocity_shell", "velocity")]


def ratings_table(ratings: dict, system: str = "SI"):
    """A display table (pandas DataFrame) of named ratings in ``system`` units, one column per rating."""
    import pandas as pd

    from ..units import from_si

    rows = {}
    for label, r in ratings.items():
        col = {}
        for attr, kind in RATING_COLUMNS:
            value, unit = from_si(float(getattr(r, attr)), kind, system)
            col[f"{attr} [{unit}]"] = round(value, 3 if abs(value) < 100 else 1)
        rows[label] = col
    return pd.DataFrame(rows)


def breakdown_figure(ratings: dict, title: str = "Where the resistance to heat transfer lies"):
    """Stacked bars of the five series resistances (outside-area basis), one bar per named rating."""
    import plotly.graph_objects as go

    labels = [plot_text(k) for k in ratings]
    fig = go.Figure()
    names = list(next(iter(ratings.values())).resistances.index)
    for name in names:
        fig.add_bar(name=name, x=labels, y=[float(r.resistances[name]) * 1e4 for r in ratings.values()])
    fig.update_layout(barmode="stack", title=title, yaxis_title="resistance [10⁻⁴ m²·K/W, outside area]",
                      height=420, margin={"t": 50}, legend={"orientation": "h", "y": -0.2})
    return fig


def option_breakdown_figure(study):
    """The five resistances of the base case and of each option at the revamp conditions (rows of study.table)."""
    ratings = {str(k): study.ratings[k] for k in study.table.index if k in study.ratings}
    return breakdown_figure(ratings, "Resistances of each option at the revamp conditions")


def summary(result: dict) -> dict:
    """The few numbers the unit index shows for one exchanger (JSON-ready)."""
    case, today, rev = result["case"], result["today"], result["revamp"]
    target = case.target or {}
    text = ", ".join(f"{k} {v:.4g}" for k, v in target.items())
    if "duty" in target:
        text, meets = f"duty {target['duty'] / 1e3:,.0f} kW", float(rev.duty) >= target["duty"]
    elif "t_out_tube" in target:
        text = f"tube outlet {target['t_out_tube'] - 273.15:.1f} °C"
        hot_tube = float(case.revamp_service.tube.t_in) > float(case.revamp_service.shell.t_in)
        meets = (float(rev.t_out_tube) <= target["t_out_tube"]) if hot_tube else (float(rev.t_out_tube) >= target["t_out_tube"])
    elif "t_out_shell" in target:
        text = f"shell outlet {target['t_out_shell'] - 273.15:.1f} °C"
        hot_shell = float(case.revamp_service.shell.t_in) > float(case.revamp_service.tube.t_in)
        meets = (float(rev.t_out_shell) <= target["t_out_shell"]) if hot_shell else (float(rev.t_out_shell) >= target["t_out_shell"])
    else:
        meets = None
    out = {"tag": case.tag, "duty_today": float(today.duty), "duty_revamp": float(rev.duty), "target": text,
           "target_duty": target.get("duty"), "meets_target": meets, "recommendation": ""}
    study = result.get("study")
    if study is not None:
        out["recommendation"] = str(study.recommendation or "")
        if "meets_target" in study.table and "base" in study.table.index and target:
            out["meets_target"] = bool(study.table.loc["base", "meets_target"])
        if "screening" in study.table and "base" in study.table.index:
            out["screening_as_is"] = str(study.table.loc["base", "screening"])
    return out


def write_summary(path, result: dict) -> None:
    """Write :func:`summary` as JSON (atomically); ``path`` None does nothing."""
    if path:
        write_atomic(path, json.dumps(summary(result), indent=1))


def show(obj, interactive: bool = False):
    """Display a plotly figure or a DataFrame in a notebook: live plotly in Jupyter, offline HTML for the reports."""
    from IPython.display import HTML, display

    if hasattr(obj, "to_plotly_json"):
        if interactive:
            obj.show()
        else:
            display(HTML(figure_html(obj)))
    elif hasattr(obj, "to_html"):
        display(HTML(obj.to_html(escape=True, classes="rv-table", border=0)))
    else:
        display(HTML(f"<p>{esc(obj)}</p>"))


def case_header_html(case, unit) -> str:
    """Who the exchanger is and what it serves, as escaped HTML."""
    from ..units import format_quantity as fq

    ex, s = case.exchanger, case.service
    rows = [["unit", unit.name], ["exchanger", case.tag], ["description", case.description],
            ["shells (series × parallel)", f"{ex.shells} × {ex.shells_parallel}"],
            ["tubes", f"{ex.tube_count} × {fq(ex.tube_od, 'length')} od, {fq(ex.tube_length, 'length')}, "
                      f"{ex.tube_passes} pass(es)"],
            ["area (outside, all shells)", fq(ex.area_outside, "area")],
            ["shell side", f"{getattr(s.shell.fluid, 'name', '')}: {fq(s.shell.flow, 'mass_flow')}, "
                           f"in at {fq(s.shell.t_in, 'temperature')}"],
            ["tube side", f"{getattr(s.tube.fluid, 'name', '')}: {fq(s.tube.flow, 'mass_flow')}, "
                          f"in at {fq(s.tube.t_in, 'temperature')}"],
            ["revamp", f"throughput × {case.throughput:g}"]]
    return table_html(rows, ["", ""])


def unit_table(unit, system: str = "SI"):
    """All exchangers of a unit in one table: duty today and at revamp, U, pressure drops against the allowed."""
    import pandas as pd

    import revamp as rv

    from ..units import from_si

    rows = []
    for case in unit.exchangers:
        try:
            today, rev = rv.rate(case.exchanger, case.service), rv.rate(case.exchanger, case.revamp_service)
        except Exception as exc:
            rows.append({"exchanger": case.tag, "error": f"{exc.__class__.__name__}: {exc}"})
            continue
        p = lambda v: round(from_si(float(v), "pressure", system)[0], 1)
        q = lambda v: round(from_si(float(v), "power", system)[0], 0)
        rows.append({"exchanger": case.tag, "description": case.description,
                     f"duty today [{from_si(1, 'power', system)[1]}]": q(today.duty),
                     f"duty at revamp [{from_si(1, 'power', system)[1]}]": q(rev.duty),
                     "U in service [W/m²K]": round(float(rev.U_service), 0),
                     "controlling resistance": rev.controlling_resistance(),
                     f"dp shell / allowed [{from_si(1, 'pressure', system)[1]}]":
                         f"{p(rev.dp_shell)} / {p(case.limits['dp_shell']) if 'dp_shell' in case.limits else '-'}",
                     f"dp tube / allowed [{from_si(1, 'pressure', system)[1]}]":
                         f"{p(rev.dp_tube)} / {p(case.limits['dp_tube']) if 'dp_tube' in case.limits else '-'}"})
    return pd.DataFrame(rows).set_index("exchanger")


def unit_figure(table):
    """Duty today and at revamp for every exchanger of :func:`unit_table`."""
    import plotly.graph_objects as go

    cols = [c for c in table.columns if c.startswith("duty")]
    fig = go.Figure()
    for c in cols:
        fig.add_bar(name=c, x=[plot_text(t) for t in table.index], y=table[c])
    fig.update_layout(barmode="group", title="Duty of each exchanger today and at the revamp conditions",
                      yaxis_title=cols[0].split("[")[-1].rstrip("]") if cols else "", height=420)
    return fig


def monitoring_items(result: dict, system: str = "SI") -> list:
    """What the plant-data section shows: the findings, the row counts by reason, and the fouling figure."""
    import pandas as pd

    mon = result.get("monitoring")
    if mon is None:
        why = result.get("monitoring_error") or "the unit file gives no plant data for this exchanger"
        return [f"No plant-data analysis: {why}."]
    summ = mon.summary
    rows = {str(k)[len("rows: "):]: v for k, v in summ.items() if str(k).startswith("rows: ")}
    findings = {str(k): v for k, v in summ.items() if not str(k).startswith("rows: ") and str(k) != "warnings"}
    fmt = lambda v: f"{v:.4g}" if isinstance(v, float) else str(v)
    items = [pd.DataFrame({"value": [fmt(v) for v in findings.values()]}, index=list(findings)),
             pd.DataFrame({"rows": [int(v) for v in rows.values()]}, index=list(rows))]
    try:
        from .. import plots_monitoring as pm
    except ImportError:  # the plant-data figures module is optional here: fall back to the fouling chart alone
        items.append(rf_figure(mon))
    else:
        items += [pm.fouling_trend(mon, system), pm.heat_balance(mon), pm.duty_lost(mon, system)]
    warnings = summ.get("warnings") if "warnings" in summ else None
    if warnings:
        items.append(f"Notes from the analysis: {warnings}")
    return items


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


def study_items(result: dict, system: str = "SI") -> list:
    """What the options section shows: the comparison table in display units and the study figures."""
    study = result.get("study")
    if study is None:
        return ["The unit file lists no option for this exchanger."]
    from .. import plots

    items = [study_table(study, system), study_money_table(study)]
    if "duty_cycle_avg" in study.table:
        items.append((result.get("cycle") or {}).get("text") or
                     "duty_cycle_avg: the duty averaged over a run between cleanings; value, payback and NPV use it.")
    elif result.get("cycle_error"):
        items.append(f"No cycle-averaged duty (snapshot duties used for the money): {result['cycle_error']}.")
    elif result.get("monitoring") is not None:
        items.append("No cycle-averaged duty: no fouling trend could be fitted to the plant data; value, payback "
                     "and NPV use the snapshot duties.")
    return items + [plots.option_comparison(study, system), plots.resistance_breakdown(study),
                    plots.economics_chart(study)]


_STUDY_COLUMNS = [("duty", "power"), ("duty_gain", "power"), ("duty_cycle_avg", "power"), ("U_service", "htc"), ("t_out_shell", "temperature"),
                  ("t_out_tube", "temperature"), ("dp_shell", "pressure"), ("dp_tube", "pressure"),
                  ("velocity_tube", "velocity"), ("velocity_shell", "velocity")]


def study_table(study, system: str = "SI"):
    """The study table with physical columns in display units and the money and screening columns as they are."""
    import pandas as pd

    from ..units import from_si

    t = study.table
    out = pd.DataFrame(index=[str(i) for i in t.index])
    for col, kind in _STUDY_COLUMNS:
        if col in t:
            mag, unit = from_si(t[col].to_numpy(dtype=float), kind, system)
            out[f"{col} [{unit}]"] = [round(float(v), 3 if abs(v) < 100 else 1) for v in mag]
    if "controlling" in t:
        out["controlling resistance"] = t["controlling"].tolist()
    return out


def study_money_table(study):
    """Screening statuses, target, money and rank of each row of the study, with the one-line reason."""
    import pandas as pd

    t = study.table
    out = pd.DataFrame(index=[str(i) for i in t.index])
    cur = getattr(study.economics, "currency", "") or ""
    names = {"dp_shell_status": "dp shell", "dp_tube_status": "dp tube", "velocity_status": "tube velocity",
             "vibration_status": "vibration", "nozzle_status": "nozzle", "meets_target": "meets target",
             "capex": f"capex [{cur}]", "annual_value": f"value [{cur}/yr]", "payback": "payback [yr]",
             "npv": f"NPV [{cur}]", "rank": "rank", "reason": "why"}
    for col, name in names.items():
        if col in t:
            values = t[col].tolist()
            if col in ("capex", "annual_value", "npv"):
                values = ["" if pd.isna(v) else f"{v:,.0f}" for v in values]
            elif col == "payback":
                values = ["" if pd.isna(v) else f"{v:.2f}" for v in values]
            out[name] = values
    return out


def recommendation_html(result: dict) -> str:
    study = result.get("study")
    if study is None:
        return "<p>No option to compare.</p>"
    return f'<p class="rv-recommendation"><b>{esc(study.recommendation)}</b></p>'


