"""Plotly figures for air coolers: the hot-day chart (layer 7, presentation; no physics).

The numbers come from a :class:`revamp.hot_day.HotDay`; the figure shows the tube outlet and the duty against the
ambient, the target outlet and the ambient at which it is lost.
"""
from __future__ import annotations

import math

import plotly.graph_objects as go
from plotly.subplots import make_subplots

from .units import from_si

__all__ = ["CAUTION", "hot_day_chart"]

#: printed under every air-cooler chart
CAUTION = ("Screening-level rating. Fan, motor and structure capacity, the mechanical design, vibration and noise, and "
           "code compliance are to be verified by licensed engineers.")

_LAYOUT = {"template": "simple_white", "font": {"size": 14},
           "legend": {"orientation": "h", "yanchor": "bottom", "y": 1.08, "xanchor": "right", "x": 1.0},
           "margin": {"l": 70, "r": 70, "t": 110, "b": 50}}


def hot_day_chart(hd, units="SI", title="Hot-day limit") -> go.Figure:
    """Tube outlet (left axis) and duty (right axis) against the ambient, with the target and the limit.

    Parameters
    ----------
    hd : HotDay
        From :func:`revamp.hot_day.hot_day`.
    units : {"SI", "US"}
    title : str
    """
    amb, t_unit = from_si(hd.ambient, "temperature", units)
    t_out, _ = from_si(hd.t_out_tube, "temperature", units)
    duty, d_unit = from_si(hd.duty, "power", units)
    fig = make_subplots(specs=[[{"secondary_y": True}]])
    fig.add_trace(go.Scatter(x=list(amb), y=list(t_out), name="tube outlet", mode="lines+markers",
                             line={"color": "#b03030", "width": 3}), secondary_y=False)
    fig.add_trace(go.Scatter(x=list(amb), y=list(duty), name="duty", mode="lines",
                             line={"color": "#4d7ea8", "width": 2, "dash": "dash"}), secondary_y=True)
    if hd.t_out_target is not None:
        target, _ = from_si(hd.t_out_target, "temperature", units)
        fig.add_hline(y=float(target), line={"color": "#555555", "dash": "dot"},
                      annotation_text=f"target {float(target):.1f} {t_unit}", secondary_y=False)
        if hd.ambient_limit is not None and math.isfinite(hd.ambient_limit):
            lim, _ = from_si(hd.ambient_limit, "temperature", units)
            fig.add_vline(x=float(lim), line={"color": "#b03030", "dash": "dot"},
                          annotation_text=f"target lost above {float(lim):.1f} {t_unit} ambient")
    fig.add_annotation(text=CAUTION, xref="paper", yref="paper", x=0.0, y=-0.22, showarrow=False,
                       font={"size": 11, "color": "#555555"}, xanchor="left")
    fig.update_layout(title=title, **{**_LAYOUT, "margin": {**_LAYOUT["margin"], "b": 110}})
    fig.update_xaxes(title_text=f"ambient [{t_unit}]")
    fig.update_yaxes(title_text=f"tube outlet [{t_unit}]", secondary_y=False)
    fig.update_yaxes(title_text=f"duty [{d_unit}]", secondary_y=True)
    return fig
