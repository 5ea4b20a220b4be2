"""Shell-side heat transfer and pressure drop by the Bell-Delaware method (Bell 1963; Taborek 1983).

The ideal tube-bank Colburn factor j and friction factor f come from Taborek's curve fits; corrections for the baffle
cut (Jc), baffle leakage (Jl, Rl), bundle bypass (Jb, Rb), unequal end spacings (Js, Rs) and the laminar adverse
temperature gradient (Jr) turn them into the exchanger's shell-side coefficient and pressure drop. Geometry is
scalar (a :class:`~revamp.geometry.BellGeometry`); flows and properties may be numpy arrays of any shape.

Taborek's ideal-bank fits (:data:`TABOREK_FITS`, :func:`ideal_j`, :func:`ideal_f`) and the blends across their seams
live in :mod:`revamp.correlations.shell_bell_fits` and are re-exported here; this module holds the correction
factors, the pressure drops, the nozzles and the kernels.

References
----------
Bell, K. J. (1963). Final report of the cooperative research program on shell and tube heat exchangers. University
of Delaware Engineering Experiment Station Bulletin 5.
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. In *Heat Exchanger Design Handbook*, §3.3,
Hemisphere. (Curve fits of the ideal j and f; the J and R correlations.)
Serth, R. W., Lestina, T. (2014). *Process Heat Transfer*, 2nd ed., Academic Press, ch. 6, Table 6.1 (the same fits).
"""
from __future__ import annotations

import dataclasses
import functools
import math
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError
from ..units import require, to_si
from ._validity import range_warning
# Taborek's ideal-bank fits and the seam blends live in shell_bell_fits; re-exported here (shell.py, the tests and
# the benchmarks import them from this module)
from .shell_bell_fits import (_EDGES, _FIT_BLEND, _HALF_BAND, _LAMINAR_RE, _LN_EDGES, _LN_LAMINAR,  # noqa: F401
                              _LN_SWITCH, _SWITCH_BLEND, TABOREK_FITS, _fit, _fit_coefficients, _fit_ln,
                              _fit_ln_float, _fit_scalar, _log_blend, _weight, ideal_f, ideal_j)

__all__ = ["ShellSideResult", "bell_delaware", "ideal_j", "ideal_f", "correction_factors", "baffle_cut_factor",
           "nozzle_pressure_drop", "TABOREK_FITS", "bell_delaware_kernel",
           "bell_delaware_warnings"]

_SOURCE = "Taborek (1983), HEDH §3.3"


@dataclass(frozen=True)
class ShellSideResult:
    """Shell-side result for one shell. Arrays (or floats for scalar inputs); SI units.

    Attributes
    ----------
    h : film coefficient on the outside tube surface [W/m²/K].
    dp : pressure drop of one shell, crossflow + window + end zones + nozzles (when a nozzle diameter was given) [Pa].
    dp_crossflow, dp_window, dp_ends : its parts [Pa] (NaN where the method does not split them).
    dp_nozzles : inlet plus outlet nozzle loss of one shell [Pa] (0 without a nozzle diameter; see
    :func:`nozzle_pressure_drop`).
    Re : shell-side Reynolds number [-]. velocity_crossflow : velocity at the crossflow area [m/s].
    j_ideal, f_ideal : ideal tube-bank factors [-]. Jc, Jl, Jb, Js, Jr, Rl, Rb, Rs : Bell-Delaware factors [-].
    warnings : list of str, validity-range warnings. method : str, the method used.
    """

    h: object
    dp: object
    dp_crossflow: object
    dp_window: object
    dp_ends: object
    Re: object
    velocity_crossflow: object
    j_ideal: object
    f_ideal: object
    Jc: object
    Jl: object
    Jb: object
    Js: object
    Jr: object
    Rl: object
    Rb: object
    Rs: object
    dp_nozzles: object = 0.0
    warnings: list = field(default_factory=list)
    method: str = "bell-delaware"


