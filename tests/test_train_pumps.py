"""A stream's pump curve against its route's pressure drop (revamp.train.hydraulics), in the API and the unit file.

Sources:
- the interpolation is PCHIP as defined by Fritsch & Carlson (1980) with the interior slopes of Fritsch & Butland
  (1984): at an interior point the weighted harmonic mean of the two secant slopes, w1 = 2h_k + h_(k-1),
  w2 = h_k + 2h_(k-1), d = (w1 + w2) / (w1/δ_(k-1) + w2/δ_k) (zero when the secants differ in sign); at an end the
  three-point formula d = ((2h_0 + h_1)δ_0 - h_0 δ_1) / (h_0 + h_1), set to 0 if its sign differs from δ_0 and to
  3δ_0 if the secants differ in sign and |d| > 3|δ_0| (the end rule as C. Moler, *Numerical Computing with MATLAB*,
  2004, §3.4 "pchip", writes it); between points the cubic Hermite form. Written out by hand below.
- head to pressure: Δp = ρ·g·H with g = 9.80665 m/s² (standard gravity, 3rd CGPM 1901).
- the operating point is where the system's pressure drop meets the pump's curve (Karassik et al., *Pump Handbook*,
  4th ed. 2008, ch. on pump and system curves): with a route Δp ∝ flow^n the meeting flow is found by bisection on
  the hand-built curve, independently of the train's throughput search.
All exchangers, fluids and pumps are invented.
"""
import copy
import math
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import unitfile
from revamp.errors import InputError
from revamp.train import Furnace, PumpCurve

sys.path.insert(0, str(Path(__file__).parent))
from test_train import CRUDE_C, KERO_C, RESID_C, interlinked  # noqa: E402
from test_train_unitfile import unit_doc, write  # noqa: E402

G = 9.80665  # standard gravity [m/s²], 3rd CGPM (1901)


def hand_pchip(x, y, xq):
    """PCHIP written out from its definition (Fritsch & Carlson 1980; Fritsch & Butland 1984 interior slopes; the
    end rule as Moler 2004 §3.4 gives it); independent of scipy."""
    x, y = np.asarray(x, float), np.asarray(y, float)
    h = np.diff(x)
    delta = np.diff(y) / h
    n = len(x)
    d = np.zeros(n)
    for k in range(1, n - 1):
        if delta[k - 1] * delta[k] > 0:
            w1, w2 = 2 * h[k] + h[k - 1], h[k] + 2 * h[k - 1]
            d[k] = (w1 + w2) / (w1 / delta[k - 1] + w2 / delta[k])

    def end(h0, h1, d0, d1):
        s = ((2 * h0 + h1) * d0 - h0 * d1) / (h0 + h1)
        if np.sign(s) != np.sign(d0):
            return 0.0
        if np.sign(d0) != np.sign(d1) and abs(s) > abs(3 * d0):
            return 3 * d0
        return s

    d[0] = end(h[0], h[1], delta[0], delta[1])
    d[-1] = end(h[-1], h[-2], delta[-1], delta[-2])
    k = int(np.searchsorted(x, xq, side="right") - 1)
    k = min(max(k, 0), n - 2)
    t = (xq - x[k]) / h[k]
    h00, h10, h01, h11 = 2 * t**3 - 3 * t**2 + 1, t**3 - 2 * t**2 + t, -2 * t**3 + 3 * t**2, t**3 - t**2
    return h00 * y[k] + h10 * h[k] * d[k] + h01 * y[k + 1] + h11 * h[k] * d[k + 1]


# an invented centrifugal pump: flow [m³/h] and differential pressure [kPa], falling with flow, unequal spacing
Q_PTS = [0.0, 150.0, 250.0, 320.0, 400.0]
DP_PTS = [420.0, 400.0, 350.0, 300.0, 210.0]


