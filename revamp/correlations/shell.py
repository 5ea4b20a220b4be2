"""Shell-side correlations: Bell-Delaware (:mod:`.shell_bell`), Kern (:mod:`.shell_kern`) and the crossflow bundle
of a TEMA X shell, one import path.

``SHELL_METHODS`` maps the method names the rating accepts to their functions.

References
----------
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. In *Heat Exchanger Design Handbook*, §3.3,
Hemisphere (ideal tube-bank j and f; bypass and laminar corrections).
"""
from __future__ import annotations

import dataclasses

import numpy as np

from ..units import require
from ._validity import range_warning
from .shell_bell import TABOREK_FITS, ShellSideResult, bell_delaware, correction_factors, ideal_f, ideal_j
from .shell_kern import kern, kern_equivalent_diameter

__all__ = ["ShellSideResult", "bell_delaware", "kern", "ideal_j", "ideal_f", "correction_factors",
           "kern_equivalent_diameter", "TABOREK_FITS", "SHELL_METHODS", "crossflow_bundle"]

SHELL_METHODS = {"bell-delaware": bell_delaware, "kern": kern}


def crossflow_bundle(geom, m_dot, rho, cp, mu, k, mu_wall=None) -> ShellSideResult:
    """Shell side of a TEMA X shell: one pass of crossflow across the whole bundle, no baffle windows.

    The ideal tube-bank factors of Taborek's fits at the crossflow area of the whole tube length,
    ``Sm = L [Lbb + Dctl/Ptef (Pt - do)]``, over ``Nc = Ds/Pp`` rows, with the bundle-bypass correction (Jb, Rb)
    and the laminar adverse-gradient correction (Jr) of the Bell-Delaware method; no baffle-cut, baffle-leakage or
    end-spacing corrections (there are no baffles):
    ``h = j cp (m/Sm) Pr^(-2/3) (μ/μw)^0.14 Jb Jr``, ``Δp = 2 f Nc (m/Sm)² / ρ (μw/μ)^0.14 Rb``.

    Parameters
    ----------
    geom : BellGeometry
        Geometry of one shell (Sm per central baffle spacing, Lbc, length, Ds, Pp, tube_od, pitch, layout, Fsbp, Nss).
    m_dot : float or array_like
        Mass flow through one shell [kg/s].
    rho, cp, mu, k : float or array_like
        Density [kg/m³], heat capacity [J/kg/K], bulk viscosity [Pa·s], conductivity [W/m/K].
    mu_wall : float or array_like, optional
        Viscosity at the wall temperature [Pa·s].

    Returns
    -------
    ShellSideResult
        Window and end-zone parts are 0; Jc, Jl, Js, Rl, Rs are 1.

    Notes
    -----
    The stream is taken as spread evenly along the tubes (a distributor belt or several nozzles); support plates
    and nozzle losses are not counted. Screening-level: X shells are chosen for low pressure drop, and the
    maldistribution along a long bundle is the main uncertainty.

    References
    ----------
    Taborek (1983), HEDH §3.3 (the ideal-bank fits and the J/R corrections reused here).
    """
    m = require(np.asarray(m_dot, dtype=float), "m_dot", gt=0)
    rho = require(np.asarray(rho, dtype=float), "rho", gt=0)
    cp = require(np.asarray(cp, dtype=float), "cp", gt=0)
    mu = require(np.asarray(mu, dtype=float), "mu", gt=0)
    k = require(np.asarray(k, dtype=float), "k", gt=0)
    scalar = all(np.ndim(v) == 0 for v in (m_dot, rho, cp, mu, k, mu_wall if mu_wall is not None else 0.0))
    phi = 1.0 if mu_wall is None else (mu / require(np.asarray(mu_wall, dtype=float), "mu_wall", gt=0)) ** 0.14
    sm = geom.Sm * geom.length / geom.Lbc
    nc = geom.Ds / geom.pitch_parallel
    whole = dataclasses.replace(geom, Sm=sm, Sb=geom.Sb * geom.length / geom.Lbc, Nc=nc, Ncw=0.0, Nb=0,
                                Lbc=geom.length, Lbi=geom.length, Lbo=geom.length)
    G = m / sm
    Re = geom.tube_od * G / mu
    Pr = cp * mu / k
    ratio = geom.pitch / geom.tube_od
    j = ideal_j(Re, ratio, geom.layout)
    f = ideal_f(Re, ratio, geom.layout)
    c = correction_factors(whole, Re)
    h = j * cp * G * Pr ** (-2.0 / 3.0) * phi * c["Jb"] * c["Jr"]
    dp = 2.0 * f * nc * G ** 2 / rho / phi * c["Rb"]
    warnings = range_warning("Taborek ideal tube-bank fits (X shell)", "Re", Re, 1.0, 1e5, "Taborek (1983), HEDH §3.3")
    warnings.append("X shell: ideal tube-bank crossflow over the whole bundle with the bypass correction; the "
                    "stream is assumed spread evenly along the tubes (support plates, distributor and nozzles "
                    "not counted)")

    def s(x):
        x = np.broadcast_to(np.asarray(x, dtype=float), np.shape(Re))
        return float(x) if scalar else np.array(x)

    one, zero = s(1.0), s(0.0)
    return ShellSideResult(h=s(h), dp=s(dp), dp_crossflow=s(dp), dp_window=zero, dp_ends=zero, Re=s(Re),
                           velocity_crossflow=s(G / rho), j_ideal=s(j), f_ideal=s(f), Jc=one, Jl=one, Jb=s(c["Jb"]),
                           Js=one, Jr=s(c["Jr"]), Rl=one, Rb=s(c["Rb"]), Rs=one, warnings=warnings,
                           method="crossflow bundle (X shell)")
