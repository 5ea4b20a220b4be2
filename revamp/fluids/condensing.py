"""Condensing streams: a condensing curve at one pressure, for a pure fluid or a mixture.

A :class:`CondensingFluid` holds the curve a vapour follows as it condenses at (nearly) constant pressure: the
heat released per kg from the dew point ``q`` [J/kg], the temperature ``T`` [K] and the vapour mass fraction ``x``
at each point, from the dew point (q = 0, x = 1) to the bubble point (q = latent, x = 0). Beside the curve it
carries the properties of the two phases in equilibrium at each point (the film and the vapour core of the
condensing zone), a liquid :class:`~revamp.fluids.base.Fluid` for the subcooled condensate and a vapour property
provider for the superheated vapour (desuperheating zone), and the heat released in those two sensible zones
(:meth:`CondensingFluid.superheat`, :meth:`CondensingFluid.subcooling`: CoolProp enthalpies where CoolProp made the
curve, the providers' heat capacities for a table).

Three sources (built in :mod:`revamp.fluids.condensing_sources`, re-exported here):

- :func:`condensing` from :func:`~revamp.fluids.pure` or :func:`~revamp.fluids.water`: the saturation state of
  the pure fluid at its pressure, from CoolProp (isothermal curve, exact latent heat);
- :func:`condensing_curve` with ``mixture="HEOS::Pentane[0.6]&Hexane[0.4]"`` (mole fractions) at ``pressure``:
  CoolProp's mixture model (GERG-2008 style Helmholtz mixing with its binary parameters) flashed at 41 vapour
  fractions; the phases in equilibrium at each point are evaluated at their own compositions;
- :func:`condensing_curve` with ``table=``: a user's condensing curve (temperature, heat released or enthalpy,
  vapour fraction, optional property columns), as printed on a process data sheet.

Stated approximations: a table curve moved to another pressure is shifted by the Clausius-Clapeyron equation with
the vapour taken as an ideal gas whose molar mass follows from its density at the dew point, and the latent heat
kept (:meth:`CondensingFluid.at_pressure`); a mixture's critical pressure (for Shah's reduced pressure) is the
pseudo-critical pressure by Kay's rule; a mixture's surface tension is the mole-fraction average of its pure
components' (CoolProp has no mixture surface tension; common practice, no source).

References
----------
Bell, I.H., Wronski, J., Quoilin, S., Lemort, V. (2014), "Pure and pseudo-pure fluid thermophysical property
evaluation and the open-source thermophysical property library CoolProp", Ind. Eng. Chem. Res. 53(6):2498-2508.
Kunz, O., Wagner, W. (2012), "The GERG-2008 wide-range equation of state for natural gases and other mixtures",
J. Chem. Eng. Data 57(11):3032-3091.
Kay, W.B. (1936), "Density of hydrocarbon gases and vapors at high temperature and pressure", Ind. Eng. Chem.
28(9):1014-1019.
Bell, K.J., Ghaly, M.A. (1973), "An approximate generalized design method for multicomponent/partial
condensers", AIChE Symp. Ser. 69(131):72-79.
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from ..errors import InputError
from ..units import require, to_si
from .base import Props
from .coolprop_liquid import _coolprop, pure

__all__ = ["CondensingFluid", "SaturationProps", "condensing", "condensing_curve"]

#: Vapour fractions at which a CoolProp mixture curve is flashed (molar, 1 -> 0).
MIXTURE_POINTS = 41
#: Span of the superheated-vapour property table above the dew point [K].
SUPERHEAT_SPAN = 150.0
#: Span of the subcooled-liquid property table below the bubble point of a mixture [K].
SUBCOOL_SPAN = 80.0


@dataclass(frozen=True)
class SaturationProps:
    """Properties of the two phases in equilibrium at points of a condensing curve.

    Attributes
    ----------
    liquid : Props
        Condensate (equilibrium liquid) density [kg/m³], heat capacity [J/kg/K], viscosity [Pa s],
        conductivity [W/m/K].
    vapour : Props
        Equilibrium vapour, same fields.
    surface_tension : float or numpy.ndarray
        Liquid surface tension [N/m]; NaN where unknown (a table without it).
    """

    liquid: Props
    vapour: Props
    surface_tension: float | np.ndarray


def _out(a):
    a = np.asarray(a, dtype=float)
    return float(a) if a.ndim == 0 else a


@dataclass(frozen=True, eq=False)
class _Enthalpy:
    """Specific enthalpy [J/kg] of one phase at one pressure on nodes T (ascending), with cp = dh/dT at each node:
    cubic Hermite interpolation (exact for h quadratic in T between nodes; NaN outside the nodes)."""

    T: np.ndarray
    h: np.ndarray
    cp: np.ndarray

    def __call__(self, T):
        T = np.asarray(T, dtype=float)
        i = np.clip(np.searchsorted(self.T, T, side="right") - 1, 0, self.T.size - 2)
        dt = self.T[i + 1] - self.T[i]
        t = (T - self.T[i]) / dt
        h = ((2 * t ** 3 - 3 * t ** 2 + 1) * self.h[i] + (t ** 3 - 2 * t ** 2 + t) * dt * self.cp[i]
             + (-2 * t ** 3 + 3 * t ** 2) * self.h[i + 1] + (t ** 3 - t ** 2) * dt * self.cp[i + 1])
        tol = 1e-9 * self.T[-1]
        return np.where((T >= self.T[0] - tol) & (T <= self.T[-1] + tol), h, np.nan)


_GL_NODES, _GL_WEIGHTS = np.polynomial.legendre.leggauss(8)


def _cp_integral(provider, t_low, t_high):
    """∫ cp dT [J/kg] from t_low to t_high of a provider's heat capacity (8-point Gauss-Legendre)."""
    a, b = np.broadcast_arrays(np.asarray(t_low, dtype=float), np.asarray(t_high, dtype=float))
    shape = a.shape
    nodes = 0.5 * (a + b)[None] + 0.5 * (b - a)[None] * _GL_NODES.reshape((-1,) + (1,) * len(shape))
    cp = np.asarray(provider.props(np.ascontiguousarray(nodes, dtype=float)).heat_capacity, dtype=float)
    w = _GL_WEIGHTS.reshape((-1,) + (1,) * len(shape))
    return 0.5 * (b - a) * np.sum(w * cp, axis=0)


