"""When to clean which bundle of a train: :func:`schedule_cleaning` and its result, :class:`CleaningPlan`.

How the plan is found (all train solves batched: every period of every candidate schedule in one solve):

1. The train's response is linearised around a reference state (the secant of the fired duty against each bundle's
   deposit, and the fired duty lost while it is bypassed), and the schedule is solved as a mixed-integer linear
   programme (:mod:`revamp.cleaning.milp`, the binary formulation of Smaïli, Vassiliadis & Wilson 2001, HiGHS).
2. That schedule and three reference policies are evaluated on the full train model (:mod:`revamp.cleaning.model`):
   no cleaning; each bundle at its own optimum interval (Epstein 1979; Ma & Epstein 1981, with its own loss rate and
   its neighbours clean); every bundle at one fixed interval (the best of a grid).
3. A local search on the full model (shift a cleaning by 1, 2, 4 or 8 periods, drop one, add one in the longest run)
   improves the best of these; the MILP is solved again linearised around that schedule, and the search repeats
   while time is left.

What the result says about optimality (:class:`Optimality`): the MILP's relative gap to its dual bound (for the
linearised model), how far the linearised cost of the plan is from its full-model cost, and the saving over the best
reference policy. No claim of a global optimum of the full, nonlinear model is made.

References
----------
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
    optimal management of cleaning. Energy & Fuels 15, 1038-1056.
Epstein, N. (1979). Optimum evaporator cycles with scale formation. Can. J. Chem. Eng. 57, 659-661.
Ma, R. S. T., Epstein, N. (1981). Optimum cycles for falling rate processes. Can. J. Chem. Eng. 59, 631-633.
Ishiyama, E. M., Paterson, W. R., Wilson, D. I. (2011). Optimum cleaning cycles for heat transfer equipment
    undergoing fouling and ageing. Chem. Eng. Sci. 66, 604-612.
"""
from __future__ import annotations

import dataclasses
import re
import time
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..errors import InputError
from ..fouling.growth import growth_law
from ..units import require, to_si
from .calendar import make_calendar
from .milp import solve_milp
from .model import BYPASS_RF, Problem, TrainState, evaluate
from .policies import _fixed_interval, _linear_cost, _linearise, _own_optimum, _repair, _search

__all__ = ["schedule_cleaning", "plan", "CleaningPlan", "Optimality", "train_evaluator", "POLICIES"]

#: Names of the reference policies in ``CleaningPlan.compare`` (besides ``"plan"``).
POLICIES = ("no cleaning", "each bundle at its own optimum interval", "all bundles at one fixed interval")

_PRICE_RE = re.compile(r"^\s*([-+0-9.eE]+)\s*([A-Za-z$€£]{1,4})?\s*/\s*([A-Za-z]{1,6})\s*$")


@dataclass(frozen=True)
class Optimality:
    """How good the plan is known to be.

    Attributes
    ----------
    milp_gap : float
        Relative gap between the MILP's schedule and HiGHS's dual bound, for the linearised train model [-]
        (nan when the MILP stopped without a bound).
    linearisation_error : float
        (full-model cost − linearised cost) / full-model cost of the plan [-]: how well the linear model describes
        the train along the plan.
    saving_over_best_reference : float
        1 − plan cost / cost of the best reference policy [-] (>= 0: the plan is never worse than a reference).
    best_reference : str
    """

    milp_gap: float
    linearisation_error: float
    saving_over_best_reference: float
    best_reference: str

    def describe(self) -> str:
        gap = "no bound" if not np.isfinite(self.milp_gap) else f"{100 * self.milp_gap:.2g} %"
        return (f"MILP gap on the linearised model {gap}; the linearised cost of the plan is off the full train model "
                f"by {100 * self.linearisation_error:+.2g} %; the plan saves {100 * self.saving_over_best_reference:.3g} % "
                f"over the best reference policy ({self.best_reference}).")


