"""The pieces of the shell-and-tube rating loop (:func:`revamp.rating.rate`): its state and its steps.

:func:`revamp.rating._rate_shell_and_tube` runs the property iteration; this module holds what it iterates with:
the stopping tolerances, the warm start a network solve gives (:func:`warm_start`), the detection of the Reynolds
numbers where Taborek's ideal-bank fits change coefficients (where the outlet map may jump), the one-case iteration
on Python floats (:func:`_iterate_one`, the same steps as the array loop), the evaluation record (:class:`_Eval`)
and the outlet map a network solve asks for (:class:`OutletMap`). Internal to the package; moved verbatim from
``revamp.rating`` (which still re-exports every name).

References
----------
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. *Heat Exchanger Design Handbook* §3.3,
Hemisphere (Bell-Delaware).
Anderson, D. G. (1965). Iterative procedures for nonlinear integral equations. *J. ACM* 12(4):547-560.
"""
from __future__ import annotations

import bisect
import contextlib
import contextvars
import dataclasses
import math
import types
from dataclasses import dataclass

import numpy as np

from .fluids.table import ConstantFluid


_MAX_ITER = 60
#: A first guess of the iteration's state for the next shell-and-tube ratings in this context (see warm_start)
_WARM_START: contextvars.ContextVar = contextvars.ContextVar("revamp_rating_warm_start", default=None)
_TOL_K = 1e-6  # a case has converged when its outlet and wall temperatures move by less than this [K]
_SEAM_STEP_K = 1e-3  # a case at a seam stops when its halved step moves it by less than this [K]
_ANDERSON_FROM = 2  # iteration from which the Anderson step is tried (plain substitution before)
_SEAM_FROM = 4  # iteration from which a residual that changes sign without shrinking marks a seam


@contextlib.contextmanager
def warm_start(state, settled=None):
    """Start the shell-and-tube ratings made inside the ``with`` block from ``state`` instead of the inlets.

    ``state`` is a ``(4, n)`` array of the outlet temperatures (shell, tube) and the wall temperatures (shell side,
    tube side) [K] of the ``n`` flattened cases, e.g. those of a previous rating at nearby inlets (a network solve
    re-rating its exchangers). Only the number of iterations changes: each case still stops where its outlets and,
    being warm-started, its walls move by less than 1e-6 K (a state that does not fit the cases is ignored; a case
    whose state is not finite starts from its inlets). ``settled``: a boolean ``(n,)`` mask of the cases whose state
    is the one an earlier rating of theirs (at the same inlets to within its stop) stopped at: each is evaluated there
    once, not iterated (a network solve building its results from its closing pass). Internal to the package.
    """
    token = _WARM_START.set(None if state is None else (state, settled))
    try:
        yield
    finally:
        _WARM_START.reset(token)


def _below(t_max):
    """A temperature just below an upper limit (the limit itself when it is infinite)."""
    return t_max - 1e-6 * t_max if np.isfinite(t_max) else t_max


def _head(v, na):
    """The first ``na`` values of a property array (a constant is returned as it is)."""
    v = np.asarray(v, dtype=float)
    return v[:na] if v.ndim else v


def _tail(v, na):
    """The values after the first ``na`` of a property array (a constant is returned as it is)."""
    v = np.asarray(v, dtype=float)
    return v[na:] if v.ndim else v


#: Reynolds numbers where Taborek's ideal-bank fits change coefficients (Taborek 1983): the map may jump there
_SEAM_RE = np.array([10.0, 100.0, 1e3, 1e4])


def _near_seam(Re):
    """Cases whose shell-side Re lies within 5 % of a band edge of Taborek's fits (the nearest edge in ln Re is
    10^k with k = round(log10 Re), kept within the edges)."""
    lr = np.log(np.asarray(Re, dtype=float))
    k = np.fmin(np.fmax(np.rint(lr * (1.0 / math.log(10.0))), 1.0), 4.0)
    return np.abs(lr - k * math.log(10.0)) < 0.05


def _constant_props(fluid):
    """``(rho, cp, mu, k, mu_wall)`` of a constant-property fluid (the same at every temperature), else None."""
    if type(fluid) is not ConstantFluid:
        return None
    return (fluid.density, fluid.heat_capacity, fluid.viscosity, fluid.conductivity, fluid.viscosity)