def baffle_cut_factor(Fc):
    """Baffle-cut correction Jc [-] from the fraction of tubes in crossflow ``Fc``, bounded as Bell's chart is.

    ``Jc = 0.55 + 0.72 Fc`` (Taborek's linear fit of Bell's chart, stated for baffle cuts of 15-45 %), capped at 1.15
    (the chart's maximum, reached near Fc = 0.9), and for Fc > 0.9 ``1.15 - 15 (Fc - 0.9)²``, which falls to 1.0 at
    Fc = 1 (no tubes in the windows), joining the cap with zero slope. The linear fit alone would give 1.27 at Fc = 1.

    Parameters
    ----------
    Fc : float or array_like
        Fraction of the tubes in crossflow between the baffle tips [-], 0 to 1.

    Returns
    -------
    float or ndarray
        Jc [-].

    References
    ----------
    Bell (1963), Bulletin 5 (the chart); Taborek (1983), HEDH §3.3 (the linear fit; "Jc is 1.0 with no tubes in the
    windows and rises to about 1.15 for small windows", paraphrased from memory). The curved top end (a parabola with
    its vertex at the cap) is our fit to the shape of the chart, not a published formula.

    Examples
    --------
    >>> round(baffle_cut_factor(0.5), 3), round(baffle_cut_factor(0.95), 4), round(baffle_cut_factor(1.0), 3)
    (0.91, 1.1125, 1.0)
    """
    Fc = np.asarray(Fc, dtype=float)
    out = np.where(Fc <= 0.9, np.minimum(0.55 + 0.72 * Fc, 1.15), 1.15 - 15.0 * (Fc - 0.9) ** 2)
    return float(out) if out.ndim == 0 else out


def _geometry_factors(geom):
    """Geometry-only parts of the corrections (scalars): leakage and bypass exponents, Jc, Jl, Rl."""
    Fc = geom.Fc
    leak = geom.Ssb + geom.Stb
    rs = geom.Ssb / leak if leak > 0 else 0.0
    rlm = leak / geom.Sm
    Jc = baffle_cut_factor(Fc)
    Jl = 0.44 * (1.0 - rs) + (1.0 - 0.44 * (1.0 - rs)) * math.exp(-2.2 * rlm)
    p = -0.15 * (1.0 + rs) + 0.8
    Rl = math.exp(-1.33 * (1.0 + rs) * rlm ** p) if rlm > 0 else 1.0
    rss = geom.Nss / geom.Nc if geom.Nc > 0 else 0.0
    bypass = geom.Fsbp * (1.0 - (2.0 * rss) ** (1.0 / 3.0)) if rss < 0.5 else 0.0
    return Jc, Jl, Rl, bypass


def correction_factors(geom, Re):
    """The Bell-Delaware correction factors at Reynolds number(s) ``Re`` (Taborek 1983, HEDH §3.3).

    Parameters
    ----------
    geom : BellGeometry
        Shell geometry.
    Re : float or array_like
        Shell-side Reynolds number [-]. Below Re = 40 the laminar constants apply, above 250 the turbulent
        ones; between, the two factors are blended geometrically, smoothstep in ln Re (our choice, no published
        source: Taborek switches at Re = 100, which makes h and Δp jump).

    Returns
    -------
    dict
        ``Jc, Jl, Jb, Js, Jr, Rl, Rb, Rs`` [-]:

        - Jc = 0.55 + 0.72 Fc, bounded as Bell's chart (:func:`baffle_cut_factor`)
        - Jl = 0.44 (1 - rs) + [1 - 0.44 (1 - rs)] exp(-2.2 rlm), rs = Ssb/(Ssb + Stb), rlm = (Ssb + Stb)/Sm
        - Jb = exp[-Cbh Fsbp (1 - (2 rss)^(1/3))], Cbh = 1.35 (Re < 100) or 1.25; 1 for rss >= 1/2
        - Js = [(Nb - 1) + (Lbi/Lbc)^(1-n) + (Lbo/Lbc)^(1-n)] / [(Nb - 1) + Lbi/Lbc + Lbo/Lbc], n = 1/3 or 0.6
        - Jr = (10/Nct)^0.18 for Re <= 20, Nct = (Nb + 1)(Nc + Ncw); linear to 1 at Re = 100; not below 0.4
        - Rl = exp[-1.33 (1 + rs) rlm^p], p = -0.15 (1 + rs) + 0.8
        - Rb = exp[-Cbp Fsbp (1 - (2 rss)^(1/3))], Cbp = 4.5 (Re < 100) or 3.7
        - Rs = [(Lbc/Lbo)^(2-n') + (Lbc/Lbi)^(2-n')] / 2, n' = 1 or 0.2
    """
    Re = np.asarray(Re, dtype=float)
    w = _weight(Re, _LAMINAR_RE, _SWITCH_BLEND)  # 0 laminar, 1 turbulent constants, blended between
    Jc, Jl, Rl, bypass = _geometry_factors(geom)
    # exp(-C x) with C linear in w is the geometric blend of the laminar and turbulent factors
    Jb = np.exp(-(1.35 + (1.25 - 1.35) * w) * bypass)
    Rb = np.exp(-(4.5 + (3.7 - 4.5) * w) * bypass)
    ri, ro = geom.Lbi / geom.Lbc, geom.Lbo / geom.Lbc

    def js(n):
        return ((geom.Nb - 1) + ri ** (1 - n) + ro ** (1 - n)) / ((geom.Nb - 1) + ri + ro)

    def rs(n2):
        return 0.5 * ((1.0 / ro) ** (2 - n2) + (1.0 / ri) ** (2 - n2))

    Js = _log_blend(js(1.0 / 3.0), js(0.6), w)
    Rs = _log_blend(rs(1.0), rs(0.2), w)
    nct = (geom.Nb + 1) * (geom.Nc + geom.Ncw)
    jr20 = max((10.0 / nct) ** 0.18, 0.4) if nct > 0 else 1.0
    Jr = np.where(Re <= 20.0, jr20, np.where(Re < _LAMINAR_RE, jr20 + (Re - 20.0) / 80.0 * (1.0 - jr20), 1.0))
    Jr = np.maximum(Jr, 0.4)
    shape = Re.shape
    full = lambda v: np.broadcast_to(np.asarray(v, dtype=float), shape)  # noqa: E731
    return dict(Jc=full(Jc), Jl=full(Jl), Jb=Jb, Js=Js, Jr=Jr, Rl=full(Rl), Rb=Rb, Rs=Rs)


