"""One air cooler's study, computed: ratings in service and clean (today, at revamp, on the hottest day of the sweep),
the hot-day sweep with the ambient at which the target outlet is lost, the options side by side, and the fouling from
its plant data (:func:`run_air_case` -> :class:`AirStudy`); :mod:`revamp.report.air` formats it.

In a unit's network (a stream's rundown cooler) the tube inlet comes from the train: the caller passes the services
the train gives (:func:`revamp.unitfile.network_inlets`), as for a shell-and-tube exchanger's study.
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np

from ..errors import InputError

__all__ = ["AirStudy", "air_monitoring", "air_unit_ratings", "run_air_case"]


@dataclass(frozen=True)
class AirStudy:
    """One air cooler's study (SI inside).

    Attributes
    ----------
    case : AirCoolerCase
    ratings : dict
        Label -> :class:`~revamp.rating_air.AirRating`: ``"today"`` and ``"today (clean)"``, with a revamp section
        ``"revamp"`` and ``"revamp (clean)"``, and with a hot-day sweep ``"hottest day"`` and ``"hottest day
        (clean)"`` at its hottest ambient (at the revamp flows when there are some).
    basis : str
        What the sweep and the options are rated at (the revamp flows, or today's).
    hot : HotDay or None
        The sweep over the ambients of the unit file (None without a ``hot_day`` section).
    hot_note : str
        How the ambient limit was found, or why it could not be.
    options : pandas.DataFrame or None
        :func:`~revamp.options_air.compare_air` at today's service (None without options).
    options_hot : pandas.DataFrame or None
        The same on the hottest day of the sweep (None without options or sweep).
    options_error : str
    warnings : tuple of str
        The rating's warnings (validity ranges), each once.
    monitoring : AirPlantMonitoring or None
        The fouling from the plant data (:func:`revamp.monitoring_air_data.monitor_air_data`; None without plant
        data, or when it failed: ``monitoring_error``).
    monitoring_error : str
    inlets : str
        Where today's and the revamp tube inlets come from, when not from the air cooler's own entry (the train).
    """

    case: object
    ratings: dict
    basis: str = ""
    hot: object = None
    hot_note: str = ""
    options: object = None
    options_hot: object = None
    options_error: str = ""
    warnings: tuple = field(default=())
    monitoring: object = None
    monitoring_error: str = ""
    inlets: str = ""


def _clean(service):
    return service.replace(fouling_tube=0.0, fouling_air=0.0)


def air_monitoring(case):
    """``(monitoring, error)``: the fouling from the case's plant data (None, "" without plant data; None and the
    reason when the analysis fails: plant data is evidence, not a precondition of the study)."""
    pdata = getattr(case, "plant_data", None)
    if pdata is None:
        return None, ""
    from ..monitoring_air_data import monitor_air_data

    try:  # the stated air flow (and the fan design point) is the entry's own service, not a train's
        return monitor_air_data(case.exchanger, case.service, pdata.file, **pdata.monitor_options()), ""
    except Exception as exc:
        return None, f"{exc.__class__.__name__}: {exc}"


def run_air_case(case, service_today=None, service_revamp=None, inlets: str = "") -> AirStudy:
    """Rate, sweep and compare one air cooler of a unit file (an :class:`~revamp.unitfile.AirCoolerCase`), and find
    its fouling from its plant data.

    Parameters
    ----------
    case : AirCoolerCase
    service_today, service_revamp : AirService, optional
        Services replacing the entry's own (e.g. the inlets a train gives it, :func:`revamp.unitfile.network_inlets`).
    inlets : str
        Where those services come from (stated in the report).
    """
    import revamp as rv

    from ..hot_day import hot_day
    from ..options_air import compare_air

    if getattr(case, "kind", None) != "air cooler":
        raise InputError("case", type(case).__name__, "an air-cooler case of a unit file (kind: air cooler)")
    ex, today = case.exchanger, (service_today if service_today is not None else case.service)
    ratings = {"today": rv.rate(ex, today), "today (clean)": rv.rate(ex, _clean(today))}
    svc = today  # the design question: the revamp flows when the unit file gives them
    basis = "today's flows (the unit file gives no revamp section for this air cooler)"
    if service_revamp is not None:
        svc = service_revamp
        ratings["revamp"], ratings["revamp (clean)"] = rv.rate(ex, svc), rv.rate(ex, _clean(svc))
        basis = "the revamp conditions the unit's train gives this air cooler"
    elif getattr(case, "revamp_service", None) is not None:
        svc = case.revamp_service
        ratings["revamp"], ratings["revamp (clean)"] = rv.rate(ex, svc), rv.rate(ex, _clean(svc))
        basis = f"the revamp conditions (tube-side flow x{case.throughput:g} on today's)"
    hot, note = None, ""
    if case.hot_day_ambient:
        hottest = max(case.hot_day_ambient)
        ratings["hottest day"] = rv.rate(ex, svc.replace(air_in=hottest))
        ratings["hottest day (clean)"] = rv.rate(ex, _clean(svc).replace(air_in=hottest))
        try:
            hot = hot_day(ex, svc, list(case.hot_day_ambient), case.t_out_target)
            note = _limit_text(hot, case.t_out_target)
        except InputError as exc:  # the limit search left the fluid's range: keep the sweep, interpolate on it
            hot = hot_day(ex, svc, list(case.hot_day_ambient))
            note = (f"The search for the limiting ambient stopped ({exc}); the limit below is read off the sweep by "
                    "linear interpolation between its points.")
            limit = _interpolated_limit(hot.ambient, hot.t_out_tube, case.t_out_target)
            hottest_out = float(hot.t_out_tube[np.argmax(hot.ambient)])
            if limit is None and case.t_out_target is not None and hottest_out <= case.t_out_target:
                note += " The target is met across the whole sweep."
            else:
                note += " " + _limit_text(hot, case.t_out_target, limit)
    options = options_hot = None
    error = ""
    if case.options:
        try:
            options = compare_air(ex, svc, case.options)
            if case.hot_day_ambient:
                options_hot = compare_air(ex, svc.replace(air_in=max(case.hot_day_ambient)), case.options)
        except InputError as exc:
            error = str(exc)
    seen, keys = [], set()
    for r in ratings.values():  # each warning once: the same complaint at another number is not repeated
        for w in r.warnings:
            key = re.sub(r"\d[\d.eE+-]*", "#", w)
            if key not in keys:
                keys.add(key)
                seen.append(w)
    monitoring, monitoring_error = air_monitoring(case)
    return AirStudy(case=case, ratings=ratings, basis=basis, hot=hot, hot_note=note, options=options,
                    options_hot=options_hot, options_error=error,
                    warnings=tuple(seen), monitoring=monitoring, monitoring_error=monitoring_error, inlets=inlets)


def _interpolated_limit(ambient, t_out, target):
    """The ambient at which ``t_out`` crosses ``target`` on a sweep (linear between points), None if it never does
    inside the sweep. ``t_out`` rises with the ambient."""
    if target is None:
        return None
    order = np.argsort(np.asarray(ambient, float))  # the unit file may list the ambients in any order
    ambient, gap = np.asarray(ambient, float)[order], np.asarray(t_out, float)[order] - target
    above = np.flatnonzero(gap > 0)
    if above.size == 0 or above[0] == 0:
        return None
    k = above[0]
    return float(np.interp(0.0, [gap[k - 1], gap[k]], [ambient[k - 1], ambient[k]]))


def _limit_text(hot, t_out_target, limit="from the search") -> str:
    from ..units import format_quantity as fq

    if t_out_target is None:
        return "No target outlet given: the sweep shows the outlet and duty only."
    limit = hot.ambient_limit if limit == "from the search" else limit
    target = fq(t_out_target, "temperature")
    if limit is None or (isinstance(limit, float) and np.isnan(limit)):
        return f"The tube outlet target {target} is not met at any ambient searched."
    if np.isinf(limit):
        return f"The tube outlet target {target} is met up to 5 K below the target itself."
    return f"The tube outlet target {target} is lost above an ambient of {fq(limit, 'temperature')}."


def air_unit_ratings(case):
    """``(today, revamp or None)``: the air cooler rated at today's service and at the revamp one (when given)."""
    import revamp as rv

    today = rv.rate(case.exchanger, case.service)
    rev = rv.rate(case.exchanger, case.revamp_service) if case.revamp_service is not None else None
    return today, rev