_LN_SEAM_RE = tuple(math.log(e) for e in _SEAM_RE)


def _interp_float(x, table):
    """``np.interp(x, *table)`` for one float: linear between the points, held constant outside them."""
    xs, fs = table
    if x <= xs[0]:
        return fs[0]
    if x >= xs[-1]:
        return fs[-1]
    j = bisect.bisect_right(xs, x) - 1
    return (fs[j + 1] - fs[j]) / (xs[j + 1] - xs[j]) * (x - xs[j]) + fs[j]


def _near_seam_one(Re):
    """:func:`_near_seam` for one case (a float)."""
    lr = math.log(Re)
    return min(abs(lr - e) for e in _LN_SEAM_RE) < 0.05


def _iterate_one(evaluate_one, ts_in, tt_in, seams, start=None, resume=None, last=None, tol=_TOL_K, walls=None,
                 warm=None, halved=False):
    """The property iteration of :func:`rate` for one case on Python floats: the same steps as the array loop
    (substitution, then Anderson depth one; plain and halved steps at a seam) and the same stops. Returns the state
    ``(outlet shell, outlet tube, wall shell, wall tube)`` [K] the case stopped at. ``start``: a first state other
    than the inlets (see :func:`warm_start`). ``resume``: the array loop's state of this case after its iteration
    ``it`` (``(it + 1, X, f_prev, g_prev, r_prev, s_prev, omega, damped)``), to carry on from there. ``last``: a list
    that receives ``(G, extra)`` of the evaluation at the returned state when the case stopped there. ``tol``: the
    outlet step below which the case stops [K] (a network solve's intermediate passes may ask for a looser one).
    ``walls``: the wall temperatures' steps count in the stop too (None: where the case has a warm start, whose walls
    may lag its outlets; from the inlets both move together and the outlets decide). ``warm``: the case (its
    ``start``, or the start of the array loop it resumes) was warm-started and its rating may be final: if it took
    halved steps at a seam of Taborek's fits, it is iterated again from its inlets (see :func:`_cold_at_seam`; None:
    warm where a ``start`` is given); ``halved``: it took them before the iteration it resumes."""
    lo, hi = min(ts_in, tt_in), max(ts_in, tt_in)
    if start is None or not all(math.isfinite(v) for v in start):
        X = (ts_in, tt_in, 0.5 * (ts_in + tt_in), 0.5 * (ts_in + tt_in))
        walls = bool(walls)
        warm = bool(warm) and resume is not None
    else:
        X = tuple(min(max(float(v), lo), hi) for v in start)
        walls = True if walls is None else walls
        warm = True if warm is None else warm
    redo = warm and seams  # a warm case that takes halved steps at a seam starts again from its inlets
    f_prev = g_prev = (0.0, 0.0, 0.0, 0.0)
    r_prev, s_prev, om, damped = math.inf, 0.0, 1.0, False
    it0 = 0
    if resume is not None:
        it0, X, f_prev, g_prev, r_prev, s_prev, om, damped = resume
    for it in range(it0, _MAX_ITER):
        G, Re, extra = evaluate_one(*X)
        f = tuple(g - x for g, x in zip(G, X))
        r = max(abs(f[0]), abs(f[1]), abs(f[2]), abs(f[3])) if walls else max(abs(f[0]), abs(f[1]))
        conv = r < tol
        edge = seams and _near_seam_one(Re)
        s_now = 1.0 if f[1] > 0.0 else -1.0 if f[1] < 0.0 else 0.0 if f[1] == 0.0 else math.nan  # np.sign
        flip = it >= _SEAM_FROM and edge and s_now * s_prev < 0 and r > 0.7 * r_prev
        dm = damped or flip
        if flip:
            om = 0.5 * om
        halved = halved or dm
        if it >= _ANDERSON_FROM:
            df = tuple(a - b for a, b in zip(f, f_prev))
            den = sum(d * d for d in df)
            gam = 0.0
            if den > 0.0 and r <= r_prev and not edge:
                try:
                    gam = sum(a * d for a, d in zip(f, df)) / den
                except (OverflowError, ZeroDivisionError):  # pragma: no cover - not finite: a plain step
                    gam = 0.0
                if not math.isfinite(gam):
                    gam = 0.0
            Xn = tuple(g - gam * (g - gp) for g, gp in zip(G, g_prev))
        else:
            Xn = G
        if dm:
            Xn = tuple(x + om * a for x, a in zip(X, f))
        Xn = tuple(min(max(v, lo), hi) for v in Xn)
        if conv or (dm and om * r < _SEAM_STEP_K):
            if redo and halved:
                return _iterate_one(evaluate_one, ts_in, tt_in, seams, last=last, tol=tol)
            if last is not None:
                last.append((G, extra))
            return X
        X, f_prev, g_prev, r_prev, s_prev, damped = Xn, f, G, r, s_now, dm
    if redo and halved:
        return _iterate_one(evaluate_one, ts_in, tt_in, seams, last=last, tol=tol)
    return X