def _window_dp(geom, Gw, Re, rho, mu):
    """Ideal window pressure drop [Pa]: Taborek's laminar form below the switch band, turbulent above, and across
    the band a geometric interpolation, smoothstep in ln Re, from the laminar value at the band's lower end to the
    turbulent value at its upper end (both at this fluid's properties). That rises with flow whenever the turbulent
    value at the upper end exceeds the laminar one at the lower end, i.e. while the laminar/turbulent ratio at
    Re = 100 stays below ``_SWITCH_BLEND**3`` (15.6; about 7 seen in practical bundles)."""
    a = 26.0 * mu / rho * (geom.Ncw / (geom.pitch - geom.tube_od) + geom.Lbc / geom.Dw ** 2)

    def lam(g):
        return a * g + g ** 2 / rho

    def turb(g):
        return (2.0 + 0.6 * geom.Ncw) * g ** 2 / (2.0 * rho)

    w = _weight(Re, _LAMINAR_RE, _SWITCH_BLEND)
    if np.all(w >= 1.0):
        return turb(Gw)
    if np.all(w <= 0.0):
        return lam(Gw)
    lo, hi = _LAMINAR_RE / _SWITCH_BLEND, _LAMINAR_RE * _SWITCH_BLEND
    band = _log_blend(lam(Gw * lo / Re), turb(Gw * hi / Re), w)
    return np.where(w <= 0.0, lam(Gw), np.where(w >= 1.0, turb(Gw), band))


#: Nozzle loss in velocity heads of the nozzle flow, per shell: 1.0 at the inlet (sudden expansion into the shell)
#: plus 0.5 at the outlet (sudden contraction into the nozzle).
NOZZLE_VELOCITY_HEADS = 1.5