def curve(**kw):
    args = dict(flow=[f"{q} m**3/h" for q in Q_PTS], dp=[f"{p} kPa" for p in DP_PTS])
    args.update(kw)
    return PumpCurve(**args)


@pytest.mark.parametrize("q", [0.0, 75.0, 150.0, 199.0, 250.0, 287.5, 320.0, 361.0, 400.0])
def test_curve_is_pchip_as_defined(q):
    # expected: the PCHIP definition written out by hand (sources in the module docstring), at the points and
    # between them
    got = float(curve().at(q / 3600.0))
    assert got == pytest.approx(hand_pchip(Q_PTS, DP_PTS, q) * 1e3, rel=1e-12)


def test_curve_passes_through_its_points_and_is_not_extrapolated():
    c = curve()
    for q, p in zip(Q_PTS, DP_PTS):  # interpolation passes through the data (definition)
        assert float(c.at(q / 3600.0)) == pytest.approx(p * 1e3, rel=1e-12)
    assert math.isnan(float(c.at(401.0 / 3600.0)))  # not extrapolated (stated rule)


@settings(max_examples=25, deadline=None)
@given(st.floats(0.0, 399.0), st.floats(0.01, 1.0))
def test_curve_never_rises_with_flow(q, step):
    # monotone data give a monotone interpolant (Fritsch & Carlson 1980, theorem on monotone PCHIP)
    c = curve()
    a, b = float(c.at(q / 3600.0)), float(c.at(min(q + step, 400.0) / 3600.0))
    assert b <= a + 1e-9
    assert min(DP_PTS) * 1e3 - 1e-9 <= b <= max(DP_PTS) * 1e3 + 1e-9  # no overshoot of the data's range


def test_head_becomes_pressure_with_the_supply_density_and_the_allowance_comes_off():
    # Δp = ρ g H (definition of head), ρ = 830 kg/m³ of the invented constant-property crude; the mass flow is
    # turned into m³/h with the same density
    heads = [p * 1e3 / (830.0 * G) for p in DP_PTS]
    c = curve(dp=None, head=[f"{h} m" for h in heads], allowance="50 kPa")
    m = 250.0 / 3600.0 * 830.0  # 250 m³/h of crude [kg/s]
    assert float(c.available(m, 830.0)) == pytest.approx(350e3 - 50e3, rel=1e-9)


def test_a_mass_flow_curve_uses_the_flow_as_given():
    c = PumpCurve(flow=["0 kg/s", "40 kg/s", "80 kg/s"], dp=["3 bar", "2.5 bar", "1 bar"])
    assert c.flow_kind == "mass_flow"
    # the middle point itself: 2.5 bar = 250 kPa (1 bar = 100 kPa, definition)
    assert float(c.available(40.0, 830.0)) == pytest.approx(250e3, rel=1e-12)


BAD_CURVES = [
    (dict(flow=["0 m**3/h", "100 m**3/h"], dp=["3 bar", "2 bar"]), "flow", "3 or more points"),
    (dict(flow=["0 m**3/h", "200 m**3/h", "100 m**3/h"], dp=["3 bar", "2 bar", "1 bar"]), "flow[2]", "increasing"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], dp=["3 bar", "3.5 bar", "1 bar"]), "dp[1]", "not rise"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], dp=["3 bar", "2 bar"]), "dp", "one value per flow"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"]), "dp", "exactly one"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], dp=["3 bar"] * 3, head=["30 m"] * 3), "dp", "exactly one"),
    (dict(flow=["0 m**3/h", "30 kg/s", "200 m**3/h"], dp=["3 bar", "2 bar", "1 bar"]), "flow[1]", "same kind"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 degC"], dp=["3 bar", "2 bar", "1 bar"]), "flow[2]", "volume flow"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], dp=["3 bar", "2 bar", "-1 bar"]), "dp[2]", ">= 0"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], head=["30 m", "20 m", "2 kg"]), "head[2]", "length"),
    (dict(flow=["0 m**3/h", "100 m**3/h", "200 m**3/h"], dp=["3 bar", "2 bar", "1 bar"], allowance="-1 bar"),
     "allowance", ">= 0"),
    (dict(flow="100 m**3/h", dp=["3 bar"]), "flow", "list"),
]


