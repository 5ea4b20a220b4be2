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

__all__ = ["Stream", "Service"]


def _check_fluid(fluid, field):
    # asked of the class first: a fluid whose range is a lazy property (CoolProp's) is not loaded just to be checked
    has = lambda name: hasattr(type(fluid), name) or hasattr(fluid, name)  # noqa: E731
    if not (has("props") and has("t_min") and has("t_max")):
        raise InputError(field, fluid, "a fluid from revamp.fluids (water(), pure(), petroleum(), table(), constant())")


@dataclass(frozen=True)
class Stream:
    """One stream entering the exchanger.

    Parameters
    ----------
    fluid : Fluid
        A fluid from :mod:`revamp.fluids`.
    flow : float, ndarray or str
        Mass flow of the whole stream [kg/s], > 0.
    t_in : float, ndarray or str
        Inlet temperature [K].
    """

    fluid: object
    flow: object
    t_in: object

    def __post_init__(self):
        _check_fluid(self.fluid, "fluid")
        flow = to_si(self.flow, "mass_flow", "flow")
        require(flow, "flow", gt=0, what="a mass flow")
        t_in = to_si(self.t_in, "temperature", "t_in")
        require(t_in, "t_in", gt=0, what="an absolute temperature [K]")
        object.__setattr__(self, "flow", flow)
        object.__setattr__(self, "t_in", t_in)

    def replace(self, **changes) -> "Stream":
        """A copy with some fields changed (validated again)."""
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
