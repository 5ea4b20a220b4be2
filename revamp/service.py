"""The service an exchanger carries: two streams and their fouling.

A :class:`Stream` is a fluid at a mass flow and an inlet temperature; a :class:`Service` puts one stream on the
shell side and one on the tube side, with the fouling resistance of each side. Flows, inlet temperatures and
fouling accept numpy arrays: a rating of an array service is a sweep, computed in one vectorized call.

Examples
--------
>>> from revamp import fluids
>>> oil = fluids.constant(density=850, heat_capacity=2100, viscosity=2e-3, conductivity=0.12)
>>> svc = Service(shell=Stream(oil, "43800 lb/h", "390 degF"), tube=Stream(fluids.constant(
...     density=995, heat_capacity=4180, viscosity=8e-4, conductivity=0.6), 60.0, "30 degC"))
>>> round(svc.shell.flow, 3), round(svc.shell.t_in, 2)
(5.519, 472.04)
>>> round(svc.scaled(1.2).shell.flow, 3)
6.622
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .units import require, to_si

__all__ = ["SATURATION_TOLERANCE", "Stream", "Service", "dew_point", "saturation_temperature"]


def _check_fluid(fluid, field):
    # asked of the class first: a fluid whose range is a lazy property (CoolProp's) is not loaded just to be checked
    has = lambda name: hasattr(type(fluid), name) or hasattr(fluid, name)  # noqa: E731
    if not (has("props") and has("t_min") and has("t_max")):
        raise InputError(field, fluid, "a fluid from revamp.fluids (water(), pure(), petroleum(), table(), constant())")


#: How far a given inlet temperature of a saturated (two-phase) stream may lie from the saturation temperature at
#: its quality [K]; within it the inlet is the saturation temperature (the stream's ``t_in`` holds that value).
SATURATION_TOLERANCE = 0.5

_PHASES = ("liquid", "vapour")


def _condensable(fluid) -> str | None:
    """``"curve"`` for a condensing curve, ``"pure"`` for a CoolProp pure fluid (water(), pure()), else None."""
    if all(hasattr(fluid, a) for a in ("t_dew", "t_bubble", "q", "T", "x")):
        return "curve"
    if hasattr(fluid, "fluid") and hasattr(fluid, "pressure") and isinstance(getattr(fluid, "fluid"), str):
        return "pure"
    return None


def saturation_temperature(fluid, quality) -> float:
    """Saturation temperature [K] of a condensable fluid at a vapour mass fraction ``quality`` (0..1).

    A pure CoolProp fluid condenses at one temperature (its liquid provider's ``t_max``, saturation at its
    pressure); a condensing curve is interpolated linearly in vapour fraction along its points.
    """
    kind = _condensable(fluid)
    if kind == "pure":
        return float(fluid.t_max)
    x, T = np.asarray(fluid.x, dtype=float), np.asarray(fluid.T, dtype=float)
    order = np.argsort(x, kind="stable")
    return float(np.interp(quality, x[order], T[order]))


def dew_point(fluid) -> float:
    """Dew-point temperature [K] of a condensable fluid (the saturation temperature of a pure fluid)."""
    return float(fluid.t_max) if _condensable(fluid) == "pure" else float(fluid.t_dew)


@dataclass(frozen=True)
class Stream:
    """One stream entering the exchanger.

    Parameters
    ----------
    fluid : Fluid
        A fluid from :mod:`revamp.fluids`.
    flow : float, ndarray or str
        Mass flow of the whole stream [kg/s], > 0.
    t_in : float, ndarray or str, optional
        Inlet temperature [K]. Required for a liquid or a superheated vapour; for a two-phase inlet (``quality``
        given) it may be omitted, and if given it must lie within :data:`SATURATION_TOLERANCE` of the saturation
        temperature at that quality (``t_in`` then holds the saturation temperature).
    quality : float, optional
        Vapour mass fraction of a saturated two-phase inlet, 0..1 (1 = saturated vapour, 0 = saturated liquid). Only
        for a condensable fluid: ``fluids.pure(...)``, ``fluids.water(...)`` or a condensing curve
        (``fluids.condensing_curve(...)``).
    phase : {"liquid", "vapour"}, optional
        ``"vapour"`` marks a superheated (or saturated) vapour inlet at ``t_in``, at or above the dew point; a
        condensable fluid only. ``None`` (default) or ``"liquid"`` is the single-phase liquid stream of every
        exchanger kind.

    Notes
    -----
    A stream is two-phase capable (:attr:`condensing`) when it has a ``quality`` or ``phase="vapour"``;
    :func:`revamp.rate` then rates the exchanger as a condenser. A vapour or two-phase stream takes one inlet
    temperature and one quality (not arrays); its flow may be an array.
    """

    fluid: object
    flow: object
    t_in: object = None
    quality: object = None
    phase: object = None

    def __post_init__(self):
        _check_fluid(self.fluid, "fluid")
        flow = to_si(self.flow, "mass_flow", "flow")
        require(flow, "flow", gt=0, what="a mass flow")
        object.__setattr__(self, "flow", flow)
        phase = self.phase
        if phase == "vapor":
            phase = "vapour"
        if phase is not None and phase not in _PHASES:
            raise InputError("phase", self.phase, "None, 'liquid' or 'vapour' (a superheated or saturated vapour "
                             "inlet at t_in)")
        object.__setattr__(self, "phase", phase)
        if self.quality is None and phase != "vapour":
            if self.t_in is None:
                raise InputError("t_in", None, "an inlet temperature (a two-phase inlet gives quality= instead)")
            t_in = to_si(self.t_in, "temperature", "t_in")
            require(t_in, "t_in", gt=0, what="an absolute temperature [K]")
            object.__setattr__(self, "t_in", t_in)
            return
        kind = _condensable(self.fluid)
        field = "quality" if self.quality is not None else "phase"
        if kind is None:
            raise InputError(field, self.quality if self.quality is not None else phase,
                             "given only for a condensable fluid: fluids.pure(...), fluids.water(...) or "
                             "fluids.condensing_curve(...)")
        if self.quality is not None and phase == "liquid":
            raise InputError("phase", phase, "None or 'vapour' with a quality (a two-phase inlet)")
        if self.quality is not None:
            if phase == "vapour":
                raise InputError("phase", phase, "omitted when quality is given (quality=1.0 is a saturated vapour)")
            x = to_si(self.quality, "dimensionless", "quality")
            if np.ndim(x) != 0:
                raise InputError("quality", self.quality, "one vapour fraction (not an array)")
            x = float(require(x, "quality", ge=0.0, le=1.0, what="a vapour mass fraction"))
            object.__setattr__(self, "quality", x)
            t_sat = saturation_temperature(self.fluid, x)
            if self.t_in is not None:
                t_in = to_si(self.t_in, "temperature", "t_in")
                if np.ndim(t_in) != 0 or abs(float(t_in) - t_sat) > SATURATION_TOLERANCE:
                    raise InputError("t_in", self.t_in, f"omitted, or the saturation temperature {t_sat:.2f} K at "
                                     f"quality {x:g} (within {SATURATION_TOLERANCE:g} K): a two-phase inlet is "
                                     "saturated")
            object.__setattr__(self, "t_in", t_sat)
            return
        if self.t_in is None:
            raise InputError("t_in", None, "the vapour inlet temperature (phase='vapour')")
        t_in = to_si(self.t_in, "temperature", "t_in")
        if np.ndim(t_in) != 0:
            raise InputError("t_in", self.t_in, "one inlet temperature for a vapour stream (not an array)")
        t_dew = dew_point(self.fluid)
        if float(t_in) < t_dew - SATURATION_TOLERANCE:
            raise InputError("t_in", self.t_in, f"at or above the dew point {t_dew:.2f} K of {self.fluid.name} "
                             "(a vapour inlet); a two-phase inlet gives quality= instead")
        object.__setattr__(self, "t_in", max(float(t_in), t_dew))

    @property
    def condensing(self) -> bool:
        """True for a vapour or two-phase inlet (rated as a condensing stream)."""
        return self.quality is not None or self.phase == "vapour"

    def replace(self, **changes) -> "Stream":
        """A copy with some fields changed (validated again). A two-phase stream given another fluid takes the
        saturation temperature of the new fluid unless ``t_in`` is given too."""
        if self.quality is not None and "fluid" in changes and "t_in" not in changes:
            changes["t_in"] = None
        return dataclasses.replace(self, **changes)


def _with_prefix(prefix, fn, *args, **kwargs):
    try:
        return fn(*args, **kwargs)
    except InputError as exc:
        raise exc.with_prefix(prefix) from None


@dataclass(frozen=True)
class Service:
    """The two streams of an exchanger and the fouling on each side.

    Parameters
    ----------
    shell, tube : Stream
        The shell-side and tube-side streams.
    fouling_shell, fouling_tube : float, ndarray or str
        Fouling resistance on the outside (shell-side) and inside (tube-side) tube surfaces [m²K/W], >= 0,
        each on its own surface (the rating refers the tube-side value to the outside area).
    """

    shell: Stream
    tube: Stream
    fouling_shell: object = 0.0
    fouling_tube: object = 0.0

    def __post_init__(self):
        for side in ("shell", "tube"):
            if not isinstance(getattr(self, side), Stream):
                raise InputError(side, getattr(self, side), "a revamp.Stream(fluid, flow, t_in)")
        for name in ("fouling_shell", "fouling_tube"):
            value = to_si(getattr(self, name), "fouling", name)
            require(value, name, ge=0, what="a fouling resistance")
            object.__setattr__(self, name, value)

    def replace(self, **changes) -> "Service":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)

    def scaled(self, throughput=1.0, side: str = "both") -> "Service":
        """The service at another throughput: flows multiplied by ``throughput``.

        Parameters
        ----------
        throughput : float or ndarray
            Flow multiplier, > 0 (1.2 for 20 % more).
        side : {"both", "shell", "tube"}
            Which streams scale.
        """
        if side not in ("both", "shell", "tube"):
            raise InputError("side", side, "'both', 'shell' or 'tube'")
        factor = to_si(throughput, "dimensionless", "throughput")
        require(factor, "throughput", gt=0, what="a flow multiplier")
        shell, tube = self.shell, self.tube
        if side in ("both", "shell"):
            shell = shell.replace(flow=np.multiply(shell.flow, factor))
        if side in ("both", "tube"):
            tube = tube.replace(flow=np.multiply(tube.flow, factor))
        return self.replace(shell=shell, tube=tube)

    def clean(self, side: str = "both", residual=0.0) -> "Service":
        """The service with one or both sides cleaned to ``residual`` fouling [m²K/W]."""
        if side not in ("both", "shell", "tube"):
            raise InputError("side", side, "'both', 'shell' or 'tube'")
        changes = {}
        if side in ("both", "shell"):
            changes["fouling_shell"] = residual
        if side in ("both", "tube"):
            changes["fouling_tube"] = residual
        return self.replace(**changes)
