"""The single-case rating iterates on Python floats; sweeps iterate on arrays. Both must give the same numbers.

These are invariant checks, not checks against a source: a case rated alone must equal the same case rated inside a
sweep (to 1e-9 relative, far below the 1e-6 K the iteration converges to), and each float kernel must equal the
array kernel it mirrors. The physics itself is checked against outside sources in test_rating*.py,
test_thermal.py and test_correlations_*.py.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import thermal
from revamp.correlations import shell_bell
from revamp.correlations import tube as tube_corr
from revamp.rating import _FLOAT_CASES, _SCALAR_FIELDS

WATER = rv.fluids.water(pressure="10 bar")
OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=4.0e-4, conductivity=0.132)
CRUDE = rv.fluids.petroleum(api=31, watson_k=11.8, viscosity=[("40 degC", "9 cSt"), ("100 degC", "3 cSt")])

# (shell type, tube passes, shells, shell method): every shell type, the effectiveness relations each selects
# (counterflow, 1-2N, N shells in series, J1/J2/J4, crossflow) and both methods
LAYOUTS = [("E", 1, 1, "bell-delaware"), ("E", 2, 1, "bell-delaware"), ("E", 4, 2, "bell-delaware"),
           ("E", 2, 3, "kern"), ("F", 2, 1, "bell-delaware"), ("F", 4, 2, "bell-delaware"),
           ("J", 1, 1, "bell-delaware"), ("J", 2, 1, "bell-delaware"), ("J", 4, 2, "kern"),
           ("J", 6, 1, "bell-delaware"), ("X", 1, 1, "bell-delaware"), ("X", 2, 2, "bell-delaware")]


def _exchanger(kind, passes, shells, layout=30, **kw):
    return rv.ShellAndTube(shell_id=0.6, tube_od=0.0254, tube_wall=0.002, tube_length=5.0, tube_count=240,
                           tube_passes=passes, tube_pitch=0.03175, layout=layout, baffle_spacing=0.25,
                           baffle_cut=0.25, shell_type=kind, shells=shells, **kw)


def _assert_same(one, sweep, i):
    for name in _SCALAR_FIELDS:
        a, b = getattr(one, name), np.asarray(getattr(sweep, name))[i]
        assert isinstance(a, float), name
        assert a == pytest.approx(float(b), rel=1e-9, abs=1e-12, nan_ok=True), name
    assert np.allclose(one.resistances.to_numpy(), sweep.resistances.to_numpy()[i], rtol=1e-9, atol=0.0)


@pytest.mark.parametrize("kind, passes, shells, method", LAYOUTS)
@pytest.mark.parametrize("shell_fluid, tube_fluid", [(OIL, WATER), (CRUDE, OIL), (OIL, CRUDE)])
def test_one_case_equals_the_same_case_in_a_sweep(kind, passes, shells, method, shell_fluid, tube_fluid):
    rng = np.random.default_rng(7)
    n = 2 * _FLOAT_CASES + 1  # a sweep this large iterates on arrays; a single case and small sweeps on floats
    hot_shell = shell_fluid is CRUDE or tube_fluid is WATER
    t_hot, t_cold = rng.uniform(400.0, 445.0, n), rng.uniform(300.0, 340.0, n)
    # flows from laminar to turbulent on both sides (shell Re about 30 to 3e4: both of Taborek's switch bands)
    m_s, m_t = 10 ** rng.uniform(-0.7, 1.5, n), 10 ** rng.uniform(-0.5, 1.7, n)
    ts, tt = (t_hot, t_cold) if hot_shell else (t_cold, t_hot)
    rf_t = rng.uniform(0.0, 5e-4, n)
    hx = _exchanger(kind, passes, shells)
    sweep = rv.rate(hx, rv.Service(shell=rv.Stream(shell_fluid, m_s, ts), tube=rv.Stream(tube_fluid, m_t, tt),
                                   fouling_shell=2e-4, fouling_tube=rf_t), shell_method=method)
    small = rv.rate(hx, rv.Service(shell=rv.Stream(shell_fluid, m_s[:3], ts[:3]), tube=rv.Stream(tube_fluid, m_t[:3],
                                                                                           tt[:3]),
                                   fouling_shell=2e-4, fouling_tube=rf_t[:3]), shell_method=method)
    for i in range(3):
        for name in _SCALAR_FIELDS:
            assert getattr(small, name)[i] == pytest.approx(getattr(sweep, name)[i], rel=1e-9, nan_ok=True)
    for i in range(6):
        one = rv.rate(hx, rv.Service(shell=rv.Stream(shell_fluid, float(m_s[i]), float(ts[i])),
                                     tube=rv.Stream(tube_fluid, float(m_t[i]), float(tt[i])),
                                     fouling_shell=2e-4, fouling_tube=float(rf_t[i])), shell_method=method)
        _assert_same(one, sweep, i)


@settings(max_examples=25, deadline=None)
@given(st.floats(-2.0, 2.5), st.floats(-1.5, 2.5), st.floats(380.0, 445.0), st.floats(290.0, 360.0),
       st.sampled_from(LAYOUTS), st.sampled_from([30, 45, 60, 90]), st.booleans())
def test_random_single_cases_match_the_array_path(lg_s, lg_t, t_hot, t_cold, layout, angle, shell_hot):
    kind, passes, shells, method = layout
    hx = _exchanger(kind, passes, shells, layout=angle)
    ts, tt = (t_hot, t_cold) if shell_hot else (t_cold, t_hot)
    svc = rv.Service(shell=rv.Stream(OIL, 10 ** lg_s, ts), tube=rv.Stream(WATER, 10 ** lg_t, tt),
                     fouling_shell=1e-4, fouling_tube=2e-4)
    k = _FLOAT_CASES + 1  # the case among others, in a sweep that iterates on arrays
    flows_s = np.r_[10 ** lg_s, np.linspace(0.5, 20.0, k - 1)]
    flows_t = np.r_[10 ** lg_t, np.linspace(1.0, 30.0, k - 1)]
    pair = rv.Service(shell=rv.Stream(OIL, flows_s, np.full(k, ts)), tube=rv.Stream(WATER, flows_t, np.full(k, tt)),
                      fouling_shell=1e-4, fouling_tube=2e-4)
    _assert_same(rv.rate(hx, svc, shell_method=method), rv.rate(hx, pair, shell_method=method), 0)


def test_float_kernels_equal_the_array_kernels():
    # Bell-Delaware h and Re: Re from 0.5 to 2e5 (below, inside and above every band edge and the laminar switch)
    for angle in (30, 45, 60, 90):
        for kind in "EJ":
            geom = _exchanger(kind, 2, 1, layout=angle).bell()
            m = np.geomspace(1e-3, 200.0, 400)
            mu, mu_w = 1e-3, 6e-4
            arr = shell_bell.bell_delaware_kernel(geom, m, 800.0, 2200.0, mu, 0.13, mu_w)
            assert arr.Re.min() < 1.0 and arr.Re.max() > 1e5
            for i in range(m.size):
                h, Re = shell_bell.bell_delaware_h_float(geom, float(m[i]), 2200.0, mu, 0.13, mu_w)
                assert Re == pytest.approx(arr.Re[i], rel=1e-12)
                assert h == pytest.approx(arr.h[i], rel=1e-12)
    # tube side: Re from 50 to 1e6 (laminar, transition, turbulent), both laminar methods
    m = np.geomspace(2e-3, 50.0, 300)
    for laminar in tube_corr.LAMINAR_METHODS:
        arr = tube_corr.tube_side_kernel(m, 30.0, 0.02, 4.0, 2, 900.0, 2000.0, 2e-3, 0.12, 3e-3, 0.0,
                                         laminar=laminar, warn=False)
        assert arr.Re.min() < 2300 and arr.Re.max() > 1e4
        for i in range(m.size):
            h = tube_corr.tube_h_float(float(m[i]), 30.0, 0.02, 4.0, 900.0, 2000.0, 2e-3, 0.12, 3e-3, laminar)
            assert h == pytest.approx(arr.h[i], rel=1e-12)


@settings(max_examples=60, deadline=None)
@given(st.floats(0.0, 80.0), st.floats(0.0, 1.0), st.sampled_from(sorted(thermal.EFFECTIVENESS_ARRANGEMENTS)),
       st.integers(1, 6), st.booleans())
def test_float_effectiveness_equals_the_array_kernel(ntu, cr, arrangement, units, shell_min):
    eps, w = thermal.effectiveness_kernel(np.array([ntu]), np.array([cr]), arrangement, units, np.array([shell_min]))
    e1, w1 = thermal.effectiveness_float(ntu, cr, arrangement, units, shell_min)
    assert e1 == pytest.approx(float(eps[0]), rel=1e-12, abs=1e-15)
    assert w1 == pytest.approx(float(w[0]), rel=1e-9, abs=1e-15)
    assert math.isfinite(e1) and math.isfinite(w1)


@pytest.mark.parametrize("n", [1, 3, 2 * _FLOAT_CASES + 1])
def test_warm_start_changes_only_the_iterations(n):
    # A rating started from a nearby state stops within the iteration tolerance of the cold rating (invariant: the
    # fixed point does not depend on where the iteration starts); a case whose start is NaN starts cold, exactly.
    from revamp.rating import warm_start

    rng = np.random.default_rng(3)
    hx = _exchanger("E", 2, 2)
    svc = rv.Service(shell=rv.Stream(CRUDE, rng.uniform(5.0, 30.0, n), rng.uniform(520.0, 560.0, n)),
                     tube=rv.Stream(OIL, rng.uniform(10.0, 40.0, n), rng.uniform(300.0, 340.0, n)),
                     fouling_shell=3e-4, fouling_tube=2e-4)
    cold = rv.rate(hx, svc)
    state = np.array([np.atleast_1d(getattr(cold, k)) + 0.3 for k in
                      ("t_out_shell", "t_out_tube", "t_wall_shell", "t_wall_tube")])
    state[:, 0] = np.nan
    with warm_start(state):
        warm = rv.rate(hx, svc)
    for name in ("t_out_shell", "t_out_tube"):
        a, b = np.atleast_1d(getattr(warm, name)), np.atleast_1d(getattr(cold, name))
        assert np.allclose(a, b, rtol=0.0, atol=1e-5)
        assert a[0] == b[0]  # the NaN start: the cold path
    with warm_start(np.zeros((4, n + 1))):  # a state that does not fit the cases is ignored
        assert np.array_equal(np.atleast_1d(rv.rate(hx, svc).duty), np.atleast_1d(cold.duty))


@pytest.mark.parametrize("band", [(1.3e4, 9e4), (3e2, 7e2), (3.0, 7.0), (2e5, 6e6), (13.0, 70.0)])
def test_one_band_shortcut_of_the_ideal_bank_fits_equals_the_general_path(band):
    # the same values computed alone (one band, away from the edges: the shortcut) and beside values at every band
    # edge (the general path with its per-case band lookup and blends): identical numbers
    from revamp.correlations import shell_bell_fits as fits

    lr = np.log(np.geomspace(*band, 41))
    assert fits._band_away_from_edges(float(lr.min()), float(lr.max())) is not None
    mixed = np.concatenate([lr, np.log([10.0, 100.0, 1e3, 1e4, 1.1e3])])
    assert fits._band_away_from_edges(float(mixed.min()), float(mixed.max())) is None
    for layout in (30, 45, 90):
        pair = (fits._fit_coefficients(layout, "j"), fits._fit_coefficients(layout, "f"))
        alone = fits._fit_ln(lr, -0.05, pair)
        beside = fits._fit_ln(mixed, -0.05, pair)
        for a, b in zip(alone, beside):
            np.testing.assert_array_equal(a, b[:lr.size])


def test_one_regime_shortcut_of_the_tube_nusselt_kernel_equals_the_blend():
    # all turbulent or all laminar: only that correlation is evaluated; beside a transitional case (the blend of
    # both, weights exactly 0 and 1 outside the transition) the same numbers come out
    pr = np.linspace(3.0, 60.0, 30)
    for re in (np.geomspace(1e4, 3e5, 30), np.geomspace(50.0, 2300.0, 30)):
        alone = tube_corr._nu_tube_kernel(re, pr, 0.003, "sieder-tate")
        beside = tube_corr._nu_tube_kernel(np.append(re, 5000.0), np.append(pr, 10.0), 0.003, "sieder-tate")
        np.testing.assert_array_equal(alone, beside[:-1])
        want = (tube_corr.nu_gnielinski(re, pr, d_over_L=0.003) if re[0] >= 1e4
                else tube_corr.nu_sieder_tate(re, pr, 0.003))
        np.testing.assert_array_equal(alone, want)
