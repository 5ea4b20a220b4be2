"""Condensing streams (revamp.fluids.condensing): pure fluids, CoolProp mixtures, user curves.

Expected values come from CoolProp called directly here (PropsSI, independent of our tables and flashes), from
iapws (IAPWS-IF97, a second independent formulation for water), or from the definitions named beside each check.
"""
import CoolProp.CoolProp as CP
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp.errors import InputError
from revamp.fluids import CondensingFluid, Fluid, condensing, condensing_curve, pure, water

MIX = "HEOS::Pentane[0.6]&Hexane[0.4]"


@pytest.fixture(scope="module")
def pentane():
    return condensing(pure("n-Pentane", "3 bar"))


@pytest.fixture(scope="module")
def mix():
    return condensing_curve(mixture=MIX, pressure="3 bar")


# ------------------------------------------------------------------------------------------------ pure fluids
def test_pure_saturation_and_latent_heat_match_coolprop(pentane):
    # CoolProp PropsSI directly: saturation temperature and h_fg = h(Q=1) - h(Q=0) at 3 bar
    t_sat = CP.PropsSI("T", "P", 3e5, "Q", 1, "n-Pentane")
    h_fg = CP.PropsSI("H", "P", 3e5, "Q", 1, "n-Pentane") - CP.PropsSI("H", "P", 3e5, "Q", 0, "n-Pentane")
    assert pentane.t_dew == pytest.approx(t_sat, abs=1e-6)
    assert pentane.t_bubble == pytest.approx(t_sat, abs=1e-6)
    assert pentane.latent == pytest.approx(h_fg, rel=1e-9)
    assert pentane.critical_pressure == pytest.approx(CP.PropsSI("pcrit", "n-Pentane"))
    assert pentane.pure_name == "n-Pentane"
    assert pentane.is_isothermal


def test_pure_curve_quality_is_linear_in_heat_released(pentane):
    # definition of vapour quality for a pure fluid at constant pressure: x = 1 - q/h_fg
    q = np.array([0.0, 0.25, 0.5, 1.0]) * pentane.latent
    T, x = pentane.at(q)
    assert np.allclose(x, 1.0 - q / pentane.latent)
    assert np.allclose(T, pentane.t_dew)
    assert np.all(pentane.z_factor(q) == 0.0)  # Bell & Ghaly (1973): no sensible vapour cooling at constant T
    assert np.all(pentane.slope(q) == 0.0)


def test_pure_phase_properties_are_coolprops_saturated_phases(pentane):
    # CoolProp PropsSI at (P, Q=0) and (P, Q=1)
    s = pentane.saturation(0.3 * pentane.latent)
    for attr, key in (("density", "D"), ("heat_capacity", "C"), ("viscosity", "V"), ("conductivity", "L")):
        assert getattr(s.liquid, attr) == pytest.approx(CP.PropsSI(key, "P", 3e5, "Q", 0, "n-Pentane"), rel=1e-9)
        assert getattr(s.vapour, attr) == pytest.approx(CP.PropsSI(key, "P", 3e5, "Q", 1, "n-Pentane"), rel=1e-9)
    assert s.surface_tension == pytest.approx(CP.PropsSI("I", "P", 3e5, "Q", 0, "n-Pentane"), rel=1e-9)


def test_water_latent_heat_against_iapws_if97():
    # iapws IAPWS97 (IF97, an independent formulation from CoolProp's IAPWS-95): h_fg at 1 bar; the two
    # formulations agree to about 0.1 % in this region (IF97's stated consistency with IAPWS-95)
    from iapws import IAPWS97

    c = condensing(water("1 bar"))
    h_fg = (IAPWS97(P=0.1, x=1).h - IAPWS97(P=0.1, x=0).h) * 1e3
    assert c.latent == pytest.approx(h_fg, rel=1e-3)
    assert c.t_dew == pytest.approx(IAPWS97(P=0.1, x=1).T, abs=0.02)


