"""Petroleum fractions characterised by API gravity, Watson K and two kinematic-viscosity points.

Built to hold over a preheat train's range (about 20-380 °C): every method below keeps a published form that stays
physical hot, and :meth:`PetroleumFluid.check` warns (once per quantity, with its range and the count of cases)
wherever a method is still used beyond its stated range.

- Specific gravity 60/60 °F: SG = 141.5 / (API + 131.5) (API definition). Density at 60 °F: ρ60 = SG · 999.016
  kg/m³ (water at 60 °F, the reference density of API MPMS 11.1; from memory).
- Mean average boiling point from the Watson K: K = Tb^(1/3) / SG with Tb in °R (Watson & Nelson 1933).
- Pseudo-critical temperature and pressure from Tb and SG: Riazi & Daubert (1980), Tc = 24.2787 Tb^0.58848
  SG^0.3596 [°R], Pc = 3.12281e9 Tb^-2.3125 SG^2.3201 [psia], Tb in °R; stated for Tb about 100-850 °F (from memory).
- Acentric factor: Edmister (1958), ω = 3/7 · log10(Pc/1 atm) / (Tc/Tb − 1) − 1.
- Liquid density vs temperature: the Rackett equation with Spencer & Danner's (1972) Z_RA, anchored at the measured
  ρ60: ρ(T) = ρ60 · Z_RA^[(1 − Tr60)^(2/7) − (1 − Tr)^(2/7)], Z_RA = 0.29056 − 0.08775 ω (Yamada & Gunn 1973).
  The saturated-liquid form; pressure effects are neglected. Used to Tr = 0.9 without a warning.
- Liquid heat capacity: Kesler & Lee (1976), cp = A1 + A2·T + A3·T² [BTU/lb/°F], T in °R, with
  A1 = −1.17126 + (0.023722 + 0.024907·SG)·K + (1.14982 − 0.046535·K)/SG,
  A2 = 1e-4·(1 + 0.82463·K)·(1.12172 − 0.27634/SG), A3 = −1e-8·(1 + 0.82463·K)·(2.9027 − 0.70958/SG);
  stated for 10 ≤ K ≤ 13 and used to Tr = 0.85 without a warning (about 4 % low there against n-decane in CoolProp).
- Liquid conductivity: Cragoe's (1929) value at 100 °F, k100 = 0.11726/SG · (1 − 0.00054 · 37.78) [W/m/K] (his fit
  to petroleum oils), carried to other temperatures with the temperature function of Latini et al. (1977),
  k ∝ (1 − Tr)^0.38 / Tr^(1/6) (whose magnitude constant then cancels). Cragoe's own linear slope (−0.054 %/K) is too
  shallow hot: n-decane loses 30 % of its conductivity between 27 and 200 °C (CoolProp), Cragoe's line 9 %. The
  combination is ours; used to Tr = 0.8 without a warning.
- Kinematic viscosity: ASTM D341 (Walther) through the two given points, log10 log10 Z = A − B·log10(T) with
  Z = ν + 0.7 + exp(−1.47 − 1.84 ν − 0.51 ν²) and the inverse ν = (Z − 0.7) − exp(−0.7487 − 3.295 (Z − 0.7) +
  0.6119 (Z − 0.7)² − 0.3193 (Z − 0.7)³) [cSt], which extends the form down to about 0.21 cSt (D341-09, from memory);
  μ = ν·ρ(T). A viscosity beyond the top of the D341 chart (2e7 cSt) is held there (a steep line would overflow);
  temperatures outside the two points are an extrapolation and are reported as such.

References
----------
Riazi, M.R. and Daubert, T.E. (1980), "Simplify property predictions", Hydrocarbon Processing 59(3):115-116.
Edmister, W.C. (1958), "Applied hydrocarbon thermodynamics, part 4: compressibility factors and equations of state",
Petroleum Refiner 37(4):173-179.
Spencer, C.F. and Danner, R.P. (1972), "Improved equation for prediction of saturated liquid density", J. Chem. Eng.
Data 17(2):236-241. Rackett, H.G. (1970), J. Chem. Eng. Data 15(4):514-517. Yamada, T. and Gunn, R.D. (1973),
"Saturated liquid molar volumes. The Rackett equation", J. Chem. Eng. Data 18(2):234-236.
Kesler, M.G. and Lee, B.I. (1976), "Improve prediction of enthalpy of fractions", Hydrocarbon Processing 55(3):153-158.
Watson, K.M. and Nelson, E.F. (1933), "Improved methods for approximating critical and thermal properties of
petroleum fractions", Ind. Eng. Chem. 25(8):880-887.
Cragoe, C.S. (1929), "Thermal properties of petroleum products", US Bureau of Standards Misc. Publ. 97.
Latini, G., Ottaviani, F., Pierpaoli, P. (1977), as given in Poling, Prausnitz & O'Connell (2001), *The Properties of
Gases and Liquids*, 5th ed., §10-9 (liquid thermal conductivity, k = A (1 − Tr)^0.38 / Tr^(1/6)).
ASTM D341, "Standard practice for viscosity-temperature equations and charts for liquid petroleum or hydrocarbon
products".
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..correlations._validity import range_warning
from ..errors import InputError
from ..units import to_si
from .base import Props, as_temperature, joined_temperatures, range_check

__all__ = ["BTU_LB_F", "RHO_WATER_60F", "PetroleumFluid", "petroleum", "riazi_daubert_1980"]

#: Density of water at 60 °F [kg/m³] (API MPMS 11.1 reference, from memory).
RHO_WATER_60F = 999.016
#: 1 BTU/(lb·°F) in J/(kg·K) (International Table BTU).
BTU_LB_F = 4186.8
#: 1 BTU·in/(h·ft²·°F) in W/(m·K).
BTU_IN_H_FT2_F = 0.1442279
_PSI = 6894.757293168
_ATM = 101325.0

_F = lambda t_f: (t_f - 32.0) / 1.8 + 273.15  # noqa: E731
T_MIN, T_MAX = _F(0.0), _F(700.0)
T_60F = _F(60.0)
T_100F = _F(100.0)
# reduced temperatures up to which each method is used without a warning (see the module docstring)
TR_DENSITY, TR_CP, TR_CONDUCTIVITY = 0.90, 0.85, 0.80
# ASTM D341 chart range [cSt] (from memory)
NU_MIN_CST, NU_MAX_CST = 0.21, 2.0e7
_LOGLOG_MAX = math.log10(math.log10(NU_MAX_CST + 0.7))
_LN10 = math.log(10.0)


def riazi_daubert_1980(tb, sg):
    """Pseudo-critical temperature [K] and pressure [Pa] of a petroleum fraction (Riazi & Daubert 1980).

    ``Tc = 24.2787 Tb^0.58848 SG^0.3596`` [°R] and ``Pc = 3.12281e9 Tb^-2.3125 SG^2.3201`` [psia], Tb in °R.

    Parameters
    ----------
    tb : float
        Mean average boiling point [K].
    sg : float
        Specific gravity 60/60 °F [-].

    Returns
    -------
    tuple of float
        (Tc [K], Pc [Pa]).

    References
    ----------
    Riazi, M.R. and Daubert, T.E. (1980), Hydrocarbon Processing 59(3):115-116 (also API Technical Data Book
    procedures 4D1.1 and 4D2.1 in their simple forms; from memory). Stated for Tb about 100-850 °F.

    Examples
    --------
    n-decane, Tb = 447.3 K, SG = 0.7346 (its true Tc is 617.7 K, Pc 2.10 MPa):

    >>> tc, pc = riazi_daubert_1980(447.3, 0.7346)
    >>> round(tc, 1), round(pc / 1e6, 2)
    (619.2, 2.01)
    """
    tb_r = tb * 1.8
    tc = 24.2787 * tb_r ** 0.58848 * sg ** 0.3596 / 1.8
    pc = 3.12281e9 * tb_r ** -2.3125 * sg ** 2.3201 * _PSI
    return tc, pc


def _d341_z(nu_cst):
    """ASTM D341 Z from kinematic viscosity [cSt] (with the low-viscosity term)."""
    return nu_cst + 0.7 + np.exp(-1.47 - 1.84 * nu_cst - 0.51 * nu_cst ** 2)


def _d341_nu(z):
    """ASTM D341 kinematic viscosity [cSt] from Z (the standard's inverse; its cubic in Horner's form)."""
    x = z - 0.7
    return x - np.exp(-0.7487 + x * (-3.295 + x * (0.6119 - 0.3193 * x)))


@dataclass(frozen=True)
class PetroleumFluid:
    """A petroleum fraction (liquid); build with :func:`petroleum`.

    Attributes
    ----------
    name : str
    api : float
        API gravity [-].
    watson_k : float
        Watson characterization factor [-].
    sg : float
        Specific gravity 60/60 °F [-].
    walther_a, walther_b : float
        ASTM D341 constants of ``log10 log10 Z = A − B log10 T`` (Z from ν in cSt, T in K).
    visc_t1, visc_t2 : float
        Temperatures of the two given viscosities [K] (outside them ν is extrapolated).
    tb : float
        Mean average boiling point from the Watson K [K].
    tc, pc : float
        Pseudo-critical temperature [K] and pressure [Pa] (Riazi & Daubert 1980).
    omega : float
        Acentric factor (Edmister 1958) [-].
    z_ra : float
        Rackett compressibility (Yamada & Gunn 1973) [-].
    t_min, t_max : float
        Overall range [K]: 0 °F to the lower of 700 °F and 0.95 Tc; narrower per-method ranges are reported by
        :meth:`check`. Above Tc the fraction is not a liquid: :meth:`props` raises.
    """

    name: str
    api: float
    watson_k: float
    sg: float
    walther_a: float
    walther_b: float
    visc_t1: float
    visc_t2: float
    tb: float
    tc: float
    pc: float
    omega: float
    z_ra: float
    t_min: float = T_MIN
    t_max: float = T_MAX

    @property
    def rho60(self) -> float:
        """Density at 60 °F [kg/m³]."""
        return self.sg * RHO_WATER_60F

    def density(self, T):
        """Density [kg/m³] at ``T`` [K] (Rackett / Spencer-Danner, anchored at ρ60)."""
        tr = np.asarray(T, dtype=float) * (1.0 / self.tc)
        tr60 = T_60F / self.tc
        return self.rho60 * self.z_ra ** ((1.0 - tr60) ** (2.0 / 7.0) - (1.0 - tr) ** (2.0 / 7.0))

    def heat_capacity(self, T):
        """Liquid heat capacity [J/kg/K] at ``T`` [K] (Kesler & Lee 1976)."""
        sg, k = self.sg, self.watson_k
        a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
        a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
        a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
        t_r = np.asarray(T, dtype=float) * 1.8
        return (a1 + (a2 + a3 * t_r) * t_r) * BTU_LB_F

    def conductivity(self, T):
        """Liquid conductivity [W/m/K] at ``T`` [K] (Cragoe at 100 °F, Latini's temperature function)."""
        k100 = 0.813 / self.sg * (1.0 - 0.0003 * (100.0 - 32.0)) * BTU_IN_H_FT2_F
        tr100 = T_100F / self.tc
        tr = np.asarray(T, dtype=float) * (1.0 / self.tc)
        return (k100 / ((1.0 - tr100) ** 0.38 / tr100 ** (1.0 / 6.0))) * ((1.0 - tr) ** 0.38 / tr ** (1.0 / 6.0))

    def kinematic_viscosity(self, T):
        """Kinematic viscosity [m²/s] at ``T`` [K] (ASTM D341, held at the chart's 2e7 cSt top)."""
        y = np.minimum(self.walther_a - self.walther_b * np.log10(np.asarray(T, dtype=float)), _LOGLOG_MAX)
        return _d341_nu(np.exp(np.exp(y * _LN10) * _LN10)) * 1e-6  # Z = 10^(10^y)

    def props(self, T) -> Props:
        """Density [kg/m³], heat capacity [J/kg/K], viscosity [Pa s], conductivity [W/m/K] at ``T`` [K].

        Raises InputError at or above the pseudo-critical temperature (not a liquid).
        """
        if (isinstance(T, float) or type(T) is int) and 0.0 < T < self.tc:  # scalar fast path
            return self._props_scalar(float(T))
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim and np.isfinite(T).all() and T.min() > 0:
            arr, scalar = T, False
        else:
            arr, scalar = as_temperature(T)
        if np.any(arr >= self.tc):
            raise InputError("T", T, f"a temperature below the pseudo-critical temperature of {self.name} "
                             f"({self.tc:.1f} K, Riazi & Daubert 1980): above it the fraction is not a liquid")
        rho = self.density(arr)
        mu = self.kinematic_viscosity(arr) * rho
        cp, k = self.heat_capacity(arr), self.conductivity(arr)
        if scalar:
            return Props(float(rho), float(cp), float(mu), float(k))
        return Props(rho, cp, mu, k)

    def _rating_props(self, t_mean, t_wall):
        """``props(t_mean)`` and ``viscosity_at(t_wall)`` as ``(ρ, cp, μ, k, μ_wall)`` arrays in one call, the same
        operations without their checks: the rating loop's kernel, whose temperatures are finite and already held
        within ``t_min``..``t_max`` (below the pseudo-critical temperature). Internal."""
        n = t_mean.size
        both = np.concatenate((t_mean, t_wall))  # density and viscosity at both in one pass
        rho = self.density(both)
        mu = self.kinematic_viscosity(both) * rho
        return rho[:n], self.heat_capacity(t_mean), mu[:n], self.conductivity(t_mean), mu[n:]

    def viscosity_at(self, T):
        """Dynamic viscosity alone [Pa s] at ``T`` [K]: exactly ``props(T).viscosity`` (the same operations), without
        the heat capacity and conductivity (a rating needs only the viscosity at the wall temperatures).

        Raises InputError where :meth:`props` does (at or above the pseudo-critical temperature).
        """
        if (isinstance(T, float) or type(T) is int) and 0.0 < T < self.tc:  # scalar: the scalar path's formulas
            T = float(T)
            rho = self.rho60 * self.z_ra ** ((1.0 - T_60F / self.tc) ** (2.0 / 7.0) - (1.0 - T / self.tc) ** (2.0 / 7.0))
            y = min(self.walther_a - self.walther_b * math.log10(T), _LOGLOG_MAX)
            x = 10.0 ** (10.0 ** y) - 0.7
            return (x - math.exp(-0.7487 - 3.295 * x + 0.6119 * x * x - 0.3193 * x * x * x)) * 1e-6 * rho
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim and np.isfinite(T).all() and T.min() > 0:
            arr, scalar = T, False
        else:
            arr, scalar = as_temperature(T)
        if np.any(arr >= self.tc):
            raise InputError("T", T, f"a temperature below the pseudo-critical temperature of {self.name} "
                             f"({self.tc:.1f} K, Riazi & Daubert 1980): above it the fraction is not a liquid")
        mu = self.kinematic_viscosity(arr) * self.density(arr)
        return float(mu) if scalar else mu

    def _props_scalar(self, T: float) -> Props:
        # the same formulas as the array methods, on Python floats (a scalar rating calls this many times)
        tc = self.tc
        rho = self.rho60 * self.z_ra ** ((1.0 - T_60F / tc) ** (2.0 / 7.0) - (1.0 - T / tc) ** (2.0 / 7.0))
        sg, k = self.sg, self.watson_k
        a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
        a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
        a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
        t_r = T * 1.8
        cp = (a1 + (a2 + a3 * t_r) * t_r) * BTU_LB_F
        tr, tr100 = T / tc, T_100F / tc
        k100 = 0.813 / sg * (1.0 - 0.0003 * (100.0 - 32.0)) * BTU_IN_H_FT2_F
        kc = k100 * ((1.0 - tr) ** 0.38 / tr ** (1.0 / 6.0)) / ((1.0 - tr100) ** 0.38 / tr100 ** (1.0 / 6.0))
        y = min(self.walther_a - self.walther_b * math.log10(T), _LOGLOG_MAX)
        x = 10.0 ** (10.0 ** y) - 0.7
        nu = (x - math.exp(-0.7487 - 3.295 * x + 0.6119 * x * x - 0.3193 * x * x * x)) * 1e-6
        return Props(rho, cp, nu * rho, kc)

    def check(self, *T) -> list[str]:
        """Warnings for every method used outside its stated range at these temperatures [K].

        One warning per quantity, however many temperatures or arrays are passed (e.g. ``check(t_in, t_out)``),
        each with the range and the count of temperatures outside it.
        """
        arr = joined_temperatures(*T)
        arr = arr[np.isfinite(arr)]
        n = self.name
        if arr.size:  # every range below is an interval: the extremes decide whether any temperature is outside
            lo, hi = float(arr.min()), float(arr.max())

        def temperatures(name, t_min, t_max, what="valid range"):
            return [] if not arr.size or (lo >= t_min and hi <= t_max) else range_check(name, arr, t_min, t_max, what)

        w = temperatures(f"{n}: overall range (0 °F to min(700 °F, 0.95 Tc))", self.t_min, self.t_max)
        w += temperatures(f"{n}: Rackett density", self.t_min, TR_DENSITY * self.tc, f"range (to {TR_DENSITY:g} Tc)")
        w += temperatures(f"{n}: Kesler-Lee cp", self.t_min, TR_CP * self.tc, f"range (to {TR_CP:g} Tc)")
        w += temperatures(f"{n}: conductivity (Cragoe at 100 °F, Latini's T function)", self.t_min,
                          TR_CONDUCTIVITY * self.tc, f"range (to {TR_CONDUCTIVITY:g} Tc)")
        w += temperatures(f"{n}: ASTM D341 viscosity", self.visc_t1, self.visc_t2,
                          "measured points (extrapolated beyond them)")
        if arr.size:
            # ASTM D341's viscosity is monotonic in T (log log Z linear in log T, ν increasing in Z): its extremes are
            # at the extreme temperatures; only where they come near a bound are all values taken
            ends = self.kinematic_viscosity(np.array([lo, hi])) * 1e6
            if not (ends.min() > NU_MIN_CST * (1.0 + 1e-9) and ends.max() < NU_MAX_CST * (1.0 - 1e-9)):
                nu_cst = self.kinematic_viscosity(arr) * 1e6
                w += range_warning(f"{n}: ASTM D341", "viscosity [cSt]", nu_cst, NU_MIN_CST, NU_MAX_CST,
                                   "ASTM D341, from memory; values above are held at 2e7 cSt")
        w += range_warning(f"{n}: Kesler & Lee (1976) cp", "Watson K", self.watson_k, 10.0, 13.0,
                           "Kesler & Lee (1976), from memory")
        w += range_warning(f"{n}: Riazi & Daubert (1980) Tc, Pc", "Tb [K]", self.tb, _F(100.0), _F(850.0),
                           "Riazi & Daubert (1980), from memory")
        return w


def _viscosity_points(points):
    field = "petroleum.viscosity"
    try:
        pairs = list(points)
        if len(pairs) != 2 or any(len(p) != 2 for p in pairs):
            raise TypeError
    except TypeError:
        raise InputError(field, points, "two (temperature, kinematic viscosity) pairs, e.g. "
                         "[('40 degC', '30 cSt'), ('100 degC', '5 cSt')]") from None
    out = []
    for j, (t, nu) in enumerate(pairs):
        t_k = to_si(t, "temperature", f"{field}[{j}][0]")
        nu_si = to_si(nu, "kinematic_viscosity", f"{field}[{j}][1]")
        if np.ndim(t_k) or not t_k > 0:
            raise InputError(f"{field}[{j}][0]", t, "one temperature > 0 K")
        if np.ndim(nu_si) or not NU_MIN_CST <= nu_si * 1e6 <= NU_MAX_CST:
            raise InputError(f"{field}[{j}][1]", nu, f"one kinematic viscosity from {NU_MIN_CST:g} to "
                             f"{NU_MAX_CST:g} cSt (the range of ASTM D341)")
        out.append((float(t_k), float(nu_si) * 1e6))
    (t1, n1), (t2, n2) = sorted(out)
    if t2 - t1 < 1.0:
        raise InputError(field, points, "two points at temperatures at least 1 K apart")
    if not n2 < n1:
        raise InputError(field, points, "a kinematic viscosity that falls as temperature rises")
    return (t1, n1), (t2, n2)


def petroleum(api, watson_k, viscosity, name: str | None = None) -> PetroleumFluid:
    """A petroleum fraction from its API gravity, Watson K and two measured kinematic viscosities.

    Parameters
    ----------
    api : float or str
        API gravity [-], −5 to 100.
    watson_k : float or str
        Watson (UOP) characterization factor [-], 9 to 14 (Kesler-Lee is stated for 10–13).
    viscosity : list of two (T, ν) pairs
        Temperatures [K] (or strings, e.g. ``"40 degC"``) and kinematic viscosities [m²/s] (or strings, e.g.
        ``"30 cSt"``), 0.21 to 2e7 cSt.
    name : str, optional

    Returns
    -------
    PetroleumFluid

    Examples
    --------
    >>> gas_oil = petroleum(api=30, watson_k=11.8, viscosity=[("40 degC", "8 cSt"), ("100 degC", "2.5 cSt")])
    >>> round(gas_oil.sg, 4)
    0.8762
    >>> round(float(gas_oil.kinematic_viscosity(313.15)) * 1e6, 6)
    8.0
    """
    a = to_si(api, "dimensionless", "petroleum.api")
    if np.ndim(a) or not -5.0 <= a <= 100.0:
        raise InputError("petroleum.api", api, "an API gravity from -5 to 100")
    k = to_si(watson_k, "dimensionless", "petroleum.watson_k")
    if np.ndim(k) or not 9.0 <= k <= 14.0:
        raise InputError("petroleum.watson_k", watson_k, "a Watson K from 9 to 14")
    (t1, n1), (t2, n2) = _viscosity_points(viscosity)
    ll1, ll2 = (math.log10(math.log10(float(_d341_z(n)))) for n in (n1, n2))
    b = (ll1 - ll2) / (math.log10(t2) - math.log10(t1))
    a_w = ll1 + b * math.log10(t1)
    sg = 141.5 / (float(a) + 131.5)
    tb = (float(k) * sg) ** 3 / 1.8  # Watson K = Tb^(1/3)/SG, Tb in °R
    tc, pc = riazi_daubert_1980(tb, sg)
    omega = 3.0 / 7.0 * math.log10(pc / _ATM) / (tc / tb - 1.0) - 1.0  # Edmister (1958)
    z_ra = 0.29056 - 0.08775 * omega  # Yamada & Gunn (1973)
    if not (tc > 1.05 * tb and 0.1 < z_ra < 0.3):
        raise InputError("petroleum.watson_k", watson_k,
                         f"a Watson K that with API {float(a):g} gives a fraction the critical-constant correlations "
                         f"can describe: Tb = {tb:.0f} K from K and SG, far beyond Riazi & Daubert's range (to "
                         f"{_F(850.0):.0f} K), gives Tc = {tc:.0f} K and acentric factor {omega:.2f}")
    label = name if name is not None else f"petroleum (API {float(a):g}, K {float(k):g})"
    return PetroleumFluid(name=str(label), api=float(a), watson_k=float(k), sg=sg, walther_a=float(a_w),
                          walther_b=float(b), visc_t1=t1, visc_t2=t2, tb=tb, tc=tc, pc=pc, omega=omega, z_ra=z_ra,
                          t_max=min(T_MAX, 0.95 * tc))
