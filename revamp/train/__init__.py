"""The preheat train as one network (studies layer, above :func:`revamp.rate`).

:class:`Train` holds the streams at their supply conditions, the exchangers with the stream on each side
(:class:`Match`), each stream's route, named points (:class:`Point`), parallel branches (:class:`Split`) and the
:class:`Furnace`. :meth:`Train.solve` rates every exchanger at the inlets the network gives it (all cases of a sweep in
one vectorized call per exchanger and iteration) and returns a :class:`TrainResult`; :func:`compare_train` re-solves
the train for sets of options and :func:`max_throughput` finds the largest flow factor every limit allows.
"""
from .network import Furnace, Match, Point, Split, Train
from .result import LimitCheck, TrainResult
from .solver import enthalpy_change, solve
from .study import Throughput, TrainStudy, compare_train, max_throughput

__all__ = ["Furnace", "LimitCheck", "Match", "Point", "Split", "Throughput", "Train", "TrainResult", "TrainStudy",
           "compare_train", "enthalpy_change", "max_throughput", "solve"]