def test_vapour_provider_is_superheated_coolprop(pentane):
    # CoolProp PropsSI in the superheated region (T, P)
    T = pentane.t_dew + 40.0
    v = pentane.vapour.props(T)
    assert v.density == pytest.approx(CP.PropsSI("D", "T", T, "P", 3e5, "n-Pentane"), rel=2e-3)
    assert v.heat_capacity == pytest.approx(CP.PropsSI("C", "T", T, "P", 3e5, "n-Pentane"), rel=2e-3)


def test_condensing_fluid_is_a_liquid_fluid_for_stream(pentane):
    assert isinstance(pentane, Fluid)
    assert pentane.t_max == pytest.approx(pentane.t_dew)
    t = pentane.t_dew - 20.0
    assert pentane.props(t).density == pytest.approx(CP.PropsSI("D", "T", t, "P", 3e5, "n-Pentane"), rel=1e-3)
    rv.Stream(pentane, "4 kg/s", t)  # Stream accepts it as a fluid (the subcooled condensate)


def test_pure_at_another_pressure_is_coolprop_saturation(pentane):
    # CoolProp saturation temperature at 2 bar and 4 bar
    for p in (2e5, 4e5):
        assert pentane.at_pressure(p).t_dew == pytest.approx(CP.PropsSI("T", "P", p, "Q", 1, "n-Pentane"), abs=1e-6)
    T = pentane.temperature_at_pressure(np.array([2e5, 4e5]))
    assert T == pytest.approx([CP.PropsSI("T", "P", p, "Q", 1, "n-Pentane") for p in (2e5, 4e5)], abs=1e-6)


def test_pure_name_is_matched_ignoring_case():
    # CoolProp's canonical name of pentane is "n-Pentane"; its triple point (143.47 K) lies below the melting line
    # at 3 bar, so the liquid table starts just above it
    liq = pure("pentane", "3 bar")
    assert liq.fluid == "n-Pentane"
    assert liq.t_min > CP.PropsSI("Ttriple", "n-Pentane")


def test_condensing_refuses_a_non_coolprop_fluid():
    with pytest.raises(InputError, match="^fluid"):
        condensing(rv.fluids.constant(density=800, heat_capacity=2000, viscosity=1e-3, conductivity=0.1))


def test_at_refuses_heat_outside_the_curve(pentane):
    with pytest.raises(InputError, match="^q"):
        pentane.at(1.01 * pentane.latent)
    with pytest.raises(InputError, match="^q"):
        pentane.at(np.array([0.0, np.nan]))


# ---------------------------------------------------------------------------------------------------- mixtures
def test_mixture_dew_bubble_and_heat_match_coolprop(mix):
    # CoolProp PropsSI on the mixture string: dew (Q=1) and bubble (Q=0) points, enthalpy difference
    assert mix.t_dew == pytest.approx(CP.PropsSI("T", "P", 3e5, "Q", 1, MIX), abs=1e-6)
    assert mix.t_bubble == pytest.approx(CP.PropsSI("T", "P", 3e5, "Q", 0, MIX), abs=1e-6)
    dh = CP.PropsSI("H", "P", 3e5, "Q", 1, MIX) - CP.PropsSI("H", "P", 3e5, "Q", 0, MIX)
    assert mix.latent == pytest.approx(dh, rel=1e-9)
    assert mix.t_dew - mix.t_bubble > 5.0  # a wide-boiling pair: a glide of several K (CoolProp above)
    # Kay's rule (1936): pseudo-critical pressure = sum of mole fraction x critical pressure
    pc = 0.6 * CP.PropsSI("pcrit", "n-Pentane") + 0.4 * CP.PropsSI("pcrit", "n-Hexane")
    assert mix.critical_pressure == pytest.approx(pc)


