"""Tests for revamp.fluids: every expected number comes from an outside source named beside it."""
import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.errors import InputError
from revamp.fluids import Props, constant, petroleum, pure, table, water
from revamp.fluids.coolprop_liquid import INTERPOLATION_ERROR

iapws = pytest.importorskip("iapws")
CP = pytest.importorskip("CoolProp.CoolProp")

HYP = settings(max_examples=40, deadline=None)


# ------------------------------------------------------------------------------------------------------------ water
# Reference: the `iapws` package (IAPWS-95 with the IAPWS 2008 viscosity and 2011 conductivity formulations), a coding
# independent of CoolProp. Tolerance 2e-4: our table's stated interpolation bound (1e-4) plus the small differences
# between two codings of the same formulations (about 1e-5 seen on viscosity).
@pytest.mark.parametrize("T, P", [(280.0, 1e5), (300.0, 1e5), (350.0, 1e6), (420.0, 1e6), (452.0, 1e6),
                                  (290.0, 5e6), (500.0, 5e6), (330.0, 2e5)])
def test_water_against_iapws95(T, P):
    p = water(P).props(T)
    ref = iapws.IAPWS95(T=T, P=P / 1e6)  # iapws takes MPa, returns cp in kJ/kg/K
    assert p.density == pytest.approx(ref.rho, rel=2e-4)
    assert p.heat_capacity == pytest.approx(ref.cp * 1e3, rel=2e-4)
    assert p.viscosity == pytest.approx(ref.mu, rel=2e-4)
    assert p.conductivity == pytest.approx(ref.k, rel=2e-4)


@pytest.mark.parametrize("fluid_factory, cp_name, P", [
    (lambda: water("10 bar"), "Water", 1e6),
    (lambda: water("2 bar"), "Water", 2e5),
    (lambda: pure("Toluene", "3 bar"), "Toluene", 3e5),
])
def test_interpolation_error_bound_against_coolprop(fluid_factory, cp_name, P):
    # The stated bound INTERPOLATION_ERROR, checked at the midpoints of the grid cells (where linear interpolation
    # errs most), against CoolProp evaluated directly at those off-grid temperatures.
    f = fluid_factory()
    g = f._grid
    Tm = g.t0 + (np.arange(g.n - 1) + 0.5) / g.inv_dt
    Tm = Tm[::3]  # every third cell keeps the test fast
    p = f.props(Tm)
    for key, got in zip("DCVL", (p.density, p.heat_capacity, p.viscosity, p.conductivity)):
        ref = CP.PropsSI(key, "T", Tm, "P", np.full(Tm.size, P), cp_name)
        assert np.max(np.abs(got / ref - 1.0)) < INTERPOLATION_ERROR, key


def test_water_saturation_and_triple_point_raise():
    w = water("10 bar")
    # saturation temperature at 1 MPa: IAPWS-IF97 region 4 (iapws), independent of CoolProp
    assert w.t_max == pytest.approx(iapws.iapws97._TSat_P(1.0), abs=0.01)
    with pytest.raises(InputError) as exc:
        w.props(w.t_max)
    assert exc.value.field == "T" and "below saturation" in str(exc.value)
    with pytest.raises(InputError) as exc:
        w.props(np.array([300.0, 400.0, 460.0]))  # one element above saturation: the whole call raises
    assert exc.value.field == "T"
    with pytest.raises(InputError):
        w.props(273.0)  # below the triple point 273.16 K
    assert w.check(np.array([300.0, 460.0]))  # check warns and does not raise
    assert w.check(350.0) == []


def test_water_units_shapes_and_scalars():
    w = water("5 bar")
    p = w.props("25 degC")
    assert isinstance(p, Props) and isinstance(p.density, float)
    # 25 °C, 0.5 MPa: IAPWS-95 via iapws
    assert p.density == pytest.approx(iapws.IAPWS95(T=298.15, P=0.5).rho, rel=2e-4)
    T = np.linspace(290.0, 400.0, 12).reshape(3, 4)
    q = w.props(T)
    assert q.density.shape == (3, 4) and q.viscosity.shape == (3, 4)
    assert q.density[1, 2] == pytest.approx(w.props(float(T[1, 2])).density, rel=1e-12)  # same numbers either way
    assert w.props([300.0, 310.0]).density.shape == (2,)


