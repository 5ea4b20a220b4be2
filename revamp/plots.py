"""Plotly figures of a comparison study: options side by side, resistance breakdown, economics.

Plain plotly (``plotly.graph_objects``), white background, large fonts and patterns that survive printing in grey.
No physics here: every number comes from a :class:`~revamp.study.Study`. Saving (with the plotly.js bundle inline,
no CDN) is the report's business.
"""
from __future__ import annotations

import html
import math

import plotly.graph_objects as go
from plotly.subplots import make_subplots

from .report.labels import RESISTANCE_COLOURS, rescale, resistance_axis
from .screening import DEFAULT_DP_LIQUID
from .units import from_si, to_si

__all__ = ["economics_chart", "option_comparison", "resistance_breakdown"]

_LAYOUT = {"template": "simple_white", "font": {"size": 14},
               "legend": {"orientation": "h", "yanchor": "bottom", "y": 1.08, "xanchor": "right", "x": 1.0},
               "margin": {"l": 70, "r": 30, "t": 110, "b": 40}}
_STATUS_COLOUR = {"ok": "#4d7ea8", "warn": "#e0a030", "fail": "#b03030", "n/a": "#999999"}
_PATTERN = {"ok": "", "warn": "/", "fail": "x", "n/a": "."}
_RES_COLOUR = RESISTANCE_COLOURS
_STATUS_WORDS = {"ok": "within limits", "warn": "near a limit", "fail": "over a limit", "n/a": "not screened"}


def _text(label) -> str:
    """User text (an option label, a currency) for plotly: ``<``, ``>``, ``&`` escaped so that plotly shows it as
    written instead of reading tags in it (plotly decodes the entities back for display)."""
    return html.escape(str(label), quote=False)


def _labels(index) -> list:
    return [_text(k) for k in index]


def _conv(values, kind, units):
    """Values [SI] in the display unit of their quantity (kW -> MW, Btu/h -> MMBtu/h, see report.labels)."""
    mag, label = from_si(list(values), kind, units)
    factor, label = rescale(label)
    mag = [float(v) * factor for v in (mag if hasattr(mag, "__len__") else [mag])]
    return mag, label


def _allowed(study, side):
    value = getattr(study.limits, f"dp_{side}")
    return DEFAULT_DP_LIQUID if value is None else float(to_si(value, "pressure", f"dp_{side}"))


def option_comparison(study, units="SI") -> go.Figure:
    """Duty of the base case and each option against the target, and both pressure drops against the allowed.

    Bars are coloured and patterned by the worst screening status (ok / warn / fail).

    Parameters
    ----------
    study : Study
    units : {"SI", "US"}
    """
    t = study.table
    labels = _labels(t.index)
    fig = make_subplots(rows=1, cols=2, subplot_titles=("Duty", "Pressure drop"), horizontal_spacing=0.12)
    duty, dlabel = _conv(t["duty"], "power", units)
    status = list(t["screening"])
    # one trace per status, each with one colour and one pattern (a pattern over a list of colours makes plotly.js
    # log "Invalid color specifier" and may draw the bars black); offsetgroup keeps them in one slot per option
    for st in [s for s in _STATUS_COLOUR if s in status]:
        ys = [d if s == st else None for d, s in zip(duty, status)]
        fig.add_trace(go.Bar(x=labels, y=ys, name=_STATUS_WORDS[st], offsetgroup="duty", legendgroup="status",
                             marker={"color": _STATUS_COLOUR[st], "pattern": {"shape": _PATTERN[st]}},
                             text=[_STATUS_WORDS[st] if s == st else "" for s in status], textposition="outside",
                             cliponaxis=False), row=1, col=1)
    if study.target is not None and study.target.kind == "duty":
        tv, _ = _conv([study.target.value], "power", units)
        fig.add_hline(y=tv[0], line={"dash": "dash", "color": "black", "width": 2}, opacity=1.0,
                      annotation_text="target", row=1, col=1)
    allowed = {side: _conv([_allowed(study, side)], "pressure", units)[0][0] for side in ("shell", "tube")}
    same = math.isclose(allowed["shell"], allowed["tube"], rel_tol=1e-9)
    for side, colour, pattern in (("shell", "#1b4f72", ""), ("tube", "#5dade2", "/")):
        dp, plabel = _conv(t[f"dp_{side}"], "pressure", units)
        fig.add_trace(go.Bar(x=labels, y=dp, name=f"ΔP {side}", marker={"color": colour, "pattern_shape": pattern},
                             offsetgroup=side), row=1, col=2)
        if same and side == "tube":
            continue  # one line for both sides: two labels on one line would overlap
        # width and opacity given: the simple_white template draws shapes with no line (width 0) at 30 % opacity
        text = "allowed, both sides" if same else f"allowed {side}"
        fig.add_hline(y=allowed[side], line={"dash": "dot" if side == "shell" else "dash",
                                             "color": "black" if same else colour, "width": 2},
                      opacity=1.0, annotation_text=text,
                      annotation_position="top left" if side == "shell" else "top right", row=1, col=2)
    fig.update_yaxes(title_text=f"duty [{dlabel}]", row=1, col=1)
    fig.update_yaxes(title_text=f"ΔP [{plabel}]", row=1, col=2)
    title = "Options at the revamp conditions"
    if study.target is not None:
        title += f" (target {study.target.kind} {study.target.describe()})"
    fig.update_layout(title=title, barmode="group", **_LAYOUT)
    fig.update_xaxes(tickangle=-30, automargin=True)
    return fig


