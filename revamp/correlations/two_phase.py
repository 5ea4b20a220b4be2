"""Two-phase (gas-liquid) pressure drop in tubes and the saturation-temperature drop it causes.

Frictional pressure gradient [Pa/m] by three published methods (:data:`TWO_PHASE_METHODS`), unvalidated array
kernels on SI floats or arrays:

- ``"muller-steinhagen-heck"`` (the default): Müller-Steinhagen & Heck (1986). Chosen as default because it
  needs no surface tension (a user's condensing curve often has none), tends exactly to the liquid-only and the
  gas-only gradients at x = 0 and x = 1 (so zone boundaries join without a step), is explicit and smooth in x,
  and did best among the simple methods in Tribbe & Müller-Steinhagen's (2000) comparison with a large data
  bank (from memory);
- ``"friedel"``: Friedel (1979), the long-standing general recommendation for μl/μv < 1000 (Whalley 1980, from
  memory); needs the surface tension;
- ``"lockhart-martinelli"``: Lockhart & Martinelli (1949) in Chisholm's (1967) form φl² = 1 + C/X + 1/X² with
  C = 20, 12, 10, 5 for turbulent-turbulent, laminar liquid-turbulent gas, turbulent liquid-laminar gas and
  laminar-laminar flow (each phase laminar below Re = 2000 with its own flow), the friction factors of the
  original (64/Re laminar, 0.184 Re^-0.2 turbulent).

Friction factors of Friedel and Müller-Steinhagen & Heck: :func:`revamp.correlations.tube.friction_darcy`
(64/Re laminar, Swamee & Jain's explicit Colebrook turbulent, a blend between), so that a rough tube can be rated.

Across a tube bundle (a shell side in crossflow), :func:`dp_crossflow_bundle` applies Chisholm's (1967) form of
the Lockhart & Martinelli multiplier to the single-phase drops of the liquid and the vapour each flowing alone
through the same bundle (from the shell method), with C = 8 for crossflow over tube banks as Ishihara, Palen &
Taborek (1980) recommend (:data:`C_CROSSFLOW_BUNDLE`; value from memory, their paper not at hand). It reduces to the
liquid-only drop at x = 0 and the vapour-only drop at x = 1. Its stated range could not be checked against a public
source here: the result is a screening estimate (gravity and momentum terms not included).

Along a path, :func:`integrate_dp` integrates a gradient over the vapour fraction (x linear in length: uniform heat
flux along the path), and :func:`two_phase_dp` can add the momentum change (a pressure recovery as vapour
condenses and slows down; Zivi's void fraction; off by default, which is conservative). :func:`saturation_temperature_drop` turns a pressure drop into the drop of
the condensing temperature (CoolProp for a pure fluid, Clausius-Clapeyron along a curve), which matters at vacuum.

References
----------
.. [1] Lockhart, R. W., Martinelli, R. C. (1949). Proposed correlation of data for isothermal two-phase,
   two-component flow in pipes. Chem. Eng. Prog. 45(1), 39-48.
.. [2] Chisholm, D. (1967). A theoretical basis for the Lockhart-Martinelli correlation for two-phase flow.
   Int. J. Heat Mass Transfer 10, 1767-1778.
.. [3] Friedel, L. (1979). Improved friction pressure drop correlations for horizontal and vertical two-phase
   pipe flow. European Two-Phase Flow Group Meeting, Ispra, paper E2.
.. [4] Müller-Steinhagen, H., Heck, K. (1986). A simple friction pressure drop correlation for two-phase flow
   in pipes. Chem. Eng. Process. 20, 297-308.
.. [5] Tribbe, C., Müller-Steinhagen, H. M. (2000). An evaluation of the performance of phenomenological models
   for predicting pressure gradient during gas-liquid flow in horizontal pipelines. Int. J. Multiphase Flow
   26, 1019-1036.
.. [6] Whalley, P. B. (1980). Air-water two-phase flow in a horizontal pipe. HTFS report AERE-R9797 (the
   method recommendations, as cited by Hewitt, *Heat Exchanger Design Handbook*).
.. [7] Zivi, S. M. (1964). Estimation of steady-state steam void-fraction by means of the principle of minimum
   entropy production. J. Heat Transfer 86, 247-252.
.. [8] Ishihara, K., Palen, J. W., Taborek, J. (1980). Critical review of correlations for predicting two-phase
   flow pressure drop across tube banks. Heat Transfer Eng. 1(3), 23-32 (citation from memory).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from ..errors import InputError
from ..units import require, to_si
from ._validity import range_warning
from .condensation import G as _G
from .condensation import zivi_void_fraction
from .tube import friction_darcy

__all__ = [
    "C_CROSSFLOW_BUNDLE",
    "DEFAULT_METHOD",
    "RE_CHISHOLM",
    "TWO_PHASE_METHODS",
    "TwoPhaseDrop",
    "chisholm_c",
    "dp_crossflow_bundle",
    "dp_friedel",
    "dp_lockhart_martinelli",
    "dp_muller_steinhagen_heck",
    "frictional_gradient",
    "integrate_dp",
    "momentum_dp",
    "saturation_temperature_drop",
    "two_phase_dp",
]

RE_CHISHOLM = 2000.0  #: each phase laminar below this Reynolds number (its own flow alone) in Chisholm's C [-]


def _single(G, d, rho, mu, rel_roughness):
    """Frictional gradient [Pa/m] of mass flux G flowing alone as one phase (Darcy)."""
    re = np.maximum(G * d / mu, 1e-12)
    f = _arr(friction_darcy(re, rel_roughness))
    return f / d * G * G / (2.0 * rho)


def chisholm_c(re_l, re_v, re_c=RE_CHISHOLM):
    """Chisholm's (1967) C: 20 (both turbulent), 12 (liquid laminar, gas turbulent), 10 (liquid turbulent, gas
    laminar), 5 (both laminar); each phase's Reynolds number with its own flow alone."""
    lam_l, lam_v = _arr(re_l) < re_c, _arr(re_v) < re_c
    return _out(np.where(lam_l, np.where(lam_v, 5.0, 12.0), np.where(lam_v, 10.0, 20.0)))


