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

Every input may be an array (flows, inlet temperatures, fouling): the whole sweep runs in one call, with no Python
loop over cases. Numbers outside a correlation's published range come back with a warning in ``Rating.warnings``.

References
----------
Kays, W. M., London, A. L. (1984). *Compact Heat Exchangers*, 3rd ed., McGraw-Hill (effectiveness-NTU).
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. *Heat Exchanger Design Handbook* §3.3,
Hemisphere (Bell-Delaware).
Gnielinski, V. (1976). New equations for heat and mass transfer in turbulent pipe and channel flow.
*Int. Chem. Eng.* 16:359-368.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from . import thermal
from ._arrays import as_out
from .correlations import shell as shell_corr
from .correlations import tube as tube_corr
from .errors import InputError
from .resistance import TUBE_LAYERS, tube_network
from .service import Service, Stream

__all__ = ["rate", "Rating", "arrangement", "Stream", "Service", "SHELL_METHODS"]

#: Shell-side methods by name: the one registry, defined beside the correlations and dispatched here only.
SHELL_METHODS = shell_corr.SHELL_METHODS

_MAX_ITER = 40
_PLAIN_STEPS = 6  # substitution steps before the step starts to shrink
_TOL_K = 1e-6  # outlet temperature change at which the property iteration stops [K]
_SETTLED_K = 0.05  # a case whose outlets still move by more than this at the end is reported [K]


def arrangement(exchanger) -> tuple[str, int]:
    """The effectiveness-NTU arrangement of an exchanger: ``(name, shells in series)``.

    One tube pass runs in counterflow (the usual single-pass layout); two or more passes in a TEMA E shell use the
    1-2N relation; identical shells in series combine by the series formula.
    """
    if exchanger.tube_passes == 1:
        return "counterflow", 1  # N counterflow shells in series are one counterflow exchanger of the total NTU
    return "E", int(exchanger.shells)


# ------------------------------------------------------------------------------------------------------ the result
_SCALAR_FIELDS = {
    # name: (unit, description) -- used for to_frame() and the report tables
    "duty": ("W", "heat duty"),
    "t_out_shell": ("K", "shell-side outlet temperature"),
    "t_out_tube": ("K", "tube-side outlet temperature"),
    "effectiveness": ("-", "thermal effectiveness"),
    "NTU": ("-", "number of transfer units"),
    "F": ("-", "LMTD correction factor"),
    "lmtd": ("K", "log-mean temperature difference (counterflow terminals)"),
    "U_clean": ("W/m²K", "overall coefficient, clean, outside area"),
    "U_service": ("W/m²K", "overall coefficient in service, outside area"),
    "U_service_inside": ("W/m²K", "overall coefficient in service, inside area"),
    "h_shell": ("W/m²K", "shell-side film coefficient"),
    "h_tube": ("W/m²K", "tube-side film coefficient"),
    "dp_shell": ("Pa", "shell-side pressure drop"),
    "dp_tube": ("Pa", "tube-side pressure drop"),
    "velocity_tube": ("m/s", "tube-side velocity"),
    "velocity_shell": ("m/s", "shell-side crossflow velocity"),
    "Re_tube": ("-", "tube-side Reynolds number"),
    "Re_shell": ("-", "shell-side Reynolds number"),
    "Pr_tube": ("-", "tube-side Prandtl number"),
    "Pr_shell": ("-", "shell-side Prandtl number"),
    "t_wall_tube": ("K", "tube inner surface temperature"),
    "t_wall_shell": ("K", "tube outer surface temperature"),
    "shear_tube": ("Pa", "tube-side wall shear stress"),
    "rho_tube": ("kg/m³", "tube-side density at mean temperature"),
    "rho_shell": ("kg/m³", "shell-side density at mean temperature"),
    "C_shell": ("W/K", "shell-side heat-capacity rate"),
    "C_tube": ("W/K", "tube-side heat-capacity rate"),
}


