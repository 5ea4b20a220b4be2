"""The study of one condenser as the report shows it: the ratings today and at the revamp vapour load, the zones
(duty, area share, U), the condensing curve against the coolant line, the column-pressure answer, the options side by
side and the fouling from plant data. No physics here: the study is computed in :mod:`revamp.studies.condenser`
(which calls :func:`revamp.rating_condenser.rate_condenser`, :func:`revamp.rating_condenser.condensing_pressure_for`,
:func:`revamp.options_condenser.compare_condenser` and :mod:`revamp.monitoring_condenser`); this module formats it.

References
----------
Bell, K. J., and Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial
condensers. AIChE Symp. Ser. 69(131), 72-79.
"""
from __future__ import annotations

import json

import numpy as np

from ..studies.condenser import CondenserStudy, condenser_unit_ratings, run_condenser_case  # noqa: F401
from .pages import esc, write_atomic

__all__ = ["CondenserStudy", "condenser_header_html", "condenser_options_table", "condenser_ratings_table",
           "condenser_summary", "curve_figure", "monitoring_items", "pressure_items", "run_condenser_case",
           "unit_row", "write_condenser_summary", "zone_table"]

#: rows of the ratings table: (attribute, quantity kind, label)
CONDENSER_COLUMNS = [("duty", "power", "duty"), ("condensed", "mass_flow", "vapour condensed"),
                     ("quality_out", "dimensionless", "outlet vapour fraction"),
                     ("t_out_condensing", "temperature", "condensate outlet"),
                     ("t_out_coolant", "temperature", "coolant outlet"),
                     ("U_service", "htc", "U in service"), ("U_clean", "htc", "U clean"),
                     ("dp_condensing", "pressure", "condensing-side pressure drop"),
                     ("dp_coolant", "pressure", "coolant pressure drop"),
                     ("dt_sat_drop", "temperature_difference", "saturation-temperature drop")]


def _round(value):
    return round(value, 3 if abs(value) < 100 else 1) if np.isfinite(value) else value


def condenser_ratings_table(study: CondenserStudy, system: str = "SI"):
    """The ratings side by side: one column per rating, one row per quantity in ``system`` units (a DataFrame)."""
    import pandas as pd

    from ..units import from_si

    rows = {}
    for label, r in study.ratings.items():
        col = {}
        for attr, kind, name in CONDENSER_COLUMNS:
            value, unit = from_si(float(getattr(r, attr)), kind, system)
            col[f"{name} [{unit}]" if unit else name] = _round(float(value))
        rows[label] = col
    return pd.DataFrame(rows)


def zone_table(study: CondenserStudy, label: str = "today", system: str = "SI"):
    """One rating's zones: duty, area, area share, U and the temperatures in ``system`` units (a DataFrame)."""
    import pandas as pd

    from ..units import from_si

    z = study.ratings[label].zones
    out = {"zone": z["zone"].to_numpy()}
    for col, kind, name in (("duty", "power", "duty"), ("area", "area", "area"),
                            ("area_share", "dimensionless", "area share"), ("U", "htc", "U"),
                            ("t_in", "temperature", "condensing in"), ("t_out", "temperature", "condensing out"),
                            ("t_coolant_in", "temperature", "coolant in"),
                            ("t_coolant_out", "temperature", "coolant out"), ("dp", "pressure", "pressure drop")):
        if col in z:
            value, unit = from_si(z[col].to_numpy(float), kind, system)
            out[f"{name} [{unit}]" if unit else name] = np.round(value, 3)
    return pd.DataFrame(out).set_index("zone")


def curve_figure(study: CondenserStudy, system: str = "SI"):
    """Temperature against duty: the condensing stream along its path and the coolant, for today and at the revamp
    load (plotly), the zones marked."""
    import plotly.graph_objects as go

    from ..units import from_si

    fig = go.Figure()
    t_unit = from_si(300.0, "temperature", system)[1]
    q_unit = from_si(1.0, "power", system)[1]
    for label, dash in (("today", None), ("revamp", "dot")):
        if label not in study.ratings:
            continue
        inc = study.ratings[label].increments
        order = np.argsort(inc["T"].to_numpy(float))[::-1] if "duty" not in inc else np.arange(len(inc))
        inc = inc.iloc[order]
        duty = np.concatenate([[0.0], np.cumsum(inc["duty"].to_numpy(float))])
        T = inc["T"].to_numpy(float)
        Tc = inc["T_coolant"].to_numpy(float)
        Th = np.concatenate([T[:1], T])
        Tk = np.concatenate([Tc[:1], Tc])
        q = from_si(duty, "power", system)[0]
        fig.add_scatter(x=q, y=from_si(Th, "temperature", system)[0], mode="lines", name=f"condensing ({label})",
                        line={"color": "#c0392b", "dash": dash})
        fig.add_scatter(x=q, y=from_si(Tk, "temperature", system)[0], mode="lines", name=f"coolant ({label})",
                        line={"color": "#2471a3", "dash": dash})
    fig.update_layout(title="Condensing curve and coolant line (temperature against duty)",
                      xaxis_title=f"duty from the vapour inlet [{q_unit}]", yaxis_title=f"temperature [{t_unit}]",
                      height=420, margin={"t": 50})
    return fig


