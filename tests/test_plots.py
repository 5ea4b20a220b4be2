"""Tests of revamp.plots: the figures carry the study's numbers (converted for display by pint)."""
import math

import pytest

import revamp as rv
from revamp import options as op
from revamp import plots
from revamp.units import ureg

OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=0.4e-3, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)
EX = rv.ShellAndTube(shell_id="21.25 in", tube_od="1 in", tube_wall="0.095 in", tube_length="16 ft", tube_count=158,
                     tube_passes=4, tube_pitch="1.25 in", layout=90, baffle_spacing="5 in", baffle_cut=0.25)
SVC = rv.Service(shell=rv.Stream(OIL, "43800 lb/h", "390 degF"), tube=rv.Stream(CRUDE, "149000 lb/h", "100 degF"),
                 fouling_shell=2e-4, fouling_tube=5e-4)


@pytest.fixture(scope="module")
def study():
    opts = [op.Clean(), op.AddShells(1)]
    return rv.compare(EX, SVC, opts, target="1.6 MW", limits={"dp_tube": "1 bar"},
                      economics={"energy_price": 6.0, "price_per": "MMBTU", "discount_rate": 0.08,
                                     "capex": {"clean both sides": 30e3, "add 1 shell in series": 600e3}})


def test_option_comparison(study):
    fig = plots.option_comparison(study)
    duty = fig.data[0]
    assert list(duty.x) == list(study.table.index)
    # SI display of power is kW (pint conversion of W)
    assert list(duty.y) == pytest.approx([ureg.Quantity(v, "W").to("kW").magnitude for v in study.table["duty"]])
    dp_tube = next(t for t in fig.data if t.name == "ΔP tube")
    assert list(dp_tube.y) == pytest.approx(list(study.table["dp_tube"] / 1e3))
    lines = [s for s in fig.layout.shapes if s.type == "line"]
    assert any(s.y0 == pytest.approx(1600.0) for s in lines)  # the target, kW
    assert any(s.y0 == pytest.approx(100.0) for s in lines)   # allowed tube dp, kPa
    # the simple_white template's shape default is a line of width 0 (plotly's template): each line must set its own
    assert fig.layout.template.layout.shapedefaults.line.width == 0
    assert all(s.line.width and s.line.width > 0 and s.opacity == 1.0 for s in lines)
    us = plots.option_comparison(study, units="US")
    assert list(us.data[0].y) == pytest.approx([ureg.Quantity(v, "W").to("BTU/h").magnitude
                                                for v in study.table["duty"]])


def test_resistance_breakdown(study):
    fig = plots.resistance_breakdown(study)
    assert [t.name for t in fig.data] == list(study.resistances.columns)
    assert fig.layout.barmode == "stack"
    total = [sum(t.y[i] for t in fig.data) for i in range(len(study.table))]
    assert total == pytest.approx(list(1 / study.table["U_service"]))
    shares = plots.resistance_breakdown(study, share=True)
    assert [sum(t.y[i] for t in shares.data) for i in range(len(study.table))] == pytest.approx([1.0] * 3)


def test_economics_chart(study):
    fig = plots.economics_chart(study)
    pb, npv = fig.data
    t = study.table.drop(index="base")
    assert list(pb.x) == list(t.index)
    for y, p in zip(pb.y, t["payback"]):
        assert y == (p if math.isfinite(p) else 0.0)
    assert list(npv.y) == pytest.approx(list(t["npv"]))


def test_economics_chart_without_economics_says_so():
    s = rv.compare(EX, SVC, [op.Clean()])
    fig = plots.economics_chart(s)
    assert len(fig.data) == 0 and "No economics" in fig.layout.annotations[0].text
    assert len(plots.option_comparison(s).data) == 3  # duty, ΔP shell, ΔP tube


def test_figures_are_self_contained(study):
    # no CDN: with the bundle inline, the HTML loads no script from elsewhere
    import re

    html = plots.option_comparison(study).to_html(include_plotlyjs=True, full_html=False)
    assert not re.search(r"<script[^>]*\bsrc=", html)


def test_user_labels_are_escaped_for_plotly():
    # plotly reads <b>, <br> ... in axis, legend and hover text as tags; a user's label must show as written, so it
    # goes in with <, > and & escaped (html.escape(label, quote=False): Python standard library)
    import html
    import json

    label = "<b>bold</b> & co"
    s = rv.compare(EX, SVC, [op.Clean(label=label)],
                   economics={"energy_price": 6.0, "price_per": "MMBTU", "discount_rate": 0.08,
                              "currency": "<i>USD</i>", "capex": {label: 30e3}})
    want = html.escape(label, quote=False)
    assert want == "&lt;b&gt;bold&lt;/b&gt; &amp; co"
    figs = [plots.option_comparison(s), plots.resistance_breakdown(s), plots.economics_chart(s)]
    for fig in figs:
        xs = [x for tr in fig.data for x in (tr.x or ())]
        assert want in xs and label not in xs
        text = json.dumps(fig.to_dict(), default=str)  # plain json: "<" is not escaped (fig.to_json() would)
        assert "<b>" not in text and "<i>" not in text
    assert figs[2].layout.yaxis2.title.text == "NPV [&lt;i&gt;USD&lt;/i&gt;]"