#: Chisholm's C for two-phase crossflow over a tube bundle, Ishihara, Palen & Taborek (1980) (from memory) [-].
C_CROSSFLOW_BUNDLE = 8.0


def dp_crossflow_bundle(dp_l, dp_v, c=C_CROSSFLOW_BUNDLE):
    """Two-phase pressure drop across a tube bundle [Pa] from the drops of each phase flowing alone.

    Δp = φl² Δp_l with φl² = 1 + C/X + 1/X², X² = Δp_l/Δp_v (Lockhart & Martinelli 1949 in Chisholm's 1967 form),
    written without the division as Δp = Δp_l + C (Δp_l Δp_v)^(1/2) + Δp_v, so that it is the liquid-only drop at
    x = 0 (Δp_v = 0) and the vapour-only drop at x = 1 (Δp_l = 0).

    Parameters
    ----------
    dp_l : float or array_like
        Pressure drop of the liquid part of the flow, (1 − x) m, flowing alone through the bundle [Pa], >= 0.
    dp_v : float or array_like
        Pressure drop of the vapour part, x m, flowing alone [Pa], >= 0.
    c : float or array_like
        Chisholm's C [-]; default :data:`C_CROSSFLOW_BUNDLE` (8, crossflow over tube banks).

    Returns
    -------
    float or numpy.ndarray
        Two-phase (frictional and form) pressure drop [Pa].

    References
    ----------
    Chisholm, D. (1967), Int. J. Heat Mass Transfer 10, 1767-1778; Ishihara, K., Palen, J. W., Taborek, J.
    (1980), Heat Transfer Eng. 1(3), 23-32 (C = 8 for tube banks, from memory).

    Examples
    --------
    >>> dp_crossflow_bundle(100.0, 0.0), dp_crossflow_bundle(0.0, 400.0), dp_crossflow_bundle(100.0, 400.0)
    (100.0, 400.0, 2100.0)
    """
    dp_l, dp_v = np.maximum(_arr(dp_l), 0.0), np.maximum(_arr(dp_v), 0.0)
    return _out(dp_l + _arr(c) * np.sqrt(dp_l * dp_v) + dp_v)


