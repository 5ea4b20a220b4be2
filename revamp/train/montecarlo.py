"""Monte Carlo of a train: what the uncertainty of flows, supply temperatures and fouling does to the furnace.

Draws are made up front (one seeded generator, so the result does not depend on how the work is split), cut into
chunks, and each chunk is one vectorized solve of the train (every draw a case of the same call): a task of the
executor (:mod:`revamp.executor`), in this process, in a process pool or on a Dask cluster. A chunk of a few hundred
draws carries far more work than the ~1 ms a Dask task costs.

Uncertainty is given as one standard deviation (JCGM 100, the GUM) per input, by path:

- ``"crude.flow": 0.02``: a stream's flow, relative (normal, truncated at zero);
- ``"crude.t_in": "1.5 K"``: a stream's supply temperature, absolute [K] (normal);
- ``"E-101.fouling_tube": 0.3``: an exchanger side's fouling, relative (normal, truncated at zero).

References
----------
JCGM 101:2008. Evaluation of measurement data, Supplement 1: propagation of distributions using a Monte Carlo method.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import require, to_si

__all__ = ["monte_carlo", "TrainMonteCarlo"]


@dataclass(frozen=True)
class TrainMonteCarlo:
    """Draws of a train and what the furnace and each exchanger gave.

    Attributes
    ----------
    samples : pandas.DataFrame
        One row per draw: the drawn inputs (their paths as columns, SI) and ``furnace_inlet`` [K],
        ``furnace_duty`` [W fired], ``duty <tag>`` [W], ``converged``.
    summary : pandas.DataFrame
        Mean, standard deviation and the 5th, 50th and 95th percentiles of every output, over converged draws.
    failed_chunks : tuple of str
        Chunks whose solve failed (their draws are NaN in ``samples``), with the reason.
    """

    samples: pd.DataFrame
    summary: pd.DataFrame
    failed_chunks: tuple = ()


def _parse(train, uncertainty):
    specs = []
    for path, sigma in (uncertainty or {}).items():
        if not isinstance(path, str) or path.count(".") != 1:
            raise InputError(f"uncertainty[{path!r}]", path, "'<stream>.flow', '<stream>.t_in' or '<tag>.fouling_shell'"
                                                             "/'<tag>.fouling_tube'")
        owner, what = path.split(".")
        if what in ("flow", "t_in"):
            if owner not in train.streams:
                raise InputError(f"uncertainty[{path!r}]", owner, f"one of the streams {sorted(train.streams)}")
        elif what in ("fouling_shell", "fouling_tube"):
            if owner not in train.exchangers:
                raise InputError(f"uncertainty[{path!r}]", owner, f"one of the exchangers {sorted(train.exchangers)}")
            if what == "fouling_shell" and train.exchangers[owner].is_air_cooler:
                raise InputError(f"uncertainty[{path!r}]", what, "fouling_tube: an air cooler has no shell side (its "
                                 "air-side fouling is set by its AirSide)")
        else:
            raise InputError(f"uncertainty[{path!r}]", what, "flow, t_in, fouling_shell or fouling_tube")
        kind = "temperature_difference" if what == "t_in" else "dimensionless"
        s = float(require(to_si(sigma, kind, f"uncertainty[{path!r}]"), f"uncertainty[{path!r}]", ge=0))
        if not np.isfinite(s) or (kind == "dimensionless" and s > 1.0):
            raise InputError(f"uncertainty[{path!r}]", sigma, "a finite standard deviation (relative ones at most 1)")
        specs.append((path, owner, what, s))
    return specs


def _base_value(train, owner, what):
    if what in ("flow", "t_in"):
        v = getattr(train.streams[owner], what)
    else:
        v = getattr(train.exchangers[owner], what)
    if np.ndim(v) != 0:
        raise InputError(f"{owner}.{what}", f"array of shape {np.shape(v)}", "one value (the draws make the cases)")
    return float(v)


def _draw(train, specs, draws, seed):
    rng = np.random.default_rng(seed)
    out = {}
    for path, owner, what, s in specs:
        base = _base_value(train, owner, what)
        z = rng.standard_normal(draws)
        out[path] = base + s * z if what == "t_in" else np.maximum(base * (1.0 + s * z), 0.0)
    return out


def _with_draws(train, values):
    streams, matches = dict(train.streams), dict(train.exchangers)
    for path, v in values.items():
        owner, what = path.split(".")
        if what in ("flow", "t_in"):
            streams[owner] = streams[owner].replace(**{what: v})
        else:
            matches[owner] = matches[owner].replace(**{what: v})
    return train.replace(streams=streams, exchangers=matches)


def _solve_chunk(task):
    """One executor task: solve the train for a chunk of draws; arrays back (picklable)."""
    train, values = task
    res = _with_draws(train, values).solve()
    n = len(next(iter(values.values()))) if values else 1
    out = {"furnace_inlet": np.broadcast_to(np.asarray(res.furnace_inlet, float), (n,)).copy(),
           "furnace_duty": np.broadcast_to(np.asarray(res.furnace_duty, float), (n,)).copy(),
           "converged": np.broadcast_to(np.asarray(res.converged, bool), (n,)).copy()}
    for tag, r in res.ratings.items():
        out[f"duty {tag}"] = np.broadcast_to(np.asarray(r.duty, float), (n,)).copy()
    return out


def monte_carlo(train, draws: int = 1000, uncertainty=None, seed: int = 0, executor=None,
                chunk: int = 250) -> TrainMonteCarlo:
    """Propagate input uncertainty through the whole train by Monte Carlo (JCGM 101).

    Parameters
    ----------
    train : revamp.Train
        One case (no arrays).
    draws : int
        Number of draws.
    uncertainty : dict
        Path -> one standard deviation (see the module docstring).
    seed : int
        Seed of the draws (the result does not depend on ``chunk`` or the executor).
    executor : optional
        From :func:`revamp.executor.executor_for`; default in this process.
    chunk : int
        Draws per task (one vectorized train solve each).

    Returns
    -------
    TrainMonteCarlo
    """
    from ..executor import InProcess

    if isinstance(draws, bool) or not isinstance(draws, (int, np.integer)) or not 1 <= draws <= 10_000_000:
        raise InputError("draws", draws, "a whole number from 1 to 10,000,000")
    if isinstance(chunk, bool) or not isinstance(chunk, (int, np.integer)) or chunk < 1:
        raise InputError("chunk", chunk, "a whole number >= 1")
    if train.shape != ():
        raise InputError("train", f"cases of shape {train.shape}", "a train of one case (the draws make the cases)")
    specs = _parse(train, uncertainty)
    values = _draw(train, specs, int(draws), seed)
    bounds = list(range(0, int(draws), int(chunk))) + [int(draws)]
    tasks = [(train, {k: v[a:b] for k, v in values.items()}) for a, b in zip(bounds[:-1], bounds[1:])]
    if not values:  # no uncertainty: every draw is the base case
        tasks = [(train, {}) for _ in tasks]
    ex = executor if executor is not None else InProcess()
    parts, failed = [None] * len(tasks), []
    with ex:
        for outcome in ex.run(_solve_chunk, tasks):
            if outcome.ok:
                parts[outcome.index] = outcome.value
            else:
                failed.append(f"draws {bounds[outcome.index]}-{bounds[outcome.index + 1] - 1}: {outcome.error}")
    keys = next((list(p) for p in parts if p is not None), ["furnace_inlet", "furnace_duty", "converged"])
    columns = {}
    for k in keys:
        chunks = []
        for p, a, b in zip(parts, bounds[:-1], bounds[1:]):
            if p is not None and not values:
                chunks.append(np.resize(p[k], b - a))
            elif p is not None:
                chunks.append(p[k])
            else:
                chunks.append(np.full(b - a, False if k == "converged" else np.nan))
        columns[k] = np.concatenate(chunks)
    samples = pd.DataFrame({**values, **columns})
    ok = samples["converged"].to_numpy(dtype=bool)
    outputs = [k for k in keys if k != "converged"]
    stats = samples.loc[ok, outputs]
    summary = pd.DataFrame({"mean": stats.mean(), "std": stats.std(ddof=1), "p5": stats.quantile(0.05),
                            "p50": stats.quantile(0.50), "p95": stats.quantile(0.95)})
    return TrainMonteCarlo(samples=samples, summary=summary, failed_chunks=tuple(failed))