def nozzle_pressure_drop(m_dot, d_nozzle, rho_nozzle):
    """Shell-side inlet plus outlet nozzle pressure drop of one shell [Pa].

    ``Δp = 1.5 ρ v²/2`` with ``v = m / (ρ π d²/4)``: one velocity head lost where the nozzle jet expands into the
    shell and half a velocity head where the flow contracts into the outlet nozzle (loss coefficients of a sudden
    expansion and a sudden contraction of large area ratio).

    Parameters
    ----------
    m_dot : float or array_like
        Mass flow through one shell [kg/s].
    d_nozzle : float
        Nozzle inside diameter [m] (inlet and outlet taken equal).
    rho_nozzle : float or array_like
        Density of the fluid in the nozzles [kg/m³].

    Returns
    -------
    float or ndarray
        Δp [Pa].

    References
    ----------
    Perry, R. H., Green, D. W. (2008). *Perry's Chemical Engineers' Handbook*, 8th ed., §6 (loss coefficients: about
    1 for a sudden expansion into a large space, 0.5 for a sudden contraction from one; from memory). The same total,
    1.5 velocity heads per shell in turbulent nozzle flow, is the shell-nozzle rule of Serth & Lestina (2014),
    *Process Heat Transfer*, ch. 5-6 (ΔPn = 7.5e-4 Ns Gn²/s in SI with s the specific gravity; from memory).

    Examples
    --------
    10 kg/s of water (1000 kg/m³) through a 0.1 m nozzle: v = 1.273 m/s, Δp = 1.5 · 1000 · 1.273²/2 = 1216 Pa.

    >>> round(nozzle_pressure_drop(10.0, 0.1, 1000.0))
    1216
    """
    rho_n = np.asarray(rho_nozzle, dtype=float)
    v = np.asarray(m_dot, dtype=float) / (rho_n * math.pi * d_nozzle ** 2 / 4.0)
    out = NOZZLE_VELOCITY_HEADS * rho_n * v ** 2 / 2.0
    return float(out) if out.ndim == 0 else out


def _nozzles(m, rho, d_nozzle, rho_nozzle):
    """Parse the optional nozzle arguments of the shell-side methods and return the nozzle Δp (0 without them)."""
    if d_nozzle is None:
        if rho_nozzle is not None:
            raise InputError("rho_nozzle", rho_nozzle, "None unless d_nozzle is given")
        return np.zeros(np.broadcast(m, rho).shape)
    dn = to_si(d_nozzle, "length", "d_nozzle")
    if np.ndim(dn) != 0 or not np.isfinite(dn) or not dn > 0:
        raise InputError("d_nozzle", d_nozzle, "one nozzle inside diameter > 0 (m, or a string with a unit)")
    rn = rho if rho_nozzle is None else require(np.asarray(to_si(rho_nozzle, "density", "rho_nozzle"), dtype=float),
                                                 "rho_nozzle", gt=0)
    return np.asarray(nozzle_pressure_drop(m, float(dn), rn), dtype=float)


def _scalar(x, scalar):
    x = np.asarray(x, dtype=float)
    return float(x) if scalar else x


