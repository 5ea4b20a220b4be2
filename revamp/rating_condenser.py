"""Rating of a condenser, zone by zone along the condensing curve (layer 5).

:func:`rate_condenser` (reached through :func:`revamp.rate` when a stream is vapour or two-phase) rates a
shell-and-tube exchanger with condensation on the shell or the tube side, or an air cooler condensing in its tubes.
It does not use one mean coefficient over the whole duty: the condensing stream's path is cut into zones
(desuperheating of the vapour, condensation along the curve, subcooling of the condensate) and each zone into
increments of heat released. For each increment it takes

1. the duty of the increment (flow x heat released, from the curve);
2. the local condensing film (:mod:`revamp.correlations.condensation`: Nusselt with Kern's row correction and the
   vapour-shear form on a shell-side bundle, Shah / stratified Nusselt inside tubes, the Bell & Ghaly correction of a
   mixture's vapour-phase resistance), or the single-phase vapour/condensate film in the desuperheating and
   subcooling zones, and the coolant film at its local temperature, both from the exchanger's model
   (:func:`revamp.exchanger.model_of`);
3. the local overall coefficient through the model's network of resistances (its own layers);
4. the local temperature difference and from it the area the increment needs.

The areas are summed along the path until the exchanger's area is used up: that point gives the duty, the outlet
temperature and quality of the condensing stream and the coolant outlet. The two-phase frictional pressure drop is
integrated along the path (:mod:`revamp.correlations.two_phase`, the default method stated there), and the
saturation-temperature drop it causes is fed back into the curve (it matters at vacuum). On the shell side the
two-phase crossflow drop is Chisholm's form of the Lockhart-Martinelli multiplier with C = 8 for tube banks
(Ishihara, Palen & Taborek 1980) on the shell method's drop of each phase flowing alone (:func:`shell_two_phase_dp`).

Flow arrangement (stated, screening level): in a shell-and-tube exchanger the coolant meets the increments in
counterflow (the coolant leaves where the vapour enters), the usual assumption of a zone analysis (Bell & Ghaly
1973; Serth & Lestina 2014, ch. 11), and each zone's area is then divided by the LMTD correction F of the zone's
terminal temperatures for 1-2N shells (:func:`zone_F`, Bowman, Mueller & Nagle 1940): F = 1 for a pure fluid's
isothermal condensing zone, below 1 for the desuperheating and subcooling zones and a mixture's glide. J and X
shells have no closed-form F here and stay in counterflow, which the rating says is optimistic where the condensing
temperature changes. In an air cooler every increment meets air at the ambient temperature (air in crossflow,
unmixed across the bundle), which is exact for isothermal condensation with a uniform coefficient.

Where the pieces live: the path, the films, the pressure drops and :func:`zone_F` in
:mod:`revamp.rating_condenser_path`; :class:`CondenserRating` and its tables in :mod:`revamp.rating_condenser_result`;
the column-pressure search (:func:`condensing_pressure_for`) in :mod:`revamp.rating_condenser_pressure`. Every name
is re-exported here.

References
----------
Bowman, R. A., Mueller, A. C., Nagle, W. M. (1940). Mean temperature difference in design. *Trans. ASME*
62:283-294.
Bell, K. J., Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial condensers.
*AIChE Symp. Ser.* 69(131):72-79.
Ishihara, K., Palen, J. W., Taborek, J. (1980). Critical review of correlations for predicting two-phase flow
pressure drop across tube banks. *Heat Transfer Eng.* 1(3):23-32 (C = 8 in Chisholm's form; from memory).
Serth, R. W., Lestina, T. G. (2014). *Process Heat Transfer: Principles and Applications*, 2nd ed., Academic Press,
ch. 11 (condensers: zone and incremental analysis).
Butterworth, D. (1983). Film condensation of pure vapor. *Heat Exchanger Design Handbook* §2.6.2, Hemisphere.
"""
from __future__ import annotations

import numpy as np

from . import thermal
from .correlations import air as air_corr
from .correlations import condensation as cond
from .errors import InputError
from .rating_condenser_path import (_curve_of, _drop_profile, _film_warnings, _model_film, _path, _pick, _q_in,
                                    _used_warnings, cond_shell, cond_tube, zone_F)