@dataclass(frozen=True)
class Rating:
    """The result of :func:`rate`. SI units; arrays of the service's broadcast shape for sweeps.

    Attributes
    ----------
    duty : heat duty [W]
    t_out_shell, t_out_tube : outlet temperatures [K]
    effectiveness, NTU, F : [-]
    lmtd : counterflow log-mean temperature difference of the terminals [K]
    U_clean, U_service : overall coefficients on the outside area [W/m²K]
    U_service_inside : in service, on the inside area [W/m²K]
    area, area_inside : outside and inside heat-transfer areas, all shells [m²]
    h_shell, h_tube : film coefficients, each on its own surface [W/m²K]
    dp_shell, dp_tube : pressure drops over all shells in series [Pa]
    velocity_tube : tube-side velocity [m/s]; velocity_shell : crossflow velocity at the bundle centreline [m/s]
    Re_tube, Re_shell, Pr_tube, Pr_shell : [-]
    t_wall_tube, t_wall_shell : tube inner and outer surface temperatures [K]
    shear_tube : tube-side wall shear stress [Pa]
    rho_tube, rho_shell : densities at the mean temperatures [kg/m³]
    C_shell, C_tube : heat-capacity rates of the whole streams [W/K]
    resistances : pandas Series (scalar) or DataFrame (one row per case) of the five series resistances on the
        outside area [m²K/W], summing to ``1/U_service``
    tube_side, shell_side : the correlation results (details)
    warnings : tuple of str
    defaults : tuple of str, the geometry defaults applied (TEMA clearances ...)
    exchanger, service : the inputs
    """

    duty: object
    t_out_shell: object
    t_out_tube: object
    effectiveness: object
    NTU: object
    F: object
    lmtd: object
    U_clean: object
    U_service: object
    U_service_inside: object
    area: float
    area_inside: float
    h_shell: object
    h_tube: object
    dp_shell: object
    dp_tube: object
    velocity_tube: object
    velocity_shell: object
    Re_tube: object
    Re_shell: object
    Pr_tube: object
    Pr_shell: object
    t_wall_tube: object
    t_wall_shell: object
    shear_tube: object
    rho_tube: object
    rho_shell: object
    C_shell: object
    C_tube: object
    resistances: object
    tube_side: object = field(repr=False)
    shell_side: object = field(repr=False)
    warnings: tuple = ()
    defaults: tuple = ()
    exchanger: object = field(default=None, repr=False)
    service: object = field(default=None, repr=False)
    shell_method: str = "bell-delaware"

    @property
    def shape(self) -> tuple:
        """The broadcast shape of the cases (``()`` for a single case)."""
        return np.shape(self.duty)

    def breakdown(self) -> pd.DataFrame:
        """The resistances in series on the outside area: ``resistance`` [m²K/W] and ``share`` of the total.

        Scalar ratings only (for sweeps use :attr:`resistances`, one row per case).
        """
        if self.shape != ():
            raise InputError("rating", f"array of shape {self.shape}", "a single case for breakdown()")
        r = self.resistances
        return pd.DataFrame({"resistance": r, "share": r / r.sum()})

    def controlling_resistance(self):
        """Name of the largest resistance (scalar) or an array of names (sweeps)."""
        if self.shape == ():
            return str(self.resistances.idxmax())
        return self.resistances.idxmax(axis=1).to_numpy().reshape(self.shape)

    def to_frame(self) -> pd.DataFrame:
        """One row per case, every numeric field and the five resistances as columns (SI)."""
        cols = {}
        for name in _SCALAR_FIELDS:
            cols[name] = np.broadcast_to(getattr(self, name), self.shape).ravel()
        cols["area"] = np.full(int(np.prod(self.shape, dtype=int)), self.area)
        frame = pd.DataFrame(cols)
        res = self.resistances
        if isinstance(res, pd.Series):
            for name in TUBE_LAYERS:
                frame["R " + name] = res[name]
        else:
            for name in TUBE_LAYERS:
                frame["R " + name] = res[name].to_numpy()
        return frame

    def to_series(self) -> pd.Series:
        """A single case as a Series (SI)."""
        if self.shape != ():
            raise InputError("rating", f"array of shape {self.shape}", "a single case for to_series(); use to_frame()")
        return self.to_frame().iloc[0]


