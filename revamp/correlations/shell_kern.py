"""Shell-side coefficient and pressure drop by Kern's method (Kern 1950), a simple cross-check of Bell-Delaware.

Kern treats the shell side as flow through an equivalent diameter De at the crossflow area of the shell centre
row, ``As = Ds (Pt - do) B / Pt``; it ignores leakage and bypass streams, so it is a cross-check only.

References
----------
Kern, D. Q. (1950). *Process Heat Transfer*, McGraw-Hill, ch. 7 (h, Δp and the equivalent diameter;
his Fig. 28 tabulates De).
Kakaç, S., Liu, H. (2002). *Heat Exchangers: Selection, Rating and Thermal Design*, 2nd ed., CRC Press,
ch. 8 (from memory):
the fit f = exp(0.576 - 0.19 ln Re) of Kern's shell-side friction chart, 400 < Re <= 1e6, for the SI form
Δp = f Gs² (Nb + 1) Ds / (2 ρ De (μ/μw)^0.14).
"""
from __future__ import annotations

import math

import numpy as np

from ..units import require
from ._validity import range_warning
from .shell_bell import ShellSideResult, _nozzles, _scalar

__all__ = ["kern", "kern_equivalent_diameter"]


def kern_equivalent_diameter(tube_od: float, pitch: float, layout: int) -> float:
    """Kern's shell-side equivalent diameter De [m].

    Square (90°) and rotated square (45°): ``4 (Pt² - π do²/4) / (π do)``; triangular (30°, 60°):
    ``4 (0.866 Pt²/2 - π do²/8) / (π do / 2)`` (Kern 1950, ch. 7).

    Examples
    --------
    1 in tubes on a 1-1/4 in square pitch (Kern's Fig. 28 gives 0.99 in):

    >>> round(kern_equivalent_diameter(0.0254, 0.03175, 90) / 0.0254, 3)
    0.989
    """
    if int(layout) in (45, 90):
        return 4.0 * (pitch ** 2 - math.pi * tube_od ** 2 / 4.0) / (math.pi * tube_od)
    return 4.0 * (math.sqrt(3.0) / 4.0 * pitch ** 2 - math.pi * tube_od ** 2 / 8.0) / (math.pi * tube_od / 2.0)


def kern(geom, m_dot, rho, cp, mu, k, mu_wall=None, d_nozzle=None, rho_nozzle=None) -> ShellSideResult:
    """Shell-side coefficient and pressure drop of one shell by Kern's method.

    ``ho De / k = 0.36 Re^0.55 Pr^(1/3) (μ/μw)^0.14`` with ``Re = De Gs / μ``, ``Gs = m/As``,
    ``As = Ds (Pt - do) Lbc / Pt``; ``Δp = f Gs² (Nb + 1) Ds / (2 ρ De (μ/μw)^0.14)``,
    ``f = exp(0.576 - 0.19 ln Re)``.

    Parameters
    ----------
    geom : BellGeometry
        Geometry of one shell (Ds, tube_od, pitch, layout, Lbc and Nb are used).
    m_dot : float or array_like
        Mass flow through one shell [kg/s].
    rho, cp, mu, k : float or array_like
        Density [kg/m³], heat capacity [J/kg/K], bulk viscosity [Pa·s], conductivity [W/m/K].
    mu_wall : float or array_like, optional
        Viscosity at the wall temperature [Pa·s].
    d_nozzle : float or str, optional
        Shell nozzle inside diameter [m]; adds the nozzle loss of
        :func:`revamp.correlations.shell_bell.nozzle_pressure_drop` (1.5 velocity heads per shell) to ``dp`` and
        reports it as ``dp_nozzles``. None (default): no nozzle loss.
    rho_nozzle : float or array_like, optional
        Density in the nozzles [kg/m³]; default ``rho``.

    Returns
    -------
    ShellSideResult
        ``h``, ``dp``, ``Re`` (on De), ``velocity_crossflow`` (at As), ``f_ideal`` holds Kern's f; the
        Bell-Delaware factors and the split of dp are NaN.

    Notes
    -----
    Validity: h for 2e3 < Re < 1e6 (Kern 1950); f fit for 400 < Re <= 1e6 (Kakaç & Liu 2002).

    References
    ----------
    Kern (1950); Kakaç & Liu (2002).
    """
    m = require(np.asarray(m_dot, dtype=float), "m_dot", gt=0)
    rho = require(np.asarray(rho, dtype=float), "rho", gt=0)
    cp = require(np.asarray(cp, dtype=float), "cp", gt=0)
    mu = require(np.asarray(mu, dtype=float), "mu", gt=0)
    k = require(np.asarray(k, dtype=float), "k", gt=0)
    scalar = all(np.ndim(v) == 0 for v in (m_dot, rho, cp, mu, k, mu_wall if mu_wall is not None else 0.0))
    phi = 1.0 if mu_wall is None else (mu / require(np.asarray(mu_wall, dtype=float), "mu_wall", gt=0)) ** 0.14
    de = kern_equivalent_diameter(geom.tube_od, geom.pitch, geom.layout)
    area = geom.Ds * (geom.pitch - geom.tube_od) * geom.Lbc / geom.pitch
    G = m / area
    Re = de * G / mu
    Pr = cp * mu / k
    h = 0.36 * k / de * Re ** 0.55 * Pr ** (1.0 / 3.0) * phi
    f = np.exp(0.576 - 0.19 * np.log(Re))
    dp = f * G ** 2 * (geom.Nb + 1) * geom.Ds / (2.0 * rho * de * phi)
    warnings = range_warning("Kern (1950) shell-side h", "Re", Re, 2e3, 1e6, "Kern (1950)")
    warnings += range_warning("Kern shell-side friction fit", "Re", Re, 400.0, 1e6, "Kakaç & Liu (2002)")
    dp_n = _nozzles(m, rho, d_nozzle, rho_nozzle)
    scalar = scalar and (rho_nozzle is None or np.ndim(rho_nozzle) == 0)
    nan = _scalar(np.full(np.shape(Re + dp_n), np.nan), scalar)
    s = lambda x: _scalar(x, scalar)  # noqa: E731
    return ShellSideResult(h=s(h), dp=s(dp + dp_n), dp_nozzles=s(dp_n + np.zeros_like(h)), dp_crossflow=nan,
                           dp_window=nan, dp_ends=nan, Re=s(Re),
                           velocity_crossflow=s(G / rho), j_ideal=nan, f_ideal=s(f), Jc=nan, Jl=nan, Jb=nan,
                           Js=nan, Jr=nan, Rl=nan, Rb=nan, Rs=nan, warnings=warnings, method="kern")
