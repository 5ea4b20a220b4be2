"""The column-pressure question of a condenser: the condensing pressure at which an exchanger just condenses a load.

:func:`condensing_pressure_for` searches the pressure (Brent's method on its logarithm) at which
:func:`revamp.rating_condenser.rate_condenser` leaves the condensing stream at its bubble point, and returns a
:class:`CondensingPressure`. Both names are re-exported by :mod:`revamp.rating_condenser`.

References
----------
Brent, R. P. (1973). *Algorithms for Minimization without Derivatives*, Prentice-Hall, ch. 4 (the root search, as
``scipy.optimize.brentq``).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .errors import InputError
from .rating_condenser_path import _curve_of, _q_in
from .rating_condenser_result import CondenserRating
from .service import Service, Stream

__all__ = ["CondensingPressure", "condensing_pressure_for"]


@dataclass(frozen=True)
class CondensingPressure:
    """The condensing pressure an exchanger can hold at a vapour load.

    Attributes
    ----------
    pressure : float
        The lowest condensing (inlet) pressure at which the whole load condenses [Pa].
    temperature : float
        The dew point at that pressure [K].
    vapour_load : float
        The vapour condensed [kg/s].
    rating : CondenserRating
        The rating at that pressure (its outlet at the bubble point).
    basis : str
        What was held and what was searched, for reports.
    """

    pressure: float
    temperature: float
    vapour_load: float
    rating: CondenserRating = field(repr=False)
    basis: str = ""


def condensing_pressure_for(exchanger, service, duty_or_vapour_load, *, increments: int = 8,
                            **methods) -> CondensingPressure:
    """The condensing pressure (and dew point) at which an exchanger just condenses a vapour load.

    The column-pressure question of a revamp: at a higher vapour load, how high must the condensing pressure rise so
    that the condenser still condenses everything? The condensing stream of ``service`` is moved to other
    pressures (:meth:`revamp.fluids.CondensingFluid.at_pressure`, keeping its inlet quality, or its superheat above
    the dew point for a vapour inlet) and rated (:func:`rate_condenser`) until its outlet sits at the bubble point:
    below that pressure vapour leaves uncondensed, above it the condensate is subcooled. Brent's root search on the
    logarithm of the pressure, between the pressure whose dew point is 1 K above the warmest coolant inlet and
    0.9 of the critical pressure (or ten times the given pressure for a curve without one).

    Parameters
    ----------
    exchanger : revamp.ShellAndTube or revamp.AirCooler
    service : Service or AirService
        With one condensing stream; single case (no arrays). Its flow is replaced by the load.
    duty_or_vapour_load : float or str
        The vapour load [kg/s] (a number is a mass flow), or a string with units: a mass flow (``"12 kg/s"``) or a
        condensing duty (``"3.5 MW"``: the load is then that duty over the heat released from the inlet to the
        bubble point at each pressure).
    increments : int
        Increments per zone of each rating in the search (default 8; the final rating uses the same).
    **methods
        Passed to :func:`rate_condenser`.

    Returns
    -------
    CondensingPressure

    Raises
    ------
    InputError
        A load that is not a positive mass flow or duty, a service with arrays, or no pressure in the bracket at
        which the load just condenses (the field says which end failed).
    """
    from scipy.optimize import brentq

    from .rating_condenser import rate_condenser  # (here, not at the top: rating_condenser re-exports this module)
    from .units import to_si

    load_kind = "mass_flow"
    value = duty_or_vapour_load
    if isinstance(value, str):
        try:
            value = to_si(value, "mass_flow", "duty_or_vapour_load")
        except InputError:
            value = to_si(value, "power", "duty_or_vapour_load")
            load_kind = "power"
    value = np.asarray(value, dtype=float)
    if value.ndim != 0 or not np.isfinite(value) or value <= 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, "one positive vapour load [kg/s] or duty [W]")
    value = float(value)
    side = "tube" if not isinstance(service, Service) else ("shell" if service.shell.condensing else "tube")
    stream = getattr(service, side, None)
    if not isinstance(stream, Stream) or not stream.condensing:
        raise InputError("service", service, "a service with a vapour or two-phase stream")
    values = list(vars(service).values())
    values += [v for s in values if isinstance(s, Stream) for v in (s.flow, s.t_in)]
    if any(np.ndim(v) > 0 for v in values if isinstance(v, (np.ndarray, float, int))):
        raise InputError("service", "arrays", "a single case (no arrays) for the pressure search")
    curve = _curve_of(stream.fluid)
    superheat = None if stream.quality is not None else float(stream.t_in) - float(curve.t_dew)
    coolant_in = float(service.air_in) if side == "tube" and not isinstance(service, Service) else float(
        getattr(service, "shell" if side == "tube" else "tube").t_in)

    def stream_at(p):
        c = curve.at_pressure(p)
        if superheat is None:
            return c, Stream(c, 1.0, quality=stream.quality)
        return c, Stream(c, 1.0, t_in=float(c.t_dew) + superheat, phase="vapour")

    def load_at(c, s):
        if load_kind == "mass_flow":
            return value
        per_kg = float(c.latent) - _q_in(c, s.quality)
        if superheat:
            per_kg += float(c.superheat(float(s.t_in)))
        return value / per_kg

    def rated(p):
        c, s = stream_at(p)
        s = s.replace(flow=load_at(c, s))
        return rate_condenser(exchanger, service.replace(**{side: s}), increments=increments, **methods), c

    def residual(logp):
        r, c = rated(float(np.exp(logp)))
        if not np.isfinite(r.quality_out):  # near choking at this low pressure: it cannot pass the load
            return 1.0
        if r.quality_out > 0:
            return float(r.quality_out)  # vapour left: the pressure is too low
        return -(float(c.t_bubble) - float(r.t_out_condensing)) / float(c.t_bubble)  # subcooled: too high

    p0 = float(curve.pressure)
    t_low = coolant_in + 1.0

    def dew_minus(logp, target):
        return float(curve.temperature_at_pressure(float(np.exp(logp)))) - target

    p_crit = float(curve.critical_pressure)
    p_high = 0.9 * p_crit if np.isfinite(p_crit) else 10.0 * p0
    try:
        p_low = float(np.exp(brentq(dew_minus, np.log(p0 * 1e-3), np.log(p_high), args=(t_low,), xtol=1e-6)))
    except ValueError:
        raise InputError("service", f"coolant inlet {coolant_in:.2f} K", "a coolant colder than the dew point at "
                         "some pressure below 0.9 of the critical pressure") from None
    lo, hi = np.log(p_low), np.log(p_high)
    f_lo, f_hi = residual(lo), residual(hi)
    if f_lo <= 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, f"a load that does not condense fully already "
                         f"at {p_low:.6g} Pa (dew point 1 K above the coolant inlet): there the condensate leaves "
                         "subcooled, so the exchanger holds any pressure above that")
    if f_hi > 0:
        raise InputError("duty_or_vapour_load", duty_or_vapour_load, f"a load the exchanger can condense below "
                         f"{p_high:.6g} Pa (at that pressure vapour still leaves, quality {f_hi:.3g})")
    logp = brentq(residual, lo, hi, xtol=1e-5, rtol=1e-8)
    p = float(np.exp(logp))
    r, c = rated(p)
    basis = (f"lowest condensing pressure at which {'the vapour load' if load_kind == 'mass_flow' else 'the duty'} "
             "condenses fully, the coolant as given; inlet "
             f"{'quality held' if superheat is None else 'superheat held'}")
    return CondensingPressure(pressure=p, temperature=float(c.t_dew), vapour_load=float(r.condensed), rating=r,
                              basis=basis)
