"""Geometry of an air-cooled exchanger: bays of finned-tube bundles with fans (layer 2, inputs).

:class:`Fin` is the fin on the tubes (annular, constant thickness); :class:`AirCooler` the bundles, their tube
layout (staggered, triangular pitch), the fans and the derived areas every later layer uses: the bare outside-tube
area (the basis of ``U``), the fin and exposed-root areas, the minimum free-flow area and the face area.

Lengths may be given with a unit (``"25.4 mm"``); everything is stored in SI.

Examples
--------
>>> ac = AirCooler(bays=1, bundles_per_bay=1, tube_rows=4, tubes_per_row=20, tube_passes=4, tube_length="3 m",
...                tube_od="25.4 mm", tube_wall="3.4 mm", transverse_pitch="60.33 mm", row_pitch="52.07 mm",
...                fin=Fin(height="15.9 mm", thickness="0.406 mm", per_length="433 /m"))
>>> ac.tubes, round(ac.area, 2)
(80, 19.15)

References
----------
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell, ch. 5 (finned-tube
geometry, minimum free-flow area of a staggered bank).
API Standard 661 (2013). Petroleum, petrochemical and natural gas industries: air-cooled heat exchangers for general
refinery service (fin types and their bonds).
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import ClassVar

from .errors import InputError
from .materials import Material, material
from .units import require, to_si

__all__ = ["AirCooler", "Fin", "FIN_BONDS", "FIN_MATERIALS"]

#: Fin metals by name: (conductivity [W/m/K], source).
FIN_MATERIALS = {
    "aluminium": (222.0, "aluminium alloy 1100-O at 20 °C, ASM Handbook Vol. 2 (from memory)"),
    "copper": (388.0, "copper C11000 at 20 °C, Copper Development Association (from memory)"),
    "carbon steel": (55.0, "plain carbon steel near 100 °C, Incropera et al. (2007) Table A.1 (from memory)"),
}
_FIN_ALIASES = {"aluminum": "aluminium", "al": "aluminium", "cu": "copper", "steel": "carbon steel",
                "cs": "carbon steel"}

#: Fin bonds: (contact resistance on the bare-tube basis when not given [m²K/W], highest tube-side inlet
#: temperature usually allowed [K], note). Values: common practice, no source; limits as usually quoted for API 661
#: fin types (from memory).
FIN_BONDS = {
    "extruded": (0.0, 300.0 + 273.15, "metallurgical contact"),
    "embedded": (0.0, 400.0 + 273.15, "fin set in a groove, peened in"),
    "welded": (0.0, 400.0 + 273.15, "welded"),
    "l-footed": (None, 130.0 + 273.15, "tension-wound L-foot: contact resistance rises with temperature"),
    "overlapped": (None, 150.0 + 273.15, "tension-wound overlapped L-foot"),
}


def _length(value, name, positive=True):
    v = to_si(value, "length", name)
    if not isinstance(v, float):
        raise InputError(name, value, "one length (not an array)")
    require(v, name, gt=0, what="a length")
    return v


def _count(value, name, low=1):
    if isinstance(value, bool) or not isinstance(value, int) or value < low:
        raise InputError(name, value, f"a whole number >= {low}")
    return value


def _per_length(value, name):
    if isinstance(value, str):
        from .units import ureg

        try:
            v = float(ureg.Quantity(value.strip()).to("1/meter").magnitude)
        except Exception:
            raise InputError(name, value, "a count per length (1/m, or e.g. '394 /m', '10 /inch')") from None
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        v = float(value)
    else:
        raise InputError(name, value, "a count per length (1/m, or e.g. '394 /m', '10 /inch')")
    if not (math.isfinite(v) and v > 0):
        raise InputError(name, value, "a count per length > 0 (1/m)")
    return v


@dataclass(frozen=True)
class Fin:
    """An annular fin of constant thickness on every tube.

    Parameters
    ----------
    height : float or str
        Fin height above the tube outside surface [m].
    thickness : float or str
        Fin thickness [m] (mean thickness for a tapered fin).
    per_length : float or str
        Fins per metre of tube [1/m] (``"394 /m"``, ``"10 /inch"``).
    material : str or float
        ``"aluminium"``, ``"copper"``, ``"carbon steel"`` or a conductivity (``"205 W/m/K"``).
    bond : str
        A key of :data:`FIN_BONDS`: ``"extruded"``, ``"embedded"``, ``"welded"``, ``"l-footed"``, ``"overlapped"``.
    bond_resistance : float or str, optional
        Contact resistance between fin and tube on the bare outside-tube area [m²K/W]; default from
        :data:`FIN_BONDS` (zero for metallurgical or embedded bonds; for tension-wound fins the rating warns that it
        is not known and takes zero).
    """

    height: object
    thickness: object
    per_length: object
    material: object = "aluminium"
    bond: str = "embedded"
    bond_resistance: object = None

    def __post_init__(self):
        h = _length(self.height, "fin.height")
        t = _length(self.thickness, "fin.thickness")
        n = _per_length(self.per_length, "fin.per_length")
        if t * n >= 1.0:
            raise InputError("fin.per_length", self.per_length, f"fewer than 1/thickness = {1 / t:.0f} fins per "
                             "metre (the fins would touch)")
        if self.bond not in FIN_BONDS:
            raise InputError("fin.bond", self.bond, f"one of {sorted(FIN_BONDS)}")
        if self.bond_resistance is not None:
            r = to_si(self.bond_resistance, "fouling", "fin.bond_resistance")
            if not isinstance(r, float):
                raise InputError("fin.bond_resistance", self.bond_resistance, "one resistance (not an array)")
            object.__setattr__(self, "bond_resistance", float(require(r, "fin.bond_resistance", ge=0)))
        object.__setattr__(self, "height", h)
        object.__setattr__(self, "thickness", t)
        object.__setattr__(self, "per_length", n)
        object.__setattr__(self, "material", self._material(self.material))

    @staticmethod
    def _material(value):
        if isinstance(value, Material):
            return value
        if isinstance(value, str) and value.strip().lower() in set(FIN_MATERIALS) | set(_FIN_ALIASES):
            key = value.strip().lower()
            key = _FIN_ALIASES.get(key, key)
            k, src = FIN_MATERIALS[key]
            cs = material("carbon steel")
            return Material(key, (300.0,), (k,), cs.density, cs.elastic_modulus, cs.erosion_velocity_max, src)
        try:
            return material(value)
        except InputError as exc:
            raise InputError("fin.material", value, f"one of {sorted(FIN_MATERIALS)}, or a conductivity such as "
                             "'205 W/m/K'") from exc

    @property
    def conductivity(self) -> float:
        """Fin conductivity [W/m/K] (at 300 K for the tabulated tube metals)."""
        return float(self.material.conductivity(300.0))

    @property
    def pitch(self) -> float:
        """Distance between fins, centre to centre [m]."""
        return 1.0 / self.per_length

    @property
    def gap(self) -> float:
        """Clear gap between fins [m]."""
        return self.pitch - self.thickness

    @property
    def contact_resistance(self):
        """Bond resistance on the bare outside-tube area [m²K/W]; None when neither given nor known for the bond."""
        return self.bond_resistance if self.bond_resistance is not None else FIN_BONDS[self.bond][0]

    def replace(self, **changes) -> "Fin":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)


@dataclass(frozen=True)
class AirCooler:
    """An air-cooled exchanger: ``bays`` x ``bundles_per_bay`` identical bundles in parallel, fans below (forced
    draft) or above (induced draft) each bay, the process fluid in the tubes.

    Tubes are staggered on a triangular layout: ``transverse_pitch`` across the air flow within a row,
    ``row_pitch`` between rows along the air flow. The tube passes divide the rows evenly (``tube_rows`` a multiple
    of ``tube_passes``) and run in overall counterflow to the air: the tube fluid enters in the rows the air leaves
    (the usual layout, inlet header at the top of a forced-draft bay).

    Parameters
    ----------
    bays, bundles_per_bay, tube_rows, tubes_per_row, tube_passes : int
    tube_length, tube_od, tube_wall, transverse_pitch, row_pitch : float or str
        [m]; the tube length is the finned length of one pass.
    fin : Fin
    tube_material : str or float
        A tube material of :mod:`revamp.materials` or a conductivity.
    fans_per_bay : int
    fan_diameter : float or str
        [m].
    fan_efficiency : float
        Fan total efficiency [-], (0, 1].
    draft : {"forced", "induced"}
    insert : insert model, optional
        A tube insert of :mod:`revamp.correlations.inserts` (set by the insert options).
    tube_roughness : float or str
        Tube inside roughness [m].
    name : str
    """

    kind: ClassVar[str] = "air cooler"

    bays: int
    bundles_per_bay: int
    tube_rows: int
    tubes_per_row: int
    tube_passes: int
    tube_length: object
    tube_od: object
    tube_wall: object
    transverse_pitch: object
    row_pitch: object
    fin: Fin
    tube_material: object = "carbon steel"
    fans_per_bay: int = 2
    fan_diameter: object = "3.0 m"
    fan_efficiency: float = 0.65
    draft: str = "forced"
    insert: object = None
    tube_roughness: object = 0.0
    name: str = ""

    def __post_init__(self):
        for name in ("bays", "bundles_per_bay", "tube_rows", "tubes_per_row", "tube_passes", "fans_per_bay"):
            _count(getattr(self, name), name)
        if self.tube_rows % self.tube_passes:
            raise InputError("tube_passes", self.tube_passes, f"a divisor of tube_rows = {self.tube_rows} (each "
                             "pass takes whole rows; uneven splits are not modelled)")
        values = {n: _length(getattr(self, n), n) for n in ("tube_length", "tube_od", "tube_wall",
                                                              "transverse_pitch", "row_pitch", "fan_diameter")}
        if 2.0 * values["tube_wall"] >= values["tube_od"]:
            raise InputError("tube_wall", self.tube_wall, f"less than half the tube OD ({values['tube_od']:.4g} m)")
        if not isinstance(self.fin, Fin):
            raise InputError("fin", self.fin, "a revamp.Fin(height=, thickness=, per_length=, ...)")
        d_fin = values["tube_od"] + 2.0 * self.fin.height
        st, sl = values["transverse_pitch"], values["row_pitch"]
        if st < d_fin:
            raise InputError("transverse_pitch", self.transverse_pitch, f">= the fin diameter {d_fin * 1e3:.1f} mm "
                             "(fins of neighbouring tubes would overlap)")
        if math.hypot(sl, st / 2.0) < d_fin:
            raise InputError("row_pitch", self.row_pitch, f"long enough that the diagonal pitch reaches the fin "
                             f"diameter {d_fin * 1e3:.1f} mm")
        eff = self.fan_efficiency
        if isinstance(eff, bool) or not isinstance(eff, (int, float)) or not (0.0 < eff <= 1.0):
            raise InputError("fan_efficiency", eff, "a number in (0, 1]")
        if self.draft not in ("forced", "induced"):
            raise InputError("draft", self.draft, "'forced' or 'induced'")
        if self.insert is not None and not (hasattr(self.insert, "nu") and hasattr(self.insert, "friction")):
            raise InputError("insert", self.insert, "an insert model of revamp.correlations.inserts, or None")
        rough = to_si(self.tube_roughness, "length", "tube_roughness")
        require(rough, "tube_roughness", ge=0)
        for n, v in values.items():
            object.__setattr__(self, n, v)
        object.__setattr__(self, "fan_efficiency", float(eff))
        object.__setattr__(self, "tube_roughness", float(rough))
        object.__setattr__(self, "tube_material", material(self.tube_material))

    def replace(self, **changes) -> "AirCooler":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)

    # ---- counts
    @property
    def bundles(self) -> int:
        """Bundles in parallel, all bays [-]."""
        return self.bays * self.bundles_per_bay

    @property
    def tubes_per_bundle(self) -> int:
        return self.tube_rows * self.tubes_per_row

    @property
    def tubes(self) -> int:
        """Tubes, all bundles [-]."""
        return self.tubes_per_bundle * self.bundles

    @property
    def tubes_per_pass(self) -> int:
        """Tubes in one pass of one bundle [-]."""
        return self.tubes_per_bundle // self.tube_passes

    @property
    def rows_per_pass(self) -> int:
        return self.tube_rows // self.tube_passes

    # ---- diameters and pitches
    @property
    def tube_id(self) -> float:
        """Tube inside diameter [m]."""
        return self.tube_od - 2.0 * self.tube_wall

    @property
    def fin_diameter(self) -> float:
        """Fin tip diameter [m]."""
        return self.tube_od + 2.0 * self.fin.height

    @property
    def diagonal_pitch(self) -> float:
        """Centre distance between tubes of neighbouring rows [m]."""
        return math.hypot(self.row_pitch, self.transverse_pitch / 2.0)

    # ---- areas per tube (one pass length)
    @property
    def area_bare_per_tube(self) -> float:
        """pi d_o L [m²]."""
        return math.pi * self.tube_od * self.tube_length

    @property
    def area_root_per_tube(self) -> float:
        """Tube surface between the fins, exposed to the air [m²]."""
        return self.area_bare_per_tube * (1.0 - self.fin.thickness * self.fin.per_length)

    @property
    def area_fin_per_tube(self) -> float:
        """Both faces and the tip of every fin on one tube [m²]."""
        df, do, t = self.fin_diameter, self.tube_od, self.fin.thickness
        one = 2.0 * math.pi / 4.0 * (df * df - do * do) + math.pi * df * t
        return one * self.fin.per_length * self.tube_length

    @property
    def area_ratio(self) -> float:
        """Air-side surface over bare outside-tube surface [-]."""
        return (self.area_root_per_tube + self.area_fin_per_tube) / self.area_bare_per_tube

    @property
    def area(self) -> float:
        """Bare outside-tube area, all bundles [m²]: the basis of ``U``."""
        return self.area_bare_per_tube * self.tubes

    @property
    def area_inside(self) -> float:
        """Tube inside area, all bundles [m²]."""
        return math.pi * self.tube_id * self.tube_length * self.tubes

    @property
    def area_air(self) -> float:
        """Air-side surface (fins and exposed roots), all bundles [m²]."""
        return self.area * self.area_ratio

    @property
    def flow_area_min(self) -> float:
        """Minimum free-flow area for the air through one bundle [m²]: per tube the smaller of the transverse gap
        and twice the diagonal gap, each less the fins' projection 2 h t n (Kröger 2004, ch. 5)."""
        block = self.tube_od + 2.0 * self.fin.height * self.fin.thickness * self.fin.per_length
        gap = min(self.transverse_pitch - block, 2.0 * (self.diagonal_pitch - block))
        return self.tubes_per_row * self.tube_length * gap

    @property
    def face_area(self) -> float:
        """Face area of one bundle [m²]: width (tubes_per_row + 1) transverse pitches (the rows are offset by half a
        pitch, plus half a pitch of side clearance; no side corbels) times the tube length."""
        return (self.tubes_per_row + 1) * self.transverse_pitch * self.tube_length

    @property
    def fan_area(self) -> float:
        """Swept area of all fans [m²]."""
        return self.bays * self.fans_per_bay * math.pi * self.fan_diameter ** 2 / 4.0
