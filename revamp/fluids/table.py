"""User property tables (as on an exchanger data sheet) and constant-property fluids."""
from __future__ import annotations

import math
from bisect import bisect_right
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError
from ..units import to_si
from .base import Props, as_temperature, joined_temperatures, range_check

__all__ = ["ConstantFluid", "TableFluid", "constant", "table"]

_KINDS = (("density", "density"), ("heat_capacity", "heat_capacity"), ("viscosity", "viscosity"),
          ("conductivity", "conductivity"))


def _column(values, kind: str, field_name: str) -> np.ndarray:
    if isinstance(values, (str, bytes)) or np.ndim(values) == 0:
        raise InputError(field_name, values, "a list of values (SI numbers or strings with units)")
    out = np.array([to_si(v, kind, f"{field_name}[{j}]") for j, v in enumerate(values)], dtype=float)
    return out


@dataclass(frozen=True)
class TableFluid:
    """Properties interpolated from data-sheet points.

    Linear in temperature between points for density, heat capacity and conductivity, linear in ln(viscosity).
    Outside the tabulated range the end segments are extrapolated the same way and :meth:`check` warns
    ("extrapolated"); an extrapolation that would give a non-positive property raises :class:`InputError`.

    Attributes
    ----------
    name : str
    t_min, t_max : float
        First and last tabulated temperatures [K].
    """

    name: str
    t_min: float
    t_max: float
    T: np.ndarray = field(repr=False)
    columns: np.ndarray = field(repr=False)  # (4, n): density, cp, ln(viscosity), conductivity
    slopes: np.ndarray = field(repr=False)  # (4, n-1): per K
    lists: tuple = field(repr=False, default=())  # (T, columns, slopes) as Python lists, for the scalar path

    def props(self, T) -> Props:
        """Density [kg/m³], heat capacity [J/kg/K], viscosity [Pa s], conductivity [W/m/K] at ``T`` [K]."""
        if (isinstance(T, float) or type(T) is int) and self.lists and T > 0.0:  # scalar fast path
            t_list, cols, slopes = self.lists
            j = min(max(bisect_right(t_list, T) - 1, 0), len(t_list) - 2)
            dt = T - t_list[j]
            d, c, m, k = (cols[q][j] + slopes[q][j] * dt for q in range(4))
            if d > 0.0 and c > 0.0 and k > 0.0 and math.isfinite(m):
                return Props(float(d), float(c), math.exp(m), float(k))
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            arr, scalar = T, False  # array fast path: no unit parsing, no copy
        else:
            arr, scalar = as_temperature(T)
        flat = arr.reshape(-1)
        i = np.searchsorted(self.T, flat, side="right") - 1
        np.clip(i, 0, self.T.size - 2, out=i)
        dt = flat - self.T.take(i)
        out = []
        for k in range(4):
            o = self.slopes[k].take(i)
            o *= dt
            o += self.columns[k].take(i)
            out.append(o)
        np.exp(out[2], out=out[2])
        for k in (0, 1, 3):
            if flat.size and not out[k].min() > 0.0:  # also catches NaN temperatures
                if not np.isfinite(flat).all():
                    as_temperature(flat)  # raises the non-finite error
                bad = flat[~(out[k] > 0.0)][0]
                raise InputError("T", f"{bad:.6g} K", f"a temperature where the extrapolated table of "
                                 f"{self.name} stays positive (table spans {self.t_min:.2f} to {self.t_max:.2f} K)")
        if scalar:
            return Props(float(out[0][0]), float(out[1][0]), float(out[2][0]), float(out[3][0]))
        return Props(*(o.reshape(arr.shape) for o in out))

    def viscosity_at(self, T):
        """Dynamic viscosity alone [Pa s] at ``T`` [K]: exactly ``props(T).viscosity`` wherever :meth:`props`
        answers (the same interpolation in ln(viscosity)), without the other three columns. The viscosity is
        positive at any temperature; the other columns' extrapolation limits, for which :meth:`props` raises, do not
        apply to it."""
        if (isinstance(T, float) or type(T) is int) and self.lists and T > 0.0:  # scalar: the scalar path's steps
            t_list, cols, slopes = self.lists
            j = min(max(bisect_right(t_list, T) - 1, 0), len(t_list) - 2)
            m = cols[2][j] + slopes[2][j] * (T - t_list[j])
            if math.isfinite(m):
                return math.exp(m)
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            arr, scalar = T, False
        else:
            arr, scalar = as_temperature(T)
        flat = arr.reshape(-1)
        if not np.isfinite(flat).all():
            as_temperature(flat)  # raises the non-finite error
        i = np.searchsorted(self.T, flat, side="right") - 1
        np.clip(i, 0, self.T.size - 2, out=i)
        dt = flat - self.T.take(i)
        o = self.slopes[2].take(i)
        o *= dt
        o += self.columns[2].take(i)
        np.exp(o, out=o)
        return float(o[0]) if scalar else o.reshape(arr.shape)

    def check(self, *T) -> list[str]:
        """A warning ("extrapolated") when any temperature lies outside the tabulated range; one for all of ``T``."""
        return range_check(f"{self.name}: extrapolated", joined_temperatures(*T), self.t_min, self.t_max,
                           "tabulated range")


