"""Tests of revamp.economics: prices and units, payback, annuity and NPV, cycle-averaged duty."""
import math
from types import SimpleNamespace

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp import economics as ec
from revamp.errors import InputError
from revamp.units import ureg

SETTINGS = settings(max_examples=40, deadline=None)


# ------------------------------------------------------------------------------------------------ energy prices
@pytest.mark.parametrize("per", ["J", "kJ", "MJ", "GJ", "kWh", "MWh", "BTU", "therm"])
def test_price_units_vs_pint(per):
    joules = ureg.Quantity(1, per).to("J").magnitude
    assert ec.price_per_joule(7.0, per) == pytest.approx(7.0 / joules, rel=1e-12)


def test_mmbtu():
    # 1 MMBTU = 1.055056 GJ (International Table BTU = 1055.05585262 J, NIST SP 811 Appendix B.8; pint rounds it to
    # 1055.056 J, hence the 1e-6 tolerance)
    assert 1 / ec.price_per_joule(1.0, "MMBTU") == pytest.approx(1.05505585262e9, rel=1e-6)
    assert ec.price_per_joule(1.0, "kWh") == pytest.approx(1 / 3.6e6)  # 1 kWh = 3.6 MJ (definition)


def test_bad_price_basis():
    with pytest.raises(InputError, match="price_per"):
        ec.price_per_joule(1.0, "barrel")
    with pytest.raises(InputError, match="energy_price"):
        ec.price_per_joule(-1.0, "GJ")


def test_duty_value_by_hand():
    # 2 MW for 8000 h = 57.6 TJ = 57 600 GJ; at 6 per MMBTU and 85 % efficiency (hand calculation)
    gj = 2e6 * 8000 * 3600 / 1e9
    expected = gj / 1.05505585262 * 6.0 / 0.85
    assert ec.annual_duty_value(2e6, 6.0, "MMBTU", "8000 h", 0.85) == pytest.approx(expected, rel=1e-6)
    # strings with units for the duty: 10 MMBTU/h (pint: 2.9307 MW)
    w = ureg.Quantity(10e6, "BTU/h").to("W").magnitude
    assert ec.annual_duty_value("10e6 BTU/h", 1.0, "GJ", "1 h") == pytest.approx(w * 3600 / 1e9)
    arr = ec.annual_duty_value(np.array([1e6, -1e6]), 5.0, "GJ", "1 h")
    assert arr.shape == (2,) and arr[0] == -arr[1]


def test_operating_time_bounds():
    with pytest.raises(InputError, match="operating_time"):
        ec.annual_duty_value(1e6, 5.0, "GJ", "9000 h")  # more than a year
    with pytest.raises(InputError, match="efficiency"):
        ec.annual_duty_value(1e6, 5.0, "GJ", "8000 h", 1.2)


def test_capacity_value_by_hand():
    # 0.5 kg/s extra for 8000 h = 14 400 t; at 0.02 per kg (hand calculation)
    assert ec.annual_capacity_value(0.5, 0.02, "8000 h") == pytest.approx(0.5 * 8000 * 3600 * 0.02)
    assert ec.annual_capacity_value("1800 kg/h", 0.02, "8000 h") == pytest.approx(0.5 * 8000 * 3600 * 0.02)


# ------------------------------------------------------------------------------------------------ payback and NPV
def test_payback():
    assert ec.simple_payback(300.0, 100.0) == 3.0
    assert ec.simple_payback(300.0, 0.0) == math.inf
    assert ec.simple_payback(300.0, -5.0) == math.inf
    assert ec.simple_payback(0.0, 0.0) == 0.0
    assert list(ec.simple_payback([100.0, 100.0], [50.0, 0.0])) == [2.0, math.inf]


def test_annuity_factor_table_value():
    # present-value annuity factor, 10 %, 10 years: 6.1446 (standard PV-of-annuity tables, e.g. Brealey, Myers &
    # Allen, Principles of Corporate Finance, appendix table) [from memory]
    assert ec.annuity_factor(0.10, 10) == pytest.approx(6.1446, abs=1e-4)
    # 5 %, 20 years: 12.4622 (same tables) [from memory]
    assert ec.annuity_factor(0.05, 20) == pytest.approx(12.4622, abs=1e-4)
    assert ec.annuity_factor(0.0, 7) == 7


@SETTINGS
@given(st.floats(0.0, 0.3), st.integers(1, 40))
def test_annuity_equals_explicit_sum(r, n):
    # independent: sum of discount factors year by year
    assert ec.annuity_factor(r, n) == pytest.approx(sum((1 + r) ** -t for t in range(1, n + 1)), rel=1e-10)


