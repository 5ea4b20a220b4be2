"""Units: parse user inputs (SI numbers or strings with a unit) to SI floats or arrays, and convert for display.

The core works in SI only: K, W, m, kg/s, Pa, m²·K/W, W/m²·K. Inputs may be a number (taken as SI), a numpy array
(taken as SI), or a string with a unit such as ``"390 degF"``, ``"43800 lb/h"`` or ``"0.002 h*ft**2*degF/BTU"``.

Examples
--------
>>> round(to_si("390 degF", "temperature", "t_in"), 2)
472.04
>>> round(to_si("43800 lb/h", "mass_flow", "flow"), 4)
5.5187
>>> to_si(300.0, "temperature", "t_in")
300.0
"""
from __future__ import annotations

import math
import numbers
import re
from functools import lru_cache

import numpy as np
import pint

from .errors import InputError

__all__ = ["ureg", "to_si", "DIMENSIONS", "from_si", "DISPLAY_UNITS", "format_quantity"]

#: the longest expression the shared registry parses [characters] (API calls that hand pint a string directly)
MAX_EXPRESSION_LENGTH = 400
_EXPONENT_RE = re.compile(r"(?:\*\*|\^)\s*\(?\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)")
_TOWER_RE = re.compile(r"(?:\*\*|\^)\s*\(?\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*\)*\s*(?:\*\*|\^)")
_LITERAL_RE = re.compile(r"(?<![\w.])(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?")


def _guard_expression(text: str) -> str:
    """A pint preprocessor that refuses expressions whose evaluation could explode, before pint evaluates them.

    pint evaluates ``**`` with Python integers: ``9**9**9`` runs for hours and ``10**400`` overflows a float. Every
    string the shared registry parses (``ureg.Quantity("...")``, ``ureg.Quantity(x, "unit")``, from any module)
    passes here: at most :data:`MAX_EXPRESSION_LENGTH` characters, the product of its powers at most 1000, and no
    number raised past 1e300. The unit-file and :func:`to_si` path is stricter still (:func:`_split_quantity`).
    """
    if len(text) > MAX_EXPRESSION_LENGTH:
        raise ValueError(f"a unit expression longer than {MAX_EXPRESSION_LENGTH} characters")
    exponents = [abs(float(m.group(1))) for m in _EXPONENT_RE.finditer(text)]
    if not exponents:
        return text
    if _TOWER_RE.search(text):  # a**b**c is a**(b**c): a power of a power is refused outright
        raise ValueError(f"{text[:40]!r} raises a power to a power (write the number, e.g. '1e6 W')")
    product = 1.0
    for e in exponents:
        product *= max(e, 1.0)
    if product > 1000.0:
        raise ValueError(f"powers in {text[:40]!r} are too large (write the number, e.g. '1e6 W')")
    powered = {m.start(1) for m in _EXPONENT_RE.finditer(text)}
    bases = [abs(float(m.group())) for m in _LITERAL_RE.finditer(text) if m.start() not in powered]
    biggest = max((np.log10(b) for b in bases if b > 1.0), default=0.0)
    if biggest * product > 300.0:
        raise ValueError(f"{text[:40]!r} raises a number past 1e300 (write the number, e.g. '1e6 W')")
    return text


ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True, preprocessors=[_guard_expression])
ureg.define("BTU = Btu")  # spelling used on data sheets
ureg.define("MMBTU = 1e6 * BTU = MMBtu")  # million BTU, the usual unit of fuel prices

