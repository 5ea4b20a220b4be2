"""Tests of revamp.correlations.tube against ht, fluids and the published equations written out here."""
import math

import numpy as np
import pytest
from fluids.friction import Clamond, Swamee_Jain_1976
from ht.conv_internal import (
    laminar_entry_Seider_Tate,
    laminar_entry_thermal_Hausen,
    turbulent_Gnielinski,
)
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.correlations import tube as T
from revamp.correlations.inserts import TwistedTapeInsert
from revamp.errors import InputError


def petukhov(Re):
    # Petukhov (1970), Advances in Heat Transfer 6: f = (0.790 ln Re - 1.64)^-2, written from the paper's form
    return (0.790 * math.log(Re) - 1.64) ** -2


# ------------------------------------------------------------------------------------------------ friction
@pytest.mark.parametrize("Re", [1e4, 1e5, 1e6])
def test_petukhov_equation(Re):
    assert T.friction_petukhov(Re) == pytest.approx(petukhov(Re), rel=1e-12)  # Petukhov (1970)


@pytest.mark.parametrize("Re", [100.0, 1000.0, 2299.0])
def test_friction_laminar_is_hagen_poiseuille(Re):
    assert T.friction_darcy(Re) == pytest.approx(64.0 / Re, rel=1e-12)  # Hagen-Poiseuille, f = 64/Re


@pytest.mark.parametrize("Re", [5e3, 1e4, 1e5, 1e6])
@pytest.mark.parametrize("eD", [0.0, 1e-4, 1e-3])
def test_friction_turbulent_swamee_jain_and_colebrook(Re, eD):
    f = T.friction_darcy(Re, eD)
    # fluids: Swamee & Jain (1976); fluids writes the paper's 5.74/Re^0.9 as (6.97/Re)^0.9, hence rel 1e-5
    assert f == pytest.approx(Swamee_Jain_1976(Re, eD), rel=1e-5)
    assert f == pytest.approx(Clamond(Re, eD), rel=0.02)  # fluids: exact Colebrook solution; S-J within ~1-2 %


def test_friction_blend_continuous():
    for Re0 in (T.RE_LAMINAR, T.RE_FRICTION_TURBULENT):  # our blend ends; continuity is the property claimed
        lo, hi = T.friction_darcy([Re0 * (1 - 1e-9), Re0 * (1 + 1e-9)], 1e-4)
        assert lo == pytest.approx(hi, rel=1e-6)


# ------------------------------------------------------------------------------------------- heat transfer
@pytest.mark.parametrize("Re,Pr", [(1e4, 0.7), (5e4, 5.0), (1e6, 100.0)])
def test_gnielinski_vs_ht(Re, Pr):
    fd = petukhov(Re)
    assert T.nu_gnielinski(Re, Pr) == pytest.approx(turbulent_Gnielinski(Re, Pr, fd), rel=1e-12)  # ht
    assert T.nu_gnielinski(Re, Pr, f=0.03) == pytest.approx(turbulent_Gnielinski(Re, Pr, 0.03), rel=1e-12)
    # entrance factor [1 + (d/L)^(2/3)], Gnielinski (2013) IJHMT 63:134
    assert T.nu_gnielinski(Re, Pr, d_over_L=0.01) == pytest.approx(
        turbulent_Gnielinski(Re, Pr, fd) * (1 + 0.01 ** (2 / 3)), rel=1e-12)


@pytest.mark.parametrize("Re,Pr,L,D", [(1000, 50.0, 3.0, 0.02), (2000, 200.0, 6.0, 0.025), (100, 5.0, 2.0, 0.02)])
def test_laminar_vs_ht(Re, Pr, L, D):
    st_ht = max(laminar_entry_Seider_Tate(Re, Pr, L, D), 3.66)  # ht; floor 3.66 = constant-wall-T limit
    assert T.nu_sieder_tate(Re, Pr, D / L) == pytest.approx(st_ht, rel=1e-12)
    assert T.nu_laminar(Re, Pr, D / L) == pytest.approx(st_ht, rel=1e-12)  # Sieder-Tate is the default
    assert T.nu_hausen(Re, Pr, D / L) == pytest.approx(laminar_entry_thermal_Hausen(Re, Pr, L, D), rel=1e-12)
    assert T.nu_laminar(Re, Pr, D / L, "hausen") == pytest.approx(
        laminar_entry_thermal_Hausen(Re, Pr, L, D), rel=1e-12)


def test_sieder_tate_floor():
    # very long tube, Gz -> 0: fully developed constant wall temperature value 3.66 (common practice floor)
    assert T.nu_sieder_tate(10.0, 1.0, 1e-4) == pytest.approx(3.66)


def test_laminar_registry_maps_to_intended_functions():
    assert T.LAMINAR_METHODS["sieder-tate"] is T.nu_sieder_tate
    assert T.LAMINAR_METHODS["hausen"] is T.nu_hausen
    with pytest.raises(InputError):
        T.nu_laminar(1000, 5, 0.01, "seider")


