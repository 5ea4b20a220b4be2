"""Tests for revamp.fouling.models: fits recover known parameters of the published model equations.

Data are made here from each model's published equation (Kern & Seaton 1959 asymptotic form; Ebert & Panchal 1995
threshold form, integrated with scipy's cumulative trapezoid, not with our code), plus seeded Gaussian noise.
"""
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats
from scipy.integrate import cumulative_trapezoid

from revamp.errors import InputError
from revamp.fouling.models import (
    GAS_CONSTANT,
    MODELS,
    film_temperature,
    fit_asymptotic,
    fit_best,
    fit_linear,
    fit_threshold,
    threshold_rate,
)

DAY = 86400.0
T = np.arange(0.0, 200 * DAY, 6 * 3600.0)  # 200 days, every 6 h


def test_linear_matches_scipy_linregress():
    # independent check: scipy.stats.linregress (ordinary least squares with standard errors)
    rng = np.random.default_rng(0)
    rf = 1e-4 + 2e-12 * T + rng.normal(0, 2e-5, T.size)
    f = fit_linear(T, rf)
    ref = stats.linregress(T, rf)
    assert f.params["b"] == pytest.approx(ref.slope, rel=1e-6)
    assert f.params["a"] == pytest.approx(ref.intercept, rel=1e-6)
    assert f.stderr["b"] == pytest.approx(ref.stderr, rel=1e-4)
    assert f.stderr["a"] == pytest.approx(ref.intercept_stderr, rel=1e-4)
    assert f.r2 == pytest.approx(ref.rvalue**2, rel=1e-6)
    # AIC for least squares, n ln(RSS/n) + 2k with k = 2 parameters + noise variance (Akaike 1974)
    rss = np.sum((rf - ref.intercept - ref.slope * T) ** 2)
    assert f.aic == pytest.approx(T.size * np.log(rss / T.size) + 2 * 3, rel=1e-9)
    # projection is the line itself
    assert f(300 * DAY) == pytest.approx(ref.intercept + ref.slope * 300 * DAY, rel=1e-6)
    assert f.rate(10 * DAY) == pytest.approx(ref.slope, rel=1e-6)


@settings(max_examples=30, deadline=None)
@given(a=st.floats(0.0, 5e-4), b_per_day=st.floats(1e-7, 1e-5))
def test_linear_exact_line_recovered(a, b_per_day):
    # invariant: a noise-free line is fitted exactly
    t = np.linspace(0, 100 * DAY, 50)
    f = fit_linear(t, a + b_per_day / DAY * t)
    assert f.params["b"] * DAY == pytest.approx(b_per_day, rel=1e-6)
    assert f.params["a"] == pytest.approx(a, abs=1e-10)


def test_asymptotic_recovers_kern_seaton_parameters():
    # Kern & Seaton (1959): Rf = Rf_inf (1 - exp(-t/tau)); here with an initial resistance Rf0
    rng = np.random.default_rng(1)
    rf0, rinf, tau = 1e-4, 4e-4, 40 * DAY
    rf = rf0 + rinf * (1 - np.exp(-T / tau)) + rng.normal(0, 1.5e-5, T.size)
    f = fit_asymptotic(T, rf)
    for name, true in (("Rf0", rf0), ("Rf_inf", rinf), ("tau", tau)):
        assert abs(f.params[name] - true) < 4 * f.stderr[name], name
        assert f.params[name] == pytest.approx(true, rel=0.05), name
    assert f(1e4 * DAY) == pytest.approx(f.params["Rf0"] + f.params["Rf_inf"], rel=1e-6)  # the asymptote
    # rate is the derivative of the curve: Rf_inf/tau exp(-t/tau)
    assert f.rate(0.0) == pytest.approx(f.params["Rf_inf"] / f.params["tau"], rel=1e-9)


def test_asymptotic_without_offset():
    rinf, tau = 3e-4, 30 * DAY
    f = fit_asymptotic(T, rinf * (1 - np.exp(-T / tau)), offset=False)
    assert set(f.params) == {"Rf_inf", "tau"}
    assert f.params["Rf_inf"] == pytest.approx(rinf, rel=1e-4)
    assert f.params["tau"] == pytest.approx(tau, rel=1e-4)


def _threshold_data(seed=2, noise=1e-5):
    rng = np.random.default_rng(seed)
    Re = 20000 * (1 + 0.15 * np.sin(T / (7 * DAY)))
    Pr = np.full(T.size, 20.0)
    Tf = 520 + 15 * np.sin(T / (11 * DAY))
    shear = 30 * (Re / 20000) ** 1.8
    alpha, E, gamma = 5e-8 * np.exp(60e3 / (GAS_CONSTANT * 520.0)), 60e3, 4.5e-13
    # Ebert & Panchal (1995): dRf/dt = alpha Re^-0.66 Pr^-0.33 exp(-E/(R T_film)) - gamma tau_w
    rate = alpha * Re**-0.66 * Pr**-0.33 * np.exp(-E / (GAS_CONSTANT * Tf)) - gamma * shear
    rf = 1e-4 + cumulative_trapezoid(rate, T, initial=0.0) + rng.normal(0, noise, T.size)
    return rf, Re, Pr, Tf, shear, alpha, E, gamma


