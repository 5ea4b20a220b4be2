"""The pieces of a condenser's zone-by-zone rating: the condensing path, the films, the pressure drops, each zone's F.

:func:`revamp.rating_condenser.rate_condenser` walks the condensing stream's path (:func:`_path`, tabulated from the
stream's condensing curve: desuperheating, condensation, subcooling) increment by increment; this module holds what it
calls at each increment: the condensing films (:func:`cond_shell`, :func:`cond_tube` and their validity warnings), the
condensing-side pressure drop along the path and the saturation-temperature drop it causes (:func:`_drop_profile`,
:func:`shell_two_phase_dp`), and the LMTD correction of each zone (:func:`zone_F`). All of these names are
re-exported by :mod:`revamp.rating_condenser`.

References
----------
Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Mean temperature difference in design. *Trans. ASME*
62:283-294.
Ishihara, K., Palen, J. W., Taborek, J. (1980). Critical review of correlations for predicting two-phase flow
pressure drop across tube banks. *Heat Transfer Eng.* 1(3):23-32 (C = 8 in Chisholm's form; from memory).
Serth, R. W., Lestina, T. G. (2014). *Process Heat Transfer: Principles and Applications*, 2nd ed., Academic Press,
ch. 11 (condensers: zone and incremental analysis).
Butterworth, D. (1983). Film condensation of pure vapor. *Heat Exchanger Design Handbook* §2.6.2, Hemisphere.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import thermal
from .correlations import condensation as cond
from .correlations import two_phase
from .errors import InputError
from .fluids.base import Props


#: The zones along a condensing stream's path, in order.
ZONES = ("desuperheating", "condensing", "subcooling")


# ------------------------------------------------------------------------------------------------------ the path
def _curve_of(fluid):
    """The condensing curve of a stream's fluid (a curve as it is; a pure CoolProp fluid at its pressure)."""
    if all(hasattr(fluid, a) for a in ("t_dew", "t_bubble", "q", "T", "x")):
        return fluid
    from .fluids import condensing

    return condensing(fluid)


@dataclass(frozen=True)
class _Path:
    """The condensing stream's path, the same for every case: heat released per kg ``s`` [J/kg] from the inlet
    against temperature, vapour fraction and zone (0, 1, 2)."""

    s: np.ndarray
    T: np.ndarray
    x: np.ndarray
    bounds: tuple  # s at the end of desuperheating and at the end of condensation [J/kg]
    t_floor: float

    def T_at(self, s):
        return np.interp(s, self.s, self.T)

    def x_at(self, s):
        return np.interp(s, self.s, self.x)

    def s_at_T(self, T):
        """Heat released [J/kg] down to a temperature in the subcooling zone (past the bubble point)."""
        s2 = self.bounds[1]
        sub = self.s >= s2
        return np.interp(-np.asarray(T, dtype=float), -self.T[sub], self.s[sub])


def _path(curve, t_in, x_in, t_floor) -> _Path:
    """Tabulate the path from the inlet (vapour at ``t_in`` or two-phase at ``x_in``) down to ``t_floor``."""
    q, Tc, xc = (np.asarray(a, dtype=float) for a in (curve.q, curve.T, curve.x))
    parts_s, parts_T, parts_x = [], [], []
    s0 = 0.0
    if x_in is None and t_in > curve.t_dew + 1e-9:  # desuperheating: the curve's vapour enthalpies
        Tg = np.linspace(t_in, curve.t_dew, 41)
        try:
            hs = np.asarray(curve.superheat(Tg), dtype=float)
        except InputError as exc:
            raise InputError("t_in", f"{t_in:.2f} K", f"a vapour inlet within the condensing fluid's "
                             f"superheat range ({exc.allowed})") from None
        sg = hs[0] - hs
        parts_s.append(sg), parts_T.append(Tg), parts_x.append(np.ones_like(Tg))
        s0 = float(sg[-1])
    s1 = s0
    xin = 1.0 if x_in is None else float(x_in)
    order = np.argsort(xc)
    q_in = float(np.interp(xin, xc[order], q[order]))
    qg = np.unique(np.concatenate((np.linspace(q_in, q[-1], 81), q[(q > q_in) & (q < q[-1])])))
    Tq, xq = curve.at(qg)
    parts_s.append(s1 + qg - q_in), parts_T.append(np.asarray(Tq, dtype=float) * np.ones_like(qg))
    parts_x.append(np.asarray(xq, dtype=float) * np.ones_like(qg))
    s2 = s1 + float(q[-1]) - q_in
    t_b = float(curve.t_bubble)
    enthalpy = getattr(curve, "liquid_enthalpy", None)
    if enthalpy is not None:  # the subcooling the curve tabulates
        t_floor = max(t_floor, float(enthalpy.T[0]))
    t_floor = min(t_floor, t_b - 1e-3)
    Tl = np.linspace(t_b, t_floor, 61)
    sl = s2 + np.asarray(curve.subcooling(Tl), dtype=float)  # the curve's condensate enthalpies
    parts_s.append(sl), parts_T.append(Tl), parts_x.append(np.zeros_like(Tl))
    s = np.concatenate(parts_s)
    keep = np.concatenate(([True], np.diff(s) > 0))
    return _Path(s=s[keep], T=np.concatenate(parts_T)[keep], x=np.concatenate(parts_x)[keep], bounds=(s1, s2),
                 t_floor=t_floor)


