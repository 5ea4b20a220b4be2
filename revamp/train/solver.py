"""Solving a train: every exchanger rated at the inlets the network gives it, all cases at once.

The method is successive linearization. Rated at any inlet temperatures, an exchanger's outlets are linear in its two
inlets for the effectiveness and heat-capacity rates of that rating (effectiveness-NTU):

    t_out_shell = (1 - a_s)·t_in_shell + a_s·t_in_tube,   a_s = ε·C_min/C_shell
    t_out_tube  = a_t·t_in_shell + (1 - a_t)·t_in_tube,   a_t = ε·C_min/C_tube

(the same form whichever side is hot). With the routes (an outlet feeds the next inlet, a split feeds its branches,
a remix is the heat-capacity-weighted mean of its branches) the whole network is then one linear system in the port
temperatures, solved exactly with numpy for every case at once, interlinked routes included (no tearing, no order).
The exchangers are re-rated at the new inlets (one vectorized ``rate()`` per exchanger per iteration, all cases of a
sweep in that call) and the system solved again, until no inlet moves by more than ``tol``. Only the temperature
dependence of the properties makes this iterate: with constant properties the second pass is exact.

An air cooler (a match with :class:`~revamp.train.AirSide`) takes the shell side's two ports for its air: the air
inlet is tied to the stated ambient (a fixed input, like a stream's supply), the air outlet is the rated mixed outlet;
its tube outlet feeds its stream's route like any other outlet. It is rated with its own ``rate()`` (an
:class:`~revamp.rating_air.AirRating`), whose effectiveness and capacity rates give the same linear form.

A case that does not converge, or whose ratings fail (a stream leaving its fluid's single-phase range), is flagged in
``TrainResult.converged`` and named in the warnings; it is never dropped or replaced.

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
Smaïli, F., Vassiliadis, V. S., Wilson, D. I. (2001). Mitigation of fouling in refinery heat exchanger networks by
optimal management of cleaning. *Energy & Fuels* 15, 1038-1056.
"""
from __future__ import annotations

import dataclasses
from typing import NamedTuple

import numpy as np
import pandas as pd

from ..errors import InputError
from ..rating import _FLOAT_CASES, _rate_shell_and_tube, _rater, rate, warm_start
from ..rating_result import LazyResistances
from ..service import Service, Stream
from .network import Point, Split
from .hydraulics import pump_available
from .result import LimitCheck, TrainResult

__all__ = ["solve", "enthalpy_change"]

_SIDES = ("shell", "tube")
_STATE_FIELDS = ("t_out_shell", "t_out_tube", "t_wall_shell", "t_wall_tube")  # a rating's iteration state
# Gauss-Legendre nodes and weights on [-1, 1], 4 points (exact for cp polynomial up to degree 7)
_GL_X, _GL_W = np.polynomial.legendre.leggauss(4)
_PROBE_K = 0.05  # inlet step of the finite differences for the Newton step [K] (far above the ratings' 1e-6 K stop)
_SHARE_TOL = 1e-6  # largest change of an equal-pressure-drop branch share at convergence [-]
_DP_EXPONENT = 1.8  # pressure drop ~ flow^1.8 in turbulent flow (common practice, no source): speeds the shares
_CHORD_FALL = 0.05  # a Newton pass whose change fell below this share of the last one's keeps its derivatives
_MIN_PASSES = 8  # passes before a case whose change stopped shrinking is given up (flagged, never dropped)
_STALL_PASSES = 3  # ... when its change is above half of what it was this many passes earlier


def _clipped_props(fluid, T):
    hi = fluid.t_max - 1e-6 * fluid.t_max if np.isfinite(fluid.t_max) else fluid.t_max
    return fluid.props(np.clip(np.asarray(T, float), fluid.t_min, hi))


def enthalpy_change(fluid, flow, t_from, t_to, field="stream"):
    """Heat taken up by a stream between two temperatures, ``m·∫cp dT`` [W] (negative when it cools).

    Parameters
    ----------
    fluid : Fluid
    flow : float or ndarray
        Mass flow [kg/s].
    t_from, t_to : float or ndarray
        Temperatures [K].
    field : str
        Path named when a temperature is outside the fluid's range.

    Notes
    -----
    Four-point Gauss-Legendre quadrature of the fluid's heat capacity.
    """
    t_from, t_to = np.asarray(t_from, float), np.asarray(t_to, float)
    half, mid = 0.5 * (t_to - t_from), 0.5 * (t_to + t_from)
    total = 0.0
    for x, w in zip(_GL_X, _GL_W):
        T = mid + half * x
        ok = np.isfinite(T)
        try:
            cp = fluid.props(np.where(ok, T, fluid.t_min if np.isfinite(fluid.t_min) else 300.0)).heat_capacity
        except InputError as exc:
            raise InputError(field, f"{fluid.name} between {np.nanmin(t_from):.1f} and {np.nanmax(t_to):.1f} K",
                             f"within the fluid's range {fluid.t_min:.1f}..{fluid.t_max:.1f} K ({exc.allowed})") \
                from None
        total = total + w * np.where(ok, cp, np.nan)
    return np.asarray(flow, float) * half * total


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


