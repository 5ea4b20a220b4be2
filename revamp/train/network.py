"""The preheat train as one network: streams, matches (an exchanger between two streams), routes, the furnace.

A :class:`Train` names its streams (supply conditions), the exchangers with the stream on each side
(:class:`Match`), the order in which each stream meets its exchangers (``routes``), and optionally the furnace that
heats one stream after its last exchanger. A route is a list of exchanger tags, named points (:class:`Point`, e.g.
the desalter, with an allowed temperature band) and parallel branches (:class:`Split`, given flow fractions, a remix
after them). Every input is checked when the train is built; a bad network raises an :class:`InputError` that names
the path of the inconsistency (``routes['crude'][2]``, ``exchangers['E-102'].shell``, ``furnace.stream``).

An air cooler (:class:`revamp.AirCooler`) is a match too, with one stream only: its ``tube`` stream, cooled by
ambient air that is a utility of the match (:class:`AirSide`: ambient, air flow or face velocity, fouling), not a
stream of the train. It is usually a stream's rundown cooler, the last item of that stream's route.

References
----------
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
optimal management of cleaning. *Energy & Fuels* 15, 1038-1056 (the preheat train as a network of rated exchangers).
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError
from ..service import Service, Stream
from ..units import require, to_si

__all__ = ["AirSide", "Match", "Furnace", "Point", "Split", "Train"]


def _temperature_or_none(value, path):
    if value is None:
        return None
    t = to_si(value, "temperature", path)
    if np.ndim(t) != 0:
        raise InputError(path, value, "one temperature, not an array")
    return float(require(t, path, gt=0, what="an absolute temperature [K]"))


def _pressure_or_none(value, path):
    if value is None:
        return None
    p = to_si(value, "pressure", path)
    if np.ndim(p) != 0:
        raise InputError(path, value, "one pressure difference, not an array")
    return float(require(p, path, gt=0, what="an allowed pressure drop"))


@dataclass(frozen=True)
class AirSide:
    """The air of an air cooler in a train: a utility at a stated ambient, not a stream of the train.

    Give the air as a mass flow (``air_flow``, all bays) or as a face velocity (``face_velocity``); exactly one of the
    two. Ambient, air flow and fouling may be arrays that broadcast with the train's cases (an ambient sweep).

    Parameters
    ----------
    air_in : float, ndarray or str
        Ambient (air inlet) temperature [K].
    air_flow : float, ndarray or str, optional
        Air mass flow, all bays [kg/s].
    face_velocity : float, ndarray or str, optional
        Air velocity at the bundle face, at the inlet density [m/s].
    altitude : float or str
        Site altitude [m].
    fouling : float, ndarray or str
        Air-side (finned surface) fouling resistance [m²K/W].

    Notes
    -----
    The checks are those of :class:`revamp.AirService` (its ``air_in``, ``air_flow``, ``face_velocity``,
    ``altitude`` and ``fouling_air``), whose error paths are given here under this class's own field names.
    """

    air_in: object
    air_flow: object = None
    face_velocity: object = None
    altitude: object = 0.0
    fouling: object = 0.0

    _NAMES = {"air_in": "air_in", "air_flow": "air_flow", "face_velocity": "face_velocity", "altitude": "altitude",
              "fouling_air": "fouling"}

    def __post_init__(self):
        from ..fluids import constant
        from ..service_air import AirService

        probe = Stream(constant(density=1.0, heat_capacity=1.0, viscosity=1.0, conductivity=1.0), 1.0, 300.0)
        try:  # the one place the air's rules live: AirService
            svc = AirService(tube=probe, air_in=self.air_in, air_flow=self.air_flow,
                             face_velocity=self.face_velocity, altitude=self.altitude, fouling_air=self.fouling)
        except InputError as exc:
            raise InputError(self._NAMES.get(exc.field, exc.field), exc.value, exc.allowed) from None
        for name, value in (("air_in", svc.air_in), ("air_flow", svc.air_flow), ("face_velocity", svc.face_velocity),
                            ("altitude", svc.altitude), ("fouling", svc.fouling_air)):
            object.__setattr__(self, name, value)

    @classmethod
    def of(cls, service) -> "AirSide":
        """The air of an :class:`revamp.AirService` (its tube stream and tube fouling left out)."""
        return cls(air_in=service.air_in, air_flow=service.air_flow, face_velocity=service.face_velocity,
                   altitude=service.altitude, fouling=service.fouling_air)

    def service(self, tube: Stream, fouling_tube=0.0):
        """The :class:`revamp.AirService` of this air with a tube stream."""
        from ..service_air import AirService

        return AirService(tube=tube, air_in=self.air_in, air_flow=self.air_flow, face_velocity=self.face_velocity,
                          altitude=self.altitude, fouling_tube=fouling_tube, fouling_air=self.fouling)

    def replace(self, **changes) -> "AirSide":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)


def _is_air_cooler(exchanger) -> bool:
    return getattr(type(exchanger), "kind", None) == "air cooler"


@dataclass(frozen=True)
class Match:
    """One exchanger of the train and the stream on each of its sides.

    Parameters
    ----------
    exchanger : ShellAndTube or AirCooler
        The exchanger as built.
    shell, tube : str
        Names of the streams (keys of ``Train.streams``) on the shell and tube sides. An air cooler has a ``tube``
        stream only (``shell`` left out).
    fouling_shell, fouling_tube : float, ndarray or str
        Fouling resistance on each side [m²K/W] (arrays broadcast with the train's cases).
    dp_max_shell, dp_max_tube : float or str, optional
        Allowed pressure drop of each side [Pa]; checked in the result and by ``max_throughput``.
    air : AirSide, optional
        The air of an air cooler (required for one, refused for a shell-and-tube exchanger).

    Examples
    --------
    An air cooler as the rundown cooler of a product stream (``Match(ac, tube="diesel", air=AirSide("35 degC",
    air_flow="200 kg/s"), fouling_tube=2e-4)``): see ``tests/test_train_aircooler.py``.
    """

    exchanger: object
    shell: str | None = None
    tube: str | None = None
    fouling_shell: object = 0.0
    fouling_tube: object = 0.0
    dp_max_shell: object = None
    dp_max_tube: object = None
    air: AirSide | None = None

    def __post_init__(self):
        if _is_air_cooler(self.exchanger):
            if not isinstance(self.air, AirSide):
                raise InputError("air", self.air, "a revamp.train.AirSide(air_in=..., air_flow=... or "
                                                  "face_velocity=...): the air of the air cooler")
            given = [n for n in ("shell", "dp_max_shell") if getattr(self, n) is not None]
            if np.any(np.asarray(to_si(self.fouling_shell, "fouling", "fouling_shell")) != 0):
                given.append("fouling_shell")
            if given:
                raise InputError(given[0], getattr(self, given[0]), "left out: an air cooler has a tube stream and "
                                                                    "the air (air=AirSide(...)), no shell side")
        elif hasattr(self.exchanger, "bell") and hasattr(self.exchanger, "tube_od"):
            if self.air is not None:
                raise InputError("air", self.air, "left out: only an air cooler takes air=AirSide(...)")
        else:
            raise InputError("exchanger", self.exchanger, "a revamp.ShellAndTube or a revamp.AirCooler")
        for side in self.sides:
            if not isinstance(getattr(self, side), str) or not getattr(self, side):
                raise InputError(side, getattr(self, side), "the name of a stream of the train")
        if self.shell == self.tube:
            raise InputError("tube", self.tube, f"another stream than the shell side's ({self.shell!r})")
        for name in ("fouling_shell", "fouling_tube"):
            value = to_si(getattr(self, name), "fouling", name)
            require(value, name, ge=0, what="a fouling resistance")
            object.__setattr__(self, name, value)
        for name in ("dp_max_shell", "dp_max_tube"):
            object.__setattr__(self, name, _pressure_or_none(getattr(self, name), name))

    @property
    def is_air_cooler(self) -> bool:
        """Whether the exchanger is an air cooler (one stream, the air a utility)."""
        return self.air is not None

    @property
    def sides(self) -> tuple:
        """The sides that carry a stream of the train: ``("shell", "tube")``, or ``("tube",)`` for an air cooler."""
        return ("tube",) if _is_air_cooler(self.exchanger) else ("shell", "tube")

    def replace(self, **changes) -> "Match":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)

    def side_of(self, stream: str) -> str:
        """``"shell"`` or ``"tube"``: the side that carries ``stream``."""
        return "shell" if self.shell == stream else "tube"


@dataclass(frozen=True)
class Furnace:
    """The fired heater after the last exchanger of one stream's route.

    Parameters
    ----------
    stream : str
        The stream it heats (usually the crude).
    outlet : float or str
        Coil outlet temperature [K].
    efficiency : float
        Fired efficiency [-], 0 < efficiency <= 1 (fired duty = absorbed duty / efficiency).
    max_duty : float or str, optional
        Largest fired duty [W] (a throughput limit).
    """

    stream: str
    outlet: object
    efficiency: float = 1.0
    max_duty: object = None

    def __post_init__(self):
        if not isinstance(self.stream, str) or not self.stream:
            raise InputError("stream", self.stream, "the name of a stream of the train")
        object.__setattr__(self, "outlet", _temperature_or_none(self.outlet, "outlet"))
        eff = to_si(self.efficiency, "dimensionless", "efficiency")
        object.__setattr__(self, "efficiency", float(require(eff, "efficiency", gt=0, le=1)))
        if self.max_duty is not None:
            q = to_si(self.max_duty, "power", "max_duty")
            object.__setattr__(self, "max_duty", float(require(q, "max_duty", gt=0, what="a duty")))


@dataclass(frozen=True)
class Point:
    """A named point on a route (the desalter, a flash drum), with an allowed temperature band.

    Parameters
    ----------
    name : str
    t_min, t_max : float or str, optional
        Allowed band [K]; the solved temperature is reported and checked against it.
    """

    name: str
    t_min: object = None
    t_max: object = None

    def __post_init__(self):
        if not isinstance(self.name, str) or not self.name:
            raise InputError("name", self.name, "a non-empty name")
        lo = _temperature_or_none(self.t_min, "t_min")
        hi = _temperature_or_none(self.t_max, "t_max")
        if lo is not None and hi is not None and hi <= lo:
            raise InputError("t_max", self.t_max, f"above t_min ({lo:.2f} K)")
        object.__setattr__(self, "t_min", lo)
        object.__setattr__(self, "t_max", hi)


@dataclass(frozen=True)
class Split:
    """Parallel branches on a route: the stream splits in given fractions and remixes after the branches.

    Parameters
    ----------
    branches : sequence of sequences of str
        Exchanger tags of each branch, in flow order (an empty branch is a bypass).
    fractions : sequence of float or "equal_dp"
        Share of the stream's flow in each branch [-], > 0, summing to 1 (the flows balance at the remix); or
        ``"equal_dp"``: the shares that give every branch the same pressure drop (found by the solve, per case;
        no empty branch then).
    """

    branches: tuple
    fractions: tuple
    equal_dp: bool = field(default=False, init=False)

    def __post_init__(self):
        branches = self.branches
        if isinstance(branches, str) or not hasattr(branches, "__len__") or len(branches) < 2:
            raise InputError("branches", branches, "two or more branches, each a list of exchanger tags")
        clean = []
        for i, branch in enumerate(branches):
            if isinstance(branch, str) or not hasattr(branch, "__iter__"):
                raise InputError(f"branches[{i}]", branch, "a list of exchanger tags (empty for a bypass)")
            for j, tag in enumerate(branch):
                if not isinstance(tag, str):
                    raise InputError(f"branches[{i}][{j}]", tag, "an exchanger tag")
            clean.append(tuple(branch))
        object.__setattr__(self, "branches", tuple(clean))
        fr = self.fractions
        if isinstance(fr, str) and fr == "equal_dp":
            for i, branch in enumerate(clean):
                if not branch:
                    raise InputError(f"branches[{i}]", [], "exchanger tags (an equal-pressure-drop split has no "
                                                          "empty branch: a bypass has no pressure drop)")
            object.__setattr__(self, "equal_dp", True)
            fr = [1.0 / len(clean)] * len(clean)
        if isinstance(fr, str) or not hasattr(fr, "__len__") or len(fr) != len(clean):
            raise InputError("fractions", fr, f"one fraction per branch ({len(clean)}), or 'equal_dp'")
        values = []
        for i, f in enumerate(fr):
            v = to_si(f, "dimensionless", f"fractions[{i}]")
            if np.ndim(v) != 0:
                raise InputError(f"fractions[{i}]", f, "one number")
            values.append(float(require(v, f"fractions[{i}]", gt=0, lt=1)))
        if abs(sum(values) - 1.0) > 1e-9 and not self.equal_dp:
            raise InputError("fractions", list(fr), f"fractions summing to 1 so that the flows balance at the remix "
                                                    f"(they sum to {sum(values):.6g})")
        object.__setattr__(self, "fractions", tuple(values))


@dataclass(frozen=True)
class Train:
    """A preheat train: streams, exchangers, routes and the furnace, solved as one network by :meth:`solve`.

    Parameters
    ----------
    streams : dict of str -> Stream
        Each stream at its supply conditions (flow [kg/s], supply temperature [K]); arrays broadcast (sweeps).
    exchangers : dict of str -> Match
        Each exchanger by tag, with the stream on each side and its fouling.
    routes : dict of str -> list
        For each stream, the order in which it meets its exchangers: tags, :class:`Point` and :class:`Split` items.
    furnace : Furnace, optional
    rundown : dict of str -> temperature, optional
        Highest final temperature of a hot stream [K]; a trim cooler takes the rest (its duty is reported).
    dp_max : dict of str -> pressure, optional
        Allowed pressure drop of a stream over its whole route [Pa].
    pump_curves : dict of str -> PumpCurve, optional
        A stream's pump (:class:`revamp.train.PumpCurve`): the route's pressure drop is checked against what the
        pump gives at the stream's flow, less the curve's allowance (a limit ``"<stream> pump"``).
    shell_method : str
        Shell-side method passed to :func:`revamp.rate`.

    Examples
    --------
    See ``revamp.train`` and ``tests/test_train.py``.
    """

    streams: dict
    exchangers: dict
    routes: dict
    furnace: Furnace | None = None
    rundown: dict = field(default_factory=dict)
    dp_max: dict = field(default_factory=dict)
    shell_method: str = "bell-delaware"
    pump_curves: dict = field(default_factory=dict)

    def __post_init__(self):
        streams = self.streams
        if not isinstance(streams, dict) or not streams:
            raise InputError("streams", streams, "a dict of stream name -> revamp.Stream(fluid, flow, t_in)")
        for name, s in streams.items():
            if not isinstance(name, str) or not name:
                raise InputError("streams", name, "stream names that are non-empty strings")
            if not isinstance(s, Stream):
                raise InputError(f"streams[{name!r}]", s, "a revamp.Stream(fluid, flow, t_in)")
        known = sorted(streams)
        if not isinstance(self.exchangers, dict) or not self.exchangers:
            raise InputError("exchangers", self.exchangers, "a dict of tag -> revamp.Match(exchanger, shell=, tube=)")
        for tag, m in self.exchangers.items():
            if not isinstance(m, Match):
                raise InputError(f"exchangers[{tag!r}]", m, "a revamp.Match(exchanger, shell=..., tube=...)")
            for side in m.sides:
                if getattr(m, side) not in streams:
                    raise InputError(f"exchangers[{tag!r}].{side}", getattr(m, side), f"one of the streams {known}")
        if not isinstance(self.routes, dict):
            raise InputError("routes", self.routes, "a dict of stream name -> list of exchanger tags")
        routes = {}
        seen = {}  # (tag, side) -> route path
        points = set()
        for name, route in self.routes.items():
            if name not in streams:
                raise InputError(f"routes[{name!r}]", name, f"a route of one of the streams {known}")
            if isinstance(route, str) or not hasattr(route, "__iter__"):
                raise InputError(f"routes[{name!r}]", route, "a list of exchanger tags, Point and Split items")
            route = tuple(route)
            for i, item in enumerate(route):
                path = f"routes[{name!r}][{i}]"
                if isinstance(item, Point):
                    if item.name in points:
                        raise InputError(f"{path}.name", item.name, "a point name used once in the train")
                    points.add(item.name)
                    continue
                if isinstance(item, Split):
                    tags = [(f"{path}.branches[{b}][{j}]", t) for b, br in enumerate(item.branches)
                            for j, t in enumerate(br)]
                elif isinstance(item, str):
                    tags = [(path, item)]
                else:
                    raise InputError(path, item, "an exchanger tag, a revamp.train.Point or a revamp.train.Split")
                for p, tag in tags:
                    if tag not in self.exchangers:
                        raise InputError(p, tag, f"one of the exchangers {sorted(self.exchangers)}")
                    m = self.exchangers[tag]
                    if name not in [getattr(m, sd) for sd in m.sides]:
                        carries = (f"{m.tube!r} in its tubes, cooled by air" if m.is_air_cooler else
                                   f"{m.shell!r} on the shell side and {m.tube!r} on the tube side")
                        raise InputError(p, tag, f"an exchanger that carries stream {name!r} (it carries {carries})")
                    key = (tag, m.side_of(name))
                    if key in seen:
                        raise InputError(p, tag, f"an exchanger visited once on the route (already at {seen[key]})")
                    seen[key] = p
            routes[name] = route
        for tag, m in self.exchangers.items():
            for side in m.sides:
                if (tag, side) not in seen:
                    raise InputError(f"exchangers[{tag!r}].{side}", getattr(m, side),
                                     f"a stream whose route lists {tag!r} (it is on no route)")
        object.__setattr__(self, "routes", routes)
        if self.furnace is not None:
            if not isinstance(self.furnace, Furnace):
                raise InputError("furnace", self.furnace, "a revamp.Furnace(stream=, outlet=, efficiency=)")
            if self.furnace.stream not in streams:
                raise InputError("furnace.stream", self.furnace.stream, f"one of the streams {known}")
        for name in ("rundown", "dp_max"):
            given = getattr(self, name) or {}
            if not isinstance(given, dict):
                raise InputError(name, given, "a dict of stream name -> limit")
            parsed = {}
            for s, v in given.items():
                if s not in streams:
                    raise InputError(f"{name}[{s!r}]", s, f"one of the streams {known}")
                parsed[s] = (_temperature_or_none if name == "rundown" else _pressure_or_none)(v, f"{name}[{s!r}]")
            object.__setattr__(self, name, parsed)
        from .hydraulics import PumpCurve

        pumps = self.pump_curves or {}
        if not isinstance(pumps, dict):
            raise InputError("pump_curves", pumps, "a dict of stream name -> revamp.train.PumpCurve")
        for s, curve in pumps.items():
            if s not in streams:
                raise InputError(f"pump_curves[{s!r}]", s, f"one of the streams {known}")
            if not isinstance(curve, PumpCurve):
                raise InputError(f"pump_curves[{s!r}]", curve, "a revamp.train.PumpCurve(flow=[...], dp=[...] or "
                                                               "head=[...])")
        object.__setattr__(self, "pump_curves", dict(pumps))
        if not isinstance(self.shell_method, str):
            raise InputError("shell_method", self.shell_method, "a shell-side method name")
        # every case-carrying array must broadcast
        try:
            self.shape
        except ValueError:
            shapes = {f"streams[{n!r}]": (np.shape(s.flow), np.shape(s.t_in)) for n, s in streams.items()}
            raise InputError("streams", shapes, "flows, supply temperatures and fouling of shapes that broadcast") \
                from None

    # ------------------------------------------------------------------------------------------------- helpers
    @property
    def shape(self) -> tuple:
        """The broadcast shape of the cases (``()`` for one case)."""
        shapes = [np.shape(s.flow) for s in self.streams.values()] + [np.shape(s.t_in) for s in self.streams.values()]
        shapes += [np.shape(m.fouling_shell) for m in self.exchangers.values()]
        shapes += [np.shape(m.fouling_tube) for m in self.exchangers.values()]
        shapes += [np.shape(getattr(m.air, f)) for m in self.exchangers.values() if m.air is not None
                   for f in ("air_in", "air_flow", "face_velocity", "fouling")]
        return np.broadcast_shapes(*shapes)

    @property
    def points(self) -> dict:
        """Named points by name: ``{name: (stream, Point)}``."""
        return {item.name: (s, item) for s, route in self.routes.items() for item in route if isinstance(item, Point)}

    def replace(self, **changes) -> "Train":
        """A copy with some fields changed (validated again)."""
        return dataclasses.replace(self, **changes)

    def scaled(self, factor, stream: str) -> "Train":
        """The train with one stream's flow multiplied by ``factor`` (a number or an array: a sweep)."""
        if stream not in self.streams:
            raise InputError("stream", stream, f"one of the streams {sorted(self.streams)}")
        f = to_si(factor, "dimensionless", "factor")
        require(f, "factor", gt=0, what="a flow multiplier")
        s = self.streams[stream]
        return self.replace(streams={**self.streams, stream: s.replace(flow=np.multiply(s.flow, f))})

    def service_of(self, tag: str):
        """The service of one exchanger at its streams' supply conditions and full flows (used by options); an
        :class:`revamp.AirService` for an air cooler."""
        m = self.exchangers[tag]
        if m.is_air_cooler:
            return m.air.service(self.streams[m.tube], m.fouling_tube)
        return Service(shell=self.streams[m.shell], tube=self.streams[m.tube], fouling_shell=m.fouling_shell,
                       fouling_tube=m.fouling_tube)

    def apply(self, options: dict) -> "Train":
        """A new train with options of :mod:`revamp.options` (:mod:`revamp.options_air` for an air cooler) applied to
        some exchangers.

        Parameters
        ----------
        options : dict of str -> option
            Exchanger tag -> option (``Combined(...)`` for several on one exchanger). An option may change the
            exchanger and the fouling of its sides; flows and inlets come from the network.
        """
        if not isinstance(options, dict):
            raise InputError("options", options, "a dict of exchanger tag -> option")
        matches = dict(self.exchangers)
        for tag, opt in options.items():
            path = f"options[{tag!r}]"
            if tag not in matches:
                raise InputError(path, tag, f"one of the exchangers {sorted(matches)}")
            if not (hasattr(opt, "apply") and isinstance(getattr(opt, "label", None), str)):
                raise InputError(path, opt, "an option of revamp.options (with a label and apply())")
            svc = self.service_of(tag)
            try:
                hx, new = opt.apply(matches[tag].exchanger, svc)
            except InputError as exc:
                raise exc.with_prefix(path) from None
            for side in matches[tag].sides:
                a, b = getattr(svc, side), getattr(new, side)
                if not (np.array_equal(a.flow, b.flow) and np.array_equal(a.t_in, b.t_in) and a.fluid is b.fluid):
                    raise InputError(path, opt.label, "an option that changes the exchanger or its fouling only "
                                                      "(the network sets each side's flow and inlet)")
            if matches[tag].is_air_cooler:  # the air is the match's own: a fan upgrade or fin cleaning changes it
                matches[tag] = matches[tag].replace(exchanger=hx, fouling_tube=new.fouling_tube, air=AirSide.of(new))
                continue
            matches[tag] = matches[tag].replace(exchanger=hx, fouling_shell=new.fouling_shell,
                                                fouling_tube=new.fouling_tube)
        return self.replace(exchangers=matches)

    def solve(self, tol=1e-6, max_iter=50):
        """Solve the network: every exchanger rated at its solved inlets, the furnace inlet and fired duty.

        Parameters
        ----------
        tol : float
            Largest change of any exchanger inlet temperature between iterations at convergence [K].
        max_iter : int
            Iterations before the solve stops and reports the cases that did not converge.

        Returns
        -------
        TrainResult
        """
        from .solver import solve

        return solve(self, tol=tol, max_iter=max_iter)

    def max_throughput(self, stream: str | None = None, **kwargs):
        """The largest flow factor on one stream at which every limit still holds; see
        :func:`revamp.train.max_throughput`."""
        from .study import max_throughput

        return max_throughput(self, stream=stream, **kwargs)