def test_water_bad_pressure():
    with pytest.raises(InputError) as exc:
        water("300 bar")  # above the critical pressure of water, 220.64 bar (IAPWS-95): no boiling point
    assert exc.value.field == "water.pressure"
    with pytest.raises(InputError) as exc:
        water("10 m")
    assert exc.value.field == "water.pressure"


def test_pure_unknown_name_lists_how_to_find_names():
    with pytest.raises(InputError) as exc:
        pure("unobtainium", "5 bar")
    assert exc.value.field == "pure.name" and "FluidsList" in str(exc.value)


def test_pure_toluene_against_coolprop():
    f = pure("toluene", pressure="2 bar")
    T = 350.0
    # CoolProp evaluated directly (the table must reproduce it within its stated bound)
    assert f.props(T).density == pytest.approx(CP.PropsSI("D", "T", T, "P", 2e5, "Toluene"), rel=1e-4)
    assert f.t_max == pytest.approx(CP.PropsSI("T", "P", 2e5, "Q", 0, "Toluene"), rel=1e-9)


# -------------------------------------------------------------------------------------------------------- petroleum
GAS_OIL = {"api": 30.0, "watson_k": 11.8, "viscosity": [("40 degC", "8 cSt"), ("100 degC", "2.5 cSt")]}


def _kesler_lee_btu(sg, k, t_rankine):
    # Kesler & Lee (1976), Hydrocarbon Processing 55(3):153, liquid cp [BTU/lb/°F], T [°R], typed here from the
    # paper's coefficients as given in the API Technical Data Book procedure 7D2.2 (from memory)
    a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
    a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
    a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
    return a1 + a2 * t_rankine + a3 * t_rankine**2


def test_petroleum_specific_gravity():
    # API definition: SG = 141.5 / (API + 131.5); 30 °API -> 0.87616
    assert petroleum(**GAS_OIL).sg == pytest.approx(141.5 / 161.5, rel=1e-12)
    assert petroleum(**{**GAS_OIL, "api": 10.0}).sg == pytest.approx(1.0, rel=1e-12)  # 10 °API = water's SG


def test_petroleum_heat_capacity_kesler_lee_and_watson_nelson():
    f = petroleum(**GAS_OIL)
    sg = 141.5 / 161.5
    for t_f in (100.0, 200.0, 400.0):
        T = (t_f - 32.0) / 1.8 + 273.15
        expected = _kesler_lee_btu(sg, 11.8, t_f + 459.67) * 4186.8  # 1 BTU/lb/°F = 4186.8 J/kg/K (IT BTU)
        assert f.props(T).heat_capacity == pytest.approx(expected, rel=1e-9)
        # Watson & Nelson (1933) form, cp = (0.6811 - 0.308 SG + (0.000815 - 0.000306 SG) t_F)(0.055 K + 0.35)
        # (from memory): an independent correlation, agrees within a few percent
        wn = (0.6811 - 0.308 * sg + (0.000815 - 0.000306 * sg) * t_f) * (0.055 * 11.8 + 0.35) * 4186.8
        assert f.props(T).heat_capacity == pytest.approx(wn, rel=0.04)
    # chart value: a 30 °API, K = 11.8 oil near 200 °F has cp about 0.52 BTU/lb/°F (Kern 1950, Fig. 4; from memory,
    # approximate chart reading)
    assert f.props((200.0 - 32.0) / 1.8 + 273.15).heat_capacity / 4186.8 == pytest.approx(0.52, rel=0.05)


def test_petroleum_conductivity_cragoe_at_100F():
    from pint import UnitRegistry

    ureg = UnitRegistry()
    f = petroleum(**GAS_OIL)
    sg = 141.5 / 161.5
    # Cragoe (1929): k = 0.813/SG (1 - 0.0003 (t - 32)) BTU·in/(h·ft²·°F), t in °F, taken at 100 °F
    k_us = 0.813 / sg * (1.0 - 0.0003 * (100.0 - 32.0))
    k_si = ureg.Quantity(k_us, "Btu * inch / (hour * foot**2 * delta_degF)").to("W/m/K").magnitude
    assert f.props((100.0 - 32.0) / 1.8 + 273.15).conductivity == pytest.approx(k_si, rel=2e-5)  # pint's Btu: 1e-6
    # Latini et al. (1977) temperature function k ∝ (1 - Tr)^0.38 / Tr^(1/6) (Poling, Prausnitz & O'Connell 2001,
    # §10-9), by hand at 250 °C with the fluid's own Tc
    T0, T = (100.0 - 32.0) / 1.8 + 273.15, 523.15
    shape = lambda t: (1 - t / f.tc) ** 0.38 / (t / f.tc) ** (1 / 6)  # noqa: E731
    assert f.props(T).conductivity == pytest.approx(k_si * shape(T) / shape(T0), rel=2e-5)