class _RawStream(NamedTuple):
    """The fields of a :class:`~revamp.Stream` the engine body reads, from a checked train (no checks again)."""

    fluid: object
    flow: np.ndarray
    t_in: np.ndarray


class _RawService(NamedTuple):
    """The fields of a :class:`~revamp.Service` the engine body reads (outlet-map passes only)."""

    shell: _RawStream
    tube: _RawStream
    fouling_shell: np.ndarray
    fouling_tube: np.ndarray


def _rate_all(plan, x, idx, probe=0.0, starts=None, outlets_only=False):
    """Rate every exchanger at the inlets ``x`` of the cases ``idx``, in one call per exchanger.

    With ``probe`` > 0 each call also rates every case with its shell inlet, then its tube inlet, raised by ``probe``
    [K] (three stacked blocks of cases): finite differences of the outlets for the Newton step. ``starts``: per
    exchanger, the outlet and wall temperatures ``(4, ncase)`` of its last rating, which the ratings start from
    (updated here from the new ratings; the converged states of one pass are close to the next pass's).
    ``outlets_only``: shell-and-tube exchangers return only what the next pass needs (:class:`OutletMap`).
    """
    train = plan.train
    ratings = {}
    for tag, m in train.exchangers.items():
        t_s = x[:, plan.port(tag, "shell")]
        t_t = x[:, plan.port(tag, "tube")]
        f_s = plan.flow[m.shell][idx] * plan.frac[(tag, "shell")][idx] if m.shell is not None else np.ones(idx.size)
        f_t = plan.flow[m.tube][idx] * plan.frac[(tag, "tube")][idx]
        r_s, r_t = plan.fouling[(tag, "shell")][idx], plan.fouling[(tag, "tube")][idx]
        if probe:
            t_s = np.concatenate([t_s, t_s + probe, t_s])
            t_t = np.concatenate([t_t, t_t, t_t + probe])
            f_s, f_t, r_s, r_t = (np.tile(v, 3) for v in (f_s, f_t, r_s, r_t))
        t_t = np.where(t_s == t_t, t_t + 1e-9, t_t)  # equal inlets: no duty either way; rate() needs a difference
        if m.is_air_cooler:
            ratings[tag] = _rate_air(plan, tag, m, t_s, t_t, f_t, r_s, r_t, idx, 3 if probe else 1)
            continue
        light = outlets_only and _rater(m.exchanger) is rate
        if light:  # the engine body reads only these fields, and an outlet map keeps no service: no checks again
            svc = _RawService(_RawStream(train.streams[m.shell].fluid, f_s, t_s),
                              _RawStream(train.streams[m.tube].fluid, f_t, t_t), r_s, r_t)
        else:
            svc = Service(shell=Stream(train.streams[m.shell].fluid, f_s, t_s),
                          tube=Stream(train.streams[m.tube].fluid, f_t, t_t), fouling_shell=r_s, fouling_tube=r_t)
        # warm starts only for the probe blocks: the base block starts from the inlets, as rate() alone does, so
        # that rating an exchanger at its solved inlets gives back exactly the result's numbers, and so that the
        # base outlets carry no iteration error of a start (the Newton step takes differences of them). On the
        # few-case float path the probes start from their base case's stopping state instead (blocks=3), closer.
        # Every shell-and-tube kind is registered with rate() itself as its rater (and the train's streams are
        # liquid: never the condensing engine), so its passes may call the engine body for outlet maps.
        state = None if starts is None or not probe else starts.get(tag)
        with warm_start(None if state is None else np.concatenate(
                [np.full_like(state[:, idx], np.nan), state[:, idx], state[:, idx]], axis=1)):
            if light:
                ratings[tag] = _rate_shell_and_tube(m.exchanger, svc, train.shell_method, outlets_only=True,
                                                    with_dp=bool(plan.equal_dp), blocks=3 if probe else 1)
            else:
                ratings[tag] = rate(m.exchanger, svc, shell_method=train.shell_method)
        if starts is not None:
            r = ratings[tag]
            new = np.array([np.asarray(getattr(r, k), float).reshape(-1)[:idx.size] for k in _STATE_FIELDS])
            if tag not in starts:
                starts[tag] = np.full((4, plan.ncase), np.nan)
            starts[tag][:, idx] = new  # NaN (a failed case): its next rating starts from the inlets
    return ratings


