"""Fouling of an air cooler from plant data, by the tube-side heat balance (layer 6).

Air outlet temperature and air flow are rarely measured on an air cooler. The duty comes from the tube side (flow,
inlet and outlet temperatures); the air takes it at a *stated* air flow (from the fan data sheet, or from the fan
power through the fan laws: :func:`revamp.correlations.air.air_flow_from_fan_power`) and the measured ambient. The effectiveness then gives the NTU of the bundle as it
operates, hence ``U_actual``; the clean ``U`` is the rating of the clean bundle at the same operating state; their
difference is the total fouling on the bare outside-tube basis, ``Rf = 1/U_actual - 1/U_clean``.

The stated air flow is the weak input: the band of :class:`AirMonitoring` is the range of ``Rf`` over the air flow
at (1 ± ``air_flow_uncertainty``) and the tube temperatures at ± ``t_uncertainty`` (each varied alone and the
effects added in quadrature, a linear propagation in the manner of JCGM 100).

References
----------
JCGM 100 (2008). Evaluation of measurement data: guide to the expression of uncertainty in measurement (GUM).
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, PennWell.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from .aircooler import AirCooler
from .correlations.air import pressure_at_altitude
from .errors import InputError
from .rating_air import rate_air_cooler
from .service_air import AirService
from .thermal_air import effectiveness_air_cooler
from .units import require, to_si

__all__ = ["AirMonitoring", "monitor_air"]


@dataclass(frozen=True)
class AirMonitoring:
    """Fouling of an air cooler from the tube-side balance, one value per data row.

    Attributes
    ----------
    duty : ndarray
        Tube-side duty [W].
    U_actual, U_clean : ndarray
        Overall coefficients on the bare outside-tube area [W/m²K]: as operating, and clean at the same state.
    fouling : ndarray
        Total fouling on the bare outside-tube area [m²K/W] (negative values kept: they say the data or the stated
        air flow disagree with the clean rating).
    fouling_low, fouling_high : ndarray
        The band [m²K/W] (see the module text).
    t_out_air : ndarray
        Air outlet implied by the balance [K].
    notes : tuple of str
    """

    duty: np.ndarray
    U_actual: np.ndarray
    U_clean: np.ndarray
    fouling: np.ndarray
    fouling_low: np.ndarray
    fouling_high: np.ndarray
    t_out_air: np.ndarray
    notes: tuple = ()
    exchanger: object = field(default=None, repr=False)

    def to_frame(self) -> pd.DataFrame:
        """One row per data row (SI)."""
        return pd.DataFrame({"duty": self.duty, "U_actual": self.U_actual, "U_clean": self.U_clean,
                             "fouling": self.fouling, "fouling_low": self.fouling_low,
                             "fouling_high": self.fouling_high, "t_out_air": self.t_out_air})


def _ntu_from_eps(eps, cr, tube_min, rows, passes):
    """Invert the bundle's effectiveness by bisection on log NTU (effectiveness rises with NTU), per case."""
    lo, hi = np.full(eps.shape, -12.0), np.full(eps.shape, 4.0)
    for _ in range(70):
        mid = 0.5 * (lo + hi)
        e, _w = effectiveness_air_cooler(np.exp(mid), cr, tube_min, rows, passes)
        below = e < eps
        lo, hi = np.where(below, mid, lo), np.where(below, hi, mid)
    e_max, _w = effectiveness_air_cooler(np.exp(4.0), cr, tube_min, rows, passes)
    return np.where(eps < e_max, np.exp(0.5 * (lo + hi)), np.nan)


def _u_actual(ac, svc, t_out, p_air):
    """U from the tube-side duty and the stated air flow; also the duty and the implied air outlet."""
    fluid = svc.tube.fluid
    t_in, ta = np.asarray(svc.tube.t_in, dtype=float), np.asarray(svc.air_in, dtype=float)
    pt = fluid.props(0.5 * (t_in + t_out))
    C_t = np.asarray(svc.tube.flow) * np.asarray(pt.heat_capacity)
    q = C_t * (t_in - t_out)
    if svc.air_flow is not None:
        m_air = np.asarray(svc.air_flow, dtype=float)
    else:
        m_air = np.asarray(svc.face_velocity) * p_air / (287.05 * ta) * ac.face_area * ac.bundles
    # air heat capacity at the mean of ambient and an outlet first estimated with cp = 1007 J/kg/K
    from .correlations.air import air_properties

    t_air_out = ta + q / (m_air * 1007.0)
    cp_a = np.asarray(air_properties(0.5 * (ta + t_air_out), pressure=p_air).heat_capacity)
    C_a = m_air * cp_a
    t_air_out = ta + q / C_a
    c_min, c_max = np.minimum(C_t, C_a), np.maximum(C_t, C_a)
    eps = q / (c_min * (t_in - ta))
    ntu = _ntu_from_eps(np.asarray(eps, dtype=float), c_min / c_max, C_t <= C_a, ac.tube_rows, ac.tube_passes)
    return ntu * c_min / ac.area, q, t_air_out


