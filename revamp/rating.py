"""Rating: what an existing shell-and-tube exchanger gives at a service.

:func:`rate` is a thin orchestrator over the physics modules. Given the geometry and the two inlet streams it finds
the outlet temperatures by effectiveness-NTU, with fluid properties at the mean bulk temperature of each side and the
viscosity correction at the wall temperature from the resistance split, iterating until the outlets settle:

1. properties at the mean temperatures (first pass: the inlets);
2. tube side: Gnielinski / Sieder-Tate (``revamp.correlations.tube``) or the insert's own correlation;
3. shell side: Bell-Delaware (``revamp.correlations.shell``), or Kern as a cross-check;
4. the series network on the outside area (``revamp.resistance``): ``U_service`` and ``U_clean``;
5. effectiveness-NTU for the exchanger's arrangement (``revamp.thermal``): duty and outlets;
6. wall temperatures from the resistance split, for the next pass.

Inputs are checked once; the loop calls unchecked array kernels and stops each case when its outlets have
converged (Anderson-accelerated substitution, see :func:`rate`). A single case, a sweep of a few cases and the last
few cases of a sweep iterate one by one on Python floats (the same steps: numpy's per-call overhead dominates arrays
that small); every reported number then comes from one array evaluation at the converged states. The shell type
(TEMA E, F, J, X) selects the effectiveness relation and the shell-side adaptation (:func:`arrangement`). Every input
may be an array (flows, inlet temperatures, fouling): the whole sweep runs in one call, with no Python loop over
cases, and no single case can make it fail (a close approach is rated; a stream that would boil or freeze is NaN
with a warning). Numbers outside a correlation's published range come back with a warning in ``Rating.warnings``.

The loop's state and steps (tolerances, :func:`warm_start`, the one-case float iteration, :class:`OutletMap`) live in
:mod:`revamp.rating_loop`; what each TEMA shell type means (:func:`arrangement`, the shell-side adaptation) in
:mod:`revamp.rating_shells`, both re-exported here; the range checks and warnings of the final evaluation in
:mod:`revamp.rating_checks`.

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. *Heat Exchanger Design Handbook* §3.3,
Hemisphere (Bell-Delaware).
Gnielinski, V. (1976). New equations for heat and mass transfer in turbulent pipe and channel flow.
*Int. Chem. Eng.* 16:359-368.
Shah, R. K., Sekulić, D. P. (2003). *Fundamentals of Heat Exchanger Design*, Wiley, ch. 3 (TEMA F, J and X shells).
Anderson, D. G. (1965). Iterative procedures for nonlinear integral equations. *J. ACM* 12(4):547-560.
"""
from __future__ import annotations

import dataclasses
import functools
import math

import numpy as np

from . import thermal
from .correlations import shell as shell_corr
from .correlations import shell_bell
from .correlations import tube as tube_corr
from .errors import InputError
from .resistance import TUBE_LAYERS, tube_resistances
from .rating_checks import out_of_range, rating_warnings
from .rating_result import (_SCALAR_FIELDS, LazyResistances, Rating, ResultFrames,  # noqa: F401  (re-exported)
                            _case_shaped)
# the loop's state and steps live in rating_loop, the TEMA shell types in rating_shells; re-exported here for the
# train solver, the exchanger models and the tests that import them from this module
from .rating_loop import (_ANDERSON_FROM, _MAX_ITER, _NO_DP, _SEAM_FROM, _SEAM_RE, _SEAM_STEP_K,  # noqa: F401
                          _TOL_K, _WARM_START, OutletMap, _below, _constant_props, _Eval, _head, _interp_float,
                          _cold_at_seam, _iterate_one, _near_seam, _near_seam_one, _reshape_fields, _tail, warm_start)
from .rating_shells import (_accepts, _bell_loop, _scaled_dp, _shell_flow_geometry,  # noqa: F401
                            _shell_side_by_type, arrangement)
from .service import Service, Stream
from .thermal_lmtd import rated_lmtd_f

__all__ = ["rate", "Rating", "arrangement", "Stream", "Service", "SHELL_METHODS"]

#: Shell-side methods by name: the one registry, defined beside the correlations and dispatched here only.
SHELL_METHODS = shell_corr.SHELL_METHODS

#: Exchanger kinds: the exchanger class's ``kind`` -> "module:function" that rates it (imported on first use), the
#: engine of each kind beside its model in :data:`revamp.exchanger.MODELS` (see docs/architecture.md, "The exchanger
#: protocol"). Every kind is registered, shell-and-tube included: an unregistered object is an InputError.
RATERS = {"shell and tube": "revamp.rating:rate", "air cooler": "revamp.rating_air:rate_air_cooler"}


_RESOLVED: dict = {}  # "module:function" -> the function, resolved once