# -------------------------------------------------------------------------------------- films, pressure drops, F
def _drop_profile(d, n, tube_cond, area_per_length, bundle, model, c_side, curve, m_h, s_out, s1, s2, t_h_in):
    """The condensing side's pressure drop (stored per increment in ``d``), the saturation-temperature drop over
    the condensing zone and its profile along the path (a function of s, for the next pass)."""
    dp_inc, length = _condensing_dp(d, tube_cond, area_per_length, bundle, c_side, m_h)
    if not tube_cond:  # shell side: each increment's share of the bundle at its local two-phase drop
        dA = np.where(np.isfinite(d["dA"]), d["dA"], 0.0)
        tot = dA.reshape(n, -1).sum(axis=1)
        zone = np.broadcast_to(np.arange(3)[None, :, None], dA.shape)
        x = np.where(zone == 0, 1.0, np.where(zone == 2, 0.0, d["x"]))
        m = np.broadcast_to(m_h[:, None, None], dA.shape)
        liquid = Props(d["rho_l"], d["cp_l"], d["mu_l"], d["k_l"])
        vapour = Props(d["rho_v"], d["cp_v"], d["mu_v"], d["k_v"])
        whole = shell_two_phase_dp(model, c_side, m, x, liquid, vapour)
        dp_inc = whole * dA / np.where(tot > 0, tot, 1.0)[:, None, None]
    dp_total = dp_inc.reshape(n, -1).sum(axis=1)
    d["dp"], d["length"] = dp_inc, length
    cum = np.cumsum(dp_inc.reshape(n, -1), axis=1)
    zone = np.broadcast_to(np.arange(3)[None, :, None], dp_inc.shape).reshape(n, -1)
    dp_cond = np.where(zone <= 1, dp_inc.reshape(n, -1), 0.0).sum(axis=1)  # up to the end of condensation
    dt_drop = _sat_drop(curve, dp_cond, s_out, s1)
    ends = d["nodes"][..., 1:].reshape(n, -1)

    def dtsat(s):
        s = np.asarray(s, dtype=float)
        out = np.zeros(s.shape)
        for i in range(n):
            if dt_drop[i] > 0:
                share = np.interp(s[i], ends[i], cum[i], left=0.0) / max(dp_cond[i], 1e-300)
                out[i] = dt_drop[i] * np.minimum(share, 1.0)
        return np.where((s > s1), out, 0.0) if s.ndim else out

    return dp_total, dt_drop, dtsat


def zone_F(Th, Tc, shells=1):
    """LMTD correction F of each zone of the path for 1-2N shells in series [-].

    Each zone (desuperheating, condensing, subcooling) is taken as one exchanger between its terminal temperatures:
    the condensing stream from ``Th[..., 0]`` to ``Th[..., -1]``, the coolant from ``Tc[..., -1]`` (in) to
    ``Tc[..., 0]`` (out); R = (Th_in - Th_out)/(Tc_out - Tc_in), P = (Tc_out - Tc_in)/(Th_in - Tc_in) and
    F = :func:`revamp.thermal.F_series` (Bowman, Mueller & Nagle 1940; N shells in overall counterflow). An
    isothermal zone (a pure fluid condensing) has R = 0 and F = 1 exactly; a zone without duty F = 1; NaN where no
    1-2N train reaches the zone's temperatures (a temperature cross: the zone cannot be done in that arrangement).

    Parameters
    ----------
    Th, Tc : numpy.ndarray
        Node temperatures of the condensing stream and the coolant [K], shape ``(cases, zones, nodes)``.
    shells : int
        1-2N shells in series.

    Returns
    -------
    numpy.ndarray
        F of shape ``(cases, zones)``.

    References
    ----------
    Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Mean temperature difference in design. Trans. ASME 62,
    283-294; Serth & Lestina (2014), ch. 11 (the zone method).
    """
    th_in, th_out, tc_in, tc_out = Th[..., 0], Th[..., -1], Tc[..., -1], Tc[..., 0]
    rise = tc_out - tc_in
    finite = np.isfinite(th_in) & np.isfinite(th_out) & np.isfinite(tc_in) & np.isfinite(tc_out)
    duty = finite & (rise > 0) & (th_in > tc_in)  # (no finite temperatures: no correction; the area is NaN anyway)
    with np.errstate(divide="ignore", invalid="ignore"):
        R = np.where(duty, np.maximum(th_in - th_out, 0.0) / np.where(duty, rise, 1.0), 0.0)
        P = np.where(duty, rise / np.where(duty, th_in - tc_in, 1.0), 0.0)
    # a coolant that barely warms (P -> 0, R -> infinity) is isothermal in the limit: F -> 1
    duty = duty & np.isfinite(R) & (P > 1e-9)
    # the condensing stream cooled down to the coolant inlet (P R >= 1, or P >= 1): no finite exchanger does it
    cross = duty & ((P * R >= 1.0) | (P >= 1.0))
    ok = duty & ~cross
    F = np.asarray(thermal.F_series(np.where(ok, R, 0.0), np.where(ok, P, 0.0), int(shells)),
                   dtype=float) * np.ones(R.shape)
    F = np.where(cross, np.nan, np.where(ok, F, 1.0))
    return np.where(duty & (R == 0.0) & np.isfinite(F), 1.0, F)