from .rating_condenser_path import ZONES, shell_two_phase_dp  # noqa: F401  (live in rating_condenser_path.py now)
from .rating_condenser_result import CondenserRating, _result
from .service import Service, Stream

__all__ = ["CondenserRating", "TUBE_CONDENSATION", "ZONES", "condensing_pressure_for", "CondensingPressure",
           "is_condensing", "rate_condenser", "shell_two_phase_dp", "zone_F"]

#: Increments per zone (the condensing zone's curvature in U and temperature difference is resolved to well below
#: a percent of area with this many; tested against a finer cut).
INCREMENTS = 16

#: A condensing-side pressure drop above this share of the inlet pressure is beyond the rating (near choking): NaN.
CHOKE_SHARE = 0.5
_MAX_SEARCH = 80
_OUTER = 8  # passes (at most) of the pressure-drop / saturation-temperature feedback
_SETTLED_K = 0.05  # a saturation drop that still moves by more than this between the last passes is reported [K]


def is_condensing(service) -> bool:
    """True when a service carries a vapour or two-phase stream (the rating is then a condenser rating)."""
    for side in ("shell", "tube"):
        s = getattr(service, side, None)
        if isinstance(s, Stream) and s.condensing:
            return True
    return False


# ------------------------------------------------------------------------------------------------------ the engine
def _sides(model, service):
    """(condensing side, its stream, coolant side, coolant stream or None for air, fouling by side)."""
    kind = model.kind
    if kind == "air cooler":
        from .service_air import AirService

        if not isinstance(service, AirService):
            raise InputError("service", service, "a revamp.AirService(tube=Stream(vapour, flow, quality=...), "
                             "air_in=..., air_flow=...)")
        if not service.tube.condensing:
            raise InputError("service.tube", service.tube, "a vapour or two-phase stream (quality= or "
                             "phase='vapour') for a condenser rating")
        return "tube", service.tube, "air", None, {"tube": service.fouling_tube, "air": service.fouling_air}
    if not isinstance(service, Service):
        raise InputError("service", service, "a revamp.Service(shell=Stream(...), tube=Stream(...))")
    c_shell, c_tube = service.shell.condensing, service.tube.condensing
    if c_shell and c_tube:
        raise InputError("service.tube", service.tube, "a single-phase coolant (only one side may condense)")
    if not (c_shell or c_tube):
        raise InputError("service", service, "a vapour or two-phase stream on one side for a condenser rating")
    side, other = ("shell", "tube") if c_shell else ("tube", "shell")
    return side, getattr(service, side), other, getattr(service, other), {
        "shell": service.fouling_shell, "tube": service.fouling_tube}


def _layer_index(model, side):
    return 0 if side == model.sides[0] else len(model.layers) - 1


#: In-tube condensing film methods of the engine: the default, the larger of Shah (1979) and the stratified form,
#: or Shah (2009) with its own gravity-controlled part.
TUBE_CONDENSATION = ("max", "shah2009")