# quantity kind -> (SI unit, pint dimensionality check unit, words for messages)
DIMENSIONS: dict[str, tuple[str, str]] = {
    "temperature": ("kelvin", "a temperature (K, or e.g. '390 degF', '30 degC')"),
    "temperature_difference": ("delta_degC", "a temperature difference (K, or e.g. '10 delta_degF')"),
    "length": ("meter", "a length (m, or e.g. '25.4 mm', '16 ft')"),
    "area": ("meter**2", "an area (m², or e.g. '1200 ft**2')"),
    "mass_flow": ("kilogram/second", "a mass flow (kg/s, or e.g. '43800 lb/h')"),
    "volume_flow": ("meter**3/second", "a volume flow (m³/s, or e.g. '120 m**3/h', '500 gallon/minute')"),
    "pressure": ("pascal", "a pressure (Pa, or e.g. '10 psi', '0.7 bar')"),
    "velocity": ("meter/second", "a velocity (m/s, or e.g. '6 ft/s')"),
    "density": ("kilogram/meter**3", "a density (kg/m³)"),
    "heat_capacity": ("joule/kilogram/kelvin", "a specific heat capacity (J/kg·K, or e.g. '0.5 BTU/lb/degF')"),
    "viscosity": ("pascal*second", "a dynamic viscosity (Pa·s, or e.g. '1.2 cP')"),
    "kinematic_viscosity": ("meter**2/second", "a kinematic viscosity (m²/s, or e.g. '5 cSt')"),
    "conductivity": ("watt/meter/kelvin", "a thermal conductivity (W/m·K, or e.g. '26 BTU/h/ft/degF')"),
    "htc": ("watt/meter**2/kelvin", "a heat-transfer coefficient (W/m²·K, or e.g. '100 BTU/h/ft**2/degF')"),
    "fouling": ("meter**2*kelvin/watt", "a fouling resistance (m²·K/W, or e.g. '0.002 h*ft**2*degF/BTU')"),
    "fouling_rate": ("meter**2*kelvin/watt/second", "a fouling rate (m²·K/W per s, or e.g. '1e-6 m**2*K/W/day')"),
    "power": ("watt", "a heat duty (W, or e.g. '5 MW', '10e6 BTU/h')"),
    "modulus": ("pascal", "an elastic modulus (Pa, or e.g. '200 GPa')"),
    "time": ("second", "a duration (s, or e.g. '30 day', '8000 h')"),
    "energy": ("joule", "an energy (J, or e.g. '1 GJ', '1 MMBTU')"),
    "dimensionless": ("dimensionless", "a plain number"),
    "mass": ("kilogram", "a mass (kg, or e.g. '1 t', '1 lb')"),
    "thermal_conductance": ("watt/kelvin", "a thermal conductance U·A (W/K, or e.g. '150 kW/K')"),
}

# Inside a compound unit (BTU/lb/degF, h*ft**2*degF/BTU) a temperature is a *difference*: pint would otherwise take
# degF as an absolute temperature (with autoconvert_offset_to_baseunit, 1 degF -> 255.9 K), a silent wrong number.
_DELTA_RE = re.compile(r"(?<![A-Za-z_])(degC|degF|°C|°F|celsius|fahrenheit|degree_Celsius|degree_Fahrenheit)(?![A-Za-z_])")
_DELTA = {"degC": "delta_degC", "°C": "delta_degC", "celsius": "delta_degC", "degree_Celsius": "delta_degC",
          "degF": "delta_degF", "°F": "delta_degF", "fahrenheit": "delta_degF", "degree_Fahrenheit": "delta_degF"}


def _as_differences(text: str) -> str:
    """Rewrite offset temperature units as differences (for every kind but an absolute temperature)."""
    return _DELTA_RE.sub(lambda m: _DELTA[m.group(1)], text)


#: the longest quantity string read [characters]; a longer one is refused before pint sees it
MAX_QUANTITY_LENGTH = 120
#: the largest power a unit may be raised to in a quantity string (``m**3``, ``ft**2``)
MAX_UNIT_EXPONENT = 12
#: the deepest parentheses in a quantity string's unit (``BTU/(h*ft**2*degF)`` is 1)
MAX_UNIT_PARENTHESES = 3

