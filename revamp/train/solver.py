"""Solving a train: every exchanger rated at the inlets the network gives it, all cases at once.

The method is successive linearization. Rated at any inlet temperatures, an exchanger's outlets are linear in its two
inlets for the effectiveness and heat-capacity rates of that rating (effectiveness-NTU):

    t_out_shell = (1 - a_s)·t_in_shell + a_s·t_in_tube,   a_s = ε·C_min/C_shell
    t_out_tube  = a_t·t_in_shell + (1 - a_t)·t_in_tube,   a_t = ε·C_min/C_tube

(the same form whichever side is hot). With the routes (an outlet feeds the next inlet, a split feeds its branches,
a remix is the heat-capacity-weighted mean of its branches) the whole network is then one linear system in the port
temperatures, solved exactly with numpy for every case at once, interlinked routes included (no tearing, no order).
The exchangers are re-rated at the new inlets (one vectorized ``rate()`` per exchanger per iteration, all cases of a
sweep in that call; :mod:`revamp.train.passes`) and the system solved again, until no inlet moves by more than
``tol``. Only the temperature dependence of the properties makes this iterate: with constant properties the second
pass is exact.

The ratings of a pass whose outlet maps only steer the next pass (the first one, from the supply temperatures, and
the Newton passes with their finite-difference probes) start from the state the last linear solve predicts (its
outlets at these inlets, each wall kept at its place between the two mean temperatures) and stop at a looser step
(5 K on the first pass, 2.5e-4 K on a probing one: derivatives to about 1 %, which keeps the Newton step's
convergence); a case converges only on a pass rated to the rating's own 1e-6 K step. The closing pass starts from
the predicted state too (its inlets have moved by about tol since the last pass): each rating still stops at the
rating's own step, walls included, so that it agrees with ``rate()`` from the inlets to within that step (see
below for the seams of Taborek's fits).

A sweep of constant-property streams (no air cooler) takes plain passes, without probes: only the tube wall's
conductivity then depends on temperature, and each plain pass cuts the change by about 1e-4.

A sweep (more cases than the rating iterates on floats) whose properties depend on temperature takes relaxed passes
first: each rating is evaluated once, at the state the last linear solve predicts (the first pass: that of a first
guess with every exchanger at an effectiveness of 0.4, not the supply temperatures),
and the linear step uses that evaluation's effectiveness and capacity rates. The rating's own iteration and the
network's then converge together, each pass cutting the change by about a factor 5 to 10 for one evaluation per
rating, where a Newton pass with probes takes three blocks of several evaluations. A case expected within half of
tol (and of 1e-4 K, so that its closing rating starts close) after its next pass waits; when none is relaxed any
more, or few are left, the waiting cases close together and the rest go on with Newton passes as one group formed
at once (so do all, when the median case would need more than 12 further relaxed passes, and after 20 relaxed
passes or 6 passes short of ``max_iter``; with ``max_iter`` below 9 a sweep takes none). Relaxed passes never end
a case. A sweep's closing passes ask for outlet maps too, which carry the state each case's rating stopped at; the
result's Ratings are built once, one call per exchanger, by evaluating each finished case at that state
(``warm_start``'s ``settled`` cases: the same evaluation at the same state, so the same numbers). A closing rating
starts from the predicted state and still stops at the rating's own step, walls included (within it of a rating
from the inlets), and a case that took halved steps at a band edge of Taborek's fits (where its stop is looser and
depends on its start) is iterated again from its inlets (see ``rating_loop._cold_at_seam``).

An air cooler (a match with :class:`~revamp.train.AirSide`) takes the shell side's two ports for its air: the air
inlet is tied to the stated ambient (a fixed input, like a stream's supply), the air outlet is the rated mixed outlet;
its tube outlet feeds its stream's route like any other outlet. It is rated with its own ``rate()`` (an
:class:`~revamp.rating_air.AirRating`), whose effectiveness and capacity rates give the same linear form.

A case that does not converge, or whose ratings fail (a stream leaving its fluid's single-phase range), is flagged in
``TrainResult.converged`` and named in the warnings; it is never dropped or replaced.

The result's tables (exchangers, streams, points), limits and furnace duty are assembled in
:mod:`revamp.train.outcome`, with :func:`enthalpy_change` (re-exported here).

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
optimal management of cleaning. *Energy & Fuels* 15, 1038-1056.
"""
from __future__ import annotations

