"""The exchanger protocol: how a rating engine sees one exchanger kind (layer 5, beside the rating engines).

An engine that rates an exchanger (single-phase today, zone by zone for a condenser) needs the same few things of
every kind: the names of its two sides, the area the overall coefficient refers to, the film coefficient and
pressure drop of each side at a flow and a set of properties, the resistances in series between the two fluids with
their names, and the effectiveness of its flow arrangement. :class:`ExchangerModel` states them;
:func:`model_of` gives the model of an exchanger from the registry :data:`MODELS` (the exchanger class's ``kind``
-> the model class). Two kinds implement it:

- :class:`ShellAndTubeModel` (``"shell and tube"``): shell side by Bell-Delaware (or Kern) adapted to the TEMA shell
  type, tube side by Gnielinski / Sieder-Tate or the insert's correlation, the five resistances of
  :data:`revamp.resistance.TUBE_LAYERS`, effectiveness-NTU of :func:`revamp.rating.arrangement`;
- :class:`AirCoolerModel` (``"air cooler"``): air side by Briggs & Young (or ESDU) with Robinson & Briggs (or ESDU)
  pressure drop, the fin efficiency inside the network (it depends on the air film), the six resistances of
  :data:`revamp.rating_air.AIR_LAYERS`, the cross-flow effectiveness for the rows and passes.

Everything here is an unvalidated kernel once the model is built: :func:`model_of` checks the exchanger kind and the
method names; ``film``, ``network`` and ``effectiveness`` take SI floats or arrays and return arrays, with no checks,
so that an engine can call them in its loop. Flows given to ``film`` are those of ONE parallel unit (a shell train,
an air-cooler bundle): the whole stream divided by ``n_parallel``.

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. *Heat Exchanger Design Handbook* §3.3,
Hemisphere (Bell-Delaware).
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell (the resistance network of a
finned tube).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import ClassVar, Protocol, runtime_checkable

import numpy as np

from . import thermal
from .correlations import air as air_corr
from .correlations import shell as shell_corr
from .correlations import tube as tube_corr
from .errors import InputError
from .resistance import TUBE_LAYERS, tube_resistances
from .thermal_air import effectiveness_air_cooler

__all__ = ["SideFilm", "TubeBundle", "ExchangerModel", "ShellAndTubeModel", "AirCoolerModel", "MODELS", "model_of",
           "layers_of"]


@dataclass(frozen=True, slots=True)
class SideFilm:
    """One side's single-phase film coefficient and pressure drop (arrays in the sweep's flat shape).

    Attributes
    ----------
    h : numpy.ndarray
        Film coefficient on that side's own heat-transfer surface [W/m²K] (air cooler: on the finned surface, the
        fin efficiency not applied).
    dp : numpy.ndarray
        Pressure drop of the side through one parallel unit, all shells and passes in series, nozzles included where
        the exchanger states them and the method models them [Pa].
    velocity : numpy.ndarray
        Reference velocity [m/s]: tube side, in the tubes; shell side, crossflow at the bundle centreline; air side,
        in the minimum free-flow area (the velocity of ``Re``).
    Re : numpy.ndarray
        Reynolds number of the side's correlation [-].
    warnings : tuple of str
        Validity-range warnings of the side's correlations (empty when asked for none).
    """

    h: np.ndarray
    dp: np.ndarray
    velocity: np.ndarray
    Re: np.ndarray
    warnings: tuple[str, ...]


@dataclass(frozen=True, slots=True)
class TubeBundle:
    """What a two-phase engine needs of the tubes of one parallel unit (every kind here has tubes).

    Attributes
    ----------
    d_o, d_i : float
        Tube outside (bare, at the fin root) and inside diameters [m].
    tubes_per_pass : float
        Tubes in one pass [-].
    passes : int
        Tube passes met along the tube-side path through one parallel unit, all shells in series included
        (shell-and-tube: ``tube_passes x shells``), so that ``pi d_o length tubes_per_pass passes`` is the
        unit's outside area.
    length : float
        Tube length of one pass [m].
    rows_vertical : float
        Mean number of tubes in a vertical column [-] (the condensate inundation of a shell-side condenser); air
        cooler: the tube rows.
    roughness : float
        Absolute tube inside roughness [m].
    """

    d_o: float
    d_i: float
    tubes_per_pass: float
    passes: int
    length: float
    rows_vertical: float
    roughness: float

    @property
    def area_outside(self) -> float:
        """Bare outside-tube area of the unit [m²]."""
        return math.pi * self.d_o * self.length * self.tubes_per_pass * self.passes


@runtime_checkable
class ExchangerModel(Protocol):
    """How a rating engine sees one exchanger kind.

    Attributes
    ----------
    kind : str
        ``"shell and tube"`` or ``"air cooler"`` (the exchanger class's ``kind``).
    sides : tuple of str
        ``(outer side, tube side)``: ``("shell", "tube")`` or ``("air", "tube")``.
    layers : tuple of str
        Names of the resistances in series, outer film first (:data:`revamp.resistance.TUBE_LAYERS`,
        :data:`revamp.rating_air.AIR_LAYERS`).
    area : float
        The basis of U: bare outside-tube area of the whole exchanger [m²].
    area_inside : float
        Tube inside area of the whole exchanger [m²].
    n_parallel : float
        Identical units in parallel; each takes ``flow / n_parallel`` of both streams.
    bundle : TubeBundle
        The tubes of one parallel unit.
    """

    kind: str
    sides: tuple[str, str]
    layers: tuple[str, ...]
    area: float
    area_inside: float
    n_parallel: float
    bundle: TubeBundle

    def film(self, side: str, m, props, props_wall=None) -> SideFilm:
        """Film coefficient and pressure drop of ``side`` at the flow ``m`` of one parallel unit [kg/s], the bulk
        properties ``props`` and (optional) the properties at the wall ``props_wall`` (viscosity correction)."""

    def network(self, h_outer, h_inner, rf_outer, rf_inner, t_wall) -> tuple:
        """The resistances in series, one array per name of ``layers`` [m²K/W], on ``area``: films [W/m²K] each on
        its own surface, fouling [m²K/W] each on its own surface, metal conductivity taken at ``t_wall`` [K]."""

    def effectiveness(self, ntu, cr, outer_is_cmin) -> tuple:
        """``(eps, 1 - eps)`` of the whole exchanger for its arrangement (NTU on ``area``, Cr = Cmin/Cmax)."""


# ------------------------------------------------------------------------------------------------------ helpers
def _arr(v):
    return np.asarray(v, dtype=float)


def _film(h, dp, velocity, Re, warnings=()):
    """A SideFilm with every array broadcast to one shape."""
    h, dp, velocity, Re = np.broadcast_arrays(_arr(h), _arr(dp), _arr(velocity), _arr(Re))
    return SideFilm(np.array(h), np.array(dp), np.array(velocity), np.array(Re), tuple(warnings))


def _side(model, side):
    if side not in model.sides:
        raise InputError("side", side, f"one of {model.sides} for a {model.kind} exchanger")
    return side


def _mu_wall(props_wall):
    return None if props_wall is None else _arr(props_wall.viscosity)


# ------------------------------------------------------------------------------------------------ shell and tube
@dataclass(frozen=True)
class ShellAndTubeModel:
    """:class:`ExchangerModel` of a :class:`revamp.ShellAndTube` (TEMA E, F, J, X shells).

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
    shell_method : {"bell-delaware", "kern"}
        Shell-side method (a key of :data:`revamp.correlations.shell.SHELL_METHODS`); Kern is not for X shells.

    Notes
    -----
    The shell side is the method adapted to the shell type by :func:`revamp.rating._shell_side_by_type` (F: two
    passes with half the flow areas, the longitudinal baffle sealed; J: divided flow; X: crossflow over the bundle),
    with the shell nozzles where given and the method models them; the conditions it assumes are in ``notes``. The
    tube side is :func:`revamp.correlations.tube.tube_side_kernel` with the tube nozzles where given. Pressure drops
    are those of all shells in series.

    ``bundle.rows_vertical`` is the mean number of tube rows met by a vertical line through the bundle,
    (pi/4) Dctl / Pp (the mean chord of the tube-centre circle over the row pitch, the tube rows taken horizontal:
    a geometric estimate, common practice, no source).
    """

    kind: ClassVar[str] = "shell and tube"
    sides: ClassVar[tuple] = ("shell", "tube")
    layers: ClassVar[tuple] = TUBE_LAYERS
    #: the method keywords :func:`model_of` accepts for this kind -> their allowed names
    METHODS: ClassVar[dict] = {"shell_method": shell_corr.SHELL_METHODS}

    exchanger: object
    shell_method: str = "bell-delaware"
    area: float = field(init=False)
    area_inside: float = field(init=False)
    n_parallel: float = field(init=False)
    bundle: TubeBundle = field(init=False)
    arrangement: tuple = field(init=False)
    notes: tuple = field(init=False)
    _shell: object = field(init=False, repr=False)
    _shell_kw: dict = field(init=False, repr=False)

    def __post_init__(self):
        from .rating import _accepts, _shell_side_by_type, arrangement  # same layer; rating imports this lazily

        hx = self.exchanger
        if self.shell_method not in shell_corr.SHELL_METHODS:
            raise InputError("shell_method", self.shell_method, f"one of {sorted(shell_corr.SHELL_METHODS)}")
        kind = getattr(hx, "shell_type", "E")
        if kind == "X" and self.shell_method == "kern":
            raise InputError("shell_method", self.shell_method, "'bell-delaware' for an X shell (Kern's method "
                             "assumes baffled crossflow; the X shell is rated as one crossflow pass over the bundle)")
        fn = shell_corr.SHELL_METHODS[self.shell_method]
        bell = hx.bell()
        call, noz_scale, notes = _shell_side_by_type(kind, fn, bell)
        kw, notes = {}, list(notes)
        d_noz = getattr(hx, "nozzle_shell", None)
        if d_noz is not None:
            if noz_scale is not None and _accepts(fn, "d_nozzle"):
                kw = {"d_nozzle": d_noz * noz_scale}
            else:
                notes.append("shell side: nozzle pressure drop not included (not available for this shell type or "
                             "method)")
        shells = int(hx.shells)
        put = object.__setattr__
        put(self, "area", float(hx.area_outside))
        put(self, "area_inside", float(hx.area_inside))
        put(self, "n_parallel", float(getattr(hx, "shells_parallel", 1)))
        put(self, "bundle", TubeBundle(
            d_o=float(hx.tube_od), d_i=float(hx.tube_id), tubes_per_pass=float(hx.tubes_per_pass),
            passes=int(hx.tube_passes) * shells, length=float(hx.tube_length),
            rows_vertical=max(1.0, math.pi / 4.0 * bell.Dctl / bell.pitch_parallel),
            roughness=float(getattr(hx, "tube_roughness", 0.0))))
        put(self, "arrangement", arrangement(hx))
        put(self, "notes", tuple(notes))
        put(self, "_shell", call)
        put(self, "_shell_kw", kw)

    def film(self, side, m, props, props_wall=None, *, warn=True) -> SideFilm:
        """See :meth:`ExchangerModel.film`; ``warn=False`` skips the tube side's validity-range warnings."""
        hx, shells = self.exchanger, int(self.exchanger.shells)
        rho, cp, mu, k = (_arr(v) for v in (props.density, props.heat_capacity, props.viscosity, props.conductivity))
        mu_w = _mu_wall(props_wall)
        if _side(self, side) == "shell":
            res = self._shell(_arr(m), rho, cp, mu, k, mu if mu_w is None else mu_w, **self._shell_kw)
            return _film(res.h, _arr(res.dp) * shells, res.velocity_crossflow, res.Re, res.warnings)
        b, d_noz = self.bundle, getattr(hx, "nozzle_tube", None)
        insert = getattr(hx, "insert", None)
        res = tube_corr.tube_side_kernel(_arr(m), b.tubes_per_pass, b.d_i, b.length, int(hx.tube_passes), rho, cp,
                                         mu, k, mu_w, b.roughness / b.d_i, insert, d_noz,
                                         rho if d_noz is not None else None, warn=False)
        warns = (tube_corr.tube_side_warnings(res.Re, res.Pr, None if mu_w is None else mu / mu_w, insert)
                 if warn else ())
        return _film(res.h, _arr(res.dp) * shells, res.velocity, res.Re, warns)

    def network(self, h_outer, h_inner, rf_outer, rf_inner, t_wall) -> tuple:
        """See :meth:`ExchangerModel.network`: :func:`revamp.resistance.tube_resistances` (shell film, shell
        fouling, wall, tube fouling, tube film) on the outside area, the wall conductivity at ``t_wall``; every layer
        broadcast to one shape (read-only views)."""
        hx = self.exchanger
        k_w = hx.tube_material.conductivity(_arr(t_wall))
        return tuple(np.broadcast_arrays(*tube_resistances(_arr(h_outer), _arr(h_inner), _arr(rf_outer),
                                                           _arr(rf_inner), self.bundle.d_o, self.bundle.d_i, k_w)))

    def effectiveness(self, ntu, cr, outer_is_cmin) -> tuple:
        """See :meth:`ExchangerModel.effectiveness`: :func:`revamp.thermal.effectiveness_kernel` for
        :func:`revamp.rating.arrangement` (``outer_is_cmin``: the shell stream has the smaller C)."""
        name, units = self.arrangement
        eps, w = thermal.effectiveness_kernel(_arr(ntu), _arr(cr), name, units, np.asarray(outer_is_cmin))
        return np.minimum(eps, 1.0), np.maximum(w, 0.0)


# ------------------------------------------------------------------------------------------------------ air cooler
@dataclass(frozen=True)
class AirCoolerModel:
    """:class:`ExchangerModel` of a :class:`revamp.AirCooler`; one parallel unit is one bundle.

    Parameters
    ----------
    exchanger : revamp.AirCooler
    h_method : {"briggs-young", "esdu"}
    dp_method : {"robinson-briggs", "esdu"}
    fin_method : {"kern-kraus", "schmidt"}

    Notes
    -----
    ``film("air", ...)`` gives the film coefficient on the finned surface (fin efficiency not applied) and the
    pressure drop over the bundle; :meth:`network` applies the fin efficiency (it depends on that film), refers the
    air film and the air fouling to the bare outside-tube area through the surface efficiency, and adds the fin bond
    (zero when the bond's contact resistance is not known; the rating warns).
    """

    kind: ClassVar[str] = "air cooler"
    sides: ClassVar[tuple] = ("air", "tube")
    layers: ClassVar[tuple] = ("air film", "air fouling", "fin bond", "wall", "tube fouling", "tube film")
    METHODS: ClassVar[dict] = {"h_method": air_corr.AIR_H_METHODS, "dp_method": air_corr.AIR_DP_METHODS,
                               "fin_method": air_corr.FIN_EFFICIENCY_METHODS}

    exchanger: object
    h_method: str = "briggs-young"
    dp_method: str = "robinson-briggs"
    fin_method: str = "kern-kraus"
    area: float = field(init=False)
    area_inside: float = field(init=False)
    area_air: float = field(init=False)
    n_parallel: float = field(init=False)
    bundle: TubeBundle = field(init=False)

    def __post_init__(self):
        for name, allowed in self.METHODS.items():
            if getattr(self, name) not in allowed:
                raise InputError(name, getattr(self, name), f"one of {sorted(allowed)}")
        ac = self.exchanger
        put = object.__setattr__
        put(self, "area", float(ac.area))
        put(self, "area_inside", float(ac.area_inside))
        put(self, "area_air", float(ac.area_air))
        put(self, "n_parallel", float(ac.bundles))
        put(self, "bundle", TubeBundle(
            d_o=float(ac.tube_od), d_i=float(ac.tube_id), tubes_per_pass=float(ac.tubes_per_pass),
            passes=int(ac.tube_passes), length=float(ac.tube_length), rows_vertical=float(ac.tube_rows),
            roughness=float(ac.tube_roughness)))

    def air_side(self, m, props):
        """The full air-side result of one bundle (:func:`revamp.rating_air.air_side`: film, fin and surface
        efficiency, pressure drop) at the air flow ``m`` [kg/s] and air properties ``props``."""
        from .rating_air import air_side

        return air_side(self.exchanger, _arr(m), _arr(props.density), _arr(props.heat_capacity),
                        _arr(props.viscosity), _arr(props.conductivity), self.h_method, self.dp_method,
                        self.fin_method)

    def film(self, side, m, props, props_wall=None, *, warn=True) -> SideFilm:
        """See :meth:`ExchangerModel.film`; ``props`` of air from :func:`revamp.correlations.air.air_properties`
        (``props_wall`` unused on the air side). ``warn=False`` skips the validity-range warnings."""
        ac = self.exchanger
        if _side(self, side) == "air":
            air = self.air_side(m, props)
            warns = air_corr.air_side_warnings(self.h_method, self.dp_method, air.Re, ac) if warn else ()
            return _film(air.h, air.dp, _arr(air.G_max) / _arr(props.density), air.Re, warns)
        rho, cp, mu, k = (_arr(v) for v in (props.density, props.heat_capacity, props.viscosity, props.conductivity))
        mu_w, b = _mu_wall(props_wall), self.bundle
        res = tube_corr.tube_side_kernel(_arr(m), b.tubes_per_pass, b.d_i, b.length, b.passes, rho, cp, mu, k, mu_w,
                                         b.roughness / b.d_i, ac.insert, warn=False)
        warns = (tube_corr.tube_side_warnings(res.Re, res.Pr, None if mu_w is None else mu / mu_w, ac.insert)
                 if warn else ())
        return _film(res.h, res.dp, res.velocity, res.Re, warns)

    def network(self, h_outer, h_inner, rf_outer, rf_inner, t_wall) -> tuple:
        """See :meth:`ExchangerModel.network`: air film (with the fin efficiency of ``fin_method`` at ``h_outer``),
        air fouling (on the finned surface), fin bond, wall, tube fouling, tube film, on the bare outside-tube area.

        ``h_outer`` is the air film on the finned surface, ``rf_outer`` the air-side fouling on the finned surface.
        """
        ac, fin = self.exchanger, self.exchanger.fin
        h = _arr(h_outer)
        eta = _arr(air_corr.FIN_EFFICIENCY_METHODS[self.fin_method](ac.tube_od, ac.fin_diameter, fin.thickness,
                                                                    fin.conductivity, h))
        a_fin, a_root, a_bare = ac.area_fin_per_tube, ac.area_root_per_tube, ac.area_bare_per_tube
        h_bare = h * (eta * a_fin + a_root) / a_bare
        eta_o = (eta * a_fin + a_root) / (a_fin + a_root)
        bond = fin.contact_resistance
        d_o, d_i = self.bundle.d_o, self.bundle.d_i
        k_w = ac.tube_material.conductivity(_arr(t_wall))
        R = (1.0 / h_bare, _arr(rf_outer) * a_bare / (eta_o * (a_fin + a_root)), None,
             d_o * np.log(d_o / d_i) / (2.0 * k_w), _arr(rf_inner) * d_o / d_i, d_o / (d_i * _arr(h_inner)))
        shape = np.broadcast_shapes(*(np.shape(r) for r in R if r is not None))
        R = R[:2] + (np.full(shape, 0.0 if bond is None else float(bond)),) + R[3:]
        return tuple(np.broadcast_to(r, shape) for r in R)

    def effectiveness(self, ntu, cr, outer_is_cmin) -> tuple:
        """See :meth:`ExchangerModel.effectiveness`: :func:`revamp.thermal_air.effectiveness_air_cooler` for the
        bundle's rows and passes (``outer_is_cmin``: the air has the smaller C)."""
        ac = self.exchanger
        return effectiveness_air_cooler(_arr(ntu), _arr(cr), ~np.asarray(outer_is_cmin, dtype=bool), ac.tube_rows,
                                        ac.tube_passes)


# ------------------------------------------------------------------------------------------------------ registry
#: Exchanger kinds: the exchanger class's ``kind`` -> its model class. A new kind registers here and in
#: :data:`revamp.rating.RATERS` (see docs/architecture.md, "The exchanger protocol").
MODELS: dict = {ShellAndTubeModel.kind: ShellAndTubeModel, AirCoolerModel.kind: AirCoolerModel}


def _kind(exchanger):
    kind = getattr(type(exchanger), "kind", None)
    if not isinstance(kind, str) or kind not in MODELS:
        raise InputError("exchanger", f"{type(exchanger).__name__} object",
                         f"an exchanger of a registered kind ({', '.join(sorted(MODELS))}): revamp.ShellAndTube or "
                         "revamp.AirCooler")
    return kind


def model_of(exchanger, **methods) -> ExchangerModel:
    """The :class:`ExchangerModel` of an exchanger, by its class's ``kind``.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or revamp.AirCooler
    **methods : str
        The kind's method choices: ``shell_method`` (shell and tube); ``h_method``, ``dp_method``, ``fin_method``
        (air cooler).

    Returns
    -------
    ExchangerModel

    Raises
    ------
    InputError
        ``exchanger`` of no registered kind (the allowed kinds named), a method keyword the kind does not have, or
        a method name it does not know.
    """
    cls = MODELS[_kind(exchanger)]
    for name, value in methods.items():
        if name not in cls.METHODS:
            raise InputError(name, value, f"not a method choice of a {cls.kind} exchanger (choices: "
                             f"{', '.join(cls.METHODS) or 'none'})")
    return cls(exchanger, **methods)


def layers_of(exchanger) -> tuple:
    """The names of the resistances in series of an exchanger's kind (outer film first), without building its model."""
    return MODELS[_kind(exchanger)].layers