def table(T, density, heat_capacity, viscosity, conductivity, name: str = "table") -> TableFluid:
    """A fluid from tabulated points, e.g. the property block of an exchanger data sheet.

    Parameters
    ----------
    T : list
        Temperatures [K] (numbers, or strings such as ``"120 degC"``), at least 2, strictly increasing.
    density : list
        Density at each temperature [kg/m³], > 0.
    heat_capacity : list
        Isobaric heat capacity [J/kg/K], > 0 (strings such as ``"0.55 BTU/lb/degF"`` accepted).
    viscosity : list
        Dynamic viscosity [Pa s], > 0 (strings such as ``"1.2 cP"`` accepted).
    conductivity : list
        Thermal conductivity [W/m/K], > 0.
    name : str
        A printable name.

    Returns
    -------
    TableFluid

    Examples
    --------
    >>> f = table(T=["50 degC", "150 degC"], density=[850, 780], heat_capacity=[2000, 2400],
    ...           viscosity=["4 cP", "1 cP"], conductivity=[0.13, 0.12])
    >>> p = f.props("100 degC")
    >>> round(p.density, 1), round(p.viscosity * 1e3, 3)
    (815.0, 2.0)
    >>> f.check("200 degC")[0][:30]
    'table: extrapolated: T = 473.1'
    """
    Tk = _column(T, "temperature", "table.T")
    n = Tk.size
    if n < 2:
        raise InputError("table.T", T, "at least 2 temperatures")
    if not (np.diff(Tk) > 0).all():
        raise InputError("table.T", T, "strictly increasing temperatures")
    if (Tk <= 0).any():
        raise InputError("table.T", T, "temperatures > 0 K")
    cols = []
    given = {"density": density, "heat_capacity": heat_capacity, "viscosity": viscosity, "conductivity": conductivity}
    for key, kind in _KINDS:
        c = _column(given[key], kind, f"table.{key}")
        if c.size != n:
            raise InputError(f"table.{key}", given[key], f"{n} values, one per temperature")
        if not (c > 0).all():
            raise InputError(f"table.{key}", given[key], "positive values")
        cols.append(np.log(c) if key == "viscosity" else c)
    columns = np.array(cols)
    slopes = np.diff(columns, axis=1) / np.diff(Tk)
    for a in (Tk, columns, slopes):
        a.setflags(write=False)
    lists = (Tk.tolist(), tuple(r.tolist() for r in columns), tuple(r.tolist() for r in slopes))
    return TableFluid(name=str(name), t_min=float(Tk[0]), t_max=float(Tk[-1]), T=Tk, columns=columns,
                      slopes=slopes, lists=lists)


@dataclass(frozen=True)
class ConstantFluid:
    """A fluid with temperature-independent properties (valid at any temperature > 0 K)."""

    name: str
    density: float
    heat_capacity: float
    viscosity: float
    conductivity: float
    t_min: float = 0.0
    t_max: float = float("inf")

    def props(self, T) -> Props:
        """The constant properties, as floats for scalar ``T`` or arrays of ``T``'s shape."""
        if (isinstance(T, float) or type(T) is int) and T > 0.0 and math.isfinite(T):  # scalar fast path
            return Props(self.density, self.heat_capacity, self.viscosity, self.conductivity)
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            arr, scalar = T, False  # array fast path (NaN gives NaN-free constants: nothing depends on T)
        else:
            arr, scalar = as_temperature(T)
        if scalar:
            return Props(self.density, self.heat_capacity, self.viscosity, self.conductivity)
        return Props(np.full(arr.shape, self.density), np.full(arr.shape, self.heat_capacity),
                     np.full(arr.shape, self.viscosity), np.full(arr.shape, self.conductivity))

    def viscosity_at(self, T):
        """The viscosity alone [Pa s]: exactly ``props(T).viscosity`` (a float for scalar ``T``, else an array of
        ``T``'s shape)."""
        if (isinstance(T, float) or type(T) is int) and T > 0.0 and math.isfinite(T):
            return self.viscosity
        if isinstance(T, np.ndarray) and T.dtype == np.float64 and T.ndim:
            return np.full(T.shape, self.viscosity)
        arr, scalar = as_temperature(T)
        return self.viscosity if scalar else np.full(arr.shape, self.viscosity)

    def check(self, *T) -> list[str]:
        """Always ``[]``: a constant fluid has no range."""
        return []


def constant(density, heat_capacity, viscosity, conductivity, name: str = "constant") -> ConstantFluid:
    """A fluid with constant properties.

    Parameters
    ----------
    density : float or str
        Density [kg/m³], > 0.
    heat_capacity : float or str
        Heat capacity [J/kg/K], > 0.
    viscosity : float or str
        Dynamic viscosity [Pa s], > 0.
    conductivity : float or str
        Thermal conductivity [W/m/K], > 0.

    Examples
    --------
    >>> constant(density=1000, heat_capacity=4180, viscosity="1 cP", conductivity=0.6).props(300.0).viscosity
    0.001
    """
    vals = {}
    given = {"density": density, "heat_capacity": heat_capacity, "viscosity": viscosity, "conductivity": conductivity}
    for key, kind in _KINDS:
        v = to_si(given[key], kind, f"constant.{key}")
        if np.ndim(v) != 0 or not v > 0:
            raise InputError(f"constant.{key}", given[key], f"one positive number ({kind.replace('_', ' ')})")
        vals[key] = float(v)
    return ConstantFluid(name=str(name), **vals)
