"""The cleaning schedule as a mixed-integer linear programme on a linearised train model.

Smaïli, Vassiliadis & Wilson (2001) pose the cleaning schedule of a preheat train as binary decisions per exchanger
and period against the energy and cleaning cost; with the train's response to fouling linearised, the problem is a
mixed-integer *linear* programme. It is written here in its run (path) form, which is much tighter than period
binaries with big-M resets: for each bundle, a binary ``x[u, b]`` chooses a run that starts at period ``u`` (clean,
or today's deposit for the first run) and ends with a cleaning that starts at period ``b``; the bundle is back in
service at ``b + downtime``, where its next run starts. Each bundle's runs form a path from the first period to the
end of the horizon (flow conservation: a shortest-path problem, whose LP relaxation is integral); only the crew
limit couples the bundles. The cost of a run is exact for the linearised model:

- fuel: Σ over its periods of (price · period · g_i · (deposit − residual)), the deposit grown by the bundle's law
  one period at a time (mid-period values), ``g_i`` the secant sensitivity of the fired duty to bundle ``i``'s deposit
  (from the full train);
- the cleaning cost, and the fired duty lost while bypassed over the downtime (``β_i``, from the full train);
- a cleaning at a planned turnaround costs no fuel (the unit is down) and does not count against the crews.

Blackouts remove the runs whose cleaning would overlap them, the minimum interval removes the short runs, and a
turnaround forbids runs that go through it. HiGHS returns the gap to its dual bound: a bound on how far the schedule
can be from optimal *for the linearised model*.

References
----------
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
    optimal management of cleaning. Energy & Fuels 15, 1038-1056.
Huangfu, Q., Hall, J. A. J. (2018). Parallelizing the dual revised simplex method. Math. Prog. Comp. 10, 119-142
    (HiGHS, the solver behind ``scipy.optimize.milp``).
"""
from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
from scipy import optimize, sparse

__all__ = ["Linearisation", "MilpResult", "solve_milp", "run_costs"]


@dataclass(frozen=True)
class Linearisation:
    """The train's response to each bundle's state, around a reference trajectory (all SI)."""

    g: np.ndarray  # (n,) W of fired duty per m²K/W of deposit
    beta: np.ndarray  # (n,) W of fired duty while bypassed, over the bundle at its residual
    a: np.ndarray  # (n, P) recursion factor of each period: rf' = a·rf + c
    c: np.ndarray  # (n, P) recursion increment [m²K/W]


@dataclass(frozen=True)
class MilpResult:
    schedule: np.ndarray  # (n, P) bool: cleaning starts
    objective: float  # linearised cost [currency], fuel counted over the residual deposit
    gap: float  # relative gap to HiGHS's dual bound (nan when unknown)
    status: str
    seconds: float
    arcs: int


def _deposits(law, a, c, rf_start, P, start):
    """Mid-period deposits of a run starting at ``start`` with ``rf_start``, for periods start..P-1."""
    out = np.empty(P - start)
    rf = rf_start
    for k, p in enumerate(range(start, P)):
        # half a period on: exact for the linear recursion with a = q², c split accordingly
        half_a = np.sqrt(a[p])
        half_c = c[p] / (1.0 + half_a) if half_a != 1.0 else 0.5 * c[p]
        out[k] = half_a * rf + half_c
        rf = a[p] * rf + c[p]
    return out


def run_costs(problem, lin):
    """For each bundle: the cumulative fuel cost of runs from every start, ``F[i][u]`` (array over end periods)."""
    cal = problem.calendar
    P = cal.periods
    w = problem.weights() * problem.fuel_price
    res = problem.residual
    table = []
    for i, law in enumerate(problem.laws):
        rows = {}
        starts = [("now", 0, law.rf_now)] + [(u, u, law.residual) for u in range(P)]
        for key, u, rf0 in starts:
            dep = _deposits(law, lin.a[i], lin.c[i], rf0, P, u)
            rows[key] = np.concatenate([[0.0], np.cumsum(w[u:] * lin.g[i] * (dep - res[i]))])
        table.append(rows)
    return table