def _rate_air(plan, tag, m, t_air, t_t, f_t, r_air, r_t, idx, blocks):
    """Rate an air cooler of the train: its tube stream at the network's inlet, the air at the match's ambient
    (``t_air``, the shell-side port, probed like a stream inlet), flow and fouling."""
    from ..service_air import AirService

    air = plan.air[tag]

    def cases(v):
        return None if v is None else np.tile(v[idx], blocks)

    svc = AirService(tube=Stream(plan.train.streams[m.tube].fluid, f_t, t_t), air_in=t_air,
                     air_flow=cases(air["air_flow"]), face_velocity=cases(air["face_velocity"]),
                     altitude=air["altitude"], fouling_tube=r_t, fouling_air=r_air)
    return rate(m.exchanger, svc)


def _side_value(r, name):
    """A rating's field by its shell-and-tube name; an air cooler's air answers for the shell side."""
    if hasattr(r, "C_air"):
        name = {"t_out_shell": "t_out_air", "C_shell": "C_air", "dp_shell": "dp_air"}.get(name, name)
    return getattr(r, name)


def _coefficients(ratings, x, plan, n, probe):
    """Per exchanger, the outlets as a linear function of the inlets: ``(J, c)`` with ``out = J @ in + c``.

    ``linear``: from the rating's effectiveness and capacity rates (exact for fixed properties); ``newton``: from
    finite differences of the rated outlets (the properties' temperature dependence included), or None.
    """
    linear, newton = {}, {}
    for tag, r in ratings.items():
        eps, cs, ct = (np.asarray(v, float)[:n] for v in (r.effectiveness, _side_value(r, "C_shell"), r.C_tube))
        c_min = np.minimum(cs, ct)
        a_s, a_t = eps * c_min / cs, eps * c_min / ct
        zero = np.zeros(n)
        linear[tag] = (((1.0 - a_s, a_s), (a_t, 1.0 - a_t)), (zero, zero))
        if probe:
            o_s, o_t = np.asarray(_side_value(r, "t_out_shell"), float), np.asarray(r.t_out_tube, float)
            j = ((( o_s[n:2 * n] - o_s[:n]) / probe, (o_s[2 * n:] - o_s[:n]) / probe),
                 ((o_t[n:2 * n] - o_t[:n]) / probe, (o_t[2 * n:] - o_t[:n]) / probe))
            xs, xt = x[:, plan.port(tag, "shell")], x[:, plan.port(tag, "tube")]
            c = (o_s[:n] - j[0][0] * xs - j[0][1] * xt, o_t[:n] - j[1][0] * xs - j[1][1] * xt)
            newton[tag] = (j, c)
    return linear, (newton or None)


def _fall(last_two, idx):
    """The share by which the largest inlet change of the cases ``idx`` fell over the last pass (both passes rated
    them all; else 1) and that change [K]."""
    (i0, r0), (i1, r1) = last_two
    if not (np.array_equal(i0, idx) and np.array_equal(i1, idx)):
        return 1.0, np.inf
    with np.errstate(invalid="ignore", divide="ignore"):
        last = float(np.nanmax(r1))
        return last / float(np.nanmax(r0)), last


def _chord(ratings, x, plan, idx, jac):
    """The Newton form of the outlets from kept derivatives and this pass's rated outlets (a chord step)."""
    n = idx.size
    out = {}
    for tag, r in ratings.items():
        J = jac.get(tag)
        if J is None:
            return None
        J = J[:, :, idx]
        o_s, o_t = np.asarray(_side_value(r, "t_out_shell"), float)[:n], np.asarray(r.t_out_tube, float)[:n]
        xs, xt = x[:, plan.port(tag, "shell")], x[:, plan.port(tag, "tube")]
        j = ((J[0, 0], J[0, 1]), (J[1, 0], J[1, 1]))
        out[tag] = (j, (o_s - J[0, 0] * xs - J[0, 1] * xt, o_t - J[1, 0] * xs - J[1, 1] * xt))
    return out