def test_nu_tube_regimes_vs_ht():
    D, L, Pr = 0.02, 4.0, 6.0
    # laminar: ht Sieder-Tate
    assert T.nu_tube(1500, Pr, D / L) == pytest.approx(max(laminar_entry_Seider_Tate(1500, Pr, L, D), 3.66))
    # turbulent: ht Gnielinski with Petukhov f and the entrance factor (Gnielinski 2013)
    ent = 1 + (D / L) ** (2 / 3)
    assert T.nu_tube(3e4, Pr, D / L) == pytest.approx(turbulent_Gnielinski(3e4, Pr, petukhov(3e4)) * ent)
    # transition: Gnielinski (2013) linear blend, gamma = (Re - 2300)/(1e4 - 2300)
    Re = 6000.0
    g = (Re - 2300) / (1e4 - 2300)
    lam = max(laminar_entry_Seider_Tate(2300, Pr, L, D), 3.66)
    turb = turbulent_Gnielinski(1e4, Pr, petukhov(1e4)) * ent
    assert T.nu_tube(Re, Pr, D / L) == pytest.approx((1 - g) * lam + g * turb, rel=1e-12)


@pytest.mark.parametrize("Re0", [2300.0, 1e4])
def test_nu_tube_blend_continuous(Re0):
    lo, hi = T.nu_tube([Re0 * (1 - 1e-9), Re0 * (1 + 1e-9)], 4.0, 0.005)
    assert lo == pytest.approx(hi, rel=1e-6)


@settings(max_examples=50, deadline=None)
@given(st.floats(100, 1e6), st.floats(0.7, 500), st.floats(1e-4, 0.05))
def test_nu_tube_positive_and_at_least_laminar_floor(Re, Pr, dl):
    assert T.nu_tube(Re, Pr, dl) >= 3.66 - 1e-12  # fully developed laminar limit is the lowest Nu


def test_viscosity_correction_vs_ht():
    # ht's Sieder-Tate with (mu/mu_w)^0.14 divided by the one without
    ratio = laminar_entry_Seider_Tate(1000, 20, 3.0, 0.02, mu=2e-3, mu_w=1e-3) / laminar_entry_Seider_Tate(
        1000, 20, 3.0, 0.02)
    assert T.viscosity_correction(2e-3, 1e-3) == pytest.approx(ratio, rel=1e-12)
    assert T.prandtl_correction(10.0, 5.0) == pytest.approx(2 ** 0.11)  # Gnielinski (1976) (Pr/Pr_w)^0.11


# ------------------------------------------------------------------------------------------------ tube_side
WATER = {"rho": 995.0, "cp": 4180.0, "mu": 0.8e-3, "k": 0.615}  # invented round numbers near water at 30 °C


def test_tube_side_turbulent_hand_check():
    m, n, d, L, passes = 20.0, 120, 0.0198, 6.0, 2
    r = T.tube_side(m, n, d, L, passes, **WATER, rel_roughness=1e-4, d_nozzle=0.15)
    v = m / (WATER["rho"] * n * math.pi * d**2 / 4)  # definition of mean velocity
    Re = WATER["rho"] * v * d / WATER["mu"]
    Pr = WATER["cp"] * WATER["mu"] / WATER["k"]
    assert r.velocity == pytest.approx(v)
    assert r.Re == pytest.approx(Re) and r.Pr == pytest.approx(Pr)
    assert Re > 1e4
    nu = turbulent_Gnielinski(Re, Pr, petukhov(Re)) * (1 + (d / L) ** (2 / 3))  # ht + Gnielinski (2013)
    assert r.Nu == pytest.approx(nu) and r.h == pytest.approx(nu * WATER["k"] / d)
    f = Swamee_Jain_1976(Re, 1e-4)  # fluids (its 5.74 is (6.97)^0.9: agrees to ~1e-6)
    head = WATER["rho"] * v**2 / 2
    assert r.dp_friction == pytest.approx(f * L * passes / d * head, rel=1e-5)
    assert r.dp_return == pytest.approx(4 * passes * head)  # Kern (1950): 4 velocity heads per pass
    vn = m / (WATER["rho"] * math.pi * 0.15**2 / 4)
    assert r.dp_nozzle == pytest.approx(2 * 1.5 * WATER["rho"] * vn**2 / 2)  # common practice, no source
    assert r.dp == pytest.approx(r.dp_friction + r.dp_return + r.dp_nozzle)
    assert r.warnings == []


def test_tube_side_viscosity_ratio():
    a = T.tube_side(20.0, 120, 0.0198, 6.0, 2, **WATER)
    b = T.tube_side(20.0, 120, 0.0198, 6.0, 2, **WATER, mu_wall=0.5e-3)
    phi = (0.8 / 0.5) ** 0.14  # Sieder & Tate (1936)
    assert b.h == pytest.approx(a.h * phi)
    assert b.dp_friction == pytest.approx(a.dp_friction / phi)  # Kern (1950): friction divided by phi


