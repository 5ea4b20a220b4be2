"""The service of an air cooler: the tube-side stream, the ambient air and the fouling (layer 2, inputs).

Examples
--------
>>> from revamp import fluids
>>> from revamp.service import Stream
>>> oil = fluids.constant(density=800, heat_capacity=2300, viscosity=1e-3, conductivity=0.12)
>>> svc = AirService(tube=Stream(oil, "25 kg/s", "150 degC"), air_in="35 degC", air_flow="420 kg/s")
>>> round(svc.air_in, 2), svc.air_flow
(308.15, 420.0)
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .service import Stream
from .units import require, to_si

__all__ = ["AirService"]


@dataclass(frozen=True)
class AirService:
    """The tube-side stream of an air cooler, the ambient air and the fouling of each side.

    Give the air as a mass flow (``air_flow``, all bays together) or as a face velocity (``face_velocity``, the
    velocity of the ambient air approaching the bundles' face area); exactly one of the two. Flows, temperatures and
    fouling may be arrays (a sweep).

    Parameters
    ----------
    tube : Stream
        The process stream in the tubes.
    air_in : float, ndarray or str
        Ambient (air inlet) temperature [K].
    air_flow : float, ndarray or str, optional
        Air mass flow, all bays [kg/s].
    face_velocity : float, ndarray or str, optional
        Air velocity at the bundle face, at the inlet density [m/s].
    altitude : float or str
        Site altitude [m] (air pressure from the standard atmosphere), -500 to 5000 m.
    fouling_tube : float, ndarray or str
        Fouling resistance on the tube inside surface [m²K/W].
    fouling_air : float, ndarray or str
        Fouling resistance on the air-side (finned) surface [m²K/W]; the rating refers it to the bare outside-tube
        area through the finned surface's efficiency.
    """

    tube: Stream
    air_in: object
    air_flow: object = None
    face_velocity: object = None
    altitude: object = 0.0
    fouling_tube: object = 0.0
    fouling_air: object = 0.0

    def __post_init__(self):
        if not isinstance(self.tube, Stream):
            raise InputError("tube", self.tube, "a revamp.Stream(fluid, flow, t_in)")
        t = to_si(self.air_in, "temperature", "air_in")
        require(t, "air_in", gt=200.0, lt=400.0, what="an ambient temperature [K]")
        object.__setattr__(self, "air_in", t)
        if (self.air_flow is None) == (self.face_velocity is None):
            raise InputError("air_flow", self.air_flow, "given, or face_velocity given instead (exactly one of them)")
        if self.air_flow is not None:
            m = to_si(self.air_flow, "mass_flow", "air_flow")
            object.__setattr__(self, "air_flow", require(m, "air_flow", gt=0, what="a mass flow"))
        else:
            v = to_si(self.face_velocity, "velocity", "face_velocity")
            object.__setattr__(self, "face_velocity", require(v, "face_velocity", gt=0, what="a velocity"))
        z = to_si(self.altitude, "length", "altitude")
        if np.ndim(z) != 0:
            raise InputError("altitude", self.altitude, "one altitude (not an array)")
        object.__setattr__(self, "altitude", float(require(z, "altitude", ge=-500.0, le=5000.0, what="an altitude [m]")))
        for name in ("fouling_tube", "fouling_air"):
            value = to_si(getattr(self, name), "fouling", name)
            object.__setattr__(self, name, require(value, name, ge=0, what="a fouling resistance"))

    def replace(self, **changes) -> "AirService":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)

    def scaled(self, throughput=1.0) -> "AirService":
        """The service with the tube-side flow multiplied by ``throughput``."""
        factor = to_si(throughput, "dimensionless", "throughput")
        require(factor, "throughput", gt=0, what="a flow multiplier")
        return self.replace(tube=self.tube.replace(flow=np.multiply(self.tube.flow, factor)))

    def clean(self, side: str = "both", residual=0.0) -> "AirService":
        """The service with the air side, the tube side or both cleaned to ``residual`` fouling [m²K/W]."""
        if side not in ("both", "air", "tube"):
            raise InputError("side", side, "'both', 'air' or 'tube'")
        changes = {}
        if side in ("both", "air"):
            changes["fouling_air"] = np.minimum(self.fouling_air, residual)
        if side in ("both", "tube"):
            changes["fouling_tube"] = np.minimum(self.fouling_tube, residual)
        return self.replace(**changes)
