"""The fluid protocol: a frozen `Props` record and the helpers every provider shares.

Every fluid is a frozen object with ``name``, ``t_min``, ``t_max`` [K], ``props(T) -> Props`` and
``check(T) -> list[str]`` (see docs/architecture.md, "Layer 1"). A provider may add ``viscosity_at(T)``, exactly
``props(T).viscosity`` without the other properties: the rating engine uses it for the wall viscosity when present.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Protocol, runtime_checkable

import numpy as np

from ..errors import InputError
from ..units import to_si

__all__ = ["Fluid", "Props", "as_temperature", "joined_temperatures", "range_check"]


@dataclass(frozen=True)
class Props:
    """Liquid properties at one or many temperatures.

    Attributes
    ----------
    density : float or numpy.ndarray
        Density [kg/m³].
    heat_capacity : float or numpy.ndarray
        Isobaric specific heat capacity [J/kg/K].
    viscosity : float or numpy.ndarray
        Dynamic viscosity [Pa s].
    conductivity : float or numpy.ndarray
        Thermal conductivity [W/m/K].

    Floats for a scalar temperature, arrays of the temperature's shape otherwise.
    """

    density: float | np.ndarray
    heat_capacity: float | np.ndarray
    viscosity: float | np.ndarray
    conductivity: float | np.ndarray

    @property
    def prandtl(self):
        """Prandtl number cp·μ/k [-]."""
        return self.heat_capacity * self.viscosity / self.conductivity


@runtime_checkable
class Fluid(Protocol):
    """What the rating engine needs from a fluid."""

    name: str
    t_min: float
    t_max: float

    def props(self, T) -> Props: ...

    def check(self, *T) -> list[str]: ...


def as_temperature(T, field: str = "T"):
    """Parse a temperature input (K number, array, or string with a unit) to (array, is_scalar).

    Raises InputError for non-finite or non-positive values.
    """
    if isinstance(T, np.ndarray) and T.dtype == np.float64:
        arr = T  # fast path for the vectorized rating engine: no copy, no unit parsing
        if not np.isfinite(arr).all():
            raise InputError(field, T, "a finite temperature (K)")
    else:
        arr = np.asarray(to_si(T, "temperature", field), dtype=float)
    scalar = arr.ndim == 0
    if (arr <= 0.0).any():
        raise InputError(field, T, "a temperature > 0 K")
    return arr, scalar


def range_check(name: str, T, t_min: float, t_max: float, what: str = "valid range") -> list[str]:
    """One warning string when any temperature lies outside [t_min, t_max], else []."""
    arr = np.atleast_1d(np.asarray(to_si(T, "temperature", "T") if isinstance(T, str) else T, dtype=float))
    arr = arr[np.isfinite(arr)]
    if arr.size == 0:
        return []
    low = arr < t_min
    high = arr > t_max
    n = int(low.sum() + high.sum())
    if n == 0:
        return []
    shown = float(arr.min()) if low.any() else float(arr.max())
    count = f" ({n} of {arr.size} temperatures)" if arr.size > 1 else ""
    return [f"{name}: T = {shown:.2f} K is outside its {what} {t_min:.2f} to {t_max:.2f} K{count}"]



def joined_temperatures(*T) -> np.ndarray:
    """Several temperature inputs (numbers, arrays, strings with units) as one flat array [K], for a ``check``
    that reports each warning once over all of them (e.g. ``fluid.check(t_in, t_out)``)."""
    parts = [np.ravel(np.asarray(to_si(t, "temperature", "T") if isinstance(t, str) else t, dtype=float)) for t in T]
    return np.concatenate(parts) if parts else np.array([])