def _linear_solve(plan, x, coefs, idx):
    """One linear solve of the network: exchanger outlets ``J @ inlets + c``, routes and remixes at ``x``.

    Every inlet is a route expression of outlets (or a fixed supply), ``in = L @ out + d``, and every outlet the
    exchanger's map of its own two inlets, so the outlets are eliminated: ``(I - L J) in = d + L c``, a system of the
    2·(exchangers) inlets per case (a quarter of the entries and an eighth of the factorization work of the dense
    system of all ports, :func:`_linear_solve_dense`, which gives the same solution), then ``out = J in + c``.
    """
    n, nc = plan.n, len(idx)
    m, nx = n // 2, n // 4  # inlets (and outlets): port p = 4i + 2s (+1 for the outlet) is unknown 2i + s
    Jb = np.zeros((nc, nx, 2, 2))  # J is block diagonal: exchanger i's 2x2 block maps its inlets to its outlets
    cv = np.zeros((nc, m))
    for tag, (J, c) in coefs.items():
        i = plan.index[tag]
        for k in range(2):
            Jb[:, i, k, 0] = J[k][0]
            Jb[:, i, k, 1] = J[k][1]
            cv[:, 2 * i + k] = c[k]
    # the rows of A = I - L J and b = d + L c from the route expressions: L is sparse (an inlet is fed by one
    # outlet, or by the remix of a split's branch ends), each term adds the feeding exchanger's row of J
    A = np.zeros((nc, m, m))
    A[:, np.arange(m), np.arange(m)] = 1.0
    b = np.zeros((nc, m))
    links, _, _, _ = plan.walk(x, idx=idx)
    for port, expr in links:
        row = port // 2  # an inlet port (even) -> its unknown
        b[:, row] += expr.const
        for i, c in expr.coefs.items():  # outlet ports (odd) only: a route runs from outlets to inlets
            u = i // 2  # the outlet's unknown 2e + k: row k of exchanger e's block
            e, k = divmod(u, 2)
            A[:, row, 2 * e] -= c * Jb[:, e, k, 0]
            A[:, row, 2 * e + 1] -= c * Jb[:, e, k, 1]
            b[:, row] += c * cv[:, u]
    bad = ~np.all(np.isfinite(A), axis=(1, 2)) | ~np.all(np.isfinite(b), axis=1)
    A[bad] = np.eye(m)
    b[bad] = np.nan
    with np.errstate(all="ignore"):
        try:
            t_in = np.linalg.solve(A, b[..., None])[..., 0]
        except np.linalg.LinAlgError:  # a singular case: solve one by one, NaN where singular
            t_in = np.full((nc, m), np.nan)
            for i in range(nc):
                try:
                    t_in[i] = np.linalg.solve(A[i], b[i])
                except np.linalg.LinAlgError:
                    pass
        t_out = np.einsum("cikj,cij->cik", Jb, t_in.reshape(nc, nx, 2)).reshape(nc, m) + cv
    sol = np.empty((nc, n))
    sol[:, 0::2], sol[:, 1::2] = t_in, t_out
    return sol, bad | ~np.all(np.isfinite(sol), axis=1)


def _linear_solve_dense(plan, x, coefs, idx):
    """:func:`_linear_solve` on the dense system of all ports (outlet rows kept): the reference form."""
    n, nc = plan.n, len(idx)
    A = np.zeros((nc, n, n))
    b = np.zeros((nc, n))
    for tag, (J, c) in coefs.items():
        ins = (plan.port(tag, "shell"), plan.port(tag, "tube"))
        for k, side in enumerate(_SIDES):
            row = plan.port(tag, side, out=True)
            A[:, row, row] = 1.0
            A[:, row, ins[0]] -= J[k][0]
            A[:, row, ins[1]] -= J[k][1]
            b[:, row] += c[k]
    links, _, _, _ = plan.walk(x, idx=idx)
    for port, expr in links:
        A[:, port, port] += 1.0
        for i, c in expr.coefs.items():
            A[:, port, i] -= c
        b[:, port] += expr.const
    bad = ~np.all(np.isfinite(A), axis=(1, 2)) | ~np.all(np.isfinite(b), axis=1)
    A[bad] = np.eye(n)
    b[bad] = np.nan
    with np.errstate(all="ignore"):
        try:
            sol = np.linalg.solve(A, b[..., None])[..., 0]
        except np.linalg.LinAlgError:  # a singular case: solve one by one, NaN where singular
            sol = np.full((nc, n), np.nan)
            for i in range(nc):
                try:
                    sol[i] = np.linalg.solve(A[i], b[i])
                except np.linalg.LinAlgError:
                    pass
    return sol, bad | ~np.all(np.isfinite(sol), axis=1)


def _update_equal_dp(plan, ratings, idx):
    """New branch shares of the equal-pressure-drop splits from the branches' rated pressure drops; returns the
    largest share change per case (0 without such splits). The shares converge to equal branch pressure drops
    whatever the exponent; ``dp ~ flow^1.8`` only makes them converge faster."""
    n = idx.size
    change = np.zeros(n)
    for stream, item in plan.equal_dp:
        shares = plan.split_frac[id(item)]
        dps = []
        for branch in item.branches:
            dp = 0.0
            for tag in branch:
                side = plan.train.exchangers[tag].side_of(stream)
                dp = dp + np.asarray(getattr(ratings[tag], f"dp_{side}"), float)[:n]
            dps.append(dp)
        new = [f[idx] * np.power(dp, -1.0 / _DP_EXPONENT) for f, dp in zip(shares, dps)]
        total = sum(new)
        for f, v in zip(shares, new):
            v = v / total
            ok = np.isfinite(v)
            change = np.maximum(change, np.where(ok, np.abs(v - f[idx]), 0.0))
            f[idx] = np.where(ok, v, f[idx])  # the arrays are shared with plan.frac: the flows follow
    return change


def _initial(plan):
    x = np.empty((plan.ncase, plan.n))
    for tag, m in plan.train.exchangers.items():
        for side in _SIDES:
            t = plan.air[tag]["air_in"] if (m.is_air_cooler and side == "shell") else plan.supply[getattr(m, side)]
            x[:, plan.port(tag, side)] = t
            x[:, plan.port(tag, side, out=True)] = t
    return x