def _alkane(fluid):
    """Tb [K] and SG (60/60 °F) of a CoolProp n-alkane, and a petroleum() fraction with the same Tb and SG."""
    tb = CP.PropsSI("T", "P", 101325.0, "Q", 0, fluid)
    t60 = (60.0 - 32.0) / 1.8 + 273.15
    sg = CP.PropsSI("D", "T", t60, "P", 101325.0, fluid) / CP.PropsSI("D", "T", t60, "P", 101325.0, "Water")
    k = (tb * 1.8) ** (1 / 3) / sg  # Watson K = Tb^(1/3)/SG, Tb in °R (Watson & Nelson 1933)
    return tb, sg, petroleum(api=141.5 / sg - 131.5, watson_k=k, viscosity=[("40 degC", "1.2 cSt"),
                                                                            ("100 degC", "0.6 cSt")])


def _cp_liquid(fluid, T, what):
    p = max(2e5, 1.5 * CP.PropsSI("P", "T", T, "Q", 0, fluid))  # compressed liquid, just above saturation
    return CP.PropsSI(what, "T", T, "P", p, fluid)


@pytest.mark.parametrize("fluid", ["n-Decane", "n-Dodecane"])
def test_petroleum_critical_constants_against_coolprop(fluid):
    tb, sg, f = _alkane(fluid)
    # Watson K round trip: Tb from K and SG reproduces the boiling point (definition)
    assert f.tb == pytest.approx(tb, rel=1e-9)
    # Riazi & Daubert (1980) from Tb and SG against the pure fluid's critical point (CoolProp): within 1 % (Tc)
    # and 6 % (Pc); their paper reports average errors of about 1 % and 3-4 % for hydrocarbons (from memory)
    assert f.tc == pytest.approx(CP.PropsSI("Tcrit", fluid), rel=0.01)
    assert f.pc == pytest.approx(CP.PropsSI("pcrit", fluid), rel=0.06)
    # Edmister (1958) acentric factor against CoolProp's: within 0.05
    assert f.omega == pytest.approx(CP.PropsSI("acentric", fluid), abs=0.05)


_ALKANE_CASES = [(fl, t) for fl in ("n-Decane", "n-Dodecane") for t in (20.0, 100.0, 150.0, 200.0)]


@pytest.mark.parametrize("fluid, t_c", _ALKANE_CASES + [("n-Dodecane", 250.0)])  # to Tr = 0.8 (n-decane, 250 °C: 0.85)
def test_petroleum_hot_properties_against_coolprop(fluid, t_c):
    tb, sg, f = _alkane(fluid)
    T = t_c + 273.15
    assert T / f.tc <= 0.82
    p = f.props(T)
    # CoolProp (reference equations of state) for the pure alkane of the same Tb and SG
    assert p.density == pytest.approx(_cp_liquid(fluid, T, "D"), rel=0.01)  # Rackett anchored at SG
    assert p.heat_capacity == pytest.approx(_cp_liquid(fluid, T, "C"), rel=0.04)  # Kesler & Lee (1976)
    # conductivity: Cragoe's magnitude (fitted to petroleum oils) overstates n-alkanes by 20-30 %, so check the
    # temperature function, the ratio to 100 °F, against CoolProp's ratio
    T0 = (100.0 - 32.0) / 1.8 + 273.15
    ratio = p.conductivity / f.props(T0).conductivity
    assert ratio == pytest.approx(_cp_liquid(fluid, T, "L") / _cp_liquid(fluid, T0, "L"), rel=0.05)