@dataclass(frozen=True)
class CleaningPlan:
    """A cleaning schedule for a train and what it does over the horizon.

    Attributes
    ----------
    cleanings : pandas.DataFrame
        One row per cleaning: ``tag``, ``start``, ``end`` (dates; end = back in service), ``at_turnaround``, ``cost``.
    timeline : pandas.DataFrame
        One row per period (index: period start): ``furnace_inlet`` [K], ``furnace_duty`` [W, fired],
        ``Rf <tag>`` [m²K/W] for each bundle (mid-period; the residual while out), ``out_of_service`` (tags).
    cost : pandas.Series
        ``fuel`` (fired fuel over the clean train), ``cleaning``, ``lost_throughput``, ``total`` [currency].
    compare : pandas.DataFrame
        The same totals and the number of cleanings for ``plan`` and each reference policy (:data:`POLICIES`).
    policies : pandas.DataFrame
        Long form, one row per policy and period: ``policy``, ``date``, ``furnace_inlet`` [K], ``furnace_duty`` [W].
    optimality : Optimality
    solves : int
        Batched train solves used (each solves every state of a batch of schedules at once).
    states : int
        Train states solved in all.
    seconds : float
    currency : str
    notes : tuple of str
    """

    cleanings: pd.DataFrame
    timeline: pd.DataFrame
    cost: pd.Series
    compare: pd.DataFrame
    policies: pd.DataFrame
    optimality: Optimality
    solves: int
    states: int
    seconds: float
    currency: str = ""
    notes: tuple = ()
    schedule: np.ndarray = field(default=None, repr=False)  # (n, P) bool, cleaning starts
    policy_schedules: dict = field(default_factory=dict, repr=False)  # reference policy -> (n, P) bool
    problem: object = field(default=None, repr=False)  # the checked inputs (for plan_monte_carlo)


# --------------------------------------------------------------------------------------------- train adapter
class _Counter:
    """Wraps an evaluator, counting solves and states."""

    def __init__(self, fn):
        self.fn, self.solves, self.states = fn, 0, 0

    def __call__(self, rf, bypass):
        self.solves += 1
        self.states += len(rf)
        return self.fn(rf, bypass)


def train_evaluator(train, tags, sides):
    """An evaluator of a :class:`revamp.Train`: deposits (K, n) and bypass flags (K, n) -> :class:`TrainState`.

    The deposit of bundle ``i`` sets the fouling of its side ``sides[i]`` (the other side keeps the train's value);
    a bypassed bundle gets a fouling of :data:`~revamp.cleaning.model.BYPASS_RF` (no heat crosses it). One call is
    one solve of the train with the K states as its cases.
    """
    from ..fouling.models import film_temperature

    def evaluate_states(rf, bypass):
        rf = np.asarray(rf, dtype=float)
        matches = dict(train.exchangers)
        for i, (tag, side) in enumerate(zip(tags, sides)):
            value = np.where(bypass[:, i], BYPASS_RF, rf[:, i])
            matches[tag] = matches[tag].replace(**{f"fouling_{side}": value})
        res = train.replace(exchangers=matches).solve()
        K = rf.shape[0]
        conds = []
        for tag in tags:
            r = res.ratings[tag]
            t_bulk = 0.5 * (np.broadcast_to(r.service.tube.t_in, (K,)) + np.asarray(r.t_out_tube))
            conds.append({"Re": np.broadcast_to(r.Re_tube, (K,)), "Pr": np.broadcast_to(r.Pr_tube, (K,)),
                          "T_film": film_temperature(t_bulk, np.asarray(r.t_wall_tube)),
                          "shear": np.broadcast_to(r.shear_tube, (K,))})
        converged = np.broadcast_to(np.asarray(getattr(res, "converged", True), dtype=bool), (K,))
        return TrainState(furnace_duty=np.broadcast_to(res.furnace_duty, (K,)),
                          furnace_inlet=np.broadcast_to(res.furnace_inlet, (K,)), conditions=tuple(conds),
                          converged=converged)

    return evaluate_states


