"""Film condensation inside horizontal tubes: the unvalidated array kernels.

Shear-controlled (annular) flow by Shah (1979) and Shah (2009), gravity-controlled (stratified) flow by Jaster &
Kosky (1976) with Zivi's (1964) void fraction, and the vapour-phase sensible coefficient for mixtures. SI floats or
arrays, broadcast together, no unit parsing. The validating wrapper
(:func:`revamp.correlations.condensation.tube_condensation`) and the choice between the regimes are in
:mod:`revamp.correlations.condensation`, which re-exports every name here (moved verbatim from it).

References
----------
.. [1] Shah, M. M. (1979). A general correlation for heat transfer during film condensation inside pipes.
   Int. J. Heat Mass Transfer 22, 547-556.
.. [2] Shah, M. M. (2009). An improved and extended general correlation for heat transfer during condensation in
   plain tubes. HVAC&R Research 15(5), 889-913 (from memory; see :func:`shah_2009_parts`).
.. [3] Jaster, H., Kosky, P. G. (1976). Condensation heat transfer in a mixed flow regime. Int. J. Heat Mass
   Transfer 19, 95-99.
.. [4] Zivi, S. M. (1964). Estimation of steady-state steam void-fraction by means of the principle of minimum
   entropy production. J. Heat Transfer 86, 247-252.
"""
from __future__ import annotations

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from .tube import nu_tube

__all__ = ["G", "SHAH_1979_RANGE", "SHAH_2009_RANGE", "shah_1979", "shah_2009", "shah_2009_parts",
           "stratified_jaster_kosky", "vapour_h_tube", "zivi_void_fraction"]


G = 9.80665  #: standard gravity [m/s²]
#: Published range of Shah (1979): reduced pressure and liquid-only Reynolds number (p_r from the paper's data
#: set; Re_LO > 350 the lower limit Shah later gave for the correlation); Pr_l 1 to 13 from memory.
SHAH_1979_RANGE = {"p_r": (0.002, 0.44), "Re_LO": (350.0, None), "Pr_l": (1.0, 13.0)}

#: Range of Shah (2009) for horizontal tubes: inside diameter [m], reduced pressure, mass flux [kg/m²/s], liquid
#: Prandtl number (Shah 2009, table of the data set; from memory, and agreeing with a public open-source
#: implementation of the paper's equations and range; the paper itself was not at hand).
SHAH_2009_RANGE = {"d_i": (0.002, 0.049), "p_r": (0.0008, 0.905), "G": (4.0, 820.0), "Pr_l": (1.0, 18.0)}


# ------------------------------------------------------------------------------------------- tube side kernels
def shah_1979(G_total, x, d_i, rho_l, mu_l, k_l, cp_l, p_r):
    """In-tube condensation, Shah (1979).

    h = h_LO [(1 − x)^0.8 + 3.8 x^0.76 (1 − x)^0.04 / p_r^0.38], h_LO = 0.023 Re_LO^0.8 Pr_l^0.4 kl / d_i
    (Dittus-Boelter with the whole flow as liquid, Re_LO = G d_i / μl).

    Parameters
    ----------
    G_total : float or array_like
        Total mass flux in the tube [kg/m²/s].
    x : float or array_like
        Vapour mass fraction [-].
    d_i : float or array_like
        Tube inside diameter [m].
    rho_l, mu_l, k_l, cp_l : float or array_like
        Condensate density [kg/m³] (unused by the equation, kept for a uniform signature), viscosity [Pa s],
        conductivity [W/m/K], heat capacity [J/kg/K].
    p_r : float or array_like
        Reduced pressure p / p_c [-].

    Returns
    -------
    float or numpy.ndarray
        Local film coefficient [W/m²/K] on the inside surface.

    References
    ----------
    Shah, M. M. (1979), Int. J. Heat Mass Transfer 22, 547-556. Range: :data:`SHAH_1979_RANGE`.
    """
    x = _arr(x)
    mu_l, k_l, d_i = _arr(mu_l), _arr(k_l), _arr(d_i)
    re_lo = _arr(G_total) * d_i / mu_l
    pr_l = _arr(cp_l) * mu_l / k_l
    h_lo = 0.023 * re_lo ** 0.8 * pr_l ** 0.4 * k_l / d_i
    one = 1.0 - x
    return _out(h_lo * (one ** 0.8 + 3.8 * x ** 0.76 * one ** 0.04 / _arr(p_r) ** 0.38))