def test_mixture_mid_curve_point_matches_coolprop(mix):
    # CoolProp at molar vapour fraction 0.5: T and h give one point of the curve; mass fraction from the phase
    # compositions and molar masses (definition)
    AS = CP.AbstractState("HEOS", "n-Pentane&n-Hexane")
    AS.set_mole_fractions([0.6, 0.4])
    AS.update(CP.PQ_INPUTS, 3e5, 0.5)
    q = CP.PropsSI("H", "P", 3e5, "Q", 1, MIX) - AS.hmass()
    M = np.array([CP.PropsSI("M", "n-Pentane"), CP.PropsSI("M", "n-Hexane")])
    mv, ml = np.dot(AS.mole_fractions_vapor(), M), np.dot(AS.mole_fractions_liquid(), M)
    T, x = mix.at(q)
    assert T == pytest.approx(AS.T(), abs=0.01)
    assert x == pytest.approx(0.5 * mv / (0.5 * mv + 0.5 * ml), abs=2e-3)


def test_mixture_z_factor_is_bell_ghaly_definition(mix):
    # Bell & Ghaly (1973): Z = x cp_v dT/dh, with cp_v of the equilibrium vapour; at the bubble point x = 0
    q = 0.5 * mix.latent
    T, x = mix.at(q)
    dq = 0.02 * mix.latent
    slope = (mix.at(q + dq)[0] - mix.at(q - dq)[0]) / (2 * dq)
    cp_v = mix.saturation(q).vapour.heat_capacity
    assert mix.z_factor(q) == pytest.approx(x * cp_v * abs(slope), rel=0.05)
    assert mix.z_factor(mix.latent) == 0.0


def test_mixture_at_pressure_recomputes(mix):
    # CoolProp mixture dew point at 4 bar
    assert mix.at_pressure("4 bar").t_dew == pytest.approx(CP.PropsSI("T", "P", 4e5, "Q", 1, MIX), abs=1e-6)


def test_mixture_bad_specifications():
    with pytest.raises(InputError, match="condensing_curve.mixture"):
        condensing_curve(mixture="HEOS::Pentane[0.6]&Hexane[0.5]", pressure="3 bar")  # fractions sum to 1.1
    with pytest.raises(InputError, match="condensing_curve.mixture"):
        condensing_curve(mixture="HEOS::Pentane[0.6]&Unobtainium[0.4]", pressure="3 bar")
    with pytest.raises(InputError, match="condensing_curve.pressure"):
        condensing_curve(mixture=MIX, pressure="80 bar")  # above the pair's critical region
    with pytest.raises(InputError, match="condensing_curve"):
        condensing_curve(mixture=MIX)  # no pressure
    with pytest.raises(InputError, match="condensing_curve"):
        condensing_curve({"temperature": [1, 2]}, mixture=MIX, pressure=1e5)


@settings(max_examples=25, deadline=None)
@given(f=st.floats(0.0, 1.0))
def test_mixture_points_lie_within_the_curve(mix, f):
    # physical bounds: T between bubble and dew points, x in [0, 1], Z >= 0
    T, x = mix.at(f * mix.latent)
    assert mix.t_bubble - 1e-9 <= T <= mix.t_dew + 1e-9
    assert 0.0 <= x <= 1.0
    assert mix.z_factor(f * mix.latent) >= 0.0


# -------------------------------------------------------------------------------------------------- user tables
def _pentane_table(points=5):
    # a pure-fluid condensing curve written from CoolProp (as a data sheet would print it)
    h_fg = CP.PropsSI("H", "P", 3e5, "Q", 1, "n-Pentane") - CP.PropsSI("H", "P", 3e5, "Q", 0, "n-Pentane")
    t = CP.PropsSI("T", "P", 3e5, "Q", 1, "n-Pentane")
    frac = np.linspace(0, 1, points)
    out = {"temperature": [t] * points, "heat_released": list(frac * h_fg), "vapour_fraction": list(1 - frac)}
    for ph, qv in (("liquid", 0), ("vapour", 1)):
        for k, key in (("density", "D"), ("heat_capacity", "C"), ("viscosity", "V"), ("conductivity", "L")):
            out[f"{ph}_{k}"] = [CP.PropsSI(key, "P", 3e5, "Q", qv, "n-Pentane")] * points
    return out, h_fg, t


