"""Film condensation correlations (revamp.correlations.condensation).

Expected values: ``ht`` (ChEDL, used here only) evaluated at the same states, CoolProp properties of saturated
n-pentane at 3 bar as the states, the published equations written out in the test (each named), and the limits
the methods' authors state.
"""
import CoolProp.CoolProp as CP
import numpy as np
import pytest
from fluids.two_phase_voidage import Zivi
from hypothesis import given, settings
from hypothesis import strategies as st
from ht.condensation import Boyko_Kruzhilin, Nusselt_laminar, Shah
from ht.conv_internal import turbulent_Gnielinski

from revamp.correlations import condensation as cd
from revamp.errors import InputError

P = 3e5
FL = "n-Pentane"
RHO_L = CP.PropsSI("D", "P", P, "Q", 0, FL)
RHO_V = CP.PropsSI("D", "P", P, "Q", 1, FL)
MU_L = CP.PropsSI("V", "P", P, "Q", 0, FL)
MU_V = CP.PropsSI("V", "P", P, "Q", 1, FL)
K_L = CP.PropsSI("L", "P", P, "Q", 0, FL)
K_V = CP.PropsSI("L", "P", P, "Q", 1, FL)
CP_L = CP.PropsSI("C", "P", P, "Q", 0, FL)
CP_V = CP.PropsSI("C", "P", P, "Q", 1, FL)
H_FG = CP.PropsSI("H", "P", P, "Q", 1, FL) - CP.PropsSI("H", "P", P, "Q", 0, FL)
T_SAT = CP.PropsSI("T", "P", P, "Q", 1, FL)
P_C = CP.PropsSI("pcrit", FL)


# ------------------------------------------------------------------------------------------------- shell side
@pytest.mark.parametrize("dT, d", [(3.0, 0.019), (10.0, 0.025), (25.0, 0.0381)])
def test_nusselt_horizontal_tube_against_ht_plate_form(dT, d):
    # ht.Nusselt_laminar is Nusselt's (1916) vertical-plate result, 0.943 [...]^(1/4) with L; the horizontal tube
    # is the same bracket with D for L and the constant 0.725 (Nusselt 1916; Kern 1950)
    plate = Nusselt_laminar(Tsat=T_SAT, Tw=T_SAT - dT, rhog=RHO_V, rhol=RHO_L, kl=K_L, mul=MU_L, Hvap=H_FG, L=d)
    expected = plate * 0.725 / (2 * 2 ** 0.5 / 3)
    assert cd.nusselt_horizontal_tube(RHO_L, RHO_V, K_L, MU_L, H_FG, d, dT) == pytest.approx(expected, rel=1e-9)


@settings(max_examples=20, deadline=None)
@given(dT=st.floats(0.5, 40.0), d=st.floats(0.01, 0.05))
def test_loading_form_is_the_same_film(dT, d):
    # Nusselt's film written with the condensate per unit length, Γ = h π d ΔT / h_fg (energy balance on the tube)
    h = cd.nusselt_horizontal_tube(RHO_L, RHO_V, K_L, MU_L, H_FG, d, dT)
    gamma = h * np.pi * d * dT / H_FG
    assert cd.nusselt_horizontal_tube_loading(RHO_L, RHO_V, K_L, MU_L, gamma) == pytest.approx(h, rel=1e-9)


def test_row_corrections_by_their_equations():
    # Kern (1958) N^(-1/6); Nusselt (1916) N^(-1/4); Eissenberg (1972) 0.60 + 0.42 N^(-1/4)
    n = np.array([1.0, 4.0, 10.0, 30.0])
    assert cd.row_factor(n) == pytest.approx(n ** (-1 / 6))
    assert cd.row_factor(n, "nusselt") == pytest.approx(n ** -0.25)
    assert cd.row_factor(n, "eissenberg") == pytest.approx(0.60 + 0.42 * n ** -0.25)
    assert cd.row_factor(1.0) == 1.0  # one tube: no inundation
    assert set(cd.ROW_CORRECTIONS) == {"kern", "nusselt", "eissenberg"}
    with pytest.raises(InputError, match="^row_correction"):
        cd.row_factor(4, "bogus")