def test_petroleum_density_near_the_volume_correction_tables_in_their_range():
    f = petroleum(**GAS_OIL)
    sg = 141.5 / 161.5
    # at 60 °F the density is SG x water at 60 °F; water at 60 °F, 1 atm from IAPWS-95 (iapws): 999.0 kg/m³
    rho_w60 = iapws.IAPWS95(T=(60.0 - 32.0) / 1.8 + 273.15, P=0.101325).rho
    assert f.props((60.0 - 32.0) / 1.8 + 273.15).density == pytest.approx(sg * rho_w60, rel=2e-5)
    # Rackett (Spencer & Danner 1972, Z_RA of Yamada & Gunn 1973) by hand with the fluid's Tc and omega
    T = (200.0 - 32.0) / 1.8 + 273.15
    z = 0.29056 - 0.08775 * f.omega
    tr60, tr = ((60.0 - 32.0) / 1.8 + 273.15) / f.tc, T / f.tc
    assert f.props(T).density == pytest.approx(sg * 999.016 * z ** ((1 - tr60) ** (2 / 7) - (1 - tr) ** (2 / 7)))
    # API MPMS 11.1 / ASTM D1250-80 generalized crude (K0 = 341.0957, from memory) at 200 °F, in its range: the two
    # methods agree within 1.5 %
    rho60 = sg * 999.016
    a = 341.0957 / rho60**2
    dt = 140.0
    mpms = rho60 * math.exp(-a * dt * (1 + 0.8 * a * dt))
    assert f.props(T).density == pytest.approx(mpms, rel=0.015)


def test_petroleum_d341_passes_through_points_and_third_point():
    f = petroleum(**GAS_OIL)
    # D341's forward Z(nu) and its inverse nu(Z) are fits of each other, consistent to about 2e-5 (D341)
    assert f.kinematic_viscosity(313.15) == pytest.approx(8e-6, rel=1e-4)
    assert f.kinematic_viscosity(373.15) == pytest.approx(2.5e-6, rel=1e-4)
    # ASTM D341: log10 log10 Z = A - B log10 T, Z = nu + 0.7 + exp(-1.47 - 1.84 nu - 0.51 nu²), inverse
    # nu = (Z - 0.7) - exp(-0.7487 - 3.295 (Z - 0.7) + 0.6119 (Z - 0.7)² - 0.3193 (Z - 0.7)³) (from memory; the same
    # constants appear in several public implementations), solved by hand through the two points, at 70 °C and 250 °C
    zf = lambda nu: nu + 0.7 + math.exp(-1.47 - 1.84 * nu - 0.51 * nu ** 2)  # noqa: E731
    l1, l2 = math.log10(math.log10(zf(8.0))), math.log10(math.log10(zf(2.5)))
    B = (l1 - l2) / (math.log10(373.15) - math.log10(313.15))
    A = l1 + B * math.log10(313.15)
    for T in (343.15, 523.15):
        z = 10 ** (10 ** (A - B * math.log10(T)))
        nu = (z - 0.7) - math.exp(-0.7487 - 3.295 * (z - 0.7) + 0.6119 * (z - 0.7) ** 2 - 0.3193 * (z - 0.7) ** 3)
        assert f.kinematic_viscosity(T) * 1e6 == pytest.approx(nu, rel=1e-9)
    # dynamic = kinematic x density
    p = f.props(343.15)
    assert p.viscosity == pytest.approx(f.kinematic_viscosity(343.15) * p.density, rel=1e-10)


def test_steep_viscosity_line_stays_finite():
    # a steep two-point line (383.9 K / 3.51 cSt, 419 K / 0.513 cSt) overflowed to mu = inf below 292 K
    f = petroleum(api=30.0, watson_k=11.8, viscosity=[(383.9, "3.51 cSt"), (419.0, "0.513 cSt")])
    T = np.array([250.0, 280.0, 292.0, 300.0, 350.0, 383.9, 419.0, 450.0])
    p = f.props(T)
    assert np.all(np.isfinite(p.viscosity)) and np.all(p.viscosity > 0)
    assert np.all(np.diff(p.viscosity) <= 0)  # never rises with temperature (physical expectation)
    # held at the top of the ASTM D341 chart, 2e7 cSt (from memory)
    assert f.kinematic_viscosity(250.0) == pytest.approx(20.0, rel=1e-6)  # 2e7 cSt = 20 m²/s
    assert f.kinematic_viscosity(383.9) == pytest.approx(3.51e-6, rel=1e-4)
    w = f.check(T)
    assert any("extrapolated" in x for x in w) and any("D341" in x and "2e+07" in x for x in w)


