"""The study of one air cooler as the report shows it: ratings in service and clean (today and on the hottest day of
the sweep), the resistances in series, the hot-day sweep with the ambient at which the target outlet is lost, the
options side by side, and the fouling history from the plant data with its band.

No physics here: the study is computed in :mod:`revamp.studies.air` (which calls
:func:`revamp.rate`, :func:`revamp.hot_day.hot_day` and :func:`revamp.options_air.compare_air`); this module formats
it.

References
----------
Briggs, D. E., and Young, E. H. (1963). Convection heat transfer and pressure drop of air flowing across triangular
pitch banks of finned tubes. Chem. Eng. Prog. Symp. Ser. 59(41), 1-10 (the default air-side method of the rating).
"""
from __future__ import annotations

import json
import re
from dataclasses import dataclass, field

import numpy as np

from ..studies.air import AirStudy, _interpolated_limit, _limit_text, air_unit_ratings, run_air_case  # noqa: F401
from .case import breakdown_figure
from .pages import esc, write_atomic

__all__ = ["AirStudy", "air_fouling_figure", "air_header_html", "air_options_table", "air_ratings_table",
           "air_summary", "breakdown_items", "hot_day_items", "monitoring_items", "options_items", "run_air_case",
           "unit_row", "write_air_summary"]

#: rows of the ratings table: (attribute, quantity kind, label)
AIR_COLUMNS = [("duty", "power", "duty"), ("t_out_tube", "temperature", "tube outlet"),
               ("t_out_air", "temperature", "air outlet (mixed)"), ("U_service", "htc", "U in service (bare area)"),
               ("U_clean", "htc", "U clean (bare area)"), ("h_air", "htc", "air film (finned surface)"),
               ("fin_efficiency", "dimensionless", "fin efficiency"), ("h_tube", "htc", "tube film"),
               ("dp_air", "pressure", "air pressure drop"), ("dp_tube", "pressure", "tube pressure drop"),
               ("fan_power", "power", "fan shaft power"), ("velocity_face", "velocity", "face velocity"),
               ("velocity_tube", "velocity", "tube velocity"), ("F", "dimensionless", "F correction"),
               ("effectiveness", "dimensionless", "effectiveness")]


def air_ratings_table(study: AirStudy, system: str = "SI"):
    """The ratings side by side: one column per rating, one row per quantity in ``system`` units (a DataFrame)."""
    import pandas as pd

    from ..units import from_si

    rows = {}
    for label, r in study.ratings.items():
        col = {}
        for attr, kind, name in AIR_COLUMNS:
            value, unit = from_si(float(getattr(r, attr)), kind, system)
            col[f"{name} [{unit}]" if unit else name] = round(value, 3 if abs(value) < 100 else 1)
        rows[label] = col
    return pd.DataFrame(rows)


def breakdown_items(study: AirStudy) -> list:
    """The resistances in series on the bare outside-tube area, stacked per rating, and the controlling one."""
    fig = breakdown_figure(study.ratings, "Where the resistance to heat transfer lies (bare outside-tube area)")
    r = study.ratings["today"]
    return [fig, f"Controlling resistance today: {r.controlling_resistance()}."]


def hot_day_items(study: AirStudy, system: str = "SI") -> list:
    """The hot-day sweep as a table and a chart, and the ambient at which the target outlet is lost."""
    if study.hot is None:
        return ["No hot-day sweep: the unit file gives no hot_day section for this air cooler."]
    basis = f"Rated at {study.basis}."
    from ..plots_air import hot_day_chart
    from ..units import from_si

    frame = study.hot.to_frame()
    shown = {}
    for col, kind in (("ambient", "temperature"), ("t_out_tube", "temperature"), ("t_out_air", "temperature"),
                      ("duty", "power"), ("fan_power", "power")):
        value, unit = from_si(frame[col].to_numpy(float), kind, system)
        shown[f"{col.replace('_', ' ')} [{unit}]"] = value
    import pandas as pd

    table = pd.DataFrame(shown).set_index(next(iter(shown)))
    return [basis, study.hot_note, table, hot_day_chart(study.hot, units=system)] + list(study.hot.notes)


def air_options_table(study: AirStudy, system: str = "SI", hottest: bool = False):
    """:func:`~revamp.options_air.compare_air` in ``system`` units (today, or on the hottest day of the sweep with
    ``hottest``), or a line saying why there is none."""
    frame = study.options_hot if hottest else study.options
    if frame is None:
        if hottest and study.options is not None:
            return "No hot-day sweep: the options are compared at today's ambient only."
        return study.options_error or "No options given in the unit file for this air cooler."
    import pandas as pd

    from ..units import from_si

    kinds = {"duty": "power", "t_out_tube": "temperature", "t_out_air": "temperature", "U_service": "htc",
             "dp_air": "pressure", "dp_tube": "pressure", "fan_power": "power", "air_flow": "mass_flow",
             "area": "area", "velocity_tube": "velocity"}
    out = {}
    for col in frame.columns:
        if col in kinds:
            value, unit = from_si(frame[col].to_numpy(float), kinds[col], system)
            out[f"{col.replace('_', ' ')} [{unit}]"] = value
        else:
            out[col] = frame[col].to_numpy()
    return pd.DataFrame(out, index=frame.index)