def dp_lockhart_martinelli(G, x, d, rho_l, rho_v, mu_l, mu_v, rel_roughness=0.0, re_c=RE_CHISHOLM):
    """Frictional gradient by Lockhart & Martinelli (1949) in Chisholm's (1967) form [Pa/m].

    dp/dz = φl² (dp/dz)_l = (dp/dz)_l + C [(dp/dz)_l (dp/dz)_v]^(1/2) + (dp/dz)_v, each phase flowing alone
    (liquid (1 − x)G, vapour xG) with the original friction factors 64/Re (Re < re_c) or 0.184 Re^-0.2.
    ``rel_roughness`` is ignored (smooth tubes, as the original).

    Parameters
    ----------
    G : float or array_like
        Total mass flux [kg/m²/s].
    x : float or array_like
        Vapour mass fraction [-].
    d : float or array_like
        Tube inside diameter [m].
    rho_l, rho_v, mu_l, mu_v : float or array_like
        Liquid and vapour densities [kg/m³] and viscosities [Pa s].
    """
    G, x, d = _arr(G), _arr(x), _arr(d)
    gl, gv = (1.0 - x) * G, x * G
    re_l = gl * d / _arr(mu_l)
    re_v = gv * d / _arr(mu_v)

    def f(re):
        re = np.maximum(re, 1e-12)
        return np.where(re < re_c, 64.0 / re, 0.184 * re ** -0.2)

    dpl = f(re_l) / d * gl * gl / (2.0 * _arr(rho_l))
    dpv = f(re_v) / d * gv * gv / (2.0 * _arr(rho_v))
    c = _arr(chisholm_c(re_l, re_v, re_c))
    return _out(dpl + c * np.sqrt(dpl * dpv) + dpv)


def dp_friedel(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma, rel_roughness=0.0):
    """Frictional gradient by Friedel (1979) [Pa/m].

    dp/dz = φlo² (dp/dz)_lo, φlo² = E + 3.24 F H / (Fr^0.045 We^0.035), E = (1 − x)² + x² ρl f_go/(ρv f_lo),
    F = x^0.78 (1 − x)^0.224, H = (ρl/ρv)^0.91 (μv/μl)^0.19 (1 − μv/μl)^0.7, Fr = G²/(g d ρh²),
    We = G² d/(σ ρh), ρh = [x/ρv + (1 − x)/ρl]^-1; "lo"/"go": the whole flow as liquid / as gas.

    Parameters
    ----------
    G, x, d, rho_l, rho_v, mu_l, mu_v
        As :func:`dp_lockhart_martinelli`.
    sigma : float or array_like
        Surface tension [N/m].
    rel_roughness : float or array_like
        Relative roughness e/d [-].
    """
    G, x, d = _arr(G), _arr(x), _arr(d)
    rho_l, rho_v, mu_l, mu_v = _arr(rho_l), _arr(rho_v), _arr(mu_l), _arr(mu_v)
    re_lo = np.maximum(G * d / mu_l, 1e-12)
    re_go = np.maximum(G * d / mu_v, 1e-12)
    f_lo = _arr(friction_darcy(re_lo, rel_roughness))
    f_go = _arr(friction_darcy(re_go, rel_roughness))
    dp_lo = f_lo / d * G * G / (2.0 * rho_l)
    E = (1.0 - x) ** 2 + x * x * rho_l * f_go / (rho_v * f_lo)
    F = x ** 0.78 * (1.0 - x) ** 0.224
    H = (rho_l / rho_v) ** 0.91 * (mu_v / mu_l) ** 0.19 * (1.0 - mu_v / mu_l) ** 0.7
    rho_h = 1.0 / (x / rho_v + (1.0 - x) / rho_l)
    fr = G * G / (_G * d * rho_h * rho_h)
    we = G * G * d / (_arr(sigma) * rho_h)
    return _out(dp_lo * (E + 3.24 * F * H / (fr ** 0.045 * we ** 0.035)))


