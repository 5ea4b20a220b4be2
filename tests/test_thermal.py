"""Tests of revamp.thermal against ht (ht.core.LMTD, ht.hx) and the closed forms of Kays & London / Bowman et al."""
import math

import numpy as np
import pytest
from ht.core import LMTD as ht_LMTD
from ht.hx import F_LMTD_Fakheri, NTU_from_effectiveness, effectiveness_from_NTU
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from revamp import thermal as th
from revamp.errors import InputError

ntus = st.floats(0.01, 8.0)
crs = st.floats(0.0, 1.0)
arrs = st.sampled_from(th.ARRANGEMENTS)
shells_st = st.integers(1, 4)
HT_SUBTYPE = {"counterflow": "counterflow", "parallel": "parallel", "E": "S&T"}


# ------------------------------------------------------------------------------------------------------ LMTD
@pytest.mark.parametrize("Thi,Tho,Tci,Tco", [(100.0, 60.0, 30.0, 40.2), (150.0, 90.0, 20.0, 80.0),
                                             (300.0, 250.0, 100.0, 200.0)])
def test_lmtd_vs_ht(Thi, Tho, Tci, Tco):
    assert th.lmtd(Thi - Tco, Tho - Tci) == pytest.approx(ht_LMTD(Thi, Tho, Tci, Tco), rel=1e-12)  # ht.LMTD


def test_lmtd_equal_and_near_equal():
    assert th.lmtd(10.0, 10.0) == 10.0  # the limit of the log mean is the common value
    # near equality: log mean = arithmetic mean - (a-b)^2/(12 m) to 2nd order (Taylor series of the definition)
    a, b = 10.0 + 1e-6, 10.0
    assert th.lmtd(a, b) == pytest.approx((a + b) / 2 - (a - b) ** 2 / (12 * 10.0), rel=1e-14)


@settings(max_examples=50, deadline=None)
@given(st.floats(1e-3, 1e3), st.floats(1e-3, 1e3))
def test_lmtd_symmetric_and_between_means(a, b):
    v = th.lmtd(a, b)
    assert v == pytest.approx(th.lmtd(b, a), rel=1e-12)
    # geometric mean <= logarithmic mean <= arithmetic mean (classical inequality)
    assert math.sqrt(a * b) * (1 - 1e-12) <= v <= (a + b) / 2 * (1 + 1e-12)


@pytest.mark.parametrize("dt1,dt2", [(-5.0, 10.0), (10.0, 0.0), ([5.0, -1.0], [3.0, 3.0])])
def test_lmtd_cross_raises(dt1, dt2):
    with pytest.raises(InputError) as e:
        th.lmtd(dt1, dt2)
    assert e.value.field == "terminal temperature difference" and "cross" in str(e.value)


def test_lmtd_shapes():
    a = th.lmtd(np.array([20.0, 10.0]), 10.0)
    assert isinstance(th.lmtd(20.0, 10.0), float) and a.shape == (2,)
    assert np.allclose(a, th.lmtd([20.0, 10.0], [10.0, 10.0]))


# ---------------------------------------------------------------------------------------------------------- F
CASES = [(150.0, 100.0, 30.0, 70.0), (150.0, 90.0, 30.0, 80.0), (100.0, 60.0, 20.0, 60.0), (200.0, 120.0, 50.0, 110.0),
         (120.0, 80.0, 40.0, 80.0)]  # last one has R = 1


@pytest.mark.parametrize("shells", [1, 2, 3, 4])
@pytest.mark.parametrize("Thi,Tho,Tci,Tco", CASES)
def test_F_vs_ht_fakheri(Thi, Tho, Tci, Tco, shells):
    R = (Thi - Tho) / (Tco - Tci)
    P = (Tco - Tci) / (Thi - Tci)
    try:
        expected = F_LMTD_Fakheri(Thi, Tho, Tci, Tco, shells=shells)  # ht: Fakheri's closed form
    except (ValueError, ZeroDivisionError):
        pytest.skip("ht cannot evaluate this case")
    if isinstance(expected, complex) or not math.isfinite(expected):
        assert math.isnan(th.F_series(R, P, shells))
    else:
        assert th.F_series(R, P, shells) == pytest.approx(expected, rel=1e-9)
        if shells == 1:
            assert th.F_1_2N(R, P) == pytest.approx(expected, rel=1e-9)