def options_items(study: AirStudy, system: str = "SI") -> list:
    """The options compared at today's ambient and, with a sweep, on its hottest day, each table with its caption."""
    from ..units import format_quantity as fq

    case = study.case
    items = [f"Rated at {study.basis}.", f"At today's ambient ({fq(case.service.air_in, 'temperature', system)}):",
             air_options_table(study, system)]
    if study.options_hot is not None:
        items += [f"On the hottest day of the sweep ({fq(max(case.hot_day_ambient), 'temperature', system)}):",
                  air_options_table(study, system, hottest=True)]
    return items


def air_fouling_figure(mon, system: str = "SI"):
    """The fouling from the plant data against time: daily medians of the used rows with their band (one standard
    uncertainty, mostly the stated air flow's), and a straight line through the data (plotly)."""
    import pandas as pd
    import plotly.graph_objects as go

    from ..units import from_si

    used = mon.used
    daily = used.set_index(pd.to_datetime(used["timestamp"]))[["Rf", "Rf_low", "Rf_high"]].resample("1D").median()
    daily = daily.dropna()
    scale, unit = from_si(1.0, "fouling", system)
    x = list(daily.index)
    fig = go.Figure()
    fig.add_scatter(x=x, y=daily["Rf_high"] * scale, mode="lines", line={"width": 0}, showlegend=False,
                    hoverinfo="skip")
    fig.add_scatter(x=x, y=daily["Rf_low"] * scale, mode="lines", line={"width": 0}, fill="tonexty",
                    fillcolor="rgba(77,126,168,0.25)",
                    name="band (air flow and temperatures, ±1 standard uncertainty)")
    fig.add_scatter(x=x, y=daily["Rf"] * scale, mode="markers", marker={"size": 4}, name="Rf from the data "
                                                                                          "(daily median)")
    trend = mon.trend()
    if trend is not None and len(x):
        t0 = pd.to_datetime(used["timestamp"]).iloc[0]
        secs = np.array([(t - t0).total_seconds() for t in x])
        fig.add_scatter(x=x, y=(trend[1] + trend[0] * secs) * scale, mode="lines",
                        name="straight line through the data")
    fig.update_layout(title="Fouling of the air cooler from plant data (tube-side heat balance)",
                      yaxis_title=f"Rf [{unit}, bare outside-tube area]", height=420,
                      legend={"orientation": "h", "y": -0.2})
    return fig


def monitoring_items(study: AirStudy, system: str = "SI") -> list:
    """What the plant-data section shows: how the air flow was known and how wide that makes the band, the findings,
    the row counts by reason, the fouling history, and the notes of the analysis."""
    import pandas as pd

    from ..units import format_quantity as fq

    mon = study.monitoring
    if mon is None:
        why = study.monitoring_error or "the unit file gives no plant data for this air cooler"
        return [f"No plant-data analysis: {why}."]
    source = {"stated": "stated in the unit file (not measured)", "measured": "measured (the air_flow column)",
              "fan_power": "scaled from the measured fan power by the fan laws"}[mon.air_flow_from]
    items = [f"The duty comes from the tube side (flow, inlet, outlet); the air flow is {source}, the ambient is "
             "measured. The band is wider than for a shell-and-tube exchanger: it carries "
             f"±{mon.air_flow_uncertainty:.0%} on the air flow and ±{fq(mon.t_uncertainty, 'temperature_difference', system)} on each temperature "
             "(one standard uncertainty each, combined in quadrature)."]
    summ = mon.summary
    shown = {}
    for key, value in summ.items():
        if "[m²K/W]" in key:
            name = key.replace(" [m²K/W]", "")
            shown[name] = (" to ".join(fq(v, "fouling", system) for v in value) if isinstance(value, list)
                           else fq(value, "fouling", system))
        elif key in ("air flow uncertainty [-]", "temperature uncertainty [K]"):
            continue
        else:
            shown[key] = str(value)
    items.append(pd.DataFrame({"value": list(shown.values())}, index=list(shown)))
    counts = {k: v for k, v in mon.counts.items() if k not in ("rows", "valid", "steady", "used")}
    if counts:
        items.append(pd.DataFrame({"rows": [int(v) for v in counts.values()]}, index=list(counts)).rename_axis(
            "rows set aside, by reason"))
    if mon.steady is not None:
        items.append(f"Steady-state filter: window {mon.steady.window / 3600:g} h, tube and air flows within "
                     f"{mon.steady.flow_rsd:.1%} (relative standard deviation), tube inlet and ambient within "
                     f"{mon.steady.t_range:g} K; {mon.steady.removed} of {mon.steady.checked} valid row(s) removed.")
    if len(mon.used):
        items.append(air_fouling_figure(mon, system))
    items += [f"Note: {n}" for n in mon.notes]
    return items