@pytest.mark.parametrize("kw, path, words", BAD_CURVES)
def test_bad_curves_are_refused_by_path(kw, path, words):
    # path-named refusals: the project's input rule (every bad input names its field, value and what is allowed)
    with pytest.raises(InputError) as exc:
        PumpCurve(**kw)
    assert exc.value.field == path
    assert words in str(exc.value.allowed)


def test_a_train_refuses_a_pump_on_an_unknown_stream():
    t = interlinked(CRUDE_C, RESID_C, KERO_C)
    with pytest.raises(InputError) as exc:
        t.replace(pump_curves={"naphtha": curve()})
    assert exc.value.field == "pump_curves['naphtha']"
    with pytest.raises(InputError) as exc:
        t.replace(pump_curves={"crude": {"flow": [1, 2, 3]}})
    assert exc.value.field == "pump_curves['crude']"


# ------------------------------------------------------------------------------------------ in the train solve
def _pumped(allowance="0 kPa", crude_flow="60 kg/s"):
    return interlinked(CRUDE_C, RESID_C, KERO_C, crude_flow=crude_flow,
                       furnace=Furnace("crude", "360 degC", 0.85, "200 MW"),
                       pump_curves={"crude": curve(allowance=allowance)})


def test_the_pump_check_compares_the_route_with_the_curve_less_the_allowance():
    res = _pumped("40 kPa").solve()
    route = sum(float(res.exchangers.loc[t, "dp_tube"]) for t in ("E-101", "E-102", "E-104"))
    # the route's pressure drop is the sum of its exchangers' tube-side drops in series (the crude is on the tube
    # side of all three; definition of a series route)
    assert float(res.streams.loc["crude", "dp"]) == pytest.approx(route, rel=1e-12)
    q = 60.0 / 830.0 * 3600.0  # m³/h at the supply density of the constant-property crude
    expected = hand_pchip(Q_PTS, DP_PTS, q) * 1e3 - 40e3  # curve (PCHIP by hand) less the allowance
    assert float(res.streams.loc["crude", "pump_dp"]) == pytest.approx(expected, rel=1e-9)
    check = next(c for c in res.limits if c.name == "crude pump")
    assert check.value == pytest.approx(route) and check.high == pytest.approx(expected)
    assert check.ok == (route <= expected)


def test_a_flow_beyond_the_curve_fails_and_says_so():
    res = _pumped(crude_flow="100 kg/s").solve()  # 434 m³/h, beyond the last point (400 m³/h)
    check = next(c for c in res.limits if c.name == "crude pump")
    assert not check.ok and "crude pump" in res.violated
    assert any("outside the pump curve" in w for w in res.warnings)


def test_max_throughput_stops_where_the_route_meets_the_pump_curve():
    train = _pumped("100 kPa")
    tp = train.max_throughput()
    assert tp.binding == ("crude pump",)
    # independent operating point: route Δp(factor) from solves of the train, pump pressure from the hand PCHIP;
    # bisection on their difference (the meeting point of system and pump curves, Karassik et al. 2008)

    def excess(f):
        r = train.scaled(f, "crude").solve()
        q = 60.0 * f / 830.0 * 3600.0
        return float(r.streams.loc["crude", "dp"]) - (hand_pchip(Q_PTS, DP_PTS, q) * 1e3 - 100e3)

    lo, hi = 0.5, 400.0 / (60.0 / 830.0 * 3600.0)  # up to the curve's last point
    assert excess(lo) < 0 < excess(hi)
    for _ in range(40):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if excess(mid) < 0 else (lo, mid)
    assert tp.factor <= lo + 1e-9 and lo - tp.factor <= tp.resolution + 1e-9