import numpy as np

from ..errors import InputError
from ..fluids.table import ConstantFluid
from ..rating import _FLOAT_CASES, _TOL_K
from .network import Point, Split
from .outcome import _SIDES, _result, _strip_probes
from .outcome import enthalpy_change  # noqa: F401  (lives in train/outcome.py now; re-exported, public here too)
from .linear import _linear_solve, _linear_solve_dense  # noqa: F401  (the dense form: tests' reference)
from .passes import _chord, _coefficients, _ntu_map, _rate_all, _update_equal_dp
from .result import TrainResult

__all__ = ["solve", "enthalpy_change"]

_PROBE_K = 0.05  # inlet step of the finite differences for the Newton step [K] (far above the ratings' 1e-6 K stop)
_SHARE_TOL = 1e-6  # largest change of an equal-pressure-drop branch share at convergence [-]
_CHORD_FALL = 0.05  # a Newton pass whose change fell below this share of the last one's keeps its derivatives
# An intermediate pass (its outlet maps are refined by the next one) lets its ratings stop at a looser step [K]:
_FIRST_TOL = 5.0  # the first pass, from the supply temperatures (the change after it is tens of kelvin)
_PROBE_TOL = 5e-3 * _PROBE_K  # probing passes: each block within ~2.5e-4 K (the derivatives to ~1 %)
# A sweep whose properties depend on temperature first takes single-evaluation (relaxed) passes (see solve):
_RELAX_READY = 1e-4  # a case is ready when expected within half the smaller of tol and this [K] (the closing
# ratings stop at 1e-6 K steps: from a state much farther off they iterate longer than relaxed passes would take)
_RELAX_PASSES = 20  # at most this many relaxed passes, then the Newton passes for every case left
_RELAX_RESERVE = 6  # ... and never within this many passes of max_iter (three or more, or none at all)
_RELAX_LEFT = 12  # ... or once the median case would need more than this many more (from the fourth on)
_RELAX_FEW = 0.1  # ... or once no more than this share of the live cases is still relaxed
_GUESS_EPS = 0.4  # the effectiveness of every exchanger in the first guess of a relaxed sweep (preheat exchangers
# run at about 0.3 to 0.7: from memory, no source; the guess only places the first pass's properties, and on the
# benchmark's petroleum sweep any value from 0.2 to 0.55 saves one relaxed pass of eleven)
_NEWTON, _RELAXED, _WAITING, _CLOSING = 0, 1, 2, 3  # a case's mode in a solve (see solve)
_MIN_PASSES = 8  # passes before a case whose change stopped shrinking is given up (flagged, never dropped)
_STALL_PASSES = 3  # ... when its change is above half of what it was this many passes earlier


def _clipped_props(fluid, T):
    hi = fluid.t_max - 1e-6 * fluid.t_max if np.isfinite(fluid.t_max) else fluid.t_max
    return fluid.props(np.clip(np.asarray(T, float), fluid.t_min, hi))


class _Expr:
    """A temperature as a linear expression of the port temperatures: ``const + Σ coef·x[idx]``."""

    __slots__ = ("coefs", "const")

    def __init__(self, coefs, const):
        self.coefs, self.const = coefs, const

    def value(self, x):
        v = np.array(self.const, dtype=float, copy=True)
        for idx, c in self.coefs.items():
            v = v + c * x[:, idx]
        return v


