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


def _duty_bars(fig):
    """The duty of each option, read off the per-status duty traces (one value per x, the others None)."""
    traces = [t for t in fig.data if t.offsetgroup == "duty"]
    return [next(t.y[i] for t in traces if t.y[i] is not None) for i in range(len(traces[0].x))], traces


def test_option_comparison(study):
    fig = plots.option_comparison(study)
    duty, traces = _duty_bars(fig)
    assert list(traces[0].x) == list(study.table.index)
    # SI display of a duty is MW (pint conversion of W)
    assert duty == pytest.approx([ureg.Quantity(v, "W").to("MW").magnitude for v in study.table["duty"]])
    dp_tube = next(t for t in fig.data if t.name == "ΔP tube")
    assert list(dp_tube.y) == pytest.approx(list(study.table["dp_tube"] / 1e3))
    lines = [s for s in fig.layout.shapes if s.type == "line"]
    assert any(s.y0 == pytest.approx(1.6) for s in lines)  # the target, MW
    assert any(s.y0 == pytest.approx(100.0) for s in lines)   # allowed tube dp, kPa
    # the simple_white template's shape default is a line of width 0 (plotly's template): each line must set its own
    assert fig.layout.template.layout.shapedefaults.line.width == 0
    assert all(s.line.width and s.line.width > 0 and s.opacity == 1.0 for s in lines)
    us = plots.option_comparison(study, units="US")
    assert _duty_bars(us)[0] == pytest.approx([ureg.Quantity(v, "W").to("MMBtu/h").magnitude
                                               for v in study.table["duty"]])
    assert us.layout.yaxis.title.text == "duty [MMBtu/h]"


def test_option_bars_have_one_colour_each(study):
    # plotly.js reads marker.pattern with a list of marker colours as an invalid colour (it logs "Invalid color
    # specifier" and may draw black bars); every bar trace must carry a single colour string
    for fig in (plots.option_comparison(study), plots.option_comparison(study, "US")):
        for tr in fig.data:
            if tr.type == "bar":
                assert isinstance(tr.marker.color, str), tr.name


def test_allowed_lines_do_not_share_a_label():
    # equal allowed pressure drops on both sides: one line, one label (two labels on one line overlap)
    s = rv.compare(EX, SVC, [op.Clean()], limits={"dp_tube": "70 kPa", "dp_shell": "70 kPa"})
    fig = plots.option_comparison(s)
    texts = [a.text for a in fig.layout.annotations if a.text and a.text.startswith("allowed")]
    assert texts == ["allowed, both sides"]
    s2 = rv.compare(EX, SVC, [op.Clean()], limits={"dp_tube": "70 kPa", "dp_shell": "50 kPa"})
    anns = [a for a in plots.option_comparison(s2).layout.annotations if a.text and a.text.startswith("allowed")]
    assert sorted(a.text for a in anns) == ["allowed shell", "allowed tube"]
    assert anns[0].xanchor != anns[1].xanchor  # one label at each end of the subplot


def test_resistance_breakdown(study):
    from revamp.report.labels import RESISTANCE_COLOURS

    fig = plots.resistance_breakdown(study)
    assert [t.name for t in fig.data] == list(study.resistances.columns)
    assert fig.layout.barmode == "stack"
    total = [sum(t.y[i] for t in fig.data) for i in range(len(study.table))]
    # axis in 10^-4 m²·K/W: 1/U [m²K/W] × 1e4
    assert total == pytest.approx(list(1e4 / study.table["U_service"]))
    assert "10⁻⁴ m²·K/W" in fig.layout.yaxis.title.text
    assert [t.marker.color for t in fig.data] == [RESISTANCE_COLOURS[t.name] for t in fig.data]
    us = plots.resistance_breakdown(study, units="US")
    # 1 m²K/W = 5.678263 h·ft²·°F/Btu (NIST SP 811 factor for the reciprocal of W/m²K to Btu/h·ft²·°F), axis x1e3
    total_us = [sum(t.y[i] for t in us.data) for i in range(len(study.table))]
    assert total_us == pytest.approx([5.678263e3 / u for u in study.table["U_service"]], rel=1e-5)
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
    # duty (one trace per screening status present), ΔP shell, ΔP tube
    n_status = len(set(s.table["screening"]))
    assert len(plots.option_comparison(s).data) == n_status + 2


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
