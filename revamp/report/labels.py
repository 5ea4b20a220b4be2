"""What a reader sees: display names, one spelling per unit, the display unit of each quantity, engineering
precision, and one colour per resistance.

No physics here. Tables reach this module with columns (or rows) named ``"identifier [unit]"`` in the units the
package converted them to (:func:`revamp.units.from_si`); :func:`display_frame` renames them in the words an
engineer writes and moves each to the unit chosen for its quantity (MW rather than 9,164 kW, GJ rather than
1.234e+13 J, days rather than seconds); :func:`format_value` writes a number with three significant figures,
thousands separators and never an exponent in the usual range. Cells that are not numbers (``True``, ``<NA>``,
``inf``) are written in words.

>>> format_value(5728.8), format_value(74.132), format_value(0.000352), format_value(float("inf"))
('5,730', '74.1', '0.000352', '—')
>>> display_name("t_out_shell [°C]")
'shell outlet temperature [°C]'
"""
from __future__ import annotations

import math
import numbers
import re

from ..resistance import TUBE_LAYERS

__all__ = ["to_system", "NAMES", "RESISTANCES", "RESISTANCE_COLOURS", "SPELLING", "resistance_names",
           "resistance_colour", "display_frame", "display_name",
           "format_frame", "format_value", "rescale", "resistance_axis", "split_label", "unit_of"]

#: the five series resistances of a shell-and-tube exchanger, in the order heat crosses them from the shell side
#: (another kind names its own: a result's are :func:`resistance_names`)
RESISTANCES = TUBE_LAYERS

#: one colour per resistance, in every chart (films blue, fouling brown/orange, wall grey; the air cooler's outer
#: film and fouling take the shell side's colours, the fin bond a lighter grey)
RESISTANCE_COLOURS = {"shell film": "#1b4f72", "shell fouling": "#a04000", "wall": "#7f8c8d",
                      "tube fouling": "#e67e22", "tube film": "#5dade2",
                      "air film": "#1b4f72", "air fouling": "#a04000", "fin bond": "#bdc3c7"}


def resistance_names(result) -> tuple:
    """The names of a rating result's resistances in series, outer film first: the exchanger kind's ``layers``
    (the names of its ``resistances`` when it states none).

    >>> class _R: layers = ("air film", "air fouling", "fin bond", "wall", "tube fouling", "tube film")
    >>> resistance_names(_R())[:2]
    ('air film', 'air fouling')
    """
    names = getattr(result, "layers", None)
    if names is None:
        r = result.resistances
        names = r.index if getattr(r, "ndim", 1) == 1 else r.columns
    return tuple(names)


def resistance_colour(name: str) -> str:
    """The chart colour of a resistance (a neutral grey for a name without its own)."""
    return RESISTANCE_COLOURS.get(name, "#888888")

#: identifier -> the words an engineer writes
NAMES = {
    "duty": "duty", "duty_gain": "duty gain over base", "duty_cycle_avg": "duty averaged over the run",
    "duty_today": "duty today", "duty_revamp": "duty at revamp",
    "t_out_shell": "shell outlet temperature", "t_out_tube": "tube outlet temperature",
    "U_clean": "U clean", "U_service": "U in service", "U_service_inside": "U in service (inside area)",
    "h_shell": "shell film coefficient", "h_tube": "tube film coefficient",
    "dp_shell": "shell pressure drop", "dp_tube": "tube pressure drop",
    "velocity_tube": "tube velocity", "velocity_shell": "shell crossflow velocity",
    "Re_tube": "tube Reynolds number", "Re_shell": "shell Reynolds number", "lmtd": "LMTD", "F": "F factor",
    "effectiveness": "effectiveness", "NTU": "NTU", "area": "area (outside)", "controlling": "controlling resistance",
    "dp_shell_status": "shell pressure drop", "dp_tube_status": "tube pressure drop",
    "velocity_status": "tube velocity", "vibration_status": "vibration", "nozzle_status": "nozzle",
    "screening": "limits", "meets_target": "meets target", "capex": "capex", "annual_value": "value per year",
    "payback": "payback", "npv": "NPV", "rank": "rank", "reason": "why",
    # plant-data findings
    "Rf now": "fouling resistance now (outside area)", "Rf now low": "fouling resistance now, low end of band",
    "Rf now high": "fouling resistance now, high end of band", "U_actual now": "U measured now",
    "U_clean now": "U clean now", "heat balance error median": "heat-balance error, median",
    "fouling rate now": "fouling rate now", "projection run time": "run length projected",
    "Rf at end of run": "fouling resistance at end of run", "duty at end of run": "duty at end of run",
    "energy lost to fouling to date": "energy lost to fouling to date", "model (lowest AIC)": "fouling model (lowest AIC)",
    "dp shell": "shell pressure drop", "dp tube": "tube pressure drop",
    "dp shell / allowed": "shell pressure drop / allowed", "dp tube / allowed": "tube pressure drop / allowed",
}