def shah_2009_parts(G_total, x, d_i, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, p_r):
    """The parts of Shah's (2009) in-tube condensation correlation for a horizontal tube.

    h_I = h_LT (μl / (14 μv))^n [(1 − x)^0.8 + 3.8 x^0.76 (1 − x)^0.04 / p_r^0.38], n = 0.0058 + 0.557 p_r,
    h_LT = 0.023 Re_LT^0.8 Pr_l^0.4 kl / d_i with Re_LT = G d_i / μl (the whole flow as liquid);
    h_Nu = 1.32 Re_LS^(-1/3) [ρl (ρl − ρv) g kl³ / μl²]^(1/3) with Re_LS = G (1 − x) d_i / μl;
    J_g = x G / [g d_i ρv (ρl − ρv)]^(1/2), Z = (1/x − 1)^0.8 p_r^0.4. Horizontal tubes: regime I (h = h_I) where
    J_g >= 0.98 (Z + 0.263)^(-0.62), else regime II (h = h_I + h_Nu).

    Returns
    -------
    tuple of numpy.ndarray
        ``(h, h_I, h_Nu, regime_I)``: the coefficient [W/m²/K], its two parts [W/m²/K] and where regime I holds.

    References
    ----------
    Shah, M. M. (2009). An improved and extended general correlation for heat transfer during condensation in plain
    tubes. HVAC&R Research 15(5), 889-913 (equations from memory, checked against a public open-source
    implementation of the paper; the paper itself was not at hand).
    """
    x = _arr(x)
    G_total, d_i = _arr(G_total), _arr(d_i)
    rho_l, rho_v, mu_l, mu_v, k_l, p_r = (_arr(v) for v in (rho_l, rho_v, mu_l, mu_v, k_l, p_r))
    pr_l = _arr(cp_l) * mu_l / k_l
    h_lt = 0.023 * (G_total * d_i / mu_l) ** 0.8 * pr_l ** 0.4 * k_l / d_i
    n = 0.0058 + 0.557 * p_r
    one = 1.0 - x
    h_i = h_lt * (mu_l / (14.0 * mu_v)) ** n * (one ** 0.8 + 3.8 * x ** 0.76 * one ** 0.04 / p_r ** 0.38)
    re_ls = np.maximum(G_total * one * d_i / mu_l, 1e-12)
    h_nu = 1.32 * re_ls ** (-1.0 / 3.0) * np.cbrt(rho_l * (rho_l - rho_v) * G * k_l ** 3 / mu_l ** 2)
    with np.errstate(divide="ignore", invalid="ignore"):
        z = np.where(x > 0.0, (1.0 / np.maximum(x, 1e-300) - 1.0) ** 0.8, np.inf) * p_r ** 0.4
        j_g = x * G_total / np.sqrt(G * d_i * rho_v * (rho_l - rho_v))
        regime_i = j_g >= 0.98 * (z + 0.263) ** -0.62
    h = np.where(regime_i, h_i, h_i + h_nu)
    return h, h_i, h_nu, regime_i


def shah_2009(G_total, x, d_i, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, p_r):
    """In-tube condensation in a horizontal tube, Shah (2009) [W/m²/K] (see :func:`shah_2009_parts`).

    Range: :data:`SHAH_2009_RANGE`.
    """
    return _out(shah_2009_parts(G_total, x, d_i, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, p_r)[0])


def zivi_void_fraction(x, rho_l, rho_v):
    """Void fraction by Zivi (1964): α = [1 + ((1 − x)/x)(ρv/ρl)^(2/3)]^(-1) (0 at x = 0)."""
    x = _arr(x)
    s = (_arr(rho_v) / _arr(rho_l)) ** (2.0 / 3.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        alpha = np.where(x > 0.0, x / (x + (1.0 - x) * s), 0.0)
    return _out(alpha)


def stratified_jaster_kosky(x, rho_l, rho_v, k_l, mu_l, h_fg, d_i, dT):
    """Gravity-controlled (stratified) condensation in a horizontal tube, Jaster & Kosky (1976).

    h = 0.728 α^(3/4) [ρl (ρl − ρv) g kl³ h_fg / (μl d_i ΔT)]^(1/4): Nusselt's film on the part of the wall
    above the condensate pool (the factor α^(3/4), α by :func:`zivi_void_fraction`); the condensate pool itself
    is taken as adding nothing. Suited to low vapour velocities (Jaster & Kosky's stratified regime).

    Parameters
    ----------
    x : float or array_like
        Vapour mass fraction [-].
    rho_l, rho_v, k_l, mu_l, h_fg : float or array_like
        As :func:`nusselt_horizontal_tube`.
    d_i : float or array_like
        Tube inside diameter [m].
    dT : float or array_like
        Saturation minus inner wall temperature [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Mean film coefficient over the whole inside perimeter [W/m²/K].

    References
    ----------
    Jaster, H., Kosky, P. G. (1976), Int. J. Heat Mass Transfer 19, 95-99 (form from memory; the Nusselt part
    is checked against ``ht``); Zivi (1964), J. Heat Transfer 86, 247-252.
    """
    rho_l = _arr(rho_l)
    alpha = _arr(zivi_void_fraction(x, rho_l, rho_v))
    a = rho_l * (rho_l - _arr(rho_v)) * G * _arr(k_l) ** 3 * _arr(h_fg) / (_arr(mu_l) * _arr(d_i) * _arr(dT))
    return _out(0.728 * alpha ** 0.75 * a ** 0.25)


def vapour_h_tube(G_total, x, d_i, mu_v, k_v, cp_v, d_over_L=0.0):
    """Sensible coefficient of the vapour phase flowing alone in the tube (for Bell & Ghaly's correction and
    desuperheating): Nu of :func:`revamp.correlations.tube.nu_tube` (Gnielinski with its laminar and transition
    blend) at Re_v = x G d_i / μv.

    Returns
    -------
    float or numpy.ndarray
        Vapour film coefficient [W/m²/K].
    """
    d_i, mu_v, k_v = _arr(d_i), _arr(mu_v), _arr(k_v)
    re_v = np.maximum(_arr(x) * _arr(G_total) * d_i / mu_v, 1e-9)
    pr_v = _arr(cp_v) * mu_v / k_v
    return _out(_arr(nu_tube(re_v, pr_v, np.broadcast_to(_arr(d_over_L), np.shape(re_v)))) * k_v / d_i)
