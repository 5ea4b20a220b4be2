"""Two-phase pressure drop (revamp.correlations.two_phase).

Expected values: ``fluids.two_phase`` (ChEDL, used here only) at the same states, scipy quadrature of those
gradients for the path integral, CoolProp saturation temperatures for the condensing-temperature drop, and the
methods' stated limits.
"""
import CoolProp.CoolProp as CP
import numpy as np
import pytest
from fluids import two_phase as ftp
from fluids.two_phase_voidage import Zivi
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from revamp.correlations import two_phase as tp
from revamp.errors import InputError
from revamp.fluids import condensing, condensing_curve, water

P = 3e5
FL = "n-Pentane"
RHO_L = CP.PropsSI("D", "P", P, "Q", 0, FL)
RHO_V = CP.PropsSI("D", "P", P, "Q", 1, FL)
MU_L = CP.PropsSI("V", "P", P, "Q", 0, FL)
MU_V = CP.PropsSI("V", "P", P, "Q", 1, FL)
SIGMA = CP.PropsSI("I", "P", P, "Q", 0, FL)
D = 0.02
AREA = np.pi / 4 * D ** 2
STATE = dict(rhol=RHO_L, rhog=RHO_V, mul=MU_L, mug=MU_V, D=D)
XS = [0.05, 0.3, 0.6, 0.9]


@pytest.mark.parametrize("x", XS)
@pytest.mark.parametrize("G", [50.0, 300.0])
def test_lockhart_martinelli_against_fluids(x, G):
    # fluids.two_phase.Lockhart_Martinelli: Chisholm's C by regime, the original friction factors (same as ours)
    expected = ftp.Lockhart_Martinelli(m=G * AREA, x=x, **STATE)
    assert tp.dp_lockhart_martinelli(G, x, D, RHO_L, RHO_V, MU_L, MU_V) == pytest.approx(expected, rel=1e-9)


@pytest.mark.parametrize("x", XS)
@pytest.mark.parametrize("G", [150.0, 400.0])
def test_friedel_against_fluids(x, G):
    # fluids.two_phase.Friedel uses Clamond's exact Colebrook friction and Fr^0.0454; we use Swamee & Jain (within
    # about 1 % of Colebrook) and Friedel's Fr^0.045: agreement to 1.5 %
    expected = ftp.Friedel(m=G * AREA, x=x, sigma=SIGMA, **STATE)
    assert tp.dp_friedel(G, x, D, RHO_L, RHO_V, MU_L, MU_V, SIGMA) == pytest.approx(expected, rel=0.015)


@pytest.mark.parametrize("x", XS)
@pytest.mark.parametrize("G", [150.0, 400.0])
def test_muller_steinhagen_heck_against_fluids(x, G):
    # fluids.two_phase.Muller_Steinhagen_Heck (Colebrook friction; ours Swamee & Jain, within about 1 %)
    expected = ftp.Muller_Steinhagen_Heck(m=G * AREA, x=x, **STATE)
    got = tp.dp_muller_steinhagen_heck(G, x, D, RHO_L, RHO_V, MU_L, MU_V)
    assert got == pytest.approx(expected, rel=0.015)


def test_rough_tube_against_fluids():
    # fluids' Müller-Steinhagen & Heck with a roughness of 45 µm (commercial steel)
    expected = ftp.Muller_Steinhagen_Heck(m=300 * AREA, x=0.5, roughness=45e-6, **STATE)
    got = tp.dp_muller_steinhagen_heck(300.0, 0.5, D, RHO_L, RHO_V, MU_L, MU_V, 45e-6 / D)
    assert got == pytest.approx(expected, rel=0.02)


def test_msh_ends_are_the_single_phase_gradients():
    # Müller-Steinhagen & Heck (1986): the liquid-only gradient at x = 0, gas-only at x = 1 (Darcy, f from fluids)
    from fluids.friction import friction_factor

    G = 300.0
    for x, rho, mu in ((0.0, RHO_L, MU_L), (1.0, RHO_V, MU_V)):
        f = friction_factor(Re=G * D / mu, eD=0.0)
        assert tp.dp_muller_steinhagen_heck(G, x, D, RHO_L, RHO_V, MU_L, MU_V) == pytest.approx(
            f / D * G ** 2 / (2 * rho), rel=0.015)


def test_registry_maps_each_name_to_its_method():
    args = (300.0, 0.4, D, RHO_L, RHO_V, MU_L, MU_V)
    assert tp.TWO_PHASE_METHODS["muller-steinhagen-heck"](*args) == tp.dp_muller_steinhagen_heck(*args)
    assert tp.TWO_PHASE_METHODS["friedel"](*args, SIGMA) == tp.dp_friedel(*args, SIGMA)
    assert tp.TWO_PHASE_METHODS["lockhart-martinelli"](*args) == tp.dp_lockhart_martinelli(*args)
    assert tp.DEFAULT_METHOD == "muller-steinhagen-heck"


def test_integrate_dp_against_quadrature_of_fluids():
    # scipy quad of fluids' Müller-Steinhagen & Heck gradient over x from 1 to 0, divided by the x span (x linear in
    # length), times the length
    G, L = 250.0, 6.0
    mean = quad(lambda x: ftp.Muller_Steinhagen_Heck(m=G * AREA, x=x, **STATE), 0.0, 1.0)[0]
    expected = mean * L

    def grad(x):
        return tp.dp_muller_steinhagen_heck(G, x, D, RHO_L, RHO_V, MU_L, MU_V)

    assert tp.integrate_dp(grad, 1.0, 0.0, L) == pytest.approx(expected, rel=0.015)
    # a constant gradient and a polynomial by hand: ∫ 3x² dx from 0 to 1 = 1
    assert tp.integrate_dp(lambda x: np.full_like(x, 7.0), 0.2, 0.9, 3.0) == pytest.approx(21.0)
    assert tp.integrate_dp(lambda x: 3 * x ** 2, 0.0, 1.0, 2.0) == pytest.approx(2.0)
    # array inputs broadcast; x_in = x_out is the local gradient times the length
    out = tp.integrate_dp(lambda x: 3 * x ** 2, np.array([0.5, 0.5]), np.array([0.5, 1.0]), 1.0)
    assert out == pytest.approx([0.75, 1.75])


