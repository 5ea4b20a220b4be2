"""Tests of revamp.units: parsing to SI, display conversions, errors.

Conversion factors: NIST Special Publication 811 (2008), *Guide for the Use of the International System of Units*,
Appendix B.8 (BTU is the International Table BTU).
"""
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.errors import InputError
from revamp.units import DISPLAY_UNITS, from_si, to_si


@pytest.mark.parametrize(
    "text, kind, expected, rel",
    [
        ("390 degF", "temperature", (390 - 32) / 1.8 + 273.15, 1e-12),  # definition of the Fahrenheit scale
        ("30 degC", "temperature", 303.15, 1e-12),
        ("43800 lb/h", "mass_flow", 43800 * 0.45359237 / 3600, 1e-12),  # NIST SP 811: 1 lb = 0.45359237 kg
        ("1 BTU/lb/degF", "heat_capacity", 4186.8, 1e-6),  # NIST SP 811: 4186.8 J/(kg K); pint rounds BTU to 1055.056 J
        ("1 h*ft**2*degF/BTU", "fouling", 0.17611, 1e-4),  # NIST SP 811: 0.176 110 2 m² K/W
        ("1 BTU/h/ft**2/degF", "htc", 5.678263, 1e-6),  # NIST SP 811: 5.678 263 W/(m² K)
        ("1 BTU/h/ft/degF", "conductivity", 1.730735, 1e-6),  # NIST SP 811: 1.730 735 W/(m K)
        ("1 psi", "pressure", 6894.757, 1e-6),  # NIST SP 811: 6.894 757 kPa
        ("10 delta_degF", "temperature_difference", 10 / 1.8, 1e-12),
        ("10 degF", "temperature_difference", 10 / 1.8, 1e-12),  # a difference, never an absolute temperature
        ("1 cSt", "kinematic_viscosity", 1e-6, 1e-12),
        ("1 cP", "viscosity", 1e-3, 1e-12),
        ("25.4 mm", "length", 0.0254, 1e-12),
    ],
)
def test_strings_to_si(text, kind, expected, rel):
    assert to_si(text, kind, "x") == pytest.approx(expected, rel=rel)


def test_numbers_and_arrays_pass_as_si():
    assert to_si(300, "temperature") == 300.0
    arr = to_si([1.0, 2.0], "mass_flow")
    assert isinstance(arr, np.ndarray) and arr.tolist() == [1.0, 2.0]


@pytest.mark.parametrize(
    "value, kind, words",
    [
        ("5 m", "mass_flow", "dimension"),        # wrong dimension
        ("5 furlongs_per_fortnight", "mass_flow", "cannot read"),  # unknown unit
        ("abc", "length", "cannot read"),          # not a number
        (None, "length", "a length"),
        (True, "length", "a length"),
        (float("nan"), "length", "finite"),
        ([1.0, float("inf")], "length", "finite"),
        ({"a": 1}, "length", "a length"),
    ],
)
def test_bad_values_name_field_value_and_dimension(value, kind, words):
    with pytest.raises(InputError) as info:
        to_si(value, kind, "tube_side.flow")
    msg = str(info.value)
    assert msg.startswith("tube_side.flow: ")
    assert words in msg


@settings(max_examples=50, deadline=None)
@given(value=st.floats(1e-6, 1e6), kind=st.sampled_from(sorted(DISPLAY_UNITS["US"])))
def test_round_trip_si_us_si(value, kind):
    # SI -> US display -> parsed back from a string gives the same SI value (pint conversions are exact inverses)
    if kind == "temperature":
        value = 200.0 + value % 800.0
    mag, _ = from_si(value, kind, "US")
    unit = DISPLAY_UNITS["US"][kind]
    back = to_si(f"{mag!r} {unit}" if unit != "dimensionless" else repr(mag), kind, "x")
    assert back == pytest.approx(value, rel=1e-9)


def test_display_labels():
    assert from_si(373.15, "temperature", "US") == (pytest.approx(212.0), "°F")
    assert from_si(1.0, "fouling", "US")[0] == pytest.approx(1 / 0.1761102, rel=1e-6)  # NIST SP 811
    with pytest.raises(InputError):
        from_si(1.0, "length", "imperial")


def test_fuel_price_units():
    # 1 MMBTU = 1e6 BTU_IT = 1.055056 GJ (NIST SP 811; pint rounds BTU to 1055.056 J)
    assert to_si("1 MMBTU", "energy") == pytest.approx(1.05505585e9, rel=1e-6)