_MAGNITUDE_RE = re.compile(r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?")
_UNIT_TOKEN_RE = re.compile(
    r"\s*(?:(?P<name>(?:[^\W\d]|°)[\w°]*[²³]?)|(?P<pct>%)|(?P<pow>\*\*|\^)\s*(?P<exp>[-+]?\d{1,2}(?:\.\d{1,3})?)"
    r"|(?P<op>[*/])|(?P<open>\()|(?P<close>\)))")


def _split_quantity(text: str) -> tuple[float, str]:
    """Split ``"<number> <unit>"`` into a float and a unit text, by a grammar that cannot explode.

    The number is a plain decimal literal (no arithmetic, read by ``float``, so ``10**400`` or ``9**9**9`` never
    reach pint's evaluator); the unit is names (``kg``, ``degC``, ``ft²``, ``%``), ``*``, ``/``, parentheses (at most
    :data:`MAX_UNIT_PARENTHESES` deep) and powers of a *name* by a literal of at most :data:`MAX_UNIT_EXPONENT`.
    Anything else raises ValueError with the reason, before pint is called.
    """
    if len(text) > MAX_QUANTITY_LENGTH:
        raise ValueError(f"longer than {MAX_QUANTITY_LENGTH} characters")
    m = _MAGNITUDE_RE.match(text)
    if not m:
        raise ValueError("must start with a number, e.g. '25.4 mm'")
    magnitude = float(m.group(0))  # '1e400' -> inf, refused later as not finite
    unit = text[m.end():].strip()
    pos, depth, prev = 0, 0, "start"
    while pos < len(unit):
        t = _UNIT_TOKEN_RE.match(unit, pos)
        if t is None or t.end() == pos:
            raise ValueError(f"unexpected {unit[pos:].strip()[:12]!r} in the unit (powers of numbers are not read: "
                             "write the number, e.g. '1e6 W')")
        pos = t.end()
        if t.group("name") or t.group("pct"):
            prev = "name"
        elif t.group("pow"):
            if prev in ("start", "exp"):
                raise ValueError("powers of numbers are not read: write the number, e.g. '1e6 W'")
            if prev != "name":
                raise ValueError("a power must follow a unit name, e.g. 'ft**2'")
            if abs(float(t.group("exp"))) > MAX_UNIT_EXPONENT:
                raise ValueError(f"unit powers are limited to {MAX_UNIT_EXPONENT}")
            prev = "exp"
        elif t.group("op"):
            if prev in ("op", "open") or (prev == "start" and t.group("op") == "*"):
                raise ValueError("an operator without a unit before it")
            prev = "op"
        elif t.group("open"):
            depth += 1
            if depth > MAX_UNIT_PARENTHESES:
                raise ValueError(f"parentheses nested deeper than {MAX_UNIT_PARENTHESES}")
            prev = "open"
        else:
            depth -= 1
            if depth < 0 or prev not in ("name", "exp", "close"):
                raise ValueError("unbalanced parentheses")
            prev = "close"
    if depth or prev in ("op", "open"):
        raise ValueError("an incomplete unit")
    if unit.startswith("/"):
        unit = "1" + unit  # '9 /MMBTU': per unit
    return magnitude, unit


@lru_cache(maxsize=4096)
def _parse_string(text: str, kind: str) -> float:
    si_unit, words = DIMENSIONS[kind]
    try:
        magnitude, unit = _split_quantity(text)
    except ValueError as exc:
        raise ValueError(f"cannot read {text[:40]!r} as a number with a unit ({exc})") from None
    if not np.isfinite(magnitude):
        raise ValueError(f"{text[:40]!r} is not a finite number")
    try:
        q = ureg.Quantity(magnitude, (unit if kind == "temperature" else _as_differences(unit)) or "dimensionless")
    except Exception as exc:  # pint raises many types: undefined unit, syntax, ...
        raise ValueError(f"cannot read {text!r} as a number with a unit ({exc.__class__.__name__})") from None
    try:
        return float(q.to(si_unit).magnitude)
    except pint.DimensionalityError:
        raise ValueError(f"{text!r} has dimension {q.dimensionality}, not {words}") from None
    except (ArithmeticError, ValueError) as exc:  # an overflowing conversion factor
        raise ValueError(f"cannot convert {text!r} to {si_unit} ({exc.__class__.__name__})") from None


def to_si(value, kind: str, field: str = "value"):
    """Convert a user value to SI.

    Parameters
    ----------
    value : float, int, array_like, str, or pint.Quantity
        A number or array (taken as SI already), or a string with a unit, or a pint quantity.
    kind : str
        The quantity kind, a key of :data:`DIMENSIONS` (e.g. ``"temperature"``, ``"mass_flow"``).
    field : str
        The field name used in error messages.

    Returns
    -------
    float or numpy.ndarray
        The value in SI units [K, m, kg/s, Pa, ...].

    Raises
    ------
    InputError
        On an unknown unit, a wrong dimension, a non-number or a non-finite value.
    """
    if kind not in DIMENSIONS:
        raise InputError("kind", kind, f"one of {sorted(DIMENSIONS)}")
    if type(value) is float and math.isfinite(value):  # the common case inside the package: SI already
        return value
    si_unit, words = DIMENSIONS[kind]
    if isinstance(value, bool) or value is None:
        raise InputError(field, value, words)
    if isinstance(value, str):
        try:
            out = _parse_string(value.strip(), kind)
        except ValueError as exc:
            raise InputError(field, value, f"{words}; {exc}") from None
    elif isinstance(value, pint.Quantity):
        try:
            out = value.to(si_unit).magnitude
        except pint.DimensionalityError:
            raise InputError(field, str(value), words) from None
        out = np.asarray(out, dtype=float) if not isinstance(out, numbers.Real) else float(out)
    elif isinstance(value, numbers.Real):
        out = float(value)
    else:
        try:
            arr = np.asarray(value, dtype=float)
        except (TypeError, ValueError):
            raise InputError(field, value, words) from None
        if arr.ndim == 0:
            out = float(arr)
        else:
            out = arr
    if not np.all(np.isfinite(out)):
        raise InputError(field, value, f"{words}, finite (no NaN or infinity)")
    return out


def require(value, field: str, *, gt=None, ge=None, lt=None, le=None, what: str = ""):
    """Check an SI value (scalar or array) against bounds; raise :class:`InputError` naming the field otherwise.

    Returns the value unchanged so that it can be used inline.
    """
    if type(value) is float and all(b is None or type(b) in (int, float) for b in (gt, ge, lt, le)) and (
            (gt is None or value > gt) and (ge is None or value >= ge) and (lt is None or value < lt)
            and (le is None or value <= le)):
        return value  # a float within number bounds (NaN is not: it takes the checks below)
    arr = np.asarray(value)
    conds = []
    ok = np.ones(arr.shape, dtype=bool)
    if gt is not None:
        ok &= arr > gt
        conds.append(f"> {gt:g}")
    if ge is not None:
        ok &= arr >= ge
        conds.append(f">= {ge:g}")
    if lt is not None:
        ok &= arr < lt
        conds.append(f"< {lt:g}")
    if le is not None:
        ok &= arr <= le
        conds.append(f"<= {le:g}")
    if not np.all(ok):
        bad = arr if arr.ndim == 0 else arr[~ok].flat[0]
        text = f"{float(bad):g}" if arr.ndim == 0 else f"{float(bad):g} (first bad element of an array)"
        raise InputError(field, text, f"{what + ' ' if what else ''}{' and '.join(conds)}".strip())
    return value


# ----------------------------------------------------------------------------------------------------------- display
DISPLAY_UNITS = {
    "SI": {
        "temperature": "degC", "temperature_difference": "delta_degC", "length": "mm", "area": "m**2",
        "mass_flow": "kg/s", "pressure": "kPa", "velocity": "m/s", "htc": "W/m**2/K", "fouling": "m**2*K/W",
        "power": "kW", "density": "kg/m**3", "heat_capacity": "kJ/kg/K", "viscosity": "mPa*s",
        "conductivity": "W/m/K", "dimensionless": "dimensionless",
    },
    "US": {
        "temperature": "degF", "temperature_difference": "delta_degF", "length": "inch", "area": "ft**2",
        "mass_flow": "lb/h", "pressure": "psi", "velocity": "ft/s", "htc": "BTU/h/ft**2/delta_degF",
        "fouling": "h*ft**2*delta_degF/BTU", "power": "BTU/h", "density": "lb/ft**3", "heat_capacity": "BTU/lb/delta_degF",
        "viscosity": "cP", "conductivity": "BTU/h/ft/delta_degF", "dimensionless": "dimensionless",
    },
}

_SYMBOLS = {"degC": "°C", "degF": "°F", "delta_degC": "K", "delta_degF": "°F", "m**2": "m²", "W/m**2/K": "W/m²·K",
            "m**2*K/W": "m²·K/W", "ft**2": "ft²", "BTU/h/ft**2/delta_degF": "BTU/h·ft²·°F", "h*ft**2*delta_degF/BTU":
            "h·ft²·°F/BTU", "kg/m**3": "kg/m³", "lb/ft**3": "lb/ft³", "kJ/kg/K": "kJ/kg·K", "BTU/lb/delta_degF":
            "BTU/lb·°F", "mPa*s": "mPa·s", "W/m/K": "W/m·K", "BTU/h/ft/delta_degF": "BTU/h·ft·°F", "inch": "in",
            "dimensionless": ""}


def from_si(value, kind: str, system: str = "SI"):
    """Convert an SI value (scalar or array) to the display unit of ``system`` ("SI" or "US").

    Returns
    -------
    (value, unit_label) : tuple
        The converted magnitude and a printable unit label.

    Examples
    --------
    >>> v, u = from_si(373.15, "temperature", "US"); (round(v, 2), u)
    (212.0, '°F')
    """
    if system not in DISPLAY_UNITS:
        raise InputError("units", system, "'SI' or 'US'")
    if kind not in DISPLAY_UNITS[system]:
        raise InputError("kind", kind, f"one of {sorted(DISPLAY_UNITS[system])}")
    target = DISPLAY_UNITS[system][kind]
    si_unit = DIMENSIONS[kind][0]
    mag = ureg.Quantity(np.asarray(value, dtype=float), si_unit).to(target).magnitude
    if np.ndim(mag) == 0:
        mag = float(mag)
    return mag, _SYMBOLS.get(target, target)


def format_quantity(value, kind: str, system: str = "SI", digits: int = 4) -> str:
    """A printable string of an SI value in the display units of ``system``.

    >>> format_quantity(0.0254, "length", "US")
    '1 in'
    """
    mag, label = from_si(value, kind, system)
    return f"{mag:.{digits}g} {label}".strip()
