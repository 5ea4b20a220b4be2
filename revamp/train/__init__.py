"""The preheat train as one network (studies layer, above :func:`revamp.rate`).

:class:`Train` holds the streams at their supply conditions, the exchangers with the stream on each side
(:class:`Match`; an air cooler's air as :class:`AirSide`), each stream's route, named points (:class:`Point`),
parallel branches (:class:`Split`) and the
:class:`Furnace`. :meth:`Train.solve` rates every exchanger at the inlets the network gives it (all cases of a sweep in
one vectorized call per exchanger and iteration) and returns a :class:`TrainResult`; :func:`compare_train` re-solves
the train for sets of options and :func:`max_throughput` finds the largest flow factor every limit allows.

Examples
--------
Two exchangers heating a crude-like oil with a residue-like oil that meets them in the reverse order (an
interlinked pair; invented constant properties):

>>> import revamp as rv
>>> crude = rv.fluids.constant(density=830, heat_capacity=2300, viscosity=2e-3, conductivity=0.12)
>>> resid = rv.fluids.constant(density=900, heat_capacity=2600, viscosity=4e-3, conductivity=0.11)
>>> hx = rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
...                      tube_count=500, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="450 mm",
...                      baffle_cut=0.25, tube_material=45.0)
>>> train = rv.Train(streams={"crude": rv.Stream(crude, "60 kg/s", "35 degC"),
...                           "resid": rv.Stream(resid, "30 kg/s", "340 degC")},
...                  exchangers={"E-1": rv.Match(hx, shell="resid", tube="crude", fouling_tube=5e-4),
...                              "E-2": rv.Match(hx, shell="resid", tube="crude", fouling_tube=5e-4)},
...                  routes={"crude": ["E-1", "E-2"], "resid": ["E-2", "E-1"]},
...                  furnace=rv.Furnace("crude", "360 degC", efficiency=0.85))
>>> res = train.solve()
>>> bool(res.converged), list(res.exchangers.index)
(True, ['E-1', 'E-2'])
>>> # what the residue gives, the crude takes (energy balance), and the crude leaves E-1 into E-2
>>> bool(abs(res.streams["duty"].sum()) < 1e-6 * res.streams.loc["crude", "duty"])
True
>>> bool(abs(res.exchangers.loc["E-2", "t_in_tube"] - res.exchangers.loc["E-1", "t_out_tube"]) < 1e-5)
True
"""
from .hydraulics import PumpCurve
from .network import AirSide, Furnace, Match, Point, Split, Train
from .result import LimitCheck, TrainResult
from .solver import enthalpy_change, solve
from .study import NetworkServices, Throughput, TrainStudy, compare_train, max_throughput, network_services

__all__ = ["AirSide", "Furnace", "LimitCheck", "Match", "NetworkServices", "Point", "PumpCurve", "Split", "Throughput",
           "Train", "TrainResult",
           "TrainStudy", "compare_train", "enthalpy_change", "max_throughput", "network_services", "solve"]
