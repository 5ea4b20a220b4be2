"""The cleaning page of a batch: when each bundle is cleaned, what the furnace sees, what each policy costs.

Formats a :class:`revamp.cleaning.CleaningPlan`; computes nothing.
"""
from __future__ import annotations

import html

import numpy as np
import plotly.graph_objects as go
from plotly.subplots import make_subplots

from .pages import esc, figure_html, page, table_html

__all__ = ["cleaning_figure", "furnace_figure", "cost_rows", "cleaning_page"]

_POLICY_STYLE = {"plan": dict(color="#1b4f72", width=3), "no cleaning": dict(color="#b03030", width=1.5, dash="dot"),
                 "each bundle at its own optimum interval": dict(color="#7d6608", width=1.5, dash="dash"),
                 "all bundles at one fixed interval": dict(color="#6c3483", width=1.5, dash="dashdot")}


def _t(text) -> str:
    return html.escape(str(text), quote=False)


def cleaning_figure(plan) -> go.Figure:
    """A bar per cleaning on a time axis, one row per bundle (turnaround cleanings hatched)."""
    fig = go.Figure()
    c = plan.cleanings
    tags = list(dict.fromkeys([col[3:] for col in plan.timeline.columns if col.startswith("Rf ")]))
    for at_t, name, colour, pattern in ((False, "cleaning (bundle bypassed)", "#1b4f72", ""),
                                        (True, "cleaning at the turnaround", "#7f8c8d", "/")):
        part = c[c["at_turnaround"] == at_t]
        if part.empty:
            continue
        length_ms = (part["end"] - part["start"]).dt.total_seconds().to_numpy() * 1000.0
        fig.add_trace(go.Bar(
            base=part["start"].astype("datetime64[ms]").astype(str).tolist(), x=length_ms, y=[_t(t) for t in part["tag"]],
            orientation="h", name=name, marker=dict(color=colour, pattern=dict(shape=pattern)),
            hovertext=[f"{_t(t)}: {s:%Y-%m-%d} to {e:%Y-%m-%d}" for t, s, e in zip(part["tag"], part["start"],
                                                                                      part["end"])],
            hoverinfo="text"))
    fig.update_layout(template="simple_white", barmode="overlay", height=120 + 32 * max(len(tags), 1),
                      title="When each bundle is cleaned", xaxis=dict(type="date", title="date"),
                      yaxis=dict(categoryorder="array", categoryarray=[_t(t) for t in reversed(tags)]),
                      legend=dict(orientation="h", y=1.12, x=1.0, xanchor="right"), margin=dict(l=90, r=30, t=90))
    return fig


def furnace_figure(plan) -> go.Figure:
    """Furnace inlet temperature [°C] and fired duty [MW] over the horizon, the plan beside the reference policies."""
    fig = make_subplots(rows=2, cols=1, shared_xaxes=True, vertical_spacing=0.08,
                        subplot_titles=("Furnace inlet temperature [°C]", "Fired duty [MW]"))
    for name, part in plan.policies.groupby("policy", sort=False):
        style = _POLICY_STYLE.get(name, dict(color="#555", width=1))
        fig.add_trace(go.Scatter(x=part["date"], y=part["furnace_inlet"] - 273.15, name=_t(name), mode="lines",
                                 line=dict(shape="hv", **style), legendgroup=_t(name)), row=1, col=1)
        fig.add_trace(go.Scatter(x=part["date"], y=part["furnace_duty"] / 1e6, name=_t(name), mode="lines",
                                 line=dict(shape="hv", **style), legendgroup=_t(name), showlegend=False), row=2, col=1)
    fig.update_layout(template="simple_white", height=560, legend=dict(orientation="h", y=1.14, x=1.0,
                                                                      xanchor="right"),
                      margin=dict(l=70, r=30, t=110))
    return fig


def _money(x, currency) -> str:
    return f"{x:,.0f} {currency}".strip() if np.isfinite(x) else "n/a"


def cost_rows(plan) -> list:
    """Rows of the cost table: each policy's fuel, cleaning, lost throughput, total and number of cleanings."""
    cur = plan.currency
    rows = []
    for name, r in plan.compare.iterrows():
        rows.append([name, _money(r["fuel"], cur), _money(r["cleaning"], cur), _money(r["lost_throughput"], cur),
                     _money(r["total"], cur), f"{int(r['cleanings'])}"])
    return rows


def cleaning_page(plan, title: str, prov: dict | None = None, plotly_src: str = "plotly.min.js") -> str:
    """The whole HTML page of a cleaning plan."""
    c = plan.cleanings
    listing = table_html([[t, f"{s:%Y-%m-%d}", f"{e:%Y-%m-%d}", "yes" if at_t else "no", _money(k, plan.currency)]
                          for t, s, e, at_t, k in c[["tag", "start", "end", "at_turnaround", "cost"]].itertuples(
                              index=False)],
                         ["bundle", "out of service from", "back in service", "at the turnaround", "cleaning cost"])
    body = [
        "<p>Which bundle to clean when, found by a mixed-integer programme on the linearised train and a local search "
        "on the full train (every period rated by the engine); each reference policy is rated the same way.</p>",
        f"<p>{esc(plan.optimality.describe())}</p>",
        "<h2>Cost over the horizon</h2>",
        table_html(cost_rows(plan), ["policy", "extra fired fuel", "cleaning", "lost throughput", "total",
                                     "cleanings"]),
        "<h2>Schedule</h2>", figure_html(cleaning_figure(plan), div_id="cleaning-gantt"),
        "<h2>What the furnace sees</h2>", figure_html(furnace_figure(plan), div_id="cleaning-furnace"),
        "<h2>Cleanings</h2>", listing,
        "<h2>Notes</h2><ul>" + "".join(f"<li>{esc(n)}</li>" for n in plan.notes) + "</ul>",
        f"<p>Train solves: {plan.solves} batched solves of {plan.states:,} train states in {plan.seconds:.1f} s.</p>",
    ]
    return page(title, "\n".join(body), prov=prov, plotly_src=plotly_src)
