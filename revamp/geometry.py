"""Shell-and-tube exchanger geometry: a validated, immutable input model and its derived areas.

:class:`ShellAndTube` holds what a data sheet gives for a TEMA E-shell with single-segmental baffles. Every length
takes SI (m) or a string with a unit; after construction every field is SI. Omitted clearances, end baffle spacings
and sealing strips get TEMA-based defaults, and each default applied is stated in ``defaults_used``. Conditions that
are possible but outside the range of the shell-side correlations go to ``notes`` (the rating passes them on);
impossible ones raise :class:`~revamp.errors.InputError` naming the field.

:meth:`ShellAndTube.bell` returns a :class:`BellGeometry` with every geometric quantity of the Bell-Delaware method
(notation of Taborek 1983).

References
----------
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. In *Heat Exchanger Design Handbook*, §3.3,
Hemisphere. (Bell-Delaware geometry, notation, tube-count estimate.)
Serth, R. W., Lestina, T. (2014). *Process Heat Transfer: Principles, Applications and Rules of Thumb*, 2nd ed.,
Academic Press, ch. 6.
Shah, R. K., Sekulić, D. P. (2003). *Fundamentals of Heat Exchanger Design*, Wiley, ch. 9 (crossflow
area for the 45° and 60° layouts).
TEMA (2007). *Standards of the Tubular Exchanger Manufacturers Association*, 9th ed.: RCB-4.2 (tube holes in
baffles), RCB-4.3 (baffle-to-shell clearance), RCB-4.52 (maximum unsupported straight tube span).

Examples
--------
>>> hx = ShellAndTube(shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m",
...                   tube_count=158, tube_passes=4, tube_pitch="31.75 mm", layout=90,
...                   baffle_spacing="127 mm", baffle_cut=0.25, shells=1, tube_material=50.0)
>>> round(hx.tube_id * 1000, 2)
20.58
>>> round(hx.area_outside, 2)          # pi * 0.0254 * 4.88 * 158
61.53
>>> hx.n_baffles
37
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from typing import ClassVar

from .errors import InputError
from .geometry_bell import (  # noqa: F401  (the Bell-Delaware geometry and tube counts, re-exported here)
    BellGeometry,
    _bundle_diameter_for,
    bell_geometry,
    tube_count_estimate,
    tube_count_max,
)
from .units import to_si

__all__ = ["ShellAndTube", "BellGeometry", "REAR_HEADS", "LAYOUTS", "SHELL_TYPES", "tube_count_max"]

LAYOUTS = (30, 45, 60, 90)
SHELL_TYPES = ("E", "F", "J", "X")  #: TEMA shell types the rating supports
REAR_HEADS = ("fixed", "u-tube", "split-ring", "pull-through")
_REAR_ALIASES = {
    "fixed": "fixed", "fixed tubesheet": "fixed", "l": "fixed", "m": "fixed", "n": "fixed",
    "u-tube": "u-tube", "u tube": "u-tube", "utube": "u-tube", "u": "u-tube",
    "split-ring": "split-ring", "split ring": "split-ring", "s": "split-ring",
    "pull-through": "pull-through", "pull through": "pull-through", "t": "pull-through",
}
_INCH = 0.0254


# TEMA RCB-4.3 (9th ed.): shell-to-baffle diametral clearance by nominal shell size (upper limit of band, in; value)
_TEMA_SHELL_BAFFLE = ((17.0, 0.125), (39.0, 0.1875), (54.0, 0.25), (69.0, 0.3125), (84.0, 0.375), (math.inf, 0.4375))
# TEMA RCB-4.52 (9th ed.): maximum unsupported straight span, steel and high alloys (tube od in, span in)
_TEMA_SPAN_OD = (0.25, 0.375, 0.5, 0.625, 0.75, 0.875, 1.0, 1.25, 1.5, 2.0, 2.5, 3.0)
_TEMA_SPAN_STEEL = (26, 35, 44, 52, 60, 69, 74, 88, 100, 125, 125, 125)


class _DefaultFloat(float):
    """A float that marks a value filled in by a default, so that ``dataclasses.replace`` recomputes it."""


class _DefaultInt(int):
    """An int that marks a defaulted value (see :class:`_DefaultFloat`)."""


class _DefaultStr(str):
    """A str that marks a defaulted value (see :class:`_DefaultFloat`)."""


def _is_default(value) -> bool:
    return value is None or isinstance(value, (_DefaultFloat, _DefaultInt, _DefaultStr))


def _length(value, name: str, *, positive: bool = True) -> float:
    v = float(to_si(value, "length", name))
    if positive and not v > 0:
        raise InputError(name, value, "a length > 0 (m, or a string with a unit)")
    if not positive and v < 0:
        raise InputError(name, value, "a length >= 0 (m, or a string with a unit)")
    return v


def _integer(value, name: str, minimum: int) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or value != int(value) or value < minimum:
        raise InputError(name, value, f"a whole number >= {minimum}")
    return int(value)


def tema_shell_baffle_clearance(shell_id: float) -> float:
    """TEMA RCB-4.3 diametral clearance between shell inside diameter and baffle [m].

    Parameters
    ----------
    shell_id : float
        Shell inside diameter [m].

    Returns
    -------
    float
        Shell design inside diameter minus baffle outside diameter [m]: 1/8 in for 6-17 in shells, 3/16 in for
        18-39 in, 1/4 in for 40-54 in, 5/16 in for 55-69 in, 3/8 in for 70-84 in, 7/16 in for 85-100 in.

    References
    ----------
    TEMA (2007), 9th ed., Table RCB-4.3.

    Examples
    --------
    >>> round(tema_shell_baffle_clearance(0.54) * 1000, 2)
    4.76
    """
    size_in = shell_id / _INCH
    for upper, clearance_in in _TEMA_SHELL_BAFFLE:
        if size_in < upper + 1.0:  # nominal sizes are whole inches: 17.9 in belongs to the 6-17 band
            return clearance_in * _INCH
    return _TEMA_SHELL_BAFFLE[-1][1] * _INCH  # pragma: no cover


def bundle_shell_clearance(shell_id: float, rear_head: str) -> float:
    """Typical diametral clearance between shell and outer tube limit by rear-head type [m].

    Fixed tubesheet and U-tube: ``12 mm + 0.005 Ds`` (Taborek 1983, as reproduced by Serth & Lestina 2014; from
    memory). Split-ring floating head: ``35 mm + 0.015 Ds``; pull-through floating head: ``85 mm + 0.010 Ds``,
    straight-line readings of Taborek's clearance figure, from memory (common practice: ~35-60 mm and ~90-100 mm).
    Give the real clearance when the bundle drawing is at hand.

    Parameters
    ----------
    shell_id : float
        Shell inside diameter [m].
    rear_head : str
        One of :data:`REAR_HEADS`.

    Returns
    -------
    float
        Diametral shell-to-bundle clearance Lbb [m].

    Examples
    --------
    >>> round(bundle_shell_clearance(0.54, "fixed") * 1000, 1)
    14.7
    """
    ds_mm = shell_id * 1000.0
    base, slope = {"fixed": (12.0, 0.005), "u-tube": (12.0, 0.005), "split-ring": (35.0, 0.015),
                   "pull-through": (85.0, 0.010)}[rear_head]
    return (base + slope * ds_mm) / 1000.0


def tema_max_unsupported_span(tube_od: float) -> float:
    """TEMA RCB-4.52 maximum unsupported straight span for steel and high-alloy tubes [m].

    The value for the nearest tabulated diameter at or below ``tube_od`` (conservative between rows).

    References
    ----------
    TEMA (2007), 9th ed., Table RCB-4.52 (steel, low and high alloy steels, nickel alloys column).
    """
    od_in = tube_od / _INCH
    span = _TEMA_SPAN_STEEL[0]
    for od, s in zip(_TEMA_SPAN_OD, _TEMA_SPAN_STEEL):
        if od_in + 1e-9 >= od:
            span = s
    return span * _INCH


@dataclass(frozen=True)
class ShellAndTube:
    """A shell-and-tube exchanger: TEMA E shell, single-segmental baffles (validated, immutable, SI inside).

    Parameters
    ----------
    shell_id : float or str
        Shell inside diameter [m].
    tube_od, tube_wall : float or str
        Tube outside diameter and wall thickness [m].
    tube_length : float or str
        Tube length of one shell, tubesheet to tubesheet (taken as the effective length) [m].
    tube_count : int
        Tubes per shell (tubesheet holes).
    tube_passes : int
        Tube passes per shell: 1 or an even number.
    tube_pitch : float or str
        Centre-to-centre tube pitch [m].
    layout : int
        Layout angle: 30 (triangular), 45 (rotated square), 60 (rotated triangular), 90 (square) [deg].
    baffle_spacing : float or str
        Central baffle spacing Lbc [m].
    baffle_cut : float or str
        Baffle cut as a fraction of the shell inside diameter, 0.15-0.45 [-] (or a string such as ``"25 %"``).
    shells : int
        Identical shells in series (default 1).
    shells_parallel : int
        Identical shells (or series trains) in parallel (default 1).
    tube_material : str, float or Material
        A metallurgy name known to :mod:`revamp.materials`, or a wall conductivity in W/m/K (default
        ``"carbon steel"``).
    rear_head : str
        ``"fixed"``, ``"u-tube"``, ``"split-ring"`` (default) or ``"pull-through"``; sets the default
        bundle-to-shell clearance.
    baffle_spacing_in, baffle_spacing_out : float or str, optional
        Inlet and outlet baffle spacings [m]. Default: equal to ``baffle_spacing`` when the tube length holds a whole
        number of central spacings; otherwise the remainder is shared equally by the two end spaces.
    clearance_tube_baffle : float or str, optional
        Diametral tube-to-baffle-hole clearance [m]. Default TEMA RCB-4.2: 1/32 in (0.8 mm), or 1/64 in (0.4 mm)
        for tubes of 1-1/4 in od or less with an unsupported span over 36 in.
    clearance_shell_baffle : float or str, optional
        Diametral shell-to-baffle clearance [m]. Default TEMA RCB-4.3 by shell size (3.2 mm to 11.1 mm).
    clearance_bundle_shell : float or str, optional
        Diametral shell-to-outer-tube-limit clearance Lbb [m]. Default by rear head (see
        :func:`bundle_shell_clearance`).
    sealing_strip_pairs : int, optional
        Sealing-strip pairs Nss (default 0).
    nozzle_shell, nozzle_tube : float or str, optional
        Nozzle inside diameters [m] (default None: not known).
    tube_roughness : float or str, optional
        Inside tube roughness [m]. Default 0.045 mm for carbon steel (or a bare conductivity), 1.5 µm otherwise.
    insert : object, optional
        A tube insert model from :mod:`revamp.correlations.inserts` (default None).
    tag : str
        A name for reports (default "").
    shell_type : {"E", "F", "J", "X"}
        TEMA shell type (default "E"): E one-pass shell; F two-pass shell with a longitudinal baffle (an even
        number of tube passes); J divided flow (one central inlet, two outlets, or the reverse); X crossflow (no
        baffle windows: the shell stream crosses the whole bundle once). Lower case is accepted.

    Attributes
    ----------
    defaults_used : tuple of str
        Each default applied, with its value and source.
    notes : tuple of str
        Possible but unusual geometry (outside the correlations' range, long spans) for the rating to pass on.

    Raises
    ------
    InputError
        On impossible geometry, naming the field.
    """

    shell_id: float
    tube_od: float
    tube_wall: float
    tube_length: float
    tube_count: int
    tube_passes: int
    tube_pitch: float
    layout: int
    baffle_spacing: float
    baffle_cut: float
    shells: int = 1
    tube_material: object = "carbon steel"
    shells_parallel: int = 1
    rear_head: str | None = None
    baffle_spacing_in: float | None = None
    baffle_spacing_out: float | None = None
    clearance_tube_baffle: float | None = None
    clearance_shell_baffle: float | None = None
    clearance_bundle_shell: float | None = None
    sealing_strip_pairs: int | None = None
    nozzle_shell: float | None = None
    nozzle_tube: float | None = None
    tube_roughness: float | None = None
    insert: object = None
    tag: str = ""
    shell_type: str = "E"
    defaults_used: tuple = field(init=False, default=(), compare=False)
    notes: tuple = field(init=False, default=(), compare=False)
    _bell: BellGeometry = field(init=False, default=None, repr=False, compare=False)
    kind: ClassVar[str] = "shell and tube"  # the exchanger kind (revamp.exchanger.MODELS, revamp.rating.RATERS)

    def __post_init__(self):  # noqa: C901 - one straight list of checks reads best
        put = lambda name, value: object.__setattr__(self, name, value)  # noqa: E731
        defaults: list[str] = []
        notes: list[str] = []

        for name in ("shell_id", "tube_od", "tube_wall", "tube_length", "tube_pitch", "baffle_spacing"):
            put(name, _length(getattr(self, name), name))
        ds, do, wall, length, pt = self.shell_id, self.tube_od, self.tube_wall, self.tube_length, self.tube_pitch
        if wall >= do / 2.0:
            raise InputError("tube_wall", self.tube_wall, f"< half the tube od ({do / 2:.4g} m)")
        if pt <= do:
            raise InputError("tube_pitch", pt, f"> tube_od ({do:.4g} m): tubes would touch or overlap")
        if pt / do > 2.0:
            notes.append(f"tube_pitch / tube_od = {pt / do:.3g} is above 2, beyond the tube banks behind "
                         "Taborek's ideal j and f fits (pitch ratios about 1.25-1.5)")
        if self.layout not in LAYOUTS or isinstance(self.layout, bool):
            raise InputError("layout", self.layout, "one of 30, 45, 60, 90 (degrees)")
        put("layout", int(self.layout))
        put("tube_count", _integer(self.tube_count, "tube_count", 1))
        passes = _integer(self.tube_passes, "tube_passes", 1)
        if passes != 1 and passes % 2:
            raise InputError("tube_passes", self.tube_passes, "1 or an even number (2, 4, 6, 8, ...)")
        put("tube_passes", passes)
        kind = self.shell_type.strip().upper() if isinstance(self.shell_type, str) else None
        if kind not in SHELL_TYPES:
            raise InputError("shell_type", self.shell_type, f"one of {', '.join(SHELL_TYPES)} (TEMA shell types "
                             "rated here: E one pass, F two passes, J divided flow, X crossflow)")
        if kind == "F" and passes < 2:
            raise InputError("tube_passes", self.tube_passes, "an even number >= 2 in an F shell (two shell passes)")
        put("shell_type", kind)
        if self.tube_count < passes:
            raise InputError("tube_count", self.tube_count, f">= tube_passes ({passes})")
        put("shells", _integer(self.shells, "shells", 1))
        put("shells_parallel", _integer(self.shells_parallel, "shells_parallel", 1))

        cut = self.baffle_cut
        allowed_cut = ("a fraction of the shell id from 0.15 to 0.45 (0.25 or '25 %'): the range of the "
                       "Bell-Delaware correlations (Taborek 1983)")
        if isinstance(cut, bool) or not isinstance(cut, (int, float, str)):
            raise InputError("baffle_cut", cut, allowed_cut)
        cut_si = to_si(cut, "dimensionless", "baffle_cut")  # "25 %" -> 0.25, as the unit file reads it
        if not isinstance(cut_si, float) or not 0.15 <= cut_si <= 0.45:
            raise InputError("baffle_cut", cut, allowed_cut)
        put("baffle_cut", float(cut_si))

        # rear head
        if _is_default(self.rear_head):
            put("rear_head", _DefaultStr("split-ring"))
            defaults.append("rear_head = 'split-ring' (default)")
        else:
            key = str(self.rear_head).strip().lower() if isinstance(self.rear_head, str) else None
            if key not in _REAR_ALIASES:
                raise InputError("rear_head", self.rear_head, f"one of {', '.join(REAR_HEADS)}")
            put("rear_head", _REAR_ALIASES[key])

        # baffle spacings and count
        lbc = self.baffle_spacing
        if lbc >= length:
            raise InputError("baffle_spacing", lbc, f"< tube_length ({length:.4g} m)")
        lbi = None if _is_default(self.baffle_spacing_in) else _length(self.baffle_spacing_in, "baffle_spacing_in")
        lbo = None if _is_default(self.baffle_spacing_out) else _length(self.baffle_spacing_out,
                                                                        "baffle_spacing_out")
        fixed = (lbi or 0.0) + (lbo or 0.0)
        n_free = (lbi is None) + (lbo is None)
        if n_free == 0:
            x = (length - lbi - lbo) / lbc
            if x < -1e-9:
                raise InputError("baffle_spacing_in", self.baffle_spacing_in,
                                 f"such that baffle_spacing_in + baffle_spacing_out <= tube_length ({length:.4g} m)")
            nb = int(math.floor(x + 1e-6)) + 1
            if abs(x - round(x)) > 0.01:
                notes.append(f"the baffle spacings do not fill the tube length: {x:.3g} central spacings between "
                             f"the end spaces; rated with {nb} baffles")
        else:
            # whole central spacings that fit with end spaces at least one central spacing each
            spaces = int(math.floor((length - fixed) / lbc + 1e-6))
            nb = spaces - n_free + 1
            if nb < 1:
                raise InputError("baffle_spacing", lbc, f"small enough that at least one baffle fits in "
                                 f"tube_length ({length:.4g} m)")
            rest = (length - fixed - (nb - 1) * lbc) / n_free
            if lbi is None:
                lbi = _DefaultFloat(rest)
                defaults.append(f"baffle_spacing_in = {rest * 1000:.4g} mm (central spacing, or the remainder of "
                                "the tube length shared by the end spaces)")
            if lbo is None:
                lbo = _DefaultFloat(rest)
                defaults.append(f"baffle_spacing_out = {rest * 1000:.4g} mm (central spacing, or the remainder of "
                                "the tube length shared by the end spaces)")
        put("baffle_spacing_in", lbi)
        put("baffle_spacing_out", lbo)
        if lbc < 0.2 * ds or lbc < 2 * _INCH:
            notes.append(f"baffle_spacing {lbc * 1000:.4g} mm is below TEMA's minimum (1/5 of the shell id or 2 in) "
                         "and the 0.2 Ds lower end of the Bell-Delaware range")
        if lbc > ds:
            notes.append(f"baffle_spacing {lbc * 1000:.4g} mm exceeds the shell id, beyond the Bell-Delaware range "
                         "(0.2-1.0 Ds)")
        span = max(2 * lbc, lbi + lbc, lbo + lbc) if nb > 1 else lbi + lbo
        tema_span = tema_max_unsupported_span(do)
        if span > tema_span:
            notes.append(f"longest unsupported tube span {span:.3g} m exceeds TEMA RCB-4.52's {tema_span:.3g} m "
                         "(steel tubes): screen for vibration")

        # clearances
        if _is_default(self.clearance_tube_baffle):
            ltb = 0.4e-3 if (do <= 1.25 * _INCH + 1e-9 and span > 36 * _INCH) else 0.8e-3
            put("clearance_tube_baffle", _DefaultFloat(ltb))
            defaults.append(f"clearance_tube_baffle = {ltb * 1000:.1f} mm (TEMA RCB-4.2, diametral, for an "
                            f"unsupported span of {span:.3g} m)")
        else:
            put("clearance_tube_baffle", _length(self.clearance_tube_baffle, "clearance_tube_baffle",
                                                 positive=False))
        if _is_default(self.clearance_shell_baffle):
            lsb = tema_shell_baffle_clearance(ds)
            put("clearance_shell_baffle", _DefaultFloat(lsb))
            defaults.append(f"clearance_shell_baffle = {lsb * 1000:.1f} mm (TEMA RCB-4.3, diametral, by shell size)")
        else:
            put("clearance_shell_baffle", _length(self.clearance_shell_baffle, "clearance_shell_baffle",
                                                  positive=False))
        if self.clearance_shell_baffle >= 0.1 * ds:
            raise InputError("clearance_shell_baffle", self.clearance_shell_baffle,
                             f"a diametral clearance well below the shell id (< {0.1 * ds:.3g} m)")
        if _is_default(self.clearance_bundle_shell):
            lbb = bundle_shell_clearance(ds, self.rear_head)
            put("clearance_bundle_shell", _DefaultFloat(lbb))
            defaults.append(f"clearance_bundle_shell = {lbb * 1000:.1f} mm (typical for a {self.rear_head} rear "
                            "head, Taborek 1983, from memory)")
        else:
            put("clearance_bundle_shell", _length(self.clearance_bundle_shell, "clearance_bundle_shell",
                                                  positive=False))
        lbb = self.clearance_bundle_shell
        if lbb >= ds - 2 * do:
            raise InputError("clearance_bundle_shell", lbb, f"< shell_id - 2 tube_od ({ds - 2 * do:.4g} m)")
        if _is_default(self.sealing_strip_pairs):
            put("sealing_strip_pairs", _DefaultInt(0))
            defaults.append("sealing_strip_pairs = 0 (none)")
        else:
            put("sealing_strip_pairs", _integer(self.sealing_strip_pairs, "sealing_strip_pairs", 0))
        for name in ("nozzle_shell", "nozzle_tube"):
            if getattr(self, name) is not None:
                put(name, _length(getattr(self, name), name))

        # tube count against the room in the bundle: refuse only what cannot fit (an exact lattice count); the
        # estimate 0.78 Dctl²/(C1 Pt²) (Taborek 1983) only prompts a note. A defaulted bundle-to-shell clearance
        # too large for the stated tubes is reduced to the largest that holds them.
        n_est = tube_count_estimate(ds - lbb - do, pt, self.layout)
        if self.tube_count > n_est:
            stated = not _is_default(self.clearance_bundle_shell)
            limit = ds - lbb if stated else ds
            n_fit = tube_count_max(limit, do, pt, self.layout)
            if self.tube_count > n_fit:
                where = (f"within the outer tube limit {limit * 1000:.1f} mm (shell id less the stated "
                         f"clearance_bundle_shell {lbb * 1000:.1f} mm)" if stated else
                         f"inside the shell id {ds * 1000:.1f} mm even with no bundle-to-shell clearance")
                raise InputError("tube_count", self.tube_count,
                                 f"<= {n_fit}: no more tubes of {do * 1000:.4g} mm on a {pt * 1000:.4g} mm pitch "
                                 f"at {self.layout}° fit {where} (exact lattice count, one pass)")
            if not stated and self.tube_count > tube_count_max(ds - lbb, do, pt, self.layout):
                lbb = max(0.0, ds - _bundle_diameter_for(self.tube_count, do, pt, self.layout, ds))
                lbb = _DefaultFloat(math.floor(lbb * 1e4) / 1e4)
                put("clearance_bundle_shell", lbb)
                defaults[:] = [d for d in defaults if not d.startswith("clearance_bundle_shell")]
                defaults.append(f"clearance_bundle_shell = {lbb * 1000:.1f} mm (the largest that holds "
                                f"{self.tube_count} tubes; the typical {self.rear_head} value leaves too little room)")
                notes.append(f"tube_count {self.tube_count} does not fit the typical bundle-to-shell clearance of a "
                             f"{self.rear_head} rear head: rated with {lbb * 1000:.1f} mm; give clearance_bundle_shell "
                             "from the bundle drawing")
            else:
                notes.append(f"tube_count {self.tube_count} exceeds the estimate 0.78 Dctl²/(C1 Pt²) = {n_est:.0f} "
                             f"(Taborek 1983) but fits by an exact lattice count ({n_fit} at most in one pass); check "
                             "it against the tube sheet layout")

        # material and roughness
        raw = self.tube_material
        put("tube_material", self._parse_material(raw))
        if _is_default(self.tube_roughness):
            name = str(getattr(raw, "name", raw)).strip().lower()
            carbon = isinstance(raw, (int, float)) or "carbon" in name or name == "cs"
            if not isinstance(raw, (str, int, float)):  # a Material given back by replace(): a bare k has no entry
                known = getattr(self._materials_module(), "MATERIALS", None)
                carbon = carbon or (known is not None and getattr(raw, "name", None) not in known)
            rough = 45e-6 if carbon else 1.5e-6
            put("tube_roughness", _DefaultFloat(rough))
            defaults.append(f"tube_roughness = {rough * 1e6:.3g} µm ({'carbon steel' if carbon else 'drawn alloy'} "
                            "tube, common practice)")
        else:
            put("tube_roughness", _length(self.tube_roughness, "tube_roughness", positive=False))
        if self.insert is not None and not hasattr(self.insert, "nu"):
            raise InputError("insert", self.insert, "None or an insert model from revamp.correlations.inserts")
        if not isinstance(self.tag, str):
            raise InputError("tag", self.tag, "a string")

        geom = bell_geometry(Ds=ds, tube_od=do, pitch=pt, layout=self.layout, tubes=self.tube_count, length=length,
                             Lbc=lbc, Lbi=float(lbi), Lbo=float(lbo), Nb=nb, Bc=self.baffle_cut, Lbb=lbb,
                             Lsb=float(self.clearance_shell_baffle), Ltb=float(self.clearance_tube_baffle),
                             Nss=int(self.sealing_strip_pairs), unsupported_span_max=span)
        if geom.Sw <= 0:
            raise InputError("baffle_cut", self.baffle_cut, "large enough that the window is not filled by tubes")
        if geom.Nss > geom.Nc / 2:
            notes.append(f"sealing_strip_pairs {geom.Nss} exceeds half the rows crossed ({geom.Nc:.3g}); "
                         "Jb = 1 from there on")
        put("_bell", geom)
        put("defaults_used", tuple(defaults))
        put("notes", tuple(notes))

    @staticmethod
    def _materials_module():
        try:
            from . import materials
        except ImportError:  # materials module not available yet: keep a conductivity or the name
            return None
        return materials

    @classmethod
    def _parse_material(cls, value):
        materials = cls._materials_module()
        if materials is not None:
            return materials.material(value)  # raises InputError("tube_material", ...) on a bad name or k
        if isinstance(value, str):  # materials module absent: keep the name, or parse a conductivity
            try:
                return float(to_si(value, "conductivity", "tube_material"))
            except InputError:
                return value
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not value > 0:
            raise InputError("tube_material", value, "a metallurgy name or a conductivity > 0 (W/m/K)")
        return float(value)

    # ------------------------------------------------------------------------------------------------ derived
    def replace(self, **changes) -> "ShellAndTube":
        """A validated copy with some fields changed (defaults are recomputed for the new geometry)."""
        return dataclasses.replace(self, **changes)

    def bell(self) -> BellGeometry:
        """The Bell-Delaware geometry of one shell (:class:`BellGeometry`)."""
        return self._bell

    @property
    def tube_id(self) -> float:
        """Tube inside diameter [m]."""
        return self.tube_od - 2.0 * self.tube_wall

    @property
    def tubes_per_pass(self) -> float:
        """Tubes in one pass of one shell [-]."""
        return self.tube_count / self.tube_passes

    @property
    def area_outside_per_shell(self) -> float:
        """Outside tube surface of one shell, π do L N [m²]."""
        return math.pi * self.tube_od * self.tube_length * self.tube_count

    @property
    def area_outside(self) -> float:
        """Outside tube surface of all shells, series and parallel [m²]."""
        return self.area_outside_per_shell * self.shells * self.shells_parallel

    @property
    def area_inside(self) -> float:
        """Inside tube surface of all shells, series and parallel [m²]."""
        return math.pi * self.tube_id * self.tube_length * self.tube_count * self.shells * self.shells_parallel

    @property
    def flow_area_tube(self) -> float:
        """Tube-side flow area of one pass in one shell [m²]."""
        return math.pi / 4.0 * self.tube_id ** 2 * self.tubes_per_pass

    @property
    def n_baffles(self) -> int:
        """Number of baffles in one shell [-]."""
        return self._bell.Nb

    @property
    def unsupported_span_max(self) -> float:
        """Longest unsupported tube span [m] (window tubes, segmental baffles)."""
        return self._bell.unsupported_span_max
