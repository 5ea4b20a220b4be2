"""The hot-day limit of an air cooler: the rating across ambient temperature and the ambient at which a target tube
outlet is lost (layer 6).

Usage: ``hd = hot_day(ac, svc, ambient=np.linspace(273.15, 318.15, 10), t_out_target="60 degC")``; then
``hd.ambient_limit`` is the hottest ambient [K] at which the tube outlet still meets 60 °C, ``hd.to_frame()`` the sweep
and :func:`revamp.plots_air.hot_day_chart` its chart.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd
from scipy.optimize import brentq

from .errors import InputError
from .rating_air import rate_air_cooler
from .service_air import AirService
from .units import to_si

__all__ = ["HotDay", "hot_day"]


@dataclass(frozen=True)
class HotDay:
    """A design-day sweep of an air cooler.

    Attributes
    ----------
    ambient : ndarray
        Ambient temperatures [K].
    duty, t_out_tube, t_out_air, fan_power : ndarray
        At each ambient [W, K, K, W].
    t_out_target : float or None
        The tube outlet to meet [K].
    ambient_limit : float or None
        The hottest ambient at which the tube outlet still meets the target [K]; NaN when it is not met even at the
        coldest ambient of the search range (-40 °C), +inf when it is met up to 5 K below the target itself.
    rating : AirRating
        The sweep's rating.
    notes : tuple of str
    """

    ambient: np.ndarray
    duty: np.ndarray
    t_out_tube: np.ndarray
    t_out_air: np.ndarray
    fan_power: np.ndarray
    t_out_target: float | None
    ambient_limit: float | None
    rating: object = field(repr=False)
    notes: tuple = ()

    def to_frame(self) -> pd.DataFrame:
        """One row per ambient (SI)."""
        return pd.DataFrame({"ambient": self.ambient, "duty": self.duty, "t_out_tube": self.t_out_tube,
                             "t_out_air": self.t_out_air, "fan_power": self.fan_power})


def _scalar(service, name):
    v = getattr(service, name)
    if v is not None and np.ndim(v) != 0:
        raise InputError(f"service.{name}", v, "a single value for hot_day() (the sweep is over the ambient)")


def hot_day(exchanger, service: AirService, ambient, t_out_target=None, **rating_kw) -> HotDay:
    """Rate an air cooler across ambient temperatures and find the ambient at which a target outlet is lost.

    The tube outlet rises with the ambient (less driving force); the limit is the ambient at which it equals the
    target, found by Brent's method on the rating (to 0.01 K) between -40 °C and 5 K below the target.

    Parameters
    ----------
    exchanger : AirCooler
    service : AirService
        A single case; its ``air_in`` is replaced by each ``ambient``. With a mass air flow the fans deliver the same
        mass at every ambient (a fixed-speed fan delivers the same volume, so less mass on a hot day: give a face
        velocity to model that).
    ambient : array_like or str
        Ambient temperatures [K] (or one string with a unit).
    t_out_target : float or str, optional
        Tube outlet temperature to meet [K].
    **rating_kw
        Methods passed to :func:`revamp.rating_air.rate_air_cooler`.

    Returns
    -------
    HotDay
    """
    if not isinstance(service, AirService):
        raise InputError("service", service, "a revamp.AirService")
    for name in ("air_flow", "face_velocity", "fouling_tube", "fouling_air"):
        _scalar(service, name)
    for name in ("flow", "t_in"):
        if np.ndim(getattr(service.tube, name)) != 0:
            raise InputError(f"service.tube.{name}", getattr(service.tube, name), "a single value for hot_day()")
    amb = np.atleast_1d(np.asarray(to_si(ambient, "temperature", "ambient"), dtype=float))
    r = rate_air_cooler(exchanger, service.replace(air_in=amb), **rating_kw)
    target = limit = None
    notes = []
    if t_out_target is not None:
        target = float(to_si(t_out_target, "temperature", "t_out_target"))
        if not service.tube.t_in > target:
            raise InputError("t_out_target", t_out_target, f"below the tube inlet {service.tube.t_in:.2f} K (a "
                             "cooling target)")
        lo, hi = 233.15, min(target - 5.0, 399.0)

        def gap(t):
            return float(rate_air_cooler(exchanger, service.replace(air_in=t), **rating_kw).t_out_tube) - target

        if hi <= lo or gap(lo) > 0:
            limit = float("nan")
            notes.append("the target outlet is not met even at -40 °C ambient")
        elif gap(hi) <= 0:
            limit = float("inf")
            notes.append("the target outlet is met up to 5 K below the target itself (no hot-day limit)")
        else:
            limit = float(brentq(gap, lo, hi, xtol=0.01))
    if service.air_flow is not None:
        notes.append("air mass flow held at every ambient (fixed-speed fans deliver a fixed volume: less mass on a "
                     "hot day; give a face velocity to model that)")
    return HotDay(amb, np.atleast_1d(r.duty), np.atleast_1d(r.t_out_tube), np.atleast_1d(r.t_out_air),
                  np.atleast_1d(r.fan_power), target, limit, r, tuple(notes))