def _cold_at_seam(warm_case, halved, tol_case):
    """The cases to iterate again from their inlets: warm-started ones that took halved steps at a band edge of
    Taborek's fits (their outlet residual there changed sign without shrinking), in a rating that may be final
    (``tol_case`` None: the rating's own stop; a network pass that asks for its own stop only steers the next pass).

    Halved steps stop at the looser :data:`_SEAM_STEP_K`, at a place that depends on where the case started (up to
    about 1e-3 K apart where a map had a jump). From its inlets the case settles exactly where ``rate()`` alone
    settles it, so a warm start changes only the number of iterations, never a rating that may be final. A case that
    merely came near an edge converges by the rating's own 1e-6 K step: the fits are blended across their edges
    (continuous, with a continuous slope), and warm and cold starts of such cases agree within about 2e-7 K."""
    if tol_case is not None:
        return np.zeros_like(warm_case)
    return warm_case & halved


def _reshape_fields(res, shape):
    """A correlation result with every array field reshaped to the sweep's shape (floats for a single case)."""
    n = math.prod(shape)
    changes = {}
    for f in dataclasses.fields(res):
        v = getattr(res, f.name)
        if isinstance(v, np.ndarray) and v.ndim == 1:
            if shape == ():
                changes[f.name] = float(v[0])
            else:
                changes[f.name] = np.full(shape, float(v[0])) if v.size == 1 and n != 1 else v.reshape(shape)
        elif isinstance(v, (float, np.floating)):
            changes[f.name] = float(v) if shape == () else np.full(shape, float(v))
    return dataclasses.replace(res, **changes)


@dataclass(slots=True)
class _Eval:
    """One evaluation of the outlet map at a state (internal, never leaves :func:`rate`)."""

    to_s: np.ndarray
    to_t: np.ndarray
    tw_s: np.ndarray
    tw_t: np.ndarray
    q: np.ndarray
    eps: np.ndarray
    w: np.ndarray
    NTU: np.ndarray
    U: np.ndarray
    C_s: np.ndarray
    C_t: np.ndarray
    shell_min: np.ndarray
    R: tuple
    tube: object
    shell: object
    rho_s: np.ndarray
    rho_t: np.ndarray
    Pr_s: np.ndarray
    mu_ratio_t: np.ndarray


_NO_DP = types.SimpleNamespace(dp=np.nan)  # the correlation details of an evaluation that computed no pressure drop


@dataclass(frozen=True)
class OutletMap:
    """What an iteration over ratings needs of one (a network solve): per flattened case, the outlets, the wall
    temperatures, the effectiveness, the heat-capacity rates of the whole streams and the pressure drops over all
    shells (SI; NaN where a stream would leave its fluid's range). Built by :func:`_rate_shell_and_tube` with
    ``outlets_only``; the same numbers as the :class:`Rating` of the same call."""

    t_out_shell: np.ndarray
    t_out_tube: np.ndarray
    t_wall_shell: np.ndarray
    t_wall_tube: np.ndarray
    effectiveness: np.ndarray
    C_shell: np.ndarray
    C_tube: np.ndarray
    dp_shell: np.ndarray
    dp_tube: np.ndarray
    state: np.ndarray = None  # (4, n) the outlet and wall temperatures each case stopped at (see warm_start)
