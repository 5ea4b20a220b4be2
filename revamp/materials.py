"""Tube materials: thermal conductivity k(T), density, elastic modulus and a tube-side erosion velocity limit.

Conductivities are piecewise linear in temperature between tabulated points (held constant beyond the ends).
Values and their provenance are in each entry's ``source``. Points recalled rather than read are marked
"from memory": check them against ASME BPVC Section II-D, Table TCD, before relying on them in a design.

References
----------
Incropera, F.P., DeWitt, D.P., Bergman, T.L. and Lavine, A.S. (2007), Fundamentals of Heat and Mass Transfer, 6th ed.,
Wiley, Table A.1 (plain carbon steel, AISI 304, AISI 316, titanium).
ASME Boiler and Pressure Vessel Code, Section II, Part D, Tables TCD (conductivity) and TM (modulus).
Copper Development Association, alloy data for C44300, C70600, C71500.
Special Metals Corporation, INCONEL alloy 625 data sheet.
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np

from .errors import InputError
from .units import to_si

__all__ = ["ALIASES", "MATERIALS", "Material", "material"]


@dataclass(frozen=True)
class Material:
    """A tube material.

    Attributes
    ----------
    name : str
    temperatures : tuple of float
        Table temperatures [K], increasing.
    conductivities : tuple of float
        Thermal conductivity at those temperatures [W/m/K].
    density : float
        Density [kg/m³].
    elastic_modulus : float
        Young's modulus near room temperature [Pa].
    erosion_velocity_max : float
        Maximum tube-side liquid velocity against erosion [m/s] (common practice values, no single source).
    source : str
        Where the numbers come from.
    """

    name: str
    temperatures: tuple
    conductivities: tuple
    density: float
    elastic_modulus: float
    erosion_velocity_max: float
    source: str
    _t: np.ndarray = field(init=False, repr=False, compare=False)
    _k: np.ndarray = field(init=False, repr=False, compare=False)

    def __post_init__(self):
        t = np.asarray(self.temperatures, dtype=float)
        k = np.asarray(self.conductivities, dtype=float)
        if t.ndim != 1 or t.size < 1 or t.size != k.size or not (np.diff(t) > 0).all() or not (k > 0).all():
            raise InputError(f"material[{self.name}].conductivities", self.conductivities,
                             "positive values, one per increasing temperature")
        t.setflags(write=False)
        k.setflags(write=False)
        object.__setattr__(self, "_t", t)
        object.__setattr__(self, "_k", k)

    def conductivity(self, T):
        """Thermal conductivity [W/m/K] at wall temperature ``T`` [K] (scalar or array; held constant outside
        the tabulated range)."""
        out = np.interp(T, self._t, self._k)
        return float(out) if np.ndim(out) == 0 else out


def _c(t_c):
    return tuple(float(v) + 273.15 for v in t_c)


_INC = "Incropera et al. (2007) Table A.1 at 300-1000 K (from memory)"
_CP = "common practice, no source"
MATERIALS: dict[str, Material] = {
    m.name: m
    for m in [
        Material("carbon steel", (300.0, 400.0, 600.0, 800.0, 1000.0), (60.5, 56.7, 48.0, 39.2, 30.0), 7854.0,
                 200e9, 3.0, f"k, density: plain carbon steel, {_INC}; modulus about 200 GPa (ASME II-D Table TM, "
                 f"from memory); erosion velocity {_CP}"),
        Material("304 stainless steel", (300.0, 400.0, 600.0, 800.0, 1000.0), (14.9, 16.6, 19.8, 22.6, 25.4),
                 7900.0, 193e9, 4.6, f"k, density: AISI 304, {_INC}; modulus 193 GPa (from memory); erosion "
                 f"velocity {_CP}"),
        Material("316 stainless steel", (300.0, 400.0, 600.0, 800.0, 1000.0), (13.4, 15.2, 18.3, 21.3, 24.2),
                 8238.0, 193e9, 4.6, f"k, density: AISI 316, {_INC}; modulus 193 GPa (from memory); erosion "
                 f"velocity {_CP}"),
        Material("duplex 2205", _c((20.0, 100.0, 200.0, 300.0)), (15.0, 16.0, 17.0, 18.0), 7800.0, 200e9, 4.6,
                 f"manufacturer data sheets for UNS S32205 (from memory, check against ASME II-D TCD); "
                 f"erosion velocity {_CP}"),
        Material("titanium grade 2", (300.0, 400.0, 600.0, 800.0), (21.9, 20.4, 19.4, 19.7), 4500.0, 105e9, 6.0,
                 f"k, density: commercially pure titanium, {_INC}; modulus 105 GPa (from memory); erosion "
                 f"velocity {_CP}"),
        Material("admiralty brass", _c((20.0, 100.0)), (111.0, 115.0), 8530.0, 110e9, 1.8,
                 f"UNS C44300: k 111 W/m·K at 20 °C, modulus 16,000 ksi (Copper Development Association, from "
                 f"memory); 115 W/m·K near 100 °C (from memory, check against ASME II-D TCD); erosion velocity {_CP}"),
        Material("90/10 copper-nickel", _c((20.0, 100.0)), (45.0, 48.0), 8940.0, 124e9, 3.0,
                 f"UNS C70600: k 26 BTU/h·ft·°F = 45 W/m·K at 20 °C, modulus 18,000 ksi (Copper Development "
                 f"Association, from memory); 48 W/m·K near 100 °C (from memory, check against ASME II-D TCD); "
                 f"erosion velocity {_CP}"),
        Material("70/30 copper-nickel", _c((20.0, 100.0)), (29.4, 31.0), 8940.0, 152e9, 3.7,
                 f"UNS C71500: k 17 BTU/h·ft·°F = 29.4 W/m·K at 20 °C, modulus 22,000 ksi (Copper Development "
                 f"Association, from memory); 31 W/m·K near 100 °C (from memory, check against ASME II-D TCD); "
                 f"erosion velocity {_CP}"),
        Material("alloy 625", _c((21.0, 93.0, 204.0, 316.0, 427.0, 538.0)), (9.8, 10.8, 12.5, 14.1, 15.7, 17.5),
                 8440.0, 207.5e9, 4.6, f"UNS N06625: Special Metals INCONEL 625 data sheet (from memory); erosion "
                 f"velocity {_CP}"),
    ]
}

ALIASES: dict[str, str] = {
    "cs": "carbon steel", "carbon steel": "carbon steel", "carbon": "carbon steel", "steel": "carbon steel",
    "ss304": "304 stainless steel", "304": "304 stainless steel", "304 ss": "304 stainless steel",
    "304l": "304 stainless steel", "ss 304": "304 stainless steel", "stainless 304": "304 stainless steel",
    "ss316": "316 stainless steel", "316": "316 stainless steel", "316 ss": "316 stainless steel",
    "316l": "316 stainless steel", "ss 316": "316 stainless steel", "stainless 316": "316 stainless steel",
    "stainless steel": "316 stainless steel", "ss": "316 stainless steel",
    "duplex": "duplex 2205", "2205": "duplex 2205", "s32205": "duplex 2205", "s31803": "duplex 2205",
    "titanium": "titanium grade 2", "ti": "titanium grade 2", "ti gr 2": "titanium grade 2",
    "ti grade 2": "titanium grade 2", "titanium gr 2": "titanium grade 2", "titanium gr. 2": "titanium grade 2",
    "admiralty": "admiralty brass", "c44300": "admiralty brass", "admiralty brass": "admiralty brass",
    "cuni 90/10": "90/10 copper-nickel", "90/10 cuni": "90/10 copper-nickel", "90-10 cuni": "90/10 copper-nickel",
    "cuni 90-10": "90/10 copper-nickel", "c70600": "90/10 copper-nickel", "90/10": "90/10 copper-nickel",
    "cuni 70/30": "70/30 copper-nickel", "70/30 cuni": "70/30 copper-nickel", "70-30 cuni": "70/30 copper-nickel",
    "cuni 70-30": "70/30 copper-nickel", "c71500": "70/30 copper-nickel", "70/30": "70/30 copper-nickel",
    "625": "alloy 625", "inconel 625": "alloy 625", "n06625": "alloy 625", "alloy 625": "alloy 625",
}


def _key(text: str) -> str:
    return re.sub(r"\s+", " ", text.strip().lower().replace("_", " "))


def material(name_or_k) -> Material:
    """A tube material by name (case-insensitive, with aliases) or by a thermal conductivity.

    Parameters
    ----------
    name_or_k : str, float or Material
        A name or alias (``"cs"``, ``"ss316"``, ``"titanium"``, ``"cuni 90/10"``...), or a conductivity
        [W/m/K] as a number or a string with a unit (``"26 BTU/h/ft/degF"``). A conductivity gives a
        constant-k material with carbon-steel density, modulus and erosion limit, and a note saying so.

    Returns
    -------
    Material

    Examples
    --------
    >>> material("SS316").name
    '316 stainless steel'
    >>> round(material("cs").conductivity(400.0), 1)
    56.7
    >>> material(45).name
    'k=45 W/m·K'
    """
    if isinstance(name_or_k, Material):
        return name_or_k
    if isinstance(name_or_k, str):
        key = _key(name_or_k)
        if key in MATERIALS:
            return MATERIALS[key]
        if key in ALIASES:
            return MATERIALS[ALIASES[key]]
        if not re.match(r"^[\d.+-]", key):
            raise InputError("tube_material", name_or_k, f"one of {sorted(MATERIALS)} (aliases: "
                             f"{', '.join(sorted(ALIASES))}), or a conductivity such as '45 W/m/K'")
    k = to_si(name_or_k, "conductivity", "tube_material")
    if np.ndim(k) != 0 or not k > 0:
        raise InputError("tube_material", name_or_k, "a conductivity > 0 (W/m·K), or a material name")
    cs = MATERIALS["carbon steel"]
    return Material(f"k={float(k):g} W/m·K", (300.0,), (float(k),), cs.density, cs.elastic_modulus,
                    cs.erosion_velocity_max, "conductivity given by the user; density, modulus and erosion velocity "
                    "are carbon-steel values (a note: not known for this material)")