def dp_muller_steinhagen_heck(G, x, d, rho_l, rho_v, mu_l, mu_v, rel_roughness=0.0):
    """Frictional gradient by Müller-Steinhagen & Heck (1986) [Pa/m].

    dp/dz = [A + 2(B − A)x](1 − x)^(1/3) + B x³, A and B the gradients of the whole flow as liquid and as gas.

    Parameters
    ----------
    G, x, d, rho_l, rho_v, mu_l, mu_v
        As :func:`dp_lockhart_martinelli`.
    rel_roughness : float or array_like
        Relative roughness e/d [-].
    """
    G, x, d = _arr(G), _arr(x), _arr(d)
    A = _single(G, d, _arr(rho_l), _arr(mu_l), rel_roughness)
    B = _single(G, d, _arr(rho_v), _arr(mu_v), rel_roughness)
    return _out((A + 2.0 * (B - A) * x) * np.cbrt(1.0 - x) + B * x ** 3)


def _friedel_registry(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma=None, rel_roughness=0.0):
    return dp_friedel(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma, rel_roughness)


def _msh_registry(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma=None, rel_roughness=0.0):
    return dp_muller_steinhagen_heck(G, x, d, rho_l, rho_v, mu_l, mu_v, rel_roughness)


def _lm_registry(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma=None, rel_roughness=0.0):
    return dp_lockhart_martinelli(G, x, d, rho_l, rho_v, mu_l, mu_v)


#: name -> gradient kernel with the common signature (G, x, d, rho_l, rho_v, mu_l, mu_v, sigma, rel_roughness).
TWO_PHASE_METHODS = {
    "muller-steinhagen-heck": _msh_registry,
    "friedel": _friedel_registry,
    "lockhart-martinelli": _lm_registry,
}
#: The default method (see the module text for why).
DEFAULT_METHOD = "muller-steinhagen-heck"


def frictional_gradient(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma=None, rel_roughness=0.0,
                        method=DEFAULT_METHOD):
    """Frictional two-phase gradient [Pa/m] by ``method``, a key of :data:`TWO_PHASE_METHODS` (unvalidated)."""
    return TWO_PHASE_METHODS[method](G, x, d, rho_l, rho_v, mu_l, mu_v, sigma, rel_roughness)


_NODES, _WEIGHTS = np.polynomial.legendre.leggauss(12)


def integrate_dp(gradient, x_in, x_out, length, nodes=None):
    """Pressure drop [Pa] over a path on which the vapour fraction goes linearly from ``x_in`` to ``x_out``.

    dp = L/(x_out − x_in) ∫ dp/dz(x) dx (x linear in length: uniform heat flux), by Gauss-Legendre quadrature
    (12 nodes, exact for polynomials up to degree 23; the gradients here are smooth in x), the mean gradient
    times the length; x_in = x_out gives L dp/dz(x_in).

    Parameters
    ----------
    gradient : callable
        ``gradient(x) -> dp/dz`` [Pa/m], array-native: it receives an array of shape ``(12,) + shape`` where
        ``shape`` is the broadcast shape of ``x_in``, ``x_out`` and ``length`` (properties varying along the path
        may be looked up from x inside it).
    x_in, x_out : float or array_like
        Vapour mass fraction at the start and end of the path [-].
    length : float or array_like
        Path length [m].
    nodes : int, optional
        Another number of Gauss-Legendre nodes.

    Returns
    -------
    float or numpy.ndarray
        Frictional pressure drop [Pa] (positive).
    """
    if nodes is None:
        t, w = _NODES, _WEIGHTS
    else:
        t, w = np.polynomial.legendre.leggauss(int(nodes))
    xi, xo, L = np.broadcast_arrays(_arr(x_in), _arr(x_out), _arr(length))
    shape = xi.shape
    tt = t.reshape((-1,) + (1,) * len(shape))
    ww = w.reshape((-1,) + (1,) * len(shape))
    xs = 0.5 * (xi + xo) + 0.5 * (xo - xi) * tt
    g = _arr(gradient(xs))
    mean = 0.5 * np.sum(ww * g, axis=0)  # the weights sum to 2
    return _out(mean * L)