def _rater(exchanger):
    """The rating function registered for the exchanger's kind; InputError naming ``exchanger`` if none is."""
    kind = getattr(type(exchanger), "kind", None)
    target = RATERS.get(kind) if isinstance(kind, str) else None
    if target is None:
        raise InputError("exchanger", f"{type(exchanger).__name__} object",
                         f"an exchanger of a registered kind ({', '.join(sorted(RATERS))}): revamp.ShellAndTube or "
                         "revamp.AirCooler")
    fn = _RESOLVED.get(target)
    if fn is None:
        import importlib

        module, name = target.split(":")
        fn = _RESOLVED[target] = getattr(importlib.import_module(module), name)
    return fn


_FLOAT_CASES = 8  # up to this many cases iterate one by one on floats (cheaper than array calls on so few)
_CHAIN_CASES = 200  # probe blocks of at least this many cases start from their base cases' states (see blocks)
_SETTLED_K = 0.05  # a case whose outlets still differ from the map by more than this at the end is reported [K]


# --------------------------------------------------------------------------------------------------- the engine
def rate(exchanger, service, shell_method: str = "bell-delaware", **methods) -> Rating:
    """Rate an existing exchanger at a service (shell-and-tube here; every other kind through :data:`RATERS`).

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or another registered kind
        The geometry as built; its class's ``kind`` selects the engine (:data:`RATERS`: a
        :class:`revamp.AirCooler` is rated by :func:`revamp.rating_air.rate_air_cooler` with its own service and
        result). For shell-and-tube, ``shell_type`` (E, F, J, X) selects the effectiveness relation and the
        shell-side adaptation (see :func:`arrangement`).
    service : revamp.Service
        The two inlet streams and the fouling of each side; flows, inlet temperatures and fouling may be arrays
        (they broadcast). Another kind takes its own service (:class:`revamp.AirService`).
    shell_method : {"bell-delaware", "kern"}
        Shell-side method; Kern (1950) is a simpler cross-check (not for X shells). A kind without a shell side
        does not use it (a train passes its one setting to every exchanger).
    **methods : str
        The method choices of another kind, passed to its engine (air cooler: ``h_method``, ``dp_method``,
        ``fin_method``); none for shell-and-tube.

    Returns
    -------
    Rating
        Duty, outlets, coefficients, pressure drops, velocities and the resistance breakdown; see :class:`Rating`.

    Raises
    ------
    InputError
        On a bad input: an exchanger of no registered kind (the error names ``exchanger`` and the kinds), equal
        inlet temperatures in a single case (no driving force), a service that is not a
        Service, an unknown method, or a single case whose stream would leave its fluid's liquid range (it would
        boil or freeze; the error names the side). In a sweep such cases come back as NaN with one warning, and
        equal inlets give zero duty.

    Notes
    -----
    Inputs are checked once here; the loop calls unvalidated kernels. Fluid properties are taken at the mean bulk
    temperature of each side and the wall viscosity at the wall temperature from the resistance split; the
    outlet and wall temperatures are found per case by an Anderson-accelerated (depth one) substitution that
    stops each case when it has converged (1e-6 K). Within 5 % of a band edge of Taborek's fits (where the map
    jumps) a case takes plain steps, and where its residual there changes sign without shrinking (no fixed point)
    its step is halved at each change of sign, so it settles at the edge; it is reported if its outlets then
    differ from the map by more than 0.05 K.

    A close temperature approach is physics, not an error: the duty tends to eps Cmin dTmax, the terminal
    differences are computed from 1 - eps without cancellation, F = (Q/UA)/LMTD is never above 1 (exactly 1 in
    counterflow) and is NaN, with a warning, only where the approach is below floating-point resolution.

    Identical shells in series (``exchanger.shells``) combine by the series effectiveness relation; identical trains
    in parallel (``exchanger.shells_parallel``) each take ``flow / shells_parallel`` of both streams.
    """
    rater = _rater(exchanger)
    if rater is not rate:  # another exchanger kind rates itself (its own service, methods and result types)
        return rater(exchanger, service, **methods)
    if any(getattr(getattr(service, side, None), "condensing", False) for side in ("shell", "tube")):
        from .rating_condenser import rate_condenser  # a vapour or two-phase stream: rated zone by zone

        return rate_condenser(exchanger, service, shell_method=shell_method, **methods)
    if methods:
        name = next(iter(methods))
        raise InputError(name, methods[name], "not a method choice of a shell-and-tube exchanger (shell_method)")
    if shell_method not in SHELL_METHODS:
        raise InputError("shell_method", shell_method, f"one of {sorted(SHELL_METHODS)}")
    if not isinstance(service, Service):
        raise InputError("service", service, "a revamp.Service(shell=Stream(...), tube=Stream(...))")
    hx = exchanger
    kind = getattr(hx, "shell_type", "E")
    if kind == "X" and shell_method == "kern":
        raise InputError("shell_method", shell_method, "'bell-delaware' for an X shell (Kern's method assumes "
                         "baffled crossflow; the X shell is rated as one crossflow pass over the bundle)")
    return _rate_shell_and_tube(hx, service, shell_method)


