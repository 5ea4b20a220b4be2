"""Petroleum fractions characterised by API gravity, Watson K and two kinematic-viscosity points.

Correlations (each with its validity range; :meth:`PetroleumFluid.check` warns outside them):

- Specific gravity 60/60 °F: SG = 141.5 / (API + 131.5) (API definition).
- Density at 60 °F: ρ60 = SG · 999.016 kg/m³ (water at 60 °F, the reference density of API MPMS 11.1; from memory).
- Density vs temperature: the API MPMS Ch. 11.1 / ASTM D1250-80 volume correction for generalized crude oils
  (Table 6A/54A form), ρ(T) = ρ60 · exp(−α·Δt·(1 + 0.8·α·Δt)), Δt = t − 60 [°F], α = K0/ρ60² + K1/ρ60 [1/°F] with
  K0 = 341.0957, K1 = 0 (ρ60 in kg/m³). Published range about 0–300 °F (from memory); used beyond it with a warning.
- Heat capacity of the liquid: Kesler & Lee (1976), cp = A1 + A2·T + A3·T² [BTU/lb/°F], T in °R, with
  A1 = −1.17126 + (0.023722 + 0.024907·SG)·K + (1.14982 − 0.046535·K)/SG,
  A2 = 1e-4·(1 + 0.82463·K)·(1.12172 − 0.27634/SG), A3 = −1e-8·(1 + 0.82463·K)·(2.9027 − 0.70958/SG).
  Stated here for 10 ≤ K ≤ 13 and 0–700 °F (from memory, approximate; the source bounds reduced temperature).
- Conductivity of the liquid: Cragoe (1929), k = (0.813/SG)·(1 − 0.0003·(t − 32)) [BTU·in/(h·ft²·°F)], t in °F;
  in SI k = 0.11726/SG·(1 − 0.00054·t[°C]) [W/m/K]. Range about 32–400 °F (from memory).
- Kinematic viscosity: ASTM D341 (Walther), log10 log10(ν + 0.7) = A − B·log10(T), ν in cSt, T in K, through the
  two given points; dynamic viscosity μ = ν·ρ(T). The simple form holds for ν ≥ 2 cSt (D341); below, a warning.

References
----------
Kesler, M.G. and Lee, B.I. (1976), "Improve prediction of enthalpy of fractions", Hydrocarbon Processing 55(3):153-158.
Watson, K.M. and Nelson, E.F. (1933), "Improved methods for approximating critical and thermal properties of
petroleum fractions", Ind. Eng. Chem. 25(8):880-887.
Cragoe, C.S. (1929), "Thermal properties of petroleum products", US Bureau of Standards Misc. Publ. 97.
ASTM D341, "Standard practice for viscosity-temperature equations and charts for liquid petroleum or hydrocarbon
products".
API MPMS Chapter 11.1 / ASTM D1250-80, "Volume correction factors" (generalized crude oils, Tables 6A/54A).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..correlations._validity import range_warning
from ..errors import InputError
from ..units import to_si
from .base import Props, as_temperature, range_check

__all__ = ["BTU_LB_F", "RHO_WATER_60F", "PetroleumFluid", "petroleum"]

#: Density of water at 60 °F [kg/m³] (API MPMS 11.1 reference, from memory).
RHO_WATER_60F = 999.016
#: 1 BTU/(lb·°F) in J/(kg·K) (International Table BTU).
BTU_LB_F = 4186.8
#: 1 BTU·in/(h·ft²·°F) in W/(m·K).
BTU_IN_H_FT2_F = 0.1442279
_K0_CRUDE, _K1_CRUDE = 341.0957, 0.0
_LN10 = math.log(10.0)

# validity ranges [K]
_F = lambda t_f: (t_f - 32.0) / 1.8 + 273.15
T_MIN, T_MAX = _F(0.0), _F(700.0)
_DENSITY_RANGE = (_F(0.0), _F(300.0))
_CRAGOE_RANGE = (_F(32.0), _F(400.0))


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
        ASTM D341 constants (ν in cSt, T in K, base-10 logarithms).
    t_min, t_max : float
        Overall range [K] (0 to 700 °F); narrower per-correlation ranges are reported by :meth:`check`.
    """

    name: str
    api: float
    watson_k: float
    sg: float
    walther_a: float
    walther_b: float
    t_min: float = T_MIN
    t_max: float = T_MAX

    @property
    def rho60(self) -> float:
        """Density at 60 °F [kg/m³]."""
        return self.sg * RHO_WATER_60F

    def density(self, T):
        """Density [kg/m³] at ``T`` [K] (API MPMS 11.1 crude-oil volume correction)."""
        rho60 = self.rho60
        alpha = _K0_CRUDE / rho60**2 + _K1_CRUDE / rho60
        dt = (np.asarray(T, dtype=float) - 273.15) * 1.8 + 32.0 - 60.0
        return rho60 * np.exp(-alpha * dt * (1.0 + 0.8 * alpha * dt))

    def heat_capacity(self, T):
        """Liquid heat capacity [J/kg/K] at ``T`` [K] (Kesler & Lee 1976)."""
        sg, k = self.sg, self.watson_k
        a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
        a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
        a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
        t_r = np.asarray(T, dtype=float) * 1.8
        return (a1 + (a2 + a3 * t_r) * t_r) * BTU_LB_F

    def conductivity(self, T):
        """Liquid conductivity [W/m/K] at ``T`` [K] (Cragoe 1929)."""
        t_f = (np.asarray(T, dtype=float) - 273.15) * 1.8 + 32.0
        return 0.813 / self.sg * (1.0 - 0.0003 * (t_f - 32.0)) * BTU_IN_H_FT2_F

    def kinematic_viscosity(self, T):
        """Kinematic viscosity [m²/s] at ``T`` [K] (ASTM D341 Walther line)."""
        # 10**(10**(A - B log10 T)) written with exp and log (faster than power on arrays)
        y = np.exp(_LN10 * self.walther_a - self.walther_b * np.log(T))
        return (np.exp(_LN10 * y) - 0.7) * 1e-6

    def props(self, T) -> Props:
        """Density [kg/m³], heat capacity [J/kg/K], viscosity [Pa s], conductivity [W/m/K] at ``T`` [K]."""
        if (isinstance(T, float) or type(T) is int) and T > 0.0 and math.isfinite(T):  # scalar fast path
            return self._props_scalar(float(T))
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim and np.isfinite(T).all() and T.min() > 0:
            arr, scalar = T, False
        else:
            arr, scalar = as_temperature(T)
            if scalar:
                return self._props_scalar(float(arr))
        rho = self.density(arr)
        mu = self.kinematic_viscosity(arr)
        mu *= rho
        return Props(rho, self.heat_capacity(arr), mu, self.conductivity(arr))

    def _props_scalar(self, T: float) -> Props:
        # the same formulas as the array methods, on Python floats
        rho60 = self.rho60
        alpha = _K0_CRUDE / rho60**2 + _K1_CRUDE / rho60
        dt = (T - 273.15) * 1.8 - 28.0
        rho = rho60 * math.exp(-alpha * dt * (1.0 + 0.8 * alpha * dt))
        sg, k = self.sg, self.watson_k
        a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg
        a2 = 1e-4 * (1.0 + 0.82463 * k) * (1.12172 - 0.27634 / sg)
        a3 = -1e-8 * (1.0 + 0.82463 * k) * (2.9027 - 0.70958 / sg)
        t_r = T * 1.8
        cp = (a1 + (a2 + a3 * t_r) * t_r) * BTU_LB_F
        y = math.exp(_LN10 * self.walther_a - self.walther_b * math.log(T))
        nu = (math.exp(_LN10 * y) - 0.7) * 1e-6
        t_f = (T - 273.15) * 1.8 + 32.0
        kc = 0.813 / self.sg * (1.0 - 0.0003 * (t_f - 32.0)) * BTU_IN_H_FT2_F
        return Props(rho, cp, nu * rho, kc)

    def check(self, T) -> list[str]:
        """Warnings for every correlation used outside its stated range at these temperatures."""
        arr = np.asarray(to_si(T, "temperature", "T") if isinstance(T, str) else T, dtype=float)
        w = range_check(f"{self.name}: Kesler-Lee cp", arr, self.t_min, self.t_max)
        w += range_warning("Kesler & Lee (1976) cp", "Watson K", self.watson_k, 10.0, 13.0, "stated range, from memory")
        w += range_check(f"{self.name}: API MPMS 11.1 density", arr, *_DENSITY_RANGE)
        w += range_check(f"{self.name}: Cragoe (1929) conductivity", arr, *_CRAGOE_RANGE)
        if arr.size:
            nu_cst = self.kinematic_viscosity(np.asarray(arr, dtype=float)) * 1e6
            w += range_warning("ASTM D341 Walther form", "viscosity [cSt]", nu_cst, 2.0, None, "ASTM D341")
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
        if np.ndim(nu_si) or not nu_si * 1e6 > 0.3:
            raise InputError(f"{field}[{j}][1]", nu, "one kinematic viscosity > 0.3 cSt (ASTM D341 needs ν + 0.7 > 1)")
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
        ``"30 cSt"``).
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
    ll1, ll2 = np.log10(np.log10(n1 + 0.7)), np.log10(np.log10(n2 + 0.7))
    b = (ll1 - ll2) / (np.log10(t2) - np.log10(t1))
    a_w = ll1 + b * np.log10(t1)
    sg = 141.5 / (float(a) + 131.5)
    label = name if name is not None else f"petroleum (API {float(a):g}, K {float(k):g})"
    return PetroleumFluid(name=str(label), api=float(a), watson_k=float(k), sg=sg, walther_a=float(a_w),
                          walther_b=float(b))