def test_threshold_recovers_ebert_panchal_parameters():
    rf, Re, Pr, Tf, shear, alpha, E, gamma = _threshold_data()
    f = fit_threshold(T, rf, Re, Pr, Tf, shear)
    assert f.params["E"] == pytest.approx(E, rel=0.1)
    assert abs(f.params["E"] - E) < 4 * f.stderr["E"]
    assert f.params["gamma"] == pytest.approx(gamma, rel=0.15)
    assert abs(f.params["gamma"] - gamma) < 4 * f.stderr["gamma"]
    assert f.params["Rf0"] == pytest.approx(1e-4, abs=3e-6)
    # deposition coefficient at the reference film temperature
    a_ref = alpha * np.exp(-E / (GAS_CONSTANT * f.conditions["T_ref"]))
    assert f.params["alpha_ref"] == pytest.approx(a_ref, rel=0.15)


def test_threshold_with_fixed_activation_energy():
    rf, Re, Pr, Tf, shear, alpha, E, gamma = _threshold_data(noise=0.0)
    f = fit_threshold(T, rf, Re, Pr, Tf, shear, E=E)
    assert f.params["E"] == E and f.stderr["E"] == 0.0
    assert f.params["alpha"] == pytest.approx(alpha, rel=1e-6)
    assert f.params["gamma"] == pytest.approx(gamma, rel=1e-6)


def test_threshold_rate_equation_and_threshold():
    # the rate equation by hand: 1e-2 * 1e4**-0.66 * 10**-0.33 * exp(-50e3/(8.314462618*500)) - 1e-13*20
    by_hand = 1e-2 * 10 ** (-2.64) * 10 ** (-0.33) * np.exp(-50e3 / (8.314462618 * 500.0)) - 2e-12
    assert threshold_rate(1e4, 10.0, 500.0, 20.0, 1e-2, 50e3, 1e-13) == pytest.approx(by_hand, rel=1e-12)
    # at the threshold the deposition equals the removal: no fouling (Ebert & Panchal 1995)
    dep = threshold_rate(1e4, 10.0, 500.0, 0.0, 1e-2, 50e3, 0.0)
    assert threshold_rate(1e4, 10.0, 500.0, 20.0, 1e-2, 50e3, dep / 20.0) == pytest.approx(0.0, abs=1e-25)
    # higher velocity (Re, shear) lowers the rate; hotter film raises it
    assert threshold_rate(2e4, 10.0, 500.0, 60.0, 1e-2, 50e3, 1e-13) < by_hand
    assert threshold_rate(1e4, 10.0, 520.0, 20.0, 1e-2, 50e3, 1e-13) > by_hand


def test_film_temperature_weighting():
    # T_film = T_b + 0.55 (T_w - T_b), Ebert & Panchal (1995) (from memory)
    assert film_temperature(500.0, 600.0) == pytest.approx(555.0)
    assert np.allclose(film_temperature([500.0, 400.0], [500.0, 500.0]), [500.0, 455.0])


def test_fit_best_chooses_by_aic():
    rng = np.random.default_rng(3)
    line = 1e-4 + 1e-11 * T + rng.normal(0, 1e-5, T.size)
    best, fits = fit_best(T, line, models=("linear", "asymptotic"))
    # a line with noise: the asymptotic model cannot do materially better, and pays for its extra parameter
    assert best.aic == min(f.aic for f in fits.values())
    curve = 4e-4 * (1 - np.exp(-T / (20 * DAY))) + rng.normal(0, 1e-5, T.size)
    best, fits = fit_best(T, curve)
    assert best.model == "asymptotic"  # strong curvature: the asymptotic form wins on AIC
    assert "threshold" not in fits  # no conditions given: skipped
    rf, Re, Pr, Tf, shear, *_ = _threshold_data()
    best, fits = fit_best(T, rf, conditions={"Re": Re, "Pr": Pr, "T_film": Tf, "shear": shear})
    assert set(fits) == {"linear", "asymptotic", "threshold"}
    assert best.model == "threshold"


def test_registry_maps_names_to_functions():
    assert MODELS == {"linear": fit_linear, "asymptotic": fit_asymptotic, "threshold": fit_threshold}


def test_bad_inputs_raise_input_error():
    with pytest.raises(InputError, match="at least"):
        fit_linear([0.0, 1.0], [1e-4, 2e-4])
    with pytest.raises(InputError, match="one value per time"):
        fit_linear([0.0, 1.0, 2.0], [1e-4, 2e-4])
    with pytest.raises(InputError, match="one of"):
        fit_best(T, np.zeros(T.size), models=("cubic",))


def test_nan_points_are_ignored():
    rf = 1e-4 + 1e-11 * T
    rf[::7] = np.nan
    f = fit_linear(T, rf)
    assert f.n == int(np.isfinite(rf).sum())
    assert f.params["b"] == pytest.approx(1e-11, rel=1e-6)