def test_F_R1_limit_continuous():
    f1 = th.F_1_2N(1.0, 0.4)
    assert th.F_1_2N(1.0 + 1e-5, 0.4) == pytest.approx(f1, rel=1e-4)
    assert th.F_1_2N(1.0 - 1e-5, 0.4) == pytest.approx(f1, rel=1e-4)


def test_F_infeasible_is_nan():
    # a 1-2 shell at R = 1 cannot exceed P = 2/(2 + sqrt 2) = 0.586 (Kays & London asymptote)
    assert math.isnan(th.F_1_2N(1.0, 0.7))
    assert math.isnan(th.F_1_2N(0.5, 1.2))
    out = th.F_1_2N([1.0, 1.0], [0.3, 0.7])
    assert np.isfinite(out[0]) and np.isnan(out[1])
    assert th.F_series(1.0, 0.7, 3) > 0.5  # three shells in series can do it


# ------------------------------------------------------------------------------------------- effectiveness
@pytest.mark.parametrize("arr", th.ARRANGEMENTS)
@pytest.mark.parametrize("shells", [1, 2, 4])
@pytest.mark.parametrize("NTU,Cr", [(0.5, 0.0), (1.7, 0.3), (3.0, 0.75), (6.0, 0.999)])
def test_effectiveness_vs_ht(arr, shells, NTU, Cr):
    if arr != "E" and shells > 1:
        # ht has no series option for these; N counterflow units in series are one counterflow unit
        if arr == "counterflow":
            assert th.effectiveness(NTU, Cr, arr, shells) == pytest.approx(
                effectiveness_from_NTU(NTU, Cr, "counterflow"), rel=1e-9)
        return
    kw = {"n_shell_tube": shells} if arr == "E" else {}
    expected = effectiveness_from_NTU(NTU, Cr, HT_SUBTYPE[arr], **kw)  # ht.hx (Kays & London forms)
    assert th.effectiveness(NTU, Cr, arr, shells) == pytest.approx(expected, rel=1e-9)
    assert th.ntu_from_effectiveness(expected, Cr, arr, shells) == pytest.approx(
        NTU_from_effectiveness(expected, Cr, HT_SUBTYPE[arr], **kw), rel=1e-6)


@pytest.mark.parametrize("arr", th.ARRANGEMENTS)
@pytest.mark.parametrize("shells", [1, 3])
def test_effectiveness_Cr1_matches_limit_of_ht(arr, shells):
    # ht divides 0/0 at Cr = 1 with several shells; compare with ht just below 1
    sub = HT_SUBTYPE[arr]
    if arr == "parallel" and shells > 1:
        return
    kw = {"n_shell_tube": shells} if arr == "E" else {}
    near = effectiveness_from_NTU(2.0, 1.0 - 1e-7, sub, **kw)
    assert th.effectiveness(2.0, 1.0, arr, shells) == pytest.approx(near, rel=1e-5)


@pytest.mark.parametrize("arr", th.ARRANGEMENTS)
@pytest.mark.parametrize("shells", [1, 2])
def test_Cr0_is_one_minus_exp(arr, shells):
    assert th.effectiveness(1.3, 0.0, arr, shells) == pytest.approx(1 - math.exp(-1.3))  # Kays & London, Cr = 0


@settings(max_examples=50, deadline=None)
@given(ntus, ntus, crs, arrs, shells_st)
def test_effectiveness_bounds_and_monotone(n1, n2, cr, arr, shells):
    e1, e2 = th.effectiveness(n1, cr, arr, shells), th.effectiveness(n2, cr, arr, shells)
    emax = th.max_effectiveness(cr, arr, shells)
    for e in (e1, e2):
        assert 0.0 <= e <= emax * (1 + 1e-12) <= 1.0 + 1e-12
    if n2 > n1 * (1 + 1e-9):
        assert e2 >= e1  # more area never lowers effectiveness


