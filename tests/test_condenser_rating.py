"""Condenser rating, zone by zone (``revamp.rating_condenser``).

Sources of the expected values (each named again beside its check):
- CoolProp (Bell et al. 2014): saturation temperatures, enthalpies of the vapour, the saturated phases and the
  subcooled liquid, at the engine's own outlet states; liquid water properties for the coolant.
- `ht` (Caleb Bell, ChEDL): ``ht.conv_internal.turbulent_Gnielinski`` for the coolant film at the engine's
  increments (Petukhov's smooth-tube friction written out, as in tests/test_exchanger_protocol.py).
- `fluids` (Caleb Bell, ChEDL): ``fluids.two_phase.Muller_Steinhagen_Heck`` for the in-tube two-phase frictional
  gradient at the engine's increments.
- Physical laws (energy conservation, more area never less duty, outlets between the inlets) with hypothesis.
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp.errors import InputError

CP = pytest.importorskip("CoolProp.CoolProp")
ht = pytest.importorskip("ht")
two_phase_ref = pytest.importorskip("fluids.two_phase")

PropsSI = CP.PropsSI
HEXANE = "n-Hexane"
P_HEX = 1.5e5
VAPOUR = rv.fluids.pure(HEXANE, pressure=P_HEX)
WATER = rv.fluids.water("3 bar")


def exchanger(**changes):
    kw = dict(shell_id="0.6 m", tube_od="19.05 mm", tube_wall="1.65 mm", tube_length="4 m", tube_count=400,
              tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="0.5 m", baffle_cut=0.25,
              tube_material="carbon steel")
    kw.update(changes)
    return rv.ShellAndTube(**kw)


def shell_condenser(flow=4.0, water=60.0, t_water="30 degC", **stream):
    kw = dict(quality=1.0) if not stream else stream
    return rv.Service(shell=rv.Stream(VAPOUR, flow, **kw), tube=rv.Stream(WATER, water, t_water))


def tube_condenser(flow=4.0, water=60.0, t_water="30 degC", **stream):
    kw = dict(quality=1.0) if not stream else stream
    return rv.Service(tube=rv.Stream(VAPOUR, flow, **kw), shell=rv.Stream(WATER, water, t_water))


def h_mass(T=None, Q=None, p=P_HEX, fluid=HEXANE):
    """Specific enthalpy [J/kg] from CoolProp at (T, p) or (p, quality)."""
    if Q is not None:
        return PropsSI("H", "P", p, "Q", Q, fluid)
    return PropsSI("H", "T", T, "P", p, fluid)


# ------------------------------------------------------------------------------------------------------ streams
def test_stream_quality_takes_the_saturation_temperature():
    s = rv.Stream(VAPOUR, "4 kg/s", quality=1.0)
    # CoolProp: saturation temperature of n-hexane at 1.5 bar
    assert s.t_in == pytest.approx(PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE), abs=1e-6)
    assert s.condensing and s.quality == 1.0
    assert rv.Stream(VAPOUR, 4.0, t_in=s.t_in + 0.2, quality=0.5).t_in == pytest.approx(s.t_in)


@pytest.mark.parametrize("kwargs, field", [
    (dict(quality=1.0, t_in="20 degC"), "t_in"),
    (dict(quality=1.5), "quality"),
    (dict(quality=np.array([0.5, 1.0])), "quality"),
    (dict(phase="vapour"), "t_in"),
    (dict(phase="vapour", t_in="20 degC"), "t_in"),
    (dict(phase="gas", t_in="120 degC"), "phase"),
    (dict(phase="vapour", quality=1.0), "phase"),
    (dict(), "t_in"),
])
def test_stream_errors_name_the_field(kwargs, field):
    with pytest.raises(InputError) as exc:
        rv.Stream(VAPOUR, 4.0, **kwargs)
    assert exc.value.field == field


def test_quality_needs_a_condensable_fluid():
    oil = rv.fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)
    with pytest.raises(InputError) as exc:
        rv.Stream(oil, 4.0, quality=1.0)
    assert exc.value.field == "quality"


def test_single_phase_streams_unchanged():
    s = rv.Stream(WATER, "10 kg/s", "30 degC")
    assert not s.condensing and s.quality is None and s.t_in == pytest.approx(303.15)


def test_both_sides_condensing_is_refused():
    svc = rv.Service(shell=rv.Stream(VAPOUR, 4.0, quality=1.0), tube=rv.Stream(VAPOUR, 4.0, quality=1.0))
    with pytest.raises(InputError) as exc:
        rv.rate(exchanger(), svc)
    assert exc.value.field == "service.tube"


# ------------------------------------------------------------------------------------------------------ duty
@pytest.fixture(scope="module")
def full_shell():
    """Shell-side condensation of saturated hexane vapour that condenses fully and subcools."""
    return rv.rate(exchanger(), shell_condenser())


def test_full_condensation_duty_equals_latent_plus_subcooling(full_shell):
    r = full_shell
    assert r.quality_out == 0.0 and r.t_out_condensing < r.service.shell.t_in - 1.0
    # CoolProp: m (h_sat,vapour - h_liquid(T_out)); the outlet pressure is the inlet less the drop (liquid enthalpy
    # barely depends on pressure: taken at the inlet pressure, from memory of the magnitude < 1e-4 relative)
    expected = 4.0 * (h_mass(Q=1.0) - h_mass(T=r.t_out_condensing))
    assert r.duty == pytest.approx(expected, rel=2e-3)
    # the condensing zone alone: saturated vapour at the inlet pressure to saturated liquid at the pressure after the
    # zone's pressure drop (CoolProp): m h_fg plus the condensate's cooling with the falling saturation temperature
    zone = r.zones.set_index("zone")
    p_end = P_HEX - zone.loc["condensing", "dp"]
    assert zone.loc["condensing", "duty"] == pytest.approx(4.0 * (h_mass(Q=1.0) - h_mass(Q=0.0, p=p_end)), rel=2e-3)


def test_energy_balance_coolant_and_zones(full_shell):
    r = full_shell
    # coolant: CoolProp water enthalpy rise at 3 bar between the engine's inlet and outlet
    q_water = 60.0 * (PropsSI("H", "T", r.t_out_coolant, "P", 3e5, "Water")
                      - PropsSI("H", "T", 303.15, "P", 3e5, "Water"))
    assert r.duty == pytest.approx(q_water, rel=1e-3)
    z = r.zones
    assert z["duty"].sum() == pytest.approx(r.duty, rel=1e-9)  # the zones add up (definition)
    assert z["area"].sum() == pytest.approx(r.area, rel=1e-6)  # the area is used up (definition of the rating)
    assert z["area_share"].sum() == pytest.approx(1.0)
    for _, row in z.iterrows():  # per zone, the coolant takes what the condensing stream gives (CoolProp water)
        q_c = 60.0 * (PropsSI("H", "T", row.t_coolant_out, "P", 3e5, "Water")
                      - PropsSI("H", "T", row.t_coolant_in, "P", 3e5, "Water"))
        assert row.duty == pytest.approx(q_c, rel=2e-3)
    assert r.resistances.sum() == pytest.approx(1.0 / r.U_service, rel=1e-12)
    assert tuple(r.resistances.index) == r.layers
    frame = r.to_frame()
    assert frame.shape[0] == 1 and "R shell film" in frame


def test_desuperheated_inlet_duty_from_coolprop_enthalpies():
    t_in = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE) + 40.0
    r = rv.rate(exchanger(), shell_condenser(flow=4.0, phase="vapour", t_in=t_in))
    assert set(r.zones.zone) >= {"desuperheating", "condensing"}
    # CoolProp: superheated vapour at t_in to the engine's outlet state
    if r.quality_out == 0.0:
        expected = 4.0 * (h_mass(T=t_in) - h_mass(T=r.t_out_condensing))
    else:
        expected = 4.0 * (h_mass(T=t_in) - h_mass(Q=r.quality_out))
    assert r.duty == pytest.approx(expected, rel=3e-3)
    ds = r.zones.set_index("zone").loc["desuperheating"]
    assert ds.duty == pytest.approx(4.0 * (h_mass(T=t_in) - h_mass(Q=1.0)), rel=3e-3)


def test_partial_condensation_outlet_on_the_curve():
    r = rv.rate(exchanger(tube_length="1 m"), shell_condenser(flow=8.0, water=40.0))
    assert 0.0 < r.quality_out < 1.0
    t_sat = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE)  # CoolProp
    assert r.t_out_condensing == pytest.approx(t_sat - r.dt_sat_drop, abs=1e-3)
    # CoolProp: heat released from saturated vapour to the outlet quality at the outlet pressure
    p_out = P_HEX - r.dp_shell
    assert r.duty == pytest.approx(8.0 * (h_mass(Q=1.0) - h_mass(Q=r.quality_out, p=p_out)), rel=2e-3)
    assert r.condensed == pytest.approx(8.0 * (1.0 - r.quality_out))
    assert list(r.zones.zone) == ["condensing"]


# ------------------------------------------------------------------------------------------------------ laws
@settings(max_examples=4, deadline=None)
@given(length=st.floats(1.0, 5.0), more=st.floats(1.05, 1.6))
def test_more_area_never_less_duty(length, more):
    svc = shell_condenser(flow=6.0, water=50.0)
    a = rv.rate(exchanger(tube_length=length), svc)
    b = rv.rate(exchanger(tube_length=length * more), svc)
    assert b.duty >= a.duty * (1 - 1e-9)


@settings(max_examples=4, deadline=None)
@given(water=st.floats(10.0, 120.0), t_water=st.floats(285.0, 320.0))
def test_outlets_within_the_curve(water, t_water):
    r = rv.rate(exchanger(), tube_condenser(flow=4.0, water=water, t_water=t_water))
    t_sat = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE)  # CoolProp
    assert t_water - 1e-9 <= r.t_out_coolant <= t_sat
    assert t_water - 1e-6 <= r.t_out_condensing <= t_sat + 1e-9
    assert 0.0 <= r.quality_out <= 1.0
    # CoolProp water enthalpy rise equals the duty
    q_water = water * (PropsSI("H", "T", r.t_out_coolant, "P", 3e5, "Water") - PropsSI("H", "T", t_water, "P", 3e5,
                                                                                      "Water"))
    assert r.duty == pytest.approx(q_water, rel=2e-3)


def test_sweep_matches_single_cases():
    flows = np.array([20.0, 60.0])
    sweep = rv.rate(exchanger(), tube_condenser(water=flows))
    assert sweep.duty.shape == (2,)
    for i, f in enumerate(flows):
        one = rv.rate(exchanger(), tube_condenser(water=float(f)))
        assert sweep.duty[i] == pytest.approx(one.duty, rel=1e-6)
        assert sweep.t_out_tube[i] == pytest.approx(one.t_out_tube, abs=1e-4)
    assert sweep.duty[1] > sweep.duty[0]  # more coolant, more duty (law)
    assert set(sweep.zones["case"]) == {0, 1}
    frame = sweep.to_frame()
    assert frame.shape[0] == 2 and "R tube film" in frame
    assert np.allclose(frame[[f"R {name}" for name in sweep.layers]].sum(axis=1), 1.0 / sweep.U_service)


# ------------------------------------------------------------------------------------------------------ films, dp
def _petukhov(Re):
    return (0.790 * np.log(Re) - 1.64) ** -2  # Petukhov (1970)


def test_coolant_film_against_ht(full_shell):
    r, hx = full_shell, exchanger()
    inc = r.increments
    d_i = float(hx.tube_id)
    m_tube = 60.0 / float(hx.tubes_per_pass)
    for _, row in inc.iloc[[0, len(inc) // 2, -1]].iterrows():
        T = row.T_coolant
        mu = PropsSI("V", "T", T, "P", 3e5, "Water")  # CoolProp (IAPWS)
        k = PropsSI("L", "T", T, "P", 3e5, "Water")
        cp = PropsSI("C", "T", T, "P", 3e5, "Water")
        Re = 4.0 * m_tube / (math.pi * d_i * mu)
        # ht.conv_internal.turbulent_Gnielinski with Petukhov's friction, Gnielinski's entrance factor
        nu = ht.conv_internal.turbulent_Gnielinski(Re=Re, Pr=cp * mu / k, fd=_petukhov(Re)) * (
            1.0 + (d_i / float(hx.tube_length)) ** (2 / 3))
        assert row.h_coolant == pytest.approx(nu * k / d_i, rel=2e-3)


def test_two_phase_dp_against_fluids():
    hx = exchanger()
    r = rv.rate(hx, tube_condenser(flow=4.0, water=60.0))
    inc = r.increments
    cond = inc[inc.zone == "condensing"]
    assert len(cond) > 3
    m_tube = 4.0 / float(hx.tubes_per_pass)
    for _, row in cond.iloc[[0, len(cond) // 2, -1]].iterrows():
        # fluids.two_phase.Muller_Steinhagen_Heck at the engine's state (vapour fraction, phase properties);
        # fluids takes Colebrook's friction factor, the engine Swamee & Jain's explicit form (within about 1 %)
        grad = two_phase_ref.Muller_Steinhagen_Heck(m=m_tube, x=row.x, rhol=row.rho_l, rhog=row.rho_v, mul=row.mu_l,
                                                    mug=row.mu_v, D=float(hx.tube_id),
                                                    roughness=float(hx.tube_roughness))
        assert row.dp == pytest.approx(grad * row.length, rel=0.015)
    assert r.dp_tube == pytest.approx(inc.dp.sum(), rel=1e-9)


def test_saturation_drop_from_coolprop():
    r = rv.rate(exchanger(), tube_condenser(flow=4.0, water=60.0))
    z = r.zones.set_index("zone")
    dp = z.loc["condensing", "dp"]
    assert dp > 0
    # CoolProp: dew point at the inlet pressure less the condensing zone's pressure drop
    expected = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE) - PropsSI("T", "P", P_HEX - dp, "Q", 1.0, HEXANE)
    assert r.dt_sat_drop == pytest.approx(expected, rel=0.02)


# ------------------------------------------------------------------------------------------------------ air cooler
def air_cooler():
    """An invented one-bay air cooler with embedded aluminium fins."""
    return rv.AirCooler(bays=1, bundles_per_bay=1, tube_rows=4, tubes_per_row=40, tube_passes=2, tube_length="6 m",
                        tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                        tube_material="carbon steel",
                        fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m", material="aluminium",
                                   bond="embedded"),
                        fans_per_bay=2, fan_diameter="3 m", fan_efficiency=0.65, draft="forced")


def test_air_cooled_condenser_energy_balance():
    ac = air_cooler()
    svc = rv.AirService(tube=rv.Stream(VAPOUR, "2 kg/s", quality=1.0), air_in="25 degC", air_flow="150 kg/s")
    r = rv.rate(ac, svc)
    assert r.condensing_side == "tube" and r.coolant_side == "air"
    assert 0.0 < r.duty
    # the air's heat capacity rate from the standard dry-air cp 1006 J/kg/K (from memory; the engine's air
    # properties vary with T by < 0.5 % over this range)
    assert r.duty == pytest.approx(150.0 * 1006.0 * (r.t_out_air - 298.15), rel=1e-2)
    # CoolProp: the condensing stream's heat released to its outlet state
    if r.quality_out > 0:
        expected = 2.0 * (h_mass(Q=1.0) - h_mass(Q=r.quality_out))
    else:
        expected = 2.0 * (h_mass(Q=1.0) - h_mass(T=r.t_out_tube))
    assert r.duty == pytest.approx(expected, rel=2e-3)
    assert r.layers[0] == "air film"


# ------------------------------------------------------------------------------------------------------ pressure
def test_condensing_pressure_for_a_vapour_load():
    hx = exchanger()
    svc = shell_condenser(flow=4.0, water=60.0)
    low = rv.condensing_pressure_for(hx, svc, "6 kg/s", increments=6)
    high = rv.condensing_pressure_for(hx, svc, 8.0, increments=6)
    for c, load in ((low, 6.0), (high, 8.0)):
        # the definition: the whole load condenses, the outlet at the bubble point
        assert c.rating.quality_out == pytest.approx(0.0, abs=1e-4)
        assert c.vapour_load == pytest.approx(load, rel=1e-4)
        # CoolProp: the dew point at the pressure found
        assert c.temperature == pytest.approx(PropsSI("T", "P", c.pressure, "Q", 1.0, HEXANE), abs=1e-6)
    assert high.pressure > low.pressure  # more vapour needs a higher condensing pressure (law)


def test_condensing_pressure_errors():
    with pytest.raises(InputError) as exc:
        rv.condensing_pressure_for(exchanger(), shell_condenser(), -1.0)
    assert exc.value.field == "duty_or_vapour_load"
    with pytest.raises(InputError) as exc:
        rv.condensing_pressure_for(exchanger(), shell_condenser(water=np.array([30.0, 60.0])), 6.0)
    assert exc.value.field == "service"


# ------------------------------------------------------------------------------------------------------ vacuum
def test_vacuum_steam_condenser_saturation_drop():
    steam = rv.fluids.water("0.2 bar")
    cw = rv.fluids.water("3 bar")
    hx = exchanger(tube_length="6 m")
    r = rv.rate(hx, rv.Service(tube=rv.Stream(steam, "0.3 kg/s", quality=1.0), shell=rv.Stream(cw, 80.0, "20 degC")))
    z = r.zones.set_index("zone")
    dp = z.loc["condensing", "dp"]
    # CoolProp (IAPWS-95): the saturation temperature at 0.15 bar less that after the condensing zone's drop
    expected = PropsSI("T", "P", 0.2e5, "Q", 1.0, "Water") - PropsSI("T", "P", 0.2e5 - dp, "Q", 1.0, "Water")
    assert r.dt_sat_drop == pytest.approx(expected, rel=1e-6)
    assert r.dt_sat_drop > 0.05
    # CoolProp: heat released to the engine's outlet state at the outlet pressure
    p_out = 0.2e5 - r.dp_tube
    h_out = PropsSI("H", "T", r.t_out_tube, "P", p_out, "Water") if r.quality_out == 0 else PropsSI(
        "H", "P", p_out, "Q", r.quality_out, "Water")
    assert r.duty == pytest.approx(0.3 * (PropsSI("H", "P", 0.2e5, "Q", 1.0, "Water") - h_out), rel=2e-3)


# ------------------------------------------------------------------------------------------------------ mixture
def test_mixture_condenses_with_its_glide():
    mix = rv.fluids.condensing_curve(mixture="HEOS::n-Pentane[0.5]&n-Hexane[0.5]", pressure="1.5 bar")
    assert mix.t_dew - mix.t_bubble > 3.0
    hx = exchanger()
    r = rv.rate(hx, rv.Service(shell=rv.Stream(mix, 3.0, quality=1.0), tube=rv.Stream(WATER, 60.0, "25 degC")))
    cond = r.increments[r.increments.zone == "condensing"]
    assert (cond["T"].diff().dropna() <= 1e-9).all()  # the temperature glides down the curve (definition)
    # Bell & Ghaly lowers the condensing coefficient below the film's where Z > 0: h_condensing <= film
    assert (cond["h_condensing"] <= cond["h_film"] * (1 + 1e-12)).all()
    assert (cond["h_condensing"] < cond["h_film"]).any()
    # CoolProp's mixture model directly: enthalpy of the saturated vapour at 1.5 bar less that of the subcooled
    # outlet (the condensate's enthalpy barely depends on the small pressure drop)
    assert r.quality_out == 0.0
    state = CP.AbstractState("HEOS", "n-Pentane&n-Hexane")
    state.set_mole_fractions([0.5, 0.5])
    state.update(CP.PQ_INPUTS, 1.5e5, 1.0)
    h_in = state.hmass()
    state.update(CP.PT_INPUTS, 1.5e5, float(r.t_out_shell))
    assert r.duty == pytest.approx(3.0 * (h_in - state.hmass()), rel=5e-3)


def test_air_cooled_condenser_sweep_more_air_more_duty():
    ac = rv.AirCooler(bays=1, bundles_per_bay=2, tube_rows=4, tubes_per_row=30, tube_passes=2, tube_length="6 m",
                      tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                      fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m"))
    velocity = np.array([2.0, 3.0, 4.0])
    svc = rv.AirService(tube=rv.Stream(VAPOUR, "3 kg/s", quality=1.0), air_in="30 degC", face_velocity=velocity)
    r = rv.rate(ac, svc)
    assert r.duty.shape == (3,)
    assert np.all(np.diff(r.duty) > 0)  # more air, more duty (law)
    assert np.all(r.t_out_air > 303.15) and np.all(r.t_out_air < r.service.tube.t_in)
    one = rv.rate(ac, svc.replace(face_velocity=3.0))
    assert one.duty == pytest.approx(r.duty[1], rel=1e-6)  # the sweep is the cases one by one
    z = r.zones[r.zones.case == 1]
    assert z["duty"].sum() == pytest.approx(r.duty[1], rel=1e-9)  # two bundles: the zones are the whole cooler
    assert z["area"].sum() == pytest.approx(r.area, rel=1e-6)


# ------------------------------------------------------------------------------------------------------ films
def test_in_tube_condensing_film_against_ht():
    hx = exchanger()
    r = rv.rate(hx, tube_condenser(flow=4.0, water=60.0))
    cond = r.increments[r.increments.zone == "condensing"]
    m_tube = 4.0 / float(hx.tubes_per_pass)
    p_crit = PropsSI("pcrit", HEXANE)  # CoolProp
    for _, row in cond.iterrows():
        # ht.condensation.Shah (Bell): Shah (1979) at the engine's state (reduced pressure at the inlet pressure)
        shah = ht.condensation.Shah(m=m_tube, x=row.x, D=float(hx.tube_id), rhol=row.rho_l, mul=row.mu_l,
                                    kl=row.k_l, Cpl=row.cp_l, P=P_HEX, Pc=p_crit)
        assert row.h_film >= shah * (1 - 1e-9)  # the larger of Shah and the stratified form
    upper = cond[cond.x > 0.3]
    shah_upper = [ht.condensation.Shah(m=m_tube, x=row.x, D=float(hx.tube_id), rhol=row.rho_l, mul=row.mu_l,
                                       kl=row.k_l, Cpl=row.cp_l, P=P_HEX, Pc=p_crit) for _, row in upper.iterrows()]
    # at these mass fluxes and qualities Shah governs (annular flow): the engine's film is Shah's value
    assert np.allclose(upper.h_film, shah_upper, rtol=1e-9)


def test_shell_condensing_film_from_the_published_equations(full_shell):
    hx = exchanger()
    inc = full_shell.increments
    cond = inc[inc.zone == "condensing"]
    rows_vertical = math.pi / 4.0 * hx.bell().Dctl / hx.bell().pitch_parallel  # the model's stated estimate
    g = 9.80665
    h_fg = h_mass(Q=1.0) - h_mass(Q=0.0)  # CoolProp latent heat at the inlet pressure
    for _, row in cond.iloc[[0, len(cond) // 2, -1]].iterrows():
        d = float(hx.tube_od)
        # Nusselt (1916) horizontal tube, 0.725 [rho_l (rho_l - rho_v) g h_fg k_l^3 / (mu_l dT d)]^(1/4), with Kern's
        # N^(-1/6) (Kern 1958)
        h_grav = 0.725 * (row.rho_l * (row.rho_l - row.rho_v) * g * h_fg * row.k_l ** 3
                          / (row.mu_l * row.dT_film * d)) ** 0.25 * rows_vertical ** (-1 / 6)
        # Shekriladze & Gomelauri (1966): Nu = 0.59 Re^(1/2), Re = rho_l u_v d / mu_l
        h_shear = 0.59 * math.sqrt(row.rho_l * row.u_vapour * d / row.mu_l) * row.k_l / d
        # Butterworth (1977): h^2 = h_sh^2 / 2 + sqrt(h_sh^4 / 4 + h_gr^4)
        expected = math.sqrt(0.5 * h_shear ** 2 + math.sqrt(0.25 * h_shear ** 4 + h_grav ** 4))
        assert row.h_film == pytest.approx(expected, rel=1e-3)


def test_stream_replace_moves_to_the_new_saturation():
    s = rv.Stream(VAPOUR, 4.0, quality=0.8)
    other = s.replace(fluid=rv.fluids.pure(HEXANE, pressure=3e5))
    # CoolProp: saturation temperature of n-hexane at 3 bar
    assert other.t_in == pytest.approx(PropsSI("T", "P", 3e5, "Q", 1.0, HEXANE), abs=1e-6)
    assert other.quality == 0.8 and s.replace(flow=5.0).t_in == s.t_in


def test_vapour_beyond_the_tabulated_superheat_is_refused():
    t_in = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE) + 400.0
    with pytest.raises(InputError) as exc:
        rv.rate(exchanger(), shell_condenser(phase="vapour", t_in=t_in))
    assert exc.value.field == "service.shell.t_in"


def test_default_increments_resolve_the_path():
    # the default cut against a three times finer one (numerical convergence; no outside number needed)
    t_in = PropsSI("T", "P", P_HEX, "Q", 1.0, HEXANE) + 30.0
    svc = tube_condenser(flow=4.0, water=30.0, phase="vapour", t_in=t_in)
    coarse = rv.rate(exchanger(), svc)
    fine = rv.rate(exchanger(), svc, increments=48)
    assert coarse.duty == pytest.approx(fine.duty, rel=1e-3)
    assert coarse.t_out_tube == pytest.approx(fine.t_out_tube, abs=0.2)


@settings(max_examples=3, deadline=None)
@given(flow=st.floats(2.0, 10.0), fouling=st.floats(1e-4, 1e-3))
def test_fouling_never_more_duty_and_zones_add_up(flow, fouling):
    clean = rv.rate(exchanger(), tube_condenser(flow=flow, water=40.0))
    fouled = rv.rate(exchanger(), tube_condenser(flow=flow, water=40.0).replace(fouling_tube=fouling))
    assert fouled.duty <= clean.duty * (1 + 1e-9)  # a deposit only adds resistance (law)
    for r in (clean, fouled):
        # energy along the curve: the zones' duties and areas add up to the whole (conservation, definition)
        assert r.zones["duty"].sum() == pytest.approx(r.duty, rel=1e-9)
        assert r.zones["area"].sum() == pytest.approx(r.area, rel=1e-6)
        assert r.increments["duty"].sum() == pytest.approx(r.duty, rel=1e-9)


def test_parallel_units_share_the_load():
    one = rv.rate(exchanger(), tube_condenser(flow=4.0, water=40.0))
    two = rv.rate(exchanger(shells_parallel=2), tube_condenser(flow=8.0, water=80.0))
    # two identical trains in parallel, each with the single train's flows: twice the duty, same outlets (definition)
    assert two.duty == pytest.approx(2.0 * one.duty, rel=1e-6)
    assert two.t_out_tube == pytest.approx(one.t_out_tube, abs=1e-4)
    assert two.zones["duty"].sum() == pytest.approx(two.duty, rel=1e-9)
    assert two.zones["area"].sum() == pytest.approx(two.area, rel=1e-6)


def test_condenser_settings_reach_an_air_cooled_condenser_and_are_refused_elsewhere():
    """The condenser engine's settings pass through rv.rate for an air cooler whose tube stream condenses; on a
    liquid air cooler, or with a bad value, they are a path-named error, never a TypeError (common practice, no
    source: an unsupported input is named)."""
    ac = air_cooler()
    svc = rv.AirService(tube=rv.Stream(VAPOUR, "2 kg/s", quality=1.0), air_in="25 degC", air_flow="150 kg/s")
    r = rv.rate(ac, svc, increments=6)
    assert len(r.increments) > 0 and r.duty > 0.0
    oil = rv.fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)
    liquid = rv.AirService(tube=rv.Stream(oil, "5 kg/s", "120 degC"), air_in="25 degC", air_flow="150 kg/s")
    with pytest.raises(InputError) as err:
        rv.rate(ac, liquid, increments=6)
    assert "increments" in str(err.value)
    with pytest.raises(InputError) as err:
        rv.rate(ac, svc, increments="many")
    assert "increments" in str(err.value)
