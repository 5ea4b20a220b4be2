"""One pass of a train solve: every exchanger rated at the inlets the network gives it (one call per exchanger,
all cases of a sweep in that call), and the outlet maps read from those ratings for the linear step.

The state a pass's ratings start from (:func:`_predicted`), the finite-difference and effectiveness-NTU maps
(:func:`_coefficients`), the chord step's maps from kept derivatives (:func:`_chord`) and the equal-pressure-drop
branch shares (:func:`_update_equal_dp`) live here; :mod:`revamp.train.solver` decides which passes to take.
Internal to the package.
"""
from __future__ import annotations

from typing import NamedTuple

import numpy as np

from ..rating import _rate_shell_and_tube, _rater, rate, warm_start
from ..service import Service, Stream

_STATE_FIELDS = ("t_out_shell", "t_out_tube", "t_wall_shell", "t_wall_tube")  # a rating's iteration state
_DP_EXPONENT = 1.8  # pressure drop ~ flow^1.8 in turbulent flow (common practice, no source): speeds the shares
_DP_EXPONENT_MIN, _DP_EXPONENT_MAX = 0.5, 20.0  # the secant exponent of a split's shares is used within these
_DP_SECANT_STEP = 1e-5  # ... and taken only from a change of the log shares' spread above this


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


def _rate_all(plan, x, idx, probe=0.0, starts=None, outlets_only=False, warm=None, tol=None, settled=None):
    """Rate every exchanger at the inlets ``x`` of the cases ``idx``, in one call per exchanger.

    With ``probe`` > 0 each call also rates every case with its shell inlet, then its tube inlet, raised by ``probe``
    [K] (three stacked blocks of cases): finite differences of the outlets for the Newton step. ``starts``: per
    exchanger, the outlet and wall temperatures and the inlets ``(6, ncase)`` of its last rating (updated here from
    the new ratings), from which a warm pass predicts its start.
    ``outlets_only``: shell-and-tube exchangers return only what the next pass needs (:class:`OutletMap`).
    ``warm``: per exchanger, the outlet map ``J`` (2, 2, ncase) of the last pass; given, every block starts from the
    state predicted by :func:`_predicted` (every pass but a solve's first), else the base block starts from the
    inlets as ``rate()`` does. ``tol``: the ratings' stopping step
    ``(base block, probe blocks)`` [K], None for the rating's own. ``settled``: per shell-and-tube exchanger, the
    state ``(4, ncase)`` each case stopped at in a closing pass (NaN where none): such a case is evaluated there once
    (see :func:`~revamp.rating_loop.warm_start`), the others start as ``warm`` says.
    """
    train = plan.train
    ratings = {}
    every = idx.size == plan.ncase  # idx is every case in order (a solve rates only cases still moving)

    def take(a):
        return a if every else a[idx]

    for tag, m in train.exchangers.items():
        t_s = x[:, plan.port(tag, "shell")]
        t_t = x[:, plan.port(tag, "tube")]
        f_s = take(plan.flow[m.shell]) * take(plan.frac[(tag, "shell")]) if m.shell is not None else np.ones(idx.size)
        f_t = take(plan.flow[m.tube]) * take(plan.frac[(tag, "tube")])
        r_s, r_t = take(plan.fouling[(tag, "shell")]), take(plan.fouling[(tag, "tube")])
        if probe:
            t_s = np.concatenate([t_s, t_s + probe, t_s])
            t_t = np.concatenate([t_t, t_t, t_t + probe])
            f_s, f_t, r_s, r_t = (np.concatenate((v, v, v)) for v in (f_s, f_t, r_s, r_t))
        t_t = np.where(t_s == t_t, t_t + 1e-9, t_t)  # equal inlets: no duty either way; rate() needs a difference
        if m.is_air_cooler:
            ratings[tag] = _rate_air(plan, tag, m, t_s, t_t, f_t, r_s, r_t, idx, 3 if probe else 1)
            continue
        light = (outlets_only or tol is not None) and _rater(m.exchanger) is rate
        if light:  # the engine body reads only these fields, and an outlet map keeps no service: no checks again
            svc = _RawService(_RawStream(train.streams[m.shell].fluid, f_s, t_s),
                              _RawStream(train.streams[m.tube].fluid, f_t, t_t), r_s, r_t)
        else:
            if plan.shape == () and not probe:  # one case: rated on floats, the Rating a user's rate() gives there
                f_s, t_s, f_t, t_t, r_s, r_t = (float(v[0]) for v in (f_s, t_s, f_t, t_t, r_s, r_t))
            svc = Service(shell=Stream(train.streams[m.shell].fluid, f_s, t_s),
                          tube=Stream(train.streams[m.tube].fluid, f_t, t_t), fouling_shell=r_s, fouling_tube=r_t)
        # A warm pass starts from the predicted state; a rating that may be final still stops where rate() does,
        # walls included, and one that took halved steps at a seam is iterated again from its inlets, so that it
        # agrees with rate() at the same inlets to within the rating's own step. On the few-case float path the
        # probes start from their base case's stopping state (blocks=3), moved as their predicted starts differ.
        # Every shell-and-tube kind is registered with rate() itself as its rater (and the train's streams are
        # liquid: never the condensing engine), so its passes may call the engine body for outlet maps.
        state = None if starts is None or warm is None else starts.get(tag)
        if state is not None:
            state = _predicted(plan, tag, x, state if every else state[:, idx], warm.get(tag), idx, probe)
        done, done_mask = None if settled is None else settled.get(tag), None
        if done is not None:  # the finished cases at the states their closing ratings stopped at
            done = done if every else done[:, idx]
            done_mask = np.all(np.isfinite(done), axis=0)
            state = np.where(done_mask, done, np.nan if state is None else state)
        with warm_start(state, done_mask):
            if light:
                ratings[tag] = _rate_shell_and_tube(m.exchanger, svc, train.shell_method, outlets_only=True,
                                                    with_dp=bool(plan.equal_dp), blocks=3 if probe else 1, tol=tol)
            else:
                ratings[tag] = rate(m.exchanger, svc, shell_method=train.shell_method)
        if starts is not None:
            r = ratings[tag]
            if tag not in starts:
                starts[tag] = np.full((6, plan.ncase), np.nan)
            into = starts[tag] if every else np.empty((6, idx.size))
            for k, name in enumerate(_STATE_FIELDS):  # NaN (a failed case): its next rating starts from the inlets
                into[k] = np.asarray(getattr(r, name), float).reshape(-1)[:idx.size]
            into[4], into[5] = x[:, plan.port(tag, "shell")], x[:, plan.port(tag, "tube")]
            if not every:
                starts[tag][:, idx] = into
    return ratings


