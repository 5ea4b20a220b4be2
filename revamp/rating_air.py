"""Rating of an air-cooled exchanger: what an existing air cooler gives at a service (layer 5).

:func:`rate_air_cooler` (reached through :func:`revamp.rate`) finds the outlet temperatures by effectiveness-NTU
with properties at the mean temperature of each side, iterating until the outlets and the wall settle. The air
side, the network and the effectiveness come from the exchanger's model (:class:`revamp.exchanger.AirCoolerModel`):

1. tube side: :func:`revamp.correlations.tube.tube_side_kernel` (plain tubes or an insert), as for shell-and-tube;
2. air side: Briggs & Young (1963) film coefficient on the finned surface (ESDU 86022 as a choice), the fin
   efficiency of Kern & Kraus (1972) (Schmidt 1949 as a choice), Robinson & Briggs (1966) pressure drop (ESDU as a
   choice), air properties at the site's altitude (:mod:`revamp.correlations.air`);
3. the series network on the bare outside-tube area: air film (with the fin efficiency), air fouling (on the finned
   surface), fin bond, wall, tube fouling, tube film (:data:`AIR_LAYERS`);
4. the cross-flow effectiveness for the bundle's rows and passes (:mod:`revamp.thermal_air`);
5. fan shaft power from the air volume flow, the bundle pressure drop and the fan efficiency.

Every input may be an array (tube flow and inlet, ambient, air flow, fouling): the sweep runs in one call.

References
----------
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell (the resistance network of a
finned tube, fan power).
Serth, R. W., Lestina, T. G. (2014). *Process Heat Transfer: Principles and Applications*, 2nd ed., Academic Press,
ch. 12 (rating an air-cooled exchanger).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from . import thermal
from ._arrays import as_out
from .aircooler import FIN_BONDS, AirCooler
from .correlations import air as air_corr
from .correlations import tube as tube_corr
from .errors import InputError
from .exchanger import AirCoolerModel, model_of
from .rating_result import ResultFrames
from .service_air import AirService

__all__ = ["AIR_LAYERS", "AirRating", "air_side", "AirSideResult", "rate_air_cooler"]

#: The resistances in series of an air cooler, air to tube fluid, all on the bare outside-tube area.
AIR_LAYERS = AirCoolerModel.layers

_MAX_ITER = 80
_TOL_K = 1e-6

_FIELDS = {
    "duty": ("W", "heat duty"),
    "t_out_tube": ("K", "tube-side outlet temperature"),
    "t_out_air": ("K", "air outlet temperature (mixed)"),
    "effectiveness": ("-", "thermal effectiveness"),
    "NTU": ("-", "number of transfer units"),
    "F": ("-", "LMTD correction factor"),
    "lmtd": ("K", "log-mean temperature difference (counterflow terminals)"),
    "U_clean": ("W/m²K", "overall coefficient, clean, bare outside-tube area"),
    "U_service": ("W/m²K", "overall coefficient in service, bare outside-tube area"),
    "U_service_inside": ("W/m²K", "overall coefficient in service, tube inside area"),
    "h_air": ("W/m²K", "air film coefficient on the finned surface"),
    "h_air_bare": ("W/m²K", "air film coefficient with the clean fin efficiency, bare-tube basis"),
    "fin_efficiency": ("-", "fin efficiency of the clean fin (in service it is taken at the fouled coefficient)"),
    "h_tube": ("W/m²K", "tube-side film coefficient"),
    "dp_air": ("Pa", "air-side pressure drop over the bundle"),
    "dp_tube": ("Pa", "tube-side pressure drop"),
    "fan_power": ("W", "fan shaft power, all fans"),
    "air_flow": ("kg/s", "air mass flow, all bays"),
    "velocity_face": ("m/s", "air face velocity at the inlet density"),
    "velocity_tube": ("m/s", "tube-side velocity"),
    "Re_air": ("-", "air Reynolds number (root diameter, maximum velocity)"),
    "Re_tube": ("-", "tube-side Reynolds number"),
    "Pr_tube": ("-", "tube-side Prandtl number"),
    "t_wall_tube": ("K", "tube inner surface temperature"),
    "C_tube": ("W/K", "tube-side heat-capacity rate"),
    "C_air": ("W/K", "air heat-capacity rate"),
}


# ------------------------------------------------------------------------------------------------------ air side
@dataclass(frozen=True)
class AirSideResult:
    """The air side of one bundle at one state (arrays for sweeps).

    Attributes
    ----------
    h : film coefficient on the finned surface [W/m²K]
    h_bare : h (eta A_fin + A_root) / A_bare, on the bare outside-tube area [W/m²K]
    fin_efficiency : [-]
    surface_efficiency : (eta A_fin + A_root) / (A_fin + A_root) [-]
    dp : pressure drop over the bundle [Pa]
    Re, Pr : [-]
    G_max : mass velocity in the minimum flow area [kg/m²s]
    """

    h: object
    h_bare: object
    fin_efficiency: object
    surface_efficiency: object
    dp: object
    Re: object
    Pr: object
    G_max: object


def air_side(ac: AirCooler, m_bundle, rho, cp, mu, k, h_method="briggs-young", dp_method="robinson-briggs",
             fin_method="kern-kraus") -> AirSideResult:
    """The air side of one bundle: film coefficient, fin efficiency and pressure drop at given air properties.

    Parameters
    ----------
    ac : AirCooler
    m_bundle : float or array_like
        Air mass flow through one bundle [kg/s].
    rho, cp, mu, k : float or array_like
        Mean air density [kg/m³], heat capacity [J/kg/K], viscosity [Pa·s], conductivity [W/m/K].
    h_method, dp_method, fin_method : str
        Keys of :data:`revamp.correlations.air.AIR_H_METHODS`, ``AIR_DP_METHODS``, ``FIN_EFFICIENCY_METHODS``.

    Returns
    -------
    AirSideResult
    """
    fin = ac.fin
    m = np.asarray(m_bundle, dtype=float)
    G = m / ac.flow_area_min
    Re = G * ac.tube_od / mu
    Pr = cp * mu / k
    if h_method == "briggs-young":
        Nu = air_corr.nu_briggs_young(Re, Pr, fin.gap, fin.height, fin.thickness)
    else:
        Nu = air_corr.nu_esdu_high_fin(Re, Pr, fin.gap, fin.height, ac.transverse_pitch, ac.row_pitch, ac.tube_rows)
    h = np.asarray(Nu) * k / ac.tube_od
    eta = np.asarray(air_corr.FIN_EFFICIENCY_METHODS[fin_method](ac.tube_od, ac.fin_diameter, fin.thickness,
                                                                 fin.conductivity, h))
    a_fin, a_root, a_bare = ac.area_fin_per_tube, ac.area_root_per_tube, ac.area_bare_per_tube
    h_bare = h * (eta * a_fin + a_root) / a_bare
    eta_o = (eta * a_fin + a_root) / (a_fin + a_root)
    if dp_method == "robinson-briggs":
        dp = air_corr.dp_robinson_briggs(G, rho, Re, ac.tube_od, ac.transverse_pitch, ac.diagonal_pitch, ac.tube_rows)
    else:
        dp = air_corr.dp_esdu_high_fin(G, rho, Re, ac.area_ratio, ac.flow_area_min / ac.face_area, ac.tube_od,
                                       ac.transverse_pitch, ac.row_pitch, ac.tube_rows)
    return AirSideResult(h, h_bare, eta, eta_o, np.asarray(dp), Re, Pr, G)


# ------------------------------------------------------------------------------------------------------ the result
@dataclass(frozen=True)
class AirRating(ResultFrames):
    """The result of rating an air cooler. SI units; arrays of the service's broadcast shape for sweeps.

    Attributes
    ----------
    duty : heat duty [W]
    t_out_tube, t_out_air : outlet temperatures [K] (air: mixed outlet)
    effectiveness, NTU, F : [-]
    lmtd : counterflow log-mean temperature difference of the terminals [K]
    U_clean, U_service : overall coefficients on the bare outside-tube area [W/m²K]
    U_service_inside : in service, on the tube inside area [W/m²K]
    area, area_inside, area_air : bare outside-tube, tube inside and air-side (finned) areas, all bundles [m²]
    h_air : air film coefficient on the finned surface [W/m²K]; h_air_bare : with the fin efficiency, on the
        bare-tube basis [W/m²K]; fin_efficiency [-]
    h_tube : tube-side film coefficient on the inside surface [W/m²K]
    dp_air : air pressure drop over a bundle [Pa]; dp_tube : tube-side pressure drop [Pa]
    fan_power : shaft power of all fans [W]
    air_flow : air mass flow, all bays [kg/s]; velocity_face : face velocity at the inlet density [m/s]
    velocity_tube : [m/s]; Re_air, Re_tube, Pr_tube : [-]
    t_wall_tube : tube inner surface temperature [K]
    C_tube, C_air : heat-capacity rates of the whole streams [W/K]
    resistances : pandas Series (scalar) or DataFrame (one row per case) of :data:`AIR_LAYERS` on the bare
        outside-tube area [m²K/W], summing to ``1/U_service``
    tube_side : the tube-side correlation result
    warnings : tuple of str
    exchanger, service : the inputs
    """

    duty: object
    t_out_tube: object
    t_out_air: object
    effectiveness: object
    NTU: object
    F: object
    lmtd: object
    U_clean: object
    U_service: object
    U_service_inside: object
    h_air: object
    h_air_bare: object
    fin_efficiency: object
    h_tube: object
    dp_air: object
    dp_tube: object
    fan_power: object
    air_flow: object
    velocity_face: object
    velocity_tube: object
    Re_air: object
    Re_tube: object
    Pr_tube: object
    t_wall_tube: object
    C_tube: object
    C_air: object
    area: float
    area_inside: float
    area_air: float
    resistances: object
    tube_side: object = field(repr=False, default=None)
    warnings: tuple = ()
    exchanger: object = field(default=None, repr=False)
    service: object = field(default=None, repr=False)
    layers: tuple = AIR_LAYERS

    _FRAME_FIELDS = tuple(_FIELDS)
    _FRAME_AREAS = ("area", "area_inside", "area_air")


# ------------------------------------------------------------------------------------------------------ the engine
def _below(t_max):
    return t_max - 1e-6 * t_max if np.isfinite(t_max) else t_max


def rate_air_cooler(exchanger: AirCooler, service: AirService, h_method: str = "briggs-young",
                    dp_method: str = "robinson-briggs", fin_method: str = "kern-kraus", **condenser) -> AirRating:
    """Rate an existing air cooler at a service.

    Parameters
    ----------
    exchanger : revamp.AirCooler
    service : revamp.AirService
        Tube stream, ambient, air flow (or face velocity), altitude and fouling; arrays broadcast.
    h_method : {"briggs-young", "esdu"}
    dp_method : {"robinson-briggs", "esdu"}
    fin_method : {"kern-kraus", "schmidt"}
    **condenser
        For a vapour or two-phase tube stream only: the condenser engine's own settings (``increments``,
        ``tube_condensation``; see :func:`revamp.rating_condenser.rate_condenser`).

    Returns
    -------
    AirRating

    Raises
    ------
    InputError
        A service that is not an AirService, an unknown method, equal tube and air inlet temperatures in a single
        case, or a single case whose tube stream would leave its fluid's liquid range.

    Notes
    -----
    The tube and air flows divide evenly between the bundles (``bays x bundles_per_bay`` in parallel). Properties are
    taken at the mean temperature of each side; the tube-side wall viscosity at the wall temperature from the
    resistance split. The air fouling is on the finned surface and is referred to the bare area through the
    surface efficiency of the fins. The fan power is that of the whole air flow at the density at the fans (ambient
    for forced draft, the air outlet for induced draft).
    """
    ac = exchanger
    if not isinstance(ac, AirCooler):
        raise InputError("exchanger", ac, "a revamp.AirCooler")
    if not isinstance(service, AirService):
        raise InputError("service", service, "a revamp.AirService(tube=Stream(...), air_in=..., air_flow=...)")
    if service.tube.condensing:  # a vapour or two-phase tube stream: rated zone by zone
        from .rating_condenser import rate_condenser

        return rate_condenser(ac, service, h_method=h_method, dp_method=dp_method, fin_method=fin_method, **condenser)
    if condenser:
        name = sorted(condenser)[0]
        raise InputError(name, condenser[name], "left out: a condenser setting, for a vapour or two-phase tube stream "
                         "only (an air cooler takes h_method, dp_method and fin_method)")
    model = model_of(ac, h_method=h_method, dp_method=dp_method, fin_method=fin_method)  # checks the methods
    fluid = service.tube.fluid
    air_given = service.air_flow if service.air_flow is not None else service.face_velocity
    shapes = [np.shape(v) for v in (service.tube.flow, service.tube.t_in, service.air_in, air_given,
                                     service.fouling_tube, service.fouling_air)]
    try:
        shape = np.broadcast_shapes(*shapes)
    except ValueError:
        raise InputError("service", f"arrays of shapes {shapes}", "arrays that broadcast together (numpy rules): "
                         "tube flow, tube inlet, ambient, air flow, fouling") from None
    n = int(np.prod(shape, dtype=int))

    def flat(v):
        return np.array(np.broadcast_to(np.asarray(v, dtype=float), shape), dtype=float).reshape(n)

    nb = model.n_parallel
    p_air = air_corr.pressure_at_altitude(service.altitude)
    tt_in, ta_in = flat(service.tube.t_in), flat(service.air_in)
    rho_in = p_air / (air_corr.R_AIR * ta_in)
    if service.air_flow is not None:
        m_air = flat(service.air_flow)
    else:
        m_air = flat(service.face_velocity) * rho_in * ac.face_area * nb
    m_a, m_t = m_air / nb, flat(service.tube.flow) / nb  # one bundle [kg/s]
    rf_t, rf_a = flat(service.fouling_tube), flat(service.fouling_air)
    same = tt_in == ta_in
    if shape == () and same[0]:
        raise InputError("service.air_in", service.air_in, "different from the tube-side inlet temperature (equal "
                         "inlets give no driving force)")
    tube_hot = tt_in > ta_in
    sign = np.where(tube_hot, -1.0, 1.0)  # the tube stream loses heat when it is the hot one
    dt_in = np.abs(tt_in - ta_in)
    t_lo, t_hi = np.minimum(tt_in, ta_in), np.maximum(tt_in, ta_in)
    do, di = ac.tube_od, ac.tube_id
    area_bundle = model.area / nb
    rel_rough = ac.tube_roughness / di
    bond = ac.fin.contact_resistance
    f_lo, f_hi = fluid.t_min, _below(fluid.t_max)

    def evaluate(xt, xa, tw):
        tm_t, tm_a = 0.5 * (tt_in + xt), 0.5 * (ta_in + xa)
        pt = fluid.props(np.clip(np.concatenate((tm_t, tw)), f_lo, f_hi))
        rho_t, cp_t, mu_t, k_t = (np.broadcast_to(v, (2 * n,))[:n] for v in
                                  (pt.density, pt.heat_capacity, pt.viscosity, pt.conductivity))
        mu_w = np.broadcast_to(pt.viscosity, (2 * n,))[n:]
        tube = tube_corr.tube_side_kernel(m_t, float(ac.tubes_per_pass), di, ac.tube_length, ac.tube_passes, rho_t,
                                          cp_t, mu_t, k_t, mu_w, rel_rough, ac.insert, warn=False)
        pa = air_corr.air_properties(tm_a, pressure=p_air)
        air = model.air_side(m_a, pa)
        R = model.network(air.h, tube.h, rf_a, rf_t, tw)  # AIR_LAYERS, the fin efficiency at this air film
        U = 1.0 / sum(R)
        C_t, C_a = m_t * cp_t, m_a * np.asarray(pa.heat_capacity)
        tube_min = C_t <= C_a
        C_min = np.minimum(C_t, C_a)
        Cr = C_min / np.maximum(C_t, C_a)
        NTU = U * area_bundle / C_min
        eps, w = model.effectiveness(NTU, Cr, ~tube_min)
        q = eps * C_min * dt_in
        flux = U * (tm_t - tm_a)  # on the bare area, positive tube -> air
        return dict(to_t=tt_in + sign * q / C_t, to_a=ta_in - sign * q / C_a, tw=tm_t - flux * (R[5] + R[4]),
                    q=q, eps=eps, w=w, NTU=NTU, U=U, R=R, C_t=C_t, C_a=C_a, tube_min=tube_min, tube=tube, air=air,
                    rho_t=rho_t, mu_ratio=mu_t / mu_w, rho_a_out=p_air / (air_corr.R_AIR * xa))

    xt, xa = tt_in.copy(), ta_in.copy()
    tw = 0.5 * (tt_in + ta_in)
    converged = False
    for _ in range(_MAX_ITER):
        ev = evaluate(xt, xa, tw)
        nxt = np.clip(np.stack((ev["to_t"], ev["to_a"], ev["tw"])), t_lo, t_hi)
        step = np.max(np.abs(nxt[:2] - np.stack((xt, xa))), axis=0)
        xt, xa, tw = nxt
        if np.all(step < _TOL_K):
            converged = True
            break
    ev = evaluate(xt, xa, tw)
    to_t, to_a, q = ev["to_t"], ev["to_a"], ev["q"]
    residual = np.maximum(np.abs(to_t - xt), np.abs(to_a - xa))

    # ---- cases that leave the tube fluid's liquid range
    out = (np.minimum(tt_in, to_t) < fluid.t_min) | (np.maximum(tt_in, to_t) >= fluid.t_max)
    warnings = []
    if np.any(out):
        if shape == ():
            t_bad = float(to_t[0] if fluid.t_min <= tt_in[0] < fluid.t_max else tt_in[0])
            raise InputError("service.tube", f"{fluid.name} at {t_bad:.1f} K", f"within the fluid's single-phase "
                             f"range {fluid.t_min:.1f}..{fluid.t_max:.1f} K (the stream would boil or freeze: this "
                             "rating does not apply)")
        warnings.append(f"tube side: {int(np.sum(out))} case(s) would leave the single-phase range of {fluid.name} "
                        f"({fluid.t_min:.1f}..{fluid.t_max:.1f} K); their results are NaN")

    # ---- terminal differences, LMTD and F
    a1 = np.abs(tt_in - to_a)  # tube inlet against air outlet (counterflow terminals)
    b1 = np.abs(to_t - ta_in)
    lm = thermal.lmtd_kernel(a1, b1)
    with np.errstate(divide="ignore", invalid="ignore"):
        F = np.minimum(ev["eps"] * dt_in / ev["NTU"] / lm, 1.0)
    F = np.where(np.isfinite(F), F, np.nan)

    tube, air = ev["tube"], ev["air"]
    tube_warn = tube_corr.tube_side_warnings(tube.Re, tube.Pr, ev["mu_ratio"], ac.insert)
    warnings = tube_warn + air_corr.air_side_warnings(h_method, dp_method, air.Re, ac) + warnings
    warnings += [f"tube side: {w}" for w in fluid.check(np.concatenate((tt_in[~out], to_t[~out])))]
    if bond is None:
        warnings.append(f"fin bond: the contact resistance of {ac.fin.bond} fins is not known here and is taken as "
                        "zero; give Fin(bond_resistance=...) from the fin maker")
    bond_limit = FIN_BONDS[ac.fin.bond][1]
    if np.any(tt_in > bond_limit):
        warnings.append(f"fin bond: tube-side inlet up to {float(np.max(tt_in)) - 273.15:.0f} °C is above the "
                        f"{bond_limit - 273.15:.0f} °C usually allowed for {ac.fin.bond} fins (common practice, "
                        "no source): the bond may loosen")
    if not converged and np.any(residual[~out] > 0.05):
        warnings.append(f"property iteration: outlets settled only to within {float(np.max(residual[~out])):.2g} K")
    if np.any(same) and shape != ():
        warnings.append(f"{int(np.sum(same))} case(s) with equal inlet temperatures: no driving force, zero duty")

    R = ev["R"]
    U = ev["U"]
    R_clean = model.network(air.h, tube.h, 0.0, 0.0, ev["tw"])  # the fin efficiency of a clean fin
    U_clean = 1.0 / (R_clean[0] + R_clean[2] + R_clean[3] + R_clean[5])
    rho_fan = rho_in if ac.draft == "forced" else ev["rho_a_out"]
    volume = m_air / rho_fan
    power = air_corr.fan_power(volume, air.dp, ac.fan_efficiency, ac.fan_area, rho_fan)
    fields = dict(
        duty=q * nb, t_out_tube=to_t, t_out_air=to_a, effectiveness=ev["eps"], NTU=ev["NTU"], F=F, lmtd=lm,
        U_clean=U_clean, U_service=U, U_service_inside=U * do / di, h_air=air.h, h_air_bare=air.h_bare,
        fin_efficiency=air.fin_efficiency, h_tube=tube.h, dp_air=air.dp, dp_tube=tube.dp, fan_power=power,
        air_flow=m_air, velocity_face=m_air / (rho_in * ac.face_area * nb), velocity_tube=tube.velocity,
        Re_air=air.Re, Re_tube=tube.Re, Pr_tube=tube.Pr, t_wall_tube=ev["tw"], C_tube=ev["C_t"] * nb,
        C_air=ev["C_a"] * nb,
    )
    for key, value in fields.items():
        value = np.broadcast_to(np.asarray(value, dtype=float), (n,))
        value = np.where(out, np.nan, value)
        fields[key] = as_out(value.reshape(shape))
    cols = {name: np.where(out, np.nan, np.broadcast_to(v, (n,))) for name, v in zip(model.layers, R)}
    if shape == ():
        resistances = pd.Series({k: float(v[0]) for k, v in cols.items()}, name="resistance [m²K/W]")
    else:
        resistances = pd.DataFrame(cols)
    return AirRating(**fields, area=model.area, area_inside=model.area_inside, area_air=model.area_air,
                     resistances=resistances, tube_side=tube, warnings=tuple(dict.fromkeys(warnings)), exchanger=ac,
                     service=service, layers=model.layers)