def test_petroleum_check_reports_each_quantity_once():
    f = petroleum(**GAS_OIL)
    assert f.check((150.0 - 32.0) / 1.8 + 273.15) == []
    assert f.check("100 degC") == []
    # a rating passes inlet and outlet arrays: one line per quantity, with the range and the count of cases
    t_in = np.full(500, 265.0 + 273.15)
    t_out = np.linspace(150.0, 200.0, 500) + 273.15
    w = f.check(t_in, t_out)
    assert len(w) == len({x.split(":")[1] for x in w})  # one line per method/quantity
    assert len(w) == 1 and "extrapolated" in w[0] and "1000 of 1000" in w[0]
    # hot but valid: 265 °C gas oil and 330 °C residue need no density, cp or conductivity warnings
    residue = petroleum(api=12.0, watson_k=11.6, viscosity=[("100 degC", "150 cSt"), ("150 degC", "30 cSt")])
    for fluid, t in ((f, 265.0), (residue, 330.0)):
        w = fluid.check(np.linspace(150.0, t, 50) + 273.15)
        assert not [x for x in w if "density" in x or "cp" in x or "conductivity" in x], w
    # beyond the ranges: 690 °F gas oil is past Tr = 0.8 for conductivity; 800 °F past everything
    assert any("conductivity" in x for x in f.check((690.0 - 32.0) / 1.8 + 273.15))
    assert any("overall range" in x for x in f.check((800.0 - 32.0) / 1.8 + 273.15))


def test_petroleum_is_not_a_liquid_above_its_critical_temperature():
    f = petroleum(**GAS_OIL)
    with pytest.raises(InputError) as err:
        f.props(f.tc + 1.0)
    assert err.value.field == "T"
    assert f.t_max < f.tc


@pytest.mark.parametrize("kwargs, field", [
    (dict(GAS_OIL, api=200.0), "petroleum.api"),
    (dict(GAS_OIL, api="thirty"), "petroleum.api"),
    (dict(GAS_OIL, watson_k=5.0), "petroleum.watson_k"),
    (dict(GAS_OIL, viscosity=[("40 degC", "2 cSt"), ("100 degC", "5 cSt")]), "petroleum.viscosity"),
    (dict(GAS_OIL, viscosity=[("40 degC", "2 cSt"), ("100 degC", "0.1 cSt")]), "petroleum.viscosity[1][1]"),
    (dict(GAS_OIL, viscosity=[("40 degC", "8 cSt")]), "petroleum.viscosity"),
    (dict(GAS_OIL, viscosity=[("40 degC", "8 cP"), ("100 degC", "2.5 cSt")]), "petroleum.viscosity[0][1]"),
    (dict(GAS_OIL, viscosity=[("40 degC", "8 cSt"), ("40 degC", "2.5 cSt")]), "petroleum.viscosity"),
])
def test_petroleum_bad_inputs(kwargs, field):
    with pytest.raises(InputError) as exc:
        petroleum(**kwargs)
    assert exc.value.field == field


# ------------------------------------------------------------------------------------------------------------ table
def _sheet():
    return table(T=["50 degC", "100 degC", "150 degC"], density=[850.0, 815.0, 780.0],
                 heat_capacity=["0.48 BTU/lb/delta_degF", 2100.0, 2300.0], viscosity=["4 cP", "2 cP", "1 cP"],
                 conductivity=[0.130, 0.125, 0.120], name="data sheet oil")


def test_table_interpolation():
    f = _sheet()
    p = f.props(np.array([348.15, 373.15]))
    # linear midpoint of 850 and 815 at 75 °C, by hand
    assert p.density[0] == pytest.approx(832.5, rel=1e-12)
    # log-linear viscosity: midpoint is the geometric mean sqrt(4 x 2) cP, by hand
    assert p.viscosity[0] == pytest.approx(math.sqrt(8.0) * 1e-3, rel=1e-12)
    assert p.viscosity[1] == pytest.approx(2e-3, rel=1e-12)
    # 0.48 BTU/lb/°F = 2009.66 J/kg/K (IT BTU), converted by hand
    assert f.props(323.15).heat_capacity == pytest.approx(0.48 * 4186.8, rel=1e-6)
    assert f.check(np.array([330.0, 400.0])) == []


def test_table_extrapolation_warns_and_stays_positive():
    f = _sheet()
    p = f.props(448.15)  # 175 °C, 25 K past the last point
    assert p.density == pytest.approx(780.0 - 35.0 / 2, rel=1e-12)  # end slope -0.7 kg/m³/K, by hand
    assert p.viscosity == pytest.approx(1e-3 / math.sqrt(2.0), rel=1e-12)  # halving per 50 K continues
    w = f.check(448.15)
    assert len(w) == 1 and "extrapolated" in w[0]
    with pytest.raises(InputError) as exc:
        f.props(2000.0)  # extrapolated density would be negative
    assert exc.value.field == "T"