def bell_delaware(geom, m_dot, rho, cp, mu, k, mu_wall=None, d_nozzle=None, rho_nozzle=None) -> ShellSideResult:
    """Shell-side coefficient and pressure drop of one shell by the Bell-Delaware method.

    Parameters
    ----------
    geom : BellGeometry
        Geometry of one shell (:meth:`revamp.geometry.ShellAndTube.bell`).
    m_dot : float or array_like
        Mass flow through one shell [kg/s].
    rho : float or array_like
        Density [kg/m³].
    cp : float or array_like
        Specific heat capacity [J/kg/K].
    mu : float or array_like
        Viscosity at the bulk temperature [Pa·s].
    k : float or array_like
        Thermal conductivity [W/m/K].
    mu_wall : float or array_like, optional
        Viscosity at the wall temperature [Pa·s]; None for no viscosity correction.
    d_nozzle : float or str, optional
        Shell nozzle inside diameter [m] (inlet and outlet); adds :func:`nozzle_pressure_drop` to ``dp`` and
        reports it as ``dp_nozzles``. None (default): no nozzle loss.
    rho_nozzle : float or array_like, optional
        Density in the nozzles [kg/m³] (e.g. at the inlet temperature); default ``rho``.

    Returns
    -------
    ShellSideResult
        ``h = j_i cp (m/Sm) Pr^(-2/3) (μ/μw)^0.14 Jc Jl Jb Js Jr``; ``dp = Δpc + Δpw + Δpe`` with
        Δpbi = 2 f_i Nc (m/Sm)²/ρ (μw/μ)^0.14, Δpc = (Nb - 1) Δpbi Rb Rl, Δpw = Nb Δpwi Rl,
        Δpwi = (2 + 0.6 Ncw) mw²/(2ρ) for Re >= 250 and 26 μ mw/ρ [Ncw/(Pt - do) + Lbc/Dw²] + mw²/ρ below 40
        (Taborek switches at 100; between, a geometric interpolation of the band-end values, smoothstep in ln Re),
        mw = m/sqrt(Sm Sw), Δpe = 2 Δpbi (1 + Ncw/Nc) Rb Rs.

    Notes
    -----
    Validity: about 1 < Re < 1e5 (the ideal-bank fits), baffle cut 15-45 % of Ds, central spacing 0.2-1.0 Ds
    (Taborek 1983). Outside these the numbers are returned with a warning. Pass-partition lanes are not counted
    in the bypass area. The laminar window form above is written from memory of HEDH and is checked only against
    itself. Nozzle losses are added only when ``d_nozzle`` is given.

    References
    ----------
    Bell (1963); Taborek (1983), HEDH §3.3; Serth & Lestina (2014) ch. 6.
    """
    m = require(np.asarray(m_dot, dtype=float), "m_dot", gt=0)
    rho = require(np.asarray(rho, dtype=float), "rho", gt=0)
    cp = require(np.asarray(cp, dtype=float), "cp", gt=0)
    mu = require(np.asarray(mu, dtype=float), "mu", gt=0)
    k = require(np.asarray(k, dtype=float), "k", gt=0)
    scalar = all(np.ndim(v) == 0 for v in (m_dot, rho, cp, mu, k, mu_wall if mu_wall is not None else 0.0))
    if mu_wall is not None:
        mu_wall = require(np.asarray(mu_wall, dtype=float), "mu_wall", gt=0)
    dn, rn = None, None
    if d_nozzle is None:
        if rho_nozzle is not None:
            raise InputError("rho_nozzle", rho_nozzle, "None unless d_nozzle is given")
    else:
        dn = to_si(d_nozzle, "length", "d_nozzle")
        if np.ndim(dn) != 0 or not np.isfinite(dn) or not dn > 0:
            raise InputError("d_nozzle", d_nozzle, "one nozzle inside diameter > 0 (m, or a string with a unit)")
        dn = float(dn)
        if rho_nozzle is not None:
            rn = require(np.asarray(to_si(rho_nozzle, "density", "rho_nozzle"), dtype=float), "rho_nozzle", gt=0)
    res = bell_delaware_kernel(geom, m, rho, cp, mu, k, mu_wall, dn, rn)
    scalar = scalar and (rho_nozzle is None or np.ndim(rho_nozzle) == 0)
    numeric = {f.name: getattr(res, f.name) for f in dataclasses.fields(res)
               if isinstance(getattr(res, f.name), (float, np.floating, np.ndarray))}
    shape = np.broadcast_shapes(*(np.shape(v) for v in numeric.values()))
    return dataclasses.replace(res, **{name: float(v) if scalar else np.array(np.broadcast_to(v, shape), dtype=float)
                                       for name, v in numeric.items()})


@functools.lru_cache(maxsize=256)
def _constants(geom):
    """The geometry-only numbers of the method for one shell, computed once per geometry (see
    :func:`correction_factors`): the baffle-cut, leakage and bypass factors, the end-spacing factors and window
    pressure-drop coefficients of both regimes, and the pitch-ratio logarithm of the ideal-bank fits."""
    Jc, Jl, Rl, bypass = _geometry_factors(geom)
    ri, ro = geom.Lbi / geom.Lbc, geom.Lbo / geom.Lbc

    def js(n):
        return ((geom.Nb - 1) + ri ** (1 - n) + ro ** (1 - n)) / ((geom.Nb - 1) + ri + ro)

    def rs(n2):
        return 0.5 * ((1.0 / ro) ** (2 - n2) + (1.0 / ri) ** (2 - n2))

    nct = (geom.Nb + 1) * (geom.Nc + geom.Ncw)
    jr20 = max((10.0 / nct) ** 0.18, 0.4) if nct > 0 else 1.0
    return dict(
        Jc=float(Jc), Jl=Jl, Rl=Rl, bypass=bypass, Js_lam=js(1.0 / 3.0), Js_turb=js(0.6), Rs_lam=rs(1.0),
        Rs_turb=rs(0.2), jr20=jr20, ln_ratio=math.log(1.33 / (geom.pitch / geom.tube_od)),
        Jb_turb=math.exp(-(1.35 + (1.25 - 1.35) * 1.0) * bypass), Rb_turb=math.exp(-(4.5 + (3.7 - 4.5) * 1.0) * bypass),
        window_lam=26.0 * (geom.Ncw / (geom.pitch - geom.tube_od) + geom.Lbc / geom.Dw ** 2),
        window_turb=(2.0 + 0.6 * geom.Ncw) / 2.0, sqrt_smsw=math.sqrt(geom.Sm * geom.Sw),
        fit_j=_fit_coefficients(int(geom.layout), "j"), fit_f=_fit_coefficients(int(geom.layout), "f"),
    )


