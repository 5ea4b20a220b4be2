"""Retrofit options for condensers and their side-by-side comparison (layer 6).

A condenser takes the options of its exchanger kind unchanged, through the same ``apply(exchanger, service) ->
(exchanger, service)`` transforms: added area or shells (:class:`revamp.options.AddShells`,
:class:`revamp.options.NewBundle`; air coolers :mod:`revamp.options_air`), cleaning (:class:`revamp.options.Clean`,
:class:`revamp.options_air.CleanFins`), a fan upgrade, and tube inserts on the coolant side
(:class:`revamp.options.TwistedTape`, :class:`revamp.options.WireCoil`: only where the coolant flows in the tubes;
the condensing correlations have no insert form, so an insert in condensing tubes is refused). This module adds the
coolant change (:class:`CoolantChange`: more coolant, a colder inlet) and :func:`compare_condenser`, which rates the
base case and every option zone by zone and, given the revamp vapour load, the condensing pressure each one holds
(:func:`revamp.rating_condenser.condensing_pressure_for`: the column-pressure question).

>>> CoolantChange(flow_ratio=1.2, t_in="28 degC").label
'coolant: flow x1.2, inlet 301.15 K'
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from .errors import InputError
from .options import TwistedTape, WireCoil, option_label
from .service import Service
from .units import require, to_si

__all__ = ["CoolantChange", "compare_condenser", "COMPARE_COLUMNS"]

#: The columns of :func:`compare_condenser` (SI), besides ``condensing_pressure`` and ``condensing_temperature``
#: when a vapour load is given.
COMPARE_COLUMNS = ("duty", "condensed", "quality_out", "t_out_condensing", "t_out_coolant", "U_service",
                   "dp_condensing", "dp_coolant", "dt_sat_drop", "area")


def _set_label(obj, text):
    if obj.label is None:
        object.__setattr__(obj, "label", text)
    elif not isinstance(obj.label, str) or not obj.label.strip():
        raise InputError("label", obj.label, "a non-empty string or None")


def _coolant_side(service):
    """The coolant side of a condenser service: 'shell'/'tube' for a Service, 'air' for an AirService."""
    if isinstance(service, Service):
        if service.shell.condensing == service.tube.condensing:
            raise InputError("service", service, "a condenser service: one vapour or two-phase stream, one coolant")
        return "tube" if service.shell.condensing else "shell"
    if hasattr(service, "air_in") and hasattr(service, "tube"):
        return "air"
    raise InputError("service", service, "a revamp.Service or revamp.AirService with a condensing stream")


@dataclass(frozen=True)
class CoolantChange:
    """More (or less) coolant, or a different coolant inlet temperature.

    Parameters
    ----------
    flow_ratio : float
        Coolant flow multiplier (> 0; 1 keeps it). Air: the air mass flow (or face velocity); the fan power that
        costs is for :class:`revamp.options_air.FanUpgrade`, which applies the fan laws.
    t_in : float or str, optional
        New coolant inlet temperature [K] (cooling water from a chiller or another header; air: not an option, the
        ambient is the weather).
    label : str, optional
    """

    flow_ratio: object = 1.0
    t_in: object = None
    label: str | None = None

    def __post_init__(self):
        r = to_si(self.flow_ratio, "dimensionless", "CoolantChange.flow_ratio")
        if np.ndim(r) != 0:
            raise InputError("CoolantChange.flow_ratio", self.flow_ratio, "one flow multiplier")
        object.__setattr__(self, "flow_ratio", float(require(r, "CoolantChange.flow_ratio", gt=0.0,
                                                             what="a flow multiplier")))
        parts = [f"flow x{self.flow_ratio:g}"] if self.flow_ratio != 1.0 else []
        if self.t_in is not None:
            t = to_si(self.t_in, "temperature", "CoolantChange.t_in")
            if np.ndim(t) != 0:
                raise InputError("CoolantChange.t_in", self.t_in, "one inlet temperature")
            object.__setattr__(self, "t_in", float(require(t, "CoolantChange.t_in", gt=0.0,
                                                           what="an absolute temperature [K]")))
            parts.append(f"inlet {self.t_in:.2f} K")
        if not parts:
            raise InputError("CoolantChange", "no change", "a flow_ratio other than 1 or a new t_in")
        _set_label(self, "coolant: " + ", ".join(parts))

    def apply(self, exchanger, service):
        side = _coolant_side(service)
        if side == "air":
            if self.t_in is not None:
                raise InputError("CoolantChange.t_in", self.t_in, "None for an air cooler (the ambient is the "
                                 "weather: rate the hot day with a different AirService.air_in)")
            if service.air_flow is not None:
                return exchanger, service.replace(air_flow=np.multiply(service.air_flow, self.flow_ratio))
            return exchanger, service.replace(face_velocity=np.multiply(service.face_velocity, self.flow_ratio))
        stream = getattr(service, side)
        changes = {"flow": np.multiply(stream.flow, self.flow_ratio)}
        if self.t_in is not None:
            changes["t_in"] = self.t_in
        return exchanger, service.replace(**{side: stream.replace(**changes)})


def _refuse_condensing_inserts(option, exchanger, service, side):
    """Inserts go into the tubes: only where the coolant flows there."""
    if isinstance(option, (TwistedTape, WireCoil)) and side != "tube":
        raise InputError("options", option.label, "tube inserts only where the coolant flows in the tubes (the "
                         "condensing correlations have no insert form)")


def compare_condenser(exchanger, service, options=(), *, vapour_load=None, base_pressure=None,
                      **rating_kw) -> pd.DataFrame:
    """Rate the base case and each option zone by zone; one row each (SI).

    Parameters
    ----------
    exchanger : ShellAndTube or AirCooler
    service : Service or AirService
        A single case (no arrays) with a vapour or two-phase stream.
    options : sequence of options
        Any ``apply(exchanger, service)`` option with a unique label (not ``"base"``): :class:`CoolantChange`,
        :mod:`revamp.options` (shells, bundle, cleaning, inserts on a tube-side coolant), :mod:`revamp.options_air`.
    vapour_load : float or str, optional
        The revamp vapour load [kg/s] (or a duty with units): adds ``condensing_pressure`` [Pa] and
        ``condensing_temperature`` [K], the lowest pressure (and its dew point) at which each case condenses it all
        (:func:`revamp.rating_condenser.condensing_pressure_for`; NaN where none in the search bracket does).
    base_pressure : CondensingPressure or InputError, optional
        The base case's answer already found by the caller at this vapour load, with the same rating settings (a
        :class:`~revamp.rating_condenser.CondensingPressure`, or the ``InputError`` its search raised): reused for
        the ``"base"`` row instead of searching again (the search is the slow part). It must be for the same
        load: its ``vapour_load`` is checked against ``vapour_load`` when both are mass flows.
    **rating_kw
        Passed to :func:`revamp.rating_condenser.rate_condenser` (``increments``, methods).

    Returns
    -------
    pandas.DataFrame
        Indexed by label (``"base"`` first), columns :data:`COMPARE_COLUMNS`, ``zones`` (the zones reached, as
        text), ``warnings`` (count) and, with a vapour load, the pressure columns.
    """
    from .rating_condenser import condensing_pressure_for, rate_condenser

    if base_pressure is not None:
        if vapour_load is None:
            raise InputError("base_pressure", type(base_pressure).__name__, "None without a vapour_load")
        if isinstance(base_pressure, InputError):
            if base_pressure.field != "duty_or_vapour_load":
                raise base_pressure
        elif not (hasattr(base_pressure, "pressure") and hasattr(base_pressure, "vapour_load")):
            raise InputError("base_pressure", type(base_pressure).__name__,
                             "a CondensingPressure from condensing_pressure_for(), an InputError, or None")
        elif not isinstance(vapour_load, str) and not np.isclose(float(base_pressure.vapour_load),
                                                                   float(vapour_load), rtol=1e-3):
            raise InputError("base_pressure.vapour_load", float(base_pressure.vapour_load),
                             f"the vapour_load of the comparison, {float(vapour_load):g} kg/s")
    labels = [option_label(o) for o in options]
    if len(set(labels)) != len(labels) or "base" in labels:
        raise InputError("options", labels, "options with unique labels, none called 'base'")
    rows = {}
    for label, option in [("base", None)] + list(zip(labels, options)):
        if option is None:
            hx, svc = exchanger, service
        else:
            _refuse_condensing_inserts(option, exchanger, service, _coolant_side(service))
            hx, svc = option.apply(exchanger, service)
        r = rate_condenser(hx, svc, **rating_kw)
        if r.shape != ():
            raise InputError("service", "an array service", "a single case for compare_condenser()")
        row = {c: float(getattr(r, c)) for c in COMPARE_COLUMNS}
        row["zones"] = ", ".join(r.zones["zone"])
        row["warnings"] = len(r.warnings)
        if vapour_load is not None:
            try:
                if option is None and isinstance(base_pressure, InputError):
                    raise base_pressure
                c = base_pressure if option is None and base_pressure is not None else condensing_pressure_for(
                    hx, svc, vapour_load, **rating_kw)
                row["condensing_pressure"], row["condensing_temperature"] = c.pressure, c.temperature
            except InputError as exc:
                if exc.field != "duty_or_vapour_load":
                    raise
                row["condensing_pressure"] = row["condensing_temperature"] = np.nan
        rows[label] = row
    return pd.DataFrame.from_dict(rows, orient="index")