def solve_milp(problem, lin: Linearisation, time_limit: float = 20.0, crews: int = 1) -> MilpResult | None:
    """Solve the linearised schedule in run form; None when HiGHS found no feasible schedule in the time given."""
    cal = problem.calendar
    n, P, d, m = problem.n, cal.periods, cal.downtime, cal.min_interval
    w = problem.weights() * problem.fuel_price
    can = cal.can_start()
    tset = set(cal.turnaround)
    t_len = cal.turnaround_length
    fuel = run_costs(problem, lin)
    cum_w = np.concatenate([[0.0], np.cumsum(w)])
    cols_cost, arc_of = [], []  # arc: (bundle, start node, cleaning period or None, next node)
    for i in range(n):
        forced = problem.turnaround_mask[i]
        nodes = ["now"] + list(range(P))
        for u in nodes:
            u0 = 0 if u == "now" else u
            cum = fuel[i][u]
            # a run may not pass a turnaround of this bundle without being cleaned there
            first_t = min((t for t in tset if t >= u0), default=None) if forced else None
            last_b = P - 1 if first_t is None else first_t
            # end of horizon without a cleaning (only if no turnaround lies ahead)
            if first_t is None:
                cols_cost.append(float(cum[P - u0]))
                arc_of.append((i, u, None, "end"))
            for b in range(u0, last_b + 1):
                at_t = forced and b in tset
                if not at_t:
                    if not can[b]:
                        continue
                    if u != "now" and b - (u0 - d) < m:  # the previous cleaning started at u0 - d
                        continue
                    if u != "now" and b == u0 and d == 0:  # a cleaning right after a cleaning
                        continue
                length = t_len if at_t else d
                cost = float(cum[b - u0]) + float(problem.cleaning_cost[i])
                if not at_t:
                    cost += float(lin.beta[i] * (cum_w[min(b + length, P)] - cum_w[b]))
                nxt = b + length
                cols_cost.append(cost)
                arc_of.append((i, u, b, "end" if nxt >= P else nxt))
    nv = len(cols_cost)
    # flow conservation: one unit leaves "now" of each bundle; at every other node in = out; "end" absorbs
    node_index = {}
    for i in range(n):
        for u in ["now"] + list(range(P)):
            node_index[(i, u)] = len(node_index)
    rows, cols, vals = [], [], []
    for k, (i, u, b, v) in enumerate(arc_of):
        rows.append(node_index[(i, u)])
        cols.append(k)
        vals.append(1.0)  # out of u
        if v != "end":
            rows.append(node_index[(i, v)])
            cols.append(k)
            vals.append(-1.0)  # into v
    nn = len(node_index)
    rhs = np.zeros(nn)
    for i in range(n):
        rhs[node_index[(i, "now")]] = 1.0
    A_flow = sparse.csr_array((vals, (rows, cols)), shape=(nn, nv))
    # crews: cleanings (not at a turnaround) whose downtime covers period p
    crow, ccol = [], []
    for k, (i, u, b, v) in enumerate(arc_of):
        if b is None or (problem.turnaround_mask[i] and b in tset):
            continue
        for p in range(b, min(b + max(d, 1), P)):  # a crew is busy at least the period the cleaning starts in
            crow.append(p)
            ccol.append(k)
    A_crew = sparse.csr_array((np.ones(len(crow)), (crow, ccol)), shape=(P, nv))
    constraints = [optimize.LinearConstraint(A_flow, rhs, rhs)]
    if crews < n:
        constraints.append(optimize.LinearConstraint(A_crew, -np.inf, float(crews)))
    t0 = time.perf_counter()
    c = np.array(cols_cost)
    bounds = optimize.Bounds(0, 1)
    # The LP relaxation first: without the crew limit it is a shortest-path problem and its solution is integral;
    # when it is, it is the optimum. Otherwise branch and bound, with the LP value as the bound for the gap.
    lp = optimize.milp(c, integrality=np.zeros(nv), bounds=bounds, constraints=constraints)
    if lp.x is not None and np.all(np.minimum(lp.x, 1.0 - lp.x) < 1e-7):
        res, gap = lp, 0.0
    else:
        res = optimize.milp(c, integrality=np.ones(nv), bounds=bounds, constraints=constraints,
                            options={"time_limit": float(time_limit), "mip_rel_gap": 1e-3, "disp": False})
        if res.x is None:
            return None
        bound = float(getattr(res, "mip_dual_bound", np.nan) or np.nan)
        if lp.x is not None:
            bound = max(bound, float(lp.fun)) if np.isfinite(bound) else float(lp.fun)
        gap = max(float(res.fun) - bound, 0.0) / max(abs(float(res.fun)), 1e-12) if np.isfinite(bound) else np.nan
    seconds = time.perf_counter() - t0
    y = np.zeros((n, P), dtype=bool)
    for k in np.flatnonzero(res.x > 0.5):
        i, u, b, v = arc_of[k]
        if b is not None:
            y[i, b] = True
    return MilpResult(schedule=y, objective=float(res.fun), gap=float(gap),
                      status=str(res.message), seconds=seconds, arcs=nv)