def _mix(exprs, weights):
    total = sum(weights)
    coefs, const = {}, 0.0
    for e, w in zip(exprs, weights):
        share = w / total
        const = const + share * e.const
        for idx, c in e.coefs.items():
            coefs[idx] = coefs.get(idx, 0.0) + share * c
    return _Expr(coefs, const)


class _Plan:
    """Port numbering, flow fractions and the case arrays of a train (flattened to ``ncase``)."""

    def __init__(self, train):
        self.train = train
        self.shape = train.shape
        self.ncase = int(np.prod(self.shape, dtype=int)) if self.shape else 1
        self.tags = list(train.exchangers)
        self.index = {t: i for i, t in enumerate(self.tags)}
        self.n = 4 * len(self.tags)
        self.frac = {}  # (tag, side) -> share of its stream's flow, per case
        self.split_frac = {}  # id(split) -> [share of each branch, per case]
        self.equal_dp = []  # (stream, split) whose shares follow equal branch pressure drops
        self.dp_secant = {}  # id(split) -> the last log share and log dp spreads (branches, ncase), the exponent

        def walk(stream, items):
            for item in items:
                if isinstance(item, str):
                    self.frac[(item, train.exchangers[item].side_of(stream))] = np.ones(self.ncase)
                elif isinstance(item, Split):
                    shares = [np.full(self.ncase, fb) for fb in item.fractions]
                    self.split_frac[id(item)] = shares
                    if item.equal_dp:
                        self.equal_dp.append((stream, item))
                    for br, share in zip(item.branches, shares):
                        for tag in br:  # branches hold exchanger tags only (no nested splits)
                            self.frac[(tag, train.exchangers[tag].side_of(stream))] = share

        for s, route in train.routes.items():
            walk(s, route)
        self.flow = {s: self.flat(st.flow) for s, st in train.streams.items()}
        self.supply = {s: self.flat(st.t_in) for s, st in train.streams.items()}
        self.fouling = {(t, side): self.flat(getattr(m, f"fouling_{side}"))
                        for t, m in train.exchangers.items() for side in _SIDES}
        self.air = {}  # air cooler tag -> its air per case (the air takes the shell side's ports)
        for t, m in train.exchangers.items():
            if m.is_air_cooler:
                a = m.air
                self.air[t] = {"air_in": self.flat(a.air_in), "altitude": a.altitude,
                               "air_flow": None if a.air_flow is None else self.flat(a.air_flow),
                               "face_velocity": None if a.face_velocity is None else self.flat(a.face_velocity)}
                self.frac[(t, "shell")] = np.ones(self.ncase)
                self.fouling[(t, "shell")] = self.flat(a.fouling)

    def flat(self, v):
        return np.broadcast_to(np.asarray(v, float), self.shape).reshape(self.ncase).copy()

    def fed(self):
        """Where no route splits, the feed of every inlet, fixed for the whole solve: ``(rows, e, k, const_rows,
        consts)``: inlet unknown ``rows[j]`` is outlet ``k[j]`` of exchanger ``e[j]``; ``const_rows`` take the fixed
        temperatures ``consts`` (ncase, ...) (a supply or an air inlet). None where a split's remix weights follow
        the temperatures (then :meth:`walk` gives the inlets pass by pass)."""
        if not hasattr(self, "_fed"):
            self._fed = None
            if not any(isinstance(item, Split) for route in self.train.routes.values() for item in route):
                links, _, _, _ = self.walk(None)
                rows, es, ks, const_rows, consts = [], [], [], [], []
                for port, expr in links:
                    if expr.coefs:
                        (i, c), = expr.coefs.items()  # one outlet, no constant
                        if c != 1.0 or np.any(expr.const != 0.0):  # pragma: no cover - a route link is a plain feed
                            raise AssertionError(f"route link to port {port} is not a plain feed")
                        e, k = divmod(i // 2, 2)
                        rows.append(port // 2)
                        es.append(e)
                        ks.append(k)
                    else:
                        const_rows.append(port // 2)
                        consts.append(np.broadcast_to(np.asarray(expr.const, float), (self.ncase,)))
                self._fed = (np.array(rows, int), np.array(es, int), np.array(ks, int), np.array(const_rows, int),
                             np.stack(consts, axis=1) if consts else np.zeros((self.ncase, 0)))
        return self._fed

    def port(self, tag, side, out=False):
        return 4 * self.index[tag] + (2 if side == "tube" else 0) + (1 if out else 0)

    def walk(self, x, on_exchanger=None, idx=None):
        """Follow every route: inlet equations ``(port, expr)``, point and final temperature expressions, and
        stream pressure-drop sums (through ``on_exchanger(tag, side) -> dp`` when given)."""
        train = self.train
        links, points, finals, dps = [], {}, {}, {}

        def walk(stream, items, node, dp):
            fluid = train.streams[stream].fluid
            for item in items:
                if isinstance(item, str):
                    side = train.exchangers[item].side_of(stream)
                    links.append((self.port(item, side), node))
                    node = _Expr({self.port(item, side, out=True): 1.0}, 0.0)
                    if on_exchanger is not None:
                        dp = dp + on_exchanger(item, side)
                elif isinstance(item, Point):
                    points[item.name] = node
                else:  # Split
                    ends, weights, branch_dp = [], [], []
                    shares = self.split_frac[id(item)]
                    for br, fb in zip(item.branches, shares if idx is None else [f[idx] for f in shares]):
                        end, bdp = walk(stream, br, node, 0.0)
                        ends.append(end)
                        branch_dp.append(bdp)
                        # heat-capacity-weighted remix, cp of each branch at its own outlet
                        weights.append(fb * _clipped_props(fluid, end.value(x)).heat_capacity)
                    node = _mix(ends, weights)
                    dp = dp + np.max(np.broadcast_arrays(*branch_dp), axis=0)
            return node, dp

        def supply(s):
            return self.supply[s] if idx is None else self.supply[s][idx]

        for s, route in train.routes.items():
            finals[s], dps[s] = walk(s, route, _Expr({}, supply(s)), 0.0)
        for tag, air in self.air.items():  # an air cooler's air enters at the stated ambient
            links.append((self.port(tag, "shell"), _Expr({}, air["air_in"] if idx is None else air["air_in"][idx])))
        for s in train.streams:
            if s not in finals:  # a stream with no exchangers leaves at its supply temperature
                finals[s], dps[s] = _Expr({}, supply(s)), 0.0
        return links, points, finals, dps


def _fall(last_two, idx):
    """The share by which the largest inlet change of the cases ``idx`` fell over the last pass (both passes rated
    them all; else 1) and that change [K]."""
    (i0, r0), (i1, r1) = last_two
    if not (np.array_equal(i0, idx) and np.array_equal(i1, idx)):
        return 1.0, np.inf
    with np.errstate(invalid="ignore", divide="ignore"):
        last = float(np.nanmax(r1))
        return last / float(np.nanmax(r0)), last


def _initial(plan):
    x = np.empty((plan.ncase, plan.n))
    for tag, m in plan.train.exchangers.items():
        for side in _SIDES:
            t = plan.air[tag]["air_in"] if (m.is_air_cooler and side == "shell") else plan.supply[getattr(m, side)]
            x[:, plan.port(tag, side)] = t
            x[:, plan.port(tag, side, out=True)] = t
    return x


def _guessed_maps(plan, idx):
    """Outlet maps of the cases ``idx`` with every exchanger at one effectiveness (:data:`_GUESS_EPS`) and
    its streams' capacity rates at their supply temperatures: a first guess of the network's temperatures, where a
    sweep's first relaxed pass evaluates its properties (instead of at the supply temperatures, where a stream that
    is heated along its route is far colder, and more viscous, than at most of its exchangers). An air cooler's two
    sides take that effectiveness itself (its air outlet feeds nothing)."""
    eps, ones = np.full(idx.size, _GUESS_EPS), np.ones(idx.size)
    cp = {s: np.asarray(st.fluid.props(plan.supply[s][idx]).heat_capacity, float)
          for s, st in plan.train.streams.items()}
    maps = {}
    for tag, m in plan.train.exchangers.items():
        if m.is_air_cooler:  # equal capacity rates: each side moves by eps of the inlets' difference
            maps[tag] = _ntu_map(eps, ones, ones)
        else:
            maps[tag] = _ntu_map(eps, *(plan.flow[s][idx] * plan.frac[(tag, side)][idx] * cp[s]
                                        for s, side in ((m.shell, "shell"), (m.tube, "tube"))))
    return maps


def _relax_exit(res, fall, fall2, n_relax, tol):
    """Whether each case of a sweep's single-evaluation (relaxed) passes is ready to leave them, and whether the
    sweep goes on with Newton passes instead: ``(ready, to_newton)``.

    Ready: expected within half of ``tol`` (and of :data:`_RELAX_READY`) after the next pass (its change times the
    larger of its last fall and its mean fall over the last two passes); it waits for the others, then all waiting
    cases take their closing pass together (a change that is not finite, a failed case, counts as ready: the failure
    is flagged elsewhere). To Newton: from the fourth relaxed pass on, when the median case would still need more
    than :data:`_RELAX_LEFT` relaxed passes at its mean fall (a train whose properties pull hard on its temperatures:
    Newton's quadratic steps are quicker)."""
    aim = 0.5 * min(tol, _RELAX_READY)
    with np.errstate(invalid="ignore", divide="ignore"):
        ready = (res * np.minimum(np.fmax(fall, fall2), 1.0) < aim) | ~np.isfinite(res)
        left = np.log(aim / res) / np.log(np.minimum(fall2, 1.0 - 1e-9))  # relaxed passes still needed
        slow = ~ready & ~(left <= _RELAX_LEFT)
    return ready, n_relax >= 3 and np.count_nonzero(slow) * 2 > slow.size


class _Group:
    """A set of a solve's cases that take the Newton passes together: their decisions (probes, chord steps, the
    closing pass) are taken over the group, from its own history of changes."""

    def __init__(self, closing=False):
        self.history = []  # (cases, their largest inlet change) per pass of this group
        self.shares = []  # ... and the largest change of their equal-pressure-drop shares
        self.passes = 0
        self.closing = closing  # every pass is a closing pass, without probes (cases near the solution already)


class _Solve:
    """The state of one solve: the port temperatures, each case's status, and what the ratings start from."""

    def __init__(self, train, tol):
        self.plan = plan = _Plan(train)
        self.tol = tol
        self.x = _initial(plan)
        self.inlets = np.array([plan.port(t, s) for t in plan.tags for s in _SIDES])
        self.failed = np.zeros(plan.ncase, dtype=bool)
        self.done = np.zeros(plan.ncase, dtype=bool)
        self.stalled = np.zeros(plan.ncase, dtype=bool)
        self.residual = np.full(plan.ncase, np.inf)
        self.starts = {}  # per exchanger, the outlet and wall temperatures of its last rating: where the next starts
        self.jac = {}  # per exchanger, the outlets' derivatives by the inlets (2, 2, ncase) from the last probes
        self.maps = {}  # per exchanger, the outlet map (2, 2, ncase) of its last pass: the probes', else ε-NTU's
        self.fall = np.ones(plan.ncase)  # per case, the share by which its change fell over its last relaxed pass
        self.fall_two = np.ones(plan.ncase)  # ... and its mean share over its last two (geometric)
        self.ratings, self.rated_all, self.loose = None, False, None  # the last Newton pass's
        self.settled = {}  # per exchanger, the state (4, ncase) each finished case's closing rating stopped at
        self.constant = all(isinstance(st.fluid, ConstantFluid) for st in train.streams.values())
        # constant-property streams and no air: only the tube wall's conductivity depends on temperature, so a plain
        # pass cuts the change by about 1e-4 and a sweep takes no probes (three blocks of ratings for derivatives it
        # hardly needs); a one-case solve keeps them (its probes are cheap on floats, its plain passes rate in full)
        self.plain_passes = plan.ncase > _FLOAT_CASES and not plan.air and self.constant

    def _keep_maps(self, coefs, idx):
        for tag, (j, _) in coefs.items():
            self.maps.setdefault(tag, np.full((2, 2, self.plan.ncase), np.nan))[:, :, idx] = np.array(j, dtype=float)

    def guess(self, idx):
        """Start the cases ``idx`` from the linear solve of :func:`_guessed_maps` (each wall midway between its
        exchanger's two mean temperatures): the first relaxed pass then evaluates there."""
        plan = self.plan
        maps = _guessed_maps(plan, idx)
        g, bad = _linear_solve(plan, self.x[idx], maps, idx)
        x = self.x[idx] = np.where(bad[:, None], self.x[idx], g)
        self._keep_maps(maps, idx)
        for tag in plan.tags:
            ps, pt = plan.port(tag, "shell"), plan.port(tag, "tube")
            state = self.starts.setdefault(tag, np.full((6, plan.ncase), np.nan))
            state[0, idx], state[1, idx] = x[:, ps + 1], x[:, pt + 1]
            state[2, idx] = state[3, idx] = 0.25 * (x[:, ps] + x[:, ps + 1] + x[:, pt] + x[:, pt + 1])
            state[4, idx], state[5, idx] = x[:, ps], x[:, pt]

    def relaxed(self, idx, first):
        """One single-evaluation pass over the cases ``idx``: every exchanger evaluated once at the state the last
        linear solve predicts (the first pass: at the first guess's, see :meth:`guess`), then the linear step on
        the effectiveness-NTU maps of that evaluation. Such a pass never ends a case."""
        plan = self.plan
        if first:
            self.guess(idx)
        xa = self.x[idx]
        ratings = _rate_all(plan, xa, idx, starts=self.starts, outlets_only=True, warm=self.maps,
                            tol=(np.inf, np.inf))
        linear, _ = _coefficients(ratings, xa, plan, idx.size, 0.0)
        self._keep_maps(linear, idx)
        g, bad = _linear_solve(plan, xa, linear, idx)
        _update_equal_dp(plan, ratings, idx)
        self.x[idx] = np.where(bad[:, None], xa, g)
        res = np.where(bad, np.nan, np.max(np.abs(g[:, self.inlets] - xa[:, self.inlets]), axis=1))
        self.failed[idx] |= bad
        with np.errstate(divide="ignore", invalid="ignore"):
            prev = self.residual[idx]
            fall = np.where(np.isfinite(prev) & (prev > 0.0), res / prev, 1.0)
            self.fall_two[idx] = np.sqrt(fall * self.fall[idx])
            self.fall[idx] = fall
        self.residual[idx] = res

    def newton(self, group, idx, first, iterations):
        """One Newton pass of ``group`` over its cases ``idx`` (see the module docstring); ``first``: the first pass
        of the solve, from the supply temperatures."""
        plan, tol, x, history = self.plan, self.tol, self.x, group.history
        group.passes += 1
        xa = x[idx]
        # Newton probes after the first pass (its plain step from the supply temperatures is as good) while the
        # cases still move by more than √tol; the closing pass (quadratic convergence:
        # its change is about the square of the last) rates the cases alone, so its ratings are the final ones
        newton_pass = (not first and not group.closing and not self.plain_passes
                       and np.max(self.residual[idx]) > np.sqrt(tol))
        # once the change has fallen fast (the step is near quadratic: the derivatives barely move any more), the
        # last probes' derivatives are kept for the next steps (a chord step: no probes, a third of the ratings)
        fall, last = _fall(history[-2:], idx) if len(history) >= 2 else (1.0, np.inf)
        chord = newton_pass and bool(self.jac) and fall < _CHORD_FALL
        probe = _PROBE_K if newton_pass and not chord else 0.0
        # the closing pass (no probes after the first) rates to the rating's own stop: its ratings are usually the
        # final ones; so does a chord pass whose change, falling as the last did, may already be within tol
        intermediate = bool(probe) or (chord and fall * last > 10.0 * tol)
        # a few cases: the first and the probing passes ask only for the outlet maps (the result objects cost more
        # than such small ratings), the closing pass rates in full; every pass of a sweep asks for outlet maps, and
        # its Ratings are built once at the end, at the states where its cases' closing ratings stopped
        light_pass = plan.ncase > _FLOAT_CASES or intermediate or first
        # every pass but the first starts its ratings from the state the last linear solve predicts; an
        # intermediate pass lets them stop at a looser step (never looser than what its use needs), the others stop
        # where rate() does: their ratings may be the final ones, and only they may end a case
        if first:
            loose, warm = (_FIRST_TOL, _FIRST_TOL), None
        elif intermediate:
            # a chord pass: its step is already near the solution; its ratings keep the rating's own stop
            loose, warm = ((_PROBE_TOL, _PROBE_TOL) if probe else (_TOL_K, _TOL_K)), self.maps
        else:  # the closing pass: within about tol of the solution, so its predicted state is close
            loose, warm = None, self.maps
        ratings = _rate_all(plan, xa, idx, probe=probe, starts=self.starts, outlets_only=light_pass, warm=warm,
                            tol=loose)
        self.ratings, self.rated_all, self.loose = ratings, idx.size == plan.ncase, loose
        linear, newton = _coefficients(ratings, xa, plan, idx.size, probe)
        if newton is not None:  # keep the derivatives for chord steps
            for tag, (j, _) in newton.items():
                self.jac.setdefault(tag, np.full((2, 2, plan.ncase), np.nan))[:, :, idx] = np.array(j, dtype=float)
        elif chord:
            newton = _chord(ratings, xa, plan, idx, self.jac)
        self._keep_maps(newton or linear, idx)
        g, bad = _linear_solve(plan, xa, linear, idx)
        res = np.where(bad, np.nan, np.max(np.abs(g[:, self.inlets] - xa[:, self.inlets]), axis=1))
        step = g
        if newton is not None:
            xn, bad_n = _linear_solve(plan, xa, newton, idx)
            # the Newton step, unless it is not finite or jumps much farther than the plain pass (a correlation's
            # band edge between the probes): then the plain pass, which converges on its own
            far = np.max(np.abs(xn[:, self.inlets] - xa[:, self.inlets]), axis=1) > 3.0 * res + 1.0
            step = np.where((bad_n | far)[:, None], g, xn)
        fres = _update_equal_dp(plan, ratings, idx)
        fin = ~bad & (res < tol) & (fres < _SHARE_TOL) & (loose is None or loose[0] <= _TOL_K)
        x[idx] = np.where(bad[:, None], xa, np.where(fin[:, None], g, step))
        self.failed[idx] |= bad
        self.residual[idx] = res
        history.append((idx, res))
        self.done[idx] |= fin
        if loose is None and fin.any():  # where each finished case's ratings stopped: its results are built there
            for tag, r in ratings.items():
                if getattr(r, "state", None) is not None:
                    self.settled.setdefault(tag, np.full((4, plan.ncase), np.nan))[:, idx[fin]] = r.state[:, fin]
        # a case whose change no longer shrinks in a pass that may end it (a correlation that jumps at a band edge
        # between two passes: no exact solution) stops being rated; it stays flagged as not converged, with its last
        # change (a probing pass's looser ratings set a floor under the change; a case whose equal-pressure-drop
        # shares still settle is not given up either: their change drives its temperatures')
        group.shares.append(fres)
        may_end = loose is None or loose[0] <= _TOL_K
        if may_end and len(history) > _STALL_PASSES:
            old_idx, old_res = history[-1 - _STALL_PASSES]
            before, shares_before = np.full(plan.ncase, np.inf), np.zeros(plan.ncase)
            before[old_idx], shares_before[old_idx] = old_res, group.shares[-1 - _STALL_PASSES]
            settling = fres < 0.5 * shares_before[idx]
            self.stalled[idx] |= (~fin & ~bad & ~settling & (iterations >= _MIN_PASSES)
                                  & (res > 0.5 * before[idx]))


def solve(train, tol=1e-6, max_iter=50) -> TrainResult:
    """Solve a :class:`~revamp.train.Train` (see the module docstring for the method)."""
    if not (np.ndim(tol) == 0 and float(tol) > 0):
        raise InputError("tol", tol, "a temperature change > 0 [K]")
    if not (isinstance(max_iter, int) and max_iter >= 1):
        raise InputError("max_iter", max_iter, "an integer >= 1")
    sv = _Solve(train, tol)
    plan = sv.plan
    # A sweep whose properties depend on temperature starts with single-evaluation (relaxed) passes. A case expected
    # within tol after its next one waits; once no case is relaxed any more, the waiting cases take their closing
    # passes together (a closing group). When few cases are still relaxed, they go on with Newton passes (a group of
    # their own, formed at once) and the waiting ones close; so do all, when the median case converges slowly.
    relax_cap = min(_RELAX_PASSES, max_iter - _RELAX_RESERVE)  # passes are left for the closing and Newton ones
    relax = plan.ncase > _FLOAT_CASES and relax_cap >= 3 and not sv.constant
    mode = np.full(plan.ncase, _RELAXED if relax else _NEWTON)
    groups = {_NEWTON: _Group(), _CLOSING: _Group(closing=True)}
    n_relax, iterations = 0, 0
    for iterations in range(1, max_iter + 1):
        live = ~(sv.failed | sv.done | sv.stalled)
        if n_relax:
            r_idx = np.flatnonzero(live & (mode == _RELAXED))
            ready, to_newton = _relax_exit(sv.residual[r_idx], sv.fall[r_idx], sv.fall_two[r_idx], n_relax, tol)
            mode[r_idx[ready]] = _WAITING
            left = r_idx.size - np.count_nonzero(ready)
            if to_newton or n_relax >= relax_cap or left <= _RELAX_FEW * np.count_nonzero(live):
                mode[mode == _RELAXED] = _NEWTON
                mode[mode == _WAITING] = _CLOSING
        r_idx = np.flatnonzero(live & (mode == _RELAXED))
        if r_idx.size:
            sv.relaxed(r_idx, n_relax == 0)
            n_relax += 1
        for kind in (_CLOSING, _NEWTON):
            idx = np.flatnonzero(live & (mode == kind))
            if idx.size:
                sv.newton(groups[kind], idx, n_relax == 0 and groups[_NEWTON].passes == 0, iterations)
        if np.all(sv.failed | sv.done | sv.stalled):
            break
    converged = sv.done & ~sv.failed
    if plan.ncase > _FLOAT_CASES:  # a sweep: the Ratings built at the states its closing passes stopped at, one
        # call per exchanger; a case that did not finish is rated in full from its last state
        ratings = _rate_all(plan, sv.x, np.arange(plan.ncase), starts=sv.starts, warm=sv.maps, settled=sv.settled)
    elif sv.rated_all and sv.loose is None:  # a few cases (one group, no relaxed passes) whose last pass rated them
        # all in full: its base block is the rating
        ratings = _strip_probes(sv.ratings, plan.ncase)
    else:  # some cases stopped earlier: every case rated once more at its solved inlets from its inlets, as rate()
        ratings = _rate_all(plan, sv.x, np.arange(plan.ncase))
    return _result(plan, sv.x, ratings, converged, sv.failed, sv.residual, iterations, tol)