def momentum_dp(G, x_in, x_out, rho_l, rho_v):
    """Momentum (acceleration) pressure change [Pa] between two vapour fractions, separated flow with Zivi's
    (1964) void fraction: G² {[x²/(ρv α) + (1 − x)²/(ρl (1 − α))]_out − [...]_in}; negative (a pressure recovery)
    as a vapour condenses and slows down."""
    G = _arr(G)

    def flux(x):
        x = _arr(x)
        a = _arr(zivi_void_fraction(x, rho_l, rho_v))
        with np.errstate(divide="ignore", invalid="ignore"):
            tv = np.where(x > 0.0, x * x / (_arr(rho_v) * a), 0.0)
            tl = np.where(x < 1.0, (1.0 - x) ** 2 / (_arr(rho_l) * (1.0 - a)), 0.0)
        return tv + tl

    return _out(G * G * (flux(x_out) - flux(x_in)))


@dataclass(frozen=True)
class TwoPhaseDrop:
    """Pressure drop of a two-phase path.

    Attributes
    ----------
    dp : float or numpy.ndarray
        Total static pressure drop [Pa] = friction + momentum (gravity not included: horizontal path).
    dp_friction : float or numpy.ndarray
        Frictional part [Pa], >= 0.
    dp_momentum : float or numpy.ndarray
        Momentum part [Pa] (negative while condensing: a recovery).
    method : str
        The frictional method used.
    warnings : tuple of str
    """

    dp: float | np.ndarray
    dp_friction: float | np.ndarray
    dp_momentum: float | np.ndarray
    method: str
    warnings: tuple[str, ...]


def _checked(value, kind, name, **bounds):
    v = to_si(value, kind, name)
    require(v, name, **bounds)
    return _arr(v)