def resistance_breakdown(study, share=False, units="SI") -> go.Figure:
    """Stacked bars of the five series resistances per case (outside basis): which resistance each option attacks.

    Parameters
    ----------
    study : Study
    share : bool
        Plot each resistance's share of the total instead of its value (on the same axis unit as every resistance
        chart of the reports: 10⁻⁴ m²·K/W in SI, 10⁻³ h·ft²·°F/Btu in US units).
    units : {"SI", "US"}
    """
    r = study.resistances
    factor, unit = resistance_axis(units)
    r = r.div(r.sum(axis=1), axis=0) if share else r * factor
    fig = go.Figure()
    for name in r.columns:
        fig.add_trace(go.Bar(x=_labels(r.index), y=list(r[name]), name=name, marker_color=_RES_COLOUR.get(name)))
    fig.update_layout(barmode="stack", title="Resistance breakdown (outside area basis)",
                      yaxis_title="share of 1/U [-]" if share else f"resistance [{unit}, outside area]", **_LAYOUT)
    fig.update_xaxes(tickangle=-30, automargin=True)
    return fig


def economics_chart(study) -> go.Figure:
    """Simple payback and NPV of each option.

    Options that never pay back are shown at zero height with the label "no payback". A study without economics
    gives an empty chart that says so.
    """
    if study.economics is None:  # an empty chart that says why, so that a report can always show the section
        fig = go.Figure()
        fig.add_annotation(text="No economics given: no cost, value or payback.", showarrow=False, x=0.5, y=0.5,
                           xref="paper", yref="paper", font={"size": 16})
        fig.update_layout(title="Economics of the options", xaxis_visible=False, yaxis_visible=False, **_LAYOUT)
        return fig
    t = study.table.drop(index="base")
    cur = f" [{_text(study.economics.currency)}]" if study.economics.currency else ""
    labels = _labels(t.index)
    fig = make_subplots(rows=1, cols=2, subplot_titles=("Simple payback", "NPV"), horizontal_spacing=0.12)
    pb = [p if math.isfinite(p) else 0.0 for p in t["payback"]]
    txt = [f"{p:.2g} y" if math.isfinite(p) else "no payback" for p in t["payback"]]
    fig.add_trace(go.Bar(x=labels, y=pb, text=txt, textposition="outside", marker_color="#4d7ea8",
                         showlegend=False), row=1, col=1)
    fig.add_trace(go.Bar(x=labels, y=list(t["npv"]), marker_color=["#4d7ea8" if v >= 0 else "#b03030"
                                                                        for v in t["npv"].fillna(0)],
                         showlegend=False), row=1, col=2)
    fig.update_yaxes(title_text="payback [years]", row=1, col=1)
    fig.update_yaxes(title_text=f"NPV{cur}", row=1, col=2)
    fig.update_layout(title="Economics of the options", **_LAYOUT)
    fig.update_xaxes(tickangle=-30, automargin=True)
    return fig