def _predicted(plan, tag, x, state, J, idx, probe):
    """The state an intermediate pass starts exchanger ``tag``'s ratings from: the outlets the last linear solve
    predicts at these inlets (the outlet ports of ``x``), and for the probe blocks those moved by the outlet map ``J``
    of the last pass; each wall keeps the place between the two mean temperatures it had in the last rating
    (``state``: its outlets, walls and inlets). NaN where there is no such state (that case starts from its inlets).
    """
    ps, pt = plan.port(tag, "shell"), plan.port(tag, "tube")
    ts, tt, os_, ot = x[:, ps], x[:, pt], x[:, ps + 1], x[:, pt + 1]
    blocks = [(ts, tt, os_, ot)]
    if probe:
        J = np.full((2, 2, idx.size), np.nan) if J is None else J if idx.size == plan.ncase else J[:, :, idx]
        blocks += [(ts + probe, tt, os_ + J[0, 0] * probe, ot + J[1, 0] * probe),
                   (ts, tt + probe, os_ + J[0, 1] * probe, ot + J[1, 1] * probe)]
    mean_s, mean_t = 0.5 * (state[4] + state[0]), 0.5 * (state[5] + state[1])
    with np.errstate(divide="ignore", invalid="ignore"):
        place_s = (state[2] - mean_t) / (mean_s - mean_t)
        place_t = (state[3] - mean_t) / (mean_s - mean_t)
    n = idx.size
    out = np.empty((4, n * len(blocks)))
    for j, (a, b, c, d) in enumerate(blocks):
        mt, span = 0.5 * (b + d), 0.5 * (a + c - b - d)
        cols = slice(j * n, (j + 1) * n)
        out[0, cols], out[1, cols], out[2, cols], out[3, cols] = c, d, mt + place_s * span, mt + place_t * span
    return out


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


def _ntu_map(eps, c_shell, c_tube):
    """An exchanger's outlets as a linear map of its inlets for an effectiveness and two capacity rates
    (effectiveness-NTU): ``(J, c)`` with ``out = J @ in + c`` and ``c = 0``."""
    c_min = np.minimum(c_shell, c_tube)
    a_s, a_t = eps * c_min / c_shell, eps * c_min / c_tube
    zero = np.zeros(np.shape(eps))
    return ((1.0 - a_s, a_s), (a_t, 1.0 - a_t)), (zero, zero)