@pytest.mark.parametrize("kwargs, field", [
    ({"T": [300.0], "density": [1.0], "heat_capacity": [1.0], "viscosity": [1.0], "conductivity": [1.0]}, "table.T"),
    ({"T": [300.0, 290.0], "density": [1, 1], "heat_capacity": [1, 1], "viscosity": [1, 1], "conductivity": [1, 1]},
     "table.T"),
    ({"T": [300.0, 310.0], "density": [1, -1], "heat_capacity": [1, 1], "viscosity": [1, 1], "conductivity": [1, 1]},
     "table.density"),
    ({"T": [300.0, 310.0], "density": [1, 1], "heat_capacity": [1, 1, 1], "viscosity": [1, 1], "conductivity": [1, 1]},
     "table.heat_capacity"),
    ({"T": [300.0, 310.0], "density": [1, 1], "heat_capacity": [1, 1], "viscosity": ["1 m", 1], "conductivity": [1, 1]},
     "table.viscosity[0]"),
])
def test_table_bad_inputs(kwargs, field):
    with pytest.raises(InputError) as exc:
        table(**kwargs)
    assert exc.value.field == field


# --------------------------------------------------------------------------------------------------------- constant
def test_constant():
    f = constant(density=1000.0, heat_capacity="1 BTU/lb/delta_degF", viscosity="1 cP", conductivity=0.6)
    p = f.props(300.0)
    assert p.heat_capacity == pytest.approx(4186.8, rel=1e-6)  # 1 BTU/lb/°F = 4186.8 J/kg/K (IT BTU)
    assert p.viscosity == pytest.approx(1e-3)  # 1 cP = 1 mPa·s
    q = f.props(np.full((2, 3), 350.0))
    assert q.density.shape == (2, 3) and np.all(q.density == 1000.0)
    assert f.check(5000.0) == []
    assert p.prandtl == pytest.approx(4186.8 * 1e-3 / 0.6, rel=1e-6)
    with pytest.raises(InputError) as exc:
        constant(density=-1.0, heat_capacity=1.0, viscosity=1.0, conductivity=1.0)
    assert exc.value.field == "constant.density"


def test_frozen():
    f = water("5 bar")
    with pytest.raises(dataclasses.FrozenInstanceError):
        f.pressure = 1.0
    with pytest.raises(dataclasses.FrozenInstanceError):
        f.props(300.0).density = 1.0


# ---------------------------------------------------------------------------------------------- physics invariants
W10 = water("10 bar")


@HYP
@given(st.floats(278.0, 452.0), st.floats(0.05, 170.0))
def test_water_density_falls_above_4C(t1, dt):
    # liquid water is densest near 4 °C (277.13 K, IAPWS-95); above it density falls with temperature
    t2 = min(t1 + dt, 452.9)
    if t2 - t1 < 0.01:
        return
    assert W10.props(t2).density < W10.props(t1).density


@HYP
@given(st.floats(274.0, 452.0), st.floats(0.05, 170.0))
def test_water_viscosity_falls(t1, dt):
    t2 = min(t1 + dt, 452.9)
    if t2 - t1 < 0.01:
        return
    assert W10.props(t2).viscosity < W10.props(t1).viscosity


@HYP
@given(api=st.floats(5.0, 80.0), k=st.floats(10.0, 13.0), nu1=st.floats(1.0, 500.0), ratio=st.floats(1.2, 20.0),
       t1=st.floats(260.0, 640.0), t2=st.floats(260.0, 640.0))
def test_liquid_viscosity_falls_petroleum(api, k, nu1, ratio, t1, t2):
    try:
        f = petroleum(api=api, watson_k=k, viscosity=[("40 degC", nu1 * ratio * 1e-6), ("100 degC", nu1 * 1e-6)])
    except InputError as err:  # API/K pairs no petroleum fraction has (e.g. API 5 with K 13: Tb ~ 1360 K)
        assert err.field == "petroleum.watson_k" and api < 25
        return
    lo, hi = sorted(min(t, f.t_max) for t in (t1, t2))
    if hi - lo < 0.1:
        return
    assert f.props(hi).viscosity <= f.props(lo).viscosity
    assert f.props(hi).density < f.props(lo).density  # thermal expansion


