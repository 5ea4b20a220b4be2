"""The condensing pressure at a measured dew point (``CondensingFluid.pressure_at_dew_point``): CoolProp's
saturation for a pure fluid, CoolProp's dew-point flash for a mixture, Clausius-Clapeyron for a table."""
from __future__ import annotations

import CoolProp.CoolProp as CP
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.errors import InputError
from revamp.fluids import condensing, condensing_curve, pure

MIX = "HEOS::Pentane[0.6]&Hexane[0.4]"


@pytest.fixture(scope="module")
def pentane():
    return condensing(pure("n-Pentane", "3 bar"))


@pytest.fixture(scope="module")
def mix():
    return condensing_curve(mixture=MIX, pressure="3 bar")


def _pentane_table():
    # a pure-fluid condensing curve written from CoolProp (as a data sheet would print it), 3 bar
    h_fg = CP.PropsSI("H", "P", 3e5, "Q", 1, "n-Pentane") - CP.PropsSI("H", "P", 3e5, "Q", 0, "n-Pentane")
    t = CP.PropsSI("T", "P", 3e5, "Q", 1, "n-Pentane")
    frac = np.linspace(0, 1, 5)
    out = {"temperature": [t] * 5, "heat_released": list(frac * h_fg), "vapour_fraction": list(1 - frac)}
    for ph, qv in (("liquid", 0), ("vapour", 1)):
        for k, key in (("density", "D"), ("heat_capacity", "C"), ("viscosity", "V"), ("conductivity", "L")):
            out[f"{ph}_{k}"] = [CP.PropsSI(key, "P", 3e5, "Q", qv, "n-Pentane")] * 5
    return out


def test_pure_fluid_is_coolprops_saturation_pressure(pentane):
    T = np.array([320.0, 340.0, 360.0])
    expected = CP.PropsSI("P", "T", T, "Q", np.ones(3), "n-Pentane")  # CoolProp saturation (Bell et al. 2014)
    assert np.allclose(pentane.pressure_at_dew_point(T), expected, rtol=1e-9)
    assert pentane.pressure_at_dew_point("60 degC") == pytest.approx(
        CP.PropsSI("P", "T", 333.15, "Q", 1, "n-Pentane"), rel=1e-9)


def test_mixture_is_coolprops_dew_point_flash(mix):
    AS = CP.AbstractState("HEOS", "n-Pentane&n-Hexane")
    AS.set_mole_fractions([0.6, 0.4])
    for p in (2e5, 4.5e5):  # the dew point CoolProp finds at p, taken back to its pressure
        AS.update(CP.PQ_INPUTS, p, 1.0)
        assert mix.pressure_at_dew_point(AS.T()) == pytest.approx(p, rel=1e-6)
    assert mix.pressure_at_dew_point(mix.t_dew) == pytest.approx(3e5, rel=1e-6)


def test_table_by_clausius_clapeyron_against_coolprop():
    # CoolProp saturation of pentane 5 K either side of the 3 bar dew point; Clausius-Clapeyron with an ideal-gas
    # vapour errs by the vapour's compressibility (Z about 0.93 at 3 bar, CoolProp): a few per cent in pressure
    c = condensing_curve(_pentane_table(), pressure="3 bar")
    for dT in (-5.0, 5.0):
        exact = CP.PropsSI("P", "T", c.t_dew + dT, "Q", 1, "n-Pentane")
        assert c.pressure_at_dew_point(c.t_dew + dT) == pytest.approx(exact, rel=0.02)
    assert c.pressure_at_dew_point(c.t_dew) == pytest.approx(3e5, rel=1e-12)  # definition: the curve's own point


@settings(max_examples=15, deadline=None)
@given(st.floats(1.2e5, 8e5))
def test_inverse_of_temperature_at_pressure(p):
    # definition of an inverse, for the table form (Clausius-Clapeyron both ways) and the pure form (CoolProp)
    c = condensing_curve(_TABLE, pressure="3 bar")
    assert c.pressure_at_dew_point(c.temperature_at_pressure(p)) == pytest.approx(p, rel=1e-9)
    assert _PENTANE.pressure_at_dew_point(_PENTANE.temperature_at_pressure(p)) == pytest.approx(p, rel=1e-6)


_TABLE = _pentane_table()
_PENTANE = condensing(pure("n-Pentane", "3 bar"))


def test_errors_name_the_field(pentane, mix):
    for bad in (-5.0, "abc"):
        with pytest.raises(InputError) as err:
            pentane.pressure_at_dew_point(bad)
        assert err.value.field == "T"
    with pytest.raises(InputError) as err:  # above pentane's critical temperature (469.7 K, CoolProp)
        pentane.pressure_at_dew_point(480.0)
    assert err.value.field == "T"
    with pytest.raises(InputError) as err:
        mix.pressure_at_dew_point(600.0)  # far above the mixture's critical region
    assert err.value.field == "T"
