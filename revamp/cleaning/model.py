"""The cleaning-plan model: deposit trajectories of a schedule, the train state they give, and what they cost.

A schedule is a boolean array ``y[..., i, p]``: bundle ``i`` starts a cleaning at the start of period ``p``. While a
bundle is out of service (``downtime`` periods) it is bypassed and its deposit does not grow; it comes back with the
law's residual resistance. In service, the deposit grows by the bundle's law; the value used for a period is the one
at the middle of the period. Every period's train state (fired duty, furnace inlet, and the tube-side conditions the
threshold law needs) comes from one batched solve of the whole train over all periods and all candidate schedules at
once (:class:`Evaluator`); identical states are solved once.

The money of a schedule (Smaïli, Vassiliadis & Wilson 2001; Ishiyama, Paterson & Wilson 2009): the extra fired fuel
over the clean train, period by period, at the fuel price; plus the cost of every cleaning; plus, when a margin is
given, the throughput lost in periods whose fired duty exceeds the furnace's maximum (to first order, throughput falls
by the fraction of the excess: common practice, no source). A turnaround's periods burn no fuel (the unit is down).

References
----------
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
    optimal management of cleaning. Energy & Fuels 15, 1038-1056.
Ishiyama, E. M., Paterson, W. R., Wilson, D. I. (2009). Platform for techno-economic analysis of fouling mitigation
    options in refinery preheat trains. Energy & Fuels 23, 1323-1337.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

__all__ = ["TrainState", "Problem", "Trajectory", "Outcome", "simulate", "evaluate"]

#: Fouling resistance that stands for a bypassed bundle [m²K/W]: U below 0.01 W/m²K, so no heat crosses it.
BYPASS_RF = 100.0


@dataclass(frozen=True)
class TrainState:
    """What the schedule needs from one batched train solve (arrays of shape (K,))."""

    furnace_duty: np.ndarray  # fired duty [W]
    furnace_inlet: np.ndarray  # [K]
    conditions: tuple  # per bundle: dict Re, Pr, T_film [K], shear [Pa] of its tube side, arrays (K,)
    converged: np.ndarray  # bool (K,)


@dataclass(frozen=True)
class Problem:
    """Everything the optimiser needs, in SI, checked at the edge by :func:`schedule_cleaning`."""

    tags: tuple
    laws: tuple
    calendar: object
    cleaning_cost: np.ndarray  # (n,) currency per cleaning
    fuel_price: float  # currency per J of fired duty
    evaluator: object  # callable (rf (K, n), bypass (K, n) bool) -> TrainState; counts its solves
    turnaround_mask: np.ndarray  # (n,) bool: bundles cleaned at each turnaround
    max_duty: float = np.inf  # furnace maximum fired duty [W]
    margin_per_watt_s: float = 0.0  # currency per (W of excess fired duty · s): lost-throughput price
    clean: TrainState = field(default=None, repr=False)  # the train with every bundle at its residual

    @property
    def n(self) -> int:
        return len(self.tags)

    @property
    def needs_conditions(self) -> bool:
        return any(getattr(law, "needs_conditions", False) for law in self.laws)

    @property
    def residual(self) -> np.ndarray:
        return np.array([law.residual for law in self.laws])

    @property
    def rf_now(self) -> np.ndarray:
        return np.array([law.rf_now for law in self.laws])

    def weights(self) -> np.ndarray:
        """Seconds of fired fuel counted in each period (0 while the unit is down for a turnaround)."""
        cal = self.calendar
        return np.where(cal.down, 0.0, cal.period)


@dataclass(frozen=True)
class Trajectory:
    rf: np.ndarray  # (C, P, n) mid-period resistance of each bundle [m²K/W] (residual while out)
    out: np.ndarray  # (C, P, n) bool, out of service


@dataclass(frozen=True)
class Outcome:
    """A batch of schedules, fully evaluated."""

    schedules: np.ndarray  # (C, n, P) bool
    trajectory: Trajectory
    furnace_duty: np.ndarray  # (C, P) [W]
    furnace_inlet: np.ndarray  # (C, P) [K]
    fuel: np.ndarray  # (C,) currency: fired fuel over the clean train
    cleaning: np.ndarray  # (C,)
    lost_throughput: np.ndarray  # (C,)
    unconverged: np.ndarray  # (C,) number of periods whose train solve did not converge

    @property
    def total(self) -> np.ndarray:
        return self.fuel + self.cleaning + self.lost_throughput


def _step(law, rf, dt, cond):
    return law.step(rf, dt, cond)


def simulate(problem: Problem, y: np.ndarray, conditions=None) -> Trajectory:
    """Deposit trajectories of schedules ``y`` (C, n, P).

    ``conditions`` (threshold laws only): per bundle a dict of arrays of shape (C, P) (or broadcastable) with the
    tube-side conditions of each period; the laws that need none ignore it.
    """
    y = np.asarray(y, dtype=bool)
    C, n, P = y.shape
    dt = problem.calendar.period
    d = problem.calendar.downtime
    rf = np.broadcast_to(problem.rf_now, (C, n)).astype(float).copy()
    residual = problem.residual
    remaining = np.zeros((C, n), dtype=int)
    rf_mid = np.empty((C, P, n))
    out = np.empty((C, P, n), dtype=bool)
    for p in range(P):
        start = y[:, :, p]
        remaining = np.where(start, d, remaining)
        rf = np.where(start, residual, rf)
        is_out = remaining > 0
        out[:, p, :] = is_out
        for i, law in enumerate(problem.laws):
            cond = None
            if conditions is not None and conditions[i] is not None:
                cond = {k: np.broadcast_to(v, (C, P))[:, p] for k, v in conditions[i].items()}
            elif getattr(law, "needs_conditions", False):
                cond = {k: v for k, v in problem.clean.conditions[i].items()}
            half = _step(law, rf[:, i], 0.5 * dt, cond)
            full = _step(law, rf[:, i], dt, cond)
            rf_mid[:, p, i] = np.where(is_out[:, i], residual[i], half)
            rf[:, i] = np.where(is_out[:, i], rf[:, i], full)
        remaining = np.maximum(remaining - 1, 0)
    return Trajectory(rf=rf_mid, out=out)


def _solve_states(problem: Problem, traj: Trajectory):
    """One batched train solve over every distinct (deposit, bypass) state of the trajectories."""
    C, P, n = traj.rf.shape
    rf = np.where(traj.out, BYPASS_RF, traj.rf).reshape(C * P, n)
    key = np.round(rf / 1e-9).astype(np.int64)  # 1e-9 m²K/W resolution: states closer than that are one state
    uniq, inverse = np.unique(key, axis=0, return_inverse=True)
    inverse = np.asarray(inverse).reshape(-1)
    first = np.zeros(len(uniq), dtype=int)
    first[inverse[::-1]] = np.arange(C * P)[::-1]
    rf_u = rf[first]
    state = problem.evaluator(np.where(rf_u >= BYPASS_RF, 0.0, rf_u), rf_u >= BYPASS_RF)
    duty = np.asarray(state.furnace_duty, dtype=float)[inverse].reshape(C, P)
    inlet = np.asarray(state.furnace_inlet, dtype=float)[inverse].reshape(C, P)
    conv = np.asarray(state.converged, dtype=bool)[inverse].reshape(C, P)
    conds = tuple(None if c is None else {k: np.asarray(v, dtype=float)[inverse].reshape(C, P) for k, v in c.items()}
                  for c in state.conditions)
    return duty, inlet, conv, conds


def evaluate(problem: Problem, y: np.ndarray, passes: int = 2) -> Outcome:
    """Evaluate schedules ``y`` (C, n, P) on the full train model.

    Threshold laws take their growth rates from the train state of each period: the trajectory is simulated with the
    clean train's conditions, the train is solved along it, and the trajectory simulated again with those conditions
    (``passes`` times in all); other laws need one pass.
    """
    y = np.asarray(y, dtype=bool)
    traj = simulate(problem, y)
    duty, inlet, conv, conds = _solve_states(problem, traj)
    for _ in range(passes - 1 if problem.needs_conditions else 0):
        traj = simulate(problem, y, conds)
        duty, inlet, conv, conds = _solve_states(problem, traj)
    w = problem.weights()
    clean = float(np.asarray(problem.clean.furnace_duty).reshape(-1)[0])
    fuel = np.sum((duty - clean) * w, axis=1) * problem.fuel_price
    cleaning = np.sum(y * problem.cleaning_cost[None, :, None], axis=(1, 2))
    excess = np.maximum(duty - problem.max_duty, 0.0) if np.isfinite(problem.max_duty) else np.zeros_like(duty)
    lost = np.sum(excess * w, axis=1) * problem.margin_per_watt_s
    return Outcome(schedules=y, trajectory=traj, furnace_duty=duty, furnace_inlet=inlet, fuel=fuel,
                   cleaning=cleaning.astype(float), lost_throughput=lost, unconverged=np.sum(~conv, axis=1))