def monitor_air(exchanger: AirCooler, service: AirService, t_out_tube, air_flow_uncertainty=0.15,
                t_uncertainty="1.5 K", **rating_kw) -> AirMonitoring:
    """The fouling of an air cooler from measured tube-side data and a stated air flow.

    Parameters
    ----------
    exchanger : AirCooler
    service : AirService
        The measured tube flow and inlet, the measured ambient (``air_in``), and the stated air flow (or face
        velocity); arrays for a data series. Its fouling fields are ignored.
    t_out_tube : float, array_like or str
        Measured tube-side outlet [K].
    air_flow_uncertainty : float
        Relative standard uncertainty of the stated air flow [-] (default 0.15: fan curves and blade pitch settings
        are rarely known better; common practice, no source).
    t_uncertainty : float or str
        Standard uncertainty of each temperature [K] (default 1.5 K: a class 1 type K thermocouple, IEC 60584).
    **rating_kw
        Methods for the clean rating (:func:`revamp.rating_air.rate_air_cooler`).

    Returns
    -------
    AirMonitoring

    Raises
    ------
    InputError
        When the measured outlet is not between the ambient and the tube inlet in a single case.
    """
    if not isinstance(exchanger, AirCooler):
        raise InputError("exchanger", exchanger, "a revamp.AirCooler")
    if not isinstance(service, AirService):
        raise InputError("service", service, "a revamp.AirService")
    t_out = np.asarray(to_si(t_out_tube, "temperature", "t_out_tube"), dtype=float)
    u_air = float(require(to_si(air_flow_uncertainty, "dimensionless", "air_flow_uncertainty"),
                          "air_flow_uncertainty", ge=0, lt=1))
    u_t = float(require(to_si(t_uncertainty, "temperature_difference", "t_uncertainty"), "t_uncertainty", ge=0))
    t_in, ta = np.asarray(service.tube.t_in, dtype=float), np.asarray(service.air_in, dtype=float)
    shape = np.broadcast_shapes(t_out.shape, t_in.shape, ta.shape, np.shape(service.tube.flow))
    bad = ~((t_out < t_in) & (t_out > ta))
    notes = []
    if np.any(np.broadcast_to(bad, shape)):
        if shape == ():
            raise InputError("t_out_tube", float(t_out), f"between the ambient {float(ta):.2f} K and the tube inlet "
                             f"{float(t_in):.2f} K (a cooled stream)")
        notes.append(f"{int(np.sum(np.broadcast_to(bad, shape)))} row(s) with the outlet not between the ambient "
                     "and the inlet: NaN")
    p_air = pressure_at_altitude(service.altitude)
    clean = rate_air_cooler(exchanger, service.replace(fouling_tube=0.0, fouling_air=0.0), **rating_kw)
    # the clean bundle at the measured state: its films at the measured outlet would differ slightly from those at
    # its own predicted outlet; the rating's U_clean is used (its property temperatures differ by the fouling's
    # effect on the outlets, a second-order term)
    U_clean = np.asarray(clean.U_clean, dtype=float)

    def fouling_at(svc, tout):
        U, q, t_air = _u_actual(exchanger, svc, tout, p_air)
        with np.errstate(divide="ignore", invalid="ignore"):
            return 1.0 / U - 1.0 / U_clean, U, q, t_air

    rf, U, q, t_air = fouling_at(service, t_out)
    scale = (lambda s: service.replace(air_flow=np.multiply(service.air_flow, s))) if service.air_flow is not None \
        else (lambda s: service.replace(face_velocity=np.multiply(service.face_velocity, s)))
    deltas = []
    if u_air > 0:
        hi_air, _, _, _ = fouling_at(scale(1.0 + u_air), t_out)
        lo_air, _, _, _ = fouling_at(scale(1.0 - u_air), t_out)
        deltas.append(0.5 * np.abs(hi_air - lo_air))
    if u_t > 0:
        for which in ("out", "in", "air"):
            if which == "out":
                d = fouling_at(service, t_out + u_t)[0]
            elif which == "in":
                d = fouling_at(service.replace(tube=service.tube.replace(t_in=t_in + u_t)), t_out)[0]
            else:
                d = fouling_at(service.replace(air_in=ta + u_t), t_out)[0]
            deltas.append(np.abs(d - rf))
    band = np.sqrt(sum(d * d for d in deltas)) if deltas else np.zeros(shape)
    notes.append(f"air flow stated, not measured: band includes ±{u_air:.0%} on it and ±{u_t:g} K on each "
                 "temperature (one standard uncertainty each)")
    out = {k: np.where(np.broadcast_to(bad, shape), np.nan, np.broadcast_to(v, shape)).astype(float)
           for k, v in (("duty", q), ("U_actual", U), ("U_clean", U_clean), ("fouling", rf),
                        ("low", rf - band), ("high", rf + band), ("t_air", t_air))}
    return AirMonitoring(out["duty"], out["U_actual"], out["U_clean"], out["fouling"], out["low"], out["high"],
                         out["t_air"], tuple(notes), exchanger)