@dataclass(frozen=True, eq=False)
class CondensingFluid:
    """A condensing curve at one pressure; also a liquid :class:`~revamp.fluids.base.Fluid` (the condensate).

    Attributes
    ----------
    name : str
    pressure : float
        Condensing pressure [Pa].
    q : numpy.ndarray
        Heat released per kg of the stream from the dew point [J/kg], ascending from 0 to ``latent``.
    T : numpy.ndarray
        Temperature along the curve [K] (constant for a pure fluid, falling for a mixture).
    x : numpy.ndarray
        Vapour mass fraction along the curve [-], 1 -> 0.
    liquid : Fluid
        The condensate as a liquid below the bubble point (subcooling zone).
    vapour : object
        ``props(T) -> Props`` of the vapour above the dew point (desuperheating zone).
    t_dew, t_bubble : float
        Dew and bubble points at ``pressure`` [K].
    latent : float
        Heat released from dew to bubble point [J/kg] (the latent heat of a pure fluid).
    pure_name : str or None
        CoolProp name of a pure fluid (exact saturation at another pressure), else None.
    critical_pressure : float
        Critical pressure [Pa] (pseudo-critical by Kay's rule for a CoolProp mixture; as given, or NaN, for a
        table).
    mixture : str or None
        The CoolProp mixture this curve was computed from (recomputed exactly at another pressure), else None.
    source : str
        How the curve was obtained, for reports.
    """

    name: str
    pressure: float
    q: np.ndarray = field(repr=False)
    T: np.ndarray = field(repr=False)
    x: np.ndarray = field(repr=False)
    liquid: object = field(repr=False)
    vapour: object = field(repr=False)
    t_dew: float = 0.0
    t_bubble: float = 0.0
    latent: float = 0.0
    pure_name: str | None = None
    critical_pressure: float = float("nan")
    mixture: str | None = None
    source: str = ""
    sat_liquid: np.ndarray = field(repr=False, default=None)  # (4, n): rho, cp, mu, k of the equilibrium liquid
    sat_vapour: np.ndarray = field(repr=False, default=None)  # (4, n): the same for the equilibrium vapour
    sigma: np.ndarray = field(repr=False, default=None)  # (n,) surface tension [N/m], NaN where unknown
    vapour_enthalpy: object = field(repr=False, default=None)  # _Enthalpy of the superheated vapour, or None
    liquid_enthalpy: object = field(repr=False, default=None)  # _Enthalpy of the subcooled condensate, or None

    # ------------------------------------------------------------------ the Fluid protocol (condensate liquid)
    @property
    def t_min(self) -> float:
        """Lowest temperature of the condensate liquid provider [K]."""
        return self.liquid.t_min

    @property
    def t_max(self) -> float:
        """Highest temperature of the condensate liquid provider [K] (the bubble point)."""
        return self.liquid.t_max

    def props(self, T) -> Props:
        """Condensate (liquid) properties at ``T`` [K], for the subcooling zone: the liquid provider's."""
        return self.liquid.props(T)

    def viscosity_at(self, T):
        """Condensate viscosity alone [Pa s] at ``T`` [K]: exactly ``props(T).viscosity``."""
        visc = getattr(self.liquid, "viscosity_at", None)
        return visc(T) if visc is not None else self.liquid.props(T).viscosity

    def check(self, *T) -> list[str]:
        """The liquid provider's range warnings for the condensate temperatures ``T``."""
        return self.liquid.check(*T)

    # ---------------------------------------------------------------------------------------------- the curve
    @property
    def is_isothermal(self) -> bool:
        """True when the curve condenses at one temperature (a pure fluid)."""
        return bool(self.T[0] - self.T[-1] <= 1e-9 * self.T[0])

    def _q(self, q, what="q"):
        arr = np.asarray(q, dtype=float)
        tol = 1e-9 * self.latent
        if not np.all((arr >= -tol) & (arr <= self.latent + tol)):  # also refuses NaN
            bad = arr[~((arr >= -tol) & (arr <= self.latent + tol))].ravel()[0]
            raise InputError(what, f"{bad:.6g} J/kg", f"heat released within the curve, 0 to {self.latent:.6g} "
                             f"J/kg (dew to bubble point of {self.name})")
        return np.clip(arr, 0.0, self.latent)

    def at(self, q):
        """Temperature [K] and vapour mass fraction [-] at heat released ``q`` [J/kg] (linear along the curve).

        Raises
        ------
        InputError
            For ``q`` outside 0 to ``latent``.
        """
        qq = self._q(q)
        return _out(np.interp(qq, self.q, self.T)), _out(np.interp(qq, self.q, self.x))

    def slope(self, q):
        """dT/dq along the curve [K kg/J] (<= 0; 0 for a pure fluid), piecewise constant between curve points."""
        qq = self._q(q)
        if self.is_isothermal:
            return _out(np.zeros_like(qq))
        s = np.diff(self.T) / np.diff(self.q)
        i = np.clip(np.searchsorted(self.q, qq, side="right") - 1, 0, s.size - 1)
        return _out(s[i])

    def saturation(self, q) -> SaturationProps:
        """Properties of the liquid and vapour in equilibrium at heat released ``q`` [J/kg] (linear along the
        curve; viscosities linear in their logarithm)."""
        qq = self._q(q)

        def interp(rows):
            out = [np.interp(qq, self.q, rows[k]) for k in (0, 1, 3)]
            mu = np.exp(np.interp(qq, self.q, np.log(rows[2])))
            return Props(_out(out[0]), _out(out[1]), _out(mu), _out(out[2]))

        sig = np.interp(qq, self.q, self.sigma)
        return SaturationProps(interp(self.sat_liquid), interp(self.sat_vapour), _out(sig))

    def z_factor(self, q):
        """Bell & Ghaly's ratio Z = x cp_v |dT/dq| of the vapour's sensible heat to the total heat released [-].

        ``1/h_eff = 1/h_film + Z/h_vapour`` (Silver 1947; Bell & Ghaly 1973). Zero for a pure fluid.
        """
        qq = self._q(q)
        if self.is_isothermal:
            return _out(np.zeros_like(qq))
        _, x = self.at(qq)
        cp_v = np.interp(qq, self.q, self.sat_vapour[1])
        return _out(np.asarray(x) * cp_v * np.abs(np.asarray(self.slope(qq))))

    # ------------------------------------------------------------------------------------ sensible zones
    def superheat(self, T):
        """Heat released [J/kg] by the vapour cooling from ``T`` [K] down to its dew point (desuperheating).

        A pure fluid or a CoolProp mixture: CoolProp enthalpies at this pressure, tabulated every 5 K over
        150 K above the dew point with their heat capacities (cubic Hermite). A table: ∫ cp dT of the vapour
        provider.

        Raises
        ------
        InputError
            For ``T`` below the dew point or above the tabulated range.
        """
        T = np.asarray(to_si(T, "temperature", "T"), dtype=float)
        tol = 1e-9 * self.t_dew
        if not np.all(T >= self.t_dew - tol):
            raise InputError("T", float(np.min(T)), f"a vapour temperature at or above the dew point "
                             f"{self.t_dew:.2f} K of {self.name}")
        if self.vapour_enthalpy is None:
            return _out(_cp_integral(self.vapour, self.t_dew, np.maximum(T, self.t_dew)))
        e = self.vapour_enthalpy
        out = e(np.maximum(T, self.t_dew)) - e.h[0]
        if not np.all(np.isfinite(out)):
            raise InputError("T", float(np.max(T)), f"a vapour temperature within the tabulated superheat, up to "
                             f"{e.T[-1]:.2f} K")
        return _out(out)

    def subcooling(self, T):
        """Heat released [J/kg] by the condensate cooling from its bubble point down to ``T`` [K] (subcooling).

        A pure fluid or a CoolProp mixture: CoolProp enthalpies at this pressure (cubic Hermite on nodes with
        their heat capacities). A table: ∫ cp dT of the liquid provider.

        Raises
        ------
        InputError
            For ``T`` above the bubble point or below the tabulated range.
        """
        T = np.asarray(to_si(T, "temperature", "T"), dtype=float)
        tol = 1e-9 * self.t_bubble
        if not np.all(T <= self.t_bubble + tol):
            raise InputError("T", float(np.max(T)), f"a condensate temperature at or below the bubble point "
                             f"{self.t_bubble:.2f} K of {self.name}")
        if self.liquid_enthalpy is None:
            return _out(_cp_integral(self.liquid, np.minimum(T, self.t_bubble), self.t_bubble))
        e = self.liquid_enthalpy
        out = e.h[-1] - e(np.minimum(T, self.t_bubble))
        if not np.all(np.isfinite(out)):
            raise InputError("T", float(np.min(T)), f"a condensate temperature within the tabulated subcooling, "
                             f"down to {e.T[0]:.2f} K")
        return _out(out)

    # ------------------------------------------------------------------------------------------ other pressures
    def _clapeyron_b(self) -> float:
        """B = latent ρv T_dew / p [K] of ln(p2/p1) = -B (1/T2 - 1/T1) (ideal-gas vapour: M/R = ρv T / p)."""
        return float(self.latent * self.sat_vapour[0][0] * self.t_dew / self.pressure)

    def temperature_at_pressure(self, p, q=0.0):
        """Curve temperature at heat released ``q`` when the stream condenses at pressure ``p`` [Pa] instead.

        A pure fluid: CoolProp's saturation temperature. A mixture or a table: Clausius-Clapeyron from this
        curve, 1/T2 = 1/T1 - ln(p2/p1)/B with B = latent ρv,dew T_dew / p (vapour as an ideal gas, latent heat
        kept), accurate for moderate pressure changes (a few tens of per cent).
        """
        pa = np.asarray(to_si(p, "pressure", "pressure"), dtype=float)
        require(pa, "pressure", gt=0.0, what="a pressure [Pa]")
        T1 = np.asarray(self.at(q)[0])
        if self.pure_name is not None:
            CP = _coolprop()
            pc = CP.PropsSI("pcrit", self.pure_name)
            if not np.all(pa < pc):
                raise InputError("pressure", float(pa.max()), f"below the critical pressure {pc:.6g} Pa of "
                                 f"{self.pure_name}")
            flat = np.ravel(pa)
            T2 = CP.PropsSI("T", "P", flat, "Q", np.ones(flat.size), self.pure_name)
            return _out(np.broadcast_to(np.reshape(T2, pa.shape), np.broadcast(pa, T1).shape))
        return _out(1.0 / (1.0 / T1 - np.log(pa / self.pressure) / self._clapeyron_b()))

    def pressure_at_dew_point(self, T):
        """The condensing pressure [Pa] whose dew point is ``T`` [K]: the inverse of
        :meth:`temperature_at_pressure` at the dew point (for a measured condensing temperature).

        A pure fluid: CoolProp's saturation pressure (vapour quality 1). A CoolProp mixture: the dew-point flash
        of the same composition at ``T`` (exact, as :meth:`at_pressure` recomputes the curve). A table:
        Clausius-Clapeyron from this curve, p2 = p1 exp(B (1/T_dew - 1/T)) with B = latent ρv,dew T_dew / p (the
        vapour an ideal gas, the latent heat kept), as :meth:`at_pressure` moves it.

        Parameters
        ----------
        T : float, array_like or str
            Dew-point temperature [K].

        Returns
        -------
        float or numpy.ndarray
            Pressure [Pa], the shape of ``T``.

        Raises
        ------
        InputError
            ``T`` not a positive temperature, or (CoolProp) at or above the critical temperature / where no dew
            point exists.

        References
        ----------
        Bell, I. H., Wronski, J., Quoilin, S., and Lemort, V. (2014). Pure and pseudo-pure fluid thermophysical
        property evaluation and the open-source thermophysical property library CoolProp. Ind. Eng. Chem. Res.
        53(6), 2498-2508.
        """
        Ta = np.asarray(to_si(T, "temperature", "T"), dtype=float)
        require(Ta, "T", gt=0.0, what="an absolute temperature [K]")
        if self.pure_name is None and self.mixture is None:
            return _out(self.pressure * np.exp(self._clapeyron_b() * (1.0 / self.t_dew - 1.0 / Ta)))
        CP = _coolprop()
        flat = np.ravel(Ta)
        out = np.empty(flat.size)
        if self.pure_name is not None:
            tc = CP.PropsSI("Tcrit", self.pure_name)
            if not np.all(flat < tc):
                raise InputError("T", float(flat.max()), f"below the critical temperature {tc:.6g} K of "
                                 f"{self.pure_name}")
            try:
                out[:] = CP.PropsSI("P", "T", flat, "Q", np.ones(flat.size), self.pure_name)
            except ValueError as exc:
                raise InputError("T", float(flat.min()), f"a temperature within CoolProp's saturation range of "
                                 f"{self.pure_name} ({str(exc)[:80]})") from None
            return _out(np.reshape(out, Ta.shape))
        names, z = _parse_mixture(self.mixture)
        AS = CP.AbstractState("HEOS", "&".join(names))
        AS.set_mole_fractions(list(z))
        for i, t in enumerate(flat):
            try:
                AS.update(CP.QT_INPUTS, 1.0, float(t))
                out[i] = AS.p()
            except ValueError as exc:
                raise InputError("T", float(t), f"a dew point CoolProp finds for {self.mixture} (below its "
                                 f"critical point; {str(exc)[:80]})") from None
        return _out(np.reshape(out, Ta.shape))

    def at_pressure(self, p) -> "CondensingFluid":
        """The same stream condensing at pressure ``p`` [Pa, or a string with a unit].

        Pure fluid: recomputed by CoolProp. CoolProp mixture: recomputed at the same composition. Table: every
        curve temperature shifted by :meth:`temperature_at_pressure` (Clausius-Clapeyron), heat released, vapour
        fractions and liquid properties kept, vapour density scaled as an ideal gas; the liquid and vapour
        providers unchanged (their tables may then warn of extrapolation).
        """
        pa = float(to_si(p, "pressure", "pressure"))
        require(pa, "pressure", gt=0.0, what="a pressure [Pa]")
        if self.pure_name is not None:
            return condensing(pure(self.pure_name, pa))
        if self.mixture is not None:
            return condensing_curve(mixture=self.mixture, pressure=pa, name=self.name.split(" at ")[0])
        b = self._clapeyron_b()
        T2 = 1.0 / (1.0 / self.T - np.log(pa / self.pressure) / b)
        sat_v = self.sat_vapour.copy()
        sat_v[0] = sat_v[0] * (pa / self.pressure) * (self.T / T2)
        for a in (T2, sat_v):
            a.setflags(write=False)
        return replace(self, name=self.name.split(" at ")[0] + f" at {pa:.6g} Pa", pressure=pa, T=T2,
                       t_dew=float(T2[0]), t_bubble=float(T2[-1]), sat_vapour=sat_v,
                       source=self.source + f"; shifted from {self.pressure:.6g} Pa by Clausius-Clapeyron")


# The builders live in condensing_sources (imported last: they build CondensingFluid, defined above).
from .condensing_sources import _parse_mixture, condensing, condensing_curve  # noqa: E402,F401  (now there)
