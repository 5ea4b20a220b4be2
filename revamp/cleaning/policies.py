"""Building blocks of the cleaning-plan search: feasibility and repair of a schedule under crews, blackouts and
turnarounds; the reference policies (each bundle at its own Epstein optimum interval, all bundles at one fixed
interval); the linearisation of the train around a trajectory; the local search on the full train model.

References
----------
Epstein, N. (1979). Optimum evaporator cycles with scale formation. Can. J. Chem. Eng. 57, 659-661.
Ma, R. S. T., Epstein, N. (1981). Optimum cycles for falling rate processes. Can. J. Chem. Eng. 59, 631-633.
"""
from __future__ import annotations

import time

import numpy as np

from .milp import Linearisation
from .model import evaluate


# ------------------------------------------------------------------------------------------------ policies
def _feasible(problem, y, crews) -> bool:
    cal = problem.calendar
    n, P = y.shape
    d, m = cal.downtime, cal.min_interval
    tmask = np.zeros(P, dtype=bool)
    tmask[list(cal.turnaround)] = True
    can = cal.can_start()
    busy = np.zeros(P, dtype=int)
    for i in range(n):
        starts = np.flatnonzero(y[i])
        if len(starts) > 1 and np.min(np.diff(starts)) < m:
            return False
        for p in starts:
            forced = problem.turnaround_mask[i] and tmask[p]
            if not can[p] and not forced:
                return False
            if not forced:
                busy[p:p + max(d, 1)] += 1
        if problem.turnaround_mask[i] and not all(y[i, p] for p in cal.turnaround):
            return False
    return bool(np.all(busy <= crews))


def _repair(problem, y, crews):
    """Move each cleaning (in time order) to the first period from its own at which it fits; drop it if none."""
    cal = problem.calendar
    n, P = y.shape
    d, m = cal.downtime, cal.min_interval
    can = cal.can_start()
    out = np.zeros_like(y)
    busy = np.zeros(P + max(d, 1), dtype=int)
    forced = np.zeros_like(y)
    for i in range(n):
        if problem.turnaround_mask[i]:
            forced[i, list(cal.turnaround)] = True
    out |= forced
    last = {i: [p for p in cal.turnaround] if problem.turnaround_mask[i] else [] for i in range(n)}
    for p, i in sorted((p, i) for i, p in zip(*np.nonzero(y & ~forced))):
        q = p
        while q < P:
            clear = all(abs(q - s) >= m for s in last[i])
            if clear and can[q] and np.all(busy[q:q + max(d, 1)] < crews):
                break
            q += 1
        if q < P:
            out[i, q] = True
            busy[q:q + max(d, 1)] += 1
            last[i].append(q)
    return out


def _own_optimum(problem, lin, crews):
    """Each bundle at its own Epstein optimum interval (its neighbours clean), then fitted to crews and blackouts."""
    from ..monitoring.cleaning import optimal_cleaning_interval

    cal = problem.calendar
    n, P, dt = problem.n, cal.periods, cal.period
    y = np.zeros((n, P), dtype=bool)
    for i, law in enumerate(problem.laws):
        # the bundle's deposit from clean, with the clean train's conditions, on a fine grid of the horizon
        grid = np.linspace(0.0, P * dt, 2001)
        rf = np.empty_like(grid)
        cond = problem.clean.conditions[i] if getattr(law, "needs_conditions", False) else None
        if cond is not None:
            cond = {k: np.asarray(v).reshape(-1)[0] for k, v in cond.items()}
        rf[0] = law.residual
        for k in range(1, len(grid)):
            rf[k] = law.step(rf[k - 1], grid[k] - grid[k - 1], cond)
        loss = lambda t, rf=rf: problem.fuel_price * lin.g[i] * np.interp(t, grid, rf - law.residual)  # noqa: E731
        best = optimal_cleaning_interval(loss, float(problem.cleaning_cost[i]), downtime=cal.downtime * dt,
                                         downtime_cost_rate=problem.fuel_price * max(lin.beta[i], 0.0),
                                         t_max=P * dt)
        if best.bounded:
            continue
        tau = max(int(round(best.interval / dt)), 1)
        age = float(np.interp(law.rf_now, rf, grid)) if rf[-1] > rf[0] else 0.0
        p = max(int(round((best.interval - age) / dt)), 0)
        while p < P:
            y[i, p] = True
            p += tau + cal.downtime
    return _repair(problem, y, crews)