def bell_delaware_kernel(geom, m, rho, cp, mu, k, mu_wall=None, d_nozzle=None, rho_nozzle=None,
                         warn=True, h_only=False) -> ShellSideResult:
    """:func:`bell_delaware` without input checks or unit parsing: SI float arrays in (any shape, broadcast
    together), the same numbers out.

    The rating loop's kernel (inputs checked once at the edge). The geometry-only parts are computed once per
    geometry; the ideal-bank j and f share one logarithm of Re and are formed as one exponential each; the
    Reynolds-dependent corrections are constants when every case is past the laminar-turbulent band. Correction
    factors that are the same for every case come back as floats. ``warn=False`` skips the validity warnings
    (the loop asks for them only on its last evaluation). ``d_nozzle`` is a diameter [m] or None. ``h_only=True``
    returns h, Re and the heat-transfer factors only (the pressure-drop fields are None): what an iteration on the
    outlet temperatures needs.
    """
    c = _constants(geom)
    G = m / geom.Sm
    Re = geom.tube_od * G / mu
    Pr = cp * mu / k
    lr = np.log(Re)
    if h_only:
        (ln_j,) = _fit_ln(lr, c["ln_ratio"], (c["fit_j"],))
        j, f = np.exp(ln_j), None
    else:
        ln_j, ln_f = _fit_ln(lr, c["ln_ratio"], (c["fit_j"], c["fit_f"]))
        j, f = np.exp(ln_j), np.exp(ln_f)
    # 0 laminar, 1 turbulent constants, blended between (see correction_factors)
    u = 0.5 + (lr - _LN_LAMINAR) / (2.0 * _LN_SWITCH)
    if np.min(u) >= 1.0:  # every case past the band: the turbulent constants
        Jb, Rb, Js, Rs, Jr = c["Jb_turb"], c["Rb_turb"], c["Js_turb"], c["Rs_turb"], 1.0
        turbulent = True
    else:
        u = np.minimum(np.maximum(u, 0.0), 1.0)
        w = u * u * (3.0 - 2.0 * u)
        Jb = np.exp(-(1.35 + (1.25 - 1.35) * w) * c["bypass"])
        Rb = np.exp(-(4.5 + (3.7 - 4.5) * w) * c["bypass"])
        Js = _log_blend(c["Js_lam"], c["Js_turb"], w)
        Rs = _log_blend(c["Rs_lam"], c["Rs_turb"], w)
        jr20 = c["jr20"]
        Jr = np.maximum(np.where(Re <= 20.0, jr20, np.where(Re < _LAMINAR_RE, jr20 + (Re - 20.0) / 80.0 * (1.0 - jr20),
                                                             1.0)), 0.4)
        turbulent = False
    Jc, Jl, Rl = c["Jc"], c["Jl"], c["Rl"]
    if h_only:
        h = j * cp * G * Pr ** (-2.0 / 3.0) * (1.0 if mu_wall is None else (mu / mu_wall) ** 0.14) * (
            Jc * Jl * Jb * Js * Jr)
        return ShellSideResult(h=h, dp=None, dp_crossflow=None, dp_window=None, dp_ends=None, Re=Re,
                               velocity_crossflow=None, j_ideal=j, f_ideal=None, Jc=Jc, Jl=Jl, Jb=Jb, Js=Js, Jr=Jr,
                               Rl=Rl, Rb=Rb, Rs=Rs, dp_nozzles=None)
    if mu_wall is None:
        h = j * cp * G * Pr ** (-2.0 / 3.0) * (Jc * Jl * Jb * Js * Jr)
        dp_bi = 2.0 * geom.Nc * f * G ** 2 / rho
    else:
        phi = (mu / mu_wall) ** 0.14
        h = j * cp * G * Pr ** (-2.0 / 3.0) * phi * (Jc * Jl * Jb * Js * Jr)
        dp_bi = 2.0 * geom.Nc * f * G ** 2 / rho / phi
    dp_c = dp_bi * ((geom.Nb - 1) * Rb * Rl)
    Gw = m / c["sqrt_smsw"]
    if turbulent:
        dp_wi = c["window_turb"] * Gw ** 2 / rho
    else:
        dp_wi = _window_dp(geom, Gw, Re, rho, mu)
    dp_w = dp_wi * (geom.Nb * Rl)
    dp_e = dp_bi * (2.0 * (1.0 + geom.Ncw / geom.Nc) * Rb * Rs)
    if d_nozzle is None:
        dp_n = 0.0
        dp = dp_c + dp_w + dp_e
    else:
        dp_n = nozzle_pressure_drop(m, d_nozzle, rho if rho_nozzle is None else rho_nozzle)
        dp = dp_c + dp_w + dp_e + dp_n
    warnings = bell_delaware_warnings(geom, Re, Jl, Jb) if warn else []
    return ShellSideResult(
        h=h, dp=dp, dp_nozzles=dp_n, dp_crossflow=dp_c, dp_window=dp_w, dp_ends=dp_e, Re=Re,
        velocity_crossflow=G / rho, j_ideal=j, f_ideal=f, Jc=Jc, Jl=Jl, Jb=Jb, Js=Js, Jr=Jr, Rl=Rl, Rb=Rb, Rs=Rs,
        warnings=warnings)