def solve(train, tol=1e-6, max_iter=50) -> TrainResult:
    """Solve a :class:`~revamp.train.Train` (see the module docstring for the method)."""
    if not (np.ndim(tol) == 0 and float(tol) > 0):
        raise InputError("tol", tol, "a temperature change > 0 [K]")
    if not (isinstance(max_iter, int) and max_iter >= 1):
        raise InputError("max_iter", max_iter, "an integer >= 1")
    plan = _Plan(train)
    x = _initial(plan)
    inlets = np.array([plan.port(t, s) for t in plan.tags for s in _SIDES])
    failed = np.zeros(plan.ncase, dtype=bool)
    done = np.zeros(plan.ncase, dtype=bool)
    residual = np.full(plan.ncase, np.inf)
    stalled = np.zeros(plan.ncase, dtype=bool)
    iterations, ratings, rated_all, history, light_pass = 0, None, False, [], False
    starts = {}  # per exchanger, the outlet and wall temperatures of its last rating: where the next one starts
    jac = {}  # per exchanger, the outlets' derivatives by the inlets (2, 2, ncase) from the last probes
    # a few cases: the first and the probing passes ask only for the outlet maps (the result objects cost more than
    # such small ratings); a sweep's passes rate in full
    light = plan.ncase <= _FLOAT_CASES
    for iterations in range(1, max_iter + 1):
        idx = np.flatnonzero(~(failed | done | stalled))  # only the cases still moving are rated again
        xa = x[idx]
        # Newton probes after the first pass (its plain step from the supply temperatures is as good) while the
        # cases still move by more than √tol; the closing pass (quadratic convergence:
        # its change is about the square of the last) rates the cases alone, so its ratings are the final ones
        newton_pass = iterations > 1 and np.max(residual[idx]) > np.sqrt(tol)
        # once the change has fallen fast (the step is near quadratic: the derivatives barely move any more), the
        # last probes' derivatives are kept for the next steps (a chord step: no probes, a third of the ratings)
        fall, last = _fall(history[-2:], idx) if len(history) >= 2 else (1.0, np.inf)
        chord = newton_pass and bool(jac) and fall < _CHORD_FALL
        probe = _PROBE_K if newton_pass and not chord else 0.0
        # the closing pass (no probes after the first) rates in full: its ratings are usually the final ones; so
        # does a chord pass whose change, falling as the last did, may already be within tol
        light_pass = light and (bool(probe) or (chord and fall * last > 10.0 * tol) or iterations == 1)
        ratings = _rate_all(plan, xa, idx, probe=probe, starts=starts, outlets_only=light_pass)
        rated_all = idx.size == plan.ncase
        linear, newton = _coefficients(ratings, xa, plan, idx.size, probe)
        if newton is not None:  # keep the derivatives for chord steps
            for tag, (j, _) in newton.items():
                jac.setdefault(tag, np.full((2, 2, plan.ncase), np.nan))[:, :, idx] = np.array(j, dtype=float)
        elif chord:
            newton = _chord(ratings, xa, plan, idx, jac)
        g, bad = _linear_solve(plan, xa, linear, idx)
        res = np.where(bad, np.nan, np.max(np.abs(g[:, inlets] - xa[:, inlets]), axis=1))
        step = g
        if newton is not None:
            xn, bad_n = _linear_solve(plan, xa, newton, idx)
            # the Newton step, unless it is not finite or jumps much farther than the plain pass (a correlation's
            # band edge between the probes): then the plain pass, which converges on its own
            far = np.max(np.abs(xn[:, inlets] - xa[:, inlets]), axis=1) > 3.0 * res + 1.0
            step = np.where((bad_n | far)[:, None], g, xn)
        fres = _update_equal_dp(plan, ratings, idx)
        fin = ~bad & (res < tol) & (fres < _SHARE_TOL)
        x[idx] = np.where(bad[:, None], xa, np.where(fin[:, None], g, step))
        failed[idx] |= bad
        residual[idx] = res
        history.append((idx, res))
        done[idx] |= fin
        # a case whose change no longer shrinks (a correlation that jumps at a band edge between two passes: no
        # exact solution) stops being rated; it stays flagged as not converged, with its last change
        if len(history) > _STALL_PASSES:
            old_idx, old_res = history[-1 - _STALL_PASSES]
            before = np.full(plan.ncase, np.inf)
            before[old_idx] = old_res
            stalled[idx] |= ~fin & ~bad & (iterations >= _MIN_PASSES) & (res > 0.5 * before[idx])
        if np.all(failed | done | stalled):
            break
    converged = done & ~failed
    if rated_all and not light_pass:  # the last pass rated every case in full: its base block is the rating there
        ratings = _strip_probes(ratings, plan.ncase)
    else:  # some cases stopped earlier: every case rated once more at its solved inlets, one call per exchanger
        ratings = _rate_all(plan, x, np.arange(plan.ncase), starts=starts)
    return _result(plan, x, ratings, converged, failed, residual, iterations, tol)


