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
saturation-temperature drop it causes is fed back into the curve (it matters at vacuum).

Flow arrangement (stated, screening level): in a shell-and-tube exchanger the coolant meets the increments in
counterflow (the coolant leaves where the vapour enters), the usual assumption of a zone analysis (Bell & Ghaly
1973; Serth & Lestina 2014, ch. 11). Where the condensing temperature is constant (a pure fluid) this is exact for
any arrangement; where it changes (desuperheating, subcooling, a mixture's glide) multi-pass coolant makes it
optimistic, and the rating says so. In an air cooler every increment meets air at the ambient temperature (air in
crossflow, unmixed across the bundle), which is exact for isothermal condensation with a uniform coefficient.

References
----------
Bell, K. J., Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial condensers.
*AIChE Symp. Ser.* 69(131):72-79.
Kern, D. Q. (1950). *Process Heat Transfer*, McGraw-Hill, ch. 12 (condensation of single vapours; the shell-side
pressure drop of a condensing vapour).
Serth, R. W., Lestina, T. G. (2014). *Process Heat Transfer: Principles and Applications*, 2nd ed., Academic Press,
ch. 11 (condensers: zone and incremental analysis).
Butterworth, D. (1983). Film condensation of pure vapor. *Heat Exchanger Design Handbook* §2.6.2, Hemisphere.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from . import thermal
from ._arrays import as_out
from .correlations import air as air_corr
from .correlations import condensation as cond
from .correlations import two_phase
from .errors import InputError
from .fluids.base import Props
from .rating_result import ResultFrames
from .service import Service, Stream

__all__ = ["CondenserRating", "ZONES", "condensing_pressure_for", "CondensingPressure", "is_condensing",
           "rate_condenser"]

#: The zones along a condensing stream's path, in order.
ZONES = ("desuperheating", "condensing", "subcooling")

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


# ------------------------------------------------------------------------------------------------------ the result
_FIELDS = {
    "duty": ("W", "heat duty"),
    "t_out_condensing": ("K", "condensing-stream outlet temperature"),
    "quality_out": ("-", "condensing-stream outlet vapour fraction"),
    "t_out_coolant": ("K", "coolant outlet temperature"),
    "U_service": ("W/m²K", "overall coefficient in service (area-weighted resistance)"),
    "U_clean": ("W/m²K", "overall coefficient clean (area-weighted resistance)"),
    "dp_condensing": ("Pa", "condensing-side pressure drop"),
    "dp_coolant": ("Pa", "coolant-side pressure drop"),
    "dt_sat_drop": ("K", "saturation-temperature drop caused by the condensing-side pressure drop"),
    "condensed": ("kg/s", "vapour condensed"),
}


@dataclass(frozen=True)
class CondenserRating(ResultFrames):
    """The result of rating a condenser. SI; arrays of the service's broadcast shape for sweeps.

    Attributes
    ----------
    duty : heat duty [W]
    condensing_side, coolant_side : the side names (``"shell"``/``"tube"``, or ``"tube"``/``"air"``)
    t_out_condensing, quality_out : outlet temperature [K] and vapour fraction [-] of the condensing stream (1.0
        while the outlet is still in the desuperheating zone, 0.0 once subcooled)
    t_out_coolant : coolant outlet temperature [K] (air: mixed outlet)
    t_out_shell, t_out_tube, t_out_air : the same outlets under the side names (None for a side the kind lacks)
    quality_out_shell, quality_out_tube : the outlet vapour fraction under the condensing side's name (None on the
        other side)
    U_service, U_clean : the reciprocal of the area-weighted mean total resistance, in service and clean [W/m²K] on
        the exchanger's area basis (the layers of :attr:`resistances` sum to ``1/U_service``)
    dp_condensing, dp_coolant : pressure drops [Pa] (also as ``dp_<side>``)
    dt_sat_drop : drop of the saturation temperature between inlet and outlet caused by the condensing-side pressure
        drop [K]
    condensed : vapour condensed [kg/s]
    area : the exchanger's area (the basis of U) [m²]
    zones : DataFrame, one row per zone (and case): ``case``, ``zone``, ``duty`` [W], ``area`` [m²] (whole exchanger),
        ``area_share`` [-], ``U`` [W/m²K] (area-weighted within the zone), ``t_in``/``t_out`` of the condensing
        stream and ``t_coolant_in``/``t_coolant_out`` [K], ``x_in``/``x_out`` [-], ``dp`` [Pa]
    increments : DataFrame, one row per increment: the local state (``x``, ``T``, ``T_coolant``, ``h_condensing``,
        ``h_coolant``, ``U``, ``dT``, ``duty`` and ``area`` (whole exchanger), ``length`` (along one tube path),
        ``dp``, ``G``, the phase properties) for checks and plots
    resistances : Series (one case) or DataFrame of the model's layers [m²K/W], area-weighted means
    layers : the layer names (from the exchanger's model)
    warnings : tuple of str, each film's prefixed with the film and side (in those, "cases" count the increments
        along the path where the film is used)
    exchanger, service : the inputs
    """

    duty: object
    t_out_condensing: object
    quality_out: object
    t_out_coolant: object
    U_service: object
    U_clean: object
    dp_condensing: object
    dp_coolant: object
    dt_sat_drop: object
    condensed: object
    area: float
    condensing_side: str
    coolant_side: str
    zones: object = field(repr=False)
    increments: object = field(repr=False)
    resistances: object = field(repr=False)
    layers: tuple = ()
    t_out_shell: object = None
    t_out_tube: object = None
    t_out_air: object = None
    quality_out_shell: object = None
    quality_out_tube: object = None
    dp_shell: object = None
    dp_tube: object = None
    dp_air: object = None
    warnings: tuple = ()
    exchanger: object = field(default=None, repr=False)
    service: object = field(default=None, repr=False)

    _FRAME_FIELDS = tuple(_FIELDS)


# ------------------------------------------------------------------------------------------------------ helpers
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


def rate_condenser(exchanger, service, increments: int = INCREMENTS, **methods) -> CondenserRating:
    """Rate a condenser zone by zone: duty, outlets, zones, pressure drops.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or revamp.AirCooler
    service : revamp.Service (one side vapour or two-phase, the other a single-phase coolant) or revamp.AirService
        (a vapour or two-phase tube stream). Coolant flow and inlet, condensing flow and fouling may be arrays (they
        broadcast); the condensing stream has one inlet temperature and quality.
    increments : int
        Increments per zone (default :data:`INCREMENTS`).
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
    The shell-side condensing pressure drop is Kern's (1950) rule, half the pressure drop of the inlet vapour at
    the whole flow (screening); inside tubes the two-phase frictional gradient of
    :mod:`revamp.correlations.two_phase` (its default method) is integrated along the path. The pressure drop
    lowers the saturation temperature along the path (pure fluid: exact at the outlet pressure; a curve shifted as
    :meth:`CondensingFluid.at_pressure` states), distributed along the path in proportion to the accumulated
    pressure drop, and the rating is repeated with it until the drop settles (at most eight passes; one still
    moving by more than 0.05 K between the last passes is reported in the warnings).

    References
    ----------
    Bell & Ghaly (1973); Kern (1950); Serth & Lestina (2014), ch. 11 (see the module).
    """
    from .exchanger import model_of

    increments = int(increments)
    if increments < 2:
        raise InputError("increments", increments, "an integer >= 2")
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
            if tube_cond:
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
        A = dA.reshape(shp).sum(axis=(1, 2))
        if not detail:
            return A
        warns = (tuple(f"coolant ({k_side} side) film: {w}" for w in fc.warnings)
                 + tuple(f"condensing film ({c_side} side): {w}" for w in _film_warnings(
                     tube_cond, (dQ > 0) & (z == 1), G, xm, d_i, d_o, rows, rho_l, rho_v, mu_l, k_l, cp_l, latent,
                     p_red, dtf, u_v))
                 + tuple(f"vapour film ({c_side} side): {w}" for w in _used_warnings(
                     model, c_side, m_v, pv, (dQ > 0) & ((z == 0) | ((z == 1) & (Z > 0)))))
                 + tuple(f"condensate film ({c_side} side, subcooling): {w}" for w in _used_warnings(
                     model, c_side, mh, pl, (dQ > 0) & (z == 2))))
        out = dict(A=A, E_out=E_out, Th=Th, Tc=Tc, x_nodes=path.x_at(nodes), nodes=nodes, thm=Th_m, tcm=Tc_m,
                   R=[r.reshape(shp) for r in R], warnings=warns)
        for key, v in (("dA", dA), ("dQ", dQ), ("U", U), ("x", xm), ("h_c", h_c), ("h_k", h_k), ("G", G),
                       ("rho_l", rho_l), ("rho_v", rho_v), ("mu_l", mu_l), ("mu_v", mu_v), ("k_l", k_l),
                       ("cp_l", cp_l), ("h_film", h_f),
                       ("Z", Z), ("dtf", dtf), ("u_v", u_v)):
            out[key] = np.asarray(v).reshape(shp)
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


def _drop_profile(d, n, tube_cond, area_per_length, bundle, model, c_side, curve, m_h, s_out, s1, s2, t_h_in):
    """The condensing side's pressure drop (stored per increment in ``d``), the saturation-temperature drop over
    the condensing zone and its profile along the path (a function of s, for the next pass)."""
    dp_inc, length = _condensing_dp(d, tube_cond, area_per_length, bundle, c_side, m_h)
    if tube_cond:
        dp_total = dp_inc.reshape(n, -1).sum(axis=1)
    else:  # Kern's rule for the shell side (see rate_condenser's Notes), spread in proportion to the area
        pv_in = curve.vapour.props(np.full(n, t_h_in))
        dp_total = 0.5 * np.asarray(model.film(c_side, m_h, pv_in).dp, dtype=float) * np.ones(n)
        dA = np.where(np.isfinite(d["dA"]), d["dA"], 0.0)
        tot = dA.reshape(n, -1).sum(axis=1)
        dp_inc = dp_total[:, None, None] * dA / np.where(tot > 0, tot, 1.0)[:, None, None]
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


def _film_warnings(tube_cond, used, G, x, d_i, d_o, rows, rho_l, rho_v, mu_l, k_l, cp_l, latent, p_red, dtf, u_v):
    """The condensing correlations' validity warnings over the condensing increments (the validating wrappers)."""
    if not np.any(used):
        return ()
    u = used
    if tube_cond:
        res = cond.tube_condensation(G[u], np.clip(x[u], 0.0, 1.0), d_i, rho_l[u], rho_v[u], mu_l[u], k_l[u],
                                     cp_l[u], latent, p_red, np.maximum(dtf[u], 1e-9))
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
    forms reduce to the single-phase gradients. On the shell side the lengths only (the caller applies Kern's rule).
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


def _zone_frames(d, n, shape, c_side, k_side):
    """The zones (one row per zone reached, per case) and the increments (one row per increment with duty)."""
    dA, dQ, U = d["dA"], d["dQ"], d["U"]
    Th, Tc = d["Th"], d["Tc"]
    case = np.broadcast_to(np.arange(n)[:, None, None], dA.shape)
    zone = np.broadcast_to(np.arange(3)[None, :, None], dA.shape)
    inc = pd.DataFrame({
        "case": case.ravel(), "zone": np.asarray(ZONES)[zone.ravel()], "x": d["x"].ravel(),
        "T": d["thm"].ravel(), "T_coolant": d["tcm"].ravel(), "h_condensing": d["h_c"].ravel(),
        "h_coolant": d["h_k"].ravel(), "h_film": np.where(zone.ravel() == 1, d["h_film"].ravel(), np.nan),
        "dT_film": np.where(zone.ravel() == 1, d["dtf"].ravel(), np.nan), "Z": d["Z"].ravel(),
        "u_vapour": d["u_v"].ravel(), "U": U.ravel(), "dT": (d["thm"] - d["tcm"]).ravel(), "duty": dQ.ravel(),
        "area": dA.ravel(), "length": d["length"].ravel(), "dp": d["dp"].ravel(), "G": d["G"].ravel(),
        "rho_l": d["rho_l"].ravel(), "rho_v": d["rho_v"].ravel(), "mu_l": d["mu_l"].ravel(),
        "mu_v": d["mu_v"].ravel(), "k_l": d["k_l"].ravel(), "cp_l": d["cp_l"].ravel()})
    inc = inc[inc["duty"] > 0].reset_index(drop=True)
    area_tot = dA.sum(axis=(1, 2))
    with np.errstate(invalid="ignore", divide="ignore"):
        rows = _zone_rows(dA, dQ, U, Th, Tc, d, n, area_tot)
    zones = pd.DataFrame(rows, columns=["case", "zone", "duty", "area", "area_share", "U", "t_in", "t_out",
                                        "t_coolant_in", "t_coolant_out", "x_in", "x_out", "dp"])
    return zones, inc


def _zone_rows(dA, dQ, U, Th, Tc, d, n, area_tot):
    rows = []
    x_nodes = d["x_nodes"]
    for i in range(n):
        for z, name in enumerate(ZONES):
            q = float(dQ[i, z].sum())
            if q <= 0:
                continue
            a = float(dA[i, z].sum())
            rows.append(dict(case=i, zone=name, duty=q, area=a, area_share=a / area_tot[i],
                             U=float((U[i, z] * dA[i, z]).sum() / a) if a > 0 else np.nan,
                             t_in=float(Th[i, z, 0]), t_out=float(Th[i, z, -1]), t_coolant_in=float(Tc[i, z, -1]),
                             t_coolant_out=float(Tc[i, z, 0]), x_in=float(x_nodes[i, z, 0]),
                             x_out=float(x_nodes[i, z, -1]), dp=float(d["dp"][i, z].sum())))
    return rows


def _result(exchanger, service, model, curve, path, d, s_out, m_h, m_c, tc_in, cp_c, n_par, shape, n, c_side,
            k_side, dp_total, dt_drop, air, warnings, coolant_props, x_in, hot):
    s1, s2 = path.bounds
    valid = hot
    q = m_h * d["E_out"]
    Th_out = d["Th"][:, 2, -1]  # the last node of the last zone reached is s_out (zones past it collapse there)
    x_out = path.x_at(s_out)
    if air:
        t_guess = tc_in + q / (m_c * np.asarray(coolant_props(tc_in).heat_capacity, dtype=float))
        cpa = np.asarray(coolant_props(0.5 * (tc_in + t_guess)).heat_capacity, dtype=float)
        tc_out = tc_in + q / (m_c * cpa)
    else:
        tc_out = tc_in + q / (m_c * cp_c)
    fk = model.film(k_side, m_c, coolant_props(0.5 * (tc_in + tc_out)))
    dp_k = np.asarray(fk.dp, dtype=float) * np.ones(n)
    x_in = 1.0 if x_in is None else x_in
    dA = d["dA"]
    A = dA.sum(axis=(1, 2))
    with np.errstate(divide="ignore", invalid="ignore"):
        R_mean = [np.where(A > 0, (r * dA).sum(axis=(1, 2)) / A, np.nan) for r in d["R"]]
    layers = tuple(model.layers)
    R_tot = sum(R_mean)
    R_clean = sum(r for r, name in zip(R_mean, layers) if "fouling" not in name)
    fields = dict(duty=q * n_par, t_out_condensing=Th_out, quality_out=x_out, t_out_coolant=tc_out,
                  U_service=1.0 / R_tot, U_clean=1.0 / R_clean, dp_condensing=dp_total, dp_coolant=dp_k,
                  dt_sat_drop=dt_drop, condensed=m_h * n_par * np.maximum(x_in - x_out, 0.0))
    for key, value in fields.items():
        value = np.where(valid | (key in ("duty", "condensed")), np.broadcast_to(value, (n,)), np.nan)
        fields[key] = as_out(value.reshape(shape))
    if shape == ():
        resistances = pd.Series([float(r[0]) for r in R_mean], index=pd.Index(layers), name="resistance [m²K/W]")
    else:
        resistances = pd.DataFrame({name: r for name, r in zip(layers, R_mean)})
    zones, inc = _zone_frames(d, n, shape, c_side, k_side)
    for frame in (zones, inc):  # the whole exchanger: every parallel unit alike
        frame["duty"] *= n_par
        frame["area"] *= n_par
    warnings = list(warnings) + list(d["warnings"])
    if not air and float(getattr(exchanger, "tube_passes", 1)) > 1 and (
            s1 > 0 or np.any(s_out > s2) or float(curve.t_dew) - float(curve.t_bubble) > 0.5):
        warnings.append("zones: the coolant is taken in counterflow with the condensing stream; with several tube "
                        "passes this is optimistic where the condensing temperature changes (desuperheating, "
                        "subcooling, a mixture's glide)")
    if not air and c_side == "shell" and np.any(s_out > s2):
        warnings.append("subcooling zone: the condensate is taken to flow over the bundle as a single-phase "
                        "liquid at the shell-side flow areas (no flooded zone modelled); screening only")
    if np.any(~valid):
        warnings.append(f"{int(np.sum(~valid))} case(s) without a result (NaN): a coolant not colder than the "
                        "condensing inlet, or a pressure drop near choking")
    warnings.append("screening-level rating: mechanical design, vibration, venting of non-condensables and code "
                    "compliance must be verified by licensed engineers")
    side_fields = {f"t_out_{c_side}": fields["t_out_condensing"], f"t_out_{k_side}": fields["t_out_coolant"],
                   f"quality_out_{c_side}": fields["quality_out"], f"dp_{c_side}": fields["dp_condensing"],
                   f"dp_{k_side}": fields["dp_coolant"]}
    return CondenserRating(**fields, area=float(model.area), condensing_side=c_side, coolant_side=k_side,
                           zones=zones, increments=inc, resistances=resistances, layers=layers,
                           warnings=tuple(dict.fromkeys(warnings)), exchanger=exchanger, service=service,
                           **side_fields)


# ------------------------------------------------------------------------------------------- column pressure
@dataclass(frozen=True)
class CondensingPressure:
    """The condensing pressure an exchanger can hold at a vapour load.

    Attributes
    ----------
    pressure : float
        The lowest condensing (inlet) pressure at which the whole load condenses [Pa].
    temperature : float
        The dew point at that pressure [K].
    vapour_load : float
        The vapour condensed [kg/s].
    rating : CondenserRating
        The rating at that pressure (its outlet at the bubble point).
    basis : str
        What was held and what was searched, for reports.
    """

    pressure: float
    temperature: float
    vapour_load: float
    rating: CondenserRating = field(repr=False)
    basis: str = ""


def condensing_pressure_for(exchanger, service, duty_or_vapour_load, *, increments: int = 8,
                            **methods) -> CondensingPressure:
    """The condensing pressure (and dew point) at which an exchanger just condenses a vapour load.

    The column-pressure question of a revamp: at a higher vapour load, how high must the condensing pressure rise so
    that the condenser still condenses everything? The condensing stream of ``service`` is moved to other
    pressures (:meth:`revamp.fluids.CondensingFluid.at_pressure`, keeping its inlet quality, or its superheat above
    the dew point for a vapour inlet) and rated (:func:`rate_condenser`) until its outlet sits at the bubble point:
    below that pressure vapour leaves uncondensed, above it the condensate is subcooled. Brent's root search on the
    logarithm of the pressure, between the pressure whose dew point is 1 K above the warmest coolant inlet and
    0.9 of the critical pressure (or ten times the given pressure for a curve without one).

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or revamp.AirCooler
    service : Service or AirService
        With one condensing stream; single case (no arrays). Its flow is replaced by the load.
    duty_or_vapour_load : float or str
        The vapour load [kg/s] (a number is a mass flow), or a string with units: a mass flow (``"12 kg/s"``) or a
        condensing duty (``"3.5 MW"``: the load is then that duty over the heat released from the inlet to the
        bubble point at each pressure).
    increments : int
        Increments per zone of each rating in the search (default 8; the final rating uses the same).
    **methods
        Passed to :func:`rate_condenser`.

    Returns
    -------
    CondensingPressure

    Raises
    ------
    InputError
        A load that is not a positive mass flow or duty, a service with arrays, or no pressure in the bracket at
        which the load just condenses (the field says which end failed).
    """
    from scipy.optimize import brentq

    from .units import to_si

    load_kind = "mass_flow"
    value = duty_or_vapour_load
    if isinstance(value, str):
        try:
            value = to_si(value, "mass_flow", "duty_or_vapour_load")
        except InputError:
            value = to_si(value, "power", "duty_or_vapour_load")
            load_kind = "power"
    value = np.asarray(value, dtype=float)
    if value.ndim != 0 or not np.isfinite(value) or value <= 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, "one positive vapour load [kg/s] or duty [W]")
    value = float(value)
    side = "tube" if not isinstance(service, Service) else ("shell" if service.shell.condensing else "tube")
    stream = getattr(service, side, None)
    if not isinstance(stream, Stream) or not stream.condensing:
        raise InputError("service", service, "a service with a vapour or two-phase stream")
    values = list(vars(service).values())
    values += [v for s in values if isinstance(s, Stream) for v in (s.flow, s.t_in)]
    if any(np.ndim(v) > 0 for v in values if isinstance(v, (np.ndarray, float, int))):
        raise InputError("service", "arrays", "a single case (no arrays) for the pressure search")
    curve = _curve_of(stream.fluid)
    superheat = None if stream.quality is not None else float(stream.t_in) - float(curve.t_dew)
    coolant_in = float(service.air_in) if side == "tube" and not isinstance(service, Service) else float(
        getattr(service, "shell" if side == "tube" else "tube").t_in)

    def stream_at(p):
        c = curve.at_pressure(p)
        if superheat is None:
            return c, Stream(c, 1.0, quality=stream.quality)
        return c, Stream(c, 1.0, t_in=float(c.t_dew) + superheat, phase="vapour")

    def load_at(c, s):
        if load_kind == "mass_flow":
            return value
        per_kg = float(c.latent) - _q_in(c, s.quality)
        if superheat:
            per_kg += float(c.superheat(float(s.t_in)))
        return value / per_kg

    def rated(p):
        c, s = stream_at(p)
        s = s.replace(flow=load_at(c, s))
        return rate_condenser(exchanger, service.replace(**{side: s}), increments=increments, **methods), c

    def residual(logp):
        r, c = rated(float(np.exp(logp)))
        if not np.isfinite(r.quality_out):  # near choking at this low pressure: it cannot pass the load
            return 1.0
        if r.quality_out > 0:
            return float(r.quality_out)  # vapour left: the pressure is too low
        return -(float(c.t_bubble) - float(r.t_out_condensing)) / float(c.t_bubble)  # subcooled: too high

    p0 = float(curve.pressure)
    t_low = coolant_in + 1.0

    def dew_minus(logp, target):
        return float(curve.temperature_at_pressure(float(np.exp(logp)))) - target

    p_crit = float(curve.critical_pressure)
    p_high = 0.9 * p_crit if np.isfinite(p_crit) else 10.0 * p0
    try:
        p_low = float(np.exp(brentq(dew_minus, np.log(p0 * 1e-3), np.log(p_high), args=(t_low,), xtol=1e-6)))
    except ValueError:
        raise InputError("service", f"coolant inlet {coolant_in:.2f} K", "a coolant colder than the dew point at "
                         "some pressure below 0.9 of the critical pressure") from None
    lo, hi = np.log(p_low), np.log(p_high)
    f_lo, f_hi = residual(lo), residual(hi)
    if f_lo <= 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, f"a load that does not condense fully already "
                         f"at {p_low:.6g} Pa (dew point 1 K above the coolant inlet): there the condensate leaves "
                         "subcooled, so the exchanger holds any pressure above that")
    if f_hi > 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, f"a load the exchanger can condense below "
                         f"{p_high:.6g} Pa (at that pressure vapour still leaves, quality {f_hi:.3g})")
    logp = brentq(residual, lo, hi, xtol=1e-5, rtol=1e-8)
    p = float(np.exp(logp))
    r, c = rated(p)
    basis = (f"lowest condensing pressure at which {'the vapour load' if load_kind == 'mass_flow' else 'the duty'} "
             "condenses fully, the coolant as given; inlet "
             f"{'quality held' if superheat is None else 'superheat held'}")
    return CondensingPressure(pressure=p, temperature=float(c.t_dew), vapour_load=float(r.condensed), rating=r,
                              basis=basis)