def test_npv_numpy_documentation_examples():
    # NumPy's financial docs (numpy.irr / numpy_financial.irr): IRR of [-100, 39, 59, 55, 20] is 0.28095, so the NPV
    # at that rate is ~0; numpy_financial.npv docs: npv(0.281, same flows) = -0.0084785916384548798 [from memory]
    flows = [-100, 39, 59, 55, 20]
    assert abs(ec.npv(0.28095, flows)) < 2e-3
    assert ec.npv(0.281, flows) == pytest.approx(-0.0084785916384548798, abs=1e-9)
    # numpy_financial.npv docs: npv(0.08, [-40000, 5000, 8000, 12000, 30000]) = 3065.22 [from memory]
    assert round(ec.npv(0.08, [-40_000, 5_000, 8_000, 12_000, 30_000]), 2) == 3065.22


@SETTINGS
@given(st.floats(0.0, 1e6), st.floats(-1e5, 1e6), st.floats(0.0, 0.25), st.integers(1, 30))
def test_project_npv_is_npv_of_flows(capex, value, r, n):
    flows = [-capex] + [value] * n
    assert ec.project_npv(capex, value, r, n) == pytest.approx(ec.npv(r, flows), rel=1e-9, abs=1e-6)


def test_npv_bad_input():
    with pytest.raises(InputError, match="cashflows"):
        ec.npv(0.1, [])
    with pytest.raises(InputError, match="discount_rate"):
        ec.npv(-1.5, [1.0])


# ------------------------------------------------------------------------------------------------ cycle average
def test_cycle_average_linear_fouling_closed_form():
    # Q = Q0/(1 + a·Rf), Rf = b·t: ∫₀^τ Q dt = Q0·ln(1 + a·b·τ)/(a·b) (calculus, by hand)
    q0, a, b, tau, down = 5e6, 2e3, 2e-11, 3.0e7, 1.0e6
    avg = ec.cycle_average(lambda rf: q0 / (1 + a * rf), lambda t: b * t, tau, down, points=201)
    assert avg.duty_mean == pytest.approx(q0 * math.log(1 + a * b * tau) / (a * b) / (tau + down), rel=1e-6)
    assert avg.duty_start == q0 and avg.fouling_end == pytest.approx(b * tau)
    assert avg.duty_end == pytest.approx(q0 / (1 + a * b * tau))


def test_cycle_average_accepts_objects_with_Rf_and_strings():
    model = SimpleNamespace(Rf=lambda t: np.full(np.shape(t), 1e-4))
    avg = ec.cycle_average(lambda rf: 1e6 - 1e9 * rf, model, "300 day", "65 day")
    # constant fouling: the mean is the duty times the on-stream fraction 300/365
    assert avg.duty_mean == pytest.approx(9e5 * 300 / 365, rel=1e-12)
    with pytest.raises(InputError, match="fouling"):
        ec.cycle_average(lambda rf: rf, 3.0, 10.0)


@SETTINGS
@given(st.floats(1e-12, 1e-9), st.floats(1e-12, 1e-9))
def test_slower_fouling_never_lowers_the_cycle_average(b1, b2):
    slow, fast = min(b1, b2), max(b1, b2)
    duty = lambda rf: 4e6 / (1 + 1.5e3 * rf)
    a = ec.cycle_average(duty, lambda t: slow * t, 3e7).duty_mean
    b = ec.cycle_average(duty, lambda t: fast * t, 3e7).duty_mean
    assert a >= b - 1e-6


# ------------------------------------------------------------------------------------------------ Economics inputs
def test_economics_inputs():
    e = ec.Economics(energy_price=8.0, price_per="GJ", efficiency=0.9, discount_rate=0.1, horizon=10,
                     capex={"clean": 50e3}, installation={"clean": 10e3}, capacity_flow=0.5, capacity_margin=0.02)
    assert e.cost("clean") == 60e3 and e.cost("other") == 0.0
    base = ec.annual_duty_value(1e6, 8.0, "GJ", "8000 h", 0.9)
    assert e.value(1e6) == pytest.approx(base)
    assert e.value(1e6, meets_target=True) == pytest.approx(base + 0.5 * 8000 * 3600 * 0.02)
    assert e.npv("clean", 20e3) == pytest.approx(-60e3 + 20e3 * 6.1446, abs=1.0)  # 6.1446: 10 %, 10 years
    assert math.isnan(ec.Economics(1.0).npv("x", 1.0))
    with pytest.raises(InputError, match="capex"):
        ec.Economics(1.0, capex={"x": -1.0})
    with pytest.raises(InputError, match="capacity"):
        ec.Economics(1.0, capacity_flow=1.0)
    with pytest.raises(InputError, match="economics"):
        ec.Economics.of({"price": 1.0})