#: one spelling per unit (left: spellings met in tables and inputs; right: the one shown)
SPELLING = {"m2K/W": "m²·K/W", "m²K/W": "m²·K/W", "m2.K/W": "m²·K/W", "W/m²K": "W/m²·K", "W/m2K": "W/m²·K",
            "W/m2/K": "W/m²·K", "BTU/h": "Btu/h", "BTU/h·ft²·°F": "Btu/h·ft²·°F", "h·ft²·°F/BTU": "h·ft²·°F/Btu",
            "BTU/lb·°F": "Btu/lb·°F", "BTU/h·ft·°F": "Btu/h·ft·°F", "BTU": "Btu", "MMBTU": "MMBtu", "yr": "years",
            "y": "years", "year": "years", "day": "days", "d": "days", "s": "s", "J": "J", "W": "W"}

#: the unit shown for a quantity, from the unit it arrives in: (factor, unit) applied to the magnitude
_RESCALE = {"kW": (1e-3, "MW"), "W": (1e-6, "MW"), "Btu/h": (1e-6, "MMBtu/h"), "J": (1e-9, "GJ"),
            "kJ": (1e-6, "GJ"), "MJ": (1e-3, "GJ"), "Btu": (1e-6, "MMBtu"), "Pa": (1e-3, "kPa")}

_LABEL = re.compile(r"^(?P<name>.*?)\s*\[(?P<unit>[^\[\]]*)\]\s*$")


def split_label(text) -> tuple:
    """``"duty [kW]"`` -> ``("duty", "kW")``; a label without brackets has unit ``""``."""
    m = _LABEL.match(str(text))
    return (m["name"], m["unit"]) if m else (str(text), "")


_PARTS = (("m2K/W", "m²·K/W"), ("m²K/W", "m²·K/W"), ("W/m2K", "W/m²·K"), ("W/m²K", "W/m²·K"), ("BTU", "Btu"))


def unit_of(unit: str) -> str:
    """The one spelling of a unit (``m2K/W``, ``m²K/W`` -> ``m²·K/W``; ``[-]`` -> no unit; ``BTU`` -> ``Btu``)."""
    unit = unit.strip()
    if unit in ("-", "—"):
        return ""
    if unit in SPELLING:
        return SPELLING[unit]
    for old, new in _PARTS:
        unit = unit.replace(old, new)
    return unit


def rescale(unit: str) -> tuple:
    """(factor, display unit) for a unit a table arrives in: kW -> MW, J -> GJ, Btu/h -> MMBtu/h, Pa -> kPa."""
    unit = unit_of(unit)
    return _RESCALE.get(unit, (1.0, unit))


#: SI display units that a US report shows in US units: unit -> (quantity kind, factor to SI, offset to SI)
_SI_UNITS = {"m²·K/W": ("fouling", 1.0, 0.0), "W/m²·K": ("htc", 1.0, 0.0), "MW": ("power", 1e6, 0.0),
             "kW": ("power", 1e3, 0.0), "W": ("power", 1.0, 0.0), "kPa": ("pressure", 1e3, 0.0),
             "°C": ("temperature", 1.0, 273.15), "m/s": ("velocity", 1.0, 0.0), "m²": ("area", 1.0, 0.0),
             "kg/s": ("mass_flow", 1.0, 0.0), "mm": ("length", 1e-3, 0.0)}
_MMBTU_IN_GJ = 1.05505585262  # 1 MMBtu (International Table Btu) = 1.05505585262 GJ (NIST SP 811)


def to_system(unit: str, system: str = "SI") -> tuple:
    """(convert(value) -> value, unit shown) that takes a number in the SI display ``unit`` to ``system``; convert is
    None when the number stays as it is.

    >>> f, u = to_system("°C", "US"); round(f(100.0), 6), u
    (212.0, '°F')
    """
    unit = unit_of(unit)
    if system != "US":
        return None, unit
    if unit == "GJ":
        return (lambda v: v / _MMBTU_IN_GJ), "MMBtu"
    base, _, per = unit.partition(" per ")
    if base not in _SI_UNITS:
        return None, unit
    from ..units import from_si

    kind, factor, offset = _SI_UNITS[base]
    shown = unit_of(from_si(1.0, kind, "US")[1])
    f2, shown = rescale(shown)

    def convert(v):
        return float(from_si(float(v) * factor + offset, kind, "US")[0]) * f2

    return convert, shown + (f" per {per}" if per else "")