def test_compare_train_shows_the_pump_beside_the_route():
    study = rv.compare_train(_pumped("100 kPa"), {"two shells": {"E-102": rv.options.AddShells(1)}},
                             throughput=True)
    t = study.table
    assert "pump dp crude" in t.columns
    # the base row's pump figure is the solve's own (the same train solved at the same flow)
    assert t.loc["base", "pump dp crude"] == pytest.approx(float(study.results["base"].streams.loc["crude",
                                                                                                 "pump_dp"]))
    # a second shell in series on the crude route adds its pressure drop: the pump lets less flow through
    assert t.loc["two shells", "dp crude"] > t.loc["base", "dp crude"]
    assert t.loc["two shells", "max_throughput"] < t.loc["base", "max_throughput"]
    assert "crude pump" in t.loc["base", "binding"]


# ------------------------------------------------------------------------------------------------ the unit file
def _doc_with_pump(pump):
    doc = copy.deepcopy(unit_doc())
    doc["network"]["streams"]["crude"]["pump_curve"] = pump
    return doc


GOOD_PUMP = {"flow": ["0 m**3/h", "150 m**3/h", "250 m**3/h", "320 m**3/h", "400 m**3/h"],
             "head": ["51.6 m", "49.1 m", "43.0 m", "36.8 m", "25.8 m"], "allowance": "0.5 bar"}


def test_the_unit_file_pump_curve_reaches_the_train(tmp_path):
    unit = unitfile.load(write(tmp_path, _doc_with_pump(GOOD_PUMP)))
    c = unit.network.pump_curves["crude"]
    assert c.quantity == "head" and c.flow_kind == "volume_flow"
    assert c.allowance == pytest.approx(50e3)  # 0.5 bar = 50 kPa (definition of the bar)
    assert c.flow[-1] == pytest.approx(400.0 / 3600.0)  # 400 m³/h in m³/s
    assert c.head[2] == pytest.approx(43.0)


@pytest.mark.parametrize("change, path, words", [
    ({"flow": ["0 m**3/h", 150, "250 m**3/h"]}, "flow[1]", "with its unit"),
    ({"flow": ["0 m**3/h", "250 m**3/h", "150 m**3/h"]}, "flow[2]", "increasing"),
    ({"flow": ["0 m**3/h", "150 m**3/h"]}, "flow", "3 or more"),
    ({"head": ["51.6 m", "55 m", "43.0 m", "36.8 m", "25.8 m"]}, "head[1]", "not rise"),
    ({"head": ["51.6 m", "49.1 m", "43.0 bar", "36.8 m", "25.8 m"]}, "head[2]", "length"),
    ({"allowance": "5 kg"}, "allowance", "pressure"),
])
def test_check_names_a_bad_pump_curve_by_path(tmp_path, change, path, words):
    pump = dict(GOOD_PUMP, **change)
    if "flow" in change and len(change["flow"]) != 5:
        pump["head"] = GOOD_PUMP["head"][:len(change["flow"])]
    problems = unitfile.check(write(tmp_path, _doc_with_pump(pump)))
    full = f"network.streams.crude.pump_curve.{path}"
    hits = [p for p in problems if p.path == full]
    assert hits, [str(p) for p in problems]
    assert words in hits[0].message, str(hits[0])


def test_the_train_page_shows_the_pump_and_its_limit():
    from revamp.report.train import train_body

    train = _pumped("100 kPa")
    study = rv.compare_train(train, {"clean": {"E-102": rv.options.Clean()}}, throughput=True, points=11)
    html = train_body(train.solve(), study, throughput=train.max_throughput(points=11))
    assert "pump: ΔP left for the route [kPa]" in html
    assert "crude pump" in html  # the limit row and the binding limit
    assert "PCHIP" in html  # the interpolation is stated