def _fixed_interval(problem, interval, crews):
    cal = problem.calendar
    n, P = problem.n, cal.periods
    y = np.zeros((n, P), dtype=bool)
    p = interval
    while p < P:
        for k in range(n):
            q = p + (k // crews) * cal.downtime
            if q < P:
                y[k, q] = True
        p += interval
    return _repair(problem, y, crews)


# ------------------------------------------------------------------------------------------------ linearise
def _linearise(problem, ref_rf) -> Linearisation:
    """Secant sensitivities of the fired duty around deposits ``ref_rf`` (n,), one batched solve (2n + 1 states)."""
    n = problem.n
    res = problem.residual
    ref = np.maximum(ref_rf, res + 1e-6)
    rows = [ref]
    byp = [np.zeros(n, dtype=bool)]
    for i in range(n):
        r = ref.copy()
        r[i] = res[i]
        rows.append(r)
        byp.append(np.zeros(n, dtype=bool))
    for i in range(n):
        rows.append(ref.copy())
        b = np.zeros(n, dtype=bool)
        b[i] = True
        byp.append(b)
    state = problem.evaluator(np.array(rows), np.array(byp))
    q = np.asarray(state.furnace_duty, dtype=float)
    g = np.maximum((q[0] - q[1:n + 1]) / (ref - res), 0.0)
    beta = np.maximum(q[n + 1:] - q[1:n + 1], 0.0)
    cal = problem.calendar
    P, dt = cal.periods, cal.period
    a = np.ones((n, P))
    c = np.zeros((n, P))
    for i, law in enumerate(problem.laws):
        cond = None
        if getattr(law, "needs_conditions", False):  # the conditions of the reference state, held over the plan
            cond = {k: float(np.atleast_1d(v)[0]) for k, v in state.conditions[i].items()}
        ai, ci = law.recursion(np.full(P, dt), cond)
        a[i], c[i] = np.broadcast_to(ai, (P,)), np.broadcast_to(ci, (P,))
    return Linearisation(g=g, beta=beta, a=a, c=np.maximum(c, 0.0))


def _linear_cost(problem, lin, y):
    """The MILP objective of a schedule (n, P), for the linearisation error (constant terms included)."""
    from .model import simulate

    traj = simulate(problem, y[None])
    w = problem.weights() * problem.fuel_price
    rf = traj.rf[0]
    cost = np.sum(w[:, None] * lin.g[None, :] * (rf - problem.residual[None, :]))
    cost += np.sum(w[:, None] * traj.out[0] * lin.beta[None, :])
    return float(cost + np.sum(y * problem.cleaning_cost[:, None]))


# ------------------------------------------------------------------------------------------------ search
def _moves(problem, y, crews, rng, limit):
    """Neighbouring feasible schedules of ``y``: shift, drop or add one cleaning."""
    cal = problem.calendar
    n, P = y.shape
    tmask = np.zeros(P, dtype=bool)
    tmask[list(cal.turnaround)] = True
    out = []
    for i, p in zip(*np.nonzero(y)):
        if problem.turnaround_mask[i] and tmask[p]:
            continue
        for s in (-8, -4, -2, -1, 1, 2, 4, 8):
            if 0 <= p + s < P:
                z = y.copy()
                z[i, p] = False
                z[i, p + s] = True
                out.append(z)
        z = y.copy()
        z[i, p] = False
        out.append(z)
    for i in range(n):  # add a cleaning in the middle of the bundle's longest run
        starts = np.concatenate([[0], np.flatnonzero(y[i]), [P]])
        k = int(np.argmax(np.diff(starts)))
        mid = (starts[k] + starts[k + 1]) // 2
        for s in (0, -2, 2):
            if 0 <= mid + s < P and not y[i, mid + s]:
                z = y.copy()
                z[i, mid + s] = True
                out.append(z)
    out = [z for z in out if _feasible(problem, z, crews)]
    if len(out) > limit:
        out = [out[k] for k in rng.choice(len(out), size=limit, replace=False)]
    return out


def _search(problem, best_y, best_cost, crews, deadline, rng, batch=48):
    """Best-improvement local search on the full model until no move improves or the time is up."""
    while time.perf_counter() < deadline:
        cands = _moves(problem, best_y, crews, rng, batch)
        if not cands:
            break
        outcome = evaluate(problem, np.array(cands))
        k = int(np.argmin(outcome.total))
        if outcome.total[k] < best_cost * (1 - 1e-9) - 1e-9:
            best_y, best_cost = cands[k], float(outcome.total[k])
        else:
            break
    return best_y, best_cost