def test_table_curve_round_trip_and_units():
    tab, h_fg, t = _pentane_table()
    c = condensing_curve(tab, pressure="3 bar", name="pentane", critical_pressure="33.7 bar")
    assert isinstance(c, CondensingFluid)
    assert c.latent == pytest.approx(h_fg)
    assert c.t_dew == pytest.approx(t)
    assert c.at(0.5 * h_fg)[1] == pytest.approx(0.5)
    # the same curve with strings with units and an enthalpy column instead of heat released
    tab2 = dict(tab)
    tab2["enthalpy"] = [f"{(500e3 - q) / 1e3} kJ/kg" for q in tab2.pop("heat_released")]
    c2 = condensing_curve(tab2, pressure="3 bar")
    assert np.allclose(c2.q, c.q)


def test_table_z_factor_by_hand():
    # Bell & Ghaly (1973) Z = x cp_v |dT/dq|; hand calculation for a straight curve 360 -> 350 K over 300 kJ/kg
    # with constant vapour cp 2000 J/kg/K: at mid-curve x = 0.5, Z = 0.5 * 2000 * 10 / 3e5 = 1/30
    tab = {"temperature": [360.0, 355.0, 350.0], "heat_released": [0.0, 1.5e5, 3e5],
           "vapour_fraction": [1.0, 0.5, 0.0]}
    liq = rv.fluids.constant(density=600, heat_capacity=2500, viscosity=2e-4, conductivity=0.1)
    vap = rv.fluids.constant(density=8, heat_capacity=2000, viscosity=8e-6, conductivity=0.02)
    c = condensing_curve(tab, pressure=3e5, liquid=liq, vapour=vap)
    assert c.z_factor(1.5e5) == pytest.approx(1.0 / 30.0)
    assert np.isnan(c.critical_pressure) and np.isnan(c.saturation(0.0).surface_tension)


def test_table_shifted_by_clausius_clapeyron_matches_coolprop():
    # CoolProp saturation of pentane at 3.3 and 2.7 bar; Clausius-Clapeyron with an ideal-gas vapour errs by the
    # compressibility of the vapour (Z about 0.93 at 3 bar, CoolProp), a few tenths of a K for +-10 % pressure
    tab, _, _ = _pentane_table()
    c = condensing_curve(tab, pressure="3 bar")
    for p in (3.3e5, 2.7e5):
        exact = CP.PropsSI("T", "P", p, "Q", 1, "n-Pentane")
        assert c.at_pressure(p).t_dew == pytest.approx(exact, abs=0.3)
        assert c.temperature_at_pressure(p) == pytest.approx(exact, abs=0.3)
    assert c.at_pressure(3.3e5).t_dew > c.t_dew  # higher pressure, higher condensing temperature


@pytest.mark.parametrize("change, field", [
    ({"temperature": [340.0, 345.0, 350.0]}, "condensing_curve.table.temperature"),  # rises as heat is released
    ({"vapour_fraction": [0.9, 0.5, 0.0]}, "condensing_curve.table.vapour_fraction"),  # not from the dew point
    ({"heat_released": [10.0, 1.5e5, 3e5]}, "condensing_curve.table.heat_released"),  # not 0 at the dew point
    ({"bogus": [1, 2, 3]}, "condensing_curve.table.bogus"),
    ({"vapour_fraction": [1.0, 0.0]}, "condensing_curve.table.vapour_fraction"),  # wrong length
])
def test_table_errors_name_the_column(change, field):
    tab = {"temperature": [360.0, 355.0, 350.0], "heat_released": [0.0, 1.5e5, 3e5],
           "vapour_fraction": [1.0, 0.5, 0.0]}
    tab.update(change)
    liq = rv.fluids.constant(density=600, heat_capacity=2500, viscosity=2e-4, conductivity=0.1)
    vap = rv.fluids.constant(density=8, heat_capacity=2000, viscosity=8e-6, conductivity=0.02)
    with pytest.raises(InputError) as e:
        condensing_curve(tab, pressure=3e5, liquid=liq, vapour=vap)
    assert str(e.value).startswith(field)


