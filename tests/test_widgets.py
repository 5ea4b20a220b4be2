"""The what-if engine behind the notebook controls: cached slices of vectorized ratings."""
from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest

import revamp as rv
from revamp.report.widgets import WhatIf, what_if, what_if_table_html
from test_plots import EX, SVC


@pytest.fixture(scope="module")
def case():
    return SimpleNamespace(tag="E-1", exchanger=EX, service=SVC, throughput=1.0, limits={"dp_tube": 1.0e3})


def test_vectorized_slices_equal_scalar_ratings(case):
    # invariant of the engine: a case taken from one vectorized rating over a slider's range equals the scalar
    # rating at that position (rate() broadcasts its service arrays; no outside source needed for an identity)
    grid = np.round(np.arange(0.8, 1.21, 0.1), 9)
    fo = np.round(np.arange(0.0, 6.01e-4, 1e-4), 9)
    engine = WhatIf(case, grid, fo, fo)
    pts = engine.cases(1.1, 2e-4, 3e-4, 4.0, 2, along="throughput")
    assert engine.ratings_run == 3  # one vectorized call per case
    ref = what_if(case, 1.1, 2e-4, 3e-4, 4.0, 2)
    for (label, p), (label_ref, r) in zip(pts.items(), ref.items()):
        assert label == label_ref
        for f in ("duty", "t_out_shell", "t_out_tube", "U_service", "dp_shell", "dp_tube"):
            assert getattr(p, f) == pytest.approx(float(getattr(r, f)), rel=1e-6), (label, f)
        assert float(p.resistances.sum()) == pytest.approx(1.0 / float(r.U_service), rel=1e-6)
    engine.cases(0.9, 2e-4, 3e-4, 4.0, 2, along="throughput")  # another position of the same slider: cached
    assert engine.ratings_run == 3
    engine.cases(0.9, 2e-4, 4e-4, 4.0, 2, along="fouling_tube")  # a new tube fouling: one call per case again
    assert engine.ratings_run == 6
    engine.cases(0.9, 2e-4, 1e-4, 4.0, 2, along="fouling_tube")
    assert engine.ratings_run == 6


def test_table_flags_pressure_drop_over_the_allowed(case):
    fo = np.array([0.0, 2e-4, 3e-4])
    engine = WhatIf(case, np.array([1.0]), fo, fo)
    pts = engine.cases(1.0, 2e-4, 3e-4, 4.0, None)
    html = what_if_table_html(case, pts)
    # the allowed tube drop here is 1 kPa, below any of these cases' drops: each case is flagged
    assert html.count("over: tube ΔP") == len(pts)
    assert "duty [MW]" in html and "True" not in html and "nan" not in html


def test_idle_prefetch_makes_the_neighbours_ready(case):
    fo = np.round(np.arange(0.0, 6.01e-4, 1e-4), 9)
    engine = WhatIf(case, np.round(np.arange(0.8, 1.21, 0.1), 9), fo, fo)
    engine.cases(1.0, 2e-4, 3e-4, 4.0, None)
    while engine.prefetch_one(1.0, 2e-4, 3e-4, 4.0, None):
        pass
    done = engine.ratings_run
    for along, fs, ft, tp in (("fouling_tube", 2e-4, 4e-4, 1.0), ("fouling_shell", 1e-4, 3e-4, 1.0),
                              ("throughput", 2e-4, 3e-4, 1.1)):
        engine.cases(tp, fs, ft, 4.0, None, along=along)
    assert engine.ratings_run == done  # one step on any slider: already rated


def test_primer_tables_carry_units_for_both_systems():
    import re

    from revamp.report.pages import frame_html
    from revamp.report.widgets import primer_sweep, primer_table

    r = rv.rate(EX, SVC)
    t = primer_table(r)
    assert t["share of 1/U [%]"].sum() == pytest.approx(100.0)  # the shares of a series sum make the whole
    u_us = frame_html(primer_sweep(r), system="US")
    assert "Btu/h·ft²·°F" in u_us and "W/m²·K" not in u_us
    # 1 W/m²K = 0.17611 Btu/h·ft²·°F (NIST SP 811 Appendix B.8), three significant figures shown
    want = f"{float(r.U_service) * 0.17611:.3g}"
    assert re.search(rf">{re.escape(want)}<", u_us), want


def test_breakdown_chart_stacks_each_resistance_to_scale_in_its_colour():
    # geometry of the drawing: each block's height is its value over the axis top times the plot height, stacked
    # from the axis in the order given; the colours are the reports' one colour per resistance
    import re

    from revamp.report.labels import RESISTANCE_COLOURS, RESISTANCES
    from revamp.report.widgets import breakdown_svg

    ys = {name: [v, 2 * v] for name, v in zip(RESISTANCES, (7.5, 2.0, 0.4, 6.4, 29.0))}
    svg = breakdown_svg(["as is", "with tapes"], ys, "10⁻⁴ m²·K/W", width=720, height=420)
    rects = re.findall(r'<rect x="([\d.]+)" y="([\d.]+)" width="([\d.]+)" height="([\d.]+)" fill="(#\w+)"><title>'
                       r'([a-z ]+):', svg)
    assert len(rects) == 10
    # axis: the taller bar totals 2 × 45.3 = 90.6; steps of 1, 2, 2.5 or 5 × 10^k in about five intervals give 20,
    # so the axis tops at 100 over a plot height of 420 - 40 - 95 = 285 px
    assert '>100</text>' in svg and '>80</text>' in svg
    scale = 285 / 100.0
    for (x, y, w, h, colour, name) in rects:
        i = 0 if float(x) < 360 else 1
        assert float(h) == pytest.approx(ys[name][i] * scale, abs=0.06)
        assert colour == RESISTANCE_COLOURS[name]
    first = [r for r in rects if float(r[0]) < 360]
    assert [r[5] for r in first] == list(RESISTANCES)  # stacked from the axis in the given order
    assert float(first[0][1]) + float(first[0][3]) == pytest.approx(40 + 285, abs=0.06)  # sits on the axis
    for lower, upper in zip(first, first[1:]):
        assert float(upper[1]) + float(upper[3]) == pytest.approx(float(lower[1]), abs=0.11)


def test_breakdown_chart_escapes_labels():
    from revamp.report.widgets import breakdown_svg

    svg = breakdown_svg(["<b>x</b>"], {"shell film": [1.0]}, "u")
    assert "<b>" not in svg and "&lt;b&gt;" in svg