def air_header_html(case, unit, system: str = "SI", inlets: str = "") -> str:
    """Who the air cooler is and what it serves, as escaped HTML."""
    from ..units import format_quantity as fq

    ex, s = case.exchanger, case.service
    air = f"air flow {fq(s.air_flow, 'mass_flow', system)}" if s.air_flow is not None else (
        f"face velocity {fq(s.face_velocity, 'velocity', system)}")
    lines = [f"<h2>{esc(case.tag)}: {esc(case.description)}</h2>",
             f"<p>Unit: {esc(unit.name)}. Air cooler, {ex.draft} draft: {ex.bays} bay(s) x {ex.bundles_per_bay} "
             f"bundle(s), {ex.tube_rows} tube rows of {ex.tubes_per_row} tubes, {ex.tube_passes} passes, "
             f"{ex.fans_per_bay} fan(s) per bay.</p>",
             f"<p>Tube side: {esc(s.tube.fluid.name)}, {fq(s.tube.flow, 'mass_flow', system)} in at "
             f"{fq(s.tube.t_in, 'temperature', system)}, fouling {fq(s.fouling_tube, 'fouling', system)}. Air: ambient "
             f"{fq(s.air_in, 'temperature', system)}, {esc(air)}, fouling {fq(s.fouling_air, 'fouling', system)}.</p>"]
    if inlets:
        lines.append(f"<p>{esc(inlets)}</p>")
    return "".join(lines)


def air_summary(study: AirStudy) -> dict:
    """The few numbers the unit index shows for an air cooler (JSON-ready)."""
    from ..units import format_quantity as fq

    case, today = study.case, study.ratings["today"]
    out = {"kind": "air cooler", "duty_today": float(today.duty)}
    if "revamp" in study.ratings:
        out["duty_revamp"] = float(study.ratings["revamp"].duty)
        today = study.ratings["revamp"]  # the limits are judged at the revamp conditions
    allowed = case.dp_allowed_tube
    out["screening_as_is"] = ("-" if allowed is None else
                              "ok" if float(today.dp_tube) <= allowed else "tube dp above allowed")
    if case.t_out_target is not None:  # judged on the hottest day of the sweep when there is one
        hot = "hottest day" in study.ratings
        r, when = (study.ratings["hottest day"], "on the hottest day") if hot else (today, "at today's ambient")
        amb = fq(r.service.air_in, "temperature")
        out["target"] = f"tube outlet <= {fq(case.t_out_target, 'temperature')} at {amb} ambient"
        out["meets_target"] = bool(float(r.t_out_tube) <= case.t_out_target)
        frame = study.options_hot if hot else study.options
        if frame is not None:
            ok = [f"{k} ({fq(v, 'temperature')})" for k, v in frame["t_out_tube"].items()
                  if k != "base" and v <= case.t_out_target]
            out["recommendation"] = (f"meeting the target {when}: " + ", ".join(ok)) if ok else (
                f"no option meets the target {when}")
    if study.hot is not None and study.hot.ambient_limit is not None and np.isfinite(study.hot.ambient_limit):
        out["ambient_limit"] = float(study.hot.ambient_limit)
    mon = study.monitoring
    if mon is not None:  # the fouling the plant data show, as for a shell-and-tube exchanger's report
        summ = mon.summary
        if "fouling, last week (median) [m²K/W]" in summ:
            out["fouling_now"] = summ["fouling, last week (median) [m²K/W]"]
            out["fouling_band"] = summ["band, last week (median) [m²K/W]"]
    elif study.monitoring_error:
        out["monitoring_error"] = study.monitoring_error
    return out


def write_air_summary(path, study: AirStudy) -> None:
    """Write :func:`air_summary` as JSON (atomically); ``path`` None does nothing."""
    if path:
        write_atomic(path, json.dumps(air_summary(study), indent=1))


def unit_row(case, system: str = "SI") -> dict:
    """An air cooler's row of the unit table (:func:`revamp.report.unit_table`): duty today and at revamp (when the
    unit file gives a revamp section), U, controlling resistance and tube pressure drop at the revamp conditions."""
    from ..units import from_si

    r, rev = air_unit_ratings(case)
    p = lambda v: round(from_si(float(v), "pressure", system)[0], 1)  # noqa: E731
    q = lambda v: round(from_si(float(v), "power", system)[0], 0)  # noqa: E731
    allowed = p(case.dp_allowed_tube) if case.dp_allowed_tube is not None else "-"
    return {"exchanger": case.tag, "description": case.description,
            f"duty today [{from_si(1, 'power', system)[1]}]": q(r.duty),
            **({f"duty at revamp [{from_si(1, 'power', system)[1]}]": q(rev.duty)} if rev is not None else {}),
            "U in service [W/m²K]": round(float((rev or r).U_service), 0),
            "controlling resistance": (rev or r).controlling_resistance(),
            f"dp tube / allowed [{from_si(1, 'pressure', system)[1]}]": f"{p((rev or r).dp_tube)} / {allowed}"}
