"""Film condensation: shell side on horizontal tube bundles, tube side in horizontal tubes, mixtures.

Unvalidated array kernels (SI floats or arrays, broadcast together, no unit parsing) sit beside two validating
public wrappers, :func:`shell_condensation` and :func:`tube_condensation`, which check their inputs (raising
:class:`~revamp.errors.InputError` with the argument's name) and return a typed result with range warnings.

Choices made here (each cited at its function):

- shell side, gravity-controlled: Nusselt (1916) on one horizontal tube, with a row correction for condensate
  inundation of a bundle, Kern's N^(-1/6) by default (:data:`ROW_CORRECTIONS`: also Nusselt's N^(-1/4), the
  most pessimistic, and Eissenberg's 0.60 + 0.42 N^(-1/4));
- shell side, shear-controlled: Shekriladze & Gomelauri (1966), Nu = 0.59 Re_tp^(1/2) with the vapour velocity;
- shell side, which one: Butterworth's (1977) combination of the two, which tends to the gravity form at low
  vapour velocity and to the shear form at high velocity, so no switch is needed; its result is never below
  either part. The gravity part carries the row correction; the shear part does not (vapour shear thins the
  inundated film: the correction is then conservative). Use the gravity form alone where the vapour velocity is
  not known (the shear part is then zero);
- tube side, shear-controlled (annular): Shah (1979), valid 0.002 < p/p_c < 0.44, Re_LO > 350;
- tube side, gravity-controlled (stratified, low vapour velocity): Nusselt's film on the upper wall with the
  vapour-space share of the perimeter, Jaster & Kosky (1976): 0.728 α^(3/4) [...]^(1/4), α by Zivi (1964);
- tube side, which one: the larger of the two at each point (each is a lower bound of the other's regime:
  shear adds to the gravity drainage; common practice, no source);
- mixtures: Silver (1947) and Bell & Ghaly (1973): 1/h_eff = 1/h_film + Z/h_vapour, Z = x cp_v dT/dq from
  :meth:`revamp.fluids.CondensingFluid.z_factor`, h_vapour the vapour-phase sensible coefficient (in tubes:
  :func:`vapour_h_tube`; on the shell side: the shell method at the vapour flow).

The tube-side kernels (:func:`shah_1979`, :func:`shah_2009`, :func:`stratified_jaster_kosky`,
:func:`zivi_void_fraction`, :func:`vapour_h_tube`) live in :mod:`revamp.correlations.condensation_tube` and are
re-exported here; this module holds the shell-side kernels, the mixture correction and the validating wrappers.

References
----------
.. [1] Nusselt, W. (1916). Die Oberflächenkondensation des Wasserdampfes. Z. VDI 60, 541-546 and 569-575.
.. [2] Kern, D. Q. (1958). Mathematical development of loading in horizontal condensers. AIChE J. 4(2), 157-160.
.. [3] Eissenberg, D. M. (1972). An investigation of the variables affecting steam condensation on the outside of
   a horizontal tube bundle. PhD thesis, University of Tennessee (as cited by Butterworth 1977).
.. [4] Shekriladze, I. G., Gomelauri, V. I. (1966). Theoretical study of laminar film condensation of flowing
   vapour. Int. J. Heat Mass Transfer 9, 581-591.
.. [5] Butterworth, D. (1977). Developments in the design of shell and tube condensers. ASME Winter Annual
   Meeting, paper 77-WA/HT-24.
.. [6] Shah, M. M. (1979). A general correlation for heat transfer during film condensation inside pipes.
   Int. J. Heat Mass Transfer 22, 547-556.
.. [7] Jaster, H., Kosky, P. G. (1976). Condensation heat transfer in a mixed flow regime. Int. J. Heat Mass
   Transfer 19, 95-99.
.. [8] Zivi, S. M. (1964). Estimation of steady-state steam void-fraction by means of the principle of minimum
   entropy production. J. Heat Transfer 86, 247-252.
.. [9] Silver, L. (1947). Gas cooling with aqueous condensation. Trans. Inst. Chem. Eng. 25, 30-42.
.. [10] Bell, K. J., Ghaly, M. A. (1973). An approximate generalized design method for multicomponent/partial
   condensers. AIChE Symp. Ser. 69(131), 72-79.
.. [11] Rohsenow, W. M. (1956). Heat transfer and temperature distribution in laminar film condensation.
   Trans. ASME 78, 1645-1648.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from ..errors import InputError
from ..units import require, to_si
from ._validity import range_warning
# the in-tube kernels (Shah, Jaster & Kosky, Zivi, the vapour coefficient) and standard gravity live in
# condensation_tube; re-exported here (two_phase, the tests and the wrappers below use them from this module)
from .condensation_tube import (G, SHAH_1979_RANGE, SHAH_2009_RANGE, shah_1979, shah_2009,  # noqa: F401
                                shah_2009_parts, stratified_jaster_kosky, vapour_h_tube, zivi_void_fraction)

__all__ = [
    "CondensationFilm",
    "G",
    "NUSSELT_HORIZONTAL",
    "ROW_CORRECTIONS",
    "SHAH_1979_RANGE",
    "SHAH_2009_RANGE",
    "bell_ghaly",
    "butterworth_combination",
    "modified_latent_heat",
    "nusselt_horizontal_tube",
    "nusselt_horizontal_tube_loading",
    "row_factor",
    "shah_1979",
    "shah_2009",
    "shah_2009_parts",
    "shear_horizontal_tube",
    "shell_condensation",
    "stratified_jaster_kosky",
    "tube_condensation",
    "vapour_h_tube",
    "zivi_void_fraction",
]

#: Nusselt's (1916) constant for a horizontal tube (0.728-0.729 in some texts, from rounding the integral).
NUSSELT_HORIZONTAL = 0.725


# ------------------------------------------------------------------------------------------ shell side kernels
def modified_latent_heat(h_fg, cp_l, dT):
    """Rohsenow's (1956) latent heat with the condensate subcooling in the film: h_fg + 0.68 cp_l ΔT [J/kg].

    Parameters
    ----------
    h_fg : float or array_like
        Latent heat [J/kg].
    cp_l : float or array_like
        Condensate heat capacity [J/kg/K].
    dT : float or array_like
        Saturation minus wall temperature [K].
    """
    return _out(_arr(h_fg) + 0.68 * _arr(cp_l) * _arr(dT))


def nusselt_horizontal_tube(rho_l, rho_v, k_l, mu_l, h_fg, d_o, dT):
    """Laminar film condensation on one horizontal tube, Nusselt (1916), wall-temperature form.

    h = 0.725 [ρl (ρl − ρv) g h_fg kl³ / (μl ΔT d_o)]^(1/4)

    Parameters
    ----------
    rho_l, rho_v : float or array_like
        Condensate and vapour densities [kg/m³].
    k_l : float or array_like
        Condensate conductivity [W/m/K].
    mu_l : float or array_like
        Condensate viscosity [Pa s].
    h_fg : float or array_like
        Latent heat [J/kg] (or Rohsenow's :func:`modified_latent_heat`).
    d_o : float or array_like
        Tube outside diameter [m].
    dT : float or array_like
        Saturation (or local curve) temperature minus wall temperature [K], > 0.

    Returns
    -------
    float or numpy.ndarray
        Mean film coefficient around the tube [W/m²/K].

    References
    ----------
    Nusselt, W. (1916), Z. VDI 60, 541-546, 569-575; the constant as given by Incropera & DeWitt,
    *Fundamentals of Heat and Mass Transfer* (2002), eq. 10.41 (0.729) and Kern (1950) (0.725).

    Examples
    --------
    >>> round(nusselt_horizontal_tube(958.0, 0.6, 0.68, 2.8e-4, 2.257e6, 0.025, 10.0))
    12599
    """
    rho_l = _arr(rho_l)
    a = rho_l * (rho_l - _arr(rho_v)) * G * _arr(h_fg) * _arr(k_l) ** 3 / (_arr(mu_l) * _arr(dT) * _arr(d_o))
    return _out(NUSSELT_HORIZONTAL * a ** 0.25)


def nusselt_horizontal_tube_loading(rho_l, rho_v, k_l, mu_l, gamma):
    """Nusselt's horizontal-tube film in its condensate-loading form (no wall temperature needed).

    h = 1.514 [kl³ ρl (ρl − ρv) g / μl²]^(1/3) (4Γ/μl)^(-1/3), which is :func:`nusselt_horizontal_tube` with
    ΔT eliminated by Γ = h π d_o ΔT / h_fg (the constant (4π 0.725⁴)^(1/3) = 1.514; Kern 1950 prints 1.51).

    Parameters
    ----------
    rho_l, rho_v, k_l, mu_l : float or array_like
        As :func:`nusselt_horizontal_tube`.
    gamma : float or array_like
        Condensate leaving the tube per unit tube length [kg/s/m]. For Kern's (1958) bundle form pass
        Γ = W / (L N_t^(2/3)) with W the bundle's condensate and N_t the tube count (from memory).

    Returns
    -------
    float or numpy.ndarray
        Mean film coefficient [W/m²/K].
    """
    rho_l, mu_l = _arr(rho_l), _arr(mu_l)
    c = (4.0 * np.pi * NUSSELT_HORIZONTAL ** 4) ** (1.0 / 3.0)
    b = _arr(k_l) ** 3 * rho_l * (rho_l - _arr(rho_v)) * G / mu_l ** 2
    return _out(c * np.cbrt(b) * np.cbrt(4.0 * _arr(gamma) / mu_l) ** -1)


def _kern(n):
    return n ** (-1.0 / 6.0)


def _nusselt_rows(n):
    return n ** (-0.25)


def _eissenberg(n):
    return 0.60 + 0.42 * n ** (-0.25)


#: Row corrections: mean coefficient of a column of N tubes over that of the top tube, h_N / h_1.
#: "kern": N^(-1/6) (Kern 1958; the default, a middle estimate supported by bundle data); "nusselt": N^(-1/4)
#: (Nusselt 1916, a smooth laminar sheet falling from tube to tube: the most pessimistic); "eissenberg":
#: 0.60 + 0.42 N^(-1/4) (Eissenberg 1972, side drainage in staggered bundles; from memory, as cited by Butterworth).
ROW_CORRECTIONS = {"kern": _kern, "nusselt": _nusselt_rows, "eissenberg": _eissenberg}


def row_factor(n_rows, method="kern"):
    """Mean-bundle factor h_N / h_1 for a vertical column of ``n_rows`` tubes, a key of :data:`ROW_CORRECTIONS`.

    Examples
    --------
    >>> round(row_factor(10), 4), round(row_factor(10, "nusselt"), 4)
    (0.6813, 0.5623)
    """
    if method not in ROW_CORRECTIONS:
        raise InputError("row_correction", method, f"one of {sorted(ROW_CORRECTIONS)}")
    return _out(ROW_CORRECTIONS[method](np.maximum(_arr(n_rows), 1.0)))


def shear_horizontal_tube(rho_l, k_l, mu_l, u_v, d_o):
    """Shear-controlled film condensation on a horizontal tube, Shekriladze & Gomelauri (1966).

    Nu = h d_o / kl = 0.59 Re_tp^(1/2), Re_tp = ρl u_v d_o / μl (vapour approach velocity, liquid properties).

    Parameters
    ----------
    rho_l, k_l, mu_l : float or array_like
        Condensate density [kg/m³], conductivity [W/m/K], viscosity [Pa s].
    u_v : float or array_like
        Vapour velocity approaching the tubes [m/s] (at the bundle's crossflow area), >= 0.
    d_o : float or array_like
        Tube outside diameter [m].

    Returns
    -------
    float or numpy.ndarray
        Film coefficient [W/m²/K] (0 at zero vapour velocity).

    References
    ----------
    Shekriladze & Gomelauri (1966), Int. J. Heat Mass Transfer 9, 581-591; the constant 0.59 as recommended by
    Butterworth (1977) (from memory).
    """
    k_l, d_o = _arr(k_l), _arr(d_o)
    re_tp = _arr(rho_l) * _arr(u_v) * d_o / _arr(mu_l)
    return _out(0.59 * np.sqrt(re_tp) * k_l / d_o)


def butterworth_combination(h_shear, h_gravity):
    """Butterworth's (1977) combination of shear- and gravity-controlled shell-side coefficients.

    h = [½ h_sh² + (¼ h_sh⁴ + h_gr⁴)^(1/2)]^(1/2); h = h_gr when h_sh = 0 and h -> h_sh when h_sh >> h_gr.

    References
    ----------
    Butterworth, D. (1977), ASME paper 77-WA/HT-24 (form from memory; its limits checked in the tests).
    """
    hs, hg = _arr(h_shear), _arr(h_gravity)
    return _out(np.sqrt(0.5 * hs ** 2 + np.sqrt(0.25 * hs ** 4 + hg ** 4)))


# ---------------------------------------------------------------------------------------------------- mixtures
def bell_ghaly(h_film, h_vapour, z):
    """Silver (1947) / Bell & Ghaly (1973) effective coefficient of a condensing mixture.

    1/h_eff = 1/h_film + Z/h_vapour, Z = x cp_v dT/dq the share of the heat released that is vapour sensible
    heat (:meth:`revamp.fluids.CondensingFluid.z_factor`); Z = 0 (a pure fluid) gives h_film.

    Parameters
    ----------
    h_film : float or array_like
        Condensate film coefficient [W/m²/K].
    h_vapour : float or array_like
        Vapour-phase sensible coefficient on the same surface [W/m²/K].
    z : float or array_like
        Bell & Ghaly's Z [-], >= 0.
    """
    return _out(1.0 / (1.0 / _arr(h_film) + _arr(z) / _arr(h_vapour)))


# ------------------------------------------------------------------------------------------- public wrappers
@dataclass(frozen=True)
class CondensationFilm:
    """A condensing film coefficient with its parts.

    Attributes
    ----------
    h : float or numpy.ndarray
        The coefficient to use [W/m²/K] (mixture-corrected when Z was given).
    h_gravity : float or numpy.ndarray
        Gravity-controlled part [W/m²/K] (shell: Nusselt with the row factor; tube: stratified).
    h_shear : float or numpy.ndarray
        Shear-controlled part [W/m²/K] (shell: Shekriladze & Gomelauri; tube: Shah 1979).
    h_film : float or numpy.ndarray
        The combined film before the mixture correction [W/m²/K].
    regime : str
        How the parts were combined, for reports.
    warnings : tuple of str
        Range warnings, one per quantity.
    """

    h: float | np.ndarray
    h_gravity: float | np.ndarray
    h_shear: float | np.ndarray
    h_film: float | np.ndarray
    regime: str
    warnings: tuple[str, ...]


def _film(h, h_gravity, h_shear, h_film, regime, warnings):
    parts = np.broadcast_arrays(_arr(h), _arr(h_gravity), _arr(h_shear), _arr(h_film))
    return CondensationFilm(*(_out(np.array(a)) for a in parts), regime, tuple(warnings))


def _checked(value, kind, name, **bounds):
    v = to_si(value, kind, name)
    require(v, name, **bounds)
    return _arr(v)


def _mixture(h_film, z, h_vapour):
    if z is None:
        return h_film
    z = _checked(z, "dimensionless", "z", ge=0.0)
    if h_vapour is None:
        raise InputError("h_vapour", None, "the vapour-phase coefficient [W/m²K] when z (Bell & Ghaly) is given")
    hv = _checked(h_vapour, "htc", "h_vapour", gt=0.0)
    return _arr(bell_ghaly(h_film, hv, z))


def shell_condensation(rho_l, rho_v, k_l, mu_l, h_fg, d_o, dT, n_rows=1.0, u_v=0.0, row_correction="kern",
                       z=None, h_vapour=None) -> CondensationFilm:
    """Shell-side condensation on a horizontal tube bundle (validated).

    Gravity part: :func:`nusselt_horizontal_tube` x :func:`row_factor` (Kern's N^(-1/6) by default); shear part:
    :func:`shear_horizontal_tube` at the vapour velocity ``u_v``; combined by :func:`butterworth_combination`
    (the gravity part alone when u_v = 0); then Bell & Ghaly's :func:`bell_ghaly` when ``z`` is given.

    Parameters
    ----------
    rho_l, rho_v, k_l, mu_l, h_fg, d_o, dT
        As :func:`nusselt_horizontal_tube` [kg/m³, kg/m³, W/m/K, Pa s, J/kg, m, K].
    n_rows : float or array_like
        Tubes in a vertical column (mean over the bundle) [-], >= 1.
    u_v : float or array_like
        Vapour velocity at the bundle crossflow area [m/s], >= 0.
    row_correction : str
        A key of :data:`ROW_CORRECTIONS`.
    z : float or array_like, optional
        Bell & Ghaly's Z [-] (mixtures).
    h_vapour : float or array_like, optional
        Vapour-phase sensible coefficient [W/m²/K], required with ``z``.

    Returns
    -------
    CondensationFilm
    """
    rho_l = _checked(rho_l, "density", "rho_l", gt=0.0)
    rho_v = _checked(rho_v, "density", "rho_v", gt=0.0)
    if np.any(rho_v >= rho_l):
        raise InputError("rho_v", float(np.max(rho_v)), "a vapour density below the liquid density")
    k_l = _checked(k_l, "conductivity", "k_l", gt=0.0)
    mu_l = _checked(mu_l, "viscosity", "mu_l", gt=0.0)
    h_fg = _checked(h_fg, "dimensionless", "h_fg", gt=0.0)
    d_o = _checked(d_o, "length", "d_o", gt=0.0)
    dT = _checked(dT, "temperature_difference", "dT", gt=0.0)
    n_rows = _checked(n_rows, "dimensionless", "n_rows", ge=1.0)
    u_v = _checked(u_v, "velocity", "u_v", ge=0.0)
    h_grav = _arr(nusselt_horizontal_tube(rho_l, rho_v, k_l, mu_l, h_fg, d_o, dT)) * _arr(
        row_factor(n_rows, row_correction))
    h_sh = _arr(shear_horizontal_tube(rho_l, k_l, mu_l, u_v, d_o))
    h_film = _arr(butterworth_combination(h_sh, h_grav))
    h = _mixture(h_film, z, h_vapour)
    # Nusselt's laminar film: film Reynolds number 4Γ/μ below about 1800 (wavy-laminar beyond, where Nusselt is
    # conservative); Γ per unit length from this h (common practice: Incropera & DeWitt 2002, sec. 10.6)
    re_film = 4.0 * h_grav * np.pi * d_o * dT / h_fg / mu_l * n_rows
    warnings = tuple(range_warning("Nusselt (1916) laminar film", "film Re (4Γ/μ, bottom tube)", re_film, None,
                                   1800.0, "Incropera & DeWitt (2002), sec. 10.6"))
    regime = (f"Butterworth (1977) combination of Nusselt (1916) with the {row_correction} row correction and "
              f"Shekriladze & Gomelauri (1966) shear" + ("; Bell & Ghaly (1973) mixture correction" if z is not None
                                                         else ""))
    return _film(h, h_grav, h_sh, h_film, regime, warnings)


def tube_condensation(G_total, x, d_i, rho_l, rho_v, mu_l, k_l, cp_l, h_fg, p_r, dT, z=None, h_vapour=None,
                      method="max", mu_v=None) -> CondensationFilm:
    """In-tube condensation in a horizontal tube (validated): Shah (1979) and the stratified form.

    Parameters
    ----------
    G_total : float or array_like
        Total mass flux [kg/m²/s], > 0.
    x : float or array_like
        Vapour mass fraction [-], 0 to 1.
    d_i : float or array_like
        Inside diameter [m].
    rho_l, rho_v, mu_l, k_l, cp_l, h_fg
        Condensate and vapour densities [kg/m³], condensate viscosity [Pa s], conductivity [W/m/K], heat
        capacity [J/kg/K], latent heat [J/kg].
    p_r : float or array_like
        Reduced pressure p / p_c [-] (a mixture: over its pseudo-critical pressure), 0 < p_r < 1.
    dT : float or array_like
        Saturation minus inner wall temperature [K], > 0 (stratified part).
    z, h_vapour : optional
        Bell & Ghaly's Z and the vapour coefficient [W/m²/K] (:func:`vapour_h_tube`) for a mixture.
    method : str
        ``"max"`` (default): the larger of Shah (1979) and the stratified Jaster & Kosky (1976) at each point;
        ``"shah"``: Shah alone; ``"stratified"``: the stratified form alone; ``"shah2009"``: Shah (2009)
        (:func:`shah_2009`, its own gravity part; needs ``mu_v``).
    mu_v : float or array_like, optional
        Vapour viscosity [Pa s], required by ``"shah2009"``.

    Returns
    -------
    CondensationFilm
        With warnings for Shah's reduced pressure, Re_LO and Pr_l outside :data:`SHAH_1979_RANGE`.
    """
    methods = ("max", "shah", "stratified", "shah2009")
    if method not in methods:
        raise InputError("method", method, f"one of {methods}")
    if method == "shah2009":
        if mu_v is None:
            raise InputError("mu_v", None, "the vapour viscosity [Pa s] (Shah 2009 needs it)")
        mu_v = _checked(mu_v, "viscosity", "mu_v", gt=0.0)
    G_total = _checked(G_total, "dimensionless", "G_total", gt=0.0)
    x = _checked(x, "dimensionless", "x", ge=0.0, le=1.0)
    d_i = _checked(d_i, "length", "d_i", gt=0.0)
    rho_l = _checked(rho_l, "density", "rho_l", gt=0.0)
    rho_v = _checked(rho_v, "density", "rho_v", gt=0.0)
    if np.any(rho_v >= rho_l):
        raise InputError("rho_v", float(np.max(rho_v)), "a vapour density below the liquid density")
    mu_l = _checked(mu_l, "viscosity", "mu_l", gt=0.0)
    k_l = _checked(k_l, "conductivity", "k_l", gt=0.0)
    cp_l = _checked(cp_l, "heat_capacity", "cp_l", gt=0.0)
    h_fg = _checked(h_fg, "dimensionless", "h_fg", gt=0.0)
    p_r = np.asarray(to_si(p_r, "dimensionless", "p_r"), dtype=float)
    if not np.all((p_r > 0.0) & (p_r < 1.0)):
        raise InputError("p_r", p_r, "a reduced pressure p/p_c between 0 and 1 (give the fluid's critical "
                                     "pressure: a table curve needs critical_pressure=)")
    dT = _checked(dT, "temperature_difference", "dT", gt=0.0)
    h_shah = _arr(shah_1979(G_total, x, d_i, rho_l, mu_l, k_l, cp_l, p_r))
    h_strat = _arr(stratified_jaster_kosky(x, rho_l, rho_v, k_l, mu_l, h_fg, d_i, dT))
    if method == "shah2009":
        h_film, h_shah, h_strat, _ = (_arr(v) for v in shah_2009_parts(G_total, x, d_i, rho_l, rho_v, mu_l, mu_v,
                                                                          k_l, cp_l, p_r))
    else:
        h_film = {"max": np.maximum(h_shah, h_strat), "shah": h_shah, "stratified": h_strat}[method]
    h = _mixture(h_film, z, h_vapour)
    warnings = []
    if method == "shah2009":
        src = "Shah (2009), HVAC&R Research 15:889 (from memory)"
        for q, vals in (("d_i", d_i), ("p_r", p_r), ("G", G_total), ("Pr_l", cp_l * mu_l / k_l)):
            lo, hi = SHAH_2009_RANGE[q]
            warnings += range_warning("Shah (2009) in-tube condensation", q, vals, lo, hi, src)
    elif method != "stratified":
        re_lo = G_total * d_i / mu_l
        pr_l = cp_l * mu_l / k_l
        src = "Shah (1979), Int. J. Heat Mass Transfer 22:547"
        for q, vals in (("p_r", p_r), ("Re_LO", re_lo), ("Pr_l", pr_l)):
            lo, hi = SHAH_1979_RANGE[q]
            warnings += range_warning("Shah (1979) in-tube condensation", q, vals, lo, hi, src)
    regime = {"max": "the larger of Shah (1979) and stratified Jaster & Kosky (1976)",
              "shah": "Shah (1979)", "stratified": "stratified Jaster & Kosky (1976)",
              "shah2009": "Shah (2009): h_shear its regime-I part, h_gravity its Nusselt part"}[method]
    if z is not None:
        regime += "; Bell & Ghaly (1973) mixture correction"
    return _film(h, h_strat, h_shah, h_film, regime, tuple(warnings))