# --------------------------------------------------------------------------------------------------- the engine
def _below(t_max):
    """A temperature just below an upper limit (the limit itself when it is infinite)."""
    return t_max - 1e-6 * t_max if np.isfinite(t_max) else t_max


def _props(fluid, T):
    """Fluid properties at T, and a mask of the temperatures the fluid cannot take (clipped), or None."""
    T = np.asarray(T, dtype=float)
    try:
        return fluid.props(T), None
    except InputError:
        lo, hi = fluid.t_min, fluid.t_max
        return fluid.props(np.clip(T, lo, _below(hi))), (T < lo) | (T >= hi)


def _wall_props(fluid, T):
    """Viscosity at the wall, with the wall temperature clipped to the fluid's valid range.

    Returns the viscosity and which end was clipped: ``""``, ``"low"`` or ``"high"``.
    """
    hi = _below(fluid.t_max)
    Tc = np.clip(T, fluid.t_min, hi)
    which = "high" if np.any(T > hi) else ("low" if np.any(T < fluid.t_min) else "")
    return fluid.props(Tc).viscosity, which


def rate(exchanger, service: Service, shell_method: str = "bell-delaware") -> Rating:
    """Rate an existing shell-and-tube exchanger at a service.

    Parameters
    ----------
    exchanger : revamp.ShellAndTube
        The geometry as built.
    service : revamp.Service
        The two inlet streams and the fouling of each side; flows, inlet temperatures and fouling may be arrays
        (they broadcast).
    shell_method : {"bell-delaware", "kern"}
        Shell-side method; Kern (1950) is a simpler cross-check.

    Returns
    -------
    Rating
        Duty, outlets, coefficients, pressure drops, velocities and the resistance breakdown; see :class:`Rating`.

    Raises
    ------
    InputError
        On a bad input: equal inlet temperatures (no driving force), a service that is not a Service, an unknown
        method.

    Notes
    -----
    Identical shells in series (``exchanger.shells``) combine by the series effectiveness relation; identical trains in
    parallel (``exchanger.shells_parallel``) each take ``flow / shells_parallel`` of both streams.
    """
    if shell_method not in SHELL_METHODS:
        raise InputError("shell_method", shell_method, f"one of {sorted(SHELL_METHODS)}")
    if not isinstance(service, Service):
        raise InputError("service", service, "a revamp.Service(shell=Stream(...), tube=Stream(...))")
    shell_fn = SHELL_METHODS[shell_method]
    hx = exchanger
    s_fluid, t_fluid = service.shell.fluid, service.tube.fluid
    shape = np.broadcast_shapes(*(np.shape(v) for v in (
        service.shell.flow, service.shell.t_in, service.tube.flow, service.tube.t_in,
        service.fouling_shell, service.fouling_tube)))

    def full(v):
        return np.broadcast_to(np.asarray(v, dtype=float), shape)

    n_par = float(getattr(hx, "shells_parallel", 1))
    m_s = full(service.shell.flow) / n_par  # one parallel train [kg/s]
    m_t = full(service.tube.flow) / n_par
    ts_in, tt_in = full(service.shell.t_in), full(service.tube.t_in)
    rf_s, rf_t = full(service.fouling_shell), full(service.fouling_tube)
    if np.any(ts_in == tt_in):
        raise InputError("service.shell.t_in", service.shell.t_in,
                         "different from the tube-side inlet temperature (equal inlets give no driving force)")

    shell_hot = ts_in > tt_in
    sign = np.where(shell_hot, -1.0, 1.0)  # the shell stream loses heat when it is the hot one
    dt_in = np.abs(ts_in - tt_in)
    arr_name, n_series = arrangement(hx)
    do, di = hx.tube_od, hx.tube_id
    area_train = hx.area_outside / n_par
    geom = hx.bell()
    material = hx.tube_material
    insert = getattr(hx, "insert", None)
    rel_rough = getattr(hx, "tube_roughness", 0.0) / di

    # State of the iteration: the outlet temperatures the properties are taken at, and the wall temperatures.
    x_s, x_t = ts_in.copy(), tt_in.copy()  # first pass: properties at the inlets
    tw_s = tw_t = 0.5 * (ts_in + tt_in)  # first guess of the wall temperatures
    warn_wall = set()
    for it in range(_MAX_ITER):
        tm_s, tm_t = 0.5 * (ts_in + x_s), 0.5 * (tt_in + x_t)
        ps, bad_s = _props(s_fluid, tm_s)
        pt, bad_t = _props(t_fluid, tm_t)
        mu_ws, clipped = _wall_props(s_fluid, tw_s)
        if clipped:
            warn_wall.add(("shell", clipped))
        mu_wt, clipped = _wall_props(t_fluid, tw_t)
        if clipped:
            warn_wall.add(("tube", clipped))

        ts_res = tube_corr.tube_side(
            m_t, hx.tubes_per_pass, di, hx.tube_length, hx.tube_passes,
            pt.density, pt.heat_capacity, pt.viscosity, pt.conductivity,
            mu_wall=mu_wt, rel_roughness=rel_rough, insert=insert,
            d_nozzle=getattr(hx, "nozzle_tube", None), rho_nozzle=pt.density,
        )
        ss_res = shell_fn(geom, m_s, ps.density, ps.heat_capacity, ps.viscosity, ps.conductivity, mu_wall=mu_ws)
        h_s, h_t = ss_res.h, ts_res.h
        k_w = material.conductivity(0.5 * (tw_s + tw_t))
        net = tube_network(h_s, h_t, rf_s, rf_t, do, di, k_w, basis="outside")
        U = net.U
        C_s = m_s * ps.heat_capacity
        C_t = m_t * pt.heat_capacity
        C_min, C_max = np.minimum(C_s, C_t), np.maximum(C_s, C_t)
        Cr = C_min / C_max
        NTU = U * area_train / C_min
        eps = thermal.effectiveness(NTU, Cr, arr_name, n_series)
        q = eps * C_min * dt_in  # one train [W]
        to_s = ts_in + sign * q / C_s
        to_t = tt_in - sign * q / C_t
        # wall temperatures from the resistance split (flux on the outside area, positive shell -> tube)
        flux = U * (tm_s - tm_t)
        new_tw_s = tm_s - flux * net["shell film"]
        new_tw_t = tm_t + flux * net["tube film"]
        residual = np.maximum(np.abs(to_s - x_s), np.abs(to_t - x_t))  # [K]
        if it > 0 and np.max(residual) < _TOL_K:
            break
        # Plain substitution first; then a shrinking step, so that a case whose correlation jumps at a band edge
        # (no exact fixed point) settles at the edge instead of cycling.
        omega = 1.0 if it < _PLAIN_STEPS else 1.0 / (it - _PLAIN_STEPS + 2)
        x_s = x_s + omega * (to_s - x_s)
        x_t = x_t + omega * (to_t - x_t)
        tw_s = tw_s + omega * (new_tw_s - tw_s)
        tw_t = tw_t + omega * (new_tw_t - tw_t)
    unsettled = residual > _SETTLED_K

    warnings = [f"geometry: {note}" for note in getattr(hx, "notes", ())]
    warnings += list(ts_res.warnings) + list(ss_res.warnings)
    for side, fluid, temps in (("shell", s_fluid, (ts_in, to_s)), ("tube", t_fluid, (tt_in, to_t))):
        for T in temps:
            warnings += [f"{side} side: {w}" for w in fluid.check(T)]
    for side, end in sorted(warn_wall):
        fluid = s_fluid if side == "shell" else t_fluid
        warnings.append(f"{side} side: wall temperature outside the range of {fluid.name} "
                        f"({fluid.t_min:.1f}..{fluid.t_max:.1f} K); wall viscosity taken at the range limit"
                        + ("; local boiling or cracking at the wall is possible" if end == "high" else
                           "; freezing or waxing at the wall is possible"))
    invalid = None
    if np.any(unsettled):
        worst = float(np.max(residual))
        if shape == ():
            warnings.append(f"property iteration: outlet temperatures settled only to within {worst:.2g} K "
                            "(a correlation changes form near this flow)")
        else:
            warnings.append(f"property iteration: {int(np.sum(unsettled))} case(s) settled only to within "
                            f"{worst:.2g} K (a correlation changes form near these flows)")
    for side, bad, fluid in (("shell", bad_s, s_fluid), ("tube", bad_t, t_fluid)):
        if bad is not None and np.any(bad):
            if shape == ():
                raise InputError(f"service.{side}", f"{fluid.name} at mean {float(tm_s if side == 'shell' else tm_t):.1f} K",
                                 f"within the fluid's single-phase range {fluid.t_min:.1f}..{fluid.t_max:.1f} K "
                                 "(the stream would boil or freeze: this rating does not apply)")
            invalid = bad if invalid is None else (invalid | bad)
            warnings.append(f"{side} side: {int(np.sum(bad))} case(s) leave the single-phase range of {fluid.name}; "
                            "their results are NaN")

    # counterflow terminal differences: always positive for 0 < eps < 1
    t_hot_in = np.where(shell_hot, ts_in, tt_in)
    t_hot_out = np.where(shell_hot, to_s, to_t)
    t_cold_in = np.where(shell_hot, tt_in, ts_in)
    t_cold_out = np.where(shell_hot, to_t, to_s)
    dt1, dt2 = t_hot_in - t_cold_out, t_hot_out - t_cold_in
    lm = thermal.lmtd(dt1, dt2)
    F = q / (U * area_train * lm)

    U_clean = 1.0 / (net.total - net["shell fouling"] - net["tube fouling"])  # the same films and wall, no deposit
    res_cols = {name: np.broadcast_to(net[name], shape) for name in TUBE_LAYERS}
    shear = ts_res.f / 8.0 * pt.density * ts_res.velocity ** 2
    fields = dict(
        duty=q * n_par, t_out_shell=to_s, t_out_tube=to_t, effectiveness=eps, NTU=NTU, F=F, lmtd=lm,
        U_clean=U_clean, U_service=U, U_service_inside=U * do / di, h_shell=h_s, h_tube=h_t,
        dp_shell=ss_res.dp * hx.shells, dp_tube=ts_res.dp * hx.shells, velocity_tube=ts_res.velocity,
        velocity_shell=ss_res.velocity_crossflow, Re_tube=ts_res.Re, Re_shell=ss_res.Re, Pr_tube=ts_res.Pr,
        Pr_shell=ps.heat_capacity * ps.viscosity / ps.conductivity, t_wall_tube=tw_t, t_wall_shell=tw_s,
        shear_tube=shear, rho_tube=pt.density, rho_shell=ps.density, C_shell=C_s * n_par, C_tube=C_t * n_par,
    )
    for key, value in fields.items():
        value = np.broadcast_to(np.asarray(value, dtype=float), shape)
        if invalid is not None:
            value = np.where(invalid, np.nan, value)
        fields[key] = as_out(value)
    if shape == ():
        resistances = pd.Series({k: float(v) for k, v in res_cols.items()}, name="resistance [m²K/W]")
    else:
        resistances = pd.DataFrame({k: np.asarray(v).ravel() for k, v in res_cols.items()})
    return Rating(
        **fields, area=hx.area_outside, area_inside=hx.area_inside, resistances=resistances,
        tube_side=ts_res, shell_side=ss_res, warnings=tuple(dict.fromkeys(warnings)),
        defaults=tuple(getattr(hx, "defaults_used", ())), exchanger=hx, service=service, shell_method=shell_method,
    )