def shell_two_phase_dp(model, side, m, x, liquid, vapour):
    """Shell-side pressure drop [Pa] of the whole bundle path for a two-phase flow at vapour fraction ``x``.

    The shell method's single-phase drops (the model's ``film(side, ...).dp``: Bell-Delaware or Kern, with the
    shell type's adaptation, nozzles where modelled, all shells in series) of the liquid part ``(1 − x) m`` and of
    the vapour part ``x m``, each flowing alone, combined by
    :func:`revamp.correlations.two_phase.dp_crossflow_bundle` (Chisholm's form with C = 8 for tube banks, Ishihara,
    Palen & Taborek 1980). x = 0 gives the liquid drop of the whole flow, x = 1 the vapour drop.

    Parameters
    ----------
    model : ExchangerModel
        A shell-and-tube model (:func:`revamp.exchanger.model_of`).
    side : str
        The shell side's name.
    m : float or array_like
        Mass flow of one parallel unit [kg/s].
    x : float or array_like
        Vapour mass fraction [-], 0 to 1.
    liquid, vapour : Props
        Properties of the liquid and of the vapour (arrays broadcasting with ``m`` and ``x``).

    Returns
    -------
    numpy.ndarray
        Pressure drop [Pa] (frictional and form; gravity and momentum not included).
    """
    m, x = np.broadcast_arrays(np.asarray(m, dtype=float), np.clip(np.asarray(x, dtype=float), 0.0, 1.0))
    floor = 1e-12 * np.maximum(m, 1e-300)

    def alone(flow, props):
        f = np.maximum(flow, floor)
        dp = np.asarray(_model_film(model, side, f, props, False).dp, dtype=float)
        return np.where(flow > floor, dp, 0.0)

    return np.asarray(two_phase.dp_crossflow_bundle(alone((1.0 - x) * m, liquid), alone(x * m, vapour)),
                      dtype=float)


def _film_warnings(tube_cond, used, G, x, d_i, d_o, rows, rho_l, rho_v, mu_l, k_l, cp_l, latent, p_red, dtf, u_v,
                   tube_method="max", mu_v=None):
    """The condensing correlations' validity warnings over the condensing increments (the validating wrappers)."""
    if not np.any(used):
        return ()
    u = used
    if tube_cond:
        res = cond.tube_condensation(G[u], np.clip(x[u], 0.0, 1.0), d_i, rho_l[u], rho_v[u], mu_l[u], k_l[u],
                                     cp_l[u], latent, p_red, np.maximum(dtf[u], 1e-9), method=tube_method,
                                     mu_v=None if mu_v is None else np.broadcast_to(mu_v, np.shape(G))[u])
    else:
        res = cond.shell_condensation(rho_l[u], rho_v[u], k_l[u], mu_l[u], latent, d_o, np.maximum(dtf[u], 1e-9),
                                      max(rows, 1.0), u_v[u])
    return tuple(res.warnings)


def _pick(where, a, b, ones):
    """Properties: ``a`` where ``where`` holds, else ``b`` (arrays of the increments' flat shape)."""
    return Props(*(np.where(where, np.asarray(getattr(a, f), dtype=float) * ones,
                            np.asarray(getattr(b, f), dtype=float) * ones) for f in _PROPS))