# ------------------------------------------------------------------------------------------------ parsing
def _fuel_price(value):
    """(currency per J, currency) from a number [currency per GJ] or a string such as ``"9 USD/GJ"``."""
    from ..economics import ENERGY_BASES, price_per_joule

    if isinstance(value, str):
        m = _PRICE_RE.match(value)
        if not m or m.group(3) not in ENERGY_BASES:
            raise InputError("fuel_price", value, f"a price such as '9 USD/GJ' (per one of {ENERGY_BASES})")
        number, currency, per = m.group(1), m.group(2) or "", m.group(3)
    else:
        number, currency, per = value, "", "GJ"
    try:
        number = float(number)
    except (TypeError, ValueError):
        raise InputError("fuel_price", value, "a number (per GJ) or a string such as '9 USD/GJ'") from None
    if not np.isfinite(number) or not 0 <= number <= 1e6:
        raise InputError("fuel_price", value, "a finite price from 0 to 1e6 per energy unit")
    return price_per_joule(number, per), currency


def _per_tag(value, tags, field, kind=None):
    if isinstance(value, dict):
        unknown = sorted(set(value) - set(tags))
        if unknown:
            raise InputError(f"{field}[{unknown[0]!r}]", unknown[0], f"one of the exchangers {sorted(tags)}")
        missing = [t for t in tags if t not in value]
        if missing:
            raise InputError(f"{field}", sorted(value), f"a value for every exchanger (missing {missing})")
        return [value[t] for t in tags]
    return [value] * len(tags)


def _default_side(train, tag):
    """The side whose deposit the plan tracks: the furnace stream's side, else the tube side."""
    m = train.exchangers[tag]
    if train.furnace is not None and train.furnace.stream in (m.shell, m.tube):
        return m.side_of(train.furnace.stream)
    return "tube"