def display_name(label, rescale_units: bool = True) -> str:
    """The display form of a column or row label ``"identifier [unit]"``: words for the identifier, one spelling and
    the chosen display unit for the unit (no unit, no brackets)."""
    name, unit = split_label(label)
    words = NAMES.get(name.strip(), name.strip().replace("_", " ") if re.fullmatch(r"[a-z_]+", name.strip())
                      else name.strip())
    if not unit:
        return words
    unit = rescale(unit)[1] if rescale_units else unit_of(unit)
    return f"{words} [{unit}]" if unit else words


def _is_missing(value) -> bool:
    if value is None:
        return True
    try:
        import pandas as pd

        return bool(pd.isna(value)) if not isinstance(value, (list, tuple, dict)) else False
    except (TypeError, ValueError):
        return False


def format_value(value, digits: int = 3) -> str:
    """A cell as a reader sees it: numbers with ``digits`` significant figures (integers in the thousands keep all
    their digits, with separators), never an exponent between 1e-4 and 1e9; booleans yes/no; missing, NaN and
    infinite values as a dash."""
    if isinstance(value, bool) or type(value).__name__ == "bool_":
        return "yes" if value else "no"
    if _is_missing(value):
        return "—"
    if isinstance(value, numbers.Integral):
        return f"{int(value):,}"
    if isinstance(value, numbers.Real):
        v = float(value)
        if not math.isfinite(v):
            return "—"
        if v == 0:
            return "0"
        mag = math.floor(math.log10(abs(v)))
        if mag >= 9 or mag < -4:
            return f"{v:.{digits - 1}e}"
        if mag >= digits - 1:
            return f"{round(v, -(mag - digits + 1)):,.0f}"
        return f"{v:.{digits - 1 - mag}f}"
    return str(value)


def display_frame(df, rows_are_quantities: bool | None = None, system: str = "SI"):
    """A copy of a table with display labels and values in the display unit of each quantity (numbers stay numbers).

    Labels ``"identifier [unit]"`` are looked up on the columns and on the index; a column (or row) whose unit is
    rescaled (kW -> MW) has its numbers multiplied by the factor. ``rows_are_quantities`` forces the orientation;
    by default rows are quantities when the index carries units and the columns do not. Numbers written as text
    become numbers. ``system="US"`` moves what is still in SI units (the plant-data findings) to US units.
    """
    import pandas as pd

    out = df.copy()
    has_units = lambda labels: any(split_label(x)[1] for x in labels)
    if rows_are_quantities is None:
        rows_are_quantities = has_units(out.index) and not has_units(out.columns)
    if rows_are_quantities:
        return display_frame(out.T, False, system).T
    new_cols = []
    for j, col in enumerate(list(out.columns)):
        name, unit = split_label(col)
        if name.strip() == "rank":  # a rank is a whole number (pandas may hand it over as float beside <NA>)
            out[out.columns[j]] = out.iloc[:, j].map(
                lambda v: int(v) if isinstance(v, numbers.Real) and not isinstance(v, bool) and math.isfinite(v)
                else v).astype(object)
        factor, shown = rescale(unit) if unit else (1.0, "")
        convert, shown = to_system(shown, system) if unit else (None, "")
        out[out.columns[j]] = out.iloc[:, j].map(lambda v: _scaled(v, factor, convert)).astype(object)
        words = display_name(name)
        new_cols.append(f"{words} [{shown}]" if shown else words)
    out.columns = new_cols
    out.index = [display_name(i, rescale_units=False) if isinstance(i, str) and "[" in i else i for i in out.index]
    out.index.name = display_name(df.index.name) if df.index.name else None
    return out


def _scaled(value, factor, convert=None):
    """A cell times ``factor`` (then ``convert``) when it is a number or a string of one; anything else unchanged."""
    if isinstance(value, bool) or type(value).__name__ == "bool_":
        return value
    if isinstance(value, str):
        try:
            value = float(value.replace(",", ""))
        except ValueError:
            return value
    if isinstance(value, numbers.Integral) and factor == 1.0 and convert is None:
        return value
    if isinstance(value, numbers.Real):
        v = float(value) * factor
        return convert(v) if convert is not None and math.isfinite(v) else v
    return value


def format_frame(df, digits: int = 3):
    """Every cell of a (display) table as text (:func:`format_value`)."""
    return df.map(lambda v: format_value(v, digits)) if hasattr(df, "map") else df.applymap(format_value)


def resistance_axis(system: str = "SI") -> tuple:
    """(factor from m²·K/W, axis unit) used by every resistance chart, so both breakdowns read the same."""
    from ..units import from_si

    if system == "US":
        return from_si(1.0, "fouling", "US")[0] * 1e3, "10⁻³ " + unit_of(from_si(1.0, "fouling", "US")[1])
    return 1e4, "10⁻⁴ m²·K/W"
