"""Studies on a whole train: options rated by re-solving the network, and the throughput every limit allows.

:func:`compare_train` solves the base train and the train with each set of options (per exchanger, from
:mod:`revamp.options`); the fuel saved is the change of the furnace's fired duty, so that a gain upstream that the
exchangers downstream then lose is not counted twice. :func:`max_throughput` finds the largest flow factor on a stream
at which the furnace duty, every allowed pressure drop and every point band still hold, from a sweep (one solve of
many cases) refined around the first violation.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..economics import Economics, annual_duty_value, project_npv, simple_payback
from ..errors import InputError
from .network import Train
from .result import TrainResult

__all__ = ["NetworkServices", "TrainStudy", "Throughput", "compare_train", "max_throughput", "network_services"]

_RESERVED = {"base"}


@dataclass(frozen=True)
class Throughput:
    """The largest flow factor the train allows.

    Attributes
    ----------
    streams : tuple of str
        The streams whose flows were scaled together.
    factor : float
        Largest factor on their flows at which every limit holds [-] (NaN when none in the searched range does).
    flows : dict of str -> float
        Their flows at that factor [kg/s].
    binding : tuple of str
        The limits that fail just above the factor (empty when the search range ends first).
    resolution : float
        Step of the final search grid [-]: the true limit lies within ``factor .. factor + resolution``.
    searched : tuple of float
        The factor range searched.
    result : TrainResult or None
        The train solved at ``factor``.
    """

    streams: tuple
    factor: float
    flows: dict
    binding: tuple
    resolution: float
    searched: tuple
    result: TrainResult | None = field(default=None, repr=False)

    def describe(self) -> str:
        """One line in words."""
        if not math.isfinite(self.factor):
            return (f"no flow factor in {self.searched[0]:g}..{self.searched[1]:g} meets every limit "
                    f"({', '.join(self.binding) or 'no converged case'})")
        what = ", ".join(self.binding) if self.binding else f"none up to {self.searched[1]:g}× (end of the search)"
        return f"{self.factor:.3f}× the {'+'.join(self.streams)} flow; binding limit: {what}"


def _ok_per_case(res: TrainResult):
    return np.asarray(res.all_ok, bool).reshape(-1)


def _failing(res: TrainResult, i):
    names = [c.name for c in res.limits if not bool(np.asarray(c.ok).reshape(-1)[i])]
    if not bool(np.asarray(res.converged).reshape(-1)[i]):
        names.append("convergence")
    return tuple(names)


def max_throughput(train: Train, stream=None, low=0.5, high=2.0, points=41, tol=1e-4) -> Throughput:
    """The largest factor on one stream's flow (or several scaled together) at which every limit still holds.

    Parameters
    ----------
    train : Train
        A single case (no array flows).
    stream : str or sequence of str, optional
        The stream(s) whose flow is scaled; default: the furnace's stream.
    low, high : float
        The range of factors searched [-].
    points : int
        Cases per sweep (two sweeps: the range, then the interval of the first violation).
    tol : float
        Solve tolerance [K].

    Returns
    -------
    Throughput
        Starting from today's flow (factor 1), the largest factor of the feasible stretch that contains it (above 1
        when today's train meets every limit; the nearest feasible factor below 1 otherwise).

    Notes
    -----
    Limits: the furnace's maximum fired duty, every exchanger's allowed pressure drops, every stream's allowed
    pressure drop, each stream's pump (the route's pressure drop against the pump curve at the scaled flow, less
    its allowance: the factor found is then where the route meets the pump curve), every point's temperature band;
    a case that does not converge counts as failing.
    """
    if train.shape != ():
        raise InputError("train", f"a sweep of shape {train.shape}", "a single case (the throughput is swept here)")
    if stream is None:
        if train.furnace is None:
            raise InputError("stream", None, "a stream name (the train has no furnace to default to)")
        stream = train.furnace.stream
    streams = (stream,) if isinstance(stream, str) else tuple(stream)
    for s in streams:
        if s not in train.streams:
            raise InputError("stream", s, f"one of the streams {sorted(train.streams)}")
    if not (0 < low < 1 < high):
        raise InputError("high", (low, high), "a range low < 1 < high of positive factors")
    if not (isinstance(points, int) and points >= 5):
        raise InputError("points", points, "an integer >= 5")

    def sweep(factors):
        t = train
        for s in streams:
            t = t.scaled(factors, s)
        res = t.solve(tol=tol)
        return res, _ok_per_case(res)

    grid = np.unique(np.r_[np.linspace(low, high, points), 1.0])
    res, ok = sweep(grid)
    i1 = int(np.flatnonzero(grid == 1.0)[0])
    if ok[i1]:
        j = i1
        while j + 1 < len(grid) and ok[j + 1]:
            j += 1
    else:
        below = np.flatnonzero(ok[:i1])
        if below.size == 0:
            return Throughput(streams, math.nan, {}, _failing(res, i1), float(grid[1] - grid[0]), (low, high))
        j = int(below[-1])
    if j + 1 == len(grid):
        factor, binding, step = float(grid[j]), (), float(grid[-1] - grid[-2])
    else:
        fine = np.linspace(grid[j], grid[j + 1], points)
        res2, ok2 = sweep(fine)
        k = 0
        while k + 1 < len(fine) and ok2[k + 1]:
            k += 1
        if k + 1 == len(fine):  # the coarse failure lay at the bracket's end only
            factor, binding = float(fine[-2]), _failing(res, j + 1)
        else:
            factor, binding = float(fine[k]), _failing(res2, k + 1)
        step = float(fine[1] - fine[0])
    at = train
    for s in streams:
        at = at.scaled(factor, s)
    return Throughput(streams, factor, {s: float(at.streams[s].flow) for s in streams}, binding, step, (low, high),
                      at.solve(tol=tol))


@dataclass(frozen=True)
class TrainStudy:
    """Options compared at train level.

    Attributes
    ----------
    table : DataFrame
        Index ``base`` and the labels. Columns: ``furnace_inlet`` [K], ``furnace_duty`` (fired) [W],
        ``furnace_duty_saved`` [W], ``duty <tag>`` per exchanger [W], ``dp <stream>`` per stream [Pa] (and
        ``pump dp <stream>``, what its pump leaves for the route [Pa], for a stream with a pump curve),
        ``limits`` (the failing limits, or "ok"), ``converged``, ``capex``, ``annual_value`` (fired duty saved ×
        operating time × fuel price), ``payback`` [years], ``npv``; ``max_throughput`` (factor on today's flow) and ``binding`` when asked.
    duty_changes : DataFrame
        Label × exchanger: change of each exchanger's duty from the base [W] (where a gain upstream is lost
        downstream).
    isolated_gains : DataFrame
        Label × exchanger: the duty gain of each changed exchanger rated alone at its base-case inlets [W], for
        contrast with the train-level saving (their sum over-counts).
    results : dict of str -> TrainResult
    throughput : dict of str -> Throughput (when asked)
    economics : Economics or None
    warnings : tuple of str
    """

    table: pd.DataFrame
    duty_changes: pd.DataFrame
    isolated_gains: pd.DataFrame
    results: dict = field(repr=False)
    throughput: dict = field(default_factory=dict, repr=False)
    economics: Economics | None = None
    warnings: tuple = ()


def compare_train(train: Train, options: dict, economics=None, revamp=None, throughput=False, tol=1e-6,
                  **throughput_kw) -> TrainStudy:
    """Solve the train for each set of options and compare them at train level.

    Parameters
    ----------
    train : Train
        Today's train (a single case).
    options : dict of str -> dict of str -> option
        Label -> {exchanger tag -> option of :mod:`revamp.options`}. Labels unique and not ``"base"``.
    economics : None, dict or Economics
        Prices and costs (capex by label). The value of a set of options is the fired duty it saves (the furnace's
        efficiency is already in the fired duty, so ``Economics.efficiency`` is not applied again).
    revamp : None, float or Train
        The conditions compared at: today's (None), a throughput factor on every stream's flow (``1.2``), or a Train.
    throughput : bool
        Also find each case's :func:`max_throughput`: the largest factor on today's flow of the stream (the train
        given, with the case's options), keyword arguments passed on.
    tol : float
        Solve tolerance [K].

    Returns
    -------
    TrainStudy
    """
    if not isinstance(train, Train):
        raise InputError("train", train, "a revamp.Train")
    if train.shape != ():
        raise InputError("train", f"a sweep of shape {train.shape}", "a single case for compare_train")
    if not isinstance(options, dict):
        raise InputError("options", options, "a dict of label -> {exchanger tag: option}")
    for label, opts in options.items():
        if not isinstance(label, str) or not label or label in _RESERVED:
            raise InputError("options", label, "labels that are non-empty strings other than 'base'")
        if not isinstance(opts, dict) or not opts:
            raise InputError(f"options[{label!r}]", opts, "a dict of exchanger tag -> option")
    eco = Economics.of(economics)
    if revamp is None:
        rev = train
    elif isinstance(revamp, Train):
        rev = revamp
    else:
        rev = train
        for s in train.streams:
            rev = rev.scaled(revamp, s)
    cases = {"base": rev}
    for label, opts in options.items():
        try:
            cases[label] = rev.apply(opts)
        except InputError as exc:
            raise exc.with_prefix(f"options[{label!r}]") from None
    results = {label: t.solve(tol=tol) for label, t in cases.items()}
    base = results["base"]
    tags = list(train.exchangers)
    rows, changes, isolated, tp = {}, {}, {}, {}
    for label, res in results.items():
        row = {"furnace_inlet": res.furnace_inlet, "furnace_duty": res.furnace_duty}
        row["furnace_duty_saved"] = (base.furnace_duty - res.furnace_duty) if res.furnace_duty is not None else np.nan
        for tag in tags:
            row[f"duty {tag}"] = float(res.exchangers.loc[tag, "duty"])
        for s in train.streams:
            row[f"dp {s}"] = float(res.streams.loc[s, "dp"])
            if s in train.pump_curves:  # what the stream's pump leaves for its route at this flow
                row[f"pump dp {s}"] = float(res.streams.loc[s, "pump_dp"])
        for s in train.rundown:
            row[f"trim duty {s}"] = float(res.streams.loc[s, "trim_duty"])
        for name, (_, _) in train.points.items():
            row[f"T {name}"] = float(res.points.loc[name, "temperature"])
        row["limits"] = ", ".join(res.violated) if res.violated else "ok"
        row["converged"] = bool(res.converged)
        saved = row["furnace_duty_saved"]
        if eco is None or label == "base" or not np.isfinite(saved):
            row.update(capex=0.0 if label == "base" else (eco.cost(label) if eco else math.nan),
                       annual_value=0.0 if label == "base" else math.nan, payback=math.nan, npv=math.nan)
        else:
            row["capex"] = eco.cost(label)
            row["annual_value"] = float(annual_duty_value(saved, eco.energy_price, eco.price_per, eco.operating_time,
                                                          efficiency=1.0))
            row["payback"] = float(simple_payback(row["capex"], row["annual_value"]))
            row["npv"] = (project_npv(row["capex"], row["annual_value"], eco.discount_rate, eco.horizon)
                          if eco.discount_rate is not None else math.nan)
        if throughput:  # on today's flows (the train given), whatever the revamp conditions compared at
            today = train if label == "base" else train.apply(options[label])
            tp[label] = max_throughput(today, tol=tol, **throughput_kw)
            row["max_throughput"] = tp[label].factor
            row["binding"] = ", ".join(tp[label].binding) or "none in range"
        rows[label] = row
        changes[label] = {t: float(res.exchangers.loc[t, "duty"] - base.exchangers.loc[t, "duty"]) for t in tags}
        if label != "base":
            from ..rating import rate

            iso = {}
            for tag in options[label]:
                r = base.ratings[tag]
                new = cases[label].exchangers[tag]
                svc = (new.air.service(r.service.tube, new.fouling_tube) if new.is_air_cooler else
                       r.service.replace(fouling_shell=new.fouling_shell, fouling_tube=new.fouling_tube))
                iso[tag] = float(rate(new.exchanger, svc, shell_method=train.shell_method).duty - r.duty)
            isolated[label] = iso
    table = pd.DataFrame.from_dict(rows, orient="index")
    table.index.name = "case"
    warnings = tuple(dict.fromkeys(f"{k}: {w}" for k, r in results.items() for w in r.warnings))
    return TrainStudy(table, pd.DataFrame.from_dict(changes, orient="index").rename_axis("case"),
                      pd.DataFrame.from_dict(isolated, orient="index").rename_axis("case"), results, tp, eco, warnings)


@dataclass(frozen=True)
class NetworkServices:
    """Each exchanger's service as the network gives it, today and at the revamp conditions.

    Attributes
    ----------
    today, revamp : dict of str -> Service
        Exchanger tag -> its two streams at their solved inlets and flows, with the match's fouling (what an
        exchanger study takes instead of the unit file's own inlets).
    results : dict of str -> TrainResult
        ``"today"`` and ``"revamp"``: the solves they come from (check ``converged``).
    """

    today: dict
    revamp: dict
    results: dict = field(repr=False)


def network_services(train: Train, revamp=1.0, tol=1e-6) -> NetworkServices:
    """The service of every exchanger of the train at its solved inlets, today and at the revamp conditions.

    Parameters
    ----------
    train : Train
        A single case.
    revamp : float or Train
        A factor on every stream's flow, or the revamp train itself.
    tol : float
        Solve tolerance [K].
    """
    if train.shape != ():
        raise InputError("train", f"a sweep of shape {train.shape}", "a single case")
    if isinstance(revamp, Train):
        rev = revamp
    else:
        rev = train
        for s in train.streams:
            rev = rev.scaled(revamp, s)
    results = {"today": train.solve(tol=tol), "revamp": rev.solve(tol=tol)}
    services = {k: {tag: r.service for tag, r in res.ratings.items()} for k, res in results.items()}
    return NetworkServices(services["today"], services["revamp"], results)