def bell_delaware_warnings(geom, Re, Jl, Jb) -> list[str]:
    """The validity warnings of a Bell-Delaware result: Re of the ideal-bank fits, baffle cut and central spacing
    (Taborek 1983), and leakage (Jl) or bypass (Jb) corrections below Taborek's design guidance."""
    warnings = range_warning("Bell-Delaware ideal tube-bank fits", "Re", Re, 1.0, 1e5, _SOURCE)
    warnings += range_warning("Bell-Delaware", "baffle cut (fraction of Ds)", geom.Bc, 0.15, 0.45, _SOURCE)
    warnings += range_warning("Bell-Delaware", "central baffle spacing / Ds", geom.Lbc / geom.Ds, 0.2, 1.0, _SOURCE)
    # Leakage and bypass streams this large make the method less reliable and the bundle a poor design: Taborek
    # advises keeping Jl above about 0.6 and Jb above about 0.7 (design guidance, from memory).
    jl_min, jb_min = float(np.min(Jl)), float(np.min(Jb))
    if jl_min < 0.6:
        warnings.append(f"Bell-Delaware: leakage correction Jl = {jl_min:.2f} < 0.6: baffle leakage streams are large "
                        "(tighter clearances or a wider baffle spacing help); h and dp are less certain")
    if jb_min < 0.7:
        warnings.append(f"Bell-Delaware: bypass correction Jb = {jb_min:.2f} < 0.7: bundle bypass is large (sealing "
                        "strips help); h and dp are less certain")
    return warnings


def bell_delaware_h_float(geom, m, cp, mu, k, mu_wall):
    """The film coefficient and Reynolds number of :func:`bell_delaware_kernel` for one case, on Python floats:
    ``(h [W/m²K], Re [-])``. The single-case rating iterates on it; its result is then evaluated once more by the
    array kernel, so the two must agree (checked by the tests)."""
    c = _constants(geom)
    G = m / geom.Sm
    Re = geom.tube_od * G / mu
    Pr = cp * mu / k
    lr = math.log(Re)
    j = math.exp(_fit_ln_float(Re, lr, c["ln_ratio"], c["fit_j"]))
    u = 0.5 + (lr - _LN_LAMINAR) / (2.0 * _LN_SWITCH)
    if u >= 1.0:
        Jb, Js, Jr = c["Jb_turb"], c["Js_turb"], 1.0
    else:
        u = min(max(u, 0.0), 1.0)
        w = u * u * (3.0 - 2.0 * u)
        Jb = math.exp(-(1.35 + (1.25 - 1.35) * w) * c["bypass"])
        lo, hi = c["Js_lam"], c["Js_turb"]
        Js = lo if w <= 0.0 else hi if w >= 1.0 else lo ** (1.0 - w) * hi ** w
        jr20 = c["jr20"]
        Jr = max(jr20 if Re <= 20.0 else jr20 + (Re - 20.0) / 80.0 * (1.0 - jr20) if Re < _LAMINAR_RE else 1.0,
                 0.4)
    h = j * cp * G * Pr ** (-2.0 / 3.0) * (mu / mu_wall) ** 0.14 * (c["Jc"] * c["Jl"] * Jb * Js * Jr)
    return h, Re