def test_shear_form_by_its_equation():
    # Shekriladze & Gomelauri (1966): Nu = 0.59 Re_tp^(1/2), Re_tp = rho_l u_v d / mu_l
    u, d = 6.0, 0.019
    re = RHO_L * u * d / MU_L
    assert cd.shear_horizontal_tube(RHO_L, K_L, MU_L, u, d) == pytest.approx(0.59 * re ** 0.5 * K_L / d)
    assert cd.shear_horizontal_tube(RHO_L, K_L, MU_L, 0.0, d) == 0.0


@settings(max_examples=25, deadline=None)
@given(hs=st.floats(0.0, 5e4), hg=st.floats(10.0, 5e4))
def test_butterworth_combination_limits(hs, hg):
    # Butterworth (1977): never below either part, equal to the gravity part without shear, and tending to the
    # shear part when shear dominates
    h = cd.butterworth_combination(hs, hg)
    assert h >= max(hs, hg) * (1 - 1e-12)
    assert h <= hs + hg + 1e-9
    assert cd.butterworth_combination(0.0, hg) == pytest.approx(hg)
    assert cd.butterworth_combination(1e3 * hg, hg) == pytest.approx(1e3 * hg, rel=1e-5)


def test_shell_wrapper_combines_and_warns_once():
    r = cd.shell_condensation(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 5.0, n_rows=12, u_v=[0.0, 2.0, 10.0])
    grav = cd.nusselt_horizontal_tube(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 5.0) * 12 ** (-1 / 6)  # Kern
    assert r.h_gravity == pytest.approx(np.full(3, grav))
    assert r.h[0] == pytest.approx(grav)  # no vapour velocity: Nusselt with the row correction
    assert np.all(np.diff(r.h) > 0)  # more vapour shear, a thinner film
    assert r.warnings == ()
    # a film Reynolds number far above Nusselt's laminar range (huge ΔT on a deep column): one warning
    big = cd.shell_condensation(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.05, [200.0, 300.0], n_rows=400)
    assert len(big.warnings) == 1 and "film Re" in big.warnings[0]


def test_shell_wrapper_refuses_bad_input():
    with pytest.raises(InputError, match="^dT"):
        cd.shell_condensation(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 0.0)
    with pytest.raises(InputError, match="^rho_v"):
        cd.shell_condensation(RHO_L, RHO_L * 2, K_L, MU_L, H_FG, 0.019, 5.0)
    with pytest.raises(InputError, match="^n_rows"):
        cd.shell_condensation(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 5.0, n_rows=0.5)
    with pytest.raises(InputError, match="^h_vapour"):
        cd.shell_condensation(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 5.0, z=0.1)


# -------------------------------------------------------------------------------------------------- tube side
@pytest.mark.parametrize("x", [0.05, 0.3, 0.6, 0.95])
@pytest.mark.parametrize("G", [80.0, 300.0])
def test_shah_1979_against_ht(x, G):
    # ht.condensation.Shah (Shah 1979, Dittus-Boelter with the whole flow as liquid) at saturated pentane states
    d = 0.02
    m = G * np.pi / 4 * d ** 2
    expected = Shah(m=m, x=x, D=d, rhol=RHO_L, mul=MU_L, kl=K_L, Cpl=CP_L, P=P, Pc=P_C)
    assert cd.shah_1979(G, x, d, RHO_L, MU_L, K_L, CP_L, P / P_C) == pytest.approx(expected, rel=1e-9)


def test_shah_plausible_beside_boyko_kruzhilin():
    # a plausibility band, not a value check: Boyko & Kruzhilin (1967, ht) is a different annular-flow correlation;
    # published comparisons put the two within a factor of about 2 at moderate pressure (common practice, no source)
    d, G, x = 0.02, 300.0, 0.5
    bk = Boyko_Kruzhilin(m=G * np.pi / 4 * d ** 2, rhog=RHO_V, rhol=RHO_L, kl=K_L, mul=MU_L, Cpl=CP_L, D=d, x=x)
    ratio = cd.shah_1979(G, x, d, RHO_L, MU_L, K_L, CP_L, P / P_C) / bk
    assert 0.5 < ratio < 2.0