@HYP
@given(st.floats(200.0, 405.0), st.floats(0.1, 100.0))
def test_liquid_viscosity_falls_toluene_and_table(t1, dt):
    tol = pure("Toluene", "2 bar")
    t2 = min(t1 + dt, tol.t_max - 0.1)
    if t2 - t1 < 0.05:
        return
    assert tol.props(t2).viscosity < tol.props(t1).viscosity
    sheet = _sheet()
    assert sheet.props(t2 + 100.0).viscosity < sheet.props(t1 + 100.0).viscosity


def test_scalar_and_array_paths_agree():
    # the scalar fast paths (plain Python floats) and the array paths must give the same numbers
    T = np.array([300.0, 333.3, 401.7])
    for f in (water("10 bar"), _sheet(), petroleum(**GAS_OIL), constant(900.0, 2000.0, 1e-3, 0.13)):
        arr = f.props(T)
        for j, t in enumerate(T):
            for one in (f.props(float(t)), f.props(np.float64(t)), f.props(f"{t} K")):
                assert one.density == pytest.approx(arr.density[j], rel=1e-12)
                assert one.viscosity == pytest.approx(arr.viscosity[j], rel=1e-12)
                assert one.heat_capacity == pytest.approx(arr.heat_capacity[j], rel=1e-12)
                assert one.conductivity == pytest.approx(arr.conductivity[j], rel=1e-12)
    assert water("10 bar").props(300).density == pytest.approx(water("10 bar").props(300.0).density)


@pytest.mark.parametrize("bad", [float("nan"), np.array([300.0, np.nan]), -5.0, "hot"])
def test_bad_temperatures_raise_input_error(bad):
    for f in (water("10 bar"), _sheet(), petroleum(**GAS_OIL)):
        with pytest.raises(InputError) as exc:
            f.props(bad)
        assert exc.value.field == "T"


def test_every_provider_meets_the_protocol():
    from revamp.fluids import Fluid

    for f in (water("10 bar"), pure("Toluene", "2 bar"), _sheet(), petroleum(**GAS_OIL),
              constant(900.0, 2000.0, 1e-3, 0.13)):
        assert isinstance(f, Fluid)
        assert isinstance(f.name, str) and f.t_min < f.t_max
        assert isinstance(f.check(350.0), list)


def test_every_check_reports_once_over_several_arrays():
    # a rating checks inlet and outlet temperatures together: one line per warning, counting all of them
    cold, hot = np.array([250.0, 260.0]), np.array([600.0, 700.0, 800.0])
    for f in (water("10 bar"), pure("Toluene", "2 bar"), _sheet()):
        w = f.check(cold, hot)
        assert len(w) == 1 and "of 5" in w[0], (f.name, w)
    assert constant(900.0, 2000.0, 1e-3, 0.13).check(cold, hot) == []


@HYP
@given(api=st.floats(8.0, 60.0), k=st.floats(10.5, 12.8), nu40=st.floats(3.0, 2000.0), ratio=st.floats(1.5, 10.0))
def test_petroleum_hot_properties_behave_physically(api, k, nu40, ratio):
    try:
        f = petroleum(api=api, watson_k=k, viscosity=[("40 degC", nu40 * 1e-6), ("100 degC", nu40 / ratio * 1e-6)])
    except InputError as err:  # an API/K pair no fraction has
        assert err.field == "petroleum.watson_k"
        return
    T = np.linspace(f.t_min, f.t_max, 200)
    p = f.props(T)
    # liquids expand, conduct less and flow more easily when hotter; cp rises (physical expectation, no source)
    assert np.all(np.diff(p.density) < 0) and np.all(np.diff(p.conductivity) < 0)
    assert np.all(np.diff(p.viscosity) <= 0) and np.all(np.diff(p.heat_capacity) > 0)
    assert np.all(np.isfinite(p.viscosity)) and np.all(p.density > 0) and np.all(p.conductivity > 0)