def _rate_shell_and_tube(hx, service, shell_method, outlets_only=False, with_dp=True, blocks=1, tol=None):
    """The body of :func:`rate` for a shell-and-tube exchanger (method and service already checked). With
    ``outlets_only`` it returns an :class:`OutletMap` of the flattened cases instead of a :class:`Rating` (no
    warnings, no result objects: for a network solve's intermediate passes); without ``with_dp`` its pressure drops
    may be NaN (not computed). ``blocks`` > 1: the flattened cases are that many equal blocks of the same cases at
    slightly moved inlets (a network solve's finite-difference probes); on the few-case float path every case of a
    later block starts from the state its case of the first block stopped at (a state closer than any other), moved
    by the difference of the two cases' warm starts where those are given (see :func:`warm_start`). ``tol``: the
    outlet step [K] below which a case stops, ``(first block, later blocks)``; None: the rating's own 1e-6 K. Only a
    network solve's intermediate passes loosen it (their outlet maps are refined by the next pass); infinite for
    both blocks, an outlet map without pressure drops is one evaluation at the start (a sweep's relaxed pass)."""
    kind = getattr(hx, "shell_type", "E")
    s_fluid, t_fluid = service.shell.fluid, service.tube.fluid
    shape = np.broadcast_shapes(*(np.shape(v) for v in (
        service.shell.flow, service.shell.t_in, service.tube.flow, service.tube.t_in,
        service.fouling_shell, service.fouling_tube)))
    n = math.prod(shape)

    def flat(v):
        if type(v) is np.ndarray and v.shape == shape:
            return v.astype(float).reshape(n)  # a copy
        return np.array(np.broadcast_to(np.asarray(v, dtype=float), shape), dtype=float).reshape(n)

    n_par = float(getattr(hx, "shells_parallel", 1))
    m_s = flat(service.shell.flow) / n_par  # one parallel train [kg/s]
    m_t = flat(service.tube.flow) / n_par
    ts_in, tt_in = flat(service.shell.t_in), flat(service.tube.t_in)
    rf_s, rf_t = flat(service.fouling_shell), flat(service.fouling_tube)
    same = ts_in == tt_in
    if shape == () and same[0]:
        raise InputError("service.shell.t_in", service.shell.t_in,
                         "different from the tube-side inlet temperature (equal inlets give no driving force)")

    shell_hot = ts_in > tt_in
    sign = np.where(shell_hot, -1.0, 1.0)  # the shell stream loses heat when it is the hot one
    dt_in = np.abs(ts_in - tt_in)
    t_lo, t_hi = np.minimum(ts_in, tt_in), np.maximum(ts_in, tt_in)
    arr_name, n_units = arrangement(hx)
    do, di = hx.tube_od, hx.tube_id
    area_train = hx.area_outside / n_par
    material = hx.tube_material
    insert = getattr(hx, "insert", None)
    rel_rough = getattr(hx, "tube_roughness", 0.0) / di
    n_tpp, length, passes = float(hx.tubes_per_pass), float(hx.tube_length), int(hx.tube_passes)
    d_noz_t = getattr(hx, "nozzle_tube", None)
    geom = hx.bell()
    bell_kernel = shell_method == "bell-delaware" and kind != "X"  # the unchecked kernel, warnings at the end
    shell_fn = _bell_loop if bell_kernel else SHELL_METHODS[shell_method]
    shell_call, noz_scale, type_notes = _shell_side_by_type(kind, shell_fn, geom)
    shell_kw, notes = {}, list(type_notes)
    d_noz_s = getattr(hx, "nozzle_shell", None)
    if d_noz_s is not None:
        if noz_scale is not None and _accepts(SHELL_METHODS[shell_method], "d_nozzle"):
            shell_kw = {"d_nozzle": d_noz_s * noz_scale}
        else:
            notes.append("shell side: nozzle pressure drop not included (not available for this shell type or method)")
    s_lo, s_hi = s_fluid.t_min, _below(s_fluid.t_max)
    t_lo_f, t_hi_f = t_fluid.t_min, _below(t_fluid.t_max)
    s_const, t_const = _constant_props(s_fluid), _constant_props(t_fluid)
    # a fluid's viscosity-only call (exactly its props().viscosity) for the wall temperatures, where it has one
    s_visc, t_visc = getattr(s_fluid, "viscosity_at", None), getattr(t_fluid, "viscosity_at", None)
    # a fluid's unchecked array kernel for both at once (the same operations as props() and viscosity_at())
    s_pair, t_pair = getattr(s_fluid, "_rating_props", None), getattr(t_fluid, "_rating_props", None)

    shell_kw_loop = {**shell_kw, "h_only": True} if bell_kernel else shell_kw

    def evaluate(sel, xs, xt, tws, twt, detail=True) -> _Eval:
        """The outlet and wall temperatures the correlations give at a state (cases ``sel``, None for all); without
        ``detail`` (inside the iteration) the pressure drops are not computed."""
        if sel is None:
            ms, mt, tsi, tti, rfs, rft, sg, dT = m_s, m_t, ts_in, tt_in, rf_s, rf_t, sign, dt_in
        else:
            ms, mt, tsi, tti, rfs, rft, sg, dT = (a[sel] for a in (m_s, m_t, ts_in, tt_in, rf_s, rf_t, sign, dt_in))
        na = xs.size
        tm_s, tm_t = 0.5 * (tsi + xs), 0.5 * (tti + xt)
        if s_const is not None:  # constant properties: the same floats at every temperature
            rho_s, cp_s, mu_s, k_s, mu_ws = s_const
        elif s_pair is not None:  # the fluid's own kernel: props at the mean, the viscosity at the wall, in one call
            rho_s, cp_s, mu_s, k_s, mu_ws = s_pair(np.minimum(np.maximum(tm_s, s_lo), s_hi),
                                                   np.minimum(np.maximum(tws, s_lo), s_hi))
        elif s_visc is not None:  # the wall needs the viscosity only
            ps = s_fluid.props(np.minimum(np.maximum(tm_s, s_lo), s_hi))
            rho_s, cp_s, mu_s, k_s = (np.asarray(v, dtype=float) for v in (ps.density, ps.heat_capacity,
                                                                           ps.viscosity, ps.conductivity))
            mu_ws = np.asarray(s_visc(np.minimum(np.maximum(tws, s_lo), s_hi)), dtype=float)
        else:
            ps = s_fluid.props(np.minimum(np.maximum(np.concatenate((tm_s, tws)), s_lo), s_hi))
            rho_s, cp_s, mu_s, k_s = (_head(v, na) for v in (ps.density, ps.heat_capacity, ps.viscosity,
                                                            ps.conductivity))
            mu_ws = _tail(ps.viscosity, na)
        if t_const is not None:
            rho_t, cp_t, mu_t, k_t, mu_wt = t_const
        elif t_pair is not None:
            rho_t, cp_t, mu_t, k_t, mu_wt = t_pair(np.minimum(np.maximum(tm_t, t_lo_f), t_hi_f),
                                                   np.minimum(np.maximum(twt, t_lo_f), t_hi_f))
        elif t_visc is not None:
            pt = t_fluid.props(np.minimum(np.maximum(tm_t, t_lo_f), t_hi_f))
            rho_t, cp_t, mu_t, k_t = (np.asarray(v, dtype=float) for v in (pt.density, pt.heat_capacity,
                                                                           pt.viscosity, pt.conductivity))
            mu_wt = np.asarray(t_visc(np.minimum(np.maximum(twt, t_lo_f), t_hi_f)), dtype=float)
        else:
            rho_t, cp_t, mu_t, k_t, mu_wt = t_const
        tube = tube_corr.tube_side_kernel(mt, n_tpp, di, length, passes, rho_t, cp_t, mu_t, k_t, mu_wt, rel_rough,
                                          insert, d_noz_t, rho_t if d_noz_t is not None else None, warn=False,
                                          h_only=not detail)
        shell = shell_call(ms, rho_s, cp_s, mu_s, k_s, mu_ws, **(shell_kw if detail else shell_kw_loop))
        h_s = np.asarray(shell.h, dtype=float)
        k_w = material.conductivity(0.5 * (tws + twt))
        R = tube_resistances(h_s, tube.h, rfs, rft, do, di, k_w)
        U = 1.0 / (R[0] + R[1] + R[2] + R[3] + R[4])
        C_s, C_t = ms * cp_s, mt * cp_t
        shell_min = C_s <= C_t
        C_min = np.where(shell_min, C_s, C_t)
        Cr = np.where(shell_min, C_s / C_t, C_t / C_s)
        NTU = U * area_train / C_min
        eps, w = thermal.effectiveness_kernel(NTU, Cr, arr_name, n_units, shell_min)
        eps, w = np.minimum(eps, 1.0), np.maximum(w, 0.0)
        q = eps * C_min * dT  # one train [W]
        flux = U * (tm_s - tm_t)  # on the outside area, positive shell -> tube
        return _Eval(to_s=tsi + sg * q / C_s, to_t=tti - sg * q / C_t, tw_s=tm_s - flux * R[0],
                     tw_t=tm_t + flux * R[4], q=q, eps=eps, w=w, NTU=NTU, U=U, C_s=C_s, C_t=C_t,
                     shell_min=shell_min, R=R, tube=tube, shell=shell, rho_s=rho_s, rho_t=rho_t,
                     Pr_s=cp_s * mu_s / k_s, mu_ratio_t=mu_t / mu_wt)

    g_eff, m_factor = _shell_flow_geometry(kind, geom)
    ratio_d, ln_ratio_d = do / di, float(np.log(do / di))
    k_table = (tuple(float(t) for t in material.temperatures), tuple(float(k) for k in material.conductivities))

    def evaluate_one(i, xs, xt, tws, twt):
        """:func:`evaluate` for case ``i`` alone on Python floats: the next outlet and wall temperatures, and the
        shell-side Re (Bell-Delaware on E, F and J shells, plain tubes)."""
        ms, mt, tsi, tti = float(m_s[i]), float(m_t[i]), float(ts_in[i]), float(tt_in[i])
        tm_s, tm_t = 0.5 * (tsi + xs), 0.5 * (tti + xt)
        if s_const is None:
            ps = s_fluid.props(min(max(tm_s, s_lo), s_hi))
            rho_s, cp_s, mu_s, k_s = (float(v) for v in (ps.density, ps.heat_capacity, ps.viscosity, ps.conductivity))
            tw = min(max(tws, s_lo), s_hi)
            mu_ws = float(s_visc(tw) if s_visc is not None else s_fluid.props(tw).viscosity)
        else:
            rho_s, cp_s, mu_s, k_s, mu_ws = s_const
        if t_const is None:
            pt = t_fluid.props(min(max(tm_t, t_lo_f), t_hi_f))
            rho_t, cp_t, mu_t, k_t = (float(v) for v in (pt.density, pt.heat_capacity, pt.viscosity, pt.conductivity))
            tw = min(max(twt, t_lo_f), t_hi_f)
            mu_wt = float(t_visc(tw) if t_visc is not None else t_fluid.props(tw).viscosity)
        else:
            rho_t, cp_t, mu_t, k_t, mu_wt = t_const
        h_t = tube_corr.tube_h_float(mt, n_tpp, di, length, rho_t, cp_t, mu_t, k_t, mu_wt)
        h_s, Re_s = shell_bell.bell_delaware_h_float(g_eff, m_factor * ms, cp_s, mu_s, k_s, mu_ws)
        k_w = _interp_float(0.5 * (tws + twt), k_table)
        R0, R2, R4 = 1.0 / h_s, do * ln_ratio_d / (2.0 * k_w), ratio_d / h_t
        U = 1.0 / (R0 + float(rf_s[i]) + R2 + float(rf_t[i]) * ratio_d + R4)
        C_s, C_t = ms * cp_s, mt * cp_t
        shell_min = C_s <= C_t
        C_min, Cr = (C_s, C_s / C_t) if shell_min else (C_t, C_t / C_s)
        eps, _ = thermal.effectiveness_float(U * area_train / C_min, Cr, arr_name, n_units, shell_min)
        q = min(eps, 1.0) * C_min * float(dt_in[i])
        sg = float(sign[i])
        flux = U * (tm_s - tm_t)
        return (tsi + sg * q / C_s, tti - sg * q / C_t, tm_s - flux * R0, tm_t + flux * R4), Re_s, (min(eps, 1.0),
                                                                                                 C_s, C_t)

    seams = shell_method == "bell-delaware"  # Kern's correlation is smooth
    start, settled = _WARM_START.get() or (None, None)
    if start is not None:  # a caller's first guess of the state (see warm_start), used only when it fits
        start = np.asarray(start, dtype=float)
        start = start if start.shape == (4, n) else None
    if start is None or settled is None:
        settled = None
    else:  # cases evaluated once at the state an earlier rating of theirs stopped at (never iterated)
        settled = np.asarray(settled, dtype=bool).reshape(n) & np.all(np.isfinite(start), axis=0)
        settled = settled if settled.any() else None
    # ---- the property iteration, per case. State rows: the outlet temperatures the properties are taken at
    # (first pass: the inlets) and the wall temperatures (first guess: the mean of the inlets).
    floats = bell_kernel and insert is None  # the float evaluation covers these
    on_floats = False
    first = n // blocks if blocks > 1 and n % blocks == 0 else n  # the cases of the first block
    if tol is None:  # the rating's own stop for every case
        tol_case = None
    else:
        tol_case = np.full(n, float(tol[1]))
        tol_case[:first] = float(tol[0])
    if n <= _FLOAT_CASES and floats and settled is None:
        try:
            # a few cases: each iterates on Python floats (no per-element numpy overhead), the same steps and stops as
            # the array loop; the converged states are then evaluated once by the array kernels, which give every
            # reported number
            rows, lasts = [], []
            for i in range(n):
                hold = []
                moved = None if i < first or start is None else (start[:, i] - start[:, i % first]).tolist()
                if i < first:
                    s_i = None if start is None else start[:, i]
                elif moved is None or not all(math.isfinite(d) for d in moved):
                    s_i = rows[i % first]
                else:  # the base case's stopping state, moved as the warm starts of the two differ
                    s_i = tuple(a + b for a, b in zip(rows[i % first], moved))
                rows.append(_iterate_one(functools.partial(evaluate_one, i), float(ts_in[i]), float(tt_in[i]), seams,
                                         s_i, last=hold, tol=_TOL_K if tol_case is None else float(tol_case[i]),
                                         warm=tol_case is None and s_i is not None))
                lasts.append(hold[0] if hold else evaluate_one(i, *rows[-1])[::2])  # (G, extra) where it stopped
            S = np.array(rows, dtype=float).T.reshape(4, n)
            if outlets_only and not with_dp:  # the float evaluation has every number an outlet map needs
                G = np.array([g for g, _ in lasts], dtype=float).T.reshape(4, n)
                E = np.array([e for _, e in lasts], dtype=float).T.reshape(3, n)
                ev = _Eval(to_s=G[0], to_t=G[1], tw_s=G[2], tw_t=G[3], q=None, eps=E[0], w=None, NTU=None, U=None,
                           C_s=E[1], C_t=E[2], shell_min=None, R=None, tube=_NO_DP, shell=_NO_DP, rho_s=None,
                           rho_t=None, Pr_s=None, mu_ratio_t=None)
            else:
                ev = evaluate(None, S[0], S[1], S[2], S[3])
            on_floats = True
        except (ValueError, ZeroDivisionError, OverflowError):  # a float domain error: the arrays give NaN
            on_floats = False
    if not on_floats:
        S = np.empty((4, n))
        warm_case = np.zeros(n, dtype=bool)  # a warm-started case: its walls' steps count in the stop too
        if start is None:
            S[0], S[1] = ts_in, tt_in
            S[2] = S[3] = 0.5 * (ts_in + tt_in)
        else:  # a case whose start is not finite starts from its inlets
            cold = ~np.all(np.isfinite(start), axis=0)
            warm_case = ~cold
            if cold.any():
                start = np.where(cold, np.stack((ts_in, tt_in, 0.5 * (ts_in + tt_in), 0.5 * (ts_in + tt_in))), start)
            np.minimum(np.maximum(start, t_lo, out=S), t_hi, out=S)
    single = (not on_floats and outlets_only and not with_dp and settled is None and tol is not None
              and math.isinf(tol[0]) and math.isinf(tol[1]))
    if single:  # one evaluation at the start, no stop to test (a network's relaxed pass): the loop's first
        # iteration without its bookkeeping (the same numbers: every finite case stops there at its start)
        ev = evaluate(None, S[0], S[1], S[2], S[3], detail=False)
        ev = _Eval(to_s=ev.to_s, to_t=ev.to_t, tw_s=ev.tw_s, tw_t=ev.tw_t, q=None, eps=ev.eps, w=None, NTU=None,
                   U=None, C_s=ev.C_s, C_t=ev.C_t, shell_min=None, R=None, tube=_NO_DP, shell=_NO_DP, rho_s=None,
                   rho_t=None, Pr_s=None, mu_ratio_t=None)
    elif not on_floats:
        f_prev, g_prev = np.zeros((4, n)), np.zeros((4, n))
        r_prev, s_prev = np.full(n, np.inf), np.zeros(n)
        omega, damped = np.ones(n), np.zeros(n, dtype=bool)
        # an outlet map without pressure drops takes each case's numbers from the evaluation it stopped at (the
        # same numbers a last evaluation at the stopping state gives: no evaluation more)
        keep = outlets_only and not with_dp
        G_end, E_end, have = np.full((4, n), np.nan), np.full((3, n), np.nan), np.zeros(n, dtype=bool)
        # many probe blocks (a network solve's finite differences): the first block iterates alone, then the later
        # blocks start from the states their cases of the first block stopped at (as on the float path): a few
        # steps each instead of the first block's many
        chained = blocks > 1 and first < n and first >= _CHAIN_CASES
        # a warm-started case that took halved steps at a seam is iterated again from its inlets, in a last stage
        # (see _cold_at_seam): where a rating may be final, a warm start changes only the number of iterations
        halved = np.zeros(n, dtype=bool)
        stages = [("base", np.arange(first)), ("probes", np.arange(first, n))] if chained else [("all", np.arange(n))]
        if settled is not None:  # only the other cases iterate (none: no iteration at all)
            stages = [("all", np.flatnonzero(~settled))] if not settled.all() else []
        for k_stage, (kind_stage, stage) in enumerate(stages):
            active = stage
            if kind_stage == "cold":
                S[0, stage], S[1, stage] = ts_in[stage], tt_in[stage]
                S[2, stage] = S[3, stage] = 0.5 * (ts_in[stage] + tt_in[stage])
                f_prev[:, stage], g_prev[:, stage] = 0.0, 0.0
                r_prev[stage], s_prev[stage], omega[stage] = np.inf, 0.0, 1.0
                damped[stage], warm_case[stage], have[stage] = False, False, False
            if kind_stage == "probes":
                base = stage % first
                moved = np.zeros((4, stage.size)) if start is None else start[:, stage] - start[:, base]
                moved = np.where(np.isfinite(moved), moved, 0.0)
                S[:, stage] = np.minimum(np.maximum(S[:, base] + moved, t_lo[stage]), t_hi[stage])
                warm_case[stage] = True
            for it in range(_MAX_ITER):
                if active.size == 0:
                    break
                full_set = active.size == n
                if full_set:  # no gathers while every case is still iterating
                    X, rp, om, sp, dmp, lo, hi = S, r_prev, omega, s_prev, damped, t_lo, t_hi
                else:
                    X = S[:, active]
                    rp, om, sp, dmp, lo, hi = (a[active] for a in (r_prev, omega, s_prev, damped, t_lo, t_hi))
                ev = evaluate(None if full_set else active, X[0], X[1], X[2], X[3], detail=False)
                G = np.stack((ev.to_s, ev.to_t, ev.tw_s, ev.tw_t))
                f = G - X
                r = np.maximum(np.abs(f[0]), np.abs(f[1]))  # from the inlets the outlets decide; the walls follow
                wc = warm_case if full_set else warm_case[active]
                if wc.any():
                    r = np.where(wc, np.maximum(r, np.maximum(np.abs(f[2]), np.abs(f[3]))), r)
                conv = r < (_TOL_K if tol_case is None else tol_case if full_set else tol_case[active])
                # Near a band edge of Taborek's fits the map jumps: there, plain substitution (a secant across a jump
                # points nowhere), and where the outlet residual changes sign without shrinking (no fixed point: a seam)
                # the step is halved at each change of sign, so that the case settles at the edge.
                # (a pass that only steers a network solve needs the seams for its steps alone: not before
                # the Anderson step is tried)
                edge = _near_seam(ev.shell.Re) if seams and (tol_case is None or it >= _ANDERSON_FROM) else None
                any_edge = edge is not None and bool(edge.any())
                s_now = np.sign(f[1])
                if any_edge and it >= _SEAM_FROM:
                    flip = edge & (s_now * sp < 0) & (r > 0.7 * rp)
                    dm = dmp | flip
                    om = np.where(flip, 0.5 * om, om)
                    if full_set:
                        halved |= dm
                    else:
                        halved[active] |= dm
                else:  # no case flips
                    dm = dmp
                if it >= _ANDERSON_FROM:
                    df = f - (f_prev if full_set else f_prev[:, active])
                    den = np.einsum("ij,ij->j", df, df)
                    with np.errstate(divide="ignore", invalid="ignore"):
                        gam = np.einsum("ij,ij->j", f, df) / den
                    ok = (den > 0) & np.isfinite(gam) & (r <= rp)
                    if any_edge:
                        ok &= ~edge
                    gam = np.where(ok, gam, 0.0)  # else a plain step
                    Xn = G - gam * (G - (g_prev if full_set else g_prev[:, active]))
                else:
                    Xn = G
                any_damped = bool(dm.any())
                if any_damped:
                    Xn = np.where(dm, X + om * f, Xn)
                Xn = np.minimum(np.maximum(Xn, lo), hi)  # outlets and walls stay between the inlets
                stop = (conv | (dm & (om * r < _SEAM_STEP_K))) if any_damped else conv
                n_stop = int(np.count_nonzero(stop))
                if n_stop:
                    Xn = np.where(stop, X, Xn)
                    if keep and full_set and n_stop == n:  # every case at once (no gathers)
                        G_end[:], have[:] = G, True
                        E_end[0], E_end[1], E_end[2] = ev.eps, ev.C_s, ev.C_t
                    elif keep:
                        at = active[stop]
                        G_end[:, at], have[at] = G[:, stop], True
                        E_end[0, at], E_end[1, at], E_end[2, at] = (np.broadcast_to(v, stop.shape)[stop]
                                                                    for v in (ev.eps, ev.C_s, ev.C_t))
                if full_set:
                    S, f_prev, g_prev = Xn, f, G
                    r_prev, s_prev, omega, damped = r, s_now, om, dm
                else:
                    S[:, active], f_prev[:, active], g_prev[:, active] = Xn, f, G
                    r_prev[active], s_prev[active], omega[active], damped[active] = r, s_now, om, dm
                if n_stop >= 0.2 * stop.size:  # drop stopped cases once it pays for the indexing (they stay put)
                    active = active[~stop]
                if floats and 0 < active.size <= _FLOAT_CASES:
                    # the last few cases carry on one by one on floats, from the state they reached (the same steps)
                    try:
                        for i in active:
                            hold = []
                            S[:, i] = _iterate_one(
                                functools.partial(evaluate_one, i), float(ts_in[i]), float(tt_in[i]), seams,
                                tol=_TOL_K if tol_case is None else float(tol_case[i]), walls=bool(warm_case[i]),
                                warm=tol_case is None and bool(warm_case[i]), halved=bool(halved[i]), last=hold,
                                resume=(it + 1, tuple(S[:, i].tolist()), tuple(f_prev[:, i].tolist()),
                                        tuple(g_prev[:, i].tolist()), float(r_prev[i]), float(s_prev[i]),
                                        float(omega[i]), bool(damped[i])))
                            if hold:
                                (G_end[:, i], E_end[:, i]), have[i] = hold[0], True
                    except (ValueError, ZeroDivisionError, OverflowError):  # carry on with the arrays (NaN there)
                        continue
                    break
            if seams and kind_stage != "cold" and k_stage == len(stages) - 1:
                cold = np.flatnonzero(_cold_at_seam(warm_case, halved, tol_case))
                if cold.size:
                    stages.append(("cold", cold))

        # every case stopped at the state of its last evaluation: evaluate once more, all together, with the
        # pressure drops the iteration did not need (an outlet map without them has its numbers already)
        if keep and have.all():
            ev = _Eval(to_s=G_end[0], to_t=G_end[1], tw_s=G_end[2], tw_t=G_end[3], q=None, eps=E_end[0], w=None,
                       NTU=None, U=None, C_s=E_end[1], C_t=E_end[2], shell_min=None, R=None, tube=_NO_DP,
                       shell=_NO_DP, rho_s=None, rho_t=None, Pr_s=None, mu_ratio_t=None)
        else:
            ev = evaluate(None, S[0], S[1], S[2], S[3])
    xs, xt = S[0], S[1]
    to_s, to_t, q, U = ev.to_s, ev.to_t, ev.q, ev.U

    # ---- cases that leave a fluid's liquid range at an inlet or an outlet (a single case raises)
    invalid, range_msgs = out_of_range(s_fluid, t_fluid, ts_in, tt_in, to_s, to_t, shape)

    if outlets_only:
        maps = (to_s, to_t, ev.tw_s, ev.tw_t, ev.eps, ev.C_s * n_par, ev.C_t * n_par,
                np.asarray(ev.shell.dp) * hx.shells, ev.tube.dp * hx.shells)
        if invalid.any():  # NaN where a stream leaves its fluid's range
            bad = np.where(invalid, np.nan, 0.0)
            maps = tuple(v + bad for v in maps)
        return OutletMap(*maps, S)

    residual = np.maximum(np.abs(to_s - xs), np.abs(to_t - xt))
    unsettled = residual > _SETTLED_K

    # ---- LMTD and F from the terminal differences of 1 - eps (no cancellation near eps = 1)
    lm, F = rated_lmtd_f(ev.eps, ev.NTU, ev.w, ev.shell_min, ev.C_s, ev.C_t, dt_in, arr_name == "counterflow")
    undefined = ~np.isfinite(F) & ~invalid & ~same
    F = np.where(np.isfinite(F), F, np.nan)

    warnings, tube_warnings, shell_warnings = rating_warnings(
        hx, notes, ev, insert, geom, bell_kernel, s_fluid, t_fluid, (ts_in, to_s, tt_in, to_t), invalid, unsettled,
        residual, undefined, same, shape, range_msgs)

    U_clean = 1.0 / (ev.R[0] + ev.R[2] + ev.R[4])  # the same films and wall, no deposit
    res_cols = {name: np.broadcast_to(v, (n,)) for name, v in zip(TUBE_LAYERS, ev.R)}
    tube = ev.tube
    shear = tube.f / 8.0 * ev.rho_t * tube.velocity ** 2
    fields = dict(
        duty=q * n_par, t_out_shell=to_s, t_out_tube=to_t, effectiveness=ev.eps, NTU=ev.NTU, F=F, lmtd=lm,
        U_clean=U_clean, U_service=U, U_service_inside=U * do / di, h_shell=ev.shell.h, h_tube=tube.h,
        dp_shell=np.asarray(ev.shell.dp) * hx.shells, dp_tube=tube.dp * hx.shells, velocity_tube=tube.velocity,
        velocity_shell=ev.shell.velocity_crossflow, Re_tube=tube.Re, Re_shell=ev.shell.Re, Pr_tube=tube.Pr,
        Pr_shell=ev.Pr_s, t_wall_tube=ev.tw_t, t_wall_shell=ev.tw_s, shear_tube=shear, rho_tube=ev.rho_t,
        rho_shell=ev.rho_s, C_shell=ev.C_s * n_par, C_tube=ev.C_t * n_par,
    )
    any_invalid = bool(invalid.any())
    resistances = LazyResistances(TUBE_LAYERS, tuple(res_cols.values()), invalid if any_invalid else None,
                                  scalar=shape == ())
    return Rating(
        **_case_shaped(fields, shape, n, invalid if any_invalid else None), area=hx.area_outside,
        area_inside=hx.area_inside, resistances=resistances,
        tube_side=_reshape_fields(dataclasses.replace(tube, warnings=tube_warnings), shape),
        shell_side=_reshape_fields(dataclasses.replace(ev.shell, warnings=shell_warnings), shape),
        warnings=tuple(dict.fromkeys(warnings)), defaults=tuple(getattr(hx, "defaults_used", ())), exchanger=hx,
        service=service, shell_method=shell_method,
    )