def test_tube_side_warnings():
    r = T.tube_side([0.5, 10.0], 120, 0.0198, 6.0, 2, **WATER)
    assert any("transitional" in w for w in r.warnings)
    oil = {"rho": 850.0, "cp": 2000.0, "mu": 2.0, "k": 0.12}  # Pr ~ 33000 laminar, above Sieder-Tate's tested range
    r = T.tube_side(1.0, 120, 0.0198, 6.0, 2, **oil)
    assert any("Sieder-Tate" in w and "Pr" in w for w in r.warnings)


def test_tube_side_with_insert_uses_insert():
    ins = TwistedTapeInsert(4.0, 0.03)
    plain = T.tube_side(20.0, 120, 0.0198, 6.0, 2, **WATER)
    r = T.tube_side(20.0, 120, 0.0198, 6.0, 2, **WATER, insert=ins)
    assert r.Nu == pytest.approx(ins.nu(plain.Re, plain.Pr, 0.0198 / 6.0))
    assert r.f == pytest.approx(ins.friction(plain.Re))
    assert r.h > plain.h and r.dp > plain.dp


def test_tube_side_scalar_list_array_agree():
    flows = [5.0, 20.0, 40.0]
    a = T.tube_side(np.array(flows), 120, 0.0198, 6.0, 2, **WATER)
    b = T.tube_side(flows, 120, 0.0198, 6.0, 2, **WATER)
    for i, m in enumerate(flows):
        s = T.tube_side(m, 120, 0.0198, 6.0, 2, **WATER)
        assert isinstance(s.h, float)
        assert s.h == pytest.approx(a.h[i]) and s.dp == pytest.approx(b.dp[i])
    assert np.shape(a.Pr) == (3,)
    assert isinstance(T.nu_tube(5000.0, 5.0, 0.01), float)
    assert np.allclose(T.nu_tube([5000.0, 2e4], 5.0, 0.01), T.nu_tube(np.array([5000.0, 2e4]), 5.0, 0.01))


def test_tube_side_units_strings():
    a = T.tube_side("72000 kg/h", 120, "19.8 mm", "6 m", 2, **WATER)
    b = T.tube_side(20.0, 120, 0.0198, 6.0, 2, **WATER)
    assert a.h == pytest.approx(b.h)


@pytest.mark.parametrize("kw", [{"m_dot": -1.0}, {"d_i": 0.0}, {"passes": 1.5}, {"n_tubes_per_pass": 0},
                                {"mu": -1e-3}, {"rel_roughness": -0.1}])
def test_tube_side_bad_input(kw):
    args = dict(m_dot=20.0, n_tubes_per_pass=120, d_i=0.0198, length=6.0, passes=2, **WATER)
    args.update(kw)
    with pytest.raises(InputError):
        T.tube_side(**args)


def test_tube_side_large_array():
    m = np.linspace(0.5, 60.0, 10_000)
    r = T.tube_side(m, 120, 0.0198, 6.0, 2, **WATER, mu_wall=0.6e-3)
    assert r.h.shape == (10_000,) and np.all(np.isfinite(r.h)) and np.all(np.diff(r.dp) > 0)


def test_swamee_jain_accuracy_as_stated_against_colebrook():
    # the friction_darcy docstring: within 3 % of Colebrook for 5000 < Re < 1e8, 1e-6 < e/d < 1e-2, 2.8 % at
    # Re = 5000, e/d = 0.01 (fluids.friction.Colebrook, an independent implementation)
    import warnings

    from fluids.friction import Colebrook

    from revamp.correlations.tube import friction_darcy

    worst = 0.0
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RuntimeWarning)
        for Re in np.geomspace(5000, 1e8, 25):
            for e in np.geomspace(1e-6, 1e-2, 9):
                worst = max(worst, abs(friction_darcy(Re, e) / Colebrook(Re, e) - 1))
        assert friction_darcy(5000.0, 0.01) / Colebrook(5000.0, 0.01) - 1 == pytest.approx(0.028, abs=1e-3)
    assert worst < 0.03


def test_kernels_equal_the_public_functions_across_the_regimes():
    # the rating loop's kernels must give what the documented public functions give (same published forms)
    from revamp.correlations.tube import _friction_kernel, _nu_tube_kernel, friction_darcy, nu_tube

    Re = np.geomspace(50.0, 2e6, 400)
    Pr = np.linspace(0.7, 400.0, 400)
    assert np.allclose(_nu_tube_kernel(Re, Pr, 0.004, "sieder-tate"), nu_tube(Re, Pr, 0.004), rtol=1e-13)
    assert np.allclose(_nu_tube_kernel(Re, Pr, 0.004, "hausen"), nu_tube(Re, Pr, 0.004, "hausen"), rtol=1e-13)
    assert np.allclose(_friction_kernel(Re, 1e-4), friction_darcy(Re, 1e-4), rtol=1e-13)