def _strip_probes(ratings, n):
    """The base block of ratings made with probes (the first ``n`` cases)."""
    out = {}
    for tag, r in ratings.items():
        if np.size(r.duty) == n:
            out[tag] = r
            continue
        if hasattr(r, "C_air"):
            out[tag] = _cut_air(r, slice(0, n))
            continue
        from ..rating import _SCALAR_FIELDS

        changes = {name: np.asarray(getattr(r, name))[:n] for name in _SCALAR_FIELDS}
        changes["resistances"] = r.resistances.iloc[:n].reset_index(drop=True)
        for name in ("tube_side", "shell_side"):  # the correlation details: their per-case arrays cut the same way
            detail = getattr(r, name)
            if dataclasses.is_dataclass(detail):
                cut = {f.name: getattr(detail, f.name)[:n] for f in dataclasses.fields(detail)
                       if isinstance(getattr(detail, f.name), np.ndarray) and getattr(detail, f.name).shape[:1] == (3 * n,)}
                changes[name] = dataclasses.replace(detail, **cut)
        svc = r.service
        changes["service"] = Service(
            shell=svc.shell.replace(flow=np.asarray(svc.shell.flow)[:n], t_in=np.asarray(svc.shell.t_in)[:n]),
            tube=svc.tube.replace(flow=np.asarray(svc.tube.flow)[:n], t_in=np.asarray(svc.tube.t_in)[:n]),
            fouling_shell=np.asarray(svc.fouling_shell)[:n], fouling_tube=np.asarray(svc.fouling_tube)[:n])
        out[tag] = dataclasses.replace(r, **changes)
    return out


def _cut_air(r, cut):
    """An air cooler's rating of the flattened cases restricted to ``cut`` (a slice), its service and details too."""
    changes = {name: np.asarray(getattr(r, name))[cut] for name in r._FRAME_FIELDS}
    changes["resistances"] = r.resistances.iloc[cut].reset_index(drop=True)
    detail = r.tube_side
    if dataclasses.is_dataclass(detail):
        size = np.size(r.duty)
        changes["tube_side"] = dataclasses.replace(detail, **{
            f.name: getattr(detail, f.name)[cut] for f in dataclasses.fields(detail)
            if isinstance(getattr(detail, f.name), np.ndarray) and getattr(detail, f.name).shape[:1] == (size,)})
    svc = r.service

    def part(v):
        return None if v is None else np.broadcast_to(np.asarray(v, float), np.shape(r.duty))[cut]

    changes["service"] = svc.replace(tube=svc.tube.replace(flow=part(svc.tube.flow), t_in=part(svc.tube.t_in)),
                                     air_in=part(svc.air_in), air_flow=part(svc.air_flow),
                                     face_velocity=part(svc.face_velocity), fouling_tube=part(svc.fouling_tube),
                                     fouling_air=part(svc.fouling_air))
    return dataclasses.replace(r, **changes)


def _reshape_air(r, shape):
    """An air cooler's rating of the flattened cases brought back to the train's case shape."""
    if shape != ():
        return dataclasses.replace(r, **{name: np.asarray(getattr(r, name), float).reshape(shape)
                                         for name in r._FRAME_FIELDS})
    one = _cut_air(r, slice(0, 1))
    changes = {name: float(np.asarray(getattr(one, name), float)[0]) for name in r._FRAME_FIELDS}
    res = one.resistances
    changes["resistances"] = pd.Series(res.to_numpy(float)[0], index=list(res.columns), name="resistance [m²K/W]")
    svc = one.service
    first = lambda v: None if v is None else float(np.ravel(v)[0])  # noqa: E731
    changes["service"] = svc.replace(tube=svc.tube.replace(flow=first(svc.tube.flow), t_in=first(svc.tube.t_in)),
                                     air_in=first(svc.air_in), air_flow=first(svc.air_flow),
                                     face_velocity=first(svc.face_velocity), fouling_tube=first(svc.fouling_tube),
                                     fouling_air=first(svc.fouling_air))
    return dataclasses.replace(one, **changes)


# ------------------------------------------------------------------------------------------------------ the result
def _reshape_rating(r, shape, ncase):
    """A rating of the flattened cases brought back to the train's case shape (scalars for one case)."""
    if hasattr(r, "C_air"):
        return _reshape_air(r, shape)
    from ..rating import _SCALAR_FIELDS

    changes = {}
    for name in _SCALAR_FIELDS:
        v = np.asarray(getattr(r, name), float).reshape(shape)
        changes[name] = float(v) if shape == () else v
    if shape == ():
        lazy = r.__dict__.get("_resistance_values") if "resistances" not in r.__dict__ else None
        if lazy is not None:  # not built yet: the one case's values, still built only when asked for
            changes["resistances"] = LazyResistances(lazy.layers, tuple(np.asarray(v, float)[:1] for v in lazy.values),
                                                     None, scalar=True)
        else:
            res = r.resistances
            changes["resistances"] = pd.Series(res.to_numpy(float)[0], index=list(res.columns),
                                               name="resistance [m²K/W]")
        svc = r.service
        changes["service"] = svc.replace(
            shell=svc.shell.replace(flow=float(svc.shell.flow[0]), t_in=float(svc.shell.t_in[0])),
            tube=svc.tube.replace(flow=float(svc.tube.flow[0]), t_in=float(svc.tube.t_in[0])),
            fouling_shell=float(np.ravel(svc.fouling_shell)[0]), fouling_tube=float(np.ravel(svc.fouling_tube)[0]))
    return dataclasses.replace(r, **changes)