# ------------------------------------------------------------------------------------------- water built lazily
@pytest.mark.parametrize("p_mpa", [0.001, 0.01, 0.1, 0.4, 1.0, 5.0, 15.0, 22.0])
def test_if97_saturation_temperature_against_iapws(p_mpa):
    # IAPWS-IF97 Eq. 31 as coded independently in the `iapws` package; and IAPWS-95's saturated liquid (CoolProp),
    # which IF97 matches to a few mK away from the critical point (Wagner et al. 2000, consistency with IAPWS-95)
    from revamp.fluids.coolprop_liquid import saturation_temperature_if97

    t = saturation_temperature_if97(p_mpa * 1e6)
    assert t == pytest.approx(iapws.iapws97._TSat_P(p_mpa), abs=1e-9)
    assert t == pytest.approx(CP.PropsSI("T", "P", p_mpa * 1e6, "Q", 0.0, "Water"), abs=0.02)


def test_water_is_built_without_coolprop_until_first_use():
    # a fresh interpreter: making water (and refusing a bad pressure) must not import CoolProp; props() then does
    import subprocess
    import sys

    code = ("import sys\nfrom revamp.fluids import water\nfrom revamp.errors import InputError\n"
            "w = water('4 bar', name='cooling water')\n"
            "try:\n    water('100 Pa')\nexcept InputError as e:\n    assert e.field == 'water.pressure', e.field\n"
            "assert 'CoolProp' not in sys.modules and not w.loaded\n"
            "lo, hi = w.screen()\n"
            "w.props(300.0)\nassert 'CoolProp' in sys.modules and w.loaded\n"
            "print(w.name, lo, hi, w.t_min, w.t_max)\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.split()
    name_words, (lo, hi, t_min, t_max) = out[:2], map(float, out[2:])
    assert name_words == ["cooling", "water"]
    # the screen (IF97) and the built table (IAPWS-95 via CoolProp) agree on saturation at 4 bar within a few mK;
    # 143.61 °C at 0.4 MPa is the common steam-table value (from memory)
    assert lo == t_min == 273.16
    assert hi == pytest.approx(t_max, abs=0.01)
    assert t_max == pytest.approx(143.61 + 273.15, abs=0.02)


def test_water_bad_pressure_names_the_field():
    # water's triple point 611.655 Pa and critical point 22.064 MPa (IAPWS-95, Wagner & Pruss 2002)
    for p in ("500 Pa", "23 MPa", "650 Pa"):
        with pytest.raises(InputError) as exc:
            water(p)
        assert exc.value.field == "water.pressure"
    with pytest.raises(InputError) as exc:
        water("4 bar", name="  ")
    assert exc.value.field == "water.name"


def test_pure_keeps_the_users_label_and_checks_its_name_at_once():
    t = pure("Toluene", "3 bar", label="solvent")
    assert t.name == "solvent" and t.fluid == "Toluene" and t.loaded
    with pytest.raises(InputError) as exc:
        pure("NotAFluid")
    assert exc.value.field == "pure.name"


@settings(max_examples=80, deadline=None)
@given(st.lists(st.floats(200.0, 700.0), min_size=1, max_size=12), st.sampled_from(["light", "heavy"]))
def test_petroleum_check_flags_what_a_value_by_value_scan_flags(temps, kind):
    # the check decides each range from the extreme temperatures (each range is an interval, ASTM D341's viscosity is
    # monotonic in T); a scan of every value, written out here, must flag the same ranges
    import importlib

    pet = importlib.import_module("revamp.fluids.petroleum")  # the module (the package exports the function)
    visc = {"light": [("40 degC", "1.5 cSt"), ("100 degC", "0.75 cSt")],
            "heavy": [("100 degC", "60 cSt"), ("150 degC", "15 cSt")]}[kind]
    f = petroleum(api=30, watson_k=11.8, viscosity=visc)
    t = np.array(temps)
    bands = {"overall range": (f.t_min, f.t_max), "Rackett density": (f.t_min, pet.TR_DENSITY * f.tc),
             "Kesler-Lee cp": (f.t_min, pet.TR_CP * f.tc), "conductivity": (f.t_min, pet.TR_CONDUCTIVITY * f.tc),
             "ASTM D341 viscosity": (f.visc_t1, f.visc_t2)}
    expected = {name for name, (lo, hi) in bands.items() if np.any((t < lo) | (t > hi))}
    nu = np.array([float(f.kinematic_viscosity(v)) for v in temps]) * 1e6
    if np.any((nu < pet.NU_MIN_CST) | (nu > pet.NU_MAX_CST)):
        expected.add("ASTM D341: viscosity")
    got = set()
    for w in f.check(t):
        for name in list(bands) + ["ASTM D341: viscosity"]:
            if f"{f.name}: {name}" in w:
                got.add(name)
    assert got == expected