def two_phase_dp(G, x_in, x_out, length, d, rho_l, rho_v, mu_l, mu_v, sigma=None, rel_roughness=0.0,
                 method=DEFAULT_METHOD, momentum=False) -> TwoPhaseDrop:
    """Two-phase pressure drop of a horizontal tube path at constant properties (validated).

    Parameters
    ----------
    G : float or array_like
        Total mass flux [kg/m²/s], > 0.
    x_in, x_out : float or array_like
        Vapour mass fraction at the inlet and outlet [-], 0 to 1.
    length : float or array_like
        Path length [m] (tube length x passes for a tube side).
    d : float or array_like
        Inside diameter [m].
    rho_l, rho_v, mu_l, mu_v : float or array_like
        Liquid and vapour densities [kg/m³] and viscosities [Pa s].
    sigma : float or array_like, optional
        Surface tension [N/m]; required by ``"friedel"``.
    rel_roughness : float
        Relative roughness e/d [-].
    method : str
        A key of :data:`TWO_PHASE_METHODS` (default :data:`DEFAULT_METHOD`).
    momentum : bool
        Add :func:`momentum_dp` (default False: the frictional drop alone, the conservative basis for a pressure
        drop limit and for the condensing-temperature drop; the recovery can reach the size of the friction term
        when a fast vapour condenses fully).

    Returns
    -------
    TwoPhaseDrop
        Friedel warns where μl/μv > 1000 (outside its recommended range).
    """
    if method not in TWO_PHASE_METHODS:
        raise InputError("method", method, f"one of {sorted(TWO_PHASE_METHODS)}")
    G = _checked(G, "dimensionless", "G", gt=0.0)
    x_in = _checked(x_in, "dimensionless", "x_in", ge=0.0, le=1.0)
    x_out = _checked(x_out, "dimensionless", "x_out", ge=0.0, le=1.0)
    length = _checked(length, "length", "length", ge=0.0)
    d = _checked(d, "length", "d", gt=0.0)
    rho_l = _checked(rho_l, "density", "rho_l", gt=0.0)
    rho_v = _checked(rho_v, "density", "rho_v", gt=0.0)
    mu_l = _checked(mu_l, "viscosity", "mu_l", gt=0.0)
    mu_v = _checked(mu_v, "viscosity", "mu_v", gt=0.0)
    if np.any(rho_v >= rho_l):
        raise InputError("rho_v", float(np.max(rho_v)), "a vapour density below the liquid density")
    if np.any(mu_v >= mu_l):
        raise InputError("mu_v", float(np.max(mu_v)), "a vapour viscosity below the liquid viscosity")
    rr = _checked(rel_roughness, "dimensionless", "rel_roughness", ge=0.0, lt=0.1)
    warnings = []
    if method == "friedel":
        if sigma is None or not np.all(np.isfinite(np.asarray(sigma, dtype=float))):
            raise InputError("sigma", sigma, "the surface tension [N/m] (Friedel needs it; the default method "
                                             f"{DEFAULT_METHOD!r} does not)")
        sigma = _checked(sigma, "dimensionless", "sigma", gt=0.0)
        warnings += range_warning("Friedel (1979)", "mu_l/mu_v", mu_l / mu_v, None, 1000.0,
                                  "Whalley (1980) recommendation")

    shape = np.broadcast_shapes(*(np.shape(a) for a in (G, x_in, x_out, length, d, rho_l, rho_v, mu_l, mu_v, rr,
                                                        sigma if sigma is not None else 0.0)))

    def grad(x):
        return frictional_gradient(G, x, d, rho_l, rho_v, mu_l, mu_v, sigma, rr, method)

    dpf = _arr(integrate_dp(grad, np.broadcast_to(x_in, shape), x_out, length))
    dpm = _arr(momentum_dp(G, x_in, x_out, rho_l, rho_v)) if momentum else np.zeros_like(dpf)
    dpf, dpm = np.broadcast_arrays(dpf, dpm)
    return TwoPhaseDrop(_out(dpf + dpm), _out(np.array(dpf)), _out(np.array(dpm)), method, tuple(warnings))


def saturation_temperature_drop(fluid, dp, q=0.0):
    """Drop of the condensing temperature [K] caused by a pressure drop ``dp`` [Pa] from the fluid's pressure.

    T(q) at ``fluid.pressure`` minus T(q) at ``fluid.pressure − dp``: a pure fluid by CoolProp's saturation
    curve, a mixture or a user's curve by Clausius-Clapeyron along the curve
    (:meth:`revamp.fluids.CondensingFluid.temperature_at_pressure`).

    Parameters
    ----------
    fluid : CondensingFluid
    dp : float or array_like
        Pressure drop [Pa], 0 <= dp < pressure.
    q : float or array_like
        Heat released from the dew point [J/kg] (the point of the curve).

    Examples
    --------
    >>> from revamp.fluids import condensing, water
    >>> round(saturation_temperature_drop(condensing(water("0.2 bar")), 2000.0), 2)   # at vacuum [K]
    2.26
    """
    if not hasattr(fluid, "temperature_at_pressure"):
        raise InputError("fluid", getattr(fluid, "name", fluid), "a CondensingFluid (fluids.condensing(...) or "
                                                                 "fluids.condensing_curve(...))")
    dp = _arr(to_si(dp, "pressure", "dp"))
    require(dp, "dp", ge=0.0, lt=fluid.pressure, what=f"a pressure drop below the pressure {fluid.pressure:g} Pa")
    t0 = _arr(fluid.at(q)[0])
    t1 = _arr(fluid.temperature_at_pressure(fluid.pressure - dp, q))
    return _out(t0 - t1)
