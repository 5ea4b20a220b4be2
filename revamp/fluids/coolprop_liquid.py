"""Liquid water and pure liquids from CoolProp, through a cached interpolation table (for speed).

CoolProp evaluates water by IAPWS-95 (with the IAPWS 2008 viscosity and IAPWS 2011 conductivity formulations);
each call costs tens of microseconds per state, too slow for vectorized sweeps. So each (fluid, pressure) is
tabulated once on a uniform temperature grid from the triple point (273.16 K for water) up to the saturated liquid,
and `props` interpolates linearly on that grid.

References
----------
Wagner, W. and Pruß, A. (2002), "The IAPWS formulation 1995 for the thermodynamic properties of ordinary water
substance for general and scientific use", J. Phys. Chem. Ref. Data 31(2):387-535.
Bell, I.H., Wronski, J., Quoilin, S. and Lemort, V. (2014), "Pure and pseudo-pure fluid thermophysical property
evaluation and the open-source thermophysical property library CoolProp", Ind. Eng. Chem. Res. 53(6):2498-2508.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache

import numpy as np

from ..errors import InputError
from ..units import require, to_si
from .base import Props, as_temperature, joined_temperatures, range_check

__all__ = ["GRID_STEP", "INTERPOLATION_ERROR", "CoolPropLiquid", "pure", "saturation_temperature_if97", "water"]

#: Starting grid spacing of the cached tables [K] (halved where a fluid's properties curve more).
GRID_STEP = 0.25
#: Stated bound on the relative linear-interpolation error against CoolProp itself (tested at cell midpoints).
INTERPOLATION_ERROR = 1e-4


@dataclass(frozen=True)
class _Grid:
    t0: float
    inv_dt: float
    n: int
    value: np.ndarray  # (4, n): density, heat capacity, viscosity, conductivity at the nodes
    slope: np.ndarray  # (4, n): per grid step, slope[:, i] = value[:, i+1] - value[:, i] (last copied)
    error: float  # largest relative error at the cell midpoints against CoolProp, measured when built
    x_max: float = 0.0  # grid coordinate of saturation, computed as props computes x: T < t_sat <=> x < x_max
    value_rows: tuple = ()  # the rows of value and slope as contiguous 1-D arrays (fast take)
    slope_rows: tuple = ()
    value_list: tuple = ()  # and as lists of Python floats (fast scalar path)
    slope_list: tuple = ()


def _coolprop():
    from CoolProp import CoolProp as CP  # imported lazily: a heavy module

    return CP


def _evaluate(CP, fluid, T, pressure):
    keys = ("D", "C", "V", "L")
    return np.array([CP.PropsSI(k, "T", T, "P", np.full(T.size, pressure), fluid) for k in keys])


@lru_cache(maxsize=64)
def _build_grid(fluid: str, pressure: float, t_low: float, t_sat: float) -> _Grid:
    """Tabulate on a uniform grid, halving the step until the error at the cell midpoints (measured against
    CoolProp) is below half of :data:`INTERPOLATION_ERROR` (or the step reaches GRID_STEP/16)."""
    CP = _coolprop()
    step = GRID_STEP
    for _ in range(5):
        n = max(int(np.ceil((t_sat - t_low) / step)) + 1, 3)
        T = np.linspace(t_low, t_sat, n)
        # below saturation: a (T, P) flash; the last node is the saturated liquid (P, Q=0), exactly on the boundary
        inner = _evaluate(CP, fluid, T[:-1], pressure)
        last = np.array([CP.PropsSI(k, "P", pressure, "Q", 0.0, fluid) for k in ("D", "C", "V", "L")])
        value = np.ascontiguousarray(np.column_stack([inner, last]))
        mid = _evaluate(CP, fluid, 0.5 * (T[1:] + T[:-1]), pressure)
        error = float(np.max(np.abs(0.5 * (value[:, 1:] + value[:, :-1]) / mid - 1.0)))
        if error < 0.5 * INTERPOLATION_ERROR:
            break
        step *= 0.5
    slope = np.empty_like(value)
    slope[:, :-1] = np.diff(value, axis=1)
    slope[:, -1] = slope[:, -2]
    value.setflags(write=False)
    slope.setflags(write=False)
    inv_dt = float((n - 1) / (t_sat - t_low))
    return _Grid(t0=float(T[0]), inv_dt=inv_dt, n=n, value=value, slope=slope, error=error,
                 x_max=(t_sat - float(T[0])) * inv_dt,
                 value_rows=tuple(np.ascontiguousarray(r) for r in value),
                 slope_rows=tuple(np.ascontiguousarray(r) for r in slope),
                 value_list=tuple(r.tolist() for r in value), slope_list=tuple(r.tolist() for r in slope))


#: triple-point and critical pressures of water [Pa] (IAPWS-95, Wagner & Pruss 2002; the triple point as CoolProp
#: computes it)
WATER_TRIPLE_PRESSURE = 611.655
WATER_CRITICAL_PRESSURE = 22.064e6
#: lower end of the water table [K]: the triple point, 273.16 K by definition of the kelvin scale (IAPWS R6-95)
WATER_TRIPLE_TEMPERATURE = 273.16

# IAPWS-IF97 region 4, the backward saturation-temperature equation (Eq. 31), coefficients n1..n10 (Table 34)
_IF97_N = (0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
           -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
           -0.23855557567849, 0.65017534844798e3)


def saturation_temperature_if97(pressure: float) -> float:
    """Saturation temperature of water [K] at ``pressure`` [Pa] by IAPWS-IF97's backward equation, without CoolProp.

    Used where a quick answer is enough (``revamp check`` screens an inlet against it); the property table itself is
    bounded by IAPWS-95's saturated liquid as CoolProp computes it, which this equation matches to within a few
    millikelvin (IF97's stated consistency with IAPWS-95).

    Parameters
    ----------
    pressure : float
        Absolute pressure, 611.213 Pa to 22.064 MPa [Pa].

    References
    ----------
    Wagner, W. et al. (2000), "The IAPWS industrial formulation 1997 for the thermodynamic properties of water and
    steam", J. Eng. Gas Turbines Power 122(1):150-182, Eq. 31.
    """
    n = _IF97_N
    beta = (float(pressure) / 1e6) ** 0.25
    e = beta * beta + n[2] * beta + n[5]
    f = n[0] * beta * beta + n[3] * beta + n[6]
    g = n[1] * beta * beta + n[4] * beta + n[7]
    d = 2.0 * g / (-f - (f * f - 4.0 * e * g) ** 0.5)
    return 0.5 * (n[9] + d - ((n[9] + d) ** 2 - 4.0 * (n[8] + n[9] * d)) ** 0.5)


@lru_cache(maxsize=64)
def _resolve(fluid: str, pressure: float, field_prefix: str, t_low_override) -> tuple:
    """``(grid, t_min, t_max)`` of a liquid: CoolProp imported and the table built here, on first use."""
    CP = _coolprop()
    p = pressure
    p_crit = CP.PropsSI("pcrit", fluid)
    p_trip = CP.PropsSI("ptriple", fluid) if fluid != "Water" else 611.655
    if not p_trip < p < p_crit:
        raise InputError(f"{field_prefix}.pressure", f"{p:.6g} Pa",
                         f"between the triple-point {p_trip:.6g} Pa and critical {p_crit:.6g} Pa pressures of "
                         f"{fluid} (a liquid below its boiling point)")
    t_sat = float(CP.PropsSI("T", "P", p, "Q", 0.0, fluid))
    if t_low_override is not None:
        t_low = t_low_override
    else:
        t_low = max(CP.PropsSI("Ttriple", fluid), CP.PropsSI("Tmin", fluid))
        for _ in range(20):  # some fluids' (T, P) flash fails right at the triple point: start just above it
            try:
                if np.isfinite(_evaluate(CP, fluid, np.array([t_low]), p)).all():
                    break
            except ValueError:  # below the melting line at this pressure
                pass
            t_low += 0.25
    t_low = float(t_low)
    if t_sat - t_low < 1.0:
        raise InputError(f"{field_prefix}.pressure", f"{p:.6g} Pa", f"a pressure where {fluid} is liquid over at "
                         f"least 1 K above {t_low:.2f} K")
    try:
        grid = _build_grid(fluid, p, t_low, t_sat)
    except ValueError as exc:
        raise InputError(f"{field_prefix}.name", fluid, f"a CoolProp fluid with density, heat capacity, "
                         f"viscosity and conductivity models ({str(exc)[:80]})") from None
    if not np.isfinite(grid.value).all():
        raise InputError(f"{field_prefix}.name", fluid, "a CoolProp fluid whose liquid properties are all defined")
    return grid, t_low, t_sat


@dataclass(frozen=True)
class CoolPropLiquid:
    """A pure liquid at a fixed pressure, evaluated through a cached CoolProp table.

    CoolProp (a heavy import) is loaded and the table built at the first use of ``props``, ``t_min``, ``t_max`` or
    ``check``, not when the fluid is made: a unit file can be checked without it (see :meth:`screen`).

    Attributes
    ----------
    name : str
        The name the user gave the fluid (e.g. ``"cooling water"``), or a plain default such as ``"water"``.
    fluid : str
        The CoolProp fluid name.
    pressure : float
        Pressure [Pa].
    t_min : float
        Lowest temperature, the triple point or CoolProp's lower limit [K].
    t_max : float
        Saturation temperature at ``pressure`` [K]; the liquid exists below it only.
    source : str
        Where the properties come from, in plain words (e.g. ``"IAPWS-95 (through CoolProp)"``).
    """

    name: str
    fluid: str
    pressure: float
    source: str = "CoolProp"
    t_low: float | None = None  # lower end of the table [K]; None: the fluid's triple point or CoolProp's Tmin
    field_prefix: str = field(default="pure", repr=False, compare=False)

    def _load(self) -> _Grid:
        grid, t_min, t_max = _resolve(self.fluid, self.pressure, self.field_prefix, self.t_low)
        object.__setattr__(self, "_g", grid)  # a cache, not state: frozen for everything the user sees
        object.__setattr__(self, "_range", (t_min, t_max))
        return grid

    @property
    def _grid(self) -> _Grid:
        try:
            return self._g
        except AttributeError:
            return self._load()

    @property
    def loaded(self) -> bool:
        """Whether the table is built (CoolProp imported)."""
        return "_g" in self.__dict__

    @property
    def t_min(self) -> float:
        try:
            return self._range[0]
        except AttributeError:
            self._load()
            return self._range[0]

    @property
    def t_max(self) -> float:
        try:
            return self._range[1]
        except AttributeError:
            self._load()
            return self._range[1]

    def screen(self):
        """``(t_min, t_max)`` [K] known without CoolProp, or None when only CoolProp can tell.

        Water: the triple point and IAPWS-IF97's saturation temperature (:func:`saturation_temperature_if97`), which
        ``revamp check`` uses so that checking a unit file never imports CoolProp for water.
        """
        if self.loaded:
            return self._range
        if self.fluid == "Water":
            return WATER_TRIPLE_TEMPERATURE, saturation_temperature_if97(self.pressure)
        return None

    def props(self, T) -> Props:
        """Density [kg/m³], heat capacity [J/kg/K], viscosity [Pa s], conductivity [W/m/K] at ``T`` [K].

        Raises
        ------
        InputError
            When any temperature is at or above saturation (not a liquid) or below ``t_min``.
        """
        try:
            g = self._g
        except AttributeError:
            g = self._load()
        if isinstance(T, float) or type(T) is int:  # scalar fast path (rating iterations): plain Python floats
            x = (T - g.t0) * g.inv_dt
            if not 0.0 <= x < g.x_max:
                self._raise_out_of_range(T)
            i = int(x)
            f = x - i
            v, s = g.value_list, g.slope_list
            return Props(v[0][i] + s[0][i] * f, v[1][i] + s[1][i] * f, v[2][i] + s[2][i] * f, v[3][i] + s[3][i] * f)
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            arr = T  # array fast path: no unit parsing, no copy
        else:
            arr, scalar = as_temperature(T)
            if scalar:
                return self.props(float(arr))
        x = (arr.reshape(-1) - g.t0) * g.inv_dt
        if x.size and not (x.min() >= 0.0 and x.max() < g.x_max):  # also false for NaN
            self._raise_out_of_range(arr)
        i = x.astype(np.intp)  # at most n - 1 (the last slope is a copy), even if x_max rounds above n - 1
        frac = x - i
        out = []
        for k in range(4):
            o = g.slope_rows[k].take(i)
            o *= frac
            o += g.value_rows[k].take(i)
            out.append(o.reshape(arr.shape))
        return Props(*out)

    def viscosity_at(self, T):
        """Dynamic viscosity alone [Pa s] at ``T`` [K]: exactly ``props(T).viscosity`` (the same interpolation in the
        same table), without the other three rows. Raises InputError where :meth:`props` does."""
        try:
            g = self._g
        except AttributeError:
            g = self._load()
        if isinstance(T, float) or type(T) is int:  # scalar: the scalar path's steps
            x = (T - g.t0) * g.inv_dt
            if not 0.0 <= x < g.x_max:
                self._raise_out_of_range(T)
            i = int(x)
            return g.value_list[2][i] + g.slope_list[2][i] * (x - i)
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            arr = T
        else:
            arr, scalar = as_temperature(T)
            if scalar:
                return self.viscosity_at(float(arr))
        x = (arr.reshape(-1) - g.t0) * g.inv_dt
        if x.size and not (x.min() >= 0.0 and x.max() < g.x_max):  # also false for NaN
            self._raise_out_of_range(arr)
        i = x.astype(np.intp)
        o = g.slope_rows[2].take(i)
        o *= x - i
        o += g.value_rows[2].take(i)
        return o.reshape(arr.shape)

    def _raise_out_of_range(self, T):
        arr, _ = as_temperature(T)  # raises for NaN, infinity, non-positive
        hi, lo = float(arr.max()), float(arr.min())
        if hi >= self.t_max:
            raise InputError("T", f"{hi:.6g} K", f"below saturation {self.t_max:.2f} K at "
                             f"{self.pressure:.6g} Pa (the {self.fluid} provider is liquid only)")
        raise InputError("T", f"{lo:.6g} K", f"at least {self.t_min:.2f} K (lower limit of the "
                         f"{self.fluid} liquid table)")

    def check(self, *T) -> list[str]:
        """Warnings for temperatures outside [t_min, t_max) (props raises for those); one line for all of ``T``."""
        return range_check(self.name, joined_temperatures(*T), self.t_min, np.nextafter(self.t_max, 0.0),
                           "liquid range")


def _pressure(pressure, field_prefix: str) -> float:
    p = to_si(pressure, "pressure", f"{field_prefix}.pressure")
    require(p, f"{field_prefix}.pressure", gt=0.0, what="a pressure [Pa]")
    return float(p)


def _name(name, field: str, default: str) -> str:
    if name is None:
        return default
    if not isinstance(name, str) or not name.strip():
        raise InputError(field, name, "a non-empty name for the fluid (e.g. 'cooling water')")
    return name.strip()


def water(pressure="10 bar", name: str | None = None) -> CoolPropLiquid:
    """Liquid water by IAPWS-95 (through CoolProp), from 273.16 K up to saturation at ``pressure``.

    Parameters
    ----------
    pressure : float or str
        Absolute pressure [Pa], or a string with a unit such as ``"10 bar"``.
    name : str, optional
        The user's own name for it (e.g. ``"cooling water"``); ``"water"`` when not given.

    Returns
    -------
    CoolPropLiquid
        ``props(T)`` interpolates linearly on a cached table with 0.25 K spacing (refined where needed); the
        maximum relative interpolation error against CoolProp is below 1e-4 (:data:`INTERPOLATION_ERROR`,
        measured at build time and tested at the midpoints of the grid cells, where linear interpolation errs
        most; about 3e-5 for water at 10 bar).

    Raises
    ------
    InputError
        ``props`` raises for a temperature at or above saturation (field ``"T"``) or below 273.16 K.

    References
    ----------
    Wagner & Pruß (2002), J. Phys. Chem. Ref. Data 31:387 (IAPWS-95); Huber et al. (2009), J. Phys. Chem. Ref.
    Data 38:101 (viscosity); Huber et al. (2012), J. Phys. Chem. Ref. Data 41:033102 (conductivity); all as coded
    in CoolProp (Bell et al. 2014, Ind. Eng. Chem. Res. 53:2498).

    Examples
    --------
    >>> w = water("10 bar")
    >>> round(w.t_max, 2)   # saturation at 10 bar [K]
    453.03
    >>> round(w.props("25 degC").density, 1)
    997.5
    """
    p = _pressure(pressure, "water")
    # checked without CoolProp (imported at the first props() call): IAPWS triple-point and critical pressures, and
    # at least 1 K of liquid above the triple point (IF97 saturation temperature)
    if not WATER_TRIPLE_PRESSURE < p < WATER_CRITICAL_PRESSURE or \
            saturation_temperature_if97(p) - WATER_TRIPLE_TEMPERATURE < 1.0:
        raise InputError("water.pressure", f"{p:.6g} Pa",
                         f"between the triple-point {WATER_TRIPLE_PRESSURE:.6g} Pa and critical "
                         f"{WATER_CRITICAL_PRESSURE:.6g} Pa pressures of water, with at least 1 K of liquid above "
                         f"{WATER_TRIPLE_TEMPERATURE} K (at least about 660 Pa)")
    return CoolPropLiquid(name=_name(name, "water.name", "water"), fluid="Water", pressure=p,
                          source="IAPWS-95 (through CoolProp)", t_low=WATER_TRIPLE_TEMPERATURE, field_prefix="water")


@lru_cache(maxsize=1)
def _names_lowercase() -> dict:
    """CoolProp's fluid names and aliases, lower-cased -> canonical name (for case-insensitive look-up)."""
    CP = _coolprop()
    out = {}
    for canonical in CP.FluidsList():
        out[canonical.lower()] = canonical
        for alias in CP.get_fluid_param_string(canonical, "aliases").split(","):
            if alias.strip():
                out.setdefault(alias.strip().lower(), canonical)
    return out


def _canonical_name(CP, name: str) -> str:
    """CoolProp's canonical name of ``name`` (an exact name or alias, else matched ignoring case)."""
    try:
        return CP.get_fluid_param_string(name, "name")
    except ValueError:
        found = _names_lowercase().get(name.lower())
        if found is None:
            raise
        return found


def pure(name: str, pressure="10 bar", label: str | None = None) -> CoolPropLiquid:
    """A pure fluid from CoolProp as a liquid at ``pressure``, from its triple point up to saturation.

    Parameters
    ----------
    name : str
        A CoolProp fluid name or alias, e.g. ``"n-Heptane"``, ``"Toluene"``, ``"R134a"``, ``"Ethanol"``
        (matched ignoring case when not exact, so ``"pentane"`` is n-Pentane). The full list is
        ``CoolProp.CoolProp.FluidsList()``.
    pressure : float or str
        Absolute pressure [Pa], or a string with a unit; between the triple-point and critical pressures.
    label : str, optional
        The user's own name for it (shown in reports); the CoolProp name when not given.

    Returns
    -------
    CoolPropLiquid
        Evaluated through a cached linear interpolation table (0.25 K spacing, halved until the error at the cell
        midpoints is below 5e-5; at most 16 times finer), as :func:`water`. Near the triple point of some fluids
        viscosity curves so sharply that the finest grid still errs more: ``_grid.error`` holds the measured bound.

    Raises
    ------
    InputError
        Unknown fluid name (field ``"pure.name"``), a pressure with no liquid range, or a fluid without
        transport-property models in CoolProp.
    """
    if not isinstance(name, str) or not name.strip():
        raise InputError("pure.name", name, "a CoolProp fluid name (see CoolProp.CoolProp.FluidsList())")
    if any(ch in name for ch in "&[]:|"):  # CoolProp's mixture and backend syntax: never a pure fluid
        raise InputError("pure.name", name, "one pure fluid's name (mixtures such as 'Water&Ethanol' and backend "
                                            "prefixes are not supported: give the mixture as a property table)")
    CP = _coolprop()
    try:
        canonical = _canonical_name(CP, name.strip())
    except ValueError:
        some = ", ".join(sorted(CP.FluidsList())[:12])
        raise InputError("pure.name", name, f"a CoolProp fluid name; list them with "
                         f"CoolProp.CoolProp.FluidsList() (e.g. {some}, ...)") from None
    liquid = CoolPropLiquid(name=_name(label, "pure.label", canonical), fluid=canonical,
                            pressure=_pressure(pressure, "pure"), source=f"CoolProp ({canonical})", field_prefix="pure")
    liquid.t_max  # the pressure range and the table need CoolProp's data for this fluid: checked here, at once
    return liquid