def pressure_items(study: CondenserStudy) -> list:
    """The column-pressure answer in plain words, and what it rests on."""
    items = [study.answer]
    if study.pressure is not None:
        items.append(f"Basis: {study.pressure.basis}.")
    return items


def condenser_options_table(study: CondenserStudy, system: str = "SI"):
    """:func:`~revamp.options_condenser.compare_condenser` in ``system`` units, or a line saying why there is
    none."""
    frame = study.options
    if frame is None:
        return study.options_error or "No options given in the unit file for this condenser."
    import pandas as pd

    from ..units import from_si

    kinds = {"duty": "power", "condensed": "mass_flow", "t_out_condensing": "temperature",
             "t_out_coolant": "temperature", "U_service": "htc", "dp_condensing": "pressure",
             "dp_coolant": "pressure", "dt_sat_drop": "temperature_difference", "area": "area",
             "condensing_pressure": "pressure", "condensing_temperature": "temperature"}
    out = {}
    for col in frame.columns:
        if col in kinds:
            value, unit = from_si(frame[col].to_numpy(float), kinds[col], system)
            out[f"{col.replace('_', ' ')} [{unit}]" if unit else col.replace("_", " ")] = np.round(value, 3)
        else:
            out[col.replace("_", " ")] = frame[col].to_numpy()
    return pd.DataFrame(out, index=frame.index)


def monitoring_items(study: CondenserStudy, system: str = "SI") -> list:
    """The plant-data findings and the fouling against time with its band (plotly), or why there are none."""
    m = study.monitoring
    if m is None:
        why = study.monitoring_error or "the unit file gives no plant data for this condenser"
        return [f"No plant-data analysis: {why}."]
    import pandas as pd
    import plotly.graph_objects as go

    u = m.used
    daily = u.set_index(pd.to_datetime(u["timestamp"]))[["Rf", "Rf_low", "Rf_high"]].resample("D").median().dropna()
    fig = go.Figure()
    fig.add_scatter(x=daily.index, y=daily["Rf_high"] * 1e4, mode="lines", line={"width": 0}, showlegend=False)
    fig.add_scatter(x=daily.index, y=daily["Rf_low"] * 1e4, mode="lines", line={"width": 0}, fill="tonexty",
                    name="band (one standard uncertainty)", fillcolor="rgba(36,113,163,0.2)")
    fig.add_scatter(x=daily.index, y=daily["Rf"] * 1e4, mode="lines", name="fouling (daily median)",
                    line={"color": "#2471a3"})
    basis = getattr(m, "basis", "coolant-side heat balance")
    fig.update_layout(title=f"Fouling resistance from plant data ({basis.split(' (')[0]})",
                      yaxis_title="Rf [10⁻⁴ m²·K/W, outside area]", height=400, margin={"t": 50})
    summary = pd.Series({k: (", ".join(f"{x:.3g}" for x in v) if isinstance(v, list) else v)
                         for k, v in m.summary.items()}, name="value").to_frame()
    return [summary, fig] + list(m.notes)


