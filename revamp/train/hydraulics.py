"""A stream's pump against the pressure drop of its route: the pump curve given as points, and the check.

A :class:`PumpCurve` is the pump's differential pressure (or head) at a few flows, read off its curve. The train's
solve compares, for each stream that has one, the pressure drop of the stream's route (its exchangers, nozzles
included, the largest branch of a split) with what the pump gives at the stream's flow less a stated allowance for
the fixed parts of the system (piping, control valve, furnace coil). That comparison is a limit of the train
(``"<stream> pump"``), so :func:`revamp.train.max_throughput` finds the flow where the route's pressure drop meets
the pump curve.

Between the points the curve is interpolated piecewise-cubic and monotone (PCHIP: Fritsch & Carlson 1980, with the
interior slopes of Fritsch & Butland 1984 as ``scipy.interpolate.PchipInterpolator`` implements them): it passes
through every point, never rises where the points fall, and never overshoots them. It is not extrapolated: a flow
outside the points' range has no pump pressure, and the check fails there (and says so).

A head is turned into a differential pressure with the stream's density at its supply temperature (the pump draws
the stream before its first exchanger): ``Δp = ρ·g·H``, g the standard acceleration of gravity.

References
----------
Fritsch, F. N., Carlson, R. E. (1980). Monotone piecewise cubic interpolation. *SIAM J. Numer. Anal.* 17(2),
238-246.
Fritsch, F. N., Butland, J. (1984). A method for constructing local monotone piecewise cubic interpolants. *SIAM J.
Sci. Stat. Comput.* 5(2), 300-304.
Karassik, I. J., Messina, J. P., Cooper, P., Heald, C. C. (2008). *Pump Handbook*, 4th ed., McGraw-Hill (head and
differential pressure; the operating point where the system curve meets the pump curve).
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..units import require, to_si

__all__ = ["G_STANDARD", "PumpCurve", "pump_available"]

#: Standard acceleration of gravity [m/s²] (3rd CGPM, 1901), for head -> differential pressure.
G_STANDARD = 9.80665

#: Fewest points of a pump curve: three, so that the curve has a shape (common practice, no source).
MIN_POINTS = 3


def _flow_points(values, path):
    """The flows in SI and their kind: all mass flows [kg/s] or all volume flows [m³/s]."""
    if isinstance(values, (str, bytes)) or not hasattr(values, "__len__"):
        raise InputError(path, values, f"a list of {MIN_POINTS} or more flows, e.g. ['100 m**3/h', '200 m**3/h', ...]")
    out, kinds = [], []
    for i, v in enumerate(values):
        p = f"{path}[{i}]"
        if isinstance(v, str):
            try:
                out.append(float(to_si(v, "volume_flow", p)))
                kinds.append("volume_flow")
            except InputError as first:
                try:
                    out.append(float(to_si(v, "mass_flow", p)))
                    kinds.append("mass_flow")
                except InputError:
                    why = str(first.allowed).split("; ", 1)
                    raise InputError(p, v, "a volume flow (e.g. '120 m**3/h') or a mass flow (e.g. '30 kg/s')"
                                     + (f"; {why[1]}" if len(why) > 1 else "")) from None
        else:
            x = to_si(v, "volume_flow", p)
            if np.ndim(x) != 0:
                raise InputError(p, v, "one flow, not an array")
            out.append(float(x))
            kinds.append("volume_flow")  # a bare number is SI: m³/s
    if len(set(kinds)) > 1:
        i = next(j for j, k in enumerate(kinds) if k != kinds[0])
        raise InputError(f"{path}[{i}]", values[i], f"a flow of the same kind as {path}[0] "
                                                    f"({kinds[0].replace('_', ' ')}): all volume or all mass flows")
    return np.asarray(out, float), (kinds[0] if kinds else "volume_flow")


@dataclass(frozen=True)
class PumpCurve:
    """A pump's curve as points: differential pressure (or head) at increasing flows.

    Parameters
    ----------
    flow : sequence of float or str
        Flows of the points, increasing: volume flows (``"120 m**3/h"``; a bare number is [m³/s]) or mass flows
        (``"30 kg/s"``, ``"43800 lb/h"``), all of one kind.
    dp : sequence of float or str, optional
        The pump's differential pressure at each flow [Pa], not rising with flow.
    head : sequence of float or str, optional
        Or its head at each flow [m] (exactly one of ``dp`` and ``head``), not rising with flow.
    allowance : float or str, optional
        Pressure the fixed parts of the system take from the pump whatever the exchangers do (piping, control
        valve, furnace coil) [Pa]; taken off the pump's pressure before it is compared with the route. Default 0.

    Attributes
    ----------
    flow_kind : str
        ``"volume_flow"`` or ``"mass_flow"``.
    """

    flow: object
    dp: object = None
    head: object = None
    allowance: object = 0.0
    flow_kind: str = dataclasses.field(default="volume_flow", init=False)

    def __post_init__(self):
        q, kind = _flow_points(self.flow, "flow")
        if len(q) < MIN_POINTS:
            raise InputError("flow", list(self.flow), f"{MIN_POINTS} or more points read off the pump's curve")
        if (self.dp is None) == (self.head is None):
            raise InputError("dp", self.dp, "the pump's differential pressure at each flow, or its head (exactly "
                                            "one of dp and head)")
        name, qty, what = ("dp", "pressure", "a differential pressure") if self.head is None else \
            ("head", "length", "a head")
        given = getattr(self, name)
        if isinstance(given, (str, bytes)) or not hasattr(given, "__len__"):
            raise InputError(name, given, f"a list of {len(q)} values, one per flow")
        if len(given) != len(q):
            raise InputError(name, f"{len(given)} value(s)", f"one value per flow ({len(q)})")
        y = []
        for i, v in enumerate(given):
            x = to_si(v, qty, f"{name}[{i}]")
            if np.ndim(x) != 0:
                raise InputError(f"{name}[{i}]", v, "one value, not an array")
            y.append(float(require(x, f"{name}[{i}]", ge=0, what=what)))
        y = np.asarray(y)
        for i, v in enumerate(q):
            require(v, f"flow[{i}]", ge=0, what="a flow")
        for i in range(1, len(q)):
            if not q[i] > q[i - 1]:
                raise InputError(f"flow[{i}]", self.flow[i], f"a flow above the one before it (flow[{i - 1}] = "
                                                             f"{self.flow[i - 1]!r}): points in increasing flow")
            if y[i] > y[i - 1]:
                raise InputError(f"{name}[{i}]", given[i], f"at most the value before it ({name}[{i - 1}] = "
                                                           f"{given[i - 1]!r}): a pump curve that does not rise "
                                                           f"with flow")
        if not y[0] > 0:
            raise InputError(f"{name}[0]", given[0], f"{what} above zero at the first point")
        allowance = to_si(0.0 if self.allowance is None else self.allowance, "pressure", "allowance")
        if np.ndim(allowance) != 0:
            raise InputError("allowance", self.allowance, "one pressure")
        require(allowance, "allowance", ge=0, what="a pressure taken by the fixed parts of the system")
        object.__setattr__(self, "flow", q)
        object.__setattr__(self, name, y)
        object.__setattr__(self, "allowance", float(allowance))
        object.__setattr__(self, "flow_kind", kind)

    @property
    def quantity(self) -> str:
        """``"dp"`` or ``"head"``: what the points give."""
        return "dp" if self.head is None else "head"

    def _interpolant(self):
        from scipy.interpolate import PchipInterpolator

        y = self.dp if self.head is None else self.head
        return PchipInterpolator(self.flow, y, extrapolate=False)

    def at(self, flow):
        """The curve's value at ``flow`` (in the curve's own flow kind, SI) by PCHIP: [Pa] or [m]; NaN outside the
        points' range (never extrapolated)."""
        return self._interpolant()(np.asarray(flow, float))

    def pressure(self, mass_flow, density):
        """The pump's differential pressure at a stream's mass flow [Pa], before the allowance.

        Parameters
        ----------
        mass_flow : float or ndarray
            The stream's flow [kg/s].
        density : float or ndarray
            Its density at the pump [kg/m³] (turns a mass flow into a volume flow, a head into a pressure).
        """
        m = np.asarray(mass_flow, float)
        rho = np.asarray(density, float)
        q = m / rho if self.flow_kind == "volume_flow" else m
        y = self.at(q)
        return y if self.head is None else rho * G_STANDARD * y

    def available(self, mass_flow, density):
        """What the pump leaves for the exchangers at a stream's flow: its differential pressure less the
        allowance [Pa] (NaN outside the curve's flow range)."""
        return self.pressure(mass_flow, density) - self.allowance

    def flow_range(self) -> tuple:
        """The first and last points' flows (SI, in the curve's flow kind)."""
        return float(self.flow[0]), float(self.flow[-1])


