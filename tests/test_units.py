"""Tests of revamp.units: parsing to SI, display conversions, errors.

Conversion factors: NIST Special Publication 811 (2008), *Guide for the Use of the International System of Units*,
Appendix B.8 (BTU is the International Table BTU).
"""
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.errors import InputError
from revamp.units import DISPLAY_UNITS, from_si, require, to_si


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


# ----------------------------------------------------------------------------------------- hostile quantity strings
HOSTILE = ["9**9**9 K", "10**400 K", "9**9**8 K", "1 K**9**9**9", "2 m**99999999", "1 ((((((m))))))", "1e400 K",
           "1" * 5000 + " K", "1 m" + " * m" * 200, "300 K\x00", "300 K\x1b[2J", "(9)**9**9 K", "9^9^9 K", "nan K",
           "inf K", "-inf K", "1e-400e5 K"]


def test_hostile_strings_are_refused_quickly_in_a_subprocess():
    """A quantity string is read by a grammar that cannot explode: no power of a number reaches pint (whose
    evaluator computes Python integer powers: 9**9**9 would run for hours), exponents and length are bounded.
    Run in a subprocess with a time limit, so that a regression fails instead of hanging the suite."""
    import json
    import subprocess
    import sys

    code = ("import json, sys\nfrom revamp.units import to_si\nfrom revamp.errors import InputError\nout = []\n"
            "for s in json.loads(sys.stdin.read()):\n"
            "    try:\n        to_si(s, 'temperature' if s.endswith('K') else 'length', 'f'); out.append('accepted')\n"
            "    except InputError as e:\n"
            "        out.append('refused' if str(e).startswith('f: ') else 'bad message')\n"
            "    except BaseException as e:\n        out.append(type(e).__name__)\n"
            "print(json.dumps(out))\n")
    proc = subprocess.run([sys.executable, "-c", code], input=json.dumps(HOSTILE), capture_output=True, text=True,
                          timeout=60, check=False)
    assert proc.returncode == 0, proc.stderr[-2000:]
    assert json.loads(proc.stdout) == ["refused"] * len(HOSTILE)


@pytest.mark.parametrize("text, kind, expected", [
    ("1 ft²", "area", 0.09290304),           # NIST SP 811: 1 ft² = 0.092 903 04 m² (exact)
    ("1 m^3", "length", None),               # wrong dimension, read by the grammar, refused by pint's dimension check
    ("1 BTU/(h*ft**2*degF)", "htc", 5.678263),  # NIST SP 811: 5.678 263 W/(m² K)
    ("150 kW/K", "thermal_conductance", 150e3),  # SI prefix
    ("2 t", "mass", 2000.0),                 # SI: 1 t = 1000 kg
    ("-5 kg/s", "mass_flow", -5.0),          # the sign is the number's: bounds are checked elsewhere
])
def test_grammar_keeps_what_users_write(text, kind, expected):
    if expected is None:
        with pytest.raises(InputError, match="dimension"):
            to_si(text, kind, "f")
    else:
        assert to_si(text, kind, "f") == pytest.approx(expected, rel=1e-6)


@pytest.mark.parametrize("text, words", [
    ("9**9**9 K", "powers of numbers"),
    ("1 m**13", "limited to 12"),
    ("kg/s", "start with a number"),
    ("x" * 500, "longer than"),
    ("1 ((((m))))", "nested deeper"),
])
def test_refusals_say_why(text, words):
    with pytest.raises(InputError, match=words):
        to_si(text, "length", "f")


def test_error_messages_escape_control_characters_and_stay_short():
    with pytest.raises(InputError) as info:
        to_si("300 \x1b[2J" + "K" * 1000, "temperature", "t_in")
    msg = str(info.value)
    assert "\x1b" not in msg and "\\x1b" in msg
    assert len(msg) < 600


@settings(max_examples=60, deadline=None)
@given(st.text(alphabet="0123456789.eE+-*/^() Kkgmsdeg°%²", max_size=40))
def test_any_short_string_parses_or_is_refused(text):
    """Invariant: any string made of the grammar's own characters gives a finite float or an InputError naming the
    field, never another exception."""
    try:
        out = to_si(text, "temperature", "t_in")
    except InputError as exc:
        assert str(exc).startswith("t_in: ")
    else:
        assert np.isfinite(out)


def test_shared_registry_refuses_exploding_expressions_from_any_caller():
    """Modules that hand pint a string directly (a study's U·A target, a plant-data column unit) go through the
    registry's preprocessor: a power of a power and a number raised past 1e300 are refused before evaluation.
    In a subprocess with a time limit: the failure this guards against is a hang."""
    import subprocess
    import sys

    code = (
        "import numpy as np\n"
        "from revamp.units import ureg\nfrom revamp.errors import InputError\nfrom revamp.study import Target\n"
        "out = []\n"
        "for s in ['9**9**9 K', 'K**9**9**9', '9^9^9 K', '10**400 K', 'm**5000', 'K' * 500]:\n"
        "    try:\n        ureg.Quantity(s); out.append('accepted')\n"
        "    except ValueError:\n        out.append('refused')\n"
        "try:\n    Target('UA', '9**9**9 kW/K'); out.append('accepted')\n"
        "except InputError:\n    out.append('refused')\n"
        "try:\n    ureg.Quantity(np.ones(2), 'K**9**9**9'); out.append('accepted')\n"  # as plant-data columns do
        "except ValueError:\n    out.append('refused')\n"
        "out.append(str(ureg.Quantity('2**10 W').to('W').magnitude))\n"
        "print(' '.join(out))\n")
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120, check=False)
    assert proc.returncode == 0, proc.stderr[-2000:]
    # 2**10 = 1024: a small power of a number is still read
    assert proc.stdout.split() == ["refused"] * 8 + ["1024"]


@pytest.mark.parametrize("value", [0.0, -1.5, 3.0, float("nan"), float("inf"), -float("inf")])
@pytest.mark.parametrize("bounds", [dict(gt=0), dict(ge=0.0), dict(gt=-1, lt=2.5), dict(le=3), dict(ge=np.float64(1.0))])
def test_float_shortcut_of_require_decides_as_the_array_checks(value, bounds):
    # a Python float takes a shortcut; the same value as a 0-d array takes the general checks: the same verdict
    # (NaN and infinities included; an array bound goes the general way)
    def verdict(v):
        try:
            require(v, "f", **bounds)
        except InputError as exc:
            return str(exc)
        return "ok"

    assert verdict(value) == verdict(np.asarray(value))


@pytest.mark.parametrize("value", [float("nan"), float("inf"), -float("inf")])
def test_a_float_that_is_not_finite_is_refused_by_name(value):
    with pytest.raises(InputError, match="finite") as info:
        to_si(value, "temperature", "t_in")
    assert str(info.value).startswith("t_in: ")
