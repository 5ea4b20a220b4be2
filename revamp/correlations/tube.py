"""Tube-side (in-tube) heat transfer and pressure drop: plain tubes, with an optional insert.

All functions take floats, lists or numpy arrays (broadcast together) and return floats for scalar input and
arrays otherwise. Re and Pr are based on the tube inside diameter and the empty-tube mean velocity.

Choices made here (each cited at its function):

- turbulent Nu: Gnielinski (1976) with Petukhov (1970) smooth-tube friction;
- laminar Nu: Sieder & Tate (1936), not below 3.66 (default), or Hausen (1943), from :data:`LAMINAR_METHODS`;
- transition 2300 < Re < 1e4: Gnielinski (2013) linear blend of Nu_lam(2300) and Nu_turb(1e4);
- friction: 64/Re laminar, Swamee & Jain (1976) explicit Colebrook above Re = 4000, a linear blend between;
- viscosity-ratio correction: (mu/mu_w)^0.14 of Sieder & Tate (1936), both regimes;
- return losses: 4 velocity heads per pass (Kern 1950); nozzles: 1.5 velocity heads in and out (common practice).

References
----------
.. [1] Petukhov, B. S. (1970). Heat transfer and friction in turbulent pipe flow with variable physical
   properties. Advances in Heat Transfer 6, 503-564.
.. [2] Gnielinski, V. (1976). New equations for heat and mass transfer in turbulent pipe and channel flow.
   International Chemical Engineering 16(2), 359-368.
.. [3] Gnielinski, V. (2013). On heat transfer in tubes. Int. J. Heat Mass Transfer 63, 134-140.
.. [4] Sieder, E. N., Tate, G. E. (1936). Heat transfer and pressure drop of liquids in tubes.
   Ind. Eng. Chem. 28(12), 1429-1435.
.. [5] Hausen, H. (1943). Darstellung des Wärmeüberganges in Rohren durch verallgemeinerte Potenzbeziehungen.
   Z. VDI Beiheft Verfahrenstechnik 4, 91-98.
.. [6] Swamee, P. K., Jain, A. K. (1976). Explicit equations for pipe-flow problems.
   J. Hydraulics Division ASCE 102(HY5), 657-664.
.. [7] Kern, D. Q. (1950). Process Heat Transfer. McGraw-Hill, ch. 7: return loss 4 velocity heads
   per pass.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from ..errors import InputError
from ..units import require, to_si
from ._validity import range_warning

__all__ = [
    "LAMINAR_METHODS",
    "RE_FRICTION_TURBULENT",
    "RE_LAMINAR",
    "RE_TURBULENT",
    "TubeSideResult",
    "friction_darcy",
    "friction_petukhov",
    "nu_gnielinski",
    "nu_hausen",
    "nu_laminar",
    "nu_sieder_tate",
    "nu_tube",
    "prandtl_correction",
    "tube_side",
    "tube_side_kernel",
    "tube_side_warnings",
    "viscosity_correction",
]

RE_LAMINAR = 2300.0  #: upper end of laminar flow [-]
RE_TURBULENT = 1.0e4  #: lower end of fully turbulent flow for heat transfer (Gnielinski 2013) [-]
RE_FRICTION_TURBULENT = 4000.0  #: lower end of the turbulent friction law [-]


# ----------------------------------------------------------------------------------------------------- friction
def friction_petukhov(Re):
    """Darcy friction factor of a smooth tube, Petukhov (1970): f = (0.790 ln Re - 1.64)^-2.

    Parameters
    ----------
    Re : float or array_like
        Reynolds number [-]; stated range 3000 < Re < 5e6.

    Returns
    -------
    float or numpy.ndarray
        Darcy friction factor [-].

    References
    ----------
    Petukhov, B. S. (1970). Advances in Heat Transfer 6, 503-564.

    Examples
    --------
    >>> round(friction_petukhov(1e5), 5)
    0.01799
    """
    Re = _arr(Re)
    return _out((0.790 * np.log(Re) - 1.64) ** -2)


def _swamee_jain(Re, rel_roughness):
    return 0.25 / np.log10(rel_roughness / 3.7 + 5.74 / Re**0.9) ** 2


def friction_darcy(Re, rel_roughness=0.0):
    """Darcy friction factor for laminar, transitional and turbulent flow in a round tube.

    Laminar (Re <= 2300): 64/Re. Turbulent (Re >= 4000): Swamee & Jain (1976), an explicit approximation of the
    Colebrook equation: within 3 % of it for 5000 < Re < 1e8 and 1e-6 < e/d < 1e-2, the largest gaps at low Re on
    rough tubes (2.8 % high at Re = 5000, e/d = 0.01; 1.2 % at Re = 5000 on a smooth tube; within 1 % above about
    Re = 2e4 for e/d <= 1e-3: checked against ``fluids.friction.Colebrook``). Between 2300 and 4000:
    linear interpolation in Re between 64/2300 and the turbulent value at Re = 4000 (common practice, no source;
    the flow is unstable there and any value is uncertain).

    Parameters
    ----------
    Re : float or array_like
        Reynolds number [-], > 0.
    rel_roughness : float or array_like
        Relative roughness e/d [-], >= 0.

    Returns
    -------
    float or numpy.ndarray
        Darcy friction factor [-].

    References
    ----------
    Swamee, P. K., Jain, A. K. (1976). Explicit equations for pipe-flow problems. J. Hydraulics Division ASCE
    102(HY5), 657-664.

    Examples
    --------
    >>> round(friction_darcy(1000.0), 4)
    0.064
    """
    Re = _arr(Re)
    eps = _arr(rel_roughness)
    f_lam = 64.0 / Re
    f_turb = _swamee_jain(np.maximum(Re, RE_FRICTION_TURBULENT), eps)
    f_lam_end = 64.0 / RE_LAMINAR
    f_turb_start = _swamee_jain(RE_FRICTION_TURBULENT, eps)
    g = np.clip((Re - RE_LAMINAR) / (RE_FRICTION_TURBULENT - RE_LAMINAR), 0.0, 1.0)
    f_mid = (1.0 - g) * f_lam_end + g * f_turb_start
    f = np.where(Re <= RE_LAMINAR, f_lam, np.where(Re >= RE_FRICTION_TURBULENT, f_turb, f_mid))
    return _out(f)


# ------------------------------------------------------------------------------------------------- heat transfer
def nu_gnielinski(Re, Pr, f=None, d_over_L=None):
    """Nusselt number in turbulent tube flow, Gnielinski (1976).

    Nu = (f/8)(Re - 1000) Pr / (1 + 12.7 (f/8)^0.5 (Pr^(2/3) - 1)), times [1 + (d/L)^(2/3)] for the entrance when
    ``d_over_L`` is given.

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds and Prandtl numbers [-]; stated range 3000 < Re < 5e6, 0.5 < Pr < 2000.
    f : float or array_like, optional
        Darcy friction factor [-]; default Petukhov (1970) smooth-tube friction.
    d_over_L : float or array_like, optional
        Inside diameter over heated length [-]; None for no entrance correction.

    Returns
    -------
    float or numpy.ndarray
        Nusselt number based on the inside diameter [-].

    References
    ----------
    Gnielinski, V. (1976). Int. Chem. Eng. 16(2), 359-368. Entrance factor: Gnielinski (2013), IJHMT 63, 134.
    """
    Re = _arr(Re)
    Pr = _arr(Pr)
    f = friction_petukhov(Re) if f is None else f
    f8 = _arr(f) / 8.0
    nu = f8 * (Re - 1000.0) * Pr / (1.0 + 12.7 * np.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0))
    if d_over_L is not None:
        nu = nu * (1.0 + _arr(d_over_L) ** (2.0 / 3.0))
    return _out(nu)


def nu_sieder_tate(Re, Pr, d_over_L):
    """Laminar mean Nusselt number, Sieder & Tate (1936): Nu = 1.86 (Re Pr d/L)^(1/3), not below 3.66.

    The viscosity-ratio factor is applied separately (:func:`viscosity_correction`). The floor 3.66 is the fully
    developed value at constant wall temperature (common practice to avoid the correlation's low-Gz failure).

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds and Prandtl numbers [-]; Sieder & Tate tested 0.48 < Pr < 16700.
    d_over_L : float or array_like
        Inside diameter over tube length [-].

    Returns
    -------
    float or numpy.ndarray
        Mean Nusselt number [-].

    References
    ----------
    Sieder, E. N., Tate, G. E. (1936). Ind. Eng. Chem. 28(12), 1429-1435.
    """
    gz = _arr(Re) * _arr(Pr) * _arr(d_over_L)
    return _out(np.maximum(1.86 * np.cbrt(gz), 3.66))


def nu_hausen(Re, Pr, d_over_L):
    """Laminar mean Nusselt number with a developing thermal layer, Hausen (1943).

    Nu = 3.66 + 0.0668 Gz / (1 + 0.04 Gz^(2/3)), Gz = Re Pr d/L (constant wall temperature, developed velocity).

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds and Prandtl numbers [-].
    d_over_L : float or array_like
        Inside diameter over tube length [-].

    Returns
    -------
    float or numpy.ndarray
        Mean Nusselt number [-].

    References
    ----------
    Hausen, H. (1943). Z. VDI Beiheft Verfahrenstechnik 4, 91-98.
    """
    gz = _arr(Re) * _arr(Pr) * _arr(d_over_L)
    return _out(3.66 + 0.0668 * gz / (1.0 + 0.04 * gz ** (2.0 / 3.0)))


#: laminar methods by name; "sieder-tate" is the default (the trade's usual choice for process exchangers)
LAMINAR_METHODS = {"sieder-tate": nu_sieder_tate, "hausen": nu_hausen}


def nu_laminar(Re, Pr, d_over_L, method="sieder-tate"):
    """Laminar mean Nusselt number by ``method`` (a key of :data:`LAMINAR_METHODS`; default Sieder-Tate).

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds and Prandtl numbers [-].
    d_over_L : float or array_like
        Inside diameter over tube length [-].
    method : str
        "sieder-tate" (default) or "hausen".

    Returns
    -------
    float or numpy.ndarray
        Mean Nusselt number [-], >= 3.66.
    """
    try:
        fn = LAMINAR_METHODS[method]
    except (KeyError, TypeError):
        raise InputError("laminar method", method, f"one of {sorted(LAMINAR_METHODS)}") from None
    return fn(Re, Pr, d_over_L)


def nu_tube(Re, Pr, d_over_L, laminar="sieder-tate"):
    """Nusselt number for all regimes in a plain tube.

    Re <= 2300: :func:`nu_laminar`. Re >= 1e4: :func:`nu_gnielinski` with the entrance factor [1 + (d/L)^(2/3)].
    Between: Gnielinski (2013) linear blend Nu = (1 - g) Nu_lam(2300) + g Nu_turb(1e4), g = (Re - 2300)/(1e4 - 2300),
    which is continuous at both ends.

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds and Prandtl numbers [-].
    d_over_L : float or array_like
        Inside diameter over tube length [-].
    laminar : str
        The laminar method, a key of :data:`LAMINAR_METHODS`.

    Returns
    -------
    float or numpy.ndarray
        Mean Nusselt number [-] (without the viscosity-ratio factor).

    References
    ----------
    Gnielinski, V. (2013). On heat transfer in tubes. Int. J. Heat Mass Transfer 63, 134-140.
    """
    Re = _arr(Re)
    Pr = _arr(Pr)
    dl = _arr(d_over_L)
    nu_lam = _arr(nu_laminar(np.minimum(Re, RE_LAMINAR), Pr, dl, laminar))
    nu_turb = _arr(nu_gnielinski(np.maximum(Re, RE_TURBULENT), Pr, d_over_L=dl))
    g = np.clip((Re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR), 0.0, 1.0)
    nu_mid = (1.0 - g) * _arr(nu_laminar(RE_LAMINAR, Pr, dl, laminar)) + g * _arr(
        nu_gnielinski(RE_TURBULENT, Pr, d_over_L=dl))
    nu = np.where(Re <= RE_LAMINAR, nu_lam, np.where(Re >= RE_TURBULENT, nu_turb, nu_mid))
    return _out(nu)


def viscosity_correction(mu, mu_wall, exponent=0.14):
    """Property-ratio factor for liquids, (mu/mu_w)^0.14 (Sieder & Tate 1936), the default of :func:`tube_side`.

    Used for laminar and turbulent flow alike, as Sieder & Tate did.

    Parameters
    ----------
    mu, mu_wall : float or array_like
        Viscosity at the bulk and at the wall temperature [Pa·s].
    exponent : float
        0.14 (Sieder & Tate 1936).

    Returns
    -------
    float or numpy.ndarray
        Factor on Nu [-].
    """
    return _out((_arr(mu) / _arr(mu_wall)) ** exponent)


def prandtl_correction(Pr, Pr_wall):
    """Property-ratio factor for turbulent liquids, (Pr/Pr_w)^0.11 (Gnielinski 1976); an alternative, not the default.

    Parameters
    ----------
    Pr, Pr_wall : float or array_like
        Prandtl number at the bulk and at the wall temperature [-].

    Returns
    -------
    float or numpy.ndarray
        Factor on Nu [-].
    """
    return _out((_arr(Pr) / _arr(Pr_wall)) ** 0.11)


# ------------------------------------------------------------------------------------------------- tube side
@dataclass(frozen=True)
class TubeSideResult:
    """Tube-side film coefficient and pressure drop of one shell.

    Attributes
    ----------
    h : float or ndarray
        Film coefficient on the inside surface [W/m²K], with the viscosity-ratio factor when ``mu_wall`` was given.
    dp : float or ndarray
        Total tube-side pressure drop per shell [Pa] = dp_friction + dp_return + dp_nozzle.
    dp_friction : float or ndarray
        Friction over all passes [Pa].
    dp_return : float or ndarray
        Return losses, 4 velocity heads per pass [Pa].
    dp_nozzle : float or ndarray
        Inlet plus outlet nozzle, 1.5 velocity heads each [Pa]; 0 without a nozzle diameter.
    Re, Pr, Nu, f : float or ndarray
        Reynolds, Prandtl, Nusselt numbers and Darcy friction factor [-].
    velocity : float or ndarray
        Mean velocity in the (empty) tubes [m/s].
    warnings : list of str
        Validity-range warnings.
    """

    h: object
    dp: object
    dp_friction: object
    dp_return: object
    dp_nozzle: object
    Re: object
    Pr: object
    Nu: object
    f: object
    velocity: object
    warnings: list = field(default_factory=list)


def _positive(value, kind, name):
    v = to_si(value, kind, name)
    require(v, name, gt=0)
    return v


def tube_side(m_dot, n_tubes_per_pass, d_i, length, passes, rho, cp, mu, k, mu_wall=None, rel_roughness=0.0,
              insert=None, d_nozzle=None, rho_nozzle=None, laminar="sieder-tate"):
    """Film coefficient and pressure drop on the tube side of one shell.

    Parameters
    ----------
    m_dot : float, array_like or str
        Tube-side mass flow through one shell [kg/s].
    n_tubes_per_pass : int or array_like
        Tubes in one pass [-].
    d_i : float or str
        Tube inside diameter [m].
    length : float or str
        Tube length of one pass [m] (one pass = one tube length).
    passes : int
        Tube passes per shell [-].
    rho, cp, mu, k : float, array_like or str
        Bulk density [kg/m³], heat capacity [J/kg/K], viscosity [Pa·s], conductivity [W/m/K].
    mu_wall : float, array_like or str, optional
        Viscosity at the wall temperature [Pa·s]; applies (mu/mu_w)^0.14 to Nu and divides friction by it
        (Sieder & Tate 1936; Kern 1950).
    rel_roughness : float
        Relative roughness e/d [-] for the plain-tube friction factor.
    insert : insert model, optional
        An object of :mod:`revamp.correlations.inserts`; its ``nu`` and ``friction`` replace the plain-tube ones.
    d_nozzle : float or str, optional
        Tube-side nozzle inside diameter [m]; adds 1.5 velocity heads at the inlet and at the outlet
        (common practice, no source).
    rho_nozzle : float, optional
        Density for the nozzle velocity [kg/m³]; default ``rho``.
    laminar : str
        Laminar method for the plain tube, a key of :data:`LAMINAR_METHODS`.

    Returns
    -------
    TubeSideResult

    References
    ----------
    Kern, D. Q. (1950). Process Heat Transfer, McGraw-Hill, ch. 7 (tube-side pressure drop).

    Examples
    --------
    >>> r = tube_side(10.0, 100, 0.02, 5.0, 2, 1000.0, 4180.0, 1e-3, 0.6)
    >>> round(r.velocity, 3), round(r.Re)
    (0.318, 6366)
    """
    m_dot = _positive(m_dot, "mass_flow", "m_dot")
    n = _arr(n_tubes_per_pass)
    require(n, "n_tubes_per_pass", ge=1)
    d = _positive(d_i, "length", "d_i")
    L = _positive(length, "length", "length")
    if isinstance(passes, bool) or not np.all(np.equal(np.mod(passes, 1), 0)):
        raise InputError("passes", passes, "a whole number of tube passes >= 1")
    require(passes, "passes", ge=1)
    rho = _positive(rho, "density", "rho")
    cp = _positive(cp, "heat_capacity", "cp")
    mu = _positive(mu, "viscosity", "mu")
    k = _positive(k, "conductivity", "k")
    rr = to_si(rel_roughness, "dimensionless", "rel_roughness")
    require(rr, "rel_roughness", ge=0, lt=0.1)
    if mu_wall is not None:
        mu_wall = _positive(mu_wall, "viscosity", "mu_wall")
    if d_nozzle is not None:
        d_nozzle = _positive(d_nozzle, "length", "d_nozzle")
        if rho_nozzle is not None:
            rho_nozzle = _positive(rho_nozzle, "density", "rho_nozzle")
    if laminar not in LAMINAR_METHODS:
        raise InputError("laminar method", laminar, f"one of {sorted(LAMINAR_METHODS)}")
    res = tube_side_kernel(_arr(m_dot), n, _arr(d), _arr(L), passes, _arr(rho), _arr(cp), _arr(mu), _arr(k),
                           None if mu_wall is None else _arr(mu_wall), _arr(rr), insert,
                           None if d_nozzle is None else _arr(d_nozzle),
                           None if rho_nozzle is None else _arr(rho_nozzle), laminar)
    out = [_out(np.array(a)) for a in np.broadcast_arrays(res.h, res.dp, res.dp_friction, res.dp_return,
                                                         res.dp_nozzle, res.Re, res.Pr, res.Nu, res.f, res.velocity)]
    return TubeSideResult(*out, warnings=res.warnings)


def tube_side_warnings(Re, Pr, mu_ratio=None, insert=None) -> list[str]:
    """The validity-range warnings of a tube-side result: Gnielinski and Sieder-Tate ranges, transitional flow, the
    insert's own checks, and the viscosity ratio (``mu_ratio`` = μ/μ_wall, None when not applied)."""
    warns: list[str] = []
    if insert is None:
        Re_b, Pr_b = np.broadcast_arrays(Re, Pr)
        turb = Re_b >= RE_TURBULENT
        warns += range_warning("Gnielinski (1976)", "Re", Re_b[turb], 3000, 5e6, "Gnielinski (1976)")
        warns += range_warning("Gnielinski (1976)", "Pr", Pr_b[turb], 0.5, 2000, "Gnielinski (1976)")
        lam = Re_b <= RE_LAMINAR
        warns += range_warning("Sieder-Tate (1936)", "Pr", Pr_b[lam], 0.48, 16700, "Sieder & Tate (1936)")
        mid = ~lam & ~turb
        if np.any(mid):
            warns.append(f"tube side: transitional flow (2300 < Re < 1e4) in {int(np.sum(mid))} case(s): "
                         "Nu from the Gnielinski (2013) blend, uncertain to about +-20 %")
    else:
        warns += list(insert.check(Re, Pr))
    if mu_ratio is not None:
        warns += range_warning("Sieder-Tate (1936)", "mu/mu_wall", mu_ratio, 0.0044, 9.75, "Sieder & Tate (1936)")
    return warns


def _nu_tube_kernel(Re, Pr, dl, laminar):
    """:func:`nu_tube` on float arrays with one evaluation of each correlation: the laminar form at min(Re, 2300)
    and Gnielinski at max(Re, 1e4) are the blend's end values inside the transition and the values themselves
    outside it, where the weight is 0 or 1. Where every case lies on one side of the transition, only that side's
    correlation is evaluated (the blend's weights are then exactly 0 and 1: the same numbers)."""
    if isinstance(Re, np.ndarray) and Re.size:
        lo, hi = float(Re.min()), float(Re.max())
        if lo >= RE_TURBULENT:
            return nu_gnielinski(Re, Pr, d_over_L=dl)
        if hi <= RE_LAMINAR:
            return LAMINAR_METHODS[laminar](Re, Pr, dl)
    g = np.clip((Re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR), 0.0, 1.0)
    lam = LAMINAR_METHODS[laminar](np.minimum(Re, RE_LAMINAR), Pr, dl)
    turb = nu_gnielinski(np.maximum(Re, RE_TURBULENT), Pr, d_over_L=dl)
    return (1.0 - g) * lam + g * turb


def _friction_kernel(Re, rr):
    """:func:`friction_darcy` on float arrays, each law evaluated once (the same end-value argument)."""
    g = np.clip((Re - RE_LAMINAR) / (RE_FRICTION_TURBULENT - RE_LAMINAR), 0.0, 1.0)
    return (1.0 - g) * (64.0 / np.minimum(Re, RE_LAMINAR)) + g * _swamee_jain(np.maximum(Re, RE_FRICTION_TURBULENT),
                                                                               rr)


def tube_side_kernel(m_dot, n, d, L, passes, rho, cp, mu, k, mu_wall=None, rr=0.0, insert=None, d_nozzle=None,
                     rho_nozzle=None, laminar="sieder-tate", warn=True, h_only=False) -> TubeSideResult:
    """:func:`tube_side` without input checks or unit parsing: SI floats or float arrays in, arrays out.

    The rating loop's kernel (inputs checked once at the edge). ``warn=False`` skips the validity-range warnings
    (the loop asks for them only on its last evaluation). Fields are not broadcast to a common shape.
    ``h_only=True`` skips the friction factor and the pressure drops (None): what an iteration on the outlet
    temperatures needs.
    """
    area = n * np.pi * d ** 2 / 4.0
    v = m_dot / (rho * area)
    Re = rho * v * d / mu
    Pr = cp * mu / k
    dl = d / L
    if insert is None:
        Nu = _nu_tube_kernel(Re, Pr, dl, laminar)
        f = None if h_only else _friction_kernel(Re, rr)
    else:
        Nu = _arr(insert.nu(Re, Pr, dl))
        f = None if h_only else _arr(insert.friction(Re))
    if mu_wall is not None:
        phi = (mu / mu_wall) ** 0.14
        Nu = Nu * phi
        f = None if h_only else f / phi
    if h_only:
        return TubeSideResult(Nu * k / d, None, None, None, None, Re, Pr, Nu, None, v, warnings=[])
    warns = tube_side_warnings(Re, Pr, None if mu_wall is None else mu / mu_wall, insert) if warn else []
    h = Nu * k / d
    head = rho * v**2 / 2.0
    dp_f = f * (L * passes / d) * head
    dp_r = 4.0 * passes * head
    if d_nozzle is not None:
        rn = rho if rho_nozzle is None else rho_nozzle
        vn = m_dot / (rn * np.pi * d_nozzle ** 2 / 4.0)
        dp_n = 2.0 * 1.5 * rn * vn**2 / 2.0
    else:
        dp_n = np.zeros_like(head)
    dp = dp_f + dp_r + dp_n
    return TubeSideResult(h, dp, dp_f, dp_r, dp_n, Re, Pr, Nu, f, v, warnings=warns)


def tube_h_float(m_dot, n, d, L, rho, cp, mu, k, mu_wall, laminar="sieder-tate"):
    """The plain-tube film coefficient of :func:`tube_side_kernel` for one case, on Python floats [W/m²K].

    The single-case rating iterates on it; its result is then evaluated once more by the array kernel, so the two
    must agree (checked by the tests). Plain tubes only (an insert takes the array kernel).
    """
    Re = m_dot / (n * math.pi * d ** 2 / 4.0) * d / mu  # rho v d / mu with v = m / (rho A)
    Pr = cp * mu / k
    dl = d / L
    g = min(max((Re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR), 0.0), 1.0)
    gz = min(Re, RE_LAMINAR) * Pr * dl
    if laminar == "sieder-tate":
        lam = max(1.86 * math.cbrt(gz), 3.66)
    else:
        lam = 3.66 + 0.0668 * gz / (1.0 + 0.04 * gz ** (2.0 / 3.0))
    re_t = max(Re, RE_TURBULENT)
    f8 = (0.790 * math.log(re_t) - 1.64) ** -2 / 8.0
    turb = (f8 * (re_t - 1000.0) * Pr / (1.0 + 12.7 * math.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0))
            * (1.0 + dl ** (2.0 / 3.0)))
    return ((1.0 - g) * lam + g * turb) * (mu / mu_wall) ** 0.14 * k / d