def _out(v, shape):
    v = np.asarray(v, float).reshape(shape)
    return float(v) if shape == () else v


def _frame(rows, shape, index_name):
    """A DataFrame with one row per item (one case) or per (item, case) (sweeps)."""
    if shape == ():
        frame = pd.DataFrame({k: {c: (np.asarray(v).ravel()[0] if isinstance(v, np.ndarray) else v)
                                  for c, v in cols.items()} for k, cols in rows.items()}).T
        frame.index.name = index_name
        return frame.infer_objects()
    ncase = int(np.prod(shape, dtype=int))
    parts = []
    for k, cols in rows.items():
        part = pd.DataFrame({c: np.broadcast_to(np.asarray(v), (ncase,)) if isinstance(v, np.ndarray) else [v] * ncase
                             for c, v in cols.items()})
        part.index = pd.MultiIndex.from_product([[k], range(ncase)], names=[index_name, "case"])
        parts.append(part)
    return pd.concat(parts)


def _result(plan, x, ratings, converged, failed, residual, iterations, tol):
    train, shape, nc = plan.train, plan.shape, plan.ncase
    warnings = []
    nan = np.where(failed, np.nan, 0.0)  # NaN for failed cases: never a silent number

    def dp_of(tag, side):
        return getattr(ratings[tag], f"dp_{side}")

    _, point_exprs, final_exprs, stream_dp = plan.walk(x, dp_of)
    finals = {s: e.value(x) + nan for s, e in final_exprs.items()}

    # exchangers
    rows = {}
    for tag, m in train.exchangers.items():
        r = ratings[tag]
        if m.is_air_cooler:  # the air is no stream: its own columns, the shell ones left empty (NaN)
            svc = r.service
            row = {"shell_stream": "", "tube_stream": m.tube, "kind": "air cooler"}
            for col, v in (("duty", r.duty), ("t_in_air", svc.air_in), ("t_out_air", r.t_out_air),
                           ("t_in_tube", svc.tube.t_in), ("t_out_tube", r.t_out_tube), ("flow_air", r.air_flow),
                           ("flow_tube", svc.tube.flow), ("effectiveness", r.effectiveness), ("U_clean", r.U_clean),
                           ("U_service", r.U_service), ("fouling_air", svc.fouling_air),
                           ("fouling_tube", svc.fouling_tube), ("dp_air", r.dp_air), ("dp_tube", r.dp_tube),
                           ("velocity_tube", r.velocity_tube), ("velocity_face", r.velocity_face),
                           ("fan_power", r.fan_power)):
                row[col] = np.broadcast_to(np.asarray(v, float), (nc,)) + nan
            row["dp_max_tube"] = np.nan if m.dp_max_tube is None else m.dp_max_tube
            rows[tag] = row
            warnings += [f"{tag}: {w}" for w in r.warnings]
            continue
        row = {"shell_stream": m.shell, "tube_stream": m.tube}
        for col, v in (("duty", r.duty), ("t_in_shell", r.service.shell.t_in), ("t_out_shell", r.t_out_shell),
                       ("t_in_tube", r.service.tube.t_in), ("t_out_tube", r.t_out_tube),
                       ("flow_shell", r.service.shell.flow), ("flow_tube", r.service.tube.flow),
                       ("effectiveness", r.effectiveness), ("U_clean", r.U_clean), ("U_service", r.U_service),
                       ("fouling_shell", r.service.fouling_shell), ("fouling_tube", r.service.fouling_tube),
                       ("dp_shell", r.dp_shell), ("dp_tube", r.dp_tube), ("velocity_tube", r.velocity_tube),
                       ("velocity_shell", r.velocity_shell)):
            row[col] = np.broadcast_to(np.asarray(v, float), (nc,)) + nan
        row["dp_max_shell"] = np.nan if m.dp_max_shell is None else m.dp_max_shell
        row["dp_max_tube"] = np.nan if m.dp_max_tube is None else m.dp_max_tube
        rows[tag] = row
        warnings += [f"{tag}: {w}" for w in r.warnings]
    exchangers = _frame(rows, shape, "tag")

    # streams: final temperature, heat exchanged, pressure drop, rundown and trim cooler
    srows, limits = {}, []
    for s, st in train.streams.items():
        exchanged = 0.0
        for tag, m in train.exchangers.items():
            for side in _SIDES:
                if getattr(m, side) == s:
                    r = ratings[tag]
                    t_in = getattr(r.service, side).t_in
                    exchanged = exchanged + getattr(r, f"C_{side}") * (getattr(r, f"t_out_{side}") - t_in)
        row = {"supply": plan.supply[s], "final": finals[s], "flow": plan.flow[s],
               "duty": np.broadcast_to(np.asarray(exchanged, float), (nc,)) + nan,
               "dp": np.broadcast_to(np.asarray(stream_dp[s], float), (nc,)) + nan,
               "dp_max": train.dp_max.get(s, np.nan), "rundown": train.rundown.get(s, np.nan)}
        trim = np.zeros(nc)
        if s in train.rundown:
            limit = train.rundown[s]
            over = finals[s] > limit
            if np.any(over):
                trim = np.where(over, -enthalpy_change(st.fluid, plan.flow[s], finals[s], limit,
                                                       f"rundown[{s!r}]"), 0.0)
        row["trim_duty"] = trim + nan
        srows[s] = row
        if s in train.dp_max:
            limits.append(LimitCheck.of(f"{s} pressure drop", "dp", row["dp"], high=train.dp_max[s], shape=shape))
        if s in train.pump_curves:  # the route against the stream's pump (revamp.train.hydraulics)
            avail, _, pump_warn = pump_available(train.pump_curves[s], st.fluid, plan.flow[s], plan.supply[s], s)
            row["pump_dp"] = avail + nan
            warnings += pump_warn
            limits.append(LimitCheck.of(f"{s} pump", "dp", row["dp"], high=row["pump_dp"], shape=shape))
    for tag, m in train.exchangers.items():
        for side in _SIDES:
            lim = getattr(m, f"dp_max_{side}")
            if lim is not None:
                limits.append(LimitCheck.of(f"{tag} dp_{side}", "dp", rows[tag][f"dp_{side}"], high=lim, shape=shape))

    # points
    prow = {}
    for name, expr in point_exprs.items():
        stream, pt = train.points[name]
        t = expr.value(x) + nan
        prow[name] = {"stream": stream, "temperature": t, "t_min": np.nan if pt.t_min is None else pt.t_min,
                      "t_max": np.nan if pt.t_max is None else pt.t_max}
        if pt.t_min is not None or pt.t_max is not None:
            limits.append(LimitCheck.of(f"{name} temperature", "temperature", t, low=pt.t_min, high=pt.t_max,
                                        shape=shape))

    # furnace
    f_in = f_abs = f_fired = None
    if train.furnace is not None:
        fu = train.furnace
        st = train.streams[fu.stream]
        f_in = finals[fu.stream]
        f_abs = enthalpy_change(st.fluid, plan.flow[fu.stream], f_in, fu.outlet, "furnace.outlet")
        f_fired = f_abs / fu.efficiency
        if np.any(f_in > fu.outlet):
            warnings.append(f"furnace: the {fu.stream} reaches the furnace above its outlet temperature in "
                            f"{int(np.sum(f_in > fu.outlet))} case(s): the absorbed duty is negative there")
        if fu.max_duty is not None:
            limits.append(LimitCheck.of("furnace duty", "power", f_fired, high=fu.max_duty, shape=shape))
        f_in, f_abs, f_fired = (_out(v, shape) for v in (f_in, f_abs, f_fired))

    if np.any(failed):
        warnings.insert(0, f"train: {int(np.sum(failed))} case(s) failed (a stream left its fluid's range or a "
                           "rating had no solution): their results are NaN")
    not_conv = ~converged & ~failed
    if np.any(not_conv):
        warnings.insert(0, f"train: {int(np.sum(not_conv))} case(s) did not converge in {iterations} iterations "
                           f"(largest inlet change {np.nanmax(residual[not_conv]):.3g} K > {tol:g} K; where a "
                           "rating reports a correlation changing form near its flow, the train has no exact "
                           "solution there): see converged and residual")
    violated = [c.name for c in limits if not np.all(c.ok)]
    return TrainResult(
        train=train, shape=shape, exchangers=exchangers, streams=_frame(srows, shape, "stream"),
        points=_frame(prow, shape, "point") if prow else pd.DataFrame(
            columns=["stream", "temperature", "t_min", "t_max"]).rename_axis("point"),
        limits=tuple(limits), ratings={t: _reshape_rating(r, shape, nc) for t, r in ratings.items()},
        furnace_inlet=f_in, furnace_absorbed=f_abs, furnace_duty=f_fired,
        converged=bool(converged[0]) if shape == () else converged.reshape(shape), iterations=iterations,
        residual=float(residual[0]) if shape == () else residual.reshape(shape),
        final_temperatures={s: _out(v, shape) for s, v in finals.items()},
        violated=tuple(violated), warnings=tuple(dict.fromkeys(warnings)))