def pump_available(curve: PumpCurve, fluid, mass_flow, t_supply, name: str) -> tuple:
    """``(available, density, warnings)`` of a stream's pump, per case.

    Parameters
    ----------
    curve : PumpCurve
    fluid : Fluid
        The stream's fluid.
    mass_flow, t_supply : ndarray
        The stream's flow [kg/s] and supply temperature [K] per case.
    name : str
        The stream's name (for the warning).

    Returns
    -------
    available : ndarray
        The pump's differential pressure less the allowance [Pa] (NaN where the flow lies outside the curve).
    density : ndarray
        The stream's density at its supply temperature [kg/m³].
    warnings : list of str
    """
    rho = np.broadcast_to(np.asarray(fluid.props(np.asarray(t_supply, float)).density, float),
                          np.shape(mass_flow))
    avail = np.asarray(curve.available(mass_flow, rho), float)
    out = np.isnan(avail) & np.isfinite(np.asarray(mass_flow, float))
    warnings = []
    if np.any(out):
        lo, hi = curve.flow_range()
        if curve.flow_kind == "volume_flow":
            flows = np.asarray(mass_flow, float)[out] / rho[out] * 3600.0
            unit, lo, hi = "m³/h", lo * 3600.0, hi * 3600.0
        else:
            flows, unit = np.asarray(mass_flow, float)[out], "kg/s"
        warnings.append(f"{name} pump: the flow ({flows.min():.4g}..{flows.max():.4g} {unit}) lies outside the pump "
                        f"curve's points ({lo:.4g}..{hi:.4g} {unit}) in {int(np.sum(out))} case(s): the curve is not "
                        f"extrapolated, so the pump check fails there")
    return avail, rho, warnings