# ------------------------------------------------------------------------------------------------ public
def schedule_cleaning(train, fouling, horizon="3 yr", period="1 week", cleaning_cost=0.0, downtime="5 day",
                      crews=1, fuel_price=None, *, start=None, min_interval=None, blackouts=(), turnaround=(),
                      turnaround_length=None, turnaround_tags=None, residual=0.0, sides=None, margin=None,
                      time_limit="60 s", seed=0) -> CleaningPlan:
    """A cleaning schedule for a train: which bundle to clean when, against fuel and cleaning cost.

    Parameters
    ----------
    train : revamp.Train
        The train at its operating conditions (one case; a single exchanger is a one-match train).
    fouling : dict of str -> growth law or fit
        For each exchanger to schedule: a :mod:`revamp.fouling.growth` law (``Linear``, ``Asymptotic``,
        ``Threshold``) or a :class:`~revamp.fouling.models.FoulingFit` from the plant data (continuing from its
        value at its last run time). Exchangers not listed keep the fouling the train gives them.
    horizon, period : str or float
        Length of the plan and of one period [s, or strings such as ``"3 yr"``, ``"1 week"``].
    cleaning_cost : float or dict
        Cost of one cleaning [currency], one value or per tag.
    downtime : str or float
        Time a bundle is out of service (bypassed) per cleaning [s]; rounded up to whole periods (at least one).
    crews : int
        Most bundles out of service at once.
    fuel_price : float or str
        Price of fired fuel: a number [currency per GJ] or a string such as ``"9 USD/GJ"`` (per GJ, MJ, kWh, MWh,
        MMBTU). Required.
    start : date, optional
        Date of the first period (default: today).
    min_interval : str or float, optional
        Fewest time between two cleanings of one bundle [s] (default: the downtime).
    blackouts : list of (date, date)
        Periods in which no bundle may be out of service (inclusive).
    turnaround : date or list of dates
        Planned turnarounds: the unit is down for ``turnaround_length`` (default the downtime); the bundles in
        ``turnaround_tags`` (default all scheduled) are cleaned then, outside the crew limit, burning no fuel.
    residual : float
        Deposit a cleaning leaves, for fits (laws carry their own) [m²K/W].
    sides : dict of str -> "shell" | "tube", optional
        The side whose fouling the deposit is (default: the side of the furnace's stream, else the tube side).
    margin : float, optional
        Value of throughput [currency per kg of the furnace's stream]: prices the throughput lost where the fired
        duty would exceed the furnace's maximum. Without it, that loss is not priced (the timeline still shows it).
    time_limit : str or float
        Wall-time budget of the search [s].
    seed : int
        Seed of the local search's move sampling (reproducible plans).

    Returns
    -------
    CleaningPlan

    Raises
    ------
    InputError
        Naming the field, the value and what is allowed.
    """
    t0 = time.perf_counter()
    budget = require(float(to_si(time_limit, "time", "time_limit")), "time_limit", gt=0)
    if not (hasattr(train, "solve") and hasattr(train, "exchangers") and hasattr(train, "furnace")):
        raise InputError("train", type(train).__name__, "a revamp.Train")
    if train.furnace is None:
        raise InputError("train.furnace", None, "a furnace (the plan prices fired fuel)")
    if train.shape != ():
        raise InputError("train", f"cases of shape {train.shape}", "a train of one case (no arrays of flows)")
    if not isinstance(fouling, dict) or not fouling:
        raise InputError("fouling", fouling, "a dict of exchanger tag -> growth law or plant-data fit")
    tags = tuple(fouling)
    for tag in tags:
        if tag not in train.exchangers:
            raise InputError(f"fouling[{tag!r}]", tag, f"one of the exchangers {sorted(train.exchangers)}")
        if train.exchangers[tag].is_air_cooler:
            raise InputError(f"fouling[{tag!r}]", tag, "a shell-and-tube exchanger of the train (an air cooler's "
                             "cleaning is not planned here: see its own report's fin-cleaning option)")
    res_val = require(float(to_si(residual, "fouling", "residual")), "residual", ge=0)
    laws = tuple(growth_law(fouling[t], f"fouling[{t!r}]", residual=res_val) for t in tags)
    if not isinstance(crews, (int, np.integer)) or isinstance(crews, bool) or crews < 1:
        raise InputError("crews", crews, "a whole number of crews, at least 1")
    sides = dict(sides or {})
    side_list = []
    for t in tags:
        s = sides.get(t, _default_side(train, t))
        if s not in ("shell", "tube"):
            raise InputError(f"sides[{t!r}]", s, "'shell' or 'tube'")
        side_list.append(s)
    costs = []
    for t, c in zip(tags, _per_tag(cleaning_cost, tags, "cleaning_cost")):
        c = float(require(to_si(c, "dimensionless", f"cleaning_cost[{t!r}]"), f"cleaning_cost[{t!r}]", ge=0))
        if not np.isfinite(c) or c > 1e12:
            raise InputError(f"cleaning_cost[{t!r}]", c, "a finite cost below 1e12")
        costs.append(c)
    if fuel_price is None:
        raise InputError("fuel_price", None, "a price of fired fuel such as '9 USD/GJ'")
    price, currency = _fuel_price(fuel_price)
    cal = make_calendar(horizon, period, downtime, start=start, min_interval=min_interval, blackouts=blackouts,
                        turnaround=turnaround, turnaround_length=turnaround_length)
    if turnaround_tags is None:
        tmask = np.ones(len(tags), dtype=bool) if cal.turnaround else np.zeros(len(tags), dtype=bool)
    else:
        for t in turnaround_tags:
            if t not in tags:
                raise InputError("turnaround_tags", t, f"one of the scheduled exchangers {list(tags)}")
        tmask = np.array([t in turnaround_tags for t in tags])
    max_duty = float(train.furnace.max_duty) if train.furnace.max_duty is not None else np.inf

    problem = Problem(tags=tags, laws=laws, calendar=cal, cleaning_cost=np.array(costs), fuel_price=price,
                      evaluator=train_evaluator(train, tags, side_list), turnaround_mask=tmask, max_duty=max_duty,
                      margin_per_watt_s=0.0)
    flow = float(train.streams[train.furnace.stream].flow)
    margin_kg = None if margin is None else float(require(to_si(margin, "dimensionless", "margin"), "margin", ge=0))
    return plan(problem, crews=crews, time_limit=budget, seed=seed, currency=currency,
                margin_per_s=None if margin_kg is None else margin_kg * flow, t0=t0)


