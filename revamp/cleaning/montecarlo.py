"""How sure is a cleaning plan? Its cost, and the reference policies', over draws of the fouling rates.

The fouling laws fitted to plant data are uncertain (their standard errors, and the crude slate changes). The plan
found for the fitted laws is kept fixed and evaluated on the full train model for each draw, with every scheduled
bundle's growth scaled by a lognormal factor exp(σ·z) (one z per bundle and draw; σ the relative spread, e.g. 0.3);
the reference policies are evaluated on the same draws. Draws are chunked into tasks of the executor (in this
process, or a Dask cluster: each task's train solves are batched across its draws' periods).

References
----------
JCGM 101:2008. Propagation of distributions using a Monte Carlo method.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from .model import evaluate

__all__ = ["PlanMonteCarlo", "plan_monte_carlo"]

#: the parameter of each growth law that sets how fast it grows
_GROWTH = {"Linear": "rate", "Asymptotic": "rf_inf", "Threshold": "alpha_ref"}


@dataclass(frozen=True)
class PlanMonteCarlo:
    """Totals [currency] per draw and policy (``totals``, one row a draw) and their summary: mean, 5th and 95th
    percentiles, and how often the plan costs no more than each reference policy (``plan_wins``)."""

    totals: pd.DataFrame
    summary: pd.DataFrame
    failed_chunks: tuple = ()


def _scaled(law, factor):
    name = _GROWTH[type(law).__name__]
    return dataclasses.replace(law, **{name: getattr(law, name) * factor})


def _chunk(task):
    """One executor task: evaluate every policy's schedule for a chunk of draws (rows: draws, columns: policies)."""
    problem, schedules, factors = task
    out = np.empty((len(factors), len(schedules)))
    for k, f in enumerate(factors):
        p = dataclasses.replace(problem, laws=tuple(_scaled(law, x) for law, x in zip(problem.laws, f)))
        out[k] = evaluate(p, np.array(schedules)).total
    return out


def plan_monte_carlo(plan, draws: int = 100, spread: float = 0.3, seed: int = 0, executor=None,
                     chunk: int = 10) -> PlanMonteCarlo:
    """Evaluate a :class:`~revamp.cleaning.CleaningPlan` and its reference policies over draws of the fouling rates.

    Parameters
    ----------
    plan : CleaningPlan
        From :func:`revamp.cleaning.schedule_cleaning`.
    draws : int
        Number of draws.
    spread : float
        Relative 1σ spread of each bundle's growth (lognormal factor exp(σ·z)) [-].
    seed : int
        Seed of the draws (the result does not depend on ``chunk`` or the executor).
    executor : optional
        From :func:`revamp.executor.executor_for` (in this process or a Dask cluster; a process pool cannot carry
        the train's evaluator); default in this process.
    chunk : int
        Draws per task.
    """
    from ..executor import InProcess

    if getattr(plan, "problem", None) is None:
        raise InputError("plan", type(plan).__name__, "a CleaningPlan from schedule_cleaning")
    if isinstance(draws, bool) or not isinstance(draws, (int, np.integer)) or not 1 <= draws <= 100_000:
        raise InputError("draws", draws, "a whole number from 1 to 100,000")
    if not (isinstance(spread, (int, float)) and 0.0 <= spread <= 2.0):
        raise InputError("spread", spread, "a relative standard deviation from 0 to 2")
    if isinstance(chunk, bool) or not isinstance(chunk, (int, np.integer)) or chunk < 1:
        raise InputError("chunk", chunk, "a whole number >= 1")
    names = ["plan"] + list(plan.policy_schedules)
    schedules = [plan.schedule] + [plan.policy_schedules[n] for n in names[1:]]
    rng = np.random.default_rng(seed)
    factors = np.exp(spread * rng.standard_normal((int(draws), plan.problem.n)))
    bounds = list(range(0, int(draws), int(chunk))) + [int(draws)]
    tasks = [(plan.problem, schedules, factors[a:b]) for a, b in zip(bounds[:-1], bounds[1:])]
    parts, failed = [None] * len(tasks), []
    ex = executor if executor is not None else InProcess()
    with ex:
        for outcome in ex.run(_chunk, tasks):
            if outcome.ok:
                parts[outcome.index] = outcome.value
            else:
                failed.append(f"draws {bounds[outcome.index]}-{bounds[outcome.index + 1] - 1}: {outcome.error}")
    rows = [p if p is not None else np.full((b - a, len(names)), np.nan)
            for p, a, b in zip(parts, bounds[:-1], bounds[1:])]
    totals = pd.DataFrame(np.vstack(rows), columns=names)
    ok = totals.dropna()
    summary = pd.DataFrame({"mean": ok.mean(), "p5": ok.quantile(0.05), "p95": ok.quantile(0.95),
                            "plan_wins": [(ok["plan"] <= ok[n] * (1 + 1e-12)).mean() for n in names]})
    return PlanMonteCarlo(totals=totals, summary=summary, failed_chunks=tuple(failed))