def test_table_needs_property_providers():
    tab = {"temperature": [360.0, 350.0], "heat_released": [0.0, 3e5], "vapour_fraction": [1.0, 0.0]}
    with pytest.raises(InputError, match="^condensing_curve.liquid"):
        condensing_curve(tab, pressure=3e5)


# ------------------------------------------------------------------------------------ desuperheating, subcooling
def test_pure_total_heat_from_superheated_vapour_to_subcooled_liquid(pentane):
    # energy balance against CoolProp enthalpies: h(T_in, P) - h(T_out, P) = superheat + latent + subcooling
    t_in = np.array([pentane.t_dew + 7.3, pentane.t_dew + 60.0, pentane.t_dew + 140.0])
    t_out = np.array([pentane.t_dew - 0.5, pentane.t_dew - 33.3, pentane.t_dew - 120.0])
    expected = CP.PropsSI("H", "T", t_in, "P", [3e5] * 3, "n-Pentane") - CP.PropsSI("H", "T", t_out, "P", [3e5] * 3,
                                                                                  "n-Pentane")
    total = pentane.superheat(t_in) + pentane.latent + pentane.subcooling(t_out)
    assert total == pytest.approx(expected, rel=1e-6)
    assert pentane.superheat(pentane.t_dew) == 0.0 and pentane.subcooling(pentane.t_bubble) == 0.0


def test_mixture_sensible_zones_against_coolprop(mix):
    # CoolProp mixture enthalpies at (T, P) and at the dew / bubble points
    t = mix.t_dew + 23.1
    assert mix.superheat(t) == pytest.approx(CP.PropsSI("H", "T", t, "P", 3e5, MIX) - CP.PropsSI("H", "P", 3e5, "Q", 1,
                                                                                             MIX), rel=1e-6)
    t = mix.t_bubble - 23.1
    assert mix.subcooling(t) == pytest.approx(CP.PropsSI("H", "P", 3e5, "Q", 0, MIX) - CP.PropsSI("H", "T", t, "P",
                                                                                              3e5, MIX), rel=1e-6)


def test_table_sensible_zones_from_provider_heat_capacity():
    # constant heat capacities: heat = cp ΔT (definition)
    tab = {"temperature": [360.0, 350.0], "heat_released": [0.0, 3e5], "vapour_fraction": [1.0, 0.0]}
    liq = rv.fluids.constant(density=600, heat_capacity=2500, viscosity=2e-4, conductivity=0.1)
    vap = rv.fluids.constant(density=8, heat_capacity=2000, viscosity=8e-6, conductivity=0.02)
    c = condensing_curve(tab, pressure=3e5, liquid=liq, vapour=vap)
    assert c.superheat([360.0, 380.0]) == pytest.approx([0.0, 2000 * 20])
    assert c.subcooling(330.0) == pytest.approx(2500 * 20)
    with pytest.raises(InputError, match="^T"):
        c.superheat(355.0)  # below the dew point
    with pytest.raises(InputError, match="^T"):
        c.subcooling(351.0)  # above the bubble point


def test_superheat_beyond_the_tabulated_range_is_refused(pentane):
    with pytest.raises(InputError, match="^T"):
        pentane.superheat(pentane.t_dew + 400.0)


@settings(max_examples=20, deadline=None)
@given(a=st.floats(0.0, 1.0), b=st.floats(0.0, 1.0))
def test_mixture_curve_cools_and_condenses_monotonically(mix, a, b):
    # physical law along a condensing curve at constant pressure: releasing more heat never raises the temperature
    # or the vapour fraction
    q1, q2 = sorted((a * mix.latent, b * mix.latent))
    (T1, x1), (T2, x2) = mix.at(q1), mix.at(q2)
    assert T2 <= T1 + 1e-12 and x2 <= x1 + 1e-12