@pytest.mark.parametrize("x", [0.2, 0.5, 1.0])
def test_stratified_form_is_nusselt_times_void_share(x):
    # Jaster & Kosky (1976): 0.728 α^(3/4) [...]^(1/4); the bracket from ht.Nusselt_laminar (0.943 plate form with
    # L = d), α from fluids' Zivi (1964) void fraction
    d, dT = 0.02, 6.0
    plate = Nusselt_laminar(Tsat=T_SAT, Tw=T_SAT - dT, rhog=RHO_V, rhol=RHO_L, kl=K_L, mul=MU_L, Hvap=H_FG, L=d)
    alpha = Zivi(x, RHO_L, RHO_V)
    expected = plate / (2 * 2 ** 0.5 / 3) * 0.728 * alpha ** 0.75
    assert cd.stratified_jaster_kosky(x, RHO_L, RHO_V, K_L, MU_L, H_FG, d, dT) == pytest.approx(expected, rel=1e-9)
    assert cd.zivi_void_fraction(x, RHO_L, RHO_V) == pytest.approx(alpha, rel=1e-12)


def test_tube_wrapper_takes_the_larger_and_warns_once_per_quantity():
    x = np.linspace(0.0, 1.0, 11)
    r = cd.tube_condensation(30.0, x, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, P / P_C, 5.0)
    assert np.all(r.h == np.maximum(r.h_shear, r.h_gravity))
    assert r.warnings == ()
    # reduced pressure below Shah's 0.002 and Re_LO below 350, in several cases: one warning per quantity
    low = cd.tube_condensation([1.0, 1.5], 0.5, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, [0.001, 0.0015], 5.0)
    assert len(low.warnings) == 2
    assert any("p_r" in w for w in low.warnings) and any("Re_LO" in w for w in low.warnings)
    with pytest.raises(InputError, match="^p_r"):  # a table curve without a critical pressure
        cd.tube_condensation(100.0, 0.5, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, float("nan"), 5.0)
    with pytest.raises(InputError, match="^x"):
        cd.tube_condensation(100.0, 1.2, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, 0.1, 5.0)
    with pytest.raises(InputError, match="^method"):
        cd.tube_condensation(100.0, 0.5, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, 0.1, 5.0, method="x")


def test_vapour_coefficient_is_gnielinski_at_the_vapour_reynolds():
    # ht.conv_internal.turbulent_Gnielinski with Petukhov's friction (0.790 ln Re - 1.64)^-2 at Re_v = x G d / mu_v
    G, x, d = 300.0, 0.8, 0.02
    re = x * G * d / MU_V
    pr = CP_V * MU_V / K_V
    fd = (0.790 * np.log(re) - 1.64) ** -2
    expected = turbulent_Gnielinski(Re=re, Pr=pr, fd=fd) * K_V / d
    assert cd.vapour_h_tube(G, x, d, MU_V, K_V, CP_V) == pytest.approx(expected, rel=1e-9)


def test_bell_ghaly_by_hand():
    # Silver (1947), Bell & Ghaly (1973): 1/h = 1/h_f + Z/h_g; 1/2000 + 0.1/200 = 1/1000
    assert cd.bell_ghaly(2000.0, 200.0, 0.1) == pytest.approx(1000.0)
    assert cd.bell_ghaly(2000.0, 200.0, 0.0) == pytest.approx(2000.0)  # pure fluid
    r = cd.tube_condensation(200.0, 0.5, 0.02, RHO_L, RHO_V, MU_L, K_L, CP_L, H_FG, P / P_C, 5.0, z=0.1,
                             h_vapour=200.0)
    assert r.h == pytest.approx(1.0 / (1.0 / r.h_film + 0.1 / 200.0))


def test_modified_latent_heat_rohsenow():
    # Rohsenow (1956): h_fg' = h_fg + 0.68 cp ΔT
    assert cd.modified_latent_heat(3e5, 2500.0, 10.0) == pytest.approx(3e5 + 0.68 * 2500 * 10)


def test_kernels_are_array_native():
    out = cd.nusselt_horizontal_tube(RHO_L, RHO_V, K_L, MU_L, H_FG, np.array([[0.019], [0.025]]), [2.0, 5.0, 9.0])
    assert out.shape == (2, 3)
    assert isinstance(cd.nusselt_horizontal_tube(RHO_L, RHO_V, K_L, MU_L, H_FG, 0.019, 5.0), float)