def test_momentum_change_against_fluids():
    # fluids.two_phase.two_phase_dP_acceleration with fluids' Zivi void fractions
    G, xi, xo = 300.0, 0.9, 0.1
    expected = ftp.two_phase_dP_acceleration(m=G * AREA, D=D, xi=xi, xo=xo, alpha_i=Zivi(xi, RHO_L, RHO_V),
                                             alpha_o=Zivi(xo, RHO_L, RHO_V), rho_li=RHO_L, rho_gi=RHO_V)
    assert tp.momentum_dp(G, xi, xo, RHO_L, RHO_V) == pytest.approx(expected, rel=1e-9)
    assert tp.momentum_dp(G, xi, xo, RHO_L, RHO_V) < 0  # condensing: a pressure recovery


def test_two_phase_dp_wrapper():
    r = tp.two_phase_dp(250.0, 1.0, 0.0, 6.0, D, RHO_L, RHO_V, MU_L, MU_V)
    assert r.method == "muller-steinhagen-heck" and r.dp == r.dp_friction and r.dp_momentum == 0.0
    r2 = tp.two_phase_dp(250.0, 1.0, 0.0, 6.0, D, RHO_L, RHO_V, MU_L, MU_V, momentum=True)
    assert r2.dp == pytest.approx(r2.dp_friction + r2.dp_momentum) and r2.dp < r.dp
    with pytest.raises(InputError, match="^sigma"):
        tp.two_phase_dp(250.0, 1.0, 0.0, 6.0, D, RHO_L, RHO_V, MU_L, MU_V, method="friedel")
    with pytest.raises(InputError, match="^method"):
        tp.two_phase_dp(250.0, 1.0, 0.0, 6.0, D, RHO_L, RHO_V, MU_L, MU_V, method="homogeneous")
    with pytest.raises(InputError, match="^x_out"):
        tp.two_phase_dp(250.0, 1.0, -0.1, 6.0, D, RHO_L, RHO_V, MU_L, MU_V)
    # Friedel outside its recommended viscosity ratio (Whalley 1980: mu_l/mu_v < 1000), in two cases: one warning
    w = tp.two_phase_dp(250.0, 0.8, 0.2, 6.0, D, RHO_L, RHO_V, [2e-2, 3e-2], MU_V, sigma=SIGMA, method="friedel")
    assert len(w.warnings) == 1 and "mu_l/mu_v" in w.warnings[0]


@settings(max_examples=20, deadline=None)
@given(x=st.floats(0.0, 1.0), G=st.floats(20.0, 800.0), method=st.sampled_from(sorted(tp.TWO_PHASE_METHODS)))
def test_gradient_positive_and_rising_with_flux(x, G, method):
    # physical law: friction loss is positive and grows with the mass flux at the same quality
    g1 = tp.frictional_gradient(G, x, D, RHO_L, RHO_V, MU_L, MU_V, SIGMA, method=method)
    g2 = tp.frictional_gradient(1.2 * G, x, D, RHO_L, RHO_V, MU_L, MU_V, SIGMA, method=method)
    assert g1 > 0 and g2 > g1


def test_saturation_temperature_drop_pure_against_coolprop():
    # CoolProp saturation temperatures of water at 0.2 bar and 0.2 bar minus the drop (vacuum: a large effect)
    c = condensing(water("0.2 bar"))
    dps = np.array([500.0, 2000.0, 5000.0])
    expected = [CP.PropsSI("T", "P", 2e4, "Q", 1, "Water") - CP.PropsSI("T", "P", 2e4 - dp, "Q", 1, "Water")
                for dp in dps]
    assert tp.saturation_temperature_drop(c, dps) == pytest.approx(expected, abs=1e-6)
    with pytest.raises(InputError, match="^dp"):
        tp.saturation_temperature_drop(c, 2e4)
    with pytest.raises(InputError, match="^fluid"):
        tp.saturation_temperature_drop(water("1 bar"), 100.0)


def test_saturation_temperature_drop_of_a_curve_by_clausius_clapeyron():
    # a user curve for pentane at 3 bar (CoolProp saturation as a data sheet would print it): the drop for 0.3 bar
    # against CoolProp's saturation temperatures; Clausius-Clapeyron with an ideal-gas vapour is within 0.3 K
    h_fg = CP.PropsSI("H", "P", P, "Q", 1, FL) - CP.PropsSI("H", "P", P, "Q", 0, FL)
    t = CP.PropsSI("T", "P", P, "Q", 1, FL)
    tab = {"temperature": [t, t], "heat_released": [0.0, h_fg], "vapour_fraction": [1.0, 0.0]}
    for ph, q in (("liquid", 0), ("vapour", 1)):
        for k, key in (("density", "D"), ("heat_capacity", "C"), ("viscosity", "V"), ("conductivity", "L")):
            tab[f"{ph}_{k}"] = [CP.PropsSI(key, "P", P, "Q", q, FL)] * 2
    c = condensing_curve(tab, pressure=P)
    expected = t - CP.PropsSI("T", "P", P - 3e4, "Q", 1, FL)
    assert tp.saturation_temperature_drop(c, 3e4) == pytest.approx(expected, abs=0.3)