@settings(max_examples=50, deadline=None)
@given(ntus, crs, arrs, shells_st)
def test_ntu_round_trip(ntu, cr, arr, shells):
    e = th.effectiveness(ntu, cr, arr, shells)
    assume(e < 0.999 * th.max_effectiveness(cr, arr, shells))  # flat tail: inversion ill-conditioned
    assert th.ntu_from_effectiveness(e, cr, arr, shells) == pytest.approx(ntu, rel=1e-6)


@settings(max_examples=50, deadline=None)
@given(st.floats(0.05, 5.0), st.floats(0.0, 1.0), shells_st)
def test_F_LMTD_UA_equals_eps_NTU_duty(ntu, cr, shells):
    # rate one case both ways: Q = eps Cmin dTmax must equal UA F LMTD (consistency of the two methods)
    cmin, thi, tci = 1000.0, 420.0, 300.0
    cmax = cmin / cr if cr > 1e-12 else 1e300  # Cr -> 0: an (almost) isothermal cold stream
    e = th.effectiveness(ntu, cr, "E", shells)
    tho, tco, q = th.outlets(thi, tci, cmin, cmax, e)  # hot stream is Cmin
    assume(tho - tci > 1e-6 and q > 1e-3)
    R = cr
    P = e
    F = th.F_series(R, P, shells)
    dt1, dt2 = thi - tco, tho - tci
    assume(dt1 > 0 and dt2 > 0 and np.isfinite(F))
    lm = th.lmtd(dt1, dt2)
    assert ntu * cmin * F * lm == pytest.approx(q, rel=1e-6)


def test_beyond_max_is_nan_and_at_max_is_inf():
    emax = th.max_effectiveness(1.0, "E")
    assert emax == pytest.approx(2 / (2 + math.sqrt(2)))  # Kays & London: NTU -> inf, Cr = 1
    out = th.ntu_from_effectiveness([0.3, 0.7], 1.0, "E")
    assert np.isfinite(out[0]) and np.isnan(out[1])
    assert math.isinf(th.ntu_from_effectiveness(emax, 1.0, "E"))
    # parallel flow cannot pass eps = 1/(1+Cr) = 0.667 at Cr = 0.5 (Kays & London)
    assert math.isnan(th.ntu_from_effectiveness(0.7, 0.5, "parallel"))
    assert math.isfinite(th.ntu_from_effectiveness(0.6, 0.5, "parallel"))


def test_outlets_energy_balance():
    tho, tco, q = th.outlets(np.array([400.0, 420.0]), 300.0, 2000.0, [1500.0, 4000.0], 0.6)
    assert np.allclose(2000.0 * (np.array([400.0, 420.0]) - tho), q)  # first law on the hot side
    assert np.allclose(np.array([1500.0, 4000.0]) * (tco - 300.0), q)  # and on the cold side
    assert np.allclose(q, 0.6 * np.minimum(2000.0, [1500.0, 4000.0]) * (np.array([400.0, 420.0]) - 300.0))


@pytest.mark.parametrize("call", [
    lambda: th.effectiveness(1.0, 1.5), lambda: th.effectiveness(-1.0, 0.5), lambda: th.effectiveness(1.0, 0.5, "X"),
    lambda: th.effectiveness(1.0, 0.5, "E", 0), lambda: th.effectiveness(1.0, 0.5, "E", 1.5),
    lambda: th.ntu_from_effectiveness(1.2, 0.5), lambda: th.outlets(300.0, 400.0, 1.0, 1.0, 0.5),
    lambda: th.outlets(400.0, 300.0, -1.0, 1.0, 0.5), lambda: th.F_1_2N(-0.5, 0.3),
    lambda: th.F_series(0.5, 0.3, 0), lambda: th.effectiveness(float("nan"), 0.5),
])
def test_bad_input(call):
    with pytest.raises(InputError):
        call()