def condenser_header_html(case, unit, system: str = "SI") -> str:
    """Who the condenser is and what it condenses, as escaped HTML."""
    from ..units import format_quantity as fq

    ex, s, v = case.exchanger, case.service, case.vapour
    fluid = v.fluid
    p = getattr(fluid, "pressure", None)
    what = "air cooler" if case.coolant_side == "air" else f"shell and tube, vapour on the {case.condensing_side} side"
    inlet = (f"vapour fraction {v.quality:g}" if v.quality is not None
             else f"superheated, {fq(v.t_in, 'temperature', system)}")
    if case.coolant_side == "air":
        cool = f"air at {fq(s.air_in, 'temperature', system)}"
    else:
        c = getattr(s, case.coolant_side)
        cool = f"{esc(c.fluid.name)}, {fq(c.flow, 'mass_flow', system)} in at {fq(c.t_in, 'temperature', system)}"
    revamp = (f" Revamp vapour load {fq(case.vapour_load, 'mass_flow', system)} (x{case.throughput:.3g})."
              if case.vapour_load is not None else "")
    allowed = (f" Allowed condensing pressure {fq(case.allowed_pressure, 'pressure', system)}."
               if case.allowed_pressure is not None else
               f" Allowed dew point {fq(case.allowed_temperature, 'temperature', system)}."
               if case.allowed_temperature is not None else "")
    return (f"<h2>{esc(case.tag)}: {esc(case.description)}</h2>"
            f"<p>Unit: {esc(unit.name)}. Condenser ({esc(what)}), area {fq(float(study_area(case)), 'area', system)}."
            f"</p><p>Vapour: {esc(fluid.name)}"
            + (f" (condensing at {fq(p, 'pressure', system)})" if p is not None and " Pa" not in fluid.name else "")
            + f", {fq(v.flow, 'mass_flow', system)}, {esc(inlet)}. Coolant: {cool}.{esc(revamp)}{esc(allowed)}</p>")


def study_area(case) -> float:
    """The exchanger's area on its U basis [m²] (from its model)."""
    from ..exchanger import model_of

    return float(model_of(case.exchanger).area)


def condenser_summary(study: CondenserStudy) -> dict:
    """The few numbers the unit index shows for a condenser (JSON-ready)."""
    from ..units import format_quantity as fq

    case, today = study.case, study.ratings["today"]
    out = {"kind": "condenser", "duty_today": float(today.duty)}
    if "revamp" in study.ratings:
        out["duty_revamp"] = float(study.ratings["revamp"].duty)
    judged = study.ratings.get("revamp", today)
    limits = []
    for key, attr in (("condensing", "dp_condensing"), ("coolant", "dp_coolant")):
        allowed = (case.dp_allowed or {}).get(key)
        if allowed is not None and float(getattr(judged, attr)) > allowed:
            limits.append(f"{key} dp above allowed")
    out["screening_as_is"] = ", ".join(limits) if limits else ("ok" if case.dp_allowed else "-")
    if study.pressure is not None:
        out["condensing_pressure"] = float(study.pressure.pressure)
    if case.allowed_pressure is not None or case.allowed_temperature is not None:
        out["target"] = (f"condensing pressure <= {fq(case.allowed_pressure, 'pressure')}"
                         if case.allowed_pressure is not None else
                         f"dew point <= {fq(case.allowed_temperature, 'temperature')}")
        out["target"] += f" at {fq(study.vapour_load, 'mass_flow')}"
        if study.holds is not None:
            out["meets_target"] = bool(study.holds)
        frame = study.options
        if frame is not None and "condensing_pressure" in frame:
            col, limit = (("condensing_pressure", case.allowed_pressure) if case.allowed_pressure is not None
                          else ("condensing_temperature", case.allowed_temperature))
            ok = [k for k, v in frame[col].items() if k != "base" and np.isfinite(v) and v <= limit]
            out["recommendation"] = ("holding the allowed pressure: " + ", ".join(ok)) if ok else (
                "no option holds the allowed pressure")
    return out


def write_condenser_summary(path, study: CondenserStudy) -> None:
    """Write :func:`condenser_summary` as JSON (atomically); ``path`` None does nothing."""
    if path:
        write_atomic(path, json.dumps(condenser_summary(study), indent=1))


def unit_row(case, system: str = "SI") -> dict:
    """A condenser's row of the unit table (:func:`revamp.report.unit_table`): duty today and at the revamp load, U,
    and the pressure drops at the revamp load against the allowed."""
    from ..units import from_si

    r, rev = condenser_unit_ratings(case)
    p = lambda v: round(from_si(float(v), "pressure", system)[0], 1)  # noqa: E731
    q = lambda v: round(from_si(float(v), "power", system)[0], 0)  # noqa: E731
    j = rev or r
    dp = case.dp_allowed or {}
    pu, qu = from_si(1, "pressure", system)[1], from_si(1, "power", system)[1]
    return {"exchanger": case.tag, "description": case.description, f"duty today [{qu}]": q(r.duty),
            **({f"duty at revamp [{qu}]": q(rev.duty)} if rev is not None else {}),
            "U in service [W/m²K]": round(float(j.U_service), 0),
            f"dp {case.condensing_side} / allowed [{pu}]":
                f"{p(j.dp_condensing)} / {p(dp['condensing']) if 'condensing' in dp else '-'}",
            **({f"dp {case.coolant_side} / allowed [{pu}]":
                f"{p(j.dp_coolant)} / {p(dp['coolant']) if 'coolant' in dp else '-'}"}
               if case.coolant_side != "air" else {})}