def plan(problem: Problem, crews: int = 1, time_limit: float = 60.0, seed: int = 0, currency: str = "",
         margin_per_s=None, t0=None) -> CleaningPlan:
    """Find the plan for a checked :class:`~revamp.cleaning.model.Problem` (any evaluator); see
    :func:`schedule_cleaning`, which builds the problem from a train."""
    t0 = time.perf_counter() if t0 is None else t0
    budget = float(time_limit)
    cal = problem.calendar
    counter = _Counter(problem.evaluator)
    problem = _replace(problem, evaluator=counter)
    max_duty = problem.max_duty
    n = len(problem.tags)
    clean = counter(problem.residual[None, :], np.zeros((1, n), dtype=bool))
    problem = _replace(problem, clean=clean)
    if margin_per_s and np.isfinite(max_duty):
        # lost fraction of throughput ≈ excess / fired duty (first order; common practice, no source)
        problem = _replace(problem, margin_per_watt_s=margin_per_s / max(float(clean.furnace_duty[0]), 1.0))
    deadline = t0 + budget
    rng = np.random.default_rng(seed)

    # 1. linearise around the no-cleaning trajectory's mean deposit, solve the MILP
    none_y = _repair(problem, np.zeros((n, cal.periods), dtype=bool), crews)
    none_out = evaluate(problem, none_y[None])
    ref_rf = np.mean(none_out.trajectory.rf[0], axis=0)
    lin = _linearise(problem, 0.5 * (ref_rf + problem.residual))
    milp_budget = max(min(0.3 * budget, 20.0), 1.0)
    milp = solve_milp(problem, lin, time_limit=milp_budget, crews=crews)

    # 2. reference policies and the MILP schedule on the full model, in one batch
    own = _own_optimum(problem, lin, crews)
    grid = sorted({max(int(round(x)), cal.min_interval + 1) for x in np.geomspace(4 * cal.downtime + 1,
                                                                                  cal.periods, 8)})
    fixed = [_fixed_interval(problem, g_, crews) for g_ in grid if g_ < cal.periods]
    cands = [none_y, own] + fixed + ([milp.schedule] if milp is not None else [])
    outcome = evaluate(problem, np.array(cands))
    totals = outcome.total
    ref_cost = {POLICIES[0]: float(totals[0]), POLICIES[1]: float(totals[1])}
    k_fixed = 2 + int(np.argmin(totals[2:2 + len(fixed)])) if fixed else None
    if k_fixed is not None:
        ref_cost[POLICIES[2]] = float(totals[k_fixed])
    ref_index = {POLICIES[0]: 0, POLICIES[1]: 1, POLICIES[2]: k_fixed}
    k0 = int(np.argmin(totals))
    best_y, best_cost = cands[k0], float(totals[k0])
    gap = milp.gap if milp is not None else np.nan

    # 3. local search, then re-linearise around the best schedule and solve again while time is left
    best_y, best_cost = _search(problem, best_y, best_cost, crews, deadline, rng)
    if time.perf_counter() < deadline - 2.0:
        traj = evaluate(problem, best_y[None])
        lin = _linearise(problem, np.mean(traj.trajectory.rf[0], axis=0))
        milp2 = solve_milp(problem, lin, time_limit=max(min(deadline - time.perf_counter() - 1.0, milp_budget), 0.5),
                           crews=crews)
        if milp2 is not None:
            o2 = evaluate(problem, milp2.schedule[None])
            gap = milp2.gap
            if o2.total[0] < best_cost:
                best_y, best_cost = milp2.schedule, float(o2.total[0])
                best_y, best_cost = _search(problem, best_y, best_cost, crews, deadline, rng)

    refs = [p for p in POLICIES if ref_index[p] is not None]
    final = evaluate(problem, np.array([best_y] + [cands[ref_index[p]] for p in refs]))
    k_best = int(np.argmin(final.total))
    if k_best > 0 and final.total[k_best] < final.total[0]:  # a reference is cheaper after all (in the last digits)
        best_y = cands[ref_index[refs[k_best - 1]]]
        final = evaluate(problem, np.array([best_y] + [cands[ref_index[p]] for p in refs]))
    plan_cost = float(final.total[0])
    # the references' costs from the same evaluation as the plan's (a plan that is one of them then saves exactly 0:
    # costs from two batches of a train sweep may differ in the last digits)
    ref_cost = {p: float(final.total[1 + j]) for j, p in enumerate(refs)}
    best_ref = min(ref_cost, key=ref_cost.get)
    lin_cost = _linear_cost(problem, lin, best_y)
    full_lin_part = plan_cost - float(final.lost_throughput[0])
    optimality = Optimality(milp_gap=float(gap), linearisation_error=(full_lin_part - lin_cost) / max(full_lin_part, 1e-9),
                            saving_over_best_reference=1.0 - plan_cost / ref_cost[best_ref] if ref_cost[best_ref] > 0
                            else 0.0, best_reference=best_ref)
    return _result(problem, final, best_y, [p for p in POLICIES if ref_index[p] is not None], optimality, counter,
                   time.perf_counter() - t0, currency, margin_per_s is not None)