def rate_condenser(exchanger, service, increments: int = INCREMENTS, tube_condensation: str = "max",
                   **methods) -> CondenserRating:
    """Rate a condenser zone by zone: duty, outlets, zones, pressure drops.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or revamp.AirCooler
    service : revamp.Service (one side vapour or two-phase, the other a single-phase coolant) or revamp.AirService
        (a vapour or two-phase tube stream). Coolant flow and inlet, condensing flow and fouling may be arrays (they
        broadcast); the condensing stream has one inlet temperature and quality.
    increments : int
        Increments per zone (default :data:`INCREMENTS`).
    tube_condensation : str
        In-tube condensing film, a key of :data:`TUBE_CONDENSATION`: ``"max"`` (default), the larger of Shah
        (1979) and the stratified Jaster & Kosky (1976) form; ``"shah2009"``, Shah (2009) with its regime map
        (:func:`revamp.correlations.condensation.shah_2009`).
    **methods
        Passed to :func:`revamp.exchanger.model_of` (e.g. ``shell_method``).

    Returns
    -------
    CondenserRating

    Raises
    ------
    InputError
        A service of the wrong kind for the exchanger, two condensing sides or none, a coolant that is not a
        liquid at its inlet, a coolant inlet at or above the condensing inlet in a single case.

    Notes
    -----
    Coolant properties at each increment's local temperature; the condensing film and the wall iterate locally
    (Nusselt's film coefficient depends on the film temperature difference). The coolant's heat balance uses its
    heat capacity at the mean of its inlet and outlet, so the balance between the streams is exact at that value.
    The shell-side condensing pressure drop is integrated increment by increment: each increment's share of the
    bundle (its area over the path's) at the two-phase drop of :func:`shell_two_phase_dp` (Chisholm's form with
    C = 8 for tube banks, Ishihara, Palen & Taborek 1980, on the shell method's drops of each phase alone; the
    vapour alone in the desuperheating zone, the condensate alone in the subcooling zone); inside tubes the
    two-phase frictional gradient of
    :mod:`revamp.correlations.two_phase` (its default method) is integrated along the path. The pressure drop
    lowers the saturation temperature along the path (pure fluid: exact at the outlet pressure; a curve shifted as
    :meth:`CondensingFluid.at_pressure` states), distributed along the path in proportion to the accumulated
    pressure drop, and the rating is repeated with it until the drop settles (at most eight passes; one still
    moving by more than 0.05 K between the last passes is reported in the warnings).

    References
    ----------
    Bell & Ghaly (1973); Ishihara, Palen & Taborek (1980); Serth & Lestina (2014), ch. 11 (see the module).
    """
    from .exchanger import model_of

    if isinstance(increments, bool) or not isinstance(increments, (int, np.integer)) or increments < 2:
        raise InputError("increments", increments, "a whole number >= 2")
    increments = int(increments)
    if tube_condensation not in TUBE_CONDENSATION:
        raise InputError("tube_condensation", tube_condensation, f"one of {TUBE_CONDENSATION}")
    model = model_of(exchanger, **methods)
    c_side, stream, k_side, coolant, fouling = _sides(model, service)
    curve = _curve_of(stream.fluid)
    bundle = model.bundle
    n_par = float(model.n_parallel)
    area_unit = float(model.area) / n_par
    air = k_side == "air"

    # ---- the cases (flat)
    if air:
        air_given = service.air_flow if service.air_flow is not None else service.face_velocity
        arrays = (stream.flow, service.air_in, air_given, service.fouling_tube, service.fouling_air)
    else:
        arrays = (stream.flow, coolant.flow, coolant.t_in, fouling["shell"], fouling["tube"])
    try:
        shape = np.broadcast_shapes(*(np.shape(a) for a in arrays))
    except ValueError:
        raise InputError("service", f"arrays of shapes {[np.shape(a) for a in arrays]}",
                         "arrays that broadcast together (numpy rules)") from None
    n = int(np.prod(shape, dtype=int))

    def flat(v):
        return np.array(np.broadcast_to(np.asarray(v, dtype=float), shape), dtype=float).reshape(n)

    m_h = flat(stream.flow) / n_par  # condensing stream, one parallel unit [kg/s]
    if air:
        p_air = air_corr.pressure_at_altitude(service.altitude)
        tc_in = flat(service.air_in)
        if service.air_flow is not None:
            m_c = flat(service.air_flow) / n_par
        else:
            rho_in = p_air / (air_corr.R_AIR * tc_in)
            m_c = flat(service.face_velocity) * rho_in * exchanger.face_area
        c_fluid = None
    else:
        tc_in = flat(coolant.t_in)
        m_c = flat(coolant.flow) / n_par
        c_fluid = coolant.fluid
    rf = {s: flat(v) for s, v in fouling.items()}
    rf_outer, rf_inner = rf[model.sides[0]], rf[model.sides[1]]
    t_h_in = float(stream.t_in)
    x_in = stream.quality
    if not air:
        bad = (tc_in < c_fluid.t_min) | (tc_in >= c_fluid.t_max)
        if np.any(bad):
            raise InputError(f"service.{k_side}.t_in", float(tc_in[bad][0]),
                             f"within the coolant's liquid range {c_fluid.t_min:.1f}..{c_fluid.t_max:.1f} K")
    hot = tc_in < t_h_in
    if shape == () and not hot[0]:
        raise InputError(f"service.{k_side}.t_in", float(tc_in[0]), f"below the condensing stream's inlet "
                         f"{t_h_in:.2f} K (a coolant)")
    tc_low = float(np.min(tc_in))
    try:
        path = _path(curve, t_h_in, x_in, max(tc_low, float(curve.liquid.t_min)))
    except InputError as exc:
        raise exc.with_prefix(f"service.{c_side}") from None
    s1, s2 = path.bounds

    # geometry of the condensing path
    d_o, d_i = float(bundle.d_o), float(bundle.d_i)
    tube_cond = c_side != model.sides[0]  # condensing inside the tubes
    n_tpp = float(bundle.tubes_per_pass)
    flow_area_tube = n_tpp * np.pi * d_i ** 2 / 4.0
    path_length = float(bundle.passes) * float(bundle.length)
    area_per_length = area_unit / path_length  # m² of the basis per m of path
    rows = float(bundle.rows_vertical)
    p_red = float(curve.pressure) / float(curve.critical_pressure)
    if tube_cond and not 0.0 < p_red < 1.0:
        raise InputError(f"service.{c_side}.fluid.critical_pressure", curve.critical_pressure,
                         "the critical (or pseudo-critical) pressure of the condensing fluid, above its pressure "
                         "(Shah's in-tube correlation needs the reduced pressure): "
                         "condensing_curve(critical_pressure=)")
    latent = float(curve.latent)
    i_c = _layer_index(model, c_side)
    warnings: list[str] = []

    def coolant_props(T):
        if air:
            return air_corr.air_properties(T, pressure=p_air)
        return c_fluid.props(np.clip(T, c_fluid.t_min, c_fluid.t_max - 1e-6 * c_fluid.t_max))

    # the coolant's heat capacity rate, per case (at the mean of inlet and outlet; updated in the search)
    cp_c = np.asarray(coolant_props(tc_in).heat_capacity, dtype=float) * np.ones(n)
    # the limits of the path: down to the coolant inlet; the coolant up to the condensing inlet (or its boiling)
    s_cold = np.minimum(path.s_at_T(np.maximum(tc_in, path.t_floor)), path.s[-1])
    t_c_cap = t_h_in if air else min(t_h_in, c_fluid.t_max * (1 - 1e-6))
    s_max = np.where(hot, s_cold, 0.0)
    if not air:
        s_max = np.minimum(s_max, m_c * cp_c * np.maximum(t_c_cap - tc_in, 0.0) / m_h)

    k = increments
    frac = np.arange(k + 1) / k
    arr_name, arr_units = (None, 1) if air else tuple(getattr(model, "arrangement", ("counterflow", 1)))
    pass_corrected = arr_name == "E"  # 1-2N shells (TEMA E with even tube passes; F shells with 4+ passes)
    q_in = _q_in(curve, x_in)

    def evaluate(s_out, dtsat, cp_c, detail=False):
        """Area one unit needs to release ``s_out`` per kg (per case), with the saturation-drop profile."""
        starts = np.array([0.0, s1, s2])
        ends = np.array([s1, s2, np.inf])
        a = np.minimum(starts[None, :], s_out[:, None])
        b = np.minimum(ends[None, :], s_out[:, None])
        nodes = a[:, :, None] + (b - a)[:, :, None] * frac  # (n, 3, k+1)
        drop = dtsat(nodes)
        Th = path.T_at(nodes) - drop
        # heat released per kg to each node: along the curve, plus the sensible cooling of both phases as the
        # saturation temperature falls with the pressure (liquid: its cp; vapour: its cp along the curve, as an
        # ideal gas whose enthalpy depends on temperature only)
        x_n = path.x_at(nodes)
        cpl_n = np.asarray(curve.liquid.props(np.clip(Th, curve.liquid.t_min, curve.liquid.t_max * (1 - 1e-9)))
                           .heat_capacity, dtype=float)
        cpv_n = np.asarray(curve.saturation(np.clip(nodes - s1 + q_in, 0.0, latent)).vapour.heat_capacity,
                           dtype=float)
        E = nodes + ((1.0 - x_n) * cpl_n + x_n * cpv_n) * drop
        E_out = E[:, 2, -1]  # the last node is s_out (the zones past it collapse onto it)
        if air:
            Tc = np.broadcast_to(tc_in[:, None, None], nodes.shape)
        else:
            Tc = tc_in[:, None, None] + (m_h / (m_c * cp_c))[:, None, None] * (E_out[:, None, None] - E)
        ds = E[..., 1:] - E[..., :-1]
        s_mid = 0.5 * (nodes[..., 1:] + nodes[..., :-1])
        Th_m, Tc_m = 0.5 * (Th[..., 1:] + Th[..., :-1]), 0.5 * (Tc[..., 1:] + Tc[..., :-1])
        shp = s_mid.shape
        N = s_mid.size

        def per_case(v):
            return np.broadcast_to(np.asarray(v, dtype=float)[:, None, None], shp).reshape(N)

        z = np.broadcast_to(np.arange(3)[None, :, None], shp).reshape(N)
        mh, mc, ro, ri = per_case(m_h), per_case(m_c), per_case(rf_outer), per_case(rf_inner)
        xm, thm, tcm, sm = path.x_at(s_mid).reshape(N), Th_m.reshape(N), Tc_m.reshape(N), s_mid.reshape(N)
        ones = np.ones(N)
        # coolant film at its local temperature
        pc = coolant_props(tcm)
        fc = _model_film(model, k_side, mc, pc, detail)
        h_k = np.asarray(fc.h, dtype=float) * ones
        # condensing side: in the condensing zone the liquid and vapour in equilibrium along the curve; the
        # superheated vapour in the desuperheating zone, the subcooled condensate in the subcooling zone
        q_loc = np.clip(sm - s1 + q_in, 0.0, latent)
        sat = curve.saturation(q_loc)
        vap = curve.vapour
        pvs = vap.props(np.clip(thm, vap.t_min, vap.t_max))
        pls = curve.liquid.props(np.clip(thm, curve.liquid.t_min, curve.liquid.t_max * (1 - 1e-9)))
        pl = _pick(z == 1, sat.liquid, pls, ones)
        pv = _pick(z == 1, sat.vapour, pvs, ones)
        rho_l, mu_l, k_l, cp_l = pl.density, pl.viscosity, pl.conductivity, pl.heat_capacity
        rho_v, mu_v = pv.density, pv.viscosity
        # single-phase films of the condensing side: the vapour (desuperheating; Bell-Ghaly's h_g at the local
        # vapour flow) and the condensate (subcooling)
        m_v = np.maximum(mh * np.where(z == 0, 1.0, xm), 1e-9 * mh)
        fv = _model_film(model, c_side, m_v, pv, detail)
        fl = _model_film(model, c_side, mh, pl, detail)
        h_v = np.asarray(fv.h, dtype=float) * ones
        h_l = np.asarray(fl.h, dtype=float) * ones
        u_v = np.asarray(fv.velocity, dtype=float) * ones
        G = mh / flow_area_tube
        Z = np.asarray(curve.z_factor(np.clip(sm - s1 + q_in, 0.0, latent)), dtype=float) * ones
        dT_loc = np.maximum(thm - tcm, 1e-9)
        dtf = 0.5 * dT_loc  # film temperature difference of the condensing film, iterated
        for _ in range(8):
            if tube_cond and tube_condensation == "shah2009":
                h_f = cond.shah_2009(G, np.clip(xm, 0.0, 1.0), d_i, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, p_red)
            elif tube_cond:
                h_f = cond_tube(G, xm, d_i, rho_l, rho_v, mu_l, k_l, cp_l, latent, p_red, dtf)
            else:
                h_f = cond_shell(d_o, rows, rho_l, rho_v, mu_l, k_l, latent, dtf, u_v)
            h_f = np.asarray(h_f, dtype=float) * ones
            with np.errstate(divide="ignore"):
                h_eff = np.where(Z > 0, cond.bell_ghaly(h_f, h_v, Z), h_f)  # Silver (1947), Bell & Ghaly (1973)
            h_c = np.where(z == 1, h_eff, np.where(z == 0, h_v, h_l))
            h_outer, h_inner = (h_c, h_k) if i_c == 0 else (h_k, h_c)
            R = model.network(h_outer, h_inner, ro, ri, 0.5 * (thm + tcm))
            R = [np.asarray(r, dtype=float) * ones for r in R]
            Rt = sum(R)
            dtf_new = dT_loc * R[i_c] / Rt
            done = np.allclose(dtf_new, dtf, rtol=1e-5, atol=1e-9)
            dtf = dtf_new
            if done:
                break
        U = 1.0 / Rt
        dQ = mh * ds.reshape(N)
        if air:
            Ga = mc * np.asarray(pc.heat_capacity, dtype=float) / area_unit  # air capacity per m² of basis [W/m²K]
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                dA = dQ / ((thm - tcm) * Ga * -np.expm1(-U / Ga))
            dA = np.where(thm > tcm, dA, np.inf)
        else:
            lm = thermal.lmtd_kernel((Th[..., :-1] - Tc[..., :-1]).reshape(N),
                                     (Th[..., 1:] - Tc[..., 1:]).reshape(N))
            with np.errstate(divide="ignore", invalid="ignore"):
                dA = np.where(lm > 0, dQ / (U * lm), np.inf)
        dA = np.where(dQ > 0, dA, 0.0)
        F = np.ones(Th.shape[:2])
        if pass_corrected:  # each zone's area by the F factor of its terminal temperatures (1-2N, shells in series)
            F = zone_F(Th, Tc, arr_units)
            with np.errstate(divide="ignore"):
                dA = (dA.reshape(shp) / np.where(np.isfinite(F), F, 0.0)[:, :, None]).reshape(N)
            dA = np.where(dQ > 0, dA, 0.0)
        A = dA.reshape(shp).sum(axis=(1, 2))
        if not detail:
            return A
        warns = (tuple(f"coolant ({k_side} side) film: {w}" for w in fc.warnings)
                 + tuple(f"condensing film ({c_side} side): {w}" for w in _film_warnings(
                     tube_cond, (dQ > 0) & (z == 1), G, xm, d_i, d_o, rows, rho_l, rho_v, mu_l, k_l, cp_l, latent,
                     p_red, dtf, u_v, tube_condensation, mu_v))
                 + tuple(f"vapour film ({c_side} side): {w}" for w in _used_warnings(
                     model, c_side, m_v, pv, (dQ > 0) & ((z == 0) | ((z == 1) & (Z > 0)))))
                 + tuple(f"condensate film ({c_side} side, subcooling): {w}" for w in _used_warnings(
                     model, c_side, mh, pl, (dQ > 0) & (z == 2))))
        out = dict(A=A, E_out=E_out, Th=Th, Tc=Tc, x_nodes=path.x_at(nodes), nodes=nodes, thm=Th_m, tcm=Tc_m,
                   R=[r.reshape(shp) for r in R], warnings=warns)
        for key, v in (("dA", dA), ("dQ", dQ), ("U", U), ("x", xm), ("h_c", h_c), ("h_k", h_k), ("G", G),
                       ("rho_l", rho_l), ("rho_v", rho_v), ("mu_l", mu_l), ("mu_v", mu_v), ("k_l", k_l),
                       ("cp_l", cp_l), ("h_film", h_f), ("cp_v", pv.heat_capacity), ("k_v", pv.conductivity),
                       ("Z", Z), ("dtf", dtf), ("u_v", u_v)):
            out[key] = np.asarray(v).reshape(shp)
        out["F"] = F
        return out

    def solve(dtsat, cp_c, guess=None):
        """The heat released per kg at which the needed area equals the unit's area, per case: regula falsi with
        the Illinois modification on a bracket (bisection while an end needs infinite area, at a pinch), from a
        bracket around ``guess`` when it holds."""
        lo, hi = np.zeros(n), s_max.copy()
        f_lo = np.full(n, -area_unit)
        f_hi = evaluate(hi, dtsat, cp_c) - area_unit
        full = f_hi <= 0  # more area than the whole path needs: it ends at its limit
        if guess is not None:
            width = 0.02 * s_max
            g_lo, g_hi = np.maximum(guess - width, 0.0), np.minimum(guess + width, s_max)
            fl_, fh_ = evaluate(g_lo, dtsat, cp_c) - area_unit, evaluate(g_hi, dtsat, cp_c) - area_unit
            ok = (fl_ < 0) & (fh_ >= 0)
            lo, hi = np.where(ok, g_lo, lo), np.where(ok, g_hi, hi)
            f_lo, f_hi = np.where(ok, fl_, f_lo), np.where(ok, fh_, f_hi)
        side = np.zeros(n)
        tol = 1e-10 * area_unit
        for _ in range(_MAX_SEARCH):
            finite = np.isfinite(f_hi)
            with np.errstate(invalid="ignore", divide="ignore"):
                falsi = (lo * f_hi - hi * f_lo) / (f_hi - f_lo)
            mid = np.where(finite & (falsi > lo) & (falsi < hi), falsi, 0.5 * (lo + hi))
            f = evaluate(mid, dtsat, cp_c) - area_unit
            under = f < 0
            # Illinois: halve the function value kept at an end that is kept twice in a row
            f_hi = np.where(under & (side < 0), 0.5 * f_hi, f_hi)
            f_lo = np.where(~under & (side > 0), 0.5 * f_lo, f_lo)
            lo, f_lo = np.where(under, mid, lo), np.where(under, f, f_lo)
            hi, f_hi = np.where(under, hi, mid), np.where(under, f_hi, f)
            side = np.where(under, -1.0, 1.0)
            if np.all(full | (np.abs(f) < tol) | (hi - lo < 1e-12 * np.maximum(s_max, 1.0))):
                lo = np.where(np.abs(f) < tol, mid, lo)
                hi = np.where(np.abs(f) < tol, mid, hi)
                break
        return np.where(full, s_max, 0.5 * (lo + hi))

    def no_drop(s):
        return np.zeros(np.shape(s))

    dtsat, s_out, dt_drop = no_drop, None, np.zeros(n)
    for it in range(_OUTER):  # the coolant's heat capacity at the mean of its inlet and outlet; the saturation drop
        dt_before = dt_drop
        s_out = solve(dtsat, cp_c, s_out)
        if not air:
            t_c_out = tc_in + m_h * s_out / (m_c * cp_c)  # (the small pressure-drop term left out here)
            cp_c = np.asarray(coolant_props(0.5 * (tc_in + t_c_out)).heat_capacity, dtype=float) * np.ones(n)
        d = evaluate(s_out, dtsat, cp_c, detail=True)
        dp_total, dt_drop, dtsat = _drop_profile(d, n, tube_cond, area_per_length, bundle, model, c_side, curve,
                                                 m_h, s_out, s1, s2, t_h_in)
        if it >= 1 and np.all(~(np.abs(dt_drop - dt_before) > 0.2 * _SETTLED_K) | ~hot):
            break
    dt_used = dt_drop
    s_out = solve(dtsat, cp_c, s_out)
    d = evaluate(s_out, dtsat, cp_c, detail=True)
    dp_total, dt_drop, _ = _drop_profile(d, n, tube_cond, area_per_length, bundle, model, c_side, curve, m_h,
                                         s_out, s1, s2, t_h_in)
    unsettled = np.abs(dt_drop - dt_used) > _SETTLED_K
    if np.any(unsettled & hot):
        warnings.append(f"saturation-temperature feedback: in {int(np.sum(unsettled & hot))} case(s) the drop "
                        f"settled only to within {float(np.max(np.abs(dt_drop - dt_used)[hot])):.2g} K after "
                        f"{_OUTER} passes (a large pressure drop at low pressure)")
    choked = ~(dp_total < CHOKE_SHARE * float(curve.pressure))
    if np.any(choked & hot):
        warnings.append(f"condensing side: in {int(np.sum(choked & hot))} case(s) the pressure drop is more than "
                        f"{CHOKE_SHARE:.0%} of the inlet pressure {float(curve.pressure):.6g} Pa: the vapour flow is "
                        "near choking, beyond what this rating can follow; their results are NaN")
    return _result(exchanger, service, model, curve, path, d, s_out, m_h, m_c, tc_in, cp_c, n_par, shape, n,
                   c_side, k_side, dp_total, dt_drop, air, warnings, coolant_props, x_in, hot & ~choked)


# the column-pressure search, re-exported (it lives in rating_condenser_pressure.py and calls rate_condenser)
from .rating_condenser_pressure import CondensingPressure, condensing_pressure_for  # noqa: E402,F401