_PROPS = ("density", "heat_capacity", "viscosity", "conductivity")


def _used_warnings(model, side, m, props, used):
    """The validity warnings of a single-phase film of the condensing side over the increments that use it."""
    if not np.any(used):
        return ()
    pick = type(props)(*(np.broadcast_to(np.asarray(getattr(props, f), dtype=float), used.shape)[used]
                         for f in ("density", "heat_capacity", "viscosity", "conductivity")))
    return tuple(_model_film(model, side, m[used], pick, True).warnings)


def _model_film(model, side, m, props, warn):
    """The model's film, skipping validity warnings inside the search when the model allows it."""
    try:
        return model.film(side, m, props, warn=warn)
    except TypeError:  # a model without the keyword
        return model.film(side, m, props)


def cond_shell(d_o, rows, rho_l, rho_v, mu_l, k_l, latent, dtf, u_v):
    """Shell-side condensing film on a horizontal tube bundle [W/m²K] (outside surface): Nusselt (1916) with Kern's
    row correction N^(-1/6), combined with Shekriladze & Gomelauri's (1966) vapour-shear form by Butterworth's (1977)
    rule (:mod:`revamp.correlations.condensation`: the gravity form at low vapour velocity, the shear form at high)."""
    h_grav = np.asarray(cond.nusselt_horizontal_tube(rho_l, rho_v, k_l, mu_l, latent, d_o, dtf)) * float(
        cond.row_factor(rows, "kern"))
    return cond.butterworth_combination(cond.shear_horizontal_tube(rho_l, k_l, mu_l, u_v, d_o), h_grav)


def cond_tube(G, x, d_i, rho_l, rho_v, mu_l, k_l, cp_l, latent, p_red, dtf):
    """In-tube condensing film [W/m²K] (inside surface): the larger of Shah (1979) and the stratified Jaster &
    Kosky (1976) form (the default of :func:`revamp.correlations.condensation.tube_condensation`)."""
    return np.maximum(cond.shah_1979(G, x, d_i, rho_l, mu_l, k_l, cp_l, p_red),
                      cond.stratified_jaster_kosky(x, rho_l, rho_v, k_l, mu_l, latent, d_i, dtf))


def _q_in(curve, x_in):
    if x_in is None:
        return 0.0
    xc, q = np.asarray(curve.x, dtype=float), np.asarray(curve.q, dtype=float)
    order = np.argsort(xc)
    return float(np.interp(x_in, xc[order], q[order]))


def _condensing_dp(d, tube_cond, area_per_length, bundle, c_side, m_h):
    """Frictional pressure drop of each increment of the condensing path [Pa] and its path length [m].

    Inside tubes: the two-phase gradient of :mod:`revamp.correlations.two_phase` (default method) at the
    increment's vapour fraction and mass flux over the increment's length (the area it needs over the area per metre
    of path); single-phase vapour (x = 1) and condensate (x = 0) in the first and last zones, where the two-phase
    forms reduce to the single-phase gradients. On the shell side the lengths only (the caller applies
    :func:`shell_two_phase_dp`).
    """
    dA = d["dA"]
    length = np.where(np.isfinite(dA), dA, 0.0) / area_per_length
    if not tube_cond:
        return np.zeros_like(length), length
    zone = np.broadcast_to(np.arange(3)[None, :, None], dA.shape)
    x = np.where(zone == 0, 1.0, np.where(zone == 2, 0.0, d["x"]))
    m_tube = np.broadcast_to(m_h[:, None, None], dA.shape) / float(bundle.tubes_per_pass)
    d_i = float(bundle.d_i)
    grad = two_phase.frictional_gradient(m_tube / (np.pi * d_i ** 2 / 4.0), x, d_i, d["rho_l"], d["rho_v"],
                                         d["mu_l"], d["mu_v"], None, float(bundle.roughness) / d_i)
    return np.asarray(grad, dtype=float) * length, length


def _sat_drop(curve, dp_total, s_out, s1):
    """Drop of the dew point [K] caused by a pressure drop ``dp_total`` [Pa] from the inlet pressure
    (:func:`revamp.correlations.two_phase.saturation_temperature_drop`: pure fluid by CoolProp, a curve by
    Clausius-Clapeyron)."""
    p = float(curve.pressure)
    dp = np.clip(np.asarray(dp_total, dtype=float), 0.0, 0.9 * p)
    dp = np.where((s_out > s1) & np.isfinite(dp), dp, 0.0)
    if not np.any(dp > 0):
        return np.zeros_like(dp)
    return np.asarray(two_phase.saturation_temperature_drop(curve, dp), dtype=float) * np.ones_like(dp)