def _coefficients(ratings, x, plan, n, probe):
    """Per exchanger, the outlets as a linear function of the inlets: ``(J, c)`` with ``out = J @ in + c``.

    ``linear``: from the rating's effectiveness and capacity rates (exact for fixed properties); ``newton``: from
    finite differences of the rated outlets (the properties' temperature dependence included), or None.
    """
    linear, newton = {}, {}
    for tag, r in ratings.items():
        linear[tag] = _ntu_map(*(np.asarray(v, float).reshape(-1)[:n]
                                 for v in (r.effectiveness, _side_value(r, "C_shell"), r.C_tube)))
        if probe:
            o_s, o_t = np.asarray(_side_value(r, "t_out_shell"), float), np.asarray(r.t_out_tube, float)
            j = ((( o_s[n:2 * n] - o_s[:n]) / probe, (o_s[2 * n:] - o_s[:n]) / probe),
                 ((o_t[n:2 * n] - o_t[:n]) / probe, (o_t[2 * n:] - o_t[:n]) / probe))
            xs, xt = x[:, plan.port(tag, "shell")], x[:, plan.port(tag, "tube")]
            c = (o_s[:n] - j[0][0] * xs - j[0][1] * xt, o_t[:n] - j[1][0] * xs - j[1][1] * xt)
            newton[tag] = (j, c)
    return linear, (newton or None)


def _chord(ratings, x, plan, idx, jac):
    """The Newton form of the outlets from kept derivatives and this pass's rated outlets (a chord step)."""
    n = idx.size
    out = {}
    for tag, r in ratings.items():
        J = jac.get(tag)
        if J is None:
            return None
        J = J[:, :, idx]
        o_s = np.asarray(_side_value(r, "t_out_shell"), float).reshape(-1)[:n]
        o_t = np.asarray(r.t_out_tube, float).reshape(-1)[:n]
        xs, xt = x[:, plan.port(tag, "shell")], x[:, plan.port(tag, "tube")]
        j = ((J[0, 0], J[0, 1]), (J[1, 0], J[1, 1]))
        out[tag] = (j, (o_s - J[0, 0] * xs - J[0, 1] * xt, o_t - J[1, 0] * xs - J[1, 1] * xt))
    return out


def _update_equal_dp(plan, ratings, idx):
    """New branch shares of the equal-pressure-drop splits from the branches' rated pressure drops; returns the
    largest share change per case (0 without such splits).

    Each share moves by its branch's log pressure-drop spread over an exponent: ``ln f <- ln f - (ln dp - mean) / p``
    (normalized). With ``dp ~ f^p`` that is one step to equal pressure drops. ``p`` is the secant of the last two
    passes' log spreads (a case's own), which takes in how the branch temperatures, and with them the viscosities,
    move with the shares; :data:`_DP_EXPONENT` (turbulent flow) until there is one, or where it is out of
    ``[_DP_EXPONENT_MIN, _DP_EXPONENT_MAX]``. A fixed 1.8 let the shares of a train of viscous fractions swing
    between two values for ever, where a lower share heats its branch more and cuts its pressure drop further."""
    n = idx.size
    change = np.zeros(n)
    memo = plan.dp_secant
    for stream, item in plan.equal_dp:
        shares = plan.split_frac[id(item)]
        dps = []
        for branch in item.branches:
            dp = 0.0
            for tag in branch:
                side = plan.train.exchangers[tag].side_of(stream)
                dp = dp + np.asarray(getattr(ratings[tag], f"dp_{side}"), float).reshape(-1)[:n]
            dps.append(np.broadcast_to(dp, (n,)))
        with np.errstate(divide="ignore", invalid="ignore"):
            lf = np.log(np.stack([f[idx] for f in shares]))
            ld = np.log(np.stack(dps))
            lf, ld = lf - lf.mean(axis=0), ld - ld.mean(axis=0)  # the spreads over the branches
            last = memo.get(id(item))
            if last is None:
                last = memo[id(item)] = (np.full((len(shares), plan.ncase), np.nan),
                                         np.full((len(shares), plan.ncase), np.nan), np.full(plan.ncase, _DP_EXPONENT))
            d_f, d_d = lf - last[0][:, idx], ld - last[1][:, idx]
            den = np.sum(d_f * d_f, axis=0)
            p = np.sum(d_f * d_d, axis=0) / den
            # a secant only from a share change well above the pressure drops' noise; else the last one kept
            p = np.where((den > _DP_SECANT_STEP ** 2) & (p >= _DP_EXPONENT_MIN) & (p <= _DP_EXPONENT_MAX), p,
                         last[2][idx])
            last[0][:, idx], last[1][:, idx], last[2][idx] = lf, ld, p
            new = np.exp(lf - ld / p)
            new = new / new.sum(axis=0)
        for f, v in zip(shares, new):
            ok = np.isfinite(v)
            change = np.maximum(change, np.where(ok, np.abs(v - f[idx]), 0.0))
            f[idx] = np.where(ok, v, f[idx])  # the arrays are shared with plan.frac: the flows follow
    return change