def test_shapes_scalar_list_array():
    ntu = [0.5, 1.0, 2.0]
    a = th.effectiveness(np.array(ntu), 0.4, "E", 2)
    b = th.effectiveness(ntu, 0.4, "E", 2)
    assert a.shape == (3,) and np.allclose(a, b)
    assert all(isinstance(th.effectiveness(n, 0.4, "E", 2), float) for n in ntu)
    assert np.allclose(a, [th.effectiveness(n, 0.4, "E", 2) for n in ntu])
    assert np.allclose(th.ntu_from_effectiveness(a, 0.4, "E", 2), ntu)
    big = th.effectiveness(np.linspace(0, 5, 10_000), np.linspace(0, 1, 10_000), "E", 3)
    assert big.shape == (10_000,) and np.all(np.isfinite(big))


# ------------------------------------------------------------------------------ shell types and stated accuracies
@settings(max_examples=40, deadline=None)
@given(st.floats(0.0, 60.0), st.floats(0.0, 60.0), crs, st.sampled_from(th.EFFECTIVENESS_ARRANGEMENTS), shells_st,
       st.booleans())
def test_every_arrangement_bounded_monotone_and_complement_consistent(n1, n2, cr, arr, shells, smin):
    # 0 <= eps <= 1 and eps non-decreasing in NTU (Kays & London 1984: more area never less duty), except the J
    # shells with two or more tube passes, whose published P1 passes a maximum and falls (a temperature cross in the
    # second pass: Shah & Sekulić 2003 §3.6; ht's TEMA J gives 0.462 at NTU1 = 1 and 0.458 at 15 for R1 = 1); the
    # kernel's 1 - eps agrees with the subtraction where that has its digits
    e1 = th.effectiveness(n1, cr, arr, shells, smin)
    e2 = th.effectiveness(n2, cr, arr, shells, smin)
    assert 0.0 <= e1 <= 1.0 and 0.0 <= e2 <= 1.0
    if n2 > n1 and arr not in ("J2", "J4"):
        assert e2 >= e1 - 1e-12
    eps, w = th.effectiveness_kernel(np.array(n1), np.array(cr), arr, shells, np.array(smin))
    assert float(w) == pytest.approx(1.0 - float(eps), abs=1e-12)


def test_one_two_N_formula_for_four_passes_within_stated_gap():
    # the F_1_2N docstring: within 0.6 % of the exact 1-4 relation where F >= 0.8 (ht's TEMA E, four passes)
    from ht.hx import temperature_effectiveness_TEMA_E
    worst = 0.0
    for R in np.linspace(0.05, 4.0, 40):
        for N in np.geomspace(0.05, 10.0, 60):
            P = temperature_effectiveness_TEMA_E(R, N, Ntp=4)
            e, cr = (P, R) if R <= 1 else (P * R, 1 / R)
            F_exact = th.ntu_from_effectiveness(e, cr, "counterflow") / (N if R <= 1 else N * R)
            F_12 = th.F_1_2N(R, P)
            if F_exact >= 0.8 and np.isfinite(F_12):
                worst = max(worst, abs(F_12 / F_exact - 1))
    assert 1e-3 < worst < 6e-3


def test_F_series_is_nan_where_infeasible_and_keeps_the_feasible_elements():
    """P R >= 1 (the hot outlet below the cold inlet) has no F: NaN for that element, never an exception for the
    array; the feasible element equals ht's Fakheri form (ht.F_LMTD_Fakheri, 2 shells)."""
    F = th.F_series(np.array([3.0, 0.5]), np.array([0.5, 0.5]), 2)
    assert np.isnan(F[0])
    # R = 0.5, P = 0.5: cold 0 -> 50, hot 100 -> 75 (ht, independent)
    assert F[1] == pytest.approx(F_LMTD_Fakheri(Thi=100.0, Tho=75.0, Tci=0.0, Tco=50.0, shells=2), rel=1e-9)
    assert np.isnan(th.F_series(3.0, 0.5, 1))