def _replace(problem, **changes):
    import dataclasses

    return dataclasses.replace(problem, **changes)


def _result(problem, final, y, policy_names, optimality, counter, seconds, currency, priced) -> CleaningPlan:
    cal = problem.calendar
    dates = cal.dates
    tmask = np.zeros(cal.periods, dtype=bool)
    tmask[list(cal.turnaround)] = True
    rows = []
    for i, p in sorted(zip(*np.nonzero(y)), key=lambda ip: (ip[1], ip[0])):
        at_t = bool(problem.turnaround_mask[i] and tmask[p])
        length = cal.turnaround_length if at_t else cal.downtime
        rows.append({"tag": problem.tags[i], "start": cal.date(p), "end": cal.date(min(p + length, cal.periods)),
                     "at_turnaround": at_t, "cost": float(problem.cleaning_cost[i])})
    cleanings = pd.DataFrame(rows, columns=["tag", "start", "end", "at_turnaround", "cost"])
    traj = final.trajectory
    timeline = pd.DataFrame({"furnace_inlet": final.furnace_inlet[0], "furnace_duty": final.furnace_duty[0]},
                            index=pd.Index(dates, name="period_start"))
    for i, tag in enumerate(problem.tags):
        timeline[f"Rf {tag}"] = traj.rf[0, :, i]
    timeline["out_of_service"] = [", ".join(t for t, o in zip(problem.tags, traj.out[0, p]) if o)
                                  for p in range(cal.periods)]
    timeline["unit_down"] = cal.down
    timeline["above_max_duty"] = final.furnace_duty[0] > problem.max_duty
    names = ["plan"] + policy_names
    compare = pd.DataFrame({"fuel": final.fuel, "cleaning": final.cleaning, "lost_throughput": final.lost_throughput,
                            "total": final.total, "cleanings": final.schedules.sum(axis=(1, 2))},
                           index=pd.Index(names, name="policy"))
    cost = compare.loc["plan", ["fuel", "cleaning", "lost_throughput", "total"]].astype(float)
    policies = pd.concat([pd.DataFrame({"policy": name, "date": dates, "furnace_inlet": final.furnace_inlet[k],
                                        "furnace_duty": final.furnace_duty[k]}) for k, name in enumerate(names)],
                         ignore_index=True)
    notes = [optimality.describe(),
             "A bundle out of service is bypassed (no heat crosses it) and its deposit does not grow; it comes back "
             "with the growth law's residual deposit.",
             "Fuel is the fired duty above the clean train's, at the fuel price; a turnaround burns none."]
    if not priced:
        notes.append("Throughput lost above the furnace's maximum fired duty is not priced (no margin given); "
                     "the timeline marks those periods.")
    if np.any(final.unconverged[0] > 0):
        notes.append(f"{int(final.unconverged[0])} period(s) of the plan: the train solve did not converge.")
    for law, tag in zip(problem.laws, problem.tags):
        notes.append(f"{tag}: {law.describe()}, {law.rf_now * 1e4:.3g}·10⁻⁴ m²K/W now.")
    return CleaningPlan(cleanings=cleanings, timeline=timeline, cost=cost, compare=compare, policies=policies,
                        optimality=optimality, solves=counter.solves, states=counter.states, seconds=seconds,
                        currency=currency, notes=tuple(notes), schedule=y,
                        policy_schedules={name: final.schedules[k] for k, name in enumerate(names) if k > 0},
                        problem=dataclasses.replace(problem, evaluator=counter.fn))
